"""The starter workbook's pump and gas-start sheets (see :mod:`fuelsys.sheet.starter`)."""

from __future__ import annotations

from openpyxl.chart import Reference, ScatterChart, Series
from openpyxl.styles import Alignment
from openpyxl.worksheet.formula import ArrayFormula

from fuelsys.sheet.layout import SheetWriter
from fuelsys.sheet.starter_parts import (COLD, DAYS, PALETTE, PUMP_TEST_ROWS, add_summary, code_header, colour_series,
                                         corner_of, day_cell, engine_cell, column_formats, notes_cell)


def sheet_pump(wb, bk):
    p = bk.s.PUMP
    ws = wb.create_sheet("Pump")
    w = SheetWriter(wb, ws, label_width=52)
    w.heading("Fuel lines and pump")
    w.input("line bore", "LineBoreMm", p["line_bore_mm"], "mm", low=0.5, high=20)
    w.input("line length", "LineLengthM", p["line_length_m"], "m", low=0.01, high=20)
    w.input("filter, valve and fitting loss coefficients (sum)", "LineK", p["k_total"], "-", low=0, high=500)
    w.input("injectors above the tank", "HeadM", p["head_m"], "m", low=-5, high=5)
    w.input("manoeuvre load factor", "GLoad", p["g_load"], "g", low=0, high=20)
    w.input("margin on the pressure needed", "MarginPct", p["margin_pct"], "%", low=0, high=200)
    w.input("battery at its cut-off voltage, under load", "BatteryV", p["battery_v"], "V", low=1, high=60)
    w.input("battery fully charged, under load", "BatteryFullV", p.get("battery_full_v", p["battery_v"]), "V",
            low=1, high=60)
    w.input("motor starting voltage (lowest that turns the pump)", "MotorStartV", p.get("motor_start_v", 0.5), "V",
            low=0, high=60)
    w.input("motor winding resistance (measured across its terminals; optional)", "WindingOhm", p.get("winding_ohm"),
            "Ω", low=0, high=100,
            comment="With it, a bench test at one fuel temperature gives the voltages at the envelope's "
                    "temperatures: the fit parts the motor's resistance loss from the pump's slip. Assumed: the "
                    "slip is laminar (slip flow goes as 1/viscosity, Wilson 1949) and the resistance holds at every "
                    "temperature (copper rises about 0.4 %/K: measure it at the running temperature). Without it, "
                    "test at two or more fuel temperatures, or the fit holds only at the test temperature.")
    w.input("motor speed constant kv (optional)", "MotorKv", p.get("kv_rpm_per_v"), "rpm/V", low=1, high=100000,
            comment="From the motor's data sheet; gives the pump's displacement per revolution in the fit.")
    w.heading("Bench test points of the pump", sub=True)
    w.note(f"Up to {PUMP_TEST_ROWS} points, from the top row down; one fuel temperature is enough with the winding "
           "resistance above.")
    w.header_row(["point", "flow [g/min]", "outlet [bar gauge]", "volts [V]", "fuel [°C]"])
    first = w.row
    tests = p["tests"]
    for k in range(PUMP_TEST_ROWS):
        r = first + k
        w.cell(r, 1, k + 1)
        row = tests[k] if k < len(tests) else (None,) * 4
        for j, v in enumerate(row, start=2):
            w.cell(r, j, v, is_input=True)
    last = first + PUMP_TEST_ROWS - 1
    w.row = last + 1
    w.heading("Pump fit", sub=True)
    w.skip()  # human headers over the fit's row of labels (kept, hidden: the pump functions read them)
    r = w.row
    formula = (f"=FS_PUMP_FIT(B{first}:B{last},C{first}:C{last},D{first}:D{last},FuelName,E{first}:E{last},"
               f'IF(ISNUMBER(WindingOhm),WindingOhm,""),IF(ISNUMBER(MotorKv),MotorKv,""),OilPct)')
    # an empty optional cell goes in as "" (the default): LibreOffice would pass an empty cell as 0
    ws[f"A{r}"] = ArrayFormula(f"A{r}:O{r + 1}", formula)
    w.define("PumpFit", f"$A${r}:$O${r + 1}")
    code_header(ws, r, ["flow per volt [mL/min/V]", "winding [Ω]", "friction current [A]", "slip [mm³]",
                         "intercept [V]", "pressure term [V/bar]", "fit viscosity [mPa·s]", "motor k [mN·m/A]",
                         "displacement [mL/rev]", "RMS error [V]", "R² [-]", "condition [-]", "points",
                         "lowest tested [V]", "highest tested [V]"])
    column_formats(ws, r + 1, r + 1, ("0.00", "0.000", "0.000", "0.00E+00", "0.000", "0.0000", "0.000", "0.00", "0.000",
                                "0.000", "0.00000", "0.0", "0", "0.0", "0.0"))
    for j in range(1, 16):
        ws.cell(r + 1, j).alignment = Alignment(horizontal="right", wrap_text=True, vertical="top")
    w.row = r + 2
    w.heading("Along the operating line, both days", sub=True)
    w.note("Line losses, pressure needed and voltage at the fuel's temperature at the pump (Envelope sheet); "
           "needle drops from the Needles sheet at the fuel's temperature at the ring.")
    w.header_row(["point", "day", "fuel [g/min]", "case [bar gauge]", "needles [bar]", "line [bar]",
                  "pump outlet needed [bar gauge]", "volts needed [V]", "headroom [V]", "check"])
    op_first = w.row
    bk.pump_rows = {}
    for day, label, pre in DAYS:
        rows = []
        for i in range(bk.points):
            r = w.row
            rows.append(r)
            w.cell(r, 1, f"={engine_cell(bk, 'A', i)}")
            w.cell(r, 2, label)
            w.cell(r, 3, f"={day_cell(bk, day, 'G', i)}", number_format="0.0")
            w.cell(r, 4, f"={day_cell(bk, day, 'C', i)}", number_format="0.000")
            w.cell(r, 5, f"=Needles!{'C' if day == 'cold' else 'G'}{bk.needle_rows[i]}", number_format="0.000")
            w.cell(r, 6, f"=FS_LINE_DP(LineBoreMm,LineLengthM,C{r},FuelName,{pre}PumpC,LineK,OilPct)",
                   number_format="0.000")
            w.cell(r, 7, f"=FS_PUMP_NEED(C{r},D{r},E{r},F{r},HeadM,GLoad,MarginPct,FuelName,{pre}PumpC,OilPct)",
                   number_format="0.000")
            w.cell(r, 8, f"=FS_PUMP_VOLTS(PumpFit,C{r},G{r},FuelName,{pre}PumpC,OilPct)", number_format="0.00")
            w.cell(r, 9, f"=BatteryV-H{r}", number_format="0.00")
            w.cell(r, 10, f"=IF(ISNUMBER(H{r}),IF(I{r}>=0,\"ok\",\"fails: short by \"&ROUND(-I{r},2)&\" V\"),H{r})")
            w.row += 1
        bk.pump_rows[day] = rows
    op_last = w.row - 1
    bk.verdict_ranges.append(("Pump", f"J{op_first}:J{op_last}"))
    rng = {c: f"${c}${op_first}:${c}${op_last}" for c in "ABGHIJ"}
    mx = f"MATCH(MAX({rng['H']}),{rng['H']},0)"
    w.result("most voltage needed", f"=MAX({rng['H']})", "V", name="PumpVoltsMax", number_format="0.00")
    w.result("  at", f'=INDEX({rng["B"]},{mx})&", "&INDEX({rng["A"]},{mx})', "", name="PumpVoltsCorner")
    w.result("  headroom there", f"=INDEX({rng['I']},{mx})", "V", number_format="0.00")
    r_head = w.row - 1
    w.result("  check there", f"=INDEX({rng['J']},{mx})", "")
    bk.verdict_ranges.append(("Pump", f"B{w.row - 1}"))
    full = bk.pump_rows["cold"][-1]
    notes_cell(w, bk, "validity notes, cold day full power", "FS_PUMP_VOLTS",
           f"PumpFit,C{full},G{full},FuelName,ColdPumpC,OilPct")
    cold_idle, hot_idle = bk.pump_rows["cold"][0], bk.pump_rows["hot"][0]

    add_summary(bk, "pump", "pump outlet needed, highest [bar gauge]", f"=MAX(Pump!{rng['G']})", "bar gauge",
         corner_of("Pump", rng["G"], rng["A"], rng["B"], "MAX"), "0.000")
    add_summary(bk, "pump", "pump outlet needed at idle, cold day [bar gauge]", f"=Pump!$G${cold_idle}", "bar gauge",
         "cold day, idle", "0.000")
    add_summary(bk, "pump", "pump outlet needed at idle, hot day [bar gauge]", f"=Pump!$G${hot_idle}", "bar gauge",
         "hot day, idle", "0.000")
    add_summary(bk, "pump", "pump volts, most needed [V]", "=PumpVoltsMax", "V", "=PumpVoltsCorner", "0.00")
    add_summary(bk, "pump", "pump volts at idle, hot day [V]", f"=Pump!$H${hot_idle}", "V", "hot day, idle", "0.00")
    add_summary(bk, "pump", "battery headroom at the most voltage [V]", f"=Pump!$B${r_head}", "V", "=PumpVoltsCorner",
         "0.00")
    add_summary(bk, "pump", "pump check at the most voltage", f"=Pump!$B${r_head + 1}", "", "=PumpVoltsCorner")
    _pump_pwm(w, bk)
    _pump_curves(ws, w, bk)


