"""Margins and verdict of one call: wetted wall and coking, flammability and flashback, validity flags.

References
----------
.. [1] A. H. Lefebvre, D. R. Ballal, "Gas Turbine Combustion", 3rd ed.,
   CRC Press 2010 (vaporisers).
.. [2] M. G. Zabetakis, US Bureau of Mines Bulletin 627 (1965) (flammability limits).
"""

from __future__ import annotations

import numpy as np

from fuelsys import heat, thermo
from fuelsys.fuels.base import T0_C
from fuelsys.vaporiser._common import family, flag, oil_share
from fuelsys.vaporiser._march import gas_props
from fuelsys.vaporiser.constants import BULK_FUEL_LIMIT, DEW_MARGIN_MIN_K, TURBULENCE_INTENSITY, VALIDITY, WET_SHARE
from fuelsys.vaporiser.flame import FLAME_SPEED_METHODS, FLAME_SPEED_SURROGATE, flammability_limits


def wetted_wall(setup, pts, nd, coking_limit):
    """Hottest wetted wall, hottest wall, coking flag and the oil left as liquid.

    Wetted: more than :data:`WET_SHARE` of the fuel still liquid there, or
    oil in the fuel (the oil never vaporises, so it wets the whole tube).
    """
    has_fuel, volatile = setup.has_fuel, setup.volatile
    oil_w = oil_share(pts.fuel)
    xv_nodes, wall_nodes, mid_wall = nd["xv"], nd["wall"], nd["mid_wall"]
    wet_oil = has_fuel & (oil_w > 0)
    liquid_nodes = has_fuel[None, :] & ((xv_nodes < volatile * (1.0 - WET_SHARE)) | wet_oil[None, :])
    liquid_mid = has_fuel[None, :] & ((nd["mid_xv"] < volatile * (1.0 - WET_SHARE)) | wet_oil[None, :])
    fuel_wet = has_fuel & np.any(xv_nodes < volatile * (1.0 - WET_SHARE), axis=0)
    wet = np.concatenate([np.where(liquid_nodes, wall_nodes, -np.inf), np.where(liquid_mid, mid_wall, -np.inf)])
    max_wet = wet.max(axis=0)
    max_wet = np.where(np.isfinite(max_wet), max_wet, np.nan)
    max_wall = np.maximum(wall_nodes.max(axis=0), mid_wall.max(axis=0))
    coking = np.where(np.isfinite(max_wet), max_wet > coking_limit, False)
    # liquid fuel (not oil alone) is at the mixture's temperature in the equilibrium march
    fuel_liquid = has_fuel[None, :] & (xv_nodes < volatile * (1.0 - WET_SHARE))
    bulk = np.where(fuel_liquid, nd["T"], -np.inf).max(axis=0)
    return {"max_wet": max_wet, "max_wall": max_wall, "coking": coking, "oil": pts.m_liq * oil_w,
            "fuel_wet": fuel_wet, "bulk": np.where(np.isfinite(bulk), bulk, np.nan)}


