"""Asymmetric-top level labels J Ka Kc, handed out inside Wang symmetry blocks.

Levels of one symmetry block never cross as the constants change, so sorting a
block's eigenvalues and giving out that block's labels in order of
τ = Ka − Kc keeps every label right even where levels of *different* blocks
cross (as they do at high J with centrifugal distortion).

Block membership (Wang "+" = (|K⟩ + |−K⟩)/√2, K = 0 in "+"; see hamiltonian.py):

* Ir  (z = a): K is Ka; "+" blocks hold Ka + Kc = J, "−" blocks Ka + Kc = J + 1.
* IIIr (z = c): K is Kc; "+" blocks hold Ka of the parity of J.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Ch. 7 (τ labels, the non-crossing rule, Wang symmetry classes).
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np


def all_labels(j: int) -> list[tuple[int, int]]:
    """Every (Ka, Kc) of a level J: Ka + Kc = J or J + 1, 0 ≤ Ka, Kc ≤ J."""
    labels = [(0, j)]
    for ka in range(1, j + 1):
        labels.append((ka, j - ka))
        labels.append((ka, j - ka + 1))
    return labels


def in_block(j: int, ka: int, kc: int, parity: int, sign: int, representation: str) -> bool:
    """Whether level J Ka Kc belongs to the Wang block (K parity, sign)."""
    if representation == "Ir":
        return ka % 2 == parity and ((ka + kc == j) == (sign == 1))
    if representation == "IIIr":
        return kc % 2 == parity and ((ka % 2 == j % 2) == (sign == 1))
    raise ValueError(f"representation must be 'Ir' or 'IIIr', got {representation!r}")


@lru_cache(maxsize=4096)
def block_labels(j: int, parity: int, sign: int, representation: str) -> tuple[np.ndarray, np.ndarray]:
    """(Ka, Kc) of a block's levels in order of increasing τ = Ka − Kc (= increasing energy).

    The block's K values are its Ka (Ir) or Kc (IIIr); Ka + Kc is fixed within a
    block (J or J + 1, see the module docstring), so τ follows K directly: it
    rises with Ka in Ir and falls with Kc in IIIr.  :func:`members` gives the
    same sets by testing every label of J.
    """
    first = parity if parity == 1 or sign == 1 else 2
    k = np.arange(first, j + 1, 2)
    if representation == "Ir":
        ka, kc = k, (j if sign == 1 else j + 1) - k
    elif representation == "IIIr":
        total = j + ((parity == 1) == (sign == 1))  # Ka + Kc
        kc = k[::-1].copy()
        ka = total - kc
    else:
        raise ValueError(f"representation must be 'Ir' or 'IIIr', got {representation!r}")
    ka.setflags(write=False)
    kc.setflags(write=False)
    return ka, kc


def members(j: int, parity: int, sign: int, representation: str) -> list[tuple[int, int]]:
    """The block's (Ka, Kc) by testing every label of J, sorted by τ (the definition)."""
    found = [(ka, kc) for ka, kc in all_labels(j) if in_block(j, ka, kc, parity, sign, representation)]
    return sorted(found, key=lambda label: label[0] - label[1])


def spin_symmetry_even(ka: np.ndarray, kc: np.ndarray, axis: str) -> np.ndarray:
    """True where a level is symmetric (+1) under the C2 rotation about ``axis``.

    The character is (−1)^Ka for a, (−1)^(Ka+Kc) for b, (−1)^Kc for c
    (Gordy & Cook 1984, Ch. 7).
    """
    if axis == "a":
        exponent = ka
    elif axis == "b":
        exponent = ka + kc
    elif axis == "c":
        exponent = kc
    else:
        raise ValueError(f"C2 axis must be 'a', 'b' or 'c', got {axis!r}")
    return exponent % 2 == 0
