"""``fuelsys share``: a copy of a computed book that opens complete without fuelsys.

Every cell that needs an FS_ function (directly, through a defined name that
calls one, or as a cell of an array formula that calls one) gets the value
fuelsys computed, as a plain number or text; cells that use only the
spreadsheet's own functions keep their formulas.  A first sheet, "About this
copy", says which fuelsys made the copy, when, from which book (a digest of
its inputs and formulas, the one ``fuelsys check`` prints), how to check it,
and lists the formula each replaced cell held.

The copy is made by editing the package's XML parts directly, like
:mod:`fuelsys.sheet.xlsx` does for cached values: the replaced cells' own
elements in the sheet parts, the workbook part (one more sheet; sheet-level
names shifted by one), its relationships and the content types.  Every other
member, charts, drawings, styles, comments and validation included, is
copied byte for byte.  The original is only read.

A book whose stored values are stale (an input changed since it was last
computed) is refused rather than recomputed on the way: the copy must show
what the builder's own book shows, and ``fuelsys check`` on the original is
how a reader confirms it.  Run ``fuelsys recalc`` first.
"""

from __future__ import annotations

import datetime as _dt
import io
import math
import os
import re
import zipfile
from dataclasses import dataclass, field

#: the first sheet of a shared copy
ABOUT_SHEET = "About this copy"
#: a stored number is stale when it differs from a fresh computation by more than this (relative) ...
STALE_REL = 1e-6
#: ... and by more than this (absolute, for values that should be zero)
STALE_ABS = 1e-9

_REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_WS_TYPE = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet"
_WS_CT = "application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"
_FS_CALL = re.compile(r"(?<![A-Za-z0-9_.])(?:_xludf\.)?FS_[A-Z0-9_]+\s*\(", re.IGNORECASE)
_STRING = re.compile(r'"(?:[^"]|"")*"')


class ShareRefused(Exception):
    """The book cannot be shared as it is (stale, not computable); nothing was written.

    ``stale`` is True when the refusal is about the book's values (recompute
    it), False when about the command's arguments.
    """

    def __init__(self, message: str, stale: bool = False):
        super().__init__(message)
        self.stale = stale


@dataclass
class Replaced:
    """One replaced formula: its sheet, the cells it covered, their label and its text."""

    sheet: str
    cells: str
    label: str
    formula: str


@dataclass
class ShareReport:
    source: str
    output: str
    digest: str
    replaced: list = field(default_factory=list)   # of Replaced
    cells: int = 0                                  # cells turned into values
    kept: int = 0                                   # formulas kept (the spreadsheet's own functions)
    errors: list = field(default_factory=list)      # (cell, text) of FS error texts / error values copied
    seconds: float = 0.0


# ---------------------------------------------------------------------------
# which cells need fuelsys

def _calls_fs(text: str | None, fs_names: set) -> bool:
    if not text:
        return False
    bare = _STRING.sub('""', text)
    if _FS_CALL.search(bare):
        return True
    if fs_names:
        words = {w.upper() for w in re.findall(r"(?<![A-Za-z0-9_.!$'])[A-Za-z_][A-Za-z0-9_.]*(?![A-Za-z0-9_(!])",
                                               bare)}
        return bool(words & fs_names)
    return False


def _fs_names(book) -> set:
    """Defined names whose formula calls an FS_ function, directly or through another such name."""
    found: set = set()
    while True:
        more = {dn.name.upper() for dn in book.names
                if dn.name.upper() not in found and _calls_fs(dn.text, found)}
        if not more:
            return found
        found |= more


def fs_cells(book) -> dict:
    """Sheet index -> {(row, col): formula key} of the cells that need an FS_ function.

    The formula key is the (row, col) of the formula that makes the cell: the
    cell itself, the first cell of its array formula, or the first cell of its
    shared-formula group.
    """
    names = _fs_names(book)
    out = {}
    for si, sheet in enumerate(book.sheets):
        if sheet.kind != "worksheet":
            continue
        cells = {}
        shared_text = {f.si: f.text for f in sheet.formulas.values() if f.kind == "shared" and f.text}
        shared_master = {f.si: key for key, f in sheet.formulas.items() if f.kind == "shared" and f.text}
        for key, f in sheet.formulas.items():
            text = f.text if f.text is not None else shared_text.get(f.si)
            if not _calls_fs(text, names):
                continue
            if f.kind == "array" and f.ref:
                r1, c1, r2, c2 = f.ref
                for r in range(r1, r2 + 1):
                    for c in range(c1, c2 + 1):
                        cells[(r, c)] = key
            elif f.kind == "shared":
                cells[key] = shared_master.get(f.si, key)
            else:
                cells[key] = key
        if cells:
            out[si] = cells
    return out


