"""The value model: equality by occupancies, hashing, pydantic integration, JSON."""

from __future__ import annotations

import json

import pytest
from pydantic import BaseModel, ValidationError

from confspec import (
    CompactConfiguration,
    Configuration,
    ConfigurationRecord,
    Species,
    Subshell,
    parse,
)


def test_notation_is_not_value() -> None:
    a, b = parse("[Ar] 3d6 4s2"), parse("1s2 2s2 2p6 3s2 3p6 4s2 3d6")
    assert a == b and hash(a) == hash(b)
    assert len({a, b, parse("[Ar]3d⁶4s²")}) == 1
    assert {a: "iron"}[b] == "iron"


def test_models_are_frozen() -> None:
    config = parse("[Ne] 3s1")
    with pytest.raises(ValidationError):
        config.subshells = ()  # type: ignore[misc]
    with pytest.raises(ValidationError):
        config.subshells[0].electrons = 1  # type: ignore[misc]


def test_subshells_are_in_shell_order_without_zeros() -> None:
    config = parse("4s2 3d6 5p0 1s2 2s2 2p6 3s2 3p6")
    assert [s.label for s in config.subshells] == ["1s", "2s", "2p", "3s", "3p", "3d", "4s"]
    assert config.electron_count == 26
    assert config.occupancy("3d") == 6 and config.occupancy("5p") == 0
    assert repr(config) == "Configuration('[Ar] 3d6 4s2')"
    assert repr(config.subshells[-1]) == "Subshell('4s2')"


def test_subshell_model() -> None:
    sub = Subshell(n=3, l=2, electrons=6)
    assert (sub.label, sub.letter, sub.capacity, sub.is_full, str(sub)) == (
        "3d", "d", 10, False, "3d6")
    assert Subshell.model_validate("4f14").is_full
    with pytest.raises(ValidationError) as info:
        Subshell(n=2, l=2, electrons=1)
    assert info.value.errors()[0]["type"] == "invalid-subshell"
    with pytest.raises(ValidationError) as info:
        Subshell(n=2, l=1, electrons=7)
    assert info.value.errors()[0]["type"] == "pauli-limit"


def test_alternative_constructors_validate() -> None:
    assert Configuration.from_occupancies({"4s": 2, "3d": 6}) == parse("3d6 4s2")
    assert Configuration.from_occupancies([(3, 2, 6), (4, 0, 2)]) == parse("3d6 4s2")
    assert parse("[Ar] 3d6 4s2").replace(**{"4s": 1, "3d": 7}) == parse("[Ar] 3d7 4s1")
    with pytest.raises(ValidationError):
        Configuration.from_occupancies({"2p": 7})
    with pytest.raises(ValidationError) as info:
        Configuration(subshells=(Subshell(n=1, l=0, electrons=1),
                                 Subshell(n=1, l=0, electrons=1)))
    assert info.value.errors()[0]["type"] == "duplicate-subshell"


def test_model_validate_accepts_notation_and_keeps_the_code() -> None:
    expanded = parse("1s2 2s2 2p6 3s2 3p6 3d10 4s2 4p6 4d10")
    assert Configuration.model_validate("[Kr] 4d10") == expanded
    with pytest.raises(ValidationError) as info:
        Configuration.model_validate("3d11")
    assert info.value.errors()[0]["type"] == "pauli-limit"
    assert Configuration.model_validate("") == Configuration()  # the bare nucleus


def test_a_users_model_with_configuration_fields() -> None:
    class Row(BaseModel):
        species: Species
        configuration: Configuration
        compact: CompactConfiguration

    row = Row(species="Fe2+", configuration="[Ar] 3d⁶", compact="[Ar] 3d6")  # type: ignore[arg-type]
    data = json.loads(row.model_dump_json())
    assert data["compact"] == "[Ar] 3d6"
    assert data["configuration"]["subshells"][-1] == {"n": 3, "l": 2, "electrons": 6}
    assert Row.model_validate_json(row.model_dump_json()) == row
    with pytest.raises(ValidationError) as info:
        Row(species="Fe2+", configuration="[Xx] 3d6", compact="3d6")  # type: ignore[arg-type]
    assert info.value.errors()[0]["type"] == "unknown-core"


def test_json_round_trip_and_schema() -> None:
    config = parse("[Xe] 4f7 5d1 6s2")
    assert Configuration.model_validate_json(config.model_dump_json()) == config
    assert Configuration.model_validate_json(config.to_compact_json()) == config
    assert config.to_compact_json() == '"[Xe] 4f7 5d1 6s2"'
    schema = Configuration.model_json_schema()
    assert schema["properties"]["subshells"]["type"] == "array"
    assert "Subshell" in schema["$defs"]


def test_record_checks_the_electron_count() -> None:
    record = ConfigurationRecord(species="Cu+", configuration="[Ar] 3d10")  # type: ignore[arg-type]
    assert str(record) == "Cu+: [Ar] 3d10"
    with pytest.raises(ValidationError) as info:
        ConfigurationRecord(species="Cu", configuration="[Ar] 3d10")  # type: ignore[arg-type]
    assert info.value.errors()[0]["type"] == "electron-count"
    assert ConfigurationRecord.model_validate_json(record.model_dump_json()) == record


def test_species_model_rejects_impossible_charges() -> None:
    with pytest.raises(ValidationError) as info:
        Species.model_validate({"element": "He", "charge": 3})
    assert info.value.errors()[0]["type"] == "impossible-charge"
    with pytest.raises(ValidationError) as info:
        Species.model_validate({"element": "Qq"})
    assert info.value.errors()[0]["type"] == "unknown-element"


def test_chemistry_views_on_the_model() -> None:
    # Parity is that of the sum of l (common practice): 2p1 is odd, 2p2 even.
    assert parse("[He] 2s2 2p1").parity == "odd"
    assert parse("[He] 2s2 2p2").parity == "even"
    # Hund: 3d6 has 4 unpaired electrons, 3d5 4s1 six (common practice, no source).
    assert parse("[Ar] 3d6 4s2").unpaired_electrons == 4
    assert parse("[Ar] 3d5 4s1").unpaired_electrons == 6
    assert [s.label for s in parse("[Ar] 3d5 4s1").open_subshells] == ["3d", "4s"]