def _pump_curves(ws, w, bk):
    """Pump curves at several voltages over the system's need (cold day), for the chart."""
    w.heading("Pump curves at several voltages, cold day (for the chart)", sub=True)
    volts = (3.0, 5.0, 7.0, 9.0)
    w.header_row(["outlet [bar gauge]"] + [f"flow at {v:g} V [g/min]" for v in volts])
    c_first = w.row
    for k, pr in enumerate((0.0, 1.0, 2.0, 3.0, 4.0, 5.0, 6.0)):
        r = w.row
        w.cell(r, 1, pr, is_input=True)
        for j, v in enumerate(volts, start=2):
            w.cell(r, j, f"=FS_PUMP_FLOW(PumpFit,{v},A{r},FuelName,ColdPumpC,OilPct)", number_format="0.0")
        w.row += 1
    c_last = w.row - 1
    chart = ScatterChart()
    chart.title = "Pump curves and the system's need (cold day)"
    chart.x_axis.title = "fuel flow [g/min]"
    chart.y_axis.title = "pump outlet [bar gauge]"
    chart.style = 13
    ys = Reference(ws, min_col=1, min_row=c_first, max_row=c_last)
    for (j, v), colour in zip(enumerate(volts, start=2), PALETTE):
        ser = Series(ys, Reference(ws, min_col=j, min_row=c_first, max_row=c_last), title=f"pump at {v:g} V")
        colour_series(ser, colour, marker="none")
        chart.series.append(ser)
    cold = bk.pump_rows["cold"]
    need = Series(Reference(ws, min_col=7, min_row=cold[0], max_row=cold[-1]),
                  Reference(ws, min_col=3, min_row=cold[0], max_row=cold[-1]), title="system need")
    colour_series(need, COLD, marker="diamond")
    need.marker.size = 8
    chart.series.append(need)
    chart.x_axis.scaling.min, chart.y_axis.scaling.min = 0, 0
    chart.x_axis.number_format = "0"
    chart.x_axis.majorUnit = 50
    chart.height, chart.width = 11, 20
    ws.add_chart(chart, "Q3")


