"""Who is calling: an API token (``Authorization: Bearer <token>``) or the browser's login session.

Either way the account needs the catalogue's view permission (viewers and
editors have it, planner/catalogue/roles.py).  A session may only make an
unsafe request (POST) with Django's CSRF token, as the pages do; a token
request needs none, since no browser sends it by itself.
"""

from __future__ import annotations

from django.conf import settings
from django.core.exceptions import PermissionDenied
from ninja.errors import HttpError
from ninja.security import APIKeyCookie, HttpBearer
from ninja.utils import check_csrf

from planner.catalogue.access import VIEW

from .tokens import user_of_token

SAFE_METHODS = ("GET", "HEAD", "OPTIONS", "TRACE")


def _allowed(user):
    if not user.has_perm(VIEW):
        raise PermissionDenied("Your account has no role that may read the catalogue: ask a staff member.")
    return user


class BearerToken(HttpBearer):
    """A token made by ``manage.py api_token``."""

    def authenticate(self, request, token: str):
        user = user_of_token(token)
        return _allowed(user) if user is not None else None


class LoginSession(APIKeyCookie):
    """The Django login of the pages; CSRF is checked only once the session is known to be logged in."""

    param_name = settings.SESSION_COOKIE_NAME

    def __init__(self):
        # ninja's own check would answer an anonymous POST with 403; it must be 401.
        super().__init__(csrf=False)

    def authenticate(self, request, key):
        user = request.user
        if not user.is_authenticated:
            return None
        if request.method not in SAFE_METHODS and check_csrf(request) is not None:
            raise HttpError(403, "CSRF check failed: send the csrftoken cookie's value as the X-CSRFToken header.")
        return _allowed(user)


API_AUTH = [BearerToken(), LoginSession()]
