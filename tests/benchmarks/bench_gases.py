"""CoolProp fluids through fuelsys vs plain PropsSI.

Baselines, measured in the same run:

* per-point PropsSI calls in a Python loop (what a straightforward port does);
* one vectorised PropsSI call on the whole 1-D array (CoolProp's own fast path).

Candidate: the same property through :class:`fuelsys.fuels.gases.CoolPropFluid`
(tabulated saturation backend).  The per-point loop is timed on a sample of the
points and scaled, to keep the run short.
"""

import sys
import time
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
    from CoolProp.CoolProp import PropsSI

    from fuelsys.fuels.gases import get_gas

    propane = get_gas("propane")
    propane.vapour_pressure(293.15)          # build the tables outside the timing
    t0 = time.perf_counter()
    get_gas("lpg-60-40").vapour_pressure(293.15)
    report("gases: first use of a new blend (tables for its new component)", None,
           time.perf_counter() - t0, "one-off cost, CoolProp already imported")

    rng = np.random.default_rng(1)
    for n in (10_000, 100_000):
        T = rng.uniform(200.0, 360.0, n)
        sample = T[:2000]
        scale = n / sample.size
        for label, out, q, fn in [
            ("vapour pressure", "P", 0, propane.vapour_pressure),
            ("liquid density", "D", 0, propane.density),
            ("liquid viscosity", "V", 0, propane.dynamic_viscosity),
        ]:
            loop = _best(lambda: [PropsSI(out, "T", float(t), "Q", q, "Propane") for t in sample], 1) * scale
            vec = _best(lambda: PropsSI(out, "T", T, "Q", q, "Propane"))
            cand = _best(lambda: fn(T))
            report(f"gases: propane {label}, {n} temperatures vs per-point PropsSI", loop, cand,
                   "loop timed on 2000 points and scaled")
            report(f"gases: propane {label}, {n} temperatures vs vectorised PropsSI", vec, cand, "")
        loop = _best(lambda: [PropsSI("H", "T", float(t), "Q", 1, "Propane")
                              - PropsSI("H", "T", float(t), "Q", 0, "Propane") for t in sample], 1) * scale
        cand = _best(lambda: propane.latent_heat(T))
        report(f"gases: propane latent heat, {n} temperatures vs per-point PropsSI", loop, cand,
               "loop timed on 2000 points and scaled")

    # blends: the fuelsys model vs CoolProp's HEOS mixture bubble point (per point)
    blend = get_gas("lpg-70-30")
    T = rng.uniform(240.0, 330.0, 10_000)
    sample = T[:100]
    mix = blend.coolprop_string
    loop = _best(lambda: [PropsSI("P", "T", float(t), "Q", 0, mix) for t in sample], 1) * (T.size / sample.size)
    cand = _best(lambda: blend.vapour_pressure(T))
    report("gases: lpg-70-30 bubble pressure, 10000 temperatures vs HEOS mixture PropsSI", loop, cand,
           "loop timed on 100 points and scaled; models differ (< 0.7 %)")
    P = rng.uniform(0.5e5, 5e5, 10_000)
    cand = _best(lambda: blend.vapour_fraction(T, P, 1.0))
    report("gases: lpg-70-30 vapour fraction in air, 10000 points", None, cand, "Rachford-Rice, vectorised")


if __name__ == "__main__":
    def _print(name, base, cand, note=""):
        ratio = f"{base / cand:8.1f}x" if base else ""
        print(f"{name:75s} {base or 0:9.4f} {cand:9.4f} {ratio} {note}")

    run(_print)
