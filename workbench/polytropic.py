"""Polytropic head and efficiency.

Two methods, both reported by the machines:

* **Schultz's method**: polytropic volume exponents from the end states and the Schultz
  correction factor ``f`` that makes the isentropic head exact for a real gas.
* **Direct integration** of the constant-efficiency polytropic path
  ``dh = v dP / eta_p`` (compression) or ``dh = eta_p v dP`` (expansion) from the inlet to the
  outlet pressure with a fourth-order Runge-Kutta scheme in ``ln P`` (fixed steps doubled until the
  result is stable for gas mixtures, adaptive steps for pure fluids).  For a rating (both end states known) the efficiency is
  found by a secant iteration so that the path ends at the measured outlet enthalpy.

References
----------
J. M. Schultz, "The Polytropic Analysis of Centrifugal Compressors", ASME Journal of
Engineering for Power 84 (1962) 69-82.
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters, section 5 and
appendix E (polytropic work, Schultz factor).
R. A. Huntington, "Evaluation of Polytropic Calculation Methods for Turbomachinery
Performance", ASME Journal of Engineering for Gas Turbines and Power 107 (1985) 872-876.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from scipy.integrate import solve_ivp

from .errors import PropertyError
from .properties import State

#: Efficiency stability reached by the path integration and the secant iteration [-].
EFFICIENCY_TOLERANCE = 1e-6


@dataclass(frozen=True)
class SchultzResult:
    """Schultz polytropic analysis between two end states.

    Attributes
    ----------
    isentropic_exponent : float
        Isentropic volume exponent n_s = ln(P2/P1) / ln(v1/v2s) [-].
    polytropic_exponent : float
        Polytropic volume exponent n = ln(P2/P1) / ln(v1/v2) [-].
    schultz_factor : float
        f = (h2s - h1) / [n_s/(n_s - 1) (P2 v2s - P1 v1)] [-].
    polytropic_head : float
        f n/(n-1) (P2 v2 - P1 v1), as a positive magnitude [J/kg].
    polytropic_efficiency : float
        Polytropic head over enthalpy change (compression) or its inverse (expansion) [-].
    """

    isentropic_exponent: float
    polytropic_exponent: float
    schultz_factor: float
    polytropic_head: float
    polytropic_efficiency: float


def _volume_term(P1, v1, P2, v2):
    """Return n/(n-1) (P2 v2 - P1 v1) and n, stable for nearly incompressible fluids."""
    ln_p = math.log(P2 / P1)
    ln_v = math.log(v1 / v2)
    if abs(ln_v) < 1e-12:
        # Incompressible limit n -> infinity: n/(n-1) (P2 v2 - P1 v1) -> v (P2 - P1).
        return v1 * (P2 - P1), math.inf
    n = ln_p / ln_v
    if abs(n - 1.0) < 1e-12:
        # Isothermal ideal-gas limit: n/(n-1) (P2 v2 - P1 v1) -> P1 v1 ln(P2/P1).
        return P1 * v1 * ln_p, n
    return n / (n - 1.0) * (P2 * v2 - P1 * v1), n


def schultz(inlet: State, outlet: State, isentropic_outlet: State) -> SchultzResult:
    """Schultz polytropic head and efficiency from inlet, actual and isentropic outlet states.

    Parameters
    ----------
    inlet, outlet, isentropic_outlet : State
        End states at the inlet pressure P1 and the outlet pressure P2 [Pa]; the isentropic
        outlet has the inlet entropy.

    Returns
    -------
    SchultzResult

    References
    ----------
    Schultz (1962); ASME PTC 10-1997 equations 5.1T-6 to 5.1T-9.
    """
    P1, v1 = inlet.P, inlet.v
    P2 = outlet.P
    term_s, n_s = _volume_term(P1, v1, P2, isentropic_outlet.v)
    term, n = _volume_term(P1, v1, P2, outlet.v)
    dh_s = isentropic_outlet.h - inlet.h
    dh = outlet.h - inlet.h
    f = dh_s / term_s if term_s != 0 else math.nan
    head = f * term  # signed: positive for compression
    if P2 > P1:
        eta = head / dh if dh != 0 else math.nan
    else:
        eta = dh / head if head != 0 else math.nan
    return SchultzResult(n_s, n, f, abs(head), eta)


def _path(inlet: State, P_out: float, efficiency: float, steps: int, stations=None):
    """Integrate the constant-efficiency polytropic path; return (h_end, T_end, head).

    The path obeys T ds = (1/eta - 1) v dP for compression and (eta - 1) v dP for expansion,
    that is dh = factor * v dP with factor = 1/eta (compression) or eta (expansion).  The
    polytropic head is the path integral of v dP.

    Mixtures (single-phase gas, smooth properties) use fixed-step RK4 with ``steps`` steps and
    temperature as the path variable.  Pure fluids use enthalpy as the path variable and an
    adaptive Runge-Kutta 4(5) scheme (Dormand-Prince, relative tolerance 1e-10) because the
    path may cross the saturation line, where v(P, h) has a kink that a fixed-step scheme
    resolves only slowly; ``steps`` is then ignored.
    """
    fluid = inlet.fluid
    compression = P_out > inlet.P
    factor = 1.0 / efficiency if compression else efficiency
    x0, x1 = math.log(inlet.P), math.log(P_out)
    if not fluid.is_mixture:
        def rhs_pure(x, y):
            P = math.exp(x)
            st = fluid.state_Ph(P, y[0])
            return [factor * P * st.v, P * st.v]

        sol = solve_ivp(rhs_pure, (x0, x1), [inlet.h, 0.0], method="RK45", rtol=1e-10,
                        atol=[1e-6, 1e-6], t_eval=None if stations is None else
                        [x0 + (x1 - x0) * k / steps for k in range(steps + 1)])
        if not sol.success:
            raise PropertyError("the polytropic path integration did not converge")
        if stations is not None:
            stations.extend((math.exp(x), h) for x, h in zip(sol.t, sol.y[0]))
        return float(sol.y[0, -1]), math.nan, float(sol.y[1, -1])

    # Mixtures: path variable T, dT/dlnP = P (factor v - (dh/dP)_T) / cp; head integrand P v.
    def rhs(x, T):
        P = math.exp(x)
        st, dhdp = fluid.gas_path_point(P, T)
        return P * (factor * st.v - dhdp) / st.cp, P * st.v

    dx = (x1 - x0) / steps
    y = inlet.T
    head = 0.0
    x = x0
    if stations is not None:
        stations.append((inlet.P, y))
    for _ in range(steps):
        k1, g1 = rhs(x, y)
        k2, g2 = rhs(x + dx / 2, y + dx / 2 * k1)
        k3, g3 = rhs(x + dx / 2, y + dx / 2 * k2)
        k4, g4 = rhs(x + dx, y + dx * k3)
        y += dx / 6 * (k1 + 2 * k2 + 2 * k3 + k4)
        head += dx / 6 * (g1 + 2 * g2 + 2 * g3 + g4)
        x += dx
        if stations is not None:
            stations.append((math.exp(x), y))
    end = fluid.gas_path_point(P_out, y)[0]
    return end.h, end.T, head


def polytropic_outlet(inlet: State, P_out: float, efficiency: float,
                      tolerance: float = EFFICIENCY_TOLERANCE) -> tuple[State, float, int]:
    """Outlet state of a constant polytropic-efficiency path (prediction).

    Parameters
    ----------
    inlet : State
        Inlet state.
    P_out : float
        Outlet pressure [Pa].
    efficiency : float
        Polytropic efficiency [-] in (0, 1].
    tolerance : float
        The step count is doubled until the enthalpy change is stable to ``tolerance`` times
        its size (so the implied efficiency is stable to about that much).

    Returns
    -------
    (State, float, int)
        Outlet state, polytropic head magnitude [J/kg], number of RK4 steps used.
    """
    fluid = inlet.fluid
    if not fluid.is_mixture:
        h_end, _, head = _path(inlet, P_out, efficiency, 0)
        return fluid.state_Ph(P_out, h_end), abs(head), 0
    steps = 4
    h_prev, _, head_prev = _path(inlet, P_out, efficiency, steps)
    while True:
        steps *= 2
        h_end, T_end, head = _path(inlet, P_out, efficiency, steps)
        dh = abs(h_end - inlet.h)
        if abs(h_end - h_prev) <= tolerance * max(dh, 1e-12) or steps >= 512:
            break
        h_prev = h_end
    outlet = fluid.state_Ph(P_out, h_end, T_guess=T_end)
    return outlet, abs(head), steps


def polytropic_efficiency(inlet: State, outlet: State, guess: float | None = None,
                          tolerance: float = EFFICIENCY_TOLERANCE) -> tuple[float, float, int]:
    """Polytropic efficiency of a measured process by direct path integration (rating).

    Finds eta_p such that the constant-efficiency polytropic path from the inlet reaches the
    outlet pressure at the outlet enthalpy.

    Parameters
    ----------
    inlet, outlet : State
        Measured end states.
    guess : float, optional
        Starting value, e.g. the Schultz efficiency [-].
    tolerance : float
        Stability of the efficiency [-] between successive step doublings.

    Returns
    -------
    (float, float, int)
        Polytropic efficiency [-], polytropic head magnitude [J/kg], RK4 steps used.
    """
    target = outlet.h
    compression = outlet.P > inlet.P
    eta = guess if (guess is not None and math.isfinite(guess) and 0.05 < guess < 1.2) else 0.8

    def solve(steps, eta0):
        # Secant on u = 1/eta (compression: h_end - h1 nearly proportional to u) or eta.
        u0 = 1.0 / eta0 if compression else eta0
        to_eta = (lambda u: 1.0 / u) if compression else (lambda u: u)
        h0, _, head0 = _path(inlet, outlet.P, to_eta(u0), steps)
        if h0 == inlet.h:
            raise PropertyError("the pressure change is too small for a polytropic path: the "
                                "path does not change the enthalpy")
        # first step from the proportionality h_end - h1 ~ u
        u1 = u0 * (target - inlet.h) / (h0 - inlet.h)
        scale = abs(target - inlet.h)
        for _ in range(30):
            h1_, _, head1 = _path(inlet, outlet.P, to_eta(u1), steps)
            # A residual of 0.1 tolerance * |dh| moves the efficiency by about 0.1 tolerance.
            if abs(h1_ - target) <= 0.1 * tolerance * scale:
                return to_eta(u1), head1
            if h1_ == h0:
                break
            u2 = u1 - (h1_ - target) * (u1 - u0) / (h1_ - h0)
            u0, h0, u1 = u1, h1_, u2
        if abs(u1 - u0) < tolerance * abs(u1):
            return to_eta(u1), head1
        raise PropertyError("the polytropic path integration did not converge")

    if not inlet.fluid.is_mixture:
        eta_new, head = solve(0, eta)
        return eta_new, abs(head), 0
    steps = 4
    eta_prev, _ = solve(steps, eta)
    while True:
        steps *= 2
        eta_new, head = solve(steps, eta_prev)
        if abs(eta_new - eta_prev) <= tolerance or steps >= 512:
            return eta_new, abs(head), steps
        eta_prev = eta_new


def polytropic_path(inlet: State, P_out: float, efficiency: float, points: int = 12) -> list:
    """States along the constant-efficiency polytropic path, e.g. to draw it on a chart.

    Uses the same integration as :func:`polytropic_outlet`, recorded at ``points`` equal
    steps in ln P.

    Parameters
    ----------
    inlet : State
        Start of the path.
    P_out : float
        End pressure [Pa].
    efficiency : float
        Polytropic efficiency [-] in (0, 1].
    points : int
        Number of steps; the list holds ``points + 1`` states, inlet first.

    Returns
    -------
    list of State
    """
    fluid = inlet.fluid
    stations: list = []
    steps = max(int(points), 1)
    _path(inlet, P_out, efficiency, steps, stations)
    states = [inlet]
    for P, y in stations[1:]:
        if fluid.is_mixture:
            states.append(fluid.gas_path_point(P, y)[0])
        else:
            states.append(fluid.state_Ph(P, y))
    return states
