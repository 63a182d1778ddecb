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
    pytest.param("Na+", {"valence_electrons": 8}, id="Na+"),
    pytest.param("He", {"block": 0, "valence_electrons": 2}, id="He"),
    pytest.param("La", {"block": 3}, id="La-by-madelung"),
    pytest.param("Lu", {"block": 2}, id="Lu-by-madelung"),
    pytest.param("Ce", {"parity_odd": 1, "hund_disagrees": True, "term_multiplicity": 1,
                        "unpaired_electrons": 2}, id="Ce"),
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
    assert row["energy_slater_ev"] == pytest.approx(slater.orbital_energy())
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
