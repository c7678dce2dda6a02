"""The species page: constants with σ and units, derived values, Q(T), plots, hazards, recent changes."""

import json

import pytest
from django.urls import reverse

from planner.catalogue.models import Species as SpeciesRow
from planner.engine.constants import MHZ_PER_CM1
from planner.engine.derived import inertial_defect_amu_a2, partition_function, ray_kappa


def _page(client, name, **query):
    row = SpeciesRow.objects.get(name=name)
    return client.get(reverse("catalogue:species", args=[row.pk]), query)


def _species(demo_species, name):
    return next(s for s in demo_species if s.name == name)


def test_constants_table_shows_value_sigma_and_their_units(viewer_client, demo_species):
    so2 = _species(demo_species, "SO2")
    html = _page(viewer_client, "SO2").content.decode()
    for header in ("Value [MHz]", "σ [MHz]", "Value [GHz]", "Value [cm⁻¹]", "σ [cm⁻¹]"):
        assert f">{header}</th>" in html
    value, sigma = so2.states[0].constants_mhz["A"]
    assert f"{value:.12g}" in html and f"{sigma:.3g}" in html
    assert f"{value / 1e3:.12g}" in html  # GHz
    assert f"{value / MHZ_PER_CM1:.8g}" in html  # cm⁻¹ (CODATA c via scipy.constants)


def test_asymmetric_top_shows_kappa_and_inertial_defect(viewer_client, demo_species):
    so2 = _species(demo_species, "SO2")
    a, b, c = (so2.states[0].constants_mhz[n][0] for n in "ABC")
    response = _page(viewer_client, "SO2")
    derived = dict((name, value) for name, value, _ in response.context["states"][0]["derived"])
    assert derived["Ray's asymmetry κ = (2B − A − C)/(A − C)"] == pytest.approx(ray_kappa(a, b, c))
    assert derived["Inertial defect Δ = Ic − Ia − Ib"] == pytest.approx(inertial_defect_amu_a2(a, b, c))
    # SO2 is a near-prolate top with a small positive defect (from memory: κ ≈ −0.94, Δ ≈ +0.14 u Å²).
    assert -0.96 < derived["Ray's asymmetry κ = (2B − A − C)/(A − C)"] < -0.92
    assert 0.1 < derived["Inertial defect Δ = Ic − Ia − Ib"] < 0.2


def test_linear_molecule_has_no_kappa(viewer_client):
    derived = [name for name, _, _ in _page(viewer_client, "OCS").context["states"][0]["derived"]]
    assert derived == ["Ib = h/(8π²B)"]


def test_a_diatomic_shows_its_bond_length(viewer_client):
    derived = {name: value for name, value, _ in _page(viewer_client, "CO").context["states"][0]["derived"]}
    assert derived["r from B of v=0 (r0 for the ground state)"] == pytest.approx(1.1309, abs=2e-4)  # from memory


def test_partition_function_at_the_typed_temperatures(viewer_client, demo_species):
    response = _page(viewer_client, "H2CO", temperatures_k="9.4, 150 300")
    rows = response.context["partition_rows"]
    assert [row["temperature_k"] for row in rows] == [9.4, 150.0, 300.0]
    h2co = _species(demo_species, "H2CO")
    for row in rows:
        assert row["q"] == pytest.approx(partition_function(h2co, row["temperature_k"]), rel=1e-12)
    assert response.content.decode().count('<td class="num">') >= 6


@pytest.mark.parametrize(
    "query, field, message",
    [
        ({"temperatures_k": "100, warm"}, "temperatures_k", "“warm” is not a number"),
        ({"temperatures_k": "-5"}, "temperatures_k", "-5 K is outside 0–5000 K"),
        ({"temperatures_k": " ".join(["10"] * 13)}, "temperatures_k", "give at most 12 temperatures"),
        ({"temperature_k": "0"}, "temperature_k", "0 K is outside 0–5000 K"),
    ],
)
def test_bad_temperature_is_an_error_next_to_its_field(viewer_client, query, field, message):
    response = _page(viewer_client, "OCS", **query)
    assert response.status_code == 200
    assert any(message in error for error in response.context["page_form"].errors[field])
    assert message in response.content.decode()


def test_stick_spectrum_and_level_diagram_are_embedded(viewer_client, demo_species):
    response = _page(viewer_client, "OCS", temperature_k="20")
    html = response.content.decode()
    assert 'id="spectrum-plot"' in html and 'id="levels-plot"' in html
    assert "/static/vendor/plotly/plotly.min.js" in html
    plot = response.context["plot"]
    assert plot["total"] == response.context["line_count"] > 0
    levels = json.loads(html.split('<script id="levels-data" type="application/json">')[1].split("</script>")[0])
    b = _species(demo_species, "OCS").states[0].constants_mhz["B"][0]
    # Textbook rigid rotor: E(J=1) = 2B (plus a tiny distortion term) [cm⁻¹].
    assert levels["present"]["energy_cm1"][1] == pytest.approx(2 * b / MHZ_PER_CM1, rel=1e-5)
    assert levels["present"]["label"][:2] == ["J=0", "J=1"]


def test_spin_weight_zero_levels_are_marked_absent(viewer_client):
    # O3 (demo data): b-axis weights even 1, odd 0 — half the levels do not exist.
    levels = _page(viewer_client, "O3").context["levels"]
    assert levels["absent"]["j"] and levels["present"]["j"]


def test_hazards_are_shown_with_the_usual_caution(viewer_client, demo_species):
    html = _page(viewer_client, "H2S").content.decode()
    assert _species(demo_species, "H2S").hazards.split(".")[0] in html
    assert "ask the safety officer" in html
    assert "follow local regulations" in html


def test_species_without_dipole_carries_a_visible_warning(viewer_client):
    response = _page(viewer_client, "CO2")
    html = response.content.decode()
    assert 'id="no-dipole-warning"' in html
    assert "has no rotational lines" in html
    assert response.context["plot"] is None


def test_viewer_sees_no_edit_link_but_an_editor_does(viewer_client, editor, client):
    row = SpeciesRow.objects.get(name="OCS")
    assert reverse("catalogue:edit", args=[row.pk]) not in _page(viewer_client, "OCS").content.decode()
    client.force_login(editor)
    assert reverse("catalogue:edit", args=[row.pk]) in _page(client, "OCS").content.decode()


def test_recent_changes_name_the_import(viewer_client):
    revisions = _page(viewer_client, "OCS").context["revisions"]
    assert [(r.kind, r.reason, r.user) for r in revisions] == [("created", "demo catalogue", "")]


def test_unknown_species_is_404(viewer_client):
    assert viewer_client.get(reverse("catalogue:species", args=[999999])).status_code == 404


def test_engine_refusal_is_shown_not_raised(viewer_client, monkeypatch):
    from planner.engine import EngineLimitError

    def refuse(species, request):
        raise EngineLimitError("needs levels above J = 250")

    monkeypatch.setattr("planner.catalogue.predictions.predict", refuse)
    response = _page(viewer_client, "SO2")
    assert response.status_code == 200
    assert "needs levels above J = 250" in response.content.decode()


def test_first_visit_shows_the_default_temperatures_in_the_form(viewer_client):
    html = _page(viewer_client, "OCS").content.decode()
    assert 'name="temperature_k" value="300"' in html
    assert 'name="temperatures_k" value="10, 75, 150, 300"' in html
