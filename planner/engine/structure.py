"""Molecular structure from rotational constants: bond lengths, moments, Kraitchman, r0 fits.

Masses are arguments in unified atomic mass units [u]; this module holds no
mass table (the caller, or a test, supplies isotopic masses).  Coordinates are
Cartesian in ångström [Å], moments of inertia in [u·Å²], constants in [MHz].

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Ch. 13 (molecular structures: r0, rs, re; Kraitchman's equations).
[2] J. Kraitchman, Am. J. Phys. 21, 17 (1953) (single isotopic substitution).
[3] C. H. Townes and A. L. Schawlow, *Microwave Spectroscopy*, McGraw-Hill 1955, Ch. 13.
[4] Linecast physics conventions (shared/PHYSICS.md), "Structure".
"""

from __future__ import annotations

import dataclasses
import math
import numbers
from collections.abc import Callable, Sequence

import numpy as np
from scipy.optimize import least_squares

from .constants import INERTIA_MHZ_AMU_A2

__all__ = [
    "Isotopologue",
    "KraitchmanCoordinates",
    "StructureFit",
    "bond_length_a",
    "equilibrium_b_mhz",
    "fit_internal_coordinates",
    "inertia_tensor_amu_a2",
    "kraitchman_coordinates_a",
    "kraitchman_linear_coordinate_a",
    "linear_triatomic_builder",
    "principal_axis_coordinates_a",
    "principal_moments_amu_a2",
    "reduced_mass_amu",
    "rotational_constants_mhz",
    "triatomic_bent_builder",
]

#: A principal moment smaller than this fraction of the largest one is set to
#: exactly 0 (a linear molecule's Ia is rounding noise of order 1e-16·Ic).
LINEAR_MOMENT_FRACTION = 1e-12

#: Two parent moments closer than this fraction of the largest are treated as
#: equal: Kraitchman's equations divide by their difference.
DEGENERATE_MOMENT_FRACTION = 1e-9


# --- Diatomics ---------------------------------------------------------------------------------


def reduced_mass_amu(m1_amu: float, m2_amu: float) -> float:
    """Reduced mass μ = m1·m2 / (m1 + m2) of two masses [u].

    Parameters
    ----------
    m1_amu, m2_amu : masses [u], each a finite number > 0.

    Notes
    -----
    μ = m1 m2 / (m1 + m2)                                          (1)

    Eq. (1) is the two-body reduced mass, [1] Ch. 13.
    """
    m1 = _positive("m1_amu", m1_amu, "u")
    m2 = _positive("m2_amu", m2_amu, "u")
    return m1 * m2 / (m1 + m2)  # Eq. (1) of [1]


def bond_length_a(b_mhz: float, m1_amu: float, m2_amu: float, sigma_b_mhz: float = 0.0) -> tuple[float, float]:
    """Bond length of a diatomic from its rotational constant, with its 1σ [Å].

    With B0 this gives r0; with Be (see :func:`equilibrium_b_mhz`) it gives re.

    Parameters
    ----------
    b_mhz : rotational constant B [MHz], > 0.
    m1_amu, m2_amu : the two atomic masses [u], > 0.
    sigma_b_mhz : 1σ uncertainty of B [MHz], ≥ 0.

    Returns
    -------
    (r, σ_r) [Å].

    Notes
    -----
    I = h / (8π² B) = μ r²                                         (2)

    σ_r = r · σ_B / (2B)                                           (3)

    Eq. (2) is [1] Ch. 13 and [4] "Structure" (constants.INERTIA_MHZ_AMU_A2 holds
    h/(8π²) in MHz·u·Å²); Eq. (3) is first-order propagation, since r ∝ B^(−1/2).
    """
    b = _positive("b_mhz", b_mhz, "MHz")
    sigma_b = _non_negative("sigma_b_mhz", sigma_b_mhz, "MHz")
    mu = reduced_mass_amu(m1_amu, m2_amu)
    r = math.sqrt(INERTIA_MHZ_AMU_A2 / (b * mu))  # Eq. (2) of [1]
    return r, r * sigma_b / (2.0 * b)  # Eq. (3)