# ---------------------------------------------------------------------------
# staleness

def stale_cells(book, progress=None) -> tuple[list, list]:
    """(stale, skipped): formula cells whose stored value differs from a fresh computation, and
    cells that could not be computed.  Numbers compare within :data:`STALE_REL` / :data:`STALE_ABS`."""
    from fuelsys.sheet import evaluate as ev

    comp = ev.compute_book(book, progress)
    stale = []
    for key in sorted(comp.values):
        si, r, c = key
        stored = book.sheets[si].cells.get((r, c))
        new = comp.values[key]
        if type(stored) is float and type(new) is float:
            if math.isclose(stored, new, rel_tol=STALE_REL, abs_tol=STALE_ABS):
                continue
        elif stored is not None and ev.same_value(stored, new):
            continue
        elif stored is None and new == "":
            continue
        stale.append((comp.cell(key), stored, new))
    return stale, comp.skipped_list()


# ---------------------------------------------------------------------------
# XML editing

def _xml_text(s: str) -> str:
    from fuelsys.sheet.xlsx import encode_ooxml_text

    return encode_ooxml_text(s).replace('"', "&quot;")


def _value_cell(prefix: bytes, attrs: bytes, value) -> bytes:
    """A cell element holding ``value`` as a constant, keeping its reference and style."""
    from fuelsys.sheet.builtins import XlError
    from fuelsys.sheet.xlsx import number_xml

    keep = re.sub(rb'\s+(?:t|cm|vm|ph)\s*=\s*("[^"]*"|\'[^\']*\')', b"", attrs)
    p = prefix
    if value is None or value == "":
        return b"<" + p + b"c" + keep + b"/>"
    if type(value) is bool:
        return b"<" + p + b"c" + keep + b' t="b"><' + p + b"v>" + (b"1" if value else b"0") + b"</" + p + b"v></" + p + b"c>"
    if type(value) is float or type(value) is int:
        x = float(value)
        if math.isfinite(x):
            return b"<" + p + b"c" + keep + b"><" + p + b"v>" + number_xml(x).encode() + b"</" + p + b"v></" + p + b"c>"
        value = XlError("#NUM!")
    if isinstance(value, XlError):
        return b"<" + p + b"c" + keep + b' t="e"><' + p + b"v>" + value.code.encode() + b"</" + p + b"v></" + p + b"c>"
    text = _xml_text(str(value)).encode("utf-8")
    space = b' xml:space="preserve"' if text != text.strip() else b""
    return (b"<" + p + b"c" + keep + b' t="inlineStr"><' + p + b"is><" + p + b"t" + space + b">" + text
            + b"</" + p + b"t></" + p + b"is></" + p + b"c>")


def replace_cells(data: bytes, values: dict, where: str) -> bytes:
    """Turn the cells ``values`` ((row, col) -> value) of a worksheet part into constants.

    Only those cells' own elements change; every other byte stays.  Cells of
    an array formula that the part does not hold (empty results) stay absent.
    """
    from fuelsys.sheet.evaluate import col_number

    m = re.search(rb"<([A-Za-z_][\w.-]*:)?sheetData\b[^>]*?(/?)>", data)
    if not m:
        raise ShareRefused(f"{where} has no sheetData element")
    prefix = m.group(1) or b""
    if m.group(2):
        return data
    p = re.escape(prefix)
    end = re.compile(rb"</" + p + rb"sheetData\s*>").search(data, m.end())
    if not end:
        raise ShareRefused(f"{where}: sheetData is not closed")
    body = data[m.end():end.start()]
    cell_re = re.compile(rb"<" + p + rb"c\b((?:\s+[^\s=/>]+\s*=\s*(?:\"[^\"]*\"|'[^']*'))*)\s*(?:/>|>(.*?)</" + p + rb"c\s*>)",
                         re.DOTALL)
    ref_re = re.compile(rb"""\br\s*=\s*["']([A-Za-z]{1,3})(\d+)["']""")
    seen = set()

    def sub(cm):
        rm = ref_re.search(cm.group(1))
        if not rm:
            return cm.group(0)
        key = (int(rm.group(2)), col_number(rm.group(1).decode("ascii")))
        if key not in values:
            return cm.group(0)
        seen.add(key)
        return _value_cell(prefix, cm.group(1), values[key])

    new_body = cell_re.sub(sub, body)
    return data[:m.end()] + new_body + data[end.start():]


