"""Flow through an injector needle (a short, small-bore tube), either way: flow from dp, dp from flow.

The model
---------
Between the manifold (static pressure ``p_up``) and the combustion space
(``p_down``) a needle of bore ``D`` and length ``L`` passing the mass flow
``m`` with mean velocity ``u = 4 m / (rho pi D^2)`` loses

    dp = rho u^2 / 2 * (K_ent + K_exit + f_app(Re, L/D, e/D) * L/D)

* ``K_ent`` -- entrance loss coefficient of the inlet geometry
  (:mod:`fuelsys.flow.fittings`: square 0.5, reentrant 0.78, Borda 1.0,
  rounded 0.04, or a given number);
* ``K_exit`` = 1 -- the jet leaves with its kinetic energy (kinetic-energy
  coefficient 1 for the flat inlet profile, Crane TP-410);
* ``f_app`` -- the all-regime apparent Darcy friction factor of
  :func:`fuelsys.flow.friction.apparent_friction`: Shah's (1978) developing
  laminar flow (which adds the wall shear of the entrance region and the
  extra kinetic energy of the laminar profile, 1.25 velocity heads for a long
  tube) blended by Churchill's (1977) form into turbulent flow (Churchill or
  Colebrook) with the roughness of drawn tubing, 1.5 um (Moody 1944).

A long tube at low Re tends to Hagen-Poiseuille, ``dp = 128 mu L Q / (pi D^4)``
plus 2.75 velocity heads.  A discharge-coefficient multiplier ``cd``
calibrates the model to a bench test: the needle passes ``cd`` times the
model's flow at the same dp.

``dp`` grows strictly with the flow (``f Re^2`` grows with Re in every
regime), so :func:`needle_flow` inverts :func:`needle_dp` by a bracketed
Newton iteration in ``ln Re`` that always converges (a point stops when its
Newton step falls below 1e-7 in ``ln Re``; the step is applied, which leaves
a relative error of order 1e-13 on the flow).  The bracket comes in closed form: the laminar
fully-developed bound ``K >= K_ent + 1 + 64 (L/D)/Re`` gives an upper Re, and
``d ln K/d ln Re >= -1`` a lower one.

Limits (errors, not warnings): dp at most :data:`P_MAX` = 20 bar unless
``p_max`` says otherwise -- the model is meant for the few bar of a model
turbine's fuel system (common practice, no source) -- and a jet velocity
below :data:`LIQUID_SOUND_SPEED`.

References
----------
.. [1] R. K. Shah, J. Fluids Eng. 100 (1978) 177-179 (laminar apparent friction).
.. [2] S. W. Churchill, Chem. Eng. 84 (1977) 91-92 (all-regime friction).
.. [3] C. F. Colebrook, J. Inst. Civil Eng. 11 (1939) 133-156.
.. [4] Crane Co., Technical Paper 410 (2009), p. A-29 (entrance and exit K).
.. [5] I. E. Idelchik, "Handbook of Hydraulic Resistance", 3rd ed. (1996),
   diagram 3-1 (entrance coefficients).
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.flow import fittings
from fuelsys.flow import friction as fr
from fuelsys.roots import expand_bracket, newton_bracketed
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array

#: highest pressure difference the needle functions accept by default [Pa] (20 bar)
P_MAX = 20e5
#: jet velocities at or above this are refused [m/s]: the speed of sound in
#: kerosene, about 1300 m/s at room temperature (CRC Handbook, from memory);
#: water's is higher (1482 m/s at 20 degC)
LIQUID_SOUND_SPEED = 1300.0
#: share of the pressure drop above which a term outside its correlation's range is flagged
SHARE_TO_FLAG = 0.10

_CHUNK = 16384
_PI = math.pi
_LN2 = math.log(2.0)



def _check_pmax(p_max) -> float:
    p_max = float(p_max)
    if not p_max > 0:
        raise FuelsysInputError(f"p_max must be > 0 (got {p_max:g} Pa)")
    return p_max


def _prepare(bore, length, rho, mu, entrance, cd, roughness, turbulent):
    D = checked_array(bore, "bore", "mm", positive=True, scale=1e3)
    L = checked_array(length, "length", "mm", positive=True, scale=1e3)
    rho = checked_array(rho, "density", "kg/m³", positive=True)
    mu = checked_array(mu, "viscosity", "Pa·s", positive=True)
    k_ent = np.asarray(fittings.entrance_k(entrance), dtype=float)
    cd = checked_array(cd, "cd (discharge-coefficient multiplier)", "", positive=True)
    e = checked_array(roughness, "roughness", "um", nonneg=True, scale=1e6)
    turb = fr._turbulent_method(turbulent)
    return D, L, rho, mu, k_ent, cd, e, turb


def _k_total(Re, lam, K0, eD, turb, lnRe=None):
    """Total loss coefficient K = K0 + f L/D, its slope d ln K/d ln Re, and f."""
    f, s = fr._apparent(Re, lam, eD, turb, lnRe)
    lf = lam * f
    K = K0 + lf
    return K, lf * s / K, f


def _solve_reynolds(Be, lam, K0, eD, turb):
    """Re with Re^2 K(Re)/2 = Be (1-D arrays), by bracketed Newton in s = ln Re.

    Returns Re and, from the last evaluation, K and f.

    The residual ``F(s) = ln(Re^2 K/2) - ln Be`` has ``F' = 2 + d ln K/d ln Re
    >= 1``.  The laminar bound ``K >= K0 + 64 (L/D)/Re`` gives ``s_hi`` with
    ``F(s_hi) >= 0`` in closed form.  The start ``s0`` is one fixed-point step
    from there with the larger of the laminar (64/Re + 1.25 D/L) and Blasius
    (0.3164 Re^-0.25) friction factors -- a start value only.  Then
    ``F(s0) >= 0`` brackets the root in ``[s0 - F(s0), s0]`` (slope >= 1) and
    ``F(s0) < 0`` in ``[s0, s_hi]``.  Any point whose final residual is not
    small (which would mean the slope bound failed) is solved again inside a
    bracket found by search.
    """
    lnBe = np.log(Be)

    def fun(s, la, k0, ed, lb):
        K, slope, f = _k_total(np.exp(s), la, k0, ed, turb, s)
        return np.log(0.5 * K) + 2.0 * s - lb, 2.0 + slope, K, f

    params = (lam, K0, eD, lnBe)
    b = 32.0 * lam
    s_hi = np.log(2.0 * Be / (b + np.sqrt(b * b + 2.0 * K0 * Be)))
    f_start = np.maximum(64.0 * np.exp(-s_hi) + 1.25 / lam, 0.3164 * np.exp(-0.25 * s_hi))
    s0 = np.minimum(0.5 * (lnBe + _LN2 - np.log(K0 + lam * f_start)), s_hi)
    first = fun(s0, *params)
    F0 = first[0]
    above = F0 >= 0
    lo = np.where(above, s0 - F0 - 1e-6, s0)
    hi = np.where(above, s0, s_hi) + 1e-12
    s, F, (K, f) = newton_bracketed(fun, lo, hi, s0, first, params, tol=1e-7)
    bad = np.flatnonzero(~(np.abs(F) <= 1e-6))
    if bad.size:
        pb = tuple(p[bad] for p in params)
        lo, hi, _, _ = expand_bracket(lambda x, i: fun(x, *(pb if i is None else (p[i] for p in pb)))[0],
                                      lo[bad] - 1.0, hi[bad] + 1.0)
        x0 = 0.5 * (lo + hi)
        s[bad], _, (K[bad], f[bad]) = newton_bracketed(fun, lo, hi, x0, fun(x0, *pb), pb, tol=1e-7)
    return np.exp(s), K, f


def _needle_dp_and_slope(q, D, L, rho, mu, k_ent, cd, eD, turb):
    """Signed dp for a signed needle flow ``q`` and d dp / d q (> 0), for network solves.

    Returns dp, d dp/d q, Re, K and f; finite through zero flow (``Re K`` stays
    finite as Re -> 0).
    """
    Re = np.maximum(4.0 * np.abs(q) / (cd * _PI * D * mu), 1e-300)
    K, slope, f = _k_total(Re, L / D, k_ent + fittings.EXIT_K, eD, turb)
    c = 0.5 * (mu / D) ** 2 / rho
    dp = np.sign(q) * c * Re * Re * K
    ddp = c * Re * K * (2.0 + slope) * 4.0 / (cd * _PI * D * mu)
    return dp, ddp, Re, K, f


def _flag_validity(Re, lam, K, f, k_ent, eD):
    """Flag terms used outside their correlation's range where they matter."""
    K = np.asarray(K)
    warn_validity("needle friction (Churchill 1977 blend)", "Reynolds number", Re,
                  *fr.CHURCHILL_1977_VALIDITY["Re"], "-")
    warn_validity("needle friction (Churchill 1977 blend)", "relative roughness", eD,
                  *fr.CHURCHILL_1977_VALIDITY["relative roughness"], "-")
    ent_share = k_ent / K
    sel = ent_share > SHARE_TO_FLAG
    if np.any(sel):
        warn_validity("entrance loss coefficient (Crane TP-410 / Idelchik, turbulent data)",
                      "Reynolds number", np.broadcast_to(Re, K.shape)[sel], *fittings.ENTRANCE_VALIDITY["Re"], "-")
    lo_re = fr.SHAH_1978_VALIDITY["Re"][0]
    dev_share = lam * (f - 64.0 / Re) / K
    sel = (dev_share > SHARE_TO_FLAG) & (Re < lo_re)
    if np.any(sel):
        warn_validity("Shah (1978) developing laminar flow (no axial diffusion)", "Reynolds number",
                      np.broadcast_to(Re, K.shape)[sel], *fr.SHAH_1978_VALIDITY["Re"], "-")


