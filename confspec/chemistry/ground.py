"""Ground states of atoms and ions, each with its provenance.

Where a published ground level is shipped (``data/ground_levels.csv`` for the neutral atoms,
``data/ion_ground_levels.csv`` for cations, ``data/anion_ground_levels.csv`` for singly
charged anions) it is used as is, with its status (measured or predicted) and source. The
anion table also says which anions are known *not* to be bound; an anion it does not list
is "not established". Every other ion is derived by rule from the neutral atom's ground
configuration and marked ``provenance="rule"``:

* cations lose electrons from the subshell of highest n first, and within one n from the
  highest l (4s empties before 3d, 6s before 5d and 4f). The subshells outside the largest
  noble-gas core count first, so Ce⁴⁺ loses 6s, 5d and 4f (giving [Xe]) before anything of
  the [Xe] core; only then does the rule reach into the core (Ce⁵⁺: [Kr] 4d10 5s2 5p5);
* anions gain electrons in the Madelung order (n + l, then n).

The rule is an approximation (common practice, no source): free ions often differ (V⁺ is
3d4, not the rule's 3d3 4s1; Ca⁻ binds a 4p electron, not a 3d one), which is why measured
rows override it and why every rule-based result names the classes where it is known to fail.
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
    "RULE_FAILURE_CLASSES",
    "AnionRow",
    "Binding",
    "Excitation",
    "GroundLevel",
    "Provenance",
    "anion_rows",
    "d_electron_count",
    "excitations",
    "ground_level",
    "ground_state",
    "is_ground_state",
]

Provenance = Literal["measured", "predicted", "rule"]
#: Whether the species exists as a bound free ion: atoms and cations always are; an anion
#: is bound when a binding energy is measured, unbound when a source says it is not, and
#: "not established" when neither is shipped.
Binding = Literal["bound", "unbound", "not established"]

#: A species argument: a Species, an Element, a species string or an atomic number.
SpeciesLike = Species | Element | str | int

_CATION_RULE = ("rule: electrons removed from the neutral atom's ground configuration, "
                "highest n first and within one n the highest l, subshells outside the "
                "noble-gas core first; term by Hund's rules")
_ANION_RULE = ("rule: electrons added to the neutral atom's ground configuration in the "
               "Madelung order (n + l, then n); term by Hund's rules")
_NEGATIVE_IONS = ("Andersen, Haugen & Hotop, 'Binding Energies in Atomic Negative Ions: III', "
                  "J. Phys. Chem. Ref. Data 28, 1511 (1999)")
#: Where the ion rule is known to go wrong (common practice, no source; the shipped
#: measured rows show each class: Ca-, Sc-, La-, Ce2+, U2+, Ac+, Ni+, Ti+, V+).
RULE_FAILURE_CLASSES = (
    "alkaline-earth and group-3 anions (Ca-, Sr-, Ba-, Sc-, Y-, La- bind a p electron, "
    "not a d one)",
    "lanthanide and actinide ions (4f, 5d, 6s and 5f, 6d, 7s lie close together)",
    "ions where d and s lie close (Ni, Ti+, V+, La, Th: the free ion keeps d electrons "
    "the rule removes, or the reverse)",
)


class GroundLevel(BaseModel):
    """The ground configuration and ground term of a species, with where they come from.

    ``provenance`` is ``"measured"`` (NIST ASD and the negative-ion compilation named in
    ``source``), ``"predicted"`` (published calculations, e.g. superheavy elements) or
    ``"rule"`` (derived by the ion rules of this module, an approximation). ``hund_term`` is
    what Hund's rules give for the configuration when that differs from the listed term
    (Ce: measured ¹G°₄, Hund ³H°₄); it is None when they agree. ``caution`` says in words
    why a value is an estimate or unchecked; it is None for measured values checked
    against their source. ``binding`` says whether the species exists as a bound free ion
    (an unbound anion still gets the rule's configuration, with a caution saying it does
    not exist). ``from_memory`` is True when the shipped row was transcribed from memory
    and not yet checked against its publication; ``note`` carries the row's own remarks.
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
    binding: Binding = "bound"
    from_memory: bool = False

    @property
    def is_measured(self) -> bool:
        return self.provenance == "measured"

    @property
    def is_bound(self) -> bool | None:
        """True or False when known, None when not established."""
        return None if self.binding == "not established" else self.binding == "bound"

    def __str__(self) -> str:
        config = str(self.configuration) + ("" if self.configuration.subshells
                                            else " (no electrons)")
        term = f" {self.term}" if self.term is not None else ""
        extra = f"; Hund's rules would give {self.hund_term}" if self.hund_term else ""
        if self.binding != "bound":
            extra += "; not bound as a free ion" if self.binding == "unbound" else (
                "; binding not established")
        if self.from_memory:
            extra += "; transcribed from memory"
        return f"{self.species}: {config}{term} ({self.provenance}{extra})"

    def __repr__(self) -> str:
        return f"GroundLevel('{self}')"


