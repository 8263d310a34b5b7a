"""The catalogue and everything generated from it stay in step.

No outside values here: these tests check the declarations themselves and that
the xlwings module, FS_HELP and docs/functions.md match them.
"""

import ast
import inspect
import math
import re
from pathlib import Path

import numpy as np
import pytest

from fuelsys.sheet import call, catalogue
from fuelsys.sheet import docs as sheet_docs

FUNCS = catalogue.functions()


def test_catalogue_is_not_empty_and_names_are_upper():
    assert "FS_VERSION" in FUNCS and "FS_HELP" in FUNCS
    for name in FUNCS:
        assert re.fullmatch(r"FS_[A-Z0-9_]+", name), name


@pytest.mark.parametrize("name", list(FUNCS))
def test_every_argument_and_return_names_a_unit(name):
    spec = FUNCS[name]
    for a in spec.args:
        assert a.unit and a.unit.strip(), f"{name}.{a.name} has no unit"
        assert a.doc.strip(), f"{name}.{a.name} has no description"
        # a number argument whose name has no unit in it must be declared dimensionless or say its unit
        if a.kind == "number" and a.unit != "-":
            assert a.unit in spec.help_text()
    assert spec.returns.unit.strip()
    assert spec.source.strip() and spec.summary.strip()


@pytest.mark.parametrize("name", list(FUNCS))
def test_fs_help_matches_the_catalogue(name):
    text = call("FS_HELP", name)
    spec = FUNCS[name]
    assert text == spec.help_text()
    for a in spec.args:
        assert a.name in text
        if a.unit != "-":
            assert f"[{a.unit}]" in text


def test_xlwings_module_matches_the_catalogue():
    from fuelsys.sheet import excel

    assert sorted(excel.UDFS) == sorted(FUNCS)
    for name, spec in FUNCS.items():
        fn = getattr(excel, name)
        params = inspect.signature(fn).parameters
        assert list(params) == [a.name for a in spec.args], name
        for a in spec.args:
            has_default = params[a.name].default is not inspect.Parameter.empty
            assert has_default == (not a.required), f"{name}.{a.name}"


def test_xlwings_function_gives_the_same_cell_value_as_call():
    from fuelsys.sheet import excel

    assert excel.FS_VERSION() == call("FS_VERSION")
    assert excel.FS_HELP([["FS_VERSION"]]) == call("FS_HELP", "FS_VERSION")


def test_camel_names_are_unique():
    camel = [s.camel_name for s in FUNCS.values()]
    assert len(set(camel)) == len(camel)
    spec = catalogue.Spec(name="FS_NEEDLE_FLOW", category="about", summary="s", args=(),
                          returns=catalogue.Returns("number", "-", "r"), source="s", impl=None)
    assert spec.camel_name == "fsNeedleFlow"


def test_docs_functions_md_is_up_to_date():
    committed = sheet_docs.DOC_PATH.read_text(encoding="utf-8")
    assert committed == sheet_docs.render_markdown(), "run: python -m fuelsys.sheet.docs"


def test_declaration_checks_refuse_bad_declarations():
    with pytest.raises(ValueError):
        catalogue.Arg("x", "number", "", "no unit")
    with pytest.raises(ValueError):
        catalogue.Arg("x", "vector", "mm", "unknown kind")
    with pytest.raises(ValueError):
        catalogue.Returns("matrix", "mm", "unknown kind")


# ---------------------------------------------------------------------------
# units declared once: no hand-written conversion in the declarations

DECL_DIR = Path(catalogue.__file__).resolve().parent / "decl"
#: decl modules still converting by hand; each leaves this set when its bodies go SI (si=True)
NOT_YET_SI: set = set()
#: names of unit constants that must not be used by a declaration (the adapter converts)
CONVERSION_NAMES = {"T0_C", "P_ATM", "P_ISA", "_BAR", "_G_MIN", "_ML_MIN", "_G_S"}
#: the declaring calls: their numbers are bounds and defaults in the declared unit, not conversions
DECLARING = {"Arg", "Returns", "spreadsheet_function"}


def _is_power_of_ten(v: float) -> bool:
    e = math.log10(v)
    return abs(e - round(e)) < 1e-9 and round(e) != 0


def is_conversion_literal(value) -> bool:
    """A number that converts units: a power of ten other than 1 (also times 60 or 3600: per minute, per
    hour), 60 and 3600 themselves, the kelvin offset 273.15, the standard atmosphere (101325 Pa,
    1.01325 bar) and the inch (25.4 mm)."""
    if isinstance(value, bool) or not isinstance(value, (int, float)) or value == 0:
        return False
    v = abs(float(value))
    if v in (60.0, 3600.0, 273.15, 101325.0, 1.01325, 25.4, 0.0254):
        return True
    if _is_power_of_ten(v):
        return True
    for k in (60.0, 3600.0):  # per minute, per hour: k * 10^n (n >= 0) and 10^n / k (n <= 0)
        for x, sign in ((v / k, 1), (v * k, -1)):
            e = math.log10(x)
            if abs(e - round(e)) < 1e-9 and sign * round(e) >= 0:
                return True
    return False


