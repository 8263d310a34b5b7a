"""Sizing a vaporiser tube: the heated length that meets a dew-point margin (the march run backwards)."""

from __future__ import annotations

import warnings

import numpy as np

from fuelsys.arrays import as_float as _out
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.arrays import checked_array
from fuelsys.vaporiser.tube import vaporiser

#: shortest heated length searched [m] (common practice, no source: below a few millimetres a tube is
#: only its inlet)
LENGTH_MIN = 5e-3
#: the length is found to this dew-margin tolerance [K]
MARGIN_TOLERANCE_K = 0.05
#: most iterations of the length search (regula falsi, Illinois) [-]
LENGTH_ITERATIONS = 40


def _margin(length, args, options):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        r = vaporiser(args[0], length, *args[1:], check_steps=False, **options)
    return np.asarray(r.dew_margin, dtype=float).reshape(-1)


def tube_length_for_margin(bore, fuel_flow, air_flow, pressure, t_air_in, wall, fuel, dew_margin, max_heated_length,
                           **options):
    """Heated length at which the exit reaches a given margin over its dew point (inverse of :func:`vaporiser`).

    The exit's margin over the dew point grows with the heated length while
    the wall is hotter than the mixture; the length is found per point by
    regula falsi (Illinois variant) between :data:`LENGTH_MIN` and
    ``max_heated_length`` on the full march, to :data:`MARGIN_TOLERANCE_K`.

    Parameters
    ----------
    bore : array_like
        Tube inside diameter [m]
    fuel_flow : array_like
        Liquid fuel flow into the tube (oil included) [kg/s]
    air_flow : array_like
        Air flow into the tube [kg/s]
    pressure : array_like
        Case pressure at the tube inlet [Pa abs]
    t_air_in : array_like
        Air temperature at the tube inlet [K]
    wall : array_like
        Uniform inner-wall temperature [K]
    fuel : Fuel
        The fuel (a blend from ``fuel.with_oil(pct)``) [-]
    dew_margin : array_like
        Required exit temperature above the dew point [K]
    max_heated_length : float
        Longest heated length considered [m]
    **options
        Keyword options of :func:`vaporiser` (``t_fuel_in``, ``shape``, ...) [-]

    Returns
    -------
    float or ndarray
        Heated length [m]

    Raises
    ------
    FuelsysInputError
        Where no length up to ``max_heated_length`` gives the margin (the message
        gives the margin reached there).

    References
    ----------
    The march of :func:`vaporiser`; regula falsi with the Illinois
    modification: M. Dowell, P. Jarratt, BIT 11 (1971) 168-174.

    Examples
    --------
    >>> from fuelsys.fuels import get_fuel
    >>> L = tube_length_for_margin(6e-3, 0.5e-3, 4e-3, 3e5, 473.15, 873.15, get_fuel("kerosene"), 20.0, 0.5)
    >>> 0.005 < L < 0.5
    True
    """
    m = np.asarray(dew_margin, dtype=float)
    if np.any(~np.isfinite(m)):
        raise FuelsysInputError("dew margin must be a finite number [K]")
    L_max = float(checked_array(max_heated_length, "longest heated length", "m", positive=True))
    if L_max <= LENGTH_MIN:
        raise FuelsysInputError(f"longest heated length must be above {LENGTH_MIN * 1e3:g} mm (got {L_max * 1e3:g} mm)")
    args = (bore, fuel_flow, air_flow, pressure, t_air_in, wall, fuel)
    shape = np.broadcast_shapes(*[np.shape(a) for a in args if not hasattr(a, "name")], np.shape(m))
    n = int(np.prod(shape)) if shape else 1
    flat = [np.broadcast_to(np.asarray(a, dtype=float), shape).reshape(n) for a in args[:6]]
    target = np.broadcast_to(m, shape).reshape(n)
    args = (*flat, fuel)
    a, b = np.full(n, LENGTH_MIN), np.full(n, L_max)
    fa, fb = _margin(a, args, options) - target, _margin(b, args, options) - target
    if np.any(fb < 0):
        i = int(np.argmin(fb))
        raise FuelsysInputError(f"no heated length up to {L_max * 1e3:g} mm gives a dew margin of {target[i]:g} K: "
                                f"{fb[i] + target[i]:.1f} K at {L_max * 1e3:g} mm; raise the wall temperature, the "
                                "longest length or the air, or lower the fuel")
    x = np.where(fa >= 0, a, b)
    active = fa < 0
    side = np.zeros(n)
    for _ in range(LENGTH_ITERATIONS):
        if not np.any(active):
            break
        x = np.where(active, (a * fb - b * fa) / (fb - fa), x)
        fx = _margin(x, args, options) - target
        active = active & (np.abs(fx) > MARGIN_TOLERANCE_K)
        low = fx < 0
        a, fa = np.where(low, x, a), np.where(low, fx, fa)
        b, fb = np.where(low, b, x), np.where(low, fb, fx)
        # Illinois: halve the end that stayed, so the bracket closes from both sides
        fb = np.where(low & (side == -1), fb / 2, fb)
        fa = np.where(~low & (side == 1), fa / 2, fa)
        side = np.where(low, -1, 1)
    if np.any(active):
        raise FuelsysInputError("the tube-length search did not settle within its iterations; the dew margin may not "
                                "grow steadily with length here (check the wall against the air temperature)")
    return _out(x.reshape(shape))
