"""Spreadsheet values, their conversion rules, the operators and the built-in functions.

This module is the "spreadsheet semantics" half of the headless engine
(:mod:`fuelsys.sheet.evaluate` is the parsing and ordering half).  Every rule
copies the documented behaviour of the spreadsheet's own engine:

* operators and their precedence -- Microsoft, "Calculation operators and
  precedence in Excel": negation binds tighter than ``^``, ``^`` goes left to
  right, ``%`` divides by 100, ``&`` joins texts;
* comparisons -- numbers < texts < booleans, texts compared without regard to
  case, numbers compared on their 15 significant digits (Microsoft, "Floating-
  point arithmetic may give inaccurate results in Excel": Excel keeps 15
  significant digits);
* number to text -- up to 15 significant digits, ``TRUE``/``FALSE`` for
  booleans;
* errors propagate through operators and functions; IFERROR catches them
  (Microsoft, "IFERROR function");
* ROUND halves away from zero (Microsoft, "ROUND function"), applied to the
  15-significant-digit decimal form of the number, so ``ROUND(1.005, 2)`` is
  1.01 as the spreadsheet shows;
* MIN, MAX, SUM and AVERAGE skip texts, booleans and empty cells inside
  ranges and arrays but convert a text or boolean typed as an argument
  (Microsoft, "SUM function", "MIN function", "AVERAGE function");
* CONVERT's unit names and prefixes are the spreadsheet's (Microsoft,
  "CONVERT function"); the factors are the exact definitions of NIST SP 811
  (2008), Appendix B.

Values
------
``float`` numbers, ``str`` texts, ``bool`` booleans, ``None`` for an empty cell,
:class:`XlError` for the spreadsheet's error values and :class:`Array` for a
range or an array (2-D).  An ``FS error: ...`` text from a catalogue function is
an ordinary text: arithmetic on it gives ``#VALUE!``.
"""

from __future__ import annotations

import math
import re
from bisect import bisect_right
from dataclasses import dataclass
from decimal import ROUND_DOWN, ROUND_HALF_UP, ROUND_UP, Context, Decimal, InvalidOperation
from typing import Callable


# ---------------------------------------------------------------------------
# values

class XlError:
    """One of the spreadsheet's error values (``#DIV/0!``, ``#VALUE!`` ...)."""

    __slots__ = ("code",)

    def __init__(self, code: str):
        self.code = code

    def __repr__(self):
        return self.code

    __str__ = __repr__

    def __eq__(self, other):
        return isinstance(other, XlError) and other.code == self.code

    def __hash__(self):
        return hash(("XlError", self.code))


ERROR_CODES = ("#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A",
               "#GETTING_DATA", "#SPILL!", "#CALC!")
_ERRORS = {c: XlError(c) for c in ERROR_CODES}
NULL = _ERRORS["#NULL!"]
DIV0 = _ERRORS["#DIV/0!"]
VALUE = _ERRORS["#VALUE!"]
REF = _ERRORS["#REF!"]
NAME = _ERRORS["#NAME?"]
NUM = _ERRORS["#NUM!"]
NA = _ERRORS["#N/A"]


def error(code: str) -> XlError:
    """The error value for ``code`` (``"#DIV/0!"``); unknown codes are kept as they are."""
    return _ERRORS.get(code.upper()) or XlError(code)


class Array:
    """A rectangular block of values: a range (``is_ref``) or an array.

    ``rows`` holds the values that exist; a whole-column reference keeps its
    nominal size in ``nrows``/``ncols`` while ``rows`` stops at the sheet's last
    used row (everything after it is empty, read back as ``None``).
    """

    __slots__ = ("rows", "nrows", "ncols", "is_ref", "sheet", "r0", "c0", "clipped", "numbers")

    def __init__(self, rows, nrows=None, ncols=None, is_ref=False, sheet=None, r0=1, c0=1, clipped=False):
        self.clipped = clipped  # a whole column or row, stored only as far as the sheet is used
        self.rows = rows
        self.nrows = len(rows) if nrows is None else nrows
        self.ncols = (len(rows[0]) if rows else 0) if ncols is None else ncols
        self.is_ref = is_ref
        self.sheet = sheet
        self.r0 = r0
        self.c0 = c0
        self.numbers = None  # MATCH's index of the numbers, built on first use (see _numbers_of)

    def at(self, i: int, j: int):
        rows = self.rows
        if i < len(rows):
            row = rows[i]
            if j < len(row):
                return row[j]
        return None

    def values(self):
        """Every stored value, row by row (empty cells beyond the used area are left out)."""
        for row in self.rows:
            yield from row

    def full_rows(self) -> list:
        """All rows at the nominal size (empty cells as ``None``)."""
        return [[self.at(i, j) for j in range(self.ncols)] for i in range(self.nrows)]

    def __repr__(self):
        return f"Array({self.nrows}x{self.ncols}, ref={self.is_ref})"


