"""The adapter's cost: single cells and large ranges through fuelsys.sheet against plain anchors.

Each ratio is anchor time / candidate time, both measured in this run (>1: the
spreadsheet function is faster than the anchor).

- single FS_NEEDLE_FLOW cell vs one point solved the plain way: the fluids
  library's friction factor (Clamond 2009 Colebrook solution, fluids.friction)
  inside a scipy brentq solve of the needle's pressure balance.  Goal >= 2x.
- single FS_DENSITY cell vs the core call it wraps (fuel.density at one
  temperature).  Goal: the cell within 2x of the core (ratio >= 0.5).
- FS_NEEDLE_FLOW over 1e5 DISTINCT points (a 1e5 x 1 column of pressure
  drops) vs the core vectorised call on the same points.  Goal: within 5x
  (ratio >= 0.2).
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from run import best_of  # noqa: E402


def _anchor_needle_point(dp, D, L, rho, mu, k_ent=0.5, rough=1.5e-6):
    """Mass flow [kg/s] of one needle by brentq on dp = (K + 1 + f L/D) rho u^2 / 2, f from fluids."""
    from fluids.friction import friction_factor
    from scipy.optimize import brentq

    area = math.pi * D * D / 4.0

    def resid(m):
        u = m / (rho * area)
        re = rho * u * D / mu
        f = friction_factor(Re=re, eD=rough / D)
        return (k_ent + 1.0 + f * L / D) * rho * u * u / 2.0 - dp

    m_hi = area * math.sqrt(2.0 * rho * dp)
    return brentq(resid, m_hi * 1e-9, m_hi, rtol=1e-12)


def run(report):
    import warnings

    from fuelsys.errors import ValidityWarning

    warnings.simplefilter("ignore", ValidityWarning)
    from fuelsys.flow.needle import needle_flow
    from fuelsys.fuels import get_fuel
    from fuelsys.sheet import call

    ker = get_fuel("kerosene")
    T = 293.15
    rho, mu = float(ker.density(T)), float(ker.dynamic_viscosity(T))

    # a warm-up call of each path (imports, caches)
    call("FS_NEEDLE_FLOW", 0.3, 25, 2.0, "kerosene", 20)
    call("FS_DENSITY", "kerosene", 20)
    _anchor_needle_point(2e5, 3e-4, 0.025, rho, mu)

    pts = [1.0 + 0.001 * k for k in range(200)]  # distinct cells, so no result cache can help
    it = iter(range(10 ** 9))

    def one_cell():
        k = next(it) % 200
        call("FS_NEEDLE_FLOW", 0.3, 25, pts[k], "kerosene", 20)

    def one_anchor():
        k = next(it) % 200
        _anchor_needle_point(pts[k] * 1e5, 3e-4, 0.025, rho, mu)

    t_anchor = best_of(one_anchor, repeat=5, number=200)
    t_cell = best_of(one_cell, repeat=5, number=200)
    report("adapt: FS_NEEDLE_FLOW cell vs fluids+brentq point", t_anchor, t_cell,
           f"goal >= 2x; cell {t_cell * 1e6:.0f} us, anchor {t_anchor * 1e6:.0f} us")

    def core_density():
        k = next(it) % 200
        ker.density(T + pts[k])

    def density_cell():
        k = next(it) % 200
        call("FS_DENSITY", "kerosene", 20 + pts[k])

    t_core = best_of(core_density, repeat=5, number=300)
    t_dcell = best_of(density_cell, repeat=5, number=300)
    report("adapt: FS_DENSITY cell vs core fuel.density", t_core, t_dcell,
           f"goal >= 0.5x; cell {t_dcell * 1e6:.0f} us, core {t_core * 1e6:.0f} us")

    n = 100_000
    rng = np.random.default_rng(1)
    dp_bar = rng.uniform(0.2, 8.0, n)  # distinct values
    column = dp_bar.reshape(-1, 1).tolist()

    def core_vector():
        needle_flow(dp_bar * 1e5, 3e-4, 0.025, rho, mu)

    def range_call():
        call("FS_NEEDLE_FLOW", 0.3, 25, column, "kerosene", 20)

    t_vec = best_of(core_vector, repeat=3)
    t_rng = best_of(range_call, repeat=3)
    report("adapt: FS_NEEDLE_FLOW 1e5 distinct points vs core", t_vec, t_rng,
           f"goal >= 0.2x; {t_rng / n * 1e6:.2f} us per point in the cell range")
