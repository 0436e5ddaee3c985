"""A field-test session: one readings file and its setup, evaluated for the readings dashboard.

Everything the readings dashboard (:class:`workbench.ui.readings_panel.ReadingsPanel`) shows
is computed here, without widgets, so that it can be tested and used without a browser:

1. :func:`read_table` reads the uploaded file's bytes (CSV or Excel) into a table of text
   cells, refusing a file larger than :data:`UPLOAD_LIMIT_BYTES`, empty, header-only or
   binary files with a message.
2. :class:`SessionSetup` holds the setup in SI units (column map and units, steady-state
   window and tolerances, machine, fluid, property model, ambient pressure, mechanical
   efficiency, instrument uncertainties, design point), validated through the input boundary
   of :mod:`workbench.units`; :meth:`SessionSetup.to_setup` and
   :func:`setup_from_file` go to and from the setup files of
   :mod:`workbench.fieldtest.setup_file`.
3. :func:`evaluate_session` converts the mapped columns
   (:func:`~workbench.fieldtest.readers.readings_from_frame`), evaluates every row
   (:func:`~workbench.fieldtest.batch.evaluate`), flags steady rows
   (:func:`~workbench.fieldtest.steady.steady_state_flags`), compares with the design point
   (:func:`~workbench.fieldtest.design.compare_with_design`) and propagates the instrument
   uncertainties at :data:`UNCERTAINTY_ROWS` rows spread over the file
   (:func:`~workbench.fieldtest.uncertainty.propagate_uncertainty`).  It returns a
   :class:`SessionResult`, which gives the summary numbers, the chart series, the table rows
   (flagged rows first) and the export frame (CSV).  :func:`reflag` applies another
   steady-state window or tolerances without evaluating again.

Steady state: a row is steady when, over the window of rows ending at it, no mapped reading
strays from its window mean by more than its tolerance (common practice of performance
testing, ASME PTC 10 section 5).  The default tolerances (:func:`default_tolerance`) are
typical permissible fluctuations (common practice, from memory): +-1 % of the file's median
reading for pressures (absolute), +-2 % for flows and power, +-0.5 % for speed, +-1 K for
temperatures, over a window of 5 rows (5 minutes of one-minute scans).  Set the limits of the
test code and contract in force.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 19.1-2013, Test Uncertainty.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np
import pandas as pd

from .. import units
from ..errors import CaseFileError, InputError, ReadingsError, WorkbenchError
from ..properties import Fluid
from . import readers, setup_file
from .batch import evaluate
from .design import DesignPoint, compare_with_design
from .readers import READING_KINDS, convert_values, readings_from_frame
from .setup_file import MACHINES, PROPERTY_MODELS, UNIT_CHOICES, difference_to_si
from .steady import steady_state_flags
from .uncertainty import propagate_uncertainty

#: Largest readings file accepted [bytes]: 20 MiB, about 200,000 rows of ten readings.  A
#: larger file is refused with a message before it is parsed (split the logger export).
UPLOAD_LIMIT_BYTES = 20 * 1024 * 1024
#: Rows (spread over the file) at which the uncertainty is propagated for the error bars.
UNCERTAINTY_ROWS = 12
#: Default steady-state window [rows].
STEADY_WINDOW = 5
#: Default steady-state tolerance per kind of reading: a fraction of the file's median reading
#: (absolute pressure, flow, power, speed) or a difference [K] for temperatures (common
#: practice, from memory; see the module docstring).
STEADY_DEFAULTS = {"pressure": 0.01, "temperature": 1.0, "mass_flow": 0.02,
                   "volume_flow": 0.02, "power": 0.02, "speed": 0.005}
#: Results evaluated for every row (keys of :data:`workbench.fieldtest.batch.RESULTS`).
SESSION_RESULTS = ("power", "shaft_power", "isentropic_efficiency", "isentropic_head",
                   "pressure_ratio", "outlet_temperature", "mass_flow", "inlet_volume_flow")
#: Default instrument systematic standard uncertainties (1 sigma): fractions of the reading
#: for pressure, flow and power [-], a difference for temperature [K] (typical calibrated
#: field instruments; common practice, from memory).
DEFAULT_UNCERTAINTY = {"pressure_fraction": 0.0025, "temperature_K": 0.2,
                       "flow_fraction": 0.01, "power_fraction": 0.01}
#: Short reading names for the reason a row is not steady.
SHORT_NAMES = {
    "inlet_pressure": "inlet p", "outlet_pressure": "outlet p", "inlet_temperature": "inlet T",
    "outlet_temperature": "outlet T", "mass_flow": "flow", "volume_flow": "flow",
    "standard_volume_flow": "flow", "power": "power", "speed": "speed",
}


# ---------------------------------------------------------------------- file and fluid
def read_table(name: str, content: bytes, *, limit: int = UPLOAD_LIMIT_BYTES) -> pd.DataFrame:
    """Read an uploaded readings file into a table of raw cells (headers stripped).

    Parameters
    ----------
    name : str
        File name, used in messages; an Excel workbook is recognised by its content or its
        name (:func:`workbench.fieldtest.readers.read_table`), anything else is read as
        delimited text (the delimiter is detected).
    content : bytes
        The file's bytes.
    limit : int
        Largest size accepted [bytes].

    Returns
    -------
    pandas.DataFrame
        One row per file row, columns named by the stripped headers, cells as text (CSV) or
        as read (Excel); nothing converted yet.

    Raises
    ------
    ReadingsError
        If the file is larger than ``limit``, empty, binary, has no rows or cannot be parsed.

    Examples
    --------
    >>> read_table("r.csv", b"p1 bar,t1 C\\n1.0,20\\n").shape
    (1, 2)
    """
    name = units.text(name or "readings.csv", "readings file name", max_length=260)
    if not isinstance(content, (bytes, bytearray, memoryview)):
        raise InputError(f"the content of {name!r} must be bytes, not {type(content).__name__}")
    limit = units.count(limit, "upload limit [bytes]")
    size = content.nbytes if isinstance(content, memoryview) else len(content)
    if size > limit:  # refused before anything is copied or parsed
        raise ReadingsError(f"file {name!r} is {size / 2**20:.1f} MiB: the largest file "
                            f"accepted is {limit / 2**20:.0f} MiB; split the export into "
                            "smaller files")
    content = bytes(content)
    # the one readings-file reader (binary data, damaged or oversized workbooks, repeated
    # headers are refused there by file name); the delimiter of a CSV is detected
    csv = {} if content.startswith(b"PK\x03\x04") else {"sep": None, "engine": "python"}
    return readers.read_table(content, file_name=name, max_bytes=limit, **csv)


def parse_fluid(text: str, backend: str = "HEOS") -> Fluid:
    """A Fluid from a name (``"Air"``) or ``"Name=fraction; Name=fraction"`` (mole fractions).

    The text is split and read as numbers only; it is never evaluated as code.

    Parameters
    ----------
    text : str
        A fluid name or a composition, parts separated by ``;`` or ``,``.
    backend : {"HEOS", "IF97"}
        Property model.

    Returns
    -------
    Fluid

    Raises
    ------
    InputError
        If the text is not text, a fraction is not a number or out of [0, 1].

    Examples
    --------
    >>> parse_fluid("Methane=0.9; Ethane=0.1").components
    ('Methane', 'Ethane')
    """
    text = units.text(text, "fluid", max_length=1000).strip()
    backend = units.choice(backend, PROPERTY_MODELS, "property model")
    if "=" not in text:
        return Fluid(text, backend=backend)
    composition = {}
    for part in text.replace(",", ";").split(";"):
        if not part.strip():
            continue
        name, _, value = part.partition("=")
        name = name.strip()
        try:
            number = float(value)
        except ValueError:
            raise InputError(f"fraction {value.strip()!r} of {name} is not a number") from None
        composition[name] = units.fraction(number, f"fraction of {name}", allow_zero=True)
    return Fluid(composition, backend=backend)


def default_tolerance(raw: pd.DataFrame, column: str, unit: str, name: str,
                      ambient_pressure: float = 101325.0) -> float:
    """Default steady-state tolerance of a mapped reading, in the column's unit.

    +-1 K for temperatures; otherwise the fraction :data:`STEADY_DEFAULTS` of the file's
    median reading (absolute pressure for pressures), rounded to two significant digits
    (common practice, from memory).

    Parameters
    ----------
    raw : pandas.DataFrame
        The file's table (:func:`read_table`).
    column, unit, name : str
        The mapped column, its unit text and the reading name (a key of
        :data:`~workbench.fieldtest.readers.READING_KINDS`).
    ambient_pressure : float
        Ambient pressure [Pa] for gauge pressures.

    Returns
    -------
    float
        The tolerance, a difference in ``unit`` (0 when the column holds no number).

    Examples
    --------
    >>> raw = pd.DataFrame({"p1": ["18.9", "19.1", "19.0"]})
    >>> default_tolerance(raw, "p1", "bar(a)", "inlet_pressure")
    0.19
    """
    kind, unit = _reading_and_unit(name, unit)
    if not isinstance(raw, pd.DataFrame) or not isinstance(column, str) or \
            column not in raw.columns:
        raise InputError(f"column {column!r} of the {name.replace('_', ' ')} is not in the "
                         "readings file")
    ambient_pressure = units.positive(ambient_pressure, "pressure", "ambient pressure")
    per_unit = difference_to_si(1.0, unit, kind, name)
    if kind == "temperature":
        return _two_digits(STEADY_DEFAULTS["temperature"] / per_unit)
    values = pd.to_numeric(raw[column], errors="coerce").to_numpy(dtype=float)
    si = convert_values(values, unit, kind, name, ambient_pressure=ambient_pressure)
    si = si[np.isfinite(si)]
    if not si.size:
        return 0.0
    return _two_digits(STEADY_DEFAULTS[kind] * float(np.median(np.abs(si))) / per_unit)


def tolerances_to_si(typed: dict, unit_texts: dict) -> dict:
    """Steady-state tolerances typed in the columns' units, in SI units.

    Parameters
    ----------
    typed : dict
        Reading name -> tolerance typed in the unit of its column.
    unit_texts : dict
        Reading name -> unit text of its column.

    Returns
    -------
    dict
        Reading name -> tolerance [Pa, K, kg/s, m^3/s, W; rev/min for speed].

    Raises
    ------
    InputError
        Naming the reading and the value as typed, with its unit, when it is negative or not
        a finite number.

    Examples
    --------
    >>> tolerances_to_si({"inlet_pressure": 0.2}, {"inlet_pressure": "bar(g)"})
    {'inlet_pressure': 20000.0}
    """
    typed = _mapping(typed, "steady-state tolerances")
    unit_texts = _mapping(unit_texts, "units of the tolerances")
    out = {}
    for name, value in typed.items():
        kind, unit = _reading_and_unit(name, unit_texts.get(name))
        shown = setup_file.tolerance_unit(unit, kind)
        label = f"steady-state tolerance of the {name.replace('_', ' ')} [{shown}]"
        if isinstance(value, (int, float)) and not isinstance(value, bool) and value < 0:
            raise InputError(f"steady-state tolerance {value:g} {shown} of the "
                             f"{name.replace('_', ' ')} must be zero or positive")
        value = units.not_negative(value, "dimensionless", label)
        out[name] = difference_to_si(value, unit, kind, name)
    return out


def _reading_and_unit(name, unit) -> tuple[str, str]:
    """(kind, unit) of a reading name and the unit text of its column, both checked."""
    name = units.choice(name, READING_KINDS, "reading name")
    kind = READING_KINDS[name][0]
    return kind, units.choice(unit, UNIT_CHOICES[kind],
                              f"unit of the {name.replace('_', ' ')} column")


def _two_digits(value: float) -> float:
    """A default tolerance rounded to two significant digits (finite, never NaN)."""
    if not math.isfinite(value) or value <= 0:
        return 0.0
    return float(f"{value:.2g}")


# ---------------------------------------------------------------------- the setup
@dataclass(frozen=True)
class SessionSetup:
    """Everything a session needs besides the file, in SI units (validated on creation).

    Attributes
    ----------
    column_map : dict
        Reading name -> file column of every mapped reading.
    units : dict
        Reading name -> unit text of its column (a choice of
        :data:`~workbench.fieldtest.setup_file.UNIT_CHOICES`).
    machine : str
        ``"compressor"``, ``"turbine"``, ``"pump"`` or ``"fan"``.
    fluid : str
        Fluid name or ``"Name=fraction; ..."`` (see :func:`parse_fluid`).
    property_model : str
        ``"HEOS"`` or ``"IF97"``.
    ambient_pressure : float
        Ambient (barometric) pressure [Pa] for gauge readings.
    mechanical_efficiency : float
        Mechanical efficiency [-] in (0, 1].
    steady_window : int
        Steady-state window [rows], at least 2.
    steady_tolerances : dict
        Reading name -> tolerance [Pa, K, kg/s, m^3/s, W; rev/min for speed] of every mapped
        reading.
    uncertainty : dict
        Instrument systematic standard uncertainties: ``pressure_fraction``,
        ``flow_fraction``, ``power_fraction`` [-] and ``temperature_K`` [K].
    design : DesignPoint
        Design point (efficiency [-], shaft power [W], inlet volume flow [m^3/s], rated speed
        [rev/min]); fields left ``None`` are not compared.
    readings_file : str
        Name of the readings file a setup file was made with (informational only).
    """

    column_map: dict
    units: dict
    machine: str = "compressor"
    fluid: str = "Air"
    property_model: str = "HEOS"
    ambient_pressure: float = 101325.0
    mechanical_efficiency: float = 1.0
    steady_window: int = STEADY_WINDOW
    steady_tolerances: dict = field(default_factory=dict)
    uncertainty: dict = field(default_factory=lambda: dict(DEFAULT_UNCERTAINTY))
    design: DesignPoint = field(default_factory=DesignPoint)
    readings_file: str = ""

    def __post_init__(self):
        check = object.__setattr__
        check(self, "machine", units.choice(self.machine, MACHINES, "machine"))
        check(self, "fluid", units.text(self.fluid, "fluid", max_length=1000))
        check(self, "property_model",
              units.choice(self.property_model, PROPERTY_MODELS, "property model"))
        check(self, "ambient_pressure", units.to_si(
            self.ambient_pressure, "pressure", "ambient pressure",
            low=setup_file.AMBIENT_RANGE[0], high=setup_file.AMBIENT_RANGE[1]))
        check(self, "mechanical_efficiency",
              units.fraction(self.mechanical_efficiency, "mechanical efficiency"))
        check(self, "steady_window", units.count(
            self.steady_window, "steady-state window [rows]", low=2,
            high=setup_file.MAX_WINDOW))
        check(self, "column_map", _mapping(self.column_map, "column map"))
        check(self, "units", _mapping(self.units, "units"))
        check(self, "steady_tolerances", _mapping(self.steady_tolerances,
                                                  "steady-state tolerances"))
        for name, column in self.column_map.items():
            units.choice(name, READING_KINDS, "reading name of the column map")
            units.text(column, f"column of the {name.replace('_', ' ')}", max_length=1000)
            _reading_and_unit(name, self.units.get(name))
        check(self, "steady_tolerances", {
            name: units.not_negative(self.steady_tolerances.get(name), "dimensionless",
                                     f"steady-state tolerance of the {name.replace('_', ' ')}")
            for name in self.column_map})
        check(self, "uncertainty", {
            key: (units.not_negative(_get(self.uncertainty, key), "temperature_difference",
                                     "temperature uncertainty") if key == "temperature_K"
                  else units.fraction(_get(self.uncertainty, key),
                                      key.replace("_", " ") + " uncertainty", allow_zero=True))
            for key in setup_file.UNCERTAINTY_KEYS})
        if not isinstance(self.design, DesignPoint):
            raise InputError("design must be a DesignPoint")
        check(self, "readings_file", units.text(self.readings_file, "readings file name",
                                                max_length=1000))

    def to_setup(self, readings_file: str | None = None) -> dict:
        """The setup-file dict (:func:`workbench.fieldtest.setup_file.make_setup`), naming
        ``readings_file`` (default :attr:`readings_file`) as the file it was made with."""
        d = self.design
        return setup_file.make_setup(
            machine=self.machine, fluid=self.fluid, property_model=self.property_model,
            ambient_pressure=self.ambient_pressure,
            mechanical_efficiency=self.mechanical_efficiency,
            columns={name: (column, self.units[name], self.steady_tolerances[name])
                     for name, column in self.column_map.items()},
            steady_window=self.steady_window, uncertainty=self.uncertainty,
            design={"isentropic_efficiency": d.isentropic_efficiency, "shaft_power_W": d.power,
                    "inlet_volume_flow_m3_per_s": d.volume_flow, "speed_rpm": d.speed},
            readings_file=self.readings_file if readings_file is None else readings_file)


def _mapping(value, name: str) -> dict:
    if not isinstance(value, dict):
        raise InputError(f"{name} must be a dict, not {type(value).__name__}")
    return dict(value)


def _get(mapping, key):
    if not isinstance(mapping, dict) or key not in mapping:
        raise InputError(f"instrument uncertainty {key!r} is missing")
    return mapping[key]


def setup_from_file(source, raw: pd.DataFrame | None, file_name: str = "") -> SessionSetup:
    """Read a setup file and check that it fits the loaded readings file.

    The setup is validated (:func:`workbench.fieldtest.setup_file.read_setup`) against the
    file's columns; then its fluid is made and its column map converts the file, so that
    nothing the setup names fails later.

    Parameters
    ----------
    source : dict, str, bytes or pathlib.Path
        The setup (parsed JSON, JSON text or bytes, or a path).
    raw : pandas.DataFrame or None
        The loaded readings file (:func:`read_table`); ``None`` when none is loaded.
    file_name : str
        Its name, for messages.

    Returns
    -------
    SessionSetup

    Raises
    ------
    CaseFileError
        Naming the setup key that is wrong or does not fit the file.
    """
    if raw is None:
        raise CaseFileError("load the readings file first: a setup maps its columns")
    setup = setup_file.read_setup(source, list(raw.columns), file_name)
    columns = setup["columns"]
    try:
        parse_fluid(setup["fluid"], setup["property_model"])
    except WorkbenchError as exc:
        raise CaseFileError(f"setup key 'fluid' = {setup['fluid']!r} (property model "
                            f"{setup['property_model']}): {exc}") from None
    try:
        readings_from_frame(raw, {n: c["column"] for n, c in columns.items()},
                            {n: c["unit"] for n, c in columns.items()},
                            ambient_pressure=setup["ambient_pressure_Pa"])
    except WorkbenchError as exc:
        raise CaseFileError(f"setup key 'columns': {exc}") from None
    d = setup["design_point"]
    tolerance_key = setup_file.TOLERANCE_KEYS
    return SessionSetup(
        column_map={n: c["column"] for n, c in columns.items()},
        units={n: c["unit"] for n, c in columns.items()},
        machine=setup["machine"], fluid=setup["fluid"],
        property_model=setup["property_model"],
        ambient_pressure=setup["ambient_pressure_Pa"],
        mechanical_efficiency=setup["mechanical_efficiency"],
        steady_window=setup["steady_window_rows"],
        steady_tolerances={n: c[tolerance_key[READING_KINDS[n][0]]]
                           for n, c in columns.items()},
        uncertainty=dict(setup["instrument_uncertainty"]),
        design=DesignPoint(isentropic_efficiency=d["isentropic_efficiency"],
                           power=d["shaft_power_W"], volume_flow=d["inlet_volume_flow_m3_per_s"],
                           speed=d["speed_rpm"]),
        readings_file=setup["readings_file"])


# ---------------------------------------------------------------------- the result
@dataclass(frozen=True)
class SessionResult:
    """One evaluated readings file (SI units throughout).

    Attributes
    ----------
    setup : SessionSetup
        The setup the file was evaluated with (its steady-state window and tolerances are
        the ones the flags were computed with).
    readings : pandas.DataFrame
        The mapped readings in SI units (:func:`~workbench.fieldtest.readers.readings_from_frame`).
    results : pandas.DataFrame
        :func:`~workbench.fieldtest.batch.evaluate` output: readings, ``status``, ``message``
        and :data:`SESSION_RESULTS`.
    deviation : pandas.DataFrame
        :func:`~workbench.fieldtest.design.compare_with_design` output (shaft power compared
        with the design power).
    steady : pandas.DataFrame
        :func:`~workbench.fieldtest.steady.steady_state_flags` output: ``<reading>_max_deviation``
        per mapped reading and ``steady``.
    uncertainty : pandas.DataFrame
        One row per sampled row: ``row`` (index label), ``U95_isentropic_efficiency`` [-],
        ``U95_shaft_power`` [W], ``dominant_efficiency`` and ``dominant_shaft_power`` (the
        reading contributing most).
    """

    setup: SessionSetup
    readings: pd.DataFrame
    results: pd.DataFrame
    deviation: pd.DataFrame
    steady: pd.DataFrame
    uncertainty: pd.DataFrame

    def summary(self) -> dict:
        """Counts and means (SI units): ``rows``, ``ok``, ``flagged``, ``steady``,
        ``steady_ok``, ``steady_window``, ``mean_isentropic_efficiency`` (and ``_steady``
        over the steady ok rows), ``mean_power_W``, ``mean_shaft_power_W``,
        ``mean_U95_isentropic_efficiency``; a mean over no rows is NaN."""
        r = self.results
        ok_rows = r["status"] == "ok"
        ok = r[ok_rows]
        steady = self.steady["steady"]
        steady_ok = r[ok_rows & steady]
        u = self.uncertainty["U95_isentropic_efficiency"]
        return {"rows": len(r), "ok": len(ok), "flagged": len(r) - len(ok),
                "steady": int(steady.sum()), "steady_ok": len(steady_ok),
                "steady_window": self.setup.steady_window,
                "mean_isentropic_efficiency": _mean(ok["isentropic_efficiency"]),
                "mean_isentropic_efficiency_steady": _mean(steady_ok["isentropic_efficiency"]),
                "mean_power_W": _mean(ok["power"]),
                "mean_shaft_power_W": _mean(ok["shaft_power"]),
                "mean_U95_isentropic_efficiency": _mean(u)}

    def status_counts(self) -> dict:
        """Rows per status word, most frequent first."""
        return {str(k): int(v) for k, v in self.results["status"].value_counts().items()}

    def dominant_reading(self) -> str | None:
        """The reading that most often dominates the efficiency uncertainty, or None."""
        u = self.uncertainty
        return None if not len(u) else str(u["dominant_efficiency"].mode().iloc[0])

    def chart_series(self) -> dict:
        """Chart data in SI units, per chart and trace.

        Returns
        -------
        dict
            ``{"efficiency": {...}, "shaft_power": {...}}``, each mapping a trace name
            (``"steady rows"``, ``"unsteady rows"``, ``"U95 at sampled rows"``,
            ``"design point"``) to ``(x, y, error)``: x the inlet volume flow [m^3/s], y the
            isentropic efficiency [-] or the shaft power [W], error the U95 of y (sampled rows
            only, else None).  Rows that are not ok are left out; the design point is there
            only when the design gives its flow and the charted value.
        """
        r = self.results
        ok = (r["status"] == "ok").to_numpy()
        steady = self.steady["steady"].to_numpy(dtype=bool)
        flow = r["inlet_volume_flow"].to_numpy(dtype=float)
        values = {"efficiency": r["isentropic_efficiency"].to_numpy(dtype=float),
                  "shaft_power": r["shaft_power"].to_numpy(dtype=float)}
        u = self.uncertainty
        at = r.loc[u["row"]]
        bars = {"efficiency": u["U95_isentropic_efficiency"].to_numpy(dtype=float),
                "shaft_power": u["U95_shaft_power"].to_numpy(dtype=float)}
        design = {"efficiency": self.setup.design.isentropic_efficiency,
                  "shaft_power": self.setup.design.power}
        out = {}
        for chart, y in values.items():
            series = {name: (flow[pick], y[pick], None) for name, pick in (
                ("steady rows", ok & steady), ("unsteady rows", ok & ~steady))}
            column = "isentropic_efficiency" if chart == "efficiency" else "shaft_power"
            series["U95 at sampled rows"] = (at["inlet_volume_flow"].to_numpy(dtype=float),
                                             at[column].to_numpy(dtype=float), bars[chart])
            q = self.setup.design.volume_flow
            if q is not None and design[chart] is not None:
                series["design point"] = (np.array([q]), np.array([design[chart]]), None)
            out[chart] = series
        return out

    def steady_reason(self, index) -> tuple[bool, str]:
        """(steady, text) of a row: ``"yes"``, or which readings strayed, or why not."""
        flags = self.steady
        if bool(flags.at[index, "steady"]):
            return True, "yes"
        window, tolerances = self.setup.steady_window, self.setup.steady_tolerances
        if flags.index.get_loc(index) < window - 1:
            return False, "no: window not yet full"
        strayed, missing = [], False
        for name, tol in tolerances.items():
            dev = flags.at[index, f"{name}_max_deviation"]
            if not math.isfinite(dev):
                missing = True
            elif dev > tol and SHORT_NAMES[name] not in strayed:
                strayed.append(SHORT_NAMES[name])
        if strayed:
            return False, "no: " + ", ".join(strayed)
        return False, "no: reading missing in window" if missing else "no"

    def table_rows(self, limit: int) -> pd.DataFrame:
        """Rows to show in a table of at most ``limit`` rows: every flagged row first, then
        the first ok rows; with the efficiency deviation from the design when there is one."""
        r = self.results
        flagged = r[r["status"] != "ok"]
        shown = pd.concat([flagged, r[r["status"] == "ok"].head(max(0, limit - len(flagged)))])
        if "efficiency_deviation_points" in self.deviation:
            shown = shown.join(self.deviation[["efficiency_deviation_points"]])
        return shown

    def export_frame(self) -> pd.DataFrame:
        """Readings, status, message, results, design deviations and steady flags (SI)."""
        return pd.concat([self.results, self.deviation, self.steady], axis=1)

    def export_csv(self) -> bytes:
        """:meth:`export_frame` as UTF-8 CSV bytes (every row, in file order)."""
        return self.export_frame().to_csv(index=False).encode("utf-8")


def _mean(values: pd.Series) -> float:
    return float(values.mean()) if len(values) else math.nan


# ---------------------------------------------------------------------- evaluation
def evaluate_session(raw: pd.DataFrame, setup: SessionSetup, *, progress=None) -> SessionResult:
    """Convert, evaluate, flag, compare and sample the uncertainty of a readings file.

    Parameters
    ----------
    raw : pandas.DataFrame
        The file's table (:func:`read_table`).
    setup : SessionSetup
        The setup.
    progress : callable, optional
        ``progress(done, total)``, called as the work advances; ``total`` is the number of
        rows plus the number of sampled rows, ``done`` counts them.

    Returns
    -------
    SessionResult

    Raises
    ------
    WorkbenchError
        If a mapped column is missing, a unit is wrong, the fluid is unknown or a reading the
        machine needs is not mapped (a bad row only gets a status and message).

    Examples
    --------
    >>> raw = read_table("air.csv", b"p1,t1,p2,t2,m\\n1,20,2,90,1\\n")
    >>> setup = SessionSetup(
    ...     column_map={"inlet_pressure": "p1", "inlet_temperature": "t1",
    ...                 "outlet_pressure": "p2", "outlet_temperature": "t2", "mass_flow": "m"},
    ...     units={"inlet_pressure": "bar(a)", "inlet_temperature": "degC",
    ...            "outlet_pressure": "bar(a)", "outlet_temperature": "degC",
    ...            "mass_flow": "kg/s"},
    ...     steady_tolerances={"inlet_pressure": 1e3, "inlet_temperature": 1.0,
    ...                        "outlet_pressure": 1e3, "outlet_temperature": 1.0,
    ...                        "mass_flow": 0.02})
    >>> result = evaluate_session(raw, setup)
    >>> round(result.summary()["mean_isentropic_efficiency"], 3)
    0.916
    """
    if not isinstance(setup, SessionSetup):
        raise InputError(f"setup must be a SessionSetup, not {type(setup).__name__}")
    fluid = parse_fluid(setup.fluid, setup.property_model)
    readings = readings_from_frame(raw, setup.column_map, setup.units,
                                   ambient_pressure=setup.ambient_pressure)
    steady = _flags(readings, setup)
    rows = len(readings)
    samples = min(UNCERTAINTY_ROWS, rows)
    total = rows + samples
    report = _reporter(progress, total)
    report(0)
    results = _evaluate_rows(readings, setup, fluid, report)
    report(rows)
    deviation = compare_with_design(results, setup.design, power_column="shaft_power")
    uncertainty = _uncertainty_sample(readings, results, setup, fluid,
                                      lambda k: report(rows + k))
    report(total)
    return SessionResult(setup, readings, results, deviation, steady, uncertainty)


def reflag(result: SessionResult, steady_window: int, steady_tolerances: dict) -> SessionResult:
    """The same result with the steady-state flags of another window or tolerances.

    Nothing is evaluated again; the window and tolerances are validated as for
    :class:`SessionSetup`.
    """
    setup = replace(result.setup, steady_window=steady_window,
                    steady_tolerances=steady_tolerances)
    return replace(result, setup=setup, steady=_flags(result.readings, setup))


def _flags(readings: pd.DataFrame, setup: SessionSetup) -> pd.DataFrame:
    tolerances = setup.steady_tolerances
    return steady_state_flags(readings, list(tolerances), setup.steady_window, tolerances)


def _reporter(progress, total: int):
    """A ``report(done)`` that calls ``progress(done, total)`` (or does nothing)."""
    if progress is None:
        return lambda done: None
    if not callable(progress):
        raise InputError(f"progress must be a callable(done, total), not "
                         f"{type(progress).__name__}")
    return lambda done: progress(int(done), int(total))


def _evaluate_rows(readings, setup, fluid, report):
    options = dict(mechanical_efficiency=setup.mechanical_efficiency, results=SESSION_RESULTS)
    options["progress"] = lambda done, _total: report(done)
    return evaluate(readings, setup.machine, fluid, **options)


def _uncertainty_sample(readings, results, setup, fluid, report) -> pd.DataFrame:
    """U95 of efficiency and shaft power at up to :data:`UNCERTAINTY_ROWS` ok rows spread
    evenly over the file (ASME PTC 19.1 propagation by sensitivity coefficients)."""
    ok = np.flatnonzero((results["status"] == "ok").to_numpy())
    picks = ok[np.unique(np.linspace(0, len(ok) - 1, min(UNCERTAINTY_ROWS, len(ok)))
                         .astype(int))] if len(ok) else []
    b = setup.uncertainty
    rows = []
    for k, i in enumerate(picks, start=1):
        row = readings.iloc[i]
        nominal, u = {}, {}
        for name in READING_KINDS:
            if name not in setup.column_map or name == "speed":
                continue
            nominal[name] = float(row[name])
            kind = READING_KINDS[name][0]
            if kind == "temperature":
                u[name] = (b["temperature_K"], 0.0)
            else:
                key = {"pressure": "pressure_fraction", "power": "power_fraction"}.get(
                    kind, "flow_fraction")
                u[name] = (b[key] * abs(nominal[name]), 0.0)
        if "outlet_temperature" in nominal:  # rated from the outlet: power is not an input
            nominal.pop("power", None)
            u.pop("power", None)
        try:
            rep = propagate_uncertainty(nominal, u, ("isentropic_efficiency", "shaft_power"),
                                        machine=setup.machine, fluid=fluid,
                                        mechanical_efficiency=setup.mechanical_efficiency)
        except WorkbenchError:
            continue  # a perturbed point that does not evaluate: the row gets no bar
        finally:
            report(k)
        rows.append({"row": results.index[i],
                     "U95_isentropic_efficiency": rep.expanded["isentropic_efficiency"],
                     "U95_shaft_power": rep.expanded["shaft_power"],
                     "dominant_efficiency": rep.dominant["isentropic_efficiency"],
                     "dominant_shaft_power": rep.dominant["shaft_power"]})
    return pd.DataFrame(rows, columns=["row", "U95_isentropic_efficiency", "U95_shaft_power",
                                       "dominant_efficiency", "dominant_shaft_power"])


__all__ = ["DEFAULT_UNCERTAINTY", "SESSION_RESULTS", "STEADY_DEFAULTS",
           "STEADY_WINDOW", "UNCERTAINTY_ROWS", "UPLOAD_LIMIT_BYTES", "SessionResult",
           "SessionSetup", "default_tolerance", "evaluate_session", "parse_fluid",
           "read_table", "reflag", "setup_from_file", "tolerances_to_si"]
