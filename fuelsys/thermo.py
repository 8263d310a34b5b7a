"""Ideal-gas properties of air and of lean combustion products (ground floor: constants, errors, arrays).

Each species (N2, O2, Ar, CO2, H2O) is described by a NASA Glenn
9-coefficient polynomial pair (200-1000 K and 1000-6000 K)::

    cp/R   = a1/T^2 + a2/T + a3 + a4 T + a5 T^2 + a6 T^3 + a7 T^4
    h/(RT) = -a1/T^2 + a2 ln(T)/T + a3 + a4 T/2 + a5 T^2/3 + a6 T^3/4 + a7 T^4/5 + b1/T
    s°/R   = -a1/(2 T^2) - a2/T + a3 ln T + a4 T + a5 T^2/2 + a6 T^3/3 + a7 T^4/4 + b2

``h`` includes the enthalpy of formation at 298.15 K, so the same numbers
serve energy balances with reaction.  Air is dry air of the CIPM-2007
composition; the products of lean combustion of a hydrocarbon CH_y are air
less the oxygen burned plus CO2 and H2O.  Every function broadcasts over
temperature and fuel/air ratio arrays.

The module serves the engine's energy balance (:mod:`fuelsys.engine`) and is
meant for the vaporiser and combustor as well.

References
----------
.. [1] B. J. McBride, M. J. Zehe and S. Gordon, "NASA Glenn Coefficients for
   Calculating Thermodynamic Properties of Individual Species",
   NASA/TP-2002-211556 (2002): species N2, O2, Ar, CO2, H2O, 200-6000 K
   (the data file of the CEA program).  They reproduce NIST-JANAF
   (Chase 1998) heat capacities to about 0.05 %.
.. [2] M. W. Chase, "NIST-JANAF Thermochemical Tables", 4th ed., J. Phys.
   Chem. Ref. Data Monograph 9 (1998): the tables the fits are checked
   against in the tests.
.. [3] A. Picard, R. S. Davis, M. Gläser and K. Fujii, "Revised formula for
   the density of moist air (CIPM-2007)", Metrologia 45 (2008) 149-155,
   Table 1: dry-air mole fractions.
.. [4] CIAAW/IUPAC, standard atomic weights, conventional values (2013):
   C 12.011, H 1.008, O 15.999, N 14.007, Ar 39.948 g/mol.
.. [5] E. Tiesinga et al., CODATA 2018 recommended values: R = 8.314462618
   J/(mol K) (exact).
"""

from __future__ import annotations

import numpy as np

from fuelsys.constants import R_MOLAR, T_REF
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import as_float as _out


#: atomic weights [kg/mol] (IUPAC conventional values)
ATOMIC_MASS = {"C": 12.011e-3, "H": 1.008e-3, "O": 15.999e-3, "N": 14.007e-3, "Ar": 39.948e-3}

#: species in the order used by every array in this module
SPECIES = ("N2", "O2", "Ar", "CO2", "H2O")

#: molar masses [kg/mol]
MOLAR_MASS = {
    "N2": 2 * ATOMIC_MASS["N"],
    "O2": 2 * ATOMIC_MASS["O"],
    "Ar": ATOMIC_MASS["Ar"],
    "CO2": ATOMIC_MASS["C"] + 2 * ATOMIC_MASS["O"],
    "H2O": 2 * ATOMIC_MASS["H"] + ATOMIC_MASS["O"],
}