def _pump_pwm(w, bk):
    """Motor voltage and PWM duty at idle and full power on both days, with their checks."""
    w.heading("Pump setting: motor voltage and PWM duty", sub=True)
    w.note("A PWM controller gives the motor the battery's voltage times the duty (average output of a chopper: "
           "Mohan, Undeland & Robbins, Power Electronics 3rd ed. §7-5). The duty is shown for a charged battery "
           "and at its cut-off; more than 100 % cannot be given, and below the motor's starting voltage the pump "
           "may stall at the start or stop at idle.")
    w.header_row(["corner", "motor voltage [V]", "duty, charged [%]", "duty, at cut-off [%]", "check"])
    pwm_first = w.row
    pwm = {}
    for day, label, _ in DAYS:
        for i, point in ((0, "idle"), (bk.points - 1, "full power")):
            r = w.row
            pwm[(day, i)] = r
            w.cell(r, 1, f"{label}, {point}")
            w.cell(r, 2, f"=H{bk.pump_rows[day][i]}", number_format="0.00")
            w.cell(r, 3, f'=IF(ISNUMBER(B{r}),B{r}/BatteryFullV*100,"")', number_format="0")
            w.cell(r, 4, f'=IF(ISNUMBER(B{r}),B{r}/BatteryV*100,"")', number_format="0")
            w.cell(r, 5, f'=IF(NOT(ISNUMBER(B{r})),B{r},IF(D{r}>100,"fails: needs "&ROUND(D{r},0)&" % duty at '
                         f'cut-off",IF(B{r}<MotorStartV,"marginal: below the motor\'s starting voltage","ok")))')
            w.row += 1
    bk.verdict_ranges.append(("Pump", f"E{pwm_first}:E{w.row - 1}"))
    add_summary(bk, "pump", "PWM duty at full power, cold day, battery at cut-off [%]", f"=Pump!$D${pwm[('cold', bk.points - 1)]}",
         "%", "cold day, full power", "0")
    add_summary(bk, "pump", "PWM duty at idle, hot day, battery charged [%]", f"=Pump!$C${pwm[('hot', 0)]}", "%",
         "hot day, idle", "0")
    add_summary(bk, "pump", "PWM check at full power, cold day", f"=Pump!$E${pwm[('cold', bk.points - 1)]}", "",
         "cold day, full power")
    add_summary(bk, "pump", "PWM check at idle, hot day", f"=Pump!$E${pwm[('hot', 0)]}", "", "hot day, idle")


