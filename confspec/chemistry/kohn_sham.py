"""The numerics behind :func:`confspec.scf`: a radial Kohn–Sham LDA solver for atoms
(non-relativistic, spherically averaged, spin-unpolarised).

This module needs numpy and scipy (``pip install "confspec[scf]"``) and is imported only
when an SCF calculation runs, so ``import confspec`` stays light. It works on plain
(n, l, electrons) tuples and knows nothing of species or notation; :mod:`.scf` turns
confspec models into those tuples and the results into frozen models. Everything it
returns is a computed approximation (spherically averaged LDA), never a measured value.

The method is the one of Kohn & Sham, Phys. Rev. 140, A1133 (1965): each occupied subshell
(n, l) is a radial orbital P(r) = r·R(r) in one common, spherical, self-consistent potential

    v(r) = -Z/r + v_H[n](r) + v_xc[n](r),

and open subshells are occupied fractionally and spherically averaged, exactly as in the
reference calculations of Kotochigova, Levine, Shirley, Stiles & Clark, Phys. Rev. A 55, 191
(1997) (the NIST "Atomic reference data for electronic-structure calculations").  Only
spin-unpolarised LDA is implemented: Slater/Dirac exchange plus the Vosko–Wilk–Nusair
correlation (see :func:`lda_exchange_correlation`).

Numerics, chosen by measurement (see ``benchmarks/bench_scf.py``):

* Grid: logarithmic, r_i = r_min·exp(i·h).  With P(r) = r^{1/2}·y(x), x = ln r, the radial
  equation has no first-derivative term, y'' = g(x)·y with
  g = (l + 1/2)² + 2r²(v(r) − ε), so Numerov's method applies directly and is O(h⁴).
  Integrals over x of functions that vanish at both ends are done by the trapezoidal rule,
  which is then spectrally accurate.
* Eigenvalues: the Numerov equations for all grid points are a symmetric tridiagonal matrix
  T(ε) in the variable w = (1 − h²g/12)·y.  An eigenvalue is an ε where T(ε) is singular.
  A second-order finite-difference problem (a linear symmetric tridiagonal eigenproblem,
  solved by LAPACK bisection) gives a starting pair with the right number of nodes; it is
  then refined by nonlinear inverse iteration with a Newton step on the Rayleigh functional
  w·T(ε)·w = 0.  Every step is one O(N) LAPACK tridiagonal solve, so no Python loop runs
  over grid points.  The node count is checked after every refinement.
* Hartree potential: U = r·v_H obeys U'' = −n(r)/r; with U = r^{1/2}·z this is
  z'' = z/4 − r^{1/2}·n(r) in x, solved by Numerov as one tridiagonal system.
* Self-consistency: Pulay (DIIS) mixing of the radial density n(r) = Σ f·P², with the
  total energy, its change and the density residual ∫|n_out − n_in| dr reported.

Measured choices: h = 0.008 leaves ~3.5e-6 hartree of grid error in the U total energy
(Numerov's h⁴ convergence: 6e-5 at h = 0.016, 1.6e-5 at 0.012) and far less for light atoms;
one LAPACK bisection call for all states of a channel costs ~6 ms at N ≈ 3000 against ~0.06 ms
for a tridiagonal solve, so bisection is used only to start, and refinement from the previous
SCF iteration does the rest.  The wall r_min = 1e-6/Z and r_max = 50 bohr each change
neutral-atom totals by < 1e-7 hartree; r_max is doubled automatically (twice at most) when a
bound orbital reaches the end of the grid.

Units are hartree atomic units throughout; :data:`HARTREE_EV` converts to eV.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
import numpy.typing as npt

# scipy ships no type information unless scipy-stubs is installed; the codes below keep
# mypy --strict clean either way.
from scipy.linalg import eigh_tridiagonal  # type: ignore[import-untyped, unused-ignore]
from scipy.linalg.lapack import dgtsv  # type: ignore[import-untyped, unused-ignore]

__all__ = [
    "HARTREE_EV",
    "AtomResult",
    "Orbital",
    "RadialGrid",
    "SCFNotConverged",
    "lda_exchange_correlation",
    "make_grid",
    "radial_states",
    "solve_atom",
]

FloatArray = npt.NDArray[np.float64]

#: CODATA 2018 hartree energy in electronvolts.
HARTREE_EV = 27.211386245988

_L_LETTERS = "spdfghiklmnoqrtuv"

# Numerov factor 1 - h²g/12 must stay positive; beyond h²g = _G_CUT the orbital is cut off
# (there the orbital has decayed by more than exp(-2·sqrt(_G_CUT)/h), i.e. to nothing).
_G_CUT = 10.0


# An occupied level above zero this many iterations running (after _UNBOUND_AFTER) is taken
# as unbound for good: the SCF stops early instead of running to max_iterations.
_UNBOUND_AFTER = 25
_UNBOUND_STREAK = 15
_GRID_RETRIES = 2  # r_max is doubled up to this many times for a diffuse bound orbital


class SCFNotConverged(Exception):  # noqa: N818 (the name says what happened)
    """The self-consistent field could not be brought to convergence.

    Attributes:
        residual: the last density residual ∫|n_out − n_in| dr (electrons), or ``inf``.
        iterations: the number of SCF iterations done.
        reason: what went wrong, in plain words.
    """

    def __init__(self, reason: str, *, residual: float, iterations: int) -> None:
        super().__init__(f"{reason} (after {iterations} iterations, residual {residual:.3g})")
        self.reason = reason
        self.residual = residual
        self.iterations = iterations

    def __reduce__(self) -> tuple[object, ...]:
        # keyword-only arguments: pickle (worker processes) rebuilds through this
        return (_rebuild_not_converged, (self.reason, self.residual, self.iterations))


def _rebuild_not_converged(reason: str, residual: float, iterations: int) -> SCFNotConverged:
    return SCFNotConverged(reason, residual=residual, iterations=iterations)


class _TooDiffuse(SCFNotConverged):
    """Internal: a bound orbital reaches the end of the grid; solve_atom retries larger."""


class _EigenError(RuntimeError):
    """Internal: the radial eigensolver could not find a state; turned into SCFNotConverged."""


@dataclass(frozen=True)
class RadialGrid:
    """Logarithmic radial grid r_i = r_min·exp(i·h), i = 0 … N−1 (bohr)."""

    r: FloatArray = field(repr=False)
    step: float

    @property
    def size(self) -> int:
        """Number of grid points."""
        return int(self.r.size)

    def integrate(self, f: FloatArray) -> float:
        """∫ f(r) dr, by the trapezoidal rule in x = ln r (spectral for f·r → 0 at both ends)."""
        return float(self.step * np.dot(f, self.r))


def make_grid(
    z: int, *, step: float = 0.008, r_min_z: float = 1e-6, r_max: float = 50.0
) -> RadialGrid:
    """Build the logarithmic grid used by :func:`solve_atom`.

    ``r_min = r_min_z / z`` so the innermost point sits at the same place relative to the 1s
    orbital for every element (the radial equation in x = ln r is then shift-invariant).
    """
    if not (0.0 < step <= 0.1) or not math.isfinite(step):
        raise ValueError(f"grid step must be in (0, 0.1], got {step!r}")
    if not (0.0 < r_min_z <= 1e-2):
        raise ValueError(f"r_min_z must be in (0, 0.01], got {r_min_z!r}")
    r_min = r_min_z / z
    if not (r_max > 1.0 and math.isfinite(r_max)):
        raise ValueError(f"r_max must be a finite number above 1 bohr, got {r_max!r}")
    count = math.ceil(math.log(r_max / r_min) / step) + 1
    r = r_min * np.exp(step * np.arange(count, dtype=np.float64))
    return RadialGrid(r=r, step=step)


@dataclass(frozen=True)
class Orbital:
    """One radial orbital (n, l) of the converged atom.

    ``radial`` is P(r) = r·R(r) on the grid, normalised to ∫P² dr = 1, positive near r = 0.
    ``r_peak`` is the radius of the outermost maximum of |P(r)|².
    """

    n: int
    l: int
    occupancy: float
    eigenvalue: float
    r_mean: float
    r2_mean: float
    r_peak: float
    radial: FloatArray = field(repr=False)

    @property
    def label(self) -> str:
        """Spectroscopic label such as ``3d``."""
        return f"{self.n}{_L_LETTERS[self.l]}"


@dataclass(frozen=True)
class AtomResult:
    """Converged spherically averaged LDA atom.

    Energies in hartree: ``total_energy = kinetic + hartree + electron_nucleus +
    exchange_correlation``.  ``virial_ratio`` is −V/T with V the whole potential energy; for
    LDA with correlation it is *not* exactly 2, because E_c is not homogeneous under uniform
    scaling.  ``scaling_virial_ratio`` replaces E_xc by its scaling derivative
    3∫n(v_xc − ε_xc) dr, for which the virial theorem holds exactly at self-consistency, so
    its distance from 2 measures the numerical error.
    """

    z: int
    electrons: float
    total_energy: float
    kinetic: float
    hartree: float
    electron_nucleus: float
    exchange_correlation: float
    virial_ratio: float
    scaling_virial_ratio: float
    orbitals: tuple[Orbital, ...]
    grid: RadialGrid = field(repr=False)
    density: FloatArray = field(repr=False)
    iterations: int
    residual: float
    energy_change: float
    energy_tolerance: float
    density_tolerance: float

    def orbital(self, n: int, l: int) -> Orbital:
        """The orbital (n, l); ``KeyError`` if it was not in the configuration."""
        for orb in self.orbitals:
            if orb.n == n and orb.l == l:
                return orb
        raise KeyError((n, l))


# ----------------------------------------------------------------------------------------
# Exchange–correlation
# ----------------------------------------------------------------------------------------

# VWN paramagnetic fit to Ceperley–Alder ("VWN5"), in hartree (A is half the Rydberg value).
_VWN_A = 0.0310907
_VWN_X0 = -0.10498
_VWN_B = 3.72744
_VWN_C = 12.9352


def lda_exchange_correlation(rho: FloatArray) -> tuple[FloatArray, FloatArray]:
    """Energy per electron ε_xc(ρ) and potential v_xc(ρ) of the spin-unpolarised LDA.

    Exchange is Slater/Dirac, ε_x = −(3/4)(3ρ/π)^{1/3}.  Correlation is the Vosko, Wilk &
    Nusair, Can. J. Phys. 58, 1200 (1980) Padé interpolation of the Ceperley–Alder
    paramagnetic correlation energy (their eq. 4.4 with x0 = −0.10498, b = 3.72744,
    c = 12.9352, the form usually called "VWN5").  That is the form used by Kotochigova et
    al., Phys. Rev. A 55, 191 (1997) for the NIST LDA tables, so totals can be compared with
    them to 1e-6 hartree; the other VWN fit (to the RPA) would differ by ~0.01 hartree/atom.

    Densities at or below 1e-30 bohr⁻³ (and negative values left by mixing) give zero.
    """
    rho = np.asarray(rho, dtype=np.float64)
    eps = np.zeros_like(rho)
    pot = np.zeros_like(rho)
    mask = rho > 1e-30
    d = rho[mask]
    cbrt = np.cbrt(3.0 * d / math.pi)
    eps_x = -0.75 * cbrt
    v_x = -cbrt
    rs = np.cbrt(3.0 / (4.0 * math.pi * d))
    x = np.sqrt(rs)
    a, x0, b, c = _VWN_A, _VWN_X0, _VWN_B, _VWN_C
    q = math.sqrt(4.0 * c - b * b)
    big_x = x * x + b * x + c
    big_x0 = x0 * x0 + b * x0 + c
    atn = np.arctan(q / (2.0 * x + b))
    k = b * x0 / big_x0
    eps_c = a * (
        np.log(x * x / big_x)
        + 2.0 * b / q * atn
        - k * (np.log((x - x0) ** 2 / big_x) + 2.0 * (b + 2.0 * x0) / q * atn)
    )
    tx = 2.0 * x + b
    den = q * q + tx * tx
    deps_dx = a * (
        2.0 / x
        - tx / big_x
        - 4.0 * b / den
        - k * (2.0 / (x - x0) - tx / big_x - 4.0 * (b + 2.0 * x0) / den)
    )
    v_c = eps_c - x * deps_dx / 6.0
    eps[mask] = eps_x + eps_c
    pot[mask] = v_x + v_c
    return eps, pot


# ----------------------------------------------------------------------------------------
# Hartree potential
# ----------------------------------------------------------------------------------------


def _hartree_u(grid: RadialGrid, n_rad: FloatArray) -> FloatArray:
    """U(r) = r·v_H(r) for radial density n(r) = 4πr²ρ, by Numerov on z = U/√r.

    Boundary values: U(r_0) = r_0·v_H(0) = r_0·∫n/r dr and U(r_max) = ∫n dr (all charge
    inside), both exact to the size of the density outside the grid.
    """
    r, h = grid.r, grid.step
    sq = np.sqrt(r)
    src = -sq * n_rad
    charge = grid.integrate(n_rad)
    z0 = r[0] * h * float(np.sum(n_rad)) / sq[0]
    z_end = charge / sq[-1]
    m = r.size - 2
    off = 1.0 - h * h / 48.0
    dia = -(2.0 + 10.0 * h * h / 48.0)
    rhs = (h * h / 12.0) * (src[2:] + 10.0 * src[1:-1] + src[:-2])
    rhs[0] -= off * z0
    rhs[-1] -= off * z_end
    offs = np.full(m - 1, off)
    _, _, _, sol, info = dgtsv(offs, np.full(m, dia), offs, rhs)
    if info != 0:
        raise RuntimeError("tridiagonal solve failed in the Hartree potential")
    zz = np.empty_like(r)
    zz[0], zz[-1] = z0, z_end
    zz[1:-1] = sol
    out: FloatArray = zz * sq
    return out


# ----------------------------------------------------------------------------------------
# Radial eigenproblem
# ----------------------------------------------------------------------------------------


@dataclass
class _Channel:
    """Quantities of one angular momentum l shared by its orbitals in one potential."""

    l: int
    q: FloatArray  # (l + 1/2)² + 2r²v
    s: FloatArray  # r²
    h: float
    origin_ratio: float  # w_{-1}/w_0 from the power-law behaviour at r -> 0


def _origin_ratio(l: int, z: int, r: FloatArray, h: float) -> float:
    """y_{-1}/y_0 for y ~ r^{l+1/2}(1 − Z r/(l+1)), the regular solution near the nucleus."""
    r0 = float(r[0])
    r_prev = r0 * math.exp(-h)
    corr = (1.0 - z * r_prev / (l + 1)) / (1.0 - z * r0 / (l + 1))
    return math.exp(-(l + 0.5) * h) * corr


def _numerov_diagonal(
    ch: _Channel, energy: float, m: int
) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Diagonal of T(ε), its ε-derivative and the Numerov factor c = 1 − h²g/12 on [0, m)."""
    hh = ch.h * ch.h
    g = ch.q[:m] - 2.0 * energy * ch.s[:m]
    c = 1.0 - hh * g / 12.0
    diag = -2.0 - hh * g / c
    diag[0] += ch.origin_ratio
    ddiag = 2.0 * hh * ch.s[:m] / (c * c)
    return diag, ddiag, c


