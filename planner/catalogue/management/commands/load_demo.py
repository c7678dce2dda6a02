"""`manage.py load_demo`: the demo catalogue and a demo editor account, for trying Linecast out.

With --if-empty (what `make run` uses) it does nothing when the catalogue
already holds species, so a group's own data is never touched.
"""

from __future__ import annotations

import secrets

from django.contrib.auth import get_user_model
from django.core.management.base import BaseCommand
from django.db import transaction

from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.roles import give_role
from planner.catalogue.store import Stamp, import_species
from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue
from planner.planning.demo import load_demo_instruments

DEMO_USERNAME = "demo"


class Command(BaseCommand):
    help = (
        "Load the demo catalogue (planner/demo/catalogue.json) and instrument profiles, and create the demo editor, "
        "printing its password."
    )

    def add_arguments(self, parser):
        parser.add_argument(
            "--if-empty", action="store_true", help="do nothing when the catalogue already holds species"
        )

    def handle(self, *args, **options):
        if options["if_empty"] and SpeciesRow.objects.exists():
            self.stdout.write("catalogue already holds species: demo not loaded")
            return
        species = load_catalogue(DEMO_CATALOGUE_PATH)
        with transaction.atomic():
            summary = import_species(species, Stamp(None, "demo catalogue"))
            password = secrets.token_urlsafe(9)
            user, _ = get_user_model().objects.get_or_create(username=DEMO_USERNAME)
            user.set_password(password)
            user.save()
            give_role(user, "editor")
            instruments = load_demo_instruments()
        self.stdout.write(f"demo catalogue loaded: {summary}; instrument profiles added: {len(instruments)}")
        self.stdout.write(
            self.style.SUCCESS(f"demo editor account: user name {DEMO_USERNAME!r}, password {password!r}")
            + "\n(for trying Linecast out on this machine only; delete it before the group uses the server)"
        )
