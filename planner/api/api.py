"""The NinjaAPI of /api/v1/: its description, authentication, error handlers and endpoints."""

from __future__ import annotations

from ninja import NinjaAPI

from . import fit, plan, predict, species
from .auth import API_AUTH
from .errors import install_error_handlers

API_VERSION = "1.0.0"

DESCRIPTION = """\
JSON access for scripts to Linecast's shared catalogue, line predictions, slot plans and fits.

**Authentication.** Send a token as `Authorization: Bearer <token>` (an administrator makes one with
`manage.py api_token USERNAME`), or use the login session of the pages; a session's POST needs the
CSRF token as the `X-CSRFToken` header. The account needs a role (viewer or editor).

**Units** are in every key: `frequency_mhz`, `temperature_k`, `dipole_debye`, `energy_cm1`, ...

**Errors** all have one shape, whatever the endpoint or status:
`{"error": {"status": 400, "code": "invalid_input", "message": "...", "fields": {"fmin_mhz": ["..."]}}}`.
Codes: `invalid_input` (400), `not_authenticated` (401), `permission_denied` (403), `not_found` (404),
`method_not_allowed` (405), `refused_by_engine` (422: e.g. a temperature that needs levels past the
engine's J cap, or a fit that does not converge), `server_error` (500).

**Bounds.** Every request's computation is bounded: the engine's J caps and window rules, at most 25
species per prediction, 30 per plan and a window of at most 300 GHz, 5000 lines per fit, and request
bodies of at most 5 MB.
"""

api = NinjaAPI(
    title="Linecast API",
    version=API_VERSION,
    description=DESCRIPTION,
    auth=API_AUTH,
    urls_namespace="api-v1",
    # The docs page is added in urls.py: ninja's docs_decorator would also keep scripts from the schema.
    docs_url=None,
)
install_error_handlers(api)
for module in (species, predict, plan, fit):
    api.add_router("", module.router)
