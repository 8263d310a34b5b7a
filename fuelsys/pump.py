"""Fuel pump sizing: the system curve, a gear pump with its DC motor, operating points.

Floor: the engine's parts (uses the ground floor).

System curve
------------
Pressure the pump must hold at its outlet to push a flow into the engine::

    p_out = (p_case + Δp_needles + Δp_line + Δp_filter + Δp_valves
             + ρ g n h) (1 + margin) + p_inlet

with ``h`` the height of the injectors above the tank (the fuel is lifted)
and ``n`` the manoeuvre load factor in g.

Pump and motor
--------------
A gear pump delivers its displacement D per radian less a laminar slip
through the tooth-tip and side clearances (Wilson 1950)::

    Q = D ω - K_s Δp / μ            (K_s = Σ b h³ / 12 L of the gaps [m³])

and needs the torque T = D Δp + T_f (pressure torque plus friction).  Its
permanent-magnet DC motor obeys V = R I + k ω and T = k I.  Eliminating ω
and I gives the terminal relation used everywhere here::

    V = R I_f + Q / φ + R φ Δp + K_s Δp / (φ μ)

with φ = D / k the ideal flow per volt of back-EMF [m³/(V s)] and
I_f = T_f / k the friction (no-load) current [A].  Flow, pressure and voltage
measured at the terminals fix φ, R, I_f and K_s; D, k and T_f separately
need the motor constant (from its speed constant Kv), which is optional.
R (the motor) and K_s (the pump's slip) both add a pressure term; they part
only through the viscosity — test points at two or more fuel temperatures —
or when the builder measures R across the motor terminals.  A fit from one
temperature without R is kept as a lumped pressure coefficient and refuses
to predict at another viscosity.

References
----------
.. [1] W. E. Wilson, "Performance criteria for positive displacement pumps
   and fluid motors", Trans. ASME 71 (1949) 115-120: slip flow ∝ Δp/μ,
   torque = DΔp + viscous + Coulomb friction.
.. [2] H. E. Merritt, "Hydraulic Control Systems", Wiley 1967, §3.8 (pump
   leakage coefficients, laminar leakage through clearances).
.. [3] A. E. Fitzgerald, C. Kingsley and S. D. Umans, "Electric Machinery",
   6th ed., McGraw-Hill 2003, §7.2 (DC machine: E = k ω, T = k I).
.. [4] D. M. Bates and D. G. Watts, "Nonlinear Regression Analysis and Its
   Applications", Wiley 1988, §2.3 (parameter standard errors from the
   Jacobian).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from fuelsys.constants import G0
from fuelsys.errors import FuelsysInputError, warn_validity
from fuelsys.arrays import as_float as _out
from fuelsys.arrays import checked_array as _arr

#: fewest test points a pump fit accepts
MIN_POINTS = 4
#: condition number of the column-scaled Jacobian above which a fit is refused
MAX_CONDITION = 1.0e7
#: relative standard error of a fitted coefficient above which the fit is refused
MAX_RELATIVE_ERROR = 1.0
#: relative standard error of the resistance or the slip above which the two are not taken as parted
#: (the fit then keeps their combined pressure coefficient and says so); a judgement, no source
SPLIT_MAX_RELATIVE_ERROR = 0.3




# -- system curve -------------------------------------------------------------------
def head_pressure(height, density, g_load=1.0):
    """Pressure to lift fuel ``height`` under a load factor, ρ g n h.

    Parameters
    ----------
    height : array_like
        Injectors above the tank (negative: below) [m]
    density : array_like
        Fuel density [kg/m³]
    g_load : array_like
        Load factor n along the lift (1 at rest, manoeuvre g in flight) [-]

    Returns
    -------
    float or ndarray
        Pressure [Pa]

    References
    ----------
    Hydrostatics, p = ρ g h, with the apparent gravity n g0; g0 = 9.80665 m/s².

    Examples
    --------
    >>> round(head_pressure(0.3, 800.0, 3.0))
    7061
    """
    h = _arr(height, "head", "m")
    rho = _arr(density, "density", "kg/m³", positive=True)
    n = _arr(g_load, "g load", "-", nonneg=True)
    return _out(rho * G0 * n * h)


def system_pressure(case_pressure, needle_dp, line_dp, *, density, head=0.0, g_load=1.0,
                    margin_pct=0.0, filter_dp=0.0, valve_dp=0.0):
    """Pump outlet pressure the fuel system needs (the system curve, point by point).

    The outlet pressure needed does not depend on what is at the pump's inlet;
    the pump must raise the pressure by this much over a vented tank at pump
    level (the pump model's test pressures are likewise rises over an inlet at
    0 bar gauge).

    Parameters
    ----------
    case_pressure : array_like
        Combustor case pressure [Pa gauge]
    needle_dp : array_like
        Pressure drop across manifold and needles at the flow [Pa]
    line_dp : array_like
        Pressure drop of the line from pump to manifold [Pa]
    density : array_like
        Fuel density [kg/m³]
    head : array_like
        Injectors above the tank [m]
    g_load : array_like
        Manoeuvre load factor along the lift [-]
    margin_pct : array_like
        Safety margin on the total [%]
    filter_dp : array_like
        Filter pressure drop [Pa]
    valve_dp : array_like
        Valve (solenoid, check) pressure drops [Pa]

    Returns
    -------
    float or ndarray
        Pump outlet pressure needed [Pa gauge]

    References
    ----------
    Sum of series losses (steady incompressible flow, Bernoulli with losses),
    e.g. White, "Fluid Mechanics", 7th ed., McGraw-Hill 2011, §6.9.

    Examples
    --------
    >>> round(system_pressure(1.8e5, 1.2e5, 0.2e5, density=800.0, margin_pct=10) / 1e5, 3)
    3.52
    """
    pc = _arr(case_pressure, "case pressure", "Pa", nonneg=True)
    dn = _arr(needle_dp, "needle pressure drop", "Pa", nonneg=True)
    dl = _arr(line_dp, "line pressure drop", "Pa", nonneg=True)
    df = _arr(filter_dp, "filter pressure drop", "Pa", nonneg=True)
    dv = _arr(valve_dp, "valve pressure drop", "Pa", nonneg=True)
    m = _arr(margin_pct, "margin", "%", nonneg=True)
    total = pc + dn + dl + df + dv + np.asarray(head_pressure(head, density, g_load))
    return _out(total * (1.0 + m / 100.0))


# -- pump model ----------------------------------------------------------------------
@dataclass(frozen=True)
class GearPump:
    """A gear pump with its DC motor, in the identifiable terminal coefficients.

    Attributes
    ----------
    phi : float
        Ideal flow per volt of back-EMF, D/k [m³/(V s)].
    winding_ohm : float
        Motor winding (plus brush and lead) resistance R [Ω]; NaN when the
        fit could not part it from the slip.
    friction_current : float
        Current to overcome friction, T_f/k [A]; NaN when not parted.
    slip : float
        Laminar slip coefficient K_s, slip flow = K_s Δp / μ [m³]; NaN when
        not parted.
    v0 : float
        R I_f, the voltage intercept [V].
    dp_volts : float
        Volts per pascal at the fit viscosity, R φ + K_s/(φ μ_fit) [V/Pa].
    mu_fit : float
        Viscosity the lumped coefficient belongs to; NaN when the split is
        known and any viscosity is allowed [Pa s].
    motor_k : float
        Motor constant k [V s/rad = N m/A]; NaN unless Kv was given.
    """

    phi: float
    winding_ohm: float
    friction_current: float
    slip: float
    v0: float
    dp_volts: float
    mu_fit: float = float("nan")
    motor_k: float = float("nan")
    #: lowest and highest voltage of the test points the pump was fitted to; NaN when unknown [V]
    v_tested: tuple = (float("nan"), float("nan"))

    def flag_untested(self, volts) -> None:
        """Warn (ValidityWarning) where ``volts`` [V] lies outside the tested voltages: an extrapolation."""
        lo, hi = self.v_tested
        if np.isfinite(lo) and np.isfinite(hi):
            warn_validity("pump fit (voltages of its test points)", "motor voltage", volts, lo, hi, "V")

    @classmethod
    def physical(cls, phi, winding_ohm, friction_current, slip, motor_k=float("nan")):
        """A pump from its physical coefficients (resistance and slip known apart).

        Parameters
        ----------
        phi : float
            Ideal flow per volt D/k [m³/(V s)]
        winding_ohm : float
            Winding resistance [Ω]
        friction_current : float
            Friction current T_f/k [A]
        slip : float
            Laminar slip coefficient K_s [m³]
        motor_k : float
            Motor constant, NaN when unknown [V s/rad]

        Returns
        -------
        GearPump
            The pump [-]

        Examples
        --------
        >>> GearPump.physical(4e-7, 1.0, 0.4, 2e-15).v0
        0.4
        """
        phi, r, i_f, ks = (float(x) for x in (phi, winding_ohm, friction_current, slip))
        for name, val in (("phi", phi), ("winding_ohm", r), ("friction_current", i_f), ("slip", ks)):
            if not np.isfinite(val) or val < 0 or (name == "phi" and val == 0):
                raise FuelsysInputError(f"pump coefficient {name} must be a finite number >= 0 (phi > 0); got {val}")
        return cls(phi=phi, winding_ohm=r, friction_current=i_f, slip=ks, v0=r * i_f, dp_volts=r * phi,
                   mu_fit=float("nan"), motor_k=float(motor_k))

    @property
    def separable(self) -> bool:
        """True when resistance and slip are known apart (any viscosity allowed)."""
        return bool(np.isfinite(self.slip))

    @property
    def displacement(self) -> float:
        """Displacement per radian D = φ k [m³/rad] (NaN without Kv)."""
        return self.phi * self.motor_k

    def _dp_coef(self, mu):
        mu = _arr(mu, "viscosity", "Pa s", positive=True)
        if self.separable:
            return self.winding_ohm * self.phi + self.slip / (self.phi * mu)
        if np.any(np.abs(mu / self.mu_fit - 1.0) > 1e-3):
            raise FuelsysInputError(
                "this pump fit was made at one fuel temperature without the winding resistance, so it cannot "
                f"tell motor losses from pump slip and holds only at its test viscosity "
                f"({self.mu_fit * 1e3:.3g} mPa s, got {float(np.ravel(mu)[0]) * 1e3:.3g}); give winding_ohm "
                "(measured across the motor terminals) or test at two or more fuel temperatures")
        return np.full(mu.shape, self.dp_volts)

    def volts(self, flow, dp, mu):
        """Terminal voltage for a volume flow against a pressure rise.

        Parameters
        ----------
        flow : array_like
            Volume flow delivered [m³/s]
        dp : array_like
            Pressure rise outlet minus inlet [Pa]
        mu : array_like
            Fuel dynamic viscosity [Pa s]

        Returns
        -------
        float or ndarray
            Voltage [V]

        References
        ----------
        Wilson (1949) slip model with a DC motor (module docstring).

        Examples
        --------
        >>> p = GearPump.physical(4e-7, 1.0, 0.4, 2e-15)
        >>> round(p.volts(5e-6, 3e5, 1.5e-3), 2)
        14.02
        """
        q = _arr(flow, "flow", "m³/s", nonneg=True)
        dp = _arr(dp, "pressure rise", "Pa")
        return _out(self.v0 + q / self.phi + self._dp_coef(mu) * dp)

    def flow(self, volts, dp, mu):
        """Volume flow at a voltage against a pressure rise (0 where it cannot flow).

        Parameters
        ----------
        volts : array_like
            Terminal voltage [V]
        dp : array_like
            Pressure rise outlet minus inlet [Pa]
        mu : array_like
            Fuel dynamic viscosity [Pa s]

        Returns
        -------
        float or ndarray
            Volume flow [m³/s]

        References
        ----------
        Wilson (1949) slip model with a DC motor (module docstring).

        Examples
        --------
        >>> p = GearPump.physical(4e-7, 1.0, 0.4, 2e-15)
        >>> round(p.flow(14.02, 3e5, 1.5e-3) * 6e7)  # mL/min
        300
        """
        v = _arr(volts, "voltage", "V", nonneg=True)
        dp = _arr(dp, "pressure rise", "Pa")
        q = self.phi * (v - self.v0 - self._dp_coef(mu) * dp)
        return _out(np.maximum(q, 0.0))

    def current(self, dp):
        """Motor current at a pressure rise, I = φ Δp + I_f (needs the split).

        Parameters
        ----------
        dp : array_like
            Pressure rise [Pa]

        Returns
        -------
        float or ndarray
            Current [A]

        References
        ----------
        DC machine T = k I (Fitzgerald et al. 2003 §7.2) with T = DΔp + T_f.

        Examples
        --------
        >>> round(GearPump.physical(4e-7, 1.0, 0.4, 2e-15).current(3e5), 3)
        0.52
        """
        if not self.separable:
            raise FuelsysInputError("motor current needs the winding resistance apart from the slip; "
                                    "give winding_ohm or test at two fuel temperatures")
        return _out(self.phi * _arr(dp, "pressure rise", "Pa") + self.friction_current)


@dataclass(frozen=True)
class PumpFit:
    """Result of :func:`fit_pump`: the model and how well it fits."""

    pump: GearPump
    rms_volts: float
    r_squared: float
    condition: float
    std_errors: dict = field(default_factory=dict)
    n_points: int = 0
    residuals: np.ndarray = field(default=None, repr=False)
    mu_test: float = float("nan")
    #: what the fit could not separate, in words ("" when every coefficient is known apart)
    note: str = ""


def _test_arrays(flow, dp, volts, mu):
    q = np.atleast_1d(_arr(flow, "test flow", "m³/s", nonneg=True)).astype(float).ravel()
    p = np.atleast_1d(_arr(dp, "test pressure", "Pa")).astype(float).ravel()
    v = np.atleast_1d(_arr(volts, "test voltage", "V", positive=True)).astype(float).ravel()
    if not (q.size == p.size == v.size):
        raise FuelsysInputError(
            f"test points: flows, pressures and volts need the same count (got {q.size}, {p.size}, {v.size})")
    if q.size < MIN_POINTS:
        raise FuelsysInputError(
            f"a pump fit needs at least {MIN_POINTS} test points of flow, pressure and voltage (got {q.size})")
    m = np.broadcast_to(np.atleast_1d(_arr(mu, "viscosity", "Pa s", positive=True)).ravel(), q.shape)
    return q, p, v, m.astype(float)


def fit_pump(flow, dp, volts, mu, winding_ohm=None, kv=None):
    """Fit the gear-pump-and-motor model to the builder's test points.

    Least squares on the voltage residual (scipy.optimize.least_squares,
    trust-region reflective with φ, R, I_f, K_s >= 0), started from the
    linear solution.  Refused (FuelsysInputError) with a reason when the
    points cannot determine the coefficients: fewer than 4 points, all at one
    voltage, flows and pressures that move together, or a condition number or
    parameter standard error beyond :data:`MAX_CONDITION` /
    :data:`MAX_RELATIVE_ERROR`.

    Parameters
    ----------
    flow : array_like
        Measured volume flows [m³/s]
    dp : array_like
        Measured pressure rises (outlet minus inlet) [Pa]
    volts : array_like
        Motor terminal voltages [V]
    mu : array_like
        Fuel dynamic viscosity during each test point (one value or one per
        point) [Pa s]
    winding_ohm : float, optional
        Measured motor resistance; fixes R [Ω]
    kv : float, optional
        Motor speed constant, to give displacement and friction torque
        [rpm/V]

    Returns
    -------
    PumpFit
        Model, RMS voltage error [V], R² of the voltages [-], condition number
        of the column-scaled Jacobian [-], standard errors of the coefficients
        (same units as the coefficients).

    References
    ----------
    Wilson (1949); Bates & Watts (1988) §2.3 for the standard errors.

    Examples
    --------
    >>> true = GearPump.physical(4e-7, 1.2, 0.5, 2e-15)
    >>> q = np.array([4e-6, 3e-6, 5e-6, 2e-6, 4.5e-6]); dp = np.array([2e5, 4e5, 1e5, 3e5, 5e5])
    >>> mu = np.array([1.6e-3, 1.6e-3, 0.9e-3, 0.9e-3, 1.2e-3])
    >>> fit = fit_pump(q, dp, true.volts(q, dp, mu), mu)
    >>> round(fit.pump.winding_ohm, 3), round(fit.pump.slip * 1e15, 3)
    (1.2, 2.0)
    """
    q, p, v, m = _test_arrays(flow, dp, volts, mu)
    if not np.any(q > 0):
        raise FuelsysInputError("every test flow is zero: the fit needs the flows measured at each voltage")
    if np.ptp(v) <= 1e-6 * np.max(v):
        raise FuelsysInputError(
            f"all test points are at one voltage ({v[0]:g} V): the fit needs points at two or more voltages "
            "to tell the motor from the pump")
    if np.ptp(p) <= 1e-9 * max(np.max(np.abs(p)), 1.0):
        raise FuelsysInputError(
            f"all test points are at one pressure ({p[0] / 1e5:g} bar): test against two or more pressures")
    r_known = winding_ohm is not None
    r_fix = float(_arr(winding_ohm, "winding resistance", "Ω", nonneg=True)) if r_known else float("nan")
    mk = float("nan")
    if kv is not None:
        kv = float(_arr(kv, "motor speed constant", "rpm/V", positive=True))
        mk = 60.0 / (2.0 * np.pi * kv)
    mu_varies = np.ptp(m) > 0.02 * np.min(m)
    if r_known or not mu_varies:
        fit = _solve_fit(q, p, v, m, r_fix, lumped=not r_known, motor_k=mk)
        if not r_known:
            fit = replace(fit, note=COMBINED_NOTE_ONE_TEMPERATURE)
        return fit
    try:
        return _solve_fit(q, p, v, m, r_fix, lumped=False, motor_k=mk)
    except _Inseparable as exc:
        # the temperatures were too close to part motor resistance from pump slip: give what the data fix
        fit = _solve_fit(q, p, v, m, r_fix, lumped=True, motor_k=mk)
        return replace(fit, note=f"{COMBINED_NOTE_CLOSE_TEMPERATURES} ({exc})")


class _Inseparable(FuelsysInputError):
    """The points fix the combined pressure coefficient but not the resistance and the slip apart."""


#: notes of a fit that gives the motor resistance and the pump slip as one combined coefficient
COMBINED_NOTE_ONE_TEMPERATURE = (
    "one fuel temperature and no winding resistance: motor resistance and pump slip are combined in "
    "dp_v_per_bar, which holds only at the test viscosity; give winding_ohm for other temperatures")
COMBINED_NOTE_CLOSE_TEMPERATURES = (
    "the test temperatures are too close to part motor resistance from pump slip: they are combined in "
    "dp_v_per_bar at the mean test viscosity; give winding_ohm for other temperatures")


def _fit_scales(x0, names, phi0, q, p, v, m, lumped):
    """Scales that bring the fit's unknowns to order one [-] (see :func:`_solve_fit`)."""
    # scale to order one; keep start strictly inside the bounds.  A coefficient that starts at (or near)
    # zero gets the scale of a term worth a few per cent of the voltages, never its own near-zero start
    # (a start of 1e-17 V would shrink its Jacobian column to nothing: a spurious infinite condition number)
    v_typ = float(np.mean(np.abs(v)))
    scale = np.where(x0 > 0, x0, 1.0)
    scale[0] = phi0
    if lumped:
        scale[1] = max(x0[1], 0.05 * v_typ)
        scale[2] = max(x0[2], 0.05 * v_typ / max(np.mean(np.abs(p)), 1.0))
    if not lumped:
        k_slip = names.index("slip")
        # order of a slip worth 10 % of the flow at the mean pressure
        scale[k_slip] = max(x0[k_slip], 0.1 * np.mean(q) * np.mean(m) / max(np.mean(np.abs(p)), 1.0))
    if "winding_ohm" in names:
        k_r = names.index("winding_ohm")
        scale[k_r] = max(x0[k_r], 0.1 * np.mean(v) / max(np.mean(np.abs(p)) * phi0, 1e-30))
    if "friction_current" in names:
        k_i = names.index("friction_current")
        scale[k_i] = max(x0[k_i], 0.05 * np.mean(np.abs(p)) * phi0 + 1e-3)
    return scale


