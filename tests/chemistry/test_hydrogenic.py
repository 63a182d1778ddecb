"""Hydrogen-like radial functions against their textbook properties and a test-only oracle.

Bohr radius: CODATA recommended value via scipy.constants (test-only oracle). Integrals by
scipy.integrate.quad; the Laguerre polynomials of the oracle by scipy.special.genlaguerre.
"""

from __future__ import annotations

import itertools
import math

import pytest
from hypothesis import given
from hypothesis import strategies as st
from scipy import constants, integrate, special

from confspec import ConfspecError, radial_density, radial_function, radial_nodes

#: CODATA Bohr radius in metres (scipy.constants, test-only oracle).
A0 = constants.physical_constants["Bohr radius"][0]

SUBSHELLS = [(n, l) for n in range(1, 7) for l in range(n)]


def _integral(f, scale: float, epsabs: float = 0.0) -> float:  # type: ignore[no-untyped-def]
    """∫₀^∞ f(r) dr, split at the scale of the function so quad sees every lobe."""
    edges = [0.0, scale, 5 * scale, 20 * scale, 60 * scale, 200 * scale]
    total = 0.0
    for lo, hi in itertools.pairwise(edges):
        total += integrate.quad(f, lo, hi, limit=400, epsabs=epsabs, epsrel=1e-12)[0]
    return total + integrate.quad(f, edges[-1], math.inf, limit=200, epsabs=epsabs)[0]


@pytest.mark.parametrize(("n", "l"), [pytest.param(n, l, id=f"{n}{'spdfgh'[l]}")
                                      for n, l in SUBSHELLS])
@pytest.mark.parametrize("Z", [1, 2, 3.5])
def test_normalization_in_si_units(n: int, l: int, Z: float) -> None:
    # ∫ r² R_nl² dr = 1 (textbook normalization), with r in metres and a0 from CODATA
    scale = n * n * A0 / Z
    norm = _integral(lambda r: radial_density((n, l), r, Z=Z, a0=A0), scale)
    assert norm == pytest.approx(1.0, rel=1e-9)


@pytest.mark.parametrize(("n", "l"), SUBSHELLS)
def test_mean_radius(n: int, l: int) -> None:
    # <r> = a0 / (2Z) [3n² − l(l + 1)] (textbook result, from memory)
    Z = 2.0
    mean = _integral(lambda r: r * radial_density((n, l), r, Z=Z), n * n / Z)
    assert mean == pytest.approx((3 * n * n - l * (l + 1)) / (2 * Z), rel=1e-9)


@pytest.mark.parametrize("l", [0, 1, 2])
def test_functions_of_one_l_are_orthogonal(l: int) -> None:
    # eigenfunctions of one radial Hamiltonian (fixed l) are orthogonal (common practice)
    for n1 in range(l + 1, 6):
        for n2 in range(n1 + 1, 6):
            overlap = _integral(lambda r, a=n1, b=n2: r * r * radial_function((a, l), r)
                                * radial_function((b, l), r), 25.0, epsabs=1e-13)
            assert abs(overlap) < 1e-9, (n1, n2, l)


@pytest.mark.parametrize(("n", "l"), [*SUBSHELLS, (10, 0), (12, 3)])
def test_agrees_with_the_scipy_laguerre_oracle(n: int, l: int) -> None:
    # R_nl from the same textbook formula, built on scipy.special.genlaguerre
    Z = 1.7
    norm = math.sqrt((2 * Z / n) ** 3 * math.factorial(n - l - 1)
                     / (2 * n * math.factorial(n + l)))
    poly = special.genlaguerre(n - l - 1, 2 * l + 1)
    for r in [0.0, 0.05, 0.3, 1.0, 2.5, 7.0, 15.0, 40.0]:
        rho = 2 * Z * r / n
        expected = norm * math.exp(-rho / 2) * rho ** l * poly(rho)
        assert radial_function((n, l), r, Z=Z) == pytest.approx(expected, rel=1e-9, abs=1e-14)


