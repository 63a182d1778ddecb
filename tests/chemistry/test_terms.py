"""LS terms: reading term symbols, every term of a configuration, Hund's rules, J."""

from __future__ import annotations

import json
import math
from collections import Counter
from fractions import Fraction

import pytest
from pydantic import BaseModel, ValidationError

import confspec
from confspec import ConfspecError, Term, allowed_j, hund_ground_term, parse, parse_term, terms

# ---------------------------------------------------------------------------- reading terms


@pytest.mark.parametrize(("text", "canonical"), [
    pytest.param("5D4", "5D4", id="plain-even"),
    pytest.param("2P°1/2", "2P°1/2", id="plain-odd"),
    pytest.param("^{2}P^{o}_{1/2}", "2P°1/2", id="latex-o"),
    pytest.param("^{2}P^{\\circ}_{1/2}", "2P°1/2", id="latex-circ"),
    pytest.param("^{2}\\mathrm{P}^{\\circ}_{1/2}", "2P°1/2", id="latex-mathrm"),
    pytest.param("2Po1/2", "2P°1/2", id="ascii-o"),
    pytest.param("2P*1/2", "2P°1/2", id="asterisk"),
    pytest.param("2Pº1/2", "2P°1/2", id="ordinal-indicator"),
    pytest.param("²P°₁/₂", "2P°1/2", id="unicode"),
    pytest.param("<sup>2</sup>P<sup>o</sup><sub>1/2</sub>", "2P°1/2", id="html"),
    pytest.param("2P_{1/2}", "2P1/2", id="subscript-braces-even"),
    pytest.param("2P°_3/2", "2P°3/2", id="underscore"),
    pytest.param("  4S°3/2 ", "4S°3/2", id="outer-space"),
    pytest.param("3P", "3P", id="no-j"),
    pytest.param("2F°", "2F°", id="odd-no-j"),
    pytest.param("1S0", "1S0", id="singlet"),
    pytest.param("5L°6", "5L°6", id="uranium"),
    pytest.param("10D°5/2", "10D°5/2", id="two-digit-multiplicity"),
    pytest.param("2[17]", "2[17]", id="large-L"),
])
def test_term_spellings(text: str, canonical: str) -> None:
    term = parse_term(text)
    assert str(term) == canonical
    assert parse_term(str(term)) == term


def test_term_fields_and_canonical_form() -> None:
    term = parse_term("2P°1/2")
    assert (term.multiplicity, term.L, term.parity, term.J) == (2, 1, "odd", Fraction(1, 2))
    assert Fraction(1, 2) == term.S and term.letter == "P" and term.is_odd
    assert repr(term) == "Term('2P°1/2')"
    assert str(Term(multiplicity=5, L=2, J=4)) == "5D4"
    assert str(Term(multiplicity=4, L=0, parity="odd", J=Fraction(3, 2))) == "4S°3/2"
    assert f"{term:latex}" == "^{2}\\mathrm{P}^{\\circ}_{1/2}"
    assert term.format("unicode") == "²P°₁/₂"
    assert term.format("ascii") == "2Po1/2"
    assert term.format("html") == "<sup>2</sup>P<sup>o</sup><sub>1/2</sub>"


def test_terms_are_frozen_hashable_values() -> None:
    a, b = parse_term("2Po1/2"), parse_term("^{2}P^{o}_{1/2}")
    assert a == b and hash(a) == hash(b) and len({a, b}) == 1
    assert a != parse_term("2P1/2") and a != parse_term("2P°3/2") and a != parse_term("2P°")
    with pytest.raises(ValidationError):
        a.L = 2  # type: ignore[misc]


