"""Ground levels of anions and ions against published data and real tables read at test time.

The negative-ion table follows Andersen, Haugen & Hotop, J. Phys. Chem. Ref. Data 28, 1511
(1999) (values from memory, as its notes say); the real tables in ``../shared/real-world/``
(a NIST ASD ionization-energies export, PubChem's and a periodic-table JSON dataset's
electron affinities) are independent checks, skipped with the reason when absent.
"""

from __future__ import annotations

import csv
import json
from pathlib import Path

import pytest

import confspec
from confspec import ground_level, parse
from confspec.chemistry.ground import RULE_FAILURE_CLASSES, anion_rows

REAL = Path(__file__).resolve().parents[3] / "shared" / "real-world"
needs_real = pytest.mark.skipif(not REAL.is_dir(), reason=f"{REAL} is absent: the real-world "
                                "tables are not shipped with the repository")

# Andersen, Haugen & Hotop 1999 (from memory): these atoms bind no extra electron.
UNBOUND = {"He", "Be", "N", "Ne", "Mg", "Ar", "Mn", "Zn", "Kr", "Cd", "Xe", "Hg", "Rn"}


@pytest.mark.parametrize(("species", "config", "term"), [
    # Andersen, Haugen & Hotop 1999 (from memory): the alkaline-earth anions bind a p
    # electron, the group-3 anions Sc-, Y- a p electron beside d s2
    ("Ca-", "[Ar] 4s2 4p1", "2P°1/2"),
    ("Sr-", "[Kr] 5s2 5p1", "2P°1/2"),
    ("Ba-", "[Xe] 6s2 6p1", "2P°1/2"),
    ("Sc-", "[Ar] 3d1 4s2 4p1", "1D°2"),
    ("Y-", "[Kr] 4d1 5s2 5p1", "1D°2"),
    # Walter et al., Phys. Rev. Lett. 113, 063001 (2014) (from memory)
    ("La-", "[Xe] 5d2 6s2", "3F2"),
    ("B-", "[He] 2s2 2p2", "3P0"),
    ("Al-", "[Ne] 3s2 3p2", "3P0"),
    ("P-", "[Ne] 3s2 3p4", "3P2"),
    ("K-", "[Ar] 4s2", "1S0"),
    ("Ni-", "[Ar] 3d9 4s2", "2D5/2"),
    ("Pt-", "[Xe] 4f14 5d9 6s2", "2D5/2"),
    ("Pd-", "[Kr] 4d10 5s1", "2S1/2"),
])
def test_measured_anions(species: str, config: str, term: str) -> None:
    level = ground_level(species)
    assert level.configuration == parse(config)
    assert str(level.term) == term
    assert level.provenance == "measured" and level.binding == "bound" and level.is_bound


@pytest.mark.parametrize("symbol", sorted(UNBOUND))
def test_unbound_anions_are_said_plainly(symbol: str) -> None:
    level = ground_level(f"{symbol}-")
    assert level.binding == "unbound" and level.is_bound is False
    assert level.provenance == "rule"
    assert level.caution and f"{symbol}- is not bound as a free ion" in level.caution
    assert "Andersen" in level.caution
    assert "not bound as a free ion" in str(level)


def test_multiply_charged_anions_are_unbound() -> None:
    # Andersen, Haugen & Hotop 1999: no doubly charged atomic anion is bound (from memory)
    for species in ("O2-", "N3-", "C4-", "Cl2-"):
        level = ground_level(species)
        assert level.binding == "unbound"
        assert "multiply charged atomic anions are not bound" in (level.caution or "")


@pytest.mark.parametrize("species", ["Nd-", "Fr-", "Ra-", "Th-", "Og-", "Po-"])
def test_other_anions_are_not_established(species: str) -> None:
    level = ground_level(species)
    assert level.binding == "not established" and level.is_bound is None
    assert "not established" in (level.caution or "") and level.provenance == "rule"


def test_the_table_covers_every_element_it_speaks_about_once() -> None:
    rows = anion_rows()
    assert {confspec.Element.model_validate(z).symbol for z, r in rows.items()
            if r.binding == "unbound"} == UNBOUND
    bound = [r for r in rows.values() if r.binding == "bound"]
    assert len(bound) >= 50
    assert all(r.affinity_ev is not None and 0 < r.affinity_ev < 3.7 for r in bound)
    # Cl has the largest electron affinity of all atoms (3.613 eV; common practice)
    best = max(rows, key=lambda z: rows[z].affinity_ev or 0.0)
    assert confspec.Element.model_validate(best).symbol == "Cl"


@pytest.mark.parametrize(("species", "config"), [
    # NIST ASD ground levels (from memory): where the removal rule goes wrong
    ("Ac+", "[Rn] 7s2"), ("Ac2+", "[Rn] 7s1"), ("Hf+", "[Xe] 4f14 5d1 6s2"),
    ("U2+", "[Rn] 5f4"), ("Cm+", "[Rn] 5f7 7s2"), ("Pa+", "[Rn] 5f2 7s2"),
    ("Ti+", "[Ar] 3d2 4s1"), ("V+", "[Ar] 3d4"),
])
def test_measured_ions_the_rule_misses(species: str, config: str) -> None:
    level = ground_level(species)
    assert level.configuration == parse(config) and level.provenance == "measured"


