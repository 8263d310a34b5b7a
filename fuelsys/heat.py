"""Heat and mass transfer correlations used by the vaporiser tube.

Floor: flow and heat (uses the ground floor).

One function per published correlation, each with its validity range kept as
data in :data:`VALIDITY` and checked at run time
(:func:`fuelsys.errors.warn_validity`), plus dispatchers where several
methods compete:

* internal forced convection in a round tube: fully developed laminar
  Nusselt numbers, laminar entry correlations (Hausen 1943, Stephan 1959),
  Gnielinski (1976) for turbulent flow with its entry factor and the
  Gnielinski (1995) interpolation across the transition 2300 < Re < 10^4;
* smooth-tube friction (Filonenko 1954 / Petukhov 1970, Hagen-Poiseuille);
* air transport properties by Sutherland's law;
* flame radiation to a combustor wall (Lefebvre);
* single-droplet evaporation: Spalding transfer number and the d²-law,
  Rayleigh jet break-up and the Weber-number limit for an initial size.

Every function broadcasts over numpy arrays; scalars in give Python floats
out.  SI units throughout.
"""

from __future__ import annotations

import numpy as np

from fuelsys.constants import SIGMA_SB
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array


#: Reynolds number where laminar flow ends in the Gnielinski (1995) interpolation [-]
RE_LAMINAR = 2300.0
#: Reynolds number where fully turbulent flow starts in the Gnielinski (1995) interpolation [-]
RE_TURBULENT = 1.0e4

#: fully developed laminar Nusselt number, uniform wall temperature (Incropera & DeWitt 6th ed. eq. 8.55)
NU_LAMINAR_T = 3.657
#: fully developed laminar Nusselt number, uniform heat flux, 48/11 (Incropera & DeWitt 6th ed. eq. 8.53)
NU_LAMINAR_Q = 48.0 / 11.0

#: validity ranges kept beside the correlations: name -> {quantity: (low, high, unit)}
VALIDITY = {
    "gnielinski_1976": {"Re": (2300.0, 5.0e6, "-"), "Pr": (0.5, 2000.0, "-")},
    "filonenko_1954": {"Re": (3000.0, 5.0e6, "-")},
    "hausen_1943": {"Re": (0.0, 2300.0, "-"), "Pr": (0.1, 1.0e4, "-")},
    "stephan_1959": {"Re": (0.0, 2300.0, "-"), "Pr": (0.1, 1.0e3, "-")},
    "gas_property_ratio": {"T_bulk/T_wall": (0.5, 1.0, "-")},
    # White quotes +-2 % over 170-1900 K (viscosity) against older data; against CoolProp's
    # Lemmon-Jacobsen air both laws stay within 4 % only up to 1000 K, the range kept here
    "sutherland_viscosity_air": {"T": (170.0, 1000.0, "K")},
    "sutherland_conductivity_air": {"T": (160.0, 1000.0, "K")},
    "lefebvre_flame_radiation": {"emissivity": (0.0, 1.0, "-")},
}

#: Sutherland constants for air (White, "Viscous Fluid Flow", 3rd ed. 2006, Tables 1-2 and 1-3)
SUTHERLAND_AIR = {
    "viscosity": {"T0": 273.0, "ref": 1.716e-5, "S": 111.0},      # Pa s
    "conductivity": {"T0": 273.0, "ref": 0.0241, "S": 194.0},     # W/(m K)
}

#: Rayleigh (1878) jet break-up: drop diameter over jet diameter [-]
RAYLEIGH_DROP_RATIO = 1.89
#: critical Weber number for the break-up of a drop in a gas stream (Hinze 1955) [-]
WEBER_CRITICAL = 12.0



def _check(name, **values):
    """Warn for every quantity of ``name``'s validity range that is exceeded."""
    for key, value in values.items():
        low, high, unit = VALIDITY[name][key]
        warn_validity(name.replace("_", " "), key, value, low, high, unit)


# ---------------------------------------------------------------------------
# friction

