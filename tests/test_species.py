"""Reading species: charges in every notation, and the two Roman-numeral conventions."""

from __future__ import annotations

import pytest

from confspec import ConfspecError, Species, parse_species


@pytest.mark.parametrize(("text", "symbol", "charge"), [
    pytest.param("Fe", "Fe", 0, id="neutral"),
    pytest.param("Fe2+", "Fe", 2, id="number-sign"),
    pytest.param("Fe+2", "Fe", 2, id="sign-number"),
    pytest.param("Fe^{2+}", "Fe", 2, id="caret-braces"),
    pytest.param("Fe^2+", "Fe", 2, id="caret"),
    pytest.param("Fe²⁺", "Fe", 2, id="superscript"),
    pytest.param("Fe<sup>2+</sup>", "Fe", 2, id="html"),
    pytest.param("Fe$^{2+}$", "Fe", 2, id="latex"),
    pytest.param("Fe++", "Fe", 2, id="repeated-signs"),
    pytest.param("Fe 2+", "Fe", 2, id="space"),
    pytest.param("Na+", "Na", 1, id="plus"),
    pytest.param("Na⁺", "Na", 1, id="superscript-plus"),
    pytest.param("O2-", "O", -2, id="anion"),
    pytest.param("O^{2−}", "O", -2, id="unicode-minus"),
    pytest.param("O²⁻", "O", -2, id="superscript-anion"),
    pytest.param("Cl-", "Cl", -1, id="chloride"),
    pytest.param("N3-", "N", -3, id="nitride"),
    # Chemists' oxidation state in parentheses: the charge itself (IUPAC Red Book, common practice).
    pytest.param("Fe(III)", "Fe", 3, id="oxidation-roman"),
    pytest.param("Fe (II)", "Fe", 2, id="oxidation-space"),
    pytest.param("Fe(+3)", "Fe", 3, id="oxidation-number"),
    pytest.param("Fe(3+)", "Fe", 3, id="oxidation-number-sign"),
    pytest.param("Fe(0)", "Fe", 0, id="oxidation-zero"),
    pytest.param("O(-II)", "O", -2, id="oxidation-negative"),
    # Spectroscopists' spectrum label: Fe I is the neutral atom, Fe III is Fe2+ (NIST ASD usage).
    pytest.param("Fe I", "Fe", 0, id="spectrum-I"),
    pytest.param("Fe III", "Fe", 2, id="spectrum-III"),
    pytest.param("FeIII", "Fe", 2, id="spectrum-run-together"),
    pytest.param("C IV", "C", 3, id="spectrum-IV"),
    pytest.param("U XCII", "U", 91, id="spectrum-large"),
    pytest.param("I", "I", 0, id="iodine"),
    pytest.param("I II", "I", 1, id="iodine-spectrum"),
    pytest.param("Og", "Og", 0, id="oganesson"),
    pytest.param(" H+ ", "H", 1, id="outer-space"),
])
def test_species_spellings(text: str, symbol: str, charge: int) -> None:
    species = parse_species(text)
    assert (species.symbol, species.charge) == (symbol, charge)
    assert species.electron_count == species.Z - charge >= 0


@pytest.mark.parametrize(("text", "code"), [
    pytest.param("He3+", "impossible-charge", id="too-many-removed"),
    pytest.param("H2+", "impossible-charge", id="hydrogen-2+"),
    pytest.param("C5-", "impossible-charge", id="anion-beyond-limit"),
    pytest.param("Xx", "unknown-element", id="unknown"),
    pytest.param("FE", "unknown-element", id="mis-cased"),
    pytest.param("fe2+", "unknown-element", id="lower-case"),
    pytest.param("Fe(IIII)", "syntax", id="bad-roman"),
    pytest.param("Fe+-", "syntax", id="mixed-signs"),
    pytest.param("Fe2", "syntax", id="number-without-sign"),
    pytest.param("", "empty", id="empty"),
    pytest.param("Fe 3d6", "syntax", id="configuration-not-species"),
])
def test_species_errors(text: str, code: str) -> None:
    with pytest.raises(ConfspecError) as info:
        parse_species(text)
    assert info.value.code == code


@pytest.mark.parametrize(("style", "text"), [
    ("plain", "Fe2+"), ("unicode", "Fe²⁺"), ("latex", "Fe^{2+}"), ("html", "Fe<sup>2+</sup>"),
    ("spectrum", "Fe III"), ("oxidation", "Fe(II)"),
])
def test_species_styles_round_trip(style: str, text: str) -> None:
    species = parse_species("Fe2+")
    assert species.format(style) == text
    assert parse_species(text) == species


def test_species_model_accepts_text_and_parts() -> None:
    assert Species.model_validate("Cu+") == Species.model_validate(
        {"element": "Cu", "charge": 1}) == Species.model_validate({"element": 29, "charge": 1})
    oxide = parse_species("O2-")
    assert Species.model_validate_json(oxide.model_dump_json()) == oxide
    assert str(parse_species("Cl-")) == "Cl-" and repr(parse_species("Cl-")) == "Species('Cl-')"
