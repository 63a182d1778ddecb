"""Rows in, rows out: the per-row job and the streaming readers and writers behind the CLI.

Every row read is one row written, in order, whatever its content: a cell that cannot be
read keeps its text and is flagged. Files are read and written in chunks (memory stays flat
as they grow) and written to a temporary file in the target's directory that is renamed
into place only when the whole job succeeded. Database writes happen in one transaction.

The per-row job is a *check*: a picklable callable from the cells of a few columns to an
:class:`Outcome`. :class:`ConfigurationCheck` reads a configuration (and a species); a check
for level designations plugs into the same :class:`RowJob`, readers and writers.

Optional libraries (pyarrow, ftfy, SQLAlchemy) are imported only where a format needs them.
"""

from __future__ import annotations

import contextlib
import csv
import gzip
import io
import json
import math
import os
import sqlite3
import sys
import tempfile
import time
from collections import Counter, OrderedDict
from collections.abc import Callable, Iterator, Sequence
from concurrent.futures import Future, ProcessPoolExecutor
from dataclasses import dataclass, field
from functools import lru_cache
from multiprocessing import get_context
from pathlib import Path
from re import compile as re_compile
from typing import IO, Any, ClassVar, NamedTuple, Protocol, cast

from . import (
    Configuration,
    ConfspecError,
    ConfspecPhysicsError,
    ConfspecSyntaxError,
    Species,
    parse,
    parse_species,
)
from . import validate as validate_text
from ._clean import clean
from ._fastpath import fast_configuration
from ._physics import implied_inner_subshells, subshell_label

__all__ = [
    "FORMATS",
    "Check",
    "Chunk",
    "ConfigurationCheck",
    "InputError",
    "Outcome",
    "RowJob",
    "Summary",
    "run",
]

#: File formats by name; chosen from the extension unless given.
FORMATS = ("csv", "tsv", "jsonl", "parquet")
_EXTENSIONS = {".csv": "csv", ".tsv": "tsv", ".tab": "tsv", ".jsonl": "jsonl",
               ".ndjson": "jsonl", ".parquet": "parquet", ".pq": "parquet"}
_SQLITE_EXTENSIONS = (".db", ".sqlite", ".sqlite3")
DEFAULT_CHUNK_ROWS = 10_000
DEFAULT_CACHE_SIZE = 65_536


class InputError(Exception):
    """Bad input or usage the user must fix: the CLI prints it on one line and exits 2."""


class _Missing:
    """A JSON Lines key that a row does not have (kept apart from an explicit null)."""

    _instance: ClassVar[_Missing | None] = None

    def __new__(cls) -> _Missing:
        if cls._instance is None:
            cls._instance = super().__new__(cls)
        return cls._instance

    def __repr__(self) -> str:
        return "MISSING"

    def __str__(self) -> str:  # a missing cell in a text output is an empty field
        return ""

    def __reduce__(self) -> str:
        return "MISSING"


MISSING = _Missing()


# ===================================================================== the per-row job
class Outcome(NamedTuple):
    """What one check found in one row (build it with :meth:`make`).

    ``normalized`` is the rewritten value when the input could be read (even when, in strict
    mode, it is flagged as non-canonical); ``checked`` is the text after repairs, when a
    repair changed it (the errors then refer to it). ``status``, ``code``, ``message`` and
    ``fixes_text`` are derived once here, because one outcome serves many rows.
    """

    errors: tuple[ConfspecError, ...]
    normalized: str | None
    fixes: tuple[str, ...]
    checked: str | None
    electrons: int | None
    status: str
    code: str | None
    message: str | None
    fixes_text: str | None
    rewritten: bool  # output rows carry `normalized` instead of the original value
    tail: tuple[str, str | None, str | None]  # (status, code, fixes_text) for output rows

    @classmethod
    def make(cls, errors: Sequence[ConfspecError], normalized: str | None = None,
             fixes: Sequence[str] = (), checked: str | None = None,
             electrons: int | None = None) -> Outcome:
        errors = tuple(errors)
        status, code = ("error", errors[0].code) if errors else ("ok", None)
        fixes_text = ",".join(fixes) if fixes else None
        return cls(errors, normalized, tuple(fixes), checked, electrons, status, code,
                   "; ".join(_one_line(e) for e in errors) if errors else None, fixes_text,
                   not errors and normalized is not None, (status, code, fixes_text))

    @property
    def ok(self) -> bool:
        return not self.errors


def _one_line(err: ConfspecError) -> str:
    where = f" (at character {err.position + 1})" if err.position is not None else ""
    return f"{err.message}{where}"


def _about_species(errors: list[ConfspecError], species: str | None, text: str
                   ) -> list[ConfspecError]:
    """Say 'species' in the messages of the errors that are about the species cell."""
    if species is None or species == text:
        return errors
    return [type(e)(e.code, f"species {species!r}: {e.message}", position=e.position,
                    text=e.text) if e.text == species else e for e in errors]


class Check(Protocol):
    """A per-row validator: reads the cells of ``roles`` (in that order), returns an Outcome.

    Implementations are frozen dataclasses so they pickle into worker processes; their
    result must depend only on the cells (the job caches it by them).
    """

    roles: ClassVar[tuple[str, ...]]

    def __call__(self, *cells: str | None) -> Outcome: ...


def cell_text(value: object) -> str | None:
    """A cell as text for a check: None for null, missing and NaN; bytes decoded as UTF-8."""
    if value is None or value is MISSING:
        return None
    if isinstance(value, str):
        return value
    if isinstance(value, float) and math.isnan(value):
        return None
    if isinstance(value, bytes | bytearray | memoryview):
        return bytes(value).decode("utf-8", errors="replace")
    if isinstance(value, dict | list):
        return json.dumps(value, ensure_ascii=False)
    try:  # pandas.NA and friends refuse bool()
        if value != value:  # NaN-like
            return None
    except TypeError:
        return None
    return str(value)


_NOBLE_GASES = ("He", "Ne", "Ar", "Kr", "Xe", "Rn", "Og")


@lru_cache(maxsize=1)
def _cores() -> tuple[tuple[str, int, frozenset[tuple[int, int]]], ...]:
    """(symbol, electrons, subshells) of each noble-gas core, read through the library."""
    out = []
    for symbol in _NOBLE_GASES:
        config = parse(f"[{symbol}]")
        out.append((symbol, config.electron_count,
                    frozenset((s.n, s.l) for s in config.subshells)))
    return tuple(out)


@lru_cache(maxsize=4096)
def _species(text: str) -> Species:
    return parse_species(text)


def _repair_text(text: str) -> str:
    try:
        import ftfy
    except ImportError:  # the CLI checks before it starts; this guards other callers
        raise InputError("--repair-text needs ftfy: pip install 'confspec[tables]'") from None
    fixed: str = ftfy.fix_text(text)
    return fixed


def repair_text_available() -> bool:
    try:
        import ftfy  # noqa: F401
    except ImportError:
        return False
    return True


@dataclass(frozen=True, kw_only=True)
class _Options:
    """What every check shares: strictness, upper case, and the notation to write."""

    strict: bool = False
    accept_uppercase: bool = False
    style: str = "plain"
    core: str = "condense"
    order: str = "shell"

    def __post_init__(self) -> None:
        # refuse an unknown style early, with the library's own error
        parse("1s1").format(style=self.style, core=self.core, order=self.order)


