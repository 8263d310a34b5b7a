"""Spreadsheet functions for fuel properties: liquid properties, phase behaviour, heating value.

Temperatures in °C, pressures in bar abs, fuel/air ratios in kg fuel per kg
air; the fuel is a built-in name or a fuel-table range.  Liquid fuels take an
optional ``oil_pct`` (turbine oil, % by volume, 0..20) where the oil matters.
"""

from __future__ import annotations

import numpy as np

from fuelsys.errors import FuelsysInputError
from fuelsys.sheet.catalogue import Arg, Returns, spreadsheet_function
from fuelsys.sheet.decl import checked_temperature

_FUEL = Arg("fuel", "fuel", "-", "built-in fuel name (kerosene, propane, butane, ...) or a fuel table range")
_TEMP = Arg("temp_c", "number", "°C", "fuel temperature", gt=-273.15)
_OIL = Arg("oil_pct", "number", "% vol", "turbine oil mixed into the fuel", default=0.0, low=0, high=20,
           group=True)
_P = Arg("p_bar_abs", "number", "bar abs", "pressure", gt=0)

_PETROLEUM = ("liquid fuels: pseudo-components from the D86 curve (Riazi-Daubert 1986 D86->TBP; "
              "Riazi-Daubert 1987 Tc, Pc, M; Riazi 2005 ASTM MNL50)")
_GASES = "gases: CoolProp reference equations of state"



def _named(name, fn, *args):
    """Run ``fn``; a FuelsysInputError message gets the argument's name in front."""
    try:
        return fn(*args)
    except FuelsysInputError as exc:
        text = str(exc)
        raise FuelsysInputError(text if text.startswith(name) else f"{name}: {text}") from None


@spreadsheet_function(
    name="FS_DENSITY", category="fuel",
    summary="Liquid density of a fuel at a temperature",
    args=[_FUEL, _TEMP, _OIL],
    returns=Returns("number", "kg/m³", "liquid density (saturated liquid for gases)"),
    source=f"{_PETROLEUM}: Rackett equation with Spencer & Danner (1972) Z_RA, calibrated to the "
           f"density at 15 °C; oil by volume-additive mixing; {_GASES}",
    si=True,
    example=("kerosene", 20),
)
def fs_density(fuel, T, oil_pct):
    f = fuel.with_oil(oil_pct)
    return f.density(checked_temperature(f, T, "temp_c"))


@spreadsheet_function(
    name="FS_VISCOSITY", category="fuel",
    summary="Kinematic viscosity of a liquid fuel at a temperature",
    args=[_FUEL, _TEMP, _OIL],
    returns=Returns("number", "mm²/s", "kinematic viscosity of the liquid"),
    source="Walther equation (ASTM D341) through the fuel's two viscosity points; oil by the Refutas "
           f"blending number (Baird 1989); {_GASES}",
    si=True,
    example=("kerosene", 20),
)
def fs_viscosity(fuel, T, oil_pct):
    f = fuel.with_oil(oil_pct)
    return f.kinematic_viscosity(checked_temperature(f, T, "temp_c"))


@spreadsheet_function(
    name="FS_SPECIFIC_HEAT", category="fuel",
    summary="Specific heat of a liquid fuel at a temperature",
    args=[_FUEL, _TEMP, _OIL],
    returns=Returns("number", "kJ/(kg·K)", "isobaric specific heat of the liquid"),
    source=f"{_PETROLEUM}: Kesler & Lee (1976) liquid heat capacity; oil by Cragoe (1929), mass average; "
           f"{_GASES}",
    si=True,
    example=("kerosene", 20),
)
def fs_specific_heat(fuel, T, oil_pct):
    f = fuel.with_oil(oil_pct)
    return f.specific_heat(checked_temperature(f, T, "temp_c"))


@spreadsheet_function(
    name="FS_CONDUCTIVITY", category="fuel",
    summary="Thermal conductivity of a liquid fuel at a temperature",
    args=[_FUEL, _TEMP],
    returns=Returns("number", "W/(m·K)", "thermal conductivity of the liquid"),
    source=f"{_PETROLEUM}: Riazi & Faghri (1985) at the mean average boiling point; {_GASES}",
    si=True,
    example=("kerosene", 20),
)
def fs_conductivity(fuel, T):
    return fuel.conductivity(checked_temperature(fuel, T, "temp_c"))


@spreadsheet_function(
    name="FS_SURFACE_TENSION", category="fuel",
    summary="Surface tension of a liquid fuel against air at a temperature",
    args=[_FUEL, _TEMP],
    returns=Returns("number", "mN/m", "surface tension"),
    source=f"{_PETROLEUM}: API Technical Data Book procedure 10A3.2; {_GASES}",
    si=True,
    example=("kerosene", 20),
)
def fs_surface_tension(fuel, T):
    return fuel.surface_tension(checked_temperature(fuel, T, "temp_c"))


@spreadsheet_function(
    name="FS_VAPOUR_PRESSURE", category="fuel",
    summary="True vapour (bubble-point) pressure of a fuel at a temperature",
    args=[_FUEL, _TEMP],
    returns=Returns("number", "bar abs", "bubble-point pressure of the liquid"),
    source=f"{_PETROLEUM}: Lee & Kesler (1975) vapour pressure of each pseudo-component, "
           f"Raoult's law; {_GASES}",
    si=True,
    example=("kerosene", 150),
)
def fs_vapour_pressure(fuel, T):
    return fuel.vapour_pressure(checked_temperature(fuel, T, "temp_c"))


