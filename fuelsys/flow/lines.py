"""Pressure drop of a fuel line: tube friction plus fittings, filter and valve losses.

``dp = rho u^2 / 2 * (f L/D + K_total)`` with ``f`` the fully developed Darcy
friction factor of every regime (Churchill 1977, or Churchill's blend with a
Colebrook turbulent branch) for the tube's roughness, and ``K_total`` the sum
of the loss coefficients of everything else in the line (bends, tees,
connectors, the filter, valves), referred to the velocity head in the line's
bore.  Loss coefficients of fittings are tabulated in Crane TP-410 and
Idelchik; filters and solenoid valves are best measured (a bench flow test
gives ``K = 2 dp / (rho u^2)``).

The ring of the manifold (:mod:`fuelsys.flow.manifold`) uses the same
friction model for its segments.

References
----------
.. [1] S. W. Churchill, Chem. Eng. 84 (1977) 91-92.
.. [2] C. F. Colebrook, J. Inst. Civil Eng. 11 (1939) 133-156.
.. [3] Crane Co., Technical Paper 410 (2009): loss coefficients of fittings
   and valves.
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.flow import friction as fr
from fuelsys.flow.needle import liquid_properties

_PI = math.pi


def _check_k(k_total) -> np.ndarray:
    k = np.asarray(k_total, dtype=float)
    ok = np.isfinite(k) & (k >= 0)
    if not np.all(ok):
        raise FuelsysInputError(f"k_total must be >= 0 (got {k[~ok].flat[0]:g})")
    return k


def _line_dp_and_slope(m, D, L, rho, mu, k, eD, turb):
    """Signed dp of a line for a signed flow ``m``, and d dp / d m (> 0 everywhere).

    Works through zero flow: ``Re f`` and ``Re^2 f`` stay finite as Re -> 0.
    """
    Re = np.maximum(4.0 * np.abs(m) / (_PI * D * mu), 1e-300)
    f, s = fr._fully_developed(Re, eD, turb)
    lam = L / D
    c = 0.5 * (mu / D) ** 2 / rho               # dp = c Re^2 (f L/D + k)
    K = f * lam + k
    dp = np.sign(m) * c * Re * Re * K
    # d dp/d Re = c Re (2 K + f lam s); d Re/d m = 4/(pi D mu)
    ddp = c * Re * (2.0 * K + f * lam * s) * 4.0 / (_PI * D * mu)
    return dp, ddp, Re


def line_dp(mdot, bore, length, rho, mu, k_total=0.0, roughness=fr.DRAWN_TUBING_ROUGHNESS,
            turbulent=fr.DEFAULT_TURBULENT):
    """Pressure drop of a fuel line: friction over its length plus its loss coefficients.

    Parameters
    ----------
    mdot : array_like
        Mass flow, > 0 [kg/s]
    bore : array_like
        Inside diameter of the line [m]
    length : array_like
        Line length [m]
    rho : array_like
        Liquid density [kg/m³]
    mu : array_like
        Liquid dynamic viscosity [Pa·s]
    k_total : array_like
        Sum of the loss coefficients of fittings, filter and valves, referred
        to the velocity head in the line, >= 0 [-]
    roughness : array_like
        Absolute wall roughness [m]
    turbulent : str
        Turbulent friction branch, "churchill_1977" or "colebrook_1939" [-]

    Returns
    -------
    float or ndarray
        Pressure drop [Pa]

    Raises
    ------
    FuelsysInputError
        Non-positive flow, bore, length or properties; negative ``k_total``.

    References
    ----------
    Churchill (1977); Colebrook (1939); Crane TP-410 (2009).

    Examples
    --------
    >>> dp = line_dp(200e-3 / 60, 3e-3, 1.0, 800.0, 1.6e-3, k_total=5.0)   # 200 g/min, 3 mm, 1 m
    >>> round(dp / 1e5, 4)
    0.0405
    """
    m = checked_array(mdot, "flow", "g/min", positive=True, scale=60e3)
    D = checked_array(bore, "bore", "mm", positive=True, scale=1e3)
    L = checked_array(length, "length", "m", positive=True)
    rho = checked_array(rho, "density", "kg/m³", positive=True)
    mu = checked_array(mu, "viscosity", "Pa·s", positive=True)
    k = _check_k(k_total)
    e = checked_array(roughness, "roughness", "um", nonneg=True, scale=1e6)
    turb = fr._turbulent_method(turbulent)
    m, D, L, rho, mu, k, e = np.broadcast_arrays(m, D, L, rho, mu, k, e)
    dp, _, Re = _line_dp_and_slope(m, D, L, rho, mu, k, e / D, turb)
    warn_validity("line friction (Churchill 1977)", "Reynolds number", Re, *fr.CHURCHILL_1977_VALIDITY["Re"], "-")
    warn_validity("line friction (Churchill 1977)", "relative roughness", e / D,
                  *fr.CHURCHILL_1977_VALIDITY["relative roughness"], "-")
    return _out(dp)


def line_dp_fuel(mdot, bore, length, fuel, T, k_total=0.0, **options):
    """:func:`line_dp` with the liquid properties of ``fuel`` at temperature ``T``.

    Parameters
    ----------
    mdot : array_like
        Mass flow [kg/s]
    bore : array_like
        Inside diameter [m]
    length : array_like
        Line length [m]
    fuel : fuelsys.fuels.base.Fuel
        The fuel [-]
    T : array_like
        Fuel temperature [K]
    k_total : array_like
        Sum of loss coefficients [-]
    **options
        roughness, turbulent as for :func:`line_dp` [-]

    Returns
    -------
    float or ndarray
        Pressure drop [Pa]

    References
    ----------
    See :func:`line_dp`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> dp = line_dp_fuel(200e-3 / 60, 3e-3, 1.0, get_fuel("kerosene"), 288.15, k_total=5.0)
    >>> 0.02e5 < dp < 0.05e5
    True
    """
    rho, mu = liquid_properties(fuel, T)
    return line_dp(mdot, bore, length, rho, mu, k_total, **options)
