"""POST /fit: fit a species' constants to assigned lines and answer the fit report; nothing is saved."""

from __future__ import annotations

import csv
import io
import re

from django.http import JsonResponse
from ninja import Router

from planner.catalogue.conversion import species_of_row, with_constants
from planner.catalogue.models import Species as SpeciesRow
from planner.engine import UndeterminedError, fit_constants
from planner.fitting.forms import FitForm
from planner.fitting.lines_file import REQUIRED_COLUMNS
from planner.fitting.report import fit_document
from planner.limits import FIT_MAX_ITERATIONS

from .errors import ERROR_RESPONSES, ApiError, form_error, invalid
from .schemas import FitIn, FitOut

router = Router(tags=["computations"])

#: Columns of the CSV written from JSON lines: the lines file's own (planner/fitting/lines_file.py).
CSV_COLUMNS = REQUIRED_COLUMNS + ("state", "note")
_ROW_PROBLEM = re.compile(r"^row (\d+), (\w+): ")
_LINE_PROBLEM = re.compile(r"^(lines\[\d+\])")


@router.post("/fit", response={200: FitOut, **ERROR_RESPONSES}, summary="Fit constants to assigned lines")
def fit_lines(request, body: FitIn):
    """Fit the constants named in `vary` to assigned lines given as `lines` or as the lines CSV text.

    Lines are read by the fit page's own rules (planner/fitting/forms.py, lines_file.py), its J cap
    and iteration limit (planner/limits.py) included.  The answer is the fit page's report:
    `constants` (`value_mhz`, `sigma_mhz`), `covariance_mhz2`, `correlation`,
    `residuals` (`obs_minus_calc_mhz`, outliers, blends),
    `weighted_rms`, `reduced_chi2` and the derived `structure`; `species_id` and `species_version`
    say which catalogue version was fitted.  A fit that does not converge answers 422.
    """
    row = with_constants(SpeciesRow.objects.filter(name=body.species)).first()
    if row is None:
        raise invalid(f"The catalogue has no species {body.species!r}.", "species")
    field = _lines_field(body)
    text = body.lines_csv if field == "lines_csv" else _csv_text(body)
    form = FitForm({"species": row.pk, "vary": ",".join(body.vary), "lines_text": text})
    if not form.is_valid():
        raise form_error(_api_names(form.errors, field))
    species = species_of_row(row)
    try:
        result = fit_constants(
            species, form.cleaned_data["lines"], form.cleaned_data["vary"], max_iterations=FIT_MAX_ITERATIONS
        )
    except ValueError as error:  # the engine names what is wrong: a constant, a line, a level
        raise _fit_refusal(str(error), field, isinstance(error, UndeterminedError)) from error
    except RuntimeError as error:  # no convergence: well-formed input that this fit cannot settle
        raise ApiError(422, f"Cannot fit: {error}") from error
    document = {"species_id": row.pk, "species_version": row.version, **fit_document(result, species)}
    return JsonResponse(document, json_dumps_params={"allow_nan": False})


def _lines_field(body: FitIn) -> str:
    if (body.lines is None) == (body.lines_csv is None):
        raise invalid("Give the assigned lines either as `lines` or as `lines_csv`, not both.", "lines")
    return "lines" if body.lines is not None else "lines_csv"


def _csv_text(body: FitIn) -> str:
    """JSON lines as the lines CSV, so that one reader checks them whichever way they came."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for line in body.lines:
        values = line.model_dump()
        writer.writerow([_cell(values[column]) for column in CSV_COLUMNS])
    return buffer.getvalue()


def _cell(value) -> str:
    if value is None:
        return ""
    return repr(value) if isinstance(value, float) else str(value)  # repr keeps every digit of a float


def _api_names(errors: dict, field: str) -> dict[str, list[str]]:
    """The fit form's errors under the API's names: a JSON line's problem goes to ``lines[i].column``."""
    named: dict[str, list[str]] = {}
    for name, problems in errors.items():
        for problem in problems:
            key = field if name in ("lines_text", "lines_file") else name
            match = _ROW_PROBLEM.match(problem)
            if key == "lines" and match:  # the CSV written from JSON lines has its header in row 1
                key, problem = f"lines[{int(match[1]) - 2}].{match[2]}", problem[match.end() :]
            named.setdefault(key, []).append(problem)
    return named


def _fit_refusal(message: str, field: str, undetermined: bool) -> ApiError:
    if undetermined or message.startswith(("cannot vary", "vary ")):
        name = "vary"
    else:
        match = _LINE_PROBLEM.match(message)
        name = match[1] if match and field == "lines" else field if match else None
    return ApiError(400, f"Cannot fit: {message}", {name: [message]} if name else None)
