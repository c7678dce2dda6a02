"""`manage.py fit`: fit a species' constants to assigned lines and write the refined catalogue.

    python manage.py fit --catalogue planner/demo/catalogue.json --species CO \\
        --lines co-lines.csv --vary B,D --output co-fitted.json

Prints the report (fitted values with σ, correlations, obs − calc with
outliers and blends flagged, weighted RMS, reduced χ², condition; for a
diatomic the bond length r0 from B).  The output catalogue holds every species
of the input with this one's fitted values, σ and covariance
(``constants_mhz`` and ``covariance_mhz2``).  Nothing is written when the
fit fails.
"""

from __future__ import annotations

from pathlib import Path

from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.command_input import species_from_file
from planner.catalogue_file import CatalogueError, dump_catalogue
from planner.engine.fitting import fit_constants
from planner.fitting.lines_file import LinesFileError, read_lines
from planner.fitting.report import structure


class Command(BaseCommand):
    help = "Fit constants of one species to assigned lines (CSV); print the report and write the fitted catalogue."

    def add_arguments(self, parser):
        parser.add_argument("--catalogue", type=Path, required=True, metavar="FILE.json")
        parser.add_argument("--species", required=True, metavar="NAME")
        parser.add_argument("--lines", type=Path, required=True, metavar="LINES.csv")
        parser.add_argument("--vary", required=True, metavar="A,B,C,...", help="constants to fit, comma-separated")
        parser.add_argument("--output", type=Path, default=None, metavar="FITTED.json")

    def handle(self, *args, **options):
        catalogue, species = species_from_file(options["catalogue"], options["species"])
        try:
            lines = read_lines(options["lines"].read_text(encoding="utf-8"))
        except OSError as error:
            raise CommandError(f"cannot read {options['lines']}: {error.strerror}") from error
        except LinesFileError as error:
            raise CommandError(f"{options['lines']} has problems:\n{error}") from error
        vary = [name.strip() for name in options["vary"].split(",") if name.strip()]
        try:
            result = fit_constants(species, lines, vary)
        except (ValueError, RuntimeError) as error:
            raise CommandError(f"cannot fit: {error}") from error
        self.stdout.write(report(result, species))
        if options["output"] is not None:
            fitted = result.fitted_species()
            try:
                dump_catalogue([fitted if s.name == species.name else s for s in catalogue], options["output"])
            except (CatalogueError, OSError) as error:
                raise CommandError(f"cannot write {options['output']}: {error}") from error
            self.stderr.write(f"wrote the fitted catalogue to {options['output']}")


def report(result, species) -> str:
    """The fit report as text."""
    out = [f"Fit of {species.name} ({result.state}) to {len(result.residuals)} lines"]
    out.append("")
    out.append(f"{'constant':10s} {'value ± 1σ [MHz]':>26s}")
    for name in result.names:
        out.append(f"{name:10s} {result.formatted(name):>26s}")
    if len(result.names) > 1:
        out.append("")
        out.append("correlation  " + " ".join(f"{n:>8s}" for n in result.names))
        for name, row in zip(result.names, result.correlation):
            out.append(f"{name:12s} " + " ".join(f"{x:8.4f}" for x in row))
    out.append("")
    out.append(f"{'line':32s} {'obs [MHz]':>16s} {'calc [MHz]':>16s} {'o−c [MHz]':>11s} {'(o−c)/σ':>8s}")
    for r in result.residuals:
        line = r.line
        label = f"{_level(line.j_up, line.ka_up, line.kc_up)} ← {_level(line.j_lo, line.ka_lo, line.kc_lo)}"
        flags = (" OUTLIER" if r.outlier else "") + (
            f" blend with line {', '.join(str(i + 1) for i in r.blended_with)}" if r.blended_with else ""
        )
        out.append(
            f"{r.index + 1:3d} {label:28s} {r.observed_mhz:16.4f} {r.calculated_mhz:16.4f} "
            f"{r.residual_mhz:11.4f} {r.normalised:8.2f}{flags}"
        )
    out.append("")
    out.append(
        f"weighted RMS {result.weighted_rms:.4g}, reduced χ² {result.reduced_chi2:.4g} "
        f"({result.degrees_of_freedom} degrees of freedom), condition number {result.condition_number:.3g}"
    )
    for name, value in structure(result, species):  # the same rows as the fit page
        shown = "bond length r0" if name.startswith("r0 ") else name
        out.append(f"{shown} = {value}")
    return "\n".join(out) + "\n"


def _level(j, ka, kc) -> str:
    return " ".join(str(n) for n in (j, ka, kc) if n is not None)
