"""Request and response shapes of the API; every key that holds a quantity carries its unit.

Input models check only types and sizes: the rules (window, temperature,
amounts, instrument coverage, line assignments) are the pages' own forms and
the engine's, applied by the views, so they are written once.
"""

from __future__ import annotations

from typing import Literal

from ninja import Field, Schema
from pydantic import ConfigDict

from planner.catalogue.models import NAME_LENGTH
from planner.engine.species import ROTOR_KINDS
from planner.limits import MAX_FIT_LINES, MAX_LINES_BYTES
from planner.planning.forms import MAX_SPECIES as MAX_PLAN_SPECIES

#: Species in one predict request: each may take up to a few hundred ms (common practice, no source).
MAX_PREDICT_SPECIES = 25
#: Constants varied in one fit: more than any rotor kind has parameters.
MAX_VARY = 40

SpeciesName = Field(..., min_length=1, max_length=NAME_LENGTH)
Rotor = Literal[ROTOR_KINDS]  # type: ignore[valid-type]


# ---- species -------------------------------------------------------------------------------------


class DipoleOut(Schema):
    a: float
    b: float
    c: float


class SpeciesSummaryOut(Schema):
    id: int
    name: str
    formula: str
    rotor: str
    version: int = Field(..., description="Raised by every saved edit of the species.")
    mass_amu: float
    dipole_debye: DipoleOut
    url: str = Field(..., description="This species' full entry (GET).")


class SpeciesListOut(Schema):
    count: int
    species: list[SpeciesSummaryOut]


class SpeciesEntryOut(Schema):
    """One species as a catalogue-file entry (docs/catalogue-format.md) with its id and version."""

    model_config = ConfigDict(extra="allow")
    id: int
    version: int
    name: str
    formula: str
    rotor: str
    reduction: str
    representation: str
    mass_amu: float
    dipole_debye: dict[str, float]
    states: list[dict]


# ---- predict -------------------------------------------------------------------------------------


class PredictIn(Schema):
    model_config = ConfigDict(
        json_schema_extra={
            "examples": [{"species": ["CO", "OCS"], "fmin_mhz": 100000, "fmax_mhz": 120000, "temperature_k": 50}]
        }
    )
    species: list[str] = Field(
        ..., min_length=1, max_length=MAX_PREDICT_SPECIES, description="Names of catalogue species."
    )
    fmin_mhz: float = Field(..., description="Lower edge of the window [MHz].")
    fmax_mhz: float = Field(..., description="Upper edge of the window [MHz].")
    temperature_k: float = Field(..., description="Rotational temperature [K].")
    min_intensity_nm2mhz: float | None = Field(
        None, description="Drop lines weaker than this integrated intensity [nm² MHz]; none: the relative floor."
    )


class PredictionOut(Schema):
    """The one prediction shape (planner/spectra/exports.py prediction_json), as the page downloads it."""

    model_config = ConfigDict(extra="allow")
    format_version: int
    request: dict[str, float]
    partition_function: dict[str, float | None]
    j_max: dict[str, int]
    messages: list[str]
    columns: dict[str, str]
    lines: list[dict]


# ---- plan ----------------------------------------------------------------------------------------


class PlanSpeciesIn(Schema):
    name: str = SpeciesName
    amount: float = Field(..., description="Abundance (relative model) or mole fraction (absorption cell).")
    isotopic_fraction: float | None = Field(None, description="Share that is this isotopologue; none: natural.")


class PlanIn(Schema):
    model_config = ConfigDict(
        json_schema_extra={
            "examples": [
                {
                    "fmin_mhz": 80000,
                    "fmax_mhz": 100000,
                    "temperature_k": 50,
                    "slot_minutes": 60,
                    "species": [{"name": "OCS", "amount": 1}, {"name": "CO", "amount": 0.5}],
                }
            ]
        }
    )
    instrument: str | None = Field(None, max_length=200, description="Name of an instrument profile; none: default.")
    fmin_mhz: float = Field(..., description="Lower edge of the window [MHz].")
    fmax_mhz: float = Field(..., description="Upper edge of the window [MHz].")
    temperature_k: float = Field(..., description="Sample temperature [K].")
    slot_minutes: float = Field(..., description="Length of the measurement slot [min].")
    snr: float = Field(5.0, description="Required signal-to-noise ratio.")
    k_sigma: float = Field(3.0, description="Scan margin in σ of each line's predicted frequency.")
    margin_mhz: float = Field(0.0, description="Extra scan margin [MHz].")
    min_intensity_nm2mhz: float | None = Field(None, description="Intensity floor [nm² MHz].")
    max_eu_k: float | None = Field(None, description="Highest upper-state energy [K].")
    pressure_pa: float | None = Field(None, description="Cell pressure [Pa] (absorption cell only).")
    include_satellites: bool = Field(True, description="Plan lines of excited vibrational states too.")
    species: list[PlanSpeciesIn] = Field(..., min_length=1, max_length=MAX_PLAN_SPECIES)


class PlanOut(Schema):
    """The plan document (planner/planning/compute.py), as the plan page shows and saves it."""

    model_config = ConfigDict(extra="allow")
    inputs: dict
    result: dict
    temperature_curve: dict
    catalogue_versions: dict[str, list[int]]
    hazards: dict[str, str]
    computed_at: str


# ---- fit -----------------------------------------------------------------------------------------


class FitLineIn(Schema):
    """One assigned line; Ka, Kc null for a linear molecule, K in ka_* and kc_* null for a symmetric top."""

    j_up: int
    ka_up: int | None = None
    kc_up: int | None = None
    j_lo: int
    ka_lo: int | None = None
    kc_lo: int | None = None
    frequency_mhz: float = Field(..., description="Measured frequency [MHz].")
    sigma_mhz: float = Field(..., description="1σ of the measured frequency [MHz], its weight.")
    state: str = Field("", max_length=50, description="State label; empty: the species' first state.")
    note: str = Field("", max_length=500)


class FitIn(Schema):
    # CO's three lowest lines as an example (frequencies from memory, rounded to 0.1 MHz).
    model_config = ConfigDict(
        json_schema_extra={
            "examples": [
                {
                    "species": "CO",
                    "vary": ["B", "D"],
                    "lines": [
                        {"j_up": 1, "j_lo": 0, "frequency_mhz": 115271.2, "sigma_mhz": 0.1},
                        {"j_up": 2, "j_lo": 1, "frequency_mhz": 230538.0, "sigma_mhz": 0.1},
                        {"j_up": 3, "j_lo": 2, "frequency_mhz": 345796.0, "sigma_mhz": 0.1},
                    ],
                }
            ]
        }
    )
    species: str = SpeciesName
    vary: list[str] = Field(..., min_length=1, max_length=MAX_VARY, description="Constants to fit, e.g. ['B', 'D'].")
    lines: list[FitLineIn] | None = Field(None, max_length=MAX_FIT_LINES, description="Give lines or lines_csv.")
    lines_csv: str | None = Field(
        None, max_length=MAX_LINES_BYTES, description="The assigned-lines CSV text (header j_up,ka_up,...)."
    )


class FitOut(Schema):
    """The fit report of the fit page: constants with σ [MHz], covariance [MHz²], residuals, statistics."""

    model_config = ConfigDict(extra="allow")
    species_id: int
    species_version: int
    species: str
    state: str
    constants: list[dict]
    covariance_mhz2: list[list[float | None]]
    residuals: list[dict]
    structure: list[list[str]]
