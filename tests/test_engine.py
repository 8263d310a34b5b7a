"""Engine operating line: case pressure, air flow, T3, fuel demand (fuelsys.engine)."""

import warnings

import numpy as np
import pytest

from fuelsys import engine, thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.fuels import fuel_h_to_c

# NIST Chemistry WebBook Shomate parameters (fits to NIST-JANAF, Chase 1998), valid ranges:
# N2 500-2000 K, O2 700-2000 K, CO2 298-1200 K, H2O 500-1700 K, Ar 298-6000 K.
# dH = H(T) - H(298.15) = A t + B t^2/2 + C t^3/3 + D t^4/4 - E/t + F - H  [kJ/mol], t = T/1000
SHOMATE = {
    "N2": (19.50583, 19.88705, -8.598535, 1.369784, 0.527601, -4.935202, 0.0),
    "O2": (30.03235, 8.772972, -3.988133, 0.788313, -0.741599, -11.32468, 0.0),
    "CO2": (24.99735, 55.18696, -33.69137, 7.948387, -0.136638, -403.6075, -393.5224),
    "H2O": (30.09200, 6.832514, 6.793435, -2.534480, 0.082139, -250.8810, -241.8264),
    "Ar": (20.78600, 2.825911e-7, -1.464191e-7, 1.092131e-8, -3.661371e-8, -6.197350, 0.0),
}
# molar masses g/mol from IUPAC conventional atomic weights (C 12.011, H 1.008, O 15.999, N 14.007, Ar 39.948)
M = {"N2": 28.014, "O2": 31.998, "CO2": 44.009, "H2O": 18.015, "Ar": 39.948}
# dry air mole fractions, CIPM-2007 (Picard et al., Metrologia 45 (2008) 149, Table 1)
X_AIR = {"N2": 0.780848, "O2": 0.209390, "Ar": 0.009332, "CO2": 0.000400}


def dh(sp, T):
    A, B, C, D, E, F, H = SHOMATE[sp]
    t = T / 1000.0
    return 1000.0 * (A * t + B * t**2 / 2 + C * t**3 / 3 + D * t**4 / 4 - E / t + F - H)  # J/mol


def test_fuel_air_ratio_against_hand_calculation():
    """Stated condition (our own): T3 = 700 K, T4 = 1100 K, LHV 43.2 MJ/kg, fuel CH1.94, η = 1.

    Hand calculation per kg of air with the NIST WebBook/JANAF enthalpies:
    f = [h_air(T4) - h_air(T3)] / [LHV - Σ ν_i Δh_i(T4)].
    """
    T3, T4, lhv, y = 700.0, 1100.0, 43.2e6, 1.94
    x_rest = 1.0 - sum(X_AIR.values())
    x = dict(X_AIR)
    x["N2"] += x_rest  # trace gases counted as nitrogen, as fuelsys.thermo does
    m_air = sum(x[s] * M[s] for s in x)  # g/mol
    h_air = lambda T: sum(x[s] * dh(s, T) for s in x) / m_air * 1000.0  # J/kg
    m_fuel = 12.011 + y * 1.008  # g per mol C
    nu_dh = ((dh("CO2", T4) + y / 2 * dh("H2O", T4) - (1 + y / 4) * dh("O2", T4)) / m_fuel * 1000.0)  # J/kg fuel
    f_hand = (h_air(T4) - h_air(T3)) / (lhv - nu_dh)
    f = engine.fuel_air_ratio_energy_balance(T3, T4, lhv, y)
    assert f == pytest.approx(f_hand, rel=3e-3)
    # magnitude check: a 400 K rise needs about 1.2 % fuel (Saravanamuttoo 6th ed. §2.3 combustion-temperature-rise chart, from memory)
    assert 0.010 < f < 0.014


def test_combustion_efficiency_definition():
    # Saravanamuttoo et al. §2.3: efficiency = theoretical f / actual f
    f1 = engine.fuel_air_ratio_energy_balance(450.0, 1050.0, 43.0e6, 1.94, 1.0)
    f9 = engine.fuel_air_ratio_energy_balance(450.0, 1050.0, 43.0e6, 1.94, 0.9)
    assert f9 == pytest.approx(f1 / 0.9, rel=1e-12)


def test_fuel_enthalpy_lowers_demand():
    # warmer fuel brings sensible heat: less fuel for the same T4
    f_cold = engine.fuel_air_ratio_energy_balance(450.0, 1050.0, 43.0e6, 1.94, h_fuel=0.0)
    f_warm = engine.fuel_air_ratio_energy_balance(450.0, 1050.0, 43.0e6, 1.94, h_fuel=2000.0 * 30)
    assert f_warm < f_cold


