"""Operating line of 200 points through the whole fuel system, vectorised vs a per-point loop.

Chain per point (an example engine and fuel system of our own invention):
engine operating line (case pressure, air flow, T3, fuel demand from the
energy balance) -> needle pressure drop (8 needles share the flow) -> line
pressure drop (2 mm bore, 0.6 m) -> system pressure with head, g-load and
margin -> pump voltage from a gear-pump-and-motor model.

Candidate: every step called once on 200-element arrays.
Baseline: the same functions called 200 times on scalars.
"""

from __future__ import annotations

import time

import numpy as np

from fuelsys import engine, pump
from fuelsys.flow.needle import needle_dp

N_POINTS = 200
NEEDLES = 8
NEEDLE_BORE, NEEDLE_LENGTH = 0.41e-3, 30e-3  # 22 G thin wall, 30 mm (example)
LINE_BORE, LINE_LENGTH = 2.0e-3, 0.6
RHO, MU = 800.0, 1.4e-3  # kerosene near 20 °C (example values)
LHV, H_TO_C = 43.2e6, 1.94
PUMP = pump.GearPump.physical(4.0e-7, 1.2, 0.5, 2.0e-15)


def _chain(speed):
    line = engine.operating_line(speed, 120000.0, 2.8, 0.25, 1050.0, lhv=LHV, h_to_c=H_TO_C)
    mf = np.asarray(line["fuel_flow"])
    dp_needle = np.asarray(needle_dp(mf / NEEDLES, NEEDLE_BORE, NEEDLE_LENGTH, RHO, MU))
    dp_line = np.asarray(needle_dp(mf, LINE_BORE, LINE_LENGTH, RHO, MU))
    p_need = np.asarray(pump.system_pressure(line["case_pressure"], dp_needle, dp_line, density=RHO,
                                             head=0.2, g_load=3.0, margin_pct=10.0))
    q = mf / RHO
    volts = np.asarray(PUMP.volts(q, p_need, MU))
    return line["case_pressure"], mf, p_need, volts


def _best(fn, repeat=3):
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def run(report):
    speeds = np.linspace(40000.0, 120000.0, N_POINTS)
    vec = _chain(speeds)
    loop_out = [_chain(float(s)) for s in speeds[::40]]
    for j, s in enumerate(range(0, N_POINTS, 40)):  # the two paths agree
        for a, b in zip(vec, loop_out[j]):
            assert abs(float(np.ravel(a)[s]) - float(np.ravel(b)[0])) <= 1e-9 * max(1.0, abs(float(np.ravel(a)[s])))
    t_vec = _best(lambda: _chain(speeds))
    t_loop = _best(lambda: [_chain(float(s)) for s in speeds], repeat=1)
    report("system: 200-point operating line -> needles, line, pump volts", t_loop, t_vec,
           "baseline: per-point loop over the same functions")


if __name__ == "__main__":
    def _print(name, base, cand, note=""):
        print(f"{name:60s} {base:9.4f}s {cand:9.4f}s {base / cand:8.1f}x  {note}")

    run(_print)
