from django.apps import AppConfig
from django.db.models.signals import post_migrate


class CatalogueConfig(AppConfig):
    name = "planner.catalogue"
    label = "catalogue"
    verbose_name = "Species catalogue"

    def ready(self):
        from planner.catalogue.roles import ensure_roles

        # After auth has created the permissions (its post_migrate handler is connected first).
        post_migrate.connect(ensure_roles, sender=self)
