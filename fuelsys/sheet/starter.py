"""The starter workbook: a whole fuel system in one book of live formulas.

``python -m fuelsys.sheet.starter`` rebuilds ``workbook/fuelsys-starter.xlsx``
from this module and the catalogue, then computes its cached values with the
headless engine so the book opens with numbers in any spreadsheet program.  A
test fails when the committed book differs from what this module builds.

Every result cell is a formula of catalogue functions and the built-ins the
headless engine supports; every input carries its unit beside it and a
defined name, so formulas read in words.  The numbers filled in are those of
the demo engine (:mod:`fuelsys.demo`), a scenario of our own invention.
"""

from __future__ import annotations

import datetime
import sys
from pathlib import Path

from openpyxl import Workbook
from openpyxl.chart import BarChart, Reference, ScatterChart, Series
from openpyxl.formatting.rule import FormulaRule
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.workbook.properties import CalcProperties
from openpyxl.worksheet.formula import ArrayFormula

from fuelsys.sheet import catalogue
from fuelsys.sheet.layout import NOTE_FONT, SheetWriter, col

STARTER_PATH = Path(__file__).resolve().parents[2] / "workbook" / "fuelsys-starter.xlsx"
#: the demo engine's filled book, kept in examples/
EXAMPLE_PATH = Path(__file__).resolve().parents[2] / "examples" / "fuelsys-demo.xlsx"

SAFETY_LINES = (
    "Fuel under pressure, flame and fast-rotating parts can hurt people.",
    "Run engines only where local rules and your club's safety code allow it.",
    "Keep a suitable fire extinguisher at hand; store and handle fuel and gas away from ignition sources.",
    "Pressure-test the fuel system before the first run; wear eye and hearing protection;"
    " keep people out of the plane of the rotor.",
    "These results are estimates from published correlations: confirm them by bench tests,"
    " and defer to local codes, club safety rules and licensed practice.",
)


def sheet_start(wb: Workbook, bk) -> None:
    ws = wb.active
    ws.title = "Start here"
    w = SheetWriter(wb, ws, label_width=28)
    if bk.title_note == "demo":
        w.heading(f"fuelsys demo book: {bk.s.ENGINE_NAME}")
        w.note(f"A scenario of our own invention: the engine and the {bk.s.CLUB_NAME} are fictional, and so is "
               "every input figure. Use 'fuelsys new MYBOOK.xlsx' to start a book for your own engine.")
    else:
        w.heading("fuelsys fuel-system workbook")
        w.note("The shaded inputs hold the example figures of a fictional demo engine: replace them with your own.")
    w.note("This book sizes the fuel system of a small gas turbine: fuel properties, injector needles and "
           "their ring manifold, the vaporiser tubes at idle and at full power, the pump pressure and voltage, "
           "and the gas start. Every result is a live formula; change the shaded inputs and the results follow.")
    w.heading("How to use it", sub=True)
    for line in (
        "1. Shaded cells are inputs; the unit of each is in the column beside it. Lists offer the allowed choices.",
        "2. Work through the sheets from left to right: engine, fuel, needles, vaporiser, pump, gas start.",
        "3. A result that cannot be computed shows a text starting 'FS error:' that says what is wrong.",
        "4. The formulas need the fuelsys functions: in LibreOffice the fuelsys extension, in Excel the xlwings "
        "add-in; 'fuelsys recalc BOOK.xlsx' computes them anywhere and stores the numbers in the file. Single "
        "results then show in any spreadsheet program; tables (array formulas) need the functions to show.",
        "5. 'fuelsys check BOOK.xlsx' tells whether the stored numbers still match the inputs.",
        "6. The Functions sheet lists every fuelsys function with its arguments and units.",
    ):
        w.note(line)
    w.heading("Safety", sub=True)
    for line in SAFETY_LINES:
        c = ws.cell(w.row, 1, line)
        c.font = Font(bold=True, color="7A1F1F")
        w.row += 1
    w.heading("About this copy", sub=True)
    w.result("computed by", "=FS_VERSION()", "", name="ComputedBy")
    r = w.row
    ws.cell(r, 1, "built on")
    ws.cell(r, 2, datetime.date.today().isoformat())
    w.row += 1
    w.note("After changing inputs, compute the book again (your spreadsheet with the fuelsys add-in, or "
           "'fuelsys recalc BOOK.xlsx'); 'fuelsys check BOOK.xlsx' lists stored values that no longer match.")


def sheet_functions(wb: Workbook) -> None:
    ws = wb.create_sheet("Functions")
    w = SheetWriter(wb, ws, label_width=26)
    w.heading("fuelsys functions")
    w.note("Generated from the fuelsys catalogue. Optional arguments are in brackets.")
    w.header_row(["function", "call", "what it does", "arguments with units", "returns", "method"])
    ws.column_dimensions["B"].width = 44
    ws.column_dimensions["C"].width = 44
    ws.column_dimensions["D"].width = 70
    ws.column_dimensions["E"].width = 30
    ws.column_dimensions["F"].width = 50
    for spec in catalogue.functions().values():
        r = w.row
        unit = "" if spec.returns.unit == "-" else f" [{spec.returns.unit}]"
        values = [spec.name, spec.signature(), spec.summary,
                  "\n".join(a.help_text() for a in spec.args), f"{spec.returns.doc}{unit}", spec.source]
        for j, v in enumerate(values, start=1):
            c = ws.cell(r, j, v)
            c.alignment = Alignment(wrap_text=True, vertical="top")
        ws.row_dimensions[r].height = max(15, 15 * len(spec.args))
        w.row += 1
    ws.freeze_panes = "A4"
    ws.cell(2, 1).font = NOTE_FONT



# ---------------------------------------------------------------------------
# the sheets of the sizing chain

