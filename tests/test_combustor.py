"""Combustor liner: air split, zone mixtures and temperatures (fuelsys.combustor) and its spreadsheet functions."""

import numpy as np
import pytest

from fuelsys import combustor as cb, engine, equilibrium as eq, thermo
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.fuels import fuel_h_to_c, get_fuel
from fuelsys.sheet import adapt, call

P_ATM = 101325.0

# An example liner of our own invention for a small (60-80 N class) turbojet: six vaporiser
# tubes, a row each of primary, secondary and dilution holes, and wall-cooling holes.
OPENINGS = [("vaporiser", 6, 5.0e-3), ("primary", 24, 2.5e-3), ("secondary", 24, 3.7e-3),
            ("dilution", 12, 7.5e-3), ("cooling", 48, 1.8e-3)]
# Its engine, also our own invention: 120,000 rpm, pressure ratio 2.6, 150 g/s of air and a
# turbine inlet of 850 °C at full power.
DESIGN = dict(design_speed=120000.0, pr_design=2.6, air_flow_design=0.15, t4_design=850.0 + 273.15)
SPEEDS = np.array([50000.0, 70000.0, 95000.0, 120000.0])


@pytest.fixture(scope="module")
def kero():
    return get_fuel("kerosene")


@pytest.fixture(scope="module")
def liner():
    return cb.Liner.from_openings(OPENINGS)


def _line(kero, eta):
    return engine.operating_line(SPEEDS, **DESIGN, lhv=kero.lhv, h_to_c=fuel_h_to_c(kero),
                                 combustion_efficiency=eta)


def _run(liner, kero, line, eta):
    return cb.combustor(liner, line["fuel_flow"], line["t3"], line["case_pressure"] + P_ATM, kero,
                        air_flow=line["air_flow"], efficiency=eta)


# -- air split -----------------------------------------------------------------------------------
def test_air_fractions_sum_to_one(liner):
    rng = np.random.default_rng(5)
    for _ in range(50):
        k = int(rng.integers(1, 8))
        f = cb.air_fractions(rng.integers(0, 40, k) + np.eye(k)[0], rng.uniform(0.5e-3, 9e-3, k),
                             rng.uniform(0.5, 0.9, k))
        assert f.sum() == pytest.approx(1.0, abs=1e-12) and np.all(f >= 0)
    assert sum(liner.zone_fractions().values()) == pytest.approx(1.0, abs=1e-12)
    assert sum(liner.stage_fractions().values()) == pytest.approx(1.0, abs=1e-12)


@pytest.mark.parametrize("row", range(len(OPENINGS)))
@pytest.mark.parametrize("how", ["count", "diameter"])
def test_doubling_a_zones_hole_area_raises_its_fraction_as_the_area_ratio_predicts(row, how):
    # equal pressure drop across every opening: fraction = A_i / sum A, so doubling A_i gives
    # 2 f / (1 + f) (orifice equation, Lefebvre & Ballal 2010 ch. 4)
    n = np.array([o[1] for o in OPENINGS], dtype=float)
    d = np.array([o[2] for o in OPENINGS])
    f = cb.air_fractions(n, d)
    if how == "count":
        n[row] *= 2
    else:
        d[row] *= np.sqrt(2.0)
    f2 = cb.air_fractions(n, d)
    assert f2[row] == pytest.approx(2 * f[row] / (1 + f[row]), rel=1e-12)
    others = np.arange(len(OPENINGS)) != row
    assert np.allclose(f2[others] / f[others], 1 / (1 + f[row]))


def test_discharge_coefficient_scales_the_share():
    f = cb.air_fractions([10, 10], [3e-3, 3e-3], [0.8, 0.4])
    assert f[0] == pytest.approx(2 / 3)
    # NaN takes the default plain-hole Cd
    assert np.allclose(cb.air_fractions([10, 10], [3e-3, 3e-3], [np.nan, cb.CD_PLAIN_HOLE]), 0.5)


