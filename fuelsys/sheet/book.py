"""Whole-book jobs: the demo book and its summary, a new book, and the diff of two versions.

Books are read with the headless engine's own safe reader
(:func:`fuelsys.sheet.xlsx.read_book`); nothing here saves a user's book
through a library that rewrites it.
"""

from __future__ import annotations

import math
import os
import shutil
from dataclasses import dataclass
from pathlib import Path

from fuelsys.sheet.starter import STARTER_PATH

DEMO_NAME = "fuelsys-demo.xlsx"


def _cell_address(r: int, c: int) -> str:
    from fuelsys.sheet.evaluate import cell_name

    return cell_name(r, c)


def inputs_digest(book) -> str:
    """A short SHA-256 digest of a parsed book's inputs and formulas.

    It covers every worksheet's constant cells (not the stored results) and the
    text of every formula, so two books with the same digest compute the same
    results; ``fuelsys check`` prints it and ``fuelsys share`` writes it into
    the copy, so a reader can tell which book a shared copy came from.
    """
    import hashlib

    h = hashlib.sha256()
    for sheet in book.sheets:
        if sheet.kind != "worksheet":
            continue
        spilled = _array_cells(sheet)
        keys = sorted(set(sheet.cells) | set(sheet.formulas))
        for r, c in keys:
            f = sheet.formulas.get((r, c))
            if f is not None:
                item = ("f", f.text if f.text is not None else f"shared {f.si}", f.kind)
            elif (r, c) in spilled:
                continue
            else:
                v = sheet.cells.get((r, c))
                if v is None or v == "":
                    continue
                item = ("v", type(v).__name__, repr(v))
            h.update(repr((sheet.name, r, c) + item).encode("utf-8"))
            h.update(b"\n")
    return h.hexdigest()[:16]


def read_summary(path) -> list[tuple[str, object]]:
    """(label, cached value) rows of the book's Summary sheet."""
    from fuelsys.sheet.xlsx import read_book

    book = read_book(path)
    sheet = book.sheet("Summary")
    rows = []
    for r in range(1, sheet.max_row + 1):
        label = sheet.cells.get((r, 1))
        if (r, 2) in sheet.formulas and isinstance(label, str):
            rows.append((label, sheet.cells.get((r, 2))))
    return rows


def _edited(existing: Path, fresh: Path) -> bool:
    """True when ``existing`` is not simply an earlier demo book: its inputs or formulas were changed."""
    try:
        diffs = diff_books(existing, fresh)
    except Exception:  # not a book we can read: treat it as the user's
        return True
    # only the build date on the first sheet may differ between two unedited demo books
    return any(d.kind in ("input", "formula", "sheet") and not _is_build_date(d) for d in diffs)


def _is_build_date(d) -> bool:
    import re

    return d.sheet == "Start here" and all(isinstance(v, str) and re.fullmatch(r"\d{4}-\d\d-\d\d", v)
                                           for v in (d.old, d.new))


def write_demo(folder=".", progress=None, reports: list | None = None, replaced: list | None = None) -> Path:
    """Build the demo engine's book in ``folder`` (computed) and return its path.

    An existing ``fuelsys-demo.xlsx`` is replaced only when it is an unedited
    demo book; one whose inputs or formulas someone changed is kept, and the
    new book gets the next free name (``fuelsys-demo-1.xlsx`` ...).  The
    path of a book that was replaced is appended to ``replaced``, so the
    caller can say so.
    """
    from fuelsys.sheet import starter

    folder = Path(folder)
    target = folder / DEMO_NAME
    tmp = folder / f".{DEMO_NAME}.tmp-{os.getpid()}.xlsx"
    try:
        starter.build(tmp, compute=True, title_note="demo", reports=reports)
        k = 0
        while target.exists() and _edited(target, tmp):
            k += 1
            target = folder / f"{Path(DEMO_NAME).stem}-{k}.xlsx"
        if target.exists() and replaced is not None:
            replaced.append(target)
        os.replace(tmp, target)
    finally:
        if tmp.exists():
            tmp.unlink()
    return target


