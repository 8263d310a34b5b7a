"""Adiabatic flame temperature with dissociation (fuelsys.equilibrium)."""

import warnings

import numpy as np
import pytest

from fuelsys import engine, equilibrium as eq, thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.fuels import fuel_h_to_c, get_fuel

PHIS = (0.6, 0.8, 1.0, 1.2)
# 1 bar and 298 K; and a preheated, pressurised primary zone typical of a small turbojet at full
# power: compressor pressure ratio about 2.5, delivery temperature about 450 K (common practice,
# no source; cf. the engine module's example design point)
CONDITIONS = ((298.15, 1.0e5), (450.0, 2.5e5))


@pytest.fixture(scope="module")
def ct():
    return pytest.importorskip("cantera")


@pytest.fixture(scope="module")
def gri30(ct):
    return ct.Solution("gri30.yaml")  # GRI-Mech 3.0 (Smith et al. 1999) thermodynamics


@pytest.fixture(scope="module")
def jet_gas(ct):
    species = ct.Species.list_from_file("gri30.yaml")
    jet = [s for s in ct.Species.list_from_file("nasa_gas.yaml") if s.name == "Jet-A(g)"]
    return ct.Solution(thermo="ideal-gas", species=species + jet)


# -- species data -------------------------------------------------------------------------
# (species, enthalpy of formation at 298.15 K [J/mol], source): the Hf(298) listed for each species
# in the CEA data file of McBride, Zehe & Gordon (2002) (from memory); checks the copying of
# the coefficients, whose b1 terms carry the enthalpy of formation
HF_298 = [
    ("CO", -110535.196, "McBride, Zehe & Gordon 2002 (NASA/TP-2002-211556), CO"),
    ("H2", 0.0, "reference element, H2 gas"),
    ("OH", 37278.206, "McBride, Zehe & Gordon 2002, OH (Ruscic et al. 2002 value)"),
    ("H", 217998.828, "McBride, Zehe & Gordon 2002, H"),
    ("O", 249175.003, "McBride, Zehe & Gordon 2002, O"),
    ("NO", 91271.310, "McBride, Zehe & Gordon 2002, NO"),
]


@pytest.mark.parametrize("species,hf,source", HF_298)
def test_enthalpy_of_formation_of_added_species(species, hf, source):
    h = eq.species_properties(298.15)["h"][eq.SPECIES.index(species)]
    assert h == pytest.approx(hf, abs=15.0), source


# (species, T [K], cp [J/(mol K)], source)
CP_TABLE = [
    ("CO", 1000.0, 33.183, "NIST-JANAF 4th ed. (Chase 1998), CO table (from memory)"),
    ("CO", 2000.0, 36.250, "NIST-JANAF 4th ed. (Chase 1998), CO table (from memory)"),
    ("H2", 1000.0, 30.205, "NIST-JANAF 4th ed. (Chase 1998), H2 table (from memory)"),
    ("H2", 2000.0, 34.280, "NIST-JANAF 4th ed. (Chase 1998), H2 table (from memory)"),
    ("H", 1500.0, 20.786, "monatomic ideal gas, 5/2 R (NIST-JANAF 4th ed., H table)"),
]


@pytest.mark.parametrize("species,T,cp,source", CP_TABLE)
def test_cp_of_added_species(species, T, cp, source):
    assert eq.species_properties(T)["cp"][eq.SPECIES.index(species)] == pytest.approx(cp, rel=2e-3), source


@pytest.mark.parametrize("species", ["CO", "H2", "OH", "H", "O", "NO", "CO2", "H2O", "N2", "O2"])
@pytest.mark.parametrize("T", [500.0, 1500.0, 2500.0])
def test_species_against_gri30_thermodynamics(species, T, gri30):
    """cp and h - h(298) of every product species against GRI-Mech 3.0's thermodynamic fits (via Cantera)."""
    sp = gri30.species(species.upper() if species == "Ar" else species)
    props = eq.species_properties(np.array([298.15, T]))
    i = eq.SPECIES.index(species)
    assert props["cp"][1, i] == pytest.approx(sp.thermo.cp(T) / 1e3, rel=5e-3)
    dh_ct = (sp.thermo.h(T) - sp.thermo.h(298.15)) / 1e3
    assert props["h"][1, i] - props["h"][0, i] == pytest.approx(dh_ct, rel=3e-3, abs=30.0)


