"""The species page's small GET form: the temperature of its stick spectrum and the Q(T) list."""

from __future__ import annotations

import re

from django import forms

from planner.engine.request import MAX_TEMPERATURE_K

DEFAULT_TEMPERATURES_K = "10, 75, 150, 300"
MAX_TEMPERATURES = 12


def _temperature_error(value: float) -> str | None:
    if not 0 < value <= MAX_TEMPERATURE_K:
        return f"{value:g} K is outside 0–{MAX_TEMPERATURE_K:g} K"
    return None


class SpeciesPageForm(forms.Form):
    temperature_k = forms.FloatField(
        label="Spectrum temperature [K]",
        initial=300,
        required=False,
        widget=forms.NumberInput(attrs={"step": "any", "min": "0"}),
    )
    temperatures_k = forms.CharField(
        label="Q(T) at temperatures [K]",
        initial=DEFAULT_TEMPERATURES_K,
        required=False,
        help_text=f"Up to {MAX_TEMPERATURES} values, separated by commas or spaces.",
    )

    def clean_temperature_k(self) -> float:
        value = self.cleaned_data["temperature_k"]
        if value is None:
            return 300.0
        problem = _temperature_error(value)
        if problem:
            raise forms.ValidationError(f"{problem}.")
        return value

    def clean_temperatures_k(self) -> list[float]:
        text = self.cleaned_data["temperatures_k"].strip() or DEFAULT_TEMPERATURES_K
        parts = [p for p in re.split(r"[\s,;]+", text) if p]
        values, problems = [], []
        for part in parts:
            try:
                value = float(part)
            except ValueError:
                problems.append(f"“{part}” is not a number")
                continue
            problem = _temperature_error(value)
            if problem:
                problems.append(problem)
            values.append(value)
        if len(parts) > MAX_TEMPERATURES:
            problems.append(f"give at most {MAX_TEMPERATURES} temperatures, got {len(parts)}")
        if problems:
            raise forms.ValidationError("; ".join(problems) + ".")
        return sorted(set(values))
