"""The plan page, saved plans, their files and the operator sheet; instrument profiles."""

import csv
import io
import json

import pytest
from django.urls import reverse

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import Stamp, update_species
from planner.planning.exports import SEGMENT_COLUMNS, TARGET_COLUMNS
from planner.planning.models import Instrument, SavedPlan
from tests.web.test_catalogue_store import _with_b

PLAN = reverse("planning:plan")


def _amount_field(client, name):
    return f"amount_{SpeciesRow.objects.get(name=name).pk}"


def _query(client, **overrides):
    # A 3 mm window with OCS and SO2 at room temperature (demo data), default relative model.
    query = {
        "frequency_unit": "GHz",
        "fmin": "85",
        "fmax": "110",
        "temperature_k": "300",
        "slot_minutes": "30",
        "snr": "5",
        "k_sigma": "3",
        "margin_mhz": "0",
        _amount_field(client, "OCS"): "1",
        _amount_field(client, "SO2"): "0.5",
    }
    query.update(overrides)
    return query


@pytest.fixture
def cell(db):
    # Invented test instrument.
    return Instrument.objects.create(
        name="test cell",
        fmin_mhz=75_000,
        fmax_mhz=110_000,
        setting_width_mhz=500,
        channel_width_mhz=0.05,
        retune_overhead_s=20,
        model_kind="absorption-cell",
        path_length_cm=200,
        noise_absorption_per_sqrt_hz=1e-5,
        pressure_pa=2,
        broadening_khz_per_pa=25,
    )


def test_anonymous_visitor_is_sent_to_log_in(client):
    assert client.get(PLAN).status_code == 302


def test_first_visit_shows_the_form_with_every_species(viewer_client, demo_species):
    html = viewer_client.get(PLAN).content.decode()
    for species in demo_species:
        assert f"<span>{species.name}</span>" in html
    for label in ("Temperature [K]", "Slot [min]", "Required SNR", "Scan margin [×σ]", "Max upper-state energy [K]"):
        assert label in html


def test_plan_shows_ranked_targets_segments_and_hazards(viewer_client):
    response = viewer_client.get(PLAN, _query(viewer_client))
    assert response.status_code == 200
    targets = response.context["targets"]
    assert targets and [t["rank"] for t in targets] == list(range(1, len(targets) + 1))
    signals = [t["expected_signal"] for t in targets]
    assert signals == sorted(signals, reverse=True)
    assert all(85_000 <= t["frequency_mhz"] <= 110_000 for t in targets)
    assert {t["species"] for t in targets} <= {"OCS", "SO2"}
    html = response.content.decode()
    for header in (
        "Frequency [MHz]",
        "σ [MHz]",
        "E<sub>u</sub> [K]",
        "Sμ² [D²]",
        "A [s⁻¹]",
        "Time to SNR [s]",
        "Dwell [s]",
    ):
        assert f">{header}</th>" in html
    assert "Handling and hazards of the planned species" in html and "ask the safety officer" in html
    totals = response.context["totals"]
    assert totals["used_s"] <= totals["slot_s"] == 1800


def test_window_in_mhz_gives_the_same_plan(viewer_client):
    in_ghz = viewer_client.get(PLAN, _query(viewer_client)).context["targets"]
    in_mhz = viewer_client.get(PLAN, _query(viewer_client, frequency_unit="MHz", fmin="85000", fmax="110000"))
    assert in_mhz.context["targets"] == in_ghz


@pytest.mark.parametrize(
    "overrides, field, message",
    [
        ({"fmin": "110", "fmax": "85"}, "fmax", "Must be above the lower edge"),
        ({"temperature_k": "0"}, "temperature_k", "greater than or equal to 0.1"),
        ({"slot_minutes": "-1"}, "slot_minutes", "greater than or equal to 0.1"),
    ],
)
def test_bad_input_is_an_error_next_to_its_field(viewer_client, overrides, field, message):
    response = viewer_client.get(PLAN, _query(viewer_client, **overrides))
    assert response.status_code == 400
    assert any(message in e for e in response.context["form"].errors[field])