def _cutoff(ch: _Channel, energy: float) -> int:
    """Number of grid points kept: up to the first point with h²g ≥ _G_CUT beyond the well."""
    g = (ch.q - 2.0 * energy * ch.s) * (ch.h * ch.h)
    over = g >= _G_CUT
    if not over.any():
        return int(g.size)
    return max(int(np.argmax(over)), 8)


def _count_nodes(y: FloatArray) -> int:
    """Sign changes of y, ignoring points where |y| is negligible."""
    big = y[np.abs(y) > 1e-9 * float(np.max(np.abs(y)))]
    return int(np.count_nonzero(np.signbit(big[1:]) != np.signbit(big[:-1])))


def _refine(
    ch: _Channel, energy: float, w: FloatArray, *, tol: float = 1e-13, max_steps: int = 30
) -> tuple[float, FloatArray]:
    """Nonlinear inverse iteration on the Numerov pencil T(ε)w = 0.

    Each step solves T(ε)z = T'(ε)w (one LAPACK tridiagonal solve) and then takes a Newton
    step on wᵀT(ε)w = 0.  Convergence is cubic near the root.  Returns (ε, y) with y on the
    full grid (zero beyond the cut-off).
    """
    size = ch.q.size
    vec = np.zeros(size)
    vec[: w.size] = w
    for _ in range(max_steps):
        m = _cutoff(ch, energy)
        diag, ddiag, c = _numerov_diagonal(ch, energy, m)
        ones = np.ones(m - 1)
        _, _, _, z, info = dgtsv(ones, diag, ones, ddiag * vec[:m])
        if info != 0 or not np.all(np.isfinite(z)):
            # T(ε) exactly singular to machine precision: ε is already an eigenvalue.
            z = vec[:m].copy()
        z /= math.sqrt(float(np.dot(z, z)))
        f = float(np.dot(diag * z, z) + 2.0 * np.dot(z[1:], z[:-1]))
        fp = float(np.dot(ddiag * z, z))
        step = -f / fp
        energy += step
        vec = np.zeros(size)
        vec[:m] = z
        if abs(step) <= tol * max(1.0, abs(energy)):
            break
    m = _cutoff(ch, energy)
    _, _, c = _numerov_diagonal(ch, energy, m)
    y = np.zeros(size)
    y[:m] = vec[:m] / c
    return energy, y


