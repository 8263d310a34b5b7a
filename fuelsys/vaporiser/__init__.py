"""One vaporiser tube: air in, heat from the wall, fuel evaporated, margins.

Floor: the engine's parts (uses flow and heat, fuels, thermo).

A straight vaporiser tube takes air from the case through its inlet (driven
by the liner pressure drop) and liquid fuel from its needle, is heated by the
flame around it and delivers a rich mixture to the front of the combustor.
This package answers, per operating point and per tube, all in one vectorised
call (idle to full power):

* how much air the tube passes (:func:`tube_air_flow`);
* how far the fuel evaporates along the heated length
  (:func:`vaporiser`, an axial march with equilibrium evaporation from the
  fuel model's flash, air as the carrier);
* whether the droplets have time to evaporate (d²-law with the Spalding
  transfer number at local conditions, against the residence time);
* the margins: dew point, equivalence ratio and flammability, flashback
  (exit velocity against a flame speed), hottest wetted wall (coking), the
  oil left behind, the tube's pressure drop -- and a verdict with its
  reasons.

The march
---------
The heated length is cut into ``n_steps`` equal steps (default
:data:`N_STEPS` = 40).  The state carried along is the mixture's enthalpy per
kg of air, ``H = h_air(T) + far h_fuel(T, P, far)``, with the fuel's enthalpy
at equilibrium from the fuel model (liquid at 298.15 K = 0, both parts at the
same temperature).  Each step:

1. properties at the step's start: temperature from H (inverted on a table
   of the fuel model's enthalpy over temperature, built once per call at the
   inlet pressure and fuel/air ratio of each point), vaporised fraction,
   gas-phase properties, Reynolds and Prandtl numbers;
2. heat-transfer coefficient: the correlation's mean Nusselt number over the
   step (:func:`fuelsys.heat.nusselt_tube_segment`, exact for the
   mean-over-length correlation), or a given coefficient;
3. wall: given (uniform or a profile), or solved from the flame side
   (convection + Lefebvre radiation outside, conduction through the wall,
   convection inside);
4. enthalpy update by the exponential (exact for constant properties)
   solution ``dH = c (T_eq - T)(1 - exp(-UA dx / (m_air c)))`` with a
   predictor step and a corrector at the step's midpoint (second order);
   ``c`` is the chord heat capacity dH/dT over the step, so the latent heat
   is carried exactly;
5. pressure: homogeneous two-phase friction and acceleration.

After the march, the exit state is evaluated directly by the fuel model
(vaporised fraction, dew point, enthalpy), so the exit is fully vaporised
exactly when the exit temperature is above the dew point.  The heat taken
from the wall (each step's exponential profile integrated) is compared with
the enthalpy rise from the fuel model at the exit temperature and pressure
(``energy_error``): it checks the tables, the inversion and the pressure
handling against the fuel model itself.  Where it is off by more than a
half of :data:`ENERGY_TOLERANCE` because the tube's pressure drop moves
the equilibrium, those points are marched again with flash tables at the
inlet and the exit pressure, interpolated in pressure.  The march is also
repeated with half the steps for a step-doubling (Richardson) error estimate
of the exit temperature and vaporised fraction.

The inlet state is the adiabatic mixture of the air and the liquid fuel
(fuel that flashes at the inlet cools it, below both streams if need be).
Points whose inlet would be near sonic (Mach above :data:`MACH_LIMIT`) or
whose tube would lose more than half the case pressure are refused: the
march is a low-speed one.

Shapes: a straight tube is one heated leg; a tube with a return bend
(``shape="return"``) is two, marched one after the other on a carried state
(:class:`_State`), each leg with its own length and wall, ``n_steps`` steps
each.  The bend between them is short and unheated and costs a pressure loss
by Crane's rule for bends (:func:`fuelsys.flow.fittings.crane_return_bend_k`); the entry
correlations continue through it (no new thermal entry after the bend), and
positions in the profile run along the heated legs.

The package, by job
-------------------
* :mod:`~fuelsys.vaporiser.air` -- air into the tube, residence-time estimate;
* :mod:`~fuelsys.vaporiser.flame` -- laminar flame speed, flammability limits;
* :mod:`~fuelsys.vaporiser.walls` -- wall descriptions (profile, flame side);
* :mod:`~fuelsys.vaporiser.constants` -- settings, thresholds, validity ranges;
* :mod:`~fuelsys.vaporiser.tube` -- :func:`vaporiser`, its option groups and result;
* :mod:`~fuelsys.vaporiser.sizing` -- the heated length for a dew-point margin;
* the march, inside: ``_tables`` (property tables, inlet mixing), ``_march``
  (state, legs, heat transfer, bend), ``_droplets`` (d²-law), ``_margins``
  (wetted wall, flashback, validity, verdicts) and ``_solve`` (one call:
  table build, march, step check, exit state, re-march).

Everything public is importable from ``fuelsys.vaporiser`` itself.

References
----------
.. [1] F. P. Incropera, D. P. DeWitt, T. L. Bergman, A. S. Lavine,
   "Fundamentals of Heat and Mass Transfer", 6th ed., Wiley 2007, ch. 8.
.. [2] A. H. Lefebvre, D. R. Ballal, "Gas Turbine Combustion", 3rd ed.,
   CRC Press 2010 (liner flow, wall heat transfer, vaporisers).
.. [3] S. R. Turns, "An Introduction to Combustion", 3rd ed., McGraw-Hill
   2012, ch. 3 (droplet evaporation) and ch. 8 (laminar flame speed).
.. [4] A. H. Lefebvre, V. G. McDonell, "Atomization and Sprays", 2nd ed.,
   CRC Press 2017, ch. 8 (drop evaporation).
.. [5] J. G. Collier, J. R. Thome, "Convective Boiling and Condensation",
   3rd ed., Oxford 1994, ch. 2 (homogeneous two-phase flow).
"""

