"""The fitting pages in a real browser: paste or upload assigned lines, read the report, save the fit.

Runs against the live server with the demo catalogue loaded and an editor
logged in through the login form (conftest.py).  Full-page screenshots of the
fit form and the report go to /tmp/linecast-shots/fitting-*.png (or to
LINECAST_SCREENSHOT_DIR, if that is set) for a human to look at.
"""

from __future__ import annotations

import os
import re
from pathlib import Path

import pytest

SPECIES = "CO"

#: Five CO ground-state lines, J = 1-0 … 5-4, from memory (approximate; only a test input).
CO_LINES_CSV = """\
j_up,ka_up,kc_up,j_lo,ka_lo,kc_lo,frequency_mhz,sigma_mhz,note
1,,,0,,,115271.2018,0.0005,from memory
2,,,1,,,230538.0000,0.0005,from memory
3,,,2,,,345795.9899,0.0005,from memory
4,,,3,,,461040.7682,0.0005,from memory
5,,,4,,,576267.9305,0.0005,from memory
"""

#: The same lines with sigma 0 in the third data row (row 4 of the file, counting the header).
BAD_SIGMA_CSV = CO_LINES_CSV.replace("345795.9899,0.0005", "345795.9899,0")

EXPECTED_B_MHZ = 57635.96
B_TOLERANCE_MHZ = 0.05
EXPECTED_R0_ANGSTROM = 1.1309
R0_TOLERANCE_ANGSTROM = 0.0005

#: The laptop size of conftest.py, set again before each screenshot.
SHOT_VIEWPORT = {"width": 1366, "height": 800}
SHOTS_DIR = Path(os.environ.get("LINECAST_SCREENSHOT_DIR") or "/tmp/linecast-shots")


def _shoot(page, name: str) -> Path:
    """A full-page screenshot at laptop size, always kept (these are looked at by a person)."""
    SHOTS_DIR.mkdir(parents=True, exist_ok=True)
    path = SHOTS_DIR / f"fitting-{name}.png"
    page.set_viewport_size(SHOT_VIEWPORT)
    page.screenshot(path=str(path), full_page=True)
    return path


def _open_fit_form(page) -> None:
    page.goto("/fitting/")
    assert page.locator("#fit-button").is_visible()
    page.select_option("#id_species", label=SPECIES)
    page.fill("#id_vary", "B, D")


def _submit_fit(page) -> None:
    with page.expect_navigation():
        page.click("#fit-button")


def _row_value(table, name: str, column: int = 0) -> str:
    """Text of the td number ``column`` in the row of ``table`` whose header cell is ``name``."""
    row = table.locator("tbody tr", has=table.page.locator("th", has_text=re.compile(rf"^{re.escape(name)}$")))
    assert row.count() == 1, f"no single row {name!r} in {table}"
    return row.locator("td").nth(column).inner_text()


def _fitted_b(page) -> float:
    # Column 1 holds the plain value in MHz (column 0 is the value(σ) text).
    return float(_row_value(page.locator("#fitted-constants"), "B", column=1))


def _fit_pasted_lines(page) -> None:
    _open_fit_form(page)
    page.fill("#id_lines_text", CO_LINES_CSV)
    _submit_fit(page)
    assert re.search(r"/fitting/\d+/$", page.url), page.url


