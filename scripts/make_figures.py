"""Draw the plots of the documentation site into docs/figures/ (run by ``make docs``).

Every number comes from confspec itself: Slater and Clementi–Raimondi effective charges
from ``confspec.descriptors`` / ``confspec.effective_charge``, radial densities from
``confspec.radial_density``. The files are written with fixed metadata so that a rebuild
with the same library versions gives the same bytes.

    python scripts/make_figures.py [--out DIR]
"""

from __future__ import annotations

import argparse
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt
from matplotlib.figure import Figure

import confspec

ROOT = Path(__file__).resolve().parent.parent
DEFAULT_OUT = ROOT / "docs" / "figures"

plt.rcParams.update({
    "font.size": 11,
    "axes.titlesize": 12,
    "axes.grid": True,
    "grid.alpha": 0.3,
    "savefig.dpi": 150,
    "svg.hashsalt": "confspec",
})


def _save(fig: Figure, path: Path) -> Path:
    fig.tight_layout()
    fig.savefig(path, metadata={"Software": None})
    plt.close(fig)
    return path


def _symbol(Z: int) -> str:
    return confspec.Element.model_validate(Z).symbol


# ---------------------------------------------------------------------------- Zeff
def zeff_outermost(out: Path) -> Path:
    """Zeff of the outermost electron, Z = 1–86: Slater's rules beside Clementi–Raimondi."""
    zs = list(range(1, 87))
    rows = [confspec.descriptors(_symbol(Z)) for Z in zs]
    slater = [float(row["zeff_slater"] or 0.0) for row in rows]  # every atom has one
    fitted = [(Z, float(row["zeff_clementi_raimondi"] or 0.0))
              for Z, row in zip(zs, rows, strict=True)
              if row["zeff_clementi_raimondi"] is not None]
    fig, ax = plt.subplots(figsize=(9, 4.8))
    ax.plot(zs, slater, "-o", ms=3.5, lw=1.2, color="tab:blue",
            label="Slater's rules (1930), Z = 1–86")
    ax.plot([z for z, _ in fitted], [v for _, v in fitted], "s", ms=4.5, mfc="none",
            color="tab:red", label="Clementi & Raimondi (1963): the shipped table covers "
                                   "Z = 1–36 only")
    for Z in (2, 10, 18, 36, 54):  # period ends: noble gases
        ax.axvline(Z + 0.5, color="grey", lw=0.8, ls=":")
    for Z in (3, 11, 19, 37, 55):
        ax.annotate(_symbol(Z), (Z, slater[Z - 1]), textcoords="offset points",
                    xytext=(0, -14), ha="center", fontsize=9)
    for Z in (10, 18, 36, 54, 86):
        ax.annotate(_symbol(Z), (Z, slater[Z - 1]), textcoords="offset points",
                    xytext=(0, 6), ha="center", fontsize=9)
    ax.annotate("Pd: outermost is 4d¹⁰ (no 5s)", (46, slater[45]), xytext=(48, 9.8),
                fontsize=9, ha="center", arrowprops={"arrowstyle": "->", "color": "grey"})
    top = max([*slater, *(v for _, v in fitted)])
    ax.set_xlim(0, 87)
    ax.set_ylim(0, top + 1.2)
    ax.set_xlabel("atomic number Z")
    ax.set_ylabel("effective nuclear charge $Z_\\mathrm{eff}$ (units of e)")
    ax.set_title("Effective nuclear charge felt by the outermost electron (ground-state atoms)")
    ax.legend(loc="lower right", fontsize=9)
    return _save(fig, out / "zeff-outermost.png")


# ---------------------------------------------------------------------------- 4s vs 3d
#: K and Ca hold no 3d electron in their ground state; their 3d point is computed for the
#: lowest configuration with one electron moved from 4s to 3d.
_PROMOTED = {"K": "[Ar] 3d1", "Ca": "[Ar] 3d1 4s1"}


