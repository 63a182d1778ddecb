"""Reading configurations: every spelling of one value parses to that value."""

from __future__ import annotations

import pytest

import confspec
from confspec import Configuration, ConfspecError, parse

# Sodium's ground configuration, 1s2 2s2 2p6 3s1 (NIST ASD ground levels), in the spellings
# real tables use. Each must give the same value.
SODIUM = Configuration.from_occupancies({"1s": 2, "2s": 2, "2p": 6, "3s": 1})

SODIUM_SPELLINGS = [
    pytest.param("1s2 2s2 2p6 3s1", id="plain"),
    pytest.param("  1s2 2s2 2p6 3s1  ", id="outer-space"),
    pytest.param("1s2\t2s2\t2p6\t3s1", id="tabs"),
    pytest.param("1s2.2s2.2p6.3s1", id="dots"),
    pytest.param("1s2,2s2,2p6,3s1", id="commas"),
    pytest.param("1s2, 2s2, 2p6, 3s1", id="comma-space"),
    pytest.param("1s2;2s2;2p6;3s1", id="semicolons"),
    pytest.param("1s2·2s2·2p6·3s1", id="middle-dot"),
    pytest.param("1s2-2s2-2p6-3s1", id="dashes"),
    pytest.param("1s2_2s2_2p6_3s1", id="underscores"),
    pytest.param("1s22s22p63s1", id="run-together"),
    pytest.param("1s^2 2s^2 2p^6 3s^1", id="caret"),
    pytest.param("1s^{2} 2s^{2} 2p^{6} 3s^{1}", id="caret-braces"),
    pytest.param("1s^(2) 2s^(2) 2p^(6) 3s^(1)", id="caret-parens"),
    pytest.param("1s² 2s² 2p⁶ 3s¹", id="superscripts"),
    pytest.param("1s²2s²2p⁶3s¹", id="superscripts-run-together"),
    pytest.param("1s(2) 2s(2) 2p(6) 3s(1)", id="parens"),
    pytest.param("1s<sup>2</sup> 2s<sup>2</sup> 2p<sup>6</sup> 3s<sup>1</sup>", id="html"),
    pytest.param("1s<SUP>2</SUP>2s<SUP>2</SUP>2p<SUP>6</SUP>3s<SUP>1</SUP>", id="html-upper"),
    pytest.param("1s$^{2}$ 2s$^{2}$ 2p$^{6}$ 3s$^{1}$", id="latex-inline"),
    pytest.param("1s$^2$2s$^2$2p$^6$3s$^1$", id="latex-inline-run-together"),
    pytest.param(r"1s^{2}\,2s^{2}\,2p^{6}\,3s^{1}", id="latex-thin-space"),
    pytest.param("1s 2 2s 2 2p 6 3s 1", id="scraped-superscripts"),
    pytest.param("1s2 2s2 2p6 3s", id="omitted-one"),
    pytest.param("3s1 2p6 2s2 1s2", id="any-order"),
    pytest.param("1s2 2s2 2p6 3s1 3p0", id="explicit-zero"),
    pytest.param("[Ne] 3s1", id="core"),
    pytest.param("[Ne]3s1", id="core-no-space"),
    pytest.param("[ Ne ] 3s1", id="core-inner-space"),
    pytest.param("[ne] 3s1", id="core-lower"),
    pytest.param("[NE] 3s1", id="core-upper"),
    pytest.param("Ne 3s1", id="core-bracketless"),
    pytest.param(r"[\mathrm{Ne}]\,3s^{1}", id="latex-core"),
    pytest.param("[Ne].3s1", id="core-dot"),
    pytest.param("[He] 2s2 2p6 3s1", id="smaller-core"),
    pytest.param("1s2 2s2 2p6 3s1\u00a0", id="trailing-nbsp"),
    pytest.param("\ufeff1s2 2s2 2p6 3s1", id="byte-order-mark"),
    pytest.param("1s2\u20092s2\u20092p6\u20093s1", id="thin-spaces"),
    pytest.param("[Ne] 3s^{1}", id="core-caret"),
    pytest.param("1s2 2s2 2p^6 3s¹", id="mixed-markers"),
]


@pytest.mark.parametrize("text", SODIUM_SPELLINGS)
def test_every_spelling_gives_the_same_value(text: str) -> None:
    assert parse(text) == SODIUM
    assert hash(parse(text)) == hash(SODIUM)


