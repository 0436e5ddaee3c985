"""The one temperature solver: T at a given pressure such that h(P, T) or s(P, T) hits a target.

Used where the property library's own P-h and P-s flashes do not serve:

* mixtures, whose flashes are phase-specified P-T flashes (the gas region only);
* water on IAPWS-IF97, whose backward equations T(P, h) and T(P, s) agree with the forward
  equations only to the release's consistency limits (about 25 mK, which moves a pump's
  enthalpy rise by tenths of a percent): the state is made consistent with the forward
  equations here (:func:`if97_state`, :func:`if97_states`).

Single states use Newton's method (the slope dh/dT = cp or ds/dT = cp/T from the same
flash), falling back to Brent's method (:func:`scipy.optimize.brentq`) on the bracket when an
iterate leaves it.  Arrays use the vectorised :func:`scipy.optimize.newton`; only the entries
not yet converged are flashed, and the slope is kept once the steps shrink fast (chord steps,
as the heat capacity hardly changes near the root); entries that leave their bracket (narrowed
by the iterates) are solved on it by Chandrupatla's method
(:func:`scipy.optimize.elementwise.find_root`).  Entries that still fail are reported, so the
caller can hand them to the single-state method.

References
----------
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam (consistency of the backward equations).
R. P. Brent, Algorithms for Minimization without Derivatives, Prentice-Hall, 1973.
"""

from __future__ import annotations

import math
import warnings

import CoolProp.CoolProp as CP
import numpy as np
from scipy.optimize import brentq, newton
from scipy.optimize.elementwise import find_root

from ..errors import PropertyError
from .state import State, StateArray, empty_columns

#: Relative step [-] at which Newton's method on temperature has converged (mixtures).
RTOL_MIXTURE = 1e-8
#: Relative step [-] at which the IF97 consistency iteration has converged.
RTOL_IF97 = 1e-10


class NoRootInBracket(PropertyError):
    """The target lies outside the values at the ends of the bracket.

    Attributes
    ----------
    side : str
        ``"low"`` when the target is below the value at the low end, ``"high"`` when above
        the value at the high end.
    """

    def __init__(self, side: str):
        super().__init__(f"no temperature in the bracket reaches the target ({side} side)")
        self.side = side


def _pick(state, prop: str) -> float:
    return state.h if prop == "h" else state.s


def temperature_root(flash_PT, P: float, target: float, prop: str, T0: float, lo: float,
                     hi: float, *, rtol: float = RTOL_MIXTURE, maxiter: int = 60):
    """The state at pressure P where h (or s) equals the target, with T in [lo, hi].

    Parameters
    ----------
    flash_PT : callable
        ``flash_PT(P, T) -> State`` (with ``cp``), raising PropertyError where it fails.
    P : float
        Pressure [Pa].
    target : float
        Specific enthalpy [J/kg] (``prop="h"``) or entropy [J/(kg K)] (``prop="s"``).
    prop : {"h", "s"}
        Which property the target is.
    T0 : float
        Starting temperature [K], inside (lo, hi).
    lo, hi : float
        Bracket [K]; h and s rise with temperature at constant pressure.
    rtol : float
        Newton's method stops when a step is below ``rtol`` times the temperature.
    maxiter : int
        Most Newton steps before Brent's method takes over.

    Returns
    -------
    State
        The state at the root (flashed there).

    Raises
    ------
    NoRootInBracket
        The target lies below the value at ``lo`` or above the value at ``hi``.
    PropertyError
        A flash failed, or neither method converged.

    References
    ----------
    R. P. Brent (1973) and scipy.optimize.brentq (the safeguard).

    Examples
    --------
    >>> import workbench as wb
    >>> air = wb.Fluid("Air")
    >>> h = air.state_PT(1e5, 350.0).h
    >>> round(temperature_root(air.state_PT, 1e5, h, "h", 300.0, 200.0, 1000.0).T, 6)
    350.0
    """
    # Newton's method, written out: scipy.optimize.newton costs two numpy.isclose calls per
    # step, which doubled the time of an IF97 state (a flash costs a few microseconds).
    T = T0
    for _ in range(maxiter):
        state = flash_PT(P, T)
        f = _pick(state, prop) - target
        if f == 0:
            return state
        slope = state.cp if prop == "h" else state.cp / state.T
        if not (math.isfinite(slope) and slope > 0):
            break
        T_new = T - f / slope
        if not lo < T_new < hi:
            break  # left the bracket: the safeguard takes over
        if abs(T_new - T) <= rtol * T:
            return flash_PT(P, T_new)
        T = T_new
    return _bracketed_root(flash_PT, P, target, prop, lo, hi)


