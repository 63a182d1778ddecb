"""A compiled fast path for the spellings most data holds.

It reads a strict subset of the grammar in one regular-expression scan: an optional
``[Ng]`` core, subshells (n of one digit, or two after a separator) whose occupancy is
plain, ``^k``, ``^{k}``, ``<sup>k</sup>`` or unicode superscripts, separated by one space,
one dot or nothing
(run-together digits are split as the grammar splits them). It returns the occupancies
only when the text is in that subset *and* valid; everything else (other spellings, holes,
any problem) returns None and takes the full path, which owns every error message.
Property tests prove the two paths agree on every string the fast path takes.
"""

from __future__ import annotations

import re

from ..physics import NOBLE_CORES, Occupancy, pauli_limit
from .scripts import FROM_SUPERSCRIPT
from .syntax import RawConfiguration, RawCore, RawItem, reading_ok

__all__ = ["fast_occupancies", "fast_raw"]

_L = {"s": 0, "p": 1, "d": 2, "f": 3, "g": 4, "h": 5, "i": 6, "k": 7}
_CAPACITY = {letter: pauli_limit(l) for letter, l in _L.items()}
_CORE = re.compile(r"\[(?:He|Ne|Ar|Kr|Xe|Rn|Og)\](?:[ .](?=[1-9]))?")
# One subshell token; the occupancy is as short as possible such that what follows is a
# separator before a digit, the next subshell (digit + letter), or the end: exactly the
# grammar's single-digit reading of run-together digits.
_TOKEN_BODY = (
    r"((?<![^ .])[1-9][0-9]?|[1-9])([spdfghik])"  # n: 1-2 digits after a separator, else 1
    r"(?:\^?([0-9]+?)|\^\{([0-9]+)\}|<sup>([0-9]+)</sup>|([⁰¹²³⁴⁵⁶⁷⁸⁹]+))?"
    r"(?:[ .](?=[1-9])|(?=[1-9][spdfghik])|\Z)")
_TOKEN_TEXT = re.compile(re.sub(r"\((?!\?)", "(?:", _TOKEN_BODY))  # same shape, no groups
# the parts of one token once it is cut out of the text
_TOKEN_PARTS = re.compile(
    r"([1-9][0-9]?)([spdfghik])(?:\^?([0-9]+)|\^\{([0-9]+)\}|<sup>([0-9]+)</sup>|([⁰¹²³⁴⁵⁶⁷⁸⁹]+))?"
    r"[ .]?")

_Entry = tuple[int, Occupancy | None]  # (sort key n*32 + l, (n, l, electrons); None if empty)
_INVALID: _Entry = (-1, None)
_TOKEN_CACHE: dict[str, _Entry] = {}


def _entries(occupancies: tuple[Occupancy, ...]) -> list[_Entry]:
    return [(n * 32 + l, (n, l, e)) for n, l, e in occupancies]


_CORES: dict[str, list[_Entry]] = {
    f"[{symbol}]": _entries(occ) for symbol, occ in NOBLE_CORES.items()}


def _token_entry(token: str) -> _Entry:
    """Read one token (cached: real data repeats a few hundred tokens)."""
    match = _TOKEN_PARTS.fullmatch(token)
    assert match is not None, token
    n_text, letter, plain, braced, html, sup = match.groups()
    count_text = plain or braced or html or (sup or "").translate(FROM_SUPERSCRIPT)
    count = int(count_text) if count_text else 1
    n, l = int(n_text), _L[letter]
    if l >= n or count > _CAPACITY[letter]:
        entry = _INVALID  # the full path names the problem
    else:
        entry = (n * 32 + l, (n, l, count) if count else None)
    if len(_TOKEN_CACHE) < 100_000:
        _TOKEN_CACHE[token] = entry
    return entry


def fast_occupancies(text: str) -> tuple[Occupancy, ...] | None:
    """The occupancies of ``text`` in shell order, zeros dropped, if it is a common, valid
    spelling; else None."""
    body = text
    entries: list[_Entry] = []
    if text[:1] == "[":
        match = _CORE.match(text)
        if match is None:
            return None
        entries = list(_CORES[text[: text.index("]") + 1]])
        body = text[match.end():]
    tokens = _TOKEN_TEXT.findall(body)
    if sum(map(len, tokens)) != len(body) or not (tokens or entries):
        return None
    cached = _TOKEN_CACHE.get
    entries += [cached(token) or _token_entry(token) for token in tokens]
    if len({key for key, _ in entries}) != len(entries):
        return None  # a subshell twice, or one the core fills: the full path names it
    entries.sort()
    if entries[0][0] < 0:
        return None  # an impossible subshell or occupancy: the full path names it
    return tuple([sub for _, sub in entries if sub is not None])


def fast_raw(text: str) -> RawConfiguration | None:
    """The raw parse of ``text`` when it has the fast path's shape, valid or not.

    The resolver then names any problem, exactly as after the grammar (proven by property
    tests), so a Pauli violation in a common spelling costs no LALR parse.
    """
    body = text
    start = 0
    core = None
    if text[:1] == "[":
        match = _CORE.match(text)
        if match is None:
            return None
        core = RawCore(text[1: text.index("]")], 0, True)
        start = match.end()
        body = text[start:]
    tokens = _TOKEN_TEXT.findall(body)
    if sum(map(len, tokens)) != len(body) or not (tokens or core):
        return None
    items = []
    at = start
    for index, token in enumerate(tokens):
        parts = _TOKEN_PARTS.fullmatch(token)
        assert parts is not None, token
        following = tokens[index + 1] if index + 1 < len(tokens) else None
        if following is not None and parts.group(3) is not None and token[-1:].isdigit() \
                and not reading_ok(parts.group(3), following[0], parts.group(2),
                                    following[1], token.find("^") >= 0):
            return None  # the grammar weighs other readings of these digits
        count_group = next((g for g in (3, 4, 5, 6) if parts.group(g) is not None), None)
        if count_group is None:
            items.append(RawItem(int(parts.group(1)), parts.group(2), at))
        else:
            digits = parts.group(count_group)
            count = int(digits.translate(FROM_SUPERSCRIPT))
            items.append(RawItem(int(parts.group(1)), parts.group(2), at, count,
                                 at + parts.start(count_group)))
        at += len(token)
    return RawConfiguration(core, tuple(items))
