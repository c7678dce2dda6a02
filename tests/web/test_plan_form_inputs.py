"""The plan form's species inputs are written straight to HTML: the same markup as Django's own number input."""

from __future__ import annotations

import pytest
from django import forms

from planner.planning.forms import DirectNumberInput, PlanForm

ATTRS = {"step": "any", "min": "0", "placeholder": "—", "aria-label": 'amount of <b>"X"</b>', "required": True}


@pytest.mark.parametrize("value", [None, "", "1.5", 0.25, '"><script>alert(1)</script>'])
@pytest.mark.parametrize("extra", [{}, {"disabled": False}, {"id": "id_amount_7"}])
def test_direct_input_writes_what_django_renders(value, extra):
    attrs = ATTRS | extra
    expected = forms.NumberInput(attrs=attrs).render("amount_7", value)
    assert DirectNumberInput(attrs=attrs).render("amount_7", value) == expected


def test_a_bound_plan_form_renders_its_species_inputs_like_django(db):
    form = PlanForm({"amount_3": "0.5", "fraction_3": "x"}, species=[(3, "OCS", 0.936), (4, "<i>SO2</i>", None)])
    form.is_valid()
    for name, amount, fraction in form.species_fields():
        for bound in (amount, fraction):
            widget = forms.NumberInput(attrs=bound.field.widget.attrs)
            assert str(bound) == bound.as_widget(widget=widget), name
