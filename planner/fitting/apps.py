from django.apps import AppConfig


class FittingConfig(AppConfig):
    name = "planner.fitting"
    label = "fitting"
    verbose_name = "Line fitting"
