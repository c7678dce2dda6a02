"""Shared set-up of the browser tests: Chromium, the demo catalogue, an editor logged in through the form.

Every page needs a login, so each test gets a fresh browser context that has
logged in through the real login form (the live server's database is flushed
after every test, sessions included, so a saved storage state would not
outlive the test that made it).

Set LINECAST_SCREENSHOT_DIR to keep full-page screenshots (screen and print
media) of the pages the tests visit, for a human to look at.
"""

from __future__ import annotations

import os
import re
from pathlib import Path

import pytest

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
#: A common laptop screen.
LAPTOP_VIEWPORT = {"width": 1366, "height": 800}

EDITOR_USERNAME = "ada"
EDITOR_PASSWORD = "kappa-0.69-prolate"  # a test account on a throw-away database
#: Plotly draws into a div after the page has loaded; a cold start can take a few seconds.
PLOT_TIMEOUT_MS = 20_000
NAVIGATION_TIMEOUT_MS = 45_000

_HERE = Path(__file__).resolve().parent


def pytest_collection_modifyitems(config, items):
    """Every test in this folder drives Chromium: mark it, and skip it where Chromium is missing."""
    skip = pytest.mark.skipif(
        not CHROMIUM.exists(), reason="needs Debian's chromium at /usr/bin/chromium (CI installs it)"
    )
    for item in items:
        if _HERE in Path(str(item.path)).resolve().parents:
            item.add_marker(pytest.mark.browser)
            item.add_marker(skip)


def pytest_terminal_summary(terminalreporter):
    """Say in the closing lines, not only in the skip list, that the browser tests did not run."""
    if not CHROMIUM.exists():
        terminalreporter.write_sep(
            "=", f"browser tests SKIPPED: {CHROMIUM} is missing (apt-get install chromium; .ci/run does)", yellow=True
        )


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


@pytest.fixture(scope="module")
def browser(allow_sync_django_next_to_playwright):
    """One Chromium per test module; each test gets its own context (cookies, storage)."""
    from playwright.sync_api import sync_playwright

    with sync_playwright() as playwright:
        chromium = playwright.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        yield chromium
        chromium.close()


@pytest.fixture
def demo_catalogue(transactional_db):
    """The demo catalogue in the (live server's) test database; returns the engine species."""
    from planner.catalogue.store import Stamp, import_species
    from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue

    species = load_catalogue(DEMO_CATALOGUE_PATH)
    import_species(species, Stamp(None, "demo"))
    return species


@pytest.fixture
def editor(transactional_db, django_user_model):
    """An editor with a known password (give_role re-creates the groups a flush removed)."""
    from planner.catalogue.roles import give_role

    user = django_user_model.objects.create_user(EDITOR_USERNAME, password=EDITOR_PASSWORD)
    give_role(user, "editor")
    user.test_password = EDITOR_PASSWORD  # for tests that fill in the login form themselves
    return user


@pytest.fixture
def anonymous_page(browser, live_server):
    """A page of a fresh context at laptop size, not logged in; relative URLs go to the live server."""
    context = browser.new_context(viewport=LAPTOP_VIEWPORT, base_url=live_server.url)
    context.set_default_timeout(NAVIGATION_TIMEOUT_MS)  # a click on a link waits for the next page too
    # A species page predicts its 0-1 THz stick spectrum while it is asked for: several seconds for
    # the larger asymmetric tops (HCOOH about 7 s here), more on a busy CI machine.
    context.set_default_navigation_timeout(NAVIGATION_TIMEOUT_MS)
    page = context.new_page()
    yield page
    context.close()


def log_in_through_the_form(page, username: str, password: str, *, next_path: str = "/") -> None:
    """Go to a page, be sent to the login form, fill it in and land back on the page."""
    page.goto(next_path)
    page.wait_for_url(re.compile(r"/accounts/login/"))
    page.fill("#id_username", username)
    page.fill("#id_password", password)
    with page.expect_navigation():
        page.click("form.stacked button[type=submit]")
    if "/accounts/login/" in page.url:
        raise AssertionError(f"login as {username!r} failed: {page.locator('main').inner_text()}")


@pytest.fixture
def page(anonymous_page, demo_catalogue, editor):
    """A page logged in as the editor, on the catalogue list, with the demo catalogue loaded."""
    log_in_through_the_form(anonymous_page, EDITOR_USERNAME, EDITOR_PASSWORD, next_path="/catalogue/")
    return anonymous_page


@pytest.fixture
def screenshot():
    """screenshot(page, name, print_media=False): a full-page PNG in LINECAST_SCREENSHOT_DIR, if set."""
    folder = os.environ.get("LINECAST_SCREENSHOT_DIR")

    def take(page, name: str, *, print_media: bool = False) -> Path | None:
        if not folder:
            return None
        Path(folder).mkdir(parents=True, exist_ok=True)
        path = Path(folder) / f"{name}.png"
        if print_media:
            page.emulate_media(media="print")
        try:
            page.screenshot(path=str(path), full_page=True)
        finally:
            if print_media:
                page.emulate_media(media="null")
        return path

    return take


@pytest.fixture
def wait_for_plot():
    """wait_for_plot(page, selector): until plotly has drawn its svg inside the div."""

    def wait(page, selector: str) -> None:
        page.wait_for_selector(f"{selector} .main-svg", timeout=PLOT_TIMEOUT_MS)

    return wait
