"""`manage.py fit` and the assigned-lines CSV: report, fitted catalogue with covariance, refusals."""

import io
import json

import pytest
from django.core.management import CommandError, call_command

from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue
from planner.fitting.lines_file import LinesFileError, read_lines

# CO J = 1-0 ... 5-4 frequencies, from memory (rounded to 0.1 kHz); σ = 0.5 kHz is test data.
CO_LINES = """j_up,ka_up,kc_up,j_lo,ka_lo,kc_lo,frequency_mhz,sigma_mhz,note
1,,,0,,,115271.2018,0.0005,from memory
2,,,1,,,230538.0000,0.0005,from memory
3,,,2,,,345795.9899,0.0005,from memory
4,,,3,,,461040.7682,0.0005,from memory
5,,,4,,,576267.9305,0.0005,from memory
"""


def run_fit(tmp_path, lines_text, *args):
    lines = tmp_path / "lines.csv"
    lines.write_text(lines_text)
    out = io.StringIO()
    call_command(
        "fit",
        "--catalogue",
        str(DEMO_CATALOGUE_PATH),
        "--species",
        "CO",
        "--lines",
        str(lines),
        *args,
        stdout=out,
        stderr=io.StringIO(),
    )
    return out.getvalue()


def test_report_gives_values_correlation_residuals_and_r0(tmp_path):
    report = run_fit(tmp_path, CO_LINES, "--vary", "B,D")
    assert "B " in report and "57635.96" in report
    assert "correlation" in report and "weighted RMS" in report and "reduced χ²" in report
    # r0(CO) ≈ 1.1309 Å (from memory) from B0 with the 12C and 16O masses.
    r0 = float(report.split("bond length r0 = ")[1].split()[0])
    assert r0 == pytest.approx(1.1309, abs=2e-4)


def test_fitted_catalogue_holds_values_sigma_and_covariance(tmp_path):
    output = tmp_path / "fitted.json"
    run_fit(tmp_path, CO_LINES, "--vary", "B,D", "--output", str(output))
    co = next(s for s in json.loads(output.read_text())["species"] if s["name"] == "CO")
    state = co["states"][0]
    b, sigma_b = state["constants_mhz"]["B"]
    d, _ = state["constants_mhz"]["D"]
    # Within the uncertainties of the constants recalled from memory (B 57635.968(1), D 0.18350(2) MHz).
    assert b == pytest.approx(57635.968, abs=0.001)
    assert d == pytest.approx(0.18350, abs=0.00002)
    assert 0 < sigma_b < 0.001
    covariance = state["covariance_mhz2"]
    assert covariance["names"] == ["B", "D"]
    assert covariance["matrix"][0][0] == pytest.approx(sigma_b**2)
    # The written file reads back, so predictions can use the correlated σ.
    assert {s.name for s in load_catalogue(output)} == {s.name for s in load_catalogue(DEMO_CATALOGUE_PATH)}


def test_an_outlier_is_flagged_in_the_report(tmp_path):
    shifted = CO_LINES.replace("345795.9899", "345796.0199")  # +30 kHz = 60σ
    report = run_fit(tmp_path, shifted, "--vary", "B,D")
    assert "OUTLIER" in report


def test_an_undetermined_constant_is_named(tmp_path):
    one_line = "\n".join(CO_LINES.splitlines()[:2]) + "\n"
    with pytest.raises(CommandError, match="cannot fit"):
        run_fit(tmp_path, one_line, "--vary", "B,D")


def test_lines_file_problems_name_row_and_column():
    with pytest.raises(LinesFileError) as raised:
        read_lines("j_up,ka_up,kc_up,j_lo,ka_lo,kc_lo,frequency_mhz,sigma_mhz\nx,,,0,,,115271.2,0\n")
    assert raised.value.problems == [
        "row 2, j_up: must be a whole number, got 'x'",
        "row 2, sigma_mhz: must be > 0 (the line's 1σ weight), got 0.0",
    ]
    with pytest.raises(LinesFileError, match="missing columns sigma_mhz"):
        read_lines("j_up,ka_up,kc_up,j_lo,ka_lo,kc_lo,frequency_mhz\n")


def test_unknown_species_is_a_command_error(tmp_path):
    lines = tmp_path / "l.csv"
    lines.write_text(CO_LINES)
    with pytest.raises(CommandError, match="no species 'XX'"):
        call_command(
            "fit",
            "--catalogue",
            str(DEMO_CATALOGUE_PATH),
            "--species",
            "XX",
            "--lines",
            str(lines),
            "--vary",
            "B",
            stdout=io.StringIO(),
        )


def test_source_and_date_columns_travel_with_the_line():
    text = "j_up,ka_up,kc_up,j_lo,ka_lo,kc_lo,frequency_mhz,sigma_mhz,note,source,date\n"
    text += "1,,,0,,,115271.2018,0.0005,weak,cell run 3,2026-11-30\n"
    (line,) = read_lines(text)
    assert line.note == "weak · cell run 3 · 2026-11-30"
