"""One vaporiser tube: air in, heat from the wall, fuel evaporated, margins.

A straight vaporiser tube takes air from the case through its inlet (driven
by the liner pressure drop) and liquid fuel from its needle, is heated by the
flame around it and delivers a rich mixture to the front of the combustor.
This module answers, per operating point and per tube, all in one vectorised
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
by Crane's rule for bends (:func:`crane_return_bend_k`); the entry
correlations continue through it (no new thermal entry after the bend), and
positions in the profile run along the heated legs.

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

import math
import warnings
from dataclasses import dataclass, field

import numpy as np

from fuelsys import heat, thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning, warn_validity
from fuelsys.fuels.base import P_ATM, T0_C
from fuelsys.arrays import as_float as _out

#: number of axial steps of the march (default); the step-doubling estimate uses half of it
N_STEPS = 40
#: temperature nodes of the per-point enthalpy tables used to invert H -> T in the march:
#: (nodes up to just above the dew point, least number of nodes from there to the hottest wall)
N_TABLE = (48, 16)
#: the dense part of the table ends this far above the mixture's dew point [K]
TABLE_KNEE_K = 20.0
#: largest node spacing of the table above the knee [K]
TABLE_UPPER_STEP_K = 5.0
#: a blend's nodes are flashed up to this far above the knee (fuel dissolved in the oil) [K]
TABLE_FLASH_SPAN_K = 150.0
#: default discharge coefficient of a plain tube inlet (Lefebvre & Ballal 2010, ch. 4: plain holes
#: about 0.6 at low bleed; from memory)
CD_TUBE_INLET = 0.6
#: JFTOT test temperature of ASTM D3241 / specification limit of ASTM D1655 (Jet A-1).  That test
#: heats the bulk fuel, it is no wall-coking threshold: here it is an assumption, a conservative
#: temperature above which a fuel-wetted wall may build deposits; it gives a caution, not a verdict [K]
COKING_LIMIT = 260.0 + T0_C
#: exit temperature margin over the dew point below which the tube is judged marginal: a colder day
#: or a richer setting condenses fuel again (common practice, no source) [K]
DEW_MARGIN_MIN_K = 10.0
#: fuel-vapour heat capacities are taken at no more than this temperature (the vapour ranges of the fuel
#: models end here; a mixture inside a vaporiser tube stays far below it) [K]
T_VAPOUR_CP_MAX = 1500.0
#: highest inlet Mach number the low-speed march accepts [-]; above 0.3 the result is flagged
MACH_LIMIT = 0.7
#: share of the fuel still liquid above which a wall counts as wetted by fuel [-]
WET_SHARE = 1e-3
#: tolerance on the step-doubling estimate of the exit temperature before the march is flagged [K]
STEP_TOLERANCE_K = 0.5
#: tolerance on the energy balance (wall heat against enthalpy rise) before the march is flagged [-]
ENERGY_TOLERANCE = 0.005
#: default wall emissivity for the flame-side model: oxidised stainless steel (from memory)
WALL_EMISSIVITY = 0.7
#: default wall conductivity: austenitic stainless steel near 600 K, Incropera & DeWitt 6th ed.
#: Table A.1 (AISI 304: 18.3 W/(m K) at 600 K) [W/(m K)]
WALL_CONDUCTIVITY = 18.3
#: default wall thickness for the flame-side model [m] (common practice, no source: 0.5 mm tube wall)
WALL_THICKNESS = 0.5e-3
#: turbulence intensity in the tube core, u'/U = 0.16 Re^-1/8 (common practice, no source)
TURBULENCE_INTENSITY = (0.16, -0.125)

#: validity ranges of the module's own correlations: name -> {quantity: (low, high, unit)}
VALIDITY = {
    "metghalchi_keck_1982": {"phi": (0.8, 1.5, "-"), "T": (298.0, 700.0, "K"), "P": (0.4 * P_ATM, 50 * P_ATM, "Pa")},
    # Gülder's data set (from memory)
    "gulder_1984": {"phi": (0.7, 1.4, "-"), "T": (300.0, 700.0, "K"), "P": (0.1e6, 0.8e6, "Pa")},
    # Zabetakis temperature correction fitted from ambient to a few hundred °C (Crowl & Louvar)
    "flammability_limits": {"T": (273.15, 573.15, "K")},
    "tube_air_flow": {"liner_dp_fraction": (0.005, 0.15, "-")},
}

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



def _family(fuel) -> str:
    """Key of a fuel (object or name) in the flame-speed and flammability tables (kerosene-type by default)."""
    name = (fuel if isinstance(fuel, str) else str(getattr(fuel, "name", ""))).lower()
    for key in ("isobutane", "butane", "propane", "lpg", "methane"):
        if name.startswith(key):
            return key
    return "kerosene"


def _require_positive(name, value, scale, unit):
    v = np.asarray(value, dtype=float)
    if np.any(~np.isfinite(v)) or np.any(v <= 0):
        bad = v[~(np.isfinite(v) & (v > 0))].flat[0]
        raise FuelsysInputError(f"{name} must be > 0 (got {bad * scale:g} {unit})")
    return v


# ---------------------------------------------------------------------------
# air into the tube

def _orifice_incompressible(area, cd, p0, t0, dp_frac):
    rho = p0 / (thermo.R_AIR * t0)
    return cd * area * np.sqrt(2.0 * rho * dp_frac * p0)


def _orifice_compressible(area, cd, p0, t0, dp_frac):
    g = np.asarray(thermo.gamma(t0), dtype=float)
    crit = (2.0 / (g + 1.0)) ** (g / (g - 1.0))
    pr = np.maximum(1.0 - dp_frac, crit)  # choked below the critical ratio
    flux = np.sqrt(2.0 * g / ((g - 1.0) * thermo.R_AIR * t0) * (pr ** (2.0 / g) - pr ** ((g + 1.0) / g)))
    return cd * area * p0 * flux


#: methods of :func:`tube_air_flow`
AIR_FLOW_METHODS = {"compressible": _orifice_compressible, "incompressible": _orifice_incompressible}


def tube_air_flow(bore, liner_dp_fraction, case_pressure, t_air, cd=CD_TUBE_INLET, needle_od=0.0,
                  method="compressible"):
    """Air mass flow into one vaporiser tube from the liner pressure drop.

    The tube inlet is an orifice of area ``pi/4 (bore² - needle_od²)`` (a
    needle poking into the inlet blocks its own area) between the case at
    ``case_pressure`` and ``t_air`` and the liner at
    ``case_pressure (1 - liner_dp_fraction)``.

    * ``"compressible"`` (default): isentropic nozzle flow times ``cd``,
      ``m = cd A p0 sqrt(2 g/((g-1) R T0) (r^(2/g) - r^((g+1)/g)))``,
      ``r = 1 - dp/p0`` (choked at the critical ratio), g from the NASA
      polynomials of :mod:`fuelsys.thermo`;
    * ``"incompressible"``: ``m = cd A sqrt(2 rho dp)`` with the inlet density.

    Parameters
    ----------
    bore : array_like
        Tube inside diameter at the inlet [m]
    liner_dp_fraction : array_like
        Liner pressure drop as a fraction of the case pressure, e.g. 0.03 [-]
    case_pressure : array_like
        Case (compressor exit) pressure [Pa abs]
    t_air : array_like
        Case (compressor exit) air temperature [K]
    cd : array_like
        Discharge coefficient of the tube inlet; default 0.6, a plain
        sharp-edged inlet [-]
    needle_od : array_like
        Outside diameter of a needle inside the inlet, 0 if none [m]
    method : str
        "compressible" or "incompressible" [-]

    Returns
    -------
    float or ndarray
        Air mass flow into the tube [kg/s]

    Raises
    ------
    FuelsysInputError
        For a bore not larger than the needle, a pressure drop outside 0..1,
        a non-positive pressure or temperature, or an unknown method.

    Notes
    -----
    The discharge coefficient lumps the inlet contraction, the tube's
    friction and the exit dump; 0.6 is typical of a plain hole (Lefebvre &
    Ballal 2010, ch. 4, from memory).  Liner pressure drops of 2-6 % of the
    case pressure are usual in small engines (validity flagged outside
    0.5-15 %).

    References
    ----------
    .. [1] A. H. Lefebvre, D. R. Ballal, "Gas Turbine Combustion", 3rd ed.,
       CRC Press 2010, ch. 4 (flow through liner holes, m = Cd A (2 rho dp)^0.5).
    .. [2] J. D. Anderson, "Modern Compressible Flow", 3rd ed., McGraw-Hill
       2003, ch. 5 (isentropic nozzle flow).

    Examples
    --------
    >>> round(tube_air_flow(6e-3, 0.03, 3e5, 473.15) * 1e3, 2)
    3.33
    """
    if method not in AIR_FLOW_METHODS:
        raise FuelsysInputError(f"air-flow method must be one of {', '.join(AIR_FLOW_METHODS)} (got {method!r})")
    d = _require_positive("tube bore", bore, 1e3, "mm")
    dn = np.asarray(needle_od, dtype=float)
    if np.any(~np.isfinite(dn)) or np.any(dn < 0):
        raise FuelsysInputError("needle outside diameter must be >= 0 [m]")
    if np.any(dn >= d):
        i = np.argmax(np.broadcast_to(dn >= d, np.broadcast(d, dn).shape))
        raise FuelsysInputError(
            f"tube bore {np.broadcast_to(d, np.broadcast(d, dn).shape).flat[i] * 1e3:g} mm must be larger than the "
            f"needle outside diameter {np.broadcast_to(dn, np.broadcast(d, dn).shape).flat[i] * 1e3:g} mm")
    dp = np.asarray(liner_dp_fraction, dtype=float)
    if np.any(~np.isfinite(dp)) or np.any(dp <= 0) or np.any(dp >= 1):
        bad = dp[~(np.isfinite(dp) & (dp > 0) & (dp < 1))].flat[0]
        raise FuelsysInputError(f"liner pressure drop must be > 0 and < 100 % of the case pressure "
                                f"(got {bad * 100:g} %)")
    p0 = _require_positive("case pressure", case_pressure, 1e-5, "bar abs")
    t0 = _require_positive("air temperature", t_air, 1.0, "K")
    cd = _require_positive("discharge coefficient", cd, 1.0, "")
    if np.any(cd > 1):
        raise FuelsysInputError(f"discharge coefficient must be within 0..1 (got {np.max(cd):g})")
    low, high, unit = VALIDITY["tube_air_flow"]["liner_dp_fraction"]
    warn_validity("tube air flow (liner pressure drop)", "liner pressure drop fraction", dp, low, high, unit)
    area = 0.25 * np.pi * (d * d - dn * dn)
    return _out(AIR_FLOW_METHODS[method](area, cd, p0, t0, dp))


def residence_time_estimate(bore, heated_length, air_flow, fuel_flow, pressure, t_in, t_exit=None,
                            fuel_molar_mass=None):
    """Plug-flow residence time of the gas in a tube, from its end temperatures.

    The gas is air plus the fuel's vapour, an ideal gas at ``pressure``; its
    temperature rises linearly from ``t_in`` to ``t_exit`` along the tube
    and the fuel vaporises linearly from none at the inlet to all at the exit
    (liquid volume neglected).  ``t = integral A dx / Vdot(x)`` by
    8-point Gauss-Legendre quadrature.  For the residence time of a full
    march use :func:`vaporiser` instead.

    Parameters
    ----------
    bore : array_like
        Tube inside diameter [m]
    heated_length : array_like
        Tube length [m]
    air_flow : array_like
        Air mass flow through the tube [kg/s]
    fuel_flow : array_like
        Fuel mass flow into the tube, >= 0 [kg/s]
    pressure : array_like
        Pressure in the tube [Pa abs]
    t_in : array_like
        Gas temperature at the inlet [K]
    t_exit : array_like, optional
        Gas temperature at the exit; default ``t_in`` [K]
    fuel_molar_mass : float, optional
        Molar mass of the fuel vapour [kg/mol]; default the built-in
        kerosene's [kg/mol]

    Returns
    -------
    float or ndarray
        Residence time [s]

    References
    ----------
    Plug flow of an ideal gas, ``t = integral dx / u``; e.g. Turns 3rd ed.
    ch. 6 (plug-flow reactor residence time).

    Examples
    --------
    >>> round(residence_time_estimate(6e-3, 0.15, 4e-3, 0.0, 3e5, 473.15) * 1e3, 3)
    2.342
    """
    d = _require_positive("tube bore", bore, 1e3, "mm")
    L = _require_positive("heated length", heated_length, 1e3, "mm")
    ma = _require_positive("air flow", air_flow, 1e3, "g/s")
    mf = np.asarray(fuel_flow, dtype=float)
    if np.any(~np.isfinite(mf)) or np.any(mf < 0):
        raise FuelsysInputError("fuel flow must be >= 0 [kg/s]")
    P = _require_positive("pressure", pressure, 1e-5, "bar abs")
    t1 = _require_positive("inlet temperature", t_in, 1.0, "K")
    t2 = t1 if t_exit is None else _require_positive("exit temperature", t_exit, 1.0, "K")
    if fuel_molar_mass is None:
        from fuelsys.fuels import get_fuel

        fuel_molar_mass = get_fuel("kerosene").molar_mass
    mw = float(fuel_molar_mass)
    xg, wg = np.polynomial.legendre.leggauss(8)
    s = 0.5 * (xg + 1.0)
    shape = np.broadcast(d, L, ma, mf, P, t1, t2).shape
    s = s.reshape((8,) + (1,) * len(shape))
    T = t1 + (t2 - t1) * s
    moles = ma / thermo.M_AIR + s * mf / mw
    vdot = moles * thermo.R_MOLAR * T / P
    area = 0.25 * np.pi * d * d
    t = L * 0.5 * np.tensordot(wg, area / vdot, axes=(0, 0))
    return _out(t)


# ---------------------------------------------------------------------------
# flame speed and flammability

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
    phi = _require_positive("equivalence ratio", phi, 1.0, "")
    T = _require_positive("temperature", T, 1.0, "K")
    P = _require_positive("pressure", P, 1e-5, "bar abs")
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
    phi = _require_positive("equivalence ratio", phi, 1.0, "")
    T = _require_positive("temperature", T, 1.0, "K")
    P = _require_positive("pressure", P, 1e-5, "bar abs")
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
    key = FLAME_SPEED_SURROGATE.get(_family(fuel), "isooctane")
    if key not in table:
        key = "isooctane" if "isooctane" in table else next(iter(table))
    return fn(phi, T, P, key)


def flammability_limits(fuel, T):
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
    T = _require_positive("temperature", T, 1.0, "K")
    low, high, unit = VALIDITY["flammability_limits"]["T"]
    warn_validity("flammability limits (Zabetakis temperature law)", "T", T, low, high, unit)
    return _flammability_raw(fuel, T)


def _flammability_raw(fuel, T):
    lfl, ufl = FLAMMABILITY_LIMITS[_family(fuel)]
    dhc = float(fuel.lhv) * float(fuel.molar_mass) / 4184.0  # kcal/mol
    shift = 0.75 * (T - 298.15) / dhc
    lo = np.maximum(lfl - shift, 0.05 * lfl) / 100.0
    hi = (ufl + shift) / 100.0
    return _out(lo), _out(hi)


# ---------------------------------------------------------------------------
# wall descriptions

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
        _require_positive("wall temperature", t, 1.0, "K")


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
        _require_positive("flame gas temperature", self.gas_temperature, 1.0, "K")
        h = np.asarray(self.h_out, dtype=float)
        if np.any(~np.isfinite(h)) or np.any(h < 0):
            raise FuelsysInputError("outer heat-transfer coefficient must be >= 0 [W/(m² K)]")
        for name, e in (("flame emissivity", self.emissivity_gas), ("wall emissivity", self.emissivity_wall)):
            e = np.asarray(e, dtype=float)
            if np.any(~np.isfinite(e)) or np.any(e < 0) or np.any(e > 1):
                raise FuelsysInputError(f"{name} must be within 0..1 (got {np.ravel(e)[0]:g})")
        _require_positive("wall thickness", self.thickness, 1e3, "mm")
        _require_positive("wall conductivity", self.conductivity, 1.0, "W/(m K)")
        if np.all(h == 0) and np.all(np.asarray(self.emissivity_gas, dtype=float) == 0):
            raise FuelsysInputError("flame side needs an outer heat-transfer coefficient > 0 or a flame "
                                    "emissivity > 0 (both are 0: no heat reaches the tube)")


# ---------------------------------------------------------------------------
# results

@dataclass
class VaporiserResult:
    """Result of :func:`vaporiser`; arrays have the shape of the broadcast inputs.

    Attributes (SI) -- exit and whole-tube values
    ----------------------------------------------
    vapour_fraction : equilibrium vaporised share of the volatile fuel at the exit [-]
    exit_temperature, dew_point, dew_margin : exit mixture temperature, its dew point
        at the tube's fuel/air ratio and exit pressure, and their difference [K]
    residence_time : gas residence time over the heated length [s]
    droplet_diameter : initial droplet diameter used by the kinetic check [m]
    droplet_lifetime : time for that droplet to evaporate along the tube's conditions,
        continued at exit conditions beyond the exit; inf when it cannot [s]
    droplets_survive : True where droplets leave the tube unevaporated [-]
    exit_droplet_diameter : droplet diameter at the exit [m]
    tube_phi : equivalence ratio of all the fuel with the tube air [-]
    exit_vapour_phi : equivalence ratio of the vaporised fuel at the exit [-]
    flammable : vapour concentration at the exit within the flammability limits [-]
    lower_limit_phi, upper_limit_phi : the limits as equivalence ratios at exit temperature [-]
    exit_velocity : homogeneous mixture velocity at the exit [m/s]
    flame_speed, turbulent_flame_speed : laminar and turbulent flame speed of the exit
        vapour mixture (0 where not flammable) [m/s]
    flashback_margin : smallest velocity / turbulent flame speed where the mixture is
        flammable along the tube; inf where it is nowhere flammable [-]
    max_wet_wall : hottest inner wall where liquid is present: more than 0.1 % of the fuel still
        liquid there (equilibrium), or anywhere when the fuel carries oil; NaN where no wall is wet [K]
    max_wall : hottest inner wall anywhere [K]
    coking_risk : max_wet_wall above the coking limit [-]
    oil_residue : oil leaving the tube as liquid [kg/s]
    pressure_drop : static pressure drop over the heated length, friction + acceleration [Pa]
    heat_in : heat from the wall into the mixture [W]
    enthalpy_rise : mixture enthalpy rise from the fuel model [W]
    energy_error : (heat_in - enthalpy_rise) / |enthalpy_rise| [-]
    step_error_temperature, step_error_vapour : step-doubling error estimates [K], [-]
    reynolds_in, reynolds_exit : gas Reynolds numbers [-]
    verdict : "good", "marginal" or "poor" followed by the reasons, per point (str)
    validity : "" or the correlations/ranges left, per point (str)
    profile : dict of arrays (nodes, *shape), nodes = legs x n_steps + 1: position along the heated
        legs [m], gas_temperature [K],
        wall_temperature [K], vapour_fraction [-], velocity [m/s], pressure [Pa],
        droplet_diameter [m], time [s]
    """

    vapour_fraction: object
    exit_temperature: object
    dew_point: object
    dew_margin: object
    residence_time: object
    droplet_diameter: object
    droplet_lifetime: object
    droplets_survive: object
    exit_droplet_diameter: object
    tube_phi: object
    exit_vapour_phi: object
    flammable: object
    lower_limit_phi: object
    upper_limit_phi: object
    exit_velocity: object
    flame_speed: object
    turbulent_flame_speed: object
    flashback_margin: object
    max_wet_wall: object
    max_wall: object
    coking_risk: object
    oil_residue: object
    pressure_drop: object
    heat_in: object
    enthalpy_rise: object
    energy_error: object
    step_error_temperature: object
    step_error_vapour: object
    reynolds_in: object
    reynolds_exit: object
    verdict: object
    validity: object
    profile: dict = field(default_factory=dict)


# ---------------------------------------------------------------------------
# the march

class _Tables:
    """Per-point property tables over temperature, built once per call.

    ``tab`` has shape (K, nT, N): for each of N points, temperature nodes in
    two uniform pieces -- ``n_dense`` nodes from ``t_lo`` to the knee
    ``t_knee`` (just above the mixture's dew point, where the fuel
    evaporates), then nodes at most :data:`TABLE_UPPER_STEP_K` apart up to
    ``t_hi``; rows: mixture enthalpy per kg air, vaporised fraction, air cp,
    fuel-vapour cp, air viscosity, air conductivity, liquid density.

    Above the knee a plain liquid fuel is all vapour (the fuel model's dew
    point), so its enthalpy there is continued from the knee with the
    vapour's ideal-gas heat capacity instead of more flash calls.  A blend
    with oil keeps some fuel dissolved in the oil above the dew point: its
    nodes are flashed up to :data:`TABLE_FLASH_SPAN_K` above the knee (where
    the dissolved fuel has fallen below 0.1 % of it) and continued with the
    fuel vapour's and the oil's heat capacities beyond.  CoolProp fluids are
    flashed at every node.
    """

    H, XV, CPA, CPV, MU, K, RHOL = range(7)

    def __init__(self, fuel, t_lo, t_knee, t_hi, P, far, has_fuel, n_dense, n_upper_min, P_second=None):
        N = t_lo.size
        self.N = N
        t_knee = np.clip(t_knee, t_lo + 1.0, t_hi - 1.0)
        # each point's upper nodes depend on that point alone (same answer in a batch or alone): spacing
        # the smaller of the point's own range / n_upper_min and the step; the count is the batch's largest
        # and a point's surplus nodes run on past its hottest wall
        own = (t_hi - t_knee) / n_upper_min
        step = np.minimum(own, TABLE_UPPER_STEP_K)
        n_upper = int(max(n_upper_min, np.max(np.ceil((t_hi - t_knee) / step - 1e-9))))
        self.nd, self.ns = n_dense, n_upper
        self.nT = n_dense + n_upper
        self.T0 = t_lo
        self.Tk = t_knee
        self.dT1 = (t_knee - t_lo) / (n_dense - 1)
        self.dT2 = step
        k = np.arange(self.nT)[:, None]
        Tg = np.where(k < n_dense, t_lo + self.dT1 * k, t_knee + self.dT2 * (k - (n_dense - 1)))
        self.Tg = Tg
        tab = np.empty((7, self.nT, N))
        tab[self.CPA] = thermo.cp(Tg)
        tab[self.MU] = heat._sutherland(Tg, heat.SUTHERLAND_AIR["viscosity"])
        tab[self.K] = heat._sutherland(Tg, heat.SUTHERLAND_AIR["conductivity"])
        h_air = thermo.enthalpy(Tg)
        if np.any(has_fuel):
            hf, xv, cpv, rhol = self._fuel_rows(fuel, Tg, P, np.where(has_fuel, far, 1e-6), n_dense)
        else:
            hf = np.zeros_like(Tg)
            xv = np.ones_like(Tg)
            cpv = np.ones_like(Tg)
            rhol = np.ones_like(Tg)
        self.far = far
        self.tab_b = None
        if P_second is not None and np.any(has_fuel):
            # the same rows at a second pressure: enthalpy and vaporised fraction are interpolated in pressure
            hf_b, xv_b, _, _ = self._fuel_rows(fuel, Tg, P_second, np.where(has_fuel, far, 1e-6), n_dense)
            self.tab_b = np.stack([h_air + far[None, :] * hf_b, np.where(has_fuel[None, :], xv_b, 1.0)])
            self.Pa, self.Pb = P, P_second
        tab[self.H] = h_air + far[None, :] * hf
        tab[self.XV] = np.where(has_fuel[None, :], xv, 1.0)
        tab[self.CPV] = cpv
        tab[self.RHOL] = rhol
        self.tab = tab
        self.cols = np.arange(N)
        if np.any(np.diff(tab[self.H], axis=0) <= 0):
            raise FuelsysInputError("the fuel model's enthalpy does not rise with temperature; "
                                    "the vaporiser march needs an increasing enthalpy")
        both = tab[self.H] if self.tab_b is None else np.concatenate([tab[self.H], self.tab_b[0]])
        Hmin = both.min() - (0.5 * (both.max() - both.min()) if self.tab_b is not None else 0.0)
        span = both.max() - Hmin + (both.max() - both.min())
        self._offset = np.arange(N) * (2.0 * span + 1.0)
        self._Hflat = (tab[self.H] - Hmin + self._offset[None, :]).T.ravel()
        self._Hmin = Hmin

    @staticmethod
    def _fuel_rows(fuel, Tg, P, far, n_dense):
        """Fuel enthalpy [J/kg fuel], vaporised fraction, vapour cp, liquid density at the nodes."""
        nT, N = Tg.shape
        cpv = np.asarray(fuel.vapour_specific_heat(np.minimum(Tg, T_VAPOUR_CP_MAX)), dtype=float)
        rhol = np.asarray(fuel.density(np.clip(Tg, fuel.t_min, fuel.t_max)), dtype=float)
        share = 1.0 - _oil_share(fuel)
        oil = getattr(fuel, "oil", None)
        first = np.broadcast_to(np.arange(nT)[:, None] < n_dense, (nT, N))
        oil_h = None
        if getattr(fuel, "kind", "") != "liquid":
            flash = np.ones((nT, N), dtype=bool)          # CoolProp fluids: every node
        elif share == 1.0:
            flash = first.copy()                          # plain fuel: all vapour above the knee
        elif oil is not None and hasattr(oil, "sensible_enthalpy"):
            flash = (Tg <= Tg[n_dense - 1][None, :] + TABLE_FLASH_SPAN_K) | first
            oil_h = np.asarray(oil.sensible_enthalpy(Tg), dtype=float)
        else:
            flash = np.ones((nT, N), dtype=bool)
        hf = np.empty((nT, N))
        xv = np.empty((nT, N))
        Pb = np.broadcast_to(P[None, :], (nT, N))
        fb = np.broadcast_to(far[None, :], (nT, N))
        hf[flash] = fuel.enthalpy(Tg[flash], Pb[flash], fb[flash])
        xv[flash] = fuel.vapour_fraction(Tg[flash], Pb[flash], fb[flash])
        if not np.all(flash):
            # continue past the last flashed node (flashed nodes are a prefix of each column):
            # fuel vapour by its heat capacity (trapezoid), the oil by its own sensible enthalpy
            last = np.sum(flash, axis=0) - 1
            inc = np.zeros((nT, N))
            inc[1:] = 0.5 * (cpv[1:] + cpv[:-1]) * np.diff(Tg, axis=0)
            cum = share * np.cumsum(inc, axis=0)
            if oil_h is not None:
                cum = cum + (1.0 - share) * oil_h
            cols = np.arange(N)
            base = hf[last, cols] - cum[last, cols]
            rest = ~flash
            hf[rest] = (base[None, :] + cum)[rest]
            xv[rest] = share
        return hf, xv, cpv, rhol

    def _spacing(self, idx):
        return np.where(idx < self.nd - 1, self.dT1, self.dT2)

    def locate(self, T):
        s = np.where(T < self.Tk, (T - self.T0) / self.dT1, self.nd - 1 + (T - self.Tk) / self.dT2)
        idx = np.clip(np.floor(s).astype(np.intp), 0, self.nT - 2)
        return idx, s - idx

    def _weight(self, P):
        """Interpolation weight of the second-pressure table (0 at the first pressure)."""
        return np.clip((self.Pa - P) / (self.Pa - self.Pb), 0.0, 1.5)

    def props(self, T, P):
        """(K, N) properties at temperature T and pressure P (linear interpolation) and dH/dT there."""
        idx, w = self.locate(T)
        lo = self.tab[:, idx, self.cols]
        hi = self.tab[:, idx + 1, self.cols]
        val = lo + w * (hi - lo)
        slope = (hi[self.H] - lo[self.H]) / self._spacing(idx)
        if self.tab_b is not None:
            s = self._weight(P)
            lob = self.tab_b[:, idx, self.cols]
            hib = self.tab_b[:, idx + 1, self.cols]
            vb = lob + w * (hib - lob)
            val[self.H] += s * (vb[0] - val[self.H])
            val[self.XV] += s * (vb[1] - val[self.XV])
            slope = slope + s * ((hib[0] - lob[0]) / self._spacing(idx) - slope)
        return val, slope

    def temperature(self, H, P):
        """Temperature at mixture enthalpy H (per kg air) and pressure P, inverted on the table."""
        if self.tab_b is None:
            Htab, flat, offset = self.tab[self.H], self._Hflat, self._offset
        else:
            Htab = self.tab[self.H] + self._weight(P)[None, :] * (self.tab_b[0] - self.tab[self.H])
            Htab = np.maximum.accumulate(Htab, axis=0) + 1e-9 * np.arange(self.nT)[:, None]
            offset = self._offset
            flat = (Htab - self._Hmin + offset[None, :]).T.ravel()
        key = H - self._Hmin + offset
        pos = np.searchsorted(flat, key, side="right") - 1
        idx = np.clip(pos - self.cols * self.nT, 0, self.nT - 2)
        h0 = Htab[idx, self.cols]
        h1 = Htab[idx + 1, self.cols]
        w = (H - h0) / (h1 - h0)
        return self.Tg[idx, self.cols] + self._spacing(idx) * w


@dataclass
class _State:
    """Mixture state carried along the tube (one entry per point)."""

    H: np.ndarray   # enthalpy per kg air [J/kg]
    T: np.ndarray   # temperature [K]
    P: np.ndarray   # pressure [Pa]
    x: np.ndarray   # distance from the heated inlet [m]
    wall: np.ndarray  # last inner-wall temperature (guess for the next step) [K]


@dataclass
class _Leg:
    """One heated leg of a tube: length, bore, wall (given or flame side) and where it starts.

    ``x0`` is the heated length before this leg: the heat-transfer entry
    correlations continue from it (the flow is not taken to develop anew
    after a bend); the wall profile of a leg is in the leg's own positions.
    """

    length: np.ndarray
    bore: np.ndarray
    kind: str                  # "uniform", "profile" or "flame"
    wall: object               # (N,) temperatures, (positions, (N, npos) temps) or dict of flame arrays
    x0: object = 0.0


class _Context:
    """Everything fixed for one call: flows, geometry, fuel, tables."""

    def __init__(self, fuel, m_air, far, tables, laminar, inner_htc, M_fuel):
        self.fuel = fuel
        self.m_air = m_air
        self.far = far   # all the liquid (oil included) per kg air: the fuel object carries its oil
        self.tab = tables
        self.laminar = laminar
        self.inner_htc = inner_htc
        self.M_fuel = M_fuel


def _gas_props(ctx, pr):
    """Gas-phase properties from the (K, N) table values."""
    t = ctx.tab
    yv = ctx.far * pr[t.XV]
    cpg = (pr[t.CPA] + yv * pr[t.CPV]) / (1.0 + yv)
    mu, k = pr[t.MU], pr[t.K]
    return yv, cpg, mu, k


def _specific_volume(ctx, T, P, pr):
    """Mixture volume per kg of air [m³/kg air]: ideal gas + liquid."""
    t = ctx.tab
    xv = pr[t.XV]
    yv = ctx.far * xv
    gas = (1.0 / thermo.M_AIR + yv / ctx.M_fuel) * thermo.R_MOLAR * T / P
    liquid = ctx.far * (1.0 - xv) / pr[t.RHOL]
    return gas + liquid


def _wall_at(leg, x_rel):
    """Given inner-wall temperature at distance x_rel (N,) along the leg."""
    if leg.kind == "uniform":
        return leg.wall
    pos, temps = leg.wall
    idx = np.clip(np.searchsorted(pos, x_rel, side="right") - 1, 0, pos.size - 2)
    w = np.clip((x_rel - pos[idx]) / (pos[idx + 1] - pos[idx]), 0.0, 1.0)
    rows = np.arange(temps.shape[0])
    return temps[rows, idx] * (1.0 - w) + temps[rows, idx + 1] * w


def _flame_wall(Tb, h_in, leg, t_guess):
    """Solve the outer wall temperature; return (UA per length, T_eq, inner wall T, q per length)."""
    f = leg.wall
    di = leg.bore
    do = di + 2.0 * f["thickness"]
    Ri = 1.0 / (h_in * np.pi * di)
    Rw = np.log(do / di) / (2.0 * np.pi * f["conductivity"])
    Rt = Ri + Rw
    Tf = f["gas_temperature"]
    lo, hi = np.minimum(Tb, Tf), np.maximum(Tb, Tf)
    Two = np.clip(t_guess + (t_guess - Tb) * Rw / np.maximum(Ri, 1e-30), lo, hi)
    for _ in range(30):
        rad = heat._radiation_raw(Tf, Two, f["emissivity_gas"], f["emissivity_wall"])
        drad = heat._radiation_slope_raw(Tf, Two, f["emissivity_gas"], f["emissivity_wall"])
        F = np.pi * do * (f["h_out"] * (Tf - Two) + rad) - (Two - Tb) / Rt
        dF = np.pi * do * (-f["h_out"] + drad) - 1.0 / Rt
        step = F / dF
        Two = np.clip(Two - step, lo, hi)
        if np.all(np.abs(step) < 1e-7):
            break
    drad = heat._radiation_slope_raw(Tf, Two, f["emissivity_gas"], f["emissivity_wall"])
    q = (Two - Tb) / Rt
    Go = np.pi * do * (f["h_out"] - drad)
    UA = 1.0 / (Rt + 1.0 / np.maximum(Go, 1e-30))
    return UA, Tb + q / UA, Tb + q * Ri, q


def _transfer(ctx, leg, T, pr, x1, x2, wall_guess):
    """Heat transfer of a segment at mixture temperature T.

    Returns UA per length [W/(m K)], T_eq [K], inner wall T [K], heat per length [W/m], Re, h [W/(m² K)].
    """
    d = leg.bore
    yv, cpg, mu, k = _gas_props(ctx, pr)
    m_gas = ctx.m_air * (1.0 + yv)
    Re = 4.0 * m_gas / (np.pi * d * mu)
    Pr = cpg * mu / k
    xm = 0.5 * (x1 + x2)
    if leg.kind == "flame":
        tw = wall_guess
    else:
        tw = _wall_at(leg, xm)
    if ctx.inner_htc is None:
        pf = np.where(T < tw, (T / tw) ** 0.45, 1.0)
        nu = heat._segment_raw(Re, Pr, leg.x0 + x1, leg.x0 + x2, d, ctx.laminar, pf)
        h = nu * k / d
    else:
        h = ctx.inner_htc
    if leg.kind == "flame":
        UA, Teq, twi, q = _flame_wall(T, h, leg, wall_guess)
        return UA, Teq, twi, q, Re, h
    UA = h * np.pi * d
    return UA, tw, tw, UA * (tw - T), Re, h


def _flame_side_bound(f, d, L, m_air, t_in):
    """Upper bound of the gas temperature a flame-heated tube can reach [K].

    The gas heats no faster than through the wall and outer resistances
    alone (inner resistance 0, radiation at its steepest tangent, the
    mixture's heat capacity at least 1000 J/(kg K) of air):
    ``T <= T_f - (T_f - T_in) exp(-UA_max L / (m_air 1000))``.
    """
    do = d + 2.0 * f["thickness"]
    rw = np.log(do / d) / (2.0 * np.pi * f["conductivity"])
    tf = f["gas_temperature"]
    g_rad = 2.5 * 0.5 * heat.SIGMA_SB * (1.0 + f["emissivity_wall"]) * f["emissivity_gas"] * tf ** 3
    g_out = np.pi * do * (f["h_out"] + g_rad)
    ua = 1.0 / (rw + 1.0 / np.maximum(g_out, 1e-30))
    return tf - (tf - t_in) * np.exp(-ua * L / (m_air * 1000.0))


def _exp_step(c, drive, ntu):
    """Enthalpy change c * drive * (1 - exp(-ntu)) per kg air, safe for tiny ntu."""
    return c * drive * -np.expm1(-ntu)


def _march_leg(ctx, state, leg, n, record):
    """March one leg in ``n`` equal steps; append node values to ``record`` when given."""
    t = ctx.tab
    dx = leg.length / n
    area = 0.25 * np.pi * leg.bore ** 2
    mass_per_air = 1.0 + ctx.far
    G = ctx.m_air * mass_per_air / area
    H, T, P, wall = state.H, state.T, state.P, state.wall
    x0 = state.x
    heat_in = np.zeros_like(H)
    pr, slope = t.props(T, P)
    v = _specific_volume(ctx, T, P, pr) / mass_per_air
    if record is not None and not record["x"]:
        _, _, twi0, _, Re0, _ = _transfer(ctx, leg, T, pr, np.zeros_like(dx), dx, wall)
        record["x"].append(x0 + 0.0 * dx)
        record["T"].append(T)
        record["P"].append(P)
        record["wall"].append(twi0)
        record["Re"].append(Re0)
        record["vol"].append(v * mass_per_air)
    for i in range(n):
        x1 = i * dx
        x2 = x1 + dx
        # predictor from the state at the start of the step
        UA, Teq, twi, _, Re, h = _transfer(ctx, leg, T, pr, x1, x2, wall)
        c0 = np.maximum(slope, 1e-6)
        Hs = H + _exp_step(c0, Teq - T, UA * dx / (ctx.m_air * c0))
        Ts = t.temperature(Hs, P)
        # corrector at the step's midpoint with the chord heat capacity
        dT = Ts - T
        c = np.where(np.abs(dT) > 1e-9, (Hs - H) / np.where(np.abs(dT) > 1e-9, dT, 1.0), c0)
        c = np.maximum(c, 1e-6)
        Tm = 0.5 * (T + Ts)
        prm, _ = t.props(Tm, P)
        UA, Teq, twi, _, Re, h = _transfer(ctx, leg, Tm, prm, x1, x2, twi)
        dH = _exp_step(c, Teq - T, UA * dx / (ctx.m_air * c))
        heat_in = heat_in + ctx.m_air * dH  # the wall's heat over the step, by the same exponential profile
        H = H + dH
        T = t.temperature(H, P)
        wall = twi
        pr, slope = t.props(T, P)
        # pressure: homogeneous friction at the midpoint plus acceleration
        fd = heat.darcy_friction_smooth(Re)
        vm = _specific_volume(ctx, Tm, P, prm) / mass_per_air
        v_new = _specific_volume(ctx, T, P, pr) / mass_per_air
        # floor: a choking flow is refused after the march (pressure below half the inlet's)
        P = np.maximum(P - fd * dx / leg.bore * 0.5 * G * G * vm - G * G * (v_new - v), 0.25 * state.P)
        v = v_new
        if record is not None:
            if leg.kind == "flame":
                node_wall = _flame_wall(T, h, leg, twi)[2]
            else:
                node_wall = _wall_at(leg, x2)
            record["x"].append(x0 + x2)
            record["T"].append(T)
            record["P"].append(P)
            record["wall"].append(node_wall)
            record["mid_wall"].append(twi)
            record["mid_xv"].append(prm[t.XV])
            record["Re"].append(Re)
            record["vol"].append(v_new * mass_per_air)
    new = _State(H=H, T=T, P=P, x=x0 + leg.length, wall=wall)
    return new, heat_in


def _bend(ctx, state, bore, r_over_d):
    """Pressure after a 180° return bend between two legs (no heat exchanged in the bend).

    Loss ``K rho u²/2`` on the homogeneous mixture, K by Crane's rule for a
    bend of n = 2 quarter turns (:func:`crane_return_bend_k`) with the
    mixture's smooth-tube friction factor standing for Crane's f_T.
    """
    t = ctx.tab
    mass_per_air = 1.0 + ctx.far
    G = ctx.m_air * mass_per_air / (0.25 * np.pi * bore ** 2)
    pr, _ = t.props(state.T, state.P)
    v = _specific_volume(ctx, state.T, state.P, pr) / mass_per_air
    yv, _, mu, _ = _gas_props(ctx, pr)
    Re = 4.0 * ctx.m_air * (1.0 + yv) / (np.pi * bore * mu)
    K = crane_return_bend_k(r_over_d, heat.darcy_friction_smooth(Re), check=False)
    P = np.maximum(state.P - K * 0.5 * G * G * v, 0.25 * state.P)
    return _State(H=state.H, T=state.T, P=P, x=state.x, wall=state.wall), K


#: Crane TP-410 (2009) A-29: loss coefficient of a 90° bend over the fully turbulent friction factor,
#: against the bend radius over the bore (from memory)
CRANE_BEND_R_OVER_D = (1.0, 1.5, 2.0, 3.0, 4.0, 6.0, 8.0, 10.0, 12.0, 14.0, 16.0, 20.0)
CRANE_BEND_K_OVER_FT = (20.0, 14.0, 12.0, 12.0, 14.0, 17.0, 24.0, 30.0, 34.0, 38.0, 42.0, 50.0)
#: default bend radius of a return-bend vaporiser, over its bore (our assumption)
BEND_R_OVER_D = 2.0


def crane_return_bend_k(r_over_d, f_t, check=True):
    """Loss coefficient of a 180° return bend by Crane's rule for bends of n quarter turns.

    ``K_B = (n - 1)(0.25 pi f_T r/d + 0.5 K_1) + K_1`` with n = 2 and
    ``K_1 = (K/f_T)(r/d) f_T`` the 90° bend of the same radius (Crane's
    table, interpolated).

    Parameters
    ----------
    r_over_d : array_like
        Bend radius (to the tube axis) over the tube bore, 1..20 [-]
    f_t : array_like
        Darcy friction factor standing for Crane's fully turbulent f_T [-]
    check : bool
        Issue a ValidityWarning outside the table's radii [-]

    Returns
    -------
    float or ndarray
        Loss coefficient on the velocity head in the tube [-]

    References
    ----------
    .. [1] Crane Co., "Flow of Fluids Through Valves, Fittings, and Pipe",
       Technical Paper 410, 2009, page A-29 (pipe bends; n·90° bends)
       (values from memory).

    Examples
    --------
    >>> round(crane_return_bend_k(2.0, 0.02), 4)
    0.3914
    """
    rd = np.asarray(r_over_d, dtype=float)
    ft = np.asarray(f_t, dtype=float)
    if np.any(~np.isfinite(rd)) or np.any(rd <= 0):
        raise FuelsysInputError(f"bend radius over bore must be > 0 (got {np.ravel(rd)[0]:g})")
    if check:
        warn_validity("Crane bend table", "r/d", rd, CRANE_BEND_R_OVER_D[0], CRANE_BEND_R_OVER_D[-1], "-")
    k1 = np.interp(rd, CRANE_BEND_R_OVER_D, CRANE_BEND_K_OVER_FT) * ft
    return _out((2 - 1) * (0.25 * np.pi * ft * rd + 0.5 * k1) + k1)


# -- droplets --------------------------------------------------------------------

class _DropletGrid:
    """Per-point tables of the liquid's vapour pressure, latent heat and density for the droplet model.

    Nodes run uniformly from the fuel's lowest temperature (or 200 K) to the
    liquid's bubble point at the point's case pressure -- the hottest a drop
    surface can be; each point's nodes depend on that point alone.  The
    vapour heat capacity is tabulated on fixed nodes 200-2000 K.
    """

    def __init__(self, fuel, t_bub, n=160):
        self.a = max(float(fuel.t_min), 200.0)
        self.b = np.maximum(np.minimum(t_bub + 0.5, float(fuel.t_max)), self.a + 1.0)
        self.n = n
        Tg = self.a + np.linspace(0.0, 1.0, n)[:, None] * (self.b - self.a)[None, :]
        self.lnp = np.log(np.maximum(np.asarray(fuel.vapour_pressure(Tg), dtype=float), 1e-300))
        self.L = np.asarray(fuel.latent_heat(Tg), dtype=float)
        self.rho = np.asarray(fuel.density(Tg), dtype=float)
        self.tv = np.linspace(200.0, T_VAPOUR_CP_MAX, 261)
        self.cpv = np.asarray(fuel.vapour_specific_heat(self.tv), dtype=float)
        self.cols = np.arange(t_bub.size)

    def at(self, table, T):
        s = (T - self.a) / (self.b - self.a) * (self.n - 1)
        idx = np.clip(np.floor(s).astype(np.intp), 0, self.n - 2)
        w = s - idx
        cols = np.broadcast_to(self.cols, T.shape)
        return table[idx, cols] * (1.0 - w) + table[idx + 1, cols] * w


def _droplet_constant(fuel, T_gas, P, y_gas, grid):
    """d²-law evaporation constant K [m²/s] at local conditions (wet-bulb surface temperature).

    Solves B_T(T_s) = B_M(T_s) for the surface temperature by bisection on
    the tabulated liquid properties (:class:`_DropletGrid`), then
    ``K = 8 k ln(1+B)/(rho_l cp)`` with film properties at the mean of T_s
    and T_gas (Law & Williams' rule as in Turns, ch. 3): cp of the fuel
    vapour, k of air.  K = 0 where the gas is saturated with vapour.
    """
    Mf = fuel.molar_mass
    a = np.full_like(T_gas, grid.a)
    b = np.maximum(np.minimum(T_gas, grid.b[None, :]), a)

    def f(Ts):
        ps = np.exp(grid.at(grid.lnp, Ts))
        X = np.minimum(ps / P, 1.0 - 1e-12)
        Ys = X * Mf / (X * Mf + (1.0 - X) * thermo.M_AIR)
        cp = np.interp(0.5 * (Ts + T_gas), grid.tv, grid.cpv)
        bt = cp * (T_gas - Ts) / grid.at(grid.L, Ts)
        bm = (Ys - y_gas) / (1.0 - Ys)
        return bt - bm, bt

    fa, _ = f(a)
    fb, _ = f(b)
    evaporates = (fb < 0) & (fa > 0)
    lo, hi = a.copy(), b.copy()
    for _ in range(44):
        mid = 0.5 * (lo + hi)
        fm, _ = f(mid)
        pos = fm > 0
        lo = np.where(pos, mid, lo)
        hi = np.where(pos, hi, mid)
    Ts = 0.5 * (lo + hi)
    _, B = f(Ts)
    B = np.where(evaporates, np.maximum(B, 0.0), 0.0)
    tbar = 0.5 * (Ts + T_gas)
    cp = np.interp(tbar, grid.tv, grid.cpv)
    k = heat._sutherland(tbar, heat.SUTHERLAND_AIR["conductivity"])
    return 8.0 * k * np.log1p(B) / (grid.at(grid.rho, Ts) * cp), Ts


# -- input handling ----------------------------------------------------------------

def _as_points(shape, *arrays):
    return [np.broadcast_to(np.asarray(a, dtype=float), shape).reshape(-1).copy() for a in arrays]


def _oil_share(fuel):
    """Mass fraction of non-volatile oil in the fuel as pumped [kg/kg] (0 for a plain fuel)."""
    for name in ("oil_mass_share",):
        val = getattr(fuel, name, None)
        if val is not None:
            return float(val)
    return 0.0


def _flags_for(N):
    return [[] for _ in range(N)]


def _flag(flags, mask, text):
    for i in np.flatnonzero(mask):
        if text not in flags[i]:
            flags[i].append(text)


def vaporiser(bore, heated_length, fuel_flow, air_flow, pressure, t_air_in, wall, fuel, *,
              t_fuel_in=298.15, droplet_diameter=None, needle_bore=None, needle_od=None,
              n_steps=N_STEPS, laminar=heat.LAMINAR_DEFAULT, inner_htc=None,
              flame_speed_method=FLAME_SPEED_DEFAULT, coking_limit=COKING_LIMIT,
              ambient_pressure=P_ATM, check_steps=True, n_table=N_TABLE, shape="straight",
              return_length=None, return_wall=None, bend_radius=None):
    """Vaporiser-tube check: march along the heated length, margins and verdict.

    Parameters
    ----------
    bore : array_like
        Tube inside diameter [m]
    heated_length : array_like
        Heated length of the tube [m]
    fuel_flow : array_like
        Liquid fuel flow into the tube (oil included), >= 0 [kg/s]
    air_flow : array_like
        Air flow into the tube, > 0 (see :func:`tube_air_flow`) [kg/s]
    pressure : array_like
        Case pressure at the tube inlet [Pa abs]
    t_air_in : array_like
        Air temperature at the tube inlet (compressor exit) [K]
    wall : array_like, WallProfile or FlameSide
        Inner-wall temperature (uniform, broadcast with the points), a
        :class:`WallProfile`, or :class:`FlameSide` conditions to solve it [K]
    fuel : Fuel
        The fuel (a blend with turbine oil from ``fuel.with_oil(pct)``:
        the oil stays liquid) [-]
    t_fuel_in : array_like
        Liquid fuel temperature at the needle exit; default 25 °C [K]
    droplet_diameter : array_like, optional
        Initial droplet diameter; default: the largest drop the tube's inlet
        air leaves unbroken (critical Weber number 12, Hinze 1955), capped by
        Rayleigh break-up of the needle's jet (1.89 x needle bore) when
        ``needle_bore`` is given, and by the tube bore -- an assumption [m]
    needle_bore : array_like, optional
        Needle inside diameter, for the default droplet size [m]
    needle_od : array_like, optional
        Needle outside diameter; the tube bore must be larger [m]
    n_steps : int
        Axial steps of the march (>= 4, even) [-]
    laminar : str
        Laminar entry correlation, "stephan" (default) or "hausen" [-]
    inner_htc : array_like, optional
        A given inner heat-transfer coefficient instead of the correlations
        [W/(m² K)]
    flame_speed_method : str
        "gulder" (default) or "metghalchi_keck" [-]
    coking_limit : float
        Wetted-wall temperature above which deposits are expected; default
        260 °C, the JFTOT test temperature of ASTM D3241 [K]
    ambient_pressure : float
        Ambient pressure; the case pressure must not be below it [Pa abs]
    check_steps : bool
        Repeat the march with half the steps for the error estimate [-]
    n_table : tuple of int
        Temperature nodes of the enthalpy tables: up to just above the dew
        point, and from there to the hottest wall [-]
    shape : str
        "straight" (one heated leg) or "return" (a second heated leg after
        a 180° return bend, the outlet facing the front of the combustor) [-]
    return_length : array_like, optional
        Heated length of the return leg; default ``heated_length`` [m]
    return_wall : array_like, WallProfile or FlameSide, optional
        Wall of the return leg, as ``wall``; default the same as ``wall`` [K]
    bend_radius : array_like, optional
        Radius of the return bend to the tube axis; default 2 bores [m]

    Returns
    -------
    VaporiserResult
        Exit values, margins, verdict and the profile along the tube; see
        :class:`VaporiserResult`.

    Raises
    ------
    FuelsysInputError
        Heated length or bore <= 0, bore not larger than the needle, air
        flow <= 0, negative fuel flow, case pressure below ambient.

    Notes
    -----
    Assumptions: equilibrium between liquid and gas at one temperature in
    each cross-section (the thermal march), dry-wall convection (wetting and
    film boiling would raise the heat transfer), gas transport properties
    of air (the fuel vapour is a few per cent of the moles), homogeneous
    two-phase flow, flash tables at the inlet pressure (the pressure falls
    by well under 1 % along a tube), no axial conduction in the wall.  The
    kinetic check uses the fuel's true vapour pressure (its light ends),
    which is optimistic for the heavy end of a wide-cut fuel.

    References
    ----------
    See the module docstring; heat transfer: :mod:`fuelsys.heat`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> r = vaporiser(6e-3, 0.15, 0.5e-3, 4e-3, 3e5, 473.15, 873.15, get_fuel("kerosene"))
    >>> 0.0 < r.vapour_fraction <= 1.0
    True
    """
    # ---- inputs ---------------------------------------------------------------
    n_steps = int(n_steps)
    if n_steps < 4 or n_steps % 2:
        raise FuelsysInputError(f"n_steps must be an even whole number >= 4 (got {n_steps})")
    if laminar not in heat.LAMINAR_METHODS:
        raise FuelsysInputError(f"laminar method must be one of {', '.join(heat.LAMINAR_METHODS)} (got {laminar!r})")
    if flame_speed_method not in FLAME_SPEED_METHODS:
        raise FuelsysInputError(f"flame-speed method must be one of {', '.join(FLAME_SPEED_METHODS)} "
                                f"(got {flame_speed_method!r})")
    L_in = np.asarray(heated_length, dtype=float)
    if np.any(~np.isfinite(L_in)) or np.any(L_in <= 0):
        bad = L_in[~(np.isfinite(L_in) & (L_in > 0))].flat[0]
        raise FuelsysInputError(f"heated length must be > 0 (got {bad * 1e3:g} mm)")
    d_in = _require_positive("tube bore", bore, 1e3, "mm")
    ma_in = np.asarray(air_flow, dtype=float)
    if np.any(~np.isfinite(ma_in)) or np.any(ma_in <= 0):
        bad = ma_in[~(np.isfinite(ma_in) & (ma_in > 0))].flat[0]
        raise FuelsysInputError(f"air flow must be > 0 (got {bad * 1e3:g} g/s): the tube needs air to carry "
                                "the fuel")
    mf_in = np.asarray(fuel_flow, dtype=float)
    if np.any(~np.isfinite(mf_in)) or np.any(mf_in < 0):
        bad = mf_in[~(np.isfinite(mf_in) & (mf_in >= 0))].flat[0]
        raise FuelsysInputError(f"fuel flow must be >= 0 (got {bad * 6e4:g} g/min)")
    p_in = np.asarray(pressure, dtype=float)
    if np.any(~np.isfinite(p_in)) or np.any(p_in < ambient_pressure):
        bad = p_in[~(np.isfinite(p_in) & (p_in >= ambient_pressure))].flat[0]
        raise FuelsysInputError(f"case pressure {bad / 1e5:g} bar abs is below ambient "
                                f"{ambient_pressure / 1e5:g} bar abs; give the absolute case pressure "
                                "(ambient or above)")
    ta_in = _require_positive("inlet air temperature", t_air_in, 1.0, "K")
    tf_in = _require_positive("fuel inlet temperature", t_fuel_in, 1.0, "K")
    if needle_od is not None:
        dn = np.asarray(needle_od, dtype=float)
        if np.any(dn >= d_in):
            i = int(np.argmax(np.broadcast_to(dn >= d_in, np.broadcast(dn, d_in).shape)))
            raise FuelsysInputError(
                f"tube bore {np.broadcast_to(d_in, np.broadcast(dn, d_in).shape).flat[i] * 1e3:g} mm is not larger "
                f"than the needle outside diameter {np.broadcast_to(dn, np.broadcast(dn, d_in).shape).flat[i] * 1e3:g}"
                " mm; the needle must fit inside the tube")
    if shape not in ("straight", "return"):
        raise FuelsysInputError(f"shape must be straight or return (got {shape!r})")
    legs_in = [(L_in, wall)]
    if shape == "return":
        L2_in = L_in if return_length is None else np.asarray(return_length, dtype=float)
        if np.any(~np.isfinite(L2_in)) or np.any(L2_in <= 0):
            bad = L2_in[~(np.isfinite(L2_in) & (L2_in > 0))].flat[0]
            raise FuelsysInputError(f"return length must be > 0 (got {bad * 1e3:g} mm)")
        legs_in.append((L2_in, wall if return_wall is None else return_wall))
        rd_in = BEND_R_OVER_D * d_in if bend_radius is None else _require_positive(
            "bend radius", bend_radius, 1e3, "mm")
    elif return_length is not None or return_wall is not None or bend_radius is not None:
        raise FuelsysInputError("return_length, return_wall and bend_radius belong to shape='return'")
    extras = [a for a in (droplet_diameter, needle_bore, inner_htc) if a is not None]
    if shape == "return":
        extras += [legs_in[1][0], rd_in]
    wall_shapes = [_wall_shape(w) for _, w in legs_in]
    out_shape = np.broadcast_shapes(np.shape(d_in), np.shape(L_in), np.shape(ma_in), np.shape(mf_in),
                                    np.shape(p_in), np.shape(ta_in), np.shape(tf_in), *wall_shapes,
                                    *[np.shape(a) for a in extras])
    N = int(np.prod(out_shape)) if out_shape else 1
    d, m_air, m_liq, P0, Ta, Tfuel = _as_points(out_shape, d_in, ma_in, mf_in, p_in, ta_in, tf_in)
    legs = []
    for length, w in legs_in:
        kind, data = _wall_points(w, out_shape, N)
        legs.append({"length": _as_points(out_shape, length)[0], "kind": kind, "wall": data})
    bend_rd = _as_points(out_shape, rd_in)[0] / d if shape == "return" else None
    if bend_rd is not None:
        warn_validity("Crane bend table", "bend radius / bore", bend_rd, CRANE_BEND_R_OVER_D[0],
                      CRANE_BEND_R_OVER_D[-1], "-")
    if inner_htc is not None:
        inner = _as_points(out_shape, _require_positive("inner heat-transfer coefficient", inner_htc, 1.0, "W/(m² K)"))[0]
    else:
        inner = None

    D_given = None if droplet_diameter is None else _as_points(
        out_shape, _require_positive("droplet diameter", droplet_diameter, 1e6, "µm"))[0]
    NB = None if needle_bore is None else _as_points(out_shape, _require_positive("needle bore", needle_bore, 1e3, "mm"))[0]
    n_table = tuple(int(n) for n in n_table)
    if len(n_table) != 2 or n_table[0] < 4 or n_table[1] < 2:
        raise FuelsysInputError(f"n_table must be (>= 4, >= 2) nodes (got {n_table})")
    args = [fuel, d, legs, bend_rd, m_air, m_liq, P0, Ta, Tfuel, inner, D_given, NB,
            n_steps, n_table, laminar, flame_speed_method, coking_limit, ambient_pressure, check_steps]
    res = _solve(*args)
    # where the tube's pressure drop moves the equilibrium enough to show in the energy balance, march
    # again with flash tables at the inlet and the exit pressure
    redo = np.flatnonzero((np.abs(res["energy_error"]) > 0.5 * ENERGY_TOLERANCE)
                          & (res["pressure_drop"] > 1e-3 * P0) & (m_liq > 0))
    if redo.size:
        sub = [fuel] + [_take(a, redo) for a in args[1:12]] + args[12:]
        p_exit = P0[redo] - res["pressure_drop"][redo]
        again = _solve(*sub, p_second=np.minimum(p_exit, P0[redo] * (1.0 - 1e-3)))
        better = np.abs(again["energy_error"]) < np.abs(res["energy_error"][redo])
        _merge(res, again, redo[better], np.flatnonzero(better))
    for text in sorted({t for v in res["validity"] if v for t in v.split("; ")}):
        warnings.warn(f"vaporiser: {text}", ValidityWarning, stacklevel=2)

    def out(a):
        a = np.asarray(a)
        if a.dtype == bool:
            return bool(a.reshape(out_shape)) if out_shape == () else a.reshape(out_shape)
        return _out(a.reshape(out_shape))

    def out_text(items):
        if out_shape == ():
            return items[0]
        return np.array(items, dtype=object).reshape(out_shape)

    profile = {key: val.reshape(val.shape[:1] + out_shape) for key, val in res.pop("profile").items()}
    texts = {key: out_text(res.pop(key)) for key in ("verdict", "validity")}
    return VaporiserResult(**{key: out(val) for key, val in res.items()}, **texts, profile=profile)


def _wall_shape(wall):
    """Operating-point shape of a wall description."""
    if isinstance(wall, WallProfile):
        return np.shape(wall.temperature)[:-1]
    if isinstance(wall, FlameSide):
        return np.broadcast(*[np.asarray(getattr(wall, f), dtype=float) for f in _FLAME_FIELDS]).shape
    _require_positive("wall temperature", wall, 1.0, "K")
    return np.shape(wall)


_FLAME_FIELDS = ("gas_temperature", "h_out", "emissivity_gas", "emissivity_wall", "thickness", "conductivity")


def _wall_points(wall, shape, N):
    """(kind, per-point data) of a wall description broadcast to the operating points."""
    if isinstance(wall, WallProfile):
        temps = np.broadcast_to(np.asarray(wall.temperature, dtype=float), shape + (np.size(wall.position),))
        return "profile", (np.asarray(wall.position, dtype=float), temps.reshape(N, -1).copy())
    if isinstance(wall, FlameSide):
        return "flame", dict(zip(_FLAME_FIELDS, _as_points(shape, *[getattr(wall, f) for f in _FLAME_FIELDS])))
    return "uniform", _as_points(shape, wall)[0]


def _take(a, idx):
    """Entries ``idx`` of a per-point input (array, profile tuple, flame-side dict, legs); others unchanged."""
    if a is None or isinstance(a, str):
        return a
    if isinstance(a, list):
        return [{"length": leg["length"][idx], "kind": leg["kind"], "wall": _take(leg["wall"], idx)} for leg in a]
    if isinstance(a, tuple):
        return (a[0], a[1][idx])
    if isinstance(a, dict):
        return {k: v[idx] for k, v in a.items()}
    if isinstance(a, np.ndarray) and a.ndim == 1:
        return a[idx]
    return a


def _merge(res, part, into, source):
    """Put the points ``source`` of the result dict ``part`` at the points ``into`` of ``res``."""
    for key, val in part.items():
        if key == "profile":
            for k, v in val.items():
                res["profile"][k][:, into] = v[:, source]
        elif isinstance(val, list):
            for i, j in zip(into, source):
                res[key][i] = val[j]
        else:
            res[key][into] = np.asarray(val)[source]


def _solve(fuel, d, legs, bend_rd, m_air, m_liq, P0, Ta, Tfuel, inner, D_given, NB, n_steps, n_table, laminar,
           flame_speed_method, coking_limit, ambient_pressure, check_steps, p_second=None):
    """The march and its margins on flat arrays of N points; returns a dict of flat results.

    ``p_second`` (N,) adds flash tables at a second pressure, interpolated in
    pressure along the tube (used where the tube's pressure drop moves the
    equilibrium enough to show in the energy balance).
    """
    N = d.size
    L = sum(leg["length"] for leg in legs)
    t_wall_min, t_wall_max = np.full(N, np.inf), np.full(N, -np.inf)
    for leg in legs:
        if leg["kind"] == "uniform":
            lo = hi = leg["wall"]
        elif leg["kind"] == "profile":
            lo, hi = leg["wall"][1].min(axis=1), leg["wall"][1].max(axis=1)
        else:
            f = leg["wall"]
            lo = np.minimum(Ta, f["gas_temperature"])
            hi = np.maximum(Ta, np.minimum(f["gas_temperature"], _flame_side_bound(f, d, L, m_air,
                                                                                   np.maximum(Ta, Tfuel))))
        t_wall_min, t_wall_max = np.minimum(t_wall_min, lo), np.maximum(t_wall_max, hi)
    # ---- fuel, flows and tables ---------------------------------------------------
    oil_w = _oil_share(fuel)
    volatile = 1.0 - oil_w
    far = m_liq / m_air
    has_fuel = far > 0
    M_fuel = float(fuel.molar_mass) if np.any(has_fuel) else thermo.M_AIR
    stoich = float(fuel.stoich_far) if np.any(has_fuel) else math.nan
    # inlet: adiabatic mixing of the air with the liquid fuel at its own temperature
    h_air_in = np.asarray(thermo.enthalpy(Ta), dtype=float)
    h_fuel_in = _liquid_enthalpy(fuel, Tfuel) if np.any(has_fuel) else np.zeros(N)
    H_in = h_air_in + far * h_fuel_in
    t_in_min = np.minimum(Ta, Tfuel)
    t_mix_low = _flash_cooling(fuel, H_in, t_in_min, P0, far, has_fuel)
    t_lo = np.minimum(t_mix_low, t_wall_min) - 2.0
    t_hi = np.maximum(np.maximum(Ta, Tfuel), t_wall_max) + 2.0
    if np.any(has_fuel):
        t_lo = np.maximum(t_lo, float(fuel.t_min))
    # a near-sonic inlet would choke: the march treats the gas as low-speed flow
    rho_in = P0 / (thermo.R_AIR * Ta)
    mach_in = m_air / (rho_in * 0.25 * np.pi * d * d) / np.sqrt(np.asarray(thermo.gamma(Ta)) * thermo.R_AIR * Ta)
    if np.any(mach_in > MACH_LIMIT):
        i = int(np.argmax(mach_in))
        raise FuelsysInputError(
            f"air flow {m_air[i] * 1e3:g} g/s is too much for a {d[i] * 1e3:g} mm tube at {P0[i] / 1e5:g} bar abs: "
            f"inlet Mach number {mach_in[i]:.2f} (allowed < {MACH_LIMIT:g}); the tube would choke")
    n_dense, n_sparse = n_table
    with warnings.catch_warnings():
        # nodes the march may never reach (up to the wall temperature) must not raise the fuel model's
        # range warnings; the exit state is evaluated again below, with its warnings
        warnings.simplefilter("ignore", ValidityWarning)
        if np.any(has_fuel):
            t_dew_in, _ = _dew_point(fuel, P0, np.where(has_fuel, far, 1e-6))
        else:
            t_dew_in = t_lo + 1.0
        tables = _Tables(fuel, t_lo, t_dew_in + TABLE_KNEE_K, t_hi, P0, far, has_fuel, n_dense, n_sparse,
                         p_second)
    ctx = _Context(fuel, m_air, far, tables, laminar, inner, M_fuel)

    T_mix = tables.temperature(H_in, P0)
    P_start = P0.copy()

    march_legs, x0 = [], np.zeros(N)
    for spec in legs:
        march_legs.append(_Leg(length=spec["length"], bore=d, kind=spec["kind"], wall=spec["wall"], x0=x0))
        x0 = x0 + spec["length"]
    first = march_legs[0]
    if first.kind == "flame":
        wall0 = 0.5 * (T_mix + first.wall["gas_temperature"])
    else:
        wall0 = _wall_at(first, np.zeros(N))

    def march(n, record):
        state = _State(H=H_in, T=T_mix, P=P_start, x=np.zeros(N), wall=wall0)
        heat_total = np.zeros(N)
        for k, leg in enumerate(march_legs):
            if k:
                state, _ = _bend(ctx, state, d, bend_rd)
                if leg.kind == "flame":
                    state.wall = 0.5 * (state.T + leg.wall["gas_temperature"])
            state, q = _march_leg(ctx, state, leg, n, record)
            heat_total = heat_total + q
        return state, heat_total

    record = {"x": [], "T": [], "P": [], "wall": [], "mid_wall": [], "mid_xv": [], "Re": [], "vol": []}
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        state, q_in = march(n_steps, record)
        if check_steps:
            coarse, _ = march(n_steps // 2, None)
    T_exit, P_exit = state.T, state.P
    if np.any(P_exit < 0.5 * P0):
        i = int(np.argmin(P_exit / P0))
        raise FuelsysInputError(
            f"the tube's own pressure drop would exceed half the case pressure ({(P0[i] - P_exit[i]) / 1e5:.3g} of "
            f"{P0[i] / 1e5:g} bar): too much air ({m_air[i] * 1e3:g} g/s) for a {d[i] * 1e3:g} mm tube "
            f"{L[i] * 1e3:g} mm long; the flow would choke")

    # ---- exit state straight from the fuel model ---------------------------------
    flags = _flags_for(N)
    if np.any(has_fuel):
        far_s = np.where(has_fuel, far, 1e-6)
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always", ValidityWarning)
            try:
                xv_exit = np.asarray(fuel.vapour_fraction(T_exit, P_exit, far_s), dtype=float)
                h_f_exit = np.asarray(fuel.enthalpy(T_exit, P_exit, far_s), dtype=float)
            except FuelsysInputError as exc:
                # beyond the fuel model's flash (e.g. a vapour hotter than its range): the tables carry on
                # with the vapour's heat capacity; say so
                pr_exit, _ = tables.props(T_exit, P_exit)
                xv_exit = pr_exit[tables.XV]
                h_f_exit = (pr_exit[tables.H] - np.asarray(thermo.enthalpy(T_exit))) / far_s
                _flag(flags, has_fuel, f"exit state beyond the fuel model ({exc}); continued with the vapour's "
                                       "heat capacity")
            dew, low = _dew_point(fuel, P_exit, far_s)
            _flag(flags, has_fuel & low, "dew point below the fuel model's range (its lowest temperature used)")
            dew = np.where(has_fuel, dew, np.nan)
            t_bub = np.asarray(fuel.bubble_point(P0), dtype=float) * np.ones(N)
        for w in caught:
            if issubclass(w.category, ValidityWarning):
                _flag(flags, has_fuel, f"fuel model at the exit state: {str(w.message).split(';')[0]}")
            else:
                warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
    else:
        xv_exit = np.ones(N)
        h_f_exit = np.zeros(N)
        dew = np.full(N, np.nan)
        t_bub = np.full(N, np.nan)
    xv_exit = np.where(has_fuel, xv_exit, 1.0)
    vap_share = np.where(has_fuel, np.clip(xv_exit / volatile, 0.0, 1.0), 1.0)
    H_exit = np.asarray(thermo.enthalpy(T_exit), dtype=float) + far * h_f_exit
    rise = m_air * (H_exit - H_in)
    heat_w = q_in
    # relative to the enthalpy rise, or to 1 K of the air's heating where the rise is smaller
    scale = np.maximum(np.maximum(np.abs(rise), np.abs(heat_w)), m_air * 1000.0)
    energy_error = (heat_w - rise) / scale
    _flag(flags, np.abs(energy_error) > ENERGY_TOLERANCE,
          f"energy balance off by more than {ENERGY_TOLERANCE * 100:g} % (raise n_steps)")
    if check_steps:
        err_T = np.abs(T_exit - coarse.T) / 3.0
        xv_coarse = tables.props(coarse.T, coarse.P)[0][tables.XV]
        xv_fine = tables.props(T_exit, P_exit)[0][tables.XV]
        err_x = np.abs(xv_fine - xv_coarse) / 3.0 / volatile
        _flag(flags, err_T > STEP_TOLERANCE_K,
              f"march not converged: step-doubling estimate above {STEP_TOLERANCE_K:g} K (raise n_steps)")
    else:
        err_T = np.full(N, np.nan)
        err_x = np.full(N, np.nan)

    # ---- profile -----------------------------------------------------------------
    x_nodes = np.asarray(record["x"])
    T_nodes = np.asarray(record["T"])
    P_nodes = np.asarray(record["P"])
    pr_nodes = np.stack([tables.props(Ti, Pi)[0] for Ti, Pi in zip(T_nodes, P_nodes)], axis=1)  # (K, nodes, N)
    xv_nodes = pr_nodes[tables.XV]
    xv_nodes[-1] = xv_exit
    wall_nodes = np.asarray(record["wall"])
    vol_nodes = np.asarray(record["vol"])
    n_total = x_nodes.shape[0] - 1
    area = 0.25 * np.pi * d * d
    u_nodes = m_air * vol_nodes / area
    dt = 0.5 * (1.0 / u_nodes[1:] + 1.0 / u_nodes[:-1]) * np.diff(x_nodes, axis=0)
    time_nodes = np.concatenate([np.zeros((1, N)), np.cumsum(dt, axis=0)])
    t_res = time_nodes[-1]

    # ---- wetted wall and oil ------------------------------------------------------
    # wetted: more than WET_SHARE of the fuel still liquid there, or oil in the fuel (the oil never
    # vaporises, so it wets the whole tube)
    wet_oil = has_fuel & (oil_w > 0)
    liquid_nodes = has_fuel[None, :] & ((xv_nodes < volatile * (1.0 - WET_SHARE)) | wet_oil[None, :])
    mid_wall = np.asarray(record["mid_wall"])
    liquid_mid = has_fuel[None, :] & ((np.asarray(record["mid_xv"]) < volatile * (1.0 - WET_SHARE))
                                      | wet_oil[None, :])
    fuel_wet = has_fuel & np.any(xv_nodes < volatile * (1.0 - WET_SHARE), axis=0)
    wet = np.concatenate([np.where(liquid_nodes, wall_nodes, -np.inf), np.where(liquid_mid, mid_wall, -np.inf)])
    max_wet = wet.max(axis=0)
    max_wet = np.where(np.isfinite(max_wet), max_wet, np.nan)
    max_wall = np.maximum(wall_nodes.max(axis=0), mid_wall.max(axis=0))
    coking = np.where(np.isfinite(max_wet), max_wet > coking_limit, False)
    oil_residue = m_liq * oil_w

    # ---- droplets -----------------------------------------------------------------
    yv_nodes = far[None, :] * xv_nodes
    y_gas = yv_nodes / (1.0 + yv_nodes)
    rho_gas_in = P_start * thermo.M_AIR / (thermo.R_MOLAR * T_mix)
    if np.any(has_fuel):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            grid = _DropletGrid(fuel, t_bub)
        K_nodes, _ = _droplet_constant(fuel, T_nodes, P_nodes, y_gas, grid)
        sigma = np.asarray(fuel.surface_tension(np.clip(Tfuel, fuel.t_min, fuel.t_max)), dtype=float)
        d_we = heat.WEBER_CRITICAL * sigma / (rho_gas_in * np.maximum(u_nodes[0], 1e-9) ** 2)
    else:
        K_nodes = np.zeros_like(T_nodes)
        d_we = d.copy()
    if D_given is not None:
        D0 = D_given
    else:
        D0 = np.minimum(d_we, d)
        if NB is not None:
            D0 = np.minimum(D0, heat.RAYLEIGH_DROP_RATIO * NB)
    D2 = np.empty_like(T_nodes)
    D2[0] = D0 * D0
    life = np.full(N, np.inf)
    for k in range(n_total):
        drop = 0.5 * (K_nodes[k] + K_nodes[k + 1]) * dt[k]
        nxt = D2[k] - drop
        gone = (nxt <= 0) & ~np.isfinite(life)
        frac = np.where(drop > 0, D2[k] / np.where(drop > 0, drop, 1.0), 0.0)
        life = np.where(gone, time_nodes[k] + frac * dt[k], life)
        D2[k + 1] = np.maximum(nxt, 0.0)
    survive = has_fuel & (D2[-1] > 0)
    K_exit = K_nodes[-1]
    with np.errstate(divide="ignore", invalid="ignore"):
        extra = np.where(K_exit > 0, D2[-1] / np.where(K_exit > 0, K_exit, 1.0), np.inf)
    life = np.where(survive, t_res + extra, life)
    life = np.where(has_fuel, life, 0.0)

    # ---- mixture, flammability and flashback --------------------------------------
    tube_phi = np.where(has_fuel, far / stoich, 0.0) if np.any(has_fuel) else np.zeros(N)
    vap_phi_nodes = (far[None, :] * xv_nodes) / stoich if np.any(has_fuel) else np.zeros_like(T_nodes)
    X_nodes = (yv_nodes / M_fuel) / (yv_nodes / M_fuel + 1.0 / thermo.M_AIR)
    if np.any(has_fuel):
        lfl, ufl = _flammability_raw(fuel, T_nodes)
        lfl, ufl = np.asarray(lfl), np.asarray(ufl)
        flam_nodes = has_fuel[None, :] & (X_nodes >= lfl) & (X_nodes <= ufl)
        to_phi = (M_fuel / thermo.M_AIR) / stoich
        lfl_phi = lfl[-1] / (1.0 - lfl[-1]) * to_phi
        ufl_phi = ufl[-1] / (1.0 - ufl[-1]) * to_phi
        fam = FLAME_SPEED_SURROGATE.get(_family(fuel), "isooctane")
        _, raw, table = FLAME_SPEED_METHODS[flame_speed_method]
        if fam not in table:
            fam = "isooctane"
        sl_nodes = np.where(flam_nodes, raw(np.maximum(vap_phi_nodes, 1e-6), T_nodes, P_nodes, fam), 0.0)
    else:
        flam_nodes = np.zeros_like(T_nodes, dtype=bool)
        lfl_phi = ufl_phi = np.full(N, np.nan)
        sl_nodes = np.zeros_like(T_nodes)
    Re_nodes = np.asarray(record["Re"])  # (n+1, N): the inlet, then each step's midpoint
    inten = np.where(Re_nodes > heat.RE_LAMINAR,
                     TURBULENCE_INTENSITY[0] * np.maximum(Re_nodes, 1.0) ** TURBULENCE_INTENSITY[1], 0.0)
    st_nodes = np.where(flam_nodes, sl_nodes + inten * u_nodes, 0.0)
    with np.errstate(divide="ignore"):
        ratio = np.where(flam_nodes & (st_nodes > 0), u_nodes / np.where(st_nodes > 0, st_nodes, 1.0), np.inf)
    margin = ratio.min(axis=0)
    flashback = np.isfinite(margin) & (margin < 1.0)
    flammable = flam_nodes[-1]

    # ---- validity ---------------------------------------------------------------------
    Re_all = Re_nodes
    if inner is None:
        pr_all = pr_nodes
        _, cpg_all, mu_all, k_all = _gas_props(ctx, pr_all)
        Pr_all = cpg_all * mu_all / k_all
        _flag(flags, np.any((Pr_all < 0.5) | (Pr_all > 2000), axis=0), "Prandtl number outside 0.5..2000")
        turb = Re_all > heat.RE_TURBULENT
        _flag(flags, np.any(turb & (Re_all > 5e6), axis=0), "Reynolds number above 5e6 (Gnielinski)")
        ratio_tw = T_nodes / np.maximum(wall_nodes, 1.0)
        _flag(flags, np.any(turb & (ratio_tw < 0.5), axis=0),
              "wall more than twice the gas temperature (property-ratio correction)")
    if inner is None:
        _flag(flags, np.any(T_nodes > heat.VALIDITY["sutherland_viscosity_air"]["T"][1], axis=0),
              "gas above 1000 K (Sutherland air properties)")
    vlo, vhi, _ = VALIDITY[f"{'gulder_1984' if flame_speed_method == 'gulder' else 'metghalchi_keck_1982'}"]["phi"]
    _flag(flags, np.any(flam_nodes & ((vap_phi_nodes < vlo) | (vap_phi_nodes > vhi)), axis=0),
          f"flame speed extrapolated outside phi {vlo:g}..{vhi:g}")
    tlo, thi, _ = VALIDITY["flammability_limits"]["T"]
    _flag(flags, has_fuel & ((T_exit < tlo) | (T_exit > thi)),
          "flammability limits extrapolated in temperature")
    if _family(fuel) == "kerosene" and np.any(has_fuel) and not str(getattr(fuel, "name", "")).lower().startswith("kerosene"):
        _flag(flags, has_fuel, "flame speed and flammability from kerosene-type data")
    if np.any(has_fuel) and np.any(T_exit > float(fuel.t_max)):
        _flag(flags, has_fuel & (T_exit > float(fuel.t_max)),
              f"exit above the liquid-property range of {fuel.name} ({float(fuel.t_max) - T0_C:.0f} °C)")
    _flag(flags, mach_in > 0.3, "inlet Mach number above 0.3 (compressibility neglected in the march)")
    validity = ["; ".join(f) for f in flags]


    dew_margin = T_exit - dew
    verdict = _verdicts(N, has_fuel, vap_share, dew_margin, survive, life, t_res, coking, max_wet,
                        coking_limit, flashback, margin, flammable, X_nodes[-1], oil_residue, T_exit,
                        Ta, wall_nodes, D0, fuel_wet)
    profile = {
        "position": x_nodes, "gas_temperature": T_nodes, "wall_temperature": wall_nodes,
        "vapour_fraction": np.where(has_fuel[None, :], xv_nodes / volatile, 1.0), "velocity": u_nodes,
        "pressure": P_nodes, "droplet_diameter": np.sqrt(D2), "time": time_nodes,
    }
    return dict(
        vapour_fraction=vap_share, exit_temperature=T_exit, dew_point=dew, dew_margin=dew_margin,
        residence_time=t_res, droplet_diameter=D0, droplet_lifetime=life, droplets_survive=survive,
        exit_droplet_diameter=np.sqrt(D2[-1]), tube_phi=tube_phi, exit_vapour_phi=vap_phi_nodes[-1],
        flammable=flammable, lower_limit_phi=lfl_phi * np.ones(N), upper_limit_phi=ufl_phi * np.ones(N),
        exit_velocity=u_nodes[-1], flame_speed=sl_nodes[-1], turbulent_flame_speed=st_nodes[-1],
        flashback_margin=margin, max_wet_wall=max_wet, max_wall=max_wall, coking_risk=coking,
        oil_residue=oil_residue, pressure_drop=P_start - P_exit, heat_in=heat_w, enthalpy_rise=rise,
        energy_error=energy_error, step_error_temperature=err_T, step_error_vapour=err_x,
        reynolds_in=Re_nodes[0], reynolds_exit=Re_nodes[-1], verdict=verdict, validity=validity,
        profile=profile)


def _flash_cooling(fuel, H_in, t_in_min, P, far, has_fuel, iterations=16):
    """Lowest temperature the inlet mixture can take [K]: below both streams where fuel flashes.

    Where the fuel model's mixture enthalpy at the colder stream's
    temperature exceeds the inlet enthalpy, fuel evaporating at the inlet
    cools the mixture below both streams; the mixing temperature is then
    bracketed by bisection on the fuel model (the lower bracket is returned),
    starting from the bound ``far L / cp_air`` (all the fuel evaporating on
    the air's heat, cp_air >= 1000 J/(kg K), L 30 % above its inlet value).
    """
    out = t_in_min.copy()
    if not np.any(has_fuel):
        return out
    far_s = np.where(has_fuel, far, 1e-6)

    def H(T, idx):
        return np.asarray(thermo.enthalpy(T), dtype=float) + far[idx] * np.asarray(
            fuel.enthalpy(T, P[idx], far_s[idx]), dtype=float)

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        allp = np.arange(t_in_min.size)
        cold = np.flatnonzero(has_fuel & (H(t_in_min, allp) > H_in))
        if cold.size == 0:
            return out
        latent = np.asarray(fuel.latent_heat(np.clip(t_in_min[cold], fuel.t_min, fuel.t_max)), dtype=float)
        lo = np.maximum(t_in_min[cold] - far[cold] * 1.3 * latent / 1000.0 - 2.0, float(fuel.t_min))
        hi = t_in_min[cold].copy()
        for _ in range(iterations):
            mid = 0.5 * (lo + hi)
            above = H(mid, cold) > H_in[cold]
            hi = np.where(above, mid, hi)
            lo = np.where(above, lo, mid)
    out[cold] = lo
    return out


def _dew_point(fuel, P, far):
    """Dew point of the fuel-air mixture [K] and where it lies below the fuel model's range.

    A gas fuel at a low fuel/air ratio has its dew point below the lowest
    temperature the model covers (the fuel model refuses it): the lowest
    temperature is used and those points are marked.
    """
    try:
        return np.asarray(fuel.dew_point(P, far), dtype=float) * np.ones(np.shape(P)), np.zeros(np.shape(P), bool)
    except FuelsysInputError:
        if getattr(fuel, "kind", "") == "liquid":
            raise
    out = np.empty(np.shape(P))
    low = np.zeros(np.shape(P), dtype=bool)
    for i in range(out.size):  # only on this rare path: find the points the model refuses
        try:
            out.flat[i] = float(fuel.dew_point(np.ravel(P)[i], np.ravel(far)[i]))
        except FuelsysInputError:
            out.flat[i] = float(fuel.t_min)
            low.flat[i] = True
    return out, low


def _liquid_enthalpy(fuel, T):
    """Liquid enthalpy [J/kg] relative to 298.15 K: integral of the liquid cp (5-point Gauss)."""
    T = np.asarray(T, dtype=float)
    if np.all(T == 298.15):
        return np.zeros_like(T)
    xg, wg = np.polynomial.legendre.leggauss(5)
    a, b = 298.15, T
    nodes = 0.5 * (b - a)[None, ...] * xg.reshape((5,) + (1,) * T.ndim) + 0.5 * (b + a)[None, ...]
    fuel.check_temperature(nodes, "fuel inlet temperature")
    cp = np.asarray(fuel.specific_heat(nodes), dtype=float)
    return 0.5 * (b - a) * np.tensordot(wg, cp, axes=(0, 0))


def _verdicts(N, has_fuel, vap, dew_margin, survive, life, t_res, coking, max_wet, coking_limit,
              flashback, margin, flammable, X_exit, oil, T_exit, T_air, wall_nodes, D0, fuel_wet):
    """One verdict text per point: level, the reasons, then the cautions.

    The level follows what the march itself decides: whether the fuel is
    vaporised at the exit (equilibrium) with a margin over the dew point
    (:data:`DEW_MARGIN_MIN_K`), whether the wall heats at all, and flashback.
    Two checks that rest on simpler models than the march are reported as
    cautions and leave the level alone: the d²-law droplet life in the gas
    alone (the equilibrium march assumes evaporation as fast as the hot wall
    film gives it, so the two bracket the truth), and deposits on a wetted
    wall above :data:`COKING_LIMIT`, an assumed threshold.
    """
    texts = []
    for i in range(N):
        reasons, cautions, level = [], [], 0
        if not has_fuel[i]:
            texts.append("no fuel: air only (exit %.0f °C)" % (T_exit[i] - T0_C))
            continue
        if np.all(wall_nodes[:, i] <= T_air[i]):
            reasons.append(f"wall (at most {np.max(wall_nodes[:, i]) - T0_C:.0f} °C) no hotter than the inlet air "
                           f"({T_air[i] - T0_C:.0f} °C): the tube adds no useful heat")
            level = max(level, 1)
        if vap[i] >= 1.0 - 1e-9:
            reasons.append(f"fully vaporised at the exit (equilibrium), {dew_margin[i]:.0f} K above the dew point")
        elif dew_margin[i] > 0:
            reasons.append(f"fuel vaporised at the exit (equilibrium) but {(1.0 - vap[i]) * 100:.2g} % held in the "
                           f"oil, {dew_margin[i]:.0f} K above the dew point")
        else:
            reasons.append(f"only {vap[i] * 100:.0f} % vaporised at the exit (equilibrium); "
                           f"exit {-dew_margin[i]:.0f} K below the dew point")
            level = max(level, 2 if vap[i] < 0.5 else 1)
        if 0 < dew_margin[i] < DEW_MARGIN_MIN_K:
            reasons.append(f"less than {DEW_MARGIN_MIN_K:.0f} K above the dew point: a colder day or more fuel "
                           "condenses fuel again")
            level = max(level, 1)
        if flashback[i]:
            reasons.append(f"flashback risk: velocity only {margin[i]:.2f} x the turbulent flame speed where "
                           "the mixture is flammable")
            level = 2
        elif flammable[i]:
            reasons.append(f"flammable mixture at the exit ({X_exit[i] * 100:.1f} % vapour), velocity "
                           f"{margin[i]:.1f} x flame speed")
        if survive[i]:
            life_txt = "never at exit conditions" if not np.isfinite(life[i]) else f"{life[i] * 1e3:.0f} ms"
            cautions.append(f"{D0[i] * 1e6:.0f} µm droplets in the gas alone would outlive the tube (life {life_txt} "
                            f"> residence {t_res[i] * 1e3:.1f} ms): the tube relies on the fuel film on its hot wall")
        else:
            reasons.append(f"{D0[i] * 1e6:.0f} µm droplets evaporate in {life[i] * 1e3:.1f} ms "
                           f"(residence {t_res[i] * 1e3:.1f} ms)")
        if coking[i]:
            liquid = ("fuel and oil" if fuel_wet[i] else "oil") if oil[i] > 0 else "liquid fuel"
            cautions.append(f"coking risk: wall wetted by {liquid} reaches {max_wet[i] - T0_C:.0f} °C "
                            f"(> {coking_limit - T0_C:.0f} °C, the assumed deposit threshold)")
        if oil[i] > 0:
            cautions.append(f"oil residue {oil[i] * 3.6e6:.2f} g/h leaves as liquid")
        text = ("good", "marginal", "poor")[level] + ": " + "; ".join(reasons)
        if cautions:
            text += "; cautions: " + "; ".join(cautions)
        texts.append(text)
    return texts