#: operating-point rows: first row of the Engine sheet's point table, filled in by sheet_engine
class _Book:
    """Where things landed, so later sheets can refer to earlier ones."""

    def __init__(self, scenario):
        self.s = scenario
        self.points = len(scenario.ENGINE["points"])
        self.op_rows = []          # Engine sheet rows of the operating points
        self.cells = {}            # named result cells for the summary: key -> "Sheet!$B$n"


def _eng(bk, col_letter, i):
    return f"Engine!${col_letter}${bk.op_rows[i]}"


def sheet_engine(wb, bk):
    e = bk.s.ENGINE
    ws = wb.create_sheet("Engine")
    w = SheetWriter(wb, ws)
    w.heading("Engine operating points")
    w.note(f"Example figures: {bk.s.ENGINE_NAME}, {bk.s.CLUB_NAME}. Replace the shaded cells with your engine's.")
    w.heading("Design point", sub=True)
    w.input("full speed", "RpmMax", e["rpm_max"], "rpm", low=1000, high=500000)
    w.input("compressor pressure ratio at full speed", "PrMax", e["pr_max"], "-", low=1, high=6)
    w.input("ambient pressure", "AmbientBar", e["ambient_bar_abs"], "bar abs", low=0.5, high=1.1)
    w.input("ambient temperature", "AmbientC", e["ambient_c"], "°C", low=-40, high=50)
    w.input("compressor isentropic efficiency", "CompressorEff", e["compressor_eff"], "-", low=0.4, high=0.9)
    w.input("combustion efficiency", "CombustionEff", e["combustion_eff"], "-", low=0.5, high=1)
    w.input("liner pressure drop", "LinerDpPct", e["liner_dp_pct"], "% of case abs", low=0.5, high=15)
    w.heading("From idle to full power", sub=True)
    w.note("Speed, air flow, turbine inlet temperature and thrust are inputs (measured, or your estimates); "
           "case pressure follows from the pressure ratio by the Euler-work similarity law, the compressor exit "
           "temperature by the isentropic relation with gamma 1.4, and the fuel from an energy balance.")
    heads = ["point", "speed [rpm]", "air flow [g/s]", "turbine inlet [°C]", "thrust [N]",
             "case [bar gauge]", "case [bar abs]", "compressor exit [°C]", "fuel [g/min]",
             "fuel per needle [g/min]", "fuel use [kg/(N·h)]"]
    w.header_row(heads)
    labels = ["idle"] + [f"point {i}" for i in range(2, bk.points)] + ["full"]
    for i, (rpm, air, t4, thrust) in enumerate(e["points"]):
        r = w.row
        bk.op_rows.append(r)
        w.cell(r, 1, labels[i])
        for j, v in enumerate((rpm, air, t4, thrust), start=2):
            w.cell(r, j, v, is_input=True)
        w.cell(r, 6, f"=FS_CASE_PRESSURE(B{r},RpmMax,PrMax,AmbientBar)", number_format="0.000")
        w.cell(r, 7, f"=F{r}+AmbientBar", number_format="0.000")
        w.cell(r, 8, f"=(AmbientC+273.15)*(1+((G{r}/AmbientBar)^(0.4/1.4)-1)/CompressorEff)-273.15",
               number_format="0.0")
        w.cell(r, 9, f"=FS_FUEL_DEMAND(C{r},H{r},D{r},FuelName,CombustionEff)", number_format="0.0")
        w.cell(r, 10, f"=I{r}/NeedleCount", number_format="0.00")
        w.cell(r, 11, f"=IF(E{r}>0,I{r}*60/1000/E{r},\"no thrust given\")", number_format="0.000")
        w.row += 1
    ws.freeze_panes = "B3"
    bk.cells["full fuel [g/min]"] = _eng(bk, "I", -1)
    bk.cells["idle fuel [g/min]"] = _eng(bk, "I", 0)
    bk.cells["full case pressure [bar gauge]"] = _eng(bk, "F", -1)


def sheet_fuel(wb, bk):
    f = bk.s.FUEL
    ws = wb.create_sheet("Fuel")
    w = SheetWriter(wb, ws)
    w.heading("Fuel")
    w.input("fuel", "FuelName", f["name"], "", choices=("kerosene",),
            comment="The built-in kerosene is a generic Jet A-1-type fuel. For your own fuel, fill in the table "
                    "at the right and point the defined name FuelName at it.")
    w.input("turbine oil in the fuel", "OilPct", f["oil_pct"], "% vol", low=0, high=20)
    w.input("fuel temperature, cold day", "ColdC", f["cold_c"], "°C", low=-40, high=60)
    w.input("fuel temperature, hot day", "HotC", f["hot_c"], "°C", low=-40, high=60)
    w.heading("Properties of the fuel with its oil", sub=True)
    w.header_row(["property", "cold day", "hot day", "unit"])
    rows = (("density", "=FS_DENSITY(FuelName,{t},OilPct)", "kg/m³", "0.0"),
            ("viscosity", "=FS_VISCOSITY(FuelName,{t},OilPct)", "mm²/s", "0.000"),
            ("specific heat", "=FS_SPECIFIC_HEAT(FuelName,{t},OilPct)", "kJ/(kg·K)", "0.000"),
            ("vapour pressure (fuel alone)", "=FS_VAPOUR_PRESSURE(FuelName,{t})", "bar abs", "0.0000"),
            ("surface tension (fuel alone)", "=FS_SURFACE_TENSION(FuelName,{t})", "mN/m", "0.00"))
    for label, fml, unit, fmt in rows:
        r = w.row
        w.cell(r, 1, label)
        w.cell(r, 2, fml.format(t="ColdC"), number_format=fmt)
        w.cell(r, 3, fml.format(t="HotC"), number_format=fmt)
        w.cell(r, 4, unit)
        w.row += 1
    w.heading("Combustion and boiling", sub=True)
    w.result("lower heating value", "=FS_HEATING_VALUE(FuelName)", "MJ/kg", number_format="0.00")
    w.result("stoichiometric fuel/air ratio", "=FS_STOICH_FAR(FuelName)", "kg/kg", name="StoichFar",
             number_format="0.0000")
    w.result("bubble point at ambient pressure", "=FS_BUBBLE_POINT(FuelName,AmbientBar)", "°C",
             number_format="0.0")
    w.result("dew point of the vapour at ambient pressure", "=FS_DEW_POINT(FuelName,AmbientBar)", "°C",
             number_format="0.0")
    # the builder's own fuel: a table of labels and values, used by pointing FuelName at it
    ws.column_dimensions["F"].width = 30
    ws.cell(1, 6, "your own fuel (optional)").font = Font(bold=True, color="2F3E4E")
    own = (("name", "my kerosene"), ("density at 15 °C [kg/m³]", 803), ("D86 10 % [°C]", 170),
           ("D86 50 % [°C]", 200), ("D86 90 % [°C]", 240), ("D86 FBP [°C]", 262),
           ("viscosity at -20 °C [mm²/s]", 4.1), ("viscosity at 40 °C [mm²/s]", 1.35),
           ("lower heating value [MJ/kg]", 43.1))
    for i, (label, value) in enumerate(own, start=2):
        ws.cell(i, 6, label)
        w.cell(i, 7, value, is_input=True)
    ws.cell(len(own) + 2, 6, "To use it, point the name FuelName at =Fuel!$F$2:$G$10 (LibreOffice: Sheet > Named "
                             "Ranges > Manage; Excel: Formulas > Name Manager)").font = NOTE_FONT


