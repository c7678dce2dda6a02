"""The species page: constants with σ, derived values, Q(T), level diagram, stick spectrum, recent changes."""

from __future__ import annotations

from django.shortcuts import get_object_or_404, render

from planner.catalogue.access import VIEW, can_edit, needs
from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.levels_plot import levels_data
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.page_forms import SpeciesPageForm
from planner.catalogue.predictions import cached_prediction, cached_result
from planner.catalogue.revisions import Timeline
from planner.catalogue.summary import constant_rows, state_derived
from planner.engine import PredictionRequest, allowed_parameters
from planner.engine.derived import partition_function
from planner.spectra.forms import DEFAULT_FMAX_MHZ, DEFAULT_FMIN_MHZ
from planner.spectra.plot import plot_data

RECENT_REVISIONS = 5
#: The page's spectrum is an overview: lines below 10⁻⁶ of the strongest possible one are left
#: out and the plot draws the strongest few, which keeps the page light (the spectrum page has all).
PAGE_RELATIVE_FLOOR = 1e-6
PAGE_PLOT_LINES = 1500


def _partition_rows(species, temperatures_k):
    rows = []
    for temperature in temperatures_k:
        try:
            rows.append({"temperature_k": temperature, "q": partition_function(species, temperature), "error": ""})
        except ValueError as error:  # EngineLimitError: the temperature needs levels past the engine's cap
            rows.append({"temperature_k": temperature, "q": None, "error": str(error)})
    return rows


def _cached_partition_rows(row, species, temperatures_k):
    # Each Q(T) climbs the J ladder: on a warm page it cost more than everything else together.
    temperatures = tuple(float(t) for t in temperatures_k)
    return cached_result(row, "partition-rows", temperatures, lambda: _partition_rows(species, temperatures))


@needs(VIEW)
def species_page(request, pk: int):
    row = get_object_or_404(with_constants(SpeciesRow.objects.all()), pk=pk)
    species = species_of_row(row)
    page_form = SpeciesPageForm(request.GET or None)
    data = {}
    if page_form.is_bound:
        page_form.is_valid()  # a bad field shows its error; the good ones (or the defaults) are used
        data = page_form.cleaned_data
    temperature_k = data.get("temperature_k", 300.0)
    order = allowed_parameters(species.rotor, species.reduction)
    states = [
        {"state": state, "constants": constant_rows(state, order), "derived": state_derived(species, state)}
        for state in species.states
    ]
    context = {
        "row": row,
        "species": species,
        "states": states,
        "page_form": page_form,
        "partition_rows": _cached_partition_rows(row, species, data.get("temperatures_k", [10.0, 75.0, 150.0, 300.0])),
        "levels": levels_data(species),
        "temperature_k": temperature_k,
        "can_edit": can_edit(request.user),
        "revisions": Timeline(pk).revisions()[:RECENT_REVISIONS],
        "parent_row": SpeciesRow.objects.filter(name=species.parent).first() if species.parent else None,
        "isotopologues": SpeciesRow.objects.filter(parent_name=species.name).order_by("name"),
    }
    context |= _spectrum(row, species, temperature_k)
    return render(request, "catalogue/species.html", context)


def _spectrum(row, species, temperature_k: float) -> dict:
    """The stick spectrum over the default window (cached like every prediction), or the engine's reason for none."""
    request = PredictionRequest(DEFAULT_FMIN_MHZ, DEFAULT_FMAX_MHZ, temperature_k, relative_floor=PAGE_RELATIVE_FLOOR)
    try:
        prediction = cached_prediction(row, species, request)
    except ValueError as error:
        return {"spectrum_error": str(error), "plot": None, "spectrum_messages": []}
    records = prediction.records()
    return {
        "spectrum_error": "",
        "plot": plot_data(records, species.rotor, limit=PAGE_PLOT_LINES) if records else None,
        "spectrum_messages": prediction.messages,
        "line_count": len(records),
        "window": (DEFAULT_FMIN_MHZ, DEFAULT_FMAX_MHZ),
    }
