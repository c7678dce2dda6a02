"""A temporary production Linecast under gunicorn on a free loopback port, for the load test's default mode.

Everything lives in one temporary folder (SQLite database, collected static
files, the server's log) that is removed afterwards; gunicorn runs in its own
process group and is always stopped, whatever happened.
"""

from __future__ import annotations

import os
import secrets
import shutil
import signal
import socket
import subprocess
import sys
import tempfile
import time
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path

from django.conf import settings

from planner.loadtest.client import LOGIN_PATH, Client, LoadTestError

HOST = "127.0.0.1"
LOAD_USERNAME = "load-test"
PASSWORD_VARIABLE = "LINECAST_LOAD_TEST_PASSWORD"
START_TIMEOUT_S = 60.0
STOP_TIMEOUT_S = 20.0
SETUP_TIMEOUT_S = 300.0
LOG_TAIL_LINES = 40


@dataclass(frozen=True)
class RunningServer:
    host: str
    port: int
    username: str
    password: str
    log_path: Path

    def log_tail(self, lines: int = LOG_TAIL_LINES) -> str:
        return _tail(self.log_path, lines)


def _tail(path: Path, lines: int) -> str:
    try:
        return "\n".join(path.read_text(encoding="utf-8", errors="replace").splitlines()[-lines:])
    except OSError:
        return "(no server log)"


def free_port() -> int:
    with socket.socket() as probe:
        probe.bind((HOST, 0))
        return probe.getsockname()[1]


def server_environment(folder: Path, password: str) -> dict:
    """The production variables of the temporary server (plain HTTP on loopback, hence no SSL redirect)."""
    environ = {key: value for key, value in os.environ.items() if key not in ("DEBUG", "DJANGO_SETTINGS_MODULE")}
    return environ | {
        "LINECAST_ENV": "production",
        "SECRET_KEY": secrets.token_urlsafe(50),
        "ALLOWED_HOSTS": HOST,
        "LINECAST_SSL_REDIRECT": "no",
        "LINECAST_HSTS_SECONDS": "0",
        "DATABASE_URL": f"sqlite:///{folder / 'load-test.sqlite3'}",
        "DJANGO_SETTINGS_MODULE": "planner.loadtest.server_settings",
        "LINECAST_LOAD_STATIC_ROOT": str(folder / "static"),
        PASSWORD_VARIABLE: password,
        "PYTHONUNBUFFERED": "1",
    }


def _manage(arguments: list[str], environ: dict, log) -> None:
    log.write(f"$ manage.py {' '.join(arguments)}\n".encode())
    log.flush()
    command = [sys.executable, str(Path(settings.BASE_DIR) / "manage.py"), *arguments]
    try:
        subprocess.run(command, env=environ, stdout=log, stderr=log, check=True, timeout=SETUP_TIMEOUT_S)
    except (subprocess.CalledProcessError, subprocess.TimeoutExpired) as error:
        raise LoadTestError(f"setting up the temporary server failed at `manage.py {arguments[0]}`: {error}") from None


def _wait_until_answering(process: subprocess.Popen, port: int) -> None:
    deadline = time.monotonic() + START_TIMEOUT_S
    while time.monotonic() < deadline:
        if process.poll() is not None:
            raise LoadTestError(f"gunicorn exited with status {process.returncode} before answering")
        client = Client(HOST, port)
        try:
            if client.get(LOGIN_PATH).status == 200:
                return
        except OSError:
            pass
        finally:
            client.close()
        time.sleep(0.2)
    raise LoadTestError(f"gunicorn did not answer on {HOST}:{port} within {START_TIMEOUT_S:.0f} s")


def _stop(process: subprocess.Popen) -> None:
    """SIGTERM to the gunicorn master (it stops its workers), SIGKILL to its process group if it hangs."""
    if process.poll() is None:
        process.terminate()
    try:
        process.wait(timeout=STOP_TIMEOUT_S)
    except subprocess.TimeoutExpired:
        pass
    try:
        os.killpg(process.pid, signal.SIGKILL)  # the group this module created: only its own workers
    except ProcessLookupError:
        pass
    process.wait()


@contextmanager
def temporary_server(workers: int, threads: int, say=print) -> Iterator[RunningServer]:
    """Migrate a fresh SQLite file, load the demo and the load-test account, collect static files, run gunicorn."""
    folder = Path(tempfile.mkdtemp(prefix="linecast-load-"))
    log_path = folder / "server.log"
    password = secrets.token_urlsafe(18)
    environ = server_environment(folder, password)
    process = None
    failed = True
    try:
        with open(log_path, "ab") as log:
            say(f"setting up a temporary production server in {folder}")
            for arguments in (
                ["migrate", "--no-input"],
                ["load_demo"],
                ["load_test", "--prepare", "--username", LOAD_USERNAME],
                ["collectstatic", "--no-input"],
            ):
                _manage(arguments, environ, log)
            port = free_port()
            bind = ["--bind", f"{HOST}:{port}", "--workers", str(workers), "--threads", str(threads)]
            say(f"starting gunicorn on {HOST}:{port}: {workers} workers × {threads} threads")
            process = subprocess.Popen(
                # No control socket: its default path is shared by every gunicorn of this user.
                [sys.executable, "-m", "gunicorn", "planner.wsgi", *bind, "--timeout", "60", "--no-control-socket"],
                env=environ,
                stdout=log,
                stderr=log,
                cwd=settings.BASE_DIR,
                start_new_session=True,  # its own process group, so _stop can reach every worker
            )
            _wait_until_answering(process, port)
            yield RunningServer(HOST, port, LOAD_USERNAME, password, log_path)
            failed = False
    finally:
        if process is not None:
            _stop(process)
        if failed:
            say(f"last lines of the server's log:\n{_tail(log_path, LOG_TAIL_LINES)}")
        shutil.rmtree(folder, ignore_errors=True)
