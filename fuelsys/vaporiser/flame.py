"""Laminar flame speed and flammability limits of the vapour-air mixture a tube delivers.

References
----------
.. [1] M. Metghalchi, J. C. Keck, Combust. Flame 48 (1982) 191-210.
.. [2] Ö. L. Gülder, SAE Technical Paper 841000 (1984).
.. [3] M. G. Zabetakis, US Bureau of Mines Bulletin 627 (1965).
"""

from __future__ import annotations

import numpy as np

from fuelsys.arrays import as_float as _out
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.fuels.base import P_ATM
from fuelsys.arrays import checked_array
from fuelsys.vaporiser._common import family
from fuelsys.vaporiser.constants import VALIDITY

# -- flame-speed constants (one table per correlation) -------------------------
#: Metghalchi & Keck (1982) constants as in Turns 3rd ed. Table 8.3: phi_m, B_m [m/s], B_phi [m/s]
MK_CONSTANTS = {
    "methanol": (1.11, 0.3692, -1.4051),
    "propane": (1.08, 0.3422, -1.3865),
    "isooctane": (1.13, 0.2632, -0.8472),
    "gasoline": (1.13, 0.2758, -0.7834),  # RMFD-303 indolene
}
#: Gülder (1984) constants: W [m/s], eta, xi, alpha, beta (from memory)
GULDER_CONSTANTS = {
    "methane": (0.422, 0.15, 5.18, 2.0, -0.5),
    "propane": (0.446, 0.12, 4.95, 1.77, -0.2),
    "ethanol": (0.465, 0.25, 6.34, 1.75, -0.17),
    "isooctane": (0.4658, -0.326, 4.48, 1.56, -0.22),
}
#: which correlation fuel stands for a fuel in the flame-speed tables; kerosene-type fuels use
#: isooctane (a common surrogate of similar laminar flame speed; our assumption)
FLAME_SPEED_SURROGATE = {"kerosene": "isooctane", "propane": "propane", "butane": "propane",
                         "isobutane": "propane", "lpg": "propane", "methane": "methane"}

#: flammability limits in air at 25 °C and 1 atm, vapour volume per cent (lower, upper):
#: kerosene 0.7-5.0 % and propane 2.1-9.5 %, butanes 1.8-8.4 % (Zabetakis 1965, US Bureau of Mines
#: Bulletin 627; Crowl & Louvar, "Chemical Process Safety", 3rd ed. 2011, Appendix B; from memory)
FLAMMABILITY_LIMITS = {"kerosene": (0.7, 5.0), "propane": (2.1, 9.5), "butane": (1.8, 8.4),
                       "isobutane": (1.8, 8.4), "lpg": (1.9, 9.0)}



def metghalchi_keck_1982(phi, T, P, fuel="isooctane"):
    """Laminar flame speed by Metghalchi & Keck (1982).

    ``S_L = (B_m + B_phi (phi - phi_m)²) (T/298 K)^alpha (P/1 atm)^beta``,
    ``alpha = 2.18 - 0.8 (phi - 1)``, ``beta = -0.16 + 0.22 (phi - 1)``;
    negative values (far from stoichiometric) are returned as 0.

    Parameters
    ----------
    phi : array_like
        Equivalence ratio of the unburned mixture [-]
    T : array_like
        Unburned-gas temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str
        A key of :data:`MK_CONSTANTS` [-]

    Returns
    -------
    float or ndarray
        Laminar flame speed [m/s]

    Notes
    -----
    Fitted for 0.8 <= phi <= 1.5, 298-700 K, 0.4-50 atm (ValidityWarning
    outside).

    References
    ----------
    .. [1] M. Metghalchi, J. C. Keck, "Burning velocities of mixtures of air
       with methanol, isooctane, and indolene at high pressure and
       temperature", Combust. Flame 48 (1982) 191-210.
    .. [2] Turns, "An Introduction to Combustion", 3rd ed., Table 8.3 and
       eq. 8.33.

    Examples
    --------
    >>> round(metghalchi_keck_1982(1.13, 298.0, 101325.0), 4)
    0.2632
    """
    if fuel not in MK_CONSTANTS:
        raise FuelsysInputError(f"Metghalchi-Keck fuel must be one of {', '.join(MK_CONSTANTS)} (got {fuel!r})")
    phi = checked_array(phi, "equivalence ratio", "", positive=True)
    T = checked_array(T, "temperature", "K", positive=True)
    P = checked_array(P, "pressure", "bar abs", positive=True, scale=1e-5)
    for key, v in (("phi", phi), ("T", T), ("P", P)):
        low, high, unit = VALIDITY["metghalchi_keck_1982"][key]
        warn_validity("Metghalchi-Keck 1982 flame speed", key, v, low, high, unit)
    return _out(_mk_raw(phi, T, P, fuel))


