"""Rotational levels of one state, J by J, with labels and ∂E/∂p.

Each rotor kind has a solver whose ``solve(j)`` returns a :class:`JLevels`:
the levels of one J with energies [MHz], labels, K degeneracy and the
derivative of every energy with respect to every constant (Hellmann–Feynman
for the asymmetric top, the closed-form basis functions otherwise).  The
asymmetric solver also keeps each Wang block's eigenvectors for the line
strengths.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984,
    Eqs. for linear molecules and symmetric tops in Chs. 2 and 8.
[2] R. P. Feynman, Phys. Rev. 56, 340 (1939) (∂E/∂p = ⟨ψ|∂H/∂p|ψ⟩).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from . import hamiltonian
from .labels import block_labels
from .species import LINEAR_PARAMETERS, OBLATE_PARAMETERS, PROLATE_PARAMETERS, State


@dataclass
class BlockSolution:
    """Eigen-solution of one Wang block: energies ascending, eigenvectors as columns."""

    j: int
    parity: int
    sign: int
    k_values: np.ndarray
    energies_mhz: np.ndarray
    vectors: np.ndarray
    first_level: int = 0  # index of the block's first level within its JLevels
    index: hamiltonian.WangIndex | None = None  # positions in the full |J,K⟩ basis


@dataclass
class JLevels:
    """All levels of one J of one state (rotational energies, no vibrational offset)."""

    j: int
    ka: np.ndarray  # K for symmetric tops, −1 when undefined
    kc: np.ndarray  # −1 when undefined
    energies_mhz: np.ndarray
    k_degeneracy: np.ndarray  # 2 for the ±K pair of a symmetric top, else 1
    derivatives: np.ndarray  # (n_levels, n_derivatives) ∂E/∂p [MHz per unit of p], solver.derivative_names
    blocks: list[BlockSolution] = field(default_factory=list)

    @property
    def lowest_mhz(self) -> float:
        return float(self.energies_mhz.min())


class LinearSolver:
    """E(J) = B x − D x² + H x³, x = J(J+1) [MHz] (Gordy & Cook 1984, Ch. 2)."""

    parameter_names = LINEAR_PARAMETERS

    def __init__(self, state: State, derivative_names: tuple[str, ...] | None = None):
        self.values = np.array([state.value(p) for p in self.parameter_names])
        self.derivative_names, self._wanted = _wanted(self.parameter_names, derivative_names)

    def solve(self, j: int) -> JLevels:
        x = float(j * (j + 1))
        basis = np.array([[x, -(x**2), x**3]])  # E = B x − D x² + H x³
        return JLevels(
            j=j,
            ka=np.array([-1]),
            kc=np.array([-1]),
            energies_mhz=basis @ self.values,
            k_degeneracy=np.array([1.0]),
            derivatives=basis[:, self._wanted],
        )


class SymmetricSolver:
    """Closed-form symmetric-top levels E(J, K) [MHz] for K = 0..J.

    Prolate: E = B x + (A − B) K² − DJ x² − DJK x K² − DK K⁴ + HJ x³ + HJK x² K²
    + HKJ x K⁴ + HK K⁶; oblate: C in place of A (Gordy & Cook 1984, Ch. 8).
    """

    def __init__(self, state: State, oblate: bool, derivative_names: tuple[str, ...] | None = None):
        self.parameter_names = OBLATE_PARAMETERS if oblate else PROLATE_PARAMETERS
        self.values = np.array([state.value(p) for p in self.parameter_names])
        self.derivative_names, self._wanted = _wanted(self.parameter_names, derivative_names)

    def solve(self, j: int) -> JLevels:
        x = float(j * (j + 1))
        k2 = np.arange(j + 1, dtype=float) ** 2
        ones = np.ones_like(k2)
        # Columns follow parameter_names: A|C, B, DJ, DJK, DK, HJ, HJK, HKJ, HK.
        basis = np.column_stack(
            [k2, x * ones - k2, -(x**2) * ones, -x * k2, -(k2**2), x**3 * ones, x**2 * k2, x * k2**2, k2**3]
        )
        k = np.arange(j + 1)
        return JLevels(
            j=j,
            ka=k,
            kc=np.full(j + 1, -1),
            energies_mhz=basis @ self.values,
            k_degeneracy=np.where(k > 0, 2.0, 1.0),
            derivatives=basis[:, self._wanted],
        )


class AsymmetricSolver:
    """Watson A- or S-reduced Hamiltonian diagonalised block by block (see hamiltonian.py)."""

    def __init__(
        self, state: State, reduction: str, representation: str, derivative_names: tuple[str, ...] | None = None
    ):
        self.reduction = reduction
        self.representation = representation
        self.parameter_names = hamiltonian.parameter_names(reduction)
        self.values = np.array([state.value(p) for p in self.parameter_names])
        self.derivative_names, self._wanted = _wanted(self.parameter_names, derivative_names)

    def block_matrices(self, j: int):
        """(elements, [(WangIndex, block matrix), ...]) for the Wang blocks of J."""
        elements = hamiltonian.full_basis_elements(j, self.reduction, self.representation)
        full = hamiltonian.full_matrix(elements, self.values, j)
        return elements, [(index, hamiltonian.wang_block_matrix(full, index)) for index in hamiltonian.wang_index(j)]

    def solve(self, j: int) -> JLevels:
        elements, blocks = self.block_matrices(j)
        size = 2 * j + 1
        kas, kcs, energies, solutions = [], [], [], []
        # Eigenvectors expanded to the full basis, one column per level, for ⟨ψ|O_p|ψ⟩.
        full_vectors = np.zeros((size, size))
        first = 0
        for index, matrix in blocks:
            block = index.block
            values, vectors = np.linalg.eigh(matrix)
            ka, kc = block_labels(j, block.parity, block.sign, self.representation)
            solutions.append(BlockSolution(j, block.parity, block.sign, block.k_values, values, vectors, first, index))
            columns = slice(first, first + len(values))
            # u(±K) = v/√2 · (1, s) for K > 0 and u(0) = v: plain assignments, blocks own disjoint columns.
            scaled = vectors * np.sqrt(0.5)
            full_vectors[index.minus, columns] = block.sign * scaled
            full_vectors[index.plus, columns] = scaled
            if block.k_values[0] == 0:
                full_vectors[index.plus[0], columns] = vectors[0]
            kas.append(ka)
            kcs.append(kc)
            energies.append(values)
            first += len(values)
        return JLevels(
            j=j,
            ka=np.concatenate(kas),
            kc=np.concatenate(kcs),
            energies_mhz=np.concatenate(energies),
            k_degeneracy=np.ones(first),
            derivatives=_expectation_values({d: c[self._wanted] for d, c in elements.items()}, full_vectors),
            blocks=solutions,
        )


def _expectation_values(elements: dict[int, np.ndarray], vectors: np.ndarray) -> np.ndarray:
    """⟨u_k|O_p|u_k⟩ for every full-basis eigenvector u_k and operator p → (n_levels, n_params).

    Σ_d (2 − δ_d0) Σ_K ⟨K+d|O_p|K⟩ u_K u_(K+d), using the band structure of O_p.
    """
    n = vectors.shape[0]
    result = elements[0] @ (vectors * vectors)
    for d, coefficients in elements.items():
        if d and coefficients.shape[1]:
            result += 2.0 * coefficients @ (vectors[: n - d] * vectors[d:])
    return result.T


def _wanted(names: tuple[str, ...], derivative_names: tuple[str, ...] | None) -> tuple[tuple[str, ...], np.ndarray]:
    """The parameters whose ∂E/∂p a solver returns (all by default) and their column indices."""
    if derivative_names is None:
        return tuple(names), np.arange(len(names))
    unknown = set(derivative_names) - set(names)
    if unknown:
        raise ValueError(f"no derivative for unknown parameters {sorted(unknown)}; known: {', '.join(names)}")
    chosen = tuple(p for p in names if p in derivative_names)
    return chosen, np.array([names.index(p) for p in chosen], dtype=np.intp)


def solver_for(species, state: State, derivative_names: tuple[str, ...] | None = None):
    """The level solver for one state of a species; ∂E/∂p for ``derivative_names`` (default all)."""
    if species.rotor == "linear":
        return LinearSolver(state, derivative_names)
    if species.rotor == "symmetric-prolate":
        return SymmetricSolver(state, oblate=False, derivative_names=derivative_names)
    if species.rotor == "symmetric-oblate":
        return SymmetricSolver(state, oblate=True, derivative_names=derivative_names)
    return AsymmetricSolver(state, species.reduction, species.representation, derivative_names)
