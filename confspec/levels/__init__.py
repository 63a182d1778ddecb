"""Level designations: a configuration with its parents, term, J, species and ordering
letter, read from the spellings level tables use and checked for consistency."""

from __future__ import annotations

from .designations import (
    PARITY_CONVENTIONS,
    Level,
    ParentTerm,
    has_odd_mark,
    mark_parity,
    parse_level,
    read_level,
    validate_level,
)

__all__ = ["PARITY_CONVENTIONS", "Level", "ParentTerm", "has_odd_mark", "mark_parity",
           "parse_level", "read_level", "validate_level"]
