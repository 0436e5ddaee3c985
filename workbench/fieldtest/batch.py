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

Speed: the cheap results (:data:`ARRAY_RESULTS`) are computed for the whole frame at once
with the array flashes of :class:`workbench.Fluid` (``states_PT``/``states_Ph``/``states_Ps``)
and the balance kernel of the core (:func:`workbench.machines.balance.steady_flow`, the same
equations and checks as the single-point API, over arrays); a row the kernel refuses or whose
state is not found goes through the single-point API, which gives its status and message.
Steam and water on IAPWS-IF97 are evaluated by the release's equations over whole arrays;
a mixture gets a property table over the frame's pressures and temperatures, clear of its
phase envelope (:mod:`workbench.properties.fast`).  The ``path`` column says which rows
came from the table (``"table"``, within :data:`workbench.properties.fast.EFFICIENCY_TOLERANCE`
in isentropic efficiency of the single-point API) and which are exact (``"exact"``);
``result.attrs["tolerance"]`` states the tolerances.  Rows a table cannot vouch for (outside
it, near the dew line, an efficiency bound above the tolerance or near a check's limit) are
exact.  The costly results go row by row: one :class:`workbench.Fluid` (one
property-library state object) serves every row; the
standard density for standard volume flows is computed once; rows with identical readings
(a historian repeating its last value) are solved once; the cheap checks (missing cells,
non-positive absolute pressures, missing flow) are vectorised over the frame before the row
loop; results that need extra work (polytropic efficiency and head by path integration, Schultz
values) are read only when asked for, because :class:`workbench.MachineResult` computes them
lazily.  A dask DataFrame is evaluated partition by partition (see
:mod:`workbench.fieldtest.dask_batch`).  An optional ``progress(done_rows, total_rows)``
callback follows a pandas evaluation (a progress bar).

The result columns are fields of :data:`workbench.fields.FIELDS` (SI units there);
:func:`with_unit_headers` gives a table CSV headers with units.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 6-2004, Steam Turbines.
ISO 13443:1996, Natural gas - Standard reference conditions.
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd

from .. import errors
from ..fields import headers
from ..machines import balance
from ..machines.flows import mass_flow_from, standard_density
from ..machines.turbomachine import energy_balance
from ..properties import fast
from ..units import MAX_MAGNITUDE, MIN_MAGNITUDE
from . import dask_batch
from .options import (
    ARRAY_RESULTS,
    DEFAULT_RESULTS,
    RESULTS,
    STANDARD_CONDITIONS,
    STATUS_FAILED,
    STATUS_INCONSISTENT,
    STATUS_INVALID,
    STATUS_MISSING,
    STATUS_NOT_NUMBER,
    STATUS_OK,
    STATUS_RANGE,
    BatchOptions,
    batch_options,
    result_columns,
)
from .readers import PROBLEM_COLUMN, column_numbers

_LABEL = {
    "inlet_pressure": "inlet pressure", "outlet_pressure": "outlet pressure",
    "inlet_temperature": "inlet temperature", "outlet_temperature": "outlet temperature",
    "mass_flow": "mass flow", "volume_flow": "volume flow",
    "standard_volume_flow": "standard volume flow", "power": "power",
}
_FLOWS = ("mass_flow", "volume_flow", "standard_volume_flow")
#: Share of the rows between two calls of a progress callback.
PROGRESS_STEP = 0.05
#: Rows evaluated together by the whole-array path.  Blocks of this size keep each array
#: (128 KiB) and the table lookups of one block near the processor's caches: on this project's
#: 2-core test machine a 200,000-row gas batch ran about 20 % faster than in one block, and
#: two processes evaluating at once (dask workers) slowed each other less.  Results do not
#: depend on it (tests/test_fieldtest_fast.py).
BLOCK_ROWS = 16_384


def evaluate(frame, machine: str = "compressor", fluid=None, *, columns: dict | None = None,
             results=DEFAULT_RESULTS, mode: str = "auto", basis: str = "static",
             mechanical_efficiency: float = 1.0,
             standard_conditions: tuple = STANDARD_CONDITIONS, keep_inputs: bool = True,
             progress=None):
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
    columns : dict of str to str, optional
        Reading name -> column name of ``frame``, for columns not named as the readings.
    results : sequence of str
        Results to compute, keys of :data:`RESULTS` (fields of :data:`workbench.fields.FIELDS`).
        Polytropic efficiency and head by path integration are costly: ask for them only when
        needed.
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
        101.325 kPa (ISO 13443, common practice for natural gas).
    keep_inputs : bool
        Keep the input columns in front of the results; an input column with the name of a
        result or of ``status``/``message`` (e.g. the measured ``power``) is kept as
        ``reading_<name>``.
    progress : callable, optional
        ``progress(done_rows, total_rows)``, called at least every 5 % of the rows and once
        at the end with ``done_rows == total_rows`` (pandas frames only; a dask frame has
        dask's own progress bars).

    Returns
    -------
    pandas.DataFrame or dask.dataframe.DataFrame
        Same index and order as ``frame``, every row; columns ``status`` (``"ok"`` or a plain
        word), ``message`` (empty when ok) and one float column per result (SI units, see
        :data:`RESULTS`), NaN for rows not computed.

    Raises
    ------
    InputError
        For a frame that is not a DataFrame, an unknown option, result or reading name, or a
        missing column; the message names the option and the allowed values.

    References
    ----------
    ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.

    Examples
    --------
    >>> import pandas as pd
    >>> frame = pd.DataFrame({"inlet_pressure": [1e5], "inlet_temperature": [300.0],
    ...                       "outlet_pressure": [2e5], "outlet_temperature": [380.0],
    ...                       "mass_flow": [2.0]})
    >>> out = evaluate(frame, "compressor", "Air", results=("isentropic_efficiency",))
    >>> out.loc[0, "status"], round(float(out.loc[0, "isentropic_efficiency"]), 3)
    ('ok', 0.819)
    """
    lazy = dask_batch.is_dask(frame)
    if not lazy and not isinstance(frame, pd.DataFrame):
        raise errors.InputError(f"readings must be a pandas or dask DataFrame, not "
                                f"{type(frame).__name__}")
    options = batch_options(machine, fluid, columns=columns, results=results, mode=mode,
                            basis=basis, mechanical_efficiency=mechanical_efficiency,
                            standard_conditions=standard_conditions, keep_inputs=keep_inputs)
    if progress is not None and not callable(progress):
        raise errors.InputError(f"progress must be a function progress(done_rows, total_rows), "
                                f"not a {type(progress).__name__}")
    if lazy:
        if progress is not None:
            raise errors.InputError("progress is for pandas frames: follow a dask frame with "
                                    "dask's progress bar (dask.diagnostics.ProgressBar)")
        return dask_batch.map_partitions(frame, evaluate_frame, options)
    return evaluate_frame(frame, options, progress)


def evaluate_dask(frame, machine: str = "compressor", fluid=None, *, columns=None,
                  results=DEFAULT_RESULTS, mode: str = "auto", basis: str = "static",
                  mechanical_efficiency: float = 1.0, standard_conditions=STANDARD_CONDITIONS,
                  keep_inputs: bool = True):
    """Evaluate a dask DataFrame of readings partition by partition (lazy).

    Parameters are those of :func:`evaluate`.

    Returns
    -------
    dask.dataframe.DataFrame
        The same columns as the pandas path; call ``.compute()`` for a pandas frame.
    """
    if not dask_batch.is_dask(frame):
        raise errors.InputError(f"readings must be a dask DataFrame, not {type(frame).__name__}")
    return evaluate(frame, machine, fluid, columns=columns, results=results, mode=mode,
                    basis=basis, mechanical_efficiency=mechanical_efficiency,
                    standard_conditions=standard_conditions, keep_inputs=keep_inputs)


def with_unit_headers(table: pd.DataFrame) -> pd.DataFrame:
    """The table with its result columns headed with their SI units, for a CSV export.

    ``"shaft_power"`` becomes ``"shaft power [W]"`` (:func:`workbench.fields.headers`);
    other columns (readings, ``status``, ``message``) keep their names.

    Examples
    --------
    >>> import pandas as pd
    >>> list(with_unit_headers(pd.DataFrame(columns=["status", "shaft_power"])).columns)
    ['status', 'shaft power [W]']
    """
    names = [c for c in table.columns if c in RESULTS]
    return table.rename(columns=dict(zip(names, headers(names))))


class _Progress:
    """Reports rows done to a ``progress(done, total)`` callback every few per cent."""

    def __init__(self, callback, total: int):
        self.callback, self.total, self.done = callback, total, 0
        self.step = max(1, math.ceil(PROGRESS_STEP * total))
        self.next = self.step

    def advance(self, rows: int) -> None:
        self.done += int(rows)
        if self.callback is not None and self.next <= self.done < self.total:
            self.callback(self.done, self.total)
            self.next = (self.done // self.step + 1) * self.step

    def finish(self) -> None:
        if self.callback is not None:
            self.callback(self.total, self.total)


def _column(frame, columns, name):
    key = columns.get(name, name)
    return key if key in frame.columns else None


def evaluate_frame(frame: pd.DataFrame, options: BatchOptions, progress=None) -> pd.DataFrame:
    """The pandas evaluation of :func:`evaluate` with checked options (also one dask partition)."""
    names = list(options.results)
    n = len(frame)
    col = {name: _column(frame, options.columns, name) for name in _LABEL}
    mode = options.mode
    if mode == "auto":
        mode = "outlet" if col["outlet_temperature"] else "power"
    required, flow_name = _required_columns(frame, col, mode, names)
    status = np.full(n, STATUS_OK, dtype=object)
    message = np.full(n, "", dtype=object)
    out = np.full((n, len(names)), np.nan)
    values = {name: _readings(frame[col[name]], name, str(col[name]), status, message)
              for name in required}
    flow = (_readings(frame[col[flow_name]], flow_name, str(col[flow_name]), status, message)
            if flow_name else np.ones(n))
    _flag_problem_notes(frame, required + ([flow_name] if flow_name else []), status, message)
    _flag_invalid(values, flow, flow_name, status, message)
    rho_standard = (standard_density(options.fluid, options.standard_conditions)
                    if flow_name == "standard_volume_flow" else None)
    readings = (values["inlet_pressure"], values["inlet_temperature"],
                values["outlet_pressure"],
                values["outlet_temperature"] if mode == "outlet" else values["power"], flow)
    todo = np.flatnonzero(status == STATUS_OK)
    tracker = _Progress(progress, n)
    tracker.advance(n - len(todo))
    path = np.full(n, fast.PATH_EXACT, dtype=object)
    if (set(names) <= set(ARRAY_RESULTS) and len(todo)
            and _prepare_fast(options.fluid, mode, readings, todo)):
        # Whole-array flashes and the kernel (pure fluids; mixtures with a property table);
        # the rows the arrays cannot settle (a reading the core would refuse, a state not
        # found, a tabulated row too near a limit) go through the single-point API below,
        # which gives their status and message.
        size = min(BLOCK_ROWS, len(todo) if progress is None else tracker.step)
        unsettled = []
        for start in range(0, len(todo), size):
            chunk = todo[start:start + size]
            computed, settled, tabulated = _evaluate_arrays(
                options, mode, names, *(r[chunk] for r in readings), flow_name, rho_standard)
            out[chunk[settled]] = computed[settled]
            path[chunk[tabulated]] = fast.PATH_TABLE
            unsettled.append(chunk[~settled])
            tracker.advance(int(settled.sum()))
        todo = np.concatenate(unsettled)
    _evaluate_rows(options, mode, names, readings, flow_name, rho_standard, todo,
                   status, message, out, tracker)
    tracker.finish()
    result = pd.DataFrame(out, index=frame.index, columns=names)
    result.insert(0, "path", pd.Series(path, index=frame.index, dtype=object))
    result.insert(0, "message", pd.Series(message, index=frame.index, dtype=object))
    result.insert(0, "status", pd.Series(status, index=frame.index, dtype=object))
    if options.keep_inputs:
        clash = {c: f"reading_{c}" for c in frame.columns if c in result.columns}
        result = pd.concat([frame.rename(columns=clash), result], axis=1)
    result.attrs["tolerance"] = _tolerance_note(options.fluid, path)
    return result


def _required_columns(frame, col, mode, names):
    """Readings the mode needs and the flow reading used; refuses missing columns by name."""
    required = ["inlet_pressure", "inlet_temperature", "outlet_pressure"]
    required.append("outlet_temperature" if mode == "outlet" else "power")
    absent = [name for name in required if col[name] is None]
    flow_name = next((f for f in _FLOWS if col[f]), None)
    if flow_name is None and (mode == "power" or any(
            r in names for r in ("power", "shaft_power", "mass_flow", "inlet_volume_flow"))):
        absent.append("mass_flow (or volume_flow or standard_volume_flow)")
    if absent:
        raise errors.InputError(
            f"the readings have no column for {', '.join(absent)} (columns: "
            f"{', '.join(map(str, frame.columns))}); map them with columns=")
    return required, flow_name


def _readings(series, name, source, status, message):
    """A reading column as floats; text cells flag their row ``not a number``."""
    if pd.api.types.is_numeric_dtype(series) and not pd.api.types.is_bool_dtype(series):
        return series.to_numpy(dtype=float, na_value=np.nan)
    # text in a number column of a frame that did not come through the readers
    values, notes = column_numbers(series, name, source)
    for i, note in enumerate(notes):
        if note and "not a number" in note and status[i] == STATUS_OK:
            status[i], message[i] = STATUS_NOT_NUMBER, note
    return values


def _flag_problem_notes(frame, used_names, status, message):
    """The readers' own notes flag a row, where they are about readings this evaluation uses."""
    if PROBLEM_COLUMN not in frame.columns:
        return
    used = tuple(_LABEL[name] + " reading" for name in used_names)
    notes = frame[PROBLEM_COLUMN].fillna("").astype(str).to_numpy(dtype=object)
    for i in np.flatnonzero(notes != ""):
        relevant = [note for note in notes[i].split("; ") if note.startswith(used)]
        if relevant:
            text = "; ".join(relevant)
            status[i] = STATUS_NOT_NUMBER if "not a number" in text else STATUS_MISSING
            message[i] = text


def _flag_invalid(values, flow, flow_name, status, message):
    """Vectorised checks: missing cells, non-finite numbers, non-positive pressures and flows.

    The first check that fails flags a row; the masks are computed over whole columns and
    only the (rare) rows flagged are visited one by one for their messages (``template``
    formatted with the row's reading ``v``)."""
    checked = dict(values)
    if flow_name:
        checked[flow_name] = flow
    ok = status == STATUS_OK

    def flag(mask, code, data, template):
        for i in np.flatnonzero(mask & ok):
            status[i], message[i] = code, template.format(v=data[i])
            ok[i] = False

    for name, data in checked.items():
        label = _LABEL[name]
        # NaN, infinity and magnitudes beyond the input boundary's (1e300 Pa)
        beyond = ~(np.abs(data) <= MAX_MAGNITUDE)
        flag(beyond & np.isnan(data), STATUS_MISSING, data, f"{label} reading is missing")
        flag(beyond, STATUS_INVALID, data, f"{label} reading {{v:g}} is not a finite number "
             f"of magnitude at most {MAX_MAGNITUDE:g} (SI)")
        # magnitudes below the input boundary's smallest (1e-300 W): refused as it refuses them
        flag((data != 0) & (np.abs(data) < MIN_MAGNITUDE), STATUS_INVALID, data,
             f"{label} reading {{v:g}} (SI) is too small to be meaningful: give 0 or a "
             f"magnitude of at least {MIN_MAGNITUDE:g}")
    for name in ("inlet_pressure", "outlet_pressure"):
        data = values[name]
        flag(data <= 0, STATUS_INVALID, data / 1e5,
             f"{_LABEL[name]} {{v:.6g}} bar (absolute) is not positive: an absolute pressure "
             "must be above zero (check the gauge/absolute unit and the transmitter)")
    for name in ("inlet_temperature", "outlet_temperature"):
        if values.get(name) is not None:
            flag(values[name] <= 0, STATUS_INVALID, values[name],
                 f"{_LABEL[name]} {{v:.6g}} K is not above absolute zero: check the "
                 "temperature unit")
    if flow_name:
        flag(flow <= 0, STATUS_INVALID, flow, f"{_LABEL[flow_name]} {{v:.6g}} (SI) must be "
             "positive")


def _evaluate_arrays(options, mode, names, p1, t1, p2, second, flow, flow_name,
                     rho_standard):
    """Energy balance of many rows at once (pure fluids, no kinetic or heat terms).

    Array flashes and the balance kernel (:func:`workbench.machines.balance.steady_flow`),
    the same equations and checks as the single-point API.  Returns the result columns and
    the mask of rows settled; a row is left unsettled (for the single-point API) whenever a
    state is not found or the kernel refuses it.
    """
    fluid, machine, eta_m = options.fluid, options.machine, options.mechanical_efficiency
    inlet = fluid.states_PT(p1, t1)
    m = mass_flow_from(flow_name or "mass_flow", flow, inlet.rho, rho_standard)
    with np.errstate(invalid="ignore"):
        ok = inlet.valid & fluid.pressure_ok(p2) & (
            balance.pressure_refusal(machine, p1, p2, inlet.phase) == balance.OK)
        if mode == "power":
            ok &= second > 0  # the core refuses a measured power of zero or below
    p2_ok = np.where(ok, p2, np.nan)  # no flash for a row already refused
    iso = fluid.states_Ps(p2_ok, inlet.s)
    if mode == "outlet":
        outlet = fluid.states_PT(p2_ok, second)
    else:  # the measured power is at the shaft
        h2 = balance.outlet_enthalpy_from_power(machine, inlet.h, second, m, eta_m)
        with np.errstate(invalid="ignore"):  # beyond the input boundary: single-point API
            outlet = fluid.states_Ph(p2_ok, np.where(np.abs(h2) <= MAX_MAGNITUDE, h2, np.nan))
    b = balance.steady_flow(machine, inlet, outlet, iso, mass_flow=m,
                            mechanical_efficiency=eta_m, basis=options.basis)
    settled = ok & (b.refusal == balance.OK)
    tabulated = _tabulated_rows(fluid, inlet, outlet, iso, b, settled)
    nan = np.full(len(p1), np.nan)
    with np.errstate(invalid="ignore", divide="ignore"):
        columns = {
            "power": b.power, "shaft_power": b.shaft_power, "specific_work": b.specific_work,
            "isentropic_efficiency": b.isentropic_efficiency,
            "isentropic_head": b.isentropic_head, "pressure_ratio": b.pressure_ratio,
            "outlet_temperature": outlet.T, "outlet_quality": outlet.x,
            "mass_flow": m * np.ones(len(p1)), "inlet_volume_flow": m / inlet.rho,
            "pump_head": b.isentropic_head / balance.STANDARD_GRAVITY,
            # rows rated from their measured outlet temperature only
            "outlet_temperature_sensitivity": (balance.temperature_sensitivity(
                b.isentropic_efficiency, outlet.cp, b.enthalpy_change) if mode == "outlet"
                else nan),
        }
    return np.column_stack([columns[name] for name in names]), settled, tabulated


# ---- fast path (workbench/properties/fast.py): which rows a property table computed -------
def _prepare_fast(fluid, mode, readings, todo) -> bool:
    """Build (or reuse) a mixture's property table over the rows' states; True when the
    whole-array path runs for this fluid (pure fluids always; mixtures with a table)."""
    if not fluid.is_mixture:
        return True
    p1, t1, p2, second, _ = readings
    temperatures = (t1[todo], second[todo]) if mode == "outlet" else (t1[todo],)
    table = fast.prepare(fluid, np.concatenate([p1[todo], p2[todo]]),
                         np.concatenate(temperatures))
    return table is not None


def _tabulated_rows(fluid, inlet, outlet, iso, b, settled):
    """Rows whose states came from a property table.  ``settled`` is cleared (in place) for
    tabulated rows whose efficiency bound (:func:`workbench.properties.fast.efficiency_bound`)
    exceeds the tolerance or reaches a limit of the kernel's checks: the single-point API
    computes them."""
    masks = [a.tabulated for a in (inlet, outlet, iso)]
    if all(mask is None for mask in masks):
        return np.zeros(len(settled), dtype=bool)
    t_in, t_out, t_iso = (np.zeros(len(settled), bool) if m is None else m for m in masks)
    tabulated = t_in | t_out | t_iso
    eta = b.isentropic_efficiency_static
    bound = fast.efficiency_bound(b.enthalpy_change, iso.T, t_in, t_out, t_iso,
                                  fast.active_table(fluid))
    with np.errstate(invalid="ignore"):
        near = ((bound > fast.EFFICIENCY_TOLERANCE)
                | (eta + bound > 1 + balance.EFFICIENCY_TOLERANCE) | (eta <= bound))
    settled &= ~(tabulated & near)
    return tabulated & settled


def _tolerance_note(fluid, path) -> dict:
    """What the ``path`` column means and the tolerance the tabulated rows hold."""
    note = {fast.PATH_EXACT: "the single-point API's flashes (steam and water on IAPWS-IF97: "
                             "the same equations evaluated over arrays, to rounding)"}
    table = fast.active_table(fluid) if (path == fast.PATH_TABLE).any() else None
    if table is not None:
        note[fast.PATH_TABLE] = {
            "isentropic_efficiency": fast.EFFICIENCY_TOLERANCE,
            **{f"table_{k}": v for k, v in table.tolerance.items()},
            "table_measured": dict(table.max_error)}
    return note


def _evaluate_rows(options, mode, names, readings, flow_name, rho_standard, todo, status,
                   message, out, tracker):
    """Rows through the single-point API (mixtures, costly results, rows the arrays left)."""
    fluid, machine = options.fluid, options.machine
    p1, t1, p2, second, flow = readings
    done: dict = {}  # identical readings (a historian repeating its last value) solved once
    for i in todo:
        tracker.advance(1)
        key = (p1[i], t1[i], p2[i], second[i], flow[i])
        if key in done:
            status[i], message[i], out[i] = done[key]
            continue
        try:
            inlet = fluid.state_PT(float(p1[i]), float(t1[i]))
            m = mass_flow_from(flow_name or "mass_flow", float(flow[i]), inlet.rho,
                               rho_standard)
            common = dict(mass_flow=m, basis=options.basis,
                          mechanical_efficiency=options.mechanical_efficiency)
            if mode == "outlet":
                outlet = fluid.state_PT(float(p2[i]), float(second[i]))
                result = energy_balance(machine, inlet, outlet, **common)
            else:
                result = energy_balance(machine, inlet, P_out=float(p2[i]),
                                        power=float(second[i]), **common)
            out[i] = [getattr(result, name) for name in names]
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


__all__ = ["ARRAY_RESULTS", "DEFAULT_RESULTS", "PROGRESS_STEP", "RESULTS",
           "STANDARD_CONDITIONS", "STATUS_FAILED", "STATUS_INCONSISTENT", "STATUS_INVALID",
           "STATUS_MISSING", "STATUS_NOT_NUMBER", "STATUS_OK", "STATUS_RANGE", "evaluate",
           "evaluate_dask", "evaluate_frame", "result_columns", "with_unit_headers"]