@dataclass(frozen=True, kw_only=True)
class ConfigurationCheck(_Options):
    """Validate a configuration cell (against a species cell when given) and rewrite it.

    Repairs run only when asked for and only on a value that fails without them, in this
    order: ``repair_text`` (undo mojibake with ftfy), ``accept_uppercase`` (read '2P6' as
    '2p6'), ``fill_core`` (add the noble-gas core a valence-only spelling leaves out, when
    that makes the electron count of the species right). Each one applied is named in
    :attr:`Outcome.fixes`.
    """

    roles: ClassVar[tuple[str, ...]] = ("configuration", "species")

    fill_core: bool = False
    repair_text: bool = False

    def __call__(self, *cells: str | None) -> Outcome:
        configuration = cells[0] if cells else None
        species = cells[1] if len(cells) > 1 else None
        original = configuration
        if configuration is None:
            return Outcome.make(validate_text(""))
        species = species.strip() if species is not None and species.strip() else None
        text = configuration
        if species is None:
            fast = fast_configuration(text)  # a common, valid spelling: nothing to repair
            if fast is not None:
                written = fast.format(style=self.style, core=self.core, order=self.order)
                if self.strict and str(fast) != text:
                    return Outcome.make([ConfspecPhysicsError(
                        "non-canonical", f"valid, but the canonical spelling is {str(fast)!r}",
                        position=None, text=text)], written, (), None, fast.electron_count)
                return Outcome.make((), written, (), None, fast.electron_count)
        fixes: list[str] = []
        upper = False
        config, errors = self._read(text, species, upper)
        if errors and self.repair_text:
            repaired = _repair_text(text)
            if repaired != text:
                text = repaired
                fixes.append("repair-text")
                config, errors = self._read(text, species, upper)
        if errors and self.accept_uppercase and errors[0].code == "uppercase-subshell":
            config2, errors2 = self._read(text, species, True)
            if not errors2 or errors2[0].code != "uppercase-subshell":
                upper, config, errors = True, config2, errors2
                fixes.append("accept-uppercase")
        if (errors and self.fill_core and species is not None and config is not None
                and [e.code for e in errors] == ["electron-count"]):
            filled = self._fill_core(text, config, species, upper)
            if filled is not None:
                added, text, config = filled
                errors = []
                fixes.append(f"fill-core:{added}")
        if config is not None:
            note = clean(text).note
            if note is not None:  # a footnote or provenance mark is kept, not dropped
                fixes.append(f"note:{note}")
        normalized = None if config is None else config.format(
            style=self.style, core=self.core, order=self.order)
        if self.strict and not errors and config is not None:
            canonical = str(config)
            if canonical != original:
                how = f"valid after {', '.join(fixes)}, but" if fixes else "valid, but"
                errors = [ConfspecPhysicsError(
                    "non-canonical", f"{how} the canonical spelling is {canonical!r}",
                    position=None, text=original)]
        return Outcome.make(errors, normalized if config is not None else None, fixes,
                            text if text != original else None,
                            None if config is None else config.electron_count)

    @staticmethod
    def _read(text: str, species: str | None, upper: bool
              ) -> tuple[Configuration | None, list[ConfspecError]]:
        """The configuration (None if unreadable) and every problem of the text.

        The common case (valid) costs one cached parse; only failures pay for
        :func:`confspec.validate` collecting all problems.
        """
        try:
            kind = _species(species) if species is not None else None
        except ConfspecError:
            return _config_only(text, upper), _about_species(
                validate_text(text, species, accept_uppercase=upper), species, text)
        try:
            config = parse(text, accept_uppercase=upper)
        except ConfspecError as err:
            if kind is None or err.code != "hole-without-reference":
                return None, validate_text(text, kind, accept_uppercase=upper)
            try:
                config = parse(text, species=kind, accept_uppercase=upper)
            except ConfspecError:
                return None, validate_text(text, kind, accept_uppercase=upper)
        if kind is not None and config.electron_count != kind.electron_count:
            return config, validate_text(text, kind, accept_uppercase=upper)
        return config, []

    def _fill_core(self, text: str, config: Configuration, species: str, upper: bool
                   ) -> tuple[str, str, Configuration] | None:
        kind = _species(species)
        deficit = kind.electron_count - config.electron_count
        written = {(s.n, s.l) for s in config.subshells}
        for symbol, electrons, subshells in _cores():
            if electrons != deficit or written & subshells:
                continue
            candidate = f"[{symbol}] {text.strip()}"
            filled, errors = self._read(candidate, species, upper)
            if filled is not None and not errors:
                return f"[{symbol}]", candidate, filled
        # level tables also leave out closed subshells below the written ones: Na 2p6.3s
        inner = implied_inner_subshells(written, deficit)
        if inner:
            config = Configuration._trusted([*inner, *config.occupancies])
            return " ".join(f"{subshell_label(n, l)}{e}" for n, l, e in inner), str(
                config), config
        return None


_J_DECIMAL = re_compile(r"^\s*(\d+)\.5\s*$")
_J_WHOLE = re_compile(r"^\s*(\d+)\.0*\s*$")


def _j_text(cell: str) -> str:
    """J as a level table writes it: ``4``, ``9/2``, a decimal ``4.5`` read as 9/2, a
    tentative ``[3]``, or ``5/2,3/2`` for unresolved fine structure (no single J: "")."""
    cell = clean(cell, notes=False).text.strip().rstrip("?").strip()
    if cell.startswith("[") and cell.endswith("]"):
        cell = cell[1:-1].strip()  # NIST brackets a tentative J
    if "," in cell:
        return ""
    decimal = _J_DECIMAL.match(cell)
    if decimal:
        return f"{2 * int(decimal.group(1)) + 1}/2"
    whole = _J_WHOLE.match(cell)
    if whole:  # a float column: 4.0
        return whole.group(1)
    return cell.strip()


@dataclass(frozen=True, kw_only=True)
class LevelCheck(_Options):
    """Validate a level designation (``3d6(5D)4s 6D9/2``) and rewrite it canonically.

    With ``term_column`` the configuration cell holds only the configuration and the term
    (and ``J``, from its own cell or written in the term) is joined to it before the check;
    the output then rewrites only the configuration. The consistency codes
    (term-not-allowed, parent-not-allowed, j-not-allowed, parity-mismatch, electron-count)
    are reported per row like every other code.
    """

    roles: ClassVar[tuple[str, ...]] = ("level", "species", "term", "j")

    term_column: bool = False

    def __call__(self, *cells: str | None) -> Outcome:
        from ._levels import parse_level, validate_level

        text, species, term, j = (*cells, None, None, None, None)[:4]
        if text is None or not text.strip():
            return Outcome.make(validate_text(text or ""))
        species = species.strip() if species is not None and species.strip() else None
        level_text = text
        config_text = clean(text, notes=False).text.strip()
        if term is not None and term.strip():
            term_text = _term_cell(term, j)
            if isinstance(term_text, ConfspecError):
                return Outcome.make([term_text])
            level_text = f"{config_text} {term_text}"
        elif j is not None and j.strip() and _j_text(j):
            # a level listed by J alone: J must be half-integer exactly for an odd number of
            # electrons (closed shells left unwritten hold an even number)
            j_value = _j_text(j)
            if not _J_TEXT.fullmatch(j_value):
                return Outcome.make([ConfspecSyntaxError(
                    "term-syntax", f"J column: {j.strip()!r} is not a J such as 4, 9/2 or 4.5",
                    position=0, text=j.strip())])
            if not validate_level(level_text, species, accept_uppercase=self.accept_uppercase):
                electrons = parse_level(level_text).configuration.electron_count
                if ("/" in j_value) != (electrons % 2 == 1):
                    return Outcome.make([ConfspecPhysicsError(
                        "j-not-allowed", f"J = {j_value} is impossible for {electrons} electrons"
                        ": J is half-integer exactly when the electron count is odd",
                        position=None, text=text)])
        problems = validate_level(level_text, species, accept_uppercase=self.accept_uppercase)
        if problems and level_text != text:
            # problems of the joined term point at the term cell, not past the configuration
            problems = [p if p.position is None or p.position <= len(config_text) else
                        type(p)(p.code, f"term {level_text[len(config_text) + 1:]!r}: "
                                f"{p.message}", position=len(config_text), text=text)
                        for p in problems]
        if problems:
            return Outcome.make(problems, checked=level_text if level_text != text else None)
        level = parse_level(level_text, accept_uppercase=self.accept_uppercase)
        if self.term_column:  # the term stays in its own column; parents stay here
            bare = level.model_copy(update={"term": None, "seniority": None, "uncertain": None})
            normalized = bare.format(self.style, core=self.core, order=self.order)
        else:
            normalized = level.format(self.style, core=self.core, order=self.order)
        errors: list[ConfspecError] = []
        if self.strict and normalized != text:
            errors.append(ConfspecPhysicsError(
                "non-canonical", f"valid, but the canonical spelling is {normalized!r}",
                position=None, text=text))
        return Outcome.make(errors, normalized, (), level_text if level_text != text else None,
                            level.configuration.electron_count)


