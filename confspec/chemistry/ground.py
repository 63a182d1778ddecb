"""Ground states of atoms and ions, each with its provenance.

Where a published ground level is shipped (``data/ground_levels.csv`` for the neutral atoms,
``data/ion_ground_levels.csv`` for ions) it is used as is, with its status (measured or
predicted) and source. Every other ion is derived by rule from the neutral atom's ground
configuration and marked ``provenance="rule"``:

* cations lose electrons from the subshell of highest n first, and within one n from the
  highest l (4s empties before 3d, 6s before 5d and 4f). The subshells outside the largest
  noble-gas core count first, so Ce⁴⁺ loses 6s, 5d and 4f (giving [Xe]) before anything of
  the [Xe] core; only then does the rule reach into the core (Ce⁵⁺: [Kr] 4d10 5s2 5p5);
* anions gain electrons in the Madelung order (n + l, then n).

The rule is an approximation (common practice, no source): free ions often differ (V⁺ is
3d4, not the rule's 3d3 4s1), which is why measured rows override it.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from functools import cache
from typing import Literal, NamedTuple

from pydantic import BaseModel, ConfigDict

from ..data import read_table
from ..errors import ConfspecPhysicsError
from ..models import Configuration, Element, Species, provide
from ..notation.render import largest_core
from ..physics import NOBLE_CORES, Occupancy, filling_key, madelung_sequence, pauli_limit
from ..reading import as_configuration, as_species
from .terms import Term, hund_ground_term, parse_ls_term

__all__ = [
    "Excitation",
    "GroundLevel",
    "Provenance",
    "d_electron_count",
    "excitations",
    "ground_level",
    "ground_state",
    "is_ground_state",
]

Provenance = Literal["measured", "predicted", "rule"]

#: A species argument: a Species, an Element, a species string or an atomic number.
SpeciesLike = Species | Element | str | int

_CATION_RULE = ("rule: electrons removed from the neutral atom's ground configuration, "
                "highest n first and within one n the highest l, subshells outside the "
                "noble-gas core first; term by Hund's rules")
_ANION_RULE = ("rule: electrons added to the neutral atom's ground configuration in the "
               "Madelung order (n + l, then n); term by Hund's rules")


class GroundLevel(BaseModel):
    """The ground configuration and ground term of a species, with where they come from.

    ``provenance`` is ``"measured"`` (NIST ASD and the negative-ion compilation named in
    ``source``), ``"predicted"`` (published calculations, e.g. superheavy elements) or
    ``"rule"`` (derived by the ion rules of this module, an approximation). ``hund_term`` is
    what Hund's rules give for the configuration when that differs from the listed term
    (Ce: measured ¹G°₄, Hund ³H°₄); it is None when they agree. ``caution`` says in words
    why a value is an estimate; it is None for measured values.
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    species: Species
    configuration: Configuration
    term: Term | None
    provenance: Provenance
    source: str
    note: str = ""
    hund_term: Term | None = None
    caution: str | None = None

    @property
    def is_measured(self) -> bool:
        return self.provenance == "measured"

    def __str__(self) -> str:
        config = str(self.configuration) + ("" if self.configuration.subshells
                                            else " (no electrons)")
        term = f" {self.term}" if self.term is not None else ""
        extra = f"; Hund's rules would give {self.hund_term}" if self.hund_term else ""
        return f"{self.species}: {config}{term} ({self.provenance}{extra})"

    def __repr__(self) -> str:
        return f"GroundLevel('{self}')"


class _Row(NamedTuple):
    configuration: Configuration
    term: Term | None
    status: Provenance
    source: str
    note: str


def _row(record: dict[str, str], electrons: int, where: str) -> _Row:
    from ..reading import parse

    config = parse(record["configuration"]) if record["configuration"].strip() else (
        Configuration())
    if config.electron_count != electrons:  # pragma: no cover - guarded by the data tests
        raise RuntimeError(f"{where}: {config} does not hold {electrons} electrons")
    status = record["status"]
    if status not in ("measured", "predicted"):  # pragma: no cover - guarded by data tests
        raise RuntimeError(f"{where}: unknown status {status!r}")
    term = parse_ls_term(record["term"]) if record["term"].strip() else None
    prov: Provenance = "measured" if status == "measured" else "predicted"
    return _Row(config, term, prov, record["source"], record.get("note") or "")


@cache
def _neutral_rows() -> dict[int, _Row]:
    return {int(r["Z"]): _row(r, int(r["Z"]), f"ground_levels.csv Z={r['Z']}")
            for r in read_table("ground_levels.csv")}


