"""Headless LibreOffice from fuelsys: install the extension, recalculate and store books.

LibreOffice's UNO bridge lives in the Python that LibreOffice runs (on Debian
the system python3 with the ``python3-uno`` package), which is usually not the
Python fuelsys runs in.  So each session runs
:mod:`fuelsys.sheet.calc_addin.lo_driver` as a child process of that Python,
with a job in JSON; the driver starts soffice with a unique profile and pipe
in its own process group and shuts it down in every case.  Should the driver
itself be stopped (a timeout here), this module kills soffice's process group
from the pid the driver recorded, so no soffice is left running.  SIGINT,
SIGTERM and SIGHUP during a session, or this process's death, end the driver
and soffice and remove their files (see :func:`run_session`); what a run
killed outright leaves is removed by the next one (:func:`clean_stale`).

Main entry points: :func:`recalc_book` (used by ``fuelsys recalc --engine
libreoffice``), :func:`install_extension` (``fuelsys libreoffice install``)
and :func:`run_session` (anything else, e.g. the live tests).
"""

from __future__ import annotations

import contextlib
import functools
import json
import os
import re
import secrets
import shutil
import signal
import socket
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

from fuelsys.sheet import xlsx

#: LibreOffice maps plain FS_ names in .xlsx files to the add-in from this version on
MIN_VERSION = (25, 2)

_DRIVER = Path(__file__).with_name("lo_driver.py")


class LibreOfficeError(RuntimeError):
    """LibreOffice is missing, too old, or a session failed."""


class OutputRefused(xlsx.WriteError):
    """The output cannot be written where it was asked for (nothing is written)."""


class Interrupted(KeyboardInterrupt):
    """fuelsys was stopped by a signal (SIGINT, SIGTERM or SIGHUP) during a LibreOffice session."""

    def __init__(self, signum: int = signal.SIGINT):
        super().__init__(f"stopped by {signal.Signals(signum).name}")
        self.signum = int(signum)


#: the signals that stop a session in an orderly way (the driver and soffice are ended, files removed)
STOP_SIGNALS = tuple(getattr(signal, n) for n in ("SIGTERM", "SIGINT", "SIGHUP") if hasattr(signal, n))


@contextlib.contextmanager
def stop_signals_raise():
    """SIGTERM and SIGHUP raise :class:`Interrupted` meanwhile, as SIGINT raises KeyboardInterrupt.

    So a ``finally`` ends the driver and soffice and removes the temporary
    files, instead of the process ending on the spot.  Only in the main
    thread (where Python runs signal handlers); elsewhere a no-op.
    """
    if threading.current_thread() is not threading.main_thread():
        yield
        return

    def _raise(signum, frame):
        raise Interrupted(signum)

    old = {}
    for sig in STOP_SIGNALS:
        if sig != signal.SIGINT:
            old[sig] = signal.signal(sig, _raise)
    try:
        yield
    finally:
        for sig, handler in old.items():
            signal.signal(sig, handler)


# ---------------------------------------------------------------------------
# this engine's own temporary files, and those an earlier run left when it was killed

#: a session or recalc folder in TMPDIR: fuelsys-lo-<pid>-<random>, fuelsys-recalc-<pid>-<random>
STALE_SCRATCH = re.compile(r"^fuelsys-(?:lo|recalc)-(?P<pid>[0-9]+)-[A-Za-z0-9_]+$")
#: the temporary output beside the output: .~fuelsys-lo-<host>-<pid>-<8 hex><suffix>
STALE_OUTPUT = re.compile(r"^\.~fuelsys-lo-(?P<host>[A-Za-z0-9._-]+)-(?P<pid>[0-9]+)-[0-9a-f]{8}\.[A-Za-z0-9]+$")


def _host() -> str:
    """This machine's name as it appears in temporary names (a shared folder may hold another's)."""
    name = "".join(c if c.isalnum() or c in ".-_" else "_" for c in socket.gethostname())[:64]
    return name or "host"


def make_scratch(kind: str, dir=None) -> str:
    """A new temporary folder ``fuelsys-<kind>-<pid>-<random>`` (in TMPDIR unless ``dir``)."""
    return tempfile.mkdtemp(prefix=f"fuelsys-{kind}-{os.getpid()}-", dir=dir)


def temp_output_name(target) -> str:
    """The name of the temporary file written beside ``target`` before it replaces it."""
    suffix = os.path.splitext(os.fspath(target))[1] or ".xlsx"
    return f".~fuelsys-lo-{_host()}-{os.getpid()}-{secrets.token_hex(4)}{suffix}"


