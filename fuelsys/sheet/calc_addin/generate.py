"""Build the LibreOffice Calc extension (fuelsys.oxt) from the catalogue.

Every file is generated from :func:`fuelsys.sheet.catalogue.functions` at
build time; nothing here lists functions by hand.  The text generators
(:func:`idl_text`, :func:`xcu_text`, ...) need no LibreOffice; compiling the
IDL to a type library needs the SDK's ``unoidl-write`` (Debian package
``libreoffice-dev``).

Names
-----
The IDL compiler refuses underscores in identifiers, so a function's method
is :attr:`Spec.camel_name` (``FS_NEEDLE_FLOW`` -> ``fsNeedleFlow``) and an
argument's IDL name is its camelCase form (``temp_c`` -> ``tempC``).  The
spreadsheet shows the catalogue's names: ``CalcAddIns.xcu`` gives each method
its ``FS_...`` name as display name and en-US compatibility name, and each
argument its catalogue name as display name.
"""

from __future__ import annotations

import importlib.util
import json
import os
import re
import shutil
import site
import subprocess
import sys
import tempfile
import zipfile
from pathlib import Path
from xml.sax.saxutils import escape, quoteattr

from fuelsys.sheet import calc_addin

#: files of the .oxt, in the order they are written
OXT_FILES = (
    "description.xml",
    "META-INF/manifest.xml",
    "fuelsys.components",
    "XFuelsysFunctions.rdb",
    "CalcAddIns.xcu",
    "fuelsys_calc.py",
    "fuelsys_build.json",
)

#: name of the component source inside the .oxt
COMPONENT_FILE = "fuelsys_calc.py"
#: name of the build record inside the .oxt
BUILD_INFO_FILE = "fuelsys_build.json"
#: name of the type library inside the .oxt
RDB_FILE = "XFuelsysFunctions.rdb"

#: the modules whose location is recorded so LibreOffice's Python can import them
DEPENDENCIES = ("fuelsys", "numpy", "scipy", "CoolProp", "openpyxl", "defusedxml")

#: words the IDL grammar reserves (an argument named like one gets a suffix)
IDL_KEYWORDS = frozenset("""
    any attribute boolean bound byte char const constants constrained double enum exception
    FALSE False float get hyper in inout interface long maybeambiguous maybedefault maybevoid
    module needs observes oneway optional out property published raises readonly removable
    sequence service set short singleton string struct transient TRUE True type typedef
    unsigned void
""".split())

_IDL_NAME = re.compile(r"[A-Za-z][A-Za-z0-9]*")

_FIXED_DATE = (1980, 1, 1, 0, 0, 0)  # zip entries get a fixed date: same catalogue, same bytes


def _functions(funcs=None) -> dict:
    if funcs is None:
        from fuelsys.sheet import catalogue

        funcs = catalogue.functions()
    return funcs


def idl_arg_name(name: str) -> str:
    """An argument name in IDL form: ``temp_c`` -> ``tempC``; reserved words get ``Value``."""
    parts = [p for p in name.split("_") if p]
    if not parts:
        raise ValueError(f"argument name {name!r} has no letters")
    out = parts[0].lower() + "".join(p[:1].upper() + p[1:].lower() for p in parts[1:])
    if out in IDL_KEYWORDS or out.lower() in {k.lower() for k in IDL_KEYWORDS}:
        out += "Value"
    if not _IDL_NAME.fullmatch(out):
        raise ValueError(f"argument name {name!r} gives {out!r}, which is not an IDL identifier")
    return out


def method_table(funcs=None) -> dict:
    """camelCase method -> {"name": FS name, "args": [catalogue arg names], "idl_args": [...]}."""
    table = {}
    for spec in _functions(funcs).values():
        camel = spec.camel_name
        if not _IDL_NAME.fullmatch(camel):
            raise ValueError(f"{spec.name} gives method name {camel!r}, which is not an IDL identifier")
        if camel in table:
            raise ValueError(f"{spec.name} and {table[camel]['name']} share the method name {camel}")
        idl_args = [idl_arg_name(a.name) for a in spec.args]
        if len(set(idl_args)) != len(idl_args):
            raise ValueError(f"{spec.name}: argument names collide in IDL form: {idl_args}")
        table[camel] = {"name": spec.name, "args": [a.name for a in spec.args], "idl_args": idl_args}
    return table


def idl_text(funcs=None) -> str:
    """The IDL interface: one method per catalogue function.

    Every argument is ``any`` (so it may be omitted, and may be a number, a
    text or a range); every result is ``sequence< sequence< any > >`` (rows of
    numbers and texts; one row of one cell for a single value), the one result
    type through which Python can give Calc both single values and arrays.
    """
    table = method_table(funcs)
    module, _, iface = calc_addin.INTERFACE_NAME.rpartition(".")
    mods = module.split(".")
    lines = ["// Generated from the fuelsys catalogue by fuelsys.sheet.calc_addin.generate; do not edit.",
             " ".join(f"module {m} {{" for m in mods),
             f"    interface {iface} : com::sun::star::uno::XInterface",
             "    {"]
    for camel, info in table.items():
        params = ", ".join(f"[in] any {p}" for p in info["idl_args"])
        lines.append(f"        sequence< sequence< any > > {camel}({params});")
    lines += ["    };", " ".join("};" for _ in mods), ""]
    return "\n".join(lines)


