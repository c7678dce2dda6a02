"""make_plan end to end: ranking, targets, blends, reasons for leaving lines out, JSON, temperature curves."""

import json
import math

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from planner.engine import LINE_COLUMNS, LineTable, Prediction, PredictionRequest, Species, State, predict
from planner.engine.constants import MHZ_PER_K
from planner.engine.measurement import AbsorptionCell, RelativeModel
from planner.engine.plan import PlanRequest, PlanSpecies, make_plan, signal_vs_temperature

# Invented test data: a linear molecule with B = 10 GHz, μ = 1 D, 30 u.  Its lines J+1 ← J lie at 2B(J+1):
# 20, 40, 60 GHz in a 15–65 GHz window.
B_MHZ = 10000.0


def linear(name="XY", b_mhz=B_MHZ, sigma_b=0.01, mass=30.0, dipole=1.0):
    return Species(name, "linear", mass, (dipole, 0, 0), (State("v=0", 0.0, {"B": (b_mhz, sigma_b)}),))


#: Integrated-intensity prefactor [nm² MHz per MHz D²], SI form 2π² ν Sμ² / (3 ε0 h c) of the Gordy & Cook
#: (1984) expression, from CODATA via scipy.constants.  PHYSICS.md prints 4.16231e-5, which differs from this
#: (4.162379e-5) by 1.7e-5 relative; see test_prefactor_printed_in_physics_md.
PREFACTOR = (
    2 * math.pi**2 * 1e6 * (1e-21 / constants.c) ** 2 / (3 * constants.epsilon_0 * constants.h * constants.c) * 1e12
)


def test_prefactor_printed_in_physics_md():
    assert_allclose(PREFACTOR, 4.16231e-5, rtol=3e-5)  # PHYSICS.md, 6 digits (its 6th digit is off, see above)


def hand_intensity(j_lower, temperature_k, b_mhz=B_MHZ, dipole=1.0):
    """I(J+1 ← J) [nm² MHz] from the textbook formula, Q summed directly (PHYSICS.md, 'Intensities')."""
    kt = temperature_k * MHZ_PER_K
    j = np.arange(0, 200)
    q = np.sum((2 * j + 1) * np.exp(-b_mhz * j * (j + 1) / kt))
    e_lo, e_up = b_mhz * j_lower * (j_lower + 1), b_mhz * (j_lower + 1) * (j_lower + 2)
    nu = e_up - e_lo
    return PREFACTOR * nu * (j_lower + 1) * dipole**2 * (math.exp(-e_lo / kt) - math.exp(-e_up / kt)) / q


def request(**overrides):
    values = dict(fmin_mhz=15000.0, fmax_mhz=65000.0, temperature_k=10.0, slot_s=100.0, retune_overhead_s=10.0)
    values.update(overrides)
    return PlanRequest(**values)


def floor_for_400_s_on_the_weakest():
    """Detection floor that makes the 20 GHz line (the weakest at 10 K) need 400 s for SNR 5."""
    return hand_intensity(0, 10.0) * math.sqrt(400.0) / 5.0


def by_frequency(result):
    return {round(t["frequency_mhz"]): t for t in result.targets}


def test_lines_are_ranked_by_expected_signal():
    result = make_plan(request(), RelativeModel(floor_for_400_s_on_the_weakest()), [PlanSpecies(linear(), 1.0)])
    # At 10 K (kT ≈ 208 GHz) the 3 ← 2 line at 60 GHz is strongest, then 40, then 20 GHz (by hand: hand_intensity).
    assert [round(t["frequency_mhz"]) for t in result.targets] == [60000, 40000, 20000]
    assert [t["rank"] for t in result.targets] == [1, 2, 3]
    hand = [hand_intensity(j, 10.0) for j in (2, 1, 0)]
    assert_allclose([t["intensity_nm2mhz"] for t in result.targets], hand, rtol=1e-5)