def _fd_guesses(ch: _Channel, count: int) -> tuple[FloatArray, FloatArray]:
    """Lowest ``count`` eigenpairs of the second-order finite-difference problem of channel l.

    −y'' + q·y = 2ε·r²·y, symmetrised with u = r·y.  LAPACK bisection (Sturm counts) picks
    the states by index, so state k has k nodes; that fixes the node count for refinement.
    Returns the energies and the matching y vectors (as rows), used as starting vectors.
    """
    h2 = ch.h * ch.h
    inv_r = 1.0 / np.sqrt(ch.s)
    dia = (2.0 / h2 + ch.q) * inv_r * inv_r
    dia[0] -= ch.origin_ratio / h2 * inv_r[0] ** 2
    off = -inv_r[1:] * inv_r[:-1] / h2
    if count > dia.size or not (np.all(np.isfinite(dia)) and np.all(np.isfinite(off))):
        raise _EigenError(f"cannot start the l={ch.l} channel in this potential")
    try:
        vals, vecs = eigh_tridiagonal(
            dia, off, select="i", select_range=(0, count - 1), lapack_driver="stebz", tol=1e-12
        )
    except (np.linalg.LinAlgError, ValueError) as exc:
        raise _EigenError(f"the l={ch.l} eigenproblem failed ({exc})") from None
    energies: FloatArray = 0.5 * np.asarray(vals, dtype=np.float64)
    ys: FloatArray = (np.asarray(vecs, dtype=np.float64) * inv_r[:, None]).T
    return energies, ys


