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
"""

from __future__ import annotations

import importlib
import pkgutil
from dataclasses import dataclass, field
from typing import Callable

#: marks an argument without a default (a required argument)
REQUIRED = object()

ARG_KINDS = ("number", "text", "fuel", "range", "cells")
RETURN_KINDS = ("number", "text", "table")
CATEGORIES = ("fuel", "needles and lines", "vaporiser", "combustor", "engine and pump", "gas", "about")

_NAME_OK = set("ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_")


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

    def __post_init__(self):
        if self.kind not in ARG_KINDS:
            raise ValueError(f"argument {self.name}: kind {self.kind!r} is not one of {ARG_KINDS}")
        if not self.unit:
            raise ValueError(f"argument {self.name}: a unit is required ('-' when dimensionless)")
        if not self.doc:
            raise ValueError(f"argument {self.name}: a description is required")

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

    def __post_init__(self):
        if self.kind not in RETURN_KINDS:
            raise ValueError(f"return kind {self.kind!r} is not one of {RETURN_KINDS}")
        if not self.unit or not self.doc:
            raise ValueError("a return needs a unit ('-' when dimensionless) and a description")


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


_REGISTRY: dict[str, Spec] = {}
_LOADED = False


def spreadsheet_function(*, name: str, category: str, summary: str, args, returns: Returns,
                         source: str, volatile: bool = False):
    """Declare a spreadsheet function (decorator).  See the module docstring."""

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
        spec = Spec(name=name, category=category, summary=summary.rstrip("."), args=tuple(args),
                    returns=returns, source=source, impl=fn, volatile=volatile)
        _REGISTRY[name] = spec
        fn.spec = spec
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
