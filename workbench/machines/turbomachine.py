"""Steady-flow energy balance of compressors, turbines, pumps and fans: the single-point API.

One inlet, one outlet, steady state.  Per unit mass, with power absorbed positive::

    w_in = (h2 - h1) + (V2^2 - V1^2) / 2 + g (z2 - z1) + q_loss

For a turbine the delivered specific work is ``-w_in``.  Results always report positive
magnitudes (absorbed by a compressor, pump or fan; delivered by a turbine).

Exactly one of these fixes the outlet:

* ``outlet``: a measured outlet state (rating);
* ``isentropic_efficiency`` or ``polytropic_efficiency`` with ``P_out`` (prediction);
* ``power`` (measured shaft power) with ``P_out``: the outlet enthalpy follows from the
  energy balance.  This is how a steam turbine with a wet exhaust is rated.

Efficiencies
------------
Isentropic efficiencies compare the actual enthalpy change with the isentropic one between
the same pressures (gas-side, adiabatic definition; heat loss counts in the power but not in
the efficiency):

* static-to-static (default): ``(h2s - h1) / (h2 - h1)`` (compression);
* total-to-total (``basis="total"``): the same between stagnation states
  ``h0 = h + V^2/2`` at the stagnation pressures;
* total-to-static (turbines): ``(h01 - h02) / (h01 - h2s)``, the exhaust kinetic energy
  counted as a loss.

The equations and checks are those of the balance kernel,
:func:`workbench.machines.balance.steady_flow`, which the field-test batch uses too; this
module converts the arguments at the input boundary, predicts the outlet where it is not
measured, calls the kernel and raises the project's error for a refused entry.  The result is
a :class:`~workbench.machines.result.MachineResult`.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 6-2004, Steam Turbines (the energy balance for exhaust enthalpy from power).
S. L. Dixon, C. A. Hall, Fluid Mechanics and Thermodynamics of Turbomachinery, 7th ed.,
Butterworth-Heinemann 2014, chapter 2 (efficiency definitions).
"""

from __future__ import annotations

from typing import NamedTuple

from ..errors import InputError, ReadingsError, SpecificationError
from ..polytropic import polytropic_outlet
from ..properties import State
from ..units import choice, fraction, not_negative, optional_si, positive, to_si
from . import balance as _balance
from . import checks
from .balance import BASES, KINDS, RAISES_PRESSURE, STANDARD_GRAVITY
from .flows import velocity_from_diameter
from .result import MachineResult

# Defaults of the public functions: known valid, so the boundary is skipped when the caller
# leaves them (the most common call gives only states, a pressure and one efficiency).
_ZERO = 0.0
_ONE = 1.0
_STATIC = "static"


def _given(value, default, convert, *args):
    """``convert(value, *args)`` at the input boundary, or the default the caller left."""
    return value if value is default else convert(value, *args)


class _Inputs(NamedTuple):
    """The arguments of :func:`energy_balance` after the input boundary (SI floats)."""

    kind: str
    basis: str
    inlet: State
    outlet: State | None
    P_out: float
    isentropic_efficiency: float | None
    polytropic_efficiency: float | None
    power: float | None
    mass_flow: float
    velocity_in: float
    velocity_out: float
    diameter_in: float | None
    diameter_out: float | None
    elevation_change: float
    heat_loss: float
    mechanical_efficiency: float


