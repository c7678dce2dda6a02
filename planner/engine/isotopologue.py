"""Constants, dipole components and abundance of an isotopologue from its parent.

A new isotopologue is usually searched for with constants scaled from a
measured parent: a diatomic by the Dunham isotope relations, a polyatomic by
the ratio of constants computed from one geometry with the two sets of masses.
Masses are arguments in unified atomic mass units [u] (this module holds no
mass table), coordinates are in ångström [Å], constants in [MHz], dipole
components in debye [D].

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984
    (diatomic isotope relations; structures from isotopic substitution, Ch. 13).
[2] C. H. Townes and A. L. Schawlow, *Microwave Spectroscopy*, McGraw-Hill 1955
    (isotope effects on rotational spectra).
[3] J. L. Dunham, Phys. Rev. 41, 721 (1932) (the Dunham expansion and its
    mass dependence Y_lj ∝ μ^−(j + l/2)).
"""

from __future__ import annotations

import itertools
import math
import numbers
from collections.abc import Mapping, Sequence

import numpy as np

from .structure import (
    DEGENERATE_MOMENT_FRACTION,
    equilibrium_b_mhz,
    principal_moments_amu_a2,
    rotational_constants_mhz,
)

__all__ = [
    "DUNHAM_MASS_EXPONENTS",
    "dunham_scaled_b0_mhz",
    "dunham_scaled_constants_mhz",
    "geometry_scaled_constants_mhz",
    "natural_abundance",
    "rotated_dipole_debye",
]

#: Power k of ρ = μ/μ′ that scales each diatomic constant, G′ = G·ρ^k: the
#: Dunham coefficients Y_0j (B = Y01, D = −Y02, H = Y03) go as μ^−j ([3]; [1]).
DUNHAM_MASS_EXPONENTS = {"B": 1, "D": 2, "H": 3}


# --- Diatomics: Dunham isotope relations ---------------------------------------------------------


def dunham_scaled_constants_mhz(
    constants_mhz: Mapping[str, tuple[float, float]], mu_parent_amu: float, mu_new_amu: float
) -> dict[str, tuple[float, float]]:
    """A diatomic state's (B, D, H) scaled to another isotopologue, with 1σ [MHz].

    Parameters
    ----------
    constants_mhz : {name: (value, sigma)} [MHz] with names among "B", "D",
        "H"; values finite, sigmas finite and ≥ 0.
    mu_parent_amu : reduced mass μ of the parent [u], > 0
        (see structure.reduced_mass_amu).
    mu_new_amu : reduced mass μ′ of the new isotopologue [u], > 0.

    Returns
    -------
    {name: (value′, sigma′)} [MHz], the same names.

    Notes
    -----
    With ρ = μ/μ′ ([3]; [1]; [2]):

    B′ = B ρ,   D′ = D ρ²,   H′ = H ρ³                              (1)

    and each σ is scaled by the same factor (the mass ratio carries no
    uncertainty of note).  Eq. (1) is exact for the equilibrium constants
    (Be, De, ...) within the Born–Oppenheimer approximation.  Applied to B0,
    which holds −αe/2, it leaves an error

    ρ B0 − B0′ = (αe/2) ρ (√ρ − 1) ≈ αe (ρ − 1)/4,                  (2)

    i.e. of order αe·(ρ − 1)/2: about −6 MHz for ¹³C¹⁶O from ¹²C¹⁶O.  Use
    :func:`dunham_scaled_b0_mhz` when αe is known.
    """
    rho = _mass_ratio(mu_parent_amu, mu_new_amu)
    if not isinstance(constants_mhz, Mapping):
        raise ValueError(f"constants_mhz must be a mapping {{name: (value, sigma)}} [MHz], got {constants_mhz!r}")
    scaled = {}
    for name, pair in constants_mhz.items():
        if name not in DUNHAM_MASS_EXPONENTS:
            raise ValueError(
                f"constants_mhz has {name!r}; the Dunham relations here scale only {tuple(DUNHAM_MASS_EXPONENTS)}"
            )
        if not isinstance(pair, Sequence) or len(pair) != 2:
            raise ValueError(f"constants_mhz[{name!r}] must be (value, sigma) [MHz], got {pair!r}")
        value = _finite(f"constants_mhz[{name!r}] value", pair[0], "MHz")
        sigma = _non_negative(f"constants_mhz[{name!r}] sigma", pair[1], "MHz")
        factor = rho ** DUNHAM_MASS_EXPONENTS[name]  # Eq. (1) of [3]
        scaled[name] = (value * factor, sigma * factor)
    return scaled


