"""Property-based test over every catalogue function (hypothesis).

Any cell-like input -- numbers, texts, booleans, empty cells, small ranges of
them -- gives a finite number, a text (an ``FS error:`` text or a result such
as a verdict), a boolean, or a table of those.  Never an exception, never a
NaN or infinity passed off as a number.  adapt.STRICT is on, so a bug inside a
function raises here instead of hiding behind an "internal error" text.
"""

import math

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fuelsys.sheet import adapt, catalogue

FUNCS = catalogue.functions()

# plausible magnitudes by unit, so that many draws get past the input checks
# into the physics (the wild draws below cover the checks themselves)
_PLAUSIBLE = {
    "°C": (-60.0, 400.0), "mm": (0.05, 50.0), "bar": (0.0, 20.0), "g/min": (0.0, 500.0),
    "g/s": (0.0, 500.0), "% vol": (0.0, 20.0), "%": (0.0, 100.0), "V": (0.0, 24.0),
}
_TEXTS = ["kerosene", "propane", "butane", "lpg-70-30", "water", "air", "turbine-oil", "", " ",
          "FS error: upstream", "verdict", "normal", "thin", "22", "zz-unknown"]


def _number_strategy(arg):
    lo, hi = (-1e3, 1e3)
    for key, rng in _PLAUSIBLE.items():
        if arg.unit.startswith(key):
            lo, hi = rng
    near = []
    for b in (arg.low, arg.high, arg.gt, arg.lt):
        if b is not None:
            near += [b, b * 1.01 + 0.01, b * 0.99 - 0.01]
    choices = [st.floats(lo, hi), st.integers(-5, 60).map(float)]
    if near:
        choices.append(st.sampled_from(near))
    return st.one_of(*choices)


def _scalar(arg):
    wild = st.one_of(st.none(), st.booleans(), st.sampled_from(_TEXTS), st.text(max_size=6),
                     st.floats(allow_nan=False, allow_infinity=False, width=32), st.integers(-10**6, 10**6))
    if arg.kind == "number":
        good = _number_strategy(arg)
    elif arg.kind in ("text", "fuel"):
        good = st.sampled_from(list(arg.choices) if arg.choices else _TEXTS)
    else:
        good = _number_strategy(arg)
    return st.one_of(good, good, wild)


def _value(arg):
    one = _scalar(arg)
    rng = st.integers(1, 3).flatmap(lambda r: st.integers(1, 2).flatmap(
        lambda c: st.lists(st.lists(one, min_size=c, max_size=c), min_size=r, max_size=r)))
    if arg.kind in ("range", "cells"):
        return st.one_of(rng, one)
    return st.one_of(one, one, one, rng)


def _ok_cell(v):
    if isinstance(v, bool) or isinstance(v, str):
        return True
    return isinstance(v, float) and math.isfinite(v)


def _check(out):
    if isinstance(out, list):
        assert out and all(isinstance(r, list) and r for r in out), out
        width = len(out[0])
        for r in out:
            assert len(r) == width, out
            for v in r:
                assert _ok_cell(v), (v, out)
    else:
        assert _ok_cell(out), out


@pytest.fixture(autouse=True)
def strict(monkeypatch):
    monkeypatch.setattr(adapt, "STRICT", True)


@pytest.mark.parametrize("name", list(FUNCS))
def test_any_cell_input_gives_a_cell_value(name):
    spec = FUNCS[name]

    @settings(max_examples=40, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)
    @given(st.integers(0, len(spec.args)).flatmap(
        lambda n: st.tuples(*[_value(a) for a in spec.args[:max(n, spec.min_args)]])))
    def run(cells):
        _check(adapt.call_spec(spec, *cells))

    run()
