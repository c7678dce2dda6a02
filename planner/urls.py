"""Site URLs: the catalogue is the home of the site; the spectrum page and the admin beside it."""

from django.contrib import admin
from django.contrib.auth import views as auth_views
from django.urls import include, path
from django.views.generic import RedirectView

urlpatterns = [
    path("", RedirectView.as_view(pattern_name="catalogue:list", permanent=False), name="home"),
    path("catalogue/", include("planner.catalogue.urls")),
    path("spectrum/", include("planner.spectra.urls")),
    path("planning/", include("planner.planning.urls")),
    path("fitting/", include("planner.fitting.urls")),
    path("api/v1/", include(("planner.api.urls", "api-v1"))),
    path("accounts/login/", auth_views.LoginView.as_view(), name="login"),
    path("accounts/logout/", auth_views.LogoutView.as_view(), name="logout"),
    path("admin/", admin.site.urls),
]
