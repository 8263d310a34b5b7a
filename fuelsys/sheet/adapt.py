"""Run a catalogue function exactly as a spreadsheet cell would.

Cell values in: ``float``/``int`` for numbers, ``str`` for texts, ``bool``,
``None`` for an empty cell, and a 2-D list (rows of cells) for a range.
Cell values out: a ``float`` or ``str`` for one cell, a 2-D list for a range
or a table.  Nothing raises: every failure becomes a text that starts with
``FS error:`` and says what is wrong and what is allowed, in the cell that
failed and not in its neighbours.

How an element-wise call goes
-----------------------------
1. Each ``number``/``text`` argument becomes an array of values plus an array
   of per-element error texts (empty cell, text where a number belongs, value
   out of its declared range).
2. The arguments are broadcast together by numpy's rules (a row and a column
   give a grid, as the spreadsheet's own array formulas do).
3. Elements without an error are grouped by their grouped arguments (texts,
   ``group=True`` numbers) and the function runs once per group on 1-D
   arrays.
4. When the function refuses a group (:class:`FuelsysInputError`), the group
   is run again element by element so that only the bad elements show the
   error.  This slow path runs only when something is wrong.
5. Results that are not finite become error texts; never a silent NaN.
"""

from __future__ import annotations

import math
import sys
import warnings

import numpy as np

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.sheet import catalogue

ERROR_PREFIX = "FS error: "

#: When True, unexpected exceptions (bugs) propagate instead of becoming an
#: ``FS error: internal error`` text.  The test suite sets it.
STRICT = False


class CellError(Exception):
    """A whole-call error with the text to show in the cell."""


def error_text(message: str) -> str:
    message = str(message).strip()
    return message if message.startswith(ERROR_PREFIX) else ERROR_PREFIX + message


def is_error(value) -> bool:
    """True for an ``FS error:`` text."""
    return isinstance(value, str) and value.startswith(ERROR_PREFIX)


# ---------------------------------------------------------------------------
# cell values -> arrays

def _is_range(value) -> bool:
    return isinstance(value, (list, tuple, np.ndarray)) and not isinstance(value, str)


def _as_grid(value) -> list[list]:
    """A range as a rectangular list of rows (a flat list is one column)."""
    if isinstance(value, np.ndarray):
        value = value.tolist()
    rows = list(value)
    if not rows:
        raise CellError("an empty range was given")
    if type(rows[0]) is list:  # the usual shape: rows as lists, checked without a call per row
        width = len(rows[0])
        if width and all(map(list.__instancecheck__, rows)) and len(set(map(len, rows))) == 1:
            return rows
    if not all(_is_range(r) for r in rows):
        rows = [[r] for r in rows]
    rows = [list(r.tolist() if isinstance(r, np.ndarray) else r) for r in rows]
    width = len(rows[0])
    if width == 0 or any(len(r) != width for r in rows):
        raise CellError("a range must be rectangular")
    return rows


def _describe(value) -> str:
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, str):
        return f'text "{value[:30]}"'
    return repr(value)


def _number_or_error(arg: catalogue.Arg, value):
    """One cell -> (float, None) or (nan, message)."""
    unit = "" if arg.unit == "-" else f" in {arg.unit}"
    if value is None or (isinstance(value, str) and value.strip() == ""):
        return math.nan, f"{arg.name} is empty; a number{unit} is required"
    if isinstance(value, bool) or not isinstance(value, (int, float, np.integer, np.floating)):
        if is_error(value):
            return math.nan, f"{arg.name} refers to a cell that failed ({value[len(ERROR_PREFIX):]})"
        return math.nan, f"{arg.name} must be a number{unit} (got {_describe(value)})"
    try:
        x = float(value)
    except OverflowError:  # a Python int beyond the largest float
        return math.nan, _too_large_text(arg, value)
    if not math.isfinite(x):
        return math.nan, f"{arg.name} must be a finite number{unit} (got {x})"
    rng = arg.range_text()
    u = "" if arg.unit == "-" else f" {arg.unit}"
    if ((arg.gt is not None and not x > arg.gt) or (arg.lt is not None and not x < arg.lt)
            or (arg.low is not None and x < arg.low) or (arg.high is not None and x > arg.high)
            or (arg.integer and x != round(x))):
        return math.nan, f"{arg.name} must be {rng}{u} (got {x:g})"
    if arg.unit == "bar abs" and x < catalogue.GAUGE_SUSPECT_BAR_ABS:
        return math.nan, _gauge_suspect_text(arg.name, x)
    return x, None


