"""The LibreOffice extension's generated files follow the catalogue (no LibreOffice needed).

Expected values here are the catalogue itself (what the files must say) and
call_spec's own results (what the component must pass through unchanged):
no outside source is involved.
"""

import ast
import json
import os
import re
import subprocess
import sys
import textwrap
import xml.etree.ElementTree as ET
import zipfile

import pytest

from fuelsys.sheet import adapt, calc_addin, catalogue
from fuelsys.sheet.calc_addin import convert, generate
from fuelsys.sheet.catalogue import Arg, Returns, Spec

OOR = "{http://openoffice.org/2001/registry}"
XML_LANG = "{http://www.w3.org/XML/1998/namespace}lang"
FUNCS = catalogue.functions()


def _idl_methods(idl):
    """IDL text -> {method: (return type, [parameter types], [parameter names])}."""
    out = {}
    for m in re.finditer(r"^\s*(sequence< sequence< any > >|any)\s+(\w+)\(([^)]*)\);", idl, re.M):
        params = [p.split() for p in m.group(3).split(",") if p.strip()]
        out[m.group(2)] = (m.group(1), [p[1] for p in params], [p[2] for p in params])
    return out


def _xcu_functions(xcu):
    root = ET.fromstring(xcu)
    (addin,) = root.find(f"node[@{OOR}name='AddInInfo']")
    assert addin.get(f"{OOR}name") == calc_addin.IMPLEMENTATION_NAME
    funcs = {}
    for node in addin.find(f"node[@{OOR}name='AddInFunctions']"):
        props = {p.get(f"{OOR}name"): p.find("value") for p in node.findall("prop")}
        params = [(p.get(f"{OOR}name"),
                   {q.get(f"{OOR}name"): q.find("value").text for q in p.findall("prop")})
                  for p in node.find(f"node[@{OOR}name='Parameters']")]
        funcs[node.get(f"{OOR}name")] = (props, params)
    return funcs


def test_idl_has_one_method_per_catalogue_function_with_its_arguments():
    methods = _idl_methods(generate.idl_text())
    assert list(methods) == [s.camel_name for s in FUNCS.values()]
    for spec in FUNCS.values():
        ret, types, names = methods[spec.camel_name]
        assert ret == "sequence< sequence< any > >"
        assert types == ["any"] * len(spec.args)  # every argument may be omitted, a number, a text or a range
        assert names == [generate.idl_arg_name(a.name) for a in spec.args]
        assert all("_" not in n for n in [spec.camel_name] + names)  # unoidl-write refuses underscores


def test_xcu_gives_plain_names_descriptions_and_arguments_with_units():
    funcs = _xcu_functions(generate.xcu_text())
    assert list(funcs) == [s.camel_name for s in FUNCS.values()]
    for spec in FUNCS.values():
        props, params = funcs[spec.camel_name]
        assert props["DisplayName"].text == spec.name
        assert props["CompatibilityName"].text == spec.name
        assert props["CompatibilityName"].get(XML_LANG) == "en-US"  # what .xlsx import and export look up
        assert props["Category"].text == "Add-In"
        assert spec.summary in props["Description"].text
        assert [p[0] for p in params] == [generate.idl_arg_name(a.name) for a in spec.args]
        for (_, p), arg in zip(params, spec.args):
            assert p["DisplayName"] == arg.name
            if arg.unit != "-":
                assert f"[{arg.unit}]" in p["Description"]


def test_generated_files_follow_a_changed_catalogue():
    # a catalogue of its own: the generator follows whatever it is given, nothing is listed by hand
    spec = Spec(name="FS_TEST_ONLY", category="about", summary="test", source="test", impl=lambda **k: 1.0,
                args=(Arg("temp_c", "number", "°C", "a temperature"),
                      Arg("type", "text", "-", "a word that is an IDL keyword", default="a")),
                returns=Returns("number", "-", "one"))
    funcs = {spec.name: spec}
    assert _idl_methods(generate.idl_text(funcs)) == {
        "fsTestOnly": ("sequence< sequence< any > >", ["any", "any"], ["tempC", "typeValue"])}
    assert list(_xcu_functions(generate.xcu_text(funcs))) == ["fsTestOnly"]
    assert generate.method_table(funcs)["fsTestOnly"]["name"] == "FS_TEST_ONLY"


@pytest.mark.parametrize("name, idl", [("temp_c", "tempC"), ("p_bar_abs", "pBarAbs"), ("fuel", "fuel"),
                                       ("oil_pct", "oilPct"), ("in", "inValue"), ("bore_mm", "boreMm")])
def test_idl_argument_names(name, idl):
    assert generate.idl_arg_name(name) == idl


