"""Levels: generated valid levels round-trip; accepted terms agree with terms() and J."""

from __future__ import annotations

from fractions import Fraction

from hypothesis import assume, given
from hypothesis import strategies as st
from hypothesis.extra.lark import from_lark

from confspec import (
    Configuration,
    ConfspecError,
    Term,
    allowed_j,
    parse_level,
    validate_level,
)
from confspec.chemistry.terms import TERM_LETTERS, term_keys
from confspec.levels.designations import read_term_token
from confspec.notation.grammar import grammar_text, parse_term_raw

from .strategies import configurations


@st.composite
def valid_levels(draw: st.DrawFn) -> str:
    config = draw(configurations(max_n=6, max_l=3))
    assume(len(config.open_subshells) <= 3)
    candidates = sorted(term_keys(config))
    two_s, L = draw(st.sampled_from(candidates))
    term = Term(multiplicity=two_s + 1, L=L, parity=config.parity)
    J = draw(st.sampled_from(allowed_j(term)))
    text = f"{config} {draw(st.sampled_from(['', 'a', 'z']))}{term.with_j(J)}"
    return text + draw(st.sampled_from(["", " ?", " (predicted)"]))


@given(valid_levels(), st.sampled_from(["plain", "latex", "html", "unicode", "caret"]))
def test_valid_levels_round_trip(text: str, style: str) -> None:
    level = parse_level(text)
    assert validate_level(level) == []
    assert parse_level(level.format(style)) == level


@given(configurations(max_n=5, max_l=3), st.integers(1, 8), st.integers(0, 8),
       st.sampled_from(["", "°"]), st.integers(0, 16))
def test_accepted_combinations_agree_with_terms_and_j(config: Configuration, multiplicity: int,
                                                      L: int, mark: str, twice_j: int) -> None:
    assume(len(config.open_subshells) <= 3)
    J = Fraction(twice_j, 2)
    j_text = str(J.numerator) if J.denominator == 1 else f"{J.numerator}/2"
    text = f"{config} {multiplicity}{TERM_LETTERS[L]}{mark}{j_text}"
    if validate_level(text):
        return
    assert (multiplicity - 1, L) in term_keys(config)
    assert J in allowed_j(f"{multiplicity}{TERM_LETTERS[L]}")
    assert (mark == "°") == (config.parity == "odd")


def _term_tokens() -> st.SearchStrategy[str]:
    from lark import Lark

    return from_lark(Lark(grammar_text(), parser="lalr", lexer="contextual", start="term"),
                     start="term")


@given(_term_tokens())
def test_every_term_token_of_the_grammar_is_read(text: str) -> None:
    try:
        token, position = parse_term_raw(text)
        read_term_token(token, position, text)
    except ConfspecError:
        pass
