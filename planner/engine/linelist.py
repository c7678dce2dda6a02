"""The one result shape of a prediction, shared by pages, exports and the API.

A :class:`Prediction` holds a :class:`LineTable` (columns of equal length,
one row per line, sorted by frequency) plus what a reader needs to trust it:
the partition function used, the highest J computed and, when there are no
lines, the reason.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

#: Column name -> (dtype, meaning with unit).  Order is the export order.
LINE_COLUMNS: dict[str, tuple[str, str]] = {
    "species": ("O", "species name"),
    "state": ("O", "label of the vibrational state the line belongs to"),
    "frequency_mhz": ("f8", "line frequency [MHz]"),
    "sigma_mhz": ("f8", "1σ uncertainty of the frequency from the constants' 1σ [MHz]"),
    "j_up": ("i8", "J of the upper level"),
    "ka_up": ("i8", "Ka of the upper level (K for symmetric tops; -1 = undefined)"),
    "kc_up": ("i8", "Kc of the upper level (-1 = undefined)"),
    "j_lo": ("i8", "J of the lower level"),
    "ka_lo": ("i8", "Ka of the lower level (K for symmetric tops; -1 = undefined)"),
    "kc_lo": ("i8", "Kc of the lower level (-1 = undefined)"),
    "dipole_type": ("O", "a, b or c: the dipole component that carries the line"),
    "el_cm1": ("f8", "lower-level energy above the species' lowest level [cm^-1]"),
    "eu_cm1": ("f8", "upper-level energy above the species' lowest level [cm^-1]"),
    "el_k": ("f8", "lower-level energy / k [K]"),
    "eu_k": ("f8", "upper-level energy / k [K]"),
    "line_strength": ("f8", "line strength S of the dipole component, per K component of a symmetric top"),
    "s_mu2_d2": ("f8", "S·μ², per K component of a symmetric top [D^2]"),
    "spin_weight": ("f8", "nuclear-spin statistical weight g_I of the levels"),
    "einstein_a_s": ("f8", "Einstein A coefficient [s^-1]"),
    "intensity_nm2mhz": (
        "f8",
        "integrated intensity per molecule at the temperature, spin weight and ±K degeneracy included [nm^2 MHz]",
    ),
    "doppler_fwhm_mhz": ("f8", "Doppler full width at half maximum at the temperature [MHz]"),
    "vib_energy_cm1": (
        "f8",
        "energy of the line's vibrational state above the lowest one (0: no satellite) [cm^-1]",
    ),
    "hfs_low_mhz": ("f8", "offset of the lowest hyperfine component of >= 1 % of the line (0 without) [MHz]"),
    "hfs_high_mhz": ("f8", "offset of the highest hyperfine component of >= 1 % of the line (0 without) [MHz]"),
    "hfs_coupling_up_mhz": ("f8", "quadrupole coupling X_J of the upper level, E_Q(F) = X_J·Y(J,I,F) [MHz]"),
    "hfs_coupling_lo_mhz": ("f8", "quadrupole coupling X_J of the lower level [MHz]"),
}

#: Columns whose -1 means "undefined" and that exports leave blank.
QUANTUM_NUMBER_COLUMNS = ("j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo")


@dataclass
class LineTable:
    """Columns of equal length keyed by :data:`LINE_COLUMNS` names."""

    columns: dict[str, np.ndarray]

    @classmethod
    def empty(cls) -> "LineTable":
        return cls({name: np.zeros(0, dtype=dtype) for name, (dtype, _) in LINE_COLUMNS.items()})

    def __len__(self) -> int:
        return len(self.columns["frequency_mhz"])

    def __getitem__(self, name: str) -> np.ndarray:
        return self.columns[name]

    def take(self, index) -> "LineTable":
        """Rows selected by an index array or boolean mask."""
        return LineTable({name: values[index] for name, values in self.columns.items()})

    @classmethod
    def concatenate(cls, tables: list["LineTable"]) -> "LineTable":
        """Join tables (each sorted by frequency) into one sorted by frequency."""
        tables = [t for t in tables if len(t)]
        if not tables:
            return cls.empty()
        if len(tables) == 1:
            return tables[0]
        joined = {name: np.concatenate([t.columns[name] for t in tables]) for name in LINE_COLUMNS}
        order = np.argsort(joined["frequency_mhz"], kind="stable")
        return cls({name: values[order] for name, values in joined.items()})

    def records(self) -> list[dict]:
        """Rows as plain dicts (Python scalars; undefined quantum numbers as None)."""
        rows = []
        names = list(LINE_COLUMNS)
        lists = [self.columns[name].tolist() for name in names]
        for values in zip(*lists):
            row = dict(zip(names, values))
            for name in QUANTUM_NUMBER_COLUMNS:
                if row[name] < 0:
                    row[name] = None
            rows.append(row)
        return rows


@dataclass
class Prediction:
    """Lines of one species (or several, after :func:`merge`) for one request.

    ``partition_function`` is Q(T) per species name; ``j_max`` the highest J
    whose levels entered the line list, per species; ``intensity_floor`` the
    floor the lines were cut at [nm² MHz], per species; ``messages`` explains
    empty or truncated results in words for the user.
    """

    lines: LineTable
    temperature_k: float
    fmin_mhz: float
    fmax_mhz: float
    partition_function: dict[str, float] = field(default_factory=dict)
    j_max: dict[str, int] = field(default_factory=dict)
    intensity_floor: dict[str, float] = field(default_factory=dict)
    messages: list[str] = field(default_factory=list)

    def records(self) -> list[dict]:
        return self.lines.records()


def merge(predictions: list[Prediction]) -> Prediction:
    """Combine predictions of several species for the same request."""
    if not predictions:
        raise ValueError("merge needs at least one prediction")
    first = predictions[0]
    merged = Prediction(
        lines=LineTable.concatenate([p.lines for p in predictions]),
        temperature_k=first.temperature_k,
        fmin_mhz=first.fmin_mhz,
        fmax_mhz=first.fmax_mhz,
    )
    for p in predictions:
        merged.partition_function.update(p.partition_function)
        merged.j_max.update(p.j_max)
        merged.intensity_floor.update(p.intensity_floor)
        merged.messages.extend(p.messages)
    return merged
