"""Gear pump with DC motor, system curve, operating points (fuelsys.pump)."""

import numpy as np
import pytest

from fuelsys import pump as P
from fuelsys.errors import FuelsysInputError

# a pump of our own invention: 24 mL/min per volt, 1.2 ohm, 0.5 A friction, slip 2e-15 m³
TRUE = P.GearPump.physical(4.0e-7, 1.2, 0.5, 2.0e-15)


def _viscosity_dodecane(t_c):
    """n-dodecane as a kerosene stand-in: CoolProp (Huber, Laesecke & Perkins 2004 viscosity)."""
    CP = pytest.importorskip("CoolProp.CoolProp")
    return CP.PropsSI("V", "T", t_c + 273.15, "P", 101325.0, "n-Dodecane")


def _test_points(mu, noise=0.0, seed=7):
    volts = np.repeat([6.0, 9.0, 12.0], 4)
    dp = np.tile([0.5e5, 1.5e5, 3.0e5, 4.5e5], 3)
    mu = np.broadcast_to(mu, volts.shape)
    q = TRUE.flow(volts, dp, mu)
    rng = np.random.default_rng(seed)
    return q, dp, volts + rng.normal(0.0, noise, volts.size), mu


def test_fit_recovers_synthetic_coefficients_exactly():
    mu = np.repeat([1.9e-3, 1.0e-3, 1.4e-3], 4)  # test points at three fuel temperatures
    q, dp, v, mu = _test_points(mu)
    fit = P.fit_pump(q, dp, v, mu)
    p = fit.pump
    assert p.phi == pytest.approx(TRUE.phi, rel=1e-6)
    assert p.winding_ohm == pytest.approx(TRUE.winding_ohm, rel=1e-5)
    assert p.friction_current == pytest.approx(TRUE.friction_current, rel=1e-5)
    assert p.slip == pytest.approx(TRUE.slip, rel=1e-5)
    assert fit.rms_volts < 1e-8 and fit.r_squared == pytest.approx(1.0, abs=1e-12)


def test_fit_recovers_coefficients_with_noise():
    mu = np.repeat([1.9e-3, 1.0e-3, 1.4e-3], 4)
    q, dp, v, mu = _test_points(mu, noise=0.02)  # 20 mV reading noise
    fit = P.fit_pump(q, dp, v, mu)
    p, se = fit.pump, fit.std_errors
    for name, true in (("phi", TRUE.phi), ("winding_ohm", TRUE.winding_ohm),
                       ("friction_current", TRUE.friction_current), ("slip", TRUE.slip)):
        got = getattr(p, name)
        assert abs(got - true) < 4.0 * se[name] + 1e-12, name
    assert p.phi == pytest.approx(TRUE.phi, rel=0.01)
    assert p.slip == pytest.approx(TRUE.slip, rel=0.1)
    assert 0.005 < fit.rms_volts < 0.04
    assert fit.r_squared > 0.999
    assert fit.condition < P.MAX_CONDITION


def test_fit_with_measured_resistance_at_one_temperature():
    q, dp, v, mu = _test_points(1.3e-3, noise=0.01)
    fit = P.fit_pump(q, dp, v, mu, winding_ohm=1.2, kv=1000.0)
    assert fit.pump.slip == pytest.approx(TRUE.slip, rel=0.1)
    # Kv 1000 rpm/V -> k = 60/(2π·1000) V s/rad (Fitzgerald et al. 2003 §7.2); D = φ k
    k = 60.0 / (2 * np.pi * 1000.0)
    assert fit.pump.motor_k == pytest.approx(k, rel=1e-12)
    assert fit.pump.displacement == pytest.approx(TRUE.phi * k, rel=0.01)


def test_lumped_fit_holds_only_at_its_viscosity():
    q, dp, v, mu = _test_points(1.3e-3)
    fit = P.fit_pump(q, dp, v, mu)
    assert not fit.pump.separable
    assert fit.pump.volts(q, dp, 1.3e-3) == pytest.approx(v, rel=1e-8)
    with pytest.raises(FuelsysInputError, match="winding_ohm"):
        fit.pump.volts(3e-6, 2e5, 0.9e-3)


def test_more_voltage_more_flow_and_warm_fuel_slips_more():
    v = np.linspace(6.0, 14.0, 9)
    q = TRUE.flow(v, 3e5, 1.4e-3)
    assert np.all(np.diff(q) > 0)
    mu20, mu60 = _viscosity_dodecane(20.0), _viscosity_dodecane(60.0)
    assert mu60 < mu20  # thinner when warm (CoolProp n-dodecane)
    q20 = TRUE.flow(12.0, 3e5, mu20)
    q60 = TRUE.flow(12.0, 3e5, mu60)
    slip20 = TRUE.phi * (12.0 - TRUE.v0 - TRUE.winding_ohm * TRUE.phi * 3e5) - q20
    slip60 = TRUE.phi * (12.0 - TRUE.v0 - TRUE.winding_ohm * TRUE.phi * 3e5) - q60
    assert slip60 > slip20 > 0
    assert q60 < q20
    # slip ∝ 1/μ (laminar leakage, Wilson 1949)
    assert slip60 / slip20 == pytest.approx(mu20 / mu60, rel=1e-9)


