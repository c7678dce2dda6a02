"""New isotopologues of catalogue species (planner/catalogue_file/isotopologues.py), checked against published
constants, and their passage through the catalogue file.

Isotopic masses and natural fractions come from the periodictable package,
never typed here.  Every other expected number names its source: "from
memory" (a measured value recalled, not looked up), "textbook identity" (an
exact consequence of the mass relations, the inertia tensor or symmetry,
worked by hand) or "invented test data" / fixture values (only in = out is
tested with those).
"""

from __future__ import annotations

import dataclasses
import io
import json
import math

import periodictable
import pytest
from numpy.testing import assert_allclose

from planner.catalogue_file import CatalogueError, catalogue_to_dict, dump_catalogue, parse_catalogue
from planner.catalogue_file.isotopologues import DerivationError, derive_isotopologue, parent_atoms, parse_substitutions
from planner.engine import Atom, PredictionRequest, Quadrupole, Species, SpinWeights, State, predict
from planner.engine.derived import moments_of_inertia_amu_a2
from planner.engine.structure import linear_triatomic_builder, reduced_mass_amu, triatomic_bent_builder


def fraction(element: str, mass_number: int) -> float:
    """Natural isotopic fraction from periodictable (which gives per cent)."""
    return getattr(periodictable, element)[mass_number].abundance / 100.0


def mass(element: str, mass_number: int) -> float:
    return getattr(periodictable, element)[mass_number].mass


# --- Parents ---------------------------------------------------------------------------------------

#: ¹²C¹⁶O: B0, D [MHz], μ [D] (from memory); v = 1 at 2143.27 cm⁻¹ and αe = 524.8 MHz (from memory).
CO_B0_MHZ, CO_D_MHZ, CO_DIPOLE_D, CO_V1_CM1, CO_ALPHA_E_MHZ = 57635.968, 0.18350, 0.11011, 2143.27, 524.8

#: OCS: B0, D [MHz], μ [D] (from memory); r(C=O) = 1.1578 Å, r(C=S) = 1.5601 Å, r0-like (from memory).
OCS_B0_MHZ, OCS_D_MHZ, OCS_DIPOLE_D = 6081.4921, 0.0013017, 0.715
OCS_BONDS_A = (1.1578, 1.5601)

#: SO2: A, B, C and quartic constants (A-reduction) [MHz], μb [D] (from memory, as in the demo catalogue);
#: r(S=O) = 1.4308 Å, ∠OSO = 119.33° (from memory, r0-ish).  Spin weights: two spin-0 ¹⁶O on the b axis,
#: Ka + Kc even 1, odd 0 (the demo catalogue's SO2 entry).
SO2_CONSTANTS_MHZ = {
    "A": (60778.55, 0.01),
    "B": (10318.07, 0.005),
    "C": (8799.70, 0.005),
    "DeltaJ": (0.006603, 0.00001),
    "DeltaJK": (-0.11757, 0.00005),
    "DeltaK": (2.5897, 0.0005),
    "deltaJ": (0.0017027, 0.000005),
    "deltaK": (0.02538, 0.0001),
}
SO2_DIPOLE_D = 1.633
SO2_GEOMETRY = (1.4308, 1.4308, 119.33)


def co() -> Species:
    return Species(
        name="CO",
        rotor="linear",
        formula="CO",
        mass_amu=mass("C", 12) + mass("O", 16),
        dipole_debye=(CO_DIPOLE_D, 0, 0),
        states=(
            State("v=0", 0.0, {"B": (CO_B0_MHZ, 0.001), "D": (CO_D_MHZ, 0.00002)}),
            State("v=1", CO_V1_CM1, {}, alpha_mhz={"B": (CO_ALPHA_E_MHZ, 0.1)}),
        ),
        source="from memory",
    )


