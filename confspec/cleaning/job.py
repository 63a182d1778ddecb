"""The row job: each distinct key checked once (an LRU of outcomes), misses computed in
worker processes with ``--jobs``.
"""

from __future__ import annotations

import signal
from collections import OrderedDict
from collections.abc import Iterator, Sequence
from concurrent.futures import Future
from dataclasses import dataclass
from functools import lru_cache
from typing import Any, Protocol

from ..reading import MAX_INPUT_LENGTH
from .check import Check, Key, Outcome, is_oversized

__all__ = [
    "DEFAULT_CACHE_SIZE",
    "Chunk",
    "RowJob",
    "RowMark",
    "Sink",
    "Source",
]

DEFAULT_CACHE_SIZE = 65_536



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
        if is_oversized(key):  # answered without parsing, and never kept in the cache
            return self._compute(key)
        result: Outcome = self._lookup(key)
        return result

    def outcomes(self, keys: Sequence[Key]) -> list[Outcome]:
        lookup, cap, one = self._lookup, MAX_INPUT_LENGTH, self.outcome
        return [lookup(k) if type(k) is str and len(k) <= cap else one(k) for k in keys]

    def known(self, key: Key) -> Outcome | None:
        hit = self._cache.get(key)
        if hit is not None:
            self._cache.move_to_end(key)
        return hit

    def remember(self, key: Key, outcome: Outcome) -> None:
        if is_oversized(key):
            return
        self._cache[key] = outcome
        if len(self._cache) > self.cache_size:
            self._cache.popitem(last=False)


# -- worker processes (--jobs): the main process keeps the cache, workers compute misses
_WORKER_JOB: RowJob | None = None


def _init_worker(check: Check, cache_size: int) -> None:
    global _WORKER_JOB
    # Ctrl-C and a hang-up reach the whole process group: the main process stops the pool
    for name in ("SIGINT", "SIGHUP"):
        if hasattr(signal, name):
            signal.signal(getattr(signal, name), signal.SIG_IGN)
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




# -- the row streams that sources give and sinks take
@dataclass(slots=True)
class Chunk:
    """Consecutive rows of a source; ``first_row`` is the 1-based number of the first."""

    columns: list[str]
    rows: list[list[Any]]
    first_row: int
    lines: list[int] | None = None  # source line of each row (text formats)
    plain: bool = False  # cells are only str, None or numbers (no lists, dicts, MISSING)
    marks: list[RowMark | None] | None = None  # what the reader found beyond the cells


@dataclass(frozen=True, slots=True)
class RowMark:
    """What a reader knows about one row beyond its cells, recorded on the row's outcome:
    ``fixes`` entries (cells it filled in, the header the row sits under) and, for an
    ionization-limit row of a level table, the column and text that say ``Limit`` (the row
    is then reported ``series-limit`` whatever the mode)."""

    fixes: tuple[str, ...] = ()
    limit_column: str | None = None
    limit_text: str = ""


class Source(Protocol):
    label: str
    columns: list[str]

    def chunks(self, size: int) -> Iterator[Chunk]: ...

    def fraction(self) -> float | None: ...

    def close(self) -> None: ...


class Sink(Protocol):
    """Where output rows go; ``plain`` says the cells are only str, None or numbers."""

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None: ...

    def commit(self) -> None: ...

    def abort(self) -> None: ...