def _term_cell(term: str, j: str | None) -> str | ConfspecError:
    """The term cell (and J cell) read on their own, written back as one term token, or
    the problem located in the cell it came from."""
    from ._terms import read_term

    cell = clean(term, notes=False).text.strip()
    query = cell.endswith("?")
    cell = cell.rstrip("?").strip()
    if cell.lower() == "limit":
        return ConfspecSyntaxError(
            "series-limit", "this row is the ionization limit of the table ('Limit'), not a "
            "level; nothing to check", position=0, text=term.strip())
    try:
        parsed, j_in_term, prefix, _ = read_term(cell)
    except ConfspecError as err:
        code = "term-syntax" if err.code == "syntax" else err.code
        return type(err)(code, f"term column: {err.message}", position=err.position, text=cell)
    if j is not None and j.strip() and j_in_term is None:
        j_text = _j_text(j)
        if j_text and not _J_TEXT.fullmatch(j_text):
            return ConfspecSyntaxError(
                "term-syntax", f"J column: {j.strip()!r} is not a J such as 4, 9/2 or 4.5",
                position=0, text=j.strip())
    else:
        j_text = "" if j_in_term is None else (
            str(j_in_term) if j_in_term.denominator == 1 else f"{j_in_term.numerator}/2")
    return f"{prefix or ''}{parsed}{j_text}" + (" ?" if query else "")


_J_TEXT = re_compile(r"\d+(?:/2)?")


def _config_only(text: str, upper: bool) -> Configuration | None:
    try:
        return parse(text, accept_uppercase=upper)
    except ConfspecError:
        return None


Key = tuple[str | None, ...] | str | None  # the cells of a row's roles (one role: the cell)


class RowJob:
    """Runs one check over rows, computing each distinct combination of cells once.

    Results of the most recently used inputs are kept in a least-recently-used cache of
    bounded size (``functools.lru_cache``), so memory stays flat however many distinct values
    a file has. A key is the cell itself for a one-column check, else the tuple of cells.
    """

    def __init__(self, check: Check, cache_size: int = DEFAULT_CACHE_SIZE) -> None:
        self.check = check
        self.cache_size = max(1, cache_size)
        self.computed = 0
        self._lookup = lru_cache(maxsize=self.cache_size)(self._compute)
        # the main process's cache when workers compute the misses (--jobs)
        self._cache: OrderedDict[Key, Outcome] = OrderedDict()

    def _compute(self, key: Key) -> Outcome:
        self.computed += 1
        return self.check(*key) if isinstance(key, tuple) else self.check(key)

    def outcome(self, key: Key) -> Outcome:
        result: Outcome = self._lookup(key)
        return result

    def outcomes(self, keys: Sequence[Key]) -> list[Outcome]:
        return list(map(self._lookup, keys))

    def known(self, key: Key) -> Outcome | None:
        hit = self._cache.get(key)
        if hit is not None:
            self._cache.move_to_end(key)
        return hit

    def remember(self, key: Key, outcome: Outcome) -> None:
        self._cache[key] = outcome
        if len(self._cache) > self.cache_size:
            self._cache.popitem(last=False)


# -- worker processes (--jobs): the main process keeps the cache, workers compute misses
_WORKER_JOB: RowJob | None = None


def _init_worker(check: Check, cache_size: int) -> None:
    global _WORKER_JOB
    _WORKER_JOB = RowJob(check, cache_size)


def _work(keys: list[Key]) -> list[Outcome]:
    assert _WORKER_JOB is not None
    return [_WORKER_JOB.outcome(key) for key in keys]


class _Pending:
    """A chunk whose outcomes are being computed in worker processes."""

    def __init__(self, chunk: Chunk, keys: list[Key], local: dict[Key, Outcome],
                 misses: list[Key], future: Future[list[Outcome]] | None):
        self.chunk, self.keys, self.local, self.misses, self.future = (
            chunk, keys, local, misses, future)

    def result(self, job: RowJob) -> list[Outcome]:
        if self.future is not None:
            for key, outcome in zip(self.misses, self.future.result(), strict=True):
                self.local[key] = outcome
                job.remember(key, outcome)
        return [self.local[k] for k in self.keys]


# ===================================================================== chunks and sources
@dataclass(slots=True)
class Chunk:
    """Consecutive rows of a source; ``first_row`` is the 1-based number of the first."""

    columns: list[str]
    rows: list[list[Any]]
    first_row: int
    lines: list[int] | None = None  # source line of each row (text formats)
    plain: bool = False  # cells are only str, None or numbers (no lists, dicts, MISSING)


class Source(Protocol):
    label: str
    columns: list[str]

    def chunks(self, size: int) -> Iterator[Chunk]: ...

    def fraction(self) -> float | None: ...

    def close(self) -> None: ...


def format_of(path: str, given: str | None) -> str:
    """The file format from ``given`` or from the extension (``.gz`` is looked through)."""
    if given:
        if given not in FORMATS:
            raise InputError(f"unknown format {given!r}; use one of: {', '.join(FORMATS)}")
        return given
    name = path.lower()
    if name.endswith(".gz"):
        name = name[:-3]
    suffix = os.path.splitext(name)[1]
    if suffix in _EXTENSIONS:
        return _EXTENSIONS[suffix]
    raise InputError(f"{path}: cannot tell the format from the extension {suffix or '(none)'!r}; "
                     f"give it with a format option ({', '.join(FORMATS)})")


def _open_binary(path: str, mode: str, *, compressed: bool | None = None) -> IO[bytes]:
    """A binary file (the caller closes it), through gzip when the name ends in ``.gz``."""
    if path.lower().endswith(".gz") if compressed is None else compressed:
        return cast(IO[bytes], gzip.open(path, mode))
    return cast(IO[bytes], open(path, mode))


def _open_text(path: str, encoding: str) -> IO[str]:
    if path.lower().endswith(".gz"):
        return io.TextIOWrapper(gzip.open(path, "rb"), encoding=encoding, newline="")
    return open(path, encoding=encoding, newline="")  # closed by the source


def _require_file(path: str) -> None:
    if not os.path.exists(path):
        raise InputError(f"{path}: no such file")
    if os.path.isdir(path):
        raise InputError(f"{path}: is a directory, not a file")
    if not os.access(path, os.R_OK):
        raise InputError(f"{path}: not readable (permission denied)")


def _first_bad_line(path: str, encoding: str) -> tuple[int, str]:
    """Line number and detail of the first line that does not decode (read again in binary)."""
    with _open_binary(path, "rb") as raw:
        for number, line in enumerate(raw, 1):
            try:
                line.decode(encoding)
            except UnicodeDecodeError as err:
                bad = line[err.start:err.start + 1]
                return number, f"byte 0x{bad.hex()} at column {err.start + 1}"
    return 0, "a byte sequence that does not decode"


class _TextSource:
    """Shared by CSV/TSV and JSON Lines: progress from the byte position, decode errors."""

    label: str
    columns: list[str]
    _handle: IO[str]

    def __init__(self, path: str, encoding: str) -> None:
        _require_file(path)
        self.label, self.path, self.encoding = path, path, encoding
        self._size = os.path.getsize(path)
        try:
            self._handle = _open_text(path, encoding)
        except LookupError:
            raise InputError(f"unknown encoding {encoding!r}") from None

    def fraction(self) -> float | None:
        if not self._size or self.path.lower().endswith(".gz"):
            return None
        try:
            position = int(cast(Any, self._handle).buffer.tell())
            return min(1.0, position / self._size)
        except (OSError, ValueError, AttributeError):
            return None

    def close(self) -> None:
        self._handle.close()

    def _decode_error(self) -> InputError:
        line, detail = _first_bad_line(self.path, self.encoding)
        where = f", line {line}" if line else ""
        return InputError(f"{self.path}{where}: not readable as {self.encoding} ({detail}); "
                          "give the file's encoding with --encoding")


