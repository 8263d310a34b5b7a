"""The ``fuelsys`` command.

Subcommands come from the modules in :data:`COMMAND_MODULES`; each has an
``add_commands(subparsers)`` that adds its parsers and sets ``func`` (a
handler taking the parsed arguments and returning the exit status).  The
commands that belong to the command itself (``demo``, ``functions``) are
defined here.
"""

from __future__ import annotations

import argparse
import importlib
import sys

CAUTIONS = """\
SAFETY: fuel under pressure, flame and fast-rotating parts can hurt people.
- Run engines only where local rules and your club's safety code allow it;
  keep a suitable extinguisher at hand, and store and handle fuel and gas away
  from ignition sources.
- Pressure-test the fuel system before running; wear eye and hearing
  protection; keep people out of the plane of the rotor.
- These figures are estimates from published correlations. Confirm them by
  bench tests, and defer to local codes, club safety rules and licensed practice."""

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


def _version() -> str:
    import fuelsys

    return fuelsys.__version__


def _cmd_properties(args) -> int:
    import warnings

    from fuelsys.errors import ValidityWarning

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        property_tables(sys.stdout)
    notes = sorted({str(w.message) for w in caught if issubclass(w.category, ValidityWarning)})
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
    path = book.write_demo(args.folder, reports=reports)
    rows = book.read_summary(path)
    if path.name != book.DEMO_NAME:
        print(f"(kept the edited {book.DEMO_NAME} that was here; the new demo book has its own name)")
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
    counts = {}
    for d in diffs:
        counts[d.kind] = counts.get(d.kind, 0) + 1
        print(d.line())
    print("; ".join(f"{n} {k}{'s' if n != 1 else ''} differ" for k, n in counts.items()))
    return 1


def _cmd_excel_setup(args) -> int:
    from fuelsys.sheet import book

    print(book.excel_setup_text())
    return 0


def _cmd_functions(args) -> int:
    from fuelsys.sheet import catalogue

    funcs = catalogue.functions()
    if args.name:
        key = args.name.strip().upper()
        key = key if key.startswith("FS_") else "FS_" + key
        if key not in funcs:
            print(f"fuelsys functions: no function {args.name}; 'fuelsys functions' lists them", file=sys.stderr)
            return 2
        print(funcs[key].help_text())
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
    p = sub.add_parser("demo", help="size the fictional demo engine: write its computed book and print a summary")
    p.add_argument("--folder", default=".", help="where to write fuelsys-demo.xlsx (default: here)")
    p.set_defaults(func=_cmd_demo)
    p = sub.add_parser("properties", help="print property tables of the built-in kerosene and canister gases")
    p.set_defaults(func=_cmd_properties)
    p = sub.add_parser("new", help="start a book for your own engine from the starter workbook")
    p.add_argument("book", help="the new book's file name (.xlsx)")
    p.add_argument("--force", action="store_true", help="overwrite an existing file")
    p.set_defaults(func=_cmd_new)
    p = sub.add_parser("diff", help="list inputs and results that differ between two versions of a book")
    p.add_argument("old", help="the original book")
    p.add_argument("new", help="the edited copy")
    p.add_argument("--rel-tol", type=float, default=1e-9, help="relative tolerance for numbers (default 1e-9)")
    p.set_defaults(func=_cmd_diff)
    p = sub.add_parser("excel-setup", help="print the steps to use the FS_ functions live in Excel (xlwings)")
    p.set_defaults(func=_cmd_excel_setup)
    p = sub.add_parser("functions", help="list the spreadsheet functions, or describe one")
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
