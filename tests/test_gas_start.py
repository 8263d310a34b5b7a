"""Gas start: canister pressure, jet flow, canister chill (fuelsys.gas_start)."""

import numpy as np
import pytest

CP = pytest.importorskip("CoolProp.CoolProp")

from fuelsys import gas_start as G  # noqa: E402
from fuelsys.errors import FuelsysInputError  # noqa: E402


def test_critical_pressure_ratio_closed_form():
    # Anderson, Modern Compressible Flow 3rd ed., Table A.1 at M = 1: p/p0 = 0.5283 for γ = 1.4
    assert G.critical_pressure_ratio(1.4) == pytest.approx(0.5283, abs=1e-4)
    # (2/(γ+1))^(γ/(γ-1)) for γ = 1.13 (propane-like), eq. (5.21)
    assert G.critical_pressure_ratio(1.13) == pytest.approx((2 / 2.13) ** (1.13 / 0.13), rel=1e-12)


def test_choked_mass_flux_closed_form():
    # Anderson 3rd ed. eq. (5.21): m*/A* = p0/sqrt(T0) sqrt(γ/R (2/(γ+1))^((γ+1)/(γ-1)));
    # air (γ 1.4, R 287) gives the textbook constant 0.0404 kg K^0.5/(N s)
    p0, T0 = 5e5, 300.0
    flux = G.mass_flux_ideal(p0, T0, 1e5, 1.4, 287.0)
    assert flux / (p0 / np.sqrt(T0)) == pytest.approx(0.0404, rel=2e-3)
    # below the critical pressure ratio the flux no longer depends on the back pressure
    assert G.mass_flux_ideal(p0, T0, 0.2e5, 1.4, 287.0) == pytest.approx(flux, rel=1e-12)
    # unchoked flux is smaller and vanishes at no pressure difference
    assert G.mass_flux_ideal(p0, T0, 4e5, 1.4, 287.0) < flux
    assert G.mass_flux_ideal(p0, T0, p0, 1.4, 287.0) == pytest.approx(0.0, abs=1e-9)


def _coolprop_scan(fluid, p0, T0, p_back, n=4000):
    """Reference: CoolProp isentropic expansion scanned on a fine throat-pressure grid."""
    s0 = CP.PropsSI("S", "T", T0, "P", p0, fluid)
    h0 = CP.PropsSI("H", "T", T0, "P", p0, fluid)
    p = np.linspace(p_back, p0 * 0.999999, n)
    h = CP.PropsSI("H", "P", p, "S", s0 * np.ones_like(p), fluid)
    d = CP.PropsSI("D", "P", p, "S", s0 * np.ones_like(p), fluid)
    g = d * np.sqrt(np.clip(2 * (h0 - h), 0, None))
    i = int(np.argmax(g))
    return g[i], p[i] / p0


@pytest.mark.parametrize("fluid,p0,T0", [("Nitrogen", 5e5, 300.0), ("Propane", 6e5, 293.15),
                                         ("Propane", 2.5e5, 283.15)])
def test_real_gas_isentropic_against_coolprop_scan(fluid, p0, T0):
    g_ref, r_ref = _coolprop_scan(fluid, p0, T0, 0.3 * p0)
    flux, r = G.mass_flux_isentropic_real(fluid, p0, T0, 0.3 * p0)
    assert flux == pytest.approx(g_ref, rel=1e-4)
    assert r == pytest.approx(r_ref, abs=2e-3)


def test_nitrogen_real_gas_near_ideal():
    # at 5 bar and 300 K nitrogen is nearly ideal: real-gas flux within 0.5 % of the closed form
    # with CoolProp's γ and Z at the upstream state
    g = CP.PropsSI("CPMASS", "T", 300.0, "P", 5e5, "Nitrogen") / CP.PropsSI("CVMASS", "T", 300.0, "P", 5e5, "Nitrogen")
    Z = CP.PropsSI("Z", "T", 300.0, "P", 5e5, "Nitrogen")
    R = 8.314462618 / CP.PropsSI("M", "Nitrogen")
    ideal = G.mass_flux_ideal(5e5, 300.0, 1e5, g, R, Z)
    real, r = G.mass_flux_isentropic_real("Nitrogen", 5e5, 300.0, 1e5)
    assert real == pytest.approx(ideal, rel=5e-3)
    assert r == pytest.approx(G.critical_pressure_ratio(g), abs=3e-3)


