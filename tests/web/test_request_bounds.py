"""No request can take the server down: every page that starts a computation caps what it is asked.

Each cap gives its message next to the field, and the heavy work does not start: the tests make
the engine's J ladder (``planner.engine.predict.climb``) and the fit's level solver
(``planner.engine.fitting.solver_for``) fail loudly if they are reached.  The caps are
planner/limits.py's and the engine's (planner/engine/request.py).
"""

from __future__ import annotations

import importlib

import pytest
from django.urls import reverse

from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.page_forms import MAX_TEMPERATURES
from planner.engine.request import ASYMMETRIC_J_CAP, CLOSED_FORM_J_CAP, MAX_TEMPERATURE_K
from planner.fitting.models import FitRun
from planner.limits import FIT_J_CAPS, FIT_MAX_ITERATIONS, MAX_FREQUENCY_MHZ, MAX_PLAN_SETTINGS, MAX_PLAN_SPAN_MHZ
from planner.planning.forms import MAX_SPECIES
from planner.planning.models import Instrument, SavedPlan
from tests.fitting.test_fit_command import CO_LINES
from tests.web.conftest import CO2_ENTRY

SPECTRUM = reverse("spectra:spectrum")
PLAN = reverse("planning:plan")


def _refuse(*args, **kwargs):
    raise AssertionError("the heavy computation started although the request is over a cap")


@pytest.fixture
def no_prediction(monkeypatch):
    """Any prediction (page, download, plan, species page) fails the test."""
    # The module, not the function of the same name that planner.engine exports.
    monkeypatch.setattr(importlib.import_module("planner.engine.predict"), "climb", _refuse)


@pytest.fixture
def no_fit(monkeypatch):
    monkeypatch.setattr(importlib.import_module("planner.engine.fitting"), "solver_for", _refuse)


def _errors(response, field: str, form: str = "form") -> str:
    return " ".join(response.context[form].errors.get(field, []))


# Spectrum page and downloads ----------------------------------------------------------------------

TOO_HIGH = {"species": "CO", "temperature_k": "300", "fmin_mhz": "0", "fmax_mhz": str(MAX_FREQUENCY_MHZ + 1)}
CAP_MESSAGE = f"At most {MAX_FREQUENCY_MHZ:.0f} MHz ({MAX_FREQUENCY_MHZ / 1e6:g} THz)"


def test_spectrum_window_above_the_cap_is_refused_before_predicting(viewer_client, no_prediction):
    response = viewer_client.get(SPECTRUM, TOO_HIGH)
    assert response.status_code == 200
    assert CAP_MESSAGE in _errors(response, "fmax_mhz")
    assert response.context["prediction"] is None


@pytest.mark.parametrize("download", ["spectra:spectrum_csv", "spectra:spectrum_json"])
def test_spectrum_downloads_above_the_cap_are_a_400_naming_the_field(viewer_client, no_prediction, download):
    response = viewer_client.get(reverse(download), TOO_HIGH)
    assert response.status_code == 400
    assert f"fmax_mhz: {CAP_MESSAGE}" in response.content.decode()


def test_spectrum_window_at_the_cap_is_predicted(viewer_client):
    query = TOO_HIGH | {"fmax_mhz": str(MAX_FREQUENCY_MHZ), "temperature_k": "50"}
    response = viewer_client.get(SPECTRUM, query)
    assert response.status_code == 200
    assert not response.context["form"].errors
    assert response.context["prediction"] is not None


def test_spectrum_temperature_above_the_engine_cap_is_refused(viewer_client, no_prediction):
    response = viewer_client.get(SPECTRUM, TOO_HIGH | {"fmax_mhz": "1000", "temperature_k": "5001"})
    assert f"less than or equal to {MAX_TEMPERATURE_K:g}" in _errors(response, "temperature_k")


