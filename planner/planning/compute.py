"""From plan inputs (plain JSON-ready data) to a plan: the one path the pages, exports and CLI share.

``inputs`` hold everything needed to recompute the plan (see ``plan_inputs``);
``compute_plan`` returns the frozen document that is shown, saved, exported
and printed: ``{"inputs", "result", "temperature_curve", "catalogue_versions",
"hazards", "computed_at"}``.  Predictions are cached per species version and
conditions (``planner.catalogue.predictions``, shared with the spectrum and
species pages), so replanning with the same window and temperature is quick.
"""

from __future__ import annotations

import hashlib
import json

import numpy as np
from django.core.cache import cache
from django.utils import timezone

from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.predictions import CACHE_SECONDS, cached_prediction
from planner.engine import LineTable, PredictionRequest, predict
from planner.engine.measurement import DEFAULT_RELATIVE_MODEL, AbsorptionCell, RelativeModel
from planner.engine.plan import PlanRequest, PlanSpecies, make_plan, signal_vs_temperature

#: Temperatures of the "which temperature favours them" plot [K].
CURVE_TEMPERATURES_K = (5.0, 10.0, 20.0, 40.0, 75.0, 100.0, 150.0, 200.0, 300.0, 400.0, 500.0)
CURVE_TARGETS = 5
#: Lines weaker than this fraction of their species' strongest line in the window do not count as
#: blends: at the engine's 10⁻⁹ relative floor every target would otherwise have a "blend".
BLEND_RELATIVE_FLOOR = 1e-4

REQUEST_KEYS = (
    "fmin_mhz",
    "fmax_mhz",
    "temperature_k",
    "slot_s",
    "snr",
    "k_sigma",
    "margin_mhz",
    "setting_width_mhz",
    "channel_width_mhz",
    "retune_overhead_s",
    "min_intensity_nm2mhz",
    "max_eu_k",
)


def model_from_inputs(model: dict):
    """The engine's sensitivity model described by ``inputs["model"]``."""
    if model["kind"] == "absorption-cell":
        return AbsorptionCell(
            path_length_cm=model["path_length_cm"],
            noise_absorption_per_sqrt_hz=model["noise_absorption_per_sqrt_hz"],
            pressure_pa=model["pressure_pa"],
            broadening_khz_per_pa=model["broadening_khz_per_pa"],
        )
    if model["kind"] == "relative":
        return RelativeModel(detection_floor_1s=model["detection_floor_1s"])
    raise ValueError(f"unknown sensitivity model {model['kind']!r}")


def default_model_inputs() -> dict:
    return {"kind": "relative", "detection_floor_1s": DEFAULT_RELATIVE_MODEL.detection_floor_1s}


class PlanInputError(ValueError):
    """Inputs that name species the catalogue does not have, or that the engine refuses."""


def compute_plan(inputs: dict) -> dict:
    """The frozen plan document for ``inputs`` (see the module docstring).

    The whole document is cached under the inputs and the version of every
    catalogue species, so asking again when nothing changed costs a lookup.
    """
    versions = sorted(SpeciesRow.objects.values_list("pk", "version"))
    key = "linecast-plan:" + hashlib.sha1(json.dumps([inputs, versions], sort_keys=True).encode()).hexdigest()
    document = cache.get(key)
    if document is None:
        document = _compute_plan(inputs)
        cache.set(key, document, CACHE_SECONDS)
    return document


def _compute_plan(inputs: dict) -> dict:
    rows = {row.name: row for row in with_constants(SpeciesRow.objects.all())}
    engine_species = {name: species_of_row(row) for name, row in rows.items()}
    document = build_plan(
        inputs, engine_species, lambda species, window: cached_prediction(rows[species.name], species, window)
    )
    versions = {name: [rows[name].pk, rows[name].version] for name in sorted(rows)}
    return {"inputs": inputs, **document, "catalogue_versions": versions}


