"""The frozen value models: Subshell, Configuration, Element, Species, ConfigurationRecord.

A configuration's value is its set of subshell occupancies; the written order, separators,
core abbreviation and superscripts are notation. Equality and hashing follow the value.
Models know nothing of lark, chemistry, the CLI or any adapter. Text input is handed to
:mod:`confspec.reading` through a lazy import: reading builds models and models accept text,
the one cycle of the root package (both are the value core; neither reaches outward). What
only an outer layer knows (a species' ground state, box diagrams) is lent to the models by
that layer at import through :func:`provide`, never imported from here.
"""

from __future__ import annotations

import warnings
from collections.abc import Callable, Iterable, Mapping
from fractions import Fraction
from typing import Annotated, Any, ClassVar, TypeAlias

from pydantic import (
    BaseModel,
    ConfigDict,
    Field,
    PlainSerializer,
    SerializerFunctionWrapHandler,
    field_validator,
    model_serializer,
    model_validator,
)
from pydantic_core import PydanticCustomError

from .data import elements as _elements
from .errors import ConfspecError, ConfspecSyntaxError, ConfspecTypeError
from .notation.render import options_from_spec, render_configuration, render_species
from .notation.resolve import canonical
from .physics import (
    SUBSHELL_LETTERS,
    Occupancy,
    Parity,
    pauli_limit,
    subshell_label,
    subshell_numbers,
)

__all__ = ["CompactConfiguration", "Configuration", "ConfigurationRecord", "Element",
           "HoleReference", "Species", "Subshell", "ground_configuration", "provide",
           "reference_occupancies"]

# -- what outer layers lend the models ----------------------------------------------------
_PROVIDED: dict[str, Callable[..., Any]] = {}
_PROVIDABLE = ("ground_state", "excitations", "box_diagram", "box_diagram_html")


def provide(name: str, function: Callable[..., Any]) -> None:
    """Lend the models a function that only an outer layer has: ``ground_state`` (species →
    Configuration), ``excitations``, ``box_diagram``, ``box_diagram_html``. Called by
    :mod:`confspec.chemistry` and :mod:`confspec.diagrams` when they are imported (which
    ``import confspec`` does)."""
    if name not in _PROVIDABLE:
        raise ValueError(f"nothing named {name!r} can be provided; one of {_PROVIDABLE}")
    _PROVIDED[name] = function


def _provided(name: str) -> Callable[..., Any]:
    function = _PROVIDED.get(name)
    if function is None:  # pragma: no cover - import confspec provides every name
        raise ConfspecSyntaxError("unavailable", f"{name} is provided by a layer that is "
                                  "not imported; import confspec first")
    return function


def _as_pydantic_error(err: ConfspecError) -> PydanticCustomError:
    """Carry our stable code into pydantic's ValidationError as the error type."""
    return PydanticCustomError(err.code, "{message}",
                               {"message": err.message, "position": err.position})


