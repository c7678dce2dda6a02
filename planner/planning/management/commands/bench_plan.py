"""`manage.py bench_plan`: time a plan over the demo catalogue (the figures, not a test).

A 40 GHz window (80–120 GHz) at 300 K with every demo species that has a
dipole, default relative model, 60-minute slot.  Prints the first plan of
this process (everything cold), a plan after the prediction cache was cleared
(engine caches warm, as in a running server after a catalogue edit), a plan
when nothing changed (predictions cached), and the process's peak resident
memory.  Targets (issue text): ≤ 1 s cold, ≤ 150 ms when nothing changed,
< 300 MB resident.  The demo is imported inside a transaction that is rolled
back, so the database is left as it was.
"""

from __future__ import annotations

import resource
import statistics
import time

from django.core.cache import cache
from django.core.management.base import BaseCommand
from django.db import transaction

from planner.catalogue.store import Stamp, import_species
from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue
from planner.planning.compute import _compute_plan, compute_plan
from planner.planning.forms import instrument_inputs


class _RollBack(Exception):
    pass


def plan_inputs(species) -> dict:
    return {
        "instrument": None,
        "fmin_mhz": 80_000.0,
        "fmax_mhz": 120_000.0,
        "temperature_k": 300.0,
        "slot_s": 3600.0,
        "snr": 5.0,
        "k_sigma": 3.0,
        "margin_mhz": 0.0,
        "min_intensity_nm2mhz": 0.0,
        "max_eu_k": None,
        "species": [{"name": s.name, "amount": 1.0} for s in species if s.has_dipole],
    } | instrument_inputs(None)


def timed(function) -> float:
    start = time.perf_counter()
    function()
    return time.perf_counter() - start


class Command(BaseCommand):
    help = "Benchmark a plan over the demo catalogue: cold, cache cleared, nothing changed; peak memory."

    def add_arguments(self, parser):
        parser.add_argument("--repeats", type=int, default=7)

    def handle(self, *args, **options):
        species = load_catalogue(DEMO_CATALOGUE_PATH)
        inputs = plan_inputs(species)
        try:
            with transaction.atomic():
                import_species(species, Stamp(None, "benchmark"))
                cache.clear()
                first = timed(lambda: compute_plan(inputs))
                cleared = []
                for _ in range(options["repeats"]):
                    cache.clear()
                    cleared.append(timed(lambda: compute_plan(inputs)))
                unchanged = [timed(lambda: compute_plan(inputs)) for _ in range(options["repeats"])]
                # The plan itself recomputed from cached predictions (what a changed slot or SNR costs).
                recomputed = [timed(lambda: _compute_plan(inputs)) for _ in range(options["repeats"])]
                targets = len(compute_plan(inputs)["result"]["targets"])
                raise _RollBack
        except _RollBack:
            pass
        rss_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
        self.stdout.write(f"plan of {len(inputs['species'])} demo species, 80-120 GHz, 300 K: {targets} targets")
        self.stdout.write(f"first plan of the process    {first * 1e3:8.0f} ms   (everything cold; target <= 1000 ms)")
        self.stdout.write(
            f"prediction cache cleared     {statistics.median(cleared) * 1e3:8.0f} ms   median of {len(cleared)}"
        )
        self.stdout.write(
            f"predictions cached, replan   {statistics.median(recomputed) * 1e3:8.0f} ms   median of {len(recomputed)}"
            " (ranking, blends, MILP, curves)"
        )
        self.stdout.write(
            f"nothing changed              {statistics.median(unchanged) * 1e3:8.0f} ms   median of {len(unchanged)}"
            " (whole plan cached; target <= 150 ms)"
        )
        self.stdout.write(f"process peak RSS             {rss_mb:8.0f} MB   (target < 300 MB)")
