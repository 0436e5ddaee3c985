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

from fluids.friction import friction_factor as _fluids_friction_factor

from ..errors import InputError, SpecificationError, WorkbenchError
from ..properties import State
from ..units import MIN_MAGNITUDE
from . import checks
from .turbomachine import STANDARD_GRAVITY

#: Absolute roughness of new commercial steel pipe [m] (0.045 mm, from memory).
COMMERCIAL_STEEL_ROUGHNESS = 4.5e-5
#: Largest relative roughness e/D accepted (the top of the Moody chart, from memory) [-].
MAX_RELATIVE_ROUGHNESS = 0.05


def _check_liquid(name, state):
    if state.phase in ("gas", "two-phase"):
        raise InputError(
            f"the {name} is {state.fluid.name} {state.phase} at {state.T:.5g} K and "
            f"{state.P / 1e5:.5g} bar: the pipe balance is for an incompressible liquid")


def _vapour_pressure(fluid, T: float) -> float:
    """Saturation pressure [Pa] at T [K]; NaN where not defined (mixture, T >= T_critical)."""
    if fluid.is_mixture or not T < fluid.T_critical:
        return math.nan
    try:
        return fluid.saturation_pressure(T)
    except WorkbenchError:
        return math.nan


def _liquid_viscosity(inlet: State, viscosity) -> float:
    """Dynamic viscosity [Pa s]: the override given, or the fluid's at the inlet state."""
    if viscosity is not None:
        return checks.number(viscosity, "dynamic_viscosity", "viscosity", low=0.0, high=1e3,
                             low_open=True)
    try:
        return inlet.fluid.viscosity(inlet)
    except WorkbenchError as exc:
        raise SpecificationError(
            f"the pipe friction needs the liquid's dynamic viscosity and the fluid gives none "
            f"({exc}); give viscosity=... [Pa s] or friction_factor=...") from None


@dataclass(frozen=True, eq=False)
class PipeResult:
    """Result of a pipe segment with an incompressible liquid.  All numbers in SI units.

    Attributes
    ----------
    inlet, outlet : State
        Inlet and outlet states (the outlet is always a liquid: a segment whose liquid would
        boil is refused).
    mass_flow : float
        Mass flow [kg/s].
    density : float
        Liquid density used throughout (inlet density) [kg/m^3].
    velocity_in, velocity_out : float
        Mean velocities [m/s].
    elevation_change : float
        Outlet elevation above the inlet [m].
    reynolds_number : float
        rho V1 D / mu [-]; NaN when not defined (friction factor given, or no length).
    friction_factor : float
        Darcy friction factor [-].
    friction_loss : float
        Mechanical energy dissipated by friction and minor losses, e_f [J/kg].
    pump_power : float
        Power added to the liquid by a pump in the segment [W].
    heat_loss : float
        Heat lost to the surroundings [W] (positive out of the pipe).
    vapour_pressure : float
        Vapour pressure of the liquid at the outlet temperature [Pa]; NaN when not defined
        (above the critical temperature, mixtures).
    cautions : tuple of str
        Plain-language cautions: a pump whose suction may fall below the vapour pressure.
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
    vapour_pressure: float = math.nan
    cautions: tuple[str, ...] = ()

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
        """Flat dict of the result numbers, SI units, keys from
        :data:`workbench.fields.FIELDS`."""
        return checks.result_dict([
            ("device", "pipe"), ("fluid", self.inlet.fluid.name),
            *checks.state_items("inlet", self.inlet, ("pressure", "temperature")),
            *checks.state_items("outlet", self.outlet, ("pressure", "temperature")),
            ("mass_flow", self.mass_flow), ("density", self.density),
            ("volume_flow", self.volume_flow), ("velocity_in", self.velocity_in),
            ("velocity_out", self.velocity_out), ("elevation_change", self.elevation_change),
            ("reynolds_number", self.reynolds_number), ("friction_factor", self.friction_factor),
            ("friction_loss", self.friction_loss), ("head_loss", self.head_loss),
            ("pressure_drop", self.pressure_drop), ("pump_power", self.pump_power),
            ("heat_loss", self.heat_loss), ("vapour_pressure", self.vapour_pressure),
        ])


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

    Examples
    --------
    >>> darcy_friction_factor(1000.0)
    0.064
    """
    Re = checks.positive(reynolds_number, "dimensionless", "Reynolds number")
    eD = checks.number(relative_roughness, "dimensionless", "relative roughness", low=0.0,
                       high=MAX_RELATIVE_ROUGHNESS)
    f = float(_fluids_friction_factor(Re=Re, eD=eD))
    if not (math.isfinite(f) and f > 0):
        raise InputError(f"no friction factor for Reynolds number {Re:g} and relative "
                         f"roughness {eD:g}")
    return f


def _boiling(name, P, Pv, T, fluid):
    return SpecificationError(
        f"the pipe {name} pressure comes out at {P / 1e5:.6g} bar, below the vapour pressure "
        f"{Pv / 1e5:.6g} bar of {fluid.name} at {T:.5g} K ({T - 273.15:.4g} degC): the liquid "
        "would boil (flash, cavitate) in the pipe; raise the inlet pressure or lower the rise, "
        "the losses or the temperature")