def sheet_needles(wb, bk):
    n = bk.s.NEEDLES
    ws = wb.create_sheet("Needles")
    w = SheetWriter(wb, ws)
    w.heading("Injector needles and ring manifold")
    w.input("needle gauge", "NeedleGauge", n["gauge"], "G (ISO 9626)", choices=tuple(range(14, 34)))
    w.input("wall class", "NeedleWall", n["wall"], "", choices=("normal", "thin", "extra-thin"))
    w.input("needles (one per vaporiser tube)", "NeedleCount", n["count"], "-", low=1, high=24, whole=True)
    w.input("needle length", "NeedleLengthMm", n["length_mm"], "mm", low=1, high=300)
    w.input("measured bore (leave empty to use the standard's)", "MeasuredBoreMm", None, "mm", low=0.05, high=5)
    w.result("bore used", "=IF(ISNUMBER(MeasuredBoreMm),MeasuredBoreMm,FS_NEEDLE_BORE(NeedleGauge,NeedleWall))",
             "mm", name="NeedleBoreMm", number_format="0.000")
    w.result("outside diameter", "=FS_NEEDLE_OD(NeedleGauge)", "mm", name="NeedleOdMm", number_format="0.000")
    w.result("chosen", '=NeedleCount&" needles of "&NeedleGauge&" G "&NeedleWall&" wall, bore "'
                       '&ROUND(NeedleBoreMm,3)&" mm, "&NeedleLengthMm&" mm long"', "")
    bk.cells["needles"] = f"Needles!$B${w.row - 1}"
    w.heading("Each needle at each operating point", sub=True)
    w.header_row(["point", "flow [g/min]", "Δp cold day [bar]", "Δp hot day [bar]", "Reynolds, cold",
                  "jet velocity, cold [m/s]", "supply [bar gauge]"])
    first = w.row
    for i in range(bk.points):
        r = w.row
        w.cell(r, 1, f"={_eng(bk, 'A', i)}")
        w.cell(r, 2, f"={_eng(bk, 'J', i)}", number_format="0.00")
        w.cell(r, 3, f"=FS_NEEDLE_DP(NeedleBoreMm,NeedleLengthMm,B{r},FuelName,ColdC,OilPct)", number_format="0.000")
        w.cell(r, 4, f"=FS_NEEDLE_DP(NeedleBoreMm,NeedleLengthMm,B{r},FuelName,HotC,OilPct)", number_format="0.000")
        w.cell(r, 5, f"=FS_NEEDLE_REYNOLDS(NeedleBoreMm,B{r},FuelName,ColdC,OilPct)", number_format="0")
        w.cell(r, 6, f"=FS_NEEDLE_VELOCITY(NeedleBoreMm,B{r},FuelName,ColdC,OilPct)", number_format="0.00")
        w.cell(r, 7, f"=C{r}+{_eng(bk, 'F', i)}", number_format="0.000")
        w.row += 1
    bk.needle_rows = list(range(first, w.row))
    bk.cells["flow per needle at full power [g/min]"] = f"Needles!$B${w.row - 1}"
    bk.cells["needle Δp at full power, cold day [bar]"] = f"Needles!$C${w.row - 1}"
    bk.cells["needle Δp at idle, hot day [bar]"] = f"Needles!$D${first}"

    w.heading("Flow against pressure drop (for the chart)", sub=True)
    w.header_row(["Δp [bar]", "flow cold [g/min]", "flow hot [g/min]"])
    chart_first = w.row
    for k, dp in enumerate((0.1, 0.25, 0.5, 0.75, 1.0, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0)):
        r = w.row
        w.cell(r, 1, dp, is_input=True)
        w.cell(r, 2, f"=FS_NEEDLE_FLOW(NeedleBoreMm,NeedleLengthMm,A{r},FuelName,ColdC,OilPct)", number_format="0.0")
        w.cell(r, 3, f"=FS_NEEDLE_FLOW(NeedleBoreMm,NeedleLengthMm,A{r},FuelName,HotC,OilPct)", number_format="0.0")
        w.row += 1
    bk.needle_chart = (chart_first, w.row - 1)

    w.heading("Ring manifold at full power, cold day", sub=True)
    w.input("ring tube bore", "RingBoreMm", n["ring_bore_mm"], "mm", low=0.5, high=20)
    w.input("ring centre-line diameter", "RingDiaMm", n["ring_dia_mm"], "mm", low=10, high=500)
    full_supply = f"G{bk.needle_rows[-1]}"
    w.result("supply pressure at the feed", f"={full_supply}", "bar gauge", name="RingSupplyBar",
             number_format="0.000")
    w.note(f"Needle bores in order round the ring from the feed (a measured bore per needle is better). The table "
           f"holds {int(bk.s.NEEDLES['count'])} rows: for another needle count add or remove rows and widen the "
           "formula's range.")
    w.header_row(["needle", "bore [mm]", "flow [g/min]", "against mean [%]"])
    first = w.row
    count = int(bk.s.NEEDLES["count"])
    last = first + count - 1
    for k in range(count):
        r = first + k
        w.cell(r, 1, k + 1)
        w.cell(r, 2, "=NeedleBoreMm", number_format="0.000")
    formula = (f"=FS_MANIFOLD_SPLIT(B{first}:B{last},NeedleLengthMm,RingSupplyBar,{_eng(bk, 'F', -1)},"
               f"RingBoreMm,RingDiaMm,FuelName,ColdC,OilPct)")
    ws[f"C{first}"] = ArrayFormula(f"C{first}:C{last}", formula)
    for k in range(count):
        r = first + k
        w.cell(r, 4, f"=(C{r}/AVERAGE(C${first}:C${last})-1)*100", number_format="0.00")
    w.row = last + 1
    bk.cells["ring: largest needle deviation [%]"] = f"Needles!$B${w.row}"
    w.result("largest deviation from the mean", f"=MAX(ABS(MAX(D{first}:D{last})),ABS(MIN(D{first}:D{last})))",
             "%", number_format="0.00")

    w.heading("Tolerance study at full power, cold day", sub=True)
    w.input("bore tolerance (half band)", "BoreTolMm", n["bore_tol_mm"], "mm", low=0, high=0.5)
    w.input("length tolerance (half band)", "LengthTolMm", n["length_tol_mm"], "mm", low=0, high=20)
    r = w.row
    formula = (f"=FS_TOLERANCE_SPREAD(NeedleGauge,NeedleWall,NeedleCount,NeedleLengthMm,C{bk.needle_rows[-1]},"
               f"FuelName,ColdC,BoreTolMm,LengthTolMm,2000,1,OilPct,NeedleBoreMm)")
    ws[f"A{r}"] = ArrayFormula(f"A{r}:C{r + 12}", formula)
    bk.cells["tolerance: spread between needles (CV) [%]"] = f"Needles!$B${r + 4}"
    w.row = r + 13

    w.heading("Bench test of the needles", sub=True)
    (vol_time, dp, temp), vols = n["bench"]
    w.input("collection time", "BenchTimeS", vol_time, "s", low=1, high=3600)
    w.input("test pressure drop", "BenchDpBar", dp, "bar", low=0.05, high=20)
    w.input("test liquid temperature", "BenchTempC", temp, "°C", low=0, high=60)
    w.input("test liquid", "BenchFluid", "water", "", choices=("water", "kerosene"))
    w.note(f"One row per needle ({len(vols)} rows); add or remove rows, and widen the check's range, for another set.")
    w.header_row(["needle", "collected [mL]", "effective bore [mm]", "against median [%]", "check"])
    first = w.row
    last = first + len(vols) - 1
    for k, v in enumerate(vols):
        r = first + k
        w.cell(r, 1, k + 1)
        w.cell(r, 2, v, is_input=True)
        w.cell(r, 3, f"=FS_BORE_FROM_TEST(B{r},BenchTimeS,BenchDpBar,NeedleLengthMm,BenchFluid,BenchTempC)",
               number_format="0.0000")
    ws[f"D{first}"] = ArrayFormula(f"D{first}:E{last}", f"=FS_ODD_NEEDLES(B{first}:B{last},5)")
    bk.verdict_ranges.append(("Needles", f"E{first}:E{last}"))
    w.row = last + 1

    chart = ScatterChart()
    chart.title = "Needle flow against pressure drop"
    chart.x_axis.title = "pressure drop [bar]"
    chart.y_axis.title = "flow per needle [g/min]"
    chart.style = 13
    a, b = bk.needle_chart
    xs = Reference(ws, min_col=1, min_row=a, max_row=b)
    for colno, name in ((2, "cold day"), (3, "hot day")):
        ser = Series(Reference(ws, min_col=colno, min_row=a, max_row=b), xs, title=name)
        ser.marker.symbol = "circle"
        chart.series.append(ser)
    chart.height, chart.width = 8, 14
    ws.add_chart(chart, "I3")


