"""The extension in a real LibreOffice Calc, headless (skipped with the reason where LibreOffice is absent).

Under CI (the environment variable CI set) a missing LibreOffice is a
failure, not a skip.  One module-scoped fixture runs every LibreOffice
session of the module: ``fuelsys libreoffice install --profile DIR`` builds
the extension from the catalogue and installs it into a fresh profile; a
session on that profile loads a test book made here, recalculates it with
calculateAll(), reads every formula cell back and stores it as .xlsx; and
:func:`~fuelsys.sheet.calc_addin.runner.recalc_book` computes and stores the
starter workbook.

Expected values are those of fuelsys itself: :func:`fuelsys.sheet.adapt.call`
(the cell-level call every face shares) and the built-in headless engine
(:func:`fuelsys.sheet.evaluate.evaluate_workbook`).  The property under test
is that LibreOffice computes exactly what they compute (numbers within a
relative 1e-9, texts equal), so no outside source is involved.
"""

import math
import os
import re
from pathlib import Path

import openpyxl
import pytest
from openpyxl.worksheet.formula import ArrayFormula

from fuelsys.sheet import adapt, evaluate
from fuelsys.sheet.calc_addin import generate, runner

pytestmark = [pytest.mark.live, pytest.mark.slow]

ROOT = Path(__file__).resolve().parent.parent
STARTER = ROOT / "workbook" / "fuelsys-starter.xlsx"
REASON = runner.unavailable_reason()
REL = 1e-9

#: inputs of the array formula: a number, another, an empty cell, a text, a temperature below absolute zero
TEMPS = [15.0, 40.0, None, "hot", -300.0]


def _test_book(path: Path) -> Path:
    """A small book of FS_ formulas: plain calls, an array formula, omitted and bad arguments."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "fs"
    for i, t in enumerate(TEMPS, start=1):
        ws.cell(i, 4, t)  # D1:D5
    ws["A1"] = "=FS_VERSION()"
    ws["A2"] = "=FS_HELP()"
    ws["A3"] = '=FS_HELP("FS_DENSITY")'
    ws["A4"] = '=FS_HELP("FS_NO_SUCH")'
    ws["E1"] = ArrayFormula("E1:E5", '=FS_DENSITY("kerosene",D1:D5)')
    ws["F1"] = '=FS_DENSITY("kerosene",15)'          # oil_pct omitted
    ws["F2"] = '=FS_DENSITY("kerosene",15,5)'
    ws["F3"] = '=FS_DENSITY("kerosene")'             # a required argument missing
    ws["F4"] = '=FS_DENSITY("kerosene","hot")'       # a text where a number belongs
    ws["F5"] = '=FS_DENSITY("kerosene",15,50)'       # outside the declared range
    ws["F6"] = '=FS_DENSITY("kerosene",15)+1'
    ws["F7"] = '=ISNUMBER(F4)'
    ws["F8"] = '=IFERROR(F4+1,"guarded")'
    ws["F9"] = '=FS_VISCOSITY("kerosene",D1,D2/10)'
    ws["F10"] = '=FS_DENSITY("propane",D1)'
    ws["G1"] = ArrayFormula("G1:H3", '=FS_FUEL_INFO("kerosene")')
    ws["I1"] = ArrayFormula("I1:J2", '=FS_DENSITY("kerosene",D1:D2)')  # a column broadcast over 2 columns
    lo = wb.create_sheet("lo_rules")  # LibreOffice's own rules, not compared with the built-in engine
    lo["A1"] = "=FS_HELP(B1)"  # B1 stays empty
    lo["A2"] = "=1/0"  # an error value, for the range-level counts
    lo["A3"] = '=NA()'
    lo["A4"] = '=FS_DENSITY("kerosene",-300)'  # an FS error text
    wb.save(path)
    return path


def _cli(*argv) -> int:
    """Run a ``fuelsys libreoffice ...`` command through its own parser."""
    import argparse

    from fuelsys.sheet.calc_addin import commands

    parser = argparse.ArgumentParser(prog="fuelsys")
    commands.add_commands(parser.add_subparsers(dest="command"))
    args = parser.parse_args(list(argv))
    return args.func(args)


@pytest.fixture(scope="module")
def calc(tmp_path_factory):
    """Three sessions, all here: install by the command, compute the test book, recalc the starter."""
    if REASON and os.environ.get("CI"):
        pytest.fail(f"CI must run the LibreOffice tests (.ci/install-libreoffice installs it): {REASON}")
    if REASON:
        pytest.skip(f"LibreOffice not usable here: {REASON}")
    tmp = tmp_path_factory.mktemp("calc")
    log = tmp / "addin.log"
    os.environ["FUELSYS_ADDIN_LOG"] = str(log)  # read by soffice, started below with this environment
    try:
        profile = tmp / "profile"
        # 1. `fuelsys libreoffice install --profile DIR` into a fresh profile
        assert _cli("libreoffice", "install", "--profile", str(profile)) == 0
        # 2. the test book in that profile: load, calculateAll(), read every formula cell, store as .xlsx
        src = _test_book(tmp / "test.xlsx")
        answer = runner.run_session([], [{"src": str(src), "dst": str(tmp / "test-lo.xlsx"), "read": True,
                                          "count": True}],
                                    profile=profile)
        # 3. the starter workbook through recalc_book (what `fuelsys recalc --engine libreoffice` runs)
        starter = None
        if STARTER.exists():
            summary = runner.recalc_book(STARTER, tmp / "starter-lo.xlsx")
            starter = {"src": STARTER, "dst": tmp / "starter-lo.xlsx", "summary": summary}
    finally:
        os.environ.pop("FUELSYS_ADDIN_LOG", None)
    res = answer["books"][0]
    cells = {(c["sheet"], evaluate.cell_name(c["row"] + 1, c["col"] + 1)): c for c in res["cells"]}
    return {"answer": answer, "log": log, "profile": profile, "starter": starter,
            "test": {"src": src, "dst": Path(res["dst"]), "cells": cells}}


def _value(cell):
    """A LibreOffice cell's value: float, str, or the error code text."""
    return cell["value"]


