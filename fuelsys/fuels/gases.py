"""Propane, butanes, LPG blends, air and water from CoolProp's reference equations.

This module gives the fuels and reference fluids whose properties come from
CoolProp's Helmholtz-energy equations of state.  CoolProp is imported only
when a fluid is first used (``import fuelsys.fuels.gases`` stays cheap).

Names
-----
``get_gas(name)`` returns a cached :class:`CoolPropFluid` for

* ``"propane"``, ``"butane"`` (n-butane; ``"n-butane"`` is accepted too),
  ``"isobutane"``;
* ``"lpg-XX-YY"`` -- propane / n-butane blend, XX and YY per cent **by mass**
  (XX + YY = 100), the way canisters are labelled; e.g. ``"lpg-70-30"``;
* ``"lpg-XX-YY-iso"`` -- propane / isobutane blend, per cent by mass;
* ``"air"`` (dry air, pseudo-pure fluid) and ``"water"`` (bench-test liquid).

:data:`GAS_NAMES` lists the built-in names; the ``lpg-`` patterns take any
split.  CoolProp's mixture strings take **mole** fractions: the conversion is
done here (:attr:`CoolPropFluid.mole_fractions`).

Fuel interface (:class:`fuelsys.fuels.base.Fuel`)
-------------------------------------------------
Liquid properties are those of the **saturated liquid** at ``T`` (the state
in a canister; for water within 0.01 % of the 1-atm value below 100 °C).  Air
has no liquid in fuelsys's range: its ``density``/``kinematic_viscosity``/
``specific_heat``/``conductivity`` give the gas at 1 atm.

Heating value: ``lhv_gas`` is the lower heating value of the gaseous fuel at
25 °C (the value tables quote: propane 46.33 MJ/kg) from the molecular
formula and NIST standard enthalpies of formation; ``lhv`` is that of the
liquid at 25 °C, the reference state of :meth:`CoolPropFluid.enthalpy`
(lower by the enthalpy from saturated liquid to ideal gas, 0.37 MJ/kg for
propane), so that energy balances with :meth:`enthalpy` count the
vaporisation once.  ``stoich_far`` from the formula with fuelsys's dry air (CIPM-2007, :mod:`fuelsys.thermo`).
Water and air are not fuels: both raise :class:`FuelsysInputError`.

Gas-phase methods (for the vaporiser, engine and gas-jet modules)
-----------------------------------------------------------------
Every :class:`CoolPropFluid` also has real-gas properties of its **vapour**
at any temperature ``T`` [K] and pressure ``P`` [Pa abs] where it is a gas
(``P`` below the vapour's dew-point pressure at ``T``, or ``T`` above the
critical temperature); they broadcast over ``T`` and ``P``:

==========================  ==========================================
``gas_density(T, P)``       density [kg/m³]
``gas_viscosity(T, P)``     dynamic viscosity [Pa·s]
``gas_cp(T, P)``            isobaric specific heat [J/(kg·K)]
``gas_cv(T, P)``            isochoric specific heat [J/(kg·K)]
``gamma(T, P)``             ratio of specific heats cp/cv [-]
``gas_conductivity(T, P)``  thermal conductivity [W/(m·K)]
``gas_speed_of_sound(T,P)`` speed of sound [m/s]
``gas_enthalpy(T, P)``      enthalpy [J/kg], same reference as :meth:`enthalpy`
``gas_entropy(T, P)``       entropy [J/(kg·K)] (CoolProp's reference state)
``compressibility(T, P)``   compressibility factor Z = P/(ρRT) [-]
==========================  ==========================================

These call CoolProp's ``PropsSI`` directly on the flattened arrays (a few µs
a point for a pure fluid); blends use CoolProp's HEOS mixture model with the
gas phase imposed.

Speed: the tabulated saturation backend
---------------------------------------
On a pure fluid's first use a table of the saturation curve is built (400
nodes from the triple point to 0.99 Tc, equally spaced in sqrt(Tc - T) so they
crowd towards the critical point) and cubic splines are fitted: ln p in 1/T,
the logarithms of the positive properties and the enthalpies in
sqrt(Tc - T).  Their interpolation error against direct ``PropsSI`` calls,
checked in tests/test_gases.py: 2e-6 relative for the saturation pressure,
1e-5 for density, viscosity, heat capacity, surface tension and latent heat,
1e-4 for conductivity (CoolProp's conductivity correlations have a corner
where their critical-enhancement term switches on, which a spline rounds).
A second table holds the ideal-gas enthalpy and heat capacity and the second
virial coefficient from the triple point to 1500 K (interpolation error
below 1e-8).

Blends: phase equilibrium
-------------------------
A blend's liquid is an ideal solution of its components.  Without air
(bubble and dew points, vapour and canister pressure) the K-values follow the
modified Raoult's law with a virial vapour phase (Lewis fugacity rule) and the
Poynting factor,

    K_i = (p_sat,i / P) exp[(B_ii - v_L,i)(p_sat,i - P) / (R T)],

with CoolProp's pure-component p_sat, second virial coefficient B_ii and
saturated liquid molar volume v_L.  Checked against CoolProp's full HEOS
mixture bubble and dew pressures (GERG-type mixture model), this agrees
within 0.7 % for propane/n-butane from -40 to 60 °C (propane/isobutane:
within 1.2 % from -20 to 40 °C), where plain Raoult's law is 1-5 % high.  HEOS mixture flashes are not used in the hot path because
they are slow (milliseconds a point) and do not always converge.

With air as an inert carrier (:meth:`vapour_fraction`, :meth:`dew_point`
with ``far``) the fuel is dilute in the gas, so the vapour is taken as ideal:
Raoult's law K_i = p_sat,i / P, solved by the Rachford-Rice equation with air
as a component that never condenses.  For a pure fluid this reduces to the
vapour's mole fraction in the gas being at most p_sat/P.

A blend's liquid mixing rules: volume additivity for density, Grunberg-Nissan
without interaction term for viscosity, mass-weighted heat capacity, the
Vredeveld power rule for conductivity, mole-fraction average for surface
tension.  A blend's liquid range ends at 0.9 Tc of its lightest
component (about 60 °C for propane blends), the range over which the phase
equilibrium was checked.

Canister pressure
-----------------
:meth:`CoolPropFluid.canister_pressure` is the bubble-point pressure of the
liquid in the canister.  For a blend the liquid's composition follows
Rayleigh distillation as gas is drawn off the top (``drawn`` = share of the
original liquid mass already used), so the pressure falls as the propane
boils off first; ``drawn=0`` gives the full canister.

References
----------
* Bell, I. H., Wronski, J., Quoilin, S., Lemort, V. (2014). Pure and
  pseudo-pure fluid thermophysical property evaluation and the open-source
  thermophysical property library CoolProp. Ind. Eng. Chem. Res. 53, 2498.
* Lemmon, E. W., McLinden, M. O., Wagner, W. (2009). Thermodynamic properties
  of propane. III. J. Chem. Eng. Data 54, 3141 (propane equation of state).
* Bücker, D., Wagner, W. (2006). Reference equations of state for the
  thermodynamic properties of fluid phase n-butane and isobutane.
  J. Phys. Chem. Ref. Data 35, 929.
* Wagner, W., Pruß, A. (2002). The IAPWS formulation 1995 for the
  thermodynamic properties of ordinary water substance. J. Phys. Chem. Ref.
  Data 31, 387.
* Lemmon, E. W., Jacobsen, R. T., Penoncello, S. G., Friend, D. G. (2000).
  Thermodynamic properties of air. J. Phys. Chem. Ref. Data 29, 331.
* Smith, J. M., Van Ness, H. C., Abbott, M. M. (2005). Introduction to
  Chemical Engineering Thermodynamics, 7th ed., McGraw-Hill: §3.5 (virial
  equation), §10.6/§14.1 (fugacity of a virial gas, the Lewis rule, the
  modified Raoult's law and the Poynting factor).
* Rachford, H. H., Rice, J. D. (1952). Procedure for use of electronic
  digital computers in calculating flash vaporization hydrocarbon
  equilibrium. J. Petrol. Technol. 4(10), 19.
* Poling, B. E., Prausnitz, J. M., O'Connell, J. P. (2001). The Properties of
  Gases and Liquids, 5th ed., McGraw-Hill: §9-13 (Grunberg-Nissan), §10-12
  (Vredeveld rule), §12-5 (surface tension of mixtures).
* NIST Chemistry WebBook, SRD 69: standard enthalpies of formation of the
  gases (propane, n-butane, isobutane); Cox, Wagman, Medvedev (1989) CODATA
  Key Values for Thermodynamics (CO2, H2O).
"""

from __future__ import annotations

import functools
import re
from dataclasses import dataclass

