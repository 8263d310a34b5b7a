"""Tolerance study: zero tolerance, reproducibility, and the spread each flow regime predicts.

Expected scalings: Hagen-Poiseuille, q ~ D^4 (laminar friction dominated); Bernoulli through the
entrance and exit heads, q ~ D^2 sqrt(dp) (kinetic dominated).  A uniform deviation on [-t, t] has a
standard deviation t/sqrt(3) (any statistics text).
"""

import math

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError
from fuelsys.flow.tolerance import draw_deviations, tolerance_study, tolerance_study_fuel

pytestmark = pytest.mark.filterwarnings("ignore::fuelsys.errors.ValidityWarning")


def test_zero_tolerance_gives_zero_spread():
    r = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, needles=8, bore_tol=0.0, length_tol=0.0, samples=50)
    assert r["cv_mean"] < 1e-12 and r["cv_p95"] < 1e-12
    assert abs(r["low_worst"]) < 1e-12 and abs(r["high_worst"]) < 1e-12
    assert r["mean_flow"] == pytest.approx(r["nominal_flow"], rel=1e-12)


def test_seeded_and_reproducible():
    a = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, 8, 0.01e-3, 0.2e-3, samples=100, seed=42)
    b = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, 8, 0.01e-3, 0.2e-3, samples=100, seed=42)
    c = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, 8, 0.01e-3, 0.2e-3, samples=100, seed=43)
    assert np.array_equal(a["flows"], b["flows"])
    assert not np.array_equal(a["flows"], c["flows"])
    assert a["flows"].shape == (100, 8)


def test_laminar_friction_dominated_spread_is_four_times_the_bore_spread():
    # Hagen-Poiseuille: q ~ D^4 -> CV(q) = 4 CV(D); long thin needle, Re well below 100
    bore, tol = 0.15e-3, 0.003e-3
    r = tolerance_study(bore, 80e-3, 2e5, 800.0, 3e-3, needles=2000, bore_tol=tol, samples=5, seed=1)
    rel_bore = tol / math.sqrt(3) / bore
    assert r["cv_mean"] / rel_bore == pytest.approx(4.0, rel=0.05)
    assert r["bore_sensitivity"] == pytest.approx(4.0, rel=0.02)


def test_kinetic_dominated_spread_is_twice_the_bore_spread():
    # Bernoulli: q ~ D^2 sqrt(dp) when the entrance and exit heads dominate; short wide needle, high Re
    bore, tol = 1.0e-3, 0.01e-3
    r = tolerance_study(bore, 2e-3, 2e5, 998.0, 1.0e-3, needles=2000, bore_tol=tol, samples=5, seed=1)
    rel_bore = tol / math.sqrt(3) / bore
    assert r["cv_mean"] / rel_bore == pytest.approx(2.0, rel=0.06)
    assert r["bore_sensitivity"] == pytest.approx(2.0, rel=0.05)


def test_spread_grows_in_proportion_to_the_bore_tolerance():
    r1 = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, 8, 0.002e-3, samples=400, seed=3)
    r2 = tolerance_study(0.3e-3, 25e-3, 2e5, 800.0, 1.6e-3, 8, 0.004e-3, samples=400, seed=3)
    assert r2["cv_mean"] / r1["cv_mean"] == pytest.approx(2.0, rel=0.02)
    assert r1["low_typical"] < 0 < r1["high_typical"]
    assert r1["low_worst"] <= r1["low_typical"] and r1["high_worst"] >= r1["high_typical"]


def test_length_tolerance_alone_spreads_laminar_flow():
    # Hagen-Poiseuille: q ~ 1/L
    r = tolerance_study(0.15e-3, 80e-3, 2e5, 800.0, 3e-3, 2000, 0.0, length_tol=2e-3, samples=5)
    assert r["cv_mean"] == pytest.approx(2e-3 / math.sqrt(3) / 80e-3, rel=0.06)


def test_distributions():
    rng = np.random.default_rng(0)
    u = draw_deviations(rng, 0.01, (200000,), "uniform")
    assert np.all(np.abs(u) <= 0.01) and u.std() == pytest.approx(0.01 / math.sqrt(3), rel=0.01)
    n = draw_deviations(rng, 0.03, (200000,), "normal")
    # scipy.stats.truncnorm: a normal with sigma = tol/3 truncated at +-3 sigma has std 0.9866 sigma
    from scipy.stats import truncnorm

    assert np.all(np.abs(n) <= 0.03) and n.std() == pytest.approx(0.01 * truncnorm(-3, 3).std(), rel=0.01)
    with pytest.raises(FuelsysInputError, match="valid: uniform, normal"):
        draw_deviations(rng, 0.01, (3,), "triangular")


def test_fuel_wrapper():
    from fuelsys.fuels import get_fuel

    r = tolerance_study_fuel(0.3e-3, 25e-3, 2e5, get_fuel("kerosene"), 288.15, 6, 0.005e-3, samples=20)
    assert 0 < r["cv_mean"] < 0.1


@pytest.mark.parametrize("kw, match", [
    (dict(bore_tol=0.3e-3), "bore tolerance .* must be smaller than the bore"),
    (dict(length_tol=30e-3), "length tolerance .* must be smaller than the length"),
    (dict(needles=1), "needles must be at least 2"),
    (dict(samples=0), "samples must be at least 1"),
    (dict(od_min=0.31e-3), "reaches the tubing's outside diameter"),
    (dict(bore_tol=-1e-6), "tolerances must be >= 0"),
])
def test_bad_input(kw, match):
    args = dict(bore=0.3e-3, length=25e-3, dp=2e5, rho=800.0, mu=1.6e-3, needles=8, bore_tol=0.01e-3, samples=10)
    args.update(kw)
    with pytest.raises(FuelsysInputError, match=match):
        tolerance_study(**args)
