"""System check linecast.E001: a broken catalogue file shows up in `manage.py check`."""

import pytest
from django.core.management import call_command
from django.core.management.base import SystemCheckError

from planner.spectra.checks import check_catalogue_file


def test_demo_catalogue_passes_the_check():
    assert check_catalogue_file() == []


def test_broken_catalogue_file_is_a_system_check_error(use_catalogue, broken_entries):
    path = use_catalogue(*broken_entries)
    (error,) = check_catalogue_file()
    assert error.id == "linecast.E001"
    assert str(path) in error.msg and "NegativeB" in error.msg and "Wobbly" in error.msg
    assert "LINECAST_CATALOGUE_FILE" in error.hint


def test_manage_check_fails_on_a_missing_catalogue_file(settings, tmp_path):
    settings.LINECAST_CATALOGUE_FILE = tmp_path / "gone.json"
    with pytest.raises(SystemCheckError, match="linecast.E001"):
        call_command("check")
