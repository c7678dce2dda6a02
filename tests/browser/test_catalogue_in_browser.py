"""The catalogue pages in a real browser: login, list and filters, create and fix, species page, history, print.

Runs against the live server with the demo catalogue loaded and an editor
logged in through the login form (conftest.py).  With LINECAST_SCREENSHOT_DIR
set, full-page screenshots of each page are kept there.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
from pathlib import Path

import pytest

#: An asymmetric top with b-type lines and spin statistics: the species page shows the most on it.
ASYMMETRIC = "SO2"

#: A made-up linear species for the create form.  B and μ are rough values from
#: memory for silicon monosulfide (B about 9077 MHz, μ about 1.7 D); the test only
#: needs a valid linear molecule, not exact constants.
NEW_NAME = "SiS-test"
NEW_FORMULA = "SiS"
NEW_B_MHZ = "9077.0"
NEW_DIPOLE_DEBYE = "1.73"


def _species_link(page, name: str):
    return page.locator("#catalogue-table td.name a", has_text=re.compile(rf"^{re.escape(name)}$"))


def _open_species(page, name: str) -> None:
    page.goto("/catalogue/")
    with page.expect_navigation():
        _species_link(page, name).click()
    assert re.search(r"/catalogue/\d+/$", page.url), page.url


def _constant_cell(page, name: str, column: int = 1) -> str:
    """Text of the ground state's constants table row ``name``: column 1 is the value in MHz."""
    row = page.locator("#constants-1 tbody tr", has=page.locator("th", has_text=re.compile(rf"^{name}$")))
    return row.locator("td").nth(column - 1).inner_text()


def _save(page) -> None:
    with page.expect_navigation():
        page.click("#save-button")


# --- login --------------------------------------------------------------------------------


def test_logging_in_through_the_form_lands_on_the_catalogue(anonymous_page, demo_catalogue, editor, screenshot):
    page = anonymous_page
    username, password = editor.username, editor.test_password
    page.goto("/")
    assert page.url.endswith("/accounts/login/?next=/catalogue/")
    assert page.locator(".site-nav").count() == 0  # no navigation before logging in
    screenshot(page, "login")

    page.fill("#id_username", username)
    page.fill("#id_password", "not the password")
    with page.expect_navigation():
        page.click("form.stacked button[type=submit]")
    assert "/accounts/login/" in page.url
    assert page.locator(".form-errors[role=alert]").is_visible()
    screenshot(page, "login-wrong-password")

    page.fill("#id_username", username)
    page.fill("#id_password", password)
    with page.expect_navigation():
        page.click("form.stacked button[type=submit]")
    assert page.url.endswith("/catalogue/")
    assert page.locator(".account .who").inner_text() == f"{username} · editor"
    assert page.locator(".site-nav a[aria-current=page]").inner_text() == "Catalogue"

    # Logging out is a POST form in the header; afterwards the pages need a login again.
    with page.expect_navigation():
        page.click(".account button[type=submit]")
    assert "/accounts/login/" in page.url
    page.goto("/catalogue/")
    assert "/accounts/login/?next=/catalogue/" in page.url


# --- list ---------------------------------------------------------------------------------


def test_list_shows_the_demo_and_filtering_by_rotor_narrows_it(page, demo_catalogue, screenshot):
    total = len(demo_catalogue)
    assert total == 23
    page.goto("/catalogue/")
    assert page.locator("#catalogue-table tbody tr").count() == total
    assert page.locator("#species-count").inner_text() == f"{total} of {total} species"
    screenshot(page, "catalogue-list")

    asymmetric = sorted(s.name for s in demo_catalogue if s.rotor == "asymmetric")
    option = page.locator("#catalogue-filter select[name=rotor] option[value=asymmetric]")
    assert option.inner_text() == f"asymmetric ({len(asymmetric)})"
    page.select_option("#catalogue-filter select[name=rotor]", "asymmetric")
    with page.expect_navigation():
        page.click("#catalogue-filter button[type=submit]")
    assert "rotor=asymmetric" in page.url
    assert page.locator("#species-count").inner_text() == f"{len(asymmetric)} of {total} species"
    names = page.locator("#catalogue-table td.name").all_inner_texts()
    assert sorted(names) == asymmetric
    # The choice stays in the form after the page reloads.
    assert page.locator("#catalogue-filter select[name=rotor]").input_value() == "asymmetric"

    # A search narrows further; nothing matching says so instead of showing an empty table.
    page.fill("#catalogue-filter input[name=q]", "no such molecule")
    with page.expect_navigation():
        page.click("#catalogue-filter button[type=submit]")
    assert page.locator("#catalogue-table").count() == 0
    assert page.locator("#species-count").inner_text() == f"0 of {total} species"


# --- create -------------------------------------------------------------------------------