@pytest.mark.parametrize("t_c,p_mpa,source", [
    (-20.0, 0.24452, "NIST WebBook propane saturation (Lemmon et al. 2009), from memory"),
    (0.0, 0.47446, "NIST WebBook propane saturation (Lemmon et al. 2009), from memory"),
    (20.0, 0.83646, "NIST WebBook propane saturation (Lemmon et al. 2009), from memory"),
    (40.0, 1.3694, "NIST WebBook propane saturation (Lemmon et al. 2009), from memory"),
])
def test_canister_pressure_against_reference(t_c, p_mpa, source):
    T = t_c + 273.15
    p = G.canister_pressure("propane", T)
    # reference equation of state itself (CoolProp, Lemmon et al. 2009), tight
    assert p == pytest.approx(CP.PropsSI("P", "T", T, "Q", 0, "Propane"), rel=1e-4)
    assert p == pytest.approx(p_mpa * 1e6, rel=5e-3), source


def test_canister_pressure_of_a_blend_lies_between_its_components():
    T = 293.15
    p_blend = G.canister_pressure("lpg-70-30", T)
    assert G.canister_pressure("butane", T) < p_blend < G.canister_pressure("propane", T)


def test_adiabatic_boil_off_against_coolprop_enthalpy_balance():
    """Cool 1 kg of liquid propane from 20 °C to 0 °C by boiling part of it, no heat gained.

    Reference: d(m h_l) = h_g dm with CoolProp's saturated liquid and vapour
    enthalpies (Lemmon et al. 2009), integrated on a fine grid.
    """
    T = np.linspace(293.15, 273.15, 4001)
    hl = CP.PropsSI("H", "T", T, "Q", np.zeros_like(T), "Propane")
    hg = CP.PropsSI("H", "T", T, "Q", np.ones_like(T), "Propane")
    dlnm = np.diff(hl) / (0.5 * ((hg - hl)[1:] + (hg - hl)[:-1]))
    m_end = np.exp(np.sum(dlnm))
    boiled_ref = 1.0 - m_end
    assert G.adiabatic_boil_off("propane", 1.0, 293.15, 273.15) == pytest.approx(boiled_ref, rel=0.02)
    # the time-marching chill model with no shell and no air gives the same
    drawn = 0.1  # kg over the run
    out = G.canister_chill("propane", 1.0, 0.0, drawn / 100.0, 100.0, 293.15, h=0.0)
    boiled = G.adiabatic_boil_off("propane", 1.0, 293.15, float(out["temperature"][-1]))
    assert boiled == pytest.approx(drawn, rel=2e-3)


def test_canister_chill_over_a_run():
    # example canister of our own: 220 g propane in a 110 g steel shell, 4 g/min for 10 min, 20 °C air
    out = G.canister_chill("propane", 0.22, 0.11, 4.0 / 6e4, 600.0, 293.15, p_required=5.0e5)
    T, p, m = out["temperature"], out["pressure"], out["liquid_mass"]
    assert np.all(np.diff(T) < 0) and np.all(np.diff(p) < 0) and np.all(np.diff(m) < 0)
    assert m[-1] == pytest.approx(0.22 - 0.04, rel=1e-6)
    assert np.all(out["heat_gain"][1:] > 0)  # air warms a cold canister
    assert 0 < out["time_below"] < 600.0  # it falls below 5 bar within the run
    # a warmer start or an aluminium shell (more heat capacity per kg) chills less
    alu = G.canister_chill("propane", 0.22, 0.11, 4.0 / 6e4, 600.0, 293.15, shell="aluminium")
    assert alu["temperature"][-1] > T[-1]
    # with no air and no shell it chills more
    bare = G.canister_chill("propane", 0.22, 0.0, 4.0 / 6e4, 600.0, 293.15, h=0.0)
    assert bare["temperature"][-1] < T[-1]
    # the run stops when the liquid is gone
    short = G.canister_chill("propane", 0.02, 0.11, 4.0 / 6e4, 600.0, 293.15)
    assert short["time_empty"] == pytest.approx(0.02 / (4.0 / 6e4), rel=1e-3)


