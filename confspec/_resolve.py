"""Policy: turn raw items into absolute occupancies, collecting every physics problem.

Cores are expanded, holes subtracted from the core (or from a reference configuration such
as a species' ground state), and each subshell checked against its Pauli limit.
"""

from __future__ import annotations

from ._errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError
from ._physics import (
    LETTER_TO_L,
    NOBLE_CORES,
    NOBLE_GAS_Z,
    Occupancy,
    pauli_limit,
    subshell_label,
)
from ._syntax import RawConfiguration

_CORE_BY_LOWER = {symbol.lower(): symbol for symbol in NOBLE_CORES}


def resolve(raw: RawConfiguration, text: str, *, accept_uppercase: bool = False,
            reference: tuple[Occupancy, ...] | None = None
            ) -> tuple[tuple[Occupancy, ...], list[ConfspecError]]:
    """Absolute occupancies (sorted by n, l; zeros dropped) and every problem found.

    Notation problems (upper-case letters) stop resolution; physics problems are collected.
    """
    errors: list[ConfspecError] = []
    base: dict[tuple[int, int], int] = {}
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
            base = {(n, l): e for n, l, e in NOBLE_CORES[symbol]}
    holes_from = base if raw.core is not None else (
        {(n, l): e for n, l, e in reference} if reference is not None else {})
    hole_source = core_name or "the reference configuration"

    written: dict[tuple[int, int], tuple[bool, int]] = {}  # (is a hole, count)
    seen: set[tuple[int, int]] = set()
    for item in raw.items:
        letter = item.letter
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
        key = (item.n, l)
        count = 1 if item.count is None else item.count
        count_at = item.position if item.count_position is None else item.count_position
        if key in seen:
            errors.append(ConfspecPhysicsError(
                "duplicate-subshell", f"{label} is written twice; write its total occupancy once",
                position=item.position, text=text))
            continue
        seen.add(key)
        limit = pauli_limit(l)
        if item.hole:
            if key not in holes_from:
                errors.append(ConfspecPhysicsError(
                    "hole-without-reference",
                    f"hole in {label}, but nothing in this text fills {label}; give a core or "
                    "the species the hole refers to", position=item.position, text=text))
                continue
            if count > holes_from[key]:
                errors.append(ConfspecPhysicsError(
                    "hole-exceeds", f"{count} holes in {label}, but {hole_source} puts only "
                    f"{holes_from[key]} electrons there", position=count_at, text=text))
                continue
            written[key] = (True, count)
            continue
        if key in base:
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

    if raw.core is None and reference is not None and any(h for h, _ in written.values()):
        # Holes relative to a reference without a core: the rest of the reference stays.
        for key, electrons in holes_from.items():
            base.setdefault(key, electrons)
    occupancy = dict(base)
    for key, (hole, count) in written.items():
        # a hole subtracts; a written occupancy sets (against a reference it replaces)
        occupancy[key] = occupancy.get(key, 0) - count if hole else count
    result = tuple(sorted((n, l, e) for (n, l), e in occupancy.items() if e > 0))
    return result, errors


def describe(occupancies: tuple[Occupancy, ...]) -> str:
    """A quick plain rendering for messages (no core condensing)."""
    return " ".join(f"{subshell_label(n, l)}{e}" for n, l, e in occupancies)
