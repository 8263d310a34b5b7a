"""Friction factors: Hagen-Poiseuille, Shah (1978) developing flow, Churchill (1977), Colebrook (1939).

References used below: fluids (PyPI, Caleb Bell) friction functions; Shah (1978) J. Fluids Eng. 100:177
and Shah & London (1978) for the correlation's published constants; an independent numerical solution of
the laminar boundary-layer equations of the entrance region (the marching method of Bodoia & Osterle 1961 /
Hornbeck 1964, written out in this file); the Moody (1944) chart.
"""

import warnings

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.flow import friction as fr

fluids_friction = pytest.importorskip("fluids.friction")


def test_hagen_poiseuille_against_fluids():
    # fluids.friction.friction_laminar: 64/Re
    for Re in (1.0, 10.0, 500.0, 2000.0):
        assert fr.hagen_poiseuille(Re) == pytest.approx(fluids_friction.friction_laminar(Re), rel=1e-14)


def test_shah_1978_limits_are_the_published_constants():
    # Shah (1978): near the inlet f_app Re -> 3.44/sqrt(x+); far downstream f_app Re -> 16 + K(inf)/(4 x+)
    # with K(inf) = 1.25 (Shah & London 1978, circular duct).
    x = 1e-7
    assert fr.shah_1978(x) == pytest.approx(3.44 / np.sqrt(x), rel=1e-3)
    for x in (2.0, 10.0, 100.0):
        assert fr.shah_1978(x) == pytest.approx(16.0 + 1.25 / (4.0 * x), rel=1e-4)
    # incremental pressure drop number from the correlation: K = 4 x+ (f_app Re - 16) -> 1.25
    x = 50.0
    assert 4 * x * (fr.shah_1978(x) - 16.0) == pytest.approx(1.25, rel=1e-3)


def _entrance_region_solution(x_out, n=200, steps=3000, x0=1e-8, x1=0.3):
    """f_app Re (Fanning) of laminar flow developing from a flat profile in a round tube.

    Independent check: the boundary-layer equations in x+ = x/(D Re), r/D, solved by an implicit
    linearised marching scheme with the pressure gradient fixed by the mass balance at each step
    (Bodoia & Osterle 1961; Hornbeck 1964).  Wall-clustered radial grid, geometric axial steps.
    """
    from scipy.linalg import solve_banded

    t = np.linspace(0.0, 1.0, n + 1)
    eta = 0.5 * (1.0 - (1.0 - t) ** 2)            # r/D from axis (0) to wall (0.5)
    ef = 0.5 * (eta[1:] + eta[:-1])                # control-volume faces
    w = np.empty(n)                                # CV weights (eta d eta), nodes 0..n-1 (n = wall)
    w[0] = ef[0] ** 2 / 2
    w[1:] = (ef[1:n] ** 2 - ef[:n - 1] ** 2) / 2
    cup = ef / (eta[1:] - eta[:-1])
    dd = np.ones(n)
    dd[1:] = eta[2:n + 1] - eta[:n - 1]
    u = np.full(n, 0.125 / w.sum())                # flat inlet profile of mean velocity 1
    V = np.zeros(n)
    xs = np.concatenate([[0.0], np.geomspace(x0, x1, steps)])
    P, out, targets = 0.0, {}, sorted(x_out)
    for k in range(1, xs.size):
        dx = xs[k] - xs[k - 1]
        cv = V / dd
        cv[0] = 0.0
        ab = np.zeros((3, n))
        ab[1] = u / dx + (cup[:n] + np.concatenate([[0.0], cup[:n - 1]])) / w
        ab[0, 1:] = -cup[:n - 1] / w[:n - 1] + cv[:n - 1]
        ab[2, :-1] = -cup[:n - 1] / w[1:] - cv[1:]
        sol = solve_banded((1, 1), ab, np.stack([u * u / dx, np.ones(n)], axis=1))
        G = (0.125 - w @ sol[:, 0]) / (w @ sol[:, 1])
        un = sol[:, 0] + G * sol[:, 1]
        flux = np.cumsum(w * (un - u) / dx)
        V = np.zeros(n)
        V[1:] = -flux[:-1] / eta[1:n]
        u = un
        P += G * dx
        while targets and xs[k] >= targets[0] * (1 - 1e-12):
            x = targets.pop(0)
            out[x] = P / (2.0 * x)
    return out


