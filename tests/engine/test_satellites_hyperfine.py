"""Vibrational satellites, state degeneracy, α-given states and quadrupole hyperfine, in predict and make_plan.

Every expected number names its source: "textbook identity" (an exact
consequence of the Boltzmann law, the Casimir formula or the Hellmann–Feynman
theorem, worked by hand), "from memory" (a measured value recalled, not looked
up) or "invented test data".  Isotopic masses come from periodictable.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import periodictable
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from planner.engine import (
    AssignedLine,
    PredictionRequest,
    Quadrupole,
    Species,
    SpeciesError,
    State,
    fit_constants,
    predict,
)
from planner.engine.constants import MHZ_PER_CM1
from planner.engine.derived import energy_levels
from planner.engine.hyperfine import DEFAULT_SPREAD_FRACTION, line_components
from planner.engine.measurement import RelativeModel
from planner.engine.plan import PlanRequest, PlanSpecies, make_plan
from planner.engine.scanplan import search_intervals

H1, C12, N14, O16 = (
    periodictable.H[1].mass,
    periodictable.C[12].mass,
    periodictable.N[14].mass,
    periodictable.O[16].mass,
)

#: Second radiation constant hc/k [cm K], CODATA via scipy.constants.
HC_OVER_K_CM_K = constants.h * constants.c / constants.k * 100.0
#: h/k [K per MHz], CODATA via scipy.constants.
H_OVER_K_K_PER_MHZ = constants.h * 1e6 / constants.k

#: ¹²C¹⁶O: B0, D [MHz] and μ [D] (from memory); v = 1 at 2143.27 cm⁻¹ (from memory), αe [MHz] (from memory).
CO_B0_MHZ, CO_D_MHZ, CO_DIPOLE_D = 57635.968, 0.18350, 0.11011
CO_V1_CM1, CO_ALPHA_E_MHZ = 2143.27, 524.8
#: CO J = 1 ← 0 in v = 0 and v = 1 [MHz] (from memory).
CO_J1_0_V0_MHZ, CO_J1_0_V1_MHZ = 115271.202, 114221.75

#: HCN: B, D [MHz], μ [D], eQq(¹⁴N) [MHz] (from memory).
HCN_B_MHZ, HCN_D_MHZ, HCN_DIPOLE_D, HCN_EQQ_MHZ = 44315.976, 0.0874, 2.985, -4.7091
#: HCN J = 1 ← 0 hyperfine components {F_up: frequency [MHz]}, F_lo = 1 (from memory).
HCN_J1_0_COMPONENTS_MHZ = {1: 88630.4157, 2: 88631.8473, 0: 88633.9360}

#: CH3CN: A, B, DJ, DJK [MHz], μa [D], eQq(¹⁴N) [MHz] (from memory).
CH3CN_CONSTANTS_MHZ = {"A": 158099.0, "B": 9198.899, "DJ": 0.0038, "DJK": 0.1774}
CH3CN_DIPOLE_D, CH3CN_EQQ_MHZ = 3.92, -4.2244


def co(b0_mhz=CO_B0_MHZ, **extra) -> Species:
    """CO with v = 0 typed in and v = 1 given by αe (from memory, see the constants above)."""
    return Species(
        name="CO",
        rotor="linear",
        mass_amu=C12 + O16,
        dipole_debye=(CO_DIPOLE_D, 0, 0),
        states=(
            State("v=0", 0.0, {"B": (b0_mhz, 0.001), "D": (CO_D_MHZ, 0.00002)}),
            State("v=1", CO_V1_CM1, {}, alpha_mhz={"B": (CO_ALPHA_E_MHZ, 0.1)}),
        ),
        formula="CO",
        **extra,
    )


def hcn(hyperfine=True) -> Species:
    quad = Quadrupole("14N", 1, {"aa": (HCN_EQQ_MHZ, 0.001)}) if hyperfine else None
    return Species(
        name="HCN",
        rotor="linear",
        mass_amu=H1 + C12 + N14,
        dipole_debye=(HCN_DIPOLE_D, 0, 0),
        states=(State("v=0", 0.0, {"B": (HCN_B_MHZ, 0.001), "D": (HCN_D_MHZ, 0.00002)}),),
        hyperfine=quad,
    )


def one_line(table, **where):
    """The single row of a LineTable whose columns equal ``where``."""
    rows = [r for r in table.records() if all(r[k] == v for k, v in where.items())]
    assert len(rows) == 1, f"expected one line with {where}, found {len(rows)}"
    return rows[0]


# --- Vibrational satellites of a linear molecule --------------------------------------------------


def test_co_v1_line_from_alpha_e_lands_on_the_measured_frequency():
    lines = predict(co(), PredictionRequest(100000.0, 120000.0, 300.0)).lines
    v1 = one_line(lines, state="v=1", j_up=1, j_lo=0)
    v0 = one_line(lines, state="v=0", j_up=1, j_lo=0)
    # 1.5 MHz: αe is rounded to 0.1 MHz and γe (the v² term) is neglected (from memory values).
    assert abs(v1["frequency_mhz"] - CO_J1_0_V1_MHZ) < 1.5
    assert abs(v0["frequency_mhz"] - CO_J1_0_V0_MHZ) < 0.05
    assert_allclose(v1["vib_energy_cm1"], CO_V1_CM1, rtol=1e-12)
    assert_allclose(v1["el_cm1"], CO_V1_CM1, rtol=1e-12)  # J = 0 of v = 1 lies at the band origin
    assert v0["vib_energy_cm1"] == 0.0


def test_co_v1_to_v0_intensity_ratio_is_the_boltzmann_factor():
    """I1/I0 = (ν1/ν0)·e^(−Ev/kT)·(1 − e^(−hν1/kT))/(1 − e^(−hν0/kT)): same S, μ and Q (textbook identity)."""
    temperature = 300.0
    lines = predict(co(), PredictionRequest(100000.0, 120000.0, temperature)).lines
    v1 = one_line(lines, state="v=1", j_up=1, j_lo=0)
    v0 = one_line(lines, state="v=0", j_up=1, j_lo=0)
    nu1, nu0 = v1["frequency_mhz"], v0["frequency_mhz"]
    expected = (
        (nu1 / nu0)
        * math.exp(-CO_V1_CM1 * HC_OVER_K_CM_K / temperature)
        * -math.expm1(-H_OVER_K_K_PER_MHZ * nu1 / temperature)
        / -math.expm1(-H_OVER_K_K_PER_MHZ * nu0 / temperature)
    )
    ratio = v1["intensity_nm2mhz"] / v0["intensity_nm2mhz"]
    assert_allclose(ratio, expected, rtol=1e-6)  # exact identity; CODATA via scipy on both sides


def test_alpha_state_takes_b_from_the_ground_state_and_copies_d():
    species = co()
    ground, v1 = species.states
    assert v1.constants_mhz["B"][0] == pytest.approx(CO_B0_MHZ - CO_ALPHA_E_MHZ, rel=1e-15)
    assert v1.constants_mhz["B"][1] == pytest.approx(math.hypot(0.001, 0.1), rel=1e-12)  # σ² add
    assert v1.constants_mhz["D"] == ground.constants_mhz["D"]  # copied (Species docstring)
    assert set(v1.derived_names) == {"B", "D"}
    assert v1.stored_constants_mhz == {}
    assert species.is_satellite(v1) and not species.is_satellite(ground)
    assert species.ground_state is ground


# --- Degeneracy and the partition function --------------------------------------------------------

#: Invented test data: a linear molecule with a doubly degenerate state at 300 cm⁻¹.
BENT_ENERGY_CM1 = 300.0


def invented_linear(degeneracy=2, states=("v=0", "v2=1")) -> Species:
    table = {
        "v=0": State("v=0", 0.0, {"B": (5000.0, 0.01), "D": (0.001, 0.0)}),
        "v2=1": State("v2=1", BENT_ENERGY_CM1, {"B": (5010.0, 0.01), "D": (0.001, 0.0)}, degeneracy=degeneracy),
        "v2=1 alone": State("v2=1", 0.0, {"B": (5010.0, 0.01), "D": (0.001, 0.0)}),
    }
    return Species("XY", "linear", 40.0, (1.0, 0, 0), tuple(table[s] for s in states))


def test_partition_function_counts_the_degenerate_state_twice():
    """Q = Q_rot(v=0) + 2·e^(−Ev/kT)·Q_rot(v2=1) (textbook identity), each Q_rot from its own prediction."""
    temperature = 300.0
    window = PredictionRequest(5000.0, 60000.0, temperature)
    q_total = predict(invented_linear(), window).partition_function["XY"]
    q_ground = predict(invented_linear(states=("v=0",)), window).partition_function["XY"]
    q_bent = predict(invented_linear(states=("v2=1 alone",)), window).partition_function["XY"]
    boltzmann = math.exp(-BENT_ENERGY_CM1 * HC_OVER_K_CM_K / temperature)
    assert_allclose(q_total, q_ground + 2 * boltzmann * q_bent, rtol=1e-9)
    q_single = predict(invented_linear(degeneracy=1), window).partition_function["XY"]
    assert_allclose(q_single, q_ground + boltzmann * q_bent, rtol=1e-9)


def test_degeneracy_doubles_the_satellite_lines_with_q_adjusted():
    """I(g=2)/I(g=1) = 2·Q1/Q2 for the satellite and Q1/Q2 for the ground state (textbook identity)."""
    window = PredictionRequest(5000.0, 60000.0, 300.0)
    double, single = predict(invented_linear(2), window), predict(invented_linear(1), window)
    q2, q1 = double.partition_function["XY"], single.partition_function["XY"]
    assert q2 > q1
    by_key = {(r["state"], r["j_up"]): r["intensity_nm2mhz"] for r in single.lines.records()}
    compared = 0
    for row in double.lines.records():
        factor = 2.0 if row["state"] == "v2=1" else 1.0
        assert_allclose(row["intensity_nm2mhz"] / by_key[(row["state"], row["j_up"])], factor * q1 / q2, rtol=1e-12)
        compared += row["state"] == "v2=1"
    assert compared >= 5  # J = 1 ← 0 … 6 ← 5 of v2=1 lie in 5–60 GHz


# --- States given as α: what is refused ----------------------------------------------------------


def _alpha_species(*states):
    return Species("XY", "linear", 40.0, (1.0, 0, 0), states)


def test_alpha_and_constant_for_the_same_name_is_refused():
    with pytest.raises(SpeciesError) as caught:
        _alpha_species(
            State("v=0", 0.0, {"B": (5000.0, 0.0)}),
            State("v=1", 500.0, {"B": (4990.0, 0.0)}, alpha_mhz={"B": (10.0, 0.0)}),
        )
    assert caught.value.field == "states[1].alpha_mhz.B"
    assert "alpha_mhz.B" in str(caught.value) and caught.value.species == "XY"


def test_alpha_for_a_constant_the_ground_state_lacks_is_refused():
    with pytest.raises(SpeciesError) as caught:
        _alpha_species(
            State("v=0", 0.0, {"B": (5000.0, 0.0)}),
            State("v=1", 500.0, {}, alpha_mhz={"B": (10.0, 0.0), "D": (1e-5, 0.0)}),
        )
    assert caught.value.field == "states[1].alpha_mhz.D"
    assert "no D" in caught.value.message


def test_alpha_on_the_ground_state_is_refused():
    with pytest.raises(SpeciesError) as caught:
        _alpha_species(State("v=0", 0.0, {"B": (5000.0, 0.0)}, alpha_mhz={"B": (10.0, 0.0)}))
    assert caught.value.field == "states[0].alpha_mhz"
    assert "ground state" in caught.value.message


#: CO v = 0 J = 1 ← 0, 2 ← 1, 3 ← 2 [MHz] (from memory).
CO_V0_LINES_MHZ = ((1, 115271.202), (2, 230538.000), (3, 345795.990))


def test_alpha_state_follows_a_refitted_ground_state():
    """B(v=1) = B0 − α must hold for the fitted B0 too (the State docstring's rule)."""
    start = co(b0_mhz=CO_B0_MHZ - 1.0)  # invented starting value: B0 1 MHz off, so that the fit moves it
    assert start.states[1].value("B") == pytest.approx(CO_B0_MHZ - 1.0 - CO_ALPHA_E_MHZ, abs=1e-9)
    lines = [AssignedLine(j, None, None, j - 1, None, None, nu, 0.005, "v=0") for j, nu in CO_V0_LINES_MHZ]
    fitted = fit_constants(start, lines, ["B", "D"]).fitted_species()
    new_ground, new_v1 = fitted.states
    assert new_ground.value("B") == pytest.approx(CO_B0_MHZ, abs=0.01)  # the fit itself works
    assert new_v1.value("B") == pytest.approx(new_ground.value("B") - CO_ALPHA_E_MHZ, abs=1e-6)
    assert new_v1.value("D") == pytest.approx(new_ground.value("D"), rel=1e-12)


# --- Hyperfine columns of predict ----------------------------------------------------------------


def test_hcn_j1_0_spread_is_the_extreme_component_offsets():
    """X(J=1) = −eQq for a linear molecule; offsets X·Y(1,1,F) = −1.177, +0.235, +2.355 MHz (textbook identity)."""
    lines = predict(hcn(), PredictionRequest(80000.0, 100000.0, 300.0)).lines
    line = one_line(lines, j_up=1, j_lo=0)
    assert_allclose(line["hfs_coupling_up_mhz"], -HCN_EQQ_MHZ, rtol=1e-12)
    assert line["hfs_coupling_lo_mhz"] == 0.0  # J = 0 has no quadrupole energy
    components = line_components(1, 0, 1, line["hfs_coupling_up_mhz"], line["hfs_coupling_lo_mhz"])
    assert_allclose(line["hfs_low_mhz"], components.offset_mhz.min(), rtol=1e-12)
    assert_allclose(line["hfs_high_mhz"], components.offset_mhz.max(), rtol=1e-12)
    assert_allclose(line["hfs_low_mhz"], -0.25 * -HCN_EQQ_MHZ, rtol=1e-12)  # Y(1,1,1) = −1/4
    assert_allclose(line["hfs_high_mhz"], 0.5 * -HCN_EQQ_MHZ, rtol=1e-12)  # Y(1,1,0) = +1/2
    assert line["hfs_low_mhz"] == pytest.approx(-1.177, abs=5e-4)
    assert line["hfs_high_mhz"] == pytest.approx(2.355, abs=5e-4)


def test_hcn_components_from_the_columns_match_the_measured_ones():
    """ν + X·Y(1,1,F) against the measured F components within 0.03 MHz (from memory)."""
    line = one_line(predict(hcn(), PredictionRequest(80000.0, 100000.0, 300.0)).lines, j_up=1, j_lo=0)
    components = line_components(1, 0, 1, line["hfs_coupling_up_mhz"], line["hfs_coupling_lo_mhz"])
    for f_up, offset in zip(components.f_up, components.offset_mhz):
        assert abs(line["frequency_mhz"] + offset - HCN_J1_0_COMPONENTS_MHZ[int(f_up)]) < 0.03


def test_species_without_hyperfine_has_zero_hfs_columns():
    for species in (co(), hcn(hyperfine=False)):
        lines = predict(species, PredictionRequest(80000.0, 120000.0, 300.0)).lines
        assert len(lines) > 0
        for name in ("hfs_low_mhz", "hfs_high_mhz", "hfs_coupling_up_mhz", "hfs_coupling_lo_mhz"):
            assert np.all(lines[name] == 0.0), name


def _counted_spread(j_up, j_lo, spin, x_up, x_lo):
    """(min, max) offset over the components of ≥ 1 % of the line (the strongest always counts)."""
    parts = line_components(j_up, j_lo, spin, x_up, x_lo)
    counted = parts.relative_intensity >= DEFAULT_SPREAD_FRACTION - 1e-12
    counted[np.argmax(parts.relative_intensity)] = True
    return parts.offset_mhz[counted].min(), parts.offset_mhz[counted].max()


def test_symmetric_top_coupling_is_eqq_times_3k2_over_j_j_plus_1_minus_1():
    """X(J, K) = eQq·(3K²/(J(J+1)) − 1) for a nucleus on the axis of a prolate top (textbook identity)."""
    species = Species(
        name="CH3CN",
        rotor="symmetric-prolate",
        mass_amu=2 * C12 + 3 * H1 + N14,
        dipole_debye=(CH3CN_DIPOLE_D, 0, 0),
        states=(State("v=0", 0.0, {k: (v, 0.0) for k, v in CH3CN_CONSTANTS_MHZ.items()}),),
        hyperfine=Quadrupole("14N", 1, {"aa": (CH3CN_EQQ_MHZ, 0.0)}),
    )
    assert_allclose([species.hyperfine.chi("bb"), species.hyperfine.chi("cc")], [-CH3CN_EQQ_MHZ / 2] * 2)
    lines = predict(species, PredictionRequest(110300.0, 110400.0, 300.0)).lines  # J = 6 ← 5
    assert sorted(lines["ka_up"].tolist()) == [0, 1, 2, 3, 4, 5]
    for row in lines.records():
        k, j_up, j_lo = row["ka_up"], row["j_up"], row["j_lo"]
        assert (j_up, j_lo) == (6, 5)
        x_up = CH3CN_EQQ_MHZ * (3 * k * k / (j_up * (j_up + 1)) - 1)
        x_lo = CH3CN_EQQ_MHZ * (3 * k * k / (j_lo * (j_lo + 1)) - 1)
        assert_allclose(row["hfs_coupling_up_mhz"], x_up, rtol=1e-9, atol=1e-12)
        assert_allclose(row["hfs_coupling_lo_mhz"], x_lo, rtol=1e-9, atol=1e-12)
        low, high = _counted_spread(j_up, j_lo, 1, x_up, x_lo)
        assert_allclose([row["hfs_low_mhz"], row["hfs_high_mhz"]], [low, high], rtol=1e-9, atol=1e-12)


#: Invented test data: quartic constants of each reduction, small enough to keep the levels in order [MHz].
QUARTIC_MHZ = {
    "A": {"DeltaJ": 0.002, "DeltaJK": -0.01, "DeltaK": 0.05, "deltaJ": 0.0005, "deltaK": 0.004},
    "S": {"DJ": 0.002, "DJK": -0.01, "DK": 0.05, "d1": -0.0005, "d2": -0.0001},
}


@pytest.mark.parametrize(
    ("reduction", "representation", "distorted"),
    [("A", "Ir", False), ("A", "Ir", True), ("S", "Ir", True), ("A", "IIIr", True)],
)
def test_asymmetric_top_coupling_from_finite_difference_p_squared(reduction, representation, distorted):
    """X = 2/(J(J+1))·Σ χgg⟨Pg²⟩ with ⟨Pg²⟩ = ∂E/∂G by central differences of the levels (Hellmann–Feynman:
    A, B, C enter only as G·Pg², also with the distortion terms, in either representation).

    Invented test data: an asymmetric top and a ¹⁴N-like nucleus with χaa, χbb given (χcc completed).
    """
    constants_mhz = {"A": 12000.0, "B": 5000.0, "C": 3500.0}
    distortion = {k: (v, 0.0) for k, v in QUARTIC_MHZ[reduction].items()} if distorted else {}
    chi = {"aa": -3.0, "bb": 1.2}

    def species_with(**shift):
        values = {k: (v + shift.get(k, 0.0), 0.0) for k, v in constants_mhz.items()}
        return Species(
            "XYZ",
            "asymmetric",
            60.0,
            (1.0, 0.5, 0.0),
            (State("v=0", 0.0, {**values, **distortion}),),
            reduction=reduction,
            representation=representation,
            hyperfine=Quadrupole("14N", 1, {k: (v, 0.0) for k, v in chi.items()}),
        )

    species = species_with()
    assert species.hyperfine.chi("cc") == pytest.approx(1.8, abs=1e-12)  # traceless completion
    lines = predict(species, PredictionRequest(5000.0, 60000.0, 10.0)).lines
    assert len(lines) > 20
    j_max = int(max(lines["j_up"].max(), lines["j_lo"].max()))
    step = 0.01  # [MHz]; the levels are smooth in A, B, C (each symmetry block on its own)

    def levels(**shift):
        table = energy_levels(species_with(**shift), 0, j_max)
        return {(j, ka, kc): e for j, ka, kc, e in zip(table["j"], table["ka"], table["kc"], table["energy_cm1"])}

    p2 = {}
    for axis, name in (("aa", "A"), ("bb", "B"), ("cc", "C")):
        up, down = levels(**{name: step}), levels(**{name: -step})
        p2[axis] = {key: (up[key] - down[key]) * MHZ_PER_CM1 / (2 * step) for key in up}
    chi_all = {"aa": -3.0, "bb": 1.2, "cc": 1.8}
    for row in lines.records():
        for end in ("up", "lo"):
            key = (row[f"j_{end}"], row[f"ka_{end}"], row[f"kc_{end}"])
            j = key[0]
            if j == 0:
                expected = 0.0
            else:
                total = sum(p2[g][key] for g in chi_all)
                assert total == pytest.approx(j * (j + 1), rel=1e-6)  # Σ⟨Pg²⟩ = J(J+1) (textbook identity)
                expected = 2.0 / (j * (j + 1)) * sum(chi_all[g] * p2[g][key] for g in chi_all)
            assert row[f"hfs_coupling_{end}_mhz"] == pytest.approx(expected, abs=1e-6)


# --- Plans: hyperfine search intervals, satellites, isotopic fraction, hyperfine blends -----------


def test_search_interval_of_a_hyperfine_target_spans_its_components():
    """[ν + low − r, ν + high + r] with r = kσ + FWHM/2 + margin (scanplan.search_intervals docstring)."""
    request = PlanRequest(88000.0, 89000.0, 300.0, slot_s=1000.0, k_sigma=3.0, margin_mhz=0.05)
    result = make_plan(request, RelativeModel(1e-6), [PlanSpecies(hcn(), 1.0)])
    [target] = [t for t in result.targets if t["j_up"] == 1]
    nu, low, high = target["frequency_mhz"], target["hfs_low_mhz"], target["hfs_high_mhz"]
    assert low < -1.0 and high > 2.0  # the J = 1 ← 0 spread, see the HCN test above
    reach = 3.0 * target["sigma_mhz"] + target["fwhm_mhz"] / 2 + 0.05
    assert_allclose(target["search_lo_mhz"], nu + low - reach, rtol=1e-12)
    assert_allclose(target["search_hi_mhz"], nu + high + reach, rtol=1e-12)
    lo, hi = search_intervals([nu], [target["sigma_mhz"]], [target["fwhm_mhz"] / 2], 3.0, 0.05, low, high)
    assert_allclose([lo[0], hi[0]], [target["search_lo_mhz"], target["search_hi_mhz"]], rtol=1e-12)
    plain = make_plan(request, RelativeModel(1e-6), [PlanSpecies(hcn(hyperfine=False), 1.0)])
    [unsplit] = plain.targets
    assert unsplit["search_hi_mhz"] - unsplit["search_lo_mhz"] == pytest.approx(2 * reach, rel=1e-6)


def test_excluded_satellites_are_left_out_with_their_reason():
    request = PlanRequest(100000.0, 120000.0, 300.0, slot_s=1000.0, include_satellites=False)
    result = make_plan(request, RelativeModel(1e-6), [PlanSpecies(co(), 1.0)])
    assert [t["state"] for t in result.targets] == ["v=0"]
    assert not any(t["satellite"] for t in result.targets)
    [row] = [r for r in result.left_out if r["state"] == "v=1"]
    assert "satellite" in row["reason"] and row["rank"] is None
    assert abs(row["frequency_mhz"] - CO_J1_0_V1_MHZ) < 1.5
    assert result.totals["line_count"] == 1


def test_included_satellites_are_targets_marked_as_satellites():
    request = PlanRequest(100000.0, 120000.0, 300.0, slot_s=1000.0, include_satellites=True)
    result = make_plan(request, RelativeModel(1e-6), [PlanSpecies(co(), 1.0)])
    by_state = {t["state"]: t for t in result.targets}
    assert set(by_state) == {"v=0", "v=1"}
    assert by_state["v=1"]["satellite"] is True
    assert by_state["v=1"]["vib_energy_cm1"] == pytest.approx(CO_V1_CM1, rel=1e-12)
    assert not by_state["v=0"]["satellite"]
    assert all("satellite" not in (r["reason"] or "") for r in result.left_out)


def invented_xy(name="XY", b_mhz=10000.0, hyperfine=None, **extra) -> Species:
    """Invented test data: a linear molecule of 30 u, μ = 1 D, lines at 2B(J+1)."""
    return Species(
        name, "linear", 30.0, (1.0, 0, 0), (State("v=0", 0.0, {"B": (b_mhz, 0.01)}),), hyperfine=hyperfine, **extra
    )


def test_natural_abundance_and_isotopic_fraction_weight_the_signal():
    """RelativeModel: signal = amount × intensity, linear in the amount (measurement.py): it scales by the fraction."""
    request = PlanRequest(15000.0, 65000.0, 10.0, slot_s=100.0)
    model = RelativeModel(1e-6)
    plain = make_plan(request, model, [PlanSpecies(invented_xy(), 2.0)])
    rare_species = invented_xy(natural_abundance=0.01)
    rare = make_plan(request, model, [PlanSpecies(rare_species, 2.0)])
    enriched = make_plan(request, model, [PlanSpecies(rare_species, 2.0, isotopic_fraction=0.5)])
    base = {round(t["frequency_mhz"]): t for t in plain.targets}
    assert len(base) == 3
    for result, fraction in ((rare, 0.01), (enriched, 0.5)):
        for target in result.targets:
            reference = base[round(target["frequency_mhz"])]
            assert_allclose(target["expected_signal"], fraction * reference["expected_signal"], rtol=1e-12)
            assert_allclose(target["time_to_snr_s"], reference["time_to_snr_s"] / fraction**2, rtol=1e-12)
            assert target["isotopic_fraction"] == fraction
            assert target["amount"] == pytest.approx(2.0 * fraction, rel=1e-15)
    assert all(t["isotopic_fraction"] == 1.0 for t in plain.targets)


def test_plan_species_fraction_rules():
    rare = invented_xy(natural_abundance=0.01)
    assert PlanSpecies(rare, 3.0).fraction == 0.01
    assert PlanSpecies(rare, 3.0).effective_amount == pytest.approx(0.03, rel=1e-15)
    assert PlanSpecies(rare, 3.0, isotopic_fraction=0.5).fraction == 0.5
    assert PlanSpecies(invented_xy(), 3.0).fraction == 1.0
    with pytest.raises(ValueError, match="per cent"):
        PlanSpecies(rare, 1.0, isotopic_fraction=1.5)
    with pytest.raises(ValueError):
        PlanSpecies(rare, 1.0, isotopic_fraction=0.0)


def test_lines_whose_hyperfine_spans_overlap_blend_though_their_centres_are_resolved():
    """Invented test data: XY J = 1 ← 0 at 20000 MHz with χaa = −4 MHz spans [19999, 20002] MHz (offsets
    4·Y(1,1,F) = −1, +0.2, +2, textbook identity); ZW's unsplit line at 20001.5 MHz is 1.5 MHz from its
    centre, fifteen times the 0.1 MHz channel, but inside the span."""
    request = PlanRequest(15000.0, 25000.0, 10.0, slot_s=100.0, channel_width_mhz=0.1)
    split = invented_xy(hyperfine=Quadrupole("14N", 1, {"aa": (-4.0, 0.0)}))
    other = invented_xy("ZW", b_mhz=10000.75)
    result = make_plan(request, RelativeModel(1e-6), [PlanSpecies(split, 1.0), PlanSpecies(other, 1.0)])
    by_name = {t["species"]: t for t in result.targets}
    assert by_name["XY"]["hfs_low_mhz"] == pytest.approx(-1.0, abs=1e-12)
    assert by_name["XY"]["hfs_high_mhz"] == pytest.approx(2.0, abs=1e-12)
    assert by_name["ZW"]["frequency_mhz"] - by_name["XY"]["frequency_mhz"] == pytest.approx(1.5, abs=1e-9)
    assert max(request.channel_width_mhz, by_name["XY"]["fwhm_mhz"]) < 0.2
    assert by_name["XY"]["blends"] == ["ZW v=0 1 ← 0 at 20001.5000 MHz"]
    assert by_name["ZW"]["blends"] == ["XY v=0 1 ← 0 at 20000.0000 MHz"]
    unsplit = make_plan(
        request,
        RelativeModel(1e-6),
        [PlanSpecies(dataclasses.replace(split, hyperfine=None), 1.0), PlanSpecies(other, 1.0)],
    )
    assert all(t["blends"] == [] for t in unsplit.targets)
