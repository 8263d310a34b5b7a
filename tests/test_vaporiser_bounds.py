"""Every physical input of the vaporiser is bounded by its model's range, and nothing grows without limit.

Issue 16: a wall of 1e7 °C made the march's tables grow with the temperature span (about 120 MB per 1e6 °C),
and a wall at -273.1499999 °C gave a negative pressure drop.  The ranges are the models' own: the NASA
polynomials of fuelsys.thermo (200-6000 K, McBride et al. NASA/TP-2002-211556), the fuel model's liquid range
and critical pressure, and the fuel-vapour heat capacities (to T_VAPOUR_CP_MAX).
"""

import warnings

import numpy as np
import pytest

from fuelsys import thermo
from fuelsys import vaporiser as vap
from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.fuels import get_fuel
from fuelsys.sheet import adapt, call, is_error
from fuelsys.vaporiser import _tables

ARGS = (6e-3, 0.15, 0.5e-3, 3e-3, 3e5, 470.0)


@pytest.fixture(autouse=True)
def quiet():
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        yield


@pytest.fixture(scope="module")
def kero():
    return get_fuel("kerosene")


@pytest.mark.parametrize("wall", [1e7, 3e7, 1501.0, 0.0, 1e-7, 100.0])
def test_wall_outside_the_models_is_refused_with_the_range(kero, wall):
    with pytest.raises(FuelsysInputError, match=r"wall temperature must be within -51\.0\.\.1226\.8 °C"):
        vap.vaporiser(*ARGS, wall, kero)


def test_wall_profile_and_flame_gas_are_bounded_too(kero):
    with pytest.raises(FuelsysInputError, match="wall temperature must be within"):
        vap.vaporiser(*ARGS, vap.WallProfile([0.0, 0.15], [600.0, 1e6]), kero)
    with pytest.raises(FuelsysInputError, match="flame gas temperature must be within -73.1..5726.9 °C"):
        vap.FlameSide(1e7, 150.0, 0.2)


def test_air_fuel_and_pressure_outside_the_models_are_refused(kero):
    with pytest.raises(FuelsysInputError, match="inlet air temperature must be within"):
        vap.vaporiser(*ARGS[:5], 1e6, 800.0, kero)
    with pytest.raises(FuelsysInputError, match="fuel inlet temperature must be within -51.0..282.8 °C"):
        vap.vaporiser(*ARGS, 800.0, kero, t_fuel_in=700.0)
    # the fuel model's flash needs a pressure below its lightest pseudo-component's critical pressure
    with pytest.raises(FuelsysInputError, match="case pressure .* above the fuel model's range"):
        vap.vaporiser(*ARGS[:4], 1e8, 470.0, 800.0, kero)


def test_step_and_table_counts_are_capped(kero):
    with pytest.raises(FuelsysInputError, match="n_steps must be an even whole number within 4..2000"):
        vap.vaporiser(*ARGS, 800.0, kero, n_steps=10 ** 7)
    with pytest.raises(FuelsysInputError, match="n_table"):
        vap.vaporiser(*ARGS, 800.0, kero, n_table=(48, 10 ** 7))


def test_table_nodes_are_capped_whatever_the_span(kero):
    """The enthalpy tables' upper part never holds more than TABLE_UPPER_MAX nodes (spacing widens instead)."""
    n = 2
    t_lo = np.full(n, 250.0)
    far = np.full(n, 0.05)
    tab = _tables.Tables(kero, t_lo, t_lo + 100.0, np.array([1500.0, 1e7]), np.full(n, 3e5), far,
                         far > 0, (48, 16))
    assert tab.ns <= vap.TABLE_UPPER_MAX
    assert np.all(tab.Tg[-1] >= np.array([1500.0, 1e7]) - 1e-6)  # the table still reaches each point's top


def test_sheet_refuses_the_extreme_walls_of_the_fuzz():
    for wall_c in (1e7, -273.1499999, 1e6):
        out = call("FS_VAPORISER", 6, 150, 30, 4, 3, 200, wall_c, "kerosene", 0, "dp_mbar")
        assert is_error(out) and "wall" in out, out


def test_coldest_allowed_wall_gives_a_verdict(kero):
    # the coldest wall the model allows, with hot air: the gas cools, slows and recovers a little pressure;
    # the tube's pressure drop is reported as friction + acceleration, and must stay a number
    r = vap.vaporiser(*ARGS, kero.t_min, kero)
    assert np.isfinite(r.pressure_drop)
    assert r.verdict.startswith("poor")
