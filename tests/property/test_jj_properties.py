"""jj coupling: the J levels of any nlj configuration carry every microstate exactly once."""

from __future__ import annotations

import math
from fractions import Fraction

from hypothesis import given
from hypothesis import strategies as st

from confspec import Configuration, jj_levels, parse


@st.composite
def jj_configurations(draw: st.DrawFn) -> tuple[Configuration, int]:
    """One to three nlj subshells (l ≤ 3) and their microstate count, the product over the
    subshells of C(2j + 1, k) (Pauli: one electron per m state; common practice, no source)."""
    keys = draw(st.sets(st.tuples(st.integers(2, 6), st.integers(1, 3), st.sampled_from([-1, 1]))
                        .filter(lambda k: k[1] < k[0]), min_size=1, max_size=3))
    parts, states = [], 1
    for n, l, sign in sorted(keys):
        j2 = 2 * l + sign
        k = draw(st.integers(1, j2 + 1))
        parts.append(f"{n}{'spdf'[l]}{j2}/2^{k}")
        states *= math.comb(j2 + 1, k)
    return parse(" ".join(parts)), states


@given(jj_configurations())
def test_weights_of_j_levels_add_up_to_the_microstates(case: tuple[Configuration, int]) -> None:
    config, states = case
    levels = jj_levels(config)
    assert sum((2 * J + 1) * n for J, n in levels.items()) == states
    assert all(n > 0 and (2 * J).denominator == 1 for J, n in levels.items())
    parity_of_count = config.electron_count % 2
    assert all(parity_of_count == (2 * J) % 2 for J in levels)  # odd electrons, half-integer J
    assert isinstance(next(iter(levels)), Fraction)
