"""Weighted least-squares fit of rotational constants to assigned lines.

One state at a time: the caller gives measured, assigned line frequencies
[MHz] with their 1σ, and the names of the constants to vary; the engine's own
level solvers give the calculated frequencies ν = E_up − E_lo [MHz] and, by
Hellmann–Feynman, the analytic derivatives ∂ν/∂p = ∂E_up/∂p − ∂E_lo/∂p.  The
fit is Gauss–Newton with step halving; no finite differences are used.

Conventions
-----------
- Weights are w_i = 1/σ_i²; χ² = Σ ((obs − calc)/σ)²; degrees of freedom
  N − n (N lines, n varied constants).
- ``weighted_rms`` = √(χ²/N) [dimensionless]; ``reduced_chi2`` = χ²/(N − n).
- Reported covariance [MHz²] = (JᵀWJ)⁻¹ · χ²/(N − n): the measurement σ fix
  the relative weights, the scatter of the fit fixes the scale (the usual
  choice in line fitting, so exact synthetic data give σ → 0).  With N = n
  there is no scatter to scale by and (JᵀWJ)⁻¹ is reported unscaled.
- Determinability: the weighted Jacobian with columns scaled to unit norm is
  decomposed by SVD; a constant whose column is zero, or that carries a
  singular vector with singular value below 1e-8 of the largest, cannot be
  determined and the fit refuses it (:class:`UndeterminedError`).
  ``condition_number`` is the ratio of largest to smallest singular value of
  that same column-scaled matrix at the solution.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984
    (fitting of spectroscopic constants by weighted least squares).
[2] R. P. Feynman, Phys. Rev. 56, 340 (1939) (∂E/∂p = ⟨ψ|∂H/∂p|ψ⟩).
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field

import numpy as np

from .levels import solver_for
from .species import Species, State, allowed_parameters

__all__ = [
    "AssignedLine",
    "FitResult",
    "LineResidual",
    "UndeterminedError",
    "fit_constants",
    "frequencies_and_jacobian",
    "significant_digits",
    "undetermined_constants",
]

#: Singular values of the column-scaled weighted Jacobian below this fraction
#: of the largest one mark a combination of constants the lines cannot fix.
SINGULAR_VALUE_FLOOR = 1e-8
#: |obs − calc| above this many σ flags a line as an outlier.
OUTLIER_SIGMAS = 3.0
#: Two different assignments whose calc frequencies lie within this many σ
#: (the larger of the two lines' σ) are flagged as a blend.
BLEND_SIGMAS = 2.0
_MAX_HALVINGS = 12


class UndeterminedError(ValueError):
    """The assigned lines cannot determine some varied constants; ``names`` lists them."""

    def __init__(self, names: list[str]):
        self.names = list(names)
        listed = ", ".join(self.names)
        super().__init__(f"the lines cannot determine {listed}; hold {'it' if len(names) == 1 else 'them'} fixed")


@dataclass(frozen=True)
class AssignedLine:
    """One measured line with its assignment.

    ``ka``/``kc`` are Ka, Kc for an asymmetric top; for a symmetric top K goes
    in ``ka`` and ``kc`` is None; for a linear molecule both are None.
    ``frequency_mhz`` and its 1σ ``sigma_mhz`` (> 0) in [MHz].  ``state`` is
    the state label, "" for the species' first state.
    """

    j_up: int
    ka_up: int | None
    kc_up: int | None
    j_lo: int
    ka_lo: int | None
    kc_lo: int | None
    frequency_mhz: float
    sigma_mhz: float
    state: str = ""
    note: str = ""

    def assignment(self) -> str:
        """Readable quantum numbers, e.g. "3(1,2) - 2(1,1)"."""
        return f"{_level_text(self.j_up, self.ka_up, self.kc_up)} - {_level_text(self.j_lo, self.ka_lo, self.kc_lo)}"


@dataclass(frozen=True)
class LineResidual:
    """Observed against calculated frequency of one line [MHz]; ``index`` is its place in the input list."""

    index: int
    line: AssignedLine
    observed_mhz: float
    calculated_mhz: float
    residual_mhz: float  # obs − calc
    normalised: float  # (obs − calc)/σ [dimensionless]
    outlier: bool  # |obs − calc| > 3σ
    blended_with: tuple[int, ...] = ()


@dataclass
class FitResult:
    """Fitted constants of one state with their statistics (conventions in the module docstring)."""

    species: Species = field(repr=False)
    state: str
    names: tuple[str, ...]  # varied constants, in engine parameter order
    values: np.ndarray  # [MHz]
    sigmas: np.ndarray  # 1σ [MHz], scaled covariance
    covariance_mhz2: np.ndarray  # (n, n) [MHz²]
    correlation: np.ndarray  # (n, n) [dimensionless]
    residuals: list[LineResidual]
    chi2: float
    weighted_rms: float
    reduced_chi2: float  # NaN when there are no degrees of freedom
    degrees_of_freedom: int
    condition_number: float
    iterations: int
    undetermined: list[str] = field(default_factory=list)  # always empty on a returned fit: those raise
    blends: list[tuple[int, int]] = field(default_factory=list)  # pairs of line indices, i < j

    @property
    def outliers(self) -> list[int]:
        """Indices of lines with |obs − calc| > 3σ."""
        return [r.index for r in self.residuals if r.outlier]

    def value(self, name: str) -> float:
        """Fitted value of one varied constant [MHz]."""
        return float(self.values[self.names.index(name)])

    def sigma(self, name: str) -> float:
        """1σ of one varied constant [MHz]."""
        return float(self.sigmas[self.names.index(name)])

    def formatted(self, name: str) -> str:
        """Value with its σ in parentheses, e.g. "57635.9681(12)"."""
        return significant_digits(self.value(name), self.sigma(name))

    def fitted_species(self) -> Species:
        """A copy of the species with the fitted values, σ and covariance in the fitted state.

        Other constants and states are unchanged.  The state's covariance
        becomes the fit's covariance of the varied constants [MHz²]; an
        earlier covariance is dropped, since it belonged to the old values.
        """
        covariance = (self.covariance_mhz2 + self.covariance_mhz2.T) / 2
        sigmas = np.sqrt(np.diag(covariance))
        states = []
        for state in self.species.states:
            if state.label == self.state:
                fitted = {name: (value, sigma) for name, value, sigma in zip(self.names, self.values, sigmas)}
                state = state.with_fitted(fitted, self.names, covariance)
            states.append(state)
        return dataclasses.replace(self.species, states=tuple(states))

    def to_dict(self) -> dict:
        """JSON-ready summary; keys carry units, NaN becomes None."""
        return {
            "species": self.species.name,
            "state": self.state,
            "constants": [
                {
                    "name": name,
                    "value_mhz": _json_float(value),
                    "sigma_mhz": _json_float(sigma),
                    "formatted": significant_digits(float(value), float(sigma)),
                }
                for name, value, sigma in zip(self.names, self.values, self.sigmas)
            ],
            "covariance_mhz2": [[_json_float(x) for x in row] for row in self.covariance_mhz2],
            "correlation": [[_json_float(x) for x in row] for row in self.correlation],
            "residuals": [
                {
                    "index": r.index,
                    "assignment": r.line.assignment(),
                    "j_up": r.line.j_up,
                    "ka_up": r.line.ka_up,
                    "kc_up": r.line.kc_up,
                    "j_lo": r.line.j_lo,
                    "ka_lo": r.line.ka_lo,
                    "kc_lo": r.line.kc_lo,
                    "observed_mhz": r.observed_mhz,
                    "calculated_mhz": r.calculated_mhz,
                    "obs_minus_calc_mhz": r.residual_mhz,
                    "sigma_mhz": r.line.sigma_mhz,
                    "normalised_residual": r.normalised,
                    "outlier": r.outlier,
                    "blended_with": list(r.blended_with),
                    "note": r.line.note,
                }
                for r in self.residuals
            ],
            "line_count": len(self.residuals),
            "chi2": _json_float(self.chi2),
            "weighted_rms": _json_float(self.weighted_rms),
            "reduced_chi2": _json_float(self.reduced_chi2),
            "degrees_of_freedom": self.degrees_of_freedom,
            "condition_number": _json_float(self.condition_number),
            "iterations": self.iterations,
            "undetermined": list(self.undetermined),
            "blends": [list(pair) for pair in self.blends],
            "outliers": self.outliers,
        }


def fit_constants(
    species: Species,
    lines: list[AssignedLine],
    vary: list[str],
    *,
    max_iterations: int = 20,
    tolerance: float = 1e-10,
) -> FitResult:
    """Fit the constants named in ``vary`` to assigned lines by weighted least squares.

    Parameters
    ----------
    species : the species; constants not in ``vary`` stay at its values.
    lines : assigned lines, all of ONE state (lines of several states raise
        ValueError naming them: fit each state on its own).
    vary : names of the constants to fit [MHz]; a valid name the state does
        not list starts at 0.
    max_iterations : Gauss–Newton iterations allowed (default 20) before
        RuntimeError.
    tolerance : convergence when every step |δp| ≤ tolerance · (|p| + σ₀(p)),
        σ₀ from the unscaled covariance, or when the step would lower χ² by
        at most tolerance · (1 + χ²) (default 1e-10).

    Returns
    -------
    FitResult ; σ and covariance follow the module docstring.

    Raises
    ------
    ValueError for bad input (unknown constant or level, fewer lines than
    constants, several states), :class:`UndeterminedError` (a ValueError)
    when the lines cannot determine a constant, RuntimeError when the
    iteration does not converge.
    """
    if not isinstance(max_iterations, int) or max_iterations < 1:
        raise ValueError(f"max_iterations must be an integer >= 1, got {max_iterations!r}")
    if not (isinstance(tolerance, (int, float)) and 0 < tolerance < 1):
        raise ValueError(f"tolerance must be in (0, 1), got {tolerance!r}")
    model = _Model(species, lines, vary)
    if len(model.lines) < len(model.names):
        raise ValueError(
            f"{len(model.lines)} line(s) cannot fit {len(model.names)} constants ({', '.join(model.names)}); "
            "give at least as many lines as varied constants"
        )
    observed = np.array([line.frequency_mhz for line in model.lines])
    sigma = np.array([line.sigma_mhz for line in model.lines])

    params = model.start.copy()
    calc, jac = model.evaluate(params)
    _refuse_undetermined(model.names, jac / sigma[:, None])
    chi2 = _chi2(observed, calc, sigma)
    converged = False
    iterations = 0
    for iterations in range(1, max_iterations + 1):
        weighted = jac / sigma[:, None]
        step, unscaled_sigma = _gauss_newton_step(weighted, (observed - calc) / sigma)
        predicted_drop = float(np.sum((weighted @ step) ** 2))
        small = np.all(np.abs(step) <= tolerance * (np.abs(params) + unscaled_sigma))
        small = small or predicted_drop <= tolerance * (1.0 + chi2)
        trial = params + step
        for _ in range(_MAX_HALVINGS):
            trial_calc, trial_jac = model.evaluate(trial)
            trial_chi2 = _chi2(observed, trial_calc, sigma)
            if trial_chi2 <= chi2 * (1 + 1e-12) or small:
                break
            step = step / 2
            trial = params + step
        params, calc, jac, chi2 = trial, trial_calc, trial_jac, trial_chi2
        if small:
            converged = True
            break
    if not converged:
        raise RuntimeError(
            f"the fit did not converge in {max_iterations} iterations (χ² = {chi2:.6g}); "
            "start closer to the solution, vary fewer constants or allow more iterations"
        )
    return _result(model, params, calc, jac, observed, sigma, chi2, iterations)


def frequencies_and_jacobian(
    species: Species, lines: list[AssignedLine], vary: list[str], values: np.ndarray | None = None
) -> tuple[tuple[str, ...], np.ndarray, np.ndarray]:
    """Calculated frequencies [MHz] of the lines and ∂ν/∂p [MHz per unit of p] (analytic).

    ``values`` are the varied constants in the returned name order (engine
    parameter order); None takes the state's values (0 for unlisted ones).
    Returns (names, frequencies (N,), jacobian (N, n)).
    """
    model = _Model(species, lines, vary)
    params = model.start if values is None else np.asarray(values, dtype=float)
    if params.shape != (len(model.names),):
        raise ValueError(f"values must hold {len(model.names)} numbers for {', '.join(model.names)}")
    calc, jac = model.evaluate(params)
    return model.names, calc, jac


def undetermined_constants(species: Species, lines: list[AssignedLine], vary: list[str]) -> list[str]:
    """Names in ``vary`` the lines cannot determine at the state's current constants (SVD test)."""
    model = _Model(species, lines, vary)
    sigma = np.array([line.sigma_mhz for line in model.lines])
    _, jac = model.evaluate(model.start)
    return _undetermined(model.names, jac / sigma[:, None])


