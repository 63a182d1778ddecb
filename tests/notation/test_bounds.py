"""Bounds on the work one input can cause: the length cap, numbers that drive work, linear
time on adversarial text, and the round trips that a fuzzing sweep found broken.

The growth checks compare the time of the same adversarial pattern at 1k and 4k
characters (min of several runs, so a busy machine slows both alike): linear code takes
about 4× as long, quadratic 16×, backtracking far more. The ratio bound is generous; it is
a property of the code, not a wall-clock limit.
"""

from __future__ import annotations

import contextlib
import time
from collections.abc import Callable

import pytest

import confspec
from confspec import MAX_INPUT_LENGTH, ConfspecError


def _code(call: Callable[[], object]) -> str:
    with pytest.raises(ConfspecError) as info:
        call()
    return info.value.code


# -- inputs a reliability sweep found (each raised a bare ValueError or hung) ----------
@pytest.mark.parametrize(("call", "code"), [
    pytest.param(lambda: confspec.xray_level("L²"), "unknown-xray-level", id="xray-superscript"),
    pytest.param(lambda: confspec.xray_level("M⁰"), "unknown-xray-level", id="xray-sup-zero"),
    pytest.param(lambda: confspec.xray_level("L" + "1" * 4301), "too-long", id="xray-4301-digits"),
    pytest.param(lambda: confspec.parse_term("2[1⁸/2]"), "term-syntax", id="jk-superscript-K"),
    pytest.param(lambda: confspec.parse_term("2[¹/2]°2"), "term-syntax", id="jk-superscript-1"),
    pytest.param(lambda: confspec.parse_term("9999999[9999993/2]°2"), "number-too-large",
                 id="jk-huge-numbers"),
    pytest.param(lambda: confspec.parse_term("0000"), "number-too-large", id="term-0000"),
    pytest.param(lambda: confspec.parse("4s1 9999999999d6"), "number-too-large", id="huge-n"),
    pytest.param(lambda: confspec.radial_nodes("999991s"), "invalid-subshell", id="nodes-huge-n"),
    pytest.param(lambda: confspec.radial_nodes("101s"), "number-too-large", id="nodes-n-101"),
    pytest.param(lambda: confspec.radial_function("1s", -1.0), "out-of-range", id="negative-r"),
    pytest.param(lambda: confspec.radial_density("1s", 1.0, Z=0.0), "out-of-range", id="zero-Z"),
    pytest.param(lambda: confspec.effective_charge("Fe", "3" * 5000 + "d"), "too-long",
                 id="subshell-label-too-long"),
    pytest.param(lambda: confspec.parse_level("3d6(5D9)4s 6D9/2"), "j-not-allowed",
                 id="parent-J-outside-its-term"),
])
def test_found_inputs_get_our_error(call: Callable[[], object], code: str) -> None:
    assert _code(call) == code


def test_the_largest_n_still_reads() -> None:
    assert confspec.parse("1s2 999s1").electron_count == 3
    assert len(confspec.radial_nodes("100s")) == 99  # n − l − 1 nodes


# -- the empty configuration and levels with parents read back ---------------------------
def test_an_all_zero_configuration_has_a_spelling_that_reads_back() -> None:
    empty = confspec.parse("2s0")
    assert empty.electron_count == 0 and str(empty) == "1s0"
    assert confspec.parse(str(empty)) == empty
    assert confspec.validate(str(empty), strict=True) == []


@pytest.mark.parametrize("text", [
    "5d6(5D)4s 6D9/2",  # the ungrouped 4s lies below the group: it must not join it
    "3d6(5D)4s 6D9/2",
    "1s2 2s2 2p6 3s2 3p6 3d6(5D) 4s 6D9/2",
    "[Ar] 3d6(5D)4s 6D9/2",
    "3d7(4F)4s4p(3P°) z6G°13/2",
    "3d6(5D4)4s 6D9/2",
    "[Xe] 4f7(8S°)5d 6s2 9D°2",
])
def test_levels_with_parents_keep_every_parents_scope(text: str) -> None:
    level = confspec.parse_level(text)
    for style in ("plain", "unicode", "latex", "html"):
        assert confspec.parse_level(level.format(style)) == level, style
    assert type(level).model_validate_json(level.model_dump_json()) == level


# -- linear time -----------------------------------------------------------------------
def _best(call: Callable[[str], object], text: str, repeats: int = 5) -> float:
    best = float("inf")
    for _ in range(repeats):
        start = time.perf_counter()
        with contextlib.suppress(ConfspecError):
            call(text)
        best = min(best, time.perf_counter() - start)
    return best


FAMILIES: list[tuple[str, Callable[[str], object], str, str]] = [
    ("footnote marks then a letter", confspec.parse, "&1s2", "*"),
    ("spaced marks", confspec.parse, "1s2", " *"),
    ("notes in parentheses", confspec.parse, "1s2", " (a)"),
    ("run-together digits", confspec.parse, "1s", "2"),
    ("repeated parents", confspec.parse_level, "3d6", "(5D)4s"),
    ("repeated parent groups", confspec.parse_level, "", "3d6(5D)"),
    ("term digits", confspec.parse_term, "2", "[3/2]"),
    ("species noise", confspec.parse_species, "Fe", "+"),
    ("x-ray digits", confspec.xray_level, "L", "1"),
]


@pytest.mark.parametrize(("name", "call", "head", "unit"), FAMILIES,
                         ids=[f[0] for f in FAMILIES])
def test_work_grows_linearly_with_the_input(name: str, call: Callable[[str], object],
                                            head: str, unit: str) -> None:
    def text(length: int) -> str:
        return head + unit * ((length - len(head) - 1) // len(unit)) + "a"

    _best(call, text(64), repeats=1)  # warm the parser and caches
    small, large = text(1024), text(MAX_INPUT_LENGTH)
    ratio = _best(call, large) / max(_best(call, small), 1e-6)
    # 4× the length: linear is about 4×, quadratic 16×; allow noise up to 10×
    assert ratio < 10, f"{name}: 4× longer input took {ratio:.1f}× as long"


def test_every_text_function_refuses_text_over_the_cap_first() -> None:
    too_long = "1s2 " * (MAX_INPUT_LENGTH // 4 + 1)
    for call in (confspec.parse, confspec.normalize, confspec.parse_species,
                 confspec.parse_term, confspec.parse_level, confspec.xray_level,
                 confspec.xray_name):
        assert _code(lambda call=call: call(too_long)) == "too-long", call  # type: ignore[misc]
    assert [e.code for e in confspec.validate(too_long)] == ["too-long"]
    assert [e.code for e in confspec.validate_level(too_long)] == ["too-long"]


def test_a_level_with_unwritten_inner_shells_is_written_without_a_core() -> None:
    # found by the fuzz driver: the canonical text of 'Ar 3d6 4s21s2;2s2' gained a [He]
    # core, and a written core turns off the unwritten-inner-shell reading
    level = confspec.parse_level("Ar 3d6 4s21s2;2s2")
    assert str(level) == "Ar I 1s2 2s2 3d6 4s2"
    assert confspec.parse_level(str(level)) == level
