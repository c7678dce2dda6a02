"""Create/edit form of a species: the species fields plus one small form per state.

The rules are not repeated here: the form builds a catalogue-file entry and
hands it to the same reader that checks imported files, which asks the
engine.  Each problem comes back with a field path (``dipole_debye.b``,
``states[0].constants_mhz.B``) and is put next to the field it names.
"""

from __future__ import annotations

import re

from django import forms

from planner.catalogue_file.species_entry import parse_species
from planner.engine import Species, allowed_parameters
from planner.engine.species import MAX_DIPOLE_DEBYE

from .models import (
    FORMULA_LENGTH,
    LABEL_LENGTH,
    NAME_LENGTH,
    REDUCTION_CHOICES,
    REPRESENTATION_CHOICES,
    ROTOR_CHOICES,
    ROUTE_CHOICES,
    SPIN_AXIS_CHOICES,
)

CONSTANTS_HELP = "One constant per line: name, value [MHz], 1σ [MHz], e.g. “B 6081.4921 0.0002”. Give σ = 0 if unknown."
ALPHA_HELP = (
    "Instead of (or besides) constants: one per line, name, α [MHz], 1σ [MHz], with this state's value = "
    "ground-state value − α, e.g. “B 524.8 0.1”. Constants not given are the ground state's."
)
CHI_HELP = "One per line: component (aa, bb or cc), χ [MHz], 1σ [MHz]. Missing ones follow from χaa + χbb + χcc = 0."
GEOMETRY_HELP = (
    "One atom per line: element, optional mass number, x y z [Å], e.g. “O 16 0 0 -1.158” or “C 0 0 0”. "
    "Used to scale isotopologue constants."
)
_SEPARATORS = re.compile(r"[\s,=±;]+")


def _number(text: str) -> float:
    return float(text.replace("−", "-"))


def parse_named_pairs(text: str, what: str) -> tuple[dict[str, list[float]], list[str]]:
    """{NAME: [value, sigma]} from lines "NAME value sigma", and the problems by line."""
    pairs, problems = {}, []
    for number, line in enumerate(text.splitlines(), start=1):
        parts = [p for p in _SEPARATORS.split(line.strip()) if p]
        if not parts:
            continue
        if len(parts) != 3:
            problems.append(f"line {number}: give a name, a {what} and a σ, got “{line.strip()}”")
            continue
        name, *numbers = parts
        try:
            value, sigma = (_number(x) for x in numbers)
        except ValueError:
            problems.append(f"line {number}: {what} and σ must be numbers, got “{line.strip()}”")
            continue
        if name in pairs:
            problems.append(f"line {number}: {name} is given twice")
        pairs[name] = [value, sigma]
    return pairs, problems


def parse_geometry(text: str) -> tuple[list[dict], list[str]]:
    """Catalogue-file atoms from lines "EL [MASS] x y z" [Å], and the problems by line."""
    atoms, problems = [], []
    for number, line in enumerate(text.splitlines(), start=1):
        parts = [p for p in re.split(r"[\s,;]+", line.strip()) if p]
        if not parts:
            continue
        if len(parts) not in (4, 5):
            problems.append(f"line {number}: give element, optional mass number, x, y, z, got “{line.strip()}”")
            continue
        try:
            xyz = [_number(x) for x in parts[-3:]]
            isotope = int(parts[1]) if len(parts) == 5 else None
        except ValueError:
            problems.append(f"line {number}: the mass number and coordinates must be numbers, got “{line.strip()}”")
            continue
        atom = {"element": parts[0]}
        if isotope is not None:
            atom["isotope"] = isotope
        atom["xyz_a"] = xyz
        atoms.append(atom)
    return atoms, problems


def _number_input(**attrs):
    return forms.NumberInput(attrs={"step": "any", **attrs})


