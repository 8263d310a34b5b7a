"""Reading workbooks safely and writing cached values without damage (fuelsys.sheet.xlsx).

What a correct result is here needs no outside source: the files are built in
the tests, and "right" means the value the formula computes by the rules tested
in tests/test_evaluate.py, read back by openpyxl (an independent reader), with
every other zip member byte-identical to the original.  The zip layout facts
come from PKWARE's APPNOTE.TXT (local header, data descriptor, central
directory); the SpreadsheetML value types from ECMA-376 Part 1, 18.3.1.4 and
18.18.11.
"""

import io
import os
import struct
import zipfile
import zlib

import openpyxl
import pytest
from openpyxl.chart import BarChart, Reference
from openpyxl.comments import Comment
from openpyxl.drawing.image import Image
from openpyxl.formatting.rule import CellIsRule
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation

from fuelsys.sheet import builtins as bi
from fuelsys.sheet import evaluate as ev
from fuelsys.sheet import xlsx

MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"


@pytest.fixture(autouse=True)
def strict(monkeypatch):
    monkeypatch.setattr(ev, "STRICT", True)


# ---------------------------------------------------------------------------
# building packages by hand (for what openpyxl cannot write: shared formulas,
# stored errors, prefixes, DTDs, crafted zips)

def c(ref, v=None, f=None, t=None, fattrs="", attrs=""):
    """One <c> element."""
    tt = f' t="{t}"' if t else ""
    inner = ""
    if f is not None:
        fx = f.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
        inner += f"<f{fattrs}>{fx}</f>" if f else f"<f{fattrs}/>"
    if v is not None:
        inner += f"<v>{v}</v>"
    r = f' r="{ref}"' if ref else ""
    return f"<c{r}{tt}{attrs}>{inner}</c>"


def rows_xml(cells):
    """cells: list of <c> strings with explicit refs -> <row> elements."""
    by_row = {}
    for cx in cells:
        ref = cx.split('r="', 1)[1].split('"', 1)[0]
        r = int("".join(ch for ch in ref if ch.isdigit()))
        by_row.setdefault(r, []).append(cx)
    return "".join(f'<row r="{r}">{"".join(by_row[r])}</row>' for r in sorted(by_row))


def raw_book(path, sheets, names=(), macro=False, extra=None, sheet_prolog="", member_order=None,
             data_descriptors=False):
    """Write a minimal package; ``sheets`` is a list of (name, sheetData inner XML)."""
    ctype = ("application/vnd.ms-excel.sheet.macroEnabled.main+xml" if macro
             else "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml")
    overrides = f'<Override PartName="/xl/workbook.xml" ContentType="{ctype}"/>'
    wrels, wsheets = [], []
    members = {}
    for i, (name, data) in enumerate(sheets, 1):
        overrides += (f'<Override PartName="/xl/worksheets/sheet{i}.xml" ContentType="application/'
                      'vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>')
        wrels.append(f'<Relationship Id="rId{i}" Type="{REL_NS}/worksheet" Target="worksheets/sheet{i}.xml"/>')
        wsheets.append(f'<sheet name="{name}" sheetId="{i}" r:id="rId{i}"/>')
        members[f"xl/worksheets/sheet{i}.xml"] = (
            f'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n{sheet_prolog}'
            f'<worksheet xmlns="{MAIN_NS}" xmlns:r="{REL_NS}"><sheetData>{data}</sheetData></worksheet>')
    dn = "".join(f'<definedName name="{n}"{"" if s is None else f" localSheetId=%s" % s}>{t}</definedName>'
                 for n, s, t in names)
    dn = f"<definedNames>{dn}</definedNames>" if dn else ""
    members["xl/workbook.xml"] = (f'<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="{MAIN_NS}" '
                                  f'xmlns:r="{REL_NS}"><sheets>{"".join(wsheets)}</sheets>{dn}</workbook>')
    members["xl/_rels/workbook.xml.rels"] = (
        '<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/'
        f'package/2006/relationships">{"".join(wrels)}</Relationships>')
    members["_rels/.rels"] = (
        '<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/'
        f'package/2006/relationships"><Relationship Id="rId1" Type="{REL_NS}/officeDocument" '
        'Target="xl/workbook.xml"/></Relationships>')
    if macro:
        overrides += '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"/>'
    members["[Content_Types].xml"] = (
        '<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/'
        'content-types"><Default Extension="xml" ContentType="application/xml"/><Default Extension="rels" '
        f'ContentType="application/vnd.openxmlformats-package.relationships+xml"/>{overrides}</Types>')
    for k, v in (extra or {}).items():
        members[k] = v
    order = member_order or ["[Content_Types].xml", "_rels/.rels", "xl/workbook.xml", "xl/_rels/workbook.xml.rels"] + \
        sorted(k for k in members if k.startswith("xl/worksheets/")) + \
        [k for k in members if k not in ("[Content_Types].xml", "_rels/.rels", "xl/workbook.xml",
                                          "xl/_rels/workbook.xml.rels") and not k.startswith("xl/worksheets/")]
    buf = io.BytesIO()
    target = _Unseekable(buf) if data_descriptors else buf
    with zipfile.ZipFile(target, "w", zipfile.ZIP_DEFLATED) as zf:
        for i, k in enumerate(order):
            zi = zipfile.ZipInfo(k, date_time=(2021, 3, 4, 5, 6, 2 * (i % 30)))
            zi.compress_type = zipfile.ZIP_DEFLATED
            data = members[k]
            zf.writestr(zi, data.encode("utf-8") if isinstance(data, str) else data)
    with open(path, "wb") as fh:
        fh.write(buf.getvalue())
    return path


