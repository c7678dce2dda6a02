"""Create, edit and delete a species: validation next to the field, roles, conflicting edits."""

import pytest
from django.urls import reverse

from planner.catalogue.models import Constant
from planner.catalogue.models import Species as SpeciesRow
from tests.web.catalogue_forms import species_post

CREATE = reverse("catalogue:create")


def _errors(response) -> dict:
    """Every error on the page by field: species fields by name, state fields as 'states-N-field'."""
    errors = {name: list(messages) for name, messages in response.context["form"].errors.items()}
    for index, state_form in enumerate(response.context["states"].forms):
        for name, messages in state_form.errors.items():
            errors[f"states-{index}-{name}"] = list(messages)
    return errors


def test_editor_creates_a_species_and_lands_on_its_page(editor_client):
    response = editor_client.post(CREATE, species_post())
    row = SpeciesRow.objects.get(name="TestCO")
    assert response.status_code == 302
    assert response["Location"] == reverse("catalogue:species", args=[row.pk])
    constants = {c.name: (c.value_mhz, c.sigma_mhz) for c in Constant.objects.filter(state__species=row)}
    assert constants == {"B": (57635.968, 0.001), "D": (0.1835, 0.00002)}
    # mass from the formula: 12C + 16O ≈ 28.0101 u natural-abundance (periodictable, from memory ≈ 28.010)
    assert row.mass_amu == pytest.approx(28.010, abs=0.001)
    assert row.hazards == "toxic: work under extraction"
    assert [r.history_user.username for r in row.history.all()] == ["eddie"]


@pytest.mark.parametrize(
    "fields, states, field, message",
    [
        ({}, [("v=0", 0, "B -5 0")], "states-0-constants", "B: must be > 0 MHz"),
        ({}, [("v=0", 0, "B 57635.968 -0.1")], "states-0-constants", "B: sigma must be >= 0"),
        ({}, [("v=0", 0, "B 57635.968 0\nQ 1 0")], "states-0-constants", "unknown parameter 'Q'"),
        ({}, [("v=0", 0, "B 57635.968")], "states-0-constants", "line 1: give a name, a value and a σ"),
        ({}, [("v=0", 0, "B fast 0")], "states-0-constants", "line 1: value and σ must be numbers"),
        ({}, [("v=0", -3, "B 57635.968 0")], "states-0-energy_cm1", "must be >= 0 cm-1"),
        ({"dipole_a_debye": "16"}, None, "dipole_a_debye", "Must be within 0–15 D."),
        ({"dipole_b_debye": "1"}, None, "dipole_b_debye", "give only 'a'"),
        ({"dipole_a_debye": "0"}, None, "dipole_a_debye", "this species will have no rotational lines"),
        ({"formula": "Xq2"}, None, "formula", "Xq"),
        ({"spin_axis": "b", "spin_weight_even": "1", "spin_weight_odd": "3"}, None, "spin_axis", "linear"),
        (
            {"rotor": "asymmetric"},
            [("v=0", 0, "A 10000 0\nB 20000 0\nC 5000 0")],
            "states-0-constants",
            "needs A >= B >= C",
        ),
        ({"spin_axis": "b", "rotor": "asymmetric", "spin_weight_even": ""}, None, "spin_weight_even", "Needed"),
    ],
)
def test_bad_input_is_refused_next_to_its_field(editor_client, fields, states, field, message):
    response = editor_client.post(CREATE, species_post(states=states, **fields))
    assert response.status_code == 400
    errors = _errors(response)
    assert any(message in text for text in errors.get(field, [])), errors
    assert not SpeciesRow.objects.filter(name="TestCO").exists()
    assert "nothing was saved" in response.content.decode()


def test_no_dipole_can_be_saved_on_purpose_with_a_warning(editor_client):
    response = editor_client.post(CREATE, species_post(dipole_a_debye="0", no_dipole="on"), follow=True)
    assert SpeciesRow.objects.filter(name="TestCO").exists()
    assert "has no permanent dipole: it will have no rotational lines" in response.content.decode()


def test_a_taken_name_is_refused(editor_client):
    response = editor_client.post(CREATE, species_post(name="OCS"))
    assert response.status_code == 400
    assert any("already called 'OCS'" in e for e in _errors(response)["name"])


def test_viewer_cannot_create_or_edit(viewer_client):
    assert viewer_client.get(CREATE).status_code == 403
    assert viewer_client.post(CREATE, species_post()).status_code == 403
    row = SpeciesRow.objects.get(name="OCS")
    response = viewer_client.post(reverse("catalogue:edit", args=[row.pk]), species_post(name="OCS", version=1))
    assert response.status_code == 403
    assert SpeciesRow.objects.get(pk=row.pk).version == 1


