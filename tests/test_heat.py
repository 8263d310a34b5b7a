"""Heat-transfer correlations of fuelsys.heat against reference libraries and closed forms."""

import math
import warnings

import numpy as np
import pytest

from fuelsys import heat
from fuelsys.errors import FuelsysInputError, ValidityWarning

ht = pytest.importorskip("ht")
fluids = pytest.importorskip("fluids")


# -- internal convection against the ht package ------------------------------

@pytest.mark.parametrize("Re,Pr,fd", [(1e4, 0.7, 0.031), (1e5, 1.2, 0.0185), (5e4, 0.72, 0.021), (3e5, 5.0, 0.0144)])
def test_gnielinski_matches_ht(Re, Pr, fd):
    # reference: ht.conv_internal.turbulent_Gnielinski (Gnielinski 1976 as in Rohsenow et al. 1998)
    ref = ht.conv_internal.turbulent_Gnielinski(Re=Re, Pr=Pr, fd=fd)
    assert heat.gnielinski_1976(Re, Pr, fd) == pytest.approx(ref, rel=1e-12)


def test_gnielinski_published_example():
    # ht docstring example: turbulent_Gnielinski(Re=1E5, Pr=1.2, fd=0.0185) = 254.6268 (ht 1.2 documentation)
    assert heat.gnielinski_1976(1e5, 1.2, 0.0185) == pytest.approx(254.62682749359632, rel=1e-9)


@pytest.mark.parametrize("Re,Pr,L,d", [(500.0, 0.7, 0.1, 0.005), (2000.0, 0.72, 0.3, 0.006), (100.0, 5.0, 1.0, 0.01),
                                       (1e5, 1.1, 5.0, 0.5)])
def test_laminar_entry_matches_ht(Re, Pr, L, d):
    # reference: ht.conv_internal.laminar_entry_thermal_Hausen (Hausen 1943, Incropera 6th ed. eq. 8.57)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        assert heat.hausen_1943(Re, Pr, L, d) == pytest.approx(
            ht.conv_internal.laminar_entry_thermal_Hausen(Re=Re, Pr=Pr, L=L, Di=d), rel=1e-12)
        # reference: ht.conv_internal.laminar_entry_Baehr_Stephan (Stephan 1959 in Baehr & Stephan)
        assert heat.stephan_1959(Re, Pr, L, d) == pytest.approx(
            ht.conv_internal.laminar_entry_Baehr_Stephan(Re=Re, Pr=Pr, L=L, Di=d), rel=1e-12)


def test_fully_developed_laminar_numbers():
    # Incropera & DeWitt 6th ed. Table 8.1: Nu_D = 3.66 (uniform T_s), 4.36 (uniform q_s");
    # ht.conv_internal.laminar_T_const / laminar_Q_const give the same numbers
    assert heat.NU_LAMINAR_T == pytest.approx(3.66, abs=0.005)
    assert heat.NU_LAMINAR_T == pytest.approx(ht.conv_internal.laminar_T_const(), abs=0.005)
    assert heat.NU_LAMINAR_Q == pytest.approx(4.36, abs=0.005)
    assert heat.NU_LAMINAR_Q == pytest.approx(ht.conv_internal.laminar_Q_const(), rel=1e-12)


def test_entry_correlations_tend_to_3_66_for_long_tubes():
    # Incropera & DeWitt 6th ed. Table 8.1 (3.66) as the length grows without limit
    for fn in (heat.hausen_1943, heat.stephan_1959):
        assert fn(100.0, 0.7, 1e4, 0.005) == pytest.approx(3.66, abs=0.01)
    assert heat.nusselt_tube_mean(1000.0, 0.7, 1e4, 0.005) == pytest.approx(3.66, abs=0.01)


