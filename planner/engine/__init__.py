"""Rotational line engine: levels, line strengths, intensities.

Pure numpy/scipy; nothing here imports Django.  Entry points:

>>> from planner.engine import Species, State, PredictionRequest, predict
"""

from .linelist import LINE_COLUMNS, LineTable, Prediction, merge
from .measurement import DEFAULT_RELATIVE_MODEL, AbsorptionCell, RelativeModel, time_to_snr_s
from .plan import PlanRequest, PlanResult, PlanSpecies, make_plan, signal_vs_temperature
from .predict import EngineLimitError, predict, predict_many
from .request import PredictionRequest
from .species import Species, SpeciesError, SpinWeights, State, allowed_parameters

__all__ = [
    "LINE_COLUMNS",
    "LineTable",
    "Prediction",
    "merge",
    "EngineLimitError",
    "predict",
    "predict_many",
    "PredictionRequest",
    "SpeciesError",
    "Species",
    "SpinWeights",
    "State",
    "allowed_parameters",
    "AbsorptionCell",
    "DEFAULT_RELATIVE_MODEL",
    "RelativeModel",
    "time_to_snr_s",
    "PlanRequest",
    "PlanResult",
    "PlanSpecies",
    "make_plan",
    "signal_vs_temperature",
]