@pytest.mark.parametrize(("text", "code", "position"), [
    pytest.param("2P3", "invalid-term", 2, id="j-too-large"),
    pytest.param("2P1", "invalid-term", 2, id="integer-j-for-doublet"),
    pytest.param("3P1/2", "invalid-term", 2, id="half-j-for-triplet"),
    pytest.param("2P°1/3", "invalid-term", 3, id="third"),
    pytest.param("0S", "invalid-term", 0, id="zero-multiplicity"),
    pytest.param("2p1/2", "term-syntax", 1, id="lower-case-letter"),
    pytest.param("2J", "term-syntax", 1, id="j-is-skipped"),
    pytest.param("P2", "term-syntax", 0, id="no-multiplicity"),
    pytest.param("2", "term-syntax", 1, id="ends-early"),
    pytest.param("2Px", "term-syntax", 2, id="trailing"),
    pytest.param("2P_", "term-syntax", 3, id="underscore-without-j"),
    pytest.param("", "empty", 0, id="empty"),
    pytest.param("   ", "empty", 0, id="blank"),
])
def test_term_errors_have_codes_and_positions(text: str, code: str, position: int) -> None:
    with pytest.raises(ConfspecError) as info:
        parse_term(text)
    assert info.value.code == code
    assert info.value.position == position
    assert code in confspec.ERROR_CODES


def test_term_error_message_shows_the_caret() -> None:
    with pytest.raises(ConfspecError) as info:
        parse_term("2P3")
    assert str(info.value) == (
        "J = 3 is impossible for L = 1, S = 1/2: J runs over |L − S| … L + S = 1/2, 3/2 "
        "[invalid-term]\n    2P3\n      ^")


def test_term_as_a_pydantic_field_accepts_text_and_round_trips_json() -> None:
    class Level(BaseModel):
        term: Term

    level = Level.model_validate({"term": "2Po3/2"})
    assert level.term == parse_term("2P°3/2")
    again = Level.model_validate_json(level.model_dump_json())
    assert again == level
    assert json.loads(level.model_dump_json())["term"]["J"] == "3/2"
    with pytest.raises(ValidationError) as info:
        Level.model_validate({"term": "2P5/2"})
    assert info.value.errors()[0]["type"] == "invalid-term"
    with pytest.raises(ValidationError):
        Term(multiplicity=2, L=1, J=3)


# ---------------------------------------------------------------------------- J


@pytest.mark.parametrize(("term", "js"), [
    pytest.param("3P", ["0", "1", "2"], id="3P"),
    pytest.param("2P°", ["1/2", "3/2"], id="2P"),
    pytest.param("1S", ["0"], id="1S"),
    pytest.param("4S°", ["3/2"], id="4S"),
    pytest.param("5D", ["0", "1", "2", "3", "4"], id="5D"),
    pytest.param("6H°", ["5/2", "7/2", "9/2", "11/2", "13/2", "15/2"], id="6H"),
    pytest.param("9D°2", ["2", "3", "4", "5", "6"], id="J-given-is-ignored"),
])
def test_allowed_j(term: str, js: list[str]) -> None:
    # |L − S| ≤ J ≤ L + S in steps of one (common practice, no source)
    values = allowed_j(term)
    assert [str(j) for j in values] == js
    t = parse_term(term).without_j()
    # the 2J + 1 weights of the levels add up to the term's (2S + 1)(2L + 1)
    assert sum(t.with_j(j).weight for j in values) == t.weight


# ---------------------------------------------------------------------------- all terms


def _names(config: str) -> list[str]:
    return [str(t) for t in terms(config)]


@pytest.mark.parametrize(("config", "expected"), [
    # Standard LS-term tables of equivalent and non-equivalent electrons (e.g. Condon &
    # Shortley, The Theory of Atomic Spectra (1935), ch. VII; from memory).
    pytest.param("2p1", "2P°", id="p1"),
    pytest.param("2p2", "3P 1D 1S", id="p2"),
    pytest.param("2p3", "4S° 2D° 2P°", id="p3"),
    pytest.param("2p4", "3P 1D 1S", id="p4"),
    pytest.param("3d2", "3F 3P 1G 1D 1S", id="d2"),
    pytest.param("3d3", "4F 4P 2H 2G 2F 2D 2D 2P", id="d3"),
    pytest.param("3d4", "5D 3H 3G 3F 3F 3D 3P 3P 1I 1G 1G 1F 1D 1D 1S 1S", id="d4"),
    pytest.param("3d5", "6S 4G 4F 4D 4P 2I 2H 2G 2G 2F 2F 2D 2D 2D 2P 2S", id="d5"),
    pytest.param("4f2", "3H 3F 3P 1I 1G 1D 1S", id="f2"),
    pytest.param("2p1 3p1", "3D 3P 3S 1D 1P 1S", id="p-p-non-equivalent"),
    pytest.param("2s1 2p1", "3P° 1P°", id="s-p"),
    pytest.param("3d1 4s1", "3D 1D", id="d-s"),
    pytest.param("2p2 3s1", "4P 2D 2P 2S", id="p2-s"),
    pytest.param("1s2 2s2 2p6", "1S", id="closed"),
    pytest.param("", "1S", id="bare-nucleus"),
])
def test_terms_of_configurations(config: str, expected: str) -> None:
    configuration = confspec.Configuration.model_validate(config)
    assert _names(configuration) == expected.split()


