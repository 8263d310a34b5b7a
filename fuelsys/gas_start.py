"""Gas start: canister pressure, gas flow through a start jet or needle, canister chill.

Floor: the engine's parts (uses heat, thermo and fuels).

Canister pressure
    The saturation (bubble-point) pressure of the liquid in the canister at
    its temperature, from :mod:`fuelsys.fuels.gases` (CoolProp reference
    equations of state; blends by the modified Raoult's law there).

Jet flow
    Compressible flow of the vapour from an upstream stagnation state (p0, T0)
    to a back pressure, choked or not, times a discharge coefficient.

    * An orifice or short jet (``length`` 0) of a pure fluid: isentropic
      expansion with the real-gas equation of state (CoolProp, h and ρ at the
      upstream entropy), mass flux ρ √(2 (h0 - h)) maximised over the throat
      pressure down to the back pressure (:func:`mass_flux_isentropic_real`).
    * Blends, or a needle of some length: the gas taken as ideal with the
      real-gas ratio of specific heats γ and compressibility Z of the upstream
      state (R → Z R), which gives the closed forms of
      :func:`mass_flux_ideal`; a needle adds adiabatic friction (Fanno flow,
      :func:`mass_flux_fanno`) with the Darcy friction factor of a smooth tube
      at the Reynolds number of the flow.

Canister chill
    The liquid and the shell share one temperature.  Boiling the drawn mass
    takes its latent heat from their heat capacity, and the air round the
    canister gives heat back by natural convection::

        (m_l c_l + m_s c_s) dT/dt = -ṁ h_fg(T) + h A (T_air - T),  dm_l/dt = -ṁ

    (the vapour in the head space is neglected against the liquid).  The
    pressure follows the liquid's temperature and, for a blend, the share
    already drawn off (Rayleigh distillation); the latent heat uses the
    filling composition.  h is either given or from the
    Churchill-Chu correlation for a vertical surface in air, A from the
    canister's volume as a cylinder twice as tall as wide.

References
----------
.. [1] J. D. Anderson, "Modern Compressible Flow", 3rd ed., McGraw-Hill 2003:
   §5.4 eq. (5.20)-(5.21) (choked mass flow, critical pressure ratio),
   §3.9 (Fanno flow, eq. 3.101-3.107 with 4 f_F = f_Darcy).
.. [2] A. H. Shapiro, "The Dynamics and Thermodynamics of Compressible Fluid
   Flow", Vol. 1, Ronald Press 1953, ch. 6 (Fanno line, choking by friction).
.. [3] I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498 (CoolProp).
.. [4] S. W. Churchill and H. H. S. Chu, "Correlating equations for laminar
   and turbulent free convection from a vertical plate", Int. J. Heat Mass
   Transfer 18 (1975) 1323-1329, eq. (4).
.. [5] F. P. Incropera, D. P. DeWitt, T. L. Bergman and A. S. Lavine,
   "Fundamentals of Heat and Mass Transfer", 6th ed., Wiley 2007, Table A.1:
   specific heat at 300 K of plain carbon steel 434 J/(kg K), pure aluminium
   903 J/(kg K).
.. [6] A. Lichtarowicz, R. K. Duggins and E. Markland, "Discharge
   coefficients for incompressible non-cavitating flow through long
   orifices", J. Mech. Eng. Sci. 7 (1965) 210-219 (about 0.8 for
   length/bore 2-10 at high Reynolds number).
"""

from __future__ import annotations

import numpy as np

from fuelsys import heat
from fuelsys.constants import G0, P_ATM, R_MOLAR
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array as _arr

#: specific heat of canister shell materials at 300 K [J/(kg K)] (Incropera et al. 2007, Table A.1)
SHELL_SPECIFIC_HEAT = {"steel": 434.0, "aluminium": 903.0}
#: default discharge coefficient of a short jet (Lichtarowicz et al. 1965)
CD_JET = 0.8
#: liquid fill of a canister by volume at filling, used only to estimate its surface area
#: (about 80 %: common practice, no source)
FILL_FRACTION = 0.8
#: height over diameter of the canister taken for its surface area (estimate, see module docstring)
ASPECT = 2.0
#: Churchill-Chu (1975) vertical-plate correlation: validity as data
CHURCHILL_CHU_RANGE = {"rayleigh": (1e-1, 1e12)}




def _gas(gas):
    if isinstance(gas, str):
        from fuelsys.fuels.gases import get_gas

        return get_gas(gas)
    return gas