def test_pressure_ratio_laws():
    # both laws return the design ratio at design speed
    assert engine.pressure_ratio_euler(1.0, 3.0) == pytest.approx(3.0, rel=1e-9)
    assert engine.pressure_ratio_rise_n_squared(1.0, 3.0) == pytest.approx(3.0, rel=1e-12)
    # Euler with constant efficiency, constant gamma 1.4 closed form:
    # PR(N) = [1 + (PR_d^((γ-1)/γ) - 1) N^2]^(γ/(γ-1)) (Saravanamuttoo 6th ed. eq. 4.7-4.8);
    # variable cp moves it by well under 1 %
    g = 1.4
    n = np.array([0.3, 0.5, 0.8])
    closed = (1 + (3.0 ** ((g - 1) / g) - 1) * n**2) ** (g / (g - 1))
    assert np.allclose(engine.pressure_ratio_euler(n, 3.0), closed, rtol=5e-3)
    # the incompressible law sits above Euler at part speed
    assert np.all(engine.pressure_ratio_rise_n_squared(n, 3.0) > engine.pressure_ratio_euler(n, 3.0))
    assert engine.pressure_ratio(0.0, 3.0) == pytest.approx(1.0, abs=1e-9)
    with pytest.raises(FuelsysInputError, match="allowed: euler, rise_n_squared"):
        engine.pressure_ratio(0.5, 3.0, method="cubic")


def test_compressor_exit_temperature():
    # ideal gas, gamma 1.4: T3 = T1 (1 + (PR^0.2857 - 1)/η) (Saravanamuttoo 6th ed. eq. 2.3)
    t3 = engine.compressor_exit_temperature(288.15, 2.5, 0.75)
    closed = 288.15 * (1 + (2.5 ** (0.4 / 1.4) - 1) / 0.75)
    assert t3 == pytest.approx(closed, abs=1.5)
    # isentropic compression against CoolProp real-gas air (Lemmon et al. 2000)
    CP = pytest.importorskip("CoolProp.CoolProp")
    s1 = CP.PropsSI("S", "T", 288.15, "P", 101325.0, "Air")
    t2s = CP.PropsSI("T", "S", s1, "P", 2.5 * 101325.0, "Air")
    assert engine.compressor_exit_temperature(288.15, 2.5, 1.0) == pytest.approx(t2s, abs=0.5)


def test_trade_facts_on_an_example_engine():
    """Example engine of our own invention: 120 000 rpm, PR 2.8, 0.25 kg/s, T4 1050 K, 100 N."""
    # case pressure ratio roughly 2-3.5 at full speed in this engine class: common practice, no source
    for pr_d in (2.0, 3.5):
        pg = engine.case_pressure(1.0, pr_d)
        assert 1.0e5 <= pg <= 2.6e5
    # idle near a third of full speed: common practice, no source
    line = engine.operating_line(np.array([40000.0, 120000.0]), 120000.0, 2.8, 0.25, 1050.0,
                                 lhv=43.0e6, h_to_c=1.94, thrust=np.array([8.0, 100.0]))
    idle, full = 0, 1
    assert line["speed_fraction"][idle] == pytest.approx(1 / 3, rel=1e-12)
    # at idle the case pressure is a small fraction of full-speed case pressure (≈ N² scaling)
    assert line["case_pressure"][idle] < 0.15 * line["case_pressure"][full]
    assert line["fuel_flow"][idle] < line["fuel_flow"][full]
    # TSFC of small turbojets 0.1-0.2 kg/(N h) at full power: common practice, no source
    assert 0.1 / 3600 < line["tsfc"][full] < 0.2 / 3600


def test_measured_table_takes_precedence():
    table = {"speed": [40000.0, 80000.0, 120000.0],
             "case_pressure": [0.2e5, 0.8e5, 1.7e5],
             "air_flow": [0.08, 0.16, 0.24],
             "t4": [950.0, 900.0, 1000.0]}
    speeds = np.array([40000.0, 60000.0, 120000.0])
    line = engine.operating_line(speeds, 120000.0, 2.8, 0.25, 1050.0, lhv=43.0e6, h_to_c=1.94, table=table)
    assert line["case_pressure"] == pytest.approx([0.2e5, 0.5e5, 1.7e5])
    assert line["air_flow"] == pytest.approx([0.08, 0.12, 0.24])
    assert line["t4"] == pytest.approx([950.0, 925.0, 1000.0])
    assert line["measured"]["case_pressure"] and not line["measured"]["t3"]
    # t3 from the measured pressure ratio and the efficiency
    pr = 1 + 1.7e5 / 101325.0
    assert line["t3"][2] == pytest.approx(engine.compressor_exit_temperature(288.15, pr, 0.72))
    with pytest.warns(ValidityWarning, match="measured engine table"):
        engine.operating_line(np.array([30000.0]), 120000.0, 2.8, 0.25, 1050.0,
                              lhv=43.0e6, h_to_c=1.94, table=table)
    with pytest.raises(FuelsysInputError, match="rising order"):
        engine.operating_line(speeds, 120000.0, 2.8, 0.25, 1050.0, lhv=43.0e6, h_to_c=1.94,
                              table={"speed": [80000.0, 40000.0], "t4": [1.0, 2.0]})
    with pytest.raises(FuelsysInputError, match="unknown column"):
        engine.operating_line(speeds, 120000.0, 2.8, 0.25, 1050.0, lhv=43.0e6, h_to_c=1.94,
                              table={"speed": [40000.0, 80000.0], "egt": [1.0, 2.0]})


