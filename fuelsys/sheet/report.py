"""``fuelsys report``: a printable PDF of a computed book, for a reviewer without a spreadsheet.

The report is read from the book itself, generically, so it follows the book
as its sheets change: the job (the first sheet's opening lines) and the
engine's and envelope's inputs (label rows), the Summary sheet's rows as
they are labelled there (with any corner or note the row carries), every
verdict and check cell with its label, every input by sheet, the charts
(found in the package's chart parts and drawn again with matplotlib from the
cells their series name), the safety cautions and the provenance (fuelsys
version, the book's inputs digest, whether its stored values are current).

A book whose stored values are stale gets a warning at the top of its first
page: the numbers shown are the stored ones.  matplotlib is imported only
here, with the Agg backend.
"""

from __future__ import annotations

import datetime as _dt
import io
import os
import re
import textwrap
from dataclasses import dataclass, field

#: page size (A4 portrait) and margins [inch]
PAGE = (8.27, 11.69)
MARGIN = 0.7
#: characters per line of body text at the body font size
LINE_CHARS = 105
#: body font size and line height [pt]
FONT = 8.5
LEAD = 11.5
#: sheets read for nothing but their own purpose
SKIP_INPUT_SHEETS = ("start here", "summary", "functions")
VERDICT_WORDS = ("verdict", "check", "notes", "validity")


# ---------------------------------------------------------------------------
# charts in the package

@dataclass
class Series:
    name: str
    x_ref: str | None
    y_ref: str | None

    def values(self, book) -> tuple[list, list]:
        """The series' x and y cell values in ``book`` (x as positions when it has none)."""
        ys = _ref_values(book, self.y_ref)
        xs = _ref_values(book, self.x_ref) if self.x_ref else list(range(1, len(ys) + 1))
        return xs, ys


@dataclass
class Chart:
    part: str
    title: str
    kind: str            # "scatter", "line", "bar"
    x_title: str = ""
    y_title: str = ""
    sheet: str = ""
    series: list = field(default_factory=list)


def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1]


def _text_of(el) -> str:
    if el is None:
        return ""
    parts = [t.text or "" for t in el.iter() if _local(t.tag) in ("t", "v")]
    return "".join(parts).strip()


def _child(el, name):
    if el is None:
        return None
    for ch in el:
        if _local(ch.tag) == name:
            return ch
    return None


def _ref_in(el) -> str | None:
    if el is None:
        return None
    for ch in el.iter():
        if _local(ch.tag) == "f" and ch.text:
            return ch.text.strip()
    return None


def _ref_values(book, ref: str | None) -> list:
    from fuelsys.sheet import evaluate as ev

    if not ref:
        return []
    try:
        node = ev.parse(ref)
    except Exception:
        return []
    if node[0] == "cell":
        _, sheet, r, c = node[:4]
        r1, c1, r2, c2 = r, c, r, c
    elif node[0] == "area":
        _, sheet, r1, c1, r2, c2 = node[:6]
    else:
        return []
    try:
        s = book.sheet(sheet)
    except KeyError:
        return []
    return [s.cells.get((r, c)) for r in range(r1, r2 + 1) for c in range(c1, c2 + 1)]


def _chart_hosts(book) -> dict:
    """Chart part -> name of the sheet whose drawing shows it."""
    import posixpath

    hosts = {}
    with book._zip() as zf:
        names = set(zf.namelist())

        def rels(part):
            folder, base = posixpath.split(part)
            rp = posixpath.join(folder, "_rels", base + ".rels")
            if rp not in names:
                return []
            out = []
            for m in re.finditer(rb"<(?:\w+:)?Relationship\b[^>]*>", zf.read(rp)):
                t = re.search(rb'Target\s*=\s*"([^"]+)"', m.group(0))
                if t:
                    target = t.group(1).decode()
                    out.append(target.lstrip("/") if target.startswith("/")
                               else posixpath.normpath(posixpath.join(folder, target)))
            return out

        for s in book.sheets:
            if not s.part:
                continue
            for d in rels(s.part):
                if "drawing" in d and d.endswith(".xml"):
                    for c in rels(d):
                        if "chart" in c:
                            hosts.setdefault(c, s.name)
    return hosts


