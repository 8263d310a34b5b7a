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
cells could not be computed (``recalc`` without ``--allow-partial``), stored
values differ (``check``), or a formula cell holds an ``FS error:`` text or an
error value such as ``#VALUE!`` (``recalc`` and ``check`` without
``--allow-errors``; ``#N/A``, which books use to leave a gap in a chart, does
not count); 2 when the input was refused or the command could not run.
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
                    "spreadsheet program. Exit status 1 when a cell could not be computed or a formula "
                    "cell holds an FS error (unless --allow-partial / --allow-errors). "
                    "Results are estimates: confirm them by bench tests.")
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
    p.add_argument("--allow-errors", action="store_true",
                   help="exit 0 even when formula cells hold an FS error text or an error value "
                        "(they are still counted and the first few listed)")
    p.set_defaults(func=cmd_recalc)

    p = subparsers.add_parser(
        "check", help="list cells whose stored value differs from a fresh computation",
        description="Recompute a workbook without writing it and list every formula cell whose stored "
                    "value differs from the fresh result (numbers beyond a relative tolerance, texts "
                    "exactly). Exit status 0 only when none differs and no formula cell holds an FS error "
                    "(--allow-errors lets errors pass). It also prints a digest of the book's inputs, "
                    "the one 'fuelsys share' writes into a shared copy.")
    p.add_argument("book", help="the workbook (.xlsx or .xlsm)")
    p.add_argument("--tolerance", type=float, default=1e-9,
                   help="relative tolerance for numbers (default 1e-9)")
    p.add_argument("--allow-partial", action="store_true",
                   help="do not fail because some cells could not be computed (they are listed)")
    p.add_argument("--allow-errors", action="store_true",
                   help="exit 0 even when formula cells hold an FS error text or an error value")
    p.add_argument("--progress", action="store_true", help="show a progress bar even when not on a terminal")
    p.set_defaults(func=cmd_check)


# ---------------------------------------------------------------------------
# output helpers

#: at most this many error cells are named in the message
ERROR_LIST = 5


def error_cells(book) -> list[tuple[str, str]]:
    """(cell, text) of the formula cells (array cells included) of a parsed book that hold
    an ``FS error:`` text or an error value; ``#N/A`` (a chart gap) does not count."""
    from fuelsys.sheet.builtins import XlError
    from fuelsys.sheet.evaluate import full_name

    out = []
    for sheet in book.sheets:
        cells = set(sheet.formulas)
        for f in sheet.formulas.values():
            if f.kind == "array" and f.ref:
                r1, c1, r2, c2 = f.ref
                cells.update((r, c) for r in range(r1, r2 + 1) for c in range(c1, c2 + 1))
        for r, c in sorted(cells):
            v = sheet.cells.get((r, c))
            if isinstance(v, str) and v.startswith("FS error:"):
                out.append((full_name(sheet.name, r, c), v))
            elif isinstance(v, XlError) and v.code != "#N/A":
                out.append((full_name(sheet.name, r, c), v.code))
    return out


def report_errors(cells, allow: bool, out=None) -> bool:
    """Print the count and the first few error cells; True when they make the command fail."""
    out = out or sys.stdout
    if not cells:
        return False
    out.write(f"{len(cells)} formula cell(s) hold an FS error or an error value"
              f"{' (allowed by --allow-errors)' if allow else ''}:\n")
    for cell, text in cells[:ERROR_LIST]:
        out.write(f"  {cell}: {text if len(text) <= 100 else text[:97] + '...'}\n")
    if len(cells) > ERROR_LIST:
        out.write(f"  ... and {len(cells) - ERROR_LIST} more\n")
    if not allow:
        out.write("  fix the inputs these cells name, or pass --allow-errors to accept them\n")
    return not allow

def _err(msg: str) -> None:
    print(msg, file=sys.stderr)


def _is_failure(v) -> bool:
    from fuelsys.sheet.adapt import is_error
    from fuelsys.sheet.builtins import XlError

    return isinstance(v, XlError) or is_error(v)


