"""The ``fuelsys`` command.

Subcommands come from the modules in :data:`COMMAND_MODULES`; each has an
``add_commands(subparsers)`` that adds its parsers and sets ``func`` (a
handler taking the parsed arguments and returning the exit status).  The
commands that belong to the command itself (``demo``, ``functions``) are
defined here.
"""

from __future__ import annotations

import argparse
import os
import importlib
import sys

from fuelsys.safety import CAUTIONS  # printed by demo and the summary

#: modules that add subcommands (each defines ``add_commands(subparsers)``)
COMMAND_MODULES = (
    "fuelsys.sheet.commands",
    "fuelsys.sheet.calc_addin.commands",
)


def _print_table(rows, headers, out):
    widths = [max(len(h), *(len(r[i]) for r in rows)) for i, h in enumerate(headers)]
    out.write("  ".join(h.rjust(w) for h, w in zip(headers, widths)) + "\n")
    out.write("  ".join("-" * w for w in widths) + "\n")
    for r in rows:
        out.write("  ".join(c.rjust(w) for c, w in zip(r, widths)) + "\n")


def property_tables(out=None) -> None:
    """Print the built-in kerosene's properties over -40..150 °C and a propane canister table."""
    out = sys.stdout if out is None else out
    import numpy as np

    from fuelsys.constants import P_ATM, T0_C
    from fuelsys.fuels import get_fuel

    ker = get_fuel("kerosene")
    t_c = np.arange(-40.0, 151.0, 10.0)
    T = t_c + T0_C
    cols = [
        ("T [°C]", t_c, "{:.0f}"),
        ("density [kg/m³]", ker.density(T), "{:.1f}"),
        ("viscosity [mm²/s]", ker.kinematic_viscosity(T) * 1e6, "{:.3f}"),
        ("cp [kJ/(kg·K)]", ker.specific_heat(T) / 1e3, "{:.3f}"),
        ("k [W/(m·K)]", ker.conductivity(T), "{:.4f}"),
        ("σ [mN/m]", ker.surface_tension(T) * 1e3, "{:.2f}"),
        ("p_vap [bar abs]", ker.vapour_pressure(T) / 1e5, "{:.4g}"),
        ("h_vap [kJ/kg]", ker.latent_heat(T) / 1e3, "{:.1f}"),
    ]
    out.write(f"Built-in fuel 'kerosene' (a generic Jet A-1-type kerosene, fuelsys {_version()} model)\n")
    out.write("Liquid properties; vapour pressure is the bubble-point (true vapour) pressure.\n\n")
    rows = [[fmt.format(v) for _, vals, fmt in cols for v in [vals[i]]] for i in range(t_c.size)]
    _print_table(rows, [c[0] for c in cols], out)
    out.write(f"\nLower heating value {ker.lhv / 1e6:.2f} MJ/kg; stoichiometric fuel/air ratio {ker.stoich_far:.4f}\n")

    from fuelsys.fuels import gases

    t_can = np.arange(-20.0, 41.0, 5.0)
    names = ["propane", "lpg-70-30", "butane"]
    cols = [("T [°C]", t_can, "{:.0f}")]
    for n in names:
        g = gases.get_gas(n)
        cols.append((f"{n} [bar gauge]", (g.canister_pressure(t_can + T0_C) - P_ATM) / 1e5, "{:.2f}"))
    out.write("\nGas canister pressure (saturated liquid in the canister, CoolProp reference equations)\n\n")
    rows = [[fmt.format(v) for _, vals, fmt in cols for v in [vals[i]]] for i in range(t_can.size)]
    _print_table(rows, [c[0] for c in cols], out)


_NOTE_RE = None


