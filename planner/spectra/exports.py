"""CSV and JSON forms of a prediction: the one export shape used everywhere.

The `predict` command and the page's downloads both call these two functions,
so a file saved from the browser and one written on the command line carry the
same columns, in the same order, with the same numbers.
"""

from __future__ import annotations

import csv
import math
from typing import TextIO

from planner.engine import LINE_COLUMNS, Prediction, PredictionRequest

#: Export column order: exactly the engine's LINE_COLUMNS keys.
CSV_COLUMNS = tuple(LINE_COLUMNS)
JSON_FORMAT_VERSION = 1


def prediction_csv(prediction: Prediction, file: TextIO) -> None:
    """Write the lines as CSV: one header row of LINE_COLUMNS names, then one row per line.

    Undefined quantum numbers (None) are written as empty cells; floats keep
    their full precision (shortest text that reads back to the same number).
    """
    writer = csv.writer(file, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for record in prediction.records():
        writer.writerow(["" if record[name] is None else record[name] for name in CSV_COLUMNS])


def prediction_json(prediction: Prediction, request: PredictionRequest) -> dict:
    """The prediction as a JSON-ready dict (keys carry their units).

    Keys: ``request`` (the window, temperature and floor asked for),
    ``partition_function`` (Q(T) per species), ``j_max`` (highest J used per
    species), ``messages`` (why lines are missing, if they are), ``columns``
    (meaning and unit of every line field) and ``lines`` (one object per line,
    sorted by frequency).  Non-finite numbers become null, because JSON has no
    NaN or infinity.
    """
    return {
        "format_version": JSON_FORMAT_VERSION,
        "request": {
            "fmin_mhz": request.fmin_mhz,
            "fmax_mhz": request.fmax_mhz,
            "temperature_k": request.temperature_k,
            "min_intensity_nm2mhz": request.min_intensity_nm2mhz,
        },
        "partition_function": {name: finite_or_none(q) for name, q in prediction.partition_function.items()},
        "j_max": dict(prediction.j_max),
        "messages": list(prediction.messages),
        "columns": {name: meaning for name, (_, meaning) in LINE_COLUMNS.items()},
        "lines": [{name: finite_or_none(value) for name, value in record.items()} for record in prediction.records()],
    }


def finite_or_none(value):
    """The value, or None when it is a non-finite float (JSON has no NaN)."""
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value
