"""fuelsys diff: labels by sheet, row and column; changes below the shown digits hidden; grammar.

Expected labels are the texts typed into the books built here; the expected
display follows the number-format rules of ECMA-376 Part 1, 18.8.31 (numFmt):
"0.00" shows two decimals, "%" multiplies by 100, "E+" is scientific.
"""

import openpyxl
import pytest

from fuelsys.cli import main
from fuelsys.sheet import book as sheet_book
from fuelsys.sheet.evaluate import recalc_workbook
from fuelsys.sheet.xlsx import Formula, Sheet


def _sheet(cells, formulas=()):
    s = Sheet("S", None, "worksheet")
    s.cells.update(cells)
    for key, f in formulas:
        s.formulas[key] = f
    s.max_row = max(r for r, _ in s.cells)
    s.max_col = max(c for _, c in s.cells)
    return s


def test_labels_name_label_rows_tables_and_array_tables():
    cells = {
        (1, 1): "Needle sizing",
        (2, 1): "needle length", (2, 2): 30.0, (2, 3): "mm",
        (3, 1): "wall class", (3, 2): "normal", (3, 3): "",
        (4, 1): "needles", (4, 2): 6.0, (4, 3): "-",
        (6, 1): "Flow against pressure drop",
        (7, 1): "Δp [bar]", (7, 2): "flow cold [g/min]", (7, 3): "flow hot [g/min]",
        (8, 1): 0.5, (8, 2): 7.1, (8, 3): 12.2,
        (9, 1): 1.0, (9, 2): 13.4, (9, 3): 21.1,
        (10, 1): "largest flow", (10, 2): 21.1, (10, 3): "g/min",
        (12, 1): "Along the tube at idle",
        (13, 1): "position_mm", (13, 2): "gas_c",
        (14, 1): 0.0, (14, 2): 25.2,
        (15, 1): 9.0, (15, 2): 36.1,
        (16, 1): 18.0, (16, 2): 43.4,
        (18, 1): "Tolerance study",
        (19, 1): "nominal bore", (19, 2): 0.317,
        (20, 1): "spread", (20, 2): 9.9,
    }
    formulas = [((8, 2), Formula("X")), ((9, 2), Formula("X")), ((8, 3), Formula("X")), ((9, 3), Formula("X")),
                ((10, 2), Formula("MAX(C8:C9)")),
                ((13, 1), Formula("T()", "array", (13, 1, 16, 2))),
                ((19, 1), Formula("L()", "array", (19, 1, 20, 2)))]
    lab = sheet_book.Labeller(_sheet(cells, formulas))
    assert lab.label(2, 2) == "needle length"
    assert lab.label(4, 2) == "needles"  # not headed by the text input "normal" above it
    assert lab.label(3, 2) == "wall class"
    # a table's rows keyed by a number take the key column's heading; its last row too
    assert lab.label(8, 2) == "Flow against pressure drop / Δp [bar] 0.5 / flow cold [g/min]"
    assert lab.label(9, 3) == "Flow against pressure drop / Δp [bar] 1 / flow hot [g/min]"
    assert lab.label(10, 2) == "largest flow"  # a label row under a table is no table row
    # an array table whose first row is texts: those are its headings, its first column the key
    assert lab.label(16, 2) == "Along the tube at idle / position_mm 18 / gas_c"
    assert lab.label(14, 1) == "Along the tube at idle / gas_c".replace("gas_c", "position_mm")
    # a spilled (label, value) list: the label in its first column
    assert lab.label(20, 2) == "spread"


@pytest.mark.parametrize("value, code, shown", [
    (172.3012, "General", "172.301"),
    (172.3012, "0.00", "172.30"),
    (0.2217, "0.0%", "22.2%"),
    (1234567.8, "#,##0", "1,234,568"),
    (0.000123, "0.00E+00", "1.23E-04"),
    (-2.5, '0.0;[Red]"minus "0.0', "2.5"),  # the second section shows negatives (its text aside)
    (3.0, "@", "3"),
])
def test_display_text_follows_the_number_format(value, code, shown):
    assert sheet_book.display_text(value, code) == shown


def _book(path, a1, extra_formula=None):
    wb = openpyxl.Workbook()
    s = wb.active
    s.title = "S"
    s["A1"], s["B1"], s["C1"] = "length", a1, "mm"
    s["A3"], s["B3"], s["C3"] = "point", "doubled [mm]", "third [mm]"
    s["A4"] = "full"
    s["B4"] = "=B1*2"
    s["B4"].number_format = "0.0"
    s["C4"] = extra_formula or "=B1/3"
    wb.save(path)
    recalc_workbook(path)
    return path


def test_diff_lists_inputs_first_hides_invisible_changes_and_counts_right(tmp_path, capsys):
    old = _book(str(tmp_path / "old.xlsx"), 15.0)
    tiny = _book(str(tmp_path / "tiny.xlsx"), 15.0000001)  # B4 shows 30.0 either way, C4 5 at 6 digits
    assert main(["diff", old, tiny]) == 1
    out = capsys.readouterr().out
    lines = [ln for ln in out.splitlines() if ln.strip()]
    assert lines[0] == "input    S!B1 (length): 15 -> 15.0000001"
    assert "2 results that follow from them; 2 of them change only below the digits the book shows" in out
    assert "result   S!B4" not in out
    assert lines[-1] == "1 input differs; 2 results differ (2 too small to show)"
    assert main(["diff", old, tiny, "--all"]) == 1
    out = capsys.readouterr().out
    # --all lists them with just enough digits to tell the values apart
    assert "result   S!B4 (full / doubled [mm]): 30 -> 30.0000002" in out
    assert "result   S!C4 (full / third [mm]): 5 -> 5.00000003" in out


def test_diff_shows_visible_result_changes_in_the_books_format(tmp_path, capsys):
    old = _book(str(tmp_path / "old.xlsx"), 15.0)
    new = _book(str(tmp_path / "new.xlsx"), 16.0, extra_formula="=B1/4")
    assert main(["diff", old, new]) == 1
    out = capsys.readouterr().out
    lines = [ln for ln in out.splitlines() if ln.strip()]
    assert lines[0].startswith("input    S!B1 (length): 15 -> 16")
    assert lines[1].startswith("formula  S!C4 (full / third [mm]): =B1/3 -> =B1/4")
    assert "result   S!B4 (full / doubled [mm]): 30.0 -> 32.0" in out
    assert lines[-1] == "1 input differs; 1 formula differs; 1 result differs"  # C4 counts as its formula
    assert out.index("input ") < out.index("formula ") < out.index("result ")


def test_counted_agrees_in_number():
    assert sheet_book.counted(1, "formula") == "1 formula differs"
    assert sheet_book.counted(2, "formula") == "2 formulas differ"
    assert sheet_book.counted(0, "input") == "0 inputs differ"