class SpeciesForm(forms.Form):
    name = forms.CharField(max_length=NAME_LENGTH, help_text="Unique in the catalogue, e.g. H2CO or 13CO.")
    formula = forms.CharField(max_length=FORMULA_LENGTH, help_text="Element symbols and counts, e.g. CH3CN, C[13]O.")
    rotor = forms.ChoiceField(choices=ROTOR_CHOICES)
    reduction = forms.ChoiceField(choices=REDUCTION_CHOICES, initial="A", help_text="Asymmetric tops only.")
    representation = forms.ChoiceField(choices=REPRESENTATION_CHOICES, initial="Ir", help_text="Asymmetric tops only.")
    mass_amu = forms.FloatField(
        label="Mass [u]", required=False, widget=_number_input(min="0"), help_text="Empty: from the formula."
    )
    dipole_a_debye = forms.FloatField(label="μa [D]", initial=0, widget=_number_input(min="0", max="15"))
    dipole_b_debye = forms.FloatField(label="μb [D]", initial=0, widget=_number_input(min="0", max="15"))
    dipole_c_debye = forms.FloatField(label="μc [D]", initial=0, widget=_number_input(min="0", max="15"))
    no_dipole = forms.BooleanField(
        label="No permanent dipole: save it knowing it has no rotational lines",
        required=False,
    )
    spin_axis = forms.ChoiceField(label="Spin statistics", choices=SPIN_AXIS_CHOICES, required=False)
    spin_weight_even = forms.FloatField(
        label="Weight of even levels (C3: K multiple of 3)", required=False, widget=_number_input(min="0")
    )
    spin_weight_odd = forms.FloatField(
        label="Weight of odd levels (C3: other K)", required=False, widget=_number_input(min="0")
    )
    source = forms.CharField(widget=forms.Textarea(attrs={"rows": 2}), required=False)
    notes = forms.CharField(widget=forms.Textarea(attrs={"rows": 2}), required=False)
    hazards = forms.CharField(
        label="Hazard notes",
        widget=forms.Textarea(attrs={"rows": 2}),
        required=False,
        help_text="Handling cautions for the lab (toxic, flammable, …); shown wherever the species is planned.",
    )
    parent = forms.CharField(
        label="Parent species", max_length=NAME_LENGTH, required=False, help_text="For an isotopologue: its parent."
    )
    natural_abundance = forms.FloatField(
        label="Natural abundance (fraction)",
        required=False,
        widget=_number_input(min="0", max="1"),
        help_text="Share of the molecules in a natural sample, e.g. 0.0106 for 13CO; empty: not stated (weight 1).",
    )
    constants_route = forms.ChoiceField(
        label="Constants obtained by", choices=ROUTE_CHOICES, initial="entered", required=False
    )
    route_note = forms.CharField(label="Route and accuracy", widget=forms.Textarea(attrs={"rows": 2}), required=False)
    hfs_nucleus = forms.CharField(
        label="Quadrupolar nucleus", max_length=10, required=False, help_text="e.g. 14N; empty: no hyperfine structure."
    )
    hfs_spin = forms.FloatField(label="Nuclear spin I", required=False, widget=_number_input(min="1", step="0.5"))
    hfs_chi = forms.CharField(
        label="Coupling constants χ",
        widget=forms.Textarea(attrs={"rows": 3, "class": "constants", "spellcheck": "false"}),
        required=False,
        help_text=CHI_HELP,
    )
    geometry = forms.CharField(
        label="Geometry",
        widget=forms.Textarea(attrs={"rows": 4, "class": "constants", "spellcheck": "false"}),
        required=False,
        help_text=GEOMETRY_HELP,
    )
    version = forms.IntegerField(widget=forms.HiddenInput, required=False)

    def clean_hfs_chi(self) -> dict[str, list[float]]:
        pairs, problems = parse_named_pairs(self.cleaned_data["hfs_chi"], "χ")
        if problems:
            raise forms.ValidationError(problems)
        return pairs

    def clean_geometry(self) -> list[dict]:
        atoms, problems = parse_geometry(self.cleaned_data["geometry"])
        if problems:
            raise forms.ValidationError(problems)
        return atoms

    def clean(self):
        cleaned = super().clean()
        dipoles = [cleaned.get(f"dipole_{axis}_debye") for axis in "abc"]
        if all(mu == 0 for mu in dipoles) and not cleaned.get("no_dipole"):
            self.add_error(
                "dipole_a_debye",
                "All three dipole components are zero: this species will have no rotational lines. "
                "Give its dipole, or tick “No permanent dipole” to save it anyway.",
            )
        for axis, mu in zip("abc", dipoles):
            if mu is not None and abs(mu) > MAX_DIPOLE_DEBYE:
                self.add_error(f"dipole_{axis}_debye", f"Must be within 0–{MAX_DIPOLE_DEBYE:g} D.")
        if cleaned.get("hfs_nucleus"):
            if cleaned.get("hfs_spin") is None and "hfs_spin" not in self.errors:
                self.add_error("hfs_spin", "Needed with a quadrupolar nucleus (I ≥ 1).")
            if not cleaned.get("hfs_chi") and "hfs_chi" not in self.errors:
                self.add_error("hfs_chi", "Give at least the coupling constant along the symmetry axis (aa).")
        elif cleaned.get("hfs_chi") or cleaned.get("hfs_spin") is not None:
            self.add_error("hfs_nucleus", "Name the nucleus (e.g. 14N), or clear the spin and χ fields.")
        if cleaned.get("spin_axis") == "":
            cleaned["spin_weight_even"] = cleaned["spin_weight_odd"] = None
        else:
            for name in ("spin_weight_even", "spin_weight_odd"):
                if cleaned.get(name) is None and name not in self.errors:
                    self.add_error(name, "Needed with spin statistics (0 for levels that do not exist).")
        return cleaned


