"""Engine operating points from idle to full speed: case pressure, air flow, fuel demand.

Floor: the engine's parts (uses thermo and the ground floor).

The builder gives a design point (full speed, its pressure ratio, air flow,
turbine-inlet temperature, optionally thrust) and, where measured, a table of
speed, case pressure, air flow, exit temperatures and thrust.  A measured
value always takes precedence over the similarity laws; the table is
interpolated linearly in speed and flagged outside its range.

Laws used when a quantity is not measured (each a function named after its
method, dispatched through a documented default):

* case pressure ratio over speed -- :func:`pressure_ratio_euler` (default):
  Euler's turbine equation with a constant slip factor, power-input factor and
  isentropic efficiency gives an ideal enthalpy rise proportional to the tip
  speed squared, Δh_s ∝ U² ∝ N²; the pressure ratio follows from that
  isentropic enthalpy rise with temperature-dependent air properties.
  :func:`pressure_ratio_rise_n_squared` is its low-pressure-ratio limit,
  (PR - 1) ∝ N², which overstates mid-speed pressure (the fan law with
  constant density);
* air flow -- :func:`air_flow_proportional_to_speed`: similar velocity
  triangles at constant flow coefficient, ṁ ∝ ρ₁ N;
* compressor-exit temperature -- :func:`compressor_exit_temperature` from
  the pressure ratio and an isentropic efficiency;
* turbine-inlet temperature -- the builder's design T4 held over the line
  (``"constant"``, default), or :func:`turbine_inlet_choked_nozzle` (nozzle
  guide vanes choked, ṁ √T4 / p3 constant), which is only as good as the air
  flow fed to it: use it with measured air flows, since with ṁ ∝ N it sends
  T4 up at idle;
* fuel demand -- :func:`fuel_air_ratio_energy_balance`: steady-flow energy
  balance between T3 and T4 with NASA Glenn ideal-gas properties of air and
  lean products (:mod:`fuelsys.thermo`), the fuel's lower heating value and a
  combustion efficiency defined as theoretical over actual fuel/air ratio.

References
----------
.. [1] H. I. H. Saravanamuttoo, G. F. C. Rogers, H. Cohen and P. V.
   Straznicky, "Gas Turbine Theory", 6th ed., Pearson 2009: §2.3 (combustion
   efficiency, fuel/air ratio), §4.2 eq. (4.7)-(4.8) (centrifugal
   compressor work from Euler's equation with slip and power-input factors),
   §8.2 (choked turbine nozzle in off-design matching).
.. [2] S. L. Dixon and C. A. Hall, "Fluid Mechanics and Thermodynamics of
   Turbomachinery", 7th ed., Butterworth-Heinemann 2014, §1.8-1.9
   (similarity, flow coefficient).
"""

from __future__ import annotations

import numpy as np

from fuelsys import thermo
from fuelsys.constants import P_ISA, T_ISA
from fuelsys.errors import FuelsysInputError, require, warn_validity
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array


