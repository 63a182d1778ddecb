"""Parse + validate throughput against a bare regex tokenizer, measured in the same run.

The baseline only splits text into (n, letter, count) tuples with ``re.findall``; confspec
also reads every notation, resolves cores and holes, checks Pauli limits and builds the
frozen model. Target: ratio confspec / baseline >= 0.20 on cold (uncached) parses.
Run: ``make bench`` (or ``python benchmarks/bench_parse.py``).
"""

from __future__ import annotations

import re
import sys
import time
from collections.abc import Callable
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

import confspec
from benchmarks.realistic import realistic_strings
from confspec import reading as _api

_TOKEN = re.compile(r"(\d+)([a-z])\^?\{?(\d*)")


def baseline(strings: list[str]) -> None:
    findall = _TOKEN.findall
    for text in strings:
        findall(text)


def confspec_cold(strings: list[str]) -> None:
    _api._parse_cached.cache_clear()
    parse = confspec.parse
    for text in strings:
        parse(text)


def confspec_validate(strings: list[str]) -> None:
    validate = confspec.validate
    for text in strings:
        validate(text)


def best_of(fn: Callable[[list[str]], None], strings: list[str], repeats: int = 5) -> float:
    best = float("inf")
    for _ in range(repeats):
        start = time.perf_counter()
        fn(strings)
        best = min(best, time.perf_counter() - start)
    return best


def main() -> None:
    strings = realistic_strings()
    confspec.parse(strings[0])  # build the parser outside the timed runs
    for text in strings:  # every string must be valid, or the comparison is unfair
        confspec.parse(text)
    n = len(strings)
    base = best_of(baseline, strings)
    cold = best_of(confspec_cold, strings)
    checked = best_of(confspec_validate, strings)
    _api._parse_cached.cache_clear()
    from confspec.notation.fastpath import fast_occupancies

    fast_share = sum(fast_occupancies(s) is not None for s in strings) / n
    print(f"strings: {n} distinct, fast-path share {fast_share:.0%}")
    print(f"baseline re.findall tokenizer : {n / base:12,.0f} strings/s")
    print(f"confspec.parse (cold cache)   : {n / cold:12,.0f} strings/s   "
          f"ratio {base / cold:.2f}  (target >= 0.20)")
    print(f"confspec.validate             : {n / checked:12,.0f} strings/s   "
          f"ratio {base / checked:.2f}")


if __name__ == "__main__":
    main()
