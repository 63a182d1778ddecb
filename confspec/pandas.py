"""Validate and normalize a pandas column, reading each distinct value once.

>>> import pandas as pd
>>> import confspec.pandas as cp
>>> s = pd.Series(["[ar] 4s^2 3d^{6}", "1s2 2s2 2p7", None, "[ar] 4s^2 3d^{6}"], dtype=object)
>>> cp.normalize(s).tolist()
['[Ar] 3d6 4s2', '1s2 2s2 2p7', None, '[Ar] 3d6 4s2']
>>> cp.check(s)["code"].tolist()
[None, 'pauli-limit', 'empty', None]
>>> s.confspec.is_valid().tolist()
[True, False, False, True]

Importing this module registers the ``.confspec`` accessor on Series. pandas is imported
here only, never by ``import confspec``.
"""

from __future__ import annotations

from typing import Any, Literal

import numpy as np
import pandas as pd  # type: ignore[import-untyped]

from .cleaning import ConfigurationCheck, Outcome, RowJob, cell_text

__all__ = ["ConfspecAccessor", "check", "electron_count", "is_valid", "normalize"]

#: The columns :func:`check` returns, the same as the CLI report's.
CHECK_COLUMNS = ("status", "code", "message", "normalized", "fixes")

_NONE = np.array(None, dtype=object)
_JOBS: dict[ConfigurationCheck, RowJob] = {}


def _job(check_: ConfigurationCheck, cache_size: int) -> RowJob:
    """One cached job per set of options, so repeated calls reuse earlier results."""
    job = _JOBS.get(check_)
    if job is None or job.cache_size != cache_size:
        if len(_JOBS) > 16:
            _JOBS.clear()
        job = _JOBS[check_] = RowJob(check_, cache_size)
    return job


def _options(strict: bool = False, accept_uppercase: bool = False, fill_core: bool = False,
             repair_text: bool = False, style: str = "plain", core: str = "condense",
             order: str = "shell") -> ConfigurationCheck:
    return ConfigurationCheck(strict=strict, accept_uppercase=accept_uppercase,
                              fill_core=fill_core, repair_text=repair_text, style=style,
                              core=core, order=order)


def _as_series(values: Any, like: pd.Series | None = None) -> pd.Series:
    if isinstance(values, pd.Series):
        return values
    if like is not None and (values is None or isinstance(values, str)):
        return pd.Series([values] * len(like), index=like.index, dtype=object)
    return pd.Series(values, dtype=object)


def _hashable_cell(value: Any) -> Any:
    """A list, dict or set cell as the text the CLI reads for it, so it is flagged like any
    other cell that is not a configuration instead of raising."""
    try:
        hash(value)
    except TypeError:
        if isinstance(value, set | frozenset):
            value = sorted(map(str, value))
        return cell_text(value) if isinstance(value, dict | list) else str(value)
    return value


def _factorize(values: pd.Series) -> tuple[np.ndarray[Any, Any], Any]:
    try:
        return pd.factorize(values, use_na_sentinel=True)  # type: ignore[no-any-return]
    except TypeError:  # an unhashable cell (a list, dict or set)
        return pd.factorize(values.map(_hashable_cell), use_na_sentinel=True)  # type: ignore[no-any-return]


def _outcomes(values: pd.Series, species: Any, check_: ConfigurationCheck,
              cache_size: int) -> tuple[np.ndarray[Any, Any], list[Outcome]]:
    """Codes (one per row) into a list of outcomes (one per distinct input)."""
    job = _job(check_, cache_size)
    codes, uniques = _factorize(values)
    texts = [cell_text(v) for v in uniques]
    if species is None:
        found = job.outcomes([(t,) for t in texts])
        found.append(job.outcome((None,)))  # code -1 (missing) takes the last one
        return np.asarray(codes), found
    kinds = _as_series(species, values)
    if len(kinds) != len(values):
        raise ValueError(f"species has {len(kinds)} values for {len(values)} configurations")
    s_codes, s_uniques = _factorize(kinds)
    width = len(s_uniques) + 1
    pairs = (codes.astype(np.int64) + 1) * width + (s_codes.astype(np.int64) + 1)
    pair_codes, pair_uniques = pd.factorize(pairs)
    s_texts = [cell_text(v) for v in s_uniques]
    keys = []
    for pair in pair_uniques:
        a, b = divmod(int(pair), width)
        keys.append((texts[a - 1] if a else None, s_texts[b - 1] if b else None))
    return np.asarray(pair_codes), job.outcomes(keys)


def _take(outcomes: list[Outcome], codes: np.ndarray[Any, Any], attr: str) -> np.ndarray[Any, Any]:
    table = np.empty(len(outcomes), dtype=object)
    table[:] = [getattr(o, attr) for o in outcomes]
    taken: np.ndarray[Any, Any] = table[codes]
    return taken


