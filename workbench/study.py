"""Machine studies: one energy balance of a case's inputs, sweeps, result values, chart series.

A *study* is what the machine panel shows: a compressor, turbine, pump or fan described by a
flat dict of inputs in SI units (the same dict a case file stores, see
:mod:`workbench.machine_case`).  :func:`machine_study` validates that dict through the input
boundary (:mod:`workbench.units`), builds the fluid and the states, converts the flow and
calls :func:`workbench.machines.energy_balance`; :func:`sweep` varies one input over a range;
:func:`result_values` reads the result fields of :data:`workbench.fields.FIELDS` from a
result; :func:`process_series` gives the points of the h-s and T-s charts.  Nothing here
imports a widget or a plotting library: the panels bind widgets to these functions.

Standard volume flow is referred to 15 degC and 1.01325 bar (ISO 13443 standard reference
conditions, common practice for natural gas), with the real-gas density of the fluid there.
Water is computed with the fluid's default model (IAPWS-95 through CoolProp's HEOS).

References
----------
ISO 13443:1996, Natural gas - Standard reference conditions.
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.

Examples
--------
>>> from workbench.study import DEFAULT_INPUTS, machine_study
>>> r = machine_study(DEFAULT_INPUTS)   # air, 1 to 3 bar at 80 % isentropic efficiency
>>> round(r.isentropic_efficiency, 3)
0.8
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .errors import InputError, WorkbenchError
from .machines import energy_balance
from .machines.flows import (
    mass_flow_from,
    standard_density,
)
from .properties import Fluid, available_fluids
from .units import UNIT_SYSTEMS, choice, count, fraction, not_negative, positive, text, to_si

#: Standard reference conditions of standard volume flow: 15 degC, 1.01325 bar (ISO 13443).

MACHINES = ("compressor", "turbine", "pump", "fan")
OUTLET_MODES = ("measured outlet", "isentropic efficiency", "polytropic efficiency",
                "measured power")
STATE_GIVEN = ("temperature", "quality")
FLOW_GIVEN = ("mass flow", "inlet volume flow", "standard volume flow")
VELOCITY_GIVEN = ("velocities", "flow diameters")
FLUID_KINDS = ("pure", "mixture")
COMPOSITION_BASES = ("mole", "mass")
EFFICIENCY_BASES = ("static", "total")

#: Inputs a sweep can vary: name -> (input key, kind of quantity, choices the variable
#: selects so that the swept number is the one used).  Efficiencies are fractions.
SWEEP_VARIABLES = {
    "outlet-pressure": ("outlet_pressure_Pa", "pressure", {}),
    "inlet-pressure": ("inlet_pressure_Pa", "pressure", {}),
    "inlet-temperature": ("inlet_temperature_K", "temperature", {"inlet_given": "temperature"}),
    "outlet-temperature": ("outlet_temperature_K", "temperature",
                           {"outlet_given": "temperature", "outlet_fixed_by": "measured outlet"}),
    "mass-flow": ("mass_flow_kg_per_s", "mass_flow", {"flow_given": "mass flow"}),
    "isentropic-efficiency": ("isentropic_efficiency", "dimensionless",
                              {"outlet_fixed_by": "isentropic efficiency"}),
    "polytropic-efficiency": ("polytropic_efficiency", "dimensionless",
                              {"outlet_fixed_by": "polytropic efficiency"}),
    "measured-power": ("power_W", "power", {"outlet_fixed_by": "measured power"}),
}
SWEEP_INPUTS = tuple(SWEEP_VARIABLES)
MAX_SWEEP_POINTS = 200

#: Default inputs (SI): air compressed from 1 to 3 bar; a case takes these where it leaves a
#: key out.
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


def _options(options):
    return lambda value, name: choice(value, options, name)


def _quantity(kind, check=to_si):
    return lambda value, name: check(value, kind, name)


def _composition(value, name):
    if not isinstance(value, dict) or not value:
        raise InputError(f"{name} must be an object of component: fraction, not "
                         f"{type(value).__name__}")
    if len(value) > 40:
        raise InputError(f"{name} has {len(value)} components: at most 40 allowed")
    out = {}
    for component, share in value.items():
        component = text(component, f"{name} component name", max_length=60).strip()
        if not component:
            raise InputError(f"{name} has an empty component name")
        out[component] = fraction(share, f"{name} fraction of {component}", allow_zero=True)
    return out


def _sweep_bound(value, name):
    return to_si(value, "dimensionless", name)  # SI number of the swept input's kind


#: The input boundary of a study: key -> check(value, name) returning the SI value.
INPUT_CHECKS = {
    "fluid_kind": _options(FLUID_KINDS),
    "fluid_name": lambda value, name: text(value, name, max_length=80).strip(),
    "composition": _composition,
    "composition_basis": _options(COMPOSITION_BASES),
    "machine": _options(MACHINES),
    "outlet_fixed_by": _options(OUTLET_MODES),
    "efficiency_basis": _options(EFFICIENCY_BASES),
    "inlet_pressure_Pa": _quantity("pressure", positive),
    "inlet_given": _options(STATE_GIVEN),
    "inlet_temperature_K": _quantity("temperature", positive),
    "inlet_quality": lambda value, name: fraction(value, name, allow_zero=True),
    "outlet_pressure_Pa": _quantity("pressure", positive),
    "outlet_given": _options(STATE_GIVEN),
    "outlet_temperature_K": _quantity("temperature", positive),
    "outlet_quality": lambda value, name: fraction(value, name, allow_zero=True),
    "flow_given": _options(FLOW_GIVEN),
    "mass_flow_kg_per_s": _quantity("mass_flow", positive),
    "volume_flow_m3_per_s": _quantity("volume_flow", positive),
    "velocity_given": _options(VELOCITY_GIVEN),
    "velocity_in_m_per_s": _quantity("velocity", not_negative),
    "velocity_out_m_per_s": _quantity("velocity", not_negative),
    "diameter_in_m": _quantity("length", positive),
    "diameter_out_m": _quantity("length", positive),
    "elevation_change_m": _quantity("length"),
    "heat_loss_W": _quantity("heat_flow"),
    "mechanical_efficiency": lambda value, name: fraction(value, name),
    "isentropic_efficiency": lambda value, name: fraction(value, name),
    "polytropic_efficiency": lambda value, name: fraction(value, name),
    "power_W": _quantity("power", positive),
    "ambient_pressure_Pa": _quantity("pressure", positive),
    "unit_system": _options(tuple(UNIT_SYSTEMS)),
    "sweep_input": _options(SWEEP_INPUTS),
    "sweep_start": _sweep_bound,
    "sweep_stop": _sweep_bound,
    "sweep_points": lambda value, name: count(value, name, low=2, high=MAX_SWEEP_POINTS),
}


def validate_inputs(inputs) -> dict:
    """Check a study's inputs and return the full dict (SI), defaults filled in.

    Parameters
    ----------
    inputs : dict
        Keys of :data:`DEFAULT_INPUTS` (any subset), SI values; pint Quantities are
        converted and their dimension checked.

    Returns
    -------
    dict
        Every key of :data:`DEFAULT_INPUTS`, validated; a new dict (the argument is not
        changed).

    Raises
    ------
    InputError
        Not a dict, an unknown key, or a value refused by the input boundary; the message
        names the key.

    Examples
    --------
    >>> validate_inputs({"machine": "fan"})["machine"]
    'fan'
    """
    if not isinstance(inputs, dict):
        raise InputError(f"study inputs must be a dict, not {type(inputs).__name__}")
    unknown = sorted(str(k) for k in inputs if k not in INPUT_CHECKS)
    if unknown:
        shown = ", ".join(repr(k[:40]) for k in unknown[:5])
        raise InputError(f"unknown input key(s): {shown}")
    checked = {k: (dict(v) if isinstance(v, dict) else v) for k, v in DEFAULT_INPUTS.items()}
    for key, value in inputs.items():
        checked[key] = INPUT_CHECKS[key](value, key)
    return checked


class _CheckedOnUse(dict):
    """Inputs validated key by key when first read (an input the options do not use is
    stored but neither read nor checked)."""

    def __init__(self, raw):
        super().__init__()
        if not isinstance(raw, dict):
            raise InputError(f"study inputs must be a dict, not {type(raw).__name__}")
        unknown = sorted(str(k)[:40] for k in raw if k not in INPUT_CHECKS)
        if unknown:
            raise InputError(f"unknown input key(s): {', '.join(map(repr, unknown[:5]))}")
        self._raw = raw

    def __missing__(self, key):
        value = self._raw.get(key, DEFAULT_INPUTS[key])
        checked = INPUT_CHECKS[key](dict(value) if isinstance(value, dict) else value, key)
        self[key] = checked
        return checked


def make_fluid(inputs: dict, cache: dict | None = None) -> Fluid:
    """The Fluid of a study's inputs (a pure fluid's name or a composition), cached by spec.

    Parameters
    ----------
    inputs : dict
        Validated inputs (:func:`validate_inputs`).
    cache : dict, optional
        Fluids by their spec, reused between calls (at most 17 kept).

    Returns
    -------
    Fluid
    """
    if inputs["fluid_kind"] == "pure":
        key = ("pure", inputs["fluid_name"])
    else:
        key = ("mixture", tuple(sorted(inputs["composition"].items())),
               inputs["composition_basis"])
    if cache is not None and key in cache:
        return cache[key]
    if key[0] == "pure":
        name = inputs["fluid_name"]
        if name not in available_fluids():
            raise InputError(f"fluid {name!r} is not in the list of pure fluids: pick one "
                             "from the list")
        fluid = Fluid(name)
    else:
        fluid = Fluid(dict(inputs["composition"]), basis=inputs["composition_basis"])
    if cache is not None:
        if len(cache) > 16:
            cache.clear()
        cache[key] = fluid
    return fluid


def _state(fluid, inputs, prefix):
    P = inputs[f"{prefix}_pressure_Pa"]
    try:
        if inputs[f"{prefix}_given"] == "quality":
            return fluid.state(P=P, x=inputs[f"{prefix}_quality"])
        return fluid.state(P=P, T=inputs[f"{prefix}_temperature_K"])
    except WorkbenchError as exc:
        raise type(exc)(f"{prefix} state: {exc}") from None


def mass_flow_from_case(fluid: Fluid, inlet, inputs: dict) -> float:
    """Mass flow [kg/s] of a study: given, from the inlet volume flow, or from the standard
    volume flow (15 degC, 1.01325 bar, ISO 13443).

    The conversion is :func:`workbench.machines.flows.mass_flow_from`, the one used by the
    batch too.

    Parameters
    ----------
    fluid : Fluid
        The fluid of the study.
    inlet : State
        Static inlet state (its density converts the inlet volume flow).
    inputs : dict
        Validated inputs (``flow_given``, ``mass_flow_kg_per_s``, ``volume_flow_m3_per_s``).

    Returns
    -------
    float
        Mass flow [kg/s].
    """
    kind = {"mass flow": "mass_flow", "inlet volume flow": "volume_flow"}.get(
        inputs["flow_given"], "standard_volume_flow")
    if kind == "mass_flow":
        return inputs["mass_flow_kg_per_s"]
    return mass_flow_from(
        kind, inputs["volume_flow_m3_per_s"], inlet.rho,
        standard_density(fluid) if kind == "standard_volume_flow" else None)


def machine_study(inputs: dict, cache: dict | None = None):
    """Energy balance of one machine described by a study's inputs.

    Parameters
    ----------
    inputs : dict
        Keys of :data:`DEFAULT_INPUTS` (SI values; missing keys take the defaults).  Each
        input the chosen options use is checked by the input boundary
        (:data:`INPUT_CHECKS`) when it is read; inputs they do not use are not read.
    cache : dict, optional
        Fluid objects by spec, reused between calls.

    Returns
    -------
    MachineResult
        From :func:`workbench.machines.energy_balance`.

    Raises
    ------
    WorkbenchError
        Bad inputs (named), states the property model cannot give, a balance the core
        refuses.

    References
    ----------
    ASME PTC 10-1997 (energy balance of a compressor from measured states).

    Examples
    --------
    >>> r = machine_study({"machine": "compressor", "outlet_fixed_by": "measured power",
    ...                    "power_W": 1.2e5})
    >>> round(r.power)
    120000
    """
    inputs = inputs if isinstance(inputs, _CheckedOnUse) else _CheckedOnUse(inputs)
    fluid = make_fluid(inputs, cache)
    inlet = _state(fluid, inputs, "inlet")
    mode = inputs["outlet_fixed_by"]
    kwargs = {}
    outlet = None
    if mode == "measured outlet":
        outlet = _state(fluid, inputs, "outlet")
    else:
        kwargs["P_out"] = inputs["outlet_pressure_Pa"]
        if mode == "isentropic efficiency":
            kwargs["isentropic_efficiency"] = inputs["isentropic_efficiency"]
        elif mode == "polytropic efficiency":
            kwargs["polytropic_efficiency"] = inputs["polytropic_efficiency"]
        else:
            kwargs["power"] = inputs["power_W"]
    mass_flow = mass_flow_from_case(fluid, inlet, inputs)
    if inputs["velocity_given"] == "velocities":
        kwargs["velocity_in"] = inputs["velocity_in_m_per_s"]
        kwargs["velocity_out"] = inputs["velocity_out_m_per_s"]
    else:
        kwargs["diameter_in"] = inputs["diameter_in_m"]
        kwargs["diameter_out"] = inputs["diameter_out_m"]
    return energy_balance(
        inputs["machine"], inlet, outlet, mass_flow=mass_flow,
        elevation_change=inputs["elevation_change_m"], heat_loss=inputs["heat_loss_W"],
        mechanical_efficiency=inputs["mechanical_efficiency"],
        basis=inputs["efficiency_basis"], **kwargs)


#: Result fields of a machine study that are not attributes of the result: field name ->
#: getter.  (The result's own ``pressure_ratio`` is quoted higher over lower pressure, so a
#: turbine shows its expansion ratio, as :data:`workbench.fields.FIELDS` says.)
_DERIVED = {
    "outlet_pressure": lambda r: r.outlet.P,
    "outlet_temperature": lambda r: r.outlet.T,
    "outlet_quality": lambda r: r.outlet.quality,
    "inlet_pressure": lambda r: r.inlet.P,
    "inlet_temperature": lambda r: r.inlet.T,
    "inlet_quality": lambda r: r.inlet.quality,
}


def result_values(result, names) -> dict:
    """Values [SI] of the named result fields (:data:`workbench.fields.FIELDS`) of a result.

    Parameters
    ----------
    result : MachineResult
        A study's result.
    names : sequence of str
        Field names.

    Returns
    -------
    dict
        Field name -> float (NaN where the field has no value, e.g. the quality of a gas).

    Raises
    ------
    WorkbenchError
        When a field's calculation fails (e.g. the polytropic path cannot be integrated).
    """
    from .fields import field

    values = {}
    for name in names:
        field(name)  # a KeyError names an unknown field
        get = _DERIVED.get(name)
        value = get(result) if get is not None else getattr(result, name)
        values[name] = math.nan if value is None else float(value)
    return values


@dataclass(frozen=True)
class SweepResult:
    """A sweep of one input of a study.

    Attributes
    ----------
    variable : str
        The swept input (a key of :data:`SWEEP_VARIABLES`).
    kind : str
        Its kind of quantity (``"dimensionless"`` for efficiencies).
    values : numpy.ndarray
        The swept values [SI].
    columns : dict
        Result field name -> numpy.ndarray [SI], NaN where the point failed.
    failures : tuple
        ``(index, message)`` of every point that failed.
    """

    variable: str
    kind: str
    values: np.ndarray
    columns: dict
    failures: tuple


def sweep_values(start, stop, points) -> np.ndarray:
    """``points`` evenly spaced values from ``start`` to ``stop`` [SI], validated."""
    start = to_si(start, "dimensionless", "sweep start")
    stop = to_si(stop, "dimensionless", "sweep end")
    n = count(points, "sweep points", low=2, high=MAX_SWEEP_POINTS)
    return np.linspace(start, stop, n)


def sweep(inputs: dict, variable: str, values, names=("power",),
          cache: dict | None = None) -> SweepResult:
    """Vary one input of a study over ``values`` and collect result fields.

    A point that fails (an impossible state, a refused balance) is a gap (NaN) with its
    message in ``failures``; a bad setting of the sweep itself raises.

    Parameters
    ----------
    inputs : dict
        The study's inputs (see :func:`machine_study`).
    variable : str
        Key of :data:`SWEEP_VARIABLES`; sweeping a number selects the choices that use it
        (sweeping the isentropic efficiency fixes the outlet by it).
    values : sequence of float
        Values of the variable [SI], at most 200.
    names : sequence of str
        Result field names (:data:`workbench.fields.FIELDS`) to collect.
    cache : dict, optional
        Fluid objects reused between points.

    Returns
    -------
    SweepResult

    Examples
    --------
    >>> s = sweep({}, "outlet-pressure", [2e5, 3e5], names=("power",))
    >>> bool(s.columns["power"][1] > s.columns["power"][0])
    True
    """
    from .fields import field
    from .units import to_si_array

    name = choice(variable, SWEEP_INPUTS, "sweep variable")
    key, kind, selects = SWEEP_VARIABLES[name]
    values = to_si_array(values, "dimensionless", f"values of {name}", allow_nan=False)
    if not 1 <= values.size <= MAX_SWEEP_POINTS:
        raise InputError(f"a sweep has 1 to {MAX_SWEEP_POINTS} points, not {values.size}")
    names = tuple(names) or ("power",)
    for n in names:
        try:
            field(n)
        except KeyError:
            raise InputError(f"result field {n!r} is not in workbench.fields.FIELDS") from None
    if not isinstance(inputs, dict):
        raise InputError(f"study inputs must be a dict, not {type(inputs).__name__}")
    base = {**inputs, **selects}
    columns = {n: np.full(values.size, math.nan) for n in names}
    failures = []
    for i, value in enumerate(values):
        trial = dict(base)
        trial[key] = float(value)
        try:
            row = result_values(machine_study(trial, cache), names)
        except WorkbenchError as exc:
            failures.append((i, str(exc)))
            continue
        for n in names:
            columns[n][i] = row[n]
    return SweepResult(name, kind, values, columns, tuple(failures))


def _arrays(states):
    """(s, h, T) arrays [SI] of a list of states; ``None`` entries become NaN."""
    rows = [(st.s, st.h, st.T) if st is not None else (math.nan,) * 3 for st in states]
    arr = np.array(rows, dtype=float).reshape(-1, 3)
    return arr[:, 0], arr[:, 1], arr[:, 2]


def process_series(result, path_steps: int = 12, dome_points: int = 40,
                   isobar_points: int = 16) -> dict:
    """Points of a result's h-s and T-s charts [SI], as ``(s, h, T)`` arrays.

    Keys: ``"dome"`` (a pure fluid's saturation dome, a mixture's dew line), ``"inlet
    isobar"``, ``"outlet isobar"``, ``"path"`` (the polytropic path from inlet to outlet
    pressure), ``"isentropic"`` (inlet to isentropic outlet), ``"ends"`` (inlet, outlet),
    ``"iso end"`` (isentropic outlet), and ``"dome label"`` (the legend name of the dome).

    Parameters
    ----------
    result : MachineResult
        A study's result.
    path_steps, dome_points, isobar_points : int
        Points of the path, the dome and each isobar.

    Returns
    -------
    dict

    References
    ----------
    ASME PTC 10-1997 (the polytropic path of a compression).
    """
    from .polytropic import polytropic_path

    fluid = result.inlet.fluid
    a, b, iso = result.inlet, result.outlet, result.isentropic_outlet
    s_lo, s_hi = min(a.s, b.s, iso.s), max(a.s, b.s, iso.s)
    span = max(s_hi - s_lo, 1.0)
    s_lo, s_hi = s_lo - 0.15 * span, s_hi + 0.15 * span
    try:
        path = polytropic_path(a, b.P, result.polytropic_efficiency, path_steps)
    except WorkbenchError:
        path = [a]
    return {
        "dome": _arrays(fluid.saturation_curve(dome_points)),
        "inlet isobar": _arrays(fluid.isobar(float(a.P), s_lo, s_hi, isobar_points)),
        "outlet isobar": _arrays(fluid.isobar(float(b.P), s_lo, s_hi, isobar_points)),
        "path": _arrays(path),
        "isentropic": _arrays([a, iso]),
        "ends": _arrays([a, b]),
        "iso end": _arrays([iso]),
        "dome label": "dew line" if fluid.is_mixture else "saturation dome",
    }




def pure_fluid_names() -> list[str]:
    """Names of the pure fluids a study can use (CoolProp's list)."""
    return list(available_fluids())


def normalise_composition(composition: dict) -> dict:
    """Mole or mass fractions scaled to sum to 1 (components named as given)."""
    from .properties import normalise_fractions

    return normalise_fractions(dict(composition))


__all__ = ["DEFAULT_INPUTS", "INPUT_CHECKS", "SWEEP_INPUTS", "SWEEP_VARIABLES", "SweepResult",
           "machine_study", "make_fluid", "mass_flow_from_case", "normalise_composition",
           "process_series", "pure_fluid_names", "result_values", "sweep", "sweep_values",
           "validate_inputs"]