from __future__ import annotations

from fuelsys.flow.fittings import CRANE_BEND_K_OVER_FT, CRANE_BEND_R_OVER_D, crane_return_bend_k
from fuelsys.vaporiser.air import AIR_FLOW_METHODS, residence_time_estimate, tube_air_flow
from fuelsys.vaporiser.constants import (BEND_R_OVER_D, CD_TUBE_INLET, COKING_LIMIT, DEW_MARGIN_MIN_K,
                                         ENERGY_TOLERANCE, MACH_LIMIT, N_STEPS, N_TABLE, STEP_TOLERANCE_K,
                                         T_VAPOUR_CP_MAX, TABLE_FLASH_SPAN_K, TABLE_KNEE_K, TABLE_UPPER_STEP_K,
                                         TURBULENCE_INTENSITY, VALIDITY, WALL_CONDUCTIVITY, WALL_EMISSIVITY,
                                         WALL_THICKNESS, WET_SHARE, T_GAS_MIN, T_GAS_MAX, T_MARCH_MAX,
                                         N_STEPS_MAX, N_TABLE_MAX, TABLE_UPPER_MAX, BULK_FUEL_LIMIT,
                                         HTC_UNCERTAINTY, PROPERTY_RATIO_MIN)
from fuelsys.vaporiser.flame import (FLAME_SPEED_DEFAULT, FLAME_SPEED_METHODS, FLAME_SPEED_SURROGATE,
                                     FLAMMABILITY_LIMITS, GULDER_CONSTANTS, MK_CONSTANTS, flammability_limits,
                                     gulder_1984, laminar_flame_speed, metghalchi_keck_1982)
from fuelsys.vaporiser.tube import (OPTION_GROUPS, T_FUEL_DEFAULT, FuelEntry, MarchOptions, MarginOptions,
                                    TubeShape, VaporiserResult, vaporiser)
from fuelsys.vaporiser.walls import FlameSide, WallProfile
from fuelsys.vaporiser.sizing import tube_length_for_margin

__all__ = [
    "tube_air_flow", "residence_time_estimate", "AIR_FLOW_METHODS",
    "metghalchi_keck_1982", "gulder_1984", "laminar_flame_speed", "flammability_limits",
    "FLAME_SPEED_DEFAULT", "FLAME_SPEED_METHODS", "FLAME_SPEED_SURROGATE", "FLAMMABILITY_LIMITS",
    "GULDER_CONSTANTS", "MK_CONSTANTS",
    "WallProfile", "FlameSide", "vaporiser", "tube_length_for_margin", "VaporiserResult", "FuelEntry",
    "TubeShape", "MarchOptions",
    "MarginOptions", "OPTION_GROUPS", "T_FUEL_DEFAULT",
    "crane_return_bend_k", "CRANE_BEND_R_OVER_D", "CRANE_BEND_K_OVER_FT", "BEND_R_OVER_D",
    "N_STEPS", "N_TABLE", "TABLE_KNEE_K", "TABLE_UPPER_STEP_K", "TABLE_FLASH_SPAN_K", "CD_TUBE_INLET",
    "COKING_LIMIT", "DEW_MARGIN_MIN_K", "T_VAPOUR_CP_MAX", "MACH_LIMIT", "WET_SHARE", "STEP_TOLERANCE_K",
    "ENERGY_TOLERANCE", "WALL_EMISSIVITY", "WALL_CONDUCTIVITY", "WALL_THICKNESS", "TURBULENCE_INTENSITY",
    "VALIDITY", "T_GAS_MIN", "T_GAS_MAX", "T_MARCH_MAX", "N_STEPS_MAX", "N_TABLE_MAX", "TABLE_UPPER_MAX",
    "BULK_FUEL_LIMIT", "HTC_UNCERTAINTY", "PROPERTY_RATIO_MIN",
]

# the package's own public functions and classes are documented and found as fuelsys.vaporiser.<name>
# (the docstring checks and help() list them here); the bend loss stays fuelsys.flow.fittings'
for _name in __all__:
    _obj = globals()[_name]
    if callable(_obj) and getattr(_obj, "__module__", "").startswith(__name__ + "."):
        _obj.__module__ = __name__
del _name, _obj
