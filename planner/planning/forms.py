"""The plan form: instrument, window (MHz or GHz), temperature, species with amounts, limits, slot.

``PlanForm.inputs()`` turns the cleaned form into the plain inputs of
compute.py, which the saved plan freezes and the CLI builds the same way.
"""

from __future__ import annotations

from django import forms
from django.core.exceptions import ValidationError
from django.utils.html import format_html
from django.utils.safestring import mark_safe

from planner.engine.request import MAX_TEMPERATURE_K
from planner.limits import MAX_FREQUENCY_MHZ, MAX_PLAN_SETTINGS, MAX_PLAN_SPAN_MHZ

from .compute import default_model_inputs
from .models import Instrument

UNIT_FACTORS_MHZ = {"MHz": 1.0, "GHz": 1000.0}
MAX_SPECIES = 30


def _number(**attrs):
    return forms.NumberInput(attrs={"step": "any", **attrs})


class DirectNumberInput(forms.NumberInput):
    """A number input written straight to HTML, the same markup as Django's template-rendered one.

    The plan form has two inputs per catalogue species; rendering them through
    the widget templates was half the time of a plan page whose plan was
    already cached (profile of the load test's plan page, 2026-12-02).
    """

    def render(self, name, value, attrs=None, renderer=None):
        widget = self.get_context(name, value, attrs)["widget"]
        parts = [format_html('<input type="{}" name="{}"', widget["type"], widget["name"])]
        if widget["value"] is not None:
            parts.append(format_html(' value="{}"', str(widget["value"])))
        # As Django's attrs.html: False leaves the attribute out, True writes it bare, in the given order.
        for key, attribute in widget["attrs"].items():
            if attribute is True:
                parts.append(format_html(" {}", key))
            elif attribute is not False:
                parts.append(format_html(' {}="{}"', key, str(attribute)))
        # Every part went through format_html, which escapes what it inserts.
        return mark_safe("".join(parts) + ">")


def _species_number(**attrs):
    return DirectNumberInput(attrs={"step": "any", **attrs})


