from django.apps import AppConfig
from django.db.models.signals import post_migrate


class CatalogueConfig(AppConfig):
    name = "planner.catalogue"
    label = "catalogue"
    verbose_name = "Species catalogue"

    def ready(self):
        from planner.catalogue.roles import ensure_roles

        # After every app's migrate signal, not only ours: the roles also hold the planning app's
        # permissions, which auth creates when that app's signal is sent (after ours).
        post_migrate.connect(ensure_roles, dispatch_uid="linecast-ensure-roles")
