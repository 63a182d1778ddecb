"""The public reading functions: parse, parse_species, validate, normalize, and the one
coercion of user values into models (:func:`as_species`, :func:`as_configuration`).

Three stages kept apart: read the text (the notation layer: fast path or grammar, then the
resolver), build the model, format it (renderers only read the model). Parsing raises the
first problem; :func:`validate` returns all of them. For any ``str`` input nothing but
:class:`~confspec.ConfspecError` escapes.
"""

from __future__ import annotations

import re
import warnings
from functools import lru_cache
from typing import Any

from .data import elements as _elements
from .errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError, ConfspecTypeError
from .models import (
    Configuration,
    Element,
    HoleReference,
    Species,
    ground_configuration,
    reference_occupancies,
)
from .notation.clean import Cleaned, clean, remap, species_noise
from .notation.fastpath import fast_occupancies
from .notation.read import MAX_INPUT_LENGTH, OUTER_SPACE, precheck, read_configuration
from .physics import Occupancy

__all__ = ["MAX_INPUT_LENGTH", "ConfigurationLike", "as_configuration", "as_species",
           "normalize", "parse", "parse_species", "validate"]


@lru_cache(maxsize=65_536)
def _parse_cached(text: str, accept_uppercase: bool) -> Configuration:
    fast = fast_occupancies(text)  # common spellings need no precheck: see notation.fastpath
    if fast is not None:
        return Configuration.from_shell_order(fast)
    text = precheck(text, "configuration")
    occupancies, errors, _ = read_configuration(text, accept_uppercase=accept_uppercase)
    if errors:
        raise errors[0]
    return Configuration.from_checked(occupancies)


def as_species(species: Species | Element | str | int) -> Species:
    """The one coercion of a species argument: a Species, an Element, a species string
    (``"Fe2+"``, ``"Fe III"``) or an atomic number (the neutral atom)."""
    if isinstance(species, Species):
        return species
    if isinstance(species, Element):
        return Species.model_construct(element=species, charge=0)
    if isinstance(species, str):
        try:
            return parse_species(species)
        except ConfspecError as err:
            if not _reads_as_configuration(species):
                raise
            raise type(err)(err.code, f"{err.message}; the text reads as a configuration, "
                            "which does not say which element it belongs to: give the "
                            "species", position=err.position, text=err.text) from None
    if isinstance(species, int) and not isinstance(species, bool):
        row = _elements.by_number(species)
        if row is None:
            raise ConfspecPhysicsError("unknown-element", f"no element has Z = {species}",
                                       text=str(species))
        return Species.model_construct(element=_element(row.symbol, 0, row.symbol), charge=0)
    why = ("; a configuration does not say which element it belongs to"
           if isinstance(species, Configuration) else "")
    raise ConfspecTypeError(
        "wrong-type", "expected a species (a Species, an Element, a species string such as "
        f"'Fe2+' or 'Fe III', or an atomic number), not {type(species).__name__}{why}")


def _reads_as_configuration(text: str) -> bool:
    try:
        parse(text)
    except ConfspecError:
        return False
    return True


#: what a configuration argument may be: the configuration, or a species for its ground state
ConfigurationLike = Configuration | Species | Element | str | int


def as_configuration(configuration: ConfigurationLike) -> Configuration:
    """The one coercion of a configuration argument: a Configuration, its notation text, or
    a species (a Species, an Element, a species string such as ``"Fe3+"`` or ``"Fe III"``,
    an atomic number) standing for its ground configuration, measured where published
    (``ground_level`` gives the provenance).

    Text is read as a configuration first; only text that is no configuration is read as a
    species. When it is neither, the error is the reading that got further."""
    if isinstance(configuration, Configuration):
        return configuration
    if isinstance(configuration, str):
        try:
            return parse(configuration)
        except ConfspecError as as_notation:
            try:
                species = parse_species(configuration)
            except ConfspecError as as_species_text:
                raise _further(as_notation, as_species_text) from None
            return ground_configuration(species)
    if isinstance(configuration, (Species, Element)) or (
            isinstance(configuration, int) and not isinstance(configuration, bool)):
        return ground_configuration(as_species(configuration))
    raise ConfspecTypeError(
        "wrong-type", "expected a configuration (a Configuration or its notation text) or a "
        "species standing for its ground state (a Species, a species string such as 'Fe3+', "
        f"an atomic number), not {type(configuration).__name__}")


def _further(first: ConfspecError, second: ConfspecError) -> ConfspecError:
    """Of two readings of one text, the error of the one that read further (the first on a
    tie): 'Fe 3+' fails as a species later than as a configuration."""
    def reach(err: ConfspecError) -> int:
        return -1 if err.position is None else err.position
    return second if reach(second) > reach(first) else first


def _hole_reference(reference: HoleReference | None, species: Species | str | None,
                    ) -> tuple[Occupancy, ...] | None:
    if species is not None:
        warnings.warn("parse(species=...) is deprecated; pass the hole reference as "
                      "reference= (a Configuration or a species)", DeprecationWarning,
                      stacklevel=3)
        reference = reference if reference is not None else species
    return None if reference is None else reference_occupancies(reference)


def parse(text: str, *, reference: HoleReference | None = None,
          accept_uppercase: bool = False, species: Species | str | None = None
          ) -> Configuration:
    """Read a configuration in any supported notation; raise the first problem.

    ``reference`` (a Configuration, or a species standing for its ground state) lets holes
    without a core (``1s^-1``) refer to it. ``species=`` is its deprecated old name.

    >>> str(parse("1s22s22p63s1"))
    '[Ne] 3s1'
    >>> str(parse("[Ne] 2p^-1 3s2"))
    '[He] 2s2 2p5 3s2'
    """
    if reference is None and species is None and type(text) is str \
            and len(text) <= MAX_INPUT_LENGTH:
        return _parse_cached(text, accept_uppercase)
    text = precheck(text, "configuration")
    ref = _hole_reference(reference, species)
    occupancies, errors, _ = read_configuration(text, accept_uppercase=accept_uppercase,
                                                reference=ref)
    if errors:
        raise errors[0]
    return Configuration.from_checked(occupancies)


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
    lead = text.lstrip(OUTER_SPACE)
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
    original = precheck(text, "species")
    cleaned = species_noise(_named(clean(original, notes=False), original), _z_of)
    text = cleaned.text
    from .notation.grammar import parse_species_raw

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
             accept_uppercase: bool = False, reference: HoleReference | None = None
             ) -> list[ConfspecError]:
    """Every problem of a configuration (and of its electron count against ``species``).

    Holes without a core refer to ``reference``, or else to the ground state of ``species``.

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
            kind = as_species(species)
        except ConfspecError as err:
            problems.append(err)
    try:
        if kind is None and not strict and type(text) is str and len(text) <= MAX_INPUT_LENGTH \
                and fast_occupancies(text) is not None:
            return problems
        text = precheck(text, "configuration")
        given = reference if reference is not None else kind
        occupancies, errors, _ = read_configuration(
            text, accept_uppercase=accept_uppercase,
            reference=None if given is None else (lambda: reference_occupancies(given)))
    except ConfspecError as err:
        return [*problems, err]
    problems.extend(errors)
    if problems:
        return problems
    config = Configuration.from_checked(occupancies)
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
