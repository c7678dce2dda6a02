"""Run the load: log every client in, warm every page up, then the measured requests, bounded by count and time."""

from __future__ import annotations

import threading
import time
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass

from planner.loadtest.client import Client
from planner.loadtest.mix import DEFAULT_SEED, discover, request_sequence
from planner.loadtest.report import Outcome, Report


@dataclass(frozen=True)
class LoadPlan:
    host: str
    port: int
    username: str
    password: str
    clients: int = 20
    requests: int = 2000
    max_seconds: float = 300.0  # for the warm-up and again for the measured requests
    seed: int = DEFAULT_SEED

    def __post_init__(self):
        if self.clients < 1 or self.requests < 1 or self.max_seconds <= 0:
            raise ValueError("clients and requests must be at least 1, max_seconds above 0")


def _fetch(client: Client, kind: str, path: str) -> Outcome:
    start = time.perf_counter()
    try:
        response = client.get(path)
    except (OSError, ValueError) as error:  # refused, reset, timed out, or a malformed answer
        client.close()
        return Outcome(kind, None, time.perf_counter() - start, f"{type(error).__name__}: {error}")
    return Outcome(kind, response.status, response.seconds)


class _Queue:
    """The shared, fixed sequence of requests: each item is handed out once, until it is used up or time is up."""

    def __init__(self, items, deadline: float):
        self._items, self._deadline = items, deadline
        self._next = 0
        self._lock = threading.Lock()

    def take(self):
        with self._lock:
            if self._next >= len(self._items) or time.monotonic() > self._deadline:
                return None
            item = self._items[self._next]
            self._next += 1
            return item


def run_load(plan: LoadPlan, say=print) -> Report:
    """Measure ``plan.requests`` requests from ``plan.clients`` logged-in clients; every connection is closed after."""
    first = Client(plan.host, plan.port)
    try:
        first.log_in(plan.username, plan.password)
        paths = discover(first).paths(plan.seed)
    finally:
        first.close()
    distinct = [(kind, path) for kind, kind_paths in paths.items() for path in kind_paths]
    say(f"{len(distinct)} distinct pages and downloads; logging in {plan.clients} clients and warming up")
    clients = [Client(plan.host, plan.port) for _ in range(plan.clients)]
    try:
        with ThreadPoolExecutor(max_workers=plan.clients) as pool:
            list(pool.map(lambda client: client.log_in(plan.username, plan.password), clients))  # raises a failure
            # Every client asks for every distinct page once (rotated, so they do not all start on the
            # same one): each server process it is connected to then holds them in its cache.
            warm_deadline = time.monotonic() + plan.max_seconds

            def warm(index):
                rotated = distinct[index % len(distinct) :] + distinct[: index % len(distinct)]
                return [
                    _fetch(clients[index], kind, path) for kind, path in rotated if time.monotonic() < warm_deadline
                ]

            warmed = [outcome for outcomes in pool.map(warm, range(plan.clients)) for outcome in outcomes]
            say(f"warm-up: {len(warmed)} requests, {sum(not o.ok for o in warmed)} errors; measuring")
            queue = _Queue(request_sequence(paths, plan.requests, plan.seed), time.monotonic() + plan.max_seconds)

            def work(client):
                outcomes = []
                while (item := queue.take()) is not None:
                    outcomes.append(_fetch(client, *item))
                return outcomes

            start = time.perf_counter()
            measured = [outcome for outcomes in pool.map(work, clients) for outcome in outcomes]
            wall = time.perf_counter() - start
    finally:
        for client in clients:
            client.close()
    return Report(measured, wall, plan.requests, len(warmed), [o for o in warmed if not o.ok])
