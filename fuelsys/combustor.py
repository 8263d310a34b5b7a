"""Combustor liner: air split by zone, zone mixtures and temperatures.

Floor: the engine's parts (uses equilibrium and thermo).

The liner is a set of openings -- vaporiser-tube inlets, primary, secondary
and dilution holes, cooling holes -- each row a hole count, a diameter and a
discharge coefficient.  Every opening sees the same liner pressure drop (the
case around the liner is one plenum), so with incompressible orifice flow
``m = Cd A sqrt(2 rho dp)`` each row passes air in proportion to its
effective area ``count Cd pi d²/4``: the air split is geometry alone.  The
total air follows from the liner pressure drop and the case conditions, or is
given (the engine's air flow), in which case the liner pressure drop follows.

Zones and stages
----------------
The air of a zone joins the flow at a stage: the vaporiser tubes' air and the
primary holes' air form the primary zone; the secondary holes' air joins in
the secondary zone; the dilution holes' air joins before the turbine.
Cooling air (film holes or slots) runs along the wall and is taken to mix in
at the dilution stage unless told otherwise (``cooling_joins``).

Per operating point (every input broadcasts; no loop over points):

* primary zone: fuel/air ratio and equivalence ratio of all the fuel with the
  primary air; flame temperature by chemical equilibrium with dissociation
  (:func:`fuelsys.equilibrium.gordon_mcbride_1994`) at the case air
  temperature and pressure, and the same without dissociation for comparison;
* secondary zone: the fuel with primary + secondary air.  Assumption: fuel
  the primary zone could not burn (phi > 1) burns on here, and everything
  burns out once the mixture is lean; the zone temperature is then the energy
  balance of complete combustion with the NASA polynomials of
  :mod:`fuelsys.thermo` and the combustion efficiency.  A secondary zone still
  rich is given its equilibrium temperature and flagged;
* exit: the fuel with all the air, the same energy balance as the engine's
  fuel demand (:func:`fuelsys.engine.fuel_air_ratio_energy_balance`), so the
  mixed-out temperature comes back to the turbine-inlet temperature the fuel
  demand was sized for;
* liner pressure drop and hole jet velocity ``sqrt(2 dp / rho)``.

The primary flame is adiabatic for the fuel that can burn there (combustion
efficiency, a whole-combustor figure, is applied where the fuel burns out:
secondary zone and exit).  Its fuel enters in the state of ``h_fuel``
(default: liquid at 25 °C).  In a vaporising combustor the heat that
evaporates the fuel in the tubes comes from the flame itself, so for the
primary zone as a whole the liquid state is the right one.

Flags, per point: primary zone outside the stable-burning range
(:data:`PRIMARY_STABLE_PHI`), a primary share far from the usual fifth
(:data:`PRIMARY_SHARE_USUAL`), a liner pressure drop outside the usual range
(weak or needlessly strong hole jets, :data:`LINER_DP_USUAL`), a secondary
zone still rich.

References
----------
.. [1] A. H. Lefebvre and D. R. Ballal, "Gas Turbine Combustion: Alternative
   Fuels and Emissions", 3rd ed., CRC Press 2010: ch. 4 (aerodynamics: flow
   through liner holes m = Cd A (2 rho dp)^0.5, discharge coefficients,
   jet velocity), ch. 5 (stability: weak and rich extinction of the primary
   zone), ch. 1 (zones of a combustor and their air shares).
.. [2] K. S. Kaddah, "Discharge Coefficients and Jet Deflection Angles for
   Combustor Liner Air Entry Holes", College of Aeronautics MSc thesis,
   Cranfield 1964 (the plain- and plunged-hole correlation of
   :func:`kaddah_1964`, as given by Lefebvre & Ballal 2010 ch. 4).
.. [3] H. I. H. Saravanamuttoo, G. F. C. Rogers, H. Cohen and P. V.
   Straznicky, "Gas Turbine Theory", 6th ed., Pearson 2009, §2.3 and ch. 7
   (combustion temperature rise and efficiency, combustor zones).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from fuelsys import equilibrium, thermo
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array

#: liner zones an opening can belong to
ZONES = ("vaporiser", "primary", "secondary", "dilution", "cooling")
#: stages at which air joins the flow, in flow order
STAGES = ("primary", "secondary", "dilution")
#: the stage each zone's air joins (cooling: see ``cooling_joins``)
ZONE_STAGE = {"vaporiser": "primary", "primary": "primary", "secondary": "secondary", "dilution": "dilution"}

#: validity of the incompressible orifice flow: liner pressure drop as a fraction of the case
#: pressure.  Above about 10 % the density change through the hole exceeds 7 % and compressible
#: flow should be used (Lefebvre & Ballal 2010 ch. 4 treat liner flow as incompressible; the limit is
#: common practice, no source)
VALIDITY = {
    "liner_dp_fraction": (0.0, 0.10, "-"),
    # Kaddah's data: hole-to-annulus dynamic pressure K from about 1 to 40 and bleed ratio
    # alpha 0-0.8 (from memory)
    "kaddah_1964": {"K": (1.0, 40.0, "-"), "alpha": (0.0, 0.8, "-")},
}

#: stable burning of a primary zone: equivalence ratio from weak to rich extinction at the
#: loadings of small engines.  Common practice, no source; stability loops of this width are shown by
#: Lefebvre & Ballal 2010 ch. 5 (from memory)
PRIMARY_STABLE_PHI = (0.5, 1.6)
#: usual share of the air in the primary zone, "about a fifth" (common practice, no source)
PRIMARY_SHARE_USUAL = (0.15, 0.30)
#: usual liner pressure drop, fraction of case pressure: below it the jets penetrate and mix poorly,
#: above it pressure is wasted (common practice, no source; 2-6 % in Lefebvre & Ballal 2010 ch. 1,
#: from memory)
LINER_DP_USUAL = (0.02, 0.08)



# -- discharge coefficient -------------------------------------------------------------
def kaddah_1964(K, alpha=0.0, plunged=False):
    """Discharge coefficient of a liner air-entry hole, Kaddah (1964).

    .. math:: C_D = \\frac{c\\,(K - 1)}{\\sqrt{4K^2 - K(2 - \\alpha)^2}}

    with c = 1.25 for plain holes and 1.65 for plunged holes, where K is the
    hole pressure-drop parameter (total pressure drop across the hole over the
    annulus dynamic pressure) and alpha the bleed ratio (hole flow over the
    annulus flow approaching the hole).  For small annulus velocities
    (K large) C_D tends to c/2: 0.625 for plain holes, the default used in
    this module (:data:`CD_PLAIN_HOLE`).

    Parameters
    ----------
    K : array_like
        Hole pressure-drop parameter, > 1 [-]
    alpha : array_like
        Bleed ratio, 0 <= alpha <= 1 [-]
    plunged : bool
        True for plunged (flanged-inward) holes [-]

    Returns
    -------
    float or ndarray
        Discharge coefficient [-]

    Raises
    ------
    FuelsysInputError
        K <= 1 or alpha outside 0..1.

    References
    ----------
    Kaddah (1964), Cranfield MSc thesis; as given by Lefebvre & Ballal,
    "Gas Turbine Combustion", 3rd ed. (2010), ch. 4 (from memory).

    Examples
    --------
    >>> round(kaddah_1964(40.0), 3)
    0.617
    >>> round(kaddah_1964(5.0, 0.3), 3)
    0.541
    """
    K = checked_array(K, "K (hole pressure-drop parameter)", "-", positive=True)
    if np.any(K <= 1):
        raise FuelsysInputError(f"K must be > 1: the hole's total pressure drop over the annulus dynamic "
                                f"pressure (got {np.ravel(K[K <= 1])[0]:g})")
    a = checked_array(alpha, "bleed ratio alpha", "-", nonneg=True)
    if np.any(a > 1):
        raise FuelsysInputError(f"bleed ratio alpha must be within 0..1 (got {np.max(a):g})")
    v = VALIDITY["kaddah_1964"]
    warn_validity("Kaddah (1964) discharge coefficient", "K", K, *v["K"])
    warn_validity("Kaddah (1964) discharge coefficient", "bleed ratio", a, *v["alpha"])
    c = 1.65 if plunged else 1.25
    return _out(c * (K - 1.0) / np.sqrt(4.0 * K * K - K * (2.0 - a) ** 2))


#: default discharge coefficient of a plain hole: Kaddah (1964) for negligible annulus velocity
#: (K -> infinity), 1.25 / 2; used for every opening whose Cd is not given, vaporiser-tube inlets
#: included (a tube's friction lowers its Cd: give the tube's own figure where known)
CD_PLAIN_HOLE = 0.625


# -- openings and air split --------------------------------------------------------------
def effective_area(count, diameter, cd=CD_PLAIN_HOLE):
    """Effective flow area of a row of round holes: count Cd pi d²/4.

    Parameters
    ----------
    count : array_like
        Number of holes, a whole number >= 0 [-]
    diameter : array_like
        Hole diameter, > 0 [m]
    cd : array_like
        Discharge coefficient, 0 < Cd <= 1 [-]

    Returns
    -------
    float or ndarray
        Effective area [m²]

    References
    ----------
    Lefebvre & Ballal (2010) ch. 4: m = Cd A (2 rho dp)^0.5 per hole.

    Examples
    --------
    >>> round(effective_area(8, 4e-3) * 1e6, 2)
    62.83
    """
    n = checked_array(count, "hole count", "-", nonneg=True)
    if np.any(n != np.round(n)):
        raise FuelsysInputError(f"hole count must be a whole number (got {np.ravel(n[n != np.round(n)])[0]:g})")
    d = np.asarray(diameter, dtype=float)
    if np.any(~np.isfinite(d)) or np.any(d <= 0):
        bad = np.ravel(d[~(np.isfinite(d) & (d > 0))])[0]
        raise FuelsysInputError(f"hole diameter must be > 0 (got {bad * 1e3:g} mm)")
    c = np.asarray(cd, dtype=float)
    if np.any(~np.isfinite(c)) or np.any(c <= 0) or np.any(c > 1):
        bad = np.ravel(c[~(np.isfinite(c) & (c > 0) & (c <= 1))])[0]
        raise FuelsysInputError(f"discharge coefficient must be > 0 and <= 1 (got {bad:g})")
    return _out(n * c * np.pi * d * d / 4.0)


def air_fractions(counts, diameters, cds=CD_PLAIN_HOLE):
    """Share of the liner air through each row of openings.

    All openings see the same pressure drop, so each row's share is its
    effective area over the total.

    Parameters
    ----------
    counts : array_like
        Hole count of each row, whole numbers >= 0 [-]
    diameters : array_like
        Hole diameter of each row, > 0 [m]
    cds : array_like
        Discharge coefficient of each row (NaN: the default
        :data:`CD_PLAIN_HOLE`) [-]

    Returns
    -------
    ndarray
        Air fraction of each row; sums to 1 [-]

    Raises
    ------
    FuelsysInputError
        Negative or fractional counts, diameters <= 0, Cd outside 0..1, rows
        of different lengths, or no openings at all.

    References
    ----------
    Lefebvre & Ballal (2010) ch. 4 (flow through liner holes).

    Examples
    --------
    >>> [round(float(x), 3) for x in air_fractions([6, 24, 24, 12], [5e-3, 2.5e-3, 3.7e-3, 7.5e-3])]
    [0.115, 0.115, 0.252, 0.518]
    """
    n = np.atleast_1d(np.asarray(counts, dtype=float))
    d = np.atleast_1d(np.asarray(diameters, dtype=float))
    c = np.asarray(cds, dtype=float)
    c = np.where(np.isnan(c), CD_PLAIN_HOLE, c)
    c = np.atleast_1d(c)
    if n.ndim != 1 or d.ndim != 1 or c.ndim != 1:
        raise FuelsysInputError("hole counts, diameters and Cds must be lists (one value per row of openings)")
    if not (n.size == d.size and c.size in (1, n.size)):
        raise FuelsysInputError(f"one diameter{' and Cd' if c.size > 1 else ''} per row of holes is needed "
                                f"(got {n.size} counts, {d.size} diameters, {c.size} Cds)")
    if n.size == 0:
        raise FuelsysInputError("no openings at all: give at least one row of holes")
    a = np.asarray(effective_area(n, d, c))
    total = a.sum()
    if not total > 0:
        raise FuelsysInputError("no openings at all: every hole count is 0; the liner needs holes to pass air")
    return a / total


@dataclass(frozen=True)
class Liner:
    """A combustor liner as rows of openings.

    Attributes
    ----------
    zones : tuple of str
        Zone of each row, one of :data:`ZONES` [-]
    counts : ndarray
        Holes in each row [-]
    diameters : ndarray
        Hole diameter of each row [m]
    cds : ndarray
        Discharge coefficient of each row [-]
    cooling_joins : str
        Stage at which cooling air mixes in: "primary", "secondary" or
        "dilution" (default) [-]
    names : tuple of str
        A label per row [-]
    """

    zones: tuple
    counts: np.ndarray
    diameters: np.ndarray
    cds: np.ndarray
    cooling_joins: str = "dilution"
    names: tuple = field(default=())

    @classmethod
    def from_openings(cls, openings, cooling_joins="dilution"):
        """Build a liner from rows ``(zone, count, diameter[, cd[, name]])`` or dicts with those keys.

        Parameters
        ----------
        openings : iterable
            Rows: zone (str), count [-], diameter [m], optional Cd [-] (None:
            :data:`CD_PLAIN_HOLE`) and name [-]
        cooling_joins : str
            Stage the cooling air joins [-]

        Returns
        -------
        Liner
            The liner [-]

        References
        ----------
        Lefebvre & Ballal (2010) ch. 1 and 4.

        Examples
        --------
        >>> lin = Liner.from_openings([("vaporiser", 6, 5e-3), ("dilution", 12, 7.5e-3)])
        >>> round(lin.stage_fractions()["primary"], 3)
        0.182
        """
        zones, counts, dias, cds, names = [], [], [], [], []
        for k, row in enumerate(openings):
            if isinstance(row, dict):
                row = (row.get("zone"), row.get("count"), row.get("diameter"), row.get("cd"), row.get("name"))
            row = tuple(row) + (None,) * (5 - len(row))
            z, n, d, cd, nm = row[:5]
            zones.append(z)
            counts.append(n)
            dias.append(d)
            cds.append(CD_PLAIN_HOLE if cd is None else cd)
            names.append(str(nm) if nm is not None else f"{z} {k + 1}")
        return cls(tuple(zones), np.asarray(counts, dtype=float), np.asarray(dias, dtype=float),
                   np.asarray(cds, dtype=float), cooling_joins, tuple(names))

    def __post_init__(self):
        bad = [z for z in self.zones if z not in ZONES]
        if bad:
            raise FuelsysInputError(f"zone {bad[0]!r} unknown; allowed: {', '.join(ZONES)}")
        if self.cooling_joins not in STAGES:
            raise FuelsysInputError(f"cooling air must join one of {', '.join(STAGES)} (got {self.cooling_joins!r})")
        if len(self.zones) != np.size(self.counts):
            raise FuelsysInputError("one zone per row of openings is needed")
        air_fractions(self.counts, self.diameters, self.cds)  # validates the rows

    @property
    def effective_areas(self) -> np.ndarray:
        """Effective area of each row [m²]."""
        return np.asarray(effective_area(self.counts, self.diameters, self.cds))

    @property
    def effective_area(self) -> float:
        """Total effective area of the liner [m²]."""
        return float(self.effective_areas.sum())

    def row_fractions(self) -> np.ndarray:
        """Air fraction of each row [-]."""
        return air_fractions(self.counts, self.diameters, self.cds)

    def zone_fractions(self) -> dict:
        """Air fraction by zone, every zone of :data:`ZONES` (0 where it has no holes) [-]."""
        f = self.row_fractions()
        return {z: float(sum(fi for zi, fi in zip(self.zones, f) if zi == z)) for z in ZONES}

    def stage_fractions(self) -> dict:
        """Air fraction joining at each stage of :data:`STAGES` (cooling by ``cooling_joins``) [-]."""
        zf = self.zone_fractions()
        out = {s: 0.0 for s in STAGES}
        for z, f in zf.items():
            out[ZONE_STAGE.get(z, self.cooling_joins)] += f
        return out


# -- liner flow -----------------------------------------------------------------------------
def _density(case_pressure, t3):
    p = checked_array(case_pressure, "case pressure", "Pa", positive=True)
    T = checked_array(t3, "case air temperature", "K", positive=True)
    return p / (thermo.R_AIR * T), p


def liner_air_flow(area_eff, liner_dp, case_pressure, t3):
    """Air through openings of effective area ``area_eff`` at a liner pressure drop (incompressible).

    Parameters
    ----------
    area_eff : array_like
        Effective area sum(count Cd pi d²/4) [m²]
    liner_dp : array_like
        Static pressure drop across the liner, > 0 [Pa]
    case_pressure : array_like
        Case (compressor delivery) pressure [Pa abs]
    t3 : array_like
        Case air temperature [K]

    Returns
    -------
    float or ndarray
        Air mass flow [kg/s]

    References
    ----------
    Lefebvre & Ballal (2010) ch. 4: m = Cd A (2 rho3 dp_L)^0.5.

    Examples
    --------
    >>> round(liner_air_flow(7e-4, 1.0e4, 2.6e5, 415.0), 4)
    0.1463
    """
    a = checked_array(area_eff, "effective area", "m²", positive=True)
    rho, p = _density(case_pressure, t3)
    dp = checked_array(liner_dp, "liner pressure drop", "Pa", positive=True)
    if np.any(dp >= p):
        raise FuelsysInputError("liner pressure drop must be below the case pressure")
    warn_validity("incompressible liner flow", "liner pressure drop fraction", dp / p,
                  *VALIDITY["liner_dp_fraction"])
    return _out(a * np.sqrt(2.0 * rho * dp))


def liner_pressure_drop(air_flow, area_eff, case_pressure, t3):
    """Liner pressure drop that passes ``air_flow`` through openings of effective area ``area_eff``.

    Parameters
    ----------
    air_flow : array_like
        Air mass flow through the liner [kg/s]
    area_eff : array_like
        Effective area [m²]
    case_pressure : array_like
        Case pressure [Pa abs]
    t3 : array_like
        Case air temperature [K]

    Returns
    -------
    float or ndarray
        Liner pressure drop [Pa]

    References
    ----------
    Lefebvre & Ballal (2010) ch. 4 (the orifice equation solved for dp).

    Examples
    --------
    >>> round(liner_pressure_drop(0.1463, 7e-4, 2.6e5, 415.0))
    10007
    """
    m = checked_array(air_flow, "air flow", "kg/s", nonneg=True)
    a = checked_array(area_eff, "effective area", "m²", positive=True)
    rho, p = _density(case_pressure, t3)
    dp = (m / a) ** 2 / (2.0 * rho)
    if np.any(dp >= p):
        k = np.flatnonzero(np.ravel(np.broadcast_to(dp >= p, np.broadcast(dp, p).shape)))[0]
        raise FuelsysInputError(
            f"the openings are too small for the air flow: it would need a liner pressure drop of "
            f"{np.ravel(np.broadcast_to(dp, np.broadcast(dp, p).shape))[k] / 1e5:.3g} bar, not below the case "
            f"pressure {np.ravel(np.broadcast_to(p, np.broadcast(dp, p).shape))[k] / 1e5:.3g} bar abs")
    warn_validity("incompressible liner flow", "liner pressure drop fraction", dp / p,
                  *VALIDITY["liner_dp_fraction"])
    return _out(dp)


def jet_velocity(liner_dp, case_pressure, t3):
    """Velocity of the air jets through the liner holes, sqrt(2 dp / rho3).

    Parameters
    ----------
    liner_dp : array_like
        Liner pressure drop [Pa]
    case_pressure : array_like
        Case pressure [Pa abs]
    t3 : array_like
        Case air temperature [K]

    Returns
    -------
    float or ndarray
        Jet velocity [m/s]

    References
    ----------
    Lefebvre & Ballal (2010) ch. 4 (jet velocity from the liner pressure drop).

    Examples
    --------
    >>> round(jet_velocity(1.0e4, 2.6e5, 415.0), 1)
    95.7
    """
    rho, _ = _density(case_pressure, t3)
    dp = checked_array(liner_dp, "liner pressure drop", "Pa", nonneg=True)
    return _out(np.sqrt(2.0 * dp / rho))


# -- mixtures and temperatures -------------------------------------------------------------
def zone_equivalence_ratio(fuel_flow, air_flow, zone_fraction, stoich_far):
    """Equivalence ratio of all the fuel with one zone's share of the air.

    Parameters
    ----------
    fuel_flow : array_like
        Fuel mass flow, >= 0 [kg/s]
    air_flow : array_like
        Total liner air flow, > 0 [kg/s]
    zone_fraction : array_like
        Share of the air reaching the zone (cumulative from the front), 0 < f <= 1 [-]
    stoich_far : array_like
        Stoichiometric fuel/air ratio of the fuel [kg/kg]

    Returns
    -------
    float or ndarray
        Equivalence ratio [-]

    References
    ----------
    Turns (2012) eq. 2.32: phi = (F/A) / (F/A)_stoich.

    Examples
    --------
    >>> round(zone_equivalence_ratio(0.0028, 0.15, 0.2, 0.0683), 3)
    1.367
    """
    mf = checked_array(fuel_flow, "fuel flow", "kg/s", nonneg=True)
    ma = checked_array(air_flow, "air flow", "kg/s", positive=True)
    z = checked_array(zone_fraction, "zone air fraction", "-", positive=True)
    if np.any(z > 1):
        raise FuelsysInputError(f"zone air fraction must be within 0..1 (got {np.max(z):g})")
    fs = checked_array(stoich_far, "stoichiometric fuel/air ratio", "kg/kg", positive=True)
    return _out(mf / (ma * z) / fs)


def burnout_temperature(t_air, far, lhv, h_to_c, efficiency=1.0, h_fuel=0.0):
    """Temperature after lean fuel burns out completely in air: the steady-flow energy balance.

    Per kg of air, with the burned fuel/air ratio f_b = efficiency * far::

        h_air(t_air) + f_b (LHV + h_fuel) = (1 + f_b) h_products(T, f_b)

    (sensible enthalpies relative to 298.15 K, :mod:`fuelsys.thermo`) -- the
    balance of :func:`fuelsys.engine.fuel_air_ratio_energy_balance` solved
    for the temperature.

    Parameters
    ----------
    t_air : array_like
        Air temperature before combustion [K]
    far : array_like
        Fuel/air mass ratio, 0..stoichiometric [kg/kg]
    lhv : array_like
        Lower heating value [J/kg]
    h_to_c : array_like
        Molar H/C ratio of the fuel [-]
    efficiency : array_like
        Combustion efficiency, 0 < eta <= 1 [-]
    h_fuel : array_like
        Fuel enthalpy above its heating value's reference state [J/kg]

    Returns
    -------
    float or ndarray
        Temperature of the burned-out mixture [K]

    References
    ----------
    Saravanamuttoo et al. (2009) §2.3; McBride, Zehe & Gordon (2002).

    Examples
    --------
    >>> round(burnout_temperature(450.0, 0.0144, 43.0e6, 1.94), 1)
    999.3
    """
    t = checked_array(t_air, "air temperature", "K", positive=True)
    f = checked_array(far, "fuel/air ratio", "kg/kg", nonneg=True)
    q = checked_array(lhv, "lower heating value", "J/kg", positive=True)
    eta = checked_array(efficiency, "combustion efficiency", "-", positive=True)
    if np.any(eta > 1):
        raise FuelsysInputError(f"combustion efficiency must be within 0..1 (got {np.max(eta):g})")
    hf = checked_array(h_fuel, "fuel enthalpy", "J/kg")
    fb = eta * f
    h = (np.asarray(thermo.enthalpy(t)) + fb * (q + hf)) / (1.0 + fb)
    return thermo.temperature_from_enthalpy(h, fb, h_to_c, t_guess=1200.0)


def mix_temperature(t_hot, m_hot, t_cold, m_cold, far_hot=0.0, far_cold=0.0, h_to_c=2.0):
    """Temperature after two streams of air or lean products mix adiabatically.

    Enthalpy is conserved: m_h h(T_h, f_h) + m_c h(T_c, f_c) = (m_h + m_c)
    h(T, f_mix), with the mixed fuel/air ratio f_mix of the combined air and
    burned fuel (the product composition is linear in f, so the mixture of
    two lean-product streams is the lean products of f_mix).

    Parameters
    ----------
    t_hot : array_like
        Temperature of the first (hot) stream [K]
    m_hot : array_like
        Mass flow of the hot stream, >= 0 [kg/s]
    t_cold : array_like
        Temperature of the second (cold) stream [K]
    m_cold : array_like
        Mass flow of the cold stream, >= 0 [kg/s]
    far_hot : array_like
        Fuel/air ratio burned in the hot stream (0 for air) [kg/kg]
    far_cold : array_like
        Fuel/air ratio burned in the cold stream (0 for air) [kg/kg]
    h_to_c : array_like
        Molar H/C ratio of the fuel burned [-]

    Returns
    -------
    float or ndarray
        Mixed-out temperature [K]

    References
    ----------
    Steady-flow energy equation of adiabatic mixing, e.g. Saravanamuttoo et
    al. (2009) §2.3; properties McBride, Zehe & Gordon (2002).

    Examples
    --------
    >>> round(mix_temperature(2200.0, 1.0, 450.0, 0.0), 6)
    2200.0
    >>> 450.0 < mix_temperature(2200.0, 1.0, 450.0, 3.0, far_hot=0.06) < 1325.0
    True
    """
    th = checked_array(t_hot, "hot-stream temperature", "K", positive=True)
    tc = checked_array(t_cold, "cold-stream temperature", "K", positive=True)
    mh = checked_array(m_hot, "hot-stream flow", "kg/s", nonneg=True)
    mc = checked_array(m_cold, "cold-stream flow", "kg/s", nonneg=True)
    if np.any(mh + mc <= 0):
        raise FuelsysInputError("the two streams have no flow between them: give a flow > 0")
    fh = checked_array(far_hot, "hot-stream fuel/air ratio", "kg/kg", nonneg=True)
    fc = checked_array(far_cold, "cold-stream fuel/air ratio", "kg/kg", nonneg=True)
    ah, ac = mh / (1.0 + fh), mc / (1.0 + fc)
    fm = (ah * fh + ac * fc) / (ah + ac)
    H = mh * np.asarray(thermo.enthalpy(th, fh, h_to_c)) + mc * np.asarray(thermo.enthalpy(tc, fc, h_to_c))
    guess = float(np.max(th)) if np.size(th) else 1000.0
    return thermo.temperature_from_enthalpy(H / (mh + mc), fm, h_to_c, t_guess=guess)


# -- the combustor at operating points -------------------------------------------------------
@dataclass
class CombustorResult:
    """Result of :func:`combustor`; arrays of the broadcast operating-point shape.

    Attributes (SI)
    ---------------
    zone_fractions : dict zone -> air fraction of :data:`ZONES` [-]
    stage_fractions : dict stage -> air fraction joining there [-]
    primary_share : air fraction of the primary zone (tubes + primary holes, + cooling if it
        joins there) [-]
    air_flow : liner air flow [kg/s]
    liner_dp : liner pressure drop [Pa]; liner_dp_fraction : over the case pressure [-]
    jet_velocity : hole jet velocity [m/s]
    primary_air, secondary_air, dilution_air : air joining at each stage [kg/s]
    far_primary, far_secondary, far_exit : fuel/air ratio of all the fuel with the air up to
        that stage [kg/kg]
    phi_primary, phi_secondary, phi_exit : the same as equivalence ratios [-]
    t_primary : primary-zone flame temperature with dissociation (equilibrium) [K]
    t_primary_complete : the same without dissociation [K]
    t_secondary : secondary-zone temperature (burn-out energy balance; equilibrium if still rich) [K]
    t_exit : mixed-out (turbine-inlet) temperature [K]
    dilution_drop : t_primary - t_exit, what secondary and dilution air take off the flame [K]
    primary_unstable, primary_share_unusual, liner_dp_unusual, secondary_rich : flags [-]
    flags : per point, "" or the flags in words joined by "; " (str)
    """

    zone_fractions: dict
    stage_fractions: dict
    primary_share: float
    air_flow: object
    liner_dp: object
    liner_dp_fraction: object
    jet_velocity: object
    primary_air: object
    secondary_air: object
    dilution_air: object
    far_primary: object
    far_secondary: object
    far_exit: object
    phi_primary: object
    phi_secondary: object
    phi_exit: object
    t_primary: object
    t_primary_complete: object
    t_secondary: object
    t_exit: object
    dilution_drop: object
    primary_unstable: object
    primary_share_unusual: object
    liner_dp_unusual: object
    secondary_rich: object
    flags: object


def combustor(liner, fuel_flow, t3, p3, fuel="kerosene", *, air_flow=None, liner_dp=None,
              efficiency=1.0, h_fuel=0.0):
    """Air split, zone mixtures and zone temperatures of a liner at operating points.

    Parameters
    ----------
    liner : Liner
        The openings (:class:`Liner`) [-]
    fuel_flow : array_like
        Fuel mass flow, >= 0 [kg/s]
    t3 : array_like
        Case (compressor delivery) air temperature [K]
    p3 : array_like
        Case pressure [Pa abs]
    fuel : str or Fuel or FuelComposition
        The fuel (:func:`fuelsys.equilibrium.fuel_composition`) [-]
    air_flow : array_like, optional
        Air flow through the liner (e.g. the engine's); then the liner
        pressure drop follows [kg/s]
    liner_dp : array_like, optional
        Liner pressure drop; then the air flow follows.  Exactly one of
        ``air_flow`` and ``liner_dp`` [Pa]
    efficiency : array_like
        Combustion efficiency, applied where the fuel burns out (secondary
        zone and exit), as in the engine's fuel demand [-]
    h_fuel : array_like
        Fuel enthalpy above its heating value's reference state (liquid at
        25 °C) as it enters the primary zone [J/kg]

    Returns
    -------
    CombustorResult
        Arrays of the broadcast shape of the operating-point inputs
        (floats for scalar inputs) [-]

    Raises
    ------
    FuelsysInputError
        Bad liner or operating point, neither or both of air flow and
        pressure drop, an overall mixture richer than stoichiometric, or a
        primary zone so rich that solid carbon would form.

    Notes
    -----
    See the module docstring for the zone model and its assumptions.

    References
    ----------
    Lefebvre & Ballal (2010) ch. 1, 4, 5; Gordon & McBride (1994) for the
    flame; Saravanamuttoo et al. (2009) §2.3 for the energy balance.

    Examples
    --------
    An example liner of our own invention at a made-up full-power point:

    >>> lin = Liner.from_openings([("vaporiser", 6, 5e-3), ("primary", 24, 2.5e-3),
    ...                           ("secondary", 24, 3.7e-3), ("dilution", 12, 7.5e-3),
    ...                           ("cooling", 48, 1.8e-3)])
    >>> r = combustor(lin, 0.0028, 415.0, 2.6e5, "kerosene", air_flow=0.15)
    >>> round(r.primary_share, 3), round(r.phi_primary, 2)
    (0.206, 1.33)
    >>> round(r.t_primary - 273.15), round(r.t_exit - 273.15)
    (1912, 845)
    """
    if not isinstance(liner, Liner):
        raise FuelsysInputError("liner must be a Liner (see Liner.from_openings)")
    if (air_flow is None) == (liner_dp is None):
        raise FuelsysInputError("give exactly one of air_flow [kg/s] and liner_dp [Pa]")
    fc = equilibrium.fuel_composition(fuel)
    y = fc.atoms[1] / fc.atoms[0]
    mf = checked_array(fuel_flow, "fuel flow", "kg/s", nonneg=True)
    T3 = checked_array(t3, "t3 (case air temperature)", "K", positive=True)
    P3 = checked_array(p3, "p3 (case pressure)", "Pa", positive=True)
    eta = checked_array(efficiency, "combustion efficiency", "-", positive=True)
    if np.any(eta > 1):
        raise FuelsysInputError(f"combustion efficiency must be within 0..1 (got {np.max(eta):g})")
    hf = checked_array(h_fuel, "fuel enthalpy", "J/kg")
    if liner.stage_fractions()["primary"] <= 0:
        raise FuelsysInputError("the liner has no primary-zone openings (vaporiser tubes or primary holes): "
                                "the fuel has no air to burn with")
    a_eff = liner.effective_area
    if air_flow is not None:
        ma = checked_array(air_flow, "air flow", "kg/s", positive=True)
        dp = np.asarray(liner_pressure_drop(ma, a_eff, P3, T3))
    else:
        dp = checked_array(liner_dp, "liner pressure drop", "Pa", positive=True)
        ma = np.asarray(liner_air_flow(a_eff, dp, P3, T3))
    shape = np.broadcast_shapes(mf.shape, T3.shape, P3.shape, ma.shape, dp.shape, eta.shape, hf.shape)
    mf, T3, P3, ma, dp, eta, hf = (np.broadcast_to(x, shape).astype(float)
                                   for x in (mf, T3, P3, ma, dp, eta, hf))
    zf = liner.zone_fractions()
    sf = liner.stage_fractions()
    share_p = sf["primary"]
    share_s = sf["primary"] + sf["secondary"]
    fs = fc.stoich_far
    far_p = mf / (ma * share_p)
    far_s = mf / (ma * share_s)
    far_e = mf / ma
    if np.any(far_e > fs):
        raise FuelsysInputError(
            f"the overall fuel/air ratio {float(np.max(far_e)):.4f} is richer than stoichiometric ({fs:.4f}): "
            "the exit would hold unburned fuel; allowed: a lean combustor overall")
    phi_p, phi_s, phi_e = far_p / fs, far_s / fs, far_e / fs
    rho = P3 / (thermo.R_AIR * T3)
    vj = np.sqrt(2.0 * dp / rho)
    # primary zone: equilibrium flame (no fuel: the air itself)
    burning = phi_p > 0
    t_p = T3.copy()
    t_pc = T3.copy()
    if np.any(burning):
        args = (phi_p[burning], T3[burning], P3[burning], fc, hf[burning])
        t_p[burning] = np.asarray(equilibrium.gordon_mcbride_1994(*args))
        t_pc[burning] = np.asarray(equilibrium.complete_combustion(*args))
    # secondary zone: burn-out when lean, equilibrium while still rich
    rich_s = far_s > fs
    t_s = np.empty(shape)
    lean = ~rich_s
    t_s[lean] = np.asarray(burnout_temperature(T3[lean], far_s[lean], fc.lhv, y, eta[lean], hf[lean]))
    if np.any(rich_s):
        t_s[rich_s] = np.asarray(equilibrium.gordon_mcbride_1994(phi_s[rich_s], T3[rich_s], P3[rich_s], fc,
                                                                 hf[rich_s]))
    t_e = np.asarray(burnout_temperature(T3, far_e, fc.lhv, y, eta, hf))
    # flags
    lo, hi = PRIMARY_STABLE_PHI
    unstable = burning & ((phi_p < lo) | (phi_p > hi))
    slo, shi = PRIMARY_SHARE_USUAL
    share_odd = np.full(shape, not (slo <= share_p <= shi))
    dlo, dhi = LINER_DP_USUAL
    dpf = dp / P3
    dp_odd = (dpf < dlo) | (dpf > dhi)
    texts = np.full(shape, "", dtype=object)
    for mask, text in (
            (unstable & (phi_p < lo), f"primary zone too lean to burn steadily (phi below {lo:g})"),
            (unstable & (phi_p > hi), f"primary zone too rich to burn steadily (phi above {hi:g})"),
            (share_odd, f"primary share {share_p:.0%} far from the usual fifth ({slo:.0%}-{shi:.0%})"),
            (dpf < dlo, f"liner pressure drop below {dlo:.0%} of case pressure: weak jets, poor mixing"),
            (dpf > dhi, f"liner pressure drop above {dhi:.0%} of case pressure: pressure wasted"),
            (rich_s, "secondary zone still rich: fuel burns on in the dilution zone")):
        texts = np.where(mask, np.where(texts == "", text, texts + "; " + text), texts)

    out = _out

    def flag(a):
        return np.asarray(a, dtype=bool) if shape else bool(a)

    return CombustorResult(
        zone_fractions=zf, stage_fractions=sf, primary_share=float(share_p),
        air_flow=out(ma), liner_dp=out(dp), liner_dp_fraction=out(dpf), jet_velocity=out(vj),
        primary_air=out(ma * share_p), secondary_air=out(ma * sf["secondary"]),
        dilution_air=out(ma * sf["dilution"]),
        far_primary=out(far_p), far_secondary=out(far_s), far_exit=out(far_e),
        phi_primary=out(phi_p), phi_secondary=out(phi_s), phi_exit=out(phi_e),
        t_primary=out(t_p), t_primary_complete=out(t_pc), t_secondary=out(t_s), t_exit=out(t_e),
        dilution_drop=out(t_p - t_e),
        primary_unstable=flag(unstable), primary_share_unusual=flag(share_odd), liner_dp_unusual=flag(dp_odd),
        secondary_rich=flag(rich_s), flags=texts if shape else str(texts.reshape(())[()]))
