"""Quadrupole hyperfine structure of planner/engine/hyperfine.py: Casimir function, couplings, 6j, components.

Every expected number is labelled "textbook identity" (an exact consequence of
angular-momentum algebra, worked by hand from the formulas of W. Gordy and
R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984, Ch. 9, and
A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton 1957, Ch. 6
and Table 5) or "from memory" (a measured value recalled, not looked up).
"""

from __future__ import annotations

import math
import time
from fractions import Fraction

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine import hyperfine
from planner.engine.hyperfine import (
    DEFAULT_SPREAD_FRACTION,
    casimir_y,
    expectation_p_squared_linear,
    expectation_p_squared_symmetric,
    level_shift_mhz,
    line_components,
    quadrupole_coupling_mhz,
    spread_mhz,
    wigner_6j,
)

#: Nuclear spins covered by the invariant tests: ¹⁴N, ³⁵Cl, ¹⁷O, ⁷⁹Br-like up to 9/2, and 7 [dimensionless].
SPINS = (1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5, 7)

#: HCN ground state, J = 1 ← 0: eQq(¹⁴N) [MHz] (from memory).
HCN_EQQ_MHZ = -4.7091
#: HCN J = 1 ← 0 components {(F_up, F_lo): frequency [MHz]} (measured, from memory).
HCN_J1_0_MHZ = {(1, 1): 88630.4157, (2, 1): 88631.8473, (0, 1): 88633.9360}


def _lines(j_lo_max: int):
    """(J_up, J_lo) of every dipole line with J_lo ≤ j_lo_max: ΔJ = −1, 0, +1, not 0 ← 0."""
    for j_lo in range(j_lo_max + 1):
        for delta in (-1, 0, 1):
            j_up = j_lo + delta
            if j_up >= 0 and not (j_up == 0 and j_lo == 0):
                yield j_up, j_lo


# --- Casimir function -----------------------------------------------------------------------------


def test_casimir_function_for_j1_i1():
    """Y(1, 1, F) = 1/2, −1/4, 1/20 for F = 0, 1, 2 (textbook identity: C = −4, −2, 2 in Eq. (1))."""
    assert_allclose(casimir_y(1, 1, [0, 1, 2]), [0.5, -0.25, 0.05], rtol=1e-14)


def test_casimir_function_for_j1_i3_2():
    """Y(1, 3/2, F) = 1/4, −1/5, 1/20 for F = 1/2, 3/2, 5/2 (textbook identity: C = −5, −2, 3)."""
    assert_allclose(casimir_y(1, 1.5, [0.5, 1.5, 2.5]), [0.25, -0.2, 0.05], rtol=1e-14)


def test_casimir_function_is_zero_for_j0():
    """A J = 0 level has the single sublevel F = I and no shift (textbook identity)."""
    for spin in SPINS:
        assert casimir_y(0, spin, spin) == 0.0


@pytest.mark.parametrize("spin", SPINS)
def test_casimir_function_has_no_centre_of_gravity_shift(spin):
    """Σ_F (2F+1) Y(J, I, F) = 0 for every J (textbook identity: the quadrupole operator is traceless)."""
    for j in (1, 2, 3, 7, 40, 200):
        f = np.arange(abs(j - spin), j + spin + 0.5)
        assert abs(np.sum((2 * f + 1) * casimir_y(j, spin, f))) < 1e-11 * (2 * j + 1) * (2 * spin + 1)


def test_casimir_function_broadcasts_j_against_f():
    """A column of J against a row of F gives the table of Y (textbook identity: element by element)."""
    table = casimir_y(np.array([[2], [3]]), 1, np.array([[2, 3]]))
    assert table.shape == (2, 2)
    assert_allclose(table[1, 0], casimir_y(3, 1, 2), rtol=1e-15)
    assert casimir_y(np.array([], dtype=int), 1, np.array([])).shape == (0,)


# --- Effective coupling of a level ----------------------------------------------------------------


