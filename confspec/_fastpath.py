"""A compiled fast path for the spellings most data holds.

It recognises a strict subset of the grammar (an optional ``[Ng]`` core, subshells with
plain or ``^`` occupancies, single spaces or dots between them, run-together digits) and
builds the same :class:`RawConfiguration` the grammar would; anything else returns None and
goes to lark. Property tests prove the two paths agree on every string the fast path takes.
"""

from __future__ import annotations

import re

from ._syntax import (
    Letter,
    Open,
    Piece,
    RawConfiguration,
    RawCore,
    Segment,
    SepKind,
    Sub,
    assemble,
)

_CORE = r"\[(?:He|Ne|Ar|Kr|Xe|Rn|Og)\]"
_RUN = r"[0-9]+[a-z](?:\^?[0-9]+[a-z])*(?:\^?[0-9]+)?"
_SHAPE = re.compile(rf"(?:({_CORE})(?: |\.)?)?((?:{_RUN})(?:[ .]{_RUN})*)?")
_CHUNK = re.compile(r"(\^?)([0-9]+)([a-z]?)")


def fast_raw(text: str) -> RawConfiguration | None:
    """The raw parse of ``text`` if it has one of the common shapes, else None."""
    match = _SHAPE.fullmatch(text)
    if match is None or not (match.group(1) or match.group(2)):
        return None
    core_text = match.group(1)
    core = RawCore(core_text[1:-1], 0, True) if core_text else None
    body = match.group(2)
    if not body:
        return RawConfiguration(core, ())
    start = match.start(2)
    segments: list[Segment] = []
    seps: list[tuple[SepKind, int]] = []
    pos = start
    for chunk in re.split(r"([ .])", body):
        if chunk == " " or chunk == ".":
            seps.append(("space" if chunk == " " else "punct", pos))
            pos += 1
            continue
        pieces: list[Piece] = []
        for m in _CHUNK.finditer(chunk):
            caret, digits, letter = m.groups()
            at = pos + m.start(2)
            if not pieces:
                pieces.append(Sub(digits, at, letter))
                continue
            pieces.append(Open(digits, at, caret=bool(caret)))
            if letter:
                pieces.append(Letter(letter, pos + m.start(3)))
        segments.append(tuple(pieces))
        pos += len(chunk)
    return assemble(core, segments, seps, text)
