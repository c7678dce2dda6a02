"""Derive an isotopologue of a species on its page: pick the atoms' isotopes, get a new catalogue species."""

from __future__ import annotations

from django.contrib import messages
from django.shortcuts import get_object_or_404, redirect, render

from planner.catalogue.access import ADD, VIEW, needs
from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.isotopologue_form import IsotopologueForm, route_preview
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import Stamp, StoreError, create_species
from planner.catalogue_file import CatalogueError
from planner.catalogue_file.isotopologues import DerivationError, derive_isotopologue, parent_atoms


@needs(VIEW, ADD)
def isotopologue_create(request, pk: int):
    row = get_object_or_404(with_constants(SpeciesRow.objects.all()), pk=pk)
    parent = species_of_row(row)
    try:
        atoms = parent_atoms(parent)
    except ValueError as error:
        atoms, problem = [], f"The atoms of {parent.name} cannot be read: {error}"
    else:
        problem = ""
    form = IsotopologueForm(atoms, request.POST or None)
    status = 200
    if request.method == "POST" and atoms and form.is_valid() and not form.substitutions():
        form.add_error(None, "Pick another isotope for at least one atom: as chosen, the result is the parent itself.")
        status = 400
    elif request.method == "POST" and atoms and form.is_valid():
        try:
            derived = derive_isotopologue(parent, form.substitutions(), form.cleaned_data["name"] or None)
            new_row = create_species(
                derived.species, Stamp(request.user, f"derived from {parent.name} ({derived.species.constants_route})")
            )
        except DerivationError as error:
            form.add_error(None, str(error))
        except (StoreError, CatalogueError) as error:
            form.add_error("name", str(error))
        else:
            messages.success(request, f"Created {new_row.name} from {parent.name}: {derived.species.route_note}")
            return redirect("catalogue:species", pk=new_row.pk)
        status = 400
    elif request.method == "POST":
        status = 400
    context = {"row": row, "species": parent, "form": form, "problem": problem, "route": route_preview(parent, atoms)}
    return render(request, "catalogue/isotopologue.html", context, status=status)