def _too_large_text(arg: catalogue.Arg, value) -> str:
    unit = "" if arg.unit == "-" else f" in {arg.unit}"
    digits = len(str(abs(int(value))))
    return (f"{arg.name} must be a finite number{unit} (got a whole number of {digits} digits, beyond the "
            f"largest number a spreadsheet cell holds, about 1.8e308)")


def _huge_int(v) -> bool:
    return isinstance(v, int) and not isinstance(v, bool) and abs(v) > _FLOAT_MAX


_FLOAT_MAX = sys.float_info.max


def _gauge_suspect_text(name: str, x: float) -> str:
    atm = catalogue.ATM_BAR
    return (f"{name} = {x:g} bar abs looks like a gauge value: no engine case, canister or regulator runs "
            f"below {catalogue.GAUGE_SUSPECT_BAR_ABS:g} bar abs. Absolute = gauge + {atm:g} "
            f"(a gauge {x:g} bar is {x + atm:g} bar abs)")


def _text_or_error(arg: catalogue.Arg, value):
    if value is None or (isinstance(value, str) and value.strip() == ""):
        allowed = f" ({arg.range_text()})" if arg.choices else ""
        return None, f"{arg.name} is empty; a text is required{allowed}"
    if not isinstance(value, str):
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            value = str(value) if _huge_int(value) else f"{value:g}"
        else:
            return None, f"{arg.name} must be a text (got {_describe(value)})"
    if is_error(value):
        return None, f"{arg.name} refers to a cell that failed ({value[len(ERROR_PREFIX):]})"
    text = value.strip()
    if arg.choices:
        low = {c.lower(): c for c in arg.choices}
        if text.lower() not in low:
            return None, f"{arg.name} must be {arg.range_text()} (got \"{text[:30]}\")"
        text = low[text.lower()]
    return text, None


def _numbers_fast(arg: catalogue.Arg, grid):
    """A range of numbers checked with array operations; messages built only for failing cells.
    None when a cell is not a plain number (the per-cell path then handles it)."""
    for row in grid:
        for v in row:
            t = type(v)
            if t is not float and t is not int:
                return None
    try:
        vals = np.array(grid, dtype=float)
    except (OverflowError, ValueError):
        return None
    bad = ~np.isfinite(vals)
    if arg.gt is not None:
        bad |= ~(vals > arg.gt)
    if arg.lt is not None:
        bad |= ~(vals < arg.lt)
    if arg.low is not None:
        bad |= vals < arg.low
    if arg.high is not None:
        bad |= vals > arg.high
    if arg.integer:
        bad |= vals != np.round(vals)
    if arg.unit == "bar abs":
        bad |= vals < catalogue.GAUGE_SUSPECT_BAR_ABS
    errs = np.full(vals.shape, None, dtype=object)
    if bad.any():
        for i, j in zip(*np.nonzero(bad)):
            vals[i, j], errs[i, j] = _number_or_error(arg, grid[i][j])
    return vals, errs


def _elementwise_arg(arg: catalogue.Arg, value):
    """-> (values array, errors object array), both of the cell's shape."""
    conv = _number_or_error if arg.kind == "number" else _text_or_error
    if _is_range(value):
        grid = _as_grid(value)
        if arg.kind == "number":
            fast = _numbers_fast(arg, grid)
            if fast is not None:
                return fast
        pairs = [[conv(arg, v) for v in row] for row in grid]
        dtype = float if arg.kind == "number" else object
        vals = np.array([[p[0] for p in row] for row in pairs], dtype=dtype)
        errs = np.array([[p[1] for p in row] for row in pairs], dtype=object)
        return vals, errs
    v, e = conv(arg, value)
    return np.array(v, dtype=float if arg.kind == "number" else object), np.array(e, dtype=object)


def _blank(v) -> bool:
    return v is None or (isinstance(v, str) and v.strip() == "")


