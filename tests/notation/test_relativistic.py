"""Relativistic subshells nlj: spellings, Pauli limit 2j + 1, merging and splitting."""

from __future__ import annotations

from fractions import Fraction

import pytest

from confspec import ConfspecError, Subshell, parse


@pytest.mark.parametrize("text", [
    pytest.param("2p1/2^2 2p3/2^3", id="fraction-caret"),
    pytest.param("2p_{1/2}^{2} 2p_{3/2}^{3}", id="latex"),
    pytest.param("2p_1/2^2 2p_3/2^3", id="underscore"),
    pytest.param("2p(1/2)^2 2p(3/2)^3", id="parens"),
    pytest.param("2p<sub>1/2</sub><sup>2</sup> 2p<sub>3/2</sub><sup>3</sup>", id="html"),
    pytest.param("2p1/2² 2p3/2³", id="superscripts"),
    pytest.param("2p-^2 2p+^3", id="minus-plus"),
    pytest.param("2p-² 2p+³", id="minus-plus-superscripts"),
    pytest.param("2p+^3 2p-^2", id="any-order"),
    pytest.param("2p3/2^{3} 2p-(2)", id="mixed"),
])
def test_spellings_of_one_relativistic_configuration(text: str) -> None:
    config = parse(text)
    assert [(s.label, s.j, s.electrons) for s in config.subshells] == [
        ("2p1/2", Fraction(1, 2), 2), ("2p3/2", Fraction(3, 2), 3)]
    assert str(config) == "2p1/2^2 2p3/2^3"
    assert config.is_relativistic and config.occupancies == ((2, 1, 5),)


def test_pauli_limit_is_2j_plus_1() -> None:
    # 2j + 1 states in an nlj subshell (common practice, no source).
    assert parse("3d5/2^6").subshells[0].capacity == 6
    assert parse("3d3/2^4").subshells[0].capacity == 4
    for text in ("2p1/2^3", "2p3/2^5", "3d3/2^5", "4f7/2^9"):
        with pytest.raises(ConfspecError) as info:
            parse(text)
        assert info.value.code == "pauli-limit"


@pytest.mark.parametrize(("text", "code"), [
    ("2p5/2^1", "invalid-subshell"), ("2s-^1", "invalid-subshell"), ("3d1/2^1", "invalid-subshell"),
    ("2p1/3^1", "syntax"), ("2p2/2^1", "syntax"), ("2p6 2p3/2^1", "duplicate-subshell"),
    ("2p3/2^1 2p+^2", "duplicate-subshell"), ("2p-2", "ambiguous-hole"),
    ("[Ne] 2p3/2^4", "core-overlap"), ("[He] 2p3/2^-1", "hole-without-reference"),
    ("[Ne] 2p1/2^-3", "hole-exceeds"),
])
def test_relativistic_errors(text: str, code: str) -> None:
    with pytest.raises(ConfspecError) as info:
        parse(text)
    assert info.value.code == code


def test_full_j_pairs_are_the_full_nl_subshell() -> None:
    # A closed nl subshell is the same state however it is written (value, not notation).
    assert parse("1s2 2s2 2p1/2^2 2p3/2^4") == parse("[Ne]")
    assert parse("2s1/2^1") == parse("2s1")  # s1/2 is s
    assert parse("[Ar]").format(core="expand", split_j=True) == (
        "1s2 2s2 2p1/2^2 2p3/2^4 3s2 3p1/2^2 3p3/2^4")
    assert parse(parse("[Kr]").format(core="expand", split_j=True)) == parse("[Kr]")


def test_holes_in_j_subshells_split_the_core() -> None:
    # An L3 (2p3/2) core hole in neon-like sodium: 2p1/2 keeps 2, 2p3/2 keeps 3.
    config = parse("[Ne] 2p3/2^-1 3s2")
    assert str(config) == "[He] 2s2 2p1/2^2 2p3/2^3 3s2"
    assert config.format(style="latex") == (
        r"[\mathrm{He}]\,2s^{2}\,2p_{1/2}^{2}\,2p_{3/2}^{3}\,3s^{2}")


@pytest.mark.parametrize("style", ["plain", "caret", "unicode", "latex", "html", "nist-asd"])
def test_relativistic_styles_round_trip(style: str) -> None:
    config = parse("[Ne] 3s2 3p1/2^2 3p3/2^1 3d5/2^1")
    assert parse(config.format(style=style)) == config
    assert parse(config.format(style=style, core="expand", order="filling")) == config


def test_relativistic_subshell_model_and_json() -> None:
    sub = Subshell(n=2, l=1, j=Fraction(3, 2), electrons=3)
    assert (sub.label, sub.capacity, str(sub), sub.j2) == ("2p3/2", 4, "2p3/2^3", 3)
    assert Subshell.model_validate("2p3/2^3") == sub
    assert Subshell(n=2, l=1, electrons=3).model_dump() == {"n": 2, "l": 1, "electrons": 3}
    assert sub.model_dump(mode="json") == {"n": 2, "l": 1, "electrons": 3, "j": "3/2"}
    config = parse("2p1/2^2 2p3/2^3")
    assert type(config).model_validate_json(config.model_dump_json()) == config