class CsvSource(_TextSource):
    """CSV (or TSV) with a header row; quoting errors and ragged rows are refused by line."""

    def __init__(self, path: str, *, delimiter: str = ",", encoding: str = "utf-8-sig") -> None:
        super().__init__(path, encoding)
        dialect = "excel-tab" if delimiter == "\t" else "excel"
        self._reader = csv.reader(self._handle, dialect=dialect, strict=True)
        self.blank_lines = 0
        try:
            header = self._next()
        except StopIteration:
            self.close()
            raise InputError(f"{path}: the file is empty (no header row)") from None
        self.columns = header

    def _next(self) -> list[str]:
        try:
            return next(self._reader)
        except UnicodeDecodeError:
            raise self._decode_error() from None
        except csv.Error as err:
            raise InputError(f"{self.path}, line {self._reader.line_num}: malformed "
                             f"{'TSV' if self._reader.dialect.delimiter == chr(9) else 'CSV'}"
                             f" ({err})") from None

    def chunks(self, size: int) -> Iterator[Chunk]:
        width, number = len(self.columns), 0
        rows: list[list[Any]] = []
        lines: list[int] = []
        reader = self._reader
        try:
            for row in reader:
                if len(row) != width:
                    if row:
                        raise InputError(
                            f"{self.path}, line {reader.line_num}: {len(row)} fields where "
                            f"the header has {width}")
                    if width != 1:
                        self.blank_lines += 1
                        continue
                    row = [""]
                rows.append(row)
                lines.append(reader.line_num)
                if len(rows) >= size:
                    number += len(rows)
                    yield Chunk(self.columns, rows, number - len(rows) + 1, lines, plain=True)
                    rows, lines = [], []
        except UnicodeDecodeError:
            raise self._decode_error() from None
        except csv.Error as err:
            kind = "TSV" if reader.dialect.delimiter == "\t" else "CSV"
            raise InputError(f"{self.path}, line {reader.line_num}: malformed {kind} ({err})"
                             ) from None
        if rows:
            number += len(rows)
            yield Chunk(self.columns, rows, number - len(rows) + 1, lines, plain=True)


class JsonLinesSource(_TextSource):
    """One JSON object per line. Keys missing from a row stay missing on output."""

    def __init__(self, path: str, *, encoding: str = "utf-8-sig",
                 scan_keys: bool = False) -> None:
        super().__init__(path, encoding)
        self.columns = []
        self._index: dict[str, int] = {}
        self.blank_lines = 0
        if scan_keys:  # a tabular output needs every key before the first row is written
            for _, obj in self._objects():
                self._add_keys(obj)
            self.close()
            self._handle = _open_text(path, encoding)
        # the first object names the columns before any chunk is read (for early errors)
        self._stream = self._objects()
        self._first = next(self._stream, None)
        if self._first is not None:
            self._add_keys(self._first[1])

    def _add_keys(self, obj: dict[str, Any]) -> None:
        for key in obj:
            if key not in self._index:
                self._index[key] = len(self.columns)
                self.columns.append(key)

    def _objects(self) -> Iterator[tuple[int, dict[str, Any]]]:
        self.blank_lines = 0
        try:
            for number, line in enumerate(self._handle, 1):
                if not line.strip():
                    self.blank_lines += 1
                    continue
                try:
                    obj = json.loads(line)
                except json.JSONDecodeError as err:
                    raise InputError(f"{self.path}, line {number}: not valid JSON "
                                     f"({err.msg} at column {err.colno})") from None
                if not isinstance(obj, dict):
                    raise InputError(f"{self.path}, line {number}: a JSON "
                                     f"{type(obj).__name__} where an object was expected")
                yield number, obj
        except UnicodeDecodeError:
            raise self._decode_error() from None

    def _all(self) -> Iterator[tuple[int, dict[str, Any]]]:
        if self._first is not None:
            yield self._first
        yield from self._stream

    def chunks(self, size: int) -> Iterator[Chunk]:
        rows: list[list[Any]] = []
        lines: list[int] = []
        count = 0
        for line, obj in self._all():
            self._add_keys(obj)
            rows.append([obj.get(c, MISSING) for c in self.columns])
            lines.append(line)
            count += 1
            if len(rows) >= size:
                yield Chunk(list(self.columns), _pad(rows, len(self.columns)),
                            count - len(rows) + 1, lines)
                rows, lines = [], []
        if rows:
            yield Chunk(list(self.columns), _pad(rows, len(self.columns)),
                        count - len(rows) + 1, lines)


def _pad(rows: list[list[Any]], width: int) -> list[list[Any]]:
    for row in rows:
        if len(row) < width:
            row.extend([MISSING] * (width - len(row)))
    return rows


def _pyarrow() -> Any:
    try:
        import pyarrow  # type: ignore[import-untyped]
        import pyarrow.parquet  # type: ignore[import-untyped]
    except ImportError:
        raise InputError("Parquet needs pyarrow: pip install 'confspec[tables]'") from None
    return pyarrow


class ParquetSource:
    """Parquet read batch by batch; the column types are kept for a Parquet output."""

    def __init__(self, path: str) -> None:
        _require_file(path)
        pa = _pyarrow()
        self.label = path
        try:
            self._file = pa.parquet.ParquetFile(path)
        except (pa.ArrowException, OSError) as err:
            raise InputError(f"{path}: not a readable Parquet file ({_first_line(err)})") from None
        self.schema = self._file.schema_arrow
        self.columns = list(self.schema.names)
        self._rows_total = self._file.metadata.num_rows
        self._done = 0

    def chunks(self, size: int) -> Iterator[Chunk]:
        pa = _pyarrow()
        first = 1
        try:
            for batch in self._file.iter_batches(batch_size=size):
                columns = [column.to_pylist() for column in batch.columns]
                rows = [list(r) for r in zip(*columns, strict=True)] if columns else []
                yield Chunk(self.columns, rows, first)
                first += len(rows)
                self._done += len(rows)
        except pa.ArrowException as err:
            raise InputError(f"{self.label}: cannot read row group ({_first_line(err)})") from None

    def fraction(self) -> float | None:
        return self._done / self._rows_total if self._rows_total else None

    def close(self) -> None:
        self._file.close()


def _first_line(err: BaseException) -> str:
    text = str(err).strip().splitlines()
    return text[0] if text else type(err).__name__


# ===================================================================== databases
def is_database(target: str) -> bool:
    """A database URL (``scheme://...``) or a path to an SQLite file."""
    return "://" in target or target.lower().endswith(_SQLITE_EXTENSIONS)


def _sqlite_path(target: str) -> str | None:
    """The file of an SQLite target (``sqlite:///x.db``, a ``.db`` path), else None."""
    if "://" not in target:
        return target
    scheme, _, rest = target.partition("://")
    if scheme.split("+")[0] != "sqlite":
        return None
    if not rest.startswith("/") or rest == "/":
        raise InputError(f"{target}: an SQLite URL names a file: sqlite:///relative.db or "
                         "sqlite:////absolute/path.db")
    path = rest[1:].split("?")[0]
    return path


def _redact(url: str) -> str:
    """A URL without its password, for messages."""
    if "://" not in url or "@" not in url:
        return url
    scheme, _, rest = url.partition("://")
    auth, _, host = rest.rpartition("@")
    user = auth.split(":")[0]
    return f"{scheme}://{user}:***@{host}" if ":" in auth else url


