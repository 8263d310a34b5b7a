"""The starter workbook and the demo book: built, computed, edited, compared.

The expected values here are fuelsys's own library API called directly (the
book must agree with it), the physics' direction of change (a longer needle
passes less at the same pressure drop: Hagen-Poiseuille, White, Fluid
Mechanics 7th ed. §6.4), and the demo scenario's invented inputs.
"""

import io
import math
import re
import shutil
import zipfile

import openpyxl
import pytest

from fuelsys import demo
from fuelsys.fuels import get_fuel
from fuelsys.sheet import book as sheet_book
from fuelsys.sheet import starter
from fuelsys.sheet.evaluate import evaluate_workbook, recalc_workbook
from fuelsys.sheet.xlsx import read_book

#: result cells that show a verdict or a check text by design (documented in the book)
TEXT_RESULTS = ("verdict", "check", "chosen", "needles", "computed by")


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    path = tmp_path_factory.mktemp("starter") / "book.xlsx"
    starter.build(path)
    return path


def _values(path):
    wb = openpyxl.load_workbook(path, data_only=True)
    return wb


def test_every_formula_cell_has_a_value_and_no_error_text(built):
    formulas = openpyxl.load_workbook(built)
    values = _values(built)
    count = 0
    for ws in formulas.worksheets:
        wv = values[ws.title]
        for row in ws.iter_rows():
            for c in row:
                is_formula = isinstance(c.value, str) and c.value.startswith("=") or \
                    type(c.value).__name__ == "ArrayFormula"
                if not is_formula:
                    continue
                count += 1
                v = wv[c.coordinate].value
                assert v is not None, f"{ws.title}!{c.coordinate} has no cached value"
                if isinstance(v, str):
                    assert not v.startswith("FS error"), f"{ws.title}!{c.coordinate}: {v}"
                    assert not v.startswith("#"), f"{ws.title}!{c.coordinate}: {v}"
    assert count > 300


def test_key_results_equal_direct_library_calls(built):
    from fuelsys.flow.needle import needle_dp_fuel

    wb = _values(built)
    ws = wb["Needles"]
    bore_mm = next(ws[f"B{r}"].value for r in range(1, 40) if ws[f"A{r}"].value == "bore used")
    # full-power row of the per-point table: flow per needle and the cold-day drop
    rows = [r for r in range(1, 80) if ws[f"A{r}"].value == "full"]
    r = rows[0]
    flow_g_min, dp_bar = ws[f"B{r}"].value, ws[f"C{r}"].value
    fuel = get_fuel(demo.FUEL["name"]).with_oil(demo.FUEL["oil_pct"])
    direct = needle_dp_fuel(flow_g_min / 6e4, bore_mm / 1e3, demo.NEEDLES["length_mm"] / 1e3, fuel,
                            demo.FUEL["cold_c"] + 273.15)
    assert dp_bar == pytest.approx(direct / 1e5, rel=1e-9)
    # fuel density on the Fuel sheet against the fuel model
    wf = wb["Fuel"]
    dens_row = next(r for r in range(1, 40) if wf[f"A{r}"].value == "density")
    assert wf[f"B{dens_row}"].value == pytest.approx(fuel.density(demo.FUEL["cold_c"] + 273.15), rel=1e-12)


def _sheet_signature(path):
    """Formulas and constants of every sheet, without the build date (for the up-to-date check)."""
    from openpyxl.utils.cell import range_boundaries

    wb = openpyxl.load_workbook(path)
    sig = {}
    for ws in wb.worksheets:
        spilled = set()  # cells an array formula fills (their stored values are results)
        for row in ws.iter_rows():
            for c in row:
                if type(c.value).__name__ == "ArrayFormula":
                    c1, r1, c2, r2 = range_boundaries(c.value.ref)
                    spilled |= {(r, k) for r in range(r1, r2 + 1) for k in range(c1, c2 + 1)} - {(c.row, c.column)}
        for row in ws.iter_rows():
            for c in row:
                v = c.value
                if v is None or (c.row, c.column) in spilled:
                    continue
                if type(v).__name__ == "ArrayFormula":
                    v = ("array", v.ref, v.text)
                if ws.title == "Start here" and re.fullmatch(r"\d{4}-\d\d-\d\d", str(v)):
                    v = "<date>"
                sig[(ws.title, c.coordinate)] = v
    return sig, sorted(wb.defined_names)


