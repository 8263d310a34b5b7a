"""Safe reading of .xlsx/.xlsm workbooks and loss-free writing of cached values.

Reading
-------
The package is checked before anything is parsed, and refused with a clear
message (:class:`WorkbookRefused`) when it is

* not a zip file -- in particular an OLE compound file, which is what an
  encrypted (password-protected) workbook and a legacy ``.xls`` are;
* a binary ``.xlsb``, an OpenDocument ``.ods`` or anything that is not a
  SpreadsheetML workbook, whatever its file name says;
* larger than the limits below, or holds a member whose compression ratio
  looks like a zip bomb, an encrypted member, or two members of one name;
* holds any XML part with a document type declaration (``<!DOCTYPE``): that is
  how entity-expansion bombs ("billion laughs") and external entities get in.
  Every member's prolog is scanned (in UTF-8, or UTF-16/32 told by a byte
  order mark or by the zero bytes of its first characters, XML 1.0 Appendix F)
  and every part that is parsed goes through :mod:`defusedxml` with DTDs
  forbidden;
* holds a damaged member (a CRC-32 that does not match, deflate data that
  does not decompress, a member cut short): every member is decompressed once,
  as a stream, before anything is parsed;
* links to other workbooks (an ``externalLink`` part), whether or not a
  formula uses the link.

Limits (documented numbers; each refusal names the one that was hit):

=====================  ==========================================
``MAX_FILE_BYTES``     512 MiB on disk
``MAX_MEMBERS``        10,000 zip members
``MAX_MEMBER_BYTES``   256 MiB uncompressed, each member
``MAX_TOTAL_BYTES``    1 GiB uncompressed, all members together
``MAX_RATIO``          200 : 1 uncompressed/compressed, for members
                       over ``RATIO_FLOOR`` (1 MiB) uncompressed, and
                       for all members together over
                       ``TOTAL_RATIO_FLOOR`` (16 MiB)
``MAX_PROLOG_BYTES``   1 MiB of XML declaration and comments
                       before a part's root element
``MAX_PROLOG_TOTAL``   16 MiB of such prologs in all parts together
=====================  ==========================================

Macros never run: nothing in a ``vbaProject.bin`` is read, and it is copied
byte for byte.

Writing
-------
:func:`write_values` stores computed values without rewriting the workbook:
only the ``<v>`` element (and the ``t`` attribute) of formula cells changes,
inside the sheet parts whose values changed.  Every other zip member is copied
raw -- the same local header, compressed bytes, data descriptor, order, dates
and compression -- and the central directory keeps every field but the
offsets.  The edited sheets are parsed again and compared cell by cell with
the original before anything is written, the new package is tested with
:mod:`zipfile`, and it replaces the target atomically (a temporary file in the
same folder, then :func:`os.replace`); on any failure the original is left as
it was.  A stale ``calcChain.xml`` is kept (formulas do not change), and
``workbook.xml`` is left alone, including any ``fullCalcOnLoad`` its author set.

Value types in the sheet XML (ECMA-376 Part 1, 18.3.1.4 ``c`` and 18.18.11
``ST_CellType``): numbers as full-precision text, ``t="str"`` for a formula's
text result, ``t="b"`` booleans, ``t="e"`` errors; NaN and infinity have no
number form and are written as ``#NUM!``.
"""

from __future__ import annotations

import io
import math
import os
import posixpath
import re
import stat
import struct
import tempfile
import zipfile
import zlib
from dataclasses import dataclass, field

from fuelsys.errors import FuelsysError
from fuelsys.sheet import builtins as bi


def col_letters(c: int) -> str:
    """Column letters of 1-based column ``c`` (1 -> A, 27 -> AA)."""
    out = ""
    while c:
        c, rem = divmod(c - 1, 26)
        out = chr(65 + rem) + out
    return out

MAX_FILE_BYTES = 512 * 1024 * 1024
MAX_MEMBERS = 10_000
MAX_MEMBER_BYTES = 256 * 1024 * 1024
MAX_TOTAL_BYTES = 1024 * 1024 * 1024
MAX_RATIO = 200
RATIO_FLOOR = 1024 * 1024
TOTAL_RATIO_FLOOR = 16 * 1024 * 1024

_CHUNK = 1 << 20
OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"

#: the main part content types of the workbooks read here
WORKBOOK_TYPES = {
    "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml": "xlsx",
    "application/vnd.ms-excel.sheet.macroEnabled.main+xml": "xlsm",
    "application/vnd.openxmlformats-officedocument.spreadsheetml.template.main+xml": "xltx",
    "application/vnd.ms-excel.template.macroEnabled.main+xml": "xltm",
}
ACCEPTED_SUFFIXES = (".xlsx", ".xlsm", ".xltx", ".xltm")
_REFUSED_SUFFIXES = {
    ".xls": "a legacy binary .xls workbook",
    ".xlsb": "a binary .xlsb workbook",
    ".ods": "an OpenDocument .ods spreadsheet",
    ".fods": "an OpenDocument flat .fods spreadsheet",
    ".csv": "a CSV text file",
    ".numbers": "an Apple Numbers file",
}
_SAVE_AS = "open it in a spreadsheet program and save it as .xlsx (or .xlsm)"


class WorkbookRefused(FuelsysError):
    """The file is not a workbook fuelsys will read, or is unsafe to read; nothing was changed."""


class WriteError(FuelsysError):
    """The values could not be written; the original file is untouched."""


# ---------------------------------------------------------------------------
# the model a parsed book gives

@dataclass
class Formula:
    """A formula cell: ``kind`` is "normal", "shared", "array" or "datatable".

    ``text`` is None for the later cells of a shared formula (they take the
    first cell's text, moved); ``ref`` is the area (r1, c1, r2, c2) of an array
    formula or a shared group; ``si`` the shared group number.
    """

    text: str | None
    kind: str = "normal"
    ref: tuple | None = None
    si: int | None = None


@dataclass
class Sheet:
    name: str
    part: str | None
    kind: str  # "worksheet", "chartsheet", "dialogsheet", "macrosheet"
    state: str = "visible"
    cells: dict = field(default_factory=dict)  # (row, col) -> value (constants and stored results)
    formulas: dict = field(default_factory=dict)  # (row, col) -> Formula
    max_row: int = 0
    max_col: int = 0


@dataclass
class DefinedName:
    name: str
    scope: int | None  # sheet index for a sheet-level name, None for the workbook
    text: str
    hidden: bool = False


@dataclass
class Book:
    path: str
    kind: str
    sheets: list
    names: list
    date1904: bool
    data: bytes = field(repr=False)
    stat: tuple = ()
    external_links: int = 0

    def member(self, name: str) -> bytes:
        with self._zip() as zf:
            return _read_member(zf, name)

    def _zip(self):
        return zipfile.ZipFile(io.BytesIO(self.data))

    def sheet(self, name: str) -> Sheet:
        for s in self.sheets:
            if s.name.upper() == name.upper():
                return s
        raise KeyError(name)


# ---------------------------------------------------------------------------
# XML helpers

def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1] if tag[:1] == "{" else tag


def _parse_xml(data: bytes, what: str):
    import defusedxml.ElementTree as DET
    from defusedxml import DefusedXmlException

    try:
        return DET.fromstring(data, forbid_dtd=True)
    except DefusedXmlException as exc:
        raise WorkbookRefused(f"{what} has a document type declaration or entities ({type(exc).__name__}); "
                              "refused as a possible XML bomb or external entity") from None
    except Exception as exc:
        raise WorkbookRefused(f"{what} is not well-formed XML ({exc})") from None


def _attr(el, local: str):
    """Attribute by local name, whatever its namespace (r:id in either OOXML flavour)."""
    for k, v in el.attrib.items():
        if _local(k) == local:
            return v
    return None


