"""Search intervals, merging, clipping and splitting, segments, the optimiser and the retuning order.

All intervals, dwell times and values here are invented test data; expected
results are worked out by hand in the comments.
"""

import itertools

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine.scanplan import (
    DwellOption,
    Segment,
    build_segments,
    choose_segments,
    clip_and_split,
    greedy_choice,
    merge_intervals,
    order_for_retuning,
    search_intervals,
)


def test_search_interval_is_k_sigma_plus_half_width_plus_margin():
    lo, hi = search_intervals([100.0, 200.0], [0.5, 1.0], [0.1, 0.2], 3.0, 2.0)
    # 3·0.5 + 0.1 + 2 = 3.6 and 3·1 + 0.2 + 2 = 5.2 (by hand)
    assert_allclose(lo, [96.4, 194.8])
    assert_allclose(hi, [103.6, 205.2])


def test_search_interval_refuses_negative_margin():
    with pytest.raises(ValueError, match="margin_mhz"):
        search_intervals([1.0], [0.1], [0.1], 3.0, -1.0)
    with pytest.raises(ValueError, match="k_sigma"):
        search_intervals([1.0], [0.1], [0.1], -3.0, 0.0)


def test_overlapping_intervals_merge():
    assert merge_intervals([0.0, 5.0], [10.0, 12.0]) == [(0.0, 12.0)]


def test_touching_intervals_merge():
    assert merge_intervals([0.0, 10.0], [10.0, 12.0]) == [(0.0, 12.0)]


def test_disjoint_intervals_stay_apart_and_come_out_sorted():
    assert merge_intervals([20.0, 0.0], [25.0, 10.0]) == [(0.0, 10.0), (20.0, 25.0)]


def test_nested_and_chained_intervals_merge():
    # (0,10) holds (2,3); (9,15) overlaps (0,10); (15,16) touches (9,15); (30,31) is apart.
    merged = merge_intervals([9.0, 2.0, 0.0, 30.0, 15.0], [15.0, 3.0, 10.0, 31.0, 16.0])
    assert merged == [(0.0, 16.0), (30.0, 31.0)]


def test_merge_of_nothing_is_nothing():
    assert merge_intervals([], []) == []


def test_long_interval_is_split_into_equal_pieces_no_wider_than_a_setting():
    pieces = clip_and_split([(0.0, 2500.0)], 0.0, 1e6, 1000.0)
    # ⌈2500/1000⌉ = 3 pieces of 833.33 MHz (by hand)
    assert len(pieces) == 3
    assert_allclose([b - a for a, b in pieces], [2500 / 3] * 3)
    assert pieces[0][0] == 0.0 and pieces[-1][1] == 2500.0


def test_interval_of_exactly_two_settings_makes_two_pieces():
    assert clip_and_split([(0.0, 2000.0)], 0.0, 1e6, 1000.0) == [(0.0, 1000.0), (1000.0, 2000.0)]


def test_intervals_are_clipped_to_the_window_and_outside_ones_dropped():
    pieces = clip_and_split([(90.0, 110.0), (150.0, 160.0), (195.0, 230.0), (300.0, 310.0)], 100.0, 200.0, 1000.0)
    assert pieces == [(100.0, 110.0), (150.0, 160.0), (195.0, 200.0)]


def test_splitting_refuses_a_zero_setting_width():
    with pytest.raises(ValueError, match="setting_width_mhz"):
        clip_and_split([(0.0, 1.0)], 0.0, 2.0, 0.0)


def test_targets_belong_to_the_segment_that_holds_their_centre():
    frequency = np.array([100.0, 103.0, 500.0, 1700.0, 2900.0])
    lo, hi = frequency - 2.0, frequency + 2.0
    lo[3], hi[3] = 1000.0, 3000.0  # one wide interval, split into two 1000 MHz pieces; it swallows line 4's
    segments = build_segments(frequency, lo, hi, 0.0, 5000.0, 1000.0)
    assert segments == [
        Segment(98.0, 105.0, (0, 1)),  # lines at 100 and 103 overlap
        Segment(498.0, 502.0, (2,)),
        Segment(1000.0, 2000.0, (3,)),
        Segment(2000.0, 3000.0, (4,)),
    ]


def test_pieces_without_a_centre_are_dropped():
    # One line with a 3000 MHz wide interval: three pieces, only the middle holds the centre.
    segments = build_segments([1500.0], [0.0], [3000.0], 0.0, 1e4, 1000.0)
    assert segments == [Segment(1000.0, 2000.0, (0,))]