class _Missing:
    """An argument left out between commas, as in ``IF(A1,,2)``."""

    __slots__ = ()

    def __repr__(self):
        return "MISSING"


MISSING = _Missing()

#: the longest text a cell can hold (Microsoft, "Excel specifications and limits")
MAX_TEXT = 32767


# ---------------------------------------------------------------------------
# conversions

_NUM_TEXT = re.compile(r"\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(%?)\s*\Z")


def to_number(v):
    """A value as a number, or an :class:`XlError` (``#VALUE!`` for text that is not a number)."""
    t = type(v)
    if t is float:
        return v
    if t is bool:
        return 1.0 if v else 0.0
    if v is None or v is MISSING:
        return 0.0
    if t is str:
        m = _NUM_TEXT.match(v)
        if not m:
            return VALUE
        x = float(m.group(1))
        if m.group(2):
            x /= 100.0
        return x if math.isfinite(x) else NUM
    if t is XlError:
        return v
    if t is int:
        return float(v)
    return VALUE


def number_text(x: float) -> str:
    """A number as text: up to 15 significant digits, as ``"x"&A1`` gives."""
    if x == 0:
        return "0"
    return "%.15G" % x


def to_text(v):
    """A value as text, or an :class:`XlError`."""
    t = type(v)
    if t is str:
        return v
    if t is float:
        return number_text(v)
    if t is bool:
        return "TRUE" if v else "FALSE"
    if v is None or v is MISSING:
        return ""
    if t is XlError:
        return v
    if t is int:
        return number_text(float(v))
    return VALUE


def to_bool(v):
    """A value as a boolean, or an :class:`XlError` (text other than TRUE/FALSE is ``#VALUE!``)."""
    t = type(v)
    if t is bool:
        return v
    if t is float or t is int:
        return v != 0
    if v is None or v is MISSING:
        return False
    if t is str:
        u = v.strip().upper()
        if u == "TRUE":
            return True
        if u == "FALSE":
            return False
        return VALUE
    if t is XlError:
        return v
    return VALUE


def round15(x: float) -> float:
    """``x`` rounded to 15 significant digits (the precision the spreadsheet compares with)."""
    return float("%.15g" % x)


def result_value(v):
    """A computed value as it is stored in a cell: empty -> 0, non-finite -> #NUM!."""
    t = type(v)
    if t is float:
        if not math.isfinite(v):
            return NUM
        return 0.0 if v == 0 else v
    if v is None or v is MISSING:
        return 0.0
    if t is str:
        return v if len(v) <= MAX_TEXT else VALUE
    if t is int:
        return float(v)
    return v


# ---------------------------------------------------------------------------
# broadcasting over arrays

#: largest array an element-wise operation may build (cells)
MAX_ARRAY_CELLS = 5_000_000


def element_at(a, i, j):
    """Element (i, j) of ``a`` as broadcasting sees it: a scalar everywhere, a single row or column
    repeated, and #N/A past the array's end (also what an array formula gives to its area's cells)."""
    if type(a) is not Array:
        return a
    ii = 0 if a.nrows == 1 else i
    jj = 0 if a.ncols == 1 else j
    if ii >= a.nrows or jj >= a.ncols:
        return NA
    return a.at(ii, jj)


def broadcast(fn: Callable, args) -> Array:
    """Apply ``fn`` element by element over the arrays in ``args`` (scalars repeat).

    Sizes follow the spreadsheet's array rules: a single row or column repeats
    along the other direction; cells outside a smaller array give ``#N/A``.
    """
    arrs = [a for a in args if type(a) is Array]
    nr = max(a.nrows for a in arrs)
    nc = max(a.ncols for a in arrs)
    if nr * nc > MAX_ARRAY_CELLS:
        return NUM
    out = []
    for i in range(nr):
        out.append([fn(*[element_at(a, i, j) for a in args]) for j in range(nc)])
    return Array(out, nr, nc)


def lift(fn: Callable) -> Callable:
    """``fn`` on scalars -> a function that also takes arrays (element by element)."""

    def lifted(*args):
        for a in args:
            if type(a) is Array:
                return broadcast(fn, args)
        return fn(*args)

    lifted.__name__ = getattr(fn, "__name__", "lifted")
    return lifted


# ---------------------------------------------------------------------------
# operators

def _finite(x: float):
    return x if math.isfinite(x) else NUM


def _two_numbers(a, b):
    a = to_number(a)
    if type(a) is XlError:
        return a, None
    b = to_number(b)
    if type(b) is XlError:
        return b, None
    return a, b


#: relative size below which a sum of two numbers of opposite sign counts as zero (2^-48)
CANCEL_TOLERANCE = 2.0 ** -48


def _approx_sum(a: float, b: float) -> float:
    """a + b, but exactly 0 when the two cancel to within the last digits.

    Spreadsheets snap a sum of nearly equal numbers of opposite sign to zero,
    so that 0.3-0.2-0.1 style differences show 0 (Microsoft, "Floating-point
    arithmetic may give inaccurate results in Excel", the 15-digit section;
    LibreOffice does the same with a relative tolerance of 2^-48).
    """
    s = a + b
    if (a < 0) != (b < 0) and abs(s) < abs(a) * CANCEL_TOLERANCE:
        return 0.0
    return s


