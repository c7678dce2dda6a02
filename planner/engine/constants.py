"""Conversion factors and prefactors, all derived from CODATA via scipy.constants.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Ch. 2 (line intensities) and Ch. 3 (Einstein coefficients).
[2] C. H. Townes and A. L. Schawlow, *Microwave Spectroscopy*, McGraw-Hill 1955, Ch. 1.
"""

import math

from scipy import constants as _c

#: 1 cm^-1 expressed in MHz: c [m/s] * 100 [cm/m] / 1e6 [Hz/MHz].
MHZ_PER_CM1 = _c.c * 100.0 / 1e6
#: 1 K (as E/k) expressed in MHz: k / h / 1e6.
MHZ_PER_K = _c.k / _c.h / 1e6
#: 1 debye in C·m (1e-21 / c, exact by definition of the debye).
DEBYE_CM = 1e-21 / _c.c

#: Einstein A [s^-1] = EINSTEIN_A_PREFACTOR · ν³[MHz] · Sμ²[D²] / (2J_u + 1).
#: SI form of the spontaneous-emission rate of [1], [2]: A = 16π³ν³ Sμ² / (3 ε0 h c³ (2J_u+1)).
EINSTEIN_A_PREFACTOR = 16.0 * math.pi**3 * (1e6) ** 3 * DEBYE_CM**2 / (3.0 * _c.epsilon_0 * _c.h * _c.c**3)

#: Integrated intensity per molecule [nm² MHz] =
#: INTENSITY_PREFACTOR · ν[MHz] · g_I Sμ²[D²] · (e^(-El/kT) − e^(-Eu/kT)) / Q.
#: SI form of the Gaussian-unit expression 8π³ν Sμ² / (3hc) of [1]:
#: ∫σ dν = 2π² ν Sμ² / (3 ε0 h c), converted from m²·Hz to nm²·MHz.
INTENSITY_PREFACTOR = 2.0 * math.pi**2 * 1e6 * DEBYE_CM**2 / (3.0 * _c.epsilon_0 * _c.h * _c.c) * 1e18 / 1e6

#: Doppler FWHM / ν = DOPPLER_FACTOR · √(T[K] / M[u]); from √(8 k T ln2 / (m c²)).
DOPPLER_FACTOR = math.sqrt(8.0 * _c.k * math.log(2.0) / (_c.atomic_mass * _c.c**2))

#: B [MHz] · I [u·Å²] = INERTIA_MHZ_AMU_A2 ≈ 505379.0 MHz·u·Å², from I = h / (8π² B) of [1]
#: (PHYSICS.md, "Structure"; B in Hz, I in kg m²) with 1 MHz = 1e6 Hz, 1 u = m_u (the atomic
#: mass constant) and 1 Å = 1e-10 m.
INERTIA_MHZ_AMU_A2 = _c.h / (8.0 * math.pi**2 * 1e6 * _c.atomic_mass * _c.angstrom**2)
