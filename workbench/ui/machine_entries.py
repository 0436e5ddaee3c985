"""Entries of the machine panel: what each entry is, which choices use it, its limits.

The panel keeps a study's inputs (SI, :data:`workbench.study.DEFAULT_INPUTS`); these tables
say which entry shows which input, in which kind of quantity, which choices typing into an
entry selects (so the typed number is the one used), which entries the current choices
use, and the physical limit each entry is checked against in the units it was typed in
(so a message quotes the number as typed).  The result rows come from
:data:`workbench.fields.FIELDS` (:data:`RESULT_FIELDS` names them).
"""

from __future__ import annotations

import math

from .. import study
from ..errors import InputError
from .common import format_number, format_typed, quoted_unit, scale_zero

#: Significant figures of the quantity shown in an entry after a unit conversion; the
#: ambient pressure keeps one more, so the standard atmosphere shows as 1.01325 bar.
ENTRY_FIGURES = 5
ENTRY_FIGURES_OF = {"ambient-pressure": 6}

#: Number entries: hook name -> (input key, label, display kind).
ENTRIES = {
    "inlet-pressure": ("inlet_pressure_Pa", "inlet pressure", "pressure"),
    "inlet-temperature": ("inlet_temperature_K", "inlet temperature", "temperature"),
    "inlet-quality": ("inlet_quality", "inlet quality", "dimensionless"),
    "outlet-pressure": ("outlet_pressure_Pa", "outlet pressure", "pressure"),
    "outlet-temperature": ("outlet_temperature_K", "outlet temperature", "temperature"),
    "outlet-quality": ("outlet_quality", "outlet quality", "dimensionless"),
    "mass-flow": ("mass_flow_kg_per_s", "mass flow", "mass_flow"),
    "volume-flow": ("volume_flow_m3_per_s", "volume flow", "volume_flow"),
    "velocity-in": ("velocity_in_m_per_s", "inlet velocity", "velocity"),
    "velocity-out": ("velocity_out_m_per_s", "outlet velocity", "velocity"),
    "diameter-in": ("diameter_in_m", "inlet flow diameter", "length"),
    "diameter-out": ("diameter_out_m", "outlet flow diameter", "length"),
    "elevation-change": ("elevation_change_m", "elevation change", "elevation"),
    "heat-loss": ("heat_loss_W", "heat loss", "heat_flow"),
    "mechanical-efficiency": ("mechanical_efficiency", "mechanical efficiency", "percent"),
    "isentropic-efficiency": ("isentropic_efficiency", "isentropic efficiency", "percent"),
    "polytropic-efficiency": ("polytropic_efficiency", "polytropic efficiency", "percent"),
    "measured-power": ("power_W", "measured shaft power", "power"),
    "ambient-pressure": ("ambient_pressure_Pa", "ambient pressure", "absolute_pressure"),
}

#: Entries checked against a physical limit before the study is run: hook name -> limit.
#: ``"absolute"``: above the physical zero of the scale (absolute zero of temperature, zero
#: absolute pressure); ``"positive"``: above 0; ``"efficiency"``: above 0 and at most 100 %.
PHYSICAL_LIMITS = {
    "inlet-pressure": "absolute",
    "outlet-pressure": "absolute",
    "ambient-pressure": "absolute",
    "inlet-temperature": "absolute",
    "outlet-temperature": "absolute",
    "mass-flow": "positive",
    "volume-flow": "positive",
    "mechanical-efficiency": "efficiency",
    "isentropic-efficiency": "efficiency",
    "polytropic-efficiency": "efficiency",
}

#: Dropdowns: hook name -> (input key, label, options).
CHOICES = {
    "fluid-kind": ("fluid_kind", "fluid given as", study.FLUID_KINDS),
    "composition-basis": ("composition_basis", "fractions by", study.COMPOSITION_BASES),
    "machine": ("machine", "machine", study.MACHINES),
    "outlet-mode": ("outlet_fixed_by", "outlet fixed by", study.OUTLET_MODES),
    "efficiency-basis": ("efficiency_basis", "efficiency basis", study.EFFICIENCY_BASES),
    "inlet-given": ("inlet_given", "inlet state by", study.STATE_GIVEN),
    "outlet-given": ("outlet_given", "outlet state by", study.STATE_GIVEN),
    "flow-given": ("flow_given", "flow given as", study.FLOW_GIVEN),
    "velocity-given": ("velocity_given", "velocities from", study.VELOCITY_GIVEN),
}

#: Typing into one of these entries selects the choices that use it.
ENTRY_SELECTS = {
    "isentropic-efficiency": {"outlet_fixed_by": "isentropic efficiency"},
    "polytropic-efficiency": {"outlet_fixed_by": "polytropic efficiency"},
    "measured-power": {"outlet_fixed_by": "measured power"},
    "outlet-temperature": {"outlet_given": "temperature", "outlet_fixed_by": "measured outlet"},
    "outlet-quality": {"outlet_given": "quality", "outlet_fixed_by": "measured outlet"},
    "inlet-temperature": {"inlet_given": "temperature"},
    "inlet-quality": {"inlet_given": "quality"},
    "mass-flow": {"flow_given": "mass flow"},
    "velocity-in": {"velocity_given": "velocities"},
    "velocity-out": {"velocity_given": "velocities"},
    "diameter-in": {"velocity_given": "flow diameters"},
    "diameter-out": {"velocity_given": "flow diameters"},
}

