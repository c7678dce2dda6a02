"""The catalogue list and its CSV download."""

from __future__ import annotations

import csv
import io

from django.http import HttpResponse
from django.shortcuts import render

from planner.catalogue.access import VIEW, can_edit, needs
from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.filters import CatalogueFilter
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.summary import CATALOGUE_COLUMNS, catalogue_row
from planner.spectra.exports import finite_or_none


def _listed(request):
    search = CatalogueFilter(request.GET)
    rows = list(with_constants(search.filtered()))
    return search, [(row, catalogue_row(species_of_row(row))) for row in rows]


@needs(VIEW)
def species_list(request):
    search, listed = _listed(request)
    context = {
        "search": search,
        "listed": listed,
        "total": SpeciesRow.objects.count(),
        "can_edit": can_edit(request.user),
        "query": request.GET.urlencode(),
    }
    return render(request, "catalogue/list.html", context)


@needs(VIEW)
def species_csv(request):
    _, listed = _listed(request)
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([key for key, _ in CATALOGUE_COLUMNS])
    for _, row in listed:
        writer.writerow(["" if finite_or_none(row[key]) is None else row[key] for key, _ in CATALOGUE_COLUMNS])
    response = HttpResponse(buffer.getvalue(), content_type="text/csv; charset=utf-8")
    response["Content-Disposition"] = 'attachment; filename="linecast-catalogue.csv"'
    return response
