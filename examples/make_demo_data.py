"""Regenerate the demo's messy input tables (deterministic: same files on every run).

The scenario is invented: three collaborators of a small spectroscopy group each kept a table
of ground configurations of atoms and ions, and the group now merges them into one database.

- ``data/aster_lab.csv``: a CSV typed by hand: expanded and run-together spellings, lower-case
  cores, bare counts, commas, dashes.
- ``data/birch_group.tsv``: a TSV exported from a spreadsheet and re-imported once with the
  wrong encoding: superscripts, some mojibake, upper-case letters, pasted term symbols.
- ``data/cedar_team.jsonl``: JSON Lines scraped from web pages and papers: LaTeX, HTML,
  carets, holes, and every way of writing an ion's charge.

About one row in eight is genuinely wrong (Pauli violations, wrong electron counts, unknown
cores, typos, two configurations in one cell, ...). The true configurations come from the
ground-level tables shipped with confspec (NIST ASD values; see confspec/data).

Run: ``python examples/make_demo_data.py`` (needs only confspec itself).
"""

from __future__ import annotations

import csv
import io
import json
import random
from importlib import resources
from pathlib import Path

import confspec

HERE = Path(__file__).resolve().parent
DATA = HERE / "data"
SUPERSCRIPT = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")


# ------------------------------------------------------------------------------ true values
def _table(name: str) -> list[dict[str, str]]:
    text = resources.files("confspec").joinpath("data", name).read_text(encoding="utf-8")
    return list(csv.DictReader(io.StringIO(text)))


def truth() -> list[tuple[str, int, str]]:
    """(symbol, charge, canonical configuration) of measured ground states, Z <= 92."""
    rows = [(r["symbol"], 0, r["configuration"]) for r in _table("ground_levels.csv")
            if int(r["Z"]) <= 92 and r.get("status", "measured") == "measured"]
    rows += [(r["symbol"], int(r["charge"]), r["configuration"])
             for r in _table("ion_ground_levels.csv") if r.get("status", "measured") == "measured"]
    return rows


# ------------------------------------------------------------------------------ spellings
Parts = tuple[str | None, list[tuple[str, int]]]  # (core symbol, [(label, count), ...])


def parts(canonical: str, *, expand: bool = False, filling: bool = False) -> Parts:
    config = confspec.parse(canonical)
    text = config.format(core="expand" if expand else "condense",
                         order="filling" if filling else "shell")
    core = None
    if text.startswith("["):
        head, _, text = text.partition("]")
        core, text = head[1:], text.strip()
    subs = []
    for token in text.split():
        label = token[:2] if token[1].isalpha() else token[:3]
        subs.append((label, int(token[len(label):])))
    return core, subs


def join(core: str | None, body: str, *, core_fmt: str = "[{}]", gap: str = " ") -> str:
    if core is None:
        return body
    head = core_fmt.format(core)
    return head + (gap + body if body else "")


def spelled(canonical: str, style: str) -> str:
    """One configuration in one of the spellings people use."""
    if style in ("expanded", "run-together", "comma", "dash", "run-together-filling"):
        core, subs = parts(canonical, expand=True, filling=style == "run-together-filling")
    else:
        core, subs = parts(canonical, filling=style in ("filling", "caret-mixed"))
    def plain(sep: str = " ") -> str:
        return sep.join(f"{label}{count}" for label, count in subs)
    if style in ("plain", "expanded", "filling"):
        return join(core, plain())
    if style in ("run-together", "run-together-filling"):
        return join(core, plain(""))
    if style == "lower-core-run-together":
        return join(core and core.lower(), plain(""), gap="")
    if style == "bare-core":
        return join(core, plain(), core_fmt="{}")
    if style == "spaced-core":
        return join(core and core.lower(), plain(), core_fmt="[ {} ]")
    if style == "caret":
        return join(core, " ".join(f"{label}^{count}" for label, count in subs))
    if style == "caret-mixed":
        return join(core, " ".join(f"{label}^{count}" if i % 2 else f"{label}^{{{count}}}"
                                   for i, (label, count) in enumerate(subs)))
    if style == "unicode":
        return join(core, " ".join(f"{label}{str(count).translate(SUPERSCRIPT)}"
                                   for label, count in subs))
    if style == "unicode-tight":
        return join(core, "".join(f"{label}{str(count).translate(SUPERSCRIPT)}"
                                  for label, count in subs), gap="")
    if style == "html":
        return join(core, " ".join(f"{label}<sup>{count}</sup>" for label, count in subs))
    if style == "latex":
        return join(core, r"\,".join(f"{label}^{{{count}}}" for label, count in subs),
                    core_fmt=r"[\mathrm{{{}}}]", gap=r"\,")
    if style == "math":
        return join(core, " ".join(f"{label}$^{{{count}}}$" for label, count in subs))
    if style == "nist-asd":
        return join(core, plain("."), gap=".")
    if style == "middle-dot":
        return join(core, plain("·"), gap="·")
    if style == "comma":
        return join(core, plain(", "))
    if style == "dash":
        return join(core, plain("-"))
    if style == "bare-counts":
        return join(core, " ".join(f"{label} {count}" for label, count in subs))
    if style == "parenthesized":
        return join(core, " ".join(f"{label}({count})" for label, count in subs))
    raise ValueError(style)


