"""Shielding and effective nuclear charge: Slater's rules and Clementi–Raimondi SCF values.

Both are estimates of how strongly an electron is bound, and results say so in ``caution``.

Slater's rules as published (J. C. Slater, "Atomic Shielding Constants", Phys. Rev. 36, 57
(1930)): electrons are grouped (1s)(2s,2p)(3s,3p)(3d)(4s,4p)(4d)(4f)(5s,5p)(5d)(5f)...;
for an electron of a group, each other electron of the same group screens 0.35 (0.30 in
1s); for an s or p electron, each electron with principal number n − 1 screens 0.85 and
each with n − 2 or lower 1.00; for a d or f electron every electron of an inner group
screens 1.00; electrons of outer groups screen nothing. Effective principal numbers n* =
1, 2, 3, 3.7, 4.0, 4.2 for n = 1–6 (Slater 1930). Slater gives no n* beyond n = 6; we use
4.2 for n ≥ 7 as well (our extrapolation, flagged in ``caution``). Groups beyond f (5g,
6g, 6h, ...) follow the same pattern: each nl with l ≥ 2 is its own group, placed after
the (n s, n p) group and before the next one.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import cache
from typing import Literal

from ..data import read_table
from ..errors import ConfspecPhysicsError, ConfspecSyntaxError
from ..models import Configuration, Species
from ..physics import subshell_label, subshell_numbers
from ..reading import as_species
from .ground import SpeciesLike, ground_level

__all__ = [
    "BOHR_RADIUS_ANGSTROM",
    "RYDBERG_ENERGY_EV",
    "Contribution",
    "Disagreement",
    "ShieldingResult",
    "effective_charge",
    "slater_disagreement",
    "slater_n_star",
]

#: Rydberg energy R∞hc in eV: CODATA 2018 recommended value 13.605 693 122 994(26) eV
#: (Tiesinga, Mohr, Newell, Taylor, Rev. Mod. Phys. 93, 025010 (2021)).
RYDBERG_ENERGY_EV = 13.605693122994

#: Bohr radius a₀ in ångström: CODATA 2018 recommended value 0.529 177 210 903(80) Å
#: (same source).
BOHR_RADIUS_ANGSTROM = 0.529177210903

Model = Literal["slater", "clementi-raimondi"]
MODELS: tuple[Model, ...] = ("slater", "clementi-raimondi")

#: Slater (1930), Phys. Rev. 36, 57: effective principal quantum numbers for n = 1–6.
_SLATER_N_STAR: Mapping[int, float] = {1: 1.0, 2: 2.0, 3: 3.0, 4: 3.7, 5: 4.0, 6: 4.2}

_SLATER_SOURCE = "Slater, Phys. Rev. 36, 57 (1930)"
_CR_SOURCE = ("Clementi & Raimondi, J. Chem. Phys. 38, 2686 (1963), "
              "shipped as data/clementi_raimondi.csv")


def slater_n_star(n: int) -> float:
    """Slater's effective principal number: 1, 2, 3, 3.7, 4.0, 4.2 (n ≥ 7: 4.2, ours)."""
    return _SLATER_N_STAR.get(n, _SLATER_N_STAR[6])


@dataclass(frozen=True, slots=True)
class Contribution:
    """One line of the hand calculation: ``electrons × factor`` from one Slater group."""

    group: str  # e.g. "(3s,3p)"
    electrons: int
    factor: float

    @property
    def shielding(self) -> float:
        return self.electrons * self.factor

    def __str__(self) -> str:
        return f"{self.electrons} × {self.factor:.2f} {self.group}"


@dataclass(frozen=True, slots=True)
class ShieldingResult:
    """An effective nuclear charge, with the numbers that produced it.

    ``sigma`` is the screening constant, ``zeff = Z − sigma``. For Slater's rules
    ``contributions`` lists every group's ``electrons × factor`` (they add up to ``sigma``);
    Clementi–Raimondi values are fitted to SCF functions and have no such breakdown, so the
    tuple is empty. ``n_star`` is Slater's effective principal number (Clementi–Raimondi:
    the integer n of their single-zeta functions).
    """

    species: Species
    subshell: str
    configuration: Configuration
    model: Model
    Z: int
    zeff: float
    sigma: float
    n: int
    n_star: float
    contributions: tuple[Contribution, ...]
    source: str
    caution: str = field(default="")
    note: str = field(default="")

    @property
    def provenance(self) -> str:
        """``"rule"`` for Slater's empirical rules, ``"predicted"`` for the published SCF
        calculation of Clementi & Raimondi (the vocabulary of :class:`GroundLevel`)."""
        return "rule" if self.model == "slater" else "predicted"

    def orbital_energy(self, use_effective_n: bool = True) -> float:
        """Orbital energy estimate in eV: −R∞hc·(Zeff / n*)² (or with the integer n).

        A hydrogen-like estimate; compare with measured ionization energies only loosely.
        """
        n = self.n_star if use_effective_n else float(self.n)
        return -RYDBERG_ENERGY_EV * (self.zeff / n) ** 2

    def radius_estimate(self, use_effective_n: bool = True) -> float:
        """Radius of maximum radial density in ångström: n*² a₀ / Zeff (Slater-type orbital;
        with the integer n, the hydrogen-like nodeless value)."""
        n = self.n_star if use_effective_n else float(self.n)
        return n * n * BOHR_RADIUS_ANGSTROM / self.zeff

    def explain(self) -> str:
        """The calculation as one would write it by hand."""
        head = f"{self.species} {self.subshell} in {self.configuration or '(empty)'}"
        if not self.contributions:
            body = f"sigma = {self.sigma:.4f} (from the published Zeff)"
        else:
            parts = " + ".join(str(c) for c in self.contributions)
            body = f"sigma = {parts} = {self.sigma:.2f}"
        return (f"{head} [{self.model}]\n{body}\n"
                f"Zeff = {self.Z} − {self.sigma:.2f} = {self.zeff:.2f}")

    def __str__(self) -> str:
        return f"Zeff({self.species} {self.subshell}, {self.model}) = {self.zeff:.4g}"


