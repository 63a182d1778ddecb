"""Conventions of the trade that every layer shares (common practice, no source unless named).

Subshell letters, Pauli limits, the two orderings and the noble-gas cores. Nothing here
imports lark, pydantic or any adapter.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from typing import Literal

__all__ = ["CORES_LARGEST_FIRST", "LETTER_TO_L", "MAX_N", "NOBLE_CORES", "NOBLE_GAS_Z",
           "SUBSHELL_LETTERS", "Occupancy", "Parity", "filling_key", "implied_inner_subshells",
           "madelung_fill", "madelung_sequence", "pauli_limit", "shell_key", "subshell_label",
           "subshell_numbers", "subshell_parts"]

Parity = Literal["even", "odd"]

#: Orbital letters for l = 0, 1, 2, ...; j is skipped (common practice, no source).
SUBSHELL_LETTERS = "spdfghiklmnoqrtu"
LETTER_TO_L = {letter: l for l, letter in enumerate(SUBSHELL_LETTERS)}

#: The noble gases whose configurations serve as core abbreviations, by symbol.
NOBLE_GAS_Z = {"He": 2, "Ne": 10, "Ar": 18, "Kr": 36, "Xe": 54, "Rn": 86, "Og": 118}

#: The largest principal number read (real tables reach n of about 100 in Rydberg series);
#: a larger one is refused with ``number-too-large`` so no number drives unbounded work.
MAX_N = 999

#: Occupancy triple: (n, l, electrons).
Occupancy = tuple[int, int, int]


def pauli_limit(l: int, j2: int = 0) -> int:
    """Electrons a subshell holds: 2(2l + 1) for nl, 2j + 1 for nlj (``j2`` = 2j, 0 for nl).
    The one capacity rule."""
    return j2 + 1 if j2 else 2 * (2 * l + 1)


def subshell_label(n: int, l: int, j2: int = 0) -> str:
    """``3d``, or ``2p3/2`` for a relativistic subshell: the one subshell-label writer."""
    return f"{n}{SUBSHELL_LETTERS[l]}" + (f"{j2}/2" if j2 else "")


def shell_key(n: int, l: int) -> tuple[int, int]:
    """Canonical order: by n, then l."""
    return (n, l)


def filling_key(n: int, l: int) -> tuple[int, int]:
    """Madelung order: by n + l, then n."""
    return (n + l, n)


def madelung_sequence() -> Iterator[tuple[int, int]]:
    """Subshells (n, l) in Madelung filling order, without end."""
    total = 1
    while True:
        for n in range(1, total + 1):
            l = total - n
            if l < n:
                yield (n, l)
        total += 1


def madelung_fill(electrons: int) -> tuple[Occupancy, ...]:
    """Distribute electrons over subshells in Madelung order (n + l, then n)."""
    out: list[Occupancy] = []
    left = electrons
    for n, l in madelung_sequence():
        if left <= 0:
            break
        take = min(left, pauli_limit(l))
        out.append((n, l, take))
        left -= take
    return tuple(sorted(out))


#: Core occupancies: the Madelung filling of each noble gas, which equals the NIST ASD
#: ground configuration of He, Ne, Ar, Kr, Xe and Rn (checked in tests) and the predicted
#: one of Og.
NOBLE_CORES: dict[str, tuple[Occupancy, ...]] = {
    symbol: madelung_fill(z) for symbol, z in NOBLE_GAS_Z.items()
}

#: Cores from the largest down, for condensing.
CORES_LARGEST_FIRST = sorted(NOBLE_CORES, key=lambda s: -NOBLE_GAS_Z[s])


def implied_inner_subshells(written: set[tuple[int, int]], missing: int
                            ) -> tuple[Occupancy, ...] | None:
    """The closed inner subshells that level tables leave unwritten (``2p6.3s`` for Na is
    1s2 2s2 short), or None when no such filling gives exactly ``missing`` electrons.

    Subshells not written are filled completely in Madelung order; each must lie below the
    highest written subshell in shell order (so ``3d6`` never implies an outer 4s2).
    """
    if missing == 0:
        return ()
    if missing < 0 or not written:
        return None
    top = max(written)
    added: list[Occupancy] = []
    left = missing
    for n, l in madelung_sequence():
        if (n, l) in written:
            continue
        if (n, l) >= top:
            return None
        full = pauli_limit(l)
        if full > left:
            return None
        added.append((n, l, full))
        left -= full
        if left == 0:
            return tuple(sorted(added))
    return None  # pragma: no cover - the sequence is endless


def subshell_numbers(subshell: str | tuple[int, int]) -> tuple[int, int]:
    """(n, l) of a subshell given as a label (``"3d"``) or a pair, checked: 1 ≤ n, 0 ≤ l < n.
    """
    if isinstance(subshell, tuple):
        n, l = subshell
        _check_numbers(n, l, str(subshell))
        return n, l
    n, l, j2 = subshell_parts(subshell)
    if j2:
        from .errors import ConfspecPhysicsError

        raise ConfspecPhysicsError(
            "invalid-subshell", f"{subshell!r} is a relativistic subshell; give an nl label "
            "such as '3d'", text=subshell)
    return n, l


_LABEL = re.compile(r"\s*([1-9][0-9]{0,2})([a-z])(?:_?\{?([0-9]{1,2})/2\}?)?\s*")


def subshell_parts(label: str) -> tuple[int, int, int]:
    """(n, l, 2j) of a bare subshell label, ``"3d"`` (2j = 0) or ``"2p3/2"``, checked.

    The one reader of bare subshell labels, for the chemistry functions and X-ray names.
    """
    from .errors import MAX_INPUT_LENGTH, ConfspecPhysicsError, ConfspecSyntaxError

    if not isinstance(label, str):
        raise TypeError(f"a subshell is a label such as '3d' or an (n, l) pair, not "
                        f"{type(label).__name__}")
    if len(label) > MAX_INPUT_LENGTH:
        raise ConfspecSyntaxError(
            "too-long", f"{len(label)} characters is over the limit of {MAX_INPUT_LENGTH}",
            position=None, text=label[:60] + "…")
    match = _LABEL.fullmatch(label)
    if match is None or match.group(2) not in LETTER_TO_L:
        raise ConfspecPhysicsError(
            "invalid-subshell", f"{label!r} is not a subshell label such as '3d'",
            text=label)
    n, l = int(match.group(1)), LETTER_TO_L[match.group(2)]
    _check_numbers(n, l, label)
    j2 = int(match.group(3)) if match.group(3) else 0
    if j2 and abs(j2 - 2 * l) != 1:
        raise ConfspecPhysicsError("invalid-subshell", f"j = {j2}/2 is not l ± 1/2 in "
                                   f"{label!r}", text=label)
    return n, l, j2


def _check_numbers(n: object, l: object, text: str) -> None:
    from .errors import ConfspecPhysicsError

    if not (isinstance(n, int) and isinstance(l, int)) or n < 1 or not 0 <= l < min(
            n, len(SUBSHELL_LETTERS)):
        raise ConfspecPhysicsError("invalid-subshell", f"n = {n}, l = {l} is not a subshell "
                                   "(1 ≤ n, 0 ≤ l < n)", text=text)
