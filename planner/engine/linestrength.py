"""Line strengths S from direction-cosine matrix elements.

Asymmetric top: with eigenvectors c (level J) and d (level J′) in the |J,K⟩
basis and M_q[K, K′] = (−1)^(J−K) (J 1 J′; −K q K′),

    S_z = (2J+1)(2J′+1) (cᵀ M_0 d)²
    S_x = (2J+1)(2J′+1) (cᵀ (M_−1 − M_+1)/√2 d)²
    S_y = (2J+1)(2J′+1) (cᵀ (M_−1 + M_+1)/√2 d)²

([2], "Line strengths", after Ch. 7 of [1] and Ch. 3 of [3]).  The operators are folded
into the Wang blocks: under K → −K every element picks up ε = (−1)^(J+J′+1)
for z and y and −(−1)^(J+J′+1) for x, so block (p, s) of J meets only block
(p′, s·ε) of J′, with p′ = p for z and 1 − p for x, y.

Symmetric tops and linear molecules use the closed forms
S(J → J+1, K) = ((J+1)² − K²)/(J+1) per K component ([2], "Linear and symmetric tops").

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984.
[2] Linecast physics conventions (shared/PHYSICS.md).
[3] R. N. Zare, *Angular Momentum*, Wiley 1988.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from .hamiltonian import wang_pair_matrix
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


def direction_cosine(j: int, jp: int, k: np.ndarray, q: int) -> np.ndarray:
    """M_q[K, K − q] = (−1)^(J−K) (J 1 J′; −K q K − q), vectorised over K [dimensionless]."""
    k = np.asarray(k)
    return np.where((j - k) % 2 == 0, 1.0, -1.0) * three_j_rank1(j, jp, k, q)


def full_axis_operator(axis: str, j: int, jp: int) -> np.ndarray:
    """Dense ⟨J,K|O_axis|J′,K′⟩ over K = −J..J, K′ = −J′..J′ (rows, columns).

    z: M_0; x: (M_−1 − M_+1)/√2; y: (M_−1 + M_+1)/√2 ([2], "Line strengths").
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
    """Matrix of O_axis between the Wang basis functions of two connected blocks (n_bra, n_ket).

    Raises ValueError for blocks that the axis does not connect (the matrix is zero there).
    """
    if connected_block(axis, ket.j - bra.j, bra.parity, bra.sign) != (ket.parity, ket.sign):
        raise ValueError(
            f"axis {axis} does not connect block (parity {bra.parity}, sign {bra.sign:+d}) of J={bra.j} "
            f"with block (parity {ket.parity}, sign {ket.sign:+d}) of J={ket.j}"
        )
    return wang_pair_matrix(full_axis_operator(axis, bra.j, ket.j), bra.index, ket.index)


@lru_cache(maxsize=1024)
def _cosines(j: int, jp: int) -> dict[int, np.ndarray]:
    """M_q(K) for K = 0..J and q = −1, 0, 1 (small; depends on J and J′ only)."""
    k = np.arange(j + 1)
    return {q: direction_cosine(j, jp, k, q) for q in (-1, 0, 1)}


#: (q, axes that use it, factor per axis) of ⟨K1|O|K1 − q⟩ = factor · M_q(K1).
_Q_TERMS = ((0, {"z": 1.0}), (-1, {"x": SQRT_HALF, "y": SQRT_HALF}), (1, {"x": -SQRT_HALF, "y": SQRT_HALF}))