def test_committed_starter_is_up_to_date(built):
    assert starter.STARTER_PATH.exists(), "run: python -m fuelsys.sheet.starter"
    assert _sheet_signature(starter.STARTER_PATH) == _sheet_signature(built), \
        "workbook/fuelsys-starter.xlsx is out of date: run python -m fuelsys.sheet.starter"


def test_committed_starter_carries_computed_values():
    wb = _values(starter.STARTER_PATH)
    assert str(wb["Start here"]["B1"].value or "") or True
    summary = wb["Summary"]
    numbers = [summary.cell(r, 2).value for r in range(1, summary.max_row + 1)]
    assert sum(isinstance(v, float) for v in numbers) >= 10
    start = wb["Start here"]
    texts = [start.cell(r, 2).value for r in range(1, start.max_row + 1)]
    assert any(isinstance(t, str) and t.startswith("fuelsys ") for t in texts)


def _edit_input(src, dst, sheet_name, cell, new_value):
    """Copy the book, changing one constant cell's value in the sheet XML (a user's edit)."""
    part = read_book(src).sheet(sheet_name).part
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info.filename)
            if info.filename == part:
                text = data.decode("utf-8")
                pat = re.compile(rf'(<c r="{cell}"[^>]*>)(.*?)(</c>)', re.S)
                m = pat.search(text)
                assert m, f"{cell} not found"
                start_tag = re.sub(r'\st="[^"]*"', "", m.group(1))
                if isinstance(new_value, str):
                    start_tag = start_tag[:-1] + ' t="inlineStr">'
                    body = f"<is><t>{new_value}</t></is>" if new_value else ""
                else:
                    body = f"<v>{new_value!r}</v>"
                text = text[:m.start()] + start_tag + body + m.group(3) + text[m.end():]
                data = text.encode("utf-8")
            zout.writestr(info, data)


def _find(ws, label):
    for r in range(1, ws.max_row + 1):
        if ws.cell(r, 1).value == label:
            return r
    raise KeyError(label)


def test_changed_needle_length_moves_the_dependent_results(tmp_path):
    built = tmp_path / "demo.xlsx"  # the committed demo book, as a builder would receive it
    shutil.copyfile(starter.EXAMPLE_PATH, built)
    edited = tmp_path / "edited.xlsx"
    ws0 = openpyxl.load_workbook(built)["Needles"]
    r_len = _find(ws0, "needle length")
    _edit_input(built, edited, "Needles", f"B{r_len}", 45.0)
    recalc_workbook(edited)
    recalc_workbook(built)  # same machine, same libraries: exact equality below means "untouched"
    before, after = _values(built), _values(edited)
    nb, na = before["Needles"], after["Needles"]
    r_full = _find(nb, "full")
    # longer needle: more pressure drop for the same flow, less flow at the same drop
    assert na[f"C{r_full}"].value > nb[f"C{r_full}"].value
    r_chart = next(r for r in range(1, nb.max_row + 1) if nb.cell(r, 1).value == 2.0 and
                   isinstance(nb.cell(r, 2).value, float))
    assert na[f"B{r_chart}"].value < nb[f"B{r_chart}"].value
    # the pump needs more pressure at full power; the engine's fuel demand is untouched
    pb, pa = before["Pump"], after["Pump"]
    r_pfull = max(r for r in range(1, pb.max_row + 1) if pb.cell(r, 1).value == "full")
    assert pa[f"F{r_pfull}"].value > pb[f"F{r_pfull}"].value
    eb, ea = before["Engine"], after["Engine"]
    for r in range(1, eb.max_row + 1):
        for c in range(1, 12):
            assert ea.cell(r, c).value == eb.cell(r, c).value
    assert after["Fuel"]["B8"].value == before["Fuel"]["B8"].value


def test_bad_inputs_show_fs_errors_and_the_rest_still_computes(built, tmp_path):
    wn = openpyxl.load_workbook(built)["Needles"]
    wf = openpyxl.load_workbook(built)["Fuel"]
    cases = (
        # text in a number cell
        ("Needles", f"B{_find(wn, 'needle length')}", "thirty", "Needles", "full", "C", "length_mm"),
        # an empty required input
        ("Fuel", f"B{_find(wf, 'fuel temperature, cold day')}", "", "Fuel", "density", "B", "temp_c is empty"),
        # a temperature above the fuel model's range (kerosene's liquid range ends near 283 °C)
        ("Fuel", f"B{_find(wf, 'fuel temperature, hot day')}", 400.0, "Fuel", "density", "C", "°C"),
    )
    for i, (sheet_in, cell, value, sheet, label, col, words) in enumerate(cases):
        path = tmp_path / f"bad{i}.xlsx"
        _edit_input(built, path, sheet_in, cell, value)
        report = recalc_workbook(path)
        assert report.ok
        wb = _values(path)
        ws = wb[sheet]
        v = ws[f"{col}{_find(ws, label)}"].value
        assert isinstance(v, str) and v.startswith("FS error:") and words in v, (path.name, v)
        # the rest computes: the engine's fuel demand is still a number
        eng = wb["Engine"]
        assert isinstance(eng[f"I{_find(eng, 'full')}"].value, float)
    # the hot-day error leaves the cold-day column alone
    assert isinstance(wb["Fuel"][f"B{_find(wb['Fuel'], 'density')}"].value, float)


