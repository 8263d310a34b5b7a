"""Small array helpers shared by the physics modules."""

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


def checked_array(x, name: str, unit: str, positive: bool = False, nonneg: bool = False) -> np.ndarray:
    """``x`` as a float array; refuse non-finite values, and values <= 0 or < 0 when asked."""
    a = np.asarray(x, dtype=float)
    if np.any(~np.isfinite(a)):
        raise FuelsysInputError(f"{name} must be a finite number [{unit}]")
    if positive and np.any(a <= 0):
        raise FuelsysInputError(f"{name} must be > 0 (got {np.ravel(a[a <= 0])[0]:g} {unit})")
    if nonneg and np.any(a < 0):
        raise FuelsysInputError(f"{name} must be >= 0 (got {np.ravel(a[a < 0])[0]:g} {unit})")
    return a
