"""LINECAST_CACHE_URL: the strict reader (no server needed) and one round trip through a real redis-server."""

from __future__ import annotations

import shutil
import socket
import subprocess
import time

import pytest
import redis
from django.core.cache import caches
from django.core.cache.backends.redis import RedisCache
from django.core.exceptions import ImproperlyConfigured
from django.test import override_settings

from planner.catalogue import predictions
from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.predictions import cached_prediction
from planner.engine import PredictionRequest, predict
from planner.envconfig import LOCAL_MEMORY_CACHE, cache_settings
from planner.planning.compute import compute_plan
from planner.planning.forms import PlanForm

REDIS_SERVER = "/usr/bin/redis-server"


def test_unset_or_blank_means_this_process_memory():
    assert cache_settings({}) == {"default": LOCAL_MEMORY_CACHE}
    assert cache_settings({"LINECAST_CACHE_URL": "  "})["default"]["BACKEND"].endswith("LocMemCache")


@pytest.mark.parametrize(
    "url",
    ["redis://127.0.0.1:6379/0", "redis://cache.example:6380", "rediss://:s3cret@cache.example:6380/2", "redis://h"],
)
def test_redis_urls_go_to_django_redis_cache_unchanged(url):
    default = cache_settings({"LINECAST_CACHE_URL": url})["default"]
    assert default["BACKEND"] == "django.core.cache.backends.redis.RedisCache"
    assert default["LOCATION"] == url
    assert default["KEY_PREFIX"] == "linecast"


@pytest.mark.parametrize(
    "url, message",
    [
        ("memcached://127.0.0.1:11211", "unknown scheme 'memcached'"),
        ("127.0.0.1:6379", "unknown scheme ''"),
        ("http://127.0.0.1:6379", "unknown scheme 'http'"),
        ("redis://127.0.0.1:port/0", "port that is not a number"),
        ("redis://127.0.0.1:99999/0", "port that is not a number"),
        ("redis:///0", "names no host"),
        ("redis://127.0.0.1:6379/cache", "database after the host must be a number"),
    ],
)
def test_bad_urls_are_refused_naming_the_variable(url, message):
    with pytest.raises(ImproperlyConfigured, match="LINECAST_CACHE_URL=") as error:
        cache_settings({"LINECAST_CACHE_URL": url})
    assert message in str(error.value)


def test_refusal_does_not_print_the_password():
    with pytest.raises(ImproperlyConfigured) as error:
        cache_settings({"LINECAST_CACHE_URL": "redis://:hunter2-secret@127.0.0.1:6379/x"})
    assert "hunter2-secret" not in str(error.value)
    assert ":***@" in str(error.value)


def _free_port() -> int:
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


@pytest.fixture
def redis_url(tmp_path):
    """A redis-server of this test only, on a free loopback port, without persistence; stopped afterwards."""
    if not shutil.which(REDIS_SERVER):
        pytest.skip(f"{REDIS_SERVER} is not installed (Debian package redis-server)")
    port = _free_port()
    command = [REDIS_SERVER, "--port", str(port), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no"]
    server = subprocess.Popen([*command, "--dir", str(tmp_path)], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        deadline = time.monotonic() + 10
        while True:
            try:
                with socket.create_connection(("127.0.0.1", port), timeout=0.5) as connection:
                    connection.sendall(b"PING\r\n")
                    if connection.recv(16).startswith(b"+PONG"):
                        break
            except OSError:
                pass
            if time.monotonic() > deadline or server.poll() is not None:
                pytest.fail(f"redis-server did not answer on 127.0.0.1:{port}")
            time.sleep(0.05)
        yield f"redis://127.0.0.1:{port}/0"
    finally:
        server.terminate()
        server.wait(timeout=10)


def _plan_inputs() -> dict:
    """Inputs of a small plan of OCS, built by the plan page's own form."""
    species = list(SpeciesRow.objects.values_list("pk", "name", "natural_abundance"))
    ocs = next(pk for pk, name, _ in species if name == "OCS")
    # A narrow, cold window keeps the test quick (common practice, no source).
    data = {"frequency_unit": "GHz", "fmin": 80, "fmax": 90, "temperature_k": 50, "slot_minutes": 30}
    data |= {"snr": 5, "k_sigma": 3, "margin_mhz": 0, f"amount_{ocs}": 1}
    form = PlanForm(data, species=species)
    assert form.is_valid(), form.errors
    return form.inputs()


def test_predictions_and_plans_round_trip_through_redis(redis_url, demo_in_db, monkeypatch):
    calls = []

    def counting_predict(species, request):
        calls.append(species.name)
        return predict(species, request)

    monkeypatch.setattr(predictions, "predict", counting_predict)
    with override_settings(CACHES=cache_settings({"LINECAST_CACHE_URL": redis_url})):
        assert isinstance(caches["default"], RedisCache)
        row = SpeciesRow.objects.get(name="OCS")
        request = PredictionRequest(0.0, 120_000.0, 50.0)
        first = cached_prediction(row, species_of_row(row), request)
        again = cached_prediction(row, species_of_row(row), request)
        assert calls == ["OCS"]
        assert again.records() == first.records() and again is not first  # unpickled from the server

        inputs = _plan_inputs()
        document = compute_plan(inputs)
        predicted = len(calls)
        assert compute_plan(inputs) == document
        assert len(calls) == predicted  # the whole plan came back from redis

        # The entries are in the server itself, not in this process's memory.
        keys = redis.Redis.from_url(redis_url).keys("linecast:*")
        assert any(b"linecast-prediction:" in key for key in keys)
        assert any(b"linecast-plan:" in key for key in keys)
