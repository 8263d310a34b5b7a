"""Petroleum fractions (kerosene-type fuels) characterised by pseudo-components.

The route from a fuel's data sheet to its properties is the classic one of
petroleum-fraction characterisation (Riazi 2005, chapters 2-8; API Technical
Data Book):

1. ASTM D86 distillation points -> true boiling point (TBP) curve by the
   Riazi-Daubert (1986) power-law interconversion
   (:func:`riazi_daubert_1986_d86_to_tbp`);  missing end points come from
   Riazi's (1989) distribution model fitted to the given points
   (:func:`riazi_1989_fit`).
2. The TBP curve (liquid volume per cent) is cut into pseudo-components
   (12 by default, see :data:`DEFAULT_CUTS`), each at the mean boiling point
   of its cut, with a specific gravity from one Watson K for the whole fuel,
   chosen so that the volume-average gravity equals the fuel's own density
   at 15 °C.
3. Per component: molar mass, Tc, Pc (Riazi-Daubert 1987), acentric factor
   (Kesler-Lee 1976), vapour pressure (Lee-Kesler 1975), saturated liquid
   volume (Rackett equation with Spencer-Danner's Z_RA, fitted to the
   component's own gravity), liquid heat capacity and ideal-gas heat capacity
   (Kesler-Lee 1976), heat of vaporisation (Riedel 1954 at Tb, Watson 1943
   scaling), hydrogen content (Riazi-Daubert 1987 C/H weight ratio).
4. Whole fuel: liquid density by ideal (volume-additive) mixing, calibrated to
   the measured density at 15 °C; kinematic viscosity from two measured points
   by the Walther equation (ASTM D341); thermal conductivity (Riazi-Faghri
   1985) and surface tension (API procedure 10A3.2) from the fuel's mean
   average boiling point, gravity and pseudo-critical temperature.
5. Phase equilibrium: Raoult's law (ideal liquid solution, ideal gas) with air
   as an inert, insoluble carrier gas and any heavy oil as a non-volatile
   liquid, solved by the Rachford-Rice equation vectorised over arrays of
   temperature, pressure and fuel/air ratio (:func:`raoult_flash`).

Every function takes SI input (K, Pa, kg/mol, kg/m³) and broadcasts over
numpy arrays.  Each correlation's validity range is kept beside it as data
(the ``*_RANGE`` dicts) and checked at run time with
:func:`fuelsys.errors.warn_validity`.

References
----------
Riazi, M. R. (2005) *Characterization and Properties of Petroleum Fractions*,
ASTM Manual MNL50, ASTM International.
API (1997) *Technical Data Book - Petroleum Refining*, 6th ed., American
Petroleum Institute.
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys import thermo as _thermo

from fuelsys.constants import R_MOLAR as R_GAS
from fuelsys.constants import T_REF
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.fuels.base import P_ATM, T0_C, Fuel, as_float

# ---------------------------------------------------------------------------
# constants and unit factors
# ---------------------------------------------------------------------------
#: molar mass of dry air [kg/mol] and its O2 mole fraction [-]: the one dry air of fuelsys
#: (CIPM-2007 composition, see fuelsys.thermo), so stoichiometric ratios agree across modules
M_AIR = _thermo.M_AIR
Y_O2_AIR = _thermo.AIR_MOLE_FRACTION["O2"]
#: molar masses of C, H, O, O2 [kg/mol] (IUPAC conventional atomic weights)
M_C, M_H, M_O = 12.011e-3, 1.008e-3, 15.999e-3
M_O2 = 2 * M_O
#: mass fraction of O2 in dry air [-]
W_O2_AIR = Y_O2_AIR * M_O2 / M_AIR
#: density of water at 60 °F [kg/m³] -- the reference of specific gravity 60/60 °F
RHO_WATER_60F = 999.016
#: density of water at 15 °C [kg/m³]; SG 15/15 °C is taken equal to SG 60/60 °F
RHO_WATER_15C = 999.10
#: 60 °F in kelvin
T_60F = 288.7056
#: latent heat of water at 25 °C [J/kg] (for HHV <-> LHV)
HVAP_WATER_25C = 2.4423e6

_RANKINE = 1.8  # °R per K
_PSIA = 6894.757293168  # Pa per psi
_BTU_LB_F = 4186.8  # J/(kg K) per Btu/(lb °F)
_BTU_H_FT_F = 1.730735  # W/(m K) per Btu/(h ft °F)


def _arr(x):
    return np.asarray(x, dtype=float)


# ---------------------------------------------------------------------------
# 1. distillation: D86 -> TBP
# ---------------------------------------------------------------------------
#: Riazi-Daubert (1986) coefficients TBP = a * D86**b (kelvin), by volume per cent
#: distilled (Riazi 2005, Table 3.4 / eq. 3.14).  The kelvin a's are the rankine a's of
#: API Technical Data Book procedure 3A1.1 times 1.8**(b - 1) (a test checks it).  The end
#: point (100 %) uses the 95 % pair -- the correlation gives none for the end point.
D86_TBP_RIAZI_DAUBERT_1986 = {
    0: (0.9177, 1.0019),
    10: (0.5564, 1.0900),
    30: (0.7617, 1.0425),
    50: (0.9013, 1.0176),
    70: (0.8821, 1.0226),
    90: (0.9552, 1.0110),
    95: (0.8177, 1.0355),
    100: (0.8177, 1.0355),
}
#: fitted range of the Riazi-Daubert 1986 interconversion (Riazi 2005 §3.2.2.1)
D86_TBP_RANGE = {"D86 temperature": (273.15 + 10.0, 273.15 + 400.0, "K")}


def riazi_daubert_1986_d86_to_tbp(pct, t_d86):
    """True boiling point from an ASTM D86 point, Riazi-Daubert (1986).

    .. math:: TBP = a\\,(D86)^b

    Parameters
    ----------
    pct : int
        Volume per cent distilled, one of 0, 10, 30, 50, 70, 90, 95, 100 [%]
        (the end point uses the 95 % coefficients).
    t_d86 : array_like
        D86 temperature at that point [K].

    Returns
    -------
    float or ndarray
        TBP temperature at the same volume per cent [K].

    References
    ----------
    Riazi, M. R. and Daubert, T. E. (1986) "Analytical correlations
    interconvert distillation-curve types", Oil & Gas Journal 84 (Aug. 25),
    50-57; as eq. 3.14 and Table 3.4 of Riazi (2005) MNL50.

    Examples
    --------
    >>> round(riazi_daubert_1986_d86_to_tbp(50, 206.7 + 273.15) - 273.15, 1)
    209.0
    """
    if pct not in D86_TBP_RIAZI_DAUBERT_1986:
        raise FuelsysInputError(
            f"D86 point at {pct} % is not one the Riazi-Daubert conversion covers; "
            f"use {', '.join(str(p) for p in D86_TBP_RIAZI_DAUBERT_1986)} %")
    t = _arr(t_d86)
    lo, hi, unit = D86_TBP_RANGE["D86 temperature"]
    warn_validity("Riazi-Daubert 1986 D86->TBP", "D86 temperature", t, lo, hi, unit)
    a, b = D86_TBP_RIAZI_DAUBERT_1986[pct]
    return as_float(a * t ** b)


def riazi_1989_fit(pct, t):
    """Fit Riazi's (1989) distribution model to points of a boiling curve.

    .. math:: \\frac{T - T_0}{T_0} = \\left[\\frac{A}{B}\\ln\\frac{1}{1-x}\\right]^{1/B}

    ``x`` is the fraction distilled.  ``T0`` is found by a scan over
    ``0.5 T_first .. 0.999 T_first``; for each trial ``A`` and ``B`` follow by
    linear least squares in the log-log form.

    Parameters
    ----------
    pct : array_like
        Volume per cent distilled of each point, 0 < pct < 100 [%].
    t : array_like
        Boiling temperature at each point [K].

    Returns
    -------
    tuple of float
        ``(T0, A, B)``: initial boiling point of the model [K] and its two
        shape parameters [-].

    References
    ----------
    Riazi, M. R. (1989) "Distribution model for properties of hydrocarbon-plus
    fractions", Ind. Eng. Chem. Res. 28, 1731-1735; Riazi (2005) MNL50 §4.5.4,
    eq. 4.56.

    Examples
    --------
    >>> t0, a, b = riazi_1989_fit([10, 50, 90], [430.0, 470.0, 520.0])
    >>> 300 < t0 < 430
    True
    """
    x = _arr(pct) / 100.0
    t = _arr(t)
    keep = (x > 0) & (x < 1)
    x, t = x[keep], t[keep]
    if x.size < 3:
        raise FuelsysInputError("the distribution-model fit needs at least 3 points between 0 and 100 %")
    t0 = np.linspace(0.5, 0.999, 400)[:, None] * t.min()
    yy = np.log((t[None, :] - t0) / t0)
    xx = np.log(np.log(1.0 / (1.0 - x)))[None, :].repeat(t0.shape[0], axis=0)
    xm, ym = xx.mean(axis=1, keepdims=True), yy.mean(axis=1, keepdims=True)
    slope = ((xx - xm) * (yy - ym)).sum(axis=1) / ((xx - xm) ** 2).sum(axis=1)
    icpt = ym[:, 0] - slope * xm[:, 0]
    pred = t0[:, 0, None] * (1.0 + np.exp(icpt[:, None] + slope[:, None] * xx))
    sse = ((pred - t[None, :]) ** 2).sum(axis=1)
    k = int(np.argmin(sse))
    b = 1.0 / slope[k]
    a = b * math.exp(icpt[k] * b)
    return float(t0[k, 0]), float(a), float(b)


def riazi_1989_temperature(pct, t0, a, b):
    """Boiling temperature of Riazi's (1989) distribution model.

    Parameters
    ----------
    pct : array_like
        Volume per cent distilled, 0 <= pct < 100 [%].
    t0 : float
        Model initial boiling point [K].
    a, b : float
        Model shape parameters [-].

    Returns
    -------
    float or ndarray
        Temperature [K].

    References
    ----------
    Riazi (1989), see :func:`riazi_1989_fit`.

    Examples
    --------
    >>> round(riazi_1989_temperature(0.0, 400.0, 1.0, 1.5), 6)
    400.0
    """
    x = _arr(pct) / 100.0
    return as_float(t0 * (1.0 + (a / b * np.log(1.0 / (1.0 - x))) ** (1.0 / b)))


# ---------------------------------------------------------------------------
# 2. Watson K, critical properties, molar mass, C/H ratio
# ---------------------------------------------------------------------------
def watson_k(tb, sg):
    """Watson (UOP) characterisation factor.

    .. math:: K_W = (1.8\\,T_b)^{1/3} / SG

    Parameters
    ----------
    tb : array_like
        (Mean average) boiling point [K].
    sg : array_like
        Specific gravity 60/60 °F [-].

    Returns
    -------
    float or ndarray
        Watson K [-].

    References
    ----------
    Watson, K. M. and Nelson, E. F. (1933) Ind. Eng. Chem. 25, 880-887;
    Riazi (2005) MNL50 eq. 2.13.

    Examples
    --------
    >>> round(watson_k(400.0, 0.8), 4)
    11.2035
    """
    return as_float((_RANKINE * _arr(tb)) ** (1.0 / 3.0) / _arr(sg))


#: Riazi-Daubert (1987) theta = a exp(b Tb + c SG + d Tb SG) Tb^e SG^f, Tb in °R;
#: M in g/mol, Tc in °R, Pc in psia; C/H weight ratio (Tables IV, V, VII, XI of the paper)
RIAZI_DAUBERT_1987 = {
    "M": (581.96, 5.43076e-4, -9.53384, 1.11056e-3, 0.97476, 6.51274),
    "Tc": (10.6443, -5.1747e-4, -0.54444, 3.5995e-4, 0.81067, 0.53691),
    "Pc": (6.162e6, -4.725e-3, -4.8014, 3.1939e-3, -0.4844, 4.0846),
    "CH": (17.22022, 8.24983e-3, 16.9402, -6.93931e-3, -2.72522, -6.79769),
}
#: fitted range of Riazi-Daubert 1987 (Tb 80-650 °F, M 70-300; Riazi 2005 §2.4.1)
RIAZI_DAUBERT_1987_RANGE = {"Tb": (300.0, 620.0, "K"), "SG": (0.55, 1.0, "-")}

#: Riazi-Daubert (1980) theta = a Tb^b SG^c, Tb in K; M g/mol, Tc K, Pc bar (Riazi 2005 eq. 2.38, Table 2.5)
RIAZI_DAUBERT_1980 = {
    "M": (1.6607e-4, 2.1962, -1.0164),
    "Tc": (19.06232, 0.58848, 0.3596),
    "Pc": (5.53027e7, -2.3125, 2.3201),
}
RIAZI_DAUBERT_1980_RANGE = {"Tb": (300.0, 620.0, "K"), "SG": (0.55, 1.0, "-")}


def _rd87(key, tb, sg):
    a, b, c, d, e, f = RIAZI_DAUBERT_1987[key]
    tbr = _RANKINE * tb
    return a * np.exp(b * tbr + c * sg + d * tbr * sg) * tbr ** e * sg ** f


def riazi_daubert_1987(tb, sg):
    """Molar mass and critical constants of a petroleum fraction, Riazi-Daubert (1987).

    .. math:: \\theta = a\\,e^{b T_b + c SG + d T_b SG}\\,T_b^{e}\\,SG^{f}

    Parameters
    ----------
    tb : array_like
        Normal boiling point [K].
    sg : array_like
        Specific gravity 60/60 °F [-].

    Returns
    -------
    tuple
        ``(M, Tc, Pc)``: molar mass [kg/mol], critical temperature [K],
        critical pressure [Pa].

    Notes
    -----
    Fitted for Tb 300-620 K (80-650 °F), M 70-300 g/mol; average errors about
    1 % (Tc), 3 % (Pc), 4 % (M) (Riazi 2005, Table 2.6).

    References
    ----------
    Riazi, M. R. and Daubert, T. E. (1987) "Characterization parameters for
    petroleum fractions", Ind. Eng. Chem. Res. 26, 755-759 (Tables IV, V, VII);
    Riazi (2005) MNL50 eq. 2.38.

    Examples
    --------
    Ahmed (2016) Example 2.2: Tb = 198 °F, SG = 0.7365 gives M 97, Tc 986 °R,
    Pc 466 psia.

    >>> m, tc, pc = riazi_daubert_1987((198 - 32) / 1.8 + 273.15, 0.7365)
    >>> round(m * 1e3), round(tc * 1.8), round(pc / 6894.757)
    (97, 986, 466)
    """
    tb, sg = _arr(tb), _arr(sg)
    for name, v in (("Tb", tb), ("SG", sg)):
        lo, hi, unit = RIAZI_DAUBERT_1987_RANGE[name]
        warn_validity("Riazi-Daubert 1987", name, v, lo, hi, unit)
    m = _rd87("M", tb, sg) * 1e-3
    tc = _rd87("Tc", tb, sg) / _RANKINE
    pc = _rd87("Pc", tb, sg) * _PSIA
    return as_float(m), as_float(tc), as_float(pc)


def riazi_daubert_1980(tb, sg):
    """Molar mass and critical constants, simple Riazi-Daubert (1980) form.

    .. math:: \\theta = a\\,T_b^{b}\\,SG^{c}

    Parameters
    ----------
    tb : array_like
        Normal boiling point [K].
    sg : array_like
        Specific gravity 60/60 °F [-].

    Returns
    -------
    tuple
        ``(M, Tc, Pc)`` [kg/mol], [K], [Pa].

    References
    ----------
    Riazi, M. R. and Daubert, T. E. (1980) "Simplify property predictions",
    Hydrocarbon Processing 59(3), 115-116; Riazi (2005) MNL50 eq. 2.38/Table 2.5.

    Examples
    --------
    >>> m, tc, pc = riazi_daubert_1980((198 - 32) / 1.8 + 273.15, 0.7365)
    >>> round(m * 1e3), round(tc * 1.8), round(pc / 6894.757)
    (96, 990, 467)
    """
    tb, sg = _arr(tb), _arr(sg)
    for name, v in (("Tb", tb), ("SG", sg)):
        lo, hi, unit = RIAZI_DAUBERT_1980_RANGE[name]
        warn_validity("Riazi-Daubert 1980", name, v, lo, hi, unit)
    out = {k: a * tb ** b * sg ** c for k, (a, b, c) in RIAZI_DAUBERT_1980.items()}
    return as_float(out["M"] * 1e-3), as_float(out["Tc"]), as_float(out["Pc"] * 1e5)


#: methods for (M, Tc, Pc) from (Tb, SG); the default is the 1987 form
CRITICAL_METHODS = {"riazi_daubert_1987": riazi_daubert_1987, "riazi_daubert_1980": riazi_daubert_1980}


def critical_properties(tb, sg, method: str = "riazi_daubert_1987"):
    """Molar mass and critical constants of a fraction by the chosen method.

    Parameters
    ----------
    tb : array_like
        Normal boiling point [K].
    sg : array_like
        Specific gravity 60/60 °F [-].
    method : str
        A key of :data:`CRITICAL_METHODS` (default "riazi_daubert_1987") [-].

    Returns
    -------
    tuple
        ``(M, Tc, Pc)`` [kg/mol], [K], [Pa].

    References
    ----------
    See :func:`riazi_daubert_1987` and :func:`riazi_daubert_1980`.

    Examples
    --------
    >>> m, tc, pc = critical_properties(447.3, 0.7342)
    >>> 610 < tc < 630
    True
    """
    try:
        fn = CRITICAL_METHODS[method]
    except KeyError:
        raise FuelsysInputError(f"unknown method {method!r}; use one of {', '.join(CRITICAL_METHODS)}") from None
    return fn(tb, sg)


def riazi_daubert_1987_ch_ratio(tb, sg):
    """Carbon/hydrogen weight ratio of a petroleum fraction, Riazi-Daubert (1987).

    Parameters
    ----------
    tb : array_like
        Normal boiling point [K].
    sg : array_like
        Specific gravity 60/60 °F [-].

    Returns
    -------
    float or ndarray
        C/H mass ratio [-].

    References
    ----------
    Riazi and Daubert (1987), Ind. Eng. Chem. Res. 26, 755-759, Table XI;
    Riazi (2005) MNL50 eq. 2.120.

    Examples
    --------
    n-Decane (Tb 447.3 K, SG 0.734) has C/H = 120.11/22.18 = 5.42:

    >>> round(riazi_daubert_1987_ch_ratio(447.3, 0.7342), 1)
    5.4
    """
    tb, sg = _arr(tb), _arr(sg)
    lo, hi, unit = RIAZI_DAUBERT_1987_RANGE["Tb"]
    warn_validity("Riazi-Daubert 1987 C/H ratio", "Tb", tb, lo, hi, unit)
    return as_float(_rd87("CH", tb, sg))


# ---------------------------------------------------------------------------
# 3. acentric factor and vapour pressure
# ---------------------------------------------------------------------------
def _lk_f0_f1(tr):
    ln_tr = np.log(tr)
    tr6 = tr ** 6
    f0 = 5.92714 - 6.09648 / tr - 1.28862 * ln_tr + 0.169347 * tr6
    f1 = 15.2518 - 15.6875 / tr - 13.4721 * ln_tr + 0.43577 * tr6
    return f0, f1


def _lk_df0_df1(tr):
    """d f0/d Tr and d f1/d Tr of the Lee-Kesler vapour-pressure functions."""
    tr5 = tr ** 5
    d0 = 6.09648 / tr ** 2 - 1.28862 / tr + 6 * 0.169347 * tr5
    d1 = 15.6875 / tr ** 2 - 13.4721 / tr + 6 * 0.43577 * tr5
    return d0, d1


def kesler_lee_omega(tb, tc, pc, k_watson=None):
    """Acentric factor of a fraction, Kesler-Lee (1976).

    For ``Tb/Tc <= 0.8`` the Lee-Kesler vapour-pressure equation solved at the
    normal boiling point; above, Kesler-Lee's correlation in Watson K.

    Parameters
    ----------
    tb : array_like
        Normal boiling point [K].
    tc : array_like
        Critical temperature [K].
    pc : array_like
        Critical pressure [Pa].
    k_watson : array_like, optional
        Watson K, needed only where Tb/Tc > 0.8 [-].

    Returns
    -------
    float or ndarray
        Acentric factor [-].

    References
    ----------
    Kesler, M. G. and Lee, B. I. (1976) "Improve prediction of enthalpy of
    fractions", Hydrocarbon Processing 55(3), 153-158; Riazi (2005) MNL50
    eqs. 2.105-2.106.

    Examples
    --------
    Same as chemicals.acentric.LK_omega (0.4922) for Tbr < 0.8:

    >>> round(kesler_lee_omega(447.3, 617.7, 2.11e6), 3)
    0.492
    """
    tb, tc, pc = _arr(tb), _arr(tc), _arr(pc)
    tbr = tb / tc
    f0, f1 = _lk_f0_f1(tbr)
    w_low = (np.log(P_ATM / pc) - f0) / f1
    if np.any(tbr > 0.8):
        if k_watson is None:
            raise FuelsysInputError("Kesler-Lee acentric factor for Tb/Tc > 0.8 needs the Watson K")
        k = _arr(k_watson)
        w_high = -7.904 + 0.1352 * k - 0.007465 * k ** 2 + 8.359 * tbr + (1.408 - 0.01063 * k) / tbr
        return as_float(np.where(tbr <= 0.8, w_low, w_high))
    return as_float(w_low)


#: range of Lee-Kesler vapour pressure in reduced temperature (Lee & Kesler 1975 fitted 0.3..1)
LEE_KESLER_RANGE = {"Tr": (0.3, 1.0, "-")}


def lee_kesler_vapour_pressure(T, tc, pc, omega):
    """Vapour pressure by the Lee-Kesler (1975) corresponding-states equation.

    .. math:: \\ln P_r = f^{(0)}(T_r) + \\omega f^{(1)}(T_r)

    Parameters
    ----------
    T : array_like
        Temperature [K].
    tc : array_like
        Critical temperature [K].
    pc : array_like
        Critical pressure [Pa].
    omega : array_like
        Acentric factor [-].

    Returns
    -------
    float or ndarray
        Vapour pressure [Pa].

    References
    ----------
    Lee, B. I. and Kesler, M. G. (1975) "A generalized thermodynamic
    correlation based on three-parameter corresponding states", AIChE J. 21,
    510-527; Riazi (2005) MNL50 eq. 7.18.

    Examples
    --------
    >>> round(lee_kesler_vapour_pressure(347.2, 617.1, 36e5, 0.299))
    13079
    """
    tr = _arr(T) / _arr(tc)
    lo, hi, unit = LEE_KESLER_RANGE["Tr"]
    warn_validity("Lee-Kesler vapour pressure", "reduced temperature", tr, lo, hi, unit)
    f0, f1 = _lk_f0_f1(tr)
    return as_float(_arr(pc) * np.exp(f0 + _arr(omega) * f1))


# ---------------------------------------------------------------------------
# 4. liquid density
# ---------------------------------------------------------------------------
#: range of the Rackett equation in reduced temperature (saturated liquid, below the critical region)
RACKETT_RANGE = {"Tr": (0.2, 0.99, "-")}


def rackett_spencer_danner(T, tc, pc, z_ra):
    """Saturated liquid molar volume, Rackett equation with Spencer-Danner's Z_RA.

    .. math:: V_s = \\frac{R T_c}{P_c} Z_{RA}^{\\,1 + (1 - T_r)^{2/7}}

    Parameters
    ----------
    T : array_like
        Temperature [K].
    tc : array_like
        Critical temperature [K].
    pc : array_like
        Critical pressure [Pa].
    z_ra : array_like
        Rackett compressibility factor [-].

    Returns
    -------
    float or ndarray
        Molar volume [m³/mol].

    References
    ----------
    Rackett, H. G. (1970) J. Chem. Eng. Data 15, 514-517; Spencer, C. F. and
    Danner, R. P. (1972) "Improved equation for prediction of saturated liquid
    density", J. Chem. Eng. Data 17, 236-241; Riazi (2005) MNL50 eq. 5.130.

    Examples
    --------
    Same as chemicals.volume.Rackett:

    >>> round(rackett_spencer_danner(272.03889, 369.83, 4248000.0, 0.2763) * 1e6, 3)
    82.992
    """
    tc = _arr(tc)
    tr = _arr(T) / tc
    lo, hi, unit = RACKETT_RANGE["Tr"]
    warn_validity("Rackett equation", "reduced temperature", tr, lo, hi, unit)
    tau = np.clip(1.0 - tr, 0.0, None)
    return as_float(R_GAS * tc / _arr(pc) * _arr(z_ra) ** (1.0 + tau ** (2.0 / 7.0)))


def rackett_z_ra_from_volume(t_ref, v_ref, tc, pc):
    """Z_RA that makes the Rackett equation pass through a known liquid volume.

    Parameters
    ----------
    t_ref : array_like
        Temperature of the known point [K].
    v_ref : array_like
        Liquid molar volume at ``t_ref`` [m³/mol].
    tc : array_like
        Critical temperature [K].
    pc : array_like
        Critical pressure [Pa].

    Returns
    -------
    float or ndarray
        Z_RA [-].

    References
    ----------
    Spencer and Danner (1972); API Technical Data Book procedure 6A2.13
    (Z_RA from one known density); Riazi (2005) MNL50 §5.9.

    Examples
    --------
    >>> round(rackett_z_ra_from_volume(272.03889, 82.992e-6, 369.83, 4248000.0), 4)
    0.2763
    """
    tr = _arr(t_ref) / _arr(tc)
    expo = 1.0 + (1.0 - tr) ** (2.0 / 7.0)
    return as_float((_arr(v_ref) * _arr(pc) / (R_GAS * _arr(tc))) ** (1.0 / expo))


# ---------------------------------------------------------------------------
# 5. heat capacities, latent heat
# ---------------------------------------------------------------------------
#: Kesler-Lee liquid heat capacity, fitted Tr up to about 0.85
KESLER_LEE_LIQUID_CP_RANGE = {"Tr": (0.2, 0.85, "-")}
#: Kesler-Lee ideal-gas heat capacity, fitted about 255-922 K (0-1200 °F; Riazi 2005 §7.5.1)
KESLER_LEE_GAS_CP_RANGE = {"T": (255.0, 922.0, "K")}


def _kl_liquid_coeffs(k, sg):
    a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg
    a2 = 1e-4 * (1.0 + 0.82463 * k) * (1.12172 - 0.27634 / sg)
    a3 = -1e-8 * (1.0 + 0.82463 * k) * (2.9027 - 0.70958 / sg)
    return a1, a2, a3


def kesler_lee_liquid_cp(T, k_watson, sg):
    """Liquid heat capacity of a petroleum fraction, Kesler-Lee (1976).

    .. math:: c_p = a_1 + a_2 T + a_3 T^2 \\quad [\\mathrm{Btu/(lb\\,°F)},\\ T\\ \\mathrm{in}\\ °R]

    Parameters
    ----------
    T : array_like
        Temperature [K].
    k_watson : array_like
        Watson K [-].
    sg : array_like
        Specific gravity 60/60 °F [-].

    Returns
    -------
    float or ndarray
        Liquid isobaric heat capacity [J/(kg K)].

    References
    ----------
    Kesler and Lee (1976), Hydrocarbon Processing 55(3), 153-158; API TDB
    procedure 7D2.2; Riazi (2005) MNL50 eq. 7.43.

    Examples
    --------
    >>> round(kesler_lee_liquid_cp(298.15, 12.67, 0.7342))
    2169
    """
    a1, a2, a3 = _kl_liquid_coeffs(_arr(k_watson), _arr(sg))
    tr = _RANKINE * _arr(T)
    return as_float((a1 + a2 * tr + a3 * tr ** 2) * _BTU_LB_F)


def kesler_lee_liquid_enthalpy(T, k_watson, sg, t_ref=T_REF):
    """Integral of :func:`kesler_lee_liquid_cp` from ``t_ref`` to ``T``.

    Parameters
    ----------
    T : array_like
        Temperature [K].
    k_watson : array_like
        Watson K [-].
    sg : array_like
        Specific gravity 60/60 °F [-].
    t_ref : float
        Reference temperature [K].

    Returns
    -------
    float or ndarray
        Sensible enthalpy of the liquid [J/kg].

    References
    ----------
    Kesler and Lee (1976); see :func:`kesler_lee_liquid_cp`.

    Examples
    --------
    >>> round(kesler_lee_liquid_enthalpy(308.15, 12.67, 0.7342), -1)
    21920.0
    """
    a1, a2, a3 = _kl_liquid_coeffs(_arr(k_watson), _arr(sg))
    t1, t0 = _RANKINE * _arr(T), _RANKINE * t_ref
    h = a1 * (t1 - t0) + a2 / 2 * (t1 ** 2 - t0 ** 2) + a3 / 3 * (t1 ** 3 - t0 ** 3)
    return as_float(h * _BTU_LB_F / _RANKINE)


def _kl_gas_coeffs(k, omega):
    a0 = -1.41779 + 0.11828 * k
    a1 = -(6.99724 - 8.69326 * k + 0.27715 * k ** 2) * 1e-4
    a2 = -2.2582e-6
    b0 = 1.09223 - 2.48245 * omega
    b1 = -(3.434 - 7.14 * omega) * 1e-3
    b2 = -(7.2661 - 9.2561 * omega) * 1e-7
    c = np.where((k > 10.0) & (k < 12.8), (((12.8 - k) * (10.0 - k)) / (10.0 * omega)) ** 2, 0.0)
    return a0, a1, a2, b0, b1, b2, c


def kesler_lee_ideal_gas_cp(T, k_watson, omega):
    """Ideal-gas heat capacity of a petroleum fraction's vapour, Kesler-Lee (1976).

    .. math:: c_p^{ig} = A_0 + A_1 T + A_2 T^2 - C (B_0 + B_1 T + B_2 T^2)
              \\quad [\\mathrm{kJ/(kg\\,K)},\\ T\\ \\mathrm{in\\ K}]

    Parameters
    ----------
    T : array_like
        Temperature [K].
    k_watson : array_like
        Watson K [-].
    omega : array_like
        Acentric factor [-].

    Returns
    -------
    float or ndarray
        Ideal-gas isobaric heat capacity [J/(kg K)].

    References
    ----------
    Kesler and Lee (1976), Hydrocarbon Processing 55(3), 153-158; API TDB
    procedure 7D4.2; Riazi (2005) MNL50 eq. 7.41.

    Examples
    --------
    >>> round(kesler_lee_ideal_gas_cp(298.15, 12.67, 0.49))
    1630
    """
    T = _arr(T)
    lo, hi, unit = KESLER_LEE_GAS_CP_RANGE["T"]
    warn_validity("Kesler-Lee ideal-gas heat capacity", "temperature", T, lo, hi, unit)
    a0, a1, a2, b0, b1, b2, c = _kl_gas_coeffs(_arr(k_watson), _arr(omega))
    return as_float((a0 + a1 * T + a2 * T ** 2 - c * (b0 + b1 * T + b2 * T ** 2)) * 1e3)


def kesler_lee_ideal_gas_enthalpy(T, k_watson, omega, t_ref=T_REF):
    """Integral of :func:`kesler_lee_ideal_gas_cp` from ``t_ref`` to ``T``.

    Parameters
    ----------
    T : array_like
        Temperature [K].
    k_watson : array_like
        Watson K [-].
    omega : array_like
        Acentric factor [-].
    t_ref : float
        Reference temperature [K].

    Returns
    -------
    float or ndarray
        Sensible enthalpy of the ideal-gas vapour [J/kg].

    References
    ----------
    Kesler and Lee (1976); see :func:`kesler_lee_ideal_gas_cp`.

    Examples
    --------
    >>> round(kesler_lee_ideal_gas_enthalpy(308.15, 12.67, 0.49), -1)
    16520.0
    """
    T = _arr(T)
    a0, a1, a2, b0, b1, b2, c = _kl_gas_coeffs(_arr(k_watson), _arr(omega))
    d1, d2, d3 = T - t_ref, (T ** 2 - t_ref ** 2) / 2, (T ** 3 - t_ref ** 3) / 3
    h = a0 * d1 + a1 * d2 + a2 * d3 - c * (b0 * d1 + b1 * d2 + b2 * d3)
    return as_float(h * 1e3)


def riedel_1954(tb, tc, pc):
    """Molar heat of vaporisation at the normal boiling point, Riedel (1954).

    .. math:: \\Delta H_{vb} = 1.093\\,R\\,T_c\\,T_{br}\\,\\frac{\\ln P_c[\\mathrm{bar}] - 1.013}{0.930 - T_{br}}

    Parameters
    ----------
    tb : array_like
        Normal boiling point [K].
    tc : array_like
        Critical temperature [K].
    pc : array_like
        Critical pressure [Pa].

    Returns
    -------
    float or ndarray
        Heat of vaporisation at Tb [J/mol].

    References
    ----------
    Riedel, L. (1954) Chem. Ing. Tech. 26, 679-683; Poling, Prausnitz and
    O'Connell (2001) *The Properties of Gases and Liquids*, 5th ed., eq. 7-11.4;
    Riazi (2005) MNL50 eq. 7.54.

    Examples
    --------
    Same as chemicals.phase_change.Riedel:

    >>> round(riedel_1954(294.0, 466.0, 5.55e6))
    26829
    """
    tb, tc = _arr(tb), _arr(tc)
    tbr = tb / tc
    return as_float(1.093 * R_GAS * tc * tbr * (np.log(_arr(pc) / 1e5) - 1.013) / (0.930 - tbr))


def watson_1943(T, h_ref, t_ref, tc, exponent=0.38):
    """Heat of vaporisation at ``T`` scaled from a known value, Watson (1943).

    .. math:: \\Delta H(T) = \\Delta H(T_{ref})\\left(\\frac{1 - T/T_c}{1 - T_{ref}/T_c}\\right)^{0.38}

    Parameters
    ----------
    T : array_like
        Temperature [K].
    h_ref : array_like
        Heat of vaporisation at ``t_ref`` [J/mol] (or [J/kg]; same unit out).
    t_ref : array_like
        Temperature of the known value [K].
    tc : array_like
        Critical temperature [K].
    exponent : float
        Watson exponent, 0.38 [-].

    Returns
    -------
    float or ndarray
        Heat of vaporisation at ``T``, zero at and above Tc [J/mol].

    References
    ----------
    Watson, K. M. (1943) Ind. Eng. Chem. 35, 398-406; Riazi (2005) MNL50 eq. 7.59.

    Examples
    --------
    Same as chemicals.phase_change.Watson:

    >>> round(watson_1943(320.0, 43908.0, 300.0, 647.14))
    42929
    """
    tc = _arr(tc)
    ratio = np.clip(1.0 - _arr(T) / tc, 0.0, None) / (1.0 - _arr(t_ref) / tc)
    return as_float(_arr(h_ref) * ratio ** exponent)


# ---------------------------------------------------------------------------
# 6. conductivity, surface tension, viscosity, heating value
# ---------------------------------------------------------------------------
#: Riazi-Faghri 1985 liquid conductivity: fitted 0-300 °F
RIAZI_FAGHRI_RANGE = {"T": (255.37, 422.04, "K")}


def riazi_faghri_1985(T, tb, sg):
    """Thermal conductivity of a liquid petroleum fraction, Riazi-Faghri (1985).

    .. math:: k = A\\,T_b^{B}\\,SG^{C},\\quad t = T[°F]/100,
              A = e^{-4.5093 - 0.6844 t - 0.1305 t^2},
              B = 0.3003 + 0.0918 t + 0.0195 t^2,
              C = 0.0129 + 0.0894 t + 0.0292 t^2

    with k in Btu/(h ft °F) and Tb in °R.

    Parameters
    ----------
    T : array_like
        Temperature [K].
    tb : float
        (Mean average) boiling point [K].
    sg : float
        Specific gravity 60/60 °F [-].

    Returns
    -------
    float or ndarray
        Thermal conductivity [W/(m K)].

    References
    ----------
    Riazi, M. R. and Faghri, A. (1985) "Thermal conductivity of liquid and
    vapor hydrocarbon systems: pentanes and heavier at low pressures",
    Ind. Eng. Chem. Process Des. Dev. 24, 398-401; Riazi (2005) MNL50 eq. 8.71.

    Examples
    --------
    >>> round(riazi_faghri_1985(298.15, 489.5, 0.7526), 3)
    0.135
    """
    T = _arr(T)
    lo, hi, unit = RIAZI_FAGHRI_RANGE["T"]
    warn_validity("Riazi-Faghri 1985 liquid conductivity", "temperature", T, lo, hi, unit)
    t = (_RANKINE * T - 459.67) / 100.0
    a = np.exp(-4.5093 - 0.6844 * t - 0.1305 * t ** 2)
    b = 0.3003 + 0.0918 * t + 0.0195 * t ** 2
    c = 0.0129 + 0.0894 * t + 0.0292 * t ** 2
    return as_float(a * (_RANKINE * _arr(tb)) ** b * _arr(sg) ** c * _BTU_H_FT_F)


def api_10a32_surface_tension(T, tc, k_watson):
    """Surface tension of a petroleum fraction against air, API procedure 10A3.2.

    .. math:: \\sigma\\,[\\mathrm{mN/m}] = 673.7\\left(\\frac{T_c - T}{T_c}\\right)^{1.232} / K_W

    Parameters
    ----------
    T : array_like
        Temperature [K].
    tc : float
        Pseudo-critical temperature of the fraction [K].
    k_watson : float
        Watson K [-].

    Returns
    -------
    float or ndarray
        Surface tension [N/m]; zero at and above Tc.

    References
    ----------
    API Technical Data Book, procedure 10A3.2 (average error about 11 %);
    Riazi (2005) MNL50 eq. 8.86.

    Examples
    --------
    API TDB sample problem (60 °F, Tc = 1334 °R, K = 12.4) gives 29.58 mN/m:

    >>> round(api_10a32_surface_tension(288.7056, 1334 / 1.8, 12.4) * 1e3, 2)
    29.58
    """
    tc = _arr(tc)
    tau = np.clip((tc - _arr(T)) / tc, 0.0, None)
    return as_float(673.7 * tau ** 1.232 / _arr(k_watson) * 1e-3)


#: ASTM D341 (2009 and later) holds its Z(nu) form down to 0.21 mm²/s (from memory)
WALTHER_D341_RANGE = {"nu": (0.21, 2.0e7, "mm²/s")}


def _walther_z(nu_cst):
    nu = _arr(nu_cst)
    return nu + 0.7 + np.exp(-1.47 - 1.84 * nu - 0.51 * nu ** 2)


def _walther_nu(z):
    """nu [mm²/s] from Z: ASTM D341's explicit inverse, then two Newton steps on Z(nu) to round-off."""
    z = _arr(z)
    w = z - 0.7
    nu = w - np.exp(-0.7487 - 3.295 * w + 0.6119 * w ** 2 - 0.3193 * w ** 3)
    for _ in range(2):
        e = np.exp(-1.47 - 1.84 * nu - 0.51 * nu ** 2)
        nu = nu - (nu + 0.7 + e - z) / (1.0 - e * (1.84 + 1.02 * nu))
    return nu