def read_charts(book) -> list[Chart]:
    """Every chart of the book, in sheet order: title, kind, axis titles and series references."""
    import defusedxml.ElementTree as DET

    hosts = _chart_hosts(book)
    order = {s.name: i for i, s in enumerate(book.sheets)}
    charts = []
    with book._zip() as zf:
        parts = [n for n in zf.namelist() if re.fullmatch(r"xl/charts/chart\d+\.xml", n)]
        for part in parts:
            try:
                root = DET.fromstring(zf.read(part), forbid_dtd=True)
            except Exception:
                continue
            chart = _child(root, "chart")
            title = _text_of(_child(chart, "title"))
            plot = _child(chart, "plotArea")
            if plot is None:
                continue
            kinds = [ch for ch in plot if _local(ch.tag).endswith("Chart")]
            if not kinds:
                continue
            kind = _local(kinds[0].tag)[:-5].lower()
            ch = Chart(part, title, kind, sheet=hosts.get(part, ""))
            for ax in plot:
                if _local(ax.tag) in ("valAx", "catAx", "dateAx"):
                    pos = _child(ax, "axPos")
                    where = pos.get("val") if pos is not None else ""
                    t = _text_of(_child(ax, "title"))
                    if where in ("b", "t"):
                        ch.x_title = ch.x_title or t
                    else:
                        ch.y_title = ch.y_title or t
            for k in kinds:
                for ser in k:
                    if _local(ser.tag) != "ser":
                        continue
                    name = _text_of(_child(ser, "tx"))
                    x = _ref_in(_child(ser, "xVal")) or _ref_in(_child(ser, "cat"))
                    y = _ref_in(_child(ser, "yVal")) or _ref_in(_child(ser, "val"))
                    ch.series.append(Series(name, x, y))
            charts.append(ch)
    charts.sort(key=lambda c: (order.get(c.sheet, len(order)), int(re.findall(r"\d+", c.part)[-1])))
    return charts


# ---------------------------------------------------------------------------
# what the report says, read from the book

def _fmt(v, code="General") -> str:
    from fuelsys.sheet.book import display_text

    if v is None:
        return ""
    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, float):
        return display_text(v, code)
    return str(v)


def summary_rows(book, formats) -> list[tuple[str, list]]:
    """(label, [values shown]) of every labelled row of the Summary sheet, as the sheet lays them out."""
    try:
        s = book.sheet("Summary")
    except KeyError:
        return []
    fm = formats.get(s.name, {})
    rows = []
    for r in range(1, s.max_row + 1):
        label = s.cells.get((r, 1))
        vals = [(c, s.cells.get((r, c))) for c in range(2, s.max_col + 1)]
        vals = [_fmt(v, fm.get((r, c), "General")) for c, v in vals if v not in (None, "")]
        if isinstance(label, str) and label.strip() and vals:
            rows.append((label.strip(), vals))
    return rows


def verdict_cells(book) -> list[tuple[str, str, str]]:
    """(sheet, label, text) of every verdict, check and notes cell outside the Summary."""
    from fuelsys.sheet.book import Labeller

    out = []
    for s in book.sheets:
        if s.kind != "worksheet" or s.name.lower() in ("summary", "functions", "start here"):
            continue
        lab = Labeller(s)
        for (r, c), v in sorted(s.cells.items()):
            if not isinstance(v, str) or not v.strip():
                continue
            if (r, c) not in s.formulas and (r, c) not in lab.arrays:
                continue
            label = lab.label(r, c)
            if any(w in label.lower() for w in VERDICT_WORDS) or v.startswith("FS error:"):
                out.append((s.name, label, v.strip()))
    return out


def input_rows(book, formats) -> list[tuple[str, str, str]]:
    """(sheet, label, value with its unit) of every input (constant) cell of the working sheets."""
    from fuelsys.sheet.book import Labeller

    out = []
    for s in book.sheets:
        if s.kind != "worksheet" or s.name.lower() in SKIP_INPUT_SHEETS:
            continue
        lab = Labeller(s)
        fm = formats.get(s.name, {})
        for (r, c), v in sorted(s.cells.items()):
            if (r, c) in s.formulas or (r, c) in lab.arrays or v in (None, ""):
                continue
            label_row = lab.is_label_row(r)
            if label_row and c != 2:
                continue
            if not label_row:
                head, _ = lab._heading(r, c)
                if head is None or c == 1 and not isinstance(v, float):
                    continue
            if isinstance(v, str) and not label_row and c == 1:
                continue
            unit = s.cells.get((r, 3)) if label_row else ""
            text = _fmt(v, fm.get((r, c), "General"))
            if unit and isinstance(unit, str) and unit.strip() not in ("-", ""):
                text += " " + unit.strip()
            out.append((s.name, lab.label(r, c), text))
    return out


def job_lines(book) -> list[str]:
    """The first sheet's opening texts (title and scenario), up to its first empty row."""
    s = book.sheets[0]
    lines = []
    for r in range(1, s.max_row + 1):
        v = s.cells.get((r, 1))
        if not isinstance(v, str) or not v.strip():
            if lines:
                break
            continue
        lines.append(v.strip())
    return lines


