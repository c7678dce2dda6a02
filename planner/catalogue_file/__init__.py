"""The catalogue file: Linecast's own JSON format for species, read and written without Django.

>>> from planner.catalogue_file import load_catalogue, DEMO_CATALOGUE_PATH
>>> species = load_catalogue(DEMO_CATALOGUE_PATH)

The format is described in docs/catalogue-format.md.
"""

from pathlib import Path

from .masses import mass_from_formula
from .problems import CatalogueError, Problem
from .reader import load_catalogue, parse_catalogue, parse_catalogue_bytes
from .writer import catalogue_to_dict, dump_catalogue

#: The demo catalogue shipped with Linecast (see planner/demo/README.md).
DEMO_CATALOGUE_PATH = Path(__file__).resolve().parent.parent / "demo" / "catalogue.json"

__all__ = [
    "DEMO_CATALOGUE_PATH",
    "CatalogueError",
    "Problem",
    "catalogue_to_dict",
    "dump_catalogue",
    "load_catalogue",
    "mass_from_formula",
    "parse_catalogue",
    "parse_catalogue_bytes",
]
