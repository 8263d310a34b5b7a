"""The catalogue: every spreadsheet function of fuelsys, declared once.

A declaration names the function, its category, a one-line summary, each
argument (kind, unit, meaning, default and allowed range), what it returns and
the published source of its method.  Everything else is generated from it: the
adapter that runs a function as a cell would (:mod:`fuelsys.sheet.adapt`), the
xlwings module (:mod:`fuelsys.sheet.excel`), the headless evaluator's function
table, the LibreOffice extension, the workbook's Functions sheet and
``docs/functions.md``.

Declarations live in the modules of :mod:`fuelsys.sheet.decl`, one module an
area; :func:`functions` imports them all on first use.  A declaration looks
like this::

    @spreadsheet_function(
        name="FS_DENSITY", category="fuel",
        summary="Liquid density of a fuel at a temperature",
        args=[Arg("fuel", "fuel", "-", "built-in fuel name or a fuel table range"),
              Arg("temp_c", "number", "°C", "fuel temperature"),
              Arg("oil_pct", "number", "% vol", "turbine oil in the fuel",
                  default=0.0, low=0, high=20, group=True)],
        returns=Returns("number", "kg/m³", "liquid density"),
        source="...")
    def fs_density(fuel, temp_c, oil_pct):
        return fuel.with_oil(oil_pct).density(temp_c + 273.15)

Argument kinds
--------------
``number``  a number or a range of numbers; broadcast element by element.
            ``low``/``high`` are inclusive bounds, ``gt``/``lt`` strict ones;
            ``integer=True`` asks for whole numbers.  ``group=True`` passes one
            Python float per distinct value instead of an array.
``text``    a text or a range of texts; always grouped (one str per call).
            ``choices`` lists the allowed values (compared case-insensitively).
``fuel``    one built-in fuel name, or a range holding a fuel table; the
            function receives a :class:`fuelsys.fuels.base.Fuel`.
``range``   a whole range of numbers, passed as one 1-D float array (empty
            cells dropped); bounds apply to every element.
``cells``   a whole range passed as it came (a 2-D list of cell values), for
            labelled tables such as a pump fit's coefficients.

Return kinds
------------
``number`` / ``text``  one value per broadcast element (same shape as the
                       inputs; a scalar when every input is a single cell).
``table``              a 2-D list (rows of numbers and texts); a 1x1 table is
                       given back as a single value.

Units declared once (``si=True``)
---------------------------------
Each declared unit string maps to the core's SI unit in :data:`UNITS` (an
exact factor as a fraction, plus an offset: ``si = value * num / den +
offset``).  A declaration made with ``spreadsheet_function(..., si=True)``
never converts by hand: the adapter checks every cell against the declared
bounds in the declared unit, converts ``number`` and ``range`` arguments
(and numeric defaults) to SI, calls the body **positionally** (so its
parameters may carry SI names such as ``T`` or ``dp``), and converts a
``number`` result -- or every number of a ``table`` whose Returns unit is not
"-" -- back into the declared unit.  The body is plain SI::

    @spreadsheet_function(
        name="FS_VISCOSITY", category="fuel", summary="...",
        args=[_FUEL, Arg("temp_c", "number", "°C", "fuel temperature", gt=-273.15), _OIL],
        returns=Returns("number", "mm²/s", "kinematic viscosity"),
        source="...", si=True)
    def fs_viscosity(fuel, T, oil_pct):
        f = fuel.with_oil(oil_pct)
        return f.kinematic_viscosity(f.check_temperature(T, "temp_c"))   # K in, m²/s out

Where the core wants a unit other than the table's first choice for a
declared unit, name it: ``Arg(..., si="Pa abs")`` on a "bar gauge" argument
gives the absolute pressure (gauge + the standard atmosphere) instead of the
gauge pressure in Pa; ``Returns(..., si="Pa abs")`` converts an absolute
result to gauge.  A labelled table of mixed units converts its numbers with
:func:`from_si` (``from_si(r.time, "min")``), naming the unit once per row.
A "bar abs" argument below :data:`GAUGE_SUSPECT_BAR_ABS` is refused as a
likely gauge value.  The docstring of an ``si=True`` body is generated from
its Spec (:meth:`Spec.docstring`); do not write a Parameters section by hand.
``tests/test_catalogue.py`` fails on any conversion literal (a power of ten,
60, 3600, 273.15, 101325 ...) or the constants T0_C / P_ATM in a migrated
``sheet/decl`` module.
"""

