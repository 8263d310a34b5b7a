"""Headless formula evaluation: parse, order and compute a workbook's formulas.

The grammar is the spreadsheet's own (Microsoft, "Calculation operators and
precedence in Excel"), split into tokens by :class:`openpyxl.formula.Tokenizer`
and parsed here with the documented precedence::

    :  (inside a reference)   -  (negation)   %   ^   * /   + -   &   = <> < > <= >=

so ``-2^2`` is 4 and ``2^3^2`` is 64.  The values and the rules of every
operator and built-in function live in :mod:`fuelsys.sheet.builtins`; every
catalogue function (:mod:`fuelsys.sheet.catalogue`) is called through
:func:`fuelsys.sheet.adapt.call_spec`, exactly as a cell would call it.

Strictness
----------
Anything outside the supported set is refused *by name* (``unsupported
function OFFSET in Sheet1!C4``); the refused cell and every cell that depends
on it are skipped and reported -- never guessed.  Volatile and indirect
functions (NOW, TODAY, RAND, RANDBETWEEN, INDIRECT, OFFSET ...), external
workbook references (``[1]Sheet1!A1``), 3-D references, structured (table)
references, the union and intersection reference operators and data tables
are refused the same way.  A reference to a sheet that does not exist is
``#REF!``; an unknown defined name is ``#NAME?``.

Order
-----
Dependencies are ordered by Kahn's algorithm (no recursion, so a chain of
100,000 cells is fine); cells left over form or follow circular references,
which are reported with the cells that form each loop.

Python API
----------
:func:`evaluate_formula` (one formula, no workbook needed),
:func:`evaluate_workbook` (every formula cell of a book, nothing written),
:func:`recalc_workbook` (compute and store the values loss-free) and
:func:`check_workbook` (compare the stored values with a fresh computation).
"""

from __future__ import annotations

import gc
import math
import os
import re
import time
from bisect import bisect_left, bisect_right
from collections import deque
from dataclasses import dataclass, field

from fuelsys.errors import FuelsysError
from fuelsys.sheet import builtins as bi
from fuelsys.sheet.builtins import MISSING, Array, XlError
from fuelsys.sheet.xlsx import col_letters  # noqa: F401 -- part of this module's cell-name helpers

MAX_ROW = 1_048_576
MAX_COL = 16_384
#: deepest nesting of parentheses and function calls accepted (the spreadsheet allows 64)
MAX_DEPTH = 100
#: longest formula text accepted (the spreadsheet allows 8,192 characters)
MAX_FORMULA = 8192

#: cells computed between two collections of the garbage collector's young generations
GC_EVERY = 4096

#: When True, an unexpected exception while computing a cell propagates (the
#: tests set it) instead of being reported as "internal error" for that cell.
STRICT = False


class Unsupported(FuelsysError):
    """A formula uses something the headless engine does not compute; the message names it."""


class FormulaSyntaxError(Unsupported):
    """A formula text that does not parse."""


class EvaluationError(FuelsysError):
    """Some formula cells could not be computed (see ``skipped``)."""

    def __init__(self, message, skipped=None):
        super().__init__(message)
        self.skipped = skipped or {}


# ---------------------------------------------------------------------------
# cell names



def col_number(letters: str) -> int:
    n = 0
    for ch in letters.upper():
        n = n * 26 + ord(ch) - 64
    return n


def cell_name(r: int, c: int) -> str:
    return f"{col_letters(c)}{r}"


_PLAIN_SHEET = re.compile(r"[A-Za-z_][A-Za-z0-9_.]*\Z")
_CELLISH = re.compile(r"[A-Za-z]{1,3}\d+\Z")


def quote_sheet(name: str) -> str:
    """A sheet name as a formula writes it (quoted when it needs to be)."""
    if _PLAIN_SHEET.match(name) and not _CELLISH.match(name) and name.upper() not in ("TRUE", "FALSE"):
        return name
    return "'" + name.replace("'", "''") + "'"


def full_name(sheet: str, r: int, c: int) -> str:
    return f"{quote_sheet(sheet)}!{cell_name(r, c)}"


def parse_cell(ref: str) -> tuple[int, int]:
    """``"B7"`` -> (7, 2)."""
    m = re.fullmatch(r"\$?([A-Za-z]{1,3})\$?(\d+)", ref.strip())
    if not m:
        raise ValueError(f"not a cell reference: {ref!r}")
    r, c = int(m.group(2)), col_number(m.group(1))
    if not (1 <= r <= MAX_ROW and 1 <= c <= MAX_COL):
        raise ValueError(f"cell reference out of the sheet: {ref!r}")
    return r, c


def parse_area(ref: str) -> tuple[int, int, int, int]:
    """``"A1:C3"`` (or one cell) -> (r1, c1, r2, c2)."""
    a, _, b = ref.partition(":")
    r1, c1 = parse_cell(a)
    r2, c2 = parse_cell(b) if b else (r1, c1)
    return min(r1, r2), min(c1, c2), max(r1, r2), max(c1, c2)


# ---------------------------------------------------------------------------
# tokens -> syntax tree
#
# Nodes are tuples:
#   ("num", x) ("str", s) ("bool", b) ("err", code) ("missing",)
#   ("cell", sheet|None, r, c, r_abs, c_abs)
#   ("area", sheet|None, r1, c1, r2, c2, r1_abs, c1_abs, r2_abs, c2_abs)
#        whole columns have r1 = r2 = None, whole rows c1 = c2 = None
#   ("name", sheet|None, NAME)
#   ("bin", op, left, right)   ("un", op, operand)   op "-", "+" or "%"
#   ("call", NAME, [args])     ("array", [[values]])

_INFIX_BP = {"=": 1, "<>": 1, "<": 1, ">": 1, "<=": 1, ">=": 1, "&": 2, "+": 3, "-": 3, "*": 4, "/": 4, "^": 5}
_PERCENT_BP = 6
_PREFIX_BP = 7

_CELL_RE = re.compile(r"(\$?)([A-Za-z]{1,3})(\$?)(\d+)\Z")
_COL_RE = re.compile(r"(\$?)([A-Za-z]{1,3})\Z")
_ROW_RE = re.compile(r"(\$?)(\d+)\Z")
_NAME_RE = re.compile(r"[A-Za-z_\\][A-Za-z0-9_.\\?]*\Z")
_FUNC_PREFIXES = ("_XLFN._XLWS.", "_XLFN.", "_XLUDF.", "_XLWS.")