_XESC = re.compile(r"_x([0-9A-Fa-f]{4})_")


def decode_ooxml_text(s: str) -> str:
    """Undo the ``_xHHHH_`` escapes SpreadsheetML uses for control characters."""
    if "_x" not in s:
        return s
    return _XESC.sub(lambda m: chr(int(m.group(1), 16)), s)


def _string_item(si) -> str:
    parts = []
    for ch in si:
        tag = _local(ch.tag)
        if tag == "t":
            parts.append(ch.text or "")
        elif tag == "r":
            for t in ch:
                if _local(t.tag) == "t":
                    parts.append(t.text or "")
    return decode_ooxml_text("".join(parts))


# ---------------------------------------------------------------------------
# package checks

def _refuse_by_name(path: str) -> None:
    suffix = os.path.splitext(path)[1].lower()
    if suffix in _REFUSED_SUFFIXES:
        raise WorkbookRefused(f"{os.path.basename(path)} is {_REFUSED_SUFFIXES[suffix]}; "
                              f"fuelsys reads .xlsx and .xlsm only: {_SAVE_AS}")
    if suffix not in ACCEPTED_SUFFIXES:
        raise WorkbookRefused(f"{os.path.basename(path)}: expected a .xlsx or .xlsm workbook "
                              f"(got the suffix {suffix or '(none)'!r})")


def _check_zip(zf: zipfile.ZipFile, where: str) -> None:
    infos = zf.infolist()
    if len(infos) > MAX_MEMBERS:
        raise WorkbookRefused(f"{where}: {len(infos)} zip members (more than the limit of {MAX_MEMBERS})")
    seen = set()
    total = packed = 0
    for info in infos:
        if info.filename in seen:
            raise WorkbookRefused(f"{where}: two zip members are named {info.filename!r}")
        seen.add(info.filename)
        if info.flag_bits & 0x1:
            raise WorkbookRefused(f"{where}: member {info.filename} is encrypted; "
                                  "remove the password and save it as .xlsx")
        if info.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
            raise WorkbookRefused(f"{where}: member {info.filename} uses zip compression method "
                                  f"{info.compress_type} (only stored and deflate are used by workbooks)")
        if info.file_size > MAX_MEMBER_BYTES:
            raise WorkbookRefused(f"{where}: member {info.filename} is {info.file_size} bytes uncompressed "
                                  f"(more than the limit of {MAX_MEMBER_BYTES})")
        if info.file_size > RATIO_FLOOR and info.file_size > MAX_RATIO * max(info.compress_size, 1):
            raise WorkbookRefused(f"{where}: member {info.filename} expands {info.file_size / max(info.compress_size, 1):.0f} "
                                  f"times (more than the limit of {MAX_RATIO}:1); refused as a possible zip bomb")
        total += info.file_size
        packed += info.compress_size
        if total > MAX_TOTAL_BYTES:
            raise WorkbookRefused(f"{where}: more than {MAX_TOTAL_BYTES} bytes uncompressed in all "
                                  "(the limit); refused as a possible zip bomb")
    if total > TOTAL_RATIO_FLOOR and total > MAX_RATIO * max(packed, 1):
        raise WorkbookRefused(f"{where}: its members expand {total / max(packed, 1):.0f} times in all (more than the "
                              f"limit of {MAX_RATIO}:1 over {TOTAL_RATIO_FLOOR} bytes); refused as a possible zip bomb")


def _read_member(zf: zipfile.ZipFile, name: str) -> bytes:
    info = zf.getinfo(name)
    with zf.open(info) as fh:
        data = fh.read(MAX_MEMBER_BYTES + 1)
    if len(data) > MAX_MEMBER_BYTES:
        raise WorkbookRefused(f"member {name} is larger than {MAX_MEMBER_BYTES} bytes uncompressed")
    return data


#: longest XML prolog (declaration, comments, processing instructions) read before the root element
MAX_PROLOG_BYTES = 1024 * 1024
#: all the prologs of one package together (a real part's prolog is well under a kilobyte)
MAX_PROLOG_TOTAL = 16 * 1024 * 1024

_SPACE = re.compile(r"[ \t\r\n]*")
#: the first four bytes of an XML part without a byte order mark -> its encoding
#: (W3C XML 1.0, Appendix F.1: "<" and "?" or "!" as seen in each encoding)
_BOMS = ((b"\x00\x00\xfe\xff", "utf-32-be"), (b"\xff\xfe\x00\x00", "utf-32-le"),
         (b"\xef\xbb\xbf", "utf-8-sig"), (b"\xfe\xff", "utf-16-be"), (b"\xff\xfe", "utf-16-le"))


def _sniff_encoding(head: bytes) -> str:
    """The encoding of an XML part from its first four bytes: a byte order mark, or the
    zero bytes that UTF-16 and UTF-32 put beside an ASCII character; else UTF-8."""
    for bom, name in _BOMS:
        if head.startswith(bom):
            return name
    b = head[:4].ljust(4, b"\x01")
    zero = [x == 0 for x in b]
    if zero == [True, True, True, False]:
        return "utf-32-be"
    if zero == [False, True, True, True]:
        return "utf-32-le"
    if zero[0] and not zero[1]:
        return "utf-16-be"
    if not zero[0] and zero[1]:
        return "utf-16-le"
    return "utf-8"


class _PrologScan:
    """Finds a document type declaration in an XML part's prolog, fed chunk by chunk.

    Whitespace, the XML declaration, processing instructions and comments are
    skipped; the scan ends at the first other markup (the root element, or a
    ``<!DOCTYPE``) or at the first character that is not markup at all (a part
    that is not XML).  Each byte is looked at a bounded number of times, so the
    cost is linear in the prolog's length.
    """

    def __init__(self, name: str, where: str):
        self.name, self.where = name, where
        self.decoder = None
        self.text = ""       # decoded text not yet skipped
        self.closing = None  # the end ("-->" or "?>") of a comment or instruction still open
        self.seen = 0        # bytes fed so far
        self.skipped = 0     # characters of prolog skipped before self.text
        self.done = False

    def feed(self, chunk: bytes, final: bool = False) -> None:
        if self.done:
            return
        if self.decoder is None:
            import codecs

            self.decoder = codecs.getincrementaldecoder(_sniff_encoding(chunk))(errors="replace")
        self.seen += len(chunk)
        text = self.text + self.decoder.decode(chunk, final)
        pos = 0
        while True:
            if self.closing is not None:
                end = text.find(self.closing, pos)
                if end < 0:
                    pos = max(pos, len(text) - len(self.closing) + 1)  # keep what may start the end mark
                    break
                pos = end + len(self.closing)
                self.closing = None
            pos = _SPACE.match(text, pos).end()
            if text.startswith("<?", pos) or text.startswith("<!--", pos):
                self.closing = "?>" if text[pos + 1] == "?" else "-->"
                pos += 2 if self.closing == "?>" else 4
                continue
            rest = text[pos:pos + 9]
            if rest.upper() == "<!DOCTYPE":
                raise WorkbookRefused(f"{self.where}: part {self.name} has a document type declaration "
                                      "(<!DOCTYPE); refused as a possible XML bomb or external entity")
            if (len(rest) < 9 and "<!DOCTYPE".startswith(rest.upper())) or rest == "<!-":
                break  # too few characters yet to tell
            self.done = True  # the root element, or something that is not XML
            self.skipped += pos
            return
        self.text = text[pos:]
        self.skipped += pos
        if final:
            self.done = True
        elif self.seen > MAX_PROLOG_BYTES:
            raise WorkbookRefused(f"{self.where}: part {self.name} has an XML prolog longer than "
                                  f"{MAX_PROLOG_BYTES} bytes (the limit)")


