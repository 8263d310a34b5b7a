"""Vaporiser tube: one check at the default step count; 100 operating points vectorised vs 100 single calls.

Aim (issue 5): at most 2 ms per tube-operating point in the vectorised call.  Spreadsheet face (issue 17):
FS_VAPORISER over a 100-point range against 100 single cells, goal at least 20x faster per point.  The operating points are
our own invention: idle to full power of a small engine, one 6 mm tube 150 mm long.
"""

import time
import warnings

import numpy as np

from fuelsys import vaporiser as vap
from fuelsys.errors import ValidityWarning
from fuelsys.fuels import get_fuel
from fuelsys.sheet import call


def _best(fn, repeat=3):
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def run(report):
    warnings.simplefilter("ignore", ValidityWarning)
    n = 100
    s = np.linspace(0.0, 1.0, n)
    fuel_flow = (0.08 + 0.6 * s) * 1e-3       # kg/s per tube
    air = (1.0 + 3.5 * s) * 1e-3              # kg/s per tube
    p3 = (1.2 + 2.0 * s) * 1e5                # Pa abs
    t3 = 300.0 + 180.0 * s                    # K
    wall = 600.0 + 300.0 * s                  # K
    for name, fuel in (("kerosene", get_fuel("kerosene")), ("kerosene + 4 % oil", get_fuel("kerosene").with_oil(4))):
        vap.vaporiser(6e-3, 0.15, fuel_flow[-1], air[-1], p3[-1], t3[-1], wall[-1], fuel)  # warm-up
        one = _best(lambda: vap.vaporiser(6e-3, 0.15, fuel_flow[-1], air[-1], p3[-1], t3[-1], wall[-1], fuel))
        report(f"vaporiser, {name}: one tube check, {vap.N_STEPS} steps", None, one,
               "includes the step-doubling check")

        def singles():
            for i in range(n):
                vap.vaporiser(6e-3, 0.15, fuel_flow[i], air[i], p3[i], t3[i], wall[i], fuel)

        def batch():
            vap.vaporiser(6e-3, 0.15, fuel_flow, air, p3, t3, wall, fuel)

        base = _best(singles, repeat=1)
        cand = _best(batch)
        report(f"vaporiser, {name}: {n} points, one call vs {n} calls", base, cand,
               f"{cand / n * 1e3:.2f} ms per point (aim <= 2 ms)")
        cand = _best(lambda: vap.vaporiser(6e-3, 0.15, fuel_flow, air, p3, t3, wall, fuel, shape="return"))
        report(f"vaporiser, {name}: {n} points, return bend (two legs)", None, cand,
               f"{cand / n * 1e3:.2f} ms per point")
        flame = vap.FlameSide(1700.0, 150.0, 0.2)
        cand = _best(lambda: vap.vaporiser(6e-3, 0.15, fuel_flow, air, p3, t3, flame, fuel))
        report(f"vaporiser, {name}: {n} points, flame-side wall", None, cand,
               f"{cand / n * 1e3:.2f} ms per point (aim <= 2 ms)")

    _sheet_range(report)


def _sheet_range(report):
    """FS_VAPORISER: one call over a 100-point range vs 100 single cells (the same points)."""
    n = 100
    s = np.linspace(0.0, 1.0, n)
    fuel_g_min = [[float(v)] for v in 10.0 + 40.0 * s]
    air_g_s = [[float(v)] for v in 1.5 + 3.0 * s]
    case = [[float(v)] for v in 1.3 + 1.7 * s]
    t3_c = [[float(v)] for v in 40.0 + 170.0 * s]
    call("FS_VAPORISER", 6, 150, fuel_g_min[0][0], air_g_s[0][0], case[0][0], t3_c[0][0], 650, "kerosene", 0,
         "dew_margin_k")  # warm-up

    def singles():
        for i in range(n):
            call("FS_VAPORISER", 6, 150, fuel_g_min[i][0], air_g_s[i][0], case[i][0], t3_c[i][0], 650, "kerosene",
                 0, "dew_margin_k")

    def batch():
        call("FS_VAPORISER", 6, 150, fuel_g_min, air_g_s, case, t3_c, 650, "kerosene", 0, "dew_margin_k")

    base = _best(singles, repeat=1)
    cand = _best(batch)
    report(f"FS_VAPORISER: {n}-point range vs {n} single cells", base, cand,
           f"single cell {base / n * 1e3:.1f} ms, range {cand / n * 1e3:.2f} ms per point (goal >= 20x)")