# ---------------------------------------------------------------------------- Slater
def _group_key(n: int, l: int) -> tuple[int, int]:
    """Position in Slater's list: (ns,np) groups share a slot; each nd, nf, ... has its own."""
    return (n, 1 if l <= 1 else l)


def _group_label(n: int, l: int) -> str:
    if l <= 1:
        return "(1s)" if n == 1 else f"({n}s,{n}p)"
    return f"({subshell_label(n, l)})"


def _slater(config: Configuration, n: int, l: int) -> tuple[Contribution, ...]:
    mine = _group_key(n, l)
    groups: dict[tuple[int, int], int] = {}
    for sn, sl, electrons in config.occupancies:
        key = _group_key(sn, sl)
        groups[key] = groups.get(key, 0) + electrons
    out: list[Contribution] = []
    for key in sorted(groups, reverse=True):
        electrons = groups[key]
        gn, gl = key
        label = _group_label(gn, 0 if gl == 1 else gl)
        if key == mine:
            if electrons > 1:
                out.append(Contribution(label, electrons - 1, 0.30 if n == 1 else 0.35))
            continue
        if key > mine:
            continue  # outer groups screen nothing
        # inner groups: an s or p electron feels 0.85 from n − 1 and 1.00 from n − 2 and
        # below; a d or f electron feels 1.00 from every inner group
        factor = 0.85 if l <= 1 and gn == n - 1 else 1.00
        out.append(Contribution(label, electrons, factor))
    return tuple(out)


# ---------------------------------------------------------------------------- C & R
@cache
def _clementi_raimondi_rows() -> dict[tuple[int, str], dict[str, str]]:
    return {(int(r["Z"]), r["subshell"]): r for r in read_table("clementi_raimondi.csv")}


@cache
def _clementi_raimondi() -> dict[tuple[int, str], float]:
    return {key: float(r["zeff"]) for key, r in _clementi_raimondi_rows().items()}


def clementi_raimondi_table() -> dict[tuple[int, str], float]:
    """The shipped Clementi–Raimondi effective charges by (Z, subshell label)."""
    return dict(_clementi_raimondi())


@dataclass(frozen=True, slots=True)
class Disagreement:
    """How far Slater's Zeff lies from the shipped SCF reference for one kind of subshell:
    median and largest relative gap |Slater − reference| / reference over ``count``
    subshells (count 0: no reference to compare with, so the error is unknown)."""

    kind: str  # "s/p", "d" or "f"
    median: float
    largest: float
    count: int
    reference: str

    def __str__(self) -> str:
        if not self.count:
            return (f"for {self.kind} electrons no SCF reference is shipped, so the error "
                    "is unknown (Slater's rules are known to be worst for d and f)")
        return (f"for {self.kind} electrons they differ from the {self.reference} by a "
                f"median {self.median:.0%} (up to {self.largest:.0%}, {self.count} "
                "subshells)")


def _kind(l: int) -> str:
    return "s/p" if l <= 1 else "d" if l == 2 else "f"


@cache
def slater_disagreement() -> dict[str, Disagreement]:
    """Slater's rules against the shipped Clementi–Raimondi effective charges of the
    neutral ground-state atoms, per subshell kind (s/p, d, f), computed from the data so
    the caution every Slater result carries cannot drift from it. Rows not taken from
    the paper (H 1s) are left out."""
    gaps: dict[str, list[float]] = {"s/p": [], "d": [], "f": []}
    zs: list[int] = []
    for (z, label), row in _clementi_raimondi_rows().items():
        if row["note"].startswith("not from the paper"):
            continue
        zs.append(z)
        n, l = _subshell(label)
        config = ground_level(Species.model_construct(
            element=as_species(z).element, charge=0)).configuration
        sigma = sum((c.shielding for c in _slater(config, n, l)), 0.0)
        reference = float(row["zeff"])
        gaps[_kind(l)].append(abs((z - sigma) - reference) / reference)
    where = (f"Clementi–Raimondi self-consistent-field values shipped for Z = "
             f"{min(zs)}–{max(zs)}")
    out: dict[str, Disagreement] = {}
    for kind, values in gaps.items():
        values.sort()
        if not values:
            out[kind] = Disagreement(kind, 0.0, 0.0, 0, where)
            continue
        mid = len(values) // 2
        median = values[mid] if len(values) % 2 else (values[mid - 1] + values[mid]) / 2
        out[kind] = Disagreement(kind, median, values[-1], len(values), where)
    return out


