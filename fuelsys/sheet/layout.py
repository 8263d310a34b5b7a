"""A small layout helper for building fuelsys workbooks with openpyxl.

Used only for books fuelsys creates from scratch (the starter and the demo);
a user's own book is never saved through openpyxl (see
:mod:`fuelsys.sheet.xlsx`).  Inputs are styled apart from results, carry their
unit in the column beside them, and get a workbook-level defined name so
formulas read like ``=FS_DENSITY(FuelName, ColdDayC, OilPct)``.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from openpyxl.comments import Comment
from openpyxl.styles import Alignment, Border, Font, PatternFill, Side
from openpyxl.utils import get_column_letter
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation

# our own house style: inputs on a pale green-grey ground with dark text,
# results plain with a thin rule under them, headings in slate
INPUT_FILL = PatternFill("solid", fgColor="E4EFE9")
INPUT_FONT = Font(color="1D3B2A", bold=True)
RESULT_FONT = Font(color="000000")
HEAD_FONT = Font(size=14, bold=True, color="2F3E4E")
SUB_FONT = Font(size=11, bold=True, color="2F3E4E")
NOTE_FONT = Font(italic=True, color="555555")
UNIT_FONT = Font(color="555555")
THIN = Side(style="thin", color="B8C4CC")
RULE = Border(bottom=THIN)
WRAP = Alignment(wrap_text=True, vertical="top")
TOP = Alignment(vertical="top")


@dataclass
class SheetWriter:
    """Writes rows down a sheet: headings, notes, inputs, results and tables."""

    book: object
    ws: object
    row: int = 1
    names: dict = field(default_factory=dict)
    label_width: int = 34

    def __post_init__(self):
        # print each sheet landscape, one page wide
        self.ws.page_setup.orientation = "landscape"
        self.ws.page_setup.paperSize = self.ws.PAPERSIZE_A4
        self.ws.sheet_properties.pageSetUpPr.fitToPage = True
        self.ws.page_setup.fitToWidth = 1
        self.ws.page_setup.fitToHeight = 0
        self.ws.column_dimensions["A"].width = self.label_width
        self.ws.column_dimensions["B"].width = 18
        self.ws.column_dimensions["C"].width = 14
        for col in "DEFGHIJKL":
            self.ws.column_dimensions[col].width = 13

    # -- text --------------------------------------------------------
    def heading(self, text: str, sub: bool = False) -> None:
        if sub and self.row > 1:
            self.row += 1
        c = self.ws.cell(self.row, 1, text)
        c.font = SUB_FONT if sub else HEAD_FONT
        self.row += 1

    def note(self, text: str, width_cols: int = 8) -> None:
        c = self.ws.cell(self.row, 1, text)
        c.font = NOTE_FONT
        c.alignment = Alignment(wrap_text=True, vertical="top")
        self.ws.merge_cells(start_row=self.row, start_column=1, end_row=self.row, end_column=width_cols)
        lines = max(1, len(text) // 110 + 1)
        self.ws.row_dimensions[self.row].height = 15 * lines
        self.row += 1

    def skip(self, n: int = 1) -> None:
        self.row += n

    # -- names ---------------------------------------------------------
    def define(self, name: str, ref: str) -> None:
        if name in self.book.defined_names:
            raise ValueError(f"defined name {name} used twice")
        self.book.defined_names[name] = DefinedName(name, attr_text=f"{self._sheet_ref()}!{ref}")
        self.names[name] = ref

    def _sheet_ref(self) -> str:
        title = self.ws.title
        return f"'{title}'" if not title.replace("_", "").isalnum() else title

    # -- inputs and results -----------------------------------------
    def input(self, label: str, name: str | None, value, unit: str, *, choices=None,
              low=None, high=None, whole=False, comment: str | None = None) -> str:
        """An input row; returns its absolute cell reference ($B$n)."""
        r = self.row
        self.ws.cell(r, 1, label).alignment = TOP
        c = self.ws.cell(r, 2, value)
        c.fill, c.font = INPUT_FILL, INPUT_FONT
        u = self.ws.cell(r, 3, unit)
        u.font = UNIT_FONT
        ref = f"$B${r}"
        if choices:
            self.validate_list(f"B{r}", choices)
        elif low is not None or high is not None:
            self.validate_range(f"B{r}", low, high, whole)
        if comment:
            c.comment = Comment(comment, "fuelsys")
        if name:
            self.define(name, ref)
        self.row += 1
        return ref

    def result(self, label: str, formula: str, unit: str, name: str | None = None,
               number_format: str | None = None) -> str:
        r = self.row
        self.ws.cell(r, 1, label).alignment = TOP  # beside a tall (wrapped) value, the label stays at its top
        c = self.ws.cell(r, 2, formula)
        c.font, c.border = RESULT_FONT, RULE
        if number_format:
            c.number_format = number_format
        self.ws.cell(r, 3, unit).font = UNIT_FONT
        ref = f"$B${r}"
        if name:
            self.define(name, ref)
        self.row += 1
        return ref

    def input_pair(self, label: str, names, values, unit: str, *, low=None, high=None,
                   comment: str | None = None) -> int:
        """An input row with two values (cold day in B, hot day in C, unit in D); returns the row."""
        r = self.row
        self.ws.cell(r, 1, label)
        for j, (name, value) in enumerate(zip(names, values), start=2):
            c = self.ws.cell(r, j, value)
            c.fill, c.font = INPUT_FILL, INPUT_FONT
            if low is not None or high is not None:
                self.validate_range(f"{col(j)}{r}", low, high)
            if name:
                self.define(name, f"${col(j)}${r}")
            if comment and j == 2:
                c.comment = Comment(comment, "fuelsys")
        self.ws.cell(r, 4, unit).font = UNIT_FONT
        self.row += 1
        return r

    def result_pair(self, label: str, names, formulas, unit: str, number_format: str | None = None) -> int:
        """A result row with two formulas (cold day in B, hot day in C, unit in D); returns the row."""
        r = self.row
        self.ws.cell(r, 1, label)
        for j, (name, formula) in enumerate(zip(names, formulas), start=2):
            c = self.ws.cell(r, j, formula)
            c.font, c.border = RESULT_FONT, RULE
            if number_format:
                c.number_format = number_format
            if name:
                self.define(name, f"${col(j)}${r}")
        self.ws.cell(r, 4, unit).font = UNIT_FONT
        self.row += 1
        return r

    def header_row(self, headers, col: int = 1) -> int:
        r = self.row
        for j, h in enumerate(headers):
            c = self.ws.cell(r, col + j, h)
            c.font = Font(bold=True, color="2F3E4E")
            c.alignment = Alignment(wrap_text=True, horizontal="center", vertical="center")
            c.border = RULE
        self.ws.row_dimensions[r].height = 32
        self.row += 1
        return r

    def cell(self, row: int, col: int, value, *, is_input: bool = False, number_format: str | None = None):
        c = self.ws.cell(row, col, value)
        if is_input:
            c.fill, c.font = INPUT_FILL, INPUT_FONT
        if number_format:
            c.number_format = number_format
        return c

    # -- validation ----------------------------------------------------
    def validate_list(self, ref: str, choices) -> None:
        text = ",".join(str(x) for x in choices)
        dv = DataValidation(type="list", formula1=f'"{text}"', allow_blank=False,
                            showErrorMessage=True, errorTitle="fuelsys",
                            error=f"Choose one of: {text}")
        self.ws.add_data_validation(dv)
        dv.add(ref)

    def validate_range(self, ref: str, low, high, whole: bool = False) -> None:
        kind = "whole" if whole else "decimal"
        if low is not None and high is not None:
            dv = DataValidation(type=kind, operator="between", formula1=str(low), formula2=str(high))
            msg = f"Enter a number from {low} to {high}"
        elif low is not None:
            dv = DataValidation(type=kind, operator="greaterThanOrEqual", formula1=str(low))
            msg = f"Enter a number of at least {low}"
        else:
            dv = DataValidation(type=kind, operator="lessThanOrEqual", formula1=str(high))
            msg = f"Enter a number of at most {high}"
        dv.showErrorMessage, dv.errorTitle, dv.error = True, "fuelsys", msg
        self.ws.add_data_validation(dv)
        dv.add(ref)


def col(n: int) -> str:
    """Column letter of 1-based column ``n``."""
    return get_column_letter(n)
