"""fuelsys share: a copy whose FS_ cells hold their values, everything else untouched.

The expected values are the original book's own stored values (the copy must
show what the builder's book shows); no outside source is involved.
"""

import io
import os
import re
import shutil
import subprocess
import zipfile

import openpyxl
import pytest
from openpyxl.worksheet.formula import ArrayFormula

from fuelsys.cli import main
from fuelsys.sheet import share, xlsx
from fuelsys.sheet.book import inputs_digest
from fuelsys.sheet.evaluate import recalc_workbook
from fuelsys.sheet.starter import EXAMPLE_PATH


def small_book(path):
    wb = openpyxl.Workbook()
    s = wb.active
    s.title = "S"
    s["A1"], s["B1"], s["C1"] = "temperature", 15.0, "°C"
    s["A2"], s["B2"] = "density", '=FS_DENSITY("kerosene",B1)'
    s["A3"], s["B3"] = "doubled", "=B2*2"  # the spreadsheet's own: kept
    s["A4"], s["B4"] = "via a name", "=Dens+1"  # a name of a cell: the spreadsheet's own, kept
    s["A6"], s["B6"] = "zone", "share"
    s["B7"] = ArrayFormula("B7:B8", "=FS_ZONE_AIR({6;12},{6;4})")
    s["C7"] = "=SUM(B7:B8)"  # kept: reads the values
    wb.defined_names["Dens"] = openpyxl.workbook.defined_name.DefinedName("Dens", attr_text="S!$B$2")
    wb.defined_names["DensCall"] = openpyxl.workbook.defined_name.DefinedName(
        "DensCall", attr_text='FS_DENSITY("kerosene",S!$B$1)')
    s["B5"] = "=DensCall*1"
    s2 = wb.create_sheet("T")
    s2["A1"] = "=S!B2+1"
    s2.print_area = "A1:B2"  # a sheet-level name: its localSheetId must follow the new first sheet
    wb.save(path)
    recalc_workbook(path)
    return path


def _members(path):
    with zipfile.ZipFile(path) as zf:
        return {i.filename: zf.read(i) for i in zf.infolist()}


def test_share_turns_fs_cells_into_values_and_keeps_the_rest(tmp_path, capsys):
    src = small_book(str(tmp_path / "b.xlsx"))
    before = open(src, "rb").read()
    out = str(tmp_path / "copy.xlsx")
    assert main(["share", src, "-o", out]) == 0
    printed = capsys.readouterr().out
    assert open(src, "rb").read() == before  # the book itself is only read
    orig, copy = xlsx.read_book(src), xlsx.read_book(out)
    assert [s.name for s in copy.sheets] == [share.ABOUT_SHEET, "S", "T"]
    s0, s1 = orig.sheet("S"), copy.sheet("S")
    assert s1.formulas[(4, 2)].text == "Dens+1"
    for ref in ((2, 2), (5, 2), (7, 2), (8, 2)):  # FS_ directly, through a name that calls it, an array
        assert ref not in s1.formulas and s1.cells[ref] == s0.cells[ref], ref
    assert s1.formulas[(3, 2)].text == "B2*2" and s1.cells[(3, 2)] == s0.cells[(3, 2)]
    assert s1.formulas[(7, 3)].text == "SUM(B7:B8)"
    assert copy.sheet("T").formulas[(1, 1)].text == "S!B2+1"
    # the sheet-level print area moved with its sheet (now the third)
    area = [dn for dn in copy.names if dn.name == "_xlnm.Print_Area"]
    assert [copy.sheets[dn.scope].name for dn in area] == ["T"]
    assert [orig.sheets[dn.scope].name for dn in orig.names if dn.name == "_xlnm.Print_Area"] == ["T"]
    about = copy.sheet(share.ABOUT_SHEET)
    texts = [v for v in about.cells.values() if isinstance(v, str)]
    assert inputs_digest(orig) in texts and any("fuelsys check b.xlsx" in t for t in texts)
    assert "{=FS_ZONE_AIR({6;12},{6;4})}" in texts and "=FS_DENSITY(\"kerosene\",B1)" in texts
    assert any(t.startswith("SAFETY") for t in texts)
    # every member not meant to change is byte for byte the same
    a, b = _members(src), _members(out)
    changed = {k for k in a if a[k] != b.get(k)}
    assert changed <= {"xl/workbook.xml", "xl/_rels/workbook.xml.rels", "[Content_Types].xml",
                       "xl/worksheets/sheet1.xml", "xl/worksheets/sheet2.xml"}
    assert set(b) - set(a) == {"xl/worksheets/sheet3.xml"}
    assert "inputs digest" in printed
    # the copy opens in openpyxl too, with values where the FS_ formulas were
    ws = openpyxl.load_workbook(out)["S"]
    assert isinstance(ws["B2"].value, (int, float)) and ws["B3"].value == "=B2*2"


