"""confspec: typed models and validation for atomic electron configurations.

Text in many notations goes in; one frozen, validated model comes out; formatting, JSON,
chemistry and the data-cleaning adapters are views of that model. Importing the package
builds no parser: the grammar is compiled on first use.

The rooms: :mod:`confspec.notation` reads and writes text, :mod:`confspec.models` holds the
values, :mod:`confspec.reading` turns text into models, :mod:`confspec.chemistry` computes,
:mod:`confspec.levels` reads level designations, :mod:`confspec.diagrams` draws,
:mod:`confspec.cleaning` runs the row job behind the CLI, SQL and dataframe adapters.
"""

from __future__ import annotations

from . import diagrams as _diagrams  # noqa: F401  (lends the models their pictures)
from .chemistry import (
    ConfigurationEnergy,
    ConfigurationRanking,
    Excitation,
    GroundLevel,
    IonizationEnergy,
    JJLevel,
    JKTerm,
    SCFConvergenceError,
    SCFDifference,
    SCFOrbital,
    SCFResult,
    SeniorityTerm,
    ShieldingResult,
    Term,
    allowed_j,
    d_electron_count,
    delta_scf,
    descriptor_table,
    descriptors,
    effective_charge,
    excitations,
    ground_level,
    ground_state,
    hund_ground_term,
    ionization_energy,
    is_ground_state,
    jj_levels,
    jj_terms,
    lowest_configuration,
    parse_term,
    published_ionization_energy,
    radial_density,
    radial_function,
    radial_nodes,
    scf,
    seniority_terms,
    term_multiplicities,
    terms,
)
from .errors import (
    ERROR_CODES,
    ConfspecError,
    ConfspecPhysicsError,
    ConfspecSyntaxError,
    ConfspecTypeError,
)
from .levels import Level, ParentTerm, parse_level, validate_level
from .models import (
    CompactConfiguration,
    Configuration,
    ConfigurationRecord,
    Element,
    Species,
    Subshell,
)
from .notation import XrayLevel, xray_level, xray_name
from .reading import MAX_INPUT_LENGTH, normalize, parse, parse_species, validate

__version__ = "0.1.0"

__all__ = [
    "ERROR_CODES",
    "MAX_INPUT_LENGTH",
    "CompactConfiguration",
    "Configuration",
    "ConfigurationEnergy",
    "ConfigurationRanking",
    "ConfigurationRecord",
    "ConfspecError",
    "ConfspecPhysicsError",
    "ConfspecSyntaxError",
    "ConfspecTypeError",
    "Element",
    "Excitation",
    "GroundLevel",
    "IonizationEnergy",
    "JJLevel",
    "JKTerm",
    "Level",
    "ParentTerm",
    "SCFConvergenceError",
    "SCFDifference",
    "SCFOrbital",
    "SCFResult",
    "SeniorityTerm",
    "ShieldingResult",
    "Species",
    "Subshell",
    "Term",
    "XrayLevel",
    "allowed_j",
    "d_electron_count",
    "delta_scf",
    "descriptor_table",
    "descriptors",
    "effective_charge",
    "excitations",
    "ground_level",
    "ground_state",
    "hund_ground_term",
    "ionization_energy",
    "is_ground_state",
    "jj_levels",
    "jj_terms",
    "lowest_configuration",
    "normalize",
    "parse",
    "parse_level",
    "parse_species",
    "parse_term",
    "published_ionization_energy",
    "radial_density",
    "radial_function",
    "radial_nodes",
    "scf",
    "seniority_terms",
    "term_multiplicities",
    "terms",
    "validate",
    "validate_level",
    "xray_level",
    "xray_name",
]


def __dir__() -> list[str]:
    return sorted(__all__)
