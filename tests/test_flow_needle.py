"""Needle flow model: reference limits, loss coefficients, both directions, monotonicity, errors.

Water at 20 degC: density 998.21 kg/m3, viscosity 1.0016 mPa s (IAPWS-95 / IAPWS 2008 viscosity, as
given by CoolProp).  Kerosene comes from the project's fuel model (fuelsys.fuels.get_fuel).
"""

import math
import warnings

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.flow import fittings
from fuelsys.flow import friction as fr
from fuelsys.flow import needle as nd

RHO_W, MU_W = 998.21, 1.0016e-3      # water, 20 degC (IAPWS-95 via CoolProp)

# out-of-range flags are expected in some of these points; the flags themselves are tested below
pytestmark = pytest.mark.filterwarnings("ignore::fuelsys.errors.ValidityWarning")

fluids_fittings = pytest.importorskip("fluids.fittings")
fluids_friction = pytest.importorskip("fluids.friction")


@pytest.fixture(scope="module")
def kerosene():
    from fuelsys.fuels import get_fuel

    return get_fuel("kerosene")


def test_long_tube_low_reynolds_is_hagen_poiseuille():
    # Hagen-Poiseuille (fluids.friction.friction_laminar = 64/Re): dp = f (L/D) rho u^2/2 for a long tube
    D, L = 0.3e-3, 0.6                       # L/D = 2000
    Re = 10.0
    m = Re * math.pi * D * MU_W / 4
    u = 4 * m / (RHO_W * math.pi * D * D)
    hp = fluids_friction.friction_laminar(Re) * (L / D) * 0.5 * RHO_W * u * u
    assert nd.needle_dp(m, D, L, RHO_W, MU_W) == pytest.approx(hp, rel=0.01)
    assert nd.needle_flow(hp, D, L, RHO_W, MU_W) == pytest.approx(m, rel=0.01)


def test_turbulent_long_tube_matches_colebrook_and_crane_k():
    # fluids.friction.Colebrook over the length plus Crane TP-410 K: 0.5 (flush entrance) + 1.0 (exit)
    D, L, e = 1.0e-3, 0.3, fr.DRAWN_TUBING_ROUGHNESS
    m = 3e4 * math.pi * D * MU_W / 4                   # Re = 30 000
    u = 4 * m / (RHO_W * math.pi * D * D)
    f = fluids_friction.Colebrook(3e4, e / D)
    expect = 0.5 * RHO_W * u * u * (0.5 + 1.0 + f * L / D)
    got = nd.needle_dp(m, D, L, RHO_W, MU_W, turbulent="colebrook_1939", p_max=1e7)
    assert got == pytest.approx(expect, rel=2e-3)
    # the default Churchill branch is within its 1.5 % of Colebrook
    assert nd.needle_dp(m, D, L, RHO_W, MU_W, p_max=1e7) == pytest.approx(expect, rel=0.015)


def test_entrance_coefficients_against_crane_and_idelchik_in_fluids():
    # fluids.fittings: Crane TP-410 and Idelchik values
    assert fittings.entrance_k("square") == fluids_fittings.entrance_sharp(method="Crane")
    assert fittings.entrance_k("square") == fluids_fittings.entrance_sharp(method="Idelchik")
    assert fittings.entrance_k("reentrant") == fluids_fittings.entrance_distance(1.0, 0.01, method="Crane")
    assert fittings.entrance_k("borda") == pytest.approx(
        fluids_fittings.entrance_distance(1.0, 0.0, l=1.0, method="Idelchik"), abs=1e-9)
    assert fittings.entrance_k("rounded") == fluids_fittings.entrance_rounded(1.0, 0.15, method="Crane")
    for r in (0.0, 0.02, 0.04, 0.06, 0.10, 0.15, 0.3):
        assert fittings.entrance_rounded_crane(r) == pytest.approx(
            fluids_fittings.entrance_rounded(1.0, r, method="Crane"), abs=1e-12)
    assert fittings.EXIT_K == fluids_fittings.exit_normal()
    # Idelchik diagram 3-1 via fluids: a protruding end with a wall 15 % of the bore (hypodermic tubing)
    # loses as much as a flush square entrance
    assert fittings.entrance_k("square") == pytest.approx(
        fluids_fittings.entrance_distance(1.0, 0.15, l=1.0, method="Idelchik"), abs=1e-9)
    assert fittings.entrance_k(0.3) == 0.3


def test_entrance_geometry_orders_the_pressure_drop():
    # Crane TP-410: rounded < square < reentrant < Borda
    m, D, L = 20e-3 / 60, 0.4e-3, 20e-3
    dps = [nd.needle_dp(m, D, L, RHO_W, MU_W, entrance=e) for e in ("rounded", "square", "reentrant", "borda")]
    assert dps == sorted(dps) and len(set(dps)) == 4