class StateForm(forms.Form):
    # No initial values: a blank extra form must stay "unchanged" so that the formset skips it.
    label = forms.CharField(
        max_length=LABEL_LENGTH, help_text="e.g. v=0, v2=1", widget=forms.TextInput(attrs={"placeholder": "v=0"})
    )
    energy_cm1 = forms.FloatField(
        label="Energy [cm⁻¹]", help_text="Above the ground state.", widget=_number_input(min="0", placeholder="0")
    )
    degeneracy = forms.IntegerField(
        label="Degeneracy g_v",
        required=False,
        min_value=1,
        widget=_number_input(min="1", step="1", placeholder="1"),
        help_text="2 for one quantum of a doubly degenerate bend.",
    )
    constants = forms.CharField(
        label="Constants",
        required=False,
        widget=forms.Textarea(attrs={"rows": 6, "class": "constants", "spellcheck": "false"}),
        help_text=CONSTANTS_HELP,
    )
    alpha = forms.CharField(
        label="α from the ground state",
        required=False,
        widget=forms.Textarea(attrs={"rows": 2, "class": "constants", "spellcheck": "false"}),
        help_text=ALPHA_HELP,
    )

    def clean_constants(self) -> dict[str, list[float]]:
        """{NAME: [value, sigma]} [MHz] from the lines of the text box."""
        constants, problems = parse_named_pairs(self.cleaned_data["constants"], "value")
        if problems:
            raise forms.ValidationError(problems)
        return constants

    def clean_alpha(self) -> dict[str, list[float]]:
        alpha, problems = parse_named_pairs(self.cleaned_data["alpha"], "α")
        if problems:
            raise forms.ValidationError(problems)
        return alpha

    def clean(self):
        cleaned = super().clean()
        if not cleaned.get("constants") and not cleaned.get("alpha") and not self.errors:
            self.add_error("constants", "Give at least the rotational constants of this state (or its α).")
        return cleaned


class BaseStateFormSet(forms.BaseFormSet):
    def kept_forms(self) -> list[StateForm]:
        """The states to save, in order: filled-in forms not marked for deletion."""
        return [f for f in self.forms if f.has_changed() and not (self.can_delete and self._should_delete_form(f))]


StateFormSet = forms.formset_factory(
    StateForm, formset=BaseStateFormSet, extra=1, can_delete=True, min_num=1, validate_min=True
)


