"""Racah's seniority of the terms of l^w, against Nielson & Koster, Spectroscopic
Coefficients for the p^n, d^n and f^n Configurations (1963), as recalled (from memory)."""

from __future__ import annotations

import json
from collections import Counter

import pytest
from hypothesis import given
from hypothesis import strategies as st

from confspec import ConfspecError, SeniorityTerm, Term, seniority_terms, terms, validate_level


def _by_seniority(configuration: str) -> dict[str, list[int]]:
    """Term text -> the seniorities of its occurrences, low first."""
    out: dict[str, list[int]] = {}
    for t in seniority_terms(configuration):
        out.setdefault(str(t.term), []).append(t.seniority)
    return out


# ---------------------------------------------------------------------------- published
@pytest.mark.parametrize(("configuration", "expected"), [
    # p3: 4S and 2D at v = 3, 2P at v = 1 (Nielson & Koster 1963, p^n table, from memory)
    pytest.param("2p3", {"4S°": [3], "2D°": [3], "2P°": [1]}, id="p3"),
    # d2: 1S at v = 0, the rest at v = 2 (Nielson & Koster 1963, from memory)
    pytest.param("3d2", {"3F": [2], "3P": [2], "1G": [2], "1D": [2], "1S": [0]}, id="d2"),
    # d3: the two 2D terms have v = 1 and v = 3 (Nielson & Koster 1963, from memory)
    pytest.param("3d3", {"4F": [3], "4P": [3], "2H": [3], "2G": [3], "2F": [3], "2D": [1, 3],
                         "2P": [3]}, id="d3"),
    # d4: 3P, 3F, 1D, 1G each at v = 2 and 4; 1S at v = 0 and 4; 5D, 3H, 3G, 3D, 1I, 1F at
    # v = 4 (Nielson & Koster 1963, from memory)
    pytest.param("3d4", {"5D": [4], "3H": [4], "3G": [4], "3F": [2, 4], "3D": [4],
                         "3P": [2, 4], "1I": [4], "1G": [2, 4], "1F": [4], "1D": [2, 4],
                         "1S": [0, 4]}, id="d4"),
    # d5: 6S v = 5; 4P, 4F v = 3; 4D, 4G v = 5; 2D at v = 1, 3, 5; 2S v = 5 (Nielson &
    # Koster 1963, from memory; 6S5 and 4P3 also as TOPbase writes Fe III parents)
    pytest.param("3d5", {"6S": [5], "4G": [5], "4F": [3], "4D": [5], "4P": [3], "2I": [5],
                         "2H": [3], "2G": [3, 5], "2F": [3, 5], "2D": [1, 3, 5], "2P": [3],
                         "2S": [5]}, id="d5"),
])
def test_seniority_of_published_cases(configuration: str, expected: dict[str, list[int]]
                                      ) -> None:
    assert _by_seniority(configuration) == expected


def test_d3_distinguishes_the_two_2d_terms() -> None:
    two_d = [t for t in seniority_terms("3d3") if str(t.term) == "2D"]
    assert [str(t) for t in two_d] == ["2D (v=1)", "2D (v=3)"]
    assert [t.index for t in two_d] == [None, None]  # (v, S, L) does not repeat


def test_f3_repeats_get_an_index() -> None:
    # f3: 2D, 2G, 2H twice each at v = 3 (Nielson & Koster tell them apart by U = (20),
    # (21) and (11), (21); from memory); 2F once at v = 1 and once at v = 3
    listed = [str(t) for t in seniority_terms("4f3")]
    assert listed == ["4I° (v=3)", "4G° (v=3)", "4F° (v=3)", "4D° (v=3)", "4S° (v=3)",
                      "2L° (v=3)", "2K° (v=3)", "2I° (v=3)", "2H° (v=3, 1)", "2H° (v=3, 2)",
                      "2G° (v=3, 1)", "2G° (v=3, 2)", "2F° (v=1)", "2F° (v=3)",
                      "2D° (v=3, 1)", "2D° (v=3, 2)", "2P° (v=3)"]


@pytest.mark.parametrize(("configuration", "count"), [
    # numbers of LS terms of f^w (Nielson & Koster 1963, from memory)
    pytest.param("4f2", 7, id="f2"), pytest.param("4f3", 17, id="f3"),
    pytest.param("4f4", 47, id="f4"), pytest.param("4f5", 73, id="f5"),
    pytest.param("4f6", 119, id="f6"), pytest.param("4f7", 119, id="f7"),
])
def test_number_of_f_terms(configuration: str, count: int) -> None:
    assert len(seniority_terms(configuration)) == count


