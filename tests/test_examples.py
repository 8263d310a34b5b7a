"""The examples: the script sizes the same system as the demo book, and the committed demo book is current.

Expected values: the demo book's own cached results (fuelsys's two faces must agree).
"""

import importlib.util
import warnings
from pathlib import Path

import pytest

from fuelsys.errors import ValidityWarning
from fuelsys.sheet import book as sheet_book
from fuelsys.sheet import starter

ROOT = Path(__file__).resolve().parents[1]


def _script():
    spec = importlib.util.spec_from_file_location("size_demo_engine", ROOT / "examples" / "size_demo_engine.py")
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def test_script_agrees_with_the_demo_book():
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        r = _script().size()
    rows = dict(sheet_book.read_summary(starter.EXAMPLE_PATH))
    # the script sizes the cold day, where the book's full-power checks are limited
    assert r["fuel_flow"][-1] * 6e4 == pytest.approx(rows["fuel at full power, cold day [g/min]"], rel=1e-9)
    assert r["bore"] * 1e3 == pytest.approx(rows["bore used [mm]"], rel=1e-9)
    assert r["needle_dp"][-1] / 1e5 == pytest.approx(rows["needle Δp at full power, cold day [bar]"], rel=1e-9)
    assert r["vapour_fraction"][0] * 100 == pytest.approx(rows["vaporised at idle, cold day [%]"], rel=1e-6)
    assert r["vapour_fraction"][-1] * 100 == pytest.approx(rows["vaporised at full power, cold day [%]"], rel=1e-6)
    assert r["pump_need"][-1] / 1e5 == pytest.approx(rows["pump outlet needed, highest [bar gauge]"], rel=1e-9)
    assert r["volts"][-1] == pytest.approx(rows["pump volts, most needed [V]"], rel=1e-6)
    assert r["gas_flow"] * 6e4 == pytest.approx(rows["gas flow at the start [g/min]"], rel=1e-6)
    assert r["verdict"][-1] == rows["vaporiser verdict at full power, cold day"]


def test_committed_demo_book_is_up_to_date(tmp_path):
    from test_starter import _sheet_signature

    fresh = starter.build(tmp_path / "demo.xlsx", compute=False, title_note="demo")
    assert _sheet_signature(starter.EXAMPLE_PATH) == _sheet_signature(fresh), \
        "examples/fuelsys-demo.xlsx is out of date: run python -m fuelsys.sheet.starter"
