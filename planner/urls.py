"""Site URLs: the spectrum page is the home page for now."""

from django.urls import include, path

urlpatterns = [
    path("", include("planner.spectra.urls")),
]