def in_table_units(note: str) -> str:
    """A validity note in the units of the printed tables: kelvin as °C, pascal as bar.

    The core speaks SI (``temperature 233.1 outside its range 255.4..422 [K]``);
    the tables are in °C and bar, so the note is restated in them.
    """
    import re

    global _NOTE_RE
    if _NOTE_RE is None:
        num = r"(-?[\d.]+(?:e[-+]?\d+)?)"
        _NOTE_RE = re.compile(rf"{num} outside its range {num}\.\.{num} \[(K|Pa)\]")

    def convert(m):
        v, lo, hi, unit = float(m.group(1)), float(m.group(2)), float(m.group(3)), m.group(4)
        if unit == "K":
            return f"{v - 273.15:.3g} outside its range {lo - 273.15:.3g}..{hi - 273.15:.3g} [°C]"
        return f"{v / 1e5:.4g} outside its range {lo / 1e5:.4g}..{hi / 1e5:.4g} [bar abs]"

    return _NOTE_RE.sub(convert, note)


def _version() -> str:
    import fuelsys

    return fuelsys.__version__


def _cmd_properties(args) -> int:
    import warnings

    from fuelsys.errors import ValidityWarning

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        property_tables(sys.stdout)
    notes = sorted({in_table_units(str(w.message)) for w in caught if issubclass(w.category, ValidityWarning)})
    if notes:
        print("\nOutside a correlation's fitted range (computed, but treat with care):")
        for n in notes:
            print(f"- {n}")
    print()
    print(CAUTIONS)
    return 0


def _fmt(v) -> str:
    if isinstance(v, float):
        return f"{v:.3g}" if abs(v) < 100 else f"{v:.1f}"
    return str(v)


def print_summary(rows, out=None) -> None:
    """The sizing summary: (label, value) rows read from a computed book."""
    out = sys.stdout if out is None else out
    width = max(len(label) for label, _ in rows)
    for label, value in rows:
        text = _fmt(value)
        if isinstance(value, str) and len(text) > 70:  # verdict texts: wrap under the label
            import textwrap

            out.write(f"  {label}:\n")
            for line in textwrap.wrap(text, 90):
                out.write(f"      {line}\n")
        else:
            out.write(f"  {label.ljust(width)}  {text}\n")


def _cmd_demo(args) -> int:
    import time

    from fuelsys import demo
    from fuelsys.sheet import book

    t0 = time.perf_counter()
    print(f"fuelsys demo: sizing the fuel system of the {demo.ENGINE_NAME}")
    print("(a scenario of our own invention: the engine, its club and every figure in it are fictional)")
    print("computing the demo book ...", flush=True)
    reports = []
    replaced = []
    path = book.write_demo(args.folder, reports=reports, replaced=replaced)
    rows = book.read_summary(path)
    if path.name != book.DEMO_NAME:
        print(f"kept the edited {book.DEMO_NAME} that was here (its inputs or formulas differ from the demo's); "
              f"the new demo book has its own name")
    if replaced:
        print(f"replaced the earlier demo book {replaced[0]} (its inputs and formulas were the demo's own, "
              "so nothing of yours was in it)")
    print(f"wrote {path} ({time.perf_counter() - t0:.1f} s); its Summary sheet says:\n")
    print_summary(rows)
    notes = reports[-1].notes if reports else []
    if notes:
        print(f"\n{len(notes)} cell(s) were computed outside a correlation's fitted range, for example:")
        for cell, texts in notes[:3]:
            print(f"  {cell}: {texts[0]}")
        print(f"  ('fuelsys recalc {path.name} --notes' lists them all)")
    print(f"\nOpen {path.name} in a spreadsheet program to see every formula, chart and verdict;"
          " 'fuelsys new MYBOOK.xlsx' starts a book for your own engine.\n")
    print(CAUTIONS)
    return 0


def _cmd_new(args) -> int:
    from fuelsys.sheet import book

    try:
        path = book.new_book(args.book, force=args.force)
    except (FileExistsError, ValueError) as exc:
        print(f"fuelsys new: {exc}", file=sys.stderr)
        return 2
    print(f"wrote {path}: the starter book with example figures of a fictional engine; replace the shaded inputs")
    return 0


