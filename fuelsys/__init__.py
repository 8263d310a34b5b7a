"""fuelsys: fuel-system sizing for small gas turbines.

The core API works in SI units (Pa, K, kg/s, m) and broadcasts over numpy
arrays; the spreadsheet face (:mod:`fuelsys.sheet`) works in the builders'
units named in each argument.
"""

__version__ = "0.1.0"

from fuelsys.errors import FuelsysError, FuelsysInputError, ValidityWarning  # noqa: E402

__all__ = ["__version__", "FuelsysError", "FuelsysInputError", "ValidityWarning"]