def _solve_fit(q, p, v, m, r_fix, lumped, motor_k):
    """Least-squares solve of :func:`fit_pump` for one model form (lumped, R known, or free) [-]."""
    from scipy.optimize import least_squares

    r_known = np.isfinite(r_fix)

    # linear start: V = b0 + b1 Q + b2 dp + b3 dp/mu
    if lumped:
        A = np.column_stack([np.ones_like(q), q, p])
    elif r_known:
        A = None
    else:
        A = np.column_stack([np.ones_like(q), q, p, p / m])

    def lin_start():
        if A is not None:
            b, *_ = np.linalg.lstsq(A / np.abs(A).max(axis=0), v, rcond=None)
            return b / np.abs(A).max(axis=0)
        # R known: V - R phi dp is nonlinear in phi; start from phi without slip
        A2 = np.column_stack([np.ones_like(q), q, p, p / m])
        s = np.abs(A2).max(axis=0)
        b, *_ = np.linalg.lstsq(A2 / s, v, rcond=None)
        return b / s

    b = lin_start()
    if not b[1] > 0:
        # a gear pump's flow rises with its motor's voltage at a given pressure; these points say otherwise
        raise FuelsysInputError(
            "in these test points the flow does not rise with the voltage at a given pressure, as a gear pump's "
            "does: check that flows, pressures and volts are in the same rows")
    phi0 = 1.0 / b[1]
    if lumped:
        names = ["phi", "v0", "dp_volts"]
        x0 = np.array([phi0, max(b[0], 0.0), max(b[2], 0.0)])

        def model(x):
            return x[1] + q / x[0] + x[2] * p
    elif r_known:
        names = ["phi", "friction_current", "slip"]
        i0 = max(b[0], 0.0) / r_fix if r_fix > 0 else 0.0
        ks0 = max(b[3] * phi0, 0.0)
        x0 = np.array([phi0, i0, ks0])

        def model(x):
            return r_fix * x[1] + q / x[0] + r_fix * x[0] * p + x[2] * p / (x[0] * m)
    else:
        names = ["phi", "winding_ohm", "friction_current", "slip"]
        r0 = max(b[2] / phi0, 0.0)
        i0 = max(b[0], 0.0) / r0 if r0 > 0 else 0.0
        x0 = np.array([phi0, r0, i0, max(b[3] * phi0, 0.0)])

        def model(x):
            return x[1] * x[2] + q / x[0] + x[1] * x[0] * p + x[3] * p / (x[0] * m)

    scale = _fit_scales(x0, names, phi0, q, p, v, m, lumped)
    z0 = np.clip(x0 / scale, 1e-6, None)
    z0[0] = 1.0

    def resid(z):
        return model(z * scale) - v

    sol = least_squares(resid, z0, bounds=(np.zeros(len(z0)), np.full(len(z0), np.inf)),
                        method="trf", x_scale="jac", xtol=1e-14, ftol=1e-14, gtol=1e-14, max_nfev=2000)
    x = sol.x * scale
    res = sol.fun
    J = sol.jac  # w.r.t. z (already scaled by 'scale')
    colnorm = np.linalg.norm(J, axis=0)
    if np.any(colnorm == 0):
        cond = np.inf
    else:
        sv = np.linalg.svd(J / colnorm, compute_uv=False)
        cond = float(sv[0] / sv[-1]) if sv[-1] > 0 else np.inf
    n, k = q.size, len(x)
    dof = n - k
    if (cond > MAX_CONDITION or not np.isfinite(cond)) and not lumped and not r_known:
        raise _Inseparable(f"condition number {cond:.3g}")
    if cond > MAX_CONDITION or not np.isfinite(cond):
        raise FuelsysInputError(
            f"the test points cannot fix the pump coefficients (condition number {cond:.3g}): spread them over "
            "two or more voltages and a range of pressures, not along one line")
    s2 = float(res @ res) / dof if dof > 0 else 0.0
    try:
        cov = np.linalg.inv(J.T @ J) * s2
        se = np.sqrt(np.clip(np.diag(cov), 0.0, None)) * scale
    except np.linalg.LinAlgError:
        se = np.full(k, np.inf)
    std = {nm: float(e) for nm, e in zip(names, se)}
    for nm, val, e in zip(names, x, se):
        if (dof > 0 and val > 0 and e / val > SPLIT_MAX_RELATIVE_ERROR and nm in ("winding_ohm", "slip")
                and not lumped and not r_known):
            raise _Inseparable(f"standard error of {nm} {100 * e / val:.0f} % of its value")
        if dof > 0 and val > 0 and e / val > MAX_RELATIVE_ERROR and nm == "phi":
            raise FuelsysInputError(
                f"the test points leave the pump coefficient {nm} uncertain (standard error {100 * e / val:.0f} % "
                "of its value): add points at other voltages and pressures")
    ss_tot = float(np.sum((v - v.mean()) ** 2))
    r2 = 1.0 - float(res @ res) / ss_tot if ss_tot > 0 else 1.0
    mk = motor_k
    x = [float(e) for e in x]
    if lumped:
        pump = GearPump(phi=x[0], winding_ohm=float("nan"), friction_current=float("nan"),
                        slip=float("nan"), v0=x[1], dp_volts=x[2], mu_fit=float(np.mean(m)), motor_k=mk)
    else:
        R = r_fix if r_known else x[1]
        pump = GearPump.physical(x[0], R, x[names.index("friction_current")], x[names.index("slip")], mk)
    pump = replace(pump, v_tested=(float(np.min(v)), float(np.max(v))))
    return PumpFit(pump=pump, rms_volts=float(np.sqrt(np.mean(res**2))), r_squared=r2, condition=cond,
                   std_errors=std, n_points=n, residuals=res, mu_test=float(np.mean(m)))


