"""Demo instrument profiles of the invented Orrin Hollow group (invented numbers, for trying Linecast out)."""

from __future__ import annotations

from .models import Instrument

#: Invented for the demo scenario, not measured on any instrument.
DEMO_INSTRUMENTS = (
    {
        "name": "Orrin Hollow W-band cell",
        "fmin_mhz": 75_000.0,
        "fmax_mhz": 110_000.0,
        "setting_width_mhz": 500.0,
        "channel_width_mhz": 0.05,
        "retune_overhead_s": 20.0,
        "model_kind": "absorption-cell",
        "path_length_cm": 200.0,
        "noise_absorption_per_sqrt_hz": 1e-5,
        "pressure_pa": 2.0,
        "broadening_khz_per_pa": 25.0,
        "notes": "Demo (invented): a 2 m glass cell with a frequency-multiplied source and a diode detector.",
    },
    {
        "name": "Orrin Hollow survey receiver",
        "fmin_mhz": 1_000.0,
        "fmax_mhz": 1_000_000.0,
        "setting_width_mhz": 4_000.0,
        "channel_width_mhz": 0.25,
        "retune_overhead_s": 60.0,
        "model_kind": "relative",
        "detection_floor_1s": 1e-5,
        "notes": "Demo (invented): a broadband receiver whose sensitivity is known only relatively.",
    },
)


def load_demo_instruments() -> list[str]:
    """Create the demo profiles that do not exist yet; their names."""
    created = []
    for values in DEMO_INSTRUMENTS:
        _, made = Instrument.objects.get_or_create(name=values["name"], defaults=values)
        if made:
            created.append(values["name"])
    return created
