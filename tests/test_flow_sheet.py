"""The needle, manifold, line and bench functions as spreadsheet cells (fuelsys.sheet.call).

Values here check the spreadsheet face against the core API and its own inverses; the physics
references are in the test_flow_* files of each module.
"""

import numpy as np
import pytest

from fuelsys.flow.needle import needle_flow
from fuelsys.sheet import adapt, call, catalogue

NAMES = ["FS_NEEDLE_BORE", "FS_NEEDLE_OD", "FS_NEEDLE_FLOW", "FS_NEEDLE_FLOW_ML", "FS_NEEDLE_DP", "FS_NEEDLE_DP_ML",
         "FS_NEEDLE_REYNOLDS", "FS_NEEDLE_VELOCITY", "FS_BORE_FROM_TEST", "FS_MANIFOLD_SPLIT", "FS_TOLERANCE_SPREAD",
         "FS_LINE_DP", "FS_ODD_NEEDLES"]


@pytest.fixture(autouse=True)
def strict():
    old = adapt.STRICT
    adapt.STRICT = True          # a bug raises instead of becoming an "internal error" text
    yield
    adapt.STRICT = old


def _err(v):
    return isinstance(v, str) and v.startswith("FS error: ")


def test_contract_names_and_argument_orders():
    funcs = catalogue.functions()
    for n in NAMES:
        assert n in funcs
    sig = {n: [a.name for a in funcs[n].args] for n in NAMES}
    assert sig["FS_NEEDLE_BORE"] == ["gauge", "wall"]
    assert sig["FS_NEEDLE_OD"][:1] == ["gauge"]
    assert sig["FS_NEEDLE_FLOW"][:6] == ["bore_mm", "length_mm", "dp_bar", "fuel", "temp_c", "oil_pct"]
    assert sig["FS_NEEDLE_DP"][:6] == ["bore_mm", "length_mm", "flow_g_min", "fuel", "temp_c", "oil_pct"]
    assert sig["FS_NEEDLE_REYNOLDS"] == ["bore_mm", "flow_g_min", "fuel", "temp_c", "oil_pct"]
    assert sig["FS_NEEDLE_VELOCITY"] == ["bore_mm", "flow_g_min", "fuel", "temp_c", "oil_pct"]
    assert sig["FS_BORE_FROM_TEST"][:6] == ["volume_ml", "time_s", "dp_bar", "length_mm", "fluid", "temp_c"]
    assert sig["FS_MANIFOLD_SPLIT"][:9] == ["bores_mm", "length_mm", "supply_bar_gauge", "case_bar_gauge",
                                            "ring_bore_mm", "ring_dia_mm", "fuel", "temp_c", "oil_pct"]
    # the contract's arguments in order; oil_pct and bore_mm follow as optional extras
    assert sig["FS_TOLERANCE_SPREAD"][:11] == ["gauge", "wall", "needles", "length_mm", "dp_bar", "fuel", "temp_c",
                                               "bore_tol_mm", "length_tol_mm", "samples", "seed"]
    assert sig["FS_TOLERANCE_SPREAD"][11:] == ["oil_pct", "bore_mm"]
    assert sig["FS_LINE_DP"] == ["bore_mm", "length_m", "flow_g_min", "fuel", "temp_c", "k_total", "oil_pct"]
    for n in ("FS_NEEDLE_FLOW", "FS_NEEDLE_DP"):
        assert sig[n][-1] == "entrance" and not funcs[n].args[-1].required


def test_tubing_lookups():
    # ISO 9626:2016 Table 1 (from memory): 22G normal 0.390 mm, thin 0.440 mm; OD 0.698..0.730 mm
    assert call("FS_NEEDLE_BORE", 22) == pytest.approx(0.390)
    assert call("FS_NEEDLE_BORE", 22, "thin") == pytest.approx(0.440)
    assert call("FS_NEEDLE_OD", 22, "min") == pytest.approx(0.698)
    assert call("FS_NEEDLE_BORE", [[21, 22, 23]]) == [[pytest.approx(0.49), pytest.approx(0.39),
                                                        pytest.approx(0.317)]]


def test_round_trip_from_laminar_to_turbulent():
    # FS_NEEDLE_DP(FS_NEEDLE_FLOW(x)) = x within 1e-6 relative; water reaches turbulence in a wide needle
    dps = [[0.05, 0.3, 1.0, 3.0, 10.0, 20.0]]
    bores = [[0.15], [0.3], [0.6], [1.2]]
    for fuel in ("kerosene", "water"):
        q = call("FS_NEEDLE_FLOW", bores, 20, dps, fuel, 20)
        back = call("FS_NEEDLE_DP", bores, 20, q, fuel, 20)
        assert np.max(np.abs(np.array(back) / np.array(dps) - 1)) < 1e-6
        re = np.array(call("FS_NEEDLE_REYNOLDS", bores, q, fuel, 20))
        if fuel == "water":
            assert re.min() < 50 and re.max() > 1e4


