"""Spreadsheet functions for the combustor: air split by zone, zone mixture, flame and mixing temperatures.

Hole diameters in mm, fuel in g/min, air in g/s, temperatures in °C,
pressures in bar abs.  A liner is described as rows of openings, one row per
zone or hole size: a column of hole counts beside a column of diameters (and,
optionally, of discharge coefficients and zone names).
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.fuels.base import T0_C
from fuelsys.sheet.catalogue import Arg, Returns, spreadsheet_function


def _flat(cells):
    """A range as it came (rows of cells) -> one list, row by row."""
    return [v for row in cells for v in row]


def _cds(cells, n):
    """Discharge coefficients: blank cells take the default (NaN), numbers must be within 0..1."""
    if cells is None:
        return np.full(n, np.nan)
    vals = _flat(cells)
    if len(vals) == 1 and n > 1 and (vals[0] is None or vals[0] == ""):
        return np.full(n, np.nan)
    if len(vals) != n:
        raise FuelsysInputError(f"cds: one discharge coefficient (or a blank cell) per row of holes is needed "
                                f"(got {len(vals)} cells for {n} rows)")
    out = []
    for k, v in enumerate(vals, 1):
        if v is None or (isinstance(v, str) and not v.strip()):
            out.append(math.nan)
        elif isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(float(v)):
            raise FuelsysInputError(f"cds: row {k} must be a number > 0 and <= 1 or a blank cell (got {v!r})")
        elif not 0 < float(v) <= 1:
            raise FuelsysInputError(f"cds: row {k} must be > 0 and <= 1 (got {float(v):g})")
        else:
            out.append(float(v))
    return np.array(out)


def _names(cells, n):
    vals = _flat(cells)
    if len(vals) != n:
        raise FuelsysInputError(f"zone_names: one name per row of holes is needed (got {len(vals)} cells for "
                                f"{n} rows)")
    out = []
    for k, v in enumerate(vals, 1):
        if isinstance(v, bool) or v is None or (isinstance(v, str) and not v.strip()):
            raise FuelsysInputError(f"zone_names: row {k} is empty; give every row a name")
        if isinstance(v, str) and v.startswith("FS error:"):
            raise FuelsysInputError(f"zone_names: row {k} refers to a cell that failed")
        out.append(v.strip() if isinstance(v, str) else f"{v:g}")
    return out


@spreadsheet_function(
    name="FS_ZONE_AIR", category="combustor",
    summary="Share of the liner air through each row of holes (or each named zone): effective area over total",
    args=[Arg("hole_counts", "range", "-", "holes in each row, one row per zone or hole size", low=0,
              integer=True),
          Arg("hole_dias_mm", "range", "mm", "hole diameter of each row", gt=0),
          Arg("cds", "cells", "-", "discharge coefficient of each row; blank cells take 0.625 "
              "(plain hole, Kaddah 1964)", default=None),
          Arg("zone_names", "cells", "-", "a name for each row; rows of the same name are added "
              "together and the result is labelled", default=None)],
    returns=Returns("table", "-", "a column of air fractions, one per row; or two columns "
                    "(zone name, air fraction) when zone_names is given; fractions sum to 1"),
    source="every opening sees the same liner pressure drop, m = Cd A (2 rho dp)^0.5 (Lefebvre & Ballal, "
           "Gas Turbine Combustion 3rd ed. 2010, ch. 4); default Cd: Kaddah (1964) plain holes at "
           "negligible annulus velocity",
)
def fs_zone_air(hole_counts, hole_dias_mm, cds, zone_names):
    """Air fractions by row or by named zone.

    Parameters
    ----------
    hole_counts : ndarray
        Holes in each row [-]
    hole_dias_mm : ndarray
        Hole diameter of each row [mm]
    cds : list or None
        Discharge coefficients as cells (blank: default) [-]
    zone_names : list or None
        Zone names as cells [-]

    Returns
    -------
    list
        Rows of [fraction] or [name, fraction] [-]

    References
    ----------
    :func:`fuelsys.combustor.air_fractions`.
    """
    from fuelsys import combustor

    n = np.asarray(hole_counts, dtype=float)
    d = np.asarray(hole_dias_mm, dtype=float) / 1e3
    if n.size != d.size:
        raise FuelsysInputError(f"hole_dias_mm: one diameter per row of hole_counts is needed "
                                f"(got {d.size} diameters for {n.size} rows)")
    f = combustor.air_fractions(n, d, _cds(cds, n.size))
    if zone_names is None:
        return [[float(x)] for x in f]
    names = _names(zone_names, n.size)
    total = {}
    for name, x in zip(names, f):
        total[name] = total.get(name, 0.0) + float(x)
    return [[name, x] for name, x in total.items()]


@spreadsheet_function(
    name="FS_ZONE_PHI", category="combustor",
    summary="Equivalence ratio of all the fuel with one zone's share of the air",
    args=[Arg("fuel_g_min", "number", "g/min", "fuel flow to the combustor", low=0),
          Arg("air_g_s", "number", "g/s", "total air flow through the liner", gt=0),
          Arg("zone_fraction", "number", "-", "share of the air that has reached the zone "
              "(primary: tubes + primary holes), e.g. from FS_ZONE_AIR", gt=0, high=1),
          Arg("fuel", "fuel", "-", "built-in fuel name (kerosene, propane, ...) or a fuel table range")],
    returns=Returns("number", "-", "equivalence ratio: fuel/air over the stoichiometric fuel/air"),
    source="phi = (F/A)/(F/A)stoich (Turns, An Introduction to Combustion 3rd ed. 2012, eq. 2.32); "
           "stoichiometric ratio from the fuel's composition",
)
def fs_zone_phi(fuel_g_min, air_g_s, zone_fraction, fuel):
    """Zone equivalence ratio.

    Parameters
    ----------
    fuel_g_min : ndarray
        Fuel flow [g/min]
    air_g_s : ndarray
        Liner air flow [g/s]
    zone_fraction : ndarray
        Air share of the zone [-]
    fuel : Fuel
        The fuel [-]

    Returns
    -------
    ndarray
        Equivalence ratio [-]

    References
    ----------
    :func:`fuelsys.combustor.zone_equivalence_ratio`.
    """
    from fuelsys import combustor

    return combustor.zone_equivalence_ratio(np.asarray(fuel_g_min) / 60000.0, np.asarray(air_g_s) / 1000.0,
                                            zone_fraction, fuel.stoich_far)


_T_LO_C, _T_HI_C = -73.15, 2726.85  # 200..3000 K: fuelsys.equilibrium.HARD_LIMITS, checked in the tests
_PHI_LO, _PHI_HI = 0.3, 2.0  # fuelsys.equilibrium.VALIDITY["phi"], checked in the tests


@spreadsheet_function(
    name="FS_FLAME_TEMP", category="combustor",
    summary="Adiabatic flame temperature of a fuel-air mixture, with dissociation (chemical equilibrium)",
    args=[Arg("fuel", "fuel", "-", "built-in fuel name (kerosene, propane, ...) or a fuel table range; "
              "it enters at 25 °C, liquid (kerosene-type) or gas (the LPG gases)"),
          Arg("phi", "number", "-", "equivalence ratio (1 = stoichiometric)", low=_PHI_LO, high=_PHI_HI),
          Arg("t_in_c", "number", "°C", "air temperature before the flame (compressor delivery)",
              low=_T_LO_C, high=_T_HI_C),
          Arg("p_bar_abs", "number", "bar abs", "pressure (case pressure)", gt=0, high=200),
          Arg("method", "text", "-", "equilibrium (with dissociation) or complete (no dissociation)",
              default="equilibrium", choices=("equilibrium", "complete"))],
    returns=Returns("number", "°C", "adiabatic flame temperature"),
    source="Gibbs-energy minimisation by element potentials over CO2, H2O, CO, H2, O2, N2, Ar, OH, H, O, NO "
           "(Gordon & McBride, NASA RP-1311, 1994) with NASA Glenn polynomials (McBride, Zehe & Gordon, "
           "NASA/TP-2002-211556); checked against Cantera with GRI-Mech 3.0 thermodynamics",
)
def fs_flame_temp(fuel, phi, t_in_c, p_bar_abs, method):
    """Flame temperature [°C].

    Parameters
    ----------
    fuel : Fuel
        The fuel [-]
    phi : ndarray
        Equivalence ratio [-]
    t_in_c : ndarray
        Air temperature [°C]
    p_bar_abs : ndarray
        Pressure [bar abs]
    method : str
        "equilibrium" or "complete" [-]

    Returns
    -------
    ndarray
        Flame temperature [°C]

    References
    ----------
    :func:`fuelsys.equilibrium.adiabatic_flame_temperature`.
    """
    from fuelsys import equilibrium

    lhv_gas = getattr(fuel, "lhv_gas", None)
    h_fuel = float(lhv_gas - fuel.lhv) if lhv_gas is not None else 0.0  # LPG: gas, not liquid, at 25 °C
    T = equilibrium.adiabatic_flame_temperature(phi, np.asarray(t_in_c) + T0_C, np.asarray(p_bar_abs) * 1e5,
                                                fuel, h_fuel=h_fuel, method=method)
    return np.asarray(T) - T0_C


@spreadsheet_function(
    name="FS_MIX_TEMP", category="combustor",
    summary="Temperature after a hot gas stream and a cold air stream mix (energy balance)",
    args=[Arg("t_hot_c", "number", "°C", "hot stream temperature (the gas polynomials end at 6000 K)",
              gt=-273.15, high=3726.85),
          Arg("hot_g_s", "number", "g/s", "hot stream mass flow", low=0),
          Arg("t_cold_c", "number", "°C", "cold stream (air) temperature", gt=-273.15),
          Arg("cold_g_s", "number", "g/s", "cold stream mass flow", low=0),
          Arg("hot_far", "number", "kg/kg", "fuel/air ratio burned in the hot stream, 0 for air; "
              "lean (up to stoichiometric)", default=0.0, low=0, high=0.1),
          Arg("fuel", "fuel", "-", "the fuel burned in the hot stream (sets its products)", default="kerosene")],
    returns=Returns("number", "°C", "mixed-out temperature"),
    source="steady-flow energy balance of adiabatic mixing with ideal-gas air and lean combustion products "
           "from NASA Glenn polynomials (McBride, Zehe & Gordon 2002; Saravanamuttoo et al., Gas Turbine "
           "Theory 6th ed. §2.3)",
)
def fs_mix_temp(t_hot_c, hot_g_s, t_cold_c, cold_g_s, hot_far, fuel):
    """Mixed-out temperature [°C].

    Parameters
    ----------
    t_hot_c : ndarray
        Hot stream temperature [°C]
    hot_g_s : ndarray
        Hot stream flow [g/s]
    t_cold_c : ndarray
        Cold stream temperature [°C]
    cold_g_s : ndarray
        Cold stream flow [g/s]
    hot_far : ndarray
        Fuel/air ratio burned in the hot stream [kg/kg]
    fuel : Fuel
        The fuel burned [-]

    Returns
    -------
    ndarray
        Mixed-out temperature [°C]

    References
    ----------
    :func:`fuelsys.combustor.mix_temperature`.
    """
    from fuelsys import combustor
    from fuelsys.engine import fuel_h_to_c

    y = fuel_h_to_c(fuel)
    T = combustor.mix_temperature(np.asarray(t_hot_c) + T0_C, np.asarray(hot_g_s) / 1e3,
                                  np.asarray(t_cold_c) + T0_C, np.asarray(cold_g_s) / 1e3,
                                  far_hot=hot_far, h_to_c=y)
    return np.asarray(T) - T0_C
