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
from . import checks


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
        Flow areas from continuity A = m / (rho V) [m^2]; NaN when not defined (zero
        velocity at that end).
    area_ratio : float
        Outlet over inlet flow area [-]; NaN when not defined (a velocity is zero).
    outlet_mach_number : float
        Outlet velocity over the outlet speed of sound [-]; NaN when not defined (two-phase
        outlet).
    cautions : tuple of str
        Plain-language cautions: a supersonic outlet of a nozzle, a supersonic diffuser
        inlet, a wet outlet.
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
    cautions: tuple[str, ...] = ()

    @property
    def velocity_coefficient(self) -> float:
        """Square root of the isentropic efficiency (nozzles) [-]."""
        return math.sqrt(self.isentropic_efficiency)

    @property
    def outlet_quality(self) -> float:
        """Vapour quality at the outlet [-], NaN when not defined (single-phase)."""
        return self.outlet.quality

    def to_dict(self) -> dict:
        """Flat dict of the result numbers, SI units, keys from
        :data:`workbench.fields.FIELDS`."""
        return checks.result_dict([
            ("device", self.kind), ("fluid", self.inlet.fluid.name),
            *checks.state_items("inlet", self.inlet, ("pressure", "temperature", "enthalpy")),
            *checks.state_items("outlet", self.outlet, ("pressure", "temperature", "enthalpy",
                                                        "quality")),
            ("mass_flow", self.mass_flow), ("velocity_in", self.velocity_in),
            ("velocity_out", self.velocity_out),
            ("isentropic_efficiency", self.isentropic_efficiency),
            ("velocity_coefficient", self.velocity_coefficient),
            ("stagnation_enthalpy", self.stagnation_enthalpy),
            ("inlet_area", self.inlet_area), ("outlet_area", self.outlet_area),
            ("area_ratio", self.area_ratio), ("outlet_mach_number", self.outlet_mach_number),
        ])


def _area(m, rho, V):
    """Flow area m / (rho V) [m^2]; NaN (not defined) at zero velocity."""
    return math.nan if V == 0 else m / (rho * V)


def _cautions(kind, inlet, outlet, V1, mach_out):
    notes = []
    if kind == "nozzle" and mach_out > 1.0:
        notes.append(f"the outlet Mach number is {mach_out:.3g}: a convergent nozzle chokes at "
                     "Mach 1; this expansion needs a convergent-divergent passage")
    if kind == "diffuser":
        a1 = inlet.fluid.speed_of_sound(inlet)
        if a1 > 0 and V1 / a1 > 1.0:
            notes.append(f"the inlet Mach number is {V1 / a1:.3g}: a supersonic diffuser "
                         "decelerates through shocks, so its efficiency is not that of a "
                         "subsonic passage")
    if outlet.two_phase:
        notes.append(f"the outlet is wet (quality {outlet.quality:.3f}): the Mach number is not "
                     "computed and droplets erode the passage")
    return tuple(notes)


def _finish(kind, inlet, outlet, iso, m, V1, V2, eta):
    A1, A2 = _area(m, inlet.rho, V1), _area(m, outlet.rho, V2)
    a2 = outlet.fluid.speed_of_sound(outlet)
    mach = V2 / a2 if a2 > 0 else math.nan
    return PassageResult(
        kind=kind, inlet=inlet, outlet=outlet, isentropic_outlet=iso, mass_flow=m,
        velocity_in=V1, velocity_out=V2, isentropic_efficiency=eta,
        stagnation_enthalpy=inlet.h + V1 ** 2 / 2, inlet_area=A1, outlet_area=A2,
        area_ratio=A2 / A1 if V1 > 0 and V2 > 0 else math.nan, outlet_mach_number=mach,
        cautions=_cautions(kind, inlet, outlet, V1, mach))