def sheet_vaporiser(wb, bk):
    v = bk.s.VAPORISER
    ws = wb.create_sheet("Vaporiser")
    w = SheetWriter(wb, ws, label_width=30)
    w.heading("Vaporiser tubes")
    w.note("One tube per needle. Air enters from the liner pressure drop; the needle's fuel is heated by the "
           "tube wall. Equilibrium and droplet checks are shown side by side; the verdict gives the reasons.")
    w.input("tube bore", "TubeBoreMm", v["tube_bore_mm"], "mm", low=1, high=40)
    w.input("heated length", "TubeLengthMm", v["heated_length_mm"], "mm", low=5, high=600)
    w.input("tube wall temperature", "WallC", v["wall_c"], "°C", low=0, high=1100)
    w.input("tube inlet discharge coefficient", "TubeCd", v["cd"], "-", low=0.3, high=1)
    w.input("tube shape", "TubeShape", v.get("shape", "straight"), "", choices=("straight", "return"),
            comment="straight: one heated leg; return: a second leg of the same length after a 180° bend, "
                    "the outlet facing the front of the combustor")
    items = (("vaporised_pct", "vaporised [%]", "0.0"), ("exit_c", "exit [°C]", "0.0"),
             ("dew_margin_k", "above dew point [K]", "0.0"), ("residence_ms", "residence [ms]", "0.00"),
             ("droplet_life_ms", "droplet life [ms]", "0.0"), ("tube_phi", "tube φ [-]", "0.00"),
             ("exit_velocity_m_s", "exit velocity [m/s]", "0.0"), ("flashback_margin", "velocity / flame speed", "0.0"),
             ("max_wet_wall_c", "hottest wet wall [°C]", "0"), ("oil_residue_g_h", "oil left [g/h]", "0.0"),
             ("dp_mbar", "tube Δp [mbar]", "0.0"), ("verdict", "verdict", None))
    w.header_row(["point", "air per tube [g/s]", "fuel per tube [g/min]"] + [h for _, h, _ in items])
    first = w.row
    for i in range(bk.points):
        r = w.row
        w.cell(r, 1, f"={_eng(bk, 'A', i)}")
        w.cell(r, 2, f"=FS_TUBE_AIR(TubeBoreMm,LinerDpPct,{_eng(bk, 'G', i)},{_eng(bk, 'H', i)},TubeCd)",
               number_format="0.000")
        w.cell(r, 3, f"={_eng(bk, 'J', i)}", number_format="0.00")
        for j, (item, _, fmt) in enumerate(items, start=4):
            w.cell(r, j, f"=FS_VAPORISER(TubeBoreMm,TubeLengthMm,C{r},B{r},{_eng(bk, 'G', i)},{_eng(bk, 'H', i)},"
                         f"WallC,FuelName,OilPct,\"{item}\",TubeShape)", number_format=fmt)
        w.row += 1
    bk.vap_rows = list(range(first, w.row))
    verdict_col = col(3 + len(items))
    bk.verdict_ranges.append(("Vaporiser", f"{verdict_col}{first}:{verdict_col}{w.row - 1}"))
    ws.column_dimensions[verdict_col].width = 90
    for cc in range(first, w.row):
        ws[f"{verdict_col}{cc}"].alignment = Alignment(wrap_text=True, vertical="top")
        # a fixed height, so every spreadsheet program places the charts below where this book says
        ws.row_dimensions[cc].height = 64
    bk.cells["vaporiser verdict at idle"] = f"Vaporiser!${verdict_col}${first}"
    bk.cells["vaporiser verdict at full power"] = f"Vaporiser!${verdict_col}${w.row - 1}"
    bk.cells["vaporised at idle [%]"] = f"Vaporiser!$D${first}"
    bk.cells["vaporised at full power [%]"] = f"Vaporiser!$D${w.row - 1}"
    bk.cells["above the dew point at idle [K]"] = f"Vaporiser!$F${first}"
    bk.cells["above the dew point at full power [K]"] = f"Vaporiser!$F${w.row - 1}"

    # profiles along the tube at idle and at full power
    profiles = []
    for label, i in (("idle", 0), ("full power", bk.points - 1)):
        w.heading(f"Along the tube at {label}", sub=True)
        r = w.row
        vr = first + i
        formula = (f"=FS_VAPORISER_PROFILE(TubeBoreMm,TubeLengthMm,C{vr},B{vr},{_eng(bk, 'G', i)},"
                   f"{_eng(bk, 'H', i)},WallC,FuelName,OilPct,11,TubeShape)")
        ws[f"A{r}"] = ArrayFormula(f"A{r}:E{r + 11}", formula)
        profiles.append((label, r))
        w.row = r + 12
    for title, colno, axis in (("Vaporised fuel along the tube", 4, "vaporised [%]"),
                               ("Gas temperature along the tube", 2, "gas temperature [°C]")):
        chart = ScatterChart()
        chart.title = title
        chart.x_axis.title = "position from the inlet [mm]"
        chart.y_axis.title = axis
        chart.style = 13
        for label, r in profiles:
            xs = Reference(ws, min_col=1, min_row=r + 1, max_row=r + 11)
            ser = Series(Reference(ws, min_col=colno, min_row=r + 1, max_row=r + 11), xs, title=label)
            ser.marker.symbol = "circle"
            chart.series.append(ser)
        chart.height, chart.width = 7.5, 13
        ws.add_chart(chart, f"G{profiles[0][1] if colno == 4 else profiles[0][1] + 16}")


