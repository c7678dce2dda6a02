"""CSV and JSON downloads of the spectrum page: same rows as the engine, all of them."""

import csv
import io
import json

from django.urls import reverse

from planner.engine import LINE_COLUMNS
from planner.spectra.exports import prediction_csv


def test_csv_download_has_a_file_name_and_the_engines_rows(viewer_client, demo_with_lines, page_query):
    species, prediction = demo_with_lines
    response = viewer_client.get(reverse("spectra:spectrum_csv"), page_query(species.name))
    assert response.status_code == 200
    assert response["Content-Type"] == "text/csv; charset=utf-8"
    assert response["Content-Disposition"].startswith('attachment; filename="linecast-')
    assert response["Content-Disposition"].endswith('-50K-0-120000MHz.csv"')

    rows = list(csv.reader(io.StringIO(response.content.decode())))
    assert rows[0] == list(LINE_COLUMNS)
    assert len(rows) - 1 == len(prediction.lines)  # every line, not just the page's first 500
    expected = io.StringIO()
    prediction_csv(prediction, expected)  # the engine's prediction, made here
    assert rows == list(csv.reader(io.StringIO(expected.getvalue())))


def test_json_download_carries_request_q_and_every_line(
    viewer_client, demo_with_lines, page_query, assert_json_matches
):
    species, prediction = demo_with_lines
    response = viewer_client.get(reverse("spectra:spectrum_json"), page_query(species.name))
    assert response.status_code == 200
    assert response["Content-Disposition"].endswith('-50K-0-120000MHz.json"')
    document = json.loads(response.content)
    assert_json_matches(document, prediction)
    assert list(document["lines"][0]) == list(LINE_COLUMNS)
    assert document["lines"][0]["frequency_mhz"] == prediction.records()[0]["frequency_mhz"]


def test_download_with_a_bad_query_is_refused_with_the_field_named(viewer_client, demo_species, page_query):
    response = viewer_client.get(reverse("spectra:spectrum_csv"), page_query(demo_species[0].name, temperature_k="-3"))
    assert response.status_code == 400
    assert "temperature_k: Must be above 0 K." in response.content.decode()


def test_page_links_both_downloads_with_the_same_query(viewer_client, demo_with_lines, page_query):
    species, _ = demo_with_lines
    response = viewer_client.get(reverse("spectra:spectrum"), page_query(species.name))
    html = response.content.decode()
    query = response.wsgi_request.GET.urlencode().replace("&", "&amp;")
    assert f'href="{reverse("spectra:spectrum_csv")}?{query}"' in html
    assert f'href="{reverse("spectra:spectrum_json")}?{query}"' in html


def test_download_refused_by_the_engine_names_the_request(viewer_client, demo_species, page_query, monkeypatch):
    def refuse(species, request):
        raise ValueError("the distortion series has broken down at J=117")

    monkeypatch.setattr("planner.catalogue.predictions.predict", refuse)
    response = viewer_client.get(reverse("spectra:spectrum_json"), page_query(demo_species[0].name))
    assert response.status_code == 400
    assert response.content.decode() == "request: the distortion series has broken down at J=117"
