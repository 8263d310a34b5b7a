"""A builder's book is never written while it is open elsewhere, and failures are counted, not hidden.

Facts used: LibreOffice keeps ".~lock.NAME#" and Excel "~$NAME" beside a book it has open
(common practice, no source).
"""

import openpyxl

from fuelsys.cli import main
from fuelsys.sheet.evaluate import recalc_workbook


def _book(path, temp=15):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws["A1"] = temp
    ws["B1"] = '=FS_DENSITY("kerosene",A1)'
    ws["B2"] = "=B1*2"
    wb.save(path)
    return path


def test_recalc_refuses_a_book_open_in_a_spreadsheet_program(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    before = book.read_bytes()
    for lock in (".~lock.engine.xlsx#", "~$gine.xlsx"):
        (tmp_path / lock).write_text("someone")
        assert main(["recalc", str(book)]) == 2
        assert "is open in a spreadsheet program" in capsys.readouterr().err
        assert book.read_bytes() == before
        (tmp_path / lock).unlink()
    assert main(["recalc", str(book)]) == 0


def test_recalc_counts_error_results(tmp_path):
    rep = recalc_workbook(_book(tmp_path / "cold.xlsx", temp=-70))  # below kerosene's freezing point
    assert rep.fs_errors == 1 and rep.error_values == 1  # B1's text, and B2's #VALUE! from arithmetic on it
    assert "1 showing an FS error text, 1 an error value" in rep.summary()


def test_libreoffice_engine_refuses_to_write_over_the_book(tmp_path, capsys):
    book = _book(tmp_path / "b.xlsx")
    before = book.read_bytes()
    assert main(["recalc", str(book), "--engine", "libreoffice", "-o", str(book)]) == 2
    assert "another file than the book" in capsys.readouterr().err
    assert book.read_bytes() == before
