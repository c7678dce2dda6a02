"""Rigid asymmetric-rotor levels of low J against their closed forms.

For J <= 2 every level of a rigid asymmetric rotor has a closed form in A, B, C
(Gordy & Cook 1984, Ch. 7, closed forms for J <= 2; Townes & Schawlow 1955,
Ch. 4).  The J = 3 closed forms are from memory; the test module checks them
itself against both symmetric-top limits and the trace of the J = 3 matrix
before using them on the engine.

The engine's labels come from Wang-block membership and tau ordering
(labels.py), its energies from diagonalising the blocks (levels.py), so a
match of (Ka, Kc) -> energy tests both, in both representations.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine.labels import all_labels, block_labels, members
from planner.engine.levels import AsymmetricSolver
from planner.engine.species import State

#: Rotational constants [MHz] covering the asymmetry range; synthetic, no source.
#: kappa = (2B - A - C)/(A - C): -0.97 (near prolate), +0.93 (near oblate),
#: 0 (most asymmetric), and one set of non-round numbers (kappa = -0.73).
CONSTANT_SETS = {
    "near-prolate": (10000.0, 3000.0, 2900.0),
    "near-oblate": (5000.0, 4900.0, 2000.0),
    "kappa-zero": (9000.0, 6000.0, 3000.0),
    "generic": (7531.25, 2712.875, 2055.375),
}

#: Matrices of at most 4 x 4 with entries ~1e5 MHz: LAPACK's symmetric eigensolver is
#: backward stable, errors ~ n * 1e-16 * |H| ~ 1e-10 MHz, so 1e-12 relative (plus 1e-9 MHz
#: absolute for the level at zero) leaves a wide margin and still catches any wrong term.
RTOL = 1e-12
ATOL_MHZ = 1e-9


def _rigid_state(a: float, b: float, c: float) -> State:
    return State("v=0", 0.0, {"A": (a, 0.0), "B": (b, 0.0), "C": (c, 0.0)})


def closed_form_j_le_2(a: float, b: float, c: float) -> dict[tuple[int, int, int], float]:
    """Rigid-rotor levels (J, Ka, Kc) -> E [MHz] for J <= 2.

    Gordy & Cook 1984, Ch. 7, closed forms for J <= 2 (also Townes & Schawlow 1955, Ch. 4).
    """
    root = math.sqrt((b - c) ** 2 + (a - c) * (a - b))
    return {
        (0, 0, 0): 0.0,
        (1, 0, 1): b + c,
        (1, 1, 1): a + c,
        (1, 1, 0): a + b,
        (2, 0, 2): 2 * (a + b + c) - 2 * root,
        (2, 2, 0): 2 * (a + b + c) + 2 * root,
        (2, 1, 2): a + b + 4 * c,
        (2, 1, 1): a + 4 * b + c,
        (2, 2, 1): 4 * a + b + c,
    }


def closed_form_j3(a: float, b: float, c: float) -> dict[tuple[int, int, int], float]:
    """Rigid-rotor levels (3, Ka, Kc) -> E [MHz].

    From memory (the J = 3 closed forms of Townes & Schawlow 1955, Ch. 4); checked in
    this module against both symmetric-top limits and the trace before use.
    """
    r_eo = math.sqrt(4 * (b - c) ** 2 + (a - b) * (a - c))
    r_oo = math.sqrt(4 * (a - c) ** 2 - (a - b) * (b - c))
    r_oe = math.sqrt(4 * (a - b) ** 2 + (a - c) * (b - c))
    return {
        (3, 0, 3): 2 * a + 5 * b + 5 * c - 2 * r_eo,
        (3, 2, 1): 2 * a + 5 * b + 5 * c + 2 * r_eo,
        (3, 1, 3): 5 * a + 2 * b + 5 * c - 2 * r_oo,
        (3, 3, 1): 5 * a + 2 * b + 5 * c + 2 * r_oo,
        (3, 1, 2): 5 * a + 5 * b + 2 * c - 2 * r_oe,
        (3, 3, 0): 5 * a + 5 * b + 2 * c + 2 * r_oe,
        (3, 2, 2): 4 * (a + b + c),
    }


def engine_levels(a: float, b: float, c: float, representation: str, j: int) -> dict[tuple[int, int, int], float]:
    levels = AsymmetricSolver(_rigid_state(a, b, c), "A", representation).solve(j)
    result = {(j, int(ka), int(kc)): float(e) for ka, kc, e in zip(levels.ka, levels.kc, levels.energies_mhz)}
    assert len(result) == 2 * j + 1, "a label was handed out twice"
    return result


def _compare(expected: dict, obtained: dict) -> None:
    assert sorted(obtained) == sorted(expected)
    keys = sorted(expected)
    assert_allclose([obtained[k] for k in keys], [expected[k] for k in keys], rtol=RTOL, atol=ATOL_MHZ)


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize("name", list(CONSTANT_SETS))
def test_levels_up_to_j2_match_closed_forms_with_their_labels(name, representation):
    a, b, c = CONSTANT_SETS[name]
    expected = closed_form_j_le_2(a, b, c)
    for j in (0, 1, 2):
        _compare({k: v for k, v in expected.items() if k[0] == j}, engine_levels(a, b, c, representation, j))


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize("name", list(CONSTANT_SETS))
def test_levels_of_j3_match_closed_forms_with_their_labels(name, representation):
    a, b, c = CONSTANT_SETS[name]
    _compare(closed_form_j3(a, b, c), engine_levels(a, b, c, representation, 3))


def test_j1_levels_are_the_textbook_sums_of_two_constants():
    """The PHYSICS.md check: 1_11 = A + C, 1_10 = A + B, 1_01 = B + C, in both representations."""
    a, b, c = CONSTANT_SETS["generic"]
    for representation in ("Ir", "IIIr"):
        levels = engine_levels(a, b, c, representation, 1)
        assert levels[(1, 1, 1)] == pytest.approx(a + c, rel=RTOL)
        assert levels[(1, 1, 0)] == pytest.approx(a + b, rel=RTOL)
        assert levels[(1, 0, 1)] == pytest.approx(b + c, rel=RTOL)


@pytest.mark.parametrize("j", [0, 1, 2, 3])
def test_representations_agree_level_by_level(j):
    """Ir and IIIr are two bases for the same Hamiltonian: each labelled level has one energy."""
    a, b, c = CONSTANT_SETS["generic"]
    ir = engine_levels(a, b, c, "Ir", j)
    iiir = engine_levels(a, b, c, "IIIr", j)
    assert sorted(ir) == sorted((j, ka, kc) for ka, kc in all_labels(j))
    _compare(ir, iiir)


def test_levels_of_one_j_rise_with_tau():
    """Rigid rotor: within one J the energy order is the order of tau = Ka - Kc (Gordy & Cook 1984, Ch. 7)."""
    for a, b, c in CONSTANT_SETS.values():
        for j in range(1, 7):
            levels = engine_levels(a, b, c, "Ir", j)
            by_tau = sorted(levels, key=lambda key: key[1] - key[2])
            assert np.all(np.diff([levels[k] for k in by_tau]) > 0)


# --- checks of the J = 3 reference itself (it is from memory) ---------------------------------


def test_j3_closed_forms_reduce_to_prolate_symmetric_top():
    """B = C: E = B J(J+1) + (A - B) Ka^2 (textbook identity; PHYSICS.md "Linear and symmetric tops")."""
    a, b = 9000.0, 2500.0
    for (j, ka, _), energy in closed_form_j3(a, b, b).items():
        assert energy == pytest.approx(b * j * (j + 1) + (a - b) * ka**2, rel=1e-14)


def test_j3_closed_forms_reduce_to_oblate_symmetric_top():
    """A = B: E = B J(J+1) + (C - B) Kc^2 (textbook identity; PHYSICS.md "Linear and symmetric tops")."""
    b, c = 4000.0, 1500.0
    for (j, _, kc), energy in closed_form_j3(b, b, c).items():
        assert energy == pytest.approx(b * j * (j + 1) + (c - b) * kc**2, rel=1e-14)


def test_j3_closed_forms_sum_to_the_trace():
    """Sum of the 2J+1 levels = trace = (A+B+C) J(J+1)(2J+1)/3 (textbook identity: Tr Jg^2 = J(J+1)(2J+1)/3)."""
    a, b, c = CONSTANT_SETS["generic"]
    assert sum(closed_form_j3(a, b, c).values()) == pytest.approx((a + b + c) * 3 * 4 * 7 / 3, rel=1e-14)


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
def test_closed_form_block_labels_equal_the_membership_definition(representation):
    # Two methods: the closed form used by the solver and the test of every label of J.
    for j in range(0, 31):
        for parity in (0, 1):
            for sign in (1, -1):
                ka, kc = block_labels(j, parity, sign, representation)
                assert list(zip(ka.tolist(), kc.tolist())) == members(j, parity, sign, representation)
