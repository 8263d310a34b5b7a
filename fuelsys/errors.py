"""Errors and warnings shared by every part of fuelsys (ground floor: imports only numpy).

* :class:`FuelsysInputError` -- impossible input (a negative bore, a
  temperature below the fuel's freezing point).  It is a ``ValueError`` so
  plain Python code can catch it the usual way.  The message says what is
  wrong and what is allowed; the spreadsheet face shows it after
  ``FS error:``.
* :class:`ValidityWarning` -- the input is possible but lies outside the
  range a correlation was fitted on.  The result is still computed and
  returned; the warning says which correlation and which range.
"""

from __future__ import annotations

import warnings

import numpy as np


class FuelsysError(Exception):
    """Base class of every fuelsys error."""


class FuelsysInputError(FuelsysError, ValueError):
    """Input that no correlation can give a meaningful answer for."""


class ValidityWarning(UserWarning):
    """Input outside the fitted range of a correlation (result still given)."""


def warn_validity(what: str, name: str, value, low: float, high: float, unit: str) -> bool:
    """Warn when any element of ``value`` lies outside ``[low, high]``.

    Returns True when a warning was issued.  ``what`` names the correlation,
    ``name`` the quantity and ``unit`` its unit, so the text reads e.g.
    "Gnielinski correlation: Reynolds number 1.2e+07 outside 2300..5e6 [-]".
    """
    v = np.asarray(value, dtype=float)
    bad = (v < low) | (v > high)
    if np.any(bad):
        worst = v[bad].flat[0]
        warnings.warn(
            f"{what}: {name} {worst:.4g} outside its range {low:.4g}..{high:.4g} [{unit}]"
            f" ({int(np.count_nonzero(bad))} of {v.size} points); result extrapolated",
            ValidityWarning,
            stacklevel=3,
        )
        return True
    return False


def require(condition, message: str) -> None:
    """Raise :class:`FuelsysInputError` with ``message`` unless ``condition`` holds everywhere."""
    if not np.all(condition):
        raise FuelsysInputError(message)
