"""The species the page offers, read from the catalogue file named in settings.

Reading and validating the file takes a moment, so the result is kept until
the file changes (its modification time or size moves).  A later version keeps
the catalogue in the database and this module goes away.
"""

from __future__ import annotations

import threading
from pathlib import Path

from django.conf import settings

from planner.catalogue_file import CatalogueError, load_catalogue
from planner.catalogue_file.problems import Problem
from planner.engine import Species

_lock = threading.Lock()
_cache: dict[str, object] = {"key": None, "species": None}


def catalogue_path() -> Path:
    return Path(settings.LINECAST_CATALOGUE_FILE)


def catalogue_species() -> list[Species]:
    """All species of the configured catalogue file, in file order.

    Raises CatalogueError (with every problem listed) when the file is missing
    or broken.
    """
    path = catalogue_path()
    try:
        status = path.stat()
    except OSError as error:
        problem = Problem(None, "file", f"cannot read {path}: {error.strerror or error}")
        raise CatalogueError([problem], path=str(path)) from error
    key = (str(path), status.st_mtime_ns, status.st_size)
    with _lock:
        if _cache["key"] != key:
            _cache["species"] = load_catalogue(path)
            _cache["key"] = key
        return list(_cache["species"])


def species_by_name(name: str) -> Species | None:
    """The species called ``name``, or None when the catalogue has none of that name."""
    return next((species for species in catalogue_species() if species.name == name), None)
