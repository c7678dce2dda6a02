"""One load-test client: a keep-alive HTTP connection to a loopback server, its cookies, the login form.

Production marks the session and CSRF cookies Secure, so a browser would not
send them over plain HTTP; this client keeps its own Cookie header and sends
them anyway, which is what lets it log in to a loopback server without TLS.
"""

from __future__ import annotations

import http.client
import ipaddress
import re
import time
from dataclasses import dataclass
from http.cookies import SimpleCookie
from urllib.parse import urlencode, urlsplit

#: Seconds one request may take before it counts as failed.
REQUEST_TIMEOUT_S = 30.0
LOGIN_PATH = "/accounts/login/"
_CSRF_FIELD = re.compile(r'name="csrfmiddlewaretoken" value="([^"]+)"')


class LoadTestError(Exception):
    """Something that stops the load test before or outside the measured requests (setup, login, URL)."""


def loopback_address(url: str) -> tuple[str, int]:
    """(host, port) of an http:// URL whose host is a loopback IP address; anything else is refused.

    Only IP literals count (127.0.0.1, ::1): a name could resolve elsewhere.
    """
    parts = urlsplit(url)
    if parts.scheme != "http":
        raise LoadTestError(f"--url {url!r}: only http:// URLs on this machine are load-tested")
    try:
        loopback = ipaddress.ip_address(parts.hostname or "").is_loopback
    except ValueError:
        loopback = False
    if not loopback:
        raise LoadTestError(
            f"--url {url!r}: the host must be a loopback address such as 127.0.0.1; "
            "the load test never sends traffic off this machine"
        )
    if parts.path not in ("", "/") or parts.query:
        raise LoadTestError(f"--url {url!r}: give the server's root, e.g. http://127.0.0.1:8000")
    return parts.hostname, parts.port or 80


@dataclass(frozen=True)
class Response:
    status: int
    body: bytes
    headers: http.client.HTTPMessage
    seconds: float  # from sending the request to the last byte of the body


class Client:
    """A browser-like client: one keep-alive connection (reopened when the server closed it) and cookies."""

    def __init__(self, host: str, port: int):
        self.host, self.port = host, port
        self.cookies: dict[str, str] = {}
        self._connection: http.client.HTTPConnection | None = None

    def close(self) -> None:
        if self._connection is not None:
            self._connection.close()
            self._connection = None

    def get(self, path: str) -> Response:
        return self.request("GET", path)

    def request(self, method: str, path: str, form: dict | None = None) -> Response:
        body = urlencode(form).encode() if form is not None else None
        host = f"[{self.host}]" if ":" in self.host else self.host  # an IPv6 literal needs brackets
        headers = {"Host": f"{host}:{self.port}", "User-Agent": "linecast-load-test"}
        if body is not None:
            headers["Content-Type"] = "application/x-www-form-urlencoded"
        if self.cookies:
            headers["Cookie"] = "; ".join(f"{name}={value}" for name, value in self.cookies.items())
        reused = self._connection is not None
        try:
            return self._send(method, path, body, headers)
        except (http.client.RemoteDisconnected, BrokenPipeError, ConnectionResetError):
            # A kept-alive connection the server closed while it was idle: any HTTP client
            # opens a new one and sends again.  A fresh connection failing is a real error.
            self.close()
            if not reused:
                raise
            return self._send(method, path, body, headers)

    def _send(self, method, path, body, headers) -> Response:
        if self._connection is None:
            self._connection = http.client.HTTPConnection(self.host, self.port, timeout=REQUEST_TIMEOUT_S)
        start = time.perf_counter()
        self._connection.request(method, path, body=body, headers=headers)
        answer = self._connection.getresponse()
        content = answer.read()
        seconds = time.perf_counter() - start
        self._keep_cookies(answer.headers.get_all("Set-Cookie") or [])
        if answer.will_close:
            self.close()
        return Response(answer.status, content, answer.headers, seconds)

    def _keep_cookies(self, lines: list[str]) -> None:
        for line in lines:
            jar = SimpleCookie()
            jar.load(line)
            for name, morsel in jar.items():
                if morsel["max-age"] == "0" or not morsel.value:
                    self.cookies.pop(name, None)  # the server deleted it (e.g. logout)
                else:
                    self.cookies[name] = morsel.value

    def log_in(self, username: str, password: str) -> None:
        """Log in through the real form: GET it, send back its CSRF token with the credentials."""
        page = self.get(LOGIN_PATH)
        token = _CSRF_FIELD.search(page.body.decode("utf-8", "replace"))
        if page.status != 200 or token is None or "csrftoken" not in self.cookies:
            raise LoadTestError(f"the login page answered {page.status} without a CSRF token and cookie")
        form = {"csrfmiddlewaretoken": token.group(1), "username": username, "password": password}
        answer = self.request("POST", LOGIN_PATH, form)
        # Django redirects after a good login and shows the form again (200) after a bad one.
        if answer.status != 302 or "sessionid" not in self.cookies:
            raise LoadTestError(f"logging in as {username!r} failed (the login form answered {answer.status})")
