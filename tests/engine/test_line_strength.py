"""Line strengths: 3j symbols, the sum rule, the Wang-block connection table, selection rules.

The independent route here builds the direction-cosine matrices in the full
|J,K> basis from a Racah-formula 3j symbol written with math.factorial, and
expands the engine's Wang-block eigenvectors into that basis (PHYSICS.md:
|K,s> = (|K> + s|-K>)/sqrt(2), K = 0 alone).  It then needs neither
wigner.py, nor the Wang folding of linestrength.py, nor its connection table.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine import PredictionRequest, Species, State, predict
from planner.engine.levels import AsymmetricSolver
from planner.engine.linestrength import block_strengths, connected_block, symmetric_top_strength
from planner.engine.wigner import three_j_rank1

#: Asymmetric top with some distortion [MHz]; synthetic, no source (kappa = -0.6).
CONSTANTS = {
    "A": 9000.0,
    "B": 4000.0,
    "C": 2750.0,
    "DeltaJ": 1.1e-3,
    "DeltaJK": -6e-3,
    "DeltaK": 4e-2,
    "deltaJ": 3e-4,
    "deltaK": 2e-3,
}
AXES = ("z", "x", "y")


def _state(constants: dict[str, float]) -> State:
    return State("v=0", 0.0, {name: (value, 0.0) for name, value in constants.items()})


def racah_3j(j1: int, j2: int, j3: int, m1: int, m2: int, m3: int) -> float:
    """Wigner 3j symbol by the Racah formula (Edmonds 1957, Eq. 3.7.3; Zare 1988, Ch. 2)."""
    if m1 + m2 + m3 != 0 or not abs(j1 - j2) <= j3 <= j1 + j2:
        return 0.0
    if abs(m1) > j1 or abs(m2) > j2 or abs(m3) > j3:
        return 0.0
    f = math.factorial
    triangle = f(j1 + j2 - j3) * f(j1 - j2 + j3) * f(-j1 + j2 + j3) / f(j1 + j2 + j3 + 1)
    root = math.sqrt(triangle * f(j1 + m1) * f(j1 - m1) * f(j2 + m2) * f(j2 - m2) * f(j3 + m3) * f(j3 - m3))
    total = 0.0
    for k in range(max(0, j2 - j3 - m1, j1 - j3 + m2), min(j1 + j2 - j3, j1 - m1, j2 + m2) + 1):
        total += (-1) ** k / (
            f(k) * f(j3 - j2 + k + m1) * f(j3 - j1 + k - m2) * f(j1 + j2 - j3 - k) * f(j1 - k - m1) * f(j2 - k + m2)
        )
    return (-1) ** (j1 - j2 - m3) * root * total


def test_racah_helper_reproduces_the_j_j_0_closed_form():
    """(j j 0; m -m 0) = (-1)^(j-m)/sqrt(2j+1) (textbook identity, Edmonds 1957, Ch. 3)."""
    for j in range(6):
        for m in range(-j, j + 1):
            assert racah_3j(j, j, 0, m, -m, 0) == pytest.approx((-1) ** (j - m) / math.sqrt(2 * j + 1), rel=1e-14)


def test_three_j_rank1_matches_racah_formula():
    for j in range(0, 11):
        k = np.arange(-j, j + 1)
        for jp in (j - 1, j, j + 1):
            if jp < 0:
                continue
            for q in (-1, 0, 1):
                expected = [racah_3j(j, 1, jp, -int(kk), q, int(kk) - q) for kk in k]
                # Closed forms vs factorial sums of integers below 25!: both accurate to ~1e-15.
                assert_allclose(
                    three_j_rank1(j, jp, k, q), expected, rtol=1e-12, atol=1e-14, err_msg=f"J={j}, J'={jp}, q={q}"
                )


# --- independent full-basis direction cosines ----------------------------------------------------


def full_basis_operator(axis: str, j: int, jp: int) -> np.ndarray:
    """<J,K|O_axis|J',K'> for K = -J..J (rows), K' = -J'..J' (columns), PHYSICS.md "Line strengths"."""

    def m_q(q):
        m = np.zeros((2 * j + 1, 2 * jp + 1))
        for i, k in enumerate(range(-j, j + 1)):
            kp = k - q
            if abs(kp) <= jp:
                m[i, kp + jp] = (-1) ** (j - k) * racah_3j(j, 1, jp, -k, q, kp)
        return m

    if axis == "z":
        return m_q(0)
    sign = -1.0 if axis == "x" else 1.0
    return (m_q(-1) + sign * m_q(1)) / math.sqrt(2)


def full_vectors(block) -> np.ndarray:
    """Columns: the block's eigenvectors expanded in |J,K>, K = -J..J."""
    j = block.j
    expansion = np.zeros((2 * j + 1, len(block.k_values)))
    for i, k in enumerate(block.k_values):
        if k == 0:
            expansion[j, i] = 1.0
        else:
            expansion[j + k, i] = 1 / math.sqrt(2)
            expansion[j - k, i] = block.sign / math.sqrt(2)
    return expansion @ block.vectors


