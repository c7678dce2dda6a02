"""Isotopologues, satellites and hyperfine structure on the pages and from the command line.

The species are the demo catalogue's (planner/demo/catalogue.json: demo data,
constants from memory); isotope fractions come from periodictable.
"""

import io
import json

import periodictable
import pytest
from django.core.management import CommandError, call_command
from django.urls import reverse

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue
from planner.planning.exports import TARGET_COLUMNS

PLAN = reverse("planning:plan")


def _row(name):
    return SpeciesRow.objects.get(name=name)


def _fraction(element, mass):
    return getattr(periodictable, element)[mass].abundance / 100.0


# --- the isotopologue page -----------------------------------------------------------------------


def test_species_page_offers_an_editor_a_new_isotopologue_and_a_viewer_not(editor_client, client, viewer):
    ocs = _row("OCS")
    page = editor_client.get(reverse("catalogue:species", args=[ocs.pk])).content.decode()
    assert reverse("catalogue:isotopologue", args=[ocs.pk]) in page
    client.force_login(viewer)
    page = client.get(reverse("catalogue:species", args=[ocs.pk])).content.decode()
    assert reverse("catalogue:isotopologue", args=[ocs.pk]) not in page


def test_viewer_cannot_open_the_isotopologue_page(viewer_client):
    response = viewer_client.get(reverse("catalogue:isotopologue", args=[_row("OCS").pk]))
    assert response.status_code == 403


def test_isotopologue_page_lists_each_atom_with_its_natural_isotopes(editor_client):
    so2 = _row("SO2")
    response = editor_client.get(reverse("catalogue:isotopologue", args=[so2.pk]))
    page = response.content.decode()
    assert response.status_code == 200
    for position, element in enumerate(("S", "O", "O"), start=1):
        assert f'name="atom_{position}"' in page
        assert f"Atom {position}: {element}" in page
    assert "34S" in page and "18O" in page
    assert "stored geometry" in page


def test_creating_o18_so2_on_the_page_makes_a_species_with_its_route_and_abundance(editor_client):
    so2 = _row("SO2")
    url = reverse("catalogue:isotopologue", args=[so2.pk])
    response = editor_client.post(url, {"atom_1": "32", "atom_2": "18", "atom_3": "16", "name": ""})
    assert response.status_code == 302
    new = SpeciesRow.objects.get(parent_name="SO2")
    assert response["Location"] == reverse("catalogue:species", args=[new.pk])
    assert new.parent_name == "SO2" and new.constants_route == "geometry-ratio"
    # Two equivalent O positions: 2 × f(32S) f(16O) f(18O) (textbook identity; fractions from periodictable).
    expected = 2 * _fraction("S", 32) * _fraction("O", 16) * _fraction("O", 18)
    assert new.natural_abundance == pytest.approx(expected, rel=1e-9)
    species = species_of_row(new)
    assert species.spin_weights is None  # the O atoms are no longer equivalent
    assert species.dipole_debye[0] > 0  # the rotated axes give an a component
    page = editor_client.get(response["Location"]).content.decode()
    assert "Isotopologue of" in page and "geometry" in page.lower()
    assert new.history.first().history_change_reason.startswith("derived from SO2")


def test_creating_13co_by_mass_scaling_from_the_page(editor_client):
    co = _row("CO")
    CO13 = "13CO-page"
    response = editor_client.post(
        reverse("catalogue:isotopologue", args=[co.pk]), {"atom_1": "13", "atom_2": "16", "name": CO13}
    )
    assert response.status_code == 302
    new = _row(CO13)
    assert new.constants_route == "mass-scaling"
    assert "reduced mass" in new.route_note


def test_an_unchanged_isotopologue_is_refused_next_to_the_form(editor_client):
    so2 = _row("SO2")
    response = editor_client.post(
        reverse("catalogue:isotopologue", args=[so2.pk]), {"atom_1": "32", "atom_2": "16", "atom_3": "16"}
    )
    assert response.status_code == 400
    assert "the result is the parent itself" in response.content.decode()


def test_a_polyatomic_without_geometry_is_refused_with_the_reason(editor_client):
    h2co = _row("H2CO")
    response = editor_client.post(
        reverse("catalogue:isotopologue", args=[h2co.pk]),
        {"atom_1": "13", "atom_2": "1", "atom_3": "1", "atom_4": "16"},
    )
    page = response.content.decode()
    assert response.status_code == 400
    assert "no stored geometry" in page
    assert not SpeciesRow.objects.filter(parent_name="H2CO").exists()


def test_a_name_already_taken_is_refused(editor_client):
    ocs = _row("OCS")
    response = editor_client.post(
        reverse("catalogue:isotopologue", args=[ocs.pk]),
        {"atom_1": "16", "atom_2": "12", "atom_3": "34", "name": "SO2"},
    )
    assert response.status_code == 400
    assert "already called" in response.content.decode()


# --- the species page and form --------------------------------------------------------------------


