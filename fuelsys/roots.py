"""Vectorised, bracketed root finders, the one root-finding module of fuelsys (ground floor).

Both solvers work on 1-D arrays of independent problems at once (no Python
loop over the points) and keep a bracket ``lo < root < hi`` for every point,
so they always converge.

* :func:`newton_bracketed` -- Newton steps with the function's own derivative;
  a step that leaves the bracket is replaced by bisection.
* :func:`chandrupatla` -- derivative-free inverse-quadratic interpolation with
  bisection safeguard (Chandrupatla 1997), for problems without a cheap
  derivative.

References
----------
.. [1] T. R. Chandrupatla, "A new hybrid quadratic/bisection algorithm for
   finding the zero of a nonlinear function without using derivatives",
   Advances in Engineering Software 28 (1997) 145-149.
.. [2] W. H. Press et al., "Numerical Recipes", 3rd ed. (2007), sec. 9.4
   (Newton-Raphson safeguarded by bisection, ``rtsafe``).
"""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysError


def expand_bracket(fun, lo, hi, f_lo=None, f_hi=None, grow: float = 2.0, maxiter: int = 200):
    """Widen ``[lo, hi]`` until ``fun(lo) <= 0 <= fun(hi)`` for an increasing ``fun``.

    Returns ``lo, hi, f_lo, f_hi``.  Only the points whose bracket is wrong are
    evaluated again.
    """
    lo = np.array(lo, dtype=float)
    hi = np.array(hi, dtype=float)
    f_lo = fun(lo, None) if f_lo is None else np.array(f_lo, dtype=float)
    f_hi = fun(hi, None) if f_hi is None else np.array(f_hi, dtype=float)
    for _ in range(maxiter):
        bad_lo = f_lo > 0
        bad_hi = f_hi < 0
        if not (bad_lo.any() or bad_hi.any()):
            return lo, hi, f_lo, f_hi
        width = np.maximum(hi - lo, 1.0)
        if bad_lo.any():
            i = np.flatnonzero(bad_lo)
            hi[i], f_hi[i] = lo[i], f_lo[i]
            lo[i] = lo[i] - grow * width[i]
            f_lo[i] = fun(lo[i], i)
        if bad_hi.any():
            i = np.flatnonzero(bad_hi)
            lo[i], f_lo[i] = hi[i], f_hi[i]
            hi[i] = hi[i] + grow * width[i]
            f_hi[i] = fun(hi[i], i)
    raise FuelsysError("could not bracket the solution (no sign change found)")