from __future__ import annotations

import importlib
import pkgutil
from dataclasses import dataclass, field
from typing import Callable

import numpy as np

from fuelsys.fuels.base import P_ATM, T0_C

#: marks an argument without a default (a required argument)
REQUIRED = object()

ARG_KINDS = ("number", "text", "fuel", "range", "cells")
RETURN_KINDS = ("number", "text", "table")
CATEGORIES = ("fuel", "needles and lines", "vaporiser", "combustor", "engine and pump", "gas", "about")

#: the longest description Excel's function wizard shows (xlwings cuts there)
WIZARD_MAX = 255

_NAME_OK = set("ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_")


@dataclass(frozen=True)
class Unit:
    """One way of turning a declared spreadsheet unit into the core's unit.

    ``core = value * num / den + offset``; ``num`` and ``den`` are kept apart
    so that the common cases (mm -> m: ``/ 1000``; bar -> Pa: ``* 1e5``) are
    one correctly rounded operation each way.
    """

    core: str
    num: float = 1.0
    den: float = 1.0
    offset: float = 0.0

    def to_core(self, x):
        if self.num != 1.0:
            x = x * self.num
        if self.den != 1.0:
            x = x / self.den
        return x + self.offset if self.offset else x

    def from_core(self, y):
        if self.offset:
            y = y - self.offset
        if self.den != 1.0:
            y = y * self.den
        if self.num != 1.0:
            y = y / self.num
        return y


def _same(core: str) -> tuple:
    return (Unit(core),)


#: declared spreadsheet unit -> the core units it converts to (the first is used unless an
#: Arg/Returns names another with ``si=``).  The single source of every factor of the face.
UNITS: dict[str, tuple] = {
    # temperature
    "°C": (Unit("K", offset=T0_C),),
    "K": _same("K"),                                       # a temperature difference
    # pressure: "bar" is a difference; gauge is relative to the standard atmosphere
    "bar": (Unit("Pa", num=1e5),),
    "bar abs": (Unit("Pa", num=1e5),),
    "bar gauge": (Unit("Pa gauge", num=1e5), Unit("Pa abs", num=1e5, offset=P_ATM)),
    "mbar": (Unit("Pa", num=1e2),),
    # length, volume, mass, time
    "m": _same("m"),
    "mm": (Unit("m", den=1e3),),
    "µm": (Unit("m", den=1e6),),
    "mL": (Unit("m³", den=1e6),),
    "g": (Unit("kg", den=1e3),),
    "s": _same("s"),
    "ms": (Unit("s", den=1e3),),
    "min": (Unit("s", num=60.0),),
    # flows
    "g/min": (Unit("kg/s", den=6e4),),
    "g/s": (Unit("kg/s", den=1e3),),
    "g/h": (Unit("kg/s", den=3.6e6),),
    "mL/min": (Unit("m³/s", den=6e7),),
    # shares
    "%": (Unit("1", den=1e2), Unit("%")),
    "% mass": (Unit("1", den=1e2),),
    "% of case pressure": (Unit("1", den=1e2),),
    "% vol": _same("% vol"),                               # Fuel.with_oil takes per cent by volume
    "kg/kg": _same("kg/kg"),
    "0-1 by mass": _same("1"),
    # properties
    "kg/m³": _same("kg/m³"),
    "mm²/s": (Unit("m²/s", den=1e6),),
    "kJ/kg": (Unit("J/kg", num=1e3),),
    "MJ/kg": (Unit("J/kg", num=1e6),),
    "kJ/(kg·K)": (Unit("J/(kg·K)", num=1e3),),
    "W/(m·K)": _same("W/(m·K)"),
    "mN/m": (Unit("N/m", den=1e3),),
    # machines
    "rpm": (Unit("rev/s", den=60.0),),
    "rpm/V": _same("rpm/V"),                               # motor constants are quoted so; pump.fit_pump takes it
    "V": _same("V"),
    "W": _same("W"),
    "Ω": _same("Ω"),
    "m/s": _same("m/s"),
}

#: an absolute pressure below this [bar abs] is refused as a likely gauge value: no engine
#: case, canister or regulator of a model turbine runs there (common practice, no source)
GAUGE_SUSPECT_BAR_ABS = 0.5
#: the standard atmosphere in bar, for the conversion hint of that message
ATM_BAR = P_ATM / 1e5


