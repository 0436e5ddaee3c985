"""Field-test data panel: load a readings file, map its columns, evaluate every row.

The panel holds no thermodynamics: it reads the file with
:func:`workbench.fieldtest.readers.readings_from_frame`, evaluates with
:func:`workbench.fieldtest.evaluate`, propagates instrument uncertainties with
:func:`workbench.fieldtest.propagate_uncertainty` at a sample of rows, flags unsteady rows with
:func:`workbench.fieldtest.steady_state_flags` and compares with the design point by
:func:`workbench.fieldtest.compare_with_design`.  A bad file, a wrong column map, a bad
tolerance or a bad row never raises into the page: the message area says what is wrong and the
last good table stays visible, marked stale.

Charts: one plotly FigureWidget with two subplots, isentropic efficiency and shaft power
against inlet volume flow.  Rows that are not ok are left out; steady rows are filled dots,
unsteady rows hollow grey rings; the sampled rows carry their U95 error bars; the design point
is a diamond.  The figure is built once and its traces are updated in place.

Steady state: a row is steady when, over the window of rows ending at it, no mapped reading
strays from its window mean by more than its tolerance (common practice of performance
testing).  Tolerances are entered per reading, as a difference in the unit the column is
mapped in (bar for a bar(g) column, degC or K for temperatures, the flow unit for flow).  The
defaults, set when a column is chosen, are typical permissible fluctuations (common practice,
from memory): +-1 % of the file's median reading for pressures (absolute), +-2 % for flows and
power, +-0.5 % for speed, +-1 K for temperatures, over a window of 5 rows (5 minutes of
one-minute scans).  Set the limits of the test code and contract in force.

Setup files: the whole setup (column map and units, steady-state window and tolerances,
machine, fluid, property model, ambient pressure, mechanical efficiency, instrument
uncertainties, design point) is saved as plain JSON with SI values and loaded back onto the
next file of the same logger export (:mod:`workbench.ui.test_setup`); a setup that does not
fit the loaded file is refused with a message and the panel keeps its state.

CSS hooks: ``wb-input-<name>`` on every entry, ``wb-result-<name>`` on every result,
``wb-message`` on the message area, ``wb-caution`` on the caution banner; table rows are
``wb-row-ok`` / ``wb-row-flagged`` and steady cells ``wb-steady-yes`` / ``wb-steady-no``.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 19.1-2013, Test Uncertainty.
"""

from __future__ import annotations

import base64
import html
import io
import math
import pathlib

import ipywidgets as widgets
import numpy as np
import pandas as pd

from .. import SAFETY_CAUTION
from ..errors import CaseFileError, InputError, WorkbenchError
from ..fieldtest import (
    DesignPoint,
    compare_with_design,
    evaluate,
    propagate_uncertainty,
    readings_from_frame,
    steady_state_flags,
)
from ..fieldtest.readers import READING_KINDS, convert_values
from ..properties import Fluid
from . import test_setup
from .charts import figure_view, new_figure, refresh_view, sync_figure
from .common import NumberEntry, caution_banner, message_area
from .test_setup import (
    MACHINES,
    PROPERTY_MODELS,
    UNIT_CHOICES,
    difference_from_si,
    difference_to_si,
    tolerance_unit,
)

#: Demo file of the invented booster compressor (see its generator in tests/data).
DEMO_FILE = pathlib.Path(__file__).resolve().parents[1] / "data" / "booster_compressor_readings.csv"
DEMO_GAS = "Methane=0.89; Ethane=0.06; Propane=0.02; Nitrogen=0.015; CarbonDioxide=0.015"
DEMO_MAP = {
    "inlet_pressure": ("PT-201 suction bar(g)", "bar(g)"),
    "inlet_temperature": ("TT-201 suction degC", "degC"),
    "outlet_pressure": ("PT-202 discharge bar(g)", "bar(g)"),
    "outlet_temperature": ("TT-202 discharge degC", "degC"),
    "standard_volume_flow": ("FT-200 flow Sm3/h", "Sm3/h"),
    "power": ("JI-200 shaft kW", "kW"),
    "speed": ("ST-200 speed rpm", "rpm"),
}

NONE = "(not measured)"
_LABELS = {
    "inlet_pressure": "Inlet pressure", "inlet_temperature": "Inlet temperature",
    "outlet_pressure": "Outlet pressure", "outlet_temperature": "Outlet temperature",
    "mass_flow": "Mass flow", "volume_flow": "Inlet volume flow",
    "standard_volume_flow": "Standard volume flow (15 °C, 101.325 kPa)",
    "power": "Shaft power", "speed": "Speed",
}
#: Short reading names for the steady column of the table.
_SHORT = {
    "inlet_pressure": "inlet p", "outlet_pressure": "outlet p", "inlet_temperature": "inlet T",
    "outlet_temperature": "outlet T", "mass_flow": "flow", "volume_flow": "flow",
    "standard_volume_flow": "flow", "power": "power", "speed": "speed",
}
#: Rows of the table shown on the page (the CSV export has every row).
TABLE_ROWS = 40
#: Rows (spread over the file) at which the uncertainty is propagated for the error bars.
UNCERTAINTY_ROWS = 12
#: Default steady-state window [rows].
STEADY_WINDOW = 5
#: Default steady-state tolerance per kind of reading: a fraction of the file's median reading
#: (absolute pressure, flow, power, speed) or a difference [K] for temperatures (common
#: practice, from memory; see the module docstring).
STEADY_DEFAULTS = {"pressure": 0.01, "temperature": 1.0, "mass_flow": 0.02,
                   "volume_flow": 0.02, "power": 0.02, "speed": 0.005}

#: Colours and traces of the field-test figure (our own plain palette).
FIELD_TRACES = ("steady rows", "unsteady rows", "U95 at sampled rows", "design point")
_STEADY_COLOUR = "#2e6b8a"
_UNSTEADY_COLOUR = "#8f8f8f"
_BAR_COLOUR = "#303030"
_DESIGN_COLOUR = "#c2461f"
_UNSTEADY_CELL = "#dde5ef"
_FLAGGED_ROW = "#fbe3c6"