@pytest.mark.parametrize(("config", "count"), [
    # Number of LS terms of f^n (standard tables; from memory): 1, 7, 17, 47, 73, 119, 119.
    pytest.param("4f1", 1, id="f1"), pytest.param("4f2", 7, id="f2"),
    pytest.param("4f3", 17, id="f3"), pytest.param("4f4", 47, id="f4"),
    pytest.param("4f5", 73, id="f5"), pytest.param("4f6", 119, id="f6"),
    pytest.param("4f7", 119, id="f7"), pytest.param("4f8", 119, id="f8"),
    pytest.param("4f13", 1, id="f13"),
])
def test_number_of_f_terms(config: str, count: int) -> None:
    assert len(terms(config)) == count


def _microstates(config: str) -> int:
    # C(2(2l+1), k) per subshell, multiplied: the size of the product space
    return math.prod(math.comb(2 * (2 * s.l + 1), s.electrons) for s in parse(config).subshells)


@pytest.mark.parametrize("config", [
    "2p2", "2p3", "3d2", "3d3", "3d4", "3d5", "4f3", "4f7", "2p1 3p1", "3d1 4s1",
    "[Ar] 3d6 4s2", "[Xe] 4f1 5d1 6s2", "[Xe] 4f7 5d1 6s2", "4f7 5d1 6s1", "[Rn] 5f3 6d1 7s2",
    "2p5 3d1", "3d5 4p3", "5g3", "4f2 5g1 6h1",
])
def test_term_weights_add_up_to_the_microstates(config: str) -> None:
    found = terms(config)
    assert sum(t.weight for t in found) == _microstates(config)
    parity = parse(config).parity
    assert all(t.parity == parity and t.J is None for t in found)


def test_terms_accept_text_or_configuration_and_keep_parity() -> None:
    assert terms("[Ne] 3s2 3p1") == terms(parse("3p1"))
    assert all(t.is_odd for t in terms("4f7 5d1 6s1"))
    counted = Counter(str(t) for t in terms("3d3"))
    assert counted["2D"] == 2 and counted["4F"] == 1  # repeated terms are listed as often


def test_four_f_seven_five_d_six_s_is_not_brute_forced() -> None:
    # 3432 × 10 × 2 = 68 640 microstates: the result must still be complete (the speed
    # itself is measured in benchmarks/bench_terms.py, not here)
    found = terms("4f7 5d1 6s1")
    assert sum(t.weight for t in found) == 68_640
    assert max(t.multiplicity for t in found) == 10


# ---------------------------------------------------------------------------- Hund


# Hund ground terms of l^n (standard tables, e.g. the lanthanide 4f^n ground levels
# 2F5/2 … 2F7/2 known from free-ion and crystal spectra; from memory).
HUND_P = ["2P°1/2", "3P0", "4S°3/2", "3P2", "2P°3/2", "1S0"]
HUND_D = ["2D3/2", "3F2", "4F3/2", "5D0", "6S5/2", "5D4", "4F9/2", "3F4", "2D5/2", "1S0"]
HUND_F = ["2F°5/2", "3H4", "4I°9/2", "5I4", "6H°5/2", "7F0", "8S°7/2", "7F6", "6H°15/2",
          "5I8", "4I°15/2", "3H6", "2F°7/2", "1S0"]