def _pid_alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError, ValueError):
        return True  # someone else's process, or a number we cannot judge: not provably dead
    return True


def _cmdline(pid: int) -> str:
    try:
        return Path(f"/proc/{pid}/cmdline").read_bytes().replace(b"\0", b" ").decode("utf-8", "replace")
    except OSError:
        return ""


def _end_stale_soffice(folder: Path) -> None:
    """Kill the process group a dead session recorded, if its leader still names that session's folder."""
    try:
        pgid = int((folder / "soffice.pid").read_text().strip())
    except (OSError, ValueError):
        return
    if pgid <= 1 or str(folder) not in _cmdline(pgid):
        return  # gone, or the number now belongs to an unrelated process
    _kill_group(pgid)


#: the socket of a session's pipe, which soffice leaves when it is killed: OSL_PIPE_<uid>_fuelsys-<32 hex>
STALE_PIPE = re.compile(r"^OSL_PIPE_(?P<uid>[0-9]+)_fuelsys-[0-9a-f]{32}$")
_PIPE_DIRS = ("/tmp", "/var/tmp")


def _clean_stale_pipes(folders=_PIPE_DIRS) -> list[str]:
    """Remove this user's session pipe sockets that nothing listens on any more."""
    if not hasattr(os, "getuid") or not hasattr(socket, "AF_UNIX"):
        return []
    removed = []
    for folder in folders:
        try:
            entries = list(os.scandir(folder))
        except OSError:
            continue
        for e in entries:
            m = STALE_PIPE.match(e.name)
            if not m or int(m["uid"]) != os.getuid():
                continue
            with socket.socket(socket.AF_UNIX, socket.SOCK_STREAM) as sock:
                sock.settimeout(1.0)
                try:
                    sock.connect(e.path)
                    continue  # a soffice listens: in use
                except ConnectionRefusedError:
                    pass
                except OSError:
                    continue
            try:
                os.unlink(e.path)
                removed.append(e.path)
            except OSError:
                pass
    return removed


def clean_stale(output_folder=None, *, tmpdir=None) -> list[str]:
    """Remove what LibreOffice runs killed earlier left behind; return the paths removed.

    Only names this engine makes (:data:`STALE_SCRATCH` in TMPDIR,
    :data:`STALE_OUTPUT` in ``output_folder`` with this machine's name), and
    only when the process named in them has ended.  A soffice still running
    on such a session's profile is ended first.
    """
    removed = []
    tmp = Path(tmpdir or tempfile.gettempdir())
    try:
        entries = list(os.scandir(tmp))
    except OSError:
        entries = []
    for e in entries:
        m = STALE_SCRATCH.match(e.name)
        if not m or _pid_alive(int(m["pid"])) or not e.is_dir(follow_symlinks=False):
            continue
        _end_stale_soffice(Path(e.path))
        shutil.rmtree(e.path, ignore_errors=True)
        if not os.path.lexists(e.path):
            removed.append(e.path)
    removed += _clean_stale_pipes()
    if output_folder is not None:
        try:
            entries = list(os.scandir(output_folder))
        except OSError:
            entries = []
        for e in entries:
            m = STALE_OUTPUT.match(e.name)
            if (m and m["host"] == _host() and not _pid_alive(int(m["pid"]))
                    and e.is_file(follow_symlinks=False)):
                try:
                    os.unlink(e.path)
                    removed.append(e.path)
                except OSError:
                    pass
    return removed


def find_soffice() -> str | None:
    """The soffice executable: $FUELSYS_SOFFICE, PATH, then the usual install places."""
    env = os.environ.get("FUELSYS_SOFFICE")
    if env:
        return env if os.path.exists(env) else None
    for name in ("soffice", "libreoffice"):
        exe = shutil.which(name)
        if exe:
            return exe
    for p in ("/usr/lib/libreoffice/program/soffice", "/opt/libreoffice/program/soffice",
              "/Applications/LibreOffice.app/Contents/MacOS/soffice",
              "C:/Program Files/LibreOffice/program/soffice.exe"):
        if os.path.exists(p):
            return p
    return None


@functools.lru_cache(maxsize=None)
def _imports_uno(python: str) -> bool:
    try:
        res = subprocess.run([python, "-c", "import uno, unohelper"], capture_output=True, timeout=60,
                             env=_child_env(python))
    except (OSError, subprocess.TimeoutExpired):
        return False
    return res.returncode == 0


