"""Flow split between the needles of a ring manifold fed at one point.

The network
-----------
``N`` needles sit at equal spacing ``s = pi D_ring / N`` round a ring of tube
(bore ``d_ring``, centre-line diameter ``D_ring``).  The feed enters the ring
between the last needle and the first, ``feed_position`` of a spacing before
needle 0 (0.5, the default, puts it midway, so the ring is symmetric).  Ring
segment ``k`` runs clockwise from node ``k-1`` to node ``k`` (node -1 and node
N are the feed point): segment 0 is ``feed_position * s`` long, segments
1..N-1 are ``s`` long and segment N is ``(1 - feed_position) * s`` long.

Unknowns: the flow ``m_0`` leaving the feed clockwise and the needle flows
``q_j``.  Mass balance at every node gives the segment flows,
``m_k = m_0 - sum_{i<k} q_i`` (segment N carries ``m_0 - sum q``, negative:
it flows back to the feed from the other side).  The equations are

* needle ``j``:  ``dp_needle(q_j) = p_supply - sum_{k<=j} dp_seg(m_k) - p_case``,
* ring closure:  ``sum_{k=0..N} dp_seg(m_k) = 0`` (the pressure round the ring
  returns to the feed pressure),

``N + 1`` equations in ``N + 1`` unknowns, solved by Newton's method with the
analytic Jacobian and a backtracking line search, vectorised over a batch of
manifolds (a Python loop runs over the iterations, never over needles or
samples).  Mass is conserved by construction: the feed flow equals the sum
of the needle flows exactly.

Segment losses use the fully developed all-regime friction of
:mod:`fuelsys.flow.lines` (Churchill 1977); tee losses at the needle
junctions and the dynamic head of the ring flow at each needle inlet are
neglected -- ring velocities are small next to the needle jet (common
practice, no source).  Needle losses are those of :mod:`fuelsys.flow.needle`,
each needle with its own bore, length, entrance and ``cd``.

References
----------
.. [1] Network equations of pipe systems (loop and node balances): e.g.
   R. W. Jeppson, "Analysis of Flow in Pipe Networks", Ann Arbor Science
   (1976), ch. 4 and 6.
.. [2] S. W. Churchill, Chem. Eng. 84 (1977) 91-92 (ring friction).
.. [3] R. K. Shah (1978); Crane TP-410 (2009) -- the needle model.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass

import numpy as np

from fuelsys.arrays import checked_array
from fuelsys.errors import FuelsysError, FuelsysInputError, ValidityWarning
from fuelsys.flow import fittings
from fuelsys.flow import friction as fr
from fuelsys.flow.lines import _line_dp_and_slope
from fuelsys.flow.needle import (P_MAX, _check_pmax, _flag_validity,
                                 _needle_dp_and_slope, liquid_properties, needle_flow)

_PI = math.pi


@dataclass
class ManifoldResult:
    """Solution of a ring manifold (arrays carry the batch shape in front).

    Attributes
    ----------
    flows : ndarray
        Mass flow of each needle, shape (..., N) [kg/s]
    node_pressure : ndarray
        Static pressure in the ring at each needle, shape (..., N) [Pa]
        (same datum as ``p_supply``)
    ring_flows : ndarray
        Flow in each ring segment, clockwise positive, shape (..., N + 1) [kg/s]
    supply_flow : float or ndarray
        Flow entering at the feed, shape (...) [kg/s]
    iterations : int
        Newton iterations used [-]
    """

    flows: np.ndarray
    node_pressure: np.ndarray
    ring_flows: np.ndarray
    supply_flow: object
    iterations: int


def _residual(x, P0, D, L, rho_n, mu_n, k_ent, cd, eD, Dr, seg_len, rho, mu, eDr, turb, jacobian):
    """Residuals R (B, N+1) [Pa] and, when asked, the Jacobian (B, N+1, N+1) [Pa s/kg]."""
    B, n1 = x.shape
    N = n1 - 1
    m0, q = x[:, 0], x[:, 1:]
    m_seg = m0[:, None] - np.concatenate([np.zeros((B, 1)), np.cumsum(q, axis=1)], axis=1)
    dps, e, _ = _line_dp_and_slope(m_seg, Dr, seg_len, rho, mu, 0.0, eDr, turb)
    Pc = np.cumsum(dps, axis=1)
    dpn, d, Re, K, f = _needle_dp_and_slope(q, D, L, rho_n, mu_n, k_ent, cd, eD, turb)
    R = np.empty((B, n1))
    R[:, :N] = dpn - (P0[:, None] - Pc[:, :N])
    R[:, N] = Pc[:, N]
    if not jacobian:
        return R, None
    C = np.cumsum(e, axis=1)
    J = np.empty((B, n1, n1))
    J[:, :, 0] = C
    lower = np.tril(np.ones((N, N)), -1)
    J[:, :N, 1:] = -(C[:, :N, None] - C[:, None, :N]) * lower
    idx = np.arange(N)
    J[:, idx, idx + 1] += d
    J[:, N, 1:] = -(C[:, N, None] - C[:, :N])
    return R, J


def ring_manifold(bores, lengths, p_supply, p_case, ring_bore, ring_diameter, rho, mu,
                  feed_position=0.5, entrance=fittings.DEFAULT_ENTRANCE, cd=1.0,
                  roughness=fr.DRAWN_TUBING_ROUGHNESS, ring_roughness=fr.DRAWN_TUBING_ROUGHNESS,
                  turbulent=fr.DEFAULT_TURBULENT, p_max=P_MAX):
    """Per-needle flows of a ring manifold fed at one point (network solve).

    Parameters
    ----------
    bores : array_like
        Needle bores, last axis = the needles round the ring (at least 1);
        leading axes are a batch of manifolds (e.g. tolerance samples) [m]
    lengths : array_like
        Needle lengths, broadcast against ``bores`` [m]
    p_supply : array_like
        Pressure at the feed point of the ring, per manifold [Pa]
    p_case : array_like
        Pressure the needles discharge into (same datum), per manifold [Pa]
    ring_bore : array_like
        Inside diameter of the ring tube, per manifold [m]
    ring_diameter : array_like
        Diameter of the ring's centre line, per manifold [m]
    rho : array_like
        Liquid density, per manifold [kg/m³]
    mu : array_like
        Liquid dynamic viscosity, per manifold [Pa·s]
    feed_position : float
        Where the feed joins, as a fraction of the needle spacing before
        needle 0, 0 < feed_position < 1 [-]
    entrance : str or array_like
        Needle inlet geometry or loss coefficient, per needle [-]
    cd : array_like
        Needle discharge-coefficient multipliers, per needle [-]
    roughness : array_like
        Needle wall roughness [m]
    ring_roughness : array_like
        Ring wall roughness [m]
    turbulent : str
        Turbulent friction branch [-]
    p_max : float
        Largest supply-to-case difference accepted [Pa]

    Returns
    -------
    ManifoldResult
        Needle flows [kg/s], node pressures [Pa], ring segment flows [kg/s],
        the supply flow [kg/s] and the iteration count.

    Raises
    ------
    FuelsysInputError
        Supply not above case pressure, or above ``p_max``; non-positive
        sizes; ``feed_position`` outside (0, 1).

    References
    ----------
    Jeppson (1976) for the network equations; Churchill (1977) for the
    ring; the needle model of :mod:`fuelsys.flow.needle`.

    Examples
    --------
    >>> r = ring_manifold([0.3e-3] * 6, 25e-3, 3e5, 1e5, 3e-3, 60e-3, 800.0, 1.6e-3)
    >>> bool(np.allclose(r.flows, r.flows[0], rtol=1e-3))   # a generous ring: equal flows
    True
    >>> round(float(r.supply_flow / r.flows.sum()), 12)
    1.0
    """
    D = checked_array(bores, "bore", "mm", positive=True, scale=1e3)
    if D.ndim == 0:
        D = D[None]
    N = D.shape[-1]
    L = checked_array(lengths, "length", "mm", positive=True, scale=1e3)
    Dr = checked_array(ring_bore, "ring bore", "mm", positive=True, scale=1e3)
    Dring = checked_array(ring_diameter, "ring diameter", "mm", positive=True, scale=1e3)
    rho = checked_array(rho, "density", "kg/m³", positive=True)
    mu = checked_array(mu, "viscosity", "Pa·s", positive=True)
    cd = checked_array(cd, "cd (discharge-coefficient multiplier)", "", positive=True)
    e = checked_array(roughness, "roughness", "um", nonneg=True, scale=1e6)
    er = checked_array(ring_roughness, "roughness", "um", nonneg=True, scale=1e6)
    k_ent = np.asarray(fittings.entrance_k(entrance), dtype=float)
    turb = fr._turbulent_method(turbulent)
    p_max = _check_pmax(p_max)
    fp = float(feed_position)
    if not 0.0 < fp < 1.0:
        raise FuelsysInputError(f"feed_position must be between 0 and 1, exclusive (got {fp:g})")
    ps = np.asarray(p_supply, dtype=float)
    pc = np.asarray(p_case, dtype=float)
    if np.any(~np.isfinite(ps)) or np.any(~np.isfinite(pc)):
        raise FuelsysInputError("supply and case pressures must be finite numbers [Pa]")
    P0 = ps - pc
    if np.any(P0 <= 0):
        raise FuelsysInputError(
            f"supply pressure must be above case pressure (got a difference of {P0[P0 <= 0].flat[0] / 1e5:g} bar)")
    if np.any(P0 > p_max * (1 + 1e-9)):
        raise FuelsysInputError(
            f"supply minus case pressure {P0[P0 > p_max].flat[0] / 1e5:g} bar is above the model's limit of "
            f"{p_max / 1e5:g} bar")
    if np.any(Dr >= Dring):
        raise FuelsysInputError("ring bore must be smaller than the ring diameter")

    # shapes: needle-level arrays (..., N), manifold-level arrays (...)
    needle_shape = np.broadcast_shapes(D.shape, L.shape, np.shape(cd), np.shape(e), np.shape(k_ent))
    batch = np.broadcast_shapes(needle_shape[:-1], P0.shape, Dr.shape, Dring.shape, rho.shape, mu.shape,
                                er.shape)
    full = batch + (N,)
    if needle_shape[-1] != N:
        raise FuelsysInputError(f"per-needle inputs must have {N} values along their last axis")
    B = int(np.prod(batch)) if batch else 1

    def per_manifold(a):
        return np.broadcast_to(a, batch).reshape(B)

    def per_needle(a):
        return np.broadcast_to(a, full).reshape(B, N)

    Dn, Ln, cdn, en, kn = (per_needle(a) for a in (D, L, cd, e, k_ent))
    P0b, Drb, Dringb, rhob, mub, erb = (per_manifold(a) for a in (P0, Dr, Dring, rho, mu, er))
    rho_n, mu_n = rhob[:, None], mub[:, None]
    s = _PI * Dringb / N
    frac = np.concatenate([[fp], np.ones(N - 1), [1.0 - fp]])
    seg_len = s[:, None] * frac[None, :]
    args = (P0b, Dn, Ln, rho_n, mu_n, kn, cdn, en / Dn, Drb[:, None], seg_len, rhob[:, None], mub[:, None],
            (erb / Drb)[:, None], turb)

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        q0 = needle_flow(np.broadcast_to(P0b[:, None], (B, N)), Dn, Ln, rho_n, mu_n, entrance=kn, cd=cdn,
                         roughness=en, turbulent=turbulent, p_max=math.inf)
    q0 = np.reshape(q0, (B, N))
    x = np.concatenate([0.5 * q0.sum(axis=1, keepdims=True), q0], axis=1)
    scale_p = P0b[:, None]
    R, J = _residual(x, *args, jacobian=True)
    norm = np.max(np.abs(R) / scale_p, axis=1)
    it = 0
    for it in range(1, 101):
        dx = np.linalg.solve(J, -R[..., None])[..., 0]
        alpha = np.ones(B)
        accepted = np.zeros(B, dtype=bool)
        x_new, R_new, norm_new = x.copy(), R.copy(), norm.copy()
        for _ in range(40):
            trial = x + alpha[:, None] * dx
            Rt, _ = _residual(trial, *args, jacobian=False)
            nt = np.max(np.abs(Rt) / scale_p, axis=1)
            ok = ~accepted & (nt < norm * (1 - 1e-4 * alpha) + 1e-15)
            x_new[ok], R_new[ok], norm_new[ok] = trial[ok], Rt[ok], nt[ok]
            accepted |= ok
            if accepted.all():
                break
            alpha = np.where(accepted, alpha, 0.5 * alpha)
        step = np.max(np.abs(dx) / np.maximum(np.abs(x), 1e-300), axis=1)
        x, R, norm = x_new, R_new, norm_new
        if np.all((norm <= 1e-12) | ((step <= 1e-13) & (norm <= 1e-9))):
            break
        R, J = _residual(x, *args, jacobian=True)
    else:
        raise FuelsysError("ring manifold solve did not converge in 100 Newton iterations")

    m0, q = x[:, 0], x[:, 1:]
    m_seg = m0[:, None] - np.concatenate([np.zeros((B, 1)), np.cumsum(q, axis=1)], axis=1)
    dps = _line_dp_and_slope(m_seg, Drb[:, None], seg_len, rhob[:, None], mub[:, None], 0.0,
                             (erb / Drb)[:, None], turb)[0]
    node_p = per_manifold(ps)[:, None] - np.cumsum(dps, axis=1)[:, :N]
    if np.any(q <= 0):
        raise FuelsysInputError("a needle would get no flow: the ring loses the whole supply pressure; "
                                "enlarge the ring bore or raise the supply pressure")
    _, _, Re, K, f = _needle_dp_and_slope(q, Dn, Ln, rho_n, mu_n, kn, cdn, en / Dn, turb)
    _flag_validity(Re, Ln / Dn, K, f, kn, en / Dn)
    supply = m0 - m_seg[:, N]
    return ManifoldResult(
        flows=q.reshape(full),
        node_pressure=node_p.reshape(full),
        ring_flows=m_seg.reshape(batch + (N + 1,)),
        supply_flow=float(supply[0]) if batch == () else supply.reshape(batch),
        iterations=it,
    )


def ring_manifold_fuel(bores, lengths, p_supply, p_case, ring_bore, ring_diameter, fuel, T, **options):
    """:func:`ring_manifold` with the liquid properties of ``fuel`` at temperature ``T``.

    Parameters
    ----------
    bores : array_like
        Needle bores, last axis = needles [m]
    lengths : array_like
        Needle lengths [m]
    p_supply : array_like
        Feed pressure [Pa]
    p_case : array_like
        Discharge pressure (same datum) [Pa]
    ring_bore : array_like
        Ring tube bore [m]
    ring_diameter : array_like
        Ring centre-line diameter [m]
    fuel : fuelsys.fuels.base.Fuel
        The fuel [-]
    T : array_like
        Fuel temperature, per manifold [K]
    **options
        As for :func:`ring_manifold` [-]

    Returns
    -------
    ManifoldResult
        See :func:`ring_manifold` [kg/s, Pa]

    References
    ----------
    See :func:`ring_manifold`.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> r = ring_manifold_fuel([0.3e-3] * 4, 25e-3, 3e5, 1e5, 3e-3, 60e-3, get_fuel("kerosene"), 288.15)
    >>> r.flows.shape
    (4,)
    """
    rho, mu = liquid_properties(fuel, T)
    return ring_manifold(bores, lengths, p_supply, p_case, ring_bore, ring_diameter, rho, mu, **options)
