"""`manage.py add_member NAME --role viewer|editor`: an account for a group member.

The password is asked for twice (or taken from --password-stdin), never from
the command line, where it would stay in the shell history.
"""

from __future__ import annotations

import getpass
import sys

from django.contrib.auth import get_user_model
from django.contrib.auth.password_validation import validate_password
from django.core.exceptions import ValidationError
from django.core.management.base import BaseCommand, CommandError

from planner.catalogue.roles import ROLE_BY_NAME, give_role


class Command(BaseCommand):
    help = "Create a group member's account (or change its role): viewers read the catalogue, editors change it."

    def add_arguments(self, parser):
        parser.add_argument("username")
        parser.add_argument("--role", choices=sorted(ROLE_BY_NAME), required=True)
        parser.add_argument("--password-stdin", action="store_true", help="read the password from standard input")

    def handle(self, *args, **options):
        user_model = get_user_model()
        user = user_model.objects.filter(username=options["username"]).first()
        created = user is None
        if created:
            user = user_model(username=options["username"])
            password = sys.stdin.readline().rstrip("\n") if options["password_stdin"] else self._ask_password()
            try:
                validate_password(password, user)
            except ValidationError as error:
                raise CommandError("password refused, no account created: " + " ".join(error.messages)) from error
            user.set_password(password)
            user.save()
        give_role(user, options["role"])
        verb = "created" if created else "updated"
        self.stdout.write(f"{verb} {user.get_username()!r} as {options['role']}")

    def _ask_password(self) -> str:
        first = getpass.getpass("Password: ")
        if first != getpass.getpass("Password (again): "):
            raise CommandError("the two passwords differ")
        return first