def test_round_trip_from_laminar_to_turbulent():
    # dp(flow(dp)) = dp within 1e-6 relative over a grid spanning Re ~ 1 to > 1e4 (both fluids)
    dp = np.geomspace(1e2, 20e5, 25)[:, None, None]
    D = np.array([0.15e-3, 0.4e-3, 1.0e-3, 2.0e-3])[None, :, None]
    L = np.array([3e-3, 20e-3, 80e-3])[None, None, :]
    for rho, mu in ((RHO_W, MU_W), (800.0, 1.6e-3)):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            m = nd.needle_flow(dp, D, L, rho, mu)
            back = nd.needle_dp(m, D, L, rho, mu)
            m2 = nd.needle_flow(back, D, L, rho, mu)
        Re = nd.needle_reynolds(m, D, mu)
        assert Re.min() < 5 and Re.max() > 2e4
        assert np.max(np.abs(back / dp - 1)) < 1e-6
        assert np.max(np.abs(m2 / m - 1)) < 1e-6


def test_large_arrays_match_point_by_point():
    # blocks of 16384 points give the same answer as single-point calls
    rng = np.random.default_rng(7)
    n = 40000
    dp = np.exp(rng.uniform(np.log(1e3), np.log(1e6), n))
    D = rng.uniform(0.2e-3, 1.5e-3, n)
    L = rng.uniform(5e-3, 60e-3, n)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        m = nd.needle_flow(dp, D, L, 800.0, 1.6e-3)
        for i in (0, 16383, 16384, 39999):
            assert m[i] == pytest.approx(nd.needle_flow(dp[i], D[i], L[i], 800.0, 1.6e-3), rel=1e-12)


def test_flow_increases_with_dp_and_bore():
    dp = np.geomspace(1e3, 20e5, 200)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        m = nd.needle_flow(dp, 0.4e-3, 30e-3, 800.0, 1.6e-3)
        assert np.all(np.diff(m) > 0)
        bores = np.linspace(0.1e-3, 2e-3, 100)
        mb = nd.needle_flow(2e5, bores, 30e-3, 800.0, 1.6e-3)
        assert np.all(np.diff(mb) > 0)


def test_flow_increases_with_temperature_for_kerosene(kerosene):
    # kerosene gets thinner and lighter when warm: at a fixed dp the mass flow rises (low-Re needle)
    T = np.linspace(253.15, 333.15, 9)
    m = nd.needle_flow_fuel(1e5, 0.25e-3, 30e-3, kerosene, T)
    assert np.all(np.diff(m) > 0)


def test_oil_lowers_flow_at_low_reynolds_number(kerosene):
    # turbine oil raises the blend's viscosity: in a friction-dominated needle the flow falls
    from fuelsys.fuels import get_fuel

    blend = get_fuel("kerosene", oil_pct=5.0)
    T = 288.15
    m0 = nd.needle_flow_fuel(0.5e5, 0.2e-3, 40e-3, kerosene, T)
    m5 = nd.needle_flow_fuel(0.5e5, 0.2e-3, 40e-3, blend, T)
    assert nd.needle_reynolds(m0, 0.2e-3, kerosene.dynamic_viscosity(T)) < 200
    assert m5 < m0 * 0.97
    # and it is a viscosity effect: the drop is close to the kinematic-viscosity ratio (laminar, q ~ 1/nu)
    ratio = kerosene.kinematic_viscosity(T) / blend.kinematic_viscosity(T)
    assert (m5 / blend.density(T)) / (m0 / kerosene.density(T)) == pytest.approx(ratio, rel=0.03)


def test_loss_breakdown_by_regime():
    # long laminar needle: friction dominates; short needle at high Re: entrance + exit dominate
    t = nd.needle_losses(5e-3 / 60, 0.25e-3, 40e-3, 800.0, 1.6e-3)
    assert t["length"] > 10 * (t["entrance"] + t["exit"])
    assert t["total"] == pytest.approx(nd.needle_dp(5e-3 / 60, 0.25e-3, 40e-3, 800.0, 1.6e-3), rel=1e-12)
    t = nd.needle_losses(200e-3 / 60, 1.0e-3, 3e-3, RHO_W, MU_W)
    assert t["entrance"] + t["exit"] > 2 * t["length"]


def test_discharge_coefficient_scales_flow():
    m1 = nd.needle_flow(1e5, 0.3e-3, 25e-3, 800.0, 1.6e-3)
    m9 = nd.needle_flow(1e5, 0.3e-3, 25e-3, 800.0, 1.6e-3, cd=0.9)
    assert m9 == pytest.approx(0.9 * m1, rel=1e-12)
    assert nd.needle_dp(m9, 0.3e-3, 25e-3, 800.0, 1.6e-3, cd=0.9) == pytest.approx(1e5, rel=1e-9)


def test_scalars_give_floats_and_shapes_broadcast():
    m = nd.needle_flow(1e5, 0.3e-3, 25e-3, 800.0, 1.6e-3)
    assert type(m) is float
    out = nd.needle_flow(np.array([[1e5], [2e5]]), np.array([0.3e-3, 0.4e-3, 0.5e-3]), 25e-3, 800.0, 1.6e-3)
    assert out.shape == (2, 3)
    assert type(nd.needle_dp(m, 0.3e-3, 25e-3, 800.0, 1.6e-3)) is float