def test_no_species_is_a_form_error(viewer_client):
    query = _query(viewer_client)
    query = {k: v for k, v in query.items() if not k.startswith("amount_")}
    response = viewer_client.get(PLAN, query)
    assert "Give an abundance or mole fraction for at least one species." in response.content.decode()


def test_window_outside_the_instrument_is_refused(viewer_client, cell):
    response = viewer_client.get(PLAN, _query(viewer_client, instrument=cell.pk, fmax="120"))
    assert any("covers 75000–110000 MHz" in e for e in response.context["form"].errors["fmax"])


def test_absorption_cell_needs_mole_fractions_up_to_one(viewer_client, cell):
    query = _query(viewer_client, instrument=cell.pk, **{_amount_field(viewer_client, "OCS"): "2"})
    response = viewer_client.get(PLAN, query)
    assert "OCS: a mole fraction is at most 1, got 2." in response.content.decode()


def test_absorption_cell_plan_uses_its_model(viewer_client, cell):
    query = _query(viewer_client, instrument=cell.pk, **{_amount_field(viewer_client, "OCS"): "0.01"})
    response = viewer_client.get(PLAN, query)
    assert response.status_code == 200
    assert response.context["inputs"]["model"]["kind"] == "absorption-cell"
    # Peak fractional absorption is at most 1 (it is 1 − e^(−αL)).
    assert all(0 < t["expected_signal"] <= 1 for t in response.context["targets"])


def _save(client, name="run 1"):
    query = _query(client)
    response = client.post(reverse("planning:save"), query | {"plan_name": name})
    assert response.status_code == 302, response.content[:500]
    return SavedPlan.objects.get(name=name)


def test_editor_saves_a_frozen_plan(editor_client):
    plan = _save(editor_client)
    assert plan.created_by.username == "eddie"
    assert plan.inputs["species"] == [{"name": "OCS", "amount": 1.0}, {"name": "SO2", "amount": 0.5}]
    assert plan.result["result"]["targets"]
    row = SpeciesRow.objects.get(name="OCS")
    assert plan.catalogue_versions["OCS"] == [row.pk, row.version]


def test_viewer_cannot_save_a_plan(viewer_client):
    response = viewer_client.post(reverse("planning:save"), _query(viewer_client) | {"plan_name": "x"})
    assert response.status_code == 403
    assert not SavedPlan.objects.exists()


def test_frozen_plan_survives_a_catalogue_edit_unchanged(editor_client):
    plan = _save(editor_client)
    page = editor_client.get(reverse("planning:saved", args=[plan.pk]))
    before = page.context["targets"]
    assert 'id="catalogue-changed"' not in page.content.decode()
    row = SpeciesRow.objects.get(name="OCS")
    update_species(row, _with_b(species_of_row(row), 6090.0), Stamp(None, "test"), expected_version=row.version)
    again = editor_client.get(reverse("planning:saved", args=[plan.pk]))
    assert again.context["targets"] == before
    html = again.content.decode()
    assert 'id="catalogue-changed"' in html and "OCS" in html
    # while a new plan follows the edit
    fresh = editor_client.get(PLAN, _query(editor_client)).context["targets"]
    assert [t["frequency_mhz"] for t in fresh if t["species"] == "OCS"] != [
        t["frequency_mhz"] for t in before if t["species"] == "OCS"
    ]


def _csv(response):
    return list(csv.reader(io.StringIO(response.content.decode())))


def test_targets_and_segments_csv_have_units_in_the_header(editor_client):
    plan = _save(editor_client)
    targets = editor_client.get(reverse("planning:targets_csv", args=[plan.pk]))
    assert targets["Content-Disposition"] == f'attachment; filename="linecast-plan-{plan.pk}-targets.csv"'
    header, first, *_ = _csv(targets)
    assert tuple(header) == TARGET_COLUMNS
    assert first[0] == "1" and float(first[header.index("frequency_mhz")]) == pytest.approx(
        plan.result["result"]["targets"][0]["frequency_mhz"]
    )
    segments = _csv(editor_client.get(reverse("planning:segments_csv", args=[plan.pk])))
    assert tuple(segments[0]) == SEGMENT_COLUMNS
    assert len(segments) - 1 == len(plan.result["result"]["segments"])


