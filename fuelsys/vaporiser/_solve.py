"""One call's march on flat arrays of points: table build, march, step check, exit state, re-march.

:func:`solve` takes one :class:`Problem` (the points' inputs and the call's
settings) and returns a dict of flat results; :func:`remarch` marches again,
with flash tables at a second pressure, the points whose energy balance
shows the tube's own pressure drop (see the package docstring).
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass, replace

import numpy as np

from fuelsys import thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.vaporiser import _droplets, _margins
from fuelsys.vaporiser._common import flag, flags_for, oil_share
from fuelsys.vaporiser._march import Context, Leg, State, bend, flame_side_bound, march_leg, wall_at
from fuelsys.vaporiser._tables import Tables, dew_point, flash_cooling, liquid_enthalpy
from fuelsys.vaporiser.constants import ENERGY_TOLERANCE, MACH_LIMIT, STEP_TOLERANCE_K, TABLE_KNEE_K


@dataclass
class Points:
    """Per-point inputs of one call, flat arrays of N points (SI).

    ``legs`` holds one dict per heated leg (``length``, ``kind``: "uniform",
    "profile" or "flame", ``wall``: the leg's per-point wall data);
    ``bend_rd`` the return bend's radius over the bore (None for a straight
    tube); ``inner``, ``D_given`` and ``NB`` the optional inner coefficient,
    droplet diameter and needle bore (None when not given).
    """

    fuel: object
    d: np.ndarray
    legs: list
    bend_rd: object
    m_air: np.ndarray
    m_liq: np.ndarray
    P0: np.ndarray
    Ta: np.ndarray
    Tfuel: np.ndarray
    inner: object = None
    D_given: object = None
    NB: object = None

    def take(self, idx):
        """The points ``idx`` only."""
        return Points(fuel=self.fuel, d=self.d[idx], legs=take(self.legs, idx), bend_rd=take(self.bend_rd, idx),
                      m_air=self.m_air[idx], m_liq=self.m_liq[idx], P0=self.P0[idx], Ta=self.Ta[idx],
                      Tfuel=self.Tfuel[idx], inner=take(self.inner, idx), D_given=take(self.D_given, idx),
                      NB=take(self.NB, idx))


@dataclass(frozen=True)
class Settings:
    """Settings of one call, the same for every point."""

    n_steps: int
    n_table: tuple
    laminar: str
    flame_speed_method: str
    coking_limit: float
    ambient_pressure: float
    check_steps: bool


@dataclass
class Problem:
    """What :func:`solve` marches: the points, the settings, and an optional second flash pressure (N,)."""

    points: Points
    settings: Settings
    p_second: object = None


@dataclass
class Setup:
    """What the march needs, built once per call from a :class:`Problem`."""

    N: int
    L: np.ndarray
    far: np.ndarray
    has_fuel: np.ndarray
    volatile: float
    M_fuel: float
    stoich: float
    H_in: np.ndarray
    T_mix: np.ndarray
    mach_in: np.ndarray
    tables: Tables
    ctx: Context
    legs: list
    wall0: np.ndarray


def take(a, idx):
    """Entries ``idx`` of a per-point input (array, profile tuple, flame-side dict, legs); others unchanged."""
    if a is None or isinstance(a, str):
        return a
    if isinstance(a, list):
        return [{"length": leg["length"][idx], "kind": leg["kind"], "wall": take(leg["wall"], idx)} for leg in a]
    if isinstance(a, tuple):
        return (a[0], a[1][idx])
    if isinstance(a, dict):
        return {k: v[idx] for k, v in a.items()}
    if isinstance(a, np.ndarray) and a.ndim == 1:
        return a[idx]
    return a


def merge(res, part, into, source):
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


def wall_range(pts):
    """Coldest and hottest wall each point's march can meet [K] (flame side: bounded by its own heat path)."""
    N = pts.d.size
    L = sum(leg["length"] for leg in pts.legs)
    t_wall_min, t_wall_max = np.full(N, np.inf), np.full(N, -np.inf)
    for leg in pts.legs:
        if leg["kind"] == "uniform":
            lo = hi = leg["wall"]
        elif leg["kind"] == "profile":
            lo, hi = leg["wall"][1].min(axis=1), leg["wall"][1].max(axis=1)
        else:
            f = leg["wall"]
            lo = np.minimum(pts.Ta, f["gas_temperature"])
            hi = np.maximum(pts.Ta, np.minimum(f["gas_temperature"], flame_side_bound(
                f, pts.d, L, pts.m_air, np.maximum(pts.Ta, pts.Tfuel))))
        t_wall_min, t_wall_max = np.minimum(t_wall_min, lo), np.maximum(t_wall_max, hi)
    return L, t_wall_min, t_wall_max


