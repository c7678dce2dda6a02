"""The spectrum page's form: species, temperature and frequency window.

Field names are the engine's request names (``fmin_mhz``, ``temperature_k``,
...), so an engine ValueError naming a field lands next to that field.
"""

from __future__ import annotations

from django import forms
from django.core.exceptions import ValidationError

from planner.engine import PredictionRequest
from planner.engine.request import MAX_TEMPERATURE_K
from planner.limits import MAX_FREQUENCY_MHZ

DEFAULT_TEMPERATURE_K = 300.0
DEFAULT_FMIN_MHZ = 0.0
#: 1 THz: past it a rotational spectrum of most species has faded, and the
#: engine's own intensity floor keeps the list finite anyway.
DEFAULT_FMAX_MHZ = 1_000_000.0
REQUEST_FIELDS = ("fmin_mhz", "fmax_mhz", "temperature_k", "min_intensity_nm2mhz")


def _plain(number: float) -> str:
    """Initial field text without a trailing '.0' (300, not 300.0)."""
    return format(number, ".10g")


def _positive(value: float) -> None:
    if value is not None and value <= 0:
        raise ValidationError("Must be above 0 K.")


class SpectrumForm(forms.Form):
    species = forms.ChoiceField(label="Species")
    temperature_k = forms.FloatField(
        label="Temperature [K]",
        initial=_plain(DEFAULT_TEMPERATURE_K),
        max_value=MAX_TEMPERATURE_K,
        validators=[_positive],
        widget=forms.NumberInput(attrs={"step": "any", "min": "0"}),
    )
    fmin_mhz = forms.FloatField(
        label="From [MHz]",
        initial=_plain(DEFAULT_FMIN_MHZ),
        min_value=0.0,
        widget=forms.NumberInput(attrs={"step": "any", "min": "0"}),
    )
    fmax_mhz = forms.FloatField(
        label="To [MHz]",
        initial=_plain(DEFAULT_FMAX_MHZ),
        widget=forms.NumberInput(attrs={"step": "any", "min": "0"}),
    )
    min_intensity_nm2mhz = forms.FloatField(
        label="Intensity floor [nm² MHz]",
        required=False,
        min_value=0.0,
        help_text="Leave empty to keep every line above the engine's relative floor.",
        widget=forms.NumberInput(attrs={"step": "any", "min": "0", "placeholder": "none"}),
    )

    def __init__(self, *args, species_names: list[str], **kwargs):
        super().__init__(*args, **kwargs)
        self.fields["species"].choices = [(name, name) for name in species_names]

    def clean(self):
        cleaned = super().clean()
        fmin, fmax = cleaned.get("fmin_mhz"), cleaned.get("fmax_mhz")
        if fmin is not None and fmax is not None and fmax <= fmin:
            self.add_error("fmax_mhz", "Must be above the lower edge of the window.")
        elif fmax is not None and fmax > MAX_FREQUENCY_MHZ:
            # planner/limits.py: the window's top edge bounds the work of one request.
            self.add_error(
                "fmax_mhz",
                f"At most {MAX_FREQUENCY_MHZ:.0f} MHz ({MAX_FREQUENCY_MHZ / 1e6:g} THz): choose a lower window.",
            )
        if not self.errors:
            self._build_request(cleaned)
        return cleaned

    def _build_request(self, cleaned: dict) -> None:
        # The engine has the last word on what a valid request is; its message
        # names the field, which lets it land next to that field.
        try:
            self.prediction_request = PredictionRequest(
                fmin_mhz=cleaned["fmin_mhz"],
                fmax_mhz=cleaned["fmax_mhz"],
                temperature_k=cleaned["temperature_k"],
                min_intensity_nm2mhz=cleaned.get("min_intensity_nm2mhz") or 0.0,
            )
        except ValueError as error:
            message = str(error)
            field = next((name for name in REQUEST_FIELDS if message.startswith(name)), None)
            self.add_error(field, message)

    def request(self) -> PredictionRequest:
        """The validated engine request (call after ``is_valid()`` returned True)."""
        return self.prediction_request
