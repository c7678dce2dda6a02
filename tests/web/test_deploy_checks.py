"""`check --deploy` is clean with production settings, and HSTS is on by default in production.

Settings are read once per process, so each case starts Python with production-like variables
(as CI's `manage.py check --deploy` does) and runs Django's checks through ``call_command``.
"""

import os
import secrets
import subprocess
import sys
from pathlib import Path

REPO = Path(__file__).resolve().parents[2]
ONE_YEAR_S = 365 * 24 * 3600  # the usual HSTS max-age (common practice, no source)

CHECK = """
import django
django.setup()
from django.conf import settings
from django.core.management import call_command
from django.core.management.base import SystemCheckError
print("HSTS", settings.SECURE_HSTS_SECONDS, settings.SECURE_HSTS_INCLUDE_SUBDOMAINS, settings.SECURE_HSTS_PRELOAD)
try:
    call_command("check", deploy=True, fail_level="WARNING")
except SystemCheckError as error:
    print(error)
    raise SystemExit(3)
"""


def _run_checks(extra_env: dict | None = None) -> subprocess.CompletedProcess:
    dropped = ("LINECAST_ENV", "DEBUG", "SECRET_KEY", "ALLOWED_HOSTS", "DATABASE_URL")
    environ = {k: v for k, v in os.environ.items() if k not in dropped and not k.startswith("LINECAST_HSTS")}
    environ |= {
        "DJANGO_SETTINGS_MODULE": "planner.settings",
        "LINECAST_ENV": "production",
        "SECRET_KEY": secrets.token_urlsafe(50),
        "ALLOWED_HOSTS": "linecast.invalid",
    } | (extra_env or {})
    return subprocess.run(
        [sys.executable, "-c", CHECK], cwd=REPO, env=environ, capture_output=True, text=True, timeout=120
    )


def test_deploy_checks_give_no_warning_with_production_defaults():
    result = _run_checks()
    assert result.returncode == 0, result.stdout + result.stderr
    assert f"HSTS {ONE_YEAR_S} True False" in result.stdout


def test_turning_hsts_off_is_reported_by_the_deploy_checks():
    # The same run fails once HSTS is switched off: the clean run above is not clean by accident.
    result = _run_checks({"LINECAST_HSTS_SECONDS": "0"})
    assert result.returncode == 3
    assert "security.W004" in result.stdout


def test_hsts_stays_configurable():
    result = _run_checks({"LINECAST_HSTS_SECONDS": "600", "LINECAST_HSTS_PRELOAD": "yes"})
    assert result.returncode == 0, result.stdout + result.stderr
    assert "HSTS 600 True True" in result.stdout