def ocs() -> Species:
    xyz = linear_triatomic_builder(*OCS_BONDS_A)
    return Species(
        name="OCS",
        rotor="linear",
        formula="OCS",
        mass_amu=mass("O", 16) + mass("C", 12) + mass("S", 32),
        dipole_debye=(OCS_DIPOLE_D, 0, 0),
        states=(State("v=0", 0.0, {"B": (OCS_B0_MHZ, 0.0002), "D": (OCS_D_MHZ, 1e-6)}),),
        geometry=tuple(Atom(element, None, tuple(row)) for element, row in zip("OCS", xyz)),
    )


def so2() -> Species:
    xyz = triatomic_bent_builder(*SO2_GEOMETRY)
    return Species(
        name="SO2",
        rotor="asymmetric",
        formula="SO2",
        mass_amu=mass("S", 32) + 2 * mass("O", 16),
        dipole_debye=(0, SO2_DIPOLE_D, 0),
        spin_weights=SpinWeights("b", 1, 0),
        states=(State("v=0", 0.0, SO2_CONSTANTS_MHZ),),
        geometry=tuple(Atom(element, None, tuple(row)) for element, row in zip(("S", "O", "O"), xyz)),
    )


def j1_0(species: Species) -> dict:
    lines = predict(species, PredictionRequest(100000.0, 120000.0, 300.0)).lines
    [row] = [r for r in lines.records() if r["state"] == "v=0" and (r["j_up"], r["j_lo"]) == (1, 0)]
    return row


# --- Diatomic: mass scaling ----------------------------------------------------------------------


@pytest.mark.parametrize(
    ("substitution", "name", "published_mhz", "atoms"),
    [
        ("C=13C", "13CO", 110201.354, (("C", 13), ("O", 16))),  # 13C16O J = 1 ← 0 (from memory)
        ("O=18O", "C18O", 109782.173, (("C", 12), ("O", 18))),  # 12C18O J = 1 ← 0 (from memory)
    ],
)
def test_mass_scaled_co_isotopologue_hits_the_published_line(substitution, name, published_mhz, atoms):
    derived = derive_isotopologue(co(), substitution)
    species = derived.species
    assert species.name == name
    assert species.constants_route == "mass-scaling" and species.parent == "CO"
    assert species.route_note and "CO" in species.route_note
    line = j1_0(species)
    miss = abs(line["frequency_mhz"] - published_mhz)
    assert miss < 1.0  # B0 through αe; γe and Born–Oppenheimer breakdown are left out
    assert miss <= 3 * line["sigma_mhz"]  # the stated σ covers the miss
    expected = math.prod(fraction(e, a) for e, a in atoms)  # one arrangement each
    assert_allclose(species.natural_abundance, expected, rtol=1e-12)
    assert_allclose(species.mass_amu, sum(mass(e, a) for e, a in atoms), rtol=1e-12)


def test_13co_abundance_matches_the_handbook_value():
    """x(13C16O) ≈ 0.0106 (IUPAC 2013 isotopic compositions, from memory) within 5 %."""
    species = derive_isotopologue(co(), "13C").species
    assert species.natural_abundance == pytest.approx(0.0106, rel=0.05)


def test_13co_band_origin_scales_as_the_root_of_the_reduced_mass():
    """E(v=1)·√ρ, ρ = μ(12CO)/μ(13CO): within 1 cm⁻¹ of 2096.07 cm⁻¹ (13CO fundamental, from memory).

    The harmonic law leaves out 2ωexe(√ρ − ρ) ≈ 0.6 cm⁻¹ with ωexe ≈ 13.3 cm⁻¹ (from memory).
    """
    rho = reduced_mass_amu(mass("C", 12), mass("O", 16)) / reduced_mass_amu(mass("C", 13), mass("O", 16))
    v1 = derive_isotopologue(co(), "C=13C").species.states[1]
    assert_allclose(v1.energy_cm1, CO_V1_CM1 * math.sqrt(rho), rtol=1e-12)
    assert abs(v1.energy_cm1 - 2096.07) < 1.0


