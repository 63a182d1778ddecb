"""The run loop: every row read is one row written, in order, whatever its content.

A cell that cannot be read keeps its text and is flagged; the summary counts codes and keeps
examples; progress is shown on a TTY.
"""

from __future__ import annotations

import contextlib
import sys
import time
from collections import Counter
from collections.abc import Callable, Sequence
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from multiprocessing import get_context
from typing import IO, Any

from ..errors import ConfspecSyntaxError
from .check import MISSING, InputError, Key, Outcome, cell_text
from .job import Chunk, RowJob, RowMark, Sink, Source, _init_worker, _Pending, _work

__all__ = [
    "DEFAULT_CHUNK_ROWS",
    "Example",
    "OutputColumns",
    "Progress",
    "RowWriter",
    "Summary",
    "in_place_rows",
    "locate",
    "normalized_rows",
    "report_rows",
    "run",
]

DEFAULT_CHUNK_ROWS = 10_000
#: Characters of a bad value kept in the summary's examples (the output keeps all of it).
EXAMPLE_CHARS = 200



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
    filled_cells: int = 0  # blank cells a reader filled from the row above (NIST text)
    seconds: float = 0.0

    @property
    def invalid(self) -> int:
        return self.rows - self.valid

    def as_dict(self) -> dict[str, Any]:
        """The counts and examples as JSON-ready data (the CLI's ``--summary-json``)."""
        return {
            "rows": self.rows,
            "valid": self.valid,
            "invalid": self.invalid,
            "by_code": dict(self.by_code.most_common()),
            "repaired_rows": self.repaired_rows,
            "fixes": dict(self.fixes.most_common()),
            "blank_lines": self.blank_lines,
            "filled_cells": self.filled_cells,
            "distinct_computed": self.distinct_computed,
            "seconds": round(self.seconds, 3),
            "examples": [{
                "row": ex.row, "line": ex.line, "code": ex.outcome.code,
                "message": ex.outcome.message, "value": _json_value(ex.value),
                "fixes": list(ex.outcome.fixes)} for ex in self.examples],
        }

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
                                             _example_value(chunk.rows[index][value_at]),
                                             outcome))
                if len(self.examples) >= self.keep:
                    return


def _example_value(value: Any) -> Any:
    """A bad value as the summary keeps it: a long text is cut (memory stays flat)."""
    if isinstance(value, str) and len(value) > EXAMPLE_CHARS:
        return value[:EXAMPLE_CHARS] + "…"
    if isinstance(value, bytes) and len(value) > EXAMPLE_CHARS:
        return value[:EXAMPLE_CHARS] + b"..."
    return value


def _json_value(value: Any) -> Any:
    if value is MISSING:
        return None
    if value is None or isinstance(value, str | int | float | bool):
        return value
    return cell_text(value)


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
    read_at: dict[int, float | None] = {}  # id(pending) -> the source's fraction after it

    def finish(item: _Pending) -> None:
        fraction = read_at.pop(id(item), None) if read_at else source.fraction()
        outcomes = item.result(job)
        chunk = item.chunk
        if chunk.marks is not None:
            outcomes = _marked(chunk.marks, outcomes)
        summary.add(chunk, value_at, outcomes)
        last = len(writers) - 1
        for index, (sink, build) in enumerate(writers):
            # a builder may rewrite rows in place: all but the last get a copy
            columns, rows = build(chunk if index == last else _copy(chunk), outcomes)
            sink.write(columns, rows, plain=chunk.plain)
        progress.update(summary.rows, fraction)

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
            item = _Pending(chunk, keys, local, misses, future)
            pending.append(item)
            read_at[id(item)] = source.fraction()  # the workers finish it later
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
    summary.filled_cells = int(getattr(source, "filled_cells", 0))
    summary.seconds = time.monotonic() - started
    return summary


def _copy(chunk: Chunk) -> Chunk:
    return Chunk(chunk.columns, [list(r) for r in chunk.rows], chunk.first_row, chunk.lines,
                 chunk.plain, chunk.marks)


def _marked(marks: Sequence[RowMark | None], outcomes: list[Outcome]) -> list[Outcome]:
    """The outcomes with what the reader found recorded on them (each distinct pair once)."""
    made: dict[tuple[int, RowMark], Outcome] = {}
    out = []
    for mark, outcome in zip(marks, outcomes, strict=True):
        if mark is None:
            out.append(outcome)
            continue
        key = (id(outcome), mark)
        hit = made.get(key)
        if hit is None:
            hit = made[key] = _with_mark(mark, outcome)
        out.append(hit)
    return out


def _with_mark(mark: RowMark, outcome: Outcome) -> Outcome:
    if mark.limit_column is not None:  # as level mode reports a 'Limit' term, in every mode
        return Outcome.make([ConfspecSyntaxError(
            "series-limit", f"this row is the ionization limit of the table "
            f"({mark.limit_text!r} in column {mark.limit_column!r}), not a level or a "
            "configuration; nothing to check", position=0, text=mark.limit_text)],
            fixes=mark.fixes)
    # the reader's entries first: it filled the cells before the check read them
    return Outcome.make(outcome.errors, outcome.normalized, (*mark.fixes, *outcome.fixes),
                        outcome.checked, outcome.electrons)


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
