"""POST /plan: a measurement slot's plan, built by the plan page's own form and compute path."""

from __future__ import annotations

from django.http import JsonResponse
from ninja import Router

from planner.catalogue.models import Species as SpeciesRow
from planner.engine import EngineLimitError
from planner.planning.compute import compute_plan
from planner.planning.forms import PlanForm
from planner.planning.models import Instrument

from .errors import ERROR_RESPONSES, ApiError, form_error, invalid
from .schemas import PlanIn, PlanOut

router = Router(tags=["computations"])

#: The plan form's field -> the API's key, where the two differ.
_FORM_TO_API = {"fmin": "fmin_mhz", "fmax": "fmax_mhz", "satellites": "include_satellites"}


@router.post("/plan", response={200: PlanOut, **ERROR_RESPONSES}, summary="Plan a measurement slot")
def plan_slot(request, body: PlanIn):
    """Ranked targets and a scan plan that fits `slot_minutes`, for the species with their `amount`.

    The same rules as the plan page: the window inside the instrument's coverage, mole fractions at
    most 1 in an absorption cell, at most 30 species.  The answer is the plan document the page
    shows and saves: `inputs`, `result`, `temperature_curve`, `catalogue_versions`, `hazards`.
    """
    catalogue = list(SpeciesRow.objects.order_by("name").values_list("pk", "name", "natural_abundance"))
    form = PlanForm(_form_data(body, {name: pk for pk, name, _ in catalogue}), species=catalogue)
    if not form.is_valid():
        raise _form_error(form, body)
    try:
        document = compute_plan(form.inputs())
    except EngineLimitError:
        raise  # 422 (errors.py)
    except ValueError as error:  # PlanInputError and the engine's refusals name what is wrong, as on the page
        raise ApiError(400, f"Cannot plan: {error}") from error
    return JsonResponse(document, json_dumps_params={"allow_nan": False})


def _form_data(body: PlanIn, pk_of: dict[str, int]) -> dict:
    """The plan form's data for the request (window in MHz); unknown names answer 400."""
    names = [s.name for s in body.species]
    unknown = [name for name in names if name not in pk_of]
    if unknown:
        raise invalid(f"The catalogue has no species {', '.join(map(repr, unknown))}.", "species")
    twice = sorted({name for name in names if names.count(name) > 1})
    if twice:
        raise invalid(f"Species listed more than once: {', '.join(twice)}.", "species")
    data = {
        "frequency_unit": "MHz",
        "fmin": body.fmin_mhz,
        "fmax": body.fmax_mhz,
        "temperature_k": body.temperature_k,
        "slot_minutes": body.slot_minutes,
        "snr": body.snr,
        "k_sigma": body.k_sigma,
        "margin_mhz": body.margin_mhz,
        "min_intensity_nm2mhz": body.min_intensity_nm2mhz,
        "max_eu_k": body.max_eu_k,
        "pressure_pa": body.pressure_pa,
        "satellites": "include" if body.include_satellites else "exclude",
    }
    if body.instrument is not None:
        instrument = Instrument.objects.filter(name=body.instrument).first()
        if instrument is None:
            raise invalid(f"No instrument profile {body.instrument!r}.", "instrument")
        data["instrument"] = instrument.pk
    for item in body.species:
        data[f"amount_{pk_of[item.name]}"] = item.amount
        data[f"fraction_{pk_of[item.name]}"] = item.isotopic_fraction
    return {key: _text(value) for key, value in data.items() if value is not None}


def _text(value) -> str:
    # Form data is text; repr keeps every digit of a float.
    return repr(value) if isinstance(value, float) else str(value)


def _form_error(form: PlanForm, body: PlanIn) -> ApiError:
    """The form's errors under the API's names (``species[2].amount`` for an amount field)."""
    position = {item.name: index for index, item in enumerate(body.species)}
    names = dict(_FORM_TO_API)
    for pk, name in form.species:
        if name in position:
            names[f"amount_{pk}"] = f"species[{position[name]}].amount"
            names[f"fraction_{pk}"] = f"species[{position[name]}].isotopic_fraction"
    return form_error({names.get(field, field): problems for field, problems in form.errors.items()})
