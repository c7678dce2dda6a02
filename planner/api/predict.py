"""POST /predict: the lines of catalogue species in a window, in the one prediction shape of the page downloads."""

from __future__ import annotations

from django.http import JsonResponse
from ninja import Router

from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.models import Species as SpeciesRow
from planner.engine import PredictionRequest, merge
from planner.planning.compute import cached_prediction
from planner.spectra.exports import prediction_json
from planner.spectra.forms import REQUEST_FIELDS, SpectrumForm

from .errors import ERROR_RESPONSES, form_error, invalid
from .schemas import PredictIn, PredictionOut

router = Router(tags=["computations"])


@router.post("/predict", response={200: PredictionOut, **ERROR_RESPONSES}, summary="Predict lines")
def predict_lines(request, body: PredictIn):
    """Every line of the named species between `fmin_mhz` and `fmax_mhz` [MHz] at `temperature_k` [K].

    The window, temperature and floor follow the spectrum page's rules.  The answer is the page's
    JSON download: `request`, `partition_function`, `j_max`, `messages`, `columns` (meaning and
    unit of each line key) and `lines`, sorted by frequency.  A temperature that would need
    levels past the engine's J cap answers 422.
    """
    names = list(dict.fromkeys(body.species))
    rows = {row.name: row for row in with_constants(SpeciesRow.objects.filter(name__in=names))}
    unknown = [name for name in names if name not in rows]
    if unknown:
        raise invalid(f"The catalogue has no species {', '.join(map(repr, unknown))}.", "species")
    prediction_request = _prediction_request(body, names)
    predictions = [cached_prediction(rows[n], species_of_row(rows[n]), prediction_request) for n in names]
    document = prediction_json(merge(predictions), prediction_request)
    return JsonResponse(document, json_dumps_params={"allow_nan": False})


def _prediction_request(body: PredictIn, names: list[str]) -> PredictionRequest:
    """The engine request, checked by the spectrum page's form (its fields are named as ours)."""
    data = {name: "" if getattr(body, name) is None else repr(getattr(body, name)) for name in REQUEST_FIELDS}
    form = SpectrumForm(data | {"species": names[0]}, species_names=names)
    if not form.is_valid():
        raise form_error(form.errors)
    return form.request()
