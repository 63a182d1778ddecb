"""Conventions of real level tables: unmarked parity, helium-like labels, the opacity
project's seniorities and parent scopes, a '?' for a lost digit."""

from __future__ import annotations

import pytest

import confspec
from confspec import ConfspecError, parse_level, validate_level
from confspec.cleaning import ConfigurationCheck, LevelCheck
from confspec.levels import has_odd_mark, read_level


# ------------------------------------------------------------------ parity conventions
def test_unmarked_terms_give_no_parity_under_the_unmarked_convention() -> None:
    # C III 2s2p 3P°1 (NIST ASD), written without its mark as many tables do
    assert [p.code for p in validate_level("2s.2p 3P1")] == ["parity-mismatch"]
    assert validate_level("2s.2p 3P1", parity="unmarked") == []
    level, added = read_level("2s.2p 3P1", parity="unmarked")
    assert str(level.term) == "3P°1" and added == ("parity-from-configuration",)
    # a written odd mark is still checked: 2s2 1S is even (sum of l = 0; common practice)
    assert [p.code for p in validate_level("2s2 1S°0", parity="unmarked")] == [
        "parity-mismatch"]


def test_parity_messages_never_call_an_unmarked_term_marked() -> None:
    unmarked = validate_level("2p 2P3/2")[0].message
    assert "has no odd mark, so it reads as even" in unmarked and "marked even" not in unmarked
    odd = validate_level("2s 2S°1/2")[0].message
    assert odd.startswith("2S°1/2 is marked odd (°)")
    parent = validate_level("2p2(3P°) 3s 4P")[0]
    assert parent.code == "parity-mismatch" and parent.message.startswith("parent term 3P°")


def test_unmarked_parents_take_their_group_parity() -> None:
    # Fe I z7D°: 3d6(5D)4s4p(3P°) (NIST ASD), parents and term unmarked
    level = parse_level("3d6(5D)4s4p(3P) z7D4", parity="unmarked")
    assert [str(p.term) for p in level.parents] == ["5D", "3P°"]
    assert str(level.term) == "7D°4"


def test_an_unknown_parity_convention_is_refused() -> None:
    with pytest.raises(ConfspecError) as info:
        validate_level("2s 2S", parity="sometimes")
    assert info.value.code == "unknown-option"
    with pytest.raises(ConfspecError):
        LevelCheck(parity="sometimes")


@pytest.mark.parametrize(("text", "term_only", "odd"), [
    ("2P*", True, True), ("2P°", True, True), ("3PO", True, True), ("3PE", True, False),
    ("2P", True, False), ("2s.2p 3P*1", False, True), ("3d7(4F)4s4p(3P°) z6G13/2", False, True),
    ("2s.2p 3P1", False, False), ("2^3P_2", False, False), ("not a level", False, False),
])
def test_what_the_automatic_convention_looks_for(text: str, term_only: bool, odd: bool) -> None:
    assert has_odd_mark(text, term_only=term_only) is odd


# ------------------------------------------------------------------ helium-like labels
@pytest.mark.parametrize(("label", "level"), [
    # n then 2S+1, L, J of the 1s nl level of a two-electron spectrum (He I, NIST ASD)
    ("1^1S_0", "1s2 1S0"),
    ("2^3S_1", "1s1 2s1 3S1"),
    ("2^3P_2", "1s1 2p1 3P°2"),
    ("2^1P_1", "1s1 2p1 1P°1"),
    ("3^3D_3", "1s1 3d1 3D3"),
    ("2^3P", "1s1 2p1 3P°"),
])
def test_helium_labels_read_as_levels(label: str, level: str) -> None:
    parsed, added = read_level(label)
    assert str(parsed) == level and added == ("helium-label",)


@pytest.mark.parametrize(("label", "code"), [
    ("1^3S_1", "term-not-allowed"),  # 1s2 has only 1S (Pauli; common practice, no source)
    ("2^3D_1", "invalid-subshell"),  # no 2d
    ("2^3P_3", "j-not-allowed"),  # 3P has J = 0, 1, 2
])
def test_impossible_helium_labels_are_refused(label: str, code: str) -> None:
    problems = validate_level(label)
    assert [p.code for p in problems] == [code]
    assert "the label reads as" in problems[0].message and problems[0].position == 0


