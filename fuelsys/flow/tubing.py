"""Stainless needle tubing sizes after ISO 9626 (gauge -> outside diameter and minimum bore).

ISO 9626 ("Stainless steel needle tubing for the manufacture of medical
devices") gives for each designated metric size (= nominal outside diameter)
and its gauge number the outside-diameter limits and the *minimum* inside
diameter for each wall class.  Real tubing is usually a little larger than the
minimum bore, so a measured bore (or one found on the bench with
:func:`fuelsys.flow.bench.effective_bore`) always overrides the table.

Wall classes and the names accepted for them (case-insensitive):

* ``normal`` -- "regular", "RW", "NW": the standard's normal wall;
* ``thin`` -- "TW";
* ``extra-thin`` -- "ETW", "XTW", "extra thin";
* ``ultra-thin`` -- "UTW": recognised, but no values are tabulated here (the
  2016 edition added them and they have not been checked); give a measured
  bore instead.

Sources of the numbers
----------------------
Every row of :data:`ISO9626_TABLE` carries its source.  The numbers are those
of ISO 9626:2016 Table 1 (normal and thin wall 34G..10G; extra-thin wall 23G..14G,
the range ISO 9626:1991/Amd 1:2001 and its national adoption GB/T 18457-2015
give for extra-thin tubing) as recalled **from memory**; they have not been
checked against the printed standard.  The tests check the table for internal
consistency and against independently published nominal sizes.

References
----------
.. [1] ISO 9626:2016, Stainless steel needle tubing for the manufacture of
   medical devices -- Requirements and test methods, Table 1 (dimensions).
.. [2] ISO 9626:1991/Amd 1:2001 (extra-thin wall for designated sizes 0,6 mm
   to 2,1 mm); GB/T 18457-2015 (the Chinese adoption, same coverage).
"""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysInputError

#: source note attached to every row of the table
SOURCE_ISO_MEMORY = "ISO 9626:2016 Table 1, from memory (not checked against the printed standard)"

#: the wall classes, in order from thickest to thinnest wall
WALL_CLASSES = ("normal", "thin", "extra-thin", "ultra-thin")

#: other names accepted for each wall class
WALL_ALIASES = {
    "normal": "normal", "regular": "normal", "rw": "normal", "nw": "normal", "regular wall": "normal",
    "normal wall": "normal",
    "thin": "thin", "tw": "thin", "thin wall": "thin",
    "extra-thin": "extra-thin", "extra thin": "extra-thin", "extrathin": "extra-thin", "etw": "extra-thin",
    "xtw": "extra-thin", "extra-thin wall": "extra-thin",
    "ultra-thin": "ultra-thin", "ultra thin": "ultra-thin", "ultrathin": "ultra-thin", "utw": "ultra-thin",
    "ultra-thin wall": "ultra-thin",
}

# gauge, designated metric size, OD min, OD max, minimum bore for normal, thin,
# extra-thin wall (None where not given) -- all in mm; source per row.
_ROWS_MM = (
    (34, 0.18, 0.178, 0.191, 0.064, 0.091, None),
    (33, 0.20, 0.203, 0.216, 0.089, 0.105, None),
    (32, 0.23, 0.229, 0.241, 0.089, 0.105, None),
    (31, 0.25, 0.254, 0.267, 0.114, 0.125, None),
    (30, 0.30, 0.298, 0.320, 0.133, 0.165, None),
    (29, 0.33, 0.324, 0.351, 0.133, 0.190, None),
    (28, 0.36, 0.349, 0.370, 0.133, 0.190, None),
    (27, 0.40, 0.400, 0.420, 0.184, 0.241, None),
    (26, 0.45, 0.440, 0.470, 0.232, 0.292, None),
    (25, 0.50, 0.500, 0.530, 0.232, 0.292, None),
    (24, 0.55, 0.550, 0.580, 0.280, 0.343, None),
    (23, 0.60, 0.600, 0.673, 0.317, 0.370, 0.440),
    (22, 0.70, 0.698, 0.730, 0.390, 0.440, 0.522),
    (21, 0.80, 0.800, 0.830, 0.490, 0.547, 0.610),
    (20, 0.90, 0.860, 0.920, 0.560, 0.635, 0.687),
    (19, 1.10, 1.030, 1.100, 0.648, 0.750, 0.850),
    (18, 1.20, 1.200, 1.300, 0.790, 0.910, 1.041),
    (17, 1.40, 1.400, 1.510, 0.950, 1.156, 1.244),
    (16, 1.60, 1.600, 1.690, 1.100, 1.283, 1.390),
    (15, 1.80, 1.750, 1.900, 1.300, 1.460, 1.560),
    (14, 2.10, 2.000, 2.150, 1.500, 1.600, 1.727),
    (13, 2.40, 2.300, 2.500, 1.700, 1.950, None),
    (12, 2.70, 2.600, 2.800, 1.950, 2.200, None),
    (11, 3.00, 2.900, 3.100, 2.150, 2.500, None),
    (10, 3.40, 3.300, 3.500, 2.500, 2.850, None),
)

