"""Air into a vaporiser tube, and a plug-flow residence-time estimate.

References
----------
.. [1] A. H. Lefebvre, D. R. Ballal, "Gas Turbine Combustion", 3rd ed.,
   CRC Press 2010, ch. 4 (flow through liner holes).
.. [2] J. D. Anderson, "Modern Compressible Flow", 3rd ed., McGraw-Hill
   2003, ch. 5 (isentropic nozzle flow).
"""

from __future__ import annotations

import numpy as np

from fuelsys import thermo
from fuelsys.arrays import as_float as _out
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import checked_array
from fuelsys.vaporiser.constants import CD_TUBE_INLET, VALIDITY


def _orifice_incompressible(area, cd, p0, t0, dp_frac):
    rho = p0 / (thermo.R_AIR * t0)
    return cd * area * np.sqrt(2.0 * rho * dp_frac * p0)


def _orifice_compressible(area, cd, p0, t0, dp_frac):
    g = np.asarray(thermo.gamma(t0), dtype=float)
    crit = (2.0 / (g + 1.0)) ** (g / (g - 1.0))
    pr = np.maximum(1.0 - dp_frac, crit)  # choked below the critical ratio
    flux = np.sqrt(2.0 * g / ((g - 1.0) * thermo.R_AIR * t0) * (pr ** (2.0 / g) - pr ** ((g + 1.0) / g)))
    return cd * area * p0 * flux


#: methods of :func:`tube_air_flow`
AIR_FLOW_METHODS = {"compressible": _orifice_compressible, "incompressible": _orifice_incompressible}


def tube_air_flow(bore, liner_dp_fraction, case_pressure, t_air, cd=CD_TUBE_INLET, needle_od=0.0,
                  method="compressible"):
    """Air mass flow into one vaporiser tube from the liner pressure drop.

    The tube inlet is an orifice of area ``pi/4 (bore² - needle_od²)`` (a
    needle poking into the inlet blocks its own area) between the case at
    ``case_pressure`` and ``t_air`` and the liner at
    ``case_pressure (1 - liner_dp_fraction)``.

    * ``"compressible"`` (default): isentropic nozzle flow times ``cd``,
      ``m = cd A p0 sqrt(2 g/((g-1) R T0) (r^(2/g) - r^((g+1)/g)))``,
      ``r = 1 - dp/p0`` (choked at the critical ratio), g from the NASA
      polynomials of :mod:`fuelsys.thermo`;
    * ``"incompressible"``: ``m = cd A sqrt(2 rho dp)`` with the inlet density.

    Parameters
    ----------
    bore : array_like
        Tube inside diameter at the inlet [m]
    liner_dp_fraction : array_like
        Liner pressure drop as a fraction of the case pressure, e.g. 0.03 [-]
    case_pressure : array_like
        Case (compressor exit) pressure [Pa abs]
    t_air : array_like
        Case (compressor exit) air temperature [K]
    cd : array_like
        Discharge coefficient of the tube inlet; default 0.6, a plain
        sharp-edged inlet [-]
    needle_od : array_like
        Outside diameter of a needle inside the inlet, 0 if none [m]
    method : str
        "compressible" or "incompressible" [-]

    Returns
    -------
    float or ndarray
        Air mass flow into the tube [kg/s]

    Raises
    ------
    FuelsysInputError
        For a bore not larger than the needle, a pressure drop outside 0..1,
        a non-positive pressure or temperature, or an unknown method.

    Notes
    -----
    The discharge coefficient lumps the inlet contraction, the tube's
    friction and the exit dump; 0.6 is typical of a plain hole (Lefebvre &
    Ballal 2010, ch. 4, from memory).  Liner pressure drops of 2-6 % of the
    case pressure are usual in small engines (validity flagged outside
    0.5-15 %).

    References
    ----------
    .. [1] A. H. Lefebvre, D. R. Ballal, "Gas Turbine Combustion", 3rd ed.,
       CRC Press 2010, ch. 4 (flow through liner holes, m = Cd A (2 rho dp)^0.5).
    .. [2] J. D. Anderson, "Modern Compressible Flow", 3rd ed., McGraw-Hill
       2003, ch. 5 (isentropic nozzle flow).

    Examples
    --------
    >>> round(tube_air_flow(6e-3, 0.03, 3e5, 473.15) * 1e3, 2)
    3.33
    """
    if method not in AIR_FLOW_METHODS:
        raise FuelsysInputError(f"air-flow method must be one of {', '.join(AIR_FLOW_METHODS)} (got {method!r})")
    d = checked_array(bore, "tube bore", "mm", positive=True, scale=1e3)
    dn = np.asarray(needle_od, dtype=float)
    if np.any(~np.isfinite(dn)) or np.any(dn < 0):
        raise FuelsysInputError("needle outside diameter must be >= 0 [m]")
    if np.any(dn >= d):
        i = np.argmax(np.broadcast_to(dn >= d, np.broadcast(d, dn).shape))
        raise FuelsysInputError(
            f"tube bore {np.broadcast_to(d, np.broadcast(d, dn).shape).flat[i] * 1e3:g} mm must be larger than the "
            f"needle outside diameter {np.broadcast_to(dn, np.broadcast(d, dn).shape).flat[i] * 1e3:g} mm")
    dp = np.asarray(liner_dp_fraction, dtype=float)
    if np.any(~np.isfinite(dp)) or np.any(dp <= 0) or np.any(dp >= 1):
        bad = dp[~(np.isfinite(dp) & (dp > 0) & (dp < 1))].flat[0]
        raise FuelsysInputError(f"liner pressure drop must be > 0 and < 100 % of the case pressure "
                                f"(got {bad * 100:g} %)")
    p0 = checked_array(case_pressure, "case pressure", "bar abs", positive=True, scale=1e-5)
    t0 = checked_array(t_air, "air temperature", "K", positive=True)
    cd = checked_array(cd, "discharge coefficient", "", positive=True)
    if np.any(cd > 1):
        raise FuelsysInputError(f"discharge coefficient must be within 0..1 (got {np.max(cd):g})")
    low, high, unit = VALIDITY["tube_air_flow"]["liner_dp_fraction"]
    warn_validity("tube air flow (liner pressure drop)", "liner pressure drop fraction", dp, low, high, unit)
    area = 0.25 * np.pi * (d * d - dn * dn)
    return _out(AIR_FLOW_METHODS[method](area, cd, p0, t0, dp))


