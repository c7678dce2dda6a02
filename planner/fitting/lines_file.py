"""The assigned-lines CSV: one measured line per row, read all or nothing.

Columns (header required, any order): j_up, ka_up, kc_up, j_lo, ka_lo,
kc_lo, frequency_mhz, sigma_mhz, and optionally state, note, source (where
the measurement comes from) and date (when it was measured); source and date
are kept in the line's note.  K of a
symmetric top goes in ka_*; Ka and Kc stay blank for a linear molecule.
"""

from __future__ import annotations

import csv
import io
import math

from planner.engine.fitting import AssignedLine
from planner.limits import MAX_FIT_LINES, MAX_LINES_FIELD_CHARS

REQUIRED_COLUMNS = ("j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo", "frequency_mhz", "sigma_mhz")
OPTIONAL_COLUMNS = ("state", "note", "source", "date")


class LinesFileError(ValueError):
    """Every problem of a lines file, each naming its row and column."""

    def __init__(self, problems: list[str]):
        self.problems = problems
        super().__init__("\n".join(problems))


def _integer(text: str, row: int, column: str, problems: list[str], blank_ok: bool) -> int | None:
    text = text.strip()
    if not text:
        if not blank_ok:
            problems.append(f"row {row}, {column}: is required")
        return None
    try:
        value = int(text)
    except ValueError:
        problems.append(f"row {row}, {column}: must be a whole number, got {text!r}")
        return None
    if value < 0:
        problems.append(f"row {row}, {column}: must be >= 0, got {value}")
    return value


def _number(text: str, row: int, column: str, problems: list[str]) -> float | None:
    try:
        value = float(text.strip())
    except ValueError:
        problems.append(f"row {row}, {column}: must be a number [MHz], got {text.strip()!r}")
        return None
    if not math.isfinite(value):
        problems.append(f"row {row}, {column}: must be finite")
        return None
    return value


def read_lines(text: str) -> list[AssignedLine]:
    """The assigned lines of a CSV text; LinesFileError listing every problem.

    At most MAX_FIT_LINES rows and MAX_LINES_FIELD_CHARS characters per field (planner/limits.py):
    a bigger file is refused before anything is fitted.
    """
    if "\x00" in text:
        raise LinesFileError(["the file holds NUL bytes: it is not a CSV text file"])
    try:
        return _read_rows(text)
    except csv.Error as error:  # e.g. a field longer than the csv module's own limit
        raise LinesFileError([f"not a readable CSV file: {error}"]) from None


def _read_rows(text: str) -> list[AssignedLine]:
    reader = csv.DictReader(io.StringIO(text))
    header = [h.strip() for h in (reader.fieldnames or [])]
    missing = [c for c in REQUIRED_COLUMNS if c not in header]
    unknown = [c for c in header if c not in REQUIRED_COLUMNS + OPTIONAL_COLUMNS]
    if missing or unknown:
        problems = []
        if missing:
            problems.append(f"header: missing columns {', '.join(missing)}")
        if unknown:
            problems.append(
                f"header: unknown columns {', '.join(c[:40] for c in unknown)}; "
                f"allowed: {', '.join(REQUIRED_COLUMNS + OPTIONAL_COLUMNS)}"
            )
        raise LinesFileError(problems)
    lines, problems, rows_read = [], [], 0
    for row_number, raw in enumerate(reader, start=2):
        row = {key.strip(): (value or "") for key, value in raw.items() if key is not None}
        if not any(v.strip() for v in row.values()):
            continue
        rows_read += 1
        if rows_read > MAX_FIT_LINES:
            raise LinesFileError([f"more than {MAX_FIT_LINES} lines: fit at most {MAX_FIT_LINES} at once"])
        long = [key for key, value in row.items() if len(value) > MAX_LINES_FIELD_CHARS]
        if long:
            raise LinesFileError(
                [f"row {row_number}, {long[0]}: longer than {MAX_LINES_FIELD_CHARS} characters: not a lines file"]
            )
        numbers = {
            c: _integer(row[c], row_number, c, problems, blank_ok=c not in ("j_up", "j_lo"))
            for c in REQUIRED_COLUMNS[:6]
        }
        frequency = _number(row["frequency_mhz"], row_number, "frequency_mhz", problems)
        sigma = _number(row["sigma_mhz"], row_number, "sigma_mhz", problems)
        if sigma is not None and sigma <= 0:
            problems.append(f"row {row_number}, sigma_mhz: must be > 0 (the line's 1σ weight), got {sigma}")
        if not problems:
            lines.append(
                AssignedLine(
                    **numbers,
                    frequency_mhz=frequency,
                    sigma_mhz=sigma,
                    state=row.get("state", "").strip(),
                    note=" · ".join(
                        text for text in (row.get(key, "").strip() for key in ("note", "source", "date")) if text
                    ),
                )
            )
    if problems:
        raise LinesFileError(problems)
    if not lines:
        raise LinesFileError(["the file holds no lines"])
    return lines