def _tokens(text: str):
    from openpyxl.formula.tokenizer import Tokenizer

    if len(text) > MAX_FORMULA:
        raise Unsupported(f"formula longer than {MAX_FORMULA} characters")
    try:
        items = Tokenizer("=" + text).items
    except Exception as exc:  # the tokenizer raises TokenizerError and others on bad input
        raise FormulaSyntaxError(f"formula does not parse ({exc})") from None
    out = []
    for tk in items:
        t, s, v = tk.type, tk.subtype, tk.value
        if t == "OPERAND":
            if s == "NUMBER":
                out.append(("num", float(v)))
            elif s == "TEXT":
                out.append(("str", v[1:-1].replace('""', '"')))
            elif s == "LOGICAL":
                out.append(("bool", v.upper() == "TRUE"))
            elif s == "ERROR":
                out.append(("err", v.upper()))
            else:
                out.append(("ref", v))
        elif t == "FUNC":
            out.append(("func", v[:-1]) if s == "OPEN" else ("close",))
        elif t == "PAREN":
            out.append(("(",) if s == "OPEN" else (")",))
        elif t == "ARRAY":
            out.append(("{",) if s == "OPEN" else ("}",))
        elif t == "SEP":
            out.append((",",) if s == "ARG" else (";",))
        elif t == "OPERATOR-PREFIX":
            out.append(("pre", v))
        elif t == "OPERATOR-INFIX":
            out.append(("in", v))
        elif t == "OPERATOR-POSTFIX":
            out.append(("post", v))
        elif t == "WHITE-SPACE":
            out.append(("ws",))
        else:
            raise FormulaSyntaxError(f"formula does not parse (token {v!r})")
    # a space between two operands is the intersection operator; elsewhere it is layout
    ends = {"num", "str", "bool", "err", "ref", "close", ")", "}"}
    starts = {"num", "str", "bool", "err", "ref", "func", "(", "{"}
    clean = []
    for i, tk in enumerate(out):
        if tk[0] == "ws":
            prev = clean[-1][0] if clean else None
            nxt = next((o[0] for o in out[i + 1:] if o[0] != "ws"), None)
            if prev in ends and nxt in starts:
                raise Unsupported("intersection operator (a space between references)")
            continue
        clean.append(tk)
    return clean


def _area_node(sheet, r1, c1, r2, c2, ra1, ca1, ra2, ca2):
    """A range node with its corners in a canonical order: top-left first (a range is the
    rectangle its corners span, so B2:A1 is A1:B2); equal rows or columns put the
    relative one first, so a moved range compares equal to the same range typed."""
    if r1 is not None and (r1, ra1) > (r2, ra2):
        r1, r2, ra1, ra2 = r2, r1, ra2, ra1
    if c1 is not None and (c1, ca1) > (c2, ca2):
        c1, c2, ca1, ca2 = c2, c1, ca2, ca1
    return ("area", sheet, r1, c1, r2, c2, ra1, ca1, ra2, ca2)


def _ref_node(text: str):
    """An operand of the RANGE kind -> a reference, name or error node."""
    raw = text
    sheet = None
    if text.startswith("'"):
        i, buf = 1, []
        while i < len(text):
            ch = text[i]
            if ch == "'":
                if i + 1 < len(text) and text[i + 1] == "'":
                    buf.append("'")
                    i += 2
                    continue
                break
            buf.append(ch)
            i += 1
        if i + 1 >= len(text) or text[i + 1] != "!":
            raise FormulaSyntaxError(f"reference {raw} does not parse")
        sheet = "".join(buf)
        text = text[i + 2:]
    elif "!" in text:
        sheet, text = text.rsplit("!", 1)
    if sheet is not None:
        if "[" in sheet or "]" in sheet:
            raise Unsupported(f"external workbook reference {raw}")
        if ":" in sheet:
            raise Unsupported(f"3-D reference {raw} (a range across sheets)")
        if not sheet:
            raise FormulaSyntaxError(f"reference {raw} has an empty sheet name")
    if "[" in text or "]" in text:
        if sheet is None and text.startswith("["):
            raise Unsupported(f"external workbook reference {raw}")
        raise Unsupported(f"structured reference {raw} (table columns)")
    if text.upper() == "#REF!":
        return ("err", "#REF!")
    a, colon, b = text.partition(":")
    if colon:
        ma, mb = _CELL_RE.match(a), _CELL_RE.match(b)
        if ma and mb:
            r1, c1 = int(ma.group(4)), col_number(ma.group(2))
            r2, c2 = int(mb.group(4)), col_number(mb.group(2))
            if not (1 <= r1 <= MAX_ROW and 1 <= r2 <= MAX_ROW and 1 <= c1 <= MAX_COL and 1 <= c2 <= MAX_COL):
                raise FormulaSyntaxError(f"reference {raw} lies outside the sheet")
            return _area_node(sheet, r1, c1, r2, c2, bool(ma.group(3)), bool(ma.group(1)),
                              bool(mb.group(3)), bool(mb.group(1)))
        ma, mb = _COL_RE.match(a), _COL_RE.match(b)
        if ma and mb:
            c1, c2 = col_number(ma.group(2)), col_number(mb.group(2))
            if not (1 <= c1 <= MAX_COL and 1 <= c2 <= MAX_COL):
                raise FormulaSyntaxError(f"reference {raw} lies outside the sheet")
            return _area_node(sheet, None, c1, None, c2, True, bool(ma.group(1)), True, bool(mb.group(1)))
        ma, mb = _ROW_RE.match(a), _ROW_RE.match(b)
        if ma and mb:
            r1, r2 = int(ma.group(2)), int(mb.group(2))
            if not (1 <= r1 <= MAX_ROW and 1 <= r2 <= MAX_ROW):
                raise FormulaSyntaxError(f"reference {raw} lies outside the sheet")
            return _area_node(sheet, r1, None, r2, None, bool(ma.group(1)), True, bool(mb.group(1)), True)
        raise Unsupported(f"range operator between {a} and {b} (only cell:cell, column:column and row:row)")
    m = _CELL_RE.match(text)
    if m:
        r, c = int(m.group(4)), col_number(m.group(2))
        if 1 <= r <= MAX_ROW and 1 <= c <= MAX_COL:
            return ("cell", sheet, r, c, bool(m.group(3)), bool(m.group(1)))
    if _NAME_RE.match(text):
        return ("name", sheet, text.upper())
    raise FormulaSyntaxError(f"reference {raw} does not parse")