def residence_time_estimate(bore, heated_length, air_flow, fuel_flow, pressure, t_in, t_exit=None,
                            fuel_molar_mass=None):
    """Plug-flow residence time of the gas in a tube, from its end temperatures.

    The gas is air plus the fuel's vapour, an ideal gas at ``pressure``; its
    temperature rises linearly from ``t_in`` to ``t_exit`` along the tube
    and the fuel vaporises linearly from none at the inlet to all at the exit
    (liquid volume neglected).  ``t = integral A dx / Vdot(x)`` by
    8-point Gauss-Legendre quadrature.  For the residence time of a full
    march use :func:`vaporiser` instead.

    Parameters
    ----------
    bore : array_like
        Tube inside diameter [m]
    heated_length : array_like
        Tube length [m]
    air_flow : array_like
        Air mass flow through the tube [kg/s]
    fuel_flow : array_like
        Fuel mass flow into the tube, >= 0 [kg/s]
    pressure : array_like
        Pressure in the tube [Pa abs]
    t_in : array_like
        Gas temperature at the inlet [K]
    t_exit : array_like, optional
        Gas temperature at the exit; default ``t_in`` [K]
    fuel_molar_mass : float, optional
        Molar mass of the fuel vapour [kg/mol]; default the built-in
        kerosene's [kg/mol]

    Returns
    -------
    float or ndarray
        Residence time [s]

    References
    ----------
    Plug flow of an ideal gas, ``t = integral dx / u``; e.g. Turns 3rd ed.
    ch. 6 (plug-flow reactor residence time).

    Examples
    --------
    >>> round(residence_time_estimate(6e-3, 0.15, 4e-3, 0.0, 3e5, 473.15) * 1e3, 3)
    2.342
    """
    d = checked_array(bore, "tube bore", "mm", positive=True, scale=1e3)
    L = checked_array(heated_length, "heated length", "mm", positive=True, scale=1e3)
    ma = checked_array(air_flow, "air flow", "g/s", positive=True, scale=1e3)
    mf = np.asarray(fuel_flow, dtype=float)
    if np.any(~np.isfinite(mf)) or np.any(mf < 0):
        raise FuelsysInputError("fuel flow must be >= 0 [kg/s]")
    P = checked_array(pressure, "pressure", "bar abs", positive=True, scale=1e-5)
    t1 = checked_array(t_in, "inlet temperature", "K", positive=True)
    t2 = t1 if t_exit is None else checked_array(t_exit, "exit temperature", "K", positive=True)
    if fuel_molar_mass is None:
        from fuelsys.fuels import get_fuel

        fuel_molar_mass = get_fuel("kerosene").molar_mass
    mw = float(fuel_molar_mass)
    xg, wg = np.polynomial.legendre.leggauss(8)
    s = 0.5 * (xg + 1.0)
    shape = np.broadcast(d, L, ma, mf, P, t1, t2).shape
    s = s.reshape((8,) + (1,) * len(shape))
    T = t1 + (t2 - t1) * s
    moles = ma / thermo.M_AIR + s * mf / mw
    vdot = moles * thermo.R_MOLAR * T / P
    area = 0.25 * np.pi * d * d
    t = L * 0.5 * np.tensordot(wg, area / vdot, axes=(0, 0))
    return _out(t)

