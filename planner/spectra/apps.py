from django.apps import AppConfig


class SpectraConfig(AppConfig):
    name = "planner.spectra"
    verbose_name = "Spectrum page"

    def ready(self):
        from planner.spectra import checks  # noqa: F401  (registers the system checks)
