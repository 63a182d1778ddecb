"""Realistic configuration strings for benchmarks: atoms, ions and excited states of
Z = 1–118 written in the notations real tables use (deterministic, seeded)."""

from __future__ import annotations

import random

from confspec import Configuration
from confspec.physics import madelung_fill

_SUP = str.maketrans("0123456789", "⁰¹²³⁴⁵⁶⁷⁸⁹")


def _spell(config: Configuration, rng: random.Random) -> str:
    style = rng.choice(["plain", "plain", "plain", "expand", "run", "caret", "unicode", "nist-asd",
                        "html", "braces", "filling", "run-core"])
    if style == "plain":
        return config.format()
    if style == "expand":
        return config.format(core="expand")
    if style == "filling":
        return config.format(order="filling")
    if style == "caret":
        return config.format(style="caret", order=rng.choice(["shell", "filling"]))
    if style == "unicode":
        return config.format(style="unicode")
    if style == "nist-asd":
        return config.format(style="nist-asd", core="expand")
    if style == "html":
        return config.format(style="html")
    if style == "braces":
        return config.format(style="latex").replace(r"\,", " ").replace(r"\mathrm{", "").replace(
            "}]", "]")
    if style.startswith("run") and any(sub.n >= 10 for sub in config.subshells):
        return config.format()  # run-together text needs single-digit n to be unambiguous
    if style == "run":
        return config.format(core="expand", order="filling").replace(" ", "")
    return config.format().replace(" ", "")  # run-core: [Ar]3d64s2


def realistic_strings(count: int = 12_000, seed: int = 20261202) -> list[str]:
    """``count`` distinct strings (a mix of notations of atoms, ions and excitations)."""
    rng = random.Random(seed)
    seen: set[str] = set()
    out: list[str] = []
    while len(out) < count:
        z = rng.randint(1, 118)
        base = dict(((n, l), e) for n, l, e in madelung_fill(z))
        # ions and single/double excitations: move electrons between nearby subshells
        for _ in range(rng.choice([0, 0, 1, 1, 2, 3])):
            keys = [k for k, e in base.items() if e]
            if not keys:
                break
            n, l = rng.choice(keys)
            base[(n, l)] -= 1
            if rng.random() < 0.6:
                target = (n + rng.randint(0, 3), rng.randint(0, 3))
                if target[1] < target[0] and base.get(target, 0) < 2 * (2 * target[1] + 1):
                    base[target] = base.get(target, 0) + 1
        config = Configuration.from_occupancies([(n, l, e) for (n, l), e in base.items() if e]) \
            if any(base.values()) else None
        if config is None:
            continue
        text = _spell(config, rng)
        if text and text not in seen:
            seen.add(text)
            out.append(text)
    return out