import numpy as np

from fuelsys import thermo as _thermo

from fuelsys.constants import R_MOLAR as R_GAS
from fuelsys.constants import T_REF  # liquid (or, for air, gas) at 25 °C has h = 0
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.roots import chandrupatla
from fuelsys.fuels.base import P_ATM, T0_C, Fuel, as_float

# ---------------------------------------------------------------------------
# data
# ---------------------------------------------------------------------------

#: standard enthalpy of formation of CO2 gas at 298.15 K [J/mol] (CODATA Key Values 1989)
HF_CO2 = -393.51e3
#: standard enthalpy of formation of H2O gas at 298.15 K [J/mol] (CODATA Key Values 1989)
HF_H2O_GAS = -241.826e3
#: mole fraction of O2 in dry air and its molar mass [kg/mol]: the one dry air of fuelsys
#: (CIPM-2007 composition, see fuelsys.thermo), so stoichiometric ratios agree across modules
X_O2_AIR = _thermo.AIR_MOLE_FRACTION["O2"]
M_AIR = _thermo.M_AIR
#: fraction of the critical temperature up to which liquid properties are given
TC_MARGIN = 0.99
#: upper end of the ideal-gas / virial table [K]
T_IG_MAX = 1500.0
#: number of saturation-table nodes
N_SAT = 400
#: number of ideal-gas-table nodes
N_IG = 400


@dataclass(frozen=True)
class _Species:
    """One CoolProp pure or pseudo-pure fluid and its combustion data."""

    coolprop: str        # CoolProp fluid name
    label: str           # human name
    carbon: int          # C atoms (0 for non-fuels)
    hydrogen: int        # H atoms
    hf_gas: float        # standard enthalpy of formation of the gas [J/mol], NaN for non-fuels
    hf_source: str
    t_low: float         # lowest temperature used [K] (None -> triple point)
    saturating: bool     # has a saturation curve in fuelsys's range


#: The built-in species.  Enthalpies of formation: NIST Chemistry WebBook (gas
#: phase thermochemistry, values selected there from Pittam & Pilcher 1972,
#: J. Chem. Soc. Faraday Trans. 1, 68, 2224), from memory.
_SPECIES = {
    "propane": _Species("Propane", "propane", 3, 8, -104.7e3,
                        "NIST WebBook ΔfH°gas -104.7 kJ/mol", 0.0, True),
    "n-butane": _Species("n-Butane", "n-butane", 4, 10, -125.6e3,
                         "NIST WebBook ΔfH°gas -125.6 kJ/mol", 0.0, True),
    "isobutane": _Species("IsoButane", "isobutane", 4, 10, -134.2e3,
                          "NIST WebBook ΔfH°gas -134.2 kJ/mol", 0.0, True),
    "water": _Species("Water", "water", 0, 0, float("nan"), "", 0.0, True),
    # air: gas properties above its critical temperature (132.5 K) only
    "air": _Species("Air", "dry air", 0, 0, float("nan"), "", 140.0, False),
}

#: validity ranges of the methods, kept beside them and checked at run time
VALIDITY = {
    # ideal-gas heat capacity/enthalpy of the equations of state: used up to
    # 1500 K (hard limit); checked against the NIST WebBook gas-phase Cp
    # tables to 0.5 % up to 1500 K in tests/test_gases.py
    "ideal_gas": {"T_max": T_IG_MAX},
    # second virial coefficient (vapour residual enthalpy) above the equation
    # of state's own Tmax (CoolProp "Tmax") is extrapolated: warned
    "virial_residual": {"T_max": "equation of state Tmax"},
    # Vredeveld conductivity rule: ratio of component conductivities <= 2
    # (Poling et al. 2001, §10-12)
    "vredeveld_1973": {"ratio_max": 2.0},
    # modified Raoult's law for blends: checked against CoolProp's HEOS
    # mixture model from -40 to 60 °C; blends' liquid range ends at
    # 0.9 Tc of the lightest component (60 °C for propane blends)
    "blend_vle": {"t_max_over_tc": 0.9},
}

# names of built-in fluids: single species and a few standard blends
GAS_NAMES = (
    "propane",
    "butane",
    "isobutane",
    "lpg-70-30",
    "lpg-60-40",
    "lpg-50-50",
    "lpg-30-70-iso",
    "air",
    "water",
)

_ALIASES = {
    "propane": "propane",
    "c3h8": "propane",
    "butane": "n-butane",
    "n-butane": "n-butane",
    "nbutane": "n-butane",
    "isobutane": "isobutane",
    "iso-butane": "isobutane",
    "i-butane": "isobutane",
    "air": "air",
    "water": "water",
}

_LPG_RE = re.compile(r"^lpg-(\d+(?:\.\d+)?)-(\d+(?:\.\d+)?)(-iso)?$")

_KNOWN_TEXT = (
    ", ".join(GAS_NAMES)
    + " (and any lpg-XX-YY: propane/n-butane per cent by mass, XX+YY=100;"
    " lpg-XX-YY-iso: propane/isobutane)"
)


# ---------------------------------------------------------------------------
# lazy imports
# ---------------------------------------------------------------------------

def _props():
    """CoolProp's PropsSI, imported on first use."""
    from CoolProp.CoolProp import PropsSI

    return PropsSI


def _cubic_spline():
    from scipy.interpolate import CubicSpline

    return CubicSpline


def _propsi(out, name1, v1, name2, v2, fluid):
    """PropsSI over any array shape; raises FuelsysInputError on failure."""
    PropsSI = _props()
    a1, a2 = np.broadcast_arrays(np.asarray(v1, dtype=float), np.asarray(v2, dtype=float))
    shape = a1.shape
    f1, f2 = a1.ravel(), a2.ravel()
    try:
        if f1.size == 1:
            r = np.array([PropsSI(out, name1, float(f1[0]), name2, float(f2[0]), fluid)])
        else:
            r = np.asarray(PropsSI(out, name1, np.ascontiguousarray(f1), name2, np.ascontiguousarray(f2), fluid),
                           dtype=float)
    except ValueError as exc:  # CoolProp's scalar-call error
        raise FuelsysInputError(f"CoolProp could not evaluate {out} of {fluid} at "
                                f"{name1}={f1[0]:.6g}, {name2}={f2[0]:.6g}: {exc}") from None
    bad = ~np.isfinite(r)
    if np.any(bad):
        i = int(np.flatnonzero(bad)[0])
        raise FuelsysInputError(f"CoolProp could not evaluate {out} of {fluid} at "
                                f"{name1}={f1[i]:.6g}, {name2}={f2[i]:.6g}")
    return r.reshape(shape)


# ---------------------------------------------------------------------------
# tables of one pure fluid
# ---------------------------------------------------------------------------

class _Curve:
    """A cubic spline of y against a transformed temperature."""

    __slots__ = ("spline", "xform", "log")

    def __init__(self, T, y, xform, log):
        x = xform(T)
        order = np.argsort(x)
        yy = np.log(y) if log else y
        self.spline = _cubic_spline()(x[order], yy[order])
        self.xform = xform
        self.log = log

    def __call__(self, T):
        y = self.spline(self.xform(T))
        return np.exp(y) if self.log else y

    def derivative_x(self, T):
        """dy/dx of the stored (possibly log) quantity in the transformed variable."""
        return self.spline(self.xform(T), 1)


# (CoolProp output, table key, saturated quality, spline in log)
_SAT_OUTPUTS = (
    ("Dmass", "rho_l", 0, True),
    ("Dmass", "rho_v", 1, True),
    ("Hmass", "h_l", 0, False),
    ("Hmass", "h_v", 1, False),
    ("viscosity", "mu_l", 0, True),
    ("viscosity", "mu_v", 1, True),
    ("Cpmass", "cp_l", 0, True),
    ("Cpmass", "cp_v", 1, True),
    ("conductivity", "k_l", 0, True),
    ("conductivity", "k_v", 1, True),
    ("surface_tension", "sigma", 0, True),
)

# (CoolProp output at zero density, table key, spline in log)
_IG_OUTPUTS = (
    ("Hmass", "h_ig", False),
    ("Cp0mass", "cp0", True),
    ("Bvirial", "B", False),
    ("dBvirial_dT", "dBdT", False),
)


