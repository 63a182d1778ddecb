"""The public functions: parse, parse_species, validate, normalize.

Three stages kept apart: read the text (fast path or grammar), resolve it (policy: cores,
holes, physics), format it (renderers only read the model). Parsing raises the first
problem; :func:`validate` returns all of them. For any ``str`` input nothing but
:class:`~confspec.ConfspecError` escapes.
"""

from __future__ import annotations

import re
from functools import lru_cache
from typing import Any

from . import _elements
from ._clean import Cleaned, clean, is_missing_marker, remap, species_noise
from ._errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError
from ._fastpath import fast_configuration, fast_raw
from ._models import Configuration, Element, Species
from ._physics import Occupancy
from ._resolve import resolve
from ._syntax import RawConfiguration

__all__ = ["MAX_INPUT_LENGTH", "normalize", "parse", "parse_species", "validate"]

#: Inputs longer than this are refused with ``too-long`` before any parsing.
MAX_INPUT_LENGTH = 4096

# Whitespace that real tables carry around a value, including zero-width characters and
# byte-order marks left by spreadsheet exports.
_OUTER_SPACE = " \t\r\n\f\v\u00a0\u1680\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007" \
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


def _precheck(text: object, what: str) -> str:
    if not isinstance(text, str):
        raise TypeError(f"{what} must be a str, not {type(text).__name__}")
    if len(text) > MAX_INPUT_LENGTH:
        raise ConfspecSyntaxError(
            "too-long", f"{len(text)} characters is over the limit of {MAX_INPUT_LENGTH}",
            position=None, text=text[:60] + "…")
    if not text.strip(_OUTER_SPACE):
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
    stripped = text.strip(_OUTER_SPACE)
    if stripped != text.strip():
        # zero-width characters at the ends: replace them so positions stay put
        text = "".join(" " if ch in _OUTER_SPACE else ch for ch in text)
    return text


def _resolved(text: str, *, accept_uppercase: bool, species: Species | None = None
              ) -> tuple[tuple[tuple[int, ...], ...], list[ConfspecError], Cleaned]:
    """Clean, read and resolve ``text``; problems point into ``text`` as written."""
    cleaned = clean(text)
    work = cleaned.text
    try:
        if cleaned.origin is not None:
            _precheck(work, "configuration")
        raw = _raw(work)
        occupancies, errors = resolve(raw, work, accept_uppercase=accept_uppercase,
                                      reference=_reference(raw, species))
    except ConfspecError as err:
        raise remap(err, text, cleaned) from None
    return occupancies, [remap(e, text, cleaned) for e in errors], cleaned


def _raw(text: str) -> RawConfiguration:
    raw = fast_raw(text)
    if raw is not None:
        return raw
    from ._grammar import parse_configuration_raw

    return parse_configuration_raw(text)


def _has_holes(raw: RawConfiguration) -> bool:
    return any(item.hole for item in raw.items)


def _reference(raw: RawConfiguration, species: Species | None) -> tuple[Occupancy, ...] | None:
    if species is None or raw.core is not None or not _has_holes(raw):
        return None
    try:
        from ._ground import ground_state
    except ImportError:  # pragma: no cover - the chemistry layer ships with the package
        return None
    return ground_state(species).occupancies


@lru_cache(maxsize=65_536)
def _parse_cached(text: str, accept_uppercase: bool) -> Configuration:
    fast = fast_configuration(text)  # common spellings need no precheck: see _fastpath
    if fast is not None:
        return fast
    text = _precheck(text, "configuration")
    occupancies, errors, _ = _resolved(text, accept_uppercase=accept_uppercase)
    if errors:
        raise errors[0]
    return Configuration._trusted(occupancies)


def _as_species(species: Species | str | None) -> Species | None:
    if species is None or isinstance(species, Species):
        return species
    return parse_species(species)


def parse(text: str, *, species: Species | str | None = None,
          accept_uppercase: bool = False) -> Configuration:
    """Read a configuration in any supported notation; raise the first problem.

    ``species`` lets holes without a core (``1s^-1``) refer to that species' ground state.

    >>> str(parse("1s22s22p63s1"))
    '[Ne] 3s1'
    >>> str(parse("[Ne] 2p^-1 3s2"))
    '[He] 2s2 2p5 3s2'
    """
    if species is None and type(text) is str and len(text) <= MAX_INPUT_LENGTH:
        return _parse_cached(text, accept_uppercase)
    text = _precheck(text, "configuration")
    kind = _as_species(species)
    occupancies, errors, _ = _resolved(text, accept_uppercase=accept_uppercase, species=kind)
    if errors:
        raise errors[0]
    return Configuration._trusted(occupancies)


_ELEMENT_CACHE: dict[str, Element] = {}


def _element(symbol: str, position: int, text: str) -> Element:
    element = _ELEMENT_CACHE.get(symbol)
    if element is not None:
        return element
    row = _elements.by_symbol(symbol)
    if row is None:
        hint = _elements.suggest(symbol)
        raise ConfspecPhysicsError(
            "unknown-element", f"{symbol!r} is not an element symbol"
            + (f"; did you mean {hint!r}?" if hint else ""), position=position, text=text)
    element = Element.model_construct(Z=row.Z, symbol=row.symbol, name=row.name)
    _ELEMENT_CACHE[symbol] = element
    return element


_ELEMENT_WORD = re.compile(r"[A-Za-z]+")


