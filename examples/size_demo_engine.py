"""Size the fuel system of the demo engine through the fuelsys Python API.

The engine (the "Moorhen") and its club are a scenario of our own
invention: every input figure comes from :mod:`fuelsys.demo` and is fictional.
The script works in SI throughout and evaluates all operating points in one
vectorised call per step; ``fuelsys demo`` builds the same system as a
workbook, and the two agree (tests/test_examples.py checks it).

Run:  python examples/size_demo_engine.py

Safety: the results are estimates; confirm them by bench tests, and run engines
only where local rules and your club's safety code allow it.
"""

from __future__ import annotations

import numpy as np

from fuelsys import demo, engine, pump, thermo, vaporiser
from fuelsys.flow.lines import line_dp_fuel
from fuelsys.flow.needle import needle_dp_fuel
from fuelsys.flow.tubing import needle_bore
from fuelsys.fuels import fuel_h_to_c, get_fuel
from fuelsys.gas_start import jet_mass_flow

T0 = 273.15


def size() -> dict:
    """The demo engine's fuel system from idle to full power; returns the key results (SI)."""
    e, f, n, v, p, g = demo.ENGINE, demo.FUEL, demo.NEEDLES, demo.VAPORISER, demo.PUMP, demo.GAS
    fuel = get_fuel(f["name"]).with_oil(f["oil_pct"])
    base = get_fuel(f["name"])
    rpm, air, t4_c, thrust = (np.array(col) for col in zip(*e["points"]))
    p_amb = e["ambient_bar_abs"] * 1e5

    # engine: case pressure over speed, compressor exit by the isentropic relation (gamma 1.4, as the book)
    p_case = engine.case_pressure(rpm / e["rpm_max"], e["pr_max"], p_amb)           # gauge [Pa]
    p3 = p_case + p_amb
    t3 = (e["ambient_c"] + T0) * (1 + ((p3 / p_amb) ** (0.4 / 1.4) - 1) / e["compressor_eff"])
    fuel_flow = engine.fuel_flow(air / 1e3, t3, t4_c + T0, base.lhv, fuel_h_to_c(base),
                                 e["combustion_eff"])                                    # [kg/s]
    per_needle = fuel_flow / n["count"]

    # needles: the standard's minimum bore, cold-day fuel
    bore = needle_bore(n["gauge"], n["wall"])                                           # [m]
    t_cold = f["cold_c"] + T0
    dp_needle = needle_dp_fuel(per_needle, bore, n["length_mm"] / 1e3, fuel, t_cold)    # [Pa]

    # vaporiser tubes at every operating point in one call
    tube_air = vaporiser.tube_air_flow(v["tube_bore_mm"] / 1e3, e["liner_dp_pct"] / 100, p3, t3, cd=v["cd"])
    vap = vaporiser.vaporiser(v["tube_bore_mm"] / 1e3, v["heated_length_mm"] / 1e3, per_needle, tube_air, p3, t3,
                              v["wall_c"] + T0, fuel)

    # lines and pump: the system's need along the operating line, then the volts from the fitted pump
    line = line_dp_fuel(fuel_flow, p["line_bore_mm"] / 1e3, p["line_length_m"], fuel, t_cold, p["k_total"])
    rho = fuel.density(t_cold)
    need = pump.system_pressure(p_case, dp_needle, line, density=rho, head=p["head_m"], g_load=p["g_load"],
                                margin_pct=p["margin_pct"])
    tq, tp, tv, tt = (np.array(col) for col in zip(*p["tests"]))
    t_test = tt + T0
    fit = pump.fit_pump(tq / 6e4 / fuel.density(t_test), tp * 1e5, tv, fuel.dynamic_viscosity(t_test))
    volts = fit.pump.volts(fuel_flow / rho, need, fuel.dynamic_viscosity(t_cold))

    # gas start: jet flow from the regulated pressure into the case at idle
    gas_flow = jet_mass_flow(g["gas"], g["jet_bore_mm"] / 1e3, g["jet_length_mm"] / 1e3, g["line_bar_abs"] * 1e5,
                             p3[0], e["ambient_c"] + T0)
    return {"fuel_flow": fuel_flow, "needle_dp": dp_needle, "tube_air": tube_air, "vapour_fraction":
            vap.vapour_fraction, "verdict": vap.verdict, "pump_need": need, "volts": volts,
            "battery_headroom": p["battery_v"] - volts, "gas_flow": gas_flow, "case_pressure": p_case,
            "t3": t3, "thermo_cp_t3": thermo.cp(t3)}


def main() -> None:
    r = size()
    print(f"{demo.ENGINE_NAME}: a scenario of our own invention, every figure fictional\n")
    print("point   fuel g/min  needle dp bar  vaporised %  pump bar g  volts V")
    for i in range(r["fuel_flow"].size):
        print(f"{i + 1:5d}  {r['fuel_flow'][i] * 6e4:10.1f}  {r['needle_dp'][i] / 1e5:13.3f}"
              f"  {r['vapour_fraction'][i] * 100:11.1f}  {r['pump_need'][i] / 1e5:10.3f}  {r['volts'][i]:7.2f}")
    print(f"\nbattery headroom at full power: {r['battery_headroom'][-1]:.2f} V;"
          f" gas flow at the start: {r['gas_flow'] * 6e4:.2f} g/min")
    print(f"vaporiser at full power: {r['verdict'][-1]}")
    print("\nThese are estimates: confirm them by bench tests.")


if __name__ == "__main__":
    main()
