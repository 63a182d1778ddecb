"""Self-consistent-field (SCF) atoms: total energies, orbital energies and radii computed for
any configuration of any atom or ion, by a radial Kohn–Sham solver in the local-density
approximation (LDA).

Everything here is **computed, not measured**, and is an approximation: the atom is
spherically averaged (each open subshell fractionally and evenly occupied), spin-unpolarised
and non-relativistic, with Slater/Dirac exchange and Vosko–Wilk–Nusair correlation (VWN5),
as in the NIST atomic reference data for electronic-structure calculations (Kotochigova,
Levine, Shirley, Stiles & Clark, Phys. Rev. A 55, 191 (1997)). Results carry
``provenance="computed"`` and a ``caution``; they are not multiplet, spin-polarised or
relativistic energies, and close configurations can come out in the wrong order (Fe: LDA
puts 3d7 4s1 below the measured ground configuration 3d6 4s2). The method is that of
Kohn & Sham, Phys. Rev. 140, A1133 (1965); the numerics are in :mod:`.kohn_sham`.

Relativistic (nlj) subshells are summed into their nl subshell before the calculation
(the spherical average does not see j). Energies are in hartree unless a name says eV;
1 hartree = 27.211386245988 eV (CODATA 2018). Lengths are in bohr.

This module imports numpy and scipy only when a calculation runs (install the ``scf``
extra); without them, :func:`scf` raises a ``scf-unavailable`` error.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from typing import TYPE_CHECKING, Any, Literal

from pydantic import BaseModel, ConfigDict, Field

from ..errors import ConfspecPhysicsError, ConfspecSyntaxError
from ..models import Configuration, Element, Species
from ..physics import subshell_label
from ..reading import as_configuration, as_species, parse, parse_species
from .ground import ground_state

if TYPE_CHECKING:  # the numerics are imported only when a calculation runs
    from .kohn_sham import AtomResult

__all__ = [
    "HARTREE_EV",
    "SCF_METHOD",
    "ConfigurationEnergy",
    "ConfigurationRanking",
    "SCFConvergenceError",
    "SCFDifference",
    "SCFOrbital",
    "SCFResult",
    "delta_scf",
    "ionization_energy",
    "lowest_configuration",
    "scf",
]

#: The hartree energy in eV: CODATA 2018 recommended value 27.211 386 245 988(53) eV
#: (Tiesinga, Mohr, Newell & Taylor, Rev. Mod. Phys. 93, 025010 (2021)).
HARTREE_EV = 27.211386245988

#: What every result of this module is, in words.
SCF_METHOD = ("spherically averaged, spin-unpolarised, non-relativistic Kohn–Sham LDA "
              "(Slater exchange + VWN5 correlation)")

_CAUTION = ("computed, not measured: an approximation (spherically averaged LDA). Open "
            "subshells are averaged and spin-unpolarised, and relativity is left out, so "
            "these are not multiplet or spin-polarised energies; orbital energies are "
            "Kohn–Sham eigenvalues (for outer electrons much shallower than ionization "
            "energies), and close configurations can come out in the wrong order (Fe: "
            "3d7 4s1 below the measured 3d6 4s2)")
_HEAVY = ("; for Z ≥ 37 the missing relativistic effects are large (inner orbitals, 6s and "
          "5d especially)")
_NLJ = "; nlj subshells were summed into nl (the spherical average does not see j)"

#: Default options of :func:`scf`, with the range each must lie in.
_OPTIONS: dict[str, tuple[float, float, bool]] = {
    # name: (lowest, highest, integer)
    "energy_tolerance": (1e-12, 1e-3, False),
    "density_tolerance": (1e-10, 1e-2, False),
    "max_iterations": (1, 10_000, True),
    "mixing": (0.01, 1.0, False),
    "history": (1, 50, True),
    "grid_step": (0.001, 0.05, False),
    "r_max": (5.0, 2000.0, False),
}

SpeciesLike = Species | Element | str | int


class SCFConvergenceError(ConfspecPhysicsError):
    """The self-consistent field did not converge (code ``scf-not-converged``).

    Raised for an iteration limit reached, an occupied orbital that is not bound (LDA does
    not bind the extra electron of most anions: H⁻, O²⁻), an orbital too diffuse for the
    grid, or a numerical breakdown; never a silent wrong answer. ``residual`` is the last
    density residual ∫|n_out − n_in| dr in electrons (``inf`` if none was reached),
    ``iterations`` the iterations done, ``reason`` what went wrong.
    """

    def __init__(self, code: str, message: str, *, position: int | None = None,
                 text: str | None = None, residual: float = math.inf, iterations: int = 0,
                 reason: str = "") -> None:
        super().__init__(code, message, position=position, text=text)
        self.residual = residual
        self.iterations = iterations
        self.reason = reason

    def __reduce__(self) -> tuple[object, ...]:
        return (_rebuild_convergence, (self.code, self.message, self.text, self.residual,
                                       self.iterations, self.reason))


def _rebuild_convergence(code: str, message: str, text: str | None, residual: float,
                         iterations: int, reason: str) -> SCFConvergenceError:
    return SCFConvergenceError(code, message, text=text, residual=residual,
                               iterations=iterations, reason=reason)


# ---------------------------------------------------------------------------- results
class SCFOrbital(BaseModel):
    """One occupied (nl) orbital of a converged SCF atom. Computed, not measured.

    ``energy_hartree`` / ``energy_ev`` is the Kohn–Sham eigenvalue (not an ionization
    energy: LDA eigenvalues of outer electrons are roughly half the measured ones).
    ``mean_radius_bohr`` is ⟨r⟩, ``mean_square_radius_bohr2`` ⟨r²⟩, ``outer_maximum_bohr``
    the radius of the outermost maximum of P(r)² (bohr).

    ``effective_charge`` is defined from ⟨r⟩ through the hydrogen-like relation
    ⟨r⟩ = [3n² − l(l+1)] / (2 Z_eff): Z_eff = [3n² − l(l+1)] / (2⟨r⟩), the charge of the
    hydrogen-like ion whose nl orbital has the same mean radius. (The eigenvalue relation
    ε = −Z_eff²/(2n²) is not used: LDA eigenvalues are too shallow, by the self-interaction
    error, and would give much too small charges.)

    ``radial`` is P(r) = r·R(r) on the radii of :attr:`SCFResult.radii` (∫P² dr = 1, positive
    at its largest lobe). It is left out of ``model_dump()`` and JSON (thousands of numbers);
    read it from the attribute.
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    label: str
    n: int
    l: int
    occupancy: int
    energy_hartree: float
    energy_ev: float
    mean_radius_bohr: float
    mean_square_radius_bohr2: float
    outer_maximum_bohr: float
    effective_charge: float
    radial: tuple[float, ...] = Field(default=(), exclude=True, repr=False)

    def __str__(self) -> str:
        return (f"{self.label}{self.occupancy}: ε = {self.energy_hartree:.6f} hartree "
                f"({self.energy_ev:.3f} eV), ⟨r⟩ = {self.mean_radius_bohr:.4f} bohr")