def _check_members(zf: zipfile.ZipFile, where: str) -> None:
    """Read every member once, as a stream: its prolog must hold no document type
    declaration, and its data must decompress to its recorded size and CRC-32.

    A member whose prolog is long counts against :data:`MAX_PROLOG_TOTAL`; the
    rest of each member is read in 1 MiB pieces and dropped, so memory stays
    small and the time is that of decompressing the package once (its total is
    bounded by :data:`MAX_TOTAL_BYTES`).
    """
    prolog_total = 0
    for info in zf.infolist():
        if info.is_dir():
            continue
        scan = _PrologScan(info.filename, where)
        try:
            with zf.open(info) as fh:
                while True:
                    chunk = fh.read(65536 if not scan.done else _CHUNK)
                    if not scan.done:
                        scan.feed(chunk, final=not chunk)
                        if scan.done:
                            prolog_total += scan.skipped
                            if prolog_total > MAX_PROLOG_TOTAL:
                                raise WorkbookRefused(
                                    f"{where}: the XML prologs of its parts add up to more than "
                                    f"{MAX_PROLOG_TOTAL} bytes (the limit; at part {info.filename}); "
                                    "refused as a possible decompression bomb")
                    if not chunk:
                        break
        except WorkbookRefused:
            raise
        except (zipfile.BadZipFile, zlib.error, EOFError, OSError, ValueError, NotImplementedError) as exc:
            raise WorkbookRefused(_damaged(where, info.filename, exc)) from None


def _damaged(where: str, member: str, exc: BaseException) -> str:
    return (f"{where}: part {member} is damaged ({type(exc).__name__}: {exc}); the file was cut short or "
            "corrupted in transfer: ask for it again, or open it in a spreadsheet program, repair it "
            "and save it as .xlsx")


# ---------------------------------------------------------------------------
# reading

def read_book(path) -> Book:
    """Check and parse the workbook at ``path``; raises :class:`WorkbookRefused`."""
    path = os.fspath(path)
    where = os.path.basename(path)
    _refuse_by_name(path)
    try:
        st = os.stat(path)
    except OSError as exc:
        raise WorkbookRefused(f"{path}: cannot read it ({exc.strerror or exc})") from None
    if st.st_size > MAX_FILE_BYTES:
        raise WorkbookRefused(f"{where} is {st.st_size} bytes (more than the limit of {MAX_FILE_BYTES})")
    with open(path, "rb") as fh:
        data = fh.read()
    if data[:8] == OLE_MAGIC:
        raise WorkbookRefused(f"{where} is an OLE compound file: an encrypted (password-protected) workbook "
                              f"or a legacy .xls; remove the password or {_SAVE_AS}")
    if data[:4] != b"PK\x03\x04":
        raise WorkbookRefused(f"{where} is not a zip package, so not a .xlsx/.xlsm workbook "
                              "(perhaps another format renamed)")
    try:
        zf = zipfile.ZipFile(io.BytesIO(data))
    except (zipfile.BadZipFile, ValueError, struct.error, OSError, EOFError) as exc:
        raise WorkbookRefused(f"{where} is not a readable zip package ({exc})") from None
    _check_zip(zf, where)
    names = set(zf.namelist())
    if "mimetype" in names:
        mt = _read_member(zf, "mimetype")[:200].decode("ascii", "replace")
        if "opendocument" in mt:
            raise WorkbookRefused(f"{where} is an OpenDocument file ({mt.strip()}), not a .xlsx workbook: {_SAVE_AS}")
    _check_members(zf, where)
    if "[Content_Types].xml" not in names:
        raise WorkbookRefused(f"{where} is a zip file but not an Office Open XML package (no [Content_Types].xml)")
    ct = _parse_xml(_read_member(zf, "[Content_Types].xml"), "[Content_Types].xml")
    overrides = {}
    for el in ct:
        if _local(el.tag) == "Override":
            overrides[(el.get("PartName") or "").lstrip("/")] = el.get("ContentType") or ""
    wb_part = _office_document(zf, names, where)
    ctype = overrides.get(wb_part, "")
    if "binary" in ctype or wb_part.endswith(".bin"):
        raise WorkbookRefused(f"{where} is a binary workbook (.xlsb); {_SAVE_AS}")
    if ctype not in WORKBOOK_TYPES:
        raise WorkbookRefused(f"{where}: its main part {wb_part} is {ctype or 'of no declared type'}, "
                              "not a SpreadsheetML workbook")
    kind = WORKBOOK_TYPES[ctype]
    wb = _parse_xml(_read_member(zf, wb_part), wb_part)
    rels = _rels(zf, names, wb_part)
    sheets, dnames, date1904 = [], [], False
    sheet_els = []
    for el in wb:
        tag = _local(el.tag)
        if tag == "workbookPr":
            date1904 = (el.get("date1904") or "").lower() in ("1", "true")
        elif tag == "sheets":
            sheet_els = [s for s in el if _local(s.tag) == "sheet"]
        elif tag == "definedNames":
            for dn in el:
                if _local(dn.tag) != "definedName":
                    continue
                scope = dn.get("localSheetId")
                dnames.append(DefinedName(dn.get("name") or "", int(scope) if scope is not None else None,
                                          (dn.text or "").strip(), (dn.get("hidden") or "") in ("1", "true")))
    sst = []
    for rid, (rtype, target) in rels.items():
        if rtype.endswith("/sharedStrings") and target in names:
            root = _parse_xml(_read_member(zf, target), target)
            sst = [_string_item(si) for si in root if _local(si.tag) == "si"]
    externals = sum(1 for rtype, _ in rels.values() if rtype.endswith("/externalLink"))
    _refuse_external_links(zf, names, rels, where)
    for s in sheet_els:
        rid = _attr(s, "id")
        rtype, target = rels.get(rid, ("", None))
        skind = rtype.rsplit("/", 1)[-1] if rtype else "missing"
        skind = {"xlMacrosheet": "macrosheet", "xlIntlMacrosheet": "macrosheet"}.get(skind, skind)
        sheet = Sheet(s.get("name") or "", target if target in names else None, skind, s.get("state") or "visible")
        if skind == "worksheet":
            if sheet.part is None:
                raise WorkbookRefused(f"{where}: sheet {sheet.name!r} has no part in the package")
            parse_sheet_xml(_read_member(zf, sheet.part), sheet, sst, date1904, sheet.part)
        sheets.append(sheet)
    for dn in dnames:
        if dn.scope is not None and not (0 <= dn.scope < len(sheets)):
            dn.scope = None
    return Book(path, kind, sheets, dnames, date1904, data, (st.st_size, st.st_mtime_ns), externals)


def _refuse_external_links(zf, names, rels, where) -> None:
    """A book linked to other workbooks is refused, whether or not a formula uses the link:
    its cached link values would be kept as they are while the book claims to be computed."""
    parts = sorted({t for rtype, t in rels.values() if rtype.endswith("/externalLink") and t}
                   | {n for n in names if n.startswith("xl/externalLinks/") and n.endswith(".xml")})
    if not parts and not any(rtype.endswith("/externalLink") for rtype, _ in rels.values()):
        return
    shown = parts[0] if parts else "a relationship of the workbook"
    source = ""
    if parts and parts[0] in names:
        folder, base = posixpath.split(parts[0])
        rel_part = posixpath.join(folder, "_rels", base + ".rels")
        if rel_part in names:
            for el in _parse_xml(_read_member(zf, rel_part), rel_part):
                if el.get("TargetMode") == "External" and el.get("Target"):
                    source = f" -> {el.get('Target')[:200]}"
                    break
    raise WorkbookRefused(f"{where} links to another workbook ({shown}{source}); fuelsys computes only "
                          "self-contained books: remove the links (Excel: Data > Edit Links > Break Link; "
                          "LibreOffice: Edit > Links to External Files > Break Link), save, and run again")


