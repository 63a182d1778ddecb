"""``confspec ground``: the ground configuration (and level) of species, with provenance."""

from __future__ import annotations

import argparse
import json
from typing import Any

from .. import ConfspecError, parse_species
from .common import brief, chemistry_function, indent, provenance, say

__all__ = ["run"]


def run(args: argparse.Namespace) -> int:
    """One line per species plus its provenance; 1 when any species is unreadable or unknown."""
    ground_level = chemistry_function("ground_level")
    if ground_level is None:
        from ..cleaning import InputError

        raise InputError("ground states are not in this build of confspec")
    status = 0
    as_json = bool(getattr(args, "json", False))
    found: list[dict[str, Any]] = []
    for text in args.species:
        try:
            species = parse_species(text)
        except ConfspecError as err:
            found.append({"input": text, "error": {"code": err.code, "message": err.message}})
            if not as_json:
                say(f"{text}:")
                say(indent(err.render(), 2))
            status = 1
            continue
        try:
            level = ground_level(species)
        except (ConfspecError, LookupError, ValueError) as err:
            code = err.code if isinstance(err, ConfspecError) else "no-reference-data"
            found.append({"input": text, "species": str(species),
                          "error": {"code": code, "message": brief(err)}})
            if not as_json:
                say(f"{species!s:<7} not known: {brief(err)}")
            status = 1
            continue
        config = level.configuration
        shown = config.format(style=args.style) if config.subshells else "(no electrons)"
        term = getattr(level, "term", None)
        found.append({"input": text, "species": str(species),
                      "configuration": config.format(style=args.style),
                      "term": None if term is None else str(term),
                      "provenance": str(getattr(level, "provenance", "") or "") or None,
                      "source": getattr(level, "source", None),
                      "explanation": provenance(level)})
        if not as_json:
            say(f"{species!s:<7} {shown}" + (f"  {term}" if term is not None else ""))
            say(f"{'':<7} {provenance(level)}")
    if as_json:
        say(json.dumps(found, ensure_ascii=False, indent=2, default=str))
    return status
