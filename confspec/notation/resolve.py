"""Policy: turn raw items into absolute occupancies, collecting every physics problem.

Cores are expanded, holes subtracted from the core (or from a reference configuration such
as a species' ground state), and each subshell checked against its Pauli limit: 2(2l + 1)
for nl, 2j + 1 for a relativistic subshell nlj. Occupancies are keyed (n, l, 2j), with
2j = 0 for an nl subshell; a full pair of j subshells is the full nl subshell (value, not
notation), and s1/2 is s.
"""

from __future__ import annotations

from collections.abc import Iterable

from ..errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError
from ..physics import (
    LETTER_TO_L,
    MAX_N,
    NOBLE_CORES,
    NOBLE_GAS_Z,
    pauli_limit,
    subshell_label,
)
from .syntax import RawConfiguration

__all__ = ["Key", "Occupancy4", "canonical", "resolve", "split_nl"]

_CORE_BY_LOWER = {symbol.lower(): symbol for symbol in NOBLE_CORES}

Key = tuple[int, int, int]  # (n, l, 2j), 2j = 0 for an nl subshell
#: (n, l, 2j, electrons)
Occupancy4 = tuple[int, int, int, int]




def split_nl(l: int, electrons: int) -> tuple[int, int]:
    """Electrons of an nl subshell over j = l − 1/2 and l + 1/2, lower j first (jj filling)."""
    lower = min(electrons, 2 * l)
    return lower, electrons - lower


def canonical(occupancy: dict[Key, int]) -> tuple[Occupancy4, ...]:
    """Merge full j pairs into nl and s1/2 into s; sort by (n, l, 2j); drop zeros."""
    merged: dict[Key, int] = {}
    for (n, l, j2), e in occupancy.items():
        if not e:
            continue
        if j2 and l == 0:
            j2 = 0
        merged[(n, l, j2)] = merged.get((n, l, j2), 0) + e
    for (n, l, j2) in list(merged):
        if j2 == 2 * l - 1 and (n, l, j2) in merged and (n, l, j2 + 2) in merged:
            low, high = merged[(n, l, j2)], merged[(n, l, j2 + 2)]
            if low == j2 + 1 and high == j2 + 3:
                del merged[(n, l, j2)], merged[(n, l, j2 + 2)]
                merged[(n, l, 0)] = low + high
    return tuple(sorted((n, l, j2, e) for (n, l, j2), e in merged.items()))


def _nl_to_keys(occupancies: Iterable[tuple[int, ...]]) -> dict[Key, int]:
    out: dict[Key, int] = {}
    for occ in occupancies:
        if len(occ) == 3:
            n, l, e = occ
            out[(n, l, 0)] = e
        else:
            n, l, j2, e = occ
            out[(n, l, j2)] = e
    return out


def _take_hole(source: dict[Key, int], key: Key) -> int | None:
    """Electrons the reference puts into ``key``, splitting an nl subshell if j is asked."""
    n, l, j2 = key
    if key in source:
        return source[key]
    if j2 and (n, l, 0) in source:
        lower, upper = split_nl(l, source.pop((n, l, 0)))
        source[(n, l, 2 * l - 1)], source[(n, l, 2 * l + 1)] = lower, upper
        return source[key]
    if not j2 and any((n, l, j) in source for j in (2 * l - 1, 2 * l + 1)):
        merged = sum(source.pop((n, l, j), 0) for j in (2 * l - 1, 2 * l + 1))
        source[key] = merged  # the j parts become one nl subshell again
        return merged
    return None