def _cmd_diff(args) -> int:
    from fuelsys.sheet import book
    from fuelsys.sheet.xlsx import WorkbookRefused

    try:
        diffs = book.diff_books(args.old, args.new, rel_tol=args.rel_tol)
    except (WorkbookRefused, OSError, KeyError) as exc:
        print(f"fuelsys diff: {exc}", file=sys.stderr)
        return 2
    if not diffs:
        print("no differences in inputs, formulas or stored results")
        return 0
    kinds = {k: [d for d in diffs if d.kind == k] for k in ("sheet", "input", "formula", "result")}
    for d in kinds["sheet"] + kinds["input"] + kinds["formula"]:
        print(d.line())
    results = kinds["result"]
    shown = results if args.all else [d for d in results if d.visible]
    hidden = len(results) - len(shown)
    if results:
        cause = "that follow from them" if (kinds["input"] or kinds["formula"] or kinds["sheet"]) else \
            "(no input or formula differs: one of the books was computed elsewhere, or is stale)"
        detail = (f"; {hidden} of them change only below the digits the book shows (--all lists them)"
                  if hidden else "")
        print(f"\n{len(results)} result{'s' if len(results) != 1 else ''} {cause}{detail}:"
              if shown else f"\n{len(results)} result{'s' if len(results) != 1 else ''} {cause}{detail}")
        for d in shown:
            print(d.line(exact=args.all))
    parts = [book.counted(len(kinds[k]), k) for k in ("sheet", "input", "formula") if kinds[k]]
    parts.append(book.counted(len(results), "result") + (f" ({hidden} too small to show)" if hidden else ""))
    print("\n" + "; ".join(parts))
    return 1


def _cmd_share(args) -> int:
    from fuelsys.sheet import share
    from fuelsys.sheet.commands import progress_for, report_errors
    from fuelsys.sheet.xlsx import WorkbookRefused, WriteError

    progress = progress_for(args, "checking")
    try:
        rep = share.share_book(args.book, args.output, force=args.force, progress=progress)
    except share.ShareRefused as exc:
        print(f"fuelsys share: {exc}", file=sys.stderr)
        return 1 if exc.stale else 2
    except WorkbookRefused as exc:
        print(f"fuelsys share: refused: {exc}", file=sys.stderr)
        return 2
    except (WriteError, OSError) as exc:
        print(f"fuelsys share: nothing written: {exc}", file=sys.stderr)
        return 2
    finally:
        if progress is not None:
            progress.close()
    print(f"wrote {rep.output}: {rep.cells} cells that need fuelsys now hold their values "
          f"({len(rep.replaced)} formulas, listed on its first sheet '{share.ABOUT_SHEET}'); "
          f"{rep.kept} formulas of the spreadsheet's own kept; inputs digest {rep.digest}; {rep.seconds:.1f} s")
    print(f"A reader checks it with 'fuelsys check {os.path.basename(args.book)}' on the original "
          "(0 differ, the same inputs digest).")
    report_errors(rep.errors, allow=True)
    return 0


def _cmd_report(args) -> int:
    from fuelsys.sheet import report
    from fuelsys.sheet.commands import progress_for
    from fuelsys.sheet.xlsx import WorkbookRefused

    progress = progress_for(args, "checking")
    try:
        rep = report.make_report(args.book, args.output, progress=progress)
    except WorkbookRefused as exc:
        print(f"fuelsys report: refused: {exc}", file=sys.stderr)
        return 2
    except ImportError as exc:
        print(f"fuelsys report: matplotlib is needed to draw the charts ({exc}); pip install matplotlib",
              file=sys.stderr)
        return 2
    except OSError as exc:
        print(f"fuelsys report: nothing written: {exc}", file=sys.stderr)
        return 2
    finally:
        if progress is not None:
            progress.close()
    print(f"wrote {rep.output}: {rep.pages} pages, {len(rep.summary)} summary rows, {rep.charts} charts")
    if rep.stale:
        print(f"WARNING: the book's stored values are stale ({rep.stale} cells differ from a fresh computation); "
              "its first page says so. Run 'fuelsys recalc' and make the report again.")
        return 1
    return 0


def _cmd_excel_setup(args) -> int:
    from fuelsys.sheet import book

    print(book.excel_setup_text())
    return 0


#: an area of at most this many cells is written out as an array constant in an example
EXAMPLE_AREA_CELLS = 40


def _literal(v) -> str | None:
    """A stored cell value as a formula constant (None for an empty cell or an error)."""
    from fuelsys.sheet.builtins import number_text

    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, float):
        return number_text(float(f"{v:.6g}"))
    if isinstance(v, str) and v and not v.startswith("FS error:"):
        return '"' + v.replace('"', '""') + '"'
    return None