def _office_document(zf, names, where) -> str:
    if "_rels/.rels" not in names:
        raise WorkbookRefused(f"{where} is not an Office Open XML package (no _rels/.rels)")
    root = _parse_xml(_read_member(zf, "_rels/.rels"), "_rels/.rels")
    for el in root:
        if (el.get("Type") or "").endswith("/officeDocument"):
            target = (el.get("Target") or "").lstrip("/")
            if target in names:
                return target
    raise WorkbookRefused(f"{where} has no workbook part (not a spreadsheet package)")


def _rels(zf, names, part: str) -> dict:
    folder, base = posixpath.split(part)
    rel_part = posixpath.join(folder, "_rels", base + ".rels")
    out = {}
    if rel_part not in names:
        return out
    root = _parse_xml(_read_member(zf, rel_part), rel_part)
    for el in root:
        if el.get("TargetMode") == "External":
            out[el.get("Id")] = (el.get("Type") or "", None)
            continue
        target = el.get("Target") or ""
        if target.startswith("/"):
            full = target.lstrip("/")
        else:
            full = posixpath.normpath(posixpath.join(folder, target))
        out[el.get("Id")] = (el.get("Type") or "", full)
    return out


_REF_RE = re.compile(r"([A-Za-z]{1,3})(\d+)\Z")


def _rc(ref: str):
    m = _REF_RE.match(ref)
    if not m:
        return None
    c = 0
    for ch in m.group(1).upper():
        c = c * 26 + ord(ch) - 64
    return int(m.group(2)), c


def _area(ref: str | None):
    if not ref:
        return None
    a, _, b = ref.partition(":")
    p = _rc(a.replace("$", ""))
    q = _rc(b.replace("$", "")) if b else p
    if p is None or q is None:
        return None
    return min(p[0], q[0]), min(p[1], q[1]), max(p[0], q[0]), max(p[1], q[1])


def _date_serial(text: str, date1904: bool):
    import datetime as dt

    try:
        d = dt.datetime.fromisoformat(text.replace("Z", ""))
    except ValueError:
        return bi.VALUE
    base = dt.datetime(1904, 1, 1) if date1904 else dt.datetime(1899, 12, 30)
    return (d - base).total_seconds() / 86400.0


def cell_value(t: str | None, v: str | None, inline, sst, date1904=False):
    """The value of a ``<c>`` from its ``t`` attribute, ``<v>`` text and ``<is>`` element."""
    if t is None or t == "n":
        if v is None or v == "":
            return None
        try:
            return float(v)
        except ValueError:
            return bi.VALUE
    if t == "s":
        try:
            return sst[int(v)]
        except (TypeError, ValueError, IndexError):
            raise WorkbookRefused(f"shared string index {v!r} does not exist") from None
    if t == "str":
        return decode_ooxml_text(v or "")
    if t == "inlineStr":
        return _string_item(inline) if inline is not None else decode_ooxml_text(v or "")
    if t == "b":
        return (v or "").strip() in ("1", "true")
    if t == "e":
        return bi.error((v or "#N/A").strip())
    if t == "d":
        return _date_serial(v or "", date1904)
    raise WorkbookRefused(f"unknown cell type t={t!r}")


def parse_sheet_xml(data: bytes, sheet: Sheet, sst, date1904=False, where="sheet") -> Sheet:
    """Fill ``sheet.cells`` and ``sheet.formulas`` from a worksheet part."""
    import defusedxml.ElementTree as DET
    from defusedxml import DefusedXmlException

    cells, formulas = sheet.cells, sheet.formulas
    max_r = max_c = 0
    row_no = 0
    col_no = 0
    try:
        for event, el in DET.iterparse(io.BytesIO(data), events=("start", "end"), forbid_dtd=True):
            tag = el.tag
            tag = tag[tag.rfind("}") + 1:]
            if event == "start":
                if tag == "row":
                    r = el.get("r")
                    row_no = int(r) if r else row_no + 1
                    col_no = 0
                continue
            if tag == "c":
                ref = el.get("r")
                if ref:
                    rc = _rc(ref)
                    if rc is None:
                        raise WorkbookRefused(f"{where}: cell reference {ref!r} does not parse")
                    r, c = rc
                else:
                    r, c = row_no, col_no + 1
                row_no, col_no = r, c
                t = el.get("t")
                v = f = inline = None
                for ch in el:
                    ctag = ch.tag
                    ctag = ctag[ctag.rfind("}") + 1:]
                    if ctag == "v":
                        v = ch.text
                    elif ctag == "f":
                        f = ch
                    elif ctag == "is":
                        inline = ch
                value = cell_value(t, v, inline, sst, date1904)
                if value is not None:
                    cells[(r, c)] = value
                if f is not None:
                    ftype = f.get("t") or "normal"
                    text = f.text
                    if ftype == "shared":
                        si = f.get("si")
                        formulas[(r, c)] = Formula(text if text else None, "shared", _area(f.get("ref")),
                                                   int(si) if si is not None else None)
                    elif ftype == "array":
                        area = _area(f.get("ref")) or (r, c, r, c)
                        formulas[(r, c)] = Formula(text or "", "array", area)
                        max_r, max_c = max(max_r, area[2]), max(max_c, area[3])
                    elif ftype == "dataTable":
                        formulas[(r, c)] = Formula(text, "datatable", _area(f.get("ref")))
                    else:
                        formulas[(r, c)] = Formula(text or "", "normal")
                if r > max_r:
                    max_r = r
                if c > max_c:
                    max_c = c
                el.clear()
            elif tag == "row":
                el.clear()
    except DefusedXmlException as exc:
        raise WorkbookRefused(f"{where} has a document type declaration or entities ({type(exc).__name__}); "
                              "refused as a possible XML bomb or external entity") from None
    except WorkbookRefused:
        raise
    except Exception as exc:
        raise WorkbookRefused(f"{where} is not well-formed XML ({exc})") from None
    sheet.max_row, sheet.max_col = max_r, max_c
    return sheet


# ---------------------------------------------------------------------------
# cell values -> XML

_BAD_XML_CHARS = re.compile("[\x00-\x08\x0b\x0c\x0d\x0e-\x1f\ufffe\uffff]|_(?=x[0-9A-Fa-f]{4}_)")


def encode_ooxml_text(s: str) -> str:
    """Escape a text for a ``<v>``: control characters as ``_xHHHH_``, then XML escapes."""
    s = _BAD_XML_CHARS.sub(lambda m: "_x%04X_" % ord(m.group(0)), s)
    return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


def number_xml(x: float) -> str:
    """A number as the shortest text that reads back to the same double."""
    if x == int(x) and abs(x) < 1e15:
        return str(int(x))
    return repr(x)


def value_xml(value) -> tuple[str | None, str]:
    """A value -> (``t`` attribute or None, ``<v>`` text)."""
    t = type(value)
    if t is float or t is int:
        x = float(value)
        if not math.isfinite(x):
            return "e", "#NUM!"
        return None, number_xml(x)
    if t is bool:
        return "b", "1" if value else "0"
    if t is str:
        return "str", encode_ooxml_text(value)
    if t is bi.XlError:
        return "e", value.code
    if value is None:
        return None, "0"
    raise WriteError(f"cannot store a value of type {type(value).__name__}")


# ---------------------------------------------------------------------------
# editing a sheet part

_ATTRS = rb"(?:\s+[^\s=/>]+\s*=\s*(?:\"[^\"]*\"|'[^']*'))*"