# -- canister pressure ---------------------------------------------------------------
def canister_pressure(gas, T):
    """Pressure in a canister of liquefied gas at temperature ``T`` (its bubble point).

    Parameters
    ----------
    gas : str or CoolPropFluid
        "propane", "butane", "isobutane", "lpg-70-30", ... [-]
    T : array_like
        Temperature of the canister contents [K]

    Returns
    -------
    float or ndarray
        Pressure [Pa abs]

    Raises
    ------
    FuelsysInputError
        For a temperature outside the fluid's liquid range.

    References
    ----------
    CoolProp reference equations (Lemmon et al. 2009 for propane) through
    :meth:`fuelsys.fuels.gases.CoolPropFluid.canister_pressure`.

    Examples
    --------
    >>> round(canister_pressure("propane", 293.15) / 1e5, 2)
    8.36
    """
    return _gas(gas).canister_pressure(T)


# -- isentropic jets -------------------------------------------------------------------
def critical_pressure_ratio(gamma):
    """Critical (choking) pressure ratio p*/p0 = (2/(γ+1))^(γ/(γ-1)).

    Parameters
    ----------
    gamma : array_like
        Ratio of specific heats [-]

    Returns
    -------
    float or ndarray
        p*/p0 [-]

    References
    ----------
    Anderson, "Modern Compressible Flow", 3rd ed. (2003), eq. (5.21).

    Examples
    --------
    >>> round(critical_pressure_ratio(1.4), 4)
    0.5283
    """
    g = _arr(gamma, "gamma", "-")
    if np.any(g <= 1):
        raise FuelsysInputError(f"gamma must be > 1 (got {np.min(g):g})")
    return _out((2.0 / (g + 1.0)) ** (g / (g - 1.0)))


def mass_flux_ideal(p0, T0, p_back, gamma, R, Z=1.0):
    """Isentropic mass flux through a throat, choked or not (ideal gas, R → Z R).

    Unchoked (p_back above p*)::

        G = p0 √(2γ / ((γ-1) Z R T0) [r^(2/γ) - r^((γ+1)/γ)]),  r = p_back/p0

    choked: the same at r = p*/p0, i.e.
    G* = p0 √(γ/(Z R T0)) (2/(γ+1))^((γ+1)/(2(γ-1))).

    Parameters
    ----------
    p0 : array_like
        Upstream stagnation pressure [Pa abs]
    T0 : array_like
        Upstream stagnation temperature [K]
    p_back : array_like
        Back (downstream) pressure [Pa abs]
    gamma : array_like
        Ratio of specific heats [-]
    R : array_like
        Specific gas constant [J/(kg K)]
    Z : array_like
        Compressibility factor at the upstream state [-]

    Returns
    -------
    float or ndarray
        Mass flux at the throat [kg/(m² s)]

    References
    ----------
    Anderson (2003) §5.4, eq. (5.20)-(5.21).

    Examples
    --------
    >>> round(mass_flux_ideal(2e5, 300.0, 1e5, 1.4, 287.0))
    467
    """
    p0 = _arr(p0, "upstream pressure", "Pa", positive=True)
    pb = _arr(p_back, "downstream pressure", "Pa", nonneg=True)
    _check_direction(p0, pb)
    T0 = _arr(T0, "upstream temperature", "K", positive=True)
    g = _arr(gamma, "gamma", "-")
    rz = _arr(R, "gas constant", "J/(kg K)", positive=True) * _arr(Z, "compressibility", "-", positive=True)
    r = np.maximum(pb / p0, np.asarray(critical_pressure_ratio(g)))
    G = p0 * np.sqrt(2.0 * g / ((g - 1.0) * rz * T0) * np.clip(r ** (2.0 / g) - r ** ((g + 1.0) / g), 0.0, None))
    return _out(G)


def _check_direction(p0, pb):
    if np.any(pb > p0):
        b = np.broadcast_arrays(p0, pb)
        i = np.flatnonzero(np.ravel(b[1] > b[0]))[0]
        raise FuelsysInputError(
            f"downstream pressure {np.ravel(b[1])[i] / 1e5:.4g} bar abs is above the upstream "
            f"{np.ravel(b[0])[i] / 1e5:.4g} bar abs: gas flows from high to low pressure "
            "(allowed: down <= up)")


def _upstream_state(gas, T0, p0):
    """Check the upstream state is vapour; return the pressure clipped onto the dew line."""
    gas = _gas(gas)
    T0 = gas.check_temperature(T0, "gas temperature") if T0 is not None else T0
    pd = np.asarray(gas.dew_pressure(T0), dtype=float)
    over = p0 > pd * (1.0 + 1e-3)
    if np.any(over):
        b = np.broadcast_arrays(p0, pd, T0)
        i = np.flatnonzero(np.ravel(np.broadcast_to(over, b[0].shape)))[0]
        raise FuelsysInputError(
            f"{gas.name} is liquid at {np.ravel(b[0])[i] / 1e5:.4g} bar abs and "
            f"{np.ravel(b[2])[i] - 273.15:.1f} °C (it condenses above {np.ravel(b[1])[i] / 1e5:.4g} bar abs): "
            "the jet needs vapour, so a lower pressure or a warmer gas")
    return np.minimum(p0, pd * (1.0 - 1e-6))


