"""First-order nuclear electric quadrupole hyperfine structure from one nucleus.

One nucleus of spin I ≥ 1 (integer or half-integer: 1 for ¹⁴N, 3/2 for ³⁵Cl)
couples to the rotation, F = J + I, F = |J − I| … J + I.  To first order each
rotational level J splits into its F sublevels, shifted by

    E_Q(F) = X_J · Y(J, I, F)

with Y the Casimir function and X_J the level's effective coupling [MHz],
built from the principal-axis coupling constants χ_gg = eQq_gg and the
level's ⟨P_g²⟩ ([1] Ch. 9; [2] Ch. 6).  A rotational line J_up ← J_lo then
splits into components F_up ← F_lo with ΔF = 0, ±1, whose strengths are
fractions of the unsplit line's strength given by a Wigner 6j symbol ([3]
Ch. 7; [5]).  :func:`wigner_6j` evaluates Racah's formula in exact integer
arithmetic ([4]; [3] Ch. 6); the line tables use the closed forms of the
6j symbols with one argument 1 ([3] Table 5), which agree with it and are
much faster.

Frequencies and couplings are in [MHz]; J, F and I are in units of ħ.

Neglected
---------
* Second-order quadrupole effects: the elements of the quadrupole operator
  between different J (and, in an asymmetric top, between different levels
  of the same J) are dropped.  They matter when such levels lie within a few
  times χ of each other, e.g. near-degenerate K-type doublets.  ΔJ = 0 lines
  between asymmetric-top levels are treated to first order like the others.
* Magnetic spin–rotation and spin–spin coupling (typically kHz to tens of
  kHz for ¹⁴N).
* More than one coupling nucleus.
* Off-diagonal χ_ab, χ_bc, χ_ac: they are not read.  In a level of definite
  symmetry ⟨P_g P_g′ + P_g′ P_g⟩ = 0 for g ≠ g′, so they act only in second
  order.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Ch. 9 (nuclear quadrupole hyperfine structure).
[2] C. H. Townes and A. L. Schawlow, *Microwave Spectroscopy*, McGraw-Hill 1955,
    Ch. 6.
[3] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton 1957,
    Ch. 6 (6j symbols, Eq. 6.3.7) and Ch. 7 (reduced matrix elements in
    coupled schemes).
[4] G. Racah, Phys. Rev. 62, 438 (1942).
[5] R. N. Zare, *Angular Momentum*, Wiley 1988, Ch. 2 and 5.
"""

from __future__ import annotations

import math
import numbers
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

__all__ = [
    "DEFAULT_SPREAD_FRACTION",
    "SIX_J_ZERO",
    "HyperfineComponents",
    "casimir_y",
    "expectation_p_squared_linear",
    "expectation_p_squared_symmetric",
    "level_shift_mhz",
    "line_components",
    "quadrupole_coupling_mhz",
    "spread_mhz",
    "wigner_6j",
]

#: Fraction of a line's strength below which a hyperfine component does not widen a scan
#: [dimensionless]: components weaker than 1 % of the line are lost in the noise of a search for
#: the line itself, so :func:`spread_mhz` leaves them out of the frequency range it reports.
DEFAULT_SPREAD_FRACTION = 0.01

#: |6j| at or below which a component is taken to be forbidden and dropped [dimensionless].
#: Racah's sum is evaluated exactly and the closed forms vanish through an exact factor 0, so a
#: forbidden component's symbol is exactly 0; the margin is only a guard.
SIX_J_ZERO = 1e-14

#: |χaa + χbb + χcc| allowed by default in :func:`quadrupole_coupling_mhz` [MHz].
DEFAULT_TRACE_TOLERANCE_MHZ = 1e-6

#: Relative tolerance of the check ⟨Pa²⟩ + ⟨Pb²⟩ + ⟨Pc²⟩ = J(J+1) [dimensionless].
P_SQUARED_SUM_RTOL = 1e-6


# --- Level shifts ------------------------------------------------------------------------------------


