"""Drive one headless LibreOffice session (run by LibreOffice's Python, which has ``uno``).

:mod:`fuelsys.sheet.calc_addin.runner` starts this script with the Python
that can import ``uno`` (the system python3 on Debian), writes a job as JSON
to its standard input and reads the answer as JSON from its standard output.
It uses the standard library and ``uno`` only, so it runs in any Python that
LibreOffice's UNO bridge supports, whatever environment fuelsys lives in.

A job::

    {"soffice": "/usr/bin/soffice", "profile": "/tmp/x" or null, "timeout": 120,
     "pidfile": "/tmp/x.pid", "extensions": ["/path/fuelsys.oxt"],
     "books": [{"src": "in.xlsx", "dst": "out.xlsx", "read": true,
                "timings": [{"name": "fs", "sheet": "bench", "range": "A1:A10000",
                             "result": "B1:B10000", "repeat": 3}]}]}

One session: start soffice with its own profile (a fresh temporary one unless
``profile`` names one) and a unique pipe, in its own process group; install
the extensions into the profile through the extension manager, then restart
soffice (an extension's UNO types load at start-up); for each book load a
copy of it hidden (so no lock file is ever left beside the original), force
recalculation with ``calculateAll()``, time the requested recalculations,
store it as .xlsx when ``dst`` is given, read every formula cell when
``read`` is true, close it; then shut soffice down (the desktop's
terminate(), then the process group killed after a timeout) in every case.
"""

import json
import os
import shutil
import signal
import subprocess
import sys
import tempfile
import time
import traceback
import uuid

import uno
import unohelper
from com.sun.star.beans import PropertyValue
from com.sun.star.task import XInteractionHandler
from com.sun.star.ucb import XCommandEnvironment, XProgressHandler

XLSX_FILTER = "Calc MS Excel 2007 XML"
# com.sun.star.sheet.CellFlags.FORMULA and com.sun.star.sheet.FormulaResult
FORMULA_FLAG = 16
RESULT_VALUE, RESULT_STRING, RESULT_ERROR = 1, 2, 4


def _prop(name, value):
    p = PropertyValue()
    p.Name = name
    p.Value = value
    return p


class _Progress(unohelper.Base, XProgressHandler):
    def push(self, status):
        pass

    def update(self, status):
        pass

    def pop(self):
        pass


class _Approve(unohelper.Base, XInteractionHandler):
    """Answers the extension manager's questions (e.g. replace an installed version) with yes."""

    def __init__(self, notes):
        self.notes = notes

    def handle(self, request):
        approve_t = uno.getTypeByName("com.sun.star.task.XInteractionApprove")
        self.notes.append("extension manager asked: " + _describe_request(request))
        for cont in request.getContinuations():
            if cont.queryInterface(approve_t) is not None:
                cont.select()
                return


def _describe_request(request):
    try:
        req = request.Request
        return f"{getattr(req, 'typeName', type(req).__name__)}: {getattr(req, 'Message', '')}".strip()
    except Exception as exc:  # describing the question must not stop the answer
        return f"(a request that cannot be shown: {type(exc).__name__})"


class _Env(unohelper.Base, XCommandEnvironment):
    def __init__(self, notes):
        self.handler = _Approve(notes)
        self.progress = _Progress()

    def getInteractionHandler(self):
        return self.handler

    def getProgressHandler(self):
        return self.progress