#: NASA Glenn 9-coefficient polynomials (McBride, Zehe & Gordon 2002):
#: (a1..a7, b1, b2) for 200-1000 K and for 1000-6000 K
NASA9 = {
    "N2": (
        (2.210371497e04, -3.818461820e02, 6.082738360e00, -8.530914410e-03, 1.384646189e-05,
         -9.625793620e-09, 2.519705809e-12, 7.108460860e02, -1.076003744e01),
        (5.877124060e05, -2.239249073e03, 6.066949220e00, -6.139685500e-04, 1.491806679e-07,
         -1.923105485e-11, 1.061954386e-15, 1.283210415e04, -1.586640027e01),
    ),
    "O2": (
        (-3.425563420e04, 4.847000970e02, 1.119010961e00, 4.293889240e-03, -6.836300520e-07,
         -2.023372700e-09, 1.039040018e-12, -3.391454870e03, 1.849699470e01),
        (-1.037939022e06, 2.344830282e03, 1.819732036e00, 1.267847582e-03, -2.188067988e-07,
         2.053719572e-11, -8.193467050e-16, -1.689010929e04, 1.738716506e01),
    ),
    "Ar": (
        (0.0, 0.0, 2.5, 0.0, 0.0, 0.0, 0.0, -7.453750000e02, 4.379674910e00),
        (0.0, 0.0, 2.5, 0.0, 0.0, 0.0, 0.0, -7.453750000e02, 4.379674910e00),
    ),
    "CO2": (
        (4.943650540e04, -6.264116010e02, 5.301725240e00, 2.503813816e-03, -2.127308728e-07,
         -7.689988780e-10, 2.849677801e-13, -4.528198460e04, -7.048279440e00),
        (1.176962419e05, -1.788791477e03, 8.291523190e00, -9.223156780e-05, 4.863676880e-09,
         -1.891053312e-12, 6.330036590e-16, -3.908350590e04, -2.652669281e01),
    ),
    "H2O": (
        (-3.947960830e04, 5.755731020e02, 9.317826530e-01, 7.222712860e-03, -7.342557370e-06,
         4.955043490e-09, -1.336933246e-12, -3.303974310e04, 1.724205775e01),
        (1.034972096e06, -2.412698562e03, 4.646110780e00, 2.291998307e-03, -6.836830480e-07,
         9.426468930e-11, -4.822380530e-15, -1.384286509e04, -7.978148510e00),
    ),
}
#: temperature where the two polynomials of every species meet [K]
T_MID = 1000.0
#: range of the polynomials, checked at run time [K]
VALIDITY = {"temperature": (200.0, 6000.0, "K")}

#: dry-air mole fractions (CIPM-2007, Picard et al. 2008, Table 1; minor gases folded into N2)
AIR_MOLE_FRACTION = {"N2": 0.780848 + (1.0 - 0.780848 - 0.209390 - 0.009332 - 0.00040),
                     "O2": 0.209390, "Ar": 0.009332, "CO2": 0.00040, "H2O": 0.0}

_COEF = np.array([[NASA9[s][0], NASA9[s][1]] for s in SPECIES])  # (species, range, 9)
_MM = np.array([MOLAR_MASS[s] for s in SPECIES])
_X_AIR = np.array([AIR_MOLE_FRACTION[s] for s in SPECIES])
#: molar mass of dry air [kg/mol]
M_AIR = float(_X_AIR @ _MM)
#: dry-air mass fractions, in SPECIES order [-]
Y_AIR = _X_AIR * _MM / M_AIR
#: specific gas constant of dry air [J/(kg K)]
R_AIR = R_MOLAR / M_AIR



def _temperature(T, what="temperature"):
    T = np.asarray(T, dtype=float)
    if np.any(~np.isfinite(T)) or np.any(T <= 0):
        bad = T[~(np.isfinite(T) & (T > 0))].flat[0]
        raise FuelsysInputError(f"{what} must be a finite absolute temperature > 0 K (got {bad})")
    low, high, unit = VALIDITY["temperature"]
    warn_validity("NASA Glenn polynomials (McBride, Zehe & Gordon 2002)", what, T, low, high, unit)
    return T


def _coeffs(T):
    """Coefficient array (species, 9, *T.shape) picking the range per temperature."""
    n = _COEF.shape[0]
    high = (T > T_MID)[None, None, ...]
    lo = _COEF[:, 0, :].reshape(n, 9, *([1] * T.ndim))
    hi = _COEF[:, 1, :].reshape(n, 9, *([1] * T.ndim))
    return np.where(high, hi, lo)


def _species_index(species):
    try:
        return SPECIES.index(species)
    except ValueError:
        raise FuelsysInputError(f"unknown species {species!r}; allowed: {', '.join(SPECIES)}") from None


def _cp_r(T):
    a = _coeffs(T)
    return (a[:, 0] / T**2 + a[:, 1] / T
            + a[:, 2] + T * (a[:, 3] + T * (a[:, 4] + T * (a[:, 5] + T * a[:, 6]))))


def _h_rt(T):
    a = _coeffs(T)
    return (-a[:, 0] / T**2 + a[:, 1] * np.log(T) / T
            + a[:, 2] + T * (a[:, 3] / 2 + T * (a[:, 4] / 3 + T * (a[:, 5] / 4 + T * a[:, 6] / 5)))
            + a[:, 7] / T)


