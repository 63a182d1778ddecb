"""Round trip: a configuration written with holes against a reference reads back equal."""

from __future__ import annotations

from hypothesis import given
from hypothesis import strategies as st

from confspec import Configuration, Species, ground_state, parse
from confspec.data.elements import all_elements
from confspec.notation.render import ORDERS, STYLES

from .strategies import configurations, ground_like

SYMBOLS = [row.symbol for row in all_elements()]


@st.composite
def species(draw: st.DrawFn) -> Species:
    symbol = draw(st.sampled_from(SYMBOLS))
    z = SYMBOLS.index(symbol) + 1
    return Species(element=symbol, charge=draw(st.integers(Species.MIN_CHARGE, z - 1)))


@st.composite
def near(draw: st.DrawFn, reference: Configuration) -> Configuration:
    """The reference with a few electrons moved, removed or added (holes are likely), with
    some subshells written as their two relativistic j subshells."""
    occ = {(n, l): e for n, l, e in reference.occupancies}
    for _ in range(draw(st.integers(1, 3))):
        if occ and draw(st.booleans()):
            key = draw(st.sampled_from(sorted(occ)))
            occ[key] -= 1
            if not occ[key]:
                del occ[key]
        else:
            n = draw(st.integers(1, 7))
            l = draw(st.integers(0, min(n - 1, 3)))
            if occ.get((n, l), 0) < 2 * (2 * l + 1):
                occ[(n, l)] = occ.get((n, l), 0) + 1
    labels: dict[str, int] = {}
    for (n, l), e in sorted(occ.items()):
        label = f"{n}{'spdf'[l]}"
        if l and draw(st.integers(0, 4)) == 0:  # sometimes write it as two j subshells
            lower = draw(st.integers(max(0, e - (2 * l + 2)), min(e, 2 * l)))
            labels[f"{label}{2 * l - 1}/2"], labels[f"{label}{2 * l + 1}/2"] = lower, e - lower
        else:
            labels[label] = e
    # read through the parser, which merges two full j subshells into their nl subshell
    # (Configuration.from_occupancies keeps them apart, and then compares unequal)
    return parse(" ".join(f"{k}^{v}" for k, v in labels.items() if v)) if any(
        labels.values()) else Configuration()


@given(species(), st.data(), st.sampled_from(STYLES), st.sampled_from(["condense", "expand"]),
       st.sampled_from(ORDERS))
def test_holes_against_a_species_read_back(kind: Species, data: st.DataObject, style: str,
                                           core: str, order: str) -> None:
    config = data.draw(near(ground_state(kind)) | configurations(max_n=7, max_l=3))
    if not config.subshells:
        return
    text = config.format(style, core=core, order=order, reference=kind)
    assert parse(text, reference=kind) == config, text


@given(ground_like(), st.data(), st.sampled_from(STYLES), st.sampled_from(ORDERS))
def test_holes_against_a_configuration_read_back_with_their_core(
        reference: Configuration, data: st.DataObject, style: str, order: str) -> None:
    config = data.draw(near(reference))
    if not config.subshells:
        return
    text = config.format(style, core="condense", order=order, reference=reference)
    assert parse(text) == config, text


@given(ground_like(), st.data(), st.sampled_from(STYLES), st.sampled_from(ORDERS))
def test_differences_against_a_configuration_resolve_back(
        reference: Configuration, data: st.DataObject, style: str, order: str) -> None:
    # core="expand" writes only the differences; against a Configuration reference no public
    # call reads them back, so resolve them with that reference the way parse(reference=) does
    from confspec.notation.read import raw_configuration as _raw
    from confspec.notation.resolve import resolve

    base = data.draw(near(reference))
    if not base.subshells:
        return
    config = data.draw(near(base))  # the reference itself may be written with j subshells
    if not config.subshells:
        return
    text = config.format(style, core="expand", order=order, reference=base)
    quads = [(s.n, s.l, s.j2, s.electrons) for s in base.subshells]
    occupancies, errors = resolve(_raw(text), text, reference=quads)
    assert not errors
    assert Configuration.from_checked(occupancies) == config, text
