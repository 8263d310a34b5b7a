"""The fuel spreadsheet functions, called as a cell would call them.

Values are checked against the core API (SI) converted to the builders' units,
and against outside references where the function adds something; bad input
must give an ``FS error:`` text that names the argument and the allowed range.
"""

import math

import pytest

from fuelsys.fuels import get_fuel
from fuelsys.sheet import call

C = 273.15
ERR = "FS error:"


def _num(x):
    assert isinstance(x, float) and math.isfinite(x), x
    return x


# -- values in builders' units ----------------------------------------------------
def test_kerosene_functions_match_the_core_api():
    k = get_fuel("kerosene")
    assert _num(call("FS_DENSITY", "kerosene", 15)) == pytest.approx(800.0, rel=1e-9)  # library value
    assert call("FS_VISCOSITY", "kerosene", -20) == pytest.approx(3.9, rel=1e-6)  # library value
    assert call("FS_SPECIFIC_HEAT", "kerosene", 25) == pytest.approx(k.specific_heat(298.15) / 1e3)
    assert call("FS_CONDUCTIVITY", "kerosene", 25) == pytest.approx(k.conductivity(298.15))
    assert call("FS_SURFACE_TENSION", "kerosene", 25) == pytest.approx(k.surface_tension(298.15) * 1e3)
    assert call("FS_VAPOUR_PRESSURE", "kerosene", 100) == pytest.approx(k.vapour_pressure(373.15) / 1e5)
    assert call("FS_LATENT_HEAT", "kerosene", 25) == pytest.approx(k.latent_heat(298.15) / 1e3)
    assert call("FS_BUBBLE_POINT", "kerosene", 1.01325) == pytest.approx(k.bubble_point(101325.0) - C)
    assert call("FS_DEW_POINT", "kerosene", 1.01325) == pytest.approx(k.dew_point(101325.0) - C)
    assert call("FS_DEW_POINT", "kerosene", 1.01325, 0.068) == pytest.approx(k.dew_point(101325.0, 0.068) - C)
    assert call("FS_VAPOUR_FRACTION", "kerosene", 120, 3.0, 0.1) == pytest.approx(
        k.vapour_fraction(393.15, 3e5, 0.1))
    # ASTM D1655 Table 1: net heat of combustion >= 42.8 MJ/kg
    assert call("FS_HEATING_VALUE", "kerosene") >= 42.8
    # jet fuel stoichiometric fuel/air ratio about 0.068 (from memory)
    assert call("FS_STOICH_FAR", "kerosene") == pytest.approx(0.068, abs=0.002)


def test_oil_pct_and_ranges_broadcast():
    out = call("FS_VISCOSITY", "kerosene", [[-20], [40]], 5)
    assert isinstance(out, list) and len(out) == 2
    # oil raises viscosity (Refutas blending of a 5 mm²/s-at-100 °C oil into kerosene)
    assert out[0][0] > 3.9 and out[1][0] > call("FS_VISCOSITY", "kerosene", 40)
    # ASTM D1655 / DEF STAN density 775..840 kg/m³ at 15 °C; 2 % oil of 1000 kg/m³ adds ~4 kg/m³
    assert call("FS_DENSITY", "kerosene", 15, 2) == pytest.approx(804.0, rel=1e-4)
    # oil never vaporises: vaporised fraction at 500 °C in air reaches only the fuel's mass share
    share = 720.0 / 820.0  # 10 % vol oil: 0.1 * 1000 = 100 kg oil with 0.9 * 800 = 720 kg fuel (library densities)
    assert call("FS_VAPOUR_FRACTION", "kerosene", 500, 1.0, 0.068) == 1.0
    b = get_fuel("kerosene", 10.0)
    assert b.fuel_mass_share == pytest.approx(share, rel=1e-9)


def test_gas_fuels_work_where_the_property_makes_sense():
    # propane saturation pressure at 15 °C: 7.32 bar abs (NIST Webbook / Lemmon et al. 2009, from memory)
    assert call("FS_VAPOUR_PRESSURE", "propane", 15) == pytest.approx(7.32, rel=0.01)
    # propane normal boiling point -42.1 °C (NIST Webbook)
    assert call("FS_BUBBLE_POINT", "propane", 1.01325) == pytest.approx(-42.1, abs=0.2)
    assert _num(call("FS_DENSITY", "propane", 15)) > 400
    assert 45 < _num(call("FS_HEATING_VALUE", "propane")) < 47  # propane LHV 46.35 MJ/kg (from memory)
    assert call("FS_VAPOUR_FRACTION", "propane", 20, 1.01325, 0.068) == 1.0
    assert str(call("FS_DENSITY", "propane", 15, 2)).startswith(ERR)  # no oil in a gas


