"""The Django admin for staff: the catalogue tables with their history."""

from django.contrib import admin
from simple_history.admin import SimpleHistoryAdmin

from .models import Constant, Species, State


class StateInline(admin.TabularInline):
    model = State
    extra = 0
    show_change_link = True


class ConstantInline(admin.TabularInline):
    model = Constant
    extra = 0


@admin.register(Species)
class SpeciesAdmin(SimpleHistoryAdmin):
    list_display = ("name", "formula", "rotor", "mass_amu", "version", "updated_at")
    list_filter = ("rotor",)
    search_fields = ("name", "formula")
    readonly_fields = ("version", "updated_at")
    inlines = [StateInline]


@admin.register(State)
class StateAdmin(SimpleHistoryAdmin):
    list_display = ("species", "label", "energy_cm1")
    inlines = [ConstantInline]
