"""The plan page: form in, ranked targets, scan plan, plots out; saving freezes it."""

from __future__ import annotations

from django.contrib import messages
from django.shortcuts import redirect, render

from planner.catalogue.access import VIEW, can_edit, needs
from planner.catalogue.models import Species as SpeciesRow
from planner.planning.compute import PlanInputError, compute_plan
from planner.planning.forms import PlanForm
from planner.planning.models import SavedPlan
from planner.planning.presentation import plan_context


def _species() -> list[tuple[int, str, float | None]]:
    return list(SpeciesRow.objects.order_by("name").values_list("pk", "name", "natural_abundance"))


def _bound_plan(data):
    """(form, document or None): the plan of valid form data; problems end up on the form."""
    form = PlanForm(data, species=_species())
    if not form.is_valid():
        return form, None
    try:
        return form, compute_plan(form.inputs())
    except (PlanInputError, ValueError) as error:  # the engine's refusals name what is wrong
        form.add_error(None, str(error))
        return form, None


@needs(VIEW)
def plan_page(request):
    if not request.GET:
        return render(request, "planning/plan.html", {"form": PlanForm(species=_species())})
    form, document = _bound_plan(request.GET)
    context = {"form": form, "document": document, "query": request.GET.urlencode(), "can_save": can_edit(request.user)}
    if document is not None:
        context |= plan_context(document)
    return render(request, "planning/plan.html", context, status=200 if form.is_valid() else 400)


@needs(VIEW, "planning.add_savedplan")
def save_plan(request):
    if request.method != "POST":
        return redirect("planning:plan")
    form, document = _bound_plan(request.POST)
    name = (request.POST.get("plan_name") or "").strip()[:200]
    if document is None or not name:
        messages.error(request, "Not saved: " + ("give the plan a name." if not name else "the plan has problems."))
        return redirect("planning:plan")
    plan = SavedPlan.objects.create(
        name=name,
        created_by=request.user,
        inputs=document["inputs"],
        result={key: document[key] for key in ("result", "temperature_curve", "hazards", "computed_at")},
        catalogue_versions=document["catalogue_versions"],
    )
    messages.success(request, f"Saved plan “{plan.name}”. It keeps these numbers even when the catalogue changes.")
    return redirect("planning:saved", pk=plan.pk)
