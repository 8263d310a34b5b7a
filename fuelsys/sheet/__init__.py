"""The spreadsheet face of fuelsys.

Floor: the spreadsheet face, above every physics floor; none of them imports it.

:func:`call` runs any catalogue function exactly as a spreadsheet cell would;
:func:`fuelsys.sheet.catalogue.functions` lists them.  The physics modules
never import this package.
"""

from fuelsys.sheet.adapt import ERROR_PREFIX, call, is_error

__all__ = ["call", "is_error", "ERROR_PREFIX"]
