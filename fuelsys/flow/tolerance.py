"""Needle-to-needle flow spread from bore and length tolerances (seeded Monte Carlo).

A set of ``needles`` needles (one engine's ring) is drawn ``samples`` times at
once: each needle's bore and length is its nominal value plus a deviation
within the tolerance, and every needle sees the same pressure drop (an ideal
manifold; :func:`fuelsys.flow.manifold.ring_manifold` adds the ring).  For
each set the coefficient of variation of the flows and the lowest and highest
needle against the set's mean are computed; the study reports their mean,
percentiles and extremes over the sets.

Distributions (``distribution``):

* ``"uniform"`` (default) -- deviations uniform on [-tol, +tol]: the worst
  case a tolerance band allows with no knowledge of the process;
* ``"normal"`` -- normal with the tolerance as three standard deviations
  (sigma = tol/3), truncated at +-tol by redrawing the few values outside.

Draws come from ``numpy.random.default_rng(seed)``: the same seed gives the
same numbers.

What to expect: a flow ``q ~ D^n`` spreads ``n`` times the relative bore
spread, ``n`` = 4 when laminar friction dominates (Hagen-Poiseuille) and 2
when the kinetic terms dominate (entrance and exit, ``q ~ D^2 sqrt(dp)``).
The study reports ``n`` at the nominal point as ``bore_sensitivity``.

References
----------
.. [1] G. Hagen (1839), J. L. M. Poiseuille (1840): ``Q ~ D^4`` in laminar flow.
.. [2] numpy.random.Generator (PCG64), numpy documentation: reproducible
   seeded streams.
"""

from __future__ import annotations

import warnings

import numpy as np

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.flow import fittings
from fuelsys.flow import friction as fr
from fuelsys.flow.needle import P_MAX, liquid_properties, needle_flow

#: distributions of the deviations within a tolerance: name -> what it means
DISTRIBUTIONS = {
    "uniform": "uniform on [-tol, +tol]",
    "normal": "normal, sigma = tol/3, truncated at +-tol",
}


def draw_deviations(rng, tol, size, distribution: str = "uniform"):
    """Random deviations within ``+-tol`` (see the module docstring for the distributions).

    Parameters
    ----------
    rng : numpy.random.Generator
        Random stream [-]
    tol : float
        Half-width of the tolerance band, >= 0 [same unit as the result]
    size : tuple of int
        Shape of the draw [-]
    distribution : str
        "uniform" or "normal" [-]

    Returns
    -------
    ndarray
        Deviations [same unit as ``tol``]

    References
    ----------
    numpy.random.Generator documentation.

    Examples
    --------
    >>> d = draw_deviations(np.random.default_rng(1), 0.01, (1000,))
    >>> bool(np.all(np.abs(d) <= 0.01))
    True
    """
    key = str(distribution).strip().lower()
    if key not in DISTRIBUTIONS:
        raise FuelsysInputError(f"distribution {distribution!r} is unknown; valid: {', '.join(DISTRIBUTIONS)}")
    tol = float(tol)
    if not tol >= 0:
        raise FuelsysInputError(f"tolerance must be >= 0 (got {tol:g})")
    if tol == 0:
        return np.zeros(size)
    if key == "uniform":
        return rng.uniform(-tol, tol, size)
    d = rng.normal(0.0, tol / 3.0, size)
    for _ in range(100):
        out = np.abs(d) > tol
        if not out.any():
            return d
        d[out] = rng.normal(0.0, tol / 3.0, int(out.sum()))
    raise FuelsysInputError("could not draw normal deviations inside the tolerance band")


