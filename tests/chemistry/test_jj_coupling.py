"""jj coupling: the levels (J_1, J_2)J of nlj configurations, their counts, and the check of
J in level designations written with nlj subshells."""

from __future__ import annotations

import importlib
import json
import math
from collections import Counter
from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st
from pydantic import ValidationError

from confspec import (
    ConfspecError,
    JJLevel,
    jj_levels,
    jj_terms,
    parse,
    validate_level,
)
from confspec.chemistry.terms import microstate_count

F = Fraction


def _listing(configuration: str) -> dict[str, int]:
    return {str(level): n for level, n in jj_terms(configuration).items()}


# ---------------------------------------------------------------------------- public API
@pytest.mark.parametrize(("configuration", "expected"), [
    # two open j-subshells: (j1, j2)J with J = |j1 − j2| … j1 + j2 (Cowan 1981, ch. 4, jj
    # coupling of two non-equivalent electrons; angular momentum addition)
    pytest.param("2p1/2^1 3d3/2^1", {"(1/2,3/2)°1": 1, "(1/2,3/2)°2": 1}, id="p1/2-d3/2"),
    pytest.param("6p1/2^1 7s1", {"(1/2,1/2)°0": 1, "(1/2,1/2)°1": 1}, id="p1/2-s-mixed"),
    pytest.param("6p1/2^1 6p3/2^1", {"(1/2,3/2)1": 1, "(1/2,3/2)2": 1}, id="p1/2-p3/2"),
    # one open j-subshell: its own J values. (3/2)^2: 0, 2 (Condon & Shortley 1935, jj
    # coupling chapter); (1/2)^2 full: 0
    pytest.param("6p3/2^2", {"0": 1, "2": 1}, id="(3/2)^2"),
    pytest.param("6p1/2^2", {"0": 1}, id="(1/2)^2-closed"),
    pytest.param("6p1/2^2 6p3/2^1", {"3/2": 1}, id="closed-j-plus-one"),
    # (5/2)^3: J = 3/2, 5/2, 9/2; (7/2)^4: 0, 2, 2, 4, 4, 5, 6, 8 (de-Shalit & Talmi,
    # Nuclear Shell Theory 1963, tables of j^n, from memory)
    pytest.param("3d5/2^3", {"3/2": 1, "5/2": 1, "9/2": 1}, id="(5/2)^3"),
    pytest.param("4f7/2^4", {"0": 1, "2": 2, "4": 2, "5": 1, "6": 1, "8": 1}, id="(7/2)^4"),
    # closed shells only: J = 0 (common practice, no source)
    pytest.param("1s2 2s2", {"0": 1}, id="closed"),
])
def test_jj_terms_of_published_cases(configuration: str, expected: dict[str, int]) -> None:
    assert _listing(configuration) == expected


def test_three_open_subshells_couple_in_order() -> None:
    # ((j1, j2)J12, j3)J: J12 = 1, 2 from (1/2, 3/2); then with 5/2 (angular momentum
    # addition, common practice, no source); 48 = 2 · 4 · 6 microstates
    listing = _listing("2p1/2^1 3p3/2^1 4d5/2^1")
    assert list(listing) == ["((1/2,3/2)1,5/2)3/2", "((1/2,3/2)1,5/2)5/2",
                             "((1/2,3/2)1,5/2)7/2", "((1/2,3/2)2,5/2)1/2",
                             "((1/2,3/2)2,5/2)3/2", "((1/2,3/2)2,5/2)5/2",
                             "((1/2,3/2)2,5/2)7/2", "((1/2,3/2)2,5/2)9/2"]
    assert sum(level.weight * n for level, n in jj_terms("2p1/2^1 3p3/2^1 4d5/2^1").items()
               ) == 48