def _same(lo_cell, want) -> bool:
    got = lo_cell["value"]
    if lo_cell["type"] == "error":
        return isinstance(want, evaluate.XlError) and str(want) == got
    if lo_cell["type"] == "text":
        return isinstance(want, str) and want == got
    if isinstance(want, bool):  # Calc has no boolean cells: TRUE is 1
        return got == float(want)
    if not isinstance(want, float) or not math.isfinite(got):
        return False
    return got == want or abs(got - want) <= REL * max(abs(got), abs(want))


def _compare_with_engine(book, skip_sheets=()):
    want = evaluate.evaluate_workbook(book["src"])
    got = {k: v for k, v in book["cells"].items() if k[0] not in skip_sheets}
    assert set(got) == {k for k in want if k[0] not in skip_sheets}, "LibreOffice and the engine see other cells"
    bad = [(k, got[k]["type"], got[k]["value"], want[k]) for k in sorted(got) if not _same(got[k], want[k])]
    assert not bad, f"{len(bad)} of {len(got)} cells differ, e.g. {bad[:5]}"
    return len(got)


def test_every_formula_of_the_test_book_matches_the_engine(calc):
    n = _compare_with_engine(calc["test"], skip_sheets=("lo_rules",))
    assert n == 29  # 14 single-cell formulas and 5 + 6 + 4 cells of array formulas

def test_range_level_counts_equal_the_cell_by_cell_reading(calc):
    # the same session read every formula cell one by one and counted them with the sheet's range queries
    res = calc["answer"]["books"][0]
    by_cell = runner._count(res["cells"])
    assert res["counts"] == by_cell
    # 29 on the fs sheet, 4 on lo_rules; #DIV/0! and #N/A; fs!A4, F3, F4, F5, E3, E4, E5, lo_rules!A1 and A4
    assert by_cell == {"formulas": 33, "errors": 2, "fs_errors": 9}


def test_the_install_command_put_the_extension_into_the_profile(calc):
    cache = calc["profile"] / "user" / "uno_packages" / "cache" / "uno_packages"
    assert any(p.name == "fuelsys.oxt" for p in cache.glob("*/fuelsys.oxt"))
    assert calc["answer"]["installed"] == []  # the session found it there, installed nothing itself


def test_every_formula_of_the_starter_workbook_matches_the_engine(calc):
    if calc["starter"] is None:
        pytest.skip("the starter workbook has not been built")
    summary = calc["starter"]["summary"]
    assert summary["engine"] == "libreoffice" and summary["formulas"] > 100
    # the values LibreOffice stored (15 significant digits in the file) against a fresh built-in computation
    check = evaluate.check_workbook(calc["starter"]["dst"], rel_tol=REL)
    assert check.checked == summary["formulas"]
    assert not check.skipped
    assert not check.differences, check.differences[:5]


def _fs_names(formula: str):
    return re.findall(r"[A-Za-z_][A-Za-z0-9_.]*(?=\()", formula or "")


