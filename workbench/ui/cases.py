"""Case files of the machine panel: plain JSON, SI values, validated on load.

A case file is a JSON object::

    {"format": "turbo-workbench machine case", "format_version": 1,
     "title": "...", "description": "...",
     "inputs": {"machine": "compressor", "inlet_pressure_Pa": 2.0e6, ...}}

Every number in ``inputs`` is in SI units (the key names end with the unit; fractions and
efficiencies are plain fractions, not percent).  Keys missing from ``inputs`` take the
values of :data:`DEFAULT_INPUTS`.  Unknown keys, wrong types and numbers out of range are
refused with a :class:`~workbench.errors.CaseFileError` that names the key; nothing is ever
evaluated or unpickled.

References
----------
T. Bray (ed.), RFC 8259, The JavaScript Object Notation (JSON) Data Interchange Format, 2017.
"""

from __future__ import annotations

import json
import math
from importlib import resources

from ..errors import CaseFileError
from ..jsonfile import read_json_source  # moved below ui (one JSON reader for cases and setups)
from ..units import UNIT_SYSTEMS

FORMAT_NAME = "turbo-workbench machine case"
FORMAT_VERSION = 1

MACHINES = ("compressor", "turbine", "pump", "fan")
OUTLET_MODES = ("measured outlet", "isentropic efficiency", "polytropic efficiency",
                "measured power")
STATE_GIVEN = ("temperature", "quality")
FLOW_GIVEN = ("mass flow", "inlet volume flow", "standard volume flow")
VELOCITY_GIVEN = ("velocities", "flow diameters")
SWEEP_INPUTS = ("outlet-pressure", "inlet-pressure", "inlet-temperature", "outlet-temperature",
                "mass-flow", "isentropic-efficiency", "polytropic-efficiency", "measured-power")

#: Default inputs (SI): an air fan-like compressor, used where a case leaves a key out.
DEFAULT_INPUTS = {
    "fluid_kind": "pure",
    "fluid_name": "Air",
    "composition": {"Methane": 0.9, "Ethane": 0.1},
    "composition_basis": "mole",
    "machine": "compressor",
    "outlet_fixed_by": "isentropic efficiency",
    "efficiency_basis": "static",
    "inlet_pressure_Pa": 1.0e5,
    "inlet_given": "temperature",
    "inlet_temperature_K": 293.15,
    "inlet_quality": 1.0,
    "outlet_pressure_Pa": 3.0e5,
    "outlet_given": "temperature",
    "outlet_temperature_K": 420.0,
    "outlet_quality": 1.0,
    "flow_given": "mass flow",
    "mass_flow_kg_per_s": 1.0,
    "volume_flow_m3_per_s": 1.0,
    "velocity_given": "velocities",
    "velocity_in_m_per_s": 0.0,
    "velocity_out_m_per_s": 0.0,
    "diameter_in_m": 0.3,
    "diameter_out_m": 0.3,
    "elevation_change_m": 0.0,
    "heat_loss_W": 0.0,
    "mechanical_efficiency": 1.0,
    "isentropic_efficiency": 0.8,
    "polytropic_efficiency": 0.8,
    "power_W": 1.0e5,
    "ambient_pressure_Pa": 101325.0,
    "unit_system": "bar, degC",
    "sweep_input": "outlet-pressure",
    "sweep_start": 2.0e5,
    "sweep_stop": 5.0e5,
    "sweep_points": 11,
}


def _number(lo=-math.inf, hi=math.inf, lo_open=False, hi_open=False):
    def check(key, value):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise CaseFileError(f"case key {key!r} must be a number, not {value!r}")
        value = float(value)
        if not math.isfinite(value):
            raise CaseFileError(f"case key {key!r} must be a finite number, not {value}")
        if value < lo or value > hi or (lo_open and value == lo) or (hi_open and value == hi):
            left = "(" if lo_open else "["
            right = ")" if hi_open else "]"
            raise CaseFileError(f"case key {key!r} = {value:g} is outside the allowed range "
                                f"{left}{lo:g}, {hi:g}{right}")
        return value
    return check


def _choice(options):
    def check(key, value):
        if not isinstance(value, str) or value not in options:
            raise CaseFileError(f"case key {key!r} = {value!r} is not one of: "
                                + ", ".join(repr(o) for o in options))
        return value
    return check


def _text(key, value):
    if not isinstance(value, str) or not value.strip():
        raise CaseFileError(f"case key {key!r} must be a non-empty text, not {value!r}")
    return value.strip()


def _composition(key, value):
    if not isinstance(value, dict) or not value:
        raise CaseFileError(f"case key {key!r} must be an object of component: fraction")
    out = {}
    for name, fraction in value.items():
        if not isinstance(name, str) or not name.strip():
            raise CaseFileError(f"case key {key!r} has a component name {name!r} that is not text")
        out[name.strip()] = _number(0.0, 1.0)(f"{key}.{name}", fraction)
    return out


def _points(key, value):
    if isinstance(value, bool) or not isinstance(value, int) or not 2 <= value <= 200:
        raise CaseFileError(f"case key {key!r} must be a whole number from 2 to 200, not {value!r}")
    return value


_POSITIVE = _number(0.0, lo_open=True)
_FRACTION = _number(0.0, 1.0, lo_open=True)

