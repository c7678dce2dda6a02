"""`manage.py plan`: a slot plan on the command line, as the targets CSV or the whole plan JSON.

    python manage.py plan --catalogue planner/demo/catalogue.json --fmin 80000 --fmax 120000 \\
        --temperature 300 --slot-minutes 60 --species OCS SO2 --format json --output plan.json

Without --catalogue the species come from the database catalogue.  Without an
instrument it uses the default relative model (planner.engine.measurement.
DEFAULT_RELATIVE_MODEL) with equal abundances of 1 for every species.
Everything is computed before anything is written.
"""

from __future__ import annotations

import io
from pathlib import Path

from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.store import export_species
from planner.catalogue_file import CatalogueError, load_catalogue
from planner.planning.compute import build_plan, default_model_inputs
from planner.planning.exports import plan_json, targets_csv
from planner.planning.forms import DEFAULT_SETTINGS, instrument_inputs
from planner.planning.models import Instrument
from planner.spectra.management.commands.predict import write_atomically


class Command(BaseCommand):
    help = "Plan a measurement slot: ranked targets and a scan plan that fits the slot (CSV of targets, or JSON)."

    def add_arguments(self, parser):
        parser.add_argument("--catalogue", type=Path, default=None, help="catalogue JSON file (default: the database)")
        parser.add_argument("--fmin", dest="fmin_mhz", type=float, required=True, metavar="MHZ")
        parser.add_argument("--fmax", dest="fmax_mhz", type=float, required=True, metavar="MHZ")
        parser.add_argument("--temperature", dest="temperature_k", type=float, required=True, metavar="K")
        parser.add_argument("--slot-minutes", type=float, required=True, metavar="N")
        parser.add_argument("--species", nargs="+", action="extend", default=None, metavar="NAME")
        parser.add_argument("--snr", type=float, default=5.0, help="required signal-to-noise ratio (default 5)")
        parser.add_argument("--k-sigma", type=float, default=3.0, help="scan margin in σ of each line (default 3)")
        parser.add_argument("--instrument", default=None, help="name of an instrument profile in the database")
        parser.add_argument("--format", choices=("csv", "json"), default="csv")
        parser.add_argument("--output", type=Path, default=None, metavar="PATH", help="file to write (default stdout)")

    def handle(self, *args, **options):
        available, species = self._species(options["catalogue"], options["species"])
        settings, model_inputs = self._instrument(options["instrument"])
        inputs = {
            "instrument": options["instrument"],
            "fmin_mhz": options["fmin_mhz"],
            "fmax_mhz": options["fmax_mhz"],
            "temperature_k": options["temperature_k"],
            "slot_s": options["slot_minutes"] * 60.0,
            "snr": options["snr"],
            "k_sigma": options["k_sigma"],
            "margin_mhz": 0.0,
            "min_intensity_nm2mhz": 0.0,
            "max_eu_k": None,
            **settings,
            "model": model_inputs,
            "species": [{"name": s.name, "amount": 1.0} for s in species],
        }
        try:
            document = {
                "inputs": inputs,
                **build_plan(inputs, {s.name: s for s in available}),
                "catalogue_versions": {},
            }
        except ValueError as error:
            raise CommandError(f"cannot plan: {error}") from error
        result = document["result"]
        if options["format"] == "csv":
            buffer = io.StringIO()
            targets_csv(document, buffer)
            text = buffer.getvalue()
        else:
            text = plan_json(document)
        for message in result.get("messages", []):
            self.stderr.write(message)
        if options["output"] is None:
            self.stdout.write(text, ending="")
        else:
            write_atomically(options["output"], text)
            totals = result["totals"]
            self.stderr.write(
                f"wrote {len(result['targets'])} targets, {totals['segment_count']} segments to {options['output']}"
            )

    def _species(self, catalogue, names):
        try:
            available = load_catalogue(catalogue) if catalogue else export_species()
        except CatalogueError as error:
            raise CommandError(f"catalogue {catalogue} has problems:\n{error}") from error
        by_name = {s.name: s for s in available}
        if not names:
            return available, [s for s in available if s.has_dipole]
        unknown = [n for n in names if n not in by_name]
        if unknown:
            raise CommandError(f"unknown species {', '.join(map(repr, unknown))}; known: {', '.join(sorted(by_name))}")
        return available, [by_name[n] for n in dict.fromkeys(names)]

    def _instrument(self, name):
        if name is None:
            return dict(DEFAULT_SETTINGS), default_model_inputs()
        instrument = Instrument.objects.filter(name=name).first()
        if instrument is None:
            raise CommandError(f"no instrument profile {name!r}")
        inputs = instrument_inputs(instrument)
        model = inputs.pop("model")
        return inputs, model
