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


def _label_of(sheet, r: int, c: int, spilled=frozenset()) -> str:
    """A readable label for cell (r, c).

    A label row (text in column A, the value in B) is named by its column-A
    text; a table cell by its row's column-A text and its column's header,
    the nearest text above it in the same unbroken column.
    """
    row_label = sheet.cells.get((r, 1))
    row_label = str(row_label).strip() if isinstance(row_label, str) and c != 1 else ""
    if c == 2 and row_label:
        return row_label
    header = ""
    for rr in range(r - 1, 0, -1):
        v = sheet.cells.get((rr, c))
        if v is None:
            break
        if isinstance(v, str) and v.strip() and (rr, c) not in sheet.formulas and (rr, c) not in spilled:
            header = v.strip()
            break
    return " / ".join(p for p in (row_label, header) if p)


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


@dataclass
class Difference:
    sheet: str
    cell: str
    label: str
    kind: str        # "input", "result", "formula", "sheet"
    old: object
    new: object

    def line(self) -> str:
        where = f"{self.sheet}!{self.cell}"
        label = f" ({self.label})" if self.label else ""
        return f"{self.kind:8s} {where}{label}: {_show(self.old)} -> {_show(self.new)}"


def _show(v) -> str:
    if v is None:
        return "(empty)"
    if isinstance(v, float):
        return f"{v:.6g}"
    text = str(v)
    return text if len(text) <= 60 else text[:57] + "..."


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
    """Inputs, formulas and results that differ between two versions of a book, by sheet and label."""
    from fuelsys.sheet.xlsx import read_book

    a, b = read_book(a_path), read_book(b_path)
    out: list[Difference] = []
    names_a = [s.name for s in a.sheets]
    names_b = [s.name for s in b.sheets]
    for n in names_a:
        if n not in names_b:
            out.append(Difference(n, "", "", "sheet", "present", None))
    for n in names_b:
        if n not in names_a:
            out.append(Difference(n, "", "", "sheet", None, "present"))
    for sa in a.sheets:
        if sa.name not in names_b:
            continue
        sb = b.sheet(sa.name)
        spilled = _array_cells(sa) | _array_cells(sb)
        keys = sorted(set(sa.cells) | set(sb.cells) | set(sa.formulas) | set(sb.formulas))
        for r, c in keys:
            fa, fb = sa.formulas.get((r, c)), sb.formulas.get((r, c))
            va, vb = sa.cells.get((r, c)), sb.cells.get((r, c))
            label = _label_of(sb, r, c, spilled) or _label_of(sa, r, c, spilled)
            addr = _cell_address(r, c)
            ta = fa.text if fa is not None else None
            tb = fb.text if fb is not None else None
            if (fa is None) != (fb is None) or (ta is not None and tb is not None and ta != tb):
                out.append(Difference(sa.name, addr, label, "formula", ta if fa else va, tb if fb else vb))
            elif fa is None and (r, c) not in spilled and not _same(va, vb, rel_tol):
                out.append(Difference(sa.name, addr, label, "input", va, vb))
            elif (fa is not None or (r, c) in spilled) and not _same(va, vb, rel_tol):
                out.append(Difference(sa.name, addr, label, "result", va, vb))
    order = {"sheet": 0, "input": 1, "formula": 2, "result": 3}
    out.sort(key=lambda d: (order[d.kind], names_b.index(d.sheet) if d.sheet in names_b else -1))
    return out


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