def _check_velocity(mdot, rho, D):
    u = 4.0 * mdot / (rho * _PI * D * D)
    if np.any(u >= LIQUID_SOUND_SPEED):
        bad = u[u >= LIQUID_SOUND_SPEED].flat[0]
        raise FuelsysInputError(
            f"the flow needs a jet velocity of {bad:.0f} m/s, at or above the speed of sound in the liquid "
            f"(about {LIQUID_SOUND_SPEED:.0f} m/s); reduce the flow or enlarge the bore")
    return u


def needle_dp(mdot, bore, length, rho, mu, entrance=fittings.DEFAULT_ENTRANCE, cd=1.0,
              roughness=fr.DRAWN_TUBING_ROUGHNESS, turbulent=fr.DEFAULT_TURBULENT, p_max=P_MAX):
    """Pressure drop across a needle passing a given mass flow.

    Parameters
    ----------
    mdot : array_like
        Mass flow through the needle, > 0 [kg/s]
    bore : array_like
        Inside diameter [m]
    length : array_like
        Needle length from the manifold wall to the tip [m]
    rho : array_like
        Liquid density [kg/m³]
    mu : array_like
        Liquid dynamic viscosity [Pa·s]
    entrance : str or array_like
        Inlet geometry ("square", "reentrant", "borda", "rounded") or loss
        coefficient [-]
    cd : array_like
        Discharge-coefficient multiplier from a calibration; the needle passes
        ``cd`` times the model flow at the same dp [-]
    roughness : array_like
        Absolute wall roughness [m]
    turbulent : str
        Turbulent friction branch, "churchill_1977" or "colebrook_1939" [-]
    p_max : float
        Largest pressure drop accepted [Pa]

    Returns
    -------
    float or ndarray
        Pressure drop from the manifold to the space the jet enters [Pa]

    Raises
    ------
    FuelsysInputError
        Non-positive flow, bore, length or properties; a jet velocity at or
        above the speed of sound of the liquid; a drop above ``p_max``.

    References
    ----------
    Shah (1978); Churchill (1977); Crane TP-410 (2009); see the module docstring.

    Examples
    --------
    >>> dp = needle_dp(5e-3 / 60, 0.4e-3, 40e-3, 800.0, 1.6e-3)   # 5 g/min, kerosene-like
    >>> round(dp / 1e5, 4)
    0.1136
    """
    m = checked_array(mdot, "flow", "g/min", positive=True, scale=1e3 * 60.0)
    D, L, rho, mu, k_ent, cd, e, turb = _prepare(bore, length, rho, mu, entrance, cd, roughness, turbulent)
    p_max = _check_pmax(p_max)
    m, D, L, rho, mu, k_ent, cd, e = np.broadcast_arrays(m, D, L, rho, mu, k_ent, cd, e)
    _check_velocity(m, rho, D)
    mm = m / cd
    Re = 4.0 * mm / (_PI * D * mu)
    lam = L / D
    eD = e / D
    K, _, f = _k_total(Re, lam, k_ent + fittings.EXIT_K, eD, turb)
    dp = 0.5 * (mu / D) ** 2 / rho * Re * Re * K
    _flag_validity(Re, lam, K, f, k_ent, eD)
    over = dp > p_max * (1.0 + 1e-9)        # rounding slack for a round trip at the limit
    if np.any(over):
        bad = dp[over].flat[0]
        raise FuelsysInputError(
            f"the flow needs a pressure drop of {bad / 1e5:.3g} bar, above the model's limit of "
            f"{p_max / 1e5:g} bar; reduce the flow or enlarge the bore")
    return _out(dp)