def test_jet_flow_and_sizing():
    # orifice, pure propane: real-gas method by default
    q = G.jet_mass_flow("propane", 0.3e-3, 0.0, 3e5, 1.013e5, 293.15)
    flux, _ = G.mass_flux_isentropic_real("Propane", 3e5, 293.15, 1.013e5)
    assert q == pytest.approx(G.CD_JET * np.pi * 0.3e-3**2 / 4 * flux, rel=1e-12)
    # ideal gas with real γ, Z stays within 3 % of the real-gas result at 3 bar
    assert G.jet_mass_flow("propane", 0.3e-3, 0.0, 3e5, 1.013e5, 293.15, method="ideal") == pytest.approx(q, rel=0.03)
    # friction of a long needle cuts the flow; length 0 of the Fanno model equals the orifice
    L = np.array([0.0, 5e-3, 30e-3, 100e-3])
    qs = G.jet_mass_flow("propane", 0.3e-3, L, 3e5, 1.013e5, 293.15, method="ideal")
    assert np.all(np.diff(qs) < 0)
    # sizing inverts the flow
    d = G.jet_bore_for_flow("propane", q, 0.0, 3e5, 1.013e5, 293.15)
    assert d == pytest.approx(0.3e-3, rel=1e-9)
    d2 = G.jet_bore_for_flow("propane", qs[2], 30e-3, 3e5, 1.013e5, 293.15)
    assert d2 == pytest.approx(0.3e-3, rel=1e-4)


def test_fanno_reference_values():
    # Anderson 3rd ed. Table A.3 (Fanno, γ = 1.4): 4 f_F L*/D = 1.0691 at M = 0.5 (Darcy f = 4 f_F)
    assert G.fanno_parameter(0.5, 1.4) == pytest.approx(1.0691, abs=2e-4)
    # choked by friction: exit pressure at M = 1, flux equals the entry flux at M1
    flux, choked = G.mass_flux_fanno(5e5, 300.0, 1e5, 1.4, 287.0, G.fanno_parameter(0.5, 1.4))
    p0, T0, g, R, M1 = 5e5, 300.0, 1.4, 287.0, 0.5
    expected = p0 * np.sqrt(g / (R * T0)) * M1 * (1 + 0.2 * M1**2) ** (-3.0)
    assert choked == 1.0 and flux == pytest.approx(expected, rel=1e-6)


def test_bad_input():
    with pytest.raises(FuelsysInputError, match="above the upstream"):
        G.jet_mass_flow("propane", 0.3e-3, 0.0, 2e5, 3e5, 293.15)
    with pytest.raises(FuelsysInputError, match="liquid"):
        G.jet_mass_flow("propane", 0.3e-3, 0.0, 12e5, 1e5, 293.15)
    with pytest.raises(FuelsysInputError, match="outside propane's range"):
        G.canister_pressure("propane", 400.0)
    with pytest.raises(FuelsysInputError, match="outside propane's range"):
        G.canister_chill("propane", 0.2, 0.1, 1e-4, 60.0, 420.0)
    with pytest.raises(FuelsysInputError, match="shell material"):
        G.canister_chill("propane", 0.2, 0.1, 1e-4, 60.0, 293.15, shell="brass")
    with pytest.raises(FuelsysInputError, match="discharge coefficient"):
        G.jet_mass_flow("propane", 0.3e-3, 0.0, 3e5, 1e5, 293.15, cd=1.5)


# -- spreadsheet face ------------------------------------------------------------------
def test_sheet_gas_functions():
    from fuelsys.sheet import call

    g = call("FS_GAS_JET_FLOW", 0.3, 0, 3.0, 1.01325, "propane", 20)
    assert g == pytest.approx(G.jet_mass_flow("propane", 0.3e-3, 0.0, 3e5, 1.01325e5, 293.15) * 6e4, rel=1e-9)
    col = call("FS_GAS_JET_FLOW", [[0.3], [0.3]], [[0], [30]], 3.0, 1.01325, "propane", 20)
    assert col[1][0] < col[0][0]
    assert call("FS_GAS_JET_FLOW", 0.3, 0, 1.0, 3.0, "propane", 20).startswith("FS error: down_bar_abs")
    assert "liquid" in call("FS_GAS_JET_FLOW", 0.3, 0, 12.0, 1.0, "propane", 20)
    table = call("FS_CANISTER_CHILL", "propane", 220, 110, 4, 10, 20, "steel", 5.0, 6)
    assert table[0][:4] == ["minutes", "temp_c", "pressure_bar_abs", "liquid_g"]
    assert len(table) == 7 and table[-1][0] == pytest.approx(10.0)
    assert table[-1][1] < table[2][1] < table[1][1] == pytest.approx(20.0)
    assert table[1][5] == "yes" and table[-1][5] == "no"
    assert "outside propane's range" in call("FS_CANISTER_CHILL", "propane", 220, 110, 4, 10, 120)
