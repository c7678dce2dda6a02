"""A species' history: who changed what, restore an earlier version, undo a delete."""

from django.urls import reverse

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Constant
from planner.catalogue.models import Species as SpeciesRow
from tests.web.catalogue_forms import species_post

OCS_FIELDS = {"name": "OCS", "formula": "OCS", "dipole_a_debye": "0.7152", "hazards": "toxic"}


def _change_b(client, row, version, b_mhz):
    data = species_post(states=[("v=0", 0, f"B {b_mhz} 0.0002")], version=version, **OCS_FIELDS)
    response = client.post(reverse("catalogue:edit", args=[row.pk]), data)
    assert response.status_code == 302, response.content.decode()[:2000]


def test_history_shows_who_changed_what_from_old_to_new(editor_client, demo_species):
    row = SpeciesRow.objects.get(name="OCS")
    old_b = next(s for s in demo_species if s.name == "OCS").states[0].constants_mhz["B"][0]
    _change_b(editor_client, row, 1, 6081.5)
    response = editor_client.get(reverse("catalogue:history", args=[row.pk]))
    newest, oldest = response.context["revisions"]
    assert (newest.kind, newest.user, newest.version, newest.reason) == ("changed", "eddie", 2, "edited on the web")
    b_change = next(c for c in newest.changes if c.field == "state v=0: B [MHz]")
    assert b_change.old.startswith(f"{old_b:.12g} ±") and b_change.new == "6081.5 ± 0.0002"
    assert oldest.kind == "created"
    html = response.content.decode()
    assert "state v=0: B [MHz]" in html and "6081.5 ± 0.0002" in html and "eddie" in html


def test_restore_brings_back_an_earlier_version_as_a_new_one(editor_client, demo_species):
    row = SpeciesRow.objects.get(name="OCS")
    original = species_of_row(row)
    _change_b(editor_client, row, 1, 6081.5)
    created = editor_client.get(reverse("catalogue:history", args=[row.pk])).context["revisions"][-1]
    url = reverse("catalogue:restore", args=[row.pk, created.history_id])
    confirm = editor_client.get(url)
    assert confirm.status_code == 200
    assert any(c.field == "state v=0: B [MHz]" for c in confirm.context["changes"])
    response = editor_client.post(url)
    assert response.status_code == 302
    row.refresh_from_db()
    assert species_of_row(row) == original
    assert row.version == 3
    newest = editor_client.get(reverse("catalogue:history", args=[row.pk])).context["revisions"][0]
    assert newest.reason.startswith("restored version 1 of")


def test_deleted_species_comes_back_from_its_history(editor_client):
    row = SpeciesRow.objects.get(name="SiO")  # demo data: three states
    before = species_of_row(row)
    pk = row.pk
    editor_client.post(reverse("catalogue:delete", args=[pk]))
    assert not SpeciesRow.objects.filter(pk=pk).exists()
    assert not Constant.objects.filter(state__species_id=pk).exists()
    deleted = editor_client.get(reverse("catalogue:deleted"))
    assert [r.name for r in deleted.context["deleted"]] == ["SiO"]
    history = editor_client.get(reverse("catalogue:history", args=[pk]))
    assert history.status_code == 200
    assert "This species is deleted now" in history.content.decode()
    deletion, created = history.context["revisions"]
    assert deletion.kind == "deleted" and deletion.species is None
    assert editor_client.post(reverse("catalogue:restore", args=[pk, created.history_id])).status_code == 302
    back = SpeciesRow.objects.get(pk=pk)
    assert species_of_row(back) == before
    assert back.version == 2
    assert editor_client.get(reverse("catalogue:deleted")).context["deleted"] == []


def test_the_deletion_itself_cannot_be_restored(editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    pk = row.pk
    editor_client.post(reverse("catalogue:delete", args=[pk]))
    deletion = editor_client.get(reverse("catalogue:history", args=[pk])).context["revisions"][0]
    assert editor_client.post(reverse("catalogue:restore", args=[pk, deletion.history_id])).status_code == 404


def test_restore_refuses_a_name_taken_in_the_meantime(editor_client):
    row = SpeciesRow.objects.get(name="OCS")
    pk = row.pk
    editor_client.post(reverse("catalogue:delete", args=[pk]))
    created = editor_client.get(reverse("catalogue:history", args=[pk])).context["revisions"][-1]
    editor_client.post(reverse("catalogue:create"), species_post(**OCS_FIELDS))
    response = editor_client.post(reverse("catalogue:restore", args=[pk, created.history_id]), follow=True)
    assert "Not restored: another species is already called &#x27;OCS&#x27;" in response.content.decode()
    assert not SpeciesRow.objects.filter(pk=pk).exists()


def test_viewer_reads_the_history_but_cannot_restore(viewer_client):
    row = SpeciesRow.objects.get(name="OCS")
    response = viewer_client.get(reverse("catalogue:history", args=[row.pk]))
    assert response.status_code == 200
    assert "Restore this version" not in response.content.decode()
    created = response.context["revisions"][-1]
    assert viewer_client.post(reverse("catalogue:restore", args=[row.pk, created.history_id])).status_code == 403


def test_history_of_a_species_that_never_existed_is_404(viewer_client):
    assert viewer_client.get(reverse("catalogue:history", args=[999999])).status_code == 404