def op_add(a, b):
    a, b = _two_numbers(a, b)
    return a if b is None else _finite(_approx_sum(a, b))


def op_sub(a, b):
    a, b = _two_numbers(a, b)
    return a if b is None else _finite(_approx_sum(a, -b))


def op_mul(a, b):
    a, b = _two_numbers(a, b)
    return a if b is None else _finite(a * b)


def op_div(a, b):
    a, b = _two_numbers(a, b)
    if b is None:
        return a
    if b == 0:
        return DIV0
    return _finite(a / b)


def power(a, b):
    """``a^b`` by the spreadsheet's rules: 0^0 and a negative base with a fractional power are #NUM!."""
    a, b = _two_numbers(a, b)
    if b is None:
        return a
    if a == 0:
        if b == 0:
            return NUM
        if b < 0:
            return DIV0
        return 0.0
    if a < 0 and b != int(b):
        return NUM
    try:
        return _finite(math.pow(a, b))
    except (OverflowError, ValueError):
        return NUM


def op_concat(a, b):
    a = to_text(a)
    if type(a) is XlError:
        return a
    b = to_text(b)
    if type(b) is XlError:
        return b
    s = a + b
    return s if len(s) <= MAX_TEXT else VALUE


def _rank(v) -> int:
    t = type(v)
    if t is bool:
        return 2
    if t is str:
        return 1
    return 0


def compare(a, b):
    """-1, 0 or 1 as ``a`` sorts before, with or after ``b``; errors propagate.

    Numbers < texts < booleans; texts without regard to case; numbers on their
    15 significant digits; an empty cell is 0, "" or FALSE as the other side is.
    """
    if type(a) is XlError:
        return a
    if type(b) is XlError:
        return b
    if a is None or a is MISSING:
        a = _empty_like(b)
    if b is None or b is MISSING:
        b = _empty_like(a)
    ra, rb = _rank(a), _rank(b)
    if ra != rb:
        return -1 if ra < rb else 1
    if ra == 0:
        x, y = round15(float(a)), round15(float(b))
    elif ra == 1:
        x, y = a.lower(), b.lower()
    else:
        x, y = a, b
    return -1 if x < y else (1 if x > y else 0)


def _empty_like(v):
    t = type(v)
    if t is str:
        return ""
    if t is bool:
        return False
    return 0.0


def _cmp_op(test):
    def op(a, b):
        c = compare(a, b)
        if type(c) is XlError:
            return c
        return test(c)

    return op


op_eq = _cmp_op(lambda c: c == 0)
op_ne = _cmp_op(lambda c: c != 0)
op_lt = _cmp_op(lambda c: c < 0)
op_le = _cmp_op(lambda c: c <= 0)
op_gt = _cmp_op(lambda c: c > 0)
op_ge = _cmp_op(lambda c: c >= 0)


def op_neg(a):
    a = to_number(a)
    return a if type(a) is XlError else (0.0 if a == 0 else -a)


def op_pos(a):
    return a


def op_percent(a):
    a = to_number(a)
    return a if type(a) is XlError else a / 100.0


#: infix operators by their symbol (element-wise over arrays)
BINARY = {"+": op_add, "-": op_sub, "*": op_mul, "/": op_div, "^": power, "&": op_concat,
          "=": op_eq, "<>": op_ne, "<": op_lt, "<=": op_le, ">": op_gt, ">=": op_ge}
#: prefix and postfix operators
UNARY = {"-": op_neg, "+": op_pos, "%": op_percent}


# ---------------------------------------------------------------------------
# built-in functions

@dataclass(frozen=True)
class Builtin:
    """A built-in function.

    ``kinds`` gives, per argument, how the evaluator passes it: ``"v"`` a value
    (a range is reduced to one cell by implicit intersection in a single-cell
    formula; arrays are handled element by element), ``"r"`` a range or array
    as a whole (:class:`Array`, or a plain value).  The last kind repeats for
    further arguments.  ``fn`` receives the values and returns a value.
    """

    name: str
    fn: Callable
    min_args: int
    max_args: int | None
    kinds: str
    doc: str

    def kind(self, i: int) -> str:
        return self.kinds[min(i, len(self.kinds) - 1)]


FUNCTIONS: dict[str, Builtin] = {}


def builtin(name: str, min_args: int, max_args: int | None, kinds: str, doc: str, lifted: bool = True):
    """Register a built-in; with ``lifted`` its ``"v"`` arguments may be arrays (element-wise)."""

    def deco(fn):
        call = fn
        if lifted and "v" in kinds:
            call = _lift_values(fn, kinds)
        FUNCTIONS[name] = Builtin(name, call, min_args, max_args, kinds, doc)
        return fn

    return deco


