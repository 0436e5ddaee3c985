"""Field-test data panel: load a readings file, map its columns, evaluate every row.

The panel holds no thermodynamics: it reads the file with
:func:`workbench.fieldtest.readers.readings_from_frame`, evaluates with
:func:`workbench.fieldtest.evaluate`, propagates instrument uncertainties with
:func:`workbench.fieldtest.propagate_uncertainty` at a sample of rows, and compares with the
design point by :func:`workbench.fieldtest.compare_with_design`.  A bad file, a wrong column map
or a bad row never raises into the page: the message area says what is wrong and the last good
table stays visible, marked stale.

CSS hooks: ``wb-input-<name>`` on every entry, ``wb-result-<name>`` on every result,
``wb-message`` on the message area, ``wb-caution`` on the caution banner.

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
from ..errors import WorkbenchError
from ..fieldtest import (
    DesignPoint,
    compare_with_design,
    evaluate,
    propagate_uncertainty,
    readings_from_frame,
)
from ..fieldtest.readers import READING_KINDS
from ..fluids import Fluid
from .common import NumberEntry, caution_banner, message_area

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
UNIT_CHOICES = {
    "pressure": ["bar(g)", "bar(a)", "kPa(g)", "kPa", "MPa", "psig", "psia", "Pa"],
    "temperature": ["degC", "K", "degF"],
    "mass_flow": ["kg/s", "kg/h", "t/h", "lb/h"],
    "volume_flow": ["m3/h", "m3/s", "Sm3/h", "ft3/min"],
    "power": ["kW", "MW", "W", "hp"],
    "speed": ["rpm"],
}
_LABELS = {
    "inlet_pressure": "Inlet pressure", "inlet_temperature": "Inlet temperature",
    "outlet_pressure": "Outlet pressure", "outlet_temperature": "Outlet temperature",
    "mass_flow": "Mass flow", "volume_flow": "Inlet volume flow",
    "standard_volume_flow": "Standard volume flow (15 °C, 101.325 kPa)",
    "power": "Shaft power", "speed": "Speed",
}
#: Rows of the table shown on the page (the CSV export has every row).
TABLE_ROWS = 40
#: Rows (spread over the file) at which the uncertainty is propagated for the error bars.
UNCERTAINTY_ROWS = 12


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
        self.file_name = file_name or ""

        self.caution = caution_banner(SAFETY_CAUTION)
        self.message = message_area()
        self.upload = widgets.FileUpload(accept=".csv,.txt,.xlsx,.xlsm", multiple=False,
                                         description="Readings file")
        self.upload.add_class("wb-input-file")
        self.upload.observe(self._uploaded, names="value")
        self.machine = self._dropdown("machine", "Machine", ["compressor", "turbine", "pump",
                                                             "fan"], machine)
        self.fluid = widgets.Text(value=fluid, description="Fluid",
                                  layout=widgets.Layout(width="640px"),
                                  style={"description_width": "170px"})
        self.fluid.add_class("wb-input-fluid")
        self.backend = self._dropdown("backend", "Property model", ["HEOS", "IF97"], backend)
        self.ambient = NumberEntry("ambient-pressure", "Ambient pressure", "absolute_pressure",
                                   ambient_pressure, system="bar, degC")
        self.mech = NumberEntry("mechanical-efficiency", "Mechanical efficiency", "percent",
                                mechanical_efficiency, system="bar, degC")
        self.map_column: dict[str, widgets.Dropdown] = {}
        self.map_unit: dict[str, widgets.Dropdown] = {}
        rows = []
        for name, (kind, _) in READING_KINDS.items():
            col = self._dropdown(f"map-{name.replace('_', '-')}", _LABELS[name], [NONE], NONE)
            choices = UNIT_CHOICES["volume_flow" if kind == "volume_flow" else kind]
            unit = widgets.Dropdown(options=choices, value=choices[0],
                                    layout=widgets.Layout(width="110px"))
            unit.add_class(f"wb-input-unit-{name.replace('_', '-')}")
            self.map_column[name], self.map_unit[name] = col, unit
            rows.append(widgets.HBox([col, unit]))
        self.u_pressure = NumberEntry("u-pressure", "Pressure b", "percent", 0.0025,
                                      system="bar, degC")
        self.u_temperature = NumberEntry("u-temperature", "Temperature b (K)",
                                         "dimensionless", 0.2, system="bar, degC")
        self.u_flow = NumberEntry("u-flow", "Flow b", "percent", 0.01,
                                  system="bar, degC")
        self.u_power = NumberEntry("u-power", "Power b", "percent", 0.01,
                                   system="bar, degC")
        design = design or DesignPoint()
        self.d_eta = NumberEntry("design-efficiency", "Design efficiency", "percent",
                                 _nan(design.isentropic_efficiency), system="bar, degC")
        self.d_power = NumberEntry("design-power", "Design power", "power", _nan(design.power),
                                   system="bar, degC")
        self.d_flow = NumberEntry("design-flow", "Design inlet flow", "volume_flow",
                                  _nan(design.volume_flow), system="bar, degC")
        self.d_speed = NumberEntry("design-speed", "Rated speed (rpm)", "dimensionless",
                                   _nan(design.speed), system="bar, degC")
        self.run = widgets.Button(description="Evaluate all rows", button_style="primary")
        self.run.add_class("wb-input-evaluate")
        self.run.on_click(lambda _: self.evaluate())

        self.summary = widgets.HTML("No readings yet.")
        self.summary.add_class("wb-result-summary")
        self.table = widgets.HTML("")
        self.table.add_class("wb-result-table")
        self.export = widgets.HTML("")
        self.export.add_class("wb-result-export")
        #: Series of the two charts: chart -> list of dicts (name, x, y, error, symbol).
        self.plot_data: dict = {"efficiency": [], "power": []}
        self.figure = widgets.HTML("")
        self.figure.add_class("wb-result-figure")
        self.figure_box = self.figure

        setup = widgets.VBox([
            widgets.HBox([self.upload]), self.machine, self.fluid, self.backend,
            self.ambient, self.mech,
            widgets.HTML("<b>Columns and units</b>"), *rows,
            widgets.HTML("<b>Instrument systematic uncertainties (standard, 1 sigma)</b>"),
            self.u_pressure, self.u_temperature, self.u_flow, self.u_power,
            widgets.HTML("<b>Design point</b> (0 where not given)"),
            self.d_eta, self.d_power, self.d_flow, self.d_speed, self.run])
        super().__init__([
            widgets.HTML("<h3>Field-test readings</h3>"), self.caution, setup, self.message,
            self.summary, self.figure_box, self.table, self.export])
        self.add_class("wb-panel-test-data")
        if content is not None:
            self.load(file_name or "readings.csv", content)
        if column_map:
            self.set_column_map(column_map)

    # ------------------------------------------------------------------ construction helpers
    @staticmethod
    def _dropdown(name, label, options, value):
        w = widgets.Dropdown(options=list(options), value=value, description=label,
                             style={"description_width": "170px"},
                             layout=widgets.Layout(width="520px"))
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
        options = [NONE, *raw.columns]
        for _name, dropdown in self.map_column.items():
            dropdown.options = options
            dropdown.value = NONE
        self._say(f"Loaded {file_name}: {len(raw)} rows, {len(raw.columns)} columns. "
                  "Map the columns and press Evaluate.")

    def set_column_map(self, column_map: dict):
        """Preset the mapping: reading name -> (file column, unit text)."""
        for name, (column, unit) in column_map.items():
            if column in self.map_column[name].options:
                self.map_column[name].value = column
            if unit in self.map_unit[name].options:
                self.map_unit[name].value = unit

    def column_map(self) -> tuple[dict, dict]:
        """The current mapping as (column_map, units) for the readers."""
        cmap, units = {}, {}
        for name, dropdown in self.map_column.items():
            if dropdown.value != NONE:
                cmap[name] = dropdown.value
                units[name] = self.map_unit[name].value
        return cmap, units

    # ------------------------------------------------------------------ evaluation
    def evaluate(self):
        """Convert, evaluate, propagate and compare; show the results or a message."""
        if self.raw is None:
            self._fail("load a readings file first")
            return
        try:
            cmap, units = self.column_map()
            fluid = parse_fluid(self.fluid.value, self.backend.value)
            readings = readings_from_frame(self.raw, cmap, units,
                                           ambient_pressure=self.ambient.si)
            results = evaluate(readings, self.machine.value, fluid,
                               mechanical_efficiency=self.mech.si,
                               results=("power", "shaft_power", "isentropic_efficiency",
                                        "isentropic_head", "pressure_ratio",
                                        "outlet_temperature", "mass_flow",
                                        "inlet_volume_flow"))
            deviation = compare_with_design(results, self._design())
            uncertainty = self._uncertainty(readings, results, fluid)
        except WorkbenchError as exc:
            self._fail(str(exc))
            return
        except Exception as exc:  # noqa: BLE001 - a callback never raises into the page
            self._fail(f"the evaluation failed ({type(exc).__name__}): check the column map, "
                       "the units and the fluid")
            return
        self.readings, self.results = readings, results
        self.deviation, self.uncertainty = deviation, uncertainty
        self._show()

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
                rep = propagate_uncertainty(nominal, u, ("isentropic_efficiency", "power"),
                                            machine=self.machine.value, fluid=fluid,
                                            mechanical_efficiency=self.mech.si)
            except WorkbenchError:
                continue
            rows.append({"row": results.index[i],
                         "U95_isentropic_efficiency": rep.expanded["isentropic_efficiency"],
                         "U95_power": rep.expanded["power"],
                         "dominant_efficiency": rep.dominant["isentropic_efficiency"],
                         "dominant_power": rep.dominant["power"]})
        return pd.DataFrame(rows, columns=["row", "U95_isentropic_efficiency", "U95_power",
                                           "dominant_efficiency", "dominant_power"])

    # ------------------------------------------------------------------ display
    def _say(self, text: str):
        self.message.value = html.escape(text)

    def _fail(self, text: str):
        self._say(text)
        if self.results is not None:
            self.summary.value = self.summary.value.replace(
                "<span class='wb-fresh'>", "<span class='wb-stale' style='color:#8a8a8a'>")

    def summary_numbers(self) -> dict:
        """Counts and means of the last evaluation (SI units), for printing."""
        r = self.results
        ok = r[r["status"] == "ok"]
        return {"rows": len(r), "ok": len(ok), "flagged": len(r) - len(ok),
                "mean_isentropic_efficiency": float(ok["isentropic_efficiency"].mean()),
                "mean_power_W": float(ok["power"].mean()),
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
            dominant = (f"; efficiency U95 about {100 * s['mean_U95_isentropic_efficiency']:.2f}"
                        f" points, mostly from the {html.escape(dom.replace('_', ' '))}")
        self.summary.value = (
            f"<span class='wb-fresh'>{s['rows']} rows ({parts}); mean isentropic efficiency "
            f"{100 * s['mean_isentropic_efficiency']:.2f} %, mean power "
            f"{s['mean_power_W'] / 1e3:.1f} kW{dominant}</span>")
        self._say("" if s["flagged"] == 0 else
                  f"{s['flagged']} row(s) flagged; their messages are in the table and the CSV.")
        self._plot()
        self.table.value = self._table_html()
        csv = self.export_frame().to_csv(index=False).encode()
        self.export.value = (
            f"<a download='results.csv' href='data:text/csv;base64,"
            f"{base64.b64encode(csv).decode()}'>Download all {len(r)} rows as CSV</a>")

    def export_frame(self) -> pd.DataFrame:
        """Readings, status, message, results and design deviations of every row (SI)."""
        return pd.concat([self.results, self.deviation], axis=1)

    def _plot(self):
        r = self.results
        ok = r[r["status"] == "ok"]
        eff = [dict(name="rows", x=ok["inlet_volume_flow"] * 3600,
                    y=100 * ok["isentropic_efficiency"], error=None, symbol="dot")]
        pwr = [dict(name="rows", x=ok["inlet_volume_flow"] * 3600, y=ok["power"] / 1e3,
                    error=None, symbol="dot")]
        u = self.uncertainty
        if len(u):
            at = r.loc[u["row"]]
            eff.append(dict(name="U95 at sampled rows", x=at["inlet_volume_flow"] * 3600,
                            y=100 * at["isentropic_efficiency"],
                            error=100 * u["U95_isentropic_efficiency"].to_numpy(),
                            symbol="bar"))
            pwr.append(dict(name="U95 at sampled rows", x=at["inlet_volume_flow"] * 3600,
                            y=at["power"] / 1e3, error=u["U95_power"].to_numpy() / 1e3,
                            symbol="bar"))
        d = self._design()
        if d.volume_flow is not None and d.isentropic_efficiency is not None:
            eff.append(dict(name="design point", x=[d.volume_flow * 3600],
                            y=[100 * d.isentropic_efficiency], error=None, symbol="star"))
        if d.volume_flow is not None and d.power is not None:
            pwr.append(dict(name="design point", x=[d.volume_flow * 3600], y=[d.power / 1e3],
                            error=None, symbol="star"))
        self.plot_data = {"efficiency": eff, "power": pwr}
        self.figure.value = (
            "<div style='display:flex;gap:12px'>"
            + svg_chart("Isentropic efficiency (%)", "inlet volume flow (m³/h)", eff)
            + svg_chart("Power (kW)", "inlet volume flow (m³/h)", pwr) + "</div>")

    def _table_html(self) -> str:
        r = self.results
        flagged = r[r["status"] != "ok"]
        shown = pd.concat([flagged, r[r["status"] == "ok"].head(max(0, TABLE_ROWS - len(flagged)))])
        shown = shown.sort_index()
        cols = [("status", "status", None), ("message", "message", None),
                ("isentropic_efficiency", "eff. %", lambda v: f"{100 * v:.2f}"),
                ("power", "power kW", lambda v: f"{v / 1e3:.1f}"),
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
            style = "" if good else " style='background:#fbe3c6'"
            css = "wb-row-ok" if good else "wb-row-flagged"
            cells = []
            for key, _, fmt in cols:
                v = row.get(key)
                if fmt is None:
                    text = "" if v is None else str(v)
                else:
                    text = fmt(v) if isinstance(v, float) and math.isfinite(v) else "–"
                cells.append(f"<td>{html.escape(text)}</td>")
            body.append(f"<tr class='{css}'{style}><td>{html.escape(str(index))}</td>"
                        f"{''.join(cells)}</tr>")
        note = (f"<p>Showing {len(shown)} of {len(r)} rows (all flagged rows first kept); the "
                "CSV has every row.</p>")
        return (note + "<style>.wb-result-table td,.wb-result-table th{padding:1px 6px}</style>"
                "<table style='font-size:85%;border-collapse:collapse'><tr><th>row</th>"
                f"{head}</tr>{''.join(body)}</table>")


_COLOURS = {"dot": "#4a6fa5", "bar": "#222222", "star": "#c0392b"}


def svg_chart(title: str, x_label: str, series: list, width: int = 430,
              height: int = 300) -> str:
    """A small scatter chart as inline SVG (no script): dots, points with error bars, stars."""
    xs = np.concatenate([np.asarray(s["x"], float) for s in series]) if series else np.array([])
    ys = np.concatenate([np.asarray(s["y"], float) - (0 if s["error"] is None else s["error"])
                         for s in series] + [np.asarray(s["y"], float) + (
                             0 if s["error"] is None else s["error"]) for s in series]) \
        if series else np.array([])
    xs, ys = xs[np.isfinite(xs)], ys[np.isfinite(ys)]
    if not len(xs) or not len(ys):
        return f"<svg width='{width}' height='{height}'><text x='10' y='20'>{html.escape(title)}" \
               ": no data</text></svg>"
    x0, x1 = float(xs.min()), float(xs.max())
    y0, y1 = float(ys.min()), float(ys.max())
    pad_x, pad_y = (x1 - x0) * 0.06 or 1.0, (y1 - y0) * 0.08 or 1.0
    x0, x1, y0, y1 = x0 - pad_x, x1 + pad_x, y0 - pad_y, y1 + pad_y
    left, right, top, bottom = 56, 10, 26, 40

    def px(x):
        return left + (x - x0) / (x1 - x0) * (width - left - right)

    def py(y):
        return height - bottom - (y - y0) / (y1 - y0) * (height - top - bottom)

    out = [f"<svg xmlns='http://www.w3.org/2000/svg' width='{width}' height='{height}' "
           "style='font:11px sans-serif;background:#fff'>",
           f"<text x='{width / 2}' y='15' text-anchor='middle'>{html.escape(title)}</text>",
           f"<text x='{width / 2}' y='{height - 6}' text-anchor='middle'>"
           f"{html.escape(x_label)}</text>",
           f"<rect x='{left}' y='{top}' width='{width - left - right}' "
           f"height='{height - top - bottom}' fill='none' stroke='#999'/>"]
    for k in range(5):
        yv = y0 + (y1 - y0) * (k + 0.5) / 5
        xv = x0 + (x1 - x0) * (k + 0.5) / 5
        out.append(f"<text x='{left - 4}' y='{py(yv) + 4:.1f}' text-anchor='end'>{yv:.4g}</text>")
        out.append(f"<text x='{px(xv):.1f}' y='{height - bottom + 14}' text-anchor='middle'>"
                   f"{xv:.4g}</text>")
    for s in series:
        colour = _COLOURS[s["symbol"]]
        err = s["error"]
        for j, (x, y) in enumerate(zip(np.asarray(s["x"], float), np.asarray(s["y"], float))):
            if not (math.isfinite(x) and math.isfinite(y)):
                continue
            cx, cy = px(x), py(y)
            if s["symbol"] == "star":
                out.append(f"<path d='M{cx},{cy - 8} L{cx + 3},{cy - 2} L{cx + 8},{cy - 2} "
                           f"L{cx + 4},{cy + 2} L{cx + 6},{cy + 8} L{cx},{cy + 4} "
                           f"L{cx - 6},{cy + 8} L{cx - 4},{cy + 2} L{cx - 8},{cy - 2} "
                           f"L{cx - 3},{cy - 2} Z' fill='{colour}'/>")
            elif s["symbol"] == "bar":
                e = float(err[j]) if err is not None else 0.0
                out.append(f"<line x1='{cx:.1f}' x2='{cx:.1f}' y1='{py(y - e):.1f}' "
                           f"y2='{py(y + e):.1f}' stroke='{colour}'/>")
                out.append(f"<rect x='{cx - 2.5:.1f}' y='{cy - 2.5:.1f}' width='5' height='5' "
                           f"fill='{colour}'/>")
            else:
                out.append(f"<circle cx='{cx:.1f}' cy='{cy:.1f}' r='2' fill='{colour}' "
                           "fill-opacity='0.6'/>")
    legend_y = top + 12
    for s in series:
        out.append(f"<text x='{left + 8}' y='{legend_y}' fill='{_COLOURS[s['symbol']]}'>"
                   f"{html.escape(s['name'])}</text>")
        legend_y += 13
    out.append("</svg>")
    return "".join(out)


def _nan(value):
    """An entry value for an optional design number: 0 stands for 'not given'."""
    return 0.0 if value is None else float(value)


__all__ = ["FieldDataPanel", "parse_fluid", "svg_chart", "DEMO_FILE", "DEMO_MAP"]