class _SheetEditor:
    def __init__(self, data: bytes, where: str):
        self.data = data
        self.where = where
        if data.startswith((b"\xff\xfe", b"\xfe\xff")):
            raise WriteError(f"{where} is UTF-16 encoded; only UTF-8 sheet parts are edited")
        m = re.search(rb"<([A-Za-z_][\w.-]*:)?sheetData\b(" + _ATTRS + rb")\s*(/?)>", data)
        if not m:
            raise WriteError(f"{where} has no sheetData element")
        self.prefix = m.group(1) or b""
        self.open_start, self.open_end, self.self_closed = m.start(), m.end(), bool(m.group(3))
        p = re.escape(self.prefix)
        if self.self_closed:
            self.content_start = self.content_end = m.end()
        else:
            end = re.compile(rb"</" + p + rb"sheetData\s*>").search(data, m.end())
            if not end:
                raise WriteError(f"{where}: sheetData is not closed")
            self.content_start, self.content_end, self.close_end = m.end(), end.start(), end.end()
        self.row_re = re.compile(rb"<" + p + rb"row\b(" + _ATTRS + rb")\s*(?:/>|>(.*?)</" + p + rb"row\s*>)", re.DOTALL)
        self.cell_re = re.compile(rb"<" + p + rb"c\b(" + _ATTRS + rb")\s*(?:/>|>(.*?)</" + p + rb"c\s*>)", re.DOTALL)
        self.f_re = re.compile(rb"<" + p + rb"f\b" + _ATTRS + rb"\s*(?:/>|>.*?</" + p + rb"f\s*>)", re.DOTALL)
        self.v_re = re.compile(rb"<" + p + rb"v\b" + _ATTRS + rb"\s*(?:/>|>(.*?)</" + p + rb"v\s*>)", re.DOTALL)
        self.is_re = re.compile(rb"<" + p + rb"is\b" + _ATTRS + rb"\s*(?:/>|>.*?</" + p + rb"is\s*>)", re.DOTALL)

    @staticmethod
    def _get_attr(attrs: bytes, name: bytes):
        m = re.search(rb"(?:^|\s)" + name + rb"\s*=\s*(\"[^\"]*\"|'[^']*')", attrs)
        return m.group(1)[1:-1] if m else None

    def edit(self, targets: dict) -> bytes | None:
        """``targets`` (row, col) -> value; returns the new part or None when nothing changes."""
        by_row: dict[int, dict] = {}
        for (r, c), v in targets.items():
            by_row.setdefault(r, {})[c] = v
        data = self.data
        content = data[self.content_start:self.content_end]
        out = []
        pos = 0
        row_no = 0
        changed = False
        pending_rows = sorted(by_row)
        pi = 0
        for m in self.row_re.finditer(content):
            rattr = self._get_attr(m.group(1), b"r")
            explicit = rattr is not None
            row_no = int(rattr) if explicit else row_no + 1
            while pi < len(pending_rows) and pending_rows[pi] < row_no:
                r_new = pending_rows[pi]
                if not explicit:
                    raise WriteError(f"{self.where}: rows without numbers; cannot add row {r_new}")
                out.append(content[pos:m.start()])
                out.append(self._new_row(r_new, by_row[r_new]))
                pos = m.start()
                changed = True
                pi += 1
            if pi < len(pending_rows) and pending_rows[pi] == row_no:
                new_row = self._edit_row(m, row_no, by_row[row_no])
                pi += 1
                if new_row is not None:
                    out.append(content[pos:m.start()])
                    out.append(new_row)
                    pos = m.end()
                    changed = True
        tail_rows = [self._new_row(r, by_row[r]) for r in pending_rows[pi:]]
        if tail_rows:
            changed = True
        if not changed:
            return None
        out.append(content[pos:])
        out.extend(tail_rows)
        body = b"".join(out)
        if self.self_closed:
            tag = data[self.open_start:self.open_end]
            opening = tag[:-2].rstrip() + b">"
            return data[:self.open_start] + opening + body + b"</" + self.prefix + b"sheetData>" + data[self.open_end:]
        return data[:self.content_start] + body + data[self.content_end:]

    def _new_cell(self, r: int, c: int, value) -> bytes:
        t, text = value_xml(value)
        p = self.prefix
        tattr = b' t="' + t.encode() + b'"' if t else b""
        ref = f"{col_letters(c)}{r}".encode()
        return b"<" + p + b'c r="' + ref + b'"' + tattr + b"><" + p + b"v>" + text.encode("utf-8") + b"</" + p + b"v></" + p + b"c>"

    def _new_row(self, r: int, cells: dict) -> bytes:
        p = self.prefix
        body = b"".join(self._new_cell(r, c, cells[c]) for c in sorted(cells))
        return b"<" + p + b'row r="' + str(r).encode() + b'">' + body + b"</" + p + b"row>"

    def _edit_row(self, m, r: int, cells: dict) -> bytes | None:
        whole = m.group(0)
        inner = m.group(2)
        pending = sorted(cells)
        if inner is None:  # <row .../>: only new cells can go in
            body = b"".join(self._new_cell(r, c, cells[c]) for c in pending)
            start_tag = whole[:-2].rstrip() + b">"
            return start_tag + body + b"</" + self.prefix + b"row>"
        inner_start = m.start(2) - m.start(0)
        out = []
        pos = 0
        col = 0
        changed = False
        pi = 0
        for cm in self.cell_re.finditer(inner):
            ref = self._get_attr(cm.group(1), b"r")
            explicit = ref is not None
            if explicit:
                rc = _rc(ref.decode("ascii", "replace"))
                if rc is None or rc[0] != r:
                    raise WriteError(f"{self.where}: cell reference {ref!r} in row {r} does not parse")
                col = rc[1]
            else:
                col += 1
            while pi < len(pending) and pending[pi] < col:
                if not explicit:
                    raise WriteError(f"{self.where}: cells without references in row {r}; cannot add a cell")
                out.append(inner[pos:cm.start()])
                out.append(self._new_cell(r, pending[pi], cells[pending[pi]]))
                pos = cm.start()
                changed = True
                pi += 1
            if pi < len(pending) and pending[pi] == col:
                new = self._edit_cell(cm, cells[col])
                pi += 1
                if new is not None:
                    out.append(inner[pos:cm.start()])
                    out.append(new)
                    pos = cm.end()
                    changed = True
        tail = [self._new_cell(r, c, cells[c]) for c in pending[pi:]]
        if not changed and not tail:
            return None
        out.append(inner[pos:])
        out.extend(tail)
        return whole[:inner_start] + b"".join(out) + whole[inner_start + len(inner):]

    def _edit_cell(self, cm, value) -> bytes | None:
        attrs, inner = cm.group(1), cm.group(2)
        whole = cm.group(0)
        t_new, text = value_xml(value)
        v_new = text.encode("utf-8")
        t_old = self._get_attr(attrs, b"t")
        t_old = t_old.decode() if t_old is not None else None
        p = self.prefix
        if inner is not None:
            vm = self.v_re.search(inner)
            if vm and (t_old or "n") == (t_new or "n") and (vm.group(1) or b"") == v_new \
                    and not self.is_re.search(inner):
                return None  # already stored as it is
        # the start tag: change only the t attribute, keep every other byte
        if t_old is not None:
            tm = re.search(rb"(\s+)t\s*=\s*(\"[^\"]*\"|'[^']*')", attrs)
            if t_new is None:
                attrs = attrs[:tm.start()] + attrs[tm.end():]
            else:
                attrs = attrs[:tm.start()] + tm.group(1) + b't="' + t_new.encode() + b'"' + attrs[tm.end():]
        elif t_new is not None:
            attrs = attrs + b' t="' + t_new.encode() + b'"'
        head = b"<" + p + b"c"
        rest = whole[len(head) + len(cm.group(1)):]  # optional space, then "/>" or ">"
        space = rest[:len(rest) - len(rest.lstrip())]
        v_el = b"<" + p + b"v>" + v_new + b"</" + p + b"v>"
        close = b"</" + p + b"c>"
        if inner is None:
            body = v_el
        else:
            close = whole[cm.end(2) - cm.start(0):]
            body = self.is_re.sub(b"", inner)
            vm = self.v_re.search(body)
            if vm:
                body = body[:vm.start()] + v_el + body[vm.end():]
            else:
                fm = self.f_re.search(body)
                at = fm.end() if fm else 0
                body = body[:at] + v_el + body[at:]
        return head + attrs + space + b">" + body + close


