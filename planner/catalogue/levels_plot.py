"""Data for the energy-level diagram: one short horizontal bar per level, E against J."""

from __future__ import annotations

import numpy as np

from planner.engine import Species
from planner.engine.derived import energy_levels

#: Highest J drawn: enough to see the pattern, few enough to read the labels.
DIAGRAM_J_MAX = {"linear": 12, "symmetric-prolate": 8, "symmetric-oblate": 8, "asymmetric": 6}


def level_label(j: int, ka: int, kc: int) -> str:
    if ka < 0:
        return f"J={j}"
    if kc < 0:
        return f"J={j} K={ka}"
    return f"{j} {ka},{kc}"


def levels_data(species: Species, state_index: int = 0) -> dict:
    """{"present": {...}, "absent": {...}, "j_max": n}: bars of levels with and without spin weight.

    Each part has ``j``, ``energy_cm1`` and ``label`` lists; absent levels
    (spin weight 0) are drawn dashed so that the pattern stays readable.
    """
    j_max = DIAGRAM_J_MAX[species.rotor]
    levels = energy_levels(species, state_index=state_index, j_max=j_max)
    parts = {}
    for key, chosen in (("present", levels["spin_weight"] > 0), ("absent", levels["spin_weight"] == 0)):
        index = np.nonzero(chosen)[0]
        parts[key] = {
            "j": levels["j"][index].tolist(),
            "energy_cm1": [round(float(e), 6) for e in levels["energy_cm1"][index]],
            "label": [level_label(int(levels["j"][i]), int(levels["ka"][i]), int(levels["kc"][i])) for i in index],
        }
    return {**parts, "j_max": j_max, "state": species.states[state_index].label}