def slater_4s_3d(out: Path) -> Path:
    """Slater orbital-energy estimates of 4s and 3d from K to Zn."""
    symbols = [_symbol(Z) for Z in range(19, 31)]
    e4s = [confspec.effective_charge(s, "4s").orbital_energy() for s in symbols]
    e3d = [confspec.effective_charge(s, "3d", configuration=_PROMOTED.get(s)).orbital_energy()
           for s in symbols]
    x = list(range(len(symbols)))
    fig, ax = plt.subplots(figsize=(8.5, 4.8))
    ax.plot(x, e4s, "-o", color="tab:blue", label="4s (ground configuration)")
    ax.plot(x[2:], e3d[2:], "-s", color="tab:orange", label="3d (ground configuration)")
    ax.plot(x[:2], e3d[:2], "s", mfc="none", color="tab:orange",
            label="3d with one electron moved from 4s (K, Ca)")
    ax.plot(x[1:3], e3d[1:3], ":", color="tab:orange")
    ax.set_xticks(x, symbols)
    ax.set_xlabel("element (Z = 19–30)")
    ax.set_ylabel("orbital energy estimate (eV)")
    ax.set_title("Slater's rules: 4s and 3d orbital energies, −R∞hc (Z$_\\mathrm{eff}$/n*)²")
    ax.legend(loc="lower left", fontsize=9, title_fontsize=9,
              title="rough estimates: Slater's rules overstate how deep 3d lies")
    # a zoom on K–Ti, where 3d crosses below 4s
    zoom = ax.inset_axes((0.06, 0.36, 0.33, 0.26))
    zoom.plot(x[:4], e4s[:4], "-o", color="tab:blue", ms=4)
    zoom.plot(x[2:4], e3d[2:4], "-s", color="tab:orange", ms=4)
    zoom.plot(x[:2], e3d[:2], "s", mfc="none", color="tab:orange", ms=4)
    zoom.plot(x[1:3], e3d[1:3], ":", color="tab:orange")
    zoom.set_xticks(x[:4], symbols[:4], fontsize=8)
    zoom.tick_params(axis="y", labelsize=8)
    zoom.set_ylim(-23, 0)
    zoom.set_title("zoom (eV): 3d falls below 4s from Sc on", fontsize=9)
    return _save(fig, out / "slater-4s-3d.png")


# ---------------------------------------------------------------------------- penetration
def radial_densities(out: Path) -> Path:
    """Hydrogen-like radial probability densities of 2s, 2p (top) and 3s, 3p, 3d (bottom)."""
    fig, (top, bottom) = plt.subplots(2, 1, figsize=(8.5, 7.2))
    panels = [(top, ["2s", "2p"], 15.0), (bottom, ["3s", "3p", "3d"], 28.0)]
    colors = {"s": "tab:blue", "p": "tab:orange", "d": "tab:green"}
    for ax, subshells, r_max in panels:
        steps = 1200
        rs = [r_max * i / steps for i in range(steps + 1)]
        for label in subshells:
            ys = [confspec.radial_density(label, r) for r in rs]
            color = colors[label[-1]]
            ax.plot(rs, ys, color=color, lw=1.8, label=f"{label}")
            for node in confspec.radial_nodes(label):
                ax.plot([node], [0], "v", color=color, ms=7, clip_on=False, zorder=5)
        ax.set_xlim(0, r_max)
        ax.set_ylim(bottom=0)
        ax.set_xlabel("distance from the nucleus r (units of the Bohr radius $a_0$)")
        ax.set_ylabel("$P(r) = r^2 R_{nl}(r)^2$  (1/$a_0$)")
        ax.legend(title="hydrogen, Z = 1", fontsize=9, title_fontsize=9)
    top.set_title("Radial probability densities: the s electron penetrates closest "
                  "to the nucleus")
    top.annotate("2s inner lobe:\npenetration", xy=(0.76, 0.054), xytext=(0.15, 0.105),
                 fontsize=9, arrowprops={"arrowstyle": "->", "color": "grey"})
    for text, lobe in (("3s inner lobes", (0.74, 0.016)), ("", (4.2, 0.04))):
        bottom.annotate(text, xy=lobe, xytext=(0.3, 0.066), fontsize=9,
                        arrowprops={"arrowstyle": "->", "color": "grey"})
    bottom.text(0.99, 0.95, "▼ radial nodes: n − l − 1 of them", transform=bottom.transAxes,
                ha="right", va="top", fontsize=9, color="dimgrey")
    return _save(fig, out / "radial-densities.png")