def equilibrium_b_mhz(
    b0_mhz: float, alpha_e_mhz: float, sigma_b0: float = 0.0, sigma_alpha: float = 0.0
) -> tuple[float, float]:
    """Equilibrium rotational constant Be of a diatomic from B0 and αe, with its 1σ [MHz].

    Parameters
    ----------
    b0_mhz : ground-state rotational constant B0 [MHz], > 0.
    alpha_e_mhz : vibration–rotation constant αe [MHz], finite (normally > 0).
    sigma_b0, sigma_alpha : 1σ uncertainties of B0 and αe [MHz], ≥ 0.

    Returns
    -------
    (Be, σ_Be) [MHz].

    Notes
    -----
    B_v = Be − αe (v + ½)                                          (4)

    so Be = B0 + αe/2 and σ_Be = √(σ_B0² + (σ_α/2)²), [1] Ch. 13.  Higher terms
    (γe) are left out.
    """
    b0 = _positive("b0_mhz", b0_mhz, "MHz")
    alpha = _finite("alpha_e_mhz", alpha_e_mhz, "MHz")
    s_b0 = _non_negative("sigma_b0", sigma_b0, "MHz")
    s_alpha = _non_negative("sigma_alpha", sigma_alpha, "MHz")
    be = b0 + alpha / 2.0  # Eq. (4) of [1] at v = 0
    if be <= 0.0:
        raise ValueError(f"alpha_e_mhz = {alpha!r} MHz gives Be = B0 + alpha_e/2 = {be!r} MHz; Be must be > 0")
    return be, math.hypot(s_b0, s_alpha / 2.0)


# --- Moments of inertia from a geometry ---------------------------------------------------------


def inertia_tensor_amu_a2(masses_amu: Sequence[float], coordinates_a) -> np.ndarray:
    """Inertia tensor about the centre of mass [u·Å²], a 3×3 symmetric array.

    Parameters
    ----------
    masses_amu : N atomic masses [u], each > 0, N ≥ 1.
    coordinates_a : N×3 Cartesian coordinates [Å], any origin.

    Notes
    -----
    I = Σ m_i (|r_i|² 𝟙 − r_i r_iᵀ),  r_i measured from the centre of mass   (5)

    Eq. (5) is the rigid-body inertia tensor, [1] Ch. 13.
    """
    masses, coords = _geometry(masses_amu, coordinates_a)
    centred = coords - masses @ coords / masses.sum()
    second = np.einsum("i,ij,ik->jk", masses, centred, centred)  # Σ m r rᵀ
    return np.trace(second) * np.eye(3) - second  # Eq. (5) of [1]


def principal_moments_amu_a2(masses_amu: Sequence[float], coordinates_a) -> tuple[np.ndarray, np.ndarray]:
    """Principal moments (Ia ≤ Ib ≤ Ic) [u·Å²] and principal axes of a geometry.

    Parameters
    ----------
    masses_amu, coordinates_a : as for :func:`inertia_tensor_amu_a2` ([u], [Å]).

    Returns
    -------
    (moments, axes): moments a length-3 array [u·Å²] in ascending order; axes a
    3×3 array whose columns are the unit vectors of a, b, c in the input frame.
    A moment below LINEAR_MOMENT_FRACTION × the largest one (Ia of a linear
    molecule) is returned as exactly 0.

    Notes
    -----
    The eigenvalues and eigenvectors of Eq. (5); a ↔ smallest moment (Ir axis
    labels, [1] Ch. 13).
    """
    moments, axes = np.linalg.eigh(inertia_tensor_amu_a2(masses_amu, coordinates_a))
    largest = moments[-1]
    moments = np.where(np.abs(moments) <= LINEAR_MOMENT_FRACTION * largest, 0.0, moments)
    return moments, axes


def principal_axis_coordinates_a(masses_amu: Sequence[float], coordinates_a) -> np.ndarray:
    """Atomic coordinates in the principal-axis system (a, b, c columns) [Å], N×3.

    Parameters
    ----------
    masses_amu, coordinates_a : as for :func:`inertia_tensor_amu_a2` ([u], [Å]).

    Notes
    -----
    Centre of mass removed, then projected on the axes of
    :func:`principal_moments_amu_a2`.  The sign of each axis is arbitrary (as
    it is for the molecule), so compare absolute values.
    """
    masses, coords = _geometry(masses_amu, coordinates_a)
    _, axes = principal_moments_amu_a2(masses, coords)
    return (coords - masses @ coords / masses.sum()) @ axes


