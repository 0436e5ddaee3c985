"""Readings dashboard: load a file of field-test readings, map its columns, evaluate every row.

The panel binds widgets to the field-test session (:mod:`workbench.fieldtest.session`) and
shows its result or its message; it computes nothing itself.  The session reads the file
(:func:`~workbench.fieldtest.session.read_table`, at most
:data:`~workbench.fieldtest.session.UPLOAD_LIMIT_BYTES`), evaluates every row, flags unsteady
rows, compares with the design point and propagates the instrument uncertainties at a sample
of rows (:func:`~workbench.fieldtest.session.evaluate_session`).  A bad file, a wrong column
map, a bad tolerance or a bad row never raises into the page: the message area says what is
wrong and the last good table stays visible, its summary marked stale.  Evaluating a file of
:data:`PROGRESS_ROWS` rows or more shows a progress bar.

Charts (:mod:`workbench.ui.readings_chart`): one plotly FigureWidget with two subplots,
isentropic efficiency and shaft power against inlet volume flow, updated in place.

Steady state: tolerances are entered per reading, as a difference in the unit the column is
mapped in (bar for a bar(g) column, degC or K for temperatures, the flow unit for flow).  The
defaults, set when a column is chosen, are typical permissible fluctuations (common practice,
from memory; see :func:`workbench.fieldtest.session.default_tolerance`).

Setup files: the whole setup is saved as plain JSON with SI values and loaded back onto the
next file of the same logger export (:mod:`workbench.fieldtest.setup_file`); a setup that does
not fit the loaded file is refused with a message and the panel keeps its state.

CSS hooks: ``wb-input-<name>`` on every entry, ``wb-result-<name>`` on every result
(``wb-result-progress`` on the progress bar), ``wb-message`` on the message area,
``wb-caution`` on the caution banner; table rows and cells as in
:mod:`workbench.ui.readings_view`.

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
ASME PTC 19.1-2013, Test Uncertainty.
"""

from __future__ import annotations

import functools
import math
import pathlib
from contextlib import contextmanager

import ipywidgets as widgets