def new_book(path, force: bool = False) -> Path:
    """Start a builder's own book as a copy of the committed starter (byte for byte)."""
    path = Path(path)
    if path.suffix.lower() != ".xlsx":
        raise ValueError(f"a new book needs the .xlsx extension (got {path.name})")
    if not path.parent.is_dir():
        raise ValueError(f"the folder {path.parent} does not exist")
    if path.exists() and not force:
        raise FileExistsError(f"{path} exists already; choose another name or use --force")
    tmp = path.with_name(f".{path.name}.tmp-{os.getpid()}.xlsx")
    try:
        if STARTER_PATH.exists():  # a checkout: the committed starter, byte for byte
            shutil.copyfile(STARTER_PATH, tmp)
        else:  # an installed package carries the builder, not the file: build it the same way
            from fuelsys.sheet import starter

            starter.build(tmp)
        os.replace(tmp, path)
    finally:
        if tmp.exists():
            tmp.unlink()
    return path


# ---------------------------------------------------------------------------
# labels: sheet, row label and column heading of a cell

#: a unit cell beside a label row is at most this long and has no "[" (a heading such as "flow [g/min]" has)
_UNIT_CHARS = 15
#: a section title (a row holding only a text in column A) is at most this long
_TITLE_CHARS = 60


def _short(v) -> str:
    if isinstance(v, float):
        return f"{v:.6g}"
    return str(v).strip()


class Labeller:
    """Names the cells of one sheet by section title, row label and column heading.

    A *label row* (a text in column A, its value in B, perhaps a unit in C and
    nothing further right) names its value by the label alone.  A table cell
    is named by its table's section title (the nearest short title above),
    its row's key (column A: a text, or a number prefixed by its column's
    heading, as in "Δp [bar] 0.5") and its column heading.  A table computed
    by one array formula whose first row is texts takes those texts as its
    headings and its first column as the row key.
    """

    def __init__(self, sheet):
        self.s = sheet
        self.cells = sheet.cells
        self.arrays = {}
        for (r, c), f in sheet.formulas.items():
            if f.kind == "array" and f.ref:
                r1, c1, r2, c2 = f.ref
                for rr in range(r1, r2 + 1):
                    for cc in range(c1, c2 + 1):
                        self.arrays[(rr, cc)] = f.ref

    def _row(self, r):
        return {c: v for (rr, c), v in self.cells.items() if rr == r and v not in (None, "")}

    def _texts_row(self, r) -> bool:
        row = self._row(r)
        return bool(row) and all(isinstance(v, str) for v in row.values())

    def is_label_row(self, r) -> bool:
        row = self._row(r)
        if not isinstance(row.get(1), str) or not row or max(row) > 3:
            return False
        unit = row.get(3)
        return unit is None or (isinstance(unit, str) and len(unit) <= _UNIT_CHARS and "[" not in unit)

    def _is_heading_row(self, r) -> bool:
        row = self._row(r)
        texts = [v for v in row.values() if isinstance(v, str)]
        return len(texts) >= 2 and len(texts) == len(row) and not self.is_label_row(r)

    def _heading(self, r, c):
        """(heading text, its row) above (r, c) in an unbroken column, or (None, None)."""
        for rr in range(r - 1, 0, -1):
            v = self.cells.get((rr, c))
            if v is None and (rr, c) not in self.s.formulas:
                return None, None
            if isinstance(v, str) and v.strip() and (rr, c) not in self.s.formulas \
                    and (rr, c) not in self.arrays and self._is_heading_row(rr):
                return v.strip(), rr
        return None, None

    def _title(self, r) -> str:
        for rr in range(r - 1, 0, -1):
            row = self._row(rr)
            if list(row) == [1] and isinstance(row[1], str) and len(row[1]) <= _TITLE_CHARS:
                return row[1].strip()
        return ""

    def _key(self, r, c1, heading_row):
        """The row key in column ``c1``: a text as it is, a number after its column's heading."""
        v = self.cells.get((r, c1))
        if v is None or v == "":
            return ""
        if isinstance(v, str):
            return v.strip()
        head = self.cells.get((heading_row, c1)) if heading_row else None
        return f"{head.strip()} {_short(v)}" if isinstance(head, str) and head.strip() else _short(v)

    def label(self, r, c) -> str:
        ref = self.arrays.get((r, c))
        if ref is not None:
            r1, c1, r2, c2 = ref
            if self._texts_row(r1) or all(isinstance(self.cells.get((r1, cc)), str) for cc in range(c1, c2 + 1)):
                if r == r1:
                    return " / ".join(p for p in (self._title(r1), "heading") if p)
                head = self.cells.get((r1, c))
                key = self._key(r, c1, r1) if (c != c1 and r2 - r1 >= 2) else ""
                return " / ".join(p for p in (self._title(r1), key, _short(head)) if p)
            # a spilled (label, value) list: the label is its first column
            if c != c1 and isinstance(self.cells.get((r, c1)), str):
                head, hr = self._heading(r1, c)
                return " / ".join(p for p in (self.cells[(r, c1)].strip(), head) if p)
        if self.is_label_row(r) and c >= 2:
            label = self.cells[(r, 1)].strip()
            return label if c == 2 else f"{label} (unit)"
        head, hr = self._heading(r, c)
        if head is None:
            key = self.cells.get((r, 1)) if c != 1 else None
            return key.strip() if isinstance(key, str) else ""
        key = self._key(r, 1, hr) if c != 1 else ""
        return " / ".join(p for p in (self._title(hr), key, head) if p)


