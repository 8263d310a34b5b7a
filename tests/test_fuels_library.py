"""Built-in fuels, the fuel table parser and get_fuel.

Every expected value names its source beside the check.
"""

import subprocess
import sys
import warnings

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.fuels import FUEL_NAMES, get_fuel
from fuelsys.fuels.library import FUEL_TABLE_ROWS, KEROSENE, parse_fuel_table

C = 273.15


@pytest.fixture(scope="module")
def kero():
    return get_fuel("kerosene")


# -- kerosene against the Jet A-1 specification limits -------------------------
def test_kerosene_density_inside_spec(kero):
    # ASTM D1655 Table 1 / DEF STAN 91-091: density at 15 °C 775..840 kg/m³
    assert 775.0 <= kero.density(15 + C) <= 840.0


def test_kerosene_viscosity_inside_spec(kero):
    # ASTM D1655 Table 1 / DEF STAN 91-091: viscosity at -20 °C <= 8.0 mm²/s
    assert kero.kinematic_viscosity(-20 + C) * 1e6 <= 8.0
    # and it reproduces its own data-sheet points (library.KEROSENE, from memory); ASTM D341's
    # inverse Z -> nu is itself an approximation, good to about 1e-7 relative
    assert kero.kinematic_viscosity(-20 + C) * 1e6 == pytest.approx(KEROSENE["visc_1"][0], rel=1e-6)
    assert kero.kinematic_viscosity(40 + C) * 1e6 == pytest.approx(KEROSENE["visc_2"][0], rel=1e-6)


def test_kerosene_distillation_inside_spec(kero):
    # ASTM D1655 Table 1: D86 10 % recovered <= 205 °C, final boiling point <= 300 °C
    assert kero.d86[10] - C <= 205.0
    assert kero.d86[100] - C <= 300.0
    # the characterised fuel boils inside its own distillation range at 1 atm:
    # bubble point above the TBP initial point and dew point below the TBP end point
    # (definition of the TBP curve as a near-equilibrium distillation, Riazi 2005 §3.2)
    assert kero.tbp[0] < kero.bubble_point(101325.0) < kero.dew_point(101325.0) < kero.tbp[100]


def test_kerosene_flash_point_and_vapour_pressure_loosely(kero):
    # ASTM D1655 / DEF STAN 91-091: flash point >= 38 °C
    assert kero.flash_point - C >= 38.0
    # Loose consistency only: at the flash point the vapour above the liquid holds about the
    # lean flammability limit of kerosene vapour, ~0.6-0.7 % by volume (from memory), i.e.
    # a vapour pressure of order 0.6 kPa.  A closed-cup flash point is not an equilibrium
    # measurement, so accept a factor of about 3 either way: 0.2..2 kPa.
    assert 200.0 < kero.vapour_pressure(kero.flash_point) < 2000.0


def test_kerosene_heating_value_and_stoichiometry(kero):
    # ASTM D1655 Table 1: net heat of combustion >= 42.8 MJ/kg
    assert kero.lhv >= 42.8e6
    # DEF STAN 91-091 hydrogen content >= 13.4 % mass (from memory); jet fuels about 13.4..14.3
    assert 0.134 <= kero.hydrogen <= 0.143
    # stoichiometric fuel/air ratio of jet fuel about 0.068 (Lefebvre & Ballal, Gas Turbine
    # Combustion, 3rd ed. 2010, Table 2.? -- from memory): accept 0.066..0.070
    assert 0.066 <= kero.stoich_far <= 0.070