class _Parser:
    def __init__(self, tokens):
        self.toks = tokens
        self.i = 0
        self.depth = 0

    def peek(self):
        return self.toks[self.i] if self.i < len(self.toks) else ("end",)

    def take(self):
        tk = self.peek()
        self.i += 1
        return tk

    def parse(self):
        if not self.toks:
            raise FormulaSyntaxError("empty formula")
        node = self.expr(0)
        if self.peek()[0] != "end":
            raise FormulaSyntaxError(f"formula does not parse (unexpected {self._show(self.peek())})")
        return node

    @staticmethod
    def _show(tk):
        return tk[1] if len(tk) > 1 else tk[0]

    def expr(self, min_bp):
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise Unsupported(f"formula nested more than {MAX_DEPTH} levels deep")
        lhs = self.primary()
        while True:
            tk = self.peek()
            if tk[0] == "post":
                if _PERCENT_BP < min_bp:
                    break
                self.take()
                lhs = ("un", "%", lhs)
                continue
            if tk[0] != "in":
                break
            op = tk[1]
            if op == ",":
                raise Unsupported("union operator (a comma between references inside parentheses)")
            if op == ":":
                raise Unsupported("range operator between expressions (only cell:cell ranges)")
            bp = _INFIX_BP.get(op)
            if bp is None:
                raise FormulaSyntaxError(f"unknown operator {op}")
            if bp < min_bp:
                break
            self.take()
            rhs = self.expr(bp + 1)  # left-associative, including ^
            lhs = ("bin", op, lhs, rhs)
        self.depth -= 1
        return lhs

    def primary(self):
        tk = self.take()
        kind = tk[0]
        if kind in ("num", "str", "bool", "err"):
            return tk
        if kind == "ref":
            return _ref_node(tk[1])
        if kind == "pre":
            if tk[1] not in ("-", "+"):
                raise FormulaSyntaxError(f"unknown prefix operator {tk[1]}")
            return ("un", tk[1], self.expr(_PREFIX_BP))
        if kind == "(":
            node = self.expr(0)
            if self.take()[0] != ")":
                raise FormulaSyntaxError("formula does not parse (a parenthesis is not closed)")
            return node
        if kind == "func":
            return self.call(tk[1])
        if kind == "{":
            return self.array()
        if kind == "end":
            raise FormulaSyntaxError("formula ends too early")
        raise FormulaSyntaxError(f"formula does not parse (unexpected {self._show(tk)})")

    def call(self, raw_name):
        if ":" in raw_name or "!" in raw_name:
            raise Unsupported(f"range built with a function ({raw_name}(...)); only cell:cell ranges")
        name = raw_name.upper()
        for p in _FUNC_PREFIXES:
            if name.startswith(p):
                name = name[len(p):]
                break
        args = []
        if self.peek()[0] == "close":
            self.take()
            return ("call", name, args)
        while True:
            nxt = self.peek()[0]
            if nxt in (",", "close"):
                args.append(("missing",))
            else:
                args.append(self.expr(0))
            tk = self.take()
            if tk[0] == "close":
                return ("call", name, args)
            if tk[0] != ",":
                raise FormulaSyntaxError(f"formula does not parse in the arguments of {name}")

    def array(self):
        rows, row = [], []
        while True:
            tk = self.take()
            sign = 1.0
            if tk[0] == "pre" and tk[1] in "+-":
                sign = -1.0 if tk[1] == "-" else 1.0
                tk = self.take()
                if tk[0] != "num":
                    raise FormulaSyntaxError("array constant: a sign must come before a number")
            if tk[0] == "num":
                row.append(sign * tk[1])
            elif tk[0] == "str":
                row.append(tk[1])
            elif tk[0] == "bool":
                row.append(tk[1])
            elif tk[0] == "err":
                row.append(bi.error(tk[1]))
            else:
                raise FormulaSyntaxError("array constant: only numbers, texts, TRUE/FALSE and errors")
            sep = self.take()[0]
            if sep == ",":
                continue
            rows.append(row)
            row = []
            if sep == ";":
                continue
            if sep == "}":
                break
            raise FormulaSyntaxError("array constant is not closed")
        if any(len(r) != len(rows[0]) for r in rows):
            raise FormulaSyntaxError("array constant rows differ in length")
        return ("array", rows)


_PARSE_CACHE: dict[str, tuple] = {}


def parse(text: str):
    """Formula text (with or without the leading ``=``) -> syntax tree; raises :class:`Unsupported`."""
    if text.startswith("="):
        text = text[1:]
    node = _PARSE_CACHE.get(text)
    if node is None:
        try:
            node = _Parser(_tokens(text)).parse()
        except RecursionError:
            raise Unsupported(f"formula nested more than {MAX_DEPTH} levels deep") from None
        if len(_PARSE_CACHE) > 50_000:
            _PARSE_CACHE.clear()
        _PARSE_CACHE[text] = node
    return node


# Formulas filled down or across differ only in their relative references.  A
# formula's *template* replaces each A1-style cell reference by its offset from
# the formula's own cell (absolute parts kept as they are); formulas with the
# same template share one parse, moved with :func:`shift`.  A template is only
# used after checking that the references it encodes are exactly the cell
# references the parser found (so a name, a function or a whole-column range
# can never be mistaken for one).
_TEMPLATE_RE = re.compile(
    r'"(?:[^"]|"")*"|\'(?:[^\']|\'\')*\'|(?<![A-Za-z0-9_.\\$])(\$?)([A-Za-z]{1,3})(\$?)(\d{1,7})(?![A-Za-z0-9_(.!\[])')


def _template(text: str, r: int, c: int):
    """-> (key, [(row, col, row_abs, col_abs)...]) or None when the text has something odd."""
    if "\x00" in text:
        return None
    refs = []

    def sub(m):
        if m.group(2) is None:
            return m.group(0)
        ca, cl, ra, rd = m.group(1), m.group(2), m.group(3), m.group(4)
        row, col = int(rd), col_number(cl)
        if not (1 <= row <= MAX_ROW and 1 <= col <= MAX_COL):
            raise ValueError
        refs.append((row, col, bool(ra), bool(ca)))
        rk = f"{row}" if ra else f"[{row - r}]"
        ck = f"{col}" if ca else f"[{col - c}]"
        return f"\x00R{rk}C{ck}\x00"

    try:
        key = _TEMPLATE_RE.sub(sub, text)
    except ValueError:
        return None
    return key, refs


def _cell_refs(node, rows, cols):
    """Collect the (value, absolute) parts of every cell reference; False if the tree has
    references a template cannot carry (whole columns or rows)."""
    stack = [node]
    while stack:
        n = stack.pop()
        kind = n[0]
        if kind == "cell":
            rows.append((n[2], n[4]))
            cols.append((n[3], n[5]))
        elif kind == "area":
            if n[2] is None or n[3] is None:
                return False
            rows += [(n[2], n[6]), (n[4], n[8])]
            cols += [(n[3], n[7]), (n[5], n[9])]
        elif kind == "bin":
            stack += [n[2], n[3]]
        elif kind == "un":
            stack.append(n[2])
        elif kind == "call":
            stack += n[2]
    return True


class _Templates:
    """Parse cache keyed on the relative form of a formula at its cell."""

    def __init__(self):
        self.cache = {}

    def tree(self, text: str, r: int, c: int):
        if text.startswith("="):
            text = text[1:]
        tp = _template(text, r, c)
        if tp is None:
            return parse(text)
        key, refs = tp
        hit = self.cache.get(key)
        if hit is not None:
            tree, r0, c0 = hit
            if tree is None:
                return parse(text)
            return shift(tree, r - r0, c - c0)
        tree = parse(text)
        rows, cols = [], []
        ok = _cell_refs(tree, rows, cols)
        if ok and sorted(rows) == sorted((a, ra) for a, _, ra, _ in refs) \
                and sorted(cols) == sorted((b, ca) for _, b, _, ca in refs):
            self.cache[key] = (tree, r, c)
        else:
            self.cache[key] = (None, r, c)
        return tree