def test_oil_in_fuel_thickens_it_and_cuts_slip():
    # a few per cent of turbine oil in the fuel (here 5 %): common practice, no source.
    # Blend viscosity from the fuels model; slip falls as 1/μ (Wilson 1949), so the pump gives more
    from fuelsys.fuels import get_fuel

    T = 293.15
    mu_kero = float(get_fuel("kerosene").dynamic_viscosity(T))
    mu_blend = float(get_fuel("kerosene", oil_pct=5.0).dynamic_viscosity(T))
    assert mu_blend > mu_kero
    assert TRUE.flow(12.0, 3e5, mu_blend) > TRUE.flow(12.0, 3e5, mu_kero)


def test_operating_point_lies_on_both_curves():
    def system(q):  # Pa: case 1.8 bar + needles ∝ q (laminar) + line ∝ q² (our own example)
        return 1.8e5 + 2.0e10 * q + 1.0e15 * q**2

    mu = 1.4e-3
    v = np.array([6.0, 9.0, 12.0])
    q = P.operating_flow(TRUE, v, system, mu)
    assert np.all(np.diff(q) > 0)
    p_sys = system(q)
    assert TRUE.flow(v, p_sys, mu) == pytest.approx(q, rel=1e-9)   # on the pump curve
    assert TRUE.volts(q, p_sys, mu) == pytest.approx(v, rel=1e-9)   # same point by voltage
    # at too low a voltage the pump cannot open the case pressure: no flow
    assert P.operating_flow(TRUE, 0.5, system, mu) == 0.0


def test_system_curve_terms():
    # ρ g n h: 800 kg/m³, 0.25 m, 4 g -> 800·9.80665·4·0.25 Pa (hydrostatics)
    assert P.head_pressure(0.25, 800.0, 4.0) == pytest.approx(800 * 9.80665 * 1.0, rel=1e-12)
    p = P.system_pressure(np.array([0.2e5, 1.8e5]), np.array([0.1e5, 1.5e5]), np.array([0.01e5, 0.2e5]),
                          density=800.0, head=0.25, g_load=4.0, margin_pct=10.0, filter_dp=0.05e5)
    expected = (np.array([0.2e5, 1.8e5]) + [0.1e5, 1.5e5] + [0.01e5, 0.2e5] + 0.05e5 + 800 * 9.80665) * 1.1
    assert p == pytest.approx(expected, rel=1e-12)
    with pytest.raises(FuelsysInputError, match="needle pressure drop"):
        P.system_pressure(1e5, -1.0, 0.0, density=800.0)


def test_battery_headroom_and_shortfall():
    mu = 1.4e-3
    q = np.array([1.2e-6, 5.0e-6])  # idle, full (m³/s)
    dp = np.array([0.6e5, 4.0e5])
    need = TRUE.volts(q, dp, mu)
    out = P.battery_check(TRUE, q, dp, mu, 12.0)
    assert out["volts"] == pytest.approx(need)
    assert out["headroom"] == pytest.approx(12.0 - need)
    ok = P.battery_check(TRUE, q, dp, mu, 16.0)
    assert bool(np.all(ok["ok"])) and "to spare" in ok["verdict"]
    short = need[1] - 11.1
    assert short > 0
    with pytest.raises(FuelsysInputError, match=rf"short by {short:.2f} V"):
        P.require_battery(TRUE, q, dp, mu, 11.1)


def test_fit_row_round_trip_and_parsing():
    mu = np.repeat([1.9e-3, 1.0e-3, 1.4e-3], 4)
    q, dp, v, mu = _test_points(mu)
    row = P.fit_row(P.fit_pump(q, dp, v, mu, kv=900.0))
    back = P.pump_from_row(row)
    assert back.volts(4e-6, 2e5, 1.1e-3) == pytest.approx(TRUE.volts(4e-6, 2e5, 1.1e-3), rel=1e-6)
    # transposed range (labels in a column), with upper-case labels and blank cells
    col = [[lab.upper(), val] for lab, val in zip(*row)] + [[None, None]]
    assert P.pump_from_row(col).phi == pytest.approx(back.phi, rel=1e-12)
    with pytest.raises(FuelsysInputError, match="flow_per_volt_ml_min_v"):
        P.pump_from_row([["rms_v"], [0.1]])