def _lift_values(fn, kinds):
    def call(*args):
        idx = [i for i, a in enumerate(args) if type(a) is Array and kinds[min(i, len(kinds) - 1)] == "v"]
        if not idx:
            return fn(*args)
        arr = [args[i] for i in idx]

        def one(*vals):
            full = list(args)
            for i, v in zip(idx, vals):
                full[i] = v
            return fn(*full)

        return broadcast(one, arr)

    return call


def _number_args(*vals):
    """Convert each value to a number; the first error is returned instead of the list."""
    out = []
    for v in vals:
        x = to_number(v)
        if type(x) is XlError:
            return x
        out.append(x)
    return out


def _collect_numbers(args):
    """Numbers for SUM/MIN/MAX/AVERAGE: ranges and arrays give their numbers only
    (texts, booleans and empty cells skipped); an argument typed directly is converted.
    Returns the list or the first error."""
    out = []
    for a in args:
        if type(a) is Array:
            for v in a.values():
                t = type(v)
                if t is float:
                    out.append(v)
                elif t is XlError:
                    return v
                elif t is int:
                    out.append(float(v))
        elif a is MISSING:
            out.append(0.0)
        else:
            x = to_number(a)
            if type(x) is XlError:
                return x
            out.append(x)
    return out


def _sequential_sum(xs) -> float:
    s = 0.0
    for x in xs:
        s += x
    return s


@builtin("SUM", 1, 255, "r", "sum of the numbers")
def fn_sum(*args):
    xs = _collect_numbers(args)
    return xs if type(xs) is XlError else _finite(_sequential_sum(xs))


@builtin("MIN", 1, 255, "r", "smallest number (0 when there is none)")
def fn_min(*args):
    xs = _collect_numbers(args)
    return xs if type(xs) is XlError else (min(xs) if xs else 0.0)


@builtin("MAX", 1, 255, "r", "largest number (0 when there is none)")
def fn_max(*args):
    xs = _collect_numbers(args)
    return xs if type(xs) is XlError else (max(xs) if xs else 0.0)


@builtin("AVERAGE", 1, 255, "r", "arithmetic mean of the numbers (#DIV/0! when there is none)")
def fn_average(*args):
    xs = _collect_numbers(args)
    if type(xs) is XlError:
        return xs
    if not xs:
        return DIV0
    return _finite(_sequential_sum(xs) / len(xs))


@builtin("COUNT", 1, 255, "r", "how many numbers")
def fn_count(*args):
    n = 0
    for a in args:
        if type(a) is Array:
            n += sum(1 for v in a.values() if type(v) is float or type(v) is int)
        elif a is MISSING:
            continue
        elif type(a) is not XlError and type(to_number(a)) is not XlError:
            n += 1
    return float(n)


@builtin("COUNTA", 1, 255, "r", "how many values that are not empty")
def fn_counta(*args):
    n = 0
    for a in args:
        if type(a) is Array:
            n += sum(1 for v in a.values() if v is not None)
        elif a is not MISSING and a is not None:
            n += 1
    return float(n)


@builtin("SUMPRODUCT", 1, 255, "r", "sum of the products of corresponding elements")
def fn_sumproduct(*args):
    arrs = [a if type(a) is Array else Array([[a]]) for a in args]
    nr, nc = arrs[0].nrows, arrs[0].ncols
    if any(a.nrows != nr or a.ncols != nc for a in arrs):
        return VALUE
    total = 0.0
    for i in range(nr):
        for j in range(nc):
            p = 1.0
            for a in arrs:
                v = a.at(i, j)
                if type(v) is XlError:
                    return v
                p *= v if (type(v) is float or type(v) is int) else 0.0
            total += p
    return _finite(total)


@builtin("ROWS", 1, 1, "r", "number of rows of a range or array")
def fn_rows(a):
    if type(a) is XlError:
        return a
    return float(a.nrows) if type(a) is Array else 1.0


@builtin("COLUMNS", 1, 1, "r", "number of columns of a range or array")
def fn_columns(a):
    if type(a) is XlError:
        return a
    return float(a.ncols) if type(a) is Array else 1.0


def _logical_values(args):
    out = []
    for a in args:
        if type(a) is Array:
            for v in a.values():
                t = type(v)
                if t is bool:
                    out.append(v)
                elif t is float or t is int:
                    out.append(v != 0)
                elif t is XlError:
                    return v
        elif a is MISSING:
            out.append(False)
        else:
            b = to_bool(a)
            if type(b) is XlError:
                return b
            out.append(b)
    if not out:
        return VALUE
    return out


@builtin("AND", 1, 255, "r", "TRUE when every argument is TRUE")
def fn_and(*args):
    vals = _logical_values(args)
    return vals if type(vals) is XlError else all(vals)


@builtin("OR", 1, 255, "r", "TRUE when any argument is TRUE")
def fn_or(*args):
    vals = _logical_values(args)
    return vals if type(vals) is XlError else any(vals)


@builtin("NOT", 1, 1, "v", "the opposite of a logical value")
def fn_not(a):
    b = to_bool(a)
    return b if type(b) is XlError else (not b)


