"""Values derived from a species' constants, for the catalogue's species page.

Ray's asymmetry parameter, moments of inertia, the inertial defect, Q(T) on
its own, and the levels of one state for an energy-level diagram.  The page
only formats these numbers; the arithmetic stays here, next to the engine it
must agree with.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Ch. 7 (asymmetric rotors, Ray's κ).
[2] B. S. Ray, Z. Phys. 78, 74 (1932) (the asymmetry parameter κ).
[3] Linecast physics conventions (shared/PHYSICS.md), "Structure" and "Intensities".
"""

from __future__ import annotations

import dataclasses
import math
import numbers

import numpy as np

from .constants import INERTIA_MHZ_AMU_A2, MHZ_PER_CM1
from .ladder import climb, level_spin_weights
from .levels import solver_for
from .request import PredictionRequest
from .species import Species

__all__ = [
    "ENERGY_LEVELS_J_MAX",
    "energy_levels",
    "inertial_defect_amu_a2",
    "moment_of_inertia_amu_a2",
    "moments_of_inertia_amu_a2",
    "partition_function",
    "ray_kappa",
]

#: Highest J that :func:`energy_levels` returns: the levels are for a diagram,
#: and past J ≈ 60 an asymmetric top has thousands of them.
ENERGY_LEVELS_J_MAX = 60

#: The frequency window of the request built for Q(T) [MHz].  Any window gives
#: the same Q: see :func:`partition_function`.
_Q_WINDOW_MHZ = (0.0, 1.0)


def ray_kappa(a_mhz: float, b_mhz: float, c_mhz: float) -> float:
    """Ray's asymmetry parameter κ of an asymmetric top [dimensionless].

    Parameters
    ----------
    a_mhz, b_mhz, c_mhz : rotational constants A ≥ B ≥ C > 0 [MHz], with A > C.

    Returns
    -------
    κ in [−1, +1]: −1 for a prolate symmetric top (B = C), +1 for an oblate
    one (A = B), 0 for the most asymmetric top (B = (A + C)/2).

    Notes
    -----
    κ = (2B − A − C) / (A − C)                                    (1)

    Eq. (1) is Ray's parameter [2] as given in [1], Ch. 7.  It is undefined
    for A = C (a linear molecule or a spherical top).
    """
    a, b, c = _ordered_constants(a_mhz, b_mhz, c_mhz)
    if a == c:
        raise ValueError(
            f"Ray's kappa needs A > C; got A = C = {a!r} MHz (a spherical top, or a linear molecule, has no kappa)"
        )
    return (2.0 * b - a - c) / (a - c)  # Eq. (1); [1], Ch. 7


def moment_of_inertia_amu_a2(constant_mhz: float) -> float:
    """Moment of inertia about one principal axis from its rotational constant [u·Å²].

    Parameters
    ----------
    constant_mhz : rotational constant A, B or C [MHz], > 0.

    Notes
    -----
    I = h / (8π² B)                                               (2)

    with B in Hz and I in kg m² ([3], "Structure"); in these units
    I [u·Å²] = 505379.0 / B [MHz] (constants.INERTIA_MHZ_AMU_A2, from CODATA
    via scipy.constants).
    """
    return INERTIA_MHZ_AMU_A2 / _positive("constant_mhz", constant_mhz)  # Eq. (2); [3]


def moments_of_inertia_amu_a2(a_mhz: float, b_mhz: float, c_mhz: float) -> tuple[float, float, float]:
    """Principal moments of inertia (Ia, Ib, Ic) from A, B, C [u·Å²].

    Parameters
    ----------
    a_mhz, b_mhz, c_mhz : rotational constants A ≥ B ≥ C > 0 [MHz].  All three
        are required: a constant a species does not list (0 or None) is refused,
        not read as an infinite moment.

    Returns
    -------
    (Ia, Ib, Ic) [u·Å²], Ia ≤ Ib ≤ Ic.

    Notes
    -----
    I_g = h / (8π² G) for G = A, B, C, Eq. (2) of :func:`moment_of_inertia_amu_a2`.
    """
    a, b, c = _ordered_constants(a_mhz, b_mhz, c_mhz)
    return (INERTIA_MHZ_AMU_A2 / a, INERTIA_MHZ_AMU_A2 / b, INERTIA_MHZ_AMU_A2 / c)  # Eq. (2); [3]