def _range_arg(arg: catalogue.Arg, value) -> np.ndarray:
    """A whole range as a 1-D array, in reading order.

    Blank cells after the last number are dropped (a range may be drawn
    larger than the data), but a blank between numbers is refused: the values
    are positions (needle 3, test point 5) and dropping one would move every
    later value to the wrong row.
    """
    if not _is_range(value) and _blank(value):
        raise CellError(f"{arg.name} is empty; a number in {arg.unit} is required")
    grid = _as_grid(value) if _is_range(value) else [[value]]
    flat = [v for row in grid for v in row]
    while flat and _blank(flat[-1]):
        flat.pop()
    if not flat:
        raise CellError(f"{arg.name} holds no numbers; a range of numbers in {arg.unit} is required")
    out = []
    for k, v in enumerate(flat, start=1):
        if _blank(v):
            raise CellError(f"{arg.name}: cell {k} of the range is empty; fill it, or end the range before it "
                            "(a gap would move the later values to the wrong rows)")
        x, err = _number_or_error(arg, v)
        if err:
            raise CellError(err)
        out.append(x)
    return np.array(out, dtype=float)


def _cells_arg(arg: catalogue.Arg, value) -> list[list]:
    """A ``cells`` range as rows of cell values; a whole number no float can hold is refused here."""
    grid = _as_grid(value) if _is_range(value) else [[value]]
    for row in grid:
        for v in row:
            if _huge_int(v):
                raise CellError(_too_large_text(arg, v))
    return grid


def _fuel_arg(arg: catalogue.Arg, value):
    from fuelsys.fuels import get_fuel

    if value is None or (isinstance(value, str) and not value.strip()):
        raise CellError(f"{arg.name} is empty; a fuel name or a fuel table range is required")
    if is_error(value):
        raise CellError(f"{arg.name} refers to a cell that failed ({value[len(ERROR_PREFIX):]})")
    if _is_range(value):
        grid = _as_grid(value)
        if len(grid) == 1 and len(grid[0]) == 1:
            return _fuel_arg(arg, grid[0][0])
        if len(grid[0]) < 2:
            raise CellError(f"{arg.name}: a fuel table needs two columns (label, value)")
        return get_fuel([row[:2] for row in grid])
    if not isinstance(value, str):
        raise CellError(f"{arg.name} must be a fuel name or a fuel table range (got {_describe(value)})")
    name = value.strip()
    if "/" in name or "\\" in name or name.lower().endswith((".csv", ".json")):
        # a workbook must not make fuelsys read files: tables come as ranges
        raise CellError(f"{arg.name}: in a spreadsheet a fuel is a built-in name or a range holding a fuel "
                        "table; fuel files are read only through the Python API")
    return get_fuel(name)


# ---------------------------------------------------------------------------
# results -> cell values

def _cell_out(x, returns_kind: str):
    """One result element -> a cell value (float, str) or an error text."""
    if isinstance(x, (str, np.str_)):
        return str(x)
    if x is None:
        return ""
    if isinstance(x, (bool, np.bool_)):
        return bool(x)
    try:
        f = float(x)
    except (TypeError, ValueError):
        return error_text(f"internal error: result of type {type(x).__name__}")
    if not math.isfinite(f):
        return error_text("no finite result for these inputs (the calculation is undefined here)")
    return f


def _table_out(result) -> object:
    if isinstance(result, np.ndarray):
        result = result.tolist()
    if not _is_range(result):
        return _cell_out(result, "table")
    rows = [list(r) if _is_range(r) else [r] for r in result]
    out = [[_cell_out(v, "table") for v in row] for row in rows]
    width = max(len(r) for r in out) if out else 0
    out = [r + [""] * (width - len(r)) for r in out]
    if len(out) == 1 and len(out[0]) == 1:
        return out[0][0]
    return out


# ---------------------------------------------------------------------------
# the call

def _bind(spec: catalogue.Spec, cells: tuple) -> list:
    if len(cells) > len(spec.args):
        raise CellError(f"{spec.name} takes at most {len(spec.args)} arguments (got {len(cells)}): {spec.signature()}")
    values = list(cells) + [None] * (len(spec.args) - len(cells))
    bound = []
    for arg, v in zip(spec.args, values):
        if _is_range(v) and arg.kind not in ("range", "cells") and len(v) == 1:
            try:  # a single-cell range holding an empty cell is an empty cell (xlwings passes [[None]])
                grid = _as_grid(v)
                if len(grid) == 1 and len(grid[0]) == 1 and _blank(grid[0][0]):
                    v = None
            except CellError:
                pass
        empty = v is None or (isinstance(v, str) and v == "")
        if empty and not arg.required:
            v = _Default(arg.default)
        elif empty and arg.required and len(cells) <= spec.args.index(arg):
            raise CellError(f"{arg.name} is missing: {spec.signature()}")
        bound.append(v)
    return bound


class _Default:
    """An omitted optional argument: its declared default, passed as it is."""

    __slots__ = ("value",)

    def __init__(self, value):
        self.value = value


