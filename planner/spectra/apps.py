from django.apps import AppConfig


class SpectraConfig(AppConfig):
    name = "planner.spectra"
    verbose_name = "Spectrum page"
