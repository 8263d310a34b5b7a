"""Cells computed outside a correlation's fitted range are flagged by the headless engine, not hidden.

The range used: Riazi & Faghri (1985) liquid conductivity, fitted 255.4..422 K (as stored beside the
correlation in fuelsys.fuels.petroleum); -40 °C lies below it, 20 °C inside it.
"""

import openpyxl

from fuelsys.cli import main
from fuelsys.sheet import adapt, call
from fuelsys.sheet.evaluate import recalc_workbook


def _book(path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws["A1"] = '=FS_CONDUCTIVITY("kerosene",-40)'
    ws["A2"] = '=FS_CONDUCTIVITY("kerosene",20)'
    ws["A3"] = '=FS_CONDUCTIVITY("kerosene",-40)*2'  # the same call again (remembered) keeps its note
    wb.save(path)
    return path


def test_recalc_reports_the_cells_outside_a_fitted_range(tmp_path):
    rep = recalc_workbook(_book(tmp_path / "b.xlsx"))
    cells = [c for c, _ in rep.notes]
    assert cells == ["Sheet!A1", "Sheet!A3"]
    assert "Riazi-Faghri 1985" in rep.notes[0][1][0]
    assert "outside a correlation's fitted range" in rep.summary()
    # the value itself is still a number in the cell
    wb = openpyxl.load_workbook(tmp_path / "b.xlsx", data_only=True)
    assert isinstance(wb.active["A1"].value, float)


def test_recalc_notes_flag_prints_them(tmp_path, capsys):
    assert main(["recalc", str(_book(tmp_path / "b.xlsx")), "--notes"]) == 0
    out = capsys.readouterr().out
    assert "outside a fitted range: Sheet!A1: FS_CONDUCTIVITY" in out
    assert "Sheet!A2" not in out


def test_note_sink_collects_only_while_set():
    sink = []
    old = adapt.set_note_sink(sink)
    try:
        call("FS_CONDUCTIVITY", "kerosene", -40)
    finally:
        adapt.set_note_sink(old)
    call("FS_CONDUCTIVITY", "kerosene", -40)
    assert len(sink) == 1 and sink[0].startswith("FS_CONDUCTIVITY: ")


# ---------------------------------------------------------------------------
# FS_NOTES: the notes of any call, as a cell text (issue 13 item 1)

import pytest  # noqa: E402

from fuelsys.sheet import catalogue  # noqa: E402
from fuelsys.sheet.decl.about import NOTES_MAX_ARGS  # noqa: E402

FUNCS = catalogue.functions()


def test_fs_notes_forwards_enough_arguments_for_every_function():
    assert max(len(s.args) for n, s in FUNCS.items() if n != "FS_NOTES") <= NOTES_MAX_ARGS


@pytest.mark.parametrize("name", [n for n in FUNCS if n != "FS_NOTES"])
def test_fs_notes_is_ok_on_the_documented_example(name):
    assert call("FS_NOTES", name, *FUNCS[name].example) == "ok"


def _outside(arg):
    """A value beyond the argument's declared bounds, or None when it has none."""
    for bound, sign in ((arg.gt, -1), (arg.low, -1), (arg.lt, 1), (arg.high, 1)):
        if bound is not None:
            return bound + sign * (abs(bound) + 1.0)
    return None


#: functions with no bounded number to push out of range (names, texts, fuels and tables only)
NO_BOUNDED_NUMBER = {"FS_VERSION", "FS_HELP", "FS_HEATING_VALUE", "FS_STOICH_FAR", "FS_FUEL_INFO",
                     "FS_NEEDLE_BORE", "FS_NEEDLE_OD"}


@pytest.mark.parametrize("name", [n for n in FUNCS if n != "FS_NOTES"])
def test_fs_notes_names_the_range_on_an_input_outside_it(name):
    spec = FUNCS[name]
    cells = list(spec.example) + [None] * (len(spec.args) - len(spec.example))
    pushed = [(i, a, _outside(a)) for i, a in enumerate(spec.args)
              if a.kind in ("number", "range") and _outside(a) is not None]
    if not pushed:
        assert name in NO_BOUNDED_NUMBER
        return
    i, arg, value = pushed[0]
    cells[i] = value
    text = call("FS_NOTES", name, *cells)
    assert text.startswith(f"FS error: {arg.name} must be ") and arg.range_text() in text, text


def test_fs_notes_names_a_correlation_range_and_its_value():
    # Riazi & Faghri (1985) conductivity, fitted 255.4..422 K (fuelsys.fuels.petroleum); -40 °C = 233.15 K
    text = call("FS_NOTES", "FS_CONDUCTIVITY", "kerosene", -40)
    assert text.startswith("FS_CONDUCTIVITY: Riazi-Faghri 1985")
    assert "255.4..422 [K]" in text and "233.1" in text
    # the same text recalc --notes collects for the direct call
    out, notes = adapt.call_with_notes(FUNCS["FS_CONDUCTIVITY"], "kerosene", -40)
    assert text == "\n".join(notes)


def test_fs_notes_of_a_range_call_and_of_a_failing_call():
    assert "(2 of 3 points)" in call("FS_NOTES", "FS_CONDUCTIVITY", "kerosene", [[-40], [20], [-45]])
    assert call("FS_NOTES", "FS_DENSITY", "kerosene", -300).startswith("FS error: temp_c must be > -273.15")
    assert call("FS_NOTES", "FS_NOPE").startswith("FS error: function_name: no function")
    assert call("FS_NOTES", "FS_NOTES", "FS_DENSITY").startswith("FS error: function_name: FS_NOTES")


def test_fs_notes_do_not_reach_the_outer_sink():
    sink = []
    old = adapt.set_note_sink(sink)
    try:
        call("FS_NOTES", "FS_CONDUCTIVITY", "kerosene", -40)
    finally:
        adapt.set_note_sink(old)
    assert sink == []


def test_tolerance_spread_passes_its_notes_on():
    # 34G needles at 20 bar run turbulent-ish entries outside the entrance data; whichever correlation
    # flags, the table's validity row and FS_NOTES tell the same story
    args = (25, "normal", 8, 25, 2, "kerosene", -45)
    table = call("FS_TOLERANCE_SPREAD", *args)
    validity = table[-1][1]
    notes = call("FS_NOTES", "FS_TOLERANCE_SPREAD", *args)
    assert (validity == "ok") == (notes == "ok")


def test_wizard_texts_fit_excels_function_wizard():
    from fuelsys.sheet import excel
    from fuelsys.sheet.calc_addin.generate import function_description

    for name, spec in FUNCS.items():
        text = spec.wizard_text()
        assert 0 < len(text) <= 255, (name, len(text))
        assert excel.UDFS[name].__doc__ == text == function_description(spec)
        for a in spec.args:
            assert len(a.wizard_text()) <= 255, (name, a.name, len(a.wizard_text()))