def test_dispatcher_regimes_and_blend():
    # laminar and turbulent ends equal the single correlations (definitions, Gnielinski 1995 interpolation)
    d, L, Pr = 0.005, 0.15, 0.7
    assert heat.nusselt_tube_mean(1500.0, Pr, L, d) == pytest.approx(heat.stephan_1959(1500.0, Pr, L, d), rel=1e-12)
    assert heat.nusselt_tube_mean(1500.0, Pr, L, d, laminar="hausen") == pytest.approx(
        heat.hausen_1943(1500.0, Pr, L, d), rel=1e-12)
    turb = heat.gnielinski_1976(3e4, Pr) * heat.gnielinski_entry_factor(d, L)
    assert heat.nusselt_tube_mean(3e4, Pr, L, d) == pytest.approx(turb, rel=1e-12)
    # continuous at both ends of the transition, and the midpoint is the mean of the two ends
    lo = heat.stephan_1959(2300.0, Pr, L, d)
    hi = heat.gnielinski_1976(1e4, Pr) * heat.gnielinski_entry_factor(d, L)
    assert heat.nusselt_tube_mean(2300.0 * (1 + 1e-9), Pr, L, d) == pytest.approx(lo, rel=1e-6)
    assert heat.nusselt_tube_mean(1e4 * (1 - 1e-9), Pr, L, d) == pytest.approx(hi, rel=1e-6)
    assert heat.nusselt_tube_mean(6150.0, Pr, L, d) == pytest.approx(0.5 * (lo + hi), rel=1e-12)
    with pytest.raises(FuelsysInputError, match="laminar method"):
        heat.nusselt_tube_mean(1500.0, Pr, L, d, laminar="nope")


@pytest.mark.parametrize("Re", [800.0, 5000.0, 4e4])
def test_segments_add_up_to_the_length_mean(Re):
    # definition of the length-mean coefficient (Incropera & DeWitt 6th ed. eq. 8.40): sum of h_i dx_i = h_mean L
    d, L, Pr, n = 0.006, 0.2, 0.7, 37
    x = np.linspace(0.0, L, n + 1)
    seg = heat.nusselt_tube_segment(Re, Pr, x[:-1], x[1:], d)
    assert np.sum(seg * np.diff(x)) == pytest.approx(L * heat.nusselt_tube_mean(Re, Pr, L, d), rel=1e-12)
    assert np.all(np.diff(seg) < 0)  # local coefficient falls along the entry region (Incropera Fig. 8.10)


def test_property_ratio_factor():
    # VDI Heat Atlas 2nd ed. G1: gases heated, (T_b/T_w)^0.45; no correction on cooling
    assert heat.gas_property_ratio_factor(400.0, 800.0) == pytest.approx(0.5 ** 0.45, rel=1e-12)
    assert heat.gas_property_ratio_factor(800.0, 400.0) == 1.0
    with pytest.warns(ValidityWarning):
        heat.gas_property_ratio_factor(300.0, 1200.0)


# -- friction ------------------------------------------------------------------

@pytest.mark.parametrize("Re", [1e4, 3e4, 1e5, 1e6])
def test_filonenko_close_to_colebrook(Re):
    # reference: fluids.friction.Colebrook for a smooth tube; Petukhov's form agrees within about 2 %
    # over 1e4..1e6 (Incropera & DeWitt 6th ed. section 8.4, comment on eq. 8.21)
    assert heat.filonenko_1954(Re) == pytest.approx(fluids.friction.Colebrook(Re, 0.0), rel=0.025)


def test_friction_all_regimes():
    # Hagen-Poiseuille 64/Re (Incropera 6th ed. eq. 8.19); turbulent end = Filonenko
    assert heat.darcy_friction_smooth(1000.0) == pytest.approx(0.064, rel=1e-12)
    assert heat.darcy_friction_smooth(1e5) == pytest.approx(heat.filonenko_1954(1e5), rel=1e-12)
    f = heat.darcy_friction_smooth(np.array([2300.0, 6150.0, 1e4]))
    assert f[1] == pytest.approx(0.5 * (f[0] + f[2]), rel=1e-12)
    with pytest.raises(FuelsysInputError, match="Reynolds number must be"):
        heat.darcy_friction_smooth(-1.0)


# -- air transport -------------------------------------------------------------

