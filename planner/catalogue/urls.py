from django.urls import path

from planner.catalogue.views import editing, history, isotopologue, listing, species_page, transfer

app_name = "catalogue"
urlpatterns = [
    path("", listing.species_list, name="list"),
    path("species.csv", listing.species_csv, name="csv"),
    path("catalogue.json", transfer.export_json, name="export"),
    path("import/", transfer.import_page, name="import"),
    path("new/", editing.species_create, name="create"),
    path("deleted/", history.deleted_list, name="deleted"),
    path("<int:pk>/", species_page.species_page, name="species"),
    path("<int:pk>/edit/", editing.species_edit, name="edit"),
    path("<int:pk>/delete/", editing.species_delete, name="delete"),
    path("<int:pk>/isotopologue/", isotopologue.isotopologue_create, name="isotopologue"),
    path("<int:pk>/history/", history.species_history, name="history"),
    path("<int:pk>/history/<int:history_id>/restore/", history.restore, name="restore"),
]