def parse_fluid(text: str, backend: str = "HEOS") -> Fluid:
    """A Fluid from a name (``"Air"``) or ``"Name=fraction; Name=fraction"`` (mole fractions).

    The text is split and read as numbers only; it is never evaluated as code.
    """
    text = (text or "").strip()
    if "=" not in text:
        return Fluid(text, backend=backend)
    composition = {}
    for part in text.replace(",", ";").split(";"):
        if not part.strip():
            continue
        name, _, value = part.partition("=")
        try:
            composition[name.strip()] = float(value)
        except ValueError:
            raise WorkbenchError(f"fraction {value.strip()!r} of {name.strip()} is not a "
                                 "number") from None
    return Fluid(composition, backend=backend)


def _read_table(name: str, content: bytes) -> pd.DataFrame:
    suffix = pathlib.Path(name).suffix.lower()
    try:
        if suffix in (".xlsx", ".xlsm"):
            raw = pd.read_excel(io.BytesIO(content), dtype=object, keep_default_na=False,
                                na_values=[""])
        else:
            raw = pd.read_csv(io.BytesIO(content), dtype=str, keep_default_na=False,
                              sep=None, engine="python")
    except Exception:  # noqa: BLE001 - any parser failure becomes a message
        raise WorkbenchError(f"file {name!r} could not be read as a CSV or Excel table") from None
    raw.columns = [str(c).strip() for c in raw.columns]
    return raw


def _nice(value: float) -> float:
    """A default tolerance rounded to two significant digits (finite, never NaN)."""
    if not math.isfinite(value) or value <= 0:
        return 0.0
    return float(f"{value:.2g}")


def make_field_figure(width: int = 1300, height: int = 440):
    """One FigureWidget with the efficiency and shaft-power charts as two subplots.

    Each subplot holds the traces of :data:`FIELD_TRACES`, in that order: trace ``i`` of the
    efficiency chart is ``data[i]``, of the power chart ``data[len(FIELD_TRACES) + i]``.
    """
    fig = new_figure()
    fig.set_subplots(rows=1, cols=2, horizontal_spacing=0.09,
                     subplot_titles=("Isentropic efficiency", "Shaft power"))
    styles = (
        dict(mode="markers", marker=dict(color=_STEADY_COLOUR, size=6, opacity=0.85)),
        dict(mode="markers", marker=dict(color=_UNSTEADY_COLOUR, size=7, symbol="circle-open",
                                         line=dict(width=1.2))),
        dict(mode="markers", marker=dict(color=_BAR_COLOUR, size=4, symbol="square"),
             error_y=dict(type="data", array=[], visible=True, thickness=1.2, width=4,
                          color=_BAR_COLOUR)),
        dict(mode="markers", marker=dict(color=_DESIGN_COLOUR, size=13, symbol="diamond",
                                         line=dict(color="#ffffff", width=1.5))),
    )
    for col in (1, 2):
        for name, style in zip(FIELD_TRACES, styles):
            fig.add_scatter(x=[], y=[], name=name, legendgroup=name, showlegend=col == 1,
                            row=1, col=col, **style)
    fig.update_layout(
        width=width, height=height, template="simple_white",
        margin=dict(l=64, r=24, t=36, b=96), font=dict(size=12),
        legend=dict(orientation="h", x=0.0, y=-0.2, font=dict(size=11)),
        hovermode="closest")
    fig.update_annotations(font=dict(size=13))
    flow = "inlet volume flow [m³/h]"
    fig.update_xaxes(title_text=flow, showgrid=True, gridcolor="#ececec")
    fig.update_yaxes(showgrid=True, gridcolor="#ececec")
    fig.update_yaxes(title_text="isentropic efficiency [%]", row=1, col=1)
    fig.update_yaxes(title_text="shaft power [kW]", row=1, col=2)
    sync_figure(fig)
    return fig


def update_field_figure(fig, series: dict):
    """Put the chart series into the figure's existing traces (in place, one batch).

    Parameters
    ----------
    fig : plotly.graph_objects.FigureWidget
        From :func:`make_field_figure`.
    series : dict
        ``{"efficiency": {trace name: (x, y, error or None)}, "power": {...}}`` in display
        units (m³/h, %, kW); a trace missing from a chart is emptied.
    """
    n = len(FIELD_TRACES)
    with fig.batch_update():
        for offset, chart in ((0, "efficiency"), (n, "power")):
            for i, name in enumerate(FIELD_TRACES):
                x, y, error = series[chart].get(name, ([], [], None))
                trace = fig.data[offset + i]
                trace.x = np.asarray(x, dtype=float)
                trace.y = np.asarray(y, dtype=float)
                if error is not None:
                    trace.error_y.array = np.asarray(error, dtype=float)
    sync_figure(fig)