# -- pressure ratio over speed ------------------------------------------------
def pressure_ratio_euler(speed_fraction, pr_design, t_inlet=T_ISA):
    """Compressor pressure ratio at a fraction of design speed, Euler scaling.

    With constant slip factor σ, power-input factor ψ and isentropic
    efficiency η, the ideal (isentropic) enthalpy rise is η ψ σ U², so it
    scales as (N/N_design)².  The design pressure ratio fixes the constant;
    the pressure ratio at another speed is the one whose isentropic enthalpy
    rise from ``t_inlet`` is that scaled value (variable cp of air).

    Parameters
    ----------
    speed_fraction : array_like
        Shaft speed over design speed N/N_design [-]
    pr_design : array_like
        Total pressure ratio at design speed [-]
    t_inlet : array_like
        Compressor inlet total temperature [K]

    Returns
    -------
    float or ndarray
        Total pressure ratio p3/p1 [-]

    References
    ----------
    Saravanamuttoo et al., "Gas Turbine Theory", 6th ed. (2009), §4.2,
    eq. (4.7)-(4.8); air properties McBride, Zehe & Gordon (2002).

    Examples
    --------
    >>> round(pressure_ratio_euler(1.0, 3.0), 6)
    3.0
    >>> round(pressure_ratio_euler(0.5, 3.0), 3)
    1.361
    """
    n = checked_array(speed_fraction, "speed fraction", "-")
    require(n >= 0, "speed fraction must be >= 0")
    pr = checked_array(pr_design, "design pressure ratio", "-", positive=True)
    require(pr >= 1, f"design pressure ratio must be >= 1 (got {np.min(pr):g})")
    t1 = checked_array(t_inlet, "inlet temperature", "K", positive=True)
    h1 = np.asarray(thermo.enthalpy(t1))
    t2s_design = np.asarray(thermo.isentropic_temperature(t1, pr))
    dh_design = np.asarray(thermo.enthalpy(t2s_design)) - h1
    dh = dh_design * n**2
    t2s = np.asarray(thermo.temperature_from_enthalpy(h1 + dh, t_guess=400.0))
    s_rise = _entropy_air(t2s) - _entropy_air(t1)
    return _out(np.exp(s_rise / thermo.R_AIR))


def _entropy_air(T):
    """Standard-state entropy of dry air s°(T) [J/(kg K)] (ideal mixture, no mixing term)."""
    T = np.asarray(T, dtype=float)
    s = sum(thermo.Y_AIR[i] * np.asarray(thermo.molar_entropy(sp, T)) / thermo.MOLAR_MASS[sp]
            for i, sp in enumerate(thermo.SPECIES) if thermo.Y_AIR[i] > 0)
    return np.asarray(s)


def pressure_ratio_rise_n_squared(speed_fraction, pr_design, t_inlet=T_ISA):
    """Compressor pressure ratio with the pressure rise proportional to speed squared.

    (PR - 1) = (PR_design - 1) (N/N_design)²: the fan law at constant density
    (incompressible limit of Euler's equation).  Kept for comparison and for
    builders who fit it to their own engine; ``t_inlet`` is not used.

    Parameters
    ----------
    speed_fraction : array_like
        Shaft speed over design speed N/N_design [-]
    pr_design : array_like
        Total pressure ratio at design speed [-]
    t_inlet : array_like
        Compressor inlet total temperature, unused by this law [K]

    Returns
    -------
    float or ndarray
        Total pressure ratio p3/p1 [-]

    References
    ----------
    Fan laws, Dixon & Hall (2014) §1.9; Saravanamuttoo et al. (2009) §4.2.

    Examples
    --------
    >>> pressure_ratio_rise_n_squared(0.5, 3.0)
    1.5
    """
    n = checked_array(speed_fraction, "speed fraction", "-")
    require(n >= 0, "speed fraction must be >= 0")
    pr = checked_array(pr_design, "design pressure ratio", "-", positive=True)
    require(pr >= 1, f"design pressure ratio must be >= 1 (got {np.min(pr):g})")
    return _out(1.0 + (pr - 1.0) * n**2)


#: pressure-ratio laws by name; the default is "euler"
PRESSURE_RATIO_LAWS = {"euler": pressure_ratio_euler, "rise_n_squared": pressure_ratio_rise_n_squared}


def pressure_ratio(speed_fraction, pr_design, t_inlet=T_ISA, method="euler"):
    """Compressor pressure ratio over speed by a named similarity law.

    Parameters
    ----------
    speed_fraction : array_like
        Shaft speed over design speed [-]
    pr_design : array_like
        Total pressure ratio at design speed [-]
    t_inlet : array_like
        Compressor inlet total temperature [K]
    method : str
        "euler" (default, :func:`pressure_ratio_euler`) or "rise_n_squared"
        (:func:`pressure_ratio_rise_n_squared`) [-]

    Returns
    -------
    float or ndarray
        Total pressure ratio [-]

    References
    ----------
    See the two laws.

    Examples
    --------
    >>> round(pressure_ratio(0.5, 3.0, method="rise_n_squared"), 3)
    1.5
    """
    try:
        law = PRESSURE_RATIO_LAWS[method]
    except KeyError:
        raise FuelsysInputError(
            f"pressure-ratio law {method!r} unknown; allowed: {', '.join(PRESSURE_RATIO_LAWS)}") from None
    return law(speed_fraction, pr_design, t_inlet)