def _s_r(T):
    a = _coeffs(T)
    return (-a[:, 0] / (2 * T**2) - a[:, 1] / T + a[:, 2] * np.log(T)
            + T * (a[:, 3] + T * (a[:, 4] / 2 + T * (a[:, 5] / 3 + T * a[:, 6] / 4)))
            + a[:, 8])


def molar_cp(species, T):
    """Ideal-gas isobaric molar heat capacity of one species.

    Parameters
    ----------
    species : str
        One of "N2", "O2", "Ar", "CO2", "H2O" [-]
    T : array_like
        Temperature [K]

    Returns
    -------
    float or ndarray
        cp [J/(mol K)]

    References
    ----------
    McBride, Zehe & Gordon (2002), NASA/TP-2002-211556.

    Examples
    --------
    >>> round(molar_cp("N2", 1000.0), 1)
    32.7
    """
    i = _species_index(species)
    T = _temperature(T)
    return _out(R_MOLAR * _cp_r(T)[i])


def molar_enthalpy(species, T):
    """Ideal-gas molar enthalpy including the enthalpy of formation at 298.15 K.

    Parameters
    ----------
    species : str
        One of "N2", "O2", "Ar", "CO2", "H2O" [-]
    T : array_like
        Temperature [K]

    Returns
    -------
    float or ndarray
        h [J/mol]

    References
    ----------
    McBride, Zehe & Gordon (2002), NASA/TP-2002-211556.

    Examples
    --------
    >>> round(molar_enthalpy("CO2", 298.15) / 1000, 1)
    -393.5
    """
    i = _species_index(species)
    T = _temperature(T)
    return _out(R_MOLAR * T * _h_rt(T)[i])


def molar_entropy(species, T):
    """Ideal-gas standard molar entropy at 1 bar.

    Parameters
    ----------
    species : str
        One of "N2", "O2", "Ar", "CO2", "H2O" [-]
    T : array_like
        Temperature [K]

    Returns
    -------
    float or ndarray
        s° [J/(mol K)]

    References
    ----------
    McBride, Zehe & Gordon (2002), NASA/TP-2002-211556.

    Examples
    --------
    >>> round(molar_entropy("N2", 298.15), 1)
    191.6
    """
    i = _species_index(species)
    T = _temperature(T)
    return _out(R_MOLAR * _s_r(T)[i])


# -- fuel and products ------------------------------------------------------
def o2_mass_fraction_air() -> float:
    """Mass fraction of oxygen in dry air [-] (CIPM-2007 composition).

    Returns
    -------
    float
        Y_O2 of dry air [-]

    References
    ----------
    Picard et al. (2008), Metrologia 45, 149, Table 1.

    Examples
    --------
    >>> round(o2_mass_fraction_air(), 4)
    0.2313
    """
    return float(Y_AIR[SPECIES.index("O2")])


def hydrogen_carbon_ratio(stoich_far):
    """Molar H/C ratio y of a hydrocarbon CH_y from its stoichiometric fuel/air ratio.

    Burning CH_y needs (1 + y/4) mol O2 per mol C, so
    ``stoich_far = (M_C + y M_H) Y_O2 / ((1 + y/4) M_O2)``, solved for y.

    Parameters
    ----------
    stoich_far : array_like
        Stoichiometric fuel/air mass ratio [kg/kg]

    Returns
    -------
    float or ndarray
        y, hydrogen atoms per carbon atom [-]

    Raises
    ------
    FuelsysInputError
        When no hydrocarbon CH_y (0 <= y <= 4) has that ratio.

    References
    ----------
    Element balance of complete combustion, e.g. Turns, "An Introduction to
    Combustion", 3rd ed., McGraw-Hill 2012, eq. 2.30-2.32.

    Examples
    --------
    >>> round(hydrogen_carbon_ratio(0.0680), 2)
    1.94
    """
    f = np.asarray(stoich_far, dtype=float)
    A = MOLAR_MASS["O2"] / o2_mass_fraction_air()  # kg air per mol O2
    y = (f * A - ATOMIC_MASS["C"]) / (ATOMIC_MASS["H"] - f * A / 4.0)
    if np.any(~np.isfinite(y)) or np.any(y < 0) or np.any(y > 4.0):
        raise FuelsysInputError(
            f"stoichiometric fuel/air ratio {np.ravel(f)[0]:.4g} belongs to no hydrocarbon CH_y with "
            "0 <= y <= 4 (allowed 0.0580..0.0868 kg/kg); give the H/C ratio directly")
    return _out(y)