def _outlet(inlet, P2, h2, rho, w):
    """Outlet state; refuse a liquid that would boil, caution on a pump's suction."""
    fluid = inlet.fluid
    if not P2 > 0:
        raise SpecificationError(
            f"the pipe outlet pressure comes out at {P2 / 1e5:.6g} bar (absolute), not positive: "
            "the liquid cannot rise that far or lose that much head; raise the inlet pressure")
    Pv_in = _vapour_pressure(fluid, inlet.T)
    if P2 < Pv_in:
        raise _boiling("outlet", P2, Pv_in, inlet.T, fluid)
    outlet = fluid.state_Ph(P2, h2, T_guess=inlet.T)
    Pv = _vapour_pressure(fluid, outlet.T)
    if outlet.two_phase or outlet.phase == "gas" or P2 < Pv:
        T = fluid.saturation_temperature(P2) if outlet.two_phase else outlet.T
        raise _boiling("outlet", P2, _vapour_pressure(fluid, T) if P2 >= Pv else Pv, T, fluid)
    cautions = []
    # A pump anywhere in the segment: placed at the outlet end, the liquid reaches it before
    # gaining the pump's head, so the lowest pressure is P2 - rho w.
    P_before_pump = P2 - rho * w
    if w > 0 and P_before_pump < max(Pv, Pv_in):
        cautions.append(
            f"if the pump sits at the outlet end, the pressure before it falls to "
            f"{P_before_pump / 1e5:.4g} bar, below the vapour pressure {max(Pv, Pv_in) / 1e5:.4g} "
            "bar: the liquid would boil there; put the pump near the inlet and check its NPSH")
    return outlet, Pv, tuple(cautions)


