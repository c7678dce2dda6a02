"""`manage.py api_token USERNAME`: a token for scripts that call /api/v1/ (printed once, stored hashed).

    python manage.py api_token vera --label "night scripts"   # prints a new token
    python manage.py api_token vera --list                     # the user's tokens, none shown
    python manage.py api_token vera --revoke                   # every active token of vera stops working

A script sends it as ``Authorization: Bearer <token>``; it acts with the
user's role (viewers and editors may read, predict, plan and fit).
"""

from __future__ import annotations

from django.contrib.auth import get_user_model
from django.core.management.base import BaseCommand, CommandError

from planner.api.models import LABEL_LENGTH, ApiToken
from planner.api.tokens import create_token, revoke_tokens


class Command(BaseCommand):
    help = "Create an API token for a user (printed once), list the user's tokens, or revoke them all."

    def add_arguments(self, parser):
        parser.add_argument("username")
        parser.add_argument("--label", default="", help="what the token is for (shown by --list)")
        action = parser.add_mutually_exclusive_group()
        action.add_argument("--revoke", action="store_true", help="revoke every active token of the user")
        action.add_argument("--list", action="store_true", help="list the user's tokens (never the tokens themselves)")

    def handle(self, *args, **options):
        user = get_user_model().objects.filter(username=options["username"]).first()
        if user is None:
            raise CommandError(f"no user {options['username']!r}")
        if options["revoke"]:
            count = revoke_tokens(user)
            self.stderr.write(f"revoked {count} token{'s' if count != 1 else ''} of {user.username}")
            return
        if options["list"]:
            for row in ApiToken.objects.filter(user=user):
                used = row.last_used_at.isoformat(timespec="seconds") if row.last_used_at else "never"
                state = f"revoked {row.revoked_at:%Y-%m-%d}" if row.revoked_at else "active"
                self.stdout.write(
                    f"{row.pk}\t{state}\tcreated {row.created_at:%Y-%m-%d}\tlast used {used}\t{row.label}"
                )
            return
        if len(options["label"]) > LABEL_LENGTH:
            raise CommandError(f"--label is longer than {LABEL_LENGTH} characters")
        if not user.is_active:
            raise CommandError(f"{user.username} is not an active account")
        _, token = create_token(user, options["label"])
        self.stderr.write(f"token for {user.username}: it is shown only now; keep it secret")
        self.stdout.write(token)
