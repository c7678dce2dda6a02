"""The shared catalogue: species, their states, and each state's named constants.

Constants are rows (name, value, σ) that the database can query, never a blob.
Every table keeps its history (django-simple-history); all rows written by one
edit share one history_date, which makes that edit one revision (see
revisions.py).  Physics rules live in the engine and are checked before
anything is written (store.py); the constraints here only guard the database.
"""

from __future__ import annotations

from django.db import models
from django.db.models import Q
from simple_history.models import HistoricalRecords

from planner.engine.species import CONSTANTS_ROUTES, MAX_DIPOLE_DEBYE, REDUCTIONS, REPRESENTATIONS, ROTOR_KINDS

NAME_LENGTH = 100
FORMULA_LENGTH = 100
LABEL_LENGTH = 50
PARAMETER_LENGTH = 20

ROTOR_CHOICES = [(kind, kind.replace("-", " ")) for kind in ROTOR_KINDS]
REDUCTION_CHOICES = [(r, f"{r}-reduction") for r in REDUCTIONS]
REPRESENTATION_CHOICES = [(r, r) for r in REPRESENTATIONS]
# entered: measured or typed in; mass-scaling: a diatomic scaled from its parent by the reduced
# mass; geometry-ratio: scaled from the parent through the stored geometry.
ROUTE_CHOICES = [("entered", "entered"), ("mass-scaling", "mass scaling"), ("geometry-ratio", "geometry ratio")]
assert [c for c, _ in ROUTE_CHOICES] == list(CONSTANTS_ROUTES)
# alpha: the row holds α = ground-state value − this state's value.
CONSTANT_KIND_CHOICES = [("value", "value"), ("alpha", "alpha")]
SPIN_AXIS_CHOICES = [
    ("", "none (every level weight 1)"),
    ("a", "C2 axis along a"),
    ("b", "C2 axis along b"),
    ("c", "C2 axis along c"),
    ("C3", "C3 axis (symmetric top)"),
]


class Species(models.Model):
    name = models.CharField(max_length=NAME_LENGTH, unique=True)
    formula = models.CharField(max_length=FORMULA_LENGTH)
    rotor = models.CharField(max_length=20, choices=ROTOR_CHOICES)
    reduction = models.CharField(max_length=1, choices=REDUCTION_CHOICES, default="A")
    representation = models.CharField(max_length=4, choices=REPRESENTATION_CHOICES, default="Ir")
    mass_amu = models.FloatField(help_text="[u]")
    dipole_a_debye = models.FloatField(default=0.0)
    dipole_b_debye = models.FloatField(default=0.0)
    dipole_c_debye = models.FloatField(default=0.0)
    # Weights of "even" levels (K a multiple of 3 for C3) and of the others; both null without spin statistics.
    spin_axis = models.CharField(max_length=2, choices=SPIN_AXIS_CHOICES, blank=True, default="")
    spin_weight_even = models.FloatField(null=True, blank=True)
    spin_weight_odd = models.FloatField(null=True, blank=True)
    source = models.TextField(blank=True, default="")
    notes = models.TextField(blank=True, default="")
    hazards = models.TextField(blank=True, default="")
    # Isotopologues: the species it was derived from, its share in a sample of natural composition,
    # and how its constants were obtained.
    parent_name = models.CharField(max_length=NAME_LENGTH, blank=True, default="")
    natural_abundance = models.FloatField(null=True, blank=True)
    constants_route = models.CharField(max_length=20, choices=ROUTE_CHOICES, default="entered")
    route_note = models.TextField(blank=True, default="")
    # One quadrupolar nucleus and a stored geometry, in the catalogue file's own form
    # ({"nucleus", "spin", "chi_mhz"} and [{"element", "isotope", "xyz_a"}, ...]); the engine checks them.
    hyperfine = models.JSONField(null=True, blank=True)
    geometry = models.JSONField(default=list, blank=True)
    # Raised by every save; an edit started from an older version is refused (store.py).
    version = models.PositiveIntegerField(default=1)
    updated_at = models.DateTimeField(auto_now=True)

    history = HistoricalRecords()

    class Meta:
        ordering = ["name"]
        verbose_name_plural = "species"
        constraints = [
            models.CheckConstraint(condition=Q(mass_amu__gt=0), name="species_mass_positive"),
            models.CheckConstraint(
                condition=Q(natural_abundance__isnull=True) | Q(natural_abundance__gt=0, natural_abundance__lte=1),
                name="species_abundance_fraction",
            ),
            *(
                models.CheckConstraint(
                    condition=Q(**{f"dipole_{axis}_debye__gte": -MAX_DIPOLE_DEBYE})
                    & Q(**{f"dipole_{axis}_debye__lte": MAX_DIPOLE_DEBYE}),
                    name=f"species_dipole_{axis}_in_range",
                )
                for axis in "abc"
            ),
        ]

    def __str__(self) -> str:
        return self.name

    @property
    def dipole_debye(self) -> tuple[float, float, float]:
        return (self.dipole_a_debye, self.dipole_b_debye, self.dipole_c_debye)

    @property
    def dipole_types(self) -> str:
        """ "a", "ab", ... : the axes with a non-zero dipole component; "" for none."""
        return "".join(axis for axis, mu in zip("abc", self.dipole_debye) if mu)