def wang_operator_terms(bras, kets, axes, size: int) -> list[tuple[np.ndarray, ...]]:
    """Non-zero Wang-basis operator elements of many connected block pairs at once.

    ``bras[n]`` and ``kets[n]`` are the BlockSolutions of pair n (any J, J′) and
    ``axes[n]`` its representation axis.  Returns up to three (pair, row,
    column, value) arrays, each with at most one element per (pair, row), with
    the same elements as :func:`wang_operator`: inside the blocks O(K1, K2) joins
    K2 = K1 (z) or K2 = K1 ± 1 (x, y), scaled by 1/√2 at K = 0, plus the
    s2·O(K1, −K2) term that only reaches K1 + K2 ≤ 1.
    """
    # Direction cosines of every (J, J′) met, one padded row each.
    j_pairs = sorted({(bra.j, ket.j) for bra, ket in zip(bras, kets)})
    row_of = {jj: n for n, jj in enumerate(j_pairs)}
    width = max(j for j, _ in j_pairs) + 1
    table = {q: np.zeros((len(j_pairs), width)) for q in (-1, 0, 1)}
    for n, (j, jp) in enumerate(j_pairs):
        for q, values in _cosines(j, jp).items():
            table[q][n, : j + 1] = values
    cosine_row = np.array([row_of[bra.j, ket.j] for bra, ket in zip(bras, kets)])
    first_bra = np.array([int(b.k_values[0]) for b in bras])
    first_ket = np.array([int(b.k_values[0]) for b in kets])
    size_bra = np.array([len(b.k_values) for b in bras])
    size_ket = np.array([len(b.k_values) for b in kets])
    row = np.arange(size)[None, :]
    terms = []
    for q, factors in _Q_TERMS:
        chosen = np.array([n for n, axis in enumerate(axes) if axis in factors], dtype=np.intp)
        if not len(chosen):
            continue
        k1 = first_bra[chosen, None] + 2 * row
        col = (k1 - q - first_ket[chosen, None]) // 2
        valid = (row < size_bra[chosen, None]) & (col >= 0) & (col < size_ket[chosen, None])
        which, rows = np.nonzero(valid)
        k1, cols = k1[which, rows], col[which, rows]
        which = chosen[which]
        factor = np.array([factors[axis] if axis in factors else 0.0 for axis in axes])[which]
        value = factor * table[q][cosine_row[which], k1]
        # Elements that touch K = 0 (few): the Wang normalisation and the O(K1, −K2) term.
        k2 = k1 - q
        for at in np.nonzero((k1 == 0) | (k2 == 0))[0]:
            if q == 1:  # K1 = 1, K2 = 0: O(1,0) + O(1,−0), scaled by 1/√2
                value[at] *= np.sqrt(2.0)
            elif q == -1:  # K1 = 0, K2 = 1: (O(0,1) + s2·O(0,−1))/√2
                pair = which[at]
                o_minus = _Q_TERMS[2][1][axes[pair]] * table[1][cosine_row[pair], 0]
                value[at] = (value[at] + kets[pair].sign * o_minus) * SQRT_HALF
            # q = 0, K1 = K2 = 0: (O(0,0) + O(0,0))/2 leaves O(0,0).
        terms.append((which, rows, cols, value))
    return terms


def wang_operator_stack(bras, kets, axes, size: int) -> np.ndarray:
    """The terms of :func:`wang_operator_terms` as dense zero-padded matrices (n_pairs, size, size)."""
    stack = np.zeros((len(bras), size, size))
    for which, rows, cols, values in wang_operator_terms(bras, kets, axes, size):
        stack[which, rows, cols] += values
    return stack


def block_strengths(axis: str, bra: BlockSolution, ket: BlockSolution) -> np.ndarray:
    """S_axis between every level of ``bra`` (rows) and of ``ket`` (columns)."""
    amplitude = bra.vectors.T @ wang_operator(axis, bra, ket) @ ket.vectors
    return (2 * bra.j + 1) * (2 * ket.j + 1) * amplitude**2


def symmetric_top_strength(j_lower: np.ndarray, k: np.ndarray) -> np.ndarray:
    """S(J → J+1, K) = ((J+1)² − K²)/(J+1) per K component [dimensionless]; [2], "Linear and symmetric tops"."""
    j1 = np.asarray(j_lower, dtype=float) + 1.0
    return (j1**2 - np.asarray(k, dtype=float) ** 2) / j1
