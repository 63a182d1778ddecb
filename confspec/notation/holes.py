"""Writing a configuration as holes relative to a reference (a configuration or a species).

Two forms, chosen by the ``core`` option of ``Configuration.format``:

* ``core="condense"``: the reference's noble-gas core is written, with a hole for every core
  electron the configuration lacks; outside the core subshells carry their occupancies as
  usual. The text reads back on its own: ``[Ar] 1s^-1 4s1`` (potassium with a K-shell hole).
* ``core="expand"``: only what differs from the reference: holes where electrons are
  missing, occupancies where a subshell holds more. ``1s^-1`` reads back with
  ``parse(text, reference="K")`` (for a Configuration reference, against that reference).

When nothing is missing there is no hole to write, and the ordinary notation is used.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import TYPE_CHECKING

from ..physics import NOBLE_CORES, Occupancy
from .render import largest_core, render
from .resolve import split_nl

if TYPE_CHECKING:
    pass

__all__ = ["render_with_holes"]

Key = tuple[int, int, int]  # (n, l, 2j); 2j = 0 for an nl subshell


def _keyed(quads: Iterable[tuple[int, int, int, int]]) -> dict[Key, int]:
    return {(n, l, j2): e for n, l, j2, e in quads}


def _summed(occ: dict[Key, int]) -> list[Occupancy]:
    """(n, l, electrons) with the j subshells of one nl summed."""
    total: dict[tuple[int, int], int] = {}
    for (n, l, _), e in occ.items():
        total[(n, l)] = total.get((n, l), 0) + e
    return [(n, l, e) for (n, l), e in sorted(total.items())]


def _by_nl(occ: dict[Key, int]) -> dict[tuple[int, int], dict[int, int]]:
    out: dict[tuple[int, int], dict[int, int]] = {}
    for (n, l, j2), e in occ.items():
        out.setdefault((n, l), {})[j2] = e
    return out


def _j_parts(l: int, parts: dict[int, int]) -> dict[int, int]:
    """An nl subshell's electrons over its two j subshells, split as the resolver splits."""
    if 0 not in parts:
        return {j2: parts.get(j2, 0) for j2 in (2 * l - 1, 2 * l + 1)}
    lower, upper = split_nl(l, parts[0])
    return {2 * l - 1: lower, 2 * l + 1: upper}


def _core_holes(have: dict[Key, int], symbol: str) -> list[tuple[int, int, int, int]]:
    """Holes against a full noble-gas core, at the j resolution the configuration uses."""
    nl_have = _by_nl(have)
    holes: list[tuple[int, int, int, int]] = []
    for n, l, full in NOBLE_CORES[symbol]:
        parts = nl_have.get((n, l), {0: 0})
        if 0 in parts or l == 0:
            if parts.get(0, 0) < full:
                holes.append((n, l, 0, parts.get(0, 0) - full))
            continue
        holes.extend((n, l, j2, e - (j2 + 1)) for j2, e in _j_parts(l, parts).items()
                     if e < j2 + 1)
    return holes


def _differences(have: dict[Key, int], want: dict[Key, int]) -> list[tuple[int, int, int, int]]:
    """Holes and raised occupancies that turn ``want`` into ``have`` when resolved."""
    nl_have, nl_want = _by_nl(have), _by_nl(want)
    out: list[tuple[int, int, int, int]] = []
    for (n, l) in sorted(set(nl_have) | set(nl_want)):
        mine, theirs = nl_have.get((n, l), {}), nl_want.get((n, l), {})
        split = l > 0 and bool(mine) and 0 not in mine
        # the resolver keeps the reference's own form (nl or j parts) for a subshell that
        # no token names, so a change of form must be written even without a change of count
        change_of_form = bool(mine) and bool(theirs) and ((0 in theirs) == split)
        if split:
            mine, theirs = _j_parts(l, mine), _j_parts(l, theirs)
        elif mine or 0 in theirs or l == 0:
            mine, theirs = {0: sum(mine.values())}, {0: sum(theirs.values())}
        tokens = []
        for j2 in sorted(set(mine) | set(theirs)):
            change = mine.get(j2, 0) - theirs.get(j2, 0)
            if change < 0:
                tokens.append((n, l, j2, change))
            elif change > 0:
                tokens.append((n, l, j2, mine[j2]))
        if change_of_form and not split:
            # an nl subshell where the reference has j parts: set it (a written occupancy
            # replaces both parts), which also covers a change of count
            tokens = [(n, l, 0, mine[0])]
        elif change_of_form and not tokens:
            tokens = [(n, l, j2, e) for j2, e in sorted(mine.items()) if e]
        out.extend(tokens)
    return out


def render_with_holes(quads: Iterable[tuple[int, int, int, int]],
                      reference: Iterable[tuple[int, int, int, int]], *, style: str = "plain",
                      core: str = "condense", order: str = "shell") -> str:
    """Render subshells ``quads`` (n, l, 2j, electrons) with holes relative to the
    subshells ``reference`` (the same form): see the module docstring.

    >>> k_shell_hole = [(1, 0, 0, 1), (2, 0, 0, 2), (2, 1, 0, 6), (3, 0, 0, 2), (3, 1, 0, 6),
    ...                 (4, 0, 0, 1)]
    >>> potassium = [(1, 0, 0, 2), (2, 0, 0, 2), (2, 1, 0, 6), (3, 0, 0, 2), (3, 1, 0, 6),
    ...              (4, 0, 0, 1)]
    >>> render_with_holes(k_shell_hole, potassium), render_with_holes(
    ...     k_shell_hole, potassium, core="expand")
    ('[Ar] 1s^-1 4s1', '1s^-1')
    """
    have, want = _keyed(quads), _keyed(reference)
    plain = render([(*key, e) for key, e in have.items()], style=style, core=core, order=order)
    if core == "condense":
        symbol = largest_core(_summed(want))
        holes = _core_holes(have, symbol) if symbol is not None else []
        if not holes or symbol is None:
            return plain
        return render([(*key, e) for key, e in have.items()], style=style, core=core,
                      order=order, changes=holes, core_symbol=symbol)
    changes = _differences(have, want)
    if not any(count < 0 for *_, count in changes):
        return plain
    return render((), style=style, core=core, order=order, changes=changes)