def _formulas(path):
    wb = openpyxl.load_workbook(path)
    out = {}
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for c in row:
                text = getattr(c.value, "text", c.value)
                if isinstance(text, str) and text.startswith("="):
                    out[(ws.title, c.coordinate)] = text
    return out


@pytest.mark.parametrize("name", ["test", "starter"])
def test_saved_xlsx_keeps_the_plain_fs_names(calc, name):
    if calc[name] is None:
        pytest.skip("the starter workbook has not been built")
    before, after = _formulas(calc[name]["src"]), _formulas(calc[name]["dst"])
    assert set(after) == set(before)
    used = set()
    for key, text in before.items():
        want = [f for f in _fs_names(text) if f.upper().startswith("FS_")]
        got = [f for f in _fs_names(after[key]) if f.upper().startswith("FS_") or "FUELSYS" in f.upper()]
        assert got == want, f"{key}: {text} was saved as {after[key]}"
        used.update(want)
    assert used  # the book did use FS_ functions


def test_array_formula_over_a_range_gives_call_spec_per_cell(calc):
    cells = calc["test"]["cells"]
    want = adapt.call("FS_DENSITY", "kerosene", [[t] for t in TEMPS])
    got = [_value(cells[("fs", f"E{i}")]) for i in range(1, 6)]
    assert got[:2] == [want[0][0], want[1][0]] and isinstance(got[0], float)
    assert got[2] == want[2][0] and got[2].startswith("FS error: temp_c is empty")
    assert got[3] == want[3][0] and got[3].startswith("FS error: temp_c must be a number")
    assert got[4] == want[4][0] and got[4].startswith("FS error: temp_c must be > -273.15")
    # a column given to a two-column array formula is repeated across, as Calc does for its own functions
    col = adapt.call("FS_DENSITY", "kerosene", [[15.0], [40.0]])
    assert [[_value(cells[("fs", f"{c}{r}")]) for c in "IJ"] for r in (1, 2)] == [[v[0], v[0]] for v in col]
    info = adapt.call("FS_FUEL_INFO", "kerosene")
    assert [[_value(cells[("fs", f"{c}{r}")]) for c in "GH"] for r in (1, 2, 3)] == info[:3]


def test_omitted_optional_argument_takes_its_default(calc):
    cells = calc["test"]["cells"]
    assert _value(cells[("fs", "F1")]) == adapt.call("FS_DENSITY", "kerosene", 15.0)
    assert _value(cells[("fs", "F2")]) == adapt.call("FS_DENSITY", "kerosene", 15.0, 5.0)
    assert _value(cells[("fs", "F1")]) != _value(cells[("fs", "F2")])
    assert _value(cells[("fs", "A2")]) == adapt.call("FS_HELP")


def test_bad_input_shows_the_fs_error_text(calc):
    cells = calc["test"]["cells"]
    for addr, args in [("F3", ("kerosene",)), ("F4", ("kerosene", "hot")), ("F5", ("kerosene", 15.0, 50.0))]:
        cell = cells[("fs", addr)]
        assert cell["type"] == "text" and cell["value"] == adapt.call("FS_DENSITY", *args)
        assert cell["value"].startswith("FS error: ")
    assert cells[("fs", "A4")]["value"] == adapt.call("FS_HELP", "FS_NO_SUCH")
    # the error is a text: ISNUMBER guards it, arithmetic on it is the spreadsheet's own #VALUE!
    assert _value(cells[("fs", "F7")]) == 0.0
    assert _value(cells[("fs", "F8")]) == "guarded"


def test_a_single_empty_cell_arrives_as_zero_in_libreoffice(calc):
    # Calc passes a reference to one empty cell by value as 0 (inside a range an empty cell stays empty),
    # so FS_HELP(B1) with B1 empty asks for the function named "0"; documented in convert.py
    cell = calc["test"]["cells"][("lo_rules", "A1")]
    assert cell["value"] == adapt.call("FS_HELP", 0.0)


def test_the_component_logged_its_python(calc):
    text = calc["log"].read_text()
    assert "loaded into Python" in text and "cannot import" not in text


def test_no_soffice_left_running(calc):
    if not Path("/proc").is_dir():
        pytest.skip("needs /proc to list processes")
    left = []
    for proc in Path("/proc").iterdir():
        try:
            cmdline = (proc / "cmdline").read_bytes().replace(b"\0", b" ").decode("utf-8", "replace")
        except OSError:
            continue
        if "soffice" in cmdline and str(calc["profile"]) in cmdline:
            left.append(cmdline)
    assert not left
