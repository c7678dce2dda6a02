"""The J cut-off: nothing above the floor is missed, and the hard cap refuses in time."""

import numpy as np
import pytest

from planner.engine import EngineLimitError, PredictionRequest, Species, State, predict
from planner.engine.ladder import rigid_j_lower_bound
from planner.engine.request import ASYMMETRIC_J_CAP


def _keys(lines):
    columns = ("state", "j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo")
    return {tuple(row[c] for c in columns) for row in lines.records()}


# Constant sets recalled from the literature (from memory); here they only need to be physical.
SPECIES = [
    Species(
        name="OCS",
        rotor="linear",
        mass_amu=59.967,
        dipole_debye=(0.7152, 0, 0),
        states=(State("v=0", 0.0, {"B": (6081.4921, 0.0), "D": (0.0013011, 0.0)}),),
    ),
    Species(
        name="CH3CN",
        rotor="symmetric-prolate",
        mass_amu=41.027,
        dipole_debye=(3.922, 0, 0),
        states=(State("v=0", 0.0, {"A": (158099.0, 0), "B": (9198.899, 0), "DJ": (0.003808, 0), "DJK": (0.1774, 0)}),),
    ),
    Species(
        name="H2CO",
        rotor="asymmetric",
        mass_amu=30.0106,
        dipole_debye=(2.331, 0, 0),
        states=(State("v=0", 0.0, {"A": (281970.56, 0), "B": (38836.0455, 0), "C": (34002.2034, 0)}),),
    ),
]


@pytest.mark.parametrize("species", SPECIES, ids=lambda s: s.name)
@pytest.mark.parametrize("temperature_k, window_mhz", [(10.0, (0.0, 3e5)), (150.0, (5e4, 4e5))])
def test_no_line_above_the_floor_is_missed(species, temperature_k, window_mhz):
    automatic = predict(species, PredictionRequest(*window_mhz, temperature_k))
    floor = automatic.intensity_floor[species.name]
    # The same request with a floor 10^4 times lower climbs further (regression of the cut-off logic).
    deeper = predict(species, PredictionRequest(*window_mhz, temperature_k, relative_floor=1e-13))
    assert deeper.j_max[species.name] >= automatic.j_max[species.name]
    strong = deeper.lines.take(deeper.lines["intensity_nm2mhz"] >= floor)
    assert len(strong) == len(automatic.lines)
    assert _keys(automatic.lines) == _keys(strong)
    # Q(T) had converged: the deeper climb changes it by less than 1e-10 (relative).
    assert deeper.partition_function[species.name] == pytest.approx(
        automatic.partition_function[species.name], rel=1e-10
    )


def test_a_colder_request_climbs_less_far():
    species = SPECIES[2]
    cold = predict(species, PredictionRequest(0.0, 3e5, 5.0)).j_max["H2CO"]
    warm = predict(species, PredictionRequest(0.0, 3e5, 100.0)).j_max["H2CO"]
    assert cold < warm


def test_higher_absolute_floor_cuts_weaker_lines():
    species = SPECIES[0]
    everything = predict(species, PredictionRequest(0.0, 3e5, 300.0))
    floor = float(np.median(everything.lines["intensity_nm2mhz"]))
    strong = predict(species, PredictionRequest(0.0, 3e5, 300.0, min_intensity_nm2mhz=floor))
    assert 0 < len(strong.lines) < len(everything.lines)
    assert strong.lines["intensity_nm2mhz"].min() >= floor


HEAVY_RIGID_TOP = Species(
    name="heavy top",
    rotor="asymmetric",
    mass_amu=150.0,
    dipole_debye=(1.0, 0, 0),
    # Invented rigid-rotor constants of a heavy molecule: only their size matters here.
    states=(State("v=0", 0.0, {"A": (3000.0, 0), "B": (1000.0, 0), "C": (800.0, 0)}),),
)


def test_hot_heavy_asymmetric_top_is_refused_at_once_with_the_limit_named():
    with pytest.raises(EngineLimitError, match=f"J = {ASYMMETRIC_J_CAP}"):
        predict(HEAVY_RIGID_TOP, PredictionRequest(0.0, 1e5, 300.0))


def test_rigid_lower_bound_is_below_the_j_actually_climbed():
    # The early refusal must never refuse what the climb could finish.
    prediction = predict(HEAVY_RIGID_TOP, PredictionRequest(0.0, 1e5, 5.0))
    bound = rigid_j_lower_bound(HEAVY_RIGID_TOP.states[0], 0.0, 5.0, 1.0)
    assert bound <= prediction.j_max["heavy top"]


def test_requested_j_cap_truncates_with_a_message():
    prediction = predict(SPECIES[2], PredictionRequest(0.0, 1e6, 300.0, j_cap=10))
    assert prediction.j_max["H2CO"] == 10
    assert prediction.lines["j_up"].max() <= 10
    assert any("J = 10" in message for message in prediction.messages)


def test_breakdown_of_the_distortion_series_is_refused():
    # A DeltaK far too large for the temperature turns the K ladder over (invented value, demo of the guard).
    state = State("v=0", 0.0, {"A": (281970.0, 0), "B": (38836.0, 0), "C": (34002.0, 0), "DeltaK": (2000.0, 0)})
    species = Species(name="broken", rotor="asymmetric", mass_amu=30.0, dipole_debye=(1.0, 0, 0), states=(state,))
    with pytest.raises(EngineLimitError, match="broken down"):
        predict(species, PredictionRequest(0.0, 1e6, 300.0))


def test_a_state_too_high_to_be_populated_stops_at_once():
    # CO-like v=1 at 2143 cm^-1 (from memory) at 3 K: e^(-E/kT) underflows to exactly 0,
    # so every term of that state is 0; the climb must stop, not run to the J cap.
    species = Species(
        name="cold two-state linear",
        rotor="linear",
        mass_amu=28.0,
        dipole_debye=(0.11, 0, 0),
        states=(
            State("v=0", 0.0, {"B": (57635.968, 0.001)}),
            State("v=1", 2143.27, {"B": (57111.25, 0.05)}),
        ),
    )
    prediction = predict(species, PredictionRequest(0.0, 1.0e6, 3.0))
    assert set(prediction.lines["state"]) == {"v=0"}
    assert prediction.j_max[species.name] < 20


def test_a_narrow_window_gives_exactly_the_lines_of_a_wide_one_inside_it():
    # Block pairs that cannot reach the window are skipped; nothing inside it may be lost.
    so2 = Species(
        name="SO2-like",
        rotor="asymmetric",
        mass_amu=64.0,
        dipole_debye=(0.3, 1.6, 0.2),  # invented: all three types, to exercise every block pair
        states=(State("v=0", 0.0, {"A": (60778.55, 0), "B": (10318.07, 0), "C": (8799.70, 0)}),),
    )
    # The absolute floor decides for both (the relative floor depends on the window edge).
    wide = predict(so2, PredictionRequest(0.0, 1.0e6, 100.0, min_intensity_nm2mhz=1e-9, relative_floor=1e-15))
    narrow = predict(
        so2, PredictionRequest(150_000.0, 160_000.0, 100.0, min_intensity_nm2mhz=1e-9, relative_floor=1e-15)
    )
    inside = (wide.lines["frequency_mhz"] >= 150_000.0) & (wide.lines["frequency_mhz"] <= 160_000.0)
    assert len(narrow.lines) == int(inside.sum()) > 0
    np.testing.assert_array_equal(narrow.lines["frequency_mhz"], wide.lines["frequency_mhz"][inside])