# -- operating points, voltage, battery ------------------------------------------------
def operating_flow(pump, volts, system_curve, mu, q_max=None, tol=1e-12):
    """Volume flow where the pump curve at ``volts`` meets the system curve.

    ``system_curve(q)`` returns the pressure rise the system needs at volume
    flow q (vectorised, rising with q).  The pump's deliverable flow falls with
    pressure, so g(q) = pump.flow(V, system_curve(q)) - q falls and has one
    root in [0, pump.flow(V, system_curve(0))], found by vectorised bisection.

    Parameters
    ----------
    pump : GearPump
        Fitted pump [-]
    volts : array_like
        Terminal voltage [V]
    system_curve : callable
        q [m³/s] -> required pressure rise [Pa] [-]
    mu : array_like
        Fuel dynamic viscosity [Pa s]
    q_max : float, optional
        Upper bracket [m³/s]
    tol : float
        Relative flow tolerance [-]

    Returns
    -------
    float or ndarray
        Volume flow at the operating point, 0 where the pump cannot open the
        system at that voltage [m³/s]

    References
    ----------
    Intersection of pump and system curves, e.g. Karassik et al., "Pump
    Handbook", 4th ed., McGraw-Hill 2008, §2.1; bisection (Press et al.,
    Numerical Recipes 3rd ed., §9.1).

    Examples
    --------
    >>> p = GearPump.physical(4e-7, 1.0, 0.4, 2e-15)
    >>> sysc = lambda q: 1e5 + 1e16 * q**2
    >>> q = operating_flow(p, 12.0, sysc, 1.5e-3)
    >>> abs(p.flow(12.0, sysc(q), 1.5e-3) - q) < 1e-15
    True
    """
    v = _arr(volts, "voltage", "V", nonneg=True)
    mu = _arr(mu, "viscosity", "Pa s", positive=True)
    shape = np.broadcast(v, mu).shape
    v = np.broadcast_to(v, shape)
    mu = np.broadcast_to(mu, shape)
    hi = np.asarray(pump.flow(v, system_curve(np.zeros(shape)), mu), dtype=float)
    if q_max is not None:
        hi = np.minimum(hi, float(q_max))
    lo = np.zeros(shape)
    hi = np.array(hi, dtype=float)
    scale = np.maximum(hi, 1e-30)
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        g = np.asarray(pump.flow(v, system_curve(mid), mu)) - mid
        up = g > 0
        lo = np.where(up, mid, lo)
        hi = np.where(up, hi, mid)
        if np.all(hi - lo <= tol * scale):
            break
    return _out(0.5 * (lo + hi))