class _Unseekable(io.RawIOBase):
    """A write-only stream that cannot seek, so zipfile writes data descriptors."""

    def __init__(self, buf):
        self.buf = buf

    def writable(self):
        return True

    def write(self, b):
        return self.buf.write(b)

    def flush(self):
        pass


def tiny_png() -> bytes:
    """A 1x1 red PNG made by hand (PNG specification, ISO/IEC 15948: signature, IHDR, IDAT, IEND)."""
    def chunk(kind, data):
        return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data) & 0xFFFFFFFF)

    ihdr = struct.pack(">IIBBBBB", 1, 1, 8, 2, 0, 0, 0)
    return b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", ihdr) + chunk(b"IDAT", zlib.compress(b"\x00\xff\x00\x00")) \
        + chunk(b"IEND", b"")


class _PngImage(Image):
    """openpyxl's Image without Pillow: the bytes are given, the size is known (1x1)."""

    def __init__(self, data):
        self.ref = io.BytesIO(data)
        self._png = data
        self.width = self.height = 1
        self.format = "png"

    def _data(self):
        return self._png


def _bytes(path):
    with open(path, "rb") as fh:
        return fh.read()


def _member(path, name):
    with zipfile.ZipFile(path) as zf:
        return zf.read(name)


def _infos(path):
    with zipfile.ZipFile(path) as zf:
        return zf.infolist()


def members(path):
    with zipfile.ZipFile(path) as zf:
        return [(i.filename, i.date_time, i.compress_type, i.CRC, i.external_attr, zf.read(i)) for i in zf.infolist()]


def raw_records(path):
    """Each member's local record as stored (header + compressed data), from the file's own bytes."""
    data = _bytes(path)
    entries = xlsx._layout(data)[0]
    phys = sorted(entries, key=lambda e: e.offset)
    out = {}
    cd = xlsx._layout(data)[1]
    for k, e in enumerate(phys):
        end = phys[k + 1].offset if k + 1 < len(phys) else cd
        out[e.name] = data[e.offset:end]
    return out


# ---------------------------------------------------------------------------
# the rich workbook: chart, image, comments, validation, conditional formats, names

