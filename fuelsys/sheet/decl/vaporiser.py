"""Spreadsheet functions for the vaporiser tube.

Units at this face (declared once, converted by the adapter): bores and
lengths in mm, air in g/s, fuel in g/min, case pressure in bar abs,
temperatures in °C, times in ms, velocities in m/s, the tube's pressure drop
in mbar and the oil left behind in g/h.  The bodies work in SI.  The wall is
one uniform inner-wall temperature; the core API
(:func:`fuelsys.vaporiser.vaporiser`) also takes a profile or flame-side
conditions.

FS_VAPORISER and FS_VAPORISER_PROFILE take a range over any operating-point
argument (bore, length, fuel, air, case pressure, air, wall and fuel
temperatures): the ranges are read in reading order, each holds one value
or as many as the longest, and every point is marched in one vectorised call.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.sheet.catalogue import Arg, Returns, from_si, spreadsheet_function

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
_FUEL_T = Arg("fuel_c", "number", "°C", "fuel temperature at the needle exit; empty for 25 °C", default=25.0,
              gt=-273.15)


def _points(arg):
    """The same argument taking a range of operating points (read in reading order)."""
    return dataclasses.replace(arg, kind="range")


#: the operating-point arguments of FS_VAPORISER and FS_VAPORISER_PROFILE, each a range or one cell
_POINT_ARGS = [_points(a) for a in (_BORE, _LENGTH, _FUEL_FLOW, _AIR, _CASE, _T3, _WALL)]

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
    "dew_margin_low_k": "K",
    "dew_margin_high_k": "K",
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
    "flame_speed_estimate": "-",
    "max_wet_wall_c": "°C",
    "max_liquid_fuel_c": "°C",
    "max_wall_c": "°C",
    "oil_residue_g_h": "g/h",
    "dp_mbar": "mbar",
    "heat_w": "W",
    "energy_error_pct": "%",
    "step_error_k": "K",
    "reynolds_exit": "-",
    "verdict": "-",
    "cautions": "-",
    "validity": "-",
}


def _finite_or(value, unit, text):
    """``value`` in the item's unit, or ``text`` where it is not finite."""
    return from_si(value, unit) if math.isfinite(value) else text


def _item_values(r, i) -> dict:
    """Cell values of every item of point ``i`` of a flat VaporiserResult."""
    def at(name):
        v = np.ravel(getattr(r, name))[i]
        return v.item() if hasattr(v, "item") else v

    return {
        "vaporised_pct": from_si(at("vapour_fraction"), "%"),
        "exit_c": from_si(at("exit_temperature"), "°C"),
        "dew_point_c": _finite_or(at("dew_point"), "°C", "no fuel"),
        "dew_margin_k": _finite_or(at("dew_margin"), "K", "no fuel"),
        "dew_margin_low_k": _finite_or(at("dew_margin_low"), "K", "no fuel"),
        "dew_margin_high_k": _finite_or(at("dew_margin_high"), "K", "no fuel"),
        "residence_ms": from_si(at("residence_time"), "ms"),
        "droplet_um": from_si(at("droplet_diameter"), "µm"),
        "droplet_life_ms": _finite_or(at("droplet_lifetime"), "ms", "never (no evaporation at exit)"),
        "tube_phi": at("tube_phi"),
        "vapour_phi": at("exit_vapour_phi"),
        "flammable": "yes" if at("flammable") else "no",
        "exit_velocity_m_s": at("exit_velocity"),
        "flame_speed_m_s": at("flame_speed"),
        "turbulent_flame_speed_m_s": at("turbulent_flame_speed"),
        "flashback_margin": _finite_or(at("flashback_margin"), "-", "not flammable anywhere"),
        "flame_speed_estimate": "yes (phi outside the fit)" if at("flame_speed_estimate") else "no",
        "max_wet_wall_c": _finite_or(at("max_wet_wall"), "°C", "none (no liquid fuel on the wall)"),
        "max_liquid_fuel_c": _finite_or(at("max_liquid_fuel_temperature"), "°C", "none (no liquid fuel)"),
        "max_wall_c": from_si(at("max_wall"), "°C"),
        "oil_residue_g_h": from_si(at("oil_residue"), "g/h"),
        "dp_mbar": from_si(at("pressure_drop"), "mbar"),
        "heat_w": at("heat_in"),
        "energy_error_pct": from_si(at("energy_error"), "%"),
        "step_error_k": at("step_error_temperature"),
        "reynolds_exit": at("reynolds_exit"),
        "verdict": at("verdict"),
        "cautions": at("cautions") or "none",
        "validity": at("validity") or "ok",
    }