def _bracketed_root(flash_PT, P, target, prop, lo, hi):
    """Brent's method on [lo, hi] (the safeguard of :func:`temperature_root`)."""
    f_lo = _pick(flash_PT(P, lo), prop) - target
    if f_lo > 0:
        raise NoRootInBracket("low")
    if f_lo == 0:
        return flash_PT(P, lo)
    f_hi = _pick(flash_PT(P, hi), prop) - target
    if f_hi < 0:
        raise NoRootInBracket("high")
    if not (math.isfinite(f_lo) and math.isfinite(f_hi)):
        raise PropertyError(f"the temperature solver found no finite values at {P:.6g} Pa")
    try:
        root = brentq(lambda T: _pick(flash_PT(P, T), prop) - target, lo, hi,
                      xtol=1e-12 * hi, rtol=1e-14, maxiter=200)
    except RuntimeError:  # pragma: no cover - Brent's method converges on a bracket
        raise PropertyError(f"the temperature solver did not converge at {P:.6g} Pa") from None
    return flash_PT(P, float(root))


class _ArrayIteration:
    """Residual and slope of many entries for the vectorised Newton's method.

    Only the entries still iterating are flashed: converged entries and entries that failed
    (left their bracket, non-finite value, non-positive slope) return a zero residual, so
    scipy leaves them where they are.  Convergence is decided here, on the step just taken
    (below ``rtol`` times the temperature), as the array form of scipy's test is absolute.
    """

    def __init__(self, values, slopes, P, target, lower, upper, rtol, maxiter):
        n = len(P)
        self.values, self.slopes_of = values, slopes
        self.P, self.target = P, target
        self.lower, self.upper = lower.copy(), upper.copy()  # narrowed by the iterates
        self.rtol, self.maxiter, self.calls = rtol, maxiter, 0
        self.previous = np.full(n, np.nan)
        self.last_step = np.full(n, np.inf)
        self.slope = np.full(n, np.nan)
        self.fresh = np.ones(n, dtype=bool)
        self.root = np.full(n, np.nan)
        self.failed = np.zeros(n, dtype=bool)
        self.left = np.zeros(n, dtype=bool)  # left the bracket or ran out of iterations
        self.active = np.arange(n)

    def residual(self, T):
        self.calls += 1
        act = self.active
        Ta = T[act]
        step = Ta - self.previous[act]
        first = np.isnan(step)
        converged = np.abs(step) < self.rtol * Ta
        self.root[act[converged]] = Ta[converged]
        left = ~converged & ~first & ~((Ta > self.lower[act]) & (Ta < self.upper[act]))
        self.failed[act[left]] = self.left[act[left]] = True
        # Near the root the heat capacity hardly changes: keep the slope (chord steps) once
        # the step is below 1e-4 of the temperature and the steps shrink fast.
        self.fresh[act] = first | (np.abs(step) > 1e-4 * self.previous[act]) | (
            np.abs(step) > 1e-3 * self.last_step[act])
        self.last_step[act] = np.where(first, np.inf, np.abs(step))
        act = act[~converged & ~left]
        if self.calls > self.maxiter:
            self.failed[act] = self.left[act] = True
            act = act[:0]
        out = np.zeros(len(T))
        if len(act):
            f = self.values(self.P[act], T[act]) - self.target[act]
            bad = ~np.isfinite(f)
            self.failed[act[bad]] = True
            exact = f == 0  # a root hit exactly (scipy stops where every residual is zero)
            self.root[act[exact]] = T[act[exact]]
            act, f = act[~bad & ~exact], f[~bad & ~exact]
            out[act] = f
            self.previous[act] = T[act]
            above = f > 0  # h and s rise with temperature: the root lies below
            self.upper[act[above]] = np.minimum(self.upper[act[above]], T[act[above]])
            self.lower[act[~above]] = np.maximum(self.lower[act[~above]], T[act[~above]])
        self.active = act
        return out

    def derivative(self, T):
        act = self.active
        again = act[self.fresh[act]]
        if len(again):
            self.slope[again] = self.slopes_of(self.P[again], T[again])
        out = np.ones(len(T))
        slope = self.slope[act]
        bad = ~(np.isfinite(slope) & (slope > 0))
        self.failed[act[bad]] = True
        out[act] = np.where(bad, 0.0, slope)  # a zero slope: scipy leaves the entry alone
        self.active = act[~bad]
        return out


