"""The eval, recalc and check commands, run through ``fuelsys.cli.main``.

Expected values are arithmetic on the inputs of books built here (rules as in
tests/test_evaluate.py) or the catalogue's own cell call (fuelsys.sheet.call),
which is the reference the engine must agree with.
"""

import json
import os
import sys
import types
import zipfile

import openpyxl
import pytest

from fuelsys.cli import main
from fuelsys.sheet import call
from fuelsys.sheet import evaluate as ev


@pytest.fixture(autouse=True)
def strict(monkeypatch):
    monkeypatch.setattr(ev, "STRICT", True)


def small_book(path):
    wb = openpyxl.Workbook()
    s = wb.active
    s.title = "S"
    s["A1"] = 15.0
    s["B1"] = "=A1*2"  # 30
    s["B2"] = '="T="&B1'  # "T=30"
    s["B3"] = "=ROUND(B1/7,4)"  # 4.2857
    wb.save(path)
    return path


def _rewrite_member(path, name, fn):
    with zipfile.ZipFile(path) as zf:
        items = [(i, zf.read(i)) for i in zf.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for i, d in items:
            zf.writestr(i, fn(d) if i.filename == name else d)


def _read(path):
    with open(path, "rb") as fh:
        return fh.read()


# ---------------------------------------------------------------------------
# eval

def test_eval_prints_a_value(capsys):
    assert main(["eval", "ROUND(2.5,0)*2"]) == 0  # "ROUND function": halves away from zero
    assert capsys.readouterr().out.strip() == "6"
    assert main(["eval", "=FS_VERSION()"]) == 0
    assert capsys.readouterr().out.strip() == call("FS_VERSION")


def test_eval_catalogue_formula_from_the_issue(capsys):
    from fuelsys.sheet import catalogue

    if "FS_DENSITY" not in catalogue.functions():
        pytest.skip("FS_DENSITY is not declared yet")
    assert main(["eval", "--json", 'FS_DENSITY("kerosene", 15)*2']) == 0
    assert json.loads(capsys.readouterr().out) == {"value": call("FS_DENSITY", "kerosene", 15.0) * 2}


def test_eval_table_prints_aligned_rows_and_json(capsys):
    assert main(["eval", '{1,"ab";22.5,TRUE}']) == 0
    assert capsys.readouterr().out.splitlines() == ["   1  ab", "22.5  TRUE"]
    assert main(["eval", "--json", '{1,"ab";22.5,TRUE}']) == 0
    assert json.loads(capsys.readouterr().out) == {"value": [[1.0, "ab"], [22.5, True]]}


def test_eval_errors_and_refusals(capsys):
    assert main(["eval", "1/0"]) == 1
    assert capsys.readouterr().out.strip() == "#DIV/0!"
    assert main(["eval", "--json", "1/0"]) == 1
    assert json.loads(capsys.readouterr().out) == {"error": "#DIV/0!"}
    assert main(["eval", 'FS_HELP("no_such")']) == 1  # an FS error text is printed, and fails
    assert capsys.readouterr().out.startswith("FS error: ")
    assert main(["eval", "OFFSET(A1,1,1)"]) == 2
    assert "OFFSET" in capsys.readouterr().err


def test_eval_with_a_book(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    assert main(["eval", "--book", path, "B1+B3"]) == 0
    assert capsys.readouterr().out.strip() == "34.2857"


# ---------------------------------------------------------------------------
# recalc

def test_recalc_writes_values_and_prints_one_line(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    assert main(["recalc", path]) == 0
    out = capsys.readouterr()
    lines = out.out.strip().splitlines()
    assert len(lines) == 1 and "3 cells computed, 0 skipped" in lines[0] and " s;" in lines[0]
    assert out.err == ""  # no progress bar when stderr is not a terminal
    ws = openpyxl.load_workbook(path, data_only=True)["S"]
    assert (ws["B1"].value, ws["B2"].value, ws["B3"].value) == (30, "T=30", 4.2857)


def test_recalc_progress_bar_on_request(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    assert main(["recalc", path, "--progress", "-o", str(tmp_path / "o.xlsx")]) == 0
    err = capsys.readouterr().err
    assert "computing [" in err and "100%" in err


def test_recalc_refuses_partial_books_unless_allowed(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    wb = openpyxl.load_workbook(path)
    wb["S"]["C1"] = "=NOW()"
    wb.save(path)
    before = _read(path)
    assert main(["recalc", path]) == 1
    out = capsys.readouterr()
    assert "S!C1: volatile function NOW" in out.err and "nothing written" in out.out
    assert _read(path) == before
    assert main(["recalc", path, "--allow-partial"]) == 0
    assert openpyxl.load_workbook(path, data_only=True)["S"]["B1"].value == 30


def test_recalc_refused_file(tmp_path, capsys):
    path = tmp_path / "fake.xlsx"
    path.write_bytes(b"%PDF-1.7 not a workbook")
    assert main(["recalc", str(path)]) == 2
    assert "refused" in capsys.readouterr().err and path.read_bytes().startswith(b"%PDF")


def test_libreoffice_engine_missing_is_a_clear_message(tmp_path, capsys, monkeypatch):
    path = small_book(str(tmp_path / "b.xlsx"))
    monkeypatch.setitem(sys.modules, "fuelsys.sheet.calc_addin.runner", None)  # import fails
    assert main(["recalc", path, "--engine", "libreoffice", "-o", str(tmp_path / "o.xlsx")]) == 2
    assert "LibreOffice engine is not available" in capsys.readouterr().err


def test_libreoffice_engine_never_overwrites_the_book(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    before = _read(path)
    assert main(["recalc", path, "--engine", "libreoffice"]) == 2
    assert "--output" in capsys.readouterr().err
    assert _read(path) == before


def test_libreoffice_engine_is_called_and_replaces_atomically(tmp_path, capsys, monkeypatch):
    path = small_book(str(tmp_path / "b.xlsx"))
    calls = []

    def recalc_book(src, dst):
        calls.append((src, dst))
        with open(src, "rb") as a, open(dst, "wb") as b:
            b.write(a.read())

    fake = types.ModuleType("fuelsys.sheet.calc_addin.runner")
    fake.recalc_book = recalc_book
    monkeypatch.setitem(sys.modules, "fuelsys.sheet.calc_addin.runner", fake)
    out = str(tmp_path / "lo.xlsx")
    assert main(["recalc", path, "--engine", "libreoffice", "-o", out]) == 0
    assert calls and calls[0][0] == path and os.path.dirname(calls[0][1]) == str(tmp_path)
    assert _read(out) == _read(path) and sorted(os.listdir(tmp_path)) == ["b.xlsx", "lo.xlsx"]


# ---------------------------------------------------------------------------
# check

def test_check_passes_on_a_fresh_book_and_names_an_altered_cell(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    assert main(["check", path]) == 1  # openpyxl stores no values at all: every cell differs
    assert "S!B1: stored (nothing stored), computed 30" in capsys.readouterr().out
    assert main(["recalc", path]) == 0
    capsys.readouterr()
    assert main(["check", path]) == 0
    assert "3 cells checked, 0 differ" in capsys.readouterr().out
    _rewrite_member(path, "xl/worksheets/sheet1.xml", lambda d: d.replace(b"<v>30</v>", b"<v>30.5</v>"))
    assert main(["check", path]) == 1
    out = capsys.readouterr().out
    assert "S!B1: stored 30.5, computed 30" in out and "1 differ" in out


def test_check_tolerance_and_texts(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    main(["recalc", path])
    # a change in the 12th digit is inside the default relative tolerance of 1e-9
    _rewrite_member(path, "xl/worksheets/sheet1.xml", lambda d: d.replace(b"<v>30</v>", b"<v>30.00000000003</v>"))
    capsys.readouterr()
    assert main(["check", path]) == 0
    assert main(["check", path, "--tolerance", "1e-14"]) == 1
    _rewrite_member(path, "xl/worksheets/sheet1.xml", lambda d: d.replace(b"T=30", b"t=30"))
    capsys.readouterr()
    assert main(["check", path]) == 1  # texts compare exactly
    assert 'S!B2: stored "t=30", computed "T=30"' in capsys.readouterr().out


def test_check_finds_a_stale_book_after_an_input_edit(tmp_path, capsys):
    path = small_book(str(tmp_path / "b.xlsx"))
    main(["recalc", path])
    _rewrite_member(path, "xl/worksheets/sheet1.xml", lambda d: d.replace(b"<v>15</v>", b"<v>16</v>"))
    capsys.readouterr()
    assert main(["check", path]) == 1
    out = capsys.readouterr().out
    assert "S!B1: stored 30, computed 32" in out and "S!B3" in out and "S!A1" not in out


# ---------------------------------------------------------------------------
# FS errors make recalc and check fail unless --allow-errors; eval hints at quotes

def error_book(path):
    wb = openpyxl.Workbook()
    s = wb.active
    s.title = "S"
    s["A1"] = -0.3
    s["B1"] = '=FS_NEEDLE_OD(A1)'  # a gauge must be a whole number > 0: an FS error text
    s["B2"] = "=A1*2"
    s["B3"] = "=1/0"
    s["B4"] = "=NA()"  # #N/A leaves a gap in a chart; not counted as a failure
    wb.save(path)
    return path


def test_recalc_and_check_fail_on_fs_errors_unless_allowed(tmp_path, capsys):
    path = error_book(str(tmp_path / "e.xlsx"))
    assert main(["recalc", path]) == 1
    out = capsys.readouterr().out
    assert "2 formula cell(s) hold an FS error or an error value" in out
    assert "S!B1: FS error:" in out and "S!B3: #DIV/0!" in out and "S!B4" not in out
    assert "--allow-errors" in out
    # the values were stored all the same (a recalc that reports errors still computes the book)
    assert openpyxl.load_workbook(path, data_only=True)["S"]["B2"].value == -0.6
    assert main(["recalc", path, "--allow-errors"]) == 0
    assert "allowed by --allow-errors" in capsys.readouterr().out
    assert main(["check", path]) == 1
    out = capsys.readouterr().out
    assert "0 differ" in out and "S!B1: FS error:" in out and "inputs digest " in out
    assert main(["check", path, "--allow-errors"]) == 0


def test_error_listing_names_the_first_few_and_counts_the_rest(tmp_path, capsys):
    from fuelsys.sheet.commands import ERROR_LIST

    wb = openpyxl.Workbook()
    s = wb.active
    s.title = "S"
    for r in range(1, 10):
        s.cell(r, 1, f"=FS_NEEDLE_OD({-r})")
    path = str(tmp_path / "many.xlsx")
    wb.save(path)
    assert main(["recalc", path]) == 1
    out = capsys.readouterr().out
    assert "9 formula cell(s)" in out and f"... and {9 - ERROR_LIST} more" in out
    assert sum(1 for line in out.splitlines() if line.startswith("  S!A")) == ERROR_LIST


def test_inputs_digest_follows_inputs_and_formulas_not_results(tmp_path):
    from fuelsys.sheet import xlsx
    from fuelsys.sheet.book import inputs_digest

    path = small_book(str(tmp_path / "b.xlsx"))
    d0 = inputs_digest(xlsx.read_book(path))
    main(["recalc", path])
    assert inputs_digest(xlsx.read_book(path)) == d0  # stored results do not enter it
    _rewrite_member(path, "xl/worksheets/sheet1.xml", lambda d: d.replace(b"<v>15</v>", b"<v>16</v>"))
    d1 = inputs_digest(xlsx.read_book(path))
    _rewrite_member(path, "xl/worksheets/sheet1.xml", lambda d: d.replace(b"A1*2", b"A1*3"))
    d2 = inputs_digest(xlsx.read_book(path))
    assert len({d0, d1, d2}) == 3 and len(d0) == 16


def test_eval_suggests_quotes_for_bare_fuel_names(capsys):
    assert main(["eval", "FS_DENSITY(kerosene,15)"]) == 1
    out = capsys.readouterr()
    assert out.out.strip() == "#NAME?"
    assert "kerosene is a text" in out.err and """fuelsys eval 'FS_DENSITY("kerosene",15)'""" in out.err
    assert main(["eval", "FS_CANISTER_PRESSURE(lpg-70-30, 15)"]) == 1
    assert """FS_CANISTER_PRESSURE("lpg-70-30", 15)""" in capsys.readouterr().err
    # a bare name that is no fuel gets the general hint; a quoted name is left alone
    assert main(["eval", "FS_DENSITY(nosuchthing,15)"]) == 1
    err = capsys.readouterr().err
    assert "not a function, a cell or a defined name" in err and "nosuchthing is a text" not in err
    assert main(["eval", 'FS_DENSITY("kerosene",15)']) == 0
    assert capsys.readouterr().err == ""


def test_text_hints_keep_quoted_texts_and_function_names():
    from fuelsys.sheet.commands import text_hints

    found, fixed = text_hints('FS_DENSITY(Kerosene, 15)&" kerosene"&FS_VERSION()')
    assert found == ["Kerosene"] and fixed == 'FS_DENSITY("Kerosene", 15)&" kerosene"&FS_VERSION()'
    assert text_hints("FS_DENSITY(A1, 15)") == ([], "FS_DENSITY(A1, 15)")