def needle_flow(dp, bore, length, rho, mu, entrance=fittings.DEFAULT_ENTRANCE, cd=1.0,
                roughness=fr.DRAWN_TUBING_ROUGHNESS, turbulent=fr.DEFAULT_TURBULENT, p_max=P_MAX):
    """Mass flow through a needle for a given pressure drop (inverse of :func:`needle_dp`).

    Parameters
    ----------
    dp : array_like
        Pressure drop from the manifold to the space the jet enters, > 0 [Pa]
    bore : array_like
        Inside diameter [m]
    length : array_like
        Needle length [m]
    rho : array_like
        Liquid density [kg/m³]
    mu : array_like
        Liquid dynamic viscosity [Pa·s]
    entrance : str or array_like
        Inlet geometry or loss coefficient (see :func:`needle_dp`) [-]
    cd : array_like
        Discharge-coefficient multiplier [-]
    roughness : array_like
        Absolute wall roughness [m]
    turbulent : str
        Turbulent friction branch [-]
    p_max : float
        Largest pressure drop accepted [Pa]

    Returns
    -------
    float or ndarray
        Mass flow [kg/s]; ``needle_dp`` of it returns ``dp`` to about 1e-12.

    Raises
    ------
    FuelsysInputError
        dp <= 0 or above ``p_max``; non-positive bore, length or properties.

    Notes
    -----
    Vectorised over arrays of any shape (broadcast together); the points are
    solved in blocks of 16384 without a per-point loop.

    References
    ----------
    Shah (1978); Churchill (1977); Crane TP-410 (2009); see the module docstring.

    Examples
    --------
    >>> m = needle_flow(1e5, 0.4e-3, 40e-3, 800.0, 1.6e-3)
    >>> round(m * 60e3, 2)            # g/min
    32.48
    """
    dp = np.asarray(dp, dtype=float)
    ok = np.isfinite(dp) & (dp > 0)
    if not np.all(ok):
        raise FuelsysInputError(f"dp must be > 0 (got {dp[~ok].flat[0] / 1e5:g} bar)")
    p_max = _check_pmax(p_max)
    over = dp > p_max * (1.0 + 1e-9)        # rounding slack for a round trip at the limit
    if np.any(over):
        raise FuelsysInputError(
            f"dp {dp[over].flat[0] / 1e5:g} bar is above the model's limit of {p_max / 1e5:g} bar")
    D, L, rho, mu, k_ent, cd, e, turb = _prepare(bore, length, rho, mu, entrance, cd, roughness, turbulent)
    arrays = np.broadcast_arrays(dp, D, L, rho, mu, k_ent, cd, e)
    shape = arrays[0].shape
    dp, D, L, rho, mu, k_ent, cd, e = [a.ravel() for a in arrays]
    n = dp.size
    Re, K, f = np.empty(n), np.empty(n), np.empty(n)
    lam = L / D
    eD = e / D
    K0 = k_ent + fittings.EXIT_K
    Be = rho * dp * (D / mu) ** 2
    for i in range(0, n, _CHUNK):
        j = slice(i, min(i + _CHUNK, n))
        Re[j], K[j], f[j] = _solve_reynolds(Be[j], lam[j], K0[j], eD[j], turb)
    _flag_validity(Re, lam, K, f, k_ent, eD)
    m = cd * Re * _PI * D * mu / 4.0
    _check_velocity(m, rho, D)
    return _out(m.reshape(shape))