def brute_force(options, overhead, slot):
    """Best value by trying every combination (independent check of the MILP)."""
    best = 0.0
    for combo in itertools.product(*[[None] + list(range(len(o))) for o in options]):
        picked = [(j, k) for j, k in enumerate(combo) if k is not None]
        time = sum(options[j][k].dwell_s + overhead for j, k in picked)
        if time <= slot + 1e-9:
            best = max(best, sum(options[j][k].value for j, k in picked))
    return best


def test_optimiser_on_a_case_checked_by_hand():
    options = [
        [DwellOption(2.0, 1.0, (0,)), DwellOption(5.0, 1.5, (0, 1))],
        [DwellOption(3.0, 0.8, (2,)), DwellOption(7.0, 1.2, (2, 3))],
    ]
    # Costs with 1 s overhead: 3, 6 and 4, 8.  Pairs that fit 10 s: (3+4) → 1.8, (6+4) → 2.3; the rest > 10 s.
    choice = choose_segments(options, overhead_s=1.0, slot_s=10.0)
    assert choice.option_index == (1, 0)
    assert choice.value == pytest.approx(2.3)
    assert choice.time_s == pytest.approx(10.0)
    assert choice.optimal


def test_optimiser_picks_nothing_when_nothing_fits():
    choice = choose_segments([[DwellOption(50.0, 1.0, (0,))]], overhead_s=10.0, slot_s=30.0)
    assert choice.option_index == (None,) and choice.value == 0.0 and choice.time_s == 0.0


def test_optimiser_takes_at_most_one_option_per_segment():
    options = [[DwellOption(1.0, 1.0, (0,)), DwellOption(1.0, 1.0, (1,))]]
    choice = choose_segments(options, overhead_s=0.0, slot_s=100.0)
    assert choice.value == pytest.approx(1.0)
    assert sum(k is not None for k in choice.option_index) == 1


def test_greedy_value_per_second_is_worse_than_the_optimum():
    options = [
        [DwellOption(6.0, 7.0, (0,))],  # 7/6 ≈ 1.17 per second: greedy takes it first
        [DwellOption(5.0, 5.0, (1,))],  # 1 per second
        [DwellOption(5.0, 5.0, (2,))],  # 1 per second
    ]
    # Slot 10 s: greedy takes the first (6 s), then neither 5 s option fits → value 7.  Best: the two 5 s → 10.
    greedy = greedy_choice(options, overhead_s=0.0, slot_s=10.0)
    best = choose_segments(options, overhead_s=0.0, slot_s=10.0)
    assert greedy.value == pytest.approx(7.0) and greedy.option_index == (0, None, None)
    assert best.value == pytest.approx(10.0) and best.option_index == (None, 0, 0)


def test_optimiser_matches_brute_force_on_random_cases():
    rng = np.random.default_rng(7)  # invented test data, reproducible
    for _ in range(20):
        options = []
        for _segment in range(4):
            dwell = np.sort(rng.uniform(0.5, 20.0, rng.integers(1, 4)))
            value = np.cumsum(rng.uniform(0.1, 2.0, len(dwell)))
            options.append([DwellOption(float(d), float(v), ()) for d, v in zip(dwell, value)])
        choice = choose_segments(options, overhead_s=2.0, slot_s=30.0)
        assert choice.value == pytest.approx(brute_force(options, 2.0, 30.0), abs=1e-9)
        assert choice.time_s <= 30.0 + 1e-6


def test_optimiser_refuses_bad_slot_and_dwell():
    with pytest.raises(ValueError, match="slot_s"):
        choose_segments([], overhead_s=0.0, slot_s=0.0)
    with pytest.raises(ValueError, match="dwell_s"):
        choose_segments([[DwellOption(-1.0, 1.0, ())]], overhead_s=0.0, slot_s=10.0)


def test_retuning_order_is_ascending_frequency():
    segments = [Segment(300.0, 310.0, (0,)), Segment(100.0, 110.0, (1,)), Segment(200.0, 210.0, (2,))]
    assert order_for_retuning(segments) == [1, 2, 0]


def test_ascending_sweep_has_the_shortest_tuning_path():
    starts = [300.0, 100.0, 250.0, 200.0]
    segments = [Segment(s, s + 1.0, (i,)) for i, s in enumerate(starts)]
    order = order_for_retuning(segments)

    def path(sequence):
        return sum(abs(starts[b] - starts[a]) for a, b in zip(sequence, sequence[1:]))

    # Every route covers at least the span, 300 − 100 = 200 MHz (by hand); the sweep equals it.
    assert path(order) == pytest.approx(200.0)
    assert path(order) == min(path(p) for p in itertools.permutations(range(4)))