def sheet_combustor(wb, bk):
    ws = wb.create_sheet("Combustor")
    w = SheetWriter(wb, ws)
    w.heading("Combustor air split and zone temperatures")
    w.note("Every liner opening sees the same pressure drop, so the air divides by effective area (holes x Cd x "
           "area). The primary zone gets the vaporiser tubes' air and the primary holes'; the fuel burned is the "
           "fuel flow times the combustion efficiency, as in the engine's fuel demand.")
    w.note("One row per zone name; the shares below are found by these names.")
    w.header_row(["zone", "holes", "diameter [mm]", "Cd (empty: plain hole)", "", "zone", "air share [-]"])
    first = w.row
    openings = bk.s.COMBUSTOR["openings"]
    for k, (zone, count, dia) in enumerate(openings):
        r = first + k
        w.cell(r, 1, zone, is_input=True)
        tube = dia is None  # the vaporiser tubes' inlets: count, bore and Cd from the needles and tube sheets
        w.cell(r, 2, "=NeedleCount" if tube else count, is_input=not tube)
        w.cell(r, 3, "=TubeBoreMm" if tube else dia, is_input=not tube, number_format="0.00")
        w.cell(r, 4, "=TubeCd" if tube else None, is_input=not tube)
    last = first + len(openings) - 1
    ws[f"F{first}"] = ArrayFormula(f"F{first}:G{last}",
                                   f"=FS_ZONE_AIR(B{first}:B{last},C{first}:C{last},D{first}:D{last},"
                                   f"A{first}:A{last})")
    w.row = last + 1
    # found by the zone names typed in column A (one row per zone), whose order FS_ZONE_AIR keeps
    share = f"INDEX($G${first}:$G${last},MATCH(\"{{}}\",$A${first}:$A${last},0))"
    w.result("tubes' share", "=" + share.format("tubes"), "-", name="TubeShare", number_format="0.000")
    w.result("primary share (tubes + primary holes)", "=TubeShare+" + share.format("primary"), "-",
             name="PrimaryShare", number_format="0.000")
    w.result("secondary share", "=" + share.format("secondary"), "-", name="SecondaryShare", number_format="0.000")
    bk.cells["primary-zone air share [-]"] = f"Combustor!$B${w.row - 2}"
    w.heading("From idle to full power", sub=True)
    w.note("Primary φ counts all the fuel; the secondary zone and the exit count the fuel burned (fuel x "
           "combustion efficiency), so the exit comes back to the turbine inlet the fuel demand was set for. The "
           "last two columns check the liner against the engine: the air the openings pass at the set liner "
           "pressure drop (from the tubes' air), and the drop that would pass the engine's air.")
    w.header_row(["point", "fuel burned [g/min]", "primary φ", "primary flame [°C]", "secondary φ (burned)",
                  "secondary zone [°C]", "exit, mixed out [°C]", "turbine inlet set [°C]", "exit - set [K]",
                  "liner air at set Δp [g/s]", "Δp for engine air [%]"])
    op_first = w.row
    for i in range(bk.points):
        r = w.row
        air, t3, p3 = _eng(bk, "C", i), _eng(bk, "H", i), _eng(bk, "G", i)
        w.cell(r, 1, f"={_eng(bk, 'A', i)}")
        w.cell(r, 2, f"={_eng(bk, 'I', i)}*CombustionEff", number_format="0.0")
        w.cell(r, 3, f"=FS_ZONE_PHI({_eng(bk, 'I', i)},{air},PrimaryShare,FuelName)", number_format="0.000")
        w.cell(r, 4, f"=FS_FLAME_TEMP(FuelName,C{r},{t3},{p3})", number_format="0")
        w.cell(r, 5, f"=FS_ZONE_PHI(B{r},{air},PrimaryShare+SecondaryShare,FuelName)", number_format="0.000")
        w.cell(r, 6, f"=FS_FLAME_TEMP(FuelName,E{r},{t3},{p3},\"complete\")", number_format="0")
        # hot stream: the secondary zone's gas (its air plus the fuel burned), mixed with the dilution air
        w.cell(r, 7, f"=FS_MIX_TEMP(F{r},{air}*(PrimaryShare+SecondaryShare)+B{r}/60,{t3},{air}*(1-PrimaryShare-"
                     f"SecondaryShare),B{r}/60/({air}*(PrimaryShare+SecondaryShare)),FuelName)", number_format="0")
        w.cell(r, 8, f"={_eng(bk, 'D', i)}", number_format="0")
        w.cell(r, 9, f"=G{r}-H{r}", number_format="0.0")
        w.cell(r, 10, f"=Vaporiser!B{bk.vap_rows[i]}*NeedleCount/TubeShare", number_format="0.0")
        # orifice flow goes as the root of the pressure drop (incompressible, Lefebvre & Ballal ch. 4)
        w.cell(r, 11, f"=LinerDpPct*({air}/J{r})^2", number_format="0.00")
        w.row += 1
    op_last = w.row - 1
    bk.cells["primary flame at full power [°C]"] = f"Combustor!$D${op_last}"
    bk.cells["primary φ at full power"] = f"Combustor!$C${op_last}"
    bk.cells["liner Δp that passes the engine's air at full power [%]"] = f"Combustor!$K${op_last}"

    bars = BarChart()
    bars.title = "Air share by zone"
    bars.y_axis.title = "share of the liner air [-]"
    bars.add_data(Reference(ws, min_col=7, min_row=first, max_row=last), titles_from_data=False)
    bars.set_categories(Reference(ws, min_col=6, min_row=first, max_row=last))
    bars.legend = None
    bars.height, bars.width = 7, 11
    ws.add_chart(bars, "M3")
    temps = ScatterChart()
    temps.title = "Zone temperatures from idle to full power"
    temps.x_axis.title = "shaft speed [rpm]"
    temps.y_axis.title = "temperature [°C]"
    temps.style = 13
    speeds = Reference(wb["Engine"], min_col=2, min_row=bk.op_rows[0], max_row=bk.op_rows[-1])
    for colno, name in ((4, "primary flame"), (6, "secondary zone"), (7, "exit")):
        ser = Series(Reference(ws, min_col=colno, min_row=op_first, max_row=op_last), speeds, title=name)
        ser.marker.symbol = "circle"
        temps.series.append(ser)
    temps.height, temps.width = 8, 14
    ws.add_chart(temps, "M18")


