"""The planning pages in a real browser: plan a slot, re-plan, save, operator sheet on paper, downloads, instruments.

Runs against the live server with the demo catalogue loaded and an editor
logged in through the login form (conftest.py).  The demo instrument profiles
are not part of that set-up; the tests that need them load them into the test
database.  With LINECAST_SCREENSHOT_DIR set, full-page screenshots of each page
(and the operator sheet's PDFs with their pages as PNGs) are kept there.
"""

from __future__ import annotations

import csv
import io
import os
import re
import shutil
import subprocess
from pathlib import Path

import pytest

PLAN = "/planning/"
INSTRUMENTS = "/planning/instruments/"
W_BAND_CELL = "Orrin Hollow W-band cell"

#: The window of the tests: OCS and SO2 both have lines in 85-110 GHz.
WINDOW_GHZ = ("85", "110")
AMOUNTS = {"OCS": "1", "SO2": "0.5"}
PLAN_NAME = "W-band OCS and SO2 check, bench 2"

#: Shown on the operator sheet, on screen and on paper.
SAFETY_CAUTION = "Follow your facility's safety rules"
TARGETS_CSV_HEAD = ["rank", "species", "state", "frequency_mhz"]


# --- helpers ------------------------------------------------------------------------------


def _amount(page, name: str):
    return page.locator(f'#plan-form input[aria-label="amount of {name}"]')


def _fill_plan(
    page,
    *,
    window=WINDOW_GHZ,
    unit="GHz",
    temperature="300",
    slot_minutes="30",
    amounts=None,
    instrument=None,
) -> None:
    if instrument is not None:
        page.select_option("#id_instrument", label=instrument)
    page.select_option("#id_frequency_unit", unit)
    page.fill("#id_fmin", window[0])
    page.fill("#id_fmax", window[1])
    page.fill("#id_temperature_k", temperature)
    page.fill("#id_slot_minutes", slot_minutes)
    for name, amount in (AMOUNTS if amounts is None else amounts).items():
        _amount(page, name).fill(amount)


def _submit_plan(page) -> None:
    with page.expect_navigation():
        page.click("#plan-button")


def _plan(page, wait_for_plot, **fields) -> None:
    """Fill in the plan form on the plan page, submit it and wait for both plots."""
    page.goto(PLAN)
    _fill_plan(page, **fields)
    _submit_plan(page)
    page.wait_for_selector("#target-table tbody tr")
    wait_for_plot(page, "#plan-plot")
    wait_for_plot(page, "#curve-plot")


def _targets(page) -> list[tuple[int, str, str, str]]:
    """(rank, species, upper <- lower, frequency) of each row of the ranked target table."""
    rows = page.locator("#target-table tbody tr")
    found = []
    for index in range(rows.count()):
        cells = rows.nth(index).locator("td")
        found.append(
            (
                int(cells.nth(0).inner_text()),
                cells.nth(1).inner_text(),
                cells.nth(4).inner_text(),  # cell 2 is the isotopic fraction, 3 the state
                cells.nth(5).inner_text(),
            )
        )
    return found


def _save_plan(page, name: str = PLAN_NAME) -> int:
    """Save the plan shown through the save form; the new plan's primary key."""
    page.fill("#save-form input[name=plan_name]", name)
    with page.expect_navigation():
        page.click("#save-button")
    match = re.search(r"/planning/saved/(\d+)/$", page.url)
    assert match, page.url
    return int(match.group(1))


def _download_csv(page, link: str, tmp_path: Path) -> tuple[str, list[list[str]]]:
    """Click a download link of the saved plan page: (suggested file name, CSV rows)."""
    with page.expect_download() as waiting:
        page.get_by_role("link", name=link, exact=True).click()
    download = waiting.value
    path = tmp_path / download.suggested_filename
    download.save_as(path)
    return download.suggested_filename, list(csv.reader(io.StringIO(path.read_text(encoding="utf-8"))))


