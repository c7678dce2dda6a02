"""The spectrum page and its CSV/JSON downloads.

Each view binds the GET form, asks the engine for the prediction and renders
it; an engine refusal becomes a form error, never a server error.
"""

from __future__ import annotations

import io
import re

from django.core.exceptions import NON_FIELD_ERRORS
from django.http import HttpResponse, HttpResponseBadRequest, JsonResponse
from django.shortcuts import render
from django.template.loader import render_to_string
from django.utils.safestring import mark_safe

from planner.catalogue.access import VIEW, needs
from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.predictions import cached_prediction, cached_result
from planner.engine import Prediction, Species
from planner.spectra.exports import prediction_csv, prediction_json
from planner.spectra.forms import SpectrumForm
from planner.spectra.plot import plot_data
from planner.spectra.table import line_table


@needs(VIEW)
def spectrum_page(request):
    form, species, prediction = _prediction_from_query(request)
    context = {"form": form, "species": species, "prediction": prediction}
    if prediction is not None:
        context |= {
            "partition_function": prediction.partition_function.get(species.name),
            "j_max": prediction.j_max.get(species.name),
            "lines": _rendered_lines(form.species_row, species, prediction, form.request()),
            "download_query": request.GET.urlencode(),
        }
    return render(request, "spectra/spectrum.html", context)


def _rendered_lines(row: SpeciesRow, species: Species, prediction: Prediction, conditions) -> dict:
    """The plot data and line table as HTML, with the line count: cached like the prediction.

    Rendering the 500-row table was the largest cost of a page whose
    prediction was already cached (profile of the load test, 2026-12-02).
    """

    def render_lines() -> dict:
        records = prediction.records()
        table = line_table(species, records)
        html = render_to_string("spectra/_lines.html", {"table": table, "plot": plot_data(records, species.rotor)})
        return {"html": html, "total_lines": table.total_lines, "has_rows": bool(table.rows)}

    lines = cached_result(row, "spectrum-lines-html", conditions, render_lines)
    # The fragment is the output of an auto-escaping template, so it is safe to insert as it is.
    return lines | {"html": mark_safe(lines["html"])}


@needs(VIEW)
def spectrum_csv(request):
    def respond(prediction, form):
        buffer = io.StringIO()
        prediction_csv(prediction, buffer)
        return HttpResponse(buffer.getvalue(), content_type="text/csv; charset=utf-8")

    return _download(request, respond, "csv")


@needs(VIEW)
def spectrum_json(request):
    def respond(prediction, form):
        return JsonResponse(prediction_json(prediction, form.request()), json_dumps_params={"allow_nan": False})

    return _download(request, respond, "json")


def _download(request, respond, extension: str):
    """The prediction of the query as a file, or a plain-text 400 naming the problem."""
    form, species, prediction = _prediction_from_query(request)
    if prediction is None:
        return _bad_query(form)
    response = respond(prediction, form)
    response["Content-Disposition"] = f'attachment; filename="{_file_stem(species, form)}.{extension}"'
    return response


def _prediction_from_query(request) -> tuple[SpectrumForm, Species | None, Prediction | None]:
    """Bind the form to the query string and predict when it is valid.

    Returns the form (carrying any errors), the chosen species and the
    prediction, the last two None when there is nothing to show.
    """
    form = SpectrumForm(request.GET or None, species_names=list(SpeciesRow.objects.values_list("name", flat=True)))
    if not form.is_bound or not form.is_valid():
        return form, None, None
    # Only the chosen species' constants are read: the form needs just the names.
    row = with_constants(SpeciesRow.objects.filter(name=form.cleaned_data["species"])).first()
    if row is None:  # deleted between the two queries
        form.add_error("species", "This species has just been deleted from the catalogue.")
        return form, None, None
    species = species_of_row(row)
    form.species_row = row
    try:
        prediction = cached_prediction(row, species, form.request())
    except ValueError as error:  # includes EngineLimitError: the request needs more J than the cap
        form.add_error(None, str(error))
        return form, species, None
    return form, species, prediction


def _bad_query(form: SpectrumForm):
    lines = [
        f"{'request' if field == NON_FIELD_ERRORS else field}: {message}"
        for field, messages in form.errors.items()
        for message in messages
    ]
    return HttpResponseBadRequest("\n".join(lines) or "no query given", content_type="text/plain; charset=utf-8")


def _file_stem(species: Species, form: SpectrumForm) -> str:
    """File name without extension, e.g. ``linecast-OCS-300K-0-1000000MHz``."""
    data = form.cleaned_data
    name = re.sub(r"[^A-Za-z0-9._+-]+", "_", species.name).strip("_") or "species"
    return f"linecast-{name}-{data['temperature_k']:.10g}K-{data['fmin_mhz']:.10g}-{data['fmax_mhz']:.10g}MHz"
