"""The vaporiser's spreadsheet functions, called exactly as cells would call them.

Builders' units at this face (mm, g/s, g/min, bar abs, °C, ms); the values are checked against the
core API in SI and against closed forms.  The tube and operating point are our own invention.
"""

import math
import warnings

import pytest

from fuelsys import thermo
from fuelsys import vaporiser as vap
from fuelsys.errors import ValidityWarning
from fuelsys.fuels import get_fuel
from fuelsys.sheet import adapt, call, is_error

ARGS = (6, 150, 30, 4, 3, 200, 600, "kerosene")  # bore mm, heated mm, fuel g/min, air g/s, bar abs, t3 °C, wall °C


@pytest.fixture(autouse=True)
def strict(monkeypatch):
    monkeypatch.setattr(adapt, "STRICT", True)


def _core(oil_pct=0.0):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        return vap.vaporiser(6e-3, 0.15, 30e-3 / 60, 4e-3, 3e5, 473.15, 873.15,
                             get_fuel("kerosene").with_oil(oil_pct))


def test_tube_air_in_builders_units():
    # incompressible check of the same orifice: Cd A (2 rho dp)^0.5 (Lefebvre & Ballal 3rd ed. ch. 4) with the
    # compressible expansion factor below 1 for a 3 % drop
    g_s = call("FS_TUBE_AIR", 6, 3, 3, 200)
    rho = 3e5 / (thermo.R_AIR * 473.15)
    inc = 0.6 * 0.25 * math.pi * 0.006 ** 2 * math.sqrt(2 * rho * 0.03 * 3e5) * 1e3
    assert 0.98 * inc < g_s < inc
    assert call("FS_TUBE_AIR", 6, 3, 3, 200, 0.8) == pytest.approx(g_s * 0.8 / 0.6, rel=1e-12)
    grid = call("FS_TUBE_AIR", [[5], [6]], 3, 3, [[150, 200]])
    assert len(grid) == 2 and len(grid[0]) == 2 and grid[1][1] == pytest.approx(g_s, rel=1e-12)
    # a liner drop of a few per cent of the case pressure (common practice, no source) gives grams per second
    assert 1.0 < g_s < 10.0


def test_vaporiser_table_and_items_match_the_core():
    table = call("FS_VAPORISER", *ARGS)
    labels = [row[0] for row in table]
    for need in ("vaporised_pct", "exit_c", "dew_point_c", "dew_margin_k", "residence_ms", "droplet_life_ms",
                 "tube_phi", "exit_velocity_m_s", "flame_speed_m_s", "max_wet_wall_c", "oil_residue_g_h",
                 "dp_mbar", "verdict"):
        assert need in labels
    values = dict((row[0], row[1]) for row in table)
    r = _core()
    assert values["exit_c"] == pytest.approx(r.exit_temperature - 273.15, rel=1e-12)
    assert values["vaporised_pct"] == pytest.approx(r.vapour_fraction * 100, rel=1e-12)
    assert values["residence_ms"] == pytest.approx(r.residence_time * 1e3, rel=1e-12)
    assert values["dp_mbar"] == pytest.approx(r.pressure_drop / 100, rel=1e-12)
    assert values["dew_margin_k"] == pytest.approx(values["exit_c"] - values["dew_point_c"], abs=1e-9)
    assert values["verdict"] == r.verdict
    # one item: the same value alone
    assert call("FS_VAPORISER", *ARGS, None, "exit_c") == pytest.approx(values["exit_c"], rel=1e-12)
    assert call("FS_VAPORISER", *ARGS, 0, "VERDICT") == values["verdict"]
    # no liquid on the wall at this point: a text, not a number
    assert isinstance(values["max_wet_wall_c"], (str, float))


def test_oil_residue_in_grams_per_hour():
    r = _core(3.0)
    g_h = call("FS_VAPORISER", *ARGS, 3, "oil_residue_g_h")
    blend = get_fuel("kerosene").with_oil(3.0)
    # all the oil leaves as liquid: fuel flow x oil mass share, g/min -> g/h (x 60)
    assert g_h == pytest.approx(30 * blend.oil_mass_share * 60, rel=1e-12)
    assert g_h == pytest.approx(r.oil_residue * 3.6e6, rel=1e-12)


def test_profile_table_for_a_chart():
    rows = call("FS_VAPORISER_PROFILE", *ARGS, 0, 6)
    assert rows[0] == ["position_mm", "gas_c", "wall_c", "vaporised_pct", "velocity_m_s"]
    assert len(rows) == 7
    assert rows[1][0] == 0.0 and rows[-1][0] == pytest.approx(150.0)
    gas = [r[1] for r in rows[1:]]
    assert all(b > a for a, b in zip(gas, gas[1:]))  # heated all along
    assert all(r[2] == pytest.approx(600.0) for r in rows[1:])  # the uniform wall
    exit_c = call("FS_VAPORISER", *ARGS, 0, "exit_c")
    assert rows[-1][1] == pytest.approx(exit_c, rel=1e-9)