def _solve_channel(
    ch: _Channel, ns: Sequence[int], previous: dict[int, tuple[float, FloatArray]]
) -> dict[int, tuple[float, FloatArray]]:
    """Eigenpairs (ε, y) for the principal quantum numbers ``ns`` of one channel.

    Starts from the previous SCF iteration where available; falls back on the
    finite-difference guesses whenever the node count comes out wrong.
    """
    out: dict[int, tuple[float, FloatArray]] = {}
    missing = [n for n in ns if n not in previous]
    guesses: tuple[FloatArray, FloatArray] | None = None
    if missing:
        guesses = _fd_guesses(ch, max(ns) - ch.l)
    for n in ns:
        nodes = n - ch.l - 1
        if n in previous:
            e0, y0 = previous[n]
        else:
            assert guesses is not None
            e0, y0 = float(guesses[0][nodes]), guesses[1][nodes]
        energy, y = _refine(ch, e0, y0)
        if not _good(y, energy, nodes):
            if guesses is None:
                guesses = _fd_guesses(ch, max(ns) - ch.l)
            energy, y = _refine(ch, float(guesses[0][nodes]), guesses[1][nodes])
            if not _good(y, energy, nodes):
                raise _EigenError(f"no {n}{_L_LETTERS[ch.l]} eigenstate with {nodes} nodes found")
        out[n] = (energy, y)
    return out