def _drop_tab_selected(data: bytes) -> bytes:
    return re.sub(rb'(<(?:[\w.-]+:)?sheetView\b[^>]*?)\s+tabSelected\s*=\s*("[^"]*"|\'[^\']*\')', rb"\1", data)


def _rels_part(part: str) -> str:
    folder, base = part.rsplit("/", 1) if "/" in part else ("", part)
    return f"{folder}/_rels/{base}.rels" if folder else f"_rels/{base}.rels"


def _workbook_part(zf) -> str:
    rels = zf.read("_rels/.rels").decode("utf-8")
    for m in re.finditer(r"<(?:\w+:)?Relationship\b[^>]*>", rels):
        tag = m.group(0)
        if "/officeDocument\"" in tag or "/officeDocument'" in tag:
            target = re.search(r"""Target\s*=\s*["']([^"']+)["']""", tag).group(1)
            return target.lstrip("/")
    raise ShareRefused("the package has no workbook part")


def _insert_about_sheet(wb_xml: bytes, rid: str, sheet_id: int) -> bytes:
    """The workbook part with the about sheet first: sheet-level names and the active tab follow."""
    text = wb_xml.decode("utf-8")
    m = re.search(r'xmlns:([\w.-]+)\s*=\s*"' + re.escape(_REL_NS) + '"', text)
    if m:
        rpre, decl = m.group(1), ""
    else:
        rpre, decl = "fsr", f' xmlns:fsr="{_REL_NS}"'
    sm = re.search(r"<([\w.-]+:)?sheets\b[^>]*?(/?)>", text)
    if not sm or sm.group(2):
        raise ShareRefused("the workbook part lists no sheets")
    epre = sm.group(1) or ""
    new_sheet = (f'<{epre}sheet name="{_xml_text(ABOUT_SHEET)}" sheetId="{sheet_id}" '
                 f'{rpre}:id="{rid}"{decl}/>')
    text = text[:sm.end()] + new_sheet + text[sm.end():]
    text = re.sub(r'(\blocalSheetId\s*=\s*")(\d+)(")', lambda k: f"{k.group(1)}{int(k.group(2)) + 1}{k.group(3)}", text)
    # the copy opens on its first sheet, the one that says what it is
    text = re.sub(r'(<(?:[\w.-]+:)?workbookView\b[^>]*?\s)activeTab\s*=\s*"\d+"', r'\1activeTab="0"', text)
    text = re.sub(r'(<(?:[\w.-]+:)?workbookView\b[^>]*?\s)firstSheet\s*=\s*"\d+"', r'\1firstSheet="0"', text)
    return text.encode("utf-8")


def _add_relationship(rels_xml: bytes, rid: str, target: str) -> bytes:
    text = rels_xml.decode("utf-8")
    m = re.search(r"</([\w.-]+:)?Relationships\s*>", text)
    if not m:
        raise ShareRefused("the workbook's relationships do not parse")
    pre = m.group(1) or ""
    rel = f'<{pre}Relationship Id="{rid}" Type="{_WS_TYPE}" Target="{target}"/>'
    return (text[:m.start()] + rel + text[m.start():]).encode("utf-8")