def test_build_info_records_this_environment_and_the_method_table():
    info = generate.build_info()
    assert info["python_version"].split(".")[:2] == [str(sys.version_info[0]), str(sys.version_info[1])]
    import fuelsys
    import numpy

    assert os.path.isdir(os.path.join(info["source_dir"], "fuelsys"))
    assert os.path.dirname(os.path.dirname(os.path.abspath(numpy.__file__))) in info["paths"]
    assert os.path.abspath(os.path.dirname(os.path.dirname(fuelsys.__file__))) in info["paths"]
    assert {v["name"] for v in info["functions"].values()} == set(FUNCS)


def test_registration_and_manifest_agree():
    comp = ET.fromstring(generate.components_xml())
    ns = "{http://openoffice.org/2010/uno-components}"
    impl = comp.find(f"{ns}component/{ns}implementation")
    assert impl.get("name") == calc_addin.IMPLEMENTATION_NAME
    assert "com.sun.star.sheet.AddIn" in [s.get("name") for s in impl.findall(f"{ns}service")]
    assert comp.find(f"{ns}component").get("uri") == "./" + generate.COMPONENT_FILE
    man = ET.fromstring(generate.manifest_xml())
    paths = {e.get("{http://openoffice.org/2001/manifest}full-path") for e in man}
    assert paths == {generate.RDB_FILE, "fuelsys.components", "CalcAddIns.xcu"}
    desc = ET.fromstring(generate.description_xml("1.2.3"))
    d = "{http://openoffice.org/extensions/description/2006}"
    assert desc.find(f"{d}identifier").get("value") == calc_addin.EXTENSION_ID
    assert desc.find(f"{d}version").get("value") == "1.2.3"


def test_component_does_not_implement_xaddin():
    # with XAddIn, Calc would ignore CalcAddIns.xcu and the FS_ names with it
    tree = ast.parse(generate.component_source())
    (cls,) = [n for n in tree.body if isinstance(n, ast.ClassDef) and n.name == "FuelsysFunctions"]
    bases = [ast.unparse(b) for b in cls.bases]
    assert bases == ["unohelper.Base", "XFuelsysFunctions", "XServiceName", "XServiceInfo"]
    imported = {a.name for n in ast.walk(tree) if isinstance(n, ast.ImportFrom) for a in n.names}
    assert "XAddIn" not in imported


def test_oxt_holds_every_member(tmp_path):
    members = generate.oxt_members(rdb_bytes=b"stand-in type library")  # compiling needs the SDK
    for name in generate.OXT_FILES:
        assert name in members
    info = json.loads(members[generate.BUILD_INFO_FILE])
    assert list(info["functions"]) == [s.camel_name for s in FUNCS.values()]
    assert members[generate.COMPONENT_FILE].decode() == generate.component_source()


@pytest.mark.skipif(not generate.find_unoidl_write(), reason="unoidl-write (LibreOffice SDK) is not installed")
def test_build_oxt_compiles_the_type_library(tmp_path):
    path = generate.build_oxt(tmp_path)
    with zipfile.ZipFile(path) as zf:
        assert zf.namelist()[: len(generate.OXT_FILES)] == list(generate.OXT_FILES)
        assert zf.read(generate.RDB_FILE)[:8] == b"UNOIDL\xff\x00"  # unoidl's binary format signature


# ---------------------------------------------------------------------------
# the component's conversions: UNO values in, call_spec's results out unchanged

def _scale(x, k):
    import numpy as np

    return np.asarray(x, dtype=float) * k


SCALE = Spec(name="FS_TEST_SCALE", category="about", summary="test", source="test", impl=_scale,
             args=(Arg("x", "number", "mm", "a length", gt=0),
                   Arg("k", "number", "-", "a factor", default=2.0)),
             returns=Returns("number", "-", "x times k"))


def test_scalar_in_one_cell_out():
    assert convert.call_spec_uno(SCALE, (3.0, None)) == ((6.0,),)


def test_range_in_array_out_with_errors_in_their_cells():
    # Calc passes a range as rows of cells, an empty cell inside it as ""
    got = convert.call_spec_uno(SCALE, (((1.0,), (2.0,), ("",), ("x",), (-1.0,)), 10.0))
    want = adapt.call_spec(SCALE, [[1.0], [2.0], [None], ["x"], [-1.0]], 10.0)
    assert got == tuple(tuple(r) for r in want)
    assert got[0] == (10.0,) and got[2][0].startswith("FS error: x is empty")


def test_omitted_trailing_arguments_are_absent_not_empty():
    assert convert.call_spec_uno(SCALE, (None, None)) == ((adapt.call_spec(SCALE),),)
    assert "x is missing" in convert.call_spec_uno(SCALE, (None, None))[0][0]


def test_catalogue_function_through_the_component_path():
    assert convert.call("FS_VERSION", ()) == ((adapt.call("FS_VERSION"),),)
    assert convert.call("FS_HELP", ("FS_VERSION",)) == ((adapt.call("FS_HELP", "FS_VERSION"),),)
    assert convert.call("FS_HELP", (None,)) == ((adapt.call("FS_HELP"),),)
    assert convert.call("FS_NOT_THERE", ())[0][0].startswith("FS error: FS_NOT_THERE is in the installed")


