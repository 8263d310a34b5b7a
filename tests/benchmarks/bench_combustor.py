"""Flame temperature and combustor zones over many operating points: one vectorised call vs a per-point loop.

Baseline, measured in the same run: the same function called once per point in a Python loop (what a
straightforward use does).  The loop is timed on a sample of the points and scaled, to keep the run short.
Candidate: one call on the whole arrays (the Newton iteration of all points together).
"""

import sys
import time
import warnings
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[2]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))


def _best(fn, repeat=3):
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def run(report):
    from fuelsys import combustor, equilibrium
    from fuelsys.errors import ValidityWarning
    from fuelsys.fuels import get_fuel

    warnings.simplefilter("ignore", ValidityWarning)
    kero = equilibrium.fuel_composition(get_fuel("kerosene"))
    rng = np.random.default_rng(7)
    n = 10_000
    phi = rng.uniform(0.3, 2.0, n)
    t_in = rng.uniform(250.0, 900.0, n)
    p = rng.uniform(0.5e5, 20e5, n)
    sample = 400
    scale = n / sample
    for method in ("equilibrium", "complete"):
        def loop():
            for i in range(sample):
                equilibrium.adiabatic_flame_temperature(phi[i], t_in[i], p[i], kero, method=method)

        base = _best(loop, 1) * scale
        cand = _best(lambda: equilibrium.adiabatic_flame_temperature(phi, t_in, p, kero, method=method))
        report(f"flame temperature ({method}), {n} (phi, T, p) points vs per-point loop", base, cand,
               f"loop timed on {sample} points and scaled")

    liner = combustor.Liner.from_openings([("vaporiser", 6, 5e-3), ("primary", 24, 2.5e-3),
                                           ("secondary", 24, 3.7e-3), ("dilution", 12, 7.5e-3),
                                           ("cooling", 48, 1.8e-3)])
    air = rng.uniform(0.05, 0.15, n)
    fuel = air * rng.uniform(0.012, 0.022, n)
    t3 = rng.uniform(300.0, 430.0, n)
    p3 = rng.uniform(1.1e5, 2.7e5, n)
    sample = 200
    scale = n / sample

    def loop_c():
        for i in range(sample):
            combustor.combustor(liner, fuel[i], t3[i], p3[i], kero, air_flow=air[i])

    base = _best(loop_c, 1) * scale
    cand = _best(lambda: combustor.combustor(liner, fuel, t3, p3, kero, air_flow=air))
    report(f"combustor zones, {n} operating points vs per-point loop", base, cand,
           f"loop timed on {sample} points and scaled")
