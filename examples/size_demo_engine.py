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

from fuelsys import combustor, demo, engine, pump, thermo, vaporiser
from fuelsys.flow.lines import line_dp_fuel
from fuelsys.flow.needle import needle_dp_fuel
from fuelsys.flow.bench import effective_bore_from_test
from fuelsys.fuels import fuel_h_to_c, get_fuel
from fuelsys.gas_start import jet_mass_flow

T0 = 273.15


def _isa_pressure(elevation_m):
    """ISA static pressure [Pa] at a field elevation [m] below 11 km (ISO 2533)."""
    return 101325.0 * (1.0 - 2.25577e-5 * elevation_m) ** 5.25588


def size() -> dict:
    """The demo engine's fuel system on the cold day, idle to full power; returns the key results (SI)."""
    e, f, n, v, p, g = demo.ENGINE, demo.FUEL, demo.NEEDLES, demo.VAPORISER, demo.PUMP, demo.GAS
    cold = demo.ENVELOPE["cold"]
    fuel = get_fuel(f["name"]).with_oil(f["oil_pct"])
    base = get_fuel(f["name"])
    rpm, air_ref, t4_c, thrust = (np.array(col) for col in zip(*e["points"]))
    p_ref, t_ref = e["ambient_bar_abs"] * 1e5, e["ambient_c"] + T0

    # engine at the figures' ambient, then carried to the cold day at the same speeds: the same isentropic
    # work (constant cp, gamma 1.4) and the same volume flow (air flow with the inlet density), as the book
    pr_ref = (engine.case_pressure(rpm / e["rpm_max"], e["pr_max"], p_ref) + p_ref) / p_ref
    p_amb = cold["ambient_bar_abs"] * 1e5 if cold["ambient_bar_abs"] else _isa_pressure(cold["elevation_m"])
    t_amb = cold["ambient_c"] + T0
    pr = (1 + t_ref / t_amb * (pr_ref ** (0.4 / 1.4) - 1)) ** (1.4 / 0.4)
    air = air_ref * (p_amb / p_ref) * (t_ref / t_amb)
    p3 = pr * p_amb
    p_case = p3 - p_amb                                                                  # gauge [Pa]
    t3 = t_amb * (1 + (pr ** (0.4 / 1.4) - 1) / e["compressor_eff"])
    fuel_flow = engine.fuel_flow(air / 1e3, t3, t4_c + T0, base.lhv, fuel_h_to_c(base),
                                 e["combustion_eff"])                                    # [kg/s]
    per_needle = fuel_flow / n["count"]

    # needles: the mean effective bore of the bench test (water), fuel at the ring's cold-day temperature
    (t_s, dp_bench, t_bench), vols = n["bench"]
    bores = effective_bore_from_test(np.array(vols) * 1e-6, t_s, dp_bench * 1e5, n["length_mm"] / 1e3,
                                     get_fuel("water"), t_bench + T0)
    bore = float(np.mean(bores))                                                        # [m]
    t_ring, t_pump = cold["ring_fuel_c"] + T0, cold["pump_fuel_c"] + T0
    dp_needle = needle_dp_fuel(per_needle, bore, n["length_mm"] / 1e3, fuel, t_ring)    # [Pa]

    # vaporiser tubes: each tube's air is the engine's air times the tubes' share of the liner's effective area
    counts, dias, cds = [], [], []
    for zone, count, dia in demo.COMBUSTOR["openings"]:
        tube = dia is None
        counts.append(n["count"] if tube else count)
        dias.append((v["tube_bore_mm"] if tube else dia) / 1e3)
        cds.append(v["cd"] if tube else combustor.CD_PLAIN_HOLE)
    tube_share = combustor.air_fractions(counts, dias, cds)[0]
    tube_air = air / 1e3 * tube_share / n["count"]                                       # [kg/s]
    vap = vaporiser.vaporiser(v["tube_bore_mm"] / 1e3, v["heated_length_mm"] / 1e3, per_needle, tube_air, p3, t3,
                              v["wall_c"] + T0, fuel)

    # lines and pump: the system's need along the operating line, then the volts from the fitted pump
    line = line_dp_fuel(fuel_flow, p["line_bore_mm"] / 1e3, p["line_length_m"], fuel, t_pump, p["k_total"])
    rho = fuel.density(t_pump)
    need = pump.system_pressure(p_case, dp_needle, line, density=rho, head=p["head_m"], g_load=p["g_load"],
                                margin_pct=p["margin_pct"])
    tq, tp, tv, tt = (np.array(col) for col in zip(*p["tests"]))
    t_test = tt + T0
    fit = pump.fit_pump(tq / 6e4 / fuel.density(t_test), tp * 1e5, tv, fuel.dynamic_viscosity(t_test),
                        winding_ohm=p["winding_ohm"])
    volts = fit.pump.volts(fuel_flow / rho, need, fuel.dynamic_viscosity(t_pump))

    # gas start: jet flow from the regulated pressure into the case at idle, cold canister
    gas_flow = jet_mass_flow(g["gas"], g["jet_bore_mm"] / 1e3, g["jet_length_mm"] / 1e3, g["line_bar_abs"] * 1e5,
                             p3[0], cold["canister_c"] + T0)
    return {"fuel_flow": fuel_flow, "needle_dp": dp_needle, "tube_air": tube_air, "vapour_fraction":
            vap.vapour_fraction, "verdict": vap.verdict, "pump_need": need, "volts": volts,
            "battery_headroom": p["battery_v"] - volts, "gas_flow": gas_flow, "case_pressure": p_case,
            "t3": t3, "thermo_cp_t3": thermo.cp(t3), "bore": bore}


def main() -> None:
    r = size()
    print(f"{demo.ENGINE_NAME}: a scenario of our own invention, every figure fictional\n")
    print("point   fuel g/min  needle dp bar  vaporised %  pump bar g  volts V")
    for i in range(r["fuel_flow"].size):
        print(f"{i + 1:5d}  {r['fuel_flow'][i] * 6e4:10.1f}  {r['needle_dp'][i] / 1e5:13.3f}"
              f"  {r['vapour_fraction'][i] * 100:11.1f}  {r['pump_need'][i] / 1e5:10.3f}  {r['volts'][i]:7.2f}")
    print(f"\ncold day; battery headroom at full power: {r['battery_headroom'][-1]:.2f} V;"
          f" gas flow at the start: {r['gas_flow'] * 6e4:.2f} g/min")
    print(f"vaporiser at full power: {r['verdict'][-1]}")
    print("\nThese are estimates: confirm them by bench tests.")


if __name__ == "__main__":
    main()