def operator_chain(node):
    """A run of operators down the left side of a tree -> (base, [(op, right operand or None)...]).

    ``A1+A2+...+A500`` is a tree 499 levels deep on its left side, and ``-`` or
    ``%`` applied to one operand nest the same way; the parser builds such runs
    in a loop, so their length has no limit.  Everything that walks a tree
    takes them apart here and loops over the steps, bottom first, so a formula's
    length is never bounded by Python's recursion.  A unary operator's step has
    None as its right operand.
    """
    steps = []
    while True:
        kind = node[0]
        if kind == "bin":
            steps.append((node[1], node[3]))
        elif kind == "un":
            steps.append((node[1], None))
        else:
            break
        node = node[2]
    steps.reverse()
    return node, steps


def shift(node, dr: int, dc: int):
    """Move the relative parts of every reference by (dr, dc) rows and columns.

    This is what copying a formula (and a shared formula's other cells) does;
    a reference moved off the sheet becomes ``#REF!``.
    """
    if dr == 0 and dc == 0:
        return node
    kind = node[0]
    if kind == "cell":
        _, sh, r, c, ra, ca = node
        r2 = r if ra else r + dr
        c2 = c if ca else c + dc
        if not (1 <= r2 <= MAX_ROW and 1 <= c2 <= MAX_COL):
            return ("err", "#REF!")
        return ("cell", sh, r2, c2, ra, ca)
    if kind == "area":
        _, sh, r1, c1, r2, c2, ra1, ca1, ra2, ca2 = node
        if r1 is not None:
            r1 = r1 if ra1 else r1 + dr
            r2 = r2 if ra2 else r2 + dr
            if not (1 <= r1 <= MAX_ROW and 1 <= r2 <= MAX_ROW):
                return ("err", "#REF!")
        if c1 is not None:
            c1 = c1 if ca1 else c1 + dc
            c2 = c2 if ca2 else c2 + dc
            if not (1 <= c1 <= MAX_COL and 1 <= c2 <= MAX_COL):
                return ("err", "#REF!")
        # a moved range may have its corners the other way round (A1:A$1 one row down is A$1:A2)
        return _area_node(sh, r1, c1, r2, c2, ra1, ca1, ra2, ca2)
    if kind == "bin" or kind == "un":
        base, steps = operator_chain(node)
        out = shift(base, dr, dc)
        for op, rhs in steps:
            out = ("bin", op, out, shift(rhs, dr, dc)) if rhs is not None else ("un", op, out)
        return out
    if kind == "call":
        return ("call", node[1], [shift(a, dr, dc) for a in node[2]])
    return node


# ---------------------------------------------------------------------------
# syntax tree -> closures

def _const(v):
    return lambda: v


def _catalogue():
    from fuelsys.sheet import catalogue

    return catalogue.functions()