def test_kerosene_builds_fast_and_light():
    # building kerosene in a fresh interpreter stays well under 0.2 s and imports
    # neither scipy nor CoolProp (project rule)
    code = ("import time, sys; t = time.perf_counter(); import fuelsys.fuels as f; k = f.get_fuel('kerosene'); "
            "k.density(300.0); dt = time.perf_counter() - t; "
            "print(dt, 'scipy' in sys.modules, 'CoolProp' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=__import__("os").path.dirname(__import__("os").path.dirname(__file__)))
    dt, has_scipy, has_cp = out.stdout.split()
    assert has_scipy == "False" and has_cp == "False"
    assert float(dt) < 1.0  # import numpy included; the build itself is timed in bench_fuels


# -- get_fuel ---------------------------------------------------------------
def test_get_fuel_cached_and_case_insensitive(kero):
    assert get_fuel(" Kerosene ") is kero
    assert get_fuel("kerosene", 0.0) is kero


def test_unknown_fuel_lists_known_names():
    with pytest.raises(FuelsysInputError) as e:
        get_fuel("avgas")
    msg = str(e.value)
    for name in ("kerosene", "turbine-oil", "propane", "butane", "water"):
        assert name in msg
    assert "kerosene" in FUEL_NAMES and "propane" in FUEL_NAMES


def test_scalar_in_float_out_and_shapes(kero):
    assert type(kero.density(300.0)) is float
    T = np.full((3, 4), 300.0)
    assert kero.density(T).shape == (3, 4)
    assert kero.kinematic_viscosity(T).shape == (3, 4)
    assert kero.vapour_pressure(T).shape == (3, 4)


def test_temperature_outside_range_refused(kero):
    with pytest.raises(FuelsysInputError, match="outside kerosene's range"):
        kero.density(-60 + C)  # below its freezing point (-51 °C, library)
    with pytest.raises(FuelsysInputError, match="outside kerosene's range"):
        kero.density(kero.t_max + 1.0)


def test_out_of_fit_range_warns(kero):
    # Riazi-Faghri conductivity is fitted 0..300 °F (Riazi & Faghri 1985): -40 °C is outside
    with pytest.warns(ValidityWarning, match="Riazi-Faghri"):
        kero.conductivity(-40 + C)


# -- a user's fuel table ----------------------------------------------------------
ROWS = [["name", "test fuel"], ["density at 15 °C [kg/m³]", 805], ["D86 10 % [°C]", 170],
        ["D86 50 % [°C]", "200"], ["D86 90 % [°C]", 245], ["viscosity at -20 °C [mm²/s]", 4.2],
        ["viscosity at 40 °C [mm²/s]", 1.35], [None, None]]


def test_user_table_from_rows_and_dict_agree():
    a = get_fuel(ROWS)
    b = get_fuel({"name": "test fuel", "density_15c": 805, "d86_10": 170, "d86_50": 200, "d86_90": 245,
                  "visc_1_temp": -20, "visc_1": 4.2, "visc_2_temp": 40, "visc_2": 1.35})
    assert a.density(300.0) == pytest.approx(b.density(300.0), rel=1e-12)
    assert a.density(15 + C) == pytest.approx(805.0, rel=1e-9)  # calibrated to its own density
    assert get_fuel(ROWS) is a  # cached
    # no heating value given: Cragoe (1929) from the density; jet-fuel range 42.8..43.6 (ASTM D1655, CRC 663)
    assert 42.8e6 < a.lhv < 43.8e6
    # no freezing point: the model stops at the lower viscosity point
    assert a.t_min == pytest.approx(-20 + C)


def test_user_table_from_csv_and_json(tmp_path):
    import json

    p = tmp_path / "fuel.csv"
    p.write_text("\n".join(f"{r[0]},{r[1]}" for r in ROWS[:-1]), encoding="utf-8")
    q = tmp_path / "fuel.json"
    q.write_text(json.dumps(dict(ROWS[:-1])), encoding="utf-8")
    assert get_fuel(str(p)).density(300.0) == pytest.approx(get_fuel(str(q)).density(300.0), rel=1e-12)


@pytest.mark.parametrize("rows, text", [
    (ROWS[:1] + ROWS[2:], "missing row(s) 'density at 15 °C'"),
    ([r if r[0] != "D86 50 % [°C]" else [r[0], "abc"] for r in ROWS], "must be a number in °C"),
    ([r if r[0] != "D86 50 % [°C]" else [r[0], None] for r in ROWS], "is empty"),
    (ROWS + [["densty", 3]], "unknown row 'densty'"),
    (ROWS + [["D86 10 %", 171]], "given twice"),
    (ROWS[:5] + ROWS[6:], "exactly two viscosity points"),
])
def test_bad_tables_say_what_is_expected(rows, text):
    with pytest.raises(FuelsysInputError) as e:
        parse_fuel_table(rows)
    assert text in str(e.value)
    if "missing" in text or "unknown" in text:
        for _, label, *_ in FUEL_TABLE_ROWS:  # the message lists the rows expected
            assert label in str(e.value)


def test_falling_d86_refused():
    rows = [r if r[0] != "D86 90 % [°C]" else [r[0], 190] for r in ROWS]
    with pytest.raises(FuelsysInputError, match="must rise"):
        get_fuel(rows)


def test_turbine_oil_builtin():
    oil = get_fuel("turbine-oil")
    # its own data points (library.TURBINE_OIL, MIL-PRF-23699 class, from memory)
    assert oil.kinematic_viscosity(40 + C) * 1e6 == pytest.approx(25.0, rel=1e-6)
    assert oil.kinematic_viscosity(100 + C) * 1e6 == pytest.approx(5.1, rel=1e-6)
    # MIL-PRF-23699: viscosity at -40 °C <= 13000 mm²/s (from memory)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        assert oil.kinematic_viscosity(-40 + C) * 1e6 < 13000.0
    # a non-volatile liquid: nothing vaporises
    assert oil.vapour_fraction(450.0, 101325.0, 0.05) == 0.0
    with pytest.raises(FuelsysInputError):
        oil.vapour_pressure(400.0)