def test_targets_are_the_lines_that_fit_the_slot():
    floor = floor_for_400_s_on_the_weakest()
    result = make_plan(request(), RelativeModel(floor), [PlanSpecies(linear(), 1.0)])
    lines = by_frequency(result)
    # t = (5 · floor / I)²: 400 s at 20 GHz by construction; (I20/I40)²·400 ≈ 8.3 s; (I20/I60)²·400 ≈ 1.2 s.
    for frequency, j in ((20000, 0), (40000, 1), (60000, 2)):
        assert_allclose(lines[frequency]["time_to_snr_s"], (5 * floor / hand_intensity(j, 10.0)) ** 2, rtol=1e-5)
    assert lines[20000]["time_to_snr_s"] == pytest.approx(400.0, rel=1e-5)
    assert 1.0 < lines[60000]["time_to_snr_s"] < lines[40000]["time_to_snr_s"] < 10.0
    assert lines[60000]["selected"] and lines[40000]["selected"]
    assert not lines[20000]["selected"] and not lines[20000]["within_slot"]
    assert result.totals["target_count"] == 2 and result.totals["selected_count"] == 2
    assert result.totals["segment_count"] == 2
    expected_dwell = lines[60000]["time_to_snr_s"] + lines[40000]["time_to_snr_s"]
    assert result.totals["dwell_s"] == pytest.approx(expected_dwell)
    assert result.totals["used_s"] == pytest.approx(expected_dwell + 20.0)
    [left] = result.left_out
    assert left["rank"] == 3
    assert left["reason"].startswith("would need 6.67 min plus 10 s retuning, more than the slot (100 s)")  # 400 s


def test_segments_are_numbered_in_ascending_frequency_and_hold_their_targets():
    result = make_plan(request(), RelativeModel(floor_for_400_s_on_the_weakest()), [PlanSpecies(linear(), 1.0)])
    assert [s["number"] for s in result.segments] == [1, 2]
    assert [s["target_ranks"] for s in result.segments] == [[2], [1]]  # 40 GHz (rank 2) before 60 GHz
    lines = by_frequency(result)
    assert lines[40000]["segment"] == 1 and lines[60000]["segment"] == 2
    first = result.segments[0]
    # σν = 2(J+1)·σB = 0.04 MHz for 2 ← 1; interval = ν ± (3σ + FWHM/2) (by hand).
    reach = 3 * 0.04 + lines[40000]["fwhm_mhz"] / 2
    assert first["start_mhz"] - 40000.0 == pytest.approx(-reach, rel=1e-6)
    assert first["stop_mhz"] - 40000.0 == pytest.approx(reach, rel=1e-6)
    assert first["dwell_s"] == pytest.approx(lines[40000]["time_to_snr_s"])


def test_segment_not_chosen_when_the_slot_is_full():
    floor = floor_for_400_s_on_the_weakest()
    result = make_plan(request(slot_s=415.0), RelativeModel(floor), [PlanSpecies(linear(), 1.0)])
    # By hand: 20 GHz alone costs 410 s ≤ 415 s, but with either other line it passes 415 s; the optimum takes
    # 60 + 40 GHz (value 1 + 0.376, 29.5 s) over 20 GHz alone (value 0.054).
    lines = by_frequency(result)
    assert lines[20000]["within_slot"] and not lines[20000]["selected"]
    assert lines[20000]["reason"].startswith("segment not chosen: slot full")
    assert result.totals["target_count"] == 3 and result.totals["selected_count"] == 2


def test_everything_fits_a_long_slot():
    result = make_plan(
        request(slot_s=1000.0), RelativeModel(floor_for_400_s_on_the_weakest()), [PlanSpecies(linear(), 1.0)]
    )
    assert all(t["selected"] for t in result.targets) and result.left_out == []
    assert result.totals["used_s"] == pytest.approx(sum(t["time_to_snr_s"] for t in result.targets) + 30.0)