def test_kaddah_discharge_coefficient():
    # large hole-to-annulus pressure ratio: Cd -> 1.25/2 (plain) and 1.65/2 (plunged), the limits of the
    # correlation as given by Lefebvre & Ballal 2010 ch. 4 (from memory); plain holes about 0.6 at the
    # low annulus velocities of small engines (common practice, no source)
    with pytest.warns(ValidityWarning):
        assert cb.kaddah_1964(1e8) == pytest.approx(cb.CD_PLAIN_HOLE, rel=1e-6)
        assert cb.kaddah_1964(1e8, plunged=True) == pytest.approx(0.825, rel=1e-6)
    K = np.array([1.5, 3.0, 10.0, 30.0])
    cd = cb.kaddah_1964(K, 0.2)
    assert np.all(np.diff(cd) > 0) and np.all(cd < cb.CD_PLAIN_HOLE)
    assert np.all(cb.kaddah_1964(K, 0.2, plunged=True) > cd)
    with pytest.raises(FuelsysInputError, match="K must be > 1"):
        cb.kaddah_1964(1.0)
    with pytest.raises(FuelsysInputError, match="bleed ratio"):
        cb.kaddah_1964(5.0, 1.5)


def test_liner_flow_against_published_air_density():
    """m = A_eff (2 rho dp)^0.5; dry air at 400 K has rho = 0.8711 kg/m³ (Incropera & DeWitt,
    Fundamentals of Heat and Mass Transfer 6th ed., Table A.4, whose densities are at 1 bar; from memory)."""
    p, T, dp, a = 1.0e5, 400.0, 3.0e3, 7.0e-4
    rho = 0.8711
    assert cb.liner_air_flow(a, dp, p, T) == pytest.approx(a * np.sqrt(2 * rho * dp), rel=1e-3)
    assert cb.jet_velocity(dp, p, T) == pytest.approx(np.sqrt(2 * dp / rho), rel=1e-3)
    m = cb.liner_air_flow(a, dp, p, T)
    assert cb.liner_pressure_drop(m, a, p, T) == pytest.approx(dp, rel=1e-12)
    with pytest.raises(FuelsysInputError, match="openings are too small"):
        cb.liner_pressure_drop(1.0, 1e-5, 2.6e5, 415.0)


def test_liner_zone_bookkeeping(liner):
    z = liner.zone_fractions()
    s = liner.stage_fractions()
    assert s["primary"] == pytest.approx(z["vaporiser"] + z["primary"])
    assert s["dilution"] == pytest.approx(z["dilution"] + z["cooling"])
    lin2 = cb.Liner.from_openings(OPENINGS, cooling_joins="secondary")
    assert lin2.stage_fractions()["secondary"] == pytest.approx(z["secondary"] + z["cooling"])
    assert liner.effective_area == pytest.approx(
        sum(n * cb.CD_PLAIN_HOLE * np.pi * d**2 / 4 for _, n, d in OPENINGS))


# -- energy balance ------------------------------------------------------------------------------------
@pytest.mark.parametrize("eta", [1.0, 0.95])
def test_mixed_out_temperature_returns_the_engines_turbine_inlet_temperature(liner, kero, eta):
    line = _line(kero, eta)
    r = _run(liner, kero, line, eta)
    # within 1 % (the requirement); seen: agreement to rounding
    assert np.allclose(r.t_exit, line["t4"], rtol=0.01)
    assert np.allclose(r.t_exit, line["t4"], rtol=1e-8)
    # the same by mixing the secondary-zone gas with the dilution and cooling air (lean zones)
    lean = ~r.secondary_rich
    m_sec = (r.primary_air + r.secondary_air) * (1 + r.far_secondary * eta)
    t_mix = cb.mix_temperature(r.t_secondary, m_sec, line["t3"], r.dilution_air,
                               far_hot=r.far_secondary * eta, h_to_c=fuel_h_to_c(kero))
    assert np.allclose(t_mix[lean], line["t4"][lean], rtol=1e-6)


