"""Spreadsheet functions for needles, the ring manifold, fuel lines and bench tests.

Units at this face: bores and needle lengths in mm, line lengths in m,
pressures in bar (a difference, or "gauge" where the name says so), flows in
g/min (mass) or mL/min (volume at the fuel's temperature), temperatures in
°C.  The fuel is a built-in name or a fuel-table range; liquid fuels take an
optional ``oil_pct``.  ``entrance`` is the needle inlet: square (flush,
K 0.5), reentrant (protruding, 0.78), borda (thin edge far in, 1.0), rounded
(0.04), or a loss coefficient typed as a number.
"""

from __future__ import annotations

import warnings

import numpy as np

from fuelsys.errors import FuelsysInputError, ValidityWarning
from fuelsys.sheet.catalogue import Arg, Returns, from_si, spreadsheet_function
from fuelsys.sheet.decl import checked_temperature

_FUEL = Arg("fuel", "fuel", "-", "built-in fuel name (kerosene, water, ...) or a fuel table range")
_TEMP = Arg("temp_c", "number", "°C", "fuel temperature", gt=-273.15)
_OIL = Arg("oil_pct", "number", "% vol", "turbine oil mixed into the fuel", default=0.0, low=0, high=20,
           group=True)
_ENTRANCE = Arg("entrance", "text", "-", "needle inlet: square, reentrant, borda, rounded, or a loss "
                "coefficient", default="square")
_BORE = Arg("bore_mm", "number", "mm", "needle bore (inside diameter)", gt=0)
_LENGTH = Arg("length_mm", "number", "mm", "needle length", gt=0)
_GAUGE = Arg("gauge", "number", "-", "needle gauge number, 10..34 (ISO 9626)", integer=True)

_NEEDLE_SOURCE = ("dp = (K_entrance + 1 + f_app L/D) rho u^2/2: Shah (1978) developing laminar flow blended "
                  "into turbulent flow by Churchill (1977); entrance K from Crane TP-410 (2009) and Idelchik "
                  "(1996); drawn-tubing roughness 1.5 um (Moody 1944)")
_ISO_SOURCE = "ISO 9626:2016 Table 1 (values from memory, not checked against the printed standard)"


def _entrance(text):
    """A key of the entrance table, or a typed loss coefficient."""
    try:
        return float(text)
    except (TypeError, ValueError):
        return text


#: (fuel, oil share, temperature) -> (density, viscosity) of single-cell calls: a book asks for the
#: same fuel at the same temperature in many cells (the fuel object is the key, so it stays alive)
_PROPS_CACHE: dict = {}


def _props(fuel, T, oil_pct):
    """Liquid density [kg/m³] and viscosity [Pa·s] of the fuel (with oil) at T [K]."""
    if type(T) is float and getattr(type(fuel), "__hash__", None) is not None:
        key = (fuel, float(oil_pct or 0.0), T)
        hit = _PROPS_CACHE.get(key)
        if hit is None:
            hit = _props_now(fuel, T, oil_pct)
            if len(_PROPS_CACHE) > 4096:
                _PROPS_CACHE.clear()
            _PROPS_CACHE[key] = hit
        return hit
    return _props_now(fuel, T, oil_pct)


def _props_now(fuel, T, oil_pct):
    if getattr(fuel, "name", "") == "air":
        raise FuelsysInputError("fuel: air is a gas; the needle and line models are for liquids "
                                "(for a gas jet use FS_GAS_JET_FLOW)")
    f = fuel.with_oil(oil_pct) if oil_pct else fuel
    T = checked_temperature(f, T, "temp_c")
    return f.density(T), f.dynamic_viscosity(T)


@spreadsheet_function(
    name="FS_NEEDLE_BORE", category="needles and lines",
    summary="Minimum bore of needle tubing of a gauge and wall class (ISO 9626)",
    args=[_GAUGE,
          Arg("wall", "text", "-", "wall class: normal, thin, extra-thin (RW, TW, ETW)", default="normal")],
    returns=Returns("number", "mm", "the standard's minimum inside diameter; a measured bore is better",
                    decimals=9),
    source=_ISO_SOURCE,
    si=True,
    example=(25,),
)
def fs_needle_bore(gauge, wall):
    from fuelsys.flow.tubing import needle_bore

    return needle_bore(gauge, wall)


