"""Curves case files: a pump in its system with an acceptance test, or a compressor test
converted to specified conditions, as plain JSON (SI values), validated and evaluated.

A case is a JSON object::

    {"format": "turbo-workbench curves case", "format_version": 1,
     "title": "...", "description": "...", "kind": "pump" | "fan" | "compressor",
     "curve": {...PerformanceCurve.to_dict()...},
     "system": {"fluid": "Water", "pressure": Pa, "temperature": K, "static_head": m,
                "pressure_difference": Pa, "suction_head": m or null,
                "sections": [{"diameter": m, "length": m, "roughness": m,
                              "loss_coefficient": -, "suction": bool, "name": "..."}]},
     "acceptance": {...keyword arguments of pump_acceptance...},
     "similarity": {"test": {...}, "specified": {...}, ...keyword arguments of
                    compressor_similarity...}}

``system``, ``acceptance`` and ``similarity`` are optional.  Parsing a file (text, bytes, a
path) is left to the caller (the panels use :func:`workbench.ui.cases.read_json_source`);
this module takes the parsed object, refuses unknown keys and wrong types with a
CaseFileError naming the section, and builds the objects through their validated
constructors.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from importlib import resources

import numpy as np

from ..errors import CaseFileError, InputError, ReadingsError, WorkbenchError
from ..machines.balance import STANDARD_GRAVITY
from ..properties import Fluid
from ..units import NUMBER_TEXT, RPM, choice
from .characteristic import PerformanceCurve
from .pump_acceptance import PumpAcceptanceResult, pump_acceptance
from .similarity import CompressorSimilarityResult, compressor_similarity
from .system import OperatingPoint, SystemCurve, operating_point

FORMAT_NAME = "turbo-workbench curves case"
FORMAT_VERSION = 1
_TOP = {"format", "format_version", "title", "description", "kind", "curve", "system",
        "acceptance", "similarity"}
_SYSTEM = {"fluid", "pressure", "temperature", "static_head", "pressure_difference",
           "suction_head", "sections"}
_ACCEPTANCE = {"test_flow", "test_head", "test_speed", "rated_speed", "guarantee_flow",
               "guarantee_head", "guarantee_efficiency", "guarantee_power", "test_power",
               "test_efficiency", "grade", "density", "specified_density", "fit", "degree"}
_SIMILARITY = {"test", "specified", "diameter", "width", "test_type", "method",
               "reynolds_correction", "roughness", "limits", "uncertainties", "impellers"}


@dataclass(frozen=True, eq=False)
class CurvesCaseResult:
    """A curves case, evaluated.

    Attributes
    ----------
    title, description, kind : str
    curve : PerformanceCurve
    system : SystemCurve or None
    operating_point : OperatingPoint or None
        Where the curve meets the system (pumps and fans with a system).
    acceptance : PumpAcceptanceResult or None
    similarity : CompressorSimilarityResult or None
    data : dict
        The validated case as given (SI values), for saving back.
    """

    title: str
    description: str
    kind: str
    curve: PerformanceCurve
    system: SystemCurve | None = None
    operating_point: OperatingPoint | None = None
    acceptance: PumpAcceptanceResult | None = None
    similarity: CompressorSimilarityResult | None = None
    data: dict = field(default_factory=dict)


def _section(data, name, allowed, required=()):
    if not isinstance(data, dict):
        raise CaseFileError(f"{name} must be a JSON object, not {type(data).__name__}")
    unknown = sorted(str(k) for k in data if k not in allowed)
    if unknown:
        raise CaseFileError(f"{name}: unknown keys {', '.join(unknown)[:200]}")
    given = {k: v for k, v in data.items() if v is not None}  # null: not given
    missing = [k for k in required if k not in given]
    if missing:
        raise CaseFileError(f"{name} lacks {', '.join(missing)}")
    return given


def _built(name, build):
    try:
        return build()
    except CaseFileError:
        raise
    except WorkbenchError as exc:
        raise CaseFileError(f"{name}: {exc}") from None


def _system(data):
    data = _section(data, "system", _SYSTEM, ("fluid", "pressure", "temperature"))
    fluid = data.pop("fluid")
    if not isinstance(fluid, (str, dict)):
        raise CaseFileError("system: fluid must be a fluid name or a composition")
    P, T = data.pop("pressure"), data.pop("temperature")

    def build():
        return SystemCurve(Fluid(fluid).state(P=P, T=T), **data)

    return _built("system", build)


def evaluate_curves_case(data) -> CurvesCaseResult:
    """Validate a curves case (a parsed JSON object) and evaluate it.

    Parameters
    ----------
    data : dict
        The case (see the module notes).

    Returns
    -------
    CurvesCaseResult

    Raises
    ------
    CaseFileError
        Wrong format or version, unknown keys, wrong types, any value the calculations
        refuse (the message names the section and the input).

    Examples
    --------
    >>> result = evaluate_curves_case(load_curves_demo("pump-loop-demo"))
    >>> result.acceptance.verdict
    'pass'
    """
    data = _section(data, "curves case", _TOP, ("format", "format_version", "kind", "curve"))
    if data["format"] != FORMAT_NAME:
        raise CaseFileError(f"case format must be {FORMAT_NAME!r}, not {data['format']!r:.60}")
    version = data["format_version"]
    if isinstance(version, bool) or version != FORMAT_VERSION:
        raise CaseFileError(f"case format_version {version!r:.20} is not supported (this "
                            f"workbench reads version {FORMAT_VERSION})")
    kind = data["kind"]
    if kind not in ("pump", "fan", "compressor"):
        raise CaseFileError(f"case kind must be 'pump', 'fan' or 'compressor', not "
                            f"{kind!r:.40}")
    for key in ("title", "description"):
        if not isinstance(data.get(key, ""), str):
            raise CaseFileError(f"case {key} must be text")
    curve = _built("curve", lambda: PerformanceCurve.from_dict(data["curve"]))
    if curve.machine != kind:
        raise CaseFileError(f"the curve is a {curve.machine} curve but the case kind is {kind}")
    system = point = acceptance = similarity = None
    if "system" in data:
        system = _system(data["system"])
        if kind != "compressor":
            point = _built("operating point", lambda: operating_point(curve, system))
    if "acceptance" in data:
        if kind != "pump":
            raise CaseFileError("acceptance after ISO 9906 is for pumps")
        acc = _section(data["acceptance"], "acceptance", _ACCEPTANCE,
                       ("test_flow", "test_head", "test_speed", "rated_speed",
                        "guarantee_flow", "guarantee_head"))
        acceptance = _built("acceptance", lambda: pump_acceptance(
            acc.pop("test_flow"), acc.pop("test_head"), **acc))
    if "similarity" in data:
        if kind != "compressor":
            raise CaseFileError("similarity after ASME PTC 10 is for compressors")
        sim = _section(data["similarity"], "similarity", _SIMILARITY,
                       ("test", "specified", "diameter", "width"))
        if isinstance(sim.get("uncertainties"), dict):
            sim["uncertainties"] = {k: tuple(v) if isinstance(v, list) else v
                                    for k, v in sim["uncertainties"].items()}
        if isinstance(sim.get("limits"), dict):
            sim["limits"] = {k: tuple(v) if isinstance(v, list) else v
                             for k, v in sim["limits"].items()}
        similarity = _built("similarity", lambda: compressor_similarity(
            sim.pop("test"), sim.pop("specified"), **sim))
    return CurvesCaseResult(
        title=data.get("title", ""), description=data.get("description", ""), kind=kind,
        curve=curve, system=system, operating_point=point, acceptance=acceptance,
        similarity=similarity, data=data)


def list_curves_demos() -> list[str]:
    """Names of the curves demo cases shipped in ``workbench/cases`` (without ``.json``)."""
    folder = resources.files("workbench") / "cases"
    names = []
    for path in folder.iterdir():
        if not path.name.endswith(".json"):
            continue
        try:
            head = json.loads(path.read_text(encoding="utf-8"))
        except (OSError, ValueError):
            continue
        if isinstance(head, dict) and head.get("format") == FORMAT_NAME:
            names.append(path.name[:-5])
    return sorted(names)


def load_curves_demo(name: str) -> dict:
    """The parsed JSON of a curves demo case by name (see :func:`list_curves_demos`)."""
    demos = list_curves_demos()
    if not isinstance(name, str) or name not in demos:
        raise CaseFileError(f"unknown curves demo {name!r:.60}: choose one of "
                            + ", ".join(demos))
    text = (resources.files("workbench") / "cases" / f"{name}.json").read_text(
        encoding="utf-8")
    return json.loads(text)


# ---- test points from the readings dashboard's result file -----------------------------------
_READINGS = "readings result file"
#: Compressor test-point keys and the result-file columns they come from.
_COMPRESSOR_COLUMNS = {"inlet_pressure": "inlet_pressure",
                       "inlet_temperature": "inlet_temperature",
                       "discharge_pressure": "outlet_pressure",
                       "discharge_temperature": "reading_outlet_temperature",
                       "volume_flow": "inlet_volume_flow", "speed": "speed"}


def _file_numbers(raw, column):
    if column not in raw.columns:
        raise ReadingsError(f"{_READINGS}: the file has no column {column!r}; export the "
                            "result file of the readings dashboard")
    return np.array([float(cell) if NUMBER_TEXT.fullmatch(cell) else math.nan
                     for cell in (str(c).strip() for c in raw[column])])


def _usable_rows(raw):
    """Rows with status ok and, where the file says, steady."""
    ok = np.array([str(s).strip() == "ok" for s in raw["status"]], dtype=bool)
    if "steady" in raw.columns:
        ok &= np.array([str(s).strip().lower() == "true" for s in raw["steady"]], dtype=bool)
    return ok


def points_from_readings(raw, machine: str) -> dict:
    """Test points from the readings dashboard's result file (SI values, speed in rpm).

    Parameters
    ----------
    raw : pandas.DataFrame
        The file as text cells (:func:`workbench.fieldtest.session.read_table`); the
        columns of :meth:`workbench.fieldtest.session.SessionResult.export_csv`.
    machine : {"pump", "compressor"}
        Pump: ``test_flow`` [m^3/s] (inlet volume flow), ``test_head`` [m] (isentropic head
        over standard gravity: for a liquid the isentropic head is the pressure rise over the
        density, common practice), ``test_power`` [W] (shaft power), sorted by flow, and
        ``test_speed`` [rad/s] (mean speed).  Compressor: the mean of the usable rows of the
        six readings of an ASME PTC 10 test point (``inlet_pressure`` [Pa],
        ``inlet_temperature`` [K], ``discharge_pressure`` [Pa], ``discharge_temperature``
        [K], ``volume_flow`` [m^3/s], ``speed`` [rad/s]), each an array of one value.

    Returns
    -------
    dict
        Arrays [SI] as above, from the rows with status ``ok`` (and steady, where the file
        has a ``steady`` column) with a number in every column used.

    Raises
    ------
    ReadingsError
        A column missing, or no usable row.
    InputError
        ``raw`` is not a table, or ``machine`` is not one of the two.

    Examples
    --------
    >>> import pandas as pd
    >>> raw = pd.DataFrame({"status": ["ok"], "inlet_volume_flow": ["0.1"],
    ...                     "isentropic_head": ["490.3325"], "shaft_power": ["60000"],
    ...                     "speed": ["1500"]})
    >>> points = points_from_readings(raw, "pump")
    >>> round(float(points["test_head"][0]), 6), round(points["test_speed"], 3)
    (50.0, 157.08)
    """
    machine = choice(machine, ("pump", "compressor"), "machine")
    if not hasattr(raw, "columns") or not hasattr(raw, "__getitem__"):
        raise InputError(f"{_READINGS} must be a table (pandas DataFrame), not "
                         f"{type(raw).__name__}")
    if "status" not in raw.columns:
        raise ReadingsError(f"{_READINGS}: no status column; export the result file of the "
                            "readings dashboard")
    use = _usable_rows(raw)
    if machine == "compressor":
        columns = {key: _file_numbers(raw, col) for key, col in _COMPRESSOR_COLUMNS.items()}
    else:
        columns = {"test_flow": _file_numbers(raw, "inlet_volume_flow"),
                   "test_head": _file_numbers(raw, "isentropic_head") / STANDARD_GRAVITY,
                   "test_power": _file_numbers(raw, "shaft_power"),
                   "speed": _file_numbers(raw, "speed")}
    columns["speed"] = columns["speed"] * RPM  # the readings keep speed in rpm
    for values in columns.values():
        use &= np.isfinite(values)
    if not use.any():
        raise ReadingsError(f"{_READINGS}: no row is usable (status ok, steady, numbers in "
                            "every column used)")
    if machine == "compressor":
        return {key: np.array([values[use].mean()]) for key, values in columns.items()}
    order = np.argsort(columns["test_flow"][use], kind="stable")
    out = {key: values[use][order] for key, values in columns.items() if key != "speed"}
    out["test_speed"] = float(columns["speed"][use].mean())
    return out


__all__ = ["FORMAT_NAME", "FORMAT_VERSION", "CurvesCaseResult", "evaluate_curves_case",
           "list_curves_demos", "load_curves_demo", "points_from_readings"]
