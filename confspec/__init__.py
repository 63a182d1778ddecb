"""confspec: typed models and validation for atomic electron configurations.

Text in many notations goes in; one frozen, validated model comes out; formatting, JSON,
chemistry and the data-cleaning adapters are views of that model. Importing the package
builds no parser: the grammar is compiled on first use.
"""

from __future__ import annotations

from ._api import MAX_INPUT_LENGTH, normalize, parse, parse_species, validate
from ._errors import (
    ERROR_CODES,
    ConfspecError,
    ConfspecPhysicsError,
    ConfspecSyntaxError,
)
from ._models import (
    CompactConfiguration,
    Configuration,
    ConfigurationRecord,
    Element,
    Species,
    Subshell,
)

__version__ = "0.1.0"

__all__ = [
    "ERROR_CODES",
    "MAX_INPUT_LENGTH",
    "CompactConfiguration",
    "Configuration",
    "ConfigurationRecord",
    "ConfspecError",
    "ConfspecPhysicsError",
    "ConfspecSyntaxError",
    "Element",
    "Species",
    "Subshell",
    "normalize",
    "parse",
    "parse_species",
    "validate",
]
