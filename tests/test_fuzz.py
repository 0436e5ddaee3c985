"""Suite-wide fuzz test: every public entry point, the readings reader and the JSON loaders.

Hypothesis (fixed seed per entry point, no database, no shrinking) drives each entry point
from a valid baseline call with one argument replaced by a drawn value:

* ``good`` values: numbers in the argument's range as float, int, Decimal, numpy scalars and
  pint Quantities of the right dimension (in SI and in another unit);
* ``physical`` values: zero, negative, large and random floats, which may be refused;
* ``boundary`` values: bool, text, None (where a number is needed), NaN, inf, -inf, 1e300,
  10**400, 1e-300, lists and arrays where a scalar belongs, Quantities of the wrong
  dimension, unknown option strings.  These must be refused.

Every call must either return finite results (result dataclasses, dicts and frames are
walked; NaN only in the fields documented "NaN when not defined", :data:`NAN_WHEN_UNDEFINED`)
or raise a :class:`workbench.WorkbenchError`.  A refused boundary value must be named in the
message (the argument's name or label).  A raw exception, a NaN/inf result or a silently
accepted boundary value is a failure.  Batches (``evaluate``, ``read_readings``) must
return every row, in order.

Every entry point must pass (there is no list of expected failures).  Every
name of ``workbench.__all__`` must have a row in :data:`ENTRIES` or a reason in
:data:`NOT_ENTRY_POINTS`, so a new public name without fuzz coverage fails
:func:`test_every_public_name_is_covered`.  The calls are counted; the suite makes at least
10,000 (:func:`test_zz_total_number_of_calls`).

The test is not about physics (the other test files check against outside references); it
checks the project's rule that nothing raw, non-finite or silent reaches a user (DESIGN.md).
"""

from __future__ import annotations

import csv
import functools
import importlib
import io
import json
import math
import os
import pathlib
import pkgutil
import re
import zlib
from dataclasses import dataclass, fields, is_dataclass
from decimal import Decimal

import numpy as np
import pandas as pd
import pint
import pytest
from hypothesis import HealthCheck, Phase, given, seed, settings
from hypothesis import strategies as st

import workbench as wb
from workbench.units import SI_UNITS

Q_ = wb.Q_

# ----------------------------------------------------------------------------- fixtures
AIR = wb.Fluid("Air")
STEAM = wb.Fluid("Water", backend="IF97")
WATER = wb.Fluid("Water")
ARGON = wb.Fluid("Argon")

AIR_IN = AIR.state(P=1e5, T=300.0)
AIR_HOT = AIR.state(P=3e5, T=420.0)
AIR_OUT = AIR.state(P=3e5, T=430.0)
STEAM_IN = STEAM.state(P=42e5, T=673.15)
WET = STEAM.state(P=10e5, x=0.5)
WATER_IN = WATER.state(P=3e5, T=293.15)
WATER_HOT = WATER.state(P=5e5, T=363.15)
WATER_COLD = WATER.state(P=4e5, T=293.15)
STATES = [AIR_IN, AIR_HOT, STEAM_IN, WET, WATER_IN, WATER_HOT, ARGON.state(P=1e5, T=300.0)]

#: Result fields documented as "NaN when not defined" (quality of a single-phase state, a
#: total-to-static efficiency of a machine that is no turbine, a sensitivity of a rating
#: not from a measured outlet, flow areas at zero velocity, a Mach number of a wet outlet,
#: a Reynolds number with a given friction factor, a vapour pressure above the critical
#: temperature, a cooling water flow without water temperatures, cp inside the dome, a
#: polytropic exponent or Schultz value with a two-phase end).
NAN_WHEN_UNDEFINED = {
    "x", "quality", "cp", "isentropic_efficiency_total_to_static",
    "outlet_temperature_sensitivity", "inlet_area", "outlet_area", "area_ratio",
    "outlet_mach_number", "reynolds_number", "vapour_pressure", "cooling_water_mass_flow",
    "speed_ratio",
}

#: Names of workbench.__all__ that are not entry points to fuzz, and why.
NOT_ENTRY_POINTS = {
    "CaseFileError": "exception class", "InputError": "exception class",
    "PropertyError": "exception class", "ReadingsError": "exception class",
    "SpecificationError": "exception class", "WorkbenchError": "exception class",
    "Q_": "pint's Quantity constructor (third-party); Quantities are fuzzed as inputs",
    "ureg": "pint unit registry (third-party)",
    "UNIT_SYSTEMS": "a constant dict of display unit systems",
    "SAFETY_CAUTION": "a constant text",
    "fieldtest": "a subpackage; its public functions are fuzzed by name",
    "State": "a result type, built by Fluid.state (fuzzed)",
    "StateArray": "a result type, built by Fluid.states_PT (fuzzed)",
    "MachineResult": "a result type, built by the machines (fuzzed)",
    "TrainResult": "a result type, built by Train.run (fuzzed)",
}
#: Public names of the curves package, fuzzed by tests/curves/test_curves_fuzz.py (checked
#: below: each name must be called there).
CURVES_FUZZ = pathlib.Path(__file__).parent / "curves" / "test_curves_fuzz.py"
for _name in ("PerformanceCurve", "SystemCurve", "operating_point", "pump_acceptance",
              "compressor_similarity", "CompressorCondition", "PipeSection", "fan_test",
              "compressibility_coefficient"):
    NOT_ENTRY_POINTS[_name] = f"fuzzed in {CURVES_FUZZ.relative_to(CURVES_FUZZ.parents[2])}"

COUNTS: dict[str, int] = {}


# ------------------------------------------------------------------ value strategies
@dataclass
class Arg:
    """One argument: its labels (words a message about it must contain, any one) and a
    strategy of ``(tag, value)`` pairs."""

    labels: tuple
    values: st.SearchStrategy
    base: object


#: Values that the input boundary must refuse wherever a number belongs.
NOT_A_NUMBER = [True, False, np.bool_(True), "1.0", "abc", "", math.nan, math.inf, -math.inf,
                np.float64("nan"), Decimal("NaN"), Decimal("Infinity"), 10 ** 400,
                -(10 ** 400), 1e300, -1e300, 1e-300, [1.0], (1.0, 2.0),
                np.array([1.0, 2.0]), {}, {"value": 1.0}, object(), b"1"]

_OTHER_UNIT = {"pressure": "bar", "temperature": "degC", "mass_flow": "kg/h",
               "volume_flow": "m**3/h", "power": "kW", "heat_flow": "kW", "velocity": "km/h",
               "length": "mm", "dimensionless": "percent", "specific_energy": "kJ/kg",
               "specific_enthalpy": "kJ/kg", "temperature_difference": "delta_degC",
               "area": "cm**2", "density": "g/cm**3", "dynamic_viscosity": "mPa*s"}


def _wrong_unit(kind):
    return "m" if kind in ("pressure", "dimensionless", "power") else "bar"


_MID = object()  # default baseline: the middle of the range


def num(labels, kind, lo, hi, *, optional=False, base=_MID, sequence_ok=False, big=1e6):
    """A number of ``kind`` whose useful range is [lo, hi] (SI)."""
    unit = SI_UNITS[kind] or "dimensionless"
    inside = st.floats(lo, hi, allow_nan=False, allow_infinity=False)
    good = st.one_of(
        inside,
        inside.map(lambda x: Decimal(repr(x))),
        inside.map(np.float64),
        inside.map(lambda x: np.float32(x) if lo <= float(np.float32(x)) <= hi else x),
        inside.map(lambda x: Q_(x, unit)),
        inside.map(lambda x: Q_(x, unit).to(_OTHER_UNIT.get(kind, unit))),
    )
    if math.ceil(lo) <= math.floor(hi):
        good = good | st.integers(math.ceil(lo), math.floor(hi)) | st.integers(
            math.ceil(lo), math.floor(hi)).map(np.int64)
    if optional:
        good = good | st.none()
    physical = st.one_of(st.sampled_from([0, 0.0, -0.0, -1.0, -1e5, 1e-9, big, -big, 1e11]),
                         st.floats(-1e12, 1e12, allow_nan=False, allow_infinity=False))
    bad = [v for v in NOT_A_NUMBER if not (sequence_ok and isinstance(v, (list, tuple,
                                                                         np.ndarray)))]
    bad = bad + [Q_(1.0, _wrong_unit(kind))] + ([] if optional else [None])
    values = st.one_of(good.map(lambda v: ("good", v)), physical.map(lambda v: ("physical", v)),
                       st.sampled_from(bad).map(lambda v: ("boundary", v)))
    return Arg(tuple(labels), values, (lo + hi) / 2 if base is _MID else base)