def test_primary_equilibrium_products_burned_out_with_the_rest_of_the_air_give_t4(liner, kero):
    """Chain through the primary zone's dissociated products (CO, H2, OH, ... carry chemical energy):
    their enthalpy plus the secondary, dilution and cooling air at T3, burned out to lean products,
    gives the engine's T4 within 1 %."""
    line = _line(kero, 1.0)
    r = _run(liner, kero, line, 1.0)
    p3 = line["case_pressure"] + P_ATM
    prim = eq.equilibrium_products(r.phi_primary, line["t3"], p3, kero)
    y = fuel_h_to_c(kero)
    idx = [eq.SPECIES.index(s) for s in thermo.SPECIES]
    air_n = thermo.Y_AIR / np.array([thermo.MOLAR_MASS[s] for s in thermo.SPECIES])  # mol/kg air
    h_air = eq.species_properties(line["t3"])["h"][:, idx] @ air_n  # J/kg air, absolute
    m_air = line["air_flow"]
    H = r.primary_air * (1 + r.far_primary) * prim["h"] + (m_air - r.primary_air) * h_air
    # lean products per kg of air at the exit fuel/air ratio, moles of N2, O2, Ar, CO2, H2O
    m_unit = thermo.ATOMIC_MASS["C"] + y * thermo.ATOMIC_MASS["H"]
    nu = np.array([0.0, -(1 + y / 4), 0.0, 1.0, y / 2]) / m_unit
    n = air_n + r.far_exit[:, None] * nu
    T = np.full(SPEEDS.shape, 1000.0)
    for _ in range(30):  # Newton on the absolute enthalpy of the products
        p = eq.species_properties(T)
        f = np.sum(n * p["h"][:, idx], 1) - H / m_air
        T = T - f / np.sum(n * p["cp"][:, idx], 1)
    assert np.allclose(T, line["t4"], rtol=0.01)
    assert np.allclose(T, line["t4"], rtol=1e-4)


def test_burnout_inverts_the_engine_energy_balance(kero):
    y = fuel_h_to_c(kero)
    far = engine.fuel_air_ratio_energy_balance(np.array([300.0, 420.0]), 1100.0, kero.lhv, y, 0.93)
    assert np.allclose(cb.burnout_temperature([300.0, 420.0], far, kero.lhv, y, 0.93), 1100.0, rtol=1e-9)


def test_mix_temperature_against_coolprop_air():
    """Two air streams, 1 kg/s at 1000 K and 1 kg/s at 300 K: the mixed enthalpy from CoolProp's air
    (Lemmon et al. 2000) is the average of the two; its temperature within 1 K."""
    from CoolProp.CoolProp import PropsSI

    h = 0.5 * (PropsSI("H", "T", 1000.0, "P", 1e5, "Air") + PropsSI("H", "T", 300.0, "P", 1e5, "Air"))
    t_ref = PropsSI("T", "H", h, "P", 1e5, "Air")
    assert cb.mix_temperature(1000.0, 1.0, 300.0, 1.0) == pytest.approx(t_ref, abs=1.0)
    # mass-weighted: a hot stream of no flow leaves the cold one as it was
    assert cb.mix_temperature(2000.0, 0.0, 450.0, 2.0) == pytest.approx(450.0, abs=1e-6)


# -- trade facts -----------------------------------------------------------------------------------------
def test_trade_facts_at_full_power(liner, kero):
    """Common practice, no source: about a fifth of the air in the primary zone; a flame just under
    2,000 °C there; a turbine inlet around 850 °C; dilution taking the gas down by over 1,000 °C.
    Combustion efficiency 0.98 at full power (common practice, no source)."""
    line = _line(kero, 0.98)
    r = _run(liner, kero, line, 0.98)
    full = -1
    assert 0.15 <= r.primary_share <= 0.25                                 # about a fifth
    assert 1800.0 <= r.t_primary[full] - 273.15 < 2000.0                   # just under 2,000 °C
    assert r.t_exit[full] - 273.15 == pytest.approx(850.0, abs=50.0)       # around 850 °C
    assert r.dilution_drop[full] > 1000.0                                  # down by over 1,000 °C
    assert r.t_primary[full] > r.t_secondary[full] > r.t_exit[full]
    assert r.flags[full] == ""
    # hole jets of the order of 100 m/s at a liner drop of a few per cent (common practice, no source)
    assert 60.0 < r.jet_velocity[full] < 150.0
    assert 0.02 < r.liner_dp_fraction[full] < 0.08