def rotational_constants_mhz(masses_amu: Sequence[float], coordinates_a) -> tuple[float, float, float]:
    """Rigid-rotor rotational constants (A, B, C) of a geometry [MHz], A ≥ B ≥ C.

    Parameters
    ----------
    masses_amu, coordinates_a : as for :func:`inertia_tensor_amu_a2` ([u], [Å]);
        at least two atoms not at the same place.

    Returns
    -------
    (A, B, C) [MHz].  A linear molecule (Ia = 0) has A = math.inf.

    Notes
    -----
    G = h / (8π² I_g) for g = a, b, c                              (6)

    Eq. (6) is Eq. (2) about each principal axis ([4], "Structure").
    """
    moments, _ = principal_moments_amu_a2(masses_amu, coordinates_a)
    if moments[-1] <= 0.0:
        raise ValueError("coordinates_a must place the atoms at two or more distinct points; all moments are 0")
    a, b, c = (math.inf if i == 0.0 else INERTIA_MHZ_AMU_A2 / i for i in moments)  # Eq. (6)
    return a, b, c


# --- Kraitchman's equations (rs coordinates) -----------------------------------------------------


@dataclasses.dataclass(frozen=True)
class KraitchmanCoordinates:
    """|a|, |b|, |c| [Å] of a substituted atom in the parent's principal-axis system.

    ``squared_a2`` holds the signed squares (a², b², c²) [Å²] that Kraitchman's
    equations give.  A square below zero (common for an atom close to an axis,
    where vibration makes the square a small difference of large numbers) is
    reported as coordinate 0 with ``imaginary`` True for that axis.
    """

    a_a: float
    b_a: float
    c_a: float
    squared_a2: tuple[float, float, float]
    imaginary: tuple[bool, bool, bool]

    @property
    def coordinates_a(self) -> tuple[float, float, float]:
        """(|a|, |b|, |c|) [Å]."""
        return (self.a_a, self.b_a, self.c_a)


def kraitchman_coordinates_a(
    parent_moments_amu_a2: Sequence[float],
    substituted_moments_amu_a2: Sequence[float],
    parent_mass_amu: float,
    delta_mass_amu: float,
    planar: bool = False,
) -> KraitchmanCoordinates:
    """Kraitchman substitution coordinates of one atom of a non-linear molecule [Å].

    Parameters
    ----------
    parent_moments_amu_a2 : parent (Ia, Ib, Ic) [u·Å²], 0 < Ia ≤ Ib ≤ Ic, with
        Ia, Ib, Ic pairwise distinct (a symmetric top is refused).  With
        ``planar`` only Ia < Ib are used; Ic may be given as anything > 0.
    substituted_moments_amu_a2 : (Ia′, Ib′, Ic′) of the singly substituted
        isotopologue [u·Å²], each > 0 (Ic′ unused with ``planar``).
    parent_mass_amu : total mass M of the parent [u], > 0.
    delta_mass_amu : mass change Δm of the substituted atom [u], ≠ 0 and
        > −M (a lighter isotope is allowed).
    planar : True for a planar molecule with the atom in the ab plane: the
        planar form, which takes c = 0 and ignores both Ic (whose inertial
        defect would otherwise enter).

    Returns
    -------
    :class:`KraitchmanCoordinates`.

    Notes
    -----
    With the planar moments P_g = Σ m g² = (Ia + Ib + Ic − 2 I_g)/2 and the
    substitution reduced mass

    μ = M Δm / (M + Δm)                                            (7)

    the second-moment tensor of the isotopologue, in the parent's axes and about
    its new centre of mass, is diag(P_a, P_b, P_c) + μ r rᵀ with r = (a, b, c).
    Its eigenvalues P′_k therefore satisfy 1 + μ Σ_g g²/(P_g − P′_k) = 0, and the
    residue at P_a gives ([2]; [1] Ch. 13):

    μ a² = ΔP_a · (1 + ΔP_b/(P_b − P_a)) · (1 + ΔP_c/(P_c − P_a))   (8)

    and cyclically for b and c, with ΔP_g = P′_g − P_g and P_b − P_a = Ia − Ib.
    The code uses the equivalent product Π_k (P′_k − P_a) / Π_(g≠a) (P_g − P_a),
    which does not depend on which substituted axis is called which.  Planar:
    P_a = Ib, P_b = Ia, P_c = 0, and Eq. (8) reduces to

    μ a² = ΔIb (1 + ΔIa/(Ia − Ib)),  μ b² = ΔIa (1 + ΔIb/(Ib − Ia))  (9)

    Both are exact for rigid moments; for ground-state (r0) moments they give rs.
    """
    parent = _moments("parent_moments_amu_a2", parent_moments_amu_a2)
    substituted = _moments("substituted_moments_amu_a2", substituted_moments_amu_a2, ordered=False)
    mu = _substitution_mass(parent_mass_amu, delta_mass_amu)  # Eq. (7)
    i_a, i_b, i_c = parent
    if planar:
        _distinct(parent[:2], "parent_moments_amu_a2 (Ia, Ib; planar form)")
        p_parent = np.array([i_b, i_a])  # P_a = Ib, P_b = Ia when Ic = Ia + Ib
        p_sub = substituted[:2]  # P′_k in any order: Eq. (8) is symmetric in k
    else:
        _distinct(parent, "parent_moments_amu_a2")
        p_parent = _planar_moments(parent)
        p_sub = _planar_moments(substituted)
    squares = []
    for g, p_g in enumerate(p_parent):
        others = np.delete(p_parent, g)
        squares.append(float(np.prod(p_sub - p_g) / np.prod(others - p_g) / mu))  # Eq. (8) / (9)
    if planar:
        squares.append(0.0)
    imaginary = tuple(s < 0.0 for s in squares)
    a, b, c = (math.sqrt(s) if s > 0.0 else 0.0 for s in squares)
    return KraitchmanCoordinates(a, b, c, tuple(squares), imaginary)


