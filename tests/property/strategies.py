"""Shared hypothesis strategies: configurations built from parts, and their spellings."""

from __future__ import annotations

from hypothesis import strategies as st

from confspec import Configuration
from confspec._format import CORE_MODES, ORDERS, STYLES
from confspec._physics import SUBSHELL_LETTERS, pauli_limit


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
    from confspec._physics import madelung_fill

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
