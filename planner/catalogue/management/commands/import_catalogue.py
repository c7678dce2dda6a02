"""`manage.py import_catalogue FILE`: add or replace species from a catalogue file, all or nothing."""

from __future__ import annotations

from pathlib import Path

from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.store import Stamp, import_species
from planner.catalogue_file import CatalogueError, load_catalogue


class Command(BaseCommand):
    help = (
        "Import a catalogue JSON file (docs/catalogue-format.md): species with a name already in the catalogue "
        "are replaced, the others added. A file with any problem changes nothing."
    )

    def add_arguments(self, parser):
        parser.add_argument("file", type=Path, help="catalogue JSON file")

    def handle(self, *args, **options):
        path = options["file"]
        try:
            species = load_catalogue(path)
            summary = import_species(species, Stamp(None, f"import_catalogue {path.name}"))
        except CatalogueError as error:
            lines = "\n".join(f"  {problem}" for problem in error.problems)
            raise CommandError(f"{path}: nothing imported, {len(error.problems)} problem(s):\n{lines}") from error
        self.stdout.write(f"imported {path}: {summary}")