def option(labels, options, base, *, optional=False):
    bad = ["bogus", "", " " + options[0], options[0].upper() + "x", 1, 1.5, True, ["x"]]
    if not optional:
        bad.append(None)
    good = st.sampled_from(list(options) + ([None] if optional else []))
    return Arg(tuple(labels), st.one_of(good.map(lambda v: ("good", v)),
                                        st.sampled_from(bad).map(lambda v: ("boundary", v))),
               base)


def state_arg(labels, states, base):
    bad = ["Air", None, 1.0, AIR, [base], {"P": 1e5}]
    return Arg(tuple(labels), st.one_of(st.sampled_from(states).map(lambda v: ("good", v)),
                                        st.sampled_from(bad).map(lambda v: ("boundary", v))),
               base)


def text_arg(labels, base):
    bad = [None, 1, 1.0, True, ["x"], "x" * 100_000, "a\x00b"]
    good = st.text(min_size=1, max_size=20).filter(lambda s: s.isprintable())
    return Arg(tuple(labels), st.one_of(good.map(lambda v: ("good", v)),
                                        st.sampled_from(bad).map(lambda v: ("boundary", v))),
               base)


def flag_arg(labels, base):
    return Arg(tuple(labels), st.one_of(
        st.sampled_from([True, False, np.bool_(False)]).map(lambda v: ("good", v)),
        st.sampled_from([1, 0, "yes", None, 1.0, "True"]).map(lambda v: ("boundary", v))),
        base)


def anything(labels, good, base):
    """An argument with a list of good values and the generic hostile values."""
    bad = [None, 1.0, "bogus", True, [], {}, object()]
    return Arg(tuple(labels), st.one_of(st.sampled_from(good).map(lambda v: ("good", v)),
                                        st.sampled_from(bad).map(lambda v: ("boundary", v))),
               base)


# ---------------------------------------------------------------------- result walk
def _nan_allowed(key):
    """A field documented "NaN when not defined" (also with a unit suffix, ``_kg_per_s``)."""
    if key.endswith("_max_deviation"):  # steady_state_flags: NaN before the first window
        return True
    return "quality" in key or key in NAN_WHEN_UNDEFINED or any(
        key.startswith(name + "_") for name in NAN_WHEN_UNDEFINED if len(name) > 2)


def _finite_problem(value, path):
    """Text of a problem with a number at ``path`` (None when fine)."""
    key = path.rsplit(".", 1)[-1].split("[")[0]
    if _nan_allowed(key):
        return None if not math.isinf(value) else f"{path} is {value}"
    return None if math.isfinite(value) else f"{path} is {value}"


#: Fields of a machine result checked on every result; the lazily integrated polytropic
#: values (about 0.2 s each) are checked through ``to_dict`` on every 10th result.
_MACHINE_FIELDS = ("inlet", "outlet", "isentropic_outlet", "mass_flow", "power", "shaft_power",
                   "specific_work", "isentropic_efficiency", "pressure_ratio",
                   "outlet_temperature_sensitivity", "cautions")
_MACHINE_RESULTS = [0]


def walk(obj, path="result", depth=0):
    """Problems (texts) found in a result: non-finite numbers where they should be finite."""
    if depth > 6 or obj is None or isinstance(obj, (str, bytes, bool, np.bool_)):
        return []
    if isinstance(obj, (int, np.integer)):
        return []
    if isinstance(obj, (float, np.floating)):
        problem = _finite_problem(float(obj), path)
        return [problem] if problem else []
    if isinstance(obj, wb.State):
        return [p for name in ("P", "T", "h", "s", "rho")
                for p in walk(getattr(obj, name), f"{path}.{name}", depth + 1)]
    if isinstance(obj, pd.DataFrame):
        return _walk_frame(obj, path)
    if isinstance(obj, pd.Series):
        return walk(obj.to_dict(), path, depth + 1)
    if isinstance(obj, np.ndarray):
        if obj.dtype.kind == "f":
            bad = ~np.isfinite(obj)
            key = path.rsplit(".", 1)[-1]
            if _nan_allowed(key):
                bad = np.isinf(obj)
            return [f"{path} has non-finite entries"] if bad.any() else []
        return []
    if isinstance(obj, dict):
        return [p for k, v in obj.items() for p in walk(v, f"{path}.{k}", depth + 1)]
    if isinstance(obj, (list, tuple)):
        return [p for i, v in enumerate(obj[:50]) for p in walk(v, f"{path}[{i}]", depth + 1)]
    if isinstance(obj, wb.MachineResult):
        _MACHINE_RESULTS[0] += 1
        if _MACHINE_RESULTS[0] % 10:  # the polytropic path (to_dict) on every 10th result
            return [p for name in _MACHINE_FIELDS
                    for p in walk(getattr(obj, name, None), f"{path}.{name}", depth + 1)]
    if hasattr(obj, "to_dict") and not isinstance(obj, type):
        problems = walk(obj.to_dict(), path, depth + 1)
        if is_dataclass(obj):
            for f in fields(obj):
                value = getattr(obj, f.name)
                if f.name == "cautions":
                    problems += [f"{path}.cautions is not a tuple of text"] if not (
                        isinstance(value, tuple) and all(isinstance(c, str) for c in value)
                    ) else []
                elif isinstance(value, (wb.State, float)):
                    problems += walk(value, f"{path}.{f.name}", depth + 1)
        return problems
    if is_dataclass(obj):
        return [p for f in fields(obj) for p in walk(getattr(obj, f.name), f"{path}.{f.name}",
                                                     depth + 1)]
    return []


def _walk_frame(frame, path):
    problems = []
    ok = frame["status"].eq("ok").to_numpy() if "status" in frame.columns else np.ones(
        len(frame), bool)
    for column in frame.columns:
        if not pd.api.types.is_float_dtype(frame[column]):
            continue
        values = frame[column].to_numpy(dtype=float)[ok]
        key = str(column)
        allowed = _nan_allowed(key) or key.startswith("reading")
        bad = np.isinf(values) if allowed else ~np.isfinite(values)
        if key.startswith(("inlet_", "outlet_", "mass_flow", "power", "volume_flow",
                           "standard_volume_flow", "speed", "reading_")) and key not in (
                "outlet_temperature", "inlet_volume_flow", "outlet_volume_flow",
                "mass_flow") and "status" in frame.columns:
            continue  # the readings themselves are inputs; NaN marks a missing reading
        if bad.any():
            problems.append(f"{path} column {key!r} has non-finite values on ok rows")
    return problems


# ------------------------------------------------------------------------ one call
def _names(message, labels):
    text = message.lower().replace("_", " ")
    return any(label.lower().replace("_", " ") in text for label in labels)


def check_call(call, tag, labels, all_labels=()):
    """Run one call; a problem text or None.  ``tag`` is the drawn value's tag.

    A refused boundary value must be named (``labels``); any other InputError must name
    one of the entry point's inputs (``all_labels``) - an error about a derived state
    (PropertyError, SpecificationError, ReadingsError) describes that state instead.
    """
    try:
        result = call()
    except wb.WorkbenchError as exc:
        message = str(exc)
        if not message.strip():
            return "empty message"
        if tag == "boundary" and not _names(message, labels):
            return f"message does not name {labels[0]!r}: {message[:200]}"
        if (all_labels and type(exc) is wb.InputError
                and not _names(message, tuple(all_labels) + tuple(labels))):
            return f"InputError names no input: {message[:200]}"
        return None
    except Exception as exc:  # noqa: BLE001 - a raw exception is the failure looked for
        return f"raw {type(exc).__name__}: {str(exc)[:200]}"
    if tag == "boundary":
        return f"accepted the invalid value (result {type(result).__name__})"
    problems = walk(result)
    return "; ".join(problems[:3]) if problems else None


def _short(value):
    try:
        text = repr(value)
    except Exception:  # noqa: BLE001
        text = type(value).__name__
    return text if len(text) < 80 else text[:77] + "..."


@dataclass
class Entry:
    """A public entry point called as ``call(**arguments)`` from a valid baseline."""

    name: str
    call: object
    args: dict
    budget: int

    def once(self, data):
        values = {k: a.base for k, a in self.args.items()}
        key = data.draw(st.sampled_from(sorted(self.args)), label="argument")
        tag, value = data.draw(self.args[key].values, label="value")
        values[key] = value
        labels = self.args[key].labels + (key,)
        every = tuple(w for k, a in self.args.items() for w in a.labels + (k,) if w != "-")
        problem = check_call(lambda: self.call(**values), tag, labels, every)
        return None if problem is None else f"{key}={_short(value)} ({tag}): {problem}"


