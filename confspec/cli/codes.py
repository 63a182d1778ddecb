"""``confspec codes``: the error codes, what triggers each one and how to fix it."""

from __future__ import annotations

import argparse
import difflib
import json
import sys

from .. import ERROR_CODES
from .common import say

__all__ = ["run"]


def run(args: argparse.Namespace) -> int:
    """List every error code, or the codes named; 2 when a name is not a code."""
    wanted: list[str] = list(getattr(args, "code", None) or ERROR_CODES)
    for code in wanted:
        if code not in ERROR_CODES:
            close = difflib.get_close_matches(code, list(ERROR_CODES), n=1)
            hint = f"; did you mean {close[0]!r}?" if close else ""
            say(f"confspec codes: error: {code!r} is not an error code{hint} (`confspec "
                "codes` lists them all)", sys.stderr)
            return 2
    if getattr(args, "json", False):
        say(json.dumps([{"code": code, "kind": ERROR_CODES[code].kind,
                         "trigger": ERROR_CODES[code].trigger, "fix": ERROR_CODES[code].fix}
                        for code in wanted], ensure_ascii=False, indent=2))
        return 0
    for code in wanted:
        info = ERROR_CODES[code]
        say(f"{code}  ({info.kind})")
        say(f"    when: {info.trigger}")
        say(f"    fix:  {info.fix}")
    return 0