def products_per_kg_fuel(h_to_c):
    """Mass of each species made (+) or used (-) per kg of CH_y burned completely.

    Parameters
    ----------
    h_to_c : array_like
        Molar hydrogen/carbon ratio y of the fuel [-]

    Returns
    -------
    ndarray
        Array of shape (5, ...) in :data:`SPECIES` order [kg/kg fuel]; the
        entries sum to 1 (mass conservation).

    References
    ----------
    CH_y + (1 + y/4) O2 -> CO2 + (y/2) H2O; Turns (2012) eq. 2.30.

    Examples
    --------
    >>> round(float(products_per_kg_fuel(2.0).sum()), 12)
    1.0
    """
    y = np.asarray(h_to_c, dtype=float)
    if np.any(~np.isfinite(y)) or np.any(y < 0) or np.any(y > 4):
        raise FuelsysInputError(f"h_to_c must be within 0..4 for a hydrocarbon CH_y (got {np.ravel(y)[0]})")
    m_fuel = ATOMIC_MASS["C"] + y * ATOMIC_MASS["H"]  # per mol C
    zero = np.zeros_like(y)
    nu = np.stack([zero,
                   -(1.0 + y / 4.0) * MOLAR_MASS["O2"] / m_fuel,
                   zero,
                   MOLAR_MASS["CO2"] / m_fuel,
                   (y / 2.0) * MOLAR_MASS["H2O"] / m_fuel])
    return nu


def stoichiometric_far(h_to_c):
    """Stoichiometric fuel/air mass ratio of CH_y in dry air.

    Parameters
    ----------
    h_to_c : array_like
        Molar hydrogen/carbon ratio y [-]

    Returns
    -------
    float or ndarray
        Stoichiometric fuel/air ratio [kg/kg]

    References
    ----------
    Turns (2012) eq. 2.31 with the CIPM-2007 dry-air oxygen fraction.

    Examples
    --------
    >>> round(stoichiometric_far(8.0 / 3.0), 4)  # propane C3H8
    0.0638
    """
    nu = products_per_kg_fuel(h_to_c)
    return _out(o2_mass_fraction_air() / -nu[SPECIES.index("O2")])


def mass_fractions(far=0.0, h_to_c=2.0):
    """Mass fractions of the products of lean complete combustion in dry air.

    Parameters
    ----------
    far : array_like
        Fuel/air mass ratio burned, 0 for air [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]

    Returns
    -------
    ndarray
        Shape (5, ...) in :data:`SPECIES` order [-]

    Raises
    ------
    FuelsysInputError
        For a negative or richer-than-stoichiometric fuel/air ratio (the
        products would hold CO and H2, which this lean model does not).

    References
    ----------
    Mass balance: Y = (Y_air + far nu) / (1 + far), nu from
    :func:`products_per_kg_fuel`.

    Examples
    --------
    >>> round(float(mass_fractions(0.0)[0]), 4)
    0.7552
    """
    far = np.asarray(far, dtype=float)
    nu = products_per_kg_fuel(h_to_c)
    if np.any(~np.isfinite(far)) or np.any(far < 0):
        raise FuelsysInputError(f"fuel/air ratio must be >= 0 (got {np.ravel(far)[0]})")
    nd = max(far.ndim, nu.ndim - 1)
    nu = nu.reshape(5, *([1] * (nd - (nu.ndim - 1))), *nu.shape[1:])
    y_air = Y_AIR.reshape(5, *([1] * nd))
    Y = (y_air + far * nu) / (1.0 + far)
    o2 = Y[SPECIES.index("O2")]
    if np.any(o2 < -1e-12):
        raise FuelsysInputError(
            "fuel/air ratio is richer than stoichiometric "
            f"({float(np.max(far)):.4g} > {float(np.min(stoichiometric_far(h_to_c))):.4g}); "
            "this lean-products model allows 0..stoichiometric")
    return np.clip(Y, 0.0, None)