#: speed fraction above which the pressure-ratio law is an extrapolation beyond the design point [-]
OVERSPEED_LIMIT = 1.05


def case_pressure(speed_fraction, pr_design, p_ambient=P_ISA, t_inlet=T_ISA, method="euler"):
    """Case (compressor delivery) pressure over speed, gauge.

    The casing around the combustor sees the compressor delivery pressure
    (diffuser exit, dynamic head mostly recovered); gauge pressure is
    p_ambient (PR - 1).

    Parameters
    ----------
    speed_fraction : array_like
        Shaft speed over design speed [-]
    pr_design : array_like
        Total pressure ratio at design speed [-]
    p_ambient : array_like
        Ambient (compressor inlet) pressure [Pa abs]
    t_inlet : array_like
        Compressor inlet temperature [K]
    method : str
        Pressure-ratio law, see :func:`pressure_ratio` [-]

    Returns
    -------
    float or ndarray
        Case pressure [Pa gauge]

    References
    ----------
    Saravanamuttoo et al. (2009) §4.2; see :func:`pressure_ratio`.

    Examples
    --------
    >>> round(case_pressure(1.0, 2.5) / 1e5, 3)
    1.52
    """
    pa = checked_array(p_ambient, "ambient pressure", "Pa", positive=True)
    # the similarity law scales from the design point; above design speed it extrapolates
    warn_validity("compressor similarity law", "speed / design speed", speed_fraction, 0.0, OVERSPEED_LIMIT, "-")
    return _out(pa * (np.asarray(pressure_ratio(speed_fraction, pr_design, t_inlet, method)) - 1.0))


# -- air flow, temperatures ----------------------------------------------------
def air_flow_proportional_to_speed(speed_fraction, air_flow_design, density_ratio=1.0):
    """Air mass flow at constant flow coefficient: ṁ ∝ ρ₁ N.

    Parameters
    ----------
    speed_fraction : array_like
        Shaft speed over design speed [-]
    air_flow_design : array_like
        Air mass flow at design speed [kg/s]
    density_ratio : array_like
        Inlet air density over its value at the design point [-]

    Returns
    -------
    float or ndarray
        Air mass flow [kg/s]

    References
    ----------
    Dixon & Hall (2014) §1.8-1.9: similar velocity triangles keep the flow
    coefficient c_x/U constant, so volume flow ∝ N.

    Examples
    --------
    >>> air_flow_proportional_to_speed(0.5, 0.2)
    0.1
    """
    n = checked_array(speed_fraction, "speed fraction", "-")
    require(n >= 0, "speed fraction must be >= 0")
    m = checked_array(air_flow_design, "design air flow", "kg/s", positive=True)
    return _out(m * n * checked_array(density_ratio, "density ratio", "-", positive=True))


def compressor_exit_temperature(t_inlet, pr, efficiency):
    """Compressor exit total temperature from the pressure ratio and isentropic efficiency.

    h3 = h1 + (h3s - h1) / η, with h3s the enthalpy after isentropic
    compression to ``pr`` (variable cp of air).

    Parameters
    ----------
    t_inlet : array_like
        Inlet total temperature [K]
    pr : array_like
        Total pressure ratio [-]
    efficiency : array_like
        Total-to-total isentropic efficiency, 0 < η <= 1 [-]

    Returns
    -------
    float or ndarray
        Exit total temperature T3 [K]

    References
    ----------
    Saravanamuttoo et al. (2009) §2.2, eq. (2.3) (with variable specific
    heats, Appendix A); air properties McBride, Zehe & Gordon (2002).

    Examples
    --------
    >>> round(compressor_exit_temperature(288.15, 3.0, 0.75), 1)
    429.1
    """
    t1 = checked_array(t_inlet, "inlet temperature", "K", positive=True)
    pr = checked_array(pr, "pressure ratio", "-", positive=True)
    require(pr >= 1, f"pressure ratio must be >= 1 for a compressor (got {np.min(pr):g})")
    eta = checked_array(efficiency, "compressor efficiency", "-", positive=True)
    require(eta <= 1, f"compressor efficiency must be within 0..1 (got {np.max(eta):g})")
    h1 = np.asarray(thermo.enthalpy(t1))
    h3s = np.asarray(thermo.enthalpy(thermo.isentropic_temperature(t1, pr)))
    return thermo.temperature_from_enthalpy(h1 + (h3s - h1) / eta, t_guess=450.0)


