"""Catalogue JSON in and out from the web: upload (all or nothing) and download."""

from __future__ import annotations

import io

from django import forms
from django.contrib import messages
from django.http import HttpResponse
from django.shortcuts import redirect, render
from django.utils import timezone

from planner.catalogue.access import ADD, CHANGE, VIEW, needs
from planner.catalogue.store import Stamp, export_species, import_species
from planner.catalogue_file import CatalogueError, Problem, dump_catalogue, parse_catalogue_bytes
from planner.limits import MAX_CATALOGUE_BYTES as MAX_UPLOAD_BYTES
from planner.limits import MAX_IMPORT_SPECIES


class ImportForm(forms.Form):
    catalogue_file = forms.FileField(
        label="Catalogue file (JSON)",
        help_text="Species with a name already in the catalogue are replaced; the others are added.",
    )

    def clean_catalogue_file(self):
        upload = self.cleaned_data["catalogue_file"]
        if upload.size > MAX_UPLOAD_BYTES:
            raise forms.ValidationError(
                f"The file is {upload.size / 1e6:.1f} MB; at most {MAX_UPLOAD_BYTES / 1e6:.0f} MB is accepted."
            )
        return upload


@needs(VIEW, ADD, CHANGE)
def import_page(request):
    problems: list[Problem] = []
    # Bound on every POST, even an empty one, so that a missing file is reported.
    form = ImportForm(request.POST, request.FILES) if request.method == "POST" else ImportForm()
    if request.method == "POST" and form.is_valid():
        upload = form.cleaned_data["catalogue_file"]
        try:
            species = parse_catalogue_bytes(upload.read())
            if len(species) > MAX_IMPORT_SPECIES:
                raise CatalogueError(
                    [Problem(None, "file", f"holds {len(species)} species; at most {MAX_IMPORT_SPECIES} per import")]
                )
            summary = import_species(species, Stamp(request.user, f"imported from {upload.name}"))
        except CatalogueError as error:
            problems = error.problems
        else:
            messages.success(request, f"Imported {upload.name}: {summary}.")
            return redirect("catalogue:list")
    status = 400 if request.method == "POST" else 200
    return render(request, "catalogue/import.html", {"form": form, "problems": problems}, status=status)


@needs(VIEW)
def export_json(request):
    buffer = io.StringIO()
    dump_catalogue(export_species(), buffer)
    response = HttpResponse(buffer.getvalue(), content_type="application/json; charset=utf-8")
    response["Content-Disposition"] = f'attachment; filename="linecast-catalogue-{timezone.now():%Y-%m-%d}.json"'
    return response
