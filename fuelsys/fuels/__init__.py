"""What the fuel is: liquid and gas properties behind one interface.

Floor: fuels, above the ground floor (errors, arrays, constants, roots, thermo) and below everything else.

:func:`get_fuel` turns a fuel specification -- a built-in name, a user's fuel
table (dict, list of ``[label, value]`` rows, or a .csv/.json file name) --
into a :class:`fuelsys.fuels.base.Fuel`:

* petroleum liquids (``kerosene``, a user's table) are
  :class:`~fuelsys.fuels.petroleum.PetroleumFuel` objects characterised from
  their distillation curve;
* ``turbine-oil`` is a non-volatile ester oil (:mod:`fuelsys.fuels.blend`),
  normally used through ``oil_pct``;
* gases and reference fluids (propane, butanes, LPG blends, air, water) come
  from CoolProp through :mod:`fuelsys.fuels.gases`, imported only when one is
  asked for.

Importing this package imports neither scipy nor CoolProp.

Examples
--------
>>> from fuelsys.fuels import get_fuel
>>> k = get_fuel("kerosene")
>>> round(k.density(288.15))
800
>>> k2 = get_fuel("kerosene", oil_pct=2.0)
>>> k2.kinematic_viscosity(313.15) > k.kinematic_viscosity(313.15)
True
"""

from __future__ import annotations

import functools
import os

from fuelsys.errors import FuelsysInputError
from fuelsys.fuels.base import Fuel, fuel_h_to_c
from fuelsys.fuels.petroleum import PetroleumFuel

#: built-in liquid fuels and oils of this package (the CoolProp gases are added by ``FUEL_NAMES``)
LIQUID_FUEL_NAMES = ("kerosene", "turbine-oil")

__all__ = ["get_fuel", "FUEL_NAMES", "LIQUID_FUEL_NAMES", "PetroleumFuel", "Fuel", "known_fuel_names", "fuel_h_to_c"]


def _gas_names() -> tuple:
    from fuelsys.fuels.gases import GAS_NAMES

    return tuple(GAS_NAMES)


def _is_gas_name(key: str) -> bool:
    from fuelsys.fuels.gases import is_gas_name

    return is_gas_name(key)


def known_fuel_names() -> tuple:
    """Every built-in fuel name: the liquids here and the gases of :mod:`fuelsys.fuels.gases`."""
    return LIQUID_FUEL_NAMES + tuple(n for n in _gas_names() if n not in LIQUID_FUEL_NAMES)


def __getattr__(name):
    # FUEL_NAMES is computed on first access so that importing this package stays light
    if name == "FUEL_NAMES":
        return known_fuel_names()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


@functools.lru_cache(maxsize=None)
def _builtin(name: str) -> Fuel:
    if name == "kerosene":
        from fuelsys.fuels.library import kerosene_sources, kerosene_table, parse_fuel_table

        return PetroleumFuel(**parse_fuel_table(kerosene_table()), sources=kerosene_sources())
    if name == "turbine-oil":
        from fuelsys.fuels.blend import turbine_oil

        return turbine_oil()
    from fuelsys.fuels.gases import get_gas

    return get_gas(name)


def _freeze(value):
    if isinstance(value, dict):
        return ("dict",) + tuple((str(k), _freeze(v)) for k, v in value.items())
    if isinstance(value, (list, tuple)):
        return ("seq",) + tuple(_freeze(v) for v in value)
    if isinstance(value, (str, int, float, bool)) or value is None:
        return value
    try:
        return float(value)
    except (TypeError, ValueError):
        return str(value)


def _thaw(frozen):
    if isinstance(frozen, tuple) and frozen and frozen[0] == "dict":
        return {k: _thaw(v) for k, v in frozen[1:]}
    if isinstance(frozen, tuple) and frozen and frozen[0] == "seq":
        return [_thaw(v) for v in frozen[1:]]
    return frozen


@functools.lru_cache(maxsize=256)
def _from_table(frozen) -> Fuel:
    from fuelsys.fuels.library import parse_fuel_table

    return PetroleumFuel(**parse_fuel_table(_thaw(frozen)))


def get_fuel(spec, oil_pct: float = 0.0) -> Fuel:
    """The fuel named or described by ``spec``, optionally with turbine oil mixed in.

    Parameters
    ----------
    spec : str, dict, sequence or Fuel
        A built-in name (case-insensitive; see :func:`known_fuel_names`), the
        name of a .csv/.json fuel file, a fuel table as a dict or as a list of
        ``[label, value]`` rows (see :mod:`fuelsys.fuels.library`), or a Fuel [-].
    oil_pct : float
        Turbine oil mixed in, per cent by volume, 0..20 [%].

    Returns
    -------
    Fuel
        The fuel (cached: the same spec gives the same object).

    Raises
    ------
    FuelsysInputError
        Unknown name (the message lists the known ones) or a bad table.

    References
    ----------
    See :mod:`fuelsys.fuels.petroleum`, :mod:`fuelsys.fuels.blend` and
    :mod:`fuelsys.fuels.gases` for the methods behind each kind of fuel.

    Examples
    --------
    >>> get_fuel("Kerosene") is get_fuel("kerosene")
    True
    """
    if isinstance(spec, Fuel):
        fuel = spec
    elif isinstance(spec, str):
        key = spec.strip().lower()
        if not key:
            raise FuelsysInputError(f"fuel name is empty; known fuels: {', '.join(known_fuel_names())}")
        if key in LIQUID_FUEL_NAMES or _is_gas_name(key):
            fuel = _builtin(key)
        elif os.path.splitext(key)[1] in (".csv", ".json") and os.path.isfile(spec.strip()):
            from fuelsys.fuels.library import read_fuel_file

            fuel = _from_table(_freeze(read_fuel_file(spec.strip())))
        else:
            raise FuelsysInputError(f"unknown fuel '{spec.strip()}'; known fuels: {', '.join(known_fuel_names())}"
                                    " (or a fuel table)")
    elif isinstance(spec, (dict, list, tuple)):
        fuel = _from_table(_freeze(spec))
    else:
        raise FuelsysInputError(f"a fuel is a name or a fuel table (got {type(spec).__name__})")
    if oil_pct is None:
        return fuel
    return fuel.with_oil(oil_pct)
