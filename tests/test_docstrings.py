"""Every public function of the physics modules documents each parameter with its unit, and a source.

STYLE.md "Do" 1 and DESIGN.md: each parameter's description ends with its unit in
brackets ("[m]", "[-]" when dimensionless), and every method names its published
source (a References section, or a "Notes"/"Method" text naming one).
"""

import importlib
import inspect
import re

import pytest

MODULES = [
    "fuelsys.fuels.petroleum", "fuelsys.fuels.blend", "fuelsys.fuels.library", "fuelsys.fuels.gases",
    "fuelsys.flow.tubing", "fuelsys.flow.friction", "fuelsys.flow.fittings", "fuelsys.flow.needle",
    "fuelsys.flow.manifold", "fuelsys.flow.lines", "fuelsys.flow.bench", "fuelsys.flow.tolerance",
    "fuelsys.heat", "fuelsys.vaporiser", "fuelsys.thermo", "fuelsys.equilibrium", "fuelsys.combustor",
    "fuelsys.engine", "fuelsys.pump", "fuelsys.gas_start",
]


def _public_functions():
    for name in MODULES:
        mod = importlib.import_module(name)
        for fname, fn in inspect.getmembers(mod, inspect.isfunction):
            if fname.startswith("_") or fn.__module__ != mod.__name__:
                continue
            yield f"{name}.{fname}", fn


FUNCS = dict(_public_functions())


def _parameter_blocks(doc: str):
    """(name, description text) for each entry of the numpydoc Parameters section."""
    m = re.search(r"\n\s*Parameters\n\s*-{5,}\n(.*?)(\n\s*\n\s*[A-Z][A-Za-z ]+\n\s*-{5,}|\Z)", doc, re.S)
    if not m:
        return None
    body = m.group(1)
    entries, current = [], None
    for line in body.splitlines():
        if re.match(r"^[A-Za-z_*][A-Za-z0-9_, *]*\s*:", line):  # entries start at the margin (getdoc dedents)
            current = [line.split(":")[0].strip(), ""]
            entries.append(current)
        elif current is not None:
            current[1] += " " + line.strip()
    return entries


@pytest.mark.parametrize("qualname", sorted(FUNCS))
def test_each_parameter_names_its_unit(qualname):
    fn = FUNCS[qualname]
    params = [p for p in inspect.signature(fn).parameters.values()
              if p.name not in ("self", "cls") and p.kind not in (p.VAR_POSITIONAL, p.VAR_KEYWORD)]
    if not params:
        return
    doc = inspect.getdoc(fn) or ""
    blocks = _parameter_blocks("\n" + doc)
    assert blocks is not None, f"{qualname}: no Parameters section"
    documented = {}
    for names, text in blocks:
        for n in names.split(","):
            documented[n.strip().lstrip("*")] = text.strip()
    for p in params:
        assert p.name in documented, f"{qualname}: parameter {p.name} is not documented"
        assert re.search(r"\[[^\]]+\]", documented[p.name]), \
            f"{qualname}: parameter {p.name} names no unit in brackets: {documented[p.name][:80]!r}"


#: accessors of data tables whose every row carries its own source (no method of their own)
DATA_ACCESSORS = {"fuelsys.fuels.blend.turbine_oil", "fuelsys.fuels.library.expected_rows_text",
                  "fuelsys.fuels.library.kerosene_sources", "fuelsys.fuels.library.kerosene_table"}


@pytest.mark.parametrize("qualname", sorted(set(FUNCS) - DATA_ACCESSORS))
def test_each_function_names_a_source(qualname):
    doc = inspect.getdoc(FUNCS[qualname]) or ""
    assert re.search(r"References\n-{5,}|Notes\n-{5,}|\(\d{4}\)|\b(19|20)\d\d\b|ISO|ASTM|API|CoolProp|:func:|:meth:", doc), \
        f"{qualname}: no source named in the docstring"
