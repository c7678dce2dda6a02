"""The spectrum page: form, engine numbers in the table, errors next to their fields."""

import pytest
from django.urls import reverse

from planner.engine import EngineLimitError, PredictionRequest, predict
from planner.spectra.table import format_cell, table_columns

URL = reverse("spectra:spectrum")

#: Methyl cyanide, a prolate symmetric top.  Constants from memory (ground state,
#: roughly A 158 099, B 9198.9, DJ 0.0038, DJK 0.1774 MHz; μ 3.92 D); the test
#: only needs a valid symmetric top, not exact values.
CH3CN_ENTRY = {
    "name": "CH3CN",
    "formula": "CH3CN",
    "rotor": "symmetric-prolate",
    "dipole_debye": {"a": 3.92},
    "states": [
        {
            "label": "v=0",
            "energy_cm1": 0.0,
            "constants_mhz": {
                "A": [158099.0, 0.0],
                "B": [9198.9, 0.0001],
                "DJ": [0.0038, 0.0],
                "DJK": [0.1774, 0.0],
            },
        }
    ],
}


def test_first_visit_shows_the_form_and_no_prediction(viewer_client, demo_species, django_assert_num_queries):
    # session, user, its two permission queries; then the species names (constants only once one is chosen)
    with django_assert_num_queries(5):
        response = viewer_client.get(URL)
    assert response.status_code == 200
    html = response.content.decode()
    for label in ("Species", "Temperature [K]", "From [MHz]", "To [MHz]", "Intensity floor [nm² MHz]"):
        assert label in html
    assert f'<option value="{demo_species[0].name}"' in html
    assert 'id="line-table"' not in html
    assert "press <em>Predict lines</em>" in html
    # Defaults: room temperature and 0-1 THz (planner/spectra/forms.py), shown without a trailing ".0".
    assert 'name="temperature_k" value="300"' in html
    assert 'name="fmax_mhz" value="1000000"' in html


def test_page_table_shows_the_engines_numbers(viewer_client, demo_with_lines, page_query, parse_table):
    species, prediction = demo_with_lines
    response = viewer_client.get(URL, page_query(species.name))
    assert response.status_code == 200
    head, body = parse_table(response.content.decode())

    columns = table_columns(species)
    assert head[-1] == [column.label for column in columns]
    first = prediction.records()[0]  # computed here by the engine itself, not hard-coded
    assert body[0] == [format_cell(first[column.key], column.number_format) for column in columns]
    assert len(body) == min(len(prediction.lines), 500)


def test_page_shows_partition_function_j_limit_and_line_count(viewer_client, demo_with_lines, page_query):
    species, prediction = demo_with_lines
    response = viewer_client.get(URL, page_query(species.name))
    html = response.content.decode()
    assert f'id="partition-function">{format_cell(prediction.partition_function[species.name], ".6g")}<' in html
    assert f'id="j-max">J ≤ {prediction.j_max[species.name]}<' in html
    assert f'id="line-count">{len(prediction.lines)}<' in html


def test_table_headers_carry_units(viewer_client, demo_with_lines, page_query):
    species, _ = demo_with_lines
    html = viewer_client.get(URL, page_query(species.name)).content.decode()
    for header in ("Frequency [MHz]", "σ [MHz]", "E_l [cm⁻¹]", "E_u [K]", "Sμ² [D²]", "A [s⁻¹]", "Intensity [nm² MHz]"):
        assert f">{header}</th>" in html
    assert ">Upper</th>" in html and ">Lower</th>" in html


def test_symmetric_top_shows_k_and_no_kc(viewer_client, use_catalogue, page_query, parse_table):
    use_catalogue(CH3CN_ENTRY)
    response = viewer_client.get(URL, page_query("CH3CN", fmax_mhz=60_000.0))
    head, body = parse_table(response.content.decode())
    assert head[-1][2:6] == ["J", "K", "J", "K"]
    assert "Ka" not in head[-1] and "Kc" not in head[-1]
    assert body, "a symmetric top with a dipole has lines below 60 GHz"


def test_table_is_cut_at_the_row_limit_with_a_note(
    viewer_client, demo_with_lines, page_query, parse_table, monkeypatch
):
    species, prediction = demo_with_lines
    monkeypatch.setattr("planner.spectra.table.TABLE_ROW_LIMIT", 1)
    html = viewer_client.get(URL, page_query(species.name)).content.decode()
    _, body = parse_table(html)
    assert len(body) == 1
    assert f"The table shows the first 1 of {len(prediction.lines)} lines" in html


