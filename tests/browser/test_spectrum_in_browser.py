"""The spectrum page in a real browser: submit the form, see the plot and the table.

Drives Debian's Chromium through playwright against pytest-django's live
server.  Set LINECAST_SCREENSHOT_DIR to keep screenshots (screen and print
media) of the rendered page for a human to look at.
"""

import os
from pathlib import Path

import pytest

from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue

CHROMIUM = Path("/usr/bin/chromium")
CHROMIUM_ARGS = [
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
]

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian's chromium at /usr/bin/chromium (CI installs it)"),
]


@pytest.fixture(scope="module", autouse=True)
def allow_sync_django_next_to_playwright():
    # playwright's sync API keeps an event loop running in this thread; Django
    # would then refuse the live server's synchronous database set-up.
    previous = os.environ.get("DJANGO_ALLOW_ASYNC_UNSAFE")
    os.environ["DJANGO_ALLOW_ASYNC_UNSAFE"] = "true"
    yield
    if previous is None:
        os.environ.pop("DJANGO_ALLOW_ASYNC_UNSAFE", None)
    else:
        os.environ["DJANGO_ALLOW_ASYNC_UNSAFE"] = previous


@pytest.fixture
def page():
    from playwright.sync_api import sync_playwright

    with sync_playwright() as playwright:
        browser = playwright.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        context = browser.new_context(viewport={"width": 1400, "height": 1000})
        page = context.new_page()
        yield page
        context.close()
        browser.close()


def _asymmetric_demo_species() -> str:
    """An asymmetric top shows every table column (J Ka Kc, type), so it tests the most layout."""
    species = load_catalogue(DEMO_CATALOGUE_PATH)
    return next((s.name for s in species if s.rotor == "asymmetric" and s.has_dipole), species[0].name)


def test_submitting_the_form_draws_the_plot_and_fills_the_table(live_server, page):
    page.goto(live_server.url + "/")
    page.select_option("#id_species", _asymmetric_demo_species())
    page.fill("#id_temperature_k", "30")
    page.fill("#id_fmin_mhz", "0")
    page.fill("#id_fmax_mhz", "300000")
    page.click("#predict-button")
    page.wait_for_selector("#line-table tbody tr")
    page.wait_for_selector("#spectrum-plot .main-svg", timeout=20_000)

    assert page.locator("#spectrum-plot .main-svg").count() >= 1
    assert page.locator("#line-table tbody tr").count() > 0
    assert page.locator("#spectrum-plot .scatterlayer .trace").count() >= 2  # sticks and their markers

    page.check("#log-scale")
    page.wait_for_function("document.querySelector('#spectrum-plot').layout.yaxis.type === 'log'")

    shots = os.environ.get("LINECAST_SCREENSHOT_DIR")
    if shots:
        Path(shots).mkdir(parents=True, exist_ok=True)
        page.screenshot(path=f"{shots}/spectrum-desktop.png", full_page=False)
        page.emulate_media(media="print")
        page.screenshot(path=f"{shots}/spectrum-print.png", full_page=False)
        page.pdf(path=f"{shots}/spectrum-print.pdf", format="A4", landscape=True)
        page.emulate_media(media="screen")


def test_form_error_is_shown_next_to_the_field_in_the_browser(live_server, page):
    page.goto(live_server.url + "/")
    page.fill("#id_temperature_k", "-10")
    page.click("#predict-button")
    page.wait_for_selector("#id_temperature_k_error")
    assert page.locator(".field-temperature_k .errorlist").inner_text() == "Must be above 0 K."
    assert page.locator("#line-table").count() == 0


def test_computing_note_shows_once_the_form_is_submitted(live_server, page):
    page.goto(live_server.url + "/")
    # Stop the navigation after the page's own submit handler has run, so the
    # page stays up to be looked at (listeners run in the order they were added).
    page.evaluate("document.getElementById('spectrum-form').addEventListener('submit', e => e.preventDefault())")
    assert page.locator("#computing").is_hidden()
    page.click("#predict-button")
    page.wait_for_selector("#computing", state="visible")
    assert page.locator("#computing").inner_text() == "Computing…"
    assert page.locator("#predict-button").is_disabled()


def test_printed_page_keeps_the_plot_at_page_width_and_hides_the_form(live_server, page):
    page.goto(live_server.url + "/?species=OCS&temperature_k=300&fmin_mhz=0&fmax_mhz=120000")
    page.wait_for_selector("#spectrum-plot .main-svg", timeout=20_000)
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
    page.wait_for_function("document.querySelector('#spectrum-plot').layout.width === 1000")
    page.emulate_media(media="print")
    assert page.locator("#spectrum-plot .main-svg").first.is_visible()
    assert page.locator("#spectrum-form").is_hidden()
    assert page.locator("#line-table tbody tr").count() > 0
    page.evaluate("window.dispatchEvent(new Event('afterprint'))")
    page.wait_for_function(
        "document.querySelector('#spectrum-plot').layout.width === undefined || "
        "document.querySelector('#spectrum-plot').layout.autosize === true"
    )
