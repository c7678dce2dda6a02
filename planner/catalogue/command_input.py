"""What several management commands read first: one species of a catalogue file."""

from __future__ import annotations

from pathlib import Path

from django.core.management.base import CommandError

from planner.catalogue_file import CatalogueError, load_catalogue
from planner.engine import Species


def species_from_file(path: Path, name: str) -> tuple[list[Species], Species]:
    """(every species of the catalogue file at ``path``, the one called ``name``); CommandError naming
    the problem otherwise."""
    try:
        catalogue = load_catalogue(path)
    except CatalogueError as error:
        raise CommandError(f"catalogue {path} has problems:\n{error}") from error
    except OSError as error:
        raise CommandError(f"cannot read {path}: {error.strerror or error}") from error
    by_name = {s.name: s for s in catalogue}
    if name not in by_name:
        raise CommandError(f"no species {name!r} in {path}; it has: {', '.join(sorted(by_name))}")
    return catalogue, by_name[name]