class Subshell(BaseModel):
    """One subshell and its occupancy: nl (``3d6``) or, with ``j``, relativistic nlj
    (``2p3/2^4``)."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    n: int = Field(ge=1, description="principal quantum number")
    l: int = Field(ge=0, description="orbital angular momentum quantum number")
    electrons: int = Field(ge=0, description="occupancy")
    j: Fraction | None = Field(
        default=None, description="total angular momentum j = l ± 1/2 of a relativistic "
        "subshell; absent for an nl subshell")

    @model_validator(mode="before")
    @classmethod
    def _from_text(cls, data: Any) -> Any:
        if isinstance(data, str):
            try:
                config = _parse()(data)
            except ConfspecError as err:
                raise _as_pydantic_error(err) from None
            if len(config.subshells) != 1:
                raise PydanticCustomError("syntax", "expected exactly one subshell")
            return config.subshells[0].model_dump()
        return data

    @model_validator(mode="after")
    def _check_physics(self) -> Subshell:
        if self.l >= self.n or self.l >= len(SUBSHELL_LETTERS):
            raise PydanticCustomError("invalid-subshell", "l must be below n (and below 16)")
        if self.j is not None and (self.j.denominator != 2 or abs(self.j - self.l) != Fraction(
                1, 2)):
            raise PydanticCustomError("invalid-subshell", "j must be l ± 1/2, not {j}",
                                      {"j": str(self.j)})
        if self.electrons > self.capacity:
            raise PydanticCustomError(
                "pauli-limit", "{label} holds at most {limit} electrons",
                {"label": self.label, "limit": self.capacity})
        return self

    @model_serializer(mode="wrap")
    def _drop_absent_j(self, handler: SerializerFunctionWrapHandler) -> dict[str, Any]:
        data: dict[str, Any] = handler(self)
        if self.j is None:
            data.pop("j", None)
        return data

    @property
    def letter(self) -> str:
        return SUBSHELL_LETTERS[self.l]

    @property
    def j2(self) -> int:
        """Twice j for a relativistic subshell, 0 for an nl subshell."""
        return 0 if self.j is None else int(2 * self.j)

    @property
    def label(self) -> str:
        """The subshell without its occupancy, e.g. ``"3d"`` or ``"2p3/2"``."""
        return subshell_label(self.n, self.l, self.j2)

    @property
    def capacity(self) -> int:
        """Pauli limit: 2(2l + 1) for nl, 2j + 1 for nlj."""
        return pauli_limit(self.l, self.j2)

    @property
    def is_full(self) -> bool:
        return self.electrons == self.capacity

    def __str__(self) -> str:
        if self.j is None:
            return f"{self.label}{self.electrons}"
        return f"{self.label}^{self.electrons}"

    def __repr__(self) -> str:
        return f"Subshell('{self}')"


_SUBSHELL_CACHE: dict[tuple[int, ...], Subshell] = {}


def make_subshell(n: int, l: int, electrons: int, j2: int = 0) -> Subshell:
    """An interned Subshell for an occupancy that is already known to be valid."""
    key = (n, l, electrons) if not j2 else (n, l, electrons, j2)
    sub = _SUBSHELL_CACHE.get(key)
    if sub is None:
        sub = Subshell.model_construct(n=n, l=l, electrons=electrons,
                                       j=Fraction(j2, 2) if j2 else None)
        if len(_SUBSHELL_CACHE) < 50_000:
            _SUBSHELL_CACHE[key] = sub
    return sub


_FIELDS_SET = {"subshells"}


def _parse() -> Any:
    from .reading import parse  # reading builds models: see the module docstring

    return parse


class Configuration(BaseModel):
    """Absolute subshell occupancies in canonical shell order (n, then l).

    >>> c = Configuration.model_validate("[Ar] 4s2 3d6")
    >>> str(c), c.electron_count
    ('[Ar] 3d6 4s2', 26)
    >>> c == Configuration.model_validate("1s2 2s2 2p6 3s2 3p6 3d6 4s2")
    True
    """

    model_config = ConfigDict(frozen=True, extra="forbid",
                              json_schema_extra={"description": (
                                  "Subshell occupancies in shell order; a notation string "
                                  "such as '[Ar] 3d6 4s2' is accepted on input.")})

    subshells: tuple[Subshell, ...] = ()

    @model_validator(mode="before")
    @classmethod
    def _from_text(cls, data: Any) -> Any:
        if isinstance(data, str):
            if not data.strip():
                return {"subshells": ()}  # the empty configuration (a bare nucleus)
            try:
                return {"subshells": _parse()(data).subshells}
            except ConfspecError as err:
                raise _as_pydantic_error(err) from None
        return data

    @field_validator("subshells")
    @classmethod
    def _canonical(cls, value: tuple[Subshell, ...]) -> tuple[Subshell, ...]:
        seen: set[tuple[int, int, int]] = set()
        for sub in value:
            overlapping = {(sub.n, sub.l, sub.j2)} if sub.j2 else {
                (sub.n, sub.l, 0), (sub.n, sub.l, 2 * sub.l - 1), (sub.n, sub.l, 2 * sub.l + 1)}
            if seen & overlapping or (sub.j2 and (sub.n, sub.l, 0) in seen):
                raise PydanticCustomError("duplicate-subshell", "{label} is given twice",
                                          {"label": sub.label})
            seen.add((sub.n, sub.l, sub.j2))
        if not any(s.j is not None for s in value):
            return tuple(sorted((s for s in value if s.electrons), key=lambda s: (s.n, s.l)))

        merged = canonical({(s.n, s.l, s.j2): s.electrons for s in value})
        return tuple(make_subshell(n, l, e, j2) for n, l, j2, e in merged)

    # -- construction ------------------------------------------------------------------
    @classmethod
    def from_checked(cls, occupancies: Iterable[tuple[int, ...]]) -> Configuration:
        """Build from occupancies already checked by the notation layer's resolver (no
        re-validation): (n, l, electrons) or (n, l, 2j, electrons) tuples. Use
        :meth:`from_occupancies` for values that are not checked yet."""
        quads = sorted(o if len(o) == 4 else (o[0], o[1], 0, o[2]) for o in occupancies)
        subs = tuple(make_subshell(n, l, e, j2) for n, l, j2, e in quads if e)
        return cls.model_construct(subshells=subs)

    @classmethod
    def from_shell_order(cls, occupancies: Iterable[Occupancy]) -> Configuration:
        """The fastest construction, for occupancies already checked *and* in shell order
        without zeros (what the notation layer's fast path returns)."""
        cached = _SUBSHELL_CACHE.get
        return cls._from_sorted(tuple([cached(o) or make_subshell(*o) for o in occupancies]))

    @classmethod
    def _from_sorted(cls, subshells: tuple[Subshell, ...]) -> Configuration:
        """Fastest construction, for the parser's fast path: subshells already valid,
        interned, sorted and without zeros."""
        config = cls.__new__(cls)
        object.__setattr__(config, "__dict__", {"subshells": subshells})
        object.__setattr__(config, "__pydantic_fields_set__", _FIELDS_SET)
        object.__setattr__(config, "__pydantic_extra__", None)
        object.__setattr__(config, "__pydantic_private__", None)
        return config

    @classmethod
    def from_occupancies(cls, occupancies: Mapping[str, int] | Iterable[Occupancy]
                         ) -> Configuration:
        """Build from ``{"3d": 6, "4s": 2}`` or ``[(3, 2, 6), (4, 0, 2)]``, validating.

        >>> str(Configuration.from_occupancies({"4s": 2, "3d": 6}))
        '3d6 4s2'
        """
        triples: list[Occupancy] = []
        if isinstance(occupancies, Mapping):
            subs = []
            for label, electrons in occupancies.items():
                mark = "^" if "/" in label else ""
                sub = Subshell.model_validate(f"{label}{mark}{electrons}" if electrons else label)
                subs.append(Subshell(n=sub.n, l=sub.l, j=sub.j, electrons=int(electrons)))
            return cls(subshells=tuple(subs))
        else:
            triples = [(int(n), int(l), int(e)) for n, l, e in occupancies]
        return cls(subshells=tuple(Subshell(n=n, l=l, electrons=e) for n, l, e in triples))

    def replace(self, **changes: int) -> Configuration:
        """A copy with some occupancies changed, validated: ``c.replace(**{"4s": 1})``."""
        occ = {s.label: s.electrons for s in self.subshells}
        occ.update(changes)
        return Configuration.from_occupancies(occ)

    # -- the value ---------------------------------------------------------------------
    @property
    def occupancies(self) -> tuple[Occupancy, ...]:
        """(n, l, electrons) per nl subshell; the j subshells of one nl are summed."""
        if not any(s.j is not None for s in self.subshells):
            return tuple((s.n, s.l, s.electrons) for s in self.subshells)
        summed: dict[tuple[int, int], int] = {}
        for s in self.subshells:
            summed[(s.n, s.l)] = summed.get((s.n, s.l), 0) + s.electrons
        return tuple((n, l, e) for (n, l), e in sorted(summed.items()))

    @property
    def is_relativistic(self) -> bool:
        """True when some subshell is written as nlj."""
        return any(s.j is not None for s in self.subshells)

    @property
    def electron_count(self) -> int:
        return sum([s.electrons for s in self.subshells])

    def occupancy(self, label: str) -> int:
        """Electrons in one subshell (0 when absent): ``c.occupancy("3d")``."""
        n, l = subshell_numbers(label)
        for sub in self.subshells:
            if sub.n == n and sub.l == l:
                return sub.electrons
        return 0

    # -- chemistry views (computed in the chemistry layer) -----------------------------
    @property
    def parity(self) -> Parity:
        """``"even"`` or ``"odd"``: the parity of the sum of l over all electrons."""
        return "odd" if sum(s.l * s.electrons for s in self.subshells) % 2 else "even"

    @property
    def open_subshells(self) -> tuple[Subshell, ...]:
        """Subshells that are neither empty nor full."""
        return tuple(s for s in self.subshells if not s.is_full)

    @property
    def unpaired_electrons(self) -> int:
        """Unpaired electrons by Hund's first rule, summed over the open nl subshells."""
        return sum(min(e, pauli_limit(l) - e) for _, l, e in self.occupancies)

    def excitations(self, reference: HoleReference) -> tuple[Any, ...]:
        """Deprecated: use ``confspec.excitations(configuration, reference)``."""
        warnings.warn("Configuration.excitations() is deprecated; use "
                      "confspec.excitations(configuration, reference)", DeprecationWarning,
                      stacklevel=2)
        result: tuple[Any, ...] = _provided("excitations")(self, reference)
        return result

    def is_ground_state(self, species: Species | str) -> bool:
        """Deprecated: use ``confspec.is_ground_state(configuration, species)``."""
        warnings.warn("Configuration.is_ground_state() is deprecated; use "
                      "confspec.is_ground_state(configuration, species)", DeprecationWarning,
                      stacklevel=2)
        return bool(self.occupancies == _provided("ground_state")(species).occupancies)

    @property
    def quads(self) -> list[tuple[int, int, int, int]]:
        """(n, l, 2j, electrons) per subshell in shell order; 2j = 0 for an nl subshell."""
        return [(s.n, s.l, s.j2, s.electrons) for s in self.subshells]

    # -- notation ----------------------------------------------------------------------
    def format(self, style: str = "plain", core: str = "condense", order: str = "shell", *,
               reference: HoleReference | None = None, split_j: bool = False,
               holes_relative_to: HoleReference | None = None) -> str:
        """Write in a notation: style plain|caret|unicode|latex|html|nist-asd,
        core condense|expand, order shell|filling; with ``reference`` (a Configuration, or
        a species meaning its ground state), as holes relative to it.
        ``holes_relative_to`` is the deprecated old name of ``reference``."""
        if holes_relative_to is not None:
            warnings.warn("format(holes_relative_to=...) is deprecated; use reference=",
                          DeprecationWarning, stacklevel=2)
            reference = reference if reference is not None else holes_relative_to
        return render_configuration(
            self.quads, style=style, core=core, order=order, split_j=split_j,
            reference=None if reference is None else _reference_quads(reference))

    def __format__(self, spec: str) -> str:
        if not spec:
            return str(self)
        options: dict[str, Any] = dict(options_from_spec(spec))
        return self.format(**options)

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"Configuration('{self}')"

    def boxes(self, form: str = "text", *, order: str = "shell", core: str = "condense",
              collapse_core: bool | None = None,
              charset: str = "unicode") -> str:
        """Orbital box diagram (Hund's rule arrows) as text, ``form="svg"`` or ``"html"``.

        >>> print(Configuration.model_validate("[Ne] 3s2 3p4").boxes())
        [Ne]  closed core, 10 electrons
        3s²   [↑↓]
        3p⁴   [↑↓][↑ ][↑ ]
        """
        text: str = _provided("box_diagram")(self, form=form, order=order,
                                             core=core, collapse_core=collapse_core,
                                             charset=charset)
        return text

    def _repr_html_(self) -> str:
        """Notebooks: the canonical text above the box diagram."""
        return (f'<div><div style="margin-bottom:0.3em">{self.format(style="html")}</div>'
                f"{_provided('box_diagram_html')(self)}</div>")

    def _repr_svg_(self) -> str:
        text: str = _provided("box_diagram")(self, form="svg")
        return text

    def _repr_latex_(self) -> str:
        return "$" + self.format(style="latex") + "$"

    def to_compact_json(self) -> str:
        """The canonical-string JSON form, e.g. ``"[Ar] 3d6 4s2"`` (quotes included)."""
        import json

        return json.dumps(str(self), ensure_ascii=False)


#: A Configuration field that serializes as its canonical string (``"[Ar] 3d6 4s2"``) instead
#: of the structured form; it accepts either form on input.
CompactConfiguration = Annotated[
    Configuration, PlainSerializer(str, return_type=str, when_used="always")]


class Element(BaseModel):
    """A chemical element, Z = 1–118, with its IUPAC symbol and name."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    Z: int = Field(ge=1, le=118)
    symbol: str
    name: str

    @model_validator(mode="before")
    @classmethod
    def _lookup(cls, data: Any) -> Any:
        row: _elements.ElementRow | None
        if isinstance(data, bool):
            return data
        if isinstance(data, int):
            row = _elements.by_number(data)
            if row is None:
                raise PydanticCustomError("unknown-element", "no element has Z = {z}",
                                          {"z": data})
            return row._asdict()
        if isinstance(data, str):
            row = _elements.by_symbol(data.strip()) or _elements.by_name(data)
            if row is None:
                raise PydanticCustomError("unknown-element", "{s!r} is not an element symbol",
                                          {"s": data})
            return row._asdict()
        return data

    @model_validator(mode="after")
    def _consistent(self) -> Element:
        row = _elements.by_number(self.Z)
        if row is None or (row.symbol, row.name) != (self.symbol, self.name):
            raise PydanticCustomError("unknown-element", "Z, symbol and name do not agree")
        return self

    def __str__(self) -> str:
        return self.symbol

    def __repr__(self) -> str:
        return f"Element('{self.symbol}')"


_MIN_CHARGE = -4


class Species(BaseModel):
    """An atom or atomic ion: element and integer charge.

    >>> s = Species.model_validate("Fe(III)")
    >>> str(s), s.electron_count
    ('Fe3+', 23)
    """

    model_config = ConfigDict(frozen=True, extra="forbid")
    MIN_CHARGE: ClassVar[int] = _MIN_CHARGE

    element: Element
    charge: int = 0

    @model_validator(mode="before")
    @classmethod
    def _from_text(cls, data: Any) -> Any:
        if isinstance(data, str):
            from .reading import parse_species  # see the module docstring

            try:
                parsed = parse_species(data)
            except ConfspecError as err:
                raise _as_pydantic_error(err) from None
            return {"element": parsed.element, "charge": parsed.charge}
        return data

    @model_validator(mode="after")
    def _possible(self) -> Species:
        if self.charge > self.element.Z or self.charge < _MIN_CHARGE:
            raise PydanticCustomError(
                "impossible-charge", "{symbol} cannot carry charge {charge}",
                {"symbol": self.element.symbol, "charge": self.charge})
        return self

    @property
    def Z(self) -> int:
        return self.element.Z

    @property
    def symbol(self) -> str:
        return self.element.symbol

    @property
    def name(self) -> str:
        return self.element.name

    @property
    def electron_count(self) -> int:
        """Z − charge (never negative)."""
        return self.element.Z - self.charge

    def format(self, style: str = "plain") -> str:
        """Styles: plain ``Fe2+``, unicode ``Fe²⁺``, latex, html, spectrum ``Fe III``,
        oxidation ``Fe(III)``."""
        return render_species(self.symbol, self.charge, style)

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"Species('{self}')"


class ConfigurationRecord(BaseModel):
    """A species with its configuration; the configuration must hold Z − charge electrons."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    species: Species
    configuration: Configuration

    @model_validator(mode="after")
    def _electron_count(self) -> ConfigurationRecord:
        have, want = self.configuration.electron_count, self.species.electron_count
        if have != want:
            raise PydanticCustomError(
                "electron-count", "{config} holds {have} electrons; {species} has {want}",
                {"config": str(self.configuration), "have": have,
                 "species": str(self.species), "want": want})
        return self

    def __str__(self) -> str:
        return f"{self.species}: {self.configuration}"


#: A hole reference: a Configuration, or a species (``Species`` or text such as ``"K"``)
#: standing for its ground state.
HoleReference: TypeAlias = "Configuration | Species | str"


def ground_configuration(species: Species | str) -> Configuration:
    """The ground configuration of a species, as the chemistry layer gives it (measured
    where published, else by rule; see ``confspec.ground_level`` for the provenance)."""
    result: Configuration = _provided("ground_state")(species)
    return result


def _reference_configuration(reference: HoleReference) -> Configuration:
    if isinstance(reference, Configuration):
        return reference
    if isinstance(reference, (Species, str)):
        return ground_configuration(reference)
    raise ConfspecTypeError("wrong-type", f"a hole reference is a Configuration or a "
                            f"species, not {type(reference).__name__}")


def _reference_quads(reference: HoleReference) -> list[tuple[int, int, int, int]]:
    return _reference_configuration(reference).quads


def reference_occupancies(reference: HoleReference) -> tuple[Occupancy, ...]:
    """The (n, l, electrons) occupancies that holes without a core refer to."""
    return _reference_configuration(reference).occupancies
