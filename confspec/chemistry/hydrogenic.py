"""Hydrogen-like radial functions: R_nl(r), the radial probability density and its nodes.

For one electron bound to a point charge Ze (the textbook hydrogen-like atom):

    R_nl(r) = N e^(−ρ/2) ρ^l L_(n−l−1)^(2l+1)(ρ),   ρ = 2Zr / (n a₀),
    N = sqrt((2Z / (n a₀))³ (n − l − 1)! / (2n (n + l)!)),

with L the generalized Laguerre polynomial, so that ∫ r² R_nl² dr = 1 over 0 … ∞ (common
practice, no source: the form found in quantum-chemistry textbooks; the tests check the
normalization, the n − l − 1 radial nodes and their positions numerically). Distances are in
the unit of ``a0`` (Bohr radii by default), so ``a0=0.529177`` gives ångström. ``Z`` may be
any positive number, e.g. an effective nuclear charge from Slater's rules: a picture of
penetration, not a many-electron calculation.
"""

from __future__ import annotations

import math

from ..errors import ConfspecPhysicsError, ConfspecSyntaxError
from ..physics import subshell_label, subshell_numbers

__all__ = ["radial_density", "radial_function", "radial_nodes"]

SubshellLike = str | tuple[int, int]


#: The largest n of the hydrogen-like functions: finding the nodes costs about n², and
#: n = 100 takes under a second.
MAX_HYDROGENIC_N = 100


def _numbers(subshell: SubshellLike) -> tuple[int, int]:
    n, l = subshell_numbers(subshell)
    if n > MAX_HYDROGENIC_N:
        raise ConfspecSyntaxError(
            "number-too-large", f"n = {n} is above {MAX_HYDROGENIC_N}, the largest n the "
            "hydrogen-like functions take", text=str(subshell))
    return n, l


def _check_scale(Z: float, a0: float) -> None:
    if not (isinstance(Z, int | float) and Z > 0 and math.isfinite(Z)):
        raise ConfspecPhysicsError("out-of-range", f"Z must be a positive number, not {Z!r}")
    if not (isinstance(a0, int | float) and a0 > 0 and math.isfinite(a0)):
        raise ConfspecPhysicsError("out-of-range",
                                   f"a0 must be a positive length, not {a0!r}")


def _laguerre(k: int, alpha: int, x: float) -> float:
    """Generalized Laguerre polynomial L_k^alpha(x) by its three-term recurrence."""
    if k == 0:
        return 1.0
    previous, current = 1.0, 1.0 + alpha - x
    for m in range(1, k):
        previous, current = current, ((2 * m + 1 + alpha - x) * current
                                      - (m + alpha) * previous) / (m + 1)
    return current


def _log_norm(n: int, l: int, Z: float, a0: float) -> float:
    """log N, through log-gamma so that large n does not overflow."""
    return 0.5 * (3 * math.log(2 * Z / (n * a0)) + math.lgamma(n - l)
                  - math.log(2 * n) - math.lgamma(n + l + 1))


def _bisect(k: int, alpha: int, lo: float, hi: float, flo: float) -> float:
    """The zero of L_k^alpha inside [lo, hi], where the sign changes, to machine precision."""
    while True:
        mid = 0.5 * (lo + hi)
        if mid in (lo, hi):
            return mid
        fmid = _laguerre(k, alpha, mid)
        if fmid == 0.0:
            return mid
        if (fmid < 0) == (flo < 0):
            lo, flo = mid, fmid
        else:
            hi = mid


def radial_function(subshell: SubshellLike, r: float, *, Z: float = 1.0,
                    a0: float = 1.0) -> float:
    """R_nl(r) of a hydrogen-like atom, in (unit of a0)^(−3/2).

    ``subshell`` is a label (``"2s"``) or ``(n, l)``; positive near the nucleus.

    >>> round(radial_function("1s", 0.0), 6)   # 2 (Z/a0)^(3/2) at the nucleus
    2.0
    >>> abs(radial_function("2s", 2.0)) < 1e-15   # the 2s node at r = 2 a0 / Z
    True
    """
    n, l = _numbers(subshell)
    _check_scale(Z, a0)
    if not (isinstance(r, int | float) and math.isfinite(r) and r >= 0):
        raise ConfspecPhysicsError("out-of-range",
                                   f"r must be a non-negative number, not {r!r}")
    rho = 2.0 * Z * r / (n * a0)
    poly = _laguerre(n - l - 1, 2 * l + 1, rho)
    if rho == 0.0:
        return math.exp(_log_norm(n, l, Z, a0)) * poly if l == 0 else 0.0
    return math.exp(_log_norm(n, l, Z, a0) - rho / 2 + l * math.log(rho)) * poly


def radial_density(subshell: SubshellLike, r: float, *, Z: float = 1.0,
                   a0: float = 1.0) -> float:
    """Radial probability density P(r) = r² R_nl(r)², in 1/(unit of a0); it integrates to 1.

    >>> round(radial_density("1s", 1.0), 6)   # 4 e⁻² at its maximum, r = a0
    0.541341
    """
    value = radial_function(subshell, r, Z=Z, a0=a0)
    return r * r * value * value


def radial_nodes(subshell: SubshellLike, *, Z: float = 1.0, a0: float = 1.0) -> list[float]:
    """The n − l − 1 radial nodes (r > 0), ascending, in the unit of a0.

    They are the zeros of L_(n−l−1)^(2l+1)(ρ), found by bracketing each sign change on a
    grid below the largest possible zero and bisecting to machine precision.

    >>> radial_nodes("2s"), radial_nodes("2p")
    ([2.0], [])
    >>> [round(x, 4) for x in radial_nodes("3s")]   # (9 ∓ 3√3)/2 a0
    [1.9019, 7.0981]
    """
    n, l = _numbers(subshell)
    _check_scale(Z, a0)
    k, alpha = n - l - 1, 2 * l + 1
    if k == 0:
        return []
    # every zero of L_k^alpha lies below 4k + 2 alpha + 2 (Szegő's bound for Laguerre
    # zeros, from memory); the count check below catches a miss
    top = 4.0 * k + 2.0 * alpha + 2.0
    steps = 400 * k
    zeros: list[float] = []
    x0, f0 = 0.0, _laguerre(k, alpha, 0.0)  # L_k^alpha(0) = C(k + alpha, k) > 0
    for i in range(1, steps + 1):
        x1 = top * i / steps
        f1 = _laguerre(k, alpha, x1)
        if f1 == 0.0:
            zeros.append(x1)
        elif f0 != 0.0 and (f0 < 0) != (f1 < 0):
            zeros.append(_bisect(k, alpha, x0, x1, f0))
        x0, f0 = x1, f1
    if len(zeros) != k:  # pragma: no cover - the grid is fine enough for every n we allow
        raise ArithmeticError(f"found {len(zeros)} of {k} nodes of {subshell_label(n, l)}")
    scale = n * a0 / (2.0 * Z)
    return [rho * scale for rho in zeros]
