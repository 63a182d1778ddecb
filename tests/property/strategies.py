"""Shared hypothesis strategies: configurations built from parts, and their spellings."""

from __future__ import annotations

from hypothesis import strategies as st

from confspec import Configuration
from confspec.notation.render import CORE_MODES, ORDERS, STYLES
from confspec.physics import SUBSHELL_LETTERS, pauli_limit


@st.composite
def configurations(draw: st.DrawFn, max_n: int = 8, max_l: int = 4) -> Configuration:
    """Any valid configuration: a set of distinct subshells with occupancies in limits."""
    keys = draw(st.sets(st.tuples(st.integers(1, max_n), st.integers(0, max_l))
                        .filter(lambda k: k[1] < k[0]), min_size=1, max_size=12))
    triples = [(n, l, draw(st.integers(1, pauli_limit(l)))) for n, l in sorted(keys)]
    return Configuration.from_occupancies(triples)


@st.composite
def ground_like(draw: st.DrawFn) -> Configuration:
    """Configurations shaped like real atoms: a filled prefix of the Madelung order."""
    from confspec.physics import madelung_fill

    z = draw(st.integers(1, 118))
    config = Configuration.from_occupancies(madelung_fill(z))
    return config


format_options = st.fixed_dictionaries({
    "style": st.sampled_from(STYLES),
    "core": st.sampled_from(CORE_MODES),
    "order": st.sampled_from(ORDERS),
})

SEPARATORS = [" ", "  ", "\t", ".", ",", ", ", ";", "·", "-", "_", " - "]
OCCUPANCY_FORMS = ["{k}", "^{k}", "^{{{k}}}", "^({k})", "({k})", "<sup>{k}</sup>", "$^{{{k}}}$",
                   "{sup}", " {k}"]


@st.composite
def spellings(draw: st.DrawFn) -> tuple[str, Configuration]:
    """A configuration and a messy but valid spelling of it."""
    config = draw(configurations(max_n=7, max_l=3))
    sup = str.maketrans("0123456789", "⁰¹²³⁴⁵⁶⁷⁸⁹")
    tokens = []
    for sub in draw(st.permutations(config.subshells)):
        form = draw(st.sampled_from(OCCUPANCY_FORMS))
        k = sub.electrons
        tokens.append(f"{sub.n}{SUBSHELL_LETTERS[sub.l]}"
                      + form.format(k=k, sup=str(k).translate(sup)))
    text = tokens[0]
    for token in tokens[1:]:
        sep = draw(st.sampled_from(SEPARATORS))
        if token.split(" ")[0] != token and sep != " ":
            sep = " "
        if sep.strip() == "-" and text[-1:].isdigit() and " " in token:
            sep = " "
        text += sep + token
    return text, config


@st.composite
def relativistic_configurations(draw: st.DrawFn) -> Configuration:
    """Configurations mixing nl and nlj subshells (j = l ± 1/2, up to 2j + 1 electrons)."""
    from fractions import Fraction

    from confspec import Subshell

    keys = draw(st.sets(st.tuples(st.integers(2, 7), st.integers(1, 3))
                        .filter(lambda k: k[1] < k[0]), min_size=1, max_size=5))
    subs = []
    for n, l in sorted(keys):
        if draw(st.booleans()):
            subs.append(Subshell(n=n, l=l, electrons=draw(st.integers(1, pauli_limit(l)))))
            continue
        for j2 in (2 * l - 1, 2 * l + 1):
            if draw(st.booleans()):
                subs.append(Subshell(n=n, l=l, j=Fraction(j2, 2),
                                     electrons=draw(st.integers(1, j2 + 1))))
    if not subs:
        subs.append(Subshell(n=2, l=1, j=Fraction(3, 2), electrons=1))
    # a full pair of j subshells is the full nl subshell: build through the parser's value
    from confspec import parse

    return parse(" ".join(f"{s.label}^{s.electrons}" for s in subs))
