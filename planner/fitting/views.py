"""Fit pages: run a fit, read its report, save the refined constants as a new catalogue version."""

from __future__ import annotations

import io

from django.contrib import messages
from django.http import HttpResponse
from django.shortcuts import get_object_or_404, redirect, render

from planner.catalogue.access import CHANGE, VIEW, can_edit, needs
from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import EditConflict, Stamp, StoreError, update_species
from planner.catalogue_file import dump_catalogue
from planner.engine.fitting import fit_constants
from planner.limits import FIT_MAX_ITERATIONS

from .forms import FitForm
from .geometry import BUILDERS, r0_structure
from .models import FitRun
from .report import fit_document, fitted_species_of
from .substitution import substitution_coordinates


@needs(VIEW)
def fit_page(request):
    if request.method == "POST":
        form = FitForm(request.POST, request.FILES)
    else:
        form = FitForm(initial={"species": request.GET.get("species")})
    if request.method == "POST" and form.is_valid():
        row = form.cleaned_data["species"]
        species = species_of_row(row)
        try:
            result = fit_constants(
                species, form.cleaned_data["lines"], form.cleaned_data["vary"], max_iterations=FIT_MAX_ITERATIONS
            )
        except (ValueError, RuntimeError) as error:
            form.add_error(None, f"Cannot fit: {error}")
        else:
            run = FitRun.objects.create(
                species=row,
                species_name=row.name,
                species_version=row.version,
                created_by=request.user,
                lines_csv=form.cleaned_data["csv_text"],
                vary=form.cleaned_data["vary"],
                result=fit_document(result, species),
            )
            return redirect("fitting:run", pk=run.pk)
    status = 400 if request.method == "POST" else 200
    return render(request, "fitting/fit.html", {"form": form, "runs": FitRun.objects.all()[:10]}, status=status)


@needs(VIEW)
def fit_run(request, pk: int):
    run = get_object_or_404(FitRun, pk=pk)
    return render(request, "fitting/run.html", {"run": run, "result": run.result, "can_edit": can_edit(request.user)})


@needs(VIEW, CHANGE)
def save_fit(request, pk: int):
    run = get_object_or_404(FitRun, pk=pk)
    if request.method != "POST":
        return redirect("fitting:run", pk=pk)
    row = get_object_or_404(SpeciesRow, pk=run.species_id)
    reason = f"fit {run.pk}: {len(run.result['residuals'])} lines, varied {', '.join(run.vary)}"
    try:
        saved = update_species(
            row, fitted_species_of(run, species_of_row(row)), Stamp(request.user, reason), run.species_version
        )
    except EditConflict as conflict:
        messages.error(request, f"Not saved: {conflict} Run the fit again on the current version.")
        return redirect("fitting:run", pk=pk)
    except StoreError as error:
        messages.error(request, f"Not saved: {error}")
        return redirect("fitting:run", pk=pk)
    run.saved_as_version = saved.version
    run.save(update_fields=["saved_as_version"])
    messages.success(request, f"Saved the fitted constants as version {saved.version} of {saved.name}.")
    return redirect("catalogue:species", pk=saved.pk)


@needs(VIEW)
def substitution_page(request):
    """Kraitchman coordinates of the atom substituted between two catalogue species."""
    rows = list(SpeciesRow.objects.order_by("name"))
    by_pk = {str(row.pk): row for row in rows}
    parent, substituted = by_pk.get(request.GET.get("parent", "")), by_pk.get(request.GET.get("substituted", ""))
    context = {"rows": rows, "parent": parent, "substituted": substituted}
    if parent and substituted:
        try:
            context["coordinates"] = substitution_coordinates(species_of_row(parent), species_of_row(substituted))
        except ValueError as error:
            context["error"] = str(error)
    return render(request, "fitting/substitution.html", context)


@needs(VIEW)
def geometry_page(request):
    """r0 fit of a triatomic's internal coordinates to the moments of chosen catalogue isotopologues."""
    rows = list(SpeciesRow.objects.order_by("name"))
    chosen_pks = request.GET.getlist("species")
    chosen = [row for row in rows if str(row.pk) in chosen_pks]
    kind = request.GET.get("geometry", "linear-triatomic")
    context = {
        "rows": rows,
        "chosen": chosen,
        "kind": kind,
        "builders": BUILDERS,
        "start": request.GET.get("start", ""),
    }
    if chosen:
        try:
            initial = [float(x) for x in request.GET.get("start", "").replace(",", " ").split()]
            context["structure"] = r0_structure(kind, [species_of_row(row) for row in chosen], initial)
        except ValueError as error:
            context["error"] = str(error)
    return render(request, "fitting/geometry.html", context)


@needs(VIEW)
def fitted_catalogue(request, pk: int):
    """The species with the run's fitted constants, σ and covariance, as a catalogue JSON file."""
    run = get_object_or_404(FitRun, pk=pk)
    row = get_object_or_404(SpeciesRow, pk=run.species_id)
    buffer = io.StringIO()
    dump_catalogue([fitted_species_of(run, species_of_row(row))], buffer)
    response = HttpResponse(buffer.getvalue(), content_type="application/json; charset=utf-8")
    response["Content-Disposition"] = f'attachment; filename="linecast-fit-{run.pk}-{row.pk}.json"'
    return response