def needle_reynolds(mdot, bore, mu):
    """Reynolds number of the flow in a needle bore, ``4 m / (pi D mu)``.

    Parameters
    ----------
    mdot : array_like
        Mass flow [kg/s]
    bore : array_like
        Inside diameter [m]
    mu : array_like
        Dynamic viscosity [Pa·s]

    Returns
    -------
    float or ndarray
        Reynolds number [-]

    References
    ----------
    O. Reynolds (1883); any fluid-mechanics text (e.g. White, "Fluid Mechanics").

    Examples
    --------
    >>> round(needle_reynolds(1e-4, 0.4e-3, 1.6e-3), 1)
    198.9
    """
    m = checked_array(mdot, "flow", "g/min", positive=True, scale=60e3)
    D = checked_array(bore, "bore", "mm", positive=True, scale=1e3)
    mu = checked_array(mu, "viscosity", "Pa·s", positive=True)
    return _out(4.0 * m / (_PI * D * mu))


def needle_velocity(mdot, bore, rho):
    """Mean velocity in a needle bore (the jet velocity), ``4 m / (rho pi D^2)``.

    Parameters
    ----------
    mdot : array_like
        Mass flow [kg/s]
    bore : array_like
        Inside diameter [m]
    rho : array_like
        Density [kg/m³]

    Returns
    -------
    float or ndarray
        Mean velocity [m/s]

    References
    ----------
    Continuity (definition of the mean velocity).

    Examples
    --------
    >>> round(needle_velocity(1e-4, 0.4e-3, 800.0), 3)
    0.995
    """
    m = checked_array(mdot, "flow", "g/min", positive=True, scale=60e3)
    D = checked_array(bore, "bore", "mm", positive=True, scale=1e3)
    rho = checked_array(rho, "density", "kg/m³", positive=True)
    return _out(4.0 * m / (rho * _PI * D * D))


