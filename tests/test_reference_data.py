"""The notation core against the outside world: elements, noble-gas cores, Pauli limits."""

from __future__ import annotations

import pytest

from confspec import Configuration, Subshell, parse, parse_species
from confspec.data.elements import all_elements
from confspec.physics import NOBLE_CORES, SUBSHELL_LETTERS, pauli_limit

periodictable = pytest.importorskip("periodictable")
ase_data = pytest.importorskip("ase.data")

# periodictable uses the US spellings; IUPAC writes aluminium and caesium.
_US_SPELLINGS = {"aluminium": "aluminum", "caesium": "cesium"}


def test_118_elements_match_iupac_via_periodictable_and_ase() -> None:
    rows = all_elements()
    assert [r.Z for r in rows] == list(range(1, 119))
    for row in rows:
        # IUPAC Periodic Table of the Elements; periodictable and ase.data as test-only oracles.
        oracle = periodictable.elements[row.Z]
        assert oracle.symbol == row.symbol
        assert oracle.name == _US_SPELLINGS.get(row.name, row.name)
        assert ase_data.chemical_symbols[row.Z] == row.symbol
        species = parse_species(row.symbol)
        assert species.Z == row.Z and species.name == row.name


# NIST Atomic Spectra Database, ground levels of the neutral noble gases (from memory):
# He 1s2; Ne [He] 2s2 2p6; Ar [Ne] 3s2 3p6; Kr [Ar] 3d10 4s2 4p6; Xe [Kr] 4d10 5s2 5p6;
# Rn [Xe] 4f14 5d10 6s2 6p6.
NIST_NOBLE_GASES = {
    "He": "1s2",
    "Ne": "1s2 2s2 2p6",
    "Ar": "1s2 2s2 2p6 3s2 3p6",
    "Kr": "1s2 2s2 2p6 3s2 3p6 3d10 4s2 4p6",
    "Xe": "1s2 2s2 2p6 3s2 3p6 3d10 4s2 4p6 4d10 5s2 5p6",
    "Rn": "1s2 2s2 2p6 3s2 3p6 3d10 4s2 4p6 4d10 4f14 5s2 5p6 5d10 6s2 6p6",
}


@pytest.mark.parametrize(("symbol", "expanded"), NIST_NOBLE_GASES.items())
def test_noble_gas_cores_match_nist(symbol: str, expanded: str) -> None:
    core = parse(f"[{symbol}]")
    assert core == parse(expanded)
    assert core.occupancies == NOBLE_CORES[symbol]
    assert core.electron_count == parse_species(symbol).Z
    assert core.format(core="expand") == expanded


def test_pauli_limits_are_2_2l_plus_1() -> None:
    # 2(2l + 1): common practice, no source.
    for l, letter in enumerate(SUBSHELL_LETTERS):
        assert pauli_limit(l) == 2 * (2 * l + 1)
        n = l + 1
        full = parse(f"{n}{letter}{pauli_limit(l)}")
        assert full.subshells == (Subshell(n=n, l=l, electrons=pauli_limit(l)),)
    assert [pauli_limit(l) for l in range(4)] == [2, 6, 10, 14]
    assert Configuration.from_occupancies({"7i": 26}).electron_count == 26
