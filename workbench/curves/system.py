"""System curves of piping and ducts, the operating point of a pump or fan, and NPSH margin.

The head a system needs to pass a volume flow Q of a fluid of density rho at its state::

    H_sys(Q) = H_static + sum_i (f_i L_i / D_i + K_i) V_i^2 / (2 g),   V_i = 4 Q / (pi D_i^2)
    H_static = dz + (P_delivery - P_source) / (rho g)

with the Darcy friction factor f_i of each pipe section from the workbench's pipe model
(:func:`workbench.machines.pipe.darcy_friction_factor`: the `fluids` package, 64/Re when
laminar, Colebrook otherwise) at Re_i = rho V_i D_i / mu.  Density and viscosity are those of
the given state, held constant along the system: an incompressible flow, exact for liquids
and a fair approximation for fan ducts at low Mach number and small pressure rise.  A
throttling valve is an added loss coefficient on the velocity head of a chosen section.

The operating point is where the machine's head equals the system's: Brent's method
(``scipy.optimize.brentq``) on H_machine(Q) - H_sys(Q) over the curve's flow range, with the
machine's head compared as pump total head [m] or as fan pressure [Pa] = rho g H_sys.

NPSH available at the pump suction, with the source level ``suction_head`` above the pump
datum and the suction sections' losses h_s(Q)::

    NPSHa(Q) = (P_source - P_vapour) / (rho g) + suction_head - h_s(Q)

which is (P - P_vapour)/(rho g) + V^2/(2 g) at the suction flange
(:func:`workbench.machines.pipe.npsh_available`); the NPSH margin is NPSHa - NPSHr.

References
----------
C. F. Colebrook (1939), J. Inst. Civil Eng. 11, 133-156; Darcy-Weisbach head loss (common
practice).
R. P. Brent, Algorithms for Minimization without Derivatives, Prentice-Hall (1973).
ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin (NPSHa, NPSH margin).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from scipy.optimize import brentq

from ..errors import InputError, PropertyError, SpecificationError, WorkbenchError
from ..fields import row
from ..machines.pipe import COMMERCIAL_STEEL_ROUGHNESS, darcy_friction_factor, npsh_available
from ..machines.turbomachine import STANDARD_GRAVITY
from ..properties import State
from ..units import count, flag, not_negative, optional_si, positive, text, to_si, to_si_array
from .characteristic import PerformanceCurve

_G = STANDARD_GRAVITY


@dataclass(frozen=True)
class PipeSection:
    """One pipe or duct section of a system, with its fittings.

    Attributes
    ----------
    diameter : float
        Inner diameter [m] (the hydraulic diameter of a duct), positive.
    length : float
        Straight length [m], not negative; zero for a fitting or valve alone.
    roughness : float
        Absolute wall roughness [m], in [0, 0.05 diameter]; default commercial steel.
    loss_coefficient : float
        Sum of the fittings' loss coefficients K on this section's velocity head [-].
    suction : bool
        True for a section on the pump's suction side (its loss lowers NPSHa).
    name : str
        A label.
    """

    diameter: float
    length: float = 0.0
    roughness: float = COMMERCIAL_STEEL_ROUGHNESS
    loss_coefficient: float = 0.0
    suction: bool = False
    name: str = "section"

    def __post_init__(self):
        D = positive(self.diameter, "length", "section diameter")
        values = {
            "diameter": D,
            "length": not_negative(self.length, "length", "section length"),
            "roughness": to_si(self.roughness, "length", "section roughness", low=0.0,
                               high=0.05 * D),
            "loss_coefficient": to_si(self.loss_coefficient, "dimensionless",
                                      "section loss coefficient", low=0.0, high=1e6),
            "suction": flag(self.suction, "suction"),
            "name": text(self.name, "section name"),
        }
        for key, value in values.items():
            object.__setattr__(self, key, value)

    @property
    def area(self) -> float:
        """Flow area pi D^2 / 4 [m^2]."""
        return math.pi * self.diameter ** 2 / 4

    def head_loss(self, flow: float, density: float, viscosity: float) -> float:
        """(f L / D + K) V^2 / (2 g) at a volume flow [m^3/s] (SI floats, validated above)."""
        if flow == 0:
            return 0.0
        V = flow / self.area
        f = 0.0
        if self.length > 0:
            Re = density * V * self.diameter / viscosity
            f = darcy_friction_factor(Re, self.roughness / self.diameter)
        return (f * self.length / self.diameter + self.loss_coefficient) * V ** 2 / (2 * _G)


def _section(value, i) -> PipeSection:
    if isinstance(value, PipeSection):
        return value
    if isinstance(value, dict):
        allowed = {"diameter", "length", "roughness", "loss_coefficient", "suction", "name"}
        unknown = sorted(str(k) for k in value if k not in allowed)
        if unknown:
            raise InputError(f"pipe section {i}: unknown keys {', '.join(unknown)[:200]}")
        if "diameter" not in value:
            raise InputError(f"pipe section {i} needs a diameter")
        return PipeSection(**value)
    raise InputError(f"pipe section {i} must be a PipeSection or a dict, not "
                     f"{type(value).__name__}")


class SystemCurve:
    """Head a piping or duct system needs against volume flow, for a fluid at its state.

    Parameters
    ----------
    state : State
        Fluid at the source (its pressure is the source pressure, e.g. the suction tank's gas
        space); density and viscosity are taken here.
    static_head : float or Quantity
        Elevation of the delivery point above the source [m] (negative below).
    pressure_difference : float or Quantity
        Delivery minus source pressure [Pa], added as (P_d - P_s) / (rho g).
    sections : sequence of PipeSection or dict
        Pipe sections with their fittings (at most 100).
    suction_head : float or Quantity, optional
        Level of the source above the pump's datum [m] (negative for a suction lift); needed
        for NPSH available.
    name : str
        A label.

    Raises
    ------
    InputError
        A value out of range, not a State, an unknown section key.
    PropertyError
        The property model has no viscosity for the fluid, or it is two-phase.

    References
    ----------
    Darcy-Weisbach with Colebrook's friction factor (module notes).

    Examples
    --------
    >>> import workbench as wb
    >>> water = wb.Fluid("Water").state(P=101325.0, T=293.15)
    >>> system = SystemCurve(water, static_head=12.0,
    ...                      sections=[PipeSection(0.1, length=80.0, loss_coefficient=4.0)])
    >>> round(system.head(0.0), 3)
    12.0
    """

    def __init__(self, state, *, static_head=0.0, pressure_difference=0.0, sections=(),
                 suction_head=None, name="system"):
        if not isinstance(state, State):
            raise InputError(f"system state must be a workbench State, not "
                             f"{type(state).__name__}")
        if state.two_phase:
            raise InputError(f"the system fluid {state.fluid.name} is two-phase at "
                             f"{state.P:.6g} Pa: give a single-phase state")
        self.state = state
        self.name = text(name, "system name")
        self.density = float(state.rho)
        self.viscosity = float(state.fluid.viscosity(state))
        self.elevation = to_si(static_head, "length", "static head")
        self.pressure_difference = to_si(pressure_difference, "pressure",
                                         "pressure difference")
        if isinstance(sections, (PipeSection, dict)) or not hasattr(sections, "__iter__"):
            sections = [sections]
        sections = list(sections)
        if len(sections) > 100:
            raise InputError(f"a system has at most 100 pipe sections, not {len(sections)}")
        self.sections = tuple(_section(s, i) for i, s in enumerate(sections))
        self.suction_head = optional_si(suction_head, "length", "suction head")

    @property
    def static_head(self) -> float:
        """Head at zero flow: dz + (P_d - P_s) / (rho g) [m]."""
        return self.elevation + self.pressure_difference / (self.density * _G)

    def _flows(self, flow):
        scalar = np.ndim(getattr(flow, "magnitude", flow)) == 0
        if scalar:
            Q = np.array([not_negative(flow, "volume_flow", "system flow")])
        else:
            Q = to_si_array(flow, "volume_flow", "system flow", allow_nan=False)
            if (Q < 0).any():
                raise InputError(f"system flow {Q.min():g} m**3/s must not be negative")
        return scalar, Q

    def _loss(self, Q: float, suction_only: bool = False) -> float:
        return sum(s.head_loss(Q, self.density, self.viscosity) for s in self.sections
                   if s.suction or not suction_only)

    def head(self, flow):
        """System head at a flow [m] (float for one flow, array for a sequence).

        Parameters
        ----------
        flow : float, sequence or Quantity
            Volume flow [m^3/s], not negative.
        """
        scalar, Q = self._flows(flow)
        H = np.array([self.static_head + self._loss(q) for q in Q])
        if not np.all(np.isfinite(H)):
            raise InputError("the system head is not finite at the flows given")
        return float(H[0]) if scalar else H

    def pressure(self, flow):
        """Pressure rise the system needs, rho g H_sys [Pa]."""
        return self.head(flow) * self.density * _G

    def with_throttle(self, loss_coefficient, *, section: int = 0) -> SystemCurve:
        """The same system with a throttling valve: an added loss coefficient [-] on the
        velocity head of section ``section`` (default the first)."""
        K = positive(loss_coefficient, "dimensionless", "throttle loss coefficient")
        if not self.sections:
            raise SpecificationError("a throttle needs a pipe section to sit in: the system "
                                     "has none")
        i = count(section, "throttle section", low=0, high=len(self.sections) - 1)
        base = self.sections[i]
        valve = PipeSection(base.diameter, loss_coefficient=K, name="throttle")
        new = SystemCurve.__new__(SystemCurve)
        new.__dict__.update(self.__dict__)
        new.sections = self.sections + (valve,)
        return new

    def npsh_available(self, flow) -> float:
        """NPSH available at the pump suction at a flow [m] (module notes).

        Raises
        ------
        SpecificationError
            Without ``suction_head``, or for a fluid above its critical temperature.
        """
        if self.suction_head is None:
            raise SpecificationError("NPSH available needs the source level above the pump "
                                     "(suction_head=...)")
        Q = not_negative(flow, "volume_flow", "flow")
        rho, state = self.density, self.state
        loss = self._loss(Q, suction_only=True)
        suction = [s for s in self.sections if s.suction]
        V = Q / suction[-1].area if suction else 0.0
        P_flange = state.P + rho * _G * (self.suction_head - loss) - rho * V ** 2 / 2
        try:
            flange = state.fluid.state(P=P_flange, T=state.T)
            if flange.phase != "liquid":
                raise PropertyError("not a liquid")
            return npsh_available(flange, velocity=V).npsh_available
        except (WorkbenchError, ValueError):
            pass
        if state.T >= state.fluid.T_critical:
            raise SpecificationError(f"the system fluid at {state.T:.6g} K is above its critical "
                                     "temperature: there is no vapour pressure")
        try:
            P_vap = state.fluid.saturation_pressure(state.T)
        except WorkbenchError as exc:
            raise SpecificationError(f"no vapour pressure of the system fluid: {exc}") from None
        # the flange would be below the vapour pressure: same definition, negative NPSHa
        return (P_flange - P_vap) / (rho * _G) + V ** 2 / (2 * _G)


@dataclass(frozen=True)
class OperatingPoint:
    """Where a machine's curve meets a system curve.  SI units.

    Attributes
    ----------
    machine : str
        ``"pump"`` or ``"fan"``.
    volume_flow : float
        Flow at the intersection [m^3/s].
    speed : float
        Machine speed [rad/s].
    total_head : float
        Head at the intersection [m] (for a fan, the fan pressure over rho g).
    pressure_rise : float
        Pressure rise at the intersection, rho g H [Pa] (the fan pressure of a fan).
    system_head : float
        System head at the flow [m] (equal to ``total_head`` to the solver tolerance).
    static_head : float
        System head at zero flow [m].
    throttle_coefficient : float
        Added throttle loss coefficient [-] (0 without).
    efficiency : float or None
        Efficiency on the curve at the flow [-]; None when the curve has none.
    power : float or None
        Power input [W]: from the power curve, else rho g Q H / efficiency; None without
        either.
    surge_margin : float
        (Q - Q_min) / Q [-] against the curve's surge or minimum-flow limit at this speed.
    npsh_available, npsh_required, npsh_margin : float or None
        [m]; None where the system or the curve lacks the data.
    cautions : tuple of str
        Plain-language cautions (below the minimum flow, beyond the maximum flow, NPSH margin
        negative, several intersections).
    """

    machine: str
    volume_flow: float
    speed: float
    total_head: float
    pressure_rise: float
    system_head: float
    static_head: float
    throttle_coefficient: float
    efficiency: float | None
    power: float | None
    surge_margin: float
    npsh_available: float | None
    npsh_required: float | None
    npsh_margin: float | None
    cautions: tuple = field(default=())

    FIELDS = ("volume_flow", "speed", "total_head", "pressure_rise", "system_head",
              "static_head", "throttle_coefficient", "efficiency", "power", "surge_margin",
              "npsh_available", "npsh_required", "npsh_margin")

    def to_dict(self) -> dict:
        """Result fields by name (SI values, see :data:`workbench.fields.FIELDS`)."""
        out = {"machine": self.machine}
        out.update(row(self, self.FIELDS))
        out["cautions"] = "; ".join(self.cautions)
        return out


def _intersections(diff, lo, hi, points=64):
    grid = np.linspace(lo, hi, points)
    values = np.array([diff(q) for q in grid])
    brackets = [(grid[i], grid[i + 1]) for i in range(points - 1)
                if values[i] == 0 or values[i] * values[i + 1] < 0]
    if values[-1] == 0:
        brackets.append((grid[-2], grid[-1]))
    return values, brackets


def operating_point(curve: PerformanceCurve, system: SystemCurve, *, speed=None,
                    throttle=None, throttle_section: int = 0) -> OperatingPoint:
    """Operating point of a pump or fan in a system, with a speed change or a throttle.

    Parameters
    ----------
    curve : PerformanceCurve
        The machine's curve (``machine`` "pump" or "fan").
    system : SystemCurve
        The system; its fluid density converts between head and pressure.
    speed : float or Quantity, optional
        Run the machine at this speed [rad/s] (affinity laws); default the curve's speed.
    throttle : float, optional
        Added loss coefficient of a throttling valve [-], positive.
    throttle_section : int
        Index of the section whose velocity head the throttle coefficient refers to.

    Returns
    -------
    OperatingPoint

    Raises
    ------
    SpecificationError
        A compressor curve (a gas network needs a compressible system model, not covered
        here), or no intersection within the curve's flow range (the message says which way
        it misses).

    References
    ----------
    Darcy-Weisbach and Colebrook (module notes); Brent (1973); ANSI/HI 9.6.1.

    Examples
    --------
    >>> import workbench as wb
    >>> water = wb.Fluid("Water").state(P=101325.0, T=293.15)
    >>> system = SystemCurve(water, static_head=12.0, sections=[PipeSection(0.15, length=80.0)])
    >>> pump = wb.PerformanceCurve([0.0, 0.05, 0.1], [40.0, 36.0, 24.0], speed=150.0)
    >>> point = operating_point(pump, system, throttle=20.0)
    >>> round(point.volume_flow, 4)
    0.0668
    """
    if not isinstance(curve, PerformanceCurve):
        raise InputError(f"curve must be a PerformanceCurve, not {type(curve).__name__}")
    if not isinstance(system, SystemCurve):
        raise InputError(f"system must be a SystemCurve, not {type(system).__name__}")
    if curve.machine == "compressor":
        raise SpecificationError("the operating point is found for pumps and fans: a "
                                 "compressor in a gas network needs a compressible system "
                                 "model, which this incompressible system curve is not")
    K = 0.0
    if throttle is not None:
        K = positive(throttle, "dimensionless", "throttle loss coefficient")
        system = system.with_throttle(K, section=throttle_section)
    if speed is not None:
        curve = curve.at_speed(speed)
    rho_g = system.density * _G

    def machine_head(q):
        H = curve.head(q)
        return H if curve.machine == "pump" else H / rho_g

    def diff(q):
        return machine_head(q) - system.head(q)

    lo, hi = float(curve.flow[0]), float(curve.flow[-1])
    values, brackets = _intersections(diff, lo, hi)
    if not brackets:
        if values.max() < 0:
            raise SpecificationError(
                f"no operating point: the system needs more head than the machine gives over "
                f"the whole curve (at {lo:g} m**3/s the system needs {system.head(lo):.5g} m, "
                f"the machine gives {machine_head(lo):.5g} m)")
        raise SpecificationError(
            f"no operating point within the curve: at its largest flow {hi:g} m**3/s the "
            f"machine still gives {machine_head(hi):.5g} m against {system.head(hi):.5g} m of "
            "the system, so it would run beyond its last datasheet point")
    a, b = brackets[-1]  # the highest-flow intersection: the stable one of a drooping curve
    Q = a if diff(a) == 0 else (b if diff(b) == 0 else brentq(diff, a, b, xtol=1e-12 * hi,
                                                                rtol=1e-12))
    return _point(curve, system, Q, K, machine_head(Q), len(brackets))


def _point(curve, system, Q, K, H, n_intersections) -> OperatingPoint:
    cautions = []
    if n_intersections > 1:
        cautions.append(f"the curves meet {n_intersections} times: the point of highest flow "
                        "is given; a drooping curve may run unstably")
    if Q < curve.min_flow:
        cautions.append(f"the flow {Q:.5g} m**3/s is below the machine's minimum-flow or surge "
                        f"limit {curve.min_flow:.5g} m**3/s")
    if Q > curve.max_flow:
        cautions.append(f"the flow {Q:.5g} m**3/s is above the machine's maximum flow "
                        f"{curve.max_flow:.5g} m**3/s")
    rho_g = system.density * _G
    eta = curve.efficiency(Q) if "efficiency" in curve.quantities else None
    if eta is not None and not 0 < eta <= 1:
        cautions.append(f"the efficiency fit gives {eta:.3g} at this flow, outside (0, 1]: the "
                        "fit is not usable there")
    if "power" in curve.quantities:
        power = curve.power(Q)
    elif eta is not None and eta > 0:
        power = rho_g * Q * H / eta
    else:
        power = None
    npsha = npshr = margin = None
    if system.suction_head is not None and system.state.phase == "liquid":
        npsha = system.npsh_available(Q)
    if "npsh_required" in curve.quantities:
        npshr = curve.npsh_required(Q)
    if npsha is not None and npshr is not None:
        margin = npsha - npshr
        if margin < 0:
            cautions.append(f"NPSH available {npsha:.4g} m is below NPSH required {npshr:.4g} m: "
                            "the pump will cavitate")
    surge = (Q - curve.min_flow) / Q if Q > 0 else -math.inf
    if not math.isfinite(surge):
        surge = -1.0
        cautions.append("the operating point lies at zero flow")
    return OperatingPoint(
        machine=curve.machine, volume_flow=float(Q), speed=curve.speed, total_head=float(H),
        pressure_rise=float(H * rho_g), system_head=float(system.head(Q)),
        static_head=system.static_head, throttle_coefficient=K, efficiency=eta, power=power,
        surge_margin=float(surge), npsh_available=npsha, npsh_required=npshr,
        npsh_margin=margin, cautions=tuple(cautions))


__all__ = ["OperatingPoint", "PipeSection", "SystemCurve", "operating_point"]