#: the choked-nozzle T4 law is trusted down to this fraction of the design delivery pressure; below it the
#: nozzle of a small turbojet has unchoked (common practice, no source) [-]
CHOKED_P3_FRACTION = 0.8


def turbine_inlet_choked_nozzle(t4_design, p3, p3_design, air_flow, air_flow_design):
    """Turbine-inlet temperature with the nozzle guide vanes choked.

    A choked nozzle passes a fixed non-dimensional flow ṁ √T4 / p3, so
    T4 = T4_design (p3 ṁ_design / (p3_design ṁ))².  The law holds only while
    the nozzle stays choked, near the design point: small turbojets' nozzles
    unchoke at part speed, where the law no longer holds and, with a rough air-flow
    law, gives implausible (even rising) T4.  Points where p3 falls below
    :data:`CHOKED_P3_FRACTION` of the design value, or where the result
    exceeds the design T4, are flagged with a :class:`ValidityWarning`; a
    measured exhaust or turbine-inlet temperature takes precedence.

    Parameters
    ----------
    t4_design : array_like
        Turbine-inlet temperature at design [K]
    p3 : array_like
        Compressor delivery pressure [Pa abs]
    p3_design : array_like
        Compressor delivery pressure at design [Pa abs]
    air_flow : array_like
        Air mass flow [kg/s]
    air_flow_design : array_like
        Air mass flow at design [kg/s]

    Returns
    -------
    float or ndarray
        T4 [K]

    References
    ----------
    Saravanamuttoo et al. (2009) §8.2 (flow compatibility with a choked
    turbine, ṁ√T03/p03 constant).

    Examples
    --------
    >>> round(turbine_inlet_choked_nozzle(1100.0, 2e5, 3e5, 0.1, 0.15), 1)
    1100.0
    """
    t4d = checked_array(t4_design, "design turbine-inlet temperature", "K", positive=True)
    p3 = checked_array(p3, "delivery pressure", "Pa", positive=True)
    p3d = checked_array(p3_design, "design delivery pressure", "Pa", positive=True)
    m = checked_array(air_flow, "air flow", "kg/s", positive=True)
    md = checked_array(air_flow_design, "design air flow", "kg/s", positive=True)
    t4 = t4d * (p3 * md / (p3d * m)) ** 2
    warn_validity("choked-nozzle T4 law", "delivery pressure / design", p3 / p3d, CHOKED_P3_FRACTION, np.inf, "-")
    warn_validity("choked-nozzle T4 law", "T4 / design T4", t4 / t4d, 0.0, 1.0, "-")
    return _out(t4)


