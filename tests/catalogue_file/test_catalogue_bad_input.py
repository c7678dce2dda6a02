"""Every class of bad input gives a Problem naming species and field; nothing is ever half-read."""

import json

import pytest

from planner.catalogue_file import CatalogueError, Problem, load_catalogue, parse_catalogue


def problems_of(data) -> list[Problem]:
    with pytest.raises(CatalogueError) as caught:
        parse_catalogue(data)
    return caught.value.problems


def fields_of(problems, species):
    return {p.field for p in problems if p.species == species}


# Each case: how to break the first species ("lin", linear) or the fourth ("asym", asymmetric),
# the species and field the problem must name, and a word of the message.
def _set(index, key, value):
    def change(data):
        data["species"][index][key] = value

    return change


def _drop(index, key):
    def change(data):
        del data["species"][index][key]

    return change


def _constant(index, name, value):
    def change(data):
        data["species"][index]["states"][0]["constants_mhz"][name] = value

    return change


def _state_key(index, key, value):
    def change(data):
        data["species"][index]["states"][0][key] = value

    return change


SINGLE_FAULTS = [
    (_set(0, "colour", "red"), "lin", "colour", "unknown key"),
    (_set(0, "dipole", {"a": 1}), "lin", "dipole", "did you mean 'dipole_debye'"),
    (_drop(0, "formula"), "lin", "formula", "required"),
    (_drop(0, "rotor"), "lin", "rotor", "required"),
    (_drop(0, "dipole_debye"), "lin", "dipole_debye", "required"),
    (_drop(0, "states"), "lin", "states", "required"),
    (_set(0, "rotor", "spherical"), "lin", "rotor", "must be one of"),
    (_set(0, "rotor", 3), "lin", "rotor", "must be text"),
    (_set(3, "reduction", "B"), "asym", "reduction", "must be one of A, S"),
    (_set(3, "representation", "IIr"), "asym", "representation", "must be one of Ir, IIIr"),
    (_set(0, "formula", "XyZ"), "lin", "formula", "periodictable"),
    (_set(0, "formula", ""), "lin", "formula", "empty"),
    (_set(0, "mass_amu", "28"), "lin", "mass_amu", "must be a number"),
    (_set(0, "mass_amu", 0), "lin", "mass_amu", "> 0"),
    (_set(0, "source", 5), "lin", "source", "must be text"),
    (_set(0, "notes", None), "lin", "notes", "must be text"),
    (_set(0, "dipole_debye", 0.7), "lin", "dipole_debye", "must be an object"),
    (_set(0, "dipole_debye", {"z": 0.7}), "lin", "dipole_debye.z", "unknown key"),
    (_set(0, "dipole_debye", {"a": "0.7"}), "lin", "dipole_debye.a", "must be a number"),
    (_set(0, "dipole_debye", {"a": 150}), "lin", "dipole_debye.a", "within"),
    (_set(0, "dipole_debye", {"a": 1, "b": 1}), "lin", "dipole_debye", "along the axis"),
    (_set(3, "spin_weights", [1, 3]), "asym", "spin_weights", "must be an object"),
    (_set(3, "spin_weights", {"even": 1, "odd": 3}), "asym", "spin_weights.axis", "required"),
    (_set(3, "spin_weights", {"axis": "z", "even": 1, "odd": 3}), "asym", "spin_weights.axis", "must be"),
    (_set(3, "spin_weights", {"axis": "C3", "k_multiple_of_3": 4, "other": 2}), "asym", "spin_weights.axis", "no C3"),
    (_set(3, "spin_weights", {"axis": "b", "even": 1}), "asym", "spin_weights.odd", "required"),
    (_set(3, "spin_weights", {"axis": "b", "even": 1, "odd": -3}), "asym", "spin_weights.odd", ">= 0"),
    (_set(3, "spin_weights", {"axis": "b", "even": 0, "odd": 0}), "asym", "spin_weights", "both weights are zero"),
    (_set(1, "spin_weights", {"axis": "C3", "even": 4, "odd": 2}), "prolate", "spin_weights.even", "unknown key"),
    (
        _set(1, "spin_weights", {"axis": "C3", "k_multiple_of_3": -4, "other": 2}),
        "prolate",
        "spin_weights.k_multiple_of_3",
        ">= 0",
    ),
    (_set(1, "spin_weights", {"axis": "a", "even": 1, "odd": 3}), "prolate", "spin_weights.axis", "'C3' weights only"),
    (_set(0, "states", []), "lin", "states", "at least one state"),
    (_set(0, "states", {"label": "v=0"}), "lin", "states", "must be a list"),
    (_set(0, "states", ["v=0"]), "lin", "states[0]", "must be an object"),
    (_state_key(0, "energy", 0), "lin", "states[0].energy", "did you mean 'energy_cm1'"),
    (_state_key(0, "label", 7), "lin", "states[0].label", "must be text"),
    (_state_key(0, "label", " "), "lin", "states[0].label", "non-empty"),
    (_state_key(0, "energy_cm1", "0"), "lin", "states[0].energy_cm1", "must be a number"),
    (_state_key(0, "energy_cm1", -5), "lin", "states[0].energy_cm1", ">= 0"),
    (_state_key(0, "constants_mhz", [6081.5, 0.001]), "lin", "states[0].constants_mhz", "must be an object"),
    (_constant(0, "B", 6081.5), "lin", "states[0].constants_mhz.B", "a bare number is not accepted"),
    (_constant(0, "B", [6081.5]), "lin", "states[0].constants_mhz.B", "[value, sigma]"),
    (_constant(0, "B", ["6081.5", 0.1]), "lin", "states[0].constants_mhz.B", "[value, sigma]"),
    (_constant(0, "B", [True, 0.1]), "lin", "states[0].constants_mhz.B", "two numbers"),  # JSON true is not 1
    (_constant(0, "B", [6081.5, -0.1]), "lin", "states[0].constants_mhz.B", "sigma must be >= 0"),
    (_constant(0, "B", [-6081.5, 0.1]), "lin", "states[0].constants_mhz.B", "> 0 MHz"),
    (_constant(0, "A", [9000, 0.1]), "lin", "states[0].constants_mhz.A", "unknown parameter 'A'"),
    (_constant(3, "DJ", [0.01, 0]), "asym", "states[0].constants_mhz.DJ", "A-reduction"),
    (_constant(3, "C", [20000, 0]), "asym", "states[0].constants_mhz", "A >= B >= C"),
    (_constant(1, "A", [100, 0]), "prolate", "states[0].constants_mhz.A", "A >= B"),
]