def test_dissociation_lowers_the_primary_flame(liner, kero):
    line = _line(kero, 1.0)
    r = _run(liner, kero, line, 1.0)
    assert np.all(r.t_primary_complete >= r.t_primary)


# -- flags ------------------------------------------------------------------------------------------------
def test_flags(liner, kero):
    # lean primary at a trickle of fuel, rich at a flood; a liner with a big primary share
    with pytest.warns(ValidityWarning, match="equivalence ratio 0.285"):
        r = cb.combustor(liner, np.array([0.0006, 0.0028, 0.0042]), 415.0, 2.6e5, kero, air_flow=0.15)
    assert list(r.primary_unstable) == [True, False, True]
    assert "too lean" in r.flags[0] and "too rich" in r.flags[2] and r.flags[1] == ""
    big = cb.Liner.from_openings([("vaporiser", 6, 6e-3), ("primary", 24, 4e-3), ("dilution", 12, 7.5e-3)])
    r2 = cb.combustor(big, 0.0028, 415.0, 2.6e5, kero, air_flow=0.15)
    assert r2.primary_share > 0.3 and r2.primary_share_unusual and "usual fifth" in r2.flags
    # liner pressure drop of 1 % of case pressure: weak jets
    with pytest.warns(ValidityWarning, match="equivalence ratio 2.6"):  # 1 % drop: less air, richer
        r3 = cb.combustor(liner, 0.0028, 415.0, 2.6e5, kero, liner_dp=0.01 * 2.6e5)
    assert r3.liner_dp_unusual and "weak jets" in r3.flags
    # primary + secondary still rich: flagged, the zone given its equilibrium temperature
    small = cb.Liner.from_openings([("vaporiser", 6, 5e-3), ("secondary", 8, 4e-3), ("dilution", 12, 8.8e-3)])
    with pytest.warns(ValidityWarning):  # primary beyond phi 2
        r4 = cb.combustor(small, 0.0028, 415.0, 2.6e5, kero, air_flow=0.15)
    assert r4.secondary_rich and "still rich" in r4.flags
    assert r4.t_secondary == pytest.approx(
        eq.gordon_mcbride_1994(r4.phi_secondary, 415.0, 2.6e5, kero), abs=1e-6)


def test_no_fuel_leaves_the_air_as_it_was(liner, kero):
    r = cb.combustor(liner, 0.0, 415.0, 2.6e5, kero, air_flow=0.15)
    assert r.t_primary == pytest.approx(415.0) and r.t_exit == pytest.approx(415.0, abs=1e-6)


def test_broadcasting_and_scalars(liner, kero):
    mf = np.array([[0.002], [0.0028]])
    t3 = np.array([380.0, 415.0, 430.0])
    r = cb.combustor(liner, mf, t3, 2.6e5, kero, air_flow=0.15)
    assert r.t_primary.shape == (2, 3) and r.flags.shape == (2, 3)
    one = cb.combustor(liner, 0.0028, 430.0, 2.6e5, kero, air_flow=0.15)
    assert isinstance(one.t_primary, float) and isinstance(one.flags, str)
    assert isinstance(one.primary_unstable, bool)
    assert r.t_primary[1, 2] == pytest.approx(one.t_primary, abs=1e-6)
    assert r.t_exit[1, 2] == pytest.approx(one.t_exit, abs=1e-6)


def test_air_from_liner_pressure_drop_equals_air_given(liner, kero):
    a = cb.combustor(liner, 0.0028, 415.0, 2.6e5, kero, air_flow=0.15)
    b = cb.combustor(liner, 0.0028, 415.0, 2.6e5, kero, liner_dp=a.liner_dp)
    assert b.air_flow == pytest.approx(0.15, rel=1e-12)
    assert b.t_primary == pytest.approx(a.t_primary, abs=1e-6)


# -- bad input ----------------------------------------------------------------------------------------------
@pytest.mark.parametrize("counts,dias,match", [
    ([6, -2], [5e-3, 2e-3], "hole count must be >= 0"),
    ([6, 2.5], [5e-3, 2e-3], "whole number"),
    ([6, 24], [5e-3, 0.0], "hole diameter must be > 0"),
    ([0, 0], [5e-3, 2e-3], "no openings at all"),
    ([], [], "no openings at all"),
    ([6, 24], [5e-3], "one diameter"),
])
def test_bad_openings(counts, dias, match):
    with pytest.raises(FuelsysInputError, match=match):
        cb.air_fractions(counts, dias)


