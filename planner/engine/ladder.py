"""Climb the J ladder of a species until Q(T) and the line list are complete.

Levels are solved J by J.  Q(T) sums g_I·(2J+1)·g_K·g_v·e^(−E/kT) over the
levels of every listed state, so the vibrational factor Σ g_v e^(−E_v/kT) of
those states is part of it (states not listed are left out of Q).  The climb of a state stops at the first J past the
Boltzmann peak where both

* the levels of that J add less than ``Q_TOLERANCE`` of the partition sum so
  far (the terms fall faster than geometrically beyond the peak), and
* no line with a lower level in that J can reach the intensity floor: by the
  sum rule S_g ≤ 2J+1, so I ≤ 4.16×10⁻⁵ · g_max · (2J+1) μ_max² ·
  e^(−E_min(J)/kT) · ν_max (1 − e^(−hν_max/kT)) / Q, which falls with J.

The floor is the request's absolute floor or its relative floor times the
largest such bound met so far, whichever is higher.  Both tests are
conservative while the climb goes on (Q only grows).  A request that would
climb past the engine's hard cap is refused with :class:`EngineLimitError`.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .constants import INTENSITY_PREFACTOR, MHZ_PER_CM1, MHZ_PER_K
from .intensity import partition_terms
from .labels import spin_symmetry_even
from .levels import JLevels, solver_for
from .request import ASYMMETRIC_J_CAP, CLOSED_FORM_J_CAP, PredictionRequest
from .species import Species, State

#: The rotational constants, whose ∂E/∂G are the ⟨P_g²⟩ of the levels.
ROTATIONAL_CONSTANTS = ("A", "B", "C")

#: A J whose levels add less than this fraction of Q(T) ends the climb.
Q_TOLERANCE = 1e-12


class EngineLimitError(ValueError):
    """A request would need more levels than the engine's hard J cap allows."""


@dataclass
class StateLadder:
    """Levels of one state up to ``j_max``, flattened, with per-J pieces kept."""

    state: State
    parameter_names: tuple[str, ...]  # the columns of each rung's derivatives
    vibrational_mhz: float
    rungs: list[JLevels] = field(default_factory=list)
    spin_weights: list[np.ndarray] = field(default_factory=list)
    truncated: bool = False

    @property
    def j_max(self) -> int:
        return self.rungs[-1].j

    def offsets(self) -> np.ndarray:
        """Index of the first level of each J in the flattened arrays."""
        return np.concatenate([[0], np.cumsum([len(r.energies_mhz) for r in self.rungs])])

    def flat(self, name: str) -> np.ndarray:
        return np.concatenate([getattr(r, name) for r in self.rungs])

    def flat_j(self) -> np.ndarray:
        return np.concatenate([np.full(len(r.energies_mhz), r.j) for r in self.rungs])

    def flat_energies(self) -> np.ndarray:
        """Level energies above the species' lowest level [MHz] (vibrational origin included)."""
        return self.vibrational_mhz + self.flat("energies_mhz")


def level_spin_weights(species: Species, rung: JLevels) -> np.ndarray:
    """Nuclear-spin weight g_I of every level of one J (1 when none declared)."""
    weights = species.spin_weights
    if weights is None:
        return np.ones(len(rung.energies_mhz))
    if weights.axis == "C3":
        even = rung.ka % 3 == 0
    else:
        even = spin_symmetry_even(rung.ka, rung.kc, weights.axis)
    return np.where(even, weights.even, weights.odd)


def j_cap_for(species: Species, request: PredictionRequest) -> int:
    cap = ASYMMETRIC_J_CAP if species.rotor == "asymmetric" else CLOSED_FORM_J_CAP
    return min(cap, request.j_cap) if request.j_cap else cap


def rigid_j_lower_bound(state: State, vibrational_mhz: float, temperature_k: float, weight_ratio: float) -> int:
    """A J below which the climb of an asymmetric-top state cannot stop [dimensionless].

    The lowest level of J lies at or below the diagonal element (B+C)/2·J(J+1)
    (Ir; any diagonal element bounds the lowest eigenvalue from above), so each
    J adds at least (2J+1)·e^(−(B+C)/2·J(J+1)/kT) (times the smallest non-zero
    spin weight, and e^(−E_v/kT) for a state at E_v) to Q, while Q stays below twice its classical value
    √(π/(ABC))·(kT/h)^(3/2) (times the largest weight).  Centrifugal distortion
    only lowers the levels, so the true stopping J is higher still.
    """
    kt_mhz = temperature_k * MHZ_PER_K
    a, b, c = state.value("A"), state.value("B"), state.value("C")
    q_high = 2.0 * np.sqrt(np.pi / (a * b * c)) * kt_mhz**1.5 * weight_ratio + 10.0
    j = np.arange(0, 100000)
    term = (2 * j + 1) * np.exp(-(vibrational_mhz + (b + c) / 2.0 * j * (j + 1)) / kt_mhz)
    return int(np.argmax(term < Q_TOLERANCE * q_high))


@dataclass
class _Climb:
    """What the states of one species share while their ladders are climbed."""

    species: Species
    request: PredictionRequest
    kt_mhz: float
    line_bound_factor: float  # 4.16e-5 · g_max · μ_max² · ν_max (1 − e^(−hν_max/kT)) [nm² MHz]
    cap: int
    hard_cap: int
    partition: float = 0.0
    bound_max: float = 0.0

    @property
    def floor(self) -> float:
        return max(self.request.min_intensity_nm2mhz, self.request.relative_floor * self.bound_max)


