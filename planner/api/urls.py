"""/api/v1/: the endpoints, the docs page, and the error shape for wrong methods and unknown paths."""

from functools import partial

from django.contrib.auth.decorators import login_required
from django.urls import path, re_path
from django.urls.resolvers import URLPattern
from ninja.openapi.views import openapi_view

from .api import api
from .errors import json_errors, unknown_path

_patterns = api.urls[0]  # (patterns, app name, namespace): the namespace is set in planner/urls.py


def _json_errors(pattern: URLPattern) -> URLPattern:
    return URLPattern(pattern.pattern, json_errors(pattern.callback), pattern.default_args, pattern.name)


urlpatterns = [
    *[_json_errors(p) for p in _patterns],
    # Swagger UI from ninja's own static files ("ninja" is in INSTALLED_APPS, so no CDN), for members
    # who are logged in; the schema itself (openapi.json) stays open to scripts.
    path("docs", login_required(partial(openapi_view, api=api)), name="docs"),
    re_path(r"^(?P<rest>.*)$", unknown_path, name="unknown"),
]
