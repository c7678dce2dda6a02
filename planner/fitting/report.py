"""The stored form of a fit (JSON) and what the pages derive from it."""

from __future__ import annotations

import dataclasses

from planner.catalogue_file.masses import diatomic_masses
from planner.engine.derived import inertial_defect_amu_a2, moments_of_inertia_amu_a2
from planner.engine.structure import bond_length_a, equilibrium_b_mhz


def structure(result, species) -> list[tuple[str, str]]:
    """(quantity, value text) derived from the fitted constants: r0 of a diatomic, moments, Δ."""
    rows = []
    masses = diatomic_masses(species.formula) if species.rotor == "linear" else None
    if masses and "B" in result.names:
        r0, sigma = bond_length_a(result.value("B"), *masses, sigma_b_mhz=result.sigma("B"))
        rows.append(("r0 from B0 [Å]", f"{r0:.6f} ± {sigma:.1g} (σ from σ(B) only; r0 is not re)"))
        rows += equilibrium_rows(species, masses, result.value("B"), result.sigma("B"))
    fitted = result.fitted_species()
    state = next(s for s in fitted.states if s.label == result.state)
    if species.rotor == "asymmetric":
        a, b, c = (state.value(n) for n in "ABC")
        moments = moments_of_inertia_amu_a2(a, b, c)
        rows += [(f"I{axis} [u Å²]", f"{value:.6g}") for axis, value in zip("abc", moments)]
        rows.append(("inertial defect Δ = Ic − Ia − Ib [u Å²]", f"{inertial_defect_amu_a2(a, b, c):.5g}"))
    return rows


def equilibrium_rows(species, masses, b0_mhz: float, sigma_b0_mhz: float) -> list[tuple[str, str]]:
    """αe, Be and re of a diatomic whose catalogue has a state labelled v=1 (B1 = B0 − αe)."""
    excited = next((s for s in species.states if s.label.replace(" ", "") == "v=1" and "B" in s.constants_mhz), None)
    if excited is None:
        return []
    alpha = b0_mhz - excited.value("B")
    sigma_alpha = (sigma_b0_mhz**2 + excited.sigma("B") ** 2) ** 0.5
    be, sigma_be = equilibrium_b_mhz(b0_mhz, alpha, sigma_b0_mhz, sigma_alpha)
    re, sigma_re = bond_length_a(be, *masses, sigma_b_mhz=sigma_be)
    return [
        ("αe = B0 − B1 [MHz]", f"{alpha:.4f} ± {sigma_alpha:.2g}"),
        ("Be = B0 + αe/2 [MHz]", f"{be:.4f} ± {sigma_be:.2g}"),
        ("re from Be [Å]", f"{re:.6f} ± {sigma_re:.1g}"),
    ]


def fit_document(result, species) -> dict:
    document = result.to_dict()
    for residual in document["residuals"]:  # the pages number lines from 1, as the CSV's rows are read
        residual["blended_with"] = [i + 1 for i in residual["blended_with"]]
    document["structure"] = structure(result, species)
    return document


def fitted_species_of(run, current):
    """``current`` with the run's fitted values, σ and covariance in the fitted state."""
    result = run.result
    names = [c["name"] for c in result["constants"]]
    states = []
    for state in current.states:
        if state.label != result["state"]:
            states.append(state)
            continue
        fitted = {c["name"]: (c["value_mhz"], c["sigma_mhz"]) for c in result["constants"]}
        states.append(state.with_fitted(fitted, names, result["covariance_mhz2"]))
    return dataclasses.replace(current, states=tuple(states))