class Office:
    """One soffice process with its own profile and pipe."""

    def __init__(self, soffice, profile=None, timeout=120.0, pidfile=None):
        self.soffice = soffice
        self.timeout = float(timeout)
        self.pidfile = pidfile
        self.own_profile = profile is None
        self.profile = profile or tempfile.mkdtemp(prefix="fuelsys-lo-profile-")
        self.pipe = "fuelsys-" + uuid.uuid4().hex
        self.proc = None
        self.ctx = None
        self.desktop = None
        self.notes = []
        self.log_path = os.path.join(tempfile.gettempdir(), self.pipe + ".soffice.log")

    def start(self):
        os.makedirs(self.profile, exist_ok=True)
        cmd = [self.soffice, "--headless", "--invisible", "--nologo", "--norestore", "--nodefault",
               "--nolockcheck", "-env:UserInstallation=" + uno.systemPathToFileUrl(os.path.abspath(self.profile)),
               f"--accept=pipe,name={self.pipe};urp;StarOffice.ComponentContext"]
        env = dict(os.environ)
        env.setdefault("SAL_USE_VCLPLUGIN", "svp")
        self._log = open(self.log_path, "wb")
        self.proc = subprocess.Popen(cmd, stdin=subprocess.DEVNULL, stdout=self._log, stderr=subprocess.STDOUT,
                                     env=env, start_new_session=True)
        if self.pidfile:
            with open(self.pidfile, "w") as fh:
                fh.write(str(self.proc.pid))
        local = uno.getComponentContext()
        resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
        url = f"uno:pipe,name={self.pipe};urp;StarOffice.ComponentContext"
        deadline = time.monotonic() + self.timeout
        last = None
        while time.monotonic() < deadline:
            if self.proc.poll() is not None:
                raise RuntimeError(f"soffice exited with status {self.proc.returncode} before accepting "
                                   f"connections; its output: {self._output()}")
            try:
                self.ctx = resolver.resolve(url)
                break
            except Exception as exc:  # NoConnectException until soffice listens
                last = exc
                time.sleep(0.1)
        else:
            raise RuntimeError(f"soffice did not accept a connection within {self.timeout:.0f} s ({last})")
        self.desktop = self.ctx.ServiceManager.createInstanceWithContext("com.sun.star.frame.Desktop", self.ctx)

    def _output(self):
        try:
            with open(self.log_path, "rb") as fh:
                return fh.read()[-2000:].decode("utf-8", "replace").strip()
        except OSError:
            return ""

    def install(self, oxt):
        """Install (or replace) an extension in this profile's user repository."""
        mgr = self.ctx.getValueByName("/singletons/com.sun.star.deployment.ExtensionManager")
        env = _Env(self.notes)
        url = uno.systemPathToFileUrl(os.path.abspath(oxt))
        pkg = mgr.addExtension(url, (), "user", mgr.createAbortChannel(), env)
        if pkg is None:
            raise RuntimeError(f"the extension manager did not install {oxt}: {self.notes}")
        ident = pkg.getIdentifier().Value
        return {"oxt": oxt, "identifier": ident, "version": pkg.getVersion(), "profile": self.profile}

    def run_book(self, book):
        """Load a copy of the book (so no lock file appears beside the original), compute, store, read."""
        out = {"src": book["src"]}
        work = tempfile.mkdtemp(prefix="fuelsys-lo-book-")
        try:
            copy = os.path.join(work, os.path.basename(book["src"]))
            shutil.copyfile(book["src"], copy)
            self._run_copy(book, copy, out)
        finally:
            shutil.rmtree(work, ignore_errors=True)
        return out

    def _run_copy(self, book, copy, out):
        url = uno.systemPathToFileUrl(copy)
        t0 = time.perf_counter()
        doc = self.desktop.loadComponentFromURL(url, "_blank", 0, (_prop("Hidden", True),))
        out["load_s"] = time.perf_counter() - t0
        if doc is None:
            raise RuntimeError(f"LibreOffice could not open {book['src']}")
        try:
            t0 = time.perf_counter()
            doc.calculateAll()
            out["calculate_all_s"] = time.perf_counter() - t0
            if book.get("timings"):
                out["timings"] = [self._time(doc, t) for t in book["timings"]]
            if book.get("read"):
                out["cells"] = read_cells(doc)
            if book.get("dst"):
                dst = os.path.abspath(book["dst"])
                doc.storeToURL(uno.systemPathToFileUrl(dst),
                               (_prop("FilterName", XLSX_FILTER), _prop("Overwrite", True)))
                out["dst"] = dst
        finally:
            doc.close(True)

    @staticmethod
    def _time(doc, spec):
        """Recalculate what depends on ``range`` (its numbers nudged) ``repeat`` times; best times.

        Automatic recalculation is off meanwhile, so only the cells that depend
        on ``range`` are dirty when ``calculate()`` runs; when ``result`` names
        a range, reading its values is part of the time (LibreOffice may
        compute a dirty cell only when it is read) and its last values are
        returned.
        """
        sheet = doc.Sheets.getByName(spec["sheet"])
        rng = sheet.getCellRangeByName(spec["range"])
        res = sheet.getCellRangeByName(spec["result"]) if spec.get("result") else None
        data = rng.getDataArray()
        doc.enableAutomaticCalculation(False)
        times, values = [], None
        try:
            for k in range(int(spec.get("repeat", 3))):
                f = 1.0 + 1e-9 * (k + 1)
                rng.setDataArray(tuple(tuple(v * f if isinstance(v, float) else v for v in row) for row in data))
                t0 = time.perf_counter()
                doc.calculate()
                if res is not None:
                    values = res.getDataArray()
                times.append(time.perf_counter() - t0)
            rng.setDataArray(data)
            doc.calculate()
        finally:
            doc.enableAutomaticCalculation(True)
        out = {"name": spec["name"], "seconds": times}
        if values is not None:
            out["values"] = [v for row in values for v in row]
        return out

    def restart(self):
        """Stop and start again on the same profile (an extension's types load at start-up)."""
        self.stop(keep_profile=True)
        self.start()

    def stop(self, keep_profile=False):
        """Shut soffice down in every case; remove a temporary profile unless ``keep_profile``."""
        if self.desktop is not None:
            try:
                self.desktop.terminate()
            except Exception:  # the bridge goes away while terminate() returns
                pass
        self.desktop = self.ctx = None
        if self.proc is not None:
            try:
                self.proc.wait(timeout=15)
            except subprocess.TimeoutExpired:
                self.notes.append("soffice did not end after terminate(); killing its process group")
            for sig in (signal.SIGTERM, signal.SIGKILL):
                try:
                    os.killpg(self.proc.pid, sig)
                except (ProcessLookupError, PermissionError):
                    break
                time.sleep(0.5 if sig == signal.SIGTERM else 0)
            try:
                self.proc.wait(timeout=10)
            except subprocess.TimeoutExpired:
                pass
            self._log.close()
        self.proc = None
        if self.own_profile and not keep_profile:
            shutil.rmtree(self.profile, ignore_errors=True)
        try:
            os.remove(self.log_path)
        except OSError:
            pass


