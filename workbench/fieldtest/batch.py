"""Batch evaluation of field-test readings: one result row per reading row.

:func:`evaluate` turns every row of a frame of readings (SI columns named as in
:data:`workbench.fieldtest.readers.READING_KINDS`) into the results the user asks for, by the
single-point energy balance of the core (:func:`workbench.compressor`, :func:`workbench.turbine`,
:func:`workbench.pump`, :func:`workbench.fan`), in rating mode from a measured outlet
temperature or, when no outlet temperature is given, from the measured shaft power.

Every input row gives exactly one output row, in the same order and with the same index.  A row
whose readings are missing, not numbers or inconsistent gets a ``status`` and the project's
``message`` (the text of the error the core raised, which names the input, the value and the
allowed range), and its result columns are NaN; the other rows are computed.

Speed: for pure fluids (steam on IAPWS-IF97, water, air, refrigerants) the cheap results
(:data:`ARRAY_RESULTS`) are computed for the whole frame at once with the array flashes of
:class:`workbench.Fluid` (``states_PT``/``states_Ph``/``states_Ps``) and the same equations
and checks as the core; a row the arrays cannot settle (a reading the core would refuse, a
state not found) goes through the single-point API, which gives its status and message.
Mixtures and the costly results go row by row: one :class:`workbench.Fluid` (one
property-library state object) serves every row; the
standard density for standard volume flows is computed once; rows with identical readings
(a historian repeating its last value) are solved once; the cheap checks (missing cells,
non-positive absolute pressures, missing flow) are vectorised over the frame before the row
loop; results that need extra work (polytropic efficiency and head by path integration, Schultz
values) are read only when asked for, because :class:`workbench.MachineResult` computes them
lazily.  A dask DataFrame is evaluated partition by partition (see
:mod:`workbench.fieldtest.dask_batch`).

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 6-2004, Steam Turbines.
ISO 13443:1996, Natural gas - Standard reference conditions.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from .. import errors
from ..machines.turbomachine import STANDARD_GRAVITY, energy_balance
from ..properties import Fluid
from .readers import PROBLEM_COLUMN, _numbers

#: Result name -> (unit, how to read it from a MachineResult).  Units are SI.
RESULTS = {
    "power": ("W", lambda r: r.power),
    "shaft_power": ("W", lambda r: r.shaft_power),
    "specific_work": ("J/kg", lambda r: r.specific_work),
    "isentropic_efficiency": ("-", lambda r: r.isentropic_efficiency),
    "isentropic_head": ("J/kg", lambda r: r.isentropic_head),
    "polytropic_efficiency": ("-", lambda r: r.polytropic_efficiency),
    "polytropic_head": ("J/kg", lambda r: r.polytropic_head),
    "polytropic_efficiency_schultz": ("-", lambda r: r.polytropic_efficiency_schultz),
    "polytropic_head_schultz": ("J/kg", lambda r: r.polytropic_head_schultz),
    "schultz_factor": ("-", lambda r: r.schultz_factor),
    "pressure_ratio": ("-", lambda r: r.pressure_ratio),
    "outlet_temperature": ("K", lambda r: r.outlet.T),
    "outlet_quality": ("-", lambda r: r.outlet.quality),
    "mass_flow": ("kg/s", lambda r: r.mass_flow),
    "inlet_volume_flow": ("m^3/s", lambda r: r.inlet_volume_flow),
    "pump_head": ("m", lambda r: r.isentropic_head / STANDARD_GRAVITY),
    # efficiency change per kelvin of measured outlet temperature (rows rated from it)
    "outlet_temperature_sensitivity": ("1/K", lambda r: r.outlet_temperature_sensitivity),
}

#: Results computed when the caller does not choose (all cheap: no path integration).
DEFAULT_RESULTS = ("power", "shaft_power", "isentropic_efficiency", "isentropic_head",
                   "pressure_ratio", "outlet_temperature", "mass_flow")

#: Standard reference conditions for standard volume flows: 15 degC, 101.325 kPa
#: (ISO 13443, common practice for natural gas).
STANDARD_CONDITIONS = (288.15, 101325.0)

#: Row status words.
STATUS_OK = "ok"
STATUS_MISSING = "missing reading"
STATUS_NOT_NUMBER = "not a number"
STATUS_INVALID = "invalid reading"
STATUS_INCONSISTENT = "inconsistent readings"
STATUS_RANGE = "outside property range"
STATUS_FAILED = "failed"

_LABEL = {
    "inlet_pressure": "inlet pressure", "outlet_pressure": "outlet pressure",
    "inlet_temperature": "inlet temperature", "outlet_temperature": "outlet temperature",
    "mass_flow": "mass flow", "volume_flow": "volume flow",
    "standard_volume_flow": "standard volume flow", "power": "power",
}


#: Results the whole-array path computes (pure fluids); others go row by row.
ARRAY_RESULTS = ("power", "shaft_power", "specific_work", "isentropic_efficiency",
                 "isentropic_head", "pressure_ratio", "outlet_temperature", "outlet_quality",
                 "mass_flow", "inlet_volume_flow", "pump_head",
                 "outlet_temperature_sensitivity")


def _evaluate_arrays(machine, fluid, mode, mechanical_efficiency, names, p1, t1, p2, second,
                     flow, flow_name, rho_standard):
    """Energy balance of many rows at once (pure fluids, no kinetic or heat terms).

    The same equations and checks as :func:`workbench.machines.turbomachine.energy_balance`
    with zero velocities, elevation change and heat loss, over arrays.  Returns the result
    columns and the mask of rows settled; a row is left unsettled (for the single-point API)
    whenever a state is not found or any check of the core would refuse it.
    """
    raises = machine != "turbine"
    eta_m = float(mechanical_efficiency)
    inlet = fluid.states_PT(p1, t1)
    if flow_name == "volume_flow":
        m = flow * inlet.rho
    elif flow_name == "standard_volume_flow":
        m = flow * rho_standard
    else:
        m = flow
    with np.errstate(invalid="ignore"):
        ok = inlet.valid & (p2 > p1 if raises else p2 < p1) & fluid.pressure_ok(p2)
        ok &= np.abs(p2 - p1) > 1e-9 * p1
        if mode == "power":
            ok &= second >= 0  # the core wants the measured power as a positive magnitude
        if machine == "pump":
            ok &= ~np.isin(inlet.phase, ("gas", "two-phase"))
        if not 0.0 < eta_m <= 1.0:
            ok[:] = False
    iso = fluid.states_Ps(np.where(ok, p2, np.nan), inlet.s)
    if mode == "outlet":
        outlet = fluid.states_PT(np.where(ok, p2, np.nan), second)
    else:
        # w_in = dh (no kinetic, potential or heat terms); the measured power is at the shaft
        w_fluid = second * eta_m / m if raises else second / (eta_m * m)
        outlet = fluid.states_Ph(np.where(ok, p2, np.nan), inlet.h + (w_fluid if raises
                                                                       else -w_fluid))
    ok &= iso.valid & outlet.valid
    with np.errstate(invalid="ignore", divide="ignore"):
        dh = outlet.h - inlet.h
        work = dh if raises else -dh
        # static isentropic efficiency, compression (h2s - h1)/(h2 - h1), expansion
        # (h1 - h2)/(h1 - h2s)
        if raises:
            eta = (iso.h - inlet.h) / dh
        else:
            eta = (inlet.h - outlet.h) / (inlet.h - iso.h)
        ok &= (work > 0) & (eta > 0) & (eta <= 1 + 1e-9)
        fluid_power = work * m
        head = np.abs(iso.h - inlet.h)
        columns = {
            "power": fluid_power,
            "shaft_power": fluid_power / eta_m if raises else fluid_power * eta_m,
            "specific_work": work,
            "isentropic_efficiency": eta,
            "isentropic_head": head,
            "pressure_ratio": outlet.P / inlet.P,
            "outlet_temperature": outlet.T,
            "outlet_quality": outlet.x,
            "mass_flow": m * np.ones(len(p1)),
            "inlet_volume_flow": m / inlet.rho,
            "pump_head": head / STANDARD_GRAVITY,
            # d(eta)/dT2 = -eta cp2 / (h2 - h1), single-phase outlet, rated from its temperature
            "outlet_temperature_sensitivity": (np.abs(eta * outlet.cp / dh) if mode == "outlet"
                                               else np.full(len(p1), np.nan)),
        }
    return np.column_stack([columns[name] for name in names]), ok


def _is_dask(frame) -> bool:
    return type(frame).__module__.split(".")[0] in ("dask", "dask_expr")


def _column(frame, columns, name):
    key = columns.get(name, name)
    return key if key in frame.columns else None


def _resolve_fluid(fluid) -> Fluid:
    if isinstance(fluid, Fluid):
        return fluid
    if fluid is None:
        raise errors.InputError("fluid is needed: a Fluid, a fluid name or a composition")
    return Fluid(fluid)


def result_columns(results) -> list[str]:
    """Names of the result columns for a choice of results (checks the names)."""
    results = tuple(results)
    unknown = [r for r in results if r not in RESULTS]
    if unknown:
        raise errors.InputError(f"unknown result(s) {', '.join(map(repr, unknown))}: choose from "
                                f"{', '.join(RESULTS)}")
    return list(results)


def evaluate(frame, machine: str = "compressor", fluid=None, *, columns: dict | None = None,
             results=DEFAULT_RESULTS, mode: str = "auto", basis: str = "static",
             mechanical_efficiency: float = 1.0,
             standard_conditions: tuple = STANDARD_CONDITIONS, keep_inputs: bool = True):
    """Evaluate every row of a frame of readings.

    Parameters
    ----------
    frame : pandas.DataFrame or dask.dataframe.DataFrame
        Readings in SI units (absolute pressures [Pa], temperatures [K], mass flow [kg/s],
        volume flows [m^3/s], shaft power [W]) under the names of
        :data:`workbench.fieldtest.readers.READING_KINDS`, or under other names given by
        ``columns``.  A dask frame is evaluated lazily per partition and a dask frame returned.
    machine : {"compressor", "turbine", "pump", "fan"}
        Machine kind.
    fluid : Fluid, str or dict
        The fluid (e.g. ``Fluid("Water", backend="IF97")`` for steam).
    columns : dict, optional
        Reading name -> column name of ``frame``, for columns not named as the readings.
    results : sequence of str
        Results to compute, keys of :data:`RESULTS`.  Polytropic efficiency and head by path
        integration are costly: ask for them only when needed.
    mode : {"auto", "outlet", "power"}
        ``"outlet"``: rate from the measured outlet temperature and pressure; ``"power"``: the
        outlet enthalpy follows from the measured shaft power (turbines with a wet exhaust);
        ``"auto"``: ``"outlet"`` when an outlet-temperature column exists, else ``"power"``.
    basis : {"static", "total"}
        Efficiency basis, passed to the core.
    mechanical_efficiency : float
        Mechanical efficiency [-] in (0, 1], passed to the core.
    standard_conditions : tuple of float
        (temperature [K], pressure [Pa]) of a standard volume flow; default 15 degC and
        101.325 kPa (common practice for natural gas).
    keep_inputs : bool
        Keep the input columns in front of the results; an input column with the name of a
        result or of ``status``/``message`` (e.g. the measured ``power``) is kept as
        ``reading_<name>``.

    Returns
    -------
    pandas.DataFrame or dask.dataframe.DataFrame
        Same index and order as ``frame``; columns ``status`` (``"ok"`` or a plain word),
        ``message`` (empty when ok) and one float column per result (SI units, see
        :data:`RESULTS`), NaN for rows not computed.

    References
    ----------
    ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
    """
    if _is_dask(frame):
        from .dask_batch import evaluate_dask

        return evaluate_dask(frame, machine=machine, fluid=fluid, columns=columns,
                             results=results, mode=mode, basis=basis,
                             mechanical_efficiency=mechanical_efficiency,
                             standard_conditions=standard_conditions, keep_inputs=keep_inputs)
    if not isinstance(frame, pd.DataFrame):
        raise errors.InputError(f"readings must be a pandas or dask DataFrame, not "
                                f"{type(frame).__name__}")
    if machine not in ("compressor", "turbine", "pump", "fan"):
        raise errors.InputError(f"machine {machine!r} is not one of compressor, turbine, pump, fan")
    if mode not in ("auto", "outlet", "power"):
        raise errors.InputError(f"mode must be 'auto', 'outlet' or 'power', not {mode!r}")
    names = result_columns(results)
    fluid = _resolve_fluid(fluid)
    columns = dict(columns or {})
    n = len(frame)

    col = {name: _column(frame, columns, name) for name in _LABEL}
    if mode == "auto":
        mode = "outlet" if col["outlet_temperature"] else "power"
    required = ["inlet_pressure", "inlet_temperature", "outlet_pressure"]
    required.append("outlet_temperature" if mode == "outlet" else "power")
    absent = [name for name in required if col[name] is None]
    flow_name = next((f for f in ("mass_flow", "volume_flow", "standard_volume_flow") if col[f]),
                     None)
    if flow_name is None and (mode == "power" or any(
            r in names for r in ("power", "shaft_power", "mass_flow", "inlet_volume_flow"))):
        absent.append("mass_flow (or volume_flow or standard_volume_flow)")
    if absent:
        raise errors.InputError(
            f"the readings have no column for {', '.join(absent)} (columns: "
            f"{', '.join(map(str, frame.columns))}); map them with columns=")

    status = np.full(n, STATUS_OK, dtype=object)
    message = np.full(n, "", dtype=object)
    out = np.full((n, len(names)), np.nan)

    def array(name):
        series = frame[col[name]]
        if pd.api.types.is_numeric_dtype(series) and not pd.api.types.is_bool_dtype(series):
            return series.to_numpy(dtype=float, na_value=np.nan)
        # text in a number column of a frame that did not come through the readers
        values, notes = _numbers(series, name, str(col[name]))
        for i, note in enumerate(notes):
            if note and "not a number" in note and status[i] == STATUS_OK:
                status[i], message[i] = STATUS_NOT_NUMBER, note
        return values

    values = {name: array(name) for name in required}
    flow = array(flow_name) if flow_name else np.ones(n)

    # Vectorised checks first: the file's own notes, missing cells, non-positive pressures.
    # Only notes about readings this evaluation uses flag a row.
    if PROBLEM_COLUMN in frame.columns:
        used = tuple(_LABEL[name] + " reading" for name in required + [flow_name] if name)
        notes = frame[PROBLEM_COLUMN].fillna("").astype(str).to_numpy(dtype=object)
        for i in np.flatnonzero(notes != ""):
            relevant = [note for note in notes[i].split("; ") if note.startswith(used)]
            if relevant:
                text = "; ".join(relevant)
                status[i] = STATUS_NOT_NUMBER if "not a number" in text else STATUS_MISSING
                message[i] = text
    checked = list(required) + ([flow_name] if flow_name else [])
    for name in checked:
        data = values.get(name, flow if name == flow_name else None)
        for i in np.flatnonzero(~np.isfinite(data) & (status == STATUS_OK)):
            if np.isnan(data[i]):
                status[i] = STATUS_MISSING
                message[i] = f"{_LABEL[name]} reading is missing"
            else:
                status[i] = STATUS_INVALID
                message[i] = f"{_LABEL[name]} reading {data[i]} is not a finite number"
    for name in ("inlet_pressure", "outlet_pressure"):
        data = values[name]
        for i in np.flatnonzero((data <= 0) & (status == STATUS_OK)):
            status[i] = STATUS_INVALID
            message[i] = (f"{_LABEL[name]} {data[i] / 1e5:.6g} bar (absolute) is not positive: "
                          "an absolute pressure must be above zero (check the gauge/absolute "
                          "unit and the transmitter)")
    for name in ("inlet_temperature", "outlet_temperature"):
        data = values.get(name)
        if data is None:
            continue
        for i in np.flatnonzero((data <= 0) & (status == STATUS_OK)):
            status[i] = STATUS_INVALID
            message[i] = (f"{_LABEL[name]} {data[i]:.6g} K is not above absolute zero: check "
                          "the temperature unit")
    if flow_name:
        for i in np.flatnonzero((flow <= 0) & (status == STATUS_OK)):
            status[i] = STATUS_INVALID
            message[i] = f"{_LABEL[flow_name]} {flow[i]:.6g} (SI) must be positive"

    rho_standard = None
    if flow_name == "standard_volume_flow":
        t_std, p_std = standard_conditions
        rho_standard = fluid.state_PT(float(p_std), float(t_std)).rho
    getters = [RESULTS[name][1] for name in names]
    p1, t1, p2 = values["inlet_pressure"], values["inlet_temperature"], values["outlet_pressure"]
    second = values["outlet_temperature"] if mode == "outlet" else values["power"]
    todo = np.flatnonzero(status == STATUS_OK)
    if not fluid.is_mixture and set(names) <= set(ARRAY_RESULTS) and len(todo):
        # Pure fluids: whole-array flashes; the rows the array path cannot settle (a reading
        # the core would refuse, a state not found) go through the single-point API below,
        # which gives their status and message.
        computed, settled = _evaluate_arrays(
            machine, fluid, mode, mechanical_efficiency, names, p1[todo], t1[todo], p2[todo],
            second[todo], flow[todo], flow_name, rho_standard)
        out[todo[settled]] = computed[settled]
        todo = todo[~settled]
    done: dict = {}  # identical readings (a historian repeating its last value) solved once
    for i in todo:
        key = (p1[i], t1[i], p2[i], second[i], flow[i])
        if key in done:
            status[i], message[i], out[i] = done[key]
            continue
        try:
            inlet = fluid.state_PT(float(p1[i]), float(t1[i]))
            if flow_name == "volume_flow":
                m = float(flow[i]) * inlet.rho
            elif flow_name == "standard_volume_flow":
                m = float(flow[i]) * rho_standard
            else:
                m = float(flow[i])
            if mode == "outlet":
                outlet = fluid.state_PT(float(p2[i]), float(second[i]))
                result = energy_balance(machine, inlet, outlet, mass_flow=m, basis=basis,
                                        mechanical_efficiency=mechanical_efficiency)
            else:
                result = energy_balance(machine, inlet, P_out=float(p2[i]),
                                        power=float(second[i]), mass_flow=m, basis=basis,
                                        mechanical_efficiency=mechanical_efficiency)
            out[i] = [get(result) for get in getters]
        except errors.ReadingsError as exc:
            status[i], message[i] = STATUS_INCONSISTENT, str(exc)
        except errors.PropertyError as exc:
            status[i], message[i] = STATUS_RANGE, str(exc)
        except errors.WorkbenchError as exc:
            status[i], message[i] = STATUS_INVALID, str(exc)
        except Exception as exc:  # noqa: BLE001 - never let raw library text reach a user
            status[i] = STATUS_FAILED
            message[i] = (f"the calculation of this row failed ({type(exc).__name__}); the "
                          "readings are probably outside the property model's range")
            out[i] = np.nan
        done[key] = (status[i], message[i], out[i].copy())

    result = pd.DataFrame(out, index=frame.index, columns=names)
    result.insert(0, "message", pd.Series(message, index=frame.index, dtype=object))
    result.insert(0, "status", pd.Series(status, index=frame.index, dtype=object))
    if keep_inputs:
        clash = {c: f"reading_{c}" for c in frame.columns if c in result.columns}
        result = pd.concat([frame.rename(columns=clash), result], axis=1)
    return result


__all__ = ["evaluate", "RESULTS", "ARRAY_RESULTS", "DEFAULT_RESULTS", "STANDARD_CONDITIONS", "result_columns",
           "STATUS_OK", "STATUS_MISSING", "STATUS_NOT_NUMBER", "STATUS_INVALID",
           "STATUS_INCONSISTENT", "STATUS_RANGE", "STATUS_FAILED"]