def temperature_roots(values, slopes, P, target, T0, lower, upper, *,
                      rtol: float = RTOL_IF97, maxiter: int = 60):
    """Array form of :func:`temperature_root`.

    Newton's method (vectorised); entries whose iterate leaves the bracket (narrowed by the
    iterates so far) or that do not converge are solved on that bracket by Chandrupatla's
    bracketing method (:func:`scipy.optimize.elementwise.find_root`).

    Parameters
    ----------
    values : callable
        ``values(P, T) -> h or s`` [J/kg or J/(kg K)] for arrays of entries.
    slopes : callable
        ``slopes(P, T) -> dh/dT = cp or ds/dT = cp/T`` for arrays of entries.
    P, target, T0 : numpy.ndarray
        Pressures [Pa], targets, starting temperatures [K] (inside their brackets).
    lower, upper : numpy.ndarray
        Brackets [K], inside which the root is sought.
    rtol : float
        Convergence: a step below ``rtol`` times the temperature.
    maxiter : int
        Most residual evaluations of an entry.

    Returns
    -------
    T : numpy.ndarray
        Roots [K], NaN where not converged.
    converged : numpy.ndarray
        Boolean mask.

    References
    ----------
    scipy.optimize.newton (its vectorised form for an array ``x0``); T. R. Chandrupatla,
    "A new hybrid quadratic/bisection algorithm for finding the zero of a nonlinear function
    without using derivatives", Adv. Eng. Software 28 (1997) 145-149.

    Examples
    --------
    >>> import numpy as np
    >>> T, ok = temperature_roots(lambda P, T: 1000.0 * T, lambda P, T: np.full(len(T), 1e3),
    ...                           np.ones(2), np.array([3e5, 4e5]), np.array([290.0, 390.0]),
    ...                           np.array([200.0, 200.0]), np.array([900.0, 900.0]))
    >>> T.round(9).tolist(), ok.tolist()
    ([300.0, 400.0], [True, True])
    """
    T0 = np.asarray(T0, dtype=float)
    n = len(T0)
    if n == 0:
        return np.empty(0), np.zeros(0, dtype=bool)
    if n == 1:  # scipy's array form needs two entries at least: add a frozen copy
        P, target, lower, upper, T0 = (np.append(a, a) for a in (P, target, lower, upper, T0))
    run = _ArrayIteration(values, slopes, P, target, lower, upper, rtol, maxiter)
    if n == 1:
        run.failed[1], run.active = True, run.active[:1]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", RuntimeWarning)
        try:
            newton(run.residual, T0, fprime=run.derivative, tol=np.finfo(float).tiny,
                   maxiter=maxiter + 2)
        except RuntimeError:  # scipy: "all failed to converge"; the mask below says which
            pass
    converged = np.isfinite(run.root) & ~run.failed
    root = np.where(converged, run.root, np.nan)
    retry = np.flatnonzero(run.left[:n])
    if len(retry):  # the safeguard: Chandrupatla's bracketing method on the narrowed bracket
        found = find_root(lambda T, p, t: values(p, T) - t,
                          (run.lower[retry], run.upper[retry]),
                          args=(run.P[retry], run.target[retry]),
                          tolerances=dict(xrtol=1e-13, xatol=0.0), maxiter=200)
        ok = np.asarray(found.success, dtype=bool)
        root[retry[ok]] = np.asarray(found.x)[ok]
        converged[retry[ok]] = True
    return root[:n], converged[:n]


