"""The catalogue's management commands: load_demo, add_member, export_catalogue errors, predict from the database."""

import csv
import io
import re
import sys

import pytest
from django.contrib.auth import authenticate, get_user_model
from django.core.management import CommandError, call_command

from planner.catalogue.models import Constant, Species, State
from planner.catalogue.roles import EDITORS, VIEWERS
from planner.catalogue.store import export_species
from planner.catalogue_file import catalogue_to_dict
from planner.engine import LINE_COLUMNS, PredictionRequest, predict_many

#: Species in the demo catalogue (planner/demo/catalogue.json; demo data, invented).
DEMO_SPECIES_COUNT = 23

#: A password for test accounts only (no source), long enough for any sensible rule.
GOOD_PASSWORD = "absorption-cell-42"

#: Far shorter than any password rule allows (Django's usual minimum is 8 characters).
SHORT_PASSWORD = "ab"


def _run(name: str, *arguments: str) -> tuple[str, str]:
    out, err = io.StringIO(), io.StringIO()
    call_command(name, *arguments, stdout=out, stderr=err)
    return out.getvalue(), err.getvalue()


def _counts() -> dict[str, int]:
    return {
        "species": Species.objects.count(),
        "states": State.objects.count(),
        "constants": Constant.objects.count(),
        "species history": Species.history.count(),
        "states history": State.history.count(),
        "constants history": Constant.history.count(),
        "users": get_user_model().objects.count(),
    }


def _roles(username: str) -> set[str]:
    return set(get_user_model().objects.get(username=username).groups.values_list("name", flat=True))


# --- load_demo -----------------------------------------------------------------------------------------------


def test_load_demo_fills_an_empty_catalogue_and_makes_a_demo_editor_whose_password_works(db, demo_species):
    assert Species.objects.count() == 0
    out, _ = _run("load_demo")
    assert Species.objects.count() == DEMO_SPECIES_COUNT
    assert export_species() == sorted(demo_species, key=lambda s: s.name)
    assert f"{DEMO_SPECIES_COUNT} new, 0 updated, 0 unchanged" in out

    match = re.search(r"user name 'demo', password '([^']+)'", out)
    assert match, out
    user = authenticate(username="demo", password=match[1])
    assert user is not None
    assert _roles("demo") == {EDITORS}
    assert user.has_perm("catalogue.change_species")
    assert authenticate(username="demo", password=match[1] + "x") is None


def test_load_demo_twice_gives_the_demo_account_a_new_password(db):
    first, _ = _run("load_demo")
    second, _ = _run("load_demo")
    old, new = (re.search(r"password '([^']+)'", text)[1] for text in (first, second))
    assert old != new
    assert authenticate(username="demo", password=new) is not None
    assert authenticate(username="demo", password=old) is None
    assert f"0 new, 0 updated, {DEMO_SPECIES_COUNT} unchanged" in second
    assert get_user_model().objects.filter(username="demo").count() == 1


def test_load_demo_if_empty_leaves_a_catalogue_with_species_alone(use_catalogue, co2_entry):
    use_catalogue(co2_entry)
    before = _counts()
    out, _ = _run("load_demo", "--if-empty")
    assert "catalogue already holds species: demo not loaded" in out
    assert "password" not in out
    assert _counts() == before
    assert [s.name for s in export_species()] == ["CO2"]
    assert not get_user_model().objects.filter(username="demo").exists()


def test_load_demo_if_empty_loads_into_an_empty_catalogue(db):
    out, _ = _run("load_demo", "--if-empty")
    assert Species.objects.count() == DEMO_SPECIES_COUNT
    assert "password" in out


# --- add_member ----------------------------------------------------------------------------------------------


def _stdin(monkeypatch, text: str) -> None:
    monkeypatch.setattr(sys, "stdin", io.StringIO(text))


def test_add_member_creates_a_viewer_whose_password_works(db, monkeypatch):
    _stdin(monkeypatch, GOOD_PASSWORD + "\n")
    out, _ = _run("add_member", "petra", "--role", "viewer", "--password-stdin")
    assert "created 'petra' as viewer" in out
    user = authenticate(username="petra", password=GOOD_PASSWORD)
    assert user is not None
    assert _roles("petra") == {VIEWERS}
    assert user.has_perm("catalogue.view_species")
    assert not user.has_perm("catalogue.change_species")


def test_add_member_refuses_a_too_short_password_and_creates_no_account(db, monkeypatch):
    _stdin(monkeypatch, SHORT_PASSWORD + "\n")
    with pytest.raises(CommandError, match="password refused, no account created"):
        _run("add_member", "petra", "--role", "viewer", "--password-stdin")
    assert not get_user_model().objects.filter(username="petra").exists()