def find_uno_python(soffice: str | None = None) -> str | None:
    """A Python that imports ``uno``: $FUELSYS_LO_PYTHON, LibreOffice's bundled one, the system python3."""
    soffice = soffice or find_soffice()
    candidates = [os.environ.get("FUELSYS_LO_PYTHON")]
    if soffice:
        prog = Path(soffice).resolve().parent
        candidates += [str(prog / "python"), str(prog / "python.exe"),
                       str(prog.parent / "Resources" / "python")]
    candidates += ["/usr/bin/python3", shutil.which("python3")]
    for c in candidates:
        if c and os.path.exists(c) and _imports_uno(c):
            return c
    return None


@functools.lru_cache(maxsize=None)
def python_version(python: str) -> tuple:
    """(major, minor, micro) of a Python executable; () when it cannot be run."""
    try:
        res = subprocess.run([python, "-c", "import sys; print(*sys.version_info[:3])"], capture_output=True,
                             text=True, timeout=60, env=_child_env(python))
        return tuple(int(x) for x in res.stdout.split())
    except (OSError, ValueError, subprocess.TimeoutExpired):
        return ()


def python_mismatch() -> str | None:
    """A warning when LibreOffice's Python has another minor version than this one; else None."""
    python = find_uno_python()
    if not python:
        return None
    theirs = python_version(python)
    if theirs and theirs[:2] != tuple(sys.version_info[:2]):
        return (f"LibreOffice runs Python {'.'.join(map(str, theirs))} ({python}) but this is Python "
                f"{'.'.join(map(str, sys.version_info[:3]))}: the compiled packages recorded in the extension "
                f"(numpy, scipy, CoolProp) will not load there. Build it from a Python "
                f"{theirs[0]}.{theirs[1]} environment, or set FUELSYS_PYTHONPATH for LibreOffice to the "
                f"site-packages of one.")
    return None


@functools.lru_cache(maxsize=None)
def soffice_version(soffice: str) -> tuple:
    """(major, minor, ...) from ``soffice --version``; () when it cannot be read."""
    try:
        res = subprocess.run([soffice, "--version"], capture_output=True, text=True, timeout=60,
                             env=_child_env(), stdin=subprocess.DEVNULL)
    except (OSError, subprocess.TimeoutExpired):
        return ()
    for word in res.stdout.split():
        parts = word.split(".")
        if len(parts) >= 2 and all(p.isdigit() for p in parts):
            return tuple(int(p) for p in parts)
    return ()


def unavailable_reason() -> str | None:
    """None when headless LibreOffice can run the extension here; otherwise why not."""
    soffice = find_soffice()
    if not soffice:
        return "LibreOffice (soffice) is not installed; run .ci/install-libreoffice as root"
    version = soffice_version(soffice)
    if not version:
        return f"cannot read the version of {soffice}"
    if version[:2] < MIN_VERSION:
        return (f"LibreOffice {'.'.join(map(str, version))} is older than "
                f"{'.'.join(map(str, MIN_VERSION))}, which is needed to map plain FS_ names in .xlsx files")
    if not find_uno_python(soffice):
        return "no Python that imports uno (Debian package python3-uno) was found"
    from fuelsys.sheet.calc_addin import generate

    if not generate.find_unoidl_write():
        return "unoidl-write (LibreOffice SDK, Debian package libreoffice-dev) is not installed"
    return None


_SYSTEM_BIN = ("/usr/bin", "/bin", "/usr/sbin", "/sbin")
#: names of a Python interpreter in a bin directory
_PYTHON_NAMES = ("python3", "python", "python%d.%d" % sys.version_info[:2], "python.exe")
#: variables that steer a Python or name an environment (besides every PYTHON* one)
_PYTHON_VARS = ("VIRTUAL_ENV", "VIRTUAL_ENV_PROMPT", "PYENV_VERSION", "PYENV_DIR", "CONDA_PREFIX",
                "CONDA_DEFAULT_ENV", "CONDA_PYTHON_EXE", "__PYVENV_LAUNCHER__")


def _holds_python(d: str) -> bool:
    """A directory with a Python interpreter in it, or a virtual environment's bin directory."""
    if os.path.isfile(os.path.join(os.path.dirname(os.path.abspath(d)), "pyvenv.cfg")):
        return True
    return any(os.path.exists(os.path.join(d, n)) for n in _PYTHON_NAMES)


