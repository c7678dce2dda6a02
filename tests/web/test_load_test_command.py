"""`manage.py load_test`: a short run against the live test server, and the refusals that keep it on loopback."""

from __future__ import annotations

import io
import re

import pytest
from django.core.management import CommandError, call_command

from planner.loadtest.client import LoadTestError, loopback_address
from planner.loadtest.mix import MIX_WEIGHTS, Targets, request_sequence
from planner.loadtest.report import percentile
from planner.loadtest.server import PASSWORD_VARIABLE
from tests.web.conftest import PASSWORD

#: Linear molecules and a symmetric top: quick to predict, so the warm-up stays short on a busy machine.
QUICK_SPECIES = ("CO", "OCS", "HCN", "CH3F")


@pytest.fixture
def load_target(transactional_db, live_server, make_member, demo_species, monkeypatch):
    """The live server with a few quick demo species, a viewer and a saved plan (made by the command's --prepare)."""
    from planner.catalogue.store import Stamp, import_species

    import_species([s for s in demo_species if s.name in QUICK_SPECIES], Stamp(None, "a few demo species"))
    monkeypatch.setenv(PASSWORD_VARIABLE, PASSWORD)
    call_command("load_test", "--prepare", "--username", "vera", stdout=io.StringIO())
    port = live_server.url.rsplit(":", 1)[1]
    return f"http://127.0.0.1:{port}"


def test_short_run_against_the_live_server_has_no_errors(load_target):
    out, err = io.StringIO(), io.StringIO()
    call_command(
        "load_test", "--url", load_target, "--username", "vera", "--clients", "3", "--requests", "40",
        "--max-seconds", "120", stdout=out, stderr=err,
    )  # fmt: skip
    report = out.getvalue()
    assert "requests: 40 of 40 planned" in report
    assert re.search(r"throughput: \d+\.\d requests/s", report)
    assert "errors: none" in report
    assert re.search(r"^all\s+40\s", report, re.MULTILINE)
    # Every kind of the mix was requested (40 draws of seven kinds, seed 7: checked by the mix test below).
    for kind in MIX_WEIGHTS:
        assert re.search(rf"^{kind}\s+\d+\s+\d+\.\d\s+\d+\.\d\s+\d+\.\d\s+0$", report, re.MULTILINE), kind
    assert re.search(r"^(PASS|FAIL): ", report, re.MULTILINE)
    assert "warm-up" in err.getvalue()


def test_wrong_password_stops_before_the_load(load_target, monkeypatch):
    monkeypatch.setenv(PASSWORD_VARIABLE, "not-the-password-9")
    with pytest.raises(CommandError, match="logging in as 'vera' failed"):
        call_command("load_test", "--url", load_target, "--username", "vera", "--clients", "1", "--requests", "1")


@pytest.mark.parametrize(
    "url",
    ["http://example.org:8000", "http://10.0.0.5:8000", "http://localhost:8000", "https://127.0.0.1:8000"],
)
def test_url_off_loopback_is_refused_before_any_request(url, monkeypatch):
    monkeypatch.setenv(PASSWORD_VARIABLE, "whatever-password")
    with pytest.raises(CommandError, match="--url"):
        call_command("load_test", "--url", url)


@pytest.mark.parametrize(
    "url, address", [("http://127.0.0.1:8000", ("127.0.0.1", 8000)), ("http://[::1]:81/", ("::1", 81))]
)
def test_loopback_urls_are_accepted(url, address):
    assert loopback_address(url) == address


def test_url_with_a_path_is_refused():
    with pytest.raises(LoadTestError, match="server's root"):
        loopback_address("http://127.0.0.1:8000/catalogue/")


def test_mix_is_fixed_by_the_seed_and_follows_the_weights():
    targets = Targets(species=[(1, "AB"), (2, "CD"), (3, "EF"), (4, "GH"), (5, "IJ")], saved_plans=[9])
    paths = targets.paths(seed=7)
    first = request_sequence(paths, 2000, seed=7)
    assert first == request_sequence(targets.paths(seed=7), 2000, seed=7)
    assert first != request_sequence(paths, 2000, seed=8)
    counts = {kind: sum(1 for k, _ in first if k == kind) for kind in MIX_WEIGHTS}
    # 2000 draws: each share within 3 percentage points of its weight (binomial σ ≤ 1.1 points).
    for kind, weight in MIX_WEIGHTS.items():
        assert abs(100 * counts[kind] / 2000 - weight) < 3, kind
    assert all(path in paths[kind] for kind, path in first)
    # The 40-request run of the live-server test draws every kind.
    assert {kind for kind, _ in request_sequence(paths, 40, seed=7)} == set(MIX_WEIGHTS)


def test_percentile_is_nearest_rank():
    # Nearest-rank definition (common practice, no source): p95 of 1..20 is the 19th value.
    values = [float(v) for v in range(20, 0, -1)]
    assert percentile(values, 95) == 19.0
    assert percentile(values, 50) == 10.0
    assert percentile(values, 100) == 20.0
    assert percentile([3.0], 95) == 3.0
