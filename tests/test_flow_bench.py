"""Bench calibration: effective bore recovered from synthetic tests made with the forward model; odd needles.

The synthetic data are made with fuelsys.flow.needle.needle_flow (the forward model) at chosen bores;
the test is that the inverse returns those bores.  Water at 20 degC: 998.21 kg/m3, 1.0016 mPa s
(IAPWS-95 via CoolProp).
"""

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError
from fuelsys.flow.bench import bench_mass_flow, effective_bore, effective_bore_from_test, odd_needles
from fuelsys.flow.needle import needle_dp, needle_flow

pytestmark = pytest.mark.filterwarnings("ignore::fuelsys.errors.ValidityWarning")

RHO_W, MU_W = 998.21, 1.0016e-3


def test_recovers_known_bores_laminar_to_turbulent():
    bores = np.array([0.12, 0.2, 0.3, 0.45, 0.8, 1.5]) * 1e-3
    dp = np.array([[0.2e5], [1e5], [5e5]])
    L = 25e-3
    m = needle_flow(dp, bores, L, RHO_W, MU_W)
    got = effective_bore(m, dp, L, RHO_W, MU_W)
    assert np.max(np.abs(got / bores - 1)) < 1e-9
    re = 4 * m / (np.pi * bores * MU_W)
    assert re.min() < 100 and re.max() > 10000


def test_recovers_bore_with_other_entrance_and_cd():
    m = needle_flow(1e5, 0.33e-3, 30e-3, 800.0, 1.6e-3, entrance="reentrant", cd=0.95)
    got = effective_bore(m, 1e5, 30e-3, 800.0, 1.6e-3, entrance="reentrant", cd=0.95)
    assert got == pytest.approx(0.33e-3, rel=1e-9)


def test_from_collected_volume_with_kerosene():
    from fuelsys.fuels import get_fuel

    k = get_fuel("kerosene")
    T, dp, L, D = 293.15, 0.8e5, 25e-3, 0.28e-3
    rho, mu = k.density(T), k.dynamic_viscosity(T)
    t = 60.0
    volume = needle_flow(dp, D, L, rho, mu) * t / rho
    assert effective_bore_from_test(volume, t, dp, L, k, T) == pytest.approx(D, rel=1e-9)


def test_mass_flow_from_volume_and_time():
    # definition: m = rho V / t
    assert bench_mass_flow(50e-6, 60.0, RHO_W) == pytest.approx(RHO_W * 50e-6 / 60.0)


def test_pressure_falls_as_bore_grows_at_fixed_flow():
    # the property the bore solve rests on
    D = np.linspace(0.1e-3, 2e-3, 400)
    dp = needle_dp(5e-3 / 60, D, 25e-3, RHO_W, MU_W)
    assert np.all(np.diff(dp) < 0)


def test_flags_the_one_odd_needle_in_a_set():
    bores = np.array([0.300, 0.302, 0.298, 0.301, 0.270, 0.299, 0.300, 0.303]) * 1e-3
    t, dp, L = 60.0, 1e5, 25e-3
    volumes = needle_flow(dp, bores, L, RHO_W, MU_W) * t / RHO_W
    eff = effective_bore_from_test_water(volumes, t, dp, L)
    assert np.allclose(eff, bores, rtol=1e-9)
    dev, odd = odd_needles(volumes)
    assert odd.tolist() == [False, False, False, False, True, False, False, False]
    assert dev[4] < -0.2


def effective_bore_from_test_water(volumes, t, dp, L):
    m = bench_mass_flow(volumes, t, RHO_W)
    return effective_bore(m, dp, L, RHO_W, MU_W)


def test_odd_needles_threshold_and_errors():
    dev, odd = odd_needles([10.0, 10.4, 9.7, 10.0], threshold=0.02)
    assert odd.tolist() == [False, True, True, False]
    with pytest.raises(FuelsysInputError, match="at least two needles"):
        odd_needles([10.0])
    with pytest.raises(FuelsysInputError, match="threshold must be > 0"):
        odd_needles([10.0, 11.0], threshold=0.0)
    with pytest.raises(FuelsysInputError, match="flows must be > 0"):
        odd_needles([10.0, -1.0])


def test_bad_input():
    with pytest.raises(FuelsysInputError, match="dp must be > 0"):
        effective_bore(1e-4, 0.0, 25e-3, RHO_W, MU_W)
    with pytest.raises(FuelsysInputError, match="length must be > 0"):
        effective_bore(1e-4, 1e5, 0.0, RHO_W, MU_W)
    with pytest.raises(FuelsysInputError, match="above the model's limit"):
        effective_bore(1e-4, 50e5, 25e-3, RHO_W, MU_W)
    with pytest.raises(FuelsysInputError, match="time must be > 0"):
        bench_mass_flow(1e-6, 0.0, RHO_W)
