"""Key names of the catalogue file format, shared by the reader and the writer.

See docs/catalogue-format.md for their meaning and units.
"""

FORMAT_NAME = "linecast-catalogue"
FORMAT_VERSION = 1

FILE_KEYS = ("format", "version", "species")
SPECIES_KEYS = (
    "name",
    "formula",
    "rotor",
    "reduction",
    "representation",
    "mass_amu",
    "dipole_debye",
    "spin_weights",
    "states",
    "source",
    "notes",
    "hazards",
    "parent",
    "natural_abundance",
    "constants_route",
    "route_note",
    "hyperfine",
    "geometry",
)
REQUIRED_SPECIES_KEYS = ("name", "formula", "rotor", "dipole_debye", "states")
STATE_KEYS = ("label", "energy_cm1", "degeneracy", "constants_mhz", "alpha_mhz", "covariance_mhz2")
REQUIRED_STATE_KEYS = ("label", "energy_cm1")
HYPERFINE_KEYS = ("nucleus", "spin", "chi_mhz")
ATOM_KEYS = ("element", "isotope", "xyz_a")
COVARIANCE_KEYS = ("names", "matrix")
DIPOLE_AXES = ("a", "b", "c")

#: Spin-weight axis -> (file key of SpinWeights.even, file key of SpinWeights.odd).
SPIN_WEIGHT_KEYS = {
    "a": ("even", "odd"),
    "b": ("even", "odd"),
    "c": ("even", "odd"),
    "C3": ("k_multiple_of_3", "other"),
}