# ---------------------------------------------------------------------------
# what a number looks like in the book (its number format)

#: the built-in number formats of SpreadsheetML (ECMA-376 part 1, 18.8.30), those that matter here
_BUILTIN_FORMATS = {0: "General", 1: "0", 2: "0.00", 3: "#,##0", 4: "#,##0.00", 9: "0%", 10: "0.00%",
                    11: "0.00E+00", 37: "#,##0 ;(#,##0)", 38: "#,##0 ;[Red](#,##0)", 39: "#,##0.00;(#,##0.00)",
                    40: "#,##0.00;[Red](#,##0.00)", 48: "##0.0E+0", 49: "@"}
#: significant digits a General cell is taken to show (a column of ordinary width shows about this many)
GENERAL_DIGITS = 6


def number_formats(book) -> dict:
    """Sheet name -> {(row, col): number format code} for the cells with a style."""
    import re

    import defusedxml.ElementTree as DET

    def local(tag):
        return tag.rsplit("}", 1)[-1]

    codes, xf_fmt = dict(_BUILTIN_FORMATS), []
    try:
        with book._zip() as zf:
            names = set(zf.namelist())
            style_part = next((n for n in ("xl/styles.xml",) if n in names), None)
            root = DET.fromstring(zf.read(style_part), forbid_dtd=True) if style_part else None
    except Exception:  # no readable styles: every cell counts as General
        root = None
    if root is not None:
        for el in root:
            if local(el.tag) == "numFmts":
                for f in el:
                    try:
                        codes[int(f.get("numFmtId"))] = f.get("formatCode") or "General"
                    except (TypeError, ValueError):
                        pass
            elif local(el.tag) == "cellXfs":
                for xf in el:
                    try:
                        xf_fmt.append(int(xf.get("numFmtId") or 0))
                    except ValueError:
                        xf_fmt.append(0)
    out = {}
    cell_re = re.compile(rb"<(?:\w+:)?c\b([^>]*?)/?>")
    r_re = re.compile(rb'\br="([A-Z]+)(\d+)"')
    s_re = re.compile(rb'\bs="(\d+)"')
    from fuelsys.sheet.evaluate import col_number

    for sheet in book.sheets:
        if sheet.kind != "worksheet" or not sheet.part:
            continue
        fmts = {}
        try:
            data = book.member(sheet.part)
        except Exception:
            continue
        for m in cell_re.finditer(data):
            attrs = m.group(1)
            sm, rm = s_re.search(attrs), r_re.search(attrs)
            if sm and rm:
                k = int(sm.group(1))
                fid = xf_fmt[k] if k < len(xf_fmt) else 0
                code = codes.get(fid, "General")
                if code != "General":
                    fmts[(int(rm.group(2)), col_number(rm.group(1).decode()))] = code
        out[sheet.name] = fmts
    return out