def needle_losses(mdot, bore, length, rho, mu, entrance=fittings.DEFAULT_ENTRANCE, cd=1.0,
                  roughness=fr.DRAWN_TUBING_ROUGHNESS, turbulent=fr.DEFAULT_TURBULENT):
    """The pressure drop of a needle split into its terms.

    Parameters
    ----------
    mdot : array_like
        Mass flow [kg/s]
    bore : array_like
        Inside diameter [m]
    length : array_like
        Needle length [m]
    rho : array_like
        Density [kg/m³]
    mu : array_like
        Dynamic viscosity [Pa·s]
    entrance : str or array_like
        Inlet geometry or loss coefficient [-]
    cd : array_like
        Discharge-coefficient multiplier [-]
    roughness : array_like
        Absolute wall roughness [m]
    turbulent : str
        Turbulent friction branch [-]

    Returns
    -------
    dict
        "entrance", "length" (friction plus laminar profile development),
        "exit" (jet kinetic energy) and "total" [Pa]; "Re" [-] and
        "velocity" [m/s].

    References
    ----------
    Shah (1978); Churchill (1977); Crane TP-410 (2009).

    Examples
    --------
    >>> t = needle_losses(1e-4, 0.4e-3, 40e-3, 800.0, 1.6e-3)
    >>> t["length"] > t["entrance"] + t["exit"]
    True
    """
    m = checked_array(mdot, "flow", "g/min", positive=True, scale=60e3)
    D, L, rho, mu, k_ent, cd, e, turb = _prepare(bore, length, rho, mu, entrance, cd, roughness, turbulent)
    m, D, L, rho, mu, k_ent, cd, e = np.broadcast_arrays(m, D, L, rho, mu, k_ent, cd, e)
    mm = m / cd
    Re = 4.0 * mm / (_PI * D * mu)
    f = fr._apparent(Re, L / D, e / D, turb)[0]
    head = 0.5 * rho * (4.0 * mm / (rho * _PI * D * D)) ** 2
    parts = {"entrance": head * k_ent, "length": head * f * L / D, "exit": head * fittings.EXIT_K}
    parts["total"] = parts["entrance"] + parts["length"] + parts["exit"]
    parts = {k: _out(v) for k, v in parts.items()}
    parts["Re"] = _out(Re)
    parts["velocity"] = _out(4.0 * m / (rho * _PI * D * D))
    return parts


