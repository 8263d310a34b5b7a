"""Fuel with turbine oil mixed in, and the turbine oil itself.

Builders mix a few per cent by volume of synthetic turbine oil into the
kerosene to lubricate the engine's bearings.  The oil changes the liquid's
viscosity, density and heating value, and it never evaporates: in the flash it
is a heavy, non-volatile liquid that stays behind (the vaporised fraction of a
blend can at most reach the fuel's share; the rest wets the vaporiser wall).

* viscosity: Refutas viscosity blending number, by mass
  (:func:`refutas_blend`; Baird 1989, as in ASTM D7152 Annex practice);
* density: ideal (volume-additive) mixing;
* heating value and stoichiometric ratio: by mass;
* phase equilibrium: the fuel's pseudo-components plus the oil as a
  non-volatile component in Raoult's law (:meth:`PetroleumFuel.flash`).

The oil on its own (:class:`TurbineOil`) has density from the ASTM D1250 /
API MPMS 11.1 lubricating-oil expansion, viscosity from the Walther equation
(ASTM D341) through its two data-sheet points, heat capacity and conductivity
from Cragoe (1929), heating value from its model compound by Boie (1953).
"""

from __future__ import annotations

import functools
import math
import re

import numpy as np

from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.fuels.base import T0_C, Fuel, as_float
from fuelsys.fuels.petroleum import (
    HVAP_WATER_25C, M_C, M_H, M_O, RHO_WATER_15C, T_REF, PetroleumFuel, stoich_far_from_composition,
    walther_d341, walther_d341_fit,
)

#: oil share allowed in a blend, per cent by volume
OIL_PCT_RANGE = (0.0, 20.0)
#: Refutas blending number needs nu + 0.8 > 1 mm²/s; fitted for fuel and lubricating oils
REFUTAS_RANGE = {"nu": (0.2, 1.0e5, "mm²/s")}
#: upper temperature of the oil model: MIL-PRF-23699-class oils serve at bulk temperatures
#: up to about 200 °C (from memory); beyond that they degrade
OIL_T_MAX = 473.15


def refutas_vbn(nu):
    """Refutas viscosity blending number.

    .. math:: VBN = 14.534\\,\\ln\\ln(\\nu + 0.8) + 10.975\\quad (\\nu\\ \\mathrm{in\\ mm^2/s})

    Parameters
    ----------
    nu : array_like
        Kinematic viscosity [m²/s].

    Returns
    -------
    float or ndarray
        Viscosity blending number [-].

    References
    ----------
    Baird, C. T. (1989) *Guide to Petroleum Product Blending*, HPI Consultants;
    Maples, R. E. (2000) *Petroleum Refinery Process Economics*, 2nd ed., PennWell.

    Examples
    --------
    >>> round(refutas_vbn(1e-6), 3)
    3.252
    """
    cst = np.asarray(nu, dtype=float) * 1e6
    lo, hi, unit = REFUTAS_RANGE["nu"]
    warn_validity("Refutas blending number", "kinematic viscosity", cst, lo, hi, unit)
    return as_float(14.534 * np.log(np.log(np.maximum(cst, lo) + 0.8)) + 10.975)


def refutas_nu(vbn):
    """Kinematic viscosity from a Refutas blending number (inverse of :func:`refutas_vbn`).

    Parameters
    ----------
    vbn : array_like
        Viscosity blending number [-].

    Returns
    -------
    float or ndarray
        Kinematic viscosity [m²/s].

    References
    ----------
    Baird (1989); see :func:`refutas_vbn`.

    Examples
    --------
    >>> round(refutas_nu(refutas_vbn(2e-6)) * 1e6, 9)
    2.0
    """
    return as_float((np.exp(np.exp((np.asarray(vbn, dtype=float) - 10.975) / 14.534)) - 0.8) * 1e-6)


def refutas_blend(nu_a, nu_b, w_b):
    """Viscosity of a two-liquid blend by the Refutas method (mass-weighted blending numbers).

    Parameters
    ----------
    nu_a, nu_b : array_like
        Kinematic viscosities of the two liquids [m²/s].
    w_b : float
        Mass fraction of liquid b [kg/kg].

    Returns
    -------
    float or ndarray
        Blend kinematic viscosity [m²/s].

    References
    ----------
    Baird (1989); see :func:`refutas_vbn`.

    Examples
    --------
    >>> round(refutas_blend(1.3e-6, 25e-6, 0.0) * 1e6, 6)
    1.3
    """
    vbn = (1.0 - w_b) * np.asarray(refutas_vbn(nu_a)) + w_b * np.asarray(refutas_vbn(nu_b))
    return refutas_nu(vbn)


