"""The ``fuelsys eval``, ``fuelsys recalc`` and ``fuelsys check`` commands.

``eval FORMULA``
    Compute one formula (``fuelsys eval 'FS_DENSITY("kerosene", 15)*2'``) and
    print the value; a table prints as aligned rows; ``--json`` prints JSON.
``recalc BOOK``
    Compute every formula of a .xlsx/.xlsm workbook and store the values in
    it without touching anything else (``--output`` writes a copy instead).
``check BOOK``
    Compute without writing and list every cell whose stored value differs
    from a fresh computation (numbers beyond a relative tolerance, texts
    exactly): stale after an edit, or computed by another fuelsys version.

Exit status: 0 when all went well; 1 when a value is an error (``eval``),
cells could not be computed (``recalc`` without ``--allow-partial``) or stored
values differ (``check``); 2 when the input was refused or the command could
not run.
"""

from __future__ import annotations

import json
import os
import signal
import sys
import time

#: books with at least this many formula cells show a progress bar on a terminal
PROGRESS_FROM = 2000
#: at most this many skipped cells or differences are listed
LIST_LIMIT = 25


def add_commands(subparsers) -> None:
    """Add ``eval``, ``recalc`` and ``check`` to the ``fuelsys`` command's subparsers."""
    p = subparsers.add_parser(
        "eval", help="compute one formula and print its value",
        description="Compute one spreadsheet formula headless, e.g. "
                    "fuelsys eval 'FS_DENSITY(\"kerosene\", 15)*2'. Built-in functions and every "
                    "FS_ function are available; with --book the formula may refer to a workbook's cells.")
    p.add_argument("formula", help="the formula, with or without a leading =")
    p.add_argument("--json", action="store_true", help="print the value as JSON")
    p.add_argument("--book", help="compute this workbook first so the formula can refer to its cells")
    p.add_argument("--sheet", help="the sheet that unqualified references mean (default: the first)")
    p.set_defaults(func=cmd_eval)

    p = subparsers.add_parser(
        "recalc", help="compute a workbook's formulas and store the values in it",
        description="Compute every formula of a .xlsx/.xlsm workbook and store the results as the cells' "
                    "cached values, changing nothing else in the file, so the numbers show in any "
                    "spreadsheet program. Results are estimates: confirm them by bench tests.")
    p.add_argument("book", help="the workbook (.xlsx or .xlsm)")
    p.add_argument("-o", "--output", help="write the computed workbook here instead of in place")
    p.add_argument("--allow-partial", action="store_true",
                   help="store what could be computed even when some cells could not (they keep their old values)")
    p.add_argument("--engine", choices=("builtin", "libreoffice"), default="builtin",
                   help="builtin: fuelsys's own engine (default); libreoffice: a headless LibreOffice with "
                        "the fuelsys add-in (rewrites the whole file)")
    p.add_argument("--progress", action="store_true", help="show a progress bar even when not on a terminal")
    p.add_argument("--notes", action="store_true",
                   help="list the cells computed outside a correlation's fitted range")
    p.add_argument("--follow-symlinks", action="store_true",
                   help="when the book or --output is a symbolic link, replace the file it points to "
                        "(without this flag a link is refused)")
    p.add_argument("--force", action="store_true",
                   help="replace a read-only or hard-linked file all the same (it stays read-only; other hard "
                        "links keep the old file)")
    p.set_defaults(func=cmd_recalc)

    p = subparsers.add_parser(
        "check", help="list cells whose stored value differs from a fresh computation",
        description="Recompute a workbook without writing it and list every formula cell whose stored "
                    "value differs from the fresh result (numbers beyond a relative tolerance, texts "
                    "exactly). Exit status 0 only when none differs.")
    p.add_argument("book", help="the workbook (.xlsx or .xlsm)")
    p.add_argument("--tolerance", type=float, default=1e-9,
                   help="relative tolerance for numbers (default 1e-9)")
    p.add_argument("--allow-partial", action="store_true",
                   help="do not fail because some cells could not be computed (they are listed)")
    p.add_argument("--progress", action="store_true", help="show a progress bar even when not on a terminal")
    p.set_defaults(func=cmd_check)


# ---------------------------------------------------------------------------
# output helpers

def _err(msg: str) -> None:
    print(msg, file=sys.stderr)


def _is_failure(v) -> bool:
    from fuelsys.sheet.adapt import is_error
    from fuelsys.sheet.builtins import XlError

    return isinstance(v, XlError) or is_error(v)


