"""Mixers and splitters: mass and energy balances of several streams of one fluid.

Mixer (admission, a steam header, a recycle joining a suction line), steady, no work,
kinetic and potential energy neglected::

    m_out = sum(m_i)
    m_out h_out = sum(m_i h_i) - Q_loss

so with no heat lost the outlet enthalpy is the mass-weighted mean of the inlet enthalpies.
The streams mix at the outlet pressure, by default the lowest inlet pressure (common
practice: a stream cannot flow into a header at a higher pressure without a machine).

Splitter (extraction, a bypass): one inlet into branches of the same state; the branch
flows must add up to the inlet flow.

References
----------
The steady-flow mass and energy balances of a control volume with several inlets and
outlets (common practice).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..errors import InputError, SpecificationError
from ..properties import State
from ..units import optional_si, to_si
from .throttle import _check_state, _positive, _quality

#: Relative tolerance on a mass balance (branch flows against the inlet flow) [-].
MASS_BALANCE_TOLERANCE = 1e-9


@dataclass(frozen=True, eq=False)
class MixerResult:
    """Result of a mixer.  All numbers in SI units.

    Attributes
    ----------
    inlets : tuple of State
        Inlet states, in the order given.
    inlet_mass_flows : tuple of float
        Inlet mass flows [kg/s].
    outlet : State
        Mixed outlet state.
    mass_flow : float
        Outlet mass flow, the sum of the inlet flows [kg/s].
    heat_loss : float
        Heat lost to the surroundings [W] (positive out of the mixer).
    entropy_generation : float
        m_out s_out - sum(m_i s_i) + Q_loss / T_out [W/K], not negative for a real mixer.
    """

    inlets: tuple
    inlet_mass_flows: tuple
    outlet: State
    mass_flow: float
    heat_loss: float
    entropy_generation: float

    def to_dict(self) -> dict:
        """Flat dict of the result numbers (SI units, keys end with their unit)."""
        d = {"device": "mixer", "fluid": self.outlet.fluid.name}
        for i, (st, m) in enumerate(zip(self.inlets, self.inlet_mass_flows), start=1):
            d[f"inlet_{i}_pressure_Pa"] = st.P
            d[f"inlet_{i}_temperature_K"] = st.T
            d[f"inlet_{i}_enthalpy_J_per_kg"] = st.h
            d[f"inlet_{i}_mass_flow_kg_per_s"] = m
        d.update({
            "outlet_pressure_Pa": self.outlet.P,
            "outlet_temperature_K": self.outlet.T,
            "outlet_enthalpy_J_per_kg": self.outlet.h,
            "outlet_quality": _quality(self.outlet),
            "mass_flow_kg_per_s": self.mass_flow,
            "heat_loss_W": self.heat_loss,
            "entropy_generation_W_per_K": self.entropy_generation,
        })
        return d


@dataclass(frozen=True, eq=False)
class SplitterResult:
    """Result of a splitter.  All numbers in SI units.

    Attributes
    ----------
    inlet : State
        Inlet state; every branch leaves in this state.
    mass_flow : float
        Inlet mass flow [kg/s].
    branch_mass_flows : tuple of float
        Mass flow of each branch [kg/s], adding up to ``mass_flow``.
    fractions : tuple of float
        Branch flow over inlet flow [-].
    """

    inlet: State
    mass_flow: float
    branch_mass_flows: tuple
    fractions: tuple

    @property
    def outlets(self) -> tuple:
        """Outlet state of each branch (the inlet state)."""
        return tuple(self.inlet for _ in self.branch_mass_flows)

    def to_dict(self) -> dict:
        """Flat dict of the result numbers (SI units, keys end with their unit)."""
        d = {"device": "splitter", "fluid": self.inlet.fluid.name,
             "pressure_Pa": self.inlet.P, "temperature_K": self.inlet.T,
             "enthalpy_J_per_kg": self.inlet.h, "quality": _quality(self.inlet),
             "mass_flow_kg_per_s": self.mass_flow}
        for i, (m, f) in enumerate(zip(self.branch_mass_flows, self.fractions), start=1):
            d[f"branch_{i}_mass_flow_kg_per_s"] = m
            d[f"branch_{i}_fraction"] = f
        return d


def _listed(values, message: str) -> list:
    """``values`` as a list; ``message`` says what was expected when it is not a sequence."""
    try:
        return list(values)
    except TypeError:
        raise InputError(message) from None


def _fraction_flow(i: int, value, mass_flow: float) -> float:
    """Mass flow [kg/s] of branch ``i`` from its split fraction [-] of ``mass_flow``."""
    f = to_si(value, "dimensionless", f"split fraction of branch {i}")
    if not 0.0 <= f <= 1.0:
        raise InputError(f"split fraction of branch {i} is {f:g}; it must lie in [0, 1]")
    return f * mass_flow


def _branch_flow(i: int, value, mass_flow: float) -> float:
    """Mass flow [kg/s] of branch ``i`` as given (``mass_flow`` is not needed)."""
    b = to_si(value, "mass_flow", f"mass flow of branch {i}")
    if b < 0:
        raise InputError(f"mass flow of branch {i} is {b:g} kg/s; it must not be negative")
    return b


def mixer(streams: Sequence, *, P_out=None, heat_loss=0.0) -> MixerResult:
    """Adiabatic (or heat-losing) mixing of several streams of one fluid.

    Assumptions: steady flow, no shaft work, kinetic and potential energy neglected, the
    streams leave fully mixed at one state.

    Parameters
    ----------
    streams : sequence of (State, mass_flow)
        Two or more inlet streams; each mass flow [kg/s] (float or Quantity) positive.
    P_out : float or Quantity, optional
        Outlet pressure [Pa], not above the lowest inlet pressure; default that pressure.
    heat_loss : float or Quantity
        Heat lost to the surroundings [W] (positive out of the mixer).

    Returns
    -------
    MixerResult

    Raises
    ------
    InputError
        Fewer than two streams, different fluids, a non-positive flow, an outlet pressure
        above the lowest inlet pressure.

    References
    ----------
    Steady-flow mass and energy balances (common practice).
    """
    items = _listed(streams, "mixer streams must be a list of (State, mass flow) pairs")
    if len(items) < 2:
        raise InputError(f"a mixer needs at least 2 inlet streams, got {len(items)}")
    states, flows = [], []
    for i, item in enumerate(items, start=1):
        try:
            state, m = item
        except (TypeError, ValueError):
            raise InputError(f"mixer stream {i} must be a (State, mass flow) pair") from None
        states.append(_check_state(f"mixer stream {i} state", state))
        flows.append(_positive(m, "mass_flow", f"mixer stream {i} mass flow", "kg/s"))
    fluid = states[0].fluid
    for i, st in enumerate(states[1:], start=2):
        if st.fluid != fluid:
            raise InputError(f"mixer stream {i} is {st.fluid.name} but stream 1 is {fluid.name}: "
                             "the mixer balances streams of one fluid")
    P_low = min(st.P for st in states)
    P2 = optional_si(P_out, "pressure", "mixer outlet pressure")
    if P2 is None:
        P2 = P_low
    elif not 0 < P2 <= P_low * (1 + 1e-12):
        raise InputError(
            f"mixer outlet pressure {P2 / 1e5:.6g} bar must lie in (0, {P_low / 1e5:.6g}] bar, "
            "not above the lowest inlet pressure")
    Q = to_si(heat_loss, "power", "mixer heat loss")
    m_out = math.fsum(flows)
    h_out = (math.fsum(m * st.h for st, m in zip(states, flows)) - Q) / m_out
    warm = max(states, key=lambda st: st.T)
    outlet = fluid.state_Ph(P2, h_out, T_guess=warm.T)
    s_gen = (m_out * outlet.s - math.fsum(m * st.s for st, m in zip(states, flows))
             + Q / outlet.T)
    return MixerResult(inlets=tuple(states), inlet_mass_flows=tuple(flows), outlet=outlet,
                       mass_flow=m_out, heat_loss=Q, entropy_generation=s_gen)


def splitter(inlet: State, mass_flow, *, fractions=None, branch_mass_flows=None) -> SplitterResult:
    """Split one stream into branches of the same state.

    Give the branch ``fractions`` (each in [0, 1], adding up to 1) or the
    ``branch_mass_flows`` [kg/s] (adding up to ``mass_flow``).  With one value missing, give
    ``None`` in its place and it takes the remainder.

    Parameters
    ----------
    inlet : State
        Inlet state.
    mass_flow : float or Quantity
        Inlet mass flow [kg/s], positive.
    fractions : sequence of float, optional
        Share of the inlet flow in each branch [-].
    branch_mass_flows : sequence of float or Quantity, optional
        Mass flow of each branch [kg/s].

    Returns
    -------
    SplitterResult

    Raises
    ------
    InputError
        A fraction outside [0, 1], a negative branch flow.
    SpecificationError
        Both or neither of fractions and flows, or a mass balance that does not close.

    References
    ----------
    Steady-flow mass balance (common practice).
    """
    inlet = _check_state("splitter inlet", inlet)
    m = _positive(mass_flow, "mass_flow", "splitter mass flow", "kg/s")
    if (fractions is None) == (branch_mass_flows is None):
        raise SpecificationError("give the splitter branch fractions or the branch mass flows "
                                 "(exactly one of them)")
    if fractions is not None:
        given, what, flow_of = fractions, "split fractions", _fraction_flow
    else:
        given, what, flow_of = branch_mass_flows, "branch mass flows", _branch_flow
    given = _listed(given, f"the splitter {what} must be a list with one value per branch")
    values = [None if v is None else flow_of(i, v, m) for i, v in enumerate(given, start=1)]
    if len(values) < 2:
        raise InputError(f"a splitter needs at least 2 branches, got {len(values)}")
    missing = [i for i, v in enumerate(values) if v is None]
    if len(missing) > 1:
        raise SpecificationError(f"{len(missing)} {what} are missing; at most one can be left "
                                 "to take the remainder")
    known = math.fsum(v for v in values if v is not None)
    if missing:
        rest = m - known
        if rest < -MASS_BALANCE_TOLERANCE * m:
            raise SpecificationError(
                f"the given {what} take {known:.6g} kg/s, more than the inlet flow {m:.6g} kg/s")
        values[missing[0]] = max(rest, 0.0)
    elif abs(known - m) > MASS_BALANCE_TOLERANCE * m:
        raise SpecificationError(
            f"the {what} add up to {known:.9g} kg/s but the splitter inlet flow is {m:.9g} kg/s: "
            "the mass balance must close")
    return SplitterResult(inlet=inlet, mass_flow=m, branch_mass_flows=tuple(values),
                          fractions=tuple(v / m for v in values))


__all__ = ["MASS_BALANCE_TOLERANCE", "MixerResult", "SplitterResult", "mixer", "splitter"]