#: where the validity notes of calls go while a caller collects them (see :func:`collect_notes`)
_note_sink = None


def set_note_sink(sink):
    """Send the validity notes of the following calls to list ``sink`` (None: drop them); returns the old sink.

    A cell's value stays a plain number; a caller that wants to know which cells
    were computed outside a correlation's fitted range (the headless engine's
    ``--notes``) collects the texts of the :class:`ValidityWarning` s here.
    """
    global _note_sink
    old, _note_sink = _note_sink, sink
    return old


def _table_from_si(table, conv):
    """Every number of a table (not texts, not flags) from the core unit into the declared one."""
    if isinstance(table, np.ndarray):
        table = table.tolist()
    if not _is_range(table):
        if isinstance(table, (int, float, np.integer, np.floating)) and not isinstance(table, (bool, np.bool_)):
            return float(conv.from_core(float(table)))
        return table
    return [_table_from_si(row, conv) for row in table]


#: per spec (by id, the spec kept beside it): the argument and result conversions
_CONVERSIONS: dict = {}


def _invoke(spec, kwargs):
    """The body on arguments in declared units; for ``si=True`` the conversions both ways."""
    if not spec.si:
        return spec.impl(**kwargs)
    convs = _CONVERSIONS.get(id(spec))
    if convs is None or convs[0] is not spec:
        convs = _CONVERSIONS[id(spec)] = (spec, [(a.name, a.conversion) for a in spec.args],
                                          spec.returns.conversion)
    args = []
    for name, conv in convs[1]:
        v = kwargs[name]
        if conv is not None and v is not None:
            v = conv.to_core(v if isinstance(v, (float, np.ndarray)) else np.asarray(v, dtype=float))
        args.append(v)
    res = spec.impl(*args)
    conv = convs[2]
    if conv is None:
        return res
    if spec.returns.kind == "table":
        return _table_from_si(res, conv)
    out = conv.from_core(np.asarray(res, dtype=float))
    if spec.returns.decimals is not None:
        out = np.round(out, spec.returns.decimals)
    return float(out) if out.ndim == 0 else out


def _run(spec, kwargs):
    if _note_sink is None:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            return _invoke(spec, kwargs)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        try:
            return _invoke(spec, kwargs)
        finally:
            for w in caught:
                if issubclass(w.category, ValidityWarning):
                    _note_sink.append(f"{spec.name}: {w.message}")


def _call_table(spec, bound):
    kwargs = {}
    for arg, v in zip(spec.args, bound):
        if isinstance(v, _Default):
            kwargs[arg.name] = _fuel_arg(arg, v.value) if arg.kind == "fuel" and v.value is not None else v.value
        elif arg.kind == "cells":
            kwargs[arg.name] = _cells_arg(arg, v) if v is not None else None
        elif arg.kind == "range":
            kwargs[arg.name] = _range_arg(arg, v)
        elif arg.kind == "fuel":
            kwargs[arg.name] = _fuel_arg(arg, v)
        else:
            if _is_range(v):
                grid = _as_grid(v)
                if len(grid) != 1 or len(grid[0]) != 1:
                    raise CellError(f"{arg.name} must be a single cell for {spec.name} "
                                    f"(got a {len(grid)}x{len(grid[0])} range)")
                v = grid[0][0]
            conv = _number_or_error if arg.kind == "number" else _text_or_error
            x, err = conv(arg, v)
            if err:
                raise CellError(err)
            kwargs[arg.name] = x
    return _table_out(_run(spec, kwargs))


