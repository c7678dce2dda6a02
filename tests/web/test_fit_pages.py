"""The fit page, a fit's report, and saving the fit as a new catalogue version."""

import pytest
from django.core.files.uploadedfile import SimpleUploadedFile
from django.urls import reverse

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.revisions import Timeline
from planner.fitting.models import FitRun
from tests.fitting.test_fit_command import CO_LINES

FIT = reverse("fitting:fit")


def _fit(client, **data):
    co = SpeciesRow.objects.get(name="CO")
    return client.post(FIT, {"species": co.pk, "vary": "B, D", "lines_text": CO_LINES} | data)


def test_a_fit_shows_values_correlation_residuals_and_r0(editor_client):
    response = _fit(editor_client)
    assert response.status_code == 302
    run = FitRun.objects.get()
    page = editor_client.get(reverse("fitting:run", args=[run.pk])).content.decode()
    for text in ("Value(σ) [MHz]", "Correlation", "Observed − calculated", "r0 from B0 [Å]", "Reduced χ²"):
        assert text in page
    assert "57635.96" in page  # CO B0 from memory
    assert run.result["line_count"] == 5


def test_uploaded_csv_is_fitted_the_same(editor_client):
    upload = SimpleUploadedFile("co.csv", CO_LINES.encode(), content_type="text/csv")
    co = SpeciesRow.objects.get(name="CO")
    response = editor_client.post(FIT, {"species": co.pk, "vary": "B,D", "lines_file": upload})
    assert response.status_code == 302


@pytest.mark.parametrize(
    "data, field, message",
    [
        ({"vary": " , "}, "vary", "Name at least one constant"),
        ({"lines_text": ""}, "lines_text", "Paste the assigned lines"),
        ({"lines_text": CO_LINES.replace("0.0005,from memory\n2,", "0,from memory\n2,")}, "lines_text", "must be > 0"),
    ],
)
def test_bad_input_is_shown_next_to_its_field(editor_client, data, field, message):
    response = _fit(editor_client, **data)
    assert response.status_code == 400
    assert any(message in e for e in response.context["form"].errors[field])


def test_an_undeterminable_constant_is_named_not_fitted(editor_client):
    one_line = "\n".join(CO_LINES.splitlines()[:2]) + "\n"
    response = _fit(editor_client, lines_text=one_line)
    assert response.status_code == 400
    assert "Cannot fit" in response.content.decode()
    assert not FitRun.objects.exists()


def test_saving_a_fit_makes_a_new_version_that_names_the_fit(editor_client):
    _fit(editor_client)
    run = FitRun.objects.get()
    response = editor_client.post(reverse("fitting:save", args=[run.pk]))
    co = SpeciesRow.objects.get(name="CO")
    assert response.status_code == 302 and co.version == 2
    state = species_of_row(co).states[0]
    assert state.covariance_names == ("B", "D")
    newest = Timeline(co.pk).revisions()[0]
    assert newest.reason == f"fit {run.pk}: 5 lines, varied B, D" and newest.user == "eddie"
    run.refresh_from_db()
    assert run.saved_as_version == 2


def test_a_fit_of_an_old_version_is_not_saved_over_a_newer_one(editor_client):
    from planner.catalogue.store import Stamp, update_species

    _fit(editor_client)
    run = FitRun.objects.get()
    co = SpeciesRow.objects.get(name="CO")
    update_species(co, species_of_row(co), Stamp(None, "someone else"), expected_version=None)  # version 2
    response = editor_client.post(reverse("fitting:save", args=[run.pk]), follow=True)
    assert "Not saved" in response.content.decode()
    assert SpeciesRow.objects.get(name="CO").version == 2


def test_viewer_may_fit_but_not_save(viewer_client):
    _fit(viewer_client)
    run = FitRun.objects.get()
    assert viewer_client.post(reverse("fitting:save", args=[run.pk])).status_code == 403


def test_the_fitted_species_downloads_as_catalogue_json(editor_client):
    import json

    _fit(editor_client)
    run = FitRun.objects.get()
    response = editor_client.get(reverse("fitting:catalogue_json", args=[run.pk]))
    assert response["Content-Disposition"].startswith(f'attachment; filename="linecast-fit-{run.pk}-')
    (entry,) = json.loads(response.content)["species"]
    assert entry["name"] == "CO"
    assert entry["states"][0]["covariance_mhz2"]["names"] == ["B", "D"]


def test_a_diatomic_with_a_v1_state_also_gets_be_and_re(editor_client):
    _fit(editor_client)  # demo CO has v=0 and v=1 (from memory)
    structure = dict(FitRun.objects.get().result["structure"])
    re = float(structure["re from Be [Å]"].split("±")[0])
    assert re == pytest.approx(1.1283, abs=3e-4)  # re(CO) ≈ 1.1283 Å, from memory
    assert float(structure["r0 from B0 [Å]"].split("±")[0]) > re  # vibration lengthens the average bond