@builtin("TRUE", 0, 0, "v", "the logical value TRUE")
def fn_true():
    return True


@builtin("FALSE", 0, 0, "v", "the logical value FALSE")
def fn_false():
    return False


@builtin("ISNUMBER", 1, 1, "v", "TRUE for a number")
def fn_isnumber(v):
    return type(v) is float or type(v) is int


@builtin("ISTEXT", 1, 1, "v", "TRUE for a text (an FS error text included)")
def fn_istext(v):
    return type(v) is str


@builtin("ISLOGICAL", 1, 1, "v", "TRUE for a logical value")
def fn_islogical(v):
    return type(v) is bool


@builtin("ISBLANK", 1, 1, "v", "TRUE for an empty cell")
def fn_isblank(v):
    return v is None


@builtin("ISERROR", 1, 1, "v", "TRUE for any error value")
def fn_iserror(v):
    return type(v) is XlError


@builtin("ISERR", 1, 1, "v", "TRUE for any error value except #N/A")
def fn_iserr(v):
    return type(v) is XlError and v != NA


@builtin("ISNA", 1, 1, "v", "TRUE for #N/A")
def fn_isna(v):
    return type(v) is XlError and v == NA


@builtin("NA", 0, 0, "v", "the error value #N/A")
def fn_na():
    return NA


@builtin("PI", 0, 0, "v", "the number pi to 15 digits")
def fn_pi():
    return math.pi


def _unary_math(name, f, doc, domain=None):
    def fn(x):
        x = to_number(x)
        if type(x) is XlError:
            return x
        if domain is not None and not domain(x):
            return NUM
        try:
            return _finite(f(x))
        except (OverflowError, ValueError):
            return NUM

    fn.__name__ = "fn_" + name.lower()
    builtin(name, 1, 1, "v", doc)(fn)
    return fn


_unary_math("ABS", abs, "absolute value")
_unary_math("SQRT", math.sqrt, "square root (#NUM! below 0)", lambda x: x >= 0)
_unary_math("EXP", math.exp, "e raised to a power")
_unary_math("LN", math.log, "natural logarithm (#NUM! at 0 and below)", lambda x: x > 0)
_unary_math("LOG10", math.log10, "base-10 logarithm (#NUM! at 0 and below)", lambda x: x > 0)
_unary_math("INT", lambda x: float(math.floor(x)), "round down to a whole number")
_unary_math("SIGN", lambda x: float((x > 0) - (x < 0)), "sign: 1, 0 or -1")
_unary_math("SIN", math.sin, "sine of an angle in radians")
_unary_math("COS", math.cos, "cosine of an angle in radians")
_unary_math("TAN", math.tan, "tangent of an angle in radians")
_unary_math("ASIN", math.asin, "arcsine in radians", lambda x: -1 <= x <= 1)
_unary_math("ACOS", math.acos, "arccosine in radians", lambda x: -1 <= x <= 1)
_unary_math("ATAN", math.atan, "arctangent in radians")
_unary_math("RADIANS", math.radians, "degrees to radians")
_unary_math("DEGREES", math.degrees, "radians to degrees")


@builtin("LOG", 1, 2, "v", "logarithm to a base (10 when omitted)")
def fn_log(x, base=10.0):
    x, base = _two_numbers(x, 10.0 if base is MISSING else base)
    if base is None:
        return x
    if x <= 0 or base <= 0:
        return NUM
    if base == 1:
        return DIV0
    return _finite(math.log(x) / math.log(base))


@builtin("ATAN2", 2, 2, "v", "arctangent of y/x in radians from x_num, y_num (the spreadsheet's order)")
def fn_atan2(x, y):
    x, y = _two_numbers(x, y)
    if y is None:
        return x
    if x == 0 and y == 0:
        return DIV0
    return math.atan2(y, x)


@builtin("POWER", 2, 2, "v", "a number raised to a power")
def fn_power(a, b):
    return power(a, b)


@builtin("MOD", 2, 2, "v", "remainder with the sign of the divisor")
def fn_mod(a, b):
    a, b = _two_numbers(a, b)
    if b is None:
        return a
    if b == 0:
        return DIV0
    return _finite(a - b * math.floor(a / b))


_DEC = Context(prec=420, Emax=999_999, Emin=-999_999)


def _round_decimal(x, digits, mode):
    x, d = _two_numbers(x, digits)
    if d is None:
        return x
    d = max(-400, min(400, int(d)))  # num_digits is truncated to a whole number
    if x == 0:
        return 0.0
    q = Decimal("%.15g" % x)
    try:
        r = q.quantize(Decimal(1).scaleb(-d, _DEC), rounding=mode, context=_DEC)
    except InvalidOperation:
        return NUM
    out = float(r)
    return 0.0 if out == 0 else out


@builtin("ROUND", 2, 2, "v", "round to a number of digits, halves away from zero")
def fn_round(x, digits):
    return _round_decimal(x, digits, ROUND_HALF_UP)