class _PureTables:
    """Saturation and ideal-gas tables of one CoolProp fluid (built on first use)."""

    def __init__(self, key: str):
        sp = _SPECIES[key]
        self.key = key
        self.species = sp
        self.fluid = "HEOS::" + sp.coolprop
        PropsSI = _props()
        f = self.fluid
        self.M = PropsSI("molar_mass", f)
        self.Tc = PropsSI("Tcrit", f)
        self.pc = PropsSI("pcrit", f)
        self.T_triple = PropsSI("Ttriple", f)
        self.T_eos_max = PropsSI("Tmax", f)
        self.t_min = max(self.T_triple, sp.t_low)
        self._sat = None
        self._ig = None

    # -- saturation ----------------------------------------------------
    def sat_nodes(self):
        u_hi = np.sqrt(self.Tc - self.t_min)
        u_lo = np.sqrt(self.Tc * (1.0 - TC_MARGIN))
        u = np.linspace(u_hi, u_lo, N_SAT)
        T = self.Tc - u * u
        T[0] = self.t_min
        T[-1] = self.Tc * TC_MARGIN
        return T

    @property
    def t_max(self):
        return self.Tc * TC_MARGIN

    def _u(self, T):
        return np.sqrt(np.maximum(self.Tc - T, 0.0))

    @staticmethod
    def _inv(T):
        return 1.0 / T

    def sat(self):
        if self._sat is None:
            T = self.sat_nodes()
            f = self.fluid
            tab = {"lnp": _Curve(T, np.log(_propsi("P", "T", T, "Q", 0, f)), self._inv, False)}
            for out, key, q, log in _SAT_OUTPUTS:
                tab[key] = _Curve(T, _propsi(out, "T", T, "Q", q, f), self._u, log)
            self._sat = tab
        return self._sat

    def lnp(self, T):
        """ln p_sat [ln Pa]; beyond t_max continued by the tangent in 1/T (up to Tc)."""
        c = self.sat()["lnp"]
        tm = self.t_max
        inside = np.minimum(T, tm)
        y = c(inside)
        over = T > tm
        if np.any(over):
            slope = c.derivative_x(np.asarray(tm))
            y = np.where(over, c(np.asarray(tm)) + slope * (1.0 / T - 1.0 / tm), y)
        return y

    # -- ideal gas + second virial coefficient -------------------------
    def ig(self):
        if self._ig is None:
            T = np.geomspace(self.t_min, T_IG_MAX, N_IG)
            d0 = np.full_like(T, 1e-10)  # mol/m³: the ideal-gas limit
            f = self.fluid
            tab = {}
            for out, key, log in _IG_OUTPUTS:
                tab[key] = _Curve(T, _propsi(out, "T", T, "Dmolar", d0, f), np.log, log)
            self._ig = tab
        return self._ig

    def h_ig(self, T):
        return self.ig()["h_ig"](T)

    def virial_enthalpy_slope(self, T):
        """(B - T dB/dT)/M: residual enthalpy per pascal of the virial gas [J/(kg·Pa)]."""
        ig = self.ig()
        return (ig["B"](T) - T * ig["dBdT"](T)) / self.M


@functools.lru_cache(maxsize=None)
def _tables(key: str) -> _PureTables:
    return _PureTables(key)


# ---------------------------------------------------------------------------
# name handling
# ---------------------------------------------------------------------------

def _parse(name) -> tuple[str, tuple[tuple[str, float], ...]]:
    """Return (canonical name, ((species key, mass fraction), ...))."""
    if not isinstance(name, str):
        raise FuelsysInputError(f"gas name must be text (got {name!r}); known: {_KNOWN_TEXT}")
    n = name.strip().lower().replace("_", "-").replace(" ", "")
    if n in _ALIASES:
        key = _ALIASES[n]
        canon = "butane" if key == "n-butane" else key
        return canon, ((key, 1.0),)
    m = _LPG_RE.match(n)
    if m:
        a, b = float(m.group(1)), float(m.group(2))
        if abs(a + b - 100.0) > 1e-9:
            raise FuelsysInputError(
                f"LPG blend '{name}': the two mass percentages must add up to 100 (got {a:g} + {b:g})")
        second = "isobutane" if m.group(3) else "n-butane"
        comps = tuple((k, w / 100.0) for k, w in (("propane", a), (second, b)) if w > 0)
        return n, comps
    raise FuelsysInputError(f"unknown gas '{name}'; known: {_KNOWN_TEXT}")


def is_gas_name(name) -> bool:
    """True when ``name`` is a fluid :func:`get_gas` knows (built-in or an lpg-XX-YY pattern).

    Parameters
    ----------
    name : str
        Candidate fluid name [-]

    Returns
    -------
    bool
        Whether :func:`get_gas` accepts it.

    References
    ----------
    Names only; see :func:`get_gas`.

    Examples
    --------
    >>> is_gas_name("lpg-80-20"), is_gas_name("kerosene")
    (True, False)
    """
    try:
        _parse(name)
    except FuelsysInputError:
        return False
    return True


@functools.lru_cache(maxsize=64)
def _get_gas_canon(canon: str, comps) -> "CoolPropFluid":
    return CoolPropFluid(canon, comps)


def get_gas(name: str) -> "CoolPropFluid":
    """The CoolProp-backed fluid called ``name`` (cached: the same object each time).

    Parameters
    ----------
    name : str
        "propane", "butane" (n-butane), "isobutane", "lpg-XX-YY" (propane /
        n-butane, per cent by mass), "lpg-XX-YY-iso" (propane / isobutane,
        per cent by mass), "air" or "water" [-]

    Returns
    -------
    CoolPropFluid
        The fluid; its tables are built when a property is first asked for.

    Raises
    ------
    FuelsysInputError
        Unknown name (the message lists the known ones) or a blend whose
        percentages do not add up to 100.

    References
    ----------
    Bell et al. (2014), CoolProp, Ind. Eng. Chem. Res. 53, 2498.

    Examples
    --------
    >>> gas = get_gas("lpg-70-30")
    >>> round(gas.mass_fractions["propane"], 2)
    0.7
    """
    canon, comps = _parse(name)
    return _get_gas_canon(canon, comps)


# ---------------------------------------------------------------------------
# the fluid
# ---------------------------------------------------------------------------

def _check_pressure(P, what="pressure"):
    P = np.asarray(P, dtype=float)
    if np.any(~np.isfinite(P)):
        raise FuelsysInputError(f"{what} must be a finite number [Pa abs]")
    if np.any(P <= 0):
        bad = P[P <= 0].flat[0]
        raise FuelsysInputError(f"{what} must be > 0 Pa absolute (got {bad:g} Pa = {bad / 1e5:g} bar abs)")
    return P


def _check_far(far):
    far = np.asarray(far, dtype=float)
    if np.any(~np.isfinite(far)) or np.any(far < 0):
        bad = far[~np.isfinite(far) | (far < 0)].flat[0]
        raise FuelsysInputError(f"fuel/air ratio must be a finite number >= 0 kg/kg (got {bad:g})")
    return far