def build_plan(inputs: dict, catalogue: dict, predict_function=predict) -> dict:
    """``{"result", "temperature_curve", "hazards", "computed_at"}`` of ``inputs`` over ``catalogue``.

    ``catalogue`` maps name -> engine Species: the chosen species are planned,
    every one of them is a blend check.  ``predict_function(species, request)``
    stands in for the engine's predict (the pages pass a caching one).
    """
    unknown = [s["name"] for s in inputs["species"] if s["name"] not in catalogue]
    if unknown:
        raise PlanInputError(f"the catalogue has no species {', '.join(repr(n) for n in unknown)}")
    # Plans saved before satellites could be excluded have no such key: they included them.
    request = PlanRequest(
        **{key: inputs[key] for key in REQUEST_KEYS}, include_satellites=inputs.get("include_satellites", True)
    )
    model = model_from_inputs(inputs["model"])
    window = PredictionRequest(
        request.fmin_mhz, request.fmax_mhz, request.temperature_k, min_intensity_nm2mhz=request.min_intensity_nm2mhz
    )
    predictions, blend_tables, messages = {}, [], []
    for name, species in catalogue.items():
        try:
            predictions[name] = predict_function(species, window)
        except ValueError as error:  # EngineLimitError: this species cannot be predicted at this temperature
            messages.append(f"{name} is left out of the blend check: {error}")
            continue
        lines = predictions[name].lines
        if len(lines):
            intensity = lines["intensity_nm2mhz"]
            blend_tables.append(lines.take(np.nonzero(intensity >= BLEND_RELATIVE_FLOOR * intensity.max())[0]))
    chosen = [PlanSpecies(catalogue[s["name"]], s["amount"], s.get("isotopic_fraction")) for s in inputs["species"]]
    missing = [p.species.name for p in chosen if p.species.name not in predictions]
    if missing:
        raise PlanInputError(f"cannot predict {', '.join(missing)} at {request.temperature_k:g} K")
    result = make_plan(
        request, model, chosen, blend_lines=LineTable.concatenate(blend_tables), predictions=predictions
    ).to_dict()
    result.setdefault("messages", []).extend(messages)
    return {
        "result": result,
        "temperature_curve": _temperature_curve(request, model, chosen, result, predict_function),
        "hazards": {p.species.name: p.species.hazards for p in chosen},
        "computed_at": timezone.now().isoformat(timespec="seconds"),
    }


_KEY_FIELDS = ("species", "state", "j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo")


def _temperature_curve(request, model, chosen, result, predict_function) -> dict:
    """Expected signal of the strongest targets at CURVE_TEMPERATURES_K, for the plot."""
    top = result["targets"][:CURVE_TARGETS]
    if not top:
        return {"temperatures_k": list(CURVE_TEMPERATURES_K), "lines": []}
    keys = [tuple(t[f] for f in _KEY_FIELDS) for t in top]
    try:
        curves = signal_vs_temperature(
            request,
            model,
            chosen,
            keys,
            list(CURVE_TEMPERATURES_K),
            predict_function=predict_function,
        )
    except ValueError as error:
        return {"temperatures_k": list(CURVE_TEMPERATURES_K), "lines": [], "message": str(error)}
    lines, refused = [], []
    for target, key in zip(top, keys):
        values = [None if not np.isfinite(v) else float(v) for v in curves[key]]
        lines.append({"rank": target["rank"], "label": target_label(target), "expected_signal": values})
        refused += [t for t, v in zip(CURVE_TEMPERATURES_K, values) if v is None]
    curve = {"temperatures_k": list(CURVE_TEMPERATURES_K), "lines": lines}
    if refused:
        hot = ", ".join(f"{t:g}" for t in sorted(set(refused)))
        curve["message"] = f"No prediction at {hot} K for some of these species (the engine refuses them there)."
    return curve


def target_label(target: dict) -> str:
    """'SO2 v=0 3 1,3 ← 2 0,2' — species, state and quantum numbers of a target."""

    def level(suffix):
        numbers = [target[f"{q}_{suffix}"] for q in ("j", "ka", "kc")]
        return " ".join(str(n) for n in numbers if n is not None)

    return f"{target['species']} {target['state']} {level('up')} ← {level('lo')}"


def document_json(document: dict) -> str:
    return json.dumps(document, indent=1, allow_nan=False, ensure_ascii=False)
