"""Declarations of the spreadsheet functions, one module an area (see fuelsys.sheet.catalogue).

The helper below is shared by the areas: every spreadsheet temperature is in °C.
"""

import numpy as np


def kelvin(fuel, temp_c, name: str = "temp_c"):
    """A cell temperature [°C] in kelvin, refused outside the fuel's range with a message naming ``name``."""
    from fuelsys.fuels.base import T0_C

    return fuel.check_temperature(np.asarray(temp_c, dtype=float) + T0_C, name)
