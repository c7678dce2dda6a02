"""Predictions (and other engine results) of catalogue species through Django's cache, shared by every page.

A prediction is stored under the species' id and version and the request's
conditions, so an edit (which raises the version, see ``store.py``) makes the
next page ask the engine again, while the old entry simply expires.  The cache
is whatever ``CACHES`` names: this process's memory by default, a shared cache
server when ``LINECAST_CACHE_URL`` is set (``planner/envconfig.py``).
"""

from __future__ import annotations

import hashlib
from collections.abc import Callable
from typing import TypeVar

from django.core.cache import cache

from planner.engine import Prediction, PredictionRequest, Species, predict

T = TypeVar("T")

#: How long a cached prediction or plan is kept [s]; versions in the key make old entries unreachable anyway.
CACHE_SECONDS = 24 * 3600


def result_key(kind: str, species_id: int, version: int, conditions) -> str:
    """Cache key of one kind of engine result for one species version under ``conditions``."""
    # Conditions are frozen dataclasses or tuples of numbers: their repr names every value.
    return f"linecast-{kind}:" + hashlib.sha1(repr((species_id, version, conditions)).encode()).hexdigest()


def prediction_key(species_id: int, version: int, request: PredictionRequest) -> str:
    """Cache key of one species version under one request's conditions (window, temperature, floors, cap)."""
    return result_key("prediction", species_id, version, request)


def cached_result(row, kind: str, conditions, compute: Callable[[], T]) -> T:
    """``compute()``, cached under the catalogue row's id and version, ``kind`` and ``conditions``.

    ``row`` is the catalogue row (``planner.catalogue.models.Species``) the
    computation is about; exceptions it raises are not cached.
    """
    key = result_key(kind, row.pk, row.version, conditions)
    value = cache.get(key)
    if value is None:
        value = compute()
        cache.set(key, value, CACHE_SECONDS)
    return value


def cached_prediction(row, species: Species, request: PredictionRequest) -> Prediction:
    """predict(species, request), cached by the row's id and version and the request (engine refusals are not)."""
    return cached_result(row, "prediction", request, lambda: predict(species, request))
