"""Watson Hamiltonians of the asymmetric top, as linear combinations of operators.

Every Hamiltonian the engine handles is linear in its constants,
H = Σ_p p · O_p, so one table of operator matrix elements per parameter gives
both the matrix (values · operators) and, by the Hellmann–Feynman theorem,
the derivative of every level with respect to every constant
(∂E/∂p = ⟨ψ|O_p|ψ⟩).  This module builds those operator elements in the
symmetric-top basis |J,K⟩ and folds them into the four Wang blocks of each J.

Notes
-----
Basis |J,K⟩, K = −J..J, x = J(J+1), f(J,K) = √([x − K(K+1)][x − (K+1)(K+2)])
([3], "Asymmetric tops").  Rigid part (representation axes x, y, z with constants X, Y, Z)::

    (X+Y)/2 · J² + (Z − (X+Y)/2) · Jz² + (X−Y)/4 · (J+² + J−²)

A-reduction (Watson [1]; diagonal and ΔK = ±2 elements as written in [3])::

    −ΔJ J⁴ − ΔJK J²Jz² − ΔK Jz⁴ − 2δJ J²(Jx²−Jy²) − δK {Jz², Jx²−Jy²}
    + ΦJ J⁶ + ΦJK J⁴Jz² + ΦKJ J²Jz⁴ + ΦK Jz⁶
    + 2φJ J⁴(Jx²−Jy²) + φJK J²{Jz², Jx²−Jy²} + φK {Jz⁴, Jx²−Jy²}

S-reduction (Watson [2]; ΔK up to ±6)::

    −DJ J⁴ − DJK J²Jz² − DK Jz⁴ + d1 J²(J+² + J−²) + d2 (J+⁴ + J−⁴)
    + HJ J⁶ + HJK J⁴Jz² + HKJ J²Jz⁴ + HK Jz⁶
    + h1 J⁴(J+² + J−²) + h2 J²(J+⁴ + J−⁴) + h3 (J+⁶ + J−⁶)

with Jx² − Jy² = (J+² + J−²)/2 and ⟨K+4|J+⁴|K⟩ = f(J,K) f(J,K+2), etc.

Wang functions |K,s⟩ = (|K⟩ + s|−K⟩)/√2 (K > 0) and |0⟩ (s = +1) split each J
into blocks of one K parity and one sign s.  Because every element obeys
⟨K'|H|K⟩ = ⟨−K'|H|−K⟩, the block element between K and K+2m is
2 N_K N_(K+2m) [⟨K+2m|H|K⟩ + s ⟨K+2m|H|−K⟩] with N_K = 1/√2 (K > 0) or 1/2 (K = 0)
(Ch. 7 of [4]).

References
----------
[1] J. K. G. Watson, J. Chem. Phys. 46, 1935 (1967).
[2] J. K. G. Watson, in *Vibrational Spectra and Structure*, Vol. 6, ed. J. R. Durig,
    Elsevier 1977, pp. 1–89.
[3] Linecast physics conventions (shared/PHYSICS.md), after [4].
[4] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984, Chs. 7–8.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from .species import A_REDUCTION_PARAMETERS, S_REDUCTION_PARAMETERS

#: Which constant lies along the representation's x, y, z axes.
REPRESENTATION_AXES = {"Ir": ("B", "C", "A"), "IIIr": ("A", "B", "C")}


def parameter_names(reduction: str) -> tuple[str, ...]:
    """Parameter order of the operator tables for a reduction ("A" or "S")."""
    return A_REDUCTION_PARAMETERS if reduction == "A" else S_REDUCTION_PARAMETERS


def _f(x: float, k: np.ndarray) -> np.ndarray:
    """f(J,K) = √([x − K(K+1)][x − (K+1)(K+2)]) [dimensionless]; [3], "Asymmetric tops"."""
    product = (x - k * (k + 1)) * (x - (k + 1) * (k + 2))
    return np.sqrt(np.clip(product, 0.0, None))


@lru_cache(maxsize=512)
def full_basis_elements(j: int, reduction: str, representation: str) -> dict[int, np.ndarray]:
    """Operator elements ⟨J,K+d|O_p|J,K⟩ for d = 0, 2, 4, 6.

    Returns ``{d: array (n_params, 2J+1−d)}``, read-only, for the d that the
    reduction couples (the A-reduction stops at d = 2); column i belongs to the
    lower K = −J + i.  Elements beyond the basis are zero.  Cached: the table
    depends on J, the reduction and the representation only (≤ 50 kB per J).
    """
    names = parameter_names(reduction)
    index = {name: i for i, name in enumerate(names)}
    x = float(j * (j + 1))
    k = np.arange(-j, j + 1, dtype=float)
    k2 = k * k
    out = {d: np.zeros((len(names), max(2 * j + 1 - d, 0))) for d in (0, 2, 4, 6)}
    diag = out[0]
    kl2 = k[: max(2 * j - 1, 0)]  # lower K of the ΔK = 2 elements
    f2 = _f(x, kl2)
    kk2 = ((kl2 + 2) ** 2 + kl2**2) / 2.0
    kk4 = ((kl2 + 2) ** 4 + kl2**4) / 2.0
    off2 = out[2]

    x_name, y_name, z_name = REPRESENTATION_AXES[representation]
    # Rigid rotor: (X+Y)/2 J² + (Z − (X+Y)/2) Jz² + (X−Y)/4 (J+² + J−²).
    for name, sign in ((x_name, 1.0), (y_name, -1.0)):
        diag[index[name]] += x / 2.0 - k2 / 2.0
        off2[index[name]] += sign * f2 / 4.0
    diag[index[z_name]] += k2

    if reduction == "A":
        diag[index["DeltaJ"]] = -(x**2)
        diag[index["DeltaJK"]] = -x * k2
        diag[index["DeltaK"]] = -(k2**2)
        diag[index["PhiJ"]] = x**3
        diag[index["PhiJK"]] = x**2 * k2
        diag[index["PhiKJ"]] = x * k2**2
        diag[index["PhiK"]] = k2**3
        off2[index["deltaJ"]] = -x * f2
        off2[index["deltaK"]] = -kk2 * f2
        off2[index["phiJ"]] = x**2 * f2
        off2[index["phiJK"]] = x * kk2 * f2
        off2[index["phiK"]] = kk4 * f2
    else:
        kl4 = k[: max(2 * j - 3, 0)]
        f4 = _f(x, kl4) * _f(x, kl4 + 2)
        kl6 = k[: max(2 * j - 5, 0)]
        f6 = _f(x, kl6) * _f(x, kl6 + 2) * _f(x, kl6 + 4)
        diag[index["DJ"]] = -(x**2)
        diag[index["DJK"]] = -x * k2
        diag[index["DK"]] = -(k2**2)
        diag[index["HJ"]] = x**3
        diag[index["HJK"]] = x**2 * k2
        diag[index["HKJ"]] = x * k2**2
        diag[index["HK"]] = k2**3
        off2[index["d1"]] = x * f2
        off2[index["h1"]] = x**2 * f2
        out[4][index["d2"]] = f4
        out[4][index["h2"]] = x * f4
        out[6][index["h3"]] = f6
    out = {d: table for d, table in out.items() if d == 0 or table.any()}
    for table in out.values():
        table.setflags(write=False)
    return out


@dataclass(frozen=True)
class WangBlock:
    """One Wang block of one J: K parity, sign s, and its K values."""

    j: int
    parity: int  # K mod 2
    sign: int  # +1 or −1
    k_values: np.ndarray  # K of each basis function, ascending

    @property
    def size(self) -> int:
        return len(self.k_values)


def wang_blocks(j: int) -> list[WangBlock]:
    """The (up to) four Wang blocks of J, in the order (even,+), (even,−), (odd,+), (odd,−)."""
    blocks = []
    for parity in (0, 1):
        for sign in (1, -1):
            first = parity if parity == 1 else (0 if sign == 1 else 2)
            k_values = np.arange(first, j + 1, 2)
            if len(k_values):
                blocks.append(WangBlock(j, parity, sign, k_values))
    return blocks


@dataclass(frozen=True)
class WangIndex:
    """Where a Wang block's basis functions sit in the full |J,K⟩ basis of J.

    ``plus`` holds the positions of +K and ``minus`` those of −K (K = 0 maps to
    itself); ``scale`` is 1/√2 for K = 0 and 1 otherwise, so that
    W = scale·(H[plus, plus] + s·H[plus, minus])·scale is the block matrix.
    """

    block: WangBlock
    plus: np.ndarray
    minus: np.ndarray
    scale: np.ndarray


@lru_cache(maxsize=1024)
def wang_index(j: int) -> tuple[WangIndex, ...]:
    """The Wang blocks of J with their positions in the full basis (cached: depends on J only)."""
    out = []
    for block in wang_blocks(j):
        k = block.k_values
        out.append(WangIndex(block, k + j, -k + j, np.where(k == 0, np.sqrt(0.5), 1.0)))
    return tuple(out)


def full_matrix(elements: dict[int, np.ndarray], values: np.ndarray, j: int) -> np.ndarray:
    """Dense symmetric Hamiltonian of J in the |J,K⟩ basis from operator elements and constants."""
    n = 2 * j + 1
    matrix = np.zeros((n, n))
    for d, coefficients in elements.items():
        if coefficients.shape[1] == 0:
            continue
        band = values @ coefficients
        idx = np.arange(n - d)
        matrix[idx + d, idx] = band
        if d:
            matrix[idx, idx + d] = band
    return matrix


def wang_pair_matrix(full: np.ndarray, bra: WangIndex, ket: WangIndex) -> np.ndarray:
    """Element block of a full-basis operator between two Wang blocks (n_bra, n_ket).

    For an operator with ⟨−K1|O|−K2⟩ = ε⟨K1|O|K2⟩ and blocks that it connects
    (s_bra·s_ket·ε = 1), ⟨K1,s1|O|K2,s2⟩ = scale·(O(K1,K2) + s2·O(K1,−K2))·scale.
    """
    rows = bra.plus[:, None]
    block = full[rows, ket.plus[None, :]] + ket.block.sign * full[rows, ket.minus[None, :]]
    return bra.scale[:, None] * block * ket.scale[None, :]


def wang_block_matrix(full: np.ndarray, index: WangIndex) -> np.ndarray:
    """Diagonal block of the Wang-transformed Hamiltonian for one (parity, sign) block."""
    return wang_pair_matrix(full, index, index)
