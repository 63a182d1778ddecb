"""Chemistry on the models: ground states and ions (measured, predicted or by rule, with
provenance), LS and jK terms and Hund's rules, shielding (Slater's rules,
Clementi–Raimondi), descriptors, hydrogen-like radial functions and self-consistent-field
(spherically averaged LDA) atoms, whose numerics load numpy and scipy only when one runs.

Importing this package lends the models the ground-state lookup they need for hole
references (see ``confspec.models.provide``).
"""

from __future__ import annotations

from .descriptors import descriptor_table, descriptors
from .ground import (
    Excitation,
    GroundLevel,
    d_electron_count,
    excitations,
    ground_level,
    ground_state,
    is_ground_state,
)
from .hydrogenic import radial_density, radial_function, radial_nodes
from .ionization import IonizationEnergy, published_ionization_energy
from .scf import (
    ConfigurationEnergy,
    ConfigurationRanking,
    SCFConvergenceError,
    SCFDifference,
    SCFOrbital,
    SCFResult,
    delta_scf,
    ionization_energy,
    lowest_configuration,
    scf,
)
from .shielding import ShieldingResult, effective_charge
from .terms import (
    JJLevel,
    JKTerm,
    SeniorityTerm,
    Term,
    allowed_j,
    hund_ground_term,
    jj_levels,
    jj_terms,
    parse_term,
    seniority_terms,
    term_multiplicities,
    terms,
)

__all__ = ["ConfigurationEnergy", "ConfigurationRanking", "Excitation", "GroundLevel",
           "IonizationEnergy", "JJLevel",
           "JKTerm", "SCFConvergenceError", "SCFDifference", "SCFOrbital", "SCFResult",
           "SeniorityTerm", "ShieldingResult",
           "Term", "allowed_j", "d_electron_count", "delta_scf", "descriptor_table",
           "descriptors", "effective_charge", "excitations", "ground_level", "ground_state",
           "hund_ground_term", "ionization_energy", "is_ground_state", "jj_levels", "jj_terms",
           "lowest_configuration", "parse_term", "published_ionization_energy",
           "radial_density", "radial_function",
           "radial_nodes", "scf", "seniority_terms",
           "term_multiplicities", "terms"]