def dunham_scaled_b0_mhz(b0_mhz: float, alpha_e_mhz: float, mu_parent_amu: float, mu_new_amu: float) -> float:
    """Ground-state B0′ of a diatomic isotopologue from the parent's B0 and αe [MHz].

    Parameters
    ----------
    b0_mhz : parent ground-state rotational constant B0 [MHz], > 0.
    alpha_e_mhz : parent vibration–rotation constant αe [MHz], finite.
    mu_parent_amu, mu_new_amu : reduced masses μ and μ′ [u], > 0.

    Returns
    -------
    B0′ [MHz].

    Notes
    -----
    With ρ = μ/μ′, Be = B0 + αe/2 (structure.equilibrium_b_mhz) and

    Be′ = Be ρ,   αe′ = αe ρ^(3/2)                                  (3)

    B0′ = Be′ − αe′/2                                              (4)

    Eq. (3) is the Dunham mass dependence of Y01 and Y11 ([3]; [1]); Eq. (4)
    is B_v = Be − αe (v + ½) at v = 0.  γe and the Born–Oppenheimer breakdown
    terms are left out (for CO they are below 1 MHz).
    """
    rho = _mass_ratio(mu_parent_amu, mu_new_amu)
    be, _ = equilibrium_b_mhz(b0_mhz, alpha_e_mhz)
    be_new = be * rho  # Eq. (3) of [3]
    alpha_new = alpha_e_mhz * rho**1.5  # Eq. (3) of [3]
    return be_new - alpha_new / 2.0  # Eq. (4) of [1]


# --- Polyatomics: scaling through a geometry -----------------------------------------------------


def geometry_scaled_constants_mhz(
    parent_abc_mhz: Sequence[float | None],
    masses_parent_amu: Sequence[float],
    masses_new_amu: Sequence[float],
    coordinates_a,
) -> tuple[float | None, float, float | None]:
    """Rotational constants (A′, B′, C′) of an isotopologue from the parent's measured ones [MHz].

    Parameters
    ----------
    parent_abc_mhz : the parent's experimental (A, B, C) [MHz], A ≥ B ≥ C > 0.
        For a linear geometry only B is used (A and C may be None or inf).
    masses_parent_amu : N atomic masses of the parent [u], > 0.
    masses_new_amu : the same N atoms with the new isotopes [u], > 0.
    coordinates_a : N×3 Cartesian coordinates [Å] of a geometry (re, r0, rs,
        or a computed one), any origin and orientation.

    Returns
    -------
    (A′, B′, C′) [MHz], ordered A′ ≥ B′ ≥ C′.  For a linear geometry
    (None, B′, None).

    Notes
    -----
    For each principal axis g of the new isotopologue, matched to the parent
    axis g_p it lies closest to (the one of largest |cos| between them),

    G′ = G_exp(g_p) · G_calc,new(g) / G_calc,parent(g_p)             (5)

    with G_calc from the principal-axis transformation of the inertia tensor
    (structure.rotational_constants_mhz).  The vibration–rotation contribution
    G_exp/G_calc changes little on substitution, so the ratio removes most of
    it ([1] Ch. 13; [2]).  The matching matters when the substitution swaps the
    order of two nearly equal moments: the correction then follows the
    physical axis, not the label.
    """
    masses_parent, masses_new, coords = _two_geometries(masses_parent_amu, masses_new_amu, coordinates_a)
    if len(parent_abc_mhz) != 3:
        raise ValueError(f"parent_abc_mhz must be (A, B, C) [MHz], got {len(parent_abc_mhz)} values")
    moments_parent, axes_parent = principal_moments_amu_a2(masses_parent, coords)
    moments_new, axes_new = principal_moments_amu_a2(masses_new, coords)
    calc_parent = rotational_constants_mhz(masses_parent, coords)
    calc_new = rotational_constants_mhz(masses_new, coords)
    if moments_parent[0] == 0.0 or moments_new[0] == 0.0:
        b = _positive("parent_abc_mhz[1]", parent_abc_mhz[1], "MHz")
        return None, b * calc_new[1] / calc_parent[1], None  # Eq. (5), linear: only B
    experimental = np.array([_positive(f"parent_abc_mhz[{i}]", v, "MHz") for i, v in enumerate(parent_abc_mhz)])
    if not experimental[0] >= experimental[1] >= experimental[2]:
        raise ValueError(f"parent_abc_mhz must satisfy A >= B >= C, got {tuple(parent_abc_mhz)} MHz")
    match = _match_axes(axes_parent, axes_new)
    scaled = [experimental[match[k]] * calc_new[k] / calc_parent[match[k]] for k in range(3)]  # Eq. (5)
    a, b, c = sorted((float(g) for g in scaled), reverse=True)
    return a, b, c