def _shots_folder(tmp_path: Path) -> Path:
    folder = Path(os.environ.get("LINECAST_SCREENSHOT_DIR") or tmp_path)
    folder.mkdir(parents=True, exist_ok=True)
    return folder


def _poppler(tool: str, *args: str) -> str:
    path = shutil.which(tool)
    if path is None:
        pytest.skip(f"{tool} (Debian's poppler-utils) is not installed: the PDF was not checked")
    return subprocess.run([path, *args], check=True, capture_output=True, text=True).stdout


@pytest.fixture
def demo_instruments(transactional_db):
    from planner.planning.demo import load_demo_instruments

    return load_demo_instruments()


@pytest.fixture
def saved_plan(page, wait_for_plot) -> int:
    """A plan of the test window, saved through the plan page's save form; its primary key."""
    _plan(page, wait_for_plot)
    return _save_plan(page)


# --- the plan page ------------------------------------------------------------------------


def test_the_plan_page_needs_a_login(anonymous_page):
    anonymous_page.goto(PLAN)
    assert "/accounts/login/?next=/planning/" in anonymous_page.url
    assert anonymous_page.locator("#plan-form").count() == 0


def test_the_plan_form_has_an_amount_per_species(page, demo_catalogue, screenshot):
    page.goto(PLAN)
    assert page.locator(".site-nav a[aria-current=page]").inner_text() == "Plan a slot"
    from planner.catalogue.models import Species as SpeciesRow

    for pk, name in SpeciesRow.objects.values_list("pk", "name"):
        field = page.locator(f"#plan-form input[name=amount_{pk}]")
        assert field.get_attribute("aria-label") == f"amount of {name}"
    assert page.locator("#plan-plot").count() == 0
    assert page.locator("#save-form").count() == 0
    _fill_plan(page)
    screenshot(page, "planning-form")


def test_planning_a_window_draws_both_plots_and_ranks_the_targets(page, wait_for_plot, screenshot):
    _plan(page, wait_for_plot)

    assert page.locator("#plan-plot .main-svg").count() >= 1
    assert page.locator("#curve-plot .main-svg").count() >= 1
    assert page.locator("#plan-plot .scatterlayer .trace").count() >= 2  # sticks and their markers
    assert page.locator("#plan-plot .shapelayer path").count() >= 1  # the shaded segments

    targets = _targets(page)
    assert targets, "no target in the table"
    assert targets[0][0] == 1
    assert [t[0] for t in targets] == sorted(t[0] for t in targets)
    assert {t[1] for t in targets} <= set(AMOUNTS)
    for _, _, _, frequency in targets:
        assert 85_000 <= float(frequency.replace(",", "").replace("\u202f", "").replace(" ", "")) <= 110_000

    assert page.locator("#segment-table tbody tr").count() >= 1
    assert page.locator("#segment-table tbody tr td").first.inner_text() == "1"
    assert "300 K" in page.locator("#plan-title").inner_text()
    # The form keeps what was asked, for the next try.
    assert page.input_value("#id_temperature_k") == "300"
    assert _amount(page, "SO2").input_value() == "0.5"

    page.uncheck("#log-scale")
    page.wait_for_function("document.querySelector('#plan-plot').layout.yaxis.type === 'linear'")
    page.check("#log-scale")
    page.wait_for_function("document.querySelector('#plan-plot').layout.yaxis.type === 'log'")
    screenshot(page, "planning-result")
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")  # as the browser does before printing
    page.wait_for_function("document.querySelector('#plan-plot').layout.width === 1000")
    screenshot(page, "planning-result-print", print_media=True)
    page.evaluate("window.dispatchEvent(new Event('afterprint'))")


def test_the_temperature_curves_of_an_ocs_plan_are_drawn(page, wait_for_plot):
    _plan(page, wait_for_plot, amounts={"OCS": "1"})
    assert page.locator("#curve-plot .scatterlayer .trace").count() >= 1
    labels = page.locator("#curve-plot .legend .legendtext").all_text_contents()
    assert labels and all(label.startswith("#") for label in labels)