def display_text(v, code: str = "General") -> str:
    """A value as the book shows it under number format ``code`` (numbers only; texts as they are).

    Fixed decimals (``0.00``), thousands separators, per cent and scientific
    formats are followed; General shows :data:`GENERAL_DIGITS` significant
    digits.  Dates, fractions and texts formats fall back to General.
    """
    import re

    if not isinstance(v, float) or isinstance(v, bool) or not math.isfinite(v):
        return _show(v)
    sections = code.split(";")
    section = sections[1] if v < 0 and len(sections) > 1 else sections[0]
    plain = re.sub(r'"[^"]*"|\[[^\]]*\]|\\.|_.|\*.', "", section)
    if not plain or plain.strip() in ("General", "@") or not re.search(r"[0#?]", plain):
        return f"{v:.{GENERAL_DIGITS}g}"
    if re.search(r"[ymdhs]", plain, re.IGNORECASE) and not re.search(r"E[+-]", plain):
        return f"{v:.{GENERAL_DIGITS}g}"
    x = abs(v) if (v < 0 and len(sections) > 1) else v
    x *= 100 ** plain.count("%")
    m = re.search(r"\.([0#?]+)", plain)
    decimals = len(m.group(1)) if m else 0
    if re.search(r"E[+-]", plain, re.IGNORECASE):
        return f"{x:.{decimals}E}"
    sep = "," if re.search(r"[0#],[0#]", plain) else ""
    return f"{x:{sep}.{decimals}f}" + ("%" if "%" in plain else "")


# ---------------------------------------------------------------------------
# the differences

@dataclass
class Difference:
    sheet: str
    cell: str
    label: str
    kind: str        # "input", "result", "formula", "sheet"
    old: object
    new: object
    #: the values as the book shows them (its number formats)
    old_text: str = ""
    new_text: str = ""
    #: False for a result whose change does not show at the book's number format
    visible: bool = True

    def line(self, exact: bool = False) -> str:
        where = f"{self.sheet}!{self.cell}" if self.cell else self.sheet
        label = f" ({self.label})" if self.label else ""
        if exact or not (self.old_text or self.new_text):
            old, new = _distinct(self.old, self.new)
        else:
            old, new = self.old_text, self.new_text
        return f"{self.kind:8s} {where}{label}: {old} -> {new}"


def _show(v) -> str:
    if v is None:
        return "(empty)"
    if isinstance(v, float):
        return f"{v:.6g}"
    text = str(v)
    return text if len(text) <= 60 else text[:57] + "..."


def _distinct(a, b) -> tuple[str, str]:
    """Two values shown with just enough digits to tell them apart (up to 15)."""
    if isinstance(a, float) and isinstance(b, float):
        for digits in range(6, 16):
            ta, tb = f"{a:.{digits}g}", f"{b:.{digits}g}"
            if ta != tb:
                return ta, tb
        return f"{a:.15g}", f"{b:.15g}"
    return _show(a), _show(b)


def _same(a, b, rel_tol: float) -> bool:
    if isinstance(a, float) and isinstance(b, float):
        return a == b or math.isclose(a, b, rel_tol=rel_tol, abs_tol=1e-12)
    if isinstance(a, bool) or isinstance(b, bool):
        return a is b or a == b
    return str(a) == str(b) if (a is not None and b is not None) else a is b


def _array_cells(sheet) -> set:
    """Cells covered by the sheet's array formulas (results, though only the first holds the formula)."""
    cells = set()
    for f in sheet.formulas.values():
        if f.kind == "array" and f.ref:
            r1, c1, r2, c2 = f.ref
            cells.update((r, c) for r in range(r1, r2 + 1) for c in range(c1, c2 + 1))
    return cells