def flame_margins(setup, pts, nd, flame_speed_method):
    """Equivalence ratios, flammability along the tube, flame speeds and the flashback margin."""
    fuel, has_fuel, N = pts.fuel, setup.has_fuel, setup.N
    T_nodes, P_nodes, u_nodes, Re_nodes = nd["T"], nd["P"], nd["u"], nd["Re"]
    far, stoich, M_fuel = setup.far, setup.stoich, setup.M_fuel
    yv_nodes = far[None, :] * nd["xv"]
    tube_phi = np.where(has_fuel, far / stoich, 0.0) if np.any(has_fuel) else np.zeros(N)
    vap_phi_nodes = (far[None, :] * nd["xv"]) / stoich if np.any(has_fuel) else np.zeros_like(T_nodes)
    X_nodes = (yv_nodes / M_fuel) / (yv_nodes / M_fuel + 1.0 / thermo.M_AIR)
    if np.any(has_fuel):
        lfl, ufl = flammability_limits(fuel, T_nodes, check=False)
        lfl, ufl = np.asarray(lfl), np.asarray(ufl)
        flam_nodes = has_fuel[None, :] & (X_nodes >= lfl) & (X_nodes <= ufl)
        to_phi = (M_fuel / thermo.M_AIR) / stoich
        lfl_phi = lfl[-1] / (1.0 - lfl[-1]) * to_phi
        ufl_phi = ufl[-1] / (1.0 - ufl[-1]) * to_phi
        fam = FLAME_SPEED_SURROGATE.get(family(fuel), "isooctane")
        _, raw, table = FLAME_SPEED_METHODS[flame_speed_method]
        if fam not in table:
            fam = "isooctane"
        sl_nodes = np.where(flam_nodes, raw(np.maximum(vap_phi_nodes, 1e-6), T_nodes, P_nodes, fam), 0.0)
    else:
        flam_nodes = np.zeros_like(T_nodes, dtype=bool)
        lfl_phi = ufl_phi = np.full(N, np.nan)
        sl_nodes = np.zeros_like(T_nodes)
    # Re_nodes (n+1, N): the inlet, then each step's midpoint
    inten = np.where(Re_nodes > heat.RE_LAMINAR,
                     TURBULENCE_INTENSITY[0] * np.maximum(Re_nodes, 1.0) ** TURBULENCE_INTENSITY[1], 0.0)
    st_nodes = np.where(flam_nodes, sl_nodes + inten * u_nodes, 0.0)
    with np.errstate(divide="ignore"):
        ratio = np.where(flam_nodes & (st_nodes > 0), u_nodes / np.where(st_nodes > 0, st_nodes, 1.0), np.inf)
    margin = ratio.min(axis=0)
    vlo, vhi, _ = VALIDITY["gulder_1984" if flame_speed_method == "gulder" else "metghalchi_keck_1982"]["phi"]
    at = np.argmin(ratio, axis=0)
    phi_at = vap_phi_nodes[at, np.arange(N)] if vap_phi_nodes.ndim == 2 else np.zeros(N)
    estimate = np.isfinite(margin) & ((phi_at < vlo) | (phi_at > vhi))
    return {"estimate": estimate, "tube_phi": tube_phi, "vap_phi": vap_phi_nodes, "X": X_nodes, "flam": flam_nodes,
            "lfl_phi": lfl_phi,
            "ufl_phi": ufl_phi, "sl": sl_nodes, "st": st_nodes, "margin": margin,
            "flashback": np.isfinite(margin) & (margin < 1.0), "flammable": flam_nodes[-1]}


def validity_flags(setup, pts, nd, T_exit, flame, flame_speed_method, flags):
    """Flag, per point, the correlations used outside their ranges along the march."""
    fuel, has_fuel = pts.fuel, setup.has_fuel
    T_nodes, wall_nodes, Re_all = nd["T"], nd["wall"], nd["Re"]
    if pts.inner is None:
        _, cpg_all, mu_all, k_all = gas_props(setup.ctx, nd["pr"])
        Pr_all = cpg_all * mu_all / k_all
        flag(flags, np.any((Pr_all < 0.5) | (Pr_all > 2000), axis=0), "Prandtl number outside 0.5..2000")
        turb = Re_all > heat.RE_TURBULENT
        flag(flags, np.any(turb & (Re_all > 5e6), axis=0), "Reynolds number above 5e6 (Gnielinski)")
        ratio_tw = T_nodes / np.maximum(wall_nodes, 1.0)
        flag(flags, np.any(turb & (ratio_tw < 0.5), axis=0),
             "wall more than twice the gas temperature (property-ratio correction)")
        flag(flags, np.any(T_nodes > heat.VALIDITY["sutherland_viscosity_air"]["T"][1], axis=0),
             "gas above 1000 K (Sutherland air properties)")
    vlo, vhi, _ = VALIDITY["gulder_1984" if flame_speed_method == "gulder" else "metghalchi_keck_1982"]["phi"]
    vap_phi_nodes = flame["vap_phi"]
    flag(flags, np.any(flame["flam"] & ((vap_phi_nodes < vlo) | (vap_phi_nodes > vhi)), axis=0),
         f"flame speed extrapolated outside phi {vlo:g}..{vhi:g}")
    tlo, thi, _ = VALIDITY["flammability_limits"]["T"]
    flag(flags, has_fuel & ((T_exit < tlo) | (T_exit > thi)), "flammability limits extrapolated in temperature")
    if family(fuel) == "kerosene" and np.any(has_fuel) and not str(getattr(fuel, "name", "")).lower().startswith(
            "kerosene"):
        flag(flags, has_fuel, "flame speed and flammability from kerosene-type data")
    if np.any(has_fuel) and np.any(T_exit > float(fuel.t_max)):
        flag(flags, has_fuel & (T_exit > float(fuel.t_max)),
             f"exit above the liquid-property range of {fuel.name} ({float(fuel.t_max) - T0_C:.0f} °C)")
    flag(flags, setup.mach_in > 0.3, "inlet Mach number above 0.3 (compressibility neglected in the march)")