def _convert(kind, inlet, outlet, P_out, isentropic_efficiency, polytropic_efficiency, power,
             mass_flow, velocity_in, velocity_out, diameter_in, diameter_out, elevation_change,
             heat_loss, mechanical_efficiency, basis) -> _Inputs:
    """Every argument through the input boundary; which one fixes the outlet, and P_out."""
    kind = choice(kind, KINDS, "machine kind")
    basis = _given(basis, _STATIC, choice, BASES, "efficiency basis")
    inlet = checks.state(inlet, "inlet")
    m = _given(mass_flow, _ONE, positive, "mass_flow", "mass flow")
    v1 = _given(velocity_in, _ZERO, not_negative, "velocity", "inlet velocity")
    v2 = _given(velocity_out, _ZERO, not_negative, "velocity", "outlet velocity")
    d1 = None if diameter_in is None else positive(diameter_in, "length", "inlet flow diameter")
    d2 = None if diameter_out is None else positive(diameter_out, "length",
                                                    "outlet flow diameter")
    for name, vel, dia in (("inlet", v1, d1), ("outlet", v2, d2)):
        if dia is not None and vel != 0:
            raise SpecificationError(
                f"give either the {name} velocity or the {name} flow diameter, not both")
    dz = _given(elevation_change, _ZERO, to_si, "length", "elevation change")
    q_rate = _given(heat_loss, _ZERO, to_si, "power", "heat loss")
    eta_m = _given(mechanical_efficiency, _ONE, fraction, "mechanical efficiency")
    P2 = optional_si(P_out, "pressure", "outlet pressure")
    eta_s = None if isentropic_efficiency is None else fraction(
        isentropic_efficiency, "isentropic efficiency")
    eta_p = None if polytropic_efficiency is None else fraction(
        polytropic_efficiency, "polytropic efficiency")
    # a measured power of zero rates nothing: refused by name like a negative one
    shaft = None if power is None else positive(power, "power", "power")
    modes = [name for name, value in (("a measured outlet state", outlet),
                                      ("an isentropic efficiency", eta_s),
                                      ("a polytropic efficiency", eta_p),
                                      ("a measured power", shaft)) if value is not None]
    if len(modes) != 1:
        raise SpecificationError(
            "the outlet must be fixed by exactly one of: a measured outlet state, an isentropic "
            "efficiency, a polytropic efficiency or a measured power (the last three with the "
            f"outlet pressure); got {' and '.join(modes) if modes else 'none of them'}")
    if outlet is not None:
        outlet = checks.state(outlet, "outlet")
        if outlet.fluid != inlet.fluid:
            raise InputError(f"inlet ({inlet.fluid.name}) and outlet ({outlet.fluid.name}) are "
                             "states of different fluids")
        if P2 is not None and abs(P2 - outlet.P) > 1e-9 * outlet.P:
            raise SpecificationError(
                f"outlet pressure {P2 / 1e5:.6g} bar disagrees with the measured outlet state "
                f"at {outlet.P / 1e5:.6g} bar: give one of them")
        P2 = outlet.P
    elif P2 is None:
        raise SpecificationError(f"outlet pressure is needed with {modes[0]}")
    return _Inputs(kind, basis, inlet, outlet, P2, eta_s, eta_p, shaft, m, v1, v2, d1, d2, dz,
                   q_rate, eta_m)


def _velocity(velocity, diameter, mass_flow, density):
    """Velocity [m/s] given directly or from mass flow and a flow diameter (continuity)."""
    return velocity if diameter is None else velocity_from_diameter(mass_flow, density, diameter)