def test_alpha_e_of_the_isotopologue_scales_as_mu_to_minus_three_halves():
    """αe ∝ μ^(−3/2) (Dunham: Y11 ∝ μ^(−3/2), textbook identity); the state stays given by α."""
    rho = reduced_mass_amu(mass("C", 12), mass("O", 16)) / reduced_mass_amu(mass("C", 13), mass("O", 16))
    ground, v1 = derive_isotopologue(co(), "C=13C").species.states
    assert_allclose(v1.alpha_mhz["B"][0], CO_ALPHA_E_MHZ * rho**1.5, rtol=1e-12)
    assert_allclose(v1.value("B"), ground.value("B") - CO_ALPHA_E_MHZ * rho**1.5, rtol=1e-12)
    assert v1.value("D") == ground.value("D")  # taken over from the new ground state


def test_alpha_of_d_scales_as_mu_to_minus_five_halves():
    """D ∝ μ⁻², βe = dD/dv ∝ μ^(−5/2) (Dunham: Y_kl ∝ μ^(−(k/2 + l)), textbook identity)."""
    parent = Species(
        name="CO",
        rotor="linear",
        formula="CO",
        mass_amu=mass("C", 12) + mass("O", 16),
        dipole_debye=(CO_DIPOLE_D, 0, 0),
        states=(
            State("v=0", 0.0, {"B": (CO_B0_MHZ, 0.001), "D": (CO_D_MHZ, 0.00002)}),
            # invented test data: a βe of −0.0003 MHz, large enough to see the power
            State("v=1", CO_V1_CM1, {}, alpha_mhz={"B": (CO_ALPHA_E_MHZ, 0.1), "D": (-0.0003, 0.0001)}),
        ),
    )
    rho = reduced_mass_amu(mass("C", 12), mass("O", 16)) / reduced_mass_amu(mass("C", 13), mass("O", 16))
    v1 = derive_isotopologue(parent, "C=13C").species.states[1]
    assert_allclose(v1.alpha_mhz["D"][0], -0.0003 * rho**2.5, rtol=1e-9)


# --- Polyatomics: the geometry route -------------------------------------------------------------


@pytest.mark.parametrize(
    ("substitution", "name", "published_b_mhz", "atoms"),
    [
        ("S=34S", "OC34S", 5932.8, (("O", 16), ("C", 12), ("S", 34))),  # 16O12C34S B0 (from memory)
        ("C=13C", "O13CS", 6061.9, (("O", 16), ("C", 13), ("S", 32))),  # 16O13C32S B0 (from memory)
        ("O=18O", "18OCS", 5704.8, (("O", 18), ("C", 12), ("S", 32))),  # 18O12C32S B0 (from memory)
    ],
)
def test_ocs_isotopologue_through_the_geometry(substitution, name, published_b_mhz, atoms):
    derived = derive_isotopologue(ocs(), substitution)
    species = derived.species
    assert species.name == name and species.rotor == "linear"
    assert species.constants_route == "geometry-ratio" and species.parent == "OCS"
    assert species.states[0].value("B") == pytest.approx(published_b_mhz, rel=5e-4)
    assert species.states[0].constants_mhz["D"] == (OCS_D_MHZ, 1e-6)  # distortion copied
    assert species.dipole_debye == (OCS_DIPOLE_D, 0.0, 0.0)  # the axis keeps the dipole
    assert_allclose(species.natural_abundance, math.prod(fraction(e, a) for e, a in atoms), rtol=1e-12)
    assert [(a.element, a.mass_number) for a in species.geometry] == list(atoms)
    assert [a.xyz_a for a in species.geometry] == [a.xyz_a for a in ocs().geometry]


def so2_moments(state: State):
    return moments_of_inertia_amu_a2(state.value("A"), state.value("B"), state.value("C"))