def test_creating_a_species_shows_errors_next_to_the_fields_then_saves(page, screenshot):
    page.goto("/catalogue/")
    with page.expect_navigation():
        page.get_by_role("link", name="New species").click()
    assert page.url.endswith("/catalogue/new/")

    page.fill("#id_name", NEW_NAME)
    page.fill("#id_formula", NEW_FORMULA)
    page.select_option("#id_rotor", "linear")
    # The dipoles stay at their initial 0 and B is negative: two mistakes at once.
    page.fill("#id_states-0-label", "v=0")
    page.fill("#id_states-0-energy_cm1", "0")
    page.fill("#id_states-0-constants", "B -5 0")
    _save(page)

    assert page.url.endswith("/catalogue/new/")  # nothing saved, same form
    assert page.locator(".notice-error[role=alert]").inner_text().startswith("Please correct the fields")
    dipole_error = page.locator(".field-dipole_a_debye .errorlist")
    assert "All three dipole components are zero" in dipole_error.inner_text()
    # What was typed is still there.
    assert page.locator("#id_name").input_value() == NEW_NAME
    assert page.locator("#id_states-0-constants").input_value() == "B -5 0"
    screenshot(page, "edit-form-errors")

    # Give the dipole: now the engine's rule on B is the one left, next to the constants box.
    page.fill("#id_dipole_a_debye", NEW_DIPOLE_DEBYE)
    _save(page)
    constants_error = page.locator(".state-form").first.locator(".field-constants .errorlist")
    assert constants_error.is_visible()
    assert re.search(r"\bB\b.*must be > 0 MHz", constants_error.inner_text()), constants_error.inner_text()
    assert page.locator(".field-dipole_a_debye .errorlist").count() == 0
    screenshot(page, "edit-form-constant-error")

    page.fill("#id_states-0-constants", f"B {NEW_B_MHZ} 0.01")
    _save(page)
    assert re.search(r"/catalogue/\d+/$", page.url), page.url
    assert page.locator("h1").inner_text().startswith(NEW_NAME)
    assert page.locator(".message-success").inner_text() == f"Created {NEW_NAME} (version 1)."
    assert _constant_cell(page, "B") == "9077"
    # It is in the list now.
    page.goto("/catalogue/")
    assert _species_link(page, NEW_NAME).count() == 1
    assert page.locator("#species-count").inner_text() == "24 of 24 species"


# --- species page -------------------------------------------------------------------------


def test_species_page_draws_the_level_diagram_and_the_stick_spectrum(page, wait_for_plot, screenshot):
    _open_species(page, ASYMMETRIC)
    wait_for_plot(page, "#levels-plot")
    wait_for_plot(page, "#spectrum-plot")
    assert page.locator("#levels-plot .scatterlayer .trace").count() >= 1
    assert page.locator("#spectrum-plot .scatterlayer .trace").count() >= 2  # sticks and their markers
    # SO2's spin-0 oxygens remove half of the levels: they are drawn apart, with a legend.
    assert page.locator("#levels-plot .legend").count() == 1

    names = page.locator("#constants-1 tbody th").all_inner_texts()
    assert names[:3] == ["A", "B", "C"]
    assert _constant_cell(page, "B") == "10318.07"
    assert page.locator("#partition-table tbody tr").count() == 4  # the default 10, 75, 150, 300 K
    assert page.locator(".hazards").is_visible()
    screenshot(page, "species-SO2")
    screenshot(page, "species-SO2-print", print_media=True)


def test_changing_the_spectrum_temperature_draws_the_spectrum_again(page, wait_for_plot):
    _open_species(page, ASYMMETRIC)
    wait_for_plot(page, "#spectrum-plot")
    assert page.locator("#spectrum-title").inner_text().startswith("Stick spectrum at 300 K")
    strongest_at_300 = page.evaluate("JSON.parse(document.getElementById('plot-data').textContent)")
    page.evaluate("document.getElementById('spectrum-plot').dataset.drawnBefore = 'yes'")

    page.fill("#id_temperature_k", "20")
    page.fill("#id_temperatures_k", "5, 20")
    with page.expect_navigation():
        page.click("#predict-button")
    wait_for_plot(page, "#spectrum-plot")
    assert "temperature_k=20" in page.url
    assert page.locator("#spectrum-title").inner_text().startswith("Stick spectrum at 20 K")
    assert page.locator("#spectrum-plot").get_attribute("data-drawn-before") is None  # a new page, a new plot
    assert page.locator("#partition-table tbody td:first-child").all_inner_texts() == ["5", "20"]
    at_20 = page.evaluate("JSON.parse(document.getElementById('plot-data').textContent)")
    assert at_20 != strongest_at_300
    # The Spectrum page link carries the temperature along.
    href = page.get_by_role("link", name="Spectrum page").get_attribute("href")
    assert "temperature_k=20" in href


