"""Validated description of one molecular species, as the engine consumes it.

The engine never reads files or databases: callers (the catalogue file reader,
the Django catalogue) build these frozen dataclasses, and construction checks
every physical constraint, raising :class:`SpeciesError` that names the field.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Mapping

import numpy as np

ROTOR_KINDS = ("linear", "symmetric-prolate", "symmetric-oblate", "asymmetric")
REDUCTIONS = ("A", "S")
REPRESENTATIONS = ("Ir", "IIIr")

#: Parameter names allowed for each Hamiltonian, in the order the engine uses.
LINEAR_PARAMETERS = ("B", "D", "H")
PROLATE_PARAMETERS = ("A", "B", "DJ", "DJK", "DK", "HJ", "HJK", "HKJ", "HK")
OBLATE_PARAMETERS = ("C", "B", "DJ", "DJK", "DK", "HJ", "HJK", "HKJ", "HK")
A_REDUCTION_PARAMETERS = (
    "A",
    "B",
    "C",
    "DeltaJ",
    "DeltaJK",
    "DeltaK",
    "deltaJ",
    "deltaK",
    "PhiJ",
    "PhiJK",
    "PhiKJ",
    "PhiK",
    "phiJ",
    "phiJK",
    "phiK",
)
S_REDUCTION_PARAMETERS = (
    "A",
    "B",
    "C",
    "DJ",
    "DJK",
    "DK",
    "d1",
    "d2",
    "HJ",
    "HJK",
    "HKJ",
    "HK",
    "h1",
    "h2",
    "h3",
)

#: Constants that must be given (and be > 0) for each rotor kind.
REQUIRED_PARAMETERS = {
    "linear": ("B",),
    "symmetric-prolate": ("A", "B"),
    "symmetric-oblate": ("C", "B"),
    "asymmetric": ("A", "B", "C"),
}

MAX_DIPOLE_DEBYE = 15.0  # no neutral molecule comes near this; catches unit slips

#: How a species' constants were obtained: typed in (measured or computed elsewhere), scaled from the
#: parent by the diatomic mass relations, or scaled from the parent through a stored geometry.
CONSTANTS_ROUTES = ("entered", "mass-scaling", "geometry-ratio")
#: Principal-axis components of a quadrupole coupling tensor, in file and engine order.
QUADRUPOLE_COMPONENTS = ("aa", "bb", "cc")
#: |χaa + χbb + χcc| allowed for three typed-in components [MHz] (published values are rounded).
QUADRUPOLE_TRACE_TOLERANCE_MHZ = 0.01
#: Two atoms of a geometry closer than this are a typing slip [Å].
MIN_ATOM_DISTANCE_A = 0.3


def allowed_parameters(rotor: str, reduction: str = "A") -> tuple[str, ...]:
    """Parameter names a state of this rotor kind (and reduction) may carry."""
    if rotor == "linear":
        return LINEAR_PARAMETERS
    if rotor == "symmetric-prolate":
        return PROLATE_PARAMETERS
    if rotor == "symmetric-oblate":
        return OBLATE_PARAMETERS
    if rotor == "asymmetric":
        return A_REDUCTION_PARAMETERS if reduction == "A" else S_REDUCTION_PARAMETERS
    raise SpeciesError("rotor", f"unknown rotor kind {rotor!r}; expected one of {', '.join(ROTOR_KINDS)}")


class SpeciesError(ValueError):
    """A species description breaks a physical or format rule.

    ``field`` is a dotted path such as ``states[0].constants_mhz.B``; ``species``
    is filled in by whoever knows the species name.
    """

    def __init__(self, field: str, message: str, species: str | None = None):
        self.field = field
        self.message = message
        self.species = species
        super().__init__(str(self))

    def __str__(self) -> str:
        where = f"{self.species}: " if self.species else ""
        return f"{where}{self.field}: {self.message}"


@dataclass(frozen=True)
class SpinWeights:
    """Nuclear-spin statistical weights of the rotational levels.

    ``axis`` is "a", "b" or "c" for a C2 axis: a level is *even* when
    (-1)^Ka (a), (-1)^(Ka+Kc) (b) or (-1)^Kc (c) is +1, and gets weight
    ``even``, else ``odd``.  ``axis`` is "C3" for a symmetric top with a
    threefold axis: levels with K a multiple of 3 (K = 0 included) get
    ``even`` and the others ``odd`` (the catalogue file calls these
    ``k_multiple_of_3`` and ``other``).  Weights are per K component; the
    ±K degeneracy of a symmetric top is counted separately.
    """

    axis: str
    even: float
    odd: float

    def __post_init__(self):
        if self.axis not in ("a", "b", "c", "C3"):
            raise SpeciesError("spin_weights.axis", f"must be 'a', 'b', 'c' or 'C3', got {self.axis!r}")
        for name in ("even", "odd"):
            value = getattr(self, name)
            if not _finite(value) or value < 0:
                raise SpeciesError(f"spin_weights.{name}", f"must be a number >= 0, got {value!r}")
        if self.even == 0 and self.odd == 0:
            raise SpeciesError("spin_weights", "both weights are zero: no level would exist")


@dataclass(frozen=True)
class State:
    """One vibrational (or other) state with its own rotational constants.

    ``energy_cm1`` is the state's origin above the ground state [cm^-1];
    ``constants_mhz`` maps parameter name to ``(value, sigma)`` [MHz].
    """

    label: str
    energy_cm1: float
    constants_mhz: Mapping[str, tuple[float, float]]
    #: Covariance of some of the constants (e.g. from a fit): the names and the symmetric matrix [MHz²]
    #: in that order.  Its diagonal is the σ² of those constants; others stay uncorrelated.
    covariance_names: tuple[str, ...] = ()
    covariance_mhz2: tuple[tuple[float, ...], ...] = ()
    #: Vibrational degeneracy g_v (2 for one quantum of a doubly degenerate bend) [dimensionless].
    degeneracy: int = 1
    #: Constants given as differences from the ground state, {name: (α, σ)} [MHz]: this state's
    #: value is the ground state's minus α (α = Σ αi·vi over the state's quanta).  Species fills
    #: ``constants_mhz`` with the result and takes the ground state's other constants over.
    alpha_mhz: Mapping[str, tuple[float, float]] = field(default_factory=dict)
    #: Names in ``constants_mhz`` that Species derived (from alpha_mhz or the ground state), not typed in.
    derived_names: tuple[str, ...] = ()

    def __post_init__(self):
        for name in ("constants_mhz", "alpha_mhz"):
            pairs = {k: (float(v[0]), float(v[1])) for k, v in dict(getattr(self, name)).items()}
            object.__setattr__(self, name, MappingProxyType(pairs))
        object.__setattr__(self, "derived_names", tuple(self.derived_names))
        object.__setattr__(self, "covariance_names", tuple(self.covariance_names))
        object.__setattr__(self, "covariance_mhz2", tuple(tuple(float(x) for x in row) for row in self.covariance_mhz2))

    def covariance(self) -> tuple[tuple[str, ...], np.ndarray]:
        """(names, matrix as a numpy array [MHz²]); an empty pair when the state has none."""
        return self.covariance_names, np.array(self.covariance_mhz2, dtype=float).reshape(
            len(self.covariance_names), len(self.covariance_names)
        )

    @property
    def stored_constants_mhz(self) -> dict[str, tuple[float, float]]:
        """The constants to write back [MHz]: those typed in when the state has ``alpha_mhz``
        (the others are derived again on reading), else all of them."""
        if not self.alpha_mhz:
            return dict(self.constants_mhz)
        return {k: v for k, v in self.constants_mhz.items() if k not in self.derived_names}

    def with_fitted(self, constants_mhz, covariance_names, covariance_mhz2) -> "State":
        """A copy with some constants replaced by fitted (value, σ) [MHz] and the fit's covariance [MHz²].

        A fitted constant becomes a typed-in one: its α, if it had one, is dropped.
        """
        merged = dict(self.constants_mhz)
        merged.update({k: (float(v[0]), float(v[1])) for k, v in dict(constants_mhz).items()})
        fitted = set(dict(constants_mhz))
        return State(
            self.label,
            self.energy_cm1,
            merged,
            tuple(covariance_names),
            tuple(tuple(float(x) for x in row) for row in covariance_mhz2),
            self.degeneracy,
            {k: v for k, v in self.alpha_mhz.items() if k not in fitted},
            tuple(n for n in self.derived_names if n not in fitted),
        )

    def value(self, name: str) -> float:
        """Value of a constant [MHz], 0 when the state does not list it."""
        return self.constants_mhz.get(name, (0.0, 0.0))[0]

    def sigma(self, name: str) -> float:
        """1σ of a constant [MHz], 0 when the state does not list it."""
        return self.constants_mhz.get(name, (0.0, 0.0))[1]


@dataclass(frozen=True)
class Atom:
    """One atom of a stored geometry: element symbol, isotope mass number (None: the commonest) and
    Cartesian position [Å] in any frame (the principal axes are found from the masses)."""

    element: str
    mass_number: int | None
    xyz_a: tuple[float, float, float]

    def __post_init__(self):
        object.__setattr__(self, "xyz_a", tuple(self.xyz_a))


@dataclass(frozen=True)
class Quadrupole:
    """One nucleus with an electric quadrupole moment that splits the rotational levels.

    ``spin`` is its nuclear spin I (≥ 1, a multiple of ½); ``chi_mhz`` maps
    "aa", "bb", "cc" to (χ_gg, σ) [MHz], the coupling constants eQq_gg along
    the principal axes.  Species completes missing components from the
    traceless condition χaa + χbb + χcc = 0 (and, for a linear molecule or a
    symmetric top, from the axial symmetry of a nucleus on the axis).
    """

    nucleus: str
    spin: float
    chi_mhz: Mapping[str, tuple[float, float]]

    def __post_init__(self):
        pairs = {k: (float(v[0]), float(v[1])) for k, v in dict(self.chi_mhz).items()}
        object.__setattr__(self, "chi_mhz", MappingProxyType(pairs))

    def chi(self, component: str) -> float:
        """χ_gg [MHz] of "aa", "bb" or "cc"."""
        return self.chi_mhz[component][0]


@dataclass(frozen=True)
class Species:
    """A molecule (or isotopologue) with everything the engine needs.

    ``mass_amu`` [u]; ``dipole_debye`` = (μa, μb, μc) [D], the sign is
    irrelevant; ``states`` lists at least one state, the ground state first by
    convention (energies need not be sorted).
    """

    name: str
    rotor: str
    mass_amu: float
    dipole_debye: tuple[float, float, float]
    states: tuple[State, ...]
    formula: str = ""
    reduction: str = "A"
    representation: str = "Ir"
    spin_weights: SpinWeights | None = None
    source: str = ""
    notes: str = ""
    hazards: str = ""  # handling notes for the lab; the engine does not read them
    #: One quadrupolar nucleus, or None for no hyperfine structure.
    hyperfine: Quadrupole | None = None
    #: Atoms of a stored geometry (for isotopologues and structure), () when none.
    geometry: tuple[Atom, ...] = ()
    #: Name of the species this isotopologue was derived from ("" for none).
    parent: str = ""
    #: Fraction of the molecules of a sample of natural isotopic composition that are this isotopologue
    #: [dimensionless, (0, 1]]; None when not stated (then the plan weights it 1).
    natural_abundance: float | None = None
    #: How the constants were obtained (CONSTANTS_ROUTES) and what accuracy to expect, in words.
    constants_route: str = "entered"
    route_note: str = ""

    def __post_init__(self):
        object.__setattr__(self, "dipole_debye", tuple(float(x) for x in self.dipole_debye))
        object.__setattr__(self, "states", tuple(self.states))
        object.__setattr__(self, "geometry", tuple(self.geometry))
        try:
            object.__setattr__(self, "states", _resolved_states(self.states))
            if self.hyperfine is not None:
                object.__setattr__(self, "hyperfine", _completed_quadrupole(self.hyperfine, self.rotor))
            self._validate()
        except SpeciesError as error:
            error.species = self.name or None
            raise

    @property
    def ground_state(self) -> State:
        """The state of lowest energy (the first of equal ones)."""
        return min(self.states, key=lambda s: s.energy_cm1)

    def is_satellite(self, state: State) -> bool:
        """True for a state above the ground state (its lines are vibrational satellites)."""
        return state.energy_cm1 > self.ground_state.energy_cm1

    def _validate(self) -> None:
        if not isinstance(self.name, str) or not self.name.strip():
            raise SpeciesError("name", "must be a non-empty text")
        if self.rotor not in ROTOR_KINDS:
            raise SpeciesError("rotor", f"unknown rotor kind {self.rotor!r}; expected one of {', '.join(ROTOR_KINDS)}")
        if self.reduction not in REDUCTIONS:
            raise SpeciesError("reduction", f"must be 'A' or 'S', got {self.reduction!r}")
        if self.representation not in REPRESENTATIONS:
            raise SpeciesError("representation", f"must be 'Ir' or 'IIIr', got {self.representation!r}")
        if not _finite(self.mass_amu) or self.mass_amu <= 0:
            raise SpeciesError("mass_amu", f"must be > 0 u, got {self.mass_amu!r}")
        if len(self.dipole_debye) != 3:
            raise SpeciesError("dipole_debye", "needs the three components a, b, c")
        for axis, mu in zip("abc", self.dipole_debye):
            if not _finite(mu) or abs(mu) > MAX_DIPOLE_DEBYE:
                raise SpeciesError(f"dipole_debye.{axis}", f"must be within 0–{MAX_DIPOLE_DEBYE:g} D, got {mu!r}")
        if self.rotor == "linear" and (self.dipole_debye[1] or self.dipole_debye[2]):
            raise SpeciesError("dipole_debye", "a linear molecule has its dipole along the axis: give only 'a'")
        if self.rotor == "symmetric-prolate" and (self.dipole_debye[1] or self.dipole_debye[2]):
            raise SpeciesError("dipole_debye", "a prolate top has its dipole along the symmetry axis a: give only 'a'")
        if self.rotor == "symmetric-oblate" and (self.dipole_debye[0] or self.dipole_debye[1]):
            raise SpeciesError("dipole_debye", "an oblate top has its dipole along the symmetry axis c: give only 'c'")
        if self.spin_weights is not None:
            if self.rotor == "asymmetric" and self.spin_weights.axis == "C3":
                raise SpeciesError("spin_weights.axis", "an asymmetric top has no C3 axis; use 'a', 'b' or 'c'")
            if self.rotor == "linear":
                raise SpeciesError("spin_weights", "a linear molecule takes no spin weights (it has no K levels)")
            if self.rotor.startswith("symmetric") and self.spin_weights.axis != "C3":
                raise SpeciesError("spin_weights.axis", "a symmetric top takes axis 'C3' weights only")
        self._validate_isotopologue()
        self._validate_geometry()
        if self.hyperfine is not None:
            self._validate_hyperfine()
        if not self.states:
            raise SpeciesError("states", "at least one state is needed")
        labels = set()
        allowed = allowed_parameters(self.rotor, self.reduction)
        for index, state in enumerate(self.states):
            where = f"states[{index}]"
            if not isinstance(state.label, str) or not state.label.strip():
                raise SpeciesError(f"{where}.label", "must be a non-empty text")
            if state.label in labels:
                raise SpeciesError(f"{where}.label", f"state label {state.label!r} is used twice")
            labels.add(state.label)
            if not _finite(state.energy_cm1) or state.energy_cm1 < 0:
                raise SpeciesError(f"{where}.energy_cm1", f"must be >= 0 cm-1, got {state.energy_cm1!r}")
            if isinstance(state.degeneracy, bool) or not isinstance(state.degeneracy, int) or state.degeneracy < 1:
                raise SpeciesError(f"{where}.degeneracy", f"must be a whole number >= 1, got {state.degeneracy!r}")
            self._validate_constants(state, where, allowed)
            self._validate_covariance(state, f"{where}.covariance_mhz2")

    def _validate_isotopologue(self) -> None:
        if self.constants_route not in CONSTANTS_ROUTES:
            raise SpeciesError(
                "constants_route", f"must be one of {', '.join(CONSTANTS_ROUTES)}, got {self.constants_route!r}"
            )
        x = self.natural_abundance
        if x is not None and (not _finite(x) or not 0 < x <= 1):
            raise SpeciesError("natural_abundance", f"must be a fraction in (0, 1] (not per cent), got {x!r}")
        if not isinstance(self.parent, str):
            raise SpeciesError("parent", "must be a text")
        if self.parent and self.parent == self.name:
            raise SpeciesError("parent", "a species cannot be its own parent")

    def _validate_geometry(self) -> None:
        if not self.geometry:
            return
        if len(self.geometry) < 2:
            raise SpeciesError("geometry", "needs at least two atoms")
        for index, atom in enumerate(self.geometry):
            where = f"geometry[{index}]"
            if not isinstance(atom.element, str) or not atom.element.isalpha():
                raise SpeciesError(f"{where}.element", f"must be an element symbol such as 'C', got {atom.element!r}")
            number = atom.mass_number
            if number is not None and (isinstance(number, bool) or not isinstance(number, int) or number < 1):
                raise SpeciesError(f"{where}.isotope", f"must be a mass number such as 13, got {number!r}")
            if len(atom.xyz_a) != 3 or not all(_finite(v) for v in atom.xyz_a):
                raise SpeciesError(f"{where}.xyz_a", "must be three finite coordinates [Å]")
        xyz = np.array([atom.xyz_a for atom in self.geometry])
        distance = np.linalg.norm(xyz[:, None, :] - xyz[None, :, :], axis=-1) + np.eye(len(xyz)) * 1e9
        i, j = np.unravel_index(np.argmin(distance), distance.shape)
        if distance[i, j] < MIN_ATOM_DISTANCE_A:
            raise SpeciesError(
                f"geometry[{max(i, j)}].xyz_a",
                f"lies {distance[i, j]:.3g} Å from geometry[{min(i, j)}]: atoms this close are a typing slip",
            )

    def _validate_hyperfine(self) -> None:
        quad = self.hyperfine
        if not isinstance(quad.nucleus, str) or not quad.nucleus.strip():
            raise SpeciesError("hyperfine.nucleus", "must name the nucleus, e.g. '14N'")
        spin = quad.spin
        if not _finite(spin) or spin < 1 or abs(2 * spin - round(2 * spin)) > 1e-9:
            raise SpeciesError("hyperfine.spin", f"must be a nuclear spin I >= 1 in steps of 1/2, got {spin!r}")
        for component, (value, sigma) in quad.chi_mhz.items():
            if component not in QUADRUPOLE_COMPONENTS:
                raise SpeciesError(f"hyperfine.chi_mhz.{component}", "unknown component; use aa, bb, cc")
            if not _finite(value) or not _finite(sigma) or sigma < 0:
                raise SpeciesError(f"hyperfine.chi_mhz.{component}", "needs a finite value and a σ >= 0 [MHz]")
        trace = sum(quad.chi(c) for c in QUADRUPOLE_COMPONENTS)
        if abs(trace) > QUADRUPOLE_TRACE_TOLERANCE_MHZ:
            raise SpeciesError(
                "hyperfine.chi_mhz",
                f"χaa + χbb + χcc must be 0 (the field gradient is traceless), got {trace:.6g} MHz",
            )

    def _validate_constants(self, state: State, where: str, allowed: tuple[str, ...]) -> None:
        for name, (value, sigma) in state.constants_mhz.items():
            path = f"{where}.constants_mhz.{name}"
            if name not in allowed:
                kind = self.rotor + (f" ({self.reduction}-reduction)" if self.rotor == "asymmetric" else "")
                article = "an" if kind[0] in "aeiou" else "a"
                raise SpeciesError(
                    path, f"unknown parameter {name!r} for {article} {kind} rotor; allowed: {', '.join(allowed)}"
                )
            if not _finite(value):
                raise SpeciesError(path, f"value must be a finite number, got {value!r}")
            if not _finite(sigma) or sigma < 0:
                raise SpeciesError(path, f"sigma must be >= 0, got {sigma!r}")
        for name in REQUIRED_PARAMETERS[self.rotor]:
            if name not in state.constants_mhz:
                raise SpeciesError(f"{where}.constants_mhz.{name}", "is required for this rotor kind")
            if state.value(name) <= 0:
                raise SpeciesError(f"{where}.constants_mhz.{name}", f"must be > 0 MHz, got {state.value(name)!r}")
        a, b, c = state.value("A"), state.value("B"), state.value("C")
        if self.rotor == "asymmetric" and not (a >= b >= c):
            raise SpeciesError(f"{where}.constants_mhz", f"needs A >= B >= C, got A={a}, B={b}, C={c} MHz")
        if self.rotor == "symmetric-prolate" and a < b:
            raise SpeciesError(f"{where}.constants_mhz.A", f"a prolate top needs A >= B, got A={a}, B={b} MHz")
        if self.rotor == "symmetric-oblate" and c > b:
            raise SpeciesError(f"{where}.constants_mhz.C", f"an oblate top needs C <= B, got C={c}, B={b} MHz")

    @staticmethod
    def _validate_covariance(state: State, where: str) -> None:
        names, rows = state.covariance_names, state.covariance_mhz2
        if not names and not rows:
            return
        if len(set(names)) != len(names):
            raise SpeciesError(f"{where}.names", "a constant is named twice")
        missing = [n for n in names if n not in state.constants_mhz]
        if missing:
            raise SpeciesError(f"{where}.names", f"names constants the state does not list: {', '.join(missing)}")
        if len(rows) != len(names) or any(len(row) != len(names) for row in rows):
            raise SpeciesError(f"{where}.matrix", f"must be {len(names)} × {len(names)}, one row and column per name")
        for i, row in enumerate(rows):
            for j, value in enumerate(row):
                if not _finite(value):
                    raise SpeciesError(f"{where}.matrix", f"element [{i}][{j}] must be a finite number")
                if not math.isclose(value, rows[j][i], rel_tol=1e-9, abs_tol=1e-300):
                    raise SpeciesError(f"{where}.matrix", f"must be symmetric; [{i}][{j}] differs from [{j}][{i}]")
            sigma = state.sigma(names[i])
            if row[i] < 0 or not math.isclose(math.sqrt(row[i]), sigma, rel_tol=1e-6, abs_tol=1e-300):
                raise SpeciesError(
                    f"{where}.matrix",
                    f"diagonal of {names[i]} must be its σ² = {sigma**2:.6g} MHz², got {row[i]:.6g}",
                )

    @property
    def has_dipole(self) -> bool:
        return any(mu != 0 for mu in self.dipole_debye)


def _resolved_states(states: tuple[State, ...]) -> tuple[State, ...]:
    """States with ``alpha_mhz`` given their constants: ground-state value minus α, the rest taken over.

    B_v = Be − Σ αi (vi + di/2) for each mode i with degeneracy di gives
    B_v = B_0 − Σ αi vi, the same for A and C (Gordy & Cook 1984, Ch. 13), so α
    here is Σ αi vi of the state's quanta.  σ² adds the ground state's σ² and α's.
    """
    if not any(state.alpha_mhz for state in states) or not states:
        return states
    ground = min(states, key=lambda s: s.energy_cm1)
    resolved = []
    for index, state in enumerate(states):
        if not state.alpha_mhz:
            resolved.append(state)
            continue
        where = f"states[{index}].alpha_mhz"
        if state is ground:
            raise SpeciesError(where, "the ground state cannot be given as a difference from itself")
        # From the typed-in constants every time, so that a changed (e.g. refitted) ground state carries over.
        constants = state.stored_constants_mhz
        derived = []
        for name, (alpha, sigma) in state.alpha_mhz.items():
            if name in constants:
                raise SpeciesError(f"{where}.{name}", f"give {name} either in constants_mhz or in alpha_mhz, not both")
            if name not in ground.constants_mhz:
                raise SpeciesError(f"{where}.{name}", f"the ground state ({ground.label}) has no {name} to start from")
            if not (_finite(alpha) and _finite(sigma) and sigma >= 0):
                raise SpeciesError(f"{where}.{name}", "needs a finite α and a σ >= 0 [MHz]")
            value, ground_sigma = ground.constants_mhz[name]
            constants[name] = (value - alpha, math.hypot(ground_sigma, sigma))
            derived.append(name)
        for name, pair in ground.constants_mhz.items():
            if name not in constants:
                constants[name] = pair
                derived.append(name)
        resolved.append(
            State(
                state.label,
                state.energy_cm1,
                constants,
                state.covariance_names,
                state.covariance_mhz2,
                state.degeneracy,
                state.alpha_mhz,
                tuple(derived),
            )
        )
    return tuple(resolved)


def _completed_quadrupole(quad: Quadrupole, rotor: str) -> Quadrupole:
    """All three χ_gg: missing ones from χaa + χbb + χcc = 0 and, on a symmetry axis, axial symmetry."""
    given = dict(quad.chi_mhz)
    missing = [c for c in QUADRUPOLE_COMPONENTS if c not in given]
    if not missing:
        return quad
    if len(missing) == 1:
        others = [given[c] for c in QUADRUPOLE_COMPONENTS if c != missing[0]]
        given[missing[0]] = (-(others[0][0] + others[1][0]), math.hypot(others[0][1], others[1][1]))
    elif len(missing) == 2 and rotor != "asymmetric":
        (axis,) = [c for c in QUADRUPOLE_COMPONENTS if c in given]
        expected = "cc" if rotor == "symmetric-oblate" else "aa"
        if axis != expected:
            raise SpeciesError(
                "hyperfine.chi_mhz",
                f"a {rotor} rotor with one coupling constant needs it along its symmetry axis: give {expected!r}",
            )
        value, sigma = given[axis]
        for c in missing:
            given[c] = (-value / 2.0, sigma / 2.0)
    else:
        raise SpeciesError(
            "hyperfine.chi_mhz",
            "give at least two of aa, bb, cc (an asymmetric top), or the one along the symmetry axis",
        )
    return Quadrupole(quad.nucleus, quad.spin, {c: given[c] for c in QUADRUPOLE_COMPONENTS})


def _finite(value) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)
