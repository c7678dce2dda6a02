"""The spectrum page in a real browser: submit the form, see the plot and the table.

Drives Debian's Chromium through playwright against pytest-django's live
server, logged in as an editor through the login form (conftest.py).  Set
LINECAST_SCREENSHOT_DIR to keep screenshots (screen and print media) of the
rendered page for a human to look at.
"""

import os
from pathlib import Path

SPECTRUM = "/spectrum/"


def _asymmetric_demo_species(demo_catalogue) -> str:
    """An asymmetric top shows every table column (J Ka Kc, type), so it tests the most layout."""
    return next(
        (s.name for s in demo_catalogue if s.rotor == "asymmetric" and s.has_dipole),
        demo_catalogue[0].name,
    )


def test_the_spectrum_page_needs_a_login(anonymous_page):
    anonymous_page.goto(SPECTRUM)
    assert "/accounts/login/?next=/spectrum/" in anonymous_page.url
    assert anonymous_page.locator("#spectrum-form").count() == 0


def test_submitting_the_form_draws_the_plot_and_fills_the_table(page, demo_catalogue, wait_for_plot, screenshot):
    page.goto(SPECTRUM)
    assert page.locator(".site-nav a[aria-current=page]").inner_text() == "Spectrum"
    page.select_option("#id_species", _asymmetric_demo_species(demo_catalogue))
    page.fill("#id_temperature_k", "30")
    page.fill("#id_fmin_mhz", "0")
    page.fill("#id_fmax_mhz", "300000")
    page.click("#predict-button")
    page.wait_for_selector("#line-table tbody tr")
    wait_for_plot(page, "#spectrum-plot")

    assert page.locator("#spectrum-plot .main-svg").count() >= 1
    assert page.locator("#line-table tbody tr").count() > 0
    assert page.locator("#spectrum-plot .scatterlayer .trace").count() >= 2  # sticks and their markers

    page.check("#log-scale")
    page.wait_for_function("document.querySelector('#spectrum-plot').layout.yaxis.type === 'log'")

    screenshot(page, "spectrum-desktop")
    screenshot(page, "spectrum-print", print_media=True)
    shots = os.environ.get("LINECAST_SCREENSHOT_DIR")
    if shots:
        page.pdf(path=str(Path(shots) / "spectrum-print.pdf"), format="A4", landscape=True)


def test_form_error_is_shown_next_to_the_field_in_the_browser(page):
    page.goto(SPECTRUM)
    page.fill("#id_temperature_k", "-10")
    page.click("#predict-button")
    page.wait_for_selector("#id_temperature_k_error")
    assert page.locator(".field-temperature_k .errorlist").inner_text() == "Must be above 0 K."
    assert page.locator("#line-table").count() == 0


def test_computing_note_shows_once_the_form_is_submitted(page):
    page.goto(SPECTRUM)
    # Stop the navigation after the page's own submit handler has run, so the
    # page stays up to be looked at (listeners run in the order they were added).
    page.evaluate("document.getElementById('spectrum-form').addEventListener('submit', e => e.preventDefault())")
    assert page.locator("#computing").is_hidden()
    page.click("#predict-button")
    page.wait_for_selector("#computing", state="visible")
    assert page.locator("#computing").inner_text() == "Computing…"
    assert page.locator("#predict-button").is_disabled()


def test_printed_page_keeps_the_plot_at_page_width_and_hides_the_form(page, wait_for_plot):
    page.goto(SPECTRUM + "?species=OCS&temperature_k=300&fmin_mhz=0&fmax_mhz=120000")
    wait_for_plot(page, "#spectrum-plot")
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
    page.wait_for_function("document.querySelector('#spectrum-plot').layout.width === 1000")
    page.emulate_media(media="print")
    assert page.locator("#spectrum-plot .main-svg").first.is_visible()
    assert page.locator("#spectrum-form").is_hidden()
    assert page.locator(".site-header").is_hidden()  # nav and the logout form stay off the paper
    assert page.locator("#line-table tbody tr").count() > 0
    page.evaluate("window.dispatchEvent(new Event('afterprint'))")
    page.wait_for_function(
        "document.querySelector('#spectrum-plot').layout.width === undefined || "
        "document.querySelector('#spectrum-plot').layout.autosize === true"
    )