def edit_sheet_xml(data: bytes, targets: dict, where: str = "sheet") -> bytes | None:
    """Store ``targets`` ((row, col) -> value) in a worksheet part; None when nothing changes."""
    return _SheetEditor(data, where).edit(targets)


def _verify_sheet(old: Sheet, new_data: bytes, targets: dict, sst, date1904, where):
    """The edited part must read back with the new values and every other cell as it was."""
    check = Sheet(old.name, old.part, old.kind)
    parse_sheet_xml(new_data, check, sst, date1904, where)
    if check.formulas != old.formulas:
        raise WriteError(f"{where}: a formula changed while editing values (nothing written)")
    for key in set(check.cells) | set(old.cells):
        want = targets[key] if key in targets else old.cells.get(key)
        if key in targets:
            want = bi.result_value(want) if type(want) is float else want
            if type(want) is float and not math.isfinite(want):
                want = bi.NUM
        got = check.cells.get(key)
        if not _same_stored(want, got):
            raise WriteError(f"{where}: cell {col_letters(key[1])}{key[0]} reads back as {got!r}, "
                             f"expected {want!r} (nothing written)")


def _same_stored(a, b) -> bool:
    if type(a) is float and type(b) is float:
        return a == b or (a != a and b != b)
    return type(a) is type(b) and a == b


# ---------------------------------------------------------------------------
# the zip package: raw copy of every member but the replaced ones

@dataclass
class _Entry:
    index: int
    cd: bytes  # the central directory record as it was
    name: str
    flags: int
    method: int
    crc: int
    csize: int
    usize: int
    offset: int
    extra: bytes
    off_in_zip64: bool


def _zip64_values(extra: bytes, want: list[bool]):
    """Parse the zip64 extra field; ``want`` says which of usize, csize, offset, disk it holds."""
    pos = 0
    while pos + 4 <= len(extra):
        hid, size = struct.unpack_from("<HH", extra, pos)
        if hid == 0x0001:
            body = extra[pos + 4:pos + 4 + size]
            vals, q = [], 0
            for i, w in enumerate(want):
                if w:
                    if i < 3:
                        vals.append(struct.unpack_from("<Q", body, q)[0])
                        q += 8
                    else:
                        vals.append(struct.unpack_from("<L", body, q)[0])
                        q += 4
                else:
                    vals.append(None)
            return pos, size, vals
        pos += 4 + size
    return None, None, [None] * len(want)


def _strip_zip64(extra: bytes) -> bytes:
    out, pos = b"", 0
    while pos + 4 <= len(extra):
        hid, size = struct.unpack_from("<HH", extra, pos)
        if hid != 0x0001:
            out += extra[pos:pos + 4 + size]
        pos += 4 + size
    return out + extra[pos:]


def _layout(data: bytes):
    eocd = data.rfind(b"PK\x05\x06", max(0, len(data) - 65557))
    if eocd < 0:
        raise WriteError("the package has no zip end record")
    (_, _, _, _, n_total, cd_size, cd_offset, clen) = struct.unpack_from("<4s4H2LH", data, eocd)
    z64 = None
    loc = eocd - 20
    if loc >= 0 and data[loc:loc + 4] == b"PK\x06\x07":
        z64_off = struct.unpack_from("<Q", data, loc + 8)[0]
        if data[z64_off:z64_off + 4] != b"PK\x06\x06":
            raise WriteError("the zip64 end record is not where its locator says")
        rec_size = struct.unpack_from("<Q", data, z64_off + 4)[0]
        n_total, cd_size, cd_offset = struct.unpack_from("<QQQ", data, z64_off + 32)
        z64 = (z64_off, 12 + rec_size, loc)
    entries = []
    pos = cd_offset
    for i in range(n_total):
        if data[pos:pos + 4] != b"PK\x01\x02":
            raise WriteError("the zip central directory does not parse")
        (flags, method, _t, _d, crc, csize, usize, nlen, xlen, klen, _disk, _ia, _ea, off) = \
            struct.unpack_from("<6x4H3L3H2HLL", data, pos + 2)
        name_b = data[pos + 46:pos + 46 + nlen]
        extra = data[pos + 46 + nlen:pos + 46 + nlen + xlen]
        rec = data[pos:pos + 46 + nlen + xlen + klen]
        want = [usize == 0xFFFFFFFF, csize == 0xFFFFFFFF, off == 0xFFFFFFFF, False]
        off_in_zip64 = want[2]
        if any(want):
            _, _, vals = _zip64_values(extra, want)
            usize = vals[0] if vals[0] is not None else usize
            csize = vals[1] if vals[1] is not None else csize
            off = vals[2] if vals[2] is not None else off
        name = name_b.decode("utf-8" if flags & 0x800 else "cp437")
        entries.append(_Entry(i, rec, name, flags, method, crc, csize, usize, off, extra, off_in_zip64))
        pos += len(rec)
    if pos != cd_offset + cd_size:
        raise WriteError("the zip central directory size does not match its records")
    return entries, cd_offset, cd_size, eocd, clen, z64


def _local_header(data: bytes, off: int):
    if data[off:off + 4] != b"PK\x03\x04":
        raise WriteError("a zip member's local header is not where the directory says")
    (ver, flags, method, t, d, crc, csize, usize, nlen, xlen) = struct.unpack_from("<5H3L2H", data, off + 4)
    name = data[off + 30:off + 30 + nlen]
    extra = data[off + 30 + nlen:off + 30 + nlen + xlen]
    return ver, flags, method, t, d, name, extra, off + 30 + nlen + xlen


def _compress(raw: bytes, method: int, flags: int) -> bytes:
    if method == 0:
        return raw
    level = {0: 6, 1: 9, 2: 1, 3: 1}[(flags >> 1) & 3]
    co = zlib.compressobj(level, zlib.DEFLATED, -15)
    return co.compress(raw) + co.flush()