def test_a_bad_spectrum_temperature_is_refused(page):
    _open_species(page, ASYMMETRIC)
    # The form is sent as typed (novalidate): the server's message, next to the field, for every bad value.
    page.fill("#id_temperature_k", "-3")
    with page.expect_navigation():
        page.click("#predict-button")
    assert "-3 K is outside 0–5000 K" in page.locator(".field-temperature_k .errorlist").inner_text()

    # Above the engine's limit the server says why, next to the field, and keeps the other parts of the page.
    page.fill("#id_temperature_k", "6000")
    with page.expect_navigation():
        page.click("#predict-button")
    error = page.locator(".field-temperature_k .errorlist")
    assert error.inner_text() == "6000 K is outside 0–5000 K."
    assert page.locator("#partition-table tbody tr").count() == 4
    assert page.locator("#spectrum-title").inner_text().startswith("Stick spectrum at 300 K")


# --- edit and restore ---------------------------------------------------------------------


def test_editing_a_constant_then_restoring_the_earlier_version(page, screenshot):
    _open_species(page, ASYMMETRIC)
    species_url = page.url
    assert _constant_cell(page, "B") == "10318.07"
    with page.expect_navigation():
        page.get_by_role("link", name="Edit", exact=True).click()
    box = page.locator("#id_states-0-constants")
    text = box.input_value()
    assert re.search(r"^B 10318\.07 0\.005$", text, re.M), text
    box.fill(re.sub(r"^B 10318\.07 ", "B 10318.5 ", text, flags=re.M))
    _save(page)

    assert page.url == species_url
    assert page.locator(".message-success").inner_text() == f"Saved {ASYMMETRIC} (version 2)."
    assert _constant_cell(page, "B") == "10318.5"

    with page.expect_navigation():
        page.get_by_role("link", name="History", exact=True).click()
    revisions = page.locator(".revisions > li")
    assert revisions.count() == 2
    assert "version 2" in revisions.nth(0).locator(".revision-head").inner_text()
    assert "10318.5" in revisions.nth(0).inner_text()
    screenshot(page, "history-SO2")

    restore = page.locator(".restore-link")
    assert restore.count() == 1  # only the older version can be restored
    with page.expect_navigation():
        restore.click()
    assert page.locator("table.changes").inner_text().count("10318") >= 2  # before and after
    screenshot(page, "restore-confirm-SO2")
    with page.expect_navigation():
        page.click("#confirm-restore")

    assert page.url == species_url
    assert page.locator(".message-success").inner_text().startswith(f"Restored {ASYMMETRIC} as it was on ")
    assert "(now version 3)" in page.locator(".message-success").inner_text()
    assert _constant_cell(page, "B") == "10318.07"
    assert page.locator("#recent-changes tbody tr").count() == 3


# --- print --------------------------------------------------------------------------------


def _pdf_text(path: Path) -> str | None:
    tool = shutil.which("pdftotext")
    if tool is None:
        return None
    return subprocess.run([tool, "-layout", str(path), "-"], check=True, capture_output=True, text=True).stdout


def test_species_page_prints_with_its_constants(page, wait_for_plot, tmp_path, screenshot):
    _open_species(page, "H2CO")
    wait_for_plot(page, "#levels-plot")
    wait_for_plot(page, "#spectrum-plot")

    page.emulate_media(media="print")
    assert page.locator(".site-header").is_hidden()
    assert page.locator("#species-page-form").is_hidden()
    assert page.locator(".page-actions").is_hidden()
    assert page.locator(".printed").is_visible()
    assert page.locator("#constants-1").is_visible()
    assert page.locator("#spectrum-plot .main-svg").first.is_visible()
    page.emulate_media(media="null")
    screenshot(page, "species-H2CO-print", print_media=True)

    folder = Path(os.environ.get("LINECAST_SCREENSHOT_DIR") or tmp_path)
    folder.mkdir(parents=True, exist_ok=True)
    pdf = folder / "species-H2CO.pdf"
    page.pdf(path=str(pdf), prefer_css_page_size=True, print_background=True)
    content = pdf.read_bytes()
    assert content.startswith(b"%PDF")
    assert len(content) > 20_000  # text, tables and two plots, not an empty sheet

    text = _pdf_text(pdf)
    if text is None:
        pytest.skip("pdftotext (Debian's poppler-utils) is not installed: the PDF's text was not checked")
    words = " ".join(text.split())
    assert "Linecast species sheet" in words
    assert "Handling and hazards" in words
    for name, value in (("A", "281970.56"), ("B", "38836.0456"), ("C", "34002.2034"), ("DeltaJ", "0.075313")):
        assert re.search(rf"\b{name}\b {re.escape(value)}\b", words), f"{name} {value} not in the printed text"
    assert "Partition function" in words
    assert "Log out" not in words and "Update" not in words  # the screen controls stay off the paper
