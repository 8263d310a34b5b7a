"""Adiabatic flame temperature of a hydrocarbon and air, with and without dissociation.

Floor: flow and heat (uses thermo and fuels below it; the combustor above uses it).

The products are the ideal-gas mixture of CO2, H2O, CO, H2, O2, N2, Ar, OH,
H, O and NO.  At constant pressure and enthalpy the equilibrium composition
minimises the Gibbs energy subject to the element balances (C, H, O, N, Ar);
it is found by the element-potential (Lagrange-multiplier) Newton iteration
of Gordon & McBride (1994), with temperature as an extra unknown of the same
Newton step (their HP problem, eqs. 2.24-2.27) and their step-size control
(eqs. 3.1-3.2).  Every operating point of an array call is iterated together:
one batched linear solve per iteration for all points, no Python loop over
points.

Species data: NASA Glenn 9-coefficient polynomials (McBride, Zehe & Gordon
2002).  N2, O2, Ar, CO2 and H2O come from :data:`fuelsys.thermo.NASA9` (the
same numbers the engine's energy balance uses); CO, H2, OH, H, O and NO are
given here.  ``fuelsys.thermo``'s evaluation helpers are bound to its own five
species, so this module carries one small evaluator (:func:`_nasa9`) of the
same polynomial form for any coefficient table.

The fuel
--------
* A :class:`fuelsys.fuels.base.Fuel` (``get_fuel("kerosene")``, a user's
  fuel table, an oil blend, the LPG gases): the fuel is CH_y, y from
  :func:`fuelsys.fuels.fuel_h_to_c` (the same H/C ratio the engine's fuel
  demand uses), in the state its lower heating value refers to (liquid at
  25 °C for every fuelsys fuel); its enthalpy of formation follows from that
  heating value, so complete combustion here and the engine's energy balance
  agree exactly.  Kerosene (y = 1.90) thus stands as C12H22.8, close to the
  Jet-A formula C12H23 of the NASA tables.
* A built-in species of :data:`FUEL_SPECIES` (``"C3H8"``, ``"n-C4H10"``,
  ``"i-C4H10"``, ``"Jet-A(g)"``, ``"Jet-A(L)"``): formula and NASA
  7-coefficient polynomials of McBride, Gordon & Reno (1993), rewritten in the
  9-coefficient form (the two leading terms zero), reference state the species
  itself at 298.15 K.
* ``h_fuel`` adds the fuel's enthalpy above that reference state [J/kg], e.g.
  ``fuel.enthalpy(T, P, far)`` for kerosene vapour leaving a vaporiser tube, or
  :meth:`FuelComposition.sensible_enthalpy` for a gas premixed at the air
  temperature.

Complete combustion (no dissociation) uses the same solver restricted to
CO2, H2O, O2, N2, Ar for lean mixtures (a unique composition) and to CO2,
H2O, CO, H2, N2, Ar for rich ones (the water-gas shift at the flame
temperature fixes the split, Turns 2012 §2.7).

References
----------
.. [1] S. Gordon and B. J. McBride, "Computer Program for Calculation of
   Complex Chemical Equilibrium Compositions and Applications. I. Analysis",
   NASA RP-1311 (1994), §2.2-2.5 and §3.3 (eqs. 2.24-2.27, 3.1-3.2).
.. [2] B. J. McBride, M. J. Zehe and S. Gordon, "NASA Glenn Coefficients for
   Calculating Thermodynamic Properties of Individual Species",
   NASA/TP-2002-211556 (2002): CO, H2, OH, H, O, NO (and the five species of
   :mod:`fuelsys.thermo`), 200-6000 K.
.. [3] B. J. McBride, S. Gordon and M. A. Reno, "Coefficients for Calculating
   Thermodynamic and Transport Properties of Individual Species", NASA
   TM-4513 (1993): fuel species C3H8, n-C4H10, i-C4H10, Jet-A(g), Jet-A(L)
   (the data file of the CEA program, as distributed with Cantera in
   ``nasa_gas.yaml`` / ``nasa_condensed.yaml``).
.. [4] S. R. Turns, "An Introduction to Combustion", 3rd ed., McGraw-Hill
   2012, §2.7 (adiabatic flame temperature), §2.8-2.9 (equilibrium products,
   water-gas shift for rich complete combustion).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fuelsys import thermo
from fuelsys.constants import P_STANDARD, R_MOLAR, T_REF
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.fuels import fuel_h_to_c, get_fuel
from fuelsys.arrays import as_float as _out

R = R_MOLAR

#: elements, in the order of every element array here
ELEMENTS = ("C", "H", "O", "N", "Ar")

#: product species, in the order of every species array here
SPECIES = ("CO2", "H2O", "CO", "H2", "O2", "N2", "Ar", "OH", "H", "O", "NO")

#: atoms of each element in each species
COMPOSITION = {
    "CO2": {"C": 1, "O": 2}, "H2O": {"H": 2, "O": 1}, "CO": {"C": 1, "O": 1}, "H2": {"H": 2},
    "O2": {"O": 2}, "N2": {"N": 2}, "Ar": {"Ar": 1}, "OH": {"O": 1, "H": 1}, "H": {"H": 1},
    "O": {"O": 1}, "NO": {"N": 1, "O": 1},
}

#: NASA Glenn 9-coefficient polynomials (a1..a7, b1, b2) for 200-1000 K and 1000-6000 K,
#: McBride, Zehe & Gordon (2002), for the species fuelsys.thermo does not carry
NASA9_EXTRA = {
    "CO": (
        (1.489045326e04, -2.922285939e02, 5.724527170e00, -8.176235030e-03, 1.456903469e-05,
         -1.087746302e-08, 3.027941827e-12, -1.303131878e04, -7.859241350e00),
        (4.619197250e05, -1.944704863e03, 5.916714180e00, -5.664282830e-04, 1.398814540e-07,
         -1.787680361e-11, 9.620935570e-16, -2.466261084e03, -1.387413108e01),
    ),
    "H2": (
        (4.078323210e04, -8.009186040e02, 8.214702010e00, -1.269714457e-02, 1.753605076e-05,
         -1.202860270e-08, 3.368093490e-12, 2.682484665e03, -3.043788844e01),
        (5.608128010e05, -8.371504740e02, 2.975364532e00, 1.252249124e-03, -3.740716190e-07,
         5.936625200e-11, -3.606994100e-15, 5.339824410e03, -2.202774769e00),
    ),
    "OH": (
        (-1.998858990e03, 9.300136160e01, 3.050854229e00, 1.529529288e-03, -3.157890998e-06,
         3.315446180e-09, -1.138762683e-12, 2.991214235e03, 4.674110790e00),
        (1.017393379e06, -2.509957276e03, 5.116547860e00, 1.305299930e-04, -8.284322260e-08,
         2.006475941e-11, -1.556993656e-15, 2.019640206e04, -1.101282337e01),
    ),
    "H": (
        (0.0, 0.0, 2.5, 0.0, 0.0, 0.0, 0.0, 2.547370801e04, -4.466828530e-01),
        (6.078774250e01, -1.819354417e-01, 2.500211817e00, -1.226512864e-07, 3.732876330e-11,
         -5.687744560e-15, 3.410210197e-19, 2.547486398e04, -4.481917770e-01),
    ),
    "O": (
        (-7.953611300e03, 1.607177787e02, 1.966226438e00, 1.013670310e-03, -1.110415423e-06,
         6.517507500e-10, -1.584779251e-13, 2.840362437e04, 8.404241820e00),
        (2.619020262e05, -7.298722030e02, 3.317177270e00, -4.281334360e-04, 1.036104594e-07,
         -9.438304330e-12, 2.725038297e-16, 3.392428060e04, -6.679585350e-01),
    ),
    "NO": (
        (-1.143916503e04, 1.536467592e02, 3.431468730e00, -2.668592368e-03, 8.481399120e-06,
         -7.685111050e-09, 2.386797655e-12, 9.098214410e03, 6.728725490e00),
        (2.239018716e05, -1.289651623e03, 5.433936030e00, -3.656034900e-04, 9.880966450e-08,
         -1.416076856e-11, 9.380184620e-16, 1.750317656e04, -8.501669090e00),
    ),
}

#: validity of the flame-temperature methods, checked at run time (ValidityWarning outside):
#: the range the method is offered and tested for (tests/test_equilibrium.py against Cantera)
VALIDITY = {
    "phi": (0.3, 2.0, "-"),
    "t_inlet": (250.0, 900.0, "K"),
    "P": (0.5e5, 20.0e5, "Pa"),
}
#: hard limits (FuelsysInputError outside): the NASA polynomials' range for the inlet temperature,
#: a positive pressure, and an equivalence ratio below the one at which the reactants hold as many
#: carbon as oxygen atoms (C/O = 1, where solid carbon, absent from the product set, must form)
HARD_LIMITS = {"t_inlet": (200.0, 3000.0, "K")}

_MM = {s: sum(n * thermo.ATOMIC_MASS[e] for e, n in COMPOSITION[s].items()) for s in SPECIES}
_MOLAR_MASS = np.array([_MM[s] for s in SPECIES])
_A = np.array([[COMPOSITION[s].get(e, 0) for s in SPECIES] for e in ELEMENTS], dtype=float)  # (E, S)


def _table(name):
    if name in thermo.NASA9:
        return thermo.NASA9[name]
    return NASA9_EXTRA[name]


_COEF = np.array([[_table(s)[0], _table(s)[1]] for s in SPECIES])  # (S, 2, 9)
_T_MID = np.full(len(SPECIES), 1000.0)

#: species sets of complete combustion (no dissociation)
_LEAN_SET = np.array([s in ("CO2", "H2O", "O2", "N2", "Ar") for s in SPECIES])
_RICH_SET = np.array([s in ("CO2", "H2O", "CO", "H2", "N2", "Ar") for s in SPECIES])
_ALL_SET = np.ones(len(SPECIES), dtype=bool)



def _nasa9(coef, t_mid, T):
    """cp/R, h/(RT), s°/R of species with 9-coefficient polynomials.

    ``coef`` (S, 2, 9), ``t_mid`` (S,), ``T`` any shape; results (*T.shape, S).
    Same polynomial form as :mod:`fuelsys.thermo` (McBride, Zehe & Gordon 2002).
    """
    T = np.asarray(T, dtype=float)[..., None]
    a = np.where((T > t_mid)[..., None], coef[:, 1, :], coef[:, 0, :])  # (*T, S, 9)
    a1, a2, a3, a4, a5, a6, a7, b1, b2 = (a[..., k] for k in range(9))
    lnT = np.log(T)
    cp = a1 / T**2 + a2 / T + a3 + T * (a4 + T * (a5 + T * (a6 + T * a7)))
    h = (-a1 / T**2 + a2 * lnT / T + a3 + T * (a4 / 2 + T * (a5 / 3 + T * (a6 / 4 + T * a7 / 5)))
         + b1 / T)
    s = (-a1 / (2 * T**2) - a2 / T + a3 * lnT + T * (a4 + T * (a5 / 2 + T * (a6 / 3 + T * a7 / 4))) + b2)
    return cp, h, s


def species_properties(T):
    """cp, absolute enthalpy and standard entropy of every product species.

    Parameters
    ----------
    T : array_like
        Temperature [K]

    Returns
    -------
    dict
        ``cp`` [J/(mol K)], ``h`` [J/mol, including the enthalpy of formation
        at 298.15 K] and ``s`` [J/(mol K), at 1 bar], each of shape
        (*T.shape, len(SPECIES)) in :data:`SPECIES` order.

    References
    ----------
    McBride, Zehe & Gordon (2002), NASA/TP-2002-211556.

    Examples
    --------
    >>> p = species_properties(298.15)
    >>> round(float(p["h"][SPECIES.index("OH")]) / 1000, 2)
    37.28
    """
    T = np.asarray(T, dtype=float)
    cp, h, s = _nasa9(_COEF, _T_MID, T)
    Tx = T[..., None]
    return {"cp": R * cp, "h": R * Tx * h, "s": R * s}


# -- fuels -------------------------------------------------------------------------
def _nasa7_as_9(lo, hi=None):
    """NASA 7-coefficient ranges (A1..A7) written in the 9-coefficient form."""
    def conv(a):
        return (0.0, 0.0, a[0], a[1], a[2], a[3], a[4], a[5], a[6])
    return (conv(lo), conv(hi if hi is not None else lo))


#: built-in fuel species: formula (C, H, O), NASA 7-coefficient ranges (low, high), the
#: temperature where they meet [K], and the range of the fit [K]; McBride, Gordon & Reno (1993)
FUEL_SPECIES = {
    "C3H8": {"atoms": (3, 8, 0), "t_mid": 1000.0, "range": (200.0, 6000.0), "label": "propane gas",
             "nasa7": ((4.2110262, 1.71599803e-03, 7.06183472e-05, -9.19594116e-08, 3.64421372e-11,
                        -1.43812106e04, 5.60930491),
                       (6.66789363, 0.0206120214, -7.36553027e-06, 1.18440761e-09, -7.0695321e-14,
                        -1.62748521e04, -13.1859503))},
    "n-C4H10": {"atoms": (4, 10, 0), "t_mid": 1000.0, "range": (200.0, 6000.0), "label": "n-butane gas",
                "nasa7": ((6.14746806, 1.55947389e-04, 9.67913517e-05, -1.2548391e-07, 4.97816555e-11,
                           -1.75994402e04, -1.09409879),
                          (9.44535834, 0.0257858073, -9.23619122e-06, 1.48632755e-09, -8.87897158e-14,
                           -2.01382165e04, -26.3470076))},
    "i-C4H10": {"atoms": (4, 10, 0), "t_mid": 1000.0, "range": (200.0, 6000.0), "label": "isobutane gas",
                "nasa7": ((4.45479276, 8.26057985e-03, 8.29886664e-05, -1.14647642e-07, 4.64570101e-11,
                           -1.84593931e04, 4.92743175),
                          (9.76991245, 0.025499721, -9.14142932e-06, 1.47328271e-09, -8.80800188e-14,
                           -2.14052647e04, -30.0329101))},
    "Jet-A(g)": {"atoms": (12, 23, 0), "t_mid": 1000.0, "range": (273.15, 5000.0), "label": "Jet-A vapour",
                 "nasa7": ((2.0869217, 0.13314965, -8.1157452e-05, 2.9409286e-08, -6.5195213e-12,
                            -3.5912814e04, 27.3552972),
                           (24.880201, 0.078250048, -3.1550973e-05, 5.78789e-09, -3.9827968e-13,
                            -4.3110684e04, -93.6552468))},
    "Jet-A(L)": {"atoms": (12, 23, 0), "t_mid": 550.0, "range": (220.0, 550.0), "label": "Jet-A liquid",
                 "nasa7": ((19.049613, -0.016918532, 6.3022035e-04, -1.3336577e-06, 9.4335638e-10,
                            -4.4803964e04, -67.6902), None)},
}


@dataclass(frozen=True)
class FuelComposition:
    """What the equilibrium needs of a fuel: its atoms and its enthalpy.

    Attributes
    ----------
    name : str
        Label [-]
    atoms : tuple
        Atoms (C, H, O) per formula unit [-]
    molar_mass : float
        Mass of one formula unit [kg/mol]
    h_ref : float
        Enthalpy of one formula unit at 298.15 K in its reference state,
        including its enthalpy of formation [J/mol]
    coef : tuple or None
        9-coefficient polynomial ranges of the reference state, for
        :meth:`sensible_enthalpy` (None when only the heating value is known) [-]
    t_mid : float
        Temperature where the two ranges meet [K]
    t_range : tuple
        Range of the polynomial fit [K]
    """

    name: str
    atoms: tuple
    molar_mass: float
    h_ref: float
    coef: tuple | None = None
    t_mid: float = 1000.0
    t_range: tuple = (200.0, 6000.0)

    @property
    def stoich_far(self) -> float:
        """Stoichiometric fuel/air mass ratio in the dry air of :mod:`fuelsys.thermo` [kg/kg]."""
        c, h, o = self.atoms
        o2_per_kg_air = thermo.o2_mass_fraction_air() / thermo.MOLAR_MASS["O2"]
        return float(o2_per_kg_air * self.molar_mass / (c + h / 4.0 - o / 2.0))

    @property
    def lhv(self) -> float:
        """Lower heating value at 298.15 K, water as vapour, from the formation enthalpies [J/kg]."""
        c, h, o = self.atoms
        hp = species_properties(T_REF)["h"]
        i = SPECIES.index
        products = c * hp[i("CO2")] + h / 2 * hp[i("H2O")] - (c + h / 4 - o / 2) * hp[i("O2")]
        return float((self.h_ref - products) / self.molar_mass)

    def sensible_enthalpy(self, T):
        """Enthalpy above the reference state at 298.15 K, from the species polynomials.

        Parameters
        ----------
        T : array_like
            Fuel temperature [K]

        Returns
        -------
        float or ndarray
            h(T) - h(298.15 K) [J/kg]

        References
        ----------
        McBride, Gordon & Reno (1993), NASA TM-4513.

        Examples
        --------
        >>> round(fuel_composition("C3H8").sensible_enthalpy(298.15), 6)
        0.0
        """
        if self.coef is None:
            raise FuelsysInputError(f"{self.name}: no heat-capacity polynomial; give h_fuel directly [J/kg]")
        T = np.asarray(T, dtype=float)
        warn_validity(f"{self.name} polynomial", "fuel temperature", T, *self.t_range, "K")
        coef = np.array([self.coef])
        tm = np.array([self.t_mid])
        h = _nasa9(coef, tm, T)[1][..., 0] * R * T
        h0 = _nasa9(coef, tm, np.asarray(T_REF))[1][..., 0] * R * T_REF
        return _out((h - h0) / self.molar_mass)


def _species_fuel(key):
    d = FUEL_SPECIES[key]
    c, h, o = d["atoms"]
    mm = c * thermo.ATOMIC_MASS["C"] + h * thermo.ATOMIC_MASS["H"] + o * thermo.ATOMIC_MASS["O"]
    coef = _nasa7_as_9(*d["nasa7"])
    href = float(_nasa9(np.array([coef]), np.array([d["t_mid"]]), np.asarray(T_REF))[1][..., 0] * R * T_REF)
    return FuelComposition(key, (c, h, o), mm, href, coef, d["t_mid"], d["range"])


def ch_fuel(h_to_c, lhv, name="CH_y fuel"):
    """A CH_y fuel from its H/C ratio and lower heating value (reference state: as the heating value).

    Parameters
    ----------
    h_to_c : float
        Molar hydrogen/carbon ratio y [-]
    lhv : float
        Lower heating value at 298.15 K, water as vapour [J/kg]
    name : str
        Label [-]

    Returns
    -------
    FuelComposition
        One formula unit CH_y with the enthalpy of formation that makes its
        complete combustion release ``lhv`` [-]

    References
    ----------
    Turns (2012) §2.5 (heating value from enthalpies of formation).

    Examples
    --------
    >>> f = ch_fuel(1.9, 43.2e6)
    >>> round(f.lhv / 1e6, 6)
    43.2
    """
    y = float(h_to_c)
    q = float(lhv)
    if not (np.isfinite(y) and 0.0 < y <= 4.0):
        raise FuelsysInputError(f"h_to_c must be within 0..4 for a hydrocarbon CH_y (got {y:g})")
    if not (np.isfinite(q) and q > 0):
        raise FuelsysInputError(f"lower heating value must be > 0 (got {q:g} J/kg)")
    mm = thermo.ATOMIC_MASS["C"] + y * thermo.ATOMIC_MASS["H"]
    hp = species_properties(T_REF)["h"]
    i = SPECIES.index
    products = hp[i("CO2")] + y / 2 * hp[i("H2O")] - (1 + y / 4) * hp[i("O2")]
    return FuelComposition(name, (1.0, y, 0.0), mm, float(products + q * mm))


def fuel_composition(fuel="kerosene"):
    """The fuel as the equilibrium sees it.

    Parameters
    ----------
    fuel : str or Fuel or FuelComposition
        A key of :data:`FUEL_SPECIES`, a built-in fuel name of
        :func:`fuelsys.fuels.get_fuel`, a :class:`fuelsys.fuels.base.Fuel`, or
        a :class:`FuelComposition` [-]

    Returns
    -------
    FuelComposition
        Atoms and reference enthalpy [-]

    References
    ----------
    McBride, Gordon & Reno (1993) for the species; for Fuel objects the H/C
    ratio of :func:`fuelsys.fuels.fuel_h_to_c` and the fuel's heating value.

    Examples
    --------
    >>> fuel_composition("Jet-A(g)").atoms
    (12, 23, 0)
    """
    if isinstance(fuel, FuelComposition):
        return fuel
    if isinstance(fuel, str):
        key = {k.lower(): k for k in FUEL_SPECIES}.get(fuel.strip().lower())
        if key is not None:
            return _species_fuel(key)
        fuel = get_fuel(fuel.strip())
    lhv = getattr(fuel, "lhv", float("nan"))
    return ch_fuel(fuel_h_to_c(fuel), lhv, getattr(fuel, "name", "fuel"))


# -- reactants ---------------------------------------------------------------------
def _air_moles():
    """Moles of each product species in 1 kg of dry air (mol/kg), SPECIES order."""
    n = np.zeros(len(SPECIES))
    for k, s in enumerate(thermo.SPECIES):
        n[SPECIES.index(s)] = thermo.Y_AIR[k] / thermo.MOLAR_MASS[s]
    return n


_AIR_N = _air_moles()
_AIR_B = _A @ _AIR_N  # element moles per kg air


def _reactants(phi, t_inlet, fc, h_fuel):
    """Element moles b0 (N, E) and enthalpy h0 (N,) per kg of mixture, and the fuel/air ratio."""
    far = phi * fc.stoich_far
    c, h, o = fc.atoms
    b_fuel = np.array([c, h, o, 0.0, 0.0]) / fc.molar_mass  # per kg fuel
    b0 = (_AIR_B + far[..., None] * b_fuel) / (1.0 + far)[..., None]
    h_air = species_properties(t_inlet)["h"] @ _AIR_N  # J/kg air, absolute
    h0 = (h_air + far * (fc.h_ref / fc.molar_mass + h_fuel)) / (1.0 + far)
    return b0, h0, far


# -- the Gordon-McBride iteration ------------------------------------------------------
_SIZE = 18.420681  # ln(1e8): species below 1e-8 of the moles are "small" (RP-1311 §3.3)


def _equilibrate_hp(b0, h0, P, allowed, max_iter=80):
    """Equilibrium at fixed enthalpy and pressure; all points in one batched Newton iteration.

    b0 (N, E) element moles per kg, h0 (N,) J/kg, P (N,) Pa, allowed (N, S) bool.
    Returns T (N,), n_j (N, S) mol/kg and a converged flag (N,).
    """
    N, S = allowed.shape
    E = len(ELEMENTS)
    # species whose elements are all present
    present = b0 > 0  # (N, E)
    allowed = allowed & ~np.any((_A.T[None, :, :] > 0) & ~present[:, None, :], axis=2)
    # start as RP-1311 does: every allowed species alike, a hot guess of the temperature (3800 K);
    # total moles a tenth of the atoms per kg (any positive start converges under the step control)
    lnn = np.log(0.1 * np.sum(b0, axis=1))
    lnnj = np.where(allowed, lnn[:, None] - np.log(np.maximum(allowed.sum(1, keepdims=True), 1)), 0.0)
    lnT = np.full(N, np.log(3800.0))
    lnp = np.log(P / P_STANDARD)
    converged = np.zeros(N, dtype=bool)
    idx = np.arange(N)
    for _ in range(max_iter):
        act = idx[~converged]
        if act.size == 0:
            break
        al = allowed[act]
        T = np.exp(lnT[act])
        cp, hrt, sr = _nasa9(_COEF, _T_MID, T)  # (n, S)
        nj = np.where(al, np.exp(lnnj[act]), 0.0)
        ln_x = lnnj[act] - lnn[act][:, None]
        mu = np.where(al, hrt - sr + ln_x + lnp[act][:, None], 0.0)
        an = nj[:, None, :] * _A[None, :, :]  # (n, E, S)
        b = an.sum(-1)  # (n, E)
        M = np.zeros((act.size, E + 2, E + 2))
        rhs = np.zeros((act.size, E + 2))
        M[:, :E, :E] = an @ _A.T
        M[:, :E, E] = b
        M[:, :E, E + 1] = np.einsum("nes,ns->ne", an, hrt)
        rhs[:, :E] = b0[act] - b + np.einsum("nes,ns->ne", an, mu)
        nsum = nj.sum(1)
        nh = nj * hrt
        M[:, E, :E] = b
        M[:, E, E] = nsum - np.exp(lnn[act])
        M[:, E, E + 1] = nh.sum(1)
        rhs[:, E] = np.exp(lnn[act]) - nsum + np.sum(nj * mu, 1)
        M[:, E + 1, :E] = np.einsum("nes,ns->ne", an, hrt)
        M[:, E + 1, E] = nh.sum(1)
        M[:, E + 1, E + 1] = np.sum(nj * cp, 1) + np.sum(nh * hrt, 1)
        rhs[:, E + 1] = h0[act] / (R * T) - nh.sum(1) + np.sum(nh * mu, 1)
        # an element absent from the reactants keeps its potential at zero
        absent = ~present[act]
        if np.any(absent):
            ii, kk = np.nonzero(absent)
            M[ii, kk, :] = 0.0
            M[ii, :, kk] = 0.0
            M[ii, kk, kk] = 1.0
            rhs[ii, kk] = 0.0
        x = np.linalg.solve(M, rhs[..., None])[..., 0]
        pi, dlnn, dlnT = x[:, :E], x[:, E], x[:, E + 1]
        dlnnj = np.where(al, -mu + pi @ _A + dlnn[:, None] + hrt * dlnT[:, None], 0.0)
        # step control, RP-1311 eqs. 3.1-3.2
        big = al & (ln_x > -_SIZE) & (dlnnj > 0)
        d1 = np.maximum(5 * np.abs(dlnT), 5 * np.abs(dlnn))
        d1 = np.maximum(d1, np.max(np.where(big, np.abs(dlnnj), 0.0), axis=1))
        lam1 = np.where(d1 > 2.0, 2.0 / np.where(d1 > 0, d1, 1.0), 1.0)
        small = al & (ln_x <= -_SIZE) & (dlnnj >= 0)
        with np.errstate(divide="ignore", invalid="ignore"):
            l2 = np.abs((-ln_x - 9.2103404) / (dlnnj - dlnn[:, None]))
        lam2 = np.min(np.where(small & np.isfinite(l2), l2, np.inf), axis=1)
        lam = np.minimum(1.0, np.minimum(lam1, lam2))
        lnnj[act] = np.where(al, lnnj[act] + lam[:, None] * dlnnj, 0.0)
        lnn[act] = lnn[act] + lam * dlnn
        lnT[act] = np.clip(lnT[act] + lam * dlnT, np.log(150.0), np.log(6000.0))
        # keep vanishing species finite (far below any physical amount)
        lnnj[act] = np.maximum(lnnj[act], lnn[act][:, None] - 300.0)
        ok = ((np.sum(nj * np.abs(dlnnj), 1) / nsum <= 0.5e-7) & (np.abs(dlnn) <= 0.5e-7)
              & (np.abs(dlnT) <= 1e-8) & (lam == 1.0))
        converged[act[ok]] = True
    nj = np.where(allowed, np.exp(lnnj), 0.0)
    return np.exp(lnT), nj, converged


# -- public functions -----------------------------------------------------------------
def _inputs(phi, t_inlet, P, h_fuel):
    phi, t_inlet, P, h_fuel = (np.asarray(x, dtype=float) for x in (phi, t_inlet, P, h_fuel))
    shape = np.broadcast_shapes(phi.shape, t_inlet.shape, P.shape, h_fuel.shape)
    phi, t_inlet, P, h_fuel = (np.broadcast_to(x, shape).ravel() for x in (phi, t_inlet, P, h_fuel))
    for name, x, unit in (("phi", phi, "-"), ("t_inlet", t_inlet, "K"), ("P", P, "Pa"), ("h_fuel", h_fuel, "J/kg")):
        if np.any(~np.isfinite(x)):
            raise FuelsysInputError(f"{name} must be a finite number [{unit}]")
    if np.any(phi <= 0):
        raise FuelsysInputError(f"equivalence ratio must be > 0 (got {phi[phi <= 0][0]:g})")
    if np.any(P <= 0):
        raise FuelsysInputError(f"pressure must be > 0 (got {P[P <= 0][0]:g} Pa)")
    lo, hi, unit = HARD_LIMITS["t_inlet"]
    bad = (t_inlet < lo) | (t_inlet > hi)
    if np.any(bad):
        raise FuelsysInputError(f"inlet temperature must be within {lo:g}..{hi:g} K, the range of the NASA "
                                f"polynomials used (got {t_inlet[bad][0]:g} K)")
    return phi, t_inlet, P, h_fuel, shape


def _check_phi(phi, fc):
    c, h, o = fc.atoms
    # carbon atoms c against oxygen atoms o_air/phi + o of the reactants: C/O = 1 at phi_max
    o_air = 2.0 * (c + h / 4.0 - o / 2.0)  # O atoms of the air at phi = 1, per formula unit
    phi_max = (o_air / (c - o)) if c > o else np.inf
    if np.any(phi >= phi_max):
        raise FuelsysInputError(
            f"equivalence ratio {float(np.max(phi)):g} too rich for {fc.name}: at phi >= {phi_max:.3g} the "
            "mixture holds as many carbon as oxygen atoms and solid carbon (not in the product set) "
            f"forms; allowed: 0 < phi < {phi_max:.3g}, valid {VALIDITY['phi'][0]:g}..{VALIDITY['phi'][1]:g}")
    low, high, unit = VALIDITY["phi"]
    warn_validity("adiabatic flame temperature", "equivalence ratio", phi, low, high, unit)


def _solve(phi, t_inlet, P, fuel, h_fuel, allowed_rows):
    fc = fuel_composition(fuel)
    phi, t_inlet, P, h_fuel, shape = _inputs(phi, t_inlet, P, h_fuel)
    _check_phi(phi, fc)
    for key, x in (("t_inlet", t_inlet), ("P", P)):
        warn_validity("adiabatic flame temperature", "inlet temperature" if key == "t_inlet" else "pressure",
                      x, *VALIDITY[key])
    b0, h0, far = _reactants(phi, t_inlet, fc, h_fuel)
    allowed = allowed_rows(phi)
    T, nj, ok = _equilibrate_hp(b0, h0, P, allowed)
    if not np.all(ok):
        i = np.flatnonzero(~ok)[0]
        raise FuelsysInputError(
            f"the equilibrium iteration did not converge at phi {phi[i]:g}, t_inlet {t_inlet[i]:g} K, P {P[i]:g} Pa")
    return T, nj, far, shape


def _equilibrium_rows(phi):
    return np.broadcast_to(_ALL_SET, (phi.size, len(SPECIES)))


def _complete_rows(phi):
    return np.where((phi <= 1.0)[:, None], _LEAN_SET, _RICH_SET)


def gordon_mcbride_1994(phi, t_inlet, P, fuel="kerosene", h_fuel=0.0):
    """Adiabatic flame temperature with dissociation: chemical equilibrium at constant h and p.

    Gibbs-energy minimisation by element potentials (Gordon & McBride 1994,
    HP problem, eqs. 2.24-2.27 with the step control of eqs. 3.1-3.2), over
    CO2, H2O, CO, H2, O2, N2, Ar, OH, H, O, NO; all points iterated together.

    Parameters
    ----------
    phi : array_like
        Equivalence ratio (fuel/air over stoichiometric fuel/air) [-]
    t_inlet : array_like
        Air inlet temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str or Fuel or FuelComposition
        The fuel, see :func:`fuel_composition` [-]
    h_fuel : array_like
        Fuel enthalpy above its reference state (liquid at 25 °C for fuelsys
        fuels, the species at 25 °C for :data:`FUEL_SPECIES`) [J/kg]

    Returns
    -------
    float or ndarray
        Adiabatic flame temperature [K]

    Raises
    ------
    FuelsysInputError
        phi <= 0 or rich enough to form solid carbon, P <= 0, t_inlet outside
        200..3000 K, or no convergence.

    Notes
    -----
    Validity (:data:`VALIDITY`, ValidityWarning outside): phi 0.3-2.0,
    t_inlet 250-900 K, P 0.5-20 bar; checked against Cantera (GRI-Mech 3.0
    thermodynamics) in the tests.  Hydrocarbons, soot and minor species
    (HO2, N, N2O, ...) are not in the product set: near phi = 2 at low
    temperatures the true equilibrium holds some methane.

    References
    ----------
    Gordon & McBride (1994), NASA RP-1311; species data McBride, Zehe &
    Gordon (2002).

    Examples
    --------
    Propane-air at 1 atm and 25 °C (published equilibrium value 2267 K,
    Turns 2012 Table B.1, from memory):

    >>> round(gordon_mcbride_1994(1.0, 298.15, 101325.0, "C3H8"))
    2264
    """
    T, _, _, shape = _solve(phi, t_inlet, P, fuel, h_fuel, _equilibrium_rows)
    return _out(T.reshape(shape))


def complete_combustion(phi, t_inlet, P, fuel="kerosene", h_fuel=0.0):
    """Adiabatic flame temperature without dissociation.

    Lean (phi <= 1): products CO2, H2O, O2, N2, Ar, all fuel burned.  Rich:
    products CO2, H2O, CO, H2, N2, Ar, the split set by the water-gas shift
    CO + H2O = CO2 + H2 in equilibrium at the flame temperature.  Same solver
    as :func:`gordon_mcbride_1994`, restricted to those species.

    Parameters
    ----------
    phi : array_like
        Equivalence ratio [-]
    t_inlet : array_like
        Air inlet temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str or Fuel or FuelComposition
        The fuel, see :func:`fuel_composition` [-]
    h_fuel : array_like
        Fuel enthalpy above its reference state [J/kg]

    Returns
    -------
    float or ndarray
        Flame temperature without dissociation [K]

    References
    ----------
    Turns (2012) §2.7 and §2.9 (water-gas shift for rich products).

    Examples
    --------
    >>> complete_combustion(1.0, 298.15, 101325.0, "C3H8") > gordon_mcbride_1994(1.0, 298.15, 101325.0, "C3H8")
    True
    """
    T, _, _, shape = _solve(phi, t_inlet, P, fuel, h_fuel, _complete_rows)
    return _out(T.reshape(shape))


#: flame-temperature methods by name; the default is "equilibrium"
FLAME_METHODS = {"equilibrium": gordon_mcbride_1994, "complete": complete_combustion}


def adiabatic_flame_temperature(phi, t_inlet, P, fuel="kerosene", h_fuel=0.0, method="equilibrium"):
    """Adiabatic flame temperature of a fuel-air mixture by a named method.

    Parameters
    ----------
    phi : array_like
        Equivalence ratio [-]
    t_inlet : array_like
        Air inlet temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str or Fuel or FuelComposition
        The fuel, see :func:`fuel_composition` [-]
    h_fuel : array_like
        Fuel enthalpy above its reference state [J/kg]
    method : str
        "equilibrium" (default, :func:`gordon_mcbride_1994`, with
        dissociation) or "complete" (:func:`complete_combustion`) [-]

    Returns
    -------
    float or ndarray
        Flame temperature [K]

    References
    ----------
    See the two methods.

    Examples
    --------
    >>> t = adiabatic_flame_temperature([0.6, 1.0], 450.0, 2.5e5, "kerosene")
    >>> [round(float(x)) for x in t]
    [1813, 2364]
    """
    try:
        fn = FLAME_METHODS[method]
    except KeyError:
        raise FuelsysInputError(f"flame-temperature method {method!r} unknown; allowed: "
                                f"{', '.join(FLAME_METHODS)}") from None
    return fn(phi, t_inlet, P, fuel, h_fuel)


def equilibrium_products(phi, t_inlet, P, fuel="kerosene", h_fuel=0.0, method="equilibrium"):
    """Flame temperature and product composition.

    Parameters
    ----------
    phi : array_like
        Equivalence ratio [-]
    t_inlet : array_like
        Air inlet temperature [K]
    P : array_like
        Pressure [Pa abs]
    fuel : str or Fuel or FuelComposition
        The fuel, see :func:`fuel_composition` [-]
    h_fuel : array_like
        Fuel enthalpy above its reference state [J/kg]
    method : str
        "equilibrium" or "complete" [-]

    Returns
    -------
    dict
        ``T`` [K]; ``far`` fuel/air mass ratio [kg/kg]; ``moles`` dict species
        -> mol per kg of products [mol/kg]; ``x`` dict species -> mole
        fraction [-]; ``h`` absolute enthalpy of the products (= that of the
        reactants) [J/kg].  Arrays of the broadcast input shape (floats for
        scalar input).

    References
    ----------
    Gordon & McBride (1994); Turns (2012) §2.9.

    Examples
    --------
    >>> r = equilibrium_products(1.0, 298.15, 101325.0, "C3H8")
    >>> round(r["x"]["CO"], 3)
    0.012
    """
    if method not in FLAME_METHODS:
        raise FuelsysInputError(f"flame-temperature method {method!r} unknown; allowed: {', '.join(FLAME_METHODS)}")
    rows = _equilibrium_rows if method == "equilibrium" else _complete_rows
    T, nj, far, shape = _solve(phi, t_inlet, P, fuel, h_fuel, rows)
    h = np.sum(nj * species_properties(T)["h"], axis=1)
    x = nj / nj.sum(1, keepdims=True)
    return {"T": _out(T.reshape(shape)), "far": _out(far.reshape(shape)), "h": _out(h.reshape(shape)),
            "moles": {s: _out(nj[:, k].reshape(shape)) for k, s in enumerate(SPECIES)},
            "x": {s: _out(x[:, k].reshape(shape)) for k, s in enumerate(SPECIES)}}
