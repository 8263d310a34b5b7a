"""The shape of the house: floors that only point down, rooms of a bounded size, live tests marked.

DESIGN.md "The house" and DEVELOPERS.md "Layout": errors, arrays, constants, roots and
thermo on the ground floor, then fuels/, then flow/, heat and equilibrium, then the engine
parts, then sheet/, then the command line.  A module imports only from its own floor or
below -- read from the real import statements (ast), function-level imports included.

Size: no file in fuelsys/ over 1,000 lines, no function over 120 lines of code (its
docstring not counted) or over 10 parameters, except the spreadsheet declarations
(``fuelsys/sheet/decl/``, whose signature is the spreadsheet function's argument list) and
the exceptions listed below with their reason.  The lists hold what is over today; a test
fails when an exception is no longer needed, so they can only shrink.
"""

from __future__ import annotations

import ast
import pathlib
import re

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[1]
PKG = ROOT / "fuelsys"

#: floors from the ground up: (name, module prefixes)
FLOORS = (
    ("ground", ("fuelsys", "fuelsys.errors", "fuelsys.arrays", "fuelsys.constants", "fuelsys.roots",
                "fuelsys.thermo", "fuelsys.safety")),
    ("fuels", ("fuelsys.fuels",)),
    ("flow and heat", ("fuelsys.flow", "fuelsys.heat", "fuelsys.equilibrium")),
    ("engine parts", ("fuelsys.vaporiser", "fuelsys.combustor", "fuelsys.engine", "fuelsys.pump",
                      "fuelsys.gas_start", "fuelsys.demo")),
    ("sheet", ("fuelsys.sheet",)),
    ("command line", ("fuelsys.cli", "fuelsys.__main__")),
)

#: upward or circular imports still there: (importer, imported) -> reason
KNOWN_CYCLES = {
    ("fuelsys.fuels.petroleum", "fuelsys.fuels.blend"):
        "PetroleumFuel.with_oil imports blend inside the method while blend imports petroleum's Walther "
        "and composition functions at the top; to break it, those move to a module both import "
        "(physics helper's files, issue 18 item 7)",
}

MAX_FILE_LINES = 1000
MAX_FUNCTION_LINES = 120
MAX_PARAMETERS = 10

#: files over MAX_FILE_LINES -> reason
BIG_FILES = {
    "fuelsys/fuels/petroleum.py": "correlations and the PetroleumFuel class in one file; to split into "
                                  "correlations and the fuel (physics helper, issue 18)",
    "fuelsys/fuels/gases.py": "tables, flash and the CoolPropFluid class in one file; to split "
                              "(physics helper, issue 18)",
    "fuelsys/sheet/evaluate.py": "being split into a formula package (files helper, issue 18 item 3)",
    "fuelsys/sheet/xlsx.py": "being split into reading, sheet editor and zip copying (files helper, issue 18 item 3)",
    "fuelsys/sheet/builtins.py": "the spreadsheet built-ins; to split by family (files helper, issue 18 item 3)",
}

#: functions over MAX_FUNCTION_LINES or MAX_PARAMETERS: "path:qualified name" -> reason
BIG_FUNCTIONS = {
    "fuelsys/engine.py:operating_line": "17 keyword parameters: the engine's whole design description; to take "
                                        "one design record (book helper's file, not yet split)",
    "fuelsys/flow/tolerance.py:tolerance_study": "17 parameters: needle, manifold and tolerance description; to "
                                                 "take one needle-set record (physics helper's file)",
    "fuelsys/flow/manifold.py:ring_manifold": "15 parameters: ring, needles and fuel; to take one ring record "
                                              "(physics helper's file)",
    "fuelsys/flow/manifold.py:_residual": "16 parameters handed down from ring_manifold; goes with it",
    "fuelsys/gas_start.py:canister_chill": "12 parameters: canister, gas and run description (physics helper's file)",
    "fuelsys/fuels/petroleum.py:PetroleumFuel.__init__": "11 parameters: the fuel's data sheet; follows the "
                                                         "petroleum split (physics helper's file)",
}


# -- imports --------------------------------------------------------------------------------------
def module_name(path: pathlib.Path) -> str:
    rel = path.relative_to(ROOT).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def package_files():
    return sorted(p for p in PKG.rglob("*.py") if "__pycache__" not in p.parts)


MODULES = {module_name(p): p for p in package_files()}


def floor_of(module: str) -> int:
    best, floor = -1, None
    for i, (_name, prefixes) in enumerate(FLOORS):
        for prefix in prefixes:
            if (module == prefix or module.startswith(prefix + ".")) and len(prefix) > best:
                best, floor = len(prefix), i
    assert floor is not None, f"{module} is on no floor: add it to FLOORS"
    return floor