def casimir_y(j, spin_i, f) -> np.ndarray:
    """Casimir function Y(J, I, F) of the first-order quadrupole energy [dimensionless].

    Parameters
    ----------
    j : rotational quantum number J, whole numbers ≥ 0 (scalar or array).
    spin_i : nuclear spin I ≥ 1, a multiple of ½ (scalar).
    f : total angular momentum F, with |J − I| ≤ F ≤ J + I and F − J − I a
        whole number; broadcast against ``j``.

    Returns
    -------
    Y [dimensionless], the broadcast shape of ``j`` and ``f``.

    Notes
    -----
    With C = F(F+1) − I(I+1) − J(J+1) ([1] Ch. 9; [2] Ch. 6):

    Y(J, I, F) = [ (3/4) C (C+1) − I(I+1) J(J+1) ] / [ 2I(2I−1)(2J−1)(2J+3) ]     (1)

    A level with J = 0 has the single sublevel F = I and no quadrupole
    energy; Y is set to 0 there (Eq. (1) gives 0/(−6I(2I−1)) = 0 too).
    Σ_F (2F+1) Y(J, I, F) = 0: the quadrupole energy has no centre-of-gravity
    shift.
    """
    two_i = _two_spin("spin_i", spin_i)
    j = _whole_array("j", j)
    f = _f_array("f", f, j, two_i)
    return _casimir(j, two_i / 2.0, f)


def level_shift_mhz(j, spin_i, f, coupling_mhz) -> np.ndarray:
    """First-order quadrupole shift E_Q of sublevel F of rotational level J [MHz].

    Parameters
    ----------
    j, spin_i, f : as for :func:`casimir_y`.
    coupling_mhz : the level's effective coupling X_J [MHz], finite
        (from :func:`quadrupole_coupling_mhz`); broadcast against ``j``.

    Returns
    -------
    E_Q(F) = X_J · Y(J, I, F) [MHz]   (Eq. (2)).
    """
    y = casimir_y(j, spin_i, f)
    coupling = _finite_array("coupling_mhz", coupling_mhz)
    return coupling * y  # Eq. (2) of [1]


def quadrupole_coupling_mhz(
    j,
    pa2,
    pb2,
    pc2,
    chi_aa_mhz: float,
    chi_bb_mhz: float,
    chi_cc_mhz: float,
    *,
    trace_tolerance_mhz: float = DEFAULT_TRACE_TOLERANCE_MHZ,
) -> np.ndarray:
    """Effective quadrupole coupling X_J of a rotational level [MHz].

    Parameters
    ----------
    j : rotational quantum number J, whole numbers ≥ 0 (scalar or array).
    pa2, pb2, pc2 : ⟨P_a²⟩, ⟨P_b²⟩, ⟨P_c²⟩ of the level, the expectation values
        of the squared angular-momentum components along the principal axes
        [dimensionless, units of ħ²], each ≥ 0 and summing to J(J+1)
        (relative tolerance ``P_SQUARED_SUM_RTOL``).  See
        :func:`expectation_p_squared_linear` and
        :func:`expectation_p_squared_symmetric`; for an asymmetric top they
        are ⟨P_g²⟩ = ∂E/∂G, the derivatives of the rigid-rotor energy with
        respect to the rotational constants G = A, B, C ([1] Ch. 9).
    chi_aa_mhz, chi_bb_mhz, chi_cc_mhz : principal-axis coupling constants
        χ_gg = eQq_gg [MHz], finite, with χaa + χbb + χcc = 0.
    trace_tolerance_mhz : largest |χaa + χbb + χcc| accepted [MHz], ≥ 0;
        default ``DEFAULT_TRACE_TOLERANCE_MHZ`` = 1e-6 MHz.  Published values
        are rounded; pass the catalogue's own tolerance for typed-in sets.

    Returns
    -------
    X_J [MHz], the shape of the broadcast inputs; 0 where J = 0.

    Raises
    ------
    ValueError : bad input, or the χ_gg not traceless within the tolerance.

    Notes
    -----
    The field gradient satisfies Laplace's equation, so the tensor is
    traceless ([1] Ch. 9).  The level's coupling is ([1] Ch. 9)

    X_J = [2 / (J(J+1))] Σ_g χ_gg ⟨P_g²⟩                                        (3)

    and its first-order sublevel shifts are ([1] Ch. 9; [2] Ch. 6)

    E_Q(F) = X_J · Y(J, I, F)                                                 (2)

    Limits: a linear molecule (⟨Pa²⟩ = 0, ⟨Pb²⟩ = ⟨Pc²⟩ = J(J+1)/2) gives
    X_J = χbb + χcc = −eQq; a prolate symmetric top with the nucleus on the
    axis (⟨Pa²⟩ = K², χbb = χcc = −χaa/2) gives X_J = eQq [3K²/(J(J+1)) − 1].
    """
    j = _whole_array("j", j)
    squares = []
    for name, value in (("pa2", pa2), ("pb2", pb2), ("pc2", pc2)):
        array = _finite_array(name, value)
        if np.any(array < 0):
            raise ValueError(f"{name} must be >= 0 (an expectation value of a square), got min {array.min():g}")
        squares.append(array)
    chi = [_finite_scalar(name, value, "MHz") for name, value in _chi_items(chi_aa_mhz, chi_bb_mhz, chi_cc_mhz)]
    tolerance = _finite_scalar("trace_tolerance_mhz", trace_tolerance_mhz, "MHz")
    if tolerance < 0:
        raise ValueError(f"trace_tolerance_mhz must be >= 0 MHz, got {tolerance!r}")
    trace = sum(chi)
    if abs(trace) > tolerance:
        raise ValueError(
            f"chi_aa_mhz + chi_bb_mhz + chi_cc_mhz must be 0 within {tolerance:g} MHz (the field gradient is "
            f"traceless), got {trace:.9g} MHz"
        )
    j, pa2, pb2, pc2 = np.broadcast_arrays(j, *squares)
    jj = j * (j + 1.0)
    total = pa2 + pb2 + pc2
    if np.any(np.abs(total - jj) > P_SQUARED_SUM_RTOL * np.maximum(jj, 1.0)):
        bad = int(np.argmax(np.abs(total - jj).ravel()))
        raise ValueError(
            f"pa2 + pb2 + pc2 must equal J(J+1); got {total.ravel()[bad]:.9g} for j = {j.ravel()[bad]:g} "
            f"(J(J+1) = {jj.ravel()[bad]:g})"
        )
    weighted = chi[0] * pa2 + chi[1] * pb2 + chi[2] * pc2
    with np.errstate(divide="ignore", invalid="ignore"):
        coupling = np.where(j > 0, 2.0 * weighted / np.where(j > 0, jj, 1.0), 0.0)  # Eq. (3) of [1]
    return coupling