def significant_digits(value: float, sigma: float, digits: int = 2) -> str:
    """``value`` rounded to the last digit its 1σ reaches, σ in parentheses in units of that digit.

    σ is rounded to ``digits`` significant digits (default 2) and the value to
    the same decimal place: 57635.96812 ± 0.00123 → "57635.9681(12)";
    1234.5 ± 150 → "1230(150)".  σ = 0 (a constant held fixed) gives the value
    alone with 12 significant digits.  σ < 0 or non-finite input raises ValueError.
    """
    if not (math.isfinite(value) and math.isfinite(sigma)):
        raise ValueError(f"value and sigma must be finite, got {value!r} ± {sigma!r}")
    if sigma < 0:
        raise ValueError(f"sigma must be >= 0, got {sigma!r}")
    if not isinstance(digits, int) or digits < 1:
        raise ValueError(f"digits must be an integer >= 1, got {digits!r}")
    if sigma == 0:
        return f"{value:.12g}"
    decimals = digits - 1 - math.floor(math.log10(sigma))
    if round(sigma * 10.0**decimals) >= 10**digits:  # σ rounds up to one more digit, e.g. 0.00999 → 0.010
        decimals -= 1
    if decimals >= 0:
        return f"{value:.{decimals}f}({round(sigma * 10.0**decimals)})"
    unit = 10 ** (-decimals)
    return f"{round(value / unit) * unit}({round(sigma / unit) * unit})"


