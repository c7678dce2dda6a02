"""Allowed transitions of one state's ladder inside a frequency window.

Returns index pairs into the ladder's flattened level arrays, with the line
strength and the principal axis (a, b, c) of the dipole component.

Selection rules: ΔJ = 0, ±1.  Asymmetric tops follow from the direction
cosines (a-type ee↔eo, oo↔oe; b-type ee↔oo, eo↔oe; c-type ee↔oe, eo↔oo in
Ka Kc parities, Gordy & Cook 1984, Ch. 7); they appear here as the Wang
block pairs that the operator connects.  Symmetric tops and linear molecules:
ΔJ = +1, ΔK = 0 along the symmetry axis (ΔJ = 0, ΔK = 0 joins a level with
itself).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .ladder import StateLadder
from .levels import BlockSolution, JLevels
from .linestrength import PRINCIPAL_TO_REPRESENTATION, connected_block, symmetric_top_strength, wang_operator_stack

#: Strengths below this are numerical zeros of the direction-cosine products.
STRENGTH_EPSILON = 1e-12


@dataclass
class TransitionSet:
    lower: np.ndarray  # index of the lower level in the ladder's flat arrays
    upper: np.ndarray
    strength: np.ndarray  # S of the carrying dipole component
    axis: np.ndarray  # 0, 1, 2 for a, b, c

    @classmethod
    def join(cls, parts: list["TransitionSet"]) -> "TransitionSet":
        if not parts:
            return cls(np.zeros(0, int), np.zeros(0, int), np.zeros(0), np.zeros(0, int))
        return cls(*(np.concatenate([getattr(p, f) for p in parts]) for f in ("lower", "upper", "strength", "axis")))


def in_window(frequency: np.ndarray, fmin_mhz: float, fmax_mhz: float) -> np.ndarray:
    return (frequency >= fmin_mhz) & (frequency <= fmax_mhz) & (frequency > 0)


def closed_form_transitions(ladder: StateLadder, dipole_axis: int, fmin_mhz: float, fmax_mhz: float) -> TransitionSet:
    """J → J+1, ΔK = 0 lines of a linear molecule or symmetric top."""
    offsets = ladder.offsets()
    parts = []
    for rung, upper_rung in zip(ladder.rungs[:-1], ladder.rungs[1:]):
        k = rung.ka.clip(min=0)  # linear molecules: K = 0 (stored as −1)
        frequency = upper_rung.energies_mhz[: len(k)] - rung.energies_mhz
        keep = in_window(frequency, fmin_mhz, fmax_mhz)
        if not keep.any():
            continue
        index = np.nonzero(keep)[0]
        parts.append(
            TransitionSet(
                lower=offsets[rung.j] + index,
                upper=offsets[upper_rung.j] + index,
                strength=symmetric_top_strength(np.full(len(index), rung.j), k[index]),
                axis=np.full(len(index), dipole_axis),
            )
        )
    return TransitionSet.join(parts)


def asymmetric_transitions(
    ladder: StateLadder, dipole_debye: tuple[float, float, float], representation: str, fmin_mhz: float, fmax_mhz: float
) -> TransitionSet:
    """a-, b- and c-type lines with ΔJ = 0, +1 between the ladder's Wang blocks.

    Every connected block pair of the ladder is gathered first; pairs of
    similar size (any J) are then computed as one zero-padded batch.
    """
    offsets = ladder.offsets()
    axes = [
        (n, PRINCIPAL_TO_REPRESENTATION[representation][p]) for n, (p, mu) in enumerate(zip("abc", dipole_debye)) if mu
    ]
    groups: dict[int, list] = {}
    for rung, weights in zip(ladder.rungs, ladder.spin_weights):
        for delta_j in (0, 1):
            if rung.j + delta_j > ladder.j_max or (rung.j == 0 and delta_j == 0):
                continue
            other = ladder.rungs[rung.j + delta_j]
            other_weights = ladder.spin_weights[rung.j + delta_j]
            for i, n, code, axis in _block_pairs(rung, other, axes, delta_j):
                bra, ket = rung.blocks[i], other.blocks[n]
                # All levels of a Wang block share one C2 symmetry, hence one spin weight:
                # a pair of blocks with different (or zero) weights has no allowed line.
                weight = weights[bra.first_level]
                if weight == 0 or weight != other_weights[ket.first_level]:
                    continue
                if not _may_reach_window(bra, ket, fmin_mhz, fmax_mhz):
                    continue
                size = -(-max(len(bra.k_values), len(ket.k_values)) // BATCH_STEP) * BATCH_STEP
                first = (offsets[rung.j] + bra.first_level, offsets[other.j] + ket.first_level)
                groups.setdefault(size, []).append((bra, ket, code, axis, first))
    parts = [_batch_transitions(items, size, fmin_mhz, fmax_mhz) for size, items in sorted(groups.items())]
    return TransitionSet.join(parts)


def _may_reach_window(bra: BlockSolution, ket: BlockSolution, fmin_mhz: float, fmax_mhz: float) -> bool:
    """False when no |E_ket − E_bra| of the pair can fall in the window (then its strengths are not needed)."""
    low = ket.energies_mhz[0] - bra.energies_mhz[-1]  # energies of a block are sorted
    high = ket.energies_mhz[-1] - bra.energies_mhz[0]
    if low > 0:
        reach = (low, high)
    elif high < 0:
        reach = (-high, -low)
    else:
        reach = (0.0, max(-low, high))
    return reach[1] >= fmin_mhz and reach[0] <= fmax_mhz


#: Block pairs are padded to a multiple of this size and batched together.
BATCH_STEP = 4


def _block_pairs(rung: JLevels, other: JLevels, axes, delta_j: int) -> list[tuple[int, int, int, str]]:
    """(bra block, ket block, principal axis code, representation axis) of every connected pair."""
    by_symmetry = {(b.parity, b.sign): n for n, b in enumerate(other.blocks)}
    pairs = []
    for code, axis in axes:
        for i, bra in enumerate(rung.blocks):
            n = by_symmetry.get(connected_block(axis, delta_j, bra.parity, bra.sign))
            if n is not None and not (delta_j == 0 and n <= i):  # a ΔJ = 0 pair is visited once
                pairs.append((i, n, code, axis))
    return pairs


def _padded(blocks: list[BlockSolution], size: int) -> tuple[np.ndarray, np.ndarray]:
    """Eigenvectors (n_blocks, size, size) and energies (n_blocks, size), zero/NaN padded."""
    vectors = np.zeros((len(blocks), size, size))
    energies = np.full((len(blocks), size), np.nan)
    for n, block in enumerate(blocks):
        m = len(block.energies_mhz)
        vectors[n, :m, :m] = block.vectors
        energies[n, :m] = block.energies_mhz
    return vectors, energies


def _batch_transitions(items, size: int, fmin_mhz: float, fmax_mhz: float) -> TransitionSet:
    """Lines of many connected block pairs, padded to ``size`` and computed as one batch."""
    bras = [item[0] for item in items]
    kets = [item[1] for item in items]
    axes = [item[3] for item in items]
    # Each block is padded once, however many pairs it takes part in.
    slot: dict[int, int] = {}
    blocks = []
    for block in bras + kets:
        if id(block) not in slot:
            slot[id(block)] = len(blocks)
            blocks.append(block)
    vectors, energies = _padded(blocks, size)
    bra_at = np.array([slot[id(b)] for b in bras])
    ket_at = np.array([slot[id(k)] for k in kets])
    # Two batched products beat gathering the rows of V_ket by O's sparse pattern (measured).
    operators = wang_operator_stack(bras, kets, axes, size)
    amplitude = np.matmul(vectors[bra_at].transpose(0, 2, 1), np.matmul(operators, vectors[ket_at]))
    degeneracy = np.array([(2 * b.j + 1) * (2 * k.j + 1) for b, k in zip(bras, kets)], dtype=float)
    strength = degeneracy[:, None, None] * amplitude**2
    frequency = np.subtract(energies[ket_at][:, None, :], energies[bra_at][:, :, None])
    with np.errstate(invalid="ignore"):
        upper_is_ket = frequency > 0
        np.abs(frequency, out=frequency)
        keep = in_window(frequency, fmin_mhz, fmax_mhz) & (strength > STRENGTH_EPSILON)
    # One flat index and two divisions are several times faster than a 3-d nonzero.
    flat = np.flatnonzero(keep)
    which, rest = np.divmod(flat, size * size)
    rows, cols = np.divmod(rest, size)
    first_bra = np.array([item[4][0] for item in items])
    first_ket = np.array([item[4][1] for item in items])
    a = first_bra[which] + rows
    b = first_ket[which] + cols
    upper_is_ket = upper_is_ket.ravel()[flat]
    return TransitionSet(
        lower=np.where(upper_is_ket, a, b),
        upper=np.where(upper_is_ket, b, a),
        strength=strength.ravel()[flat],
        axis=np.array([item[2] for item in items])[which],
    )