def sheet_pump(wb, bk):
    p = bk.s.PUMP
    ws = wb.create_sheet("Pump")
    w = SheetWriter(wb, ws)
    w.heading("Fuel lines and pump")
    w.input("line bore", "LineBoreMm", p["line_bore_mm"], "mm", low=0.5, high=20)
    w.input("line length", "LineLengthM", p["line_length_m"], "m", low=0.01, high=20)
    w.input("filter, valve and fitting loss coefficients (sum)", "LineK", p["k_total"], "-", low=0, high=500)
    w.input("injectors above the tank", "HeadM", p["head_m"], "m", low=-5, high=5)
    w.input("manoeuvre load factor", "GLoad", p["g_load"], "g", low=0, high=20)
    w.input("margin on the pressure needed", "MarginPct", p["margin_pct"], "%", low=0, high=200)
    w.input("battery voltage under load", "BatteryV", p["battery_v"], "V", low=1, high=60)
    w.heading("Bench test points of the pump", sub=True)
    w.header_row(["point", "flow [g/min]", "outlet [bar gauge]", "volts [V]", "fuel [°C]"])
    first = w.row
    for k, row in enumerate(p["tests"]):
        r = first + k
        w.cell(r, 1, k + 1)
        for j, v in enumerate(row, start=2):
            w.cell(r, j, v, is_input=True)
    last = first + len(p["tests"]) - 1
    w.row = last + 1
    w.heading("Pump fit", sub=True)
    r = w.row
    formula = f"=FS_PUMP_FIT(B{first}:B{last},C{first}:C{last},D{first}:D{last},FuelName,E{first}:E{last},,,OilPct)"
    ws[f"A{r}"] = ArrayFormula(f"A{r}:O{r + 1}", formula)
    w.define("PumpFit", f"$A${r}:$O${r + 1}")
    w.row = r + 2
    w.heading("Along the operating line, cold day", sub=True)
    w.header_row(["point", "fuel [g/min]", "case [bar gauge]", "needles [bar]", "line [bar]",
                  "pump outlet needed [bar gauge]", "volts needed [V]", "headroom [V]", "check"])
    op_first = w.row
    for i in range(bk.points):
        r = w.row
        w.cell(r, 1, f"={_eng(bk, 'A', i)}")
        w.cell(r, 2, f"={_eng(bk, 'I', i)}", number_format="0.0")
        w.cell(r, 3, f"={_eng(bk, 'F', i)}", number_format="0.000")
        w.cell(r, 4, f"=Needles!C{bk.needle_rows[i]}", number_format="0.000")
        w.cell(r, 5, f"=FS_LINE_DP(LineBoreMm,LineLengthM,B{r},FuelName,ColdC,LineK,OilPct)", number_format="0.000")
        w.cell(r, 6, f"=FS_PUMP_NEED(B{r},C{r},D{r},E{r},HeadM,GLoad,MarginPct,FuelName,ColdC,OilPct)",
               number_format="0.000")
        w.cell(r, 7, f"=FS_PUMP_VOLTS(PumpFit,B{r},F{r},FuelName,ColdC,OilPct)", number_format="0.00")
        w.cell(r, 8, f"=BatteryV-G{r}", number_format="0.00")
        w.cell(r, 9, f"=IF(ISNUMBER(G{r}),IF(H{r}>=0,\"ok\",\"fails: short by \"&ROUND(-H{r},2)&\" V\"),G{r})")
        w.row += 1
    op_last = w.row - 1
    bk.verdict_ranges.append(("Pump", f"I{op_first}:I{op_last}"))
    bk.cells["pump outlet needed at full power [bar gauge]"] = f"Pump!$F${op_last}"
    bk.cells["pump volts at idle [V]"] = f"Pump!$G${op_first}"
    bk.cells["pump volts at full power [V]"] = f"Pump!$G${op_last}"
    bk.cells["battery headroom at full power [V]"] = f"Pump!$H${op_last}"
    bk.cells["pump check at full power"] = f"Pump!$I${op_last}"

    w.heading("Pump curves at several voltages (for the chart)", sub=True)
    volts = (3.0, 5.0, 7.0, 9.0)
    w.header_row(["outlet [bar gauge]"] + [f"flow at {v:g} V [g/min]" for v in volts])
    c_first = w.row
    for k, pr in enumerate((0.0, 1.0, 2.0, 3.0, 4.0, 5.0, 6.0)):
        r = w.row
        w.cell(r, 1, pr, is_input=True)
        for j, v in enumerate(volts, start=2):
            w.cell(r, j, f"=FS_PUMP_FLOW(PumpFit,{v},A{r},FuelName,ColdC,OilPct)", number_format="0.0")
        w.row += 1
    c_last = w.row - 1
    chart = ScatterChart()
    chart.title = "Pump curves and the system's need (cold day)"
    chart.x_axis.title = "fuel flow [g/min]"
    chart.y_axis.title = "pump outlet [bar gauge]"
    chart.style = 13
    ys = Reference(ws, min_col=1, min_row=c_first, max_row=c_last)
    for j, v in enumerate(volts, start=2):
        ser = Series(ys, Reference(ws, min_col=j, min_row=c_first, max_row=c_last), title=f"pump at {v:g} V")
        chart.series.append(ser)
    need = Series(Reference(ws, min_col=6, min_row=op_first, max_row=op_last),
                  Reference(ws, min_col=2, min_row=op_first, max_row=op_last), title="system need")
    need.marker.symbol = "diamond"
    need.marker.size = 8
    chart.series.append(need)
    chart.x_axis.number_format = "0"
    chart.x_axis.majorUnit = 50
    chart.height, chart.width = 11, 20
    ws.add_chart(chart, "Q3")