def energy_balance(kind: str, inlet: State, outlet: State | None = None, *, P_out=None,
                   isentropic_efficiency=None, polytropic_efficiency=None, power=None,
                   mass_flow=_ONE, velocity_in=_ZERO, velocity_out=_ZERO, diameter_in=None,
                   diameter_out=None, elevation_change=_ZERO, heat_loss=_ZERO,
                   mechanical_efficiency=_ONE, basis: str = _STATIC) -> MachineResult:
    """Steady-flow energy balance of one machine; see the module docstring.

    Parameters
    ----------
    kind : {"compressor", "turbine", "pump", "fan"}
        Machine type; fixes the direction of the pressure change.
    inlet : State
        Static inlet state.
    outlet : State, optional
        Measured static outlet state (rating).
    P_out : float or Quantity, optional
        Outlet static pressure [Pa], with an efficiency or ``power``.
    isentropic_efficiency, polytropic_efficiency : float, optional
        Efficiency [-] in (0, 1] on ``basis``, to predict the outlet.
    power : float or Quantity, optional
        Measured shaft power [W], a positive magnitude, to find the outlet from the balance.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive.
    velocity_in, velocity_out : float or Quantity
        Flow velocities [m/s], not negative.
    diameter_in, diameter_out : float or Quantity, optional
        Flow diameters [m]; the velocity then follows from continuity, V = 4 m / (rho pi D^2).
    elevation_change : float or Quantity
        Outlet elevation minus inlet elevation [m].
    heat_loss : float or Quantity
        Heat lost to the surroundings [W] (positive out of the machine).
    mechanical_efficiency : float
        Bearing, seal and gear losses [-] in (0, 1].
    basis : {"static", "total"}
        Basis of the given and reported isentropic and polytropic efficiency.

    Returns
    -------
    MachineResult

    Raises
    ------
    InputError, SpecificationError, ReadingsError, PropertyError
        With a message naming the input, its value and the allowed range.

    References
    ----------
    ASME PTC 10-1997; ASME PTC 6-2004; Dixon and Hall (2014), chapter 2.

    Examples
    --------
    >>> import workbench as wb
    >>> air = wb.Fluid("Air")
    >>> r = energy_balance("compressor", air.state(P=1e5, T=300.0), P_out=2e5,
    ...                    isentropic_efficiency=0.8, mass_flow=2.0)
    >>> round(r.outlet.T, 1), round(r.shaft_power / 1e3, 1)
    (381.9, 165.0)
    """
    a = _convert(kind, inlet, outlet, P_out, isentropic_efficiency, polytropic_efficiency,
                 power, mass_flow, velocity_in, velocity_out, diameter_in, diameter_out,
                 elevation_change, heat_loss, mechanical_efficiency, basis)
    inlet, fluid, P2 = a.inlet, a.inlet.fluid, a.P_out
    fluid.check_pressure(P2, "outlet pressure")
    refused = _balance.pressure_refusal(a.kind, inlet.P, P2, inlet.phase)
    if refused:
        raise _balance.refusal_error(refused, a.kind, inlet, P2)
    V1 = _velocity(a.velocity_in, a.diameter_in, a.mass_flow, inlet.rho)
    iso = fluid.state_Ps(P2, inlet.s, T_guess=inlet.T)
    inlet0 = _stagnation(inlet, V1)
    given_polytropic = ()
    if a.outlet is not None:
        outlet = a.outlet
        V2 = _velocity(a.velocity_out, a.diameter_out, a.mass_flow, outlet.rho)
    else:
        outlet, V2, given_polytropic = _predict_outlet(a, iso, inlet0, V1)
    outlet0 = _stagnation(outlet, V2)
    if inlet0 is inlet and outlet0 is outlet:
        iso0 = iso  # no kinetic terms: stagnation and static states coincide
    else:
        iso0 = fluid.state_Ps(outlet0.P, inlet0.s, T_guess=iso.T)
    b = _balance.steady_flow(
        a.kind, inlet, outlet, iso, mass_flow=a.mass_flow, velocity_in=V1, velocity_out=V2,
        elevation_change=a.elevation_change, heat_loss=a.heat_loss,
        mechanical_efficiency=a.mechanical_efficiency, basis=a.basis,
        stagnation=(inlet0, outlet0, iso0))
    if b.refusal:
        raise _balance.refusal_error(b.refusal, a.kind, inlet, P2, basis=a.basis,
                                     outlet=outlet, result=b)
    rated_from = ("outlet" if a.outlet is not None
                  else "power" if a.power is not None else "efficiency")
    return MachineResult(
        kind=a.kind, basis=a.basis, inlet=inlet, outlet=outlet, isentropic_outlet=iso,
        inlet_stagnation=inlet0, outlet_stagnation=outlet0, mass_flow=a.mass_flow,
        velocity_in=V1, velocity_out=V2, elevation_change=a.elevation_change,
        heat_loss=a.heat_loss, mechanical_efficiency=a.mechanical_efficiency,
        specific_work=b.specific_work, power=b.power, shaft_power=b.shaft_power,
        enthalpy_change=b.enthalpy_change, kinetic_energy_change=b.kinetic_energy_change,
        potential_energy_change=b.potential_energy_change,
        specific_heat_loss=b.specific_heat_loss,
        isentropic_efficiency_static=b.isentropic_efficiency_static,
        isentropic_efficiency_total=b.isentropic_efficiency_total,
        isentropic_efficiency_total_to_static=b.isentropic_efficiency_total_to_static,
        isentropic_head=b.isentropic_head, rated_from=rated_from,
        _given_polytropic=given_polytropic)


def _predict_outlet(a: _Inputs, iso: State, inlet0: State, V1: float):
    """Outlet state and velocity from an efficiency or a measured power: (outlet, V2, poly).

    Iterates when the outlet velocity depends on the outlet density (flow diameter given) or
    the basis is total (the stagnation outlet pressure depends on the outlet state).
    """
    inlet, P2 = a.inlet, a.P_out
    g_dz = STANDARD_GRAVITY * a.elevation_change
    q = a.heat_loss / a.mass_flow
    raises = RAISES_PRESSURE[a.kind]
    static_only = a.basis == "static" or (a.isentropic_efficiency is None
                                          and a.polytropic_efficiency is None)
    V2 = _velocity(a.velocity_out, a.diameter_out, a.mass_flow, iso.rho)
    h2, guess_T, given_polytropic = None, iso.T, ()
    for _ in range(50):
        if a.power is not None:
            # w_in = dh + dKE + dPE + q solved for h2
            h2_new = _balance.outlet_enthalpy_from_power(
                a.kind, inlet.h, a.power, a.mass_flow, a.mechanical_efficiency,
                (V2 ** 2 - V1 ** 2) / 2, g_dz, q)
        else:
            h2_new = _outlet_enthalpy(inlet, inlet0, P2, V2, a.isentropic_efficiency,
                                      a.polytropic_efficiency, a.basis, raises, iso, guess_T, h2)
            if a.polytropic_efficiency is not None:
                h2_new, head = h2_new
                given_polytropic = (a.polytropic_efficiency, head)
        converged = h2 is not None and abs(h2_new - h2) < 1e-9 * max(abs(h2_new), 1.0)
        h2 = h2_new
        outlet = _outlet_state(a, h2, guess_T)
        guess_T = outlet.T
        V2_new = _velocity(a.velocity_out, a.diameter_out, a.mass_flow, outlet.rho)
        if (a.diameter_out is None and static_only) or (
                converged and abs(V2_new - V2) < 1e-9 * max(V2, 1)):
            return outlet, V2_new, given_polytropic
        V2 = V2_new
    raise SpecificationError("the outlet velocity and state did not converge: check "
                             "the outlet flow diameter")


