"""The headless engine over whole workbooks: references, names, shared and array formulas, order.

Expected values are arithmetic on the inputs under the rules of
tests/test_evaluate.py; where a rule is the spreadsheet's, its Microsoft help
page is named beside the check:
  [REFS]  "Switch between relative, absolute, and mixed references"
  [NAMES] "Define and use names in formulas" (workbook and worksheet scope)
  [ARRAY] "Guidelines and examples of array formulas"
  [IMPL]  "Implicit intersection operator: @"
  [CIRC]  "Remove or allow a circular reference"
Shared formulas: ECMA-376 Part 1, 18.3.1.40 (f element, t="shared"), checked
against openpyxl's own formula Translator.
"""

import openpyxl
import pytest
from openpyxl.formula.translate import Translator, TranslatorError
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.formula import ArrayFormula

from fuelsys.sheet import builtins as bi
from fuelsys.sheet import evaluate as ev
from fuelsys.sheet import xlsx
from fuelsys.sheet.catalogue import Arg, Returns, Spec
from test_xlsx import c, raw_book, rows_xml


@pytest.fixture(autouse=True)
def strict(monkeypatch):
    monkeypatch.setattr(ev, "STRICT", True)


def book(tmp_path, fill, name="b.xlsx"):
    wb = openpyxl.Workbook()
    fill(wb)
    path = str(tmp_path / name)
    wb.save(path)
    return path


def compute(path):
    comp = ev.compute_book(xlsx.read_book(path))
    values = {comp.cell(k): v for k, v in comp.values.items()}
    skipped = dict(comp.skipped_list())
    return values, skipped


def test_references_relative_absolute_and_cross_sheet(tmp_path):
    def fill(wb):
        a = wb.active
        a.title = "In"
        for i, v in enumerate([1, 2, 3, 4], 1):
            a.cell(i, 1, v)
        a["B1"] = 10
        s = wb.create_sheet("Fuel Data")
        s["A1"] = 0.5
        o = wb.create_sheet("Out")
        o["A1"] = "=In!A1+In!$B$1"  # 11
        o["A2"] = "=SUM(In!A1:A4)"  # 10
        o["A3"] = "='Fuel Data'!A1*A1"  # 5.5  (quoted sheet name with a space)
        o["A4"] = "=SUM(In!A:A)"  # 10 (whole column)
        o["A5"] = "=In!A1:A4*2"  # row 5 is outside 1..4: #VALUE! [IMPL]
        o["A6"] = "=Missing!A1"  # a sheet that does not exist: #REF!, never 0
        o["A7"] = "=SUM(Missing!A1:A4)"  # same for a range
        o["B2"] = "=In!A1:A4*2"  # implicit intersection picks In!A2: 4 [IMPL]
        o["A8"] = "=In!A9"  # an empty cell reads as 0
        o["A9"] = '="x"&In!A9&"y"'  # ... and as "" in a text
        o["A10"] = "=ISBLANK(In!A9)"  # TRUE ("IS functions")
        o["A11"] = "=MATCH(3,In!A1:A4,0)+INDEX(In!A1:A4,4)"  # 3 + 4
        o["A12"] = "=ROWS(In!A:A)"  # whole column has 1,048,576 rows ("Excel specifications and limits")

    values, skipped = compute(book(tmp_path, fill))
    assert not skipped
    assert values["Out!A1"] == 11.0 and values["Out!A2"] == 10.0 and values["Out!A3"] == 5.5
    assert values["Out!A4"] == 10.0
    assert values["Out!A5"] == bi.VALUE and values["Out!B2"] == 4.0
    assert values["Out!A6"] == bi.REF and values["Out!A7"] == bi.REF
    assert values["Out!A8"] == 0.0 and values["Out!A9"] == "xy" and values["Out!A10"] is True
    assert values["Out!A11"] == 7.0 and values["Out!A12"] == 1048576.0