def test_an_empty_temperature_curve_plot_says_why(page, wait_for_plot):
    _plan(page, wait_for_plot)
    drawn = page.locator("#curve-plot .scatterlayer .trace").count()
    message = page.evaluate("JSON.parse(document.getElementById('plan-data').textContent).curve.message")
    assert drawn >= 1 or (message and message[:40] in page.locator(".plan-result").inner_text())


def test_the_printed_plan_keeps_the_frequency_plot_whole(page, wait_for_plot):
    _plan(page, wait_for_plot, amounts={"OCS": "1"})
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
    page.wait_for_function("document.querySelector('#plan-plot').layout.width === 1000")
    page.emulate_media(media="print")
    assert page.locator("#plan-form").is_hidden()
    assert page.locator("#save-form").is_hidden()
    assert page.evaluate("document.querySelector('#plan-plot .main-svg').getAttribute('height')") == "300"
    page.evaluate("window.dispatchEvent(new Event('afterprint'))")


def test_the_printed_plan_keeps_the_temperature_axis(page, wait_for_plot):
    _plan(page, wait_for_plot, amounts={"OCS": "1"})
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
    page.wait_for_function("document.querySelector('#plan-plot').layout.width === 1000")
    page.emulate_media(media="print")
    box, svg = page.evaluate(
        "[document.querySelector('#curve-plot').clientHeight,"
        " Number(document.querySelector('#curve-plot .main-svg').getAttribute('height'))]"
    )
    assert svg <= box


def test_a_colder_plan_picks_other_targets(page, wait_for_plot):
    _plan(page, wait_for_plot, temperature="300")
    warm = _targets(page)

    page.fill("#id_temperature_k", "50")
    _submit_plan(page)
    page.wait_for_selector("#target-table tbody tr")
    wait_for_plot(page, "#plan-plot")
    cold = _targets(page)

    assert "50 K" in page.locator("#plan-title").inner_text()
    assert cold[0][0] == 1
    assert cold != warm
    assert page.input_value("#id_temperature_k") == "50"


def test_planning_without_an_amount_says_so(page):
    page.goto(PLAN)
    _fill_plan(page, amounts={})
    _submit_plan(page)
    assert "at least one species" in page.locator("#plan-form .form-errors").inner_text()
    assert page.locator("#plan-plot").count() == 0


# --- saving, the saved plan, the operator sheet, the downloads ------------------------------


def test_saving_a_plan_opens_the_saved_plan(page, wait_for_plot, screenshot):
    _plan(page, wait_for_plot)
    planned = _targets(page)
    pk = _save_plan(page)

    assert page.locator("h1").inner_text() == PLAN_NAME
    assert PLAN_NAME in page.locator(".messages").inner_text()
    for label in ("Operator sheet", "Targets CSV", "Segments CSV", "Plan JSON"):
        assert page.get_by_role("link", name=label, exact=True).count() == 1, label
    assert page.get_by_role("link", name="Operator sheet").get_attribute("href") == (
        f"/planning/saved/{pk}/operator-sheet/"
    )
    wait_for_plot(page, "#plan-plot")
    wait_for_plot(page, "#curve-plot")
    assert _targets(page) == planned
    assert page.locator("#catalogue-changed").count() == 0
    screenshot(page, "planning-saved")

    page.goto("/planning/saved/")
    assert page.locator("#saved-table tbody tr").count() == 1
    assert page.locator("#saved-table tbody tr td").first.inner_text() == PLAN_NAME