def battery_check(pump, flow, dp, mu, battery_volts):
    """Voltage needed for each demand, the headroom against a battery, and a verdict.

    Parameters
    ----------
    pump : GearPump
        Fitted pump [-]
    flow : array_like
        Volume flow demanded [m³/s]
    dp : array_like
        Pressure rise the system needs at that flow [Pa]
    mu : array_like
        Fuel dynamic viscosity [Pa s]
    battery_volts : float
        Voltage the battery holds under load [V]

    Returns
    -------
    dict
        ``volts`` needed [V], ``headroom`` battery minus needed [V],
        ``headroom_pct`` of the battery [%], ``ok`` (bool array), ``verdict``
        (text naming the worst point and the shortfall).

    References
    ----------
    :meth:`GearPump.volts`.

    Examples
    --------
    >>> p = GearPump.physical(4e-7, 1.0, 0.4, 2e-15)
    >>> battery_check(p, 5e-6, 3e5, 1.5e-3, 11.1)["ok"]
    False
    """
    vb = float(_arr(battery_volts, "battery voltage", "V", positive=True))
    need = np.asarray(pump.volts(flow, dp, mu), dtype=float)
    head = vb - need
    ok = head >= 0
    if np.all(ok):
        verdict = f"the pump meets every demand with {float(np.min(head)):.2f} V to spare at {vb:g} V"
    else:
        i = int(np.argmax(np.ravel(need)))
        q = float(np.ravel(np.broadcast_to(np.asarray(flow, dtype=float), need.shape))[i])
        verdict = (f"the pump cannot meet the demand at {vb:g} V: {q * 6e7:.0f} mL/min needs "
                   f"{float(np.ravel(need)[i]):.2f} V, short by {float(-np.ravel(head)[i]):.2f} V")
    return {"volts": _out(need), "headroom": _out(head), "headroom_pct": _out(100.0 * head / vb),
            "ok": _out(ok) if np.ndim(ok) else bool(ok), "verdict": verdict}