def test_doppler_width_is_the_line_width_without_pressure():
    result = make_plan(request(), RelativeModel(1e-6), [PlanSpecies(linear(), 1.0)])
    for target in result.targets:
        # Doppler FWHM ≈ 7.162e-7 ν √(T/M) (PHYSICS.md, 4 digits)
        assert_allclose(target["fwhm_mhz"], 7.162e-7 * target["frequency_mhz"] * math.sqrt(10.0 / 30.0), rtol=1e-4)


def test_pressure_widens_the_line():
    model = AbsorptionCell(10.0, 1e-5, pressure_pa=2.0, broadening_khz_per_pa=100.0)  # γ = 0.2 MHz, invented
    result = make_plan(request(), model, [PlanSpecies(linear(), 0.01)])
    for target in result.targets:
        f_l, f_g = 0.4, target["doppler_fwhm_mhz"]
        # Olivero & Longbothum 1977: f_V ≈ 0.5346 f_L + √(0.2166 f_L² + f_G²)
        assert_allclose(target["fwhm_mhz"], 0.5346 * f_l + math.sqrt(0.2166 * f_l**2 + f_g**2), rtol=1e-12)
    assert result.model["kind"] == "absorption-cell"


def test_blend_with_a_second_chosen_species():
    # Invented: B = 10000.01 MHz puts lines 0.02, 0.04, 0.06 MHz above those of XY.
    chosen = [PlanSpecies(linear(), 1.0), PlanSpecies(linear("YZ", b_mhz=10000.01), 1.0)]
    result = make_plan(request(channel_width_mhz=0.03), RelativeModel(1e-6), chosen)
    xy = {round(t["frequency_mhz"]): t for t in result.targets if t["species"] == "XY"}
    # Resolvable width = max(0.03 MHz, FWHM); FWHM at 20 GHz ≈ 0.008 MHz, at 60 GHz ≈ 0.025 MHz (by hand).
    assert xy[20000]["blends"] == ["YZ v=0 1 ← 0 at 20000.0200 MHz"]
    assert xy[40000]["blends"] == []  # 0.04 MHz apart > 0.03 MHz
    assert xy[60000]["blends"] == []
    wide = make_plan(request(channel_width_mhz=0.1), RelativeModel(1e-6), chosen)
    assert all(len(t["blends"]) == 1 for t in wide.targets)


def test_blend_with_a_catalogue_species_that_is_not_chosen():
    other = linear("ZZ", b_mhz=20000.005)  # invented: a line at 40000.01 MHz
    window = PredictionRequest(15000.0, 65000.0, 10.0)
    chosen_lines = predict(linear(), window).lines
    blend_lines = LineTable.concatenate([chosen_lines, predict(other, window).lines])
    result = make_plan(request(), RelativeModel(1e-6), [PlanSpecies(linear(), 1.0)], blend_lines=blend_lines)
    lines = by_frequency(result)
    assert lines[40000]["blends"] == ["ZZ v=0 1 ← 0 at 40000.0100 MHz"]
    assert lines[20000]["blends"] == [] and lines[60000]["blends"] == []
    alone = make_plan(request(), RelativeModel(1e-6), [PlanSpecies(linear(), 1.0)])
    assert all(t["blends"] == [] for t in alone.targets)  # a line does not blend with itself


def invented_table(species, rows):
    """A LineTable of invented lines: rows of (frequency_mhz, intensity_nm2mhz, eu_k); J = 1 ← 0 for all."""
    n = len(rows)
    columns = {name: np.zeros(n, dtype=dtype) for name, (dtype, _) in LINE_COLUMNS.items()}
    columns["species"] = np.array([species] * n, dtype=object)
    columns["state"] = np.array(["v=0"] * n, dtype=object)
    columns["dipole_type"] = np.array(["a"] * n, dtype=object)
    columns["frequency_mhz"] = np.array([r[0] for r in rows], dtype=float)
    columns["intensity_nm2mhz"] = np.array([r[1] for r in rows], dtype=float)
    columns["eu_k"] = np.array([r[2] for r in rows], dtype=float)
    columns["sigma_mhz"] = np.full(n, 0.01)
    columns["doppler_fwhm_mhz"] = np.full(n, 0.02)
    columns["j_up"] = np.arange(1, n + 1)  # distinct labels so that lines are told apart
    columns["j_lo"] = np.arange(0, n)
    for name in ("ka_up", "kc_up", "ka_lo", "kc_lo"):
        columns[name] = np.full(n, -1)
    return LineTable(columns)