def _outlet_state(a: _Inputs, h2: float, guess_T: float) -> State:
    """The outlet state at P_out and h2; a power the fluid cannot take is a reading error."""
    fluid = a.inlet.fluid
    try:
        return fluid.state_Ph(a.P_out, h2, T_guess=guess_T)
    except Exception as exc:
        if a.power is not None:
            raise ReadingsError(
                f"the measured power {a.power / 1e3:.6g} kW puts the outlet enthalpy at "
                f"{h2 / 1e3:.6g} kJ/kg, where no state of {fluid.name} at "
                f"{a.P_out / 1e5:.6g} bar exists in the property model: check the readings"
            ) from exc
        raise


def _stagnation(state: State, velocity: float) -> State:
    """Stagnation state: h0 = h + V^2/2 at the static entropy."""
    if velocity == 0:
        return state
    return state.fluid.state_hs(state.h + velocity ** 2 / 2, state.s, state.P)


def _outlet_enthalpy(inlet, inlet0, P2, V2, eta_s, eta_p, basis, raises, iso, guess_T, h2_prev):
    """Outlet static enthalpy [J/kg] predicted from an efficiency on the chosen basis."""
    fluid = inlet.fluid
    if basis == "static" or (V2 == 0 and inlet0 is inlet):
        start, P_end, iso_end = inlet, P2, iso
        ke_out = 0.0
    else:
        # Stagnation outlet pressure from the current estimate of the outlet state.
        ke_out = V2 ** 2 / 2
        if h2_prev is None:
            h2_est = (inlet.h + (iso.h - inlet.h) / (eta_s or eta_p)) if raises else \
                (inlet.h - (eta_s or eta_p) * (inlet.h - iso.h))
        else:
            h2_est = h2_prev
        est = fluid.state_Ph(P2, h2_est, T_guess=guess_T)
        P_end = _stagnation(est, V2).P
        start = inlet0
        iso_end = fluid.state_Ps(P_end, inlet0.s, T_guess=iso.T)
    if eta_s is not None:
        if raises:
            h0 = start.h + (iso_end.h - start.h) / eta_s
        else:
            h0 = start.h - eta_s * (start.h - iso_end.h)
        return h0 - ke_out
    out, head, _ = polytropic_outlet(start, P_end, eta_p)
    return out.h - ke_out, head


def _public(kind):
    def machine(inlet, outlet=None, *, P_out=None, isentropic_efficiency=None,
                polytropic_efficiency=None, power=None, mass_flow=_ONE, velocity_in=_ZERO,
                velocity_out=_ZERO, diameter_in=None, diameter_out=None,
                elevation_change=_ZERO, heat_loss=_ZERO, mechanical_efficiency=_ONE,
                basis=_STATIC) -> MachineResult:
        return energy_balance(
            kind, inlet, outlet, P_out=P_out, isentropic_efficiency=isentropic_efficiency,
            polytropic_efficiency=polytropic_efficiency, power=power, mass_flow=mass_flow,
            velocity_in=velocity_in, velocity_out=velocity_out, diameter_in=diameter_in,
            diameter_out=diameter_out, elevation_change=elevation_change, heat_loss=heat_loss,
            mechanical_efficiency=mechanical_efficiency, basis=basis)

    machine.__name__ = kind
    machine.__qualname__ = kind
    machine.__doc__ = (
        f"Steady-flow energy balance of a {kind}.\n\n"
        f"Same parameters as :func:`energy_balance` without ``kind``.  "
        f"{'Power is absorbed' if RAISES_PRESSURE[kind] else 'Power is delivered'}; results "
        "are positive magnitudes.\n\nReturns\n-------\nMachineResult\n\n"
        "References\n----------\nASME PTC 10-1997; ASME PTC 6-2004.\n")
    return machine


compressor = _public("compressor")
turbine = _public("turbine")
pump = _public("pump")
fan = _public("fan")

__all__ = ["MachineResult", "energy_balance", "compressor", "turbine", "pump", "fan",
           "STANDARD_GRAVITY"]