def test_five_species_are_thermo_s_own():
    """N2, O2, Ar, CO2, H2O use fuelsys.thermo's coefficients: same enthalpies as thermo."""
    T = np.array([300.0, 900.0, 1800.0])
    props = eq.species_properties(T)["h"]
    for s in thermo.SPECIES:
        assert np.allclose(props[:, eq.SPECIES.index(s)], thermo.molar_enthalpy(s, T), rtol=0, atol=1e-6)


# -- against Cantera -----------------------------------------------------------------------------
def _cantera_air(ct, gas):
    return {("AR" if k == "Ar" else k): v for k, v in thermo.AIR_MOLE_FRACTION.items() if v > 0}


def _cantera_hp(gas, b_per_kg, h_per_kg, p):
    """Equilibrium HP in Cantera for given element moles per kg (C, H, O, N, Ar) and enthalpy per kg."""
    c, h, o, n, ar = b_per_kg
    x = {"CO": c, "H2": h / 2, "O2": (o - c) / 2, "N2": n / 2, "AR": ar}
    gas.TPX = 1000.0, p, {k: v for k, v in x.items() if v > 0}
    gas.HP = h_per_kg, p
    gas.equilibrate("HP")
    return gas.T


def _cantera_premixed(ct, gas, fuel_species, phi, T, p, far_st):
    """Premixed fuel vapour and air, both at T, equilibrated at constant h and p in Cantera."""
    gas.TPX = T, p, _cantera_air(ct, gas)
    y_air = gas.Y.copy()
    far = phi * far_st
    y = y_air / (1 + far)
    y[gas.species_index(fuel_species)] += far / (1 + far)
    gas.TPY = T, p, y
    gas.equilibrate("HP")
    return gas.T


# Tolerance 5 K at every point (tighter than the 10 K asked near phi = 1): the two calculations
# differ only in their thermodynamic data (McBride et al. 2002 against GRI-Mech 3.0; the fuel's
# enthalpy of formation) and in GRI-Mech's 53 species against our 11; seen: 1-2 K.
TOL_K = 5.0


@pytest.mark.parametrize("T,p", CONDITIONS)
@pytest.mark.parametrize("phi", PHIS)
def test_propane_air_against_cantera_gri30(phi, T, p, ct, gri30):
    gas = gri30  # GRI-Mech 3.0: C3H8 and the products, equilibrium by Cantera
    fc = eq.fuel_composition("C3H8")
    ours = eq.gordon_mcbride_1994(phi, T, p, fc, h_fuel=fc.sensible_enthalpy(T))
    ref = _cantera_premixed(ct, gas, "C3H8", phi, T, p, fc.stoich_far)
    assert ours == pytest.approx(ref, abs=TOL_K), f"Cantera gri30 {ref:.1f} K"


@pytest.mark.parametrize("T,p", [(250.0, 0.5e5), (900.0, 20e5)])
@pytest.mark.parametrize("phi", [0.3, 1.6, 2.0])
def test_corners_of_the_validity_range_against_cantera_gri30(phi, T, p, ct, gri30):
    """The ends of VALIDITY (phi 0.3-2.0, 250-900 K, 0.5-20 bar): propane-air against Cantera gri30."""
    fc = eq.fuel_composition("C3H8")
    ours = eq.gordon_mcbride_1994(phi, T, p, fc, h_fuel=fc.sensible_enthalpy(T))
    ref = _cantera_premixed(ct, gri30, "C3H8", phi, T, p, fc.stoich_far)
    assert ours == pytest.approx(ref, abs=TOL_K), f"Cantera gri30 {ref:.1f} K"