def _add_override(ct_xml: bytes, part: str) -> bytes:
    text = ct_xml.decode("utf-8")
    m = re.search(r"</([\w.-]+:)?Types\s*>", text)
    if not m:
        raise ShareRefused("[Content_Types].xml does not parse")
    pre = m.group(1) or ""
    ov = f'<{pre}Override PartName="/{part}" ContentType="{_WS_CT}"/>'
    return (text[:m.start()] + ov + text[m.start():]).encode("utf-8")


# ---------------------------------------------------------------------------
# the about sheet

def _cell_xml(r: int, c: int, value, style: str = "") -> str:
    from fuelsys.sheet.xlsx import col_letters, number_xml

    ref = f"{col_letters(c)}{r}"
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return f'<c r="{ref}"{style}><v>{number_xml(float(value))}</v></c>'
    text = _xml_text(str(value))
    return f'<c r="{ref}"{style} t="inlineStr"><is><t xml:space="preserve">{text}</t></is></c>'


def about_sheet_xml(rows: list[list]) -> bytes:
    """A plain worksheet part holding ``rows`` (lists of values from column A)."""
    widths = [14, 14, 50, 90]
    cols = "".join(f'<col min="{i + 1}" max="{i + 1}" width="{w}" customWidth="1"/>' for i, w in enumerate(widths))
    body = []
    for r, row in enumerate(rows, start=1):
        cells = "".join(_cell_xml(r, c, v) for c, v in enumerate(row, start=1) if v not in (None, ""))
        if cells:
            body.append(f'<row r="{r}">{cells}</row>')
    return ('<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
            '<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" '
            f'xmlns:r="{_REL_NS}"><sheetPr><pageSetUpPr fitToPage="1"/></sheetPr><sheetViews><sheetView workbookViewId="0" tabSelected="1"/></sheetViews>'
            f'<sheetFormatPr defaultRowHeight="15"/><cols>{cols}</cols>'
            f'<sheetData>{"".join(body)}</sheetData>'
            '<pageMargins left="0.7" right="0.7" top="0.75" bottom="0.75" header="0.3" footer="0.3"/>'
            '<pageSetup orientation="landscape" fitToWidth="1" fitToHeight="0"/>'
            '</worksheet>').encode("utf-8")


def about_rows(source_name: str, version: str, when: str, digest: str, replaced: list, kept: int) -> list:
    from fuelsys.safety import CAUTIONS

    n_cells = sum(_count_cells(x.cells) for x in replaced)
    rows = [
        [f"Shared copy of {source_name}: values in place of the fuelsys functions"],
        [],
        ["made by", f"fuelsys {version}"],
        ["made on", when],
        ["from the book", source_name],
        ["inputs digest", digest],
        ["cells made values", float(n_cells)],
        ["formulas kept", float(kept)],
        [],
        ["What this copy is: every cell that needs a fuelsys (FS_) function holds the value fuelsys computed "
         "in the original book, as a plain number or text, so the copy opens complete in any spreadsheet "
         "program without fuelsys. Cells that use only the spreadsheet's own functions keep their formulas. "
         "Changing an input here does not change the values that came from fuelsys functions."],
        [f"How to check it: on the original book, run 'fuelsys check {source_name}'. It must report that "
         "0 cells differ and print the inputs digest above; then this copy holds that book's values. "
         "To change anything, edit the original and share it again."],
        [],
    ]
    rows += [[line.strip("- ")] for line in _caution_lines(CAUTIONS)]
    rows += [[], ["The formulas the values replace (as in the original book)"],
             ["sheet", "cells", "label", "formula"]]
    for x in replaced:
        rows.append([x.sheet, x.cells, x.label, x.formula])
    return _wrapped(rows)


#: prose rows are cut into lines of at most this many characters, one row each (no cell style needed)
PROSE_CHARS = 120


def _wrapped(rows: list) -> list:
    import textwrap

    out = []
    for row in rows:
        if len(row) == 1 and isinstance(row[0], str) and len(row[0]) > PROSE_CHARS:
            out += [[line] for line in textwrap.wrap(row[0], PROSE_CHARS)]
        else:
            out.append(row)
    return out


def _caution_lines(text: str) -> list[str]:
    lines, cur = [], ""
    for raw in text.splitlines():
        s = raw.strip()
        if s.startswith("- ") or not cur:
            if cur:
                lines.append(cur)
            cur = s
        else:
            cur += " " + s
    if cur:
        lines.append(cur)
    return lines