def _mix(values, Y):
    """Mass-weighted sum over species; values (5, *T.shape) per kg of each species.

    Both arrays carry the species on axis 0; the remaining axes broadcast
    right-aligned, as numpy arrays do.
    """
    nd = max(values.ndim, Y.ndim)
    values = values.reshape(values.shape[0], *([1] * (nd - values.ndim)), *values.shape[1:])
    Y = Y.reshape(Y.shape[0], *([1] * (nd - Y.ndim)), *Y.shape[1:])
    return np.sum(values * Y, axis=0)


def cp(T, far=0.0, h_to_c=2.0):
    """Isobaric specific heat of air (far=0) or of lean combustion products.

    Parameters
    ----------
    T : array_like
        Temperature [K]
    far : array_like
        Fuel/air mass ratio burned [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]

    Returns
    -------
    float or ndarray
        cp [J/(kg K)]

    References
    ----------
    McBride, Zehe & Gordon (2002) species polynomials, ideal mixing by mass.

    Examples
    --------
    >>> round(cp(300.0))
    1005
    """
    T = _temperature(T)
    Y = mass_fractions(far, h_to_c)
    per_kg = R_MOLAR * _cp_r(T) / _MM.reshape(5, *([1] * T.ndim))
    return _out(_mix(per_kg, Y))


def enthalpy(T, far=0.0, h_to_c=2.0):
    """Sensible specific enthalpy h(T) - h(298.15 K) of air or lean products.

    Parameters
    ----------
    T : array_like
        Temperature [K]
    far : array_like
        Fuel/air mass ratio burned [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]

    Returns
    -------
    float or ndarray
        Sensible enthalpy [J/kg of mixture]

    References
    ----------
    McBride, Zehe & Gordon (2002) species polynomials, ideal mixing by mass.

    Examples
    --------
    >>> round(enthalpy(298.15), 6)
    0.0
    """
    T = _temperature(T)
    Y = mass_fractions(far, h_to_c)
    return _out(_mix(_sensible_per_kg(T), Y))


def _sensible_per_kg(T):
    shape = (5, *([1] * T.ndim))
    h_ref = (R_MOLAR * T_REF * _h_rt(np.asarray(T_REF))).reshape(shape)
    return (R_MOLAR * T * _h_rt(T) - h_ref) / _MM.reshape(shape)


def species_sensible_enthalpy(T):
    """Sensible enthalpy h(T) - h(298.15 K) of each species per kg of it.

    Parameters
    ----------
    T : array_like
        Temperature [K]

    Returns
    -------
    ndarray
        Shape (5, ...) in :data:`SPECIES` order [J/kg]

    References
    ----------
    McBride, Zehe & Gordon (2002), NASA/TP-2002-211556.

    Examples
    --------
    >>> species_sensible_enthalpy(500.0).shape
    (5,)
    """
    return _sensible_per_kg(_temperature(T))


def gas_constant(far=0.0, h_to_c=2.0):
    """Specific gas constant of air or lean products.

    Parameters
    ----------
    far : array_like
        Fuel/air mass ratio burned [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]

    Returns
    -------
    float or ndarray
        R [J/(kg K)]

    References
    ----------
    R = R_molar * sum(Y_i / M_i); CODATA 2018 R_molar.

    Examples
    --------
    >>> round(gas_constant(), 1)
    287.0
    """
    Y = mass_fractions(far, h_to_c)
    inv_m = np.sum(Y / _MM.reshape(5, *([1] * (Y.ndim - 1))), axis=0)
    return _out(R_MOLAR * inv_m)


def gamma(T, far=0.0, h_to_c=2.0):
    """Ratio of specific heats cp/cv of air or lean products (ideal gas).

    Parameters
    ----------
    T : array_like
        Temperature [K]
    far : array_like
        Fuel/air mass ratio burned [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]

    Returns
    -------
    float or ndarray
        gamma [-]

    References
    ----------
    cv = cp - R for an ideal gas.

    Examples
    --------
    >>> round(gamma(300.0), 3)
    1.4
    """
    c = np.asarray(cp(T, far, h_to_c))
    r = np.asarray(gas_constant(far, h_to_c))
    return _out(c / (c - r))


