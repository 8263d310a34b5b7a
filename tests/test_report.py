"""fuelsys report: the Summary's numbers and one picture per chart in a PDF; a stale book says so first.

Expected values are the book's own stored values (the report must print what
the book holds), read back from the PDF with pdftotext (poppler-utils).
"""

import re
import shutil
import subprocess
import zipfile

import pytest

from fuelsys.cli import main
from fuelsys.sheet import xlsx
from fuelsys.sheet.book import number_formats, display_text
from fuelsys.sheet.report import read_charts
from fuelsys.sheet.starter import EXAMPLE_PATH

PDFTOTEXT = shutil.which("pdftotext")
PDFIMAGES = shutil.which("pdfimages")
needs_poppler = pytest.mark.skipif(not (PDFTOTEXT and PDFIMAGES),
                                   reason="pdftotext and pdfimages (poppler-utils) read the PDF back")


def _text(pdf, first=None, last=None):
    cmd = [PDFTOTEXT, "-layout"] + (["-f", str(first), "-l", str(last)] if first else []) + [str(pdf), "-"]
    return subprocess.run(cmd, check=True, capture_output=True, text=True).stdout


def _bump_first_input(src, dst, sheet_name="Engine"):
    """Copy ``src`` to ``dst`` with the first numeric input of ``sheet_name`` increased by 10 %."""
    import re as _re

    from fuelsys.sheet import xlsx as _x

    book = _x.read_book(src)
    sheet = book.sheet(sheet_name)
    r, c = next(k for k, v in sorted(sheet.cells.items()) if isinstance(v, float) and k not in sheet.formulas)
    ref = f"{_x.col_letters(c)}{r}".encode()
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename == sheet.part:
                pat = _re.compile(rb'(<c r="' + ref + rb'"[^>]*><v>)([^<]+)(</v>)')
                data, n = pat.subn(lambda m: m.group(1) + repr(float(m.group(2)) * 1.1).encode() + m.group(3), data)
                assert n == 1
            zout.writestr(info, data)


@pytest.fixture(scope="module")
def demo_report(tmp_path_factory):
    folder = tmp_path_factory.mktemp("report")
    src = folder / "demo.xlsx"
    shutil.copyfile(EXAMPLE_PATH, src)
    out = folder / "demo-report.pdf"
    code = main(["report", str(src), "-o", str(out)])
    return src, out, code


@needs_poppler
def test_report_prints_the_summary_numbers_and_a_picture_per_chart(demo_report):
    src, pdf, code = demo_report
    assert code == 0 and pdf.exists()
    text = " ".join(_text(pdf).split())
    book = xlsx.read_book(src)
    summary = book.sheet("Summary")
    fmts = number_formats(book).get("Summary", {})
    numbers = 0
    for r in range(1, summary.max_row + 1):
        label, value = summary.cells.get((r, 1)), summary.cells.get((r, 2))
        if isinstance(label, str) and isinstance(value, float):
            shown = display_text(value, fmts.get((r, 2), "General"))
            assert f"{label.strip()}: {shown}" in text, label
            # the printed figure reads back as the stored value to the digits shown
            printed = float(shown.replace(",", "").rstrip("%"))
            decimals = len(shown.split(".")[1]) if "." in shown else 0
            assert abs(printed - value) <= 0.5 * 10 ** -decimals + 1e-12 or "E" in shown
            numbers += 1
    assert numbers >= 5
    charts = read_charts(book)
    images = subprocess.run([PDFIMAGES, "-list", str(pdf)], check=True, capture_output=True, text=True).stdout
    n_images = sum(1 for line in images.splitlines()[2:] if line.split()[2:3] == ["image"])
    assert len(charts) >= 1 and n_images >= len(charts)
    for chart in charts:
        assert chart.title in text
    assert "SAFETY" in text and "inputs digest" in text and "stored values are current" in text


@needs_poppler
def test_report_on_a_stale_book_warns_on_its_first_page(tmp_path, capsys):
    src = tmp_path / "stale.xlsx"
    _bump_first_input(EXAMPLE_PATH, src)  # an input changed, the book not computed again
    out = tmp_path / "stale.pdf"
    assert main(["report", str(src), "-o", str(out)]) == 1
    assert "stale" in capsys.readouterr().out
    first = " ".join(_text(out, 1, 1).split())
    assert "THE STORED VALUES OF THIS BOOK ARE STALE" in first and "fuelsys recalc stale.xlsx" in first


def test_charts_are_found_with_their_series(tmp_path):
    book = xlsx.read_book(EXAMPLE_PATH)
    charts = read_charts(book)
    assert charts and all(c.series and c.title for c in charts)
    for c in charts:
        for s in c.series:
            xs, ys = s.values(book)
            assert len(xs) == len(ys) and any(isinstance(y, float) for y in ys)
    assert re.match(r"xl/charts/chart\d+\.xml", charts[0].part)
