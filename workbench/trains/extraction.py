"""A steam turbine with one extraction between two sections: :func:`extraction_turbine`.

References
----------
ASME PTC 6-2004 (steam turbine sections and extraction); steady-flow energy equation for the
feed heater (common practice).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import SpecificationError
from ..machines.heat_exchanger import heat_exchanger
from ..machines.turbomachine import MachineResult
from ..properties import State
from ..units import positive
from .core import Train, TrainResult
from .steps import Extraction, Station, ThrottleValve, TurbineSection, check_state


@dataclass(frozen=True, eq=False)
class ExtractionTurbineResult:
    """Result of :func:`extraction_turbine`.  SI units.

    Attributes
    ----------
    train : TrainResult
        Valve, HP section, extraction and LP section.
    feed_heater : HeatExchangerResult or None
        The closed feed heater fed by the extraction, when feedwater was given.
    """

    train: TrainResult
    feed_heater: object = None

    @property
    def extraction(self) -> Station:
        """The extraction branch: its state and mass flow [kg/s] as it leaves the turbine."""
        return self.train.step("extraction").branch

    @property
    def high_pressure_section(self) -> MachineResult:
        """HP section result (full flow)."""
        return self.train.machines["HP section"]

    @property
    def low_pressure_section(self) -> MachineResult:
        """LP section result (flow after the extraction)."""
        return self.train.machines["LP section"]

    @property
    def total_shaft_power(self) -> float:
        """Shaft power of both sections [W] (each section's ``power`` is its fluid power)."""
        return self.train.delivered_shaft_power

    #: Same as :attr:`total_shaft_power`: the shaft power of both sections [W].
    total_power = total_shaft_power

    def to_dict(self) -> dict:
        """Train dict (:meth:`TrainResult.to_dict`) with ``total_shaft_power`` added to the
        totals; the feed heater's numbers under ``"feed_heater"``.  Keys are field names of
        :data:`workbench.fields.FIELDS`."""
        d = self.train.to_dict()
        d["totals"]["total_shaft_power"] = self.total_shaft_power
        d["feed_heater"] = None if self.feed_heater is None else self.feed_heater.to_dict()
        return d

    def stations_frame(self, headers: bool = False):
        """Station table (see :meth:`TrainResult.stations_frame`)."""
        return self.train.stations_frame(headers)

    def machines_frame(self, headers: bool = False):
        """Section table (see :meth:`TrainResult.machines_frame`)."""
        return self.train.machines_frame(headers)


def _feed_heater(bleed: Station, feedwater_inlet: State, feedwater_mass_flow: float):
    """The closed feed heater: the bleed condenses to saturated liquid at its pressure."""
    fluid = bleed.state.fluid
    drain_h = fluid.saturation_states(bleed.state.P)[0].h
    duty = bleed.mass_flow * (bleed.state.h - drain_h)
    if not duty > 0:
        raise SpecificationError("the extraction steam is not above saturated liquid: it "
                                 "cannot heat feedwater")
    heater = heat_exchanger(bleed.state, bleed.mass_flow, feedwater_inlet, feedwater_mass_flow,
                            duty=duty)
    t_sat = fluid.saturation_temperature(bleed.state.P)
    if heater.cold_outlet.T > t_sat:
        raise SpecificationError(
            f"the feedwater would leave the feed heater at {heater.cold_outlet.T:.5g} K, "
            f"above the extraction steam's saturation temperature {t_sat:.5g} K at "
            f"{bleed.state.P / 1e5:.5g} bar: raise the feedwater mass flow or lower the "
            "extraction mass flow")
    return heater


def extraction_turbine(inlet: State, mass_flow, P_out, *, extraction_pressure,
                       extraction_mass_flow, hp_isentropic_efficiency,
                       lp_isentropic_efficiency, valve_outlet_pressure=None,
                       valve_pressure_drop=None, mechanical_efficiency=1.0,
                       feedwater_inlet=None, feedwater_mass_flow=None) -> ExtractionTurbineResult:
    """A steam turbine behind a throttle valve with one extraction between two sections.

    The valve throttles the steam (isenthalpic); the HP section expands the full flow to the
    extraction pressure; the extraction takes its flow off; the LP section expands the rest
    to the exhaust pressure.  With feedwater given, the extraction steam condenses in a closed
    feed heater to saturated liquid at the extraction pressure (the drain) and the heater
    duty heats the feedwater, which may leave no hotter than the steam's saturation
    temperature (terminal temperature difference not negative).

    Parameters
    ----------
    inlet : State
        Steam state ahead of the valve.
    mass_flow : float or Quantity
        Throttle (admission) steam flow [kg/s].
    P_out : float or Quantity
        Exhaust pressure [Pa].
    extraction_pressure : float or Quantity
        Pressure at the extraction point [Pa].
    extraction_mass_flow : float or Quantity
        Extraction flow [kg/s], below the throttle flow.
    hp_isentropic_efficiency, lp_isentropic_efficiency : float
        Section isentropic efficiencies [-].
    valve_outlet_pressure, valve_pressure_drop : float or Quantity, optional
        Pressure after the valve [Pa], or the valve's pressure drop [Pa]; neither: the valve
        is wide open (no step).
    mechanical_efficiency : float
        Mechanical efficiency of each section [-].
    feedwater_inlet : State, optional
        Feedwater entering the feed heater.
    feedwater_mass_flow : float or Quantity, optional
        Feedwater flow [kg/s], with ``feedwater_inlet``.

    Returns
    -------
    ExtractionTurbineResult
        ``extraction`` is the branch (state and mass flow); ``total_shaft_power`` (also
        ``total_power``) the shaft power of both sections.

    References
    ----------
    ASME PTC 6-2004 (steam turbine sections and extraction); steady-flow energy equation for
    the feed heater (common practice).

    Examples
    --------
    >>> from workbench import Fluid
    >>> steam = Fluid("Water").state(P=60e5, T=753.15)
    >>> r = extraction_turbine(steam, 20.0, 0.1e5, extraction_pressure=5e5,
    ...                        extraction_mass_flow=3.0, hp_isentropic_efficiency=0.85,
    ...                        lp_isentropic_efficiency=0.80)
    >>> r.extraction.mass_flow, r.low_pressure_section.mass_flow
    (3.0, 17.0)
    """
    if (feedwater_inlet is None) != (feedwater_mass_flow is None):
        raise SpecificationError("give the feedwater inlet state and its mass flow together")
    if feedwater_inlet is not None:
        feedwater_inlet = check_state(feedwater_inlet, "feedwater inlet state")
        feedwater_mass_flow = positive(feedwater_mass_flow, "mass_flow", "feedwater mass flow")
    # the arguments by their own names (the steps would name them "HP section" outlet...)
    mass_flow = positive(mass_flow, "mass_flow", "throttle mass flow")
    P_out = positive(P_out, "pressure", "exhaust pressure (P_out)")
    extraction_pressure = positive(extraction_pressure, "pressure", "extraction pressure")
    extraction_mass_flow = positive(extraction_mass_flow, "mass_flow", "extraction mass flow")
    steps = []
    if valve_outlet_pressure is not None or valve_pressure_drop is not None:
        steps.append(ThrottleValve("inlet valve", P_out=valve_outlet_pressure,
                                   pressure_drop=valve_pressure_drop))
    steps += [
        TurbineSection("HP section", P_out=extraction_pressure,
                       isentropic_efficiency=hp_isentropic_efficiency,
                       mechanical_efficiency=mechanical_efficiency),
        Extraction("extraction", branch_mass_flow=extraction_mass_flow),
        TurbineSection("LP section", P_out=P_out, isentropic_efficiency=lp_isentropic_efficiency,
                       mechanical_efficiency=mechanical_efficiency),
    ]
    result = ExtractionTurbineResult(train=Train(steps).run(inlet, mass_flow))
    if feedwater_inlet is None:
        return result
    heater = _feed_heater(result.extraction, feedwater_inlet, feedwater_mass_flow)
    return ExtractionTurbineResult(train=result.train, feed_heater=heater)


__all__ = ["ExtractionTurbineResult", "extraction_turbine"]
