"""Top level of the engine: one species and one request in, a Prediction out."""

from __future__ import annotations

import numpy as np

from .constants import MHZ_PER_CM1, MHZ_PER_K
from .hyperfine import DEFAULT_SPREAD_FRACTION, quadrupole_coupling_mhz, spread_mhz
from .intensity import doppler_fwhm, einstein_a, integrated_intensity
from .ladder import EngineLimitError, StateLadder, climb
from .linelist import LINE_COLUMNS, LineTable, Prediction, merge
from .request import PredictionRequest
from .species import Species
from .transitions import TransitionSet, asymmetric_transitions, closed_form_transitions

__all__ = ["EngineLimitError", "predict", "predict_many"]

AXIS_LETTERS = np.array(["a", "b", "c"], dtype=object)


def predict(species: Species, request: PredictionRequest) -> Prediction:
    """Every rotational line of ``species`` in the request's window, above its floor.

    Raises :class:`EngineLimitError` when the temperature needs levels past
    the engine's hard J cap.
    """
    prediction = Prediction(LineTable.empty(), request.temperature_k, request.fmin_mhz, request.fmax_mhz)
    if not species.has_dipole:
        prediction.messages.append(
            f"{species.name} has no permanent dipole moment (μa = μb = μc = 0), so it has no rotational lines."
        )
        return prediction
    ladders, partition, floor = climb(species, request)
    prediction.partition_function[species.name] = partition
    prediction.j_max[species.name] = max(ladder.j_max for ladder in ladders)
    prediction.intensity_floor[species.name] = floor
    lines = LineTable.concatenate([_state_lines(species, ladder, request, partition, floor) for ladder in ladders])
    prediction.lines = lines
    if any(ladder.truncated for ladder in ladders):
        prediction.messages.append(
            f"{species.name}: levels stop at J = {prediction.j_max[species.name]} as requested; "
            "Q(T) and the line list leave out higher levels."
        )
    if not len(lines):
        prediction.messages.append(
            f"{species.name} has no lines between {request.fmin_mhz:g} and {request.fmax_mhz:g} MHz "
            f"above {floor:.3g} nm² MHz at {request.temperature_k:g} K."
        )
    return prediction


def predict_many(species_list, request: PredictionRequest) -> Prediction:
    """Predict several species for the same request, lines merged by frequency."""
    return merge([predict(s, request) for s in species_list])


def _state_lines(
    species: Species, ladder: StateLadder, request: PredictionRequest, partition: float, floor: float
) -> LineTable:
    if species.rotor == "asymmetric":
        found = asymmetric_transitions(
            ladder, species.dipole_debye, species.representation, request.fmin_mhz, request.fmax_mhz
        )
    else:
        axis = 2 if species.rotor == "symmetric-oblate" else 0  # the symmetry axis: c or a
        found = closed_form_transitions(ladder, axis, request.fmin_mhz, request.fmax_mhz)
    return _line_table(species, ladder, found, request, partition, floor)


def _frequency_sigma(ladder: StateLadder, up: np.ndarray, lo: np.ndarray) -> np.ndarray:
    """1σ of each line frequency [MHz] from the constants' uncertainties.

    σν² = gᵀ C g with g = ∂ν/∂p = ∂E_u/∂p − ∂E_l/∂p (Hellmann–Feynman derivatives
    of the levels) and C the covariance of the constants: the state's stored
    covariance block where it has one, σ_p² on the diagonal for the others.
    """
    names = list(ladder.parameter_names)
    sigma = np.array([ladder.state.sigma(p) for p in names])
    block_names, block = ladder.state.covariance()
    correlated = [names.index(n) for n in block_names if n in names]
    independent = np.ones(len(names), dtype=bool)
    independent[correlated] = False
    # (n_params, n_levels): gathering along the contiguous axis is several times faster than by rows.
    derivatives = np.concatenate([r.derivatives for r in ladder.rungs]).T.copy()
    scaled = derivatives[independent] * sigma[independent, None]
    difference = np.take(scaled, up, axis=1)
    difference -= np.take(scaled, lo, axis=1)
    variance = np.einsum("pi,pi->i", difference, difference)
    if correlated:
        order = [block_names.index(names[i]) for i in correlated]
        covariance = block[np.ix_(order, order)]
        g = np.take(derivatives[correlated], up, axis=1) - np.take(derivatives[correlated], lo, axis=1)
        variance += np.einsum("pi,pq,qi->i", g, covariance, g)
    return np.sqrt(np.clip(variance, 0.0, None))


def level_p_squared(species: Species, ladder: StateLadder) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """⟨Pa²⟩, ⟨Pb²⟩, ⟨Pc²⟩ of every level of the ladder (flat order) [dimensionless].

    By Hellmann–Feynman ⟨P_g²⟩ = ∂E/∂G for the rotational constant G of axis g
    (A, B, C enter the Hamiltonians only as G·P_g²; Gordy & Cook 1984, Ch. 7).
    A symmetric top's B multiplies P_b² + P_c² (prolate) or P_a² + P_b²
    (oblate), a linear molecule's P_b² + P_c², split equally by the axial symmetry.
    """
    names = list(ladder.parameter_names)
    derivatives = np.concatenate([r.derivatives for r in ladder.rungs])
    zeros = np.zeros(len(derivatives))

    def along(name):
        return derivatives[:, names.index(name)] if name in names else zeros

    if species.rotor == "asymmetric":
        return along("A"), along("B"), along("C")
    half = along("B") / 2.0
    if species.rotor == "symmetric-oblate":
        return half, half, along("C")
    return (along("A") if species.rotor == "symmetric-prolate" else zeros), half, half