def sheet_gas(wb, bk):
    g = bk.s.GAS
    ws = wb.create_sheet("Gas start")
    w = SheetWriter(wb, ws)
    w.heading("Gas start")
    w.input("gas", "GasName", g["gas"], "", choices=("propane", "lpg-70-30", "lpg-60-40", "butane", "isobutane"))
    w.input("canister temperature at the start", "CanisterC", bk.s.ENGINE["ambient_c"], "°C", low=-30, high=50)
    w.result("canister pressure", "=FS_CANISTER_PRESSURE(GasName,CanisterC)", "bar gauge", name="CanisterBar",
             number_format="0.00")
    w.input("pressure before the jet (regulated)", "JetUpBar", g["line_bar_abs"], "bar abs", low=0.1, high=30)
    w.input("jet bore", "JetBoreMm", g["jet_bore_mm"], "mm", low=0.05, high=5)
    w.input("jet length", "JetLengthMm", g["jet_length_mm"], "mm", low=0, high=500)
    w.result("gas flow at the start (into the case at idle pressure)",
             f"=FS_GAS_JET_FLOW(JetBoreMm,JetLengthMm,JetUpBar,{_eng(bk, 'G', 0)},GasName,CanisterC)",
             "g/min", name="GasFlow", number_format="0.00")
    w.result("regulator check", "=IF(CanisterBar+AmbientBar>JetUpBar,\"ok\",\"fails: canister below regulated pressure\")",
             "", name="GasCheck")
    bk.verdict_ranges.append(("Gas start", f"B{w.row - 1}"))
    bk.cells["gas flow at the start [g/min]"] = f"'Gas start'!$B${w.row - 2}"
    bk.cells["gas start check"] = f"'Gas start'!$B${w.row - 1}"
    w.heading("Canister over a run", sub=True)
    w.input("liquid gas in the canister", "GasLiquidG", g["liquid_g"], "g", low=1, high=20000)
    w.input("empty canister mass", "GasShellG", g["shell_g"], "g", low=0, high=20000)
    w.input("length of the run", "GasMinutes", g["flow_minutes"], "min", low=0.1, high=600)
    r = w.row
    formula = "=FS_CANISTER_CHILL(GasName,GasLiquidG,GasShellG,GasFlow,GasMinutes,CanisterC,\"steel\",JetUpBar,11)"
    ws[f"A{r}"] = ArrayFormula(f"A{r}:F{r + 11}", formula)
    bk.verdict_ranges.append(("Gas start", f"F{r + 1}:F{r + 11}"))
    bk.cells["canister pressure at the end of the run [bar abs]"] = f"'Gas start'!$C${r + 11}"
    w.row = r + 12
    chart = ScatterChart()
    chart.title = "Canister pressure over the run"
    chart.x_axis.title = "minutes"
    chart.y_axis.title = "pressure [bar abs]"
    chart.style = 13
    ser = Series(Reference(ws, min_col=3, min_row=r + 1, max_row=r + 11),
                 Reference(ws, min_col=1, min_row=r + 1, max_row=r + 11), title="canister")
    ser.marker.symbol = "circle"
    chart.series.append(ser)
    chart.height, chart.width = 7.5, 13
    ws.add_chart(chart, "H3")


