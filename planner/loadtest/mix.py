"""What the load test asks for: targets found on the server's own pages, drawn in a fixed weighted mix.

The same seed and catalogue give the same sequence of requests, so two runs
measure the same work.
"""

from __future__ import annotations

import html
import random
import re
from dataclasses import dataclass
from urllib.parse import urlencode

from django.urls import reverse

from planner.loadtest.client import Client, LoadTestError
from planner.spectra.forms import DEFAULT_FMAX_MHZ, DEFAULT_FMIN_MHZ, DEFAULT_TEMPERATURE_K

#: Kind of request -> weight in the mix [per cent] (common practice, no source: a group browsing the
#: catalogue and spectra more often than it plans or downloads).
MIX_WEIGHTS = {
    "catalogue list": 15,
    "species page": 25,
    "spectrum page": 20,
    "spectrum CSV": 10,
    "plan page": 15,
    "saved targets CSV": 8,
    "saved plan JSON": 7,
}
SPECTRUM_SPECIES = 4
PLAN_SPECIES = 3
DEFAULT_SEED = 7

_SPECIES_LINK = re.compile(r'<td class="name"><a href="/catalogue/(\d+)/">([^<]+)</a>')
_SAVED_LINK = re.compile(r'href="/planning/saved/(\d+)/"')


def plan_form_data(species_ids: list[int]) -> dict:
    """The plan form's fields for a 80–120 GHz, 300 K, one-hour plan of ``species_ids``, amount 1 each."""
    data = {"frequency_unit": "GHz", "fmin": 80, "fmax": 120, "temperature_k": 300, "slot_minutes": 60}
    data |= {"snr": 5, "k_sigma": 3, "margin_mhz": 0, "satellites": "include"}
    return data | {f"amount_{pk}": 1 for pk in species_ids}


@dataclass(frozen=True)
class Targets:
    species: list[tuple[int, str]]  # (id, name) as the catalogue list shows them
    saved_plans: list[int]

    def paths(self, seed: int = DEFAULT_SEED) -> dict[str, list[str]]:
        """Kind -> the distinct paths of that kind (a seeded choice of species for spectra and the plan)."""
        rng = random.Random(seed)
        names = [name for _, name in self.species]
        spectra = rng.sample(names, min(SPECTRUM_SPECIES, len(names)))
        planned = rng.sample([pk for pk, _ in self.species], min(PLAN_SPECIES, len(self.species)))

        def spectrum_query(name):
            window = {"fmin_mhz": DEFAULT_FMIN_MHZ, "fmax_mhz": DEFAULT_FMAX_MHZ}
            return urlencode({"species": name, "temperature_k": DEFAULT_TEMPERATURE_K, **window})

        return {
            "catalogue list": [reverse("catalogue:list")],
            "species page": [reverse("catalogue:species", args=[pk]) for pk, _ in self.species],
            "spectrum page": [f"{reverse('spectra:spectrum')}?{spectrum_query(name)}" for name in spectra],
            "spectrum CSV": [f"{reverse('spectra:spectrum_csv')}?{spectrum_query(name)}" for name in spectra],
            "plan page": [f"{reverse('planning:plan')}?{urlencode(plan_form_data(planned))}"],
            "saved targets CSV": [reverse("planning:targets_csv", args=[pk]) for pk in self.saved_plans],
            "saved plan JSON": [reverse("planning:plan_json", args=[pk]) for pk in self.saved_plans],
        }


def discover(client: Client) -> Targets:
    """Species and saved plans as a logged-in member sees them on the catalogue and saved-plans pages."""
    listing = client.get(reverse("catalogue:list"))
    saved = client.get(reverse("planning:saved_list"))
    if listing.status != 200 or saved.status != 200:
        raise LoadTestError(f"catalogue list answered {listing.status}, saved plans {saved.status}; expected 200")
    species = [(int(pk), html.unescape(name)) for pk, name in _SPECIES_LINK.findall(listing.body.decode())]
    plans = sorted({int(pk) for pk in _SAVED_LINK.findall(saved.body.decode())})
    if not species:
        raise LoadTestError("the catalogue list shows no species: load a catalogue first (manage.py load_demo)")
    if not plans:
        raise LoadTestError("no saved plan to export: save one first (the default mode of load_test does)")
    return Targets(species, plans)


def request_sequence(paths: dict[str, list[str]], total: int, seed: int = DEFAULT_SEED) -> list[tuple[str, str]]:
    """``total`` (kind, path) pairs drawn with MIX_WEIGHTS from ``paths``; the same seed gives the same list."""
    rng = random.Random(seed)
    kinds = list(MIX_WEIGHTS)
    drawn = rng.choices(kinds, weights=[MIX_WEIGHTS[kind] for kind in kinds], k=total)
    return [(kind, rng.choice(paths[kind])) for kind in drawn]
