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
from . import checks

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
    cautions : tuple of str
        Plain-language cautions: a two-phase outlet.
    """

    inlets: tuple
    inlet_mass_flows: tuple
    outlet: State
    mass_flow: float
    heat_loss: float
    entropy_generation: float
    cautions: tuple[str, ...] = ()

    @property
    def outlet_quality(self) -> float:
        """Vapour quality at the outlet [-], NaN when not defined (single-phase)."""
        return self.outlet.quality

    def to_dict(self) -> dict:
        """Flat dict of the result numbers, SI units, keys from
        :data:`workbench.fields.FIELDS`; inlet stream ``i`` (from 1) as ``stream_<i>_...``."""
        items = [("device", "mixer"), ("fluid", self.outlet.fluid.name)]
        for i, (st, m) in enumerate(zip(self.inlets, self.inlet_mass_flows), start=1):
            items += checks.state_items(f"stream_{i}", st, ("pressure", "temperature",
                                                            "enthalpy"))
            items.append((f"stream_{i}_mass_flow", m))
        items += checks.state_items("outlet", self.outlet, ("pressure", "temperature",
                                                            "enthalpy", "quality"))
        items += [("mass_flow", self.mass_flow), ("heat_loss", self.heat_loss),
                  ("entropy_generation", self.entropy_generation)]
        return checks.result_dict(items)


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
    cautions : tuple of str
        Plain-language cautions: a two-phase inlet (a tee does not split phases evenly).
    """

    inlet: State
    mass_flow: float
    branch_mass_flows: tuple
    fractions: tuple
    cautions: tuple[str, ...] = ()

    @property
    def outlets(self) -> tuple:
        """Outlet state of each branch (the inlet state)."""
        return tuple(self.inlet for _ in self.branch_mass_flows)

    def to_dict(self) -> dict:
        """Flat dict of the result numbers, SI units, keys from
        :data:`workbench.fields.FIELDS`; branch ``i`` (from 1) as ``branch_<i>_...``."""
        items = [("device", "splitter"), ("fluid", self.inlet.fluid.name),
                 *checks.state_items("", self.inlet), ("mass_flow", self.mass_flow)]
        for i, (m, f) in enumerate(zip(self.branch_mass_flows, self.fractions), start=1):
            items += [(f"branch_{i}_mass_flow", m), (f"branch_{i}_split_fraction", f)]
        return checks.result_dict(items)


#: Most streams or branches a mixer or splitter takes (a header, not a data set).
MAX_STREAMS = 1000


def _listed(values, message: str) -> list:
    """``values`` as a list; ``message`` says what was expected when it is not a sequence."""
    if isinstance(values, (str, bytes, dict, set)) or not hasattr(values, "__iter__"):
        raise InputError(message)
    try:
        items = list(values)
    except TypeError:
        raise InputError(message) from None
    if len(items) > MAX_STREAMS:
        raise InputError(f"{message}; {len(items)} given, at most {MAX_STREAMS}")
    return items


def _fraction_flow(i: int, value, mass_flow: float) -> float:
    """Mass flow [kg/s] of branch ``i`` from its split fraction [-] of ``mass_flow``."""
    return checks.fraction(value, f"split fraction of branch {i}", allow_zero=True) * mass_flow


def _branch_flow(i: int, value, mass_flow: float) -> float:
    """Mass flow [kg/s] of branch ``i`` as given (``mass_flow`` is not needed)."""
    return checks.not_negative(value, "mass_flow", f"mass flow of branch {i}")


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

    Examples
    --------
    >>> import workbench as wb
    >>> water = wb.Fluid("Water")
    >>> r = mixer([(water.state(P=5e5, T=293.15), 2.0), (water.state(P=4e5, T=353.15), 1.0)])
    >>> round(r.outlet.T - 273.15, 2)
    40.03
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
        states.append(checks.state(state, f"mixer stream {i} state"))
        flows.append(checks.positive(m, "mass_flow", f"mixer stream {i} mass flow"))
    fluid = states[0].fluid
    for i, st in enumerate(states[1:], start=2):
        if st.fluid != fluid:
            raise InputError(f"mixer stream {i} is {st.fluid.name} but stream 1 is {fluid.name}: "
                             "the mixer balances streams of one fluid")
    P_low = min(st.P for st in states)
    P2 = checks.optional(P_out, "pressure", "mixer outlet pressure")
    if P2 is None:
        P2 = P_low
    elif not 0 < P2 <= P_low * (1 + 1e-12):
        raise InputError(
            f"mixer outlet pressure {P2 / 1e5:.6g} bar must lie in (0, {P_low / 1e5:.6g}] bar, "
            "not above the lowest inlet pressure")
    Q = checks.number(heat_loss, "heat_flow", "mixer heat loss")
    m_out = math.fsum(flows)
    h_out = (math.fsum(m * st.h for st, m in zip(states, flows)) - Q) / m_out
    warm = max(states, key=lambda st: st.T)
    outlet = fluid.state_Ph(P2, h_out, T_guess=warm.T)
    s_gen = (m_out * outlet.s - math.fsum(m * st.s for st, m in zip(states, flows))
             + Q / outlet.T)
    cautions = ()
    if outlet.two_phase:
        cautions = (f"the mixed stream is two-phase (outlet quality {outlet.quality:.3f}): "
                    "the header carries liquid and vapour",)
    return MixerResult(inlets=tuple(states), inlet_mass_flows=tuple(flows), outlet=outlet,
                       mass_flow=m_out, heat_loss=Q, entropy_generation=s_gen,
                       cautions=cautions)


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

    Examples
    --------
    >>> import workbench as wb
    >>> water = wb.Fluid("Water")
    >>> splitter(water.state(P=5e5, T=293.15), 10.0, fractions=[0.25, None]).branch_mass_flows
    (2.5, 7.5)
    """
    inlet = checks.state(inlet, "splitter inlet")
    m = checks.positive(mass_flow, "mass_flow", "splitter mass flow")
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
        raise InputError(f"the splitter {what} list {len(values)} value(s): a splitter needs "
                         "at least 2 branches")
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
    cautions = ()
    if inlet.two_phase:
        cautions = (f"the inlet is two-phase (quality {inlet.quality:.3f}): a tee does not "
                    "split liquid and vapour evenly, so the branch qualities may differ from "
                    "the inlet's (common practice)",)
    return SplitterResult(inlet=inlet, mass_flow=m, branch_mass_flows=tuple(values),
                          fractions=tuple(v / m for v in values), cautions=cautions)


__all__ = ["MASS_BALANCE_TOLERANCE", "MixerResult", "SplitterResult", "mixer", "splitter"]
