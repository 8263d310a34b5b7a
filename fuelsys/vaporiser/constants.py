"""Settings and limits of the vaporiser-tube model, each with its source or its status.

Numerical settings of the march (steps, table nodes, tolerances), the
defaults of the wall and inlet models, the thresholds behind the verdict
and the validity ranges of the package's own correlations.
"""

from __future__ import annotations

from fuelsys.fuels.base import P_ATM, T0_C

#: number of axial steps of the march (default); the step-doubling estimate uses half of it
N_STEPS = 40
#: temperature nodes of the per-point enthalpy tables used to invert H -> T in the march:
#: (nodes up to just above the dew point, least number of nodes from there to the hottest wall)
N_TABLE = (48, 16)
#: the dense part of the table ends this far above the mixture's dew point [K]
TABLE_KNEE_K = 20.0
#: largest node spacing of the table above the knee [K]
TABLE_UPPER_STEP_K = 5.0
#: a blend's nodes are flashed up to this far above the knee (fuel dissolved in the oil) [K]
TABLE_FLASH_SPAN_K = 150.0
#: default discharge coefficient of a plain tube inlet (Lefebvre & Ballal 2010, ch. 4: plain holes
#: about 0.6 at low bleed; from memory)
CD_TUBE_INLET = 0.6
#: JFTOT test temperature of ASTM D3241 / specification limit of ASTM D1655 (Jet A-1).  That test
#: heats the bulk fuel, it is no wall-coking threshold: here it is an assumption, a conservative
#: temperature above which a fuel-wetted wall may build deposits; it gives a caution, not a verdict [K]
COKING_LIMIT = 260.0 + T0_C
#: highest bulk temperature of liquid kerosene-type fuel before its thermal stability suffers: 163 °C (325 °F),
#: the bulk-fuel limit of JP-8 / Jet A-1 that the US Air Force's JP-8+100 additive raised by 100 °F (Heneghan
#: et al., "JP-8+100: the development of high-thermal-stability jet fuel", J. Energy Eng. 122 (1996); from
#: memory).  ASTM D3241's 260 °C is the heated-tube (wall) temperature of the test, used by COKING_LIMIT [K]
BULK_FUEL_LIMIT = 163.0 + T0_C
#: relative uncertainty of the inner heat-transfer coefficient: Gnielinski (1976) reports about 90 % of the
#: data within +-20 % (from memory); the verdict is computed at both ends [-]
HTC_UNCERTAINTY = 0.2
#: smallest gas/wall temperature ratio of the property-ratio correction's fit (heated gas, Tw/Tb <= 2; Kays &
#: Crawford, Convective Heat and Mass Transfer 3rd ed., ch. 13, from memory): beyond it the band's upper end
#: drops the correction [-]
PROPERTY_RATIO_MIN = 0.5
#: exit temperature margin over the dew point below which the tube is judged marginal: a colder day
#: or a richer setting condenses fuel again (common practice, no source) [K]
DEW_MARGIN_MIN_K = 10.0
#: fuel-vapour heat capacities are taken at no more than this temperature (the vapour ranges of the fuel
#: models end here; a mixture inside a vaporiser tube stays far below it) [K]
T_VAPOUR_CP_MAX = 1500.0
#: highest inlet Mach number the low-speed march accepts [-]; above 0.3 the result is flagged
MACH_LIMIT = 0.7
#: share of the fuel still liquid above which a wall counts as wetted by fuel [-]
WET_SHARE = 1e-3
#: tolerance on the step-doubling estimate of the exit temperature before the march is flagged [K]
STEP_TOLERANCE_K = 0.5
#: tolerance on the energy balance (wall heat against enthalpy rise) before the march is flagged [-]
ENERGY_TOLERANCE = 0.005
#: default wall emissivity for the flame-side model: oxidised stainless steel (from memory)
WALL_EMISSIVITY = 0.7
#: default wall conductivity: austenitic stainless steel near 600 K, Incropera & DeWitt 6th ed.
#: Table A.1 (AISI 304: 18.3 W/(m K) at 600 K) [W/(m K)]
WALL_CONDUCTIVITY = 18.3
#: default wall thickness for the flame-side model [m] (common practice, no source: 0.5 mm tube wall)
WALL_THICKNESS = 0.5e-3
#: turbulence intensity in the tube core, u'/U = 0.16 Re^-1/8 (common practice, no source)
TURBULENCE_INTENSITY = (0.16, -0.125)

#: validity ranges of the module's own correlations: name -> {quantity: (low, high, unit)}
VALIDITY = {
    "metghalchi_keck_1982": {"phi": (0.8, 1.5, "-"), "T": (298.0, 700.0, "K"), "P": (0.4 * P_ATM, 50 * P_ATM, "Pa")},
    # Gülder's data set (from memory)
    "gulder_1984": {"phi": (0.7, 1.4, "-"), "T": (300.0, 700.0, "K"), "P": (0.1e6, 0.8e6, "Pa")},
    # Zabetakis temperature correction fitted from ambient to a few hundred °C (Crowl & Louvar)
    "flammability_limits": {"T": (273.15, 573.15, "K")},
    "tube_air_flow": {"liner_dp_fraction": (0.005, 0.15, "-")},
}
#: default bend radius of a return-bend vaporiser, over its bore (our assumption)
BEND_R_OVER_D = 2.0

# -- bounds of the inputs (issue: no input may make memory or time grow without limit) ---------------------
#: lowest temperature of the gas model: the NASA polynomials of fuelsys.thermo start at 200 K (McBride et al.,
#: NASA/TP-2002-211556) [K]
T_GAS_MIN = 200.0
#: highest temperature of the gas model (NASA polynomials, 6000 K): the flame side's gas temperature [K]
T_GAS_MAX = 6000.0
#: highest inlet-air and wall temperature of the march: the top of the fuel vapour's heat capacities [K]
T_MARCH_MAX = T_VAPOUR_CP_MAX
#: most axial steps per leg, and most nodes per piece of the enthalpy tables [-]
N_STEPS_MAX = 2000
N_TABLE_MAX = 2000
#: most nodes of a table's upper part: past it the spacing widens instead (the span the temperature bounds
#: allow, 200-6000 K at TABLE_UPPER_STEP_K, needs 1160) [-]
TABLE_UPPER_MAX = 1200
