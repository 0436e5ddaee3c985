"""Field-test setup files: plain JSON, SI values, a format version, validated on load.

A performance engineer who reads the same logger export again and again saves the whole setup
of a field-test session (:mod:`workbench.fieldtest.session`, shown by the readings dashboard
:class:`~workbench.ui.readings_panel.ReadingsPanel`) once and loads it onto the next file.
A setup file is a JSON object::

    {"format": "turbo-workbench field-test setup", "format_version": 1,
     "units": "...", "readings_file": "booster_compressor_readings.csv",
     "machine": "compressor", "fluid": "Methane=0.89; ...", "property_model": "HEOS",
     "ambient_pressure_Pa": 101300.0, "mechanical_efficiency": 0.985,
     "columns": {"inlet_pressure": {"column": "PT-201 suction bar(g)", "unit": "bar(g)",
                                    "steady_tolerance_Pa": 19000.0}, ...},
     "steady_window_rows": 5,
     "instrument_uncertainty": {"pressure_fraction": 0.0025, "temperature_K": 0.2,
                                "flow_fraction": 0.01, "power_fraction": 0.01},
     "design_point": {"isentropic_efficiency": 0.77, "shaft_power_W": 1.7e6,
                      "inlet_volume_flow_m3_per_s": 0.65, "speed_rpm": null}}

Physical quantities are in SI units and the key names end with the unit (the ``units`` note
of the file says so); a column's ``unit`` is the unit of the readings file's column, and its
steady-state tolerance is a difference of readings in SI units.  ``readings_file`` names the
file the setup was made with and is informational only.  ``null`` marks a design value that
is not given.  Unknown keys, missing keys, wrong types, numbers out of range and mapped
columns that the current readings file does not have are refused with a
:class:`~workbench.errors.CaseFileError` that names the key; nothing is ever evaluated or
unpickled.  Numbers pass the workbench's input boundary (:mod:`workbench.units`).  The
functions here use no widgets.

References
----------
T. Bray (ed.), RFC 8259, The JavaScript Object Notation (JSON) Data Interchange Format, 2017.
B. N. Taylor, A. Thompson, NIST Special Publication 811, Guide for the Use of the
International System of Units (SI), 2008 (unit conversion factors).
"""

from __future__ import annotations

import json
import math
from contextlib import contextmanager

from .. import units
from ..errors import CaseFileError, InputError
from ..machine_case import parse_case_json, read_case_text
from .readers import READING_KINDS, convert_values, parse_unit

FORMAT_NAME = "turbo-workbench field-test setup"
FORMAT_VERSION = 1

MACHINES = ("compressor", "turbine", "pump", "fan")
PROPERTY_MODELS = ("HEOS", "IF97")

#: Units a mapped column can be read in, per kind of quantity (the panel's unit choices).
UNIT_CHOICES = {
    "pressure": ["bar(g)", "bar(a)", "kPa(g)", "kPa", "MPa", "psig", "psia", "Pa"],
    "temperature": ["degC", "K", "degF"],
    "mass_flow": ["kg/s", "kg/h", "t/h", "lb/h"],
    "volume_flow": ["m3/h", "m3/s", "Sm3/h", "ft3/min"],
    "power": ["kW", "MW", "W", "hp"],
    "speed": ["rpm"],
}

#: Key of a column's steady-state tolerance, by kind of quantity (the SI unit it is in).
TOLERANCE_KEYS = {"pressure": "steady_tolerance_Pa", "temperature": "steady_tolerance_K",
                  "mass_flow": "steady_tolerance_kg_per_s",
                  "volume_flow": "steady_tolerance_m3_per_s", "power": "steady_tolerance_W",
                  "speed": "steady_tolerance_rpm"}

#: The note on units written into every setup file.
UNITS_NOTE = (
    "SI units: ambient_pressure_Pa is an absolute pressure in Pa; steady_tolerance_* are "
    "differences of readings in the unit of their key (Pa, K, kg/s, m3/s, W; rev/min for "
    "speed); design shaft power in W, inlet volume flow in m3/s, speed in rev/min; "
    "efficiencies and *_fraction uncertainties are fractions, not percent; temperature_K is "
    "a temperature difference in K.  A column's 'unit' is the unit of that column in the "
    "readings file.  readings_file is informational only.")