def test_booleans_become_numbers_and_tables_keep_their_shape():
    assert convert.to_uno(True) == ((1.0,),)
    assert convert.to_uno([["a", 1.0], ["b", False]]) == (("a", 1.0), ("b", 0.0))


# ---------------------------------------------------------------------------
# the component itself, loaded with stand-in UNO modules in a bare Python

_STUBS = {
    "uno.py": "",
    "unohelper.py": """
        class Base:
            pass
        class ImplementationHelper:
            def addImplementation(self, cls, name, services):
                self.added = (cls, name, services)
    """,
    "com/__init__.py": "", "com/sun/__init__.py": "", "com/sun/star/__init__.py": "",
    "com/sun/star/lang/__init__.py": "class XServiceInfo: pass\nclass XServiceName: pass\n",
    "org/__init__.py": "", "org/fuelsys/__init__.py": "",
    "org/fuelsys/calc/__init__.py": "class XFuelsysFunctions: pass\n",
}

_PROBE = """
import json, runpy, sys
sys.path.insert(0, sys.argv[1])
mod = runpy.run_path(sys.argv[2])
obj = mod["FuelsysFunctions"](None)
print(json.dumps({"version": obj.fsVersion(), "help": obj.fsHelp("FS_VERSION"),
                  "services": list(mod["g_ImplementationHelper"].added[2])}))
"""


def _run_component(tmp_path, info, env_extra=None):
    stubs = tmp_path / "stubs"
    for rel, text in _STUBS.items():
        (stubs / rel).parent.mkdir(parents=True, exist_ok=True)
        (stubs / rel).write_text(textwrap.dedent(text))
    ext = tmp_path / "ext"
    ext.mkdir()
    (ext / generate.COMPONENT_FILE).write_text(generate.component_source())
    (ext / generate.BUILD_INFO_FILE).write_text(json.dumps(info))
    probe = tmp_path / "probe.py"
    probe.write_text(_PROBE)
    env = {k: v for k, v in os.environ.items() if not k.startswith("PYTHON") and k != calc_addin.PYTHONPATH_ENV}
    env[calc_addin.LOG_ENV] = str(tmp_path / "addin.log")
    env.update(env_extra or {})
    # -S: no site-packages, so numpy and fuelsys come only from what the component puts on sys.path
    res = subprocess.run([sys.executable, "-S", str(probe), str(stubs), str(ext / generate.COMPONENT_FILE)],
                         capture_output=True, text=True, cwd=tmp_path, env=env, timeout=120)
    assert res.returncode == 0, res.stderr
    return json.loads(res.stdout)


def test_component_imports_fuelsys_from_the_recorded_environment(tmp_path):
    out = _run_component(tmp_path, generate.build_info())
    assert out["version"] == [[adapt.call("FS_VERSION")]]
    assert out["help"] == [[adapt.call("FS_HELP", "FS_VERSION")]]
    assert "com.sun.star.sheet.AddIn" in out["services"]
    assert "loaded into Python" in (tmp_path / "addin.log").read_text()


def test_component_says_why_it_cannot_import_fuelsys(tmp_path):
    info = generate.build_info()
    info.update(python_version="3.99.0", source_dir=str(tmp_path / "nowhere"), paths=[str(tmp_path / "gone")])
    out = _run_component(tmp_path, info)
    text = out["version"][0][0]
    assert text.startswith("FS error: LibreOffice's Python")
    assert "cannot import fuelsys (ModuleNotFoundError" in text
    assert "built with Python 3.99.0" in text and "same minor version" in text
    assert out["help"] == out["version"]  # every function says the same
    log = (tmp_path / "addin.log").read_text()
    assert "Traceback" in log and "cannot import fuelsys" in log


def test_component_honours_the_path_variable(tmp_path):
    info = generate.build_info()
    good = os.pathsep.join([info["source_dir"]] + info["paths"])
    info.update(source_dir=str(tmp_path / "nowhere"), paths=[])
    out = _run_component(tmp_path, info, {calc_addin.PYTHONPATH_ENV: good})
    assert out["version"] == [[adapt.call("FS_VERSION")]]


@pytest.mark.skipif(not generate.find_unoidl_write(), reason="unoidl-write (LibreOffice SDK) is not installed")
def test_build_command_writes_the_extension(tmp_path, capsys):
    import argparse

    from fuelsys.sheet.calc_addin import commands

    parser = argparse.ArgumentParser(prog="fuelsys")
    commands.add_commands(parser.add_subparsers(dest="command"))
    args = parser.parse_args(["libreoffice", "build", "-o", str(tmp_path / "out" / "fs.oxt")])
    assert args.func(args) == 0
    assert zipfile.is_zipfile(tmp_path / "out" / "fs.oxt")
    assert f"({len(FUNCS)} functions)" in capsys.readouterr().out
    with pytest.raises(SystemExit):  # an action is required
        parser.parse_args(["libreoffice"])
