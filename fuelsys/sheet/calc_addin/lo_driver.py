"""Drive one headless LibreOffice session (run by LibreOffice's Python, which has ``uno``).

:mod:`fuelsys.sheet.calc_addin.runner` starts this script with the Python
that can import ``uno`` (the system python3 on Debian), writes a job as JSON
to its standard input and reads the answer as JSON from its standard output.
It uses the standard library and ``uno`` only, so it runs in any Python that
LibreOffice's UNO bridge supports, whatever environment fuelsys lives in.

A job::

    {"soffice": "/usr/bin/soffice", "profile": "/tmp/x" or null, "timeout": 120,
     "pidfile": "/tmp/x.pid", "workdir": "/tmp/fuelsys-lo-<pid>-<random>" or null,
     "parent_pid": 1234, "cleanup": ["/tmp/fuelsys-recalc-<pid>-<random>"],
     "extensions": ["/path/fuelsys.oxt"],
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
``read`` is true, count formula cells, error results and ``FS error:``
texts with range-level queries when ``count`` is true, close it; then shut soffice down (the desktop's
terminate(), then the process group killed after a timeout) in every case.

Stopping: SIGTERM, SIGINT and SIGHUP are blocked in every thread and taken by
one waiting thread, and a second thread watches ``parent_pid`` (the runner
also sets PR_SET_PDEATHSIG on Linux); either ends soffice's process group at
once (SIGTERM, SIGKILL after 1 s), removes the session's files (the folder
``workdir``: profile, soffice's log and TMPDIR, the book's copy) and, when
the parent has died, the runner's folders listed in ``cleanup``, then exits.
soffice itself gets SIGKILL should this driver die.
"""

import json
import os
import shutil
import signal
import subprocess
import sys
import tempfile
import threading
import time
import traceback
import uuid

#: the signals that stop a session; blocked in every thread and taken by one waiting thread
#: (set before ``import uno`` starts any thread), so they act at once even while a UNO call blocks
STOP_SIGNALS = tuple(getattr(signal, n) for n in ("SIGTERM", "SIGINT", "SIGHUP") if hasattr(signal, n))
if __name__ == "__main__" and hasattr(signal, "pthread_sigmask"):
    signal.pthread_sigmask(signal.SIG_BLOCK, STOP_SIGNALS)

