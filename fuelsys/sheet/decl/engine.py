"""Spreadsheet functions for the engine and pump: case pressure, fuel demand, pump sizing.

Pressures in bar (gauge unless the name says abs), flows in g/min of fuel,
air in g/s, temperatures in °C, voltages in V.  The pump functions share the
coefficients range that FS_PUMP_FIT returns (a row of labels over a row of
values; the range may also be given transposed).
"""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.fuels.base import T0_C
from fuelsys.sheet.catalogue import Arg, Returns, spreadsheet_function
from fuelsys.sheet.decl import kelvin as _kelvin

_FUEL = Arg("fuel", "fuel", "-", "built-in fuel name or a fuel table range", default="kerosene")
_TEMP = Arg("temp_c", "number", "°C", "fuel temperature", default=20.0, gt=-273.15)
_OIL = Arg("oil_pct", "number", "% vol", "turbine oil mixed into the fuel", default=0.0, low=0, high=20,
           group=True)
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
)
def fs_case_pressure(rpm, rpm_max, pr_max, ambient_bar_abs):
    """Case pressure [bar gauge] at ``rpm`` from the design pressure ratio.

    Parameters
    ----------
    rpm : array_like
        Shaft speed [rpm]
    rpm_max : array_like
        Design speed [rpm]
    pr_max : array_like
        Pressure ratio at design speed [-]
    ambient_bar_abs : array_like
        Ambient pressure [bar abs]

    Returns
    -------
    ndarray
        Case pressure [bar gauge]

    References
    ----------
    :func:`fuelsys.engine.case_pressure`.
    """
    from fuelsys import engine

    n = np.asarray(rpm, dtype=float) / np.asarray(rpm_max, dtype=float)
    return np.asarray(engine.case_pressure(n, pr_max, np.asarray(ambient_bar_abs) * 1e5)) / 1e5


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
)
def fs_fuel_demand(air_g_s, t3_c, t4_c, fuel, efficiency):
    """Fuel flow [g/min] for ``air_g_s`` heated from ``t3_c`` to ``t4_c``.

    Parameters
    ----------
    air_g_s : array_like
        Air flow [g/s]
    t3_c : array_like
        Compressor exit temperature [°C]
    t4_c : array_like
        Turbine inlet temperature [°C]
    fuel : Fuel
        The fuel (its lhv and stoichiometric ratio) [-]
    efficiency : array_like
        Combustion efficiency [-]

    Returns
    -------
    ndarray
        Fuel flow [g/min]

    References
    ----------
    :func:`fuelsys.engine.fuel_flow`.
    """
    from fuelsys import engine

    lhv = float(getattr(fuel, "lhv", np.nan))
    if not np.isfinite(lhv) or lhv <= 0:
        raise FuelsysInputError(f"fuel: {fuel.name} has no heating value")
    try:
        y = engine.fuel_h_to_c(fuel)
    except FuelsysInputError as exc:
        raise FuelsysInputError(f"fuel: {exc}") from None
    m = engine.fuel_flow(np.asarray(air_g_s, dtype=float) / 1e3, np.asarray(t3_c) + T0_C,
                         np.asarray(t4_c) + T0_C, lhv, y, efficiency)
    return np.asarray(m) * 6e4