@spreadsheet_function(
    name="FS_LATENT_HEAT", category="fuel",
    summary="Heat of vaporisation of a fuel at a temperature",
    args=[_FUEL, _TEMP],
    returns=Returns("number", "kJ/kg", "heat of vaporisation, liquid to vapour at the temperature"),
    source=f"{_PETROLEUM}: Riedel (1954) at each pseudo-component's boiling point, Watson (1943) "
           f"scaling; {_GASES}",
    si=True,
    example=("kerosene", 150),
)
def fs_latent_heat(fuel, T):
    return fuel.latent_heat(checked_temperature(fuel, T, "temp_c"))


@spreadsheet_function(
    name="FS_BUBBLE_POINT", category="fuel",
    summary="Temperature at which a liquid fuel starts to boil at a pressure",
    args=[_FUEL, _P],
    returns=Returns("number", "°C", "bubble-point temperature (no air)"),
    source=f"{_PETROLEUM}: Raoult's law with Lee & Kesler (1975) vapour pressures; {_GASES}",
    si=True,
    example=("kerosene", 1.01325),
)
def fs_bubble_point(fuel, P):
    return _named("p_bar_abs", fuel.bubble_point, P)


@spreadsheet_function(
    name="FS_DEW_POINT", category="fuel",
    summary="Temperature above which a fuel's vapour, alone or mixed with air, stays all vapour",
    args=[_FUEL, _P,
          Arg("fuel_air_ratio", "number", "kg/kg", "fuel/air mass ratio of a fuel-air mixture; "
              "empty for the fuel's own vapour", default=None, gt=0)],
    returns=Returns("number", "°C", "dew-point temperature"),
    source=f"{_PETROLEUM}: Raoult's and Dalton's laws with Lee & Kesler (1975) vapour pressures, "
           f"air as an inert carrier; {_GASES}",
    si=True,
    example=("kerosene", 3, 0.05),
)
def fs_dew_point(fuel, P, far):
    if far is None:
        return _named("p_bar_abs", fuel.dew_point, P)
    return _named("p_bar_abs", fuel.dew_point, P, far)


@spreadsheet_function(
    name="FS_VAPOUR_FRACTION", category="fuel",
    summary="Share of a fuel that is vapour at equilibrium with air at a temperature and pressure",
    args=[_FUEL, Arg("temp_c", "number", "°C", "temperature of the fuel-air mixture", gt=-273.15), _P,
          Arg("fuel_air_ratio", "number", "kg/kg", "fuel/air mass ratio", gt=0)],
    returns=Returns("number", "0-1 by mass", "equilibrium vaporised mass fraction of the fuel"),
    source=f"{_PETROLEUM}: Raoult's law with air as an inert carrier, Rachford & Rice (1952) flash; "
           f"{_GASES}",
    si=True,
    example=("kerosene", 150, 3, 0.05),
)
def fs_vapour_fraction(fuel, T, P, far):
    try:
        return fuel.vapour_fraction(T, P, far)
    except FuelsysInputError as exc:
        text = str(exc)
        name = "temp_c" if text.startswith("temperature") else "p_bar_abs" if "ressure" in text else \
            "fuel_air_ratio" if "fuel/air" in text else "fuel"
        raise FuelsysInputError(f"{name}: {text}") from None


@spreadsheet_function(
    name="FS_HEATING_VALUE", category="fuel",
    summary="Lower heating value of a fuel",
    args=[_FUEL],
    returns=Returns("number", "MJ/kg", "lower (net) heating value"),
    source="the fuel's own data; otherwise Cragoe (1929) from its density (liquids) or heats of "
           "formation (gases)",
    si=True,
    example=("kerosene",),
)
def fs_heating_value(fuel):
    return float(fuel.lhv)


@spreadsheet_function(
    name="FS_STOICH_FAR", category="fuel",
    summary="Stoichiometric fuel/air ratio of a fuel in dry air",
    args=[_FUEL],
    returns=Returns("number", "kg/kg", "kg of fuel per kg of air for complete combustion"),
    source="combustion stoichiometry from the fuel's hydrogen content (given, or Riazi & Daubert 1987 "
           "C/H ratio) or formula; dry air of Lemmon et al. (2000)",
    si=True,
    example=("kerosene",),
)
def fs_stoich_far(fuel):
    return float(fuel.stoich_far)


@spreadsheet_function(
    name="FS_FUEL_INFO", category="fuel",
    summary="Table describing a fuel: its data, the characterisation and the sources",
    args=[_FUEL],
    returns=Returns("table", "-", "two columns: label (with its unit) and value"),
    source="the fuel's data and characterisation (see FS_DENSITY and the other fuel functions)",
    si=True,
    example=("kerosene",),
)
def fs_fuel_info(fuel):
    rows = []
    for label, value, unit in fuel.info():
        lab = f"{label} [{unit}]" if unit and unit != "-" else str(label)
        if isinstance(value, (int, float, np.floating, np.integer)) and not isinstance(value, bool):
            value = float(value)
        else:
            value = str(value)
        rows.append([lab, value])
    return rows