def _loc(prop: str, text: str, indent: str) -> str:
    return (f'{indent}<prop oor:name="{prop}" oor:type="xs:string">'
            f'<value xml:lang="en-US">{escape(text)}</value></prop>')


def function_description(spec) -> str:
    """The text the function wizard shows for a function: the catalogue's one wizard text (<= 255)."""
    return spec.wizard_text()


def xcu_text(funcs=None) -> str:
    """CalcAddIns.xcu: spreadsheet names (display and en-US compatibility), descriptions, arguments."""
    funcs = _functions(funcs)
    table = method_table(funcs)
    out = ['<?xml version="1.0" encoding="UTF-8"?>',
           "<!-- Generated from the fuelsys catalogue by fuelsys.sheet.calc_addin.generate; do not edit. -->",
           '<oor:component-data xmlns:oor="http://openoffice.org/2001/registry"'
           ' xmlns:xs="http://www.w3.org/2001/XMLSchema" oor:name="CalcAddIns" oor:package="org.openoffice.Office">',
           ' <node oor:name="AddInInfo">',
           f'  <node oor:name={quoteattr(calc_addin.IMPLEMENTATION_NAME)} oor:op="replace">',
           '   <node oor:name="AddInFunctions">']
    for camel, info in table.items():
        spec = funcs[info["name"]]
        out.append(f'    <node oor:name="{camel}" oor:op="replace">')
        out.append(_loc("DisplayName", spec.name, "     "))
        out.append(_loc("Description", function_description(spec), "     "))
        out.append('     <prop oor:name="Category" oor:type="xs:string"><value>Add-In</value></prop>')
        out.append(_loc("CompatibilityName", spec.name, "     "))
        out.append('     <node oor:name="Parameters">')
        for arg, idl in zip(spec.args, info["idl_args"]):
            out.append(f'      <node oor:name="{idl}" oor:op="replace">')
            out.append(_loc("DisplayName", arg.name, "       "))
            out.append(_loc("Description", arg.wizard_text(), "       "))
            out.append("      </node>")
        out.append("     </node>")
        out.append("    </node>")
    out += ["   </node>", "  </node>", " </node>", "</oor:component-data>", ""]
    return "\n".join(out)


def description_xml(version: str) -> str:
    """The extension's description.xml."""
    return f"""<?xml version="1.0" encoding="UTF-8"?>
<description xmlns="http://openoffice.org/extensions/description/2006"
             xmlns:d="http://openoffice.org/extensions/description/2006"
             xmlns:xlink="http://www.w3.org/1999/xlink">
  <identifier value={quoteattr(calc_addin.EXTENSION_ID)}/>
  <version value={quoteattr(version)}/>
  <platform value="all"/>
  <display-name>
    <name lang="en">fuelsys spreadsheet functions (FS_...)</name>
  </display-name>
</description>
"""


def manifest_xml() -> str:
    """META-INF/manifest.xml: type library, component registration, configuration."""
    return f"""<?xml version="1.0" encoding="UTF-8"?>
<manifest:manifest xmlns:manifest="http://openoffice.org/2001/manifest">
  <manifest:file-entry manifest:media-type="application/vnd.sun.star.uno-typelibrary;type=RDB"
                       manifest:full-path="{RDB_FILE}"/>
  <manifest:file-entry manifest:media-type="application/vnd.sun.star.uno-components"
                       manifest:full-path="fuelsys.components"/>
  <manifest:file-entry manifest:media-type="application/vnd.sun.star.configuration-data"
                       manifest:full-path="CalcAddIns.xcu"/>
</manifest:manifest>
"""


def components_xml() -> str:
    """Passive registration of the Python component for the service com.sun.star.sheet.AddIn."""
    impl = quoteattr(calc_addin.IMPLEMENTATION_NAME)
    return f"""<?xml version="1.0" encoding="UTF-8"?>
<components xmlns="http://openoffice.org/2010/uno-components">
  <component loader="com.sun.star.loader.Python" uri="./{COMPONENT_FILE}">
    <implementation name={impl}>
      <service name="com.sun.star.sheet.AddIn"/>
      <service name={impl}/>
    </implementation>
  </component>
</components>
"""


def component_source() -> str:
    """The Python component's source (the module :mod:`fuelsys.sheet.calc_addin.component`)."""
    return (Path(__file__).with_name("component.py")).read_text(encoding="utf-8")


def dependency_paths() -> list[str]:
    """Directories from which this Python imports fuelsys and its dependencies, then its site dirs."""
    paths = []

    def add(p):
        p = os.path.abspath(p)
        if os.path.isdir(p) and p not in paths:
            paths.append(p)

    for name in DEPENDENCIES:
        try:
            spec = importlib.util.find_spec(name)
        except (ImportError, ValueError):
            spec = None
        if spec is None:
            continue
        if spec.submodule_search_locations:  # a package: the directory that holds it
            for loc in spec.submodule_search_locations:
                add(Path(loc).parent)
        elif spec.origin:  # a single-file or compiled module
            add(Path(spec.origin).parent)
    for p in site.getsitepackages():
        add(p)
    if site.ENABLE_USER_SITE:
        add(site.getusersitepackages())
    return paths


