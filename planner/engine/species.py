"""Validated description of one molecular species, as the engine consumes it.

The engine never reads files or databases: callers (the catalogue file reader,
the Django catalogue) build these frozen dataclasses, and construction checks
every physical constraint, raising :class:`SpeciesError` that names the field.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
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

    def __post_init__(self):
        object.__setattr__(
            self,
            "constants_mhz",
            MappingProxyType({k: (float(v[0]), float(v[1])) for k, v in dict(self.constants_mhz).items()}),
        )
        object.__setattr__(self, "covariance_names", tuple(self.covariance_names))
        object.__setattr__(self, "covariance_mhz2", tuple(tuple(float(x) for x in row) for row in self.covariance_mhz2))

    def covariance(self) -> tuple[tuple[str, ...], np.ndarray]:
        """(names, matrix as a numpy array [MHz²]); an empty pair when the state has none."""
        return self.covariance_names, np.array(self.covariance_mhz2, dtype=float).reshape(
            len(self.covariance_names), len(self.covariance_names)
        )

    def value(self, name: str) -> float:
        """Value of a constant [MHz], 0 when the state does not list it."""
        return self.constants_mhz.get(name, (0.0, 0.0))[0]

    def sigma(self, name: str) -> float:
        """1σ of a constant [MHz], 0 when the state does not list it."""
        return self.constants_mhz.get(name, (0.0, 0.0))[1]


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

    def __post_init__(self):
        object.__setattr__(self, "dipole_debye", tuple(float(x) for x in self.dipole_debye))
        object.__setattr__(self, "states", tuple(self.states))
        try:
            self._validate()
        except SpeciesError as error:
            error.species = self.name or None
            raise

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
            self._validate_constants(state, where, allowed)
            self._validate_covariance(state, f"{where}.covariance_mhz2")

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


def _finite(value) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)