class SCFResult(BaseModel):
    """A converged spherically averaged LDA atom or ion (computed, an approximation).

    Energies in hartree: ``total_energy = kinetic_energy + hartree_energy +
    electron_nucleus_energy + exchange_correlation_energy`` (the classical electron–electron
    repulsion is ``hartree_energy``).

    ``virial_ratio`` is −V/T with V the whole potential energy. The virial theorem gives 2
    for the exact atom and for Hartree–Fock, but LDA *with correlation* does not give
    exactly 2: the correlation energy is not homogeneous under uniform scaling of the
    density (exchange is, of degree one), so −V/T differs from 2 by about 1e-3 (Mg:
    2.00301 from the NIST parts). ``scaling_virial_ratio`` replaces E_xc in V by its
    uniform-scaling derivative 3∫n(v_xc − ε_xc) dr, for which the theorem holds exactly
    at self-consistency; its distance from 2 (≲ 1e-8 here) measures the numerical error.
    Both are None for a bare nucleus.

    ``orbitals`` maps each occupied subshell label (``"3d"``) to an :class:`SCFOrbital`.
    ``iterations``, ``residual`` (∫|n_out − n_in| dr, electrons) and ``energy_change``
    (hartree, last iteration) describe the convergence reached against
    ``energy_tolerance`` and ``density_tolerance``. ``radii`` (bohr, the logarithmic grid)
    and ``density`` (radial electron density n(r) = 4πr²ρ(r), electrons per bohr) are left
    out of ``model_dump()`` and JSON. ``provenance`` is always ``"computed"``.
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    species: Species
    configuration: Configuration
    total_energy: float
    kinetic_energy: float
    hartree_energy: float
    electron_nucleus_energy: float
    exchange_correlation_energy: float
    virial_ratio: float | None
    scaling_virial_ratio: float | None
    orbitals: dict[str, SCFOrbital]
    iterations: int
    residual: float
    energy_change: float
    energy_tolerance: float
    density_tolerance: float
    grid_step: float
    method: str = SCF_METHOD
    provenance: Literal["computed"] = "computed"
    caution: str = _CAUTION
    radii: tuple[float, ...] = Field(default=(), exclude=True, repr=False)
    density: tuple[float, ...] = Field(default=(), exclude=True, repr=False)

    @property
    def total_energy_ev(self) -> float:
        """The total energy in eV (CODATA 2018 hartree)."""
        return self.total_energy * HARTREE_EV

    @property
    def provenance_text(self) -> str:
        """``computed (spherically averaged LDA)``: how the CLI and the docs label it."""
        return "computed (spherically averaged LDA)"

    def orbital(self, subshell: str) -> SCFOrbital:
        """The orbital of one subshell label; a ``empty-subshell`` error if it is empty."""
        found = self.orbitals.get(subshell)
        if found is None:
            raise ConfspecPhysicsError(
                "empty-subshell", f"{subshell} holds no electron in {self.configuration}",
                text=subshell)
        return found

    def __str__(self) -> str:
        return (f"{self.species} {str(self.configuration) or '(no electrons)'}: "
                f"E = {self.total_energy:.6f} hartree ({self.provenance_text})")


class SCFDifference(BaseModel):
    """A ΔSCF energy: ``final`` total energy minus ``initial`` (computed, an approximation).

    For an ionization (X → X⁺) it is the ΔSCF ionization energy; between two configurations
    of one species, an excitation energy of spherically averaged configurations (not of
    levels or terms). ``hartree`` and ``ev`` hold the same difference.
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    initial: SCFResult
    final: SCFResult
    hartree: float
    ev: float
    provenance: Literal["computed"] = "computed"
    caution: str = _CAUTION

    def __str__(self) -> str:
        return (f"{self.initial.species} {self.initial.configuration} -> "
                f"{self.final.species} {str(self.final.configuration) or '(no electrons)'}: "
                f"{self.ev:.4f} eV (ΔSCF, computed)")