@pytest.mark.parametrize(("config", "term"), [
    *(pytest.param(f"2p{k}", t, id=f"p{k}") for k, t in enumerate(HUND_P, 1)),
    *(pytest.param(f"3d{k}", t, id=f"d{k}") for k, t in enumerate(HUND_D, 1)),
    *(pytest.param(f"4f{k}", t, id=f"f{k}") for k, t in enumerate(HUND_F, 1)),
])
def test_hund_ground_terms_of_single_subshells(config: str, term: str) -> None:
    ground = hund_ground_term(config)
    assert str(ground) == term
    # Hund's first two rules pick the highest S, then the highest L, among all terms
    best = max(terms(config), key=lambda t: (t.multiplicity, t.L))
    assert ground.without_j() == best


@pytest.mark.parametrize(("config", "term"), [
    # NIST ASD ground levels (from memory) of configurations with several open subshells,
    # which our convention for rule 3 (open electrons counted together) reproduces.
    pytest.param("[Xe] 4f7 5d1 6s2", "9D°2", id="Gd"),
    pytest.param("[Rn] 5f7 6d1 7s2", "9D°2", id="Cm"),
    pytest.param("[Xe] 4f14 5d9 6s1", "3D3", id="Pt"),
    pytest.param("[Kr] 4d7 5s1", "5F5", id="Ru"),
    pytest.param("[Kr] 4d8 5s1", "4F9/2", id="Rh"),
    pytest.param("[Kr] 4d4 5s1", "6D1/2", id="Nb"),
    pytest.param("[Ar] 3d5 4s1", "7S3", id="Cr"),
    pytest.param("[Ar] 3d6 4s1", "6D9/2", id="Fe+"),
    pytest.param("[Ar] 3d2 4s1", "4F3/2", id="Ti+"),
    pytest.param("[Rn] 5f2 6d1 7s2", "4K11/2", id="Pa"),
    pytest.param("[Rn] 5f3 6d1 7s2", "5L°6", id="U"),
    pytest.param("[Rn] 5f4 6d1 7s2", "6L11/2", id="Np"),
    pytest.param("[Xe] 4f7 5d1 6s1", "10D°5/2", id="Gd+"),
    pytest.param("[Rn] 5f1 6d1", "3H°4", id="Th2+"),
])
def test_hund_convention_for_several_open_subshells(config: str, term: str) -> None:
    assert str(hund_ground_term(config)) == term


def test_hund_is_not_the_measured_term_for_cerium() -> None:
    # NIST ASD: Ce I ground level 4f 5d 6s2 1G°4 (from memory); Hund's rules give 3H°4
    assert str(hund_ground_term("[Xe] 4f1 5d1 6s2")) == "3H°4"
    assert "1G°" in _names("[Xe] 4f1 5d1 6s2")


def test_configuration_chemistry_views() -> None:
    # parity: (−1)^(sum of l) (common practice, no source)
    assert parse("[Xe] 4f1 5d1 6s2").parity == "odd"
    assert parse("[Ar] 3d6 4s2").parity == "even"
    assert parse("2p3").parity == "odd" and parse("2p2").parity == "even"
    config = parse("[Xe] 4f7 5d1 6s2")
    assert [s.label for s in config.open_subshells] == ["4f", "5d"]
    assert config.unpaired_electrons == 8 == hund_ground_term(config).multiplicity - 1
    assert parse("[Ar] 3d8").unpaired_electrons == 2
    assert parse("[Ne]").open_subshells == () and parse("[Ne]").unpaired_electrons == 0


def test_relativistic_subshells_are_refused_by_ls_functions() -> None:
    # 2p1/2^2 2p3/2^1 is one jj level, J = 3/2 (a full j = 1/2 pair and one j = 3/2 electron;
    # Condon & Shortley, jj coupling chapter): summing it into 2p3 would invent 4S, 2D, 2P
    jj = parse("[He] 2s2 2p1/2^2 2p3/2^1")
    for function in (terms, hund_ground_term):
        with pytest.raises(ConfspecError) as info:
            function(jj)
        assert info.value.code == "jj-configuration"