def expectation_p_squared_linear(j) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(⟨Pa²⟩, ⟨Pb²⟩, ⟨Pc²⟩) of level J of a linear molecule [dimensionless].

    Parameters
    ----------
    j : rotational quantum number J, whole numbers ≥ 0 (scalar or array).

    Returns
    -------
    (pa2, pb2, pc2), each of the shape of ``j``: (0, J(J+1)/2, J(J+1)/2)   (4)

    Notes
    -----
    The rotation is perpendicular to the axis a ([1] Ch. 9).
    """
    j = _whole_array("j", j)
    half = j * (j + 1.0) / 2.0  # Eq. (4)
    return np.zeros_like(half), half, half.copy()


def expectation_p_squared_symmetric(j, k, axis: str) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(⟨Pa²⟩, ⟨Pb²⟩, ⟨Pc²⟩) of level J, K of a symmetric top [dimensionless].

    Parameters
    ----------
    j : rotational quantum number J, whole numbers ≥ 0 (scalar or array).
    k : projection K on the symmetry axis, whole numbers with |K| ≤ J;
        broadcast against ``j``.
    axis : the symmetry axis, "a" for a prolate top or "c" for an oblate one.

    Returns
    -------
    (pa2, pb2, pc2) of the broadcast shape ([1] Ch. 9):

    prolate ("a"):  (K², (J(J+1) − K²)/2, (J(J+1) − K²)/2)                    (5)
    oblate ("c"):   ((J(J+1) − K²)/2, (J(J+1) − K²)/2, K²)                    (6)
    """
    if axis not in ("a", "c"):
        raise ValueError(f"axis must be 'a' (prolate) or 'c' (oblate), got {axis!r}")
    j = _whole_array("j", j)
    k = _integer_array("k", k)
    j, k = np.broadcast_arrays(j, k)
    if np.any(np.abs(k) > j):
        bad = int(np.argmax((np.abs(k) - j).ravel()))
        raise ValueError(f"k must satisfy |K| <= J, got K = {k.ravel()[bad]:g} for J = {j.ravel()[bad]:g}")
    along = k * k
    across = (j * (j + 1.0) - along) / 2.0
    if axis == "a":
        return along, across, across.copy()  # Eq. (5)
    return across, across.copy(), along  # Eq. (6)


# --- Components of one line -------------------------------------------------------------------------