class ConfigurationEnergy(BaseModel):
    """One entry of a :class:`ConfigurationRanking`: total energy and its distance above the
    lowest configuration (hartree and eV)."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    configuration: Configuration
    total_energy: float
    above_lowest_hartree: float
    above_lowest_ev: float


class ConfigurationRanking(BaseModel):
    """Configurations of one species ordered by SCF total energy, lowest first.

    ``lowest`` is the configuration with the lowest computed total energy: the LDA answer
    to "which lies lower", an approximation that can differ from the measured ground
    configuration (see ``caution``).
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    species: Species
    entries: tuple[ConfigurationEnergy, ...]
    provenance: Literal["computed"] = "computed"
    caution: str = _CAUTION

    @property
    def lowest(self) -> Configuration:
        return self.entries[0].configuration


# ---------------------------------------------------------------------------- input
def _looks_like_species(text: str) -> bool:
    """True for text shaped like a species (``Fe``, ``Fe2+``, ``Fe III``), not a
    configuration (those start with a digit or a bracketed core)."""
    stripped = text.strip()
    return bool(stripped) and stripped[0].isalpha() and stripped[0].isupper()


def _resolve(what: Any, species: SpeciesLike | None) -> tuple[Species, Configuration]:
    """(species, configuration) of an :func:`scf` argument."""
    kind = None if species is None else as_species(species)
    if isinstance(what, Configuration):
        config = what
    elif isinstance(what, str) and _looks_like_species(what):
        if kind is not None:
            raise ConfspecSyntaxError("scf-option", f"{what!r} reads as a species; give "
                                      "species= only with a configuration")
        kind = parse_species(what)
        config = ground_state(kind)
    elif isinstance(what, str):
        config = parse(what) if kind is None else parse(what, reference=kind)
    elif isinstance(what, Species | Element | int) and not isinstance(what, bool):
        if kind is not None:
            raise ConfspecSyntaxError("scf-option", "give species= only with a configuration, "
                                      "not with a species as the first argument")
        kind = as_species(what)
        config = ground_state(kind)
    else:
        raise TypeError(f"expected a species, a Configuration or notation text, not "
                        f"{type(what).__name__}")
    if kind is None:
        if config.electron_count == 0:
            raise ConfspecSyntaxError("scf-option", "an empty configuration needs species= "
                                      "(a bare nucleus of which element?)")
        kind = as_species(config.electron_count) if config.electron_count <= 118 else None
        if kind is None:
            raise ConfspecPhysicsError("electron-count", f"{config} holds "
                                       f"{config.electron_count} electrons: no neutral atom has "
                                       "that many; pass species=", text=str(config))
    if config.electron_count != kind.electron_count:
        raise ConfspecPhysicsError(
            "electron-count", f"{config or 'the empty configuration'} holds "
            f"{config.electron_count} electrons; {kind} has {kind.electron_count} (Z − charge)",
            text=str(config))
    return kind, config