@pytest.mark.parametrize(("species", "failure"), [
    ("Pr+", 1), ("Np3+", 1), ("Ni3+", None), ("Cr2+", None), ("Os2+", 2), ("Ra-", 0),
    ("Fe7+", None), ("Sn3+", None),
])
def test_rule_cautions_name_the_failure_classes(species: str, failure: int | None) -> None:
    level = ground_level(species)
    caution = level.caution or ""
    if level.provenance == "rule":
        for known in RULE_FAILURE_CLASSES:
            assert known in caution
        named = [i for i, cls in enumerate(RULE_FAILURE_CLASSES)
                 if f"This ion is one of the {cls.split(' (')[0]}" in caution]
        assert named == ([] if failure is None else [failure])
    else:
        assert failure is None


# ------------------------------------------------------------------- real tables
def _excel(value: str) -> str:
    return value[2:-1] if value.startswith('="') else value  # NIST's ="..." cells


@needs_real
def test_every_species_of_a_nist_asd_export_has_its_published_ground_level() -> None:
    # NIST ASD "Ionization Energies" CSV export, H I to Mg III (real-world
    # mat_nist_ionisation_slice.csv): Ground Shells and Ground Level of each spectrum
    checked: set[str] = set()
    with open(REAL / "mat_nist_ionisation_slice.csv", newline="", encoding="utf-8") as f:
        for row in csv.DictReader(f):
            spectrum = _excel(row["Sp. Name"])
            shells, level_text = _excel(row["Ground Shells (a)"]), _excel(row["Ground Level"])
            species = confspec.parse_species(spectrum)
            level = ground_level(species)
            assert level.configuration == parse(shells), spectrum
            published = confspec.parse_term(level_text.replace("*", "°").replace("<", "")
                                            .replace(">", ""))
            assert level.term == published, (spectrum, str(level.term), level_text)
            checked.add(str(species))
    assert len(checked) == 69
    # the rows whose note claims this check are exactly the shipped rows it covers
    claims = {str(level.species) for level in _shipped_levels()
              if "checked against a NIST ASD Ionization Energies export" in level.note}
    assert claims and claims <= checked
    assert not any(level.from_memory for level in _shipped_levels()
                   if str(level.species) in claims)


def _shipped_levels() -> list[confspec.GroundLevel]:
    from confspec.chemistry.ground import _ion_rows

    species = [confspec.Species(element=z, charge=0) for z in range(1, 119)]
    species += [confspec.Species(element=z, charge=q) for z, q in _ion_rows()]
    return [ground_level(s) for s in species]


def _ptjson() -> dict[str, float | None]:
    data = json.loads((REAL / "ptjson.json").read_text(encoding="utf-8"))["elements"]
    return {e["symbol"]: e.get("electron_affinity") for e in data}


@needs_real
def test_bound_and_unbound_agree_with_published_affinities() -> None:
    # Periodic-Table-JSON electron_affinity (kJ/mol; negative = not bound, calculated) and
    # PubChem's ElectronAffinity (eV; empty where none is measured), read at test time
    from scipy.constants import Avogadro, electron_volt

    kj_per_ev = electron_volt * Avogadro / 1000.0
    ptjson = _ptjson()
    with open(REAL / "pubchem_elements.csv", newline="", encoding="utf-8") as f:
        pubchem = {r["Symbol"]: r["ElectronAffinity"] for r in csv.DictReader(f)}
    for z, row in anion_rows().items():
        symbol = confspec.Element.model_validate(z).symbol
        value = ptjson[symbol]
        if row.binding == "unbound":
            assert value is not None and value < 0, symbol
            assert not pubchem.get(symbol), symbol
        else:
            assert row.affinity_ev is not None and value is not None
            assert abs(row.affinity_ev - value / kj_per_ev) < 0.06, (symbol, value / kj_per_ev)


@needs_real
def test_neutral_rows_marked_checked_agree_with_real_periodic_tables() -> None:
    # PubChem's periodic-table export (ElectronConfiguration, NIST-derived) and
    # sweaver2112/periodic-table-data-complete (quantum_numbers: ground term, no parity
    # mark), both real-world files read at test time. A row may claim the check in its
    # note only if both agree; Es stays unchecked (that dataset gives 5I15/2 for 4f11,
    # which has no quintet of L = 6 as its Hund term: Hund's rules give 4I°15/2).
    with open(REAL / "pubchem_elements.csv", newline="", encoding="utf-8") as f:
        pubchem = {r["Symbol"]: r["ElectronConfiguration"] for r in csv.DictReader(f)}
    with open(REAL / "ptable_complete.csv", newline="", encoding="utf-8") as f:
        terms = {r["symbol"]: r["quantum_numbers"] for r in csv.DictReader(f)}
    marked = 0
    for z in range(1, 119):
        level = ground_level(z)
        if "checked against two real periodic-table exports" not in level.note:
            continue
        symbol = level.species.symbol
        published = parse(pubchem[symbol].split("(")[0].strip())
        assert published.occupancies == level.configuration.occupancies, symbol
        assert terms[symbol] == str(level.term).replace("°", ""), symbol
        assert not level.from_memory and level.caution is None
        marked += 1
    assert marked >= 85
    assert ground_level("Es").from_memory
