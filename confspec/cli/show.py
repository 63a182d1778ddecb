"""``confspec show``: everything about one configuration (or level designation): canonical
forms, electron count, problems with carets, orbital boxes and the chemistry of this build."""

from __future__ import annotations

import argparse
import json
from collections.abc import Callable
from typing import Any

from .. import ConfspecError, Element, parse, parse_level, parse_species, validate_level
from .. import validate as validate_text
from ..notation.render import STYLES
from ..physics import implied_inner_subshells
from .common import brief, chemistry_function, indent, provenance, say

__all__ = ["run"]


def run(args: argparse.Namespace) -> int:
    """Describe ``args.text``; 0 when it has no problems, 1 otherwise."""
    text: str = args.text
    species_text: str | None = args.species
    problems = validate_text(text, species_text, accept_uppercase=args.accept_uppercase)
    rows: list[tuple[str, str]] = []
    try:
        config = parse(text, reference=None if species_text is None else _try_species(
            species_text), accept_uppercase=args.accept_uppercase)
    except ConfspecError:
        config = None
    level = None
    if config is None:  # perhaps a level designation: 3d6(5D)4s 6D9/2
        try:
            level = parse_level(text, accept_uppercase=args.accept_uppercase)
        except ConfspecError:
            level = None
        if level is not None:
            config = level.configuration
            problems = validate_level(level, species_text)
            if species_text is None and level.species is not None:
                species_text = str(level.species)
    as_json = bool(getattr(args, "json", False))
    if not as_json:
        say(f"input          {text!r}")
    if level is not None:
        rows.append(("level", level.format()))
        if level.term is not None:
            j = "" if level.J is None else f", J = {level.J}, statistical weight " \
                f"{level.statistical_weight}"
            rows.append(("term", f"{level.term}{j}"))
        for parent in level.parents:
            rows.append(("parent", f"{parent} of {' '.join(parent.subshells)}"))
    if config is not None:
        rows.append(("canonical", str(config)))
        rows.append(("expanded", config.format(core="expand")))
        rows.append(("filling order", config.format(order="filling")))
        for style in STYLES:
            if style != "plain":
                rows.append((style, config.format(style=style)))
        rows.append(("electrons", str(config.electron_count)))
        rows.append(("parity", config.parity))
        open_shells = " ".join(str(s) for s in config.open_subshells) or "none (closed shells)"
        rows.append(("open subshells", open_shells))
        rows.append(("unpaired", f"{config.unpaired_electrons} (Hund's first rule, "
                                  "per open subshell)"))
    species = _try_species(species_text) if species_text else None
    if species is not None:
        detail = f"{species} ({species.name}, Z = {species.Z}, {species.electron_count} electrons)"
        if config is not None:
            same = config.electron_count == species.electron_count
            detail += "; electron count " + ("matches" if same else
                                             f"does not match ({config.electron_count})")
        rows.append(("species", detail))
    if as_json:
        say(json.dumps(_as_json(text, config, level, species, problems), ensure_ascii=False,
                       indent=2))
        return 1 if problems else 0
    for label, value in rows:
        say(f"  {label:<14} {value}")
    if config is not None and config.subshells:
        from ..diagrams import box_diagram_text

        say("  orbital boxes (filling order; arrows by Hund's rule):")
        say(indent(box_diagram_text(config, order="filling"), 4))
    if config is not None:
        _show_chemistry(config, species, from_level=level is not None)
    if config is not None and getattr(args, "scf", False):
        from .scf import scf_section

        for line in scf_section(config, species):
            say(line)
    if problems:
        say(f"problems ({len(problems)}):")
        for err in problems:
            say(indent(err.render(), 2))
        return 1
    say("no problems")
    return 0


def _as_json(text: str, config: Any, level: Any, species: Any,
             problems: list[ConfspecError]) -> dict[str, Any]:
    """What ``show`` prints, as data (``--json``); absent facts are null."""
    out: dict[str, Any] = {"input": text, "valid": not problems, "level": None,
                           "configuration": None, "species": None}
    if level is not None:
        out["level"] = {
            "canonical": level.format(),
            "term": None if level.term is None else str(level.term),
            "J": None if level.J is None else str(level.J),
            "statistical_weight": None if level.J is None else level.statistical_weight,
            "parents": [{"term": str(p), "subshells": list(p.subshells)}
                        for p in level.parents]}
    if config is not None:
        out["configuration"] = {
            "canonical": str(config), "expanded": config.format(core="expand"),
            "filling_order": config.format(order="filling"),
            "styles": {style: config.format(style=style) for style in STYLES},
            "electrons": config.electron_count, "parity": config.parity,
            "open_subshells": [str(s) for s in config.open_subshells],
            "unpaired": config.unpaired_electrons}
    if species is not None:
        out["species"] = {
            "symbol": str(species), "name": species.name, "Z": species.Z,
            "electrons": species.electron_count,
            "electron_count_matches": None if config is None
            else config.electron_count == species.electron_count}
    out["problems"] = [{"code": e.code, "kind": e.kind, "message": e.message,
                        "position": e.position} for e in problems]
    return out