class Database:
    """The few operations the jobs need, over stdlib sqlite3 or SQLAlchemy.

    The connection is in manual-transaction mode: :meth:`begin`, :meth:`commit` and
    :meth:`rollback` bracket a whole job.
    """

    label: str
    kind: str  # "sqlite" or the SQLAlchemy dialect name

    def quote(self, name: str) -> str:
        raise NotImplementedError

    def table_ref(self, table: str) -> str:
        return self.quote(table)

    def placeholders(self, count: int) -> str:
        raise NotImplementedError

    def tables(self) -> list[str]:
        raise NotImplementedError

    def has_table(self, table: str) -> bool:
        raise NotImplementedError

    def columns(self, table: str) -> list[str]:
        raise NotImplementedError

    def row_key(self, table: str) -> str | None:
        """A column that identifies rows (a one-column primary key, or SQLite's rowid)."""
        raise NotImplementedError

    def execute(self, sql: str, params: Sequence[Any] = ()) -> None:
        raise NotImplementedError

    def executemany(self, sql: str, rows: Sequence[Sequence[Any]]) -> None:
        raise NotImplementedError

    def stream(self, sql: str, size: int) -> Iterator[list[tuple[Any, ...]]]:
        raise NotImplementedError

    def begin(self) -> None:
        raise NotImplementedError

    def commit(self) -> None:
        raise NotImplementedError

    def rollback(self) -> None:
        raise NotImplementedError

    def close(self) -> None:
        raise NotImplementedError

    def error_types(self) -> tuple[type[BaseException], ...]:
        raise NotImplementedError

    def require_table(self, table: str) -> None:
        if not self.has_table(table):
            known = self.tables()
            listing = ", ".join(known[:12]) + (" …" if len(known) > 12 else "")
            raise InputError(f"{self.label}: no table {table!r}"
                             + (f"; tables: {listing}" if known else " (the database is empty)"))


class SqliteDatabase(Database):
    """SQLite through the standard library: the embedded default, no extra install."""

    kind = "sqlite"

    def __init__(self, path: str, *, create: bool, read_only: bool = False) -> None:
        self.path, self.label = path, path
        self.created = False
        if not create and not os.path.exists(path):
            raise InputError(f"{path}: no such database file")
        if os.path.isdir(path):
            raise InputError(f"{path}: is a directory, not a database file")
        self.created = create and not os.path.exists(path)
        try:
            if read_only:
                uri = "file:" + Path(path).resolve().as_posix() + "?mode=ro"
                self.conn = sqlite3.connect(uri, uri=True, isolation_level=None)
            else:
                self.conn = sqlite3.connect(path, isolation_level=None)
            self.conn.execute("SELECT count(*) FROM sqlite_master").fetchone()
        except sqlite3.DatabaseError as err:
            raise InputError(f"{path}: not an SQLite database ({err})") from None

    def quote(self, name: str) -> str:
        return '"' + name.replace('"', '""') + '"'

    def placeholders(self, count: int) -> str:
        return ", ".join("?" * count)

    def tables(self) -> list[str]:
        rows = self.conn.execute("SELECT name FROM sqlite_master WHERE type IN ('table', 'view')"
                                 " AND name NOT LIKE 'sqlite_%' ORDER BY name").fetchall()
        return [r[0] for r in rows]

    def has_table(self, table: str) -> bool:
        row = self.conn.execute("SELECT 1 FROM sqlite_master WHERE type IN ('table', 'view') "
                                "AND name = ?", (table,)).fetchone()
        return row is not None

    def columns(self, table: str) -> list[str]:
        return [r[1] for r in self.conn.execute(f"PRAGMA table_info({self.quote(table)})")]

    def row_key(self, table: str) -> str | None:
        try:
            self.conn.execute(f"SELECT rowid FROM {self.quote(table)} LIMIT 0")
            return "rowid"
        except sqlite3.OperationalError:
            keys = [r[1] for r in self.conn.execute(f"PRAGMA table_info({self.quote(table)})")
                    if r[5]]
            return keys[0] if len(keys) == 1 else None

    def execute(self, sql: str, params: Sequence[Any] = ()) -> None:
        self.conn.execute(sql, tuple(params))

    def executemany(self, sql: str, rows: Sequence[Sequence[Any]]) -> None:
        self.conn.executemany(sql, rows)

    def stream(self, sql: str, size: int) -> Iterator[list[tuple[Any, ...]]]:
        cursor = self.conn.cursor()
        cursor.execute(sql)
        try:
            while batch := cursor.fetchmany(size):
                yield batch
        finally:
            cursor.close()

    def begin(self) -> None:
        self.conn.execute("BEGIN")

    def commit(self) -> None:
        self.conn.execute("COMMIT")

    def rollback(self) -> None:
        if self.conn.in_transaction:
            self.conn.execute("ROLLBACK")

    def close(self) -> None:
        self.conn.close()

    def error_types(self) -> tuple[type[BaseException], ...]:
        return (sqlite3.Error,)


class AlchemyDatabase(Database):
    """Any database SQLAlchemy reaches (PostgreSQL through psycopg, ...)."""

    def __init__(self, url: str) -> None:
        try:
            import sqlalchemy
        except ImportError:
            raise InputError(f"{_redact(url)}: databases other than SQLite need SQLAlchemy: "
                             "pip install 'confspec[sql]'") from None
        self._sa = sqlalchemy
        self.label = _redact(url)
        try:
            self.engine = sqlalchemy.create_engine(url)
        except (sqlalchemy.exc.ArgumentError, sqlalchemy.exc.NoSuchModuleError,
                ImportError, ValueError) as err:
            raise InputError(f"{self.label}: not a usable database URL ({_first_line(err)})"
                             ) from None
        self.kind = self.engine.dialect.name
        try:
            self.conn = self.engine.connect()
        except sqlalchemy.exc.SQLAlchemyError as err:
            raise InputError(f"{self.label}: cannot connect ({_first_line(err.orig or err)})"
                             if isinstance(err, sqlalchemy.exc.DBAPIError)
                             else f"{self.label}: cannot connect ({_first_line(err)})") from None
        self._inspector = sqlalchemy.inspect(self.conn)
        self.conn.rollback()  # reflection opened a transaction; jobs begin their own

    def quote(self, name: str) -> str:
        quoted: str = self.engine.dialect.identifier_preparer.quote_identifier(name)
        return quoted

    def _split(self, table: str) -> tuple[str | None, str]:
        if "." in table:
            schema, _, name = table.partition(".")
            return schema, name
        return None, table

    def table_ref(self, table: str) -> str:
        schema, name = self._split(table)
        return (self.quote(schema) + "." if schema else "") + self.quote(name)

    def placeholders(self, count: int) -> str:
        style = self.engine.dialect.paramstyle
        if style == "qmark":
            return ", ".join("?" * count)
        if style == "numeric":
            return ", ".join(f":{i + 1}" for i in range(count))
        return ", ".join(["%s"] * count)

    def tables(self) -> list[str]:
        self._inspector = self._sa.inspect(self.conn)
        return sorted(self._inspector.get_table_names() + self._inspector.get_view_names())

    def has_table(self, table: str) -> bool:
        schema, name = self._split(table)
        return bool(self._sa.inspect(self.conn).has_table(name, schema=schema))

    def columns(self, table: str) -> list[str]:
        schema, name = self._split(table)
        return [c["name"] for c in self._sa.inspect(self.conn).get_columns(name, schema=schema)]

    def row_key(self, table: str) -> str | None:
        schema, name = self._split(table)
        keys = self._sa.inspect(self.conn).get_pk_constraint(name, schema=schema)
        columns = keys.get("constrained_columns") or []
        return columns[0] if len(columns) == 1 else None

    def execute(self, sql: str, params: Sequence[Any] = ()) -> None:
        self.conn.exec_driver_sql(sql, tuple(params))

    def executemany(self, sql: str, rows: Sequence[Sequence[Any]]) -> None:
        if rows:
            self.conn.exec_driver_sql(sql, [tuple(r) for r in rows])

    def stream(self, sql: str, size: int) -> Iterator[list[tuple[Any, ...]]]:
        # options for this statement only: Connection.execution_options() would change the
        # connection itself, and every later statement would run in a server-side cursor
        result = self.conn.exec_driver_sql(
            sql, execution_options={"stream_results": True, "max_row_buffer": size})
        try:
            for part in result.partitions(size):
                yield [tuple(r) for r in part]
        finally:
            result.close()

    def begin(self) -> None:
        if not self.conn.in_transaction():
            self.conn.begin()

    def commit(self) -> None:
        self.conn.commit()

    def rollback(self) -> None:
        self.conn.rollback()

    def close(self) -> None:
        self.conn.close()
        self.engine.dispose()

    def error_types(self) -> tuple[type[BaseException], ...]:
        return (self._sa.exc.SQLAlchemyError,)


