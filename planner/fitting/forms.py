"""The fit form: species, constants to vary, assigned lines pasted or uploaded as CSV."""

from __future__ import annotations

from django import forms

from planner.catalogue.models import Species
from planner.limits import FIT_J_CAPS, MAX_LINES_BYTES

from .lines_file import REQUIRED_COLUMNS, LinesFileError, read_lines


class FitForm(forms.Form):
    species = forms.ModelChoiceField(queryset=Species.objects.order_by("name"))
    vary = forms.CharField(label="Constants to fit", help_text="Comma-separated, e.g. B, D or A, B, C, DeltaJ.")
    lines_text = forms.CharField(
        label="Assigned lines (CSV)",
        required=False,
        widget=forms.Textarea(attrs={"rows": 10, "class": "constants", "spellcheck": "false"}),
        help_text="Header: " + ",".join(REQUIRED_COLUMNS) + " (and optionally state, note). Blank Ka, Kc for linear.",
    )
    lines_file = forms.FileField(label="…or upload the CSV", required=False)

    def clean_vary(self) -> list[str]:
        names = [n.strip() for n in self.cleaned_data["vary"].replace(";", ",").split(",") if n.strip()]
        if not names:
            raise forms.ValidationError("Name at least one constant to fit.")
        return names

    def clean(self):
        cleaned = super().clean()
        upload = cleaned.get("lines_file")
        text = cleaned.get("lines_text") or ""
        if upload is not None:
            if upload.size > MAX_LINES_BYTES:
                self.add_error("lines_file", f"The file is larger than {MAX_LINES_BYTES // 1024 // 1024} MB.")
                return cleaned
            try:
                text = upload.read().decode("utf-8")
            except UnicodeDecodeError:
                self.add_error("lines_file", "The file is not UTF-8 text.")
                return cleaned
        elif len(text.encode("utf-8")) > MAX_LINES_BYTES:
            self.add_error("lines_text", f"The pasted lines are longer than {MAX_LINES_BYTES // 1024 // 1024} MB.")
            return cleaned
        if not text.strip():
            self.add_error("lines_text", "Paste the assigned lines or upload a CSV file.")
            return cleaned
        field = "lines_file" if upload is not None else "lines_text"
        try:
            cleaned["lines"] = read_lines(text)
        except LinesFileError as error:
            self.add_error(field, error.problems)
        else:
            self._check_j(cleaned, field)
        cleaned["csv_text"] = text
        return cleaned

    def _check_j(self, cleaned: dict, field: str) -> None:
        """Refuse lines above the web fit's J cap before the fit solves their levels (planner/limits.py)."""
        row = cleaned.get("species")
        cap = FIT_J_CAPS.get(row.rotor) if row is not None else None
        if cap is None:
            return
        high = [i for i, line in enumerate(cleaned["lines"], start=1) if max(line.j_up, line.j_lo) > cap]
        if high:
            self.add_error(
                field,
                f"line {high[0]} has J above {cap}, the most a fit on this page takes for a {row.rotor} rotor"
                + (f" ({len(high)} such lines)" if len(high) > 1 else "")
                + ".",
            )
            del cleaned["lines"]
