"""Round trips: format -> parse, normalize idempotence, JSON, messy spellings."""

from __future__ import annotations

from hypothesis import given
from hypothesis import strategies as st

from confspec import Configuration, normalize, parse, validate

from .strategies import (
    configurations,
    format_options,
    ground_like,
    relativistic_configurations,
    spellings,
)


@given(configurations(), format_options)
def test_every_style_core_and_order_parses_back(config: Configuration,
                                                options: dict[str, str]) -> None:
    assert parse(config.format(**options)) == config


@given(ground_like(), format_options)
def test_atom_shaped_configurations_round_trip(config: Configuration,
                                              options: dict[str, str]) -> None:
    assert parse(config.format(**options)) == config


@given(configurations(), format_options)
def test_normalize_is_idempotent(config: Configuration, options: dict[str, str]) -> None:
    once = normalize(config.format(**options))
    assert normalize(once) == once == str(config)
    assert validate(once, strict=True) == []


@given(configurations())
def test_json_round_trip_is_lossless(config: Configuration) -> None:
    assert Configuration.model_validate_json(config.model_dump_json()) == config
    assert Configuration.model_validate_json(config.to_compact_json()) == config
    assert Configuration.model_validate(config.model_dump()) == config


@given(spellings())
def test_messy_spellings_parse_to_their_value(case: tuple[str, Configuration]) -> None:
    text, config = case
    assert parse(text) == config, text


@given(configurations(), st.sampled_from(["", " ", "\t", "\u00a0"]))
def test_outer_whitespace_is_notation(config: Configuration, pad: str) -> None:
    assert parse(pad + str(config) + pad) == config


@given(relativistic_configurations(), format_options, st.booleans())
def test_relativistic_configurations_round_trip(config: Configuration, options: dict[str, str],
                                                split_j: bool) -> None:
    assert parse(config.format(**options, split_j=split_j)) == config
    assert Configuration.model_validate_json(config.model_dump_json()) == config