def mass_flux_isentropic_real(fluid, p0, T0, p_back):
    """Real-gas isentropic mass flux through a throat (CoolProp), choked or not.

    The throat pressure p_t maximises G(p_t) = ρ(p_t, s0) √(2 (h0 - h(p_t, s0)))
    over p_back <= p_t <= p0 (golden-section search on all points at once);
    the flow is choked where the maximum lies above p_back.

    Parameters
    ----------
    fluid : str
        CoolProp fluid name of a pure fluid, e.g. "Propane" [-]
    p0 : array_like
        Upstream stagnation pressure [Pa abs]
    T0 : array_like
        Upstream stagnation temperature [K]
    p_back : array_like
        Back pressure [Pa abs]

    Returns
    -------
    tuple of (float or ndarray, float or ndarray)
        Mass flux [kg/(m² s)] and throat-to-upstream pressure ratio [-]

    References
    ----------
    Anderson (2003) §5.4 generalised to a real gas: G = ρ V with
    V = √(2 Δh_s); CoolProp (Bell et al. 2014).

    Examples
    --------
    >>> G, r = mass_flux_isentropic_real("Nitrogen", 5e5, 300.0, 1e5)
    >>> round(r, 3)
    0.528
    """
    from CoolProp.CoolProp import PropsSI

    p0 = _arr(p0, "upstream pressure", "Pa", positive=True)
    pb = _arr(p_back, "downstream pressure", "Pa", nonneg=True)
    _check_direction(p0, pb)
    T0 = _arr(T0, "upstream temperature", "K", positive=True)
    shape = np.broadcast(p0, T0, pb).shape
    p0, T0, pb = (np.ravel(a).astype(float) for a in np.broadcast_arrays(p0, T0, pb))
    s0 = np.asarray(PropsSI("S", "T", T0, "P", p0, fluid), dtype=float)
    h0 = np.asarray(PropsSI("H", "T", T0, "P", p0, fluid), dtype=float)

    def flux(p):
        h = np.asarray(PropsSI("H", "P", p, "S", s0, fluid), dtype=float)
        d = np.asarray(PropsSI("D", "P", p, "S", s0, fluid), dtype=float)
        return d * np.sqrt(np.clip(2.0 * (h0 - h), 0.0, None))

    lo = np.maximum(pb, 0.05 * p0)
    hi = p0 * (1.0 - 1e-9)
    gr = (np.sqrt(5.0) - 1.0) / 2.0
    a, b = lo.copy(), hi.copy()
    c = b - gr * (b - a)
    d = a + gr * (b - a)
    fc, fd = flux(c), flux(d)
    for _ in range(60):
        left = fc > fd
        b = np.where(left, d, b)
        a = np.where(left, a, c)
        new_c = b - gr * (b - a)
        new_d = a + gr * (b - a)
        c_next = np.where(left, new_c, d)
        d_next = np.where(left, c, new_d)
        f_new = flux(np.where(left, new_c, new_d))
        fc, fd = np.where(left, f_new, fd), np.where(left, fc, f_new)
        c, d = c_next, d_next
        if np.all(b - a < 1e-9 * p0):
            break
    pt = 0.5 * (a + b)
    G = flux(pt)
    # the maximum at the lower end means unchoked: flux at the back pressure
    unchoked = pt <= lo * (1.0 + 1e-6)
    G = np.where(unchoked & (pb >= 0.05 * p0), flux(np.maximum(pb, 1.0)), G)
    pt = np.where(unchoked, pb, pt)
    return _out(G.reshape(shape)), _out((pt / p0).reshape(shape))


# -- Fanno needles -----------------------------------------------------------------------
def fanno_parameter(M, gamma):
    """Fanno friction parameter f_D L*/D that chokes a duct entered at Mach M.

    ``f L*/D = (1 - M²)/(γ M²) + (γ+1)/(2γ) ln[(γ+1) M² / (2 + (γ-1) M²)]``
    with the Darcy friction factor f (4× Fanning).

    Parameters
    ----------
    M : array_like
        Mach number at the duct entry [-]
    gamma : array_like
        Ratio of specific heats [-]

    Returns
    -------
    float or ndarray
        f L*/D [-]

    References
    ----------
    Anderson (2003) §3.9, eq. (3.107) (Fanning form, × 4 here).

    Examples
    --------
    >>> round(fanno_parameter(0.5, 1.4), 4)
    1.0691
    """
    M = _arr(M, "Mach number", "-", positive=True)
    if np.any(M > 1):
        raise FuelsysInputError(f"Mach number must be within 0..1 for the subsonic Fanno branch (got {np.max(M):g})")
    return _out(_fanno_raw(M, np.asarray(gamma, dtype=float)))