def sheet_gas(wb, bk):
    g = bk.s.GAS
    ws = wb.create_sheet("Gas start")
    w = SheetWriter(wb, ws, label_width=58)
    w.heading("Gas start")
    w.note("Checked with the cold canister (Envelope sheet): the least pressure it gives.")
    w.input("gas", "GasName", g["gas"], "", choices=("propane", "lpg-70-30", "lpg-60-40", "butane", "isobutane"))
    w.result("canister temperature at the start (cold day)", "=ColdCanC", "°C", name="CanisterC", number_format="0.0")
    w.result("canister pressure", "=FS_CANISTER_PRESSURE(GasName,CanisterC)", "bar gauge", name="CanisterBar",
             number_format="0.00")
    w.input("pressure before the jet (regulated)", "JetUpBar", g["line_bar_abs"], "bar abs", low=0.1, high=30)
    w.input("jet bore", "JetBoreMm", g["jet_bore_mm"], "mm", low=0.05, high=5)
    w.input("jet length", "JetLengthMm", g["jet_length_mm"], "mm", low=0, high=500)
    w.result("gas flow at the start (into the case at the cold day's idle pressure)",
             f"=FS_GAS_JET_FLOW(JetBoreMm,JetLengthMm,JetUpBar,{day_cell(bk, 'cold', 'D', 0)},GasName,CanisterC)",
             "g/min", name="GasFlow", number_format="0.00")
    w.result("regulator check",
             "=IF(CanisterBar+ColdAmbBar>JetUpBar,\"ok\",\"fails: canister below regulated pressure\")",
             "", name="GasCheck")
    bk.verdict_ranges.append(("Gas start", f"B{w.row - 1}"))
    add_summary(bk, "gas", "gas flow at the start [g/min]", f"='Gas start'!$B${w.row - 2}", "g/min", "cold canister",
         "0.00")
    add_summary(bk, "gas", "gas start check", f"='Gas start'!$B${w.row - 1}", "", "cold canister")
    notes_cell(w, bk, "validity notes of the gas flow", "FS_GAS_JET_FLOW",
           f"JetBoreMm,JetLengthMm,JetUpBar,{day_cell(bk, 'cold', 'D', 0)},GasName,CanisterC")
    w.heading("Canister over a run", sub=True)
    w.input("liquid gas in the canister", "GasLiquidG", g["liquid_g"], "g", low=1, high=20000)
    w.input("empty canister mass", "GasShellG", g["shell_g"], "g", low=0, high=20000)
    w.input("length of the run", "GasMinutes", g["flow_minutes"], "min", low=0.1, high=600)
    w.skip()  # human headers over the table's row of code names (hidden)
    r = w.row
    formula = "=FS_CANISTER_CHILL(GasName,GasLiquidG,GasShellG,GasFlow,GasMinutes,CanisterC,\"steel\",JetUpBar,11)"
    ws[f"A{r}"] = ArrayFormula(f"A{r}:F{r + 11}", formula)
    code_header(ws, r, ["time [min]", "canister [°C]", "pressure [bar abs]", "liquid left [g]",
                         "heat from the air [W]", "pressure enough?"])
    column_formats(ws, r + 1, r + 11, ("0.0", "0.0", "0.00", "0.0", "0.00"))
    bk.verdict_ranges.append(("Gas start", f"F{r + 1}:F{r + 11}"))
    add_summary(bk, "gas", "canister pressure at the end of the run [bar abs]", f"='Gas start'!$C${r + 11}", "bar abs",
         "cold canister", "0.00")
    w.row = r + 12
    chart = ScatterChart()
    chart.title = "Canister pressure over the run (cold canister)"
    chart.x_axis.title = "minutes"
    chart.y_axis.title = "pressure [bar abs]"
    chart.style = 13
    ser = Series(Reference(ws, min_col=3, min_row=r + 1, max_row=r + 11),
                 Reference(ws, min_col=1, min_row=r + 1, max_row=r + 11), title="canister")
    colour_series(ser, COLD)
    chart.series.append(ser)
    chart.x_axis.scaling.min, chart.y_axis.scaling.min = 0, 0
    chart.height, chart.width = 7.5, 13
    ws.add_chart(chart, "H3")