def radial_states(
    grid: RadialGrid, z: int, potential: FloatArray, l: int, ns: Sequence[int]
) -> list[tuple[float, FloatArray]]:
    """Eigenvalues and normalised P(r) for (n, l), n in ``ns``, in a fixed potential v(r).

    The same eigensolver the SCF uses, exposed for checks against exact results (for
    v = −z/r the eigenvalues are −z²/2n²).  ``z`` sets the regular behaviour at r → 0.
    Raises ValueError for bad arguments and SCFNotConverged if a state cannot be found.
    """
    pot = np.asarray(potential, dtype=np.float64)
    if pot.shape != grid.r.shape or not np.all(np.isfinite(pot)):
        raise ValueError("potential must be finite and given on the grid points")
    if l < 0 or not ns or any(n <= l for n in ns):
        raise ValueError(f"need n > l >= 0, got l={l}, ns={list(ns)}")
    r, h = grid.r, grid.step
    ch = _Channel(
        l=l,
        q=(l + 0.5) ** 2 + 2.0 * r * r * pot,
        s=r * r,
        h=h,
        origin_ratio=_origin_ratio(l, z, r, h),
    )
    try:
        pairs = _solve_channel(ch, sorted(set(ns)), {})
    except _EigenError as exc:
        raise SCFNotConverged(str(exc), residual=math.inf, iterations=0) from None
    out = []
    for n in ns:
        e, y = pairs[n]
        p = np.sqrt(r) * y
        p /= math.sqrt(grid.integrate(p * p))
        out.append((e, p))
    return out


def _good(y: FloatArray, energy: float, nodes: int) -> bool:
    """Finite, nonzero and with the required number of nodes."""
    if not (math.isfinite(energy) and np.all(np.isfinite(y)) and np.any(y != 0.0)):
        return False
    return _count_nodes(y) == nodes


# ----------------------------------------------------------------------------------------
# Mixing
# ----------------------------------------------------------------------------------------


class _PulayMixer:
    """Pulay/DIIS mixing of radial densities with a linear-mixing step ``beta``.

    Minimises |Σc_k F_k| (weighted by the grid measure) subject to Σc_k = 1 over the last
    ``depth`` pairs (n_in, F = n_out − n_in), then returns Σc_k(n_in,k + beta·F_k).
    """

    def __init__(self, weight: FloatArray, beta: float, depth: int) -> None:
        self.weight = weight
        self.beta = beta
        self.depth = depth
        self.inputs: list[FloatArray] = []
        self.residuals: list[FloatArray] = []

    def reset(self) -> None:
        """Forget the history (after a bad step)."""
        self.inputs.clear()
        self.residuals.clear()

    def update(self, n_in: FloatArray, residual: FloatArray) -> FloatArray:
        """Next input density."""
        self.inputs.append(n_in)
        self.residuals.append(residual)
        if len(self.inputs) > self.depth:
            self.inputs.pop(0)
            self.residuals.pop(0)
        k = len(self.inputs)
        res = np.array(self.residuals)
        gram = (res * self.weight) @ res.T
        mat = np.ones((k + 1, k + 1))
        mat[:k, :k] = gram
        mat[k, k] = 0.0
        rhs = np.zeros(k + 1)
        rhs[k] = 1.0
        scale = float(np.max(np.abs(np.diag(gram)))) or 1.0
        mat[:k, :k] /= scale
        coef = np.linalg.lstsq(mat, rhs, rcond=1e-12)[0][:k]
        if not np.all(np.isfinite(coef)):
            coef = np.zeros(k)
            coef[-1] = 1.0
        new: FloatArray = coef @ (np.array(self.inputs) + self.beta * res)
        return new


# ----------------------------------------------------------------------------------------
# Driver
# ----------------------------------------------------------------------------------------