def constants_text(constants_mhz, rotor: str, reduction: str) -> str:
    """The text-box form of a state's constants, in the engine's parameter order."""
    order = allowed_parameters(rotor, reduction)
    names = [n for n in order if n in constants_mhz] + [n for n in constants_mhz if n not in order]
    return "\n".join(f"{n} {constants_mhz[n][0]:.12g} {constants_mhz[n][1]:.6g}" for n in names)


def initial_data(species: Species, version: int) -> tuple[dict, list[dict]]:
    """Initial values of both forms for editing ``species``."""
    weights = species.spin_weights
    form = {
        "name": species.name,
        "formula": species.formula,
        "rotor": species.rotor,
        "reduction": species.reduction,
        "representation": species.representation,
        "mass_amu": species.mass_amu,
        "dipole_a_debye": species.dipole_debye[0],
        "dipole_b_debye": species.dipole_debye[1],
        "dipole_c_debye": species.dipole_debye[2],
        "no_dipole": not species.has_dipole,
        "spin_axis": weights.axis if weights else "",
        "spin_weight_even": weights.even if weights else None,
        "spin_weight_odd": weights.odd if weights else None,
        "source": species.source,
        "notes": species.notes,
        "hazards": species.hazards,
        "parent": species.parent,
        "natural_abundance": species.natural_abundance,
        "constants_route": species.constants_route,
        "route_note": species.route_note,
        "hfs_nucleus": species.hyperfine.nucleus if species.hyperfine else "",
        "hfs_spin": species.hyperfine.spin if species.hyperfine else None,
        "hfs_chi": "\n".join(f"{k} {v[0]:.10g} {v[1]:.6g}" for k, v in species.hyperfine.chi_mhz.items())
        if species.hyperfine
        else "",
        "geometry": "\n".join(
            " ".join([a.element, *([str(a.mass_number)] if a.mass_number else []), *(f"{x:.6f}" for x in a.xyz_a)])
            for a in species.geometry
        ),
        "version": version,
    }
    states = [
        {
            "label": s.label,
            "energy_cm1": s.energy_cm1,
            "degeneracy": s.degeneracy,
            "constants": constants_text(s.stored_constants_mhz, species.rotor, species.reduction),
            "alpha": constants_text(s.alpha_mhz, species.rotor, species.reduction),
        }
        for s in species.states
    ]
    return form, states


def validated_species(form: SpeciesForm, states: BaseStateFormSet) -> Species | None:
    """The engine Species of the two forms, or None after putting every problem next to its field.

    Call after ``is_valid()`` on both.  The engine's rules are checked even
    when some fields already failed (with stand-ins for those), so that one
    save shows every problem at once rather than in rounds.
    """
    data = form.cleaned_data
    if any(key not in data for key in ("name", "formula", "rotor", "reduction", "representation")):
        return None  # without these the rules cannot be asked
    checked = [f for f in states.kept_forms() if not f.errors]
    entry = {
        "name": data["name"],
        "formula": data["formula"],
        "rotor": data["rotor"],
        "reduction": data["reduction"],
        "representation": data["representation"],
        "dipole_debye": {axis: data.get(f"dipole_{axis}_debye") or 0.0 for axis in "abc"},
        "states": [_state_entry(f.cleaned_data) for f in checked],
        "source": data.get("source", ""),
        "notes": data.get("notes", ""),
        "hazards": data.get("hazards", ""),
        "parent": data.get("parent", ""),
        "constants_route": data.get("constants_route") or "entered",
        "route_note": data.get("route_note", ""),
    }
    if data.get("natural_abundance") is not None:
        entry["natural_abundance"] = data["natural_abundance"]
    if data.get("hfs_nucleus") and data.get("hfs_spin") is not None and data.get("hfs_chi"):
        entry["hyperfine"] = {"nucleus": data["hfs_nucleus"], "spin": data["hfs_spin"], "chi_mhz": data["hfs_chi"]}
    if data.get("geometry"):
        entry["geometry"] = data["geometry"]
    if data.get("mass_amu") is not None:
        entry["mass_amu"] = data["mass_amu"]
    if data.get("spin_axis") and data.get("spin_weight_even") is not None and data.get("spin_weight_odd") is not None:
        even_key, odd_key = ("k_multiple_of_3", "other") if data["spin_axis"] == "C3" else ("even", "odd")
        entry["spin_weights"] = {
            "axis": data["spin_axis"],
            even_key: data["spin_weight_even"],
            odd_key: data["spin_weight_odd"],
        }
    if not checked:
        entry["states"] = [{"label": "?", "energy_cm1": 0.0, "constants_mhz": {}}]  # species-level rules only
    species, problems = parse_species(entry, data["name"])
    for problem in problems:
        if checked or not problem.field.startswith("states"):
            _place(problem.field, problem.message, form, checked, states, entry)
    if form.errors or states.total_error_count():
        return None
    return species