class _Compiler:
    """Compiles one formula at one cell into a zero-argument closure; collects its references."""

    def __init__(self, engine, si: int, r: int, c: int, array_mode: bool):
        self.e = engine
        self.si = si
        self.r = r
        self.c = c
        self.array_mode = array_mode
        self.deps: list[tuple] = []
        self.names: list[tuple] = []

    # -- references -------------------------------------------------------
    def _sheet(self, name):
        if self.e.no_book:
            raise Unsupported("cell references need a workbook")
        if name is None:
            return self.si
        si = self.e.sheet_ids.get(name.upper())
        if si is None or not self.e.is_worksheet[si]:
            return None
        return si

    def comp(self, node, ref=False):
        kind = node[0]
        if kind == "num" or kind == "str" or kind == "bool":
            return _const(node[1])
        if kind == "err":
            return _const(bi.error(node[1]))
        if kind == "missing":
            return _const(MISSING)
        if kind == "cell":
            return self._cell(node, ref)
        if kind == "area":
            return self._area(node, ref)
        if kind == "name":
            return self._name(node, ref)
        if kind == "bin" or kind == "un":
            return self._operators(node)
        if kind == "call":
            return self._call(node, ref)
        if kind == "array":
            arr = Array(node[1])
            return _const(arr)
        raise Unsupported(f"formula part {kind}")

    def _cell(self, node, ref):
        _, sh, r, c, _, _ = node
        si = self._sheet(sh)
        if si is None:
            return _const(bi.REF)
        self.deps.append((si, r, c, r, c))
        key = (si, r, c)
        get = self.e.vals.get
        if ref:
            def cell_ref():
                return Array([[get(key)]], 1, 1, True, si, r, c)

            return cell_ref
        return lambda: get(key)

    def _area(self, node, ref):
        _, sh, r1, c1, r2, c2 = node[:6]
        si = self._sheet(sh)
        if si is None:
            return _const(bi.REF)
        whole_cols, whole_rows = r1 is None, c1 is None
        r1, r2 = (1, MAX_ROW) if whole_cols else (r1, r2)
        c1, c2 = (1, MAX_COL) if whole_rows else (c1, c2)
        if not ref and not self.array_mode:
            # implicit intersection: the cell of the range in this formula's row or column
            rr = r1 if r1 == r2 else (self.r if r1 <= self.r <= r2 else None)
            cc = c1 if c1 == c2 else (self.c if c1 <= self.c <= c2 else None)
            if rr is None or cc is None:
                return _const(bi.VALUE)
            return self._cell(("cell", sh, rr, cc, True, True), False)
        if (whole_cols or whole_rows) and not ref:
            raise Unsupported("whole-column or whole-row reference in an element-wise array operation")
        # a whole column or row stops at the sheet's last used cell (the rest is empty);
        # a range typed out in full is read in full
        maxr, maxc = self.e.extent[si]
        er = min(r2, maxr) if whole_cols else r2
        ec = min(c2, maxc) if whole_rows else c2
        if max(0, er - r1 + 1) * max(0, ec - c1 + 1) > bi.MAX_ARRAY_CELLS:
            raise Unsupported(f"range of more than {bi.MAX_ARRAY_CELLS} cells")
        self.deps.append((si, r1, c1, er, ec))
        nrows, ncols = r2 - r1 + 1, c2 - c1 + 1
        vals = self.e.vals
        cache = self.e.area_cache
        akey = (si, r1, c1, r2, c2)

        def area():
            arr = cache.get(akey)
            if arr is None:
                get = vals.get
                cols = range(c1, ec + 1)
                rows = [[get((si, rr, cc)) for cc in cols] for rr in range(r1, er + 1)]
                arr = Array(rows, nrows, ncols, True, si, r1, c1, whole_cols or whole_rows)
                cache[akey] = arr  # final: every formula cell in it was computed before this one
            return arr

        return area

    def _name(self, node, ref):
        _, sh, name = node
        if sh is not None:
            si = self._sheet(sh)
            if si is None:
                return _const(bi.REF)
            key = self.e.find_name(name, si)
        else:
            key = self.e.find_name(name, self.si if not self.e.no_book else None)
        if key is None:
            return _const(bi.NAME)
        if key in self.names:
            raise Unsupported(f"defined name {name} refers to itself")
        tree = self.e.name_tree(key)
        self.names.append(key)
        try:
            # names keep relative references relative to A1 of the cell that uses them
            return self.comp(shift(tree, self.r - 1, self.c - 1) if not self.e.no_book else tree, ref)
        finally:
            self.names.pop()

    # -- operators --------------------------------------------------------
    def _operators(self, node):
        """A run of operators (see :func:`operator_chain`) as one loop: no recursion per operand."""
        base, steps = operator_chain(node)
        bc = bi.broadcast
        fb = self.comp(base)
        ops = []
        for op, rhs in steps:
            if rhs is None:
                if op != "+":  # unary plus leaves its operand as it is
                    ops.append((bi.UNARY[op], None))
            else:
                ops.append((bi.BINARY[op], self.comp(rhs)))
        if not ops:
            return fb
        if len(ops) == 1:
            op, fr = ops[0]
            if fr is None:
                def unary():
                    x = fb()
                    if type(x) is Array:
                        return bc(op, (x,))
                    return op(x)

                return unary

            def binary():
                x = fb()
                y = fr()
                if type(x) is Array or type(y) is Array:
                    return bc(op, (x, y))
                return op(x, y)

            return binary

        def chain():
            x = fb()
            for op, fr in ops:
                if fr is None:
                    x = bc(op, (x,)) if type(x) is Array else op(x)
                else:
                    y = fr()
                    x = bc(op, (x, y)) if type(x) is Array or type(y) is Array else op(x, y)
            return x

        return chain

    # -- functions --------------------------------------------------------
    def _call(self, node, ref):
        _, name, args = node
        if name in bi.REFUSED:
            raise Unsupported(bi.REFUSED[name])
        if name in bi.SPECIAL:
            return getattr(self, "_special_" + name.lower())(args, ref)
        b = bi.FUNCTIONS.get(name)
        if b is not None:
            return self._builtin(b, args)
        spec = self.e.catalogue.get(name)
        if spec is not None:
            return self._catalogue_call(spec, args)
        raise Unsupported(f"unsupported function {name}")

    def _arity(self, name, args, lo, hi):
        if len(args) < lo or (hi is not None and len(args) > hi):
            want = f"{lo}" if lo == hi else (f"{lo} or more" if hi is None else f"{lo} to {hi}")
            raise Unsupported(f"{name} takes {want} arguments (got {len(args)})")

    def _builtin(self, b, args):
        self._arity(b.name, args, b.min_args, b.max_args)
        if b.name == "SUMPRODUCT":  # its arguments are arrays even in a single-cell formula
            saved, self.array_mode = self.array_mode, True
            try:
                fs = [self.comp(a, True) for a in args]
            finally:
                self.array_mode = saved
        else:
            fs = [self.comp(a, b.kind(i) == "r") for i, a in enumerate(args)]
        fn = b.fn
        n = len(fs)
        if n == 0:
            return fn
        if n == 1:
            f0 = fs[0]
            return lambda: fn(f0())
        if n == 2:
            f0, f1 = fs
            return lambda: fn(f0(), f1())
        return lambda: fn(*[f() for f in fs])

    def _catalogue_call(self, spec, args):
        from fuelsys.sheet.adapt import call_spec, set_note_sink

        fs = [self.comp(a, True) for a in args]
        memo = self.e.call_memo
        name = spec.name
        pure = not spec.volatile

        def catalogue_call():
            cells = []
            scalar = pure
            for f in fs:
                v = f()
                t = type(v)
                if t is Array:
                    # whole columns and rows come as far as the sheet's last used cell
                    rows = [list(r) for r in v.rows] if v.clipped else v.full_rows()
                    for row in rows:
                        for x in row:
                            if type(x) is XlError:
                                return x
                    if v.nrows == 1 and v.ncols == 1:
                        cells.append(rows[0][0] if rows else None)
                    else:
                        cells.append(rows)
                        scalar = False
                elif t is XlError:
                    return v
                elif v is MISSING:
                    cells.append(None)
                else:
                    cells.append(v)
            if scalar:
                # the same function on the same single values gives the same result (and notes)
                key = (name, tuple((type(x), x) for x in cells))
                hit = memo.get(key)
                if hit is None:
                    sink = []
                    outer = set_note_sink(sink)
                    try:
                        out = call_spec(spec, *cells)
                    finally:
                        set_note_sink(outer)
                    if outer is not None:
                        outer.extend(sink)
                    if len(memo) < 200_000:
                        memo[key] = (out, tuple(sink))
                else:
                    out, notes = hit
                    if notes and self.e.note_sink is not None:
                        self.e.note_sink.extend(notes)
            else:
                out = call_spec(spec, *cells)
            if isinstance(out, list):
                return Array([list(r) for r in out])
            return out

        return catalogue_call

    def _special_if(self, args, ref):
        self._arity("IF", args, 2, 3)
        fc = self.comp(args[0])
        ft = self.comp(args[1], ref)
        fe = self.comp(args[2], ref) if len(args) > 2 else _const(False)

        def pick(c, t, e):
            b = bi.to_bool(c)
            if type(b) is XlError:
                return b
            return t if b else e

        def if_():
            c = fc()
            if type(c) is Array:
                return bi.broadcast(pick, (c, ft(), fe()))
            b = bi.to_bool(c)
            if type(b) is XlError:
                return b
            return ft() if b else fe()

        return if_

    def _catch(self, args, ref, name, catches):
        self._arity(name, args, 2, 2)
        fv = self.comp(args[0], ref)
        fa = self.comp(args[1], ref)

        def pick(v, a):
            return a if catches(v) else v

        def catch():
            v = fv()
            if type(v) is Array:
                return bi.broadcast(pick, (v, fa()))
            return fa() if catches(v) else v

        return catch

    def _special_single(self, args, ref):
        """``@x`` (stored as _xlfn.SINGLE): x reduced to one value by implicit intersection."""
        self._arity("SINGLE", args, 1, 1)
        saved, self.array_mode = self.array_mode, False
        try:
            f = self.comp(args[0])
        finally:
            self.array_mode = saved

        def single():
            v = f()
            if type(v) is Array:
                return v.at(0, 0) if v.nrows and v.ncols else bi.VALUE
            return v

        return single

    def _special_iferror(self, args, ref):
        return self._catch(args, ref, "IFERROR", lambda v: type(v) is XlError)

    def _special_ifna(self, args, ref):
        return self._catch(args, ref, "IFNA", lambda v: type(v) is XlError and v == bi.NA)

    def _special_choose(self, args, ref):
        self._arity("CHOOSE", args, 2, 255)
        fi = self.comp(args[0])
        opts = [self.comp(a, ref) for a in args[1:]]

        def index_of(i):
            x = bi.to_number(i)
            if type(x) is XlError:
                return x
            k = int(x)
            if not 1 <= k <= len(opts):
                return bi.VALUE
            return k

        def choose():
            i = fi()
            if type(i) is Array:
                vals = [f() for f in opts]

                def one(x, *vs):
                    k = index_of(x)
                    return k if type(k) is XlError else vs[k - 1]

                return bi.broadcast(one, (i, *vals))
            k = index_of(i)
            return k if type(k) is XlError else opts[k - 1]()

        return choose


