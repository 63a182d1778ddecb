"""The compiled fast path is proven equal to the grammar on every string it accepts."""

from __future__ import annotations

from collections.abc import Callable

from hypothesis import example, given
from hypothesis import strategies as st

from confspec import Configuration, ConfspecError
from confspec.notation.fastpath import fast_occupancies, fast_raw
from confspec.notation.grammar import parse_configuration_raw
from confspec.notation.resolve import resolve

from .strategies import configurations

CORE = st.sampled_from(["", "[He]", "[Ne]", "[Ar]", "[Kr]", "[Xe]", "[Rn]", "[Og]", "[Ar] ",
                        "[Ne].", "[Fe] ", "[ar]"])
OCC = st.sampled_from(["", "0", "1", "2", "6", "10", "14", "99", "^2", "^{6}", "<sup>10</sup>",
                       "²", "¹⁴", "⁻¹", "^-1", "(2)"])
TOKEN = st.builds(lambda n, letter, k: f"{n}{letter}{k}", st.integers(0, 12),
                  st.sampled_from("spdfghikx"), OCC)
SEP = st.sampled_from(["", "", " ", ".", "  ", ","])


@st.composite
def fast_shaped(draw: st.DrawFn) -> str:
    tokens = draw(st.lists(TOKEN, max_size=8))
    text = draw(CORE)
    for token in tokens:
        text += token + draw(SEP)
    return text.rstrip(" .") if draw(st.booleans()) else text


def _full_path(text: str) -> Configuration | None:
    try:
        occupancies, errors = resolve(parse_configuration_raw(text), text)
    except ConfspecError:
        return None
    return None if errors else Configuration.from_checked(occupancies)


def fast_configuration(text: str) -> Configuration | None:
    occupancies = fast_occupancies(text)
    return None if occupancies is None else Configuration.from_shell_order(occupancies)


def _agree(text: str) -> None:
    fast = fast_configuration(text)
    if fast is None:
        return
    assert fast == _full_path(text), text
    assert fast.subshells == tuple(sorted(fast.subshells, key=lambda s: (s.n, s.l)))


@given(fast_shaped())
@example("1s22s22p63s23p64s23d104p65s24d105p66s24f145d106p67s25f146d107p6")
@example("[Xe]4f145d106s2")
@example("2p110s1")
@example("[Ar]3d⁶4s²")
@example("[Xe] 4f^{9} 6s^{1} 12p^{1}")
@example("1s2 10s1")
@example("1s210s1")
def test_fast_path_equals_grammar_on_fast_shaped_text(text: str) -> None:
    _agree(text)


@given(configurations())
def test_fast_path_takes_canonical_text(config: Configuration) -> None:
    text = str(config)
    if all(s.n < 100 and s.l < 8 for s in config.subshells):
        assert fast_configuration(text) == config
    _agree(text)
    _agree(config.format(style="caret", core="expand"))
    _agree(config.format(style="unicode", order="filling"))
    _agree(config.format(style="html"))
    _agree(config.format(style="nist-asd"))
    _agree(config.format(core="expand").replace(" ", ""))


def _raw_or_error(read: Callable[[str], object], text: str) -> object:
    try:
        return read(text)
    except ConfspecError as err:
        return (err.code, err.position)


@given(fast_shaped())
@example("1s22s22p73s2")
@example("[Ar] 3d11 4s2")
@example("1s2 2s3 2p7")
@example("[Ne] 2p6 3s1")
@example("2d1 3d¹⁰ 4s^{2} 5p<sup>7</sup>")
def test_fast_raw_equals_the_grammar_raw(text: str) -> None:
    fast = fast_raw(text)
    if fast is None:
        return
    assert fast == _raw_or_error(parse_configuration_raw, text), text