def _raise_if_unknown_element(text: str) -> None:
    """Name a mis-cased or unknown symbol instead of a bare syntax error ('FE', 'fe2+')."""
    lead = text.lstrip(_OUTER_SPACE)
    match = _ELEMENT_WORD.match(lead)
    if match is None:
        return
    word, offset = match.group(), len(text) - len(lead)
    for candidate in (word, word[:2], word[:1]):
        hint = _elements.suggest(candidate)
        if hint:
            raise ConfspecPhysicsError(
                "unknown-element", f"{candidate!r} is not an element symbol; did you mean "
                f"{hint!r}?", position=offset, text=text) from None
    if len(word) == 3 and word[0].isupper() and word[1:].islower():
        raise ConfspecPhysicsError(  # an IUPAC placeholder symbol such as Uue (Z = 119)
            "unknown-element", f"{word!r} is not the symbol of an element with Z = 1–118",
            position=offset, text=text) from None
    if _elements.by_symbol(word[:2]) is None and _elements.by_symbol(word[:1]) is None:
        raise ConfspecPhysicsError("unknown-element", f"{word!r} is not an element symbol",
                                   position=offset, text=text) from None


def parse_species(text: str) -> Species:
    """Read a species: ``Fe``, ``Fe2+``, ``Fe+2``, ``Fe^{2+}``, ``Fe²⁺``, ``Fe++``, ``O2-``,
    ``Cl-``, ``Fe(III)`` (oxidation state: +3) or ``Fe III`` (spectrum label: Fe²⁺).

    >>> str(parse_species("Fe(III)")), str(parse_species("Fe III"))
    ('Fe3+', 'Fe2+')
    """
    original = _precheck(text, "species")
    cleaned = species_noise(_named(clean(original, notes=False), original), _z_of)
    text = cleaned.text
    from ._grammar import parse_species_raw

    try:
        try:
            symbol, position, charge, _ = parse_species_raw(text)
        except ConfspecSyntaxError:
            _raise_if_unknown_element(text)
            raise
        return _species_of(symbol, position, charge, text)
    except ConfspecError as err:
        raise remap(err, original, cleaned) from None


_NAME_WORD = re.compile(r"[A-Za-z]{3,}")


def _z_of(symbol: str) -> int | None:
    row = _elements.by_symbol(symbol)
    return None if row is None else row.Z


def _named(cleaned: Cleaned, original: str) -> Cleaned:
    """Replace a leading element name (``iron(III)``, ``Sodium``) by its symbol."""
    text = cleaned.text
    match = _NAME_WORD.match(text)
    row = _elements.by_name(match.group()) if match else None
    if match is None or row is None:
        return cleaned
    origin = cleaned.origin or tuple(range(len(text)))
    start = origin[0] if origin else 0
    new_origin = tuple(start + min(i, len(match.group()) - 1) for i in range(len(row.symbol)))
    return Cleaned(row.symbol + text[match.end():], new_origin + origin[match.end():],
                   cleaned.note)


def _species_of(symbol: str, position: int, charge: int, text: str) -> Species:
    element = _element(symbol, position, text)
    if charge > element.Z or charge < Species.MIN_CHARGE:
        raise ConfspecPhysicsError(
            "impossible-charge", f"{symbol} cannot carry charge {charge:+d}: "
            + ("that removes more electrons than it has" if charge > 0
               else f"free atomic anions go down to {Species.MIN_CHARGE}"),
            position=position + len(symbol), text=text)
    return Species.model_construct(element=element, charge=charge)


def validate(text: str, species: Species | str | None = None, *, strict: bool = False,
             accept_uppercase: bool = False) -> list[ConfspecError]:
    """Every problem of a configuration (and of its electron count against ``species``).

    Returns an empty list when the text is valid. ``strict=True`` also reports
    ``non-canonical`` when the text is not written in the canonical plain notation.

    >>> [e.code for e in validate("1s2 2s3 2p7")]
    ['pauli-limit', 'pauli-limit']
    >>> validate("[Ar] 3d6 4s2", species="Fe")
    []
    """
    kind: Species | None = None
    problems: list[ConfspecError] = []
    if species is not None:
        try:
            kind = _as_species(species)
        except ConfspecError as err:
            problems.append(err)
    try:
        if kind is None and not strict and type(text) is str and len(text) <= MAX_INPUT_LENGTH \
                and fast_configuration(text) is not None:
            return problems
        text = _precheck(text, "configuration")
        occupancies, errors, _ = _resolved(text, accept_uppercase=accept_uppercase,
                                           species=kind)
    except ConfspecError as err:
        return [*problems, err]
    problems.extend(errors)
    if problems:
        return problems
    config = Configuration._trusted(occupancies)
    if kind is not None and config.electron_count != kind.electron_count:
        problems.append(ConfspecPhysicsError(
            "electron-count", f"{config} holds {config.electron_count} electrons; {kind} has "
            f"{kind.electron_count} (Z − charge)", position=None, text=text))
    if strict:
        canonical = str(config)
        if canonical != text:
            problems.append(ConfspecPhysicsError(
                "non-canonical", f"valid, but the canonical spelling is {canonical!r}",
                position=None, text=text))
    return problems


def normalize(text: str, *, accept_uppercase: bool = False, **format_options: Any) -> str:
    """Parse and write back in a chosen notation (default: canonical plain).

    >>> normalize("[ar] 4s^2 3d^{6}")
    '[Ar] 3d6 4s2'
    """
    return parse(text, accept_uppercase=accept_uppercase).format(**format_options)