def test_an_open_nl_subshell_couples_whole_with_its_own_j_values() -> None:
    # 3d1 has J = 3/2, 5/2 (its 2D levels); with 6p1/2 (1/2): (3/2,1/2)1,2 and (5/2,1/2)2,3
    assert _listing("3d1 6p1/2^1") == {"(3/2,1/2)°1": 1, "(3/2,1/2)°2": 1, "(5/2,1/2)°2": 1,
                                       "(5/2,1/2)°3": 1}
    # the levels of 3d2 are 3F2,3,4 3P0,1,2 1G4 1D2 1S0 (Condon & Shortley 1935): J_1 = 0
    # twice (3P0, 1S0) and J_1 = 2 three times (3F2, 3P2, 1D2)
    levels = jj_terms("3d2 6p1/2^1")
    by_text = {str(level): n for level, n in levels.items()}
    assert by_text["(2,1/2)°3/2"] == 3
    assert by_text["(0,1/2)°1/2"] == 2
    assert sum(level.weight * n for level, n in levels.items()) == 45 * 2


def test_jj_level_model() -> None:
    level = JJLevel(subshell_j=(F(1, 2), F(3, 2)), J=2, parity="odd")
    assert str(level) == "(1/2,3/2)°2"
    assert repr(level) == "JJLevel('(1/2,3/2)°2')"
    assert f"{level:latex}" == "(1/2,3/2)^{\\circ}_{2}"
    assert level.format("html") == "(1/2,3/2)<sup>o</sup><sub>2</sub>"
    assert level.format("ascii") == "(1/2,3/2)o2"
    assert level.weight == 5
    assert hash(level) == hash(JJLevel(subshell_j=(F(1, 2), F(3, 2)), J=F(2), parity="odd"))
    assert level in jj_terms("2p1/2^1 3d3/2^1")  # the listing's levels compare equal
    assert JJLevel.model_validate_json(level.model_dump_json()) == level
    assert json.loads(level.model_dump_json())["J"] == "2"
    with pytest.raises(ConfspecError) as info:
        level.format("fancy")
    assert info.value.code == "unknown-option"


@pytest.mark.parametrize("fields", [
    pytest.param({"subshell_j": (F(1, 2), F(3, 2)), "J": 3}, id="J-beyond-j1+j2"),
    pytest.param({"subshell_j": (F(1, 2), F(3, 2)), "J": F(3, 2)}, id="half-integer-from-two"),
    pytest.param({"subshell_j": (F(3, 2),), "J": F(1, 2)}, id="one-subshell-other-J"),
    pytest.param({"subshell_j": (F(1, 2), F(1, 2), F(1, 2)), "J": F(1, 2)},
                 id="missing-intermediate"),
    pytest.param({"subshell_j": (F(1, 3),), "J": F(1, 3)}, id="not-half-integer"),
    pytest.param({"subshell_j": (), "J": 1}, id="nothing-open-J-1"),
])
def test_jj_level_refuses_impossible_couplings(fields: dict[str, object]) -> None:
    with pytest.raises(ValidationError):
        JJLevel.model_validate(fields)