def tolerance_study(bore, length, dp, rho, mu, needles: int, bore_tol: float, length_tol: float = 0.0,
                    samples: int = 2000, seed: int = 0, distribution: str = "uniform", od_min=None,
                    entrance=fittings.DEFAULT_ENTRANCE, cd=1.0, roughness=fr.DRAWN_TUBING_ROUGHNESS,
                    turbulent=fr.DEFAULT_TURBULENT, p_max=P_MAX) -> dict:
    """Spread of needle flows between the needles of a set, from bore and length tolerances.

    Parameters
    ----------
    bore : float
        Nominal bore [m]
    length : float
        Nominal needle length [m]
    dp : float
        Pressure drop every needle sees [Pa]
    rho : float
        Liquid density [kg/m³]
    mu : float
        Liquid dynamic viscosity [Pa·s]
    needles : int
        Needles in one set (one engine), >= 2 [-]
    bore_tol : float
        Bore tolerance, half-width of the band (bore = nominal +- bore_tol) [m]
    length_tol : float
        Length tolerance, half-width of the band [m]
    samples : int
        Sets drawn, >= 1 [-]
    seed : int
        Seed of the random stream [-]
    distribution : str
        "uniform" or "normal" (see the module docstring) [-]
    od_min : float, optional
        Smallest outside diameter of the tubing; a bore band reaching it is
        refused [m]
    entrance : str or float
        Needle inlet geometry or loss coefficient [-]
    cd : float
        Discharge-coefficient multiplier [-]
    roughness : float
        Wall roughness [m]
    turbulent : str
        Turbulent friction branch [-]
    p_max : float
        Largest pressure drop accepted [Pa]

    Returns
    -------
    dict
        ``nominal_flow``, ``mean_flow`` [kg/s]; ``cv_mean``, ``cv_p95`` (spread
        between needles as a coefficient of variation, mean over the sets and
        95th percentile) [-]; ``low_typical``, ``high_typical`` (lowest and
        highest needle against its set's mean, median over the sets) [-];
        ``low_worst``, ``high_worst`` (the extremes over all sets) [-];
        ``bore_sensitivity`` (d ln q / d ln D at the nominal point) [-];
        ``flows`` (samples x needles) [kg/s].

    Raises
    ------
    FuelsysInputError
        Tolerances that reach a zero bore or length or the tubing OD; fewer
        than two needles; no samples.

    References
    ----------
    Hagen-Poiseuille; the needle model of :mod:`fuelsys.flow.needle`.

    Examples
    --------
    >>> r = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, needles=8, bore_tol=0.005e-3, samples=200)
    >>> 0.02 < r["cv_mean"] < 0.035    # about 3 x the 0.96 % relative bore spread
    True
    """
    needles, samples = int(needles), int(samples)
    if needles < 2:
        raise FuelsysInputError(f"needles must be at least 2 (got {needles})")
    if samples < 1:
        raise FuelsysInputError(f"samples must be at least 1 (got {samples})")
    bore, length = float(bore), float(length)
    bore_tol, length_tol = float(bore_tol), float(length_tol)
    if not bore > 0:
        raise FuelsysInputError(f"bore must be > 0 (got {bore * 1e3:g} mm)")
    if not length > 0:
        raise FuelsysInputError(f"length must be > 0 (got {length * 1e3:g} mm)")
    if not (bore_tol >= 0 and length_tol >= 0):
        raise FuelsysInputError(f"tolerances must be >= 0 (got bore {bore_tol * 1e3:g} mm, "
                                f"length {length_tol * 1e3:g} mm)")
    if bore_tol >= bore:
        raise FuelsysInputError(f"bore tolerance {bore_tol * 1e3:g} mm must be smaller than the bore "
                                f"{bore * 1e3:g} mm")
    if length_tol >= length:
        raise FuelsysInputError(f"length tolerance {length_tol * 1e3:g} mm must be smaller than the length "
                                f"{length * 1e3:g} mm")
    if od_min is not None and bore + bore_tol >= float(od_min):
        raise FuelsysInputError(f"bore {bore * 1e3:.3f} mm + tolerance {bore_tol * 1e3:g} mm reaches the "
                                f"tubing's outside diameter {float(od_min) * 1e3:.3f} mm")
    rng = np.random.default_rng(seed)
    shape = (samples, needles)
    D = bore + draw_deviations(rng, bore_tol, shape, distribution)
    L = length + draw_deviations(rng, length_tol, shape, distribution)
    opts = dict(entrance=entrance, cd=cd, roughness=roughness, turbulent=turbulent, p_max=p_max)
    q = needle_flow(dp, D, L, rho, mu, **opts)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        h = 1e-4
        q_nom, q_p, q_m = needle_flow(dp, bore * np.exp([0.0, h, -h]), length, rho, mu, **opts)
    mean = q.mean(axis=1)
    cv = q.std(axis=1) / mean
    low = q.min(axis=1) / mean - 1.0
    high = q.max(axis=1) / mean - 1.0
    return {
        "nominal_flow": float(q_nom),
        "mean_flow": float(mean.mean()),
        "cv_mean": float(cv.mean()),
        "cv_p95": float(np.percentile(cv, 95)),
        "low_typical": float(np.median(low)),
        "high_typical": float(np.median(high)),
        "low_worst": float(low.min()),
        "high_worst": float(high.max()),
        "bore_sensitivity": float(np.log(q_p / q_m) / (2 * h)),
        "flows": q,
    }


def tolerance_study_fuel(bore, length, dp, fuel, T, needles: int, bore_tol: float, **options) -> dict:
    """:func:`tolerance_study` with the liquid properties of ``fuel`` at temperature ``T``.

    Parameters
    ----------
    bore : float
        Nominal bore [m]
    length : float
        Nominal length [m]
    dp : float
        Pressure drop [Pa]
    fuel : fuelsys.fuels.base.Fuel
        The fuel [-]
    T : float
        Fuel temperature [K]
    needles : int
        Needles per set [-]
    bore_tol : float
        Bore tolerance (half-width) [m]
    **options
        As for :func:`tolerance_study` [-]

    Returns
    -------
    dict
        See :func:`tolerance_study` [kg/s, -]

    References
    ----------
    See :func:`tolerance_study`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> r = tolerance_study_fuel(0.3e-3, 25e-3, 2e5, get_fuel("kerosene"), 288.15, 6, 0.0)
    >>> r["cv_mean"] < 1e-12          # no tolerance, no spread
    True
    """
    rho, mu = liquid_properties(fuel, T)
    return tolerance_study(bore, length, dp, float(rho), float(mu), needles, bore_tol, **options)