def envelope_rows(rows) -> list:
    """The inputs that describe the operating envelope: ambient, cold and hot day, elevation."""
    words = ("cold", "hot", "ambient", "elevation", "envelope", "canister temperature")
    return [x for x in rows if x[0].lower() == "envelope"
            or (" / " not in x[1] and any(w in x[1].lower() for w in words))]


# ---------------------------------------------------------------------------
# the PDF

class _Pages:
    """Text and pictures flowed onto A4 pages of a matplotlib PdfPages."""

    def __init__(self, pdf):
        self.pdf = pdf
        self.fig = None
        self.y = 0.0

    def _new(self):
        from matplotlib.figure import Figure

        self.close_page()
        self.fig = Figure(figsize=PAGE)
        self.y = PAGE[1] - MARGIN

    def close_page(self):
        if self.fig is not None:
            self.pdf.savefig(self.fig)
            self.fig = None

    def _room(self, h):
        if self.fig is None or self.y - h < MARGIN:
            self._new()

    def text(self, s, size=FONT, weight="normal", color="black", indent=0.0, chars=LINE_CHARS):
        width = max(20, int(chars * FONT / size) - int(indent * 12))
        for line in textwrap.wrap(s, width) or [""]:
            h = LEAD / 72 * size / FONT
            self._room(h)
            self.fig.text((MARGIN + indent) / PAGE[0], self.y / PAGE[1], line, fontsize=size,
                          weight=weight, color=color, va="top", ha="left")
            self.y -= h

    def gap(self, pts=6):
        self.y -= pts / 72

    def heading(self, s):
        self._room(0.6)
        self.gap(8)
        self.text(s, size=12, weight="bold")
        self.gap(3)

    def pair(self, label, value, indent=0.0):
        self.text(f"{label}:  {value}", indent=indent)

    def picture(self, rgba, width_in):
        h = width_in * rgba.shape[0] / rgba.shape[1]
        self._room(h + 0.1)
        ax = self.fig.add_axes([MARGIN / PAGE[0], (self.y - h) / PAGE[1], width_in / PAGE[0], h / PAGE[1]])
        ax.imshow(rgba, interpolation="antialiased")
        ax.set_axis_off()
        self.y -= h + 0.15


def _chart_picture(chart: Chart, book):
    """The chart drawn with matplotlib from the book's numbers, as an RGBA array (a picture in the PDF)."""
    import matplotlib.image as mimg
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(6.6, 3.4), dpi=150)
    FigureCanvasAgg(fig)
    ax = fig.add_subplot(111)
    drawn = 0
    if chart.kind == "bar":
        import numpy as np

        n = len(chart.series)
        for k, ser in enumerate(chart.series):
            xs, ys = ser.values(book)
            pts = [(str(x), y) for x, y in zip(xs, ys) if isinstance(y, float)]
            if not pts:
                continue
            pos = np.arange(len(pts)) + (k - (n - 1) / 2) * 0.8 / max(n, 1)
            ax.bar(pos, [y for _, y in pts], width=0.8 / max(n, 1), label=ser.name or None)
            ax.set_xticks(np.arange(len(pts)), [x for x, _ in pts])
            drawn += 1
    else:
        for ser in chart.series:
            xs, ys = ser.values(book)
            pts = [(x, y) for x, y in zip(xs, ys) if isinstance(x, float) and isinstance(y, float)]
            if not pts:
                continue
            ax.plot([x for x, _ in pts], [y for _, y in pts], marker="o", markersize=3, label=ser.name or None)
            drawn += 1
    ax.set_title(chart.title or "chart", fontsize=10)
    ax.set_xlabel(chart.x_title, fontsize=8)
    ax.set_ylabel(chart.y_title, fontsize=8)
    ax.tick_params(labelsize=7)
    ax.grid(True, alpha=0.3)
    if drawn == 0:
        ax.text(0.5, 0.5, "no numbers in the cells this chart names", ha="center", va="center",
                transform=ax.transAxes)
    elif any(s.name for s in chart.series):
        ax.legend(fontsize=7, loc="best")
    fig.tight_layout()
    buf = io.BytesIO()
    fig.savefig(buf, format="png")
    buf.seek(0)
    return mimg.imread(buf), drawn


@dataclass
class ReportResult:
    output: str
    pages: int
    charts: int
    stale: int
    summary: list