def level_of(vap, dew_margin):
    """0/1/2 (good/marginal/poor) from the exit's vaporised share and dew margin alone."""
    level = np.where(dew_margin <= 0, np.where(vap < 0.5, 2, 1), 0)
    return np.where((dew_margin > 0) & (dew_margin < DEW_MARGIN_MIN_K), 1, level)


def _reason(i, ex, flame, wall_nodes, T_air):
    """(level, the one decisive reason) of point i."""
    vap, dm, lo, hi = ex["vap"][i], ex["dew_margin"][i], ex["dew_low"][i], ex["dew_high"][i]
    if flame["flashback"][i]:
        est = " (flame speed an estimate)" if flame["estimate"][i] else ""
        return 2, f"flashback risk: velocity {flame['margin'][i]:.2f} x the turbulent flame speed{est}"
    if np.all(wall_nodes[:, i] <= T_air[i]):
        return 2 if dm <= 0 and vap < 0.5 else 1, "wall no hotter than the inlet air: the tube adds no heat"
    if dm <= 0 and vap < 0.5:
        return 2, f"only {vap * 100:.0f} % vaporised at the exit, {-dm:.0f} K below the dew point"
    if dm <= 0:
        return 1, f"{vap * 100:.0f} % vaporised at the exit, {-dm:.0f} K below the dew point"
    if ex["flips"][i]:
        return 1, f"dew margin {lo:.0f} to {hi:.0f} K within the heat-transfer uncertainty: verdict flips"
    if dm < DEW_MARGIN_MIN_K:
        return 1, f"only {dm:.0f} K above the dew point (under {DEW_MARGIN_MIN_K:.0f} K)"
    what = "fully vaporised" if vap >= 1.0 - 1e-9 else "fuel vaporised (some held in the oil)"
    return 0, f"{what}, {lo:.0f} to {hi:.0f} K above the dew point"


def verdicts(setup, pts, settings, ex, nd, wet, drops, flame):
    """One short verdict per point (good / marginal / poor and the one decisive reason), and its cautions.

    The level follows what the march decides: vaporised share and margin
    over the dew point (:data:`DEW_MARGIN_MIN_K`) at the nominal heat
    transfer and at both ends of its uncertainty (a level that differs
    between the ends is "marginal"), whether the wall heats at all, and
    flashback.  Checks resting on simpler models or assumed thresholds are
    cautions, each given only where its own condition holds: droplets that
    would outlive the tube in the gas alone (d²-law), a wetted wall above
    the deposit threshold, liquid fuel heated above the bulk thermal-stability
    limit (:data:`BULK_FUEL_LIMIT`), and oil leaving as liquid.
    """
    N, has_fuel, coking_limit = setup.N, setup.has_fuel, settings.coking_limit
    survive, life, D0, t_res = drops["survive"], drops["life"], drops["D0"], nd["time"][-1]
    texts, cautions = [], []
    for i in range(N):
        if not has_fuel[i]:
            texts.append("good: no fuel, air only (exit %.0f °C)" % (ex["T"][i] - T0_C))
            cautions.append("")
            continue
        level, reason = _reason(i, ex, flame, nd["wall"], pts.Ta)
        texts.append(("good", "marginal", "poor")[level] + ": " + reason)
        c = []
        if survive[i]:
            life_txt = "never at exit conditions" if not np.isfinite(life[i]) else f"{life[i] * 1e3:.0f} ms"
            c.append(f"{D0[i] * 1e6:.0f} µm droplets in the gas alone outlive the tube (life {life_txt} > residence "
                     f"{t_res[i] * 1e3:.1f} ms): it relies on the fuel film on its hot wall")
        if wet["coking"][i]:
            oil = wet["oil"][i]
            liquid = ("fuel and oil" if wet["fuel_wet"][i] else "oil") if oil > 0 else "liquid fuel"
            c.append(f"coking risk: wall wetted by {liquid} reaches {wet['max_wet'][i] - T0_C:.0f} °C "
                     f"(> {coking_limit - T0_C:.0f} °C, the assumed deposit threshold)")
        if wet["bulk"][i] > BULK_FUEL_LIMIT:
            c.append(f"liquid fuel heated to {wet['bulk'][i] - T0_C:.0f} °C, above the "
                     f"{BULK_FUEL_LIMIT - T0_C:.0f} °C bulk thermal-stability limit")
        if wet["oil"][i] > 0:
            c.append(f"oil residue {wet['oil'][i] * 3.6e6:.2f} g/h leaves as liquid")
        cautions.append("; ".join(c))
    return texts, cautions