def check(values: pd.Series, species: pd.Series | str | None = None, *, strict: bool = False,
          accept_uppercase: bool = False, fill_core: bool = False, repair_text: bool = False,
          style: str = "plain", core: str = "condense", order: str = "shell",
          cache_size: int = 65_536) -> pd.DataFrame:
    """One row per value: status (ok/error), code, message, normalized, fixes.

    The columns hold Python objects, None where there is nothing to say.

    ``species`` (a Series aligned with ``values``, or one species for all) adds the electron
    count check. Missing values are invalid (code ``empty``).
    """
    values = _as_series(values)
    codes, outcomes = _outcomes(values, species, _options(
        strict, accept_uppercase, fill_core, repair_text, style, core, order), cache_size)
    data = {name: _take(outcomes, codes, attr) for name, attr in (
        ("status", "status"), ("code", "code"), ("message", "message"),
        ("normalized", "normalized"), ("fixes", "fixes_text"))}
    return pd.DataFrame({name: pd.Series(column, index=values.index, dtype=object)
                         for name, column in data.items()}, index=values.index)


def normalize(values: pd.Series, species: pd.Series | str | None = None, *,
              errors: Literal["keep", "null", "raise"] = "keep",
              accept_uppercase: bool = False, fill_core: bool = False,
              repair_text: bool = False, style: str = "plain", core: str = "condense",
              order: str = "shell", cache_size: int = 65_536) -> pd.Series:
    """The values rewritten in one notation.

    A value that cannot be read is kept as it was (``errors="keep"``), replaced by None
    (``"null"``), or reported with its row label (``"raise"``, a ValueError).
    """
    if errors not in ("keep", "null", "raise"):
        raise ValueError(f"errors must be 'keep', 'null' or 'raise', not {errors!r}")
    values = _as_series(values)
    codes, outcomes = _outcomes(values, species, _options(
        False, accept_uppercase, fill_core, repair_text, style, core, order), cache_size)
    good = np.array([o.ok for o in outcomes], dtype=bool)[codes] if len(codes) else \
        np.zeros(0, dtype=bool)
    rewritten = _take(outcomes, codes, "normalized")
    if errors == "raise" and not good.all():
        at = int(np.flatnonzero(~good)[0])
        outcome = outcomes[codes[at]]
        label = values.index[at]
        label = label.item() if hasattr(label, "item") else label  # numpy scalar -> Python
        raise ValueError(f"row {label!r}: {outcome.message} [{outcome.code}]")
    if errors == "keep":
        original = values.to_numpy(dtype=object, na_value=None)
        rewritten = np.where(good, rewritten, original)
    else:
        rewritten = np.where(good, rewritten, _NONE)
    return pd.Series(rewritten, index=values.index, name=values.name, dtype=_text_dtype(values))


def _text_dtype(values: pd.Series) -> Any:
    """Keep a string dtype the column had; otherwise plain objects (None for missing)."""
    dtype = values.dtype
    return dtype if isinstance(dtype, pd.StringDtype) else object


def is_valid(values: pd.Series, species: pd.Series | str | None = None, *,
             strict: bool = False, accept_uppercase: bool = False,
             cache_size: int = 65_536) -> pd.Series:
    """True where the value is valid (and agrees with the species, when given)."""
    values = _as_series(values)
    codes, outcomes = _outcomes(values, species, _options(strict, accept_uppercase),
                                cache_size)
    flags = np.array([o.ok for o in outcomes], dtype=bool)
    return pd.Series(flags[codes] if len(codes) else flags[:0], index=values.index,
                     name=values.name)


def electron_count(values: pd.Series, *, accept_uppercase: bool = False,
                   cache_size: int = 65_536) -> pd.Series:
    """Electrons of each valid value; missing (<NA>) where the value is invalid."""
    values = _as_series(values)
    codes, outcomes = _outcomes(values, None, _options(accept_uppercase=accept_uppercase),
                                cache_size)
    counts = _take(outcomes, codes, "electrons")
    ok = np.array([o.ok for o in outcomes], dtype=bool)[codes] if len(codes) else \
        np.zeros(0, dtype=bool)
    return pd.Series(pd.array(np.where(ok, counts, _NONE), dtype="Int64"), index=values.index,
                     name=values.name)


class ConfspecAccessor:
    """``series.confspec.normalize()``, ``.check()``, ``.is_valid()``, ``.electron_count()``."""

    def __init__(self, series: pd.Series) -> None:
        self._series = series

    def normalize(self, species: pd.Series | str | None = None, **options: Any) -> pd.Series:
        return normalize(self._series, species, **options)

    def check(self, species: pd.Series | str | None = None, **options: Any) -> pd.DataFrame:
        return check(self._series, species, **options)

    def is_valid(self, species: pd.Series | str | None = None, **options: Any) -> pd.Series:
        return is_valid(self._series, species, **options)

    def electron_count(self, **options: Any) -> pd.Series:
        return electron_count(self._series, **options)


if "confspec" not in getattr(pd.Series, "_accessors", set()):
    pd.api.extensions.register_series_accessor("confspec")(ConfspecAccessor)