def _try_species(text: str) -> Any:
    try:
        return parse_species(text)
    except ConfspecError:
        return None


def _show_chemistry(config: Any, species: Any, *, from_level: bool = False) -> None:
    """Ground-state comparison, terms, Hund term and Slater shielding (where this build has
    the chemistry layer). Without a species, a whole configuration (one that starts at 1s)
    is compared with the neutral atom of its electron count, and says so; a level
    designation or a configuration without its inner shells names no element (tables leave
    closed shells out), so the species stays unknown."""
    lines: list[str] = []
    assumed = ""
    whole = any(sub.n == 1 for sub in config.subshells)
    if species is None and config.electron_count > 0 and whole and not from_level:
        try:
            species = parse_species(_element_symbol(config.electron_count))
            assumed = " (assumed: the neutral atom with this many electrons)"
        except (ConfspecError, LookupError):
            species = None
    elif species is None:
        why = ("a level designation does not name its element" if from_level else
               "the inner shells are not written, so the electron count names no element")
        lines.append(f"  species        unknown ({why});")
        lines.append(f"  {'':<14} give --species for the ground state and shielding")
    if species is not None and config.electron_count != species.electron_count:
        inner = implied_inner_subshells({(sub.n, sub.l) for sub in config.subshells},
                                        species.electron_count - config.electron_count)
        if inner:  # tables leave closed inner shells out: the chemistry needs them back
            core = type(config).from_checked(list(inner))
            config = type(config).from_checked([*inner, *config.occupancies])
            lines.append(f"  inner shells   {core.format(core='expand')} implied (closed and "
                         f"not written, as level tables do): {config}")
    ground_level = chemistry_function("ground_level")
    if species is not None and ground_level is not None:
        try:
            level = ground_level(species)
            same = level.configuration.occupancies == config.occupancies
            lines.append(f"  ground state   {species}{assumed}: {level.configuration}"
                         + (f" {level.term}" if getattr(level, "term", None) else "")
                         + ("  <- this configuration" if same else "  (this one is not it)"))
            lines.append(f"  {'':<14} {provenance(level)}")
        except (ConfspecError, LookupError, ValueError) as err:
            lines.append(f"  ground state   not known ({brief(err)})")
    hund = chemistry_function("hund_ground_term")
    if hund is not None:
        try:
            lines.append(f"  Hund term      {hund(config)}  (Hund's rules: the lowest term of "
                         "this configuration, an estimate)")
        except (ConfspecError, ValueError) as err:
            lines.append(f"  Hund term      not available ({brief(err)})")
    terms = chemistry_function("terms")
    if terms is not None:
        try:
            found = list(terms(config))
            shown = " ".join(str(t) for t in found[:20])
            more = f" … ({len(found)} terms)" if len(found) > 20 else ""
            lines.append(f"  terms          {shown}{more}")
        except (ConfspecError, ValueError) as err:
            lines.append(f"  terms          not available ({brief(err)})")
    zeff = chemistry_function("effective_charge")
    if zeff is not None and species is not None:
        lines.extend(_shielding_lines(zeff, config, species))
    if not lines:
        lines.append("  (ground states, terms and shielding: not in this build)")
    for line in lines:
        say(line)


def _element_symbol(z: int) -> str:
    return str(Element.model_validate(z).symbol)


def _shielding_lines(zeff: Callable[..., Any], config: Any, species: Any) -> list[str]:
    lines = [f"  shielding      Slater's rules for {species} (an estimate; Z_eff = Z - S):"]
    cautions: list[str] = []
    for sub in config.subshells:
        try:
            result = zeff(species, sub.label, configuration=config, model="slater")
        except (ConfspecError, ValueError, TypeError) as err:
            return [f"  shielding      not available ({brief(err)})"]
        parts = " + ".join(str(c) for c in getattr(result, "contributions", ()))
        lines.append(f"    {sub.label:<4} Z_eff = {result.zeff:6.2f}   S = {result.sigma:6.2f}"
                     + (f" = {parts}" if parts else ""))
        for caution in str(getattr(result, "caution", "") or "").split("; "):
            if caution and caution not in cautions:
                cautions.append(caution)
    lines.extend(f"    caution: {caution}" for caution in cautions)
    return lines