def _count_cells(ref: str) -> int:
    from fuelsys.sheet.evaluate import parse_area

    if ":" not in ref:
        return 1
    r1, c1, r2, c2 = parse_area(ref)
    return (r2 - r1 + 1) * (c2 - c1 + 1)


# ---------------------------------------------------------------------------
# the command's work

def default_output(path) -> str:
    base, ext = os.path.splitext(os.fspath(path))
    return f"{base}-shared{ext or '.xlsx'}"


def share_book(path, output=None, force: bool = False, progress=None, now=None) -> ShareReport:
    """Write a copy of the book at ``path`` for readers without fuelsys; see the module docstring.

    Raises :class:`ShareRefused` (stale or uncomputable book, output exists
    without ``force``, output is the book itself),
    :class:`fuelsys.sheet.xlsx.WorkbookRefused` and
    :class:`fuelsys.sheet.xlsx.WriteError`; nothing is written then.
    """
    import time

    from fuelsys import __version__
    from fuelsys.sheet import xlsx
    from fuelsys.sheet.book import Labeller, inputs_digest
    from fuelsys.sheet.commands import error_cells
    from fuelsys.sheet.evaluate import cell_name

    t0 = time.perf_counter()
    path = os.fspath(path)
    output = os.fspath(output) if output else default_output(path)
    if os.path.exists(output) and os.path.samefile(output, path):
        raise ShareRefused("the copy must be another file than the book (the book is never changed)")
    if os.path.exists(output) and not force:
        raise ShareRefused(f"{output} exists already; choose another name with -o, or use --force")
    book = xlsx.read_book(path)
    stale, skipped = stale_cells(book, progress)
    if skipped:
        cells = ", ".join(c for c, _ in skipped[:3])
        raise ShareRefused(f"{len(skipped)} formula cell(s) cannot be computed ({cells} ...); "
                           "'fuelsys check' lists why. Nothing written", stale=True)
    if stale:
        first = "; ".join(f"{c}: stored {s!r}, computed {n!r}" for c, s, n in stale[:3])
        raise ShareRefused(f"the stored values are stale: {len(stale)} formula cell(s) differ from a fresh "
                           f"computation (for example {first}). Compute the book first "
                           f"('fuelsys recalc {os.path.basename(path)}', or recalculate it in your spreadsheet "
                           "with fuelsys), then share it. Nothing written", stale=True)
    targets = fs_cells(book)
    digest = inputs_digest(book)
    report = ShareReport(path, output, digest)
    replace: dict[str, bytes] = {}
    for si, cells in sorted(targets.items()):
        sheet = book.sheets[si]
        lab = Labeller(sheet)
        values = {key: sheet.cells.get(key) for key in cells}
        replace[sheet.part] = replace_cells(book.member(sheet.part), values, sheet.part)
        report.cells += len(cells)
        for key in sorted(set(cells.values())):
            f = sheet.formulas[key]
            if f.kind == "array" and f.ref:
                r1, c1, r2, c2 = f.ref
                ref = cell_name(r1, c1) + (f":{cell_name(r2, c2)}" if (r1, c1) != (r2, c2) else "")
                text = "{=" + f.text.lstrip("=") + "}"  # the spreadsheet's way of showing an array formula
            elif f.kind == "shared" and f.ref:
                r1, c1, r2, c2 = f.ref
                ref = f"{cell_name(r1, c1)}:{cell_name(r2, c2)}"
                text = f.text + "  (filled over the range, references moving with it)"
            else:
                ref, text = cell_name(*key), f.text
            if not text.startswith(("=", "{=")):
                text = "=" + text
            report.replaced.append(Replaced(sheet.name, ref, lab.label(*key), text))
    report.kept = sum(1 for si, s in enumerate(book.sheets) for key, f in s.formulas.items()
                      if f.text is not None and key not in targets.get(si, {}))
    # sheets selected in the original lose the selection, so the copy opens on its first sheet
    for s in book.sheets:
        if s.part and s.kind == "worksheet":
            data = replace.get(s.part) or book.member(s.part)
            dropped = _drop_tab_selected(data)
            if dropped != data:
                replace[s.part] = dropped
    with zipfile.ZipFile(io.BytesIO(book.data)) as zf:
        names = set(zf.namelist())
        wb_part = _workbook_part(zf)
        wb_rels = _rels_part(wb_part)
        n = 1
        while f"xl/worksheets/sheet{n}.xml" in names:
            n += 1
        new_part = f"xl/worksheets/sheet{n}.xml"
        rels_xml = zf.read(wb_rels)
        ids = set(re.findall(rb'\bId\s*=\s*"([^"]+)"', rels_xml))
        k = 1
        while f"rIdFuelsysShare{k}".encode() in ids:
            k += 1
        rid = f"rIdFuelsysShare{k}"
        wb_xml = zf.read(wb_part)
        sheet_ids = [int(x) for x in re.findall(rb'<(?:[\w.-]+:)?sheet\b[^>]*?\bsheetId\s*=\s*"(\d+)"', wb_xml)]
        replace[wb_part] = _insert_about_sheet(wb_xml, rid, max(sheet_ids, default=0) + 1)
        replace[wb_rels] = _add_relationship(rels_xml, rid, "/" + new_part)
        replace["[Content_Types].xml"] = _add_override(zf.read("[Content_Types].xml"), new_part)
    when = (now or _dt.datetime.now(_dt.timezone.utc)).strftime("%Y-%m-%d %H:%M UTC")
    rows = about_rows(os.path.basename(path), __version__, when, digest, report.replaced, report.kept)
    payload = xlsx.rebuild_zip(book.data, replace)
    buf = io.BytesIO(payload)
    with zipfile.ZipFile(buf, "a", zipfile.ZIP_DEFLATED) as zf:
        info = zipfile.ZipInfo(new_part, date_time=zf.infolist()[0].date_time)
        info.compress_type = zipfile.ZIP_DEFLATED
        zf.writestr(info, about_sheet_xml(rows))
    payload = buf.getvalue()
    copy = verify_copy(book, payload, targets, output)
    report.errors = error_cells(copy)
    xlsx.atomic_write(output, payload, mode_from=path)
    report.seconds = time.perf_counter() - t0
    return report