def unit_conversion(unit: str, si: str | None = None) -> Unit | None:
    """The :class:`Unit` taking ``unit`` to its core unit (``si`` picks one); None for "-"."""
    if unit == "-":
        return None
    try:
        choices = UNITS[unit]
    except KeyError:
        raise ValueError(f"unit {unit!r} is not in fuelsys.sheet.catalogue.UNITS; add it there "
                         "with its SI factor") from None
    if si is None:
        return choices[0]
    for c in choices:
        if c.core == si:
            return c
    raise ValueError(f"unit {unit!r} converts to {', '.join(c.core for c in choices)}, not {si!r}")


def to_si(value, unit: str, si: str | None = None):
    """``value`` in the declared ``unit`` -> the core unit (arrays broadcast)."""
    conv = unit_conversion(unit, si)
    return value if conv is None else conv.to_core(np.asarray(value, dtype=float) if not
                                                   isinstance(value, float) else value)


def from_si(value, unit: str, si: str | None = None):
    """``value`` in the core unit -> the declared ``unit`` (a float stays a float)."""
    conv = unit_conversion(unit, si)
    if conv is None:
        return value
    if isinstance(value, (int, float, np.floating, np.integer)) and not isinstance(value, bool):
        return float(conv.from_core(float(value)))
    return conv.from_core(np.asarray(value, dtype=float))


@dataclass(frozen=True)
class Arg:
    """One argument of a spreadsheet function.

    Parameters
    ----------
    name : str
        Argument name as shown in the spreadsheet, with its unit in it where it
        has one (``temp_c``, ``bore_mm``, ``p_bar_abs``).
    kind : str
        One of :data:`ARG_KINDS`.
    unit : str
        Unit of the value, "-" for dimensionless or texts.
    doc : str
        What the argument means, in a few words.
    default : object
        Value used when the argument is omitted or its cell is empty;
        :data:`REQUIRED` (the default) makes it required.
    low, high : float, optional
        Inclusive bounds.
    gt, lt : float, optional
        Strict bounds.
    integer : bool
        Whole numbers only.
    choices : tuple of str, optional
        Allowed texts for a ``text`` argument.
    group : bool
        For a ``number``: pass one float per distinct value (for values that
        select a model, such as ``oil_pct``), not an array.
    si : str, optional
        The core unit the body wants, when not the first of :data:`UNITS`
        for ``unit`` (``"Pa abs"`` for a "bar gauge" argument).
    """

    name: str
    kind: str
    unit: str
    doc: str
    default: object = REQUIRED
    low: float | None = None
    high: float | None = None
    gt: float | None = None
    lt: float | None = None
    integer: bool = False
    choices: tuple | None = None
    group: bool = False
    si: str | None = None

    def __post_init__(self):
        if self.kind not in ARG_KINDS:
            raise ValueError(f"argument {self.name}: kind {self.kind!r} is not one of {ARG_KINDS}")
        if not self.unit:
            raise ValueError(f"argument {self.name}: a unit is required ('-' when dimensionless)")
        if not self.doc:
            raise ValueError(f"argument {self.name}: a description is required")
        if self.si is not None:
            unit_conversion(self.unit, self.si)

    @property
    def conversion(self) -> "Unit | None":
        """How the adapter turns this argument into the core's unit (None: passed as it is)."""
        if self.kind not in ("number", "range") or self.unit == "-":
            return None
        return unit_conversion(self.unit, self.si)

    @property
    def core_unit(self) -> str:
        conv = self.conversion
        return self.unit if conv is None else conv.core

    @property
    def required(self) -> bool:
        return self.default is REQUIRED

    def range_text(self) -> str:
        """The allowed values in words, for messages and help."""
        parts = []
        if self.gt is not None:
            parts.append(f"> {self.gt:g}")
        if self.low is not None:
            parts.append(f">= {self.low:g}")
        if self.lt is not None:
            parts.append(f"< {self.lt:g}")
        if self.high is not None:
            parts.append(f"<= {self.high:g}")
        text = " and ".join(parts)
        if self.integer:
            text = ("a whole number " + text).strip()
        if self.choices:
            text = "one of " + ", ".join(self.choices)
        return text

    def wizard_text(self) -> str:
        """The argument's help for the function wizards, at most 255 characters (a long list of
        choices is left to FS_HELP)."""
        text = self.help_text()
        if len(text) > WIZARD_MAX and self.choices:
            unit = "" if self.unit == "-" else f" [{self.unit}]"
            opt = "" if self.required else ", optional"
            text = f"{self.name}{unit}: {self.doc}; one of {len(self.choices)} names (FS_HELP lists them){opt}"
        return text if len(text) <= WIZARD_MAX else text[:WIZARD_MAX - 1] + "…"

    def help_text(self) -> str:
        unit = "" if self.unit == "-" else f" [{self.unit}]"
        opt = "" if self.required else f", optional (default {self.default!r})" if self.default is not None else ", optional"
        rng = self.range_text()
        rng = f"; {rng}" if rng else ""
        return f"{self.name}{unit}: {self.doc}{rng}{opt}"


