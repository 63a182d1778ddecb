"""Level designations: parsing, consistency checks, formatting, and X-ray level names."""

from __future__ import annotations

import csv
from fractions import Fraction
from pathlib import Path

import pytest

from confspec import (
    ConfspecError,
    Level,
    parse,
    parse_level,
    validate_level,
    xray_level,
    xray_name,
)

DATA = Path(__file__).resolve().parents[2] / "confspec" / "data"


@pytest.mark.parametrize(("text", "config", "term", "J", "parents"), [
    pytest.param("3d6 4s2 5D4", "3d6 4s2", "5D4", Fraction(4), [], id="term-J"),
    pytest.param("3d6 4s2 5D<4>", "3d6 4s2", "5D4", Fraction(4), [], id="angle-J"),
    pytest.param("3d6 4s2 ^5D_4", "3d6 4s2", "5D4", Fraction(4), [], id="caret-underscore"),
    pytest.param("3d6 4s2 5D_{4}", "3d6 4s2", "5D4", Fraction(4), [], id="braced-J"),
    pytest.param("3d6 4s2 (5D)", "3d6 4s2", "5D", None, [], id="parenthesized-term"),
    pytest.param("2p 2P°1/2", "2p1", "2P°1/2", Fraction(1, 2), [], id="degree"),
    pytest.param("2p 2Po1/2", "2p1", "2P°1/2", Fraction(1, 2), [], id="letter-o"),
    pytest.param("2p 2P*1/2", "2p1", "2P°1/2", Fraction(1, 2), [], id="star"),
    pytest.param("2p 2P^o1/2", "2p1", "2P°1/2", Fraction(1, 2), [], id="caret-o"),
    pytest.param("2p ^{2}P^{o}_{1/2}", "2p1", "2P°1/2", Fraction(1, 2), [], id="latex"),
    pytest.param("3d6(5D)4s 6D9/2", "3d6 4s1", "6D9/2", Fraction(9, 2), ["(5D)"], id="parent"),
    # NIST ASD notation conventions: parents in parentheses after their subconfiguration.
    pytest.param("3d7(4F)4s4p(3P°) z6G°13/2", "3d7 4s1 4p1", "6G°13/2", Fraction(13, 2),
                 ["(4F)", "(3P°)"], id="two-parents"),
    pytest.param("[Ne] 3s1 2S1/2", "[Ne] 3s1", "2S1/2", Fraction(1, 2), [], id="core"),
])
def test_level_spellings(text: str, config: str, term: str, J: Fraction | None,
                         parents: list[str]) -> None:
    level = parse_level(text)
    assert level.configuration == parse(config)
    assert str(level.term) == term and level.J == J
    assert [str(p) for p in level.parents] == parents
    assert parse_level(level.format()) == level


def test_labels_seniority_and_marks() -> None:
    level = parse_level("Fe II 3d6(5D)4s a6D9/2")
    assert (str(level.species), level.ordering_letter, level.statistical_weight) == ("Fe+", "a", 10)
    assert level.parents[0].subshells == ("3d",)
    assert str(parse_level("Fe3+: [Ar] 3d5").species) == "Fe3+"
    assert str(parse_level("Fe³⁺ = [Ar]3d⁵").species) == "Fe3+"
    assert parse_level("2p5 3s 3P°2 ?").uncertain == "?"
    assert parse_level("2p5 3s 3P°2?").uncertain == "?"
    assert parse_level("[Ne] 3s (predicted)").uncertain == "predicted"
    assert parse_level("z7P°2".join(["3d6(5D)4s4p(3P°) ", ""])).ordering_letter == "z"
    assert parse_level("2p 2P°1/2").parity == "odd"
    assert parse_level("2p 2P°3/2").statistical_weight == 4


@pytest.mark.parametrize(("text", "codes"), [
    pytest.param("2p2 1P", ["term-not-allowed"], id="not-a-term"),
    pytest.param("3d6(5D)4s 8D", ["term-not-allowed"], id="parent-coupling"),
    # 3d7 4s 4p holds an odd number of electrons outside closed shells, so every
    # multiplicity is even: 4F x 3P° couples to 2, 4, 6 (D, F, G) only. A quintet is
    # impossible here (checked by hand; vector coupling of S = 3/2 and S = 1).
    pytest.param("3d7(4F)4s4p(3P°) 5G°6", ["term-not-allowed"], id="odd-electrons-quintet"),
    pytest.param("3d6(4S)", ["parent-not-allowed"], id="parent"),
    pytest.param("3d6(5D)4s 6D13/2", ["j-not-allowed"], id="J-with-parent"),
    pytest.param("2p2 3P3", ["j-not-allowed"], id="J"),
    pytest.param("2p 2P", ["parity-mismatch"], id="odd-unmarked"),
    pytest.param("3d 2D°", ["parity-mismatch"], id="even-marked"),
    pytest.param("2p2 1P° ", ["term-not-allowed", "parity-mismatch"], id="two-problems"),
    pytest.param("Fe II 3d6 4s2 5D4", ["electron-count"], id="electron-count"),
    pytest.param("2p1/2^3 2P°1/2", ["pauli-limit"], id="relativistic-pauli"),
])
def test_consistency_problems(text: str, codes: list[str]) -> None:
    assert [p.code for p in validate_level(text)] == codes
    with pytest.raises(ConfspecError):
        parse_level(text)