class PlanForm(forms.Form):
    instrument = forms.ModelChoiceField(
        queryset=Instrument.objects.all(),
        required=False,
        empty_label="none: relative model, default floor",
        help_text="Its coverage, setting width, channel width, retuning time and sensitivity model.",
    )
    frequency_unit = forms.ChoiceField(label="Window unit", choices=[("GHz", "GHz"), ("MHz", "MHz")], initial="GHz")
    fmin = forms.FloatField(label="From", min_value=0, initial=80, widget=_number(min="0"))
    fmax = forms.FloatField(label="To", min_value=0, initial=120, widget=_number(min="0"))
    temperature_k = forms.FloatField(
        label="Temperature [K]", initial=300, min_value=0.1, max_value=MAX_TEMPERATURE_K, widget=_number(min="0")
    )
    slot_minutes = forms.FloatField(label="Slot [min]", initial=60, min_value=0.1, widget=_number(min="0"))
    snr = forms.FloatField(label="Required SNR", initial=5, min_value=0.1, widget=_number(min="0"))
    k_sigma = forms.FloatField(
        label="Scan margin [×σ]", initial=3, min_value=0, widget=_number(min="0"), help_text="±k·σ of each line"
    )
    margin_mhz = forms.FloatField(label="Extra margin [MHz]", initial=0, min_value=0, widget=_number(min="0"))
    min_intensity_nm2mhz = forms.FloatField(
        label="Intensity floor [nm² MHz]", required=False, min_value=0, widget=_number(min="0", placeholder="none")
    )
    max_eu_k = forms.FloatField(
        label="Max upper-state energy [K]", required=False, min_value=0, widget=_number(min="0", placeholder="none")
    )
    pressure_pa = forms.FloatField(
        label="Pressure [Pa]", required=False, min_value=0, widget=_number(min="0"), help_text="Absorption cell only."
    )
    satellites = forms.ChoiceField(
        label="Vibrational satellites",
        choices=[("include", "include"), ("exclude", "exclude")],
        required=False,
        initial="include",
        help_text="Lines of excited vibrational states.",
    )

    def __init__(self, *args, species: list[tuple], **kwargs):
        super().__init__(*args, **kwargs)
        # Keyed by the species' id, which never moves: a saved query or a plan being saved
        # keeps its amounts on the right species when others are added to the catalogue.
        # Each item is (pk, name) or (pk, name, natural abundance or None).
        self.species = [(item[0], item[1]) for item in species]
        self.natural = {item[0]: (item[2] if len(item) > 2 else None) for item in species}
        for pk, name in self.species:
            self.fields[f"amount_{pk}"] = forms.FloatField(
                label=name,
                required=False,
                min_value=0,
                widget=_species_number(min="0", placeholder="—", **{"aria-label": f"amount of {name}"}),
            )
            natural = self.natural[pk]
            self.fields[f"fraction_{pk}"] = forms.FloatField(
                label=f"isotopic fraction of {name}",
                required=False,
                min_value=0,
                max_value=1,
                widget=_species_number(
                    min="0",
                    max="1",
                    placeholder=f"{natural:.3g}" if natural is not None else "1",
                    title="Share of the molecules that are this isotopologue; empty: natural abundance",
                    **{"aria-label": f"isotopic fraction of {name}"},
                ),
            )

    def species_fields(self):
        return [(name, self[f"amount_{pk}"], self[f"fraction_{pk}"]) for pk, name in self.species]

    def clean(self):
        cleaned = super().clean()
        factor = UNIT_FACTORS_MHZ.get(cleaned.get("frequency_unit") or "GHz", 1.0)
        fmin, fmax = cleaned.get("fmin"), cleaned.get("fmax")
        if fmin is not None and fmax is not None:
            if fmax <= fmin:
                self.add_error("fmax", "Must be above the lower edge of the window.")
            elif (fmax - fmin) * factor > MAX_PLAN_SPAN_MHZ or fmax * factor > MAX_FREQUENCY_MHZ:
                # planner/limits.py: the window bounds the work of one plan request.
                self.add_error(
                    "fmax",
                    f"Plan a window of at most {MAX_PLAN_SPAN_MHZ / 1000:g} GHz below "
                    f"{MAX_FREQUENCY_MHZ / 1000:g} GHz; split a wider one into several plans.",
                )
            cleaned["fmin_mhz"], cleaned["fmax_mhz"] = fmin * factor, fmax * factor
        for pk, name in self.species:
            if cleaned.get(f"fraction_{pk}") == 0:
                self.add_error(f"fraction_{pk}", "Must be above 0; leave it empty for the natural abundance.")
        chosen = [
            (name, cleaned[f"amount_{pk}"], cleaned.get(f"fraction_{pk}"))
            for pk, name in self.species
            if cleaned.get(f"amount_{pk}")
        ]
        if not chosen and not any(f"amount_{pk}" in self.errors for pk, _ in self.species):
            raise ValidationError("Give an abundance or mole fraction for at least one species.")
        if len(chosen) > MAX_SPECIES:
            raise ValidationError(f"Plan at most {MAX_SPECIES} species at once.")
        instrument = cleaned.get("instrument")
        if "fmin_mhz" in cleaned and not self.has_error("fmax"):
            self._check_settings(cleaned, instrument)
        if instrument is not None and "fmin_mhz" in cleaned:
            if cleaned["fmin_mhz"] < instrument.fmin_mhz or cleaned["fmax_mhz"] > instrument.fmax_mhz:
                self.add_error(
                    "fmax",
                    f"{instrument.name} covers {instrument.fmin_mhz:g}–{instrument.fmax_mhz:g} MHz; "
                    "choose a window inside it.",
                )
            if instrument.model_kind == "absorption-cell":
                for name, amount, _ in chosen:
                    if amount > 1:
                        self.add_error(None, f"{name}: a mole fraction is at most 1, got {amount:g}.")
        cleaned["chosen"] = chosen
        return cleaned

    def _check_settings(self, cleaned: dict, instrument) -> None:
        """Refuse a window that the instrument's setting width cuts into too many pieces (planner/limits.py)."""
        width = instrument.setting_width_mhz if instrument is not None else DEFAULT_SETTINGS["setting_width_mhz"]
        settings = (cleaned["fmax_mhz"] - cleaned["fmin_mhz"]) / width
        if settings > MAX_PLAN_SETTINGS:
            self.add_error(
                "fmax",
                f"With settings {width:g} MHz wide this window needs {settings:.0f} of them; at most "
                f"{MAX_PLAN_SETTINGS} are planned at once: choose a window of at most "
                f"{MAX_PLAN_SETTINGS * width:g} MHz.",
            )

    def inputs(self) -> dict:
        """The plain, JSON-ready inputs of compute.compute_plan."""
        data = self.cleaned_data
        instrument = data.get("instrument")
        inputs = {
            "instrument": instrument.name if instrument else None,
            "fmin_mhz": data["fmin_mhz"],
            "fmax_mhz": data["fmax_mhz"],
            "temperature_k": data["temperature_k"],
            "slot_s": data["slot_minutes"] * 60.0,
            "snr": data["snr"],
            "k_sigma": data["k_sigma"],
            "margin_mhz": data["margin_mhz"],
            "min_intensity_nm2mhz": data.get("min_intensity_nm2mhz") or 0.0,
            "max_eu_k": data.get("max_eu_k"),
            "species": [_species_input(name, amount, fraction) for name, amount, fraction in data["chosen"]],
            "include_satellites": data.get("satellites") != "exclude",
        }
        inputs |= instrument_inputs(instrument, data.get("pressure_pa"))
        return inputs