def test_every_left_out_line_has_its_reason():
    # Invented lines, RelativeModel floor 1e-3 and SNR 1 → t = (1e-3 / I)².
    rows = [
        (10000.0, 1e-2, 20.0),  # 0.01 s
        (10000.5, 1e-4, 20.0),  # 100 s; within 1 MHz margin of the first: same segment
        (12000.0, 5e-3, 20.0),  # 0.04 s
        (14000.0, 1e-3 / math.sqrt(90.0), 20.0),  # 90 s
        (16000.0, 1e-5, 20.0),  # 1e4 s
        (18000.0, 1e-1, 500.0),  # above max Eu
    ]
    prediction = Prediction(invented_table("AB", rows), 50.0, 5000.0, 20000.0)
    plan_request = PlanRequest(
        5000.0, 20000.0, 50.0, slot_s=115.0, snr=1.0, margin_mhz=1.0, retune_overhead_s=10.0, max_eu_k=300.0
    )
    result = make_plan(
        plan_request, RelativeModel(1e-3), [PlanSpecies(linear("AB"), 1.0)], predictions={"AB": prediction}
    )
    # By hand (value = signal / strongest target): segment 10000 MHz options (0.01 s, 1) and (100 s, 1.01),
    # costs 10.01 and 110; 12000 MHz (0.04 s, 0.5), cost 10.04; 14000 MHz (90 s, 0.0105), cost 100.
    # Best within 115 s: 10000 (short) + 12000 → 1.5 in 20.05 s; 14000 no longer fits the 94.95 s left.
    reasons = {round(row["frequency_mhz"], 1): row["reason"] for row in result.left_out}
    assert set(reasons) == {10000.5, 14000.0, 16000.0, 18000.0}
    assert reasons[10000.5].startswith(
        "needs more dwell than chosen for its segment (needs 100 s, segment 1 gets 0.01 s"
    )
    assert reasons[14000.0].startswith("segment not chosen: slot full (95 s left, the segment needs 100 s)")
    assert reasons[16000.0] == "would need 2.78 h plus 10 s retuning, more than the slot (115 s)"  # 1e4 s
    assert reasons[18000.0] == "above max Eu: E_u = 500.0 K > 300 K"
    assert result.totals["value"] == pytest.approx(1.5)
    assert result.totals["used_s"] == pytest.approx(20.05)
    # Ranks among the five kept lines by signal: 10000 (1e-2) → 1, 12000 (5e-3) → 2, 14000 → 3, 10000.5 → 4, 16000 → 5.
    assert [s["target_ranks"] for s in result.segments] == [[1], [2]]
    hot = [row for row in result.left_out if row["rank"] is None]
    assert len(hot) == 1 and result.totals["line_count"] == 5


def test_a_line_that_fits_only_without_retuning_is_not_a_target():
    # Invented: t = (1e-3 / I)² = 95 s ≤ slot 100 s, but 95 s + 10 s retuning > 100 s.
    prediction = Prediction(invented_table("AB", [(10000.0, 1e-3 / math.sqrt(95.0), 20.0)]), 50.0, 5000.0, 20000.0)
    result = make_plan(
        PlanRequest(5000.0, 20000.0, 50.0, slot_s=100.0, snr=1.0, retune_overhead_s=10.0),
        RelativeModel(1e-3),
        [PlanSpecies(linear("AB"), 1.0)],
        predictions={"AB": prediction},
    )
    assert result.totals["target_count"] == 0 and not result.targets[0]["within_slot"]
    assert result.left_out[0]["reason"] == "would need 95 s plus 10 s retuning, more than the slot (100 s)"
    assert any("No line reaches SNR 1 within the slot of 100 s" in m for m in result.messages)


