"""Headless LibreOffice from fuelsys: install the extension, recalculate and store books.

LibreOffice's UNO bridge lives in the Python that LibreOffice runs (on Debian
the system python3 with the ``python3-uno`` package), which is usually not the
Python fuelsys runs in.  So each session runs
:mod:`fuelsys.sheet.calc_addin.lo_driver` as a child process of that Python,
with a job in JSON; the driver starts soffice with a unique profile and pipe
in its own process group and shuts it down in every case.  Should the driver
itself be stopped (a timeout here), this module kills soffice's process group
from the pid the driver recorded, so no soffice is left running.

Main entry points: :func:`recalc_book` (used by ``fuelsys recalc --engine
libreoffice``), :func:`install_extension` (``fuelsys libreoffice install``)
and :func:`run_session` (anything else, e.g. the live tests).
"""

from __future__ import annotations

import functools
import json
import os
import shutil
import signal
import subprocess
import sys
import tempfile
import time
from pathlib import Path

#: LibreOffice maps plain FS_ names in .xlsx files to the add-in from this version on
MIN_VERSION = (25, 2)

_DRIVER = Path(__file__).with_name("lo_driver.py")


class LibreOfficeError(RuntimeError):
    """LibreOffice is missing, too old, or a session failed."""


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


def run_session(extensions=(), books=(), *, profile=None, timeout: float = 300.0, env: dict | None = None) -> dict:
    """One headless LibreOffice session (see :mod:`.lo_driver` for ``books``); returns the driver's answer.

    Raises :class:`LibreOfficeError` when LibreOffice is missing or the session fails.
    """
    reason = unavailable_reason()
    if reason:
        raise LibreOfficeError(reason)
    soffice = find_soffice()
    python = find_uno_python(soffice)
    with tempfile.TemporaryDirectory(prefix="fuelsys-lo-") as tmp:
        pidfile = os.path.join(tmp, "soffice.pid")
        # a fresh profile inside our own temporary directory, so it goes even if the driver is killed
        profile = str(profile) if profile else os.path.join(tmp, "profile")
        job = {"soffice": soffice, "profile": profile, "timeout": min(timeout, 120.0),
               "pidfile": pidfile, "extensions": [str(x) for x in extensions],
               "books": [{k: (str(v) if isinstance(v, Path) else v) for k, v in b.items()} for b in books]}
        child_env = _child_env(python)
        child_env.update(env or {})
        proc = subprocess.Popen([python, str(_DRIVER)], stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                                stderr=subprocess.PIPE, env=child_env, start_new_session=True)
        try:
            out, err = proc.communicate(json.dumps(job).encode("utf-8"), timeout=timeout)
        except subprocess.TimeoutExpired:
            proc.terminate()  # the driver shuts soffice down on SIGTERM
            try:
                proc.communicate(timeout=30)
            except subprocess.TimeoutExpired:
                proc.kill()
                proc.communicate()
            raise LibreOfficeError(f"the LibreOffice session did not finish within {timeout:g} s")
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


def _kill_leftover(pidfile: str) -> None:
    """Kill soffice's process group if the driver left it running."""
    try:
        pgid = int(Path(pidfile).read_text().strip())
    except (OSError, ValueError):
        return
    for sig in (signal.SIGTERM, signal.SIGKILL):
        try:
            os.killpg(pgid, sig)
        except (ProcessLookupError, PermissionError):
            return
        time.sleep(0.5)


def build_extension(dest_dir) -> Path:
    """Build fuelsys.oxt from the catalogue into ``dest_dir``."""
    from fuelsys.sheet.calc_addin import generate

    return generate.build_oxt(Path(dest_dir))


def recalc_book(src_path, dst_path, *, timeout: float = 600.0) -> dict:
    """Compute a workbook in headless LibreOffice with the fuelsys extension and store it as .xlsx.

    The book is loaded into a fresh profile with the extension (built from the
    catalogue for this call), every formula is recalculated with
    ``calculateAll()``, and the book is stored to ``dst_path`` with the
    filter "Calc MS Excel 2007 XML".  ``dst_path`` may equal ``src_path``.

    Returns a summary: LibreOffice's version, the number of formula cells and
    the number that show an error value or an ``FS error:`` text.
    """
    src = Path(src_path).resolve()
    dst = Path(dst_path).resolve()
    if not src.is_file():
        raise FileNotFoundError(f"{src} does not exist")
    with tempfile.TemporaryDirectory(prefix="fuelsys-recalc-") as tmp:
        oxt = build_extension(tmp)
        out_tmp = Path(tmp) / ("out" + (dst.suffix or ".xlsx"))
        answer = run_session([oxt], [{"src": str(src), "dst": str(out_tmp), "read": True}], timeout=timeout)
        dst.parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(out_tmp, dst)
    cells = answer["books"][0]["cells"]
    return {
        "engine": "libreoffice",
        "libreoffice": answer.get("version", ""),
        "formulas": len(cells),
        "errors": sum(1 for c in cells if c["type"] == "error"),
        "fs_errors": sum(1 for c in cells if c["type"] == "text" and c["value"].startswith("FS error:")),
        "seconds": answer["books"][0]["calculate_all_s"],
    }


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
