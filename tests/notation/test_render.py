"""Writing configurations: styles, cores, orders, and the one formatting entry point."""

from __future__ import annotations

import pytest

import confspec
from confspec import ConfspecError, normalize, parse

IRON = parse("[Ar] 3d6 4s2")


@pytest.mark.parametrize(("options", "text"), [
    pytest.param({}, "[Ar] 3d6 4s2", id="default"),
    pytest.param({"style": "caret"}, "[Ar] 3d^6 4s^2", id="caret"),
    pytest.param({"style": "unicode"}, "[Ar] 3d⁶ 4s²", id="unicode"),
    pytest.param({"style": "latex"}, r"[\mathrm{Ar}]\,3d^{6}\,4s^{2}", id="latex"),
    pytest.param({"style": "html"}, "[Ar] 3d<sup>6</sup> 4s<sup>2</sup>", id="html"),
    pytest.param({"style": "nist-asd", "core": "expand"}, "1s2.2s2.2p6.3s2.3p6.3d6.4s2",
                 id="nist-asd"),
    pytest.param({"core": "expand"}, "1s2 2s2 2p6 3s2 3p6 3d6 4s2", id="expand"),
    pytest.param({"order": "filling"}, "[Ar] 4s2 3d6", id="filling"),
    pytest.param({"core": "expand", "order": "filling"}, "1s2 2s2 2p6 3s2 3p6 4s2 3d6",
                 id="expand-filling"),
])
def test_styles(options: dict[str, str], text: str) -> None:
    assert IRON.format(**options) == text
    assert parse(text) == IRON


def test_format_spec_shares_the_entry_point() -> None:
    assert f"{IRON}" == str(IRON) == "[Ar] 3d6 4s2"
    assert f"{IRON:unicode}" == "[Ar] 3d⁶ 4s²"
    assert f"{IRON:caret,expand,filling}" == IRON.format("caret", "expand", "filling")


@pytest.mark.parametrize("options", [
    {"style": "fancy"}, {"core": "shrink"}, {"order": "alphabetical"}])
def test_unknown_options_are_refused(options: dict[str, str]) -> None:
    with pytest.raises(ConfspecError) as info:
        IRON.format(**options)
    assert info.value.code == "unknown-option"
    with pytest.raises(ConfspecError):
        format(IRON, "sparkly")


@pytest.mark.parametrize(("text", "canonical"), [
    # Canonical plain: one space, core first, occupancy always written, zeros dropped; the
    # largest core that leaves a subshell written, so a closed shell is not its own core (as
    # published tables write the noble gases: NIST ASD ground levels, from memory)
    ("1s2 2s2 2p6", "[He] 2s2 2p6"),
    ("[Ne]", "[He] 2s2 2p6"),
    ("1s2", "1s2"),
    ("[Ar]", "[Ne] 3s2 3p6"),
    ("1s1", "1s1"),
    ("1s2 2s1 2p6", "[He] 2s1 2p6"),  # an excited state keeps the core that is full
    ("1s1 2s2 2p6 3s1", "1s1 2s2 2p6 3s1"),  # a 1s hole: no core is full
    ("[Xe] 4f14 5d10 6s2 6p6", "[Xe] 4f14 5d10 6s2 6p6"),
    ("[Kr] 4d10 5s2 5p6 4f14 5d10 6s2 6p6 5f14 6d10 7s2 7p6", "[Rn] 5f14 6d10 7s2 7p6"),
    ("[Og] 8s1", "[Og] 8s1"),
])
def test_condensed_core_is_the_largest_full_one(text: str, canonical: str) -> None:
    assert normalize(text) == canonical
    assert normalize(canonical) == canonical


@pytest.mark.parametrize("style", ["plain", "caret", "unicode", "latex", "html", "nist-asd"])
@pytest.mark.parametrize("text", ["1s2", "[Ne]", "[Ar]", "[Kr]", "[Xe]", "[Rn]", "[Og]"])
def test_no_style_writes_a_configuration_as_a_bare_core(text: str, style: str) -> None:
    written = confspec.parse(text).format(style=style)
    assert written.count("[") <= 1 and not written.rstrip().endswith("]"), written
    assert "He]" not in written or text != "1s2"
    assert confspec.parse(written) == confspec.parse(text)


def test_the_empty_configuration_writes_1s0_which_reads_back() -> None:
    from confspec import Configuration

    empty = Configuration()
    assert str(empty) == "1s0" and empty.electron_count == 0
    assert confspec.parse(str(empty)) == empty == confspec.ground_state("H+")
    assert empty.format("unicode") == "1s⁰" and confspec.parse(empty.format("latex")) == empty


def test_notebook_hooks() -> None:
    assert IRON.format(style="html") in IRON._repr_html_()
    assert IRON._repr_latex_() == "$" + IRON.format(style="latex") + "$"
