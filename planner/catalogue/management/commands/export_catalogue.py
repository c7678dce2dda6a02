"""`manage.py export_catalogue [--output FILE]`: the whole catalogue as a catalogue JSON file."""

from __future__ import annotations

from pathlib import Path

from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.store import export_species
from planner.catalogue_file import CatalogueError, dump_catalogue


class Command(BaseCommand):
    help = "Write every species of the catalogue as a catalogue JSON file (to stdout unless --output is given)."

    def add_arguments(self, parser):
        parser.add_argument("--output", type=Path, default=None, metavar="FILE", help="file to write (default stdout)")

    def handle(self, *args, **options):
        species = export_species()
        output = options["output"]
        if output is not None and not output.resolve().parent.is_dir():
            raise CommandError(f"cannot write {output}: folder {output.resolve().parent} does not exist")
        try:
            # dump_catalogue reads its text back before writing and replaces a file in one step.
            dump_catalogue(species, output if output is not None else self.stdout)
        except (CatalogueError, OSError) as error:
            raise CommandError(f"export failed, nothing written: {error}") from error
        if output is not None:
            self.stderr.write(f"wrote {len(species)} species to {output}")