@dataclass
class Custom:
    """An entry point with its own draw-and-check function ``once(data) -> problem``."""

    name: str
    once: object
    budget: int


def run_entry(entry):
    """Run ``entry.budget`` generated calls; return (calls, problems)."""
    problems, calls = [], [0]

    @seed(zlib.crc32(entry.name.encode()))
    @settings(max_examples=entry.budget, deadline=None, database=None,
              phases=[Phase.generate], suppress_health_check=list(HealthCheck))
    @given(data=st.data())
    def fuzz(data):
        calls[0] += 1
        problem = entry.once(data)
        if problem is not None:
            problems.append(problem)

    fuzz()
    return calls[0], problems


# ---------------------------------------------------------------------- the entries
def _opt_state(labels, good, base):
    bad = ["Air", 1.0, True, [AIR_OUT], {"P": 1e5}]
    return Arg(tuple(labels), st.one_of(st.sampled_from(good).map(lambda v: ("good", v)),
                                        st.sampled_from(bad).map(lambda v: ("boundary", v))),
               base)


def _machine_args(inlet, P_out, eff=None, power=None, mass_flow=2.0, P_range=(1.5e5, 1e6),
                  power_range=(1e3, 1e6)):
    return {
        "inlet": state_arg(("inlet",), STATES, inlet),
        "outlet": _opt_state(("outlet",), [None, AIR_OUT], None),
        "P_out": num(("outlet pressure", "P_out"), "pressure", *P_range, optional=True,
                     base=P_out),
        "isentropic_efficiency": num(("isentropic efficiency",), "dimensionless", 0.5, 1.0,
                                     optional=True, base=eff),
        "polytropic_efficiency": num(("polytropic efficiency",), "dimensionless", 0.5, 1.0,
                                     optional=True, base=None),
        "power": num(("power",), "power", *power_range, optional=True, base=power),
        "mass_flow": num(("mass flow",), "mass_flow", 0.1, 100.0, base=mass_flow),
        "velocity_in": num(("inlet velocity", "velocity_in", "velocity in"), "velocity", 0.0,
                           200.0, base=0.0),
        "velocity_out": num(("outlet velocity", "velocity_out", "velocity out"), "velocity",
                            0.0, 200.0, base=0.0),
        "diameter_in": num(("inlet diameter", "inlet flow diameter", "diameter_in"), "length",
                           0.05, 1.0, optional=True, base=None),
        "diameter_out": num(("outlet diameter", "outlet flow diameter", "diameter_out"),
                            "length", 0.05, 1.0, optional=True, base=None),
        "elevation_change": num(("elevation",), "length", -100.0, 100.0, base=0.0),
        "heat_loss": num(("heat loss",), "power", 0.0, 1e4, base=0.0),
        "mechanical_efficiency": num(("mechanical efficiency",), "dimensionless", 0.8, 1.0,
                                     base=1.0),
        "basis": option(("basis",), ("static", "total"), "static"),
    }


def _machine(kind, inlet, **kw):
    return Entry(kind, getattr(wb, kind), _machine_args(inlet, **kw), 0)


def _energy_balance():
    args = _machine_args(AIR_IN, 3e5, eff=0.8)
    args["kind"] = option(("kind", "machine"), ("compressor", "turbine", "pump", "fan"),
                          "compressor")
    return Entry("energy_balance", wb.energy_balance, args, 0)


def _streams_arg():
    good = [[(WATER_HOT, 1.0), (WATER_COLD, 2.0)], [(WATER_HOT, Q_(3.6, "t/h")),
                                                     (WATER_COLD, Decimal("2"))],
            ((WET, 1.0), (STEAM_IN, 1.0), (WET, 0.5))]
    bad = ["streams", None, 5.0, [(WATER_HOT, "a"), (WATER_COLD, 1.0)],
           [(WATER_HOT, math.nan), (WATER_COLD, 1.0)], [(1.0, 2.0), (3.0, 4.0)], [WATER_HOT],
           [(WATER_HOT, True), (WATER_COLD, 1.0)], [(WATER_HOT, 1.0, 2.0), (WATER_COLD, 1.0)],
           [(WATER_HOT, Q_(1.0, "bar")), (WATER_COLD, 1.0)]]
    return Arg(("stream",), st.one_of(st.sampled_from(good).map(lambda v: ("good", v)),
                                      st.sampled_from(bad).map(lambda v: ("boundary", v))),
               good[0])


def _split_arg(labels, good, bad, base):
    return Arg(labels, st.one_of(st.sampled_from(good).map(lambda v: ("good", v)),
                                 st.sampled_from(bad).map(lambda v: ("boundary", v))), base)


def _device_entries():
    flow = lambda label, base=2.0: num((label,), "mass_flow", 0.1, 100.0, base=base)  # noqa: E731
    pressure = lambda label, lo, hi, base, **kw: num((label,), "pressure", lo, hi,  # noqa: E731
                                                     base=base, **kw)
    eff = lambda label, base, **kw: num((label,), "dimensionless", 0.5, 1.0,  # noqa: E731
                                        base=base, **kw)
    return [
        Entry("throttle", wb.throttle, {
            "inlet": state_arg(("throttle inlet",), STATES, AIR_HOT),
            "mass_flow": flow("throttle mass flow"),
            "P_out": pressure("throttle outlet pressure", 1e4, 2.9e5, 1e5)}, 0),
        Entry("nozzle", wb.nozzle, {
            "inlet": state_arg(("nozzle inlet",), STATES, AIR_HOT),
            "mass_flow": flow("nozzle mass flow"),
            "P_out": pressure("nozzle outlet pressure", 1e4, 2.9e5, 1.5e5),
            "isentropic_efficiency": eff("nozzle isentropic efficiency", None, optional=True),
            "velocity_coefficient": eff("nozzle velocity coefficient", None, optional=True),
            "velocity_in": num(("nozzle inlet velocity",), "velocity", 0.0, 300.0,
                               base=0.0)}, 0),
        Entry("diffuser", wb.diffuser, {
            "inlet": state_arg(("diffuser inlet",), STATES, AIR_IN),
            "mass_flow": flow("diffuser mass flow"),
            "velocity_in": num(("diffuser inlet velocity",), "velocity", 50.0, 300.0,
                               base=200.0),
            "velocity_out": num(("diffuser outlet velocity",), "velocity", 0.0, 40.0,
                                base=0.0),
            "isentropic_efficiency": eff("diffuser isentropic efficiency", 1.0)}, 0),
        Entry("mixer", wb.mixer, {
            "streams": _streams_arg(),
            "P_out": pressure("mixer outlet pressure", 1e5, 4e5, None, optional=True),
            "heat_loss": num(("mixer heat loss",), "heat_flow", -1e4, 1e4, base=0.0)}, 0),
        Entry("splitter", wb.splitter, {
            "inlet": state_arg(("splitter inlet",), STATES, STEAM_IN),
            "mass_flow": flow("splitter mass flow", 10.0),
            "fractions": _split_arg(
                ("split fraction", "fractions"),
                [[0.3, None], [0.5, 0.5], [Decimal("0.2"), None, 0.1], (np.float64(0.4), None),
                 None],
                [[True, None], ["a", None], [math.nan, None], 0.5, "ab", [1.5, None],
                 [None, None], [0.2], [Q_(1, "m"), None]], [0.3, None]),
            "branch_mass_flows": _split_arg(
                ("branch", "mass flow"), [None, [2.0, None], [Q_(3600, "kg/h"), 9.0]],
                [[True, None], ["x", None], 3.0, [math.inf, None], [-1.0, None],
                 [Q_(1.0, "bar"), None]], None)}, 0),
        Entry("heat_exchanger", wb.heat_exchanger, {
            "hot_inlet": state_arg(("hot inlet",), STATES, WATER_HOT),
            "hot_mass_flow": flow("hot mass flow", 5.0),
            "cold_inlet": state_arg(("cold inlet",), STATES, WATER_COLD),
            "cold_mass_flow": flow("cold mass flow", 8.0),
            "hot_outlet_temperature": num(("hot outlet temperature",), "temperature", 300.0,
                                          360.0, optional=True, base=None),
            "cold_outlet_temperature": num(("cold outlet temperature",), "temperature",
                                           295.0, 360.0, optional=True, base=None),
            "duty": num(("duty",), "heat_flow", 1e3, 1e6, optional=True, base=1e5),
            "hot_pressure_drop": pressure("hot side pressure drop", 0.0, 4e5, 0.0),
            "cold_pressure_drop": pressure("cold side pressure drop", 0.0, 3e5, 0.0),
            "heat_loss": num(("heat exchanger heat loss",), "heat_flow", 0.0, 1e4,
                             base=0.0)}, 0),
        Entry("cooler", wb.cooler, {
            "inlet": state_arg(("cooler inlet",), STATES, AIR_HOT),
            "mass_flow": flow("cooler mass flow"),
            "outlet_temperature": num(("cooler outlet temperature",), "temperature", 280.0,
                                      410.0, base=308.15),
            "pressure_drop": pressure("cooler pressure drop", 0.0, 2e5, 0.0),
            "cooling_water_inlet_temperature": num(
                ("cooling water inlet temperature", "cooling water"), "temperature", 280.0,
                300.0, optional=True, base=None),
            "cooling_water_outlet_temperature": num(
                ("cooling water outlet temperature", "cooling water"), "temperature", 300.0,
                330.0, optional=True, base=None),
            "cooling_water_pressure": pressure("cooling water pressure", 1e5, 1e6, 3e5)}, 0),
        Entry("pipe_segment", wb.pipe_segment, {
            "inlet": state_arg(("pipe inlet",), STATES, WATER_IN),
            "mass_flow": flow("pipe mass flow", 10.0),
            "diameter": num(("pipe diameter",), "length", 0.05, 1.0, base=0.1),
            "length": num(("pipe length",), "length", 0.0, 1000.0, base=100.0),
            "outlet_diameter": num(("pipe outlet diameter",), "length", 0.05, 1.0,
                                   optional=True, base=None),
            "elevation_change": num(("elevation change",), "length", -10.0, 10.0, base=0.0),
            "roughness": num(("pipe roughness", "roughness"), "length", 0.0, 1e-3,
                             base=4.5e-5),
            "viscosity": num(("viscosity",), "dynamic_viscosity", 1e-4, 1e-2, optional=True,
                             base=None),
            "friction_factor": num(("friction factor",), "dimensionless", 0.01, 0.1,
                                   optional=True, base=None),
            "minor_loss_coefficient": num(("minor loss coefficient",), "dimensionless", 0.0,
                                          10.0, base=0.0),
            "pump_power": num(("pump power",), "power", 0.0, 1e4, base=0.0),
            "heat_loss": num(("pipe heat loss",), "heat_flow", -1e4, 1e4, base=0.0)}, 0),
        Entry("npsh_available", wb.npsh_available, {
            "suction": state_arg(("pump suction",), STATES, WATER_IN),
            "velocity": num(("suction velocity",), "velocity", 0.0, 10.0, base=2.0),
            "mass_flow": num(("suction mass flow", "mass flow"), "mass_flow", 1.0, 50.0,
                             optional=True, base=None),
            "diameter": num(("suction diameter", "diameter"), "length", 0.05, 0.5,
                            optional=True, base=None)}, 0),
    ]


