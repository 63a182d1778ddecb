"""``confspec scf``: SCF total energies and ΔSCF ionization energies of species, and the SCF
section of ``confspec show --scf``. Every number is computed (spherically averaged LDA), an
approximation, and is printed as such; numpy and scipy are loaded only when one runs."""

from __future__ import annotations

import argparse
import json
import sys
import time
from typing import IO, Any

from .. import ConfspecError, SCFResult, parse_species, scf
from ..chemistry.scf import SCF_METHOD, SCFDifference, ionization_energy
from .common import brief, indent, say

__all__ = ["run", "scf_section"]

_LABEL = "computed (spherically averaged LDA)"


class _Progress:
    """``[3/10] Fe`` on stderr while species are computed, only on a terminal (or asked)."""

    def __init__(self, total: int, enabled: bool | None, stream: IO[str] | None = None) -> None:
        self.stream = stream or sys.stderr
        self.total = total
        self.enabled = (self.stream.isatty() if enabled is None else enabled) and total > 1
        self._start = time.monotonic()

    def update(self, done: int, name: str) -> None:
        if self.enabled:
            elapsed = time.monotonic() - self._start
            self.stream.write(f"\r  [{done}/{self.total}] {name:<8} {elapsed:6.1f} s ")
            self.stream.flush()

    def done(self) -> None:
        if self.enabled:
            self.stream.write("\r" + " " * 40 + "\r")
            self.stream.flush()


def run(args: argparse.Namespace) -> int:
    """One line per species: ground configuration, total energy, ΔSCF ionization energy.
    Returns 1 when any species is unreadable or its SCF fails (the others still print)."""
    choice = args.progress
    progress = _Progress(len(args.species), None if choice == "auto" else choice == "always")
    rows: list[dict[str, Any]] = []
    for index, text in enumerate(args.species, 1):
        progress.update(index, text)
        rows.append(_one(text))
    progress.done()
    if args.json:
        sys.stdout.write(json.dumps(rows, ensure_ascii=False, indent=2) + "\n")
    else:
        _table(rows)
    return 1 if any(row["error"] for row in rows) else 0


def _one(text: str) -> dict[str, Any]:
    row: dict[str, Any] = {"input": text, "species": None, "configuration": None,
                           "total_energy_hartree": None, "ion": None, "ion_configuration": None,
                           "ion_total_energy_hartree": None, "ionization_energy_hartree": None,
                           "ionization_energy_ev": None, "iterations": None,
                           "provenance": "computed", "method": SCF_METHOD, "caution": None,
                           "error": None}
    try:
        species = parse_species(text)
        row["species"] = str(species)
        if species.charge < species.Z:
            diff: SCFDifference = ionization_energy(species)
            result = diff.initial
            row.update(ion=str(diff.final.species),
                       ion_configuration=str(diff.final.configuration),
                       ion_total_energy_hartree=diff.final.total_energy,
                       ionization_energy_hartree=diff.hartree, ionization_energy_ev=diff.ev)
        else:
            result = scf(species)
        row.update(configuration=str(result.configuration),
                   total_energy_hartree=result.total_energy, iterations=result.iterations,
                   caution=result.caution)
    except ConfspecError as err:
        row["error"] = {"code": err.code, "message": err.message}
    return row


def _table(rows: list[dict[str, Any]]) -> None:
    say(f"{'species':<8} {'configuration':<24} {'E_total (hartree)':>18} "
        f"{'ΔSCF IE (eV)':>13}  ion configuration")
    cautions: list[str] = []
    for row in rows:
        name = row["species"] or row["input"]
        if row["error"]:
            say(f"{name:<8} error: {row['error']['message']} [{row['error']['code']}]")
            continue
        ie = "-" if row["ionization_energy_ev"] is None else f"{row['ionization_energy_ev']:.4f}"
        ion = row["ion_configuration"] if row["ion"] else "(no electron to remove)"
        say(f"{name:<8} {row['configuration'] or '(no electrons)':<24} "
            f"{row['total_energy_hartree']:>18.6f} {ie:>13}  {ion or '(no electrons)'}")
        if row["caution"] and row["caution"] not in cautions:
            cautions.append(row["caution"])
    say(f"all values {_LABEL}: {SCF_METHOD}; ΔSCF IE = E(X+) − E(X), both in the ground "
        "configurations of confspec.ground_state; 1 hartree = 27.211386245988 eV (CODATA 2018)")
    for caution in cautions:
        say(indent(f"caution: {caution}", 2))


def scf_section(config: Any, species: Any) -> list[str]:
    """Lines of the ``show --scf`` section: total energy and, per orbital, energy and radii."""
    head = f"  SCF            {_LABEL}, an approximation, not measured"
    try:
        result: SCFResult = scf(config, species=species)
    except ConfspecError as err:
        return [head, f"    not available: {brief(err)}"]
    ratio = "-" if result.virial_ratio is None else f"{result.virial_ratio:.6f}"
    lines = [head,
             f"    species        {result.species}",
             f"    total energy   {result.total_energy:.6f} hartree "
             f"({result.total_energy_ev:.3f} eV); −V/T = {ratio}",
             f"    converged      {result.iterations} iterations, density residual "
             f"{result.residual:.2g} electrons",
             f"    {'orbital':<8} {'ε (hartree)':>12} {'ε (eV)':>10} {'⟨r⟩ (bohr)':>11} "
             f"{'r_max (bohr)':>12} {'Z_eff':>7}"]
    for orb in result.orbitals.values():
        lines.append(f"    {orb.label + str(orb.occupancy):<8} {orb.energy_hartree:>12.6f} "
                     f"{orb.energy_ev:>10.3f} {orb.mean_radius_bohr:>11.4f} "
                     f"{orb.outer_maximum_bohr:>12.4f} {orb.effective_charge:>7.3f}")
    lines.append(indent(f"caution: {result.caution}", 4))
    lines.append("    (ε: Kohn–Sham eigenvalue; r_max: outermost maximum of P(r)²; Z_eff from "
                 "⟨r⟩ = [3n² − l(l+1)]/(2 Z_eff))")
    return lines