def filonenko_1954(Re):
    """Darcy friction factor of a smooth tube in turbulent flow (Filonenko).

    ``f = (1.82 log10 Re - 1.64)^-2``, which is Petukhov's form
    ``(0.790 ln Re - 1.64)^-2``; the friction factor Gnielinski's
    correlation was fitted with.

    Parameters
    ----------
    Re : array_like
        Reynolds number on the tube bore [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    Notes
    -----
    Valid for 3000 <= Re <= 5e6 (Incropera & DeWitt); outside, a
    ValidityWarning is issued.

    References
    ----------
    .. [1] G. K. Filonenko, "Hydraulic resistance in pipes", Teploenergetika
       1 (1954) 40-44.
    .. [2] B. S. Petukhov, "Heat transfer and friction in turbulent pipe flow
       with variable physical properties", Adv. Heat Transfer 6 (1970) 503-564.
    .. [3] F. P. Incropera, D. P. DeWitt, T. L. Bergman, A. S. Lavine,
       "Fundamentals of Heat and Mass Transfer", 6th ed., Wiley 2007, eq. 8.21.

    Examples
    --------
    >>> round(filonenko_1954(1e5), 5)
    0.01799
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    _check("filonenko_1954", Re=Re)
    return _out((0.790 * np.log(Re) - 1.64) ** -2)


def darcy_friction_smooth(Re):
    """Darcy friction factor of a smooth round tube over every regime.

    Laminar ``64/Re`` below Re = 2300, Filonenko above 10^4, and between them
    the linear interpolation in Re of Gnielinski (1995) -- the same blend as
    :func:`nusselt_tube_mean` uses for heat transfer, so friction and heat
    transfer switch regime together.

    Parameters
    ----------
    Re : array_like
        Reynolds number on the tube bore [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    References
    ----------
    .. [1] Hagen-Poiseuille laminar friction, Incropera & DeWitt 6th ed.
       eq. 8.19.
    .. [2] Filonenko (1954), see :func:`filonenko_1954`.
    .. [3] V. Gnielinski, "Ein neues Berechnungsverfahren für die
       Wärmeübertragung im Übergangsbereich zwischen laminarer und turbulenter
       Rohrströmung", Forsch. Ingenieurwes. 61 (1995) 240-248.

    Examples
    --------
    >>> round(darcy_friction_smooth(1000.0), 4)
    0.064
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    lam = 64.0 / np.maximum(Re, 1e-300)
    turb = (0.790 * np.log(np.maximum(Re, RE_TURBULENT)) - 1.64) ** -2
    g = _transition_weight(Re)
    f_low = 64.0 / RE_LAMINAR
    f_high = (0.790 * np.log(RE_TURBULENT) - 1.64) ** -2
    mid = (1.0 - g) * f_low + g * f_high
    out = np.where(Re <= RE_LAMINAR, lam, np.where(Re >= RE_TURBULENT, turb, mid))
    return _out(out)


def _transition_weight(Re):
    """Gnielinski (1995) weight: 0 at Re <= 2300, 1 at Re >= 10^4, linear between."""
    return np.clip((Re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR), 0.0, 1.0)


# ---------------------------------------------------------------------------
# internal convection

def gnielinski_1976(Re, Pr, fd=None):
    """Nusselt number of fully developed turbulent flow in a tube (Gnielinski).

    ``Nu = (f/8)(Re - 1000) Pr / (1 + 12.7 (f/8)^0.5 (Pr^(2/3) - 1))``

    Parameters
    ----------
    Re : array_like
        Reynolds number on the tube bore [-]
    Pr : array_like
        Prandtl number [-]
    fd : array_like, optional
        Darcy friction factor; default :func:`filonenko_1954` (smooth tube) [-]

    Returns
    -------
    float or ndarray
        Nusselt number on the bore [-]

    Notes
    -----
    Valid for 2300 <= Re <= 5e6 and 0.5 <= Pr <= 2000 (ValidityWarning
    outside).  Properties at the bulk temperature.

    References
    ----------
    .. [1] V. Gnielinski, "New equations for heat and mass transfer in
       turbulent pipe and channel flow", Int. Chem. Eng. 16 (1976) 359-368.
    .. [2] Incropera & DeWitt, "Fundamentals of Heat and Mass Transfer",
       6th ed., eq. 8.62.

    Examples
    --------
    >>> round(gnielinski_1976(1e5, 0.7, 0.0185), 2)
    184.04
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    Pr = checked_array(Pr, "Prandtl number", "-", positive=True)
    _check("gnielinski_1976", Re=Re, Pr=Pr)
    if fd is None:
        fd = (0.790 * np.log(Re) - 1.64) ** -2
    f8 = np.asarray(fd, dtype=float) / 8.0
    nu = f8 * (Re - 1000.0) * Pr / (1.0 + 12.7 * np.sqrt(f8) * (Pr ** (2.0 / 3.0) - 1.0))
    return _out(nu)


def gnielinski_entry_factor(d, L):
    """Entry-length factor ``1 + (d/L)^(2/3)`` on Gnielinski's mean Nusselt number.

    Parameters
    ----------
    d : array_like
        Tube bore [m]
    L : array_like
        Heated length from the tube inlet [m]

    Returns
    -------
    float or ndarray
        Factor on the fully developed Nusselt number, mean over ``L`` [-]

    References
    ----------
    .. [1] V. Gnielinski, "Wärmeübertragung in Rohren", VDI Heat Atlas
       (VDI-Wärmeatlas), 2nd English ed., Springer 2010, section G1 (the
       (d/L)^(2/3) entry term of the mean turbulent Nusselt number).

    Examples
    --------
    >>> round(gnielinski_entry_factor(0.01, 0.1), 4)
    1.2154
    """
    d = checked_array(d, "bore", "m", positive=True)
    L = checked_array(L, "length", "m", positive=True)
    return _out(1.0 + (d / L) ** (2.0 / 3.0))


def hausen_1943(Re, Pr, L, d):
    """Mean laminar Nusselt number in the thermal entry of a tube at uniform wall temperature.

    ``Nu = 3.66 + 0.0668 Gz / (1 + 0.04 Gz^(2/3))`` with ``Gz = (d/L) Re Pr``.

    Parameters
    ----------
    Re : array_like
        Reynolds number on the bore [-]
    Pr : array_like
        Prandtl number [-]
    L : array_like
        Heated length from the inlet [m]
    d : array_like
        Tube bore [m]

    Returns
    -------
    float or ndarray
        Nusselt number averaged over the length ``L`` [-]

    Notes
    -----
    Velocity profile assumed developed at the start of heating (strictly
    for Pr >> 1 with a developing profile); laminar flow, Re <= 2300.

    References
    ----------
    .. [1] H. Hausen, "Darstellung des Wärmeüberganges in Rohren durch
       verallgemeinerte Potenzbeziehungen", Z. VDI Beiheft Verfahrenstechnik
       4 (1943) 91-98.
    .. [2] Incropera & DeWitt, "Fundamentals of Heat and Mass Transfer",
       6th ed., eq. 8.57.

    Examples
    --------
    >>> round(hausen_1943(1000.0, 0.7, 1.0, 0.01), 3)
    4.068
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    Pr = checked_array(Pr, "Prandtl number", "-", positive=True)
    L = checked_array(L, "length", "m", positive=True)
    d = checked_array(d, "bore", "m", positive=True)
    _check("hausen_1943", Re=Re, Pr=Pr)
    gz = d / L * Re * Pr
    return _out(3.66 + 0.0668 * gz / (1.0 + 0.04 * gz ** (2.0 / 3.0)))


def stephan_1959(Re, Pr, L, d):
    """Mean laminar Nusselt number with velocity and temperature developing together.

    ``Nu = [3.657 / tanh(2.264 Gz^(-1/3) + 1.7 Gz^(-2/3)) + 0.0499 Gz tanh(1/Gz)]
    / tanh(2.432 Pr^(1/6) Gz^(-1/6))`` with ``Gz = (d/L) Re Pr``, uniform wall
    temperature.

    Parameters
    ----------
    Re : array_like
        Reynolds number on the bore [-]
    Pr : array_like
        Prandtl number [-]
    L : array_like
        Heated length from the inlet [m]
    d : array_like
        Tube bore [m]

    Returns
    -------
    float or ndarray
        Nusselt number averaged over the length ``L`` [-]

    Notes
    -----
    Suits a gas entering a heated tube with a flat profile (the vaporiser
    case).  Laminar flow, Re <= 2300.

    References
    ----------
    .. [1] K. Stephan, "Wärmeübergang und Druckabfall bei nicht ausgebildeter
       Laminarströmung in Rohren und ebenen Spalten", Chem. Ing. Tech. 31
       (1959) 773-778.
    .. [2] H. D. Baehr, K. Stephan, "Heat and Mass Transfer", 3rd ed.,
       Springer 2011, section 3.7 (laminar entry flow).

    Examples
    --------
    >>> round(stephan_1959(1000.0, 0.7, 1.0, 0.01), 3)
    4.289
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    Pr = checked_array(Pr, "Prandtl number", "-", positive=True)
    L = checked_array(L, "length", "m", positive=True)
    d = checked_array(d, "bore", "m", positive=True)
    _check("stephan_1959", Re=Re, Pr=Pr)
    gz = d / L * Re * Pr
    num = 3.657 / np.tanh(2.264 * gz ** (-1.0 / 3.0) + 1.7 * gz ** (-2.0 / 3.0)) + 0.0499 * gz * np.tanh(1.0 / gz)
    return _out(num / np.tanh(2.432 * Pr ** (1.0 / 6.0) * gz ** (-1.0 / 6.0)))


#: laminar entry correlations for :func:`nusselt_tube_mean` (one table, no elif chain)
LAMINAR_METHODS = {"stephan": stephan_1959, "hausen": hausen_1943}
#: default laminar method: the gas enters with a flat velocity profile
LAMINAR_DEFAULT = "stephan"


def gas_property_ratio_factor(t_bulk, t_wall, exponent=0.45):
    """Correction ``(T_bulk/T_wall)^n`` of a turbulent Nusselt number for a heated gas.

    Parameters
    ----------
    t_bulk : array_like
        Bulk gas temperature [K]
    t_wall : array_like
        Wall temperature [K]
    exponent : float
        Exponent n; 0.45 for gases being heated [-]

    Returns
    -------
    float or ndarray
        Factor on the Nusselt number with bulk properties [-]; 1 where the gas
        is cooled (no correction, as the source gives for gases).

    Notes
    -----
    Fitted for 0.5 < T_bulk/T_wall < 1 (ValidityWarning when the heated
    range is left).

    References
    ----------
    .. [1] V. Gnielinski, VDI Heat Atlas, 2nd ed., Springer 2010, section G1
       (temperature-dependent properties: gases, (T_b/T_w)^0.45 on heating).

    Examples
    --------
    >>> round(gas_property_ratio_factor(500.0, 800.0), 4)
    0.8094
    """
    tb = checked_array(t_bulk, "bulk temperature", "K", positive=True)
    tw = checked_array(t_wall, "wall temperature", "K", positive=True)
    ratio = tb / tw
    heated = ratio < 1.0
    if np.any(heated):
        _check("gas_property_ratio", **{"T_bulk/T_wall": np.broadcast_to(ratio, np.broadcast(tb, tw).shape)[
            np.broadcast_to(heated, np.broadcast(tb, tw).shape)]})
    return _out(np.where(heated, ratio ** exponent, 1.0))


def nusselt_tube_mean(Re, Pr, L, d, laminar=LAMINAR_DEFAULT, property_factor=1.0, check=True):
    """Mean Nusselt number over a heated length from the inlet, any regime.

    * Re <= 2300: the laminar entry correlation ``laminar``
      (:data:`LAMINAR_METHODS`, default Stephan 1959);
    * Re >= 10^4: Gnielinski (1976) times the entry factor
      ``1 + (d/L)^(2/3)`` and ``property_factor``;
    * between: Gnielinski's (1995) interpolation
      ``Nu = (1 - g) Nu_lam(2300) + g Nu_turb(10^4)``,
      ``g = (Re - 2300) / (10^4 - 2300)``.

    Parameters
    ----------
    Re : array_like
        Reynolds number on the bore [-]
    Pr : array_like
        Prandtl number [-]
    L : array_like
        Heated length from the tube inlet [m]
    d : array_like
        Tube bore [m]
    laminar : str
        Laminar method, a key of :data:`LAMINAR_METHODS` [-]
    property_factor : array_like
        Factor on the turbulent part for property variation, e.g.
        :func:`gas_property_ratio_factor` [-]
    check : bool
        Issue ValidityWarnings for Pr outside the correlations' ranges [-]

    Returns
    -------
    float or ndarray
        Mean Nusselt number over ``L`` [-]

    References
    ----------
    .. [1] Gnielinski (1976), see :func:`gnielinski_1976`.
    .. [2] Gnielinski (1995), see :func:`darcy_friction_smooth`.
    .. [3] Stephan (1959) / Hausen (1943), see :func:`stephan_1959`,
       :func:`hausen_1943`.

    Examples
    --------
    >>> round(nusselt_tube_mean(1e5, 0.7, 1.0, 0.01), 1)
    186.9
    """
    if laminar not in LAMINAR_METHODS:
        raise FuelsysInputError(f"laminar method must be one of {', '.join(LAMINAR_METHODS)} (got {laminar!r})")
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    Pr = checked_array(Pr, "Prandtl number", "-", positive=True)
    L = checked_array(L, "length", "m", positive=True)
    d = checked_array(d, "bore", "m", positive=True)
    if check:
        _check("gnielinski_1976", Pr=Pr)
    return _out(_nusselt_mean_raw(Re, Pr, L, d, laminar, np.asarray(property_factor, dtype=float)))


def _laminar_raw(method, Re, Pr, L, d):
    gz = d / L * Re * Pr
    if method == "hausen":
        return 3.66 + 0.0668 * gz / (1.0 + 0.04 * gz ** (2.0 / 3.0))
    num = 3.657 / np.tanh(2.264 * gz ** (-1.0 / 3.0) + 1.7 * gz ** (-2.0 / 3.0)) + 0.0499 * gz * np.tanh(1.0 / gz)
    return num / np.tanh(2.432 * Pr ** (1.0 / 6.0) * gz ** (-1.0 / 6.0))


def _gnielinski_raw(Re, Pr):
    f8 = (0.790 * np.log(Re) - 1.64) ** -2 / 8.0
    return f8 * (Re - 1000.0) * Pr / (1.0 + 12.7 * np.sqrt(f8) * (Pr ** (2.0 / 3.0) - 1.0))


def _nusselt_mean_raw(Re, Pr, L, d, laminar, property_factor):
    """Unchecked core of :func:`nusselt_tube_mean` (arrays in, arrays out, L > 0).

    The laminar correlation is evaluated at min(Re, 2300) and Gnielinski's
    at max(Re, 10^4), so one weighted sum covers the three regimes.
    """
    g = _transition_weight(Re)
    nu_lam = _laminar_raw(laminar, np.minimum(Re, RE_LAMINAR), Pr, L, d)
    nu_turb = _gnielinski_raw(np.maximum(Re, RE_TURBULENT), Pr) * (1.0 + (d / L) ** (2.0 / 3.0)) * property_factor
    return (1.0 - g) * nu_lam + g * nu_turb


def nusselt_tube_segment(Re, Pr, x1, x2, d, laminar=LAMINAR_DEFAULT, property_factor=1.0):
    """Mean Nusselt number over a segment ``x1..x2`` of a heated tube.

    From the mean-over-length correlation of :func:`nusselt_tube_mean`:
    ``Nu_12 = (x2 Nu(x2) - x1 Nu(x1)) / (x2 - x1)``, exact for the
    correlation (``x Nu(x) -> 0`` as ``x -> 0``), so a march that uses it step
    by step adds up to the mean correlation over the whole length.

    Parameters
    ----------
    Re : array_like
        Reynolds number on the bore [-]
    Pr : array_like
        Prandtl number [-]
    x1 : array_like
        Segment start, distance from the heated inlet, >= 0 [m]
    x2 : array_like
        Segment end, > x1 [m]
    d : array_like
        Tube bore [m]
    laminar : str
        Laminar method, a key of :data:`LAMINAR_METHODS` [-]
    property_factor : array_like
        Factor on the turbulent part [-]

    Returns
    -------
    float or ndarray
        Nusselt number averaged over the segment [-]

    References
    ----------
    See :func:`nusselt_tube_mean`; the segment mean follows from the
    definition of the length-mean heat-transfer coefficient (Incropera &
    DeWitt 6th ed. eq. 8.40).

    Examples
    --------
    >>> round(nusselt_tube_segment(1e5, 0.7, 0.0, 1.0, 0.01), 1)
    186.9
    """
    if laminar not in LAMINAR_METHODS:
        raise FuelsysInputError(f"laminar method must be one of {', '.join(LAMINAR_METHODS)} (got {laminar!r})")
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    Pr = checked_array(Pr, "Prandtl number", "-", positive=True)
    d = checked_array(d, "bore", "m", positive=True)
    x1 = np.asarray(x1, dtype=float)
    x2 = np.asarray(x2, dtype=float)
    if np.any(x1 < 0) or np.any(x2 <= x1):
        raise FuelsysInputError("segment must have 0 <= x1 < x2 [m]")
    return _out(_segment_raw(Re, Pr, x1, x2, d, laminar, np.asarray(property_factor, dtype=float)))


def _segment_raw(Re, Pr, x1, x2, d, laminar, property_factor):
    """Unchecked core of :func:`nusselt_tube_segment`.

    Segment mean of the blend = blend of the segment means (the blend is
    linear in the Nusselt numbers); the turbulent entry factor integrates to
    ``1 + d^(2/3) (x2^(1/3) - x1^(1/3)) / (x2 - x1)``.
    """
    g = _transition_weight(Re)
    re_lam = np.minimum(Re, RE_LAMINAR)
    up = x2 * _laminar_raw(laminar, re_lam, Pr, x2, d)
    safe = np.maximum(x1, 1e-300)
    low = np.where(x1 > 0, x1 * _laminar_raw(laminar, re_lam, Pr, safe, d), 0.0)
    seg_lam = (up - low) / (x2 - x1)
    entry = 1.0 + d ** (2.0 / 3.0) * (np.cbrt(x2) - np.cbrt(x1)) / (x2 - x1)
    seg_turb = _gnielinski_raw(np.maximum(Re, RE_TURBULENT), Pr) * entry * property_factor
    return (1.0 - g) * seg_lam + g * seg_turb


# ---------------------------------------------------------------------------
# air transport properties

def _sutherland(T, c):
    return c["ref"] * (T / c["T0"]) ** 1.5 * (c["T0"] + c["S"]) / (T + c["S"])


def sutherland_viscosity_air(T):
    """Dynamic viscosity of air by Sutherland's law.

    ``mu = mu0 (T/T0)^1.5 (T0 + S)/(T + S)``, mu0 = 1.716e-5 Pa s,
    T0 = 273 K, S = 111 K.

    Parameters
    ----------
    T : array_like
        Temperature [K]

    Returns
    -------
    float or ndarray
        Dynamic viscosity [Pa s]

    Notes
    -----
    White quotes ±2 % over 170-1900 K; against the Lemmon-Jacobsen (2004)
    correlation in CoolProp it falls 2 % low by 600 K and 4 % low by 1000 K,
    the upper end of the range kept in :data:`VALIDITY`.  Pressure has little
    effect at the pressures of small gas turbines.

    References
    ----------
    .. [1] W. Sutherland, "The viscosity of gases and molecular force",
       Phil. Mag. 36 (1893) 507-531.
    .. [2] F. M. White, "Viscous Fluid Flow", 3rd ed., McGraw-Hill 2006,
       Table 1-2.

    Examples
    --------
    >>> round(sutherland_viscosity_air(300.0) * 1e6, 2)
    18.47
    """
    T = checked_array(T, "temperature", "K", positive=True)
    _check("sutherland_viscosity_air", T=T)
    return _out(_sutherland(T, SUTHERLAND_AIR["viscosity"]))


def sutherland_conductivity_air(T):
    """Thermal conductivity of air by Sutherland's law.

    ``k = k0 (T/T0)^1.5 (T0 + S)/(T + S)``, k0 = 0.0241 W/(m K), T0 = 273 K,
    S = 194 K.

    Parameters
    ----------
    T : array_like
        Temperature [K]

    Returns
    -------
    float or ndarray
        Thermal conductivity [W/(m K)]

    References
    ----------
    .. [1] F. M. White, "Viscous Fluid Flow", 3rd ed., McGraw-Hill 2006,
       Table 1-3.

    Examples
    --------
    >>> round(sutherland_conductivity_air(300.0), 4)
    0.0262
    """
    T = checked_array(T, "temperature", "K", positive=True)
    _check("sutherland_conductivity_air", T=T)
    return _out(_sutherland(T, SUTHERLAND_AIR["conductivity"]))


# ---------------------------------------------------------------------------
# radiation

def lefebvre_flame_radiation(t_gas, t_wall, emissivity_gas, emissivity_wall=0.7):
    """Radiant heat flux from flame gas to a combustor wall (Lefebvre).

    ``q = 0.5 sigma (1 + e_w) e_g T_g^1.5 (T_g^2.5 - T_w^2.5)``

    Parameters
    ----------
    t_gas : array_like
        Flame (gas) temperature [K]
    t_wall : array_like
        Wall surface temperature [K]
    emissivity_gas : array_like
        Gas emissivity, 0..1 [-]
    emissivity_wall : array_like
        Wall emissivity, 0..1; 0.7 for oxidised stainless steel [-]

    Returns
    -------
    float or ndarray
        Heat flux into the wall [W/m²] (negative when the wall is hotter)

    Notes
    -----
    The gas emissivity is an input (the source gives it from pressure,
    fuel/air ratio, beam length and luminosity).  The (1 + e_w)/2 factor is
    the source's approximation of the wall's effective absorptivity.

    References
    ----------
    .. [1] A. H. Lefebvre, D. R. Ballal, "Gas Turbine Combustion", 3rd ed.,
       CRC Press 2010, chapter 9 (liner wall temperature, internal radiation).

    Examples
    --------
    >>> round(lefebvre_flame_radiation(1800.0, 900.0, 0.3) / 1e3, 1)
    125.0
    """
    tg = checked_array(t_gas, "gas temperature", "K", positive=True)
    tw = checked_array(t_wall, "wall temperature", "K", positive=True)
    eg = np.asarray(emissivity_gas, dtype=float)
    ew = np.asarray(emissivity_wall, dtype=float)
    for name, e in (("gas emissivity", eg), ("wall emissivity", ew)):
        if np.any(~np.isfinite(e)) or np.any(e < 0) or np.any(e > 1):
            raise FuelsysInputError(f"{name} must be within 0..1 (got {np.ravel(e)[0]:g})")
    return _out(_radiation_raw(tg, tw, eg, ew))


def _radiation_raw(tg, tw, eg, ew):
    return 0.5 * SIGMA_SB * (1.0 + ew) * eg * tg ** 1.5 * (tg ** 2.5 - tw ** 2.5)


def _radiation_slope_raw(tg, tw, eg, ew):
    """d q / d T_wall of :func:`lefebvre_flame_radiation` [W/(m² K)] (negative)."""
    return -0.5 * SIGMA_SB * (1.0 + ew) * eg * tg ** 1.5 * 2.5 * tw ** 1.5


# ---------------------------------------------------------------------------
# droplets

def spalding_transfer_number(cp_gas, t_gas, t_surface, latent_heat):
    """Spalding heat-transfer number ``B_T = cp (T_inf - T_s) / L``.

    Parameters
    ----------
    cp_gas : array_like
        Specific heat of the gas film [J/(kg K)]
    t_gas : array_like
        Gas temperature far from the drop [K]
    t_surface : array_like
        Drop surface temperature [K]
    latent_heat : array_like
        Latent heat of the liquid at the surface temperature [J/kg]

    Returns
    -------
    float or ndarray
        Transfer number [-]

    References
    ----------
    .. [1] D. B. Spalding, "The combustion of liquid fuels", 4th Symposium
       (International) on Combustion (1953) 847-864.
    .. [2] S. R. Turns, "An Introduction to Combustion", 3rd ed.,
       McGraw-Hill 2012, eq. 3.57 (chapter 3).

    Examples
    --------
    >>> round(spalding_transfer_number(2000.0, 800.0, 450.0, 300e3), 4)
    2.3333
    """
    cp = checked_array(cp_gas, "gas specific heat", "J/(kg K)", positive=True)
    L = checked_array(latent_heat, "latent heat", "J/kg", positive=True)
    return _out(cp * (np.asarray(t_gas, dtype=float) - np.asarray(t_surface, dtype=float)) / L)


def mass_transfer_number(y_surface, y_gas):
    """Spalding mass-transfer number ``B_M = (Y_s - Y_inf) / (1 - Y_s)``.

    Parameters
    ----------
    y_surface : array_like
        Fuel-vapour mass fraction at the drop surface, < 1 [-]
    y_gas : array_like
        Fuel-vapour mass fraction far from the drop [-]

    Returns
    -------
    float or ndarray
        Transfer number [-]

    References
    ----------
    .. [1] Spalding (1953); A. H. Lefebvre, V. G. McDonell, "Atomization and
       Sprays", 2nd ed., CRC Press 2017, chapter 8 (drop evaporation).

    Examples
    --------
    >>> round(mass_transfer_number(0.5, 0.1), 3)
    0.8
    """
    ys = np.asarray(y_surface, dtype=float)
    yg = np.asarray(y_gas, dtype=float)
    if np.any(ys >= 1) or np.any(ys < 0):
        raise FuelsysInputError("surface vapour mass fraction must be within 0..1 (exclusive of 1)")
    return _out((ys - yg) / (1.0 - ys))


def d2_evaporation_constant(k_gas, cp_gas, rho_liquid, B):
    """Evaporation constant of the d²-law ``K = 8 k ln(1 + B) / (rho_l cp)``.

    Parameters
    ----------
    k_gas : array_like
        Thermal conductivity of the gas film [W/(m K)]
    cp_gas : array_like
        Specific heat of the gas film [J/(kg K)]
    rho_liquid : array_like
        Liquid density [kg/m³]
    B : array_like
        Spalding transfer number, >= 0 [-]

    Returns
    -------
    float or ndarray
        K, the rate of fall of the squared diameter [m²/s]

    References
    ----------
    .. [1] Spalding (1953); Turns, "An Introduction to Combustion", 3rd ed.,
       eq. 3.59.

    Examples
    --------
    >>> round(d2_evaporation_constant(0.05, 2000.0, 700.0, 2.0) * 1e7, 4)
    3.1389
    """
    k = checked_array(k_gas, "gas conductivity", "W/(m K)", positive=True)
    cp = checked_array(cp_gas, "gas specific heat", "J/(kg K)", positive=True)
    rho = checked_array(rho_liquid, "liquid density", "kg/m³", positive=True)
    B = np.asarray(B, dtype=float)
    if np.any(B < 0) or np.any(~np.isfinite(B)):
        raise FuelsysInputError(f"transfer number must be >= 0 (got {np.ravel(B)[0]:g})")
    return _out(8.0 * k * np.log1p(B) / (rho * cp))


def d2_lifetime(diameter, K):
    """Droplet lifetime ``t = D0² / K`` by the d²-law (constant conditions).

    Parameters
    ----------
    diameter : array_like
        Initial drop diameter [m]
    K : array_like
        Evaporation constant [m²/s]

    Returns
    -------
    float or ndarray
        Lifetime [s]; infinity where K = 0 (no evaporation)

    References
    ----------
    .. [1] Turns, "An Introduction to Combustion", 3rd ed., eq. 3.60.

    Examples
    --------
    >>> round(d2_lifetime(100e-6, 1e-7), 4)
    0.1
    """
    D = checked_array(diameter, "drop diameter", "m", positive=True)
    K = np.asarray(K, dtype=float)
    if np.any(K < 0) or np.any(np.isnan(K)):
        raise FuelsysInputError("evaporation constant must be >= 0 [m²/s]")
    with np.errstate(divide="ignore"):
        return _out(np.where(K > 0, D * D / np.where(K > 0, K, 1.0), np.inf))


def rayleigh_drop_diameter(jet_diameter):
    """Drop diameter from the capillary break-up of a low-speed jet, ``1.89 d_jet``.

    Parameters
    ----------
    jet_diameter : array_like
        Jet (needle bore) diameter [m]

    Returns
    -------
    float or ndarray
        Drop diameter [m]

    References
    ----------
    .. [1] Lord Rayleigh, "On the instability of jets", Proc. London Math.
       Soc. 10 (1878) 4-13 (fastest-growing wavelength 4.51 d).
    .. [2] Lefebvre & McDonell, "Atomization and Sprays", 2nd ed., chapter 2.

    Examples
    --------
    >>> round(rayleigh_drop_diameter(0.3e-3) * 1e3, 3)
    0.567
    """
    return _out(RAYLEIGH_DROP_RATIO * checked_array(jet_diameter, "jet diameter", "m", positive=True))


def weber_limited_diameter(surface_tension, gas_density, relative_velocity, weber_critical=WEBER_CRITICAL):
    """Largest drop a gas stream leaves unbroken, ``D = We_c sigma / (rho_g U²)``.

    Parameters
    ----------
    surface_tension : array_like
        Liquid surface tension [N/m]
    gas_density : array_like
        Gas density [kg/m³]
    relative_velocity : array_like
        Gas velocity relative to the drop [m/s]
    weber_critical : float
        Critical Weber number, 12 for low-viscosity liquids [-]

    Returns
    -------
    float or ndarray
        Drop diameter [m]

    References
    ----------
    .. [1] J. O. Hinze, "Fundamentals of the hydrodynamic mechanism of
       splitting in dispersion processes", AIChE J. 1 (1955) 289-295.
    .. [2] Lefebvre & McDonell, "Atomization and Sprays", 2nd ed., chapter 2
       (drop break-up, We_crit about 12).

    Examples
    --------
    >>> round(weber_limited_diameter(0.025, 2.0, 40.0) * 1e6, 2)
    93.75
    """
    s = checked_array(surface_tension, "surface tension", "N/m", positive=True)
    r = checked_array(gas_density, "gas density", "kg/m³", positive=True)
    u = checked_array(relative_velocity, "relative velocity", "m/s", positive=True)
    return _out(weber_critical * s / (r * u * u))
