"""GET /species (the catalogue list, filtered) and GET /species/{id} (one species as a catalogue-file entry)."""

from __future__ import annotations

from typing import Literal

from django.http import Http404, JsonResponse
from django.urls import reverse
from ninja import Query, Router, Schema

from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.filters import CatalogueFilter
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue_file.writer import catalogue_to_dict

from .errors import ERROR_RESPONSES
from .schemas import Rotor, SpeciesEntryOut, SpeciesListOut

router = Router(tags=["species"])

#: Largest id a database key can hold (signed 64 bits); a longer number in the path names no species.
MAX_ID = 2**63 - 1


class SpeciesFilter(Schema):
    search: str | None = None
    rotor: Rotor | None = None
    dipole: Literal["a", "b", "c", "none"] | None = None


@router.get("/species", response={200: SpeciesListOut, **ERROR_RESPONSES}, summary="List the catalogue's species")
def species_list(request, filters: Query[SpeciesFilter]):
    """Every species matching the filters, by name: `search` in name or formula, `rotor` kind, `dipole`
    component that is non-zero (`none`: no dipole, so no lines)."""
    form = CatalogueFilter({"q": filters.search or "", "rotor": filters.rotor or "", "dipole": filters.dipole or ""})
    rows = list(form.filtered())
    return {"count": len(rows), "species": [_summary(request, row) for row in rows]}


@router.get(
    "/species/{int:species_id}", response={200: SpeciesEntryOut, **ERROR_RESPONSES}, summary="One species in full"
)
def species_detail(request, species_id: int):
    """The species as an entry of the catalogue file (docs/catalogue-format.md), with its `id` and `version`."""
    row = with_constants(SpeciesRow.objects.filter(pk=species_id)).first() if species_id <= MAX_ID else None
    if row is None:
        raise Http404(f"No species with id {species_id}.")
    entry = catalogue_to_dict([species_of_row(row)])["species"][0]
    return JsonResponse({"id": row.pk, "version": row.version, **entry}, json_dumps_params={"allow_nan": False})


def _summary(request, row: SpeciesRow) -> dict:
    return {
        "id": row.pk,
        "name": row.name,
        "formula": row.formula,
        "rotor": row.rotor,
        "version": row.version,
        "mass_amu": row.mass_amu,
        "dipole_debye": {"a": row.dipole_a_debye, "b": row.dipole_b_debye, "c": row.dipole_c_debye},
        "url": request.build_absolute_uri(reverse("api-v1:species_detail", args=[row.pk])),
    }
