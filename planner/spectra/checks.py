"""System checks: a broken catalogue file shows up in `manage.py check`, not first on the page."""

from django.core import checks

from planner.catalogue_file import CatalogueError
from planner.spectra.catalogue import catalogue_path, catalogue_species


@checks.register()
def check_catalogue_file(app_configs=None, **kwargs):
    try:
        catalogue_species()
    except CatalogueError as error:
        return [
            checks.Error(
                f"The catalogue file {catalogue_path()} cannot be used: {error}",
                hint="Fix the file, or point LINECAST_CATALOGUE_FILE at a valid catalogue (docs/catalogue-format.md).",
                id="linecast.E001",
            )
        ]
    return []