def climb(species: Species, request: PredictionRequest) -> tuple[list[StateLadder], float, float]:
    """Solve every state's levels as far as the request needs.

    Returns the ladders, Q(T) and the effective intensity floor [nm² MHz].
    """
    kt_mhz = request.temperature_k * MHZ_PER_K
    nu = request.fmax_mhz
    k_degeneracy = 1.0 if species.rotor in ("linear", "asymmetric") else 2.0
    weights = species.spin_weights
    g_max = k_degeneracy * (max(weights.even, weights.odd) if weights else 1.0)
    g_max *= max(state.degeneracy for state in species.states)
    mu_max2 = max(mu * mu for mu in species.dipole_debye)
    shared = _Climb(
        species,
        request,
        kt_mhz,
        line_bound_factor=INTENSITY_PREFACTOR * g_max * mu_max2 * nu * -np.expm1(-nu / kt_mhz),
        cap=j_cap_for(species, request),
        hard_cap=ASYMMETRIC_J_CAP if species.rotor == "asymmetric" else CLOSED_FORM_J_CAP,
    )
    origin_cm1 = min(s.energy_cm1 for s in species.states)
    ladders = []
    for state in sorted(species.states, key=lambda s: s.energy_cm1):
        vibrational_mhz = (state.energy_cm1 - origin_cm1) * MHZ_PER_CM1
        if species.rotor == "asymmetric" and shared.cap >= shared.hard_cap:
            _refuse_hopeless(shared, state, vibrational_mhz)
        ladders.append(_climb_state(shared, state, vibrational_mhz))
    return ladders, shared.partition, shared.floor


def _refuse_hopeless(shared: _Climb, state: State, vibrational_mhz: float) -> None:
    """Refuse before any diagonalisation when even the rigid rotor needs J past the cap."""
    weights = shared.species.spin_weights
    weight_ratio = max(weights.even, weights.odd) / min(w for w in (weights.even, weights.odd) if w) if weights else 1.0
    at_least = rigid_j_lower_bound(state, vibrational_mhz, shared.request.temperature_k, weight_ratio)
    if at_least > shared.hard_cap:
        raise EngineLimitError(
            f"{shared.species.name} ({state.label}) at {shared.request.temperature_k:g} K needs levels above "
            f"J = {at_least}, beyond the engine's limit of J = {shared.hard_cap} for an asymmetric rotor. "
            "Lower the temperature."
        )


def _climb_state(shared: _Climb, state: State, vibrational_mhz: float) -> StateLadder:
    """Solve one state J by J until the stopping rule of the module docstring holds."""
    species, request, kt_mhz = shared.species, shared.request, shared.kt_mhz
    # Only constants with a 1σ move the frequency σ: the others need no ∂E/∂p.  Hyperfine structure
    # needs ⟨P_g²⟩ = ∂E/∂(A, B, C) (Hellmann–Feynman) of every level.
    wanted = [name for name, (_, sigma) in state.constants_mhz.items() if sigma > 0]
    if species.hyperfine is not None:
        wanted += [name for name in ROTATIONAL_CONSTANTS if name in state.constants_mhz and name not in wanted]
    solver = solver_for(species, state, tuple(wanted))
    ladder = StateLadder(state, solver.derivative_names, vibrational_mhz)
    previous_term = previous_bound = previous_low = None
    j = 0
    while True:
        rung = solver.solve(j)
        level_weights = level_spin_weights(species, rung)
        energies = vibrational_mhz + rung.energies_mhz
        degeneracy = level_weights * rung.k_degeneracy * ((2 * j + 1) * state.degeneracy)
        term = partition_terms(energies, degeneracy, request.temperature_k)
        ladder.rungs.append(rung)
        ladder.spin_weights.append(level_weights)
        shared.partition += term
        low = float(energies.min())
        if previous_low is not None and low < previous_low:
            raise EngineLimitError(
                f"{species.name} ({state.label}) at {request.temperature_k:g} K needs levels up to J > {j}, "
                f"but there the lowest level of J = {j} lies below that of J = {j - 1}: the "
                "centrifugal-distortion series of these constants has broken down. Lower the temperature, "
                "or add the higher-order constants that hold the levels up."
            )
        bound = shared.line_bound_factor * (2 * j + 1) * np.exp(-low / kt_mhz) / shared.partition
        shared.bound_max = max(shared.bound_max, bound)
        # A state too high to be populated at all has terms and bounds that are exactly 0 from J = 0.
        past_peak = (
            previous_term is not None
            and (term < previous_term or term == 0.0)
            and (bound < previous_bound or bound == 0.0)
        )
        if past_peak and term < Q_TOLERANCE * shared.partition and bound < shared.floor:
            return ladder
        if j >= shared.cap:
            ladder.truncated = True
            if shared.cap >= shared.hard_cap:
                raise EngineLimitError(
                    f"{species.name} ({state.label}) at {request.temperature_k:g} K needs levels above "
                    f"J = {shared.hard_cap}, the engine's limit for a {species.rotor} rotor. Lower the "
                    "temperature, raise the intensity floor, or narrow the window."
                )
            return ladder
        previous_term, previous_bound, previous_low = term, bound, low
        j += 1