def walther_d341_fit(t1, nu1, t2, nu2):
    """Constants of the Walther equation (ASTM D341) through two viscosity points.

    .. math:: \\log_{10}\\log_{10} Z = A - B\\log_{10} T,\\quad
              Z = \\nu + 0.7 + e^{-1.47 - 1.84\\nu - 0.51\\nu^2}\\ (\\nu\\ \\mathrm{in\\ mm^2/s})

    Parameters
    ----------
    t1, t2 : float
        Temperatures of the two points [K].
    nu1, nu2 : float
        Kinematic viscosities at ``t1`` and ``t2`` [m²/s].

    Returns
    -------
    tuple of float
        ``(A, B)`` of the Walther equation [-].

    References
    ----------
    ASTM D341-20 "Standard practice for viscosity-temperature equations and
    charts for liquid petroleum or hydrocarbon products", eqs. 1-4 (the
    exponential terms extend it to about 0.21 mm²/s).

    Examples
    --------
    >>> a, b = walther_d341_fit(313.15, 25e-6, 373.15, 5e-6)
    >>> round(b, 3)
    3.556
    """
    if not (t1 > 0 and t2 > 0 and t1 != t2):
        raise FuelsysInputError(f"the two viscosity points need different temperatures above 0 K (got {t1} and {t2} K)")
    if not (nu1 > 0 and nu2 > 0):
        raise FuelsysInputError("viscosities must be > 0")
    if (t1 - t2) * (nu1 - nu2) >= 0:
        raise FuelsysInputError(
            f"viscosity must fall as temperature rises (got {nu1 * 1e6:g} mm²/s at {t1 - T0_C:g} °C "
            f"and {nu2 * 1e6:g} mm²/s at {t2 - T0_C:g} °C)")
    ll1 = math.log10(math.log10(float(_walther_z(nu1 * 1e6))))
    ll2 = math.log10(math.log10(float(_walther_z(nu2 * 1e6))))
    b = (ll1 - ll2) / (math.log10(t2) - math.log10(t1))
    a = ll1 + b * math.log10(t1)
    return a, b


