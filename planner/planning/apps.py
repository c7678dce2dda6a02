from django.apps import AppConfig


class PlanningConfig(AppConfig):
    name = "planner.planning"
    label = "planning"
    verbose_name = "Slot planning"
