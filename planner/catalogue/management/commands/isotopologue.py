"""`manage.py isotopologue --catalogue FILE --species NAME --substitute C=13C [...] [--output FILE]`.

Derives one isotopologue of a catalogue file's species (by the reduced mass
for a diatomic, through the stored geometry otherwise) and writes a catalogue
file holding that species, with its constants, natural abundance and route.
"""

from __future__ import annotations

from pathlib import Path

from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.command_input import species_from_file
from planner.catalogue_file import CatalogueError, dump_catalogue
from planner.catalogue_file.isotopologues import DerivationError, derive_isotopologue


class Command(BaseCommand):
    help = (
        "Derive an isotopologue of a species in a catalogue file and write it as a catalogue file "
        "(to stdout unless --output is given)."
    )

    def add_arguments(self, parser):
        parser.add_argument("--catalogue", type=Path, required=True, metavar="FILE", help="catalogue JSON file")
        parser.add_argument("--species", required=True, metavar="NAME", help="the parent species")
        parser.add_argument(
            "--substitute",
            action="append",
            required=True,
            metavar="WHERE=ISOTOPE",
            help="an atom by element symbol (C=13C, when the molecule has one C) or by position in the stored "
            "geometry or formula, from 1 (2=18O); repeat for several atoms",
        )
        parser.add_argument("--name", default=None, help="name of the new species (default: from the isotopes)")
        parser.add_argument("--output", type=Path, default=None, metavar="FILE", help="file to write (default stdout)")

    def handle(self, *args, **options):
        _, parent = species_from_file(options["catalogue"], options["species"])
        try:
            derived = derive_isotopologue(parent, options["substitute"], options["name"])
        except DerivationError as error:
            raise CommandError(str(error)) from error
        output = options["output"]
        if output is not None and not output.resolve().parent.is_dir():
            raise CommandError(f"cannot write {output}: folder {output.resolve().parent} does not exist")
        try:
            dump_catalogue([derived.species], output if output is not None else self.stdout)
        except (CatalogueError, OSError) as error:
            raise CommandError(f"nothing written: {error}") from error
        species = derived.species
        abundance = f"{species.natural_abundance:.4g}" if species.natural_abundance is not None else "unknown"
        self.stderr.write(f"{species.name}: {species.route_note} Natural abundance {abundance}.")
        for note in derived.notes:
            self.stderr.write(f"note: {note}")
        if output is not None:
            self.stderr.write(f"wrote {species.name} to {output}")