def read_cells(doc):
    """Every formula cell of every sheet: sheet, address, formula, result type and value."""
    cells = []
    sheets = doc.Sheets
    for i in range(sheets.Count):
        sheet = sheets.getByIndex(i)
        ranges = sheet.queryContentCells(FORMULA_FLAG)
        for addr in ranges.RangeAddresses:
            for row in range(addr.StartRow, addr.EndRow + 1):
                for col in range(addr.StartColumn, addr.EndColumn + 1):
                    cell = sheet.getCellByPosition(col, row)
                    kind = cell.FormulaResultType2
                    item = {"sheet": sheet.Name, "row": row, "col": col, "formula": cell.getFormula()}
                    if kind == RESULT_ERROR or cell.getError():
                        item["type"], item["value"] = "error", cell.getString()
                        item["error"] = cell.getError()
                    elif kind == RESULT_STRING:
                        item["type"], item["value"] = "text", cell.getString()
                    else:
                        item["type"], item["value"] = "number", cell.getValue()
                    cells.append(item)
    return cells


def main():
    job = json.load(sys.stdin)
    office = Office(job["soffice"], job.get("profile"), job.get("timeout", 120), job.get("pidfile"))
    answer = {"ok": False}

    def _term(signum, frame):
        raise SystemExit(f"stopped by signal {signum}")

    signal.signal(signal.SIGTERM, _term)
    try:
        t0 = time.perf_counter()
        office.start()
        answer["start_s"] = time.perf_counter() - t0
        answer["version"] = _version(office.ctx)
        answer["installed"] = [office.install(x) for x in job.get("extensions", [])]
        if answer["installed"] and job.get("books"):
            t0 = time.perf_counter()
            office.restart()
            answer["restart_s"] = time.perf_counter() - t0
        answer["books"] = [office.run_book(b) for b in job.get("books", [])]
        answer["ok"] = True
    except BaseException as exc:
        answer["error"] = f"{type(exc).__name__}: {exc}"
        answer["traceback"] = traceback.format_exc()
    finally:
        office.stop()
        answer["notes"] = office.notes
    json.dump(answer, sys.stdout)
    sys.stdout.flush()


def _version(ctx):
    try:
        cp = ctx.ServiceManager.createInstanceWithContext("com.sun.star.configuration.ConfigurationProvider", ctx)
        node = cp.createInstanceWithArguments("com.sun.star.configuration.ConfigurationAccess",
                                              (_prop("nodepath", "/org.openoffice.Setup/Product"),))
        return node.getByName("ooSetupVersionAboutBox")
    except Exception:
        return ""


if __name__ == "__main__":
    main()