def kraitchman_linear_coordinate_a(
    parent_moment_amu_a2: float, substituted_moment_amu_a2: float, parent_mass_amu: float, delta_mass_amu: float
) -> tuple[float, bool]:
    """Kraitchman coordinate |z| of one atom of a linear molecule [Å].

    Parameters
    ----------
    parent_moment_amu_a2 : parent moment I = Ib [u·Å²], > 0.
    substituted_moment_amu_a2 : moment I′ of the singly substituted isotopologue [u·Å²], > 0.
    parent_mass_amu, delta_mass_amu : M [u] > 0 and Δm [u], ≠ 0 and > −M.

    Returns
    -------
    (|z|, imaginary): distance of the atom from the parent's centre of mass [Å],
    and True when z² < 0 (then |z| is returned as 0).

    Notes
    -----
    |z|² = ΔI / μ,  ΔI = I′ − I,  μ from Eq. (7)                   (10)

    [2]; [1] Ch. 13.
    """
    i = _positive("parent_moment_amu_a2", parent_moment_amu_a2, "u·Å²")
    i_sub = _positive("substituted_moment_amu_a2", substituted_moment_amu_a2, "u·Å²")
    mu = _substitution_mass(parent_mass_amu, delta_mass_amu)
    z2 = (i_sub - i) / mu  # Eq. (10) of [1]
    return (math.sqrt(z2), False) if z2 >= 0.0 else (0.0, True)


# --- r0 fits -------------------------------------------------------------------------------------


@dataclasses.dataclass(frozen=True)
class Isotopologue:
    """One isotopologue for an r0 fit: atomic masses and observed principal moments.

    ``masses_amu`` [u] are in the order of the builder's atoms.
    ``moments_amu_a2`` is (Ia, Ib, Ic) [u·Å²]; an unobserved moment is None
    (for a linear molecule give (None, Ib, None)).
    """

    name: str
    masses_amu: tuple[float, ...]
    moments_amu_a2: tuple[float | None, float | None, float | None]

    def __post_init__(self):
        masses = tuple(_positive(f"{self.name}: masses_amu[{i}]", m, "u") for i, m in enumerate(self.masses_amu))
        if len(self.moments_amu_a2) != 3:
            raise ValueError(f"{self.name}: moments_amu_a2 must be (Ia, Ib, Ic) with None for unobserved ones")
        moments = tuple(
            None if m is None else _positive(f"{self.name}: moments_amu_a2[{i}]", m, "u·Å²")
            for i, m in enumerate(self.moments_amu_a2)
        )
        if all(m is None for m in moments):
            raise ValueError(f"{self.name}: moments_amu_a2 has no observed moment")
        object.__setattr__(self, "masses_amu", masses)
        object.__setattr__(self, "moments_amu_a2", moments)

    @classmethod
    def from_constants_mhz(
        cls,
        name: str,
        masses_amu: Sequence[float],
        a_mhz: float | None,
        b_mhz: float | None,
        c_mhz: float | None,
    ) -> Isotopologue:
        """An isotopologue from observed A, B, C [MHz] (None for unobserved), via Eq. (2)."""
        moments = tuple(
            None if g is None else INERTIA_MHZ_AMU_A2 / _positive(label, g, "MHz")
            for label, g in (("a_mhz", a_mhz), ("b_mhz", b_mhz), ("c_mhz", c_mhz))
        )
        return cls(name, tuple(masses_amu), moments)


