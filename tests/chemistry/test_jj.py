"""jj coupling of nlj configurations, checked against hand counts of the m states."""

from __future__ import annotations

from fractions import Fraction

import pytest

from confspec import ConfspecError, hund_ground_term, jj_levels, terms
from confspec.chemistry.terms import microstate_count

F = Fraction


@pytest.mark.parametrize(("text", "expected"), [
    # one electron in a j-subshell has J = j (common practice, no source)
    pytest.param("2p3/2^1", {F(3, 2): 1}, id="2p3/2"),
    pytest.param("3d5/2^1", {F(5, 2): 1}, id="3d5/2"),
    # a full j = 1/2 pair is a single J = 0 state (Condon & Shortley, jj coupling chapter)
    pytest.param("6p1/2^2", {F(0): 1}, id="6p1/2^2"),
    # (1/2, 3/2) gives J = 1, 2 only (Condon & Shortley, jj coupling chapter)
    pytest.param("6p1/2^1 6p3/2^1", {F(1): 1, F(2): 1}, id="(1/2,3/2)"),
    # (3/2)^2 gives J = 0, 2 (Condon & Shortley, jj coupling chapter)
    pytest.param("6p3/2^2", {F(0): 1, F(2): 1}, id="(3/2)^2"),
    # nl subshells couple through their LS terms: p2 is 3P0,1,2 1D2 1S0 (Condon & Shortley)
    pytest.param("2p2", {F(0): 2, F(1): 1, F(2): 2}, id="p2-as-LS"),
    # mixed nl + nlj: 2s1 (j=1/2) with 2p3/2 (J=3/2) gives J = 1, 2 (angular momentum addition)
    pytest.param("2s1 2p3/2^1", {F(1): 1, F(2): 1}, id="mixed"),
])
def test_j_levels(text: str, expected: dict[Fraction, int]) -> None:
    assert jj_levels(text) == expected


@pytest.mark.parametrize("text", ["2p3/2^1", "6p1/2^2", "6p1/2^1 6p3/2^1"])
def test_ls_functions_refuse_nlj_input(text: str) -> None:
    for function in (terms, hund_ground_term):
        with pytest.raises(ConfspecError) as info:
            function(text)
        assert info.value.code == "jj-configuration"


def test_microstates_of_j_subshells() -> None:
    assert microstate_count("6p1/2^2") == 1  # C(2, 2): Pauli, common practice, no source
    assert microstate_count("6p3/2^2") == 6  # C(4, 2)