def walther_d341(T, a, b):
    """Kinematic viscosity from the Walther equation (ASTM D341).

    Parameters
    ----------
    T : array_like
        Temperature [K].
    a, b : float
        Walther constants from :func:`walther_d341_fit` [-].

    Returns
    -------
    float or ndarray
        Kinematic viscosity [m²/s].

    References
    ----------
    ASTM D341-20, eqs. 1-4; see :func:`walther_d341_fit`.

    Examples
    --------
    >>> a, b = walther_d341_fit(313.15, 25e-6, 373.15, 5e-6)
    >>> round(walther_d341(313.15, a, b) * 1e6, 6)
    25.0
    """
    T = _arr(T)
    z = 10.0 ** (10.0 ** (a - b * np.log10(T)))
    nu = _walther_nu(z)
    lo, hi, unit = WALTHER_D341_RANGE["nu"]
    warn_validity("Walther equation (ASTM D341)", "kinematic viscosity", nu, lo, hi, unit)
    return as_float(nu * 1e-6)


def cragoe_1929_lhv(sg):
    """Net (lower) heat of combustion of a petroleum liquid from its gravity, Cragoe (1929).

    .. math:: LHV\\,[\\mathrm{MJ/kg}] = 46.423 - 8.792\\,SG^2 + 3.170\\,SG

    Parameters
    ----------
    sg : array_like
        Specific gravity 60/60 °F [-].

    Returns
    -------
    float or ndarray
        Lower heating value [J/kg].

    References
    ----------
    Cragoe, C. S. (1929) "Thermal properties of petroleum products", US Bureau
    of Standards Misc. Publ. 97; in SI as in Riazi (2005) MNL50 §7.8
    (coefficients from memory).

    Examples
    --------
    >>> round(cragoe_1929_lhv(0.8) / 1e6, 2)
    43.33
    """
    sg = _arr(sg)
    return as_float((46.423 - 8.792 * sg ** 2 + 3.170 * sg) * 1e6)


def stoich_far_from_composition(w_c, w_h, w_o=0.0):
    """Stoichiometric fuel/air mass ratio of a C-H-O fuel in dry air.

    Parameters
    ----------
    w_c, w_h, w_o : array_like
        Mass fractions of carbon, hydrogen and oxygen in the fuel [-].

    Returns
    -------
    float or ndarray
        Stoichiometric fuel/air ratio [kg/kg].

    References
    ----------
    Combustion stoichiometry, C + O2 -> CO2, 2 H2 + O2 -> 2 H2O; dry-air O2
    content of Lemmon et al. (2000), J. Phys. Chem. Ref. Data 29, 331-385.

    Examples
    --------
    n-Decane, C10H22 (textbook air/fuel ratio 15.0):

    >>> round(1 / stoich_far_from_composition(0.8442, 0.1558), 2)
    15.07
    """
    o2 = _arr(w_c) / M_C * M_O2 + _arr(w_h) / (4 * M_H) * M_O2 - _arr(w_o)
    return as_float(W_O2_AIR / o2)


# ---------------------------------------------------------------------------
# 7. the flash: Raoult's law, air inert, oil non-volatile (Rachford-Rice)
# ---------------------------------------------------------------------------
#: Raoult's law with an ideal vapour: low pressures (common practice, no source for the exact bound)
RAOULT_RANGE = {"P": (1.0e3, 1.0e6, "Pa")}


