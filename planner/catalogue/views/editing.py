"""Create, edit and delete a species.

Edits carry the version they started from; a save after someone else's is
refused with their changes shown (store.EditConflict), and the form keeps the
editor's values so that nothing typed is lost.
"""

from __future__ import annotations

from django.contrib import messages
from django.shortcuts import get_object_or_404, redirect, render
from django.urls import reverse
from django.utils.html import format_html

from planner.catalogue.access import ADD, CHANGE, DELETE, VIEW, needs
from planner.catalogue.conversion import species_of_row
from planner.catalogue.forms import SpeciesForm, StateFormSet, initial_data, validated_species
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import EditConflict, Stamp, StoreError, create_species, delete_species, update_species
from planner.catalogue_file import CatalogueError

STATES_PREFIX = "states"


def _bound_forms(request):
    return SpeciesForm(request.POST), StateFormSet(request.POST, prefix=STATES_PREFIX)


def _checked_species(form, states):
    """The engine Species of the posted forms, or None with every problem placed on the forms."""
    form.is_valid()
    states.is_valid()  # both, whatever the first says, so that one save shows every message
    return validated_species(form, states)


def _render(request, form, states, row=None, conflict=None, status=200):
    context = {"form": form, "states": states, "row": row, "conflict": conflict}
    return render(request, "catalogue/edit.html", context, status=status)


def _saved(request, row: SpeciesRow, verb: str):
    messages.success(request, f"{verb} {row.name} (version {row.version}).")
    if not any(row.dipole_debye):
        messages.warning(request, f"{row.name} has no permanent dipole: it will have no rotational lines.")
    return redirect("catalogue:species", pk=row.pk)


def _store_problems(form, error: Exception) -> None:
    if isinstance(error, CatalogueError):
        for problem in error.problems:
            field = problem.field if problem.field in form.fields else None
            form.add_error(field, problem.message if field else f"{problem.field}: {problem.message}")
    else:
        form.add_error("name" if "name" in str(error) else None, str(error))


@needs(VIEW, ADD)
def species_create(request):
    if request.method != "POST":
        return _render(request, SpeciesForm(), StateFormSet(prefix=STATES_PREFIX))
    form, states = _bound_forms(request)
    species = _checked_species(form, states)
    if species is not None:
        try:
            row = create_species(species, Stamp(request.user, "created on the web"))
        except (StoreError, CatalogueError) as error:
            _store_problems(form, error)
        else:
            return _saved(request, row, "Created")
    return _render(request, form, states, status=400)


@needs(VIEW, CHANGE)
def species_edit(request, pk: int):
    row = get_object_or_404(SpeciesRow, pk=pk)
    if request.method != "POST":
        initial, state_initial = initial_data(species_of_row(row), row.version)
        return _render(
            request, SpeciesForm(initial=initial), StateFormSet(initial=state_initial, prefix=STATES_PREFIX), row
        )
    form, states = _bound_forms(request)
    species = _checked_species(form, states)
    if species is not None:
        stamp = Stamp(request.user, "edited on the web")
        try:
            row = update_species(row, species, stamp, expected_version=form.cleaned_data["version"] or 0)
        except EditConflict as conflict:
            # Show the others' changes; a second save (from the new version) is the editor's informed choice.
            form.data = form.data.copy()
            form.data["version"] = conflict.current_version
            return _render(request, form, states, row, conflict=conflict, status=409)
        except (StoreError, CatalogueError) as error:
            _store_problems(form, error)
        else:
            return _saved(request, row, "Saved")
    return _render(request, form, states, row, status=400)


@needs(VIEW, DELETE)
def species_delete(request, pk: int):
    row = get_object_or_404(SpeciesRow, pk=pk)
    if request.method != "POST":
        return render(request, "catalogue/delete.html", {"row": row})
    name, history = row.name, reverse("catalogue:history", args=[row.pk])
    delete_species(row, Stamp(request.user, "deleted on the web"))
    messages.success(request, format_html('Deleted {}. <a href="{}">Undo from its history</a>.', name, history))
    return redirect("catalogue:list")