def filippov_1955(k1, k2, w2):
    """Thermal conductivity of a binary liquid mixture, Filippov (1955).

    .. math:: k = w_1 k_1 + w_2 k_2 - 0.72\\,w_1 w_2 |k_2 - k_1|

    Parameters
    ----------
    k1, k2 : array_like
        Conductivities of the two liquids [W/(m K)].
    w2 : float
        Mass fraction of liquid 2 [kg/kg].

    Returns
    -------
    float or ndarray
        Mixture conductivity [W/(m K)].

    References
    ----------
    Filippov, L. P. (1955) Vest. Mosk. Univ., Ser. Fiz. Mat. Estestv. Nauk 8,
    67-69; Poling, Prausnitz and O'Connell (2001) eq. 10-12.1.

    Examples
    --------
    >>> round(filippov_1955(0.12, 0.15, 0.5), 4)
    0.1296
    """
    k1, k2 = np.asarray(k1, dtype=float), np.asarray(k2, dtype=float)
    w1 = 1.0 - w2
    return as_float(w1 * k1 + w2 * k2 - 0.72 * w1 * w2 * np.abs(k2 - k1))


def boie_1953_hhv(w_c, w_h, w_o=0.0):
    """Higher heating value of a C-H-O fuel from its composition, Boie (1953).

    .. math:: HHV\\,[\\mathrm{MJ/kg}] = 35.16\\,w_C + 116.225\\,w_H - 11.09\\,w_O

    Parameters
    ----------
    w_c, w_h, w_o : float
        Mass fractions of carbon, hydrogen and oxygen [-].

    Returns
    -------
    float
        Higher heating value [J/kg].

    References
    ----------
    Boie, W. (1953) Energietechnik 3, 309-316; as in Channiwala, S. A. and
    Parikh, P. P. (2002) Fuel 81, 1051-1063, Table 1 (coefficients from memory).

    Examples
    --------
    n-Decane (published HHV 47.6 MJ/kg):

    >>> round(boie_1953_hhv(0.8442, 0.1558) / 1e6, 1)
    47.8
    """
    return (35.16 * w_c + 116.225 * w_h - 11.09 * w_o) * 1e6


def _formula_mass_fractions(formula: str):
    counts = {"C": 0, "H": 0, "O": 0}
    for el, num in re.findall(r"([CHO])(\d*)", formula):
        counts[el] += int(num or 1)
    mass = {"C": counts["C"] * M_C, "H": counts["H"] * M_H, "O": counts["O"] * M_O}
    total = sum(mass.values())
    return total, mass["C"] / total, mass["H"] / total, mass["O"] / total


