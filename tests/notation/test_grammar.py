"""The grammar file itself: LALR without conflicts or terminal collisions, loaded lazily."""

from __future__ import annotations

import pytest
from lark import Lark

from confspec.notation.grammar import grammar_text


@pytest.mark.parametrize("start", ["configuration", "species"])
def test_grammar_is_conflict_free_in_strict_mode(start: str) -> None:
    pytest.importorskip("interegular")  # lark's strict mode checks regex collisions with it
    Lark(grammar_text(), parser="lalr", lexer="contextual", start=start, strict=True)
