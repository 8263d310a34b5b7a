"""The adapter: cell values in, cell values out, errors as texts in the failing cells only.

Expected values here are arithmetic on the inputs (no outside source needed):
the test functions are declared in this file and never registered in the catalogue.
"""

import math

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError
from fuelsys.sheet import adapt
from fuelsys.sheet.catalogue import Arg, Returns, Spec


def _spec(impl, args, kind="number", name="FS_TEST"):
    return Spec(name=name, category="about", summary="test", args=tuple(args),
                returns=Returns(kind, "-", "test result"), source="test", impl=impl)


def _scale(x, k):
    x = np.asarray(x, dtype=float)
    if np.any(x > 100):
        raise FuelsysInputError("x must be <= 100 for this test function")
    return x * k


SCALE = _spec(_scale, [Arg("x", "number", "mm", "a length", gt=0),
                       Arg("k", "number", "-", "a factor", default=2.0)])


def test_scalar_in_float_out():
    out = adapt.call_spec(SCALE, 3.0)
    assert out == 6.0 and type(out) is float


def test_omitted_and_empty_optional_take_default():
    assert adapt.call_spec(SCALE, 3.0, None) == 6.0
    assert adapt.call_spec(SCALE, 3.0, "") == 6.0
    assert adapt.call_spec(SCALE, 3.0, 3) == 9.0


def test_range_broadcasts_row_against_column():
    out = adapt.call_spec(SCALE, [[1.0], [2.0]], [[1.0, 10.0]])
    assert out == [[1.0, 10.0], [2.0, 20.0]]


def test_flat_list_is_a_column():
    assert adapt.call_spec(SCALE, [1.0, 2.0]) == [[2.0], [4.0]]


def test_bad_elements_fail_alone():
    out = adapt.call_spec(SCALE, [[1.0], [-1.0], ["abc"], [None], [True], [200.0]])
    assert out[0][0] == 2.0
    assert out[1][0] == "FS error: x must be > 0 mm (got -1)"
    assert out[2][0].startswith("FS error: x must be a number in mm (got text")
    assert out[3][0] == "FS error: x is empty; a number in mm is required"
    assert out[4][0] == "FS error: x must be a number in mm (got TRUE)"
    # refused by the function itself: located element by element
    assert out[5][0] == "FS error: x must be <= 100 for this test function"


def test_required_missing_and_too_many():
    assert adapt.call_spec(SCALE).startswith("FS error: x is missing")
    assert adapt.call_spec(SCALE, 1, 2, 3).startswith("FS error: FS_TEST takes at most 2 arguments")


def test_shapes_that_do_not_fit():
    out = adapt.call_spec(SCALE, [[1.0], [2.0]], [[1.0], [2.0], [3.0]])
    assert out.startswith("FS error: the ranges given have shapes that do not fit")


def test_nan_result_is_an_error_text():
    nan = _spec(lambda x: np.full_like(np.asarray(x, float), np.nan), [Arg("x", "number", "-", "x")])
    assert adapt.call_spec(nan, 1.0).startswith("FS error: no finite result")


def test_internal_error_never_raises_unless_strict(monkeypatch):
    boom = _spec(lambda x: 1 / 0, [Arg("x", "number", "-", "x")])
    monkeypatch.setattr(adapt, "STRICT", False)
    assert adapt.call_spec(boom, 1.0).startswith("FS error: internal error in FS_TEST (ZeroDivisionError")
    monkeypatch.setattr(adapt, "STRICT", True)
    with pytest.raises(ZeroDivisionError):
        adapt.call_spec(boom, 1.0)


def test_grouped_arguments_get_one_value_per_call():
    seen = []

    def impl(x, mode):
        seen.append(mode)
        return np.asarray(x) * (1 if mode == "one" else 10)

    spec = _spec(impl, [Arg("x", "number", "-", "x"), Arg("mode", "text", "-", "mode", choices=("one", "ten"))])
    out = adapt.call_spec(spec, [[1.0], [2.0]], [["one"], ["TEN"]])
    assert out == [[1.0], [20.0]]
    assert sorted(seen) == ["one", "ten"]
    assert adapt.call_spec(spec, 1.0, "five") == 'FS error: mode must be one of one, ten (got "five")'


def test_table_result_and_single_cell_table():
    tab = _spec(lambda n: [["label", "value"], ["n", n]], [Arg("n", "number", "-", "n")], kind="table")
    assert adapt.call_spec(tab, 2) == [["label", "value"], ["n", 2.0]]
    one = _spec(lambda n: [[n * 2]], [Arg("n", "number", "-", "n")], kind="table")
    assert adapt.call_spec(one, 2) == 4.0
    assert adapt.call_spec(tab, [[1, 2]]).startswith("FS error: n must be a single cell")


def test_range_argument_drops_blanks_and_checks_bounds():
    spec = _spec(lambda v: [[float(np.sum(v))]], [Arg("v", "range", "mm", "values", gt=0)], kind="table")
    assert adapt.call_spec(spec, [[1.0], [2.0], [None]]) == 3.0
    assert adapt.call_spec(spec, [[1.0], [-2.0]]) == "FS error: v must be > 0 mm (got -2)"
    assert adapt.call_spec(spec, [[None]]).startswith("FS error: v holds no numbers")


def test_error_input_names_the_failed_cell():
    out = adapt.call_spec(SCALE, "FS error: bore_mm must be > 0")
    assert out == "FS error: x refers to a cell that failed (bore_mm must be > 0)"


def test_integer_bounds():
    spec = _spec(lambda n: np.asarray(n) + 1, [Arg("n", "number", "-", "count", low=1, integer=True)])
    assert adapt.call_spec(spec, 2) == 3.0
    assert adapt.call_spec(spec, 2.5) == "FS error: n must be a whole number >= 1 (got 2.5)"
    assert not math.isnan(adapt.call_spec(spec, 1))


