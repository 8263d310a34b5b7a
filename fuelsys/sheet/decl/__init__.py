"""Declarations of the spreadsheet functions, one module an area (see fuelsys.sheet.catalogue).

Every declaration is made with ``si=True``: its body takes and returns SI
values, and the adapter converts from and to the declared units through
:data:`fuelsys.sheet.catalogue.UNITS`.  A temperature reaches a body in kelvin;
check it against a fuel's range with ``fuel.check_temperature(T, "temp_c")``
(the message names the cell argument and shows °C).
"""
