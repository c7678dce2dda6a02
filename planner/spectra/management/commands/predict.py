"""`manage.py predict`: the page's prediction on the command line, as CSV or JSON.

Example::

    python manage.py predict --catalogue planner/demo/catalogue.json --species OCS \\
        --fmin 10000 --fmax 100000 --temperature 300 --format csv --output ocs.csv

Everything is computed before anything is written, and a file is written to a
temporary name and renamed, so an error never leaves half a file behind.
"""

from __future__ import annotations

import io
import json
import os
import tempfile
from pathlib import Path

from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.store import export_species
from planner.catalogue_file import CatalogueError, load_catalogue
from planner.engine import PredictionRequest, predict_many
from planner.spectra.exports import prediction_csv, prediction_json

FORMATS = ("csv", "json")


class Command(BaseCommand):
    help = "Predict the rotational lines of catalogue species in a frequency window and write them as CSV or JSON."

    def add_arguments(self, parser):
        parser.add_argument(
            "--catalogue",
            type=Path,
            default=None,
            help="catalogue JSON file (default: the catalogue in the database)",
        )
        parser.add_argument(
            "--species",
            nargs="+",
            action="extend",
            default=None,
            metavar="NAME",
            help="species names to predict (default: every species in the catalogue)",
        )
        parser.add_argument("--fmin", "--fmin-mhz", dest="fmin_mhz", type=float, required=True, metavar="MHZ")
        parser.add_argument("--fmax", "--fmax-mhz", dest="fmax_mhz", type=float, required=True, metavar="MHZ")
        parser.add_argument(
            "--temperature", "--temperature-k", dest="temperature_k", type=float, required=True, metavar="K"
        )
        parser.add_argument(
            "--min-intensity",
            "--min-intensity-nm2mhz",
            dest="min_intensity_nm2mhz",
            type=float,
            default=0.0,
            metavar="NM2MHZ",
            help="drop lines weaker than this integrated intensity [nm² MHz] (default 0: engine's relative floor only)",
        )
        parser.add_argument("--format", choices=FORMATS, default="csv", help="output format (default csv)")
        parser.add_argument("--output", type=Path, default=None, metavar="PATH", help="file to write (default stdout)")

    def handle(self, *args, **options):
        species_list = self._species(options["catalogue"], options["species"])
        try:
            request = PredictionRequest(
                fmin_mhz=options["fmin_mhz"],
                fmax_mhz=options["fmax_mhz"],
                temperature_k=options["temperature_k"],
                min_intensity_nm2mhz=options["min_intensity_nm2mhz"],
            )
            prediction = predict_many(species_list, request)
        except ValueError as error:  # a bad request, or EngineLimitError
            raise CommandError(f"cannot predict: {error}") from error

        text = io.StringIO()
        if options["format"] == "csv":
            prediction_csv(prediction, text)
        else:
            json.dump(prediction_json(prediction, request), text, indent=1, allow_nan=False)
            text.write("\n")
        for message in prediction.messages:
            self.stderr.write(message)

        if options["output"] is None:
            self.stdout.write(text.getvalue(), ending="")
        else:
            write_atomically(options["output"], text.getvalue())
            self.stderr.write(f"wrote {len(prediction.lines)} lines to {options['output']}")

    def _species(self, catalogue: Path | None, names: list[str] | None):
        if catalogue is None:
            catalogue = "the database catalogue"
            species_list = export_species()
        else:
            try:
                species_list = load_catalogue(catalogue)
            except CatalogueError as error:  # missing and unreadable files included
                raise CommandError(f"catalogue {catalogue} has problems:\n{error}") from error
        if not names:
            return species_list
        by_name = {species.name: species for species in species_list}
        unknown = [name for name in names if name not in by_name]
        if unknown:
            raise CommandError(
                f"unknown species {', '.join(repr(n) for n in unknown)} in {catalogue}; "
                f"it has: {', '.join(sorted(by_name))}"
            )
        return [by_name[name] for name in dict.fromkeys(names)]


def write_atomically(path: Path, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename."""
    folder = path.resolve().parent
    if not folder.is_dir():
        raise CommandError(f"cannot write {path}: folder {folder} does not exist")
    handle, temporary = tempfile.mkstemp(dir=folder, prefix=f".{path.name}.", suffix=".part")
    try:
        with os.fdopen(handle, "w", encoding="utf-8", newline="") as file:
            file.write(text)
        # mkstemp makes the file private; give it the permissions a plain open() would.
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(temporary, 0o666 & ~umask)
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise
