"""Friction factors for round tubes: laminar developing, fully developed, turbulent, all regimes.

All friction factors here are **Darcy** factors (``dp = f (L/D) rho u^2 / 2``)
unless a name says Fanning.  Every function broadcasts over numpy arrays.

One function per published correlation:

* :func:`hagen_poiseuille` -- fully developed laminar flow, ``f = 64/Re``.
* :func:`shah_1978` -- apparent (Fanning) friction ``f_app Re`` of laminar
  flow developing from a uniform inlet profile (Shah 1978), as a function of
  ``x+ = L/(D Re)``.  It includes the wall shear *and* the growth of the
  momentum flux from the flat inlet profile to the parabola.
* :func:`churchill_1977` -- Churchill's single equation for every regime of
  fully developed flow in rough or smooth tubes.
* :func:`colebrook_1939` -- the Colebrook(-White) equation for turbulent flow,
  solved to machine precision by Newton's method.

and two combinations built from them:

* :func:`friction_fully_developed` -- Churchill's all-regime form, with the
  turbulent branch given by :data:`TURBULENT_METHODS` (default
  ``"churchill_1977"``, which makes it exactly :func:`churchill_1977`).
* :func:`apparent_friction` -- the same all-regime form with its laminar term
  ``64/Re`` replaced by Shah's developing-flow apparent friction, so a short
  tube carries its entrance-region pressure drop in laminar flow and goes
  over smoothly, through Churchill's own transition term, into turbulent flow.

The all-regime blend
--------------------
Churchill (1977) writes ``f = [(64/Re)^12 + 8^12 (A + B)^-1.5]^(1/12)`` with
``A = [2.457 ln(1/((7/Re)^0.9 + 0.27 e/D))]^16`` (turbulent) and
``B = (37530/Re)^16`` (which switches the turbulent term off below about
Re 2000 and brings it in over roughly Re 2000-4000).  Here the laminar term is
a general ``f_lam`` (``64/Re`` or Shah's apparent friction) and the turbulent
branch enters through ``A = (8/f_turb)^8``, which is Churchill's own ``A``
when ``f_turb`` is his turbulent limit.  Because ``f Re^2`` of each term grows
with Re, ``dp`` grows strictly with the flow in every regime -- the property
the needle solver relies on.

References
----------
.. [1] R. K. Shah, "A correlation for laminar hydrodynamic entry length
   solutions for circular and noncircular ducts", J. Fluids Eng. 100 (1978)
   177-179.  Circular duct: ``f_app Re = 3.44/sqrt(x+) + (1.25/(4x+) + 16 -
   3.44/sqrt(x+)) / (1 + 0.00021/x+^2)``.
.. [2] R. K. Shah and A. L. London, "Laminar Flow Forced Convection in Ducts",
   Academic Press (1978): circular-duct entrance region, incremental pressure
   drop number K(inf) = 1.25.
.. [3] S. W. Churchill, "Friction-factor equation spans all fluid-flow
   regimes", Chemical Engineering 84 (7 Nov 1977) 91-92.
.. [4] C. F. Colebrook, "Turbulent flow in pipes, with particular reference
   to the transition region between the smooth and rough pipe laws",
   J. Inst. Civil Eng. 11 (1939) 133-156.
.. [5] P. K. Swamee and A. K. Jain, "Explicit equations for pipe-flow
   problems", J. Hydraulics Div. ASCE 102 (1976) 657-664 (start value of the
   Colebrook iteration).
.. [6] L. F. Moody, "Friction factors for pipe flow", Trans. ASME 66 (1944)
   671-684: roughness of drawn tubing 0.000005 ft = 1.5 um.
.. [7] T. S. Chen, "Flow in the entrance region at low Reynolds numbers",
   J. Fluids Eng. 95 (1973) 153-158: axial diffusion matters below Re of a
   few hundred (K(inf) = 1.20 + 38/Re, from memory).
"""

from __future__ import annotations

import math

import numpy as np

from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array

#: absolute roughness of drawn tubing (stainless hypodermic, copper, brass) [m]
#: -- Moody (1944): 0.000005 ft = 1.5 um
DRAWN_TUBING_ROUGHNESS = 1.5e-6

#: absolute roughness of some tube materials [m] with their sources
ROUGHNESS = {
    "drawn tubing": (1.5e-6, "Moody 1944 chart: drawn tubing 0.000005 ft"),
    "commercial steel": (4.6e-5, "Moody 1944 chart: commercial steel 0.00015 ft"),
    "smooth": (0.0, "hydraulically smooth wall"),
}

