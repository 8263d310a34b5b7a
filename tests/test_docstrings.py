"""The docstring rule, checked once for every public function of the core (non-sheet) modules.

STYLE.md "Do" 1 and 7, DESIGN.md: every parameter's description ends with its unit in
brackets ("[m]", "[-]" when dimensionless); every method names its published source in a
References section; every public function shows a runnable example (the examples
themselves run under ``--doctest-modules``, set in pyproject.toml).

The modules are found by walking the package, not from a hand-kept list: every module of
fuelsys except the spreadsheet face (``fuelsys.sheet``, whose functions are declared and
documented through the catalogue), the command line, private modules (a name part
starting with ``_``) and the tool modules in :data:`TOOL_MODULES`.

This is the one parser of the numpydoc sections in the tests; other tests that need the
Parameters of a docstring import :func:`sections` and :func:`parameter_descriptions`.
"""

from __future__ import annotations

import importlib
import inspect
import pathlib
import pkgutil
import re

import pytest

import fuelsys

#: modules of tools rather than methods (no physical parameters, no published method)
TOOL_MODULES = {
    "fuelsys.errors": "the error and warning classes and their helpers",
    "fuelsys.arrays": "array conversion and input checks",
    "fuelsys.constants": "physical constants (each with its source beside it, not a function)",
    "fuelsys.roots": "the vectorised root finder (numerical method, sources in the module docstring)",
}

#: the parts of the package that are not the core API
NOT_CORE = ("fuelsys.sheet", "fuelsys.cli", "fuelsys.__main__")

#: public functions exempt from the References and Examples rule, with the reason
NO_METHOD = {
    "fuelsys.fuels.blend.turbine_oil": "accessor of the built-in oil, whose every datum carries its source",
    "fuelsys.fuels.library.expected_rows_text": "text listing the rows of a fuel table",
    "fuelsys.fuels.library.kerosene_sources": "accessor of the source of each datum of the built-in kerosene",
    "fuelsys.fuels.library.kerosene_table": "accessor of the built-in kerosene's data sheet (sourced per row)",
    "fuelsys.fuels.known_fuel_names": "the list of built-in names",
}


def core_modules() -> list[str]:
    """Names of the core modules: every module of fuelsys outside NOT_CORE, private names and TOOL_MODULES."""
    names = []
    for info in pkgutil.walk_packages(fuelsys.__path__, "fuelsys."):
        name = info.name
        if name.startswith(NOT_CORE) or name in TOOL_MODULES:
            continue
        if any(part.startswith("_") for part in name.split(".")[1:]):
            continue
        names.append(name)
    return sorted(names)


def public_functions(module_names):
    """``{qualified name: function}`` of the public functions defined in each module."""
    out = {}
    for name in module_names:
        mod = importlib.import_module(name)
        for fname, fn in inspect.getmembers(mod, inspect.isfunction):
            if not fname.startswith("_") and fn.__module__ == mod.__name__:
                out[f"{name}.{fname}"] = fn
    return out


def sections(doc: str) -> dict[str, list[str]]:
    """The numpydoc sections of ``doc``: ``{title: lines}``, a title being a line underlined by dashes."""
    lines = inspect.cleandoc(doc or "").splitlines()
    out, current, i = {}, None, 0
    while i < len(lines):
        if i + 1 < len(lines) and lines[i].strip() and re.fullmatch(r"-{3,}", lines[i + 1].strip()):
            current = lines[i].strip()
            out[current] = []
            i += 2
            continue
        if current is not None:
            out[current].append(lines[i])
        i += 1
    return out


def parameter_descriptions(doc: str, section: str = "Parameters") -> dict[str, str] | None:
    """``{parameter name: description}`` from the Parameters (or another such) section (None without one).

    An entry starts at the margin (``name : type`` or ``a, b : type``); the lines indented
    under it are its description.  ``*args`` and ``**kwargs`` keep their stars.
    """
    sec = sections(doc)
    if section not in sec:
        return None
    entries, current = {}, None
    for line in sec[section]:
        if line.strip() and not line[0].isspace():
            current = [n.strip() for n in line.split(":")[0].split(",")]
            for n in current:
                entries[n] = ""
        elif current is not None:
            for n in current:
                entries[n] = (entries[n] + " " + line.strip()).strip()
    return entries


#: the unit in brackets closes the description; a remark in parentheses may follow it
UNIT_AT_END = re.compile(r"\[[^\]]+\]\.?(\s*\([^()]*\))?\.?$")


def unit_problems(fn) -> list[str]:
    """What breaks the unit rule in ``fn``'s docstring (empty when it holds)."""
    params = [p for p in inspect.signature(fn).parameters.values() if p.name not in ("self", "cls")]
    if not params:
        return []
    documented = parameter_descriptions(fn.__doc__ or "")
    if documented is None:
        return ["no Parameters section"]
    problems = []
    for p in params:
        key = {p.VAR_POSITIONAL: "*", p.VAR_KEYWORD: "**"}.get(p.kind, "") + p.name
        text = documented.get(key, documented.get(p.name))
        if text is None:
            problems.append(f"parameter {key} is not documented")
        elif not UNIT_AT_END.search(text):
            problems.append(f"parameter {key} does not end with its unit in brackets: {text[-80:]!r}")
    taken = {p.name for p in params}
    for key in documented:
        if key.lstrip("*") not in taken:
            problems.append(f"documents {key}, which it does not take")
    return problems


