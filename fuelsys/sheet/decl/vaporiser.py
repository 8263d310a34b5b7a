"""Spreadsheet functions for the vaporiser tube.

Units at this face: bores and lengths in mm, air in g/s, fuel in g/min,
case pressure in bar abs, temperatures in °C, times in ms, velocities in m/s,
the tube's pressure drop in mbar and the oil left behind in g/h.  The wall is
one uniform inner-wall temperature; the core API
(:func:`fuelsys.vaporiser.vaporiser`) also takes a profile or flame-side
conditions.
"""

from __future__ import annotations

import math
import warnings

import numpy as np

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.fuels.base import T0_C
from fuelsys.sheet.catalogue import Arg, Returns, spreadsheet_function

_G_MIN = 1e-3 / 60.0   # 1 g/min in kg/s
_G_S = 1e-3            # 1 g/s in kg/s
_BAR = 1e5

_BORE = Arg("tube_bore_mm", "number", "mm", "vaporiser tube inside diameter", gt=0, high=100)
_LENGTH = Arg("heated_length_mm", "number", "mm", "heated length of the tube", gt=0, high=5000)
_FUEL_FLOW = Arg("fuel_g_min", "number", "g/min", "fuel into this tube (oil included)", low=0)
_AIR = Arg("air_g_s", "number", "g/s", "air through this tube (FS_TUBE_AIR)", gt=0)
_CASE = Arg("case_bar_abs", "number", "bar abs", "case (compressor exit) pressure", gt=0)
_T3 = Arg("t3_c", "number", "°C", "compressor exit air temperature", gt=-273.15)
_WALL = Arg("wall_c", "number", "°C", "inner wall temperature of the tube (uniform)", gt=-273.15)
_FUEL = Arg("fuel", "fuel", "-", "built-in fuel name (kerosene, ...) or a fuel table range")
_OIL = Arg("oil_pct", "number", "% vol", "turbine oil mixed into the fuel", default=0.0, low=0, high=20)
_SHAPE = Arg("shape", "text", "-", "straight, or return: a second heated leg of the same length and wall after "
             "a 180° bend (radius 2 bores)", default="straight", choices=("straight", "return"))

_SOURCE = ("axial march of the air-fuel mixture's enthalpy with equilibrium evaporation from the fuel "
           "model's flash (air inert); wall heat by Gnielinski (1976) turbulent / Stephan (1959) laminar "
           "entry, blended over Re 2300-1e4 (Gnielinski 1995); droplets by the d2-law with the Spalding "
           "(1953) transfer number (Turns 3rd ed. ch. 3); laminar flame speed Gulder (1984), flammability "
           "limits Zabetakis (1965); coking limit 260 °C, the ASTM D3241 JFTOT temperature; return bend loss "
           "by Crane TP-410 (2009) A-29")

#: the items of FS_VAPORISER in table order, each with its unit (the unit is also in the name)
_ITEMS = {
    "vaporised_pct": "%",
    "exit_c": "°C",
    "dew_point_c": "°C",
    "dew_margin_k": "K",
    "residence_ms": "ms",
    "droplet_um": "µm",
    "droplet_life_ms": "ms",
    "tube_phi": "-",
    "vapour_phi": "-",
    "flammable": "-",
    "exit_velocity_m_s": "m/s",
    "flame_speed_m_s": "m/s",
    "turbulent_flame_speed_m_s": "m/s",
    "flashback_margin": "-",
    "max_wet_wall_c": "°C",
    "max_wall_c": "°C",
    "oil_residue_g_h": "g/h",
    "dp_mbar": "mbar",
    "heat_w": "W",
    "energy_error_pct": "%",
    "step_error_k": "K",
    "reynolds_exit": "-",
    "verdict": "-",
    "validity": "-",
}


def _item_values(r) -> dict:
    """Cell values of every item from a scalar VaporiserResult."""
    life = r.droplet_lifetime * 1e3 if math.isfinite(r.droplet_lifetime) else "never (no evaporation at exit)"
    margin = r.flashback_margin if math.isfinite(r.flashback_margin) else "not flammable anywhere"
    wet = r.max_wet_wall - T0_C if math.isfinite(r.max_wet_wall) else "none (no liquid fuel on the wall)"
    dew = r.dew_point - T0_C if math.isfinite(r.dew_point) else "no fuel"
    margin_k = r.dew_margin if math.isfinite(r.dew_margin) else "no fuel"
    return {
        "vaporised_pct": r.vapour_fraction * 100.0,
        "exit_c": r.exit_temperature - T0_C,
        "dew_point_c": dew,
        "dew_margin_k": margin_k,
        "residence_ms": r.residence_time * 1e3,
        "droplet_um": r.droplet_diameter * 1e6,
        "droplet_life_ms": life,
        "tube_phi": r.tube_phi,
        "vapour_phi": r.exit_vapour_phi,
        "flammable": "yes" if r.flammable else "no",
        "exit_velocity_m_s": r.exit_velocity,
        "flame_speed_m_s": r.flame_speed,
        "turbulent_flame_speed_m_s": r.turbulent_flame_speed,
        "flashback_margin": margin,
        "max_wet_wall_c": wet,
        "max_wall_c": r.max_wall - T0_C,
        "oil_residue_g_h": r.oil_residue * 3.6e6,
        "dp_mbar": r.pressure_drop / 100.0,
        "heat_w": r.heat_in,
        "energy_error_pct": r.energy_error * 100.0,
        "step_error_k": r.step_error_temperature,
        "reynolds_exit": r.reynolds_exit,
        "verdict": r.verdict,
        "validity": r.validity or "ok",
    }


