"""The vaporiser-tube check: inputs, option groups, the result, and :func:`vaporiser` itself."""

from __future__ import annotations

import dataclasses
import warnings
from dataclasses import dataclass, field

import numpy as np

from fuelsys import heat
from fuelsys.arrays import as_float as _out
from fuelsys.errors import FuelsysInputError, ValidityWarning, warn_validity
from fuelsys.flow.fittings import CRANE_BEND_R_OVER_D
from fuelsys.fuels.base import P_ATM
from fuelsys.arrays import checked_array
from fuelsys.vaporiser._common import as_points, require_within
from fuelsys.vaporiser._march import wall_points, wall_shape
from fuelsys.vaporiser._solve import Points, Problem, Settings, remarch, solve
from fuelsys.vaporiser.constants import (BEND_R_OVER_D, COKING_LIMIT, N_STEPS, N_STEPS_MAX, N_TABLE, N_TABLE_MAX,
                                         T_GAS_MIN, T_MARCH_MAX)
from fuelsys.vaporiser.flame import FLAME_SPEED_DEFAULT, FLAME_SPEED_METHODS
from fuelsys.vaporiser.walls import FlameSide, WallProfile


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
    dew_margin_low, dew_margin_high : dew margin at the low and high end of the inner heat-transfer
        uncertainty (:data:`HTC_UNCERTAINTY`; the high end also drops the property-ratio correction
        beyond its fit); equal to dew_margin for a given inner coefficient [K]
    max_liquid_fuel_temperature : hottest liquid fuel (bulk, at the mixture's temperature); NaN where
        none stays liquid [K]
    flame_speed_estimate : True where the flashback margin rests on a flame speed extrapolated beyond
        the correlation's equivalence ratios [-]
    verdict : "good", "marginal" or "poor" and the one decisive reason, per point (str)
    cautions : "" or the cautions whose own condition holds at the point (droplets, coking, bulk fuel
        temperature, oil residue), per point (str)
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
    dew_margin_low: object
    dew_margin_high: object
    max_liquid_fuel_temperature: object
    flame_speed_estimate: object
    verdict: object
    cautions: object
    validity: object
    profile: dict = field(default_factory=dict)



#: default fuel temperature at the needle exit: 25 °C [K]
T_FUEL_DEFAULT = 298.15


@dataclass(frozen=True)
class FuelEntry:
    """How the fuel enters the tube (keywords of :func:`vaporiser`; SI).

    Parameters
    ----------
    t_fuel_in : array_like
        Liquid fuel temperature at the needle exit [K]
    droplet_diameter : array_like, optional
        Initial droplet diameter; None for the default estimate [m]
    needle_bore : array_like, optional
        Needle inside diameter, for the default droplet size [m]
    needle_od : array_like, optional
        Needle outside diameter; the tube bore must be larger [m]
    """

    t_fuel_in: object = T_FUEL_DEFAULT
    droplet_diameter: object = None
    needle_bore: object = None
    needle_od: object = None


@dataclass(frozen=True)
class TubeShape:
    """Straight tube, or a return bend with a second heated leg (keywords of :func:`vaporiser`; SI).

    Parameters
    ----------
    shape : str
        "straight" or "return" [-]
    return_length : array_like, optional
        Heated length of the return leg; default the first leg's [m]
    return_wall : array_like, WallProfile or FlameSide, optional
        Wall of the return leg; default the first leg's [K]
    bend_radius : array_like, optional
        Radius of the return bend to the tube axis; default 2 bores [m]
    """

    shape: str = "straight"
    return_length: object = None
    return_wall: object = None
    bend_radius: object = None


@dataclass(frozen=True)
class MarchOptions:
    """Numerics and inner heat transfer of the march (keywords of :func:`vaporiser`).

    Parameters
    ----------
    n_steps : int
        Axial steps per leg (>= 4, even) [-]
    n_table : tuple of int
        Temperature nodes of the enthalpy tables [-]
    check_steps : bool
        Repeat the march with half the steps for the error estimate [-]
    laminar : str
        Laminar entry correlation, "stephan" or "hausen" [-]
    inner_htc : array_like, optional
        A given inner heat-transfer coefficient instead of the correlations [W/(m² K)]
    """

    n_steps: int = N_STEPS
    n_table: tuple = N_TABLE
    check_steps: bool = True
    laminar: str = heat.LAMINAR_DEFAULT
    inner_htc: object = None


@dataclass(frozen=True)
class MarginOptions:
    """Methods and limits of the margins (keywords of :func:`vaporiser`; SI).

    Parameters
    ----------
    flame_speed_method : str
        "gulder" or "metghalchi_keck" [-]
    coking_limit : float
        Wetted-wall deposit threshold [K]
    ambient_pressure : float
        Ambient pressure; the case pressure must not be below it [Pa abs]
    """

    flame_speed_method: str = FLAME_SPEED_DEFAULT
    coking_limit: float = COKING_LIMIT
    ambient_pressure: float = P_ATM


#: option groups of :func:`vaporiser`: keyword -> class; each field of a class is also a keyword
OPTION_GROUPS = {"entry": FuelEntry, "tube": TubeShape, "march": MarchOptions, "margins": MarginOptions}


def _option_groups(options):
    """The four option groups from the keywords of :func:`vaporiser` (group objects or their fields)."""
    fields = {f.name: group for group, cls in OPTION_GROUPS.items() for f in dataclasses.fields(cls)}
    groups, loose = {}, {group: {} for group in OPTION_GROUPS}
    for key, value in options.items():
        if key in OPTION_GROUPS:
            if not isinstance(value, OPTION_GROUPS[key]):
                raise FuelsysInputError(f"{key} must be a {OPTION_GROUPS[key].__name__} (got {type(value).__name__})")
            groups[key] = value
        elif key in fields:
            loose[fields[key]][key] = value
        else:
            raise TypeError(f"vaporiser() got an unexpected keyword argument {key!r}")
    for group, cls in OPTION_GROUPS.items():
        if group in groups and loose[group]:
            raise TypeError(f"vaporiser(): give {', '.join(loose[group])} inside {group}= or alone, not both")
        groups[group] = groups.get(group) or cls(**loose[group])
    return groups


def _check_settings(march, margins):
    """The call's settings, checked."""
    n_steps = int(march.n_steps)
    if n_steps < 4 or n_steps % 2 or n_steps > N_STEPS_MAX:
        raise FuelsysInputError(f"n_steps must be an even whole number within 4..{N_STEPS_MAX} (got {n_steps})")
    if march.laminar not in heat.LAMINAR_METHODS:
        raise FuelsysInputError(f"laminar method must be one of {', '.join(heat.LAMINAR_METHODS)} "
                                f"(got {march.laminar!r})")
    if margins.flame_speed_method not in FLAME_SPEED_METHODS:
        raise FuelsysInputError(f"flame-speed method must be one of {', '.join(FLAME_SPEED_METHODS)} "
                                f"(got {margins.flame_speed_method!r})")
    n_table = tuple(int(n) for n in march.n_table)
    if len(n_table) != 2 or n_table[0] < 4 or n_table[1] < 2 or max(n_table) > N_TABLE_MAX:
        raise FuelsysInputError(f"n_table must be (4..{N_TABLE_MAX}, 2..{N_TABLE_MAX}) nodes (got {n_table})")
    return Settings(n_steps=n_steps, n_table=n_table, laminar=march.laminar,
                    flame_speed_method=margins.flame_speed_method, coking_limit=margins.coking_limit,
                    ambient_pressure=margins.ambient_pressure, check_steps=march.check_steps)


#: why the inlet air and the wall are bounded where they are (the message of a refusal)
RANGE_WHY = ("the fuel model's lowest temperature (or the gas polynomials' 200 K) to the top of the fuel-vapour "
             "heat capacities")


def _t_low(fuel):
    """Lowest inlet-air and wall temperature of the march: the gas polynomials' and the fuel model's [K]."""
    return max(T_GAS_MIN, float(getattr(fuel, "t_min", T_GAS_MIN)))


def _check_walls(legs_in, t_low):
    """Refuse given wall temperatures outside the march's range (flame-side gas is checked by FlameSide)."""
    for _, w in legs_in:
        if isinstance(w, WallProfile):
            require_within("wall temperature", w.temperature, t_low, T_MARCH_MAX, RANGE_WHY)
        elif not isinstance(w, FlameSide):
            require_within("wall temperature", w, t_low, T_MARCH_MAX, RANGE_WHY)


def _check_operating(bore, heated_length, fuel_flow, air_flow, pressure, t_air_in, entry, ambient_pressure, fuel):
    """Operating-point inputs as float arrays (unbroadcast), refused with a message where impossible."""
    t_low = _t_low(fuel)
    L_in = np.asarray(heated_length, dtype=float)
    if np.any(~np.isfinite(L_in)) or np.any(L_in <= 0):
        bad = L_in[~(np.isfinite(L_in) & (L_in > 0))].flat[0]
        raise FuelsysInputError(f"heated length must be > 0 (got {bad * 1e3:g} mm)")
    d_in = checked_array(bore, "tube bore", "mm", positive=True, scale=1e3)
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
    ta_in = require_within("inlet air temperature", t_air_in, t_low, T_MARCH_MAX, RANGE_WHY)
    tf_in = require_within("fuel inlet temperature", entry.t_fuel_in, float(fuel.t_min), float(fuel.t_max),
                           f"the liquid range of {getattr(fuel, 'name', 'the fuel')}")
    p_max = float(getattr(fuel, "p_max", np.inf))
    if np.any(p_in >= p_max):
        raise FuelsysInputError(f"case pressure {np.max(p_in) / 1e5:g} bar abs is above the fuel model's range: "
                                f"allowed < {p_max / 1e5:.3g} bar abs (the critical pressure of its lightest part)")
    if entry.needle_od is not None:
        dn = np.asarray(entry.needle_od, dtype=float)
        if np.any(dn >= d_in):
            both = np.broadcast(dn, d_in).shape
            i = int(np.argmax(np.broadcast_to(dn >= d_in, both)))
            raise FuelsysInputError(
                f"tube bore {np.broadcast_to(d_in, both).flat[i] * 1e3:g} mm is not larger "
                f"than the needle outside diameter {np.broadcast_to(dn, both).flat[i] * 1e3:g}"
                " mm; the needle must fit inside the tube")
    return d_in, L_in, mf_in, ma_in, p_in, ta_in, tf_in


def _legs_in(L_in, d_in, wall, tube):
    """(length, wall) per heated leg and the bend radius (None for a straight tube)."""
    if tube.shape not in ("straight", "return"):
        raise FuelsysInputError(f"shape must be straight or return (got {tube.shape!r})")
    legs_in = [(L_in, wall)]
    rd_in = None
    if tube.shape == "return":
        L2_in = L_in if tube.return_length is None else np.asarray(tube.return_length, dtype=float)
        if np.any(~np.isfinite(L2_in)) or np.any(L2_in <= 0):
            bad = L2_in[~(np.isfinite(L2_in) & (L2_in > 0))].flat[0]
            raise FuelsysInputError(f"return length must be > 0 (got {bad * 1e3:g} mm)")
        legs_in.append((L2_in, wall if tube.return_wall is None else tube.return_wall))
        rd_in = BEND_R_OVER_D * d_in if tube.bend_radius is None else checked_array(tube.bend_radius, "bend radius", "mm", positive=True, scale=1e3)
    elif tube.return_length is not None or tube.return_wall is not None or tube.bend_radius is not None:
        raise FuelsysInputError("return_length, return_wall and bend_radius belong to shape='return'")
    return legs_in, rd_in


def _problem(operating, wall, fuel, groups):
    """The :class:`Problem` of one call on flat points, and the operating points' shape."""
    entry, march = groups["entry"], groups["march"]
    settings = _check_settings(march, groups["margins"])
    d_in, L_in, mf_in, ma_in, p_in, ta_in, tf_in = _check_operating(*operating, entry, settings.ambient_pressure,
                                                                     fuel)
    legs_in, rd_in = _legs_in(L_in, d_in, wall, groups["tube"])
    _check_walls(legs_in, _t_low(fuel))
    extras = [a for a in (entry.droplet_diameter, entry.needle_bore, march.inner_htc) if a is not None]
    if rd_in is not None:
        extras += [legs_in[1][0], rd_in]
    wall_shapes = [wall_shape(w) for _, w in legs_in]
    out_shape = np.broadcast_shapes(np.shape(d_in), np.shape(L_in), np.shape(ma_in), np.shape(mf_in),
                                    np.shape(p_in), np.shape(ta_in), np.shape(tf_in), *wall_shapes,
                                    *[np.shape(a) for a in extras])
    N = int(np.prod(out_shape)) if out_shape else 1
    d, m_air, m_liq, P0, Ta, Tfuel = as_points(out_shape, d_in, ma_in, mf_in, p_in, ta_in, tf_in)
    legs = []
    for length, w in legs_in:
        kind, data = wall_points(w, out_shape, N)
        legs.append({"length": as_points(out_shape, length)[0], "kind": kind, "wall": data})
    bend_rd = as_points(out_shape, rd_in)[0] / d if rd_in is not None else None
    if bend_rd is not None:
        warn_validity("Crane bend table", "bend radius / bore", bend_rd, CRANE_BEND_R_OVER_D[0],
                      CRANE_BEND_R_OVER_D[-1], "-")
    inner = None if march.inner_htc is None else as_points(out_shape, checked_array(march.inner_htc, "inner heat-transfer coefficient", "W/(m² K)", positive=True))[0]
    D_given = None if entry.droplet_diameter is None else as_points(
        out_shape, checked_array(entry.droplet_diameter, "droplet diameter", "µm", positive=True, scale=1e6))[0]
    NB = None if entry.needle_bore is None else as_points(
        out_shape, checked_array(entry.needle_bore, "needle bore", "mm", positive=True, scale=1e3))[0]
    points = Points(fuel=fuel, d=d, legs=legs, bend_rd=bend_rd, m_air=m_air, m_liq=m_liq, P0=P0, Ta=Ta,
                    Tfuel=Tfuel, inner=inner, D_given=D_given, NB=NB)
    return Problem(points=points, settings=settings), out_shape


def _result(res, out_shape):
    """The flat result dict reshaped to the operating points, as a :class:`VaporiserResult`."""
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
    texts = {key: out_text(res.pop(key)) for key in ("verdict", "cautions", "validity")}
    return VaporiserResult(**{key: out(val) for key, val in res.items()}, **texts, profile=profile)


def vaporiser(bore, heated_length, fuel_flow, air_flow, pressure, t_air_in, wall, fuel, **options):
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
    **options
        The keywords below, or their groups as objects: ``entry``
        (:class:`FuelEntry`), ``tube`` (:class:`TubeShape`), ``march``
        (:class:`MarchOptions`), ``margins`` (:class:`MarginOptions`) [-]

    Other Parameters
    ----------------
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
    problem, out_shape = _problem((bore, heated_length, fuel_flow, air_flow, pressure, t_air_in), wall, fuel,
                                  _option_groups(options))
    res = remarch(problem, solve(problem))
    for text in sorted({t for v in res["validity"] if v for t in v.split("; ")}):
        warnings.warn(f"vaporiser: {text}", ValidityWarning, stacklevel=2)
    return _result(res, out_shape)