def resolve(raw: RawConfiguration, text: str, *, accept_uppercase: bool = False,
            reference: Iterable[tuple[int, ...]] | None = None
            ) -> tuple[tuple[Occupancy4, ...], list[ConfspecError]]:
    """Absolute occupancies (n, l, 2j, electrons), canonical, and every problem found.

    Notation problems (upper-case letters) stop resolution; physics problems are collected.
    """
    errors: list[ConfspecError] = []
    base: dict[Key, int] = {}
    core_name = ""
    if raw.core is not None:
        symbol = _CORE_BY_LOWER.get(raw.core.symbol.lower()) if raw.core.bracketed else (
            raw.core.symbol if raw.core.symbol in NOBLE_CORES else None)
        if symbol is None:
            shown = f"[{raw.core.symbol}]" if raw.core.bracketed else raw.core.symbol
            errors.append(ConfspecPhysicsError(
                "unknown-core", f"{shown} is not a noble-gas core; use "
                + ", ".join(f"[{s}]" for s in NOBLE_GAS_Z), position=raw.core.position, text=text))
        else:
            core_name = f"[{symbol}]"
            base = _nl_to_keys(NOBLE_CORES[symbol])
    against_reference = raw.core is None and reference is not None
    holes_from = dict(base) if not against_reference else _nl_to_keys(reference or ())
    hole_source = core_name or "the reference configuration"

    written: dict[Key, tuple[bool, int]] = {}  # key -> (is a hole, count)
    seen_nl: dict[tuple[int, int], int] = {}  # (n, l) -> 2j written first (0: nl)
    for item in raw.items:
        letter = item.letter
        if item.n > MAX_N:
            raise ConfspecSyntaxError(
                "number-too-large", f"n = {item.n} is above {MAX_N}, the largest principal "
                "number read", position=item.position, text=text)
        if letter != letter.lower() and not accept_uppercase:
            raise ConfspecSyntaxError(
                "uppercase-subshell",
                f"upper-case subshell letter in {item.n}{letter}: it may be a term symbol; "
                "write lower case, or accept upper case if the column holds no terms",
                position=item.position + len(str(item.n)), text=text)
        l = LETTER_TO_L.get(letter.lower())
        label = f"{item.n}{letter.lower()}"
        if l is None:
            errors.append(ConfspecPhysicsError(
                "invalid-subshell", f"{letter!r} in {label} is not a subshell letter "
                "(s p d f g h i k l m n o q r t u; j is skipped)",
                position=item.position + len(str(item.n)), text=text))
            continue
        if item.n < 1 or l >= item.n:
            errors.append(ConfspecPhysicsError(
                "invalid-subshell", f"{label} does not exist: l must be below n",
                position=item.position, text=text))
            continue
        j2 = 2 * l + item.j_sign if item.j_sign else item.j2
        if item.j2 or item.j_sign:
            if j2 not in (2 * l - 1, 2 * l + 1) or j2 < 1:
                errors.append(ConfspecPhysicsError(
                    "invalid-subshell", f"{label} has no j = {j2}/2: j is l ± 1/2 "
                    f"({', '.join(f'{j}/2' for j in (2 * l - 1, 2 * l + 1) if j > 0)})",
                    position=item.position, text=text))
                continue
            if l == 0:
                j2 = 0  # s1/2 is the s subshell
        key = (item.n, l, j2)
        label = subshell_label(*key)
        count = 1 if item.count is None else item.count
        count_at = item.position if item.count_position is None else item.count_position
        first = seen_nl.get((item.n, l))
        if first is not None and (first == j2 or not first or not j2):
            what = "is written twice; write its total occupancy once" if first == j2 else (
                f"overlaps {subshell_label(item.n, l, first)}: write {item.n}{letter.lower()} "
                "either as one nl subshell or as its j subshells")
            errors.append(ConfspecPhysicsError("duplicate-subshell", f"{label} {what}",
                                               position=item.position, text=text))
            continue
        seen_nl[(item.n, l)] = j2
        limit = pauli_limit(l, j2)
        if item.hole:
            have = _take_hole(holes_from, key)
            if have is None:
                errors.append(ConfspecPhysicsError(
                    "hole-without-reference",
                    f"hole in {label}, but nothing in this text fills {label}; give a core or "
                    "the species the hole refers to", position=item.position, text=text))
                continue
            if count > have:
                errors.append(ConfspecPhysicsError(
                    "hole-exceeds", f"{count} holes in {label}, but {hole_source} puts only "
                    f"{have} electrons there", position=count_at, text=text))
                continue
            written[key] = (True, count)
            continue
        if (item.n, l, 0) in base:
            errors.append(ConfspecPhysicsError(
                "core-overlap", f"{core_name} already fills {label}; drop it, or write a change "
                f"as a hole such as {label}^-1", position=item.position, text=text))
            continue
        if count > limit:
            errors.append(ConfspecPhysicsError(
                "pauli-limit", f"{label} holds at most {limit} electrons, not {count}",
                position=count_at, text=text))
            continue
        written[key] = (False, count)

    has_holes = any(hole for hole, _ in written.values())
    occupancy = dict(holes_from) if has_holes else dict(base)
    if against_reference and not has_holes:
        occupancy = {}
    for key, (hole, count) in written.items():
        # a hole subtracts; a written occupancy sets (against a reference it replaces)
        if hole:
            occupancy[key] = occupancy.get(key, 0) - count
        else:
            n, l, j2 = key
            if j2:
                _take_hole(occupancy, key)  # splits a reference's nl subshell into j parts
            else:
                for other in ((n, l, 2 * l - 1), (n, l, 2 * l + 1)):
                    occupancy.pop(other, None)
            occupancy[key] = count
    return canonical(occupancy), errors