def _check_mach(pts):
    """Inlet Mach number; a near-sonic inlet is refused (the march is a low-speed one)."""
    d, m_air, P0, Ta = pts.d, pts.m_air, pts.P0, pts.Ta
    rho_in = P0 / (thermo.R_AIR * Ta)
    mach_in = m_air / (rho_in * 0.25 * np.pi * d * d) / np.sqrt(np.asarray(thermo.gamma(Ta)) * thermo.R_AIR * Ta)
    if np.any(mach_in > MACH_LIMIT):
        i = int(np.argmax(mach_in))
        raise FuelsysInputError(
            f"air flow {m_air[i] * 1e3:g} g/s is too much for a {d[i] * 1e3:g} mm tube at {P0[i] / 1e5:g} bar abs: "
            f"inlet Mach number {mach_in[i]:.2f} (allowed < {MACH_LIMIT:g}); the tube would choke")
    return mach_in


def build(problem):
    """Flows, inlet state and property tables of one call (:class:`Setup`)."""
    pts, settings = problem.points, problem.settings
    fuel, N = pts.fuel, pts.d.size
    L, t_wall_min, t_wall_max = wall_range(pts)
    volatile = 1.0 - oil_share(fuel)
    far = pts.m_liq / pts.m_air
    has_fuel = far > 0
    M_fuel = float(fuel.molar_mass) if np.any(has_fuel) else thermo.M_AIR
    stoich = float(fuel.stoich_far) if np.any(has_fuel) else math.nan
    # inlet: adiabatic mixing of the air with the liquid fuel at its own temperature
    h_air_in = np.asarray(thermo.enthalpy(pts.Ta), dtype=float)
    h_fuel_in = liquid_enthalpy(fuel, pts.Tfuel) if np.any(has_fuel) else np.zeros(N)
    H_in = h_air_in + far * h_fuel_in
    t_mix_low = flash_cooling(fuel, H_in, np.minimum(pts.Ta, pts.Tfuel), pts.P0, far, has_fuel)
    t_lo = np.minimum(t_mix_low, t_wall_min) - 2.0
    t_hi = np.maximum(np.maximum(pts.Ta, pts.Tfuel), t_wall_max) + 2.0
    if np.any(has_fuel):
        t_lo = np.maximum(t_lo, float(fuel.t_min))
    mach_in = _check_mach(pts)
    with warnings.catch_warnings():
        # nodes the march may never reach (up to the wall temperature) must not raise the fuel model's
        # range warnings; the exit state is evaluated again later, with its warnings
        warnings.simplefilter("ignore", ValidityWarning)
        if np.any(has_fuel):
            t_dew_in, _ = dew_point(fuel, pts.P0, np.where(has_fuel, far, 1e-6))
        else:
            t_dew_in = t_lo + 1.0
        tables = Tables(fuel, t_lo, t_dew_in + TABLE_KNEE_K, t_hi, pts.P0, far, has_fuel, settings.n_table,
                        problem.p_second)
    ctx = Context(fuel, pts.m_air, far, tables, settings.laminar, pts.inner, M_fuel)
    T_mix = tables.temperature(H_in, pts.P0)
    legs, x0 = [], np.zeros(N)
    for spec in pts.legs:
        legs.append(Leg(length=spec["length"], bore=pts.d, kind=spec["kind"], wall=spec["wall"], x0=x0))
        x0 = x0 + spec["length"]
    first = legs[0]
    wall0 = 0.5 * (T_mix + first.wall["gas_temperature"]) if first.kind == "flame" else wall_at(first, np.zeros(N))
    return Setup(N=N, L=L, far=far, has_fuel=has_fuel, volatile=volatile, M_fuel=M_fuel, stoich=stoich, H_in=H_in,
                 T_mix=T_mix, mach_in=mach_in, tables=tables, ctx=ctx, legs=legs, wall0=wall0)


