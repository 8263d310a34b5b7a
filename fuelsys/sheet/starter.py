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
        "2. Enter the operating envelope first (Envelope sheet): the cold day and the hot day, with the fuel's "
        "temperature at the pump and at the ring and the gas canister's. Every sheet computes its checks at the "
        "corners that matter to it, and the Summary names the corner that limits each one.",
        "3. Then work through the sheets from left to right: engine, fuel, needles, vaporiser, combustor, pump, "
        "gas start.",
        "4. A result that cannot be computed shows a text starting 'FS error:' that says what is wrong.",
        "5. The formulas need the fuelsys functions: in LibreOffice the fuelsys extension, in Excel the xlwings "
        "add-in; 'fuelsys recalc BOOK.xlsx' computes them anywhere and stores the numbers in the file. Single "
        "results then show in any spreadsheet program; tables (array formulas) need the functions to show.",
        "6. 'fuelsys check BOOK.xlsx' tells whether the stored numbers still match the inputs.",
        "7. The Functions sheet lists every fuelsys function with its arguments and units.",
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
        widths = (26, 44, 44, 70, 30, 50)
        lines = max(sum(len(part) // max(1, int(wd * 1.05)) + 1 for part in str(v).split("\n"))
                    for v, wd in zip(values, widths))
        ws.row_dimensions[r].height = min(409, 15 * lines)
        w.row += 1
    ws.freeze_panes = "A4"
    ws.print_title_rows = "3:3"
    ws.cell(2, 1).font = NOTE_FONT



# ---------------------------------------------------------------------------
# the sheets of the sizing chain

from fuelsys.sheet.starter_parts import (  # noqa: E402  (shared with the pump sheets)
    COLD, DAYS, HOT, MAX_NEEDLES, PALETTE, PUMP_TEST_ROWS, CD_PLAIN, R_AIR, BookLayout, add_summary, code_header,
    colour_series, day_cell, engine_cell, column_formats, notes_cell)
from fuelsys.sheet.starter_pump import sheet_gas, sheet_pump  # noqa: E402


def sheet_envelope(wb, bk):
    env = bk.s.ENVELOPE
    ws = wb.create_sheet("Envelope")
    w = SheetWriter(wb, ws, label_width=58)
    w.heading("Operating envelope: the cold day and the hot day")
    w.note("Entered once: every sheet takes its corners from here. The engine's figures (Engine sheet) are "
           "carried to each day at the same speed and turbine inlet temperature; the needles, vaporiser tubes, "
           "combustor and pump are computed at every operating point on both days, and the gas start with the "
           "cold canister. The Summary names the corner that limits each check.")
    w.header_row(["", "cold day", "hot day", "unit"])
    c, h = env["cold"], env["hot"]
    w.input_pair("air temperature", ("ColdAmbC", "HotAmbC"), (c["ambient_c"], h["ambient_c"]), "°C",
                 low=-40, high=55)
    r_elev = w.input_pair("field elevation", ("ColdElevM", "HotElevM"), (c["elevation_m"], h["elevation_m"]),
                          "m", low=-400, high=5000)
    r_pin = w.input_pair("ambient pressure, measured (leave empty to use the elevation)", (None, None),
                         (c["ambient_bar_abs"], h["ambient_bar_abs"]), "bar abs", low=0.5, high=1.1)
    # ISA (ISO 2533) below 11 km: p = 101325 (1 - 2.25577e-5 h)^5.25588
    w.result_pair("ambient pressure used", ("ColdAmbBar", "HotAmbBar"),
                  [f"=IF(ISNUMBER({k}{r_pin}),{k}{r_pin},1.01325*(1-0.0000225577*{k}{r_elev})^5.25588)"
                   for k in "BC"], "bar abs", number_format="0.0000")
    w.input_pair("fuel at the pump (the tank's temperature)", ("ColdPumpC", "HotPumpC"),
                 (c["pump_fuel_c"], h["pump_fuel_c"]), "°C", low=-40, high=80)
    w.input_pair("fuel at the ring and needles (warmed by the case)", ("ColdRingC", "HotRingC"),
                 (c["ring_fuel_c"], h["ring_fuel_c"]), "°C", low=-40, high=150)
    w.input_pair("gas canister at the start", ("ColdCanC", "HotCanC"), (c["canister_c"], h["canister_c"]), "°C",
                 low=-30, high=50)
    w.heading("Which corner limits which check", sub=True)
    for line in (
        "Needles: cold-day full power needs the most pressure (thick fuel, dense air, most fuel); hot-day idle "
        "has the least pressure drop, so the ring's own unevenness weighs most there.",
        "Vaporiser tubes: cold-day idle is usually the worst (cold air, little of it); every point is checked "
        "on both days and the Summary shows the least margin above the dew point.",
        "Pump: cold-day full power asks the most voltage; idle on a hot day the least.",
        "Gas start: the cold canister gives the least pressure.",
    ):
        w.note(line)


def sheet_engine(wb, bk):
    e = bk.s.ENGINE
    ws = wb.create_sheet("Engine")
    w = SheetWriter(wb, ws, label_width=46)
    w.heading("Engine operating points")
    w.note(f"Example figures: {bk.s.ENGINE_NAME}, {bk.s.CLUB_NAME}. Replace the shaded cells with your engine's.")
    w.heading("Design point", sub=True)
    w.input("full speed", "RpmMax", e["rpm_max"], "rpm", low=1000, high=500000)
    w.input("compressor pressure ratio at full speed", "PrMax", e["pr_max"], "-", low=1, high=6)
    w.input("ambient pressure where the figures were taken", "AmbientBar", e["ambient_bar_abs"], "bar abs",
            low=0.5, high=1.1)
    w.input("ambient temperature where the figures were taken", "AmbientC", e["ambient_c"], "°C", low=-40,
            high=50)
    w.input("compressor isentropic efficiency", "CompressorEff", e["compressor_eff"], "-", low=0.4, high=0.9)
    w.input("combustion efficiency", "CombustionEff", e["combustion_eff"], "-", low=0.5, high=1)
    w.heading("From idle to full power, as measured or estimated", sub=True)
    w.note("Speed, air flow, turbine inlet temperature and thrust are inputs (measured, or your estimates) at the "
           "ambient above; case pressure follows from the pressure ratio by the Euler-work similarity law, the "
           "compressor exit temperature by the isentropic relation with gamma 1.4, and the fuel from an energy "
           "balance.")
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
    t_ref = "(AmbientC+273.15)"
    for day, label, pre in DAYS:
        w.heading(f"On the {label} (Envelope sheet)", sub=True)
        if day == "cold":
            w.note("The same speeds and turbine inlet temperatures on each day. At a given speed the compressor "
                   "gives the same isentropic work (Euler, constant cp), so the pressure ratio is higher in cold "
                   "air; the air flow goes with the inlet density at the same volume flow (constant flow "
                   "coefficient). Saravanamuttoo et al., Gas Turbine Theory 6th ed. §4.2; Dixon & Hall 7th ed. §1.8.")
        w.header_row(["point", "air flow [g/s]", "case [bar gauge]", "case [bar abs]", "compressor exit [°C]",
                      "turbine inlet [°C]", "fuel [g/min]", "fuel per needle [g/min]"])
        rows = []
        t_day = f"({pre}AmbC+273.15)"
        for i in range(bk.points):
            r, ref = w.row, bk.op_rows[i]
            rows.append(r)
            w.cell(r, 1, f"=A{ref}")
            w.cell(r, 2, f"=C{ref}*({pre}AmbBar/AmbientBar)*({t_ref}/{t_day})", number_format="0.0")
            w.cell(r, 3, f"=D{r}-{pre}AmbBar", number_format="0.000")
            w.cell(r, 4, f"={pre}AmbBar*(1+{t_ref}/{t_day}*((G{ref}/AmbientBar)^(0.4/1.4)-1))^(1.4/0.4)",
                   number_format="0.000")
            w.cell(r, 5, f"={t_day}*(1+((D{r}/{pre}AmbBar)^(0.4/1.4)-1)/CompressorEff)-273.15", number_format="0.0")
            w.cell(r, 6, f"=D{ref}", number_format="0")
            w.cell(r, 7, f"=FS_FUEL_DEMAND(B{r},E{r},F{r},FuelName,CombustionEff)", number_format="0.0")
            w.cell(r, 8, f"=G{r}/NeedleCount", number_format="0.00")
            w.row += 1
        bk.day_rows[day] = rows
    ws.freeze_panes = "B3"
    add_summary(bk, "engine", "fuel at full power, cold day [g/min]", f"={day_cell(bk, 'cold', 'G', -1)}", "g/min",
         "cold day, full power", "0.0")
    add_summary(bk, "engine", "fuel at full power, cold day [mL/min]",
         f"={day_cell(bk, 'cold', 'G', -1)}/FS_DENSITY(FuelName,ColdPumpC,OilPct)*1000", "mL/min",
         "cold day, full power (at the pump's fuel temperature)", "0.0")
    add_summary(bk, "engine", "fuel at idle, hot day [g/min]", f"={day_cell(bk, 'hot', 'G', 0)}", "g/min", "hot day, idle",
         "0.0")
    add_summary(bk, "engine", "fuel at idle, hot day [mL/min]",
         f"={day_cell(bk, 'hot', 'G', 0)}/FS_DENSITY(FuelName,HotPumpC,OilPct)*1000", "mL/min",
         "hot day, idle (at the pump's fuel temperature)", "0.0")
    add_summary(bk, "engine", "case pressure at full power, cold day [bar gauge]", f"={day_cell(bk, 'cold', 'C', -1)}",
         "bar gauge", "cold day, full power", "0.000")


def sheet_fuel(wb, bk):
    f = bk.s.FUEL
    ws = wb.create_sheet("Fuel")
    w = SheetWriter(wb, ws, label_width=50)
    w.heading("Fuel")
    w.input("fuel", "FuelName", f["name"], "", choices=("kerosene",),
            comment="The built-in kerosene is a generic Jet A-1-type fuel. For your own fuel, fill in the table "
                    "at the right and point the defined name FuelName at it.")
    w.input("turbine oil in the fuel", "OilPct", f["oil_pct"], "% vol", low=0, high=20)
    w.note("Fuel temperatures come from the Envelope sheet: at the pump (the tank) and at the ring and needles.")
    w.heading("Properties of the fuel with its oil", sub=True)
    w.header_row(["property", "cold day, pump", "cold day, ring", "hot day, pump", "hot day, ring", "unit"])
    temps = ("ColdPumpC", "ColdRingC", "HotPumpC", "HotRingC")
    rows = (("temperature", "={t}", "°C", "0.0"),
            ("density", "=FS_DENSITY(FuelName,{t},OilPct)", "kg/m³", "0.0"),
            ("viscosity", "=FS_VISCOSITY(FuelName,{t},OilPct)", "mm²/s", "0.000"),
            ("specific heat", "=FS_SPECIFIC_HEAT(FuelName,{t},OilPct)", "kJ/(kg·K)", "0.000"),
            ("vapour pressure (fuel alone)", "=FS_VAPOUR_PRESSURE(FuelName,{t})", "bar abs", "0.0000"),
            ("surface tension (fuel alone)", "=FS_SURFACE_TENSION(FuelName,{t})", "mN/m", "0.00"))
    for label, fml, unit, fmt in rows:
        r = w.row
        w.cell(r, 1, label)
        for j, t in enumerate(temps, start=2):
            w.cell(r, j, fml.format(t=t), number_format=fmt)
        w.cell(r, 6, unit)
        w.row += 1
    w.heading("Combustion and boiling", sub=True)
    w.result("lower heating value", "=FS_HEATING_VALUE(FuelName)", "MJ/kg", number_format="0.00")
    w.result("stoichiometric fuel/air ratio", "=FS_STOICH_FAR(FuelName)", "kg/kg", name="StoichFar",
             number_format="0.0000")
    w.result("bubble point at the cold day's ambient pressure", "=FS_BUBBLE_POINT(FuelName,ColdAmbBar)", "°C",
             number_format="0.0")
    w.result("dew point of the vapour at the cold day's ambient pressure", "=FS_DEW_POINT(FuelName,ColdAmbBar)",
             "°C", number_format="0.0")
    # the builder's own fuel: a table of labels and values, used by pointing FuelName at it
    ws.column_dimensions["J"].width = 30
    ws.cell(1, 10, "your own fuel (optional)").font = Font(bold=True, color="2F3E4E")
    own = (("name", "my kerosene"), ("density at 15 °C [kg/m³]", 803), ("D86 10 % [°C]", 170),
           ("D86 50 % [°C]", 200), ("D86 90 % [°C]", 240), ("D86 FBP [°C]", 262),
           ("viscosity at -20 °C [mm²/s]", 4.1), ("viscosity at 40 °C [mm²/s]", 1.35),
           ("lower heating value [MJ/kg]", 43.1))
    for i, (label, value) in enumerate(own, start=2):
        ws.cell(i, 10, label)
        w.cell(i, 11, value, is_input=True)
    ws.cell(len(own) + 2, 10, "To use it, point the name FuelName at =Fuel!$J$2:$K$10 (LibreOffice: Sheet > Named "
                             "Ranges > Manage; Excel: Formulas > Name Manager)").font = NOTE_FONT


def sheet_needles(wb, bk):
    n = bk.s.NEEDLES
    ws = wb.create_sheet("Needles")
    w = SheetWriter(wb, ws, label_width=58)
    w.heading("Injector needles and ring manifold")
    w.input("needle gauge", "NeedleGauge", n["gauge"], "G (ISO 9626)", choices=tuple(range(14, 34)))
    w.input("wall class", "NeedleWall", n["wall"], "", choices=("normal", "thin", "extra-thin"))
    w.input("needles (one per vaporiser tube)", "NeedleCount", n["count"], "-", low=2, high=MAX_NEEDLES,
            whole=True, comment=f"Every per-needle table below has {MAX_NEEDLES} rows; the rows past this count "
                                "stay blank.")
    w.input("needle length", "NeedleLengthMm", n["length_mm"], "mm", low=1, high=300)
    w.input("bore tolerance (half band)", "BoreTolMm", n["bore_tol_mm"], "mm", low=0, high=0.5)
    w.input("length tolerance (half band)", "LengthTolMm", n["length_tol_mm"], "mm", low=0, high=20)
    w.input("measured bore, one for all (leave empty to use the bench test or the typical bore)", "MeasuredBoreMm",
            None, "mm", low=0.05, high=5)
    w.result("ISO 9626 minimum bore", "=FS_NEEDLE_BORE(NeedleGauge,NeedleWall)", "mm", name="IsoBoreMm",
             number_format="0.000")
    w.result("typical bore (the minimum plus the tolerance: mid-band)", "=IsoBoreMm+BoreTolMm", "mm",
             name="TypicalBoreMm", number_format="0.000")
    r_bench_mean = w.row  # filled in once the bench table is laid out
    w.result("bench test: mean effective bore", "", "mm", name="BenchBoreMm", number_format="0.0000")
    w.result("bore used", "=IF(ISNUMBER(MeasuredBoreMm),MeasuredBoreMm,IF(ISNUMBER(BenchBoreMm),BenchBoreMm,"
                          "TypicalBoreMm))", "mm", name="NeedleBoreMm", number_format="0.0000")
    r_source = w.row
    w.result("bore from", "", "", name="BoreSource")
    w.result("outside diameter", "=FS_NEEDLE_OD(NeedleGauge)", "mm", name="NeedleOdMm", number_format="0.000")
    w.result("chosen", '=NeedleCount&" needles of "&NeedleGauge&" G "&NeedleWall&" wall, bore "'
                       '&ROUND(NeedleBoreMm,3)&" mm, "&NeedleLengthMm&" mm long"', "")
    chosen = f"Needles!$B${w.row - 1}"

    w.heading("Each needle at each operating point, both days", sub=True)
    w.note("Flow per needle from the Engine sheet's day tables; the drop at the fuel's temperature at the ring "
           "(Envelope). Supply = needle drop + case pressure: what the ring must hold.")
    w.header_row(["point", "cold: flow [g/min]", "cold: Δp [bar]", "cold: supply [bar gauge]", "cold: Reynolds",
                  "hot: flow [g/min]", "hot: Δp [bar]", "hot: supply [bar gauge]", "hot: Reynolds",
                  "cold: jet velocity [m/s]"])
    first = w.row
    for i in range(bk.points):
        r = w.row
        w.cell(r, 1, f"={engine_cell(bk, 'A', i)}")
        for c0, day, pre in ((2, "cold", "Cold"), (6, "hot", "Hot")):
            fl, dp, sup, re_ = (col(c0 + k) for k in range(4))
            w.cell(r, c0, f"={day_cell(bk, day, 'H', i)}", number_format="0.00")
            w.cell(r, c0 + 1, f"=FS_NEEDLE_DP(NeedleBoreMm,NeedleLengthMm,{fl}{r},FuelName,{pre}RingC,OilPct)",
                   number_format="0.000")
            w.cell(r, c0 + 2, f"={dp}{r}+{day_cell(bk, day, 'C', i)}", number_format="0.000")
            w.cell(r, c0 + 3, f"=FS_NEEDLE_REYNOLDS(NeedleBoreMm,{fl}{r},FuelName,{pre}RingC,OilPct)",
                   number_format="0")
        w.cell(r, 10, f"=FS_NEEDLE_VELOCITY(NeedleBoreMm,B{r},FuelName,ColdRingC,OilPct)", number_format="0.00")
        w.row += 1
    last = w.row - 1
    bk.needle_rows = list(range(first, w.row))
    # the pressure limit is the highest supply over both days, the distribution limit the least drop
    hi = (f'=IF(MAX(D{first}:D{last})>=MAX(H{first}:H{last}),"cold day, "&INDEX(A{first}:A{last},'
          f'MATCH(MAX(D{first}:D{last}),D{first}:D{last},0)),"hot day, "&INDEX(A{first}:A{last},'
          f'MATCH(MAX(H{first}:H{last}),H{first}:H{last},0)))')
    lo = (f'=IF(MIN(C{first}:C{last})<=MIN(G{first}:G{last}),"cold day, "&INDEX(A{first}:A{last},'
          f'MATCH(MIN(C{first}:C{last}),C{first}:C{last},0)),"hot day, "&INDEX(A{first}:A{last},'
          f'MATCH(MIN(G{first}:G{last}),G{first}:G{last},0)))')
    w.result("highest supply pressure (the pressure limit)", f"=MAX(D{first}:D{last},H{first}:H{last})",
             "bar gauge", name="NeedleSupplyMaxBar", number_format="0.000")
    w.result("  at", hi, "")
    w.result("least needle drop (the distribution limit)", f"=MIN(C{first}:C{last},G{first}:G{last})", "bar",
             name="NeedleDpMinBar", number_format="0.000")
    w.result("  at", lo, "")
    notes_cell(w, bk, "validity notes, cold day full power", "FS_NEEDLE_DP",
           f"NeedleBoreMm,NeedleLengthMm,B{last},FuelName,ColdRingC,OilPct")
    notes_cell(w, bk, "validity notes, hot day idle", "FS_NEEDLE_DP",
           f"NeedleBoreMm,NeedleLengthMm,F{first},FuelName,HotRingC,OilPct")
    add_summary(bk, "needles", "needles", f"={chosen}")
    add_summary(bk, "needles", "bore used [mm]", "=NeedleBoreMm", "mm", "=BoreSource", "0.0000")
    add_summary(bk, "needles", "flow per needle at full power, cold day [g/min]", f"=Needles!$B${last}", "g/min",
         "cold day, full power", "0.00")
    add_summary(bk, "needles", "flow per needle at idle, hot day [g/min]", f"=Needles!$F${first}", "g/min",
         "hot day, idle", "0.00")
    add_summary(bk, "needles", "flow per needle at idle, hot day [mL/min]",
         f"=Needles!$F${first}/FS_DENSITY(FuelName,HotRingC,OilPct)*1000", "mL/min", "hot day, idle", "0.00")
    add_summary(bk, "needles", "needle supply, highest (pressure limit) [bar gauge]", "=NeedleSupplyMaxBar", "bar gauge",
         f"=Needles!$B${w.row - 5}", "0.000")
    add_summary(bk, "needles", "needle Δp at full power, cold day [bar]", f"=Needles!$C${last}", "bar",
         "cold day, full power", "0.000")
    add_summary(bk, "needles", "needle Δp, least (distribution limit) [bar]", "=NeedleDpMinBar", "bar",
         f"=Needles!$B${w.row - 3}", "0.000")

    _needles_tables(ws, w, bk, n, first, last, r_bench_mean, r_source)


def _needles_tables(ws, w, bk, n, first, last, r_bench_mean, r_source):
    """The Needles sheet's chart table, ring manifold, bench test, tolerance study and chart."""
    w.heading("Flow against pressure drop (for the chart)", sub=True)
    w.header_row(["Δp [bar]", "flow cold [g/min]", "flow hot [g/min]"])
    chart_first = w.row
    for k, dp in enumerate((0.1, 0.25, 0.5, 0.75, 1.0, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0)):
        r = w.row
        w.cell(r, 1, dp, is_input=True)
        w.cell(r, 2, f"=FS_NEEDLE_FLOW(NeedleBoreMm,NeedleLengthMm,A{r},FuelName,ColdRingC,OilPct)",
               number_format="0.0")
        w.cell(r, 3, f"=FS_NEEDLE_FLOW(NeedleBoreMm,NeedleLengthMm,A{r},FuelName,HotRingC,OilPct)",
               number_format="0.0")
        w.row += 1
    needle_chart = (chart_first, w.row - 1)

    # bench rows are laid out below the ring; their row numbers are known here
    w.heading("Ring manifold: cold-day full power and hot-day idle", sub=True)
    w.input("ring tube bore", "RingBoreMm", n["ring_bore_mm"], "mm", low=0.5, high=20)
    w.input("ring centre-line diameter", "RingDiaMm", n["ring_dia_mm"], "mm", low=10, high=500)
    w.result("supply at the feed, cold day full power", f"=D{last}", "bar gauge", name="RingSupplyBar",
             number_format="0.000")
    w.result("supply at the feed, hot day idle", f"=H{first}", "bar gauge", name="RingSupplyIdleBar",
             number_format="0.000")
    w.note(f"Needle bores in order round the ring from the feed: each needle's bench-test bore where one is "
           f"entered, otherwise the bore used. {MAX_NEEDLES} rows; those past the needle count stay blank.")
    w.header_row(["needle", "bore [mm]", "cold, full: flow [g/min]", "cold, full: against mean [%]",
                  "hot, idle: flow [g/min]", "hot, idle: against mean [%]"])
    ring_first = w.row
    ring_last = ring_first + MAX_NEEDLES - 1
    for k in range(MAX_NEEDLES):
        w.cell(ring_first + k, 1, k + 1)  # the bores (column B) are written once the bench rows are known
    rng_a, rng_b = f"A{ring_first}:A{ring_last}", f"B{ring_first}:B{ring_last}"
    for c0, supply, case, temp in ((3, "RingSupplyBar", day_cell(bk, "cold", "C", -1), "ColdRingC"),
                                   (5, "RingSupplyIdleBar", day_cell(bk, "hot", "C", 0), "HotRingC")):
        fc = col(c0)
        formula = (f'=IF({rng_a}<=NeedleCount,FS_MANIFOLD_SPLIT({rng_b},NeedleLengthMm,{supply},{case},'
                   f'RingBoreMm,RingDiaMm,FuelName,{temp},OilPct),"")')
        ws[f"{fc}{ring_first}"] = ArrayFormula(f"{fc}{ring_first}:{fc}{ring_last}", formula)
        column_formats(ws, ring_first, ring_last, ("0.00",), first_col=c0)
        for k in range(MAX_NEEDLES):
            r = ring_first + k
            w.cell(r, c0 + 1, f'=IF(A{r}>NeedleCount,"",({fc}{r}/AVERAGE({fc}${ring_first}:{fc}${ring_last})-1)*100)',
                   number_format="0.00")
    w.row = ring_last + 1
    dev = "MAX(ABS(MAX({c}{a}:{c}{b})),ABS(MIN({c}{a}:{c}{b})))"
    w.result("largest deviation from the mean, cold day full power",
             "=" + dev.format(c="D", a=ring_first, b=ring_last), "%", number_format="0.00")
    w.result("largest deviation from the mean, hot day idle",
             "=" + dev.format(c="F", a=ring_first, b=ring_last), "%", number_format="0.00")
    notes_cell(w, bk, "validity notes of the ring, cold day full power", "FS_MANIFOLD_SPLIT",
           f"{rng_b},NeedleLengthMm,RingSupplyBar,{day_cell(bk, 'cold', 'C', -1)},RingBoreMm,RingDiaMm,FuelName,"
           f"ColdRingC,OilPct")
    add_summary(bk, "needles", "ring: largest needle deviation, cold day full power [%]", f"=Needles!$B${w.row - 3}", "%",
         "cold day, full power", "0.00")
    add_summary(bk, "needles", "ring: largest needle deviation, hot day idle [%]", f"=Needles!$B${w.row - 2}", "%",
         "hot day, idle", "0.00")

    _needles_bench(ws, w, bk, n, ring_first, r_bench_mean, r_source)

    w.heading("Tolerance study at full power, cold day", sub=True)
    w.note("Tubing bought to the standard: bores drawn between the ISO 9626 minimum and the minimum plus twice "
           "the tolerance (the typical bore at the centre), lengths within their tolerance; the bench table "
           "above shows the spread of the needles actually measured.")
    r = w.row
    formula = (f"=FS_TOLERANCE_SPREAD(NeedleGauge,NeedleWall,NeedleCount,NeedleLengthMm,C{last},"
               f"FuelName,ColdRingC,BoreTolMm,LengthTolMm,2000,1,OilPct,TypicalBoreMm)")
    ws[f"A{r}"] = ArrayFormula(f"A{r}:C{r + 12}", formula)
    for k, fmt in enumerate(("0.0000", "0.0000", "0.00", "0.00", "0.00", "0.00", "0.00", "0.00", "0.0", "0.0",
                             "0.000", "0", None)):
        if fmt:
            ws.cell(r + k, 2).number_format = fmt
    add_summary(bk, "needles", "tolerance: spread between needles (CV) [%]", f"=Needles!$B${r + 4}", "%",
         "cold day, full power", "0.00")
    w.row = r + 13

    chart = ScatterChart()
    chart.title = "Needle flow against pressure drop"
    chart.x_axis.title = "pressure drop [bar]"
    chart.y_axis.title = "flow per needle [g/min]"
    chart.style = 13
    a, b = needle_chart
    xs = Reference(ws, min_col=1, min_row=a, max_row=b)
    for colno, name, colour in ((2, "cold day", COLD), (3, "hot day", HOT)):
        ser = Series(Reference(ws, min_col=colno, min_row=a, max_row=b), xs, title=name)
        colour_series(ser, colour)
        chart.series.append(ser)
    chart.x_axis.scaling.min, chart.y_axis.scaling.min = 0, 0
    chart.height, chart.width = 8, 14
    ws.add_chart(chart, "L3")


def _needles_bench(ws, w, bk, n, ring_first, r_bench_mean, r_source):
    """The bench-test table; its bores feed the ring's bore column and the bore used."""
    w.heading("Bench test of the needles", sub=True)
    (vol_time, dp, temp), vols = n["bench"]
    w.input("collection time", "BenchTimeS", vol_time, "s", low=1, high=3600)
    w.input("test pressure drop", "BenchDpBar", dp, "bar", low=0.05, high=20)
    w.input("test liquid temperature", "BenchTempC", temp, "°C", low=0, high=60)
    w.input("test liquid", "BenchFluid", "water", "", choices=("water", "kerosene"))
    w.note(f"One row per needle, in order round the ring ({MAX_NEEDLES} rows; rows past the needle count are "
           "left out). Entered bores replace the bore used above and feed the ring manifold.")
    w.header_row(["needle", "collected [mL]", "counted [mL]", "", "effective bore [mm]", "against median [%]",
                  "check"])
    first_b = w.row
    last_b = first_b + MAX_NEEDLES - 1
    for k in range(MAX_NEEDLES):
        r, b = ring_first + k, f"E{first_b + k}"
        w.cell(r, 2, f'=IF(A{r}>NeedleCount,"",IF(AND(NOT(ISNUMBER(MeasuredBoreMm)),ISNUMBER({b})),{b},'
                     f'NeedleBoreMm))', number_format="0.0000")
    for k in range(MAX_NEEDLES):
        r = first_b + k
        w.cell(r, 1, k + 1)
        w.cell(r, 2, vols[k] if k < len(vols) else None, is_input=True)
        w.cell(r, 3, f'=IF(A{r}>NeedleCount,"",IF(ISNUMBER(B{r}),B{r},""))')
        w.cell(r, 5, f'=IF(ISNUMBER(C{r}),FS_BORE_FROM_TEST(C{r},BenchTimeS,BenchDpBar,NeedleLengthMm,BenchFluid,'
                     f'BenchTempC),"")', number_format="0.0000")
    counted = f"C{first_b}:C{last_b}"
    ws[f"F{first_b}"] = ArrayFormula(f"F{first_b}:G{last_b}",
                                     f'=IF(ISNUMBER({counted}),FS_ODD_NEEDLES({counted},5),"")')
    column_formats(ws, first_b, last_b, ("0.00",), first_col=6)
    bk.verdict_ranges.append(("Needles", f"G{first_b}:G{last_b}"))
    w.row = last_b + 1
    bores = f"E{first_b}:E{last_b}"
    ws[f"B{r_bench_mean}"] = f'=IF(COUNT({bores})>0,AVERAGE({bores}),"none entered")'
    ws[f"B{r_source}"] = (f'=IF(ISNUMBER(MeasuredBoreMm),"the measured bore typed above",IF(ISNUMBER(BenchBoreMm),'
                          f'"bench test: mean of "&COUNT({bores})&" needles","typical: ISO 9626 minimum + '
                          f'tolerance"))')


def sheet_vaporiser(wb, bk):
    v = bk.s.VAPORISER
    ws = wb.create_sheet("Vaporiser")
    w = SheetWriter(wb, ws, label_width=36)
    w.heading("Vaporiser tubes")
    w.note("One tube per needle, checked at every operating point on both days. Each tube's air is the engine's "
           "air times the tubes' share of the liner's effective area (Combustor sheet), shared between the tubes; "
           "the liner pressure drop that passes the engine's air follows from the openings' effective area "
           "(incompressible orifice flow, Lefebvre & Ballal, Gas Turbine Combustion 3rd ed. ch. 4).")
    w.note("For every tube, once: the turbine oil never vaporises and leaves a residue on hot walls (inspect and "
           "clean the tubes); fuel still liquid at the exit burns as droplets further down the liner. The "
           "verdicts below give each point's own checks.")
    w.input("tube bore", "TubeBoreMm", v["tube_bore_mm"], "mm", low=1, high=40)
    w.input("heated length", "TubeLengthMm", v["heated_length_mm"], "mm", low=5, high=600)
    w.input("tube wall temperature", "WallC", v["wall_c"], "°C", low=0, high=1100)
    w.input("tube inlet discharge coefficient", "TubeCd", v["cd"], "-", low=0.3, high=1)
    w.input("tube shape", "TubeShape", v.get("shape", "straight"), "", choices=("straight", "return"),
            comment="straight: one heated leg; return: a second leg of the same length after a 180° bend, "
                    "the outlet facing the front of the combustor")
    w.result("tube", '=TubeBoreMm&" mm bore, "&TubeLengthMm&" mm heated, "&TubeShape', "", name="TubeSize")
    items = (("vaporised_pct", "vaporised [%]", "0.0"), ("exit_c", "exit [°C]", "0.0"),
             ("dew_margin_k", "above dew point [K]", "0.0"), ("flashback_margin", "velocity / flame speed", "0.0"),
             ("verdict", "verdict", None))
    w.header_row(["point", "day", "air per tube [g/s]", "liner Δp [% of case abs]", "fuel per tube [g/min]",
                  "fuel at the needle [°C]"] + [h for _, h, _ in items])
    first = w.row
    bk.vap_rows = {}
    for day, label, pre in DAYS:
        rows = []
        for i in range(bk.points):
            r = w.row
            rows.append(r)
            air, p3, t3 = day_cell(bk, day, "B", i), day_cell(bk, day, "D", i), day_cell(bk, day, "E", i)
            w.cell(r, 1, f"={engine_cell(bk, 'A', i)}")
            w.cell(r, 2, label)
            w.cell(r, 3, f"={air}*TubeShare/NeedleCount", number_format="0.000")
            # Δp/p = (m / A_eff)² R T / (2 p²): orifice flow m = A_eff √(2 ρ Δp), ρ = p / (R T)
            w.cell(r, 4, f"=100*({air}/1000/(LinerAreaMm2*0.000001))^2*{R_AIR}*({t3}+273.15)/(2*({p3}*100000)^2)",
                   number_format="0.00")
            w.cell(r, 5, f"={day_cell(bk, day, 'H', i)}", number_format="0.00")
            w.cell(r, 6, f"={pre}RingC", number_format="0.0")
            for j, (item, _, fmt) in enumerate(items, start=7):
                w.cell(r, j, f"=FS_VAPORISER(TubeBoreMm,TubeLengthMm,E{r},C{r},{p3},{t3},WallC,FuelName,OilPct,"
                             f"\"{item}\",TubeShape)", number_format=fmt)
            w.row += 1
        bk.vap_rows[day] = rows
    last = w.row - 1
    verdict_col = col(6 + len(items))
    bk.verdict_ranges.append(("Vaporiser", f"{verdict_col}{first}:{verdict_col}{last}"))
    ws.column_dimensions[verdict_col].width = 90
    for cc in range(first, w.row):
        ws[f"{verdict_col}{cc}"].alignment = Alignment(wrap_text=True, vertical="top")
        # a fixed height, so every spreadsheet program places the charts below where this book says
        ws.row_dimensions[cc].height = 64
    pts, days = f"$A${first}:$A${last}", f"$B${first}:$B${last}"
    m = f"MATCH(MIN($I${first}:$I${last}),$I${first}:$I${last},0)"
    w.result("least margin above the dew point", f"=MIN(I{first}:I{last})", "K", name="VapWorstMarginK",
             number_format="0.0")
    w.result("  at", f'=INDEX({days},{m})&", "&INDEX({pts},{m})', "", name="VapWorstCorner")
    w.result("  vaporised there", f"=INDEX($G${first}:$G${last},{m})", "%", number_format="0.0")
    w.result("  verdict there", f"=INDEX(${verdict_col}${first}:${verdict_col}${last},{m})", "")
    ws.cell(w.row - 1, 2).alignment = Alignment(wrap_text=True, vertical="top", horizontal="left")
    ws.merge_cells(start_row=w.row - 1, start_column=2, end_row=w.row - 1, end_column=9)
    ws.row_dimensions[w.row - 1].height = 64
    bk.verdict_ranges.append(("Vaporiser", f"B{w.row - 1}"))
    w.result("liner Δp, least and most over both days",
             f'=ROUND(MIN(D{first}:D{last}),2)&" to "&ROUND(MAX(D{first}:D{last}),2)', "% of case abs")
    add_summary(bk, "vaporiser", "tube size", "=TubeSize")
    add_summary(bk, "vaporiser", "vaporiser: least margin above the dew point [K]", "=VapWorstMarginK", "K",
         "=VapWorstCorner", "0.0")
    add_summary(bk, "vaporiser", "vaporised at that corner [%]", f"=Vaporiser!$B${w.row - 3}", "%", "=VapWorstCorner",
         "0.0")
    add_summary(bk, "vaporiser", "vaporiser verdict at that corner", f"=Vaporiser!$B${w.row - 2}", "", "=VapWorstCorner")
    add_summary(bk, "vaporiser", "vaporised at idle, cold day [%]", f"=Vaporiser!$G${bk.vap_rows['cold'][0]}", "%",
         "cold day, idle", "0.0")
    add_summary(bk, "vaporiser", "vaporised at full power, cold day [%]", f"=Vaporiser!$G${bk.vap_rows['cold'][-1]}", "%",
         "cold day, full power", "0.0")
    add_summary(bk, "vaporiser", "vaporiser verdict at full power, cold day", f"=Vaporiser!${verdict_col}${bk.vap_rows['cold'][-1]}",
         "", "cold day, full power")
    add_summary(bk, "vaporiser", "liner Δp at idle, cold day [% of case abs]", f"=Vaporiser!$D${bk.vap_rows['cold'][0]}",
         "%", "cold day, idle", "0.00")
    add_summary(bk, "vaporiser", "liner Δp at full power, cold day [% of case abs]",
         f"=Vaporiser!$D${bk.vap_rows['cold'][-1]}", "%", "cold day, full power", "0.00")

    _vaporiser_corners(ws, w, bk)


def _vaporiser_corners(ws, w, bk):
    """The remaining items, validity notes and profiles at the tube's two bounding corners, with the charts."""
    # the remaining items at the two corners that bound the tube: cold-day idle and hot-day full power
    w.heading("More of the tube at its two bounding corners", sub=True)
    corners = (("cold day, idle", bk.vap_rows["cold"][0], "cold", 0),
               ("hot day, full power", bk.vap_rows["hot"][-1], "hot", bk.points - 1))
    w.header_row(["item"] + [c[0] for c in corners] + ["unit"])
    more = (("residence_ms", "residence time", "ms", "0.00"), ("droplet_life_ms", "droplet life", "ms", "0.0"),
            ("tube_phi", "tube φ", "-", "0.00"), ("exit_velocity_m_s", "exit velocity", "m/s", "0.0"),
            ("max_wet_wall_c", "hottest wet wall", "°C", "0"), ("oil_residue_g_h", "oil left", "g/h", "0.0"),
            ("dp_mbar", "tube Δp", "mbar", "0.0"))
    for item, label, unit, fmt in more:
        r = w.row
        w.cell(r, 1, label)
        for j, (_, vr, day, i) in enumerate(corners, start=2):
            w.cell(r, j, f"=FS_VAPORISER(TubeBoreMm,TubeLengthMm,E{vr},C{vr},{day_cell(bk, day, 'D', i)},"
                         f"{day_cell(bk, day, 'E', i)},WallC,FuelName,OilPct,\"{item}\",TubeShape)", number_format=fmt)
        w.cell(r, 4, unit)
        w.row += 1
    r = w.row
    w.cell(r, 1, "validity notes").alignment = Alignment(vertical="top")
    for j, (_, vr, day, i) in enumerate(corners, start=2):
        c = w.cell(r, j, f'=FS_NOTES("FS_VAPORISER",TubeBoreMm,TubeLengthMm,E{vr},C{vr},{day_cell(bk, day, "D", i)},'
                         f'{day_cell(bk, day, "E", i)},WallC,FuelName,OilPct,"verdict",TubeShape)')
        c.alignment = Alignment(wrap_text=True, vertical="top")
        bk.notes_ranges.append(("Vaporiser", f"{col(j)}{r}"))
    ws.row_dimensions[r].height = 45
    w.row += 1

    # profiles along the tube at the two corners
    profiles = []
    for label, vr, day, i in corners:
        w.heading(f"Along the tube, {label}", sub=True)
        w.skip()  # the human headers go here, over the function's row of code names (hidden)
        r = w.row
        formula = (f"=FS_VAPORISER_PROFILE(TubeBoreMm,TubeLengthMm,E{vr},C{vr},{day_cell(bk, day, 'D', i)},"
                   f"{day_cell(bk, day, 'E', i)},WallC,FuelName,OilPct,11,TubeShape)")
        ws[f"A{r}"] = ArrayFormula(f"A{r}:E{r + 11}", formula)
        code_header(ws, r, ["position [mm]", "gas [°C]", "wall [°C]", "vaporised [%]", "velocity [m/s]"])
        column_formats(ws, r + 1, r + 11, ("0", "0.0", "0", "0.0", "0.0"))
        profiles.append((label, r))
        w.row = r + 12
    for title, colno, axis in (("Vaporised fuel along the tube", 4, "vaporised [%]"),
                               ("Gas temperature along the tube", 2, "gas temperature [°C]")):
        chart = ScatterChart()
        chart.title = title
        chart.x_axis.title = "position from the inlet [mm]"
        chart.y_axis.title = axis
        chart.style = 13
        for (label, r), colour in zip(profiles, (COLD, HOT)):
            xs = Reference(ws, min_col=1, min_row=r + 1, max_row=r + 11)
            ser = Series(Reference(ws, min_col=colno, min_row=r + 1, max_row=r + 11), xs, title=label)
            colour_series(ser, colour)
            chart.series.append(ser)
        chart.x_axis.scaling.min = 0
        if colno == 4:
            chart.y_axis.scaling.min, chart.y_axis.scaling.max = 0, 100
        chart.height, chart.width = 7.5, 13
        ws.add_chart(chart, f"G{profiles[0][1] if colno == 4 else profiles[0][1] + 16}")


def sheet_combustor(wb, bk):
    ws = wb.create_sheet("Combustor")
    w = SheetWriter(wb, ws)
    w.heading("Combustor air split and zone temperatures")
    w.note("Every liner opening sees the same pressure drop, so the air divides by effective area (holes x Cd x "
           "area). The primary zone gets the vaporiser tubes' air and the primary holes'; the fuel burned is the "
           "fuel flow times the combustion efficiency, as in the engine's fuel demand.")
    w.note(f"One row per zone name; the shares below are found by these names. An empty Cd is a plain hole "
           f"({CD_PLAIN}).")
    w.header_row(["zone", "holes", "diameter [mm]", "Cd (empty: plain hole)", "effective area [mm²]", "zone",
                  "air share [-]"])
    first = w.row
    openings = bk.s.COMBUSTOR["openings"]
    for k, (zone, count, dia) in enumerate(openings):
        r = first + k
        w.cell(r, 1, zone, is_input=True)
        tube = dia is None  # the vaporiser tubes' inlets: count, bore and Cd from the needles and tube sheets
        w.cell(r, 2, "=NeedleCount" if tube else count, is_input=not tube)
        w.cell(r, 3, "=TubeBoreMm" if tube else dia, is_input=not tube, number_format="0.00")
        w.cell(r, 4, "=TubeCd" if tube else None, is_input=not tube)
        w.cell(r, 5, f"=B{r}*IF(ISNUMBER(D{r}),D{r},{CD_PLAIN})*PI()/4*C{r}^2", number_format="0.0")
    last = first + len(openings) - 1
    ws[f"F{first}"] = ArrayFormula(f"F{first}:G{last}",
                                   f"=FS_ZONE_AIR(B{first}:B{last},C{first}:C{last},D{first}:D{last},"
                                   f"A{first}:A{last})")
    column_formats(ws, first, last, ("0.000",), first_col=7)
    w.row = last + 1
    # found by the zone names typed in column A (one row per zone), whose order FS_ZONE_AIR keeps
    share = f"INDEX($G${first}:$G${last},MATCH(\"{{}}\",$A${first}:$A${last},0))"
    w.result("liner effective area (all openings)", f"=SUM(E{first}:E{last})", "mm²", name="LinerAreaMm2",
             number_format="0.0")
    w.result("tubes' share", "=" + share.format("tubes"), "-", name="TubeShare", number_format="0.000")
    w.result("primary share (tubes + primary holes)", "=TubeShare+" + share.format("primary"), "-",
             name="PrimaryShare", number_format="0.000")
    w.result("secondary share", "=" + share.format("secondary"), "-", name="SecondaryShare", number_format="0.000")
    add_summary(bk, "combustor", "primary-zone air share [-]", "=PrimaryShare", "-", "", "0.000")
    w.heading("From idle to full power, both days", sub=True)
    w.note("Primary φ counts all the fuel; the secondary zone and the exit count the fuel burned (fuel x "
           "combustion efficiency), so the exit comes back to the turbine inlet the fuel demand was set for.")
    w.header_row(["point", "day", "fuel burned [g/min]", "primary φ", "primary flame [°C]", "secondary φ (burned)",
                  "secondary zone [°C]", "exit, mixed out [°C]", "turbine inlet set [°C]", "exit - set [K]"])
    op_first = w.row
    bk.comb_rows = {}
    for day, label, pre in DAYS:
        rows = []
        for i in range(bk.points):
            r = w.row
            rows.append(r)
            air, t3, p3, fuel = (day_cell(bk, day, c, i) for c in "BEDG")
            w.cell(r, 1, f"={engine_cell(bk, 'A', i)}")
            w.cell(r, 2, label)
            w.cell(r, 3, f"={fuel}*CombustionEff", number_format="0.0")
            w.cell(r, 4, f"=FS_ZONE_PHI({fuel},{air},PrimaryShare,FuelName)", number_format="0.000")
            w.cell(r, 5, f"=FS_FLAME_TEMP(FuelName,D{r},{t3},{p3})", number_format="0")
            w.cell(r, 6, f"=FS_ZONE_PHI(C{r},{air},PrimaryShare+SecondaryShare,FuelName)", number_format="0.000")
            w.cell(r, 7, f"=FS_FLAME_TEMP(FuelName,F{r},{t3},{p3},\"complete\")", number_format="0")
            # hot stream: the secondary zone's gas (its air plus the fuel burned), mixed with the dilution air
            w.cell(r, 8, f"=FS_MIX_TEMP(G{r},{air}*(PrimaryShare+SecondaryShare)+C{r}/60,{t3},{air}*(1-PrimaryShare-"
                         f"SecondaryShare),C{r}/60/({air}*(PrimaryShare+SecondaryShare)),FuelName)", number_format="0")
            w.cell(r, 9, f"={day_cell(bk, day, 'F', i)}", number_format="0")
            w.cell(r, 10, f"=H{r}-I{r}", number_format="0.0")
            w.row += 1
        bk.comb_rows[day] = rows
    op_last = w.row - 1
    full_cold = bk.comb_rows["cold"][-1]
    notes_cell(w, bk, "validity notes, primary flame at cold-day full power", "FS_FLAME_TEMP",
           f"FuelName,D{full_cold},{day_cell(bk, 'cold', 'E', -1)},{day_cell(bk, 'cold', 'D', -1)}")
    add_summary(bk, "combustor", "primary flame at full power, cold day [°C]", f"=Combustor!$E${full_cold}", "°C",
         "cold day, full power", "0")
    add_summary(bk, "combustor", "primary φ at full power, cold day", f"=Combustor!$D${full_cold}", "-",
         "cold day, full power", "0.000")

    bars = BarChart()
    bars.title = "Air share by zone"
    bars.y_axis.title = "share of the liner air [-]"
    bars.add_data(Reference(ws, min_col=7, min_row=first, max_row=last), titles_from_data=False)
    bars.set_categories(Reference(ws, min_col=6, min_row=first, max_row=last))
    bars.legend = None
    bars.y_axis.scaling.min = 0
    bars.series[0].graphicalProperties.solidFill = COLD
    bars.height, bars.width = 7, 11
    ws.add_chart(bars, "M3")
    temps = ScatterChart()
    temps.title = "Zone temperatures from idle to full power, cold day"
    temps.x_axis.title = "shaft speed [rpm]"
    temps.y_axis.title = "temperature [°C]"
    temps.style = 13
    speeds = Reference(wb["Engine"], min_col=2, min_row=bk.op_rows[0], max_row=bk.op_rows[-1])
    rows = bk.comb_rows["cold"]
    for (colno, name), colour in zip(((5, "primary flame"), (7, "secondary zone"), (8, "exit")), PALETTE):
        ser = Series(Reference(ws, min_col=colno, min_row=rows[0], max_row=rows[-1]), speeds, title=name)
        colour_series(ser, colour)
        temps.series.append(ser)
    temps.x_axis.scaling.min, temps.y_axis.scaling.min = 0, 0
    temps.height, temps.width = 8, 14
    ws.add_chart(temps, "M18")


def sheet_summary(wb, bk):
    ws = wb.create_sheet("Summary", 1)
    w = SheetWriter(wb, ws, label_width=52)
    w.heading("Summary of the sizing")
    w.note("Key results, linked from the sheets, each with the corner of the envelope it belongs to (for a check: "
           "the corner that limits it). Verdict cells are highlighted.")
    ws.column_dimensions["B"].width = 60
    ws.column_dimensions["C"].width = 11
    ws.column_dimensions["D"].width = 34
    w.header_row(["result", "value", "unit", "corner (day, point) or source"])
    section = None
    for sec, label, formula, unit, corner, fmt in bk.summary:
        if sec != section:
            section = sec
        r = w.row
        w.result(label, formula, unit, number_format=fmt)
        ws[f"B{r}"].alignment = Alignment(wrap_text=True, vertical="top", horizontal="left")
        ws[f"C{r}"].alignment = Alignment(vertical="top")
        c = ws.cell(r, 4, corner)
        c.alignment = Alignment(wrap_text=True, vertical="top")
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


def _notes_formatting(wb, bk):
    """A notes cell that is not "ok" shows in the marginal colour."""
    amber = PatternFill("solid", fgColor="FBE7A1")
    for sheet, ref in bk.notes_ranges:
        wb[sheet].conditional_formatting.add(
            ref, FormulaRule(formula=[f'AND(LEN({ref})>0,LEFT({ref},2)<>"ok")'], fill=amber, stopIfTrue=True))


def _verdict_formatting(wb, bk):
    # verdict fills apart from the inputs' pale green-grey, in the colour-blind-safe hues (Okabe & Ito 2008)
    green = PatternFill("solid", fgColor="CFE3F3")   # ok: pale blue
    amber = PatternFill("solid", fgColor="FBE7A1")   # marginal: pale yellow
    red = PatternFill("solid", fgColor="F5C6AE")     # fails: pale vermillion
    for sheet, rng in bk.verdict_ranges:
        ws = wb[sheet]
        top_left = rng.split(":")[0]
        for text, fill in (("ok", green), ("good", green), ("yes", green), ("marginal", amber), ("fail", red),
                           ("poor", red), ("ODD", red), ("no", red), ("empty", red), ("FS error", red)):
            ws.conditional_formatting.add(
                rng, FormulaRule(formula=[f'LEFT({top_left},{len(text)})="{text}"'], fill=fill, stopIfTrue=True))


SECTIONS = (sheet_start, sheet_envelope, sheet_engine, sheet_fuel, sheet_needles, sheet_vaporiser, sheet_combustor,
            sheet_pump, sheet_gas, sheet_summary)


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
    bk = BookLayout(scenario or demo)
    bk.title_note = title_note
    for section in SECTIONS:
        section(wb, bk)
    sheet_functions(wb)
    _verdict_formatting(wb, bk)
    _notes_formatting(wb, bk)
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