def test_edit_form_opens_with_the_stored_values(editor_client, demo_species):
    row = SpeciesRow.objects.get(name="SO2")
    response = editor_client.get(reverse("catalogue:edit", args=[row.pk]))
    html = response.content.decode()
    so2 = next(s for s in demo_species if s.name == "SO2")
    value, sigma = so2.states[0].constants_mhz["A"]
    assert f"A {value:.12g} {sigma:.6g}" in html
    assert 'name="version" value="1"' in html


def _edit(client, row, version, states, **fields):
    data = species_post(states=states, version=version, **fields)
    return client.post(reverse("catalogue:edit", args=[row.pk]), data)


OCS_FIELDS = {"name": "OCS", "formula": "OCS", "dipole_a_debye": "0.7152", "hazards": "toxic"}


def test_editing_saves_a_new_version(editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    response = _edit(editor_client, row, 1, [("v=0", 0, "B 6081.4921 0.0002\nD 0.0013017 0.000001")], **OCS_FIELDS)
    assert response.status_code == 302
    row.refresh_from_db()
    assert row.version == 2 and row.hazards == "toxic"


def test_adding_and_removing_states(editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    states = [("v=0", 0, "B 6081.4921 0.0002"), ("v1=1", 859.0, "B 6081.0 0.5")]
    assert _edit(editor_client, row, 1, states, **OCS_FIELDS).status_code == 302
    assert list(row.states.values_list("label", flat=True)) == ["v=0", "v1=1"]
    data = species_post(states=states, version=2, **OCS_FIELDS)
    data["states-1-DELETE"] = "on"
    assert editor_client.post(reverse("catalogue:edit", args=[row.pk]), data).status_code == 302
    assert list(row.states.values_list("label", flat=True)) == ["v=0"]


def test_second_save_of_a_concurrent_edit_is_refused_with_the_others_changes(editor_client, second_editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    # Both opened the form at version 1.  Olga saves first: B changes.
    first = _edit(second_editor_client, row, 1, [("v=0", 0, "B 6081.5000 0.0002")], **OCS_FIELDS)
    assert first.status_code == 302
    # Eddie saves his own change from version 1: refused, nothing overwritten.
    second = _edit(editor_client, row, 1, [("v=0", 0, "B 6081.4000 0.0002")], **OCS_FIELDS)
    assert second.status_code == 409
    html = second.content.decode()
    assert "was changed by olga while you were editing it" in html
    assert "state v=0: B [MHz]" in html and "6081.5 ± 0.0002" in html
    assert Constant.objects.get(state__species=row, name="B").value_mhz == 6081.5
    # His values are still in the form, now based on version 2: saving again is his informed choice.
    assert 'name="version" value="2"' in html and "B 6081.4000 0.0002" in html
    third = _edit(editor_client, row, 2, [("v=0", 0, "B 6081.4000 0.0002")], **OCS_FIELDS)
    assert third.status_code == 302
    assert Constant.objects.get(state__species=row, name="B").value_mhz == 6081.4


def test_delete_asks_first_then_deletes_with_an_undo_link(editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    url = reverse("catalogue:delete", args=[row.pk])
    confirm = editor_client.get(url)
    assert confirm.status_code == 200 and "Delete OCS?" in confirm.content.decode()
    assert SpeciesRow.objects.filter(pk=row.pk).exists()
    response = editor_client.post(url, follow=True)
    assert not SpeciesRow.objects.filter(pk=row.pk).exists()
    html = response.content.decode()
    assert "Deleted OCS." in html and reverse("catalogue:history", args=[row.pk]) in html


def test_viewer_cannot_delete(viewer_client):
    row = SpeciesRow.objects.get(name="OCS")
    assert viewer_client.post(reverse("catalogue:delete", args=[row.pk])).status_code == 403
    assert SpeciesRow.objects.filter(pk=row.pk).exists()


def test_forms_carry_a_csrf_token(editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    for url in (CREATE, reverse("catalogue:edit", args=[row.pk]), reverse("catalogue:delete", args=[row.pk])):
        assert 'name="csrfmiddlewaretoken"' in editor_client.get(url).content.decode()


def test_one_save_shows_every_problem_at_once(editor_client):
    # Zero dipoles (a form rule) and a negative B (an engine rule) in the same save.
    response = editor_client.post(CREATE, species_post(dipole_a_debye="0", states=[("v=0", 0, "B -5 0")]))
    errors = _errors(response)
    assert any("no rotational lines" in e for e in errors["dipole_a_debye"])
    assert any("B: must be > 0 MHz" in e for e in errors["states-0-constants"])


def test_a_new_species_offers_no_delete_box_for_its_first_state(editor_client):
    html = editor_client.get(CREATE).content.decode()
    assert 'name="states-0-DELETE"' not in html