def open_database(target: str, *, create: bool = False, read_only: bool = False) -> Database:
    path = _sqlite_path(target)
    if path is not None:
        return SqliteDatabase(path, create=create, read_only=read_only)
    return AlchemyDatabase(target)


def same_database(a: str, b: str) -> bool:
    pa, pb = _sqlite_path(a), _sqlite_path(b)
    if pa is not None and pb is not None:
        try:
            return os.path.exists(pa) and os.path.exists(pb) and os.path.samefile(pa, pb)
        except OSError:
            return False
    return a == b


class TableSource:
    """Rows of a database table, in a stable order (rowid or primary key when there is one).

    With ``keyed=True`` only ``only`` columns are read, after the row key (for in-place
    updates); the key comes first under the name :data:`KEY_COLUMN`.
    """

    def __init__(self, db: Database, table: str, *, only: Sequence[str] | None = None,
                 keyed: bool = False) -> None:
        db.require_table(table)
        self.db, self.table = db, table
        self.label = f"{db.label} table {table}"
        self.all_columns = db.columns(table)
        self.key = db.row_key(table)
        if keyed and self.key is None:
            raise InputError(f"{self.label}: no primary key to update rows by; write a new "
                             "table instead (-o)")
        self._read = list(only) if only is not None else list(self.all_columns)
        self.keyed = keyed
        self.columns = ([KEY_COLUMN] if keyed else []) + self._read
        self._done = 0
        self._total: int | None = None

    def _key_ref(self) -> str:
        assert self.key is not None
        return "rowid" if self.key == "rowid" else self.db.quote(self.key)

    def select(self) -> str:
        names = ", ".join(self.db.quote(c) for c in self._read)
        if self.keyed:
            names = f"{self._key_ref()}, {names}"
        order = f" ORDER BY {self._key_ref()}" if self.key is not None else ""
        return f"SELECT {names} FROM {self.db.table_ref(self.table)}{order}"

    def count_rows(self) -> None:
        """Count the rows first, so the progress display can show a fraction."""
        for batch in self.db.stream(f"SELECT count(*) FROM {self.db.table_ref(self.table)}", 1):
            self._total = int(batch[0][0])

    def chunks(self, size: int) -> Iterator[Chunk]:
        first = 1
        for batch in self.db.stream(self.select(), size):
            rows = [list(r) for r in batch]
            yield Chunk(self.columns, rows, first)
            first += len(rows)
            self._done += len(rows)

    def fraction(self) -> float | None:
        if self._total is None:
            return None
        return self._done / self._total if self._total else None

    def close(self) -> None:
        """The database is closed by whoever opened it."""


KEY_COLUMN = "\0row-key"


class InPlaceSink:
    """Adds columns to the source table and fills them, all inside one transaction.

    Results go to a temporary staging table while the source is read; one ``UPDATE ... FROM``
    joins them back by the row key at the end, so the table is never changed under an open
    read.
    """

    def __init__(self, source: TableSource, new_columns: Sequence[str]) -> None:
        db, self.db, self.source = source.db, source.db, source
        self.new_columns = list(new_columns)
        clash = [c for c in self.new_columns if c in source.all_columns]
        if clash:
            raise InputError(f"{source.label}: the column {clash[0]!r} exists already; choose "
                             "another name")
        ref = db.table_ref(source.table)
        self.stage = "confspec_stage"
        db.begin()
        for column in self.new_columns:
            db.execute(f"ALTER TABLE {ref} ADD COLUMN {db.quote(column)} TEXT")
        key = source._key_ref()
        db.execute(f"CREATE TEMPORARY TABLE {self.stage} AS SELECT {key} AS k FROM {ref} "
                   "WHERE 1 = 0")
        for index in range(len(self.new_columns)):
            db.execute(f"ALTER TABLE {self.stage} ADD COLUMN v{index} TEXT")
        self._sql = (f"INSERT INTO {self.stage} VALUES "
                     f"({db.placeholders(len(self.new_columns) + 1)})")

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        self.db.executemany(self._sql, rows)

    def commit(self) -> None:
        db, source = self.db, self.source
        ref = db.table_ref(source.table)
        sets = ", ".join(f"{db.quote(c)} = s.v{i}" for i, c in enumerate(self.new_columns))
        db.execute(f"UPDATE {ref} SET {sets} FROM {self.stage} AS s "
                   f"WHERE {ref}.{source._key_ref()} = s.k")
        db.execute(f"DROP TABLE {self.stage}")
        db.commit()

    def abort(self) -> None:
        self.db.rollback()


# ===================================================================== sinks
class Sink(Protocol):
    """Where output rows go; ``plain`` says the cells are only str, None or numbers."""

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None: ...

    def commit(self) -> None: ...

    def abort(self) -> None: ...


class _AtomicPath:
    """A temporary file beside ``path``, renamed onto it by :meth:`commit`."""

    def __init__(self, path: str) -> None:
        directory = os.path.dirname(os.path.abspath(path))
        if not os.path.isdir(directory):
            raise InputError(f"{path}: the directory {directory} does not exist")
        if os.path.isdir(path):
            raise InputError(f"{path}: is a directory")
        self.path = path
        handle, self.temp = tempfile.mkstemp(dir=directory,
                                             prefix=f".{os.path.basename(path)}.",
                                             suffix=".partial")
        os.close(handle)

    def commit(self) -> None:
        os.replace(self.temp, self.path)

    def abort(self) -> None:
        with contextlib.suppress(FileNotFoundError):
            os.unlink(self.temp)


def _text_cell(value: Any) -> Any:
    if value is None or value is MISSING:
        return ""
    if isinstance(value, dict | list):
        return json.dumps(value, ensure_ascii=False)
    return value


class CsvSink:
    """CSV or TSV, header first; ``.gz`` targets are compressed."""

    def __init__(self, path: str, *, delimiter: str = ",", encoding: str = "utf-8") -> None:
        self._atomic = _AtomicPath(path)
        raw = _open_binary(self._atomic.temp, "wb", compressed=path.lower().endswith(".gz"))
        self._handle = io.TextIOWrapper(raw, encoding=encoding, newline="")
        dialect = "excel-tab" if delimiter == "\t" else "excel"
        self._writer = csv.writer(self._handle, dialect=dialect, lineterminator="\n")
        self._header: list[str] | None = None

    def write(self, columns: list[str], rows: list[list[Any]], *, plain: bool = False) -> None:
        if self._header is None:
            self._header = list(columns)
            self._writer.writerow(columns)
        elif columns != self._header:
            raise InputError("a row has fields the first rows lack; write JSON Lines instead")
        if plain:  # the csv module writes None (and MISSING) as an empty field
            self._writer.writerows(rows)
        else:
            self._writer.writerows([_text_cell(v) for v in row] for row in rows)

    def commit(self) -> None:
        self._handle.close()
        self._atomic.commit()

    def abort(self) -> None:
        self._handle.close()
        self._atomic.abort()


class JsonLinesSink:
    """One JSON object per row; cells a row did not have stay absent."""

    def __init__(self, path: str) -> None:
        self._atomic = _AtomicPath(path)
        raw = _open_binary(self._atomic.temp, "wb", compressed=path.lower().endswith(".gz"))
        self._handle = io.TextIOWrapper(raw, encoding="utf-8", newline="\n")

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        dumps = json.dumps
        self._handle.write("".join(
            dumps({c: v for c, v in zip(columns, row, strict=True) if v is not MISSING},
                  ensure_ascii=False, default=str) + "\n" for row in rows))

    def commit(self) -> None:
        self._handle.flush()
        self._handle.close()
        self._atomic.commit()

    def abort(self) -> None:
        self._handle.close()
        self._atomic.abort()