def _rr_residual(a, K, z, za, zh):
    """Rachford-Rice residual in alpha = liquid moles / feed moles, and its derivative d/d alpha."""
    den = K + a[..., None] * (1.0 - K)
    with np.errstate(divide="ignore", invalid="ignore"):
        f = np.sum(z * (K - 1.0) / den, axis=-1)
        df = np.sum(z * (K - 1.0) ** 2 / den ** 2, axis=-1)
        f = f + np.where(za > 0, za / (1.0 - a), 0.0) - np.where(zh > 0, zh / a, 0.0)
        df = df + np.where(za > 0, za / (1.0 - a) ** 2, 0.0) + np.where(zh > 0, zh / a ** 2, 0.0)
    return f, df


def raoult_flash(K, z, za, zh, tol=1e-14, maxiter=200):
    """Isothermal flash of a liquid with an inert gas and a non-volatile liquid.

    Rachford-Rice form in the liquid mole fraction of the feed ``alpha``:

    .. math:: \\frac{z_a}{1-\\alpha} + \\sum_i \\frac{z_i (K_i - 1)}{K_i + \\alpha (1 - K_i)}
              - \\frac{z_h}{\\alpha} = 0

    The air (``z_a``, K infinite) never dissolves, the heavy oil (``z_h``, K
    zero) never vaporises.  The left side rises monotonically in ``alpha``;
    the root is bracketed in (z_h, 1 - z_a) and found by Newton steps
    safeguarded by bisection -- vectorised, no loop over points.

    Parameters
    ----------
    K : ndarray
        K-values (vapour pressure / total pressure) of the volatile
        components, shape (..., N) [-].
    z : ndarray
        Feed mole fractions of the volatile components, shape (..., N) or (N,) [-].
    za : ndarray
        Feed mole fraction of air, shape (...) [-].
    zh : ndarray
        Feed mole fraction of the non-volatile liquid, shape (...) [-].
    tol : float
        Tolerance on alpha [-].
    maxiter : int
        Iteration limit [-].

    Returns
    -------
    alpha : ndarray
        Liquid moles / feed moles, shape (...) [-] (1 below the bubble point
        without air, 0 when all vaporised).
    vap : ndarray
        Vapour moles of each volatile component / feed moles, shape (..., N) [-].

    References
    ----------
    Rachford, H. H. and Rice, J. D. (1952) "Procedure for use of electronic
    digital computers in calculating flash vaporization hydrocarbon
    equilibrium", J. Petrol. Technol. 4(10), 19-20.  The air and oil terms
    are the standard equation's limits K -> infinity and K = 0.

    Examples
    --------
    >>> import numpy as np
    >>> a, v = raoult_flash(np.array([2.0, 0.5]), np.array([0.5, 0.5]), np.array(0.0), np.array(0.0))
    >>> round(float(a), 6)
    0.5
    """
    K = np.asarray(K, dtype=float)
    shape = K.shape[:-1]
    z = np.broadcast_to(np.asarray(z, dtype=float), K.shape)
    za = np.broadcast_to(np.asarray(za, dtype=float), shape)
    zh = np.broadcast_to(np.asarray(zh, dtype=float), shape)
    # bracket: the oil stays liquid (alpha > z_h), the air stays vapour (alpha < 1 - z_a)
    lo = np.array(zh, dtype=float, copy=True)
    hi = 1.0 - za
    no_air, no_oil = za <= 0, zh <= 0
    # ends: without oil, f(0) = 1 - sum z/K >= 0 means all vaporised (dew point passed);
    # without air, f(1) = sum z (K - 1) - z_h <= 0 means all liquid (below the bubble point)
    with np.errstate(divide="ignore", invalid="ignore"):
        f_0 = za + np.sum(z * (K - 1.0) / K, axis=-1)
    f_1 = np.sum(z * (K - 1.0), axis=-1) - zh
    all_vap = no_oil & (f_0 >= 0)
    all_liq = no_air & (f_1 <= 0)
    active = ~(all_vap | all_liq)
    a = 0.5 * (lo + hi)
    # iterate on the unfinished points only (flattened), so the cost follows the points
    # that still need steps rather than the slowest one
    a_f, lo_f, hi_f = a.reshape(-1).copy(), lo.reshape(-1).copy(), hi.reshape(-1).copy()
    n_comp = K.shape[-1]
    K_f, z_f = K.reshape(-1, n_comp), z.reshape(-1, n_comp)
    za_f, zh_f = za.reshape(-1), zh.reshape(-1)
    idx = np.flatnonzero(active.reshape(-1))
    for _ in range(maxiter):
        if idx.size == 0:
            break
        ai, li, hi_i = a_f[idx], lo_f[idx], hi_f[idx]
        f, df = _rr_residual(ai, K_f[idx], z_f[idx], za_f[idx], zh_f[idx])
        pos = f > 0
        hi_i = np.where(pos, ai, hi_i)
        li = np.where(pos, li, ai)
        with np.errstate(divide="ignore", invalid="ignore"):
            an = ai - f / df
        bad = ~np.isfinite(an) | (an <= li) | (an >= hi_i)
        an = np.where(bad, 0.5 * (li + hi_i), an)
        done = (np.abs(an - ai) < tol) | (hi_i - li < tol)
        a_f[idx], lo_f[idx], hi_f[idx] = an, li, hi_i
        idx = idx[~done]
    a = a_f.reshape(shape)
    alpha = np.where(all_vap, 0.0, np.where(all_liq, 1.0, a))
    a = alpha[..., None]
    with np.errstate(divide="ignore", invalid="ignore"):
        vap = z * K * (1.0 - a) / (K + a * (1.0 - K))
    vap = np.where(all_vap[..., None], z, np.where(all_liq[..., None], 0.0, vap))
    return alpha, vap