# -- energy balance --------------------------------------------------------------
def fuel_air_ratio_energy_balance(t3, t4, lhv, h_to_c, efficiency=1.0, h_fuel=0.0):
    """Fuel/air ratio that heats air from T3 to T4, steady-flow energy balance.

    Per kg of air, with sensible enthalpies relative to 298.15 K (the
    reference of the heating value)::

        h_air(T3) + f h_fuel + f LHV = h_air(T4) + f Σ ν_i h_i(T4)

    where ν_i (kg of species i made per kg of fuel, O2 negative) turn air into
    lean products.  Solved for the theoretical f; the combustion efficiency
    η_b = f_theoretical / f_actual then gives the fuel actually needed.

    Parameters
    ----------
    t3 : array_like
        Combustor inlet (compressor exit) temperature [K]
    t4 : array_like
        Combustor exit (turbine inlet) temperature [K]
    lhv : array_like
        Lower heating value of the fuel at 298.15 K [J/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]
    efficiency : array_like
        Combustion efficiency η_b, 0 < η_b <= 1 [-]
    h_fuel : array_like
        Sensible enthalpy of the fuel as it enters, relative to liquid at
        298.15 K [J/kg]

    Returns
    -------
    float or ndarray
        Fuel/air mass ratio [kg/kg]

    Raises
    ------
    FuelsysInputError
        When T4 is not above T3, or T4 needs a mixture richer than
        stoichiometric.

    References
    ----------
    Saravanamuttoo et al. (2009) §2.3 (combustion temperature rise and
    efficiency); gas properties McBride, Zehe & Gordon (2002).

    Examples
    --------
    >>> round(fuel_air_ratio_energy_balance(450.0, 1000.0, 43.0e6, 1.94), 4)
    0.0144
    """
    t3 = checked_array(t3, "t3 (compressor exit temperature)", "K", positive=True)
    t4 = checked_array(t4, "t4 (turbine inlet temperature)", "K", positive=True)
    if np.any(t4 <= t3):
        b = np.broadcast_arrays(t3, t4)
        i = np.flatnonzero(np.ravel(b[1] <= b[0]))[0]
        raise FuelsysInputError(
            f"t4 must be above t3 for the combustor to add heat (got t4 {np.ravel(b[1])[i] - 273.15:.1f} °C"
            f" <= t3 {np.ravel(b[0])[i] - 273.15:.1f} °C)")
    lhv = checked_array(lhv, "lower heating value", "J/kg", positive=True)
    eta = checked_array(efficiency, "combustion efficiency", "-", positive=True)
    require(eta <= 1, f"combustion efficiency must be within 0..1 (got {np.max(eta):g})")
    hf = checked_array(h_fuel, "fuel sensible enthalpy", "J/kg")
    h_to_c = np.asarray(h_to_c, dtype=float)
    nu = thermo.products_per_kg_fuel(h_to_c)
    hs4 = thermo.species_sensible_enthalpy(t4)
    nd = max(nu.ndim, hs4.ndim)
    nu = nu.reshape(5, *([1] * (nd - nu.ndim)), *nu.shape[1:])
    hs4 = hs4.reshape(5, *([1] * (nd - hs4.ndim)), *hs4.shape[1:])
    dh_products = np.sum(nu * hs4, axis=0)
    num = np.asarray(thermo.enthalpy(t4)) - np.asarray(thermo.enthalpy(t3))
    far_theory = num / (lhv + hf - dh_products)
    far = far_theory / eta
    stoich = np.asarray(thermo.stoichiometric_far(h_to_c))
    if np.any(far_theory > stoich):
        raise FuelsysInputError(
            f"t4 {float(np.max(t4)) - 273.15:.0f} °C needs more fuel than the stoichiometric mixture "
            f"(fuel/air {float(np.max(far_theory)):.4f} > {float(np.min(stoich)):.4f}); allowed: a lean combustor")
    return _out(far)


def fuel_flow(air_flow, t3, t4, lhv, h_to_c, efficiency=1.0, h_fuel=0.0):
    """Fuel mass flow for an air flow heated from T3 to T4.

    Parameters
    ----------
    air_flow : array_like
        Air mass flow through the combustor [kg/s]
    t3 : array_like
        Compressor exit temperature [K]
    t4 : array_like
        Turbine inlet temperature [K]
    lhv : array_like
        Lower heating value [J/kg]
    h_to_c : array_like
        Molar hydrogen/carbon ratio of the fuel [-]
    efficiency : array_like
        Combustion efficiency [-]
    h_fuel : array_like
        Sensible enthalpy of the entering fuel relative to 298.15 K [J/kg]

    Returns
    -------
    float or ndarray
        Fuel mass flow [kg/s]

    References
    ----------
    :func:`fuel_air_ratio_energy_balance`.

    Examples
    --------
    >>> round(fuel_flow(0.25, 450.0, 1000.0, 43.0e6, 1.94) * 60000, 1)  # g/min
    216.3
    """
    m = checked_array(air_flow, "air flow", "kg/s", positive=True)
    return _out(m * np.asarray(fuel_air_ratio_energy_balance(t3, t4, lhv, h_to_c, efficiency, h_fuel)))