def inertial_defect_amu_a2(a_mhz: float, b_mhz: float, c_mhz: float) -> float:
    """Inertial defect Δ = Ic − Ia − Ib from A, B, C [u·Å²].

    Parameters
    ----------
    a_mhz, b_mhz, c_mhz : rotational constants A ≥ B ≥ C > 0 [MHz].

    Returns
    -------
    Δ [u·Å²]: zero for a rigid planar molecule, small and positive for a real
    planar one in its ground state (vibration), negative for a non-planar one.

    Notes
    -----
    Δ = Ic − Ia − Ib                                              (3)

    with each I from Eq. (2) ([3], "Structure").  For a rigid body in the ab
    plane Ic = Σ m (a² + b²) = Ia + Ib, so Δ = 0.
    """
    i_a, i_b, i_c = moments_of_inertia_amu_a2(a_mhz, b_mhz, c_mhz)
    return i_c - i_a - i_b  # Eq. (3); [3], "Structure"


def partition_function(species: Species, temperature_k: float, j_cap: int | None = None) -> float:
    """Rotational (and vibrational-state) partition function Q(T) of a species [dimensionless].

    The same number that :func:`planner.engine.predict` reports in
    ``Prediction.partition_function[species.name]``: the sum is made by the
    same J-ladder climb (ladder.climb) with the same stopping rule.

    Parameters
    ----------
    species : the species; one with no dipole moment has a Q(T) too.
    temperature_k : temperature [K], 0 < T ≤ request.MAX_TEMPERATURE_K (5000 K).
    j_cap : optional highest J [dimensionless], a positive integer; Q then
        leaves out the higher levels, as predict does.  None uses the engine caps.

    Raises
    ------
    ValueError
        for a temperature or ``j_cap`` outside its range (message from
        :class:`PredictionRequest`).
    EngineLimitError
        (a ValueError) when the temperature needs levels above the engine's
        hard J cap.

    Notes
    -----
    Q(T) = Σ g_I · (2J + 1) · g_K · e^(−E/kT)                     (4)

    over the levels of all states, E measured from the lowest level of the
    species and g_K = 2 for the ±K pair of a symmetric top ([3], "Intensities").

    Why the window does not matter: the climb stops at a J past the Boltzmann
    peak whose levels add less than ladder.Q_TOLERANCE (1e-12) of Q *and* whose
    bound on line intensity is below the floor.  The frequency window, the
    dipole and the spin weights enter that bound only through one positive
    factor (ladder._Climb.line_bound_factor) that also multiplies the
    relative floor, so it cancels; with no absolute floor, which is the case
    here and predict's default, the stopping J is the same for any window.
    With an absolute floor predict may stop a J earlier, which moves Q by less
    than 1e-12 of itself.

    A species with no dipole has that factor zero, the bound test never passes
    and the climb would run to the hard cap; it is climbed with a unit dipole
    along its symmetry (or a) axis instead, which by the same cancellation
    gives the levels and Q of the species itself.
    """
    request = PredictionRequest(*_Q_WINDOW_MHZ, temperature_k, j_cap=j_cap)
    _, partition, _ = climb(_climbable(species), request)  # Eq. (4); [3], "Intensities"
    return partition


