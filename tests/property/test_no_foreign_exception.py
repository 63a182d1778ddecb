"""For any str input, nothing but ConfspecError escapes parse, validate, normalize, species."""

from __future__ import annotations

from hypothesis import given
from hypothesis import strategies as st
from hypothesis.extra.lark import from_lark

from confspec import (
    ConfspecError,
    normalize,
    parse,
    parse_level,
    parse_species,
    parse_term,
    validate,
    validate_level,
)
from confspec.notation.grammar import grammar_text

ALPHABET = st.sampled_from([*"0123456789spdfghikSPDF[]()^{}<>/$-−+.,;·_ \t⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻°*?:=",
                            "[Ar]", "[Ne]", "<sup>", "</sup>", "Fe", "III", "\\,", "Âº", "â",
                            "(5D)", "3P°", "2[3/2]", "L3", "1/2", "&sup2;", "“", "(est.)"])
notation_like = st.lists(ALPHABET, max_size=30).map("".join)


def _only_confspec_errors(text: str) -> None:
    for call in (parse, normalize, parse_species, parse_term, parse_level,
                 lambda t: parse(t, accept_uppercase=True), lambda t: parse(t, reference="Cu")):
        try:
            call(text)
        except ConfspecError as err:
            assert err.code and isinstance(err.message, str)
            if err.position is not None:
                assert 0 <= err.position <= len(text)
    for problem in (validate(text) + validate(text, species="Fe", strict=True)
                    + validate_level(text) + validate_level(text, species="Fe")):
        assert isinstance(problem, ConfspecError)


@given(st.text(max_size=60))
def test_any_text(text: str) -> None:
    _only_confspec_errors(text)


@given(notation_like)
def test_notation_like_text(text: str) -> None:
    _only_confspec_errors(text)


def _lark_strategy(start: str) -> st.SearchStrategy[str]:
    from lark import Lark

    grammar = Lark(grammar_text(), parser="lalr", lexer="contextual", start=start)
    return from_lark(grammar, start=start)


@given(_lark_strategy("configuration"))
def test_strings_from_the_grammar_parse_or_raise_confspec_errors(text: str) -> None:
    _only_confspec_errors(text)
    try:
        config = parse(text)
    except ConfspecError:
        return
    if config.subshells:  # '1s0' is the bare nucleus, written as an empty string
        assert parse(str(config)) == config


@given(_lark_strategy("level"))
def test_levels_from_the_grammar(text: str) -> None:
    _only_confspec_errors(text)


@given(_lark_strategy("species"))
def test_species_from_the_grammar(text: str) -> None:
    try:
        species = parse_species(text)
    except ConfspecError:
        return
    assert parse_species(str(species)) == species