def if97_state(fluid, P: float, target: float, prop: str):
    """An IF97 state at P [Pa] with h (or s) equal to the target, consistent with the forward
    equations.

    The two-phase region is resolved with the saturation states and the lever rule; single-
    phase states by :func:`temperature_root` on the forward equations, started from the
    backward-equation estimate and bracketed by the saturation temperature.  Where the
    iteration cannot run, the backward-equation estimate is returned.

    Parameters
    ----------
    fluid : Fluid
        Water on the IF97 backend.
    P : float
        Pressure [Pa].
    target : float
        Specific enthalpy [J/kg] or entropy [J/(kg K)].
    prop : {"h", "s"}

    Returns
    -------
    State

    References
    ----------
    IAPWS R7-97(2012).

    Examples
    --------
    >>> import workbench as wb
    >>> steam = wb.Fluid("Water", backend="IF97")
    >>> round(if97_state(steam, 1e5, steam.state_PT(1e5, 400.0).h, "h").T, 6)
    400.0
    """
    lo, hi = fluid.T_min, fluid.T_max
    if P < fluid.P_critical:
        liq, vap = fluid.saturation_states(P)
        low, high = _pick(liq, prop), _pick(vap, prop)
        if low <= target <= high:
            x = (target - low) / (high - low)
            v = (1 - x) / liq.rho + x / vap.rho
            return State(fluid, P, liq.T, liq.h + x * (vap.h - liq.h),
                         liq.s + x * (vap.s - liq.s), 1.0 / v, x, math.nan, "two-phase")
        if target > high:
            lo = liq.T
        else:
            hi = liq.T
    try:
        if prop == "h":
            approx = fluid.flash(CP.HmassP_INPUTS, target, P, f"P={P:.6g} Pa, h={target:.6g}")
        else:
            approx = fluid.flash(CP.PSmass_INPUTS, P, target, f"P={P:.6g} Pa, s={target:.6g}")
    except PropertyError as exc:
        # The library has no backward equation there (parts of region 3, near the critical
        # point): start in the middle of the bracket; the safeguard finds the root.
        approx, refusal = None, exc
    T0 = 0.5 * (lo + hi) if approx is None else approx.T
    T0 = min(max(T0, lo * (1 + 1e-9)), hi * (1 - 1e-9))
    try:
        return temperature_root(fluid.flash_PT, P, target, prop, T0, lo, hi, rtol=RTOL_IF97)
    except PropertyError:
        if approx is None:
            raise refusal from None
        return approx


