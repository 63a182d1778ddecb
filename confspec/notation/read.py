"""From text to occupancies: the precheck, cell cleaning, the fast path or the grammar, and
the resolver, with every problem pointing into the text as written.

This is the notation layer's one entry for reading a configuration; it builds no model
(:mod:`confspec.reading` turns occupancies into models).
"""

from __future__ import annotations

import re
from collections.abc import Callable

from ..errors import MAX_INPUT_LENGTH, ConfspecError, ConfspecSyntaxError, ConfspecTypeError
from ..physics import Occupancy
from .clean import Cleaned, clean, is_missing_marker, remap
from .fastpath import fast_raw
from .resolve import resolve
from .syntax import RawConfiguration

#: What holes without a core refer to: occupancies, or a function giving them (called only
#: when the text has such holes).
Reference = tuple[Occupancy, ...] | Callable[[], tuple[Occupancy, ...]]

__all__ = [
    "MAX_INPUT_LENGTH",
    "OUTER_SPACE",
    "Reference",
    "has_holes",
    "precheck",
    "raw_configuration",
    "read_configuration",
    "written_parents",
]


# Whitespace that real tables carry around a value, including zero-width characters and
# byte-order marks left by spreadsheet exports.
OUTER_SPACE = " \t\r\n\f\v\u00a0\u1680\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007" \
               "\u2008\u2009\u200a\u200b\u200c\u200d\u2028\u2029\u202f\u205f\u2060\u3000\ufeff"
_MOJIBAKE_LEAD = "ÂÃâ"


_MOJIBAKE_CANDIDATE = re.compile(f"[{_MOJIBAKE_LEAD}].")


def _mojibake_at(text: str) -> int | None:
    """Position of UTF-8 bytes read as Latin-1 / Windows-1252 ('1sÂ²', '2pâ\\x81¶'), if any."""
    for match in _MOJIBAKE_CANDIDATE.finditer(text):
        follower = match.group()[1]
        try:
            byte = follower.encode("cp1252")
        except UnicodeEncodeError:
            byte = follower.encode("latin-1", errors="ignore")
        if len(byte) == 1 and 0x80 <= byte[0] <= 0xBF:
            return match.start()
    return None


def _redecoded(text: str) -> str | None:
    for codec in ("cp1252", "latin-1"):
        try:
            return text.encode(codec).decode("utf-8")
        except UnicodeError:
            continue
    return None


def precheck(text: object, what: str) -> str:
    if not isinstance(text, str):
        raise ConfspecTypeError("wrong-type", f"the {what} must be a str, not "
                                f"{type(text).__name__}")
    if len(text) > MAX_INPUT_LENGTH:
        raise ConfspecSyntaxError(
            "too-long", f"{len(text)} characters is over the limit of {MAX_INPUT_LENGTH}",
            position=None, text=text[:60] + "…")
    if not text.strip(OUTER_SPACE):
        raise ConfspecSyntaxError("empty", f"the {what} is empty", position=0, text=text)
    if is_missing_marker(text):
        raise ConfspecSyntaxError(
            "empty", f"{text.strip()!r} marks a missing value, not a {what}",
            position=len(text) - len(text.lstrip()), text=text)
    at = _mojibake_at(text)
    if at is not None:
        fixed = _redecoded(text)
        hint = f"; re-decoded as UTF-8 it reads {fixed!r}" if fixed else ""
        raise ConfspecSyntaxError(
            "mojibake", "UTF-8 text was decoded as Latin-1/Windows-1252" + hint
            + "; re-read the source as UTF-8", position=at, text=text)
    stripped = text.strip(OUTER_SPACE)
    if stripped != text.strip():
        # zero-width characters at the ends: replace them so positions stay put
        text = "".join(" " if ch in OUTER_SPACE else ch for ch in text)
    return text


def read_configuration(text: str, *, accept_uppercase: bool,
                       reference: Reference | None = None
                       ) -> tuple[tuple[tuple[int, ...], ...], list[ConfspecError], Cleaned]:
    """Clean, read and resolve ``text``; problems point into ``text`` as written."""
    cleaned = clean(text)
    work = cleaned.text
    try:
        if cleaned.origin is not None:
            precheck(work, "configuration")
        raw = raw_configuration(work)
        occupancies, errors = resolve(raw, work, accept_uppercase=accept_uppercase,
                                      reference=_reference(raw, reference))
    except ConfspecError as err:
        raise remap(_level_hint(err, work), text, cleaned) from None
    return occupancies, [remap(_level_hint(e, work), text, cleaned) for e in errors], cleaned


def written_parents(text: str) -> tuple[str, ...]:
    """The parent terms a configuration cell carries (``3d6(5D)4s`` -> ``('(5D)',)``), as
    written; empty when there are none or the text does not read."""
    if "(" not in text:
        return ()
    try:
        raw = raw_configuration(clean(text).text)
    except ConfspecError:
        return ()
    return tuple(parent for _, parent, _ in raw.parents)


def lost_occupancy(err: ConfspecError, text: str) -> ConfspecError:
    """A syntax error at a '?' written where an occupancy belongs (``3d?``, ``3d^?``: a
    digit a lossy export replaced) gets its own code: never read as one electron."""
    at = err.position
    if err.code != "syntax" or at is None or at >= len(text) or text[at] != "?":
        return err
    before = text[:at].rstrip("^")
    if not before or before[-1] not in "spdfghikSPDFGHIK":
        return err
    return ConfspecSyntaxError(
        "unknown-occupancy", f"'?' stands where the electron count of {before[-2:].strip()} "
        "belongs (a digit lost in an export); the value cannot be read", position=at,
        text=err.text)


def _level_hint(err: ConfspecError, text: str) -> ConfspecError:
    """A syntax error in text that reads as a level designation says so."""
    err = lost_occupancy(err, text)
    if err.code not in ("syntax", "uppercase-subshell"):
        return err
    from .grammar import parse_level_raw

    try:
        level = parse_level_raw(text)
    except ConfspecError:
        return err
    if level.term is None and level.label is None:
        return err
    what = "a term" if level.term is not None else "a species label"
    return type(err)(err.code, f"{err.message}; the text reads as a level designation "
                     f"(a configuration with {what}): read it as a level (parse_level, "
                     "the CLI's --level)", position=err.position, text=err.text)


def raw_configuration(text: str) -> RawConfiguration:
    raw = fast_raw(text)
    if raw is not None:
        return raw
    from .grammar import parse_configuration_raw

    return parse_configuration_raw(text)


def has_holes(raw: RawConfiguration) -> bool:
    return any(item.hole for item in raw.items)




def _reference(raw: RawConfiguration, reference: Reference | None
               ) -> tuple[Occupancy, ...] | None:
    if reference is None or raw.core is not None or not has_holes(raw):
        return None
    return reference() if callable(reference) else reference