def test_linear_molecule_coupling_is_minus_eqq_at_every_j():
    """Linear molecule: X_J = χbb + χcc = −eQq, so E_Q = −eQq·Y (textbook identity, Gordy & Cook 1984 Ch. 9)."""
    j = np.arange(1, 60)
    pa2, pb2, pc2 = expectation_p_squared_linear(j)
    chi = (HCN_EQQ_MHZ, -HCN_EQQ_MHZ / 2, -HCN_EQQ_MHZ / 2)
    assert_allclose(quadrupole_coupling_mhz(j, pa2, pb2, pc2, *chi), -HCN_EQQ_MHZ, rtol=1e-14)


@pytest.mark.parametrize("axis", ["a", "c"])
def test_symmetric_top_coupling_is_eqq_times_3k2_over_jj_minus_1(axis):
    """Symmetric top, nucleus on the axis: X = eQq [3K²/(J(J+1)) − 1] (textbook identity, Gordy & Cook 1984 Ch. 9)."""
    eqq = -4.3  # any value; a CH3CN-like ¹⁴N coupling on the axis [MHz]
    j, k = np.meshgrid(np.arange(1, 30), np.arange(0, 30))
    j, k = j[k <= j], k[k <= j]
    chi = {"a": (eqq, -eqq / 2, -eqq / 2), "c": (-eqq / 2, -eqq / 2, eqq)}[axis]
    coupling = quadrupole_coupling_mhz(j, *expectation_p_squared_symmetric(j, k, axis), *chi)
    assert_allclose(coupling, eqq * (3 * k**2 / (j * (j + 1)) - 1), rtol=1e-13, atol=1e-14)


def test_symmetric_top_with_k_equal_j_large_approaches_twice_eqq():
    """K = J → ∞ gives X → 2 eQq (textbook identity: 3J²/(J(J+1)) − 1 → 2)."""
    coupling = quadrupole_coupling_mhz(1000, *expectation_p_squared_symmetric(1000, 1000, "a"), 1.0, -0.5, -0.5)
    assert_allclose(coupling, 3 * 1000 / 1001 - 1, rtol=1e-14)


