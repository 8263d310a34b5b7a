"""Per-point property tables of the march, the inlet mixing and the fuel model's dew point.

The march inverts the mixture's enthalpy to a temperature on tables of the
fuel model built once per call (:class:`Tables`); the inlet state is the
adiabatic mixture of air and liquid fuel (:func:`flash_cooling`,
:func:`liquid_enthalpy`).
"""

from __future__ import annotations

import warnings

import numpy as np

from fuelsys import heat, thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.vaporiser._common import oil_share
from fuelsys.vaporiser.constants import TABLE_UPPER_MAX, T_VAPOUR_CP_MAX, TABLE_FLASH_SPAN_K, TABLE_UPPER_STEP_K


class Tables:
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

    def __init__(self, fuel, t_lo, t_knee, t_hi, P, far, has_fuel, n_table, P_second=None):
        n_dense, n_upper_min = n_table
        N = t_lo.size
        self.N = N
        t_knee = np.clip(t_knee, t_lo + 1.0, t_hi - 1.0)
        # each point's upper nodes depend on that point alone (same answer in a batch or alone): spacing
        # the smaller of the point's own range / n_upper_min and the step; the count is the batch's largest
        # and a point's surplus nodes run on past its hottest wall
        own = (t_hi - t_knee) / n_upper_min
        step = np.minimum(own, TABLE_UPPER_STEP_K)
        # never more than TABLE_UPPER_MAX nodes above the knee: a wider spacing instead (bounded memory)
        step = np.maximum(step, (t_hi - t_knee) / TABLE_UPPER_MAX)
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
        share = 1.0 - oil_share(fuel)
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



def flash_cooling(fuel, H_in, t_in_min, P, far, has_fuel, iterations=16):
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


def dew_point(fuel, P, far):
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


def liquid_enthalpy(fuel, T):
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