def diff_books(a_path, b_path, rel_tol: float = 1e-9) -> list[Difference]:
    """Inputs, formulas and results that differ between two versions of a book, by sheet and label.

    Sorted: sheets added or removed, then inputs, then formulas, then results,
    each in sheet order.  A result's ``visible`` is False when its change does
    not show at the cell's number format (see :func:`display_text`).
    """
    from fuelsys.sheet.xlsx import read_book

    a, b = read_book(a_path), read_book(b_path)
    fmt_a, fmt_b = number_formats(a), number_formats(b)
    out: list[Difference] = []
    names_a = [s.name for s in a.sheets]
    names_b = [s.name for s in b.sheets]
    for n in names_a:
        if n not in names_b:
            out.append(Difference(n, "", "", "sheet", "present", None, "present", "(removed)"))
    for n in names_b:
        if n not in names_a:
            out.append(Difference(n, "", "", "sheet", None, "present", "(absent)", "present"))
    for sa in a.sheets:
        if sa.name not in names_b:
            continue
        sb = b.sheet(sa.name)
        la, lb = Labeller(sa), Labeller(sb)
        fa_codes, fb_codes = fmt_a.get(sa.name, {}), fmt_b.get(sa.name, {})
        spilled = _array_cells(sa) | _array_cells(sb)
        keys = sorted(set(sa.cells) | set(sb.cells) | set(sa.formulas) | set(sb.formulas))
        for r, c in keys:
            fa, fb = sa.formulas.get((r, c)), sb.formulas.get((r, c))
            va, vb = sa.cells.get((r, c)), sb.cells.get((r, c))
            addr = _cell_address(r, c)
            ta = fa.text if fa is not None else None
            tb = fb.text if fb is not None else None
            if (fa is None) != (fb is None) or (ta is not None and tb is not None and ta != tb):
                kind, old, new = "formula", (ta if fa else va), (tb if fb else vb)
            elif fa is None and (r, c) not in spilled and not _same(va, vb, rel_tol):
                kind, old, new = "input", va, vb
            elif (fa is not None or (r, c) in spilled) and not _same(va, vb, rel_tol):
                kind, old, new = "result", va, vb
            else:
                continue
            label = lb.label(r, c) or la.label(r, c)
            if kind == "formula":
                old_t = "=" + old if (fa is not None and old is not None) else _show(old)
                new_t = "=" + new if (fb is not None and new is not None) else _show(new)
                out.append(Difference(sa.name, addr, label, kind, old, new, old_t, new_t))
                continue
            old_t = display_text(va, fa_codes.get((r, c), "General"))
            new_t = display_text(vb, fb_codes.get((r, c), "General"))
            visible = kind == "input" or old_t != new_t or type(va) is not type(vb)
            if kind == "input" and old_t == new_t:
                old_t, new_t = _distinct(va, vb)
            out.append(Difference(sa.name, addr, label, kind, va, vb, old_t, new_t, visible))
    order = {"sheet": 0, "input": 1, "formula": 2, "result": 3}
    out.sort(key=lambda d: (order[d.kind], names_b.index(d.sheet) if d.sheet in names_b else -1))
    return out


def counted(n: int, noun: str, verb: str = "differ") -> str:
    """``1 input differs``, ``2 inputs differ``: a count with its noun and verb agreeing."""
    plural = noun if n == 1 else (noun + "es" if noun.endswith("s") else noun + "s")
    if verb == "differ":
        verb = "differs" if n == 1 else "differ"
    return f"{n} {plural} {verb}".rstrip()


EXCEL_STEPS = """\
Using the fuelsys functions live in Excel on Windows (through xlwings)

Not tested on this project's machines (they run Linux); follow xlwings' own
documentation where it differs.

1. Install Python 3.11 or newer for Windows, then in a command prompt, in
   the folder that holds your copy of the fuelsys repository:
       py -m pip install ".[excel]"
       xlwings addin install
2. In Excel: File > Options > Trust Center > Trust Center Settings > Macro
   Settings: tick "Trust access to the VBA project object model".
3. Open the xlwings ribbon tab and set
       UDF Modules:  fuelsys.sheet.excel
   (and the Interpreter to the python.exe you installed fuelsys into).
4. Click "Import Functions". The FS_ functions appear in the category
   "fuelsys"; open workbook/fuelsys-starter.xlsx (or your own book from
   'fuelsys new') and recalculate (Ctrl+Alt+F9).
5. Without Excel, 'fuelsys recalc BOOK.xlsx' computes the same formulas and
   stores the numbers in the file.
"""


def excel_setup_text() -> str:
    return EXCEL_STEPS