# ---------------------------------------------------------------------------- SCF densities
def scf_radial_densities(out: Path) -> Path:
    """3d and 4s radial densities: hydrogen (top) beside computed SCF ones (spherically
    averaged LDA) of K and Fe, with hydrogen-like curves of the same mean radius dashed."""
    colors = {"3d": "tab:green", "4s": "tab:blue"}
    fig, axes = plt.subplots(3, 1, figsize=(8.5, 10.2))
    steps = 1500
    rs_h = [40.0 * i / steps for i in range(steps + 1)]
    for label in ("4s", "3d"):
        axes[0].plot(rs_h, [confspec.radial_density(label, r) for r in rs_h],
                     color=colors[label], lw=1.8, label=f"{label}, hydrogen (Z = 1)")
    axes[0].set_title("Hydrogen-like (one electron, Z = 1): 3d lies inside 4s", fontsize=11)
    axes[0].set_xlim(0, 40)
    cases = [(axes[1], "K", "[Ar] 4s1", "[Ar] 3d1", 16.0),
             (axes[2], "Fe", "[Ar] 3d6 4s2", None, 8.0)]
    for ax, symbol, config, promoted, r_max in cases:
        ground = confspec.scf(config, species=symbol)
        excited = confspec.scf(promoted, species=symbol) if promoted else ground
        for label, result in (("4s", ground), ("3d", excited)):
            orb = result.orbitals[label]
            rs = [r for r in result.radii if r <= r_max]
            where = "" if result is ground else f" in {result.configuration}"
            ax.plot(rs, [p * p for p in orb.radial[: len(rs)]], color=colors[label], lw=1.9,
                    label=f"{label} SCF{where}: ⟨r⟩ = {orb.mean_radius_bohr:.2f} bohr")
            zeff = orb.effective_charge
            ax.plot(rs, [confspec.radial_density(label, r, Z=zeff) for r in rs],
                    color=colors[label], lw=1.0, ls="--",
                    label=f"{label} hydrogen-like, Z = {zeff:.2f} (same ⟨r⟩)")
        ax.set_xlim(0, r_max)
        ax.set_title(f"{symbol}: computed (spherically averaged LDA, an approximation), "
                     f"ground {config}", fontsize=11)
    for ax in axes:
        ax.set_ylim(bottom=0)
        ax.set_xlabel("distance from the nucleus r (bohr)")
        ax.set_ylabel("$P(r)^2 = r^2 R(r)^2$  (1/bohr)")
        ax.legend(fontsize=8.5, loc="upper right")
    axes[1].annotate("4s inner lobes reach into the [Ar] core (penetration);\n"
                     "3d barely does, so it feels Z ≈ 1 and lies outside 4s",
                     xy=(0.8, 0.045), xytext=(1.2, 0.26), fontsize=9,
                     arrowprops={"arrowstyle": "->", "color": "grey"})
    axes[2].annotate("at Fe the 3d has contracted inside 4s", xy=(0.9, 0.75),
                     xytext=(2.2, 0.8), fontsize=9,
                     arrowprops={"arrowstyle": "->", "color": "grey"})
    return _save(fig, out / "scf-radial-densities.png")

FIGURES = (zeff_outermost, slater_4s_3d, radial_densities, scf_radial_densities)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--out", type=Path, default=DEFAULT_OUT, help="output folder")
    args = parser.parse_args(argv)
    out: Path = args.out
    out.mkdir(parents=True, exist_ok=True)
    for draw in FIGURES:
        path = draw(out)
        print(f"wrote {path.relative_to(ROOT) if path.is_relative_to(ROOT) else path}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