def _train_step(cls, inlet, flow):
    def call(**kw):
        return wb.Train([cls(**kw)]).run(inlet, flow)
    return call


class _BadStep:
    """A step list holding a stage with a text pressure ratio, built at call time (a step
    class may check its fields when constructed)."""

    def __repr__(self):
        return "[CompressorStage('c', pressure_ratio='x', isentropic_efficiency=0.8)]"


def _run_train(steps, inlet, mass_flow):
    if isinstance(steps, _BadStep):
        steps = [wb.CompressorStage("c", pressure_ratio="x", isentropic_efficiency=0.8)]
    return wb.Train(steps).run(inlet, mass_flow)


def _train_entries():
    name = lambda base: text_arg(("name",), base)  # noqa: E731
    ratio = lambda base: num(("pressure ratio",), "dimensionless", 1.1, 10.0,  # noqa: E731
                             optional=True, base=base)
    eff = lambda label, base: num((label, "efficiency"), "dimensionless", 0.5, 1.0,  # noqa: E731
                                  optional=True, base=base)
    flow = num(("mass flow",), "mass_flow", 0.1, 50.0, optional=True, base=None)
    machine = lambda inlet_P, r, e: {  # noqa: E731
        "name": name("stage"), "P_out": num(("outlet pressure", "P_out"), "pressure",
                                            1e4, 1e7, optional=True, base=None),
        "pressure_ratio": ratio(r), "isentropic_efficiency": eff("isentropic efficiency", e),
        "polytropic_efficiency": eff("polytropic efficiency", None),
        "mechanical_efficiency": num(("mechanical efficiency",), "dimensionless", 0.8, 1.0,
                                     base=1.0),
        "heat_loss": num(("heat loss",), "power", 0.0, 1e4, base=0.0), "mass_flow": flow}
    steps_good = [[wb.CompressorStage("c", pressure_ratio=2.0, isentropic_efficiency=0.8)],
                  [wb.Cooler("k", outlet_temperature=300.0), wb.PressureLoss(
                      "d", pressure_drop=1e4)]]
    return [
        Entry("CompressorStage", _train_step(wb.CompressorStage, AIR_IN, 2.0),
              machine(1e5, 3.0, 0.8), 0),
        Entry("TurbineSection", _train_step(wb.TurbineSection, STEAM_IN, 10.0),
              machine(42e5, 5.0, 0.85), 0),
        Entry("PumpStage", _train_step(wb.PumpStage, WATER_IN, 10.0),
              dict(machine(3e5, 3.0, 0.75), P_out=num(("outlet pressure", "P_out"),
                                                      "pressure", 4e5, 2e6, optional=True,
                                                      base=10e5), pressure_ratio=ratio(None)),
              0),
        Entry("Cooler", _train_step(wb.Cooler, AIR_HOT, 2.0), {
            "name": name("cooler"),
            "outlet_temperature": num(("outlet temperature",), "temperature", 280.0, 410.0,
                                      base=308.15),
            "pressure_drop": num(("pressure drop",), "pressure", 0.0, 2e5, base=0.0),
            "cooling_water_inlet_temperature": num(("cooling water",), "temperature", 280.0,
                                                   300.0, optional=True, base=None),
            "cooling_water_outlet_temperature": num(("cooling water",), "temperature", 300.0,
                                                    330.0, optional=True, base=None),
            "mass_flow": flow}, 0),
        Entry("ThrottleValve", _train_step(wb.ThrottleValve, AIR_HOT, 2.0), {
            "name": name("valve"),
            "P_out": num(("outlet pressure", "P_out"), "pressure", 1e4, 2.9e5, optional=True,
                         base=1e5),
            "pressure_drop": num(("pressure drop",), "pressure", 1e3, 2e5, optional=True,
                                 base=None),
            "mass_flow": flow}, 0),
        Entry("PressureLoss", _train_step(wb.PressureLoss, AIR_HOT, 2.0), {
            "name": name("strainer"),
            "pressure_drop": num(("pressure drop",), "pressure", 1e3, 2e5, optional=True,
                                 base=2e4),
            "mass_flow": flow}, 0),
        Entry("PipeRun", _train_step(wb.PipeRun, WATER_IN, 10.0), {
            "name": name("pipe"),
            "diameter": num(("diameter",), "length", 0.05, 1.0, base=0.1),
            "options": _split_arg(("options", "length", "bogus", "viscosity"),
                                  [{}, {"length": 100.0}, {"elevation_change": Q_(2, "m")}],
                                  ["length", None, 1.0, {"length": "x"}, {"bogus": 1.0},
                                   {"length": math.nan}, {1: 2}], {"length": 100.0}),
            "mass_flow": flow}, 0),
        Entry("Extraction", _train_step(wb.Extraction, STEAM_IN, 10.0), {
            "name": name("bleed"),
            "branch_mass_flow": num(("branch mass flow",), "mass_flow", 0.1, 9.0,
                                    optional=True, base=None),
            "fraction": num(("fraction",), "dimensionless", 0.0, 0.99, optional=True,
                            base=0.2),
            "mass_flow": flow}, 0),
        Entry("Admission", _train_step(wb.Admission, STEAM_IN, 10.0), {
            "name": name("admission"),
            "state": state_arg(("state", "admission"), STATES, STEAM_IN),
            "branch_mass_flow": num(("branch mass flow",), "mass_flow", 0.1, 9.0,
                                    optional=True, base=1.0),
            "mass_flow": flow}, 0),
        Entry("Train", _run_train, {
            "steps": _split_arg(("step",), steps_good,
                                ["steps", None, 1.0, [1.0], [], [None], [AIR_IN],
                                 _BadStep()], steps_good[0]),
            "inlet": state_arg(("inlet",), [AIR_IN, AIR_HOT], AIR_IN),
            "mass_flow": num(("mass flow",), "mass_flow", 0.1, 50.0, base=2.0)}, 0),
        Entry("intercooled_compressor", wb.intercooled_compressor, {
            "inlet": state_arg(("inlet", "suction"), [AIR_IN], AIR_IN),
            "mass_flow": num(("mass flow",), "mass_flow", 0.5, 20.0, base=3.0),
            "P_out": num(("outlet pressure", "P_out", "discharge"), "pressure", 3e5, 2e6,
                         optional=True, base=9e5),
            "pressure_ratio": ratio(None),
            "stages": num(("stages",), "dimensionless", 1, 4, base=2),
            "isentropic_efficiency": eff("isentropic efficiency", 0.82),
            "polytropic_efficiency": eff("polytropic efficiency", None),
            "cooler_outlet_temperature": num(("cooler outlet temperature",), "temperature",
                                             290.0, 330.0, base=308.15, sequence_ok=True),
            "cooler_pressure_drop": num(("cooler pressure drop",), "pressure", 0.0, 2e4,
                                        base=5e3, sequence_ok=True),
            "knockout_pressure_drop": num(("knock-out", "knockout"), "pressure", 0.0, 2e4,
                                          base=0.0, sequence_ok=True),
            "aftercooler": flag_arg(("aftercooler",), False),
            "aftercooler_pressure_drop": num(("aftercooler pressure drop",), "pressure", 0.0,
                                             2e4, base=0.0),
            "stage_ratios": _split_arg(("stage ratio",), ["equal", [3.0], (2.5,)],
                                       ["bogus", "", None, 3.0, [True], ["x"], [math.nan],
                                        [3.0, 3.0, 3.0, 3.0]], "equal"),
            "cooling_water_inlet_temperature": num(("cooling water",), "temperature", 280.0,
                                                   300.0, optional=True, base=None),
            "cooling_water_outlet_temperature": num(("cooling water",), "temperature", 300.0,
                                                    305.0, optional=True, base=None),
            "mechanical_efficiency": num(("mechanical efficiency",), "dimensionless", 0.8,
                                         1.0, base=1.0)}, 0),
        Entry("extraction_turbine", wb.extraction_turbine, {
            "inlet": state_arg(("inlet",), [STEAM_IN], STEAM_IN),
            "mass_flow": num(("mass flow",), "mass_flow", 5.0, 50.0, base=10.0),
            "P_out": num(("outlet pressure", "P_out", "exhaust"), "pressure", 0.05e5, 2e5,
                         base=0.12e5),
            "extraction_pressure": num(("extraction pressure",), "pressure", 3e5, 20e5,
                                       base=5e5),
            "extraction_mass_flow": num(("extraction mass flow",), "mass_flow", 0.1, 4.0,
                                        base=2.0),
            "hp_isentropic_efficiency": eff("hp isentropic efficiency", 0.85),
            "lp_isentropic_efficiency": eff("lp isentropic efficiency", 0.85),
            "valve_outlet_pressure": num(("valve outlet pressure", "valve"), "pressure",
                                         30e5, 41e5, optional=True, base=None),
            "valve_pressure_drop": num(("valve pressure drop", "valve"), "pressure", 1e4,
                                       5e5, optional=True, base=None),
            "mechanical_efficiency": num(("mechanical efficiency",), "dimensionless", 0.8,
                                         1.0, base=1.0),
            "feedwater_inlet": _opt_state(("feedwater",), [None, WATER_IN], None),
            "feedwater_mass_flow": num(("feedwater mass flow", "feedwater"), "mass_flow",
                                       1.0, 20.0, optional=True, base=None)}, 0),
    ]