@dataclass(frozen=True)
class Returns:
    """What a spreadsheet function gives back: kind, unit and meaning."""

    kind: str
    unit: str
    doc: str
    si: str | None = None
    #: for tabulated data exact in the declared unit: round the converted result to this many
    #: decimals (0.39 mm stays 0.39, not 0.39000000000000001)
    decimals: int | None = None

    def __post_init__(self):
        if self.kind not in RETURN_KINDS:
            raise ValueError(f"return kind {self.kind!r} is not one of {RETURN_KINDS}")
        if not self.unit or not self.doc:
            raise ValueError("a return needs a unit ('-' when dimensionless) and a description")
        if self.si is not None:
            unit_conversion(self.unit, self.si)

    @property
    def conversion(self) -> "Unit | None":
        """How the adapter turns the body's result back into the declared unit (None: as it is)."""
        if self.kind == "text" or self.unit == "-":
            return None
        return unit_conversion(self.unit, self.si)


@dataclass(frozen=True)
class Spec:
    """A declared spreadsheet function."""

    name: str
    category: str
    summary: str
    args: tuple
    returns: Returns
    source: str
    impl: Callable = field(repr=False, compare=False)
    volatile: bool = False
    si: bool = False
    #: cell values of a documented call (inside every correlation's fitted range)
    example: tuple = ()

    @property
    def camel_name(self) -> str:
        """``FS_NEEDLE_FLOW`` -> ``fsNeedleFlow`` (for IDL, which refuses underscores)."""
        parts = self.name.lower().split("_")
        return parts[0] + "".join(p.capitalize() for p in parts[1:])

    @property
    def min_args(self) -> int:
        return sum(1 for a in self.args if a.required)

    def signature(self) -> str:
        """``FS_DENSITY(fuel, temp_c, [oil_pct])``."""
        names = [a.name if a.required else f"[{a.name}]" for a in self.args]
        return f"{self.name}({', '.join(names)})"

    def help_text(self) -> str:
        """One-line summary, then one line per argument with its unit, then the return."""
        unit = "" if self.returns.unit == "-" else f" [{self.returns.unit}]"
        lines = [f"{self.signature()}: {self.summary}."]
        lines += [f"  {a.help_text()}" for a in self.args]
        lines.append(f"  returns{unit}: {self.returns.doc}")
        return "\n".join(lines)

    def wizard_text(self) -> str:
        """One short description (at most 255 characters: Excel's function wizard cuts there) for
        the function wizards of Excel and LibreOffice: the summary and what it returns, in its unit."""
        unit = "" if self.returns.unit == "-" else f" [{self.returns.unit}]"
        text = f"{self.summary}. Returns {self.returns.doc}{unit}."
        if len(text) > WIZARD_MAX:
            text = f"{self.summary}. Returns{unit or ' ' + self.returns.kind}; FS_HELP gives more."
        if len(text) > WIZARD_MAX:
            text = text[:WIZARD_MAX - 1] + "…"
        return text

    def example_formula(self) -> str:
        """The documented example as a formula, ``=FS_DENSITY("kerosene", 20)``."""
        def cell(v):
            if isinstance(v, str):
                return '"' + v.replace('"', '""') + '"'
            if isinstance(v, (list, tuple)):
                rows = [r if isinstance(r, (list, tuple)) else [r] for r in v]
                return "{" + ";".join(",".join(cell(x) for x in r) for r in rows) + "}"
            return f"{v:g}" if isinstance(v, float) else str(v)
        return f"={self.name}(" + ", ".join(cell(v) for v in self.example) + ")"

    def docstring(self) -> str:
        """The numpydoc docstring of the body, generated from the declaration.

        For an ``si=True`` body the parameters are named as the body names them
        and carry the core unit the adapter passes; the cell argument and its
        declared unit are named beside each.
        """
        import inspect

        try:
            params = list(inspect.signature(self.impl).parameters)
        except (TypeError, ValueError):
            params = [a.name for a in self.args]
        lines = [f"{self.summary} (spreadsheet function {self.name}).", "",
                 f"Spreadsheet call: ``{self.signature()}``.", ""]
        if self.args:
            lines += ["Parameters", "----------"]
            for pname, a in zip(params, self.args):
                kind = {"number": "ndarray or float", "range": "ndarray", "text": "str", "fuel": "Fuel",
                        "cells": "list of lists"}[a.kind]
                if not a.required:
                    kind += ", optional"
                unit = a.core_unit if self.si else a.unit
                cell = f" (cell argument {a.name} [{a.unit}])" if self.si and pname != a.name else ""
                lines += [f"{pname} : {kind}", f"    {a.doc}{cell} [{unit}]"]
            lines.append("")
        r = self.returns
        conv = r.conversion if self.si else None
        unit = conv.core if conv is not None else r.unit
        shown = f" (the cell shows it in {r.unit})" if conv is not None else ""
        lines += ["Returns", "-------", {"number": "ndarray or float", "text": "str or ndarray",
                                         "table": "list of lists"}[r.kind],
                  f"    {r.doc}{shown} [{unit}]", "", "References", "----------", f"{self.source}."]
        return "\n".join(lines)


