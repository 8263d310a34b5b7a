"""Spreadsheet functions for the engine and pump: case pressure, fuel demand, pump sizing.

Pressures in bar (gauge unless the name says abs), flows in g/min of fuel,
air in g/s, temperatures in °C, voltages in V.  The pump functions share the
coefficients range that FS_PUMP_FIT returns (a row of labels over a row of
values; the range may also be given transposed).
"""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.fuels import fuel_h_to_c
from fuelsys.sheet.catalogue import Arg, Returns, from_si, spreadsheet_function
from fuelsys.sheet.decl import checked_temperature

_FUEL = Arg("fuel", "fuel", "-", "built-in fuel name or a fuel table range", default="kerosene")
_TEMP = Arg("temp_c", "number", "°C", "fuel temperature", default=20.0, gt=-273.15)
_OIL = Arg("oil_pct", "number", "% vol", "turbine oil mixed into the fuel", default=0.0, low=0, high=20,
           group=True)
#: a pump-fit range for the examples (labels over values, as FS_PUMP_FIT gives them; round numbers)
_COEF_EXAMPLE = [["flow_per_volt_ml_min_v", "v0_v", "dp_v_per_bar", "winding_ohm", "friction_a", "slip_mm3"],
                 [24.0, 0.5, 0.3, 1.0, 0.5, 2e-6]]
_COEF = Arg("coefficients", "cells", "-", "the range FS_PUMP_FIT returned (labels and values)")
#: combustion efficiency default: small vaporiser engines run a few per cent short of complete
#: combustion (common practice, no source)
ETA_DEFAULT = 0.95


def _liquid(fuel, what="fuel"):
    if getattr(fuel, "kind", "liquid") != "liquid" and not np.isfinite(getattr(fuel, "lhv", np.nan)):
        raise FuelsysInputError(f"{what}: {fuel.name} has no liquid properties for a fuel pump")
    return fuel


@spreadsheet_function(
    name="FS_CASE_PRESSURE", category="engine and pump",
    summary="Case (compressor delivery) pressure at a shaft speed, scaled from the full-speed pressure ratio",
    args=[Arg("rpm", "number", "rpm", "shaft speed", low=0),
          Arg("rpm_max", "number", "rpm", "full (design) speed", gt=0),
          Arg("pr_max", "number", "-", "compressor pressure ratio at full speed", low=1, high=20),
          Arg("ambient_bar_abs", "number", "bar abs", "ambient pressure", default=1.01325, gt=0, high=2)],
    returns=Returns("number", "bar gauge", "case pressure above ambient"),
    source="Euler's turbine equation with constant slip, power-input factor and efficiency: isentropic "
           "enthalpy rise ∝ N² (Saravanamuttoo et al., Gas Turbine Theory 6th ed. §4.2); air properties "
           "NASA Glenn polynomials (McBride, Zehe & Gordon 2002); inlet at 15 °C",
    si=True,
    example=(80000, 120000, 2.5),
)
def fs_case_pressure(speed, speed_max, pr_max, p_ambient):
    from fuelsys import engine

    return engine.case_pressure(speed / speed_max, pr_max, p_ambient)


@spreadsheet_function(
    name="FS_FUEL_DEMAND", category="engine and pump",
    summary="Fuel flow that heats the engine's air from compressor exit to turbine inlet temperature",
    args=[Arg("air_g_s", "number", "g/s", "air mass flow through the engine", gt=0),
          Arg("t3_c", "number", "°C", "compressor exit (combustor inlet) temperature", gt=-273.15),
          Arg("t4_c", "number", "°C", "turbine inlet temperature", gt=-273.15),
          Arg("fuel", "fuel", "-", "built-in fuel name or a fuel table range"),
          Arg("efficiency", "number", "-", "combustion efficiency (theoretical over actual fuel)",
              default=ETA_DEFAULT, gt=0, high=1)],
    returns=Returns("number", "g/min", "fuel mass flow"),
    source="steady-flow energy balance with the lower heating value, combustion efficiency as "
           "theoretical/actual fuel-air ratio (Saravanamuttoo et al., Gas Turbine Theory 6th ed. §2.3); "
           "air and lean products from NASA Glenn polynomials (McBride, Zehe & Gordon 2002)",
    si=True,
    example=(250, 150, 850, "kerosene"),
)
def fs_fuel_demand(air, T3, T4, fuel, efficiency):
    from fuelsys import engine

    lhv = float(getattr(fuel, "lhv", np.nan))
    if not np.isfinite(lhv) or lhv <= 0:
        raise FuelsysInputError(f"fuel: {fuel.name} has no heating value")
    try:
        y = fuel_h_to_c(fuel)
    except FuelsysInputError as exc:
        raise FuelsysInputError(f"fuel: {exc}") from None
    return engine.fuel_flow(air, T3, T4, lhv, y, efficiency)