def test_shah_1978_against_a_numerical_entrance_region_solution():
    # Shah (1978) fitted his correlation to numerical entrance-region solutions of this kind and states
    # an accuracy of a few per cent (from memory); here it agrees within 2.5 % from x+ = 1e-4 to 0.3.
    xs = [1e-4, 1e-3, 1e-2, 3e-2, 0.1, 0.3]
    num = _entrance_region_solution(xs)
    for x in xs:
        assert fr.shah_1978(x) == pytest.approx(num[x], rel=0.025), x
    # the numerical solution's own incremental pressure drop number matches K(inf) = 1.25 (Shah & London)
    assert 4 * 0.3 * (num[0.3] - 16.0) == pytest.approx(1.25, rel=0.03)


def test_shah_darcy_long_tube_tends_to_hagen_poiseuille():
    # Hagen-Poiseuille: a long tube's apparent friction -> 64/Re (plus 1.25 D/L velocity heads)
    Re, lam = 100.0, 1e5
    assert fr.shah_1978_darcy(Re, lam) == pytest.approx(64.0 / Re + 1.25 / lam, rel=1e-4)


def test_churchill_1977_against_fluids():
    # fluids.friction.Churchill_1977: same published equation, all regimes
    for Re in (1.0, 300.0, 2500.0, 3500.0, 1e4, 1e6, 1e8):
        for eD in (0.0, 1e-5, 1e-3, 0.05):
            assert fr.churchill_1977(Re, eD) == pytest.approx(fluids_friction.Churchill_1977(Re, eD), rel=1e-12)


def test_colebrook_1939_against_fluids():
    # fluids.friction.Colebrook (exact Lambert-W solution of the same equation)
    for Re in (4000.0, 1e4, 1e5, 1e6, 1e8):
        for eD in (0.0, 1e-6, 1e-4, 1e-2, 0.05):
            assert fr.colebrook_1939(Re, eD) == pytest.approx(fluids_friction.Colebrook(Re, eD), rel=1e-12)


@pytest.mark.parametrize("Re, eD, f_chart", [
    (1e5, 0.0, 0.018),      # Moody (1944) chart, smooth pipes (from memory)
    (1e6, 0.0, 0.0116),     # Moody chart, smooth (from memory)
    (1e6, 1e-3, 0.0199),    # Moody chart, e/D = 0.001 (from memory)
    (1e7, 1e-2, 0.038),     # Moody chart, fully rough e/D = 0.01 (from memory)
])
def test_turbulent_friction_against_the_moody_chart(Re, eD, f_chart):
    assert fr.colebrook_1939(Re, eD) == pytest.approx(f_chart, rel=0.03)
    assert fr.friction_turbulent(Re, eD) == pytest.approx(f_chart, rel=0.03)


def test_churchill_close_to_colebrook_in_turbulent_flow():
    # Churchill (1977) reproduces Colebrook within 1-2 % in developed turbulence (from memory);
    # near Re 4000 its transition term adds up to about 3 %.
    Re = np.geomspace(1e4, 1e8, 60)
    for eD in (0.0, 1e-5, 1e-3):
        assert np.max(np.abs(fr.churchill_1977(Re, eD) / fr.colebrook_1939(Re, eD) - 1)) < 0.016
    Re = np.geomspace(4000, 1e8, 60)
    for eD in (0.0, 1e-3, 1e-2):
        assert np.max(np.abs(fr.churchill_1977(Re, eD) / fr.colebrook_1939(Re, eD) - 1)) < 0.035


