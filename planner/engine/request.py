"""The validated inputs of one prediction."""

from __future__ import annotations

import math
from dataclasses import dataclass

#: Highest J the engine will diagonalise for an asymmetric top.  Past it a
#: request is refused with a message, so that no request can hang a server.
ASYMMETRIC_J_CAP = 250
#: Highest J for linear molecules and symmetric tops (closed-form levels).
CLOSED_FORM_J_CAP = 3000
#: Lines weaker than this fraction of the strongest line any level could give
#: are not sought when no absolute floor is asked for (see jcutoff.py).
DEFAULT_RELATIVE_FLOOR = 1e-9
MAX_TEMPERATURE_K = 5000.0


@dataclass(frozen=True)
class PredictionRequest:
    """What to predict: a frequency window at a temperature.

    Parameters
    ----------
    fmin_mhz, fmax_mhz : window [MHz], 0 <= fmin < fmax.
    temperature_k : rotational temperature [K], 0 < T <= 5000.
    min_intensity_nm2mhz : absolute floor on the integrated intensity
        [nm^2 MHz]; 0 means only the relative floor applies.
    relative_floor : lines below this fraction of the largest possible line
        intensity of the species are not sought (dimensionless, 0 < x < 1).
    j_cap : optional lower cap on J [dimensionless]; None uses the engine caps.
    """

    fmin_mhz: float
    fmax_mhz: float
    temperature_k: float
    min_intensity_nm2mhz: float = 0.0
    relative_floor: float = DEFAULT_RELATIVE_FLOOR
    j_cap: int | None = None

    def __post_init__(self):
        for name in ("fmin_mhz", "fmax_mhz", "temperature_k", "min_intensity_nm2mhz", "relative_floor"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
                raise ValueError(f"{name} must be a finite number, got {value!r}")
        if self.fmin_mhz < 0:
            raise ValueError(f"fmin_mhz must be >= 0 MHz, got {self.fmin_mhz}")
        if self.fmax_mhz <= self.fmin_mhz:
            raise ValueError(f"fmax_mhz ({self.fmax_mhz}) must be above fmin_mhz ({self.fmin_mhz})")
        if not 0 < self.temperature_k <= MAX_TEMPERATURE_K:
            raise ValueError(f"temperature_k must be in (0, {MAX_TEMPERATURE_K:g}] K, got {self.temperature_k}")
        if self.min_intensity_nm2mhz < 0:
            raise ValueError(f"min_intensity_nm2mhz must be >= 0, got {self.min_intensity_nm2mhz}")
        if not 0 < self.relative_floor < 1:
            raise ValueError(f"relative_floor must be in (0, 1), got {self.relative_floor}")
        if self.j_cap is not None and (
            isinstance(self.j_cap, bool) or not isinstance(self.j_cap, int) or self.j_cap < 1
        ):
            raise ValueError(f"j_cap must be a positive integer, got {self.j_cap!r}")