# ---------------------------------------------------------------------------- entry point
def _subshell(subshell: str | tuple[int, int]) -> tuple[int, int]:
    return subshell_numbers(subshell)


def _as_config(configuration: Configuration | str) -> Configuration:
    if isinstance(configuration, Configuration):
        return configuration
    from ..reading import parse

    return parse(configuration)


def effective_charge(species: SpeciesLike, subshell: str | tuple[int, int], *,
                     configuration: Configuration | str | None = None,
                     model: str = "slater") -> ShieldingResult:
    """The effective nuclear charge felt by an electron of ``subshell``.

    ``configuration`` defaults to the species' ground state and may be any excited or
    hypothetical configuration with Z − charge electrons. ``model`` is ``"slater"`` (any
    species and configuration) or ``"clementi-raimondi"`` (the published SCF values, for
    the tabulated neutral ground-state atoms only; anything else is a
    ``no-reference-data`` error, never a guess).

    >>> r = effective_charge("Zn", "4s")
    >>> round(r.zeff, 2), [str(c) for c in r.contributions]
    (4.35, ['1 × 0.35 (4s,4p)', '10 × 0.85 (3d)', '8 × 0.85 (3s,3p)', '8 × 1.00 (2s,2p)', \
'2 × 1.00 (1s)'])
    >>> round(effective_charge("K", "3d", configuration="[Ar] 3d1").zeff, 2)
    1.0
    """
    if model not in MODELS:
        raise ConfspecSyntaxError("unknown-option", f"unknown shielding model {model!r}; "
                                  "use one of: " + ", ".join(MODELS))
    kind = as_species(species)
    n, l = _subshell(subshell)
    label = subshell_label(n, l)
    level = ground_level(kind)
    config = level.configuration if configuration is None else _as_config(configuration)
    if config.electron_count != kind.electron_count:
        raise ConfspecPhysicsError(
            "electron-count", f"{config} holds {config.electron_count} electrons; {kind} has "
            f"{kind.electron_count} (Z − charge)", text=str(config))
    if not any((sn, sl) == (n, l) for sn, sl, _ in config.occupancies):
        raise ConfspecPhysicsError(
            "empty-subshell", f"{label} holds no electron in {config or 'the empty configuration'}"
            f"; pass a configuration with an electron there", text=label)
    is_ground = config.occupancies == level.configuration.occupancies
    if model == "slater":
        contributions = _slater(config, n, l)
        # rounded to drop binary noise of 0.35 and 0.85, so 30 − 25.65 prints as 4.35
        sigma = round(sum((c.shielding for c in contributions), 0.0), 10)
        cautions = ["Slater's rules are an empirical estimate: "
                    + str(slater_disagreement()[_kind(l)])]
        if n >= 7:
            cautions.append(f"n* = 4.2 for n = {n} is our extrapolation: Slater (1930) "
                            "tabulates n* only up to n = 6")
        if level.provenance != "measured" and is_ground:
            cautions.append(f"the configuration is the {level.provenance}-based ground state")
        return ShieldingResult(
            species=kind, subshell=label, configuration=config, model="slater", Z=kind.Z,
            zeff=round(kind.Z - sigma, 10), sigma=sigma, n=n, n_star=slater_n_star(n),
            contributions=contributions, source=_SLATER_SOURCE, caution="; ".join(cautions))
    table = _clementi_raimondi()
    value = table.get((kind.Z, label))
    if kind.charge != 0 or not is_ground or value is None:
        tabulated = sorted({z for z, _ in table})
        raise ConfspecPhysicsError(
            "no-reference-data", f"the Clementi–Raimondi table has no value for {kind} {label}"
            + ("" if is_ground else " in this configuration")
            + f": it covers the ground states of the neutral atoms Z = {tabulated[0]}–"
            f"{tabulated[-1]} and their occupied subshells; use model='slater' otherwise",
            text=str(kind))
    row = _clementi_raimondi_rows()[(kind.Z, label)]
    caution = ("Clementi–Raimondi effective charges come from single-zeta SCF functions; "
               "orbital energies from them are hydrogen-like estimates")
    note = row["note"]
    if "DOUBTFUL" in note:
        caution += ("; this value is marked doubtful in the shipped table (see note): "
                    "verify it against the paper before use")
    if note.startswith("not from the paper"):
        caution += "; this value is not from the paper (see source and note)"
    elif note.startswith("from memory"):
        caution += "; transcribed from memory (see note)"
    source = row["source"] if not row["source"].startswith("Clementi") else _CR_SOURCE
    return ShieldingResult(
        species=kind, subshell=label, configuration=config, model="clementi-raimondi",
        Z=kind.Z, zeff=value, sigma=kind.Z - value, n=n, n_star=float(n), contributions=(),
        source=source, caution=caution, note=note)
