"""Two independent routes to the same asymmetric-top levels, derivatives and labels.

Route 1 (this module): the full (2J+1) x (2J+1) Hamiltonian built from explicit
angular-momentum matrices in |J,K>, K = -J..J, by matrix products only:
Jz = diag(K), <K+1|J+|K> = sqrt(J(J+1) - K(K+1)), J- = J+^T, J^2 = J(J+1) 1,
Jx^2 - Jy^2 = (J+^2 + J-^2)/2, {P, Q} = PQ + QP (textbook identities, Zare 1988;
Watson 1977 for the operator forms of the A and S reductions).
Route 2 (the engine): closed-form matrix elements folded into Wang blocks.
Both are diagonalised and compared as sorted eigenvalue lists.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg
from numpy.testing import assert_allclose

from planner.engine.labels import all_labels
from planner.engine.levels import AsymmetricSolver, LinearSolver, SymmetricSolver
from planner.engine.species import A_REDUCTION_PARAMETERS, S_REDUCTION_PARAMETERS, State

J_VALUES = range(13)
#: x, y, z constants of each representation (PHYSICS.md: Ir z = a, x = b, y = c; IIIr z = c, x = a, y = b).
AXES = {"Ir": ("B", "C", "A"), "IIIr": ("A", "B", "C")}

#: Typical magnitudes [MHz] of the constants of a ~50 u asymmetric top (common practice, no source).
#: Signs and factors 0.5-1.5 are drawn at random below so that no term can hide behind another.
SCALES = {
    "DeltaJ": 1e-3,
    "DeltaJK": 1e-2,
    "DeltaK": 5e-2,
    "deltaJ": 3e-4,
    "deltaK": 5e-3,
    "PhiJ": 1e-8,
    "PhiJK": 1e-7,
    "PhiKJ": 5e-7,
    "PhiK": 2e-6,
    "phiJ": 5e-9,
    "phiJK": 5e-8,
    "phiK": 5e-7,
    "DJ": 1e-3,
    "DJK": 1e-2,
    "DK": 5e-2,
    "d1": 3e-4,
    "d2": 3e-5,
    "HJ": 1e-8,
    "HJK": 1e-7,
    "HKJ": 5e-7,
    "HK": 2e-6,
    "h1": 5e-9,
    "h2": 2e-9,
    "h3": 5e-10,
}


def random_constants(reduction: str, seed: int) -> dict[str, float]:
    """A, B, C [MHz] of an asymmetric top and every distortion constant nonzero (synthetic, no source)."""
    rng = np.random.default_rng(seed)
    names = A_REDUCTION_PARAMETERS if reduction == "A" else S_REDUCTION_PARAMETERS
    constants = {"A": 9000.0 + 500 * rng.random(), "B": 4000.0 + 200 * rng.random(), "C": 3000.0 + 200 * rng.random()}
    for name in names[3:]:
        constants[name] = SCALES[name] * rng.uniform(0.5, 1.5) * rng.choice([-1.0, 1.0])
    return constants


def _state(constants: dict[str, float]) -> State:
    return State("v=0", 0.0, {name: (value, 0.0) for name, value in constants.items()})


def angular_momentum(j: int):
    """(Jz, J+, J-, J^2) in |J,K>, K = -J..J (textbook identities, Zare 1988)."""
    k = np.arange(-j, j + 1, dtype=float)
    jz = np.diag(k)
    j_plus = np.zeros((2 * j + 1, 2 * j + 1))
    for i in range(2 * j):  # <K+1|J+|K> = sqrt(J(J+1) - K(K+1))
        j_plus[i + 1, i] = math.sqrt(j * (j + 1) - k[i] * (k[i] + 1))
    return jz, j_plus, j_plus.T.copy(), j * (j + 1) * np.eye(2 * j + 1)


def full_hamiltonian(j: int, constants: dict[str, float], reduction: str, representation: str) -> np.ndarray:
    """Watson A- or S-reduced H [MHz] from operator products (operator forms of hamiltonian.py / the brief)."""
    p = {name: 0.0 for name in (A_REDUCTION_PARAMETERS + S_REDUCTION_PARAMETERS)}
    p.update(constants)
    jz, jp, jm, j2 = angular_momentum(j)
    power = np.linalg.matrix_power

    def anticommutator(a, b):
        return a @ b + b @ a

    jz2 = jz @ jz
    jz4 = jz2 @ jz2
    jz6 = jz4 @ jz2
    j4 = j2 @ j2
    j6 = j4 @ j2
    plus_minus2 = jp @ jp + jm @ jm
    jx2_minus_jy2 = plus_minus2 / 2
    jx2 = (j2 - jz2 + jx2_minus_jy2) / 2  # Jx^2 + Jy^2 = J^2 - Jz^2
    jy2 = (j2 - jz2 - jx2_minus_jy2) / 2
    x_name, y_name, z_name = AXES[representation]
    h = p[x_name] * jx2 + p[y_name] * jy2 + p[z_name] * jz2
    if reduction == "A":
        h = h - p["DeltaJ"] * j4 - p["DeltaJK"] * j2 @ jz2 - p["DeltaK"] * jz4
        h = h - 2 * p["deltaJ"] * j2 @ jx2_minus_jy2 - p["deltaK"] * anticommutator(jz2, jx2_minus_jy2)
        h = h + p["PhiJ"] * j6 + p["PhiJK"] * j4 @ jz2 + p["PhiKJ"] * j2 @ jz4 + p["PhiK"] * jz6
        h = h + 2 * p["phiJ"] * j4 @ jx2_minus_jy2 + p["phiJK"] * j2 @ anticommutator(jz2, jx2_minus_jy2)
        h = h + p["phiK"] * anticommutator(jz4, jx2_minus_jy2)
    else:
        plus_minus4 = power(jp, 4) + power(jm, 4)
        plus_minus6 = power(jp, 6) + power(jm, 6)
        h = h - p["DJ"] * j4 - p["DJK"] * j2 @ jz2 - p["DK"] * jz4
        h = h + p["d1"] * j2 @ plus_minus2 + p["d2"] * plus_minus4
        h = h + p["HJ"] * j6 + p["HJK"] * j4 @ jz2 + p["HKJ"] * j2 @ jz4 + p["HK"] * jz6
        h = h + p["h1"] * j4 @ plus_minus2 + p["h2"] * j2 @ plus_minus4 + p["h3"] * plus_minus6
    return h


def _tolerance(energies: np.ndarray) -> float:
    """Both routes are backward-stable eigensolvers on matrices of size n <= 25: errors
    ~ n * 2e-16 * |H| ~ 5e-15 |H|; 1e-12 |H| is a 200-fold margin [MHz]."""
    return 1e-12 * max(1.0, float(np.abs(energies).max()))


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize("reduction", ["A", "S"])
def test_block_energies_equal_full_matrix_eigenvalues(reduction, representation):
    constants = random_constants(reduction, seed=7)
    solver = AsymmetricSolver(_state(constants), reduction, representation)
    for j in J_VALUES:
        expected = np.linalg.eigvalsh(full_hamiltonian(j, constants, reduction, representation))
        obtained = np.sort(solver.solve(j).energies_mhz)
        assert_allclose(obtained, expected, rtol=0, atol=_tolerance(expected), err_msg=f"J = {j}")


@pytest.mark.parametrize("reduction", ["A", "S"])
def test_every_distortion_term_is_visible_above_the_tolerance(reduction):
    """The comparison above can fail for each term: dropping any one constant moves J = 12 levels well past it."""
    constants = random_constants(reduction, seed=7)
    engine = np.sort(AsymmetricSolver(_state(constants), reduction, "Ir").solve(12).energies_mhz)
    for name in constants:
        without = dict(constants, **{name: 0.0})
        shifted = np.linalg.eigvalsh(full_hamiltonian(12, without, reduction, "Ir"))
        assert np.abs(shifted - engine).max() > 100 * _tolerance(engine), name


def test_a_and_s_reductions_coincide_when_their_operator_forms_do():
    """-2 deltaJ J^2 (Jx^2 - Jy^2) = -deltaJ J^2 (J+^2 + J-^2), so with deltaK = phiJK = phiK = 0 and
    d2 = h2 = h3 = 0 the S form with d1 = -deltaJ, h1 = phiJ, DJ = DeltaJ, ... is the same operator
    (textbook identity of the operator forms)."""
    a_constants = random_constants("A", seed=3)
    a_constants.update(deltaK=0.0, phiJK=0.0, phiK=0.0)
    rename = {
        "DeltaJ": "DJ",
        "DeltaJK": "DJK",
        "DeltaK": "DK",
        "PhiJ": "HJ",
        "PhiJK": "HJK",
        "PhiKJ": "HKJ",
        "PhiK": "HK",
    }
    a_only = ("deltaJ", "deltaK", "phiJ", "phiJK", "phiK")
    s_constants = {rename.get(name, name): value for name, value in a_constants.items() if name not in a_only}
    s_constants.update(d1=-a_constants["deltaJ"], h1=a_constants["phiJ"], d2=0.0, h2=0.0, h3=0.0)
    for representation in ("Ir", "IIIr"):
        a_solver = AsymmetricSolver(_state(a_constants), "A", representation)
        s_solver = AsymmetricSolver(_state(s_constants), "S", representation)
        for j in range(0, 21, 4):
            a_levels, s_levels = a_solver.solve(j), s_solver.solve(j)
            assert a_levels.ka.tolist() == s_levels.ka.tolist() and a_levels.kc.tolist() == s_levels.kc.tolist()
            atol = _tolerance(a_levels.energies_mhz)
            assert_allclose(s_levels.energies_mhz, a_levels.energies_mhz, rtol=0, atol=atol)


# --- Hellmann-Feynman derivatives against finite differences -----------------------------------


def _central_difference(make_solver, constants: dict[str, float], names, j: int, derivatives: np.ndarray):
    """dE/dp by central differences, with a step that moves the levels by about 1e-2 MHz.

    Error budget: rounding eps |E| / step ~ 2e-16 * 1e7 / 1e-2 relative to the derivative scale, ~ 2e-7
    at worst; truncation O(step^2 E''') ~ (1e-2 MHz)^2 / (level spacing >= 1 MHz) relative.
    """
    result = np.zeros_like(derivatives)
    for column, name in enumerate(names):
        scale = max(1.0, float(np.abs(derivatives[:, column]).max()))
        step = 1e-2 / scale
        up = make_solver(dict(constants, **{name: constants.get(name, 0.0) + step})).solve(j).energies_mhz
        down = make_solver(dict(constants, **{name: constants.get(name, 0.0) - step})).solve(j).energies_mhz
        result[:, column] = (up - down) / (2 * step)
    return result


def _check_derivatives(make_solver, constants, j_values):
    names = make_solver(constants).parameter_names
    for j in j_values:
        levels = make_solver(constants).solve(j)
        assert levels.derivatives.shape == (len(levels.energies_mhz), len(names))
        numeric = _central_difference(make_solver, constants, names, j, levels.derivatives)
        for column, name in enumerate(names):
            scale = max(1.0, float(np.abs(levels.derivatives[:, column]).max()))
            assert_allclose(
                levels.derivatives[:, column],
                numeric[:, column],
                rtol=1e-5,
                atol=1e-6 * scale,
                err_msg=f"J = {j}, dE/d{name}",
            )


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
@pytest.mark.parametrize("reduction", ["A", "S"])
def test_asymmetric_derivatives_match_finite_differences(reduction, representation):
    constants = random_constants(reduction, seed=11)
    _check_derivatives(lambda c: AsymmetricSolver(_state(c), reduction, representation), constants, (1, 2, 3, 6, 9))


@pytest.mark.parametrize("oblate", [False, True])
def test_symmetric_top_derivatives_match_finite_differences(oblate):
    constants = {
        "A" if not oblate else "C": 9000.0 if not oblate else 1500.0,
        "B": 2500.0,
        "DJ": 1e-3,
        "DJK": 2e-2,
        "DK": 0.1,
        "HJ": 1e-8,
        "HJK": 3e-7,
        "HKJ": -2e-6,
        "HK": 5e-6,
    }
    _check_derivatives(lambda c: SymmetricSolver(_state(c), oblate=oblate), constants, (0, 1, 5, 20))


def test_linear_derivatives_match_finite_differences():
    constants = {"B": 11000.0, "D": 3e-2, "H": 1e-7}
    _check_derivatives(lambda c: LinearSolver(_state(c)), constants, (0, 1, 5, 30))


# --- labels where levels of different symmetry cross ---------------------------------------------

#: Near-prolate top (kappa ~ -0.9997) with sizeable distortion; synthetic, no source.  The
#: deltaJ and deltaK terms shrink the K = 1 asymmetry element (B - C)/4 - deltaJ x - deltaK until
#: it changes sign near J = 31, so that J_{1,J} rises above J_{1,J-1}: two levels of different Wang
#: blocks swap their rigid-rotor order.
CROSSING = {
    "A": 9000.0,
    "B": 2501.0,
    "C": 2500.0,
    "DeltaJ": 1e-3,
    "DeltaJK": 1e-2,
    "DeltaK": 0.5,
    "deltaJ": 2e-4,
    "deltaK": 0.05,
}
J_CROSSING_MAX = 40


def _c2_rotations(j: int):
    """C2 about z and about y, exp(-i pi Jz) and exp(-i pi Jy), in |J,K> (both real matrices)."""
    jz, jp, jm, _ = angular_momentum(j)
    c2_z = np.diag((-1.0) ** np.arange(-j, j + 1))
    c2_y = scipy.linalg.expm(-np.pi / 2 * (jp - jm))  # -i pi Jy with Jy = (J+ - J-)/(2i)
    return c2_z, c2_y


def _full_vector(j: int, k_values: np.ndarray, sign: int, wang_vector: np.ndarray) -> np.ndarray:
    """Wang vector -> |J,K> vector, |K,s> = (|K> + s|-K>)/sqrt(2), |0> alone (PHYSICS.md)."""
    full = np.zeros(2 * j + 1)
    for k, c in zip(k_values, wang_vector):
        if k == 0:
            full[j] += c
        else:
            full[j + k] += c / math.sqrt(2)
            full[j - k] += sign * c / math.sqrt(2)
    return full


def _k1_splitting(levels, j: int) -> float:
    energy = {(int(a), int(c)): e for a, c, e in zip(levels.ka, levels.kc, levels.energies_mhz)}
    return energy[(1, j - 1)] - energy[(1, j)]


def test_k1_doublet_inverts_and_labels_follow_their_block():
    solver = AsymmetricSolver(_state(CROSSING), "A", "Ir")
    rigid = AsymmetricSolver(_state({k: CROSSING[k] for k in "ABC"}), "A", "Ir")
    inverted = []
    for j in range(1, J_CROSSING_MAX + 1):
        levels = solver.solve(j)
        # Every (Ka, Kc) exactly once.
        assert sorted(zip(levels.ka.tolist(), levels.kc.tolist())) == sorted(all_labels(j))
        # First-order perturbation theory with the Delta K = 2 element of PHYSICS.md between K = +1
        # and -1 (f(J, -1) = x): E(J_{1,J-1}) - E(J_{1,J}) = 2x[(B - C)/4 - deltaJ x - deltaK].
        # Neglected: relative corrections ~ ((B - C) x / 4 / (8 (A - B)))^2 < 1e-4 for J <= 40.
        x = j * (j + 1)
        expected = 2 * x * ((CROSSING["B"] - CROSSING["C"]) / 4 - CROSSING["deltaJ"] * x - CROSSING["deltaK"])
        assert_allclose(_k1_splitting(levels, j), expected, rtol=1e-3, atol=1e-3)
        if _k1_splitting(levels, j) < 0 < _k1_splitting(rigid.solve(j), j):
            inverted.append(j)

        # Labels from the eigenvectors alone: Ka is the dominant |K| (a near-prolate top is nearly
        # pure in K), and the C2 characters fix the parities: (-1)^Ka about a (= z in Ir) and
        # (-1)^Kc about c (= y in Ir) (PHYSICS.md; Gordy & Cook 1984, Ch. 7).
        c2_z, c2_y = _c2_rotations(j)
        for block in levels.blocks:
            for n in range(len(block.energies_mhz)):
                vector = _full_vector(j, block.k_values, block.sign, block.vectors[:, n])
                ka = int(levels.ka[block.first_level + n])
                kc = int(levels.kc[block.first_level + n])
                assert block.k_values[np.argmax(np.abs(block.vectors[:, n]))] == ka
                assert vector @ c2_z @ vector == pytest.approx((-1) ** ka, abs=1e-9)
                assert vector @ c2_y @ vector == pytest.approx((-1) ** kc, abs=1e-9)
    # The scan must actually contain the crossing for the label checks to mean anything.
    assert inverted and inverted[0] > 25 and inverted[-1] == J_CROSSING_MAX