def rebuild_zip(data: bytes, replace: dict) -> bytes:
    """The package ``data`` with the members in ``replace`` (name -> bytes) replaced.

    Every other member is copied raw (local header, compressed data and data
    descriptor byte for byte); the central directory keeps each record and
    changes only offsets (and, for a replaced member, its CRC and sizes).
    """
    entries, cd_offset, cd_size, eocd, clen, z64 = _layout(data)
    names = {e.name for e in entries}
    missing = set(replace) - names
    if missing:
        raise WriteError(f"no zip member {sorted(missing)[0]!r} to replace")
    physical = sorted(entries, key=lambda e: e.offset)
    first = physical[0].offset if physical else cd_offset
    out = bytearray(data[:first])
    new_off, new_info = {}, {}
    for k, e in enumerate(physical):
        end = physical[k + 1].offset if k + 1 < len(physical) else cd_offset
        data_start = _local_header(data, e.offset)[7]
        if data_start + e.csize > end:
            raise WriteError(f"zip member {e.name} overlaps the next one")
        new_off[e.index] = len(out)
        if e.name in replace:
            ver, flags, method, t, d, name, extra, _ = _local_header(data, e.offset)
            raw = replace[e.name]
            comp = _compress(raw, e.method, e.flags)
            crc = zlib.crc32(raw) & 0xFFFFFFFF
            lflags = flags & ~0x0008
            lextra = _strip_zip64(extra)
            out += struct.pack("<4s5H3L2H", b"PK\x03\x04", ver, lflags, e.method, t, d, crc, len(comp), len(raw),
                               len(name), len(lextra))
            out += name + lextra + comp
            new_info[e.index] = (crc, len(comp), len(raw))
        else:
            out += data[e.offset:end]
    cd_start = len(out)
    for e in entries:
        rec = bytearray(e.cd)
        off = new_off[e.index]
        if off > 0xFFFFFFFE:
            raise WriteError("the package would need zip64 offsets")
        if e.index in new_info:
            crc, cs, us = new_info[e.index]
            nlen, xlen, klen = struct.unpack_from("<3H", rec, 28)
            extra = _strip_zip64(bytes(rec[46 + nlen:46 + nlen + xlen]))
            head = bytearray(rec[:46])
            struct.pack_into("<H", head, 8, e.flags & ~0x0008)
            struct.pack_into("<3L", head, 16, crc, cs, us)
            struct.pack_into("<H", head, 30, len(extra))
            struct.pack_into("<L", head, 42, off)
            rec = head + rec[46:46 + nlen] + extra + rec[46 + nlen + xlen:]
        elif e.off_in_zip64:
            nlen, xlen = struct.unpack_from("<2H", rec, 28)
            usize32, csize32 = struct.unpack_from("<2L", rec, 20)
            want = [usize32 == 0xFFFFFFFF, csize32 == 0xFFFFFFFF, True, False]
            xpos, _, _ = _zip64_values(e.extra, want)
            q = 46 + nlen + xpos + 4 + 8 * (int(want[0]) + int(want[1]))
            struct.pack_into("<Q", rec, q, off)
        else:
            struct.pack_into("<L", rec, 42, off)
        out += rec
    cd_len = len(out) - cd_start
    if z64 is not None:
        z64_off, z64_len, loc = z64
        rec = bytearray(data[z64_off:z64_off + z64_len])
        struct.pack_into("<QQ", rec, 40, cd_len, cd_start)
        new_z64 = len(out)
        out += rec
        locator = bytearray(data[loc:loc + 20])
        struct.pack_into("<Q", locator, 8, new_z64)
        out += locator
    end = bytearray(data[eocd:eocd + 22])
    n32 = struct.unpack_from("<L", end, 16)[0]
    s32 = struct.unpack_from("<L", end, 12)[0]
    if s32 != 0xFFFFFFFF:
        struct.pack_into("<L", end, 12, cd_len)
    if n32 != 0xFFFFFFFF:
        struct.pack_into("<L", end, 16, cd_start)
    out += end + data[eocd + 22:eocd + 22 + clen]
    return bytes(out)


# ---------------------------------------------------------------------------
# writing a book

def _write_chunk(fh, chunk: bytes) -> None:
    fh.write(chunk)


def open_elsewhere(path: str) -> str | None:
    """The lock file a spreadsheet program keeps beside a book it has open, if there is one.

    LibreOffice writes ``.~lock.NAME#`` and Excel ``~$NAME`` in the book's
    folder while the book is open; a book written under an open program would
    lose the new values at its next save.
    """
    folder, name = os.path.split(os.path.realpath(path))
    for lock in (f".~lock.{name}#", "~$" + name[2:] if len(name) > 2 else "", "~$" + name):
        if lock and os.path.lexists(os.path.join(folder, lock)):
            return os.path.join(folder, lock)
    return None


def pid_alive(pid: int) -> bool:
    """Whether process ``pid`` exists on this machine (signal 0 tests without sending anything)."""
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    except (OverflowError, ValueError, OSError):
        return False
    return True


def _libreoffice_running() -> bool:
    try:
        pids = [p for p in os.listdir("/proc") if p.isdigit()]
    except OSError:
        return True  # cannot tell: assume it may be
    for p in pids:
        try:
            with open(f"/proc/{p}/comm") as fh:
                if fh.read().strip() in ("soffice", "soffice.bin", "oosplash"):
                    return True
        except OSError:
            continue
    return False


def describe_lock(lock: str) -> str:
    """Who holds a spreadsheet program's lock file, whether that looks stale, and how to clear it."""
    import socket

    name = os.path.basename(lock)
    try:
        with open(lock, "rb") as fh:
            raw = fh.read(4096)
    except OSError:
        raw = b""
    text = raw.decode("utf-8", "replace").strip().rstrip(";")
    verdict = ""
    if name.startswith(".~lock."):
        # LibreOffice: user name, system user, host, date, profile URL (and a process id where present)
        fields = text.split(",")
        user = next((f for f in fields[:2] if f.strip()), "someone").strip()
        host = fields[2].strip() if len(fields) > 2 else ""
        when = fields[3].strip() if len(fields) > 3 else ""
        pid = next((int(f) for f in fields[4:] if f.strip().isdigit()), None)
        who = f"LibreOffice lock of {user}" + (f" on {host}" if host else "") + (f" since {when}" if when else "")
        if host and host == socket.gethostname():
            if pid is not None:
                verdict = (f"; process {pid} is running: the book is open there" if pid_alive(pid)
                           else f"; process {pid} is not running: the lock is stale")
            else:
                verdict = ("; a LibreOffice is running on this machine: close the book there"
                           if _libreoffice_running() else
                           "; no LibreOffice is running on this machine: the lock is stale")
        elif host:
            verdict = f"; it was written on another computer ({host}): if the book is not open there, it is stale"
    else:
        who = "Excel owner file" + (f" of {text[1:40].strip()}" if len(text) > 1 else "")
    return (f"{name} ({who}{verdict}). If no spreadsheet program has the book open (one crashed, or the "
            f"file came with the lock), delete {lock} and run again")


#: the temporary files fuelsys writes beside a book: ".~fuelsys-<pid>-<random>.tmp"
_TEMP_RE = re.compile(r"\.~fuelsys-(\d{1,10})-[A-Za-z0-9_]{1,32}\.tmp\Z")


def clean_stale_temps(folder: str) -> list[str]:
    """Remove fuelsys's own temporary files in ``folder`` whose writing process is dead.

    Only regular files named ``.~fuelsys-<pid>-<random>.tmp`` and owned by this
    user are touched (a kill during a write leaves one behind); the LibreOffice
    engine's files and everything else are left alone.
    """
    removed = []
    try:
        names = os.listdir(folder)
    except OSError:
        return removed
    for name in names:
        m = _TEMP_RE.match(name)
        if not m:
            continue
        pid = int(m.group(1))
        if pid == os.getpid() or pid_alive(pid):
            continue
        p = os.path.join(folder, name)
        try:
            st = os.lstat(p)
            if stat.S_ISREG(st.st_mode) and st.st_uid == os.geteuid():
                os.unlink(p)
                removed.append(p)
        except OSError:
            continue
    return removed