def test_bad_fits_are_refused():
    q, dp, v, mu = _test_points(1.3e-3)
    with pytest.raises(FuelsysInputError, match="at least 4 test points"):
        P.fit_pump(q[:3], dp[:3], v[:3], mu[:3])
    with pytest.raises(FuelsysInputError, match="one voltage"):
        P.fit_pump(q[:4], dp[:4], np.full(4, 12.0), 1.3e-3)
    with pytest.raises(FuelsysInputError, match="same count"):
        P.fit_pump(q, dp[:-1], v, 1.3e-3)
    # collinear: flow and pressure rise together along one line through all points
    qq = np.linspace(1e-6, 5e-6, 6)
    with pytest.raises(FuelsysInputError, match="cannot fix the pump coefficients"):
        P.fit_pump(qq, qq * 1e11, 2.0 + qq * 2e6 + qq * 1e5, 1.3e-3)


# -- spreadsheet face ------------------------------------------------------------------
def _col(a):
    return [[float(x)] for x in a]


def test_sheet_pump_functions():
    from fuelsys.fuels import get_fuel
    from fuelsys.sheet import call

    k = get_fuel("kerosene")
    volts = np.repeat([6.0, 9.0, 12.0], 4)
    dp = np.tile([0.5e5, 1.5e5, 3.0e5, 4.5e5], 3)
    t_c = np.repeat([10.0, 40.0, 25.0], 4)
    T = t_c + 273.15
    g_min = TRUE.flow(volts, dp, k.dynamic_viscosity(T)) * k.density(T) * 6e4
    fit = call("FS_PUMP_FIT", _col(g_min), _col(dp / 1e5), _col(volts), "kerosene", _col(t_c))
    labels, values = fit
    got = dict(zip(labels, values))
    assert got["flow_per_volt_ml_min_v"] == pytest.approx(TRUE.phi * 6e7, rel=1e-6)
    assert got["winding_ohm"] == pytest.approx(1.2, rel=1e-5)
    assert got["points"] == 12.0
    # voltage and flow are inverse of each other, at any fuel temperature
    v = call("FS_PUMP_VOLTS", fit, 200.0, 3.5, "kerosene", 40.0)
    assert call("FS_PUMP_FLOW", fit, v, 3.5, "kerosene", 40.0) == pytest.approx(200.0, rel=1e-9)
    # warm fuel slips more: more volts for the same flow
    assert call("FS_PUMP_VOLTS", fit, 200.0, 3.5, "kerosene", 60.0) > call("FS_PUMP_VOLTS", fit, 200.0, 3.5,
                                                                            "kerosene", 0.0)
    # per-cell errors: too little voltage to open the pressure
    row = call("FS_PUMP_FLOW", fit, [[12.0, 1.0]], 3.5)
    assert isinstance(row[0][0], float) and row[0][1].startswith("FS error: the pump delivers nothing")
    # system curve
    need = call("FS_PUMP_NEED", 260, 1.8, 1.2, 0.3, 0.25, 3, 10)
    rho = float(k.density(293.15))
    assert need == pytest.approx((1.8e5 + 1.2e5 + 0.3e5 + rho * 9.80665 * 3 * 0.25) * 1.1 / 1e5, rel=1e-9)


def test_sheet_pump_fit_errors():
    from fuelsys.sheet import call

    four = [[100.0], [120.0], [150.0], [90.0]]
    assert call("FS_PUMP_FIT", four[:3], four[:3], [[6.0], [9.0], [12.0]]).startswith(
        "FS error: a pump fit needs at least 4 test points")
    assert "one voltage" in call("FS_PUMP_FIT", four, [[1.0], [2.0], [3.0], [4.0]], [[12.0]] * 4)
    assert call("FS_PUMP_VOLTS", [["rms_v"], [0.1]], 100.0, 2.0).startswith("FS error: coefficients")


def test_fit_refuses_points_that_no_gear_pump_gives():
    """Flow must rise with voltage (positive displacement; Wilson 1949): falling flows, or none, are refused."""
    from fuelsys.sheet import call

    zero = call("FS_PUMP_FIT", [[0], [0], [0], [0]], [[1], [2], [3], [1]], [[3], [6], [9], [6]])
    assert zero.startswith("FS error: every test flow is zero")
    falling = call("FS_PUMP_FIT", [[300], [200], [100], [250]], [[1], [2], [1], [2]], [[3], [6], [9], [5]])
    assert falling.startswith("FS error: in these test points the flow does not rise with the voltage")