def pipe_segment(inlet: State, mass_flow, diameter, *, length=0.0, outlet_diameter=None,
                 elevation_change=0.0, roughness=COMMERCIAL_STEEL_ROUGHNESS, viscosity=None,
                 friction_factor=None, minor_loss_coefficient=0.0, pump_power=0.0,
                 heat_loss=0.0) -> PipeResult:
    """Outlet state of a pipe segment carrying a liquid (steady-flow energy equation).

    Assumptions: steady flow of an incompressible liquid (density of the inlet state),
    uniform velocity over each cross-section, friction from Darcy-Weisbach on the inlet
    diameter, a uniform slope (so the pressure along the pipe lies between its end values;
    a route that rises above both ends, a siphon, must be given as two segments); see the
    module notes.

    The liquid must stay liquid: a segment whose outlet pressure falls below the liquid's
    vapour pressure (water at 80 degC in a pipe rising 8 m from 1 bar) is **refused** with a
    message naming the vapour pressure, because the incompressible balance no longer holds
    once the liquid flashes.  With a pump in the segment, whose position is not known, a
    pressure below the vapour pressure just before a pump at the outlet end gives a caution.

    Parameters
    ----------
    inlet : State
        Inlet state, a liquid.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive (required).
    diameter : float or Quantity
        Inner diameter of the pipe [m] (inlet).
    length : float or Quantity
        Pipe length [m], not negative.
    outlet_diameter : float or Quantity, optional
        Inner diameter at the outlet [m]; default the inlet diameter.
    elevation_change : float or Quantity
        Outlet elevation minus inlet elevation [m].
    roughness : float or Quantity
        Absolute wall roughness [m], at most 0.05 of the diameter; default commercial steel
        0.045 mm.
    viscosity : float or Quantity, optional
        Dynamic viscosity of the liquid [Pa s]; default the fluid's own at the inlet state.
        Give it to override the property model (or when the fluid has no viscosity model).
    friction_factor : float, optional
        Darcy friction factor [-] in (0, 1), to override the correlation.
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
        A gas or two-phase inlet, bad dimensions, a velocity above 1000 m/s, a negative pump
        power.
    SpecificationError
        An outlet below zero absolute pressure or below the liquid's vapour pressure;
        friction needed but no viscosity known.

    References
    ----------
    Colebrook (1939); the `fluids` package for the friction factor.

    Examples
    --------
    >>> import workbench as wb
    >>> water = wb.Fluid("Water")
    >>> r = pipe_segment(water.state(P=3e5, T=293.15), 10.0, 0.1, length=100.0)
    >>> round(r.pressure_drop)
    15838
    """
    inlet = checks.state(inlet, "pipe inlet")
    _check_liquid("pipe inlet", inlet)
    m = checks.positive(mass_flow, "mass_flow", "pipe mass flow")
    D1 = checks.positive(diameter, "length", "pipe diameter")
    D2 = D1 if outlet_diameter is None else checks.positive(outlet_diameter, "length",
                                                             "pipe outlet diameter")
    L = checks.not_negative(length, "length", "pipe length")
    dz = checks.number(elevation_change, "length", "elevation change")
    K = checks.not_negative(minor_loss_coefficient, "dimensionless", "minor loss coefficient")
    W = checks.not_negative(pump_power, "power", "pump power")
    Q = checks.number(heat_loss, "heat_flow", "pipe heat loss")
    f_given = checks.optional(friction_factor, "dimensionless", "friction factor", low=0.0,
                              high=1.0, low_open=True, high_open=True)
    rho = inlet.rho
    V1 = checks.passage_velocity(m, rho, D1, "pipe")
    V2 = checks.passage_velocity(m, rho, D2, "pipe outlet")
    eps = checks.not_negative(roughness, "length", "pipe roughness")
    if not eps <= MAX_RELATIVE_ROUGHNESS * D1:
        raise InputError(f"pipe roughness {eps:g} m is above {MAX_RELATIVE_ROUGHNESS:g} of the "
                         f"pipe diameter {D1:g} m (relative roughness {eps / D1:.3g}; at most "
                         f"{MAX_RELATIVE_ROUGHNESS:g} allowed)")
    Re = math.nan
    if f_given is not None:
        f = f_given
    elif L > 0:
        mu = _liquid_viscosity(inlet, viscosity)
        Re = rho * V1 * D1 / mu
        # below 1e-12 (the input boundary's smallest magnitude) the pipe is hydraulically smooth
        f = darcy_friction_factor(Re, eps / D1 if eps >= MIN_MAGNITUDE * D1 else 0.0)
    else:
        f = 0.0
    e_f = (f * L / D1 + K) * V1 ** 2 / 2
    w = W / m
    dke = (V2 ** 2 - V1 ** 2) / 2
    g_dz = STANDARD_GRAVITY * dz
    P2 = inlet.P + rho * (w - dke - g_dz - e_f)
    h2 = inlet.h + w - Q / m - dke - g_dz
    outlet, Pv, cautions = _outlet(inlet, P2, h2, rho, w)
    return PipeResult(inlet=inlet, outlet=outlet, mass_flow=m, density=rho, velocity_in=V1,
                      velocity_out=V2, elevation_change=dz, reynolds_number=Re,
                      friction_factor=f, friction_loss=e_f, pump_power=W, heat_loss=Q,
                      vapour_pressure=Pv, cautions=cautions)


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
    cautions : tuple of str
        Plain-language cautions (none yet: the margin over the pump's NPSH required is the
        user's judgement).
    """

    suction: State
    velocity: float
    vapour_pressure: float
    npsh_available: float
    cautions: tuple[str, ...] = ()

    @property
    def velocity_head(self) -> float:
        """V^2 / (2 g) [m]."""
        return self.velocity ** 2 / (2 * STANDARD_GRAVITY)

    def to_dict(self) -> dict:
        """Flat dict of the result numbers, SI units, keys from
        :data:`workbench.fields.FIELDS` (pressure, temperature, density at the suction)."""
        return checks.result_dict([
            ("device", "pump suction"), ("fluid", self.suction.fluid.name),
            *checks.state_items("", self.suction, ("pressure", "temperature", "density")),
            ("velocity", self.velocity), ("vapour_pressure", self.vapour_pressure),
            ("velocity_head", self.velocity_head), ("npsh_available", self.npsh_available),
        ])


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

    Examples
    --------
    >>> import workbench as wb
    >>> water = wb.Fluid("Water")
    >>> round(npsh_available(water.state(P=1.2e5, T=298.15), velocity=2.0).npsh_available, 2)
    12.15
    """
    suction = checks.state(suction, "pump suction state")
    _check_liquid("pump suction", suction)
    V = checks.not_negative(velocity, "velocity", "suction velocity")
    if (mass_flow is None) != (diameter is None):
        raise SpecificationError("give the suction mass flow and diameter together")
    if mass_flow is not None:
        if V != 0:
            raise SpecificationError("give the suction velocity or the mass flow and diameter, "
                                     "not both")
        m = checks.positive(mass_flow, "mass_flow", "suction mass flow")
        D = checks.positive(diameter, "length", "suction diameter")
        V = checks.passage_velocity(m, suction.rho, D, "suction")
    fluid = suction.fluid
    if fluid.is_mixture:
        raise InputError(f"suction fluid {fluid.name} is a mixture: NPSH available needs the "
                         "vapour pressure of a pure fluid")
    if suction.T >= fluid.T_critical:
        raise InputError(f"suction temperature {suction.T:.6g} K is at or above the critical "
                         f"temperature {fluid.T_critical:.6g} K: there is no vapour pressure")
    Pv = fluid.saturation_pressure(suction.T)
    npsha = (suction.P - Pv) / (suction.rho * STANDARD_GRAVITY) + V ** 2 / (2 * STANDARD_GRAVITY)
    return SuctionHeadResult(suction=suction, velocity=V, vapour_pressure=Pv,
                             npsh_available=npsha)


__all__ = ["COMMERCIAL_STEEL_ROUGHNESS", "PipeResult", "SuctionHeadResult",
           "darcy_friction_factor", "npsh_available", "pipe_segment"]
