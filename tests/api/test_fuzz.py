"""Fuzz every operation of the OpenAPI description against a running server: no answer may be a 5xx.

schemathesis (its pytest API) takes the API's OpenAPI description (the one
served at /api/v1/openapi.json, see test_schema.py) and sends every operation,
on pytest-django's live server holding the demo catalogue and with a viewer's
token, the schema's examples, cases around the schema's edges and random
cases.  The run is bounded (a fixed seed, a few examples per operation) so
that it stays quick on a shared 2-core machine; `make fuzz` runs a longer one.

The description is loaded at collection rather than from the live server
through ``schemathesis.pytest.from_fixture``: that lazy loader sets a pytest
node attribute that pytest 9 no longer has.
"""

from __future__ import annotations

import json
import os

import pytest
import schemathesis
from hypothesis import HealthCheck, settings
from schemathesis.checks import not_a_server_error
from schemathesis.specs.openapi.checks import content_type_conformance, response_schema_conformance

from planner.api.api import api
from planner.api.tokens import create_token
from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue

#: Random cases per operation and phase (common practice, no source: enough to reach every branch
#: of the input checks once, few enough for a test run); LINECAST_FUZZ_EXAMPLES raises it (make fuzz).
MAX_EXAMPLES = int(os.environ.get("LINECAST_FUZZ_EXAMPLES", "6"))
SEED = 20261202

#: No 5xx anywhere; every answer is JSON of the schema documented for its status (the error shape too).
CHECKS = [not_a_server_error, content_type_conformance, response_schema_conformance]


def _schema():
    """The API's own OpenAPI description, loaded when the tests are collected (the server's URL comes later)."""
    document = api.get_openapi_schema(path_prefix="/api/v1/")
    config = schemathesis.Config.from_dict(
        {
            # Species names are drawn from the demo catalogue most of the time, so that random cases
            # reach the computations and not only the "no such species" answer.
            "dictionaries": {"demo_species": {"values": sorted(s.name for s in load_catalogue(DEMO_CATALOGUE_PATH))}},
            "parameters": {
                key: {"dictionary": "demo_species", "probability": 0.8}
                for key in ("body.species", "body.species[*]", "body.species[*].name")
            },
            "seed": SEED,
            "generation": {"max-examples": MAX_EXAMPLES, "deterministic": True},
            # The status is checked here, not the speed: the 2-core machine is shared, and the first
            # plan of a process takes seconds when the machine is busy.
            "request-timeout": 120,
        }
    )
    return schemathesis.openapi.from_dict(json.loads(json.dumps(document)), config=config)


schema = _schema()


@pytest.fixture
def token_header(transactional_db, live_server, demo_in_db, viewer):
    """The viewer's token, with the demo catalogue visible to the live server's thread."""
    _, token = create_token(viewer, "fuzz")
    return {"Authorization": f"Bearer {token}"}


@schema.parametrize()
# The fixtures are meant to be shared by every case: the API saves nothing, so a case cannot change them.
@settings(suppress_health_check=[HealthCheck.function_scoped_fixture], deadline=None)
def test_no_operation_answers_with_a_server_error(case, live_server, token_header):
    case.call_and_validate(base_url=live_server.url, headers=token_header, checks=CHECKS)
