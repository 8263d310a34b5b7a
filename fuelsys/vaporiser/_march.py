"""The axial march of one or two heated legs: state, legs, heat transfer, the wall, the bend.

See the package docstring for the scheme (exponential enthalpy update with a
predictor and a midpoint corrector, homogeneous two-phase pressure drop).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fuelsys import heat, thermo
from fuelsys.flow.fittings import crane_return_bend_k
from fuelsys.arrays import checked_array
from fuelsys.vaporiser._common import as_points
from fuelsys.vaporiser.constants import HTC_UNCERTAINTY, PROPERTY_RATIO_MIN
from fuelsys.vaporiser.walls import FlameSide, WallProfile


@dataclass
class State:
    """Mixture state carried along the tube (one entry per point)."""

    H: np.ndarray   # enthalpy per kg air [J/kg]
    T: np.ndarray   # temperature [K]
    P: np.ndarray   # pressure [Pa]
    x: np.ndarray   # distance from the heated inlet [m]
    wall: np.ndarray  # last inner-wall temperature (guess for the next step) [K]


@dataclass
class Leg:
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


class Context:
    """Everything fixed for one call: flows, geometry, fuel, tables."""

    def __init__(self, fuel, m_air, far, tables, laminar, inner_htc, M_fuel):
        self.fuel = fuel
        self.m_air = m_air
        self.far = far   # all the liquid (oil included) per kg air: the fuel object carries its oil
        self.tab = tables
        self.laminar = laminar
        self.inner_htc = inner_htc
        self.M_fuel = M_fuel
        #: None for the nominal inner heat transfer, "low" or "high" for an end of its uncertainty band
        self.band = None


def gas_props(ctx, pr):
    """Gas-phase properties from the (K, N) table values."""
    t = ctx.tab
    yv = ctx.far * pr[t.XV]
    cpg = (pr[t.CPA] + yv * pr[t.CPV]) / (1.0 + yv)
    mu, k = pr[t.MU], pr[t.K]
    return yv, cpg, mu, k


def specific_volume(ctx, T, P, pr):
    """Mixture volume per kg of air [m³/kg air]: ideal gas + liquid."""
    t = ctx.tab
    xv = pr[t.XV]
    yv = ctx.far * xv
    gas = (1.0 / thermo.M_AIR + yv / ctx.M_fuel) * thermo.R_MOLAR * T / P
    liquid = ctx.far * (1.0 - xv) / pr[t.RHOL]
    return gas + liquid


def wall_at(leg, x_rel):
    """Given inner-wall temperature at distance x_rel (N,) along the leg."""
    if leg.kind == "uniform":
        return leg.wall
    pos, temps = leg.wall
    idx = np.clip(np.searchsorted(pos, x_rel, side="right") - 1, 0, pos.size - 2)
    w = np.clip((x_rel - pos[idx]) / (pos[idx + 1] - pos[idx]), 0.0, 1.0)
    rows = np.arange(temps.shape[0])
    return temps[rows, idx] * (1.0 - w) + temps[rows, idx + 1] * w


def flame_wall(Tb, h_in, leg, t_guess):
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


def transfer(ctx, leg, T, pr, x1, x2, wall_guess):
    """Heat transfer of a segment at mixture temperature T.

    Returns UA per length [W/(m K)], T_eq [K], inner wall T [K], heat per length [W/m], Re, h [W/(m² K)].
    """
    d = leg.bore
    yv, cpg, mu, k = gas_props(ctx, pr)
    m_gas = ctx.m_air * (1.0 + yv)
    Re = 4.0 * m_gas / (np.pi * d * mu)
    Pr = cpg * mu / k
    xm = 0.5 * (x1 + x2)
    if leg.kind == "flame":
        tw = wall_guess
    else:
        tw = wall_at(leg, xm)
    if ctx.inner_htc is None:
        pf = np.where(T < tw, (T / tw) ** 0.45, 1.0)
        if ctx.band == "high":  # beyond the correction's fitted ratios the upper end does without it
            pf = np.where(T < PROPERTY_RATIO_MIN * tw, 1.0, pf)
        nu = heat._segment_raw(Re, Pr, leg.x0 + x1, leg.x0 + x2, d, ctx.laminar, pf)
        h = nu * k / d
        if ctx.band is not None:
            h = h * (1.0 + HTC_UNCERTAINTY if ctx.band == "high" else 1.0 - HTC_UNCERTAINTY)
    else:
        h = ctx.inner_htc
    if leg.kind == "flame":
        UA, Teq, twi, q = flame_wall(T, h, leg, wall_guess)
        return UA, Teq, twi, q, Re, h
    UA = h * np.pi * d
    return UA, tw, tw, UA * (tw - T), Re, h


def flame_side_bound(f, d, L, m_air, t_in):
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


def exp_step(c, drive, ntu):
    """Enthalpy change c * drive * (1 - exp(-ntu)) per kg air, safe for tiny ntu."""
    return c * drive * -np.expm1(-ntu)


def march_leg(ctx, state, leg, n, record):
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
    v = specific_volume(ctx, T, P, pr) / mass_per_air
    if record is not None and not record["x"]:
        _, _, twi0, _, Re0, _ = transfer(ctx, leg, T, pr, np.zeros_like(dx), dx, wall)
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
        UA, Teq, twi, _, Re, h = transfer(ctx, leg, T, pr, x1, x2, wall)
        c0 = np.maximum(slope, 1e-6)
        Hs = H + exp_step(c0, Teq - T, UA * dx / (ctx.m_air * c0))
        Ts = t.temperature(Hs, P)
        # corrector at the step's midpoint with the chord heat capacity
        dT = Ts - T
        c = np.where(np.abs(dT) > 1e-9, (Hs - H) / np.where(np.abs(dT) > 1e-9, dT, 1.0), c0)
        c = np.maximum(c, 1e-6)
        Tm = 0.5 * (T + Ts)
        prm, _ = t.props(Tm, P)
        UA, Teq, twi, _, Re, h = transfer(ctx, leg, Tm, prm, x1, x2, twi)
        dH = exp_step(c, Teq - T, UA * dx / (ctx.m_air * c))
        heat_in = heat_in + ctx.m_air * dH  # the wall's heat over the step, by the same exponential profile
        H = H + dH
        T = t.temperature(H, P)
        wall = twi
        pr, slope = t.props(T, P)
        # pressure: homogeneous friction at the midpoint plus acceleration
        fd = heat.darcy_friction_smooth(Re)
        vm = specific_volume(ctx, Tm, P, prm) / mass_per_air
        v_new = specific_volume(ctx, T, P, pr) / mass_per_air
        # floor: a choking flow is refused after the march (pressure below half the inlet's)
        P = np.maximum(P - fd * dx / leg.bore * 0.5 * G * G * vm - G * G * (v_new - v), 0.25 * state.P)
        v = v_new
        if record is not None:
            if leg.kind == "flame":
                node_wall = flame_wall(T, h, leg, twi)[2]
            else:
                node_wall = wall_at(leg, x2)
            record["x"].append(x0 + x2)
            record["T"].append(T)
            record["P"].append(P)
            record["wall"].append(node_wall)
            record["mid_wall"].append(twi)
            record["mid_xv"].append(prm[t.XV])
            record["Re"].append(Re)
            record["vol"].append(v_new * mass_per_air)
    new = State(H=H, T=T, P=P, x=x0 + leg.length, wall=wall)
    return new, heat_in


def bend(ctx, state, bore, r_over_d):
    """Pressure after a 180° return bend between two legs (no heat exchanged in the bend).

    Loss ``K rho u²/2`` on the homogeneous mixture, K by Crane's rule for a
    bend of n = 2 quarter turns (:func:`crane_return_bend_k`) with the
    mixture's smooth-tube friction factor standing for Crane's f_T.
    """
    t = ctx.tab
    mass_per_air = 1.0 + ctx.far
    G = ctx.m_air * mass_per_air / (0.25 * np.pi * bore ** 2)
    pr, _ = t.props(state.T, state.P)
    v = specific_volume(ctx, state.T, state.P, pr) / mass_per_air
    yv, _, mu, _ = gas_props(ctx, pr)
    Re = 4.0 * ctx.m_air * (1.0 + yv) / (np.pi * bore * mu)
    K = crane_return_bend_k(r_over_d, heat.darcy_friction_smooth(Re), check=False)
    P = np.maximum(state.P - K * 0.5 * G * G * v, 0.25 * state.P)
    return State(H=state.H, T=state.T, P=P, x=state.x, wall=state.wall), K



def wall_shape(wall):
    """Operating-point shape of a wall description."""
    if isinstance(wall, WallProfile):
        return np.shape(wall.temperature)[:-1]
    if isinstance(wall, FlameSide):
        return np.broadcast(*[np.asarray(getattr(wall, f), dtype=float) for f in FLAME_FIELDS]).shape
    checked_array(wall, "wall temperature", "K", positive=True)
    return np.shape(wall)


FLAME_FIELDS = ("gas_temperature", "h_out", "emissivity_gas", "emissivity_wall", "thickness", "conductivity")


def wall_points(wall, shape, N):
    """(kind, per-point data) of a wall description broadcast to the operating points."""
    if isinstance(wall, WallProfile):
        temps = np.broadcast_to(np.asarray(wall.temperature, dtype=float), shape + (np.size(wall.position),))
        return "profile", (np.asarray(wall.position, dtype=float), temps.reshape(N, -1).copy())
    if isinstance(wall, FlameSide):
        return "flame", dict(zip(FLAME_FIELDS, as_points(shape, *[getattr(wall, f) for f in FLAME_FIELDS])))
    return "uniform", as_points(shape, wall)[0]