def _species_input(name: str, amount: float, fraction: float | None) -> dict:
    entry = {"name": name, "amount": amount}
    if fraction is not None:
        entry["isotopic_fraction"] = fraction
    return entry


#: Setting width, channel width and retuning time without an instrument (common practice, no source).
DEFAULT_SETTINGS = {"setting_width_mhz": 1000.0, "channel_width_mhz": 0.1, "retune_overhead_s": 10.0}


def instrument_inputs(instrument: Instrument | None, pressure_pa: float | None = None) -> dict:
    """The instrument's part of the plan inputs (its settings and sensitivity model)."""
    if instrument is None:
        return DEFAULT_SETTINGS | {"model": default_model_inputs()}
    settings = {
        "setting_width_mhz": instrument.setting_width_mhz,
        "channel_width_mhz": instrument.channel_width_mhz,
        "retune_overhead_s": instrument.retune_overhead_s,
    }
    if instrument.model_kind == "absorption-cell":
        model = {
            "kind": "absorption-cell",
            "path_length_cm": instrument.path_length_cm,
            "noise_absorption_per_sqrt_hz": instrument.noise_absorption_per_sqrt_hz,
            "pressure_pa": pressure_pa or instrument.pressure_pa,
            "broadening_khz_per_pa": instrument.broadening_khz_per_pa or 0.0,
        }
    else:
        model = {"kind": "relative", "detection_floor_1s": instrument.detection_floor_1s}
    return settings | {"model": model}


class InstrumentForm(forms.ModelForm):
    class Meta:
        model = Instrument
        fields = [
            "name",
            "fmin_mhz",
            "fmax_mhz",
            "setting_width_mhz",
            "channel_width_mhz",
            "retune_overhead_s",
            "model_kind",
            "path_length_cm",
            "noise_absorption_per_sqrt_hz",
            "pressure_pa",
            "broadening_khz_per_pa",
            "detection_floor_1s",
            "notes",
        ]
        widgets = {"notes": forms.Textarea(attrs={"rows": 2})}

    def clean(self):
        cleaned = super().clean()
        for name in ("fmin_mhz", "setting_width_mhz", "channel_width_mhz", "retune_overhead_s"):
            value = cleaned.get(name)
            if value is not None and value < 0:
                self.add_error(name, "Must not be negative.")
        for name in ("setting_width_mhz", "channel_width_mhz"):
            if cleaned.get(name) == 0:
                self.add_error(name, "Must be above 0.")
        if cleaned.get("fmin_mhz") is not None and cleaned.get("fmax_mhz") is not None:
            if cleaned["fmax_mhz"] <= cleaned["fmin_mhz"]:
                self.add_error("fmax_mhz", "Must be above the lowest frequency.")
        kind = cleaned.get("model_kind")
        needed = (
            ("path_length_cm", "noise_absorption_per_sqrt_hz", "pressure_pa", "broadening_khz_per_pa")
            if kind == "absorption-cell"
            else ("detection_floor_1s",)
        )
        for name in needed:
            value = cleaned.get(name)
            if value is None:
                self.add_error(name, "Needed by this sensitivity model.")
            elif value <= 0 and name != "broadening_khz_per_pa":
                self.add_error(name, "Must be above 0.")
            elif value < 0:
                self.add_error(name, "Must not be negative.")
        return cleaned