READINGS_FRAME = pd.DataFrame({
    "inlet_pressure": [1e5, 1.2e5, 1e5], "inlet_temperature": [300.0, 305.0, 310.0],
    "outlet_pressure": [3e5, 3.5e5, 2.5e5], "outlet_temperature": [430.0, 445.0, 410.0],
    "mass_flow": [1.0, 2.0, 1.5]})
READINGS = {"inlet_pressure": 1e5, "inlet_temperature": 300.0, "outlet_pressure": 3e5,
            "outlet_temperature": 430.0, "mass_flow": 2.0}
UNCERTAINTIES = {"inlet_pressure": (100.0, 50.0), "outlet_pressure": (100.0, 50.0),
                 "inlet_temperature": (0.1, 0.05), "outlet_temperature": (0.1, 0.05),
                 "mass_flow": (0.01, 0.005)}
RESULTS_FRAME = pd.DataFrame({"isentropic_efficiency": [0.80, 0.78], "power": [1.0e6, 1.1e6],
                              "inlet_volume_flow": [2.0, 2.1], "isentropic_head": [5e4, 5.2e4],
                              "speed": [2900.0, 3000.0]})


def _only_good(values, base):
    return Arg(("-",), st.sampled_from(values).map(lambda v: ("good", v)), base)


def _any_unit(labels, lo, hi, base):
    """A number in an SI unit not known to the function (any unit of a Quantity is SI)."""
    arg = num(labels, "dimensionless", lo, hi, base=base)
    values = st.one_of(arg.values.filter(lambda tv: not (
        tv[0] == "boundary" and isinstance(tv[1], pint.Quantity))))
    return Arg(arg.labels, values, base)


def _arrays(labels, lo, hi, base, unit):
    good = [base, np.asarray(base), Q_(np.asarray(base), unit), base[:1] * 2]
    bad = ["x", None, {"a": 1.0}, [[1.0, 2.0], [3.0, 4.0]], [math.inf, 1.0],
           [1e300, 1.0], Q_(np.asarray(base), "m**2" if unit != "m**2" else "bar")]
    lists = st.lists(st.floats(lo, hi), min_size=len(base), max_size=len(base))
    return Arg(tuple(labels), st.one_of(
        st.sampled_from(good).map(lambda v: ("good", v)), lists.map(lambda v: ("good", v)),
        st.sampled_from(bad).map(lambda v: ("boundary", v))), base)


def _uncertainty_entries():
    readings_good = [READINGS, dict(READINGS, inlet_pressure=Q_(1.0, "bar")),
                     dict(READINGS, inlet_temperature=Q_(26.85, "degC"))]
    readings_bad = [None, [1.0], "readings", dict(READINGS, inlet_pressure="x"),
                    dict(READINGS, inlet_pressure=math.nan), dict(READINGS, mass_flow=True),
                    dict(READINGS, inlet_pressure=Q_(1.0, "m")), {1: 2.0}]
    unc_good = [UNCERTAINTIES, {}, dict(UNCERTAINTIES, inlet_temperature=(Q_(0.1, "K"), 0.0))]
    unc_bad = [None, "u", [1.0], dict(UNCERTAINTIES, inlet_pressure=(-1.0, 0.0)),
               dict(UNCERTAINTIES, inlet_pressure=5.0), dict(UNCERTAINTIES, bogus=(1.0, 1.0)),
               dict(UNCERTAINTIES, inlet_pressure=(math.nan, 0.0)),
               dict(UNCERTAINTIES, inlet_temperature=(Q_(0.1, "degC"), 0.0))]
    results = _split_arg(("result",), [("isentropic_efficiency",), "power",
                                       ["isentropic_efficiency", "power"]],
                         ["bogus", [], [1], None, [None], "x" * 1000], ("isentropic_efficiency",))
    common = {
        "readings": _split_arg(("reading",), readings_good, readings_bad, READINGS),
        "uncertainties": _split_arg(("uncertaint",), unc_good, unc_bad, UNCERTAINTIES),
        "results": results,
        "machine": option(("machine",), ("compressor", "turbine", "pump", "fan"),
                          "compressor"),
        "fluid": _split_arg(("fluid", "composition"), [AIR, "Air"],
                            [None, 1.0, "NotAFluid", {}], AIR),
    }
    samples = Arg(("samples",), st.one_of(
        st.integers(10, 40).map(lambda v: ("good", v)),
        st.sampled_from([0, 9, -5, 10.5, 2_000_000]).map(lambda v: ("physical", v)),
        st.sampled_from([True, "20", None, math.nan, 10 ** 400, [20]]).map(
            lambda v: ("boundary", v))), 20)
    return [
        Entry("propagate_uncertainty", wb.propagate_uncertainty, dict(
            common, step_fraction=num(("step_fraction", "step fraction"), "dimensionless",
                                      0.01, 1.0, base=0.1)), 0),
        Entry("monte_carlo_uncertainty", wb.monte_carlo_uncertainty, dict(
            common, samples=samples,
            seed=Arg(("seed",), st.one_of(st.sampled_from([None, 0, 1, 12345]).map(
                lambda v: ("good", v)), st.sampled_from(["x", 1.5, True, -1, [1]]).map(
                lambda v: ("boundary", v))), 0)), 0),
        Entry("InstrumentUncertainty", wb.InstrumentUncertainty, {
            "systematic": _any_unit(("systematic",), 0.0, 10.0, 1.0),
            "random": _any_unit(("random",), 0.0, 10.0, 0.5)}, 0),
    ]