def test_pasted_lines_fit_b_and_d_of_co(page):
    _open_fit_form(page)
    page.fill("#id_lines_text", CO_LINES_CSV)
    _shoot(page, "form")
    _submit_fit(page)

    assert re.search(r"/fitting/\d+/$", page.url), page.url
    assert page.locator("h1").inner_text().startswith("Fit ")
    assert SPECIES in page.locator("h1").inner_text()

    constants = page.locator("#fitted-constants")
    names = constants.locator("tbody th").all_inner_texts()
    assert names == ["B", "D"]
    assert _fitted_b(page) == pytest.approx(EXPECTED_B_MHZ, abs=B_TOLERANCE_MHZ)

    # Two constants: a 2×2 correlation table with ones on the diagonal.
    correlation = page.locator("#correlation tbody tr")
    assert correlation.count() == 2
    assert float(correlation.nth(0).locator("td").nth(0).inner_text()) == pytest.approx(1.0)

    r0_text = _row_value(page.locator("#structure"), "r0 from B0 [Å]")
    r0 = float(r0_text.split("±")[0])
    assert r0 == pytest.approx(EXPECTED_R0_ANGSTROM, abs=R0_TOLERANCE_ANGSTROM)

    residuals = page.locator("#residuals tbody tr")
    assert residuals.count() == 5
    assert page.locator("#residuals tbody tr.outlier").count() == 0
    assert "from memory" in residuals.nth(0).inner_text()

    assert page.locator("#save-fit").inner_text() == f"Save as a new version of {SPECIES}"
    _shoot(page, "report")


def test_uploaded_csv_file_gives_the_same_b(page, tmp_path):
    lines_file = tmp_path / "co-lines.csv"
    lines_file.write_text(CO_LINES_CSV, encoding="utf-8")

    _open_fit_form(page)
    page.set_input_files("#id_lines_file", str(lines_file))
    _submit_fit(page)

    assert re.search(r"/fitting/\d+/$", page.url), page.url
    assert _fitted_b(page) == pytest.approx(EXPECTED_B_MHZ, abs=B_TOLERANCE_MHZ)
    assert page.locator("#residuals tbody tr").count() == 5


def test_zero_sigma_is_shown_next_to_the_lines_field_and_nothing_is_fitted(page):
    _open_fit_form(page)
    page.fill("#id_lines_text", BAD_SIGMA_CSV)
    _submit_fit(page)

    assert page.url.rstrip("/").endswith("/fitting"), page.url  # stayed on the form, no redirect
    field = page.locator(".field-lines_text")
    assert "has-error" in (field.get_attribute("class") or "")
    error = field.locator(".errorlist")
    assert error.is_visible()
    assert "row 4, sigma_mhz: must be > 0" in error.inner_text()
    # The pasted text is kept for fixing, and no other field is blamed.
    assert "345795.9899,0,from memory" in page.locator("#id_lines_text").input_value()
    assert page.locator(".field-lines_file .errorlist").count() == 0
    assert page.locator("#fit-runs").count() == 0  # no fit was recorded
    _shoot(page, "form-error")


def test_saving_the_fit_makes_version_2_of_co(page, wait_for_plot):
    _fit_pasted_lines(page)
    fit_number = re.search(r"/fitting/(\d+)/$", page.url).group(1)
    fitted_b = _fitted_b(page)

    with page.expect_navigation():
        page.click("#save-fit")

    assert re.search(r"/catalogue/\d+/$", page.url), page.url
    assert page.locator("h1").inner_text().startswith(SPECIES)
    assert page.locator(".message-success").inner_text() == f"Saved the fitted constants as version 2 of {SPECIES}."
    version = page.locator(".facts div", has=page.locator("dt", has_text=re.compile(r"^Version$")))
    assert version.locator("dd").inner_text().startswith("2,")
    constants = page.locator("#constants-1")
    assert float(_row_value(constants, "B")) == pytest.approx(fitted_b, abs=1e-6)

    latest = page.locator("#recent-changes tbody tr").first
    assert f"fit {fit_number}: 5 lines, varied B, D" in latest.inner_text()
    assert latest.locator("td").nth(3).inner_text() == "2"

    wait_for_plot(page, "#spectrum-plot")
    assert page.locator("#spectrum-plot .main-svg").first.is_visible()
    assert page.locator("#spectrum-plot .scatterlayer .trace").count() >= 1

    # The report now says where the fit went, and offers no second save.
    page.goto(f"/fitting/{fit_number}/")
    assert page.locator("#save-fit").count() == 0
    assert f"Saved as version 2 of {SPECIES}" in page.locator(".page-head").inner_text()