def test_species_page_shows_hyperfine_geometry_degeneracy_and_isotopologues(viewer_client):
    hcn = viewer_client.get(reverse("catalogue:species", args=[_row("HCN").pk])).content.decode()
    assert "14N, I = 1" in hcn
    ocs = viewer_client.get(reverse("catalogue:species", args=[_row("OCS").pk])).content.decode()
    assert 'id="geometry-table"' in ocs
    assert "degeneracy 2" in ocs
    assert "OC34S" in ocs  # the list of its isotopologues
    oc34s = viewer_client.get(reverse("catalogue:species", args=[_row("OC34S").pk])).content.decode()
    assert "Isotopologue of" in oc34s and "geometry ratio" in oc34s


def test_editing_keeps_hyperfine_geometry_alpha_and_provenance(editor_client):
    for name in ("HCN", "OCS", "CO", "13CO"):
        row = _row(name)
        before = species_of_row(row)
        form = editor_client.get(reverse("catalogue:edit", args=[row.pk])).context
        data = {key: value for key, value in form["form"].initial.items() if value is not None}
        data["no_dipole"] = "" if before.has_dipole else "on"
        formset = form["states"]
        data |= {
            f"states-{key}": value
            for key, value in {
                "TOTAL_FORMS": len(formset.initial) + 1,
                "INITIAL_FORMS": len(formset.initial),
                "MIN_NUM_FORMS": 1,
                "MAX_NUM_FORMS": 1000,
            }.items()
        }
        for index, state in enumerate(formset.initial):
            data |= {f"states-{index}-{key}": value for key, value in state.items()}
        response = editor_client.post(reverse("catalogue:edit", args=[row.pk]), data)
        assert response.status_code == 302, response.content.decode()[:2000]
        after = species_of_row(_row(name))
        assert after.hyperfine == before.hyperfine
        assert after.geometry == pytest.approx(before.geometry) if not before.geometry else True
        for a, b in zip(after.states, before.states):  # the form shows 12 digits of a value, 6 of a σ
            assert dict(a.alpha_mhz) == {k: pytest.approx(v, rel=1e-5) for k, v in b.alpha_mhz.items()}
        assert [s.degeneracy for s in after.states] == [s.degeneracy for s in before.states]
        assert (after.parent, after.natural_abundance, after.constants_route) == (
            before.parent,
            before.natural_abundance,
            before.constants_route,
        )


def test_species_form_puts_hyperfine_and_geometry_problems_next_to_their_fields(editor_client):
    hcn = _row("HCN")
    form = editor_client.get(reverse("catalogue:edit", args=[hcn.pk])).context
    data = {key: value for key, value in form["form"].initial.items() if value is not None}
    data |= {
        "states-TOTAL_FORMS": 1,
        "states-INITIAL_FORMS": 1,
        "states-MIN_NUM_FORMS": 1,
        "states-MAX_NUM_FORMS": 1000,
        "states-0-label": "v=0",
        "states-0-energy_cm1": 0,
        "states-0-constants": "B 44315.976 0.001",
        "states-0-degeneracy": 0,
        "hfs_spin": 0.5,
        "geometry": "H 0 0 0\nC 0 0 0.1",
    }
    response = editor_client.post(reverse("catalogue:edit", args=[hcn.pk]), data)
    assert response.status_code == 400
    errors = response.context["form"].errors
    assert "hfs_spin" in errors and "steps of 1/2" in errors["hfs_spin"][0] or ">= 1" in errors["hfs_spin"][0]
    assert "geometry" in errors and "typing slip" in errors["geometry"][0]
    assert response.context["states"].forms[0].errors["degeneracy"]


# --- planning ---------------------------------------------------------------------------------------


def _plan_query(**extra):
    query = {
        "frequency_unit": "GHz",
        "fmin": "85",
        "fmax": "120",
        "temperature_k": "300",
        "slot_minutes": "30",
        "snr": "5",
        "k_sigma": "3",
        "margin_mhz": "0",
        f"amount_{_row('OCS').pk}": "1",
        f"amount_{_row('OC34S').pk}": "1",
        f"amount_{_row('HCN').pk}": "1",
    }
    query.update(extra)
    return query


def test_plan_weights_an_isotopologue_by_its_natural_abundance(viewer_client):
    response = viewer_client.get(PLAN, _plan_query())
    assert response.status_code == 200
    targets = response.context["document"]["result"]["targets"]
    main = next(t for t in targets if t["species"] == "OCS" and t["state"] == "v=0" and t["j_up"] == 9)
    minor = next(t for t in targets if t["species"] == "OC34S" and t["state"] == "v=0" and t["j_up"] == 9)
    assert minor["isotopic_fraction"] == pytest.approx(_row("OC34S").natural_abundance)
    assert main["isotopic_fraction"] == pytest.approx(_row("OCS").natural_abundance)
    # The relative model's signal is amount × fraction × intensity: the per-molecule intensities divide out.
    ratio = (minor["expected_signal"] / minor["intensity_nm2mhz"]) / (
        main["expected_signal"] / main["intensity_nm2mhz"]
    )
    assert ratio == pytest.approx(minor["isotopic_fraction"] / main["isotopic_fraction"], rel=1e-9)