@pytest.mark.parametrize("T,tol", [(300.0, 0.01), (450.0, 0.015), (600.0, 0.02), (800.0, 0.03), (1000.0, 0.04)])
def test_sutherland_air_against_coolprop(T, tol):
    CP = pytest.importorskip("CoolProp.CoolProp")
    # reference: CoolProp 8 air (Lemmon & Jacobsen 2004 transport) at 3 bar; White (2006) quotes +-2 %,
    # but against this reference the simple law drifts low with temperature: tolerance per row
    mu = CP.PropsSI("V", "T", T, "P", 3e5, "Air")
    k = CP.PropsSI("L", "T", T, "P", 3e5, "Air")
    assert heat.sutherland_viscosity_air(T) == pytest.approx(mu, rel=tol)
    assert heat.sutherland_conductivity_air(T) == pytest.approx(k, rel=tol)


def test_sutherland_reference_point():
    # White, Viscous Fluid Flow 3rd ed. Tables 1-2/1-3: mu0 = 1.716e-5 Pa s and k0 = 0.0241 W/(m K) at 273 K
    assert heat.sutherland_viscosity_air(273.0) == pytest.approx(1.716e-5, rel=1e-12)
    assert heat.sutherland_conductivity_air(273.0) == pytest.approx(0.0241, rel=1e-12)
    assert isinstance(heat.sutherland_viscosity_air(300.0), float)
    assert heat.sutherland_viscosity_air(np.array([300.0, 400.0])).shape == (2,)


# -- radiation -------------------------------------------------------------------

def test_lefebvre_radiation_closed_form():
    # Lefebvre & Ballal, Gas Turbine Combustion 3rd ed. ch. 9: 0.5 sigma (1+e_w) e_g T_g^1.5 (T_g^2.5 - T_w^2.5)
    tg, tw, eg, ew = 1700.0, 950.0, 0.25, 0.8
    sigma = 5.670374419e-8  # CODATA 2018
    expect = 0.5 * sigma * (1 + ew) * eg * tg ** 1.5 * (tg ** 2.5 - tw ** 2.5)
    assert heat.lefebvre_flame_radiation(tg, tw, eg, ew) == pytest.approx(expect, rel=1e-12)
    assert heat.lefebvre_flame_radiation(tg, tg, eg, ew) == 0.0
    with pytest.raises(FuelsysInputError, match="emissivity"):
        heat.lefebvre_flame_radiation(tg, tw, 1.5)


# -- droplets ----------------------------------------------------------------------

def test_d2_law_closed_form():
    # Turns, An Introduction to Combustion 3rd ed. eqs. 3.57, 3.59, 3.60:
    # B = cp (T_inf - T_boil)/h_fg, K = 8 k ln(1+B)/(rho_l cp), t_d = D0^2/K
    cp, k, rho, hfg = 2850.0, 0.0474, 659.0, 335e3  # n-hexane film values of Turns Example 3.3 (from memory)
    B = heat.spalding_transfer_number(cp, 1000.0, 342.0, hfg)
    assert B == pytest.approx(cp * (1000.0 - 342.0) / hfg, rel=1e-12)
    K = heat.d2_evaporation_constant(k, cp, rho, B)
    assert K == pytest.approx(8 * k * math.log(1 + B) / (rho * cp), rel=1e-12)
    t = heat.d2_lifetime(500e-6, K)
    assert t == pytest.approx((500e-6) ** 2 / K, rel=1e-12)
    # Turns Example 3.3 gives a lifetime of about 0.67 s for a 500 um n-hexane drop at 1000 K (from memory)
    assert t == pytest.approx(0.67, rel=0.05)
    assert heat.d2_lifetime(100e-6, 0.0) == math.inf


def test_mass_transfer_number_and_drop_sizes():
    # Lefebvre & McDonell, Atomization and Sprays 2nd ed. ch. 8: B_M = (Y_s - Y_inf)/(1 - Y_s)
    assert heat.mass_transfer_number(0.6, 0.2) == pytest.approx(1.0, rel=1e-12)
    # Rayleigh (1878): D = 1.89 d_jet
    assert heat.rayleigh_drop_diameter(0.25e-3) == pytest.approx(1.89 * 0.25e-3, rel=1e-12)
    # Hinze (1955): We_crit = rho U^2 D / sigma = 12
    D = heat.weber_limited_diameter(0.025, 2.0, 40.0)
    assert 2.0 * 40.0 ** 2 * D / 0.025 == pytest.approx(12.0, rel=1e-12)
    with pytest.raises(FuelsysInputError, match="drop diameter must be"):
        heat.d2_lifetime(-1.0, 1e-7)
