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