def test_blend_with_colebrook_branch_is_colebrook_when_turbulent():
    # fluids.friction.Colebrook: the blend's turbulent branch dominates completely at Re 1e5
    for eD in (0.0, 1e-4, 1e-2):
        got = fr.friction_fully_developed(1e5, eD, turbulent="colebrook_1939")
        assert got == pytest.approx(fluids_friction.Colebrook(1e5, eD), rel=1e-6)
        long = fr.apparent_friction(1e5, 1e6, eD, turbulent="colebrook_1939")
        assert long == pytest.approx(fluids_friction.Colebrook(1e5, eD), rel=1e-5)


def test_blend_is_laminar_below_transition():
    # Hagen-Poiseuille below Re 2000: the turbulent branch is switched off by Churchill's B term
    for Re in (10.0, 500.0, 1500.0):
        for turb in fr.TURBULENT_METHODS:
            assert fr.friction_fully_developed(Re, 0.0, turb) == pytest.approx(64.0 / Re, rel=2e-3)


def test_dp_grows_strictly_with_flow_in_every_regime():
    # needed for a unique, always-converging inverse: f Re^2 strictly increasing (Churchill 1977 form)
    Re = np.geomspace(1e-3, 1e8, 4000)
    for lam in (0.5, 5.0, 50.0, 500.0, 1e5):
        for eD in (0.0, 1e-3, 0.05):
            for turb in fr.TURBULENT_METHODS:
                f = fr.apparent_friction(Re, lam, eD, turb)
                assert np.all(np.diff(f * Re * Re) > 0)
                # and the transition is smooth: no jump between neighbouring points of the grid
                assert np.max(np.abs(np.diff(np.log(f)))) < 0.03


def test_analytic_slope_matches_finite_difference():
    # internal: d ln f / d ln Re used by the Newton solver, against a central difference
    rng = np.random.default_rng(3)
    Re = np.exp(rng.uniform(np.log(1.0), np.log(1e7), 2000))
    lam = np.exp(rng.uniform(np.log(1.0), np.log(1e4), 2000))
    eD = rng.uniform(0.0, 0.01, 2000)
    for name in fr.TURBULENT_METHODS:
        turb = fr._turbulent_method(name)
        h = 1e-6
        f, s = fr._apparent(Re, lam, eD, turb)
        fp, _ = fr._apparent(Re * np.exp(h), lam, eD, turb)
        fm, _ = fr._apparent(Re * np.exp(-h), lam, eD, turb)
        num = (np.log(fp) - np.log(fm)) / (2 * h)
        assert np.max(np.abs(num - s)) < 1e-5


def test_validity_is_flagged():
    with pytest.warns(ValidityWarning, match="Colebrook"):
        fr.colebrook_1939(1000.0)
    with pytest.warns(ValidityWarning, match="relative roughness"):
        fr.churchill_1977(1e5, 0.2)
    with pytest.warns(ValidityWarning, match="Hagen-Poiseuille"):
        fr.hagen_poiseuille(5000.0)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        fr.churchill_1977(1e5, 1e-3)


def test_drawn_tubing_roughness():
    # Moody (1944): drawn tubing 0.000005 ft
    assert fr.DRAWN_TUBING_ROUGHNESS == pytest.approx(0.000005 * 0.3048, rel=0.02)


def test_bad_input():
    with pytest.raises(FuelsysInputError, match="Reynolds number must be"):
        fr.churchill_1977(-5.0)
    with pytest.raises(FuelsysInputError, match="relative roughness must be >= 0"):
        fr.churchill_1977(1e4, -1e-3)
    with pytest.raises(FuelsysInputError, match="valid: churchill_1977, colebrook_1939"):
        fr.friction_turbulent(1e4, 0.0, "haaland")


def test_scalars_give_floats_and_arrays_keep_shape():
    assert type(fr.churchill_1977(1e4)) is float
    assert type(fr.apparent_friction(100.0, 50.0)) is float
    out = fr.apparent_friction(np.full((2, 3), 100.0), np.array([10.0, 50.0, 100.0]))
    assert out.shape == (2, 3)