@cache
def _ion_rows() -> dict[tuple[int, int], _Row]:
    from ..data import elements as _elements

    rows: dict[tuple[int, int], _Row] = {}
    for r in read_table("ion_ground_levels.csv"):
        element = _elements.by_symbol(r["symbol"])
        if element is None:  # pragma: no cover - guarded by the data tests
            raise RuntimeError(f"ion_ground_levels.csv: unknown symbol {r['symbol']!r}")
        charge = int(r["charge"])
        rows[(element.Z, charge)] = _row(r, element.Z - charge,
                                         f"ion_ground_levels.csv {r['symbol']}{charge:+d}")
    return rows


# ---------------------------------------------------------------------------- the rules
def _removal_choice(occ: dict[tuple[int, int], int]) -> tuple[int, int]:
    """The subshell a cation loses its next electron from (see the module docstring)."""
    occupied = [(n, l, e) for (n, l), e in occ.items() if e > 0]
    core = largest_core(occupied)
    inside = {(n, l) for n, l, _ in NOBLE_CORES[core]} if core else set()
    outside = [(n, l) for n, l, _ in occupied if (n, l) not in inside]
    return max(outside or [(n, l) for n, l, _ in occupied])


def remove_electrons(occupancies: Iterable[Occupancy], count: int) -> tuple[Occupancy, ...]:
    """Apply the cation rule ``count`` times."""
    occ = {(n, l): e for n, l, e in occupancies}
    for _ in range(count):
        key = _removal_choice(occ)
        occ[key] -= 1
    return tuple(sorted((n, l, e) for (n, l), e in occ.items() if e))


def add_electrons(occupancies: Iterable[Occupancy], count: int) -> tuple[Occupancy, ...]:
    """Apply the anion rule ``count`` times: the first subshell in Madelung order with room."""
    occ = {(n, l): e for n, l, e in occupancies}
    for _ in range(count):
        for n, l in madelung_sequence():
            if occ.get((n, l), 0) < pauli_limit(l):
                occ[(n, l)] = occ.get((n, l), 0) + 1
                break
    return tuple(sorted((n, l, e) for (n, l), e in occ.items() if e))


def outermost_subshell(configuration: Configuration) -> tuple[int, int] | None:
    """(n, l) of the subshell the cation rule empties first, or None when empty."""
    occ = {(n, l): e for n, l, e in configuration.occupancies}
    return _removal_choice(occ) if occ else None


def _rule_caution(species: Species, neutral: _Row) -> str:
    if species.charge == species.Z:
        return "a bare nucleus: no electrons, so nothing is estimated"
    base = ("derived by rule, not measured: no published ground level is shipped for this "
            "ion, and free ions can differ from the rule (V+ is 3d4, not 3d3 4s1)")
    if neutral.status == "predicted":
        base += "; the neutral atom's configuration it starts from is itself predicted"
    if species.charge <= -2:
        base += "; multiply charged atomic anions are not bound as free ions"
    elif species.charge == -1:
        base += "; this anion may not be bound as a free ion"
    return base


@cache
def _ground_level(Z: int, charge: int) -> GroundLevel:
    neutral = _neutral_rows()[Z]
    from ..data import elements as _elements

    row = _elements.by_number(Z)
    assert row is not None
    species = Species.model_construct(
        element=Element.model_construct(Z=row.Z, symbol=row.symbol, name=row.name),
        charge=charge)
    listed = neutral if charge == 0 else _ion_rows().get((Z, charge))
    if listed is not None:
        config, term = listed.configuration, listed.term
        provenance, source, note = listed.status, listed.source, listed.note
        caution = None if provenance == "measured" else (
            "predicted by calculation, not measured; see the note and source")
    else:
        if charge > 0:
            occupancies = remove_electrons(neutral.configuration.occupancies, charge)
            source = _CATION_RULE
        else:
            occupancies = add_electrons(neutral.configuration.occupancies, -charge)
            source = _ANION_RULE
        source += f"; neutral ground configuration from: {neutral.source}"
        config = Configuration.from_checked(occupancies)
        term = hund_ground_term(config)
        provenance, note = "rule", ""
        caution = _rule_caution(species, neutral)
    hund = hund_ground_term(config)
    return GroundLevel.model_construct(
        species=species, configuration=config, term=term, provenance=provenance,
        source=source, note=note, hund_term=None if term is None or hund == term else hund,
        caution=caution)


def ground_level(species: SpeciesLike) -> GroundLevel:
    """The ground level of an atom or ion (Z = 1–118, charge −4 … +Z) with provenance.

    >>> level = ground_level("Ce")
    >>> str(level.configuration), str(level.term), level.provenance, str(level.hund_term)
    ('[Xe] 4f1 5d1 6s2', '1G°4', 'measured', '3H°4')
    >>> ground_level("Fe7+").provenance
    'rule'
    """
    kind = as_species(species)
    return _ground_level(kind.Z, kind.charge)