def newton_bracketed(fun, lo, hi, x0, first, params=(), tol: float = 1e-9, maxiter: int = 100):
    """Solve ``fun(x) = 0`` for an increasing ``fun`` inside ``[lo, hi]`` by safeguarded Newton.

    Parameters
    ----------
    fun : callable
        ``fun(x, *params) -> (F, dF/dx, *aux)`` on 1-D arrays; ``params`` are
        per-point parameter arrays (the solver hands over the ones of the
        points still moving) and ``aux`` any further arrays the caller wants
        back from each point's last evaluation.
    lo, hi : ndarray
        Bracket, ``F(lo) <= 0 <= F(hi)`` for every point.
    x0 : ndarray
        Start point inside the bracket.
    first : tuple
        ``fun(x0, *params)``, already computed by the caller.
    params : tuple of ndarray
        Per-point parameters passed on to ``fun``.
    tol : float
        A point is finished when its Newton step is below ``tol`` (absolute in
        x); that last step is applied without a further evaluation, so the
        error left is of order ``tol**2`` times the curvature.
    maxiter : int
        Iteration limit (a bracket halves at least every iteration that fails
        to take a Newton step).

    Returns
    -------
    x : ndarray
        The roots.
    F : ndarray
        The residual at each point's last evaluation (about ``tol`` times the
        slope for a point finished by a Newton step).
    aux : tuple of ndarray
        The ``aux`` arrays of each point's last evaluation.

    Notes
    -----
    Finished points are written out as they finish; the working set is
    compacted once a fifth of it has finished, so late iterations cost only
    as much as the points still moving.  A Newton step that would leave the
    bracket is replaced by bisection, which makes the method converge for
    any increasing function.
    """
    x = np.array(x0, dtype=float)
    act = np.arange(x.size)
    xa = x.copy()
    la = np.array(lo, dtype=float)
    ha = np.array(hi, dtype=float)
    params = tuple(params)
    F, D, *aux = first
    F_out = np.empty_like(x)
    aux_out = [np.empty_like(x) for _ in aux]
    for _ in range(maxiter):
        with np.errstate(divide="ignore", invalid="ignore"):
            step = F / D
        xn = xa - step
        newton = (xn >= la) & (xn <= ha)
        if not newton.all():
            xn = np.where(newton, xn, 0.5 * (la + ha))
        done = (newton & (np.abs(step) <= tol)) | (F == 0) | (ha - la <= tol)
        n_done = np.count_nonzero(done)
        if n_done:
            k = act[done]
            x[k] = np.where(F[done] == 0, xa[done], xn[done])
            F_out[k] = F[done]
            for a_out, a in zip(aux_out, aux):
                a_out[k] = a[done]
            if n_done == act.size:
                return x, F_out, tuple(aux_out)
            if n_done >= 0.2 * act.size:
                keep = ~done
                act, xn, la, ha = act[keep], xn[keep], la[keep], ha[keep]
                params = tuple(p[keep] for p in params)
        F, D, *aux = fun(xn, *params)
        pos = F > 0
        np.copyto(ha, xn, where=pos)
        np.copyto(la, xn, where=~pos)
        xa = xn
    raise FuelsysError("safeguarded Newton did not converge (this is a bug: the bracket should close)")


def chandrupatla(fun, lo, hi, f_lo, f_hi, xtol: float = 1e-13, maxiter: int = 200):
    """Solve ``fun(x) = 0`` inside a sign-changing bracket, derivative-free (Chandrupatla 1997).

    ``fun(x)`` takes and returns 1-D arrays; ``f_lo`` and ``f_hi`` have
    opposite signs (or one is zero).  Returns the roots to an absolute
    tolerance of about ``xtol`` in x.
    """
    a = np.array(hi, dtype=float)
    b = np.array(lo, dtype=float)
    fa = np.array(f_hi, dtype=float)
    fb = np.array(f_lo, dtype=float)
    c = a.copy()
    fc = fa.copy()
    t = np.full(a.shape, 0.5)
    eps = 2.0 * np.finfo(float).eps
    done = (fa == 0) | (fb == 0)
    root = np.where(fa == 0, a, b)
    for _ in range(maxiter):
        xt = a + t * (b - a)
        ft = fun(xt)
        same = np.sign(ft) == np.sign(fa)
        c = np.where(same, a, b)
        fc = np.where(same, fa, fb)
        b = np.where(same, b, a)
        fb = np.where(same, fb, fa)
        a, fa = xt, ft
        small = np.abs(fa) < np.abs(fb)
        xm = np.where(small, a, b)
        fm = np.where(small, fa, fb)
        tol = 2.0 * eps * np.abs(xm) + 0.5 * xtol
        tl = tol / np.abs(b - c)
        new = ~done & ((tl > 0.5) | (fm == 0))
        root = np.where(new, xm, root)
        done = done | new
        if done.all():
            return root
        with np.errstate(divide="ignore", invalid="ignore"):
            xi = (a - b) / (c - b)
            phi = (fa - fb) / (fc - fb)
            iq = (phi ** 2 < xi) & ((1.0 - phi) ** 2 < 1.0 - xi)
            t_iq = (fa / (fb - fa)) * (fc / (fb - fc)) + ((c - a) / (b - a)) * (fa / (fc - fa)) * (fb / (fc - fb))
        t = np.where(iq, t_iq, 0.5)
        t = np.clip(t, tl, 1.0 - tl)
        t = np.where(np.isfinite(t), t, 0.5)
    raise FuelsysError("Chandrupatla's method did not converge (this is a bug: the bracket should close)")
