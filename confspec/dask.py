"""Validate and normalize a column of a Dask dataframe, partition by partition.

Each partition goes through :mod:`confspec.pandas` (each distinct value read once per
partition, with a per-worker cache across partitions), so the work spreads over the
workers of a ``dask.distributed`` cluster and no partition waits on another. Row order and
the index are kept; no row is dropped.

>>> import pandas as pd, dask.dataframe as dd
>>> import confspec.dask as cd
>>> frame = dd.from_pandas(pd.DataFrame({"c": ["[ar] 4s^2 3d^{6}", "2p7"]}), npartitions=1)
>>> cd.normalize(frame, "c").compute()["status"].tolist()
['ok', 'error']
"""

from __future__ import annotations

from typing import Any

import pandas as pd  # type: ignore[import-untyped]

from . import pandas as _cp
from .errors import ConfspecSyntaxError

__all__ = ["check", "normalize"]

_REPORT = ("status", "code", "message", "normalized", "fixes")


def _check_partition(part: pd.DataFrame, column: str, species_column: str | None,
                     options: dict[str, Any]) -> pd.DataFrame:
    species = part[species_column] if species_column else None
    result = _cp.check(part[column], species, **options)
    return result.astype(object)


def _normalize_partition(part: pd.DataFrame, column: str, species_column: str | None,
                         names: tuple[str, str, str], options: dict[str, Any]) -> pd.DataFrame:
    species = part[species_column] if species_column else None
    report = _cp.check(part[column], species, **options)
    out = part.copy()
    good = (report["status"] == "ok").to_numpy()
    original = part[column].astype(object).to_numpy()
    out[column] = pd.Series(
        [n if g else o for n, g, o in zip(report["normalized"], good, original, strict=True)],
        index=part.index, dtype=object)
    status, code, fixes = names
    out[status] = report["status"].astype(object)
    out[code] = report["code"].astype(object)
    out[fixes] = report["fixes"].astype(object)
    return out


def _object_meta(index: Any, names: tuple[str, ...]) -> pd.DataFrame:
    return pd.DataFrame({n: pd.Series([], dtype=object) for n in names},
                        index=index[:0])


def _require_columns(frame: Any, *names: str | None) -> None:
    """Name a missing column in our words (code ``unknown-column``) before any work."""
    have = list(frame.columns)
    for name in names:
        if name is not None and name not in have:
            raise ConfspecSyntaxError(
                "unknown-column", f"the frame has no column {name!r}; it has: "
                + ", ".join(map(str, have)), text=str(name))


def check(frame: Any, column: str, *, species_column: str | None = None,
          **options: Any) -> Any:
    """A Dask dataframe of status, code, message, normalized, fixes, aligned with ``frame``.

    ``options`` are those of :func:`confspec.pandas.check` (strict, accept_uppercase,
    fill_core, repair_text, style, core, order).
    """
    _require_columns(frame, column, species_column)
    meta = _object_meta(frame._meta.index, _REPORT)
    return frame.map_partitions(_check_partition, column, species_column, dict(options),
                                meta=meta)


def normalize(frame: Any, column: str, *, species_column: str | None = None,
              status_column: str = "status", code_column: str = "code",
              fixes_column: str = "fixes", **options: Any) -> Any:
    """``frame`` with ``column`` rewritten where it could be read, plus status columns.

    Unreadable values keep their text and are flagged in the status column.
    """
    _require_columns(frame, column, species_column)
    names = (status_column, code_column, fixes_column)
    clash = [n for n in names if n in frame.columns]
    if clash:
        raise ValueError(f"the frame already has a column {clash[0]!r}; choose other names")
    meta = frame._meta.copy()
    meta[column] = meta[column].astype(object)
    for name in names:
        meta[name] = pd.Series([], dtype=object, index=meta.index)
    return frame.map_partitions(_normalize_partition, column, species_column, names,
                                dict(options), meta=meta)