def _lever_rule(P, target, prop, sat, out, phase):
    """Fill the two-phase entries (lever rule between the saturation states) and return the
    start temperatures and brackets of the single-phase entries below the critical pressure.

    ``sat`` is ``(idx, t_sat, liquid, vapour)`` from :meth:`Fluid.saturation_arrays`.
    """
    idx, t_sat, liq, vap = sat
    low, high, value = liq[prop], vap[prop], target[idx]
    two = (low <= value) & (value <= high)
    x = (value[two] - low[two]) / (high[two] - low[two])
    rows = idx[two]
    out["T"][rows] = t_sat[two]
    out["h"][rows] = liq["h"][two] + x * (vap["h"][two] - liq["h"][two])
    out["s"][rows] = liq["s"][two] + x * (vap["s"][two] - liq["s"][two])
    out["rho"][rows] = 1.0 / ((1 - x) / liq["rho"][two] + x / vap["rho"][two])
    out["x"][rows] = x
    phase[rows] = "two-phase"
    # Single-phase entries: start on the saturation line with a typical heat capacity
    # (vapour 2.1, liquid 4.2 kJ/(kg K)); the saturation temperature bounds the root.
    starts = []
    for side, edge, c_p in ((value > high, vap, 2100.0), (value < low, liq, 4200.0)):
        excess = value[side] - edge[prop][side]
        if prop == "h":
            T = t_sat[side] + excess / c_p
        else:
            with np.errstate(over="ignore"):  # an absurd entropy: clipped to the bracket later
                T = t_sat[side] * np.exp(excess / c_p)
        starts.append((idx[side], T, t_sat[side]))
    return starts


def if97_states(fluid, P, target, prop: str, valid):
    """Array form of :func:`if97_state` for arrays of pressure [Pa] and h or s.

    Entries that do not converge, or whose iterate leaves its bracket, are returned not
    valid; the caller hands them to the single-state method, which decides.

    Returns
    -------
    StateArray

    References
    ----------
    IAPWS R7-97(2012).

    Examples
    --------
    >>> import workbench as wb
    >>> steam = wb.Fluid("Water", backend="IF97")
    >>> states = if97_states(steam, np.array([1e5]), np.array([7500.0]), "s",
    ...                      np.array([True]))
    >>> states.valid.tolist(), round(float(states.T[0]), 3) > 373.0
    ([True], True)
    """
    n = len(P)
    key = "H" if prop == "h" else "S"
    out, phase = empty_columns(n)
    valid = valid.copy()
    lower, upper = np.full(n, fluid.T_min), np.full(n, fluid.T_max)
    T = np.full(n, np.nan)
    idx = np.flatnonzero(valid & (P < fluid.P_critical))
    if len(idx):
        t_sat, liq, vap = fluid.saturation_arrays(P[idx])
        gas, liquid = _lever_rule(P, target, prop, (idx, t_sat, liq, vap), out, phase)
        T[gas[0]], lower[gas[0]] = gas[1], gas[2]
        T[liquid[0]], upper[liquid[0]] = liquid[1], liquid[2]
    high = np.flatnonzero(valid & (P >= fluid.P_critical))
    if len(high):  # start from the backward equations, or mid-range where they have none
        T[high] = fluid.array_property("T", "P", P[high], key, target[high])
        T[high[np.isnan(T[high])]] = 0.5 * (fluid.T_min + fluid.T_max)
    active = np.flatnonzero(valid & (phase != "two-phase"))
    T0 = np.clip(T[active], lower[active] * (1 + 1e-9), upper[active])

    def values(p, t):
        return fluid.array_property(key, "P", p, "T", t)

    def slopes(p, t):
        cp = fluid.array_property("C", "P", p, "T", t)
        return cp if prop == "h" else cp / t

    roots, converged = temperature_roots(values, slopes, P[active], target[active], T0,
                                         lower[active], upper[active], rtol=RTOL_IF97)
    valid[active[~converged]] = False  # the single-state method decides
    single = active[converged]
    if len(single):
        found = fluid.read_states(P[single], "P", P[single], "T", roots[converged],
                                  np.ones(len(single), dtype=bool))
        for name in ("T", "h", "s", "rho", "cp"):
            out[name][single] = getattr(found, name)
        phase[single] = found.phase
        valid[single] = found.valid
    valid &= np.isfinite(out["T"]) & fluid.temperature_ok(out["T"])
    return StateArray(fluid, P, out["T"], out["h"], out["s"], out["rho"], out["x"], out["cp"],
                      phase, valid).masked(valid)
