"""Line strengths S from direction-cosine matrix elements.

Asymmetric top: with eigenvectors c (level J) and d (level J′) in the |J,K⟩
basis and M_q[K, K′] = (−1)^(J−K) (J 1 J′; −K q K′),

    S_z = (2J+1)(2J′+1) (cᵀ M_0 d)²
    S_x = (2J+1)(2J′+1) (cᵀ (M_−1 − M_+1)/√2 d)²
    S_y = (2J+1)(2J′+1) (cᵀ (M_−1 + M_+1)/√2 d)²

(Eq. 4 of [2], after Ch. 7 of [1] and Ch. 3 of [3]).  The operators are folded
into the Wang blocks: under K → −K every element picks up ε = (−1)^(J+J′+1)
for z and y and −(−1)^(J+J′+1) for x, so block (p, s) of J meets only block
(p′, s·ε) of J′, with p′ = p for z and 1 − p for x, y.

Symmetric tops and linear molecules use the closed forms
S(J → J+1, K) = ((J+1)² − K²)/(J+1) per K component (Eq. 5 of [2]).

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984.
[2] Linecast physics conventions (shared/PHYSICS.md).
[3] R. N. Zare, *Angular Momentum*, Wiley 1988.
"""

from __future__ import annotations

import numpy as np

from .levels import BlockSolution
from .wigner import three_j_rank1

#: Molecule-fixed axis (x, y, z of the representation) of each principal axis.
PRINCIPAL_TO_REPRESENTATION = {"Ir": {"a": "z", "b": "x", "c": "y"}, "IIIr": {"a": "x", "b": "y", "c": "z"}}
SQRT_HALF = np.sqrt(0.5)


def connected_block(axis: str, delta_j: int, parity: int, sign: int) -> tuple[int, int]:
    """(parity, sign) of the J′ block that ``axis`` connects to block (parity, sign) of J."""
    epsilon = -1 if (delta_j + 1) % 2 else 1  # (−1)^(ΔJ+1)
    if axis == "x":
        epsilon = -epsilon
    return (parity if axis == "z" else 1 - parity), sign * epsilon


def _direction_cosine(j: int, jp: int, k: np.ndarray, q: int) -> np.ndarray:
    """M_q[K, K − q] = (−1)^(J−K) (J 1 J′; −K q K − q), vectorised over K."""
    phase = np.where((j - k) % 2 == 0, 1.0, -1.0)
    return phase * three_j_rank1(j, jp, k, q)


def axis_operator(axis: str, j: int, jp: int, k1: np.ndarray, k2: np.ndarray) -> np.ndarray:
    """Full-basis element ⟨J,K1| O_axis |J′,K2⟩ for arrays K1, K2 (any sign)."""
    k1 = np.asarray(k1)
    k2 = np.asarray(k2)
    if axis == "z":
        return np.where(k2 == k1, _direction_cosine(j, jp, k1, 0), 0.0)
    sign_plus = -1.0 if axis == "x" else 1.0  # x = (M−1 − M+1)/√2, y = (M−1 + M+1)/√2
    lower = np.where(k2 == k1 + 1, _direction_cosine(j, jp, k1, -1), 0.0)
    upper = np.where(k2 == k1 - 1, sign_plus * _direction_cosine(j, jp, k1, 1), 0.0)
    return SQRT_HALF * (lower + upper)


def wang_operator(axis: str, bra: BlockSolution, ket: BlockSolution) -> np.ndarray:
    """Matrix of O_axis between the Wang basis functions of two blocks (n_bra, n_ket).

    Element = 2 N_K1 N_K2 [O(K1, K2) + s2 O(K1, −K2)], N = 1/√2 (K > 0), 1/2 (K = 0).
    """
    k1 = bra.k_values[:, None]
    k2 = ket.k_values[None, :]
    near = np.abs(k1 - k2) <= 1
    value = np.zeros((len(bra.k_values), len(ket.k_values)))
    rows, cols = np.nonzero(near | ((k1 + k2) <= 1))
    a, b = bra.k_values[rows], ket.k_values[cols]
    element = axis_operator(axis, bra.j, ket.j, a, b) + ket.sign * axis_operator(axis, bra.j, ket.j, a, -b)
    norm = np.where(a == 0, 0.5, SQRT_HALF) * np.where(b == 0, 0.5, SQRT_HALF)
    value[rows, cols] = 2.0 * norm * element
    return value


def block_strengths(axis: str, bra: BlockSolution, ket: BlockSolution) -> np.ndarray:
    """S_axis between every level of ``bra`` (rows) and of ``ket`` (columns)."""
    amplitude = bra.vectors.T @ wang_operator(axis, bra, ket) @ ket.vectors
    return (2 * bra.j + 1) * (2 * ket.j + 1) * amplitude**2


def symmetric_top_strength(j_lower: np.ndarray, k: np.ndarray) -> np.ndarray:
    """S(J → J+1, K) = ((J+1)² − K²)/(J+1) per K component [dimensionless]; Eq. 5 of [2]."""
    j1 = np.asarray(j_lower, dtype=float) + 1.0
    return (j1**2 - np.asarray(k, dtype=float) ** 2) / j1
