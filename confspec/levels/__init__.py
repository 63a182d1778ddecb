"""Level designations: a configuration with its parents, term, J, species and ordering
letter, read from the spellings level tables use and checked for consistency."""

from __future__ import annotations

from .designations import Level, ParentTerm, parse_level, validate_level

__all__ = ["Level", "ParentTerm", "parse_level", "validate_level"]
