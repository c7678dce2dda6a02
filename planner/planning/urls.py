from django.urls import path

from planner.planning.views import instruments, plan_page, saved

app_name = "planning"
urlpatterns = [
    path("", plan_page.plan_page, name="plan"),
    path("save/", plan_page.save_plan, name="save"),
    path("saved/", saved.saved_list, name="saved_list"),
    path("saved/<int:pk>/", saved.saved_plan, name="saved"),
    path("saved/<int:pk>/operator-sheet/", saved.operator_sheet, name="operator_sheet"),
    path("saved/<int:pk>/targets.csv", saved.saved_targets_csv, name="targets_csv"),
    path("saved/<int:pk>/segments.csv", saved.saved_segments_csv, name="segments_csv"),
    path("saved/<int:pk>/plan.json", saved.saved_json, name="plan_json"),
    path("instruments/", instruments.instrument_list, name="instruments"),
    path("instruments/new/", instruments.instrument_create, name="instrument_create"),
    path("instruments/<int:pk>/edit/", instruments.instrument_edit, name="instrument_edit"),
]