def rich_book(path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Inputs"
    ws["A1"], ws["B1"] = "temperature", 15.0
    ws["A2"], ws["B2"] = "pressure bar", 3.5
    ws["A3"], ws["B3"] = "needles", 8
    ws["B1"].comment = Comment("fuel temperature in the tank", "builder")
    dv = DataValidation(type="decimal", operator="between", formula1="-40", formula2="150")
    ws.add_data_validation(dv)
    dv.add("B1")
    ws.conditional_formatting.add("B2", CellIsRule(operator="greaterThan", formula=["10"]))
    calc = wb.create_sheet("Calc sheet")
    calc["A1"] = "=Inputs!B1*2"  # 30
    calc["A2"] = "=A1+Pressure"  # 33.5
    calc["A3"] = "=ROUND(A2/Needles,3)"  # 4.1875 -> 4.188 (ROUND function: halves away from zero)
    calc["A4"] = '="flow "&A3'  # "flow 4.188"
    calc["A5"] = "=SUM(A1:A3)"  # 67.688
    calc["A6"] = "=IFERROR(1/0,-1)"  # -1
    calc["A7"] = "=A6<0"  # TRUE
    calc["A8"] = "=1/0"  # #DIV/0!
    calc["A9"] = "=FS_VERSION()"
    res = wb.create_sheet("Results")
    res["A1"] = "='Calc sheet'!A5*10"  # 676.88
    wb.defined_names["Pressure"] = DefinedName("Pressure", attr_text="Inputs!$B$2")
    wb.defined_names["Needles"] = DefinedName("Needles", attr_text="Inputs!$B$3")
    chart = BarChart()
    chart.add_data(Reference(ws, min_col=2, min_row=1, max_row=3))
    ws.add_chart(chart, "D2")
    img = _PngImage(tiny_png())
    img.anchor = "D20"
    ws.add_image(img)
    wb.save(path)
    return path


RICH_EXPECTED = {  # arithmetic on the inputs by the rules in tests/test_evaluate.py
    ("Calc sheet", "A1"): 30.0, ("Calc sheet", "A2"): 33.5, ("Calc sheet", "A3"): 4.188,
    ("Calc sheet", "A4"): "flow 4.188", ("Calc sheet", "A5"): 67.688, ("Calc sheet", "A6"): -1.0,
    ("Calc sheet", "A7"): True, ("Results", "A1"): 676.88,
}


def test_rich_workbook_recalc_in_place_keeps_every_other_member(tmp_path):
    path = rich_book(str(tmp_path / "rich.xlsx"))
    before, raw_before = members(path), raw_records(path)
    rep = ev.recalc_workbook(path)
    assert rep.ok and rep.written and rep.computed == 10
    wb = openpyxl.load_workbook(path, data_only=True)
    for (sheet, ref), want in RICH_EXPECTED.items():
        got = wb[sheet][ref].value
        assert got == pytest.approx(want) if isinstance(want, float) else got == want, (sheet, ref, got)
    assert wb["Calc sheet"]["A8"].value == "#DIV/0!"
    assert wb["Calc sheet"]["A9"].value.startswith("fuelsys ")
    after, raw_after = members(path), raw_records(path)
    assert [m[0] for m in before] == [m[0] for m in after]  # same members, same order
    changed = set(rep.changed_parts)
    assert changed == {"xl/worksheets/sheet2.xml", "xl/worksheets/sheet3.xml"}
    for b, a in zip(before, after):
        assert b[1:3] == a[1:3], b[0]  # date_time and compress_type
        if b[0] not in changed:
            assert b == a, b[0]  # bytes, CRC, attributes
            assert raw_before[b[0]] == raw_after[b[0]], b[0]  # the stored record itself
    names = [m[0] for m in after]
    assert "xl/charts/chart1.xml" in names and "xl/media/image1.png" in names
    assert dict((m[0], m[5]) for m in after)["xl/media/image1.png"] == tiny_png()
    wb2 = openpyxl.load_workbook(path)
    assert len(wb2["Inputs"]._charts) == 1  # the chart still reads as a chart
    assert wb2["Inputs"]["B1"].comment.text == "fuel temperature in the tank"
    assert wb2["Inputs"].data_validations.dataValidation[0].formula1 == "-40"
    rules = [r for cf in wb2["Inputs"].conditional_formatting for r in cf.rules]
    assert len(rules) == 1 and rules[0].operator == "greaterThan" and rules[0].formula == ["10"]
    assert wb2.defined_names["Pressure"].attr_text == "Inputs!$B$2"
    assert ev.check_workbook(path).ok


def test_output_elsewhere_leaves_the_original_untouched(tmp_path):
    path = rich_book(str(tmp_path / "rich.xlsx"))
    original = _bytes(path)
    out = str(tmp_path / "out" / "copy.xlsx")
    os.makedirs(os.path.dirname(out))
    rep = ev.recalc_workbook(path, output=out)
    assert rep.written and rep.output == out
    assert _bytes(path) == original
    assert openpyxl.load_workbook(out, data_only=True)["Results"]["A1"].value == pytest.approx(676.88)


def test_second_recalc_changes_nothing(tmp_path):
    path = rich_book(str(tmp_path / "rich.xlsx"))
    ev.recalc_workbook(path)
    first = _bytes(path)
    rep = ev.recalc_workbook(path)
    assert rep.changed_parts == [] and _bytes(path) == first


# ---------------------------------------------------------------------------
# faults: the original survives

def test_write_failing_half_way_leaves_the_original(tmp_path, monkeypatch):
    path = rich_book(str(tmp_path / "rich.xlsx"))
    original = _bytes(path)
    calls = []

    def failing(fh, chunk):
        calls.append(len(chunk))
        fh.write(chunk[: len(chunk) // 2])
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(xlsx, "_CHUNK", 1024)
    monkeypatch.setattr(xlsx, "_write_chunk", failing)
    with pytest.raises(OSError):
        ev.recalc_workbook(path)
    assert calls and _bytes(path) == original
    assert os.listdir(tmp_path) == ["rich.xlsx"]  # the temporary file is gone


def test_failing_replace_leaves_the_original(tmp_path, monkeypatch):
    path = rich_book(str(tmp_path / "rich.xlsx"))
    original = _bytes(path)

    def boom(a, b):
        raise PermissionError("locked")

    monkeypatch.setattr(xlsx.os, "replace", boom)
    with pytest.raises(PermissionError):
        ev.recalc_workbook(path)
    assert _bytes(path) == original and os.listdir(tmp_path) == ["rich.xlsx"]


def test_file_changed_while_computing_is_not_overwritten(tmp_path, monkeypatch):
    path = rich_book(str(tmp_path / "rich.xlsx"))
    real = xlsx.rebuild_zip

    def touch_then_build(data, replace):
        with open(path, "ab") as fh:  # someone saves the book meanwhile
            fh.write(b"x")
        return real(data, replace)

    monkeypatch.setattr(xlsx, "rebuild_zip", touch_then_build)
    with pytest.raises(xlsx.WriteError, match="changed on disk"):
        ev.recalc_workbook(path)


def test_partial_book_is_not_written_without_allow_partial(tmp_path):
    path = raw_book(str(tmp_path / "p.xlsx"), [("S", rows_xml([
        c("A1", "1"), c("B1", f="A1*2"), c("C1", f="OFFSET(A1,0,0)"), c("D1", f="C1+1")]))])
    original = _bytes(path)
    rep = ev.recalc_workbook(path)
    assert not rep.written and _bytes(path) == original
    assert [s[0] for s in rep.skipped] == ["S!C1", "S!D1"]
    assert "OFFSET" in rep.skipped[0][1] and "S!C1" in rep.skipped[1][1]
    rep = ev.recalc_workbook(path, allow_partial=True)
    assert rep.written
    wb = openpyxl.load_workbook(path, data_only=True)
    assert wb["S"]["B1"].value == 2 and wb["S"]["C1"].value is None  # skipped cells keep what they had


# ---------------------------------------------------------------------------
# refusals

BILLION_LAUGHS = ('<?xml version="1.0"?>\n<!DOCTYPE lolz [<!ENTITY lol "lol">'
                  + "".join(f'<!ENTITY lol{i} "{("&lol%s;" % ("" if i == 1 else i - 1)) * 10}">' for i in range(1, 10))
                  + ']>\n')
EXTERNAL_ENTITY = '<?xml version="1.0"?>\n<!DOCTYPE x [<!ENTITY xxe SYSTEM "file:///etc/passwd">]>\n'


def test_billion_laughs_in_a_sheet_is_refused(tmp_path):
    path = raw_book(str(tmp_path / "bomb.xlsx"), [("S", '<row r="1"><c r="A1" t="str"><v>&lol9;</v></c></row>')])
    data = _member(path, "xl/worksheets/sheet1.xml").decode()
    bomb = BILLION_LAUGHS + data.split("\n", 1)[1]
    _replace_member(path, "xl/worksheets/sheet1.xml", bomb.encode())
    original = _bytes(path)
    with pytest.raises(xlsx.WorkbookRefused, match="document type declaration"):
        ev.recalc_workbook(path)
    assert _bytes(path) == original


def test_external_entity_in_any_part_is_refused(tmp_path):
    core = EXTERNAL_ENTITY + '<coreProperties xmlns="urn:x">&xxe;</coreProperties>'
    path = raw_book(str(tmp_path / "xxe.xlsx"), [("S", "")], extra={"docProps/core.xml": core})
    with pytest.raises(xlsx.WorkbookRefused, match="docProps/core.xml.*document type"):
        xlsx.read_book(path)


def test_dtd_after_a_long_comment_is_still_found(tmp_path):
    part = '<?xml version="1.0"?>\n<!--' + "x" * 200_000 + '-->' + EXTERNAL_ENTITY.split("\n", 1)[1] + "<a/>"
    path = raw_book(str(tmp_path / "c.xlsx"), [("S", "")], extra={"xl/charts/chart1.xml": part})
    with pytest.raises(xlsx.WorkbookRefused, match="chart1.xml"):
        xlsx.read_book(path)


def _replace_member(path, name, data):
    with zipfile.ZipFile(path) as zf:
        items = [(i, zf.read(i)) for i in zf.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for i, d in items:
            zf.writestr(i, data if i.filename == name else d)


@pytest.mark.parametrize("name, content, words", [
    ("picture.xlsx", tiny_png(), "not a zip package"),
    ("secret.xlsx", xlsx.OLE_MAGIC + b"\0" * 504, "OLE compound file"),
    ("text.xlsx", b"a,b\n1,2\n", "not a zip package"),
])
def test_other_formats_renamed_are_refused(tmp_path, name, content, words):
    path = tmp_path / name
    path.write_bytes(content)
    with pytest.raises(xlsx.WorkbookRefused, match=words):
        xlsx.read_book(str(path))


def test_opendocument_renamed_is_refused(tmp_path):
    path = str(tmp_path / "calc.xlsx")
    with zipfile.ZipFile(path, "w") as zf:
        zf.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        zf.writestr("content.xml", "<office:document-content xmlns:office='urn:oasis:names:tc:opendocument:xmlns:office:1.0'/>")
    with pytest.raises(xlsx.WorkbookRefused, match="OpenDocument"):
        xlsx.read_book(path)


def test_word_document_renamed_is_refused(tmp_path):
    path = str(tmp_path / "letter.xlsx")
    raw_book(path, [("S", "")])
    data = _member(path, "[Content_Types].xml").decode().replace(
        "spreadsheetml.sheet.main+xml", "wordprocessingml.document.main+xml")
    _replace_member(path, "[Content_Types].xml", data.encode())
    with pytest.raises(xlsx.WorkbookRefused, match="not a SpreadsheetML workbook"):
        xlsx.read_book(path)


def test_binary_workbook_content_is_refused(tmp_path):
    path = str(tmp_path / "b.xlsx")
    raw_book(path, [("S", "")])
    data = _member(path, "[Content_Types].xml").decode().replace(
        "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
        "application/vnd.ms-excel.sheet.binary.macroEnabled.main")
    _replace_member(path, "[Content_Types].xml", data.encode())
    with pytest.raises(xlsx.WorkbookRefused, match="xlsb"):
        xlsx.read_book(path)


@pytest.mark.parametrize("suffix", [".xls", ".xlsb", ".ods", ".csv", ".txt"])
def test_other_suffixes_are_refused_by_name(tmp_path, suffix):
    path = tmp_path / ("book" + suffix)
    path.write_bytes(b"PK\x03\x04")
    with pytest.raises(xlsx.WorkbookRefused, match="xlsx"):
        xlsx.read_book(str(path))


def test_zip_bomb_member_is_refused_by_its_ratio(tmp_path):
    path = raw_book(str(tmp_path / "z.xlsx"), [("S", "")], extra={"xl/media/zeros.bin": b"\0" * (4 << 20)})
    with pytest.raises(xlsx.WorkbookRefused, match="possible zip bomb"):
        xlsx.read_book(path)


def test_member_over_the_size_limit_is_refused(tmp_path, monkeypatch):
    path = raw_book(str(tmp_path / "big.xlsx"), [("S", rows_xml([c(f"A{i}", str(i)) for i in range(1, 200)]))])
    monkeypatch.setattr(xlsx, "MAX_MEMBER_BYTES", 2000)
    with pytest.raises(xlsx.WorkbookRefused, match="limit of 2000"):
        xlsx.read_book(path)


def test_duplicate_and_encrypted_members_are_refused(tmp_path):
    path = str(tmp_path / "dup.xlsx")
    raw_book(path, [("S", "")])
    with pytest.warns(UserWarning), zipfile.ZipFile(path, "a") as zf:
        zf.writestr("xl/workbook.xml", "<workbook/>")
    with pytest.raises(xlsx.WorkbookRefused, match="two zip members"):
        xlsx.read_book(path)
    path = raw_book(str(tmp_path / "enc.xlsx"), [("S", "")])
    data = bytearray(_bytes(path))
    entries = xlsx._layout(bytes(data))[0]
    e = entries[-1]
    cd_pos = bytes(data).find(e.cd)
    struct.pack_into("<H", data, e.offset + 6, e.flags | 1)  # APPNOTE 4.4.4 bit 0: encrypted
    struct.pack_into("<H", data, cd_pos + 8, e.flags | 1)
    with open(path, "wb") as fh:
        fh.write(bytes(data))
    with pytest.raises(xlsx.WorkbookRefused, match="encrypted"):
        xlsx.read_book(path)


def test_macros_are_copied_byte_for_byte_and_never_run(tmp_path):
    vba = b"\xd0\xcf\x11\xe0" + os.urandom(3000)  # stands for a VBA project (an OLE file)
    path = raw_book(str(tmp_path / "m.xlsm"), [("S", rows_xml([c("A1", "2"), c("B1", f="A1*21")]))],
                    macro=True, extra={"xl/vbaProject.bin": vba})
    raw_before = raw_records(path)
    rep = ev.recalc_workbook(path)
    assert rep.written and rep.computed == 1
    raw_after = raw_records(path)
    assert raw_after["xl/vbaProject.bin"] == raw_before["xl/vbaProject.bin"]
    assert _member(path, "xl/vbaProject.bin") == vba
    assert openpyxl.load_workbook(path, data_only=True)["S"]["B1"].value == 42


# ---------------------------------------------------------------------------
# the XML edit itself

def test_value_types_are_stored_as_spreadsheetml_says(tmp_path):
    cells = [c("A1", "0.1"), c("B1", f="A1*3"), c("B2", f='"a&b<c"&CHAR9'), c("B3", f="1=1"),
             c("B4", f="1/0"), c("B5", f="A1/3"), c("B6", f="1E+300*1E+300"), c("B7", f="-0.5*0")]
    path = raw_book(str(tmp_path / "v.xlsx"), [("S", rows_xml(cells))], names=[("CHAR9", None, '"x"')])
    ev.recalc_workbook(path)
    xml = _member(path, "xl/worksheets/sheet1.xml").decode()
    assert '<c r="B1"><f>A1*3</f><v>0.30000000000000004</v></c>' in xml  # full precision, reads back exactly
    assert '<c r="B2" t="str"><f>"a&amp;b&lt;c"&amp;CHAR9</f><v>a&amp;b&lt;cx</v></c>' in xml
    assert '<c r="B3" t="b"><f>1=1</f><v>1</v></c>' in xml
    assert '<c r="B4" t="e"><f>1/0</f><v>#DIV/0!</v></c>' in xml
    assert '<c r="B6" t="e"><f>1E+300*1E+300</f><v>#NUM!</v></c>' in xml  # no number form for infinity
    assert '<c r="B7"><f>-0.5*0</f><v>0</v></c>' in xml
    wb = openpyxl.load_workbook(path, data_only=True)
    assert wb["S"]["B5"].value == 0.1 / 3 and wb["S"]["B3"].value is True


def test_control_characters_and_escapes_round_trip():
    # ECMA-376 Part 1, 22.9.2.19 ST_Xstring: characters XML cannot hold are written _xHHHH_
    for s in ["tab\tand\nnew line", "bell\x07", "cr\r", "_x0041_ literal", "plain"]:
        text = xlsx.encode_ooxml_text(s)
        back = xlsx.decode_ooxml_text(text.replace("&amp;", "&").replace("&lt;", "<").replace("&gt;", ">"))
        assert back == s, s


def test_prefixed_namespace_and_implied_positions(tmp_path):
    sheet = (f'<?xml version="1.0" encoding="UTF-8"?><x:worksheet xmlns:x="{MAIN_NS}"><x:sheetData>'
             '<x:row><x:c><x:v>4</x:v></x:c><x:c><x:f>A1*2</x:f></x:c></x:row>'
             '<x:row><x:c r="B2" s="3"><x:f>B1+1</x:f><x:v>0</x:v></x:c></x:row>'
             '</x:sheetData></x:worksheet>')
    path = raw_book(str(tmp_path / "x.xlsx"), [("S", "")])
    _replace_member(path, "xl/worksheets/sheet1.xml", sheet.encode())
    assert ev.evaluate_workbook(path) == {("S", "B1"): 8.0, ("S", "B2"): 9.0}
    ev.recalc_workbook(path)
    xml = _member(path, "xl/worksheets/sheet1.xml").decode()
    assert "<x:c><x:f>A1*2</x:f><x:v>8</x:v></x:c>" in xml
    assert '<x:c r="B2" s="3"><x:f>B1+1</x:f><x:v>9</x:v></x:c>' in xml


def test_array_formula_spill_cells_are_written_and_added(tmp_path):
    # legacy array formula over B1:B3, B2 exists, B3 does not (ECMA-376 18.3.1.40 f, t="array")
    cells = [c("A1", "1"), c("A2", "2"), c("A3", "3"), c("B1", "0", f="A1:A3*10", fattrs=' t="array" ref="B1:B3"'),
             c("B2", "0")]
    path = raw_book(str(tmp_path / "a.xlsx"), [("S", rows_xml(cells))])
    ev.recalc_workbook(path)
    ws = openpyxl.load_workbook(path, data_only=True)["S"]
    assert [ws[f"B{i}"].value for i in (1, 2, 3)] == [10, 20, 30]
    assert ev.check_workbook(path).ok


def test_data_descriptors_and_member_order_are_kept(tmp_path):
    cells = [c("A1", "2"), c("B1", f="A1+1")]
    order = ["xl/worksheets/sheet1.xml", "[Content_Types].xml", "xl/workbook.xml", "_rels/.rels",
             "xl/_rels/workbook.xml.rels", "docProps/app.xml"]
    path = raw_book(str(tmp_path / "d.xlsx"), [("S", rows_xml(cells))], member_order=order,
                    extra={"docProps/app.xml": "<Properties/>"}, data_descriptors=True)
    infos = _infos(path)
    assert all(i.flag_bits & 0x08 for i in infos)  # APPNOTE 4.4.4 bit 3: sizes in a data descriptor
    before = raw_records(path)
    ev.recalc_workbook(path)
    after = raw_records(path)
    assert [i.filename for i in _infos(path)] == order
    for name in order[1:]:
        assert after[name] == before[name], name
    assert openpyxl.load_workbook(path, data_only=True)["S"]["B1"].value == 3


def test_stored_errors_and_texts_read_as_values(tmp_path):
    cells = [c("A1", "#DIV/0!", t="e"), c("A2", "FS error: bore_mm must be &gt; 0", t="str"),
             c("A3", "1", t="b"), c("A4", "0", t="s"),
             c("B1", f="IFERROR(A1,5)"), c("B2", f="ISNUMBER(A2)"), c("B3", f="A3+1"), c("B4", f='A4&"!"')]
    path = raw_book(str(tmp_path / "e.xlsx"), [("S", rows_xml(cells))],
                    extra={"xl/sharedStrings.xml": f'<sst xmlns="{MAIN_NS}"><si><r><t>ab</t></r><r><t>c</t></r></si></sst>'})
    data = _member(path, "xl/_rels/workbook.xml.rels").decode().replace(
        "</Relationships>", f'<Relationship Id="rIdS" Type="{REL_NS}/sharedStrings" Target="sharedStrings.xml"/>'
        "</Relationships>")
    _replace_member(path, "xl/_rels/workbook.xml.rels", data.encode())
    book = xlsx.read_book(path)
    assert book.sheets[0].cells[(1, 1)] == bi.DIV0 and book.sheets[0].cells[(4, 1)] == "abc"
    got = ev.evaluate_workbook(path)
    assert got[("S", "B1")] == 5.0 and got[("S", "B2")] is False
    assert got[("S", "B3")] == 2.0 and got[("S", "B4")] == "abc!"