@pytest.mark.parametrize("change, species, field, words", SINGLE_FAULTS)
def test_each_fault_is_named_by_species_and_field(catalogue_data, change, species, field, words):
    change(catalogue_data)

    problems = problems_of(catalogue_data)

    matching = [p for p in problems if (p.species, p.field) == (species, field)]
    assert matching, f"no problem on {species}/{field}; got {[str(p) for p in problems]}"
    assert words in matching[0].message
    assert all(p.species == species for p in problems), "only the broken species may be blamed"


def test_a_state_in_another_position_is_named_by_its_index(catalogue_data):
    catalogue_data["species"][0]["states"][1]["constants_mhz"]["B"] = [6063.0, -1]

    assert fields_of(problems_of(catalogue_data), "lin") == {"states[1].constants_mhz.B"}


def test_duplicate_state_labels(catalogue_data):
    catalogue_data["species"][0]["states"][1]["label"] = "v=0"

    problems = problems_of(catalogue_data)

    assert [(p.species, p.field) for p in problems] == [("lin", "states[1].label")]
    assert "states[0]" in problems[0].message


def test_duplicate_species_names(catalogue_data):
    catalogue_data["species"][2]["name"] = "lin"

    problems = problems_of(catalogue_data)

    assert [(p.species, p.field) for p in problems] == [("lin", "name")]
    assert "species[0]" in problems[0].message


def test_a_species_without_usable_name_is_named_by_position(catalogue_data):
    del catalogue_data["species"][2]["name"]
    catalogue_data["species"][3]["name"] = ""

    problems = problems_of(catalogue_data)

    assert ("species[2]", "name") in {(p.species, p.field) for p in problems}
    assert ("species[3]", "name") in {(p.species, p.field) for p in problems}


def test_a_species_entry_that_is_not_an_object(catalogue_data):
    catalogue_data["species"].append("CO")

    assert [(p.species, p.field) for p in problems_of(catalogue_data)] == [("species[4]", "entry")]


@pytest.mark.parametrize(
    "change, field, words",
    [
        (lambda d: d.update(format="something-else"), "format", "not a catalogue file"),
        (lambda d: d.pop("format"), "format", "got nothing"),
        (lambda d: d.update(version=2), "version", "reads version 1"),
        (lambda d: d.update(version=True), "version", "reads version 1"),
        (lambda d: d.pop("version"), "version", "required"),
        (lambda d: d.update(species={"name": "x"}), "species", "must be a list"),
        (lambda d: d.pop("species"), "species", "got nothing"),
        (lambda d: d.update(comment="hello"), "comment", "unknown key"),
    ],
)
def test_file_level_faults(catalogue_data, change, field, words):
    change(catalogue_data)

    problems = problems_of(catalogue_data)

    assert [(p.species, p.field) for p in problems] == [(None, field)]
    assert words in problems[0].message


def test_top_level_must_be_an_object():
    problems = problems_of([{"name": "CO"}])

    assert [(p.species, p.field) for p in problems] == [(None, "file")]