#: ISO 9626 table by gauge, SI units [m]: each row a dict with the designated
#: size, OD limits, minimum bore per wall class (absent where not given) and
#: the source of the row's values.
ISO9626_TABLE: dict[int, dict] = {
    g: {
        "designation": size * 1e-3,
        "od_min": lo * 1e-3,
        "od_max": hi * 1e-3,
        "bore_min": {w: v * 1e-3 for w, v in zip(WALL_CLASSES, (rw, tw, etw)) if v is not None},
        "source": SOURCE_ISO_MEMORY,
    }
    for g, size, lo, hi, rw, tw, etw in _ROWS_MM
}

#: gauges in the table, thinnest tubing first
GAUGES = tuple(sorted(ISO9626_TABLE, reverse=True))

_G_LO, _G_HI = min(GAUGES), max(GAUGES)


def _lookup(values_by_gauge: dict) -> np.ndarray:
    """A dense array indexed by gauge number (NaN where the table has no value)."""
    arr = np.full(_G_HI + 1, np.nan)
    for g, v in values_by_gauge.items():
        arr[g] = v
    return arr


_OD_MIN = _lookup({g: r["od_min"] for g, r in ISO9626_TABLE.items()})
_OD_MAX = _lookup({g: r["od_max"] for g, r in ISO9626_TABLE.items()})
_DESIGNATION = _lookup({g: r["designation"] for g, r in ISO9626_TABLE.items()})
_BORE = {w: _lookup({g: r["bore_min"][w] for g, r in ISO9626_TABLE.items() if w in r["bore_min"]})
         for w in WALL_CLASSES}


def _scalar_out(a):
    a = np.asarray(a, dtype=float)
    return float(a) if a.ndim == 0 else a


def wall_class(wall: str) -> str:
    """The canonical wall-class name for ``wall`` (see the module docstring for aliases).

    Parameters
    ----------
    wall : str
        Wall class or one of its aliases, e.g. "normal", "RW", "thin", "ETW" [-]

    Returns
    -------
    str
        One of :data:`WALL_CLASSES` [-]

    Raises
    ------
    FuelsysInputError
        For an unknown name; the message lists the valid ones.

    References
    ----------
    ISO 9626:2016 (wall classes normal, thin, extra-thin, ultra-thin).

    Examples
    --------
    >>> wall_class("TW")
    'thin'
    """
    key = str(wall).strip().lower().replace("_", "-")
    if key not in WALL_ALIASES:
        raise FuelsysInputError(
            f"wall class {wall!r} is unknown; valid: {', '.join(WALL_CLASSES)} "
            f"(or RW, TW, ETW, UTW)")
    return WALL_ALIASES[key]


def _gauge_index(gauge) -> np.ndarray:
    g = np.asarray(gauge, dtype=float)
    ok = np.isfinite(g) & (g == np.round(g)) & (g >= _G_LO) & (g <= _G_HI)
    if not np.all(ok):
        bad = g[~ok].flat[0]
        raise FuelsysInputError(
            f"gauge {bad:g} is not in the ISO 9626 table; valid gauges: "
            f"{', '.join(str(x) for x in GAUGES)}")
    return g.astype(int)


def od_range(gauge):
    """Outside-diameter limits of needle tubing of a gauge (ISO 9626 Table 1).

    Parameters
    ----------
    gauge : array_like
        Gauge number, 10..34 [-]

    Returns
    -------
    od_min, od_max : float or ndarray
        Smallest and largest outside diameter allowed [m]

    Raises
    ------
    FuelsysInputError
        For a gauge not in the table (the message lists the valid ones).

    References
    ----------
    ISO 9626:2016 Table 1 (values from memory, see the module docstring).

    Examples
    --------
    >>> [round(x * 1e3, 3) for x in od_range(22)]
    [0.698, 0.73]
    """
    i = _gauge_index(gauge)
    return _scalar_out(_OD_MIN[i]), _scalar_out(_OD_MAX[i])


