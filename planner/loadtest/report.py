"""The load test's figures: throughput, latency percentiles per kind, errors, and the verdict."""

from __future__ import annotations

import math
from collections import Counter
from dataclasses import dataclass, field

#: Targets from the issue text: no errors, and the 95th percentile of cached pages under 500 ms.
TARGET_P95_MS = 500.0


@dataclass(frozen=True)
class Outcome:
    kind: str
    status: int | None  # None when the request raised
    seconds: float
    problem: str = ""  # exception class and message when status is None

    @property
    def ok(self) -> bool:
        return self.status is not None and 200 <= self.status < 400


def percentile(values: list[float], p: float) -> float:
    """Nearest-rank percentile (the smallest value with at least p % of the values at or below it).

    Common practice, no source beyond the usual definition; empty input gives NaN.
    """
    if not values:
        return math.nan
    ordered = sorted(values)
    rank = max(1, math.ceil(p / 100.0 * len(ordered)))
    return ordered[rank - 1]


@dataclass
class Report:
    outcomes: list[Outcome]
    wall_s: float
    planned: int
    warmup_count: int = 0
    warmup_errors: list[Outcome] = field(default_factory=list)

    @property
    def errors(self) -> list[Outcome]:
        return [o for o in self.outcomes if not o.ok] + self.warmup_errors

    def error_counts(self) -> Counter:
        return Counter(str(o.status) if o.status is not None else o.problem.split(":")[0] for o in self.errors)

    def latencies_ms(self, kind: str | None = None) -> list[float]:
        return [1000.0 * o.seconds for o in self.outcomes if kind is None or o.kind == kind]

    def slow_kinds(self) -> list[str]:
        """Kinds whose p95 is at or above the target (every kind is cached after the warm-up)."""
        kinds = sorted({o.kind for o in self.outcomes})
        return [k for k in kinds if percentile(self.latencies_ms(k), 95) >= TARGET_P95_MS]

    @property
    def finished(self) -> bool:
        return len(self.outcomes) == self.planned

    @property
    def passed(self) -> bool:
        return not self.errors and not self.slow_kinds() and self.finished

    def lines(self) -> list[str]:
        sent = len(self.outcomes)
        throughput = sent / self.wall_s if self.wall_s > 0 else math.nan
        out = [
            f"requests: {sent} of {self.planned} planned (after {self.warmup_count} warm-up requests, not counted)",
            f"wall time: {self.wall_s:.2f} s",
            f"throughput: {throughput:.1f} requests/s",
            "",
            f"{'kind':<20}{'count':>7}{'p50 [ms]':>11}{'p95 [ms]':>11}{'max [ms]':>11}{'errors':>8}",
        ]
        kinds = sorted({o.kind for o in self.outcomes}, key=lambda k: -len(self.latencies_ms(k)))
        for kind in [*kinds, None]:
            values = self.latencies_ms(kind)
            errors = sum(1 for o in self.outcomes if (kind is None or o.kind == kind) and not o.ok)
            name = kind or "all"
            out.append(
                f"{name:<20}{len(values):>7}{percentile(values, 50):>11.1f}{percentile(values, 95):>11.1f}"
                f"{max(values, default=math.nan):>11.1f}{errors:>8}"
            )
        statuses = Counter(str(o.status) for o in self.outcomes if o.status is not None)
        out += ["", "statuses: " + (", ".join(f"{s} × {n}" for s, n in sorted(statuses.items())) or "none")]
        counts = self.error_counts()
        out.append("errors: " + (", ".join(f"{what} × {n}" for what, n in sorted(counts.items())) or "none"))
        for outcome in self.errors[:5]:
            out.append(f"  e.g. {outcome.kind}: {outcome.status or outcome.problem}")
        out.append(self.verdict())
        return out

    def verdict(self) -> str:
        reasons = []
        if self.errors:
            reasons.append(f"{len(self.errors)} errors (target: none)")
        slow = self.slow_kinds()
        if slow:
            reasons.append(f"p95 ≥ {TARGET_P95_MS:.0f} ms for {', '.join(slow)}")
        if not self.finished:
            reasons.append(f"only {len(self.outcomes)} of {self.planned} requests within the time limit")
        if not reasons:
            return f"PASS: no errors, p95 under {TARGET_P95_MS:.0f} ms for every kind of cached page"
        return "FAIL: " + "; ".join(reasons)
