"""The catalogue and everything generated from it stay in step.

No outside values here: these tests check the declarations themselves and that
the xlwings module, FS_HELP and docs/functions.md match them.
"""

import inspect
import re

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
