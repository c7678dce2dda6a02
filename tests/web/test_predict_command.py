"""`manage.py predict`: CSV/JSON output, and errors that exit non-zero and write nothing."""

import csv
import io
import json
import subprocess
import sys
from pathlib import Path

import pytest
from django.core.management import CommandError, call_command

from planner.catalogue_file import DEMO_CATALOGUE_PATH
from planner.engine import LINE_COLUMNS, PredictionRequest, predict_many

REPO = Path(__file__).resolve().parents[2]
WINDOW = ["--fmin", "0", "--fmax", "120000", "--temperature", "50"]


def run_predict(*arguments: str) -> str:
    out = io.StringIO()
    call_command("predict", *arguments, stdout=out, stderr=io.StringIO())
    return out.getvalue()


def test_csv_to_stdout_has_the_line_columns_and_rows_sorted_by_frequency(demo_with_lines):
    species, _ = demo_with_lines
    text = run_predict("--catalogue", str(DEMO_CATALOGUE_PATH), "--species", species.name, *WINDOW)
    header, *rows = list(csv.reader(io.StringIO(text)))
    assert header == list(LINE_COLUMNS)
    frequencies = [float(row[header.index("frequency_mhz")]) for row in rows]
    assert frequencies == sorted(frequencies)
    expected = predict_many([species], PredictionRequest(fmin_mhz=0.0, fmax_mhz=120000.0, temperature_k=50.0))
    assert len(rows) == len(expected.lines)
    assert {row[0] for row in rows} == {species.name}


def test_several_species_are_merged_in_frequency_order(demo_species):
    names = [s.name for s in demo_species if s.has_dipole][:2]
    text = run_predict("--catalogue", str(DEMO_CATALOGUE_PATH), "--species", *names, *WINDOW)
    header, *rows = list(csv.reader(io.StringIO(text)))
    frequencies = [float(row[header.index("frequency_mhz")]) for row in rows]
    assert frequencies == sorted(frequencies)
    assert {row[0] for row in rows} <= set(names)


def test_json_output_file_holds_request_q_j_max_messages_and_lines(demo_with_lines, tmp_path, assert_json_matches):
    species, prediction = demo_with_lines
    output = tmp_path / "lines.json"
    text = run_predict(
        "--catalogue", str(DEMO_CATALOGUE_PATH), "--species", species.name, *WINDOW,
        "--min-intensity", "0", "--format", "json", "--output", str(output),
    )  # fmt: skip
    assert text == ""  # nothing on stdout when --output is given
    document = json.loads(output.read_text(encoding="utf-8"))
    assert_json_matches(document, prediction)


def test_unknown_species_is_a_command_error_naming_it():
    with pytest.raises(CommandError, match="unknown species 'Unobtainium'"):
        run_predict("--catalogue", str(DEMO_CATALOGUE_PATH), "--species", "Unobtainium", *WINDOW)


def test_broken_catalogue_lists_every_problem_and_writes_no_file(write_catalogue, broken_entries, tmp_path):
    from_entries = write_catalogue({"format": "linecast-catalogue", "version": 1, "species": broken_entries})
    output = tmp_path / "out" / "lines.csv"
    output.parent.mkdir()
    with pytest.raises(CommandError) as raised:
        run_predict("--catalogue", str(from_entries), *WINDOW, "--output", str(output))
    message = str(raised.value)
    assert "NegativeB" in message and "Wobbly" in message
    assert list(output.parent.iterdir()) == []


def test_missing_catalogue_file_is_a_command_error(tmp_path):
    with pytest.raises(CommandError, match="no such file"):
        run_predict("--catalogue", str(tmp_path / "absent.json"), *WINDOW)


def test_bad_request_is_a_command_error_and_writes_no_file(tmp_path):
    output = tmp_path / "lines.csv"
    arguments = ["--fmin", "5000", "--fmax", "1000", "--temperature", "50", "--output", str(output)]
    with pytest.raises(CommandError, match=r"fmax_mhz \(1000.0\) must be above fmin_mhz \(5000.0\)"):
        run_predict("--catalogue", str(DEMO_CATALOGUE_PATH), *arguments)
    assert list(tmp_path.iterdir()) == []


def test_an_existing_output_file_survives_a_failed_run(tmp_path):
    output = tmp_path / "lines.csv"
    output.write_text("earlier result\n", encoding="utf-8")
    with pytest.raises(CommandError):
        run_predict("--catalogue", str(DEMO_CATALOGUE_PATH), "--fmin", "0", "--fmax", "1000", "--temperature", "-4",
                    "--output", str(output))  # fmt: skip
    assert output.read_text(encoding="utf-8") == "earlier result\n"
    assert list(tmp_path.iterdir()) == [output]


def test_command_line_exits_non_zero_with_the_problem_on_stderr():
    result = subprocess.run(
        [sys.executable, "manage.py", "predict", "--catalogue", str(DEMO_CATALOGUE_PATH), "--species", "Unobtainium",
         *WINDOW],
        cwd=REPO, capture_output=True, text=True, timeout=120,
    )  # fmt: skip
    assert result.returncode != 0
    assert "unknown species 'Unobtainium'" in result.stderr
    assert result.stdout == ""