def _mk_raw(phi, T, P, fuel):
    pm, bm, b2 = MK_CONSTANTS[fuel]
    s0 = np.maximum(bm + b2 * (phi - pm) ** 2, 0.0)
    alpha = 2.18 - 0.8 * (phi - 1.0)
    beta = -0.16 + 0.22 * (phi - 1.0)
    return s0 * (T / 298.0) ** alpha * (P / P_ATM) ** beta


def gulder_1984(phi, T, P, fuel="isooctane"):
    """Laminar flame speed by Gülder (1984).

    ``S_L = W phi^eta exp(-xi (phi - 1.075)²) (T/300 K)^alpha (P/1 atm)^beta``;
    stays positive on the rich side, where vaporiser tubes run.

    Parameters
    ----------
    phi : array_like
        Equivalence ratio of the unburned mixture [-]
    T : array_like
        Unburned-gas temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str
        A key of :data:`GULDER_CONSTANTS` [-]

    Returns
    -------
    float or ndarray
        Laminar flame speed [m/s]

    Notes
    -----
    Fitted (from memory) for about 0.7 <= phi <= 1.4, 300-700 K, 1-8 atm;
    ValidityWarning outside.

    References
    ----------
    .. [1] Ö. L. Gülder, "Correlations of laminar combustion data for
       alternative S.I. engine fuels", SAE Technical Paper 841000 (1984).

    Examples
    --------
    >>> round(gulder_1984(1.075, 300.0, 101325.0, "propane"), 4)
    0.4499
    """
    if fuel not in GULDER_CONSTANTS:
        raise FuelsysInputError(f"Gülder fuel must be one of {', '.join(GULDER_CONSTANTS)} (got {fuel!r})")
    phi = checked_array(phi, "equivalence ratio", "", positive=True)
    T = checked_array(T, "temperature", "K", positive=True)
    P = checked_array(P, "pressure", "bar abs", positive=True, scale=1e-5)
    for key, v in (("phi", phi), ("T", T), ("P", P)):
        low, high, unit = VALIDITY["gulder_1984"][key]
        warn_validity("Gülder 1984 flame speed", key, v, low, high, unit)
    return _out(_gulder_raw(phi, T, P, fuel))


def _gulder_raw(phi, T, P, fuel):
    w, eta, xi, alpha, beta = GULDER_CONSTANTS[fuel]
    return w * phi ** eta * np.exp(-xi * (phi - 1.075) ** 2) * (T / 300.0) ** alpha * (P / P_ATM) ** beta


#: laminar flame-speed correlations: name -> (function, raw function, constants table)
FLAME_SPEED_METHODS = {"gulder": (gulder_1984, _gulder_raw, GULDER_CONSTANTS),
                       "metghalchi_keck": (metghalchi_keck_1982, _mk_raw, MK_CONSTANTS)}
#: default: Gülder, which stays positive on the rich side where the tube runs
FLAME_SPEED_DEFAULT = "gulder"


