"""One access check for every catalogue page: log in first, then the role's permission."""

from __future__ import annotations

from functools import wraps

from django.contrib.auth.decorators import login_required
from django.core.exceptions import PermissionDenied

VIEW = "catalogue.view_species"
ADD = "catalogue.add_species"
CHANGE = "catalogue.change_species"
DELETE = "catalogue.delete_species"


def needs(*permissions: str):
    """Anonymous users go to the login page; users without every permission get 403."""

    def decorate(view):
        @login_required
        @wraps(view)
        def checked(request, *args, **kwargs):
            if not request.user.has_perms(permissions):
                raise PermissionDenied("Your account may not do this: ask a staff member for the editor role.")
            return view(request, *args, **kwargs)

        return checked

    return decorate


def can_edit(user) -> bool:
    return user.has_perm(CHANGE)
