"""Descriptors for modelling code: documented keys, numeric values, provenance flags."""

from __future__ import annotations

import subprocess
import sys

import pytest

from confspec import ConfspecError, descriptor_table, descriptors, effective_charge
from confspec.chemistry.descriptors import DESCRIPTOR_DOCS


def test_every_key_is_documented_and_numeric() -> None:
    for species in ("H", "Fe", "Fe2+", "Ce", "Og", "Fe26+", "O2-", "U6+"):
        row = descriptors(species)
        assert list(row) == list(DESCRIPTOR_DOCS)
        assert all(v is None or isinstance(v, int | float | bool) for v in row.values())


@pytest.mark.parametrize(("species", "expected"), [
    # electron counts and blocks: common practice, no source; ground states from NIST ASD
    pytest.param("Fe", {"electron_count": 26, "block": 2, "period": 4, "valence_n": 4,
                        "valence_electrons": 8, "unpaired_electrons": 4, "parity_odd": 0,
                        "term_multiplicity": 5, "term_L": 2, "term_J": 4.0, "outer_n": 4,
                        "outer_l": 0, "is_measured": True}, id="Fe"),
    pytest.param("Fe2+", {"electron_count": 24, "valence_n": 3, "valence_electrons": 6,
                          "outer_l": 2, "zeff_clementi_raimondi": None}, id="Fe2+"),
    pytest.param("Zn", {"valence_electrons": 2, "open_subshells": 0}, id="Zn"),
    pytest.param("Ga", {"valence_electrons": 3, "block": 1}, id="Ga"),
    pytest.param("Pd", {"valence_electrons": 10, "valence_n": 4, "period": 5}, id="Pd"),
    pytest.param("Ne", {"valence_electrons": 8}, id="Ne"),
    pytest.param("Na+", {"valence_electrons": 0}, id="Na+"),
    pytest.param("He", {"block": 0, "valence_electrons": 2}, id="He"),
    pytest.param("La", {"block": 3}, id="La-by-madelung"),
    pytest.param("Lu", {"block": 2}, id="Lu-by-madelung"),
    # NIST ASD: Ce I 4f 5d 6s2 1G°4 (from memory), a singlet, though Hund's rules give 3H°4
    pytest.param("Ce", {"parity_odd": 1, "hund_disagrees": True, "term_multiplicity": 1,
                        "unpaired_electrons": 0, "unpaired_electrons_hund": 2}, id="Ce"),
    pytest.param("Og", {"is_predicted": True, "is_measured": False}, id="Og"),
    pytest.param("Fe7+", {"is_rule": True, "is_measured": False}, id="Fe7+"),
    pytest.param("Fe26+", {"electron_count": 0, "valence_n": None, "zeff_slater": None,
                           "outer_n": None}, id="bare-nucleus"),
])
def test_descriptor_values(species: str, expected: dict[str, object]) -> None:
    row = descriptors(species)
    for key, value in expected.items():
        assert row[key] == value, key


def test_shielding_descriptors_match_effective_charge() -> None:
    row = descriptors("K")
    slater = effective_charge("K", "4s")
    assert row["zeff_slater"] == pytest.approx(2.20)
    assert row["orbital_energy_slater_ev"] == pytest.approx(slater.orbital_energy())
    assert row["radius_slater_angstrom"] == pytest.approx(slater.radius_estimate())
    # Clementi & Raimondi, J. Chem. Phys. 38, 2686 (1963): K 4s 3.4952 (from memory)
    assert row["zeff_clementi_raimondi"] == pytest.approx(3.4952)
    assert descriptors("Rb")["zeff_clementi_raimondi"] is None  # outside the table


def test_descriptor_table_keeps_order_and_every_row() -> None:
    rows = descriptor_table(["Fe", "Fe3+", "Zn2+"])
    assert [r["species"] for r in rows] == ["Fe", "Fe3+", "Zn2+"]
    assert [r["unpaired_electrons"] for r in rows] == [4, 5, 0]
    kept = descriptor_table(["Fe", "Xx", "He3+", "Cu+"], errors="keep")
    assert [r["species"] for r in kept] == ["Fe", "Xx", "He3+", "Cu+"]
    assert kept[0]["error"] is None and kept[3]["error"] is None
    assert str(kept[1]["error"]).startswith("unknown-element")
    assert str(kept[2]["error"]).startswith("impossible-charge")
    assert all(kept[1][key] is None for key in DESCRIPTOR_DOCS)
    with pytest.raises(ConfspecError):
        descriptor_table(["Fe", "Xx"])
    with pytest.raises(ValueError, match="errors"):
        descriptor_table(["Fe"], errors="skip")  # type: ignore[arg-type]


@pytest.mark.slow  # a fresh interpreter
def test_no_pandas_in_the_core() -> None:
    code = ("import sys, confspec; confspec.descriptor_table(['Fe', 'Cu+']); "
            "assert 'pandas' not in sys.modules")
    subprocess.run([sys.executable, "-c", code], check=True)


