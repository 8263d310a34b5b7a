"""ISO 9626 needle tubing table: internal consistency, published nominal sizes, look-ups and errors."""

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError
from fuelsys.flow import tubing

# Needle gauge comparison chart (Wikipedia, "Needle gauge comparison chart", US/Stubs nominal sizes,
# regular wall): gauge -> (nominal OD [mm], nominal ID [mm]).  Gauges 10..31 as published there;
# 32..34 from the same chart, from memory.
NOMINAL_MM = {
    10: (3.404, 2.692), 11: (3.048, 2.388), 12: (2.769, 2.159), 13: (2.413, 1.803), 14: (2.108, 1.600),
    15: (1.829, 1.372), 16: (1.651, 1.194), 17: (1.473, 1.067), 18: (1.270, 0.838), 19: (1.067, 0.686),
    20: (0.9081, 0.603), 21: (0.8192, 0.514), 22: (0.7176, 0.413), 23: (0.6414, 0.337), 24: (0.5652, 0.311),
    25: (0.5144, 0.260), 26: (0.4636, 0.260), 27: (0.4128, 0.210), 28: (0.3620, 0.184), 29: (0.3366, 0.184),
    30: (0.3112, 0.159), 31: (0.2604, 0.133), 32: (0.2350, 0.108), 33: (0.2096, 0.108), 34: (0.1842, 0.0826),
}


def test_table_covers_33g_to_14g_and_more():
    # ISO 9626:2016 scope: designated sizes 3.4 mm (10G) to 0.18 mm (34G)
    assert set(range(10, 35)) == set(tubing.GAUGES)


def test_every_value_carries_its_source():
    for g, row in tubing.ISO9626_TABLE.items():
        assert "ISO 9626" in row["source"], g


@pytest.mark.parametrize("g", sorted(tubing.ISO9626_TABLE))
def test_internal_consistency_of_each_row(g):
    # ISO 9626 Table 1 structure: OD min < OD max; every minimum bore below the smallest OD;
    # bores grow as the wall gets thinner; the designated metric size (a rounded label) lies in the
    # OD range or at most 3 % below it (0.2 mm for 33G, 0.25 mm for 31G).
    row = tubing.ISO9626_TABLE[g]
    assert row["od_min"] < row["od_max"]
    assert 0.97 * row["od_min"] <= row["designation"] <= row["od_max"]
    bores = [row["bore_min"][w] for w in tubing.WALL_CLASSES if w in row["bore_min"]]
    assert bores == sorted(bores) and len(set(bores)) == len(bores)
    assert all(b < row["od_min"] for b in bores)
    assert "normal" in row["bore_min"] and "thin" in row["bore_min"]


def test_od_and_bore_grow_with_smaller_gauge_number():
    # internal consistency: a smaller gauge number is a bigger tube (Birmingham gauge convention)
    g = np.array(sorted(tubing.GAUGES))          # 10 .. 34
    lo, hi = tubing.od_range(g)
    assert np.all(np.diff(lo) < 0) and np.all(np.diff(hi) < 0)
    assert np.all(np.diff(tubing.needle_bore(g, "normal")) <= 0)
    assert np.all(np.diff(tubing.needle_bore(g, "thin")) <= 0)


def test_extra_thin_wall_range():
    # ISO 9626:1991/Amd 1:2001 and GB/T 18457-2015: extra-thin wall for designated sizes 0.6..2.1 mm
    have = sorted(g for g, r in tubing.ISO9626_TABLE.items() if "extra-thin" in r["bore_min"])
    assert have == list(range(14, 24))
    sizes = sorted(tubing.ISO9626_TABLE[g]["designation"] for g in have)
    assert sizes[0] == pytest.approx(0.6e-3) and sizes[-1] == pytest.approx(2.1e-3)


@pytest.mark.parametrize("g", sorted(NOMINAL_MM))
def test_against_published_nominal_sizes(g):
    # Wikipedia needle gauge chart (nominal, regular wall): the nominal OD lies in the ISO OD range and
    # the nominal regular-wall ID is at least the ISO minimum normal-wall bore.
    od, bore = NOMINAL_MM[g]
    lo, hi = tubing.od_range(g)
    assert lo * 1e3 - 1e-3 <= od <= hi * 1e3 + 1e-3
    assert bore >= tubing.needle_bore(g) * 1e3


@pytest.mark.parametrize("g", range(10, 35))
def test_birmingham_wire_gauge_from_fluids_lies_in_the_od_range(g):
    # fluids.piping.t_from_gauge(schedule="BWG"): Birmingham (Stubs iron) wire gauge, from which needle
    # gauges derive; ISO rounds its limits to 1 um.
    fluids_piping = pytest.importorskip("fluids.piping")
    bwg = fluids_piping.t_from_gauge(g, schedule="BWG")
    lo, hi = tubing.od_range(g)
    assert lo - 1e-6 <= bwg <= hi + 1e-6


def test_lookups_scalar_and_array():
    # ISO 9626:2016 Table 1 (from memory): 22G OD 0.698..0.730 mm, bores 0.390 / 0.440 / 0.522 mm
    assert tubing.needle_bore(22) == pytest.approx(0.390e-3)
    assert tubing.needle_bore(22, "TW") == pytest.approx(0.440e-3)
    assert tubing.needle_bore(22, "extra thin") == pytest.approx(0.522e-3)
    assert type(tubing.needle_bore(22)) is float
    assert tubing.needle_od(22) == pytest.approx(0.714e-3)
    assert tubing.needle_od(22, "min") == pytest.approx(0.698e-3)
    assert tubing.needle_od(22, "nominal") == pytest.approx(0.7e-3)
    out = tubing.needle_bore(np.array([[22, 23], [20, 25]]), "thin")
    assert out.shape == (2, 2) and out[0, 1] == pytest.approx(0.370e-3)


def test_measured_bore_overrides_the_table():
    assert tubing.resolve_bore(22, "normal", bore=0.41e-3) == pytest.approx(0.41e-3)
    assert tubing.resolve_bore(22) == pytest.approx(0.390e-3)


def test_unknown_gauge_lists_valid_ones():
    with pytest.raises(FuelsysInputError, match=r"gauge 35 is not in the ISO 9626 table; valid gauges: 34, 33"):
        tubing.needle_bore(35)
    with pytest.raises(FuelsysInputError, match="valid gauges"):
        tubing.needle_od(22.5)


def test_unknown_wall_class_lists_valid_ones():
    with pytest.raises(FuelsysInputError, match="valid: normal, thin, extra-thin, ultra-thin"):
        tubing.needle_bore(22, "heavy")


def test_wall_class_not_given_for_that_gauge():
    with pytest.raises(FuelsysInputError, match=r"extra-thin wall is not given for 30G.*23G\.\.14G"):
        tubing.needle_bore(30, "ETW")
    with pytest.raises(FuelsysInputError, match="measured bore"):
        tubing.needle_bore(22, "ultra-thin")


def test_bore_not_smaller_than_od_is_refused():
    with pytest.raises(FuelsysInputError, match="smaller than the tubing's outside diameter"):
        tubing.resolve_bore(22, bore=0.70e-3)
    with pytest.raises(FuelsysInputError, match="bore must be > 0"):
        tubing.resolve_bore(22, bore=-0.1e-3)
    with pytest.raises(FuelsysInputError, match="give a gauge"):
        tubing.resolve_bore()