@spreadsheet_function(
    name="FS_NEEDLE_OD", category="needles and lines",
    summary="Outside diameter of needle tubing of a gauge (ISO 9626)",
    args=[_GAUGE,
          Arg("limit", "text", "-", "mid (middle of the allowed range), min, max or nominal", default="mid")],
    returns=Returns("number", "mm", "outside diameter", decimals=9),
    source=_ISO_SOURCE,
    si=True,
    example=(25,),
)
def fs_needle_od(gauge, limit):
    from fuelsys.flow.tubing import needle_od

    return needle_od(gauge, limit)


def _flow(D, L, dp, fuel, T, oil_pct, entrance):
    from fuelsys.flow.needle import needle_flow

    rho, mu = _props(fuel, T, oil_pct)
    return needle_flow(dp, D, L, rho, mu, entrance=_entrance(entrance)), rho


@spreadsheet_function(
    name="FS_NEEDLE_FLOW", category="needles and lines",
    summary="Mass flow through an injector needle at a pressure drop",
    args=[_BORE, _LENGTH, Arg("dp_bar", "number", "bar", "pressure drop across the needle", gt=0),
          _FUEL, _TEMP, _OIL, _ENTRANCE],
    returns=Returns("number", "g/min", "mass flow through the needle"),
    source=_NEEDLE_SOURCE,
    si=True,
    example=(0.3, 25, 2, "kerosene", 20),
)
def fs_needle_flow(D, L, dp, fuel, T, oil_pct, entrance):
    return _flow(D, L, dp, fuel, T, oil_pct, entrance)[0]


@spreadsheet_function(
    name="FS_NEEDLE_FLOW_ML", category="needles and lines",
    summary="Volume flow through an injector needle at a pressure drop (at the fuel temperature)",
    args=[_BORE, _LENGTH, Arg("dp_bar", "number", "bar", "pressure drop across the needle", gt=0),
          _FUEL, _TEMP, _OIL, _ENTRANCE],
    returns=Returns("number", "mL/min", "volume flow through the needle, at the fuel's temperature"),
    source=_NEEDLE_SOURCE,
    si=True,
    example=(0.3, 25, 2, "kerosene", 20),
)
def fs_needle_flow_ml(D, L, dp, fuel, T, oil_pct, entrance):
    m, rho = _flow(D, L, dp, fuel, T, oil_pct, entrance)
    return m / rho


def _dp(D, L, mdot, fuel, T, oil_pct, entrance):
    from fuelsys.flow.needle import needle_dp

    rho, mu = _props(fuel, T, oil_pct)
    return needle_dp(mdot(rho), D, L, rho, mu, entrance=_entrance(entrance))


@spreadsheet_function(
    name="FS_NEEDLE_DP", category="needles and lines",
    summary="Pressure drop across an injector needle passing a mass flow",
    args=[_BORE, _LENGTH, Arg("flow_g_min", "number", "g/min", "mass flow through the needle", gt=0),
          _FUEL, _TEMP, _OIL, _ENTRANCE],
    returns=Returns("number", "bar", "pressure drop from the manifold to the space the jet enters"),
    source=_NEEDLE_SOURCE,
    si=True,
    example=(0.3, 25, 10, "kerosene", 20),
)
def fs_needle_dp(D, L, mdot, fuel, T, oil_pct, entrance):
    return _dp(D, L, lambda rho: mdot, fuel, T, oil_pct, entrance)


@spreadsheet_function(
    name="FS_NEEDLE_DP_ML", category="needles and lines",
    summary="Pressure drop across an injector needle passing a volume flow (at the fuel temperature)",
    args=[_BORE, _LENGTH, Arg("flow_ml_min", "number", "mL/min", "volume flow through the needle", gt=0),
          _FUEL, _TEMP, _OIL, _ENTRANCE],
    returns=Returns("number", "bar", "pressure drop from the manifold to the space the jet enters"),
    source=_NEEDLE_SOURCE,
    si=True,
    example=(0.3, 25, 12, "kerosene", 20),
)
def fs_needle_dp_ml(D, L, Q, fuel, T, oil_pct, entrance):
    return _dp(D, L, lambda rho: rho * Q, fuel, T, oil_pct, entrance)


