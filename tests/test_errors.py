"""Errors: stable codes, positions, caret rendering, and the malformed-input corpus."""

from __future__ import annotations

import pickle
import re
from pathlib import Path

import pytest

import confspec
from confspec import ERROR_CODES, ConfspecError, parse, validate

CORPUS = Path(__file__).parent / "corpus" / "malformed.tsv"


def _decode(text: str) -> str:
    text = text.replace("\\t", "\t").replace("\\n", "\n").replace("\\r", "\r")
    text = re.sub(r"\\u([0-9a-fA-F]{4})", lambda m: chr(int(m.group(1), 16)), text)
    return "1s2 " * 1100 if text == "@LONG@" else text


def _corpus() -> list[pytest.ParameterSet]:
    rows = []
    for number, line in enumerate(CORPUS.read_text(encoding="utf-8").splitlines(), 1):
        if not line or line.startswith("#"):
            continue
        code, _, text = line.partition("\t")
        rows.append(pytest.param(code, _decode(text), id=f"line{number}-{code}"))
    return rows


CORPUS_ROWS = _corpus()


#: Codes a configuration string alone can trigger; the corpus must reach each of them.
CONFIGURATION_CODES = {
    "empty", "too-long", "syntax", "mojibake", "uppercase-subshell", "ambiguous-run-together",
    "ambiguous-hole", "misplaced-core", "invalid-subshell", "pauli-limit", "duplicate-subshell",
    "unknown-core", "core-overlap", "hole-without-reference", "hole-exceeds"}


def test_the_corpus_is_large_and_covers_the_notation_codes() -> None:
    assert len(CORPUS_ROWS) >= 200
    assert {row.values[0] for row in CORPUS_ROWS} == CONFIGURATION_CODES
    assert set(ERROR_CODES) >= CONFIGURATION_CODES


@pytest.mark.parametrize(("code", "text"), CORPUS_ROWS)
def test_malformed_input_gets_its_code(code: str, text: str) -> None:
    with pytest.raises(ConfspecError) as info:
        parse(text)
    err = info.value
    assert err.code == code, err.render()
    assert err.code in ERROR_CODES
    if err.position is not None:
        assert 0 <= err.position <= len(text)
    problems = validate(text)
    assert problems and problems[0].code == code


@pytest.mark.parametrize(("text", "rendered"), [
    pytest.param("1s2 2s2 2p7", "2p holds at most 6 electrons, not 7 [pauli-limit]\n"
                 "    1s2 2s2 2p7\n"
                 "              ^", id="pauli"),
    pytest.param("[Ar] 3p6 4s1", "[Ar] already fills 3p; drop it, or write a change as a hole "
                 "such as 3p^-1 [core-overlap]\n"
                 "    [Ar] 3p6 4s1\n"
                 "         ^", id="core-overlap"),
    pytest.param("1s2 2s2 2p6 3s", None, id="valid"),
    pytest.param("1s2 2s2 %", "unexpected character '%'; expected '-', a number, a parent "
                 "term such as (5D), a separator or an X-ray level such as L3 [syntax]\n"
                 "    1s2 2s2 %\n"
                 "            ^", id="syntax"),
    pytest.param("1s2 2s^", "the configuration ends too early; expected '$', '(', "
                 "'{', a number or a separator... [syntax]", id="ends-early"),
    pytest.param("1s²2s²2p⁷", "2p holds at most 6 electrons, not 7 [pauli-limit]\n"
                 "    1s²2s²2p⁷\n"
                 "            ^", id="superscript-position"),
])
def test_caret_rendering(text: str, rendered: str | None) -> None:
    problems = validate(text)
    if rendered is None:
        assert problems == []
        return
    if rendered.endswith("... [syntax]"):
        assert problems[0].code == "syntax" and problems[0].position == len(text)
        return
    assert str(problems[0]) == rendered


def test_an_early_end_points_after_the_last_character() -> None:
    with pytest.raises(ConfspecError) as info:
        parse("1s2 2s^")
    assert info.value.position == len("1s2 2s^")
    assert "$END" not in info.value.message and "NUM" not in info.value.message


def test_validate_collects_every_physics_problem() -> None:
    problems = validate("1s3 2d1 2p7 2p1 [Ar]")
    assert [p.code for p in problems] == ["misplaced-core"]  # notation stops first
    problems = validate("1s3 2d1 2p7 3p1 3p1")
    assert [p.code for p in problems] == [
        "pauli-limit", "invalid-subshell", "pauli-limit", "duplicate-subshell"]
    assert [p.position for p in problems] == [2, 4, 10, 16]


def test_electron_count_against_the_species() -> None:
    # Fe: Z = 26 (IUPAC); Fe2+ holds 24 electrons.
    assert validate("[Ar] 3d6", species="Fe2+") == []
    (problem,) = validate("[Ar] 3d6 4s2", species="Fe2+")
    assert problem.code == "electron-count"
    assert "26" in problem.message and "24" in problem.message
    assert [p.code for p in validate("[Ar] 3d6", species="He3+")] == ["impossible-charge"]


def test_strict_mode_holds_a_column_to_one_spelling() -> None:
    assert validate("[Ar] 3d6 4s2", strict=True) == []
    (problem,) = validate("4s2 3d6", strict=True)
    assert problem.code == "non-canonical" and "'3d6 4s2'" in problem.message


def test_errors_are_value_errors_and_pickle() -> None:
    with pytest.raises(ValueError):
        parse("2p7")
    err = validate("2p7")[0]
    clone = pickle.loads(pickle.dumps(err))
    assert (clone.code, clone.position, clone.text, str(clone)) == (
        err.code, err.position, err.text, str(err))
    assert isinstance(err, confspec.ConfspecPhysicsError)
    assert isinstance(validate("2p-1")[0], confspec.ConfspecSyntaxError)


def test_every_code_has_trigger_and_fix_text() -> None:
    for code, row in ERROR_CODES.items():
        assert re.fullmatch(r"[a-z]+(-[a-z]+)*", code)
        assert row.trigger and row.fix and row.kind in {"syntax", "physics"}


def test_non_str_input_is_a_type_error() -> None:
    with pytest.raises(TypeError):
        parse(None)  # type: ignore[arg-type]
