"""Shared pieces of the starter workbook's sheets: the envelope's days, where results landed, helpers.

Used by :mod:`fuelsys.sheet.starter` and :mod:`fuelsys.sheet.starter_pump`.
"""

from __future__ import annotations

from openpyxl.chart.shapes import GraphicalProperties
from openpyxl.styles import Alignment, Font

from fuelsys.sheet.layout import RULE

#: rows of every per-needle table (ring manifold, bench test): the needle count may be anything up to this
MAX_NEEDLES = 16
#: rows of the pump's bench-test table
PUMP_TEST_ROWS = 12
#: the two days of the envelope: key, label, prefix of the defined names
DAYS = (("cold", "cold day", "Cold"), ("hot", "hot day", "Hot"))
#: discharge coefficient the Combustor sheet gives a hole whose Cd cell is empty (the catalogue's default)
CD_PLAIN = 0.625
#: specific gas constant of dry air [J/(kg K)] (CIPM-2007 dry air, 28.9647 g/mol; 8.314462618 J/(mol K))
R_AIR = 287.05


class BookLayout:
    """Where things landed, so later sheets can refer to earlier ones."""

    def __init__(self, scenario):
        self.s = scenario
        self.points = len(scenario.ENGINE["points"])
        self.op_rows = []          # Engine sheet rows of the operating points (the figures as entered)
        self.day_rows = {}         # Engine sheet rows of the operating points on each day of the envelope
        self.summary = []          # (section, label, formula, unit, corner, number format) rows of the Summary
        self.verdict_ranges = []
        self.notes_ranges = []     # FS_NOTES cells, highlighted when not "ok"


def engine_cell(bk, col_letter, i):
    return f"Engine!${col_letter}${bk.op_rows[i]}"


def day_cell(bk, day, col_letter, i):
    """A cell of the Engine sheet's table for ``day`` ("cold" or "hot") at operating point ``i``."""
    return f"Engine!${col_letter}${bk.day_rows[day][i]}"


def _point_label(bk, i):
    return "idle" if i == 0 else "full power" if i == bk.points - 1 else f"point {i + 1}"


def corner_of(sheet, rng_value, rng_point, rng_day, how):
    """Formula naming the row where ``rng_value`` is largest (how="MAX") or smallest ("MIN"): "day, point"."""
    m = f"MATCH({how}({sheet}!{rng_value}),{sheet}!{rng_value},0)"
    return f'=INDEX({sheet}!{rng_day},{m})&", "&INDEX({sheet}!{rng_point},{m})'


#: series colours from the colour-blind-safe palette of Okabe & Ito (2008): blue for the cold day, vermillion for
#: the hot day (a cool/warm pair), then the palette's other hues
COLD, HOT = "0072B2", "D55E00"
PALETTE = ("009E73", "E69F00", "56B4E9", "CC79A7", "000000")


def colour_series(series, hex_rgb, marker="circle", width_emu=22000):
    """Give a chart series one colour for its line and markers."""
    series.graphicalProperties.line.solidFill = hex_rgb
    series.graphicalProperties.line.width = width_emu
    series.marker.symbol = marker
    series.marker.graphicalProperties = GraphicalProperties(solidFill=hex_rgb)
    series.marker.graphicalProperties.line.solidFill = hex_rgb
    series.smooth = False


def code_header(ws, row, labels, first_col=1):
    """Hide an array result's row of code names and put human headers (with units) in the row above it."""
    ws.row_dimensions[row].hidden = True
    for j, text in enumerate(labels, start=first_col):
        c = ws.cell(row - 1, j, text)
        c.font = Font(bold=True, color="2F3E4E")
        c.alignment = Alignment(wrap_text=True, horizontal="center", vertical="center")
        c.border = RULE
    ws.row_dimensions[row - 1].height = 32


def column_formats(ws, first_row, last_row, formats, first_col=1):
    """Number formats of an array result's columns (significant digits fit for each quantity)."""
    for j, fmt in enumerate(formats, start=first_col):
        if fmt:
            for r in range(first_row, last_row + 1):
                ws.cell(r, j).number_format = fmt


def notes_cell(w, bk, label, function, args):
    """A notes cell: FS_NOTES of one call ("ok", or each correlation used outside its range), highlighted if not ok."""
    r = w.row
    w.result(label, f'=FS_NOTES("{function}",{args})', "")
    c = w.ws.cell(r, 2)
    c.alignment = Alignment(wrap_text=True, vertical="top", horizontal="left")
    w.ws.merge_cells(start_row=r, start_column=2, end_row=r, end_column=8)
    w.ws.row_dimensions[r].height = 30
    bk.notes_ranges.append((w.ws.title, f"B{r}"))
    return r


def add_summary(bk, section, label, formula, unit="", corner="", fmt=None):
    bk.summary.append((section, label, formula, unit, corner, fmt))