def _validate(
    z: int, occupations: Sequence[tuple[int, int, float]]
) -> list[tuple[int, int, float]]:
    """Check arguments; return the occupations as a list of (n, l, f) sorted by (l, n)."""
    if isinstance(z, bool) or not isinstance(z, (int, np.integer)) or not 1 <= z <= 120:
        raise ValueError(f"nuclear charge z must be an integer from 1 to 120, got {z!r}")
    seen: set[tuple[int, int]] = set()
    out: list[tuple[int, int, float]] = []
    for item in occupations:
        if len(item) != 3:
            raise ValueError(f"each occupation must be (n, l, electrons), got {item!r}")
        n, l, f = item
        if not isinstance(n, (int, np.integer)) or not isinstance(l, (int, np.integer)):
            raise ValueError(f"n and l must be integers, got {item!r}")
        if not (n >= 1 and 0 <= l < n):
            raise ValueError(f"need n >= 1 and 0 <= l < n, got n={n}, l={l}")
        if l >= len(_L_LETTERS):
            raise ValueError(f"l={l} is too large")
        ff = float(f)
        cap = 2 * (2 * l + 1)
        if not (math.isfinite(ff) and 0.0 <= ff <= cap):
            raise ValueError(f"{n}{_L_LETTERS[l]} holds 0 to {cap} electrons, got {f!r}")
        if (n, l) in seen:
            raise ValueError(f"subshell {n}{_L_LETTERS[l]} is listed twice")
        seen.add((n, l))
        out.append((int(n), int(l), ff))
    total = sum(f for _, _, f in out)
    if total <= 0.0:
        raise ValueError("the configuration has no electrons")
    if total > 2.0 * z + 2.0:
        raise ValueError(f"{total:g} electrons on a nucleus of charge {z} cannot bind")
    return sorted(out, key=lambda t: (t[1], t[0]))


def _guess_potential(grid: RadialGrid, z: int, electrons: float) -> FloatArray:
    """Starting potential: Coulomb of the nucleus screened by a Thomas–Fermi-like cloud.

    v = −[z_out + (z − z_out)·φ(r/b)]/r with b the Thomas–Fermi length 0.8853·z^{-1/3}, the
    simple screening function φ(x) = (1 + 0.6x)^{-2}, and z_out ≥ 1 so every level is bound
    to start with.  Only a guess: self-consistency removes it.
    """
    r = grid.r
    b = 0.8853 * z ** (-1.0 / 3.0)
    z_out = max(z - electrons + 1.0, 1.0)
    phi = 1.0 / (1.0 + 0.6 * r / b) ** 2
    pot: FloatArray = -(z_out + (z - z_out) * phi) / r
    return pot


@dataclass
class _State:
    """Orbitals of one potential: {(n, l): (ε, y)} and the radial density they give."""

    pairs: dict[tuple[int, int], tuple[float, FloatArray]]
    density: FloatArray
    eigen_sum: float


def _solve_orbitals(
    grid: RadialGrid,
    z: int,
    v: FloatArray,
    occ: list[tuple[int, int, float]],
    previous: dict[tuple[int, int], tuple[float, FloatArray]],
) -> _State:
    """Solve every channel in the potential v and build n(r) = Σ f·P², P² = r·y²."""
    r, h = grid.r, grid.step
    s = r * r
    by_l: dict[int, list[int]] = {}
    for n, l, _ in occ:
        by_l.setdefault(l, []).append(n)
    pairs: dict[tuple[int, int], tuple[float, FloatArray]] = {}
    for l, ns in by_l.items():
        ch = _Channel(
            l=l, q=(l + 0.5) ** 2 + 2.0 * s * v, s=s, h=h, origin_ratio=_origin_ratio(l, z, r, h)
        )
        prev = {n: previous[(n, l)] for n in ns if (n, l) in previous}
        for n, pair in _solve_channel(ch, ns, prev).items():
            e, y = pair
            y = y / math.sqrt(h * float(np.dot(s, y * y)))
            pairs[(n, l)] = (e, y)
    density = np.zeros_like(r)
    eigen_sum = 0.0
    for n, l, f in occ:
        e, y = pairs[(n, l)]
        density += f * r * y * y
        eigen_sum += f * e
    return _State(pairs=pairs, density=density, eigen_sum=eigen_sum)


def _potential(grid: RadialGrid, z: int, n_rad: FloatArray) -> tuple[FloatArray, FloatArray]:
    """Kohn–Sham potential of density n and the Hartree U = r·v_H used to build it."""
    r = grid.r
    u = _hartree_u(grid, n_rad)
    rho = np.maximum(n_rad, 0.0) / (4.0 * math.pi * r * r)
    _, vxc = lda_exchange_correlation(rho)
    return -z / r + u / r + vxc, u


@dataclass(frozen=True)
class _Energies:
    total: float
    kinetic: float
    hartree: float
    nucleus: float
    xc: float
    xc_scaling: float


def _energies(grid: RadialGrid, z: int, state: _State, v_in: FloatArray) -> _Energies:
    """Kohn–Sham energy of the output density; T from the eigenvalue sum in v_in."""
    r = grid.r
    n_out = state.density
    kinetic = state.eigen_sum - grid.integrate(v_in * n_out)
    u = _hartree_u(grid, n_out)
    hartree = 0.5 * grid.integrate(u / r * n_out)
    nucleus = -z * grid.integrate(n_out / r)
    rho = np.maximum(n_out, 0.0) / (4.0 * math.pi * r * r)
    eps, vxc = lda_exchange_correlation(rho)
    xc = grid.integrate(eps * n_out)
    xc_scaling = 3.0 * grid.integrate((vxc - eps) * n_out)
    total = kinetic + hartree + nucleus + xc
    return _Energies(total, kinetic, hartree, nucleus, xc, xc_scaling)