@dataclasses.dataclass(frozen=True)
class StructureFit:
    """Result of :func:`fit_internal_coordinates`.

    ``values`` and ``sigmas`` are in the builder's units (e.g. Å and degrees),
    ``residuals_amu_a2`` are observed − calculated moments [u·Å²] in the order
    (isotopologue, axis) of the observed moments, ``labels`` names each one.
    ``sigmas`` are nan when the fit has no degrees of freedom and no
    moment uncertainty was given.
    """

    names: tuple[str, ...]
    values: tuple[float, ...]
    sigmas: tuple[float, ...]
    covariance: np.ndarray
    residuals_amu_a2: tuple[float, ...]
    labels: tuple[str, ...]
    degrees_of_freedom: int

    @property
    def rms_amu_a2(self) -> float:
        """Root-mean-square residual [u·Å²]."""
        return float(np.sqrt(np.mean(np.square(self.residuals_amu_a2))))

    def as_dict(self) -> dict[str, tuple[float, float]]:
        """{name: (value, sigma)}."""
        return {n: (v, s) for n, v, s in zip(self.names, self.values, self.sigmas, strict=True)}


def fit_internal_coordinates(
    build: Callable[..., np.ndarray],
    initial: Sequence[float],
    isotopologues: Sequence[Isotopologue],
    names: Sequence[str] | None = None,
    moment_uncertainty_amu_a2: float | None = None,
    rcond: float = 1e-8,
    relative_step: float = 1e-6,
    max_nfev: int = 200,
) -> StructureFit:
    """r0 fit: internal coordinates that reproduce the observed moments of several isotopologues.

    Parameters
    ----------
    build : callable, called as ``build(*params)``, returning the N×3
        Cartesian coordinates [Å] of the N atoms, e.g. :func:`triatomic_bent_builder`.
    initial : starting values of the parameters (builder units, e.g. Å, degrees).
    isotopologues : :class:`Isotopologue` items, masses in the builder's atom order.
    names : one name per parameter (default "p0", "p1", ...), used in messages.
    moment_uncertainty_amu_a2 : 1σ of each observed moment [u·Å²], > 0.  None
        scales the covariance by the residual variance instead.
    rcond : a parameter is reported as undetermined when the smallest singular
        value of the column-normalised Jacobian is below ``rcond`` × the largest
        (default 1e-8; central differences leave noise near 1e-10).
    relative_step : central-difference step, as a fraction of max(|p|, 1) (default 1e-6).
    max_nfev : limit on model evaluations of the least-squares solver (default 200).

    Returns
    -------
    :class:`StructureFit`.

    Raises
    ------
    ValueError : bad input; fewer observed moments than parameters; or data
        that cannot determine a parameter (named in the message), such as one
        isotopologue of a planar triatomic, whose Ic = Ia + Ib adds nothing.
    RuntimeError : the solver did not converge.

    Notes
    -----
    Minimises Σ (I_obs − I_calc(p))² over the observed moments, with I_calc the
    principal moments of Eq. (5) (the r0 method, [1] Ch. 13), by
    scipy.optimize.least_squares.  Covariance = (JᵀJ)⁻¹ σ², with J the
    Jacobian at the solution and σ² either the given moment variance or
    Σ residual² / (n_obs − n_par).
    """
    if not callable(build):
        raise ValueError("build must be a callable build(*params) -> N×3 coordinates [Å]")
    p0 = np.array([_finite(f"initial[{i}]", v, "") for i, v in enumerate(initial)], dtype=float)
    if p0.size == 0:
        raise ValueError("initial must hold at least one parameter")
    names = tuple(names) if names is not None else tuple(f"p{i}" for i in range(p0.size))
    if len(names) != p0.size:
        raise ValueError(f"names has {len(names)} entries; initial has {p0.size} parameters")
    isotopologues = tuple(isotopologues)
    if not isotopologues or not all(isinstance(iso, Isotopologue) for iso in isotopologues):
        raise ValueError("isotopologues must be a non-empty sequence of Isotopologue")
    sigma = None
    if moment_uncertainty_amu_a2 is not None:
        sigma = _positive("moment_uncertainty_amu_a2", moment_uncertainty_amu_a2, "u·Å²")
    rcond = _positive("rcond", rcond, "")
    step = _positive("relative_step", relative_step, "")

    picks = [(k, g) for k, iso in enumerate(isotopologues) for g in range(3) if iso.moments_amu_a2[g] is not None]
    labels = tuple(f"{isotopologues[k].name}:I{'abc'[g]}" for k, g in picks)
    observed = np.array([isotopologues[k].moments_amu_a2[g] for k, g in picks])
    if observed.size < p0.size:
        raise ValueError(
            f"{observed.size} observed moments cannot determine {p0.size} parameters {names}; add isotopologues"
        )

    def calculated(params: np.ndarray) -> np.ndarray:
        coords = np.asarray(build(*params), dtype=float)
        out = []
        for iso in isotopologues:
            if coords.shape != (len(iso.masses_amu), 3):
                raise ValueError(
                    f"build returned coordinates of shape {coords.shape}; {iso.name} has {len(iso.masses_amu)} atoms"
                )
            out.append(principal_moments_amu_a2(iso.masses_amu, coords)[0])
        return np.array([out[k][g] for k, g in picks])

    def residuals(params):
        return calculated(params) - observed

    def jacobian(params):
        columns = []
        for j in range(params.size):
            h = step * max(abs(params[j]), 1.0)
            up, down = params.copy(), params.copy()
            up[j] += h
            down[j] -= h
            columns.append((calculated(up) - calculated(down)) / (2.0 * h))
        return np.column_stack(columns)

    solution = least_squares(residuals, p0, jac=jacobian, method="lm", x_scale="jac", max_nfev=max_nfev)
    if solution.status <= 0:
        raise RuntimeError(f"r0 fit did not converge in max_nfev = {max_nfev} evaluations: {solution.message}")
    jac = jacobian(solution.x)
    _check_determined(jac, names, rcond)
    dof = observed.size - p0.size
    if sigma is not None:
        variance = sigma**2
    elif dof > 0:
        variance = float(np.sum(solution.fun**2)) / dof
    else:
        variance = math.nan
    covariance = np.linalg.inv(jac.T @ jac) * variance
    return StructureFit(
        names=names,
        values=tuple(float(v) for v in solution.x),
        sigmas=tuple(float(s) for s in np.sqrt(np.diag(covariance))),
        covariance=covariance,
        residuals_amu_a2=tuple(float(r) for r in -solution.fun),
        labels=labels,
        degrees_of_freedom=dof,
    )