class TurbineOil(Fuel):
    """A synthetic ester turbine oil, treated as a non-volatile liquid.

    Parameters
    ----------
    name : str
        Name [-].
    density_15c : float
        Density at 15 °C [kg/m³].
    viscosity_points : sequence
        Two pairs (temperature [K], kinematic viscosity [m²/s]).
    pour_point : float
        Pour point, the model's lower limit [K].
    flash_point : float
        Flash point (information) [K].
    model_compound : str
        Formula of the compound that stands for the base stock, e.g. "C33H60O8" [-].
    sources : dict
        Source text of each datum [-].

    Notes
    -----
    Its vapour pressure (below 1 Pa at 100 °C for polyol esters, from memory)
    is neglected: vapour_pressure, bubble and dew point are refused, the
    vaporised fraction is 0.

    References
    ----------
    MIL-PRF-23699 (turbine engine lubricating oil, synthetic base); see each method.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> round(get_fuel("turbine-oil").kinematic_viscosity(313.15) * 1e6, 3)
    25.0
    """

    kind = "liquid"

    def __init__(self, name, density_15c, viscosity_points, pour_point, flash_point, model_compound, sources=None):
        self.name = name
        self.density_15c = float(density_15c)
        (t1, n1), (t2, n2) = viscosity_points
        self.viscosity_points = ((float(t1), float(n1)), (float(t2), float(n2)))
        self.walther_a, self.walther_b = walther_d341_fit(float(t1), float(n1), float(t2), float(n2))
        self.t_min = float(pour_point)
        self.t_max = OIL_T_MAX
        self.flash_point = float(flash_point)
        self.model_compound = model_compound
        self.molar_mass, self.w_c, self.w_h, self.w_o = _formula_mass_fractions(model_compound)
        self.hhv = boie_1953_hhv(self.w_c, self.w_h, self.w_o)
        # water formed: w_H * M_H2O / (2 M_H) per kg
        self.lhv = self.hhv - self.w_h * 18.015e-3 / (2 * M_H) * HVAP_WATER_25C
        self.stoich_far = float(stoich_far_from_composition(self.w_c, self.w_h, self.w_o))
        self.sg = self.density_15c / RHO_WATER_15C
        self.sources = dict(sources or {})

    def density(self, T):
        """Density [kg/m³] at ``T`` [K]: ASTM D1250 / API MPMS 11.1 lubricating-oil expansion from 15 °C.

        .. math:: \\rho = \\rho_{15} e^{-\\alpha\\Delta T (1 + 0.8\\alpha\\Delta T)},
                  \\quad \\alpha = K_1/\\rho_{15},\\ K_1 = 0.6278\\ \\mathrm{kg/(m^3\\,K)}

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
        ASTM D1250-80 / API MPMS Ch. 11.1, Table 54D (lubricating oils; K0 = 0,
        K1 = 0.6278, from memory).
        """
        T = self.check_temperature(T)
        alpha = 0.6278 / self.density_15c
        dt = T - 288.15
        return as_float(self.density_15c * np.exp(-alpha * dt * (1.0 + 0.8 * alpha * dt)))

    def kinematic_viscosity(self, T):
        """Kinematic viscosity [m²/s] at ``T`` [K]: Walther equation (ASTM D341) through the two data-sheet points.

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
        ASTM D341-20.
        """
        T = self.check_temperature(T)
        return walther_d341(T, self.walther_a, self.walther_b)

    def specific_heat(self, T):
        """Liquid heat capacity [J/(kg K)] at ``T`` [K], Cragoe (1929): c = (0.388 + 0.00045 t[°F])/sqrt(SG) Btu/(lb °F).

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Specific heat [J/(kg K)].

        References
        ----------
        Cragoe (1929) US Bureau of Standards Misc. Publ. 97 (from memory).
        """
        T = self.check_temperature(T)
        return as_float(self._cp(T))

    def _cp(self, T):
        t_f = (np.asarray(T, dtype=float) - T0_C) * 1.8 + 32.0
        return (0.388 + 0.00045 * t_f) / math.sqrt(self.sg) * 4186.8

    def sensible_enthalpy(self, T):
        """Integral of the Cragoe heat capacity from 298.15 K to ``T`` [K], in [J/kg].

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Sensible enthalpy [J/kg].

        References
        ----------
        Cragoe (1929); see :meth:`specific_heat`.
        """
        T = np.asarray(T, dtype=float)
        f = lambda t: (0.388 * 1.8 * (t - T0_C) + 0.00045 * ((1.8 * (t - T0_C) + 32.0) ** 2) / 2.0)  # noqa: E731
        return as_float((f(T) - f(T_REF)) / math.sqrt(self.sg) * 4186.8 / 1.8)

    def conductivity(self, T):
        """Thermal conductivity [W/(m K)] at ``T`` [K], Cragoe (1929): k = 0.0677 (1 - 0.0003 (t[°F] - 32))/SG Btu/(h ft °F).

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Conductivity [W/(m K)].

        References
        ----------
        Cragoe (1929) US Bureau of Standards Misc. Publ. 97 (from memory).
        """
        T = self.check_temperature(T)
        t_f = (T - T0_C) * 1.8 + 32.0
        return as_float(0.0677 * (1.0 - 0.0003 * (t_f - 32.0)) / self.sg * 1.730735)

    def vapour_fraction(self, T, P, far):
        """Vaporised mass fraction: 0 -- the oil is treated as non-volatile.

        Parameters
        ----------
        T : array_like
            Temperature [K].
        P : array_like
            Pressure [Pa abs].
        far : array_like
            Oil/air mass ratio [kg/kg].

        Returns
        -------
        float or ndarray
            0 everywhere in the oil's range [kg/kg].

        References
        ----------
        Model assumption (polyol-ester vapour pressure below 1 Pa at 100 °C, from memory).
        """
        T = self.check_temperature(T)
        P = np.asarray(P, dtype=float)
        if np.any(~(P > 0)):
            raise FuelsysInputError("pressure must be > 0 Pa abs")
        T, P, far = np.broadcast_arrays(T, P, np.asarray(far, dtype=float))
        return as_float(np.zeros(T.shape))

    def with_oil(self, oil_pct):
        if float(oil_pct) == 0.0:
            return self
        raise FuelsysInputError(f"oil_pct applies to fuels; {self.name} is the oil itself (got {oil_pct})")

    def info(self):
        rows = [("name", self.name, ""), ("kind", "non-volatile ester turbine oil", ""),
                ("density at 15 °C", self.density_15c, "kg/m³")]
        for t, nu in self.viscosity_points:
            rows.append((f"viscosity at {t - T0_C:g} °C", nu * 1e6, "mm²/s"))
        rows += [("pour point", self.t_min - T0_C, "°C"), ("flash point", self.flash_point - T0_C, "°C"),
                 ("model compound", self.model_compound, ""),
                 ("lower heating value (Boie 1953)", self.lhv / 1e6, "MJ/kg"),
                 ("stoichiometric oil/air ratio", self.stoich_far, "kg/kg"),
                 ("liquid model range, high", self.t_max - T0_C, "°C")]
        rows += [(f"source: {k}", v, "") for k, v in self.sources.items()]
        return rows


