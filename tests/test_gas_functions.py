"""FS_CANISTER_PRESSURE through the spreadsheet face (cell-style inputs and outputs)."""

import pytest

from fuelsys.sheet import call

PSI = 6894.757e-5   # bar per psi (NIST SP 811)


def test_propane_at_20c():
    # R290 saturation table from Lemmon et al. 2009: 8.365 bar abs at 20 °C (from memory)
    out = call("FS_CANISTER_PRESSURE", "propane", 20)
    assert type(out) is float
    assert out == pytest.approx(8.365 - 1.01325, rel=2e-3)


def test_lpg_70_30_at_70f():
    # Engineering ToolBox, propane-butane mixture evaporation pressure, 70/30 at 70 °F:
    # 82 psig (checked; the table does not state mass or mole basis)
    assert call("FS_CANISTER_PRESSURE", "lpg-70-30", (70 - 32) / 1.8) == pytest.approx(82 * PSI, rel=0.06)


def test_butane_below_its_boiling_point_is_negative_gauge():
    # n-butane boils at -0.5 °C at 1 atm (Bücker & Wagner 2006, from memory)
    assert call("FS_CANISTER_PRESSURE", "butane", -10) < 0 < call("FS_CANISTER_PRESSURE", "butane", 10)


def test_range_broadcasts():
    out = call("FS_CANISTER_PRESSURE", "propane", [[0.0], [20.0], [40.0]])
    assert len(out) == 3 and all(len(r) == 1 for r in out)
    assert out[0][0] < out[1][0] < out[2][0]


def test_bad_inputs_are_error_texts():
    out = call("FS_CANISTER_PRESSURE", "propane", [[20.0], [-250.0], ["hot"], [None]])
    assert isinstance(out[0][0], float)
    assert out[1][0].startswith("FS error: temp_c -250.0 °C is outside propane's range")
    assert out[2][0].startswith("FS error: temp_c must be a number")
    assert out[3][0].startswith("FS error: temp_c is empty")
    assert call("FS_CANISTER_PRESSURE", "hydrogen", 20).startswith("FS error: gas: unknown gas 'hydrogen'; known:")
    assert call("FS_CANISTER_PRESSURE", "air", 20).startswith("FS error: gas: air is not a canister gas")
    assert call("FS_CANISTER_PRESSURE", "lpg-60-30", 20).startswith("FS error: gas: LPG blend")
    assert call("FS_CANISTER_PRESSURE", "propane", 120).startswith("FS error: temp_c 120.0 °C is outside")


def test_used_pct_lowers_a_blend_pressure():
    full = call("FS_CANISTER_PRESSURE", "lpg-70-30", 20)
    half = call("FS_CANISTER_PRESSURE", "lpg-70-30", 20, 50)
    assert half < full
    assert call("FS_CANISTER_PRESSURE", "lpg-70-30", 20, None) == full   # empty cell takes the default 0
    assert call("FS_CANISTER_PRESSURE", "propane", 20, 50) == pytest.approx(call("FS_CANISTER_PRESSURE", "propane", 20))
    assert call("FS_CANISTER_PRESSURE", "lpg-70-30", 20, 100).startswith("FS error: used_pct")


def test_gas_jet_regulated_pressure_typed_as_gauge_is_refused():
    # issue 13: a regulator gauge reading of 0.4 bar typed where bar abs belongs; absolute pressure is
    # gauge + 1.01325 bar (standard atmosphere, ISO 2533:1975)
    out = call("FS_GAS_JET_FLOW", 0.3, 0, 0.4, 1.4, "propane", 20)
    assert out.startswith("FS error: up_bar_abs = 0.4 bar abs looks like a gauge value")
    assert "1.41325 bar abs" in out
    assert call("FS_GAS_JET_FLOW", 0.3, 0, 1.41325, 1.2, "propane", 20) > 0
