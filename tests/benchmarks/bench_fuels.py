"""Vectorised kerosene properties against a per-point Python loop over the same API.

Measured: density + kinematic viscosity + vapour pressure of the built-in
kerosene over 10⁵ temperatures in its liquid range, as three array calls,
against the same three calls made point by point in a Python loop.  The loop
is timed on a 2000-point subsample and scaled to 10⁵ points (its cost per point
is constant), which keeps the benchmark short.  Aim (issue 2): >= 50x.

Also measured: the equilibrium flash (vaporised fraction with air) over 10⁵
(T, P, fuel/air) points, vectorised, against the same per-point loop.
"""

import sys
import time
import warnings
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[2]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

N = 100_000
N_LOOP = 2_000


def _best(fn, repeat=3):
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def run(report):
    from fuelsys.errors import ValidityWarning
    from fuelsys.fuels import get_fuel

    warnings.simplefilter("ignore", ValidityWarning)
    t0 = time.perf_counter()
    kero = get_fuel("kerosene")
    build = time.perf_counter() - t0
    rng = np.random.default_rng(0)
    T = rng.uniform(kero.t_min, kero.t_max, N)
    Ts = [float(t) for t in T[:N_LOOP]]

    def vectorised():
        kero.density(T)
        kero.kinematic_viscosity(T)
        kero.vapour_pressure(T)

    def loop():
        for t in Ts:
            kero.density(t)
            kero.kinematic_viscosity(t)
            kero.vapour_pressure(t)

    # same numbers either way
    assert np.allclose([kero.density(t) for t in Ts[:50]], kero.density(T[:50]), rtol=1e-12)
    cand = _best(vectorised)
    base = _best(loop, repeat=2) * N / N_LOOP
    report("kerosene density+viscosity+vapour pressure, 1e5 temperatures", base, cand,
           f"loop timed on {N_LOOP} points x {N // N_LOOP}; aim >= 50x")

    P = rng.uniform(0.5e5, 6e5, N)
    far = 10 ** rng.uniform(-2, 1, N)
    Tf = rng.uniform(kero.t_min, 800.0, N)
    pts = list(zip(Tf[:N_LOOP // 4].tolist(), P[:N_LOOP // 4].tolist(), far[:N_LOOP // 4].tolist()))
    cand = _best(lambda: kero.vapour_fraction(Tf, P, far), repeat=2)
    base = _best(lambda: [kero.vapour_fraction(a, b, c) for a, b, c in pts], repeat=2) * N / len(pts)
    report("kerosene equilibrium flash with air, 1e5 (T, P, far) points", base, cand,
           f"loop timed on {len(pts)} points, scaled")
    report("kerosene characterisation (first get_fuel)", None, build, "aim well under 0.2 s")


if __name__ == "__main__":
    def _print(name, base, cand, note=""):
        ratio = f"{base / cand:8.1f}x" if base else ""
        print(f"{name:62s} {base if base else float('nan'):10.4g}s {cand:10.4g}s {ratio}  {note}")

    run(_print)