#: validity ranges (inclusive) kept beside each correlation and checked at run time
HAGEN_POISEUILLE_VALIDITY = {"Re": (0.0, 2300.0)}
SHAH_1978_VALIDITY = {"x_plus": (0.0, math.inf), "Re": (400.0, math.inf)}
CHURCHILL_1977_VALIDITY = {"Re": (0.0, 1e8), "relative roughness": (0.0, 0.05)}
COLEBROOK_1939_VALIDITY = {"Re": (4000.0, 1e8), "relative roughness": (0.0, 0.05)}

#: default turbulent method (explicit, fast, within 1.5 % of Colebrook above Re 1e4);
#: the methods are listed in :data:`TURBULENT_METHODS` at the end of the module
DEFAULT_TURBULENT = "churchill_1977"

_LN8 = math.log(8.0)
_LN64 = math.log(64.0)
_LN4 = math.log(4.0)
_LN37530 = math.log(37530.0)
_LN7 = math.log(7.0)
_C_LOG10 = 2.0 / math.log(10.0)



def _relative_roughness(eD) -> np.ndarray:
    eD = np.asarray(eD, dtype=float)
    if np.any(~np.isfinite(eD)) or np.any(eD < 0):
        bad = eD[~(np.isfinite(eD) & (eD >= 0))].flat[0]
        raise FuelsysInputError(f"relative roughness must be >= 0 (got {bad:g})")
    return eD


# ---------------------------------------------------------------------------
# laminar

def hagen_poiseuille(Re):
    """Darcy friction factor of fully developed laminar flow in a round tube, ``64/Re``.

    Parameters
    ----------
    Re : array_like
        Reynolds number ``rho u D / mu`` [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    Notes
    -----
    Validity (:data:`HAGEN_POISEUILLE_VALIDITY`): laminar flow, Re up to about
    2300; outside it a ValidityWarning is issued.

    References
    ----------
    G. Hagen (1839), J. L. M. Poiseuille (1840); e.g. F. M. White, "Fluid
    Mechanics", any edition, laminar pipe flow.

    Examples
    --------
    >>> hagen_poiseuille(1000.0)
    0.064
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    warn_validity("Hagen-Poiseuille (laminar)", "Reynolds number", Re, *HAGEN_POISEUILLE_VALIDITY["Re"], "-")
    return _out(64.0 / Re)


def _shah_terms(x):
    """Shah's f_app*Re (Fanning) and x*d(f_app Re)/dx / (f_app Re) at x = x+."""
    return _shah_terms_r(1.0 / x)


def _shah_terms_r(r):
    """:func:`_shah_terms` at ``r = 1/x+ = D Re / L``."""
    a = 3.44 * np.sqrt(r)
    h = 0.3125 * r          # 1.25 / (4 x+)
    c = 0.00021 * r * r
    inv = 1.0 / (1.0 + c)
    ba = h + 16.0 - a
    bai = ba * inv
    g = a + bai
    xg = (0.5 * a - h) * inv - 0.5 * a + 2.0 * c * bai * inv
    return g, xg / g


def shah_1978(x_plus):
    """Apparent Fanning friction ``f_app Re`` of developing laminar flow in a round tube (Shah 1978).

    ``f_app`` is defined by ``dp = 4 f_app (x/D) rho u^2 / 2`` for the pressure
    drop from the tube inlet (uniform velocity) to the distance ``x``: it
    includes the wall shear and the increase of momentum flux as the profile
    develops from flat to parabolic.

    Parameters
    ----------
    x_plus : array_like
        Dimensionless distance from the inlet ``x+ = x / (D Re)`` [-]

    Returns
    -------
    float or ndarray
        ``f_app Re`` with ``f_app`` a Fanning factor [-]; the Darcy apparent
        friction factor is ``4 f_app``.

    Notes
    -----
    ``f_app Re = 3.44/sqrt(x+) + (1.25/(4 x+) + 16 - 3.44/sqrt(x+)) /
    (1 + 0.00021/x+^2)``.  Limits: ``3.44/sqrt(x+)`` near the inlet (boundary
    layer), ``16 + 1.25/(4 x+)`` far downstream (fully developed friction
    plus the incremental pressure drop number K(inf) = 1.25).

    The underlying entrance solutions neglect axial diffusion of momentum,
    which matters below Re of a few hundred (Chen 1973);
    :data:`SHAH_1978_VALIDITY` keeps that bound, and the needle model flags
    it only where the developing-flow part is a noticeable share of the drop.

    References
    ----------
    R. K. Shah, J. Fluids Eng. 100 (1978) 177-179; R. K. Shah and A. L.
    London, "Laminar Flow Forced Convection in Ducts" (1978).

    Examples
    --------
    >>> round(shah_1978(1.0), 4)
    16.3098
    """
    x = checked_array(x_plus, "x+", "-", positive=True)
    return _out(_shah_terms(x)[0])