def test_value_rule_count_prefers_more_lines():
    # Invented: one strong line (t = 1e-4 s) and, elsewhere, three weak lines close together (30 s each).
    weak = 1e-3 / math.sqrt(30.0)
    rows = [(10000.0, 1e-1, 20.0), (12000.0, weak, 20.0), (12000.5, weak, 20.0), (12001.0, weak, 20.0)]
    prediction = Prediction(invented_table("AB", rows), 50.0, 5000.0, 20000.0)
    # Overhead 50 s, slot 100 s: only one segment fits (50 s + 80 s > 100 s).  "signal": strong 1 vs weak
    # 3 × 0.0183 → the strong line; "count": 1 vs 3 → the three weak lines (by hand).
    values = dict(slot_s=100.0, snr=1.0, retune_overhead_s=50.0, margin_mhz=1.0)
    plan_request = PlanRequest(5000.0, 20000.0, 50.0, **values)
    chosen = [PlanSpecies(linear("AB"), 1.0)]
    plans = {
        rule: make_plan(plan_request, RelativeModel(1e-3), chosen, predictions={"AB": prediction}, value_rule=rule)
        for rule in ("signal", "count")
    }
    assert plans["signal"].totals["selected_count"] == 1 and plans["signal"].targets[0]["selected"]
    assert plans["count"].totals["selected_count"] == 3 and not plans["count"].targets[0]["selected"]
    assert plans["count"].segments[0]["dwell_s"] == pytest.approx(30.0)
    with pytest.raises(ValueError, match="value_rule"):
        make_plan(plan_request, RelativeModel(1e-3), chosen, predictions={"AB": prediction}, value_rule="best")


def test_to_dict_is_json_ready_and_maps_infinite_times_to_none():
    rows = [(10000.0, 1e-2, 20.0), (12000.0, 0.0, 20.0)]  # invented: a line of zero intensity never reaches the SNR
    prediction = Prediction(invented_table("AB", rows), 50.0, 5000.0, 20000.0)
    result = make_plan(
        PlanRequest(5000.0, 20000.0, 50.0, slot_s=100.0),
        RelativeModel(1e-3),
        [PlanSpecies(linear("AB"), 1.0)],
        predictions={"AB": prediction},
    )
    assert math.isinf(result.targets[1]["time_to_snr_s"])
    data = result.to_dict()
    text = json.dumps(data, allow_nan=False)
    assert json.loads(text) == data
    assert data["targets"][1]["time_to_snr_s"] is None
    assert data["left_out"][0]["reason"] == "no expected signal: it can never reach the SNR"
    target_keys = {
        "rank", "species", "state", "j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo", "frequency_mhz", "sigma_mhz",
        "eu_k", "s_mu2_d2", "einstein_a_s", "intensity_nm2mhz", "fwhm_mhz", "expected_signal", "time_to_snr_s",
        "blends", "selected", "segment",
    }  # fmt: skip
    assert target_keys <= set(data["targets"][0])
    assert data["targets"][0]["ka_up"] is None  # undefined quantum numbers, as in the engine's records
    assert {"number", "start_mhz", "stop_mhz", "dwell_s", "target_ranks"} <= set(data["segments"][0])
    assert {"rank", "species", "frequency_mhz", "reason"} <= set(data["left_out"][0])
    totals = {"slot_s", "used_s", "dwell_s", "overhead_s", "target_count", "selected_count", "segment_count"}
    assert totals <= set(data["totals"])


def test_real_plan_is_json_ready():
    result = make_plan(request(), AbsorptionCell(10.0, 1e-5, 1.0, 75.0), [PlanSpecies(linear(), 0.01)])
    json.dumps(result.to_dict(), allow_nan=False)