HOLE_SPELLINGS = ("^-{n}", "^{{-{n}}}", "⁻{sup}", "(-{n})", "^(-{n})", "^−{n}")


def with_hole(species: str, rng: random.Random) -> tuple[str, str] | None:
    """A halogen or chalcogen written as holes in the next noble-gas core: F -> [Ne] 2p^-1."""
    holes = {"F": ("Ne", "2p", 1), "Cl": ("Ar", "3p", 1), "Br": ("Kr", "4p", 1),
             "I": ("Xe", "5p", 1), "O": ("Ne", "2p", 2), "S": ("Ar", "3p", 2)}
    if species not in holes:
        return None
    core, label, n = holes[species]
    mark = rng.choice(HOLE_SPELLINGS).format(n=n, sup=str(n).translate(SUPERSCRIPT)
                                             if n > 1 else "¹")
    return species, f"[{core}] {label}{mark}"


def species_spelled(symbol: str, charge: int, rng: random.Random, kind: str) -> str:
    if charge == 0:
        return symbol if rng.random() < 0.9 else f"{symbol} I"
    size = "" if abs(charge) == 1 else str(abs(charge))
    sign = "+" if charge > 0 else "-"
    roman = ["I", "II", "III", "IV", "V"][charge] if 0 < charge < 5 else None
    options = [f"{symbol}{size}{sign}", f"{symbol}{sign}{abs(charge)}"]
    if kind == "web":
        options += [f"{symbol}^{{{size}{sign}}}", f"{symbol}<sup>{size}{sign}</sup>",
                    f"{symbol}$^{{{size}{sign}}}$", f"{symbol}^({size}{sign})"]
    if kind == "sheet":
        options += [f"{symbol}{(size + sign).translate(SUPERSCRIPT)}",
                    f"{symbol}{sign * abs(charge)}"]
    if roman and charge > 0:
        options += [f"{symbol}({['0', 'I', 'II', 'III', 'IV'][charge]})",  # oxidation state
                    f"{symbol} {['I', 'II', 'III', 'IV', 'V'][charge]}"]  # spectrum: Fe III = Fe2+
    return rng.choice(options)


# ------------------------------------------------------------------------------ bad rows
def _mojibake(text: str) -> str:
    """UTF-8 bytes read as Windows-1252 (undefined bytes kept as control characters)."""
    out = []
    for byte in text.encode("utf-8"):
        try:
            out.append(bytes([byte]).decode("cp1252"))
        except UnicodeDecodeError:
            out.append(chr(byte))
    return "".join(out)


