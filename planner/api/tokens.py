"""Create, find and revoke API tokens (the plain token is shown once and never stored)."""

from __future__ import annotations

import hashlib
import secrets

from django.utils import timezone

from .models import ApiToken

#: Bytes of randomness in a token: 32 bytes = 256 bits (text of 43 URL-safe characters).
TOKEN_BYTES = 32
#: Longest Authorization value worth hashing; a token is 43 characters (common practice, no source).
MAX_TOKEN_LENGTH = 200


def token_hash(token: str) -> str:
    """Hex SHA-256 of the token text, the form kept in the database."""
    return hashlib.sha256(token.encode("utf-8", "surrogatepass")).hexdigest()


def create_token(user, label: str = "") -> tuple[ApiToken, str]:
    """A new token for ``user``: (its row, the plain token to show once)."""
    token = secrets.token_urlsafe(TOKEN_BYTES)
    row = ApiToken.objects.create(user=user, label=label, key_sha256=token_hash(token))
    return row, token


def revoke_tokens(user) -> int:
    """Revoke every active token of ``user``; how many were revoked."""
    return ApiToken.objects.filter(user=user, revoked_at__isnull=True).update(revoked_at=timezone.now())


def user_of_token(token: str):
    """The active user whose active token this is, or None."""
    if not token or len(token) > MAX_TOKEN_LENGTH:
        return None
    row = (
        ApiToken.objects.select_related("user")
        .filter(key_sha256=token_hash(token), revoked_at__isnull=True, user__is_active=True)
        .first()
    )
    if row is None:
        return None
    ApiToken.objects.filter(pk=row.pk).update(last_used_at=timezone.now())
    return row.user