def test_bad_liner_and_operating_points(liner, kero):
    with pytest.raises(FuelsysInputError, match="zone 'dome' unknown"):
        cb.Liner.from_openings([("dome", 6, 5e-3)])
    with pytest.raises(FuelsysInputError, match="discharge coefficient"):
        cb.Liner.from_openings([("primary", 6, 5e-3, 1.2)])
    with pytest.raises(FuelsysInputError, match="no primary-zone openings"):
        cb.combustor(cb.Liner.from_openings([("dilution", 6, 5e-3)]), 0.001, 415.0, 2.6e5, kero, air_flow=0.1)
    with pytest.raises(FuelsysInputError, match="exactly one"):
        cb.combustor(liner, 0.0028, 415.0, 2.6e5, kero)
    with pytest.raises(FuelsysInputError, match="exactly one"):
        cb.combustor(liner, 0.0028, 415.0, 2.6e5, kero, air_flow=0.15, liner_dp=1e4)
    with pytest.raises(FuelsysInputError, match="richer than stoichiometric"):
        cb.combustor(liner, 0.015, 415.0, 2.6e5, kero, air_flow=0.15)
    with pytest.raises(FuelsysInputError, match="openings are too small"):
        cb.combustor(liner, 0.0028, 415.0, 2.6e5, kero, air_flow=0.8)
    with pytest.raises(FuelsysInputError, match="fuel flow must be >= 0"):
        cb.combustor(liner, -0.001, 415.0, 2.6e5, kero, air_flow=0.15)
    with pytest.raises(FuelsysInputError, match="too rich"):  # a primary zone where soot must form
        cb.combustor(cb.Liner.from_openings([("vaporiser", 2, 1e-3), ("dilution", 12, 9e-3)]), 0.0028, 415.0,
                     2.6e5, kero, air_flow=0.15)
    with pytest.raises(FuelsysInputError, match="liner must be a Liner"):
        cb.combustor(OPENINGS, 0.0028, 415.0, 2.6e5, kero, air_flow=0.15)


def test_incompressible_flow_flagged_at_large_pressure_drop():
    with pytest.warns(ValidityWarning, match="incompressible"):
        cb.liner_air_flow(7e-4, 0.2 * 2.6e5, 2.6e5, 415.0)


# -- spreadsheet functions ----------------------------------------------------------------------------------------
COUNTS = [[o[1]] for o in OPENINGS]
DIAS_MM = [[o[2] * 1e3] for o in OPENINGS]


@pytest.fixture(autouse=True)
def strict_adapter(monkeypatch):
    monkeypatch.setattr(adapt, "STRICT", True)


def test_fs_zone_air_column_and_labelled(liner):
    col = call("FS_ZONE_AIR", COUNTS, DIAS_MM)
    assert np.allclose([r[0] for r in col], liner.row_fractions())
    names = [["primary"], ["primary"], ["secondary"], ["dilution"], ["dilution"]]
    lab = call("FS_ZONE_AIR", COUNTS, DIAS_MM, None, names)
    assert [r[0] for r in lab] == ["primary", "secondary", "dilution"]
    s = liner.stage_fractions()
    assert np.allclose([r[1] for r in lab], [s["primary"], s["secondary"], s["dilution"]])
    assert sum(r[1] for r in lab) == pytest.approx(1.0)
    # a row of the range as well as a column; blank Cd cells take the default
    row = call("FS_ZONE_AIR", [[6, 24]], [[5, 2.5]], [[None, 0.625]])
    assert np.allclose([r[0] for r in row], cb.air_fractions([6, 24], [5e-3, 2.5e-3]))