def _fieldtest_entries():
    opt = lambda label, kind, lo, hi, base=None: num((label,), kind, lo, hi,  # noqa: E731
                                                    optional=True, base=base)
    frame_arg = lambda base: _split_arg(  # noqa: E731
        ("frame", "readings", "results", "DataFrame"), [base, base.iloc[:1], base.iloc[::-1]],
        [None, "frame", [1.0, 2.0], {"a": [1.0]}, base.to_numpy()], base)
    column = lambda label, base: _split_arg((label,), [base, "not a column"],  # noqa: E731
                                            [None, 1, ["x"], True], base)
    return [
        Entry("DesignPoint", wb.DesignPoint, {
            "isentropic_efficiency": opt("design isentropic efficiency", "dimensionless",
                                         0.5, 1.0, 0.8),
            "power": opt("design power", "power", 1e3, 1e7, 1e6),
            "volume_flow": opt("design volume flow", "volume_flow", 0.01, 10.0),
            "head": opt("design head", "specific_energy", 1e2, 1e5),
            "speed": opt("design speed", "dimensionless", 100.0, 1e4)}, 0),
        Entry("affinity_correction", wb.affinity_correction, {
            "speed": _arrays(("speed",), 100.0, 1e4, [2900.0, 3000.0], "rpm"),
            "rated_speed": num(("rated speed",), "dimensionless", 100.0, 1e4, base=2950.0),
            "volume_flow": _split_arg(("volume flow",), [None, [0.05, 0.06]],
                                      ["x", [[1.0]], [math.inf, 1.0], [1.0, 2.0, 3.0]], None),
            "head": _split_arg(("head",), [None, [900.0, 1000.0], Q_([80.0, 90.0], "m")],
                               ["x", [math.inf, 1.0], Q_([1.0, 2.0], "bar")], None),
            "power": _split_arg(("power",), [None, [6e4, 6.6e4], Q_([60.0, 66.0], "kW")],
                                ["x", [math.nan, "a"], Q_([1.0, 2.0], "m")], [6e4, 6.6e4])}, 0),
        Entry("compare_with_design", wb.compare_with_design, {
            "results": frame_arg(RESULTS_FRAME),
            "design": _split_arg(("design",), [wb.DesignPoint(power=1.05e6, speed=2950.0),
                                               wb.DesignPoint()],
                                 [None, {"power": 1e6}, 1.0, "design"],
                                 wb.DesignPoint(isentropic_efficiency=0.79, power=1.05e6)),
            "efficiency_column": column("efficiency_column", "isentropic_efficiency"),
            "power_column": column("power_column", "power"),
            "flow_column": column("flow_column", "inlet_volume_flow"),
            "head_column": column("head_column", "isentropic_head"),
            "speed_column": column("speed_column", "speed"),
            "correct_speed": _split_arg(("correct_speed", "speed"), [None, False],
                                        ["yes", 1, 1.0], None)}, 0),
        Entry("steady_state_flags", wb.steady_state_flags, {
            "frame": frame_arg(READINGS_FRAME),
            "columns": _split_arg(("column",), [["inlet_pressure"], ("mass_flow",
                                                                      "inlet_pressure")],
                                  ["inlet_pressure", None, [1], ["bogus"], 5.0],
                                  ["inlet_pressure", "mass_flow"]),
            "window": num(("window",), "dimensionless", 2, 5, base=2),
            "tolerance": _split_arg(("tolerance",), [0.5, 1e4, Q_(0.1, "bar"), Decimal("1"),
                                                     {"inlet_pressure": 1e4, "mass_flow": 1}],
                                    [-1.0, math.nan, "x", None, True, [1.0], {"bogus": 1.0},
                                     Q_(1.0, "degC"), 10 ** 400], 1e4),
            "relative": flag_arg(("relative",), False)}, 0),
        Entry("evaluate", wb.evaluate, {
            "frame": frame_arg(READINGS_FRAME),
            "machine": option(("machine",), ("compressor", "turbine", "pump", "fan"),
                              "compressor"),
            "fluid": _split_arg(("fluid", "composition"), [AIR, "Air"],
                                [None, 1.0, "NotAFluid", {}], AIR),
            "columns": _split_arg(("column",), [None, {"mass_flow": "mass_flow"}],
                                  ["x", [1], {"bogus": "mass_flow"}, {"mass_flow": 1}], None),
            "results": _split_arg(("result",), [("power",), ["isentropic_efficiency"]],
                                  ["bogus", ["bogus"], [1], None, []], ("power",)),
            "mode": option(("mode",), ("auto", "outlet", "power"), "auto"),
            "basis": option(("basis",), ("static", "total"), "static"),
            "mechanical_efficiency": num(("mechanical efficiency",), "dimensionless", 0.8,
                                         1.0, base=1.0),
            "standard_conditions": _split_arg(("standard conditions", "standard"),
                                              [(288.15, 101325.0), (Q_(15, "degC"),
                                                                    Q_(1, "atm"))],
                                              [None, "x", (1.0,), (math.nan, 1e5),
                                               (288.15, -1.0), 5.0], (288.15, 101325.0)),
            "keep_inputs": flag_arg(("keep_inputs", "keep inputs"), True)}, 0),
    ]


def _fluid_entries():
    fluids = _only_good([AIR, STEAM, WATER], AIR)
    composition = st.dictionaries(st.sampled_from(["Methane", "Ethane", "Nitrogen", "CO2"]),
                                  st.floats(0.01, 100.0), min_size=1)
    fractions = _split_arg(
        ("composition", "fraction", "Methane"),
        [{"Methane": 0.9, "Ethane": 0.1}, {"Methane": 90, "Ethane": Decimal(10)},
         {"Nitrogen": np.float64(1.0)}],
        [{}, {"Methane": -1.0}, {"Methane": math.nan}, {"Methane": True},
         {"Methane": "x"}, {"Methane": 10 ** 400}, {"Methane": 0.0}, None, "Methane",
         [("Methane", 1.0)], {"Methane": Q_(1.0, "m")}, {1: 1.0}],
        {"Methane": 0.9, "Ethane": 0.1})
    fractions.values = fractions.values | composition.map(lambda v: ("good", v))
    return [
        Entry("Fluid.state", lambda fluid, P, T: fluid.state(P=P, T=T), {
            "fluid": fluids, "P": num(("pressure",), "pressure", 1e4, 1e7, base=1e5),
            "T": num(("temperature",), "temperature", 280.0, 900.0, base=300.0)}, 0),
        Entry("Fluid.state_Ph", lambda fluid, P, h: fluid.state(P=P, h=h), {
            "fluid": fluids, "P": num(("pressure",), "pressure", 1e4, 1e7, base=1e5),
            "h": num(("enthalpy",), "specific_enthalpy", 1e5, 3e6, base=4e5)}, 0),
        Entry("Fluid.states_PT", lambda fluid, P, T: fluid.states_PT(P, T), {
            "fluid": _only_good([AIR, STEAM], AIR),
            "P": _arrays(("pressure", "P"), 1e4, 1e7, [1e5, 2e5], "Pa"),
            "T": _arrays(("temperature", "T"), 280.0, 900.0, [300.0, 400.0], "K")}, 0),
        Entry("Fluid.saturation_pressure", lambda fluid, T: fluid.saturation_pressure(T), {
            "fluid": _only_good([STEAM, WATER], WATER),
            "T": num(("temperature", "T="), "temperature", 280.0, 640.0, base=373.15)}, 0),
        Entry("normalise_fractions", wb.normalise_fractions, {"composition": fractions}, 0),
    ]


