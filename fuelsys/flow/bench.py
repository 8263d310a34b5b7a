"""Bench calibration of needles: effective bore from a collected volume, and the odd one out.

A bench test runs water or fuel at a known pressure through each needle and
collects a volume ``V`` in a time ``t``; the mass flow is ``rho(T) V / t``.
The *effective bore* is the bore the needle model (:mod:`fuelsys.flow.needle`)
needs to pass that flow at that pressure drop with the needle's length: it
folds burrs, ovality and bore tolerance into one number that then predicts the
needle on fuel, at other pressures and temperatures.

The model's pressure drop falls strictly as the bore grows at a fixed flow, so
the bore is found by a bracketed, derivative-free root search in ``ln D``
(Chandrupatla 1997), vectorised over all needles at once.  The bracket's lower
end comes in closed form from the laminar bound
``dp >= (8 m^2 (K_ent + 1)/(rho pi^2) + 128 mu L m/(rho pi)) / D^4``.

A set of needles is then checked against its median: a needle whose flow
differs from the set's median by more than a threshold (default 5 %) is
flagged.  The median is used because one odd needle cannot shift it.

References
----------
.. [1] T. R. Chandrupatla, Advances in Engineering Software 28 (1997) 145-149.
.. [2] The needle model: Shah (1978), Churchill (1977), Crane TP-410 (2009).
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array
from fuelsys.errors import FuelsysError, FuelsysInputError
from fuelsys.flow import fittings
from fuelsys.flow import friction as fr
from fuelsys.roots import chandrupatla, expand_bracket
from fuelsys.flow.needle import P_MAX, _check_pmax, _flag_validity, _k_total, liquid_properties

_PI = math.pi

#: default threshold for flagging a needle against the set's median [-]
ODD_THRESHOLD = 0.05


def bench_mass_flow(volume, time, rho):
    """Mass flow of a bench test from the volume collected in a time.

    Parameters
    ----------
    volume : array_like
        Volume collected [m³]
    time : array_like
        Collection time [s]
    rho : array_like
        Density of the test liquid at its temperature [kg/m³]

    Returns
    -------
    float or ndarray
        Mass flow [kg/s]

    References
    ----------
    Definition of the mean flow rate.

    Examples
    --------
    >>> round(bench_mass_flow(50e-6, 60.0, 998.2) * 60e3, 3)   # 50 mL of water in a minute, g/min
    49.91
    """
    V = checked_array(volume, "volume", "mL", positive=True, scale=1e6)
    t = checked_array(time, "time", "s", positive=True)
    rho = checked_array(rho, "density", "kg/m³", positive=True)
    return _out(rho * V / t)


def _model_dp(m, D, L, rho, mu, k_ent, cd, e, turb):
    Re = 4.0 * m / (cd * _PI * D * mu)
    K, _, f = _k_total(Re, L / D, k_ent + fittings.EXIT_K, e / D, turb)
    return 0.5 * (mu / D) ** 2 / rho * Re * Re * K, Re, K, f


def effective_bore(mdot, dp, length, rho, mu, entrance=fittings.DEFAULT_ENTRANCE, cd=1.0,
                   roughness=fr.DRAWN_TUBING_ROUGHNESS, turbulent=fr.DEFAULT_TURBULENT, p_max=P_MAX):
    """The bore with which the needle model passes ``mdot`` at ``dp`` (inverse solve on bore).

    Parameters
    ----------
    mdot : array_like
        Measured mass flow [kg/s]
    dp : array_like
        Test pressure drop across the needle [Pa]
    length : array_like
        Needle length [m]
    rho : array_like
        Test-liquid density [kg/m³]
    mu : array_like
        Test-liquid dynamic viscosity [Pa·s]
    entrance : str or array_like
        Needle inlet geometry or loss coefficient [-]
    cd : array_like
        Discharge-coefficient multiplier held fixed in the solve [-]
    roughness : array_like
        Wall roughness [m]
    turbulent : str
        Turbulent friction branch [-]
    p_max : float
        Largest test pressure accepted [Pa]

    Returns
    -------
    float or ndarray
        Effective bore [m]; the model with it reproduces the test to about
        1e-12.

    Raises
    ------
    FuelsysInputError
        Non-positive flow, pressure, length or properties; pressure above
        ``p_max``.

    References
    ----------
    Chandrupatla (1997); the needle model of :mod:`fuelsys.flow.needle`.

    Examples
    --------
    >>> from fuelsys.flow.needle import needle_flow
    >>> m = needle_flow(0.2e5, 0.33e-3, 25e-3, 998.2, 1.0e-3)
    >>> round(effective_bore(m, 0.2e5, 25e-3, 998.2, 1.0e-3) * 1e3, 6)
    0.33
    """
    m = checked_array(mdot, "flow", "g/min", positive=True, scale=60e3)
    dp = checked_array(dp, "dp", "bar", positive=True, scale=1e-5)
    L = checked_array(length, "length", "mm", positive=True, scale=1e3)
    rho = checked_array(rho, "density", "kg/m³", positive=True)
    mu = checked_array(mu, "viscosity", "Pa·s", positive=True)
    cd = checked_array(cd, "cd (discharge-coefficient multiplier)", "", positive=True)
    e = checked_array(roughness, "roughness", "um", nonneg=True, scale=1e6)
    k_ent = np.asarray(fittings.entrance_k(entrance), dtype=float)
    turb = fr._turbulent_method(turbulent)
    p_max = _check_pmax(p_max)
    if np.any(dp > p_max * (1 + 1e-9)):
        raise FuelsysInputError(f"dp {dp[dp > p_max].flat[0] / 1e5:g} bar is above the model's limit of "
                                f"{p_max / 1e5:g} bar")
    arrays = np.broadcast_arrays(m, dp, L, rho, mu, k_ent, cd, e)
    shape = arrays[0].shape
    m, dp, L, rho, mu, k_ent, cd, e = [np.ascontiguousarray(a).ravel() for a in arrays]
    lndp = np.log(dp)
    mm = m / cd

    def H(lnD, idx=None):
        sel = slice(None) if idx is None else idx
        D = np.exp(lnD)
        return lndp[sel] - np.log(_model_dp(m[sel], D, L[sel], rho[sel], mu[sel], k_ent[sel], cd[sel], e[sel],
                                            turb)[0])

    K0 = k_ent + fittings.EXIT_K
    d_lo = ((8.0 * mm * mm * K0 / (rho * _PI ** 2) + 128.0 * mu * L * mm / (rho * _PI)) / dp) ** 0.25
    lo = np.log(d_lo) - 1e-9
    hi = lo + math.log(2.0)
    try:
        lo, hi, f_lo, f_hi = expand_bracket(H, lo, hi, grow=1.0)
        lnD = chandrupatla(H, lo, hi, f_lo, f_hi, xtol=1e-14)
    except FuelsysError as exc:
        if isinstance(exc, FuelsysInputError):
            raise
        raise FuelsysInputError("no needle bore passes this flow at this pressure drop and length within the "
                                "needle model's reach: check the test's volume, time, pressure and length") from None
    D = np.exp(lnD)
    _, Re, K, f = _model_dp(m, D, L, rho, mu, k_ent, cd, e, turb)
    _flag_validity(Re, L / D, K, f, k_ent, e / D)
    return _out(D.reshape(shape))


def effective_bore_from_test(volume, time, dp, length, fluid, T, **options):
    """Effective bore of needles from bench tests with water or fuel at a temperature.

    Parameters
    ----------
    volume : array_like
        Volume collected from each needle [m³]
    time : array_like
        Collection time [s]
    dp : array_like
        Test pressure drop across the needle [Pa]
    length : array_like
        Needle length [m]
    fluid : fuelsys.fuels.base.Fuel
        The test liquid (water or a fuel) [-]
    T : array_like
        Liquid temperature [K]
    **options
        entrance, cd, roughness, turbulent, p_max as for :func:`effective_bore` [-]

    Returns
    -------
    float or ndarray
        Effective bore [m]

    References
    ----------
    See :func:`effective_bore`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> d = effective_bore_from_test(20e-6, 60.0, 0.5e5, 25e-3, get_fuel("kerosene"), 293.15)
    >>> 0.2e-3 < d < 0.4e-3
    True
    """
    rho, mu = liquid_properties(fluid, T)
    return effective_bore(bench_mass_flow(volume, time, rho), dp, length, rho, mu, **options)


def odd_needles(flows, threshold=ODD_THRESHOLD):
    """Deviation of each needle's flow from its set's median, and which exceed the threshold.

    Parameters
    ----------
    flows : array_like
        Flows of the needles of a set, last axis = needles (any flow unit:
        mass, volume or the volume collected in a common time) [any]
    threshold : float
        Allowed relative deviation from the median, > 0 [-]

    Returns
    -------
    deviation : ndarray
        ``flow / median - 1`` per needle [-]
    odd : ndarray of bool
        True where ``|deviation| > threshold`` [-]

    Raises
    ------
    FuelsysInputError
        Fewer than two needles, or a flow that is not a positive number.

    References
    ----------
    The median as a robust centre (e.g. Hampel et al., "Robust Statistics",
    Wiley 1986).

    Examples
    --------
    >>> dev, odd = odd_needles([50.0, 51.0, 49.5, 44.0, 50.5])
    >>> odd.tolist()
    [False, False, False, True, False]
    """
    q = np.asarray(flows, dtype=float)
    if q.ndim == 0 or q.shape[-1] < 2:
        raise FuelsysInputError("give the flows of at least two needles")
    if np.any(~np.isfinite(q)) or np.any(q <= 0):
        raise FuelsysInputError(f"flows must be > 0 (got {q[~(np.isfinite(q) & (q > 0))].flat[0]:g})")
    threshold = float(threshold)
    if not threshold > 0:
        raise FuelsysInputError(f"threshold must be > 0 (got {threshold:g})")
    dev = q / np.median(q, axis=-1, keepdims=True) - 1.0
    return dev, np.abs(dev) > threshold