def verify_copy(book, payload: bytes, targets: dict, where: str):
    """The copy must read back safely with no FS_ formula left, every replaced cell holding the
    original's stored value, and every other cell and formula as it was.  Returns the parsed copy."""
    import tempfile

    from fuelsys.sheet import xlsx

    fd, tmp = tempfile.mkstemp(suffix=".xlsx")
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(payload)
        copy = xlsx.read_book(tmp)
    finally:
        os.unlink(tmp)
    names = [s.name for s in copy.sheets]
    if names != [ABOUT_SHEET] + [s.name for s in book.sheets]:
        raise xlsx.WriteError(f"{where}: the copy's sheets read back as {names} (nothing written)")
    for si, sheet in enumerate(book.sheets):
        if sheet.kind != "worksheet":
            continue
        got = copy.sheets[si + 1]
        cells = targets.get(si, {})
        for key, f in sheet.formulas.items():
            if key in cells:
                if key in got.formulas:
                    raise xlsx.WriteError(f"{where}: {sheet.name} keeps a formula at {key} (nothing written)")
            elif got.formulas.get(key) != f:
                raise xlsx.WriteError(f"{where}: a formula of {sheet.name} changed at {key} (nothing written)")
        for key in set(sheet.cells) | set(got.cells):
            a, b = sheet.cells.get(key), got.cells.get(key)
            if a == "" and b is None and key in cells:
                continue
            if not (a == b or (type(a) is float and type(b) is float and a != a and b != b)):
                raise xlsx.WriteError(f"{where}: {sheet.name} cell {key} reads back as {b!r}, "
                                      f"expected {a!r} (nothing written)")
    left = _fs_names(copy)
    for s in copy.sheets:
        for f in s.formulas.values():
            if _calls_fs(f.text, left):
                raise xlsx.WriteError(f"{where}: {s.name} still calls an FS_ function (nothing written)")
    return copy