def shah_1978_darcy(Re, l_over_d):
    """Darcy apparent friction factor ``4 f_app`` of developing laminar flow over a length (Shah 1978).

    Parameters
    ----------
    Re : array_like
        Reynolds number [-]
    l_over_d : array_like
        Tube length over bore ``L/D`` [-]

    Returns
    -------
    float or ndarray
        Darcy apparent friction factor over the length [-]; the pressure drop
        from the inlet is ``f (L/D) rho u^2/2``.

    References
    ----------
    R. K. Shah, J. Fluids Eng. 100 (1978) 177-179.

    Examples
    --------
    >>> round(shah_1978_darcy(100.0, 1e4) * 100.0 / 64.0, 4)   # long tube -> 64/Re
    1.0002
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    lam = checked_array(l_over_d, "L/D", "-", positive=True)
    return _out(4.0 * _shah_terms(lam / Re)[0] / Re)


# ---------------------------------------------------------------------------
# turbulent

def _churchill_lnA(lnRe, eD):
    """ln A of Churchill (1977) and d ln A / d ln Re.

    Where ``(7/Re)^0.9 + 0.27 e/D >= 1`` (Re below about 7, or e/D above 3)
    ``ln(1/q)`` is floored at 1e-300: there A is negligible next to B.
    """
    p = np.exp(0.9 * (_LN7 - lnRe))                 # (7/Re)^0.9
    q = p + 0.27 * eD
    Lq = np.maximum(-np.log(q), 1e-300)             # ln(1/q)
    lnA = 16.0 * np.log(2.457 * Lq)
    dlnA = 14.4 * p / (q * Lq)
    return lnA, dlnA


def _colebrook_y(Re, eD):
    """y = 1/sqrt(f) of Colebrook's equation by Newton's method (vectorised).

    ``e/D`` is held at 1 at most (the equation has no solution beyond 3.7;
    the validity check flags anything above 0.05), and a Newton step that
    would make ``y`` non-positive is replaced by halving ``y``.
    """
    r = np.minimum(eD, 1.0) / 3.7
    y = -2.0 * np.log10(r + 5.74 / Re ** 0.9)        # Swamee-Jain start
    y = np.maximum(y, 1.0)
    for _ in range(100):
        t = r + 2.51 * y / Re
        G = y + 2.0 * np.log10(t)
        dG = 1.0 + _C_LOG10 * (2.51 / Re) / t
        y_new = y - G / dG
        y_new = np.where(y_new > 0, y_new, 0.5 * y)
        step = y_new - y
        y = y_new
        if np.all(np.abs(step) <= 1e-15 * np.abs(y)):
            break
    return y


def _colebrook_lnA(Re, eD):
    """ln A = 8 ln(8/f_C) for Colebrook's f_C, and d ln A / d ln Re.

    Below Re 2000 the branch is held at its Re = 2000 value: there the
    transition term B outweighs it by many orders of magnitude.
    """
    Rc = np.maximum(Re, 2000.0)
    y = _colebrook_y(Rc, eD)
    t = np.minimum(eD, 1.0) / 3.7 + 2.51 * y / Rc
    w = (2.51 * y / Rc) / t
    k = _C_LOG10 * w / y
    s_c = np.where(Re > 2000.0, -2.0 * k / (1.0 + k), 0.0)   # d ln f_C / d ln Re
    lnA = 8.0 * (_LN8 + 2.0 * np.log(y))              # (8/f)^8 with f = y^-2
    return lnA, -8.0 * s_c


def _turbulent_entry(name: str) -> dict:
    key = str(name).strip().lower()
    if key not in TURBULENT_METHODS:
        raise FuelsysInputError(
            f"turbulent friction method {name!r} is unknown; valid: {', '.join(TURBULENT_METHODS)}")
    return TURBULENT_METHODS[key]


def _turbulent_method(name: str):
    """The blend branch (lnRe, Re, eD) -> (ln A, d ln A / d ln Re) of a turbulent method."""
    return _turbulent_entry(name)["branch"]


def colebrook_1939(Re, eD=0.0):
    """Darcy friction factor of turbulent flow from the Colebrook equation.

    ``1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f)))``, solved by Newton's
    method from the Swamee-Jain (1976) explicit value to machine precision.

    Parameters
    ----------
    Re : array_like
        Reynolds number [-]
    eD : array_like
        Relative roughness ``e/D`` [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    Notes
    -----
    Validity (:data:`COLEBROOK_1939_VALIDITY`): Re 4000..1e8, e/D 0..0.05
    (the range of the Moody chart); outside it a ValidityWarning is issued.

    References
    ----------
    C. F. Colebrook, J. Inst. Civil Eng. 11 (1939) 133-156; L. F. Moody,
    Trans. ASME 66 (1944) 671-684.

    Examples
    --------
    >>> round(colebrook_1939(1e5, 1e-4), 5)
    0.01851
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    eD = _relative_roughness(eD)
    warn_validity("Colebrook (1939)", "Reynolds number", Re, *COLEBROOK_1939_VALIDITY["Re"], "-")
    warn_validity("Colebrook (1939)", "relative roughness", eD,
                  *COLEBROOK_1939_VALIDITY["relative roughness"], "-")
    Re, eD = np.broadcast_arrays(Re, eD)
    y = _colebrook_y(Re, eD)
    return _out(1.0 / (y * y))


def churchill_1977(Re, eD=0.0):
    """Darcy friction factor of fully developed flow in every regime (Churchill 1977).

    ``f = 8 [(8/Re)^12 + (A + B)^-1.5]^(1/12)``,
    ``A = [2.457 ln(1/((7/Re)^0.9 + 0.27 e/D))]^16``, ``B = (37530/Re)^16``.

    Parameters
    ----------
    Re : array_like
        Reynolds number [-]
    eD : array_like
        Relative roughness ``e/D`` [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    Notes
    -----
    Laminar (64/Re), transition and turbulent (Colebrook within 1.5 % above Re 1e4) in
    one smooth formula; computed in logarithms so that it neither overflows
    nor underflows at extreme Re.  Validity
    (:data:`CHURCHILL_1977_VALIDITY`): Re up to 1e8, e/D up to 0.05.

    References
    ----------
    S. W. Churchill, Chemical Engineering 84 (7 Nov 1977) 91-92.

    Examples
    --------
    >>> round(churchill_1977(1e5, 1e-4), 5)
    0.01846
    """
    return friction_fully_developed(Re, eD, turbulent="churchill_1977")


def _logaddexp(a, b):
    """ln(e^a + e^b) for finite arrays; several times faster than numpy.logaddexp."""
    return np.maximum(a, b) + np.log1p(np.exp(-np.abs(a - b)))


def _blend(lnRe, Re, ln_flam, s_lam, eD, turb):
    """Churchill's blend of a laminar term with a turbulent branch.

    Returns the Darcy factor f and its slope d ln f / d ln Re.
    """
    lnA, dlnA = turb(lnRe, Re, eD)
    lnB = 16.0 * (_LN37530 - lnRe)
    lnAB = _logaddexp(lnA, lnB)
    wA = np.exp(lnA - lnAB)
    ln_T = 12.0 * _LN8 - 1.5 * lnAB
    # (1/12) d ln T / d ln Re = -(1/8) (wA dlnA - 16 wB)
    s_T = 2.0 - 0.125 * wA * (dlnA + 16.0)
    ln_L = 12.0 * ln_flam
    ln_f12 = _logaddexp(ln_L, ln_T)
    wL = np.exp(ln_L - ln_f12)
    f = np.exp(ln_f12 * (1.0 / 12.0))
    s = s_T + wL * (s_lam - s_T)
    return f, s


def _fully_developed(Re, eD, turb, lnRe=None):
    """Fully developed all-regime Darcy f and d ln f / d ln Re."""
    lnRe = np.log(Re) if lnRe is None else lnRe
    return _blend(lnRe, Re, _LN64 - lnRe, -1.0, eD, turb)


def _apparent(Re, lam, eD, turb, lnRe=None):
    """Apparent (Shah laminar developing + Churchill blend) Darcy f and d ln f / d ln Re."""
    lnRe = np.log(Re) if lnRe is None else lnRe
    g, xg = _shah_terms_r(Re / lam)
    ln_flam = np.log(g) + (_LN4 - lnRe)
    return _blend(lnRe, Re, ln_flam, -1.0 - xg, eD, turb)


def friction_fully_developed(Re, eD=0.0, turbulent: str = DEFAULT_TURBULENT):
    """Darcy friction factor of fully developed flow, all regimes (Churchill's blend).

    Parameters
    ----------
    Re : array_like
        Reynolds number [-]
    eD : array_like
        Relative roughness ``e/D`` [-]
    turbulent : str
        Turbulent branch, a key of :data:`TURBULENT_METHODS`; the default
        "churchill_1977" gives exactly :func:`churchill_1977` [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    References
    ----------
    S. W. Churchill (1977); C. F. Colebrook (1939) for the "colebrook_1939"
    branch.

    Examples
    --------
    >>> round(friction_fully_developed(500.0), 4)
    0.128
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    eD = _relative_roughness(eD)
    turb = _turbulent_method(turbulent)
    warn_validity("Churchill (1977) all-regime friction", "Reynolds number", Re,
                  *CHURCHILL_1977_VALIDITY["Re"], "-")
    warn_validity("Churchill (1977) all-regime friction", "relative roughness", eD,
                  *CHURCHILL_1977_VALIDITY["relative roughness"], "-")
    Re, eD = np.broadcast_arrays(Re, eD)
    return _out(_fully_developed(Re, eD, turb)[0])


def apparent_friction(Re, l_over_d, eD=0.0, turbulent: str = DEFAULT_TURBULENT):
    """Darcy apparent friction factor over a tube length from a flat inlet profile, all regimes.

    Churchill's all-regime blend with its laminar term replaced by Shah's
    (1978) developing-flow apparent friction ``4 f_app``; for a long tube it
    tends to the fully developed factor.

    Parameters
    ----------
    Re : array_like
        Reynolds number [-]
    l_over_d : array_like
        Tube length over bore ``L/D`` [-]
    eD : array_like
        Relative roughness ``e/D`` [-]
    turbulent : str
        Turbulent branch, a key of :data:`TURBULENT_METHODS` [-]

    Returns
    -------
    float or ndarray
        Darcy apparent friction factor [-]: the pressure drop from the tube
        inlet to its outlet (wall shear plus laminar profile development) is
        ``f (L/D) rho u^2 / 2``.

    Notes
    -----
    In turbulent flow the developing region is short and the fully developed
    factor is used over the whole length (common practice, no source).

    References
    ----------
    R. K. Shah (1978); S. W. Churchill (1977).

    Examples
    --------
    >>> round(apparent_friction(100.0, 20.0) / (64.0 / 100.0), 3)  # short tube: above 64/Re
    1.094
    """
    Re = checked_array(Re, "Reynolds number", "-", positive=True)
    lam = checked_array(l_over_d, "L/D", "-", positive=True)
    eD = _relative_roughness(eD)
    turb = _turbulent_method(turbulent)
    warn_validity("Churchill (1977) all-regime friction", "Reynolds number", Re,
                  *CHURCHILL_1977_VALIDITY["Re"], "-")
    warn_validity("Churchill (1977) all-regime friction", "relative roughness", eD,
                  *CHURCHILL_1977_VALIDITY["relative roughness"], "-")
    Re, lam, eD = np.broadcast_arrays(Re, lam, eD)
    return _out(_apparent(Re, lam, eD, turb)[0])


def friction_turbulent(Re, eD=0.0, method: str = DEFAULT_TURBULENT):
    """Darcy friction factor of turbulent flow by a chosen correlation (dispatcher).

    Parameters
    ----------
    Re : array_like
        Reynolds number [-]
    eD : array_like
        Relative roughness ``e/D`` [-]
    method : str
        "churchill_1977" (default; its all-regime formula, which is turbulent
        above about Re 4000) or "colebrook_1939" [-]

    Returns
    -------
    float or ndarray
        Darcy friction factor [-]

    References
    ----------
    S. W. Churchill (1977); C. F. Colebrook (1939).

    Examples
    --------
    >>> round(friction_turbulent(1e5, 1e-4, "colebrook_1939"), 5)
    0.01851
    """
    return _turbulent_entry(method)["friction"](Re, eD)


#: turbulent methods, each with its public friction function and its branch
#: for the all-regime blend ((lnRe, Re, eD) -> (ln A, d ln A / d ln Re))
TURBULENT_METHODS = {
    "churchill_1977": {"friction": churchill_1977,
                       "branch": lambda lnRe, Re, eD: _churchill_lnA(lnRe, eD)},
    "colebrook_1939": {"friction": colebrook_1939,
                       "branch": lambda lnRe, Re, eD: _colebrook_lnA(Re, eD)},
}