@builtin("ROUNDUP", 2, 2, "v", "round away from zero")
def fn_roundup(x, digits):
    return _round_decimal(x, digits, ROUND_UP)


@builtin("ROUNDDOWN", 2, 2, "v", "round towards zero")
def fn_rounddown(x, digits):
    return _round_decimal(x, digits, ROUND_DOWN)


@builtin("CONCATENATE", 1, 255, "v", "join texts")
def fn_concatenate(*args):
    out = ""
    for a in args:
        out = op_concat(out, a)
        if type(out) is XlError:
            return out
    return out


@builtin("LEN", 1, 1, "v", "number of characters of a text")
def fn_len(a):
    s = to_text(a)
    return s if type(s) is XlError else float(len(s))


def _whole(v):
    x = to_number(v)
    if type(x) is XlError:
        return x
    return int(x)  # truncates towards zero as the spreadsheet does for index arguments


@builtin("INDEX", 2, 3, "rvv", "the value at a row and column of a range or array")
def fn_index(arr, row, col=MISSING):
    if type(arr) is XlError:
        return arr
    if type(arr) is not Array:
        arr = Array([[arr]])
    r = _whole(row)
    if type(r) is XlError:
        return r
    if col is MISSING:
        if arr.nrows == 1 and arr.ncols > 1:  # one row: the single index is the column
            r, c = 1, r
        elif arr.ncols == 1:
            c = 1
        else:
            c = 0
    else:
        c = _whole(col)
        if type(c) is XlError:
            return c
    if r < 0 or c < 0:
        return VALUE
    if r > arr.nrows or c > arr.ncols:
        return REF
    if r == 0 and c == 0:
        return arr
    if r == 0:
        rows = [[arr.at(i, c - 1)] for i in range(min(arr.nrows, len(arr.rows)))]
        return Array(rows, arr.nrows, 1, arr.is_ref, arr.sheet, arr.r0, arr.c0 + c - 1, arr.clipped)
    if c == 0:
        rows = [[arr.at(r - 1, j) for j in range(arr.ncols)]]
        return Array(rows, 1, arr.ncols, arr.is_ref, arr.sheet, arr.r0 + r - 1, arr.c0, arr.clipped)
    return arr.at(r - 1, c - 1)


def _wildcard(pattern: str):
    out = []
    i = 0
    while i < len(pattern):
        ch = pattern[i]
        if ch == "~" and i + 1 < len(pattern) and pattern[i + 1] in "*?~":
            out.append(re.escape(pattern[i + 1]))
            i += 2
            continue
        out.append(".*" if ch == "*" else "." if ch == "?" else re.escape(ch))
        i += 1
    return re.compile("".join(out) + r"\Z", re.IGNORECASE | re.DOTALL)


def _negative(x):
    return -x


def _numbers_of(arr):
    """(positions, 15-digit keys, order) of the numbers in a one-row or one-column array.

    ``order`` is 2 when every key is equal, 1 when they never fall, -1 when they
    never rise, 0 otherwise.  Built once per array (a range is one cached array
    for every formula that reads it), so a MATCH over a sorted range costs a
    bisection, not a scan.
    """
    idx = arr.numbers
    if idx is None:
        pos, keys = [], []
        odd = False
        for i, v in enumerate(arr.values()):
            t = type(v)
            if t is float or t is int:
                pos.append(i)
                keys.append(round15(float(v)))
            elif not (v is None or t is str or t is bool or t is XlError):
                odd = True  # something the scan would compare in its own way
        rises = any(a < b for a, b in zip(keys, keys[1:]))
        falls = any(a > b for a, b in zip(keys, keys[1:]))
        order = 0 if odd or (rises and falls) else (1 if rises else (-1 if falls else 2))
        idx = arr.numbers = (pos, keys, order)
    return idx


@builtin("MATCH", 2, 3, "vrv", "position of a value in a single row or column")
def fn_match(lookup, arr, mtype=1.0):
    if type(lookup) is XlError:
        return lookup
    if lookup is None or lookup is MISSING:
        return NA
    if type(arr) is XlError:
        return arr
    if type(arr) is not Array:
        arr = Array([[arr]])
    if arr.nrows != 1 and arr.ncols != 1:
        return NA
    mt = _whole(mtype)
    if type(mt) is XlError:
        return mt
    rank = _rank(lookup)
    if mt == 0:
        vals = list(arr.values())
        if type(lookup) is str and any(ch in lookup for ch in "*?~"):
            rx = _wildcard(lookup)
            for i, v in enumerate(vals):
                if type(v) is str and rx.match(v):
                    return float(i + 1)
            return NA
        for i, v in enumerate(vals):
            if v is not None and type(v) is not XlError and _rank(v) == rank and compare(v, lookup) == 0:
                return float(i + 1)
        return NA
    if rank == 0 and type(lookup) is not bool:
        pos, keys, order = _numbers_of(arr)
        if (mt > 0 and order in (1, 2)) or (mt < 0 and order in (-1, 2)):
            # sorted as MATCH takes them: the last number <= (or >=) the lookup on 15 digits,
            # found by bisection -- what the scan below gives on a sorted range
            x = round15(float(lookup))
            if mt > 0:
                k = bisect_right(keys, x) - 1
            else:  # the keys fall: those >= x come first
                k = bisect_right(keys, -x, key=_negative) - 1
            return NA if k < 0 else float(pos[k] + 1)
    vals = list(arr.values())
    best = None
    for i, v in enumerate(vals):
        if v is None or type(v) is XlError or _rank(v) != rank:
            continue
        c = compare(v, lookup)
        if (mt > 0 and c <= 0) or (mt < 0 and c >= 0):
            best = i
        else:
            break  # the values are taken as sorted (ascending for 1, descending for -1)
    return NA if best is None else float(best + 1)