def _options(values: dict[str, float]) -> dict[str, float]:
    """Check every option against its range; ``scf-option`` errors otherwise."""
    for name, value in values.items():
        low, high, integer = _OPTIONS[name]
        if integer and (isinstance(value, bool) or not isinstance(value, int)):
            raise ConfspecSyntaxError("scf-option", f"{name} must be a whole number from "
                                      f"{low:g} to {high:g}, not {value!r}")
        if not integer and (isinstance(value, bool) or not isinstance(value, int | float)):
            raise ConfspecSyntaxError("scf-option", f"{name} must be a number from {low:g} to "
                                      f"{high:g}, not {value!r}")
        if not (math.isfinite(value) and low <= value <= high):
            raise ConfspecSyntaxError("scf-option", f"{name} must lie between {low:g} and "
                                      f"{high:g}, not {value!r}")
    return values


def _numerics() -> Any:
    try:
        from . import kohn_sham
    except ImportError as err:
        raise ConfspecPhysicsError(
            "scf-unavailable", f"SCF calculations need numpy and scipy ({err}); install them "
            "with: pip install \"confspec[scf]\"") from None
    return kohn_sham


# ---------------------------------------------------------------------------- scf
def scf(what: SpeciesLike | Configuration, *, species: SpeciesLike | None = None,
        energy_tolerance: float = 1e-9, density_tolerance: float = 1e-7,
        max_iterations: int = 200, mixing: float = 0.4, history: int = 8,
        grid_step: float = 0.008, r_max: float = 50.0) -> SCFResult:
    """Solve the spherically averaged LDA atom self-consistently (computed, an approximation).

    ``what`` is a species (``"Fe"``, ``"Fe2+"``, a :class:`~confspec.Species`, an atomic
    number), which means its ground configuration from :func:`confspec.ground_state`; or a
    :class:`~confspec.Configuration` or notation text (``"[Ar] 3d7 4s1"``), whose species
    is ``species`` (default: the neutral atom with that many electrons). Holes such as
    ``"[Ne] 2p^-1 3s2"`` work as everywhere in confspec.

    Options: converged when the total energy changes by less than ``energy_tolerance``
    (hartree, 1e-12 … 1e-3) and ∫|n_out − n_in| dr < ``density_tolerance`` (electrons,
    1e-10 … 1e-2) within ``max_iterations`` (1 … 10,000); ``mixing`` (0.01 … 1) and
    ``history`` (1 … 50) tune the Pulay density mixing; ``grid_step`` (0.001 … 0.05) is the
    step h of the logarithmic grid and ``r_max`` (5 … 2000 bohr) its outer end (doubled
    automatically, twice at most, for a diffuse orbital). At the defaults the total energies
    of neutral atoms agree with the NIST LDA reference data to about 1e-6 hartree.

    Raises ``scf-not-converged`` (:class:`SCFConvergenceError`, with the residual reached)
    when the SCF does not converge or an occupied orbital is not bound (most anions in
    LDA), ``scf-option`` for an option out of range, ``electron-count`` when the
    configuration does not fit the species, ``scf-unavailable`` without numpy/scipy.

    >>> result = scf("He")
    >>> round(result.total_energy, 6), result.provenance   # NIST LDA table: −2.834836
    (-2.834836, 'computed')
    >>> round(result.orbitals["1s"].energy_hartree, 4)
    -0.5704
    """
    kind, config = _resolve(what, species)
    opts = _options({"energy_tolerance": energy_tolerance,
                     "density_tolerance": density_tolerance, "max_iterations": max_iterations,
                     "mixing": mixing, "history": history, "grid_step": grid_step,
                     "r_max": r_max})
    caution = _CAUTION + (_HEAVY if kind.Z >= 37 else "") + (
        _NLJ if config.is_relativistic else "")
    if config.electron_count == 0:
        return SCFResult.model_construct(
            species=kind, configuration=config, total_energy=0.0, kinetic_energy=0.0,
            hartree_energy=0.0, electron_nucleus_energy=0.0, exchange_correlation_energy=0.0,
            virial_ratio=None, scaling_virial_ratio=None, orbitals={}, iterations=0,
            residual=0.0, energy_change=0.0, energy_tolerance=energy_tolerance,
            density_tolerance=density_tolerance, grid_step=grid_step, method=SCF_METHOD,
            provenance="computed", caution="a bare nucleus: no electrons, the energy is 0 "
            "exactly", radii=(), density=())
    ks = _numerics()
    occupations = [(n, l, float(e)) for n, l, e in config.occupancies]
    try:
        atom = ks.solve_atom(
            kind.Z, occupations, energy_tolerance=opts["energy_tolerance"],
            density_tolerance=opts["density_tolerance"],
            max_iterations=int(opts["max_iterations"]), mixing=opts["mixing"],
            history=int(opts["history"]), step=opts["grid_step"], r_max=opts["r_max"])
    except ks.SCFNotConverged as err:
        raise SCFConvergenceError(
            "scf-not-converged", f"{kind} {config}: {err.reason} (after {err.iterations} "
            f"iterations; density residual {err.residual:.3g} electrons)", text=str(config),
            residual=float(err.residual), iterations=int(err.iterations),
            reason=str(err.reason)) from None
    except ValueError as err:  # the numerics refuse an argument our checks let through
        raise ConfspecSyntaxError("scf-option", str(err)) from None
    return _result(kind, config, atom, caution)