# ---------------------------------------------------------------------------
# the workbook engine

@dataclass(slots=True)
class _Node:
    key: tuple
    kind: str
    area: tuple | None
    tree: object = None
    fn: object = None
    deps: set = field(default_factory=set)
    reason: str | None = None


@dataclass
class Computation:
    """What one run of the engine produced.

    ``values`` maps (sheet index, row, col) of every computed formula cell
    (array cells included) to its value; ``skipped`` maps each formula cell that
    was not computed to the reason; ``names`` gives the sheet names.
    """

    values: dict
    skipped: dict
    sheets: list
    seconds: float
    formula_cells: int
    #: formula cell -> validity notes (computed outside a correlation's fitted range)
    notes: dict = field(default_factory=dict)

    def notes_list(self) -> list[tuple[str, tuple]]:
        return [(self.cell(k), v) for k, v in sorted(self.notes.items())]

    def cell(self, key) -> str:
        si, r, c = key
        return full_name(self.sheets[si], r, c)

    def skipped_list(self) -> list[tuple[str, str]]:
        return [(self.cell(k), why) for k, why in sorted(self.skipped.items())]


class Engine:
    """Computes every formula of a :class:`fuelsys.sheet.xlsx.Book`."""

    def __init__(self, book=None):
        self.book = book
        self.no_book = book is None
        sheets = book.sheets if book is not None else []
        self.sheet_names = [s.name for s in sheets]
        self.sheet_ids = {s.name.upper(): i for i, s in enumerate(sheets)}
        self.is_worksheet = [s.kind == "worksheet" for s in sheets]
        self.vals: dict = {}
        self.extent = []
        for si, s in enumerate(sheets):
            for (r, c), v in s.cells.items():
                self.vals[(si, r, c)] = v
            self.extent.append((s.max_row, s.max_col))
        self.area_cache: dict = {}
        self.call_memo: dict = {}
        self.note_sink = None  # the current cell's validity notes while it computes
        self.catalogue = _catalogue()
        self._names = {}
        self._name_trees = {}
        for dn in (book.names if book is not None else []):
            self._names[(dn.scope, dn.name.upper())] = dn.text

    # -- defined names ------------------------------------------------------
    def find_name(self, name, si):
        """The key of defined name ``name`` as seen from sheet ``si``: its own sheet-level name first."""
        if si is not None and (si, name) in self._names:
            return (si, name)
        if (None, name) in self._names:
            return (None, name)
        return None

    def name_tree(self, key):
        tree = self._name_trees.get(key)
        if tree is None:
            text = self._names[key]
            try:
                tree = parse(text)
            except Unsupported as exc:
                raise Unsupported(f"defined name {key[1]}: {exc}") from None
            self._name_trees[key] = tree
        return tree

    # -- one formula --------------------------------------------------------
    def compile(self, tree, si=0, r=1, c=1, array_mode=False):
        comp = _Compiler(self, si, r, c, array_mode)
        fn = comp.comp(tree)
        return fn, comp.deps

    # -- the whole book -----------------------------------------------------
    def _nodes(self):
        nodes: dict[tuple, _Node] = {}
        owner: dict[tuple, tuple] = {}
        templates = _Templates()
        for si, s in enumerate(self.book.sheets):
            if s.kind != "worksheet":
                continue
            masters = {}
            for (r, c), f in s.formulas.items():
                if f.kind == "shared" and f.text is not None:
                    masters[f.si] = (r, c, f.text)
            for (r, c), f in sorted(s.formulas.items()):
                key = (si, r, c)
                node = _Node(key, f.kind, f.ref)
                nodes[key] = node
                try:
                    if f.kind == "datatable":
                        raise Unsupported("data table (what-if analysis table)")
                    if f.kind == "shared" and f.text is None:
                        m = masters.get(f.si)
                        if m is None:
                            raise Unsupported(f"shared formula {f.si} without its first cell")
                        node.tree = shift(templates.tree(m[2], m[0], m[1]), r - m[0], c - m[1])
                    else:
                        if not f.text or not f.text.strip():
                            raise FormulaSyntaxError("empty formula")
                        node.tree = templates.tree(f.text, r, c)
                except Unsupported as exc:
                    node.reason = str(exc)
                if f.kind == "array" and f.ref is not None:
                    r1, c1, r2, c2 = f.ref
                    for rr in range(r1, r2 + 1):
                        for cc in range(c1, c2 + 1):
                            k2 = (si, rr, cc)
                            if k2 in owner and owner[k2] != key:
                                node.reason = f"array formula overlaps the formula in {full_name(s.name, rr, cc)}"
                            owner[k2] = key
                else:
                    owner.setdefault(key, key)
        return nodes, owner

    def run(self, progress=None) -> Computation:
        """Compile, order and compute every formula cell.

        The automatic garbage collector is paused meanwhile (the run makes millions
        of small objects, and full collections over them cost more than the run);
        the young generations are collected every :data:`GC_EVERY` cells instead, so
        the reference cycles that catalogue calls leave behind (numpy, warnings)
        are freed as the run goes and memory stays proportional to the book.
        """
        was_enabled = gc.isenabled()
        gc.disable()
        try:
            return self._run(progress)
        finally:
            if was_enabled:
                gc.enable()

    def _run(self, progress):
        t0 = time.perf_counter()
        nodes, owner = self._nodes()
        # compile
        for key, node in nodes.items():
            if node.reason:
                continue
            si, r, c = key
            try:
                node.fn, deps = self.compile(node.tree, si, r, c, array_mode=node.kind == "array")
            except Unsupported as exc:
                node.reason = str(exc)
                continue
            finally:
                node.tree = None  # compiled: the tree is not needed any more
            node.deps = self._dep_nodes(deps, owner)
        order, cyclic = _topological(nodes, self.sheet_names)
        skipped: dict[tuple, str] = {}
        for key, why in cyclic.items():
            skipped[key] = why
        values: dict[tuple, object] = {}
        notes: dict[tuple, tuple] = {}
        from fuelsys.sheet.adapt import set_note_sink

        vals = self.vals
        n = len(order)
        step = max(1, n // 200)
        for i, key in enumerate(order):
            node = nodes[key]
            if progress is not None and i % step == 0:
                progress(i, n)
            if i % GC_EVERY == GC_EVERY - 1:
                gc.collect(1)
            if node.reason:
                skipped[key] = node.reason
                continue
            bad = next((d for d in node.deps if d in skipped), None)
            if bad is not None:
                root = skipped[bad]
                skipped[key] = root if root.startswith("depends on ") else \
                    f"depends on {self._name(bad)} ({root})"
                continue
            sink = self.note_sink = []
            outer = set_note_sink(sink)
            try:
                out = node.fn()
            except Exception as exc:
                if STRICT:
                    raise
                skipped[key] = f"internal error ({type(exc).__name__}: {exc})"
                continue
            finally:
                set_note_sink(outer)
                self.note_sink = None
            if sink:
                notes[key] = tuple(dict.fromkeys(sink))
            si, r, c = key
            if node.kind == "array" and node.area is not None:
                r1, c1, r2, c2 = node.area
                for rr in range(r1, r2 + 1):
                    for cc in range(c1, c2 + 1):
                        v = bi.result_value(bi.element_at(out, rr - r1, cc - c1))
                        k2 = (si, rr, cc)
                        vals[k2] = v
                        values[k2] = v
            else:
                if type(out) is Array:
                    out = out.at(0, 0) if out.nrows and out.ncols else bi.VALUE
                v = bi.result_value(out)
                vals[key] = v
                values[key] = v
        if progress is not None:
            progress(n, n)
        return Computation(values, skipped, self.sheet_names, time.perf_counter() - t0, len(nodes), notes)

    def _name(self, key):
        si, r, c = key
        return full_name(self.sheet_names[si], r, c)

    def _dep_nodes(self, deps, owner) -> set:
        index = self._index(owner)
        out = set()
        for si, r1, c1, r2, c2 in deps:
            if r1 == r2 and c1 == c2:
                k = owner.get((si, r1, c1))
                if k is not None:
                    out.add(k)
                continue
            cols, colrows = index.get(si, ((), {}))
            for cc in cols[bisect_left(cols, c1):bisect_right(cols, c2)]:
                rows, owners = colrows[cc]
                out.update(owners[bisect_left(rows, r1):bisect_right(rows, r2)])
        return out

    def _index(self, owner):
        idx = getattr(self, "_owner_index", None)
        if idx is None:
            per = {}
            for (si, r, c), k in owner.items():
                per.setdefault(si, {}).setdefault(c, []).append((r, k))
            idx = {}
            for si, cols in per.items():
                colrows = {}
                for c, lst in cols.items():
                    lst.sort()
                    colrows[c] = ([r for r, _ in lst], [k for _, k in lst])
                idx[si] = (sorted(cols), colrows)
            self._owner_index = idx
        return idx


def _topological(nodes, sheet_names):
    """Kahn's algorithm -> (order, {key: reason} for cells in or behind a circular reference)."""
    indeg = {k: 0 for k in nodes}
    dependents: dict[tuple, list] = {}
    for k, node in nodes.items():
        for d in node.deps:
            dependents.setdefault(d, []).append(k)
            indeg[k] += 1
    queue = deque(k for k, n in indeg.items() if n == 0)
    order = []
    while queue:
        k = queue.popleft()
        order.append(k)
        for dk in dependents.get(k, ()):
            indeg[dk] -= 1
            if indeg[dk] == 0:
                queue.append(dk)
    if len(order) == len(nodes):
        return order, {}
    left = {k for k, n in indeg.items() if n > 0}
    return order, _circular_reasons(nodes, left, sheet_names)


def _circular_reasons(nodes, left, sheet_names):
    """Name the loops among ``left`` (iterative Tarjan); the rest depend on a loop."""

    def text_of(key):
        si, r, c = key
        return full_name(sheet_names[si], r, c)

    index, low, on_stack, stack, sccs = {}, {}, set(), [], []
    counter = 0
    for start in sorted(left):
        if start in index:
            continue
        work = [(start, iter(sorted(d for d in nodes[start].deps if d in left)))]
        index[start] = low[start] = counter
        counter += 1
        stack.append(start)
        on_stack.add(start)
        while work:
            v, it = work[-1]
            advanced = False
            for w in it:
                if w not in index:
                    index[w] = low[w] = counter
                    counter += 1
                    stack.append(w)
                    on_stack.add(w)
                    work.append((w, iter(sorted(d for d in nodes[w].deps if d in left))))
                    advanced = True
                    break
                if w in on_stack:
                    low[v] = min(low[v], index[w])
            if advanced:
                continue
            work.pop()
            if work:
                low[work[-1][0]] = min(low[work[-1][0]], low[v])
            if low[v] == index[v]:
                comp = []
                while True:
                    w = stack.pop()
                    on_stack.discard(w)
                    comp.append(w)
                    if w == v:
                        break
                sccs.append(sorted(comp))
    loops = [c for c in sccs if len(c) > 1 or c[0] in nodes[c[0]].deps]
    reasons = {}
    for comp in loops:
        text = ", ".join(text_of(k) for k in comp[:10])
        more = f" and {len(comp) - 10} more" if len(comp) > 10 else ""
        for k in comp:
            reasons[k] = f"circular reference among {text}{more}"
    first = text_of(loops[0][0]) if loops else "?"
    for k in left:
        if k not in reasons:
            reasons[k] = f"depends on a circular reference (at {first})"
    return reasons


# ---------------------------------------------------------------------------
# the Python API

def evaluate_formula(text: str, book=None, sheet: str | None = None):
    """Compute one formula (``'FS_DENSITY("kerosene", 15)*2'``) as a cell would.

    Without ``book`` the formula may use constants, built-ins and catalogue
    functions only.  With a book (a path or a :class:`fuelsys.sheet.xlsx.Book`)
    the book is computed first and the formula may refer to its cells; an
    unqualified reference means ``sheet`` (default: the first sheet).  Returns
    a value (float, str, bool, :class:`XlError`) or an :class:`Array` for a
    table; raises :class:`Unsupported` for a formula the engine refuses.

    Examples
    --------
    >>> evaluate_formula("ROUND(2.5, 0) & \\" \\" & -2^2")
    '3 4'
    """
    if book is not None and not hasattr(book, "sheets"):
        from fuelsys.sheet import xlsx

        book = xlsx.read_book(book)
    engine = Engine(book)
    si = 0
    if book is not None:
        comp = engine.run()
        if comp.skipped:
            raise EvaluationError(_skipped_message(comp), comp.skipped)
        if sheet is not None:
            si = engine.sheet_ids.get(sheet.upper())
            if si is None:
                raise Unsupported(f"no sheet named {sheet!r}")
        engine.area_cache.clear()
    fn, _ = engine.compile(parse(text), si, 1, 1, array_mode=True)
    out = fn()
    if type(out) is Array:
        rows = [[bi.result_value(v) for v in row] for row in out.full_rows()]
        if len(rows) == 1 and len(rows[0]) == 1:
            return rows[0][0]
        return Array(rows)
    return bi.result_value(out)


def compute_book(book, progress=None) -> Computation:
    """Run the engine over a parsed book."""
    return Engine(book).run(progress)


def _skipped_message(comp: Computation, limit: int = 10) -> str:
    items = comp.skipped_list()
    lines = [f"{cell}: {why}" for cell, why in items[:limit]]
    if len(items) > limit:
        lines.append(f"... and {len(items) - limit} more")
    return f"{len(items)} formula cell(s) not computed:\n  " + "\n  ".join(lines)


def evaluate_workbook(path, allow_partial: bool = False) -> dict:
    """Every formula cell of the book at ``path`` -> its freshly computed value.

    Keys are ``(sheet name, "B3")``; values are float, str, bool or
    :class:`XlError`.  Nothing is written.  Raises :class:`EvaluationError`
    when a cell could not be computed, unless ``allow_partial`` (then those
    cells are left out).
    """
    from fuelsys.sheet import xlsx

    book = xlsx.read_book(path)
    comp = compute_book(book)
    if comp.skipped and not allow_partial:
        raise EvaluationError(_skipped_message(comp), comp.skipped)
    return {(comp.sheets[si], cell_name(r, c)): v for (si, r, c), v in comp.values.items()}


@dataclass
class Report:
    """The result of :func:`recalc_workbook`."""

    path: str
    output: str | None
    computed: int
    skipped: list
    changed_parts: list
    seconds: float
    written: bool
    #: (cell, notes) of the cells computed outside a correlation's fitted range
    notes: list = field(default_factory=list)
    #: cells whose result is an ``FS error:`` text, and cells whose result is an error value (#VALUE! ...)
    fs_errors: int = 0
    error_values: int = 0
    #: what the write could not keep (owner, extended attributes) or what --force let through
    warnings: list = field(default_factory=list)

    @property
    def ok(self) -> bool:
        return not self.skipped

    def summary(self) -> str:
        where = f"written to {self.output}" if self.written else \
            "nothing written (fix the cells listed, or allow a partial result)"
        flagged = (f"; {len(self.notes)} cell(s) computed outside a correlation's fitted range"
                   " (--notes lists them)") if self.notes else ""
        errors = (f", {self.fs_errors} showing an FS error text, {self.error_values} an error value"
                  if (self.fs_errors or self.error_values) else "")
        return (f"{os.path.basename(self.path)}: {self.computed} cells computed{errors}, "
                f"{len(self.skipped)} skipped, {len(self.changed_parts)} sheet part(s) changed, "
                f"{self.seconds:.2f} s; {where}{flagged}")


def recalc_workbook(path, output=None, allow_partial: bool = False, progress=None,
                    follow_symlinks: bool = False, force: bool = False) -> Report:
    """Compute every formula of the book at ``path`` and store the values loss-free.

    Only the formula cells' cached values in the changed sheet parts are
    rewritten; every other part of the file stays byte-identical (see
    :mod:`fuelsys.sheet.xlsx`).  The book is written in place (atomically)
    unless ``output`` names another file.  When a cell cannot be computed
    nothing is written unless ``allow_partial``; then the computable cells are
    stored and the others keep what they had.  The output policy of
    :func:`fuelsys.sheet.xlsx.output_target` (symbolic links, devices,
    read-only and hard-linked files; ``follow_symlinks`` and ``force``) is
    applied before anything is computed.
    """
    from fuelsys.sheet import xlsx

    t0 = time.perf_counter()
    target = os.fspath(output) if output is not None else os.fspath(path)
    book = xlsx.read_book(path)
    xlsx.output_target(target, follow_symlinks, force)
    comp = compute_book(book, progress)
    skipped = comp.skipped_list()
    fs_err = sum(1 for v in comp.values.values() if isinstance(v, str) and v.startswith("FS error:"))
    err_val = sum(1 for v in comp.values.values() if type(v) is XlError)
    if skipped and not allow_partial:
        return Report(os.fspath(path), None, len(comp.values), skipped, [], time.perf_counter() - t0, False,
                      comp.notes_list(), fs_err, err_val)
    updates = {}
    for (si, r, c), v in comp.values.items():
        updates.setdefault(si, {})[(r, c)] = v
    warnings = []
    changed = xlsx.write_values(book, updates, target, follow_symlinks, force, warnings)
    return Report(os.fspath(path), target, len(comp.values), skipped, changed, time.perf_counter() - t0, True,
                  comp.notes_list(), fs_err, err_val, warnings)


@dataclass
class Difference:
    cell: str
    stored: object
    computed: object


@dataclass
class CheckReport:
    """The result of :func:`check_workbook`."""

    path: str
    checked: int
    differences: list
    skipped: list
    seconds: float

    @property
    def ok(self) -> bool:
        return not self.differences and not self.skipped


def same_value(stored, computed, rel_tol: float = 1e-9) -> bool:
    """Stored and computed values agree: numbers within ``rel_tol`` (relative), everything else exactly."""
    ts, tc = type(stored), type(computed)
    if ts is float and tc is float:
        if stored == computed:
            return True
        return abs(stored - computed) <= rel_tol * max(abs(stored), abs(computed))
    if ts is not tc:
        return False
    return stored == computed


def check_workbook(path, rel_tol: float = 1e-9, progress=None) -> CheckReport:
    """Recompute the book at ``path`` without writing and list the cells whose stored value differs."""
    from fuelsys.sheet import xlsx

    t0 = time.perf_counter()
    book = xlsx.read_book(path)
    comp = compute_book(book, progress)
    diffs = []
    for key in sorted(comp.values):
        si, r, c = key
        stored = book.sheets[si].cells.get((r, c))
        new = comp.values[key]
        if stored is None or not same_value(stored, new, rel_tol):
            diffs.append(Difference(comp.cell(key), stored, new))
    return CheckReport(os.fspath(path), len(comp.values), diffs, comp.skipped_list(), time.perf_counter() - t0)


def describe_value(v) -> str:
    """A value as a short text for messages (numbers to 15 significant digits)."""
    if v is None:
        return "(nothing stored)"
    if type(v) is float:
        return bi.number_text(v) if math.isfinite(v) else repr(v)
    if type(v) is bool:
        return "TRUE" if v else "FALSE"
    if type(v) is str:
        return '"' + (v if len(v) <= 60 else v[:57] + "...") + '"'
    return str(v)
