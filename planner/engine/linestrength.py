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

from .hamiltonian import wang_pair_matrix
from .levels import BlockSolution
from .wigner import clebsch_gordan_rank1

#: Molecule-fixed axis (x, y, z of the representation) of each principal axis.
PRINCIPAL_TO_REPRESENTATION = {"Ir": {"a": "z", "b": "x", "c": "y"}, "IIIr": {"a": "x", "b": "y", "c": "z"}}
SQRT_HALF = np.sqrt(0.5)


def connected_block(axis: str, delta_j: int, parity: int, sign: int) -> tuple[int, int]:
    """(parity, sign) of the J′ block that ``axis`` connects to block (parity, sign) of J."""
    epsilon = -1 if (delta_j + 1) % 2 else 1  # (−1)^(ΔJ+1)
    if axis == "x":
        epsilon = -epsilon
    return (parity if axis == "z" else 1 - parity), sign * epsilon


def direction_cosine(j: int, jp: int, k: np.ndarray, q: int) -> np.ndarray:
    """M_q[K, K − q] = (−1)^(J−K) (J 1 J′; −K q K − q), vectorised over K [dimensionless].

    With the phase of Eq. 2.19 of [3] folded in this is
    (−1)^(1+q) ⟨J −K; 1 q | J′ −K+q⟩ / √(2J′+1).
    """
    sign = -1.0 if q == 0 else 1.0
    return sign * clebsch_gordan_rank1(j, -np.asarray(k), q, jp) / np.sqrt(2 * jp + 1)


def full_axis_operator(axis: str, j: int, jp: int) -> np.ndarray:
    """Dense ⟨J,K|O_axis|J′,K′⟩ over K = −J..J, K′ = −J′..J′ (rows, columns).

    z: M_0; x: (M_−1 − M_+1)/√2; y: (M_−1 + M_+1)/√2 (Eq. 4 of [2]).
    """
    k = np.arange(-j, j + 1)
    operator = np.zeros((2 * j + 1, 2 * jp + 1))
    if axis == "z":
        terms = ((0, 1.0),)
    else:
        terms = ((-1, SQRT_HALF), (1, (-SQRT_HALF if axis == "x" else SQRT_HALF)))
    for q, factor in terms:
        kp = k - q
        valid = np.abs(kp) <= jp
        operator[(k + j)[valid], (kp + jp)[valid]] = factor * direction_cosine(j, jp, k[valid], q)
    return operator


def wang_operator(axis: str, bra: BlockSolution, ket: BlockSolution) -> np.ndarray:
    """Matrix of O_axis between the Wang basis functions of two connected blocks (n_bra, n_ket)."""
    return wang_pair_matrix(full_axis_operator(axis, bra.j, ket.j), bra.index, ket.index)


def wang_operator_stack(rung, other, pairs, size: int) -> np.ndarray:
    """Wang-basis operator matrices of many block pairs of J and J′ at once, zero padded.

    ``pairs`` holds (bra block, ket block, _, axis) with blocks indexed in
    ``rung.blocks`` and ``other.blocks``.  Returns (n_pairs, size, size) with the
    same elements as :func:`wang_operator`: inside the blocks O(K1, K2) joins
    K2 = K1 (z) or K2 = K1 ± 1 (x, y), scaled by 1/√2 at K = 0, plus the
    s2·O(K1, −K2) term that only reaches K1 + K2 ≤ 1.
    """
    j, jp = rung.j, other.j
    bras = [rung.blocks[p[0]] for p in pairs]
    kets = [other.blocks[p[1]] for p in pairs]
    first_bra = np.array([int(b.k_values[0]) for b in bras])[:, None]
    first_ket = np.array([int(b.k_values[0]) for b in kets])[:, None]
    size_bra = np.array([len(b.k_values) for b in bras])[:, None]
    size_ket = np.array([len(b.k_values) for b in kets])[:, None]
    sign_ket = np.array([b.sign for b in kets], dtype=float)[:, None]
    axis = np.array([p[3] for p in pairs])[:, None]
    row = np.broadcast_to(np.arange(size), (len(pairs), size))
    k1 = first_bra + 2 * row
    stack = np.zeros((len(pairs), size, size))
    # ⟨K1|O|K1 + d⟩ = factor(q) · M_q(K1) with q = −d.
    factors = {0: np.where(axis == "z", 1.0, 0.0)}
    factors[-1] = np.where(axis == "z", 0.0, SQRT_HALF)  # d = +1
    factors[1] = np.where(axis == "x", -SQRT_HALF, np.where(axis == "y", SQRT_HALF, 0.0))  # d = −1
    cosine = {q: direction_cosine(j, jp, np.arange(j + 1), q) for q in (-1, 0, 1)}
    for q, factor in factors.items():
        k2 = k1 - q
        col = (k2 - first_ket) // 2
        valid = (row < size_bra) & (k2 >= first_ket) & (col < size_ket) & (k1 <= j) & (factor != 0)
        value = factor * cosine[q][np.clip(k1, 0, j)]
        # The s2·O(K1, −K2) term: at K1 = 1, K2 = 0 it doubles the element; at K1 = 0, K2 = 1 it adds O(0, −1).
        value = np.where((k1 == 1) & (k2 == 0), 2.0 * value, value)
        if q == -1:
            value = np.where((k1 == 0) & (k2 == 1), value + sign_ket * factors[1] * cosine[1][0], value)
        scale = np.where(k1 == 0, SQRT_HALF, 1.0) * np.where(k2 == 0, SQRT_HALF, 1.0)
        if q == 0:
            scale = np.where(k1 == 0, 1.0, scale)  # K1 = K2 = 0: O(0,0) + O(0,0) scaled by 1/2
        which, rows = np.nonzero(valid)
        stack[which, rows, col[which, rows]] = (value * scale)[which, rows]
    return stack


def block_strengths(axis: str, bra: BlockSolution, ket: BlockSolution) -> np.ndarray:
    """S_axis between every level of ``bra`` (rows) and of ``ket`` (columns)."""
    amplitude = bra.vectors.T @ wang_operator(axis, bra, ket) @ ket.vectors
    return (2 * bra.j + 1) * (2 * ket.j + 1) * amplitude**2


def symmetric_top_strength(j_lower: np.ndarray, k: np.ndarray) -> np.ndarray:
    """S(J → J+1, K) = ((J+1)² − K²)/(J+1) per K component [dimensionless]; Eq. 5 of [2]."""
    j1 = np.asarray(j_lower, dtype=float) + 1.0
    return (j1**2 - np.asarray(k, dtype=float) ** 2) / j1