@pytest.mark.parametrize(
    "field, value, message",
    [
        ("temperature_k", "-5", "Must be above 0 K."),
        ("temperature_k", "0", "Must be above 0 K."),
        ("temperature_k", "warm", "Enter a number."),
        ("temperature_k", "6000", "Ensure this value is less than or equal to 5000.0."),
        ("fmin_mhz", "-1", "Ensure this value is greater than or equal to 0.0."),
        ("fmax_mhz", "", "This field is required."),
        ("min_intensity_nm2mhz", "-1e-5", "Ensure this value is greater than or equal to 0.0."),
    ],
)
def test_bad_value_shows_an_error_next_to_its_field(viewer_client, demo_species, page_query, field, value, message):
    response = viewer_client.get(URL, page_query(demo_species[0].name, **{field: value}))
    assert response.status_code == 200
    assert response.context["form"].errors[field] == [message]
    html = response.content.decode()
    # Django renders a field's errors right after it, in a list whose id names the field.
    assert f'<ul class="errorlist" id="id_{field}_error"><li>{message}</li></ul>' in html
    assert 'id="line-table"' not in html


def test_upside_down_window_is_an_error_on_the_upper_edge(viewer_client, demo_species, page_query):
    response = viewer_client.get(URL, page_query(demo_species[0].name, fmin_mhz="20000", fmax_mhz="10000"))
    assert response.context["form"].errors["fmax_mhz"] == ["Must be above the lower edge of the window."]
    assert 'id="line-table"' not in response.content.decode()


def test_unknown_species_is_an_error_on_the_species_field(viewer_client, demo_species, page_query):
    response = viewer_client.get(URL, page_query("no-such-molecule"))
    assert "species" in response.context["form"].errors
    assert 'id="id_species_error"' in response.content.decode()


def test_species_without_dipole_shows_the_engines_message(viewer_client, use_catalogue, co2_entry, page_query):
    use_catalogue(co2_entry)
    response = viewer_client.get(URL, page_query("CO2"))
    assert response.status_code == 200
    html = response.content.decode()
    species = response.context["species"]
    expected = predict(species, PredictionRequest(fmin_mhz=0.0, fmax_mhz=120_000.0, temperature_k=50.0))
    assert expected.messages, "the engine explains an empty line list"
    for message in expected.messages:
        assert f'<p class="notice engine-message">{message}</p>' in html
    assert 'id="line-table"' not in html


def test_engine_refusal_is_a_form_error_not_a_server_error(viewer_client, demo_species, page_query, monkeypatch):
    def refuse(species, request):
        raise EngineLimitError("this window needs J up to 400, above the cap of 250")

    monkeypatch.setattr("planner.catalogue.predictions.predict", refuse)
    response = viewer_client.get(URL, page_query(demo_species[0].name))
    assert response.status_code == 200
    assert response.context["form"].non_field_errors() == ["this window needs J up to 400, above the cap of 250"]
    assert 'class="form-errors"' in response.content.decode()


def test_anonymous_visitor_is_sent_to_the_login_page(client):
    response = client.get(URL)
    assert response.status_code == 302
    assert response["Location"].startswith(reverse("login"))


def test_account_without_a_role_is_refused(client, make_member):
    client.force_login(make_member("nobody"))
    assert client.get(URL).status_code == 403


def test_page_loads_plotly_from_our_static_files(viewer_client, demo_with_lines, page_query):
    species, _ = demo_with_lines
    html = viewer_client.get(URL, page_query(species.name)).content.decode()
    assert 'src="/static/vendor/plotly/plotly.min.js"' in html
    assert "cdn" not in html.lower()
    assert 'id="plot-data"' in html


def test_print_stylesheet_is_linked_for_print_and_summary_is_printable(viewer_client, demo_with_lines, page_query):
    species, prediction = demo_with_lines
    html = viewer_client.get(URL, page_query(species.name)).content.decode()
    assert '<link rel="stylesheet" href="/static/css/print.css" media="print">' in html
    summary = html.split('<div class="result-head">')[1].split("</dl>")[0]
    assert "no-print" not in summary  # temperature, window, Q(T), J limit and line count reach the paper
    assert f'id="line-count">{len(prediction.lines)}<' in summary


def test_hazard_notes_of_the_species_are_shown_with_the_prediction(viewer_client, demo_with_lines, page_query):
    species, _ = demo_with_lines
    html = viewer_client.get(URL, page_query(species.name)).content.decode()
    assert "Handling and hazards" in html
    assert species.hazards.split(".")[0] in html
    assert "ask the safety officer" in html