def test_residence_time_in_ms():
    # plug flow at constant temperature without fuel: t = A L rho / m (ideal gas, fuelsys.thermo R_AIR)
    ms = call("FS_RESIDENCE_TIME", 6, 150, 4, 0, 3, 200)
    rho = 3e5 / (thermo.R_AIR * 473.15)
    assert ms == pytest.approx(0.25 * math.pi * 0.006 ** 2 * 0.15 * rho / 4e-3 * 1e3, rel=1e-12)
    hotter = call("FS_RESIDENCE_TIME", 6, 150, 4, 30, 3, 200, 300)
    assert hotter < ms
    faster = call("FS_RESIDENCE_TIME", 6, 150, [[2, 4, 8]], 0, 3, 200)
    assert faster[0][0] > faster[0][1] > faster[0][2]


@pytest.mark.parametrize("args,text", [
    ((6, 0, 30, 4, 3, 200, 600, "kerosene"), "heated_length_mm must be > 0"),
    ((6, 150, 30, 0, 3, 200, 600, "kerosene"), "air_g_s must be > 0"),
    ((6, 150, 30, 4, 0.9, 200, 600, "kerosene"), "case pressure 0.9 bar abs is below ambient"),
    ((6, 150, 30, 4, 3, 200, 600, "air"), "air is not a fuel"),
    ((6, 150, 30, 4, 3, 200, 600, "kerosene", 0, "colour"), "item must be one of"),
    ((6, 150, None, 4, 3, 200, 600, "kerosene"), "fuel_g_min is empty"),
])
def test_bad_input_gives_error_text(args, text):
    out = call("FS_VAPORISER", *args)
    assert is_error(out) and text in out, out


def test_cold_wall_is_a_verdict_not_an_error():
    out = call("FS_VAPORISER", 6, 150, 180, 2, 2, 150, 80, "kerosene", 0, "verdict")
    assert not is_error(out)
    assert out.startswith("poor") and "no hotter than the inlet air" in out


def test_return_shape_option():
    straight = call("FS_VAPORISER", *ARGS, 0, "dp_mbar")
    bent = call("FS_VAPORISER", *ARGS, 0, "dp_mbar", "return")
    assert bent > 2 * straight  # two legs plus the bend
    rows = call("FS_VAPORISER_PROFILE", *ARGS, 0, 5, "return")
    assert rows[-1][0] == pytest.approx(300.0)
    out = call("FS_VAPORISER", *ARGS, 0, None, "bent")
    assert is_error(out) and "shape must be one of straight, return" in out


def test_verdict_levels_follow_the_march_and_cautions_stay_cautions():
    """A tube that vaporises its fuel well above the dew point, at both ends of the heat-transfer uncertainty,
    is "good"; the verdict is one word and its one decisive reason (issue 13: at most about 100 characters);
    the d²-law droplet check and the assumed deposit threshold are cautions in their own cell
    (DEW_MARGIN_MIN_K: common practice, no source)."""
    from fuelsys import vaporiser

    args = (6, 90, 37, 4.2, 2.63, 140, 650, "kerosene", 0)
    good = call("FS_VAPORISER", *args, "verdict")
    assert good.startswith("good: fully vaporised") and len(good) <= 100
    cautions = call("FS_VAPORISER", *args, "cautions")
    assert "coking risk" in cautions and "droplets" in cautions
    low = call("FS_VAPORISER", *args, "dew_margin_low_k")
    high = call("FS_VAPORISER", *args, "dew_margin_high_k")
    margin = call("FS_VAPORISER", *args, "dew_margin_k")
    assert vaporiser.DEW_MARGIN_MIN_K < low < margin < high
    # more fuel: the band straddles the threshold -> marginal, and the verdict says the band decides it
    for fuel in (40, 42, 45, 48, 50):
        a = (6, 90, fuel, 4.2, 2.63, 140, 650, "kerosene", 0)
        lo, hi = call("FS_VAPORISER", *a, "dew_margin_low_k"), call("FS_VAPORISER", *a, "dew_margin_high_k")
        if lo < vaporiser.DEW_MARGIN_MIN_K < hi:
            v = call("FS_VAPORISER", *a, "verdict")
            assert v.startswith("marginal") and "heat-transfer uncertainty" in v and len(v) <= 100, v
            break
    else:
        pytest.fail("no fuel flow in the sweep gave a dew-margin band across the threshold")
    # a cool wall: no coking caution where the wetted wall stays below the threshold
    cool = call("FS_VAPORISER", 6, 150, 30, 4, 3, 200, 240, "kerosene", 0, "cautions")
    assert "coking" not in cool


# -- the fuel's temperature at the needle (issue 12) and ranges of operating points (issue 17) ----------

