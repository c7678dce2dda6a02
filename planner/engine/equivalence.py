"""Equivalent atoms of a geometry, and how many arrangements an isotopic substitution has.

A substituted isotopologue's natural abundance is the product of its atoms'
isotope fractions (isotopologue.natural_abundance) times the number of
distinct arrangements of the same isotopes over equivalent positions: one
¹⁸O in SO2 can sit on either O, and both arrangements are the same molecule,
so x(³²S¹⁶O¹⁸O) = 2 f(³²S) f(¹⁶O) f(¹⁸O).  This module finds that number from
the geometry alone.

Coordinates are Cartesian in ångström [Å]; atoms are told apart by an
element symbol (any string: only equality is used) and, for the
substitution, by one hashable label per atom (a mass number, say).

References
----------
[1] P. R. Bunker and P. Jensen, *Molecular Symmetry and Spectroscopy*, 2nd ed.,
    NRC Research Press 1998, Ch. 2–4 (permutations of identical nuclei and
    the point group of the equilibrium structure).
[2] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984
    (isotopic species in natural abundance).
[3] M. A. Armstrong, *Groups and Symmetry*, Springer 1988 (orbit–stabiliser
    theorem).
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Hashable, Sequence

import numpy as np

__all__ = [
    "DEFAULT_TOLERANCE_A",
    "arrangement_count",
    "equivalent_positions",
]

#: Default largest change of an interatomic distance that still counts as equal [Å]:
#: well above rounding in a geometry given to 4–5 decimals, well below any real
#: difference between two bonds.
DEFAULT_TOLERANCE_A = 1e-3


def equivalent_positions(
    elements: Sequence[str], coordinates_a, tolerance_a: float = DEFAULT_TOLERANCE_A
) -> list[tuple[int, ...]]:
    """The permutations of like atoms that leave every interatomic distance unchanged.

    Parameters
    ----------
    elements : one element symbol per atom (N ≥ 1), e.g. ("S", "O", "O").
        Atoms are only ever exchanged with atoms of the same symbol.
    coordinates_a : N×3 Cartesian coordinates [Å], finite, any origin and
        orientation.
    tolerance_a : two distances are equal when they differ by at most this
        [Å], finite and > 0 (default DEFAULT_TOLERANCE_A = 1e-3 Å).

    Returns
    -------
    list of permutations p, each a tuple of N atom indices: atom i goes to
    position p[i], with |r_i − r_k| = |r_p[i] − r_p[k]| for all i, k within
    ``tolerance_a``.  Sorted, so the identity comes first.  Its length is the
    order |G| of the permutation group of the geometry.

    Raises
    ------
    ValueError : bad input, or a ``tolerance_a`` so loose that the
        permutations found are not closed under composition (some distances
        equal within it and some not: give a tighter or a looser tolerance).

    Notes
    -----
    A permutation of the atoms that keeps all distances is an isometry of
    the point set, proper or improper, so the permutations found are the
    permutation representation of the point group of the geometry ([1]).
    Operations that move no atom (the reflection in the plane of a planar
    molecule) give the identity once more, so |G| is the point-group order
    divided by that of the subgroup fixing every atom: 2 for bent SO2
    (C2v, order 4), 12 for planar benzene (D6h, order 24), 24 for CH4 (Td).
    Mirror-image arrangements count as the same species, which is right for
    rotational spectra: two enantiomers have the same lines.

    The search is backtracking over atoms: an atom may only go to a like atom
    with the same sorted distances to each element (checked once, up front),
    and each choice must keep its distances to all atoms already placed.
    Once four atoms not in one plane are placed (three not in a line, for a
    planar molecule) the rest is forced, so the work grows roughly as |G|·N²,
    not as N!.
    """
    labels_of_element, coords = _validated(elements, coordinates_a)
    tolerance = _tolerance(tolerance_a)
    count = coords.shape[0]
    distances = np.linalg.norm(coords[:, None, :] - coords[None, :, :], axis=-1)
    candidates = _candidates(labels_of_element, distances, tolerance)
    order = _search_order(candidates, distances)

    found: list[tuple[int, ...]] = []
    image = [-1] * count
    used = [False] * count

    def place(depth: int) -> None:
        if depth == count:
            found.append(tuple(image))
            return
        atom = order[depth]
        placed = order[:depth]
        images = [image[k] for k in placed]
        for target in candidates[atom]:
            if used[target]:
                continue
            if placed and np.any(np.abs(distances[atom, placed] - distances[target, images]) > tolerance):
                continue
            image[atom], used[target] = target, True
            place(depth + 1)
            image[atom], used[target] = -1, False

    place(0)
    found.sort()
    _check_closed(found, tolerance)
    return found


def arrangement_count(
    elements: Sequence[str],
    labels: Sequence[Hashable],
    coordinates_a,
    tolerance_a: float = DEFAULT_TOLERANCE_A,
) -> int:
    """Number of distinct arrangements of a labelling over equivalent positions (the orbit size).

    Parameters
    ----------
    elements, coordinates_a, tolerance_a : as for :func:`equivalent_positions`
        (symbols, N×3 [Å], [Å]).
    labels : one hashable per atom (N of them), e.g. mass numbers
        (32, 16, 18) for ³²S¹⁶O¹⁸O in the atom order of ``elements``.

    Returns
    -------
    n ≥ 1: how many labellings, all the same molecule, the permutations of
    :func:`equivalent_positions` make of this one.  The natural abundance of
    the isotopologue is n × Π f_i (isotopologue.natural_abundance gives the
    product).  2 for one ¹⁸O in SO2, 1 for two; 4 for one D in CH4, 6 for two;
    1 for anything in OCS.

    Notes
    -----
    With G the permutations and Stab(L) = {p ∈ G : L∘p = L} those that map
    every atom to one with the same label, the orbit–stabiliser theorem ([3])
    gives

    n = |G| / |Stab(L)|                                              (1)

    The code counts the distinct relabelled tuples (L_p⁻¹(0), ...,
    L_p⁻¹(N−1)) directly, which is Eq. (1) for a group.  The count assumes
    the isotopes are spread at random over the atoms ([2]) and uses the
    point group of the rigid geometry: a large-amplitude motion (internal
    rotation, inversion) can make more positions equivalent than the
    geometry shows.
    """
    labels = _labels(labels, len(elements) if isinstance(elements, Sequence) else None)
    permutations = equivalent_positions(elements, coordinates_a, tolerance_a)
    relabelled = set()
    for p in permutations:
        moved = [None] * len(labels)
        for atom, target in enumerate(p):
            moved[target] = labels[atom]  # the label of atom i now sits at position p[i]
        relabelled.add(tuple(moved))
    return len(relabelled)  # Eq. (1) of [3]


# --- Helpers -------------------------------------------------------------------------------------


def _validated(elements, coordinates_a) -> tuple[list[int], np.ndarray]:
    """Element symbols as small integers and coordinates as an N×3 float array, or ValueError."""
    if isinstance(elements, str) or not isinstance(elements, Sequence):
        raise ValueError(f"elements must be a sequence of element symbols, one per atom, got {elements!r}")
    if len(elements) == 0:
        raise ValueError("elements must name at least one atom")
    codes: dict[str, int] = {}
    for i, symbol in enumerate(elements):
        if not isinstance(symbol, str) or not symbol.strip():
            raise ValueError(f"elements[{i}] must be an element symbol (text), got {symbol!r}")
        codes.setdefault(symbol.strip(), len(codes))
    try:
        coords = np.asarray(coordinates_a, dtype=float)
    except (TypeError, ValueError):
        raise ValueError(f"coordinates_a must be an N×3 array of numbers [Å], got {coordinates_a!r}") from None
    if coords.shape != (len(elements), 3):
        raise ValueError(
            f"coordinates_a must be an N×3 array [Å] for N = {len(elements)} atoms (one per element), "
            f"got shape {coords.shape}"
        )
    if not np.all(np.isfinite(coords)):
        raise ValueError("coordinates_a must be finite numbers [Å]")
    return [codes[symbol.strip()] for symbol in elements], coords


def _tolerance(tolerance_a) -> float:
    if (
        isinstance(tolerance_a, bool)
        or not isinstance(tolerance_a, numbers.Real)
        or not math.isfinite(tolerance_a)
        or tolerance_a <= 0
    ):
        raise ValueError(f"tolerance_a must be a finite number > 0 Å, got {tolerance_a!r}")
    return float(tolerance_a)


def _labels(labels, count: int | None) -> list:
    if isinstance(labels, str) or not isinstance(labels, Sequence):
        raise ValueError(f"labels must be a sequence with one label per atom, got {labels!r}")
    for i, label in enumerate(labels):
        try:
            hash(label)
        except TypeError:
            raise ValueError(f"labels[{i}] must be hashable (a number or text), got {label!r}") from None
    if count is not None and len(labels) != count:
        raise ValueError(f"labels has {len(labels)} entries; elements has {count}: one per atom")
    return list(labels)


def _candidates(element_codes: list[int], distances: np.ndarray, tolerance: float) -> list[list[int]]:
    """For each atom, the like atoms whose sorted distances to every element match its own."""
    codes = np.array(element_codes)
    signatures = [[np.sort(distances[i, codes == code]) for code in range(codes.max() + 1)] for i in range(codes.size)]

    def alike(i: int, j: int) -> bool:
        # Sorted lists of two multisets that match one to one within tolerance match term by term.
        return all(np.all(np.abs(a - b) <= tolerance) for a, b in zip(signatures[i], signatures[j], strict=True))

    return [[j for j in range(codes.size) if codes[j] == codes[i] and alike(i, j)] for i in range(codes.size)]


def _search_order(candidates: list[list[int]], distances: np.ndarray) -> list[int]:
    """Atoms in the order to place them: fewest candidates first, then the farthest from those placed.

    Far-apart atoms fix the orientation soonest (four atoms not in one plane
    fix it completely), so the consistency test prunes wrong branches early.
    """
    remaining = list(range(len(candidates)))
    first = min(remaining, key=lambda i: (len(candidates[i]), i))
    order = [first]
    remaining.remove(first)
    while remaining:
        nearest = distances[np.ix_(remaining, order)].min(axis=1)
        best = min(range(len(remaining)), key=lambda k: (len(candidates[remaining[k]]), -nearest[k], remaining[k]))
        order.append(remaining.pop(best))
    return order


def _check_closed(permutations: list[tuple[int, ...]], tolerance: float) -> None:
    """ValueError unless the permutations compose to one another (a group), as exact isometries do."""
    known = set(permutations)
    for p in permutations:
        for q in permutations:
            if tuple(p[q[i]] for i in range(len(q))) not in known:
                raise ValueError(
                    f"tolerance_a = {tolerance!r} Å makes some near-equal distances equal and others not: the "
                    "distance-keeping permutations found do not form a group; give a tighter or a looser tolerance_a"
                )
