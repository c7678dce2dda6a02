"""Shared fixtures: a small valid catalogue (as decoded JSON) and a way to write one to disk.

The constants here are test fixtures, not reference data: the tests only
compare what goes in with what comes out.
"""

import json

import pytest


@pytest.fixture
def catalogue_data():
    """A fresh, valid catalogue with one species of each rotor kind."""
    return {
        "format": "linecast-catalogue",
        "version": 1,
        "species": [
            {
                "name": "lin",
                "formula": "OCS",
                "rotor": "linear",
                "dipole_debye": {"a": 0.7},
                "states": [
                    {"label": "v=0", "energy_cm1": 0, "constants_mhz": {"B": [6081.5, 0.001], "D": [0.0013, 1e-6]}},
                    {"label": "v1=1", "energy_cm1": 859.0, "constants_mhz": {"B": [6063.0, 0.01]}},
                ],
            },
            {
                "name": "prolate",
                "formula": "CH3CN",
                "rotor": "symmetric-prolate",
                "dipole_debye": {"a": 3.9},
                "spin_weights": {"axis": "C3", "k_multiple_of_3": 4, "other": 2},
                "states": [{"label": "v=0", "energy_cm1": 0, "constants_mhz": {"A": [158000, 10], "B": [9198.9, 0]}}],
            },
            {
                "name": "oblate",
                "formula": "CHF3",
                "rotor": "symmetric-oblate",
                "dipole_debye": {"c": 1.65},
                "states": [{"label": "v=0", "energy_cm1": 0, "constants_mhz": {"C": [5673, 5], "B": [10348.8, 0.1]}}],
            },
            {
                "name": "asym",
                "formula": "SO2",
                "rotor": "asymmetric",
                "mass_amu": 63.96,
                "dipole_debye": {"b": 1.63},
                "spin_weights": {"axis": "b", "even": 1, "odd": 0},
                "states": [
                    {
                        "label": "v=0",
                        "energy_cm1": 0,
                        "constants_mhz": {"A": [60778.5, 0.01], "B": [10318.1, 0.01], "C": [8799.7, 0.01]},
                    }
                ],
                "source": "test fixture",
                "notes": "fixture only",
            },
        ],
    }


@pytest.fixture
def write_json(tmp_path):
    """write_json(data, name='catalogue.json') -> path of a file holding ``data`` as JSON."""

    def write(data, name="catalogue.json"):
        path = tmp_path / name
        path.write_text(json.dumps(data), encoding="utf-8")
        return path

    return write
