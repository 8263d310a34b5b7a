"""FS_ functions recalculated in headless LibreOffice Calc: per-call overhead against a built-in.

One book, one sheet, built here with openpyxl:

- A1:A10000 temperatures, B = ``=SQRT(A+273.15)`` (a built-in function: the baseline);
- C1:C10000 temperatures, D = ``=FS_DENSITY("kerosene";C)`` (10,000 calls of a
  catalogue function through the extension: the candidate);
- E1:E10000 temperatures, F1:F10000 one array formula
  ``{=FS_DENSITY("kerosene";E1:E10000)}`` (one call for the whole column).

Each measurement nudges one input column (so only the cells that depend on
it are dirty) and times ``calculate()``, best of a few; automatic
recalculation is off meanwhile; reading the results back is part of the time.
The same 10,000 calls through :func:`fuelsys.sheet.adapt.call_spec` in this
Python split the cost between the adapter and the UNO bridge.  Loading the
book (which recomputes array formulas, and so imports numpy, scipy and
CoolProp into LibreOffice's Python) and the first ``calculateAll()`` are
reported on their own.

Then the two engines of ``fuelsys recalc`` on the same book of 10,000
formula cells (5,000 FS_DENSITY on distinct temperatures and 5,000 built-ins
on their results): :func:`fuelsys.sheet.evaluate.recalc_workbook` (the
baseline) against :func:`fuelsys.sheet.calc_addin.runner.recalc_book`, start-up
of LibreOffice and the extension's build included, as a user waits for them;
and, inside one LibreOffice session on that book, counting formula cells and
errors by range-level queries against reading every formula cell back.

Skipped, with the reason printed, where LibreOffice is not usable.
"""

from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

N = 10_000
FUNCTION = "FS_DENSITY"


def _book(path: Path) -> Path:
    import openpyxl
    from openpyxl.worksheet.formula import ArrayFormula

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "bench"
    for i in range(1, N + 1):
        t = -20.0 + 80.0 * (i - 1) / (N - 1)  # -20..60 °C
        ws.cell(i, 1, t)
        ws.cell(i, 2, f"=SQRT(A{i}+273.15)")
        ws.cell(i, 3, t)
        ws.cell(i, 4, f'={FUNCTION}("kerosene",C{i})')
        ws.cell(i, 5, t)
    ws["F1"] = ArrayFormula(f"F1:F{N}", f'={FUNCTION}("kerosene",E1:E{N})')
    wb.save(path)
    return path


