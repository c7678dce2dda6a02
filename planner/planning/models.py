"""Instrument profiles and saved plans.

A saved plan keeps a frozen copy of its inputs and results (JSON, exactly what
the operator got) and the catalogue versions it was computed from, so that a
plan reprinted next month is the same plan, with a notice when the catalogue
has moved on since.
"""

from __future__ import annotations

from django.conf import settings
from django.db import models
from django.db.models import Q
from simple_history.models import HistoricalRecords

MODEL_CHOICES = [
    ("absorption-cell", "absorption cell (peak absorption, noise-equivalent absorption)"),
    ("relative", "relative (abundance × intensity, detection floor)"),
]


class Instrument(models.Model):
    name = models.CharField(max_length=100, unique=True)
    fmin_mhz = models.FloatField("lowest frequency [MHz]")
    fmax_mhz = models.FloatField("highest frequency [MHz]")
    setting_width_mhz = models.FloatField("instantaneous bandwidth of one setting [MHz]")
    channel_width_mhz = models.FloatField("channel width [MHz]")
    retune_overhead_s = models.FloatField("retuning overhead per setting [s]", default=10.0)
    model_kind = models.CharField("sensitivity model", max_length=20, choices=MODEL_CHOICES, default="relative")
    # absorption cell
    path_length_cm = models.FloatField("path length [cm]", null=True, blank=True)
    noise_absorption_per_sqrt_hz = models.FloatField(
        "noise-equivalent absorption [Hz^-1/2]", null=True, blank=True, help_text="fractional absorption noise in 1 s"
    )
    pressure_pa = models.FloatField("default sample pressure [Pa]", null=True, blank=True)
    broadening_khz_per_pa = models.FloatField("default pressure broadening [kHz/Pa] (HWHM)", null=True, blank=True)
    # relative model
    detection_floor_1s = models.FloatField(
        "detection floor in 1 s [nm² MHz]", null=True, blank=True, help_text="abundance × intensity giving SNR 1 in 1 s"
    )
    notes = models.TextField(blank=True, default="")
    history = HistoricalRecords()

    class Meta:
        ordering = ["name"]
        constraints = [
            models.CheckConstraint(condition=Q(fmax_mhz__gt=models.F("fmin_mhz")), name="instrument_window_ordered"),
            models.CheckConstraint(condition=Q(setting_width_mhz__gt=0), name="instrument_setting_width_positive"),
            models.CheckConstraint(condition=Q(channel_width_mhz__gt=0), name="instrument_channel_positive"),
            models.CheckConstraint(condition=Q(retune_overhead_s__gte=0), name="instrument_overhead_not_negative"),
        ]

    def __str__(self) -> str:
        return self.name


class SavedPlan(models.Model):
    name = models.CharField(max_length=200)
    created_by = models.ForeignKey(settings.AUTH_USER_MODEL, null=True, on_delete=models.SET_NULL)
    created_at = models.DateTimeField(auto_now_add=True)
    # Frozen copies: everything needed to recompute, and what was computed.
    inputs = models.JSONField()
    result = models.JSONField()
    # {species name: [species id, version]} of every catalogue species the plan read (chosen ones and blend checks).
    catalogue_versions = models.JSONField()

    class Meta:
        ordering = ["-created_at", "-id"]

    def __str__(self) -> str:
        return self.name