@pytest.mark.parametrize("T,p", CONDITIONS)
@pytest.mark.parametrize("phi", PHIS)
def test_kerosene_surrogate_vapour_against_cantera(phi, T, p, ct, jet_gas):
    """Jet-A vapour C12H23 (NASA TM-4513 species, shipped with Cantera in nasa_gas.yaml) premixed with air;
    Cantera equilibrium over GRI-Mech 3.0's species plus that fuel species."""
    gas = jet_gas
    fc = eq.fuel_composition("Jet-A(g)")
    ours = eq.gordon_mcbride_1994(phi, T, p, fc, h_fuel=fc.sensible_enthalpy(T))
    ref = _cantera_premixed(ct, gas, "Jet-A(g)", phi, T, p, fc.stoich_far)
    assert ours == pytest.approx(ref, abs=TOL_K), f"Cantera {ref:.1f} K"


@pytest.mark.parametrize("T,p", CONDITIONS)
@pytest.mark.parametrize("phi", PHIS)
def test_kerosene_fuel_model_against_cantera(phi, T, p, ct, gri30):
    """fuelsys kerosene (CH_1.90, LHV 43.2 MJ/kg, liquid at 25 °C) with air at T: Cantera gri30 equilibrium
    of the same elements, the enthalpy built from GRI-Mech 3.0's own CO2, H2O and O2 and the heating value."""
    gas = gri30
    k = get_fuel("kerosene")
    y = fuel_h_to_c(k)
    far = phi * k.stoich_far
    m_unit = thermo.ATOMIC_MASS["C"] + y * thermo.ATOMIC_MASS["H"]
    # fuel enthalpy per kg from its heating value and Cantera's product enthalpies at 298.15 K
    h = {s: gas.species(s).thermo.h(298.15) / 1e3 for s in ("CO2", "H2O", "O2")}  # J/mol
    h_fuel = (h["CO2"] + y / 2 * h["H2O"] - (1 + y / 4) * h["O2"]) / m_unit + k.lhv
    gas.TPX = T, p, _cantera_air(ct, gas)
    h_air = gas.enthalpy_mass
    b_air = np.array([gas.elemental_mass_fraction(e) / (gas.atomic_weight(e) / 1e3) for e in ("C", "H", "O", "N", "Ar")])
    b = (b_air + far * np.array([1.0, y, 0, 0, 0]) / m_unit) / (1 + far)
    ref = _cantera_hp(gas, b, (h_air + far * h_fuel) / (1 + far), p)
    ours = eq.gordon_mcbride_1994(phi, T, p, k)
    assert ours == pytest.approx(ref, abs=TOL_K), f"Cantera gri30 {ref:.1f} K"


def test_kerosene_string_and_fuel_object_agree():
    assert eq.gordon_mcbride_1994(0.9, 400.0, 2e5, "kerosene") == eq.gordon_mcbride_1994(0.9, 400.0, 2e5,
                                                                                         get_fuel("kerosene"))


# -- published values ------------------------------------------------------------------------
def test_propane_stoichiometric_flame_against_published_value():
    # propane-air, phi = 1, 298 K, 1 atm, equilibrium: 2267 K (Turns, "An Introduction to Combustion",
    # 3rd ed. 2012, Table B.1; from memory)
    T = eq.gordon_mcbride_1994(1.0, 298.15, 101325.0, "C3H8")
    assert T == pytest.approx(2267.0, abs=10.0)


def test_dissociation_is_small_lean_and_large_at_stoichiometric():
    # the flame without dissociation overshoots by about 100-150 K at phi = 1 and 1 atm, and by
    # almost nothing at phi = 0.4 (Turns 2012 ch. 2, equilibrium products; from memory)
    phi = np.array([0.4, 1.0])
    eqT = eq.gordon_mcbride_1994(phi, 298.15, 1e5, "kerosene")
    cc = eq.complete_combustion(phi, 298.15, 1e5, "kerosene")
    assert cc[0] - eqT[0] == pytest.approx(0.0, abs=2.0)
    assert 90.0 < cc[1] - eqT[1] < 200.0


