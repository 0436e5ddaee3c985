"""Pipe segment carrying an incompressible liquid, and the suction head available to a pump.

Steady-flow energy equation per unit mass between inlet 1 and outlet 2 of a liquid of
constant density ``rho`` (Bernoulli's equation with pump work, heat and friction)::

    P2 = P1 + rho (w_pump - (V2^2 - V1^2)/2 - g (z2 - z1) - e_f)
    e_f = (f L / D + K) V1^2 / 2                         (Darcy-Weisbach, minor losses K)
    h2 = h1 + w_pump - q_loss - (V2^2 - V1^2)/2 - g (z2 - z1)

The friction work ``e_f`` is dissipated into the liquid; together with the heat lost it sets
the outlet temperature through ``h2`` at ``P2``.  The Darcy friction factor comes from the
`fluids` package (``fluids.friction.friction_factor``: 64/Re when laminar, the Colebrook
equation otherwise).  Friction is taken on the inlet diameter over the whole length; a
different outlet diameter is a transition at the outlet whose loss, if any, belongs in K.

Net positive suction head available at a pump suction::

    NPSHa = (P - P_vapour(T)) / (rho g) + V^2 / (2 g)

References
----------
C. F. Colebrook, "Turbulent flow in pipes, with particular reference to the transition
region between the smooth and rough pipe laws", J. Inst. Civil Eng. 11 (1939) 133-156.
C. Bell et al., fluids: Fluid dynamics component of the Chemical Engineering Design Library
(friction factor solvers).
ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin (definition of NPSHa).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import pint
from fluids.friction import friction_factor as _fluids_friction_factor

from ..errors import InputError, SpecificationError
from ..properties import State
from ..units import to_si
from .throttle import _check_state, _not_negative, _positive
from .turbomachine import STANDARD_GRAVITY

#: Absolute roughness of new commercial steel pipe [m] (0.045 mm, from memory).
COMMERCIAL_STEEL_ROUGHNESS = 4.5e-5


def _viscosity(value) -> float:
    """Dynamic viscosity [Pa s] from a float or a pint Quantity."""
    if isinstance(value, pint.Quantity):
        try:
            value = value.to("Pa*s").magnitude
        except pint.DimensionalityError:
            raise InputError(f"viscosity was given in {value.units:~P}, which is not a unit of "
                             "dynamic viscosity (Pa s)") from None
    return to_si(value, "dimensionless", "viscosity")


def _check_liquid(name, state):
    if state.phase in ("gas", "two-phase"):
        raise InputError(
            f"the {name} is {state.fluid.name} {state.phase} at {state.T:.5g} K and "
            f"{state.P / 1e5:.5g} bar: the pipe balance is for an incompressible liquid")


@dataclass(frozen=True, eq=False)
class PipeResult:
    """Result of a pipe segment with an incompressible liquid.  All numbers in SI units.

    Attributes
    ----------
    inlet, outlet : State
        Inlet and outlet states.
    mass_flow : float
        Mass flow [kg/s].
    density : float
        Liquid density used throughout (inlet density) [kg/m^3].
    velocity_in, velocity_out : float
        Mean velocities [m/s].
    elevation_change : float
        Outlet elevation above the inlet [m].
    reynolds_number : float
        rho V1 D / mu [-] (NaN when the friction factor was given).
    friction_factor : float
        Darcy friction factor [-].
    friction_loss : float
        Mechanical energy dissipated by friction and minor losses, e_f [J/kg].
    pump_power : float
        Power added to the liquid by a pump in the segment [W].
    heat_loss : float
        Heat lost to the surroundings [W] (positive out of the pipe).
    """

    inlet: State
    outlet: State
    mass_flow: float
    density: float
    velocity_in: float
    velocity_out: float
    elevation_change: float
    reynolds_number: float
    friction_factor: float
    friction_loss: float
    pump_power: float
    heat_loss: float

    @property
    def pressure_drop(self) -> float:
        """Inlet minus outlet pressure [Pa] (negative when the pressure rises)."""
        return self.inlet.P - self.outlet.P

    @property
    def head_loss(self) -> float:
        """Friction head loss e_f / g [m]."""
        return self.friction_loss / STANDARD_GRAVITY

    @property
    def volume_flow(self) -> float:
        """Volume flow [m^3/s]."""
        return self.mass_flow / self.density

    def to_dict(self) -> dict:
        """Flat dict of the result numbers (SI units, keys end with their unit)."""
        return {
            "device": "pipe", "fluid": self.inlet.fluid.name,
            "inlet_pressure_Pa": self.inlet.P, "inlet_temperature_K": self.inlet.T,
            "outlet_pressure_Pa": self.outlet.P, "outlet_temperature_K": self.outlet.T,
            "mass_flow_kg_per_s": self.mass_flow, "density_kg_per_m3": self.density,
            "volume_flow_m3_per_s": self.volume_flow,
            "velocity_in_m_per_s": self.velocity_in, "velocity_out_m_per_s": self.velocity_out,
            "elevation_change_m": self.elevation_change,
            "reynolds_number": self.reynolds_number, "friction_factor": self.friction_factor,
            "friction_loss_J_per_kg": self.friction_loss, "head_loss_m": self.head_loss,
            "pressure_drop_Pa": self.pressure_drop, "pump_power_W": self.pump_power,
            "heat_loss_W": self.heat_loss,
        }


def darcy_friction_factor(reynolds_number, relative_roughness=0.0) -> float:
    """Darcy friction factor from the `fluids` package [-].

    Parameters
    ----------
    reynolds_number : float
        Reynolds number [-], positive.
    relative_roughness : float
        Absolute roughness over diameter e/D [-], in [0, 0.05].

    Returns
    -------
    float
        64/Re below Re = 2040 (laminar), the Colebrook equation above (as chosen by
        ``fluids.friction.friction_factor``).

    References
    ----------
    Colebrook (1939); fluids.friction.friction_factor.
    """
    Re = to_si(reynolds_number, "dimensionless", "Reynolds number")
    eD = to_si(relative_roughness, "dimensionless", "relative roughness")
    if not Re > 0:
        raise InputError(f"Reynolds number {Re:g} must be positive")
    if not 0.0 <= eD <= 0.05:
        raise InputError(f"relative roughness {eD:g} must lie in [0, 0.05]")
    return float(_fluids_friction_factor(Re=Re, eD=eD))


def pipe_segment(inlet: State, mass_flow, diameter, *, length=0.0, outlet_diameter=None,
                 elevation_change=0.0, roughness=COMMERCIAL_STEEL_ROUGHNESS, viscosity=None,
                 friction_factor=None, minor_loss_coefficient=0.0, pump_power=0.0,
                 heat_loss=0.0) -> PipeResult:
    """Outlet state of a pipe segment carrying a liquid (steady-flow energy equation).

    Assumptions: steady flow of an incompressible liquid (density of the inlet state),
    uniform velocity over each cross-section, friction from Darcy-Weisbach on the inlet
    diameter; see the module notes.

    Parameters
    ----------
    inlet : State
        Inlet state, a liquid.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive.
    diameter : float or Quantity
        Inner diameter of the pipe [m] (inlet).
    length : float or Quantity
        Pipe length [m], not negative.
    outlet_diameter : float or Quantity, optional
        Inner diameter at the outlet [m]; default the inlet diameter.
    elevation_change : float or Quantity
        Outlet elevation minus inlet elevation [m].
    roughness : float or Quantity
        Absolute wall roughness [m]; default commercial steel 0.045 mm.
    viscosity : float, optional
        Dynamic viscosity of the liquid [Pa s]; needed for friction unless
        ``friction_factor`` is given.
    friction_factor : float, optional
        Darcy friction factor [-], to override the correlation.
    minor_loss_coefficient : float
        Sum of the loss coefficients of fittings and valves, on the inlet velocity head [-].
    pump_power : float or Quantity
        Power added by a pump in the segment [W], not negative.
    heat_loss : float or Quantity
        Heat lost to the surroundings [W] (positive out of the pipe).

    Returns
    -------
    PipeResult

    Raises
    ------
    InputError
        A gas or two-phase inlet, bad dimensions, a negative pump power.
    SpecificationError
        Friction needed but neither a viscosity nor a friction factor given, or a result
        below zero absolute pressure.

    References
    ----------
    Colebrook (1939); the `fluids` package for the friction factor.
    """
    inlet = _check_state("pipe inlet", inlet)
    _check_liquid("pipe inlet", inlet)
    m = _positive(mass_flow, "mass_flow", "pipe mass flow", "kg/s")
    D1 = _positive(diameter, "length", "pipe diameter", "m")
    D2 = D1 if outlet_diameter is None else _positive(outlet_diameter, "length",
                                                         "pipe outlet diameter", "m")
    L = _not_negative(length, "length", "pipe length", "m")
    dz = to_si(elevation_change, "length", "elevation change")
    eps = to_si(roughness, "length", "pipe roughness")
    if not 0.0 <= eps < D1 * 0.05:
        raise InputError(f"pipe roughness {eps:g} m must lie in [0, {0.05 * D1:g}) m "
                         "(relative roughness up to 0.05)")
    K = _not_negative(minor_loss_coefficient, "dimensionless", "minor loss coefficient")
    W = _not_negative(pump_power, "power", "pump power", "W")
    Q = to_si(heat_loss, "power", "pipe heat loss")
    rho = inlet.rho
    V1 = m / (rho * math.pi * D1 ** 2 / 4)
    V2 = m / (rho * math.pi * D2 ** 2 / 4)
    Re = math.nan
    if friction_factor is not None:
        f = to_si(friction_factor, "dimensionless", "friction factor")
        if not 0 < f < 1:
            raise InputError(f"friction factor {f:g} must lie in (0, 1)")
    elif L > 0:
        if viscosity is None:
            raise SpecificationError(
                "the pipe friction needs the liquid's dynamic viscosity [Pa s] (viscosity=...) "
                "or a Darcy friction factor (friction_factor=...)")
        mu = _viscosity(viscosity)
        if not 0 < mu < 1e3:
            raise InputError(f"viscosity {mu:g} Pa s must lie in (0, 1000) Pa s")
        Re = rho * V1 * D1 / mu
        f = darcy_friction_factor(Re, eps / D1)
    else:
        f = 0.0
    e_f = (f * L / D1 + K) * V1 ** 2 / 2
    w = W / m
    dke = (V2 ** 2 - V1 ** 2) / 2
    g_dz = STANDARD_GRAVITY * dz
    P2 = inlet.P + rho * (w - dke - g_dz - e_f)
    if not P2 > 0:
        raise SpecificationError(
            f"the pipe outlet pressure comes out at {P2 / 1e5:.6g} bar (absolute), not positive: "
            "the liquid cannot rise that far or lose that much head; raise the inlet pressure")
    h2 = inlet.h + w - Q / m - dke - g_dz
    outlet = inlet.fluid.state_Ph(P2, h2, T_guess=inlet.T)
    return PipeResult(inlet=inlet, outlet=outlet, mass_flow=m, density=rho, velocity_in=V1,
                      velocity_out=V2, elevation_change=dz, reynolds_number=Re,
                      friction_factor=f, friction_loss=e_f, pump_power=W, heat_loss=Q)


@dataclass(frozen=True, eq=False)
class SuctionHeadResult:
    """Net positive suction head available at a pump suction.  SI units.

    Attributes
    ----------
    suction : State
        Static state at the pump suction flange.
    velocity : float
        Mean velocity at the suction flange [m/s].
    vapour_pressure : float
        Saturation pressure at the suction temperature [Pa].
    npsh_available : float
        (P - P_vapour) / (rho g) + V^2 / (2 g) [m].
    """

    suction: State
    velocity: float
    vapour_pressure: float
    npsh_available: float

    @property
    def velocity_head(self) -> float:
        """V^2 / (2 g) [m]."""
        return self.velocity ** 2 / (2 * STANDARD_GRAVITY)

    def to_dict(self) -> dict:
        """Flat dict of the result numbers (SI units, keys end with their unit)."""
        return {"device": "pump suction", "fluid": self.suction.fluid.name,
                "suction_pressure_Pa": self.suction.P, "suction_temperature_K": self.suction.T,
                "density_kg_per_m3": self.suction.rho, "velocity_m_per_s": self.velocity,
                "vapour_pressure_Pa": self.vapour_pressure,
                "velocity_head_m": self.velocity_head,
                "npsh_available_m": self.npsh_available}


def npsh_available(suction: State, *, velocity=0.0, mass_flow=None, diameter=None
                   ) -> SuctionHeadResult:
    """Net positive suction head available, NPSHa = (P - Pv)/(rho g) + V^2/(2 g).

    Parameters
    ----------
    suction : State
        Static state at the pump suction (a liquid of a pure fluid).
    velocity : float or Quantity
        Mean suction velocity [m/s]; or give ``mass_flow`` and ``diameter``.
    mass_flow : float or Quantity, optional
        Mass flow [kg/s], with ``diameter``.
    diameter : float or Quantity, optional
        Suction flange inner diameter [m], with ``mass_flow``.

    Returns
    -------
    SuctionHeadResult

    References
    ----------
    ANSI/HI 9.6.1 (NPSHa definition); vapour pressure from Fluid.saturation_pressure.
    """
    suction = _check_state("pump suction state", suction)
    _check_liquid("pump suction", suction)
    V = to_si(velocity, "velocity", "suction velocity")
    if (mass_flow is None) != (diameter is None):
        raise SpecificationError("give the suction mass flow and diameter together")
    if mass_flow is not None:
        if V != 0:
            raise SpecificationError("give the suction velocity or the mass flow and diameter, "
                                     "not both")
        m = _positive(mass_flow, "mass_flow", "suction mass flow", "kg/s")
        D = _positive(diameter, "length", "suction diameter", "m")
        V = m / (suction.rho * math.pi * D ** 2 / 4)
    if V < 0:
        raise InputError(f"suction velocity {V:g} m/s must not be negative")
    fluid = suction.fluid
    if suction.T >= fluid.T_critical:
        raise InputError(f"suction temperature {suction.T:.6g} K is at or above the critical "
                         f"temperature {fluid.T_critical:.6g} K: there is no vapour pressure")
    Pv = fluid.saturation_pressure(suction.T)
    npsha = (suction.P - Pv) / (suction.rho * STANDARD_GRAVITY) + V ** 2 / (2 * STANDARD_GRAVITY)
    return SuctionHeadResult(suction=suction, velocity=V, vapour_pressure=Pv,
                             npsh_available=npsha)


__all__ = ["COMMERCIAL_STEEL_ROUGHNESS", "PipeResult", "SuctionHeadResult",
           "darcy_friction_factor", "npsh_available", "pipe_segment"]