def make_report(path, output=None, progress=None, now=None) -> ReportResult:
    """Write the PDF report of the book at ``path`` (default: BOOK-report.pdf beside it)."""
    import matplotlib

    matplotlib.use("Agg", force=False)
    from matplotlib import rcParams
    from matplotlib.backends.backend_pdf import PdfPages

    from fuelsys import __version__
    from fuelsys.sheet import xlsx
    from fuelsys.sheet.book import number_formats, inputs_digest
    from fuelsys.sheet.share import stale_cells

    path = os.fspath(path)
    output = os.fspath(output) if output else os.path.splitext(path)[0] + "-report.pdf"
    book = xlsx.read_book(path)
    formats = number_formats(book)
    stale, skipped = stale_cells(book, progress)
    summary = summary_rows(book, formats)
    inputs = input_rows(book, formats)
    when = (now or _dt.datetime.now(_dt.timezone.utc)).strftime("%Y-%m-%d %H:%M UTC")
    name = os.path.basename(path)
    charts = read_charts(book)
    rc = {"pdf.fonttype": 42, "font.family": "DejaVu Sans"}
    tmp = output + f".tmp-{os.getpid()}"
    pages = 0
    with matplotlib.rc_context(rc):
        try:
            with PdfPages(tmp, metadata={"Title": f"fuelsys report: {name}", "Creator": f"fuelsys {__version__}"}) as pdf:
                doc = _Pages(pdf)
                doc.text(f"fuelsys report: {name}", size=15, weight="bold")
                doc.text(f"made {when} by fuelsys {__version__}; inputs digest {inputs_digest(book)}")
                if stale or skipped:
                    doc.gap(6)
                    doc.text("WARNING: THE STORED VALUES OF THIS BOOK ARE STALE.", size=12, weight="bold",
                             color="darkred")
                    doc.text(f"{len(stale)} formula cell(s) differ from a fresh computation of its inputs"
                             + (f" and {len(skipped)} cannot be computed" if skipped else "")
                             + f" (for example {', '.join(c for c, *_ in (stale or skipped)[:3])}). Every number "
                             f"below is the one stored in the book, not what its inputs give now: compute it "
                             f"('fuelsys recalc {name}') and make the report again.", color="darkred")
                else:
                    doc.text("The stored values are current: a fresh computation of the book's inputs gives "
                             "the same numbers.")
                doc.heading("The job")
                for line in job_lines(book):
                    doc.text(line)
                eng = [x for x in inputs if x[0].lower() == "engine"]
                if eng:
                    doc.heading("The engine")
                    for _, label, value in eng:
                        doc.pair(label, value)
                env = envelope_rows(inputs)
                if env:
                    doc.heading("The operating envelope")
                    for sheet, label, value in env:
                        doc.pair(f"{sheet}: {label}", value)
                doc.heading("Summary (as the book's Summary sheet gives it)")
                for label, vals in summary:
                    doc.pair(label, "   ".join(vals))
                verdicts = verdict_cells(book)
                if verdicts:
                    doc.heading("Verdicts, checks and notes, with their reasons")
                    for sheet, label, text in verdicts:
                        doc.text(f"{sheet}: {label}", weight="bold")
                        doc.text(text, indent=0.2)
                doc.heading("Charts (drawn from the book's numbers)")
                for chart in charts:
                    rgba, _ = _chart_picture(chart, book)
                    doc.text(f"{chart.sheet}: {chart.title}" if chart.sheet else chart.title, weight="bold")
                    doc.picture(rgba, PAGE[0] - 2 * MARGIN)
                doc.heading("Inputs")
                last = None
                for sheet, label, value in inputs:
                    if sheet != last:
                        doc.text(sheet, weight="bold")
                        last = sheet
                    doc.pair(label, value, indent=0.2)
                doc.heading("Safety")
                from fuelsys.safety import CAUTIONS

                for line in CAUTIONS.splitlines():
                    doc.text(line)
                doc.heading("Provenance")
                computed_by = None
                for s in book.sheets:
                    for (r, c), v in s.cells.items():
                        if isinstance(v, str) and v.startswith("fuelsys ") and (r, c) in s.formulas:
                            computed_by = v
                doc.pair("book", name)
                doc.pair("computed by", computed_by or "(the book does not say)")
                doc.pair("inputs digest", f"{inputs_digest(book)} ('fuelsys check {name}' prints the same)")
                doc.pair("stored values", "stale" if (stale or skipped) else "current (checked when this report was made)")
                doc.pair("report made", f"{when} by fuelsys {__version__}")
                doc.text("The report's figures are the book's stored values; its charts are drawn again "
                         "from the cells each chart of the book names.")
                doc.close_page()
                pages = pdf.get_pagecount()
            os.replace(tmp, output)
        finally:
            if os.path.exists(tmp):
                os.unlink(tmp)
    return ReportResult(output, pages, len(charts), len(stale) + len(skipped), summary)