@spreadsheet_function(
    name="FS_NEEDLE_REYNOLDS", category="needles and lines",
    summary="Reynolds number of the flow in a needle bore",
    args=[_BORE, Arg("flow_g_min", "number", "g/min", "mass flow through the needle", gt=0), _FUEL, _TEMP, _OIL],
    returns=Returns("number", "-", "Reynolds number 4 m / (pi D mu); laminar below about 2000"),
    source="definition (Reynolds 1883); viscosity from the fuel model",
    si=True,
    example=(0.3, 10, "kerosene", 20),
)
def fs_needle_reynolds(D, mdot, fuel, T, oil_pct):
    from fuelsys.flow.needle import needle_reynolds

    _, mu = _props(fuel, T, oil_pct)
    return needle_reynolds(mdot, D, mu)


@spreadsheet_function(
    name="FS_NEEDLE_VELOCITY", category="needles and lines",
    summary="Mean velocity in a needle bore (the jet velocity)",
    args=[_BORE, Arg("flow_g_min", "number", "g/min", "mass flow through the needle", gt=0), _FUEL, _TEMP, _OIL],
    returns=Returns("number", "m/s", "mean velocity 4 m / (rho pi D^2)"),
    source="continuity; density from the fuel model",
    si=True,
    example=(0.3, 10, "kerosene", 20),
)
def fs_needle_velocity(D, mdot, fuel, T, oil_pct):
    from fuelsys.flow.needle import needle_velocity

    rho, _ = _props(fuel, T, oil_pct)
    return needle_velocity(mdot, D, rho)


@spreadsheet_function(
    name="FS_BORE_FROM_TEST", category="needles and lines",
    summary="Effective bore of a needle from a bench test (volume collected in a time at a pressure)",
    args=[Arg("volume_ml", "number", "mL", "volume collected from the needle", gt=0),
          Arg("time_s", "number", "s", "collection time", gt=0),
          Arg("dp_bar", "number", "bar", "test pressure drop across the needle", gt=0),
          _LENGTH,
          Arg("fluid", "fuel", "-", "test liquid: water, kerosene or a fuel table range"),
          Arg("temp_c", "number", "°C", "test liquid temperature", gt=-273.15),
          _ENTRANCE],
    returns=Returns("number", "mm", "the bore with which the needle model passes the measured flow"),
    source=f"inverse of the needle model on bore (Chandrupatla 1997 root search); {_NEEDLE_SOURCE}",
    si=True,
    example=(10, 60, 1, 25, "water", 20),
)
def fs_bore_from_test(volume, time, dp, L, fluid, T, entrance):
    from fuelsys.flow.bench import bench_mass_flow, effective_bore

    rho, mu = _props(fluid, T, 0.0)
    return effective_bore(bench_mass_flow(volume, time, rho), dp, L, rho, mu, entrance=_entrance(entrance))


@spreadsheet_function(
    name="FS_ODD_NEEDLES", category="needles and lines",
    summary="Each needle's flow against the set's median, flagging the odd ones",
    args=[Arg("flows", "range", "-", "flows (or volumes collected in the same time) of the needles of a set, all in one unit",
              gt=0),
          Arg("threshold_pct", "number", "%", "allowed deviation from the median", default=5.0, gt=0)],
    returns=Returns("table", "%", "one row per needle: deviation from the median [%] and ok / ODD"),
    source="deviation from the set's median (a robust centre: Hampel et al. 1986)",
    si=True,
    example=([[10.0], [10.2], [11.5], [9.9]],),
)
def fs_odd_needles(flows, threshold):
    from fuelsys.flow.bench import odd_needles

    dev, odd = odd_needles(flows, threshold)
    return [[float(d), "ODD" if o else "ok"] for d, o in zip(dev, odd)]