class _BookExamples:
    """Self-contained calls of the FS_ functions built from a computed book's own inputs.

    Each FS_ call in the book's formulas whose arguments are constants, cells,
    defined names of cells or small ranges is written out with the stored
    values in place of the references; a function the book does not call on
    such arguments borrows each argument's value, by name, from the calls of
    other functions.
    """

    def __init__(self, path):
        from fuelsys.sheet import catalogue
        from fuelsys.sheet import evaluate as ev
        from fuelsys.sheet.xlsx import read_book

        self.book = read_book(path)
        self.ev = ev
        self.sheets = {s.name.upper(): s for s in self.book.sheets}
        self.names = {dn.name.upper(): dn.text for dn in self.book.names if dn.scope is None}
        funcs = catalogue.functions()
        self.calls: dict[str, str] = {}
        self.by_arg: dict[str, str] = {}
        for sheet in self.book.sheets:
            for (r, c), f in sorted(sheet.formulas.items()):
                if not f.text or "FS_" not in f.text.upper():
                    continue
                try:
                    tree = ev.parse(f.text)
                except Exception:
                    continue
                for name, args in self._calls(tree):
                    spec = funcs.get(name)
                    if spec is None:
                        continue
                    texts = [self._arg(a, sheet) for a in args]
                    for a, t in zip(spec.args, texts):
                        if t is not None and t != "":
                            self.by_arg.setdefault(a.name, t)
                    if name not in self.calls and all(t is not None for t in texts):
                        self.calls[name] = f"{name}({', '.join(texts)})"

    def _calls(self, node):
        if isinstance(node, tuple):
            if node and node[0] == "call":
                yield node[1].upper(), node[2]
                for a in node[2]:
                    yield from self._calls(a)
            else:
                for x in node[1:]:
                    if isinstance(x, tuple):
                        yield from self._calls(x)
                    elif isinstance(x, list):
                        for y in x:
                            yield from self._calls(y)

    def _arg(self, node, sheet, depth=0):
        kind = node[0]
        if kind == "num":
            return _literal(float(node[1]))
        if kind == "str":
            return _literal(node[1]) or '""'
        if kind == "bool":
            return _literal(bool(node[1]))
        if kind == "missing" or node == ("missing",):
            return ""
        if kind == "un" and node[1] == "-" and node[2][0] == "num":
            return _literal(-float(node[2][1]))
        if kind == "cell":
            target = self.sheets.get((node[1] or sheet.name).upper())
            return _literal(target.cells.get((node[2], node[3]))) if target else None
        if kind == "area":
            target = self.sheets.get((node[1] or sheet.name).upper())
            _, _, r1, c1, r2, c2 = node[:6]
            if target is None or None in (r1, c1, r2, c2) or (r2 - r1 + 1) * (c2 - c1 + 1) > EXAMPLE_AREA_CELLS:
                return None
            rows = []
            for r in range(r1, r2 + 1):
                row = [_literal(target.cells.get((r, c))) for c in range(c1, c2 + 1)]
                if None in row:
                    return None
                rows.append(",".join(row))
            return "{" + ";".join(rows) + "}"
        if kind == "name" and depth < 3:
            text = self.names.get(node[2].upper())
            if text is None:
                return None
            try:
                return self._arg(self.ev.parse(text), sheet, depth + 1)
            except Exception:
                return None
        return None

    def formula(self, spec) -> str | None:
        if spec.name in self.calls:
            return self.calls[spec.name]
        texts = []
        for a in spec.args:
            t = self.by_arg.get(a.name)
            if t is None and a.kind == "fuel":
                t = '"kerosene"'
            if t is None:
                if a.required:
                    return None
                break
            texts.append(t)
        return f"{spec.name}({', '.join(texts)})"