_KINDS = ((stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device"), (stat.S_ISFIFO, "a FIFO (named pipe)"),
          (stat.S_ISSOCK, "a socket"), (stat.S_ISDIR, "a folder"))


def output_target(target, follow_symlinks: bool = False, force: bool = False) -> tuple[str, list[str]]:
    """The output policy: the file to replace for ``target``, and notes on what ``force`` let through.

    * a symbolic link is refused unless ``follow_symlinks`` (then its target is replaced);
    * anything but a regular file (a device, a FIFO, a socket, a folder) is refused, always;
    * a read-only file (no write bit) is refused unless ``force`` (it stays read-only);
    * a file with other hard links is refused unless ``force``: a replace gives this name a
      new file, and the other names keep the old one.
    Raises :class:`WriteError`; nothing is written.
    """
    target = os.path.abspath(os.fspath(target))
    notes = []
    try:
        st = os.lstat(target)
    except FileNotFoundError:
        st = None
    if st is not None and stat.S_ISLNK(st.st_mode):
        if not follow_symlinks:
            raise WriteError(f"{target} is a symbolic link (to {os.readlink(target)}); fuelsys does not write "
                             "through links: name the file itself, or add --follow-symlinks; nothing written")
        target = os.path.realpath(target)
        try:
            st = os.stat(target)
        except FileNotFoundError:
            st = None
    if st is None:
        folder = os.path.dirname(target)
        if not os.path.isdir(folder):
            raise WriteError(f"the folder {folder} does not exist; nothing written")
        return target, notes
    for test, kind in _KINDS:
        if test(st.st_mode):
            raise WriteError(f"{target} is not a regular file ({kind}); fuelsys writes only regular files and "
                             "never replaces anything else: give another --output; nothing written")
    if not st.st_mode & 0o222:
        if not force:
            raise WriteError(f"{target} is read-only (mode {stat.S_IMODE(st.st_mode):04o}); add --force to replace "
                             "it (it stays read-only), or write elsewhere with --output; nothing written")
        notes.append(f"{os.path.basename(target)} was read-only; replaced because of --force (still read-only)")
    if st.st_nlink > 1:
        what = (f"{target} has {st.st_nlink} hard links: replacing it gives this name a new file, and the "
                "other names keep the old file with the old values")
        if not force:
            raise WriteError(what + "; write elsewhere with --output, or add --force to replace it anyway; "
                             "nothing written")
        notes.append(f"{os.path.basename(target)} had {st.st_nlink} hard links; replaced because of --force: "
                     "the other names keep the old file with the old values")
    return target, notes


def _keep_attributes(src: str, tmp: str, notes: list) -> None:
    """Give ``tmp`` the owner, group, mode and extended attributes of ``src`` where this process may."""
    st = os.stat(src)
    if (st.st_uid, st.st_gid) != (os.geteuid(), os.getegid()):
        try:
            os.chown(tmp, st.st_uid, st.st_gid)
        except OSError as exc:
            notes.append(f"owner and group of {os.path.basename(src)} not kept ({exc.strerror}): the file now "
                         "belongs to you")
    os.chmod(tmp, stat.S_IMODE(st.st_mode))
    try:
        names = os.listxattr(src)
    except (OSError, AttributeError):
        names = []
    for name in names:
        try:
            os.setxattr(tmp, name, os.getxattr(src, name))
        except OSError as exc:
            notes.append(f"extended attribute {name} of {os.path.basename(src)} not kept ({exc.strerror})")


def atomic_write(target: str, payload: bytes, mode_from: str | None = None, expect_stat=None,
                 follow_symlinks: bool = False, force: bool = False) -> list[str]:
    """Write ``payload`` to ``target`` through a temporary file in the same folder and :func:`os.replace`.

    The output policy (:func:`output_target`) applies first; the new file keeps
    the replaced file's owner, group, mode and extended attributes where the
    process may (a new file takes the mode of ``mode_from``).  ``expect_stat``
    (size, mtime_ns) refuses the replace when ``target`` changed since it was
    read.  fuelsys's own stale temporary files in the folder are removed first.
    On any failure the temporary file is removed and ``target`` is untouched.
    Returns notes on what could not be kept or what ``force`` let through.
    """
    target, notes = output_target(target, follow_symlinks, force)
    folder = os.path.dirname(target) or "."
    lock = open_elsewhere(target)
    if lock:
        raise WriteError(f"{os.path.basename(target)} is open in a spreadsheet program ({describe_lock(lock)}); "
                         "or write elsewhere with --output; nothing written")
    clean_stale_temps(folder)
    fd, tmp = tempfile.mkstemp(prefix=f".~fuelsys-{os.getpid()}-", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "wb") as fh:
            for i in range(0, len(payload), _CHUNK):
                _write_chunk(fh, payload[i:i + _CHUNK])
            fh.flush()
            os.fsync(fh.fileno())
        if os.path.exists(target):
            _keep_attributes(target, tmp, notes)
        elif mode_from and os.path.exists(mode_from):
            os.chmod(tmp, stat.S_IMODE(os.stat(mode_from).st_mode))
        if expect_stat:
            st = os.stat(target)
            if (st.st_size, st.st_mtime_ns) != tuple(expect_stat):
                raise WriteError(f"{os.path.basename(target)} changed on disk while it was being computed; "
                                 "nothing written (run again)")
        os.replace(tmp, target)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
    return notes


def write_values(book: Book, updates: dict, target, follow_symlinks: bool = False, force: bool = False,
                 notes: list | None = None) -> list[str]:
    """Store ``updates`` (sheet index -> {(row, col): value}) in a copy of ``book`` at ``target``.

    ``target`` may be the book's own path (replaced atomically); the output
    policy of :func:`output_target` applies.  Returns the names of the sheet
    parts that changed; ``notes`` (a list) receives what could not be kept.
    Raises :class:`WriteError`, with the original untouched, when anything
    does not check out.
    """
    target = os.fspath(target)
    output_target(target, follow_symlinks, force)  # refuse before any work
    replace = {}
    with book._zip() as zf:
        sst = _shared_strings(book, zf)
        for si in sorted(updates):
            sheet = book.sheets[si]
            old = _read_member(zf, sheet.part)
            new = edit_sheet_xml(old, updates[si], sheet.part)
            if new is None:
                continue
            _verify_sheet(sheet, new, updates[si], sst, book.date1904, sheet.part)
            replace[sheet.part] = new
    same_file = os.path.exists(target) and os.path.samefile(target, book.path)
    if same_file and not replace:
        return []
    payload = rebuild_zip(book.data, replace) if replace else book.data
    _verify_package(book.data, payload, replace)
    kept = atomic_write(target, payload, mode_from=book.path, expect_stat=book.stat if same_file else None,
                        follow_symlinks=follow_symlinks, force=force)
    if notes is not None:
        notes.extend(kept)
    return sorted(replace)


def _shared_strings(book: Book, zf) -> list:
    names = set(zf.namelist())
    wb_part = _office_document(zf, names, book.path)
    for rtype, target in _rels(zf, names, wb_part).values():
        if rtype.endswith("/sharedStrings") and target in names:
            root = _parse_xml(_read_member(zf, target), target)
            return [_string_item(si) for si in root if _local(si.tag) == "si"]
    return []


def _verify_package(old: bytes, new: bytes, replaced: dict) -> None:
    """The new package must list the same members in the same order, with the same
    metadata, and every member must read back (CRC checked)."""
    with zipfile.ZipFile(io.BytesIO(old)) as a, zipfile.ZipFile(io.BytesIO(new)) as b:
        _compare_packages(a, b, replaced)


def _compare_packages(a, b, replaced):
    ia, ib = a.infolist(), b.infolist()
    if [i.filename for i in ia] != [i.filename for i in ib]:
        raise WriteError("the rebuilt package lists different members (nothing written)")
    for x, y in zip(ia, ib):
        if (x.date_time, x.compress_type, x.external_attr, x.create_system) != \
                (y.date_time, y.compress_type, y.external_attr, y.create_system):
            raise WriteError(f"member {x.filename} lost its metadata (nothing written)")
        if x.filename in replaced:
            if b.read(y) != replaced[x.filename]:
                raise WriteError(f"member {x.filename} does not read back (nothing written)")
        elif (x.CRC, x.compress_size, x.file_size, x.extra, x.flag_bits) != \
                (y.CRC, y.compress_size, y.file_size, y.extra, y.flag_bits):
            raise WriteError(f"member {x.filename} changed although it was not edited (nothing written)")
    bad = b.testzip()
    if bad is not None:
        raise WriteError(f"member {bad} of the rebuilt package fails its CRC check (nothing written)")