@spreadsheet_function(
    name="FS_MANIFOLD_SPLIT", category="needles and lines",
    summary="Flow of each needle round a ring manifold fed at one point",
    args=[Arg("bores_mm", "range", "mm", "bore of each needle, in order round the ring from the feed", gt=0),
          Arg("length_mm", "range", "mm", "needle length: one value for all, or one per needle", gt=0),
          Arg("supply_bar_gauge", "number", "bar gauge", "pressure at the ring's feed point"),
          Arg("case_bar_gauge", "number", "bar gauge", "pressure the needles discharge into"),
          Arg("ring_bore_mm", "number", "mm", "inside diameter of the ring tube", gt=0),
          Arg("ring_dia_mm", "number", "mm", "diameter of the ring's centre line", gt=0),
          _FUEL, _TEMP, _OIL, _ENTRANCE],
    returns=Returns("table", "g/min", "a column: the mass flow of each needle, in the order given"),
    source=("node and loop balances of the ring network solved by Newton's method (Jeppson 1976); ring "
            f"friction Churchill (1977); needles: {_NEEDLE_SOURCE}"),
    si=True,
    example=([[0.3], [0.31], [0.3], [0.29]], 25, 3, 1, 2, 60, "kerosene", 20),
)
def fs_manifold_split(bores, lengths, p_supply, p_case, ring_bore, ring_dia, fuel, T, oil_pct, entrance):
    from fuelsys.flow.manifold import ring_manifold

    if lengths.size not in (1, bores.size):
        raise FuelsysInputError(f"length_mm must hold one value or one per needle ({bores.size}); "
                                f"got {lengths.size}")
    rho, mu = _props(fuel, T, oil_pct)
    r = ring_manifold(bores, lengths, p_supply, p_case, ring_bore, ring_dia, float(rho), float(mu),
                      entrance=_entrance(entrance))
    return [[float(q)] for q in r.flows]


# ID tolerance of hypodermic tubing by gauge, US/Stubs nominal sizes (Wikipedia "Needle gauge comparison
# chart"): +-0.003 in (76.2 µm) for 7..14G, +-0.0015 in (38.1 µm) for 15..19G, +-0.00075 in (19.05 µm)
# for 20G and finer; as (finest gauge of the band, tolerance [m]).
_BORE_TOL = ((14, 76.2e-6), (19, 38.1e-6), (99, 19.05e-6))


def _default_bore_tol(gauge: int) -> float:
    """The usual ID tolerance [m] of hypodermic tubing of ``gauge`` [-]."""
    return next(tol for last, tol in _BORE_TOL if gauge <= last)