def nozzle(inlet: State, mass_flow, *, P_out, isentropic_efficiency=None,
           velocity_coefficient=None, velocity_in=0.0) -> PassageResult:
    """Outlet velocity and state of a nozzle from the energy balance.

    Assumptions: steady, adiabatic, no shaft work, potential energy neglected; the flow
    follows the pressure given (no check of choking: a Mach number above 1 at the outlet
    means the passage must be convergent-divergent, and the result carries a caution).

    Parameters
    ----------
    inlet : State
        Static inlet state.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive, for the flow areas (required).
    P_out : float or Quantity
        Outlet static pressure [Pa], below the inlet pressure (keyword-only).
    isentropic_efficiency : float, optional
        Nozzle efficiency (h01 - h2) / (h01 - h2s) [-] in (0, 1]; default 1.
    velocity_coefficient : float, optional
        V2 / V2s [-] in (0, 1]; give this or the efficiency, not both.
    velocity_in : float or Quantity
        Inlet velocity [m/s], not negative (0: from rest).

    Returns
    -------
    PassageResult

    References
    ----------
    Steady-flow energy equation; the nozzle efficiency and velocity coefficient as defined
    in the module notes (common practice).

    Examples
    --------
    >>> import workbench as wb
    >>> steam = wb.Fluid("Water", backend="IF97")
    >>> r = nozzle(steam.state(P=10e5, T=573.15), 1.0, P_out=5e5)
    >>> round(r.velocity_out)
    575
    """
    inlet = checks.state(inlet, "nozzle inlet")
    m = checks.positive(mass_flow, "mass_flow", "nozzle mass flow")
    P2 = checks.positive(P_out, "pressure", "nozzle outlet pressure")
    V1 = checks.not_negative(velocity_in, "velocity", "nozzle inlet velocity")
    if isentropic_efficiency is not None and velocity_coefficient is not None:
        raise SpecificationError("give the nozzle isentropic efficiency or its velocity "
                                 "coefficient, not both")
    if velocity_coefficient is not None:
        eta = checks.fraction(velocity_coefficient, "nozzle velocity coefficient") ** 2
    elif isentropic_efficiency is not None:
        eta = checks.fraction(isentropic_efficiency, "nozzle isentropic efficiency")
    else:
        eta = 1.0
    checks.below_inlet("nozzle", P2, inlet, "a nozzle accelerates the flow by lowering "
                       "pressure (use diffuser for the reverse)")
    fluid = inlet.fluid
    h01 = inlet.h + V1 ** 2 / 2
    iso = fluid.state_Ps(P2, inlet.s, T_guess=inlet.T)
    h2 = h01 - eta * (h01 - iso.h)
    outlet = fluid.state_Ph(P2, h2, T_guess=iso.T)
    V2 = math.sqrt(2.0 * max(h01 - h2, 0.0))
    return _finish("nozzle", inlet, outlet, iso, m, V1, V2, eta)


def diffuser(inlet: State, mass_flow, *, velocity_in, velocity_out=0.0,
             isentropic_efficiency=1.0) -> PassageResult:
    """Outlet pressure of a diffuser from the energy balance.

    Assumptions: steady, adiabatic, no shaft work, potential energy neglected.  The static
    enthalpy rises by the kinetic energy given up, ``h2 = h1 + (V1^2 - V2^2)/2``; the
    isentropic efficiency fixes how much of it becomes pressure:
    ``h(P2, s1) = h1 + eta (h2 - h1)``.

    Parameters
    ----------
    inlet : State
        Static inlet state.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive, for the flow areas (required).
    velocity_in : float or Quantity
        Inlet velocity [m/s], positive (keyword-only).
    velocity_out : float or Quantity
        Outlet velocity [m/s], in [0, velocity_in).
    isentropic_efficiency : float
        Diffuser efficiency (h2s - h1) / (h2 - h1) [-] in (0, 1].

    Returns
    -------
    PassageResult

    References
    ----------
    Steady-flow energy equation; the diffuser efficiency as defined in the module notes
    (common practice).

    Examples
    --------
    >>> import workbench as wb
    >>> air = wb.Fluid("Air")
    >>> r = diffuser(air.state(P=1e5, T=300.0), 1.0, velocity_in=200.0)
    >>> round(r.outlet.P / 1e5, 3)
    1.252
    """
    inlet = checks.state(inlet, "diffuser inlet")
    m = checks.positive(mass_flow, "mass_flow", "diffuser mass flow")
    V1 = checks.positive(velocity_in, "velocity", "diffuser inlet velocity")
    V2 = checks.number(velocity_out, "velocity", "diffuser outlet velocity")
    eta = checks.fraction(isentropic_efficiency, "diffuser isentropic efficiency")
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
        Mass flow [kg/s], positive.
    density : float or Quantity
        Density [kg/m^3], positive.
    area : float or Quantity
        Flow area [m^2], positive.

    Returns
    -------
    float
        Mean velocity [m/s].

    References
    ----------
    Continuity of a steady flow (common practice).

    Examples
    --------
    >>> velocity_from_area(2.0, 1000.0, 0.01)
    0.2
    """
    m = checks.positive(mass_flow, "mass_flow", "mass flow")
    rho = checks.positive(density, "density", "density")
    A = checks.positive(area, "area", "flow area")
    return m / (rho * A)


__all__ = ["PassageResult", "diffuser", "nozzle", "velocity_from_area"]