def test_spectrum_needing_more_j_than_the_engine_allows_is_a_form_error(viewer_client):
    # SO2 at the top temperature needs J far past ASYMMETRIC_J_CAP; the engine refuses before solving.
    query = {"species": "SO2", "temperature_k": str(MAX_TEMPERATURE_K), "fmin_mhz": "0", "fmax_mhz": "1000000"}
    response = viewer_client.get(SPECTRUM, query)
    assert response.status_code == 200
    assert f"beyond the engine's limit of J = {ASYMMETRIC_J_CAP}" in " ".join(
        response.context["form"].non_field_errors()
    )


# Species page ---------------------------------------------------------------------------------------


def test_species_page_refuses_too_many_temperatures(viewer_client):
    pk = SpeciesRow.objects.get(name="CO").pk
    many = ", ".join(str(10 * (n + 1)) for n in range(MAX_TEMPERATURES + 1))
    response = viewer_client.get(reverse("catalogue:species", args=[pk]), {"temperatures_k": many})
    assert f"give at most {MAX_TEMPERATURES} temperatures, got {MAX_TEMPERATURES + 1}" in _errors(
        response, "temperatures_k", "page_form"
    )
    assert len(response.context["partition_rows"]) == 4  # the page's default list, not the refused one


def test_species_page_refuses_a_temperature_above_the_cap(viewer_client):
    pk = SpeciesRow.objects.get(name="CO").pk
    response = viewer_client.get(reverse("catalogue:species", args=[pk]), {"temperature_k": "5001"})
    assert f"5001 K is outside 0–{MAX_TEMPERATURE_K:g} K" in _errors(response, "temperature_k", "page_form")
    assert response.context["temperature_k"] == 300.0


# Plan page and saving ------------------------------------------------------------------------------


def _plan_query(fmin: str, fmax: str, unit: str = "GHz", rows=None, **extra) -> dict:
    rows = rows if rows is not None else [SpeciesRow.objects.get(name="CO")]
    return (
        {
            "frequency_unit": unit,
            "fmin": fmin,
            "fmax": fmax,
            "temperature_k": "300",
            "slot_minutes": "60",
            "snr": "5",
            "k_sigma": "3",
            "margin_mhz": "0",
        }
        | {f"amount_{row.pk}": "1" for row in rows}
        | extra
    )


@pytest.mark.parametrize(
    "fmin, fmax, unit",
    [
        ("0", str(MAX_PLAN_SPAN_MHZ / 1000 + 1), "GHz"),
        ("100000", str(100000 + MAX_PLAN_SPAN_MHZ + 1), "MHz"),
        ("2900", str(MAX_FREQUENCY_MHZ / 1000 + 1), "GHz"),
    ],
    ids=["span-ghz", "span-mhz", "above-top-edge"],
)
def test_plan_window_over_the_caps_is_refused_before_predicting(viewer_client, no_prediction, fmin, fmax, unit):
    response = viewer_client.get(PLAN, _plan_query(fmin, fmax, unit))
    assert response.status_code == 400
    assert f"Plan a window of at most {MAX_PLAN_SPAN_MHZ / 1000:g} GHz" in _errors(response, "fmax")


def test_plan_window_at_the_span_cap_passes_the_form(viewer_client, monkeypatch):
    seen = []
    monkeypatch.setattr(
        "planner.planning.views.plan_page.compute_plan", lambda inputs: seen.append(inputs) or _refuse()
    )
    with pytest.raises(AssertionError):
        viewer_client.get(PLAN, _plan_query("100", str(100 + MAX_PLAN_SPAN_MHZ / 1000)))
    assert seen[0]["fmax_mhz"] - seen[0]["fmin_mhz"] == MAX_PLAN_SPAN_MHZ


def test_saving_a_plan_over_the_span_cap_saves_nothing(editor_client, no_prediction):
    data = _plan_query("0", str(MAX_PLAN_SPAN_MHZ / 1000 + 1), plan_name="too wide")
    response = editor_client.post(reverse("planning:save"), data)
    assert response.status_code == 302
    assert not SavedPlan.objects.exists()


