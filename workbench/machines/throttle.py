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

from ..errors import InputError
from ..properties import State
from ..units import to_si


def _check_state(name: str, state) -> State:
    if not isinstance(state, State):
        raise InputError(f"{name} must be a State from Fluid.state(...), not {type(state).__name__}")
    return state


def _positive(value, kind: str, name: str, unit: str) -> float:
    number = to_si(value, kind, name)
    if not number > 0:
        raise InputError(f"{name} {number:g} {unit} must be positive")
    return number


def _not_negative(value, kind: str, name: str, unit: str = "") -> float:
    number = to_si(value, kind, name)
    if number < 0:
        shown = f"{number:g} {unit}" if unit else f"{number:g}"
        raise InputError(f"{name} {shown} must not be negative")
    return number


def _check_below_inlet(device: str, P_out: float, inlet: State, reason: str) -> None:
    """Refuse an outlet pressure [Pa] not below the inlet's; ``reason`` ends the message."""
    if not P_out < inlet.P:
        raise InputError(
            f"{device} outlet pressure {P_out / 1e5:.6g} bar is not below the inlet pressure "
            f"{inlet.P / 1e5:.6g} bar: {reason}")


def _quality(state: State) -> float:
    return state.quality


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
        Vapour quality at the outlet [-], NaN when the outlet is single-phase.
    flashes : bool
        True when the inlet is liquid (or saturated liquid) and the outlet is two-phase.
    """

    inlet: State
    outlet: State
    mass_flow: float
    pressure_drop: float
    temperature_change: float
    mean_joule_thomson_coefficient: float
    outlet_quality: float
    flashes: bool

    def to_dict(self) -> dict:
        """Flat dict of the result numbers (SI units, keys end with their unit)."""
        return {
            "device": "throttle valve",
            "fluid": self.inlet.fluid.name,
            "inlet_pressure_Pa": self.inlet.P,
            "inlet_temperature_K": self.inlet.T,
            "inlet_quality": _quality(self.inlet),
            "outlet_pressure_Pa": self.outlet.P,
            "outlet_temperature_K": self.outlet.T,
            "outlet_quality": self.outlet_quality,
            "enthalpy_J_per_kg": self.outlet.h,
            "mass_flow_kg_per_s": self.mass_flow,
            "pressure_drop_Pa": self.pressure_drop,
            "temperature_change_K": self.temperature_change,
            "mean_joule_thomson_coefficient_K_per_Pa": self.mean_joule_thomson_coefficient,
            "entropy_generation_W_per_K": self.mass_flow * (self.outlet.s - self.inlet.s),
            "flashes": self.flashes,
        }


def throttle(inlet: State, P_out, *, mass_flow=1.0) -> ThrottleResult:
    """Isenthalpic expansion through a throttle valve.

    Assumptions: steady flow, adiabatic (no heat lost), no shaft work, kinetic and potential
    energy changes neglected, so ``h2 = h1``.

    Parameters
    ----------
    inlet : State
        Inlet state.
    P_out : float or Quantity
        Outlet pressure [Pa], below the inlet pressure.
    mass_flow : float or Quantity
        Mass flow [kg/s], positive.

    Returns
    -------
    ThrottleResult

    Raises
    ------
    InputError
        Outlet pressure not below the inlet pressure, non-positive mass flow.

    References
    ----------
    The steady-flow energy equation with w = q = 0 (common practice); see the module notes.
    """
    inlet = _check_state("throttle inlet", inlet)
    P2 = _positive(P_out, "pressure", "throttle outlet pressure", "Pa")
    m = _positive(mass_flow, "mass_flow", "throttle mass flow", "kg/s")
    _check_below_inlet("throttle", P2, inlet, "a throttle valve lowers pressure")
    outlet = inlet.fluid.state_Ph(P2, inlet.h, T_guess=inlet.T)
    dT = outlet.T - inlet.T
    liquid_in = inlet.phase == "liquid" or (inlet.two_phase and inlet.x <= 1e-9)
    return ThrottleResult(
        inlet=inlet, outlet=outlet, mass_flow=m, pressure_drop=inlet.P - P2,
        temperature_change=dT, mean_joule_thomson_coefficient=-dT / (inlet.P - P2),
        outlet_quality=_quality(outlet), flashes=bool(liquid_in and outlet.two_phase),
    )


__all__ = ["ThrottleResult", "throttle"]