def _fluid_once(data):
    spec = data.draw(st.one_of(
        st.sampled_from(["Air", "Water", "Nitrogen", "CO2", {"Methane": 0.9, "Ethane": 0.1}]).map(
            lambda v: ("good", v)),
        st.sampled_from(["", "NotAFluid", None, 1, 1.5, True, {}, {"Methane": -1.0},
                         {"Methane": math.nan}, {"Methane": True}, "x" * 10_000, "Water\x00",
                         {"Methane": 10 ** 400}, ["Methane"], {"NotAFluid": 1.0}, b"Air"]).map(
            lambda v: ("boundary", v))))
    basis = data.draw(st.sampled_from(["mole", "mole", "mass", "bogus", None, 1]))
    backend = data.draw(st.sampled_from(["HEOS", "HEOS", "IF97", "bogus", "", None]))
    tag, value = spec
    if basis not in ("mole", "mass") or backend not in ("HEOS", "IF97"):
        tag = "boundary"
    labels = ("fluid", "basis", "backend", "composition", "fraction", "name")
    problem = check_call(lambda: wb.Fluid(value, basis=basis, backend=backend), tag, labels)
    return None if problem is None else f"Fluid({_short(value)}, basis={basis!r}, " \
                                        f"backend={backend!r}): {problem}"


def _available_fluids_once(data):
    data.draw(st.integers(0, 3))
    names = wb.available_fluids()
    if not (isinstance(names, list) and names and all(isinstance(n, str) for n in names)):
        return f"available_fluids() returned {_short(names)}"
    return None


# ------------------------------------------------------------------- files and loaders
_CELLS = st.one_of(st.floats(0.5, 5.0).map(lambda v: f"{v:.4f}"),
                   st.sampled_from(["", "x", "nan", "inf", "-1", "0", "1e400", "1,5", " 2 ",
                                    "#", "\"3\"", "NULL", "1e-300"]))
_UNITS = {"inlet_pressure": "bar", "inlet_temperature": "degC", "outlet_pressure": "bar(g)",
          "outlet_temperature": "K", "mass_flow": "t/h"}
_UNIT_TEXT = st.one_of(st.sampled_from(["bar", "kPa", "psig", "bar(g)", "degC", "K", "degF",
                                        "kg/s", "t/h", "m3/h", "Sm3/h", "kW", "rpm"]),
                       st.sampled_from(["kg/(s", "bar**", "1/0", "m" * 50, "", " ", "__import__",
                                        "bar; rm", "°C", "\x00", "kelvin**1e9", "(((", "s" * 41,
                                        "bar**bar", "1e400 Pa"]),
                       st.text(max_size=12))
_TMP = os.path.join(os.path.dirname(os.path.abspath(__file__)), "data")  # an existing folder


def _csv(rows, names):
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(["row"] + names)
    writer.writerows([str(i)] + r for i, r in enumerate(rows))
    return out.getvalue()


def _readings_once(data):
    scenario = data.draw(st.sampled_from(["rows", "rows", "units", "bytes", "path", "map",
                                          "ambient"]))
    names = list(_UNITS)
    column_map = {n: f"col {n}" for n in names}
    units = dict(_UNITS)
    n_rows = data.draw(st.integers(1, 8))
    # one draw for the whole table (a draw per cell costs more than the read itself)
    rows = data.draw(st.lists(st.lists(_CELLS, min_size=len(names), max_size=len(names)),
                              min_size=n_rows, max_size=n_rows))
    source = io.StringIO(_csv(rows, [column_map[n] for n in names]))
    source.name = "readings.csv"
    tag, labels, kwargs = "good", ("readings",), {}
    if scenario == "units":
        key = data.draw(st.sampled_from(names))
        units[key] = data.draw(_UNIT_TEXT)
        tag, labels = "physical", ("unit", key.replace("_", " "))
    elif scenario == "bytes":
        suffix = data.draw(st.sampled_from([".csv", ".xlsx", ".xls", ".txt", ""]))
        blob = data.draw(st.one_of(st.binary(max_size=200), st.sampled_from([
            b"PK\x03\x04" + b"\x00" * 40, b"", b"\xff\xfe\x00", b"row\n", b"a,b\n1,2\n"])))
        source = io.BytesIO(blob)
        source.name = "junk" + suffix
        tag, labels = "physical", ("junk", "file", "column", "reading")
    elif scenario == "path":
        source = data.draw(st.sampled_from([_TMP, os.path.join(_TMP, "missing.csv"),
                                            os.path.join(_TMP, "missing.xlsx"), "", None, 1.0,
                                            b"readings.csv", "a\x00b.csv"]))
        tag, labels = "boundary", ("file", "path", "folder", "director", "readings")
    elif scenario == "map":
        column_map = data.draw(st.sampled_from([
            None, "map", {"bogus": "col inlet_pressure"}, {"inlet_pressure": "missing"},
            {"inlet_pressure": 1}, {"inlet_pressure": ["a"]}, [("inlet_pressure", "x")]]))
        tag, labels = "boundary", ("column", "map", "reading")
    elif scenario == "ambient":
        arg = num(("ambient pressure",), "pressure", 9e4, 1.1e5)
        tag, value = data.draw(arg.values)
        kwargs["ambient_pressure"] = value
        labels = ("ambient pressure",)

    def call():
        return wb.read_readings(source, column_map, units, **kwargs)

    try:
        result = call()
    except wb.WorkbenchError as exc:
        if tag == "boundary" and not _names(str(exc), labels):
            return f"{scenario}: message does not name {labels[0]!r}: {str(exc)[:200]}"
        if scenario == "rows":
            return f"rows: refused a readable file: {exc}"
        return None
    except Exception as exc:  # noqa: BLE001 - a raw exception is the failure looked for
        return f"{scenario}: raw {type(exc).__name__}: {str(exc)[:200]}"
    if tag == "boundary":
        return f"{scenario}: accepted {_short(source)} / {_short(column_map)}"
    if not isinstance(result, pd.DataFrame):
        return f"{scenario}: returned {type(result).__name__}"
    if scenario in ("rows", "units", "ambient"):
        if len(result) != n_rows or [str(v) for v in result["row"]] != [str(i) for i in
                                                                        range(n_rows)]:
            return f"{scenario}: {len(result)} rows for {n_rows} file rows, or out of order"
        for n in names:
            values = result[n].to_numpy(dtype=float)
            if np.isinf(values).any():
                return f"{scenario}: column {n} holds infinity"
            bad = np.isnan(values) & (result["reading_problem"] == "").to_numpy()
            if bad.any():
                return f"{scenario}: a missing {n} reading without a reading_problem note"
    return None


@functools.cache
def _find(attribute):
    """The first workbench module that defines ``attribute`` (the loaders may move)."""
    for name in ("workbench.machine_case", "workbench.study", "workbench.fieldtest.setup_file",
                 "workbench.ui.cases", "workbench.fieldtest.session"):
        try:
            module = importlib.import_module(name)
        except ImportError:
            continue
        if hasattr(module, attribute):
            return getattr(module, attribute)
    for info in pkgutil.walk_packages(wb.__path__, "workbench."):
        try:
            module = importlib.import_module(info.name)
        except Exception:  # noqa: BLE001, S112 - a module that does not import is skipped
            continue
        if hasattr(module, attribute):
            return getattr(module, attribute)
    raise AssertionError(f"no workbench module defines {attribute}")


def _valid_case():
    return _find("make_case")(dict(_find("DEFAULT_INPUTS")), "fuzz", "a case")


def _valid_setup():
    return _find("make_setup")(
        machine="pump", fluid="Water", property_model="IF97", ambient_pressure=101325.0,
        mechanical_efficiency=0.97, columns={"inlet_pressure": ("p1", "psig", 6894.757),
                                             "mass_flow": ("m", "t/h", 0.5)},
        steady_window=7, uncertainty={"pressure_fraction": 0.003, "temperature_K": 0.1,
                                      "flow_fraction": 0.02, "power_fraction": 0.015},
        design={"isentropic_efficiency": 0.8, "shaft_power_W": None,
                "inlet_volume_flow_m3_per_s": None, "speed_rpm": 2950.0},
        readings_file="pump.csv")


_JSON_VALUES = st.one_of(
    st.sampled_from([None, True, -1, 0, 1e308, -1e308, "", "\x00", "x" * 5000, [], {},
                     [1, 2], {"a": 1}, 1.5, "bar", "NaN"]),
    st.integers(-(10 ** 30), 10 ** 30), st.floats(allow_nan=False, allow_infinity=False),
    st.text(max_size=10))
_RAW_TEXTS = ["[" * 100_000 + "]" * 100_000, '{"a":' * 50_000 + "1" + "}" * 50_000,
              "[1, 2]", '"text"', "1", "null", "{", '{"format": NaN}', '{"inputs": Infinity}',
              "{\"format\": 1" + "0" * 5000 + "}", "\x00{}", "{}\x00", "", "   ",
              '{"format": "\\u0000"}']


