"""The two roles of a group member: viewers read the catalogue, editors change it.

Roles are Django groups holding the model permissions; staff use the admin.
"""

from __future__ import annotations

from django.contrib.auth.models import Group, Permission

VIEWERS = "Viewers"
EDITORS = "Editors"

#: Permission codenames of each role on the catalogue models.
ROLE_PERMISSIONS = {
    VIEWERS: ("view_species",),
    EDITORS: ("view_species", "add_species", "change_species", "delete_species"),
}
ROLE_BY_NAME = {"viewer": VIEWERS, "editor": EDITORS}


def ensure_roles(**kwargs) -> dict[str, Group]:
    """Create the role groups with their permissions (idempotent; runs after every migrate)."""
    groups = {}
    for name, codenames in ROLE_PERMISSIONS.items():
        group, _ = Group.objects.get_or_create(name=name)
        permissions = Permission.objects.filter(content_type__app_label="catalogue", codename__in=codenames)
        if permissions.count() == len(codenames):  # absent only while the catalogue tables are being created
            group.permissions.set(permissions)
        groups[name] = group
    return groups


def give_role(user, role: str) -> None:
    """Make ``user`` a viewer or an editor ("viewer" | "editor"), replacing the other role."""
    groups = ensure_roles()
    wanted = groups[ROLE_BY_NAME[role]]
    user.groups.remove(*[g for g in groups.values() if g != wanted])
    user.groups.add(wanted)
