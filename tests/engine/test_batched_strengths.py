"""The batched Wang-block operator of predict() against the per-pair dense operator.

Two independent constructions of the same matrix elements: ``wang_operator``
folds the full-basis direction-cosine matrix with the Wang index arithmetic,
``wang_operator_terms`` writes the non-zero diagonals directly for many block
pairs at once.  The sum-rule and Racah tests pin ``wang_operator``; this pins
the fast path to it.
"""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine.levels import AsymmetricSolver
from planner.engine.linestrength import connected_block, wang_operator, wang_operator_stack
from planner.engine.species import State
from planner.engine.transitions import _block_pairs

# Invented rigid-rotor constants (any asymmetric top will do) [MHz].
STATE = State("v=0", 0.0, {"A": (9000.0, 0.0), "B": (3100.0, 0.0), "C": (2500.0, 0.0)})
AXES = [(0, "z"), (1, "x"), (2, "y")]


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
def test_batched_terms_equal_the_dense_operator_of_every_connected_pair(representation):
    solver = AsymmetricSolver(STATE, "A", representation)
    rungs = [solver.solve(j) for j in range(9)]
    checked = 0
    for rung in rungs[:-1]:
        for delta_j in (0, 1):
            if rung.j == 0 and delta_j == 0:
                continue
            other = rungs[rung.j + delta_j]
            pairs = _block_pairs(rung, other, AXES, delta_j)
            bras = [rung.blocks[i] for i, _, _, _ in pairs]
            kets = [other.blocks[k] for _, k, _, _ in pairs]
            size = max(len(b.energies_mhz) for b in rung.blocks + other.blocks) + 1  # one row of padding too
            stack = wang_operator_stack(bras, kets, [axis for *_, axis in pairs], size)
            for n, (bra, ket, (_, _, _, axis)) in enumerate(zip(bras, kets, pairs)):
                dense = wang_operator(axis, bra, ket)
                # Same closed-form 3j values through two index paths: rounding only.
                assert_allclose(stack[n, : bra.index.plus.size, : ket.index.plus.size], dense, atol=1e-14)
                assert not stack[n, bra.index.plus.size :].any() and not stack[n, :, ket.index.plus.size :].any()
                checked += 1
    assert checked > 100


def test_dense_operator_refuses_blocks_the_axis_does_not_connect():
    rungs = [AsymmetricSolver(STATE, "A", "Ir").solve(j) for j in (0, 1)]
    bra, ket = rungs[1].blocks[0], rungs[0].blocks[0]  # (even, +) of J = 1 and J = 0
    assert connected_block("x", -1, bra.parity, bra.sign) != (ket.parity, ket.sign)
    with pytest.raises(ValueError, match="does not connect"):
        wang_operator("x", bra, ket)
    assert np.abs(wang_operator("z", bra, ket)).max() > 0.1
