"""Static files come from our own server: plotly.js from the pinned plotly wheel, our CSS and JS."""

from importlib.metadata import version

import pytest
from plotly.offline import get_plotlyjs_version


def _body(response) -> bytes:
    return b"".join(response.streaming_content) if response.streaming else response.content


def test_plotly_js_is_served_from_our_static_files(client):
    response = client.get("/static/vendor/plotly/plotly.min.js")
    assert response.status_code == 200
    assert "javascript" in response["Content-Type"]
    head = _body(response)[:400].decode("utf-8", "replace")
    # The plotly wheel names the plotly.js it bundles (library: plotly.offline.get_plotlyjs_version).
    assert f"plotly.js v{get_plotlyjs_version()}" in head


def test_plotly_version_follows_the_requirements_pin():
    pinned = next(
        line.split("==")[1].strip()
        for line in open("requirements.txt", encoding="utf-8")
        if line.lower().startswith("plotly==")
    )
    assert version("plotly") == pinned


@pytest.mark.parametrize("path", ["css/site.css", "css/print.css", "js/computing.js", "js/spectrum-plot.js"])
def test_site_assets_are_served(client, path):
    assert client.get(f"/static/{path}").status_code == 200


def test_print_stylesheet_hides_the_form_and_navigation(client):
    css = _body(client.get("/static/css/print.css")).decode()
    assert ".site-header" in css and ".query" in css and "display: none" in css