# --------------------------------------------------------------------------- internals


class _Model:
    """Validated lines of one state and the map constants → (calc frequencies, ∂ν/∂p)."""

    def __init__(self, species: Species, lines: list[AssignedLine], vary: list[str]):
        self.species = species
        self.lines = list(lines)
        if not self.lines:
            raise ValueError("no lines to fit")
        self.state = _single_state(species, self.lines)
        allowed = allowed_parameters(species.rotor, species.reduction)
        vary = list(vary)
        if not vary:
            raise ValueError("vary names no constant to fit")
        unknown = [name for name in vary if name not in allowed]
        if unknown:
            raise ValueError(
                f"cannot vary {', '.join(map(repr, unknown))}: not a parameter of this {species.rotor} rotor; "
                f"allowed: {', '.join(allowed)}"
            )
        if len(set(vary)) != len(vary):
            raise ValueError(f"vary lists a constant twice: {vary}")
        self.names = tuple(p for p in allowed if p in vary)
        self.start = np.array([self.state.value(p) for p in self.names])
        self.keys = [(_key(species, line, i, "up"), _key(species, line, i, "lo")) for i, line in enumerate(self.lines)]
        for i, line in enumerate(self.lines):
            if self.keys[i][0] == self.keys[i][1]:
                raise ValueError(f"lines[{i}] ({line.assignment()}): upper and lower level are the same")
        self.evaluate(self.start)  # raises on levels that do not exist

    def evaluate(self, params: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        constants = dict(self.state.constants_mhz)
        for name, value in zip(self.names, params):
            constants[name] = (float(value), 0.0)
        trial = State(self.state.label, self.state.energy_cm1, constants, degeneracy=self.state.degeneracy)
        solver = solver_for(self.species, trial, derivative_names=self.names)
        if tuple(solver.derivative_names) != self.names:  # guards the column order
            raise AssertionError(f"solver derivative order {solver.derivative_names} != {self.names}")
        levels = {}
        for j in sorted({key[0] for pair in self.keys for key in pair}):
            solved = solver.solve(j)
            levels[j] = (
                {(int(a), int(c)): n for n, (a, c) in enumerate(zip(solved.ka, solved.kc))},
                solved.energies_mhz,
                solved.derivatives,
            )
        calc = np.empty(len(self.lines))
        jac = np.empty((len(self.lines), len(self.names)))
        for i, (upper, lower) in enumerate(self.keys):
            e_up, d_up = _level(levels, upper, i, "upper", self.lines[i])
            e_lo, d_lo = _level(levels, lower, i, "lower", self.lines[i])
            calc[i] = e_up - e_lo
            jac[i] = d_up - d_lo  # ∂ν/∂p = ∂E_up/∂p − ∂E_lo/∂p (Hellmann–Feynman, [2])
        return calc, jac


def _single_state(species: Species, lines: list[AssignedLine]) -> State:
    by_label = {state.label: state for state in species.states}
    labels = [line.state or species.states[0].label for line in lines]
    unknown = sorted(set(labels) - set(by_label))
    if unknown:
        raise ValueError(
            f"unknown state {', '.join(map(repr, unknown))} for {species.name}; states: {', '.join(by_label)}"
        )
    used = sorted(set(labels))
    if len(used) > 1:
        raise ValueError(
            f"the lines belong to several states ({', '.join(map(repr, used))}); fit_constants fits one state "
            "at a time: give the lines of each state separately"
        )
    return by_label[used[0]]


def _key(species: Species, line: AssignedLine, index: int, which: str) -> tuple[int, int, int]:
    """(J, Ka, Kc) as the solvers label levels: −1 where undefined."""
    j, ka, kc = getattr(line, f"j_{which}"), getattr(line, f"ka_{which}"), getattr(line, f"kc_{which}")
    where = f"lines[{index}] ({line.assignment()})"
    for name, value in ((f"j_{which}", j), (f"ka_{which}", ka), (f"kc_{which}", kc)):
        if value is not None and (isinstance(value, bool) or not isinstance(value, (int, np.integer))):
            raise ValueError(f"{where}: {name} must be an integer or None, got {value!r}")
    if j is None or j < 0:
        raise ValueError(f"{where}: j_{which} must be an integer >= 0, got {j!r}")
    for name in ("frequency_mhz", "sigma_mhz"):
        value = getattr(line, name)
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value <= 0:
            raise ValueError(f"{where}: {name} must be a number > 0 MHz, got {value!r}")
    if species.rotor == "linear":
        if ka not in (None, -1) or kc not in (None, -1):
            raise ValueError(f"{where}: a linear molecule's levels have no Ka, Kc; give None")
        return (int(j), -1, -1)
    if species.rotor.startswith("symmetric"):
        if ka is None or kc not in (None, -1):
            raise ValueError(f"{where}: a symmetric top's level takes K in ka_{which} and kc_{which} = None")
        return (int(j), int(ka), -1)
    if ka is None or kc is None:
        raise ValueError(f"{where}: an asymmetric top's level needs both ka_{which} and kc_{which}")
    return (int(j), int(ka), int(kc))


def _level(levels, key, index: int, which: str, line: AssignedLine):
    lookup, energies, derivatives = levels[key[0]]
    n = lookup.get((key[1], key[2]))
    if n is None:
        raise ValueError(
            f"lines[{index}] ({line.assignment()}): the {which} level {_level_text(*key)} does not exist "
            "for this rotor (check K ≤ J and Ka + Kc = J or J + 1)"
        )
    return energies[n], derivatives[n]


def _chi2(observed: np.ndarray, calc: np.ndarray, sigma: np.ndarray) -> float:
    return float(np.sum(((observed - calc) / sigma) ** 2))


def _scaled_svd(weighted: np.ndarray):
    norms = np.linalg.norm(weighted, axis=0)
    safe = np.where(norms > 0, norms, 1.0)
    _, singular, vt = np.linalg.svd(weighted / safe, full_matrices=False)
    return norms, safe, singular, vt


def _undetermined(names: tuple[str, ...], weighted: np.ndarray) -> list[str]:
    norms, _, singular, vt = _scaled_svd(weighted)
    bad = set()
    biggest = norms.max() if norms.size else 0.0
    for i, norm in enumerate(norms):
        if norm <= 1e-14 * biggest or norm == 0:
            bad.add(i)
    good = [i for i in range(len(names)) if i not in bad]
    if len(good) > 0 and biggest > 0:
        _, _, singular, vt = _scaled_svd(weighted[:, good])
        for value, vector in zip(singular, vt):
            if value < SINGULAR_VALUE_FLOOR * singular[0]:
                weight = np.abs(vector)
                bad.update(good[k] for k in np.flatnonzero(weight >= 0.5 * weight.max()))
    return [names[i] for i in sorted(bad)]


def _refuse_undetermined(names: tuple[str, ...], weighted: np.ndarray) -> None:
    bad = _undetermined(names, weighted)
    if bad:
        raise UndeterminedError(bad)


def _gauss_newton_step(weighted: np.ndarray, residual: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Least-squares step of the column-scaled system and the unscaled σ₀ of each constant."""
    _, safe, singular, vt = _scaled_svd(weighted)
    # Solve (W/n) y = r by SVD, then δ = y/n: column scaling keeps constants of very different size apart.
    u = (weighted / safe) @ vt.T / singular
    step = (vt.T @ ((u.T @ residual) / singular)) / safe
    covariance = (vt.T / singular**2) @ vt / np.outer(safe, safe)
    return step, np.sqrt(np.diag(covariance))


def _result(model: _Model, params, calc, jac, observed, sigma, chi2, iterations) -> FitResult:
    weighted = jac / sigma[:, None]
    _refuse_undetermined(model.names, weighted)
    _, safe, singular, vt = _scaled_svd(weighted)
    unscaled = (vt.T / singular**2) @ vt / np.outer(safe, safe)  # (JᵀWJ)⁻¹ [MHz²]
    n_lines, n_params = len(model.lines), len(model.names)
    dof = n_lines - n_params
    reduced = chi2 / dof if dof > 0 else math.nan
    covariance = unscaled * (reduced if dof > 0 else 1.0)
    diagonal = np.sqrt(np.diag(unscaled))
    correlation = unscaled / np.outer(diagonal, diagonal)
    np.fill_diagonal(correlation, 1.0)
    blends = _blends(model, calc, sigma)
    partners: dict[int, list[int]] = {}
    for i, j in blends:
        partners.setdefault(i, []).append(j)
        partners.setdefault(j, []).append(i)
    residuals = []
    for i, line in enumerate(model.lines):
        difference = float(observed[i] - calc[i])
        residuals.append(
            LineResidual(
                index=i,
                line=line,
                observed_mhz=float(observed[i]),
                calculated_mhz=float(calc[i]),
                residual_mhz=difference,
                normalised=difference / float(sigma[i]),
                outlier=abs(difference) > OUTLIER_SIGMAS * float(sigma[i]),
                blended_with=tuple(sorted(partners.get(i, []))),
            )
        )
    return FitResult(
        species=model.species,
        state=model.state.label,
        names=model.names,
        values=np.asarray(params, dtype=float),
        sigmas=np.sqrt(np.diag(covariance)),
        covariance_mhz2=covariance,
        correlation=correlation,
        residuals=residuals,
        chi2=chi2,
        weighted_rms=math.sqrt(chi2 / n_lines),
        reduced_chi2=reduced,
        degrees_of_freedom=dof,
        condition_number=float(singular[0] / singular[-1]),
        iterations=iterations,
        undetermined=[],
        blends=blends,
    )


def _blends(model: _Model, calc: np.ndarray, sigma: np.ndarray) -> list[tuple[int, int]]:
    """Pairs of lines with different assignments whose calc frequencies agree within 2σ (larger σ)."""
    order = np.argsort(calc)
    pairs = []
    for a_pos, i in enumerate(order):
        for j in order[a_pos + 1 :]:
            limit = BLEND_SIGMAS * max(sigma[i], sigma[j])
            if calc[j] - calc[i] > BLEND_SIGMAS * sigma.max():
                break
            if abs(calc[j] - calc[i]) <= limit and model.keys[i] != model.keys[j]:
                pairs.append((int(min(i, j)), int(max(i, j))))
    return sorted(pairs)


def _level_text(j, ka, kc) -> str:
    if ka is None or ka == -1:
        return str(j)
    if kc is None or kc == -1:
        return f"{j}(K={ka})"
    return f"{j}({ka},{kc})"


def _json_float(x) -> float | None:
    x = float(x)
    return x if math.isfinite(x) else None