def test_the_operator_sheet_prints_on_a4_and_letter(page, saved_plan, tmp_path, screenshot):
    page.goto(f"/planning/saved/{saved_plan}/")
    with page.expect_navigation():
        page.get_by_role("link", name="Operator sheet").click()
    assert page.url.endswith(f"/planning/saved/{saved_plan}/operator-sheet/")
    assert page.locator(".operator-sheet h1").inner_text() == PLAN_NAME
    rows = page.locator("#sheet-segments tbody tr")
    segment_count = rows.count()
    assert segment_count >= 1
    numbers = [rows.nth(i).locator("td").nth(1).inner_text() for i in range(segment_count)]
    assert numbers == [str(n) for n in range(1, segment_count + 1)]
    assert rows.locator(".box").count() == segment_count
    assert rows.first.locator(".box").inner_text() == "☐"
    assert SAFETY_CAUTION in page.locator(".safety").inner_text()
    for name in AMOUNTS:
        assert f"{name}:" in page.locator(".safety").inner_text()

    # The print button asks the browser to print (headless Chromium would not show a dialog).
    page.evaluate("() => { window.__printed = 0; window.print = () => { window.__printed += 1; }; }")
    page.click("#print-button")
    assert page.evaluate("window.__printed") == 1
    screenshot(page, "planning-operator-sheet")

    page.emulate_media(media="print")
    assert page.locator("#print-button").is_hidden()
    assert page.locator(".site-header").is_hidden()
    assert page.locator("#sheet-segments").is_visible()
    page.emulate_media(media="null")
    screenshot(page, "planning-operator-sheet-print", print_media=True)

    folder = _shots_folder(tmp_path)
    for paper, size in (("A4", "595.92 x 842.88"), ("Letter", "612 x 792")):
        pdf = folder / f"planning-operator-sheet-{paper}.pdf"
        page.pdf(path=str(pdf), format=paper, print_background=True)
        assert pdf.read_bytes().startswith(b"%PDF")
        info = _poppler("pdfinfo", str(pdf))
        assert re.search(rf"Page size:\s+{re.escape(size)} pts", info), info  # portrait
        words = " ".join(_poppler("pdftotext", "-layout", str(pdf), "-").split())
        assert PLAN_NAME in words
        assert SAFETY_CAUTION in words
        assert "Segments, in this order" in words
        for number in numbers:
            assert re.search(rf"☐ {number} \d", words), f"segment {number} not on the {paper} sheet"
        assert "Log out" not in words and "Print" not in words.split()  # screen controls stay off
        _poppler("pdftoppm", "-r", "60", "-png", str(pdf), str(folder / f"planning-operator-sheet-{paper}"))

    # The sheet's own @page rule asks for portrait, over the site print sheet's A4 landscape.
    pdf = folder / "planning-operator-sheet-css-size.pdf"
    page.pdf(path=str(pdf), prefer_css_page_size=True)
    width, height = map(
        float, re.search(r"Page size:\s+([\d.]+) x ([\d.]+) pts", _poppler("pdfinfo", str(pdf))).groups()
    )
    assert width < height


def test_the_targets_and_segments_csv_download_with_their_headers(page, saved_plan, tmp_path):
    page.goto(f"/planning/saved/{saved_plan}/")
    rows_on_page = page.locator("#target-table tbody tr").count()
    segments_on_page = page.locator("#segment-table tbody tr").count()

    name, rows = _download_csv(page, "Targets CSV", tmp_path)
    assert name == f"linecast-plan-{saved_plan}-targets.csv"
    assert rows[0][:4] == TARGETS_CSV_HEAD
    assert len(rows) - 1 == rows_on_page
    assert rows[1][0] == "1"
    assert {row[1] for row in rows[1:]} <= set(AMOUNTS)

    name, rows = _download_csv(page, "Segments CSV", tmp_path)
    assert name == f"linecast-plan-{saved_plan}-segments.csv"
    assert rows[0][:3] == ["number", "start_mhz", "stop_mhz"]
    assert len(rows) - 1 == segments_on_page


def test_the_csv_gives_the_reason_for_each_left_out_line(page, saved_plan, tmp_path):
    page.goto(f"/planning/saved/{saved_plan}/")
    left_out = page.locator("#left-out-table tbody tr").count()
    assert left_out >= 1
    _, rows = _download_csv(page, "Targets CSV", tmp_path)
    assert any("reason" in column for column in rows[0])