def laminar_flame_speed(phi, T, P, fuel="kerosene", method=FLAME_SPEED_DEFAULT):
    """Laminar flame speed of a fuel-air mixture (dispatcher).

    Parameters
    ----------
    phi : array_like
        Equivalence ratio [-]
    T : array_like
        Unburned-gas temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str or Fuel
        Fuel name or object; kerosene-type fuels use the isooctane constants
        (:data:`FLAME_SPEED_SURROGATE`) [-]
    method : str
        "gulder" (default) or "metghalchi_keck" [-]

    Returns
    -------
    float or ndarray
        Laminar flame speed [m/s]

    References
    ----------
    Gülder (1984); Metghalchi & Keck (1982); see the two functions.

    Examples
    --------
    >>> 0.2 < laminar_flame_speed(1.0, 300.0, 101325.0) < 0.5
    True
    """
    if method not in FLAME_SPEED_METHODS:
        raise FuelsysInputError(f"flame-speed method must be one of {', '.join(FLAME_SPEED_METHODS)} (got {method!r})")
    fn, _, table = FLAME_SPEED_METHODS[method]
    key = FLAME_SPEED_SURROGATE.get(family(fuel), "isooctane")
    if key not in table:
        key = "isooctane" if "isooctane" in table else next(iter(table))
    return fn(phi, T, P, key)


def flammability_limits(fuel, T, check=True):
    """Lower and upper flammability limits of a fuel vapour in air, as vapour mole fractions.

    Limits at 25 °C from :data:`FLAMMABILITY_LIMITS`, moved with temperature
    by the modified Burgess-Wheeler law of Zabetakis et al.:
    ``LFL_T = LFL_25 - 0.75 (T - 25 °C)/dHc``,
    ``UFL_T = UFL_25 + 0.75 (T - 25 °C)/dHc`` (vol %, dHc the net heat of
    combustion in kcal/mol from the fuel's LHV and molar mass).  Pressure
    is not accounted for (the upper limit widens with pressure).

    Parameters
    ----------
    fuel : Fuel
        The fuel (its name picks the table row; kerosene-type by default) [-]
    T : array_like
        Mixture temperature [K]
    check : bool
        Check T and flag it outside the temperature law's range; False for
        temperatures already checked by the caller [-]

    Returns
    -------
    tuple of float or ndarray
        (lower, upper) limit as vapour mole fractions in the mixture [-]

    References
    ----------
    .. [1] M. G. Zabetakis, "Flammability characteristics of combustible
       gases and vapors", US Bureau of Mines Bulletin 627 (1965).
    .. [2] D. A. Crowl, J. F. Louvar, "Chemical Process Safety", 3rd ed.,
       Prentice Hall 2011, eqs. 6-3 and 6-4 and Appendix B.

    Examples
    --------
    >>> class K: name = "kerosene"; lhv = 43.2e6; molar_mass = 0.167
    >>> lo, hi = flammability_limits(K(), 298.15)
    >>> round(lo * 100, 2), round(hi * 100, 2)
    (0.7, 5.0)
    """
    if not check:
        return _flammability_raw(fuel, np.asarray(T, dtype=float))
    T = checked_array(T, "temperature", "K", positive=True)
    low, high, unit = VALIDITY["flammability_limits"]["T"]
    warn_validity("flammability limits (Zabetakis temperature law)", "T", T, low, high, unit)
    return _flammability_raw(fuel, T)


def _flammability_raw(fuel, T):
    lfl, ufl = FLAMMABILITY_LIMITS[family(fuel)]
    dhc = float(fuel.lhv) * float(fuel.molar_mass) / 4184.0  # kcal/mol
    shift = 0.75 * (T - 298.15) / dhc
    lo = np.maximum(lfl - shift, 0.05 * lfl) / 100.0
    hi = (ufl + shift) / 100.0
    return _out(lo), _out(hi)

