"""Limits: asymmetric top -> symmetric top -> linear molecule.

With B = C (Ir) the Watson Hamiltonians with all delta/phi (A) or d/h (S)
constants zero are diagonal in |J,K> and equal the prolate symmetric-top
energies with Ka = K; with A = B (IIIr) they equal the oblate ones with Kc = K.
The distortion constants map one to one (textbook identity of the operator
forms, Watson 1977): DeltaJ = DJ, DeltaJK = DJK, DeltaK = DK, PhiJ = HJ,
PhiJK = HJK, PhiKJ = HKJ, PhiK = HK.  A symmetric top's K = 0 stack is a
linear molecule with B, D = DJ, H = HJ.
"""

from __future__ import annotations

from collections import defaultdict

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine import PredictionRequest, Species, State, predict
from planner.engine.labels import all_labels
from planner.engine.levels import AsymmetricSolver, LinearSolver, SymmetricSolver

#: Symmetric-top constants [MHz]: synthetic, physically sized (a ~50 u prolate top), no source.
SYMMETRIC = {
    "B": 2500.0,
    "DJ": 1.2e-3,
    "DJK": 2.1e-2,
    "DK": 0.11,
    "HJ": 1.3e-8,
    "HJK": 3.1e-7,
    "HKJ": -2.2e-6,
    "HK": 5.3e-6,
}
A_PROLATE_MHZ = 9000.0
C_OBLATE_MHZ = 1500.0
#: Symmetric-top name -> A-reduction name (textbook identity, see module docstring).
TO_A_REDUCTION = {
    "DJ": "DeltaJ",
    "DJK": "DeltaJK",
    "DK": "DeltaK",
    "HJ": "PhiJ",
    "HJK": "PhiJK",
    "HKJ": "PhiKJ",
    "HK": "PhiK",
}
J_MAX = 30

#: Same energies by two routes; the asymmetric route diagonalises blocks of size <= 16
#: with entries up to ~1e7 MHz (J = 30), eigh errors ~ 1e-16 * 16 * |H| ~ 1e-8 MHz:
#: 1e-12 relative plus 1e-7 MHz absolute.
RTOL = 1e-12
ATOL_MHZ = 1e-7


def _state(**constants: float) -> State:
    return State("v=0", 0.0, {name: (value, 0.0) for name, value in constants.items()})


def _distortion(reduction: str) -> dict[str, float]:
    names = TO_A_REDUCTION if reduction == "A" else {name: name for name in TO_A_REDUCTION}
    return {names[name]: SYMMETRIC[name] for name in TO_A_REDUCTION}


def _check_limit(asymmetric: AsymmetricSolver, symmetric: SymmetricSolver, k_label: str) -> None:
    for j in range(J_MAX + 1):
        levels = asymmetric.solve(j)
        top = symmetric.solve(j)
        k = levels.ka if k_label == "ka" else levels.kc
        # Each K > 0 appears twice (the K-doublet), K = 0 once.
        assert np.bincount(k, minlength=j + 1).tolist() == [1] + [2] * j
        assert sorted(zip(levels.ka.tolist(), levels.kc.tolist())) == sorted(all_labels(j))
        assert_allclose(levels.energies_mhz, top.energies_mhz[k], rtol=RTOL, atol=ATOL_MHZ)


@pytest.mark.parametrize("reduction", ["A", "S"])
def test_prolate_limit_of_asymmetric_top_is_symmetric_top_with_ka_as_k(reduction):
    b = SYMMETRIC["B"]
    asymmetric = AsymmetricSolver(_state(A=A_PROLATE_MHZ, B=b, C=b, **_distortion(reduction)), reduction, "Ir")
    symmetric = SymmetricSolver(_state(A=A_PROLATE_MHZ, **SYMMETRIC), oblate=False)
    _check_limit(asymmetric, symmetric, "ka")


@pytest.mark.parametrize("reduction", ["A", "S"])
def test_oblate_limit_of_asymmetric_top_is_symmetric_top_with_kc_as_k(reduction):
    b = SYMMETRIC["B"]
    asymmetric = AsymmetricSolver(_state(A=b, B=b, C=C_OBLATE_MHZ, **_distortion(reduction)), reduction, "IIIr")
    symmetric = SymmetricSolver(_state(C=C_OBLATE_MHZ, **SYMMETRIC), oblate=True)
    _check_limit(asymmetric, symmetric, "kc")