def ground_state(species: SpeciesLike) -> Configuration:
    """The ground configuration of an atom or ion (see :func:`ground_level` for provenance).

    >>> str(ground_state("Fe2+")), str(ground_state("V+")), str(ground_state("Ce4+"))
    ('[Ar] 3d6', '[Ar] 3d4', '[Kr] 4d10 5s2 5p6')
    """
    return ground_level(species).configuration


def is_ground_state(configuration: Configuration | str, species: SpeciesLike) -> bool:
    """Whether the configuration is the species' ground configuration (as shipped/derived);
    nlj subshells count by their nl sums."""
    return as_configuration(configuration).occupancies == ground_state(species).occupancies


# ---------------------------------------------------------------------------- d count
def _group(Z: int) -> int | None:
    """IUPAC group 1–18 of a d-block element, else None (La, Ac, Lu, Lr all count as 3)."""
    for start in (21, 39, 71, 103):  # Sc, Y, Lu, Lr: first members of groups 3–12
        if start <= Z < start + 10:
            return Z - start + 3
    return 3 if Z in (57, 89) else None


def d_electron_count(species: SpeciesLike) -> int:
    """The ligand-field d-electron count of a transition-metal ion: group − oxidation state.

    This is the convention for metals in compounds and complexes (Fe³⁺ is d5, Cu⁺ d10,
    Co(−I) d10); it is *not* the free-ion ground state, which can differ (free V⁺ is
    3d4, its d count 4; free Sc⁺ is 3d1 4s1, its d count 2). Groups 3–12 only; La, Ac, Lu
    and Lr all count as group 3 (common practice, no source).

    >>> d_electron_count("Fe3+"), d_electron_count("Cu+"), d_electron_count("Ti4+")
    (5, 10, 0)
    """
    kind = as_species(species)
    group = _group(kind.Z)
    if group is None:
        raise ConfspecPhysicsError(
            "not-d-block", f"{kind.symbol} is not a transition metal (groups 3–12); the "
            "ligand-field d count applies to d-block ions only", text=str(kind))
    count = group - kind.charge
    if not 0 <= count <= 10:
        raise ConfspecPhysicsError(
            "d-count-out-of-range", f"{kind} would have {count} d electrons (group {group} "
            f"minus oxidation state {kind.charge:+d}); a d subshell holds 0–10",
            text=str(kind))
    return count


# ---------------------------------------------------------------------------- excitations
def reference_configuration(reference: Configuration | SpeciesLike) -> Configuration:
    """A Configuration as given, or the ground state of a Species / species string."""
    if isinstance(reference, Configuration):
        return reference
    return ground_state(reference)


@dataclass(frozen=True, slots=True)
class Excitation:
    """Electrons moved from one subshell to another (None: removed from / added to the atom).

    ``str()``: ``3d -> 4s``, ``4s -> 3d (×2)``, ``4s -> removed``, ``added -> 4p``.
    """

    source: str | None
    target: str | None
    electrons: int = 1

    def __str__(self) -> str:
        text = f"{self.source or 'added'} -> {self.target or 'removed'}"
        return text if self.electrons == 1 else f"{text} (×{self.electrons})"


def excitations(configuration: Configuration | str,
                reference: Configuration | SpeciesLike) -> tuple[Excitation, ...]:
    """Which electrons moved relative to a reference (a species means its ground state).

    Electrons that left a subshell are paired with electrons that arrived elsewhere, both
    taken in Madelung order (lowest first); an unpaired surplus is an electron removed
    (ionization) or added. Empty when the two configurations are equal.

    >>> [str(e) for e in excitations(Configuration.model_validate("[Ar] 3d3 4s1"), "V+")]
    ['3d -> 4s']
    """
    ref = reference_configuration(reference)
    have = {(n, l): e for n, l, e in as_configuration(configuration).occupancies}
    want = {(n, l): e for n, l, e in ref.occupancies}
    left: list[tuple[int, int]] = []
    arrived: list[tuple[int, int]] = []
    for key in sorted(set(have) | set(want), key=lambda k: filling_key(*k)):
        change = have.get(key, 0) - want.get(key, 0)
        (arrived if change > 0 else left).extend([key] * abs(change))
    moves: dict[tuple[str | None, str | None], int] = {}
    for i in range(max(len(left), len(arrived))):
        source = _label(left[i]) if i < len(left) else None
        target = _label(arrived[i]) if i < len(arrived) else None
        moves[(source, target)] = moves.get((source, target), 0) + 1
    return tuple(Excitation(s, t, k) for (s, t), k in moves.items())


def _label(key: tuple[int, int]) -> str:
    from ..physics import subshell_label

    return subshell_label(*key)


# the models ask for ground states (a species as a hole reference) and excitations
# through these, without importing chemistry
provide("ground_state", ground_state)
provide("excitations", excitations)