def cell_text(v) -> str:
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
    cells = [[cell_text(v) for v in row] for row in rows]
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


def progress_for(args, label: str):
    """A progress bar when asked (--progress), or on a terminal for a large book."""
    if getattr(args, "progress", False):
        return _Progress(label)
    if sys.stderr.isatty():
        return _Progress(label, min_total=PROGRESS_FROM)
    return None


# ---------------------------------------------------------------------------
# eval

_STRING_LITERAL = r'"(?:[^"]|"")*"'


def _bare_words(formula: str) -> list[str]:
    """Names that stand bare (outside double quotes, not followed by "(") in a formula."""
    import re

    parts = re.split(f"({_STRING_LITERAL})", formula)
    words = []
    for k, part in enumerate(parts):
        if k % 2:  # a string literal
            continue
        for m in re.finditer(r"(?<![\w.!'$])([A-Za-z_][\w.-]*)(?![\w(!])", part):
            words.append(m.group(1))
    return words


def text_hints(formula: str) -> tuple[list[str], str]:
    """(bare names that are texts fuelsys knows, the formula with them quoted).

    The known texts are the built-in fuel names and the choices of every text
    argument in the catalogue; a bare name reads as a defined name and gives
    ``#NAME?``.
    """
    import re

    from fuelsys.fuels import known_fuel_names
    from fuelsys.sheet import catalogue

    known = {n.lower() for n in known_fuel_names()}
    for spec in catalogue.functions().values():
        for a in spec.args:
            known.update(ch.lower() for ch in (a.choices or ()))
    found = []
    # the longest names first, so "lpg-70-30" is quoted whole and not as "lpg"
    for word in sorted({w for w in _bare_words(formula)}, key=len, reverse=True):
        if word.lower() in known and word not in found:
            found.append(word)
    fixed = formula
    for word in found:
        parts = re.split(f"({_STRING_LITERAL})", fixed)
        pat = re.compile(r"(?<![\w.!'$])" + re.escape(word) + r"(?![\w(!-])")
        fixed = "".join(p if k % 2 else pat.sub('"' + word + '"', p) for k, p in enumerate(parts))
    return found, fixed


def _name_hint(formula: str) -> None:
    found, fixed = text_hints(formula)
    if found:
        names = ", ".join(found)
        _err(f"hint: {names} {'is a text' if len(found) == 1 else 'are texts'} and need"
             f"{'s' if len(found) == 1 else ''} double quotes (a bare name means a defined name, "
             f"hence #NAME?); try:\n  fuelsys eval '{fixed}'")
    else:
        _err("hint: #NAME? means a name the formula uses is not a function, a cell or a defined name; "
             "texts need double quotes and 'fuelsys functions' lists the FS_ functions")

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
        if any(getattr(v, "code", None) == "#NAME?" for row in rows for v in row):
            _name_hint(args.formula)
        if args.json:
            print(json.dumps({"value": [[_json_value(v) for v in row] for row in rows]}))
        else:
            print(format_table(rows))
    else:
        failed = _is_failure(value)
        if getattr(value, "code", None) == "#NAME?":
            _name_hint(args.formula)
        if args.json:
            print(json.dumps({"error": value.code} if hasattr(value, "code") else {"value": value}))
        else:
            print(cell_text(value))
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
    progress = progress_for(args, "computing")
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
    if not rep.written:
        return 1
    try:
        cells = error_cells(xlsx.read_book(rep.output))
    except xlsx.WorkbookRefused as exc:  # it was just written by us; a failure here is a real problem
        _err(f"fuelsys recalc: the written book does not read back: {exc}")
        return 2
    return 1 if report_errors(cells, getattr(args, "allow_errors", False)) else 0


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

    progress = progress_for(args, "checking")
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
    book = xlsx.read_book(args.book)
    failed = report_errors(error_cells(book), getattr(args, "allow_errors", False))
    from fuelsys.sheet.book import inputs_digest

    print(f"inputs digest {inputs_digest(book)}")
    if rep.differences or (rep.skipped and not args.allow_partial) or failed:
        return 1
    return 0