def triatomic_bent_builder(r1_a: float, r2_a: float, angle_deg: float) -> np.ndarray:
    """Cartesian coordinates [Å] of a bent triatomic X–Y–Z, atom order (Y, X, Z).

    Parameters
    ----------
    r1_a : Y–X bond length [Å], > 0.
    r2_a : Y–Z bond length [Å], > 0.
    angle_deg : X–Y–Z angle [degrees], 0 < angle ≤ 180.

    Returns
    -------
    3×3 array: rows Y (central atom, at the origin), X (on +x), Z (in the xy plane).
    Masses passed with it go in the same order (Y, X, Z), e.g. (S, O, O) for SO2.
    """
    r1 = _positive("r1_a", r1_a, "Å")
    r2 = _positive("r2_a", r2_a, "Å")
    angle = _finite("angle_deg", angle_deg, "degrees")
    if not 0.0 < angle <= 180.0:
        raise ValueError(f"angle_deg must be in (0, 180] degrees, got {angle!r}")
    theta = math.radians(angle)
    return np.array([[0.0, 0.0, 0.0], [r1, 0.0, 0.0], [r2 * math.cos(theta), r2 * math.sin(theta), 0.0]])


def linear_triatomic_builder(r1_a: float, r2_a: float) -> np.ndarray:
    """Cartesian coordinates [Å] of a linear triatomic X–Y–Z, atom order (X, Y, Z) along z.

    Parameters
    ----------
    r1_a : X–Y bond length [Å], > 0.
    r2_a : Y–Z bond length [Å], > 0.

    Returns
    -------
    3×3 array: X at z = −r1, Y at the origin, Z at z = +r2; e.g. (O, C, S) for OCS.
    """
    r1 = _positive("r1_a", r1_a, "Å")
    r2 = _positive("r2_a", r2_a, "Å")
    return np.array([[0.0, 0.0, -r1], [0.0, 0.0, 0.0], [0.0, 0.0, r2]])


