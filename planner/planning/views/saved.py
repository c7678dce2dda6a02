"""Saved plans: the list, one plan as frozen, its downloads and the operator sheet."""

from __future__ import annotations

import io

from django.http import HttpResponse
from django.shortcuts import get_object_or_404, render
from django.utils.dateparse import parse_datetime

from planner.catalogue.access import VIEW, needs
from planner.planning.exports import plan_json, segments_csv, targets_csv
from planner.planning.models import SavedPlan
from planner.planning.presentation import catalogue_changes, plan_context


def document_of(plan: SavedPlan) -> dict:
    return {"inputs": plan.inputs, **plan.result, "catalogue_versions": plan.catalogue_versions}


def _context(plan: SavedPlan) -> dict:
    document = document_of(plan)
    context = {
        "plan": plan,
        "document": document,
        "changed": catalogue_changes(plan.catalogue_versions),
        "computed_at": parse_datetime(document.get("computed_at") or ""),
    }
    return context | plan_context(document)


@needs(VIEW)
def saved_list(request):
    return render(request, "planning/saved_list.html", {"plans": SavedPlan.objects.select_related("created_by")})


@needs(VIEW)
def saved_plan(request, pk: int):
    plan = get_object_or_404(SavedPlan, pk=pk)
    return render(request, "planning/saved.html", _context(plan))


@needs(VIEW)
def operator_sheet(request, pk: int):
    plan = get_object_or_404(SavedPlan, pk=pk)
    return render(request, "planning/operator_sheet.html", _context(plan))


def _file(plan: SavedPlan, content: str, kind: str, extension: str, content_type: str) -> HttpResponse:
    response = HttpResponse(content, content_type=f"{content_type}; charset=utf-8")
    response["Content-Disposition"] = f'attachment; filename="linecast-plan-{plan.pk}-{kind}.{extension}"'
    return response


@needs(VIEW)
def saved_targets_csv(request, pk: int):
    plan = get_object_or_404(SavedPlan, pk=pk)
    buffer = io.StringIO()
    targets_csv(document_of(plan), buffer)
    return _file(plan, buffer.getvalue(), "targets", "csv", "text/csv")


@needs(VIEW)
def saved_segments_csv(request, pk: int):
    plan = get_object_or_404(SavedPlan, pk=pk)
    buffer = io.StringIO()
    segments_csv(document_of(plan), buffer)
    return _file(plan, buffer.getvalue(), "segments", "csv", "text/csv")


@needs(VIEW)
def saved_json(request, pk: int):
    plan = get_object_or_404(SavedPlan, pk=pk)
    return _file(plan, plan_json(document_of(plan)), "plan", "json", "application/json")