@dataclass(frozen=True)
class HyperfineComponents:
    """The allowed hyperfine components F_up ← F_lo of one rotational line.

    Arrays of equal length, ordered by ``offset_mhz`` (ties by F_lo, then F_up):

    f_up, f_lo : F of the upper and lower level [dimensionless, units of ħ].
    offset_mhz : E_Q,up(F_up) − E_Q,lo(F_lo), the shift from the unsplit line [MHz].
    relative_intensity : fraction of the unsplit line strength in the component
        [dimensionless]; the fractions sum to 1.
    """

    f_up: np.ndarray
    f_lo: np.ndarray
    offset_mhz: np.ndarray
    relative_intensity: np.ndarray


def line_components(j_up, j_lo, spin_i, coupling_up_mhz, coupling_lo_mhz) -> HyperfineComponents:
    """Hyperfine components of one rotational line J_up ← J_lo, with offsets and strengths.

    Parameters
    ----------
    j_up, j_lo : J of the upper and lower level, whole numbers ≥ 0 with
        J_up − J_lo ∈ {−1, 0, +1}, not both 0.
    spin_i : nuclear spin I ≥ 1, a multiple of ½.
    coupling_up_mhz, coupling_lo_mhz : effective couplings X_J of the upper
        and lower level [MHz], finite (from :func:`quadrupole_coupling_mhz`).

    Returns
    -------
    :class:`HyperfineComponents` with every component of ΔF = 0, ±1 whose 6j
    symbol is not zero (|6j| > ``SIX_J_ZERO``); F = 0 ↔ F = 0 never appears.

    Notes
    -----
    Offset of component F_up ← F_lo, from Eq. (2):

    Δν = X_up Y(J_up, I, F_up) − X_lo Y(J_lo, I, F_lo)                         (7)

    Its fraction of the line strength S of the unsplit line ([3] Ch. 7; [5]; [1] Ch. 9):

    s(F_up, F_lo) = (2F_up+1)(2F_lo+1) {J_lo F_lo I; F_up J_up 1}² / (2I+1)      (8)

    The orthogonality of the 6j symbols gives Σ s = 1 for every line, so
    each component has strength s·S and the components carry the whole line.
    """
    j_up = _whole_scalar("j_up", j_up)
    j_lo = _whole_scalar("j_lo", j_lo)
    _check_pair(j_up, j_lo)
    two_i = _two_spin("spin_i", spin_i)
    x_up = _finite_scalar("coupling_up_mhz", coupling_up_mhz, "MHz")
    x_lo = _finite_scalar("coupling_lo_mhz", coupling_lo_mhz, "MHz")
    f_up, f_lo, fraction, y_up, y_lo = _component_table(j_up, j_lo, two_i)
    offset = x_up * y_up - x_lo * y_lo  # Eq. (7)
    order = np.argsort(offset, kind="stable")
    return HyperfineComponents(
        f_up=f_up[order].copy(),
        f_lo=f_lo[order].copy(),
        offset_mhz=offset[order],
        relative_intensity=fraction[order].copy(),
    )