def needle_od(gauge, limit: str = "mid"):
    """Outside diameter of needle tubing of a gauge (ISO 9626 Table 1).

    Parameters
    ----------
    gauge : array_like
        Gauge number, 10..34 [-]
    limit : str
        "mid" (middle of the allowed range, the default), "min", "max" or
        "nominal" (the designated metric size) [-]

    Returns
    -------
    float or ndarray
        Outside diameter [m]

    Raises
    ------
    FuelsysInputError
        For a gauge not in the table or an unknown ``limit``.

    References
    ----------
    ISO 9626:2016 Table 1 (values from memory, see the module docstring).

    Examples
    --------
    >>> round(needle_od(22) * 1e3, 3)
    0.714
    """
    i = _gauge_index(gauge)
    choices = {"mid": 0.5 * (_OD_MIN + _OD_MAX), "min": _OD_MIN, "max": _OD_MAX, "nominal": _DESIGNATION}
    key = str(limit).strip().lower()
    if key not in choices:
        raise FuelsysInputError(f"OD limit {limit!r} is unknown; valid: {', '.join(choices)}")
    return _scalar_out(choices[key][i])


def needle_bore(gauge, wall: str = "normal"):
    """Minimum bore (inside diameter) of needle tubing of a gauge and wall class (ISO 9626).

    Parameters
    ----------
    gauge : array_like
        Gauge number, 10..34 [-]
    wall : str
        Wall class: "normal" (default), "thin", "extra-thin" (aliases RW, TW,
        ETW) [-]

    Returns
    -------
    float or ndarray
        The standard's minimum inside diameter [m].  Actual tubing is usually
        slightly larger: prefer a measured bore where there is one.

    Raises
    ------
    FuelsysInputError
        For a gauge not in the table, an unknown wall class (both messages list
        the valid ones), or a wall class the table does not give for that
        gauge.

    References
    ----------
    ISO 9626:2016 Table 1 (values from memory, see the module docstring).

    Examples
    --------
    >>> round(needle_bore(22, "thin") * 1e3, 3)
    0.44
    """
    w = wall_class(wall)
    i = _gauge_index(gauge)
    table = _BORE[w]
    have = sorted((g for g in GAUGES if np.isfinite(table[g])), reverse=True)
    if not have:
        raise FuelsysInputError(
            f"{w} wall bores are not tabulated in fuelsys (not checked against ISO 9626:2016); "
            f"give a measured bore, or use one of: normal, thin, extra-thin")
    out = table[i]
    if np.any(~np.isfinite(out)):
        bad = int(np.asarray(i)[~np.isfinite(out)].flat[0]) if np.ndim(i) else int(i)
        raise FuelsysInputError(
            f"{w} wall is not given for {bad}G in ISO 9626; {w} wall exists for "
            f"{have[0]}G..{have[-1]}G")
    return _scalar_out(out)


def resolve_bore(gauge=None, wall: str = "normal", bore=None):
    """The bore to compute with: a measured ``bore`` if given, else the ISO 9626 minimum.

    A measured bore is checked against the gauge's smallest outside diameter
    when a gauge is given as well.

    Parameters
    ----------
    gauge : array_like, optional
        Gauge number, 10..34 [-]
    wall : str
        Wall class for the table look-up [-]
    bore : array_like, optional
        Measured inside diameter; overrides the table [m]

    Returns
    -------
    float or ndarray
        Inside diameter [m]

    Raises
    ------
    FuelsysInputError
        When neither is given, a bore is not positive, or a measured bore is
        not smaller than the gauge's outside diameter.

    References
    ----------
    ISO 9626:2016 Table 1 (values from memory, see the module docstring).

    Examples
    --------
    >>> resolve_bore(22, bore=0.45e-3)
    0.00045
    """
    if bore is None:
        if gauge is None:
            raise FuelsysInputError("give a gauge (10..34) or a measured bore [m]")
        return needle_bore(gauge, wall)
    b = np.asarray(bore, dtype=float)
    if np.any(~np.isfinite(b)) or np.any(b <= 0):
        bad = b[~(np.isfinite(b) & (b > 0))].flat[0]
        raise FuelsysInputError(f"bore must be > 0 (got {bad * 1e3:g} mm)")
    if gauge is not None:
        od_min, _ = od_range(gauge)
        od_min = np.broadcast_to(np.asarray(od_min), np.broadcast_shapes(np.shape(od_min), b.shape))
        bb = np.broadcast_to(b, od_min.shape)
        if np.any(bb >= od_min):
            k = np.flatnonzero(bb >= od_min)[0]
            raise FuelsysInputError(
                f"bore {bb.flat[k] * 1e3:.3f} mm must be smaller than the tubing's outside diameter "
                f"({od_min.flat[k] * 1e3:.3f} mm for the gauge given)")
    return _scalar_out(b)
