from django.apps import AppConfig


class ApiConfig(AppConfig):
    name = "planner.api"
    label = "api"
    verbose_name = "JSON API for scripts"
