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
from fuelsys.vaporiser.constants import DEW_MARGIN_MIN_K, TURBULENCE_INTENSITY, VALIDITY, WET_SHARE
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
    return {"max_wet": max_wet, "max_wall": max_wall, "coking": coking, "oil": pts.m_liq * oil_w,
            "fuel_wet": fuel_wet}


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
    return {"tube_phi": tube_phi, "vap_phi": vap_phi_nodes, "X": X_nodes, "flam": flam_nodes, "lfl_phi": lfl_phi,
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


def verdicts(setup, pts, settings, vap, dew_margin, T_exit, nd, wet, drops, flame):
    """One verdict text per point: level, the reasons, then the cautions.

    The level follows what the march itself decides: whether the fuel is
    vaporised at the exit (equilibrium) with a margin over the dew point
    (:data:`DEW_MARGIN_MIN_K`), whether the wall heats at all, and flashback.
    Two checks that rest on simpler models than the march are reported as
    cautions and leave the level alone: the d²-law droplet life in the gas
    alone (the equilibrium march assumes evaporation as fast as the hot wall
    film gives it, so the two bracket the truth), and deposits on a wetted
    wall above :data:`COKING_LIMIT`, an assumed threshold.
    """
    N, has_fuel, coking_limit = setup.N, setup.has_fuel, settings.coking_limit
    survive, life, D0, t_res, wall_nodes = drops["survive"], drops["life"], drops["D0"], nd["time"][-1], nd["wall"]
    coking, max_wet, oil, fuel_wet = wet["coking"], wet["max_wet"], wet["oil"], wet["fuel_wet"]
    flashback, margin, flammable, X_exit = flame["flashback"], flame["margin"], flame["flammable"], flame["X"][-1]
    T_air = pts.Ta
    texts = []
    for i in range(N):
        reasons, cautions, level = [], [], 0
        if not has_fuel[i]:
            texts.append("no fuel: air only (exit %.0f °C)" % (T_exit[i] - T0_C))
            continue
        if np.all(wall_nodes[:, i] <= T_air[i]):
            reasons.append(f"wall (at most {np.max(wall_nodes[:, i]) - T0_C:.0f} °C) no hotter than the inlet air "
                           f"({T_air[i] - T0_C:.0f} °C): the tube adds no useful heat")
            level = max(level, 1)
        if vap[i] >= 1.0 - 1e-9:
            reasons.append(f"fully vaporised at the exit (equilibrium), {dew_margin[i]:.0f} K above the dew point")
        elif dew_margin[i] > 0:
            reasons.append(f"fuel vaporised at the exit (equilibrium) but {(1.0 - vap[i]) * 100:.2g} % held in the "
                           f"oil, {dew_margin[i]:.0f} K above the dew point")
        else:
            reasons.append(f"only {vap[i] * 100:.0f} % vaporised at the exit (equilibrium); "
                           f"exit {-dew_margin[i]:.0f} K below the dew point")
            level = max(level, 2 if vap[i] < 0.5 else 1)
        if 0 < dew_margin[i] < DEW_MARGIN_MIN_K:
            reasons.append(f"less than {DEW_MARGIN_MIN_K:.0f} K above the dew point: a colder day or more fuel "
                           "condenses fuel again")
            level = max(level, 1)
        if flashback[i]:
            reasons.append(f"flashback risk: velocity only {margin[i]:.2f} x the turbulent flame speed where "
                           "the mixture is flammable")
            level = 2
        elif flammable[i]:
            reasons.append(f"flammable mixture at the exit ({X_exit[i] * 100:.1f} % vapour), velocity "
                           f"{margin[i]:.1f} x flame speed")
        if survive[i]:
            life_txt = "never at exit conditions" if not np.isfinite(life[i]) else f"{life[i] * 1e3:.0f} ms"
            cautions.append(f"{D0[i] * 1e6:.0f} µm droplets in the gas alone would outlive the tube (life {life_txt} "
                            f"> residence {t_res[i] * 1e3:.1f} ms): the tube relies on the fuel film on its hot wall")
        else:
            reasons.append(f"{D0[i] * 1e6:.0f} µm droplets evaporate in {life[i] * 1e3:.1f} ms "
                           f"(residence {t_res[i] * 1e3:.1f} ms)")
        if coking[i]:
            liquid = ("fuel and oil" if fuel_wet[i] else "oil") if oil[i] > 0 else "liquid fuel"
            cautions.append(f"coking risk: wall wetted by {liquid} reaches {max_wet[i] - T0_C:.0f} °C "
                            f"(> {coking_limit - T0_C:.0f} °C, the assumed deposit threshold)")
        if oil[i] > 0:
            cautions.append(f"oil residue {oil[i] * 3.6e6:.2f} g/h leaves as liquid")
        text = ("good", "marginal", "poor")[level] + ": " + "; ".join(reasons)
        if cautions:
            text += "; cautions: " + "; ".join(cautions)
        texts.append(text)
    return texts