def temperature_from_enthalpy(h, far=0.0, h_to_c=2.0, t_guess=1000.0):
    """Temperature at which air or lean products have sensible enthalpy ``h``.

    Newton iteration on :func:`enthalpy`, vectorised (all points together).

    Parameters
    ----------
    h : array_like
        Sensible enthalpy relative to 298.15 K [J/kg]
    far : array_like
        Fuel/air mass ratio burned [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]
    t_guess : float
        Starting temperature [K]

    Returns
    -------
    float or ndarray
        Temperature [K]

    References
    ----------
    Newton's method with dh/dT = cp (McBride, Zehe & Gordon 2002 polynomials).

    Examples
    --------
    >>> round(temperature_from_enthalpy(enthalpy(1200.0)), 6)
    1200.0
    """
    h = np.asarray(h, dtype=float)
    far_a = np.asarray(far, dtype=float)
    T = np.full(np.broadcast(h, far_a, np.asarray(h_to_c)).shape, float(t_guess))
    low, high, _ = VALIDITY["temperature"]
    converged = False
    for _ in range(50):
        f = np.asarray(_enthalpy_quiet(T, far_a, h_to_c)) - h
        step = f / np.asarray(_cp_quiet(T, far_a, h_to_c))
        T = np.clip(T - step, 50.0, 2.0 * high)
        if np.all(np.abs(step) < 1e-9 * T):
            converged = True
            break
    if not converged or np.any(T >= 2.0 * high) or np.any(T <= 50.0):
        # the clip bounds were reached or Newton did not settle: no temperature has this enthalpy in range
        raise FuelsysInputError(
            f"no gas temperature between 50 K and {2.0 * high:.0f} K has this enthalpy "
            f"({float(np.ravel(h)[0]):.4g} J/kg): the polynomials' range is {low:.0f}..{high:.0f} K")
    _temperature(T)  # flags results outside the polynomials' range
    return _out(T)


def _enthalpy_quiet(T, far, h_to_c):
    Y = mass_fractions(far, h_to_c)
    return _mix(_sensible_per_kg(T), Y)


def _cp_quiet(T, far, h_to_c):
    Y = mass_fractions(far, h_to_c)
    return _mix(R_MOLAR * _cp_r(T) / _MM.reshape(5, *([1] * T.ndim)), Y)


def isentropic_temperature(t_inlet, pressure_ratio, far=0.0, h_to_c=2.0):
    """Temperature after an isentropic compression or expansion of an ideal-gas mixture.

    Solves s°(T2) - s°(t_inlet) = R ln(p2/p1) with the polynomial entropy
    (variable specific heats), Newton iteration vectorised.

    Parameters
    ----------
    t_inlet : array_like
        Temperature before the compression or expansion [K]
    pressure_ratio : array_like
        p2/p1 [-]
    far : array_like
        Fuel/air mass ratio burned [kg/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]

    Returns
    -------
    float or ndarray
        T2 [K]

    References
    ----------
    Ideal-gas entropy, e.g. Saravanamuttoo, Rogers, Cohen & Straznicky, "Gas
    Turbine Theory", 6th ed., Pearson 2009, Appendix A (variable specific heats).

    Examples
    --------
    >>> round(isentropic_temperature(288.15, 3.0), 1)
    394.0
    """
    t_inlet = _temperature(t_inlet, "start temperature")
    pr = np.asarray(pressure_ratio, dtype=float)
    if np.any(~np.isfinite(pr)) or np.any(pr <= 0):
        raise FuelsysInputError(f"pressure ratio must be > 0 (got {np.ravel(pr)[0]})")
    far = np.asarray(far, dtype=float)
    Y = mass_fractions(far, h_to_c)
    R = np.asarray(gas_constant(far, h_to_c))
    shape = np.broadcast(t_inlet, pr, far, np.asarray(h_to_c)).shape

    def s_mix(T):
        return _mix(R_MOLAR * _s_r(T) / _MM.reshape(5, *([1] * T.ndim)), Y)

    target = s_mix(t_inlet) + R * np.log(pr)
    T = np.broadcast_to(t_inlet * pr ** (0.2857), shape).astype(float)
    for _ in range(50):
        f = s_mix(T) - target
        step = f / (_mix(R_MOLAR * _cp_r(T) / _MM.reshape(5, *([1] * T.ndim)), Y) / T)
        T = np.clip(T - step, 20.0, 20000.0)
        if np.all(np.abs(step) < 1e-9 * T):
            break
    _temperature(T, "isentropic end temperature")
    return _out(T)