def require_battery(pump, flow, dp, mu, battery_volts):
    """Raise FuelsysInputError with the shortfall when the battery cannot drive the demand.

    Parameters
    ----------
    pump : GearPump
        Fitted pump [-]
    flow : array_like
        Volume flow demanded [m³/s]
    dp : array_like
        Pressure rise needed [Pa]
    mu : array_like
        Fuel dynamic viscosity [Pa s]
    battery_volts : float
        Battery voltage under load [V]

    Returns
    -------
    dict
        As :func:`battery_check` when every demand is met.

    References
    ----------
    :func:`battery_check`.

    Examples
    --------
    >>> p = GearPump.physical(4e-7, 1.0, 0.4, 2e-15)
    >>> require_battery(p, 2e-6, 1e5, 1.5e-3, 12.0)["ok"]
    True
    """
    out = battery_check(pump, flow, dp, mu, battery_volts)
    if not np.all(out["ok"]):
        raise FuelsysInputError(out["verdict"])
    return out


def fit_row(fit: PumpFit, temp_c=None):
    """The fit as a labelled two-row table (labels, values) in builders' units.

    Parameters
    ----------
    fit : PumpFit
        Result of :func:`fit_pump` [-]
    temp_c : float, optional
        Fuel temperature of the test, for the record [°C]

    Returns
    -------
    list
        [[labels...], [values...]]; texts where a coefficient is not known.

    References
    ----------
    :func:`fit_pump`.

    Examples
    --------
    >>> true = GearPump.physical(4e-7, 1.2, 0.5, 2e-15)
    >>> q = np.array([4e-6, 3e-6, 5e-6, 2e-6]); dp = np.array([2e5, 4e5, 1e5, 3e5])
    >>> fit_row(fit_pump(q, dp, true.volts(q, dp, 1.2e-3), 1.2e-3, winding_ohm=1.2))[0][0]
    'flow_per_volt_ml_min_v'
    """
    p = fit.pump
    na = "n/a"

    def num(x, f=1.0, missing=na):
        return float(x * f) if np.isfinite(x) else missing

    labels = ["flow_per_volt_ml_min_v", "winding_ohm", "friction_a", "slip_mm3", "v0_v", "dp_v_per_bar",
              "fit_viscosity_mpas", "motor_k_mnm_a", "displacement_ml_rev", "rms_v", "r2", "condition",
              "points", "tested_min_v", "tested_max_v"]
    mu = fit.mu_test if np.isfinite(fit.mu_test) else p.mu_fit
    dp_volts = p.dp_volts if not p.separable else float(p._dp_coef(mu))
    combined = "combined in dp_v_per_bar"  # resistance and slip not parted: says so in their cells
    values = [p.phi * 6e7, num(p.winding_ohm, missing=combined), num(p.friction_current, missing=combined),
              num(p.slip, 1e9, missing=combined), p.v0,
              dp_volts * 1e5, num(mu, 1e3), num(p.motor_k, 1e3),
              num(p.displacement * 2 * np.pi, 1e6), fit.rms_volts, fit.r_squared, fit.condition,
              float(fit.n_points), num(p.v_tested[0]), num(p.v_tested[1])]
    return [labels, values]