def march(setup, pts, n, record):
    """March every leg in ``n`` steps each (the bend between them); returns the exit state and the wall's heat."""
    state = State(H=setup.H_in, T=setup.T_mix, P=pts.P0.copy(), x=np.zeros(setup.N), wall=setup.wall0)
    heat_total = np.zeros(setup.N)
    for k, leg in enumerate(setup.legs):
        if k:
            state, _ = bend(setup.ctx, state, pts.d, pts.bend_rd)
            if leg.kind == "flame":
                state.wall = 0.5 * (state.T + leg.wall["gas_temperature"])
        state, q = march_leg(setup.ctx, state, leg, n, record)
        heat_total = heat_total + q
    return state, heat_total


def march_twice(setup, pts, settings):
    """The recorded march at ``n_steps``, and at half the steps for the step-doubling estimate (or None)."""
    record = {"x": [], "T": [], "P": [], "wall": [], "mid_wall": [], "mid_xv": [], "Re": [], "vol": []}
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        state, q_in = march(setup, pts, settings.n_steps, record)
        coarse = march(setup, pts, settings.n_steps // 2, None)[0] if settings.check_steps else None
    P0, P_exit = pts.P0, state.P
    if np.any(P_exit < 0.5 * P0):
        i = int(np.argmin(P_exit / P0))
        raise FuelsysInputError(
            f"the tube's own pressure drop would exceed half the case pressure ({(P0[i] - P_exit[i]) / 1e5:.3g} of "
            f"{P0[i] / 1e5:g} bar): too much air ({pts.m_air[i] * 1e3:g} g/s) for a {pts.d[i] * 1e3:g} mm tube "
            f"{setup.L[i] * 1e3:g} mm long; the flow would choke")
    return state, q_in, coarse, record


def band_exits(setup, pts, settings, state):
    """Exit states at both ends of the inner heat-transfer uncertainty (the nominal one for a given coefficient).

    The low end takes the correlations' coefficient times ``1 - HTC_UNCERTAINTY``; the high end times
    ``1 + HTC_UNCERTAINTY``, and without the property-ratio correction where the wall is more than
    ``1 / PROPERTY_RATIO_MIN`` times the gas temperature (outside that correction's fit).  Both ends are
    marched with half the steps: their step error (the step-doubling estimate, flagged above
    STEP_TOLERANCE_K) is small beside the band itself.
    """
    if pts.inner is not None:
        return state, state
    ends = []
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        for band in ("low", "high"):
            setup.ctx.band = band
            try:
                ends.append(march(setup, pts, settings.n_steps // 2, None)[0])
            finally:
                setup.ctx.band = None
    return ends[0], ends[1]


def exit_state(setup, pts, state, flags):
    """Exit vaporised fraction, fuel enthalpy, dew point and the liquid's bubble point, from the fuel model."""
    fuel, N, has_fuel, tables = pts.fuel, setup.N, setup.has_fuel, setup.tables
    T_exit, P_exit = state.T, state.P
    if not np.any(has_fuel):
        return np.ones(N), np.zeros(N), np.full(N, np.nan), np.full(N, np.nan)
    far_s = np.where(has_fuel, setup.far, 1e-6)
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
            flag(flags, has_fuel, f"exit state beyond the fuel model ({exc}); continued with the vapour's "
                                  "heat capacity")
        dew, low = dew_point(fuel, P_exit, far_s)
        flag(flags, has_fuel & low, "dew point below the fuel model's range (its lowest temperature used)")
        dew = np.where(has_fuel, dew, np.nan)
        t_bub = np.asarray(fuel.bubble_point(pts.P0), dtype=float) * np.ones(N)
    for w in caught:
        if issubclass(w.category, ValidityWarning):
            flag(flags, has_fuel, f"fuel model at the exit state: {str(w.message).split(';')[0]}")
        else:
            warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
    return xv_exit, h_f_exit, dew, t_bub


def step_check(setup, state, coarse, flags):
    """Step-doubling (Richardson) error estimates of the exit temperature [K] and vaporised share [-]."""
    if coarse is None:
        return np.full(setup.N, np.nan), np.full(setup.N, np.nan)
    tables = setup.tables
    err_T = np.abs(state.T - coarse.T) / 3.0
    xv_coarse = tables.props(coarse.T, coarse.P)[0][tables.XV]
    xv_fine = tables.props(state.T, state.P)[0][tables.XV]
    err_x = np.abs(xv_fine - xv_coarse) / 3.0 / setup.volatile
    flag(flags, err_T > STEP_TOLERANCE_K,
         f"march not converged: step-doubling estimate above {STEP_TOLERANCE_K:g} K (raise n_steps)")
    return err_T, err_x


def energy_check(setup, pts, state, h_f_exit, q_in, flags):
    """Enthalpy rise from the fuel model [W] and the energy balance's error against the wall's heat [-]."""
    H_exit = np.asarray(thermo.enthalpy(state.T), dtype=float) + setup.far * h_f_exit
    rise = pts.m_air * (H_exit - setup.H_in)
    # relative to the enthalpy rise, or to 1 K of the air's heating where the rise is smaller
    scale = np.maximum(np.maximum(np.abs(rise), np.abs(q_in)), pts.m_air * 1000.0)
    energy_error = (q_in - rise) / scale
    flag(flags, np.abs(energy_error) > ENERGY_TOLERANCE,
         f"energy balance off by more than {ENERGY_TOLERANCE * 100:g} % (raise n_steps)")
    return rise, energy_error


def nodes(setup, pts, record, xv_exit):
    """Node values of the recorded march: positions, states, properties, velocity and time."""
    tables = setup.tables
    x_nodes = np.asarray(record["x"])
    T_nodes = np.asarray(record["T"])
    P_nodes = np.asarray(record["P"])
    pr_nodes = np.stack([tables.props(Ti, Pi)[0] for Ti, Pi in zip(T_nodes, P_nodes)], axis=1)  # (K, nodes, N)
    xv_nodes = pr_nodes[tables.XV]
    xv_nodes[-1] = xv_exit
    u_nodes = pts.m_air * np.asarray(record["vol"]) / (0.25 * np.pi * pts.d * pts.d)
    dt = 0.5 * (1.0 / u_nodes[1:] + 1.0 / u_nodes[:-1]) * np.diff(x_nodes, axis=0)
    time_nodes = np.concatenate([np.zeros((1, setup.N)), np.cumsum(dt, axis=0)])
    return dict(x=x_nodes, T=T_nodes, P=P_nodes, pr=pr_nodes, xv=xv_nodes, wall=np.asarray(record["wall"]),
                mid_wall=np.asarray(record["mid_wall"]), mid_xv=np.asarray(record["mid_xv"]),
                Re=np.asarray(record["Re"]), u=u_nodes, dt=dt, time=time_nodes)


def solve(problem):
    """The march and its margins on flat arrays of N points; returns a dict of flat results.

    ``problem.p_second`` (N,) adds flash tables at a second pressure,
    interpolated in pressure along the tube (used where the tube's pressure
    drop moves the equilibrium enough to show in the energy balance).
    """
    pts, settings = problem.points, problem.settings
    setup = build(problem)
    state, q_in, coarse, record = march_twice(setup, pts, settings)
    flags = flags_for(setup.N)
    xv_exit, h_f_exit, dew, t_bub = exit_state(setup, pts, state, flags)
    has_fuel = setup.has_fuel
    xv_exit = np.where(has_fuel, xv_exit, 1.0)
    vap_share = np.where(has_fuel, np.clip(xv_exit / setup.volatile, 0.0, 1.0), 1.0)
    rise, energy_error = energy_check(setup, pts, state, h_f_exit, q_in, flags)
    err_T, err_x = step_check(setup, state, coarse, flags)
    nd = nodes(setup, pts, record, xv_exit)
    wet = _margins.wetted_wall(setup, pts, nd, settings.coking_limit)
    drops = _droplets.droplet_history(setup, pts, nd, t_bub)
    flame = _margins.flame_margins(setup, pts, nd, settings.flame_speed_method)
    _margins.validity_flags(setup, pts, nd, state.T, flame, settings.flame_speed_method, flags)
    dew_margin = state.T - dew
    low, high = band_exits(setup, pts, settings, state)
    ex = {"vap": vap_share, "dew_margin": dew_margin, "T": state.T}
    levels = [_margins.level_of(vap_share, dew_margin)]
    for name, end in (("low", low), ("high", high)):
        xv_end = setup.tables.props(end.T, end.P)[0][setup.tables.XV]
        ex["dew_" + name] = np.where(has_fuel, end.T - dew, np.nan)
        levels.append(_margins.level_of(np.clip(xv_end / setup.volatile, 0.0, 1.0), end.T - dew))
    ex["flips"] = has_fuel & (np.min(levels, axis=0) != np.max(levels, axis=0))
    verdict, cautions = _margins.verdicts(setup, pts, settings, ex, nd, wet, drops, flame)
    N = setup.N
    profile = {
        "position": nd["x"], "gas_temperature": nd["T"], "wall_temperature": nd["wall"],
        "vapour_fraction": np.where(has_fuel[None, :], nd["xv"] / setup.volatile, 1.0), "velocity": nd["u"],
        "pressure": nd["P"], "droplet_diameter": np.sqrt(drops["D2"]), "time": nd["time"],
    }
    return dict(
        vapour_fraction=vap_share, exit_temperature=state.T, dew_point=dew, dew_margin=dew_margin,
        residence_time=nd["time"][-1], droplet_diameter=drops["D0"], droplet_lifetime=drops["life"],
        droplets_survive=drops["survive"], exit_droplet_diameter=np.sqrt(drops["D2"][-1]),
        tube_phi=flame["tube_phi"], exit_vapour_phi=flame["vap_phi"][-1], flammable=flame["flammable"],
        lower_limit_phi=flame["lfl_phi"] * np.ones(N), upper_limit_phi=flame["ufl_phi"] * np.ones(N),
        exit_velocity=nd["u"][-1], flame_speed=flame["sl"][-1], turbulent_flame_speed=flame["st"][-1],
        flashback_margin=flame["margin"], max_wet_wall=wet["max_wet"], max_wall=wet["max_wall"],
        coking_risk=wet["coking"], oil_residue=wet["oil"], pressure_drop=pts.P0 - state.P, heat_in=q_in,
        enthalpy_rise=rise, energy_error=energy_error, step_error_temperature=err_T, step_error_vapour=err_x,
        reynolds_in=nd["Re"][0], reynolds_exit=nd["Re"][-1], dew_margin_low=ex["dew_low"],
        dew_margin_high=ex["dew_high"], max_liquid_fuel_temperature=wet["bulk"], flame_speed_estimate=flame["estimate"],
        verdict=verdict, cautions=cautions,
        validity=["; ".join(f) for f in flags], profile=profile)


def remarch(problem, res):
    """March again, with flash tables at the inlet and the exit pressure, where the balance shows the drop.

    Points whose energy balance is off by more than half of
    :data:`ENERGY_TOLERANCE` while the tube loses more than 0.1 % of the
    case pressure are marched again; the new result replaces the old where
    its balance is better.  ``res`` is updated in place.
    """
    pts = problem.points
    redo = np.flatnonzero((np.abs(res["energy_error"]) > 0.5 * ENERGY_TOLERANCE)
                          & (res["pressure_drop"] > 1e-3 * pts.P0) & (pts.m_liq > 0))
    if not redo.size:
        return res
    sub = pts.take(redo)
    p_exit = sub.P0 - res["pressure_drop"][redo]
    again = solve(replace(problem, points=sub, p_second=np.minimum(p_exit, sub.P0 * (1.0 - 1e-3))))
    better = np.abs(again["energy_error"]) < np.abs(res["energy_error"][redo])
    merge(res, again, redo[better], np.flatnonzero(better))
    return res
