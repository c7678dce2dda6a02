"""Scan plan: search intervals, settings of the instrument, and the choice of what fits a slot.

Each target line needs the frequencies where it may lie (its predicted
frequency ± k σ, widened by its half width and a fixed margin).  Overlapping
intervals merge; the merged intervals are clipped to the window and cut into
settings no wider than the instantaneous bandwidth.  A setting costs its dwell
plus a fixed retuning overhead; its value depends on which of its lines reach
the wanted signal-to-noise ratio in that dwell.  Choosing one dwell per
setting to maximise value within the slot is a multiple-choice knapsack,
solved exactly as a mixed-integer linear programme.

References
----------
[1] H. Kellerer, U. Pferschy and D. Pisinger, *Knapsack Problems*, Springer 2004,
    Ch. 11 (the multiple-choice knapsack problem).
[2] Q. Huangfu and J. A. J. Hall, "Parallelizing the dual revised simplex
    method", Math. Prog. Comp. 10, 119 (2018) (HiGHS, behind scipy.optimize.milp).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import NamedTuple, Sequence

import numpy as np
from scipy.optimize import Bounds, LinearConstraint, milp

__all__ = [
    "Segment",
    "DwellOption",
    "Choice",
    "search_intervals",
    "merge_intervals",
    "clip_and_split",
    "build_segments",
    "choose_segments",
    "greedy_choice",
    "order_for_retuning",
]

#: Slack on the time constraint [s]: the MILP works in floating point.
TIME_TOLERANCE_S = 1e-6


@dataclass(frozen=True)
class Segment:
    """One instrument setting: a frequency range [MHz] and the targets whose centre lies in it."""

    start_mhz: float
    stop_mhz: float
    target_indices: tuple[int, ...]


class DwellOption(NamedTuple):
    """One way to spend time on a segment: ``dwell_s`` [s], its ``value`` and the targets it detects."""

    dwell_s: float
    value: float
    detected: tuple[int, ...]


@dataclass(frozen=True)
class Choice:
    """Result of the optimiser.

    ``option_index[j]`` is the chosen option of segment j, or None; ``value``
    the total value; ``time_s`` the dwell plus overhead used [s]; ``optimal``
    is False only when the solver stopped at its time limit with a feasible
    but unproven plan.
    """

    option_index: tuple[int | None, ...]
    value: float
    time_s: float
    optimal: bool = True


def search_intervals(
    frequency_mhz, sigma_mhz, halfwidth_mhz, k_sigma, margin_mhz, spread_low_mhz=0.0, spread_high_mhz=0.0
):
    """Where each line may lie: [ν + low − r, ν + high + r] with r = k σ + half width + margin [MHz].

    ``frequency_mhz``, ``sigma_mhz``, ``halfwidth_mhz`` [MHz] are arrays of
    equal length; ``k_sigma`` >= 0 [dimensionless]; ``margin_mhz`` >= 0 [MHz];
    ``spread_low_mhz`` <= 0 <= ``spread_high_mhz`` (scalars or arrays) [MHz]
    are the offsets of the outermost hyperfine components, 0 for an unsplit line.
    Returns the arrays (lo, hi) [MHz].
    """
    if not math.isfinite(k_sigma) or k_sigma < 0:
        raise ValueError(f"k_sigma must be a finite number >= 0, got {k_sigma!r}")
    if not math.isfinite(margin_mhz) or margin_mhz < 0:
        raise ValueError(f"margin_mhz must be a finite number >= 0 MHz, got {margin_mhz!r}")
    frequency = np.asarray(frequency_mhz, dtype=float)
    reach = k_sigma * np.asarray(sigma_mhz, dtype=float) + np.asarray(halfwidth_mhz, dtype=float) + margin_mhz
    low = np.minimum(np.asarray(spread_low_mhz, dtype=float), 0.0)
    high = np.maximum(np.asarray(spread_high_mhz, dtype=float), 0.0)
    return frequency + low - reach, frequency + high + reach


def merge_intervals(lo, hi) -> list[tuple[float, float]]:
    """Union of intervals [lo, hi] [MHz], sorted; overlapping or touching intervals merge."""
    lo = np.asarray(lo, dtype=float)
    hi = np.asarray(hi, dtype=float)
    if lo.shape != hi.shape:
        raise ValueError(f"lo and hi must have the same length, got {lo.shape} and {hi.shape}")
    if np.any(hi < lo):
        raise ValueError("every interval needs hi >= lo")
    merged: list[tuple[float, float]] = []
    for index in np.argsort(lo, kind="stable"):
        start, stop = float(lo[index]), float(hi[index])
        if merged and start <= merged[-1][1]:
            merged[-1] = (merged[-1][0], max(merged[-1][1], stop))
        else:
            merged.append((start, stop))
    return merged


def clip_and_split(intervals, fmin_mhz, fmax_mhz, setting_width_mhz) -> list[tuple[float, float]]:
    """Intervals [MHz] clipped to the window, each cut into equal pieces no wider than one setting.

    An interval of width w becomes ⌈w / setting width⌉ pieces of equal width;
    intervals entirely outside [fmin_mhz, fmax_mhz] are dropped.
    """
    if not setting_width_mhz > 0:
        raise ValueError(f"setting_width_mhz must be > 0 MHz, got {setting_width_mhz!r}")
    pieces: list[tuple[float, float]] = []
    for start, stop in intervals:
        start, stop = max(float(start), fmin_mhz), min(float(stop), fmax_mhz)
        if stop < start:
            continue
        # The small relative slack keeps an interval of exactly n widths from becoming n + 1 pieces.
        count = max(1, math.ceil((stop - start) / setting_width_mhz * (1 - 1e-12)))
        edges = np.linspace(start, stop, count + 1)
        pieces.extend((float(a), float(b)) for a, b in zip(edges[:-1], edges[1:]))
    return pieces


def build_segments(frequency_mhz, lo, hi, fmin_mhz, fmax_mhz, setting_width_mhz) -> list[Segment]:
    """Settings covering the search intervals, each holding the targets whose centre lies in it.

    A centre on the boundary of two pieces belongs to the upper piece; pieces
    that hold no centre are dropped (they carry no value).
    """
    frequency = np.asarray(frequency_mhz, dtype=float)
    pieces = clip_and_split(merge_intervals(lo, hi), fmin_mhz, fmax_mhz, setting_width_mhz)
    if not pieces:
        return []
    starts = np.array([p[0] for p in pieces])
    stops = np.array([p[1] for p in pieces])
    owner = np.searchsorted(starts, frequency, side="right") - 1
    inside = (owner >= 0) & (frequency <= stops[np.clip(owner, 0, None)])
    segments = []
    for index, (start, stop) in enumerate(pieces):
        members = tuple(int(i) for i in np.nonzero(inside & (owner == index))[0])
        if members:
            segments.append(Segment(start, stop, members))
    return segments


def _costs_and_values(dwell_options, overhead_s):
    rows = []
    for segment, options in enumerate(dwell_options):
        for option, (dwell, value, _detected) in enumerate(options):
            if not (math.isfinite(dwell) and dwell >= 0):
                raise ValueError(f"segment {segment} option {option}: dwell_s must be >= 0 s, got {dwell!r}")
            if not math.isfinite(value):
                raise ValueError(f"segment {segment} option {option}: value must be finite, got {value!r}")
            rows.append((segment, option, dwell + overhead_s, float(value)))
    return rows


def choose_segments(
    dwell_options: Sequence[Sequence[DwellOption]],
    overhead_s: float,
    slot_s: float,
    *,
    time_limit_s: float = 10.0,
    mip_rel_gap: float = 0.0,
) -> Choice:
    """Best option (or none) per segment: maximum total value within the slot.

    Parameters
    ----------
    dwell_options : per segment, its options (dwell_s [s], value, detected indices).
    overhead_s : retuning overhead paid once per chosen segment [s], >= 0.
    slot_s : time available [s], > 0.
    time_limit_s : solver time limit [s]; past it the best plan found is
        returned with ``optimal=False``.
    mip_rel_gap : relative optimality gap at which the solver may stop
        (0 = prove the optimum).

    Notes
    -----
    Binary x_jl = 1 when option l of segment j is chosen.  Maximise
    Σ v_jl x_jl subject to Σ_l x_jl <= 1 for each j and
    Σ (d_jl + overhead) x_jl <= slot: the multiple-choice knapsack of [1],
    solved by branch and bound in HiGHS [2] through scipy.optimize.milp.
    Raises RuntimeError when the solver fails.
    """
    if not math.isfinite(overhead_s) or overhead_s < 0:
        raise ValueError(f"overhead_s must be a finite number >= 0 s, got {overhead_s!r}")
    if not math.isfinite(slot_s) or slot_s <= 0:
        raise ValueError(f"slot_s must be a finite number > 0 s, got {slot_s!r}")
    chosen: list[int | None] = [None] * len(dwell_options)
    # Options that cannot fit alone, or are worth nothing, never enter an optimum.
    rows = [r for r in _costs_and_values(dwell_options, overhead_s) if r[2] <= slot_s + TIME_TOLERANCE_S and r[3] > 0]
    if not rows:
        return Choice(tuple(chosen), 0.0, 0.0)
    segment_of = np.array([r[0] for r in rows])
    cost = np.array([r[2] for r in rows])
    value = np.array([r[3] for r in rows])
    segments = np.unique(segment_of)
    one_per_segment = (segment_of[None, :] == segments[:, None]).astype(float)
    constraints = [
        LinearConstraint(one_per_segment, -np.inf, 1.0),
        LinearConstraint(cost[None, :], -np.inf, slot_s + TIME_TOLERANCE_S),
    ]
    result = milp(
        -value,
        integrality=np.ones(len(rows)),
        bounds=Bounds(0.0, 1.0),
        constraints=constraints,
        options={"time_limit": time_limit_s, "mip_rel_gap": mip_rel_gap},
    )
    if result.x is None or result.status not in (0, 1):
        raise RuntimeError(f"the segment optimiser failed: {result.message}")
    picked = np.nonzero(result.x > 0.5)[0]
    for index in picked:
        chosen[rows[index][0]] = rows[index][1]
    return Choice(tuple(chosen), float(value[picked].sum()), float(cost[picked].sum()), optimal=result.status == 0)


def greedy_choice(dwell_options: Sequence[Sequence[DwellOption]], overhead_s: float, slot_s: float) -> Choice:
    """Baseline heuristic: take options in order of value per second while they fit, one per segment.

    Not used for plans; the tests use it to show that the optimiser can do better.
    """
    rows = [r for r in _costs_and_values(dwell_options, overhead_s) if r[3] > 0]
    rows.sort(key=lambda r: -r[3] / r[2] if r[2] > 0 else -math.inf)
    chosen: list[int | None] = [None] * len(dwell_options)
    used = total = 0.0
    for segment, option, cost, value in rows:
        if chosen[segment] is None and used + cost <= slot_s + TIME_TOLERANCE_S:
            chosen[segment] = option
            used += cost
            total += value
    return Choice(tuple(chosen), total, used)


def order_for_retuning(segments: Sequence[Segment]) -> list[int]:
    """Indices of ``segments`` in the order to observe them: ascending frequency.

    With a constant cost per retune every order costs the same.  With a cost
    proportional to the distance tuned, any route through points on a line
    covers at least their span (highest − lowest), and one sweep from the
    lowest to the highest covers exactly the span: the ascending order is
    optimal (as is the descending one) when the starting frequency is free.
    """
    return sorted(range(len(segments)), key=lambda i: (segments[i].start_mhz, segments[i].stop_mhz))