def sheet_summary(wb, bk):
    ws = wb.create_sheet("Summary", 1)
    w = SheetWriter(wb, ws, label_width=48)
    w.heading("Summary of the sizing")
    w.note("Key results, linked from the sheets. Verdict cells are highlighted.")
    ws.column_dimensions["B"].width = 60
    for label, ref in bk.cells.items():
        r = w.row
        w.result(label, f"={ref}", "", number_format="0.00")
        ws[f"B{r}"].alignment = Alignment(wrap_text=True, vertical="top", horizontal="left")
        if "verdict" in label or "check" in label:
            bk.verdict_ranges.append(("Summary", f"B{r}"))
    for line in SAFETY_LINES[-1:]:
        w.skip()
        c = ws.cell(w.row, 1, line)
        c.font = Font(bold=True, color="7A1F1F")


def _show_axes(wb) -> None:
    """Mark both axes of every chart as shown: openpyxl writes no "delete" flag, and some readers then hide them."""
    for ws in wb.worksheets:
        for chart in ws._charts:
            for axis in (chart.x_axis, chart.y_axis):
                axis.delete = False
            chart.x_axis.axPos = "b"  # the horizontal axis along the bottom (openpyxl's default says left)


def _verdict_formatting(wb, bk):
    green = PatternFill("solid", fgColor="D5EDD9")
    amber = PatternFill("solid", fgColor="FBE8C8")
    red = PatternFill("solid", fgColor="F4CCCC")
    for sheet, rng in bk.verdict_ranges:
        ws = wb[sheet]
        top_left = rng.split(":")[0]
        for text, fill in (("ok", green), ("good", green), ("yes", green), ("marginal", amber), ("fail", red),
                           ("poor", red), ("ODD", red), ("no", red), ("empty", red), ("FS error", red)):
            ws.conditional_formatting.add(
                rng, FormulaRule(formula=[f'LEFT({top_left},{len(text)})="{text}"'], fill=fill, stopIfTrue=True))


SECTIONS = (sheet_start, sheet_engine, sheet_fuel, sheet_needles, sheet_vaporiser, sheet_combustor, sheet_pump,
            sheet_gas,
            sheet_summary)


def build(path: Path | str = STARTER_PATH, compute: bool = True, scenario=None, title_note: str = "starter",
          progress=None, reports: list | None = None) -> Path:
    """Build the starter book at ``path`` and compute its cached values.

    ``scenario`` is a module or object with the attributes of
    :mod:`fuelsys.demo` (the default); ``title_note`` "demo" titles the book as
    the demo engine's.
    """
    path = Path(path)
    from fuelsys import demo

    wb = Workbook()
    bk = _Book(scenario or demo)
    bk.verdict_ranges = []
    bk.title_note = title_note
    for section in SECTIONS:
        section(wb, bk)
    sheet_functions(wb)
    _verdict_formatting(wb, bk)
    _show_axes(wb)
    # the book carries computed values: ask spreadsheet programs to show them rather than recompute on
    # open (a program without the fuelsys functions would replace every one with #NAME?); calcId is
    # that of a current Excel engine, which otherwise recomputes books stamped by an older one
    wb.calculation = CalcProperties(calcId=191029, fullCalcOnLoad=False)
    stamp = datetime.datetime.combine(datetime.date.today(), datetime.time())
    wb.properties.creator = "fuelsys"
    wb.properties.created = wb.properties.modified = stamp
    wb.properties.title = "fuelsys fuel-system workbook"
    path.parent.mkdir(parents=True, exist_ok=True)
    wb.save(path)
    if compute:
        from fuelsys.sheet.evaluate import recalc_workbook

        report = recalc_workbook(path, progress=progress)
        if reports is not None:
            reports.append(report)
        if getattr(report, "skipped", None):
            raise RuntimeError(f"the starter book did not compute completely: {report.skipped}")
        from fuelsys.sheet.xlsx import read_book

        broken = {(sh.name, rc): v for sh in read_book(path).sheets for rc, v in sh.cells.items()
                  if isinstance(v, str) and v.startswith("FS error: internal error")}
        if broken:  # a bug, not a user's input: never ship a book that shows one
            raise RuntimeError(f"the starter book shows internal errors: {sorted(broken.items())[:3]}")
    return path


def main(argv=None) -> int:
    for out in (build(), build(EXAMPLE_PATH, title_note="demo")):
        print(f"wrote {out}")
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