@pytest.mark.parametrize(("species", "valence", "f"), [
    # one definition for atoms and ions (DESCRIPTOR_DOCS; common practice, no source):
    # closed-shell cations have none, whatever their row
    ("Ti4+", 0, 0), ("Mo6+", 0, 0), ("W6+", 0, 14), ("Hf4+", 0, 14), ("U6+", 0, 0),
    ("Na+", 0, 0), ("Ce4+", 0, 0),
    # f electrons of the shell n = period - 2 are counted apart (NIST ASD configurations)
    ("Eu", 2, 7), ("Gd", 3, 7), ("Ce", 3, 1), ("U", 3, 3), ("Yb", 2, 14), ("Lu", 3, 14),
    ("Th", 4, 0), ("Eu3+", 0, 6),
    # d electrons count until group 12, from where the filled d10 is core
    ("Cu", 11, 0), ("Cu+", 10, 0), ("Zn", 2, 0), ("Zn2+", 0, 0), ("Ga3+", 0, 0),
    ("Pb", 4, 14), ("Kr", 8, 0),
])
def test_valence_electrons_one_definition(species: str, valence: int, f: int) -> None:
    row = descriptors(species)
    assert (row["valence_electrons"], row["f_electrons"]) == (valence, f)


def test_valence_electrons_of_an_ion_are_the_atoms_minus_what_it_lost() -> None:
    # where the ion loses only valence electrons, the counts differ by the charge
    for atom, ion, lost in (("Fe", "Fe2+", 2), ("Ti", "Ti4+", 4), ("Mo", "Mo6+", 6),
                            ("W", "W6+", 6), ("Sc", "Sc3+", 3), ("Ga", "Ga3+", 3)):
        assert (descriptors(atom)["valence_electrons"]
                - descriptors(ion)["valence_electrons"]) == lost, ion


def test_spin_descriptors_agree_with_the_listed_term() -> None:
    for species in ("H", "Fe", "Ce", "Gd", "Cr", "Fe7+", "Og", "Ca-", "U", "Tb2+"):
        row = descriptors(species)
        assert row["unpaired_electrons"] == row["term_multiplicity"] - 1, species
    assert descriptors("Ce")["unpaired_electrons_hund"] == 2  # named as the estimate


def test_renamed_orbital_energy_keys_still_read_with_a_warning() -> None:
    row = descriptors("K")
    assert "energy_slater_ev" not in row and "energy_clementi_raimondi_ev" not in row
    with pytest.warns(DeprecationWarning, match="orbital_energy_slater_ev"):
        assert row["energy_slater_ev"] == row["orbital_energy_slater_ev"]
    with pytest.warns(DeprecationWarning, match="orbital_energy_clementi_raimondi_ev"):
        assert (row.get("energy_clementi_raimondi_ev")
                == row["orbital_energy_clementi_raimondi_ev"])
    with pytest.raises(KeyError):
        row["no_such_key"]


# NIST ASD first ionization energies (from memory, the shipped table checks them against
# real exports): the hydrogen-like orbital energies are far from them, which is why they
# are named orbital energies
@pytest.mark.parametrize(("species", "low", "high"), [
    ("H", 0.99, 1.01), ("Li", 1.0, 1.1), ("C", 3.0, 3.4), ("Ne", 5.2, 5.6),
    ("Na", 1.3, 1.5), ("K", 1.0, 1.2), ("Fe", 1.6, 1.9), ("Kr", 4.6, 5.0),
])
def test_orbital_energy_estimates_are_not_ionization_energies(
        species: str, low: float, high: float) -> None:
    row = descriptors(species)
    ratio = -float(row["orbital_energy_slater_ev"] or 0) / float(
        row["ionization_energy_ev"] or 1)
    assert low <= ratio <= high, ratio
    assert row["ionization_energy_measured"] is (species != "H")


def test_measured_ionization_and_affinity_descriptors() -> None:
    # NIST ASD IE1 of Na 5.1391 eV, IE2 (Na+) 47.2864 eV; Andersen, Haugen & Hotop 1999:
    # Cl affinity 3.613 eV, N- unbound, Nd- not established (all from memory)
    assert descriptors("Na")["ionization_energy_ev"] == pytest.approx(5.1391, abs=1e-4)
    assert descriptors("Na+")["ionization_energy_ev"] == pytest.approx(47.2864, abs=1e-3)
    assert descriptors("Fe5+")["ionization_energy_ev"] is None
    assert descriptors("Cl")["electron_affinity_ev"] == pytest.approx(3.613, abs=1e-3)
    assert (descriptors("N")["anion_bound"], descriptors("N")["electron_affinity_ev"]) == (
        False, None)
    assert descriptors("Nd")["anion_bound"] is None