@spreadsheet_function(
    name="FS_TOLERANCE_SPREAD", category="needles and lines",
    summary="Spread of flows between the needles of a set from bore and length tolerances",
    args=[_GAUGE,
          Arg("wall", "text", "-", "wall class: normal, thin, extra-thin"),
          Arg("needles", "number", "-", "needles in one set (one engine)", integer=True, low=2, high=200),
          _LENGTH,
          Arg("dp_bar", "number", "bar", "pressure drop every needle sees", gt=0),
          _FUEL, _TEMP,
          Arg("bore_tol_mm", "number", "mm", "bore tolerance, half-width of the band; empty: the usual ID "
              "tolerance of hypodermic tubing for the gauge", default=None, low=0),
          Arg("length_tol_mm", "number", "mm", "length tolerance, half-width of the band", default=0.0, low=0),
          Arg("samples", "number", "-", "sets drawn (samples x needles at most 1e6)", default=2000, integer=True,
              low=1, high=100000),
          Arg("seed", "number", "-", "seed of the random draw (same seed, same result)", default=1, integer=True,
              low=0),
          Arg("oil_pct", "number", "% vol", "turbine oil mixed into the fuel", default=0.0, low=0, high=20),
          Arg("bore_mm", "number", "mm", "nominal bore of the set (measured, or the bore the sheet uses); empty: "
              "the ISO 9626 minimum plus the tolerance", default=None, gt=0)],
    returns=Returns("table", "-", "labelled rows: nominal and mean flow [g/min], spread between needles "
                    "(CV) [%], worst low and high needle [%], bore sensitivity, validity"),
    source=("Monte Carlo with numpy's PCG64 stream, deviations uniform within the bands, bores centred "
            "bore_tol above the ISO 9626 minimum; default ID tolerance of hypodermic tubing from the needle "
            f"gauge comparison chart (Wikipedia); needle model: {_NEEDLE_SOURCE}"),
    si=True,
    example=(25, "normal", 8, 25, 2, "kerosene", 20),
)
def fs_tolerance_spread(gauge, wall, needles, L, dp, fuel, T, bore_tol, length_tol, samples, seed, oil_pct, D):
    from fuelsys.flow.tolerance import tolerance_study
    from fuelsys.flow.tubing import needle_bore, od_range

    g = int(gauge)
    if int(samples) * int(needles) > 1_000_000:
        raise FuelsysInputError(f"samples x needles must be at most 1e6 (got {int(samples) * int(needles):g})")
    tol = _default_bore_tol(g) if bore_tol is None else float(bore_tol)
    # bore_min is the nominal bore less one tolerance: the band then reaches down to it
    bore_min = needle_bore(g, wall) if D is None else float(D) - tol
    if bore_min <= 0:
        raise FuelsysInputError(f"bore_tol_mm ({from_si(tol, 'mm'):g} mm) must be smaller than bore_mm "
                                f"({from_si(D, 'mm'):g} mm)")
    rho, mu = _props(fuel, T, oil_pct)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ValidityWarning)
        r = tolerance_study(bore_min + tol, L, dp, float(rho), float(mu), int(needles), tol, length_tol,
                            samples=int(samples), seed=int(seed), od_min=od_range(g)[0])
    notes = sorted({str(w.message).split(":")[0] for w in caught if issubclass(w.category, ValidityWarning)})
    for w in caught:  # shown in the table's validity row, and passed on to FS_NOTES and recalc --notes
        warnings.warn(w.message, w.category, stacklevel=2)
    rows = [
        ("nominal bore", bore_min + tol, "mm"),
        ("bore tolerance", tol, "mm"),
        ("nominal flow per needle", r["nominal_flow"], "g/min"),
        ("mean flow per needle", r["mean_flow"], "g/min"),
        ("spread between needles (CV), mean of sets", r["cv_mean"], "%"),
        ("spread between needles (CV), 95th percentile", r["cv_p95"], "%"),
        ("worst low needle, typical set", r["low_typical"], "%"),
        ("worst high needle, typical set", r["high_typical"], "%"),
        ("worst low needle, all sets", r["low_worst"], "%"),
        ("worst high needle, all sets", r["high_worst"], "%"),
        ("flow sensitivity to bore (d ln q / d ln D)", r["bore_sensitivity"], "-"),
        ("sets drawn", float(int(samples)), "-"),
    ]
    return [[label, from_si(value, unit), unit] for label, value, unit in rows] + [
        ["validity", "ok" if not notes else "outside range: " + "; ".join(notes), "-"]]


@spreadsheet_function(
    name="FS_LINE_DP", category="needles and lines",
    summary="Pressure drop of a fuel line: tube friction plus fittings, filter and valves",
    args=[Arg("bore_mm", "number", "mm", "inside diameter of the line", gt=0),
          Arg("length_m", "number", "m", "line length", gt=0),
          Arg("flow_g_min", "number", "g/min", "mass flow in the line", gt=0),
          _FUEL, _TEMP,
          Arg("k_total", "number", "-", "sum of loss coefficients of fittings, filter and valves", default=0.0,
              low=0),
          _OIL],
    returns=Returns("number", "bar", "pressure drop of the line"),
    source="dp = (f L/D + K) rho u^2/2, f from Churchill (1977) all regimes, drawn-tubing roughness 1.5 um "
           "(Moody 1944); loss coefficients as in Crane TP-410 (2009)",
    si=True,
    example=(2.5, 0.8, 100, "kerosene", 20, 8),
)
def fs_line_dp(D, L, mdot, fuel, T, k_total, oil_pct):
    from fuelsys.flow.lines import line_dp

    rho, mu = _props(fuel, T, oil_pct)
    return line_dp(mdot, D, L, rho, mu, k_total=k_total)