def _run(tube_bore_mm, heated_length_mm, fuel_g_min, air_g_s, case_bar_abs, t3_c, wall_c, fuel, oil_pct, shape):
    from fuelsys import vaporiser as vap

    if not (math.isfinite(float(getattr(fuel, "stoich_far", math.nan)))
            and math.isfinite(float(getattr(fuel, "lhv", math.nan)))):
        raise FuelsysInputError(f"fuel: {getattr(fuel, 'name', 'this fluid')} is not a fuel "
                                "(no heating value); use kerosene or a fuel table")
    fuel = fuel.with_oil(oil_pct)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        return vap.vaporiser(tube_bore_mm * 1e-3, heated_length_mm * 1e-3, fuel_g_min * _G_MIN, air_g_s * _G_S,
                             case_bar_abs * _BAR, t3_c + T0_C, wall_c + T0_C, fuel, shape=shape)


@spreadsheet_function(
    name="FS_TUBE_AIR", category="vaporiser",
    summary="Air flow into one vaporiser tube from the liner pressure drop",
    args=[_BORE,
          Arg("liner_dp_pct", "number", "% of case pressure", "liner pressure drop", gt=0, lt=100),
          _CASE, _T3,
          Arg("cd", "number", "-", "discharge coefficient of the tube inlet", default=0.6, gt=0, high=1)],
    returns=Returns("number", "g/s", "air mass flow into the tube"),
    source="isentropic (compressible) orifice flow times a discharge coefficient, case to liner "
           "(Anderson, Modern Compressible Flow 3rd ed. ch. 5; Lefebvre & Ballal, Gas Turbine Combustion "
           "3rd ed. ch. 4; cd 0.6 for a plain inlet, from memory)",
    example=(6, 4, 2.2, 150),
)
def fs_tube_air(tube_bore_mm, liner_dp_pct, case_bar_abs, t3_c, cd):
    """Air into one tube [g/s].

    Parameters
    ----------
    tube_bore_mm : array_like
        Tube bore [mm]
    liner_dp_pct : array_like
        Liner pressure drop [% of case pressure]
    case_bar_abs : array_like
        Case pressure [bar abs]
    t3_c : array_like
        Compressor exit temperature [°C]
    cd : array_like
        Discharge coefficient [-]

    Returns
    -------
    ndarray
        Air flow [g/s]

    References
    ----------
    :func:`fuelsys.vaporiser.tube_air_flow`.
    """
    from fuelsys import vaporiser as vap

    return np.asarray(vap.tube_air_flow(np.asarray(tube_bore_mm) * 1e-3, np.asarray(liner_dp_pct) / 100.0,
                                        np.asarray(case_bar_abs) * _BAR, np.asarray(t3_c) + T0_C, cd)) / _G_S


@spreadsheet_function(
    name="FS_VAPORISER", category="vaporiser",
    summary="Vaporiser tube check: vaporised fuel, dew-point, droplet, flashback and coking margins, verdict",
    args=[_BORE, _LENGTH, _FUEL_FLOW, _AIR, _CASE, _T3, _WALL, _FUEL, _OIL,
          Arg("item", "text", "-", "one result by name; empty for the whole table", default="",
              choices=tuple(_ITEMS)), _SHAPE],
    returns=Returns("table", "-", "two columns: item name (unit in the name) and value; or the one item asked for"),
    source=_SOURCE,
    example=(6, 150, 20, 2, 2.2, 150, 600, "kerosene"),
)
def fs_vaporiser(tube_bore_mm, heated_length_mm, fuel_g_min, air_g_s, case_bar_abs, t3_c, wall_c, fuel, oil_pct,
                 item, shape):
    """Vaporiser check as a labelled table, or one item of it.

    Parameters
    ----------
    tube_bore_mm : float
        Tube bore [mm]
    heated_length_mm : float
        Heated length [mm]
    fuel_g_min : float
        Fuel flow into the tube [g/min]
    air_g_s : float
        Air flow through the tube [g/s]
    case_bar_abs : float
        Case pressure [bar abs]
    t3_c : float
        Compressor exit temperature [°C]
    wall_c : float
        Inner wall temperature [°C]
    fuel : Fuel
        The fuel [-]
    oil_pct : float
        Turbine oil in the fuel [% vol]
    item : str
        Item name, or "" for the table [-]
    shape : str
        "straight" or "return" [-]

    Returns
    -------
    list or float or str
        Rows [item, value], or the single value [-]

    References
    ----------
    :func:`fuelsys.vaporiser.vaporiser`.
    """
    r = _run(tube_bore_mm, heated_length_mm, fuel_g_min, air_g_s, case_bar_abs, t3_c, wall_c, fuel, oil_pct, shape)
    values = _item_values(r)
    if item:
        return [[values[item]]]
    return [[key, values[key]] for key in _ITEMS]