def test_so2_with_one_18o_counts_two_arrangements_and_drops_the_spin_weights():
    derived = derive_isotopologue(so2(), "2=18O")
    species = derived.species
    assert derived.substituted == (1,)
    assert species.rotor == "asymmetric" and species.constants_route == "geometry-ratio"
    # 16O on either of the two equivalent sites (textbook identity: 2 arrangements).
    expected = 2 * fraction("S", 32) * fraction("O", 16) * fraction("O", 18)
    assert_allclose(species.natural_abundance, expected, rtol=1e-12)
    assert species.spin_weights is None
    assert any("Spin weights dropped" in note for note in derived.notes)
    assert "Spin weights dropped" in species.notes
    # The centre of mass leaves the C2 axis, the axes rotate: an a-component appears, |μ| is kept.
    mu_a, mu_b, mu_c = species.dipole_debye
    assert mu_a > 0.01 and mu_c == pytest.approx(0.0, abs=1e-12)
    assert math.hypot(mu_a, mu_b, mu_c) == pytest.approx(SO2_DIPOLE_D, rel=1e-12)
    # A heavier isotope adds a positive semidefinite term to the inertia tensor: no moment falls (textbook).
    parent = so2().states[0]
    for name in "ABC":
        assert species.states[0].value(name) < parent.value(name)
    # The distortion constants are copied.
    for name in ("DeltaJ", "DeltaJK", "DeltaK", "deltaJ", "deltaK"):
        assert species.states[0].constants_mhz[name] == SO2_CONSTANTS_MHZ[name]


def test_the_two_oxygen_sites_of_so2_give_the_same_isotopologue():
    """Atoms 2 and 3 are exchanged by the C2 rotation (textbook identity): equal constants, dipole, abundance."""
    second = derive_isotopologue(so2(), "2=18O").species
    third = derive_isotopologue(so2(), "3=18O").species
    for name in "ABC":
        assert_allclose(second.states[0].value(name), third.states[0].value(name), rtol=1e-12)
    assert_allclose(second.dipole_debye, third.dipole_debye, rtol=1e-9, atol=1e-12)
    assert second.natural_abundance == third.natural_abundance


def test_so2_with_34s_keeps_b_axis_and_spin_weights():
    """S lies on the b (C2) axis and the centre of mass moves along it (textbook reasoning):

    * S has a = c = 0, so it adds nothing to I_b: B is unchanged; it adds the same μ·b_S² to I_a and I_c;
    * the axes do not rotate, so μ stays along b;
    * one arrangement only, and the two ¹⁶O stay equivalent: spin weights kept.
    No published 34SO2 constants are used: the recalled ones are not certain enough.
    """
    derived = derive_isotopologue(so2(), "S=34S")
    species = derived.species
    assert species.spin_weights == SpinWeights("b", 1, 0) and derived.notes == ()
    assert_allclose(species.natural_abundance, fraction("S", 34) * fraction("O", 16) ** 2, rtol=1e-12)
    mu_a, mu_b, mu_c = species.dipole_debye
    assert mu_a == pytest.approx(0.0, abs=1e-9) and mu_c == pytest.approx(0.0, abs=1e-9)
    assert mu_b == pytest.approx(SO2_DIPOLE_D, rel=1e-12)
    parent, new = so2().states[0], species.states[0]
    change = {name: new.value(name) / parent.value(name) - 1 for name in "ABC"}
    assert change["B"] == pytest.approx(0.0, abs=1e-12)
    assert change["A"] < change["C"] < 0  # A falls most: the same ΔI on the smallest moment
    d_ia, d_ib, d_ic = (n - p for n, p in zip(so2_moments(new), so2_moments(parent)))
    assert d_ib == pytest.approx(0.0, abs=1e-9)
    # ΔIa = ΔIc for the computed moments; the measured/computed ratio of each axis differs by < 1 %.
    assert d_ia == pytest.approx(d_ic, rel=0.02)