def test_pressure_suppresses_dissociation():
    # Le Chatelier: higher pressure, less dissociation, hotter stoichiometric flame (Turns 2012 §2.8)
    T = eq.gordon_mcbride_1994(1.0, 450.0, np.array([0.5e5, 2.5e5, 20e5]), "kerosene")
    assert np.all(np.diff(T) > 10.0)


def test_complete_combustion_matches_the_engine_energy_balance():
    """Lean complete-combustion temperature put into fuelsys.engine's fuel demand gives phi back."""
    k = get_fuel("kerosene")
    y = fuel_h_to_c(k)
    phi = np.array([0.3, 0.5, 0.8, 1.0])
    t_in = 430.0
    T = eq.complete_combustion(phi, t_in, 2e5, k)
    far = engine.fuel_air_ratio_energy_balance(t_in, T, k.lhv, y)
    assert np.allclose(far / k.stoich_far, phi, rtol=1e-6)


# -- the solution itself -------------------------------------------------------------------------
@pytest.mark.parametrize("method", ["equilibrium", "complete"])
def test_elements_and_enthalpy_are_conserved(method):
    phi = np.array([0.35, 0.7, 1.0, 1.3, 1.9])
    r = eq.equilibrium_products(phi, 500.0, 3e5, "kerosene", method=method)
    fc = eq.fuel_composition("kerosene")
    b0, h0, far = eq._reactants(phi, np.full(phi.shape, 500.0), fc, np.zeros(phi.shape))
    n = np.stack([r["moles"][s] for s in eq.SPECIES], axis=1)
    assert np.allclose(n @ eq._A.T, b0, rtol=1e-6, atol=1e-9)
    assert np.allclose(r["h"], h0, rtol=1e-6, atol=1.0)
    assert np.allclose(sum(r["x"].values()), 1.0)
    assert np.allclose(r["far"], far)


def test_equilibrium_constants_hold_in_the_products():
    """The solved composition satisfies K_p of CO2 = CO + 1/2 O2 and H2O = OH + 1/2 H2 from the same data."""
    r = eq.equilibrium_products(1.0, 600.0, 5e5, "kerosene")
    T, x, P = r["T"], r["x"], 5e5 / eq.P_STANDARD
    g = eq.species_properties(T)
    g = {s: g["h"][i] - T * g["s"][i] for i, s in enumerate(eq.SPECIES)}  # J/mol at 1 bar
    for lhs, rhs in ((("CO2", 1.0),), (("CO", 1.0), ("O2", 0.5))), ((("H2O", 1.0),), (("OH", 1.0), ("H2", 0.5))):
        dg = sum(nu * g[s] for s, nu in rhs) - sum(nu * g[s] for s, nu in lhs)
        kp = np.exp(-dg / (eq.R * T))
        dn = sum(nu for _, nu in rhs) - sum(nu for _, nu in lhs)
        q = np.prod([x[s] ** nu for s, nu in rhs]) / np.prod([x[s] ** nu for s, nu in lhs]) * P ** dn
        assert q == pytest.approx(kp, rel=1e-5)


def test_broadcasting_and_scalars():
    phi = np.array([[0.5], [1.0], [1.5]])
    T = np.array([300.0, 600.0])
    grid = eq.adiabatic_flame_temperature(phi, T, 2e5, "C3H8")
    assert grid.shape == (3, 2)
    one = eq.adiabatic_flame_temperature(1.5, 600.0, 2e5, "C3H8")
    assert isinstance(one, float)
    assert grid[2, 1] == pytest.approx(one, abs=1e-6)
    assert isinstance(eq.complete_combustion(0.8, 300.0, 1e5), float)