def test_validate_level_against_a_species() -> None:
    assert validate_level("3d6 4s2 5D4", species="Fe") == []  # [Ar] is implied, as in tables
    assert [p.code for p in validate_level("3d6 4s2 5D4", species="Co")] == ["electron-count"]
    assert validate_level(parse_level("[Ar] 3d5 6S5/2"), species="Fe3+") == []


def _nist_ground_levels() -> list[pytest.ParameterSet]:
    with (DATA / "ground_levels.csv").open(encoding="utf-8") as handle:
        return [pytest.param(r["symbol"], r["configuration"], r["term"], id=r["symbol"])
                for r in csv.DictReader(handle)]


@pytest.mark.parametrize(("symbol", "configuration", "term"), _nist_ground_levels())
def test_every_nist_neutral_ground_level_is_consistent(symbol: str, configuration: str,
                                                       term: str) -> None:
    # NIST ASD ground levels of the neutral atoms (the shipped table): each must parse as a
    # level designation and pass every consistency check against its element.
    text = f"{configuration} {term}"
    assert validate_level(text, species=symbol) == []
    level = parse_level(text)
    assert parse_level(level.format()) == level


@pytest.mark.parametrize(("style"), ["plain", "latex", "html", "unicode", "caret"])
def test_level_styles_round_trip(style: str) -> None:
    for text in ("3d7(4F)4s4p(3P°) z6G°13/2", "Fe II 3d6(5D)4s a6D9/2 ?", "[Ne] 3s1 2S1/2",
                 "Cl-: [Ne] 3s2 3p6 1S0", "2p1/2^2 2p3/2^3 2P°3/2"):
        level = parse_level(text)
        assert parse_level(level.format(style)) == level, level.format(style)


# IUPAC X-ray nomenclature (Jenkins et al., Pure Appl. Chem. 63, 735 (1991)), from memory.
XRAY = {"K": "1s", "L1": "2s", "L2": "2p1/2", "L3": "2p3/2", "M1": "3s", "M2": "3p1/2",
        "M3": "3p3/2", "M4": "3d3/2", "M5": "3d5/2", "N1": "4s", "N2": "4p1/2", "N3": "4p3/2",
        "N4": "4d3/2", "N5": "4d5/2", "N6": "4f5/2", "N7": "4f7/2", "O1": "5s", "P3": "6p3/2",
        "L2,3": "2p", "M4,5": "3d", "N6,7": "4f"}


@pytest.mark.parametrize(("name", "subshell"), XRAY.items())
def test_iupac_xray_levels(name: str, subshell: str) -> None:
    level = xray_level(name)
    assert level.subshell == subshell and str(level) == name
    assert xray_name(subshell) == name


@pytest.mark.parametrize("name", ["L4", "K2", "M6", "L1,2", "N8", "X1", "L2,4"])
def test_unknown_xray_levels(name: str) -> None:
    with pytest.raises(ConfspecError) as info:
        xray_level(name)
    assert info.value.code == "unknown-xray-level"


def test_xray_holes_against_a_species() -> None:
    # Cu ground state [Ar] 3d10 4s1 (NIST ASD); an L3 hole leaves 2p3/2 with 3 electrons.
    assert parse("L3^-1", reference="Cu") == parse("2p3/2^-1", reference="Cu")
    assert str(parse("L3^-1", reference="Cu")) == "[He] 2s2 2p1/2^2 2p3/2^3 3s2 3p6 3d10 4s1"
    assert parse("K^-1", reference="Cu").electron_count == 28
    assert str(parse("[Ne] L2,3^-1 3s2")) == "[He] 2s2 2p5 3s2"


def test_level_model_is_frozen_and_json_round_trips() -> None:
    level = parse_level("Fe II 3d6(5D)4s a6D9/2")
    assert Level.model_validate_json(level.model_dump_json()) == level
    assert hash(level) == hash(parse_level("Fe II 3d6(5D) 4s1 a6D9/2"))