def _hyperfine_columns(species: Species, ladder: StateLadder, up: np.ndarray, lo: np.ndarray) -> dict:
    """The hfs_* columns of the lines up ← lo: component spread and level couplings [MHz]."""
    n = len(up)
    quad = species.hyperfine
    if quad is None:
        return {name: np.zeros(n) for name in HYPERFINE_COLUMNS}
    j = ladder.flat_j()
    pa2, pb2, pc2 = level_p_squared(species, ladder)
    chi = (quad.chi("aa"), quad.chi("bb"), -(quad.chi("aa") + quad.chi("bb")))  # exactly traceless
    coupling = {}
    for end, index in (("up", up), ("lo", lo)):
        coupling[end] = quadrupole_coupling_mhz(j[index], pa2[index], pb2[index], pc2[index], *chi)
    low, high = spread_mhz(j[up], j[lo], quad.spin, coupling["up"], coupling["lo"], DEFAULT_SPREAD_FRACTION)
    return {
        "hfs_low_mhz": low,
        "hfs_high_mhz": high,
        "hfs_coupling_up_mhz": coupling["up"],
        "hfs_coupling_lo_mhz": coupling["lo"],
    }


HYPERFINE_COLUMNS = ("hfs_low_mhz", "hfs_high_mhz", "hfs_coupling_up_mhz", "hfs_coupling_lo_mhz")


def _line_table(
    species: Species,
    ladder: StateLadder,
    found: TransitionSet,
    request: PredictionRequest,
    partition: float,
    floor: float,
) -> LineTable:
    """Columns of the lines in ``found`` at or above ``floor`` [nm² MHz], sorted by frequency."""
    energy = ladder.flat_energies()
    spin = np.concatenate(ladder.spin_weights)
    lo, up, strength, axis = found.lower, found.upper, found.strength, found.axis
    if species.spin_weights is not None:
        # A line exists only between levels of the same nuclear-spin species.
        same_spin = (spin[lo] == spin[up]) & (spin[lo] > 0)
        lo, up, strength, axis = lo[same_spin], up[same_spin], strength[same_spin], axis[same_spin]

    frequency = energy[up] - energy[lo]
    mu2 = np.array(species.dipole_debye) ** 2
    s_mu2 = strength * mu2[axis]
    weight = spin[lo] * ladder.flat("k_degeneracy")[lo] * ladder.state.degeneracy
    intensity = integrated_intensity(frequency, weight * s_mu2, energy[lo], request.temperature_k, partition)
    # Keep the lines at or above the floor, in order of frequency, before building the other columns.
    keep = np.nonzero(intensity >= floor)[0]
    keep = keep[np.argsort(frequency[keep])]
    lo, up, strength, axis = lo[keep], up[keep], strength[keep], axis[keep]
    frequency, s_mu2, intensity = frequency[keep], s_mu2[keep], intensity[keep]
    if not len(lo):
        return LineTable.empty()

    j = ladder.flat_j()
    ka, kc = ladder.flat("ka"), ladder.flat("kc")
    sigma_mhz = _frequency_sigma(ladder, up, lo)
    n = len(lo)
    constant_text = np.array([species.name, ladder.state.label], dtype=object)
    columns = {
        "species": constant_text[np.zeros(n, dtype=np.intp)],
        "state": constant_text[np.ones(n, dtype=np.intp)],
        "frequency_mhz": frequency,
        "sigma_mhz": sigma_mhz,
        "j_up": j[up],
        "ka_up": ka[up],
        "kc_up": kc[up],
        "j_lo": j[lo],
        "ka_lo": ka[lo],
        "kc_lo": kc[lo],
        "dipole_type": AXIS_LETTERS[axis],
        "el_cm1": energy[lo] / MHZ_PER_CM1,
        "eu_cm1": energy[up] / MHZ_PER_CM1,
        "el_k": energy[lo] / MHZ_PER_K,
        "eu_k": energy[up] / MHZ_PER_K,
        "line_strength": strength,
        "s_mu2_d2": s_mu2,
        "spin_weight": spin[lo].astype(float),
        "einstein_a_s": einstein_a(frequency, s_mu2, j[up]),
        "intensity_nm2mhz": intensity,
        "doppler_fwhm_mhz": doppler_fwhm(frequency, request.temperature_k, species.mass_amu),
        "vib_energy_cm1": np.full(n, ladder.vibrational_mhz / MHZ_PER_CM1),
        **_hyperfine_columns(species, ladder, up, lo),
    }
    assert list(columns) == list(LINE_COLUMNS)
    return LineTable(columns)
