"""fuelsys: fuel-system sizing for small gas turbines.

The core API works in SI units (Pa, K, kg/s, m) and broadcasts over numpy
arrays; the spreadsheet face (:mod:`fuelsys.sheet`) works in the builders'
units named in each argument.

The package is built in floors; a module imports only from its own floor or
below (DEVELOPERS.md "Layout", checked by tests/test_house.py):

1. ground: errors, arrays, constants, roots, thermo;
2. fuels (every fluid property);
3. flow, heat and equilibrium;
4. the engine's parts: vaporiser, combustor, engine, pump, gas_start (and demo);
5. sheet (the spreadsheet face);
6. cli.
"""

__version__ = "0.1.0"

from fuelsys.errors import FuelsysError, FuelsysInputError, ValidityWarning  # noqa: E402

__all__ = ["__version__", "FuelsysError", "FuelsysInputError", "ValidityWarning"]
