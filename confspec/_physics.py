"""Conventions of the trade that every layer shares (common practice, no source unless named).

Subshell letters, Pauli limits, the two orderings and the noble-gas cores. Nothing here
imports lark, pydantic or any adapter.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Literal

Parity = Literal["even", "odd"]

#: Orbital letters for l = 0, 1, 2, ...; j is skipped (common practice, no source).
SUBSHELL_LETTERS = "spdfghiklmnoqrtu"
LETTER_TO_L = {letter: l for l, letter in enumerate(SUBSHELL_LETTERS)}

#: The noble gases whose configurations serve as core abbreviations, by symbol.
NOBLE_GAS_Z = {"He": 2, "Ne": 10, "Ar": 18, "Kr": 36, "Xe": 54, "Rn": 86, "Og": 118}

#: Occupancy triple: (n, l, electrons).
Occupancy = tuple[int, int, int]


def pauli_limit(l: int) -> int:
    """Electrons an nl subshell holds: 2(2l + 1)."""
    return 2 * (2 * l + 1)


def subshell_label(n: int, l: int) -> str:
    return f"{n}{SUBSHELL_LETTERS[l]}"


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

    The one place that reads a bare subshell label for the chemistry functions.
    """
    from ._errors import ConfspecPhysicsError

    if isinstance(subshell, tuple):
        n, l = subshell
    elif not isinstance(subshell, str):
        raise TypeError(f"a subshell is a label such as '3d' or an (n, l) pair, not "
                        f"{type(subshell).__name__}")
    else:
        text = subshell.strip()
        try:
            n, l = int(text[:-1]), LETTER_TO_L[text[-1:]]
        except (ValueError, KeyError):
            raise ConfspecPhysicsError(
                "invalid-subshell", f"{subshell!r} is not a subshell label such as '3d'",
                text=subshell) from None
    if not (isinstance(n, int) and isinstance(l, int)) or n < 1 or not 0 <= l < min(
            n, len(SUBSHELL_LETTERS)):
        raise ConfspecPhysicsError("invalid-subshell", f"n = {n}, l = {l} is not a subshell "
                                   "(1 ≤ n, 0 ≤ l < n)", text=str(subshell))
    return n, l
