"""Wall descriptions of a vaporiser tube: a given profile, or flame-side conditions to solve it."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.arrays import checked_array
from fuelsys.vaporiser._common import require_within
from fuelsys.vaporiser.constants import T_GAS_MAX, T_GAS_MIN, WALL_CONDUCTIVITY, WALL_EMISSIVITY, WALL_THICKNESS


@dataclass(frozen=True)
class WallProfile:
    """A given inner-wall temperature profile along the heated length.

    Parameters
    ----------
    position : array_like
        Increasing positions from the start of the heated length, 1-D [m]
    temperature : array_like
        Inner-wall temperatures, last axis along ``position``; leading axes
        broadcast with the operating points [K]

    Linear interpolation between the positions, held constant beyond them.
    """

    position: object
    temperature: object

    def __post_init__(self):
        x = np.asarray(self.position, dtype=float)
        t = np.asarray(self.temperature, dtype=float)
        if x.ndim != 1 or x.size < 2 or np.any(np.diff(x) <= 0) or np.any(x < 0):
            raise FuelsysInputError("wall profile positions must be a 1-D increasing list of at least 2 "
                                    "positions >= 0 [m]")
        if t.shape[-1:] != x.shape:
            raise FuelsysInputError(f"wall profile needs one temperature per position ({x.size}), "
                                    f"got shape {t.shape}")
        checked_array(t, "wall temperature", "K", positive=True)


@dataclass(frozen=True)
class FlameSide:
    """Flame-side conditions from which the wall temperature is found.

    Heat reaches the outer wall by convection from the hot gas and by flame
    radiation (Lefebvre's formula, :func:`fuelsys.heat.lefebvre_flame_radiation`),
    passes the tube wall by conduction (thin cylinder, no axial conduction) and
    enters the mixture by internal convection.

    Parameters
    ----------
    gas_temperature : array_like
        Flame / hot-gas temperature around the tube [K]
    h_out : array_like
        Outer convective heat-transfer coefficient [W/(m² K)]
    emissivity_gas : array_like
        Flame (gas) emissivity, 0..1 [-]
    emissivity_wall : array_like
        Outer wall emissivity, 0..1 [-]
    thickness : array_like
        Tube wall thickness [m]
    conductivity : array_like
        Tube wall thermal conductivity [W/(m K)]
    """

    gas_temperature: object
    h_out: object
    emissivity_gas: object = 0.0
    emissivity_wall: object = WALL_EMISSIVITY
    thickness: object = WALL_THICKNESS
    conductivity: object = WALL_CONDUCTIVITY

    def __post_init__(self):
        require_within("flame gas temperature", self.gas_temperature, T_GAS_MIN, T_GAS_MAX,
                       "the range of the gas polynomials")
        h = np.asarray(self.h_out, dtype=float)
        if np.any(~np.isfinite(h)) or np.any(h < 0):
            raise FuelsysInputError("outer heat-transfer coefficient must be >= 0 [W/(m² K)]")
        for name, e in (("flame emissivity", self.emissivity_gas), ("wall emissivity", self.emissivity_wall)):
            e = np.asarray(e, dtype=float)
            if np.any(~np.isfinite(e)) or np.any(e < 0) or np.any(e > 1):
                raise FuelsysInputError(f"{name} must be within 0..1 (got {np.ravel(e)[0]:g})")
        checked_array(self.thickness, "wall thickness", "mm", positive=True, scale=1e3)
        checked_array(self.conductivity, "wall conductivity", "W/(m K)", positive=True)
        if np.all(h == 0) and np.all(np.asarray(self.emissivity_gas, dtype=float) == 0):
            raise FuelsysInputError("flame side needs an outer heat-transfer coefficient > 0 or a flame "
                                    "emissivity > 0 (both are 0: no heat reaches the tube)")