def energy_levels(species: Species, state_index: int = 0, j_max: int = 10) -> dict[str, np.ndarray]:
    """Rotational levels of one state up to ``j_max``, for an energy-level diagram.

    Parameters
    ----------
    species : the species.
    state_index : index into ``species.states`` (0 is the first state listed).
    j_max : highest J [dimensionless], 0 ≤ j_max ≤ ENERGY_LEVELS_J_MAX (60).

    Returns
    -------
    dict of equal-length arrays, one entry per level, sorted by J, then energy:

    ``j``
        J (int).
    ``ka``, ``kc``
        Ka and Kc (int), with the engine's conventions (levels.JLevels, and
        the line list's ``ka_*``/``kc_*`` columns): an asymmetric top has both;
        a symmetric top, prolate or oblate, has its K in ``ka`` and −1 in
        ``kc``; a linear molecule has −1 in both.  One row per |K|: a symmetric
        top's K > 0 row stands for the ±K pair.
    ``energy_cm1``
        rotational energy above the lowest level of this state (J = 0 for any
        sensible constants) [cm⁻¹]; the state's vibrational origin is not included.
    ``spin_weight``
        nuclear-spin weight g_I (float; 1 when the species declares none, per
        K component for a symmetric top).  0 marks a level that the spin
        statistics forbid: it is kept so that a diagram can show the gap.

    Notes
    -----
    Energies are the levels.solver_for(species, state).solve(J) eigenvalues,
    the same the line list uses; spin weights from ladder.level_spin_weights.
    """
    if isinstance(state_index, bool) or not isinstance(state_index, numbers.Integral):
        raise ValueError(f"state_index must be an integer, got {state_index!r}")
    if not 0 <= state_index < len(species.states):
        raise ValueError(
            f"state_index must be in 0..{len(species.states) - 1} for {species.name} "
            f"({len(species.states)} states), got {state_index}"
        )
    if isinstance(j_max, bool) or not isinstance(j_max, numbers.Integral):
        raise ValueError(f"j_max must be an integer, got {j_max!r}")
    if not 0 <= j_max <= ENERGY_LEVELS_J_MAX:
        raise ValueError(f"j_max must be in 0..{ENERGY_LEVELS_J_MAX} (levels for a diagram), got {j_max}")

    solver = solver_for(species, species.states[state_index], derivative_names=())  # no ∂E/∂p needed
    rungs = [solver.solve(j) for j in range(int(j_max) + 1)]
    j = np.concatenate([np.full(len(rung.energies_mhz), rung.j) for rung in rungs])
    ka = np.concatenate([rung.ka for rung in rungs]).astype(int)
    kc = np.concatenate([rung.kc for rung in rungs]).astype(int)
    energy_mhz = np.concatenate([rung.energies_mhz for rung in rungs])
    spin_weight = np.concatenate([level_spin_weights(species, rung) for rung in rungs]).astype(float)
    energy_cm1 = (energy_mhz - energy_mhz.min()) / MHZ_PER_CM1
    # Ka, Kc break exact ties (A = B or B = C) so that the order never depends on the eigensolver.
    order = np.lexsort((kc, ka, energy_cm1, j))
    return {
        "j": j[order],
        "ka": ka[order],
        "kc": kc[order],
        "energy_cm1": energy_cm1[order],
        "spin_weight": spin_weight[order],
    }


def _climbable(species: Species) -> Species:
    """The species itself, or (no dipole) a copy with a unit dipole that the climb can stop for."""
    if max(mu * mu for mu in species.dipole_debye) > 0.0:
        return species
    # The symmetry axis of an oblate top is c; every other rotor kind accepts a dipole along a.
    unit = (0.0, 0.0, 1.0) if species.rotor == "symmetric-oblate" else (1.0, 0.0, 0.0)
    return dataclasses.replace(species, dipole_debye=unit)


def _positive(name: str, value) -> float:
    """``value`` as a float, or ValueError unless it is a finite number > 0."""
    if isinstance(value, bool) or not isinstance(value, numbers.Real) or not math.isfinite(value) or value <= 0:
        raise ValueError(f"{name} must be a finite number > 0 MHz, got {value!r}")
    return float(value)


def _ordered_constants(a_mhz, b_mhz, c_mhz) -> tuple[float, float, float]:
    """A, B, C as floats, or ValueError unless each is > 0 and A ≥ B ≥ C (the a, b, c axis labels)."""
    a, b, c = _positive("a_mhz", a_mhz), _positive("b_mhz", b_mhz), _positive("c_mhz", c_mhz)
    if not a >= b >= c:
        raise ValueError(f"rotational constants must satisfy A >= B >= C, got A={a}, B={b}, C={c} MHz")
    return a, b, c