class ParquetSink:
    """Parquet written row group by row group; input column types are kept when known."""

    def __init__(self, path: str, *, types: dict[str, Any] | None = None) -> None:
        self._pa = _pyarrow()
        self._atomic = _AtomicPath(path)
        self._types = dict(types or {})
        self._writer: Any = None
        self._schema: Any = None

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        pa = self._pa
        data = [list(c) for c in zip(*rows, strict=True)] if rows else [[] for _ in columns]
        if self._schema is None:
            fields = []
            for name, values in zip(columns, data, strict=True):
                values = [None if v is MISSING else v for v in values]
                kind = self._types.get(name)
                if kind is None:
                    try:
                        kind = pa.array(values).type
                    except (pa.ArrowException, TypeError):
                        kind = pa.string()
                    if pa.types.is_null(kind):
                        kind = pa.string()
                fields.append(pa.field(name, kind))
            self._schema = pa.schema(fields)
            self._writer = pa.parquet.ParquetWriter(self._atomic.temp, self._schema)
        elif list(self._schema.names) != columns:
            raise InputError("a row has fields the first rows lack; write JSON Lines instead")
        arrays = []
        for spec, values in zip(self._schema, data, strict=True):
            values = [None if v is MISSING else v for v in values]
            try:
                arrays.append(pa.array(values, type=spec.type))
            except (pa.ArrowException, TypeError, ValueError):
                arrays.append(pa.array([None if v is None else _text_cell(v) for v in values],
                                       type=pa.string()).cast(spec.type, safe=False)
                              if pa.types.is_string(spec.type) else _refuse(spec))
        self._writer.write_table(pa.Table.from_arrays(arrays, schema=self._schema))

    def commit(self) -> None:
        if self._writer is None:  # no rows at all: still write a valid (empty) file
            self._writer = self._pa.parquet.ParquetWriter(self._atomic.temp,
                                                          self._pa.schema([]))
        self._writer.close()
        self._atomic.commit()

    def abort(self) -> None:
        if self._writer is not None:
            self._writer.close()
        self._atomic.abort()


def _refuse(spec: Any) -> Any:
    raise InputError(f"column {spec.name!r}: values of more than one type do not fit the "
                     f"Parquet type {spec.type}; write CSV or JSON Lines instead")


def _db_value(value: Any) -> Any:
    if value is MISSING:
        return None
    if isinstance(value, dict | list):
        return json.dumps(value, ensure_ascii=False)
    return value


class TableSink:
    """A new table, created and filled inside one transaction (committed at the end)."""

    def __init__(self, db: Database, table: str, *, overwrite: bool = False,
                 like: TableSource | None = None, text_columns: Sequence[str] = ()) -> None:
        self.db, self.table = db, table
        self._like, self._text_columns = like, list(text_columns)
        self._created = False
        self._sql = ""
        db.begin()
        if db.has_table(table):
            if not overwrite:
                db.rollback()
                raise InputError(f"{db.label}: the table {table!r} exists already; choose "
                                 "another name or pass --overwrite")
            db.execute(f"DROP TABLE {db.table_ref(table)}")

    def _create(self, columns: list[str], rows: list[list[Any]]) -> None:
        db, ref = self.db, self.db.table_ref(self.table)
        like = self._like
        if like is not None and like.db is db:
            # same database: copy the declared column types of the source table
            copied = [c for c in columns if c in like.columns]
            names = ", ".join(db.quote(c) for c in copied)
            db.execute(f"CREATE TABLE {ref} AS SELECT {names} FROM "
                       f"{db.table_ref(like.table)} WHERE 1 = 0")
            for column in self._text_columns:
                if column in copied and db.kind == "postgresql":
                    db.execute(f"ALTER TABLE {ref} ALTER COLUMN {db.quote(column)} TYPE TEXT")
            for column in columns:
                if column not in copied:
                    db.execute(f"ALTER TABLE {ref} ADD COLUMN {db.quote(column)} TEXT")
        else:
            kinds = [_sql_type(db, [r[i] for r in rows]) for i in range(len(columns))]
            body = ", ".join(f"{db.quote(c)} {k}".rstrip() for c, k in
                             zip(columns, kinds, strict=True))
            db.execute(f"CREATE TABLE {ref} ({body})")
        self._sql = (f"INSERT INTO {ref} ({', '.join(db.quote(c) for c in columns)}) "
                     f"VALUES ({db.placeholders(len(columns))})")
        self._columns = list(columns)
        self._created = True

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        if not self._created:
            self._create(columns, rows)
        elif columns != self._columns:
            raise InputError("a row has fields the first rows lack; write JSON Lines instead")
        self.db.executemany(self._sql, [[_db_value(v) for v in row] for row in rows])

    def commit(self) -> None:
        if not self._created:
            raise InputError("nothing to write")  # pragma: no cover - run() writes headers
        self.db.commit()

    def abort(self) -> None:
        self.db.rollback()


def _sql_type(db: Database, values: list[Any]) -> str:
    """A column type for values from a file: TEXT unless every value is a number or bool."""
    seen = {type(v) for v in values if v is not None and v is not MISSING}
    if db.kind == "sqlite":
        return "" if seen and seen <= {int, float, bool} else "TEXT"
    if seen and seen <= {bool}:
        return "BOOLEAN"
    if seen and seen <= {int}:
        return "BIGINT"
    if seen and seen <= {int, float}:
        return "DOUBLE PRECISION"
    return "TEXT"


# ===================================================================== the run
@dataclass
class Example:
    """A bad row kept for the summary."""

    row: int
    line: int | None
    value: Any
    outcome: Outcome


@dataclass
class Summary:
    """Counts over a whole run, and the first few bad rows."""

    rows: int = 0
    valid: int = 0
    by_code: Counter[str] = field(default_factory=Counter)
    fixes: Counter[str] = field(default_factory=Counter)
    repaired_rows: int = 0
    examples: list[Example] = field(default_factory=list)
    keep: int = 5
    distinct_computed: int = 0
    blank_lines: int = 0
    seconds: float = 0.0

    @property
    def invalid(self) -> int:
        return self.rows - self.valid

    def add(self, chunk: Chunk, value_at: int, outcomes: list[Outcome]) -> None:
        self.rows += len(outcomes)
        distinct = dict(zip(map(id, outcomes), outcomes, strict=True))
        for key, count in Counter(map(id, outcomes)).items():
            outcome = distinct[key]
            if outcome.fixes:
                self.repaired_rows += count
                for fix in outcome.fixes:
                    self.fixes[fix.split(":")[0]] += count
            if outcome.errors:
                self.by_code[outcome.errors[0].code] += count
            else:
                self.valid += count
        if len(self.examples) >= self.keep or all(o.ok for o in distinct.values()):
            return
        for index, outcome in enumerate(outcomes):
            if outcome.errors:
                line = chunk.lines[index] if chunk.lines else None
                self.examples.append(Example(chunk.first_row + index, line,
                                             chunk.rows[index][value_at], outcome))
                if len(self.examples) >= self.keep:
                    return


class Progress:
    """A one-line progress display on stderr, only when stderr is a terminal."""

    def __init__(self, enabled: bool | None = None, stream: IO[str] | None = None) -> None:
        self.stream = stream or sys.stderr
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self._start = time.monotonic()
        self._last = 0.0

    def update(self, rows: int, fraction: float | None) -> None:
        if not self.enabled:
            return
        now = time.monotonic()
        if now - self._last < 0.2:
            return
        self._last = now
        rate = rows / max(now - self._start, 1e-9)
        part = f"  {fraction:4.0%}" if fraction is not None else ""
        bar = ""
        if fraction is not None:
            filled = int(fraction * 24)
            bar = "  [" + "#" * filled + "." * (24 - filled) + "]"
        self.stream.write(f"\r  {rows:>12,} rows{part}{bar}  {rate:>10,.0f} rows/s ")
        self.stream.flush()

    def done(self) -> None:
        if self.enabled:
            self.stream.write("\r" + " " * 78 + "\r")
            self.stream.flush()


