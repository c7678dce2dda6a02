from django.urls import path

from planner.spectra import views

app_name = "spectra"
urlpatterns = [
    path("", views.spectrum_page, name="spectrum"),
    path("lines.csv", views.spectrum_csv, name="spectrum_csv"),
    path("lines.json", views.spectrum_json, name="spectrum_json"),
]