def test_volumetric_variants():
    q = call("FS_NEEDLE_FLOW", 0.3, 25, 2, "kerosene", 15)
    v = call("FS_NEEDLE_FLOW_ML", 0.3, 25, 2, "kerosene", 15)
    rho = call("FS_DENSITY", "kerosene", 15)
    assert v == pytest.approx(q / rho * 1000.0, rel=1e-12)          # g/min -> mL/min at 15 degC
    assert call("FS_NEEDLE_DP_ML", 0.3, 25, v, "kerosene", 15) == pytest.approx(2.0, rel=1e-9)


def test_sheet_matches_the_core_api():
    from fuelsys.fuels import get_fuel

    k = get_fuel("kerosene")
    T = 288.15
    m = needle_flow(2e5, 0.3e-3, 25e-3, k.density(T), k.dynamic_viscosity(T))
    assert call("FS_NEEDLE_FLOW", 0.3, 25, 2, "kerosene", 15) == pytest.approx(m * 60e3, rel=1e-12)
    u = call("FS_NEEDLE_VELOCITY", 0.3, m * 60e3, "kerosene", 15)
    assert u == pytest.approx(m / k.density(T) / (np.pi * 0.3e-3 ** 2 / 4), rel=1e-12)


def test_oil_and_temperature_move_the_flow_the_right_way():
    base = call("FS_NEEDLE_FLOW", 0.2, 40, 0.5, "kerosene", 15)
    assert call("FS_NEEDLE_FLOW", 0.2, 40, 0.5, "kerosene", 15, 5) < base
    assert call("FS_NEEDLE_FLOW", 0.2, 40, 0.5, "kerosene", 40) > base


def test_entrance_option():
    sq = call("FS_NEEDLE_FLOW", 0.5, 5, 2, "kerosene", 15)
    re = call("FS_NEEDLE_FLOW", 0.5, 5, 2, "kerosene", 15, 0, "reentrant")
    k = call("FS_NEEDLE_FLOW", 0.5, 5, 2, "kerosene", 15, 0, 0.5)
    assert re < sq and k == pytest.approx(sq, rel=1e-12)


def test_bore_from_test_recovers_the_bore():
    v = call("FS_NEEDLE_FLOW_ML", 0.27, 25, 1.0, "water", 20)
    assert call("FS_BORE_FROM_TEST", v * 2.0, 120, 1.0, 25, "water", 20) == pytest.approx(0.27, rel=1e-8)


def test_manifold_split_is_a_column_and_conserves_the_ring():
    out = call("FS_MANIFOLD_SPLIT", [[0.3], [0.3], [0.3], [0.3], [0.3], [0.3]], 25, 3, 1, 4, 60, "kerosene", 15)
    assert len(out) == 6 and all(len(r) == 1 for r in out)
    q = np.array(out)[:, 0]
    assert np.max(np.abs(q / q.mean() - 1)) < 1e-3
    single = call("FS_NEEDLE_FLOW", 0.3, 25, 2, "kerosene", 15)
    assert q.mean() == pytest.approx(single, rel=1e-3)
    narrow = np.array(call("FS_MANIFOLD_SPLIT", [[0.5]] * 8, 25, 3, 1, 0.8, 60, "kerosene", 15))[:, 0]
    assert narrow[3] < narrow[0]
    per_needle = call("FS_MANIFOLD_SPLIT", [[0.3], [0.3], [0.3]], [[20], [25], [30]], 3, 1, 4, 60, "kerosene", 15)
    assert per_needle[0][0] > per_needle[1][0] > per_needle[2][0]


def test_tolerance_spread_table():
    t = call("FS_TOLERANCE_SPREAD", 27, "normal", 8, 25, 2, "kerosene", 15, 0.01, 0.2, 300, 7)
    rows = {r[0]: r[1] for r in t}
    assert rows["bore tolerance"] == pytest.approx(0.01)
    assert rows["nominal bore"] == pytest.approx(0.184 + 0.01)        # ISO minimum + tolerance
    assert 0 < rows["spread between needles (CV), mean of sets"] < 20
    assert rows["worst low needle, all sets"] < 0 < rows["worst high needle, all sets"]
    assert t == call("FS_TOLERANCE_SPREAD", 27, "normal", 8, 25, 2, "kerosene", 15, 0.01, 0.2, 300, 7)
    zero = {r[0]: r[1] for r in call("FS_TOLERANCE_SPREAD", 27, "normal", 8, 25, 2, "kerosene", 15, 0, 0, 20)}
    assert zero["spread between needles (CV), mean of sets"] < 1e-10
    # default bore tolerance: hypodermic ID tolerance +-0.00075 in for 20G and finer (needle gauge chart)
    dflt = {r[0]: r[1] for r in call("FS_TOLERANCE_SPREAD", 27, "normal", 8, 25, 2, "kerosene", 15)}
    assert dflt["bore tolerance"] == pytest.approx(0.00075 * 25.4)