def test_demo_command_writes_the_book_and_prints_its_values(tmp_path, capsys):
    from fuelsys.cli import main

    assert main(["demo", "--folder", str(tmp_path)]) == 0
    out = capsys.readouterr().out
    path = tmp_path / sheet_book.DEMO_NAME
    assert path.exists()
    rows = dict(sheet_book.read_summary(path))
    assert "SAFETY" in out and "fictional" in out
    # each number printed is the book's cached value
    for label, value in rows.items():
        if isinstance(value, float):
            line = next(ln for ln in out.splitlines() if ln.strip().startswith(label))
            printed = float(line.split()[-1])
            assert printed == pytest.approx(value, rel=5e-3, abs=1e-3), label
    wb = openpyxl.load_workbook(path)
    assert "demo book" in str(wb["Start here"]["A1"].value)


def test_diff_names_the_changed_input_and_the_results_it_moved(built, tmp_path, capsys):
    from fuelsys.cli import main

    edited = tmp_path / "club-copy.xlsx"
    ws0 = openpyxl.load_workbook(built)["Needles"]
    _edit_input(built, edited, "Needles", f"B{_find(ws0, 'needle length')}", 36.0)
    recalc_workbook(edited)
    diffs = sheet_book.diff_books(built, edited)
    inputs = [d for d in diffs if d.kind == "input"]
    assert len(inputs) == 1 and inputs[0].sheet == "Needles" and "needle length" in inputs[0].label
    results = [d for d in diffs if d.kind == "result"]
    assert any(d.sheet == "Pump" for d in results) and any(d.sheet == "Summary" for d in results)
    assert main(["diff", str(built), str(edited)]) == 1
    out = capsys.readouterr().out
    assert "needle length" in out and "30 -> 36" in out
    assert main(["diff", str(built), str(built)]) == 0


def test_new_book_copies_the_starter_and_never_overwrites(tmp_path, capsys):
    from fuelsys.cli import main

    target = tmp_path / "mine.xlsx"
    assert main(["new", str(target)]) == 0
    assert target.read_bytes() == starter.STARTER_PATH.read_bytes()
    assert main(["new", str(target)]) == 2
    assert "exists" in capsys.readouterr().err
    assert main(["new", str(tmp_path / "mine.txt")]) == 2


def test_excel_setup_says_it_is_untested_here(capsys):
    from fuelsys.cli import main

    assert main(["excel-setup"]) == 0
    out = capsys.readouterr().out
    assert "fuelsys.sheet.excel" in out and "Not tested" in out


def test_functions_sheet_lists_the_catalogue(built):
    from fuelsys.sheet import catalogue

    ws = openpyxl.load_workbook(built)["Functions"]
    names = [ws.cell(r, 1).value for r in range(1, ws.max_row + 1)]
    assert [n for n in names if isinstance(n, str) and n.startswith("FS_")] == list(catalogue.functions())


