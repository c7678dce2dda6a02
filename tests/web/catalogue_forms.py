"""POST data of the species form, built like the browser sends it."""

from __future__ import annotations


def species_post(states=None, version=None, **fields) -> dict:
    """Form data for a linear test molecule unless ``fields``/``states`` say otherwise.

    ``states`` is a list of (label, energy_cm1, constants text); a blank extra
    state form is sent too, as the page does.
    """
    data = {
        "name": "TestCO",
        "formula": "CO",
        "rotor": "linear",
        "reduction": "A",
        "representation": "Ir",
        "mass_amu": "",
        "dipole_a_debye": "0.11",
        "dipole_b_debye": "0",
        "dipole_c_debye": "0",
        "spin_axis": "",
        "spin_weight_even": "",
        "spin_weight_odd": "",
        "source": "test entry (values from memory)",
        "notes": "",
        "hazards": "toxic: work under extraction",
    }
    if version is not None:
        data["version"] = str(version)
    data.update({key: str(value) for key, value in fields.items()})
    # CO ground state, B and D from memory (≈57 635.97 and 0.1835 MHz).
    states = states if states is not None else [("v=0", 0, "B 57635.968 0.001\nD 0.18350 0.00002")]
    for index, (label, energy, constants) in enumerate(states):
        data[f"states-{index}-label"] = label
        data[f"states-{index}-energy_cm1"] = str(energy)
        data[f"states-{index}-constants"] = constants
    blank = len(states)
    data[f"states-{blank}-label"] = ""
    data[f"states-{blank}-energy_cm1"] = ""
    data[f"states-{blank}-constants"] = ""
    data.update(
        {
            "states-TOTAL_FORMS": str(blank + 1),
            "states-INITIAL_FORMS": "0",
            "states-MIN_NUM_FORMS": "1",
            "states-MAX_NUM_FORMS": "1000",
        }
    )
    return data