def _text(v) -> str:
    from fuelsys.sheet.builtins import XlError, number_text

    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, float):
        return number_text(v)
    if isinstance(v, XlError):
        return v.code
    return "" if v is None else str(v)


def _json_value(v):
    from fuelsys.sheet.builtins import XlError

    if isinstance(v, XlError):
        return {"error": v.code}
    return v


def format_table(rows) -> str:
    """Rows of values as aligned text: numbers right-aligned, texts left-aligned."""
    cells = [[_text(v) for v in row] for row in rows]
    ncol = max(len(r) for r in cells)
    widths = [max(len(r[j]) for r in cells if j < len(r)) for j in range(ncol)]
    lines = []
    for row, texts in zip(rows, cells):
        parts = []
        for j, (v, t) in enumerate(zip(row, texts)):
            numeric = isinstance(v, float) and not isinstance(v, bool)
            parts.append(t.rjust(widths[j]) if numeric else t.ljust(widths[j]))
        lines.append("  ".join(parts).rstrip())
    return "\n".join(lines)


class _Progress:
    """A one-line progress bar on stderr, for books of at least ``min_total`` formula cells."""

    def __init__(self, label: str, min_total: int = 0, stream=None, width: int = 30):
        self.label = label
        self.min_total = min_total
        self.stream = stream or sys.stderr
        self.width = width
        self.shown = False
        self.last = -1.0

    def __call__(self, done: int, total: int) -> None:
        if total < max(1, self.min_total):
            return
        frac = done / total
        now = time.perf_counter()
        if done < total and now - self.last < 0.1:
            return
        self.last = now
        fill = int(round(frac * self.width))
        self.stream.write(f"\r{self.label} [{'#' * fill}{'.' * (self.width - fill)}] {frac:4.0%} {done}/{total}")
        self.stream.flush()
        self.shown = True

    def close(self):
        if self.shown:
            self.stream.write("\n")
            self.stream.flush()


def _progress_for(args, label: str):
    """A progress bar when asked (--progress), or on a terminal for a large book."""
    if getattr(args, "progress", False):
        return _Progress(label)
    if sys.stderr.isatty():
        return _Progress(label, min_total=PROGRESS_FROM)
    return None


# ---------------------------------------------------------------------------
# eval

def cmd_eval(args) -> int:
    from fuelsys.sheet import evaluate as ev
    from fuelsys.sheet import xlsx
    from fuelsys.sheet.builtins import Array

    try:
        value = ev.evaluate_formula(args.formula, book=args.book, sheet=args.sheet)
    except ev.Unsupported as exc:
        _err(f"fuelsys eval: formula refused: {exc}")
        return 2
    except ev.EvaluationError as exc:
        _err(f"fuelsys eval: the workbook could not be computed: {exc}")
        return 2
    except xlsx.WorkbookRefused as exc:
        _err(f"fuelsys eval: workbook refused: {exc}")
        return 2
    if isinstance(value, Array):
        rows = value.full_rows()
        failed = any(_is_failure(v) for row in rows for v in row)
        if args.json:
            print(json.dumps({"value": [[_json_value(v) for v in row] for row in rows]}))
        else:
            print(format_table(rows))
    else:
        failed = _is_failure(value)
        if args.json:
            print(json.dumps({"error": value.code} if hasattr(value, "code") else {"value": value}))
        else:
            print(_text(value))
    return 1 if failed else 0


# ---------------------------------------------------------------------------
# recalc

def _list_skipped(skipped, out=None) -> None:
    out = out or sys.stderr
    for cell, why in skipped[:LIST_LIMIT]:
        out.write(f"  not computed: {cell}: {why}\n")
    if len(skipped) > LIST_LIMIT:
        out.write(f"  ... and {len(skipped) - LIST_LIMIT} more\n")


def cmd_recalc(args) -> int:
    from fuelsys.sheet import evaluate as ev
    from fuelsys.sheet import xlsx

    if args.engine == "libreoffice":
        return _recalc_libreoffice(args)
    progress = _progress_for(args, "computing")
    try:
        rep = ev.recalc_workbook(args.book, output=args.output, allow_partial=args.allow_partial,
                                 progress=progress, follow_symlinks=getattr(args, "follow_symlinks", False),
                                 force=getattr(args, "force", False))
    except xlsx.WorkbookRefused as exc:
        _err(f"fuelsys recalc: refused: {exc}")
        return 2
    except (xlsx.WriteError, OSError) as exc:
        _err(f"fuelsys recalc: nothing written: {exc}")
        return 2
    finally:
        if progress is not None:
            progress.close()
    _list_skipped(rep.skipped)
    for w in rep.warnings:
        _err(f"note: {w}")
    if getattr(args, "notes", False):
        for cell, notes in rep.notes:
            for n in notes:
                print(f"  outside a fitted range: {cell}: {n}")
    print(rep.summary())
    return 0 if rep.written else 1