def test_add_member_refuses_an_empty_password_and_creates_no_account(db, monkeypatch):
    _stdin(monkeypatch, "\n")
    with pytest.raises(CommandError, match="password refused, no account created"):
        _run("add_member", "petra", "--role", "viewer", "--password-stdin")
    assert not get_user_model().objects.filter(username="petra").exists()


def test_add_member_again_with_another_role_changes_the_role_and_keeps_the_password(db, monkeypatch):
    _stdin(monkeypatch, GOOD_PASSWORD + "\n")
    _run("add_member", "petra", "--role", "viewer", "--password-stdin")
    _stdin(monkeypatch, "a-different-password-9\n")  # not read: the account exists
    out, _ = _run("add_member", "petra", "--role", "editor", "--password-stdin")
    assert "updated 'petra' as editor" in out
    assert _roles("petra") == {EDITORS}  # the viewer role is gone
    user = authenticate(username="petra", password=GOOD_PASSWORD)
    assert user is not None and user.has_perm("catalogue.change_species")
    assert get_user_model().objects.filter(username="petra").count() == 1


def test_add_member_rejects_an_unknown_role(db, monkeypatch):
    _stdin(monkeypatch, GOOD_PASSWORD + "\n")
    with pytest.raises(CommandError, match="invalid choice: 'admin'"):
        _run("add_member", "petra", "--role", "admin", "--password-stdin")
    assert not get_user_model().objects.filter(username="petra").exists()


# --- export_catalogue ----------------------------------------------------------------------------------------


def test_export_into_a_folder_that_does_not_exist_is_a_command_error_and_writes_nothing(demo_in_db, tmp_path):
    target = tmp_path / "absent" / "catalogue.json"
    with pytest.raises(CommandError, match="does not exist"):
        _run("export_catalogue", "--output", str(target))
    assert list(tmp_path.iterdir()) == []


def test_export_of_an_empty_catalogue_is_a_valid_empty_file(db, tmp_path):
    target = tmp_path / "empty.json"
    _, err = _run("export_catalogue", "--output", str(target))
    assert "wrote 0 species" in err
    assert target.read_text(encoding="utf-8").startswith("{")
    out, _ = _run("import_catalogue", str(target))
    assert "0 new, 0 updated, 0 unchanged (0 species in the file)" in out


# --- predict reads the database ------------------------------------------------------------------------------

PREDICT_WINDOW = ["--fmin", "0", "--fmax", "100000", "--temperature", "300"]


def _predicted_rows(*arguments: str) -> tuple[list[str], list[list[str]]]:
    out, _ = _run("predict", *arguments, *PREDICT_WINDOW)
    header, *rows = list(csv.reader(io.StringIO(out)))
    return header, rows


def _predicted_frequencies(*arguments: str) -> list[float]:
    header, rows = _predicted_rows(*arguments)
    return [float(row[header.index("frequency_mhz")]) for row in rows]


def test_predict_without_catalogue_uses_the_database_catalogue(demo_in_db):
    header, rows = _predicted_rows("--species", "OCS")
    assert header == list(LINE_COLUMNS)
    assert rows and {row[0] for row in rows} == {"OCS"}
    ocs = next(s for s in export_species() if s.name == "OCS")
    expected = predict_many([ocs], PredictionRequest(fmin_mhz=0.0, fmax_mhz=100000.0, temperature_k=300.0))
    assert len(rows) == len(expected.lines)


def test_predict_without_catalogue_follows_an_edit_of_the_database(demo_in_db, demo_species, write_catalogue):
    before = _predicted_frequencies("--species", "OCS")
    document = catalogue_to_dict([s for s in demo_species if s.name == "OCS"])
    # B doubled (arbitrary, no source): every line moves, so lines from the file could not match.
    document["species"][0]["states"][0]["constants_mhz"]["B"][0] *= 2
    _run("import_catalogue", str(write_catalogue(document)))
    after = _predicted_frequencies("--species", "OCS")
    assert after and after != before
    ocs = next(s for s in export_species() if s.name == "OCS")
    expected = predict_many([ocs], PredictionRequest(fmin_mhz=0.0, fmax_mhz=100000.0, temperature_k=300.0))
    assert after == pytest.approx([float(f) for f in expected.lines["frequency_mhz"]], rel=1e-12)


def test_predict_without_catalogue_does_not_know_species_missing_from_the_database(use_catalogue, co2_entry):
    use_catalogue(co2_entry)
    with pytest.raises(CommandError, match="unknown species 'OCS' in the database catalogue"):
        _run("predict", "--species", "OCS", *PREDICT_WINDOW)