def spread_mhz(
    j_up,
    j_lo,
    spin_i,
    coupling_up_mhz,
    coupling_lo_mhz,
    min_fraction: float = DEFAULT_SPREAD_FRACTION,
) -> tuple[np.ndarray, np.ndarray]:
    """Lowest and highest hyperfine offset of each of many lines [MHz].

    Parameters
    ----------
    j_up, j_lo : J of the upper and lower level of each line, whole numbers
        ≥ 0 with J_up − J_lo ∈ {−1, 0, +1}, not both 0 (arrays, broadcast).
    spin_i : nuclear spin I ≥ 1, a multiple of ½ (one nucleus for all lines).
    coupling_up_mhz, coupling_lo_mhz : effective couplings X_J of each line's
        upper and lower level [MHz], finite (arrays, broadcast).
    min_fraction : smallest relative intensity (Eq. (8)) of a component that
        counts [dimensionless], in [0, 1]; default ``DEFAULT_SPREAD_FRACTION``.
        A fraction equal to it counts (to 1e-12, so that 1/10 stored as
        0.0999… is not lost).  The strongest component of a line always
        counts, so the range is never empty.

    Returns
    -------
    (low_offset_mhz, high_offset_mhz) [MHz], the broadcast shape: the most
    negative and most positive offset (Eq. (7)) among the counted components.
    Both may be of one sign; both are 0 when the nucleus splits nothing.

    Notes
    -----
    The relative intensities and Y values depend only on (J_up, J_lo, I) and
    are cached; the work is one vectorised pass per distinct (J_lo, ΔJ).
    """
    two_i = _two_spin("spin_i", spin_i)
    fraction_floor = _finite_scalar("min_fraction", min_fraction, "")
    if not 0.0 <= fraction_floor <= 1.0:
        raise ValueError(f"min_fraction must be in [0, 1], got {min_fraction!r}")
    arrays = [
        _whole_array("j_up", j_up),
        _whole_array("j_lo", j_lo),
        _finite_array("coupling_up_mhz", coupling_up_mhz),
        _finite_array("coupling_lo_mhz", coupling_lo_mhz),
    ]
    try:
        j_up, j_lo, x_up, x_lo = np.broadcast_arrays(*arrays)
    except ValueError:
        shapes = ", ".join(str(a.shape) for a in arrays)
        raise ValueError(
            f"j_up, j_lo, coupling_up_mhz and coupling_lo_mhz must broadcast together, got shapes {shapes}"
        ) from None
    shape = j_up.shape
    j_up, j_lo, x_up, x_lo = (a.ravel() for a in (j_up, j_lo, x_up, x_lo))
    delta = j_up - j_lo
    if np.any(np.abs(delta) > 1):
        bad = int(np.argmax(np.abs(delta)))
        raise ValueError(
            f"j_up - j_lo must be -1, 0 or +1 for a dipole line, got j_up = {j_up[bad]:g}, j_lo = {j_lo[bad]:g} "
            f"(line {bad})"
        )
    both_zero = (j_up == 0) & (j_lo == 0)
    if np.any(both_zero):
        bad = int(np.argmax(both_zero))
        raise ValueError(f"j_up = j_lo = 0 is not a dipole line (line {bad})")
    low = np.zeros(j_up.size)
    high = np.zeros(j_up.size)
    if j_up.size == 0:
        return low.reshape(shape), high.reshape(shape)
    keys = (j_lo.astype(np.int64) * 3 + (delta.astype(np.int64) + 1)).astype(np.int64)
    unique_keys, inverse = np.unique(keys, return_inverse=True)
    order = np.argsort(inverse, kind="stable")
    bounds = np.searchsorted(inverse[order], np.arange(unique_keys.size + 1))
    for g, key in enumerate(unique_keys):
        lines = order[bounds[g] : bounds[g + 1]]
        lower_j = int(key // 3)
        upper_j = lower_j + int(key % 3) - 1
        _, _, fraction, y_up, y_lo = _component_table(upper_j, lower_j, two_i)
        counted = fraction >= fraction_floor - 1e-12
        counted[np.argmax(fraction)] = True
        offsets = np.outer(x_up[lines], y_up[counted]) - np.outer(x_lo[lines], y_lo[counted])  # Eq. (7)
        low[lines] = offsets.min(axis=1)
        high[lines] = offsets.max(axis=1)
    return low.reshape(shape), high.reshape(shape)


# --- Wigner 6j symbols ------------------------------------------------------------------------------


def wigner_6j(j1, j2, j3, j4, j5, j6) -> float:
    """Wigner 6j symbol {j1 j2 j3; j4 j5 j6} by Racah's formula [dimensionless].

    Parameters
    ----------
    j1 … j6 : angular momenta, each ≥ 0 and a multiple of ½ (int, float or
        fractions.Fraction).

    Returns
    -------
    The 6j symbol as a float, 0.0 when a triangle condition fails.

    Notes
    -----
    The triads (j1 j2 j3), (j1 j5 j6), (j4 j2 j6), (j4 j5 j3) must each obey
    the triangle rule and sum to a whole number.  With
    Δ(abc) = [(a+b−c)!(a−b+c)!(−a+b+c)!/(a+b+c+1)!]^½ ([4]; Eq. 6.3.7 of [3]):

    {j1 j2 j3; j4 j5 j6} = Δ(j1j2j3)Δ(j1j5j6)Δ(j4j2j6)Δ(j4j5j3)
        × Σ_t (−1)^t (t+1)! / [(t−α1)!(t−α2)!(t−α3)!(t−α4)!(β1−t)!(β2−t)!(β3−t)!]   (9)

    α1 = j1+j2+j3, α2 = j1+j5+j6, α3 = j4+j2+j6, α4 = j4+j5+j3,
    β1 = j1+j2+j4+j5, β2 = j2+j3+j5+j6, β3 = j3+j1+j6+j4, and t runs over the
    whole numbers with max α ≤ t ≤ min β.  The sum is taken over a common
    denominator in Python integers, so it is exact (an exact 0 stays 0) and
    the only rounding is the final division and square root, about 1 ulp.
    """
    doubled = tuple(_two_spin(f"j{n}", value, minimum=0) for n, value in enumerate((j1, j2, j3, j4, j5, j6), 1))
    return _six_j_doubled(*doubled)


@lru_cache(maxsize=65536)
def _six_j_doubled(d1: int, d2: int, d3: int, d4: int, d5: int, d6: int) -> float:
    """{j1 … j6} from the doubled values 2j (Eq. (9))."""
    triads = ((d1, d2, d3), (d1, d5, d6), (d4, d2, d6), (d4, d5, d3))
    for a, b, c in triads:
        if (a + b + c) % 2 or a > b + c or b > a + c or c > a + b:
            return 0.0
    fact = _factorials((d1 + d2 + d3 + d4 + d5 + d6) // 2 + 1)
    numerator = 1
    denominator = 1
    for a, b, c in triads:  # Δ² of Eq. (9)
        numerator *= fact[(a + b - c) // 2] * fact[(a - b + c) // 2] * fact[(-a + b + c) // 2]
        denominator *= fact[(a + b + c) // 2 + 1]
    alphas = [(a + b + c) // 2 for a, b, c in triads]
    betas = [(d1 + d2 + d4 + d5) // 2, (d2 + d3 + d5 + d6) // 2, (d3 + d1 + d6 + d4) // 2]
    t_min, t_max = max(alphas), min(betas)
    if t_min > t_max:
        return 0.0
    # Common denominator Π (t_max − α)! Π (β − t_min)!: each term becomes a whole number.
    common = 1
    for alpha in alphas:
        common *= fact[t_max - alpha]
    for beta in betas:
        common *= fact[beta - t_min]
    total = 0
    for t in range(t_min, t_max + 1):
        term = fact[t + 1] * common
        for alpha in alphas:
            term //= fact[t - alpha]
        for beta in betas:
            term //= fact[beta - t]
        total += -term if t % 2 else term  # Eq. (9) of [3], times the common denominator
    if total == 0:
        return 0.0
    # The falling-factorial ratios are exact, so the floor divisions above lose nothing.
    square = (numerator * total * total) / (denominator * common * common)
    return math.sqrt(square) if total > 0 else -math.sqrt(square)


_FACTORIAL_TABLE = [1]


def _factorials(n: int) -> list[int]:
    """The table 0!, 1!, …, n! (at least), grown on demand."""
    table = _FACTORIAL_TABLE
    while len(table) <= n:
        table.append(table[-1] * len(table))
    return table


# --- Cached per-line tables -------------------------------------------------------------------------


def _six_j_rank1(two_a: int, two_b: int, two_c: int, dc: int, db: int) -> float:
    """{a b c; 1 c+dc b+db} for dc, db ∈ {−1, 0, +1} from the closed forms of [3] (Table 5).

    With s = a + b + c ([3], Table 5):

    {a b c; 1 c−1 b−1} = (−1)^s [s(s+1)(s−2a−1)(s−2a) / ((2b−1)2b(2b+1)(2c−1)2c(2c+1))]^½      (10)
    {a b c; 1 c−1 b}   = (−1)^s [2(s+1)(s−2a)(s−2b)(s−2c+1) / (2b(2b+1)(2b+2)(2c−1)2c(2c+1))]^½  (11)
    {a b c; 1 c−1 b+1} = (−1)^s [(s−2b−1)(s−2b)(s−2c+1)(s−2c+2) / ((2b+1)(2b+2)(2b+3)(2c−1)2c(2c+1))]^½  (12)
    {a b c; 1 c b}     = (−1)^(s+1) 2[b(b+1) + c(c+1) − a(a+1)] / [2b(2b+1)(2b+2)2c(2c+1)(2c+2)]^½  (13)

    and the other five (dc, db) follow from the column and row symmetries of
    the 6j symbol ([3] Ch. 6).  Each is a product of whole or half-whole
    numbers and one square root: no cancellation, a few ulp at any J, and an
    exact 0 wherever a factor vanishes.  Racah's sum (Eq. (9)) gives the same
    values (tests) but is far slower, and the line tables need thousands.
    """
    two_e, two_f = two_c + 2 * dc, two_b + 2 * db
    for x, y, z in ((two_a, two_b, two_c), (two_a, two_e, two_f), (2, two_b, two_f), (2, two_e, two_c)):
        if x < 0 or y < 0 or z < 0 or (x + y + z) % 2 or x > y + z or y > x + z or z > x + y:
            return 0.0
    if dc == 0 and db == -1:  # {a b c; 1 c b−1} = {a c b; 1 b−1 c}
        return _six_j_rank1(two_a, two_c, two_b, -1, 0)
    if dc == 0 and db == 1:  # {a b c; 1 c b+1} = {a c b; 1 b+1 c}
        return _six_j_rank1(two_a, two_c, two_b, 1, 0)
    if dc == 1:  # {a b c; 1 c+1 b+db} = {a c+1 b+db; 1 b c} = {a b+db c+1; 1 c b}
        return _six_j_rank1(two_a, two_f, two_e, -1, -db)
    a, b, c = two_a / 2.0, two_b / 2.0, two_c / 2.0
    two_s = two_a + two_b + two_c
    s = two_s / 2.0
    sign = -1.0 if (two_s // 2) % 2 else 1.0
    if dc == 0:  # db == 0
        numerator = 2.0 * (b * (b + 1.0) + c * (c + 1.0) - a * (a + 1.0))
        denominator = (2 * b) * (2 * b + 1) * (2 * b + 2) * (2 * c) * (2 * c + 1) * (2 * c + 2)
        return -sign * numerator / math.sqrt(denominator)  # Eq. (13) of [3]
    low_c = (2 * c - 1) * (2 * c) * (2 * c + 1)
    if db == -1:  # Eq. (10) of [3]
        numerator = s * (s + 1) * (s - 2 * a - 1) * (s - 2 * a)
        denominator = (2 * b - 1) * (2 * b) * (2 * b + 1) * low_c
    elif db == 0:  # Eq. (11) of [3]
        numerator = 2 * (s + 1) * (s - 2 * a) * (s - 2 * b) * (s - 2 * c + 1)
        denominator = (2 * b) * (2 * b + 1) * (2 * b + 2) * low_c
    else:  # Eq. (12) of [3]
        numerator = (s - 2 * b - 1) * (s - 2 * b) * (s - 2 * c + 1) * (s - 2 * c + 2)
        denominator = (2 * b + 1) * (2 * b + 2) * (2 * b + 3) * low_c
    # Inside the triangle rules every factor is >= 0; max() only guards a rounded −0.
    return sign * math.sqrt(max(numerator / denominator, 0.0))


@lru_cache(maxsize=4096)
def _component_table(j_up: int, j_lo: int, two_i: int) -> tuple[np.ndarray, ...]:
    """(f_up, f_lo, fraction, Y_up, Y_lo) of every allowed component, read-only (Eq. (8), Eq. (1))."""
    spin = two_i / 2.0
    rows = []
    for two_f_lo in range(abs(2 * j_lo - two_i), 2 * j_lo + two_i + 1, 2):
        for two_f_up in (two_f_lo - 2, two_f_lo, two_f_lo + 2):
            if two_f_up < abs(2 * j_up - two_i) or two_f_up > 2 * j_up + two_i:
                continue
            # {J_lo F_lo I; F_up J_up 1} = {I J_lo F_lo; 1 F_up J_up} (columns permuted, [3] Ch. 6).
            six_j = _six_j_rank1(two_i, 2 * j_lo, two_f_lo, (two_f_up - two_f_lo) // 2, j_up - j_lo)
            if abs(six_j) <= SIX_J_ZERO:
                continue
            fraction = (two_f_up + 1) * (two_f_lo + 1) * six_j * six_j / (two_i + 1)  # Eq. (8) of [3]
            rows.append((two_f_up / 2.0, two_f_lo / 2.0, fraction))
    f_up, f_lo, fraction = (np.array(column, dtype=float) for column in zip(*rows))
    y_up = _casimir(np.full(f_up.shape, float(j_up)), spin, f_up)
    y_lo = _casimir(np.full(f_lo.shape, float(j_lo)), spin, f_lo)
    table = (f_up, f_lo, fraction, y_up, y_lo)
    for array in table:
        array.setflags(write=False)
    return table


def _casimir(j: np.ndarray, spin: float, f: np.ndarray) -> np.ndarray:
    """Eq. (1) on checked arrays; 0 where J = 0."""
    j, f = np.broadcast_arrays(np.asarray(j, dtype=float), np.asarray(f, dtype=float))
    ii = spin * (spin + 1.0)
    jj = j * (j + 1.0)
    c = f * (f + 1.0) - ii - jj
    numerator = 0.75 * c * (c + 1.0) - ii * jj
    denominator = 2.0 * spin * (2.0 * spin - 1.0) * (2.0 * j - 1.0) * (2.0 * j + 3.0)
    return np.where(j > 0, numerator / denominator, 0.0)  # Eq. (1) of [1]


# --- Input checks -----------------------------------------------------------------------------------


def _check_pair(j_up: int, j_lo: int) -> None:
    if abs(j_up - j_lo) > 1:
        raise ValueError(f"j_up - j_lo must be -1, 0 or +1 for a dipole line, got j_up = {j_up}, j_lo = {j_lo}")
    if j_up == 0 and j_lo == 0:
        raise ValueError("j_up = j_lo = 0 is not a dipole line")


def _two_spin(name: str, value, minimum: int = 2) -> int:
    """2·value as an int, for a value ≥ minimum/2 that is a multiple of ½."""
    if isinstance(value, bool) or not isinstance(value, numbers.Real):
        raise ValueError(f"{name} must be a number, a multiple of 1/2, got {value!r}")
    doubled = 2 * value
    if not math.isfinite(doubled) or abs(doubled - round(doubled)) > 1e-9:
        raise ValueError(f"{name} must be a multiple of 1/2 (integer or half-integer), got {value!r}")
    doubled = int(round(doubled))
    if doubled < minimum:
        what = (
            "a nuclear spin I >= 1 (I = 1/2 has no quadrupole moment)" if minimum == 2 else "an angular momentum >= 0"
        )
        raise ValueError(f"{name} must be {what}, got {value!r}")
    return doubled


def _numeric_array(name: str, value) -> np.ndarray:
    try:
        array = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise ValueError(f"{name} must be a number or an array of numbers, got {value!r}") from None
    if np.asarray(value).dtype == bool:
        raise ValueError(f"{name} must be a number or an array of numbers, got booleans")
    return array


def _finite_array(name: str, value) -> np.ndarray:
    array = _numeric_array(name, value)
    if not np.all(np.isfinite(array)):
        raise ValueError(f"{name} must be finite, got {value!r}")
    return array


def _integer_array(name: str, value) -> np.ndarray:
    array = _finite_array(name, value)
    if np.any(array != np.round(array)):
        raise ValueError(f"{name} must hold whole numbers, got {value!r}")
    return array


def _whole_array(name: str, value) -> np.ndarray:
    array = _integer_array(name, value)
    if np.any(array < 0):
        raise ValueError(f"{name} must be >= 0 (a rotational quantum number), got min {array.min():g}")
    return array


def _whole_scalar(name: str, value) -> int:
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value):
        raise ValueError(f"{name} must be a whole number >= 0, got {value!r}")
    if value != round(value) or value < 0:
        raise ValueError(f"{name} must be a whole number >= 0 (a rotational quantum number), got {value!r}")
    return int(round(value))


def _finite_scalar(name: str, value, unit: str) -> float:
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value):
        raise ValueError(f"{name} must be a finite number{' ' + unit if unit else ''}, got {value!r}")
    return float(value)


def _f_array(name: str, value, j: np.ndarray, two_i: int) -> np.ndarray:
    """F checked against the triangle (J, I, F) and the parity of J + I + F."""
    f = _finite_array(name, value)
    try:
        j_b, f_b = np.broadcast_arrays(j, f)
    except ValueError:
        raise ValueError(f"{name} must broadcast against j, got shapes {f.shape} and {j.shape}") from None
    doubled = 2.0 * f_b
    two_j = 2.0 * j_b
    bad = (
        (np.abs(doubled - np.round(doubled)) > 1e-9)
        | ((np.round(doubled) + two_j + two_i) % 2 != 0)
        | (np.round(doubled) < np.abs(two_j - two_i))
        | (np.round(doubled) > two_j + two_i)
    )
    if np.any(bad):
        k = int(np.argmax(bad.ravel()))
        raise ValueError(
            f"{name} must be one of |J - I|, ..., J + I; got F = {f_b.ravel()[k]:g} for J = {j_b.ravel()[k]:g}, "
            f"I = {two_i / 2:g}"
        )
    return f_b


def _chi_items(chi_aa_mhz, chi_bb_mhz, chi_cc_mhz):
    return (("chi_aa_mhz", chi_aa_mhz), ("chi_bb_mhz", chi_bb_mhz), ("chi_cc_mhz", chi_cc_mhz))