import uno  # noqa: E402  (after the signal mask)
import unohelper  # noqa: E402
from com.sun.star.beans import PropertyValue  # noqa: E402
from com.sun.star.task import XInteractionHandler  # noqa: E402
from com.sun.star.ucb import XCommandEnvironment, XProgressHandler  # noqa: E402

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

    def __init__(self, soffice, profile=None, timeout=120.0, pidfile=None, workdir=None):
        self.soffice = soffice
        self.timeout = float(timeout)
        self.pidfile = pidfile
        # everything of this session (profile unless given, soffice's log and TMPDIR, book copies) lives
        # in workdir: the runner's own folder, or one made here with this process's pid in its name
        self.own_workdir = workdir is None
        self.workdir = workdir or tempfile.mkdtemp(prefix=f"fuelsys-lo-{os.getpid()}-")
        self.own_profile = profile is None
        self.profile = profile or os.path.join(self.workdir, "profile")
        self.pipe = "fuelsys-" + uuid.uuid4().hex
        self.proc = None
        self.ctx = None
        self.desktop = None
        self.notes = []
        self.log_path = os.path.join(self.workdir, "soffice.log")
        self.tmpdir = os.path.join(self.workdir, "tmp")

    def start(self):
        os.makedirs(self.profile, exist_ok=True)
        cmd = [self.soffice, "--headless", "--invisible", "--nologo", "--norestore", "--nodefault",
               "--nolockcheck", "-env:UserInstallation=" + uno.systemPathToFileUrl(os.path.abspath(self.profile)),
               f"--accept=pipe,name={self.pipe};urp;StarOffice.ComponentContext"]
        env = dict(os.environ)
        env.setdefault("SAL_USE_VCLPLUGIN", "svp")
        os.makedirs(self.tmpdir, exist_ok=True)
        env["TMPDIR"] = self.tmpdir  # LibreOffice's own temporary files go with the session's folder
        self._log = open(self.log_path, "wb")
        self.proc = subprocess.Popen(cmd, stdin=subprocess.DEVNULL, stdout=self._log, stderr=subprocess.STDOUT,
                                     env=env, start_new_session=True, preexec_fn=_soffice_preexec(os.getpid()))
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
        work = tempfile.mkdtemp(prefix="book-", dir=self.workdir)
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
                t0 = time.perf_counter()
                out["cells"] = read_cells(doc)
                out["read_s"] = time.perf_counter() - t0
            if book.get("count"):
                t0 = time.perf_counter()
                out["counts"] = count_cells(doc)
                out["count_s"] = time.perf_counter() - t0
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
        if not keep_profile:
            self.remove_files()

    def abort(self):
        """End soffice's process group at once (SIGTERM, SIGKILL after 1 s); remove this session's files.

        A killed soffice leaves the sockets of its pipes in /tmp; those its
        processes have open are found first (Linux /proc) and removed after.
        """
        proc = self.proc
        sockets = []
        if proc is not None:
            sockets = _group_sockets(proc.pid)
            _kill_group(proc.pid, grace=1.0)
        self.remove_files()
        for path in sockets:
            try:
                os.remove(path)
            except OSError:
                pass

    def remove_files(self):
        """This session's own files: the profile unless it was given, the log, LibreOffice's temp files,
        and the socket of soffice's pipe (which soffice removes only when it ends in order)."""
        for folder in _PIPE_DIRS:
            try:
                os.remove(os.path.join(folder, f"OSL_PIPE_{os.getuid()}_{self.pipe}"))
            except (OSError, AttributeError):
                pass
        if self.own_profile:
            shutil.rmtree(self.profile, ignore_errors=True)
        if self.own_workdir:
            shutil.rmtree(self.workdir, ignore_errors=True)
        else:
            shutil.rmtree(self.tmpdir, ignore_errors=True)
            try:
                os.remove(self.log_path)
            except OSError:
                pass


FS_ERROR_PREFIX = "FS error:"


def _cell_count(ranges):
    return sum((a.EndRow - a.StartRow + 1) * (a.EndColumn - a.StartColumn + 1) for a in ranges.RangeAddresses)


def count_cells(doc):
    """Formula cells, error results and ``FS error:`` texts of every sheet, by range-level queries.

    The sheet's own queries find the formula cells (queryContentCells) and
    those with an error or a text result (queryFormulaCells); only the text
    results are read, one getDataArray per block of them, to find the
    ``FS error:`` texts.  A few UNO calls per sheet instead of one per cell.
    """
    counts = {"formulas": 0, "errors": 0, "fs_errors": 0}
    sheets = doc.Sheets
    for i in range(sheets.Count):
        sheet = sheets.getByIndex(i)
        counts["formulas"] += _cell_count(sheet.queryContentCells(FORMULA_FLAG))
        counts["errors"] += _cell_count(sheet.queryFormulaCells(RESULT_ERROR))
        for addr in sheet.queryFormulaCells(RESULT_STRING).RangeAddresses:
            block = sheet.getCellRangeByPosition(addr.StartColumn, addr.StartRow, addr.EndColumn, addr.EndRow)
            counts["fs_errors"] += sum(1 for row in block.getDataArray() for v in row
                                       if isinstance(v, str) and v.startswith(FS_ERROR_PREFIX))
    return counts


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


_PR_SET_PDEATHSIG = 1
#: where LibreOffice's runtime puts the socket of a named pipe (fixed places, not TMPDIR)
_PIPE_DIRS = ("/tmp", "/var/tmp")


def _libc():
    if not sys.platform.startswith("linux"):
        return None
    try:
        import ctypes

        return ctypes.CDLL(None, use_errno=True)
    except (OSError, ImportError):
        return None