def test_a_viewer_plans_but_cannot_save(anonymous_page, demo_catalogue, django_user_model, wait_for_plot):
    from planner.catalogue.roles import give_role

    from .conftest import log_in_through_the_form

    viewer = django_user_model.objects.create_user("grace", password="viewer-only-password-1")
    give_role(viewer, "viewer")
    log_in_through_the_form(anonymous_page, "grace", "viewer-only-password-1", next_path=PLAN)
    _plan(anonymous_page, wait_for_plot)
    assert anonymous_page.locator("#target-table tbody tr").count() >= 1
    assert anonymous_page.locator("#save-form").count() == 0


def test_saving_after_the_catalogue_grew_keeps_the_planned_species(page, demo_catalogue, wait_for_plot):
    import dataclasses

    from planner.catalogue.store import Stamp, import_species

    _plan(page, wait_for_plot, amounts={"OCS": "1"})
    carbon_monoxide = next(s for s in demo_catalogue if s.name == "CO")
    import_species([dataclasses.replace(carbon_monoxide, name="AlO-test")], Stamp(None, "test"))  # sorts first
    _save_plan(page)
    assert {t[1] for t in _targets(page)} == {"OCS"}


# --- instrument profiles ------------------------------------------------------------------


def test_the_instrument_list_shows_the_demo_profiles(page, demo_instruments, screenshot):
    page.goto(INSTRUMENTS)
    names = page.locator("#instrument-table tbody tr td:first-child").all_inner_texts()
    assert W_BAND_CELL in names
    assert len(names) == len(demo_instruments)
    screenshot(page, "planning-instruments")


def test_the_instrument_list_fits_a_laptop_screen(page, demo_instruments):
    page.goto(INSTRUMENTS)
    wrap = page.locator(".table-wrap").first
    assert wrap.evaluate("e => e.scrollWidth <= e.clientWidth")
    assert page.get_by_role("link", name="Edit").first.is_visible()
    box = page.get_by_role("link", name="Edit").first.bounding_box()
    assert box["x"] + box["width"] <= page.viewport_size["width"]


@pytest.mark.parametrize("window", [("100", "120"), ("60", "100")], ids=["above", "below"])
def test_a_window_outside_the_instrument_is_refused_next_to_the_to_field(page, demo_instruments, window):
    page.goto(PLAN)
    _fill_plan(page, instrument=W_BAND_CELL, window=window, amounts={"OCS": "0.01"})
    _submit_plan(page)
    error = page.locator(".field-fmax .errorlist")
    assert error.is_visible()
    assert "75000–110000 MHz" in error.inner_text()
    assert page.locator(".field-fmin .errorlist").count() == 0
    assert page.locator("#plan-plot").count() == 0
    assert page.locator("#save-form").count() == 0
    # The choice survives, so a narrower window is one edit away.
    assert page.locator("#id_instrument option:checked").inner_text() == W_BAND_CELL


def test_a_plan_with_the_absorption_cell_uses_its_model(page, demo_instruments, wait_for_plot):
    _plan(page, wait_for_plot, instrument=W_BAND_CELL, amounts={"OCS": "0.01", "SO2": "0.005"})
    facts = page.locator(".plan-result .facts").inner_text()
    assert W_BAND_CELL in facts
    assert "absorption-cell" in facts
    assert _targets(page)[0][0] == 1


def test_a_mole_fraction_above_one_is_refused_for_the_cell(page, demo_instruments):
    page.goto(PLAN)
    _fill_plan(page, instrument=W_BAND_CELL, amounts={"OCS": "2"})
    _submit_plan(page)
    assert "OCS: a mole fraction is at most 1" in page.locator("#plan-form .form-errors").inner_text()
    assert page.locator("#plan-plot").count() == 0