def conversion_literals(path: Path) -> list[str]:
    """Every conversion literal or unit constant outside the declaring calls of a decl module."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    skip = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Call) and isinstance(node.func, ast.Name) and node.func.id in DECLARING:
            skip.update(id(n) for n in ast.walk(node))
    limits = set()  # a number compared with is a limit (samples x needles <= 1e6), not a conversion
    for node in ast.walk(tree):
        if isinstance(node, ast.Compare):
            for side in [node.left, *node.comparators]:
                while isinstance(side, ast.UnaryOp):
                    side = side.operand
                limits.add(id(side))
    found = []
    for node in ast.walk(tree):
        if id(node) in skip or id(node) in limits:
            continue
        if isinstance(node, ast.Constant) and is_conversion_literal(node.value):
            found.append(f"{path.name}:{node.lineno}: {node.value!r}")
        elif isinstance(node, ast.Name) and node.id in CONVERSION_NAMES:
            found.append(f"{path.name}:{node.lineno}: {node.id}")
        elif isinstance(node, ast.alias) and node.name in CONVERSION_NAMES:
            found.append(f"{path.name}: imports {node.name}")
    return found


def test_the_literal_rule_finds_what_it_should():
    for v in (1e5, 1e-3, 1000, 100.0, 0.01, 60, 6e4, 1e-3 / 60.0, 1 / 60.0, 3.6e6, 6e7, 273.15, 101325.0, 25.4, 1e6, -1e3):
        assert is_conversion_literal(v), v
    for v in (0, 1, 2, 9, 0.5, 0.95, 20, 0.6, True, "1e5"):
        assert not is_conversion_literal(v), v
    src = "x = a * 1e5\ny = T0_C\nArg('p', 'number', 'bar', 'p', high=100)\nif n > 1_000_000:\n    pass\n"
    path = Path(__file__).parent / "_probe_decl_rule.py"
    try:
        path.write_text(src, encoding="utf-8")
        assert len(conversion_literals(path)) == 2
    finally:
        path.unlink()


@pytest.mark.parametrize("path", sorted(p for p in DECL_DIR.glob("*.py") if p.name not in NOT_YET_SI),
                         ids=lambda p: p.name)
def test_no_conversion_literal_in_migrated_declarations(path):
    assert conversion_literals(path) == []


def test_migrated_declarations_are_all_si():
    for spec in FUNCS.values():
        module = Path(inspect.getsourcefile(spec.impl)).name
        if module not in NOT_YET_SI:
            assert spec.si, f"{spec.name} in {module} converts by hand"


@pytest.mark.parametrize("unit", sorted(catalogue.UNITS))
def test_every_unit_converts_there_and_back(unit):
    for conv in catalogue.UNITS[unit]:
        x = np.array([-3.5, 0.0, 1.0, 123.456])
        assert np.allclose(conv.from_core(conv.to_core(x)), x, rtol=1e-15, atol=1e-12)


def test_unit_table_values():
    # SI definitions (BIPM SI Brochure 9th ed. 2019, Table 8: bar = 1e5 Pa, degree Celsius offset
    # 273.15 K); standard atmosphere 101325 Pa (ISO 2533:1975)
    c = catalogue
    assert c.to_si(20.0, "°C") == 293.15
    assert c.to_si(2.0, "bar gauge") == 2e5
    assert c.to_si(2.0, "bar gauge", si="Pa abs") == 301325.0
    assert c.from_si(301325.0, "bar gauge", si="Pa abs") == 2.0
    assert c.to_si(0.3, "mm") == 0.3 / 1000
    assert c.to_si(60.0, "g/min") == 1e-3
    assert c.to_si(60.0, "mL/min") == 1e-6
    assert c.from_si(1e-6, "mm²/s") == 1.0
    assert c.to_si(12.0, "% of case pressure") == 0.12
    with pytest.raises(ValueError):
        c.to_si(1.0, "furlong")
    with pytest.raises(ValueError):
        catalogue.Arg("p", "number", "bar gauge", "p", si="Pa furlong")


def test_conversion_literals_left_count(capsys):
    counts = {p.name: len(conversion_literals(p)) for p in sorted(DECL_DIR.glob("*.py"))}
    print("conversion literals in sheet/decl:", counts, "total", sum(counts.values()))
    assert all(counts[n] == 0 for n in counts if n not in NOT_YET_SI)


@pytest.mark.parametrize("name", [n for n, s in FUNCS.items() if s.si])
def test_si_docstrings_are_generated_from_the_declaration(name):
    spec = FUNCS[name]
    assert spec.impl.__doc__ == spec.docstring()
    assert spec.docstring().count("Parameters\n----------") == (1 if spec.args else 0)