def test_f7_half_filled() -> None:
    by = _by_seniority("4f7")
    # 8S has v = 7; 6P, 6F, 6H come from f5 (v = 5), 6D, 6G, 6I first at f7 (v = 7)
    # (Nielson & Koster 1963, from memory)
    assert by["8S°"] == [7]
    assert (by["6P°"], by["6F°"], by["6H°"]) == ([5], [5], [5])
    assert (by["6D°"], by["6G°"], by["6I°"]) == ([7], [7], [7])
    # numbers of terms by seniority: v = 1, 3, 5, 7 carry the terms of f1, f3 − f1, f5 −
    # f3, f7 − f5 (Racah 1943): 1, 16, 56, 46 with the f^w totals above
    assert Counter(t.seniority for t in seniority_terms("4f7")) == {1: 1, 3: 16, 5: 56, 7: 46}


# ---------------------------------------------------------------------------- API
def test_listing_matches_terms_and_leaves_term_untouched() -> None:
    for configuration in ("3d3", "[Ar] 3d6 4s2", "4f7", "2p4", "1s2"):
        assert [t.term for t in seniority_terms(configuration)] == terms(configuration)
    # Term itself has no seniority field: its equality and JSON stay as they were
    assert "seniority" not in Term.model_fields
    assert json.loads(Term(multiplicity=2, L=2).model_dump_json()) == {
        "multiplicity": 2, "L": 2, "parity": "even", "J": None}


def test_closed_shells_have_seniority_zero() -> None:
    assert [str(t) for t in seniority_terms("[Ne]")] == ["1S (v=0)"]


def test_model_format_and_json() -> None:
    term = SeniorityTerm(term=Term(multiplicity=2, L=5, parity="odd"), seniority=3, index=2)
    assert str(term) == "2H° (v=3, 2)"
    assert repr(term) == "SeniorityTerm('2H° (v=3, 2)')"
    assert f"{term:latex}" == "{}^{2}_{3}\\mathrm{H}^{\\circ}(2)"
    assert SeniorityTerm.model_validate_json(term.model_dump_json()) == term
    assert term in seniority_terms("4f3")
    with pytest.raises(ConfspecError) as info:
        term.format("html")
    assert info.value.code == "unknown-option"


@pytest.mark.parametrize(("configuration", "code"), [
    pytest.param("3d3 4s1", "several-open-subshells", id="two-open"),
    pytest.param("2p3/2^1", "jj-configuration", id="nlj"),
])
def test_refusals(configuration: str, code: str) -> None:
    with pytest.raises(ConfspecError) as info:
        seniority_terms(configuration)
    assert info.value.code == code


# ---------------------------------------------------------------------------- properties
@given(st.integers(0, 3).flatmap(lambda l: st.tuples(st.just(l),
                                                     st.integers(0, 2 * (2 * l + 1)))))
def test_seniority_rules_hold(case: tuple[int, int]) -> None:
    l, w = case
    capacity = 2 * (2 * l + 1)
    text = f"{l + 4}{'spdf'[l]}{w}" if w else "1s2"
    listed = seniority_terms(text)
    assert [t.term for t in listed] == terms(text)
    for t in listed:
        v = t.seniority
        # v ≤ w, v ≤ 4l + 2 − w, v ≡ w (mod 2) (Racah 1943; common practice)
        assert v <= min(w, capacity - w) and (w - v) % 2 == 0
    # a subshell and its complement (w holes) share their seniorities (Racah 1943)
    holes = f"{l + 4}{'spdf'[l]}{capacity - w}" if capacity - w else "1s2"
    assert [(t.term, t.seniority, t.index) for t in seniority_terms(holes)] == [
        (t.term, t.seniority, t.index) for t in listed]


# ---------------------------------------------------------------------------- designations
@pytest.mark.parametrize(("designation", "codes"), [
    # TOPbase writes the seniority after a parent of one subshell: 6S of d5 has v = 5, 4P
    # v = 3, 2D v = 1, 3 and 5 (Nielson & Koster 1963, from memory)
    pytest.param("3d5(6S5) 4s 7S", [], id="6S5"),
    pytest.param("3d5(4P3) 4s 5P", [], id="4P3"),
    pytest.param("3d5(2D1) 4s 3D", [], id="2D1"),
    pytest.param("3d5(2D5) 4s 3D", [], id="2D5"),
    # 4P of d5 has v = 3 only: v = 5 fits the bounds of d5 but not the term
    pytest.param("3d5(4P5) 4s 5P", ["parent-not-allowed"], id="4P5"),
    pytest.param("3d3(4F1) 4s 5F", ["parent-not-allowed"], id="4F1"),
])
def test_a_seniority_after_a_parent_is_one_of_that_term(designation: str, codes: list[str]
                                                        ) -> None:
    problems = validate_level(designation)
    assert [p.code for p in problems] == codes
    if codes:
        assert "has seniority 3, not" in problems[0].message
