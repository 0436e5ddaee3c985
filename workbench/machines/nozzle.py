"""Nozzles and diffusers: adiabatic flow passages without shaft work.

First law for one inlet and one outlet, adiabatic, no work, potential energy neglected::

    h1 + V1^2 / 2 = h2 + V2^2 / 2        (the stagnation enthalpy h0 is conserved)

Continuity gives the area ratio ``A2 / A1 = (rho1 V1) / (rho2 V2)``.

Losses are given as an isentropic efficiency or, for a nozzle, a velocity coefficient:

* nozzle: ``eta = (h01 - h2) / (h01 - h2s)``, the actual over the isentropic exit kinetic
  energy; velocity coefficient ``phi = V2 / V2s = sqrt(eta)``;
* diffuser: ``eta = (h2s - h1) / (h2 - h1)``, the isentropic over the actual static enthalpy
  rise to the outlet pressure reached.

``h2s`` is the enthalpy at the outlet pressure and the inlet entropy.

References
----------
The steady-flow energy and continuity equations of a control volume (common practice).
Nozzle and diffuser efficiencies as defined above are those of turbomachinery practice
(common practice); the isentropic-flow relations of an ideal gas are used in the tests.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import InputError, SpecificationError
from ..properties import State
from ..units import to_si
from .throttle import _check_below_inlet, _check_state, _not_negative, _positive, _quality


@dataclass(frozen=True, eq=False)
class PassageResult:
    """Result of a nozzle or diffuser.  All numbers in SI units.

    Attributes
    ----------
    kind : str
        ``"nozzle"`` or ``"diffuser"``.
    inlet, outlet : State
        Static inlet and outlet states.
    isentropic_outlet : State
        State at the outlet pressure and the inlet entropy.
    mass_flow : float
        Mass flow [kg/s].
    velocity_in, velocity_out : float
        Inlet and outlet velocities [m/s].
    isentropic_efficiency : float
        Efficiency on the definition of ``kind`` (see the module notes) [-].
    stagnation_enthalpy : float
        h + V^2/2, equal at inlet and outlet [J/kg].
    inlet_area, outlet_area : float
        Flow areas from continuity A = m / (rho V) [m^2]; infinite at zero velocity.
    area_ratio : float
        Outlet over inlet flow area [-]; NaN when the inlet velocity is zero.
    outlet_mach_number : float
        Outlet velocity over the outlet speed of sound [-] (NaN when two-phase).
    """

    kind: str
    inlet: State
    outlet: State
    isentropic_outlet: State
    mass_flow: float
    velocity_in: float
    velocity_out: float
    isentropic_efficiency: float
    stagnation_enthalpy: float
    inlet_area: float
    outlet_area: float
    area_ratio: float
    outlet_mach_number: float

    @property
    def velocity_coefficient(self) -> float:
        """Square root of the isentropic efficiency (nozzles) [-]."""
        return math.sqrt(self.isentropic_efficiency)

    def to_dict(self) -> dict:
        """Flat dict of the result numbers (SI units, keys end with their unit)."""
        return {
            "device": self.kind,
            "fluid": self.inlet.fluid.name,
            "inlet_pressure_Pa": self.inlet.P,
            "inlet_temperature_K": self.inlet.T,
            "inlet_enthalpy_J_per_kg": self.inlet.h,
            "outlet_pressure_Pa": self.outlet.P,
            "outlet_temperature_K": self.outlet.T,
            "outlet_enthalpy_J_per_kg": self.outlet.h,
            "outlet_quality": _quality(self.outlet),
            "mass_flow_kg_per_s": self.mass_flow,
            "velocity_in_m_per_s": self.velocity_in,
            "velocity_out_m_per_s": self.velocity_out,
            "isentropic_efficiency": self.isentropic_efficiency,
            "stagnation_enthalpy_J_per_kg": self.stagnation_enthalpy,
            "inlet_area_m2": self.inlet_area,
            "outlet_area_m2": self.outlet_area,
            "area_ratio": self.area_ratio,
            "outlet_mach_number": self.outlet_mach_number,
        }


def _area(m, rho, V):
    return math.inf if V == 0 else m / (rho * V)


def _efficiency(name, value):
    value = to_si(value, "dimensionless", name)
    if not 0.0 < value <= 1.0:
        raise InputError(f"{name} {value:g} is outside the allowed range (0, 1]")
    return value


def _inlet_and_flow(kind, inlet, mass_flow):
    """Checked inlet state and mass flow [kg/s] of a nozzle or diffuser."""
    return (_check_state(f"{kind} inlet", inlet),
            _positive(mass_flow, "mass_flow", f"{kind} mass flow", "kg/s"))


def _finish(kind, inlet, outlet, iso, m, V1, V2, eta):
    A1, A2 = _area(m, inlet.rho, V1), _area(m, outlet.rho, V2)
    a2 = outlet.fluid.speed_of_sound(outlet)
    return PassageResult(
        kind=kind, inlet=inlet, outlet=outlet, isentropic_outlet=iso, mass_flow=m,
        velocity_in=V1, velocity_out=V2, isentropic_efficiency=eta,
        stagnation_enthalpy=inlet.h + V1 ** 2 / 2, inlet_area=A1, outlet_area=A2,
        area_ratio=A2 / A1 if V1 > 0 else math.nan,
        outlet_mach_number=V2 / a2 if a2 > 0 else math.nan)


def nozzle(inlet: State, P_out, *, isentropic_efficiency=None, velocity_coefficient=None,
           velocity_in=0.0, mass_flow=1.0) -> PassageResult:
    """Outlet velocity and state of a nozzle from the energy balance.

    Assumptions: steady, adiabatic, no shaft work, potential energy neglected; the flow
    follows the pressure given (no check of choking: a Mach number above 1 at the outlet
    means the passage must be convergent-divergent).

    Parameters
    ----------
    inlet : State
        Static inlet state.
    P_out : float or Quantity
        Outlet static pressure [Pa], below the inlet pressure.
    isentropic_efficiency : float, optional
        Nozzle efficiency (h01 - h2) / (h01 - h2s) [-] in (0, 1]; default 1.
    velocity_coefficient : float, optional
        V2 / V2s [-] in (0, 1]; give this or the efficiency, not both.
    velocity_in : float or Quantity
        Inlet velocity [m/s], not negative (0: from rest).
    mass_flow : float or Quantity
        Mass flow [kg/s], for the flow areas.

    Returns
    -------
    PassageResult

    References
    ----------
    Steady-flow energy equation; the nozzle efficiency and velocity coefficient as defined
    in the module notes (common practice).
    """
    inlet, m = _inlet_and_flow("nozzle", inlet, mass_flow)
    P2 = _positive(P_out, "pressure", "nozzle outlet pressure", "Pa")
    V1 = _not_negative(velocity_in, "velocity", "nozzle inlet velocity", "m/s")
    if isentropic_efficiency is not None and velocity_coefficient is not None:
        raise SpecificationError("give the nozzle isentropic efficiency or its velocity "
                                 "coefficient, not both")
    if velocity_coefficient is not None:
        eta = _efficiency("nozzle velocity coefficient", velocity_coefficient) ** 2
    elif isentropic_efficiency is not None:
        eta = _efficiency("nozzle isentropic efficiency", isentropic_efficiency)
    else:
        eta = 1.0
    _check_below_inlet("nozzle", P2, inlet, "a nozzle accelerates the flow by lowering "
                       "pressure (use diffuser for the reverse)")
    fluid = inlet.fluid
    h01 = inlet.h + V1 ** 2 / 2
    iso = fluid.state_Ps(P2, inlet.s, T_guess=inlet.T)
    h2 = h01 - eta * (h01 - iso.h)
    outlet = fluid.state_Ph(P2, h2, T_guess=iso.T)
    V2 = math.sqrt(2.0 * (h01 - h2))
    return _finish("nozzle", inlet, outlet, iso, m, V1, V2, eta)


def diffuser(inlet: State, velocity_in, *, velocity_out=0.0, isentropic_efficiency=1.0,
             mass_flow=1.0) -> PassageResult:
    """Outlet pressure of a diffuser from the energy balance.

    Assumptions: steady, adiabatic, no shaft work, potential energy neglected.  The static
    enthalpy rises by the kinetic energy given up, ``h2 = h1 + (V1^2 - V2^2)/2``; the
    isentropic efficiency fixes how much of it becomes pressure:
    ``h(P2, s1) = h1 + eta (h2 - h1)``.

    Parameters
    ----------
    inlet : State
        Static inlet state.
    velocity_in : float or Quantity
        Inlet velocity [m/s], positive.
    velocity_out : float or Quantity
        Outlet velocity [m/s], in [0, velocity_in).
    isentropic_efficiency : float
        Diffuser efficiency (h2s - h1) / (h2 - h1) [-] in (0, 1].
    mass_flow : float or Quantity
        Mass flow [kg/s], for the flow areas.

    Returns
    -------
    PassageResult

    References
    ----------
    Steady-flow energy equation; the diffuser efficiency as defined in the module notes
    (common practice).
    """
    inlet, m = _inlet_and_flow("diffuser", inlet, mass_flow)
    V1 = _positive(velocity_in, "velocity", "diffuser inlet velocity", "m/s")
    V2 = to_si(velocity_out, "velocity", "diffuser outlet velocity")
    eta = _efficiency("diffuser isentropic efficiency", isentropic_efficiency)
    if not 0.0 <= V2 < V1:
        raise InputError(
            f"diffuser outlet velocity {V2:g} m/s must lie in [0, {V1:g}) m/s, below the "
            "inlet velocity: a diffuser slows the flow")
    fluid = inlet.fluid
    h2 = inlet.h + (V1 ** 2 - V2 ** 2) / 2
    h2s = inlet.h + eta * (h2 - inlet.h)
    iso = fluid.state_hs(h2s, inlet.s, inlet.P * 1.01)
    outlet = fluid.state_Ph(iso.P, h2, T_guess=iso.T)
    return _finish("diffuser", inlet, outlet, iso, m, V1, V2, eta)


def velocity_from_area(mass_flow, density, area) -> float:
    """Flow velocity from continuity, V = m / (rho A) [m/s].

    Parameters
    ----------
    mass_flow : float or Quantity
        Mass flow [kg/s].
    density : float or Quantity
        Density [kg/m^3].
    area : float or Quantity
        Flow area [m^2].
    """
    m = _positive(mass_flow, "mass_flow", "mass flow", "kg/s")
    rho = _positive(density, "density", "density", "kg/m^3")
    A = _positive(area, "area", "flow area", "m^2")
    return m / (rho * A)


__all__ = ["PassageResult", "diffuser", "nozzle", "velocity_from_area"]