def _fanno_raw(M, g):
    return (1 - M**2) / (g * M**2) + (g + 1) / (2 * g) * np.log((g + 1) * M**2 / (2 + (g - 1) * M**2))


def _mach_from_fanno(X, g, iters=80):
    """Subsonic Mach number with f L*/D = X (bisection in ln M, vectorised)."""
    lo = np.full(np.shape(X), np.log(1e-6))
    hi = np.zeros(np.shape(X))
    for _ in range(iters):
        mid = 0.5 * (lo + hi)
        big = _fanno_raw(np.exp(mid), g) > X  # too slow: F too large
        lo = np.where(big, mid, lo)
        hi = np.where(big, hi, mid)
    return np.exp(0.5 * (lo + hi))


def mass_flux_fanno(p0, T0, p_back, gamma, R, fL_D, Z=1.0):
    """Mass flux through a duct with adiabatic friction, entered isentropically from rest.

    An isentropic entry takes the gas from (p0, T0) to Mach M1; friction
    along f L/D raises the Mach number towards 1 (Fanno line).  Choked when
    the exit pressure at M2 = 1 is at or above the back pressure (then
    f L*/D(M1) = f L/D); otherwise M1 is the one whose exit pressure equals
    the back pressure.  Reduces to :func:`mass_flux_ideal` for f L/D = 0.

    Parameters
    ----------
    p0 : array_like
        Upstream stagnation pressure [Pa abs]
    T0 : array_like
        Upstream stagnation temperature [K]
    p_back : array_like
        Back pressure [Pa abs]
    gamma : array_like
        Ratio of specific heats [-]
    R : array_like
        Specific gas constant [J/(kg K)]
    fL_D : array_like
        Darcy friction factor times length over bore [-]
    Z : array_like
        Compressibility factor at the upstream state [-]

    Returns
    -------
    tuple of (float or ndarray, float or ndarray)
        Mass flux in the duct [kg/(m² s)] and a choked flag (1.0 choked,
        0.0 not) [-]

    References
    ----------
    Anderson (2003) §3.9, eq. (3.101)-(3.107); Shapiro (1953) ch. 6.

    Examples
    --------
    >>> G, choked = mass_flux_fanno(5e5, 300.0, 1e5, 1.4, 287.0, 0.0)
    >>> round(G / mass_flux_ideal(5e5, 300.0, 1e5, 1.4, 287.0), 6), choked
    (1.0, 1.0)
    """
    p0 = _arr(p0, "upstream pressure", "Pa", positive=True)
    pb = _arr(p_back, "downstream pressure", "Pa", nonneg=True)
    _check_direction(p0, pb)
    T0 = _arr(T0, "upstream temperature", "K", positive=True)
    g = _arr(gamma, "gamma", "-")
    if np.any(g <= 1):
        raise FuelsysInputError(f"gamma must be > 1 (got {np.min(g):g})")
    rz = _arr(R, "gas constant", "J/(kg K)", positive=True) * _arr(Z, "compressibility", "-", positive=True)
    X = _arr(fL_D, "friction parameter fL/D", "-", nonneg=True)
    p0, T0, pb, g, rz, X = np.broadcast_arrays(p0, T0, pb, g, rz, X)
    e = (g - 1.0) / 2.0

    def p1_of(M1):
        return p0 * (1 + e * M1**2) ** (-g / (g - 1))

    def flux(M1):
        return p0 * np.sqrt(g / (rz * T0)) * M1 * (1 + e * M1**2) ** (-(g + 1) / (2 * (g - 1)))

    def exit_p(M1, M2):
        return p1_of(M1) * (M1 / M2) * np.sqrt((1 + e * M1**2) / (1 + e * M2**2))

    M1c = np.where(X > 0, _mach_from_fanno(np.maximum(X, 1e-300), g), 1.0)
    p_star = exit_p(M1c, np.ones_like(M1c))
    choked = pb <= p_star
    M1 = M1c.copy()
    un = ~choked
    if np.any(un):
        # unchoked: bisection on M1 in (0, M1c) for exit pressure = back pressure (those points only)
        gu, Xu, pbu, M1cu = g[un], X[un], pb[un], M1c[un]
        p0u = p0[un]
        lo = np.full(M1cu.shape, 1e-8)
        hi = M1cu.copy()
        for _ in range(48):
            mid = 0.5 * (lo + hi)
            F2 = _fanno_raw(mid, gu) - Xu
            M2 = np.where(Xu > 0, _mach_from_fanno(np.maximum(F2, 1e-300), gu, iters=48), mid)
            eu = (gu - 1.0) / 2.0
            p2 = (p0u * (1 + eu * mid**2) ** (-gu / (gu - 1)) * (mid / M2)
                  * np.sqrt((1 + eu * mid**2) / (1 + eu * M2**2)))
            too_fast = p2 < pbu
            hi = np.where(too_fast, mid, hi)
            lo = np.where(too_fast, lo, mid)
        M1[un] = 0.5 * (lo + hi)
    return _out(flux(M1)), _out(choked.astype(float))