# -- the operating line ------------------------------------------------------------
#: measured-table columns (SI) and their meaning
TABLE_COLUMNS = {
    "speed": "shaft speed [rpm]",
    "case_pressure": "case pressure [Pa gauge]",
    "air_flow": "air mass flow [kg/s]",
    "t3": "compressor exit temperature [K]",
    "t4": "turbine inlet temperature [K]",
    "thrust": "thrust [N]",
}

T4_LAWS = ("constant", "choked_nozzle")


def _table_value(table, key, speed):
    col = table.get(key)
    if col is None:
        return None
    s = np.asarray(table["speed"], dtype=float)
    v = np.asarray(col, dtype=float)
    if v.shape != s.shape:
        raise FuelsysInputError(f"measured table: column {key} has {v.size} values, speed has {s.size}")
    return np.interp(speed, s, v)


def _check_table(table):
    if "speed" not in table:
        raise FuelsysInputError("measured table needs a 'speed' column [rpm]")
    unknown = set(table) - set(TABLE_COLUMNS)
    if unknown:
        raise FuelsysInputError(
            f"measured table: unknown column(s) {', '.join(sorted(unknown))}; allowed: {', '.join(TABLE_COLUMNS)}")
    s = np.asarray(table["speed"], dtype=float)
    if s.ndim != 1 or s.size < 2 or np.any(~np.isfinite(s)) or np.any(np.diff(s) <= 0):
        raise FuelsysInputError("measured table: speed needs at least 2 finite values in rising order [rpm]")
    for k, v in table.items():
        a = np.asarray(v, dtype=float)
        if np.any(~np.isfinite(a)):
            raise FuelsysInputError(f"measured table: column {k} holds a value that is not a finite number")
    return s


