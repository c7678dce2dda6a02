from django.urls import path

from planner.fitting import views

app_name = "fitting"
urlpatterns = [
    path("", views.fit_page, name="fit"),
    path("<int:pk>/", views.fit_run, name="run"),
    path("<int:pk>/save/", views.save_fit, name="save"),
    path("<int:pk>/catalogue.json", views.fitted_catalogue, name="catalogue_json"),
    path("substitution/", views.substitution_page, name="substitution"),
    path("geometry/", views.geometry_page, name="geometry"),
]
