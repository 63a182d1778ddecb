"""Published first and second ionization energies, each with its provenance and source.

The values ship in ``data/ionization_energies.csv``: charge 0 is the first ionization
energy of the neutral atom (X → X⁺), charge 1 the second (X⁺ → X²⁺). They are looked up,
never computed, so a species without a shipped row gets None rather than an estimate
(for a computed one see :func:`confspec.chemistry.scf.ionization_energy`, an LDA
approximation).

``provenance`` keeps measured and predicted values apart: ``"predicted"`` marks values
that NIST ASD itself gives as calculated or semi-empirical (H I, He II and Li II from
theory, N II in brackets, the heaviest actinides and Rf–Hs) and published semi-empirical
revisions (the lanthanide second ionization energies of Johnson & Nelson 2017).
"""

from __future__ import annotations

from functools import cache
from typing import Literal

from pydantic import BaseModel, ConfigDict

from ..data import read_table
from ..models import Element, Species
from ..reading import as_species

__all__ = ["IonizationEnergy", "published_ionization_energy"]

#: A species argument: a Species, an Element, a species string or an atomic number.
SpeciesLike = Species | Element | str | int


class IonizationEnergy(BaseModel):
    """The energy (eV) to remove one electron from ``species``, with where it comes from.

    ``provenance`` is ``"measured"`` or ``"predicted"`` (calculated or semi-empirical, see
    the module docstring); ``source`` names the publication and ``note`` how the value
    was entered and checked.
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    species: Species
    energy_ev: float
    provenance: Literal["measured", "predicted"]
    source: str
    note: str = ""

    def __str__(self) -> str:
        return f"{self.species}: {self.energy_ev} eV ({self.provenance})"

    def __repr__(self) -> str:
        return f"IonizationEnergy('{self}')"


@cache
def _rows() -> dict[tuple[int, int], IonizationEnergy]:
    """The shipped table keyed by (Z, charge); read once, since the CSV never changes."""
    from ..data import elements as _elements

    rows: dict[tuple[int, int], IonizationEnergy] = {}
    for record in read_table("ionization_energies.csv"):
        where = f"ionization_energies.csv {record['symbol']}{int(record['charge']):+d}"
        row = _elements.by_symbol(record["symbol"])
        if row is None:  # pragma: no cover - guarded by the data tests
            raise RuntimeError(f"{where}: unknown symbol {record['symbol']!r}")
        status = record["status"]
        if status not in ("measured", "predicted"):  # pragma: no cover - guarded by tests
            raise RuntimeError(f"{where}: unknown status {status!r}")
        charge = int(record["charge"])
        if (row.Z, charge) in rows:  # pragma: no cover - guarded by the data tests
            raise RuntimeError(f"{where}: listed twice")
        # model_construct: the row is checked above, and this is the hot lookup path
        species = Species.model_construct(
            element=Element.model_construct(Z=row.Z, symbol=row.symbol, name=row.name),
            charge=charge)
        rows[(row.Z, charge)] = IonizationEnergy.model_construct(
            species=species, energy_ev=float(record["energy_ev"]),
            provenance="measured" if status == "measured" else "predicted",
            source=record["source"], note=record.get("note") or "")
    return rows


def published_ionization_energy(species: SpeciesLike) -> IonizationEnergy | None:
    """The shipped ionization energy of a species, or None when none ships.

    Named apart from :func:`confspec.chemistry.scf.ionization_energy`, the computed ΔSCF
    estimate, so a published value and an approximation are never confused.

    Only first (neutral atom) and second (singly charged ion) ionization energies ship;
    anything else, such as Fe⁵⁺ or an anion, gives None. A species that cannot exist or
    an unknown element is refused with confspec's error, as everywhere.

    >>> ie = published_ionization_energy("Na")
    >>> ie.energy_ev, ie.provenance
    (5.1391, 'measured')
    >>> fe = published_ionization_energy("Fe+")
    >>> fe.energy_ev, published_ionization_energy("Fe5+") is None
    (16.1992, True)
    """
    kind = as_species(species)
    return _rows().get((kind.Z, kind.charge))
