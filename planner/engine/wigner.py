"""Wigner 3j symbols (J 1 J'; −K q K') for the dipole operator, vectorised over K.

Closed forms of the Clebsch–Gordan coefficients ⟨j m; 1 q | j' m+q⟩ for
j' = j − 1, j, j + 1 (Condon–Shortley phases), Ch. 2 of [1], turned into
3j symbols with the standard relation (Ch. 2 of [1]):
(j1 j2 j3; m1 m2 m3) = (−1)^(j1 − j2 − m3) / √(2 j3 + 1) · ⟨j1 m1; j2 m2 | j3 −m3⟩.

References
----------
[1] R. N. Zare, *Angular Momentum*, Wiley 1988, Ch. 2.
[2] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton 1957, Ch. 3.
"""

from __future__ import annotations

import numpy as np


def clebsch_gordan_rank1(j: int, m: np.ndarray, q: int, jp: int) -> np.ndarray:
    """⟨j m; 1 q | j' m+q⟩ for j' ∈ {j−1, j, j+1}, q ∈ {−1, 0, 1} [dimensionless]."""
    m = np.asarray(m, dtype=float)
    j = float(j)
    with np.errstate(invalid="ignore", divide="ignore"):
        if jp == j + 1:
            if q == 1:
                value = np.sqrt((j + m + 1) * (j + m + 2) / ((2 * j + 1) * (2 * j + 2)))
            elif q == 0:
                value = np.sqrt((j - m + 1) * (j + m + 1) / ((2 * j + 1) * (j + 1)))
            else:
                value = np.sqrt((j - m + 1) * (j - m + 2) / ((2 * j + 1) * (2 * j + 2)))
        elif jp == j:
            if j == 0:
                return np.zeros_like(m)
            if q == 1:
                value = -np.sqrt((j + m + 1) * (j - m) / (2 * j * (j + 1)))
            elif q == 0:
                value = m / np.sqrt(j * (j + 1))
            else:
                value = np.sqrt((j - m + 1) * (j + m) / (2 * j * (j + 1)))
        elif jp == j - 1:
            if j == 0:
                return np.zeros_like(m)
            if q == 1:
                value = np.sqrt((j - m - 1) * (j - m) / (2 * j * (2 * j + 1)))
            elif q == 0:
                value = -np.sqrt((j - m) * (j + m) / (j * (2 * j + 1)))
            else:
                value = np.sqrt((j + m - 1) * (j + m) / (2 * j * (2 * j + 1)))
        else:
            raise ValueError(f"j' must be j-1, j or j+1 for a rank-1 coupling, got j={j:g}, j'={jp}")
    mp = m + q
    valid = (np.abs(m) <= j) & (np.abs(mp) <= jp)
    return np.where(valid, np.nan_to_num(value), 0.0)


def three_j_rank1(j: int, jp: int, k: np.ndarray, q: int) -> np.ndarray:
    """(J 1 J'; −K q K') with K' = K − q, vectorised over K [dimensionless]."""
    k = np.asarray(k)
    kp = k - q
    # The 3j–CG relation of [1] with j1 = J, m1 = −K, j2 = 1, m2 = q, j3 = J', m3 = K'.
    phase = np.where((j - 1 - kp) % 2 == 0, 1.0, -1.0)
    return phase / np.sqrt(2 * jp + 1) * clebsch_gordan_rank1(j, -k, q, jp)