def ch3cn() -> Species:
    """CH3CN (constants, μ and eQq from memory) with a C3v geometry along z (invented test data near its
    structure: r(CH) 1.087, r(CC) 1.458, r(CN) 1.157 Å, ∠HCC 109.5°): only its symmetry matters here."""
    r_ch, r_cc, r_cn, angle = 1.087, 1.458, 1.157, math.radians(109.5)
    hydrogens = [
        Atom(
            "H",
            None,
            (
                r_ch * math.sin(angle) * math.cos(2 * math.pi * k / 3),
                r_ch * math.sin(angle) * math.sin(2 * math.pi * k / 3),
                r_ch * math.cos(angle),
            ),
        )
        for k in range(3)
    ]
    heavy = [
        Atom("C", None, (0.0, 0.0, 0.0)),
        Atom("C", None, (0.0, 0.0, r_cc)),
        Atom("N", None, (0.0, 0.0, r_cc + r_cn)),
    ]
    return Species(
        name="CH3CN",
        rotor="symmetric-prolate",
        formula="CH3CN",
        mass_amu=2 * mass("C", 12) + mass("N", 14) + 3 * mass("H", 1),
        dipole_debye=(3.92, 0, 0),
        spin_weights=SpinWeights("C3", 2, 1),
        states=(
            State(
                "v=0", 0.0, {"A": (158099.0, 1.0), "B": (9198.899, 0.001), "DJ": (0.0038, 0.0), "DJK": (0.1774, 0.0)}
            ),
        ),
        hyperfine=Quadrupole("14N", 1, {"aa": (-4.2244, 0.001)}),
        geometry=(*heavy, *hydrogens),
    )


def test_13c_on_the_axis_of_ch3cn_keeps_the_symmetric_top():
    """An atom on the a axis adds nothing to I_a: A unchanged, B falls; the axis, dipole and χ stay (textbook)."""
    parent = ch3cn()
    for position in ("1=13C", "2=13C"):
        species = derive_isotopologue(parent, position).species
        assert species.rotor == "symmetric-prolate"
        assert species.states[0].value("A") == pytest.approx(158099.0, rel=1e-12)
        assert species.states[0].value("B") < 9198.899
        assert species.dipole_debye == (3.92, 0.0, 0.0)
        assert species.hyperfine == parent.hyperfine
        # the two carbons are not equivalent: one arrangement
        expected = fraction("C", 13) * fraction("C", 12) * fraction("N", 14) * fraction("H", 1) ** 3
        assert_allclose(species.natural_abundance, expected, rtol=1e-12)


def test_13c_in_ch3cn_keeps_the_c3_spin_weights():
    derived = derive_isotopologue(ch3cn(), "2=13C")
    assert derived.species.spin_weights == SpinWeights("C3", 2, 1)
    assert not any("Spin weights dropped" in note for note in derived.notes)


def test_one_d_in_ch3cn_makes_an_asymmetric_top():
    """CH2DCN loses the C3 axis: asymmetric (A-reduction names), dipole rotated with |μ| kept, 3 arrangements."""
    derived = derive_isotopologue(ch3cn(), "4=D")
    species = derived.species
    assert species.rotor == "asymmetric" and species.reduction == "A"
    assert species.states[0].constants_mhz["DeltaJ"] == (0.0038, 0.0)
    assert species.states[0].constants_mhz["DeltaJK"] == (0.1774, 0.0)
    assert math.hypot(*species.dipole_debye) == pytest.approx(3.92, rel=1e-12)
    assert species.dipole_debye[1] > 0.01
    assert species.spin_weights is None and species.hyperfine is None
    expected = 3 * fraction("C", 12) ** 2 * fraction("N", 14) * fraction("H", 1) ** 2 * fraction("H", 2)
    assert_allclose(species.natural_abundance, expected, rtol=1e-12)
    assert any("asymmetric top" in note for note in derived.notes)


# --- Substitution texts --------------------------------------------------------------------------


def test_parse_substitutions_accepts_symbol_isotope_and_position_forms():
    ocs_atoms = parent_atoms(ocs())
    assert ocs_atoms == [("O", 16), ("C", 12), ("S", 32)]
    assert parse_substitutions("C=13C", ocs_atoms) == {1: 13}
    assert parse_substitutions("13C", ocs_atoms) == {1: 13}
    assert parse_substitutions(["S=34S", "1=18O"], ocs_atoms) == {2: 34, 0: 18}
    so2_atoms = parent_atoms(so2())
    assert so2_atoms == [("S", 32), ("O", 16), ("O", 16)]
    assert parse_substitutions("2=18O", so2_atoms) == {1: 18}
    assert parse_substitutions(" 3 = 18O ", so2_atoms) == {2: 18}


