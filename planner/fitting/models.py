"""A fit run: the lines, the varied constants and the result, kept so the catalogue can cite it."""

from __future__ import annotations

from django.conf import settings
from django.db import models

from planner.catalogue.models import Species


class FitRun(models.Model):
    species = models.ForeignKey(Species, null=True, on_delete=models.SET_NULL, related_name="fits")
    species_name = models.CharField(max_length=100)  # kept when the species is deleted
    species_version = models.PositiveIntegerField()  # the version the fit started from
    created_by = models.ForeignKey(settings.AUTH_USER_MODEL, null=True, on_delete=models.SET_NULL)
    created_at = models.DateTimeField(auto_now_add=True)
    lines_csv = models.TextField()  # the assigned lines exactly as given
    vary = models.JSONField()  # names of the fitted constants
    result = models.JSONField()  # FitResult.to_dict() plus the report text and structure
    saved_as_version = models.PositiveIntegerField(null=True, blank=True)

    class Meta:
        ordering = ["-created_at", "-id"]

    def __str__(self) -> str:
        return f"fit {self.pk} of {self.species_name}"
