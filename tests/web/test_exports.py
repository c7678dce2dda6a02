"""The one export shape: CSV and JSON of a prediction (no database, no engine run)."""

import csv
import io
import json
import math

import numpy as np

from planner.engine import LINE_COLUMNS, LineTable, Prediction, PredictionRequest
from planner.spectra.exports import prediction_csv, prediction_json


def _two_line_prediction() -> Prediction:
    """Synthetic input, no source: one asymmetric-top line and one linear line (Ka, Kc undefined = -1)."""
    values = {
        "species": ["X", "Y"],
        "state": ["v=0", "v=0"],
        "frequency_mhz": [1000.125, 2000.5],
        "sigma_mhz": [0.01, math.nan],
        "j_up": [1, 2],
        "ka_up": [1, -1],
        "kc_up": [0, -1],
        "j_lo": [0, 1],
        "ka_lo": [0, -1],
        "kc_lo": [0, -1],
        "dipole_type": ["b", "a"],
    }
    columns = {}
    for name, (dtype, _) in LINE_COLUMNS.items():
        if name in values:
            columns[name] = np.array(values[name], dtype=object if dtype == "U" else dtype)
        else:
            columns[name] = np.array([0.5, 0.25], dtype="f8")
    return Prediction(
        lines=LineTable(columns),
        temperature_k=10.0,
        fmin_mhz=0.0,
        fmax_mhz=3000.0,
        partition_function={"X": 12.5, "Y": 3.0},
        j_max={"X": 4, "Y": 6},
        messages=["a note"],
    )


def test_csv_header_is_exactly_the_line_columns_in_order():
    buffer = io.StringIO()
    prediction_csv(_two_line_prediction(), buffer)
    rows = list(csv.reader(io.StringIO(buffer.getvalue())))
    assert rows[0] == list(LINE_COLUMNS)
    assert len(rows) == 3


def test_csv_leaves_undefined_quantum_numbers_blank_and_keeps_full_precision():
    buffer = io.StringIO()
    prediction_csv(_two_line_prediction(), buffer)
    header, first, second = csv.reader(io.StringIO(buffer.getvalue()))
    first, second = dict(zip(header, first)), dict(zip(header, second))
    assert (first["j_up"], first["ka_up"], first["kc_up"]) == ("1", "1", "0")
    assert (second["j_up"], second["ka_up"], second["kc_up"], second["ka_lo"]) == ("2", "", "", "")
    assert float(first["frequency_mhz"]) == 1000.125


def test_json_holds_request_q_j_max_messages_and_lines():
    request = PredictionRequest(fmin_mhz=0.0, fmax_mhz=3000.0, temperature_k=10.0, min_intensity_nm2mhz=1e-9)
    document = prediction_json(_two_line_prediction(), request)
    assert document["request"] == {
        "fmin_mhz": 0.0,
        "fmax_mhz": 3000.0,
        "temperature_k": 10.0,
        "min_intensity_nm2mhz": 1e-9,
    }
    assert document["partition_function"] == {"X": 12.5, "Y": 3.0}
    assert document["j_max"] == {"X": 4, "Y": 6}
    assert document["messages"] == ["a note"]
    assert list(document["columns"]) == list(LINE_COLUMNS)
    assert [line["frequency_mhz"] for line in document["lines"]] == [1000.125, 2000.5]
    assert document["lines"][1]["ka_up"] is None


def test_json_turns_nan_into_null_so_the_text_is_valid_json():
    request = PredictionRequest(fmin_mhz=0.0, fmax_mhz=3000.0, temperature_k=10.0)
    text = json.dumps(prediction_json(_two_line_prediction(), request), allow_nan=False)
    assert json.loads(text)["lines"][1]["sigma_mhz"] is None