def _solve_increasing(fun, lo, hi, x0, tol=1e-9, maxiter=100):
    """Vectorised bracketed Newton for g(x) = 0 with g increasing; fun returns (g, dg/dx)."""
    x = np.clip(x0, lo, hi)
    lo, hi = lo.copy(), hi.copy()
    active = np.ones(x.shape, dtype=bool)
    for _ in range(maxiter):
        g, dg = fun(x)
        pos = g > 0
        hi = np.where(active & pos, x, hi)
        lo = np.where(active & ~pos, x, lo)
        with np.errstate(divide="ignore", invalid="ignore"):
            xn = x - g / dg
        bad = ~np.isfinite(xn) | (xn <= lo) | (xn >= hi)
        xn = np.where(bad, 0.5 * (lo + hi), xn)
        done = np.abs(xn - x) < tol * np.abs(x)
        x = np.where(active, xn, x)
        active = active & ~done
        if not np.any(active):
            break
    return x


# ---------------------------------------------------------------------------
# 8. the fuel
# ---------------------------------------------------------------------------
#: default pseudo-component cut boundaries in liquid volume per cent distilled
#: (12 components, finer at both ends where the light end sets the bubble point
#: and the heavy end the dew point)
DEFAULT_CUTS = (0, 3, 10, 20, 30, 40, 50, 60, 70, 80, 90, 97, 100)
#: upper limit of the liquid model in reduced temperature of the lightest component
TR_LIQUID_MAX = 0.95
#: temperature limit of the vapour side of the flash (Kesler-Lee ideal-gas cp fitted to 922 K)
T_VAPOUR_MAX = 1000.0