def _json_once(data, what, read, valid, extra_args):
    scenario = data.draw(st.sampled_from(["value", "value", "extra", "drop", "raw", "bytes",
                                          "top"]))
    case = json.loads(json.dumps(valid))
    inner = case.get("inputs") if isinstance(case.get("inputs"), dict) else case
    container = data.draw(st.sampled_from([case, inner]))
    key, tag, source = None, "physical", None
    if scenario == "value":
        key = data.draw(st.sampled_from(sorted(container)))
        container[key] = data.draw(_JSON_VALUES)
    elif scenario == "extra":
        key = data.draw(st.sampled_from(["bogus", "extra_key", "__class__", "inputs2"]))
        container[key] = 1.0
        tag = "boundary"
    elif scenario == "drop":
        key = data.draw(st.sampled_from(sorted(container)))
        del container[key]
    elif scenario == "raw":
        source = data.draw(st.sampled_from(_RAW_TEXTS))
        tag = "boundary"
    elif scenario == "bytes":
        source = data.draw(st.binary(max_size=100))
        tag = "boundary" if not source.strip().startswith(b"{") else "physical"
    else:
        source = data.draw(st.sampled_from([[case], 1.5, None, True, ("a",), 10 ** 400]))
        tag = "boundary"
    if source is None and scenario != "top":
        source = data.draw(st.sampled_from(["text", "dict", "bytes"]))
        source = {"text": json.dumps(case), "dict": case,
                  "bytes": json.dumps(case).encode()}[source]
    labels = (what,) + ((key,) if key else ())
    try:
        result = read(source, *extra_args)
    except wb.WorkbenchError as exc:
        message = str(exc)
        named = [key] + (list(container[key]) if scenario == "value" and isinstance(
            container.get(key), dict) else [])
        if key and scenario in ("value", "extra", "drop") and not any(
                str(k) in message for k in named):
            return f"{scenario} {key!r}: message does not name the key: {message[:200]}"
        if not _names(message, labels):
            return f"{scenario}: message does not name the {what}: {message[:200]}"
        return None
    except Exception as exc:  # noqa: BLE001 - a raw exception is the failure looked for
        return f"{scenario} {key!r}: raw {type(exc).__name__}: {str(exc)[:200]}"
    if tag == "boundary":
        return f"{scenario} {key!r}: accepted {_short(source)}"
    problems = walk(result)
    return f"{scenario} {key!r}: " + "; ".join(problems[:3]) if problems else None


def _case_once(data):
    return _json_once(data, "case", _find("read_case"), _valid_case(), ())


def _setup_once(data):
    return _json_once(data, "setup", _find("read_setup"), _valid_setup(), (["p1", "m"],))


def _evaluate_rows_once(data):
    """Batches return every row, in order, with results for exactly the rows that are ok."""
    n = data.draw(st.integers(1, 8))
    cells = st.one_of(st.floats(0.0, 2.0), st.sampled_from([math.nan, -1.0, 0.0, math.inf,
                                                             1e300, "x", None, "1.5"]))

    def column(numbers):  # one draw per column
        return data.draw(st.lists(numbers | cells, min_size=n, max_size=n))

    frame = pd.DataFrame({
        "inlet_pressure": column(st.floats(0.5e5, 2e5)),
        "inlet_temperature": column(st.floats(280.0, 330.0)),
        "outlet_pressure": column(st.floats(2e5, 5e5)),
        "outlet_temperature": column(st.floats(380.0, 500.0)),
        "mass_flow": column(st.floats(0.5, 5.0))},
        index=pd.Index(data.draw(st.permutations(list(range(100, 100 + n))))))
    try:
        out = wb.evaluate(frame, "compressor", AIR, mode="outlet",
                          results=("power", "isentropic_efficiency", "outlet_temperature"))
    except wb.WorkbenchError as exc:
        return f"refused a whole frame for bad cells: {exc}"
    except Exception as exc:  # noqa: BLE001 - a raw exception is the failure looked for
        return f"raw {type(exc).__name__}: {str(exc)[:200]}"
    if list(out.index) != list(frame.index):
        return f"rows out of order or missing: {list(out.index)} for {list(frame.index)}"
    problems = walk(out, "evaluate")
    return "; ".join(problems[:3]) if problems else None


# ------------------------------------------------------------------------ the table
def _entries():
    entries = [
        *_device_entries(),
        _machine("compressor", AIR_IN, P_out=3e5, eff=0.8),
        _machine("turbine", STEAM_IN, P_out=0.12e5, power=8.5e6, mass_flow=10.0,
                 P_range=(0.05e5, 30e5), power_range=(1e6, 1e7)),
        _machine("pump", WATER_IN, P_out=10e5, eff=0.75, mass_flow=10.0,
                 P_range=(4e5, 50e5)),
        _machine("fan", AIR_IN, P_out=1.05e5, eff=0.8, mass_flow=5.0, P_range=(1.01e5, 1.2e5)),
        _energy_balance(),
        *_train_entries(), *_fieldtest_entries(), *_uncertainty_entries(), *_fluid_entries(),
        Custom("Fluid", _fluid_once, 0),
        Custom("available_fluids", _available_fluids_once, 0),
        Custom("read_readings", _readings_once, 0),
        Custom("read_case", _case_once, 0),
        Custom("read_setup", _setup_once, 0),
        Custom("evaluate rows", _evaluate_rows_once, 0),
    ]
    return {e.name: e for e in entries}


ENTRIES = _entries()

#: Generated calls per entry point (at least 10,000 in all, in under two minutes).  Entries
#: costing several milliseconds a call (files read, batches, uncertainty samples, stages with
#: the polytropic path) get fewer calls; the cheap single-point entries carry the count.
BUDGET = {name: 250 for name in ENTRIES}
BUDGET.update({
    "available_fluids": 4, "compressor": 200, "turbine": 120, "pump": 100, "fan": 200,
    "energy_balance": 120, "intercooled_compressor": 100, "extraction_turbine": 150,
    "monte_carlo_uncertainty": 60, "propagate_uncertainty": 90, "evaluate": 120,
    "evaluate rows": 50, "Fluid": 120, "read_case": 300, "read_setup": 350,
    "read_readings": 160, "Fluid.states_PT": 200, "Fluid.state": 500, "Fluid.state_Ph": 400,
    "Fluid.saturation_pressure": 400, "DesignPoint": 450, "InstrumentUncertainty": 250,
    "normalise_fractions": 300, "throttle": 400, "nozzle": 500, "diffuser": 400,
    "mixer": 450, "splitter": 500, "heat_exchanger": 500, "cooler": 450,
    "pipe_segment": 500, "npsh_available": 450, "CompressorStage": 120,
    "ThrottleValve": 300, "Cooler": 300, "TurbineSection": 300, "PipeRun": 300,
})
for _name, _entry in ENTRIES.items():
    _entry.budget = BUDGET[_name]


# ------------------------------------------------------------------------- the tests
def test_every_public_name_is_covered():
    # A new public name must come with a fuzz row (or a reason it is no entry point).
    missing = [n for n in wb.__all__ if n not in ENTRIES and n not in NOT_ENTRY_POINTS]
    curves_fuzz = CURVES_FUZZ.read_text(encoding="utf-8")
    missing += [n for n, why in NOT_ENTRY_POINTS.items()
                if why.startswith("fuzzed in tests/curves")
                and not re.search(rf"\b{n}\b", curves_fuzz)]
    assert not missing, f"public names without fuzz coverage: {missing}"
    assert sum(BUDGET.values()) >= 10_000


def test_baselines_are_valid_calls():
    # Each entry's baseline call succeeds with finite results, so the fuzz starts from a
    # valid call and every refusal comes from the one argument it changed.
    for name, entry in ENTRIES.items():
        if isinstance(entry, Entry):
            result = entry.call(**{k: a.base for k, a in entry.args.items()})
            assert not walk(result), (name, walk(result)[:3])


@pytest.mark.parametrize("name", list(ENTRIES))
def test_fuzz(name):
    calls, problems = run_entry(ENTRIES[name])
    COUNTS[name] = calls
    unique = list(dict.fromkeys(problems))
    assert not unique, (f"{name}: {len(problems)} of {calls} calls failed; first ones:\n  "
                        + "\n  ".join(unique[:8]))


def test_zz_total_number_of_calls():
    # Runs after the fuzz tests of this file (file order); alone it has nothing to count.
    if set(COUNTS) != set(ENTRIES):
        pytest.skip("the fuzz tests of this file did not all run in this session")
    total = sum(COUNTS.values())
    print(f"\nfuzz calls: {total} " + ", ".join(f"{k}={v}" for k, v in COUNTS.items()))
    assert total >= 10_000, f"only {total} fuzz calls"