def rotated_dipole_debye(
    dipole_abc_debye: Sequence[float],
    masses_parent_amu: Sequence[float],
    masses_new_amu: Sequence[float],
    coordinates_a,
) -> tuple[float, float, float]:
    """Dipole components |μ_a|, |μ_b|, |μ_c| of an isotopologue in its own principal axes [D].

    Parameters
    ----------
    dipole_abc_debye : (μ_a, μ_b, μ_c) of the parent in the parent's principal
        axes [D], finite, signs included.  Each parent axis is taken pointing
        so that its largest Cartesian component (in the frame of
        ``coordinates_a``) is positive; so with coordinates given in the
        parent's principal-axis frame the signs are those of that frame.
    masses_parent_amu, masses_new_amu, coordinates_a : as for
        :func:`geometry_scaled_constants_mhz` ([u], [u], [Å]).

    Returns
    -------
    (|μ_a′|, |μ_b′|, |μ_c′|) [D], labelled by the new axes (a′ ↔ smallest
    moment).  Signs are dropped: line strengths depend on μ_g² only.

    Raises
    ------
    ValueError : bad input, or two new moments equal (a symmetric top) while
        the dipole has a component in their plane, which then has no unique
        split between the two axes.

    Notes
    -----
    The dipole is fixed to the molecular frame (isotopic substitution does not
    change the electronic structure in the Born–Oppenheimer approximation);
    only the principal axes move, because the centre of mass and the inertia
    tensor change ([1] Ch. 13; [2]).  With the axes as columns of X (parent)
    and X′ (new) in the Cartesian frame,

    μ′ = X′ᵀ X μ                                                     (6)

    The transformation is a rotation, so |μ′| = |μ|.  Labelling by the new
    moment order handles substitutions that swap two axes.
    """
    masses_parent, masses_new, coords = _two_geometries(masses_parent_amu, masses_new_amu, coordinates_a)
    if len(dipole_abc_debye) != 3:
        raise ValueError(f"dipole_abc_debye must be (mu_a, mu_b, mu_c) [D], got {len(dipole_abc_debye)} values")
    dipole = np.array([_finite(f"dipole_abc_debye[{i}]", v, "D") for i, v in enumerate(dipole_abc_debye)])
    _, axes_parent = principal_moments_amu_a2(masses_parent, coords)
    moments_new, axes_new = principal_moments_amu_a2(masses_new, coords)
    axes_parent = _oriented(axes_parent)
    rotated = axes_new.T @ (axes_parent @ dipole)  # Eq. (6)
    tolerance = 1e-9 * max(float(np.linalg.norm(dipole)), 1e-300)
    for k in range(2):
        equal = moments_new[k + 1] - moments_new[k] <= DEGENERATE_MOMENT_FRACTION * moments_new[-1]
        if equal and math.hypot(rotated[k], rotated[k + 1]) > tolerance and moments_new[k] > 0.0:
            raise ValueError(
                f"masses_new_amu make a symmetric top (I{'abc'[k]} = I{'abc'[k + 1]}) and dipole_abc_debye has a "
                "component in that degenerate plane: its split between the two axes is not defined"
            )
    mu_a, mu_b, mu_c = (abs(float(g)) for g in rotated)
    return mu_a, mu_b, mu_c