@pytest.mark.parametrize("cells,expect", [
    ((COUNTS[:1] + [[-24]] + COUNTS[2:], DIAS_MM), "FS error: hole_counts must be a whole number >= 0 (got -24)"),
    ((COUNTS, DIAS_MM[:1] + [[0]] + DIAS_MM[2:]), "FS error: hole_dias_mm must be > 0 mm (got 0)"),
    (([[0], [0]], [[5], [2]]), "FS error: no openings at all"),
    (([[None], [None]], [[5], [2]]), "FS error: hole_counts holds no numbers"),
    ((COUNTS, DIAS_MM[:3]), "FS error: hole_dias_mm: one diameter per row"),
    ((COUNTS, DIAS_MM, [[0.6], [1.4], [None], [None], [None]]), "FS error: cds: row 2 must be > 0 and <= 1"),
    ((COUNTS, DIAS_MM, None, [["a"], [""], ["b"], ["c"], ["d"]]), "FS error: zone_names: row 2 is empty"),
])
def test_fs_zone_air_bad_input(cells, expect):
    out = call("FS_ZONE_AIR", *cells)
    assert isinstance(out, str) and out.startswith(expect), out


def test_fs_zone_phi(kero):
    phi = call("FS_ZONE_PHI", 168.0, 150.0, 0.2, "kerosene")
    assert phi == pytest.approx(168.0 / 60000 / (0.15 * 0.2) / kero.stoich_far)
    col = call("FS_ZONE_PHI", [[100.0], [168.0]], 150.0, 0.2, "kerosene")
    assert col[1][0] == pytest.approx(phi)
    assert call("FS_ZONE_PHI", 168.0, 150.0, 0.0, "kerosene").startswith("FS error: zone_fraction must be > 0")
    assert call("FS_ZONE_PHI", 168.0, 150.0, 0.2, "water").startswith("FS error:")


def test_fs_flame_temp(kero):
    # cell against the core function
    t = call("FS_FLAME_TEMP", "kerosene", 1.0, 150.0, 2.5)
    assert t == pytest.approx(eq.gordon_mcbride_1994(1.0, 423.15, 2.5e5, kero) - 273.15, abs=1e-6)
    # propane gas at 25 °C, 1 atm, phi = 1: 2267 K published equilibrium value (Turns 2012 Table B.1,
    # from memory) -- enters as gas, not as liquid
    assert call("FS_FLAME_TEMP", "propane", 1.0, 25.0, 1.01325) + 273.15 == pytest.approx(2267.0, abs=10.0)
    col = call("FS_FLAME_TEMP", "kerosene", [[0.6], [1.0], [0.25]], 150.0, 2.5)
    assert isinstance(col[0][0], float) and col[1][0] == pytest.approx(t)
    assert col[2][0].startswith("FS error: phi must be >= 0.3 and <= 2")
    assert call("FS_FLAME_TEMP", "kerosene", 1.0, 150.0, 2.5, "complete") > t
    assert call("FS_FLAME_TEMP", "kerosene", 2.5, 150.0, 2.5).startswith("FS error: phi must be >= 0.3 and <= 2")
    assert call("FS_FLAME_TEMP", "kerosene", 1.0, 150.0, 0).startswith("FS error: p_bar_abs must be > 0")


def test_fs_flame_temp_limits_match_the_core():
    from fuelsys.sheet.decl import combustor as decl

    lo, hi, _ = eq.HARD_LIMITS["t_inlet"]
    assert (decl._T_LO_C, decl._T_HI_C) == pytest.approx((lo - 273.15, hi - 273.15))
    assert (decl._PHI_LO, decl._PHI_HI) == eq.VALIDITY["phi"][:2]


def test_fs_mix_temp(kero):
    t = call("FS_MIX_TEMP", 1600.0, 60.0, 140.0, 90.0, 0.04)
    ref = cb.mix_temperature(1873.15, 0.06, 413.15, 0.09, far_hot=0.04, h_to_c=fuel_h_to_c(kero))
    assert t == pytest.approx(ref - 273.15, abs=1e-6)
    assert 140.0 < t < 1600.0
    assert call("FS_MIX_TEMP", 1600.0, 0.0, 140.0, 0.0).startswith("FS error: the two streams have no flow")
    assert call("FS_MIX_TEMP", 1600.0, 60.0, 140.0, 90.0, 0.09).startswith("FS error: fuel/air ratio is richer")
