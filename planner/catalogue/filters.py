"""Search, filters and sort order of the catalogue list (also used by its CSV download)."""

from __future__ import annotations

from django import forms
from django.db.models import Count, Q
from django.db.models.functions import Lower

from .models import ROTOR_CHOICES
from .models import Species as SpeciesRow

DIPOLE_CHOICES = [
    ("", "any"),
    ("a", "μa ≠ 0 (a-type lines)"),
    ("b", "μb ≠ 0 (b-type lines)"),
    ("c", "μc ≠ 0 (c-type lines)"),
    ("none", "no dipole (no lines)"),
]
SORT_CHOICES = [
    ("name", "name"),
    ("formula", "formula"),
    ("rotor", "rotor kind"),
    ("mass", "mass"),
    ("-mass", "mass, heaviest first"),
    ("-updated", "last changed first"),
]
# Names sort without regard to case, as people read them (CH3F beside c-C2H4O).
_NAME = Lower("name")
_ORDER = {
    "name": (_NAME, "name"),
    "formula": (Lower("formula"), _NAME),
    "rotor": ("rotor", _NAME),
    "mass": ("mass_amu", _NAME),
    "-mass": ("-mass_amu", _NAME),
    "-updated": ("-updated_at", _NAME),
}
_NO_DIPOLE = Q(dipole_a_debye=0, dipole_b_debye=0, dipole_c_debye=0)


class CatalogueFilter(forms.Form):
    q = forms.CharField(label="Search name or formula", required=False)
    rotor = forms.ChoiceField(label="Rotor kind", choices=[("", "any")] + ROTOR_CHOICES, required=False)
    dipole = forms.ChoiceField(label="Dipole", choices=DIPOLE_CHOICES, required=False)
    sort = forms.ChoiceField(label="Sort by", choices=SORT_CHOICES, required=False)

    def __init__(self, data=None):
        super().__init__(data)
        counts = dict(SpeciesRow.objects.values_list("rotor").annotate(n=Count("id")))
        self.fields["rotor"].choices = [("", "any")] + [
            (kind, f"{label} ({counts.get(kind, 0)})") for kind, label in ROTOR_CHOICES
        ]

    def filtered(self):
        """The matching species, ordered; bad choices are form errors and match nothing."""
        rows = SpeciesRow.objects.all()
        if not self.is_valid():
            return rows.none()
        data = self.cleaned_data
        if data["q"].strip():
            text = data["q"].strip()
            rows = rows.filter(Q(name__icontains=text) | Q(formula__icontains=text))
        if data["rotor"]:
            rows = rows.filter(rotor=data["rotor"])
        if data["dipole"] == "none":
            rows = rows.filter(_NO_DIPOLE)
        elif data["dipole"]:
            rows = rows.exclude(**{f"dipole_{data['dipole']}_debye": 0})
        return rows.order_by(*_ORDER[data["sort"] or "name"])