@pytest.mark.parametrize(
    ("parent", "text", "words"),
    [
        (so2, "O=18O", ["2 O atoms", "2=18O", "3=18O"]),  # which O? the positions are listed
        (so2, "18O", ["2=18O", "3=18O"]),
        (ocs, "C=18O", ["not an isotope of C"]),
        (ocs, "C=99C", ["99C"]),
        (so2, "4=18O", ["atoms 1 to 3"]),
        (so2, "2=34S", ["atom 2 is O"]),
        (ocs, "C=12C", ["change no atom"]),
        (ocs, "N=15N", ["no N atom"]),
        (ocs, "C13", ["SYMBOL=ISOTOPE"]),
    ],
)
def test_bad_substitutions_are_refused_with_the_reason(parent, text, words):
    with pytest.raises(DerivationError) as caught:
        derive_isotopologue(parent(), text)
    for word in words:
        assert word in str(caught.value)


def test_polyatomic_without_geometry_cannot_be_derived():
    hcn = Species(
        "HCN", "linear", 27.0109, (2.985, 0, 0), (State("v=0", 0.0, {"B": (44315.976, 0.001)}),), formula="HCN"
    )  # B, μ from memory
    with pytest.raises(DerivationError, match="geometry"):
        derive_isotopologue(hcn, "C=13C")


def test_an_isotope_absent_in_nature_has_no_natural_abundance():
    with pytest.raises(DerivationError, match="does not occur in nature"):
        derive_isotopologue(ocs(), "C=14C")


# --- Catalogue file round trip ------------------------------------------------------------------


def read_back(species_list):
    data = json.loads(json.dumps(catalogue_to_dict(species_list)))
    return data, parse_catalogue(data)


@pytest.mark.parametrize(("parent", "text"), [(co, "C=13C"), (so2, "2=18O"), (ocs, "S=34S")])
def test_derived_species_round_trips_through_the_file(parent, text):
    species = derive_isotopologue(parent(), text).species
    data, (back,) = read_back([species])
    assert back == species
    entry = data["species"][0]
    for key in ("parent", "natural_abundance", "constants_route", "route_note"):
        assert key in entry, key
    assert entry["parent"] == parent().name and entry["constants_route"] == species.constants_route
    if species.geometry:
        assert [a["isotope"] for a in entry["geometry"]] == [a.mass_number for a in species.geometry]
        assert back.geometry == species.geometry
    text_file = io.StringIO()
    dump_catalogue([parent(), species], text_file)  # the writer's own read-back accepts it
    assert parse_catalogue(json.loads(text_file.getvalue()))[1] == species


def test_alpha_state_with_degeneracy_round_trips_and_is_written_as_alpha():
    """Fixture values near HCN's (only in = out is tested)."""
    species = Species(
        "HCN",
        "linear",
        27.0109,
        (2.985, 0, 0),
        (
            State("v=0", 0.0, {"B": (44315.976, 0.001), "D": (0.0874, 0.00002)}),
            State("v2=1", 712.0, {}, degeneracy=2, alpha_mhz={"B": (-107.0, 0.1)}),
        ),
        formula="HCN",
    )
    data, (back,) = read_back([species])
    assert back == species
    state = data["species"][0]["states"][1]
    assert state["degeneracy"] == 2
    assert state["alpha_mhz"] == {"B": [-107.0, 0.1]}
    assert state["constants_mhz"] == {}  # B and D are derived again on reading, not stored
    assert back.states[1].value("B") == pytest.approx(44422.976, rel=1e-15)
    assert "degeneracy" not in data["species"][0]["states"][0]