def test_cached_predictions_are_used_and_checked():
    prediction = predict(linear(), PredictionRequest(15000.0, 65000.0, 10.0))
    result = make_plan(request(), RelativeModel(1e-6), [PlanSpecies(linear(), 1.0)], predictions={"XY": prediction})
    assert len(result.targets) == 3
    with pytest.raises(ValueError, match="at 10 K, the plan at 20 K"):
        make_plan(
            request(temperature_k=20.0),
            RelativeModel(1e-6),
            [PlanSpecies(linear(), 1.0)],
            predictions={"XY": prediction},
        )


def test_empty_window_gives_a_message():
    result = make_plan(request(fmin_mhz=100.0, fmax_mhz=200.0), RelativeModel(1e-6), [PlanSpecies(linear(), 1.0)])
    assert result.targets == [] and result.segments == []
    assert any("nothing to plan" in m for m in result.messages)
    json.dumps(result.to_dict(), allow_nan=False)


@pytest.mark.parametrize(
    "field, value",
    [("slot_s", 0.0), ("snr", -1.0), ("setting_width_mhz", 0.0), ("channel_width_mhz", 0.0), ("k_sigma", -1.0)],
)
def test_plan_request_names_the_bad_field(field, value):
    with pytest.raises(ValueError, match=field):
        request(**{field: value})


def test_plan_request_checks_the_window_too():
    with pytest.raises(ValueError, match="fmax_mhz"):
        request(fmax_mhz=1000.0)


def test_bad_choices_are_refused():
    with pytest.raises(ValueError, match="amount"):
        PlanSpecies(linear(), 0.0)
    with pytest.raises(ValueError, match="chosen twice: XY"):
        make_plan(request(), RelativeModel(1e-6), [PlanSpecies(linear(), 1.0), PlanSpecies(linear(), 2.0)])


def test_signal_versus_temperature():
    chosen = [PlanSpecies(linear(), 0.5)]
    key_20 = ("XY", "v=0", 1, None, None, 0, None, None)
    missing = ("XY", "v=0", 9, None, None, 8, None, None)  # 180 GHz: outside the window
    curves = signal_vs_temperature(request(), RelativeModel(1e-6), chosen, [key_20, missing], [5.0, 10.0, 300.0])
    # Relative model: 0.5 · I(T) with I from the textbook formula at each temperature.
    assert_allclose(curves[key_20], [0.5 * hand_intensity(0, t) for t in (5.0, 10.0, 300.0)], rtol=1e-5)
    assert curves[missing] == [0.0, 0.0, 0.0]
    with pytest.raises(ValueError, match="not chosen: QQ"):
        signal_vs_temperature(request(), RelativeModel(1e-6), chosen, [("QQ",) + key_20[1:]], [10.0])


def test_signal_versus_temperature_marks_refused_temperatures_as_nan():
    from planner.engine import predict

    chosen = [PlanSpecies(linear(), 0.5)]
    key_20 = ("XY", "v=0", 1, None, None, 0, None, None)

    def refuse_hot(species, window):
        if window.temperature_k > 100:
            raise ValueError("needs levels above the J cap")  # as EngineLimitError would
        return predict(species, window)

    curves = signal_vs_temperature(request(), RelativeModel(1e-6), chosen, [key_20], [10.0, 300.0], refuse_hot)
    assert curves[key_20][0] == pytest.approx(0.5 * hand_intensity(0, 10.0), rel=1e-5)
    assert np.isnan(curves[key_20][1])


def test_durations_read_in_the_largest_sensible_unit():
    from planner.engine.plan import duration_text

    # textbook identities: 60 s/min, 3600 s/h, 86 400 s/day, 365.25 days/year
    assert duration_text(45.0) == "45 s"
    assert duration_text(400.0) == "6.67 min"
    assert duration_text(3 * 86400.0) == "3 days"
    assert duration_text(7.74e8) == "24.5 years"
