"""Needle flow at scale: the vectorised FS_NEEDLE_FLOW core against a per-point scalar solve.

Candidate: :func:`fuelsys.flow.needle.needle_flow` on 10^6 operating points at
once (bores, lengths, pressure drops and kerosene properties over a builder's
range).  Baseline: the same model written for one point with the ``math``
module, solved per point with ``scipy.optimize.brentq`` (relative tolerance
1e-12), timed on a subsample and extrapolated per point.  Aim: at least 100x
and under 1 us per point.

Also: a batch of ring manifolds solved at once against one call per manifold,
and the spreadsheet path (fuelsys.sheet.call on a 100 x 100 range).
"""

from __future__ import annotations

import math
import time
import warnings

import numpy as np

from fuelsys.errors import ValidityWarning

_LN8, _LN64, _LN7, _LN37530 = math.log(8.0), math.log(64.0), math.log(7.0), math.log(37530.0)


def _logaddexp(a, b):
    m = max(a, b)
    return m + math.log1p(math.exp(-abs(a - b)))


def _dp_scalar(m, D, L, rho, mu, k_ent=0.5, e=1.5e-6):
    """The needle model of fuelsys.flow.needle for one point (Shah 1978 + Churchill 1977 blend)."""
    Re = 4.0 * m / (math.pi * D * mu)
    lam, eD = L / D, e / D
    x = lam / Re
    a = 3.44 / math.sqrt(x)
    g = a + (0.3125 / x + 16.0 - a) / (1.0 + 0.00021 / (x * x))
    lnRe = math.log(Re)
    ln_fl = math.log(4.0 * g) - lnRe
    q = math.exp(0.9 * (_LN7 - lnRe)) + 0.27 * eD
    lnA = 16.0 * math.log(2.457 * max(abs(-math.log(q)), 1e-300))
    lnB = 16.0 * (_LN37530 - lnRe)
    ln_T = 12.0 * _LN8 - 1.5 * _logaddexp(lnA, lnB)
    f = math.exp(_logaddexp(12.0 * ln_fl, ln_T) / 12.0)
    return 0.5 * (mu / D) ** 2 / rho * Re * Re * (k_ent + 1.0 + f * lam)


def _points(n, seed=11):
    from fuelsys.fuels import get_fuel

    rng = np.random.default_rng(seed)
    k = get_fuel("kerosene")
    T = rng.uniform(263.15, 333.15, n)
    rho, mu = k.density(T), k.dynamic_viscosity(T)
    D = rng.uniform(0.15e-3, 0.8e-3, n)
    L = rng.uniform(10e-3, 60e-3, n)
    dp = np.exp(rng.uniform(math.log(0.05e5), math.log(15e5), n))
    return dp, D, L, rho, mu


def run(report):
    from scipy.optimize import brentq

    from fuelsys.flow.manifold import ring_manifold
    from fuelsys.flow.needle import needle_flow

    n = 1_000_000
    dp, D, L, rho, mu = _points(n)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        needle_flow(dp[:1000], D[:1000], L[:1000], rho[:1000], mu[:1000])     # warm-up
        best = math.inf
        for _ in range(3):
            t0 = time.perf_counter()
            m = needle_flow(dp, D, L, rho, mu)
            best = min(best, time.perf_counter() - t0)

    sub = 2000
    idx = np.random.default_rng(3).choice(n, sub, replace=False)
    t0 = time.perf_counter()
    ref = []
    for i in idx:
        args = (float(D[i]), float(L[i]), float(rho[i]), float(mu[i]))
        target = float(dp[i])
        hi = math.sqrt(2.0 * target * args[2] / 1.5) * args[2] * math.pi * args[0] ** 2 / 4.0 * 1.0001
        ref.append(brentq(lambda x: _dp_scalar(x, *args) - target, hi * 1e-9, hi, xtol=1e-300, rtol=1e-12))
    per_point = (time.perf_counter() - t0) / sub
    err = float(np.max(np.abs(np.array(ref) / m[idx] - 1)))
    report("needle flow, 1e6 points: vectorised vs scalar brentq", per_point * n, best,
           f"{best / n * 1e9:.0f} ns/point (aim < 1000); baseline {per_point * 1e6:.1f} us/point on {sub} "
           f"points; max rel. difference {err:.1e}")

    # ring manifolds: a batch of 2000 eight-needle rings at once vs one call per ring
    rng = np.random.default_rng(5)
    bores = 0.3e-3 + rng.uniform(-0.01e-3, 0.01e-3, (2000, 8))
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        t0 = time.perf_counter()
        ring_manifold(bores, 25e-3, 3e5, 1.2e5, 1.0e-3, 60e-3, 800.0, 1.6e-3)
        batch = time.perf_counter() - t0
        t0 = time.perf_counter()
        for b in bores[:50]:
            ring_manifold(b, 25e-3, 3e5, 1.2e5, 1.0e-3, 60e-3, 800.0, 1.6e-3)
        loop = (time.perf_counter() - t0) / 50 * 2000
    report("ring manifold, 2000 rings x 8 needles: batch vs per ring", loop, batch,
           f"{batch / 2000 * 1e6:.0f} us per ring in the batch")

    # the spreadsheet path: one array formula over a 100 x 100 range
    from fuelsys.sheet import call

    bores_mm = [[0.15 + 0.005 * i] for i in range(100)]
    dps = [[0.05 + 0.15 * j for j in range(100)]]
    call("FS_NEEDLE_FLOW", bores_mm[:2], 25, dps[0][:2], "kerosene", 15)
    t0 = time.perf_counter()
    out = call("FS_NEEDLE_FLOW", bores_mm, 25, [dps[0]], "kerosene", 15)
    cells = time.perf_counter() - t0
    assert len(out) == 100 and len(out[0]) == 100
    report("FS_NEEDLE_FLOW via fuelsys.sheet.call, 100 x 100 range", None, cells,
           f"{cells / 1e4 * 1e6:.1f} us per cell including cell conversion")
