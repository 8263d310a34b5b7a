"""Spreadsheet functions for the gas start: start-jet flow and canister chill over a run.

(FS_CANISTER_PRESSURE lives in :mod:`fuelsys.sheet.decl.gas_props`.)
"""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.sheet.catalogue import Arg, Returns, from_si, spreadsheet_function
from fuelsys.sheet.decl import checked_temperature

_GAS = Arg("gas", "text", "-", "propane, butane, isobutane or a blend lpg-XX-YY (% by mass)")


def _get(gas):
    from fuelsys.fuels.gases import get_gas

    try:
        fluid = get_gas(gas)
    except FuelsysInputError as exc:
        raise FuelsysInputError(f"gas: {exc}") from None
    if not all(k in ("propane", "n-butane", "isobutane") for k in fluid.components):
        raise FuelsysInputError(f"gas: {gas} is not a start gas; use propane, butane, isobutane or lpg-XX-YY")
    return fluid


@spreadsheet_function(
    name="FS_GAS_JET_FLOW", category="gas",
    summary="Gas flow through a start jet or small needle, choked or not",
    args=[Arg("bore_mm", "number", "mm", "jet or needle bore", gt=0, high=20),
          Arg("length_mm", "number", "mm", "length of the bore; 0 for a thin orifice", low=0, high=2000),
          Arg("up_bar_abs", "number", "bar abs", "gas pressure before the jet", gt=0),
          Arg("down_bar_abs", "number", "bar abs", "pressure after the jet", low=0),
          _GAS,
          Arg("temp_c", "number", "°C", "gas temperature before the jet", gt=-273.15),
          Arg("cd", "number", "-", "discharge coefficient", default=0.8, gt=0, high=1)],
    returns=Returns("number", "g/min", "gas mass flow"),
    source="isentropic expansion with the real-gas equation of state (CoolProp) for a pure gas through an "
           "orifice; otherwise ideal gas with real γ and Z and Fanno friction along the bore (Anderson, "
           "Modern Compressible Flow 3rd ed. §3.9, §5.4); cd 0.8 after Lichtarowicz et al. (1965)",
    si=True,
    example=(0.35, 12, 2.5, 1.4, "propane", 20),
)
def fs_gas_jet_flow(d, L, up, down, gas, T, cd):
    from fuelsys import gas_start

    fluid = _get(gas)
    if np.any(down > up):
        raise FuelsysInputError("down_bar_abs must not be above up_bar_abs (gas flows from high to low pressure)")
    T = checked_temperature(fluid, T, "temp_c")
    if np.all(L == 0) or np.all(L > 0):
        m = gas_start.jet_mass_flow(fluid, d, L, up, down, T, cd)
    else:  # a column mixing orifices and needles: each kind by its own method
        b = np.broadcast_arrays(d, L, up, down, T, np.asarray(cd, dtype=float))
        m = np.empty(b[0].shape)
        for sel in (b[1] == 0, b[1] > 0):
            m[sel] = gas_start.jet_mass_flow(fluid, *(x[sel] for x in b))
    return m


@spreadsheet_function(
    name="FS_CANISTER_CHILL", category="gas",
    summary="Canister temperature, pressure and liquid left over a run of drawing gas",
    args=[_GAS,
          Arg("liquid_g", "number", "g", "liquid gas in the canister at the start", gt=0, high=20000),
          Arg("shell_g", "number", "g", "mass of the empty canister", low=0, high=20000),
          Arg("flow_g_min", "number", "g/min", "gas drawn", gt=0, high=1000),
          Arg("minutes", "number", "min", "length of the run", gt=0, high=600),
          Arg("ambient_c", "number", "°C", "air temperature round the canister (also the start)", gt=-273.15),
          Arg("shell", "text", "-", "canister material", default="steel", choices=("steel", "aluminium")),
          Arg("p_need_bar_abs", "number", "bar abs", "pressure the jet needs; the table marks when it is lost; "
              "empty: the standard atmosphere, 1.01325 (below it no gas leaves the canister)", default=1.01325,
              gt=0),
          Arg("rows", "number", "-", "rows of the table after its header", default=11, low=2, high=200,
              integer=True)],
    returns=Returns("table", "-", "header row, then rows of minutes, canister °C, bar abs, liquid g left, "
                                  "heat from the air W, and whether the pressure still meets p_need_bar_abs"),
    source="lumped energy balance: latent heat drawn from liquid and shell, natural convection from the air "
           "(Churchill & Chu 1975), solved with solve_ivp; CoolProp saturation properties; shell specific "
           "heat from Incropera et al. 6th ed. Table A.1",
    si=True,
    example=("propane", 180, 110, 3, 5, 15),
)
def fs_canister_chill(gas, m_liquid, m_shell, mdot, duration, T_air, shell, p_need, rows):
    from fuelsys import gas_start

    fluid = _get(gas)
    out = gas_start.canister_chill(fluid, float(m_liquid), float(m_shell), float(mdot), float(duration),
                                   float(T_air), shell=str(shell).strip().lower(), p_required=float(p_need),
                                   n_out=int(rows))
    header = ["minutes", "temp_c", "pressure_bar_abs", "liquid_g", "heat_from_air_w", "pressure_ok"]
    table = [header]
    for t, T, p, m, q in zip(out["time"], out["temperature"], out["pressure"], out["liquid_mass"],
                             out["heat_gain"]):
        ok = "yes" if p >= p_need else "no"
        if m <= 0 and t > 0:
            ok = "empty"
        table.append([from_si(t, "min"), from_si(T, "°C"), from_si(p, "bar abs"), from_si(m, "g"), q, ok])
    return table