def imports_of(module: str) -> set[str]:
    """The fuelsys modules that ``module`` imports anywhere in its file (top level or in a function)."""
    path = MODULES[module]
    tree = ast.parse(path.read_text(encoding="utf-8"))
    is_pkg = path.name == "__init__.py"
    out = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names = [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = module.split(".") if is_pkg else module.split(".")[:-1]
                base = base[: len(base) - (node.level - 1)]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            names = [f"{target}.{a.name}" if f"{target}.{a.name}" in MODULES else target for a in node.names]
        else:
            continue
        for name in names:
            if name == "fuelsys" or name.startswith("fuelsys."):
                while name not in MODULES:  # fuelsys.x.y where y is a name inside module fuelsys.x
                    name = name.rsplit(".", 1)[0]
                if name != module:
                    out.add(name)
    return out


IMPORTS = {m: imports_of(m) for m in MODULES}


def test_every_module_is_on_a_floor():
    for m in MODULES:
        floor_of(m)


@pytest.mark.parametrize("module", sorted(MODULES))
def test_nothing_points_upward(module):
    mine = floor_of(module)
    up = sorted(t for t in IMPORTS[module] if floor_of(t) > mine and (module, t) not in KNOWN_CYCLES)
    assert not up, (f"{module} ({FLOORS[mine][0]} floor) imports from above: "
                    + ", ".join(f"{t} ({FLOORS[floor_of(t)][0]})" for t in up))


def _cycles():
    """Pairs (a, b) where a imports b and b reaches a again (a cycle through the import graph)."""
    def reaches(start, goal):
        seen, todo = set(), [start]
        while todo:
            m = todo.pop()
            if m == goal:
                return True
            if m in seen:
                continue
            seen.add(m)
            todo.extend(IMPORTS.get(m, ()))
        return False

    return {(a, b) for a in IMPORTS for b in IMPORTS[a]
            if not b.startswith(a + ".") and not a.startswith(b + ".") and reaches(b, a)}


def test_no_import_cycles():
    """No module imports one that imports it back (a package and its own modules aside: an __init__
    gathering its modules' names is no cycle of layers)."""
    cycles = _cycles()
    unknown = {(a, b) for a, b in cycles if (a, b) not in KNOWN_CYCLES and (b, a) not in KNOWN_CYCLES}
    assert not unknown, f"import cycles: {sorted(unknown)}"
    stale = {k for k in KNOWN_CYCLES if k not in cycles and k[::-1] not in cycles}
    assert not stale, f"these known cycles are gone; remove them from KNOWN_CYCLES: {sorted(stale)}"


def test_the_floor_check_sees_function_level_imports():
    assert "fuelsys.fuels.blend" in IMPORTS["fuelsys.fuels.petroleum"]  # imported inside with_oil
    assert "fuelsys.thermo" in IMPORTS["fuelsys.fuels.gases"]


#: another module's private names still used: (user, owner) -> reason
KNOWN_PRIVATE_USES = {
    ("fuelsys.flow.bench", "fuelsys.flow.friction"): "_turbulent_method: the flow package's method check",
    ("fuelsys.flow.lines", "fuelsys.flow.friction"): "_fully_developed, _turbulent_method: friction internals",
    ("fuelsys.flow.manifold", "fuelsys.flow.friction"): "_turbulent_method: the flow package's method check",
    ("fuelsys.flow.needle", "fuelsys.flow.friction"): "_apparent, _turbulent_method: friction internals",
    ("fuelsys.flow.bench", "fuelsys.flow.needle"): "_check_pmax, _flag_validity, _k_total: needle internals",
    ("fuelsys.flow.manifold", "fuelsys.flow.needle"): "_check_pmax, _flag_validity, _needle_dp_and_slope",
    ("fuelsys.flow.manifold", "fuelsys.flow.lines"): "_line_dp_and_slope: the line's drop with its slope",
    ("fuelsys.vaporiser._droplets", "fuelsys.heat"): "_sutherland: heat's raw air viscosity",
    ("fuelsys.vaporiser._tables", "fuelsys.heat"): "_sutherland: heat's raw air viscosity",
    ("fuelsys.vaporiser._march", "fuelsys.heat"): "_radiation_raw, _radiation_slope_raw, _segment_raw: heat's "
                                                  "unchecked kernels for the march",
}
#: the way out for the entries above (physics and vaporiser helpers' files): a private module inside the
#: package (flow/_core.py) holding the shared internals, and heat's kernels public with their docstring


def private_uses():
    """``{(user, owner): names}``: private names (``_x``) a module takes from another fuelsys module
    (a package's own private modules, like vaporiser/_march.py, are the package's inside and allowed)."""
    out = {}
    for module, path in MODULES.items():
        tree = ast.parse(path.read_text(encoding="utf-8"))
        aliases = {}
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom) and node.module and node.module.startswith("fuelsys") \
                    and not node.level:
                for a in node.names:
                    full = f"{node.module}.{a.name}"
                    if full in MODULES:
                        aliases[a.asname or a.name] = full
                    elif a.name.startswith("_") and not a.name.startswith("__") and node.module != module:
                        out.setdefault((module, node.module), set()).add(a.name)
            elif isinstance(node, ast.Import):
                for a in node.names:
                    if a.name.startswith("fuelsys."):
                        aliases[a.asname or a.name] = a.name
        for node in ast.walk(tree):
            if isinstance(node, ast.Attribute) and isinstance(node.value, ast.Name) \
                    and node.value.id in aliases and node.attr.startswith("_") and not node.attr.startswith("__"):
                out.setdefault((module, aliases[node.value.id]), set()).add(node.attr)
    return {k: v for k, v in out.items()
            if not (k[1].rsplit(".", 1)[-1].startswith("_") and k[1].rsplit(".", 1)[0] == k[0].rsplit(".", 1)[0])}