class FieldDataPanel(widgets.VBox):
    """Dashboard panel for a file of field-test readings.

    Parameters
    ----------
    file_name : str, optional
        Name of the file given in ``content`` (its suffix chooses CSV or Excel).
    content : bytes, optional
        The file's bytes.
    column_map : dict, optional
        Reading name -> (file column, unit text), to preset the mapping.
    machine : str
        ``"compressor"``, ``"turbine"``, ``"pump"`` or ``"fan"``.
    fluid : str
        Fluid name or ``"Name=fraction; ..."``.
    """

    def __init__(self, file_name: str | None = None, content: bytes | None = None,
                 column_map: dict | None = None, machine: str = "compressor",
                 fluid: str = "Air", backend: str = "HEOS", ambient_pressure: float = 101325.0,
                 design: DesignPoint | None = None, mechanical_efficiency: float = 1.0):
        self.raw: pd.DataFrame | None = None
        self.readings: pd.DataFrame | None = None
        self.results: pd.DataFrame | None = None
        self.deviation: pd.DataFrame | None = None
        self.uncertainty: pd.DataFrame | None = None
        #: Steady-state flags of the last good evaluation (``steady_state_flags`` output).
        self.steady: pd.DataFrame | None = None
        #: Window [rows] and SI tolerances the flags were computed with.
        self.steady_used: tuple[int, dict] | None = None
        self.file_name = file_name or ""
        self._quiet = False
        self._loading_setup = False
        self._tolerance_edited: set[str] = set()

        self.caution = caution_banner(SAFETY_CAUTION)
        self.message = message_area()
        self.upload = widgets.FileUpload(accept=".csv,.txt,.xlsx,.xlsm", multiple=False,
                                         description="Readings file")
        self.upload.add_class("wb-input-file")
        self.upload.observe(self._uploaded, names="value")
        self.machine = self._dropdown("machine", "", MACHINES, machine, "150px", "0px")
        self.fluid = widgets.Text(value=fluid, description="Fluid",
                                  layout=widgets.Layout(width="760px"),
                                  style={"description_width": "170px"})
        self.fluid.add_class("wb-input-fluid")
        self.backend = self._dropdown("backend", "", PROPERTY_MODELS, backend, "150px", "0px")
        self.ambient = NumberEntry("ambient-pressure", "Ambient pressure", "absolute_pressure",
                                   ambient_pressure, system="bar, degC")
        self.mech = NumberEntry("mechanical-efficiency", "Mechanical efficiency", "percent",
                                mechanical_efficiency, system="bar, degC")
        self.map_column: dict[str, widgets.Dropdown] = {}
        self.map_unit: dict[str, widgets.Dropdown] = {}
        #: Steady-state tolerance entries, in the unit of the mapped column.
        self.tolerance: dict[str, widgets.FloatText] = {}
        self.tolerance_unit: dict[str, widgets.Label] = {}
        self._tolerance_box: dict[str, widgets.HBox] = {}
        rows = [widgets.HBox([
            widgets.HTML("<span class='wb-head'>reading and file column</span>",
                         layout=widgets.Layout(width="640px")),
            widgets.HTML("<span class='wb-head'>unit</span>", layout=widgets.Layout(
                width="110px")),
            widgets.HTML("<span class='wb-head'>steady tolerance ±</span>")])]
        for name, (kind, _) in READING_KINDS.items():
            hook = name.replace("_", "-")
            col = self._dropdown(f"map-{hook}", _LABELS[name], [NONE], NONE, "640px",
                                 "300px")
            choices = UNIT_CHOICES["volume_flow" if kind == "volume_flow" else kind]
            unit = widgets.Dropdown(options=choices, value=choices[0],
                                    layout=widgets.Layout(width="110px"))
            unit.add_class(f"wb-input-unit-{hook}")
            tol = widgets.FloatText(value=0.0, continuous_update=False,
                                    layout=widgets.Layout(width="90px"))
            tol.add_class(f"wb-input-tolerance-{hook}")
            tol_unit = widgets.Label(tolerance_unit(choices[0], kind),
                                     layout=widgets.Layout(width="70px"))
            box = widgets.HBox([tol, tol_unit], layout=widgets.Layout(visibility="hidden"))
            self.map_column[name], self.map_unit[name] = col, unit
            self.tolerance[name], self.tolerance_unit[name] = tol, tol_unit
            self._tolerance_box[name] = box
            col.observe(lambda change, n=name: self._mapping_changed(n, change), names="value")
            unit.observe(lambda change, n=name: self._mapping_changed(n, change),
                         names="value")
            tol.observe(lambda change, n=name: self._tolerance_typed(n), names="value")
            rows.append(widgets.HBox([col, unit, box], layout=widgets.Layout(
                align_items="center")))
        self.steady_window = widgets.IntText(
            value=STEADY_WINDOW, description="Steady window (rows)", continuous_update=False,
            style={"description_width": "170px"}, layout=widgets.Layout(width="260px"))
        self.steady_window.add_class("wb-input-steady-window")
        self.steady_window.observe(lambda _change: self._steady_changed(), names="value")
        self.u_pressure = NumberEntry("u-pressure", "Pressure b", "percent", 0.0025,
                                      system="bar, degC")
        self.u_temperature = NumberEntry("u-temperature", "Temperature b", "dimensionless",
                                         0.2, system="bar, degC")
        self.u_temperature.unit.value = "K"
        self.u_flow = NumberEntry("u-flow", "Flow b", "percent", 0.01,
                                  system="bar, degC")
        self.u_power = NumberEntry("u-power", "Power b", "percent", 0.01,
                                   system="bar, degC")
        design = design or DesignPoint()
        self.d_eta = NumberEntry("design-efficiency", "Design efficiency", "percent",
                                 _nan(design.isentropic_efficiency), system="bar, degC")
        self.d_power = NumberEntry("design-power", "Design shaft power", "power",
                                   _nan(design.power), system="bar, degC")
        self.d_flow = NumberEntry("design-flow", "Design inlet flow", "volume_flow",
                                  _nan(design.volume_flow), system="bar, degC")
        self.d_speed = NumberEntry("design-speed", "Rated speed", "dimensionless",
                                   _nan(design.speed), system="bar, degC")
        self.d_speed.unit.value = "rpm"
        self.run = widgets.Button(description="Evaluate all rows", button_style="primary",
                                  layout=widgets.Layout(width="200px", margin="8px 0 4px 0"))
        self.run.add_class("wb-input-evaluate")
        self.run.on_click(lambda _: self.evaluate())

        self.summary = widgets.HTML("No readings yet.", layout=widgets.Layout(width="100%"))
        self.summary.add_class("wb-result-summary")
        self.table = widgets.HTML("", layout=widgets.Layout(max_height="460px",
                                                            overflow="auto", width="100%"))
        self.table.add_class("wb-result-table")
        self.export = widgets.HTML("")
        self.export.add_class("wb-result-export")
        #: The charts: one FigureWidget, two subplots, traces updated in place.
        self.figure = make_field_figure()
        self.figure_view = figure_view(self.figure)
        self.figure_view.add_class("wb-result-figure")

        self.title = widgets.HTML(_title(""))
        header = widgets.HBox([self.title, self.upload], layout=widgets.Layout(
            justify_content="space-between", align_items="center", width="100%"))
        column = widgets.Layout(width="350px", margin="0 16px 0 0")
        machine_box = widgets.VBox([
            self.fluid, widgets.HBox([
                widgets.VBox([_heading("Machine"), _labelled("Machine", self.machine),
                              _labelled("Property model", self.backend), self.ambient,
                              self.mech], layout=column),
                widgets.VBox([_heading("Instrument systematic uncertainty (1 sigma)"),
                              self.u_pressure, self.u_temperature, self.u_flow,
                              self.u_power], layout=column),
                widgets.VBox([_heading("Design point (0 where not given)"),
                              self.d_eta, self.d_power, self.d_flow, self.d_speed],
                             layout=column)], layout=widgets.Layout(flex_flow="row wrap"))])
        columns_box = widgets.VBox([
            *rows,
            widgets.HBox([self.steady_window, widgets.HTML(
                "<div class='wb-note'>A row is steady when no reading strays from its mean "
                "over the window ending at that row by more than its tolerance. Defaults: "
                "±1 % of the reading for pressures, ±2 % for flow and power, ±0.5 % for "
                "speed, ±1 K for temperatures; use the limits of the test code and contract "
                "in force.</div>", layout=widgets.Layout(width="620px", margin="0 0 0 16px"))],
                layout=widgets.Layout(align_items="center", margin="6px 0 0 0"))])
        self.setup_upload = widgets.FileUpload(accept=".json", multiple=False,
                                               description="Load setup")
        self.setup_upload.add_class("wb-input-setup-upload")
        self.setup_upload.observe(self._setup_uploaded, names="value")
        self.setup_save = widgets.Button(description="Prepare setup download",
                                         layout=widgets.Layout(width="200px"))
        self.setup_save.add_class("wb-input-setup-save")
        self.setup_save.on_click(lambda _b: self._refresh_setup_link())
        self.setup_link = widgets.HTML("")
        self.setup_link.add_class("wb-result-setup-link")
        setup_box = widgets.VBox([
            widgets.HTML("<div class='wb-note'>Save the whole setup of this page (column map "
                         "and units, steady-state window and tolerances, machine, fluid, "
                         "ambient pressure, instrument uncertainties, design point) as a JSON "
                         "file with SI values, and load it onto the next file of the same "
                         "logger export. A setup is checked against the loaded file before "
                         "anything changes; the results are evaluated again.</div>",
                         layout=widgets.Layout(width="760px")),
            widgets.HBox([self.setup_upload]),
            widgets.HBox([self.setup_save, self.setup_link],
                         layout=widgets.Layout(align_items="center"))])
        self.setup = widgets.Tab([columns_box, machine_box, setup_box])
        self.setup.set_title(0, "Columns")
        self.setup.set_title(1, "Machine, design")
        self.setup.set_title(2, "Setup file")
        self.setup.add_class("wb-tabs")
        super().__init__([
            widgets.HTML(f"<style>{_CSS}</style>"), header, self.caution, self.setup,
            self.run, self.message, self.summary, self.figure_view, self.table, self.export],
            layout=widgets.Layout(width="100%", max_width="1400px"))
        self.add_class("wb-panel-test-data")
        if content is not None:
            self.load(file_name or "readings.csv", content)
        if column_map:
            self.set_column_map(column_map)

    # ------------------------------------------------------------------ construction helpers
    @staticmethod
    def _dropdown(name, label, options, value, width="520px", label_width="170px"):
        w = widgets.Dropdown(options=list(options), value=value, description=label,
                             style={"description_width": label_width},
                             layout=widgets.Layout(width=width))
        w.add_class(f"wb-input-{name}")
        return w

    @classmethod
    def demo(cls) -> FieldDataPanel:
        """The panel with the invented booster-compressor file loaded and evaluated."""
        panel = cls(DEMO_FILE.name, DEMO_FILE.read_bytes(), DEMO_MAP, machine="compressor",
                    fluid=DEMO_GAS, ambient_pressure=101300.0, mechanical_efficiency=0.985,
                    design=DesignPoint(isentropic_efficiency=0.77, power=1.70e6,
                                       volume_flow=0.65))
        panel.evaluate()
        return panel

    # ------------------------------------------------------------------ file and map
    def _uploaded(self, change):
        value = change["new"]
        if not value:
            return
        item = value[0] if isinstance(value, (tuple, list)) else next(iter(value.values()))
        self.load(item.get("name", "readings.csv"), bytes(item["content"]))

    def load(self, file_name: str, content: bytes):
        """Load a file's bytes; the column choices become the file's headers."""
        try:
            raw = _read_table(file_name, content)
        except WorkbenchError as exc:
            self._fail(str(exc))
            return
        self.raw, self.file_name = raw, file_name
        self.title.value = _title(file_name)
        self._tolerance_edited.clear()
        options = [NONE, *raw.columns]
        for _name, dropdown in self.map_column.items():
            dropdown.options = options
            dropdown.value = NONE
        self._say(f"Loaded {file_name}: {len(raw)} rows, {len(raw.columns)} columns. "
                  "Map the columns and press Evaluate.")

    def set_column_map(self, column_map: dict):
        """Preset the mapping: reading name -> (file column, unit text)."""
        for name, (column, unit) in column_map.items():
            if unit in self.map_unit[name].options:
                self.map_unit[name].value = unit
            if column in self.map_column[name].options:
                self.map_column[name].value = column

    def column_map(self) -> tuple[dict, dict]:
        """The current mapping as (column_map, units) for the readers."""
        cmap, units = {}, {}
        for name, dropdown in self.map_column.items():
            if dropdown.value != NONE:
                cmap[name] = dropdown.value
                units[name] = self.map_unit[name].value
        return cmap, units

    # ------------------------------------------------------------------ steady-state entries
    def _mapping_changed(self, name: str, change):
        """A column or unit choice changed: show the tolerance entry in the mapped unit."""
        try:
            kind = READING_KINDS[name][0]
            mapped = self.map_column[name].value != NONE
            unit = self.map_unit[name].value
            self._tolerance_box[name].layout.visibility = "visible" if mapped else "hidden"
            self.tolerance_unit[name].value = tolerance_unit(unit, kind)
            if not mapped:
                return
            if name in self._tolerance_edited and change["owner"] is self.map_unit[name]:
                # the typed tolerance keeps its size in the new unit
                old = difference_to_si(1.0, change["old"], kind, name)
                new = difference_to_si(1.0, unit, kind, name)
                self._set_tolerance(name, self.tolerance[name].value * old / new)
            elif name not in self._tolerance_edited:
                self._set_tolerance(name, self.default_tolerance(name))
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._fail(f"steady-state tolerance of the {_LABELS[name].lower()}: {exc}")

    def _set_tolerance(self, name: str, value: float):
        self._quiet = True
        try:
            self.tolerance[name].value = float(f"{value:.6g}") if math.isfinite(value) else 0.0
        finally:
            self._quiet = False

    def default_tolerance(self, name: str) -> float:
        """Default steady-state tolerance of a mapped reading, in its mapped unit.

        ±1 K for temperatures; otherwise the fraction :data:`STEADY_DEFAULTS` of the file's
        median reading (absolute pressure for pressures), rounded to two significant digits.
        """
        kind = READING_KINDS[name][0]
        unit = self.map_unit[name].value
        per_unit = difference_to_si(1.0, unit, kind, name)
        if kind == "temperature":
            return _nice(STEADY_DEFAULTS["temperature"] / per_unit)
        values = pd.to_numeric(self.raw[self.map_column[name].value], errors="coerce")
        si = convert_values(values.to_numpy(dtype=float), unit, kind, name,
                            ambient_pressure=self.ambient.si)
        si = si[np.isfinite(si)]
        if not si.size:
            return 0.0
        return _nice(STEADY_DEFAULTS[kind] * float(np.median(np.abs(si))) / per_unit)

    def _tolerance_typed(self, name: str):
        if self._quiet or self._loading_setup:
            return
        self._tolerance_edited.add(name)
        self._steady_changed()

    def steady_settings(self) -> tuple[int, dict]:
        """The window [rows] and the tolerance of every mapped reading in SI units.

        Raises
        ------
        InputError
            If the window is shorter than 2 rows or a tolerance is negative.
        """
        window = self.steady_window.value
        if not isinstance(window, int) or window < 2:
            raise InputError(f"steady-state window of {window!r} rows: it must be at least 2 "
                             "rows")
        cmap, units = self.column_map()
        tolerances = {}
        for name in cmap:
            value = self.tolerance[name].value
            shown = tolerance_unit(units[name], READING_KINDS[name][0])
            if not (math.isfinite(value) and value >= 0):
                raise InputError(f"steady-state tolerance {value:g} {shown} of the "
                                 f"{_LABELS[name].lower()} must be zero or positive")
            tolerances[name] = difference_to_si(value, units[name], READING_KINDS[name][0],
                                                name)
        return window, tolerances

    def _steady_flags(self, readings: pd.DataFrame):
        window, tolerances = self.steady_settings()
        flags = steady_state_flags(readings, list(tolerances), window, tolerances)
        return flags, (window, tolerances)

    def _steady_changed(self):
        """A window or tolerance changed: flag the last readings again (no re-evaluation)."""
        if self.readings is None or self._loading_setup:
            return
        try:
            flags, used = self._steady_flags(self.readings)
        except WorkbenchError as exc:
            self._fail(str(exc))
            return
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._fail(f"the steady-state check failed ({type(exc).__name__})")
            return
        self.steady, self.steady_used = flags, used
        self._show()

    # ------------------------------------------------------------------ evaluation
    def evaluate(self) -> bool:
        """Convert, evaluate, propagate, flag and compare; show the results or a message.

        Returns True when the results were computed and shown.
        """
        if self.raw is None:
            self._fail("load a readings file first")
            return False
        try:
            cmap, units = self.column_map()
            fluid = parse_fluid(self.fluid.value, self.backend.value)
            readings = readings_from_frame(self.raw, cmap, units,
                                           ambient_pressure=self.ambient.si)
            steady, used = self._steady_flags(readings)
            results = evaluate(readings, self.machine.value, fluid,
                               mechanical_efficiency=self.mech.si,
                               results=("power", "shaft_power", "isentropic_efficiency",
                                        "isentropic_head", "pressure_ratio",
                                        "outlet_temperature", "mass_flow",
                                        "inlet_volume_flow"))
            deviation = compare_with_design(results, self._design(),
                                            power_column="shaft_power")
            uncertainty = self._uncertainty(readings, results, fluid)
        except WorkbenchError as exc:
            self._fail(str(exc))
            return False
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._fail(f"the evaluation failed ({type(exc).__name__}): check the column map, "
                       "the units and the fluid")
            return False
        self.readings, self.results = readings, results
        self.deviation, self.uncertainty = deviation, uncertainty
        self.steady, self.steady_used = steady, used
        self._show()
        return True

    def _design(self) -> DesignPoint:
        def given(entry):
            return entry.si if math.isfinite(entry.si) and entry.si > 0 else None

        return DesignPoint(isentropic_efficiency=given(self.d_eta), power=given(self.d_power),
                           volume_flow=given(self.d_flow), speed=given(self.d_speed))

    def _uncertainty(self, readings, results, fluid) -> pd.DataFrame:
        ok = np.flatnonzero((results["status"] == "ok").to_numpy())
        picks = ok[np.unique(np.linspace(0, len(ok) - 1, min(UNCERTAINTY_ROWS, len(ok)))
                             .astype(int))] if len(ok) else []
        rows = []
        for i in picks:
            row = readings.iloc[i]
            nominal, u = {}, {}
            for name in READING_KINDS:
                if name in readings.columns and name != "speed":
                    nominal[name] = float(row[name])
                    kind = READING_KINDS[name][0]
                    if kind == "pressure":
                        u[name] = (self.u_pressure.si * nominal[name], 0.0)
                    elif kind == "temperature":
                        u[name] = (self.u_temperature.si, 0.0)
                    elif kind == "power":
                        u[name] = (self.u_power.si * nominal[name], 0.0)
                    else:
                        u[name] = (self.u_flow.si * nominal[name], 0.0)
            if "outlet_temperature" in nominal:
                nominal.pop("power", None)
                u.pop("power", None)
            try:
                rep = propagate_uncertainty(nominal, u, ("isentropic_efficiency",
                                                         "shaft_power"),
                                            machine=self.machine.value, fluid=fluid,
                                            mechanical_efficiency=self.mech.si)
            except WorkbenchError:
                continue
            rows.append({"row": results.index[i],
                         "U95_isentropic_efficiency": rep.expanded["isentropic_efficiency"],
                         "U95_shaft_power": rep.expanded["shaft_power"],
                         "dominant_efficiency": rep.dominant["isentropic_efficiency"],
                         "dominant_shaft_power": rep.dominant["shaft_power"]})
        return pd.DataFrame(rows, columns=["row", "U95_isentropic_efficiency",
                                           "U95_shaft_power", "dominant_efficiency",
                                           "dominant_shaft_power"])

    # ------------------------------------------------------------------ setup files
    def to_setup(self) -> dict:
        """The whole setup of the panel as a setup dict (SI values; see
        :mod:`workbench.ui.test_setup`).

        Raises
        ------
        InputError
            If the steady-state window or a tolerance is not valid (see
            :meth:`steady_settings`).
        """
        window, tolerances = self.steady_settings()
        cmap, units = self.column_map()
        design = self._design()
        return test_setup.make_setup(
            machine=self.machine.value, fluid=self.fluid.value,
            property_model=self.backend.value, ambient_pressure=self.ambient.si,
            mechanical_efficiency=self.mech.si,
            columns={name: (cmap[name], units[name], tolerances[name]) for name in cmap},
            steady_window=window,
            uncertainty={"pressure_fraction": self.u_pressure.si,
                         "temperature_K": self.u_temperature.si,
                         "flow_fraction": self.u_flow.si, "power_fraction": self.u_power.si},
            design={"isentropic_efficiency": design.isentropic_efficiency,
                    "shaft_power_W": design.power,
                    "inlet_volume_flow_m3_per_s": design.volume_flow,
                    "speed_rpm": design.speed},
            readings_file=self.file_name)

    def setup_json(self) -> str:
        """JSON text of :meth:`to_setup`."""
        return test_setup.setup_json(self.to_setup())

    def load_setup(self, source, name: str = "") -> bool:
        """Load a setup (dict, JSON text or bytes, or path) onto the loaded readings file.

        The setup is validated first, against the loaded file's columns, and its fluid and
        column map are tried; if anything is wrong the message area says so (naming the key)
        and nothing in the panel changes.  Otherwise every entry takes the setup's value and
        the rows are evaluated again.  Never raises.

        Parameters
        ----------
        source : dict, str, bytes or pathlib.Path
            The setup.
        name : str
            Name of the setup file, for the message.

        Returns
        -------
        bool
            True when the setup was loaded (the evaluation's outcome is in the message area).
        """
        try:
            if self.raw is None:
                raise WorkbenchError("load the readings file first: a setup maps its columns")
            setup = test_setup.read_setup(source, list(self.raw.columns), self.file_name)
            columns = setup["columns"]
            # try what validation alone cannot settle: the fluid and the conversion
            try:
                parse_fluid(setup["fluid"], setup["property_model"])
            except WorkbenchError as exc:
                raise CaseFileError(f"setup key 'fluid' = {setup['fluid']!r} (property model "
                                    f"{setup['property_model']}): {exc}") from None
            try:
                readings_from_frame(self.raw, {n: c["column"] for n, c in columns.items()},
                                    {n: c["unit"] for n, c in columns.items()},
                                    ambient_pressure=setup["ambient_pressure_Pa"])
            except WorkbenchError as exc:
                raise CaseFileError(f"setup key 'columns': {exc}") from None
        except WorkbenchError as exc:  # the panel and its results stay as they were
            self._say(f"setup not loaded: {exc}", error=True)
            return False
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._say(f"setup not loaded: it could not be read ({type(exc).__name__})",
                      error=True)
            return False
        try:
            self._apply_setup(setup)
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._fail(f"the setup was only partly applied ({type(exc).__name__}: {exc}); "
                       "check the entries")
            return False
        made_with = setup["readings_file"]
        note = (f" (made with {made_with})" if made_with and made_with != self.file_name
                else "")
        loaded = f"Setup {name + ' ' if name else ''}loaded{note}."
        if self.evaluate():
            rest = self.message.value
            self._say(loaded)
            self.message.value += rest
        else:
            self.message.value = (f"<div style='color:#333333;padding:2px 0'>"
                                  f"{html.escape(loaded)}</div>" + self.message.value)
        return True

    def _apply_setup(self, setup: dict):
        """Put a validated setup into the entries (no evaluation, no observers' re-flagging)."""
        self._loading_setup = True
        try:
            self.machine.value = setup["machine"]
            self.backend.value = setup["property_model"]
            self.fluid.value = setup["fluid"]
            self.ambient.set_si(setup["ambient_pressure_Pa"])
            self.mech.set_si(setup["mechanical_efficiency"])
            u = setup["instrument_uncertainty"]
            self.u_pressure.set_si(u["pressure_fraction"])
            self.u_temperature.set_si(u["temperature_K"])
            self.u_flow.set_si(u["flow_fraction"])
            self.u_power.set_si(u["power_fraction"])
            d = setup["design_point"]
            for entry, key in ((self.d_eta, "isentropic_efficiency"),
                               (self.d_power, "shaft_power_W"),
                               (self.d_flow, "inlet_volume_flow_m3_per_s"),
                               (self.d_speed, "speed_rpm")):
                entry.set_si(_nan(d[key]))
            self.steady_window.value = setup["steady_window_rows"]
            columns = setup["columns"]
            for name in READING_KINDS:
                self._tolerance_edited.discard(name)
                if name not in columns:
                    self.map_column[name].value = NONE
                    continue
                self.map_unit[name].value = columns[name]["unit"]
                self.map_column[name].value = columns[name]["column"]
            for name, entry in columns.items():
                kind = READING_KINDS[name][0]
                si = entry[test_setup.TOLERANCE_KEYS[kind]]
                self._quiet = True
                try:
                    self.tolerance[name].value = difference_from_si(si, entry["unit"], kind,
                                                                    name)
                finally:
                    self._quiet = False
                self._tolerance_edited.add(name)
        finally:
            self._loading_setup = False

    def _setup_uploaded(self, change):
        value = change["new"]
        if not value:
            return
        try:
            item = value[0] if isinstance(value, (tuple, list)) else next(iter(value.values()))
            content = item["content"] if isinstance(item, dict) else item.content
            name = item.get("name", "") if isinstance(item, dict) else getattr(item, "name", "")
            self.load_setup(bytes(content), name)
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._say(f"setup not loaded: the upload could not be read "
                      f"({type(exc).__name__})", error=True)
        self.setup_upload.value = ()  # so the same file can be loaded again

    def _refresh_setup_link(self):
        """Put the current setup into the download link (a data: URL), or say what is wrong."""
        try:
            text = self.setup_json()
        except WorkbenchError as exc:
            self._say(f"setup not saved: {exc}", error=True)
            return
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._say(f"setup not saved ({type(exc).__name__})", error=True)
            return
        stem = pathlib.Path(self.file_name).stem if self.file_name else "test"
        encoded = base64.b64encode(text.encode("utf-8")).decode("ascii")
        self.setup_link.value = (
            f"<a download='{html.escape(stem + '-setup.json', quote=True)}' "
            f"href='data:application/json;base64,{encoded}' target='_blank'>"
            "Download the setup (JSON, SI values)</a>")

    # ------------------------------------------------------------------ display
    def _say(self, text: str, error: bool = False):
        colour = "#9a3b00" if error else "#333333"
        self.message.value = (f"<div style='color:{colour};padding:2px 0'>"
                              f"{html.escape(text)}</div>" if text else "")

    def _fail(self, text: str):
        self._say(text, error=True)
        if self.results is not None:
            self.summary.value = self.summary.value.replace(
                "<span class='wb-fresh'>", "<span class='wb-stale' style='color:#8a8a8a'>")

    def summary_numbers(self) -> dict:
        """Counts and means of the last evaluation (SI units), for printing."""
        r = self.results
        ok_rows = r["status"] == "ok"
        ok = r[ok_rows]
        steady = self.steady["steady"]
        steady_ok = r[ok_rows & steady]
        return {"rows": len(r), "ok": len(ok), "flagged": len(r) - len(ok),
                "steady": int(steady.sum()), "steady_ok": len(steady_ok),
                "steady_window": self.steady_used[0],
                "mean_isentropic_efficiency": float(ok["isentropic_efficiency"].mean()),
                "mean_isentropic_efficiency_steady": float(
                    steady_ok["isentropic_efficiency"].mean()) if len(steady_ok) else math.nan,
                "mean_power_W": float(ok["power"].mean()),
                "mean_shaft_power_W": float(ok["shaft_power"].mean()),
                "mean_U95_isentropic_efficiency": float(
                    self.uncertainty["U95_isentropic_efficiency"].mean())
                if len(self.uncertainty) else math.nan}

    def _show(self):
        r = self.results
        s = self.summary_numbers()
        counts = r["status"].value_counts()
        parts = ", ".join(f"{html.escape(k)}: {v}" for k, v in counts.items())
        dominant = ""
        if len(self.uncertainty):
            dom = self.uncertainty["dominant_efficiency"].mode().iloc[0]
            dominant = (f"<br>Efficiency U95 about "
                        f"{100 * s['mean_U95_isentropic_efficiency']:.2f} points at the "
                        f"sampled rows, mostly from the {html.escape(dom.replace('_', ' '))}.")
        steady_mean = (f" ({100 * s['mean_isentropic_efficiency_steady']:.2f} % over the "
                       "steady rows)" if math.isfinite(s["mean_isentropic_efficiency_steady"])
                       else "")
        self.summary.value = (
            f"<div class='wb-summary'><span class='wb-fresh'><b>{s['rows']} rows</b> "
            f"({parts}).<br><b>Steady: {s['steady']} of {s['rows']} rows</b> "
            f"({s['steady_ok']} of them ok; window {s['steady_window']} rows).<br>"
            f"Mean isentropic efficiency {100 * s['mean_isentropic_efficiency']:.2f} %"
            f"{steady_mean}, mean shaft power {s['mean_shaft_power_W'] / 1e3:.1f} kW."
            f"{dominant}</span></div>")
        self._say("" if s["flagged"] == 0 else
                  f"{s['flagged']} row(s) flagged; their messages are in the table and the CSV.")
        self._plot()
        self.table.value = self._table_html()
        csv = self.export_frame().to_csv(index=False).encode()
        self.export.value = (
            f"<a download='results.csv' href='data:text/csv;base64,"
            f"{base64.b64encode(csv).decode()}'>Download all {len(r)} rows as CSV</a>"
            " (SI units; <code>steady</code> and each reading's largest deviation from its "
            "window mean)")
        self._refresh_setup_link()

    def export_frame(self) -> pd.DataFrame:
        """Readings, status, message, results, design deviations and steady flags (SI)."""
        return pd.concat([self.results, self.deviation, self.steady], axis=1)

    def chart_series(self) -> dict:
        """Chart data in display units: ``{"efficiency"|"power": {trace: (x, y, error)}}``.

        x is the inlet volume flow [m³/h], y the isentropic efficiency [%] or the shaft power
        [kW]; rows that are not ok are left out.
        """
        r = self.results
        ok = (r["status"] == "ok").to_numpy()
        steady = self.steady["steady"].to_numpy(dtype=bool)
        flow = 3600 * r["inlet_volume_flow"].to_numpy(dtype=float)
        eta = 100 * r["isentropic_efficiency"].to_numpy(dtype=float)
        power = r["shaft_power"].to_numpy(dtype=float) / 1e3
        eff_series, pwr_series = {}, {}
        for name, pick in (("steady rows", ok & steady), ("unsteady rows", ok & ~steady)):
            eff_series[name] = (flow[pick], eta[pick], None)
            pwr_series[name] = (flow[pick], power[pick], None)
        u = self.uncertainty
        at = r.loc[u["row"]]
        q = 3600 * at["inlet_volume_flow"].to_numpy(dtype=float)
        eff_series["U95 at sampled rows"] = (
            q, 100 * at["isentropic_efficiency"].to_numpy(dtype=float),
            100 * u["U95_isentropic_efficiency"].to_numpy(dtype=float))
        pwr_series["U95 at sampled rows"] = (
            q, at["shaft_power"].to_numpy(dtype=float) / 1e3,
            u["U95_shaft_power"].to_numpy(dtype=float) / 1e3)
        d = self._design()
        if d.volume_flow is not None and d.isentropic_efficiency is not None:
            eff_series["design point"] = ([3600 * d.volume_flow],
                                          [100 * d.isentropic_efficiency], None)
        if d.volume_flow is not None and d.power is not None:
            pwr_series["design point"] = ([3600 * d.volume_flow], [d.power / 1e3], None)
        return {"efficiency": eff_series, "power": pwr_series}

    def _plot(self):
        try:
            update_field_figure(self.figure, self.chart_series())
            refresh_view(self.figure_view, self.figure)
        except Exception as exc:  # noqa: BLE001 - the table stays good; the chart is not
            self._say(f"the charts could not be drawn ({type(exc).__name__}: {exc})",
                      error=True)

    def _steady_text(self, index) -> tuple[bool, str]:
        """(steady, cell text) of a row: the readings that strayed, or why the row is not."""
        flags = self.steady
        if bool(flags.at[index, "steady"]):
            return True, "yes"
        window, tolerances = self.steady_used
        if flags.index.get_loc(index) < window - 1:
            return False, "no: window not yet full"
        strayed, missing = [], False
        for name, tol in tolerances.items():
            dev = flags.at[index, f"{name}_max_deviation"]
            if not math.isfinite(dev):
                missing = True
            elif dev > tol and _SHORT[name] not in strayed:
                strayed.append(_SHORT[name])
        if strayed:
            return False, "no: " + ", ".join(strayed)
        return False, "no: reading missing in window" if missing else "no"

    def _table_html(self) -> str:
        r = self.results
        flagged = r[r["status"] != "ok"]
        shown = pd.concat([flagged, r[r["status"] == "ok"].head(max(0, TABLE_ROWS - len(flagged)))])
        cols = [("status", "status", None), ("message", "message", None),
                ("isentropic_efficiency", "eff. %", lambda v: f"{100 * v:.2f}"),
                ("shaft_power", "shaft kW", lambda v: f"{v / 1e3:.1f}"),
                ("inlet_volume_flow", "Q1 m³/h", lambda v: f"{3600 * v:.0f}"),
                ("pressure_ratio", "ratio", lambda v: f"{v:.3f}")]
        if self.deviation is not None and "efficiency_deviation_points" in self.deviation:
            shown = shown.join(self.deviation[["efficiency_deviation_points"]])
            cols.append(("efficiency_deviation_points", "eff. dev. points",
                         lambda v: f"{v:+.2f}"))
        head = "".join(f"<th>{html.escape(label)}</th>" for _, label, _ in cols)
        body = []
        for index, row in shown.iterrows():
            good = row["status"] == "ok"
            style = "" if good else f" style='background:{_FLAGGED_ROW}'"
            css = "wb-row-ok" if good else "wb-row-flagged"
            steady, steady_text = self._steady_text(index)
            steady_cell = ("<td class='wb-steady-yes'>yes</td>" if steady else
                           f"<td class='wb-steady-no' style='background:{_UNSTEADY_CELL}'>"
                           f"{html.escape(steady_text)}</td>")
            cells = []
            for key, _, fmt in cols:
                v = row.get(key)
                if fmt is None:
                    text = "" if v is None else str(v)
                    css_cell = " class='wb-msg'" if key == "message" else ""
                    cells.append(f"<td{css_cell}>{html.escape(text)}</td>")
                else:
                    text = fmt(v) if isinstance(v, float) and math.isfinite(v) else "–"
                    cells.append(f"<td class='wb-num'>{html.escape(text)}</td>")
            body.append(f"<tr class='{css}'{style}><td class='wb-num'>{html.escape(str(index))}"
                        f"</td>{steady_cell}{''.join(cells)}</tr>")
        note = (f"<p class='wb-note'>Showing {len(shown)} of {len(r)} rows: every flagged row "
                "(shaded orange) first, then the first rows that were computed; the CSV has "
                "every row. Cells of unsteady rows are blue-grey.</p>")
        return (note + "<table class='wb-table'><thead><tr><th>row</th><th>steady</th>"
                f"{head}</tr></thead><tbody>{''.join(body)}</tbody></table>")