def _call_elementwise(spec, bound):
    fixed = {}
    ew_names, ew_vals, ew_errs = [], [], []
    for arg, v in zip(spec.args, bound):
        if isinstance(v, _Default):
            fixed[arg.name] = _fuel_arg(arg, v.value) if arg.kind == "fuel" and v.value is not None else v.value
        elif arg.kind == "fuel":
            fixed[arg.name] = _fuel_arg(arg, v)
        elif arg.kind == "range":
            fixed[arg.name] = _range_arg(arg, v)
        elif arg.kind == "cells":
            fixed[arg.name] = _cells_arg(arg, v)
        else:
            vals, errs = _elementwise_arg(arg, v)
            ew_names.append(arg.name)
            ew_vals.append(vals)
            ew_errs.append(errs)
    try:
        shape = np.broadcast_shapes(*[a.shape for a in ew_vals]) if ew_vals else ()
    except ValueError:
        raise CellError("the ranges given have shapes that do not fit together: "
                        + ", ".join(f"{n} {a.shape[0]}x{a.shape[1]}" for n, a in zip(ew_names, ew_vals) if a.ndim == 2))
    n = int(np.prod(shape)) if shape else 1
    single = [a.ndim == 0 for a in ew_vals]  # one cell: passed as one value, not spread over the range
    vals = [np.broadcast_to(a, shape).reshape(n) for a in ew_vals]
    errs = [np.broadcast_to(e, shape).reshape(n) for e in ew_errs]
    out = np.empty(n, dtype=object)
    bad = np.zeros(n, dtype=bool)
    for e in errs:  # first failing argument (in order) names the error
        m = (e != None) & ~bad  # noqa: E711 -- elementwise test on an object array
        out[m] = [error_text(t) for t in e[m]]
        bad |= m
    ok = np.flatnonzero(~bad)
    if ok.size:
        args = {a.name: a for a in spec.args}
        grouped = [i for i, nm in enumerate(ew_names) if args[nm].group or args[nm].kind == "text"]
        keys = [tuple(vals[i][j] for i in grouped) for j in ok] if grouped else None
        groups = {}
        if keys is None:
            groups[()] = ok
        else:
            for j, k in zip(ok, keys):
                groups.setdefault(k, []).append(j)
        for key, idx in groups.items():
            idx = np.asarray(idx)
            kw = dict(fixed)
            for i, nm in enumerate(ew_names):
                if i in grouped:
                    kw[nm] = vals[i][idx[0]]
                    if args[nm].kind == "number":
                        kw[nm] = float(kw[nm])
                elif single[i] and shape != ():
                    kw[nm] = float(ew_vals[i])
                else:
                    kw[nm] = (vals[i] if idx.size == n else vals[i][idx]).astype(float)
            _run_group(spec, kw, idx, [ew_names[i] for i in range(len(ew_names))
                                       if i not in grouped and not (single[i] and shape != ())], out)
    if shape == ():
        return out[0]
    res = out.reshape(shape)
    if res.ndim == 1:
        res = res.reshape(-1, 1)
    return res.tolist()


def _run_group(spec, kw, idx, array_names, out):
    try:
        res = _run(spec, kw)
        if spec.returns.kind == "number":
            arr = np.asarray(res)
            if arr.dtype.kind in "fiu":
                arr = np.broadcast_to(arr.astype(float, copy=False), (idx.size,))
                fin = np.isfinite(arr)
                out[idx[fin]] = arr[fin].tolist() if not fin.all() else arr.tolist()
                if not fin.all():
                    out[idx[~fin]] = _cell_out(math.nan, "number")
                return
        res = np.broadcast_to(np.asarray(res, dtype=object if spec.returns.kind == "text" else None), (idx.size,))
        for j, r in zip(idx, res.tolist()):
            out[j] = _cell_out(r, spec.returns.kind)
        return
    except (FuelsysInputError, CellError) as exc:
        if idx.size == 1:
            out[idx[0]] = error_text(str(exc))
            return
    # locate the failing elements one by one (only after a refusal)
    for k, j in enumerate(idx):
        one = dict(kw)
        for nm in array_names:
            one[nm] = kw[nm][k:k + 1]
        _run_group(spec, one, np.array([j]), array_names, out)


class _Plan:
    """What the fast path needs of a spec, worked out once: per argument its kind, bounds and
    converted default."""

    __slots__ = ("args", "defaults", "simple")

    def __init__(self, spec):
        self.args = spec.args
        self.defaults = []
        for a in spec.args:
            d = a.default
            if a.required or d is None:
                self.defaults.append(d)
            elif a.kind == "fuel":
                self.defaults.append(_fuel_arg(a, d))
            else:
                self.defaults.append(d)
        # the fast path takes element-wise functions whose arguments are numbers, texts and fuels
        self.simple = spec.returns.kind != "table" and all(a.kind in ("number", "text", "fuel") for a in spec.args)


_PLANS: dict = {}
_FUELS: dict = {}
_NUM = (float, int)


def _plan(spec) -> _Plan:
    plan = _PLANS.get(spec.name)
    if plan is None or plan.args is not spec.args:
        plan = _PLANS[spec.name] = _Plan(spec)
    return plan


