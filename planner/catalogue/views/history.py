"""A species' change history, restoring an earlier version, and the list of deleted species."""

from __future__ import annotations

from django.contrib import messages
from django.http import Http404
from django.shortcuts import redirect, render

from planner.catalogue.access import ADD, CHANGE, VIEW, can_edit, needs
from planner.catalogue.changes import differences
from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.revisions import Timeline, deleted_species
from planner.catalogue.store import Stamp, StoreError, restore_revision


def _timeline_or_404(pk: int) -> Timeline:
    timeline = Timeline(pk)
    if not timeline.species_records:
        raise Http404("No species with this number has ever existed.")
    return timeline


@needs(VIEW)
def species_history(request, pk: int):
    timeline = _timeline_or_404(pk)
    revisions = timeline.revisions()
    current = SpeciesRow.objects.filter(pk=pk).first()
    context = {
        "revisions": revisions,
        "current": current,
        "name": current.name if current else revisions[0].name,
        "pk": pk,
        "can_edit": can_edit(request.user),
    }
    return render(request, "catalogue/history.html", context)


@needs(VIEW, CHANGE, ADD)
def restore(request, pk: int, history_id: int):
    timeline = _timeline_or_404(pk)
    revision = timeline.revision(history_id)
    if revision is None or revision.species is None:
        raise Http404("This revision does not exist or is the deletion itself.")
    current = SpeciesRow.objects.filter(pk=pk).first()
    if request.method != "POST":
        now = species_of_row(current) if current else None
        context = {"revision": revision, "current": current, "changes": differences(now, revision.species), "pk": pk}
        return render(request, "catalogue/restore.html", context)
    try:
        row = restore_revision(pk, history_id, Stamp(request.user))
    except StoreError as error:
        messages.error(request, f"Not restored: {error}")
        return redirect("catalogue:history", pk=pk)
    messages.success(
        request, f"Restored {row.name} as it was on {revision.date:%Y-%m-%d %H:%M} UTC (now version {row.version})."
    )
    return redirect("catalogue:species", pk=row.pk)


@needs(VIEW)
def deleted_list(request):
    return render(request, "catalogue/deleted.html", {"deleted": deleted_species(), "can_edit": can_edit(request.user)})
