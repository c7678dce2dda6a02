"""The form that picks the isotope of each atom of a species, to derive an isotopologue."""

from __future__ import annotations

from django import forms

from planner.catalogue_file.isotopes import isotopes_of
from planner.engine import Species

from .models import NAME_LENGTH


def _choice_label(info) -> str:
    share = f"{info.natural_fraction * 100:.4g} %" if info.natural_fraction else "not natural"
    return f"{info.label} ({share})"


class IsotopologueForm(forms.Form):
    """One drop-down per atom (``atom_1``, ``atom_2``, ...) with its element's natural isotopes, and a name."""

    name = forms.CharField(
        max_length=NAME_LENGTH,
        required=False,
        help_text="Empty: a name from the isotopes, e.g. O13CS.",
    )

    def __init__(self, atoms: list[tuple[str, int]], *args, **kwargs):
        super().__init__(*args, **kwargs)
        self.atoms = atoms
        for position, (element, mass) in enumerate(atoms, start=1):
            choices = [(str(info.mass_number), _choice_label(info)) for info in isotopes_of(element)]
            if str(mass) not in dict(choices):
                choices.insert(0, (str(mass), f"{mass}{element}"))
            self.fields[f"atom_{position}"] = forms.ChoiceField(
                label=f"Atom {position}: {element}", choices=choices, initial=str(mass)
            )

    def atom_fields(self):
        return [self[f"atom_{position}"] for position in range(1, len(self.atoms) + 1)]

    def substitutions(self) -> list[str]:
        """ "POSITION=ISOTOPE" texts of the atoms whose isotope changed (call after is_valid)."""
        changed = []
        for position, (element, mass) in enumerate(self.atoms, start=1):
            chosen = int(self.cleaned_data[f"atom_{position}"])
            if chosen != mass:
                changed.append(f"{position}={chosen}{element}")
        return changed


def route_preview(species: Species, atoms: list[tuple[str, int]]) -> str:
    """Which route a derivation from ``species`` will take, in words, before anything is picked."""
    if len(atoms) == 2 and species.rotor == "linear":
        return "A diatomic: the constants will be scaled by the reduced mass (Dunham relations)."
    if species.geometry:
        return "The constants will be scaled through the stored geometry (ratio of computed constants)."
    return (
        "This species has no stored geometry: only a diatomic can be derived without one. Add the geometry on the "
        "edit page, or create the isotopologue by hand with its own constants."
    )