def _solve(representation: str, j_max: int):
    solver = AsymmetricSolver(_state(CONSTANTS), "A", representation)
    return {j: solver.solve(j) for j in range(j_max + 1)}


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
def test_block_strengths_match_full_basis_and_only_connected_blocks_couple(representation):
    levels = _solve(representation, 7)
    for j in range(0, 7):
        for delta_j in (-1, 0, 1):
            jp = j + delta_j
            if jp < 0:
                continue
            for axis in AXES:
                operator = full_basis_operator(axis, j, jp)
                for bra in levels[j].blocks:
                    for ket in levels[jp].blocks:
                        amplitude = full_vectors(bra).T @ operator @ full_vectors(ket)
                        full_strength = (2 * j + 1) * (2 * jp + 1) * amplitude**2
                        where = f"{axis}, J={j} {bra.parity, bra.sign} -> J'={jp} {ket.parity, ket.sign}"
                        if connected_block(axis, delta_j, bra.parity, bra.sign) == (ket.parity, ket.sign):
                            # Same sums of products of numbers O(1): rounding only.
                            assert_allclose(
                                block_strengths(axis, bra, ket), full_strength, rtol=1e-10, atol=1e-12, err_msg=where
                            )
                        else:
                            # The connection table is right: every other block pair has no strength.
                            assert np.abs(full_strength).max(initial=0.0) < 1e-24, where


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize("axis", AXES)
def test_sum_rule_over_all_upper_and_lower_partners(representation, axis):
    """Sum over J' = J-1, J, J+1 and all tau' of S_g = 2J + 1 for every level (PHYSICS.md; 3j orthogonality,
    Edmonds 1957, Ch. 3)."""
    levels = _solve(representation, 9)
    for j in range(0, 9):
        for bra in levels[j].blocks:
            total = np.zeros(len(bra.energies_mhz))
            for delta_j in (-1, 0, 1):
                if j + delta_j < 0:
                    continue
                wanted = connected_block(axis, delta_j, bra.parity, bra.sign)
                for ket in levels[j + delta_j].blocks:
                    if (ket.parity, ket.sign) == wanted:
                        total += block_strengths(axis, bra, ket).sum(axis=1)
            # Sums of at most 3 x 9 terms O(2J+1): rounding ~1e-14 (2J+1).
            assert_allclose(total, 2 * j + 1, rtol=1e-12, err_msg=f"J={j} block {bra.parity, bra.sign}")


# --- prolate limit: symmetric-top strengths ---------------------------------------------------------


def test_prolate_limit_strengths_are_symmetric_top_strengths():
    """B = C, a-axis (z in Ir) dipole; per K component (PHYSICS.md "Linear and symmetric tops"; Gordy & Cook 1984):
    S(J -> J+1) = ((J+1)^2 - K^2)/(J+1), S(J -> J) = K^2 (2J+1)/(J(J+1)), S(J -> J-1) = (J^2 - K^2)/J."""
    solver = AsymmetricSolver(_state({"A": 9000.0, "B": 2500.0, "C": 2500.0}), "A", "Ir")
    levels = {j: solver.solve(j) for j in range(0, 12)}
    for j in range(0, 11):
        per_delta = {}
        for delta_j in (-1, 0, 1):
            if j + delta_j < 0:
                continue
            per_level = np.zeros(len(levels[j].energies_mhz))
            for bra in levels[j].blocks:
                wanted = connected_block("z", delta_j, bra.parity, bra.sign)
                for ket in levels[j + delta_j].blocks:
                    if (ket.parity, ket.sign) == wanted:
                        rows = slice(bra.first_level, bra.first_level + len(bra.energies_mhz))
                        per_level[rows] += block_strengths("z", bra, ket).sum(axis=1)
            per_delta[delta_j] = per_level
        k = levels[j].ka.astype(float)
        # Exact limit, same 3j values by two formulas: rounding only.
        assert_allclose(per_delta[1], ((j + 1) ** 2 - k**2) / (j + 1), rtol=1e-12)
        assert_allclose(per_delta[1], symmetric_top_strength(np.full(len(k), j), k), rtol=1e-12)
        if j > 0:
            assert_allclose(per_delta[0], k**2 * (2 * j + 1) / (j * (j + 1)), rtol=1e-12, atol=1e-12)
            assert_allclose(per_delta[-1], (j**2 - k**2) / j, rtol=1e-12, atol=1e-12)


# --- selection rules and axis assignment seen through predict() ------------------------------------

#: Parities (Ka mod 2, Kc mod 2) each dipole type joins (PHYSICS.md; Gordy & Cook 1984, Ch. 7).
ALLOWED = {
    "a": {frozenset({(0, 0), (0, 1)}), frozenset({(1, 1), (1, 0)})},
    "b": {frozenset({(0, 0), (1, 1)}), frozenset({(0, 1), (1, 0)})},
    "c": {frozenset({(0, 0), (1, 0)}), frozenset({(0, 1), (1, 1)})},
}