def test_vectorised_equals_pointwise():
    speeds = np.linspace(35000.0, 120000.0, 9)
    line = engine.operating_line(speeds, 120000.0, 2.8, 0.25, 1050.0, lhv=43.0e6, h_to_c=1.94)
    for i in (0, 4, 8):
        one = engine.operating_line(speeds[i], 120000.0, 2.8, 0.25, 1050.0, lhv=43.0e6, h_to_c=1.94)
        assert float(one["fuel_flow"]) == pytest.approx(line["fuel_flow"][i], rel=1e-10)
    assert isinstance(engine.case_pressure(0.5, 3.0), float)
    assert isinstance(engine.fuel_air_ratio_energy_balance(450.0, 1000.0, 43e6, 1.94), float)


def test_bad_input():
    with pytest.raises(FuelsysInputError, match="t4 must be above t3"):
        engine.fuel_air_ratio_energy_balance(600.0, 500.0, 43e6, 1.94)
    with pytest.raises(FuelsysInputError, match="stoichiometric"):
        engine.fuel_air_ratio_energy_balance(300.0, 3000.0, 43e6, 1.94)
    with pytest.raises(FuelsysInputError, match="efficiency"):
        engine.fuel_air_ratio_energy_balance(450.0, 1000.0, 43e6, 1.94, efficiency=1.2)
    with pytest.raises(FuelsysInputError, match="design pressure ratio"):
        engine.case_pressure(0.5, 0.8)
    with pytest.raises(FuelsysInputError, match="speed"):
        engine.case_pressure(-0.5, 3.0)
    with pytest.raises(FuelsysInputError, match="air flow"):
        engine.operating_line(np.array([0.0, 1000.0]), 120000.0, 2.8, 0.25, 1050.0, lhv=43e6, h_to_c=1.94)


def test_choked_nozzle_law():
    # Saravanamuttoo §8.2: m sqrt(T4)/p3 constant -> same non-dimensional flow
    t4 = engine.turbine_inlet_choked_nozzle(1100.0, 2.0e5, 3.0e5, 0.1, 0.15)
    assert 0.1 * np.sqrt(t4) / 2.0e5 == pytest.approx(0.15 * np.sqrt(1100.0) / 3.0e5, rel=1e-12)


def test_thermo_consistency_of_h_to_c():
    class Kero:
        stoich_far = 0.0680
    y = fuel_h_to_c(Kero())
    assert thermo.stoichiometric_far(y) == pytest.approx(0.0680, rel=1e-12)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        engine.fuel_air_ratio_energy_balance(450.0, 1000.0, 43e6, y)


# -- spreadsheet face ------------------------------------------------------------------
def test_sheet_case_pressure_and_fuel_demand():
    from fuelsys.sheet import call

    # full speed gives (PR - 1) x ambient: 1.8 x 1.01325 bar
    assert call("FS_CASE_PRESSURE", 120000, 120000, 2.8) == pytest.approx(1.8 * 1.01325, rel=1e-9)
    col = call("FS_CASE_PRESSURE", [[40000], [120000]], 120000, 2.8, 0.9)
    assert col[1][0] == pytest.approx(1.8 * 0.9, rel=1e-9) and col[0][0] < col[1][0]
    # fuel demand = air x far / efficiency, in g/min (kerosene's own lhv and stoichiometric ratio)
    from fuelsys.fuels import get_fuel

    k = get_fuel("kerosene")
    far = engine.fuel_air_ratio_energy_balance(423.15, 1053.15, k.lhv, fuel_h_to_c(k), 0.9)
    assert call("FS_FUEL_DEMAND", 250, 150, 780, "kerosene", 0.9) == pytest.approx(0.25 * far * 6e4, rel=1e-9)
    assert call("FS_FUEL_DEMAND", 250, 800, 700, "kerosene").startswith("FS error: t4 must be above t3")
    assert call("FS_CASE_PRESSURE", 1000, 0, 2.8).startswith("FS error:")


def test_choked_nozzle_law_is_flagged_away_from_design():
    """The law holds only with a choked nozzle near design (Saravanamuttoo et al. 2009 §8.2); at a third
    of the design delivery pressure it is outside CHOKED_P3_FRACTION (common practice, no source)."""
    import warnings as _w

    from fuelsys.errors import ValidityWarning

    with _w.catch_warnings(record=True) as caught:
        _w.simplefilter("always", ValidityWarning)
        engine.turbine_inlet_choked_nozzle(1123.0, 2.9e5, 3.0e5, 0.19, 0.19)
    assert not any(issubclass(w.category, ValidityWarning) for w in caught)
    with pytest.warns(ValidityWarning, match="choked-nozzle"):
        engine.turbine_inlet_choked_nozzle(1123.0, 1.1e5, 3.0e5, 0.06, 0.19)