def _state_entry(cleaned: dict) -> dict:
    state = {"label": cleaned["label"], "energy_cm1": cleaned["energy_cm1"], "constants_mhz": cleaned["constants"]}
    if cleaned.get("degeneracy") is not None:
        state["degeneracy"] = cleaned["degeneracy"]
    if cleaned.get("alpha"):
        state["alpha_mhz"] = cleaned["alpha"]
    return state


_SPIN_FIELDS = {
    "spin_weights": "spin_axis",
    "spin_weights.axis": "spin_axis",
    "spin_weights.even": "spin_weight_even",
    "spin_weights.k_multiple_of_3": "spin_weight_even",
    "spin_weights.odd": "spin_weight_odd",
    "spin_weights.other": "spin_weight_odd",
}
_STATE_PATH = re.compile(
    r"states\[(\d+)\](?:\.(label|energy_cm1|degeneracy|constants_mhz|alpha_mhz|covariance_mhz2)(?:\.(.+))?)?$"
)


def _place(path: str, message: str, form, kept, states, entry) -> None:
    """Attach one reader problem to the form field that ``path`` names (unless it already has one)."""
    if path in form.fields and path in form.errors:
        return
    if path in form.fields and path not in ("version",):
        form.add_error(path, message)
    elif path.startswith("dipole_debye"):
        axis = path.rpartition(".")[2]
        if axis not in "abc" or len(axis) != 1:
            # a rule on the direction: put it on the first component that breaks it
            allowed = "c" if entry["rotor"] == "symmetric-oblate" else "a"
            axis = next((a for a in "abc" if a != allowed and entry["dipole_debye"][a]), allowed)
        if f"dipole_{axis}_debye" not in form.errors:
            form.add_error(f"dipole_{axis}_debye", message)
    elif path in _SPIN_FIELDS:
        if _SPIN_FIELDS[path] not in form.errors:
            form.add_error(_SPIN_FIELDS[path], message)
    elif match := _STATE_PATH.match(path):
        index, key, parameter = int(match[1]), match[2], match[3]
        target = kept[index] if index < len(kept) else None
        if target is None:
            states._non_form_errors.append(message)
        elif key in (None, "label", "energy_cm1", "degeneracy"):
            target.add_error(key or None, message)
        else:
            box = "alpha" if key == "alpha_mhz" else "constants"
            target.add_error(box, f"{parameter}: {message}" if parameter else message)
    elif path.startswith("hyperfine"):
        box = {"hyperfine.nucleus": "hfs_nucleus", "hyperfine.spin": "hfs_spin"}.get(path, "hfs_chi")
        if box not in form.errors:
            form.add_error(box, message)
    elif path.startswith("geometry"):
        if "geometry" not in form.errors:
            atom = re.match(r"geometry\[(\d+)\]", path)
            form.add_error("geometry", f"atom {int(atom[1]) + 1}: {message}" if atom else message)
    elif path == "states":
        states._non_form_errors.append(message)
    else:
        form.add_error(None if path not in form.fields else path, f"{path}: {message}")


__all__ = ["SpeciesForm", "StateFormSet", "initial_data", "validated_species"]
