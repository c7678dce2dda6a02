"""Template filter that prints a number with a format spec, e.g. {{ q|number:".6g" }}."""

from django import template

from planner.spectra.table import format_cell

register = template.Library()


@register.filter
def number(value, number_format: str = ".6g") -> str:
    """``value`` in ``number_format``; blank for None, unchanged text for non-numbers."""
    return format_cell(value, number_format)