def test_too_many_jj_levels_are_refused_with_a_code(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(importlib.import_module("confspec.chemistry.terms"),
                        "MAX_LISTED_TERMS", 3)
    with pytest.raises(ConfspecError) as info:
        jj_terms("2p1/2^1 3p3/2^1 4d5/2^1")
    assert info.value.code == "too-many-terms"


# ---------------------------------------------------------------------------- designations
@pytest.mark.parametrize(("designation", "codes"), [
    # 2p3/2^1 has only J = 3/2 (one electron in a j-subshell has J = j; common practice)
    pytest.param("2p3/2 2P°1/2", ["j-not-allowed"], id="2p3/2-J1/2"),
    pytest.param("2p3/2 2P°3/2", [], id="2p3/2-J3/2"),
    # (1/2, 3/2) gives J = 1, 2 only (Condon & Shortley 1935): J = 0 fails, and the even
    # configuration also refuses the odd mark
    pytest.param("6p1/2 6p3/2 3P°0", ["j-not-allowed", "parity-mismatch"], id="pp-J0-odd"),
    pytest.param("6p1/2 6p3/2 3P0", ["j-not-allowed"], id="pp-J0"),
    pytest.param("6p1/2 6p3/2 3P1", [], id="pp-J1"),
    # (3/2)^2: J = 0, 2
    pytest.param("6p3/2^2 3P1", ["j-not-allowed"], id="(3/2)^2-J1"),
    pytest.param("6p3/2^2 1D2", [], id="(3/2)^2-J2"),
    # the LS letter is a label only: 4S is no term of p2 in LS coupling, yet 6p3/2^2 gives
    # no term-not-allowed; its J must still fit the label (|L − S| … L + S)
    pytest.param("6p1/2 6p3/2 5D1", [], id="label-only"),
    pytest.param("6p3/2^2 1S2", ["j-not-allowed"], id="J-outside-the-label"),
    # mixed nl and nlj: 3d1 6p1/2 has J = 1, 2, 3
    pytest.param("3d 6p1/2 3P°0", ["j-not-allowed"], id="mixed-J0"),
    pytest.param("3d 6p1/2 3F°3", [], id="mixed-J3"),
    # LS configurations keep the LS check (Condon & Shortley: p2 is 3P, 1D, 1S)
    pytest.param("2p2 1P1", ["term-not-allowed"], id="ls-unchanged"),
])
def test_validate_level_checks_j_in_jj_coupling(designation: str, codes: list[str]) -> None:
    assert sorted(p.code for p in validate_level(designation)) == sorted(codes)


def test_the_jj_message_lists_the_possible_j() -> None:
    (problem,) = validate_level("6p1/2 6p3/2 3P0")
    assert problem.message == ("J = 0 is not a J of 6p1/2^1 6p3/2^1 in jj coupling: 1, 2")
    assert problem.position is not None


# ---------------------------------------------------------------------------- properties
@st.composite
def nlj_configurations(draw: st.DrawFn) -> tuple[str, int]:
    """One to three subshells, nlj (l ≤ 3) or, now and then, an nl subshell, with their
    microstate count: C(2j + 1, w) for nlj, C(2(2l + 1), w) for nl (Pauli; common
    practice, no source)."""
    keys = draw(st.sets(st.tuples(st.integers(2, 6), st.integers(0, 3),
                                  st.sampled_from([-1, 1, 0])).filter(
        lambda k: k[1] < k[0] and not (k[1] == 0 and k[2] == -1)), min_size=1, max_size=3))
    parts, states, seen = [], 1, set[tuple[int, int, int]]()
    for n, l, sign in sorted(keys):
        as_nl = sign == 0 and l <= 2
        j2 = 0 if as_nl else 2 * l + (1 if sign == 0 else sign)
        if (n, l, 0 if j2 else -1) in seen or (n, l, j2) in seen:
            continue  # nl beside nlj of the same nl, or one nlj twice, is refused as written
        seen.update({(n, l, j2), (n, l, 0 if as_nl else -1)})
        if as_nl:
            w = draw(st.integers(1, 2 * (2 * l + 1)))
            parts.append(f"{n}{'spdf'[l]}{w}")
            states *= math.comb(2 * (2 * l + 1), w)
            continue
        w = draw(st.integers(1, j2 + 1))
        parts.append(f"{n}{'spdf'[l]}{j2}/2^{w}")
        states *= math.comb(j2 + 1, w)
    return " ".join(parts), states


@given(nlj_configurations())
def test_levels_carry_every_microstate_once(case: tuple[str, int]) -> None:
    text, states = case
    levels = jj_terms(text)
    assert sum(n * level.weight for level, n in levels.items()) == states
    assert microstate_count(text) == states
    # coupling J's in order gives the same J counts as the M-state count of jj_levels
    by_j: Counter[Fraction] = Counter()
    for level, n in levels.items():
        by_j[level.J] += n
    assert dict(by_j) == jj_levels(text)
    parity = parse(text).parity
    assert all(level.parity == parity for level in levels)
    # every listed level passes the model's own coupling check
    for level in levels:
        assert JJLevel.model_validate(level.model_dump()) == level
