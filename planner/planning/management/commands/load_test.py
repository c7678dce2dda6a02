"""`manage.py load_test`: a bounded load test of Linecast on this machine's loopback (the figures, not a test).

By default it starts its own production server (gunicorn, temporary SQLite
database with the demo catalogue, a viewer account and a saved plan), runs the
load and stops it again; with --url it loads a server that is already running,
logging in as --username with the password from $LINECAST_LOAD_TEST_PASSWORD.
Only loopback addresses are accepted.  Clients log in through the login form,
request every page once to warm the caches, then share a fixed, seeded mix of
--requests requests (catalogue list, species pages, spectrum page and CSV,
plan page, saved plan's targets CSV and JSON), stopping after --max-seconds at
the latest.  Prints throughput, p50/p95/max latency per kind, errors and a
PASS/FAIL line against the targets (no errors; p95 < 500 ms for cached pages);
exits non-zero when any request failed.

`--prepare` only creates the load-test account (viewer) and a saved plan in
the configured database: the default mode runs it against its temporary one.
"""

from __future__ import annotations

import os

from django.contrib.auth import get_user_model
from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.roles import give_role
from planner.loadtest.client import LoadTestError, loopback_address
from planner.loadtest.mix import PLAN_SPECIES, plan_form_data
from planner.loadtest.runner import LoadPlan, run_load
from planner.loadtest.server import LOAD_USERNAME, PASSWORD_VARIABLE, temporary_server
from planner.planning.compute import compute_plan
from planner.planning.forms import PlanForm
from planner.planning.models import SavedPlan

SAVED_PLAN_NAME = "load test"


class Command(BaseCommand):
    help = "Load-test Linecast on loopback: N logged-in clients, a fixed weighted mix of pages; prints the figures."

    def add_arguments(self, parser):
        parser.add_argument("--url", help="a running server on a loopback address, e.g. http://127.0.0.1:8000")
        parser.add_argument(
            "--username", default=LOAD_USERNAME, help=f"account to log in as (password: ${PASSWORD_VARIABLE})"
        )
        parser.add_argument("--clients", type=int, default=20, help="concurrent clients (default 20)")
        parser.add_argument("--requests", type=int, default=2000, help="measured requests in all (default 2000)")
        parser.add_argument(
            "--max-seconds",
            type=float,
            default=300.0,
            help="time limit of the warm-up and of the measured requests each (default 300)",
        )
        parser.add_argument("--seed", type=int, default=7, help="seed of the request mix (default 7)")
        parser.add_argument(
            "--workers", type=int, default=4, help="gunicorn workers of the temporary server (default 4)"
        )
        parser.add_argument(
            "--threads", type=int, default=1, help="threads per gunicorn worker (default 1: sync workers)"
        )
        parser.add_argument(
            "--prepare", action="store_true", help="only create the load-test account and a saved plan here"
        )

    def handle(self, *args, **options):
        if options["prepare"]:
            self._prepare(options["username"])
            return
        try:
            if options["url"]:
                host, port = loopback_address(options["url"])
                password = os.environ.get(PASSWORD_VARIABLE, "")
                if not password:
                    raise CommandError(f"--url needs the password of {options['username']!r} in ${PASSWORD_VARIABLE}")
                self._run(options, host, port, options["username"], password)
            else:
                with temporary_server(options["workers"], options["threads"], say=self.stderr.write) as server:
                    report = self._run(options, server.host, server.port, server.username, server.password, fail=False)
                    if report.errors:
                        self.stderr.write(f"last lines of the server's log:\n{server.log_tail()}")
                self._fail_on_errors(report)
        except (LoadTestError, ValueError) as error:
            raise CommandError(str(error)) from error

    def _run(self, options, host, port, username, password, fail=True):
        plan = LoadPlan(
            host,
            port,
            username,
            password,
            options["clients"],
            options["requests"],
            options["max_seconds"],
            options["seed"],
        )
        self.stdout.write(f"load test of http://{host}:{port}: {plan.clients} clients, {plan.requests} requests")
        report = run_load(plan, say=self.stderr.write)
        self.stdout.write("\n".join(report.lines()))
        if fail:
            self._fail_on_errors(report)
        return report

    @staticmethod
    def _fail_on_errors(report):
        if report.errors:
            raise CommandError(f"{len(report.errors)} requests failed")

    def _prepare(self, username: str) -> None:
        password = os.environ.get(PASSWORD_VARIABLE, "")
        if not password:
            raise CommandError(f"--prepare needs the account's password in ${PASSWORD_VARIABLE}")
        user, _ = get_user_model().objects.get_or_create(username=username)
        user.set_password(password)
        user.save()
        give_role(user, "viewer")
        species = list(SpeciesRow.objects.order_by("name").values_list("pk", "name", "natural_abundance"))
        form = PlanForm(plan_form_data([pk for pk, _, _ in species[:PLAN_SPECIES]]), species=species)
        if not form.is_valid():
            raise CommandError(f"the load test's plan is not valid here: {form.errors.as_text()}")
        document = compute_plan(form.inputs())
        SavedPlan.objects.create(
            name=SAVED_PLAN_NAME,
            created_by=user,
            inputs=document["inputs"],
            result={key: document[key] for key in ("result", "temperature_curve", "hazards", "computed_at")},
            catalogue_versions=document["catalogue_versions"],
        )
        self.stdout.write(f"load-test account {username!r} (viewer) and saved plan {SAVED_PLAN_NAME!r} ready")
