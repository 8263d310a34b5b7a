"""Droplet evaporation along the march: the d²-law with the Spalding transfer number.

References
----------
.. [1] S. R. Turns, "An Introduction to Combustion", 3rd ed., McGraw-Hill
   2012, ch. 3 (droplet evaporation).
"""

from __future__ import annotations

import warnings

import numpy as np

from fuelsys import heat, thermo
from fuelsys.errors import ValidityWarning
from fuelsys.vaporiser.constants import T_VAPOUR_CP_MAX


class DropletGrid:
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


def droplet_constant(fuel, T_gas, P, y_gas, grid):
    """d²-law evaporation constant K [m²/s] at local conditions (wet-bulb surface temperature).

    Solves B_T(T_s) = B_M(T_s) for the surface temperature by bisection on
    the tabulated liquid properties (:class:`DropletGrid`), then
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



def droplet_history(setup, pts, nd, t_bub):
    """Droplet diameter along the march and its lifetime, by the d²-law at the nodes' local conditions.

    The initial diameter is the given one, or the largest drop the inlet air
    leaves unbroken (critical Weber number, Hinze 1955), capped by the tube
    bore and, with a needle bore, by Rayleigh break-up of the needle's jet.
    Returns a dict: ``D0`` [m], ``D2`` (nodes, N) squared diameters [m²],
    ``life`` [s] (continued at exit conditions beyond the exit, inf where the
    drop cannot evaporate there), ``survive`` [-].
    """
    fuel, has_fuel, N = pts.fuel, setup.has_fuel, setup.N
    T_nodes, P_nodes, u_nodes, dt, time_nodes = nd["T"], nd["P"], nd["u"], nd["dt"], nd["time"]
    yv_nodes = setup.far[None, :] * nd["xv"]
    y_gas = yv_nodes / (1.0 + yv_nodes)
    rho_gas_in = pts.P0 * thermo.M_AIR / (thermo.R_MOLAR * setup.T_mix)
    if np.any(has_fuel):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            grid = DropletGrid(fuel, t_bub)
        K_nodes, _ = droplet_constant(fuel, T_nodes, P_nodes, y_gas, grid)
        sigma = np.asarray(fuel.surface_tension(np.clip(pts.Tfuel, fuel.t_min, fuel.t_max)), dtype=float)
        d_we = heat.WEBER_CRITICAL * sigma / (rho_gas_in * np.maximum(u_nodes[0], 1e-9) ** 2)
    else:
        K_nodes = np.zeros_like(T_nodes)
        d_we = pts.d.copy()
    if pts.D_given is not None:
        D0 = pts.D_given
    else:
        D0 = np.minimum(d_we, pts.d)
        if pts.NB is not None:
            D0 = np.minimum(D0, heat.RAYLEIGH_DROP_RATIO * pts.NB)
    D2 = np.empty_like(T_nodes)
    D2[0] = D0 * D0
    life = np.full(N, np.inf)
    for k in range(T_nodes.shape[0] - 1):
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
    life = np.where(survive, time_nodes[-1] + extra, life)
    life = np.where(has_fuel, life, 0.0)
    return {"D0": D0, "D2": D2, "life": life, "survive": survive}
