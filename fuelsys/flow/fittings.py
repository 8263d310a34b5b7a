"""Loss coefficients of tube entrances and exits (``dp = K rho u^2 / 2``).

Entrance geometries of a needle where it leaves the manifold ring (the keys of
:data:`ENTRANCE_K`):

========== ====== ===========================================================
key        K      geometry and source
========== ====== ===========================================================
square     0.50   square-cut end flush with the wall (Crane TP-410 2009,
                  p. A-29 "flush"; Idelchik 3rd ed. diagram 3-1 at b/D = 0)
reentrant  0.78   end protruding into the ring, "inward projecting"
                  (Crane TP-410 2009, p. A-29)
borda      1.00   thin-walled end protruding far into the ring, sharp edge
                  (Idelchik 3rd ed. diagram 3-1, delta/D -> 0, b/D > 0.5;
                  Borda mouthpiece; from memory)
rounded    0.04   well rounded, r/D >= 0.15 (Crane TP-410 2009, p. A-29)
========== ====== ===========================================================

Wall thickness matters for a protruding end: Idelchik's diagram 3-1 falls
from 1.0 for a knife edge to 0.5 once the wall is about 5 % of the bore
thick (as tabulated by fluids.fittings.entrance_distance(method="Idelchik")),
and hypodermic tubing walls are 15-40 % of the bore, so a
needle pushed through the ring wall with a square-cut end is usually best
described by "square" (0.5); "reentrant" and "borda" are for thin-walled
tube ends.

A number may be given instead of a key (any K >= 0), and
:func:`entrance_rounded_crane` interpolates Crane's table for a given
rounding radius.  The exit of a needle is a free jet: it leaves with its
kinetic energy, K = 1 times the kinetic-energy coefficient of the profile
(:data:`EXIT_K` = 1.0 for a flat profile, Crane TP-410 "pipe exit"); the
needle model adds the laminar profile's extra kinetic energy through Shah's
apparent friction.

The coefficients were measured in turbulent flow (Idelchik: Re > 1e4);
:data:`ENTRANCE_VALIDITY` keeps that range and the needle model flags it
where the entrance term is a noticeable share of the pressure drop.

References
----------
.. [1] Crane Co., "Flow of Fluids Through Valves, Fittings and Pipe",
   Technical Paper 410 (2009), p. A-29: entrance and exit resistance
   coefficients.
.. [2] I. E. Idelchik, "Handbook of Hydraulic Resistance", 3rd ed.
   (Begell House, 1996), diagram 3-1 (entrance of a straight tube).

Bends: :func:`crane_return_bend_k` gives the loss of a 180° return bend
(the vaporiser's return leg) by Crane's rule for bends of n quarter turns,
with the 90° bend's K/f_T read from Crane's table (:data:`CRANE_BEND_K_OVER_FT`).
"""

from __future__ import annotations

import numpy as np

from fuelsys.arrays import as_float as _as_float
from fuelsys.errors import FuelsysInputError, warn_validity

#: entrance loss coefficients by geometry: key -> (K, source)
ENTRANCE_K = {
    "square": (0.50, "Crane TP-410 (2009) p. A-29, flush square-edged entrance"),
    "reentrant": (0.78, "Crane TP-410 (2009) p. A-29, inward projecting entrance"),
    "borda": (1.00, "Idelchik, Handbook of Hydraulic Resistance 3rd ed., diagram 3-1, thin edge far "
                    "into the reservoir (from memory)"),
    "rounded": (0.04, "Crane TP-410 (2009) p. A-29, rounded entrance r/D >= 0.15"),
}
#: other names accepted for the entrance keys
ENTRANCE_ALIASES = {"flush": "square", "sharp": "square", "square-cut": "square", "protruding": "reentrant",
                    "re-entrant": "reentrant", "inward": "reentrant", "thin-reentrant": "borda"}
#: default entrance of a needle soldered flush into the ring wall
DEFAULT_ENTRANCE = "square"

#: Crane TP-410 (2009) p. A-29: rounded entrance, r/D -> K
CRANE_ROUNDED_R_OVER_D = (0.0, 0.02, 0.04, 0.06, 0.10, 0.15)
CRANE_ROUNDED_K = (0.50, 0.28, 0.24, 0.15, 0.09, 0.04)