RowWriter = Callable[[Chunk, list[Outcome]], tuple[list[str], list[list[Any]]]]


def report_rows(role_columns: Sequence[int]) -> RowWriter:
    """The report: ``row, input, status, code, message, normalized, fixes`` per input row."""
    value_at = role_columns[0]
    columns = ["row", "input", "status", "code", "message", "normalized", "fixes"]

    def build(chunk: Chunk, outcomes: list[Outcome]) -> tuple[list[str], list[list[Any]]]:
        first = chunk.first_row
        return columns, [
            [first + i, _report_input(row[value_at]), o.status, o.code, o.message,
             o.normalized, o.fixes_text]
            for i, (row, o) in enumerate(zip(chunk.rows, outcomes, strict=True))]

    return build


def _report_input(value: Any) -> Any:
    return None if value is MISSING else value


@dataclass(frozen=True)
class OutputColumns:
    """The names normalize adds beside the rewritten column."""

    status: str = "status"
    code: str = "code"
    fixes: str = "fixes"
    original: str | None = None  # keep the original text in this column, when given

    def names(self) -> list[str]:
        return [n for n in (self.original, self.status, self.code, self.fixes) if n]


def normalized_rows(value_at: int, extra: OutputColumns) -> RowWriter:
    """Input rows with the value rewritten when it could be read, plus status columns."""

    def build(chunk: Chunk, outcomes: list[Outcome]) -> tuple[list[str], list[list[Any]]]:
        clash = [n for n in extra.names() if n in chunk.columns]
        if clash:
            raise InputError(f"the input already has a column {clash[0]!r}; choose other names "
                             "for the added columns (--status-column, --code-column, "
                             "--fixes-column, --keep-original)")
        columns = [*chunk.columns, *extra.names()]
        rows = chunk.rows
        if extra.original is not None:
            for row, o in zip(rows, outcomes, strict=True):
                row += (row[value_at], o.status, o.code, o.fixes_text)
                if o.rewritten:
                    row[value_at] = o.normalized
            return columns, rows
        for row, o in zip(rows, outcomes, strict=True):
            if o.rewritten:
                row[value_at] = o.normalized
            row += o.tail
        return columns, rows

    return build


def in_place_rows(value_at: int, extra: OutputColumns) -> RowWriter:
    """(row key, rewritten value, status columns) for :class:`InPlaceSink`."""

    def build(chunk: Chunk, outcomes: list[Outcome]) -> tuple[list[str], list[list[Any]]]:
        rows = []
        for row, outcome in zip(chunk.rows, outcomes, strict=True):
            value = outcome.normalized if outcome.rewritten else cell_text(row[value_at])
            rows.append([row[0], value, outcome.status, outcome.code, outcome.fixes_text])
        return [], rows

    return build


def _keys(chunk: Chunk, positions: Sequence[int]) -> list[Key]:
    rows = chunk.rows
    if len(positions) == 1:
        (a,) = positions
        if chunk.plain:  # CSV cells are already str
            return [r[a] for r in rows]
        return [v if type(v) is str else cell_text(v) for v in (r[a] for r in rows)]
    return [tuple(v if type(v) is str else cell_text(v)
                  for v in (r[p] if p >= 0 else None for p in positions))
            for r in rows]


def locate(columns: Sequence[str], wanted: str, label: str) -> int:
    """The index of a column, or a one-line error naming the columns there are."""
    if wanted in columns:
        if list(columns).count(wanted) > 1:
            raise InputError(f"{label}: the column {wanted!r} appears more than once")
        return list(columns).index(wanted)
    folded = [c for c in columns if c.lower() == wanted.lower()]
    hint = f"; did you mean {folded[0]!r}?" if folded else ""
    listing = ", ".join(repr(c) for c in list(columns)[:20])
    raise InputError(f"{label}: no column {wanted!r}{hint} (columns: {listing})")


def run(source: Source, job: RowJob, role_columns: Sequence[str | None], *,
        writers: Sequence[tuple[Sink, RowWriter]] = (), chunk_size: int = DEFAULT_CHUNK_ROWS,
        jobs: int = 1, progress: Progress | None = None, keep_examples: int = 5) -> Summary:
    """Stream ``source`` through ``job``; every sink gets one output row per input row.

    ``role_columns`` names the column of each role of the check (None: not given). On any
    error every sink is aborted (temporary files removed, transactions rolled back).
    """
    started = time.monotonic()
    summary = Summary(keep=keep_examples)
    progress = progress or Progress(enabled=False)
    positions: list[int] | None = None
    value_at = 0
    pool: ProcessPoolExecutor | None = None
    if jobs > 1:
        pool = ProcessPoolExecutor(max_workers=jobs, mp_context=get_context("spawn"),
                                   initializer=_init_worker,
                                   initargs=(job.check, job.cache_size))
    pending: list[_Pending] = []

    def finish(item: _Pending) -> None:
        outcomes = item.result(job)
        chunk = item.chunk
        summary.add(chunk, value_at, outcomes)
        last = len(writers) - 1
        for index, (sink, build) in enumerate(writers):
            # a builder may rewrite rows in place: all but the last get a copy
            columns, rows = build(chunk if index == last else _copy(chunk), outcomes)
            sink.write(columns, rows, plain=chunk.plain)
        progress.update(summary.rows, source.fraction())

    try:
        header_checked = False
        for chunk in source.chunks(chunk_size):
            if not header_checked:
                positions = _positions(chunk.columns, role_columns, source.label)
                value_at = positions[0]
                header_checked = True
            assert positions is not None
            keys = _keys(chunk, positions)
            if pool is None:
                finish(_Pending(chunk, keys, dict(zip(keys, job.outcomes(keys), strict=True)),
                                [], None))
                continue
            local: dict[Key, Outcome] = {}
            missing: dict[Key, None] = {}  # ordered set
            for key in keys:
                if key in local or key in missing:
                    continue
                hit = job.known(key)
                if hit is None:
                    missing[key] = None
                else:
                    local[key] = hit
            misses = list(missing)
            future = pool.submit(_work, misses) if misses else None
            pending.append(_Pending(chunk, keys, local, misses, future))
            while len(pending) > 2 * jobs:
                finish(pending.pop(0))
        while pending:
            finish(pending.pop(0))
        if not header_checked:
            _positions(source.columns, role_columns, source.label)
            for sink, build in writers:
                empty = Chunk(list(source.columns), [], 1)
                columns, rows = build(empty, [])
                sink.write(columns, rows, plain=True)
        for sink, _ in writers:
            sink.commit()
    except BaseException:
        for sink, _ in writers:
            with contextlib.suppress(Exception):  # the first error is the one to report
                sink.abort()
        raise
    finally:
        if pool is not None:
            pool.shutdown(wait=True, cancel_futures=True)
        progress.done()
    summary.distinct_computed = job.computed
    summary.blank_lines = int(getattr(source, "blank_lines", 0))
    summary.seconds = time.monotonic() - started
    return summary


def _copy(chunk: Chunk) -> Chunk:
    return Chunk(chunk.columns, [list(r) for r in chunk.rows], chunk.first_row, chunk.lines,
                 chunk.plain)


def _positions(columns: Sequence[str], role_columns: Sequence[str | None], label: str
               ) -> list[int]:
    """Column index of each role. Roles are positional: trailing roles without a column are
    left out (the check then receives fewer cells)."""
    names = list(role_columns)
    while names and names[-1] is None:
        names.pop()
    if not names or names[0] is None:
        raise InputError("the first role (the value column) must be given")
    # a role in the middle without a column reads as an empty cell (position -1)
    return [-1 if n is None else locate(columns, n, label) for n in names]
