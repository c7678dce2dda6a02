"""API tokens: a user's key for scripts, kept only as its SHA-256 so a database leak reveals no token."""

from __future__ import annotations

from django.conf import settings
from django.db import models

LABEL_LENGTH = 100


class ApiToken(models.Model):
    user = models.ForeignKey(settings.AUTH_USER_MODEL, on_delete=models.CASCADE, related_name="api_tokens")
    label = models.CharField(max_length=LABEL_LENGTH, blank=True, default="")
    # Hex SHA-256 of the token text: the token is random (256 bits), so a plain hash is enough
    # and lets a request find its token with one indexed lookup.
    key_sha256 = models.CharField(max_length=64, unique=True)
    created_at = models.DateTimeField(auto_now_add=True)
    last_used_at = models.DateTimeField(null=True, blank=True)
    revoked_at = models.DateTimeField(null=True, blank=True)

    class Meta:
        ordering = ["-created_at"]

    def __str__(self):
        state = "revoked" if self.revoked_at else "active"
        return f"token {self.pk} of {self.user} ({state})"