#: Highest steady-state window accepted [rows].
MAX_WINDOW = 1_000_000
#: Range of the ambient (barometric) pressure accepted [Pa]: every site on land lies well
#: inside (about 31 kPa at the highest summit, from memory).
AMBIENT_RANGE = (1.0e4, 2.0e5)

_TOP_KEYS = ("format", "format_version", "units", "readings_file", "machine", "fluid",
             "property_model", "ambient_pressure_Pa", "mechanical_efficiency", "columns",
             "steady_window_rows", "instrument_uncertainty", "design_point")
_OPTIONAL_TOP = ("units", "readings_file")
UNCERTAINTY_KEYS = ("pressure_fraction", "temperature_K", "flow_fraction", "power_fraction")
DESIGN_KEYS = ("isentropic_efficiency", "shaft_power_W", "inlet_volume_flow_m3_per_s",
               "speed_rpm")


def tolerance_unit(unit: str, kind: str) -> str:
    """Unit of a difference of readings taken in ``unit`` (``bar(g)`` -> ``bar``)."""
    if kind == "pressure":
        text = parse_unit(unit, kind)[0]
    else:
        text = unit
    return (text.replace("degC", "°C").replace("degF", "°F").replace("m3", "m³")
            .replace("ft3", "ft³"))


def difference_to_si(value: float, unit: str, kind: str, name: str) -> float:
    """A difference of two readings (a tolerance) given in ``unit``, in SI units.

    Parameters
    ----------
    value : float
        The difference in the reading's unit (gauge and absolute pressures alike).
    unit, kind, name : str
        Unit text, kind of quantity and reading name, as for
        :func:`workbench.fieldtest.readers.convert_values`.

    Returns
    -------
    float
        The difference in SI units [Pa, K, kg/s, m^3/s, W; rev/min for speed].
    """
    zero, shifted = convert_values([0.0, float(value)], unit, kind, name)
    return float(shifted - zero)


def difference_from_si(value: float, unit: str, kind: str, name: str) -> float:
    """A difference in SI units as a difference in ``unit``; the inverse of
    :func:`difference_to_si`, rounded to 12 significant digits so that a number typed with
    fewer digits comes back exactly.

    Parameters
    ----------
    value : float
        The difference in SI units [Pa, K, kg/s, m^3/s, W; rev/min for speed].
    unit, kind, name : str
        As for :func:`difference_to_si`.

    Returns
    -------
    float
        The difference in ``unit``.
    """
    shown = float(value) / difference_to_si(1.0, unit, kind, name)
    return float(f"{shown:.12g}") if math.isfinite(shown) and shown != 0 else shown


# ---------------------------------------------------------------------- checks of single keys
@contextmanager
def _setup_key():
    """The input boundary's refusals, as the CaseFileError of a setup file."""
    try:
        yield
    except InputError as exc:
        raise CaseFileError(str(exc)) from None


def _shown(value) -> str:
    """Short text of a JSON value for a message (containers by their kind only)."""
    if isinstance(value, (dict, list)):
        return "a JSON " + ("object" if isinstance(value, dict) else "array")
    if isinstance(value, int) and not isinstance(value, bool) and abs(value) > 10**40:
        return "an integer of more than 40 digits"
    text = "null" if value is None else repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _number(key, value, lo=None, hi=None, lo_open=False, allow_null=False, kind="dimensionless"):
    if value is None and allow_null:
        return None
    if value is None:
        raise CaseFileError(f"setup key {key!r} must be a number, not null")
    hint = (" (use null for a value not given)" if allow_null and value == 0
            and not isinstance(value, bool) else "")
    try:
        return units.to_si(value, kind, f"setup key {key!r}", low=lo, high=hi, low_open=lo_open)
    except InputError as exc:
        raise CaseFileError(f"{exc}{hint}") from None


def _choice(key, value, options):
    with _setup_key():
        return units.choice(value, options, f"setup key {key!r}")


def _text(key, value):
    with _setup_key():
        value = units.text(value, f"setup key {key!r}")
    if not value.strip():
        raise CaseFileError(f"setup key {key!r} must be a non-empty text, not {value!r}")
    return value