def test_missing_file(tmp_path):
    with pytest.raises(CatalogueError) as caught:
        load_catalogue(tmp_path / "absent.json")

    assert [(p.species, p.field) for p in caught.value.problems] == [(None, "file")]
    assert "no such file" in caught.value.problems[0].message


def test_not_json_reports_the_line(tmp_path):
    path = tmp_path / "broken.json"
    path.write_text('{\n  "format": "linecast-catalogue",\n  "version": 1,\n  "species": [,]\n}\n', encoding="utf-8")

    with pytest.raises(CatalogueError) as caught:
        load_catalogue(path)

    assert "not valid JSON" in str(caught.value)
    assert "line 4" in str(caught.value)


def test_not_utf8(tmp_path):
    path = tmp_path / "latin1.json"
    path.write_bytes('{"format": "linecast-catalogue", "notes": "\u00e9"}'.encode("latin-1"))

    with pytest.raises(CatalogueError) as caught:
        load_catalogue(path)

    assert "UTF-8" in str(caught.value)


def test_keys_given_twice_in_the_file_are_refused(tmp_path, catalogue_data):
    text = json.dumps(catalogue_data)
    text = text.replace('"B": [9198.9, 0]', '"B": [9198.9, 0], "B": [9199.9, 0]')
    text = text.replace('"name": "asym"', '"name": "asym", "name": "asym2"')
    path = tmp_path / "twice.json"
    path.write_text(text, encoding="utf-8")

    with pytest.raises(CatalogueError) as caught:
        load_catalogue(path)

    found = {(p.species, p.field) for p in caught.value.problems}
    assert found == {("prolate", "states[0].constants_mhz.B"), ("asym2", "name")}


def test_broken_file_lists_every_problem_and_returns_nothing(tmp_path, catalogue_data):
    good = catalogue_data["species"]
    bad = [
        {  # three faults in one species, in different places
            "name": "bad-linear",
            "formula": "C[99]O",
            "rotor": "linear",
            "dipole_debye": {"a": 0.1, "x": 2},
            "states": [{"label": "v=0", "energy_cm1": 0, "constants_mhz": {"B": 57635.968}}],
        },
        {  # faults at species level and in two states
            "name": "bad-asym",
            "formula": "H2CO",
            "rotor": "asymmetric",
            "mass_amu": -30,
            "dipole_debye": {"a": 2.3},
            "spin_weights": {"axis": "C3", "k_multiple_of_3": 1, "other": 3},
            "states": [
                {
                    "label": "g",
                    "energy_cm1": 0,
                    "constants_mhz": {"A": [281970, 0], "B": [38836, 0], "C": [34002, 0], "DeltaJJ": [0.07, 0]},
                },
                {"label": "v4", "energy_cm1": -1, "constants_mhz": {"A": [1, 0], "B": [2, 0], "C": [3, 0]}},
            ],
        },
        {  # unknown keys at both levels
            "name": "bad-oblate",
            "formula": "CHF3",
            "rotor": "symmetric-oblate",
            "dipole_debye": {"a": 1.6},
            "colour": "blue",
            "states": [
                {"label": "v=0", "energy_cm1": 0, "enrgy": 1, "constants_mhz": {"C": [5673, 0], "B": [10348, 0]}},
            ],
        },
    ]
    catalogue_data["species"] = good[:2] + bad + good[2:]
    path = tmp_path / "broken.json"
    path.write_text(json.dumps(catalogue_data), encoding="utf-8")

    with pytest.raises(CatalogueError) as caught:
        load_catalogue(path)

    problems = caught.value.problems
    assert {(p.species, p.field) for p in problems} == {
        ("bad-linear", "formula"),
        ("bad-linear", "dipole_debye.x"),
        ("bad-linear", "states[0].constants_mhz.B"),
        ("bad-asym", "mass_amu"),
        ("bad-asym", "spin_weights.axis"),
        ("bad-asym", "states[0].constants_mhz.DeltaJJ"),
        ("bad-asym", "states[1].energy_cm1"),
        ("bad-asym", "states[1].constants_mhz"),
        ("bad-oblate", "colour"),
        ("bad-oblate", "dipole_debye"),
        ("bad-oblate", "states[0].enrgy"),
    }
    assert caught.value.path == str(path)
    assert str(caught.value).splitlines() == [f"species {p.species}, field {p.field}: {p.message}" for p in problems]


def test_catalogue_error_shape():
    problem = Problem("CO", "states[0].constants_mhz.B", "must be > 0 MHz, got -1")
    error = CatalogueError([problem, Problem(None, "version", "is required")])

    assert isinstance(error, ValueError)
    assert str(error).splitlines() == [
        "species CO, field states[0].constants_mhz.B: must be > 0 MHz, got -1",
        "file, field version: is required",
    ]
    with pytest.raises(AttributeError):
        problem.field = "B"