@spreadsheet_function(
    name="FS_PUMP_NEED", category="engine and pump",
    summary="Pump outlet pressure the fuel system needs at a flow (the system curve)",
    args=[Arg("flow_g_min", "number", "g/min", "fuel flow the drops below belong to", low=0),
          Arg("case_bar_gauge", "number", "bar gauge", "combustor case pressure at that flow", low=0),
          Arg("needle_dp_bar", "number", "bar", "manifold and needle pressure drop at that flow", low=0),
          Arg("line_dp_bar", "number", "bar", "line, filter and valve pressure drops at that flow", low=0),
          Arg("head_m", "number", "m", "height of the injectors above the tank", default=0.0, low=-5, high=5),
          Arg("g_load", "number", "-", "manoeuvre load factor along that height", default=1.0, low=0, high=20),
          Arg("margin_pct", "number", "%", "safety margin on the total", default=0.0, low=0, high=200, si="%"),
          _FUEL, _TEMP, _OIL],
    returns=Returns("number", "bar gauge", "pressure needed at the pump outlet"),
    source="sum of series losses plus hydrostatic head ρ g n h (White, Fluid Mechanics 7th ed. §6.9); "
           "fuel density from the fuel model",
    si=True,
    example=(200, 1.5, 3, 0.4),
)
def fs_pump_need(mdot, p_case, needle_dp, line_dp, head, g_load, margin_pct, fuel, T, oil_pct):
    fuel = fuel.with_oil(oil_pct)
    from fuelsys import pump

    rho = np.asarray(_liquid(fuel).density(checked_temperature(fuel, T, "temp_c")))
    p = pump.system_pressure(p_case, needle_dp, line_dp, density=rho, head=head, g_load=g_load,
                             margin_pct=margin_pct)
    return np.asarray(p) + 0.0 * mdot  # the flow only sets the shape of the answer


@spreadsheet_function(
    name="FS_PUMP_FIT", category="engine and pump",
    summary="Fit a gear pump with its DC motor to bench test points of flow, pressure and voltage",
    args=[Arg("flows_g_min", "range", "g/min", "measured fuel flows, one per test point", low=0),
          Arg("pressures_bar", "range", "bar gauge", "pump outlet pressures (inlet at 0 bar gauge)", low=0),
          Arg("volts", "range", "V", "motor terminal voltages", gt=0),
          _FUEL,
          Arg("temp_c", "range", "°C", "fuel temperature: one value, or one per test point", default=20.0,
              gt=-273.15),
          Arg("winding_ohm", "number", "Ω", "motor resistance measured across its terminals (optional)",
              default=None, low=0, high=100),
          Arg("kv_rpm_per_v", "number", "rpm/V", "motor speed constant from its data sheet (optional)",
              default=None, gt=0),
          _OIL],
    returns=Returns("table", "-", "a row of labels over a row of values: flow per volt (mL/min/V), winding "
                                  "resistance (Ω), friction current (A), slip (mm³), fit viscosity, "
                                  "RMS error (V), R², condition number, points, lowest and highest "
                                  "tested voltage (V)"),
    source="gear pump with laminar slip ∝ Δp/μ and torque DΔp + friction (Wilson 1949), permanent-magnet "
           "DC motor V = RI + kω, T = kI (Fitzgerald, Kingsley & Umans 2003 §7.2); least squares "
           "(scipy.optimize.least_squares), standard errors from the Jacobian (Bates & Watts 1988)",
    si=True,
    example=([[118.2], [247.6], [375.9], [263.4], [104.9], [228.5], [393.4], [365.6]], [[1.0], [3.0], [5.0], [1.0], [2.0], [4.0], [2.0], [5.0]], [[3.0], [6.0], [9.0], [6.0], [3.0], [6.0], [9.0], [9.0]], "kerosene"),
)
def fs_pump_fit(mdot, p, volts, fuel, T, winding_ohm, kv_rpm_per_v, oil_pct):
    fuel = fuel.with_oil(oil_pct)
    from fuelsys import pump

    mdot, p, v, T = (np.atleast_1d(np.asarray(x, dtype=float)) for x in (mdot, p, volts, T))
    if T.size not in (1, mdot.size):
        raise FuelsysInputError(f"temp_c: give one temperature or one per test point ({mdot.size}), got {T.size}")
    T = checked_temperature(_liquid(fuel), T, "temp_c")
    rho = np.asarray(fuel.density(T))
    mu = np.asarray(fuel.dynamic_viscosity(T))
    if mdot.size != p.size or mdot.size != v.size:
        raise FuelsysInputError(
            f"flows, pressures and volts need the same count of test points (got {mdot.size}, {p.size}, {v.size})")
    fit = pump.fit_pump(mdot / rho, p, v, mu, winding_ohm=winding_ohm, kv=kv_rpm_per_v)
    return pump.fit_row(fit)