MODULES = core_modules()
FUNCS = public_functions(MODULES)


def test_the_walk_finds_the_core():
    """The walk finds the physics floors (a wrong filter would silently check nothing)."""
    for expected in ("fuelsys.fuels.petroleum", "fuelsys.flow.needle", "fuelsys.thermo", "fuelsys.engine"):
        assert expected in MODULES
    assert not [m for m in MODULES if m.startswith("fuelsys.sheet")]
    assert len(FUNCS) > 100
    assert set(NO_METHOD) <= set(FUNCS), "an exemption names a function that no longer exists"


@pytest.mark.parametrize("qualname", sorted(FUNCS))
def test_each_parameter_ends_with_its_unit(qualname):
    problems = unit_problems(FUNCS[qualname])
    assert not problems, f"{qualname}: " + "; ".join(problems)


@pytest.mark.parametrize("qualname", sorted(set(FUNCS) - set(NO_METHOD)))
def test_each_function_names_its_source_and_shows_an_example(qualname):
    sec = sections(FUNCS[qualname].__doc__ or "")
    assert "References" in sec and any(line.strip() for line in sec["References"]), \
        f"{qualname}: no References section"
    assert "Examples" in sec and any(">>>" in line for line in sec["Examples"]), f"{qualname}: no example"


def test_the_parser_reads_numpydoc():
    doc = """Summary.

    Parameters
    ----------
    a, b : float
        Two lengths,
        on two lines [m].
    c : float
        A ratio [-] (of two lengths).
    **kw : dict
        Options, no unit.

    Returns
    -------
    float
        Something [m].
    """
    got = parameter_descriptions(doc)
    assert got == {"a": "Two lengths, on two lines [m].", "b": "Two lengths, on two lines [m].",
                   "c": "A ratio [-] (of two lengths).", "**kw": "Options, no unit."}
    assert list(sections(doc)) == ["Parameters", "Returns"]

    def f(a, b, c, **kw):
        pass

    f.__doc__ = doc
    assert unit_problems(f) == ["parameter **kw does not end with its unit in brackets: 'Options, no unit.'"]


# -- nomenclature -----------------------------------------------------------------------------------
NOMENCLATURE = pathlib.Path(__file__).resolve().parents[1] / "docs" / "nomenclature.md"


def read_nomenclature():
    """``(names, drifts)`` from docs/nomenclature.md: ``{name: set of units}`` from the tables above
    "Names still to rename", and ``{name in the code: the page's name}`` from that last table."""
    names, drifts, in_drift = {}, {}, False
    for line in NOMENCLATURE.read_text(encoding="utf-8").splitlines():
        if line.startswith("## "):
            in_drift = line.strip() == "## Names still to rename"
        m = re.match(r"\|\s*`([^`]+)`\s*\|([^|]*)\|([^|]*)\|\s*$", line)
        if not m:
            continue
        if in_drift:
            drifts[m.group(1)] = m.group(2).strip()
        else:
            names[m.group(1)] = {u.strip() for u in re.split(r"\s+or\s+", m.group(3)) if u.strip()}
    return names, drifts


def _unit_of(text: str) -> str:
    units = re.findall(r"\[([^\]]+)\]", text or "")
    return units[-1].replace("·", " ").strip() if units else ""


def nomenclature_findings():
    """``(unknown, wrong_unit, drift_seen)`` over the public signatures of the core."""
    names, drifts = read_nomenclature()
    unknown, wrong_unit, drift_seen = [], [], set()
    for qualname, fn in sorted(FUNCS.items()):
        documented = parameter_descriptions(fn.__doc__ or "") or {}
        for p in inspect.signature(fn).parameters.values():
            unit = _unit_of(documented.get(p.name, documented.get("**" + p.name, "")))
            if p.name in names and (unit in names[p.name] or p.kind is p.VAR_KEYWORD):
                continue
            if p.name in drifts:
                drift_seen.add(p.name)
            elif p.name not in names:
                unknown.append(f"{qualname}: {p.name}")
            else:
                wrong_unit.append(f"{qualname}: {p.name} [{unit}], the page says {sorted(names[p.name])}")
    return unknown, wrong_unit, drift_seen


def test_every_public_parameter_is_named_as_the_nomenclature_says():
    """docs/nomenclature.md names every parameter of the core API with its unit (pvlib's manner)."""
    unknown, wrong_unit, _ = nomenclature_findings()
    assert not unknown, "parameters missing from docs/nomenclature.md: " + "; ".join(unknown)
    assert not wrong_unit, "parameters whose unit differs from docs/nomenclature.md: " + "; ".join(wrong_unit)


def test_the_names_still_to_rename_are_still_there():
    """The page's list of drifting names holds only names still in the code (it can only shrink)."""
    _, drifts = read_nomenclature()
    _, _, seen = nomenclature_findings()
    assert drifts, "the page has no 'Names still to rename' table"
    gone = sorted(set(drifts) - seen)
    assert not gone, f"renamed already: remove from docs/nomenclature.md's last table: {gone}"