# ---------------------------------------------------------------------------
# CONVERT

_LBM = 0.45359237  # kg, exact (NIST SP 811 B.8)
_G0 = 9.80665  # m/s², standard gravity, exact
_IN = 0.0254  # m, exact
_FT = 0.3048
_GAL = 231 * _IN ** 3  # US gallon, 231 in³ exactly
_ATM = 101325.0  # Pa, exact

#: unit name -> (quantity, factor to the SI unit, accepts a metric prefix).  Names and
#: prefixes are the spreadsheet's (Microsoft, "CONVERT function"); factors are the exact
#: definitions or the values of NIST SP 811 (2008) Appendix B.
_UNITS = {
    # mass -> kg
    "g": ("mass", 1e-3, True), "lbm": ("mass", _LBM, False), "ozm": ("mass", _LBM / 16, False),
    "u": ("mass", 1.66053906660e-27, True), "grain": ("mass", 64.79891e-6, False),
    "stone": ("mass", 14 * _LBM, False), "ton": ("mass", 2000 * _LBM, False),
    "sg": ("mass", _LBM * _G0 / _FT, False),
    # length -> m
    "m": ("length", 1.0, True), "in": ("length", _IN, False), "ft": ("length", _FT, False),
    "yd": ("length", 3 * _FT, False), "mi": ("length", 5280 * _FT, False), "Nmi": ("length", 1852.0, False),
    "ang": ("length", 1e-10, True), "ell": ("length", 45 * _IN, False),
    "Picapt": ("length", _IN / 72, False), "Pica": ("length", _IN / 72, False), "pica": ("length", _IN / 6, False),
    # time -> s
    "sec": ("time", 1.0, True), "s": ("time", 1.0, True), "mn": ("time", 60.0, False),
    "min": ("time", 60.0, False), "hr": ("time", 3600.0, False), "day": ("time", 86400.0, False),
    "d": ("time", 86400.0, False), "yr": ("time", 365.25 * 86400.0, False),
    # pressure -> Pa
    "Pa": ("pressure", 1.0, True), "p": ("pressure", 1.0, True), "atm": ("pressure", _ATM, True),
    "at": ("pressure", _ATM, True), "mmHg": ("pressure", 133.322387415, True),
    "Torr": ("pressure", _ATM / 760, False), "psi": ("pressure", _LBM * _G0 / _IN ** 2, False),
    # force -> N
    "N": ("force", 1.0, True), "dyn": ("force", 1e-5, True), "dy": ("force", 1e-5, True),
    "lbf": ("force", _LBM * _G0, False), "pond": ("force", 1e-3 * _G0, True),
    # energy -> J
    "J": ("energy", 1.0, True), "e": ("energy", 1e-7, True), "c": ("energy", 4.184, True),
    "cal": ("energy", 4.1868, True), "eV": ("energy", 1.602176634e-19, True),
    "ev": ("energy", 1.602176634e-19, True), "Wh": ("energy", 3600.0, True), "wh": ("energy", 3600.0, True),
    "flb": ("energy", _FT * _LBM * _G0, False), "BTU": ("energy", 1055.05585262, False),
    "btu": ("energy", 1055.05585262, False),
    # power -> W
    "W": ("power", 1.0, True), "w": ("power", 1.0, True), "HP": ("power", 550 * _FT * _LBM * _G0, False),
    "h": ("power", 550 * _FT * _LBM * _G0, False), "PS": ("power", 75 * _G0, False),
    # volume -> m³
    "l": ("volume", 1e-3, True), "L": ("volume", 1e-3, True), "lt": ("volume", 1e-3, True),
    "gal": ("volume", _GAL, False), "uk_gal": ("volume", 4.54609e-3, False),
    "qt": ("volume", _GAL / 4, False), "pt": ("volume", _GAL / 8, False), "us_pt": ("volume", _GAL / 8, False),
    "uk_pt": ("volume", 4.54609e-3 / 8, False), "cup": ("volume", _GAL / 16, False),
    "oz": ("volume", _GAL / 128, False), "tbs": ("volume", _GAL / 256, False), "tsp": ("volume", _GAL / 768, False),
    "barrel": ("volume", 42 * _GAL, False),
    "in3": ("volume", _IN ** 3, False), "in^3": ("volume", _IN ** 3, False),
    "ft3": ("volume", _FT ** 3, False), "ft^3": ("volume", _FT ** 3, False),
    # area -> m²
    "in2": ("area", _IN ** 2, False), "in^2": ("area", _IN ** 2, False),
    "ft2": ("area", _FT ** 2, False), "ft^2": ("area", _FT ** 2, False),
    "ha": ("area", 1e4, False), "ar": ("area", 100.0, True),
    # speed -> m/s
    "m/s": ("speed", 1.0, True), "m/sec": ("speed", 1.0, True), "m/h": ("speed", 1 / 3600, True),
    "m/hr": ("speed", 1 / 3600, True), "mph": ("speed", 5280 * _FT / 3600, False),
    "kn": ("speed", 1852 / 3600, False),
    # magnetism -> T
    "T": ("magnetism", 1.0, True), "ga": ("magnetism", 1e-4, True),
}
#: metres raised to a power: the prefix is raised to the same power ("cm3" = 1e-6 m³)
_POWERED = {"m2": ("area", 2), "m^2": ("area", 2), "m3": ("volume", 3), "m^3": ("volume", 3)}
#: temperature scales: name -> (kelvin per degree, kelvin at the scale's zero, accepts a prefix)
_TEMPERATURE = {
    "C": (1.0, 273.15, False), "cel": (1.0, 273.15, False),
    "F": (5 / 9, 273.15 - 32 * 5 / 9, False), "fah": (5 / 9, 273.15 - 32 * 5 / 9, False),
    "K": (1.0, 0.0, True), "kel": (1.0, 0.0, True),
    "Rank": (5 / 9, 0.0, False), "Reau": (1.25, 273.15, False),
}
_PREFIXES = {"Y": 1e24, "Z": 1e21, "E": 1e18, "P": 1e15, "T": 1e12, "G": 1e9, "M": 1e6, "k": 1e3,
             "h": 1e2, "da": 1e1, "e": 1e1, "d": 1e-1, "c": 1e-2, "m": 1e-3, "u": 1e-6, "n": 1e-9,
             "p": 1e-12, "f": 1e-15, "a": 1e-18, "z": 1e-21, "y": 1e-24}


