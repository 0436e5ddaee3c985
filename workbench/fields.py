"""The one table of result fields: name, kind of quantity, SI unit, label, description, format.

Every place that lists results reads this table: result objects' ``to_dict``, the batch's
result columns, the panels' result rows, train tables and CSV headers.  A field is described
once here; adding a result means adding one row.

Examples
--------
>>> FIELDS["shaft_power"].unit
'W'
>>> FIELDS["shaft_power"].header()
'shaft power [W]'
>>> FIELDS["isentropic_efficiency"].format(0.82345)
'0.8235'
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .units import SI_UNITS


@dataclass(frozen=True)
class ResultField:
    """One result quantity.

    Attributes
    ----------
    name : str
        Attribute name on a result object and column name in tables (no unit in it).
    kind : str
        Kind of quantity, a key of :data:`workbench.units.SI_UNITS`.
    label : str
        Short label for tables and panels ("shaft power").
    description : str
        One sentence for tooltips, docstrings and report glossaries.
    fmt : str
        Format spec of the SI value for display: ``".4f"`` for efficiencies, ``".5g"`` for
        most quantities.
    """

    name: str
    kind: str
    label: str
    description: str
    fmt: str = ".5g"

    @property
    def unit(self) -> str:
        """SI unit text ("" for dimensionless)."""
        return SI_UNITS[self.kind]

    def header(self, unit: str | None = None) -> str:
        """Column header with its unit, e.g. ``"shaft power [W]"``."""
        unit = self.unit if unit is None else unit
        return f"{self.label} [{unit}]" if unit else f"{self.label} [-]"

    def format(self, value) -> str:
        """The SI value formatted for a table; an en dash for NaN or None."""
        if value is None or (isinstance(value, float) and math.isnan(value)):
            return "\u2013"
        return format(value, self.fmt)


def _f(name, kind, label, description, fmt=".5g"):
    return ResultField(name, kind, label, description, fmt)


_EFF = ".4f"


def _table(rows) -> dict:
    """The rows by name; a name used twice is a mistake in this module (ValueError)."""
    table = {}
    for f in rows:
        if f.name in table:
            raise ValueError(f"result field {f.name!r} is described twice in FIELDS")
        table[f.name] = f
    return table


#: Every result field of the workbench, by name.
FIELDS: dict[str, ResultField] = _table((
    # states
    _f("inlet_pressure", "pressure", "inlet pressure", "Static pressure at the inlet."),
    _f("inlet_temperature", "temperature", "inlet temperature",
       "Static temperature at the inlet."),
    _f("inlet_quality", "dimensionless", "inlet quality",
       "Vapour mass fraction at the inlet; empty when single-phase.", _EFF),
    _f("outlet_pressure", "pressure", "outlet pressure", "Static pressure at the outlet."),
    _f("outlet_temperature", "temperature", "outlet temperature",
       "Static temperature at the outlet."),
    _f("outlet_quality", "dimensionless", "outlet quality",
       "Vapour mass fraction at the outlet; empty when single-phase.", _EFF),
    _f("isentropic_outlet_temperature", "temperature", "isentropic outlet temperature",
       "Temperature at the outlet pressure and the inlet entropy."),
    _f("pressure", "pressure", "pressure", "Static pressure."),
    _f("temperature", "temperature", "temperature", "Static temperature."),
    _f("enthalpy", "specific_enthalpy", "enthalpy", "Specific enthalpy."),
    _f("entropy", "specific_entropy", "entropy", "Specific entropy."),
    _f("density", "density", "density", "Mass density."),
    _f("quality", "dimensionless", "quality",
       "Vapour mass fraction; empty when single-phase.", _EFF),
    # flows and energy balance
    _f("mass_flow", "mass_flow", "mass flow", "Mass flow through the machine or device."),
    _f("inlet_volume_flow", "volume_flow", "inlet volume flow",
       "Actual volume flow at inlet conditions."),
    _f("outlet_volume_flow", "volume_flow", "outlet volume flow",
       "Actual volume flow at outlet conditions."),
    _f("velocity_in", "velocity", "inlet velocity", "Flow velocity at the inlet."),
    _f("velocity_out", "velocity", "outlet velocity", "Flow velocity at the outlet."),
    _f("power", "power", "fluid power",
       "Power exchanged with the fluid, a positive magnitude."),
    _f("shaft_power", "power", "shaft power",
       "Power at the coupling after mechanical losses, a positive magnitude."),
    _f("specific_work", "specific_enthalpy", "specific work",
       "Fluid work per unit mass, a positive magnitude."),
    _f("enthalpy_change", "specific_enthalpy", "enthalpy change", "h2 - h1."),
    _f("kinetic_energy_change", "specific_enthalpy", "kinetic energy change",
       "(V2^2 - V1^2)/2."),
    _f("potential_energy_change", "specific_enthalpy", "potential energy change",
       "g (z2 - z1)."),
    _f("heat_loss", "power", "heat loss", "Heat lost to the surroundings (positive out)."),
    _f("kinetic_share", "dimensionless", "kinetic share",
       "Share of the specific work that goes into kinetic energy.", _EFF),
    _f("pressure_ratio", "dimensionless", "pressure ratio",
       "Higher over lower static pressure (outlet over inlet for a compressor, inlet over "
       "outlet for a turbine)."),
    # efficiencies and heads
    _f("isentropic_efficiency", "dimensionless", "isentropic efficiency",
       "Isentropic efficiency on the chosen basis (static or total).", _EFF),
    _f("isentropic_efficiency_static", "dimensionless", "isentropic efficiency (static)",
       "Static-to-static isentropic efficiency.", _EFF),
    _f("isentropic_efficiency_total", "dimensionless", "isentropic efficiency (total)",
       "Total-to-total isentropic efficiency.", _EFF),
    _f("isentropic_efficiency_total_to_static", "dimensionless",
       "isentropic efficiency (total-to-static)",
       "Total-to-static isentropic efficiency of a turbine.", _EFF),
    _f("isentropic_head", "specific_enthalpy", "isentropic head",
       "|h2s - h1| on the chosen basis."),
    _f("polytropic_efficiency", "dimensionless", "polytropic efficiency",
       "Polytropic efficiency by direct integration of the polytropic path.", _EFF),
    _f("polytropic_head", "specific_enthalpy", "polytropic head",
       "Polytropic head by direct integration of the polytropic path."),
    _f("polytropic_efficiency_schultz", "dimensionless", "polytropic efficiency (Schultz)",
       "Polytropic efficiency by Schultz's method (ASME PTC 10).", _EFF),
    _f("polytropic_head_schultz", "specific_enthalpy", "polytropic head (Schultz)",
       "Polytropic head by Schultz's method (ASME PTC 10)."),
    _f("schultz_factor", "dimensionless", "Schultz factor",
       "Schultz's polytropic head factor f."),
    _f("polytropic_exponent", "dimensionless", "polytropic exponent",
       "Volume exponent n of the polytropic path."),
    _f("isentropic_exponent", "dimensionless", "isentropic exponent",
       "Volume exponent of the isentropic path."),
    _f("pump_head", "length", "pump head", "Isentropic head over standard gravity."),
    _f("outlet_temperature_sensitivity", "per_kelvin",
       "efficiency change per kelvin",
       "Change of the isentropic efficiency per kelvin of measured outlet temperature.",
       ".3g"),
    _f("mechanical_efficiency", "dimensionless", "mechanical efficiency",
       "Shaft over fluid power (turbine) or fluid over shaft power (driven machine).", _EFF),
    # devices and trains
    _f("heat_flow", "heat_flow", "heat flow", "Heat transferred."),
    _f("pressure_drop", "pressure", "pressure drop", "Static pressure loss."),
    # machine states and balance terms (appended for MachineResult.to_dict)
    _f("inlet_enthalpy", "specific_enthalpy", "inlet enthalpy",
       "Static specific enthalpy at the inlet."),
    _f("inlet_entropy", "specific_entropy", "inlet entropy", "Specific entropy at the inlet."),
    _f("inlet_density", "density", "inlet density", "Density at the inlet."),
    _f("outlet_enthalpy", "specific_enthalpy", "outlet enthalpy",
       "Static specific enthalpy at the outlet."),
    _f("outlet_entropy", "specific_entropy", "outlet entropy",
       "Specific entropy at the outlet."),
    _f("outlet_density", "density", "outlet density", "Density at the outlet."),
    _f("isentropic_outlet_enthalpy", "specific_enthalpy", "isentropic outlet enthalpy",
       "Specific enthalpy at the outlet pressure and the inlet entropy."),
    _f("isentropic_outlet_density", "density", "isentropic outlet density",
       "Density at the outlet pressure and the inlet entropy."),
    _f("isentropic_outlet_quality", "dimensionless", "isentropic outlet quality",
       "Vapour mass fraction at the outlet pressure and the inlet entropy; empty when "
       "single-phase.", _EFF),
    _f("elevation_change", "length", "elevation change",
       "Outlet elevation above the inlet."),
    _f("specific_heat_loss", "specific_enthalpy", "specific heat loss",
       "Heat lost to the surroundings per unit mass (positive out)."),
    # devices (appended): throttle, nozzle, diffuser, mixer, splitter, heat exchanger, pipe
    _f("temperature_change", "temperature_difference", "temperature change",
       "Outlet minus inlet temperature."),
    _f("mean_joule_thomson_coefficient", "joule_thomson_coefficient", "mean Joule-Thomson coefficient",
       "(T1 - T2) / (P1 - P2) over a throttle valve.", ".4g"),
    _f("entropy_generation", "entropy_flow", "entropy generation",
       "Entropy generated in the device, not negative for a real process.", ".5g"),
    _f("flashes", "dimensionless", "flashes",
       "True when a liquid inlet leaves two-phase (flashing across a valve).", ""),
    _f("velocity_coefficient", "dimensionless", "velocity coefficient",
       "Actual over isentropic outlet velocity of a nozzle, sqrt of its efficiency.", _EFF),
    _f("stagnation_enthalpy", "specific_enthalpy", "stagnation enthalpy",
       "h + V^2/2, conserved through an adiabatic passage without work."),
    _f("inlet_area", "area", "inlet flow area",
       "Flow area at the inlet from continuity, m / (rho V); empty at zero velocity."),
    _f("outlet_area", "area", "outlet flow area",
       "Flow area at the outlet from continuity, m / (rho V); empty at zero velocity."),
    _f("area_ratio", "dimensionless", "area ratio",
       "Outlet over inlet flow area; empty when a velocity is zero."),
    _f("outlet_mach_number", "dimensionless", "outlet Mach number",
       "Outlet velocity over the outlet speed of sound; empty when two-phase."),
    _f("split_fraction", "dimensionless", "split fraction",
       "Branch flow over the inlet flow of a splitter.", _EFF),
    _f("duty", "heat_flow", "duty", "Heat gained by the cold stream (removed by a cooler)."),
    _f("heat_released", "heat_flow", "heat released", "Heat given up by the hot stream."),
    _f("heat_absorbed", "heat_flow", "heat absorbed", "Heat taken up by the cold stream."),
    _f("hot_end_difference", "temperature_difference", "hot end difference",
       "Hot inlet minus cold outlet temperature (counterflow)."),
    _f("cold_end_difference", "temperature_difference", "cold end difference",
       "Hot outlet minus cold inlet temperature (counterflow)."),
    _f("log_mean_temperature_difference", "temperature_difference", "LMTD",
       "Counterflow log-mean temperature difference."),
    _f("conductance", "thermal_conductance", "conductance UA",
       "Overall conductance, duty over LMTD (counterflow)."),
    _f("volume_flow", "volume_flow", "volume flow", "Actual volume flow."),
    _f("reynolds_number", "dimensionless", "Reynolds number",
       "rho V D / mu on the inlet diameter; empty when a friction factor was given."),
    _f("friction_factor", "dimensionless", "friction factor", "Darcy friction factor.", ".4g"),
    _f("friction_loss", "specific_energy", "friction loss",
       "Mechanical energy dissipated by friction and fittings per unit mass."),
    _f("head_loss", "length", "head loss", "Friction loss over standard gravity."),
    _f("pump_power", "power", "pump power", "Power added to the liquid by a pump."),
    _f("vapour_pressure", "pressure", "vapour pressure",
       "Saturation pressure of the liquid at its temperature; empty where not defined "
       "(above the critical temperature, mixtures)."),
    _f("velocity", "velocity", "velocity", "Mean flow velocity."),
    _f("velocity_head", "length", "velocity head", "V^2 / (2 g)."),
    _f("npsh_available", "length", "NPSH available",
       "Net positive suction head available, (P - Pv)/(rho g) + V^2/(2 g)."),
    # train totals (train panel)
    _f("total_shaft_power", "power", "total shaft power",
       "Shaft power of every stage or section of a train, a positive magnitude."),
    _f("heat_removed", "heat_flow", "heat removed by coolers",
       "Heat removed from the gas by the train's coolers."),
    _f("stage_pressure_ratios", "dimensionless", "stage pressure ratios",
       "Pressure ratio of each stage or section, higher over lower pressure.", ".4g"),
    # curves, acceptance and similarity (workbench/curves)
    _f("speed", "rotational_speed", "speed", "Rotational speed of the machine."),
    _f("total_head", "length", "pump total head",
       "Pump total head: rise of total energy per unit weight of liquid."),
    _f("system_head", "length", "system head",
       "Head the piping system needs at the flow: static head plus friction and minor losses."),
    _f("static_head", "length", "static head",
       "Head the system needs at zero flow: elevation plus pressure difference over rho g."),
    _f("efficiency", "dimensionless", "efficiency",
       "Machine efficiency read on the curve (the efficiency the datasheet gives).", _EFF),
    _f("throttle_coefficient", "dimensionless", "added throttle loss coefficient",
       "Loss coefficient of a throttling valve added to the system, on its velocity head."),
    _f("surge_margin", "dimensionless", "surge margin",
       "(Q - Q_limit) / Q at the same speed: distance from the surge or minimum-flow limit.",
       _EFF),
    _f("npsh_required", "length", "NPSH required",
       "Net positive suction head the pump requires (datasheet curve)."),
    _f("npsh_margin", "length", "NPSH margin", "NPSH available minus NPSH required."),
    _f("flow_deviation", "dimensionless", "flow deviation",
       "Relative departure of the test curve's flow at the guarantee head from the guarantee "
       "flow.", _EFF),
    _f("head_deviation", "dimensionless", "head deviation",
       "Relative departure of the test curve's head at the guarantee flow from the guarantee "
       "head.", _EFF),
    _f("flow_head_margin", "dimensionless", "flow and head margin",
       "Signed margin of the test curve to the nearer limit of the tolerance cross, over the "
       "guaranteed value (positive passes).", _EFF),
    _f("efficiency_margin", "dimensionless", "efficiency margin",
       "Test efficiency minus the lowest acceptable efficiency, over the guaranteed "
       "efficiency (positive passes).", _EFF),
    _f("power_margin", "dimensionless", "power margin",
       "Highest acceptable power minus the test power, over the guaranteed power (positive "
       "passes).", _EFF),
    _f("pressure_rise", "pressure", "pressure rise",
       "Static-to-static or total pressure rise the machine gives, rho g H for a liquid."),
    _f("fan_pressure", "pressure", "fan pressure",
       "Outlet minus inlet stagnation pressure of a fan (ISO 5801)."),
    _f("fan_static_pressure", "pressure", "fan static pressure",
       "Outlet static minus inlet stagnation pressure of a fan (ISO 5801)."),
    _f("fan_dynamic_pressure", "pressure", "fan dynamic pressure",
       "Dynamic pressure at the fan outlet (ISO 5801)."),
    _f("compressibility_coefficient", "dimensionless", "compressibility coefficient",
       "k_p: fan air work per unit mass over (fan pressure x inlet specific volume).", ".5f"),
    _f("static_compressibility_coefficient", "dimensionless",
       "static compressibility coefficient", "k_ps: as k_p on the fan static pressure.",
       ".5f"),
    _f("fan_air_power", "power", "fan air power",
       "Inlet volume flow x fan pressure x compressibility coefficient (ISO 5801)."),
    _f("fan_static_air_power", "power", "fan static air power",
       "Inlet volume flow x fan static pressure x static compressibility coefficient."),
    _f("fan_efficiency", "dimensionless", "fan efficiency",
       "Fan air power over the power input given.", _EFF),
    _f("fan_static_efficiency", "dimensionless", "fan static efficiency",
       "Fan static air power over the power input given.", _EFF),
    _f("tip_speed", "velocity", "impeller tip speed", "Peripheral speed at the impeller tip."),
    _f("flow_coefficient", "dimensionless", "flow coefficient",
       "Inlet volume flow over (rotational speed x tip radius cubed) (ASME PTC 10).", ".5f"),
    _f("work_coefficient", "dimensionless", "polytropic work coefficient",
       "Polytropic head over the tip speed squared (ASME PTC 10).", ".5f"),
    _f("machine_mach_number", "dimensionless", "machine Mach number",
       "Impeller tip speed over the speed of sound at the inlet (ASME PTC 10).", ".4f"),
    _f("machine_reynolds_number", "dimensionless", "machine Reynolds number",
       "Tip speed x impeller exit width over the inlet kinematic viscosity (ASME PTC 10).",
       ".4g"),
    _f("specific_volume_ratio", "dimensionless", "specific volume ratio",
       "Inlet over discharge specific volume (ASME PTC 10).", ".5f"),
    # train totals (TrainResult.totals, the parametrised trains' to_dict)
    _f("absorbed_shaft_power", "power", "absorbed shaft power",
       "Shaft power taken by a train's compressors and pumps, a positive magnitude."),
    _f("delivered_shaft_power", "power", "delivered shaft power",
       "Shaft power given by a train's turbine sections, a positive magnitude."),
    _f("net_shaft_power", "power", "net shaft power",
       "Delivered minus absorbed shaft power of a train (negative for a driven train)."),
    _f("cooling_water_mass_flow", "mass_flow", "cooling water flow",
       "Cooling water a cooler needs between its water inlet and outlet temperatures; "
       "empty when they were not given."),
    _f("inlet_mass_flow", "mass_flow", "inlet mass flow", "Main-line flow at the train inlet."),
    _f("outlet_mass_flow", "mass_flow", "outlet mass flow",
       "Main-line flow at the train outlet."),
    _f("extracted_mass_flow", "mass_flow", "extracted mass flow",
       "Total flow of the branches leaving a train."),
    _f("admitted_mass_flow", "mass_flow", "admitted mass flow",
       "Total flow of the branches joining a train."),
    _f("stage_shaft_powers", "power", "stage shaft powers",
       "Shaft power of each stage or section of a train, positive magnitudes."),
))


def field(name: str) -> ResultField:
    """The field of that name (a KeyError names the unknown field)."""
    try:
        return FIELDS[name]
    except KeyError:
        raise KeyError(f"no result field {name!r} in workbench.fields.FIELDS") from None


def row(obj, names) -> dict:
    """``{name: getattr(obj, name)}`` for the named fields (SI values), in order."""
    return {name: getattr(obj, field(name).name) for name in names}


def headers(names) -> list[str]:
    """CSV/table headers with SI units, in order."""
    return [field(name).header() for name in names]


__all__ = ["FIELDS", "ResultField", "field", "headers", "row"]
