"""Sensitivity models: how strong a line looks on an instrument and how long it takes to see it.

A model turns a line's integrated intensity per molecule [nm² MHz] into an
expected signal, and states the noise of one second of integration in the
same unit.  With white noise the noise falls as 1/√t, so the time to reach a
signal-to-noise ratio follows from those two numbers alone
(:func:`time_to_snr_s`).

Two models:

* :class:`AbsorptionCell` — a sample cell of known length and pressure; the
  signal is the peak fractional absorption at line centre, through the
  area-normalised Voigt profile of Doppler and pressure broadening.
* :class:`RelativeModel` — no instrument description; the signal is
  abundance × integrated intensity, compared with a detection floor.

References
----------
[1] C. H. Townes and A. L. Schawlow, *Microwave Spectroscopy*, McGraw-Hill 1955,
    Ch. 1 (absorption coefficient) and Ch. 13 (Doppler and pressure broadening).
[2] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Ch. 2 (absorption coefficient, line shapes).
[3] J. J. Olivero and R. L. Longbothum, "Empirical fits to the Voigt line width:
    a brief review", J. Quant. Spectrosc. Radiat. Transfer 17, 233 (1977).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy import constants as _c
from scipy.special import voigt_profile

__all__ = [
    "AbsorptionCell",
    "RelativeModel",
    "DEFAULT_RELATIVE_MODEL",
    "number_density_cm3",
    "voigt_peak",
    "voigt_fwhm",
    "time_to_snr_s",
]

#: FWHM / σ of a Gaussian: 2√(2 ln 2).
GAUSS_FWHM_PER_SIGMA = 2.0 * math.sqrt(2.0 * math.log(2.0))
#: 1 nm² = 1e-14 cm².
CM2_PER_NM2 = 1e-14


def _check(name: str, value, low: float, high: float = math.inf, low_open: bool = True) -> None:
    """Raise ValueError naming ``name`` unless ``value`` is a finite number in the range."""
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ValueError(f"{name} must be a finite number, got {value!r}")
    too_low = value <= low if low_open else value < low
    if too_low or value > high:
        left = "(" if low_open else "["
        right = "]" if math.isfinite(high) else ")"
        upper = f"{high:g}" if math.isfinite(high) else "inf"
        raise ValueError(f"{name} must be in {left}{low:g}, {upper}{right}, got {value!r}")


def number_density_cm3(pressure_pa, temperature_k):
    """Number density of an ideal gas n = P / (k T) [cm^-3].

    ``pressure_pa`` [Pa], ``temperature_k`` [K]; k from CODATA (scipy.constants).
    """
    return np.asarray(pressure_pa, dtype=float) / (_c.k * np.asarray(temperature_k, dtype=float)) * 1e-6


def voigt_peak(doppler_fwhm_mhz, lorentz_hwhm_mhz):
    """Value at line centre of the area-normalised Voigt profile [1/MHz].

    ``doppler_fwhm_mhz`` [MHz] is the Gaussian full width, ``lorentz_hwhm_mhz``
    [MHz] the Lorentzian half width; they may not both be zero.

    Notes
    -----
    φ_V(0) = V(0; σ_D, γ_L) with σ_D = FWHM_D / (2√(2 ln 2)) ([1], Ch. 13); the
    limits are 2√(ln 2/π)/FWHM_D (pure Doppler) and 1/(π γ_L) (pure pressure).
    """
    sigma = np.asarray(doppler_fwhm_mhz, dtype=float) / GAUSS_FWHM_PER_SIGMA
    return voigt_profile(0.0, sigma, np.asarray(lorentz_hwhm_mhz, dtype=float))


def voigt_fwhm(doppler_fwhm_mhz, lorentz_hwhm_mhz):
    """Full width at half maximum of a Voigt profile [MHz], accurate to about 0.02 %.

    Notes
    -----
    f_V ≈ 0.5346 f_L + √(0.2166 f_L² + f_G²) with f_L = 2 γ_L the Lorentzian
    and f_G the Gaussian full widths (Eq. of [3], its recommended fit).
    """
    f_g = np.asarray(doppler_fwhm_mhz, dtype=float)
    f_l = 2.0 * np.asarray(lorentz_hwhm_mhz, dtype=float)
    return 0.5346 * f_l + np.sqrt(0.2166 * f_l**2 + f_g**2)  # [3]


@dataclass(frozen=True)
class AbsorptionCell:
    """A sample cell: peak fractional absorption at line centre.

    Parameters
    ----------
    path_length_cm : absorption path L [cm], > 0.
    noise_absorption_per_sqrt_hz : noise-equivalent fractional absorption
        [Hz^-1/2], > 0; with the noise bandwidth taken as 1/t it is also the
        1σ noise of one second of integration (see :meth:`noise_1s`).
    pressure_pa : total sample pressure P [Pa], > 0.
    broadening_khz_per_pa : pressure-broadening coefficient, Lorentzian HWHM
        per pascal [kHz/Pa], >= 0.

    The Lorentzian (Voigt) shape is a good description while the pressure
    width is much smaller than the line frequency; at pressures where it is
    not, the line shape of a real cell departs from it ([1], Ch. 13).
    """

    path_length_cm: float
    noise_absorption_per_sqrt_hz: float
    pressure_pa: float
    broadening_khz_per_pa: float
    kind = "absorption-cell"
    signal_unit = "fractional absorption"

    def __post_init__(self):
        _check("path_length_cm", self.path_length_cm, 0.0)
        _check("noise_absorption_per_sqrt_hz", self.noise_absorption_per_sqrt_hz, 0.0)
        _check("pressure_pa", self.pressure_pa, 0.0)
        _check("broadening_khz_per_pa", self.broadening_khz_per_pa, 0.0, low_open=False)

    def pressure_hwhm_mhz(self) -> float:
        """Lorentzian half width γ_L = broadening · P [MHz]."""
        return self.broadening_khz_per_pa * self.pressure_pa * 1e-3

    def noise_1s(self) -> float:
        """1σ noise of one second of integration [fractional absorption]."""
        return float(self.noise_absorption_per_sqrt_hz)

    def expected_signal(self, intensity_nm2mhz, doppler_fwhm_mhz, amount, temperature_k) -> np.ndarray:
        """Peak fractional absorption 1 − exp(−α L) at line centre [dimensionless].

        Parameters
        ----------
        intensity_nm2mhz : integrated intensity per molecule [nm² MHz], >= 0.
        doppler_fwhm_mhz : Doppler FWHM of the line [MHz], > 0.
        amount : mole fraction of the species in the cell, 0 < x <= 1.
        temperature_k : gas temperature [K], > 0.

        Notes
        -----
        n = x P / (k T) [cm^-3] (ideal gas); α_peak = I · n · φ_V(0) [cm^-1]
        with I in cm² MHz and φ_V the area-normalised Voigt profile [1/MHz]
        ([1], Ch. 1; [2], Ch. 2); the absorbed fraction over the path is
        1 − exp(−α L) (Beer–Lambert).
        """
        _check("amount", amount, 0.0, 1.0)
        _check("temperature_k", temperature_k, 0.0)
        density = number_density_cm3(amount * self.pressure_pa, temperature_k)
        peak = voigt_peak(doppler_fwhm_mhz, self.pressure_hwhm_mhz())
        alpha = np.asarray(intensity_nm2mhz, dtype=float) * CM2_PER_NM2 * density * peak  # [1], Ch. 1
        return -np.expm1(-alpha * self.path_length_cm)

    def describe(self) -> dict:
        return {
            "kind": self.kind,
            "signal_unit": self.signal_unit,
            "path_length_cm": self.path_length_cm,
            "noise_absorption_per_sqrt_hz": self.noise_absorption_per_sqrt_hz,
            "pressure_pa": self.pressure_pa,
            "broadening_khz_per_pa": self.broadening_khz_per_pa,
        }


@dataclass(frozen=True)
class RelativeModel:
    """No instrument description: signal = relative abundance × integrated intensity.

    ``detection_floor_1s`` [nm² MHz] is the signal that gives SNR 1 in one
    second of integration, > 0.  The model ignores line widths: it ranks
    integrated intensities, not peak heights.
    """

    detection_floor_1s: float
    kind = "relative"
    signal_unit = "nm2 MHz"

    def __post_init__(self):
        _check("detection_floor_1s", self.detection_floor_1s, 0.0)

    def pressure_hwhm_mhz(self) -> float:
        """No pressure broadening in this model [MHz]."""
        return 0.0

    def noise_1s(self) -> float:
        """1σ noise of one second of integration [nm² MHz]."""
        return float(self.detection_floor_1s)

    def expected_signal(self, intensity_nm2mhz, doppler_fwhm_mhz, amount, temperature_k) -> np.ndarray:
        """amount · intensity [nm² MHz]; ``amount`` > 0 is a relative abundance."""
        _check("amount", amount, 0.0)
        return amount * np.asarray(intensity_nm2mhz, dtype=float)

    def describe(self) -> dict:
        return {"kind": self.kind, "signal_unit": self.signal_unit, "detection_floor_1s": self.detection_floor_1s}


#: Default for the CLI and the forms when nobody describes an instrument.  No
#: published source: 1e-6 nm² MHz is a round order-of-magnitude choice, so that
#: at SNR 5 a line of abundance × intensity 5e-6 nm² MHz needs one second and
#: one of 5e-8 nm² MHz about three hours.  Set it from your own instrument.
DEFAULT_RELATIVE_MODEL = RelativeModel(detection_floor_1s=1e-6)


def time_to_snr_s(model, signal, snr) -> np.ndarray:
    """Integration time needed to reach ``snr`` [s]; inf where ``signal`` <= 0.

    Parameters
    ----------
    model : a sensitivity model with ``noise_1s()`` in the unit of ``signal``.
    signal : expected signal (array or scalar), the model's unit.
    snr : required signal-to-noise ratio, > 0.

    Notes
    -----
    White noise averages down as noise(t) = noise_1s / √(t / 1 s), so
    SNR(t) = signal √t / noise_1s and t = (snr · noise_1s / signal)².
    """
    _check("snr", snr, 0.0)
    signal = np.asarray(signal, dtype=float)
    time = np.full(signal.shape, np.inf)
    positive = signal > 0
    time[positive] = (snr * model.noise_1s() / signal[positive]) ** 2
    return time
