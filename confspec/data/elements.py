"""The elements Z = 1–118 with their IUPAC symbols and names (from ``data/elements.csv``)."""

from __future__ import annotations

from functools import cache
from typing import NamedTuple

from . import read_table

__all__ = ["ElementRow", "all_elements", "by_name", "by_number", "by_symbol", "suggest"]

class ElementRow(NamedTuple):
    Z: int
    symbol: str
    name: str


@cache
def _tables() -> tuple[dict[str, ElementRow], dict[int, ElementRow]]:
    rows = [ElementRow(int(r["Z"]), r["symbol"], r["name"]) for r in read_table("elements.csv")]
    return {r.symbol: r for r in rows}, {r.Z: r for r in rows}


def by_symbol(symbol: str) -> ElementRow | None:
    return _tables()[0].get(symbol)


def by_number(z: int) -> ElementRow | None:
    return _tables()[1].get(z)


def by_name(name: str) -> ElementRow | None:
    wanted = name.strip().lower()
    for row in _tables()[1].values():
        if row.name.lower() == wanted:
            return row
    return None


def all_elements() -> list[ElementRow]:
    return sorted(_tables()[1].values())


def suggest(symbol: str) -> str | None:
    """A correctly cased symbol for a mis-cased one ('FE' -> 'Fe'), if there is one."""
    fixed = symbol[:1].upper() + symbol[1:].lower()
    return fixed if fixed != symbol and by_symbol(fixed) else None
