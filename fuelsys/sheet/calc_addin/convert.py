"""UNO values in, cell values out: what the Calc component does around each call.

Calc hands an ``any`` argument to the component as:

- ``float`` for a number (a single cell or a constant; a single *empty* cell
  given as an argument arrives as 0.0, which is Calc's own rule for a
  reference to an empty cell passed by value),
- ``str`` for a text,
- a tuple of row tuples for a range (an empty cell inside it arrives as
  ``""``, as does a formula's empty text; both become ``None``, an empty
  cell, as the built-in engine reads them),
- ``None`` for an omitted argument.

:func:`call` turns these into the cell values of
:func:`fuelsys.sheet.adapt.call_spec` (floats, texts, ``None`` for empty, 2-D
lists for ranges), runs the function there, and turns the result back into
rows of cells (the methods return ``sequence< sequence< any > >``; a single
value is one row of one cell, which Calc shows as a plain value).  Calc has
no boolean cell type, so a boolean result becomes 1.0 or 0.0, as Calc's own
TRUE and FALSE are.
"""

from __future__ import annotations

from fuelsys.sheet import adapt, catalogue


def from_uno(value):
    """One UNO argument -> a cell value for :func:`~fuelsys.sheet.adapt.call_spec`."""
    if value is None:
        return None
    if isinstance(value, bool):
        return value
    if isinstance(value, (int, float)):
        return float(value)
    if isinstance(value, str):
        return value
    if isinstance(value, (tuple, list)):
        if value and all(isinstance(r, (tuple, list)) for r in value):
            return [[_from_uno_cell(c) for c in row] for row in value]
        return [_from_uno_cell(c) for c in value]
    return value  # anything else: call_spec says in the cell what it got


def _from_uno_cell(value):
    if value is None or value == "":  # Calc passes an empty cell inside a range as ""
        return None
    if isinstance(value, bool):
        return value
    if isinstance(value, (int, float)):
        return float(value)
    return value


def _to_uno_cell(value):
    if isinstance(value, bool):
        return 1.0 if value else 0.0
    if isinstance(value, (int, float)):
        return float(value)
    if value is None:
        return ""
    return str(value)


def to_uno(result):
    """A call_spec result -> a tuple of row tuples (one row of one cell for a single value)."""
    if isinstance(result, (list, tuple)):
        rows = [r if isinstance(r, (list, tuple)) else [r] for r in result]
        return tuple(tuple(_to_uno_cell(v) for v in row) for row in rows)
    return ((_to_uno_cell(result),),)


def call_spec_uno(spec: catalogue.Spec, args) -> tuple:
    """Run ``spec`` on the UNO arguments Calc passed; rows of cells back."""
    cells = [from_uno(a) for a in args]
    while cells and cells[-1] is None:  # Calc passes every argument; trailing omitted ones are absent
        cells.pop()
    return to_uno(adapt.call_spec(spec, *cells))


def call(name: str, args) -> tuple:
    """Run the catalogue function ``name`` on the UNO arguments Calc passed; rows of cells back."""
    try:
        spec = catalogue.get(name)
    except KeyError:
        return to_uno(adapt.error_text(f"{name} is in the installed extension but not in this fuelsys "
                                       "(rebuild and reinstall the extension: fuelsys libreoffice install)"))
    return call_spec_uno(spec, args)