# -- jets with a gas object -----------------------------------------------------------------
def jet_mass_flow(gas, bore, length, p_up, p_down, T, cd=CD_JET, method="auto"):
    """Gas mass flow through a start jet or small needle.

    Parameters
    ----------
    gas : str or CoolPropFluid
        The flowing gas ("propane", "butane", a blend name) [-]
    bore : array_like
        Jet or needle bore [m]
    length : array_like
        Length of the bore; 0 for a thin orifice [m]
    p_up : array_like
        Upstream (stagnation) pressure [Pa abs]
    p_down : array_like
        Downstream pressure [Pa abs]
    T : array_like
        Upstream gas temperature [K]
    cd : array_like
        Discharge coefficient on the ideal mass flow [-]
    method : str
        "auto" (real-gas isentropic for a pure fluid through an orifice,
        else ideal gas with real γ and Z, with Fanno friction when
        ``length`` > 0), "real" or "ideal" [-]

    Returns
    -------
    float or ndarray
        Mass flow [kg/s]

    Raises
    ------
    FuelsysInputError
        For a downstream pressure above the upstream, a liquid upstream state
        or a temperature outside the fluid's range.

    References
    ----------
    Anderson (2003) §3.9 and §5.4; CoolProp (Bell et al. 2014); friction
    factor :func:`fuelsys.heat.darcy_friction_smooth`.

    Examples
    --------
    >>> round(jet_mass_flow("propane", 0.3e-3, 0.0, 3e5, 1.013e5, 293.15) * 6e4, 2)  # g/min
    2.8
    """
    gas = _gas(gas)
    if method not in ("auto", "real", "ideal"):
        raise FuelsysInputError(f"jet method {method!r} unknown; allowed: auto, real, ideal")
    d = _arr(bore, "bore", "m", positive=True)
    L = _arr(length, "length", "m", nonneg=True)
    p0 = _arr(p_up, "upstream pressure", "Pa", positive=True)
    pb = _arr(p_down, "downstream pressure", "Pa", nonneg=True)
    _check_direction(p0, pb)
    cd = _arr(cd, "discharge coefficient", "-", positive=True)
    if np.any(cd > 1):
        raise FuelsysInputError(f"discharge coefficient must be within 0..1 (got {np.max(cd):g})")
    T = gas.check_temperature(_arr(T, "gas temperature", "K", positive=True), "gas temperature")
    p0c = _upstream_state(gas, T, p0)
    area = np.pi * d**2 / 4.0
    pure = "&" not in gas.coolprop_string
    use_real = (method == "real") or (method == "auto" and pure and np.all(L == 0))
    if use_real:
        if not pure:
            raise FuelsysInputError("the real-gas isentropic jet needs a pure fluid; use method 'ideal' for blends")
        if np.any(L > 0):
            raise FuelsysInputError("the real-gas isentropic jet is for an orifice (length 0); "
                                    "a needle with length uses method 'ideal' with Fanno friction")
        fluid = gas.coolprop_string.split("::")[-1]
        G, _ = mass_flux_isentropic_real(fluid, p0c, T, np.minimum(pb, p0c))
        return _out(cd * area * np.asarray(G))
    g = np.asarray(gas.gamma(T, p0c), dtype=float)
    Z = np.asarray(gas.compressibility(T, p0c), dtype=float)
    R = R_MOLAR / gas.molar_mass
    if np.all(L == 0):
        return _out(cd * area * np.asarray(mass_flux_ideal(p0c, T, np.minimum(pb, p0c), g, R, Z)))
    mu = np.asarray(gas.gas_viscosity(T, p0c), dtype=float)
    # fixed-point on the friction factor (Re from the flux it gives)
    f = np.full(np.broadcast(d, L, p0c, T).shape, 0.03)
    for _ in range(12):
        G, _ = mass_flux_fanno(p0c, T, np.minimum(pb, p0c), g, R, f * L / d, Z)
        Re = cd * np.asarray(G) * d / mu
        f_new = np.asarray(heat.darcy_friction_smooth(np.maximum(Re, 1.0)))
        if np.all(np.abs(f_new - f) <= 1e-6 * f):
            f = f_new
            break
        f = f_new
    G, _ = mass_flux_fanno(p0c, T, np.minimum(pb, p0c), g, R, f * L / d, Z)
    return _out(cd * area * np.asarray(G))