def test_fuel_info_is_a_two_column_table():
    t = call("FS_FUEL_INFO", "kerosene")
    assert all(len(r) == 2 for r in t)
    labels = [r[0] for r in t]
    assert "density at 15 °C [kg/m³]" in labels
    assert any("source:" in lab for lab in labels)
    assert all(isinstance(v, (float, str)) for _, v in t)
    assert len(call("FS_FUEL_INFO", "propane")) > 2


def test_user_fuel_table_range():
    rows = [["name", "club fuel"], ["density at 15 °C [kg/m³]", 805], ["D86 10 % [°C]", 170],
            ["D86 50 % [°C]", 200], ["D86 90 % [°C]", 245], ["viscosity at -20 °C [mm²/s]", 4.2],
            ["viscosity at 40 °C [mm²/s]", 1.35], [None, None]]
    assert call("FS_DENSITY", rows, 15) == pytest.approx(805.0, rel=1e-9)
    assert call("FS_VISCOSITY", rows, 40) == pytest.approx(1.35, rel=1e-6)
    bad = call("FS_DENSITY", rows[:1] + rows[2:], 15)
    assert bad.startswith(ERR) and "density at 15 °C" in bad and "rows expected" in bad


# -- bad input: a clear text naming the argument and what is allowed ---------------------------
@pytest.mark.parametrize("args, words", [
    (("FS_DENSITY", "avgas", 15), ["unknown fuel 'avgas'", "kerosene", "propane", "butane", "water"]),
    (("FS_DENSITY", "kerosene", -60), ["temp_c", "-60.0 °C", "-51.0..", "°C"]),  # below freezing (-51 °C)
    (("FS_VISCOSITY", "kerosene", 400), ["temp_c", "400.0 °C", "..282"]),  # above the critical region edge
    (("FS_VAPOUR_FRACTION", "kerosene", 1200, 1.0, 0.05), ["temp_c", "1200.0 °C", "..726.9 °C"]),
    (("FS_BUBBLE_POINT", "kerosene", -1), ["p_bar_abs", "> 0"]),
    (("FS_DEW_POINT", "kerosene", 0), ["p_bar_abs", "> 0"]),
    (("FS_BUBBLE_POINT", "kerosene", 40), ["p_bar_abs", "critical region", "allowed < 18"]),
    (("FS_VAPOUR_FRACTION", "kerosene", 100, -2, 0.05), ["p_bar_abs", "> 0"]),
    (("FS_VAPOUR_FRACTION", "kerosene", 100, 1, 0), ["fuel_air_ratio", "> 0"]),
    (("FS_DENSITY", "kerosene", 15, 25), ["oil_pct", ">= 0", "<= 20"]),
    (("FS_DENSITY", "kerosene", 15, -1), ["oil_pct", ">= 0", "<= 20"]),
    (("FS_DENSITY", "kerosene", "hot"), ["temp_c", "must be a number", "°C"]),
    (("FS_VISCOSITY", "kerosene", 15, "lots"), ["oil_pct", "number"]),
    (("FS_DENSITY", "kerosene", None), ["temp_c", "empty"]),
    (("FS_DENSITY", None, 15), ["fuel", "empty"]),
    (("FS_VAPOUR_FRACTION", "kerosene", 100, None, 0.05), ["p_bar_abs", "empty"]),
    (("FS_VAPOUR_PRESSURE", "turbine-oil", 40), ["turbine-oil", "no vapour pressure"]),
])
def test_bad_input_texts(args, words):
    out = call(*args)
    assert isinstance(out, str) and out.startswith(ERR), out
    for w in words:
        assert w in out, (w, out)


def test_only_bad_cells_show_the_error():
    out = call("FS_DENSITY", "kerosene", [[-60], [15], [-40]])
    assert out[0][0].startswith(ERR)
    assert out[1][0] == pytest.approx(800.0, rel=1e-9)
    assert isinstance(out[2][0], float)