# ---------------------------------------------------------------------------
# convenience wrappers taking a fuel and a temperature

def liquid_properties(fuel, T):
    """Density and dynamic viscosity of a fuel's liquid at a temperature.

    Parameters
    ----------
    fuel : fuelsys.fuels.base.Fuel
        The fuel (with its oil already mixed in, see ``Fuel.with_oil``) [-]
    T : array_like
        Temperature [K]

    Returns
    -------
    rho, mu : float or ndarray
        Density [kg/m³] and dynamic viscosity [Pa·s]

    References
    ----------
    The fuel model, :mod:`fuelsys.fuels`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> rho, mu = liquid_properties(get_fuel("kerosene"), 288.15)
    >>> 780 < rho < 820 and 1e-3 < mu < 2.5e-3
    True
    """
    T = fuel.check_temperature(T)
    return fuel.density(T), fuel.dynamic_viscosity(T)


def needle_flow_fuel(dp, bore, length, fuel, T, **options):
    """:func:`needle_flow` with the liquid properties of ``fuel`` at temperature ``T``.

    Parameters
    ----------
    dp : array_like
        Pressure drop [Pa]
    bore : array_like
        Inside diameter [m]
    length : array_like
        Needle length [m]
    fuel : fuelsys.fuels.base.Fuel
        The fuel [-]
    T : array_like
        Fuel temperature [K]
    **options
        entrance, cd, roughness, turbulent, p_max as for :func:`needle_flow` [-]

    Returns
    -------
    float or ndarray
        Mass flow [kg/s]

    References
    ----------
    See :func:`needle_flow`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> m = needle_flow_fuel(1e5, 0.25e-3, 40e-3, get_fuel("kerosene"), 293.15)
    >>> 5 < m * 60e3 < 15          # g/min
    True
    """
    rho, mu = liquid_properties(fuel, T)
    return needle_flow(dp, bore, length, rho, mu, **options)


def needle_dp_fuel(mdot, bore, length, fuel, T, **options):
    """:func:`needle_dp` with the liquid properties of ``fuel`` at temperature ``T``.

    Parameters
    ----------
    mdot : array_like
        Mass flow [kg/s]
    bore : array_like
        Inside diameter [m]
    length : array_like
        Needle length [m]
    fuel : fuelsys.fuels.base.Fuel
        The fuel [-]
    T : array_like
        Fuel temperature [K]
    **options
        entrance, cd, roughness, turbulent, p_max as for :func:`needle_dp` [-]

    Returns
    -------
    float or ndarray
        Pressure drop [Pa]

    References
    ----------
    See :func:`needle_dp`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> dp = needle_dp_fuel(10e-3 / 60, 0.25e-3, 40e-3, get_fuel("kerosene"), 293.15)
    >>> 0.5e5 < dp < 2e5
    True
    """
    rho, mu = liquid_properties(fuel, T)
    return needle_dp(mdot, bore, length, rho, mu, **options)