def function_example(spec, book_path=None):
    """(formula, value, notes) of an example call of ``spec`` with the demo book's figures, or None.

    The formula is self-contained (constants only) and is computed here, so the
    result shown is what the function gives today.
    """
    from fuelsys.sheet import evaluate as ev
    from fuelsys.sheet.adapt import set_note_sink

    if book_path is None:
        from fuelsys.sheet.starter import EXAMPLE_PATH

        book_path = EXAMPLE_PATH
    if not spec.args:
        text = f"{spec.name}()"
    else:
        try:
            text = _BookExamples(book_path).formula(spec)
        except Exception:  # no demo book here (an installed package), or one that does not read
            return None
        if text is None:
            return None
    sink: list = []
    outer = set_note_sink(sink)
    try:
        value = ev.evaluate_formula(text)
    except Exception:
        return None
    finally:
        set_note_sink(outer)
    return text, value, list(dict.fromkeys(sink))


def describe_function(spec) -> str:
    """``fuelsys functions NAME``: arguments, method, validity and an example with its result."""
    import textwrap

    from fuelsys.sheet.commands import format_table, cell_text

    lines = [spec.help_text(), ""]
    lines += textwrap.wrap(f"method: {spec.source}", 96, subsequent_indent="  ")
    bounds = [f"{a.name} {a.range_text()}" for a in spec.args if a.range_text()]
    lines += textwrap.wrap("validity: inputs " + ("; ".join(bounds) if bounds else "as described above")
                           + " (outside these the cell shows an FS error text). Inside them, a result "
                           "computed outside a correlation's fitted range is still given but flagged: "
                           "the example shows its flags, and 'fuelsys recalc BOOK --notes' lists a book's.",
                           96, subsequent_indent="  ")
    ex = function_example(spec)
    if ex is None:
        lines.append("example: none can be built here (the demo book does not call it on plain values)")
    else:
        text, value, notes = ex
        lines.append("example (the demo book's figures):")
        lines.append(f"  fuelsys eval '{text}'")
        def short(v):
            return float(f"{v:.6g}") if isinstance(v, float) else v

        if hasattr(value, "full_rows"):
            rows = [[short(v) for v in row] for row in value.full_rows()]
            lines.append(textwrap.indent(format_table(rows), "    "))
        else:
            lines.append(f"    {cell_text(short(value))}")
        for n in notes:
            lines += textwrap.wrap(f"flagged: {n}", 96, initial_indent="    ", subsequent_indent="      ")
    return "\n".join(lines)