def _object(key, value, keys, optional=()):
    """A JSON object with exactly ``keys`` (``optional`` ones may be left out)."""
    if not isinstance(value, dict):
        raise CaseFileError(f"setup key {key!r} must be a JSON object, not {_shown(value)}")
    prefix = f"{key}." if key else ""
    unknown = [k for k in value if k not in keys]
    if unknown:
        where = f" in {key!r}" if key else ""
        raise CaseFileError(f"unknown setup key(s){where}: "
                            + ", ".join(repr(prefix + str(k)) for k in unknown)
                            + " (allowed: " + ", ".join(keys) + ")")
    missing = [k for k in keys if k not in value and k not in optional]
    if missing:
        raise CaseFileError("missing setup key(s): "
                            + ", ".join(repr(prefix + k) for k in missing))
    return value


def _column(key, name, value, file_columns, file_name):
    kind = READING_KINDS[name][0]
    tol_key = TOLERANCE_KEYS[kind]
    _object(key, value, ("column", "unit", tol_key))
    column = _text(f"{key}.column", value["column"])
    if file_columns is not None and column not in file_columns:
        shown = f"the readings file {file_name!r}" if file_name else "the loaded readings file"
        if not file_columns:
            shown = "no readings file is loaded: it"
        raise CaseFileError(f"setup key '{key}.column': {shown} has no column {_shown(column)}")
    unit = _choice(f"{key}.unit", value["unit"], UNIT_CHOICES[kind])
    tolerance = _number(f"{key}.{tol_key}", value[tol_key], lo=0.0)
    return {"column": column, "unit": unit, tol_key: tolerance}


def validate_setup(data, file_columns=None, file_name: str = "") -> dict:
    """Check a setup (a dict as read from JSON) and return it with numbers as floats.

    Parameters
    ----------
    data : dict
        The parsed JSON object.
    file_columns : sequence of str, optional
        Headers of the readings file the setup is meant for; every mapped column must be one
        of them.  ``None`` skips that check.
    file_name : str
        Name of that readings file, for messages.

    Returns
    -------
    dict
        The setup with every key of the format present (``units`` and ``readings_file`` as
        text), numbers as floats [SI units] and ``null`` design values as ``None``.

    Raises
    ------
    CaseFileError
        Not an object, wrong format name or version, unknown or missing keys, wrong types,
        numbers out of range, a mapped column the file does not have.
    """
    if not isinstance(data, dict):
        raise CaseFileError("a setup file must hold a JSON object")
    _object("", data, _TOP_KEYS, optional=_OPTIONAL_TOP)
    if data["format"] != FORMAT_NAME:
        raise CaseFileError(f"setup key 'format' must be {FORMAT_NAME!r}, not "
                            f"{_shown(data['format'])}")
    version = data["format_version"]
    if isinstance(version, bool) or version != FORMAT_VERSION:
        raise CaseFileError(f"setup key 'format_version' = {_shown(version)} is not supported "
                            f"(this workbench reads version {FORMAT_VERSION})")
    out = {"format": FORMAT_NAME, "format_version": FORMAT_VERSION}
    for key in _OPTIONAL_TOP:
        value = data.get(key, "")
        if not isinstance(value, str):
            raise CaseFileError(f"setup key {key!r} must be text, not {_shown(value)}")
        out[key] = value
    out["machine"] = _choice("machine", data["machine"], MACHINES)
    out["fluid"] = _text("fluid", data["fluid"])
    out["property_model"] = _choice("property_model", data["property_model"], PROPERTY_MODELS)
    out["ambient_pressure_Pa"] = _number("ambient_pressure_Pa", data["ambient_pressure_Pa"],
                                         *AMBIENT_RANGE, kind="pressure")
    out["mechanical_efficiency"] = _number("mechanical_efficiency",
                                           data["mechanical_efficiency"], 0.0, 1.0,
                                           lo_open=True)
    columns = _object("columns", data["columns"], tuple(READING_KINDS), optional=READING_KINDS)
    out["columns"] = {name: _column(f"columns.{name}", name, columns[name], file_columns,
                                    file_name)
                      for name in READING_KINDS if name in columns}
    window = data["steady_window_rows"]
    if not isinstance(window, int):  # JSON 5.0 is not a count of rows
        raise CaseFileError(f"setup key 'steady_window_rows' must be a whole number of rows "
                            f"from 2 to {MAX_WINDOW}, not {_shown(window)}")
    with _setup_key():
        out["steady_window_rows"] = units.count(window, "setup key 'steady_window_rows'",
                                                low=2, high=MAX_WINDOW)
    u = _object("instrument_uncertainty", data["instrument_uncertainty"], UNCERTAINTY_KEYS)
    out["instrument_uncertainty"] = {
        key: (_number(f"instrument_uncertainty.{key}", u[key], 0.0) if key == "temperature_K"
              else _number(f"instrument_uncertainty.{key}", u[key], 0.0, 1.0))
        for key in UNCERTAINTY_KEYS}
    d = _object("design_point", data["design_point"], DESIGN_KEYS)
    out["design_point"] = {
        key: _number(f"design_point.{key}", d[key], 0.0,
                     1.0 if key == "isentropic_efficiency" else None, lo_open=True,
                     allow_null=True)
        for key in DESIGN_KEYS}
    return out