def _mixed_book(path: Path, n_cells: int = N) -> Path:
    """n_cells formula cells: column B FS_DENSITY on distinct temperatures, column C built-ins on B."""
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Data"
    for i in range(1, n_cells // 2 + 1):
        ws.cell(i, 1, 10.0 + i * 1e-3)  # distinct temperatures [°C]
        ws.cell(i, 2, f'={FUNCTION}("kerosene",A{i})')
        ws.cell(i, 3, f"=IF(ISNUMBER(B{i}),ROUND(B{i}*2+A{i},3),-1)")
    wb.save(path)
    return path


def _best(fn, repeat):
    best, out = float("inf"), None
    for _ in range(repeat):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def _recalc_cli(book: Path, out: Path, *engine) -> str:
    """``fuelsys recalc`` in a fresh interpreter, as a user runs it; its standard output."""
    env = dict(os.environ, PYTHONPATH=os.pathsep.join([str(ROOT), os.environ.get("PYTHONPATH", "")]))
    res = subprocess.run([sys.executable, "-m", "fuelsys", "recalc", *engine, str(book), "--output", str(out)],
                         capture_output=True, text=True, env=env, timeout=900)
    if res.returncode != 0:
        raise AssertionError(f"fuelsys recalc {' '.join(engine)} failed: {res.stderr}")
    return res.stdout


def run_engines(report) -> None:
    """The built-in engine against the LibreOffice engine on the same 10,000-cell book."""
    from fuelsys.sheet.calc_addin import runner

    reason = runner.unavailable_reason()
    if reason:
        print(f"bench_calc: engines skipped: {reason}")
        return
    with tempfile.TemporaryDirectory(prefix="fuelsys-bench-engines-") as tmp:
        tmp = Path(tmp)
        book = _mixed_book(tmp / "mixed.xlsx")
        builtin, _ = _best(lambda: _recalc_cli(book, tmp / "builtin.xlsx"), 2)
        lo, text = _best(lambda: _recalc_cli(book, tmp / "lo.xlsx", "--engine", "libreoffice"), 2)
        if f"{N:,} formula cells".replace(",", "") not in text.replace(",", "") or " 0 error values" not in text:
            raise AssertionError(f"the LibreOffice engine did not count {N:,} clean formula cells: {text}")
        report(f"fuelsys recalc {N:,}-cell book: built-in engine vs --engine libreoffice", builtin, lo,
               f"LibreOffice takes {lo / builtin:.1f}x the built-in's time (goal: within 3x); fresh "
               f"interpreter, extension build and LibreOffice start-up included")
        oxt = runner.build_extension(tmp)
        answer = runner.run_session([oxt], [{"src": str(book), "read": True, "count": True}], timeout=900)
    res = answer["books"][0]
    if res["counts"] != runner._count(res["cells"]):
        raise AssertionError(f"range-level counts {res['counts']} differ from the cell-by-cell reading")
    report(f"LibreOffice {N:,} formula cells: read every cell vs range-level counts", res["read_s"],
           res["count_s"], f"cell by cell: {res['read_s'] / N * 1e6:.0f} us a cell; "
           f"calculateAll {res['calculate_all_s']:.2f} s, load {res['load_s']:.2f} s")


def run(report) -> None:
    run_cells(report)
    run_engines(report)


def run_cells(report) -> None:
    from fuelsys.sheet import adapt, catalogue
    from fuelsys.sheet.calc_addin import generate, runner

    reason = runner.unavailable_reason()
    if reason:
        print(f"bench_calc: skipped: {reason}")
        return
    if FUNCTION not in catalogue.functions():
        print(f"bench_calc: skipped: {FUNCTION} is not in the catalogue")
        return
    with tempfile.TemporaryDirectory(prefix="fuelsys-bench-calc-") as tmp:
        tmp = Path(tmp)
        oxt = generate.build_oxt(tmp)
        book = _book(tmp / "bench.xlsx")
        timings = [{"name": name, "sheet": "bench", "range": f"{col}1:{col}{N}", "result": f"{out}1:{out}{N}",
                    "repeat": 3}
                   for name, col, out in (("builtin", "A", "B"), ("cells", "C", "D"), ("array", "E", "F"))]
        answer = runner.run_session([oxt], [{"src": str(book), "timings": timings}], timeout=900)
    res = answer["books"][0]
    best = {t["name"]: min(t["seconds"]) for t in res["timings"]}
    vals = {t["name"]: t["values"] for t in res["timings"]}
    if vals["cells"] != vals["array"] or not all(isinstance(v, float) for v in vals["cells"]):
        raise AssertionError(f"{FUNCTION} cells and the array formula disagree, or did not compute numbers")
    overhead_us = (best["cells"] - best["builtin"]) / N * 1e6
    report(f"LibreOffice {N:,} cells {FUNCTION} vs built-in SQRT", best["builtin"], best["cells"],
           f"{best['cells'] / N * 1e6:.1f} us a call, {overhead_us:.1f} us over the built-in "
           f"(LibreOffice {answer.get('version', '?')})")
    report(f"LibreOffice {FUNCTION}: {N:,} single cells vs one array formula", best["cells"], best["array"],
           f"array formula: {best['array'] / N * 1e6:.2f} us a cell")
    temps = [-20.0 + 80.0 * i / (N - 1) for i in range(N)]
    spec = catalogue.get(FUNCTION)
    t0 = time.perf_counter()
    for t in temps:
        adapt.call_spec(spec, "kerosene", t)
    py = time.perf_counter() - t0
    report(f"{FUNCTION} {N:,} cells: call_spec in this Python vs through LibreOffice", py, best["cells"],
           f"UNO bridge and conversion: {(best['cells'] - py) / N * 1e6:.1f} us a call")
    report("LibreOffice load (array formulas recomputed on open; first call imports numpy/scipy/CoolProp)",
           None, res["load_s"], "")
    report("LibreOffice first calculateAll after load", None, res["calculate_all_s"],
           f"{N:,} FS cells, one {N:,}-cell FS array formula, {N:,} built-in cells")
    report("LibreOffice start-up (fresh profile, then restart with the extension)", None,
           answer["start_s"] + answer.get("restart_s", 0.0), "")


if __name__ == "__main__":
    def _print(name, baseline, candidate, note=""):
        ratio = f"{baseline / candidate:.2f}x" if baseline else ""
        print(f"{name:70s} {baseline or 0:10.4g}s {candidate:10.4g}s {ratio:>8s}  {note}")

    run(_print)
