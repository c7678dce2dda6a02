"""Template filters of the plan pages."""

from django import template

register = template.Library()


@register.filter
def subtract(value, other):
    """value − other, for widths from start and stop; blank when either is missing."""
    if value is None or other is None:
        return None
    return value - other


@register.filter
def quantum_text(target: dict) -> str:
    """'J Ka Kc ← J Ka Kc' of a target, numbers the rotor kind does not have left out."""

    def level(suffix):
        return " ".join(
            str(target[f"{q}_{suffix}"]) for q in ("j", "ka", "kc") if target.get(f"{q}_{suffix}") is not None
        )

    return f"{level('up')} ← {level('lo')}"


@register.filter
def dwell_text(seconds) -> str:
    """A dwell time as the operator sets it: under 1 s says so, else 3 digits with minutes where useful."""
    if seconds is None:
        return ""
    if seconds < 1:
        return "< 1 s"
    if seconds < 120:
        return f"{seconds:.3g} s"
    return f"{seconds / 60:.3g} min"