def _child_env(python: str | None = None) -> dict:
    """The environment for LibreOffice's side: none of the calling Python's own settings.

    soffice's embedded Python (on Debian the system's libpython) finds its home
    as a ``python3`` started by name does: from the first ``python3`` on PATH.
    A virtual environment's bin directory there, even one made with that very
    Python (its ``python3`` is a link to it), makes the embedded Python start
    inside the environment, where the system's dist-packages, and so ``uno``,
    are missing; LibreOffice's Python loader fails and Calc opens no document
    once a Python add-in is installed.  A pyenv or conda bin directory makes it
    start from another installation altogether.  So PATH keeps no directory
    that holds a Python or is a virtual environment's bin, except the system's
    own bin directories and the directory of ``python`` (the one that imports
    uno) itself; every PYTHON* variable and the variables naming a virtual,
    pyenv or conda environment are dropped (FUELSYS_PYTHONPATH is the add-in's
    own way to add packages).
    """
    env = {k: v for k, v in os.environ.items() if not k.startswith("PYTHON") and k not in _PYTHON_VARS}
    keep = {os.path.normcase(os.path.abspath(d)) for d in _SYSTEM_BIN}
    if python:
        keep.add(os.path.normcase(os.path.dirname(os.path.abspath(python))))
        keep.add(os.path.normcase(os.path.dirname(os.path.realpath(python))))
    dirs = [d for d in env.get("PATH", "").split(os.pathsep)
            if d and (os.path.normcase(os.path.abspath(d)) in keep or not _holds_python(d))]
    env["PATH"] = os.pathsep.join(dirs)
    return env


_PR_SET_PDEATHSIG = 1


@functools.lru_cache(maxsize=None)
def _libc():
    """The C library through ctypes (Linux), loaded before any fork; None elsewhere."""
    if not sys.platform.startswith("linux"):
        return None
    try:
        import ctypes

        return ctypes.CDLL(None, use_errno=True)
    except (OSError, ImportError):
        return None


def _die_with_parent(sig: int, parent: int):
    """A preexec function: the child gets ``sig`` when ``parent`` dies (Linux prctl PR_SET_PDEATHSIG)."""
    libc = _libc()

    def preexec():
        if libc is not None:
            libc.prctl(_PR_SET_PDEATHSIG, int(sig), 0, 0, 0)
        if os.getppid() != parent:  # the parent died before prctl took effect
            os.kill(os.getpid(), sig)

    return preexec


def run_session(extensions=(), books=(), *, profile=None, timeout: float = 300.0, env: dict | None = None,
                cleanup=()) -> dict:
    """One headless LibreOffice session (see :mod:`.lo_driver` for ``books``); returns the driver's answer.

    The driver runs in its own session (process group), and soffice in
    another; both end when this process is stopped by SIGINT, SIGTERM or
    SIGHUP (raised as :class:`Interrupted` / KeyboardInterrupt after the
    driver has ended soffice and removed the profile), and when it dies (the
    driver gets SIGTERM through PR_SET_PDEATHSIG on Linux and watches this
    pid as well, then also removes the folders in ``cleanup``, which must be
    this engine's own scratch folders).

    Raises :class:`LibreOfficeError` when LibreOffice is missing or the session fails.
    """
    reason = unavailable_reason()
    if reason:
        raise LibreOfficeError(reason)
    soffice = find_soffice()
    python = find_uno_python(soffice)
    with stop_signals_raise():
        tmp = make_scratch("lo")
        try:
            return _run_driver(python, soffice, tmp, extensions, books, profile, timeout, env, cleanup)
        finally:
            shutil.rmtree(tmp, ignore_errors=True)