def build_info(funcs=None) -> dict:
    """What the component needs to find its Python environment, plus the method table."""
    import fuelsys

    return {
        "fuelsys_version": fuelsys.__version__,
        "python_version": "%d.%d.%d" % sys.version_info[:3],
        "python_executable": sys.executable,
        "source_dir": str(Path(fuelsys.__file__).resolve().parent.parent),
        "paths": dependency_paths(),
        "implementation": calc_addin.IMPLEMENTATION_NAME,
        "functions": method_table(funcs),
    }


def find_unoidl_write() -> str | None:
    """The SDK's unoidl-write (PATH, then the usual LibreOffice SDK places)."""
    exe = shutil.which("unoidl-write")
    if exe:
        return exe
    for base in _office_dirs():
        for rel in ("sdk/bin/unoidl-write", "program/unoidl-write", "sdk/bin/unoidl-write.exe"):
            p = base / rel
            if p.exists():
                return str(p)
    return None


def _office_dirs() -> list[Path]:
    dirs = []
    soffice = shutil.which("soffice")
    if soffice:
        dirs.append(Path(soffice).resolve().parent.parent)
    dirs += [Path("/usr/lib/libreoffice"), Path("/opt/libreoffice"),
             Path("/Applications/LibreOffice.app/Contents"), Path("C:/Program Files/LibreOffice")]
    return [d for d in dirs if d.is_dir()]


def find_types_rdb() -> str | None:
    """LibreOffice's own type library (to resolve com::sun::star::uno::XInterface)."""
    for base in _office_dirs():
        for rel in ("program/types.rdb", "Resources/ure/share/misc/types.rdb", "program/types/offapi.rdb"):
            p = base / rel
            if p.exists():
                return str(p)
    return None


def compile_idl(idl: str, out_rdb: Path) -> Path:
    """Compile IDL text to a type library with unoidl-write."""
    exe = find_unoidl_write()
    if not exe:
        raise FileNotFoundError("unoidl-write not found: install the LibreOffice SDK "
                                "(Debian/Ubuntu package libreoffice-dev)")
    types = find_types_rdb()
    if not types:
        raise FileNotFoundError("LibreOffice's types.rdb not found: is LibreOffice installed?")
    with tempfile.TemporaryDirectory() as tmp:
        src = Path(tmp) / "XFuelsysFunctions.idl"
        src.write_text(idl, encoding="utf-8")
        res = subprocess.run([exe, types, str(src), str(out_rdb)], capture_output=True, text=True, timeout=120)
    if res.returncode != 0:
        raise RuntimeError(f"unoidl-write failed ({res.returncode}): {(res.stderr or res.stdout).strip()}")
    return out_rdb


def oxt_members(funcs=None, rdb_bytes: bytes | None = None) -> dict:
    """Every file of the .oxt as bytes, by path (the type library is compiled unless given)."""
    import fuelsys

    funcs = _functions(funcs)
    idl = idl_text(funcs)
    if rdb_bytes is None:
        with tempfile.TemporaryDirectory() as tmp:
            rdb_bytes = compile_idl(idl, Path(tmp) / RDB_FILE).read_bytes()
    files = {
        "description.xml": description_xml(fuelsys.__version__),
        "META-INF/manifest.xml": manifest_xml(),
        "fuelsys.components": components_xml(),
        RDB_FILE: rdb_bytes,
        "CalcAddIns.xcu": xcu_text(funcs),
        COMPONENT_FILE: component_source(),
        BUILD_INFO_FILE: json.dumps(build_info(funcs), indent=1, ensure_ascii=False) + "\n",
        "XFuelsysFunctions.idl": idl,
    }
    return {k: (v.encode("utf-8") if isinstance(v, str) else v) for k, v in files.items()}


def build_oxt(dest, funcs=None) -> Path:
    """Write fuelsys.oxt; ``dest`` is a file path or a directory (then ``dest/fuelsys.oxt``)."""
    dest = Path(dest)
    if dest.is_dir() or not dest.suffix:
        dest.mkdir(parents=True, exist_ok=True)
        dest = dest / "fuelsys.oxt"
    dest.parent.mkdir(parents=True, exist_ok=True)
    members = oxt_members(funcs)
    tmp = dest.with_name(dest.name + ".part")
    with zipfile.ZipFile(tmp, "w", compression=zipfile.ZIP_DEFLATED) as zf:
        for name in list(OXT_FILES) + [n for n in members if n not in OXT_FILES]:
            info = zipfile.ZipInfo(name, date_time=_FIXED_DATE)
            info.compress_type = zipfile.ZIP_DEFLATED
            info.external_attr = 0o644 << 16
            zf.writestr(info, members[name])
    os.replace(tmp, dest)
    return dest
