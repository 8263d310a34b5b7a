"""Spreadsheet functions for start gas: canister pressure of propane, butanes and LPG blends."""

from __future__ import annotations

from fuelsys.sheet.catalogue import Arg, Returns, spreadsheet_function
from fuelsys.sheet.decl import checked_temperature

_GAS_DOC = ("propane, butane, isobutane, or a blend lpg-XX-YY (propane/n-butane, % by mass) "
            "or lpg-XX-YY-iso (propane/isobutane, % by mass)")


@spreadsheet_function(
    name="FS_CANISTER_PRESSURE", category="gas",
    summary="Gauge pressure in a gas canister from the temperature of the liquid in it",
    args=[Arg("gas", "text", "-", _GAS_DOC),
          Arg("temp_c", "number", "°C", "temperature of the liquid in the canister", gt=-273.15),
          Arg("used_pct", "number", "% mass",
              "share of the canister's contents already drawn off as gas (canister upright)",
              default=0.0, low=0, high=99)],
    returns=Returns("number", "bar gauge",
                    "bubble-point pressure of the canister's liquid minus 1.01325 bar "
                    "(negative: below atmospheric, the gas will not flow out)", si="Pa abs"),
    source="saturation pressure from CoolProp reference equations of state (Lemmon et al. 2009 "
           "propane; Bücker & Wagner 2006 butanes); blends by the modified Raoult's law with a "
           "virial vapour phase (Smith, Van Ness & Abbott 2005, §14.1); liquid left after "
           "drawing gas by Rayleigh distillation (Rayleigh 1902)",
    si=True,
    example=("propane", 20),
)
def fs_canister_pressure(gas, T, drawn):
    from fuelsys.errors import FuelsysInputError
    from fuelsys.fuels.gases import get_gas

    try:
        fluid = get_gas(gas)
    except FuelsysInputError as exc:
        raise FuelsysInputError(f"gas: {exc}") from None
    if not all(k in ("propane", "n-butane", "isobutane") for k in fluid.components):
        raise FuelsysInputError(f"gas: {gas} is not a canister gas; use propane, butane, isobutane "
                                "or a blend lpg-XX-YY / lpg-XX-YY-iso")
    return fluid.canister_pressure(checked_temperature(fluid, T, "temp_c"), drawn)