def test_fuel_temperature_at_the_needle_is_an_optional_argument():
    default = call("FS_VAPORISER", *ARGS, 0, "exit_c")
    assert call("FS_VAPORISER", *ARGS, 0, "exit_c", "straight", 25) == default  # default as before: 25 °C
    warm = call("FS_VAPORISER", *ARGS, 0, "exit_c", "straight", 60)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        core = vap.vaporiser(6e-3, 0.15, 30e-3 / 60, 4e-3, 3e5, 473.15, 873.15, get_fuel("kerosene"),
                             t_fuel_in=333.15)
    assert warm == pytest.approx(core.exit_temperature - 273.15, rel=1e-12)
    assert warm > default  # warmer fuel brings more enthalpy in (energy balance)
    rows = call("FS_VAPORISER_PROFILE", *ARGS, 0, 3, "straight", 60)
    assert rows[-1][1] == pytest.approx(warm, rel=1e-12)
    out = call("FS_VAPORISER", *ARGS, 0, "exit_c", "straight", 400)
    assert is_error(out) and "fuel inlet temperature must be within" in out


def test_a_range_of_operating_points_equals_single_cells():
    fuel = [[12], [25], [40], [55]]
    air = [[2.0], [3.0], [4.0], [4.5]]
    t3 = [[90], [140], [190], [220]]
    column = call("FS_VAPORISER", 6, 150, fuel, air, 3, t3, 600, "kerosene", 0, "dew_margin_k")
    table = call("FS_VAPORISER", 6, 150, fuel, air, 3, t3, 600, "kerosene")
    assert len(column) == 4 and all(len(row) == 1 for row in column)
    assert all(len(row) == 5 for row in table)
    for i in range(4):
        single = call("FS_VAPORISER", 6, 150, fuel[i][0], air[i][0], 3, t3[i][0], 600, "kerosene")
        for row_batch, row_one in zip(table, single):
            assert row_batch[0] == row_one[0]
            if isinstance(row_one[1], float):
                assert row_batch[i + 1] == pytest.approx(row_one[1], rel=1e-9, abs=1e-9), row_one[0]
            else:
                assert row_batch[i + 1].split(":")[0] == row_one[1].split(":")[0]
        assert column[i][0] == pytest.approx(dict(single)["dew_margin_k"], rel=1e-9)


def test_profile_over_a_range_numbers_its_points():
    rows = call("FS_VAPORISER_PROFILE", 6, [[100], [150]], 30, 4, 3, 200, 600, "kerosene", 0, 3)
    assert rows[0][0] == "point" and len(rows) == 1 + 2 * 3
    assert [r[0] for r in rows[1:]] == [1, 1, 1, 2, 2, 2]
    assert rows[3][1] == pytest.approx(100.0) and rows[6][1] == pytest.approx(150.0)
    one = call("FS_VAPORISER_PROFILE", 6, 150, 30, 4, 3, 200, 600, "kerosene", 0, 3)
    assert rows[6][1:] == pytest.approx(one[3], rel=1e-9)


def test_ranges_of_different_lengths_are_refused():
    out = call("FS_VAPORISER", 6, 150, [[20], [30], [40]], [[4], [5]], 3, 200, 600, "kerosene", 0, "exit_c")
    assert is_error(out) and "air_g_s holds 2 values; give one, or 3" in out


def test_vaporiser_notes_reach_the_notes_list():
    """FS_VAPORISER no longer silences its warnings: the notes that `fuelsys recalc --notes` lists are there."""
    notes = []
    old = adapt.set_note_sink(notes)
    try:
        call("FS_VAPORISER", 6, 150, 30, 4, 3, 200, 600, "kerosene", 0, "exit_c")
    finally:
        adapt.set_note_sink(old)
    assert any(n.startswith("FS_VAPORISER: vaporiser: wall more than twice the gas temperature") for n in notes), notes


# -- the heated length for a required dew margin (issue 14) -------------------------------------------

@pytest.mark.parametrize("args", [
    (6, 37, 4.2, 2.63, 140, 650, "kerosene", 20),
    (6, 25, 3.0, 2.0, 100, 600, "kerosene", 40, 500, 4),
    (5, 20, 2.0, 1.6, 60, 550, "kerosene", 10, 400, 0, "return", 40),
])
def test_tube_length_fed_back_gives_the_margin(args):
    """FS_TUBE_LENGTH inverts FS_VAPORISER's march: fed back, the exit sits at the required margin (0.5 K)."""
    length = call("FS_TUBE_LENGTH", *args)
    assert isinstance(length, float) and 5 < length < 500, length
    bore, fuel, air, case, t3, wall, name, margin = args[:8]
    rest = list(args[8:]) + [500, 0, "straight", 25][len(args) - 8:]
    oil, shape, fuel_c = rest[1], rest[2], rest[3]
    back = call("FS_VAPORISER", bore, length, fuel, air, case, t3, wall, name, oil, "dew_margin_k", shape, fuel_c)
    assert back == pytest.approx(margin, abs=0.5)


def test_tube_length_refuses_a_margin_no_length_reaches():
    out = call("FS_TUBE_LENGTH", 6, 37, 4.2, 2.63, 140, 300, "kerosene", 150, 200)
    assert is_error(out) and "no heated length up to 200 mm gives a dew margin of 150 K" in out, out