def _broadcast_points(names, arrays):
    """Operating-point ranges as flat arrays of one length: each holds 1 value or as many as the longest."""
    n = max(a.size for a in arrays)
    for name, a in zip(names, arrays):
        if a.size not in (1, n):
            raise FuelsysInputError(f"{name} holds {a.size} values; give one, or {n} like the longest range "
                                    "(one per operating point)")
    return n, [np.broadcast_to(a, (n,)) for a in arrays]


def _run(points, fuel, oil_pct, shape, T_fuel):
    """The core march on every operating point at once (SI); returns (VaporiserResult, point count)."""
    from fuelsys import vaporiser as vap

    if not (math.isfinite(float(getattr(fuel, "stoich_far", math.nan)))
            and math.isfinite(float(getattr(fuel, "lhv", math.nan)))):
        raise FuelsysInputError(f"fuel: {getattr(fuel, 'name', 'this fluid')} is not a fuel "
                                "(no heating value); use kerosene or a fuel table")
    names = [a.name for a in _POINT_ARGS] + [_FUEL_T.name]
    n, (bore, length, m_fuel, m_air, P, T3, T_wall, T_f) = _broadcast_points(
        names, [np.ravel(np.asarray(p, dtype=float)) for p in (*points, T_fuel)])
    fuel = fuel.with_oil(oil_pct)
    return vap.vaporiser(bore, length, m_fuel, m_air, P, T3, T_wall, fuel, shape=shape, t_fuel_in=T_f), n


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
    si=True,
    example=(6, 4, 2.2, 150),
)
def fs_tube_air(bore, dp_fraction, P, T, cd):
    from fuelsys import vaporiser as vap

    return vap.tube_air_flow(bore, dp_fraction, P, T, cd)


@spreadsheet_function(
    name="FS_VAPORISER", category="vaporiser",
    summary="Vaporiser tube check: vaporised fuel, dew-point, droplet, flashback and coking margins, verdict",
    args=[*_POINT_ARGS, _FUEL, _OIL,
          Arg("item", "text", "-", "one result by name; empty for the whole table", default="",
              choices=tuple(_ITEMS)), _SHAPE, _points(_FUEL_T)],
    returns=Returns("table", "-", "two columns: item name (unit in the name) and value; or the one item asked "
                                  "for.  With ranges of operating points: one value column per point, or the "
                                  "item's column of values, one per point"),
    source=_SOURCE,
    si=True,
    example=(6, 100, 10, 2, 2.2, 200, 400, "kerosene"),
)
def fs_vaporiser(bore, length, m_fuel, m_air, P, T3, T_wall, fuel, oil_pct, item, shape, T_fuel):
    r, n = _run((bore, length, m_fuel, m_air, P, T3, T_wall), fuel, oil_pct, shape, T_fuel)
    values = [_item_values(r, i) for i in range(n)]
    if item:
        return [[v[item]] for v in values]
    return [[key] + [v[key] for v in values] for key in _ITEMS]


_PROFILE_HEADER = ["position_mm", "gas_c", "wall_c", "vaporised_pct", "velocity_m_s"]