def test_species_with_a_refitted_ground_state_round_trips():
    parent = co()
    ground, v1 = parent.states
    refitted = ground.with_fitted({"B": (CO_B0_MHZ + 1.0, 0.0005)}, ("B",), ((0.0005**2,),))  # invented fit
    species = dataclasses.replace(parent, states=(refitted, v1))
    _, (back,) = read_back([species])
    assert back == species


def test_hyperfine_with_only_the_axial_component_reads_back_complete(catalogue_data):
    """χbb = χcc = −χaa/2 for a nucleus on the axis of a linear molecule (textbook identity)."""
    entry = catalogue_data["species"][0]  # "lin", linear
    entry["hyperfine"] = {"nucleus": "33S", "spin": 1.5, "chi_mhz": {"aa": [-29.1, 0.2]}}  # fixture values
    species = parse_catalogue(catalogue_data)[0]
    chi = dict(species.hyperfine.chi_mhz)
    assert chi == {"aa": (-29.1, 0.2), "bb": (14.55, 0.1), "cc": (14.55, 0.1)}
    data, back = read_back(parse_catalogue(catalogue_data))
    assert set(data["species"][0]["hyperfine"]["chi_mhz"]) == {"aa", "bb", "cc"}
    assert back[0] == species


# --- Reader: new keys, bad values ---------------------------------------------------------------


def problems_of(data):
    with pytest.raises(CatalogueError) as caught:
        parse_catalogue(data)
    return caught.value.problems


def _ocs_geometry():
    return [
        {"element": "O", "xyz_a": [0.0, 0.0, -1.1578]},
        {"element": "C", "xyz_a": [0.0, 0.0, 0.0]},
        {"element": "S", "xyz_a": [0.0, 0.0, 1.5601]},
    ]


def _hyperfine(spin=1.5, chi=None):
    return {"nucleus": "33S", "spin": spin, "chi_mhz": chi or {"aa": [-29.1, 0.2]}}


@pytest.mark.parametrize(
    ("change", "field", "word"),
    [
        (lambda e: e.update(hyperfine=_hyperfine(spin=0.5)), "hyperfine.spin", "I >= 1"),
        (
            lambda e: e.update(hyperfine=_hyperfine(chi={"aa": [-2.0, 0], "bb": [1.5, 0], "cc": [1.5, 0]})),
            "hyperfine.chi_mhz",
            "traceless",
        ),
        (
            lambda e: e.update(geometry=[{**_ocs_geometry()[0], "element": "Xx"}, *_ocs_geometry()[1:]]),
            "geometry[0].element",
            "element symbol",
        ),
        (
            lambda e: e.update(
                geometry=[_ocs_geometry()[0], {**_ocs_geometry()[1], "isotope": 99}, _ocs_geometry()[2]]
            ),
            "geometry[1].isotope",
            "99",
        ),
        (lambda e: e.update(natural_abundance=5), "natural_abundance", "not per cent"),
        (lambda e: e["states"][1].update(degeneracy=0), "states[1].degeneracy", ">= 1"),
    ],
)
def test_bad_new_keys_name_their_field(catalogue_data, change, field, word):
    entry = catalogue_data["species"][0]  # "lin": formula OCS, two states
    change(entry)
    problems = problems_of(catalogue_data)
    found = {p.field: p for p in problems if p.species == "lin"}
    assert field in found, [str(p) for p in problems]
    assert word in found[field].message


def test_good_new_keys_read(catalogue_data):
    entry = catalogue_data["species"][0]
    entry.update(geometry=_ocs_geometry(), natural_abundance=0.9, parent="OCS parent", constants_route="entered")
    entry["geometry"][2]["isotope"] = 34
    entry["states"][1]["degeneracy"] = 2
    species = parse_catalogue(catalogue_data)[0]
    assert [(a.element, a.mass_number) for a in species.geometry] == [("O", None), ("C", None), ("S", 34)]
    assert species.natural_abundance == 0.9 and species.parent == "OCS parent"
    assert species.states[1].degeneracy == 2