@pytest.mark.parametrize(("text", "canonical"), [
    # Ground configurations as NIST ASD lists them (ground levels of the neutral atoms).
    pytest.param("[Ar]3d104s2", "[Ar] 3d10 4s2", id="Zn-run-together"),
    pytest.param("[Ar] 3d⁶ 4s²", "[Ar] 3d6 4s2", id="Fe-unicode"),
    pytest.param("4s^2 3d^{6} 1s2 2s2 2p6 3s2 3p6", "[Ar] 3d6 4s2", id="Fe-mixed-order"),
    pytest.param("[Xe]4f145d106s2", "[Xe] 4f14 5d10 6s2", id="Hg-run-together"),
    pytest.param("[Xe] 4f7 5d1 6s2", "[Xe] 4f7 5d1 6s2", id="Gd"),
    pytest.param("1s22s22p63s23p64s23d104p65s24d105p66s24f145d106p6",
                 "[Xe] 4f14 5d10 6s2 6p6", id="Rn-run-together"),
    pytest.param("[Rn] 5f14 7s2 7p1", "[Rn] 5f14 7s2 7p1", id="Lr"),
    pytest.param("Ar 3d6 4s2", "[Ar] 3d6 4s2", id="bracketless"),
    pytest.param("3d 6 4s 2", "3d6 4s2", id="bare-counts"),
    pytest.param("3p5 4s", "3p5 4s1", id="omitted-one"),
    pytest.param("[Kr] 4d10 5s0", "[Kr] 4d10", id="explicit-zero"),
    pytest.param("[Ne] 2p^-1 3s2", "[He] 2s2 2p5 3s2", id="hole-caret"),
    pytest.param("[Ne] 2p^{-1} 3s2", "[He] 2s2 2p5 3s2", id="hole-braces"),
    pytest.param("[Ne] 2p⁻¹ 3s2", "[He] 2s2 2p5 3s2", id="hole-superscript"),
    pytest.param("[Ne] 2p(-1) 3s2", "[He] 2s2 2p5 3s2", id="hole-parens"),
    pytest.param("[Ne] 2p^{−1} 3s2", "[He] 2s2 2p5 3s2", id="hole-unicode-minus"),
    pytest.param("[Ar] 3p^-0 4s2", "[Ar] 4s2", id="hole-zero"),
    pytest.param("[Ne] 1s^-1 3s1", "1s1 2s2 2p6 3s1", id="core-hole"),
    pytest.param("[Ne]", "[He] 2s2 2p6", id="core-only"),
    pytest.param("1s2 2s2 2p6", "[He] 2s2 2p6", id="neon-expanded"),
    pytest.param("2p110s1".replace("110", "1 10"), "2p1 10s1", id="rydberg-with-space"),
    pytest.param("1s1 10s1", "1s1 10s1", id="two-digit-n"),
    pytest.param("5g18 6h22 7i26", "5g18 6h22 7i26", id="high-l"),
    pytest.param("1s2 2s1 2p1", "[He] 2s1 2p1", id="excited-Be"),
    pytest.param("[Og]", "[Rn] 5f14 6d10 7s2 7p6", id="oganesson-core"),
])
def test_canonical_form(text: str, canonical: str) -> None:
    assert str(parse(text)) == canonical


def test_upper_case_is_refused_unless_asked() -> None:
    # Upper-case letters read like term symbols (5D4, 3S1) once case is folded.
    with pytest.raises(ConfspecError) as info:
        parse("1S2 2S2 2P6")
    assert info.value.code == "uppercase-subshell"
    assert str(parse("1S2 2S2 2P6", accept_uppercase=True)) == "[He] 2s2 2p6"
    assert confspec.validate("1S2 2S2 2P6", accept_uppercase=True) == []
    assert confspec.normalize("[AR] 3D6 4S2", accept_uppercase=True) == "[Ar] 3d6 4s2"


@pytest.mark.slow  # a fresh interpreter
def test_the_parser_is_not_built_on_import() -> None:
    import subprocess
    import sys

    code = ("import confspec, sys; "
            "assert 'confspec.notation.grammar' not in sys.modules, 'grammar imported'; "
            "assert 'lark' not in sys.modules, 'lark imported'")
    subprocess.run([sys.executable, "-c", code], check=True)


def test_run_together_ambiguity_names_the_readings() -> None:
    with pytest.raises(ConfspecError) as info:
        parse("1s2 2p110s1")
    err = info.value
    assert err.code == "ambiguous-run-together"
    assert "'2p11 0s' is impossible" in err.message and "'2p1 10s'" in err.message
    assert err.position == 6


def test_a_pauli_typo_in_run_together_text_stays_a_pauli_error() -> None:
    # 2p73s2 is 2p7 3s2 with one electron too many, not 2p1 in a 73s shell.
    with pytest.raises(ConfspecError) as info:
        parse("1s22s22p73s2")
    assert info.value.code == "pauli-limit"
