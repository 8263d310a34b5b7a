"""Small helpers shared inside the vaporiser package: input checks, per-point flags, fuel keys."""

from __future__ import annotations

import numpy as np

from fuelsys.constants import T0_C
from fuelsys.errors import FuelsysInputError


def family(fuel) -> str:
    """Key of a fuel (object or name) in the flame-speed and flammability tables (kerosene-type by default)."""
    name = (fuel if isinstance(fuel, str) else str(getattr(fuel, "name", ""))).lower()
    for key in ("isobutane", "butane", "propane", "lpg", "methane"):
        if name.startswith(key):
            return key
    return "kerosene"


def as_points(shape, *arrays):
    return [np.broadcast_to(np.asarray(a, dtype=float), shape).reshape(-1).copy() for a in arrays]


def oil_share(fuel):
    """Mass fraction of non-volatile oil in the fuel as pumped [kg/kg] (0 for a plain fuel)."""
    for name in ("oil_mass_share",):
        val = getattr(fuel, name, None)
        if val is not None:
            return float(val)
    return 0.0


def flags_for(N):
    return [[] for _ in range(N)]


def flag(flags, mask, text):
    for i in np.flatnonzero(mask):
        if text not in flags[i]:
            flags[i].append(text)



def require_within(name, value, low, high, why):
    """``value`` [K] as a float array; refuse NaN and values outside ``low..high`` [K], naming the range in °C."""
    v = np.asarray(value, dtype=float)
    ok = np.isfinite(v) & (v >= low) & (v <= high)
    if not np.all(ok):
        bad = v[~ok].flat[0]
        raise FuelsysInputError(f"{name} must be within {low - T0_C:.1f}..{high - T0_C:.1f} °C, {why} "
                                f"(got {bad - T0_C:g} °C)")
    return v