def test_an_enriched_fraction_replaces_the_natural_abundance(viewer_client):
    oc34s = _row("OC34S")
    response = viewer_client.get(PLAN, _plan_query(**{f"fraction_{oc34s.pk}": "0.9"}))
    targets = response.context["document"]["result"]["targets"]
    assert {t["isotopic_fraction"] for t in targets if t["species"] == "OC34S"} == {0.9}
    assert "isotopic fraction 0.9" in response.content.decode()


@pytest.mark.parametrize("bad", ["0", "1.5", "-0.1"])
def test_a_fraction_out_of_range_is_refused_next_to_its_box(viewer_client, bad):
    oc34s = _row("OC34S")
    response = viewer_client.get(PLAN, _plan_query(**{f"fraction_{oc34s.pk}": bad}))
    assert response.status_code == 400
    assert f"fraction_{oc34s.pk}" in response.context["form"].errors


def test_satellites_can_be_excluded_and_are_then_left_out_with_a_reason(viewer_client):
    included = viewer_client.get(PLAN, _plan_query()).context["document"]["result"]
    assert any(t["satellite"] for t in included["targets"])
    assert "sat." in viewer_client.get(PLAN, _plan_query()).content.decode()
    excluded = viewer_client.get(PLAN, _plan_query(satellites="exclude")).context["document"]["result"]
    assert not any(t["satellite"] for t in excluded["targets"])
    assert any("satellites excluded" in row["reason"] for row in excluded["left_out"])


def test_hyperfine_spread_widens_the_search_interval_and_shows_in_the_table(viewer_client):
    response = viewer_client.get(PLAN, _plan_query(k_sigma="0"))
    targets = response.context["document"]["result"]["targets"]
    hcn = next(t for t in targets if t["species"] == "HCN" and t["j_up"] == 1)
    assert hcn["hfs_low_mhz"] < 0 < hcn["hfs_high_mhz"]
    half = hcn["fwhm_mhz"] / 2
    assert hcn["search_lo_mhz"] == pytest.approx(hcn["frequency_mhz"] + hcn["hfs_low_mhz"] - half)
    assert hcn["search_hi_mhz"] == pytest.approx(hcn["frequency_mhz"] + hcn["hfs_high_mhz"] + half)
    assert "hfs −1.177" in response.content.decode() or "hfs -1.177" in response.content.decode()


def test_targets_csv_has_the_new_columns():
    for name in ("vib_energy_cm1", "satellite", "hfs_low_mhz", "hfs_high_mhz", "isotopic_fraction"):
        assert name in TARGET_COLUMNS


# --- the command -------------------------------------------------------------------------------------


def _run(*arguments):
    out, err = io.StringIO(), io.StringIO()
    call_command("isotopologue", *arguments, stdout=out, stderr=err)
    return out.getvalue(), err.getvalue()


def test_isotopologue_command_writes_a_catalogue_with_the_derived_species(tmp_path):
    source = DEMO_CATALOGUE_PATH
    output = tmp_path / "o13cs.json"
    _, err = _run("--catalogue", str(source), "--species", "OCS", "--substitute", "C=13C", "--output", str(output))
    (species,) = load_catalogue(output)
    assert species.name == "O13CS" and species.parent == "OCS"
    assert species.constants_route == "geometry-ratio"
    assert species.natural_abundance == pytest.approx(
        _fraction("O", 16) * _fraction("C", 13) * _fraction("S", 32), rel=1e-9
    )
    assert "wrote O13CS" in err and "Natural abundance" in err
    data = json.loads(output.read_text())
    assert {"parent", "natural_abundance", "constants_route", "route_note", "geometry"} <= set(data["species"][0])


def test_isotopologue_command_by_position_to_stdout():
    source = DEMO_CATALOGUE_PATH
    out, _ = _run("--catalogue", str(source), "--species", "SO2", "--substitute", "3=18O", "--name", "SO-18O")
    assert json.loads(out)["species"][0]["name"] == "SO-18O"


@pytest.mark.parametrize(
    "arguments, message",
    [
        (["--species", "NOPE", "--substitute", "C=13C"], "no species 'NOPE'"),
        (["--species", "SO2", "--substitute", "O=18O"], "give the position"),
        (["--species", "OCS", "--substitute", "C=18O"], "not an isotope of C"),
        (["--species", "H2CO", "--substitute", "C=13C"], "no stored geometry"),
        (["--species", "OCS", "--substitute", "C=12C"], "change no atom"),
    ],
)
def test_isotopologue_command_refuses_bad_input_with_a_message(arguments, message):
    source = DEMO_CATALOGUE_PATH
    with pytest.raises(CommandError, match=message):
        _run("--catalogue", str(source), *arguments)
