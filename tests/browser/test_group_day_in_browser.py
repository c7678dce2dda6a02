"""One member's whole session in a real browser, in the order a group uses Linecast before a slot.

Log in through the form, add a species (a mistake first, then fixed), plan a
window that includes it, see both plots drawn, plan again at another
temperature, save the plan, open the operator sheet and print it to PDF, and
download the targets CSV. The other browser modules test each page in depth;
this one checks that the steps hand over to each other.
"""

from __future__ import annotations

import csv
import io
import re
import shutil
import subprocess

#: An invented linear species for the session; B puts J=1-0 at 2B ≈ 20.2 GHz (textbook identity ν = 2B).
NEW_NAME = "Session probe"
NEW_B_MHZ = "10100"
WINDOW_GHZ = ("15", "45")
PLAN_NAME = "Session probe and OCS, K band"


def _save_species_form(page) -> None:
    with page.expect_navigation():
        page.click("form button[type=submit]:has-text('Save')")


def _plan(page, wait_for_plot, temperature: str) -> list[str]:
    page.fill("#id_temperature_k", temperature)
    with page.expect_navigation():
        page.click("#plan-button")
    page.wait_for_selector("#target-table tbody tr")
    wait_for_plot(page, "#plan-plot")
    wait_for_plot(page, "#curve-plot")
    rows = page.locator("#target-table tbody tr")
    return [rows.nth(i).inner_text() for i in range(rows.count())]


def test_a_member_adds_a_species_plans_saves_prints_and_exports(
    anonymous_page, demo_catalogue, editor, wait_for_plot, screenshot, tmp_path
):
    page = anonymous_page
    page.goto("/catalogue/new/")
    page.fill("#id_username", editor.username)
    page.fill("#id_password", editor.test_password)
    with page.expect_navigation():
        page.click("form.stacked button[type=submit]")
    assert page.url.endswith("/catalogue/new/"), page.url

    # A species with a mistake: B negative. The error stands next to the constants; nothing is saved.
    page.fill("#id_name", NEW_NAME)
    page.fill("#id_formula", "CS")
    page.select_option("#id_rotor", "linear")
    page.fill("#id_dipole_a_debye", "1.5")
    page.fill("#id_states-0-label", "v=0")
    page.fill("#id_states-0-energy_cm1", "0")
    page.fill("#id_states-0-constants", f"B -{NEW_B_MHZ} 0")
    _save_species_form(page)
    assert page.url.endswith("/catalogue/new/")
    error = page.locator(".state-form").first.locator(".field-constants .errorlist")
    assert re.search(r"\bB\b.*must be > 0 MHz", error.inner_text()), error.inner_text()
    page.fill("#id_states-0-constants", f"B {NEW_B_MHZ} 0.05")
    _save_species_form(page)
    assert re.search(r"/catalogue/\d+/$", page.url), page.url

    # Plan a window holding its J=1-0 line, with OCS beside it.
    page.goto("/planning/")
    page.select_option("#id_frequency_unit", "GHz")
    page.fill("#id_fmin", WINDOW_GHZ[0])
    page.fill("#id_fmax", WINDOW_GHZ[1])
    page.fill("#id_slot_minutes", "30")
    page.locator(f'#plan-form input[aria-label="amount of {NEW_NAME}"]').fill("1")
    page.locator('#plan-form input[aria-label="amount of OCS"]').fill("1")
    warm = _plan(page, wait_for_plot, "300")
    assert any(NEW_NAME in row for row in warm), warm
    assert page.locator("#plan-plot .main-svg").count() >= 1
    screenshot(page, "session-plan-300K")

    # Colder: the title says so and the ranking changes.
    cold = _plan(page, wait_for_plot, "20")
    assert "20 K" in page.locator("#plan-title").inner_text()
    assert cold != warm
    screenshot(page, "session-plan-20K")

    # Save it, open the operator sheet, print it.
    page.fill("#save-form input[name=plan_name]", PLAN_NAME)
    with page.expect_navigation():
        page.click("#save-button")
    assert re.search(r"/planning/saved/\d+/$", page.url), page.url
    with page.expect_navigation():
        page.get_by_role("link", name="Operator sheet").click()
    assert page.locator(".operator-sheet h1").inner_text() == PLAN_NAME
    pdf = tmp_path / "operator-sheet.pdf"
    page.pdf(path=str(pdf), format="A4", print_background=True)
    assert pdf.read_bytes().startswith(b"%PDF")
    if shutil.which("pdftotext"):
        words = " ".join(subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True).stdout.split())
        assert PLAN_NAME in words and NEW_NAME in words

    # Back on the saved plan, the targets CSV carries the new species with its units in the header.
    page.go_back()
    with page.expect_download() as waiting:
        page.get_by_role("link", name="Targets CSV", exact=True).click()
    path = tmp_path / waiting.value.suggested_filename
    waiting.value.save_as(path)
    rows = list(csv.reader(io.StringIO(path.read_text(encoding="utf-8"))))
    assert "frequency_mhz" in rows[0]
    species_column = rows[0].index("species")
    assert NEW_NAME in {row[species_column] for row in rows[1:]}
    assert len(rows) - 1 == len(cold)