def test_whole_validity_range_converges_vectorised():
    rng = np.random.default_rng(3)
    n = 400
    phi = rng.uniform(0.3, 2.0, n)
    t_in = rng.uniform(250.0, 900.0, n)
    p = rng.uniform(0.5e5, 20e5, n)
    T = eq.gordon_mcbride_1994(phi, t_in, p, "kerosene")
    Tc = eq.complete_combustion(phi, t_in, p, "kerosene")
    assert np.all(np.isfinite(T)) and np.all(T > t_in) and np.all(Tc >= T - 1e-6)
    i = [0, 77, 399]
    assert np.allclose(T[i], [eq.gordon_mcbride_1994(phi[j], t_in[j], p[j], "kerosene") for j in i], atol=1e-6)


def test_fuel_enthalpy_raises_the_flame():
    k = get_fuel("kerosene")
    cold = eq.gordon_mcbride_1994(0.8, 450.0, 2.5e5, k)
    vapour = eq.gordon_mcbride_1994(0.8, 450.0, 2.5e5, k, h_fuel=float(k.enthalpy(450.0, 2.5e5, 0.05)))
    assert vapour > cold


def test_fuel_compositions():
    # CH_y from an H/C ratio gives back the heating value and the engine's stoichiometric ratio
    k = get_fuel("kerosene")
    fc = eq.fuel_composition(k)
    assert fc.lhv == pytest.approx(k.lhv, rel=1e-12)
    assert fc.stoich_far == pytest.approx(k.stoich_far, rel=1e-9)
    # propane C3H8: the same stoichiometric ratio as fuelsys.thermo's (same dry air; a consistency check)
    assert eq.fuel_composition("C3H8").stoich_far == pytest.approx(thermo.stoichiometric_far(8 / 3), rel=1e-9)
    # propane gas LHV 46.35 MJ/kg (Turns 2012, Table B.1; from memory)
    assert eq.fuel_composition("C3H8").lhv == pytest.approx(46.35e6, rel=2e-3)
    # Jet-A liquid: net heat of combustion at least 42.8 MJ/kg (ASTM D1655, Table 1; from memory)
    assert 42.8e6 < eq.fuel_composition("Jet-A(L)").lhv < 43.5e6
    assert eq.fuel_composition("jet-a(g)").lhv > eq.fuel_composition("Jet-A(L)").lhv  # + latent heat


# -- bad input and validity --------------------------------------------------------------------------
@pytest.mark.parametrize("kw,match", [
    (dict(phi=0.0), "equivalence ratio must be > 0"),
    (dict(phi=-1.0), "equivalence ratio must be > 0"),
    (dict(phi=3.5), "too rich"),
    (dict(p=0.0), "pressure must be > 0"),
    (dict(t_in=100.0), "inlet temperature must be within"),
    (dict(phi=float("nan")), "finite"),
])
def test_bad_input_raises(kw, match):
    args = dict(phi=1.0, t_in=300.0, p=1e5)
    args.update(kw)
    with pytest.raises(FuelsysInputError, match=match):
        eq.gordon_mcbride_1994(args["phi"], args["t_in"], args["p"], "kerosene")


def test_unknown_method_and_fuel():
    with pytest.raises(FuelsysInputError, match="unknown"):
        eq.adiabatic_flame_temperature(1.0, 300.0, 1e5, method="guess")
    with pytest.raises(FuelsysInputError):
        eq.fuel_composition("unobtainium")
    with pytest.raises(FuelsysInputError, match="heat-capacity"):
        eq.ch_fuel(1.9, 43e6).sensible_enthalpy(400.0)


@pytest.mark.parametrize("kw", [dict(phi=0.25), dict(phi=2.2), dict(t_in=950.0), dict(p=25e5)])
def test_outside_validity_is_computed_and_flagged(kw):
    args = dict(phi=1.0, t_in=300.0, p=1e5)
    args.update(kw)
    with pytest.warns(ValidityWarning):
        T = eq.gordon_mcbride_1994(args["phi"], args["t_in"], args["p"], "kerosene")
    assert np.isfinite(T)


def test_inside_validity_no_warning():
    with warnings.catch_warnings():
        warnings.simplefilter("error", ValidityWarning)
        eq.gordon_mcbride_1994([0.3, 2.0], [250.0, 900.0], [0.5e5, 20e5], "kerosene")
