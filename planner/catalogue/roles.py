"""The two roles of a group member: viewers read the catalogue, editors change it.

Roles are Django groups holding the model permissions; staff use the admin.
"""

from __future__ import annotations

from django.contrib.auth.models import Group, Permission

VIEWERS = "Viewers"
EDITORS = "Editors"

#: Permissions (app label, codename) of each role: viewers read the catalogue and plans; editors also
#: change the catalogue, keep the instrument profiles and save plans.
_VIEW = (("catalogue", "view_species"), ("planning", "view_instrument"), ("planning", "view_savedplan"))
ROLE_PERMISSIONS = {
    VIEWERS: _VIEW,
    EDITORS: _VIEW
    + (
        ("catalogue", "add_species"),
        ("catalogue", "change_species"),
        ("catalogue", "delete_species"),
        ("planning", "add_instrument"),
        ("planning", "change_instrument"),
        ("planning", "add_savedplan"),
    ),
}
ROLE_BY_NAME = {"viewer": VIEWERS, "editor": EDITORS}


def ensure_roles(**kwargs) -> dict[str, Group]:
    """Create the role groups with their permissions (idempotent; runs after every migrate)."""
    groups = {}
    for name, wanted in ROLE_PERMISSIONS.items():
        group, _ = Group.objects.get_or_create(name=name)
        permissions = [
            permission
            for permission in Permission.objects.filter(codename__in=[c for _, c in wanted]).select_related(
                "content_type"
            )
            if (permission.content_type.app_label, permission.codename) in wanted
        ]
        if len(permissions) == len(wanted):  # fewer only while the apps' tables are being created
            group.permissions.set(permissions)
        groups[name] = group
    return groups


def give_role(user, role: str) -> None:
    """Make ``user`` a viewer or an editor ("viewer" | "editor"), replacing the other role."""
    groups = ensure_roles()
    wanted = groups[ROLE_BY_NAME[role]]
    user.groups.remove(*[g for g in groups.values() if g != wanted])
    user.groups.add(wanted)