def test_symmetric_top_k0_levels_are_the_linear_molecule_levels():
    """K = 0 of E(J,K) is B x - DJ x^2 + HJ x^3, the linear-molecule form (textbook identity, PHYSICS.md)."""
    linear = LinearSolver(_state(B=SYMMETRIC["B"], D=SYMMETRIC["DJ"], H=SYMMETRIC["HJ"]))
    for oblate, top_constant in ((False, {"A": A_PROLATE_MHZ}), (True, {"C": C_OBLATE_MHZ})):
        symmetric = SymmetricSolver(_state(**top_constant, **SYMMETRIC), oblate=oblate)
        for j in (0, 1, 5, 40, 300):
            # Same polynomial evaluated two ways: rounding only.
            assert_allclose(symmetric.solve(j).energies_mhz[0], linear.solve(j).energies_mhz[0], rtol=1e-13)


# --- the same limit through predict() ---------------------------------------------------------

#: Near-prolate asymmetric top with (B + C)/2 equal to the symmetric top's B and
#: B - C = 1e-3 MHz; synthetic constants, no source.
SPLIT_MHZ = 1e-3
TEMPERATURE_K = 20.0
WINDOW_MHZ = (1000.0, 60000.0)  # R-branch lines J = 0..11; K-doublet Q-branch lines fall below 1000 MHz
DIPOLE_A_DEBYE = 1.5


def _prolate_pair() -> tuple[Species, Species]:
    b = SYMMETRIC["B"]
    quartic = {name: SYMMETRIC[name] for name in ("DJ", "DJK", "DK")}
    symmetric = Species(
        "prolate",
        "symmetric-prolate",
        50.0,
        (DIPOLE_A_DEBYE, 0.0, 0.0),
        (State("v=0", 0.0, {"A": (A_PROLATE_MHZ, 0.0), "B": (b, 0.0), **{k: (v, 0.0) for k, v in quartic.items()}}),),
    )
    asymmetric_constants = {"A": A_PROLATE_MHZ, "B": b + SPLIT_MHZ / 2, "C": b - SPLIT_MHZ / 2}
    asymmetric_constants.update({TO_A_REDUCTION[k]: v for k, v in quartic.items()})
    asymmetric = Species(
        "near-prolate",
        "asymmetric",
        50.0,
        (DIPOLE_A_DEBYE, 0.0, 0.0),
        (State("v=0", 0.0, {k: (v, 0.0) for k, v in asymmetric_constants.items()}),),
    )
    return symmetric, asymmetric


def test_near_prolate_asymmetric_lines_sum_to_symmetric_top_lines():
    symmetric, asymmetric = _prolate_pair()
    request = PredictionRequest(*WINDOW_MHZ, TEMPERATURE_K, relative_floor=1e-12)
    top = predict(symmetric, request)
    near = predict(asymmetric, request)

    # Q(T): the symmetric code counts each K > 0 twice, the asymmetric code has both doublet
    # levels, shifted by about +-(B - C) x / 4; the first order cancels between the two, the
    # rest is O(((B - C) x / kT)^2) < 1e-12.
    assert_allclose(near.partition_function["near-prolate"], top.partition_function["prolate"], rtol=1e-10)

    lines = near.lines
    assert np.all(lines["j_up"] == lines["j_lo"] + 1)
    # Delta Ka = +-2 lines carry S ~ ((B - C)/(A - B))^2 ~ 1e-14: below the floor.
    assert np.all(lines["ka_up"] == lines["ka_lo"])
    grouped = defaultdict(list)
    for row in lines.records():
        grouped[(row["j_lo"], row["ka_lo"])].append(row)
    expected = {(row["j_lo"], row["ka_lo"]): row for row in top.lines.records()}
    assert sorted(grouped) == sorted(expected)
    for key, rows in grouped.items():
        reference = expected[key]
        k = key[1]
        assert len(rows) == (1 if k == 0 else 2)
        # The K = 1 doublet components sit at +-(B - C)(J + 1)/2 around the symmetric-top
        # line (first-order perturbation); their mean and every higher K are off by O((B-C)^2).
        mean = np.mean([r["frequency_mhz"] for r in rows])
        assert_allclose(mean, reference["frequency_mhz"], rtol=0, atol=1e-6)
        for r in rows:
            # Each component carries the symmetric-top S of one K component (PHYSICS.md), up to
            # the mixing of K with K +- 2, whose effect on S is O(((B - C)/(A - B))^2) ~ 1e-14.
            assert_allclose(r["line_strength"], reference["line_strength"], rtol=1e-9)
        # Intensities: the symmetric code puts the K-degeneracy 2 into the line weight,
        # the asymmetric code has two lines; the sums agree up to the Boltzmann factors of
        # the doublet shifts +-(B - C) x / 4, whose first order cancels in the sum (< 1e-12 left).
        assert_allclose(sum(r["intensity_nm2mhz"] for r in rows), reference["intensity_nm2mhz"], rtol=1e-9)
        # Einstein A of each component: nu^3 changes by 3 (B - C)(J + 1)/(2 nu) ~ 3e-7 at K = 1.
        for r in rows:
            assert_allclose(r["einstein_a_s"], reference["einstein_a_s"], rtol=1e-6)