def test_share_refuses_a_stale_book_and_an_existing_copy(tmp_path, capsys):
    src = small_book(str(tmp_path / "b.xlsx"))
    data = _members(src)
    with zipfile.ZipFile(src, "w", zipfile.ZIP_DEFLATED) as zf:
        for k, v in data.items():
            zf.writestr(k, v.replace(b"<v>15</v>", b"<v>25</v>") if k == "xl/worksheets/sheet1.xml" else v)
    out = tmp_path / "copy.xlsx"
    assert main(["share", src, "-o", str(out)]) == 1
    err = capsys.readouterr().err
    assert "stale" in err and "fuelsys recalc b.xlsx" in err and not out.exists()
    recalc_workbook(src)
    assert main(["share", src, "-o", str(out)]) == 0
    assert main(["share", src, "-o", str(out)]) == 2
    assert "exists already" in capsys.readouterr().err
    assert main(["share", src, "-o", src]) == 2  # never over the book itself
    assert main(["share", src, "-o", str(out), "--force"]) == 0


def test_demo_copy_keeps_every_chart_on_cells_that_hold_numbers(tmp_path):
    from fuelsys.sheet.report import read_charts

    src = tmp_path / "demo.xlsx"
    shutil.copyfile(EXAMPLE_PATH, src)
    rep = share.share_book(src, tmp_path / "demo-shared.xlsx")
    copy = xlsx.read_book(rep.output)
    assert not rep.errors
    charts = read_charts(copy)
    assert len(charts) == len(read_charts(xlsx.read_book(src))) > 0
    for chart in charts:
        for ser in chart.series:
            xs, ys = ser.values(copy)
            assert ys and all(isinstance(v, float) for v in ys), (chart.title, ser.name)
    # no cell of the copy calls an FS_ function, and the original's FS cells all hold values
    assert not any("FS_" in (f.text or "").upper() for s in copy.sheets for f in s.formulas.values())


@pytest.mark.live
def test_live_copy_renders_without_the_extension_and_the_original_checks_clean(tmp_path):
    """The demo book built and computed here, shared, then printed by a LibreOffice with a fresh profile
    (so without the fuelsys extension): no error text anywhere."""
    soffice = shutil.which("soffice") or shutil.which("libreoffice")
    pdftotext = shutil.which("pdftotext")
    if not soffice or not pdftotext:
        if os.environ.get("CI"):
            pytest.fail("LibreOffice and pdftotext are needed under CI")
        pytest.skip("LibreOffice (soffice) and pdftotext (poppler-utils) are needed to render the copy")
    from fuelsys.sheet import book

    path = book.write_demo(tmp_path)
    out = tmp_path / "copy.xlsx"
    assert main(["share", str(path), "-o", str(out)]) == 0
    profile = tmp_path / "profile"
    subprocess.run([soffice, f"-env:UserInstallation=file://{profile}", "--headless", "--convert-to", "pdf",
                    "--outdir", str(tmp_path), str(out)], check=True, timeout=300,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    pdf = tmp_path / "copy.pdf"
    text = subprocess.run([pdftotext, "-layout", str(pdf), "-"], check=True, capture_output=True, text=True).stdout
    assert share.ABOUT_SHEET.split()[0] in text or "Shared copy" in text
    for bad in ("#NAME?", "Err:", "#VALUE!", "#REF!", "#DIV/0!"):
        assert bad not in text, bad
    assert "Summary of the sizing" in text and re.search(r"\d+\.\d+", text)
    assert main(["check", str(path)]) == 0