def jet_bore_for_flow(gas, mass_flow, length, p_up, p_down, T, cd=CD_JET):
    """Bore of a start jet or needle that passes a target gas mass flow.

    An orifice's flow is proportional to its area (closed form); with a
    length the friction makes it steeper, solved by bisection in ln(bore) on
    all points at once.

    Parameters
    ----------
    gas : str or CoolPropFluid
        The flowing gas [-]
    mass_flow : array_like
        Target mass flow [kg/s]
    length : array_like
        Length of the bore [m]
    p_up : array_like
        Upstream pressure [Pa abs]
    p_down : array_like
        Downstream pressure [Pa abs]
    T : array_like
        Gas temperature [K]
    cd : array_like
        Discharge coefficient [-]

    Returns
    -------
    float or ndarray
        Bore [m]

    References
    ----------
    :func:`jet_mass_flow` inverted.

    Examples
    --------
    >>> d = jet_bore_for_flow("propane", 2.80 / 6e4, 0.0, 3e5, 1.013e5, 293.15)
    >>> round(d * 1e3, 3)
    0.3
    """
    m = _arr(mass_flow, "target gas flow", "kg/s", positive=True)
    L = _arr(length, "length", "m", nonneg=True)
    ref = 1e-3
    if np.all(L == 0):
        m_ref = np.asarray(jet_mass_flow(gas, ref, 0.0, p_up, p_down, T, cd))
        if np.any(m_ref <= 0):
            raise FuelsysInputError("no gas flows at these pressures (upstream equals downstream)")
        return _out(ref * np.sqrt(m / m_ref))
    # secant iteration in ln(flow) against ln(bore), started from the orifice size
    m_ref = np.asarray(jet_mass_flow(gas, ref, 0.0, p_up, p_down, T, cd))
    x0 = np.log(ref * np.sqrt(m / m_ref))
    x1 = x0 + np.log(1.3)
    f0 = np.log(np.asarray(jet_mass_flow(gas, np.exp(x0), L, p_up, p_down, T, cd))) - np.log(m)
    f1 = np.log(np.asarray(jet_mass_flow(gas, np.exp(x1), L, p_up, p_down, T, cd))) - np.log(m)
    for _ in range(30):
        slope = np.where(np.abs(f1 - f0) > 0, (f1 - f0) / np.where(x1 != x0, x1 - x0, 1.0), 2.0)
        slope = np.clip(slope, 0.5, 5.0)  # flow grows as bore^2 (orifice) to bore^2.5..5 (long tube)
        x2 = x1 - f1 / slope
        x0, f0 = x1, f1
        x1 = x2
        f1 = np.log(np.asarray(jet_mass_flow(gas, np.exp(x1), L, p_up, p_down, T, cd))) - np.log(m)
        if np.all(np.abs(f1) < 1e-10):
            break
    return _out(np.exp(x1))


# -- canister chill ---------------------------------------------------------------------------
def churchill_chu_1975(T_surface, T_air, height):
    """Mean natural-convection coefficient of a vertical surface in air (Churchill & Chu 1975).

    Nu = {0.825 + 0.387 Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}², air
    properties at the film temperature (ideal gas at 1 atm, Sutherland
    viscosity and conductivity, cp from :mod:`fuelsys.thermo`).

    Parameters
    ----------
    T_surface : array_like
        Surface temperature [K]
    T_air : array_like
        Air temperature far away [K]
    height : array_like
        Height of the surface [m]

    Returns
    -------
    float or ndarray
        Heat-transfer coefficient [W/(m² K)]

    References
    ----------
    Churchill & Chu (1975) eq. (4); Incropera et al. (2007) eq. (9.26).

    Examples
    --------
    >>> round(churchill_chu_1975(273.15, 293.15, 0.15), 2)
    4.92
    """
    from fuelsys import thermo

    Ts = _arr(T_surface, "surface temperature", "K", positive=True)
    Ta = _arr(T_air, "air temperature", "K", positive=True)
    H = _arr(height, "height", "m", positive=True)
    Tf = 0.5 * (Ts + Ta)
    mu = np.asarray(heat.sutherland_viscosity_air(Tf))
    k = np.asarray(heat.sutherland_conductivity_air(Tf))
    cp = np.asarray(thermo.cp(Tf))
    rho = P_ATM / (thermo.R_AIR * Tf)
    nu = mu / rho
    alpha = k / (rho * cp)
    beta = 1.0 / Tf
    Ra = G0 * beta * np.abs(Ta - Ts) * H**3 / (nu * alpha)
    Pr = nu / alpha
    lo, hi = CHURCHILL_CHU_RANGE["rayleigh"]
    warn_validity("Churchill-Chu (1975) free convection", "Rayleigh number", np.maximum(Ra, lo), lo, hi, "-")
    Nu = (0.825 + 0.387 * Ra ** (1 / 6) / (1 + (0.492 / Pr) ** (9 / 16)) ** (8 / 27)) ** 2
    return _out(Nu * k / H)