class PetroleumFuel(Fuel):
    """A kerosene-type fuel characterised from its data sheet.

    Parameters
    ----------
    name : str
        Name of the fuel [-].
    density_15c : float
        Liquid density at 15 °C [kg/m³].
    d86 : dict
        ASTM D86 points: volume per cent distilled (0 = IBP, 10, 30, 50, 70,
        90, 95, 100 = FBP) -> temperature [K]; 10, 50 and 90 % are required.
        A missing IBP or FBP is taken from Riazi's (1989) distribution model
        fitted to the other TBP points (its T0, and its 99 % point for the end).
        Pass None together with ``tbp`` to give the true boiling curve directly.
    viscosity_points : sequence
        Two pairs (temperature [K], kinematic viscosity [m²/s]).
    lhv : float, optional
        Lower heating value [J/kg]; by Cragoe (1929) from the density if not given.
    freezing_point : float, optional
        Freezing point [K], the lower limit of the liquid model; if not given,
        the lower viscosity-point temperature (no extrapolation below data).
    flash_point : float, optional
        Flash point [K] (shown by :meth:`info`, not used in the model).
    hydrogen_mass_fraction : float, optional
        Hydrogen content [kg/kg]; by Riazi-Daubert (1987) C/H ratio if not given.
    cuts : sequence of float
        Pseudo-component boundaries in volume per cent, 0 ... 100 [%].
    sources : dict, optional
        Source text of each datum, shown by :meth:`info`.
    tbp : dict, optional
        True boiling points instead of D86: volume per cent (0..100, both ends
        required) -> temperature [K], e.g. from a simulated distillation.

    Notes
    -----
    Model limits: liquid properties from the freezing point up to
    ``TR_LIQUID_MAX`` (0.95) times the critical temperature of the lightest
    pseudo-component (the edge of the critical region);  the flash up to
    1000 K (vapour side) at pressures below the lowest component critical
    pressure.  Raoult's law makes the liquid an ideal solution and the vapour
    an ideal gas -- good at the low pressures of a small turbine's fuel
    system (a few bar), increasingly approximate above 10 bar.

    References
    ----------
    Riazi (2005) MNL50 chapters 2-8; see the module docstring and each
    correlation's function.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> round(get_fuel("kerosene").density(288.15), 1)
    800.0
    """

    kind = "liquid"

    def __init__(self, name, density_15c, d86, viscosity_points, lhv=None, freezing_point=None,
                 flash_point=None, hydrogen_mass_fraction=None, cuts=DEFAULT_CUTS, sources=None, tbp=None):
        self.name = str(name)
        self.sources = dict(sources or {})
        self.density_15c = float(density_15c)
        if not 500.0 <= self.density_15c <= 1100.0:
            raise FuelsysInputError(f"density at 15 °C must be 500..1100 kg/m³ for a petroleum liquid "
                                    f"(got {self.density_15c:g})")
        self.sg = self.density_15c / RHO_WATER_15C
        if tbp is not None:
            self.d86 = {}
            self._set_tbp({float(k): float(v) for k, v in tbp.items()})
        else:
            self.d86 = {int(k): float(v) for k, v in sorted(d86.items())}
            self._build_tbp()
        self._build_components(cuts)
        # viscosity
        (t1, n1), (t2, n2) = viscosity_points
        self.viscosity_points = ((float(t1), float(n1)), (float(t2), float(n2)))
        self.walther_a, self.walther_b = walther_d341_fit(float(t1), float(n1), float(t2), float(n2))
        # limits
        self.freezing_point = None if freezing_point is None else float(freezing_point)
        self.flash_point = None if flash_point is None else float(flash_point)
        self.t_min = self.freezing_point if self.freezing_point is not None else min(float(t1), float(t2))
        self.t_max = TR_LIQUID_MAX * float(self.tc.min())
        if self.t_min >= self.t_max:
            raise FuelsysInputError(f"freezing point {self.t_min - T0_C:.1f} °C is above the liquid range's top "
                                    f"{self.t_max - T0_C:.1f} °C")
        self.p_max = float(self.pc.min())
        # density calibration to the measured value at 15 °C
        self._rho_cal = 1.0
        self._rho_cal = self.density_15c / self._density_raw(np.array(288.15))
        # heating value and stoichiometry
        self.lhv_given = lhv is not None
        self.lhv = float(lhv) if lhv is not None else float(cragoe_1929_lhv(self.sg))
        if not 30e6 <= self.lhv <= 50e6:
            raise FuelsysInputError(f"lower heating value must be 30..50 MJ/kg (got {self.lhv / 1e6:g})")
        if hydrogen_mass_fraction is None:
            ch = riazi_daubert_1987_ch_ratio(self.tb, self.sg_i)
            self.hydrogen = float(np.sum(self.w / (1.0 + ch)))
            self.hydrogen_given = False
        else:
            self.hydrogen = float(hydrogen_mass_fraction)
            self.hydrogen_given = True
            if not 0.05 <= self.hydrogen <= 0.2:
                raise FuelsysInputError(f"hydrogen content must be 5..20 % by mass (got {self.hydrogen * 100:g})")
        self.stoich_far = float(stoich_far_from_composition(1.0 - self.hydrogen, self.hydrogen))

    # -- construction ---------------------------------------------------
    def _build_tbp(self):
        d86 = self.d86
        for need in (10, 50, 90):
            if need not in d86:
                raise FuelsysInputError(f"D86 {need} % point is required (given: "
                                        f"{', '.join(str(p) for p in d86) or 'none'} %)")
        pcts = sorted(d86)
        temps = [d86[p] for p in pcts]
        if any(b <= a for a, b in zip(temps, temps[1:])):
            raise FuelsysInputError("D86 temperatures must rise with per cent distilled "
                                    f"(got {', '.join(f'{p} %: {d86[p] - T0_C:g} °C' for p in pcts)})")
        tbp = {p: float(riazi_daubert_1986_d86_to_tbp(p, d86[p])) for p in pcts}
        inner = [p for p in pcts if 0 < p < 100]
        if 0 not in tbp or 100 not in tbp:
            t0, a, b = riazi_1989_fit(inner, [tbp[p] for p in inner])
            if 0 not in tbp:
                tbp[0] = min(t0, tbp[inner[0]] - 1.0)
            if 100 not in tbp:
                tbp[100] = max(float(riazi_1989_temperature(99.0, t0, a, b)), tbp[inner[-1]] + 1.0)
        self._set_tbp(tbp)

    def _set_tbp(self, tbp):
        pts = sorted(tbp)
        vals = [tbp[p] for p in pts]
        if pts[0] != 0 or pts[-1] != 100:
            raise FuelsysInputError("a true boiling curve needs its 0 % and 100 % points")
        if any(b <= a for a, b in zip(vals, vals[1:])):
            raise FuelsysInputError("the true boiling curve does not rise steadily; check the distillation points")
        self.tbp = dict(zip(pts, vals))
        self._tbp_x = np.array(pts, dtype=float)
        self._tbp_t = np.array(vals, dtype=float)

    def tbp_temperature(self, pct):
        """True boiling point curve (piecewise linear through the converted points).

        Parameters
        ----------
        pct : array_like
            Liquid volume per cent distilled, 0..100 [%].

        Returns
        -------
        float or ndarray
            TBP temperature [K].
        """
        return as_float(np.interp(_arr(pct), self._tbp_x, self._tbp_t))

    def _build_components(self, cuts):
        cuts = np.asarray(cuts, dtype=float)
        if cuts[0] != 0 or cuts[-1] != 100 or np.any(np.diff(cuts) <= 0) or cuts.size < 3:
            raise FuelsysInputError("cuts must rise from 0 to 100 % with at least two components")
        # mean boiling point of each cut: average of the TBP curve over the cut
        s = np.linspace(0.0, 1.0, 41)
        xs = cuts[:-1, None] + s[None, :] * np.diff(cuts)[:, None]
        tb = np.trapezoid(np.interp(xs, self._tbp_x, self._tbp_t), s, axis=1)
        v = np.diff(cuts) / 100.0
        # one Watson K so that the volume-average gravity is the fuel's own
        k = float(np.sum(v * (_RANKINE * tb) ** (1.0 / 3.0)) / self.sg)
        sg_i = (_RANKINE * tb) ** (1.0 / 3.0) / k
        m, tc, pc = critical_properties(tb, sg_i)
        omega = kesler_lee_omega(tb, tc, pc, k)
        # Z_RA through each component's own density at 60 °F
        vm60 = m / (sg_i * RHO_WATER_60F)
        z_ra = rackett_z_ra_from_volume(T_60F, vm60, tc, pc)
        w = v * sg_i / np.sum(v * sg_i)
        n = w / m
        self.cuts = cuts
        self.v, self.w, self.tb, self.sg_i = v, w, tb, sg_i
        self.k_watson = k
        self.m, self.tc, self.pc, self.omega, self.z_ra = m, tc, pc, omega, z_ra
        self.n = n  # mol per kg of fuel
        self.x = n / n.sum()
        self.molar_mass = float(1.0 / n.sum())
        # bulk characterisation (Riazi 2005 §3.3.3: MeABP = (MABP + CABP)/2)
        mabp = float(np.sum(self.x * tb))
        cabp = float(np.sum(v * tb ** (1.0 / 3.0)) ** 3)
        self.meabp = 0.5 * (mabp + cabp)
        self.vabp = float(np.sum(v * tb))
        self.tpc = float(np.sum(self.x * tc))  # Kay's rule
        self.k_bulk = float(watson_k(self.meabp, self.sg))
        self.hvap_b = riedel_1954(tb, tc, pc)  # J/mol at Tb

    # -- liquid properties ------------------------------------------------
    def _density_raw(self, T):
        vm = rackett_spencer_danner(T[..., None], self.tc, self.pc, self.z_ra)
        return 1.0 / np.sum(self.w * vm / self.m, axis=-1) * self._rho_cal

    def density(self, T):
        """Liquid density [kg/m³] at ``T`` [K].

        Rackett/Spencer-Danner volume of each pseudo-component (Z_RA fitted to
        its gravity), ideal volume-additive mixing, scaled to the fuel's
        measured density at 15 °C.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Density [kg/m³].

        References
        ----------
        Spencer and Danner (1972); Riazi (2005) MNL50 §5.9.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 780 < get_fuel("kerosene").density(313.15) < 800
        True
        """
        T = self.check_temperature(T)
        return as_float(self._density_raw(T))

    def kinematic_viscosity(self, T):
        """Kinematic viscosity [m²/s] at ``T`` [K], Walther equation (ASTM D341) through two measured points.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Kinematic viscosity [m²/s].

        References
        ----------
        ASTM D341-20; see :func:`walther_d341`.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 1e-6 < get_fuel("kerosene").kinematic_viscosity(313.15) < 2e-6
        True
        """
        T = self.check_temperature(T)
        return walther_d341(T, self.walther_a, self.walther_b)

    def specific_heat(self, T):
        """Liquid heat capacity [J/(kg K)] at ``T`` [K]: Kesler-Lee (1976), mass average of the components.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Isobaric specific heat [J/(kg K)].

        References
        ----------
        Kesler and Lee (1976); see :func:`kesler_lee_liquid_cp`.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 1800 < get_fuel("kerosene").specific_heat(298.15) < 2200
        True
        """
        T = self.check_temperature(T)
        tr = T[..., None] / self.tc
        lo, hi, unit = KESLER_LEE_LIQUID_CP_RANGE["Tr"]
        warn_validity("Kesler-Lee liquid heat capacity", "reduced temperature", tr, lo, hi, unit)
        cp = kesler_lee_liquid_cp(T[..., None], self.k_watson, self.sg_i)
        return as_float(np.sum(self.w * cp, axis=-1))

    def conductivity(self, T):
        """Liquid thermal conductivity [W/(m K)] at ``T`` [K], Riazi-Faghri (1985) at the mean average boiling point.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Thermal conductivity [W/(m K)].

        References
        ----------
        Riazi and Faghri (1985); see :func:`riazi_faghri_1985`.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 0.10 < get_fuel("kerosene").conductivity(298.15) < 0.15
        True
        """
        T = self.check_temperature(T)
        return riazi_faghri_1985(T, self.meabp, self.sg)

    def surface_tension(self, T):
        """Surface tension against air [N/m] at ``T`` [K], API procedure 10A3.2 (pseudo-critical Tc, Watson K).

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Surface tension [N/m].

        References
        ----------
        API TDB procedure 10A3.2; see :func:`api_10a32_surface_tension`.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 0.020 < get_fuel("kerosene").surface_tension(298.15) < 0.030
        True
        """
        T = self.check_temperature(T)
        return api_10a32_surface_tension(T, self.tpc, self.k_bulk)

    # -- phase behaviour ------------------------------------------------
    def _psat(self, T):
        """Component vapour pressures [Pa], shape (..., N) (no range check)."""
        tr = T[..., None] / self.tc
        f0, f1 = _lk_f0_f1(tr)
        return self.pc * np.exp(f0 + self.omega * f1)

    def _lnpsat_and_slope(self, T):
        tr = T[..., None] / self.tc
        f0, f1 = _lk_f0_f1(tr)
        d0, d1 = _lk_df0_df1(tr)
        lnp = np.log(self.pc) + f0 + self.omega * f1
        return lnp, (d0 + self.omega * d1) / self.tc

    def _liquid_x(self, n_heavy=0.0):
        """Liquid mole fractions of the volatile components with ``n_heavy`` mol/kg of non-volatile liquid."""
        return self.n / (self.n.sum() + n_heavy)

    def _check_lk(self, T):
        lo, hi, unit = LEE_KESLER_RANGE["Tr"]
        warn_validity("Lee-Kesler vapour pressure", "reduced temperature",
                      np.asarray(T)[..., None] / self.tc, lo, hi, unit)

    def _vapour_pressure(self, T, x):
        T = self.check_temperature(T)
        self._check_lk(T)
        return as_float(np.sum(x * self._psat(T), axis=-1))

    def vapour_pressure(self, T):
        """True vapour (bubble-point) pressure [Pa] at ``T`` [K]: Raoult's law over the pseudo-components.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Bubble-point pressure [Pa abs].

        References
        ----------
        Lee and Kesler (1975) for each component; Raoult's law.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 100 < get_fuel("kerosene").vapour_pressure(298.15) < 2000
        True
        """
        return self._vapour_pressure(T, self.x)

    def _latent(self, T):
        hv = watson_1943(T[..., None], self.hvap_b, self.tb, self.tc)  # J/mol
        return hv / self.m  # J/kg per component

    def latent_heat(self, T):
        """Heat of vaporisation [J/kg] at ``T`` [K]: Riedel (1954) at each component's Tb, Watson scaling, mass average.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Heat of vaporisation of the whole fuel, liquid to vapour at ``T`` [J/kg].

        References
        ----------
        Riedel (1954); Watson (1943); see :func:`riedel_1954`, :func:`watson_1943`.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 250e3 < get_fuel("kerosene").latent_heat(298.15) < 400e3
        True
        """
        T = self.check_temperature(T)
        return as_float(np.sum(self.w * self._latent(T), axis=-1))

    def _check_pressure(self, P, what="pressure"):
        P = np.asarray(P, dtype=float)
        if np.any(~np.isfinite(P)) or np.any(P <= 0):
            bad = P[~np.isfinite(P) | (P <= 0)].flat[0]
            raise FuelsysInputError(f"{what} must be > 0 Pa abs (got {bad:g} Pa)")
        if np.any(P >= self.p_max):
            bad = P[P >= self.p_max].flat[0]
            raise FuelsysInputError(
                f"{what} {bad / 1e5:.3g} bar abs is at or above {self.name}'s critical region "
                f"(lowest pseudo-component critical pressure {self.p_max / 1e5:.3g} bar); allowed < {self.p_max / 1e5:.3g} bar")
        lo, hi, unit = RAOULT_RANGE["P"]
        warn_validity("Raoult's law (ideal solution, ideal gas)", "pressure", P, lo, hi, unit)
        return P

    def _bubble_point(self, P, x):
        P = self._check_pressure(P)
        lnp_target = np.log(P)

        def g(T):
            lnp, slope = self._lnpsat_and_slope(T)
            pi = x * np.exp(lnp)
            s = pi.sum(axis=-1)
            return np.log(s) - lnp_target, (pi * slope).sum(axis=-1) / s

        lo = np.full(P.shape, 100.0)
        hi = np.full(P.shape, float(self.tc.max()) * 1.5)
        T = _solve_increasing(g, lo, hi, np.full(P.shape, float(np.sum(self.x * self.tb))))
        self._check_lk(T)
        return as_float(T)

    def bubble_point(self, P):
        """Bubble-point temperature [K] of the liquid at pressure ``P`` [Pa abs] (no air).

        Parameters
        ----------
        P : array_like
            Pressure [Pa abs].

        Returns
        -------
        float or ndarray
            Bubble-point temperature [K].

        References
        ----------
        Raoult's law with Lee-Kesler (1975) vapour pressures.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 400 < get_fuel("kerosene").bubble_point(101325) < 460
        True
        """
        return self._bubble_point(P, self.x)

    def _dew_point_partial(self, Pf):
        """Dew point of the fuel vapour (volatile part) at fuel partial pressure ``Pf``."""
        y = self.x / self.x.sum()
        lnp_f = np.log(Pf)

        def g(T):  # ln(P sum y/Psat) decreasing in T -> negate
            lnp, slope = self._lnpsat_and_slope(T)
            q = y * np.exp(-lnp)
            s = q.sum(axis=-1)
            return -(lnp_f + np.log(s)), (q * slope).sum(axis=-1) / s

        lo = np.full(Pf.shape, 100.0)
        hi = np.full(Pf.shape, float(self.tc.max()) * 1.5)
        T = _solve_increasing(g, lo, hi, np.full(Pf.shape, float(self.tb.max())))
        self._check_lk(T)
        return T

    def _air_moles(self, far, mass=1.0):
        """Air moles per kg of liquid for fuel/air ratio ``far`` (inf: no air)."""
        far = np.asarray(far, dtype=float)
        if np.any(np.isnan(far)) or np.any(far <= 0):
            bad = far[np.isnan(far) | (far <= 0)].flat[0]
            raise FuelsysInputError(f"fuel/air ratio must be > 0 kg/kg (got {bad:g})")
        with np.errstate(divide="ignore"):
            return mass / (far * M_AIR)

    def dew_point(self, P, far=None):
        """Dew-point temperature [K] at ``P`` [Pa abs], of the pure vapour or of a fuel-air mixture.

        Parameters
        ----------
        P : array_like
            Pressure [Pa abs].
        far : array_like, optional
            Fuel/air mass ratio [kg/kg]; None for the pure fuel vapour.

        Returns
        -------
        float or ndarray
            Dew-point temperature [K].

        Notes
        -----
        With air the vapour's fuel partial pressure is ``P y_fuel``, so the dew
        point is the pure vapour's at that partial pressure (Raoult/Dalton).

        References
        ----------
        Raoult's law with Lee-Kesler (1975) vapour pressures.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> k = get_fuel("kerosene")
        >>> k.dew_point(101325, 0.05) < k.dew_point(101325)
        True
        """
        P = self._check_pressure(P)
        if far is None:
            return as_float(self._dew_point_partial(P))
        P, far = np.broadcast_arrays(P, np.asarray(far, dtype=float))
        n_air = self._air_moles(far)
        nf = self.n.sum()
        return as_float(self._dew_point_partial(P * nf / (nf + n_air)))

    def _check_flash_temperature(self, T):
        T = np.asarray(T, dtype=float)
        if np.any(~np.isfinite(T)):
            raise FuelsysInputError("temperature must be a finite number [K]")
        if np.any(T < self.t_min) or np.any(T > T_VAPOUR_MAX):
            bad = T[(T < self.t_min) | (T > T_VAPOUR_MAX)].flat[0]
            raise FuelsysInputError(f"temperature {bad - T0_C:.1f} °C is outside {self.name}'s range for "
                                    f"evaporation {self.t_min - T0_C:.1f}..{T_VAPOUR_MAX - T0_C:.1f} °C")
        return T

    def flash(self, T, P, far, n_heavy=0.0, volatile_share=1.0):
        """Equilibrium of the fuel with air at ``T`` [K], ``P`` [Pa abs] and fuel/air ratio ``far`` [kg/kg].

        Parameters
        ----------
        T : array_like
            Temperature [K].
        P : array_like
            Pressure [Pa abs].
        far : array_like
            Fuel/air mass ratio [kg/kg] (``inf`` for no air).
        n_heavy : float
            Moles of non-volatile liquid per kg of the (blended) liquid [mol/kg].
        volatile_share : float
            Mass fraction of this fuel in the (blended) liquid [kg/kg].

        Returns
        -------
        dict
            ``vaporised``: vaporised mass fraction of the liquid [kg/kg];
            ``vap_mass``: vaporised mass of each component per kg liquid,
            shape (..., N) [kg/kg]; ``alpha``: liquid share of all moles [-].

        References
        ----------
        Raoult's law; Rachford and Rice (1952); see :func:`raoult_flash`.
        """
        T = self._check_flash_temperature(T)
        P = self._check_pressure(P)
        T, P, far = np.broadcast_arrays(T, P, np.asarray(far, dtype=float))
        n_air = self._air_moles(far)
        shape = T.shape
        Tf, Pf, na = T.ravel(), P.ravel(), n_air.ravel()
        nf = self.n * volatile_share
        with np.errstate(invalid="ignore"):
            ntot = nf.sum() + n_heavy + na
            za = np.where(np.isinf(na), 1.0, na / ntot)
        z = np.where(np.isinf(na)[:, None], 0.0, nf[None, :] / ntot[:, None])
        zh = np.where(np.isinf(na), 0.0, n_heavy / ntot)
        with np.errstate(over="ignore"):
            K = self._psat(Tf) / Pf[:, None]
        alpha, vap = raoult_flash(K, z, za, zh)
        # vapour moles per kg liquid = vap * ntot; infinite air -> all vaporised
        inf_air = np.isinf(na)
        vap_mol = np.where(inf_air[:, None], nf[None, :], vap * np.where(inf_air, 0.0, ntot)[:, None])
        vap_mass = vap_mol * self.m
        vaporised = np.clip(vap_mass.sum(axis=-1), 0.0, volatile_share)
        # above the liquid range Lee-Kesler is extrapolated past Tc; that matters only where more
        # than a trace (0.1 %) of the fuel is left liquid -- where it is all vapour the answer
        # stands whatever the exact K-values
        wet_hot = (Tf > self.t_max) & (vaporised < 0.999 * volatile_share)
        if np.any(wet_hot):
            lo, hi, unit = LEE_KESLER_RANGE["Tr"]
            warn_validity("Lee-Kesler vapour pressure (liquid left above the liquid range)",
                          "reduced temperature", Tf[wet_hot][:, None] / self.tc, lo, hi, unit)
        return {"vaporised": vaporised.reshape(shape), "vap_mass": vap_mass.reshape(shape + (self.m.size,)),
                "alpha": alpha.reshape(shape)}

    def vapour_fraction(self, T, P, far):
        """Equilibrium vaporised mass fraction [0..1] at ``T`` [K], ``P`` [Pa abs], fuel/air ratio ``far`` [kg/kg].

        Parameters
        ----------
        T : array_like
            Temperature [K].
        P : array_like
            Pressure [Pa abs].
        far : array_like
            Fuel/air mass ratio [kg/kg]; ``inf`` for the fuel alone.

        Returns
        -------
        float or ndarray
            Vaporised mass fraction of the fuel [kg/kg].

        References
        ----------
        Raoult's law with air as inert carrier; Rachford and Rice (1952).

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> get_fuel("kerosene").vapour_fraction(700.0, 101325, 0.05)
        1.0
        """
        return as_float(self.flash(T, P, far)["vaporised"])

    def _vapour_enthalpy(self, T):
        """Enthalpy of each component's ideal-gas vapour [J/kg], liquid at 298.15 K = 0."""
        h25 = watson_1943(T_REF, self.hvap_b, self.tb, self.tc) / self.m
        return h25 + kesler_lee_ideal_gas_enthalpy(T[..., None], self.k_watson, self.omega)

    def _liquid_enthalpy(self, T):
        return kesler_lee_liquid_enthalpy(T[..., None], self.k_watson, self.sg_i)

    def enthalpy(self, T, P, far):
        """Enthalpy of the fuel at equilibrium [J/kg of fuel], liquid at 298.15 K = 0.

        Liquid part: Kesler-Lee liquid heat capacity from 298.15 K; vaporised
        part: latent heat at 298.15 K (Riedel/Watson) plus Kesler-Lee
        ideal-gas heat capacity to ``T``; shares from the flash.

        Parameters
        ----------
        T : array_like
            Temperature [K].
        P : array_like
            Pressure [Pa abs].
        far : array_like
            Fuel/air mass ratio [kg/kg].

        Returns
        -------
        float or ndarray
            Specific enthalpy [J/kg].

        References
        ----------
        Kesler and Lee (1976); Riedel (1954); Watson (1943).

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> abs(get_fuel("kerosene").enthalpy(298.15, 101325, 1e3)) < 2e3
        True
        """
        fl = self.flash(T, P, far)
        T = np.broadcast_to(np.asarray(T, dtype=float), fl["vaporised"].shape)
        vap = fl["vap_mass"]
        liq = self.w - vap
        h = np.sum(liq * self._liquid_enthalpy(T) + vap * self._vapour_enthalpy(T), axis=-1)
        return as_float(h)

    def vapour_specific_heat(self, T):
        """Ideal-gas heat capacity of the fuel vapour [J/(kg K)] at ``T`` [K], Kesler-Lee (1976).

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Ideal-gas isobaric specific heat [J/(kg K)].

        References
        ----------
        Kesler and Lee (1976); see :func:`kesler_lee_ideal_gas_cp`.

        Examples
        --------
        >>> from fuelsys.fuels import get_fuel
        >>> 1400 < get_fuel("kerosene").vapour_specific_heat(300.0) < 1800
        True
        """
        T = np.asarray(T, dtype=float)
        if np.any(~np.isfinite(T)) or np.any(T <= 0):
            raise FuelsysInputError("temperature must be a finite number > 0 K")
        cp = kesler_lee_ideal_gas_cp(T[..., None], self.k_watson, self.omega)
        return as_float(np.sum(self.w * cp, axis=-1))

    # -- blends and description ------------------------------------------
    def with_oil(self, oil_pct: float) -> Fuel:
        """This fuel with ``oil_pct`` per cent by volume of the built-in turbine oil (0..20).

        Parameters
        ----------
        oil_pct : float
            Oil share by volume [%].

        Returns
        -------
        Fuel
            The fuel itself for 0, else a cached :class:`fuelsys.fuels.blend.OilBlend`.

        References
        ----------
        See :mod:`fuelsys.fuels.blend`.
        """
        from fuelsys.fuels.blend import blend_with_oil

        return blend_with_oil(self, oil_pct)

    def info(self):
        """Rows (label, value, unit) describing the fuel and its characterisation."""
        rows = [("name", self.name, ""), ("kind", "petroleum liquid (pseudo-components)", ""),
                ("density at 15 °C", self.density_15c, "kg/m³"),
                ("lower heating value", self.lhv / 1e6, "MJ/kg"),
                ("heating value source", self.sources.get("lhv", "given") if self.lhv_given
                 else "Cragoe (1929) from density", ""),
                ("stoichiometric fuel/air ratio", self.stoich_far, "kg/kg"),
                ("hydrogen content", self.hydrogen * 100, "% mass"),
                ("mean molar mass", self.molar_mass * 1e3, "g/mol"),
                ("Watson K", self.k_watson, "-"),
                ("mean average boiling point", self.meabp - T0_C, "°C"),
                ("pseudo-critical temperature", self.tpc - T0_C, "°C")]
        if self.freezing_point is not None:
            rows.append(("freezing point", self.freezing_point - T0_C, "°C"))
        if self.flash_point is not None:
            rows.append(("flash point", self.flash_point - T0_C, "°C"))
        for p, t in self.d86.items():
            rows.append((f"D86 {'IBP' if p == 0 else 'FBP' if p == 100 else f'{p} %'}", t - T0_C, "°C"))
        for (t, nu) in self.viscosity_points:
            rows.append((f"viscosity at {t - T0_C:g} °C", nu * 1e6, "mm²/s"))
        rows += [("liquid model range, low", self.t_min - T0_C, "°C"),
                 ("liquid model range, high", self.t_max - T0_C, "°C"),
                 ("bubble point at 1 atm", self.bubble_point(P_ATM) - T0_C, "°C"),
                 ("dew point at 1 atm", self.dew_point(P_ATM) - T0_C, "°C"),
                 ("pseudo-components", int(self.m.size), "-")]
        for key, text in self.sources.items():
            rows.append((f"source: {key}", text, ""))
        return rows