def _outer_peak(r: FloatArray, p2: FloatArray) -> float:
    """Radius of the outermost local maximum of P², refined by a parabola in ln r."""
    top = float(np.max(p2))
    inner = p2[1:-1]
    is_max = (inner >= p2[:-2]) & (inner > p2[2:]) & (inner > 1e-6 * top)
    idx = np.nonzero(is_max)[0]
    if idx.size == 0:
        return float(r[int(np.argmax(p2))])
    i = int(idx[-1]) + 1
    a, b, c = float(p2[i - 1]), float(p2[i]), float(p2[i + 1])
    den = a - 2.0 * b + c
    shift = 0.5 * (a - c) / den if den != 0.0 else 0.0
    h = math.log(float(r[1] / r[0]))
    return float(r[i] * math.exp(shift * h))


def _orbitals(
    grid: RadialGrid, state: _State, occ: list[tuple[int, int, float]]
) -> tuple[Orbital, ...]:
    """Package converged orbitals, ordered by (n, l)."""
    r = grid.r
    items = []
    for n, l, f in sorted(occ):
        e, y = state.pairs[(n, l)]
        p = np.sqrt(r) * y
        if p[np.argmax(np.abs(p))] < 0.0:
            p = -p
        p2 = p * p
        items.append(
            Orbital(
                n=n,
                l=l,
                occupancy=f,
                eigenvalue=e,
                r_mean=grid.integrate(p2 * r),
                r2_mean=grid.integrate(p2 * r * r),
                r_peak=_outer_peak(r, p2),
                radial=p,
            )
        )
    return tuple(items)


def solve_atom(
    z: int,
    occupations: Sequence[tuple[int, int, float]],
    *,
    energy_tolerance: float = 1e-9,
    density_tolerance: float = 1e-7,
    max_iterations: int = 200,
    mixing: float = 0.4,
    history: int = 8,
    step: float = 0.008,
    r_min_z: float = 1e-6,
    r_max: float = 50.0,
) -> AtomResult:
    """Self-consistent spherically averaged LDA atom (Kohn & Sham 1965; VWN correlation).

    Args:
        z: nuclear charge.
        occupations: (n, l, electrons) per subshell, 0 ≤ l < n, 0 ≤ electrons ≤ 2(2l+1);
            fractional values are allowed and the electron count may differ from z (ions).
            Subshells with zero electrons are solved too and reported (an empty subshell
            that is not bound is reported with the box state's eigenvalue, ≥ 0).
        energy_tolerance: converged when the total energy changes by less than this
            (hartree) between iterations ...
        density_tolerance: ... and ∫|n_out − n_in| dr is below this (electrons).
        max_iterations: SCF iteration limit.
        mixing: linear-mixing fraction used inside Pulay mixing.
        history: number of Pulay history vectors.
        step, r_min_z, r_max: grid h, z·r_min and r_max (bohr); see :func:`make_grid`.

    Raises:
        ValueError: invalid arguments.
        SCFNotConverged: no convergence within ``max_iterations``, an occupied orbital that
            is not bound (eigenvalue ≥ 0: LDA often cannot bind the extra electron of an
            anion, and the result would be an artefact of the finite grid), a bound orbital
            too diffuse for ``r_max``, or a numerical breakdown.  The exception carries the
            residual, the iteration count and the reason.
    """
    occ = _validate(z, occupations)
    for name, value in (
        ("energy_tolerance", energy_tolerance),
        ("density_tolerance", density_tolerance),
    ):
        if not (value > 0.0 and math.isfinite(value)):
            raise ValueError(f"{name} must be a positive number, got {value!r}")
    if not (isinstance(max_iterations, int) and max_iterations >= 1):
        raise ValueError(f"max_iterations must be a positive integer, got {max_iterations!r}")
    if not (0.0 < mixing <= 1.0):
        raise ValueError(f"mixing must be in (0, 1], got {mixing!r}")
    if not (isinstance(history, int) and history >= 1):
        raise ValueError(f"history must be a positive integer, got {history!r}")
    electrons = sum(f for _, _, f in occ)
    attempt_r_max = r_max
    for attempt in range(_GRID_RETRIES + 1):
        grid = make_grid(int(z), step=step, r_min_z=r_min_z, r_max=attempt_r_max)
        try:
            with np.errstate(all="ignore"):
                return _scf(
                    grid,
                    int(z),
                    occ,
                    electrons,
                    energy_tolerance,
                    density_tolerance,
                    max_iterations,
                    mixing,
                    history,
                )
        except _TooDiffuse as exc:
            if attempt == _GRID_RETRIES:
                raise SCFNotConverged(
                    exc.reason, residual=exc.residual, iterations=exc.iterations
                ) from None
            attempt_r_max *= 2.0
    raise AssertionError("unreachable")