@pytest.mark.parametrize(("subshell", "nodes"), [
    # Node positions in units of a0 / Z, from the closed forms of R_nl (textbook, from
    # memory): 2s: 2; 3s: (9 ∓ 3√3)/2; 3p: 6; 4p: 10 ∓ 2√5; 1s, 2p, 3d, 4f: none.
    pytest.param("1s", [], id="1s"),
    pytest.param("2s", [2.0], id="2s"),
    pytest.param("2p", [], id="2p"),
    pytest.param("3s", [(9 - 3 * math.sqrt(3)) / 2, (9 + 3 * math.sqrt(3)) / 2], id="3s"),
    pytest.param("3p", [6.0], id="3p"),
    pytest.param("3d", [], id="3d"),
    pytest.param("4p", [10 - 2 * math.sqrt(5), 10 + 2 * math.sqrt(5)], id="4p"),
    pytest.param("4f", [], id="4f"),
])
@pytest.mark.parametrize("Z", [1, 3])
def test_node_positions(subshell: str, nodes: list[float], Z: int) -> None:
    found = radial_nodes(subshell, Z=Z, a0=A0)
    assert found == pytest.approx([x * A0 / Z for x in nodes], rel=1e-12)
    for r in found:
        assert abs(radial_function(subshell, r, Z=Z, a0=A0)) < 1e-6 * radial_function(
            subshell, 0.0 if subshell.endswith("s") else A0, Z=Z, a0=A0) + 1e-300


@pytest.mark.parametrize(("n", "l"), [*SUBSHELLS, (9, 2), (15, 0)])
def test_node_count_is_n_minus_l_minus_1(n: int, l: int) -> None:
    # count sign changes of R_nl on a fine grid, independently of radial_nodes
    # out to 3n² a0, offset by half a step so that no point sits exactly on a node
    grid = [(i + 0.5) * 0.01 for i in range(300 * n * n)]
    values = [radial_function((n, l), r) for r in grid]
    changes = sum(1 for a, b in itertools.pairwise(values) if a * b < 0)
    assert changes == n - l - 1 == len(radial_nodes((n, l)))


@pytest.mark.parametrize("n", [1, 2, 3, 4, 5])
def test_nodeless_density_peaks_at_n_squared_a0_over_z(n: int) -> None:
    # l = n − 1: P(r) ∝ r^(2n) e^(−2Zr/(n a0)) peaks at r = n² a0 / Z (textbook, from memory)
    Z = 2.0
    peak = n * n / Z
    here = radial_density((n, n - 1), peak, Z=Z)
    assert here > radial_density((n, n - 1), peak * 0.99, Z=Z)
    assert here > radial_density((n, n - 1), peak * 1.01, Z=Z)


def test_values_at_the_nucleus() -> None:
    # R_10(0) = 2 (Z/a0)^(3/2); every l > 0 function vanishes there (textbook)
    assert radial_function("1s", 0.0, Z=3) == pytest.approx(2 * 3 ** 1.5)
    assert radial_function("2s", 0.0) == pytest.approx(1 / math.sqrt(2))
    assert radial_function("2p", 0.0) == 0.0 == radial_density("1s", 0.0)


def test_penetration_2s_has_more_density_near_the_nucleus_than_2p() -> None:
    # the picture on the docs site: inside r = a0 the 2s inner lobe outweighs 2p
    inner_2s = _integral(lambda r: radial_density("2s", r) if r < 1 else 0.0, 1.0)
    inner_2p = _integral(lambda r: radial_density("2p", r) if r < 1 else 0.0, 1.0)
    assert inner_2s > 2 * inner_2p > 0


@pytest.mark.parametrize(("subshell", "code"), [
    pytest.param("2d", "invalid-subshell", id="l-not-below-n"),
    pytest.param("0s", "invalid-subshell", id="n-zero"),
    pytest.param("3j", "invalid-subshell", id="letter-j"),
    pytest.param("x", "invalid-subshell", id="not-a-label"),
    pytest.param((2, 2), "invalid-subshell", id="tuple"),
])
def test_impossible_subshells_are_confspec_errors(subshell: str | tuple[int, int],
                                                  code: str) -> None:
    with pytest.raises(ConfspecError) as info:
        radial_function(subshell, 1.0)
    assert info.value.code == code
    with pytest.raises(ConfspecError):
        radial_nodes(subshell)


@pytest.mark.parametrize("kwargs", [{"Z": 0}, {"Z": -1}, {"a0": 0}, {"Z": math.nan},
                                    {"a0": math.inf}])
def test_impossible_scales_are_value_errors(kwargs: dict[str, float]) -> None:
    with pytest.raises(ValueError):
        radial_function("1s", 1.0, **kwargs)
    with pytest.raises(ValueError):
        radial_function("1s", -1.0)


@given(st.integers(1, 12).flatmap(lambda n: st.tuples(st.just(n), st.integers(0, n - 1))),
       st.floats(0, 500), st.floats(0.1, 20))
def test_density_is_finite_and_non_negative(nl: tuple[int, int], r: float, Z: float) -> None:
    value = radial_density(nl, r, Z=Z)
    assert math.isfinite(value) and value >= 0
    assert radial_density(nl, r, Z=Z, a0=2.0) == pytest.approx(
        radial_density(nl, r / 2, Z=Z) / 2, rel=1e-9, abs=1e-300)
