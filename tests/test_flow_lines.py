"""Fuel-line pressure drop against Hagen-Poiseuille and the fluids package (Churchill 1977, K method)."""

import math

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError
from fuelsys.flow import friction as fr
from fuelsys.flow.lines import line_dp, line_dp_fuel

fluids = pytest.importorskip("fluids")

RHO, MU = 800.0, 1.6e-3


def test_laminar_line_is_hagen_poiseuille_plus_k():
    # Hagen-Poiseuille (fluids.friction.friction_laminar) over the length, plus K velocity heads
    D, L, K = 4e-3, 2.0, 3.0
    m = 100e-3 / 60
    u = 4 * m / (RHO * math.pi * D * D)
    Re = RHO * u * D / MU
    assert Re < 1000
    f = fluids.friction.friction_laminar(Re)
    expect = fluids.core.dP_from_K(fluids.core.K_from_f(f, L, D) + K, RHO, u)
    assert line_dp(m, D, L, RHO, MU, k_total=K) == pytest.approx(expect, rel=1e-3)


def test_turbulent_line_against_fluids_churchill_and_k():
    # fluids.friction.Churchill_1977 with fluids.core.K_from_f / dP_from_K
    D, L, K = 3e-3, 1.5, 8.0
    m = 1500e-3 / 60
    u = 4 * m / (RHO * math.pi * D * D)
    Re = RHO * u * D / MU
    assert Re > 4000
    eD = fr.DRAWN_TUBING_ROUGHNESS / D
    f = fluids.friction.Churchill_1977(Re, eD)
    expect = fluids.core.dP_from_K(fluids.core.K_from_f(f, L, D) + K, RHO, u)
    assert line_dp(m, D, L, RHO, MU, k_total=K) == pytest.approx(expect, rel=1e-10)


def test_k_total_adds_velocity_heads():
    D, m = 3e-3, 200e-3 / 60
    u = 4 * m / (RHO * math.pi * D * D)
    d0 = line_dp(m, D, 1.0, RHO, MU)
    d5 = line_dp(m, D, 1.0, RHO, MU, k_total=5.0)
    assert d5 - d0 == pytest.approx(5.0 * 0.5 * RHO * u * u, rel=1e-10)


def test_arrays_and_fuel_wrapper():
    from fuelsys.fuels import get_fuel

    k = get_fuel("kerosene")
    flows = np.array([50.0, 100.0, 200.0]) * 1e-3 / 60
    out = line_dp_fuel(flows, 3e-3, 1.0, k, 288.15, k_total=2.0)
    assert out.shape == (3,) and np.all(np.diff(out) > 0)
    rho, mu = k.density(288.15), k.dynamic_viscosity(288.15)
    assert np.allclose(out, line_dp(flows, 3e-3, 1.0, rho, mu, k_total=2.0))


@pytest.mark.parametrize("kw, match", [
    (dict(k_total=-1.0), "k_total must be >= 0"),
    (dict(length=0.0), "length must be > 0"),
    (dict(bore=-3e-3), "bore must be > 0"),
    (dict(mdot=0.0), "flow must be > 0"),
])
def test_bad_input(kw, match):
    args = dict(mdot=1e-3, bore=3e-3, length=1.0, rho=RHO, mu=MU)
    args.update(kw)
    with pytest.raises(FuelsysInputError, match=match):
        line_dp(**args)