#: exit of a tube into a large space: the flow leaves with its kinetic energy
#: (Crane TP-410 2009 p. A-29: K = 1.0)
EXIT_K = 1.0

#: Reynolds range of the entrance coefficients (turbulent tests; Idelchik 3rd ed. ch. 3: Re > 1e4)
ENTRANCE_VALIDITY = {"Re": (1e4, np.inf)}


def entrance_rounded_crane(r_over_d):
    """Entrance loss coefficient of a rounded tube inlet, Crane TP-410 table (linear interpolation).

    Parameters
    ----------
    r_over_d : array_like
        Rounding radius over bore, >= 0; 0.15 and above give 0.04 [-]

    Returns
    -------
    float or ndarray
        Loss coefficient referred to the tube velocity head [-]

    References
    ----------
    Crane Co., Technical Paper 410 (2009), p. A-29.

    Examples
    --------
    >>> entrance_rounded_crane(0.04)
    0.24
    """
    r = np.asarray(r_over_d, dtype=float)
    if np.any(~np.isfinite(r)) or np.any(r < 0):
        raise FuelsysInputError(f"r/D must be >= 0 (got {r[~(np.isfinite(r) & (r >= 0))].flat[0]:g})")
    k = np.interp(r, CRANE_ROUNDED_R_OVER_D, CRANE_ROUNDED_K)
    return float(k) if k.ndim == 0 else k


#: largest entrance loss coefficient accepted: sharp re-entrant inlets reach about 1 (Idelchik 1986,
#: diagram 3-1); anything far above it is another loss, not the needle's entrance [-]
ENTRANCE_K_MAX = 10.0


def entrance_k(entrance=DEFAULT_ENTRANCE):
    """Entrance loss coefficient for a key of :data:`ENTRANCE_K` or a given number.

    Parameters
    ----------
    entrance : str or array_like
        "square" (default), "reentrant", "borda", "rounded" (or an alias such
        as "flush", "protruding"), or loss coefficients >= 0 [-]

    Returns
    -------
    float or ndarray
        Loss coefficient [-]

    Raises
    ------
    FuelsysInputError
        For an unknown key (the message lists the valid ones) or a negative K.

    References
    ----------
    Crane TP-410 (2009) p. A-29; Idelchik, Handbook of Hydraulic Resistance,
    3rd ed., diagram 3-1.

    Examples
    --------
    >>> entrance_k("reentrant")
    0.78
    """
    if isinstance(entrance, str):
        key = entrance.strip().lower()
        key = ENTRANCE_ALIASES.get(key, key)
        if key not in ENTRANCE_K:
            raise FuelsysInputError(
                f"entrance {entrance!r} is unknown; valid: {', '.join(ENTRANCE_K)} or a loss coefficient >= 0")
        return ENTRANCE_K[key][0]
    k = np.asarray(entrance, dtype=float)
    ok = np.isfinite(k) & (k >= 0) & (k <= ENTRANCE_K_MAX)
    if not np.all(ok):
        raise FuelsysInputError(f"entrance loss coefficient must be within 0..{ENTRANCE_K_MAX:g} "
                                f"(got {k[~ok].flat[0]:g}); put other losses in the line's k_total")
    return float(k) if k.ndim == 0 else k


# -- bends ------------------------------------------------------------------------------------

#: Crane TP-410 (2009) A-29: loss coefficient of a 90° bend over the fully turbulent friction factor,
#: against the bend radius over the bore (from memory)
CRANE_BEND_R_OVER_D = (1.0, 1.5, 2.0, 3.0, 4.0, 6.0, 8.0, 10.0, 12.0, 14.0, 16.0, 20.0)
CRANE_BEND_K_OVER_FT = (20.0, 14.0, 12.0, 12.0, 14.0, 17.0, 24.0, 30.0, 34.0, 38.0, 42.0, 50.0)


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
    return _as_float((2 - 1) * (0.25 * np.pi * ft * rd + 0.5 * k1) + k1)