def test_line_dp_and_odd_needles():
    assert 0 < call("FS_LINE_DP", 3, 1.0, 200, "kerosene", 15, 5) < call("FS_LINE_DP", 3, 1.0, 400, "kerosene", 15, 5)
    out = call("FS_ODD_NEEDLES", [[50], [51], [44], [50.5]])
    assert [r[1] for r in out] == ["ok", "ok", "ODD", "ok"]
    assert out[2][0] == pytest.approx((44 / 50.25 - 1) * 100)


@pytest.mark.parametrize("name, args, text", [
    ("FS_NEEDLE_BORE", (35,), "valid gauges: 34, 33"),
    ("FS_NEEDLE_BORE", (22, "heavy"), "valid: normal, thin, extra-thin"),
    ("FS_NEEDLE_BORE", (30, "extra-thin"), "extra-thin wall is not given for 30G"),
    ("FS_NEEDLE_FLOW", (0.3, 0, 2, "kerosene", 15), "length_mm must be > 0"),
    ("FS_NEEDLE_FLOW", (0.3, -5, 2, "kerosene", 15), "length_mm must be > 0"),
    ("FS_NEEDLE_FLOW", (0.3, 25, 0, "kerosene", 15), "dp_bar must be > 0"),
    ("FS_NEEDLE_FLOW", (0.3, 25, -1, "kerosene", 15), "dp_bar must be > 0"),
    ("FS_NEEDLE_FLOW", (0.3, 25, 25, "kerosene", 15), "above the model's limit of 20 bar"),
    ("FS_NEEDLE_FLOW", (0.3, 25, 2, "kerosene", 15, 0, "bellmouth"), "valid: square, reentrant"),
    ("FS_NEEDLE_DP", (0.3, 25, 200, "kerosene", 15), "above the model's limit of 20 bar"),
    ("FS_NEEDLE_DP", (0.1, 25, 1000, "kerosene", 15), "speed of sound"),
    ("FS_NEEDLE_FLOW", (0.3, 25, 2, "kerosene", -80), "temp_c"),
    ("FS_TOLERANCE_SPREAD", (30, "normal", 8, 25, 2, "kerosene", 15, 0.1), "reaches the tubing's outside diameter"),
    ("FS_MANIFOLD_SPLIT", ([[0.3], [0.3]], 25, 1, 2, 3, 60, "kerosene", 15), "supply pressure must be above case"),
    ("FS_MANIFOLD_SPLIT", ([[0.3], [0.3]], [[20], [25], [30]], 3, 1, 3, 60, "kerosene", 15), "one per needle"),
    ("FS_BORE_FROM_TEST", (10, 0, 1, 25, "water", 20), "time_s must be > 0"),
])
def test_bad_input_gives_fs_error_texts(name, args, text):
    out = call(name, *args)
    assert _err(out), out
    assert text in out, out


def test_bad_cells_fail_alone():
    out = call("FS_NEEDLE_FLOW", [[0.3], [-0.3], [0.4]], 25, 2, "kerosene", 15)
    assert isinstance(out[0][0], float) and isinstance(out[2][0], float)
    assert _err(out[1][0])


def test_tolerance_study_on_the_sheets_own_needle():
    """Given the bore the sheet uses and the oil, the study's nominal needle is FS_NEEDLE_FLOW's needle."""
    t = call("FS_TOLERANCE_SPREAD", 23, "normal", 6, 30, 3.0, "kerosene", -5, 0.02, 0.5, 500, 1, 5, 0.317)
    rows = {r[0]: r[1] for r in t}
    assert rows["nominal bore"] == pytest.approx(0.317, rel=1e-12)
    assert rows["nominal flow per needle"] == pytest.approx(call("FS_NEEDLE_FLOW", 0.317, 30, 3.0, "kerosene", -5, 5),
                                                            rel=1e-12)
    assert call("FS_NEEDLE_FLOW", 0.317, 30, 3.0, "air", 15).startswith("FS error: fuel: air is a gas")
