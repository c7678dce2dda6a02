"""One error shape for every failure of the API, and the handlers that produce it.

    {"error": {"status": 400, "code": "invalid_input", "message": "...", "fields": {"fmin_mhz": ["..."]}}}

``fields`` maps an input's name (``species[1].amount``, ``lines[0].sigma_mhz``)
to its problems; it is empty when the problem belongs to no one field.
"""

from __future__ import annotations

import logging
from functools import wraps

from django.core.exceptions import PermissionDenied
from django.http import Http404, JsonResponse
from ninja import Schema
from ninja.errors import AuthenticationError, HttpError, ValidationError

from planner.engine import EngineLimitError

logger = logging.getLogger("planner.api")

#: Machine-readable code of each status the API answers with.
CODES = {
    400: "invalid_input",
    401: "not_authenticated",
    403: "permission_denied",
    404: "not_found",
    405: "method_not_allowed",
    422: "refused_by_engine",
    500: "server_error",
}


class ErrorDetail(Schema):
    status: int
    code: str
    message: str
    fields: dict[str, list[str]]


class ErrorOut(Schema):
    error: ErrorDetail


#: The error statuses every endpoint documents (OpenAPI), all in the ErrorOut shape.
ERROR_RESPONSES = {status: ErrorOut for status in (400, 401, 403, 404, 422, 500)}


class ApiError(Exception):
    """A failure to answer in the error shape; ``fields`` maps input names to their problems."""

    def __init__(self, status: int, message: str, fields: dict[str, list[str]] | None = None, code: str | None = None):
        self.status = status
        self.message = message
        self.fields = fields or {}
        self.code = code or CODES[status]
        super().__init__(message)


def invalid(message: str, field: str | None = None) -> ApiError:
    """A 400 for one bad input (``field`` None: the request as a whole)."""
    return ApiError(400, message, {field: [message]} if field else None)


def form_error(errors: dict[str, list[str]]) -> ApiError:
    """A 400 from a page form's errors, already under the API's input names; "__all__" is the message only."""
    fields = {name: [str(p) for p in problems] for name, problems in errors.items() if name != "__all__"}
    general = [str(p) for p in errors.get("__all__", [])]
    parts = general + ([listed(fields)] if fields else [])
    return ApiError(400, "; ".join(parts) or "Invalid input.", fields)


def listed(fields: dict[str, list[str]]) -> str:
    """'fmin_mhz: problem; species[0].amount: problem' for a message."""
    return "; ".join(f"{name}: {' '.join(problems)}" for name, problems in fields.items())


def error_response(status: int, message: str, fields=None, code: str | None = None) -> JsonResponse:
    body = {"status": status, "code": code or CODES[status], "message": message, "fields": fields or {}}
    return JsonResponse({"error": body}, status=status)


def install_error_handlers(api) -> None:
    """Make every failure of ``api`` answer in the error shape (most specific handler wins)."""

    def handle(exc_class):
        return lambda handler: api.add_exception_handler(exc_class, handler)

    @handle(ApiError)
    def api_error(request, exc):
        return error_response(exc.status, exc.message, exc.fields, exc.code)

    @handle(ValidationError)
    def validation_error(request, exc):
        fields = validation_fields(exc.errors)
        return error_response(400, f"Invalid input: {listed(fields)}" if fields else "Invalid input.", fields)

    @handle(AuthenticationError)
    def not_authenticated(request, exc):
        response = error_response(
            401, "Log in, or send an API token as 'Authorization: Bearer <token>' (manage.py api_token)."
        )
        response["WWW-Authenticate"] = 'Bearer realm="linecast"'
        return response

    @handle(HttpError)
    def http_error(request, exc):
        status = exc.status_code if exc.status_code in CODES else 400
        return error_response(status, str(exc))

    @handle(PermissionDenied)
    def permission_denied(request, exc):
        return error_response(403, str(exc) or "Your account may not do this.")

    @handle(Http404)
    def not_found(request, exc):
        return error_response(404, str(exc) or "Not found.")

    @handle(EngineLimitError)
    def engine_limit(request, exc):
        # A well-formed request the engine will not compute (levels past its J cap): its message says why.
        return error_response(422, str(exc))

    @handle(Exception)
    def server_error(request, exc):
        logger.exception("API request %s %s failed", request.method, request.path)
        return error_response(500, "The server failed to answer this request; the failure is logged.")


def validation_fields(errors: list[dict]) -> dict[str, list[str]]:
    """ninja's validation errors as {input name: [messages]} (``species[0].amount``)."""
    fields: dict[str, list[str]] = {}
    for error in errors:
        # loc is (source, parameter name, *path) for a body, (source, name) for a query parameter.
        loc = [str(part) for part in error.get("loc", ())]
        path = loc[2:] if loc[:1] == ["body"] and len(loc) > 2 else loc[1:] or loc
        fields.setdefault(_dotted(path) or "body", []).append(str(error.get("msg", "invalid")))
    return fields


def _dotted(path: list[str]) -> str:
    text = ""
    for part in path:
        text += f"[{part}]" if part.isdigit() else (f".{part}" if text else part)
    return text


def json_errors(view):
    """Wrap one of ninja's URL views so that its wrong-method 405 (plain text) and the 404 of its
    root path (Django's HTML page) answer in the error shape too."""

    @wraps(view)
    def checked(request, *args, **kwargs):
        try:
            response = view(request, *args, **kwargs)
        except Http404:
            return unknown_path(request)
        if response.status_code == 405 and not isinstance(response, JsonResponse):
            allowed = response.get("Allow", "")
            response = error_response(405, f"{request.method} is not allowed here; allowed: {allowed}.")
            response["Allow"] = allowed
        return response

    return checked


def unknown_path(request, rest: str = ""):
    """Any path under /api/v1/ that names no endpoint."""
    return error_response(404, f"No API endpoint at {request.path}; see /api/v1/openapi.json.")