# --- Abundance -----------------------------------------------------------------------------------


def natural_abundance(fractions: Sequence[float]) -> float:
    """Natural abundance of an isotopologue, the product of its atoms' isotope fractions [dimensionless].

    Parameters
    ----------
    fractions : one isotope abundance per atom, as a fraction in (0, 1]
        (not per cent), e.g. 0.0107 for ¹³C; at least one.

    Notes
    -----
    x = Π_i f_i                                                      (7)

    Eq. (7) assumes the isotopes are distributed at random over the atoms
    ([2]).  Equivalent positions are not combined: for ³⁴S¹⁶O¹⁸O with two
    equivalent O sites the caller multiplies by the number of such species (2).
    """
    values = [_finite(f"fractions[{i}]", f, "") for i, f in enumerate(fractions)]
    if not values:
        raise ValueError("fractions must hold at least one isotope fraction")
    for i, f in enumerate(values):
        if not 0.0 < f <= 1.0:
            raise ValueError(f"fractions[{i}] must be in (0, 1] (a fraction, not per cent), got {f!r}")
    return math.prod(values)  # Eq. (7) of [2]


# --- Helpers -------------------------------------------------------------------------------------


def _match_axes(axes_parent: np.ndarray, axes_new: np.ndarray) -> tuple[int, ...]:
    """match[k] = the parent axis closest to new axis k (permutation of largest Σ |cos|)."""
    overlap = np.abs(axes_parent.T @ axes_new)
    return max(itertools.permutations(range(3)), key=lambda p: sum(overlap[p[k], k] for k in range(3)))


def _oriented(axes: np.ndarray) -> np.ndarray:
    """Each column flipped so that its largest-magnitude component is positive."""
    signs = np.sign(axes[np.argmax(np.abs(axes), axis=0), range(3)])
    return axes * np.where(signs == 0.0, 1.0, signs)


def _two_geometries(masses_parent_amu, masses_new_amu, coordinates_a) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    masses_parent = np.array(
        [_positive(f"masses_parent_amu[{i}]", m, "u") for i, m in enumerate(masses_parent_amu)], dtype=float
    )
    masses_new = np.array([_positive(f"masses_new_amu[{i}]", m, "u") for i, m in enumerate(masses_new_amu)])
    if masses_new.size != masses_parent.size:
        raise ValueError(
            f"masses_new_amu has {masses_new.size} masses; masses_parent_amu has {masses_parent.size}: one per atom"
        )
    coords = np.asarray(coordinates_a, dtype=float)
    if masses_parent.size < 2 or coords.shape != (masses_parent.size, 3):
        raise ValueError(
            f"coordinates_a must be an N×3 array [Å] for N = {masses_parent.size} atoms (N ≥ 2), got shape "
            f"{coords.shape}"
        )
    return masses_parent, masses_new, coords


def _mass_ratio(mu_parent_amu, mu_new_amu) -> float:
    """ρ = μ/μ′, after checking both reduced masses."""
    return _positive("mu_parent_amu", mu_parent_amu, "u") / _positive("mu_new_amu", mu_new_amu, "u")


def _finite(name: str, value, unit: str) -> float:
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value):
        raise ValueError(f"{name} must be a finite number{_unit(unit)}, got {value!r}")
    return float(value)


def _positive(name: str, value, unit: str) -> float:
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value) or value <= 0:
        raise ValueError(f"{name} must be a finite number > 0{_unit(unit)}, got {value!r}")
    return float(value)


def _non_negative(name: str, value, unit: str) -> float:
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value) or value < 0:
        raise ValueError(f"{name} must be a finite number >= 0{_unit(unit)}, got {value!r}")
    return float(value)


def _unit(unit: str) -> str:
    return f" {unit}" if unit else ""