@spreadsheet_function(
    name="FS_VAPORISER_PROFILE", category="vaporiser",
    summary="Gas and wall temperature, vaporised fuel and velocity along a vaporiser tube, for a chart",
    args=[_BORE, _LENGTH, _FUEL_FLOW, _AIR, _CASE, _T3, _WALL, _FUEL, _OIL,
          Arg("points", "number", "-", "rows of the table after its header", default=11, low=2, high=201,
              integer=True), _SHAPE],
    returns=Returns("table", "-", "header row, then rows of position mm (along the heated legs), gas °C, "
                                  "wall °C, vaporised %, velocity m/s"),
    source=_SOURCE,
    example=(6, 150, 20, 2, 2.2, 150, 600, "kerosene"),
)
def fs_vaporiser_profile(tube_bore_mm, heated_length_mm, fuel_g_min, air_g_s, case_bar_abs, t3_c, wall_c, fuel,
                         oil_pct, points, shape):
    """Profile along the tube, linearly interpolated from the march's nodes.

    Parameters
    ----------
    tube_bore_mm : float
        Tube bore [mm]
    heated_length_mm : float
        Heated length [mm]
    fuel_g_min : float
        Fuel flow into the tube [g/min]
    air_g_s : float
        Air flow through the tube [g/s]
    case_bar_abs : float
        Case pressure [bar abs]
    t3_c : float
        Compressor exit temperature [°C]
    wall_c : float
        Inner wall temperature [°C]
    fuel : Fuel
        The fuel [-]
    oil_pct : float
        Turbine oil in the fuel [% vol]
    points : float
        Number of rows [-]
    shape : str
        "straight" or "return" [-]

    Returns
    -------
    list
        Header row and one row per position along the heated legs [-]

    References
    ----------
    :func:`fuelsys.vaporiser.vaporiser` (profile).
    """
    r = _run(tube_bore_mm, heated_length_mm, fuel_g_min, air_g_s, case_bar_abs, t3_c, wall_c, fuel, oil_pct, shape)
    p = r.profile
    x = p["position"]
    at = np.linspace(0.0, x[-1], int(points))
    cols = [np.interp(at, x, p["gas_temperature"]) - T0_C, np.interp(at, x, p["wall_temperature"]) - T0_C,
            np.interp(at, x, p["vapour_fraction"]) * 100.0, np.interp(at, x, p["velocity"])]
    rows = [["position_mm", "gas_c", "wall_c", "vaporised_pct", "velocity_m_s"]]
    for i in range(at.size):
        rows.append([float(at[i] * 1e3)] + [float(c[i]) for c in cols])
    return rows


@spreadsheet_function(
    name="FS_RESIDENCE_TIME", category="vaporiser",
    summary="Plug-flow residence time of the gas in a tube from its end temperatures",
    args=[_BORE, _LENGTH, _AIR, _FUEL_FLOW, _CASE, _T3,
          Arg("exit_c", "number", "°C", "gas temperature at the exit; empty for t3_c", default=None,
              gt=-273.15)],
    returns=Returns("number", "ms", "residence time of the gas over the length"),
    source="plug flow of an ideal gas (air plus kerosene vapour, molar mass of the built-in kerosene), "
           "temperature and vaporised fuel linear along the tube; 8-point Gauss-Legendre quadrature",
    example=(6, 150, 2, 20, 2.2, 150),
)
def fs_residence_time(tube_bore_mm, heated_length_mm, air_g_s, fuel_g_min, case_bar_abs, t3_c, exit_c):
    """Residence time [ms].

    Parameters
    ----------
    tube_bore_mm : array_like
        Tube bore [mm]
    heated_length_mm : array_like
        Tube length [mm]
    air_g_s : array_like
        Air flow [g/s]
    fuel_g_min : array_like
        Fuel flow [g/min]
    case_bar_abs : array_like
        Pressure in the tube [bar abs]
    t3_c : array_like
        Inlet gas temperature [°C]
    exit_c : array_like or None
        Exit gas temperature [°C]

    Returns
    -------
    ndarray
        Residence time [ms]

    References
    ----------
    :func:`fuelsys.vaporiser.residence_time_estimate`.
    """
    from fuelsys import vaporiser as vap

    t_exit = None if exit_c is None else np.asarray(exit_c) + T0_C
    t = vap.residence_time_estimate(np.asarray(tube_bore_mm) * 1e-3, np.asarray(heated_length_mm) * 1e-3,
                                    np.asarray(air_g_s) * _G_S, np.asarray(fuel_g_min) * _G_MIN,
                                    np.asarray(case_bar_abs) * _BAR, np.asarray(t3_c) + T0_C, t_exit)
    return np.asarray(t) * 1e3
