"""Rotational line engine: levels, line strengths, intensities.

Pure numpy/scipy; nothing here imports Django.  Entry points:

>>> from planner.engine import Species, State, PredictionRequest, predict
"""

from .fitting import AssignedLine, FitResult, UndeterminedError, fit_constants, significant_digits
from .linelist import LINE_COLUMNS, LineTable, Prediction, merge
from .measurement import DEFAULT_RELATIVE_MODEL, AbsorptionCell, RelativeModel, time_to_snr_s
from .plan import PlanRequest, PlanResult, PlanSpecies, make_plan, signal_vs_temperature
from .predict import EngineLimitError, predict, predict_many
from .request import PredictionRequest
from .species import Atom, Quadrupole, Species, SpeciesError, SpinWeights, State, allowed_parameters
from .structure import (
    Isotopologue,
    KraitchmanCoordinates,
    StructureFit,
    bond_length_a,
    equilibrium_b_mhz,
    fit_internal_coordinates,
    inertia_tensor_amu_a2,
    kraitchman_coordinates_a,
    kraitchman_linear_coordinate_a,
    linear_triatomic_builder,
    principal_axis_coordinates_a,
    principal_moments_amu_a2,
    reduced_mass_amu,
    rotational_constants_mhz,
    triatomic_bent_builder,
)

__all__ = [
    "AssignedLine",
    "FitResult",
    "UndeterminedError",
    "fit_constants",
    "significant_digits",
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
    "Atom",
    "Quadrupole",
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