SCHEMA = {
    "fluid_kind": _choice(("pure", "mixture")),
    "fluid_name": _text,
    "composition": _composition,
    "composition_basis": _choice(("mole", "mass")),
    "machine": _choice(MACHINES),
    "outlet_fixed_by": _choice(OUTLET_MODES),
    "efficiency_basis": _choice(("static", "total")),
    "inlet_pressure_Pa": _POSITIVE,
    "inlet_given": _choice(STATE_GIVEN),
    "inlet_temperature_K": _POSITIVE,
    "inlet_quality": _number(0.0, 1.0),
    "outlet_pressure_Pa": _POSITIVE,
    "outlet_given": _choice(STATE_GIVEN),
    "outlet_temperature_K": _POSITIVE,
    "outlet_quality": _number(0.0, 1.0),
    "flow_given": _choice(FLOW_GIVEN),
    "mass_flow_kg_per_s": _POSITIVE,
    "volume_flow_m3_per_s": _POSITIVE,
    "velocity_given": _choice(VELOCITY_GIVEN),
    "velocity_in_m_per_s": _number(0.0),
    "velocity_out_m_per_s": _number(0.0),
    "diameter_in_m": _POSITIVE,
    "diameter_out_m": _POSITIVE,
    "elevation_change_m": _number(),
    "heat_loss_W": _number(),
    "mechanical_efficiency": _FRACTION,
    "isentropic_efficiency": _FRACTION,
    "polytropic_efficiency": _FRACTION,
    "power_W": _POSITIVE,
    "ambient_pressure_Pa": _POSITIVE,
    "unit_system": _choice(tuple(UNIT_SYSTEMS)),
    "sweep_input": _choice(SWEEP_INPUTS),
    "sweep_start": _number(),
    "sweep_stop": _number(),
    "sweep_points": _points,
}

_TOP_KEYS = {"format", "format_version", "title", "description", "inputs"}


def validate_case(data) -> dict:
    """Check a case (a dict as read from JSON) and return its full input dict (SI).

    Parameters
    ----------
    data : dict
        The parsed JSON object.

    Returns
    -------
    dict
        ``{"title": str, "description": str, "inputs": dict}`` with every key of
        :data:`DEFAULT_INPUTS` present.

    Raises
    ------
    CaseFileError
        Not an object, wrong format name or version, unknown keys, wrong types, numbers out
        of range.
    """
    if not isinstance(data, dict):
        raise CaseFileError("a case file must hold a JSON object")
    unknown = sorted(set(data) - _TOP_KEYS)
    if unknown:
        raise CaseFileError(f"unknown case file key(s): {', '.join(map(repr, unknown))}")
    if data.get("format") != FORMAT_NAME:
        raise CaseFileError(f"case file format must be {FORMAT_NAME!r}, not {data.get('format')!r}")
    version = data.get("format_version")
    if isinstance(version, bool) or version != FORMAT_VERSION:
        raise CaseFileError(f"case file format_version {version!r} is not supported "
                            f"(this workbench reads version {FORMAT_VERSION})")
    title = data.get("title", "")
    description = data.get("description", "")
    for key, value in (("title", title), ("description", description)):
        if not isinstance(value, str):
            raise CaseFileError(f"case key {key!r} must be text, not {value!r}")
    inputs = data.get("inputs", {})
    if not isinstance(inputs, dict):
        raise CaseFileError("case key 'inputs' must be an object")
    unknown = sorted(set(inputs) - set(SCHEMA))
    if unknown:
        raise CaseFileError(f"unknown input key(s) in the case: {', '.join(map(repr, unknown))}")
    checked = {k: (dict(v) if isinstance(v, dict) else v) for k, v in DEFAULT_INPUTS.items()}
    for key, value in inputs.items():
        checked[key] = SCHEMA[key](key, value)
    return {"title": title, "description": description, "inputs": checked}


def make_case(inputs: dict, title: str = "", description: str = "") -> dict:
    """A case dict (ready for ``json.dumps``) from panel inputs in SI units."""
    return {"format": FORMAT_NAME, "format_version": FORMAT_VERSION, "title": title,
            "description": description,
            "inputs": {k: (dict(v) if isinstance(v, dict) else v) for k, v in inputs.items()}}


def read_case(source) -> dict:
    """Read and validate a case from a dict, a JSON text, bytes, or a file path.

    Returns the result of :func:`validate_case`.
    """
    return validate_case(read_json_source(source, "case"))


def case_json(case: dict) -> str:
    """JSON text of a case dict (indented, plain)."""
    return json.dumps(case, indent=2, allow_nan=False)


def list_demo_cases() -> list[str]:
    """Names of the demo cases shipped in ``workbench/cases`` (without ``.json``)."""
    folder = resources.files("workbench") / "cases"
    try:
        names = [p.name for p in folder.iterdir()]
    except (FileNotFoundError, NotADirectoryError):
        return []
    return sorted(n[:-5] for n in names if n.endswith(".json"))


def load_demo_case(name: str) -> dict:
    """Read and validate a demo case by name (see :func:`list_demo_cases`)."""
    if name not in list_demo_cases():
        raise CaseFileError(f"unknown demo case {name!r}: choose one of "
                            + ", ".join(list_demo_cases()))
    text = (resources.files("workbench") / "cases" / f"{name}.json").read_text(encoding="utf-8")
    return read_case(text)