BAD_ROWS: dict[str, list[tuple[str, str, str]]] = {
    # (species, configuration, what is wrong) -- kept as comments in the generator only
    "hand": [
        ("Ne", "1s2 2s2 2p7", "Pauli: 2p holds 6"),
        ("Zn", "[Ar] 3d11 4s1", "Pauli: 3d holds 10"),
        ("Fe", "3d6 4s2", "valence only: the [Ar] core is missing (--fill-core)"),
        ("Cr", "3d5 4s1", "valence only (--fill-core)"),
        ("Fe", "[Ar] 3d7 4s2", "one electron too many for Fe"),
        ("Cu", "[Ar] 3d9 4s2", "electron count is right but..."),  # valid: not the ground state
        ("Na", "[Na] 3s1", "unknown core"),
        ("Ca", "[Ar] 4s2 3d", "typo: 3d with no count is read as 3d1 -> wrong count"),
        ("K", "1s2 2s2 2p6 3s2 3p6 4s1 4s1", "subshell written twice"),
        ("Mg", "1s2 2s2 2d6 3s2", "typo: 2d does not exist"),
        ("Al", "", "empty cell"),
        ("Si", "[Ne] 3s2 3p2 [Ar]", "two configurations in one cell"),
        ("Ti", "[Ar] 3d2 4s2 ;", "trailing separator"),
        ("Ne", "2p-1 3s1", "a dash that may be a hole"),
    ],
    "sheet": [
        ("Fe", "[Ar] 3dâ\x81¶ 4sÂ²", "mojibake (--repair-text)"),
        ("Ni", _mojibake("[Ar] 3d⁸ 4s²"), "mojibake (--repair-text)"),
        ("Co", _mojibake("[Ar] 3d⁷ 4s²"), "mojibake (--repair-text)"),
        ("Na", "1S2 2S2 2P6 3S1", "upper-case letters (--accept-uppercase)"),
        ("Fe", "5D4", "a term symbol pasted into the configuration column"),
        ("Mn", "6S5/2", "a level designation pasted into the configuration column"),
        ("O", "[He] 2s2 2p⁷", "Pauli"),
        ("FE", "[Ar] 3d⁶ 4s²", "mis-cased element symbol"),
        ("He3+", "1s1", "impossible charge"),
        ("Fe III", "[Ar] 3d⁵", "Fe III is the spectrum of Fe2+ (24 electrons), not Fe3+"),
        ("Ar", "[Xx] 3s² 3p⁶", "unknown core"),
        ("Kr", "[Ar] 3d¹⁰ 4s² 4p⁶ 4p²", "subshell written twice"),
    ],
    "web": [
        ("F", "[He] 1s^{-3}", "removes 3 electrons from a subshell that holds 2"),
        ("Ca", r"[\mathrm{Ar}]\,4s^{3}", "Pauli"),
        ("Cl-", "[Ne] 3s<sup>2</sup> 3p<sup>5</sup>", "neutral Cl's configuration for Cl-"),
        ("Fe<sup>3+</sup>", "[Ar] 3d^{6}", "Fe3+ has 23 electrons"),
        ("Sc", "[Ar] 3p^{6} 3d^{1} 4s^{2}", "a subshell the core already fills"),
        ("Cu", "[Ar] 3d$^{10}$ 4s$^{1}$ 4p", "one electron too many"),
        ("Zn", "2p110s1", "ambiguous run-together digits"),
        ("Ga", "[Ar] 3d10 4s2 4p1 <br>", "markup left in the cell"),
        ("V", "[Ar] 3j3 4s2", "typo: j is not a subshell letter"),
        ("Xe", "[Kr] 4d10 5s2 5p6 6s", "one electron too many"),
    ],
}


def rows_for(kind: str, rng: random.Random, records: list[tuple[str, int, str]],
             styles: list[str], count: int) -> list[tuple[str, str]]:
    out: list[tuple[str, str]] = []
    for _ in range(count):
        symbol, charge, canonical = rng.choice(records)
        style = rng.choice(styles)
        out.append((species_spelled(symbol, charge, rng, kind), spelled(canonical, style)))
    if kind == "web":  # holes relative to the next noble gas, and core-excited states
        for symbol in ("F", "Cl", "Br", "O", "S", "I"):
            found = with_hole(symbol, rng)
            if found:
                out.append(found)
        out += [("Na", "[Ne] 2p^-1 3s2"), ("Ne", "[Ne] 2p⁻¹ 3s¹"), ("Mg", "[Ne] 2p^{-1} 3s2 3p1")]
    bad = [(sp, cf) for sp, cf, _ in BAD_ROWS[kind]]
    for row in bad:  # spread the bad rows through the table
        out.insert(rng.randrange(len(out) + 1), row)
    return out


STYLES = {
    "hand": ["plain", "expanded", "run-together", "run-together-filling",
             "lower-core-run-together", "bare-core", "bare-counts", "comma", "dash", "filling",
             "parenthesized", "spaced-core", "nist-asd"],
    "sheet": ["unicode", "unicode-tight", "plain", "middle-dot", "filling", "expanded"],
    "web": ["caret", "caret-mixed", "html", "latex", "math", "plain", "unicode"],
}


def main() -> None:
    rng = random.Random(20240617)
    records = truth()
    DATA.mkdir(exist_ok=True)

    aster = rows_for("hand", rng, records, STYLES["hand"], 96)
    with open(DATA / "aster_lab.csv", "w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(["id", "species", "config", "checked_by"])
        for index, (species, config) in enumerate(aster, 1):
            writer.writerow([f"A{index:03d}", species, config, rng.choice(["ak", "mm", "ak", ""])])

    birch = rows_for("sheet", rng, records, STYLES["sheet"], 92)
    with open(DATA / "birch_group.tsv", "w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle, dialect="excel-tab", lineterminator="\n")
        writer.writerow(["ion", "electron configuration", "remarks"])
        for species, config in birch:
            writer.writerow([species, config, rng.choice(["", "", "from tables", "check"])])

    cedar = rows_for("web", rng, records, STYLES["web"], 90)
    with open(DATA / "cedar_team.jsonl", "w", encoding="utf-8", newline="\n") as handle:
        for index, (species, config) in enumerate(cedar):
            record = {"species": species, "configuration": config,
                      "page": f"https://example.org/atoms/{index}"}
            handle.write(json.dumps(record, ensure_ascii=False) + "\n")

    print(f"wrote {len(aster)} + {len(birch)} + {len(cedar)} rows to {DATA}")


if __name__ == "__main__":
    main()
