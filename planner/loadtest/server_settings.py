"""Settings of the load test's own gunicorn: Linecast's settings unchanged, but static files in its temporary folder.

planner/settings.py puts STATIC_ROOT beside the code; the load test collects
static files into its temporary folder instead, so it never writes into the
working tree.  Everything else (production guard, WhiteNoise's manifest
storage, database, cache) comes from the environment exactly as in a deployment.
"""

from pathlib import Path

from planner.settings import *  # noqa: F403 -- the real settings; only STATIC_ROOT differs
from planner.settings import ENVIRON

STATIC_ROOT = Path(ENVIRON["LINECAST_LOAD_STATIC_ROOT"])
