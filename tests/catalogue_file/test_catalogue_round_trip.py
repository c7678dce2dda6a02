"""Writing then reading a catalogue gives back exactly equal Species; bad input is never written."""

import io
import json

import pytest

from planner.catalogue_file import CatalogueError, catalogue_to_dict, dump_catalogue, load_catalogue, parse_catalogue
from planner.engine import Species, SpinWeights, State


def state(label, energy_cm1, **constants):
    return State(label=label, energy_cm1=energy_cm1, constants_mhz=constants)


@pytest.fixture
def species_list():
    """Fixture species covering every rotor kind and option (numbers are fixtures, not reference data)."""
    return [
        Species(
            name="linear two states",
            rotor="linear",
            formula="C[13]O",
            mass_amu=29.0,
            dipole_debye=(0.11, 0, 0),
            states=(
                state("v=0", 0.0, B=(55101.01, 0.001), D=(0.1679, 1e-5), H=(1.5e-7, 2e-8)),
                State(
                    "v=1",
                    2096.07,
                    {"B": (54600.1, 0.05), "D": (0.1679, 1e-4)},
                    ("B", "D"),
                    ((0.0025, 4.5e-6), (4.5e-6, 1e-8)),  # fixture covariance, correlation 0.9
                ),
                state("v=2", 4166.8, B=(54100.3, 0.5), D=(0.168, 0.001)),
            ),
            source="fixture [ 1  2 ] {odd}  spacing",
            notes="línea — ünïcode\nsecond line",
            hazards="toxic gas: work in a ventilated enclosure",
        ),
        Species(
            name="prolate C3",
            rotor="symmetric-prolate",
            formula="CH3F",
            mass_amu=34.0334,
            dipole_debye=(1.858, 0, 0),
            spin_weights=SpinWeights("C3", 4, 2),
            states=(state("v=0", 0.0, A=(155350.0, 30), B=(25536.1, 0.01), DJ=(0.0602, 1e-5), HKJ=(1e-9, 0)),),
        ),
        Species(
            name="oblate C3",
            rotor="symmetric-oblate",
            formula="CHF3",
            mass_amu=70.014,
            dipole_debye=(0, 0, 1.65),
            spin_weights=SpinWeights("C3", 2.5, 0.5),
            states=(state("v=0", 0.0, C=(5673.0, 5), B=(10348.8, 0.1), DJK=(-0.0171, 0.001)),),
        ),
        Species(
            name="asym A Ir",
            rotor="asymmetric",
            formula="H2CO",
            mass_amu=30.0106,
            dipole_debye=(2.33, 0, 0),
            spin_weights=SpinWeights("a", 1, 3),
            states=(
                # given out of order on purpose: the writer sorts them
                state(
                    "v=0",
                    0.0,
                    PhiKJ=(-1e-4, 1e-5),
                    C=(34002.2, 0.01),
                    A=(281970.5, 0.1),
                    deltaK=(1.03, 1e-3),
                    B=(38836.0, 0.01),
                ),
                state("v4=1", 1167.26, A=(286000.0, 5), B=(38900.0, 1), C=(33900.0, 1)),
            ),
        ),
        Species(
            name="asym S IIIr",
            rotor="asymmetric",
            reduction="S",
            representation="IIIr",
            formula="H2C2O",
            mass_amu=42.0106,
            dipole_debye=(0.1, 1.4, 0.3),
            spin_weights=SpinWeights("c", 3, 1),
            states=(
                state(
                    "g",
                    0.0,
                    A=(282000.0, 500),
                    B=(10293.3, 0.05),
                    C=(9915.9, 0.05),
                    d1=(-9.2e-5, 1e-5),
                    d2=(-3e-6, 2e-6),
                    h3=(1.0e-12, 0),
                ),
            ),
            source="fixture",
        ),
        Species(
            name="no dipole",
            rotor="linear",
            formula="CO2",
            mass_amu=0.1 + 0.2,  # a float with a long repr must survive exactly
            dipole_debye=(0, 0, 0),
            states=(state("v=0", 0.0, B=(11698.5, 0.1)),),
        ),
    ]


def test_dump_then_load_gives_equal_species(tmp_path, species_list):
    path = tmp_path / "out.json"

    dump_catalogue(species_list, path)

    assert load_catalogue(path) == species_list


def test_dump_to_an_open_file(species_list):
    buffer = io.StringIO()

    dump_catalogue(species_list, buffer)

    assert parse_catalogue(json.loads(buffer.getvalue())) == species_list


def test_equality_is_not_vacuous(tmp_path, species_list):
    path = tmp_path / "out.json"
    dump_catalogue(species_list, path)
    loaded = load_catalogue(path)

    changed = Species(**{**loaded[3].__dict__, "states": loaded[3].states[:1]})

    assert changed != species_list[3]


def test_dict_uses_the_file_key_names(species_list):
    data = catalogue_to_dict(species_list)

    assert (data["format"], data["version"]) == ("linecast-catalogue", 1)
    prolate, asym = data["species"][1], data["species"][3]
    assert prolate["spin_weights"] == {"axis": "C3", "k_multiple_of_3": 4, "other": 2}
    assert asym["spin_weights"] == {"axis": "a", "even": 1, "odd": 3}
    assert "spin_weights" not in data["species"][0]
    assert prolate["states"][0]["constants_mhz"]["B"] == [25536.1, 0.01]
    for entry in data["species"]:
        assert {"mass_amu", "reduction", "representation", "source", "notes"} <= set(entry)


def test_constants_are_written_in_the_engine_order(species_list):
    entry = catalogue_to_dict(species_list)["species"][3]

    assert list(entry["states"][0]["constants_mhz"]) == ["A", "B", "C", "deltaK", "PhiKJ"]


def test_the_written_file_is_readable_json_text(tmp_path, species_list):
    path = tmp_path / "out.json"
    dump_catalogue(species_list, path)
    text = path.read_text(encoding="utf-8")

    assert '"B": [55101.01, 0.001]' in text  # one [value, sigma] pair per line
    assert "línea" in text
    assert json.loads(text)["species"][0]["source"] == "fixture [ 1  2 ] {odd}  spacing"


def test_unreadable_output_is_never_written(tmp_path, species_list):
    path = tmp_path / "out.json"
    path.write_text("old content", encoding="utf-8")
    twin = Species(**{**species_list[1].__dict__})  # same name twice
    nameless_formula = Species(**{**species_list[2].__dict__, "name": "other", "formula": ""})

    with pytest.raises(CatalogueError) as caught:
        dump_catalogue([*species_list, twin, nameless_formula], path)

    assert {(p.species, p.field) for p in caught.value.problems} == {("prolate C3", "name"), ("other", "formula")}
    assert path.read_text(encoding="utf-8") == "old content"
    assert [p.name for p in tmp_path.iterdir()] == ["out.json"]