#: Entries in use for each choice value: (input key, value) -> entry hook names.
USED_WHEN = {
    ("inlet_given", "temperature"): ("inlet-temperature",),
    ("inlet_given", "quality"): ("inlet-quality",),
    ("outlet_fixed_by", "isentropic efficiency"): ("isentropic-efficiency", "outlet-pressure"),
    ("outlet_fixed_by", "polytropic efficiency"): ("polytropic-efficiency", "outlet-pressure"),
    ("outlet_fixed_by", "measured power"): ("measured-power", "outlet-pressure"),
    ("outlet_fixed_by", "measured outlet"): ("outlet-pressure",),
    ("flow_given", "mass flow"): ("mass-flow",),
    ("flow_given", "inlet volume flow"): ("volume-flow",),
    ("flow_given", "standard volume flow"): ("volume-flow",),
    ("velocity_given", "velocities"): ("velocity-in", "velocity-out"),
    ("velocity_given", "flow diameters"): ("diameter-in", "diameter-out"),
}
OPTIONAL = frozenset(name for names in USED_WHEN.values() for name in names) | {
    "outlet-temperature", "outlet-quality"}

#: Result rows of the panel: field names of :data:`workbench.fields.FIELDS`, in order;
#: the efficiencies and the kinetic share are shown in percent.
RESULT_FIELDS = (
    "power", "shaft_power", "specific_work", "isentropic_efficiency", "polytropic_efficiency",
    "polytropic_efficiency_schultz", "schultz_factor", "polytropic_head", "isentropic_head",
    "pressure_ratio", "outlet_pressure", "outlet_temperature", "outlet_quality",
    "kinetic_share", "mass_flow", "inlet_volume_flow", "outlet_volume_flow", "velocity_in",
    "velocity_out")
PERCENT_FIELDS = frozenset({"isentropic_efficiency", "polytropic_efficiency",
                            "polytropic_efficiency_schultz", "kinetic_share"})


def entries_in_use(inputs: dict) -> set:
    """Hook names of the optional entries that the current choices use."""
    used = set()
    for (key, value), names in USED_WHEN.items():
        if inputs.get(key) == value:
            used.update(names)
    if inputs.get("outlet_fixed_by") == "measured outlet":
        used.add("outlet-temperature" if inputs.get("outlet_given") == "temperature"
                 else "outlet-quality")
    return used


def limit_problem(name: str, value: float, shown: float, system, ambient: float):
    """Message when entry ``name`` holding ``value`` (display units; ``shown`` is the number
    as it stands in the field) is beyond its physical limit, else None.

    The message quotes the entry's label, the number and the unit typed.
    """
    limit = PHYSICAL_LIMITS.get(name)
    if limit is None:
        return None
    _key, label, kind = ENTRIES[name]
    unit = quoted_unit(system, kind)
    quoted = f"{label[:1].upper()}{label[1:]} {format_typed(shown)} {unit}"
    if limit == "efficiency":
        if 0.0 < value <= 100.0:
            return None
        return f"{quoted} is out of range: an efficiency is above 0 % and at most 100 %"
    zero = scale_zero(system, kind, ambient) if limit == "absolute" else 0.0
    if value > zero:
        return None
    if kind == "temperature":
        return (f"{quoted} is below absolute zero: a temperature must be above "
                f"{format_number(zero)} {unit}")
    if kind == "pressure" and zero != 0.0:  # gauge scale
        abs_unit = quoted_unit(system, "absolute_pressure")
        return (f"{quoted} is below vacuum: it is {format_number(value - zero)} {abs_unit} "
                f"absolute (ambient pressure {format_number(-zero)} {abs_unit}); a gauge "
                f"pressure must be above {format_number(zero)} {unit}")
    if kind in ("pressure", "absolute_pressure"):
        return f"{quoted} is not positive: an absolute pressure must be above 0 {unit}"
    return f"{quoted} is not positive: a flow must be above 0 {unit}"


def parse_composition(text: str) -> dict:
    """Parse ``name fraction`` pairs, one a line (``:``, ``=``, ``,`` or ``;`` also separate).

    Numbers are read with ``float`` only; nothing is evaluated.

    Examples
    --------
    >>> parse_composition("Methane: 0.9\\nEthane = 0.1")
    {'Methane': 0.9, 'Ethane': 0.1}
    """
    out = {}
    for raw in str(text).replace(";", "\n").splitlines():
        line = raw.strip()
        if not line:
            continue
        for sep in (":", "=", ","):
            line = line.replace(sep, " ")
        parts = line.split()
        if len(parts) != 2:
            raise InputError(f"composition line {raw.strip()[:60]!r} is not "
                             "'component fraction'")
        name, number = parts
        try:
            value = float(number)
        except ValueError:
            raise InputError(f"fraction {number[:30]!r} of {name} is not a number") from None
        if not math.isfinite(value) or value < 0:
            raise InputError(f"fraction {number[:30]!r} of {name} must be a number >= 0")
        if name in out:
            raise InputError(f"component {name} appears twice in the composition")
        out[name] = value
    if not out:
        raise InputError("composition is empty: give one 'component fraction' a line")
    return out


def composition_text(composition: dict) -> str:
    """Text of a composition for the mixture box, one ``name fraction`` a line."""
    return "\n".join(f"{name} {value:.6g}" for name, value in composition.items())


def number_of(value, name: str) -> float:
    """A number given to the panel by code (display units): finite, not bool, not text."""
    from ..units import to_si

    return to_si(value, "dimensionless", name)
