"""Array conversion and the one input check of the core (ground floor: imports only errors and numpy)."""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysInputError


def as_float(x):
    """Return a Python float for a 0-d result, else the array unchanged.

    Keeps 0-d arrays from leaking out of a public function: scalars in give
    floats out, arrays in give arrays out.
    """
    a = np.asarray(x, dtype=float)
    return float(a) if a.ndim == 0 else a


def checked_array(x, name: str, unit: str, positive: bool = False, nonneg: bool = False,
                  scale: float = 1.0) -> np.ndarray:
    """``x`` as a float array, refusing non-finite values (and values <= 0 or < 0 when asked).

    The one input check of the core: every module calls it (directly, or through a thin
    adapter keeping its own argument order) instead of writing the test again.

    Parameters
    ----------
    x : array_like
        The values [any unit].
    name : str
        The quantity's name for the message [-].
    unit : str
        The unit the message shows the offending value in [-].
    positive : bool
        Refuse values <= 0 [-].
    nonneg : bool
        Refuse values < 0 [-].
    scale : float
        Factor from the value's unit to the unit shown, e.g. 1e3 for a bore in m shown in mm [-].

    Returns
    -------
    ndarray
        ``x`` as floats.

    Raises
    ------
    FuelsysInputError
        "bore must be > 0 (got -0.3 mm)", or "... must be a finite number (got nan mm)".

    Examples
    --------
    >>> checked_array([1e-3, 2e-3], "bore", "mm", positive=True, scale=1e3)
    array([0.001, 0.002])
    >>> checked_array(-3e-4, "bore", "mm", positive=True, scale=1e3)
    Traceback (most recent call last):
    ...
    fuelsys.errors.FuelsysInputError: bore must be > 0 (got -0.3 mm)
    """
    a = np.asarray(x, dtype=float)
    bad = ~np.isfinite(a)
    if np.any(bad):
        raise FuelsysInputError(f"{name} must be a finite number (got {np.ravel(a[bad])[0] * scale:g} {unit})")
    if positive and np.any(a <= 0):
        raise FuelsysInputError(f"{name} must be > 0 (got {np.ravel(a[a <= 0])[0] * scale:g} {unit})")
    if nonneg and np.any(a < 0):
        raise FuelsysInputError(f"{name} must be >= 0 (got {np.ravel(a[a < 0])[0] * scale:g} {unit})")
    return a