def _fast_number(a, v):
    """A valid number cell as a float, or None (the slow path then builds the message)."""
    t = type(v)
    if t is not float and t is not int:
        return None
    if t is int and not -_FLOAT_MAX <= v <= _FLOAT_MAX:
        return None
    x = float(v)
    if x != x or x in (math.inf, -math.inf):
        return None
    if ((a.gt is not None and not x > a.gt) or (a.lt is not None and not x < a.lt)
            or (a.low is not None and x < a.low) or (a.high is not None and x > a.high)
            or (a.integer and x != round(x)) or (a.unit == "bar abs" and x < catalogue.GAUGE_SUSPECT_BAR_ABS)):
        return None
    return x


def _fast_single(spec, cells):
    """All arguments single valid cells: one call on floats, no arrays, no grouping.  Returns
    ``_SLOW`` when anything needs the general path (a range, an empty or bad cell ...)."""
    plan = _plan(spec)
    if not plan.simple or len(cells) > len(spec.args):
        return _SLOW
    kw = {}
    n = len(cells)
    for k, a in enumerate(spec.args):
        v = cells[k] if k < n else None
        if type(v) in (list, tuple, np.ndarray):
            return _SLOW
        if v is None or (type(v) is str and v == ""):
            if a.required:
                return _SLOW
            kw[a.name] = plan.defaults[k]
            continue
        kind = a.kind
        if kind == "number":
            x = _fast_number(a, v)
            if x is None:
                return _SLOW
            kw[a.name] = x
        elif kind == "text":
            if type(v) is not str or v.startswith(ERROR_PREFIX):
                return _SLOW
            text = v.strip()
            if not text:
                return _SLOW
            if a.choices:
                key = text.lower()
                match = [c for c in a.choices if c.lower() == key]
                if not match:
                    return _SLOW
                text = match[0]
            kw[a.name] = text
        else:  # fuel: a built-in name, looked up once
            if type(v) is not str:
                return _SLOW
            fuel = _FUELS.get(v)
            if fuel is None:
                fuel = _fuel_arg(a, v)
                if len(_FUELS) < 256:
                    _FUELS[v] = fuel
            kw[a.name] = fuel
    try:
        res = _run(spec, kw)
    except (FuelsysInputError, CellError) as exc:
        return error_text(str(exc))
    if spec.returns.kind == "text":
        return _cell_out(res if isinstance(res, str) else np.asarray(res, dtype=object).reshape(-1)[0], "text")
    res = np.asarray(res, dtype=float)
    if res.size != 1:
        return _SLOW
    return _cell_out(res.reshape(-1)[0], "number")


_SLOW = object()


def call_spec(spec: catalogue.Spec, *cells):
    """Run ``spec`` on cell values; see the module docstring."""
    try:
        out = _fast_single(spec, cells)
        if out is not _SLOW:
            return out
        bound = _bind(spec, cells)
        if spec.returns.kind == "table":
            return _call_table(spec, bound)
        return _call_elementwise(spec, bound)
    except (CellError, FuelsysInputError) as exc:
        return error_text(str(exc))
    except Exception as exc:  # a spreadsheet function never crashes its host
        if STRICT:
            raise
        return error_text(f"internal error in {spec.name} ({type(exc).__name__}: {exc})")


def call(name: str, *cells):
    """Run the spreadsheet function ``name`` on cell values, as a cell would.

    Examples
    --------
    >>> from fuelsys.sheet import call
    >>> call("FS_VERSION").startswith("fuelsys ")
    True
    """
    try:
        spec = catalogue.get(name)
    except KeyError:
        return error_text(f"unknown function {str(name)[:40]}; see FS_HELP() for the list")
    return call_spec(spec, *cells)


def call_with_notes(spec: catalogue.Spec, *cells):
    """Run ``spec`` as :func:`call_spec` does; also give the validity notes of that call.

    Returns ``(result, notes)``: the cell result and the distinct note texts in
    the order they came, each ``"FS_NAME: correlation: quantity value outside
    its range low..high [unit] ..."`` -- the texts ``fuelsys recalc --notes``
    lists.  The notes stay with this call: they do not reach an outer sink.
    """
    sink = []
    outer = set_note_sink(sink)
    try:
        out = call_spec(spec, *cells)
    finally:
        set_note_sink(outer)
    return out, list(dict.fromkeys(sink))


def notes_text(spec: catalogue.Spec, *cells) -> str:
    """FS_NOTES' text: "ok", the notes of the call one per line, or the call's own FS error text."""
    out, notes = call_with_notes(spec, *cells)
    if is_error(out):
        return out
    return "\n".join(notes) if notes else "ok"