def turbine_oil() -> TurbineOil:
    """The built-in turbine oil from :data:`fuelsys.fuels.library.TURBINE_OIL`."""
    from fuelsys.fuels.library import TURBINE_OIL

    d = {k: v for k, (v, _) in TURBINE_OIL.items()}
    return TurbineOil(
        name=d["name"], density_15c=d["density_15c"],
        viscosity_points=((d["visc_1_temp"] + T0_C, d["visc_1"] * 1e-6), (d["visc_2_temp"] + T0_C, d["visc_2"] * 1e-6)),
        pour_point=d["pour_point"] + T0_C, flash_point=d["flash_point"] + T0_C,
        model_compound=d["model_compound"], sources={k: s for k, (_, s) in TURBINE_OIL.items()})


class OilBlend(Fuel):
    """A petroleum fuel with turbine oil mixed in by volume.

    Parameters
    ----------
    fuel : PetroleumFuel
        The base fuel [-].
    oil : TurbineOil
        The oil [-].
    oil_pct : float
        Oil share by volume at 15 °C, 0..20 [%].

    Notes
    -----
    Surface tension is the base fuel's (no blend data for the oil; up to 20 %
    oil of 28-32 mN/m against kerosene's 23-28, from memory) -- flagged in
    :meth:`info`.  Latent heat is the fuel's, per kg of vapour formed (the oil
    does not vaporise).

    References
    ----------
    Refutas blending (Baird 1989); ideal mixing; Raoult's law with a
    non-volatile component.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> b = get_fuel("kerosene", oil_pct=5)
    >>> b.vapour_fraction(700.0, 101325, 0.05) <= b.fuel_mass_share
    True
    """

    kind = "liquid"

    def __init__(self, fuel: PetroleumFuel, oil: TurbineOil, oil_pct: float):
        self.fuel, self.oil, self.oil_pct = fuel, oil, float(oil_pct)
        phi = self.oil_pct / 100.0
        mo, mf = phi * oil.density_15c, (1.0 - phi) * fuel.density_15c
        self.oil_mass_share = mo / (mo + mf)
        self.fuel_mass_share = 1.0 - self.oil_mass_share
        self.name = f"{fuel.name} + {self.oil_pct:g} % {oil.name}"
        self.t_min = max(fuel.t_min, oil.t_min)
        self.t_max = min(fuel.t_max, oil.t_max)
        s, wo = self.fuel_mass_share, self.oil_mass_share
        self.n_oil = wo / oil.molar_mass  # mol per kg blend
        self.lhv = s * fuel.lhv + wo * oil.lhv
        self.stoich_far = 1.0 / (s / fuel.stoich_far + wo / oil.stoich_far)
        self.molar_mass = fuel.molar_mass
        self.density_15c = mo + mf
        self._x = s * fuel.n / (s * fuel.n.sum() + self.n_oil)

    def density(self, T):
        """Liquid density [kg/m³] at ``T`` [K], ideal volume-additive mixing of fuel and oil.

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
        Amagat's law of additive volumes (ideal mixing).
        """
        T = self.check_temperature(T)
        s, wo = self.fuel_mass_share, self.oil_mass_share
        return as_float(1.0 / (s / np.asarray(self.fuel.density(T)) + wo / np.asarray(self.oil.density(T))))

    def kinematic_viscosity(self, T):
        """Kinematic viscosity [m²/s] at ``T`` [K], Refutas blending (by mass) of fuel and oil.

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
        Baird (1989); see :func:`refutas_blend`.
        """
        T = self.check_temperature(T)
        return refutas_blend(self.fuel.kinematic_viscosity(T), self.oil.kinematic_viscosity(T), self.oil_mass_share)

    def specific_heat(self, T):
        """Liquid heat capacity [J/(kg K)] at ``T`` [K], mass average of fuel and oil.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Specific heat [J/(kg K)].

        References
        ----------
        Kopp's rule of additive heat capacities (ideal mixing).
        """
        T = self.check_temperature(T)
        return as_float(self.fuel_mass_share * np.asarray(self.fuel.specific_heat(T))
                        + self.oil_mass_share * np.asarray(self.oil.specific_heat(T)))

    def conductivity(self, T):
        """Thermal conductivity [W/(m K)] at ``T`` [K], Filippov (1955) mixing of fuel and oil.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Conductivity [W/(m K)].

        References
        ----------
        Filippov (1955); see :func:`filippov_1955`.
        """
        T = self.check_temperature(T)
        return filippov_1955(self.fuel.conductivity(T), self.oil.conductivity(T), self.oil_mass_share)

    def surface_tension(self, T):
        """Surface tension [N/m] at ``T`` [K]: the base fuel's (see the class notes).

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
        API TDB procedure 10A3.2 for the fuel.
        """
        T = self.check_temperature(T)
        return self.fuel.surface_tension(T)

    def vapour_pressure(self, T):
        """Bubble-point pressure [Pa] at ``T`` [K]: Raoult's law with the oil as a non-volatile solute.

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Vapour pressure [Pa abs].

        References
        ----------
        Raoult's law; Lee and Kesler (1975) for the fuel's components.
        """
        T = self.check_temperature(T)
        return self.fuel._vapour_pressure(T, self._x)

    def latent_heat(self, T):
        """Heat of vaporisation [J/kg of vapour] at ``T`` [K]: the fuel's (the oil does not vaporise).

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Heat of vaporisation [J/kg].

        References
        ----------
        Riedel (1954); Watson (1943).
        """
        T = self.check_temperature(T)
        return self.fuel.latent_heat(T)

    def bubble_point(self, P):
        """Bubble-point temperature [K] at ``P`` [Pa abs] of the blend (oil lowers it slightly by dilution).

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
        Raoult's law with a non-volatile component.
        """
        return self.fuel._bubble_point(P, self._x)

    def dew_point(self, P, far=None):
        """Dew-point temperature [K] at ``P`` [Pa abs] of the blend's vapour (fuel only), optionally with air.

        Parameters
        ----------
        P : array_like
            Pressure [Pa abs].
        far : array_like, optional
            Blend/air mass ratio [kg/kg]; None for the pure vapour.

        Returns
        -------
        float or ndarray
            Dew-point temperature [K]; the oil never vaporises, so this is the
            temperature above which only the oil is left liquid.

        References
        ----------
        Raoult's law; Dalton's law.
        """
        if far is None:
            return self.fuel.dew_point(P)
        return self.fuel.dew_point(P, np.asarray(far, dtype=float) * self.fuel_mass_share)

    def _flash(self, T, P, far):
        # the fuel's flash checks T against the fuel's range for evaporation; the oil stays
        # liquid throughout (only its sensible heat depends on T: see enthalpy)
        return self.fuel.flash(T, P, far, n_heavy=self.n_oil, volatile_share=self.fuel_mass_share)

    def vapour_fraction(self, T, P, far):
        """Vaporised mass fraction of the blend [0..fuel share] at ``T`` [K], ``P`` [Pa abs], blend/air ratio ``far`` [kg/kg].

        Parameters
        ----------
        T : array_like
            Temperature [K].
        P : array_like
            Pressure [Pa abs].
        far : array_like
            Blend/air mass ratio [kg/kg].

        Returns
        -------
        float or ndarray
            Vaporised mass / blend mass [kg/kg]; never above the fuel's mass share.

        References
        ----------
        Raoult's law with air inert and the oil non-volatile; Rachford and Rice (1952).
        """
        return as_float(self._flash(T, P, far)["vaporised"])

    def enthalpy(self, T, P, far):
        """Enthalpy [J/kg of blend] at equilibrium, liquid at 298.15 K = 0.

        Parameters
        ----------
        T : array_like
            Temperature [K].
        P : array_like
            Pressure [Pa abs].
        far : array_like
            Blend/air mass ratio [kg/kg].

        Returns
        -------
        float or ndarray
            Specific enthalpy [J/kg].

        References
        ----------
        Kesler and Lee (1976); Riedel (1954); Watson (1943); Cragoe (1929) for the oil.
        """
        fl = self._flash(T, P, far)
        T = np.broadcast_to(np.asarray(T, dtype=float), fl["vaporised"].shape)
        f = self.fuel
        vap = fl["vap_mass"]
        liq = self.fuel_mass_share * f.w - vap
        h = np.sum(liq * f._liquid_enthalpy(T) + vap * f._vapour_enthalpy(T), axis=-1)
        warn_validity("Cragoe (1929) oil heat capacity", "temperature", T, self.oil.t_min, self.oil.t_max, "K")
        h = h + self.oil_mass_share * np.asarray(self.oil.sensible_enthalpy(T))
        return as_float(h)

    def vapour_specific_heat(self, T):
        """Ideal-gas heat capacity of the blend's vapour (the fuel's) [J/(kg K)] at ``T`` [K].

        Parameters
        ----------
        T : array_like
            Temperature [K].

        Returns
        -------
        float or ndarray
            Ideal-gas specific heat [J/(kg K)].

        References
        ----------
        Kesler and Lee (1976).
        """
        return self.fuel.vapour_specific_heat(T)

    def with_oil(self, oil_pct):
        return blend_with_oil(self.fuel, oil_pct)

    def info(self):
        rows = [("name", self.name, ""), ("kind", "petroleum fuel with turbine oil", ""),
                ("oil share", self.oil_pct, "% vol"), ("oil share", self.oil_mass_share * 100, "% mass"),
                ("density at 15 °C", self.density_15c, "kg/m³"),
                ("lower heating value", self.lhv / 1e6, "MJ/kg"),
                ("stoichiometric fuel/air ratio", self.stoich_far, "kg/kg"),
                ("surface tension", "the base fuel's (no oil blend data)", "")]
        rows += [(f"fuel: {lab}", v, u) for lab, v, u in self.fuel.info() if lab not in ("name", "kind")]
        return rows