@pytest.mark.live
def test_pdf_render_of_the_first_pages_has_no_error_cells(tmp_path):
    """A real spreadsheet program renders the book (LibreOffice headless, without the fuelsys extension).

    Without the extension LibreOffice recomputes array formulas on load (they show #NAME?), so
    only the pages before the first array formula are checked: the start sheet, the summary,
    the engine and the fuel sheets.
    """
    soffice = shutil.which("soffice") or shutil.which("libreoffice")
    pdftotext = shutil.which("pdftotext")
    if not soffice or not pdftotext:
        pytest.skip("LibreOffice (soffice) and pdftotext (poppler-utils) are needed to render the book")
    import subprocess

    src = tmp_path / "book.xlsx"
    shutil.copyfile(starter.STARTER_PATH, src)
    profile = tmp_path / "profile"
    subprocess.run([soffice, f"-env:UserInstallation=file://{profile}", "--headless", "--convert-to", "pdf",
                    "--outdir", str(tmp_path), str(src)], check=True, timeout=180,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    pdf = tmp_path / "book.pdf"
    assert pdf.exists() and pdf.stat().st_size > 10_000
    text = subprocess.run([pdftotext, "-f", "1", "-l", "4", "-layout", str(pdf), "-"], check=True,
                          capture_output=True, text=True).stdout
    assert "fuelsys fuel-system workbook" in text and "Summary of the sizing" in text
    for bad in ("#NAME?", "#VALUE!", "#REF!", "#N/A", "Err:"):
        assert bad not in text, bad
    assert not re.search(r"FS error: \w", text)  # an error text (the start sheet only mentions the prefix)
    assert re.search(r"\d+\.\d+", text)


def test_combustor_sheet_closes_the_energy_balance(built):
    """Primary + secondary + dilution mixing returns the turbine inlet the fuel demand used (issue's 1 %)."""
    ws = _values(built)["Combustor"]
    head = _find(ws, "point")
    rows = range(head + 1, head + 1 + len(demo.ENGINE["points"]))
    for r in rows:
        exit_c, t4_c = ws[f"G{r}"].value, ws[f"H{r}"].value
        assert abs((exit_c + 273.15) / (t4_c + 273.15) - 1) < 0.01, (r, exit_c, t4_c)
    top = _find(ws, "zone")
    shares = [ws[f"G{r}"].value for r in range(top + 1, top + 1 + len(demo.COMBUSTOR["openings"]))]
    assert sum(shares) == pytest.approx(1.0, abs=1e-12)  # air fractions sum to 1
    # common practice, no source: about a fifth of the air burns in the primary zone
    assert 0.15 < ws[f"B{_find(ws, 'primary share (tubes + primary holes)')}"].value < 0.30


def test_own_fuel_table_replaces_the_built_in_fuel(built, tmp_path):
    """Pointing the defined name FuelName at the Fuel sheet's own-fuel table switches every result to it."""
    from fuelsys.sheet import call

    edited = tmp_path / "own-fuel.xlsx"
    with zipfile.ZipFile(built) as zin, zipfile.ZipFile(edited, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info.filename)
            if info.filename == "xl/workbook.xml":
                text, n = re.subn(r'(<definedName name="FuelName"[^>]*>)[^<]*(</definedName>)',
                                  r"\1'Fuel'!$F$2:$G$10\2", data.decode("utf-8"))
                assert n == 1
                data = text.encode("utf-8")
            zout.writestr(info, data)
    assert recalc_workbook(edited).ok
    wb = _values(edited)
    wf = wb["Fuel"]
    table = [[wf.cell(r, 6).value, wf.cell(r, 7).value] for r in range(2, 11)]
    r = _find(wf, "density")
    # the book's cell equals the same function called on the table (the builder's own data: 803 kg/m³ at 15 °C)
    assert wf[f"B{r}"].value == pytest.approx(call("FS_DENSITY", table, demo.FUEL["cold_c"], demo.FUEL["oil_pct"]),
                                              rel=1e-12)
    assert wf[f"B{r}"].value != _values(built)["Fuel"][f"B{r}"].value
    assert isinstance(wb["Summary"]["B3"].value, float)  # the whole chain still computes


def test_book_asks_to_show_its_stored_values_on_open():
    """openpyxl's default fullCalcOnLoad would make a program without the functions replace every value."""
    with zipfile.ZipFile(starter.STARTER_PATH) as z:
        xml = z.read("xl/workbook.xml").decode("utf-8")
    calc = re.search(r"<calcPr[^>]*>", xml).group(0)
    assert 'fullCalcOnLoad="1"' not in calc


def test_demo_never_overwrites_a_book_someone_edited(tmp_path):
    first = sheet_book.write_demo(tmp_path)
    again = sheet_book.write_demo(tmp_path)  # an unedited demo book is simply renewed
    assert again == first
    ws = openpyxl.load_workbook(first)["Needles"]
    edited = tmp_path / "edited.xlsx"
    _edit_input(first, edited, "Needles", f"B{_find(ws, 'needle length')}", 41.0)
    shutil.move(edited, first)
    mine = first.read_bytes()
    third = sheet_book.write_demo(tmp_path)
    assert third.name == "fuelsys-demo-1.xlsx"
    assert first.read_bytes() == mine  # the edited book is untouched