class CoolPropFluid(Fuel):
    """A pure CoolProp fluid or an ideal-solution blend of them.

    Build through :func:`get_gas`.  All methods take SI arguments (K, Pa abs,
    kg/kg), broadcast over numpy arrays (any shape) and return Python floats
    for scalar input.  See the module docstring for the models.

    Attributes
    ----------
    name : str
        Canonical name, e.g. "propane", "lpg-70-30" [-].
    components : tuple of str
        Species keys ("propane", "n-butane", "isobutane", "water", "air") [-].
    mass_fractions : dict
        Mass fraction of each component [kg/kg].
    mole_fractions : dict
        Mole fraction of each component [mol/mol] (what CoolProp's mixture
        strings take).
    lhv : float
        Lower heating value of the liquid at 25 °C, water as vapour [J/kg];
        ``lhv_gas`` is that of the gas (the value usually tabulated).
        Raises FuelsysInputError for air and water.
    stoich_far : float
        Stoichiometric fuel/air mass ratio with dry air [kg/kg] (raises for
        air and water).

    References
    ----------
    See the module docstring.
    """

    kind = "gas"

    def __init__(self, name: str, comps):
        self.name = name
        self.components = tuple(k for k, _ in comps)
        w = np.array([x for _, x in comps], dtype=float)
        self._w = w / w.sum()
        self.mass_fractions = dict(zip(self.components, self._w.tolist()))
        self._is_air = self.components == ("air",)
        self._saturating = all(_SPECIES[k].saturating for k in self.components)
        self._combustible = all(_SPECIES[k].carbon > 0 for k in self.components)
        self._ready = False

    # -- lazily built state ----------------------------------------------
    def _setup(self):
        if self._ready:
            return
        tabs = [_tables(k) for k in self.components]
        self._tabs = tabs
        self._M = np.array([t.M for t in tabs])
        n = self._w / self._M
        self._x = n / n.sum()                        # mole fractions
        self._Mmix = float(1.0 / n.sum())            # mean molar mass [kg/mol]
        self._Tc = np.array([t.Tc for t in tabs])
        self._t_min = max(t.t_min for t in tabs)
        if not self._saturating:
            self._t_max = min(t.T_eos_max for t in tabs)
        elif len(tabs) == 1:
            self._t_max = tabs[0].t_max
        else:
            self._t_max = VALIDITY["blend_vle"]["t_max_over_tc"] * float(np.min(self._Tc))
        self._T_eos_max = min(t.T_eos_max for t in tabs)
        self._pmax = min(_props()("pmax", t.fluid) for t in tabs)
        self._ready = True

    def _ensure(self):
        if not self._ready:
            self._setup()

    @property
    def mole_fractions(self) -> dict:
        self._ensure()
        return dict(zip(self.components, self._x.tolist()))

    @property
    def molar_mass(self) -> float:  # noqa: D401
        """Mean molar mass [kg/mol]."""
        self._ensure()
        return self._Mmix

    @property
    def t_min(self) -> float:
        """Lowest temperature [K]: the (highest) triple point of the components."""
        self._ensure()
        return self._t_min

    @property
    def t_max(self) -> float:
        """Highest liquid temperature [K]: 0.99 Tc (blends: 0.9 Tc of the lightest component)."""
        self._ensure()
        return self._t_max

    @property
    def coolprop_string(self) -> str:
        """CoolProp fluid string (mixtures with mole fractions) [-]."""
        self._ensure()
        if len(self.components) == 1:
            return self._tabs[0].fluid
        return "HEOS::" + "&".join(f"{t.species.coolprop}[{x:.12g}]" for t, x in zip(self._tabs, self._x))

    # -- combustion --------------------------------------------------------
    def _require_fuel(self, what):
        if not self._combustible:
            raise FuelsysInputError(f"{self.name} is not a fuel: it has no {what}")

    @property
    def lhv_gas(self) -> float:
        """Lower heating value of the gaseous fuel at 25 °C, water as vapour [J/kg].

        From the molecular formula and standard enthalpies of formation:
        C_cH_h + (c + h/4) O2 -> c CO2 + h/2 H2O(g).

        References
        ----------
        NIST Chemistry WebBook (ΔfH° of the hydrocarbon gases); CODATA Key
        Values for Thermodynamics, Cox, Wagman & Medvedev (1989) (CO2, H2O).
        """
        self._require_fuel("heating value")
        self._ensure()
        q = 0.0
        for k, w, M in zip(self.components, self._w, self._M):
            sp = _SPECIES[k]
            dh = sp.carbon * HF_CO2 + sp.hydrogen / 2 * HF_H2O_GAS - sp.hf_gas   # J/mol, < 0
            q += w * (-dh) / M
        return float(q)

    @property
    def lhv(self) -> float:
        """Lower heating value of the liquid fuel at 25 °C [J/kg].

        ``lhv_gas`` minus the enthalpy to take the saturated liquid at 25 °C to
        the ideal gas at 25 °C, so that it pairs with :meth:`enthalpy`'s
        reference state (liquid at 25 °C).
        """
        self._require_fuel("heating value")
        self._ensure()
        T = np.asarray(T_REF)
        lift = sum(w * (t.h_ig(T) - t.sat()["h_l"](T)) for w, t in zip(self._w, self._tabs))
        return float(self.lhv_gas - lift)

    @property
    def stoich_far(self) -> float:
        """Stoichiometric fuel/air mass ratio with dry air [kg/kg].

        (c + h/4) mol O2 per mol of C_cH_h, with the O2 share and molar mass of
        fuelsys's dry air (CIPM-2007 composition, :mod:`fuelsys.thermo`).
        """
        self._require_fuel("stoichiometric fuel/air ratio")
        self._ensure()
        air_per_kg = 0.0
        for k, w, M in zip(self.components, self._w, self._M):
            sp = _SPECIES[k]
            o2 = sp.carbon + sp.hydrogen / 4.0
            air_per_kg += w * (o2 / X_O2_AIR * M_AIR) / M
        return float(1.0 / air_per_kg)

    # -- checks --------------------------------------------------------------
    def check_temperature(self, T, what="temperature"):
        """Return ``T`` as an array; raise when outside ``[t_min, t_max]``.

        Parameters
        ----------
        T : array_like
            Temperature [K]
        what : str
            Name of the quantity in the message [-]

        Returns
        -------
        ndarray
            ``T`` as floats [K].

        References
        ----------
        Range: triple point to 0.99 Tc (blends 0.9 Tc), see the module docstring.
        """
        self._ensure()
        return super().check_temperature(T, what)

    def _require_saturating(self, what):
        if not self._saturating:
            raise FuelsysInputError(
                f"{self.name} is a permanent gas in fuelsys's range "
                f"({self.t_min - T0_C:.0f}..{self.t_max - T0_C:.0f} °C): it has no {what}")

    def _check_vapour_T(self, T, what="temperature", residual=True):
        """T for vapour properties: t_min .. 1500 K; with ``residual``, warn above the EOS's Tmax."""
        self._ensure()
        T = np.asarray(T, dtype=float)
        if np.any(~np.isfinite(T)):
            raise FuelsysInputError(f"{what} must be a finite number [K]")
        if np.any(T < self.t_min) or np.any(T > T_IG_MAX):
            bad = T[(T < self.t_min) | (T > T_IG_MAX)].flat[0]
            raise FuelsysInputError(
                f"{what} {bad - T0_C:.1f} °C is outside {self.name}'s vapour range "
                f"{self.t_min - T0_C:.1f}..{T_IG_MAX - T0_C:.1f} °C")
        if residual:
            warn_validity(f"{self.name} equation of state (second virial coefficient)", "temperature", T,
                          self.t_min, self._T_eos_max, "K")
        return T

    # -- per-component helpers (arrays shaped (ncomp, *T.shape)) -------------
    def _comp(self, key, T):
        return np.stack([t.sat()[key](T) for t in self._tabs])

    def _lnp(self, T):
        """ln p_sat of each component [ln Pa], T clipped at each critical temperature."""
        return np.stack([t.lnp(np.minimum(T, t.Tc)) for t in self._tabs])

    def _mix_liquid(self, T, key, rule):
        self._ensure()
        T = self.check_temperature(T)
        if len(self._tabs) == 1:
            return as_float(self._tabs[0].sat()[key](T))
        v = self._comp(key, T)
        w = self._w.reshape((-1,) + (1,) * T.ndim)
        x = self._x.reshape(w.shape)
        if rule == "volume":
            out = 1.0 / np.sum(w / v, axis=0)
        elif rule == "mass":
            out = np.sum(w * v, axis=0)
        elif rule == "log-mole":
            out = np.exp(np.sum(x * np.log(v), axis=0))
        elif rule == "mole":
            out = np.sum(x * v, axis=0)
        else:  # "vredeveld"
            ratio = np.max(v, axis=0) / np.min(v, axis=0)
            warn_validity("Vredeveld (1973) conductivity rule", "component conductivity ratio", ratio,
                          1.0, VALIDITY["vredeveld_1973"]["ratio_max"], "-")
            out = np.sum(w / v**2, axis=0) ** -0.5
        return as_float(out)

    def _air_1atm(self, out, T):
        T = self.check_temperature(T)
        return as_float(_propsi(out, "T", T, "P", np.full(T.shape, P_ATM), self._tabs[0].fluid))

    # -- liquid properties ---------------------------------------------------
    def density(self, T):
        """Saturated-liquid density [kg/m³] (air: gas at 1 atm).

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Density [kg/m³]; blends by volume additivity 1/ρ = Σ w_i/ρ_i.

        References
        ----------
        CoolProp (Bell et al. 2014) with the reference equations named in
        the module docstring; blends: Amagat's law of additive volumes
        (ideal solution).

        Examples
        --------
        >>> round(get_gas("water").density(293.15), 1)
        998.2
        """
        self._ensure()
        if self._is_air:
            return self._air_1atm("Dmass", T)
        return self._mix_liquid(T, "rho_l", "volume")

    def dynamic_viscosity(self, T):
        """Saturated-liquid dynamic viscosity [Pa·s] (air: gas at 1 atm).

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Viscosity [Pa·s]; blends by Grunberg-Nissan without interaction,
            ln μ = Σ x_i ln μ_i.

        References
        ----------
        CoolProp transport models (Bell et al. 2014); Grunberg, L., Nissan,
        A. H. (1949), Nature 164, 799.

        Examples
        --------
        >>> round(get_gas("water").dynamic_viscosity(293.15) * 1e3, 3)
        1.002
        """
        self._ensure()
        if self._is_air:
            return self._air_1atm("viscosity", T)
        return self._mix_liquid(T, "mu_l", "log-mole")

    def kinematic_viscosity(self, T):
        """Saturated-liquid kinematic viscosity [m²/s] (air: gas at 1 atm).

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Kinematic viscosity μ/ρ [m²/s].

        References
        ----------
        As :meth:`dynamic_viscosity` and :meth:`density`.

        Examples
        --------
        >>> round(get_gas("water").kinematic_viscosity(293.15) * 1e6, 3)
        1.003
        """
        return as_float(np.asarray(self.dynamic_viscosity(T)) / np.asarray(self.density(T)))

    def specific_heat(self, T):
        """Saturated-liquid isobaric specific heat [J/(kg·K)] (air: gas at 1 atm).

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            cp [J/(kg·K)]; blends mass-weighted (ideal solution).

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("water").specific_heat(293.15))
        4184
        """
        self._ensure()
        if self._is_air:
            return self._air_1atm("Cpmass", T)
        return self._mix_liquid(T, "cp_l", "mass")

    def conductivity(self, T):
        """Saturated-liquid thermal conductivity [W/(m·K)] (air: gas at 1 atm).

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Conductivity [W/(m·K)]; blends by the Vredeveld power rule
            λ = (Σ w_i λ_i⁻²)^(-1/2).

        References
        ----------
        CoolProp transport models (Bell et al. 2014); Vredeveld, D. R.
        (1973), in Poling, Prausnitz & O'Connell (2001) §10-12.

        Examples
        --------
        >>> round(get_gas("water").conductivity(293.15), 3)
        0.598
        """
        self._ensure()
        if self._is_air:
            return self._air_1atm("conductivity", T)
        return self._mix_liquid(T, "k_l", "vredeveld")

    def surface_tension(self, T):
        """Surface tension of the saturated liquid against its vapour [N/m].

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Surface tension [N/m]; blends as the mole-fraction average.

        References
        ----------
        CoolProp surface-tension correlations (Mulero, Cachadiña & Parra
        2012, J. Phys. Chem. Ref. Data 41, 043105; IAPWS 2014 for water);
        Poling et al. (2001) §12-5 for the mixture average.

        Examples
        --------
        >>> round(get_gas("water").surface_tension(293.15) * 1e3, 1)
        72.8
        """
        self._ensure()
        self._require_saturating("surface tension")
        return self._mix_liquid(T, "sigma", "mole")

    # -- phase behaviour -------------------------------------------------------
    def _virial_terms(self, T):
        """p_sat [Pa], c = (B - v_L)/(R T) [1/Pa] and the supercritical mask, each (ncomp, *T.shape).

        Ingredients of the modified-Raoult K-values
        K_i = (p_i/P) exp[c_i (p_i - P)]  (virial vapour, Lewis rule, Poynting).
        """
        p = np.exp(self._lnp(T))
        B = np.stack([t.ig()["B"](T) for t in self._tabs])
        Tl = np.minimum(T, self._t_max)
        vl = np.stack([t.M / t.sat()["rho_l"](Tl) for t in self._tabs])
        c = (B - vl) / (R_GAS * T)
        sup = np.broadcast_to(T >= self._Tc.reshape((-1,) + (1,) * np.ndim(T)), p.shape)
        return p, c, sup

    def _col(self, v, ndim):
        return v.reshape((-1,) + (1,) * ndim)

    def _bubble_pressure(self, T, x=None):
        """Bubble pressure [Pa] at T of the liquid with mole fractions x (default: the feed).

        Newton's method on P = Σ x_i p_i exp[c_i (p_i - P)], started from Raoult's law.
        """
        if len(self._tabs) == 1:
            return np.exp(self._tabs[0].lnp(T))
        p, c, _ = self._virial_terms(T)
        x = self._col(self._x, np.ndim(T)) if x is None else x
        P = np.sum(x * p, axis=0)
        for _ in range(50):
            e = x * p * np.exp(c * (p - P))
            f = np.sum(e, axis=0) - P
            dP = f / (np.sum(e * c, axis=0) + 1.0)
            P = np.maximum(P + dP, 0.5 * P)
            if np.all(np.abs(dP) <= 1e-13 * P):
                break
        return P

    def _dew_pressure(self, T):
        """Dew pressure [Pa] at T of the vapour of feed composition.

        Newton's method on P Σ y_i / (p_i exp[c_i (p_i - P)]) = 1; a
        supercritical component (K = inf) does not condense.
        """
        if len(self._tabs) == 1:
            return np.exp(self._tabs[0].lnp(T))
        p, c, sup = self._virial_terms(T)
        y = self._col(self._x, np.ndim(T))
        pp = np.where(sup, 1.0, p)
        with np.errstate(divide="ignore"):
            P = 1.0 / np.sum(np.where(sup, 0.0, y / pp), axis=0)
        for _ in range(50):
            e = np.where(sup, 0.0, y * np.exp(-c * (pp - P)) / pp)
            s = np.sum(e, axis=0)
            g = P * s - 1.0
            dP = -g / (s + P * np.sum(e * c, axis=0))
            P = np.maximum(P + dP, 0.5 * P)
            if np.all(np.abs(dP) <= 1e-13 * P):
                break
        return P

    def _vapour_mass_fractions(self, T, w):
        """Mass fractions of the vapour in equilibrium with liquid of mass fractions w at its bubble point."""
        M = self._col(self._M, np.ndim(T))
        n = w / M
        x = n / np.sum(n, axis=0)
        P = self._bubble_pressure(T, x)
        p, c, _ = self._virial_terms(T)
        y = x * p / P * np.exp(c * (p - P))
        ym = y * M
        return ym / np.sum(ym, axis=0)

    def _rayleigh_rate(self, T, w):
        return self._vapour_mass_fractions(T, w) - w

    def _rayleigh(self, T, drawn, steps=32):
        """Liquid mass fractions after drawing ``drawn`` of the liquid mass off as vapour.

        Rayleigh (differential) distillation at constant T: with s = ln(m/m0),
        dw_i/ds = yw_i - w_i (from d(m w_i) = yw_i dm), integrated by the
        classical Runge-Kutta method in 32 steps (mass fractions converged to
        1e-6 even at 99 % drawn).
        """
        w = np.broadcast_to(self._col(self._w, T.ndim), (len(self._w),) + T.shape).copy()
        h = np.log1p(-drawn) / steps           # <= 0
        for _ in range(steps):
            k1 = self._rayleigh_rate(T, w)
            k2 = self._rayleigh_rate(T, w + 0.5 * h * k1)
            k3 = self._rayleigh_rate(T, w + 0.5 * h * k2)
            k4 = self._rayleigh_rate(T, w + h * k3)
            w = np.clip(w + h / 6.0 * (k1 + 2 * k2 + 2 * k3 + k4), 0.0, 1.0)
            w = w / np.sum(w, axis=0)
        return w

    def vapour_pressure(self, T):
        """Bubble-point (true vapour) pressure [Pa abs] of the liquid at ``T``.

        For a pure fluid the saturation pressure; for a blend the bubble
        pressure of the liquid of the nominal composition (modified Raoult's
        law, see the module docstring).

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Pressure [Pa abs].

        References
        ----------
        CoolProp (Bell et al. 2014); Smith, Van Ness & Abbott (2005) §14.1.

        Examples
        --------
        >>> round(get_gas("propane").vapour_pressure(293.15) / 1e5, 2)
        8.36
        """
        self._ensure()
        self._require_saturating("vapour pressure")
        T = self.check_temperature(T)
        return as_float(self._bubble_pressure(T))

    def dew_pressure(self, T):
        """Dew-point pressure [Pa abs] of the blend's vapour at ``T``.

        Equal to :meth:`vapour_pressure` for a pure fluid.

        Parameters
        ----------
        T : array_like
            Temperature [K]

        Returns
        -------
        float or ndarray
            Pressure [Pa abs].

        References
        ----------
        Smith, Van Ness & Abbott (2005) §14.1 (modified Raoult's law).

        Examples
        --------
        >>> g = get_gas("lpg-70-30")
        >>> g.dew_pressure(293.15) < g.vapour_pressure(293.15)
        True
        """
        self._ensure()
        self._require_saturating("dew pressure")
        T = self.check_temperature(T)
        return as_float(self._dew_pressure(T))

    def canister_pressure(self, T, drawn=0.0):
        """Pressure in a canister of the liquid at ``T`` [Pa abs].

        The bubble-point pressure of the liquid in the canister.  A full
        canister's liquid has the nominal composition.  When gas is drawn off
        the top (a canister standing upright), the vapour leaving is richer in
        propane than the liquid, so a blend's liquid grows richer in butane and
        its pressure falls: ``drawn`` is the share of the original liquid mass
        already drawn off as vapour, and the liquid composition follows
        Rayleigh's differential distillation at the temperature ``T`` with the
        vapour in equilibrium with the liquid (heat effects and the vapour
        held in the head space neglected).  A pure fluid's pressure does not
        change with ``drawn``; nor does a blend's when liquid is drawn
        (canister inverted): use ``drawn=0`` then.

        Parameters
        ----------
        T : array_like
            Canister (liquid) temperature [K]
        drawn : array_like
            Share of the original liquid mass drawn off as vapour, 0 <= drawn
            <= 0.99 [kg/kg]

        Returns
        -------
        float or ndarray
            Absolute pressure [Pa abs]; subtract 101325 Pa for gauge.

        References
        ----------
        As :meth:`vapour_pressure`; Rayleigh, Lord (1902). On the distillation
        of binary mixtures. Phil. Mag. 4(23), 521-537.

        Examples
        --------
        >>> round(get_gas("propane").canister_pressure(293.15) / 1e5 - 1.01325, 2)
        7.35
        >>> g = get_gas("lpg-70-30")
        >>> g.canister_pressure(293.15, drawn=0.5) < g.canister_pressure(293.15)
        True
        """
        self._ensure()
        self._require_saturating("canister pressure")
        T = self.check_temperature(T)
        drawn = np.asarray(drawn, dtype=float)
        if np.any(~np.isfinite(drawn)) or np.any(drawn < 0) or np.any(drawn > 0.99):
            bad = drawn[~np.isfinite(drawn) | (drawn < 0) | (drawn > 0.99)].flat[0]
            raise FuelsysInputError(f"drawn (share of the canister drawn off as vapour) must be within "
                                    f"0..0.99 (got {bad:g})")
        if len(self._tabs) == 1 or not np.any(drawn > 0):
            return as_float(np.broadcast_to(self._bubble_pressure(T), np.broadcast(T, drawn).shape))
        T, drawn = np.broadcast_arrays(T, drawn)
        shape = T.shape
        Tf, df = T.ravel(), drawn.ravel()
        w = self._rayleigh(Tf, df)
        M = self._M.reshape(-1, 1)
        n = w / M
        return as_float(self._bubble_pressure(Tf, n / np.sum(n, axis=0)).reshape(shape))

    def canister_liquid_mass_fractions(self, T, drawn):
        """Mass fractions of the liquid left after drawing vapour off a canister.

        See :meth:`canister_pressure` for the model (Rayleigh distillation).

        Parameters
        ----------
        T : float
            Canister (liquid) temperature [K]
        drawn : float
            Share of the original liquid mass drawn off as vapour [kg/kg]

        Returns
        -------
        dict
            Mass fraction of each component [kg/kg].

        References
        ----------
        Rayleigh (1902), Phil. Mag. 4(23), 521.

        Examples
        --------
        >>> w = get_gas("lpg-70-30").canister_liquid_mass_fractions(293.15, 0.5)
        >>> w["propane"] < 0.7
        True
        """
        self._ensure()
        self._require_saturating("canister model")
        T = self.check_temperature(np.asarray(T, dtype=float).reshape(1))
        d = np.asarray(drawn, dtype=float).reshape(1)
        if not (np.isfinite(d[0]) and 0 <= d[0] <= 0.99):
            raise FuelsysInputError(f"drawn must be within 0..0.99 (got {float(d[0]):g})")
        if len(self._tabs) == 1:
            return dict(self.mass_fractions)
        w = self._rayleigh(T, d)
        return {k: float(v) for k, v in zip(self.components, w[:, 0])}

    def _solve_T(self, func, P, lo, hi, what):
        """Solve func(T, P) = 0 for T in [lo, hi] with func increasing in 1/T... (vectorised)."""
        shape = P.shape
        Pf = P.ravel()
        a = np.full(Pf.shape, 1.0 / hi)
        b = np.full(Pf.shape, 1.0 / lo)
        fa = func(1.0 / a, Pf)
        fb = func(1.0 / b, Pf)
        bad = np.sign(fa) == np.sign(fb)
        bad &= (fa != 0) & (fb != 0)
        if np.any(bad):
            i = int(np.flatnonzero(bad)[0])
            raise FuelsysInputError(
                f"no {what} of {self.name} within {lo - T0_C:.1f}..{hi - T0_C:.1f} °C at "
                f"{Pf[i] / 1e5:.6g} bar abs")
        x = chandrupatla(lambda xx: func(1.0 / xx, Pf), a, b, fa, fb, xtol=1e-17)
        return (1.0 / x).reshape(shape)

    def _p_limits(self, fn):
        lo, hi = np.asarray(self._t_min), np.asarray(self._t_max)
        return float(fn(lo)), float(fn(hi))

    def bubble_point(self, P):
        """Bubble-point temperature [K] of the liquid at pressure ``P``.

        Parameters
        ----------
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Temperature [K].

        Raises
        ------
        FuelsysInputError
            ``P`` <= 0, or outside the pressures of the liquid range.

        References
        ----------
        As :meth:`vapour_pressure` (inverted by Chandrupatla's method).

        Examples
        --------
        >>> round(get_gas("propane").bubble_point(101325.0), 2)
        231.04
        """
        self._ensure()
        self._require_saturating("bubble point")
        P = _check_pressure(P)
        P = self._check_p_range(P, self._bubble_pressure, "bubble")
        T = self._solve_T(lambda T, p: np.log(self._bubble_pressure(T) / p), P,
                          self._t_min, self._t_max, "bubble point")
        return as_float(T)

    def _check_p_range(self, P, fn, what):
        """Raise when P is outside the pressures of the liquid range; return P clipped into it.

        A relative slack of 1e-6 (the table's own accuracy) is allowed at the ends.
        """
        plo, phi = self._p_limits(fn)
        bad = (P < plo * (1 - 1e-6)) | (P > phi * (1 + 1e-6))
        if np.any(bad):
            worst = P[bad].flat[0]
            raise FuelsysInputError(
                f"pressure {worst / 1e5:.6g} bar abs is outside the range where {self.name} has a {what} "
                f"point: {plo / 1e5:.3g}..{phi / 1e5:.4g} bar abs")
        return np.clip(P, plo, phi)

    def dew_point(self, P, far=None):
        """Dew-point temperature [K] at pressure ``P``.

        With ``far`` None the dew point of the fuel's own vapour (modified
        Raoult's law); with a fuel/air mass ratio, that of the fuel-air
        mixture with air as an inert carrier (Raoult's law), which is lower.

        Parameters
        ----------
        P : array_like
            Pressure [Pa abs]
        far : array_like or None
            Fuel/air mass ratio [kg/kg]

        Returns
        -------
        float or ndarray
            Temperature [K].

        Raises
        ------
        FuelsysInputError
            ``P`` <= 0, ``far`` < 0, or no dew point in the fuel's range.

        References
        ----------
        Smith, Van Ness & Abbott (2005) §10.4, §14.1.

        Examples
        --------
        >>> g = get_gas("propane")
        >>> g.dew_point(101325.0, far=0.0638) < g.dew_point(101325.0)
        True
        """
        self._ensure()
        self._require_saturating("dew point")
        P = _check_pressure(P)
        if far is None:
            P = self._check_p_range(P, self._dew_pressure, "dew")
            T = self._solve_T(lambda T, p: np.log(self._dew_pressure(T) / p), P,
                              self._t_min, self._t_max, "dew point")
            return as_float(T)
        far = _check_far(far)
        P, far = np.broadcast_arrays(P, far)
        if np.any(far == 0):
            raise FuelsysInputError("fuel/air ratio must be > 0 for a mixture dew point (got 0)")
        za = self._z_air(far.ravel())
        zf = 1.0 - za
        x = self._x.reshape(-1, 1)

        def f(T, p):
            lnp = self._lnp(T)
            # ln Σ y_i P / p_i  (y_i = z_f x_i); decreasing in T -> use its negative
            return -np.log(np.sum(zf * x * p / np.exp(lnp), axis=0))

        hi = float(np.min(self._Tc)) * (1 - 1e-9)
        T = self._solve_T(f, P.ravel().copy(), self._t_min, hi, "dew point (fuel-air mixture)")
        return as_float(T.reshape(P.shape))

    def _z_air(self, far):
        """Mole fraction of air in the fuel-air feed."""
        na = 1.0 / M_AIR
        nf = far / self._Mmix
        return na / (na + nf)

    def _flash_air(self, T, P, far):
        """Rachford-Rice flash with inert air (Raoult).  Arrays of one flat shape.

        Returns psi (gas moles / feed moles), z (ncomp, n) fuel feed mole
        fractions of the total, and invK (ncomp, n).
        """
        za = self._z_air(far)
        z = (1.0 - za) * self._x.reshape(-1, 1)
        below = T.reshape(1, -1) < self._Tc.reshape(-1, 1)
        lnp = self._lnp(T)
        invK = np.where(below, P / np.exp(lnp), 0.0)          # 1/K = P/p_sat, 0 when supercritical

        def g(psi):
            d = invK + psi * (1.0 - invK)
            return za / psi + np.sum(z * (1.0 - invK) / d, axis=0)

        g1 = 1.0 - np.sum(z * invK, axis=0)                   # g(1)
        allgas = (g1 >= 0) | (za >= 1.0)
        if len(self._tabs) == 1:
            k = 1.0 / np.where(invK[0] > 0, invK[0], 1.0)
            psi = np.where(allgas, 1.0, za / np.maximum(1.0 - k, 1e-300))
        else:
            lo = np.where(allgas, 0.5, za)
            hi = np.ones_like(za)
            glo = np.where(allgas, 1.0, g(lo))
            ghi = np.where(allgas, -1.0, g1)
            psi = chandrupatla(g, lo, hi, glo, ghi, xtol=1e-15)
            psi = np.where(allgas, 1.0, psi)
        return np.clip(psi, za, 1.0), z, invK, za

    def _vap_mass_split(self, T, P, far):
        """Vaporised and liquid mass of each component per kg of fuel; partial pressures."""
        psi, z, invK, za = self._flash_air(T, P, far)
        d = invK + psi * (1.0 - invK)
        y = z / d                                             # vapour-phase mole fractions (fuel comps)
        M = self._M.reshape(-1, 1)
        vap_mol = psi * y                                     # per mole of feed
        vap_mol = np.minimum(vap_mol, z)
        fuel_mass = np.sum(z * M, axis=0)
        with np.errstate(invalid="ignore", divide="ignore"):
            vap = np.where(fuel_mass > 0, vap_mol * M / fuel_mass, self._w.reshape(-1, 1))
            liq = np.where(fuel_mass > 0, (z - vap_mol) * M / fuel_mass, 0.0)
        return vap, liq, y * P

    def vapour_fraction(self, T, P, far):
        """Equilibrium vaporised mass fraction of the fuel in air [0..1].

        Rachford-Rice flash of fuel plus air (air inert, never condenses),
        Raoult's-law K-values from CoolProp saturation pressures; a component
        above its critical temperature is all vapour.

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]
        far : array_like
            Fuel/air mass ratio [kg/kg]; 0 gives 1 (the lean limit)

        Returns
        -------
        float or ndarray
            Vaporised mass fraction of the fuel [-].

        References
        ----------
        Rachford & Rice (1952); Smith, Van Ness & Abbott (2005) §10.4 (Raoult).

        Examples
        --------
        >>> get_gas("propane").vapour_fraction(293.15, 101325.0, 0.0638)
        1.0
        """
        self._ensure()
        self._require_saturating("vapour-liquid model")
        T, P, far = np.broadcast_arrays(self._check_vapour_T(T, residual=False), _check_pressure(P),
                                        _check_far(far))
        shape = T.shape
        vap, _, _ = self._vap_mass_split(T.ravel(), P.ravel(), far.ravel())
        return as_float(np.clip(np.sum(vap, axis=0), 0.0, 1.0).reshape(shape))

    def latent_heat(self, T):
        """Heat of vaporisation [J/kg] of the liquid at ``T``.

        Pure fluid: h_vapour - h_liquid at saturation.  Blend: from the
        bubble-point liquid at ``T`` to the dew-point vapour at the same
        (bubble) pressure, ideal solution with virial vapour enthalpy
        h_i = h_ig,i(T) + P (B_ii - T dB_ii/dT)/M_i.

        Parameters
        ----------
        T : array_like
            Liquid temperature [K]

        Returns
        -------
        float or ndarray
            Latent heat [J/kg].

        References
        ----------
        CoolProp (Bell et al. 2014); Smith, Van Ness & Abbott (2005) §6.7
        (residual enthalpy of a virial gas).

        Examples
        --------
        >>> round(get_gas("propane").latent_heat(231.04) / 1e3)
        426
        """
        self._ensure()
        self._require_saturating("latent heat")
        T = self.check_temperature(T)
        if len(self._tabs) == 1:
            s = self._tabs[0].sat()
            return as_float(s["h_v"](T) - s["h_l"](T))
        Pb = self._bubble_pressure(T)
        # the dew point at the bubble pressure may lie above t_max: search up to Tc
        Td = self._solve_T(lambda TT, p: np.log(self._dew_pressure(TT) / p), Pb.ravel(),
                           self._t_min, float(np.min(self._Tc)) * (1 - 1e-9),
                           "dew point").reshape(T.shape)
        hl = sum(w * t.sat()["h_l"](T) for w, t in zip(self._w, self._tabs))
        hv = sum(w * (t.h_ig(Td) + Pb * t.virial_enthalpy_slope(Td)) for w, t in zip(self._w, self._tabs))
        return as_float(hv - hl)

    # -- heat --------------------------------------------------------------------
    def _h_liquid_comp(self, T):
        """Liquid enthalpy of each component relative to its liquid at 25 °C (T clipped to t_max)."""
        Tl = np.minimum(T, self._t_max)
        out = []
        for t in self._tabs:
            s = t.sat()
            h = s["h_l"](Tl) - s["h_l"](np.asarray(T_REF))
            h = h + s["cp_l"](Tl) * (T - Tl)
            out.append(h)
        return np.stack(out)

    def _h_vapour_comp(self, T, p_partial):
        """Vapour enthalpy of each component at partial pressure p (virial) rel. liquid at 25 °C."""
        out = []
        for i, t in enumerate(self._tabs):
            href = t.sat()["h_l"](np.asarray(T_REF))
            out.append(t.h_ig(T) + p_partial[i] * t.virial_enthalpy_slope(T) - href)
        return np.stack(out)

    def enthalpy(self, T, P, far):
        """Specific enthalpy of the fuel at equilibrium in air [J/kg of fuel].

        Liquid parts (saturated-liquid enthalpy) and vapour parts (ideal-gas
        enthalpy plus the virial residual at the component's partial
        pressure) weighted by the Rachford-Rice split of :meth:`vapour_fraction`.
        Reference: saturated liquid at 25 °C has h = 0 (air: the gas at 25 °C
        and 1 atm; ``far`` is then ignored).

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]
        far : array_like
            Fuel/air mass ratio [kg/kg]

        Returns
        -------
        float or ndarray
            Enthalpy [J/kg of fuel].

        References
        ----------
        CoolProp (Bell et al. 2014); Smith, Van Ness & Abbott (2005) §6.7;
        Rachford & Rice (1952).

        Examples
        --------
        >>> round(get_gas("propane").enthalpy(298.15, 101325.0, 0.01) / 1e3)
        368
        """
        self._ensure()
        if self._is_air:
            _check_far(far)
            return self.gas_enthalpy(T, P)
        T, P, far = np.broadcast_arrays(self._check_vapour_T(T), _check_pressure(P), _check_far(far))
        shape = T.shape
        Tf, Pf = T.ravel(), P.ravel()
        vap, liq, pp = self._vap_mass_split(Tf, Pf, far.ravel())
        h = np.sum(vap * self._h_vapour_comp(Tf, pp), axis=0)
        if np.any(liq > 0):
            h = h + np.sum(liq * self._h_liquid_comp(Tf), axis=0)
        return as_float(h.reshape(shape))

    def vapour_specific_heat(self, T):
        """Ideal-gas isobaric specific heat of the vapour [J/(kg·K)].

        Parameters
        ----------
        T : array_like
            Temperature [K], up to 1500 K

        Returns
        -------
        float or ndarray
            cp0 [J/(kg·K)], mass-weighted for blends.

        References
        ----------
        Ideal-gas parts of the reference equations of state (module docstring).

        Examples
        --------
        >>> round(get_gas("propane").vapour_specific_heat(300.0))
        1671
        """
        T = self._check_vapour_T(T, residual=False)
        return as_float(sum(w * t.ig()["cp0"](T) for w, t in zip(self._w, self._tabs)))

    # -- gas phase -----------------------------------------------------------------
    def _gas_state(self, T, P):
        """Checked, broadcast, flattened copies of (T, P) for gas properties, and the shape."""
        self._ensure()
        T = np.asarray(T, dtype=float)
        if np.any(~np.isfinite(T)):
            raise FuelsysInputError("temperature must be a finite number [K]")
        P = _check_pressure(P)
        T, P = np.broadcast_arrays(T, P)
        shape = T.shape
        T, P = T.ravel().copy(), P.ravel().copy()
        tmax = min(t.T_eos_max for t in self._tabs)
        if np.any(T < self._t_min) or np.any(T > tmax):
            bad = T[(T < self._t_min) | (T > tmax)][0]
            raise FuelsysInputError(
                f"temperature {bad - T0_C:.1f} °C is outside {self.name}'s gas range "
                f"{self._t_min - T0_C:.1f}..{tmax - T0_C:.1f} °C")
        pmax = self._pmax
        if np.any(P > pmax):
            raise FuelsysInputError(f"pressure must be <= {pmax / 1e5:.6g} bar abs for {self.name} "
                                    f"(got {P.max() / 1e5:.6g} bar abs)")
        if self._saturating:
            sub = T < float(np.max(self._Tc))
            if np.any(sub):
                pd = np.full(T.shape, np.inf)
                pd[sub] = self._dew_pressure(T[sub])
                # saturated vapour (P = dew pressure) is a gas; allow round-off above it
                cond = sub & (P > pd * (1.0 + 1e-6))
                if np.any(cond):
                    i = int(np.flatnonzero(cond)[0])
                    raise FuelsysInputError(
                        f"{self.name} condenses at {T[i] - T0_C:.1f} °C above "
                        f"{pd[i] / 1e5:.4g} bar abs (got {P[i] / 1e5:.4g} bar abs): "
                        "gas properties need a lower pressure or a higher temperature")
        return T, P, shape

    def _gas(self, out, T, P):
        """A CoolProp output for the gas phase at flat checked (T, P) arrays."""
        fluid = self.coolprop_string
        res = np.empty(T.shape)
        # below the highest critical temperature impose the gas phase (so a
        # saturated vapour at P = p_sat is not taken for liquid)
        sub = T < float(np.max(self._Tc)) if self._saturating else np.zeros(T.shape, dtype=bool)
        if np.any(sub):
            res[sub] = _propsi(out, "T|gas", T[sub], "P", P[sub], fluid)
        if np.any(~sub):
            res[~sub] = _propsi(out, "T", T[~sub], "P", P[~sub], fluid)
        return res

    def _gas_prop(self, out, T, P):
        T, P, shape = self._gas_state(T, P)
        return as_float(self._gas(out, T, P).reshape(shape))

    def gas_density(self, T, P):
        """Density of the gas [kg/m³] at ``T`` and ``P``.

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Density [kg/m³].

        Raises
        ------
        FuelsysInputError
            The fluid would condense at (T, P), or T, P out of range.

        References
        ----------
        CoolProp (Bell et al. 2014) with the reference equations of state.

        Examples
        --------
        >>> round(get_gas("air").gas_density(300.0, 101325.0), 4)
        1.177
        """
        return self._gas_prop("Dmass", T, P)

    def gas_viscosity(self, T, P):
        """Dynamic viscosity of the gas [Pa·s] at ``T`` [K] and ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Viscosity [Pa·s].

        References
        ----------
        CoolProp transport models (Bell et al. 2014); air: Lemmon & Jacobsen
        (2004), Int. J. Thermophys. 25, 21.

        Examples
        --------
        >>> round(get_gas("air").gas_viscosity(300.0, 101325.0) * 1e6, 2)
        18.54
        """
        return self._gas_prop("viscosity", T, P)

    def gas_cp(self, T, P):
        """Isobaric specific heat of the gas [J/(kg·K)] at ``T`` [K], ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            cp [J/(kg·K)].

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("air").gas_cp(300.0, 101325.0))
        1006
        """
        return self._gas_prop("Cpmass", T, P)

    def gas_cv(self, T, P):
        """Isochoric specific heat of the gas [J/(kg·K)] at ``T`` [K], ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            cv [J/(kg·K)].

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("air").gas_cv(300.0, 101325.0))
        718
        """
        return self._gas_prop("Cvmass", T, P)

    def gamma(self, T, P):
        """Ratio of specific heats cp/cv of the gas [-] at ``T`` [K], ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            cp/cv [-].

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("air").gamma(300.0, 101325.0), 2)
        1.4
        """
        T, P, shape = self._gas_state(T, P)
        return as_float((self._gas("Cpmass", T, P) / self._gas("Cvmass", T, P)).reshape(shape))

    def gas_conductivity(self, T, P):
        """Thermal conductivity of the gas [W/(m·K)] at ``T`` [K], ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Conductivity [W/(m·K)].

        References
        ----------
        CoolProp transport models (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("air").gas_conductivity(300.0, 101325.0) * 1e3, 1)
        26.4
        """
        return self._gas_prop("conductivity", T, P)

    def gas_speed_of_sound(self, T, P):
        """Speed of sound in the gas [m/s] at ``T`` [K], ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Speed of sound [m/s].

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("air").gas_speed_of_sound(300.0, 101325.0))
        347
        """
        return self._gas_prop("speed_of_sound", T, P)

    def _gas_h_rel(self, T, P):
        """CoolProp gas enthalpy moved to fuelsys's reference [J/kg]."""
        return self._gas("Hmass", T, P) - self._h_offset()

    def _h_offset(self):
        """CoolProp enthalpy of the reference state (liquid at 25 °C; air: gas 25 °C, 1 atm)."""
        if self._is_air:
            return float(_propsi("Hmass", "T", T_REF, "P", P_ATM, self._tabs[0].fluid))
        Tr = np.asarray(T_REF)
        return float(sum(w * t.sat()["h_l"](Tr) for w, t in zip(self._w, self._tabs)))

    def gas_enthalpy(self, T, P):
        """Enthalpy of the gas [J/kg] at ``T`` [K], ``P`` [Pa abs].

        Same reference as :meth:`enthalpy` (saturated liquid at 25 °C = 0;
        air: gas at 25 °C and 1 atm = 0), so differences are what matter.

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Enthalpy [J/kg].

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> round(get_gas("air").gas_enthalpy(398.15, 101325.0) / 1e3, 1)
        100.9
        """
        T, P, shape = self._gas_state(T, P)
        return as_float(self._gas_h_rel(T, P).reshape(shape))

    def gas_entropy(self, T, P):
        """Entropy of the gas [J/(kg·K)] at ``T`` [K], ``P`` [Pa abs] (CoolProp's reference state).

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Entropy [J/(kg·K)]; only differences are meaningful.

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> g = get_gas("air")
        >>> g.gas_entropy(300.0, 2e5) < g.gas_entropy(300.0, 1e5)
        True
        """
        return self._gas_prop("Smass", T, P)

    def compressibility(self, T, P):
        """Compressibility factor Z = P M/(ρ R T) of the gas [-] at ``T`` [K], ``P`` [Pa abs].

        Parameters
        ----------
        T : array_like
            Temperature [K]
        P : array_like
            Pressure [Pa abs]

        Returns
        -------
        float or ndarray
            Z [-].

        References
        ----------
        CoolProp (Bell et al. 2014).

        Examples
        --------
        >>> get_gas("propane").compressibility(293.15, 5e5) < 1
        True
        """
        T, P, shape = self._gas_state(T, P)
        rho = self._gas("Dmass", T, P)
        return as_float((P * self._Mmix / (rho * R_GAS * T)).reshape(shape))

    # -- description -------------------------------------------------------------------
    def info(self):
        """Rows (label, value, unit) describing the fluid, for FS_FUEL_INFO.

        Examples
        --------
        >>> dict((r[0], r[1]) for r in get_gas("propane").info())["kind"]
        'gas'
        """
        self._ensure()
        rows = [("name", self.name, ""), ("kind", self.kind, ""),
                ("source", "CoolProp " + ", ".join(t.species.coolprop for t in self._tabs), "")]
        if len(self.components) > 1:
            for k, w, x in zip(self.components, self._w, self._x):
                rows.append((f"{k} by mass", float(w * 100), "%"))
                rows.append((f"{k} by mole", float(x * 100), "%"))
        rows.append(("molar mass", self._Mmix * 1e3, "g/mol"))
        rows.append(("lowest temperature", self._t_min - T0_C, "°C"))
        rows.append(("highest liquid temperature" if self._saturating else "highest temperature",
                     self._t_max - T0_C, "°C"))
        rows.append(("critical temperature", float(np.min(self._Tc)) - T0_C, "°C"))
        if self._saturating:
            try:
                rows.append(("boiling point at 1 atm", self.bubble_point(P_ATM) - T0_C, "°C"))
            except FuelsysInputError:
                pass
            try:
                rows.append(("vapour pressure at 20 °C", self.vapour_pressure(293.15) / 1e5, "bar abs"))
                rows.append(("liquid density at 20 °C", self.density(293.15), "kg/m³"))
            except FuelsysInputError:
                pass
        if self._combustible:
            rows.append(("lower heating value (gas)", self.lhv_gas / 1e6, "MJ/kg"))
            rows.append(("lower heating value (liquid)", self.lhv / 1e6, "MJ/kg"))
            rows.append(("stoichiometric fuel/air ratio", self.stoich_far, "kg/kg"))
        return rows

    def __repr__(self):
        return f"CoolPropFluid({self.name!r})"
