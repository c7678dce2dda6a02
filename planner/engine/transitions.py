"""Allowed transitions of one state's ladder inside a frequency window.

Returns index pairs into the ladder's flattened level arrays, with the line
strength and the principal axis (a, b, c) of the dipole component.

Selection rules: ΔJ = 0, ±1.  Asymmetric tops follow from the direction
cosines (a-type ee↔eo, oo↔oe; b-type ee↔oo, eo↔oe; c-type ee↔oe, eo↔oo in
Ka Kc parities, Gordy & Cook 1984, Table 7.8); they appear here as the Wang
block pairs that the operator connects.  Symmetric tops and linear molecules:
ΔJ = +1, ΔK = 0 along the symmetry axis (ΔJ = 0, ΔK = 0 joins a level with
itself).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .ladder import StateLadder
from .linestrength import PRINCIPAL_TO_REPRESENTATION, block_strengths, connected_block, symmetric_top_strength

#: Strengths below this are numerical zeros of the direction-cosine products.
STRENGTH_EPSILON = 1e-12


@dataclass
class TransitionSet:
    lower: np.ndarray  # index of the lower level in the ladder's flat arrays
    upper: np.ndarray
    strength: np.ndarray  # S of the carrying dipole component
    axis: np.ndarray  # 'a', 'b' or 'c'

    @classmethod
    def join(cls, parts: list["TransitionSet"]) -> "TransitionSet":
        if not parts:
            return cls(np.zeros(0, int), np.zeros(0, int), np.zeros(0), np.zeros(0, dtype="<U1"))
        return cls(*(np.concatenate([getattr(p, f) for p in parts]) for f in ("lower", "upper", "strength", "axis")))


def in_window(frequency: np.ndarray, fmin_mhz: float, fmax_mhz: float) -> np.ndarray:
    return (frequency >= fmin_mhz) & (frequency <= fmax_mhz) & (frequency > 0)


def closed_form_transitions(ladder: StateLadder, dipole_axis: str, fmin_mhz: float, fmax_mhz: float) -> TransitionSet:
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
    """a-, b- and c-type lines with ΔJ = 0, +1 between the ladder's Wang blocks."""
    offsets = ladder.offsets()
    axes = [(p, PRINCIPAL_TO_REPRESENTATION[representation][p]) for p, mu in zip("abc", dipole_debye) if mu != 0]
    parts = []
    for rung in ladder.rungs:
        for delta_j in (0, 1):
            if rung.j + delta_j > ladder.j_max or (rung.j == 0 and delta_j == 0):
                continue
            other = ladder.rungs[rung.j + delta_j]
            by_symmetry = {(b.parity, b.sign): (n, b) for n, b in enumerate(other.blocks)}
            for principal, axis in axes:
                for i, bra in enumerate(rung.blocks):
                    n, ket = by_symmetry.get(connected_block(axis, delta_j, bra.parity, bra.sign), (None, None))
                    if ket is None or (delta_j == 0 and n <= i):
                        continue  # a ΔJ = 0 block pair is visited once
                    frequency = np.abs(ket.energies_mhz[None, :] - bra.energies_mhz[:, None])
                    keep = in_window(frequency, fmin_mhz, fmax_mhz)
                    if not keep.any():
                        continue
                    strength = block_strengths(axis, bra, ket)
                    keep &= strength > STRENGTH_EPSILON
                    rows, cols = np.nonzero(keep)
                    a = offsets[rung.j] + bra.first_level + rows
                    b = offsets[other.j] + ket.first_level + cols
                    upper_is_ket = ket.energies_mhz[cols] > bra.energies_mhz[rows]
                    parts.append(
                        TransitionSet(
                            lower=np.where(upper_is_ket, a, b),
                            upper=np.where(upper_is_ket, b, a),
                            strength=strength[rows, cols],
                            axis=np.full(len(rows), principal),
                        )
                    )
    return TransitionSet.join(parts)