def _result(kind: Species, config: Configuration, atom: AtomResult,
            caution: str) -> SCFResult:
    """The frozen model of a solver result (values computed here: no re-validation)."""
    orbitals: dict[str, SCFOrbital] = {}
    for orb in atom.orbitals:
        label = subshell_label(orb.n, orb.l)
        orbitals[label] = SCFOrbital.model_construct(
            label=label, n=orb.n, l=orb.l, occupancy=round(orb.occupancy),
            energy_hartree=float(orb.eigenvalue), energy_ev=float(orb.eigenvalue) * HARTREE_EV,
            mean_radius_bohr=float(orb.r_mean), mean_square_radius_bohr2=float(orb.r2_mean),
            outer_maximum_bohr=float(orb.r_peak),
            effective_charge=(3 * orb.n**2 - orb.l * (orb.l + 1)) / (2.0 * float(orb.r_mean)),
            radial=tuple(orb.radial.tolist()))
    return SCFResult.model_construct(
        species=kind, configuration=config, total_energy=float(atom.total_energy),
        kinetic_energy=float(atom.kinetic), hartree_energy=float(atom.hartree),
        electron_nucleus_energy=float(atom.electron_nucleus),
        exchange_correlation_energy=float(atom.exchange_correlation),
        virial_ratio=float(atom.virial_ratio),
        scaling_virial_ratio=float(atom.scaling_virial_ratio), orbitals=orbitals,
        iterations=int(atom.iterations), residual=float(atom.residual),
        energy_change=float(atom.energy_change), energy_tolerance=float(atom.energy_tolerance),
        density_tolerance=float(atom.density_tolerance), grid_step=float(atom.grid.step),
        method=SCF_METHOD, provenance="computed", caution=caution,
        radii=tuple(atom.grid.r.tolist()), density=tuple(atom.density.tolist()))


