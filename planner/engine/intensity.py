"""Einstein A, integrated intensity, Doppler width and the partition-function sum.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984, Chs. 2–3.
[2] C. H. Townes and A. L. Schawlow, *Microwave Spectroscopy*, McGraw-Hill 1955, Ch. 1.
[3] Linecast physics conventions (shared/PHYSICS.md), Eqs. in "Intensities".
"""

from __future__ import annotations

import numpy as np

from .constants import DOPPLER_FACTOR, EINSTEIN_A_PREFACTOR, INTENSITY_PREFACTOR, MHZ_PER_K


def einstein_a(frequency_mhz, s_mu2_d2, j_upper):
    """Spontaneous emission rate A [s^-1].

    A = 1.16395×10⁻²⁰ · ν³[MHz] · Sμ²[D²] / (2J_u + 1) ([3], "Intensities", from [1], [2]).
    Nuclear-spin weights do not enter.
    """
    frequency_mhz = np.asarray(frequency_mhz, dtype=float)
    return EINSTEIN_A_PREFACTOR * frequency_mhz**3 * np.asarray(s_mu2_d2) / (2.0 * np.asarray(j_upper) + 1.0)


def boltzmann_difference(lower_mhz, frequency_mhz, temperature_k):
    """e^(−E_l/kT) − e^(−E_u/kT) with E_u = E_l + hν, computed without cancellation."""
    kt_mhz = temperature_k * MHZ_PER_K
    return np.exp(-np.asarray(lower_mhz) / kt_mhz) * -np.expm1(-np.asarray(frequency_mhz) / kt_mhz)


def integrated_intensity(frequency_mhz, weighted_s_mu2_d2, lower_mhz, temperature_k, partition_function):
    """Integrated intensity per molecule [nm² MHz].

    I = 4.16231×10⁻⁵ · ν[MHz] · g Sμ²[D²] · (e^(−E_l/kT) − e^(−E_u/kT)) / Q(T),
    with g the statistical weight of the line (spin and K degeneracy), energies
    from the lowest level ([3], "Intensities", after [1]).
    """
    boltzmann = boltzmann_difference(lower_mhz, frequency_mhz, temperature_k)
    return INTENSITY_PREFACTOR * np.asarray(frequency_mhz) * weighted_s_mu2_d2 * boltzmann / partition_function


def doppler_fwhm(frequency_mhz, temperature_k, mass_amu):
    """Doppler full width at half maximum [MHz]: ν·√(8 kT ln2 / (m c²)) ([2], Ch. 13)."""
    return DOPPLER_FACTOR * np.asarray(frequency_mhz) * np.sqrt(temperature_k / mass_amu)


def partition_terms(energies_mhz, weights, temperature_k):
    """Σ g e^(−E/kT) over levels [dimensionless]; energies from the lowest level [MHz]."""
    return float(np.sum(weights * np.exp(-np.asarray(energies_mhz) / (temperature_k * MHZ_PER_K))))
