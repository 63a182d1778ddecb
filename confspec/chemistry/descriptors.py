"""Flat numeric descriptors of atoms and ions for modelling code (no pandas needed).

Every value is an ``int``, ``float``, ``bool`` or ``None`` (not applicable / no published
value), so a list of rows goes straight into any data-frame library. The meaning of each
key is in :data:`DESCRIPTOR_DOCS`; estimates keep their provenance in the ``is_*`` flags.

Measured quantities (ionization energy, electron affinity, the ground term and the spin it
implies) and estimates (Slater and Clementi–Raimondi orbital energies, Hund's-rule spin)
have different names, so a model never takes one for the other: the hydrogen-like orbital
energies are up to 5.4× the measured first ionization energies (Ne; see the docs' table).
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any, Literal

from ..errors import ConfspecError
from ..models import Configuration
from ..physics import CORES_LARGEST_FIRST, NOBLE_CORES, madelung_fill, pauli_limit
from ..reading import as_species
from .ground import SpeciesLike, anion_rows, ground_level, outermost_subshell
from .ionization import published_ionization_energy

__all__ = ["DEPRECATED_KEYS", "DESCRIPTOR_DOCS", "Descriptors", "descriptor_table",
           "descriptors"]

Value = int | float | bool | None

#: Every descriptor key and what it means (conventions are ours unless a source is named).
DESCRIPTOR_DOCS: dict[str, str] = {
    "Z": "atomic number",
    "charge": "ion charge (0 for the neutral atom)",
    "electron_count": "Z − charge",
    "period": "period of the element: highest n in the Madelung filling of the neutral atom",
    "block": "block of the element as l (0 s, 1 p, 2 d, 3 f): the last subshell of the "
             "Madelung filling of the neutral atom (He counts as s)",
    "valence_n": "highest principal number occupied in the species' ground configuration",
    "valence_electrons": "electrons of the species' ground configuration outside the "
                         "element's noble-gas core (the noble gas before it; none for H, "
                         "He), leaving out f electrons of the shell n = period − 2 (see "
                         "f_electrons) and, from group 12 on (Zn, Ga, ... Kr and the rows "
                         "below), the filled (period − 1)d10: the same count for atoms and "
                         "ions (Fe: 8, Fe2+: 6, Cu: 11, Zn: 2, Ga: 3, Pd: 10, Ne: 8, Na+: 0, "
                         "Ti4+: 0, Mo6+: 0, W6+: 0, Eu: 2, Gd: 3, Ce: 3, U: 3)",
    "f_electrons": "f electrons of the ground configuration outside the element's "
                   "noble-gas core (Eu: 7, U: 3, W6+: 14)",
    "unpaired_electrons": "2S of the ground term where one is listed (measured or "
                          "predicted), so it agrees with term_multiplicity; otherwise "
                          "Hund's estimate (Ce: 0, from its measured 1G°4)",
    "unpaired_electrons_hund": "unpaired electrons of the ground configuration by Hund's "
                               "first rule (an estimate; Ce: 2)",
    "open_subshells": "number of partly filled subshells in the ground configuration",
    "parity_odd": "1 when the ground configuration has odd parity (sum of l is odd), else 0",
    "term_multiplicity": "2S + 1 of the ground term (measured where published)",
    "term_L": "L of the ground term",
    "term_J": "J of the ground level as a float (None when not known)",
    "hund_disagrees": "True when Hund's rules give another ground term than the listed one",
    "outer_n": "n of the outermost subshell (the one the cation rule empties first)",
    "outer_l": "l of the outermost subshell",
    "zeff_slater": "effective nuclear charge of an outermost electron by Slater's rules "
                   "(Slater, Phys. Rev. 36, 57 (1930)); an estimate",
    "sigma_slater": "Slater screening constant of that electron (Z − zeff_slater)",
    "orbital_energy_slater_ev": "hydrogen-like orbital energy estimate −R∞hc (Zeff/n*)² in "
                                "eV with Slater's n*; not an ionization energy (Ne: 5.4× "
                                "the measured IE1)",
    "radius_slater_angstrom": "radius of maximum radial density n*² a₀ / Zeff in ångström",
    "zeff_clementi_raimondi": "Clementi & Raimondi (J. Chem. Phys. 38, 2686 (1963)) SCF "
                              "effective charge of the outermost subshell; None outside "
                              "their table (ions, Z > 36)",
    "orbital_energy_clementi_raimondi_ev": "hydrogen-like orbital energy estimate "
                                           "−R∞hc (Zeff/n)² in eV from the Clementi–"
                                           "Raimondi Zeff; not an ionization energy",
    "ionization_energy_ev": "published energy to remove one electron from this species "
                            "(NIST ASD; IE1 for atoms, IE2 for singly charged ions), None "
                            "where none ships",
    "ionization_energy_measured": "True when ionization_energy_ev is measured, False when "
                                  "NIST gives it as calculated, None when there is none",
    "electron_affinity_ev": "measured electron affinity of the neutral element (Andersen, "
                            "Haugen & Hotop 1999 and later), None when its anion is unbound "
                            "or not established",
    "anion_bound": "whether the element's singly charged anion is bound (True), known to "
                   "be unbound (False) or not established (None)",
    "is_measured": "the ground configuration and term are measured (NIST ASD or the "
                   "negative-ion compilation)",
    "is_predicted": "the ground level is a published prediction (e.g. superheavy elements)",
    "is_rule": "the ground level is derived by the ion rules (an approximation)",
}

#: Keys renamed so that no one mistakes an orbital-energy estimate for an ionization
#: energy; the old names still read (with a DeprecationWarning) for one release.
DEPRECATED_KEYS: dict[str, str] = {
    "energy_slater_ev": "orbital_energy_slater_ev",
    "energy_clementi_raimondi_ev": "orbital_energy_clementi_raimondi_ev",
}


class Descriptors(dict[str, Value]):
    """The descriptor row: a plain dict whose renamed keys still read, with a warning."""

    def __missing__(self, key: str) -> Value:
        new = DEPRECATED_KEYS.get(key)
        if new is None:
            raise KeyError(key)
        import warnings

        warnings.warn(f"the descriptor {key!r} is deprecated; it is an orbital-energy "
                      f"estimate, now {new!r}", DeprecationWarning, stacklevel=2)
        return self[new]

    def get(self, key: str, default: Any = None) -> Any:
        if key in DEPRECATED_KEYS and key not in self:
            return self.__missing__(key)
        return super().get(key, default)


def _valence(Z: int, config: Configuration) -> tuple[int | None, int, int]:
    """(highest n occupied, valence electrons, f electrons) as :data:`DESCRIPTOR_DOCS`
    defines them."""
    occ = config.occupancies
    if not occ:
        return None, 0, 0
    top = max(n for n, _, _ in occ)
    filling = madelung_fill(Z)
    period = max(n for n, _, _ in filling)
    last = max(filling, key=lambda t: (t[0] + t[1], t[0]))
    # from group 12 on, the (period - 1)d10 belongs to the core: the Madelung filling of
    # the neutral atom ends in p, or in a full d subshell
    d10_is_core = last[1] == 1 or (last[1] == 2 and last[2] == pauli_limit(2))
    core: set[tuple[int, int]] = set()
    for symbol in CORES_LARGEST_FIRST:  # the noble gas before the element
        shells = NOBLE_CORES[symbol]
        if sum(e for _, _, e in shells) < Z:
            core = {(n, l) for n, l, _ in shells}
            break
    count = f_count = 0
    for n, l, e in occ:
        if (n, l) in core:
            continue
        if l == 3:
            f_count += e
        if l == 3 and n == period - 2:
            continue
        if d10_is_core and l == 2 and n == period - 1 and e == pauli_limit(2):
            continue
        count += e
    return top, count, f_count


def descriptors(species: SpeciesLike) -> Descriptors:
    """Numeric features of one species (keys and meanings: :data:`DESCRIPTOR_DOCS`).

    >>> d = descriptors("Fe2+")
    >>> d["electron_count"], d["unpaired_electrons"], d["block"], d["is_measured"]
    (24, 4, 2, True)
    """
    from .shielding import effective_charge

    kind = as_species(species)
    level = ground_level(kind)
    config = level.configuration
    filling = madelung_fill(kind.Z)
    last = max(filling, key=lambda t: (t[0] + t[1], t[0]))
    valence_n, valence_electrons, f_electrons = _valence(kind.Z, config)
    term = level.term
    hund_unpaired = config.unpaired_electrons
    ionization = published_ionization_energy(kind)
    anion = anion_rows().get(kind.Z)
    out = Descriptors({
        "Z": kind.Z,
        "charge": kind.charge,
        "electron_count": kind.electron_count,
        "period": max(n for n, _, _ in filling),
        "block": last[1],
        "valence_n": valence_n,
        "valence_electrons": valence_electrons,
        "f_electrons": f_electrons,
        "unpaired_electrons": hund_unpaired if term is None else term.multiplicity - 1,
        "unpaired_electrons_hund": hund_unpaired,
        "open_subshells": len(config.open_subshells),
        "parity_odd": int(config.parity == "odd"),
        "term_multiplicity": None if term is None else term.multiplicity,
        "term_L": None if term is None else term.L,
        "term_J": None if term is None or term.J is None else float(term.J),
        "hund_disagrees": level.hund_term is not None,
        "outer_n": None, "outer_l": None,
        "zeff_slater": None, "sigma_slater": None, "orbital_energy_slater_ev": None,
        "radius_slater_angstrom": None,
        "zeff_clementi_raimondi": None, "orbital_energy_clementi_raimondi_ev": None,
        "ionization_energy_ev": None if ionization is None else ionization.energy_ev,
        "ionization_energy_measured": None if ionization is None else (
            ionization.provenance == "measured"),
        "electron_affinity_ev": None if anion is None else anion.affinity_ev,
        "anion_bound": None if anion is None else anion.binding == "bound",
        "is_measured": level.provenance == "measured",
        "is_predicted": level.provenance == "predicted",
        "is_rule": level.provenance == "rule",
    })
    outer = outermost_subshell(config)
    if outer is not None:
        slater = effective_charge(kind, outer)
        out.update({
            "outer_n": outer[0], "outer_l": outer[1],
            "zeff_slater": slater.zeff, "sigma_slater": slater.sigma,
            "orbital_energy_slater_ev": slater.orbital_energy(),
            "radius_slater_angstrom": slater.radius_estimate(),
        })
        try:
            fitted = effective_charge(kind, outer, model="clementi-raimondi")
        except ConfspecError:
            pass  # outside the published table: left as None
        else:
            out["zeff_clementi_raimondi"] = fitted.zeff
            out["orbital_energy_clementi_raimondi_ev"] = fitted.orbital_energy()
    assert set(out) == set(DESCRIPTOR_DOCS)
    return out


def descriptor_table(species: Iterable[SpeciesLike], *,
                     errors: Literal["raise", "keep"] = "raise") -> list[dict[str, Value | str]]:
    """One row per species: ``{"species": "Fe2+", **descriptors}``, in input order.

    With ``errors="keep"`` a species that cannot be read still gets its row, with every
    descriptor None and ``"error"`` holding the code and message, so no row is lost.

    >>> [row["unpaired_electrons"] for row in descriptor_table(["Fe", "Fe3+", "Zn2+"])]
    [4, 5, 0]
    """
    if errors not in ("raise", "keep"):
        raise ValueError(f"errors must be 'raise' or 'keep', not {errors!r}")
    rows: list[dict[str, Value | str]] = []
    for item in species:
        try:
            kind = as_species(item)
            row: dict[str, Value | str] = {"species": str(kind), **descriptors(kind)}
            if errors == "keep":
                row["error"] = None
        except ConfspecError as err:
            if errors == "raise":
                raise
            row = {"species": str(item), **dict.fromkeys(DESCRIPTOR_DOCS),
                   "error": f"{err.code}: {err.message}"}
        rows.append(row)
    return rows