class State(models.Model):
    species = models.ForeignKey(Species, related_name="states", on_delete=models.CASCADE)
    position = models.PositiveSmallIntegerField(default=0)  # order within the species, ground state first
    label = models.CharField(max_length=LABEL_LENGTH)
    energy_cm1 = models.FloatField(default=0.0)
    degeneracy = models.PositiveSmallIntegerField(default=1)  # vibrational degeneracy g_v

    history = HistoricalRecords()

    class Meta:
        ordering = ["species", "position", "id"]
        constraints = [
            models.UniqueConstraint(fields=["species", "label"], name="state_label_unique_per_species"),
            models.CheckConstraint(condition=Q(energy_cm1__gte=0), name="state_energy_not_negative"),
            models.CheckConstraint(condition=Q(degeneracy__gte=1), name="state_degeneracy_positive"),
        ]

    def __str__(self) -> str:
        return f"{self.species_id}: {self.label}"


class Constant(models.Model):
    state = models.ForeignKey(State, related_name="constants", on_delete=models.CASCADE)
    name = models.CharField(max_length=PARAMETER_LENGTH)
    value_mhz = models.FloatField()
    sigma_mhz = models.FloatField(default=0.0)
    # "alpha": the row holds α, and the state's value is the ground state's minus α.
    kind = models.CharField(max_length=5, choices=CONSTANT_KIND_CHOICES, default="value")

    history = HistoricalRecords()

    class Meta:
        ordering = ["state", "id"]
        constraints = [
            models.UniqueConstraint(fields=["state", "name"], name="constant_name_unique_per_state"),
            models.CheckConstraint(condition=Q(sigma_mhz__gte=0), name="constant_sigma_not_negative"),
        ]

    def __str__(self) -> str:
        return f"{self.name} = {self.value_mhz} ± {self.sigma_mhz} MHz"


class CovarianceElement(models.Model):
    """One element of a state's covariance of constants (upper triangle, first <= second in order)."""

    state = models.ForeignKey(State, related_name="covariance", on_delete=models.CASCADE)
    row = models.PositiveSmallIntegerField()  # positions in the covariance's name order
    column = models.PositiveSmallIntegerField()
    first = models.CharField(max_length=PARAMETER_LENGTH)
    second = models.CharField(max_length=PARAMETER_LENGTH)
    value_mhz2 = models.FloatField()

    history = HistoricalRecords()

    class Meta:
        ordering = ["state", "row", "column"]
        constraints = [
            models.UniqueConstraint(fields=["state", "row", "column"], name="covariance_element_unique"),
            models.CheckConstraint(condition=Q(column__gte=models.F("row")), name="covariance_upper_triangle"),
        ]

    def __str__(self) -> str:
        return f"cov({self.first}, {self.second}) = {self.value_mhz2} MHz²"
