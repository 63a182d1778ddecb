"""One argument shape across the chemistry API: a species (Species, Element, species text,
atomic number) or a configuration (Configuration or notation text) wherever the function's
meaning allows it, and our error (``wrong-type``, also a ``TypeError``) for anything else."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import pytest

import confspec
from confspec import ConfspecError, ConfspecTypeError

from ..cli.runner import cli

#: functions of a configuration: a species stands for its ground configuration
ON_CONFIGURATIONS: dict[str, Callable[[Any], Any]] = {
    "hund_ground_term": confspec.hund_ground_term,
    "terms": confspec.terms,
    "term_multiplicities": confspec.term_multiplicities,
    "jj_levels": confspec.jj_levels,
    "is_ground_state": lambda v: confspec.is_ground_state(v, "Fe3+"),
    "excitations": lambda v: confspec.excitations(v, "Fe3+"),
}
#: functions of a species: a configuration does not say which element it belongs to
ON_SPECIES: dict[str, Callable[[Any], Any]] = {
    "ground_state": confspec.ground_state,
    "ground_level": confspec.ground_level,
    "d_electron_count": confspec.d_electron_count,
    "descriptors": confspec.descriptors,
    "effective_charge": lambda v: confspec.effective_charge(v, "3d"),
    "is_ground_state (species)": lambda v: confspec.is_ground_state("[Ar] 3d5", v),
}

# Fe3+ in every spelling a species takes (the spectrum Fe IV, the oxidation state Fe(III));
# ground level [Ar] 3d5 6S5/2 (NIST ASD)
FE3 = ["Fe3+", "Fe IV", "Fe(III)", confspec.parse_species("Fe3+")]
WRONG_TYPES = [3.5, None, b"Fe", True, ["3d6"], object()]


@pytest.mark.parametrize("name", sorted(ON_CONFIGURATIONS))
@pytest.mark.parametrize("value", FE3, ids=str)
def test_a_species_stands_for_its_ground_configuration(name: str, value: Any) -> None:
    function = ON_CONFIGURATIONS[name]
    assert function(value) == function("[Ar] 3d5")


@pytest.mark.parametrize("name", sorted(ON_SPECIES))
@pytest.mark.parametrize("value", FE3, ids=str)
def test_a_species_function_takes_every_species_spelling(name: str, value: Any) -> None:
    function = ON_SPECIES[name]
    assert function(value) == function("Fe3+")


@pytest.mark.parametrize("name", sorted(ON_SPECIES))
def test_an_atomic_number_is_the_neutral_atom(name: str) -> None:
    assert ON_SPECIES[name](26) == ON_SPECIES[name]("Fe")


@pytest.mark.parametrize("name", sorted(ON_CONFIGURATIONS) + sorted(ON_SPECIES))
@pytest.mark.parametrize("value", WRONG_TYPES, ids=repr)
def test_other_types_get_our_error(name: str, value: Any) -> None:
    function = {**ON_CONFIGURATIONS, **ON_SPECIES}[name]
    with pytest.raises(ConfspecTypeError) as caught:
        function(value)
    assert caught.value.code == "wrong-type"
    assert isinstance(caught.value, TypeError) and isinstance(caught.value, ConfspecError)


@pytest.mark.parametrize("name", sorted(ON_SPECIES))
def test_a_configuration_is_no_species(name: str) -> None:
    with pytest.raises(ConfspecTypeError, match="does not say which element"):
        ON_SPECIES[name](confspec.parse("[Ar] 3d5"))
    with pytest.raises(ConfspecError, match="reads as a configuration"):
        ON_SPECIES[name]("[Ar] 3d5")


def test_published_values_through_each_shape() -> None:
    # NIST ASD ground levels: Fe3+ [Ar] 3d5 6S5/2, Fe [Ar] 3d6 4s2 5D4, N 2p3 4S°3/2
    assert str(confspec.hund_ground_term("Fe3+")) == "6S5/2"
    assert str(confspec.ground_state(26)) == "[Ar] 3d6 4s2"
    assert confspec.is_ground_state("[Ar] 3d6 4s2", 26)
    # the terms of p3: 4S°, 2D°, 2P° (Condon & Shortley, The Theory of Atomic Spectra)
    assert sorted(str(t) for t in confspec.terms("N")) == ["2D°", "2P°", "4S°"]


def test_text_that_is_neither_reports_the_reading_that_got_further() -> None:
    with pytest.raises(ConfspecError) as caught:
        confspec.hund_ground_term("Fe 3+x")  # a species with a stray letter
    assert caught.value.position == 5
    with pytest.raises(ConfspecError) as caught:
        confspec.hund_ground_term("3d6 4sx")  # a configuration with a stray letter
    assert caught.value.position == 6


def test_subshell_pairs_are_checked() -> None:
    # d2 has one 1D (Condon & Shortley)
    assert confspec.term_multiplicities([(2, 2)])[(1, 2)] == 1
    with pytest.raises(ConfspecError) as caught:
        confspec.term_multiplicities([(2, 11)])
    assert caught.value.code == "pauli-limit"
    with pytest.raises(ConfspecTypeError):
        confspec.term_multiplicities([(2, "x")])


def test_text_functions_refuse_other_types_with_our_error() -> None:
    for function in (confspec.parse, confspec.parse_species, confspec.parse_level):
        with pytest.raises(ConfspecTypeError):
            function(3.5)  # type: ignore[arg-type]


def test_show_names_no_element_for_a_level_without_one() -> None:
    # Fe II 3d6(5D)4s a6D9/2 is the Fe II ground level (NIST ASD); without a label or
    # --species its electron count (7) must not be taken for nitrogen
    done = cli("show", "3d6(5D)4s 6D9/2")
    assert done.returncode == 0, done.stderr
    assert "species        unknown (a level designation does not name its element)" in \
        done.stdout
    assert "Slater's rules for" not in done.stdout and " N " not in done.stdout
    labelled = cli("show", "Fe II 3d6(5D)4s 6D9/2")
    assert "ground state   Fe+: [Ar] 3d6 4s1 6D9/2  <- this configuration" in labelled.stdout
    assert "1s2 2s2 2p6 3s2 3p6 implied" in labelled.stdout
    assert "Slater's rules for Fe+" in labelled.stdout


def test_show_assumes_a_neutral_atom_only_for_a_whole_configuration() -> None:
    whole = cli("show", "1s2 2s2 2p3")
    assert "N (assumed: the neutral atom with this many electrons)" in whole.stdout
    valence = cli("show", "3d6 4s2")
    assert "species        unknown (the inner shells are not written" in valence.stdout