def test_range_argument_refuses_a_gap_between_values():
    """A blank between values would shift every later value (needle 3's flow shown against needle 4)."""
    spec = _spec(lambda v: [[float(x)] for x in v], [Arg("v", "range", "mm", "values", gt=0)], kind="table")
    assert adapt.call_spec(spec, [[1.0], [None], [3.0]]).startswith("FS error: v: cell 2 of the range is empty")
    assert adapt.call_spec(spec, [[1.0], [3.0], [None], [""]]) == [[1.0], [3.0]]  # trailing blanks are fine


def test_single_empty_cell_range_is_an_empty_cell():
    """xlwings reads an empty cell given as an argument as [[None]] (ndim=2)."""
    assert adapt.call_spec(SCALE, [[3.0]], [[None]]) == [[6.0]]  # the default k = 2 applies
    assert adapt.call_spec(SCALE, [[None]]) == "FS error: x is empty; a number in mm is required"


# ---------------------------------------------------------------------------
# units declared once: the adapter converts (SI definitions: BIPM SI Brochure 9th ed. 2019,
# Table 8, bar = 1e5 Pa, °C = K - 273.15; standard atmosphere 101325 Pa, ISO 2533:1975)

def _si_spec(impl, args, returns):
    return Spec(name="FS_TEST_SI", category="about", summary="test", args=tuple(args), returns=returns,
                source="test", impl=impl, si=True)


def test_si_body_gets_core_units_and_result_goes_back():
    seen = {}

    def body(d, T, p, frac):
        seen.update(d=d, T=T, p=p, frac=frac)
        return d  # metres out, shown in the declared unit

    spec = _si_spec(body, [Arg("d_mm", "number", "mm", "a bore"), Arg("t_c", "number", "°C", "a temperature"),
                           Arg("p_bar_gauge", "number", "bar gauge", "a pressure", si="Pa abs"),
                           Arg("share_pct", "number", "%", "a share", default=50.0)],
                    Returns("number", "µm", "the bore"))
    out = adapt.call_spec(spec, 0.3, 20.0, 2.0)
    assert seen["d"] == pytest.approx(3e-4, rel=1e-15) and seen["T"] == 293.15
    assert seen["p"] == 301325.0 and seen["frac"] == 0.5
    assert out == pytest.approx(300.0, rel=1e-14) and type(out) is float


def test_si_ranges_and_tables_convert_every_number_but_not_texts():
    def body(x, n):
        return [[float(v), "ok" if v > 0.0005 else "low"] for v in x]

    spec = _si_spec(body, [Arg("x_mm", "range", "mm", "lengths", gt=0), Arg("n", "number", "-", "n", default=1)],
                    Returns("table", "mm", "lengths again"))
    out = adapt.call_spec(spec, [[0.3], [0.7]])
    assert out[0][0] == pytest.approx(0.3, rel=1e-15) and out[0][1] == "low" and out[1][1] == "ok"


def test_absolute_pressure_that_looks_gauge_is_refused():
    spec = _si_spec(lambda p: p, [Arg("case_bar_abs", "number", "bar abs", "case pressure", gt=0)],
                    Returns("number", "bar abs", "the same"))
    out = adapt.call_spec(spec, [[0.12], [1.2]])
    assert out[1][0] == pytest.approx(1.2, rel=1e-15)
    msg = out[0][0]
    assert msg.startswith("FS error: case_bar_abs = 0.12 bar abs looks like a gauge value")
    assert "+ 1.01325" in msg and "1.13325 bar abs" in msg


def test_tube_air_with_gauge_case_pressure_is_an_error():
    # issue 13: FS_TUBE_AIR(6, 4, 0.12, 28, 0.7) had the case pressure typed as gauge
    from fuelsys.sheet import call

    out = call("FS_TUBE_AIR", 6, 4, 0.12, 28, 0.7)
    assert out.startswith("FS error: case_bar_abs = 0.12 bar abs looks like a gauge value")
    assert isinstance(call("FS_TUBE_AIR", 6, 4, 1.13325, 28, 0.7), float)


# ---------------------------------------------------------------------------
# issue 16: Python ints beyond the largest float (a cell can hold them in the Python faces)

def _catalogue():
    from fuelsys.sheet import catalogue

    return catalogue.functions()


@pytest.mark.parametrize("name", [n for n, s in _catalogue().items() if s.args])
def test_whole_numbers_beyond_float_give_an_input_message(name, monkeypatch):
    monkeypatch.setattr(adapt, "STRICT", True)
    spec = _catalogue()[name]
    example = list(spec.example) + [None] * (len(spec.args) - len(spec.example))
    big = 10 ** 400
    for i, arg in enumerate(spec.args):
        for v in (big, -big, [[big], [2.0]]):
            cells = list(example)
            cells[i] = v
            out = adapt.call_spec(spec, *cells)
            flat = [c for row in out for c in row] if isinstance(out, list) else [out]
            assert not any(isinstance(c, str) and "internal error" in c for c in flat), (name, arg.name, out)
            if arg.kind == "number" and not isinstance(v, list):
                assert isinstance(out, str) and f"{arg.name} must be a finite number" in out and "401 digits" in out


def test_every_function_has_a_documented_example_that_computes():
    for name, spec in _catalogue().items():
        assert len(spec.example) >= spec.min_args, name
        out = adapt.call_spec(spec, *spec.example)
        flat = [c for row in out for c in row] if isinstance(out, list) else [out]
        assert not any(adapt.is_error(c) for c in flat), (name, out)
