"""The fuelsys add-in component for LibreOffice Calc (runs inside LibreOffice).

This file is shipped in fuelsys.oxt as ``fuelsys_calc.py`` and loaded by
LibreOffice's Python loader; it is not imported by fuelsys itself.  It has one
UNO method per catalogue function (the table comes from ``fuelsys_build.json``
beside it, written when the extension was built), and each method hands its
arguments to :func:`fuelsys.sheet.calc_addin.convert.call`, so results,
broadcasting over ranges and ``FS error:`` texts are those of
:func:`fuelsys.sheet.adapt.call_spec`.

Finding fuelsys
---------------
LibreOffice runs the system's Python (on Debian 12, /usr/bin/python3 3.11),
not the Python fuelsys was installed into.  On the first call the component
puts on ``sys.path``, in this order: the directories in the environment
variable ``FUELSYS_PYTHONPATH`` (separated by ``os.pathsep``), the fuelsys
source directory and the dependency directories recorded at build time.
Compiled packages (numpy, scipy, CoolProp) load only into a Python of the same
minor version as the one they were built for.  When the import fails, every
fuelsys cell shows a text starting ``FS error:`` that says why (naming a
Python version mismatch when there is one), and the log file (environment
variable ``FUELSYS_ADDIN_LOG``; by default ``calc-addin.log`` under the
user's cache directory) holds the details.

The component registers for the service ``com.sun.star.sheet.AddIn`` and does
not implement ``XAddIn``: Calc then takes the names and descriptions from
CalcAddIns.xcu.
"""

import datetime
import json
import os
import site
import sys
import tempfile
import traceback

import unohelper
from com.sun.star.lang import XServiceInfo, XServiceName
from org.fuelsys.calc import XFuelsysFunctions

HERE = os.path.dirname(os.path.abspath(__file__))
with open(os.path.join(HERE, "fuelsys_build.json"), encoding="utf-8") as _fh:
    BUILD = json.load(_fh)

IMPLEMENTATION_NAME = BUILD["implementation"]
SERVICE_NAMES = ("com.sun.star.sheet.AddIn", IMPLEMENTATION_NAME)
PYTHONPATH_ENV = "FUELSYS_PYTHONPATH"
LOG_ENV = "FUELSYS_ADDIN_LOG"
ERROR_PREFIX = "FS error: "

_ENGINE = None  # the convert module once imported, or the error text when that failed


def log_path():
    """Where the component writes its log."""
    env = os.environ.get(LOG_ENV)
    if env:
        return env
    if os.name == "nt":
        base = os.environ.get("LOCALAPPDATA") or tempfile.gettempdir()
    else:
        base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return os.path.join(base, "fuelsys", "calc-addin.log")


def log(message):
    """Append a dated line to the log; never fails."""
    path = log_path()
    try:
        os.makedirs(os.path.dirname(path) or ".", exist_ok=True)
        with open(path, "a", encoding="utf-8") as fh:
            stamp = datetime.datetime.now().isoformat(timespec="seconds")
            fh.write(f"{stamp} [pid {os.getpid()}] {message}\n")
    except OSError:
        pass


def search_paths():
    """The directories put in front of sys.path, in order."""
    extra = [p for p in os.environ.get(PYTHONPATH_ENV, "").split(os.pathsep) if p]
    return extra + [BUILD["source_dir"]] + list(BUILD["paths"])


def _put_on_path(paths):
    before = list(sys.path)
    for p in paths:
        if os.path.isdir(p) and p not in sys.path:
            site.addsitedir(p)  # also reads the .pth files there (editable installs)
    added = [p for p in sys.path if p not in before]
    sys.path[:] = added + before


def _load():
    here = "%d.%d.%d" % sys.version_info[:3]
    built = BUILD["python_version"]
    mismatch = here.split(".")[:2] != built.split(".")[:2]
    paths = search_paths()
    _put_on_path(paths)
    try:
        import fuelsys
        from fuelsys.sheet.calc_addin import convert
    except Exception as exc:  # every failure must reach the cell as a readable text
        reason = f"{type(exc).__name__}: {exc}"
        text = f"{ERROR_PREFIX}LibreOffice's Python {here} ({sys.executable}) cannot import fuelsys ({reason})"
        if mismatch:
            text += (f"; the extension was built with Python {built} ({BUILD['python_executable']}), and numpy, "
                     f"scipy and CoolProp load only into the same minor version: rebuild the extension from "
                     f"a Python {sys.version_info[0]}.{sys.version_info[1]} environment, or set "
                     f"{PYTHONPATH_ENV} to the site-packages of one")
        else:
            text += f"; looked in {os.pathsep.join(paths)}; set {PYTHONPATH_ENV} to the directories that hold them"
        text += f"; details in {log_path()}"
        log(text)
        log("sys.path: " + repr(sys.path))
        log(traceback.format_exc())
        return text
    log(f"fuelsys {fuelsys.__version__} from {os.path.dirname(fuelsys.__file__)} loaded into Python {here}"
        + (f" (the extension was built with Python {built})" if mismatch else ""))
    if fuelsys.__version__ != BUILD["fuelsys_version"]:
        log(f"the extension was built from fuelsys {BUILD['fuelsys_version']}; "
            f"this is {fuelsys.__version__}: rebuild it if functions are missing")
    return convert


def engine():
    """The convert module, or the error text that says why fuelsys cannot be imported."""
    global _ENGINE
    if _ENGINE is None:
        _ENGINE = _load()
    return _ENGINE


def run(name, args):
    """Run one catalogue function on the UNO arguments; returns what Calc shows, as rows of cells.

    Every method returns ``sequence< sequence< any > >``: a one-cell result is
    one row of one cell, which Calc shows as a plain value.  (An ``any`` result
    cannot carry an array from Python: Python UNO turns a tuple into
    ``sequence<any>``, which Calc refuses, and does not accept ``uno.Any`` as a
    return value.)
    """
    eng = engine()
    if isinstance(eng, str):
        return ((eng,),)
    try:
        return eng.call(name, args)
    except Exception as exc:  # a spreadsheet function never crashes its host
        log(f"{name}: " + traceback.format_exc())
        return ((f"{ERROR_PREFIX}internal error in the LibreOffice add-in ({type(exc).__name__}: {exc})",),)


class FuelsysFunctions(unohelper.Base, XFuelsysFunctions, XServiceName, XServiceInfo):
    """The add-in object; its methods (one per catalogue function) are added below."""

    def __init__(self, ctx):
        self.ctx = ctx

    def getServiceName(self):
        return IMPLEMENTATION_NAME

    def getImplementationName(self):
        return IMPLEMENTATION_NAME

    def supportsService(self, name):
        return name in SERVICE_NAMES

    def getSupportedServiceNames(self):
        return SERVICE_NAMES


def _method(fs_name, camel):
    def method(self, *args):
        return run(fs_name, args)

    method.__name__ = camel
    method.__doc__ = f"{fs_name} (see FS_HELP(\"{fs_name}\"))"
    return method


for _camel, _info in BUILD["functions"].items():
    setattr(FuelsysFunctions, _camel, _method(_info["name"], _camel))

g_ImplementationHelper = unohelper.ImplementationHelper()
g_ImplementationHelper.addImplementation(FuelsysFunctions, IMPLEMENTATION_NAME, SERVICE_NAMES)