_REGISTRY: dict[str, Spec] = {}
_LOADED = False


def spreadsheet_function(*, name: str, category: str, summary: str, args, returns: Returns,
                         source: str, volatile: bool = False, si: bool = False, example: tuple = ()):
    """Declare a spreadsheet function (decorator).  See the module docstring.

    ``si=True``: the body works in SI; the adapter converts arguments and the
    result through :data:`UNITS`, and the body's docstring is generated.
    """

    def deco(fn):
        if not name.startswith("FS_") or not set(name) <= _NAME_OK:
            raise ValueError(f"{name}: spreadsheet names are FS_ plus capitals, digits and underscores")
        if name in _REGISTRY:
            raise ValueError(f"{name} is declared twice")
        if category not in CATEGORIES:
            raise ValueError(f"{name}: category {category!r} is not one of {CATEGORIES}")
        if not source:
            raise ValueError(f"{name}: the method's published source is required")
        seen_optional = False
        for a in args:
            if a.required and seen_optional:
                raise ValueError(f"{name}: required argument {a.name} after an optional one")
            seen_optional = seen_optional or not a.required
        if len({a.name for a in args}) != len(args):
            raise ValueError(f"{name}: argument names repeat")
        import inspect

        params = list(inspect.signature(fn).parameters)
        variadic = any(p.kind == p.VAR_POSITIONAL for p in inspect.signature(fn).parameters.values())
        if variadic:
            params = params[:-1] + [a.name for a in args[len(params) - 1:]]
        if len(params) != len(args):
            raise ValueError(f"{name}: the body takes {len(params)} parameters for {len(args)} arguments")
        if not si and params != [a.name for a in args]:
            raise ValueError(f"{name}: the body's parameters must be named as the arguments")
        if si:
            for a in args:
                a.conversion  # noqa: B018 -- raises for a unit missing from UNITS
            returns.conversion  # noqa: B018
        spec = Spec(name=name, category=category, summary=summary.rstrip("."), args=tuple(args),
                    returns=returns, source=source, impl=fn, volatile=volatile, si=si, example=tuple(example))
        _REGISTRY[name] = spec
        fn.spec = spec
        if si:
            fn.__doc__ = spec.docstring()
        return fn

    return deco


def _load() -> None:
    global _LOADED
    if _LOADED:
        return
    from fuelsys.sheet import decl

    for mod in sorted(pkgutil.iter_modules(decl.__path__), key=lambda m: m.name):
        importlib.import_module(f"{decl.__name__}.{mod.name}")
    _LOADED = True


def functions() -> dict[str, Spec]:
    """Every declared function, by spreadsheet name, in catalogue order (category, then name)."""
    _load()
    order = {c: i for i, c in enumerate(CATEGORIES)}
    return dict(sorted(_REGISTRY.items(), key=lambda kv: (order[kv[1].category], kv[0])))


def get(name: str) -> Spec:
    """The declaration of ``name`` (case-insensitive); KeyError if unknown."""
    _load()
    return _REGISTRY[str(name).strip().upper()]