def test_p_squared_components_sum_to_j_j_plus_1():
    """⟨Pa²⟩ + ⟨Pb²⟩ + ⟨Pc²⟩ = J(J+1) for any level (textbook identity)."""
    j = np.arange(0, 20)
    assert_allclose(sum(expectation_p_squared_linear(j)), j * (j + 1), rtol=1e-15)
    assert_allclose(sum(expectation_p_squared_symmetric(j, j // 2, "c")), j * (j + 1), rtol=1e-15)


def test_j0_level_has_zero_coupling_and_zero_shift():
    """J = 0: X = 0 and E_Q(F = I) = 0 (textbook identity)."""
    assert quadrupole_coupling_mhz(0, 0.0, 0.0, 0.0, 2.0, -1.0, -1.0) == 0.0
    assert level_shift_mhz(0, 1.5, 1.5, 37.0) == 0.0


def test_level_shift_is_coupling_times_casimir_function():
    """E_Q(F) = X_J·Y(J, I, F) (textbook identity, Gordy & Cook 1984 Ch. 9)."""
    assert_allclose(level_shift_mhz(2, 1.5, [0.5, 1.5, 2.5, 3.5], 3.0), 3.0 * casimir_y(2, 1.5, [0.5, 1.5, 2.5, 3.5]))


def test_coupling_that_is_not_traceless_raises():
    """χaa + χbb + χcc = 0 (textbook identity: Laplace's equation for the field gradient)."""
    with pytest.raises(ValueError, match="traceless"):
        quadrupole_coupling_mhz(1, 0.0, 1.0, 1.0, -4.7, 2.35, 2.36)


def test_trace_tolerance_can_be_widened_for_rounded_published_values():
    """A rounded set off by 5 kHz passes with a 0.01 MHz tolerance (invented test data)."""
    coupling = quadrupole_coupling_mhz(1, 0.0, 1.0, 1.0, -4.7, 2.35, 2.355, trace_tolerance_mhz=0.01)
    assert_allclose(coupling, 4.705, rtol=1e-14)


def test_p_squared_that_do_not_add_up_to_j_j_plus_1_raise():
    with pytest.raises(ValueError, match="pa2 \\+ pb2 \\+ pc2"):
        quadrupole_coupling_mhz(2, 1.0, 1.0, 1.0, 1.0, -0.5, -0.5)


# --- Wigner 6j symbols ----------------------------------------------------------------------------


def test_six_j_all_ones():
    """{1 1 1; 1 1 1} = 1/6 (textbook identity: Edmonds 1957 Table 5, {a b c; 1 c b} with a = b = c = 1)."""
    assert_allclose(wigner_6j(1, 1, 1, 1, 1, 1), 1 / 6, rtol=1e-15)


@pytest.mark.parametrize(
    ("a", "b", "c"),
    [
        (0, 0, 0),
        (1, 1, 1),
        (0.5, 0.5, 1),
        (2, 1.5, 0.5),
        (3, 7, 5),
        (4.5, 100, 102.5),
        (199, 200, 1),
        (200, 150.5, 100.5),
    ],
)
def test_six_j_with_a_zero(a, b, c):
    """{a b c; 0 c b} = (−1)^(a+b+c)/√((2b+1)(2c+1)) (textbook identity, Edmonds 1957 Eq. 6.3.2)."""
    expected = (-1) ** round(a + b + c) / math.sqrt((2 * b + 1) * (2 * c + 1))
    assert_allclose(wigner_6j(a, b, c, 0, c, b), expected, rtol=1e-14)


@pytest.mark.parametrize(
    ("a", "b", "c", "d", "e", "e_prime"),
    [
        (1, 2, 1, 2, 2, 2),
        (1, 2, 1, 2, 2, 3),
        (1.5, 2, 2.5, 3, 1.5, 2.5),
        (4.5, 30, 4, 29.5, 26, 27),
        (4.5, 30, 4, 29.5, 27, 27),
    ],
)
def test_six_j_orthogonality(a, b, c, d, e, e_prime):
    """Σ_x (2x+1)(2e+1) {a b x; c d e}{a b x; c d e′} = δ_ee′ (textbook identity, Edmonds 1957 Ch. 6)."""
    x_values = np.arange(abs(a - b), a + b + 0.5)
    total = sum(
        (2 * x + 1) * (2 * e + 1) * wigner_6j(a, b, x, c, d, e) * wigner_6j(a, b, x, c, d, e_prime) for x in x_values
    )
    assert_allclose(total, 1.0 if e == e_prime else 0.0, atol=1e-13)


def test_six_j_symmetries():
    """Invariant under column permutations and under swapping upper and lower in two columns (textbook identity)."""
    rng = np.random.default_rng(7)
    checked = 0
    while checked < 200:
        j = [int(v) / 2 for v in rng.integers(0, 16, size=6)]
        value = wigner_6j(*j)
        if value == 0.0:
            continue
        checked += 1
        top, bottom = j[:3], j[3:]
        for order in ((1, 0, 2), (2, 1, 0), (0, 2, 1), (1, 2, 0), (2, 0, 1)):
            permuted = [top[k] for k in order] + [bottom[k] for k in order]
            assert_allclose(wigner_6j(*permuted), value, rtol=1e-13)
        swapped = [bottom[0], bottom[1], top[2], top[0], top[1], bottom[2]]
        assert_allclose(wigner_6j(*swapped), value, rtol=1e-13)


def test_six_j_is_zero_when_a_triangle_fails():
    """(1, 1, 3) and (1, 1, 1.5) are not triangles (textbook identity)."""
    assert wigner_6j(1, 1, 3, 1, 1, 1) == 0.0
    assert wigner_6j(1, 1, 1.5, 1, 1, 1) == 0.0


def test_six_j_takes_exact_fractions():
    """Fraction(3, 2) and 1.5 are the same argument (textbook identity)."""
    assert wigner_6j(Fraction(3, 2), 1, Fraction(1, 2), 1, Fraction(1, 2), 1) == wigner_6j(1.5, 1, 0.5, 1, 0.5, 1)


def test_racah_formula_agrees_with_the_closed_forms_used_for_the_line_tables():
    """Racah's sum (Eq. 6.3.7) and the rank-1 closed forms (Table 5) of Edmonds 1957: two methods agree."""
    rng = np.random.default_rng(3)
    cases = [(a, b, c) for a in range(2, 10) for b in range(0, 24) for c in range(0, 24)]
    cases += [(int(rng.integers(2, 10)), int(rng.integers(300, 401)), int(rng.integers(300, 401))) for _ in range(200)]
    for two_a, two_b, two_c in cases:
        for dc in (-1, 0, 1):
            for db in (-1, 0, 1):
                if two_c + 2 * dc < 0 or two_b + 2 * db < 0:
                    continue
                closed = hyperfine._six_j_rank1(two_a, two_b, two_c, dc, db)
                racah = wigner_6j(two_a / 2, two_b / 2, two_c / 2, 1, two_c / 2 + dc, two_b / 2 + db)
                assert abs(closed - racah) <= 1e-14 * max(abs(racah), 1e-3), (two_a, two_b, two_c, dc, db)


def test_six_j_bad_arguments_raise():
    with pytest.raises(ValueError, match="j3"):
        wigner_6j(1, 1, 0.3, 1, 1, 1)
    with pytest.raises(ValueError, match="j5"):
        wigner_6j(1, 1, 1, 1, -1, 1)


# --- Components of one line -----------------------------------------------------------------------


@pytest.mark.parametrize("spin", SPINS)
def test_relative_intensities_sum_to_one(spin):
    """Σ s(F_up, F_lo) = 1 for every line, ΔJ = −1, 0, +1 (textbook identity: 6j orthogonality)."""
    for j_up, j_lo in [*_lines(25), (100, 99), (100, 100), (99, 100), (200, 199), (200, 200)]:
        components = line_components(j_up, j_lo, spin, 1.0, -0.5)
        assert_allclose(components.relative_intensity.sum(), 1.0, rtol=1e-13)


def test_j1_0_with_i1_has_three_components_in_ratio_1_3_5():
    """J = 1 ← 0, I = 1: F′ = 0, 1, 2 with 1/9, 3/9, 5/9 (textbook identity: ∝ 2F′+1 when J_lo = 0)."""
    components = line_components(1, 0, 1, 1.0, 0.0)
    strengths = dict(zip(components.f_up, components.relative_intensity))
    assert sorted(strengths) == [0, 1, 2]
    assert_allclose([strengths[0], strengths[1], strengths[2]], [1 / 9, 3 / 9, 5 / 9], rtol=1e-14)
    assert set(components.f_lo) == {1.0}


@pytest.mark.parametrize("spin", SPINS)
def test_from_a_j0_level_each_component_goes_as_2f_plus_1(spin):
    """J = 1 ← 0: s = (2F′+1)/(3(2I+1)) (textbook identity: {0 I I; F′ 1 1}² = 1/(3(2I+1)))."""
    components = line_components(1, 0, spin, 1.0, 0.0)
    assert_allclose(components.relative_intensity, (2 * components.f_up + 1) / (3 * (2 * spin + 1)), rtol=1e-13)


#: J = 2 ← 1, I = 1: {(F_up, F_lo): (6j {J_lo F_lo I; F_up J_up 1}, fraction s)} (textbook identity: the closed
#: forms of Edmonds 1957 Table 5 evaluated by hand, e.g. {1 2 1; 3 2 1} = {1 2 3; 1 2 1} = [6·7·3·4/(3·4·5·5·6·7)]^½
#: = 1/5, so s = 7·5/(25·3) = 7/15; {1 1 1; 2 2 1} = −1/√20, s = 1/4; {1 0 1; 1 2 1} = 1/3, s = 1/9).
J2_1_I1 = {
    (3, 2): (1 / 5, 7 / 15),
    (2, 1): (-1 / math.sqrt(20), 1 / 4),
    (1, 0): (1 / 3, 1 / 9),
    (2, 2): (-1 / 10, 1 / 12),
    (1, 1): (1 / 6, 1 / 12),
    (1, 2): (1 / 30, 1 / 180),
}


def test_j2_1_with_i1_has_the_six_textbook_components():
    """The six ΔF = 0, ±1 components of J = 2 ← 1, I = 1 and their fractions (textbook identity, table above)."""
    components = line_components(2, 1, 1, 1.0, -0.5)
    found = {(int(u), int(lo)): s for u, lo, s in zip(components.f_up, components.f_lo, components.relative_intensity)}
    assert set(found) == set(J2_1_I1)
    for (f_up, f_lo), (six_j, fraction) in J2_1_I1.items():
        assert_allclose(wigner_6j(1, f_lo, 1, f_up, 2, 1), six_j, rtol=1e-14)
        assert_allclose(found[(f_up, f_lo)], fraction, rtol=1e-14)


@pytest.mark.parametrize(("j_up", "j_lo", "spin"), [(1, 0, 1), (2, 1, 1.5), (3, 3, 2.5), (5, 6, 4.5), (1, 1, 1)])
def test_components_obey_delta_f_rules(j_up, j_lo, spin):
    """|ΔF| ≤ 1, F within |J − I| … J + I, and never F = 0 ↔ F = 0 (textbook identity)."""
    c = line_components(j_up, j_lo, spin, 2.0, 1.0)
    assert np.all(np.abs(c.f_up - c.f_lo) <= 1)
    assert np.all((c.f_up >= abs(j_up - spin)) & (c.f_up <= j_up + spin))
    assert np.all((c.f_lo >= abs(j_lo - spin)) & (c.f_lo <= j_lo + spin))
    assert not np.any((c.f_up == 0) & (c.f_lo == 0))
    assert np.all(np.diff(c.offset_mhz) >= 0)


def test_components_have_no_weighted_mean_offset():
    """Σ s·Δν = 0: the unsplit line is the intensity-weighted centre (textbook identity for a J_lo = 0 line)."""
    c = line_components(1, 0, 1.5, 23.0, 0.0)
    assert abs(np.sum(c.relative_intensity * c.offset_mhz)) < 1e-13


def test_hcn_j1_0_offsets_follow_the_casimir_function():
    """F=0←1 − F=1←1 = 0.75|eQq| and F=2←1 − F=1←1 = 0.3|eQq| (textbook identity from Y(1, 1, F))."""
    c = line_components(1, 0, 1, -HCN_EQQ_MHZ, 0.0)
    offset = {int(f): v for f, v in zip(c.f_up, c.offset_mhz)}
    assert_allclose(offset[0] - offset[1], 0.75 * abs(HCN_EQQ_MHZ), rtol=1e-14)
    assert_allclose(offset[2] - offset[1], 0.3 * abs(HCN_EQQ_MHZ), rtol=1e-14)


def test_hcn_j1_0_pattern_matches_the_measured_components():
    """HCN J = 1 ← 0 from eQq(¹⁴N) within 0.03 MHz of the measured lines (both from memory; spin–rotation neglected)."""
    c = line_components(1, 0, 1, -HCN_EQQ_MHZ, 0.0)
    predicted = {(int(u), int(lo)): (v, s) for u, lo, v, s in zip(c.f_up, c.f_lo, c.offset_mhz, c.relative_intensity)}
    assert set(predicted) == set(HCN_J1_0_MHZ)
    # The unsplit line is the strength-weighted mean of the measured components (test above).
    centre = sum(predicted[key][1] * nu for key, nu in HCN_J1_0_MHZ.items())
    for key, nu in HCN_J1_0_MHZ.items():
        assert abs(centre + predicted[key][0] - nu) < 0.03
    measured_1, measured_2, measured_0 = HCN_J1_0_MHZ[(1, 1)], HCN_J1_0_MHZ[(2, 1)], HCN_J1_0_MHZ[(0, 1)]
    assert abs((predicted[(0, 1)][0] - predicted[(1, 1)][0]) - (measured_0 - measured_1)) < 0.03
    assert abs((predicted[(2, 1)][0] - predicted[(1, 1)][0]) - (measured_2 - measured_1)) < 0.03


def test_no_coupling_means_no_splitting():
    """X_up = X_lo = 0: every component sits on the unsplit line (textbook identity)."""
    c = line_components(4, 3, 2.5, 0.0, 0.0)
    assert np.all(c.offset_mhz == 0.0)


# --- Spread of many lines -------------------------------------------------------------------------


def _random_lines(rng, n, j_max):
    j_lo = rng.integers(0, j_max + 1, size=n)
    j_up = j_lo + rng.integers(-1, 2, size=n)
    fix = (j_up < 0) | ((j_up == 0) & (j_lo == 0))
    j_up[fix] = j_lo[fix] + 1
    return j_up, j_lo, rng.normal(0.0, 3.0, size=n), rng.normal(0.0, 3.0, size=n)


@pytest.mark.parametrize("spin", [1, 1.5, 4.5])
@pytest.mark.parametrize("min_fraction", [0.0, DEFAULT_SPREAD_FRACTION, 0.1])
def test_spread_agrees_with_line_components(spin, min_fraction):
    """Lowest and highest counted offset equal those from line_components, line by line (two methods agree)."""
    rng = np.random.default_rng(11)
    j_up, j_lo, x_up, x_lo = _random_lines(rng, 300, 30)
    low, high = spread_mhz(j_up, j_lo, spin, x_up, x_lo, min_fraction=min_fraction)
    for k in range(j_up.size):
        c = line_components(j_up[k], j_lo[k], spin, x_up[k], x_lo[k])
        counted = c.relative_intensity >= min_fraction - 1e-12  # 1/10 may be stored as 0.0999…
        counted[np.argmax(c.relative_intensity)] = True
        assert_allclose(low[k], c.offset_mhz[counted].min(), rtol=1e-13, atol=1e-13)
        assert_allclose(high[k], c.offset_mhz[counted].max(), rtol=1e-13, atol=1e-13)


def test_spread_without_coupling_is_zero_and_keeps_the_shape():
    """No coupling: both ends 0; a 2-D input keeps its shape; an empty input gives empty arrays (textbook identity)."""
    j_lo = np.array([[0, 1], [2, 3]])
    low, high = spread_mhz(j_lo + 1, j_lo, 1, 0.0, 0.0)
    assert low.shape == high.shape == (2, 2)
    assert np.all(low == 0.0) and np.all(high == 0.0)
    empty = np.array([], dtype=int)
    low, high = spread_mhz(empty, empty, 1, empty, empty)
    assert low.shape == high.shape == (0,)


def test_spread_of_one_sided_pattern():
    """J = 1 ← 0 with X = 1 MHz: offsets −1/4, 1/20, 1/2 MHz, so (−0.25, 0.5) (textbook identity from Y(1, 1, F))."""
    low, high = spread_mhz(np.array([1]), np.array([0]), 1, np.array([1.0]), np.array([0.0]))
    assert_allclose([low[0], high[0]], [-0.25, 0.5], rtol=1e-14)


def test_spread_with_min_fraction_one_keeps_only_the_strongest_component():
    """J = 1 ← 0, I = 1: the strongest is F = 2 ← 1 at X·Y(1, 1, 2) = X/20 (textbook identity)."""
    low, high = spread_mhz(np.array([1]), np.array([0]), 1, np.array([2.0]), np.array([0.0]), min_fraction=1.0)
    assert_allclose([low[0], high[0]], [0.1, 0.1], rtol=1e-14)


def test_spread_of_fifty_thousand_lines_is_fast():
    """50 000 lines, J ≤ 100, I = 9/2, cold caches, well under 0.5 s (regression: about 0.07 s when written)."""
    hyperfine._component_table.cache_clear()
    rng = np.random.default_rng(5)
    j_up, j_lo, x_up, x_lo = _random_lines(rng, 50_000, 100)
    start = time.perf_counter()
    low, high = spread_mhz(j_up, j_lo, 4.5, x_up, x_lo)
    elapsed = time.perf_counter() - start
    assert elapsed < 0.5
    assert np.all(low <= high)


# --- Bad input ------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("call", "message"),
    [
        (lambda: casimir_y(1, 0.5, 1), "spin_i must be a nuclear spin I >= 1"),
        (lambda: casimir_y(1, 0, 1), "spin_i must be a nuclear spin I >= 1"),
        (lambda: casimir_y(1, 1.3, 1), "spin_i must be a multiple of 1/2"),
        (lambda: casimir_y(-1, 1, 1), "j must be >= 0"),
        (lambda: casimir_y(1.5, 1, 1.5), "j must hold whole numbers"),
        (lambda: casimir_y(1, 1, 3), "f must be one of"),
        (lambda: casimir_y(1, 1, 1.5), "f must be one of"),
        (lambda: line_components(3, 1, 1, 1.0, 1.0), "j_up - j_lo must be -1, 0 or \\+1"),
        (lambda: line_components(0, 0, 1, 1.0, 1.0), "j_up = j_lo = 0"),
        (lambda: line_components(-1, 0, 1, 1.0, 1.0), "j_up must be a whole number >= 0"),
        (lambda: line_components(1, 0, 0.5, 1.0, 1.0), "spin_i"),
        (lambda: line_components(1, 0, 2.25, 1.0, 1.0), "spin_i must be a multiple of 1/2"),
        (lambda: line_components(1, 0, 1, float("nan"), 1.0), "coupling_up_mhz must be a finite number"),
        (lambda: spread_mhz(np.array([3]), np.array([1]), 1, 1.0, 1.0), "j_up - j_lo must be -1, 0 or \\+1"),
        (lambda: spread_mhz(np.array([0]), np.array([0]), 1, 1.0, 1.0), "j_up = j_lo = 0"),
        (lambda: spread_mhz(np.array([1]), np.array([-1]), 1, 1.0, 1.0), "j_lo must be >= 0"),
        (lambda: spread_mhz(np.array([1]), np.array([0]), 1, 1.0, 1.0, min_fraction=1.5), "min_fraction"),
        (lambda: spread_mhz(np.array([1, 2]), np.array([0, 1, 2]), 1, 1.0, 1.0), "broadcast"),
        (
            lambda: spread_mhz(np.array([1]), np.array([0]), 1, np.array([np.nan]), 1.0),
            "coupling_up_mhz must be finite",
        ),
        (lambda: expectation_p_squared_symmetric(2, 3, "a"), "\\|K\\| <= J"),
        (lambda: expectation_p_squared_symmetric(2, 1, "b"), "axis must be 'a'"),
        (lambda: quadrupole_coupling_mhz(1, -1.0, 1.5, 1.5, 1.0, -0.5, -0.5), "pa2 must be >= 0"),
        (lambda: quadrupole_coupling_mhz(1, 0.0, 1.0, 1.0, 1.0, -0.5, -0.5, trace_tolerance_mhz=-1), "trace_tolerance"),
    ],
)
def test_bad_input_raises_a_clear_value_error(call, message):
    with pytest.raises(ValueError, match=message):
        call()