def unit_info(name: str):
    """``name`` -> (quantity, scale, offset) with value_SI = value * scale + offset; None if unknown."""
    if name in _UNITS:
        q, f, _ = _UNITS[name]
        return q, f, 0.0
    if name in _POWERED:
        q, _ = _POWERED[name]
        return q, 1.0, 0.0
    if name in _TEMPERATURE:
        k, z, _ = _TEMPERATURE[name]
        return "temperature", k, z
    for plen in (2, 1):
        pre, base = name[:plen], name[plen:]
        if pre not in _PREFIXES or not base:
            continue
        mult = _PREFIXES[pre]
        if base in _UNITS and _UNITS[base][2]:
            q, f, _ = _UNITS[base]
            return q, f * mult, 0.0
        if base in _POWERED:
            q, n = _POWERED[base]
            return q, mult ** n, 0.0
        if base in _TEMPERATURE and _TEMPERATURE[base][2]:
            k, z, _ = _TEMPERATURE[base]
            return "temperature", k * mult, z
    return None


@builtin("CONVERT", 3, 3, "v", "convert a number between units (the spreadsheet's unit names)")
def fn_convert(x, from_unit, to_unit):
    x = to_number(x)
    if type(x) is XlError:
        return x
    for u in (from_unit, to_unit):
        if type(u) is XlError:
            return u
    if type(from_unit) is not str or type(to_unit) is not str:
        return NA
    a, b = unit_info(from_unit), unit_info(to_unit)
    if a is None or b is None or a[0] != b[0]:
        return NA
    si = x * a[1] + a[2]
    return _finite((si - b[2]) / b[1])


#: functions refused by name: their value depends on when or where they run, or they
#: build references at run time, so a stored result could not be reproduced or checked
REFUSED = {
    "NOW": "volatile function NOW (the time changes)",
    "TODAY": "volatile function TODAY (the date changes)",
    "RAND": "volatile function RAND (random numbers)",
    "RANDBETWEEN": "volatile function RANDBETWEEN (random numbers)",
    "RANDARRAY": "volatile function RANDARRAY (random numbers)",
    "INDIRECT": "indirect reference INDIRECT (references built at run time)",
    "OFFSET": "indirect reference OFFSET (references built at run time)",
    "CELL": "volatile function CELL",
    "INFO": "volatile function INFO",
}

#: functions the evaluator handles itself (they choose which argument to evaluate)
SPECIAL = ("IF", "IFERROR", "IFNA", "CHOOSE", "SINGLE")


def supported_names() -> list[str]:
    """Every built-in function name the headless engine computes."""
    return sorted(set(FUNCTIONS) | set(SPECIAL))
