"""The catalogue list: search, filters, sort, counts, access."""

import pytest
from django.urls import reverse

URL = reverse("catalogue:list")


def _names(response) -> list[str]:
    return [item["name"] for _, item in response.context["listed"]]


def test_anonymous_visitor_is_sent_to_log_in(client, demo_in_db):
    response = client.get(URL)
    assert response.status_code == 302
    assert response["Location"] == f"{reverse('login')}?next={URL}"


def test_account_without_a_role_is_refused(client, make_member, demo_in_db):
    client.force_login(make_member("norole"))
    response = client.get(URL)
    assert response.status_code == 403
    assert "ask a staff member for the editor role" in response.content.decode()


def test_viewer_sees_every_species_with_the_count(viewer_client, demo_species):
    response = viewer_client.get(URL)
    assert response.status_code == 200
    assert _names(response) == sorted((s.name for s in demo_species), key=str.lower)
    html = response.content.decode()
    assert f"{len(demo_species)} of {len(demo_species)} species" in html
    for header in ("Mass [u]", "μa [D]", "A [MHz]", "B [MHz]", "C [MHz]"):
        assert f">{header}</th>" in html


def test_viewer_gets_no_edit_links(viewer_client):
    html = viewer_client.get(URL).content.decode()
    assert reverse("catalogue:create") not in html
    assert reverse("catalogue:import") not in html


def test_editor_gets_the_new_species_link(editor_client):
    assert reverse("catalogue:create") in editor_client.get(URL).content.decode()


@pytest.mark.parametrize(
    "query, expected",
    [
        ({"q": "ch3"}, {"CH3CN", "CH3CCH", "CH3F"}),  # name or formula, any case
        ({"q": "HCl[35]"}, {"HCl"}),  # the formula only
        ({"rotor": "symmetric-oblate"}, {"CHF3", "PH3"}),
        ({"dipole": "none"}, {"CO2"}),
        ({"dipole": "c"}, {"CHF3", "PH3"}),
        ({"q": "O", "rotor": "asymmetric", "dipole": "b"}, {"SO2", "O3", "c-C2H4O", "HCOOH"}),
    ],
)
def test_search_and_filters_narrow_the_list(viewer_client, query, expected):
    # Demo data (planner/demo/catalogue.json): which species match is a property of that file.
    response = viewer_client.get(URL, query)
    assert set(_names(response)) == expected
    assert f"{len(expected)} of 23 species" in response.content.decode()


def test_rotor_choices_carry_their_counts(viewer_client, demo_species):
    linear = sum(s.rotor == "linear" for s in demo_species)
    html = viewer_client.get(URL).content.decode()
    assert f">linear ({linear})</option>" in html


def test_sort_by_mass_heaviest_first(viewer_client, demo_species):
    names = _names(viewer_client.get(URL, {"sort": "-mass"}))
    expected = [s.name for s in sorted(demo_species, key=lambda s: (-s.mass_amu, s.name.lower()))]
    assert names == expected


def test_unknown_filter_value_is_an_error_and_lists_nothing(viewer_client):
    response = viewer_client.get(URL, {"rotor": "wobbly"})
    assert response.status_code == 200
    assert _names(response) == []
    assert "Select a valid choice" in response.content.decode()


def test_list_needs_a_fixed_number_of_queries(viewer_client, django_assert_num_queries):
    # session, user, two permission lookups, rotor counts, total, species, states, constants, covariances;
    # the header's permission check is cached: the count must not grow with the number of species.
    with django_assert_num_queries(10):
        viewer_client.get(URL)


def test_markup_in_a_name_is_shown_as_text(editor_client, use_catalogue):
    entry = {
        "name": "<script>alert(1)</script>",
        "formula": "CO",
        "rotor": "linear",
        "dipole_debye": {"a": 0.1},
        "states": [{"label": "v=0", "energy_cm1": 0.0, "constants_mhz": {"B": [57635.968, 0.0]}}],
        "hazards": "<b>bold</b>",
    }
    use_catalogue(entry)
    html = editor_client.get(URL).content.decode()
    assert "<script>alert(1)</script>" not in html
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in html