@spreadsheet_function(
    name="FS_VAPORISER_PROFILE", category="vaporiser",
    summary="Gas and wall temperature, vaporised fuel and velocity along a vaporiser tube, for a chart",
    args=[*_POINT_ARGS, _FUEL, _OIL,
          Arg("points", "number", "-", "rows of the table after its header", default=11, low=2, high=201,
              integer=True), _SHAPE, _points(_FUEL_T)],
    returns=Returns("table", "-", "header row, then rows of position mm (along the heated legs), gas °C, "
                                  "wall °C, vaporised %, velocity m/s; with ranges of operating points, a first "
                                  "column 'point' numbers each point's rows"),
    source=_SOURCE,
    si=True,
    example=(6, 100, 10, 2, 2.2, 200, 400, "kerosene"),
)
def fs_vaporiser_profile(bore, length, m_fuel, m_air, P, T3, T_wall, fuel, oil_pct, points, shape, T_fuel):
    r, n = _run((bore, length, m_fuel, m_air, P, T3, T_wall), fuel, oil_pct, shape, T_fuel)
    p = r.profile
    rows = [_PROFILE_HEADER if n == 1 else ["point"] + _PROFILE_HEADER]
    for i in range(n):
        x = np.reshape(p["position"], (-1, n))[:, i]
        at = np.linspace(0.0, x[-1], int(points))
        cols = [from_si(at, "mm"),
                from_si(np.interp(at, x, np.reshape(p["gas_temperature"], (-1, n))[:, i]), "°C"),
                from_si(np.interp(at, x, np.reshape(p["wall_temperature"], (-1, n))[:, i]), "°C"),
                from_si(np.interp(at, x, np.reshape(p["vapour_fraction"], (-1, n))[:, i]), "%"),
                np.interp(at, x, np.reshape(p["velocity"], (-1, n))[:, i])]
        lead = [] if n == 1 else [i + 1]
        rows += [lead + [float(c[k]) for c in cols] for k in range(at.size)]
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
    si=True,
    example=(6, 150, 2, 20, 2.2, 150),
)
def fs_residence_time(bore, length, m_air, m_fuel, P, T_in, T_exit):
    from fuelsys import vaporiser as vap

    return vap.residence_time_estimate(bore, length, m_air, m_fuel, P, T_in, T_exit)


@spreadsheet_function(
    name="FS_TUBE_LENGTH", category="vaporiser",
    summary="Heated length at which a vaporiser tube's exit reaches a required margin over its dew point",
    args=[_BORE, _FUEL_FLOW, _AIR, _CASE, _T3, _WALL, _FUEL,
          Arg("margin_k", "number", "K", "required exit temperature above the dew point", low=-50, high=300),
          Arg("max_length_mm", "number", "mm", "longest heated length considered", default=500.0, gt=5, high=5000,
              group=True),
          dataclasses.replace(_OIL, group=True), _SHAPE, _FUEL_T],
    returns=Returns("number", "mm", "heated length (of each leg for the return shape)"),
    source="the FS_VAPORISER march solved for the length by regula falsi (Illinois; Dowell & Jarratt 1971)",
    si=True,
    example=(6, 10, 2, 2.2, 200, 400, "kerosene", 80),
)
def fs_tube_length(bore, m_fuel, m_air, P, T3, T_wall, fuel, margin, max_length, oil_pct, shape, T_fuel):
    from fuelsys import vaporiser as vap

    if not (math.isfinite(float(getattr(fuel, "stoich_far", math.nan)))
            and math.isfinite(float(getattr(fuel, "lhv", math.nan)))):
        raise FuelsysInputError(f"fuel: {getattr(fuel, 'name', 'this fluid')} is not a fuel "
                                "(no heating value); use kerosene or a fuel table")
    return vap.tube_length_for_margin(bore, m_fuel, m_air, P, T3, T_wall, fuel.with_oil(oil_pct), margin,
                                      float(max_length), shape=shape, t_fuel_in=T_fuel)