def test_no_module_uses_another_modules_private_names():
    uses = private_uses()
    unknown = {k: sorted(v) for k, v in uses.items() if k not in KNOWN_PRIVATE_USES}
    assert not unknown, f"private names used across modules (make them public or move them): {unknown}"
    stale = sorted(set(KNOWN_PRIVATE_USES) - set(uses))
    assert not stale, f"no longer used: remove from KNOWN_PRIVATE_USES: {stale}"


# -- sizes ----------------------------------------------------------------------------------------
def _rel(path):
    return path.relative_to(ROOT).as_posix()


def big_files():
    out = {}
    for p in package_files():
        n = len(p.read_text(encoding="utf-8").splitlines())
        if n > MAX_FILE_LINES:
            out[_rel(p)] = n
    return out


def _code_lines(fn) -> int:
    """Lines of a function, its docstring not counted."""
    n = fn.end_lineno - fn.lineno + 1
    body = fn.body
    if body and isinstance(body[0], ast.Expr) and isinstance(getattr(body[0], "value", None), ast.Constant) \
            and isinstance(body[0].value.value, str):
        n -= body[0].end_lineno - body[0].lineno + 1
    return n


def _n_parameters(fn) -> int:
    a = fn.args
    names = [x.arg for x in a.posonlyargs + a.args + a.kwonlyargs]
    return len([n for n in names if n not in ("self", "cls")])


def big_functions():
    out = {}
    for p in package_files():
        rel = _rel(p)
        if rel.startswith("fuelsys/sheet/decl/"):
            continue
        tree = ast.parse(p.read_text(encoding="utf-8"))

        def visit(node, prefix):
            for child in ast.iter_child_nodes(node):
                if isinstance(child, (ast.FunctionDef, ast.AsyncFunctionDef)):
                    q = prefix + child.name
                    lines, params = _code_lines(child), _n_parameters(child)
                    if lines > MAX_FUNCTION_LINES or params > MAX_PARAMETERS:
                        out[f"{rel}:{q}"] = (lines, params)
                    visit(child, q + ".")
                elif isinstance(child, ast.ClassDef):
                    visit(child, prefix + child.name + ".")

        visit(tree, "")
    return out


def test_no_file_over_the_limit():
    over = big_files()
    unlisted = {f: n for f, n in over.items() if f not in BIG_FILES}
    assert not unlisted, f"files over {MAX_FILE_LINES} lines: {unlisted}"
    stale = sorted(set(BIG_FILES) - set(over))
    assert not stale, f"no longer over the limit (or gone): remove from BIG_FILES: {stale}"


def test_no_function_over_the_limits():
    over = big_functions()
    unlisted = {f: v for f, v in over.items() if f not in BIG_FUNCTIONS}
    assert not unlisted, (f"functions over {MAX_FUNCTION_LINES} lines of code or {MAX_PARAMETERS} "
                          f"parameters (lines, parameters): {unlisted}")
    stale = sorted(set(BIG_FUNCTIONS) - set(over))
    assert not stale, f"no longer over the limits (or gone): remove from BIG_FUNCTIONS: {stale}"


#: what starting a spreadsheet program looks like in a test: finding its executable or passing the
#: headless switch (the runner's own tests live in test_calc_live.py, marked live as a module)
STARTS_LIBREOFFICE = re.compile(r"which\(\s*[\"'](soffice|libreoffice)[\"']|[\"']--headless[\"']")


# -- markers --------------------------------------------------------------------------------------
def test_tests_that_start_libreoffice_are_marked_live():
    """A test that starts a spreadsheet program carries the ``live`` marker (on itself or its module)."""
    unmarked = []
    for path in sorted((ROOT / "tests").glob("test_*.py")):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        module_live = any(isinstance(n, ast.Assign) and any(getattr(t, "id", "") == "pytestmark" for t in n.targets)
                          and "live" in ast.unparse(n.value) for n in tree.body)
        for node in tree.body:
            if not (isinstance(node, ast.FunctionDef) and node.name.startswith("test_")):
                continue
            src = ast.unparse(node)
            starts = bool(STARTS_LIBREOFFICE.search(src)) and "monkeypatch" not in src
            marked = module_live or any("live" in ast.unparse(d) for d in node.decorator_list)
            if starts and not marked:
                unmarked.append(f"{path.name}::{node.name}")
    assert not unmarked, f"tests that start LibreOffice without the live marker: {unmarked}"