def _run_driver(python, soffice, tmp, extensions, books, profile, timeout, env, cleanup) -> dict:
    pidfile = os.path.join(tmp, "soffice.pid")
    # a fresh profile inside our own temporary folder, so it goes with it
    profile = str(profile) if profile else os.path.join(tmp, "profile")
    job = {"soffice": soffice, "profile": profile, "timeout": min(timeout, 120.0), "workdir": tmp,
           "pidfile": pidfile, "parent_pid": os.getpid(),
           "cleanup": [tmp] + [str(c) for c in cleanup if STALE_SCRATCH.match(os.path.basename(str(c)))],
           "extensions": [str(x) for x in extensions],
           "books": [{k: (str(v) if isinstance(v, Path) else v) for k, v in b.items()} for b in books]}
    child_env = _child_env(python)
    child_env.update(env or {})
    proc = subprocess.Popen([python, str(_DRIVER)], stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                            stderr=subprocess.PIPE, env=child_env, start_new_session=True,
                            preexec_fn=_die_with_parent(signal.SIGTERM, os.getpid()) if os.name == "posix" else None)
    try:
        out, err = proc.communicate(json.dumps(job).encode("utf-8"), timeout=timeout)
    except subprocess.TimeoutExpired:
        _stop_driver(proc)
        raise LibreOfficeError(f"the LibreOffice session did not finish within {timeout:g} s")
    except BaseException:  # KeyboardInterrupt, Interrupted: the driver ends soffice and its files
        _stop_driver(proc)
        raise
    finally:
        _kill_leftover(pidfile)
    try:
        answer = json.loads(out.decode("utf-8"))
    except ValueError:
        raise LibreOfficeError(f"the LibreOffice driver failed (status {proc.returncode}): "
                               f"{err.decode('utf-8', 'replace')[-2000:]}")
    if not answer.get("ok"):
        raise LibreOfficeError(f"LibreOffice session failed: {answer.get('error')}\n{answer.get('traceback', '')}")
    return answer


def _stop_driver(proc) -> None:
    """SIGTERM to the driver (it ends soffice and removes its files), then its process group killed."""
    if proc.poll() is None:
        try:
            proc.terminate()
            proc.wait(timeout=15)
        except subprocess.TimeoutExpired:
            pass
        except KeyboardInterrupt:  # a second Ctrl+C: no more waiting
            pass
    _kill_group(proc.pid, grace=0.0)
    try:
        proc.wait(timeout=5)
    except subprocess.TimeoutExpired:
        pass


def _kill_group(pgid: int, grace: float = 1.0) -> None:
    """SIGTERM to a process group, SIGKILL after ``grace`` seconds if it is still there."""
    try:
        os.killpg(pgid, signal.SIGTERM)
    except (ProcessLookupError, PermissionError, OSError):
        return
    deadline = time.monotonic() + grace
    while time.monotonic() < deadline:
        try:
            os.killpg(pgid, 0)
        except (ProcessLookupError, PermissionError, OSError):
            return
        time.sleep(0.05)
    try:
        os.killpg(pgid, signal.SIGKILL)
    except (ProcessLookupError, PermissionError, OSError):
        pass


def _kill_leftover(pidfile: str) -> None:
    """Kill soffice's process group if the driver left it running."""
    try:
        pgid = int(Path(pidfile).read_text().strip())
    except (OSError, ValueError):
        return
    _kill_group(pgid)


def build_extension(dest_dir) -> Path:
    """Build fuelsys.oxt from the catalogue into ``dest_dir``."""
    from fuelsys.sheet.calc_addin import generate

    return generate.build_oxt(Path(dest_dir))


def check_output(dst) -> Path:
    """The output's real path, or :class:`OutputRefused` saying why it cannot be written there."""
    dst = Path(os.path.realpath(dst))
    folder = dst.parent
    if not folder.is_dir():
        raise OutputRefused(f"the output folder {folder} does not exist: create it first or give another "
                            f"--output; nothing written")
    if dst.is_dir():
        raise OutputRefused(f"the output {dst} is a folder: give a file name such as {dst / 'out.xlsx'}; "
                            f"nothing written")
    if not os.access(folder, os.W_OK | os.X_OK):
        raise OutputRefused(f"the output folder {folder} is not writable by this user; nothing written")
    lock = xlsx.open_elsewhere(dst)
    if lock:
        raise OutputRefused(f"{dst.name} is open in a spreadsheet program ({os.path.basename(lock)} is beside "
                            f"it): close it there first, or give another --output; nothing written")
    return dst


def store_output(made, dst) -> None:
    """Put the book LibreOffice stored at ``made`` in place at ``dst``, atomically.

    Through a temporary file beside ``dst`` (named by :func:`temp_output_name`),
    created as any new file is, so a new output has the permissions the umask
    gives; an existing output keeps its mode (and owner and group where this
    process may set them).  On any failure ``dst`` is as it was and the
    temporary file is gone.
    """
    dst = Path(dst)
    if not os.path.exists(made) or os.path.getsize(made) == 0:
        raise LibreOfficeError("LibreOffice wrote no workbook")
    tmp = dst.parent / temp_output_name(dst)
    fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_CLOEXEC", 0), 0o666)
    try:
        with os.fdopen(fd, "wb") as out, open(made, "rb") as src:
            shutil.copyfileobj(src, out, 1 << 20)
            out.flush()
            os.fsync(out.fileno())
        try:
            st = os.stat(dst)
        except FileNotFoundError:
            st = None
        if st is not None:
            os.chmod(tmp, st.st_mode & 0o7777)
            if hasattr(os, "chown"):
                try:
                    os.chown(tmp, st.st_uid, st.st_gid)
                except PermissionError:
                    pass
        os.replace(tmp, dst)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise


def recalc_book(src_path, dst_path, *, timeout: float = 600.0) -> dict:
    """Compute a workbook in headless LibreOffice with the fuelsys extension and store it as .xlsx.

    The book is loaded into a fresh profile with the extension (built from the
    catalogue for this call), every formula is recalculated with
    ``calculateAll()``, and the book is stored with the filter "Calc MS Excel
    2007 XML" and put in place at ``dst_path`` by :func:`store_output`.
    ``dst_path`` may equal ``src_path``.  An output folder that is missing or
    not writable raises :class:`OutputRefused` before LibreOffice starts.
    Temporary files that killed runs left behind are removed first
    (:func:`clean_stale`).  Stopped by SIGINT/SIGTERM/SIGHUP, it raises
    :class:`Interrupted` (a KeyboardInterrupt) with soffice ended and no file
    left or written.

    Returns a summary: LibreOffice's version, the number of formula cells and
    the number that show an error value or an ``FS error:`` text.
    """
    dst = check_output(dst_path)
    src = Path(src_path).resolve()
    if not src.is_file():
        raise FileNotFoundError(f"{src} does not exist")
    clean_stale(dst.parent)
    with stop_signals_raise():
        tmp = make_scratch("recalc")
        try:
            oxt = build_extension(tmp)
            made = Path(tmp) / ("out" + (dst.suffix or ".xlsx"))
            answer = run_session([oxt], [{"src": str(src), "dst": str(made), "count": True}], timeout=timeout,
                                 cleanup=[tmp])
            store_output(made, dst)
        finally:
            shutil.rmtree(tmp, ignore_errors=True)
    book = answer["books"][0]
    counts = book.get("counts") or _count(book.get("cells", []))
    return {
        "engine": "libreoffice",
        "libreoffice": answer.get("version", ""),
        "formulas": counts["formulas"],
        "errors": counts["errors"],
        "fs_errors": counts["fs_errors"],
        "seconds": book["calculate_all_s"],
    }


def _count(cells) -> dict:
    return {"formulas": len(cells), "errors": sum(1 for c in cells if c["type"] == "error"),
            "fs_errors": sum(1 for c in cells if c["type"] == "text" and c["value"].startswith("FS error:"))}


def default_profile() -> Path:
    """The user's own LibreOffice profile directory (the UserInstallation that holds user/)."""
    if sys.platform == "win32":
        return Path(os.environ.get("APPDATA", Path.home())) / "LibreOffice" / "4"
    if sys.platform == "darwin":
        return Path.home() / "Library" / "Application Support" / "LibreOffice" / "4"
    return Path(os.environ.get("XDG_CONFIG_HOME", Path.home() / ".config")) / "libreoffice" / "4"


def install_extension(oxt, profile=None, *, timeout: float = 300.0) -> dict:
    """Install fuelsys.oxt into a LibreOffice profile (default: the user's own) via a headless instance.

    The profile must not be in use: close LibreOffice first.
    """
    profile = Path(profile) if profile else default_profile()
    lock = profile / "user" / ".lock"
    if lock.exists() and _lock_live(lock):
        raise LibreOfficeError(f"the profile {profile} is in use ({lock} exists): close LibreOffice and retry")
    profile.mkdir(parents=True, exist_ok=True)
    answer = run_session([Path(oxt).resolve()], [], profile=profile, timeout=timeout)
    info = answer["installed"][0]
    info["libreoffice"] = answer.get("version", "")
    return info


def _lock_live(lock: Path) -> bool:
    """A lock file whose process is gone is stale (LibreOffice writes host and pid in it)."""
    try:
        text = lock.read_text(errors="replace")
    except OSError:
        return True
    for line in text.splitlines():
        if line.startswith("PID="):
            try:
                os.kill(int(line[4:].strip()), 0)
            except (ValueError, ProcessLookupError):
                return False
            except PermissionError:
                return True
            return True
    return True