def test_plan_needing_too_many_narrow_settings_is_refused(viewer_client, no_prediction):
    # A narrow-band instrument (invented numbers) over a window its setting width cuts into
    # MAX_PLAN_SETTINGS + 1 pieces.
    cavity = Instrument.objects.create(
        name="narrow cavity",
        fmin_mhz=1_000.0,
        fmax_mhz=200_000.0,
        setting_width_mhz=0.5,
        channel_width_mhz=0.001,
        model_kind="relative",
        detection_floor_1s=1e-6,
    )
    fmax_mhz = 10_000 + (MAX_PLAN_SETTINGS + 1) * 0.5
    response = viewer_client.get(PLAN, _plan_query("10000", f"{fmax_mhz:g}", "MHz", instrument=cavity.pk))
    assert response.status_code == 400
    message = (
        f"With settings 0.5 MHz wide this window needs {MAX_PLAN_SETTINGS + 1} of them; at most {MAX_PLAN_SETTINGS} "
        f"are planned at once: choose a window of at most {MAX_PLAN_SETTINGS * 0.5:g} MHz."
    )
    assert message in _errors(response, "fmax")


def test_plan_temperature_above_the_engine_cap_is_refused(viewer_client, no_prediction):
    response = viewer_client.get(PLAN, _plan_query("100", "120", temperature_k="5001"))
    assert response.status_code == 400
    assert f"less than or equal to {MAX_TEMPERATURE_K:g}" in _errors(response, "temperature_k")


def test_plan_refuses_more_species_than_the_cap(viewer_client, use_catalogue, no_prediction):
    entries = [CO2_ENTRY | {"name": f"CO2 copy {n}"} for n in range(MAX_SPECIES + 1)]
    use_catalogue(*entries)
    query = _plan_query("100", "120", rows=list(SpeciesRow.objects.all()))
    response = viewer_client.get(PLAN, query)
    assert response.status_code == 400
    assert f"Plan at most {MAX_SPECIES} species at once." in " ".join(response.context["form"].non_field_errors())


# Fit page ---------------------------------------------------------------------------------------------


def _line(j_up: int, j_lo: int, ka: str = "", kc: str = "") -> str:
    return f"{j_up},{ka},{kc},{j_lo},{ka},{kc},100000.0,0.01,far too high\n"


@pytest.mark.parametrize(
    "species, cap, ka",
    [("CO", FIT_J_CAPS["linear"], ""), ("SO2", FIT_J_CAPS["asymmetric"], "0")],
)
def test_fit_lines_above_the_j_cap_are_refused_before_solving(editor_client, no_fit, species, cap, ka):
    row = SpeciesRow.objects.get(name=species)
    lines = CO_LINES.splitlines()[0] + "\n" + _line(cap + 1, cap, ka, ka) + _line(cap + 2, cap + 1, ka, ka)
    response = editor_client.post(reverse("fitting:fit"), {"species": row.pk, "vary": "B", "lines_text": lines})
    assert response.status_code == 400
    message = f"line 1 has J above {cap}, the most a fit on this page takes for a {row.rotor} rotor (2 such lines)."
    assert message in _errors(response, "lines_text")
    assert not FitRun.objects.exists()


def test_fit_caps_agree_with_the_engine():
    assert FIT_J_CAPS["linear"] == CLOSED_FORM_J_CAP
    assert FIT_J_CAPS["asymmetric"] <= ASYMMETRIC_J_CAP


def test_a_fit_from_the_page_stops_after_the_iteration_cap(editor_client, monkeypatch):
    seen = {}

    def fit(species, lines, vary, **options):
        seen.update(options)
        raise RuntimeError(f"the fit did not converge in {options['max_iterations']} iterations")

    monkeypatch.setattr("planner.fitting.views.fit_constants", fit)
    row = SpeciesRow.objects.get(name="CO")
    response = editor_client.post(reverse("fitting:fit"), {"species": row.pk, "vary": "B", "lines_text": CO_LINES})
    assert response.status_code == 400
    assert seen == {"max_iterations": FIT_MAX_ITERATIONS}
    assert f"Cannot fit: the fit did not converge in {FIT_MAX_ITERATIONS} iterations" in response.content.decode()
    assert not FitRun.objects.exists()