def _pump(coefficients):
    from fuelsys import pump

    return pump.pump_from_row(coefficients)


@spreadsheet_function(
    name="FS_PUMP_VOLTS", category="engine and pump",
    summary="Motor voltage the fitted pump needs for a flow against an outlet pressure",
    args=[_COEF,
          Arg("flow_g_min", "number", "g/min", "fuel flow wanted", low=0),
          Arg("p_bar_gauge", "number", "bar gauge", "pump outlet pressure (from FS_PUMP_NEED)", low=0),
          _FUEL, _TEMP, _OIL],
    returns=Returns("number", "V", "motor terminal voltage"),
    source="the fitted gear-pump and DC-motor model (Wilson 1949; Fitzgerald et al. 2003 §7.2)",
    si=True,
    example=(_COEF_EXAMPLE, 200, 3),
)
def fs_pump_volts(coefficients, mdot, p, fuel, T, oil_pct):
    fuel = fuel.with_oil(oil_pct)
    pmp = _pump(coefficients)
    T = checked_temperature(_liquid(fuel), T, "temp_c")
    q = mdot / np.asarray(fuel.density(T))
    v = np.asarray(pmp.volts(q, p, fuel.dynamic_viscosity(T)))
    pmp.flag_untested(v)
    return v


@spreadsheet_function(
    name="FS_PUMP_FLOW", category="engine and pump",
    summary="Fuel flow the fitted pump delivers at a voltage against an outlet pressure",
    args=[_COEF,
          Arg("volts", "number", "V", "motor terminal voltage", low=0),
          Arg("p_bar_gauge", "number", "bar gauge", "pump outlet pressure", low=0),
          _FUEL, _TEMP, _OIL],
    returns=Returns("number", "g/min", "fuel flow delivered"),
    source="the fitted gear-pump and DC-motor model (Wilson 1949; Fitzgerald et al. 2003 §7.2)",
    si=True,
    example=(_COEF_EXAMPLE, 6, 3),
)
def fs_pump_flow(coefficients, volts, dp, fuel, T, oil_pct):
    fuel = fuel.with_oil(oil_pct)
    pmp = _pump(coefficients)
    T = checked_temperature(_liquid(fuel), T, "temp_c")
    mu = fuel.dynamic_viscosity(T)
    pmp.flag_untested(volts)
    q = np.asarray(pmp.flow(volts, dp, mu))
    if np.any(q <= 0):
        v_open = np.asarray(pmp.volts(0.0, dp, mu))
        vb = np.broadcast_arrays(np.asarray(volts, dtype=float), v_open)
        i = int(np.flatnonzero(np.ravel(np.broadcast_to(q, vb[0].shape)) <= 0)[0])
        raise FuelsysInputError(
            f"the pump delivers nothing at {np.ravel(vb[0])[i]:.2f} V against "
            f"{from_si(np.ravel(np.broadcast_to(dp, vb[0].shape))[i], 'bar gauge'):.2f} bar: it needs more than "
            f"{np.ravel(vb[1])[i]:.2f} V to start flowing")
    return q * np.asarray(fuel.density(T))