# --- Helpers -------------------------------------------------------------------------------------


def _check_determined(jac: np.ndarray, names: tuple[str, ...], rcond: float) -> None:
    """ValueError naming a parameter the data cannot determine (rank-deficient Jacobian)."""
    norms = np.linalg.norm(jac, axis=0)
    for name, norm in zip(names, norms, strict=True):
        if norm == 0.0:
            raise ValueError(f"the observed moments do not depend on parameter {name!r}: it is undetermined")
    _, singular, vt = np.linalg.svd(jac / norms, full_matrices=False)
    if singular[-1] < rcond * singular[0]:
        worst = names[int(np.argmax(np.abs(vt[-1])))]
        raise ValueError(
            f"the observed moments cannot determine all of {names} (condition {singular[0] / singular[-1]:.3g}); "
            f"parameter {worst!r} is undetermined: add isotopologues or fix a parameter"
        )


def _planar_moments(moments: np.ndarray) -> np.ndarray:
    """Planar moments P_g = (Ia + Ib + Ic − 2 I_g)/2 [u·Å²]."""
    return (moments.sum() - 2.0 * moments) / 2.0


def _substitution_mass(parent_mass_amu, delta_mass_amu) -> float:
    """μ = M Δm / (M + Δm) [u], Eq. (7), after checking M > 0, Δm ≠ 0, M + Δm > 0."""
    m = _positive("parent_mass_amu", parent_mass_amu, "u")
    dm = _finite("delta_mass_amu", delta_mass_amu, "u")
    if dm == 0.0 or m + dm <= 0.0:
        raise ValueError(f"delta_mass_amu must be nonzero and > -parent_mass_amu = {-m!r} u, got {dm!r}")
    return m * dm / (m + dm)  # Eq. (7) of [1]


def _distinct(moments: np.ndarray, name: str) -> None:
    if np.min(np.diff(moments)) <= DEGENERATE_MOMENT_FRACTION * moments[-1]:
        raise ValueError(
            f"{name} must be pairwise distinct (a symmetric top is outside Kraitchman's asymmetric-top "
            f"equations), got {tuple(float(m) for m in moments)} u·Å²"
        )


def _moments(name: str, values, ordered: bool = True) -> np.ndarray:
    if len(values) != 3:
        raise ValueError(f"{name} must be (Ia, Ib, Ic) [u·Å²], got {len(values)} values")
    moments = np.array([_positive(f"{name}[{i}]", v, "u·Å²") for i, v in enumerate(values)])
    if ordered and not (moments[0] <= moments[1] <= moments[2]):
        raise ValueError(f"{name} must satisfy Ia <= Ib <= Ic, got {tuple(float(m) for m in moments)} u·Å²")
    return moments


def _geometry(masses_amu, coordinates_a) -> tuple[np.ndarray, np.ndarray]:
    masses = np.array([_positive(f"masses_amu[{i}]", m, "u") for i, m in enumerate(masses_amu)], dtype=float)
    coords = np.asarray(coordinates_a, dtype=float)
    if masses.size == 0 or coords.shape != (masses.size, 3):
        raise ValueError(
            f"coordinates_a must be an N×3 array for N = {masses.size} masses (N ≥ 1), got shape {coords.shape}"
        )
    if not np.all(np.isfinite(coords)):
        raise ValueError("coordinates_a must be finite numbers [Å]")
    return masses, coords


def _finite(name: str, value, unit: str) -> float:
    """``value`` as a float, or ValueError unless it is a finite real number."""
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value):
        raise ValueError(f"{name} must be a finite number{_unit(unit)}, got {value!r}")
    return float(value)


def _positive(name: str, value, unit: str) -> float:
    """``value`` as a float, or ValueError unless it is finite and > 0."""
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value) or value <= 0:
        raise ValueError(f"{name} must be a finite number > 0{_unit(unit)}, got {value!r}")
    return float(value)


def _non_negative(name: str, value, unit: str) -> float:
    """``value`` as a float, or ValueError unless it is finite and >= 0."""
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value) or value < 0:
        raise ValueError(f"{name} must be a finite number >= 0{_unit(unit)}, got {value!r}")
    return float(value)


def _unit(unit: str) -> str:
    return f" {unit}" if unit else ""