def pump_from_row(cells):
    """Rebuild a :class:`GearPump` from the table :func:`fit_row` gives (labels + values).

    Accepts the two rows as given, transposed (two columns), with extra empty
    cells, labels in any case and in any order.

    Parameters
    ----------
    cells : list of lists
        The range holding labels and values [-]

    Returns
    -------
    GearPump
        The pump model [-]

    References
    ----------
    :func:`fit_row`.

    Examples
    --------
    >>> row = [["flow_per_volt_ml_min_v", "v0_v", "dp_v_per_bar", "winding_ohm", "friction_a", "slip_mm3"],
    ...        [24.0, 0.5, 0.3, 1.0, 0.5, 2e-6]]
    >>> round(pump_from_row(row).phi * 6e7, 6)
    24.0
    """
    rows = [list(r) if isinstance(r, (list, tuple)) else [r] for r in cells]
    pairs = {}

    def value_like(x):
        return (isinstance(x, (int, float)) and not isinstance(x, bool)) or (
            isinstance(x, str) and (x.strip().lower() == "n/a" or x.strip().lower().startswith("combined")))

    for grid in (rows, [list(c) for c in zip(*rows)] if rows and all(len(r) == len(rows[0]) for r in rows) else []):
        for i in range(len(grid) - 1):
            for j, lab in enumerate(grid[i]):
                if isinstance(lab, str) and lab.strip() and j < len(grid[i + 1]) and value_like(grid[i + 1][j]):
                    pairs.setdefault(lab.strip().lower(), grid[i + 1][j])
    # row-wise pairs (label in one cell, value in the next)
    for r in rows:
        for j in range(len(r) - 1):
            if isinstance(r[j], str) and r[j].strip() and value_like(r[j + 1]):
                pairs.setdefault(r[j].strip().lower(), r[j + 1])

    def get(key, required=True):
        val = pairs.get(key)
        if isinstance(val, bool):
            val = None
        if isinstance(val, (int, float)) and np.isfinite(val):
            return float(val)
        if required:
            raise FuelsysInputError(
                f"coefficients: no number labelled {key!r}; pass the whole range that FS_PUMP_FIT returned "
                "(labels and values)")
        return float("nan")

    phi = get("flow_per_volt_ml_min_v") / 6e7
    if phi <= 0:
        raise FuelsysInputError("coefficients: flow_per_volt_ml_min_v must be > 0")
    v0 = get("v0_v")
    dpv = get("dp_v_per_bar") / 1e5
    r = get("winding_ohm", False)
    i_f = get("friction_a", False)
    ks = get("slip_mm3", False) / 1e9
    mu = get("fit_viscosity_mpas", False) / 1e3
    mk = get("motor_k_mnm_a", False) / 1e3
    tested = (get("tested_min_v", False), get("tested_max_v", False))
    if np.isfinite(ks) and np.isfinite(r) and np.isfinite(i_f):
        return replace(GearPump.physical(phi, r, i_f, ks, mk), v_tested=tested)
    if not np.isfinite(mu):
        raise FuelsysInputError("coefficients: a lumped fit needs its fit_viscosity_mpas")
    return GearPump(phi=phi, winding_ohm=float("nan"), friction_current=float("nan"), slip=float("nan"),
                    v0=v0, dp_volts=dpv, mu_fit=mu, motor_k=mk, v_tested=tested)