#: Page styles of the panel (scoped to its own classes).
_CSS = """
.wb-panel-test-data { font-size: 13px; color: #222; }
.wb-panel-test-data .widget-html-content { line-height: 1.4; }
.wb-panel-test-data .wb-section { font-weight: 600; margin: 10px 0 4px 0; padding-bottom: 2px;
  border-bottom: 1px solid #d4d8dd; color: #2b3a4a; }
.wb-panel-test-data .wb-head { font-size: 11px; color: #666; text-transform: uppercase;
  letter-spacing: 0.04em; }
.wb-panel-test-data .wb-summary { border-left: 3px solid #2e6b8a; background: #f4f7f9;
  padding: 6px 10px; margin: 6px 0; line-height: 1.5; }
.wb-panel-test-data .wb-note { color: #555; margin: 4px 0; font-size: 12px; }
.wb-panel-test-data .wb-file { font-weight: 400; color: #555; font-size: 14px;
  margin-left: 8px; }
.wb-panel-test-data .wb-table { border-collapse: collapse; font-size: 12px; }
.wb-panel-test-data .wb-table th { position: sticky; top: 0; background: #eef1f4;
  text-align: left; font-weight: 600; border-bottom: 1px solid #c8ced5; }
.wb-panel-test-data .wb-table td, .wb-panel-test-data .wb-table th { padding: 2px 8px;
  white-space: nowrap; vertical-align: top; }
.wb-panel-test-data .wb-table td.wb-msg { white-space: normal; min-width: 260px;
  max-width: 520px; }
.wb-panel-test-data .wb-table tbody tr { border-bottom: 1px solid #eceff2; }
.wb-panel-test-data .wb-table td.wb-num { text-align: right;
  font-variant-numeric: tabular-nums; }
"""


def _title(file_name: str) -> str:
    name = (f" <span class='wb-file'>{html.escape(file_name)}</span>" if file_name else "")
    return f"<h3 style='margin:4px 0'>Readings file{name}</h3>"


def _labelled(label: str, widget) -> widgets.HBox:
    """A widget behind a left-aligned label, lined up with the number entries."""
    return widgets.HBox([widgets.Label(label, layout=widgets.Layout(width="170px")), widget],
                        layout=widgets.Layout(align_items="center"))


def _heading(text: str) -> widgets.HTML:
    return widgets.HTML(f"<div class='wb-section'>{html.escape(text)}</div>")


def _nan(value):
    """An entry value for an optional design number: 0 stands for 'not given'."""
    return 0.0 if value is None else float(value)


__all__ = ["FieldDataPanel", "parse_fluid", "make_field_figure", "update_field_figure",
           "difference_to_si", "tolerance_unit", "DEMO_FILE", "DEMO_MAP", "FIELD_TRACES",
           "STEADY_DEFAULTS", "STEADY_WINDOW"]