def test_plan_json_holds_inputs_targets_segments_and_left_out(editor_client):
    plan = _save(editor_client)
    document = json.loads(editor_client.get(reverse("planning:plan_json", args=[plan.pk])).content)
    assert document["inputs"] == plan.inputs
    result = document  # the result keys sit at the top of the file, beside the inputs
    assert {"inputs", "targets", "segments", "left_out", "totals", "catalogue_versions"} <= set(result)
    target = result["targets"][0]
    for key in (
        "rank",
        "species",
        "state",
        "j_up",
        "j_lo",
        "frequency_mhz",
        "sigma_mhz",
        "expected_signal",
        "time_to_snr_s",
        "selected",
    ):
        assert key in target
    for segment in result["segments"]:
        assert {"start_mhz", "stop_mhz", "dwell_s", "target_ranks"} <= set(segment)
    assert document["catalogue_versions"]["SO2"][1] == 1


def test_operator_sheet_has_the_header_checklist_hazards_and_caution(editor_client):
    plan = _save(editor_client, "morning run")
    html = editor_client.get(reverse("planning:operator_sheet", args=[plan.pk])).content.decode()
    assert "morning run" in html
    assert "85000–110000 MHz" in html and "300 K" in html
    assert html.count("☐") == len(plan.result["result"]["segments"])
    assert "Follow your facility's safety rules and local regulations" in html
    assert "css/operator-sheet.css" in html
    assert plan.result["hazards"]["SO2"].split(".")[0] in html


def test_saved_plans_are_listed(editor_client):
    plan = _save(editor_client, "listed run")
    html = editor_client.get(reverse("planning:saved_list")).content.decode()
    assert reverse("planning:saved", args=[plan.pk]) in html and "listed run" in html


def test_editor_creates_an_instrument_profile_and_a_viewer_cannot(editor_client, make_member, client):
    data = {
        "name": "new cell",
        "fmin_mhz": "50000",
        "fmax_mhz": "75000",
        "setting_width_mhz": "250",
        "channel_width_mhz": "0.1",
        "retune_overhead_s": "5",
        "model_kind": "absorption-cell",
        "path_length_cm": "",
        "noise_absorption_per_sqrt_hz": "1e-5",
        "pressure_pa": "1",
        "broadening_khz_per_pa": "20",
        "detection_floor_1s": "",
        "notes": "",
    }
    refused = editor_client.post(reverse("planning:instrument_create"), data)
    assert refused.status_code == 400
    assert "Needed by this sensitivity model." in refused.context["form"].errors["path_length_cm"]
    data["path_length_cm"] = "100"
    assert editor_client.post(reverse("planning:instrument_create"), data).status_code == 302
    assert Instrument.objects.filter(name="new cell").exists()
    client.force_login(make_member("vic", "viewer"))
    assert client.get(reverse("planning:instrument_create")).status_code == 403
    assert client.get(reverse("planning:instruments")).status_code == 200


def test_amounts_stay_on_their_species_when_the_catalogue_grows(editor_client, use_catalogue):
    query = _query(editor_client)
    ocs = SpeciesRow.objects.get(name="OCS")
    # A species whose name sorts before OCS arrives between planning and saving (invented constants).
    from planner.catalogue.store import Stamp, create_species
    from planner.engine import Species, State

    create_species(
        Species(
            name="AAA",
            rotor="linear",
            mass_amu=30.0,
            dipole_debye=(1.0, 0, 0),
            states=(State("v=0", 0.0, {"B": (20000.0, 0.0)}),),
        ),
        Stamp(None, "test"),
    )
    editor_client.post(reverse("planning:save"), query | {"plan_name": "grown"})
    plan = SavedPlan.objects.get(name="grown")
    assert [s["name"] for s in plan.inputs["species"]] == ["OCS", "SO2"]
    assert f"amount_{ocs.pk}" in query
