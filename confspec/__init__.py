"""confspec: typed models and validation for atomic electron configurations.

Text in many notations goes in; one frozen, validated model comes out; formatting, JSON,
chemistry and the data-cleaning adapters are views of that model. Importing the package
builds no parser: the grammar is compiled on first use.
"""

from __future__ import annotations

from ._api import MAX_INPUT_LENGTH, normalize, parse, parse_species, validate
from ._descriptors import descriptor_table, descriptors
from ._errors import (
    ERROR_CODES,
    ConfspecError,
    ConfspecPhysicsError,
    ConfspecSyntaxError,
)
from ._ground import (
    Excitation,
    GroundLevel,
    d_electron_count,
    ground_level,
    ground_state,
    is_ground_state,
)
from ._hydrogenic import radial_density, radial_function, radial_nodes
from ._levels import Level, ParentTerm, parse_level, validate_level
from ._models import (
    CompactConfiguration,
    Configuration,
    ConfigurationRecord,
    Element,
    Species,
    Subshell,
)
from ._shielding import ShieldingResult, effective_charge
from ._terms import JKTerm, Term, allowed_j, hund_ground_term, parse_term, terms
from ._xray import XrayLevel, xray_level, xray_name

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
    "Excitation",
    "GroundLevel",
    "JKTerm",
    "Level",
    "ParentTerm",
    "ShieldingResult",
    "Species",
    "Subshell",
    "Term",
    "XrayLevel",
    "allowed_j",
    "d_electron_count",
    "descriptor_table",
    "descriptors",
    "effective_charge",
    "ground_level",
    "ground_state",
    "hund_ground_term",
    "is_ground_state",
    "normalize",
    "parse",
    "parse_level",
    "parse_species",
    "parse_term",
    "radial_density",
    "radial_function",
    "radial_nodes",
    "terms",
    "validate",
    "validate_level",
    "xray_level",
    "xray_name",
]