def _species(dipole, representation: str, constants=None) -> Species:
    constants = constants or CONSTANTS
    return Species(
        "top",
        "asymmetric",
        60.0,
        dipole,
        (State("v=0", 0.0, {k: (v, 0.0) for k, v in constants.items()}),),
        representation=representation,
    )


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
def test_predicted_lines_obey_the_parity_selection_rules(representation):
    prediction = predict(_species((1.0, 0.8, 0.6), representation), PredictionRequest(0.0, 80000.0, 10.0))
    lines = prediction.lines
    assert set(lines["dipole_type"]) == {"a", "b", "c"}
    assert set((lines["j_up"] - lines["j_lo"]).tolist()) == {-1, 0, 1}
    for row in prediction.records():
        pair = frozenset({(row["ka_up"] % 2, row["kc_up"] % 2), (row["ka_lo"] % 2, row["kc_lo"] % 2)})
        assert pair in ALLOWED[row["dipole_type"]], row


#: Rigid rotor [MHz], synthetic, no source: the three J = 1 levels lie apart (B + C, A + C, A + B).
RIGID = {"A": 9000.0, "B": 4000.0, "C": 2750.0}


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize(
    "dipole, upper, frequency",
    [
        ((1.0, 0.0, 0.0), (1, 0, 1), RIGID["B"] + RIGID["C"]),
        ((0.0, 1.0, 0.0), (1, 1, 1), RIGID["A"] + RIGID["C"]),
        ((0.0, 0.0, 1.0), (1, 1, 0), RIGID["A"] + RIGID["B"]),
    ],
)
def test_each_dipole_axis_reaches_its_own_j1_level_from_000(representation, dipole, upper, frequency):
    """From 0_00: a-type -> 1_01, b-type -> 1_11, c-type -> 1_10, S = 1 each (sum rule with one partner,
    PHYSICS.md; textbook, Gordy & Cook 1984, Ch. 7).  Checks the x/y assignment of b and c."""
    prediction = predict(_species(dipole, representation, RIGID), PredictionRequest(0.0, 14000.0, 5.0))
    rows = [r for r in prediction.records() if (r["j_lo"], r["ka_lo"], r["kc_lo"]) == (0, 0, 0)]
    assert len(rows) == 1
    row = rows[0]
    assert (row["j_up"], row["ka_up"], row["kc_up"]) == upper
    assert row["dipole_type"] == "abc"[dipole.index(1.0)]
    assert row["frequency_mhz"] == pytest.approx(frequency, rel=1e-12)
    assert row["line_strength"] == pytest.approx(1.0, rel=1e-12)


def test_rigid_rotor_lines_do_not_depend_on_the_representation():
    """Ir and IIIr are two bases for the same rigid-rotor Hamiltonian and dipole: the same lines, with the
    same labels, frequencies, strengths and intensities (textbook identity)."""
    request = PredictionRequest(0.0, 80000.0, 10.0)
    tables = {}
    for representation in ("Ir", "IIIr"):
        records = predict(_species((1.0, 0.8, 0.6), representation, RIGID), request).records()
        tables[representation] = {
            (r["j_up"], r["ka_up"], r["kc_up"], r["j_lo"], r["ka_lo"], r["kc_lo"], r["dipole_type"]): r for r in records
        }
    assert len(tables["Ir"]) > 1000
    assert tables["Ir"].keys() == tables["IIIr"].keys()
    keys = sorted(tables["Ir"])
    # Different matrices with the same eigenvalues: level energies (up to ~1e6 MHz here) agree to
    # rounding, ~1e-16 |E| * block size, so frequencies to 1e-8 MHz absolute (low-frequency lines are
    # differences of large energies); S and intensities to ~1e-12 relative.
    for column, rtol, atol in (
        ("frequency_mhz", 1e-12, 1e-8),
        ("line_strength", 1e-10, 0.0),
        ("intensity_nm2mhz", 1e-10, 0.0),
    ):
        ir = [tables["Ir"][k][column] for k in keys]
        iiir = [tables["IIIr"][k][column] for k in keys]
        assert_allclose(iiir, ir, rtol=rtol, atol=atol, err_msg=column)


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize("c2_axis", ["a", "b", "c"])
def test_every_wang_block_has_one_c2_symmetry(representation, c2_axis):
    """transitions.py skips block pairs by one spin weight per block; that needs every level of a
    Wang block to share its C2 character (Gordy & Cook 1984, Ch. 7: the four Wang blocks are the
    four symmetry species of the D2 group)."""
    from planner.engine.labels import spin_symmetry_even

    solver = AsymmetricSolver(_state({"A": 9000.0, "B": 3100.0, "C": 2500.0}), "A", representation)
    for j in range(0, 15):
        levels = solver.solve(j)
        for block in levels.blocks:
            rows = slice(block.first_level, block.first_level + len(block.energies_mhz))
            even = spin_symmetry_even(levels.ka[rows], levels.kc[rows], c2_axis)
            assert even.all() or not even.any(), f"J={j} block {block.parity, block.sign}"