def _cmd_functions(args) -> int:
    from fuelsys.sheet import catalogue

    funcs = catalogue.functions()
    if args.name:
        key = args.name.strip().upper()
        key = key if key.startswith("FS_") else "FS_" + key
        if key not in funcs:
            print(f"fuelsys functions: no function {args.name}; 'fuelsys functions' lists them", file=sys.stderr)
            return 2
        print(describe_function(funcs[key]))
        return 0
    for spec in funcs.values():
        print(f"{spec.signature():70s} {spec.summary}")
    return 0


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="fuelsys",
        description="Size the fuel system of a small gas turbine: fuel properties, needles, "
                    "vaporisers, pump and gas start, and compute fuelsys workbooks headless.",
        epilog="Results are estimates: confirm them by bench tests. See README for the safety cautions.",
    )
    parser.add_argument("--version", action="version", version=f"fuelsys {_version()}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    p = sub.add_parser(
        "demo", help="size the fictional demo engine: write its computed book and print a summary",
        description="Build the book of the demo engine (a fictional engine of our own invention), compute it "
                    "and print its Summary sheet. It writes fuelsys-demo.xlsx in the folder; an earlier demo "
                    "book there is replaced only when its inputs and formulas are the demo's own (it says "
                    "so), and a demo book you edited is kept: the new one then gets the next free name.")
    p.add_argument("--folder", default=".", help="where to write fuelsys-demo.xlsx (default: here)")
    p.set_defaults(func=_cmd_demo)
    p = sub.add_parser(
        "properties", help="print property tables of the built-in kerosene and canister gases",
        description="Print the built-in kerosene's liquid properties from -40 to 150 °C and the canister "
                    "pressure of propane, a propane/butane blend and butane from -20 to 40 °C, with any "
                    "value computed outside a correlation's fitted range named in the tables' units.")
    p.set_defaults(func=_cmd_properties)
    p = sub.add_parser(
        "new", help="start a book for your own engine from the starter workbook",
        description="Write a copy of the starter workbook under a new name, to fill in with your own "
                    "engine's figures (the shaded cells). An existing file is never replaced unless --force.")
    p.add_argument("book", help="the new book's file name (.xlsx)")
    p.add_argument("--force", action="store_true", help="overwrite an existing file")
    p.set_defaults(func=_cmd_new)
    p = sub.add_parser(
        "diff", help="list inputs and results that differ between two versions of a book",
        description="Compare two versions of a book, cell by cell, and name each difference by sheet, "
                    "row label and column heading: first the inputs and formulas that were changed, then "
                    "the results that follow from them. A result whose change does not show at the "
                    "number of digits the book displays (its number format; 6 significant digits for "
                    "General) is counted, not listed, unless --all. Exit status 0 when nothing differs, 1 when something does, 2 when a book is refused.")
    p.add_argument("old", help="the original book")
    p.add_argument("new", help="the edited copy")
    p.add_argument("--rel-tol", type=float, default=1e-9, help="relative tolerance for numbers (default 1e-9)")
    p.add_argument("--all", action="store_true",
                   help="list every result that differs, also changes too small to show, with enough digits")
    p.set_defaults(func=_cmd_diff)
    p = sub.add_parser(
        "share", help="write a copy of a computed book that opens complete without fuelsys",
        description="Write a copy of BOOK for people without fuelsys: every cell that needs an FS_ function "
                    "holds the value computed in the book, cells with only the spreadsheet's own functions "
                    "keep their formulas, and charts, formats, comments and validation stay as they are. A "
                    "first sheet, 'About this copy', gives the fuelsys version, the date, a digest of the "
                    "book's inputs, how to check the copy, and every formula the values replace. A book "
                    "whose stored values are stale is refused (exit 1): run 'fuelsys recalc' first. The "
                    "book itself is never changed.")
    p.add_argument("book", help="the computed workbook (.xlsx or .xlsm)")
    p.add_argument("-o", "--output", help="the copy to write (default: BOOK-shared.xlsx beside the book)")
    p.add_argument("--force", action="store_true", help="replace an existing copy")
    p.add_argument("--progress", action="store_true", help="show a progress bar even when not on a terminal")
    p.set_defaults(func=_cmd_share)
    p = sub.add_parser(
        "report", help="write a printable PDF report of a computed book (charts drawn with matplotlib)",
        description="Write a PDF a reviewer reads without a spreadsheet: the job, the engine and its envelope, "
                    "the Summary sheet's figures, every verdict and check with its reasons, the charts drawn "
                    "from the book's numbers, the inputs, the safety cautions and the provenance. A book whose "
                    "stored values are stale gets a warning on the first page (and exit status 1).")
    p.add_argument("book", help="the computed workbook (.xlsx or .xlsm)")
    p.add_argument("-o", "--output", help="the PDF to write (default: BOOK-report.pdf beside the book)")
    p.add_argument("--progress", action="store_true", help="show a progress bar even when not on a terminal")
    p.set_defaults(func=_cmd_report)
    p = sub.add_parser(
        "excel-setup", help="print the steps to use the FS_ functions live in Excel (xlwings)",
        description="Print the steps that make the FS_ functions work live in Excel on Windows through the "
                    "xlwings add-in (not tested on this project's Linux machines).")
    p.set_defaults(func=_cmd_excel_setup)
    p = sub.add_parser(
        "functions", help="list the spreadsheet functions, or describe one",
        description="List every FS_ spreadsheet function with its arguments, or describe one: its "
                    "arguments and units, its method and source, the allowed inputs, and an example "
                    "built from the demo book's figures, computed here.")
    p.add_argument("name", nargs="?", help="a function name such as FS_NEEDLE_FLOW")
    p.set_defaults(func=_cmd_functions)
    for modname in COMMAND_MODULES:
        try:
            mod = importlib.import_module(modname)
        except ModuleNotFoundError as exc:
            if not (exc.name and (modname + ".").startswith(exc.name + ".")):
                raise
            continue
        mod.add_commands(sub)
    return parser


def main(argv=None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "func", None):
        parser.print_help()
        return 2
    return int(args.func(args) or 0)


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
