"""Old names kept for one release: each still works and warns with DeprecationWarning."""

from __future__ import annotations

import pytest

import confspec
from confspec import parse


def test_parse_species_keyword_is_the_hole_reference() -> None:
    with pytest.warns(DeprecationWarning, match="reference="):
        old = parse("1s^-1", species="K")
    assert old == parse("1s^-1", reference="K") == parse("1s^-1",
                                                        reference=confspec.ground_state("K"))


def test_format_holes_relative_to_is_reference() -> None:
    k_hole = parse("1s1 2s2 2p6 3s2 3p6 4s1")
    with pytest.warns(DeprecationWarning, match="reference="):
        old = k_hole.format(holes_relative_to="K")
    assert old == k_hole.format(reference="K") == "[Ar] 1s^-1 4s1"


def test_chemistry_methods_moved_to_functions() -> None:
    vanadium_ion = parse("[Ar] 3d3 4s1")
    with pytest.warns(DeprecationWarning, match="confspec.excitations"):
        moved = vanadium_ion.excitations("V+")
    assert [str(e) for e in moved] == [str(e) for e in confspec.excitations(vanadium_ion, "V+")]
    with pytest.warns(DeprecationWarning, match="confspec.is_ground_state"):
        assert parse("[Ar] 3d6 4s2").is_ground_state("Fe")
    assert confspec.is_ground_state("[Ar] 3d6 4s2", "Fe")


def test_collapse_core_is_core() -> None:
    nitrogen = parse("1s2 2s2 2p3")
    with pytest.warns(DeprecationWarning, match="core="):
        old = nitrogen.boxes(collapse_core=False)
    assert old == nitrogen.boxes(core="expand")
    with pytest.raises(confspec.ConfspecError) as info:
        nitrogen.boxes(core="squash")
    assert info.value.code == "unknown-option"


def test_dotted_style_is_nist_asd() -> None:
    sodium = parse("[Ne] 3s1")
    with pytest.warns(DeprecationWarning, match="nist-asd"):
        old = sodium.format("dotted")
    # NIST ASD's ground-shells spelling: dots, a single electron without its 1
    assert old == sodium.format("nist-asd") == "[Ne].3s"
    assert parse("[Ne].3s") == sodium


def test_seniority_is_the_ordering_letter() -> None:
    level = confspec.parse_level("Fe II 3d6(5D)4s a6D9/2")
    assert level.ordering_letter == "a"
    with pytest.warns(DeprecationWarning, match="ordering_letter"):
        assert level.seniority == "a"
    # JSON written by the old release (key "seniority") still reads
    data = level.model_dump()
    data["seniority"] = data.pop("ordering_letter")
    assert confspec.Level.model_validate(data) == level