def test_ranges_skip_text_but_typed_text_converts(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "S"
        s["A1"], s["A2"], s["A3"] = 1, "2", True
        s["B1"] = "=SUM(A1:A3)"  # text and TRUE in a range are skipped: 1 ("SUM function")
        s["B2"] = '=SUM(A1,"2",TRUE)'  # typed: 4
        s["B3"] = "=A2+1"  # text that is a number converts in arithmetic: 3
        s["B4"] = "=A2=2"  # but a text never equals a number: FALSE

    values, _ = compute(book(tmp_path, fill))
    assert values["S!B1"] == 1.0 and values["S!B2"] == 4.0 and values["S!B3"] == 3.0 and values["S!B4"] is False


def test_defined_names_cell_range_constant_and_scope(tmp_path):
    def fill(wb):
        a = wb.active
        a.title = "A"
        a["A1"], a["A2"], a["A3"] = 2, 3, 4
        b = wb.create_sheet("B")
        a["B1"] = "=Rate*10"  # workbook name, a cell: 20
        a["B2"] = "=SUM(Block)"  # a range: 9
        a["B3"] = "=Half*A2"  # a constant: 1.5
        a["B4"] = "=Scoped"  # workbook-level Scoped: 100
        b["A1"] = "=Scoped"  # B's own Scoped wins on B: 7 [NAMES]
        a["B5"] = "=B!Scoped"  # qualified: B's own: 7 [NAMES]
        a["B6"] = "=Twice"  # a name holding a formula: 2*A1 = 4
        a["B7"] = "=NoSuchName+1"  # #NAME?
        a["B8"] = "=Later"  # a name pointing at a formula cell computed after this one
        b["C9"] = "=A!A3*100"  # 400
        wb.defined_names["Rate"] = DefinedName("Rate", attr_text="A!$A$1")
        wb.defined_names["Block"] = DefinedName("Block", attr_text="A!$A$1:$A$3")
        wb.defined_names["Half"] = DefinedName("Half", attr_text="0.5")
        wb.defined_names["Scoped"] = DefinedName("Scoped", attr_text="100")
        wb.defined_names["Twice"] = DefinedName("Twice", attr_text="2*A!$A$1")
        wb.defined_names["Later"] = DefinedName("Later", attr_text="B!$C$9")
        b.defined_names["Scoped"] = DefinedName("Scoped", attr_text="7")

    values, skipped = compute(book(tmp_path, fill))
    assert not skipped
    assert values["A!B1"] == 20.0 and values["A!B2"] == 9.0 and values["A!B3"] == 1.5
    assert values["A!B4"] == 100.0 and values["B!A1"] == 7.0 and values["A!B5"] == 7.0
    assert values["A!B6"] == 4.0 and values["A!B7"] == bi.NAME and values["A!B8"] == 400.0


def test_shared_formulas_move_like_the_translator(tmp_path):
    # master B1 "A1*$D$1+A$1", shared over B1:C3 (ECMA-376 18.3.1.40)
    master = "A1*$D$1+A$1"
    cells = [c("A1", "1"), c("A2", "2"), c("A3", "3"), c("D1", "10"),
             c("B1", f=master, fattrs=' t="shared" ref="B1:C3" si="0"'),
             c("B2", f="", fattrs=' t="shared" si="0"'), c("B3", f="", fattrs=' t="shared" si="0"'),
             c("C1", f="", fattrs=' t="shared" si="0"'), c("C2", f="", fattrs=' t="shared" si="0"'),
             c("C3", f="", fattrs=' t="shared" si="0"')]
    path = raw_book(str(tmp_path / "sh.xlsx"), [("S", rows_xml(cells))])
    got = ev.evaluate_workbook(path)
    for ref in ("B2", "B3", "C1", "C2", "C3"):
        moved = Translator("=" + master, origin="B1").translate_formula(ref)
        assert got[("S", ref)] == ev.evaluate_formula(moved[1:], book=path), ref
    assert got[("S", "B3")] == 3 * 10 + 1  # A3*$D$1+A$1
    # C2 = B2*$D$1+B$1 = (A2*10+A$1)*10 + (A1*10+A$1)
    assert got[("S", "C2")] == (2 * 10 + 1) * 10 + (1 * 10 + 1)


def test_shared_formula_cells_agree_with_their_written_out_formulas(tmp_path):
    cells = [c(f"A{i}", str(i)) for i in range(1, 6)]
    cells += [c("B1", f="A1*2+SUM($A$1:A1)", fattrs=' t="shared" ref="B1:B5" si="3"')]
    cells += [c(f"B{i}", f="", fattrs=' t="shared" si="3"') for i in range(2, 6)]
    path = raw_book(str(tmp_path / "sh2.xlsx"), [("S", rows_xml(cells))])
    got = ev.evaluate_workbook(path)
    for i in range(1, 6):
        assert got[("S", f"B{i}")] == i * 2 + sum(range(1, i + 1))


def test_array_formula_fills_its_area(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "S"
        for i in range(1, 4):
            s.cell(i, 1, i)
        s["B1"] = ArrayFormula("B1:B3", "=A1:A3*A1:A3")  # [ARRAY] element by element: 1, 4, 9
        s["C1"] = ArrayFormula("C1:D2", "=7")  # a single value fills the whole area [ARRAY]
        s["E1"] = ArrayFormula("E1:E4", "=A1:A3")  # more cells than values: #N/A [ARRAY]
        s["F1"] = ArrayFormula("F1", "=SUM(A1:A3*2)")  # one cell: 12
        s["G1"] = "=SUM(B1:B3)"  # reads the spilled cells: 14
        s["H1"] = "=SUMPRODUCT(A1:A3,A1:A3)"  # 14, no array formula needed ("SUMPRODUCT function")

    values, skipped = compute(book(tmp_path, fill))
    assert not skipped
    assert [values[f"S!B{i}"] for i in (1, 2, 3)] == [1.0, 4.0, 9.0]
    assert {values[k] for k in ("S!C1", "S!C2", "S!D1", "S!D2")} == {7.0}
    assert values["S!E3"] == 3.0 and values["S!E4"] == bi.NA
    assert values["S!F1"] == 12.0 and values["S!G1"] == 14.0 and values["S!H1"] == 14.0


def _table_spec():
    def impl(n):
        return [["step", "value"], [1.0, n], [2.0, 2 * n]]

    return Spec(name="FS_TEST_TABLE", category="about", summary="a test table", source="test",
                args=(Arg("n", "number", "-", "a number"),), returns=Returns("table", "-", "a table"), impl=impl)


def test_catalogue_table_spills_into_its_array_area(tmp_path, monkeypatch):
    funcs = dict(ev._catalogue())
    funcs["FS_TEST_TABLE"] = _table_spec()
    monkeypatch.setattr(ev, "_catalogue", lambda: funcs)

    def fill(wb):
        s = wb.active
        s.title = "S"
        s["A1"] = 5
        s["B1"] = ArrayFormula("B1:C3", "=FS_TEST_TABLE(A1)")
        s["D1"] = "=FS_TEST_TABLE(A1)"  # a single-cell formula shows the top-left value [IMPL]
        s["E1"] = "=C3+1"  # reads a spilled cell: 11

    values, skipped = compute(book(tmp_path, fill))
    assert not skipped
    assert [[values[f"S!{col}{r}"] for col in "BC"] for r in (1, 2, 3)] == [["step", "value"], [1.0, 5.0], [2.0, 10.0]]
    assert values["S!D1"] == "step" and values["S!E1"] == 11.0


def test_catalogue_errors_are_texts_and_errors_in_arguments_propagate(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "S"
        s["A1"] = '=FS_HELP("no_such_function")'
        s["A2"] = "=A1*2"  # arithmetic on a text: #VALUE!
        s["A3"] = "=ISNUMBER(A1)"  # FALSE
        s["A4"] = '=IF(ISTEXT(A1),"check inputs",A1)'
        s["A5"] = "=FS_HELP(1/0)"  # an error argument propagates, the function is not called

    values, _ = compute(book(tmp_path, fill))
    assert values["S!A1"].startswith("FS error: ")
    assert values["S!A2"] == bi.VALUE and values["S!A3"] is False and values["S!A4"] == "check inputs"
    assert values["S!A5"] == bi.DIV0


def test_circular_references_name_their_cells(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "S"
        s["A1"] = "=B1+1"
        s["B1"] = "=C1+1"
        s["C1"] = "=A1+1"
        s["D1"] = "=D1"  # refers to itself
        s["E1"] = "=A1*2"  # depends on the loop
        s["F1"] = "=2"  # independent

    values, skipped = compute(book(tmp_path, fill))
    assert skipped["S!A1"] == "circular reference among S!A1, S!B1, S!C1" == skipped["S!C1"]  # [CIRC]
    assert skipped["S!D1"] == "circular reference among S!D1"
    assert "S!A1" in skipped["S!E1"] and "circular" in skipped["S!E1"]
    assert values == {"S!F1": 2.0}


def test_unsupported_function_skips_the_cell_and_its_dependents(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "Sheet1"
        s["C4"] = "=OFFSET(A1,1,1)"
        s["C5"] = "=C4*2"
        s["C6"] = "=SUM(C4:C5)"
        s["C7"] = "=VLOOKUP(1,A1:B2,2)"
        s["C8"] = "=1+1"

    values, skipped = compute(book(tmp_path, fill))
    assert skipped["Sheet1!C4"] == "indirect reference OFFSET (references built at run time)"
    assert skipped["Sheet1!C5"].startswith("depends on Sheet1!C4")
    assert skipped["Sheet1!C6"].startswith("depends on Sheet1!C4")
    assert skipped["Sheet1!C7"] == "unsupported function VLOOKUP"
    assert values == {"Sheet1!C8": 2.0}
    with pytest.raises(ev.EvaluationError, match="OFFSET"):
        ev.evaluate_workbook(book(tmp_path, fill, "again.xlsx"))


def test_external_and_volatile_references_are_refused_by_cell(tmp_path):
    cells = [c("A1", f="[1]Other!A1*2"), c("A2", f="NOW()"), c("A3", f="RAND()+A1"), c("A4", f='INDIRECT("A1")')]
    path = raw_book(str(tmp_path / "x.xlsx"), [("S", rows_xml(cells))])
    _, skipped = compute(path)
    assert skipped["S!A1"] == "external workbook reference [1]Other!A1"
    assert "NOW" in skipped["S!A2"] and "RAND" in skipped["S!A3"] and "INDIRECT" in skipped["S!A4"]


def test_long_chain_has_no_recursion_limit(tmp_path):
    # 20,000 cells, each the one above plus 1, as one shared formula (well past Python's 1,000 frames)
    n = 20_000
    cells = [c("A1", "1"), c("A2", f="A1+1", fattrs=f' t="shared" ref="A2:A{n}" si="0"')]
    cells += [c(f"A{i}", f="", fattrs=' t="shared" si="0"') for i in range(3, n + 1)]
    path = raw_book(str(tmp_path / "chain.xlsx"), [("S", rows_xml(cells))])
    comp = ev.compute_book(xlsx.read_book(path))
    assert not comp.skipped and comp.values[(0, n, 1)] == float(n)


def test_evaluate_formula_against_a_book(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "S"
        s["A1"] = 3
        s["A2"] = "=A1*2"

    path = book(tmp_path, fill)
    assert ev.evaluate_formula("A2+1", book=path) == 7.0
    assert ev.evaluate_formula("S!A1:A2*10", book=path).full_rows() == [[30.0], [60.0]]
    with pytest.raises(ev.Unsupported, match="no sheet"):
        ev.evaluate_formula("A1", book=path, sheet="Nope")


def test_evaluate_workbook_keys_and_values(tmp_path):
    def fill(wb):
        s = wb.active
        s.title = "My Sheet"
        s["A1"] = "=1/0"
        s["A2"] = '="a"'

    got = ev.evaluate_workbook(book(tmp_path, fill))
    assert got == {("My Sheet", "A1"): bi.DIV0, ("My Sheet", "A2"): "a"}


def _shape_spec():
    def impl(grid):
        return float(len(grid) * 1000 + len(grid[0]))

    return Spec(name="FS_TEST_SHAPE", category="about", summary="rows*1000+columns of a range", source="test",
                args=(Arg("grid", "cells", "-", "a range"),), returns=Returns("number", "-", "a shape"), impl=impl)


def test_ranges_reach_catalogue_functions_in_their_shape(tmp_path, monkeypatch):
    funcs = dict(ev._catalogue())
    funcs["FS_TEST_SHAPE"] = _shape_spec()
    monkeypatch.setattr(ev, "_catalogue", lambda: funcs)

    def fill(wb):
        s = wb.active
        s.title = "S"
        s["A1"], s["A2"], s["A3"] = 1, 2, 3
        s["B1"] = "=FS_TEST_SHAPE(A1:A10)"  # typed range: all 10 rows, empty ones as empty cells
        s["B2"] = "=FS_TEST_SHAPE(A:A)"  # whole column: up to the last used row (3)
        s["B3"] = "=FS_TEST_SHAPE(A1:B2)"

    values, skipped = compute(book(tmp_path, fill))
    assert not skipped
    assert values["S!B1"] == 10001.0 and values["S!B2"] == 3001.0 and values["S!B3"] == 2002.0


def test_at_operator_is_implicit_intersection(tmp_path):
    # Excel stores =@A1:A3 as _xlfn.SINGLE(A1:A3) [IMPL]
    cells = [c("A1", "1"), c("A2", "20"), c("A3", "300"), c("B2", f="_xlfn.SINGLE(A1:A3)*2"),
             c("C1", "0", f="_xlfn.SINGLE(A1:A3)+0", fattrs=' t="array" ref="C1"')]
    path = raw_book(str(tmp_path / "at.xlsx"), [("S", rows_xml(cells))])
    got = ev.evaluate_workbook(path)
    assert got[("S", "B2")] == 40.0
    assert got[("S", "C1")] == 1.0  # row 1 of A1:A3


# ---------------------------------------------------------------------------
# the parse cache for filled formulas agrees with a fresh parse, always

from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402


def _ref_text(draw):
    col = draw(st.integers(1, 60))
    row = draw(st.integers(1, 400))
    letters = ev.col_letters(col)
    return f"{'$' if draw(st.booleans()) else ''}{letters}{'$' if draw(st.booleans()) else ''}{row}"


@st.composite
def formulas(draw, depth=0):
    leaves = [
        lambda: _ref_text(draw),
        lambda: f"{_ref_text(draw)}:{_ref_text(draw)}",
        lambda: f"'My A1 sheet'!{_ref_text(draw)}",
        lambda: f"Data1!{_ref_text(draw)}",
        lambda: str(draw(st.integers(0, 99))),
        lambda: '"B7 text ""A1"""',
        lambda: "Rate2",
        lambda: "A:A" if draw(st.booleans()) else "$3:$3",
    ]
    if depth >= 3 or draw(st.integers(0, 2)) == 0:
        return leaves[draw(st.integers(0, len(leaves) - 1))]()
    kind = draw(st.integers(0, 3))
    a, b = draw(formulas(depth + 1)), draw(formulas(depth + 1))
    if kind == 0:
        return f"{a}{draw(st.sampled_from(['+', '-', '*', '/', '&', '^', '<=']))}{b}"
    if kind == 1:
        return f"SUM({a},{b})"
    if kind == 2:
        return f"LOG10({a})+IF({a}>{b},{b},-{a})"
    return f"({a})"


@pytest.mark.slow
@settings(max_examples=300, deadline=None)
@given(text=formulas(), host=st.tuples(st.integers(1, 50), st.integers(1, 30)),
       move=st.tuples(st.integers(-20, 20), st.integers(-10, 10)))
def test_template_cache_matches_a_fresh_parse(text, host, move):
    r, c = host
    r2, c2 = r + move[0], c + move[1]
    if r2 < 1 or c2 < 1:
        return
    try:
        moved = Translator("=" + text, origin=ev.cell_name(r, c)).translate_formula(ev.cell_name(r2, c2))
    except TranslatorError:  # a reference moved off the sheet
        return
    cache = ev._Templates()
    assert cache.tree(text, r, c) == ev.parse(text)
    assert cache.tree(moved[1:], r2, c2) == ev.parse(moved[1:]), (text, moved)
    # a shared formula's later cells are its first cell's tree, moved the same way
    assert ev.shift(ev.parse(text), r2 - r, c2 - c) == ev.parse(moved[1:]), (text, moved)


def test_relative_defined_name_is_relative_to_the_cell_using_it(tmp_path):
    # a name holding a relative reference is stored as seen from A1 and moves with the
    # cell that uses it [NAMES] (from memory: "Use relative references in names")
    cells = [c("B1", "10"), c("B2", "20"), c("B3", "30"), c("A3", f="RightOf*2"), c("A1", f="RightOf+1")]
    path = raw_book(str(tmp_path / "rel.xlsx"), [("S", rows_xml(cells))], names=[("RightOf", None, "S!B1")])
    got = ev.evaluate_workbook(path)
    assert got[("S", "A3")] == 60.0 and got[("S", "A1")] == 11.0


def test_five_hundred_operands_compute_without_recursion(tmp_path):
    # issue 16: =A1+A2+...+A500 (2,391 characters) raised RecursionError from the compiler.
    # Expected: the sum of 1..500 is 500*501/2 = 125,250 (arithmetic series).
    text = "+".join(f"A{i}" for i in range(1, 501))
    assert len(text) + 1 == 2392

    def fill(wb):
        ws = wb.active
        for i in range(1, 501):
            ws.cell(i, 1, i)
        ws["B1"] = "=" + text
        ws["B2"] = "=" + "-".join(f"A{i}" for i in range(1, 501))  # 1 - (2+...+500) = 1 - 125,249
        ws["B3"] = "=A2" + "%" * 600  # 2 / 100^600 underflows to 0 (IEEE 754 double)
        ws["C1"] = "=" + "+".join(f"B{i}" for i in range(1, 501))  # B1's formula moved: the template cache shifts it
    path = book(tmp_path, fill)
    values, skipped = compute(path)
    assert not skipped
    assert values["Sheet!B1"] == 125250.0
    assert values["Sheet!B2"] == 1.0 - 125249.0
    assert values["Sheet!B3"] == 0.0
    assert values["Sheet!C1"] == 125250.0 + (1.0 - 125249.0) + 0.0
    assert ev.evaluate_formula("+".join(["1"] * 3000)) == 3000.0
    assert ev.evaluate_formula("&".join(["1"] * 1000)) == "1" * 1000
    rep = ev.recalc_workbook(path)
    assert rep.ok and rep.written
    assert ev.check_workbook(path).ok