def canister_geometry(gas, liquid_mass, T):
    """Outer area and height of a canister estimated from its liquid fill.

    Volume = liquid volume / :data:`FILL_FRACTION`; a cylinder of height
    :data:`ASPECT` times its diameter; area of the side and both ends.

    Parameters
    ----------
    gas : str or CoolPropFluid
        The liquefied gas [-]
    liquid_mass : float
        Liquid at filling [kg]
    T : float
        Temperature at filling [K]

    Returns
    -------
    tuple of float
        Area [m²], height [m]

    References
    ----------
    Cylinder geometry; fill fraction as in :data:`FILL_FRACTION`.

    Examples
    --------
    >>> a, h = canister_geometry("propane", 0.2, 293.15)
    >>> round(a * 1e4), round(h * 1e3)
    (366, 137)
    """
    gas = _gas(gas)
    m = float(_arr(liquid_mass, "liquid mass", "kg", positive=True))
    V = m / float(gas.density(T)) / FILL_FRACTION
    D = (4.0 * V / (np.pi * ASPECT)) ** (1.0 / 3.0)
    H = ASPECT * D
    return float(np.pi * D * H + 2.0 * np.pi * D**2 / 4.0), float(H)


def canister_chill(gas, liquid_mass, shell_mass, mass_flow, duration, t_ambient, *, shell="steel",
                   t_start=None, area=None, h=None, p_required=None, n_out=61):
    """Temperature, pressure and remaining liquid of a canister over a run.

    Parameters
    ----------
    gas : str or CoolPropFluid
        The liquefied gas [-]
    liquid_mass : float
        Liquid at the start [kg]
    shell_mass : float
        Mass of the canister shell [kg]
    mass_flow : float
        Gas drawn [kg/s]
    duration : float
        Length of the run [s]
    t_ambient : float
        Air temperature round the canister [K]
    shell : str
        "steel" or "aluminium" (specific heat from Incropera et al. Table A.1) [-]
    t_start : float, optional
        Canister temperature at the start, default the air temperature [K]
    area : float, optional
        Outer area exchanging heat with the air; default from
        :func:`canister_geometry` [m²]
    h : float, optional
        Heat-transfer coefficient; default Churchill-Chu at each instant
        [W/(m² K)]
    p_required : float, optional
        Pressure the jet needs; the time it is last held is reported [Pa abs]
    n_out : int
        Number of output times [-]

    Returns
    -------
    dict
        ``time`` [s], ``temperature`` [K], ``pressure`` [Pa abs],
        ``liquid_mass`` [kg], ``heat_gain`` from the air [W],
        ``time_empty`` (NaN when liquid remains) [s], ``time_below`` (first
        time the pressure is below ``p_required``; NaN when it holds) [s].

    Raises
    ------
    FuelsysInputError
        For temperatures outside the fluid's liquid range, or a flow or mass
        that is not positive.

    References
    ----------
    Lumped energy balance (module docstring); solved with
    scipy.integrate.solve_ivp (Dormand-Prince RK45); latent heat and liquid
    cp from CoolProp through :mod:`fuelsys.fuels.gases`.

    Examples
    --------
    >>> out = canister_chill("propane", 0.2, 0.1, 2e-5, 300.0, 293.15)
    >>> bool(out["temperature"][-1] < 293.15)
    True
    """
    from scipy.integrate import solve_ivp

    gas = _gas(gas)
    m0 = float(_arr(liquid_mass, "liquid mass", "kg", positive=True))
    ms = float(_arr(shell_mass, "shell mass", "kg", nonneg=True))
    mdot = float(_arr(mass_flow, "gas flow", "kg/s", positive=True))
    tend = float(_arr(duration, "duration", "s", positive=True))
    Ta = float(gas.check_temperature(_arr(t_ambient, "ambient temperature", "K", positive=True),
                                     "ambient temperature"))
    T0 = Ta if t_start is None else float(gas.check_temperature(t_start, "canister start temperature"))
    try:
        cs = SHELL_SPECIFIC_HEAT[shell]
    except KeyError:
        raise FuelsysInputError(f"shell material {shell!r} unknown; allowed: {', '.join(SHELL_SPECIFIC_HEAT)}") from None
    A, H = canister_geometry(gas, m0, T0)
    if area is not None:
        A = float(_arr(area, "area", "m²", nonneg=True))
    hfix = None if h is None else float(_arr(h, "heat-transfer coefficient", "W/(m² K)", nonneg=True))
    t_lo = gas.t_min

    def h_of(T):
        if hfix is not None:
            return hfix
        if abs(Ta - T) < 1e-9:
            return 0.0
        import warnings

        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            return float(churchill_chu_1975(T, Ta, H))

    def rhs(t, y):
        T, m = y
        m = max(m, 0.0)
        T = max(T, t_lo + 1e-6)
        cap = m * float(gas.specific_heat(T)) + ms * cs
        q = h_of(T) * A * (Ta - T)
        dT = (-mdot * float(gas.latent_heat(T)) + q) / cap if cap > 0 else 0.0
        return [dT, -mdot]

    def empty(t, y):
        return y[1]

    empty.terminal = True
    empty.direction = -1

    def too_cold(t, y):
        return y[0] - (t_lo + 1.0)

    too_cold.terminal = True
    too_cold.direction = -1

    sol = solve_ivp(rhs, (0.0, tend), [T0, m0], method="RK45", events=[empty, too_cold], dense_output=True,
                    rtol=1e-7, atol=[1e-6, 1e-9], max_step=max(tend / 50.0, 1e-3))
    t_stop = float(sol.t[-1])
    if sol.t_events[1].size:
        raise FuelsysInputError(
            f"the canister would cool below {gas.name}'s range ({t_lo - 273.15:.0f} °C) after "
            f"{t_stop:.0f} s: draw less gas or add heat")
    times = np.linspace(0.0, tend, int(n_out))
    Y = sol.sol(np.minimum(times, t_stop))
    T = Y[0]
    m = np.where(times <= t_stop, np.maximum(Y[1], 0.0), 0.0)
    # a blend's liquid grows richer in its heavier part as vapour is drawn off (Rayleigh distillation,
    # see fuelsys.fuels.gases): its pressure falls with the share drawn as well as with temperature
    drawn = np.clip(1.0 - m / m0, 0.0, 0.99)
    p = np.asarray(gas.canister_pressure(T, drawn), dtype=float)
    q = np.array([h_of(x) for x in T]) * A * (Ta - T)
    time_empty = float(sol.t_events[0][0]) if sol.t_events[0].size else float("nan")
    time_below = float("nan")
    if p_required is not None:
        preq = float(_arr(p_required, "required pressure", "Pa", positive=True))
        fine = np.linspace(0.0, t_stop, 2001)
        yf = sol.sol(fine)
        pf = np.asarray(gas.canister_pressure(yf[0], np.clip(1.0 - yf[1] / m0, 0.0, 0.99)), dtype=float)
        below = np.flatnonzero(pf < preq)
        if below.size:
            time_below = float(fine[below[0]])
        elif np.isfinite(time_empty):
            time_below = time_empty
    return {"time": times, "temperature": T, "pressure": p, "liquid_mass": m, "heat_gain": q,
            "time_empty": time_empty, "time_below": time_below, "area": A}