def _recalc_libreoffice(args) -> int:
    from fuelsys.sheet import xlsx

    try:
        from fuelsys.sheet.calc_addin.runner import recalc_book
    except ImportError as exc:
        _err("fuelsys recalc: the LibreOffice engine is not available here "
             f"(fuelsys.sheet.calc_addin.runner.recalc_book could not be imported: {exc}); "
             "use --engine builtin")
        return 2
    if not args.output or os.path.realpath(args.output) == os.path.realpath(args.book):
        # LibreOffice saves the whole workbook anew, which can change parts of it that the built-in
        # engine keeps byte for byte: it never overwrites the builder's own file
        _err("fuelsys recalc: the LibreOffice engine saves the whole workbook anew; give --output OTHER.xlsx, "
             "another file than the book "
             "(your book stays as it is), or use the built-in engine, which changes only the values")
        return 2
    try:
        xlsx.read_book(args.book)  # the same safety checks whatever engine computes
    except xlsx.WorkbookRefused as exc:
        _err(f"fuelsys recalc: refused: {exc}")
        return 2
    try:  # the same output policy as the built-in engine: no links, devices, read-only or linked files
        target, _ = xlsx.output_target(args.output, getattr(args, "follow_symlinks", False),
                                       getattr(args, "force", False))
    except xlsx.WriteError as exc:
        _err(f"fuelsys recalc: nothing written: {exc}")
        return 2
    t0 = time.perf_counter()
    try:
        # recalc_book writes through a temporary file beside the target and replaces it atomically
        info = recalc_book(args.book, target)
    except KeyboardInterrupt as exc:  # SIGINT, or SIGTERM/SIGHUP raised by the engine
        signum = getattr(exc, "signum", signal.SIGINT)
        _err(f"fuelsys recalc: interrupted by {signal.Signals(signum).name}; LibreOffice ended, nothing written")
        return 128 + signum
    except xlsx.WriteError as exc:
        _err(f"fuelsys recalc: refused: {exc}")
        return 2
    except Exception as exc:
        _err(f"fuelsys recalc: LibreOffice could not compute the workbook; nothing written ({exc})")
        return 2
    _err("note: LibreOffice saves the whole workbook again (the built-in engine changes only the values)")
    detail = ""
    if isinstance(info, dict) and "formulas" in info:
        detail = (f" {info.get('libreoffice', '')}: {info['formulas']} formula cells, "
                  f"{info.get('errors', 0)} error values, {info.get('fs_errors', 0)} FS error texts;").replace("  ", " ")
    print(f"{os.path.basename(args.book)}: computed by LibreOffice{detail} {time.perf_counter() - t0:.2f} s; "
          f"written to {target}")
    return 0


# ---------------------------------------------------------------------------
# check

def cmd_check(args) -> int:
    from fuelsys.sheet import evaluate as ev
    from fuelsys.sheet import xlsx

    progress = _progress_for(args, "checking")
    try:
        rep = ev.check_workbook(args.book, rel_tol=args.tolerance, progress=progress)
    except xlsx.WorkbookRefused as exc:
        _err(f"fuelsys check: refused: {exc}")
        return 2
    finally:
        if progress is not None:
            progress.close()
    for d in rep.differences[:LIST_LIMIT]:
        print(f"{d.cell}: stored {ev.describe_value(d.stored)}, computed {ev.describe_value(d.computed)}")
    if len(rep.differences) > LIST_LIMIT:
        print(f"... and {len(rep.differences) - LIST_LIMIT} more")
    _list_skipped(rep.skipped, sys.stdout)
    print(f"{os.path.basename(args.book)}: {rep.checked} cells checked, {len(rep.differences)} differ, "
          f"{len(rep.skipped)} could not be computed, {rep.seconds:.2f} s")
    if rep.differences or (rep.skipped and not args.allow_partial):
        return 1
    return 0