def test_volts_outside_the_tested_range_are_flagged():
    """A fit holds between the voltages it was tested at; beyond them it is an extrapolation, flagged."""
    import warnings

    from fuelsys.errors import ValidityWarning
    from fuelsys.sheet import adapt, call

    flows = [[118.2], [247.6], [375.9], [263.4], [104.9], [228.5], [393.4], [365.6]]  # the demo's points (invented)
    bars = [[1.0], [3.0], [5.0], [1.0], [2.0], [4.0], [2.0], [5.0]]
    volts = [[3.0], [6.0], [9.0], [6.0], [3.0], [6.0], [9.0], [9.0]]
    temps = [[12.0]] * 4 + [[28.0]] * 4
    fit = call("FS_PUMP_FIT", flows, bars, volts, "kerosene", temps)
    row = dict(zip(fit[0], fit[1]))
    assert (row["tested_min_v"], row["tested_max_v"]) == (3.0, 9.0)
    sink = []
    old = adapt.set_note_sink(sink)
    try:
        inside = call("FS_PUMP_VOLTS", fit, 250, 3, "kerosene", 20)
        assert 3 <= inside <= 9 and not sink
        call("FS_PUMP_VOLTS", fit, 50, 0.5, "kerosene", 20)
    finally:
        adapt.set_note_sink(old)
    assert sink and "voltages of its test points" in sink[0]
    with warnings.catch_warnings():
        warnings.simplefilter("error", ValidityWarning)
        assert isinstance(call("FS_PUMP_FLOW", fit, 6, 2, "kerosene", 20), float)  # the cell still computes


def test_exact_points_at_one_temperature_fit_with_r_squared_one():
    """flow = 80·V − 25·p (g/min, V, bar), noise-free over 4 voltages and 2 pressures: a plane, fitted exactly.

    Synthetic points made here from the stated plane (our own numbers): V = flow/80 + (25/80)·p, so the fit
    must give 80 g/min per volt, 0.3125 V per bar and no intercept.
    """
    from fuelsys.fuels import get_fuel
    from fuelsys.sheet import call

    volts = [3.0, 5.0, 7.0, 9.0] * 2
    bars = [1.0] * 4 + [3.0] * 4
    flows = [80.0 * v - 25.0 * b for v, b in zip(volts, bars)]
    fit = call("FS_PUMP_FIT", _col(flows), _col(bars), _col(volts), "kerosene", 20.0)
    assert isinstance(fit, list), fit
    got = dict(zip(*fit))
    rho = float(get_fuel("kerosene").density(293.15))
    assert got["r2"] == pytest.approx(1.0, abs=1e-12)
    assert got["flow_per_volt_ml_min_v"] == pytest.approx(80.0 / rho * 1e3, rel=1e-8)
    assert got["dp_v_per_bar"] == pytest.approx(25.0 / 80.0, rel=1e-8)
    assert abs(got["v0_v"]) < 1e-8
    # the resistance and the slip are not parted by one temperature: the cells say so instead of an error
    assert got["winding_ohm"].startswith("combined") and got["slip_mm3"].startswith("combined")
    # the combined fit predicts back its own points at the test temperature
    assert call("FS_PUMP_VOLTS", fit, flows[5], bars[5], "kerosene", 20.0) == pytest.approx(volts[5], rel=1e-9)


def test_exact_points_with_measured_resistance_recover_every_coefficient():
    """One temperature plus R measured across the terminals parts slip from resistance (module docstring)."""
    q, dp, v, mu = _test_points(1.3e-3)
    fit = P.fit_pump(q, dp, v, mu, winding_ohm=TRUE.winding_ohm)
    assert fit.r_squared == pytest.approx(1.0, abs=1e-12) and not fit.note
    for name in ("phi", "friction_current", "slip"):
        assert getattr(fit.pump, name) == pytest.approx(getattr(TRUE, name), rel=1e-6), name
    # and it predicts at another viscosity (a colder day) as the true pump does
    assert fit.pump.volts(4e-6, 3e5, 2.5e-3) == pytest.approx(TRUE.volts(4e-6, 3e5, 2.5e-3), rel=1e-6)


def test_temperatures_too_close_give_the_combined_coefficient_and_say_so():
    """Two temperatures 3 % apart in viscosity, with 20 mV reading noise, cannot part R from the slip."""
    mu = np.repeat([1.30e-3, 1.34e-3, 1.30e-3], 4)
    q, dp, v, mu = _test_points(mu, noise=0.02)
    fit = P.fit_pump(q, dp, v, mu)
    assert not fit.pump.separable and "too close" in fit.note
    assert fit.r_squared > 0.999
    row = dict(zip(*P.fit_row(fit)))
    assert row["winding_ohm"].startswith("combined")
    assert P.pump_from_row(P.fit_row(fit)).dp_volts == pytest.approx(fit.pump.dp_volts, rel=1e-12)