class _Row(NamedTuple):
    configuration: Configuration
    term: Term | None
    status: Provenance
    source: str
    note: str

    @property
    def from_memory(self) -> bool:
        """Transcribed from memory and not checked against the publication since."""
        return self.note.startswith("from memory") and "checked against" not in self.note


class AnionRow(NamedTuple):
    """One row of the negative-ion table: bound (with its measured ground level and
    electron affinity) or unbound, with the source that says so."""

    binding: Binding
    level: _Row | None
    affinity_ev: float | None
    source: str
    note: str


def _row(record: dict[str, str], electrons: int, where: str) -> _Row:
    """A ground-level row, checked against the electron count it must hold."""
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


@cache
def anion_rows() -> dict[int, AnionRow]:
    """The singly charged anions the shipped table speaks about, by Z."""
    from ..data import elements as _elements

    rows: dict[int, AnionRow] = {}
    for r in read_table("anion_ground_levels.csv"):
        element = _elements.by_symbol(r["symbol"])
        if element is None:  # pragma: no cover - guarded by the data tests
            raise RuntimeError(f"anion_ground_levels.csv: unknown symbol {r['symbol']!r}")
        note = r.get("note") or ""
        if r["status"] == "unbound":
            rows[element.Z] = AnionRow("unbound", None, None, r["source"], note)
        else:
            level = _row(r, element.Z + 1, f"anion_ground_levels.csv {r['symbol']}-")
            rows[element.Z] = AnionRow("bound", level, float(r["affinity_ev"]),
                                       r["source"], note)
    return rows


def _binding(Z: int, charge: int) -> tuple[Binding, str]:
    """Whether the species is bound, and the source that says so ("" for cations)."""
    if charge >= 0:
        return "bound", ""
    if charge <= -2:
        return "unbound", _NEGATIVE_IONS
    row = anion_rows().get(Z)
    return ("not established", "") if row is None else (row.binding, row.source)


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


#: Be, Mg, Ca, Sr, Ba, Ra and Sc, Y, La, Lu, Ac, Lr (both placements of group 3).
_GROUPS_2_AND_3 = frozenset({4, 12, 20, 38, 56, 88, 21, 39, 57, 71, 89, 103})
#: Z ranges of the d block (groups 3-12 of periods 4-7, La and Ac counted with the f rows).
_D_BLOCK = ((21, 30), (39, 48), (72, 80), (104, 112))


def _failure_class(species: Species) -> str | None:
    """The known failure class of the ion rule this species falls into, if any."""
    z = species.Z
    if species.charge < 0 and z in _GROUPS_2_AND_3:
        return RULE_FAILURE_CLASSES[0]
    if species.charge > 0 and (57 <= z <= 71 or 89 <= z <= 103):
        return RULE_FAILURE_CLASSES[1]
    # beyond 2+ the d subshell lies clearly below the next s (common practice, no source)
    if 0 < species.charge <= 2 and any(lo <= z <= hi for lo, hi in _D_BLOCK):
        return RULE_FAILURE_CLASSES[2]
    return None


def _rule_caution(species: Species, neutral: _Row, binding: Binding,
                  binding_source: str) -> str:
    if species.charge == species.Z:
        return "a bare nucleus: no electrons, so nothing is estimated"
    if binding == "unbound":
        what = ("multiply charged atomic anions are not bound as free ions"
                if species.charge <= -2 else f"{species} is not bound as a free ion")
        return (f"{what} ({binding_source}); the configuration shown is what the addition "
                "rule gives, for a state that does not exist as a stable free ion")
    base = ("derived by rule, not measured: no published ground level is shipped for this "
            "ion. The rule is known to fail for " + "; for ".join(RULE_FAILURE_CLASSES))
    failure = _failure_class(species)
    if failure is not None:
        base += f". This ion is one of the {failure.split(' (')[0]}, so treat it with care"
    if neutral.status == "predicted":
        base += "; the neutral atom's configuration it starts from is itself predicted"
    if binding == "not established":
        base += (f"; whether {species} is bound as a free ion is not established (no "
                 "measured binding energy is shipped)")
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
    binding, binding_source = _binding(Z, charge)
    listed: _Row | None
    if charge == 0:
        listed = neutral
    elif charge == -1:
        anion = anion_rows().get(Z)
        listed = anion.level if anion is not None else None
    else:
        listed = _ion_rows().get((Z, charge))
    from_memory = False
    if listed is not None:
        config, term = listed.configuration, listed.term
        provenance, source, note = listed.status, listed.source, listed.note
        from_memory = listed.from_memory
        cautions = [] if provenance == "measured" else [
            "predicted by calculation, not measured; see the note and source"]
        if from_memory:
            cautions.append("transcribed from memory from the source named and not yet "
                            "checked against it")
        caution = "; ".join(cautions) or None
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
        provenance = "rule"
        note = "" if binding != "unbound" or charge <= -2 else anion_rows()[Z].note
        caution = _rule_caution(species, neutral, binding, binding_source)
    hund = hund_ground_term(config)
    return GroundLevel.model_construct(
        species=species, configuration=config, term=term, provenance=provenance,
        source=source, note=note, hund_term=None if term is None or hund == term else hund,
        caution=caution, binding=binding, from_memory=from_memory)


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