@spreadsheet_function(
    name="FS_PUMP_NEED", category="engine and pump",
    summary="Pump outlet pressure the fuel system needs at a flow (the system curve)",
    args=[Arg("flow_g_min", "number", "g/min", "fuel flow the drops below belong to", low=0),
          Arg("case_bar_gauge", "number", "bar gauge", "combustor case pressure at that flow", low=0),
          Arg("needle_dp_bar", "number", "bar", "manifold and needle pressure drop at that flow", low=0),
          Arg("line_dp_bar", "number", "bar", "line, filter and valve pressure drops at that flow", low=0),
          Arg("head_m", "number", "m", "height of the injectors above the tank", default=0.0, low=-5, high=5),
          Arg("g_load", "number", "-", "manoeuvre load factor along that height", default=1.0, low=0, high=20),
          Arg("margin_pct", "number", "%", "safety margin on the total", default=0.0, low=0, high=200),
          _FUEL, _TEMP, _OIL],
    returns=Returns("number", "bar gauge", "pressure needed at the pump outlet"),
    source="sum of series losses plus hydrostatic head ρ g n h (White, Fluid Mechanics 7th ed. §6.9); "
           "fuel density from the fuel model",
)
def fs_pump_need(flow_g_min, case_bar_gauge, needle_dp_bar, line_dp_bar, head_m, g_load, margin_pct, fuel,
                 temp_c, oil_pct):
    """Pump outlet pressure [bar gauge] the system needs.

    Parameters
    ----------
    flow_g_min : array_like
        Fuel flow the drops belong to [g/min]
    case_bar_gauge : array_like
        Case pressure [bar gauge]
    needle_dp_bar : array_like
        Manifold and needle drop [bar]
    line_dp_bar : array_like
        Line, filter and valve drops [bar]
    head_m : array_like
        Injectors above the tank [m]
    g_load : array_like
        Load factor [-]
    margin_pct : array_like
        Margin [%]
    fuel : Fuel
        The fuel [-]
    temp_c : array_like
        Fuel temperature [°C]
    oil_pct : float
        Turbine oil in the fuel [% vol]

    Returns
    -------
    ndarray
        Pump outlet pressure [bar gauge]

    References
    ----------
    :func:`fuelsys.pump.system_pressure`.
    """
    fuel = fuel.with_oil(oil_pct)
    from fuelsys import pump

    rho = np.asarray(_liquid(fuel).density(_kelvin(fuel, temp_c)))
    p = pump.system_pressure(np.asarray(case_bar_gauge) * 1e5, np.asarray(needle_dp_bar) * 1e5,
                             np.asarray(line_dp_bar) * 1e5, density=rho, head=head_m, g_load=g_load,
                             margin_pct=margin_pct)
    return np.asarray(p) / 1e5 + 0.0 * np.asarray(flow_g_min, dtype=float)


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
)
def fs_pump_fit(flows_g_min, pressures_bar, volts, fuel, temp_c, winding_ohm, kv_rpm_per_v, oil_pct):
    """Pump fit as a labelled table.

    Parameters
    ----------
    flows_g_min : ndarray
        Test flows [g/min]
    pressures_bar : ndarray
        Test outlet pressures [bar gauge]
    volts : ndarray
        Test voltages [V]
    fuel : Fuel
        Test fuel [-]
    temp_c : ndarray or float
        Fuel temperature(s) [°C]
    oil_pct : float
        Turbine oil in the fuel [% vol]
    winding_ohm : float or None
        Measured motor resistance [Ω]
    kv_rpm_per_v : float or None
        Motor speed constant [rpm/V]

    Returns
    -------
    list
        Two rows: labels, values.

    References
    ----------
    :func:`fuelsys.pump.fit_pump`.
    """
    fuel = fuel.with_oil(oil_pct)
    from fuelsys import pump

    q_g = np.atleast_1d(np.asarray(flows_g_min, dtype=float))
    p = np.atleast_1d(np.asarray(pressures_bar, dtype=float))
    v = np.atleast_1d(np.asarray(volts, dtype=float))
    t = np.atleast_1d(np.asarray(temp_c, dtype=float))
    if t.size not in (1, q_g.size):
        raise FuelsysInputError(f"temp_c: give one temperature or one per test point ({q_g.size}), got {t.size}")
    T = _kelvin(_liquid(fuel), t)
    rho = np.asarray(fuel.density(T))
    mu = np.asarray(fuel.dynamic_viscosity(T))
    if q_g.size != p.size or q_g.size != v.size:
        raise FuelsysInputError(
            f"flows, pressures and volts need the same count of test points (got {q_g.size}, {p.size}, {v.size})")
    q = q_g / 6e4 / rho
    fit = pump.fit_pump(q, p * 1e5, v, mu, winding_ohm=winding_ohm, kv=kv_rpm_per_v)
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
)
def fs_pump_volts(coefficients, flow_g_min, p_bar_gauge, fuel, temp_c, oil_pct):
    """Voltage [V] for a flow [g/min] against a pressure [bar gauge].

    Parameters
    ----------
    coefficients : list
        FS_PUMP_FIT's range [-]
    flow_g_min : array_like
        Flow [g/min]
    p_bar_gauge : array_like
        Outlet pressure [bar gauge]
    fuel : Fuel
        The fuel [-]
    temp_c : array_like
        Fuel temperature [°C]
    oil_pct : float
        Turbine oil in the fuel [% vol]

    Returns
    -------
    ndarray
        Voltage [V]

    References
    ----------
    :meth:`fuelsys.pump.GearPump.volts`.
    """
    fuel = fuel.with_oil(oil_pct)
    pmp = _pump(coefficients)
    T = _kelvin(_liquid(fuel), temp_c)
    q = np.asarray(flow_g_min, dtype=float) / 6e4 / np.asarray(fuel.density(T))
    v = np.asarray(pmp.volts(q, np.asarray(p_bar_gauge) * 1e5, fuel.dynamic_viscosity(T)))
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
)
def fs_pump_flow(coefficients, volts, p_bar_gauge, fuel, temp_c, oil_pct):
    """Flow [g/min] at a voltage against a pressure; refused where the pump cannot flow.

    Parameters
    ----------
    coefficients : list
        FS_PUMP_FIT's range [-]
    volts : array_like
        Voltage [V]
    p_bar_gauge : array_like
        Outlet pressure [bar gauge]
    fuel : Fuel
        The fuel [-]
    temp_c : array_like
        Fuel temperature [°C]
    oil_pct : float
        Turbine oil in the fuel [% vol]

    Returns
    -------
    ndarray
        Flow [g/min]

    References
    ----------
    :meth:`fuelsys.pump.GearPump.flow`.
    """
    fuel = fuel.with_oil(oil_pct)
    pmp = _pump(coefficients)
    T = _kelvin(_liquid(fuel), temp_c)
    mu = fuel.dynamic_viscosity(T)
    dp = np.asarray(p_bar_gauge, dtype=float) * 1e5
    pmp.flag_untested(volts)
    q = np.asarray(pmp.flow(volts, dp, mu))
    if np.any(q <= 0):
        v_open = np.asarray(pmp.volts(0.0, dp, mu))
        vb = np.broadcast_arrays(np.asarray(volts, dtype=float), v_open)
        i = int(np.flatnonzero(np.ravel(np.broadcast_to(q, vb[0].shape)) <= 0)[0])
        raise FuelsysInputError(
            f"the pump delivers nothing at {np.ravel(vb[0])[i]:.2f} V against "
            f"{np.ravel(np.broadcast_to(dp, vb[0].shape))[i] / 1e5:.2f} bar: it needs more than "
            f"{np.ravel(vb[1])[i]:.2f} V to start flowing")
    return q * np.asarray(fuel.density(T)) * 6e4
