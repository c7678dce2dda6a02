"""Instrument profiles: list for everyone, create and edit for editors."""

from __future__ import annotations

from django.contrib import messages
from django.shortcuts import get_object_or_404, redirect, render

from planner.catalogue.access import VIEW, needs
from planner.planning.forms import InstrumentForm
from planner.planning.models import Instrument

EDIT = ("planning.add_instrument", "planning.change_instrument")


@needs(VIEW)
def instrument_list(request):
    context = {"instruments": Instrument.objects.all(), "can_edit": request.user.has_perms(EDIT)}
    return render(request, "planning/instruments.html", context)


def _edit(request, instrument=None):
    form = InstrumentForm(request.POST or None, instance=instrument)
    if request.method == "POST" and form.is_valid():
        saved = form.save()
        messages.success(request, f"Saved instrument profile {saved.name}.")
        return redirect("planning:instruments")
    status = 400 if request.method == "POST" else 200
    return render(request, "planning/instrument_form.html", {"form": form, "instrument": instrument}, status=status)


@needs(VIEW, *EDIT)
def instrument_create(request):
    return _edit(request)


@needs(VIEW, *EDIT)
def instrument_edit(request, pk: int):
    return _edit(request, get_object_or_404(Instrument, pk=pk))
