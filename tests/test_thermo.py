"""Gas-phase properties of air and combustion products (fuelsys.thermo)."""

import warnings

import numpy as np
import pytest

from fuelsys import thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning

# (species, T [K], cp [J/(mol K)], relative tolerance, source)
JANAF_CP = [
    ("N2", 300.0, 29.125, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table N-023"),
    ("N2", 500.0, 29.580, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table N-023"),
    ("N2", 1000.0, 32.697, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table N-023"),
    ("N2", 1500.0, 34.843, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table N-023"),
    ("N2", 2000.0, 35.971, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table N-023"),
    ("N2", 3000.0, 37.030, 3e-3, "NIST-JANAF 4th ed. (Chase 1998), table N-023"),
    ("CO2", 298.15, 37.129, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table C-095"),
    ("CO2", 1000.0, 54.308, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table C-095"),
    ("CO2", 1100.0, 55.409, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table C-095"),
    ("CO2", 1200.0, 56.342, 2e-3, "NIST-JANAF 4th ed. (Chase 1998), table C-095"),
]


@pytest.mark.parametrize("species,T,expected,rtol,source", JANAF_CP)
def test_cp_against_janaf(species, T, expected, rtol, source):
    assert thermo.molar_cp(species, T) == pytest.approx(expected, rel=rtol), source


# NIST Chemistry WebBook Shomate parameters (fits to Chase 1998, NIST-JANAF 4th ed.):
# cp = A + B t + C t^2 + D t^3 + E / t^2, t = T/1000, J/(mol K)
SHOMATE = {
    # H2O(g), 500-1700 K
    "H2O": (30.09200, 6.832514, 6.793435, -2.534480, 0.082139, -250.8810, -241.8264),
    # N2, 500-2000 K
    "N2": (19.50583, 19.88705, -8.598535, 1.369784, 0.527601, -4.935202, 0.0),
    # CO2, 298-1200 K
    "CO2": (24.99735, 55.18696, -33.69137, 7.948387, -0.136638, -403.6075, -393.5224),
    # O2, 700-2000 K
    "O2": (30.03235, 8.772972, -3.988133, 0.788313, -0.741599, -11.32468, 0.0),
    # Ar, 298-6000 K
    "Ar": (20.78600, 2.825911e-7, -1.464191e-7, 1.092131e-8, -3.661371e-8, -6.197350, 0.0),
}


def shomate_cp(species, T):
    A, B, C, D, E, _, _ = SHOMATE[species]
    t = T / 1000.0
    return A + B * t + C * t**2 + D * t**3 + E / t**2


def shomate_dh(species, T):
    """H(T) - H(298.15) [J/mol] from the Shomate equation (NIST WebBook form)."""
    A, B, C, D, E, F, H = SHOMATE[species]
    t = T / 1000.0
    return 1000.0 * (A * t + B * t**2 / 2 + C * t**3 / 3 + D * t**4 / 4 - E / t + F - H)


@pytest.mark.parametrize("T,rtol", [(500.0, 3e-3), (800.0, 3e-3), (1000.0, 3e-3), (1300.0, 3e-3),
                                    (1600.0, 7e-3)])
def test_h2o_cp_against_webbook_shomate(T, rtol):
    # NIST WebBook Shomate fit for H2O(g) 500-1700 K (Chase 1998).  The NASA Glenn H2O data
    # (McBride et al. 2002, from Woolley 1987) run up to 0.6 % above JANAF at 1600 K, hence
    # the wider tolerance there; CoolProp's IAPWS-95 ideal-gas part agrees with JANAF.
    assert thermo.molar_cp("H2O", T) == pytest.approx(shomate_cp("H2O", T), rel=rtol)


@pytest.mark.parametrize("species,T", [("N2", 1000.0), ("N2", 1800.0), ("CO2", 1000.0),
                                       ("H2O", 1200.0), ("O2", 1000.0), ("Ar", 1500.0)])
def test_sensible_enthalpy_against_webbook_shomate(species, T):
    # H(T) - H(298.15) from the NIST WebBook Shomate parameters (Chase 1998)
    i = thermo.SPECIES.index(species)
    ours = thermo.species_sensible_enthalpy(T)[i] * thermo.MOLAR_MASS[species]
    assert ours == pytest.approx(shomate_dh(species, T), rel=2e-3)


@pytest.mark.parametrize("species,dhf,source", [
    ("CO2", -393.51e3, "CODATA key values (Cox, Wagman & Medvedev 1989): -393.51 +- 0.13 kJ/mol"),
    ("H2O", -241.826e3, "CODATA key values (Cox, Wagman & Medvedev 1989): -241.826 +- 0.040 kJ/mol"),
    ("N2", 0.0, "element in its reference state"),
    ("O2", 0.0, "element in its reference state"),
])
def test_enthalpy_of_formation(species, dhf, source):
    assert thermo.molar_enthalpy(species, 298.15) == pytest.approx(dhf, abs=150.0), source


@pytest.mark.parametrize("species,s0", [
    ("N2", 191.609),   # CODATA key values (Cox, Wagman & Medvedev 1989)
    ("O2", 205.152),   # CODATA key values (Cox, Wagman & Medvedev 1989)
    ("CO2", 213.785),  # CODATA key values (Cox, Wagman & Medvedev 1989)
    ("H2O", 188.835),  # CODATA key values (Cox, Wagman & Medvedev 1989)
])
def test_standard_entropy(species, s0):
    assert thermo.molar_entropy(species, 298.15) == pytest.approx(s0, abs=0.05)


def test_air_properties():
    # cp of air at 300 K 1.005 kJ/(kg K), gamma 1.400: Cengel & Boles, Thermodynamics, Table A-2 (from memory)
    assert thermo.cp(300.0) == pytest.approx(1005.0, rel=3e-3)
    assert thermo.gamma(300.0) == pytest.approx(1.400, abs=2e-3)
    # gas constant of dry air 287.05 J/(kg K) for M = 28.9655 g/mol: ISO 2533 standard atmosphere
    assert thermo.gas_constant() == pytest.approx(287.05, rel=2e-4)


def test_air_cp_against_coolprop_ideal_gas():
    # CoolProp pseudo-pure air (Lemmon et al. 2000) ideal-gas cp0 at low pressure
    CP = pytest.importorskip("CoolProp.CoolProp")
    for T in (300.0, 600.0, 1000.0):
        ref = CP.PropsSI("CP0MASS", "T", T, "P", 1e5, "Air")
        assert thermo.cp(T) == pytest.approx(ref, rel=5e-3)


def test_isentropic_compression_against_coolprop():
    # real-gas air (CoolProp, Lemmon et al. 2000) compressed isentropically 1 -> 3 bar from 288.15 K
    CP = pytest.importorskip("CoolProp.CoolProp")
    s1 = CP.PropsSI("S", "T", 288.15, "P", 1e5, "Air")
    t2 = CP.PropsSI("T", "S", s1, "P", 3e5, "Air")
    assert thermo.isentropic_temperature(288.15, 3.0) == pytest.approx(t2, abs=0.5)


def test_stoichiometry():
    # propane C3H8 (y = 8/3): stoichiometric air/fuel 15.6 kg/kg, Turns 3rd ed. Appendix B, Table B.1 (from memory)
    assert 1.0 / thermo.stoichiometric_far(8.0 / 3.0) == pytest.approx(15.6, rel=0.01)
    # round trip y -> far -> y
    assert thermo.hydrogen_carbon_ratio(thermo.stoichiometric_far(1.9)) == pytest.approx(1.9, rel=1e-12)
    # products of 1 kg fuel weigh 1 kg + the oxygen burned (mass conservation)
    assert thermo.products_per_kg_fuel(2.0).sum() == pytest.approx(1.0, abs=1e-12)
    # the stoichiometric mixture holds no oxygen
    fst = thermo.stoichiometric_far(2.0)
    y = thermo.mass_fractions(fst, 2.0)
    assert y[thermo.SPECIES.index("O2")] == pytest.approx(0.0, abs=1e-12)
    assert y.sum() == pytest.approx(1.0, abs=1e-12)


def test_broadcasting_and_types():
    T = np.linspace(300.0, 1500.0, 7)
    far = np.array([[0.0], [0.01], [0.02]])
    out = thermo.cp(T, far)
    assert out.shape == (3, 7)
    assert isinstance(thermo.cp(500.0), float)
    assert isinstance(thermo.enthalpy(500.0, 0.01), float)
    # products are heavier in cp than air (CO2 and H2O)
    assert np.all(out[2] > out[0])
    # array result equals pointwise results
    assert out[1, 3] == pytest.approx(thermo.cp(T[3], 0.01), rel=1e-14)
    h = thermo.enthalpy(T, 0.015)
    assert np.allclose(thermo.temperature_from_enthalpy(h, 0.015), T, rtol=1e-10)


def test_enthalpy_is_integral_of_cp():
    # dh/dT = cp, central difference
    T = np.array([400.0, 900.0, 1400.0])
    dh = (thermo.enthalpy(T + 0.01, 0.02) - thermo.enthalpy(T - 0.01, 0.02)) / 0.02
    assert np.allclose(dh, thermo.cp(T, 0.02), rtol=1e-6)


def test_bad_input():
    with pytest.raises(FuelsysInputError, match="temperature"):
        thermo.cp(-5.0)
    with pytest.raises(FuelsysInputError, match="richer than stoichiometric"):
        thermo.cp(1000.0, far=0.09)
    with pytest.raises(FuelsysInputError, match="unknown species"):
        thermo.molar_cp("CH4", 300.0)
    with pytest.raises(FuelsysInputError, match="hydrocarbon"):
        thermo.hydrogen_carbon_ratio(0.2)
    with warnings.catch_warnings(record=True) as w:
        warnings.simplefilter("always")
        thermo.cp(7000.0)
    assert any(issubclass(x.category, ValidityWarning) for x in w)