def test_reynolds_and_velocity_definitions():
    m, D = 1e-4, 0.4e-3
    assert nd.needle_reynolds(m, D, 1.6e-3) == pytest.approx(4 * m / (math.pi * D * 1.6e-3))
    assert nd.needle_velocity(m, D, 800.0) == pytest.approx(m / 800.0 / (math.pi * D * D / 4))


def test_validity_flag_where_it_matters():
    # a short needle at Re ~ 1000: the (turbulent-data) entrance coefficient is a large share -> flagged
    with pytest.warns(ValidityWarning, match="entrance loss coefficient"):
        nd.needle_dp(30e-3 / 60, 0.5e-3, 5e-3, 800.0, 1.6e-3)
    # a long laminar needle: nothing to flag
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        nd.needle_dp(2e-3 / 60, 0.25e-3, 40e-3, 800.0, 1.6e-3)


@pytest.mark.parametrize("call, match", [
    (lambda: nd.needle_flow(0.0, 0.3e-3, 25e-3, 800.0, 1.6e-3), "dp must be > 0"),
    (lambda: nd.needle_flow(-1e4, 0.3e-3, 25e-3, 800.0, 1.6e-3), "dp must be > 0"),
    (lambda: nd.needle_flow(25e5, 0.3e-3, 25e-3, 800.0, 1.6e-3), "above the model's limit of 20 bar"),
    (lambda: nd.needle_flow(1e5, 0.3e-3, 0.0, 800.0, 1.6e-3), "length must be > 0"),
    (lambda: nd.needle_flow(1e5, 0.3e-3, -5e-3, 800.0, 1.6e-3), r"length must be > 0 \(got -5 mm\)"),
    (lambda: nd.needle_flow(1e5, -0.3e-3, 25e-3, 800.0, 1.6e-3), r"bore must be > 0 \(got -0.3 mm\)"),
    (lambda: nd.needle_flow(1e5, 0.3e-3, 25e-3, 800.0, 1.6e-3, entrance="bellmouth"), "valid: square"),
    (lambda: nd.needle_flow(1e5, 0.3e-3, 25e-3, 800.0, 1.6e-3, turbulent="blasius"), "valid: churchill"),
    (lambda: nd.needle_dp(0.0, 0.3e-3, 25e-3, 800.0, 1.6e-3), "flow must be > 0"),
    (lambda: nd.needle_dp(3.0, 0.3e-3, 25e-3, 800.0, 1.6e-3, p_max=math.inf), "speed of sound"),
    (lambda: nd.needle_dp(100e-3 / 60, 0.2e-3, 25e-3, 800.0, 1.6e-3), "above the model's limit of 20 bar"),
])
def test_bad_input_gives_clear_errors(call, match):
    with pytest.raises(FuelsysInputError, match=match):
        call()


def test_fuel_wrapper_uses_the_fuel_properties(kerosene):
    T = 293.15
    rho, mu = kerosene.density(T), kerosene.dynamic_viscosity(T)
    assert nd.needle_flow_fuel(1e5, 0.3e-3, 25e-3, kerosene, T) == pytest.approx(
        nd.needle_flow(1e5, 0.3e-3, 25e-3, rho, mu), rel=1e-12)
    m = nd.needle_flow(1e5, 0.3e-3, 25e-3, rho, mu)
    assert nd.needle_dp_fuel(m, 0.3e-3, 25e-3, kerosene, T) == pytest.approx(1e5, rel=1e-9)
    with pytest.raises(FuelsysInputError, match="outside"):
        nd.needle_flow_fuel(1e5, 0.3e-3, 25e-3, kerosene, 100.0)


@pytest.mark.parametrize("turbulent", list(fr.TURBULENT_METHODS))
def test_round_trip_over_an_extreme_range(turbulent):
    # robustness of the bracketed solve far outside the needle range: bores 20 um..20 mm, L/D 0.05..1e5,
    # viscosities 1e-5..1 Pa s, rough walls up to e/D of tens (flagged, still finite), custom K
    rng = np.random.default_rng(9)
    n = 50000
    D = np.exp(rng.uniform(np.log(2e-5), np.log(2e-2), n))
    L = D * np.exp(rng.uniform(np.log(0.05), np.log(1e5), n))
    dp = np.exp(rng.uniform(np.log(1.0), np.log(50e5), n))
    rho = rng.uniform(500, 1500, n)
    mu = np.exp(rng.uniform(np.log(1e-5), np.log(1.0), n))
    K = rng.uniform(0, 3, n)
    e = np.where(rng.random(n) < 0.5, 0.0, np.exp(rng.uniform(np.log(1e-8), np.log(1e-3), n)))
    opts = dict(entrance=K, roughness=e, turbulent=turbulent, p_max=math.inf)
    m = nd.needle_flow(dp, D, L, rho, mu, **opts)
    assert np.all(np.isfinite(m)) and np.all(m > 0)
    back = nd.needle_dp(m, D, L, rho, mu, **opts)
    assert np.max(np.abs(back / dp - 1)) < 1e-9
