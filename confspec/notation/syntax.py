"""The parse result before policy: raw subshell items with source positions.

Both the lark grammar (``_grammar``) and the compiled fast path (``_fastpath``) produce a
:class:`RawConfiguration` through the functions here, so the two paths share every decision
that is not pure shape: splitting run-together digits and attaching bare counts.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..errors import ConfspecSyntaxError
from ..physics import LETTER_TO_L, pauli_limit

__all__ = ["Bare", "Closed", "Letter", "Open", "Piece", "RawConfiguration", "RawCore",
           "RawItem", "Rel", "Segment", "SepKind", "Sub", "assemble", "assemble_counted",
           "reading_ok", "split_run"]

#: The largest principal number considered when a run-together digit run is read with a
#: multi-digit n (only ever to name alternatives, never silently).
_MAX_RUN_N_DIGITS = 3


@dataclass(frozen=True, slots=True)
class RawItem:
    """One written subshell: ``n``, ``letter``, optional count, and where they stand."""

    n: int
    letter: str
    position: int  # where n starts
    count: int | None = None  # None: no occupancy written (means 1)
    count_position: int | None = None
    hole: bool = False
    j2: int = 0  # twice j of a relativistic subshell written as a fraction (0: an nl subshell)
    j_sign: int = 0  # -1 for `2p-` (j = l - 1/2), +1 for `2p+` (j = l + 1/2)


@dataclass(frozen=True, slots=True)
class RawCore:
    symbol: str  # as written inside the brackets, stripped
    position: int
    bracketed: bool


@dataclass(frozen=True, slots=True)
class RawConfiguration:
    core: RawCore | None
    items: tuple[RawItem, ...]
    #: parent terms written in the text: (items before it, text as written, position). A
    #: configuration keeps them only to report them; a level designation checks them.
    parents: tuple[tuple[int, str, int], ...] = ()


# -- pieces of one run ------------------------------------------------------------------
@dataclass(frozen=True, slots=True)
class Sub:
    """A subshell start whose n is known: head of a run or after a closed occupancy."""

    n: str
    n_pos: int
    letter: str


@dataclass(frozen=True, slots=True)
class Open:
    """Digits that end an occupancy and may run into the next principal number."""

    digits: str
    pos: int
    negative: bool = False
    caret: bool = False


@dataclass(frozen=True, slots=True)
class Closed:
    """A delimited occupancy: superscript, braces, parentheses or markup."""

    value: int
    pos: int
    negative: bool = False


@dataclass(frozen=True, slots=True)
class Letter:
    letter: str
    pos: int


Piece = Sub | Open | Closed | Letter


@dataclass(frozen=True, slots=True)
class Bare:
    """A count standing alone after a separator (``3d 6``)."""

    digits: str
    pos: int


@dataclass(frozen=True, slots=True)
class Rel:
    """One relativistic subshell nlj with its (marked) occupancy."""

    n: str
    n_pos: int
    letter: str
    j2: int
    j_sign: int
    occupancy: Closed | None


SepKind = Literal["space", "punct", "dash"]
Segment = tuple[Piece, ...] | Bare | Rel


def _capacity(letter: str) -> int | None:
    l = LETTER_TO_L.get(letter.lower())
    return None if l is None else pauli_limit(l)


def reading_ok(occ: str, n: str, left: str, right: str, signed: bool) -> bool:
    if not n or n[0] == "0":
        return False
    if occ == "":
        if signed:
            return False
    elif occ[0] == "0" and occ != "0":
        return False
    capacity = _capacity(left)
    count = int(occ) if occ else 1
    if capacity is not None and count > capacity:
        return False
    l = LETTER_TO_L.get(right.lower())
    return l is None or l < int(n)


def _split_digits(run: Open, left_n: str, left: str, right: str, text: str) -> tuple[str, str]:
    """Split ``occupancy + n`` digits between two subshell letters.

    Principal numbers in run-together text are read as single digits (the convention of the
    tables that write ``1s22s22p6``). When that reading breaks a limit but a reading with a
    longer n would not (``2p110s``), the text is refused as ambiguous, naming the readings.
    """
    d = run.digits
    signed = run.negative or run.caret
    if reading_ok(d[:-1], d[-1:], left, right, signed):
        return d[:-1], d[-1:]
    # a longer n is only a rival reading when an occupancy is still written before it
    others = [(d[:-k], d[-k:]) for k in range(2, min(len(d) - 1, _MAX_RUN_N_DIGITS) + 1)
              if reading_ok(d[:-k], d[-k:], left, right, signed)]
    if not others:
        return d[:-1], d[-1:]  # let the resolver name the physics problem
    sign = "^-" if run.negative else ""

    def reading(occ: str, n: str) -> str:
        return f"'{left_n}{left}{sign}{occ} {n}{right}'"

    raise ConfspecSyntaxError(
        "ambiguous-run-together",
        f"cannot split the digits {d!r} after {left_n}{left} with certainty: "
        f"{reading(d[:-1], d[-1:])} is impossible, but "
        + " or ".join(reading(occ, n) for occ, n in others)
        + " would be valid; put spaces between the subshells",
        position=run.pos, text=text)


def split_run(pieces: tuple[Piece, ...], text: str) -> list[RawItem]:
    """Turn the pieces of one run into raw items."""
    items: list[RawItem] = []
    head = pieces[0]
    assert isinstance(head, Sub)
    n, n_pos, letter, i = head.n, head.n_pos, head.letter, 1
    while True:
        nxt = pieces[i] if i < len(pieces) else None
        if nxt is None:
            items.append(RawItem(int(n), letter, n_pos))
            return items
        if isinstance(nxt, Open):
            follower = pieces[i + 1] if i + 1 < len(pieces) else None
            if isinstance(follower, Letter):
                occ, next_n = _split_digits(nxt, n, letter, follower.letter, text)
                if not occ and (nxt.caret or nxt.negative):
                    raise ConfspecSyntaxError(
                        "syntax", f"expected an occupancy after '^' on {n}{letter}",
                        position=nxt.pos, text=text)
                count = int(occ) if occ else None
                items.append(RawItem(int(n), letter, n_pos, count,
                                     nxt.pos if occ else None, nxt.negative))
                n, n_pos, letter = next_n, nxt.pos + len(occ), follower.letter
                i += 2
                continue
            items.append(RawItem(int(n), letter, n_pos, int(nxt.digits), nxt.pos, nxt.negative))
            return items
        assert isinstance(nxt, Closed)
        items.append(RawItem(int(n), letter, n_pos, nxt.value, nxt.pos, nxt.negative))
        follower = pieces[i + 1] if i + 1 < len(pieces) else None
        if follower is None:
            return items
        assert isinstance(follower, Sub)
        n, n_pos, letter, i = follower.n, follower.n_pos, follower.letter, i + 2


def assemble(core: RawCore | None, segments: list[Segment], seps: list[tuple[SepKind, int]],
             text: str) -> RawConfiguration:
    """Join the segments of a body; a bare count attaches to the subshell before it."""
    return assemble_counted(core, segments, seps, text)[0]


def assemble_counted(core: RawCore | None, segments: list[Segment],
                     seps: list[tuple[SepKind, int]], text: str
                     ) -> tuple[RawConfiguration, list[int]]:
    """:func:`assemble`, with the number of items after each segment (``counts[k]``: after
    the first k segments), so parents can find their scope in one pass."""
    items: list[RawItem] = []
    counts = [0]
    for index, segment in enumerate(segments):
        if index:
            counts.append(len(items))
        if isinstance(segment, Rel):
            occ = segment.occupancy
            items.append(RawItem(
                int(segment.n), segment.letter, segment.n_pos,
                None if occ is None else occ.value, None if occ is None else occ.pos,
                occ is not None and occ.negative, segment.j2, segment.j_sign))
            continue
        if not isinstance(segment, Bare):
            items.extend(split_run(segment, text))
            continue
        kind, sep_pos = seps[index - 1] if index else ("space", segment.pos)
        if kind == "dash" and items and items[-1].count is None:
            raise ConfspecSyntaxError(
                "ambiguous-hole",
                f"'-{segment.digits}' after {items[-1].n}{items[-1].letter} may be a separator "
                "or a hole; write a hole as '^-1', '^{-1}', '⁻¹' or '(-1)'",
                position=sep_pos, text=text)
        if not items or kind != "space":
            raise ConfspecSyntaxError(
                "syntax", "expected a subshell such as '3d', found a number", position=segment.pos,
                text=text)
        last = items[-1]
        if last.count is not None:
            raise ConfspecSyntaxError(
                "syntax", f"{last.n}{last.letter} already has an occupancy", position=segment.pos,
                text=text)
        items[-1] = RawItem(last.n, last.letter, last.position, int(segment.digits), segment.pos,
                            False, last.j2, last.j_sign)
    if segments:
        counts.append(len(items))
    return RawConfiguration(core, tuple(items)), counts
