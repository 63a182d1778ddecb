"""Flat numeric descriptors of atoms and ions for modelling code (no pandas needed).

Every value is an ``int``, ``float``, ``bool`` or ``None`` (not applicable / no published
value), so a list of rows goes straight into any data-frame library. The meaning of each
key is in :data:`DESCRIPTOR_DOCS`; estimates keep their provenance in the ``is_*`` flags.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Literal

from ..errors import ConfspecError
from ..models import Configuration
from ..physics import CORES_LARGEST_FIRST, NOBLE_CORES, madelung_fill, pauli_limit
from ..reading import as_species
from .ground import SpeciesLike, ground_level, outermost_subshell

__all__ = ["DESCRIPTOR_DOCS", "descriptor_table", "descriptors"]

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
    "valence_electrons": "electrons outside the largest noble-gas core that holds fewer "
                         "electrons than the species, not counting full d or f subshells "
                         "whose n is below valence_n (Zn: 2, Fe: 8, Ga: 3, Pd: 10, Ne: 8, "
                         "Na+: 8, Fe2+: 6)",
    "unpaired_electrons": "unpaired electrons of the ground configuration by Hund's first rule",
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
    "energy_slater_ev": "orbital energy estimate −R∞hc (Zeff/n*)² in eV with Slater's n*",
    "radius_slater_angstrom": "radius of maximum radial density n*² a₀ / Zeff in ångström",
    "zeff_clementi_raimondi": "Clementi & Raimondi (J. Chem. Phys. 38, 2686 (1963)) SCF "
                              "effective charge of the outermost subshell; None outside "
                              "their table (ions, Z > 36)",
    "energy_clementi_raimondi_ev": "orbital energy estimate −R∞hc (Zeff/n)² in eV from the "
                                   "Clementi–Raimondi Zeff",
    "is_measured": "the ground configuration and term are measured (NIST ASD or the "
                   "negative-ion compilation)",
    "is_predicted": "the ground level is a published prediction (e.g. superheavy elements)",
    "is_rule": "the ground level is derived by the ion rules (an approximation)",
}


def _valence(config: Configuration) -> tuple[int | None, int]:
    occ = config.occupancies
    if not occ:
        return None, 0
    top = max(n for n, _, _ in occ)
    have = {(n, l): e for n, l, e in occ}
    inside: set[tuple[int, int]] = set()
    for symbol in CORES_LARGEST_FIRST:  # the largest core smaller than the species
        core = NOBLE_CORES[symbol]
        if (sum(e for _, _, e in core) < config.electron_count
                and all(have.get((n, l)) == e for n, l, e in core)):
            inside = {(n, l) for n, l, _ in core}
            break
    count = 0
    for n, l, e in occ:
        if (n, l) in inside:
            continue
        if l >= 2 and e == pauli_limit(l) and n < top:
            continue
        count += e
    return top, count


def descriptors(species: SpeciesLike) -> dict[str, Value]:
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
    valence_n, valence_electrons = _valence(config)
    term = level.term
    out: dict[str, Value] = {
        "Z": kind.Z,
        "charge": kind.charge,
        "electron_count": kind.electron_count,
        "period": max(n for n, _, _ in filling),
        "block": last[1],
        "valence_n": valence_n,
        "valence_electrons": valence_electrons,
        "unpaired_electrons": config.unpaired_electrons,
        "open_subshells": len(config.open_subshells),
        "parity_odd": int(config.parity == "odd"),
        "term_multiplicity": None if term is None else term.multiplicity,
        "term_L": None if term is None else term.L,
        "term_J": None if term is None or term.J is None else float(term.J),
        "hund_disagrees": level.hund_term is not None,
        "outer_n": None, "outer_l": None,
        "zeff_slater": None, "sigma_slater": None, "energy_slater_ev": None,
        "radius_slater_angstrom": None,
        "zeff_clementi_raimondi": None, "energy_clementi_raimondi_ev": None,
        "is_measured": level.provenance == "measured",
        "is_predicted": level.provenance == "predicted",
        "is_rule": level.provenance == "rule",
    }
    outer = outermost_subshell(config)
    if outer is not None:
        slater = effective_charge(kind, outer)
        out.update({
            "outer_n": outer[0], "outer_l": outer[1],
            "zeff_slater": slater.zeff, "sigma_slater": slater.sigma,
            "energy_slater_ev": slater.orbital_energy(),
            "radius_slater_angstrom": slater.radius_estimate(),
        })
        try:
            fitted = effective_charge(kind, outer, model="clementi-raimondi")
        except ConfspecError:
            pass  # outside the published table: left as None
        else:
            out["zeff_clementi_raimondi"] = fitted.zeff
            out["energy_clementi_raimondi_ev"] = fitted.orbital_energy()
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