# ------------------------------------------------------------------ opacity-project parents
def test_a_digit_after_a_parent_that_is_no_j_is_a_seniority() -> None:
    # TOPbase Fe records: 3d5(6S5) 4s, 3d5(4P3) 4s; 6S of d5 has seniority 5, 4P seniority 3
    # (Racah; Nielson & Koster tables), while J of 6S is 5/2 only
    level, added = read_level("3d5(6S5) 4s 7S")
    assert [str(p.term) for p in level.parents] == ["6S"]
    assert added == ("parent-seniority:(6S5)",)
    assert validate_level("3d5(4P3) 4s 5P") == []
    # neither a J of 6S nor a seniority of 3d5 (odd w needs odd v)
    assert [p.code for p in validate_level("3d5(6S4) 4s 7S")] == ["j-not-allowed"]
    # NIST's reading wins where the digit is a J: 3d6(5D4) is J = 4
    assert parse_level("3d6(5D4)4s 6D9/2").parents[0].term.J == 4


def test_a_parent_couples_the_last_subshell_when_it_is_not_a_term_of_all() -> None:
    # TOPbase Fe record '3p5 3d4(3F4)': 3F is no term of 3p5 3d4 (odd, all odd terms) but a
    # term of 3d4: the parent couples the subshell it follows (the opacity project's layout)
    level, added = read_level("3p5 3d4(3F4) 4D°")
    assert level.parents[0].subshells == ("3d",)
    assert added == ("parent-of-last-subshell:(3F4)",)
    assert parse_level(str(level)) == level  # the canonical text reads back the same


def test_seniority_alone_is_checked() -> None:
    assert validate_level("3d6(4) 4s 6D") == []  # d6 seniorities 0, 2, 4
    problem = validate_level("3d6(3) 4s 6D")[0]
    assert problem.code == "parent-not-allowed" and "possible: 0, 2, 4" in problem.message


# ------------------------------------------------------------------ lost digits, run-together
@pytest.mark.parametrize("text", ["[Ar] 3d?", "[Ar] 3d^?", "3d?4s2", "4s2 3d?"])
def test_a_question_mark_for_a_digit_is_refused(text: str) -> None:
    problems = confspec.validate(text)
    assert [p.code for p in problems] == ["unknown-occupancy"]
    assert text[problems[0].position or 0] == "?"


def test_a_question_mark_after_a_space_stays_a_note() -> None:
    outcome = ConfigurationCheck()("[Ar] 3d6 ?")
    assert outcome.ok and "note:?" in outcome.fixes
    assert [p.code for p in validate_level("3d? 2D")] == ["unknown-occupancy"]


@pytest.mark.parametrize("text", ["[Xe] 5d16s2", "[Xe] 5d¹⁶s²"])
def test_plain_and_superscript_run_together_read_alike_with_a_fix(text: str) -> None:
    outcome = ConfigurationCheck()(text)
    assert outcome.normalized == "[Xe] 5d1 6s2"
    assert outcome.fixes == ("run-together:5d1 6s2",)


def test_closed_subshells_run_together_leave_no_fix() -> None:
    assert ConfigurationCheck()("1s22s22p6").fixes == ()
    assert ConfigurationCheck()("[Xe]4f145d106s2").fixes == ()


def test_a_spectrum_without_its_space_is_read_with_a_fix() -> None:
    # Fe III: Fe2+, 24 electrons, ground configuration [Ar] 3d6 (NIST ASD)
    outcome = ConfigurationCheck()("[Ar] 3d6", "FeIII")
    assert outcome.ok and outcome.fixes == ("spectrum:Fe III",)
    assert ConfigurationCheck()("[Ar] 3d6", "Fe III").fixes == ()


@pytest.mark.parametrize(("text", "level"), [
    # J in parentheses after an underscore, as a periodic-table dataset writes its terms
    # (`^2S_(1/2)`, elem_v3.json in ../shared/real-world); Na I and Fe I/II ground levels
    # from NIST ASD
    ("2p6 3s ^2S_(1/2)", "2p6 3s1 2S1/2"),
    ("3d6 4s2 5D_(4)", "3d6 4s2 5D4"),
    ("Fe II 3d6(5D)4s a^6D_(9/2)", "Fe II 3d6(5D) 4s1 a6D9/2"),
])
def test_a_j_in_parentheses_reads_in_a_level(text: str, level: str) -> None:
    assert str(parse_level(text)) == level