_LIBC = _libc()  # loaded before any fork


def _soffice_preexec(parent):
    """In soffice's child before exec: the stop signals unblocked again; SIGKILL when this driver dies."""

    def preexec():
        if hasattr(signal, "pthread_sigmask"):
            signal.pthread_sigmask(signal.SIG_UNBLOCK, STOP_SIGNALS)
        if _LIBC is not None:
            _LIBC.prctl(_PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0)
        if os.getppid() != parent:
            os.kill(os.getpid(), signal.SIGKILL)

    return preexec if os.name == "posix" else None


def _group_sockets(pgid):
    """Paths of the LibreOffice pipe sockets (in /tmp, /var/tmp) that the processes of a group have open."""
    try:
        inodes = set()
        for entry in os.scandir("/proc"):
            if not entry.name.isdigit():
                continue
            try:
                with open(f"/proc/{entry.name}/stat", "rb") as fh:
                    fields = fh.read().rsplit(b")", 1)[1].split()
                if int(fields[2]) != pgid:  # the field after state and ppid: the process group
                    continue
                for fd in os.scandir(f"/proc/{entry.name}/fd"):
                    link = os.readlink(fd.path)
                    if link.startswith("socket:["):
                        inodes.add(link[8:-1])
            except (OSError, ValueError, IndexError):
                continue
        paths = []
        with open("/proc/net/unix") as fh:
            next(fh)
            for line in fh:
                parts = line.split()
                if len(parts) >= 8 and parts[6] in inodes:
                    path = parts[7]
                    if os.path.dirname(path) in _PIPE_DIRS and os.path.basename(path).startswith("OSL_PIPE_"):
                        paths.append(path)
        return paths
    except OSError:
        return []


def _kill_group(pgid, grace=1.0):
    try:
        os.killpg(pgid, signal.SIGTERM)
    except OSError:
        return
    deadline = time.monotonic() + grace
    while time.monotonic() < deadline:
        try:
            os.killpg(pgid, 0)
        except OSError:
            return
        time.sleep(0.05)
    try:
        os.killpg(pgid, signal.SIGKILL)
    except OSError:
        pass


#: held by whoever ends the process: the main thread's orderly end, or an abort
_EXIT = threading.Lock()


def _abort(office, job, why):
    """End soffice and remove the session's files at once, then exit (from a guard thread)."""
    if not _EXIT.acquire(blocking=False):
        return  # the main thread is already ending the session
    try:
        office.abort()
        parent = job.get("parent_pid")
        if parent and os.getppid() != parent:  # fuelsys is gone: nobody else removes its scratch folders
            for path in job.get("cleanup", []):
                shutil.rmtree(path, ignore_errors=True)
        try:
            json.dump({"ok": False, "error": why, "notes": office.notes}, sys.stdout)
            sys.stdout.flush()
        except (OSError, ValueError):
            pass
    finally:
        os._exit(3)


def _guard(office, job):
    """Threads that abort the session on a stop signal or when the parent (fuelsys) has died."""
    if hasattr(signal, "sigwait"):
        def waiter():
            signum = signal.sigwait(STOP_SIGNALS)
            _abort(office, job, f"stopped by signal {signal.Signals(signum).name}")

        threading.Thread(target=waiter, name="stop-signals", daemon=True).start()
    parent = job.get("parent_pid")
    if parent:
        def watchdog():
            while os.getppid() == parent:
                time.sleep(0.25)
            _abort(office, job, "fuelsys, which started this session, has ended")

        threading.Thread(target=watchdog, name="parent-watchdog", daemon=True).start()


def main():
    job = json.load(sys.stdin)
    office = Office(job["soffice"], job.get("profile"), job.get("timeout", 120), job.get("pidfile"),
                    job.get("workdir"))
    answer = {"ok": False}
    _guard(office, job)
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
        _EXIT.acquire()  # an abort under way ends the process here
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