@functools.lru_cache(maxsize=128)
def _cached_blend(fuel: PetroleumFuel, oil_pct: float) -> OilBlend:
    from fuelsys.fuels import get_fuel

    return OilBlend(fuel, get_fuel("turbine-oil"), oil_pct)


def blend_with_oil(fuel: PetroleumFuel, oil_pct) -> Fuel:
    """``fuel`` with ``oil_pct`` per cent by volume of the built-in turbine oil.

    Parameters
    ----------
    fuel : PetroleumFuel
        The base fuel [-].
    oil_pct : float
        Oil share by volume, 0..20 [%].

    Returns
    -------
    Fuel
        ``fuel`` itself for 0 %, else a cached :class:`OilBlend` (keyed on the
        share rounded to 1e-6 %).

    References
    ----------
    See :class:`OilBlend`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> k = get_fuel("kerosene")
    >>> blend_with_oil(k, 2) is blend_with_oil(k, 2.0)
    True
    """
    try:
        pct = float(oil_pct)
    except (TypeError, ValueError):
        raise FuelsysInputError(f"oil_pct must be a number 0..20 % vol (got {oil_pct!r})") from None
    lo, hi = OIL_PCT_RANGE
    if not lo <= pct <= hi:
        raise FuelsysInputError(f"oil_pct must be {lo:g}..{hi:g} % vol (got {pct:g})")
    if pct == 0.0:
        return fuel
    return _cached_blend(fuel, round(pct, 6))
