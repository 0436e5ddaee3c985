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

#: Every result field of the workbench, by name.
FIELDS: dict[str, ResultField] = {f.name: f for f in (
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
    _f("outlet_temperature_sensitivity", "dimensionless",
       "efficiency change per kelvin",
       "Change of the isentropic efficiency per kelvin of measured outlet temperature "
       "[1/K].", ".3g"),
    _f("mechanical_efficiency", "dimensionless", "mechanical efficiency",
       "Shaft over fluid power (turbine) or fluid over shaft power (driven machine).", _EFF),
    # devices and trains
    _f("heat_flow", "heat_flow", "heat flow", "Heat transferred."),
    _f("pressure_drop", "pressure", "pressure drop", "Static pressure loss."),
    # train totals (train panel)
    _f("total_shaft_power", "power", "total shaft power",
       "Shaft power of every stage or section of a train, a positive magnitude."),
    _f("heat_removed", "heat_flow", "heat removed by coolers",
       "Heat removed from the gas by the train's coolers."),
    _f("stage_pressure_ratios", "dimensionless", "stage pressure ratios",
       "Pressure ratio of each stage or section, higher over lower pressure.", ".4g"),
)}


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
