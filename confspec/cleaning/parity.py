"""The automatic parity convention: a level or term column in which no row writes an odd
mark (°, *, o, O) is a table that leaves parity unmarked, not a table of even terms.

The decision needs the whole column before the first row is checked, so a re-readable
input is read once more for it; standard input is held in memory only until the first odd
mark (a table of unmarked terms is held whole: give ``--parity`` to stream it).
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from .check import writes_odd_parity
from .job import Chunk, Source
from .run import locate

__all__ = ["ParityDecision", "ReplayedSource", "decide_parity"]


@dataclass(frozen=True)
class ParityDecision:
    """The convention chosen for a column, and the row that decided it (None: no row
    writes an odd mark)."""

    convention: str
    column: str
    row: int | None

    def describe(self) -> str:
        if self.row is None:
            return (f"parity: no row of {self.column!r} writes an odd mark, so the column is "
                    "read as unmarked (a term without a mark takes its configuration's "
                    "parity, recorded as parity-from-configuration)")
        return (f"parity: row {self.row:,} of {self.column!r} writes an odd mark, so a term "
                "without one is read as even (marked)")


def decide_parity(chunks: Iterator[Chunk], columns: list[str], column: str, label: str, *,
                  term_cells: bool, seen: list[Chunk] | None = None) -> ParityDecision:
    """Read chunks until one row writes an odd mark; ``seen`` collects the chunks read
    (for a source that cannot be read twice)."""
    at = locate(columns, column, label)
    checked: set[str] = set()
    for chunk in chunks:
        if seen is not None:
            seen.append(chunk)
        for offset, row in enumerate(chunk.rows):
            cell = row[at] if at < len(row) else None
            if not isinstance(cell, str) or cell in checked:
                continue
            if writes_odd_parity(cell, term_cell=term_cells):
                return ParityDecision("marked", column, chunk.first_row + offset)
            if len(checked) < 100_000:
                checked.add(cell)
    return ParityDecision("unmarked", column, None)


class ReplayedSource:
    """A source whose first chunks were already read (to decide the parity convention):
    they are given again, then the rest of the same stream."""

    def __init__(self, source: Source, seen: list[Chunk], rest: Iterator[Chunk]) -> None:
        self.source, self.seen, self.rest = source, seen, rest
        self.label, self.columns = source.label, source.columns

    def chunks(self, size: int) -> Iterator[Chunk]:
        while self.seen:
            yield self.seen.pop(0)
        yield from self.rest

    def fraction(self) -> float | None:
        return self.source.fraction()

    def close(self) -> None:
        close = getattr(self.source, "close", None)
        if close is not None:
            close()
