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
