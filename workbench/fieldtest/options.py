"""What a batch evaluation can compute and how it is asked: shared by the pandas and dask paths.

The result columns of a batch are fields of the one table of result fields
(:data:`workbench.fields.FIELDS`: name, SI unit, label, format); :data:`RESULTS` lists the
ones a batch offers.  :func:`batch_options` passes every option of
:func:`workbench.fieldtest.evaluate` through the input boundary (:mod:`workbench.units`) and
refuses a wrong one by name.

References
----------
ISO 13443:1996, Natural gas - Standard reference conditions.
"""

from __future__ import annotations

from typing import NamedTuple

from .. import errors
from ..fields import FIELDS, ResultField
from ..machines.balance import BASES, KINDS
from ..machines.flows import STANDARD_CONDITIONS
from ..properties import Fluid
from ..units import choice, flag, fraction, positive, text
from .readers import READING_KINDS

#: Result name -> its field in :data:`workbench.fields.FIELDS` (SI unit ``RESULTS[n].unit``).
#: A result is read from a :class:`workbench.MachineResult` as the attribute of that name.
RESULTS: dict[str, ResultField] = {name: FIELDS[name] for name in (
    "power", "shaft_power", "specific_work", "isentropic_efficiency", "isentropic_head",
    "polytropic_efficiency", "polytropic_head", "polytropic_efficiency_schultz",
    "polytropic_head_schultz", "schultz_factor", "pressure_ratio", "outlet_temperature",
    "outlet_quality", "mass_flow", "inlet_volume_flow", "pump_head",
    # efficiency change per kelvin of measured outlet temperature (rows rated from it) [1/K]
    "outlet_temperature_sensitivity",
)}

#: Results computed when the caller does not choose (all cheap: no path integration).
DEFAULT_RESULTS = ("power", "shaft_power", "isentropic_efficiency", "isentropic_head",
                   "pressure_ratio", "outlet_temperature", "mass_flow")

#: Results the whole-array path computes (pure fluids); others go row by row.
ARRAY_RESULTS = ("power", "shaft_power", "specific_work", "isentropic_efficiency",
                 "isentropic_head", "pressure_ratio", "outlet_temperature", "outlet_quality",
                 "mass_flow", "inlet_volume_flow", "pump_head",
                 "outlet_temperature_sensitivity")

#: Rating modes of a batch.
MODES = ("auto", "outlet", "power")

#: Row status words.
STATUS_OK = "ok"
STATUS_MISSING = "missing reading"
STATUS_NOT_NUMBER = "not a number"
STATUS_INVALID = "invalid reading"
STATUS_INCONSISTENT = "inconsistent readings"
STATUS_RANGE = "outside property range"
STATUS_FAILED = "failed"


class BatchOptions(NamedTuple):
    """The options of a batch evaluation after the input boundary.

    Attributes
    ----------
    machine : str
        Machine kind.
    fluid : Fluid
        The fluid.
    columns : dict
        Reading name -> column name.
    results : tuple of str
        Result names, keys of :data:`RESULTS`.
    mode : str
        ``"auto"``, ``"outlet"`` or ``"power"``.
    basis : str
        Efficiency basis.
    mechanical_efficiency : float
        Mechanical efficiency [-].
    standard_conditions : tuple of float
        (temperature [K], pressure [Pa]) of a standard volume flow.
    keep_inputs : bool
        Keep the input columns in front of the results.
    """

    machine: str
    fluid: Fluid
    columns: dict
    results: tuple
    mode: str
    basis: str
    mechanical_efficiency: float
    standard_conditions: tuple
    keep_inputs: bool


def resolve_fluid(fluid) -> Fluid:
    """A :class:`workbench.Fluid` from a Fluid, a fluid name or a composition dict.

    Examples
    --------
    >>> resolve_fluid("Air").name
    'Air'
    """
    if isinstance(fluid, Fluid):
        return fluid
    if fluid is None:
        raise errors.InputError("fluid is needed: a Fluid, a fluid name or a composition")
    if not isinstance(fluid, (str, dict)):
        raise errors.InputError(f"fluid must be a Fluid, a fluid name or a composition dict, "
                                f"not a {type(fluid).__name__}")
    return Fluid(fluid)


def result_columns(results) -> list[str]:
    """Names of the result columns for a choice of results (checked by name).

    ``results`` is a sequence of keys of :data:`RESULTS` (or one key).

    Examples
    --------
    >>> result_columns(("power", "isentropic_efficiency"))
    ['power', 'isentropic_efficiency']
    """
    if isinstance(results, str):
        results = (results,)
    try:
        names = list(results)
    except TypeError:
        raise errors.InputError(f"results must be a sequence of result names, not a "
                                f"{type(results).__name__}") from None
    if not names:
        raise errors.InputError(f"results is empty: name at least one result of "
                                f"{', '.join(RESULTS)}")
    unknown = [r for r in names if not isinstance(r, str) or r not in RESULTS]
    if unknown:
        raise errors.InputError(f"unknown result(s) {', '.join(map(repr, unknown))}: choose from "
                                f"{', '.join(RESULTS)}")
    doubled = sorted({r for r in names if names.count(r) > 1})
    if doubled:
        raise errors.InputError(f"result(s) {', '.join(map(repr, doubled))} asked for twice")
    return names


def _columns(columns) -> dict:
    if columns is None:
        return {}
    if not isinstance(columns, dict):
        raise errors.InputError(f"columns must be a dict of reading name -> column name, not a "
                                f"{type(columns).__name__}")
    checked = {}
    for reading, column in columns.items():
        choice(reading, READING_KINDS, "reading name in columns")
        checked[reading] = text(column, f"column name for {reading}")
    return checked


def _standard_conditions(conditions) -> tuple:
    if not isinstance(conditions, (tuple, list)) or len(conditions) != 2:
        raise errors.InputError("standard conditions must be (temperature [K], pressure [Pa]), "
                                f"not {str(conditions)[:60]}")
    return (positive(conditions[0], "temperature", "standard temperature"),
            positive(conditions[1], "pressure", "standard pressure"))


def batch_options(machine="compressor", fluid=None, *, columns=None, results=DEFAULT_RESULTS,
                  mode="auto", basis="static", mechanical_efficiency=1.0,
                  standard_conditions=STANDARD_CONDITIONS, keep_inputs=True) -> BatchOptions:
    """Every option of :func:`workbench.fieldtest.evaluate` through the input boundary.

    Raises
    ------
    InputError
        Naming the option, its value and the allowed values.

    Examples
    --------
    >>> batch_options("turbine", "Water", mode="power").mode
    'power'
    """
    return BatchOptions(
        machine=choice(machine, KINDS, "machine"),
        fluid=resolve_fluid(fluid),
        columns=_columns(columns),
        results=tuple(result_columns(results)),
        mode=choice(mode, MODES, "mode"),
        basis=choice(basis, BASES, "efficiency basis"),
        mechanical_efficiency=fraction(mechanical_efficiency, "mechanical efficiency"),
        standard_conditions=_standard_conditions(standard_conditions),
        keep_inputs=flag(keep_inputs, "keep_inputs"))


__all__ = ["ARRAY_RESULTS", "BatchOptions", "DEFAULT_RESULTS", "MODES", "RESULTS",
           "STANDARD_CONDITIONS", "STATUS_FAILED", "STATUS_INCONSISTENT", "STATUS_INVALID",
           "STATUS_MISSING", "STATUS_NOT_NUMBER", "STATUS_OK", "STATUS_RANGE", "batch_options",
           "resolve_fluid", "result_columns"]