def _scf(
    grid: RadialGrid,
    z: int,
    occ: list[tuple[int, int, float]],
    electrons: float,
    energy_tol: float,
    density_tol: float,
    max_iterations: int,
    mixing: float,
    history: int,
) -> AtomResult:
    """The SCF loop proper (see :func:`solve_atom`)."""
    r = grid.r
    mixer = _PulayMixer(weight=r * grid.step, beta=mixing, depth=history)
    previous: dict[tuple[int, int], tuple[float, FloatArray]] = {}
    residual = math.inf
    energy_prev = math.inf
    v_in = _guess_potential(grid, z, electrons)
    n_in: FloatArray | None = None
    unbound_streak = 0
    for iteration in range(1, max_iterations + 1):
        if not np.all(np.isfinite(v_in)):
            raise SCFNotConverged(
                "the potential became non-finite", residual=residual, iterations=iteration
            )
        try:
            state = _solve_orbitals(grid, z, v_in, occ, previous)
        except _EigenError as exc:
            raise SCFNotConverged(str(exc), residual=residual, iterations=iteration) from None
        previous = state.pairs
        if n_in is None:
            n_in = state.density
            v_in, _ = _potential(grid, z, n_in)
            continue
        energies = _energies(grid, z, state, v_in)
        resid_vec = state.density - n_in
        residual = grid.integrate(np.abs(resid_vec))
        change = abs(energies.total - energy_prev)
        energy_prev = energies.total
        if not (math.isfinite(residual) and math.isfinite(energies.total)):
            raise SCFNotConverged(
                "the density or energy became non-finite", residual=math.inf, iterations=iteration
            )
        unbound_streak = _unbound_streak(state, occ, unbound_streak)
        if iteration >= _UNBOUND_AFTER and unbound_streak >= _UNBOUND_STREAK:
            _check_bound(state, occ, grid, residual, iteration)
        if residual < density_tol and change < energy_tol:
            _check_bound(state, occ, grid, residual, iteration)
            return _result(
                grid,
                z,
                electrons,
                occ,
                state,
                energies,
                iteration,
                residual,
                change,
                energy_tol,
                density_tol,
            )
        n_in = mixer.update(n_in, resid_vec)
        v_in, _ = _potential(grid, z, n_in)
    _check_bound(state, occ, grid, residual, max_iterations)
    raise SCFNotConverged(
        f"self-consistency not reached in {max_iterations} iterations",
        residual=residual,
        iterations=max_iterations,
    )


def _unbound_streak(state: _State, occ: list[tuple[int, int, float]], streak: int) -> int:
    """Consecutive iterations in which some occupied orbital had a non-negative eigenvalue."""
    unbound = any(f > 0.0 and state.pairs[(n, l)][0] >= 0.0 for n, l, f in occ)
    return streak + 1 if unbound else 0


def _check_bound(
    state: _State,
    occ: list[tuple[int, int, float]],
    grid: RadialGrid,
    residual: float,
    iteration: int,
) -> None:
    """Raise SCFNotConverged if an occupied orbital is unbound or leaks out of the grid."""
    r = grid.r
    for n, l, f in occ:
        if f <= 0.0:
            continue
        e, y = state.pairs[(n, l)]
        label = f"{n}{_L_LETTERS[l]}"
        if e >= 0.0:
            raise SCFNotConverged(
                f"the {label} orbital is not bound in this potential (eigenvalue {e:.4g} hartree)",
                residual=residual,
                iterations=iteration,
            )
        tail = grid.integrate(np.where(r > 0.8 * r[-1], r * y * y, 0.0))
        if tail > 1e-10:
            raise _TooDiffuse(
                f"the {label} orbital (eigenvalue {e:.4g} hartree) is too diffuse for "
                f"r_max = {r[-1]:.3g} bohr; use a larger r_max",
                residual=residual,
                iterations=iteration,
            )


def _result(
    grid: RadialGrid,
    z: int,
    electrons: float,
    occ: list[tuple[int, int, float]],
    state: _State,
    en: _Energies,
    iteration: int,
    residual: float,
    change: float,
    energy_tol: float,
    density_tol: float,
) -> AtomResult:
    """Assemble the public result."""
    potential = en.hartree + en.nucleus + en.xc
    scaled = en.hartree + en.nucleus + en.xc_scaling
    return AtomResult(
        z=z,
        electrons=electrons,
        total_energy=en.total,
        kinetic=en.kinetic,
        hartree=en.hartree,
        electron_nucleus=en.nucleus,
        exchange_correlation=en.xc,
        virial_ratio=-potential / en.kinetic,
        scaling_virial_ratio=-scaled / en.kinetic,
        orbitals=_orbitals(grid, state, occ),
        grid=grid,
        density=state.density,
        iterations=iteration,
        residual=residual,
        energy_change=change,
        energy_tolerance=energy_tol,
        density_tolerance=density_tol,
    )