# ---------------------------------------------------------------------------- derived
def _as_result(item: SCFResult | SpeciesLike | Configuration, species: SpeciesLike | None,
               options: dict[str, Any]) -> SCFResult:
    return item if isinstance(item, SCFResult) else scf(item, species=species, **options)


def delta_scf(initial: SCFResult | SpeciesLike | Configuration,
              final: SCFResult | SpeciesLike | Configuration, *,
              species: SpeciesLike | None = None, **options: Any) -> SCFDifference:
    """ΔSCF energy E(final) − E(initial), in hartree and eV (computed, an approximation).

    Each side is anything :func:`scf` takes (``species`` applies to configuration text and
    Configurations, as there) or an :class:`SCFResult` already computed; ``options`` go to
    :func:`scf`. Both sides must be the same element. ``delta_scf("Fe", "Fe+")`` is the
    ΔSCF first ionization energy of iron; ``delta_scf("[Ar] 4s1", "[Ar] 3d1")`` the 4s → 3d
    excitation energy of potassium, both between spherically averaged configurations.

    >>> round(delta_scf("Mg", "Mg+").hartree, 5)   # NIST LDA table: 0.296000
    0.296
    """
    first = _as_result(initial, species, options)
    second = _as_result(final, species, options)
    if first.species.Z != second.species.Z:
        raise ConfspecSyntaxError(
            "scf-option", f"a ΔSCF energy compares one element: {first.species} and "
            f"{second.species} are different elements")
    diff = second.total_energy - first.total_energy
    caution = first.caution if len(first.caution) >= len(second.caution) else second.caution
    return SCFDifference(initial=first, final=second, hartree=diff, ev=diff * HARTREE_EV,
                         caution=caution)


def ionization_energy(species: SpeciesLike, **options: Any) -> SCFDifference:
    """ΔSCF ionization energy of a species: E(X⁺) − E(X), both in their ground
    configurations from :func:`confspec.ground_state` (computed, an approximation: for
    Z = 1–36 it differs from the measured first ionization energies by 0.76 eV on average,
    see the docs). A bare nucleus cannot be ionized (``scf-option``).

    >>> round(ionization_energy("Na").ev, 2)   # measured (NIST ASD): 5.139 eV
    5.16
    """
    kind = as_species(species)
    if kind.charge >= kind.Z:
        raise ConfspecSyntaxError("scf-option", f"{kind} has no electron left to remove")
    ion = Species(element=kind.element, charge=kind.charge + 1)
    return delta_scf(kind, ion, **options)


def lowest_configuration(species: SpeciesLike,
                         configurations: Iterable[Configuration | str] | Sequence[str],
                         **options: Any) -> ConfigurationRanking:
    """Which of several configurations of one species has the lowest SCF total energy.

    Each configuration must hold the species' electron count; ``options`` go to
    :func:`scf`. The ranking is that of spherically averaged LDA, an approximation: it
    gets K, Ca, Fe²⁺ and Cu right but puts Fe 3d7 4s1 below the measured 3d6 4s2.

    >>> ranking = lowest_configuration("K", ["[Ar] 3d1", "[Ar] 4s1"])
    >>> str(ranking.lowest), round(ranking.entries[1].above_lowest_ev, 2)
    ('[Ar] 4s1', 2.48)
    """
    kind = as_species(species)
    configs = [as_configuration(c) for c in configurations]
    if not configs:
        raise ConfspecSyntaxError("scf-option", "give at least one configuration to compare")
    results = [scf(c, species=kind, **options) for c in configs]
    lowest = min(r.total_energy for r in results)
    entries = sorted(
        (ConfigurationEnergy(configuration=r.configuration, total_energy=r.total_energy,
                             above_lowest_hartree=r.total_energy - lowest,
                             above_lowest_ev=(r.total_energy - lowest) * HARTREE_EV)
         for r in results), key=lambda e: e.total_energy)
    caution = max((r.caution for r in results), key=len)
    return ConfigurationRanking(species=kind, entries=tuple(entries), caution=caution)