from ..fieldtest.design import DesignPoint
from ..fieldtest.readers import READING_KINDS
from ..fieldtest.session import (
    STEADY_WINDOW,
    SessionSetup,
    default_tolerance,
    evaluate_session,
    read_table,
    reflag,
    setup_from_file,
    tolerances_to_si,
)
from ..fieldtest.setup_file import (
    MACHINES,
    PROPERTY_MODELS,
    difference_from_si,
    difference_to_si,
    setup_json,
)
from . import readings_view as view
from .charts import figure_view, refresh_view
from .common import NumberEntry, Panel, download_link, input_class, result_class
from .readings_chart import make_readings_figure, update_readings_figure
from .readings_entries import (
    LABELS,
    NONE,
    ColumnRow,
    column_header,
    dropdown,
    heading,
    labelled,
    note,
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
#: Files of at least this many rows show a progress bar while they are evaluated.
PROGRESS_ROWS = 1000

_SYSTEM = "bar, degC"  # display units of the number entries


class ReadingsPanel(Panel):
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
    backend : str
        Property model, ``"HEOS"`` or ``"IF97"``.
    ambient_pressure : float
        Ambient pressure [Pa].
    design : DesignPoint, optional
        Design point (efficiency, shaft power, inlet volume flow, rated speed).
    mechanical_efficiency : float
        Mechanical efficiency [-].

    Attributes
    ----------
    result : workbench.fieldtest.session.SessionResult or None
        The last good evaluation (kept, marked stale, when a later one fails).
    raw : pandas.DataFrame or None
        The table of the loaded file (:func:`~workbench.fieldtest.session.read_table`).
    """

    css_class = "wb-panel-test-data"

    def __init__(self, file_name: str | None = None, content: bytes | None = None,
                 column_map: dict | None = None, machine: str = "compressor",
                 fluid: str = "Air", backend: str = "HEOS", ambient_pressure: float = 101325.0,
                 design: DesignPoint | None = None, mechanical_efficiency: float = 1.0):
        self._ensure_plumbing()
        self.raw = None
        self.file_name = file_name or ""
        self._tolerance_edited: set[str] = set()
        self._build(machine, fluid, backend, ambient_pressure, mechanical_efficiency,
                    design or DesignPoint())
        if content is not None:
            self.load(file_name or "readings.csv", content)
        if column_map:
            self.set_column_map(column_map)

    # ------------------------------------------------------------------ construction
    def _build(self, machine, fluid, backend, ambient_pressure, mechanical_efficiency, design):
        self.upload = widgets.FileUpload(accept=".csv,.txt,.xlsx,.xlsm", multiple=False,
                                         description="Readings file")
        input_class(self.upload, "file")
        self.upload.observe(self.guard(self._uploaded, "the upload could not be read: "),
                            names="value")
        self.machine = dropdown("machine", "", MACHINES, machine, "150px", "0px")
        self.fluid = widgets.Text(value=fluid, description="Fluid",
                                  layout=widgets.Layout(width="760px"),
                                  style={"description_width": "170px"})
        input_class(self.fluid, "fluid")
        self.backend = dropdown("backend", "", PROPERTY_MODELS, backend, "150px", "0px")
        self.ambient = NumberEntry("ambient-pressure", "Ambient pressure", "absolute_pressure",
                                   ambient_pressure, system=_SYSTEM)
        self.mech = NumberEntry("mechanical-efficiency", "Mechanical efficiency", "percent",
                                mechanical_efficiency, system=_SYSTEM)
        self.rows = {name: ColumnRow(name) for name in READING_KINDS}
        self.map_column = {name: row.column for name, row in self.rows.items()}
        self.map_unit = {name: row.unit for name, row in self.rows.items()}
        self.tolerance = {name: row.tolerance for name, row in self.rows.items()}
        self.tolerance_unit = {name: row.tolerance_unit for name, row in self.rows.items()}
        for name, row in self.rows.items():
            prefix = f"steady-state tolerance of the {LABELS[name].lower()}: "
            changed = self.guard(functools.partial(self._mapping_changed, name), prefix)
            row.column.observe(changed, "value")
            row.unit.observe(changed, "value")
            row.tolerance.observe(self.guard(functools.partial(self._tolerance_typed, name)),
                                  "value")
        self.steady_window = widgets.IntText(
            value=STEADY_WINDOW, description="Steady window (rows)", continuous_update=False,
            style={"description_width": "170px"}, layout=widgets.Layout(width="260px"))
        input_class(self.steady_window, "steady-window")
        self.steady_window.observe(self.guard(lambda _change: self._steady_changed()),
                                   names="value")
        self._build_uncertainty_and_design(design)
        self.run = widgets.Button(description="Evaluate all rows", button_style="primary",
                                  layout=widgets.Layout(width="200px", margin="8px 0 4px 0"))
        input_class(self.run, "evaluate")
        self.run.on_click(self.guard(lambda _: self.evaluate()))
        self.progress = widgets.IntProgress(value=0, min=0, max=100, description="Evaluating",
                                            layout=widgets.Layout(width="400px",
                                                                  display="none"))
        result_class(self.progress, "progress")
        self.summary = widgets.HTML("No readings yet.", layout=widgets.Layout(width="100%"))
        result_class(self.summary, "summary")
        self.table = widgets.HTML("", layout=widgets.Layout(max_height="460px",
                                                            overflow="auto", width="100%"))
        result_class(self.table, "table")
        self.export = widgets.HTML("")
        result_class(self.export, "export")
        #: The charts: one FigureWidget, two subplots, traces updated in place.
        self.figure = make_readings_figure()
        self.figure_view = figure_view(self.figure)
        result_class(self.figure_view, "figure")
        self.title = widgets.HTML(view.title_html(""))
        header = widgets.HBox([self.title, self.upload], layout=widgets.Layout(
            justify_content="space-between", align_items="center", width="100%"))
        self.setup = widgets.Tab([self._columns_tab(), self._machine_tab(), self._setup_tab()])
        for i, title in enumerate(("Columns", "Machine, design", "Setup file")):
            self.setup.set_title(i, title)
        self.setup.add_class("wb-tabs")
        super().__init__([
            widgets.HTML(f"<style>{view.CSS}</style>"), header, self.caution, self.setup,
            widgets.HBox([self.run, self.progress], layout=widgets.Layout(
                align_items="center")),
            self.message, self.summary, self.figure_view, self.table, self.export],
            layout=widgets.Layout(width="100%", max_width="1400px"))

    def _build_uncertainty_and_design(self, design: DesignPoint):
        def entry(name, label, kind, value, unit=None):
            e = NumberEntry(name, label, kind, 0.0 if value is None else value, system=_SYSTEM)
            if unit:
                e.unit.value = unit
            return e

        self.u_pressure = entry("u-pressure", "Pressure b", "percent", 0.0025)
        self.u_temperature = entry("u-temperature", "Temperature b", "dimensionless", 0.2, "K")
        self.u_flow = entry("u-flow", "Flow b", "percent", 0.01)
        self.u_power = entry("u-power", "Power b", "percent", 0.01)
        # 0 stands for "not given": NaN cannot travel to the browser as a widget value
        self.d_eta = entry("design-efficiency", "Design efficiency", "percent",
                           design.isentropic_efficiency)
        self.d_power = entry("design-power", "Design shaft power", "power", design.power)
        self.d_flow = entry("design-flow", "Design inlet flow", "volume_flow",
                            design.volume_flow)
        self.d_speed = entry("design-speed", "Rated speed", "dimensionless", design.speed, "rpm")

    def _columns_tab(self):
        return widgets.VBox([
            column_header(), *self.rows.values(),
            widgets.HBox([self.steady_window, note(
                "A row is steady when no reading strays from its mean over the window ending "
                "at that row by more than its tolerance. Defaults: ±1 % of the reading for "
                "pressures, ±2 % for flow and power, ±0.5 % for speed, ±1 K for "
                "temperatures; use the limits of the test code and contract in force.",
                "620px", "0 0 0 16px")],
                layout=widgets.Layout(align_items="center", margin="6px 0 0 0"))])

    def _machine_tab(self):
        column = widgets.Layout(width="350px", margin="0 16px 0 0")
        return widgets.VBox([self.fluid, widgets.HBox([
            widgets.VBox([heading("Machine"), labelled("Machine", self.machine),
                          labelled("Property model", self.backend), self.ambient, self.mech],
                         layout=column),
            widgets.VBox([heading("Instrument systematic uncertainty (1 sigma)"),
                          self.u_pressure, self.u_temperature, self.u_flow, self.u_power],
                         layout=column),
            widgets.VBox([heading("Design point (0 where not given)"),
                          self.d_eta, self.d_power, self.d_flow, self.d_speed],
                         layout=column)], layout=widgets.Layout(flex_flow="row wrap"))])

    def _setup_tab(self):
        self.setup_upload = widgets.FileUpload(accept=".json", multiple=False,
                                               description="Load setup")
        input_class(self.setup_upload, "setup-upload")
        self.setup_upload.observe(self._setup_uploaded, names="value")  # guarded inside
        self.setup_save = widgets.Button(description="Prepare setup download",
                                         layout=widgets.Layout(width="200px"))
        input_class(self.setup_save, "setup-save")
        self.setup_save.on_click(self.guard(lambda _b: self._refresh_setup_link(),
                                            "setup not saved: "))
        self.setup_link = widgets.HTML("")
        result_class(self.setup_link, "setup-link")
        return widgets.VBox([
            note("Save the whole setup of this page (column map and units, steady-state "
                 "window and tolerances, machine, fluid, ambient pressure, instrument "
                 "uncertainties, design point) as a JSON file with SI values, and load it "
                 "onto the next file of the same logger export. A setup is checked against "
                 "the loaded file before anything changes; the results are evaluated again."),
            widgets.HBox([self.setup_upload]),
            widgets.HBox([self.setup_save, self.setup_link],
                         layout=widgets.Layout(align_items="center"))])

    @classmethod
    def demo(cls) -> ReadingsPanel:
        """The panel with the invented booster-compressor file loaded and evaluated."""
        panel = cls(DEMO_FILE.name, DEMO_FILE.read_bytes(), DEMO_MAP, machine="compressor",
                    fluid=DEMO_GAS, ambient_pressure=101300.0, mechanical_efficiency=0.985,
                    design=DesignPoint(isentropic_efficiency=0.77, power=1.70e6,
                                       volume_flow=0.65))
        panel.evaluate()
        return panel

    # ------------------------------------------------------------------ the last result
    @property
    def session(self):
        """The last good evaluation (same as :attr:`result`), or None."""
        return self.result

    @property
    def results(self):
        """Result rows of the last good evaluation (``evaluate`` output), or None."""
        return None if self.result is None else self.result.results

    @property
    def readings(self):
        """Readings in SI units of the last good evaluation, or None."""
        return None if self.result is None else self.result.readings

    @property
    def steady(self):
        """Steady-state flags of the last good evaluation, or None."""
        return None if self.result is None else self.result.steady

    @property
    def deviation(self):
        """Deviations from the design point of the last good evaluation, or None."""
        return None if self.result is None else self.result.deviation

    @property
    def uncertainty(self):
        """U95 at the sampled rows of the last good evaluation, or None."""
        return None if self.result is None else self.result.uncertainty

    def summary_numbers(self) -> dict:
        """Counts and means of the last evaluation (SI units; see ``SessionResult.summary``)."""
        return self.result.summary()

    def chart_series(self) -> dict:
        """Chart data of the last evaluation (SI units; ``SessionResult.chart_series``)."""
        return self.result.chart_series()

    def export_frame(self):
        """Readings, status, message, results, deviations and steady flags (SI units)."""
        return self.result.export_frame()

    # ------------------------------------------------------------------ file and map
    def _uploaded(self, change):
        value = change["new"]
        if not value:
            return
        try:
            item = value[0] if isinstance(value, (tuple, list)) else next(iter(value.values()))
            self.load(item.get("name", "readings.csv"), item["content"])
        finally:
            with self.quiet():
                self.upload.value = ()  # the bytes are not kept twice; the same file can
                # be chosen again

    def load(self, file_name: str, content: bytes) -> bool:
        """Load a file's bytes; the column choices become the file's headers.

        A file that cannot be read (larger than
        :data:`~workbench.fieldtest.session.UPLOAD_LIMIT_BYTES`, empty, binary, not a table)
        leaves the panel as it was, its last results marked stale, and the message says why.
        """
        good, raw = self.attempt(read_table, file_name, content)
        if not good:
            return False
        self.raw, self.file_name = raw, file_name
        self.title.value = view.title_html(file_name)
        self._tolerance_edited.clear()
        options = [NONE, *raw.columns]
        for row in self.rows.values():
            row.column.options = options
            row.column.value = NONE
        self.message.show(f"Loaded {file_name}: {len(raw)} rows, {len(raw.columns)} columns. "
                          "Map the columns and press Evaluate.")
        return True

    def set_column_map(self, column_map: dict):
        """Preset the mapping: reading name -> (file column, unit text)."""
        for name, (column, unit) in column_map.items():
            if unit in self.map_unit[name].options:
                self.map_unit[name].value = unit
            if column in self.map_column[name].options:
                self.map_column[name].value = column

    def column_map(self) -> tuple[dict, dict]:
        """The current mapping as (column_map, units) for the readers."""
        mapped = [name for name, row in self.rows.items() if row.mapped]
        return ({n: self.rows[n].column.value for n in mapped},
                {n: self.rows[n].unit.value for n in mapped})

    # ------------------------------------------------------------------ steady-state entries
    def _mapping_changed(self, name: str, change):
        """A column or unit choice changed: show the tolerance entry in the mapped unit."""
        row = self.rows[name]
        row.show_tolerance()
        if not row.mapped:
            return
        if name in self._tolerance_edited and change["owner"] is row.unit:
            # the typed tolerance keeps its size in the new unit
            old = difference_to_si(1.0, change["old"], row.kind, name)
            new = difference_to_si(1.0, row.unit.value, row.kind, name)
            self._set_tolerance(name, row.tolerance.value * old / new)
        elif name not in self._tolerance_edited:
            self._set_tolerance(name, self.default_tolerance(name))

    def _set_tolerance(self, name: str, value: float):
        with self.quiet():
            self.tolerance[name].value = float(f"{value:.6g}") if math.isfinite(value) else 0.0

    def default_tolerance(self, name: str) -> float:
        """Default steady-state tolerance of a mapped reading, in its mapped unit."""
        row = self.rows[name]
        return default_tolerance(self.raw, row.column.value, row.unit.value, name,
                                 self.ambient.si)

    def _tolerance_typed(self, name: str, _change=None):
        self._tolerance_edited.add(name)
        self._steady_changed()

    def _steady_changed(self):
        """A window or tolerance changed: flag the last readings again (no re-evaluation)."""
        if self.result is None:
            return
        names = self.result.setup.column_map
        tolerances = tolerances_to_si({n: self.tolerance[n].value for n in names},
                                      {n: self.map_unit[n].value for n in names})
        self._show(reflag(self.result, self.steady_window.value, tolerances))

    # ------------------------------------------------------------------ evaluation
    def current_setup(self) -> SessionSetup:
        """The entries as a :class:`~workbench.fieldtest.session.SessionSetup` (SI units).

        Raises
        ------
        WorkbenchError
            If an entry is not valid (the window, a tolerance, an uncertainty...).
        """
        cmap, unit_texts = self.column_map()
        tolerances = tolerances_to_si({n: self.tolerance[n].value for n in cmap}, unit_texts)

        def given(entry):
            return entry.si if math.isfinite(entry.si) and entry.si > 0 else None

        design = DesignPoint(isentropic_efficiency=given(self.d_eta), power=given(self.d_power),
                             volume_flow=given(self.d_flow), speed=given(self.d_speed))
        return SessionSetup(
            column_map=cmap, units=unit_texts, machine=self.machine.value,
            fluid=self.fluid.value, property_model=self.backend.value,
            ambient_pressure=self.ambient.si, mechanical_efficiency=self.mech.si,
            steady_window=self.steady_window.value, steady_tolerances=tolerances,
            uncertainty={"pressure_fraction": self.u_pressure.si,
                         "temperature_K": self.u_temperature.si,
                         "flow_fraction": self.u_flow.si, "power_fraction": self.u_power.si},
            design=design)

    def evaluate(self) -> bool:
        """Evaluate the loaded file with the entries; show the results or a message.

        Returns True when the results were computed and shown.  Never raises.
        """
        if self.raw is None:
            self.fail("load a readings file first")
            return False
        good, session = self.attempt(self._evaluate_session)
        if good:
            self._show(session)
        return good

    def _evaluate_session(self):
        setup = self.current_setup()
        with self._progress_bar(len(self.raw)) as progress:
            return evaluate_session(self.raw, setup, progress=progress)

    @contextmanager
    def _progress_bar(self, rows: int):
        """Show the progress bar while a file of :data:`PROGRESS_ROWS` rows or more is
        evaluated; yields the ``progress(done, total)`` callback (None for small files)."""
        if rows < PROGRESS_ROWS:
            yield None
            return

        def progress(done, total):
            percent = int(100 * done / total) if total else 100
            if percent != self.progress.value:  # one message per percent, not per row
                self.progress.value = percent

        self.progress.value = 0
        self.progress.layout.display = None
        try:
            yield progress
        finally:
            self.progress.layout.display = "none"

    # ------------------------------------------------------------------ setup files
    def to_setup(self) -> dict:
        """The whole setup of the panel as a setup dict (SI values; see
        :mod:`workbench.fieldtest.setup_file`).  Raises WorkbenchError for a bad entry."""
        return self.current_setup().to_setup(readings_file=self.file_name)

    def setup_json(self) -> str:
        """JSON text of :meth:`to_setup`."""
        return setup_json(self.to_setup())

    def load_setup(self, source, name: str = "") -> bool:
        """Load a setup (dict, JSON text or bytes, or a :class:`pathlib.Path`) onto the loaded
        readings file.

        The setup is validated first, against the loaded file's columns, and its fluid and
        column map are tried (:func:`~workbench.fieldtest.session.setup_from_file`); if
        anything is wrong the message area says so (naming the key) and nothing in the panel
        changes.  Otherwise every entry takes the setup's value and the rows are evaluated
        again.  Never raises.

        Returns
        -------
        bool
            True when the setup was loaded (the evaluation's outcome is in the message area).
        """
        # a refused setup leaves the panel and its results as they were (not stale)
        good, setup = self.attempt(setup_from_file, source, self.raw, self.file_name,
                                   prefix="setup not loaded: ", stale=False)
        if not good:
            return False
        good, _ = self.attempt(self._apply_setup, setup,
                               prefix="the setup was only partly applied; check the entries: ")
        if not good:
            return False
        made_with = setup.readings_file
        note_text = (f" (made with {made_with})" if made_with and made_with != self.file_name
                     else "")
        loaded = f"Setup {name + ' ' if name else ''}loaded{note_text}."
        good = self.evaluate()
        self.message.show(f"{loaded} {self.message.text}".strip(), error=not good)
        return True

    def _apply_setup(self, setup: SessionSetup):
        """Put a checked setup into the entries (no evaluation, no re-flagging)."""
        with self.quiet():
            self.machine.value = setup.machine
            self.backend.value = setup.property_model
            self.fluid.value = setup.fluid
            self.ambient.set_si(setup.ambient_pressure)
            self.mech.set_si(setup.mechanical_efficiency)
            u = setup.uncertainty
            self.u_pressure.set_si(u["pressure_fraction"])
            self.u_temperature.set_si(u["temperature_K"])
            self.u_flow.set_si(u["flow_fraction"])
            self.u_power.set_si(u["power_fraction"])
            d = setup.design
            for entry, value in ((self.d_eta, d.isentropic_efficiency), (self.d_power, d.power),
                                 (self.d_flow, d.volume_flow), (self.d_speed, d.speed)):
                entry.set_si(0.0 if value is None else value)
            self.steady_window.value = setup.steady_window
            for name, row in self.rows.items():
                self._tolerance_edited.discard(name)
                if name in setup.column_map:
                    row.unit.value = setup.units[name]
                    row.column.value = setup.column_map[name]
                    tolerance = setup.steady_tolerances[name]
                    row.tolerance.value = difference_from_si(tolerance, row.unit.value,
                                                             row.kind, name)
                    self._tolerance_edited.add(name)
                else:
                    row.column.value = NONE
                row.show_tolerance()

    def _setup_uploaded(self, change):
        value = change["new"]
        if not value:
            return
        self.attempt(self._load_uploaded_setup, value, stale=False,
                     prefix="setup not loaded: the upload could not be read: ")
        with self.quiet():
            self.setup_upload.value = ()  # so the same file can be loaded again

    def _load_uploaded_setup(self, value):
        item = value[0] if isinstance(value, (tuple, list)) else next(iter(value.values()))
        content = item["content"] if isinstance(item, dict) else item.content
        name = item.get("name", "") if isinstance(item, dict) else getattr(item, "name", "")
        self.load_setup(bytes(content), name)

    def _refresh_setup_link(self):
        """Put the current setup into the download link (a data: URL)."""
        stem = pathlib.Path(self.file_name).stem if self.file_name else "test"
        self.setup_link.value = download_link(self.setup_json(), stem + "-setup.json",
                                              "Download the setup (JSON, SI values)",
                                              mime="application/json")

    # ------------------------------------------------------------------ display
    def set_stale(self, stale: bool) -> None:
        """Grey the summary (stale) or show it as current."""
        super().set_stale(stale)
        if self.result is not None:
            summary = view.summary_html(self.result)
            self.summary.value = view.stale(summary) if self.stale else summary

    def _show(self, session):
        """Show a good session result: summary, charts, table, downloads."""
        s = session.summary()
        self.show_result(session, "" if s["flagged"] == 0 else
                         f"{s['flagged']} row(s) flagged; their messages are in the table "
                         "and the CSV.")
        self.attempt(self._draw, session, prefix="the charts could not be drawn: ",
                     stale=False)  # the table stays good when the chart is not
        self.table.value = view.table_html(session)
        self.export.value = download_link(
            session.export_csv(), "results.csv", f"Download all {s['rows']} rows as CSV") + (
            " (SI units; <code>steady</code> and each reading's largest deviation from its "
            "window mean)")
        self.attempt(self._refresh_setup_link, prefix="setup not saved: ", stale=False)

    def _draw(self, session):
        update_readings_figure(self.figure, session.chart_series())
        refresh_view(self.figure_view, self.figure)


__all__ = ["DEMO_FILE", "DEMO_GAS", "DEMO_MAP", "PROGRESS_ROWS", "ReadingsPanel"]