def make_setup(*, machine: str, fluid: str, property_model: str, ambient_pressure: float,
               mechanical_efficiency: float, columns: dict, steady_window: int,
               uncertainty: dict, design: dict, readings_file: str = "") -> dict:
    """A setup dict (ready for ``json.dumps``) from the panel's values in SI units.

    Parameters
    ----------
    machine, fluid, property_model : str
        Machine kind, fluid text (a name or ``"Name=fraction; ..."``), property model.
    ambient_pressure : float
        Ambient (barometric) pressure [Pa].
    mechanical_efficiency : float
        Mechanical efficiency [-].
    columns : dict
        Reading name -> (file column, unit text, steady-state tolerance [SI units of the
        kind: Pa, K, kg/s, m^3/s, W; rev/min for speed]) of every mapped reading.
    steady_window : int
        Steady-state window [rows].
    uncertainty : dict
        Keys of :data:`UNCERTAINTY_KEYS`: fractions of the reading [-] and ``temperature_K``
        [K].
    design : dict
        Keys of :data:`DESIGN_KEYS` [-, W, m^3/s, rev/min]; ``None`` where not given.
    readings_file : str
        Name of the readings file the setup was made with (informational).

    Returns
    -------
    dict
        The setup, in the layout :func:`validate_setup` reads.
    """
    mapped = {}
    for name in READING_KINDS:
        if name in columns:
            column, unit, tolerance = columns[name]
            mapped[name] = {"column": column, "unit": unit,
                            TOLERANCE_KEYS[READING_KINDS[name][0]]: float(tolerance)}
    return {
        "format": FORMAT_NAME, "format_version": FORMAT_VERSION, "units": UNITS_NOTE,
        "readings_file": readings_file, "machine": machine, "fluid": fluid,
        "property_model": property_model, "ambient_pressure_Pa": float(ambient_pressure),
        "mechanical_efficiency": float(mechanical_efficiency), "columns": mapped,
        "steady_window_rows": int(steady_window),
        "instrument_uncertainty": {k: float(uncertainty[k]) for k in UNCERTAINTY_KEYS},
        "design_point": {k: None if design.get(k) is None else float(design[k])
                         for k in DESIGN_KEYS},
    }


def read_setup(source, file_columns=None, file_name: str = "") -> dict:
    """Read and validate a setup from a dict, a JSON text or bytes, or a :class:`pathlib.Path`.

    A ``str`` is always the JSON text itself, never opened as a file name.  The text is
    parsed by the project's safe JSON reader (:func:`workbench.machine_case.parse_case_json`:
    size, nesting depth, NaN and Infinity checked).  Returns the result of
    :func:`validate_setup` (``file_columns`` and ``file_name`` are passed on).
    """
    data = source if isinstance(source, dict) else parse_case_json(
        read_case_text(source, "setup"), "setup")
    return validate_setup(data, file_columns, file_name)


def setup_json(setup: dict) -> str:
    """JSON text of a setup dict (indented, plain; NaN refused)."""
    return json.dumps(setup, indent=2, allow_nan=False, ensure_ascii=False)


__all__ = ["FORMAT_NAME", "FORMAT_VERSION", "MACHINES", "PROPERTY_MODELS", "UNIT_CHOICES",
           "TOLERANCE_KEYS", "UNITS_NOTE", "UNCERTAINTY_KEYS", "DESIGN_KEYS",
           "tolerance_unit", "difference_to_si", "difference_from_si", "validate_setup",
           "make_setup", "read_setup", "setup_json"]
