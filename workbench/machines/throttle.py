"""Throttle valve: adiabatic, work-free expansion at constant enthalpy.

First law for one inlet and one outlet with no shaft work, no heat exchange with the
surroundings and negligible changes of kinetic and potential energy::

    h2 = h1

The temperature change across the valve is the integral Joule-Thomson effect; a liquid
(steam condensate, a refrigerant) that crosses its saturation line flashes, and the outlet
quality is reported.

References
----------
The steady-flow energy equation of a control volume (common practice).
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam (used in the tests).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..properties import State
from . import checks


@dataclass(frozen=True, eq=False)
class ThrottleResult:
    """Result of a throttle valve.  All numbers in SI units.

    Attributes
    ----------
    inlet, outlet : State
        Inlet and outlet states (equal enthalpy).
    mass_flow : float
        Mass flow [kg/s].
    pressure_drop : float
        Inlet minus outlet pressure [Pa], positive.
    temperature_change : float
        Outlet minus inlet temperature [K] (negative: cooling by the Joule-Thomson effect).
    mean_joule_thomson_coefficient : float
        (T1 - T2) / (P1 - P2) [K/Pa], the mean Joule-Thomson coefficient over the valve.
    outlet_quality : float
        Vapour quality at the outlet [-] (``outlet.quality``), NaN when not defined (the
        outlet is single-phase).
    flashes : bool
        True when the inlet is liquid (or saturated liquid) and the outlet is two-phase.
    cautions : tuple of str
        Plain-language cautions: a flashing or wet outlet, a fluid that warms on throttling.
    """

    inlet: State
    outlet: State
    mass_flow: float
    pressure_drop: float
    temperature_change: float
    mean_joule_thomson_coefficient: float
    outlet_quality: float
    flashes: bool
    cautions: tuple[str, ...] = ()

    @property
    def entropy_generation(self) -> float:
        """m (s2 - s1) [W/K], positive for a real valve."""
        return self.mass_flow * (self.outlet.s - self.inlet.s)

    def to_dict(self) -> dict:
        """Flat dict of the result numbers, SI units, keys from
        :data:`workbench.fields.FIELDS`."""
        return checks.result_dict([
            ("device", "throttle valve"), ("fluid", self.inlet.fluid.name),
            *checks.state_items("inlet", self.inlet, ("pressure", "temperature", "quality")),
            *checks.state_items("outlet", self.outlet, ("pressure", "temperature", "quality")),
            ("enthalpy", self.outlet.h), ("mass_flow", self.mass_flow),
            ("pressure_drop", self.pressure_drop),
            ("temperature_change", self.temperature_change),
            ("mean_joule_thomson_coefficient", self.mean_joule_thomson_coefficient),
            ("entropy_generation", self.entropy_generation), ("flashes", self.flashes),
        ])


def _cautions(inlet: State, outlet: State, flashes: bool) -> tuple[str, ...]:
    notes = []
    if outlet.two_phase:
        what = "the liquid flashes across the valve" if flashes else "the outlet is wet"
        notes.append(f"{what} (outlet quality {outlet.quality:.3f}): size the valve and the "
                     "downstream line for two-phase flow")
    elif outlet.T > inlet.T and not inlet.two_phase:
        notes.append(f"the fluid warms by {outlet.T - inlet.T:.3g} K across the valve: it is "
                     "above its Joule-Thomson inversion temperature")
    return tuple(notes)


def throttle(inlet: State, mass_flow, *, P_out) -> ThrottleResult:
    """Isenthalpic expansion through a throttle valve.

    Assumptions: steady flow, adiabatic (no heat lost), no shaft work, kinetic and potential
    energy changes neglected, so ``h2 = h1``.

    Parameters
    ----------
    inlet : State
        Inlet state.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive (required; the second argument of every single-inlet
        device).
    P_out : float or Quantity
        Outlet pressure [Pa], below the inlet pressure (keyword-only).

    Returns
    -------
    ThrottleResult

    Raises
    ------
    InputError
        Outlet pressure not below the inlet pressure, non-positive mass flow, a value that is
        not a number or of the wrong unit.

    References
    ----------
    The steady-flow energy equation with w = q = 0 (common practice); see the module notes.

    Examples
    --------
    >>> import workbench as wb
    >>> air = wb.Fluid("Air")
    >>> r = throttle(air.state(P=10e5, T=300.0), 2.0, P_out=1e5)
    >>> round(r.temperature_change, 1)
    -2.0
    """
    inlet = checks.state(inlet, "throttle inlet")
    m = checks.positive(mass_flow, "mass_flow", "throttle mass flow")
    P2 = checks.positive(P_out, "pressure", "throttle outlet pressure")
    checks.below_inlet("throttle", P2, inlet, "a throttle valve lowers pressure")
    outlet = inlet.fluid.state_Ph(P2, inlet.h, T_guess=inlet.T)
    dT = outlet.T - inlet.T
    liquid_in = inlet.phase == "liquid" or (inlet.two_phase and inlet.quality <= 1e-9)
    flashes = bool(liquid_in and outlet.two_phase)
    return ThrottleResult(
        inlet=inlet, outlet=outlet, mass_flow=m, pressure_drop=inlet.P - P2,
        temperature_change=dT, mean_joule_thomson_coefficient=-dT / (inlet.P - P2),
        outlet_quality=outlet.quality, flashes=flashes,
        cautions=_cautions(inlet, outlet, flashes))


__all__ = ["ThrottleResult", "throttle"]
