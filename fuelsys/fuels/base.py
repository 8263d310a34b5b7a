"""The interface every fuel in fuelsys offers, liquid or gas.

Every method takes SI arguments (K, Pa, kg/kg) and broadcasts over numpy
arrays; scalars in give Python floats out.  Impossible input raises
:class:`fuelsys.errors.FuelsysInputError` whose message names the quantity and
the allowed range; input outside a correlation's fitted range computes and
issues :class:`fuelsys.errors.ValidityWarning`.

Two families implement it:

* :class:`fuelsys.fuels.petroleum.PetroleumFuel` -- kerosene-type fractions
  characterised by pseudo-components (and blends with turbine oil);
* :class:`fuelsys.fuels.gases.CoolPropFluid` -- propane, butanes, LPG blends,
  air and water from CoolProp's reference equations of state.
"""

from __future__ import annotations

import numpy as np

from fuelsys.arrays import as_float  # noqa: F401 -- part of this module's interface
from fuelsys import thermo as _thermo
from fuelsys.constants import P_ATM, T0_C  # noqa: F401 -- part of this module's interface
from fuelsys.errors import FuelsysInputError



class Fuel:
    """Abstract fuel.  Subclasses fill in the properties they can give.

    Attributes
    ----------
    name : str
        Name as the user knows it ("kerosene", "propane", a user's table name).
    kind : str
        "liquid" for kerosene-type fuels and oils, "gas" for CoolProp fluids
        (which may still be liquid in a canister).
    lhv : float
        Lower heating value [J/kg].
    stoich_far : float
        Stoichiometric fuel/air mass ratio [kg/kg].
    molar_mass : float
        Mean molar mass of the fuel (as vapour) [kg/mol].
    t_min, t_max : float
        Temperature range over which the liquid properties are defined [K]
        (freezing point up to the edge of the critical region).
    """

    name: str = "fuel"
    kind: str = "liquid"
    lhv: float = float("nan")
    stoich_far: float = float("nan")
    molar_mass: float = float("nan")
    t_min: float = 0.0
    t_max: float = float("inf")

    # -- checks -------------------------------------------------------
    def check_temperature(self, T, what: str = "temperature") -> np.ndarray:
        """Return ``T`` as an array; raise when outside ``[t_min, t_max]``."""
        T = np.asarray(T, dtype=float)
        if np.any(~np.isfinite(T)):
            raise FuelsysInputError(f"{what} must be a finite number [K]")
        low, high = self.t_min, self.t_max
        if np.any(T < low) or np.any(T > high):
            bad = T[(T < low) | (T > high)].flat[0]
            raise FuelsysInputError(
                f"{what} {bad - T0_C:.1f} °C is outside {self.name}'s range "
                f"{low - T0_C:.1f}..{high - T0_C:.1f} °C"
            )
        return T

    # -- liquid properties (per kg of liquid) -------------------------
    def density(self, T):
        """Liquid density at saturation or 1 atm [kg/m³] at temperature ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no liquid density")

    def kinematic_viscosity(self, T):
        """Liquid kinematic viscosity [m²/s] at ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no liquid viscosity")

    def dynamic_viscosity(self, T):
        """Liquid dynamic viscosity [Pa·s] at ``T`` [K]."""
        return as_float(np.asarray(self.kinematic_viscosity(T)) * np.asarray(self.density(T)))

    def specific_heat(self, T):
        """Liquid isobaric specific heat [J/(kg·K)] at ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no liquid specific heat")

    def conductivity(self, T):
        """Liquid thermal conductivity [W/(m·K)] at ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no liquid conductivity")

    def surface_tension(self, T):
        """Surface tension against its vapour or air [N/m] at ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no surface tension")

    # -- phase behaviour ----------------------------------------------
    def vapour_pressure(self, T):
        """Bubble-point (true vapour) pressure [Pa] of the liquid at ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no vapour pressure")

    def latent_heat(self, T):
        """Heat of vaporisation [J/kg] at ``T`` [K] (whole fuel, liquid to vapour)."""
        raise FuelsysInputError(f"{self.name} has no latent heat")

    def bubble_point(self, P):
        """Bubble-point temperature [K] of the liquid at pressure ``P`` [Pa abs]."""
        raise FuelsysInputError(f"{self.name} has no bubble point")

    def dew_point(self, P, far=None):
        """Dew-point temperature [K] at pressure ``P`` [Pa abs].

        With ``far`` None: the pure fuel vapour's dew point.  With a fuel/air
        mass ratio ``far`` [kg/kg]: the dew point of that fuel-air mixture
        (air an inert carrier), which is lower.
        """
        raise FuelsysInputError(f"{self.name} has no dew point")

    def vapour_fraction(self, T, P, far):
        """Equilibrium vaporised mass fraction of the fuel [0..1].

        At temperature ``T`` [K], pressure ``P`` [Pa abs], fuel/air mass ratio
        ``far`` [kg/kg] with air as an inert carrier.
        """
        raise FuelsysInputError(f"{self.name} has no vapour-liquid model")

    # -- heat -----------------------------------------------------------
    def enthalpy(self, T, P, far):
        """Specific enthalpy of the fuel [J/kg of fuel] at equilibrium.

        At temperature ``T`` [K], pressure ``P`` [Pa abs] and fuel/air mass
        ratio ``far`` [kg/kg]: liquid and vapour parts weighted by the
        equilibrium vaporised fraction.  Reference: liquid at 298.15 K = 0.
        """
        raise FuelsysInputError(f"{self.name} has no enthalpy model")

    def vapour_specific_heat(self, T):
        """Ideal-gas isobaric specific heat of the fuel vapour [J/(kg·K)] at ``T`` [K]."""
        raise FuelsysInputError(f"{self.name} has no vapour specific heat")

    def with_oil(self, oil_pct: float) -> "Fuel":
        """This fuel with ``oil_pct`` per cent by volume of turbine oil mixed in.

        The base class knows no blending: 0 % gives the fuel itself, anything
        else is refused.  Liquid fuels override this (see
        :mod:`fuelsys.fuels.blend`).
        """
        if float(oil_pct) == 0.0:
            return self
        raise FuelsysInputError(f"oil_pct applies to liquid fuels only; {self.name} takes 0 (got {oil_pct})")

    def info(self) -> list[tuple[str, object, str]]:
        """Rows (label, value, unit) describing the fuel, for FS_FUEL_INFO."""
        return [("name", self.name, ""), ("kind", self.kind, "")]


def fuel_h_to_c(fuel):
    """Molar H/C ratio of a :class:`fuelsys.fuels.base.Fuel` (its own, else from its stoichiometric ratio).

    Parameters
    ----------
    fuel : Fuel
        A fuel object with ``stoich_far`` (or ``h_to_c``) [-]

    Returns
    -------
    float
        H/C ratio [-]

    References
    ----------
    :func:`fuelsys.thermo.hydrogen_carbon_ratio` (the H/C ratio of a C-H fuel from its stoichiometric
    fuel/air ratio).

    Examples
    --------
    >>> class K: stoich_far = 0.068
    >>> round(fuel_h_to_c(K()), 2)
    1.94
    """
    y = getattr(fuel, "h_to_c", None)
    if y is not None and np.isfinite(y):
        return float(y)
    return float(_thermo.hydrogen_carbon_ratio(float(fuel.stoich_far)))