def adiabatic_boil_off(gas, liquid_mass, T_start, T_end):
    """Liquid mass boiled off to cool the rest from T_start to T_end with no heat gained.

    The chill model's balance with no shell and no air, m c_l dT = h_fg dm,
    integrated: m_end = m0 exp(-∫ c_l / h_fg dT) (trapezoid rule on 400
    points).

    Parameters
    ----------
    gas : str or CoolPropFluid
        The liquefied gas [-]
    liquid_mass : float
        Liquid at the start [kg]
    T_start : float
        Start temperature [K]
    T_end : float
        End temperature, below the start [K]

    Returns
    -------
    float
        Mass boiled off [kg]

    References
    ----------
    Energy balance of an adiabatic boiling liquid; properties from CoolProp
    through :mod:`fuelsys.fuels.gases`.

    Examples
    --------
    >>> round(adiabatic_boil_off("propane", 1.0, 293.15, 283.15), 4)
    0.0716
    """
    gas = _gas(gas)
    m0 = float(_arr(liquid_mass, "liquid mass", "kg", positive=True))
    T1 = float(gas.check_temperature(T_start, "start temperature"))
    T2 = float(gas.check_temperature(T_end, "end temperature"))
    if T2 >= T1:
        raise FuelsysInputError("end temperature must be below the start temperature for boil-off cooling")
    T = np.linspace(T2, T1, 400)
    ratio = np.asarray(gas.specific_heat(T)) / np.asarray(gas.latent_heat(T))
    integral = float(np.sum(0.5 * (ratio[1:] + ratio[:-1]) * np.diff(T)))
    return float(m0 * (1.0 - np.exp(-integral)))