def operating_line(speed, design_speed, pr_design, air_flow_design, t4_design, *, lhv, h_to_c,
                   compressor_efficiency=0.72, combustion_efficiency=0.95, p_ambient=P_ISA,
                   t_ambient=T_ISA, thrust=None, table=None, pr_method="euler", t4_law="constant",
                   t4=None, h_fuel=0.0):
    """Operating points along the line from idle to full speed.

    Each quantity comes from the measured ``table`` where it holds that
    column (interpolated in speed; a ValidityWarning outside its speed range),
    else from the similarity laws of this module scaled from the design point.

    Parameters
    ----------
    speed : array_like
        Shaft speeds [rpm]
    design_speed : float
        Design (full) speed [rpm]
    pr_design : float
        Compressor total pressure ratio at design speed [-]
    air_flow_design : float
        Air mass flow at design speed [kg/s]
    t4_design : float
        Turbine-inlet temperature at design speed [K]
    lhv : float
        Lower heating value of the fuel [J/kg]
    h_to_c : float
        Molar hydrogen/carbon ratio of the fuel [-]
    compressor_efficiency : float
        Compressor isentropic efficiency for T3 when not measured [-]
    combustion_efficiency : float
        Combustion efficiency [-]
    p_ambient : float
        Ambient pressure [Pa abs]
    t_ambient : float
        Ambient temperature [K]
    thrust : array_like, optional
        Thrust at each speed, for TSFC [N]
    table : dict, optional
        Measured columns (see :data:`TABLE_COLUMNS`), SI units [-]
    pr_method : str
        Pressure-ratio law when case pressure is not measured [-]
    t4_law : str
        "constant" (default: the design T4 at every speed) or "choked_nozzle"
        when T4 is neither measured nor given [-]
    t4 : array_like, optional
        Turbine-inlet temperature given point by point (overrides the law) [K]
    h_fuel : float
        Sensible enthalpy of the entering fuel relative to 298.15 K [J/kg]

    Returns
    -------
    dict
        Arrays (shape of ``speed``): ``speed`` [rpm], ``speed_fraction`` [-],
        ``pressure_ratio`` [-], ``case_pressure`` [Pa gauge], ``air_flow``
        [kg/s], ``t3`` [K], ``t4`` [K], ``far`` [kg/kg], ``fuel_flow``
        [kg/s], ``thrust`` [N] (NaN where not given), ``tsfc`` [kg/(N s)]
        (NaN where no thrust), ``measured`` (dict of column -> bool: taken
        from the table).

    References
    ----------
    See the module docstring.

    Examples
    --------
    >>> line = operating_line([40000, 120000], 120000, 2.8, 0.25, 1050.0, lhv=43.0e6, h_to_c=1.94)
    >>> [round(float(x) / 1e5, 3) for x in line["case_pressure"]]
    [0.141, 1.824]
    """
    speed = checked_array(speed, "speed", "rpm")
    require(speed >= 0, "speed must be >= 0 rpm")
    nd = float(checked_array(design_speed, "design speed", "rpm", positive=True))
    n = speed / nd
    t1 = checked_array(t_ambient, "ambient temperature", "K", positive=True)
    pa = checked_array(p_ambient, "ambient pressure", "Pa", positive=True)
    if t4_law not in T4_LAWS:
        raise FuelsysInputError(f"t4 law {t4_law!r} unknown; allowed: {', '.join(T4_LAWS)}")
    measured = {}
    tab = {} if table is None else dict(table)
    if tab:
        s = _check_table(tab)
        warn_validity("measured engine table", "speed", speed, float(s[0]), float(s[-1]), "rpm")

    def pick(key, law):
        v = _table_value(tab, key, speed) if tab else None
        measured[key] = v is not None
        return v if v is not None else law()

    pg = pick("case_pressure", lambda: np.asarray(case_pressure(n, pr_design, pa, t1, pr_method)))
    pr = 1.0 + pg / pa
    m_air = pick("air_flow", lambda: np.asarray(air_flow_proportional_to_speed(n, air_flow_design)))
    if np.any(m_air <= 0):
        raise FuelsysInputError("air flow must be > 0 at every operating point (speed 0 has no flow)")
    t3 = pick("t3", lambda: np.asarray(compressor_exit_temperature(t1, pr, compressor_efficiency)))

    def t4_fallback():
        if t4 is not None:
            return np.broadcast_to(checked_array(t4, "t4", "K", positive=True), speed.shape).astype(float)
        if t4_law == "constant":
            return np.full(speed.shape, float(t4_design))
        p3d = pa * np.asarray(pressure_ratio(1.0, pr_design, t1, pr_method))
        return np.asarray(turbine_inlet_choked_nozzle(t4_design, pa * pr, p3d, m_air, air_flow_design))

    t4v = pick("t4", t4_fallback)
    far = np.asarray(fuel_air_ratio_energy_balance(t3, t4v, lhv, h_to_c, combustion_efficiency, h_fuel))
    mf = m_air * far
    if thrust is not None:
        f = np.broadcast_to(np.asarray(thrust, dtype=float), speed.shape).astype(float)
        measured["thrust"] = False
    else:
        f = _table_value(tab, "thrust", speed) if tab else None
        measured["thrust"] = f is not None
        f = np.full(speed.shape, np.nan) if f is None else f
    with np.errstate(divide="ignore", invalid="ignore"):
        tsfc = np.where(f > 0, mf / np.where(f > 0, f, 1.0), np.nan)
    return {"speed": speed, "speed_fraction": n, "pressure_ratio": pr, "case_pressure": pg,
            "air_flow": m_air, "t3": t3, "t4": t4v, "far": far, "fuel_flow": mf, "thrust": f,
            "tsfc": tsfc, "measured": measured}
