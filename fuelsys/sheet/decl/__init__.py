"""Declarations of the spreadsheet functions, one module an area (see fuelsys.sheet.catalogue).

Every declaration is made with ``si=True``: its body takes and returns SI
values, and the adapter converts from and to the declared units through
:data:`fuelsys.sheet.catalogue.UNITS`.  A temperature reaches a body in kelvin;
check it against a fuel's range with ``fuel.check_temperature(T, "temp_c")``
(the message names the cell argument and shows °C).
"""


def checked_temperature(fuel, T, name: str = "temp_c"):
    """``T`` [K] checked against the fuel's range, the message naming cell argument ``name``.

    A single float inside the range passes straight through (the cell's fast path); anything else
    goes through :meth:`fuelsys.fuels.base.Fuel.check_temperature`.
    """
    if type(T) is float and fuel.t_min <= T <= fuel.t_max:
        return T
    return fuel.check_temperature(T, name)
