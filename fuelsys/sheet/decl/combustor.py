"""Spreadsheet functions for the combustor: air split by zone, zone mixture, flame and mixing temperatures.

Hole diameters in mm, fuel in g/min, air in g/s, temperatures in °C,
pressures in bar abs.  A liner is described as rows of openings, one row per
zone or hole size: a column of hole counts beside a column of diameters (and,
optionally, of discharge coefficients and zone names).
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys.equilibrium import HARD_LIMITS, VALIDITY
from fuelsys.errors import FuelsysInputError
from fuelsys.sheet.catalogue import Arg, Returns, from_si, spreadsheet_function


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
    si=True,
    example=([[6], [8], [12]], [[2.0], [3.0], [4.0]]),
)
def fs_zone_air(hole_counts, d, cds, zone_names):
    from fuelsys import combustor

    n = np.asarray(hole_counts, dtype=float)
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
    si=True,
    example=(200, 250, 0.3, "kerosene"),
)
def fs_zone_phi(fuel_flow, air, zone_fraction, fuel):
    from fuelsys import combustor

    return combustor.zone_equivalence_ratio(fuel_flow, air, zone_fraction, fuel.stoich_far)


_T_LO_C, _T_HI_C = (from_si(t, "°C") for t in HARD_LIMITS["t_inlet"][:2])  # the equilibrium solver's hard limits
_PHI_LO, _PHI_HI = VALIDITY["phi"][:2]


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
    si=True,
    example=("kerosene", 0.8, 150, 2.5),
)
def fs_flame_temp(fuel, phi, T_in, p, method):
    from fuelsys import equilibrium

    lhv_gas = getattr(fuel, "lhv_gas", None)
    h_fuel = float(lhv_gas - fuel.lhv) if lhv_gas is not None else 0.0  # LPG: gas, not liquid, at 25 °C
    return equilibrium.adiabatic_flame_temperature(phi, T_in, p, fuel, h_fuel=h_fuel, method=method)


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
    si=True,
    example=(1800, 100, 150, 150, 0.04),
)
def fs_mix_temp(T_hot, hot, T_cold, cold, hot_far, fuel):
    from fuelsys import combustor
    from fuelsys.fuels import fuel_h_to_c

    return combustor.mix_temperature(T_hot, hot, T_cold, cold, far_hot=hot_far, h_to_c=fuel_h_to_c(fuel))
