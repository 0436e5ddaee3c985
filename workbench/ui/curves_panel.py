"""Machine curves and acceptance dashboard: datasheet curves, system curve, test points,
verdicts, case files and a self-contained HTML report.

The panel binds widgets to the curves calculation layer and shows its result or message;
it computes nothing itself.  Every change rebuilds a curves case (the JSON object of
:mod:`workbench.curves.cases`, SI values) from the widgets and evaluates it with
:func:`workbench.curves.cases.evaluate_curves_case`; the charts come from
:func:`workbench.curves.charts.case_charts`, the report from
:func:`workbench.curves.report.curves_report`.  A refused entry never raises into the page:
the message area says what is wrong and the last good result stays shown, marked stale.

Entries: the machine kind (pump or compressor; choosing one loads its demo case), the
acceptance rule (an ISO 9906 grade for a pump, an ASME PTC 10 test type for a compressor),
the datasheet curve as a point table (typed, or a CSV upload of at most
:data:`~workbench.ui.curves_table.TABLE_LIMIT_BYTES`, numbers only, see
:mod:`workbench.ui.curves_table`), its speed and flow limits, the test points (a pump's
flows, heads and powers at the test speed with the guarantee point; a compressor's one test
point of six readings, converted to the specified conditions of the case), or the result
file of the readings dashboard, and the static head of the pump's system.  Values are shown
in the units of the unit switch; the charts and the report use m^3/h, m, kJ/kg, kW.

CSS hooks: ``wb-input-<name>`` on every entry, ``wb-result-<name>`` on every result
(``wb-result-verdict``, ``wb-result-verdicts``, ``wb-result-figure``,
``wb-result-report``, ``wb-result-case-file``), ``wb-message``, ``wb-caution``.

References
----------
ISO 9906:2012, Rotodynamic pumps - Hydraulic performance acceptance tests.
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
"""

from __future__ import annotations

import copy
import dataclasses
import html
import json

import ipywidgets as widgets

from ..casefiles import read_json
from ..curves.cases import (
    evaluate_curves_case,
    list_curves_demos,
    load_curves_demo,
    points_from_readings,
)
from ..curves.charts import case_charts, curve_series
from ..curves.pump_acceptance import GRADES
from ..curves.report import curves_report
from ..errors import CaseFileError, InputError
from ..fieldtest.session import read_table
from ..units import RPM
from .charts import figure_view, refresh_view
from .common import (
    NumberEntry,
    Panel,
    ResultRows,
    download_link,
    input_class,
    result_class,
    unit_switch,
)
from .curves_figure import make_curves_figure, update_curves_figure
from .curves_table import (
    TABLE_LIMIT_BYTES,
    curve_columns,
    format_table,
    measured_columns,
    parse_table,
)
from .curves_verdicts import CSS, verdict_text, verdicts_html

#: Demo loaded for each machine kind.
KIND_DEMOS = {"pump": "pump-loop-demo", "compressor": "compressor-co2-shop-test-demo"}
RULES = {"pump": [(f"ISO 9906 grade {g}", g) for g in GRADES],
         "compressor": [("ASME PTC 10 Type 1", "1"), ("ASME PTC 10 Type 2", "2")]}
POINT_FIELDS = ("volume_flow", "total_head", "efficiency", "shaft_power", "surge_margin",
                "npsh_available", "npsh_required", "npsh_margin")
ACCEPTANCE_FIELDS = ("head_deviation", "flow_deviation", "flow_head_margin",
                     "efficiency_margin", "power_margin")
_PERCENT = ("efficiency", "surge_margin") + ACCEPTANCE_FIELDS
_CASE_LIMIT = 1_000_000


def _upload_content(change):
    files = change["new"]
    if not files:
        return None, None
    item = files[0] if isinstance(files, (tuple, list)) else next(iter(files.values()))
    get = item.get if isinstance(item, dict) else lambda key: getattr(item, key)
    return get("name"), bytes(get("content"))


def _textarea(name, rows=10):
    w = widgets.Textarea(value="", continuous_update=False, rows=rows,
                         layout=widgets.Layout(width="720px"))
    return input_class(w, name)


def _upload(name, label, accept=".csv,.txt"):
    w = widgets.FileUpload(accept=accept, multiple=False, description=label,
                           layout=widgets.Layout(width="230px"))
    return input_class(w, name)


def _note(text):
    return widgets.HTML(f"<div class='wb-note'>{html.escape(text)}</div>",
                        layout=widgets.Layout(width="560px"))


class CurvesPanel(Panel):
    """Dashboard panel of machine curves, a system curve and an acceptance test.

    Parameters
    ----------
    case : str or dict
        A curves demo name (:func:`workbench.curves.cases.list_curves_demos`) or a case
        dict (SI values).
    units : str
        Display unit system (:data:`workbench.units.UNIT_SYSTEMS`).

    Attributes
    ----------
    result : workbench.curves.cases.CurvesCaseResult or None
        The last good evaluation (kept, marked stale, when a later one fails).
    case : dict
        The case of the last good evaluation (SI values), as saved.
    figure : plotly FigureWidget
        The two charts, updated in place.
    """

    css_class = "wb-panel-curves"

    def __init__(self, case="pump-loop-demo", units: str = "bar, degC"):
        self._ensure_plumbing()
        self.case = {}
        self._build(units)
        if isinstance(case, str) and case in self.demo.options:
            self.demo.value = case
        if not self.load_case(load_curves_demo(case) if isinstance(case, str) else case):
            raise CaseFileError(self.message.text)

    # ------------------------------------------------------------------ construction
    def _build(self, units):
        guard = self.guard
        self.title_html = widgets.HTML("")
        self.units = unit_switch(units)
        self.units.observe(guard(lambda _c: self._show_inputs() or self._show_results()),
                           names="value")
        self.kind = input_class(widgets.Dropdown(
            options=[("pump", "pump"), ("compressor", "compressor")], value="pump",
            description="Machine", layout=widgets.Layout(width="240px")), "kind")
        self.kind.observe(guard(self._kind_changed, "machine not changed: "), names="value")
        self.rule = input_class(widgets.Dropdown(
            options=RULES["pump"], value="2B", description="Acceptance",
            style={"description_width": "80px"}, layout=widgets.Layout(width="280px")), "rule")
        self.demo = input_class(widgets.Dropdown(
            options=list_curves_demos(), description="Demo case",
            layout=widgets.Layout(width="380px")), "demo")
        self.demo_button = input_class(widgets.Button(description="Load demo"), "load-demo")
        self.demo_button.on_click(guard(lambda _b: self.load_case(
            load_curves_demo(self.demo.value))))
        self.curve_text = _textarea("curve-points")
        self.test_text = _textarea("test-points", rows=8)
        self.curve_file = _upload("curve-file", "Curve CSV")
        self.readings_file = _upload("readings-file", "Readings result")
        self.case_file = _upload("case-file", "Case file", ".json")
        self.curve_file.observe(guard(self._curve_uploaded, "curve file not read: "), "value")
        self.readings_file.observe(guard(self._readings_uploaded, "readings not read: "),
                                   "value")
        self.case_file.observe(guard(self._case_uploaded, "case not loaded: "), "value")

        def entry(name, label, kind, unit=None):
            e = NumberEntry(name, label, kind, 0.0, system=units, significant=6 if unit else None,
                            on_change=guard(lambda _e: self.recalculate()))
            if unit:
                e.unit.value = unit
            return e

        self.curve_speed = entry("curve-speed", "Datasheet speed", "dimensionless", "rpm")
        self.min_flow = entry("min-flow", "Minimum flow or surge", "volume_flow")
        self.max_flow = entry("max-flow", "Maximum flow", "volume_flow")
        self.test_speed = entry("test-speed", "Test speed", "dimensionless", "rpm")
        self.g_flow = entry("guarantee-flow", "Guarantee flow", "volume_flow")
        self.g_head = entry("guarantee-head", "Guarantee head", "elevation")
        self.g_eff = entry("guarantee-efficiency", "Guarantee efficiency", "percent")
        self.static_head = entry("static-head", "System static head", "elevation")
        for w in (self.rule, self.curve_text, self.test_text):
            w.observe(guard(lambda _c: self.recalculate()), names="value")
        self.rows = self.add_result_widget(ResultRows(
            POINT_FIELDS + ACCEPTANCE_FIELDS, percent=_PERCENT,
            context={"volume_flow": "operating point", "efficiency": "curve",
                     "shaft_power": "curve"}))
        for name in ("total_head", "npsh_available", "npsh_required", "npsh_margin"):
            self.rows.kinds[name] = "elevation"  # heads in m (or ft), not mm
        self.verdict = result_class(widgets.HTML(""), "verdict")
        self.verdicts = result_class(widgets.HTML(""), "verdicts")
        self.report_link = result_class(widgets.HTML(""), "report")
        self.case_link = result_class(widgets.HTML(""), "case-file")
        self.figure = make_curves_figure()
        self.figure_view = result_class(figure_view(self.figure), "figure")
        super().__init__(self._layout(), layout=widgets.Layout(width="100%",
                                                               max_width="1200px"))

    def _layout(self):
        self.test_heading = widgets.HTML("")
        self.test_box = widgets.VBox([])
        self.curve_box = widgets.VBox([
            widgets.HBox([self.curve_speed, self.min_flow]), widgets.HBox([self.max_flow]),
            self.curve_text, widgets.HBox([self.curve_file, _note(
                "One point a line; the header names the columns and units. Efficiency, "
                "power and NPSH required may be left empty. Numbers only.")])])
        tabs = widgets.Tab([self.curve_box, self.test_box, widgets.VBox([
            widgets.HBox([self.demo, self.demo_button]), self.case_file, self.case_link,
            self.report_link])])
        for i, title in enumerate(("Datasheet curve", "Test points", "Case and report")):
            tabs.set_title(i, title)
        self.tabs = input_class(tabs, "tabs")
        head = widgets.HBox([self.kind, self.rule, self.units],
                            layout=widgets.Layout(align_items="center"))
        results = widgets.HBox([widgets.VBox([self.verdict, self.verdicts],
                                             layout=widgets.Layout(width="600px")),
                                self.rows])
        return [widgets.HTML(f"<style>{CSS}</style>"), self.title_html, self.caution, head,
                self.tabs, self.message, results, self.figure_view]

    # ------------------------------------------------------------------ public
    @property
    def system(self) -> str:
        """The display unit system chosen."""
        return self.units.value

    def load_case(self, source) -> bool:
        """Load a case (a dict, or JSON bytes as uploaded); nothing changes when refused.

        Returns True when loaded and evaluated.
        """
        try:
            data = read_json(source, "curves case", max_bytes=_CASE_LIMIT)
            result = evaluate_curves_case(copy.deepcopy(data))
        except Exception as exc:  # noqa: BLE001 - shown to the user
            self.fail(exc, "case not loaded: ")
            return False
        self.case = data
        self._accept(result, f"case loaded: {result.title or 'untitled'}")
        self._show_inputs()
        return True

    def case_json(self) -> str:
        """JSON text of the current case (SI values)."""
        return json.dumps(self.case, indent=2)

    def report_html(self) -> str:
        """The self-contained HTML report of the last good result."""
        return curves_report(self.result)

    def recalculate(self) -> bool:
        """Rebuild the case from the widgets and evaluate it; True when it succeeded.

        A refused entry is shown in the message area (the last good result stays, marked
        stale) and False is returned."""
        try:
            data = self._case_from_widgets()
            result = evaluate_curves_case(copy.deepcopy(data))
        except Exception as exc:  # noqa: BLE001 - shown to the user
            self.fail(exc)
            return False
        self.case = data
        self._accept(result, "")
        return True

    # ------------------------------------------------------------------ case <-> widgets
    def _case_from_widgets(self) -> dict:
        data = copy.deepcopy(self.case)
        kind = data["kind"]
        curve = dict(data["curve"])
        table = parse_table(self.curve_text.value, curve_columns(kind), self.system,
                            "datasheet curve")
        for key in ("flow", "head", "efficiency", "power", "npsh_required"):
            curve.pop(key, None)
            if table.get(key) is not None:
                curve[key] = table[key].tolist()
        curve.update(speed=self.curve_speed.si * RPM, min_flow=self.min_flow.si,
                     max_flow=self.max_flow.si)
        data["curve"] = curve
        if kind == "pump":
            self._pump_from_widgets(data)
        else:
            self._compressor_from_widgets(data)
        return data

    def _pump_from_widgets(self, data):
        if "system" in data:
            data["system"] = dict(data["system"], static_head=self.static_head.si)
        table = parse_table(self.test_text.value, measured_columns("pump"), self.system,
                            "test points")
        if table["_rows"] == 0:
            data.pop("acceptance", None)
            return
        acc = dict(data.get("acceptance") or {})
        for key in ("test_flow", "test_head", "test_power"):
            acc[key] = None if table[key] is None else table[key].tolist()
        acc.update(test_speed=self.test_speed.si * RPM, rated_speed=data["curve"]["speed"],
                   guarantee_flow=self.g_flow.si, guarantee_head=self.g_head.si,
                   guarantee_efficiency=self.g_eff.si or None, grade=self.rule.value)
        acc.setdefault("degree", 2)
        data["acceptance"] = acc

    def _compressor_from_widgets(self, data):
        sim = data.get("similarity")
        if sim is None:
            return
        table = parse_table(self.test_text.value, measured_columns("compressor"), self.system,
                            "test point")
        if table["_rows"] != 1:
            raise InputError(f"test point: an ASME PTC 10 comparison takes one test point "
                             f"(one line of six readings), not {table['_rows']}")
        test = dict(sim["test"])
        for col in measured_columns("compressor"):
            test[col.key] = float(table[col.key][0])
        data["similarity"] = dict(sim, test=test, test_type=self.rule.value)

    def _show_inputs(self):
        """Show the current case in the widgets (quietly: no recalculation)."""
        data, system = self.case, self.system
        kind = data["kind"]
        curve = data["curve"]
        with self.quiet():
            self.kind.value = kind
            self.rule.options = RULES[kind]
            self.curve_text.value = format_table(curve_columns(kind), curve, system)
            for e in (self.curve_speed, self.min_flow, self.max_flow, self.test_speed,
                      self.g_flow, self.g_head, self.g_eff, self.static_head):
                e.set_system(system, 101325.0)
            for e in (self.curve_speed, self.test_speed):
                e.unit.value = "rpm"
            self.min_flow.label.value = ("Minimum-flow limit" if kind == "pump"
                                         else "Surge limit")
            self.curve_speed.set_si(curve["speed"] / RPM)
            self.min_flow.set_si(curve.get("min_flow") or curve["flow"][0])
            self.max_flow.set_si(curve.get("max_flow") or curve["flow"][-1])
            if kind == "pump":
                self._show_pump_inputs(data, system)
            else:
                self._show_compressor_inputs(data, system)

    def _show_pump_inputs(self, data, system):
        acc = data.get("acceptance") or {}
        self.rule.value = acc.get("grade", "2B")
        self.test_text.value = format_table(measured_columns("pump"), acc, system)
        self.test_speed.set_si(acc.get("test_speed", data["curve"]["speed"]) / RPM)
        self.g_flow.set_si(acc.get("guarantee_flow", 0.0))
        self.g_head.set_si(acc.get("guarantee_head", 0.0))
        self.g_eff.set_si(acc.get("guarantee_efficiency") or 0.0)
        self.static_head.set_si((data.get("system") or {}).get("static_head", 0.0))
        self.test_heading.value = "<b>Test points at the test speed (ISO 9906)</b>"
        system_row = [self.static_head] if "system" in data else []
        self.test_box.children = [
            self.test_heading, widgets.HBox([self.test_speed, self.g_flow]),
            widgets.HBox([self.g_head, self.g_eff]), widgets.HBox(system_row),
            self.test_text, widgets.HBox([self.readings_file, _note(
                "A readings result file (the readings dashboard's export) gives the flows, "
                "heads (isentropic head over g) and shaft powers of its steady rows.")])]

    def _show_compressor_inputs(self, data, system):
        sim = data.get("similarity") or {}
        self.rule.value = str(sim.get("test_type", "2"))
        test = sim.get("test") or {}
        cols = measured_columns("compressor")
        self.test_text.value = format_table(
            cols, {c.key: [test[c.key]] for c in cols if c.key in test}, system)
        self.test_heading.value = ("<b>Test point on the test gas (ASME PTC 10); the "
                                   "specified conditions come from the case file</b>")
        self.test_box.children = [self.test_heading, self.test_text, widgets.HBox([
            self.readings_file, _note("A readings result file gives the mean of its steady "
                                      "rows as the test point.")])]

    # ------------------------------------------------------------------ results
    def _accept(self, result, text):
        self.show_result(result, text, cautions=self._cautions(result))
        self.title_html.value = (f"<h3 style='margin:4px 0'>"
                                 f"{html.escape(result.title or 'untitled case')}</h3>")
        self._show_results()

    @staticmethod
    def _cautions(result):
        out = []
        for part in (result.operating_point, result.acceptance, result.similarity):
            text = getattr(part, "cautions", "") if part is not None else ""
            if text:
                out.extend(text if isinstance(text, (list, tuple)) else [text])
        return out

    def _show_results(self):
        result = self.result
        if result is None:
            return
        values = {}
        if result.operating_point is not None:
            values.update(result.operating_point.to_dict())
            # the curve's power is the power input at the coupling: a shaft power
            values["shaft_power"] = values.pop("power", None)
        if result.acceptance is not None:
            values.update({k: result.acceptance.to_dict().get(k) for k in ACCEPTANCE_FIELDS})
        values = {k: v for k, v in values.items() if isinstance(v, (int, float))}
        self.rows.show(values, self.system)
        for name in POINT_FIELDS + ACCEPTANCE_FIELDS:
            shown = self.rows[name].layout
            shown.display = None if name in values else "none"
        self.verdict.value = verdict_text(result)
        self.verdicts.value = verdicts_html(result)
        self._draw(result)
        self.case_link.value = download_link(self.case_json(), "curves-case.json",
                                             "download the case (JSON)", "application/json")
        self.report_link.value = download_link(curves_report(result), "curves-report.html",
                                               "download the report (HTML)", "text/html")

    def _draw(self, result):
        charts = {c.key: c for c in case_charts(result)}
        if result.kind == "compressor":
            shown = [charts.get("compressor_head"), charts.get("compressor_efficiency")]
        else:
            shown = [charts.get("head"), charts.get("acceptance") or charts.get("npsh")]
        extra = self._test_speed_series(result)
        if extra and shown[0] is not None:
            shown[0] = dataclasses.replace(shown[0], series=tuple(shown[0].series) + extra)
        update_curves_figure(self.figure, [c for c in shown if c is not None])
        refresh_view(self.figure_view, self.figure)

    @staticmethod
    def _test_speed_series(result):
        """The datasheet curve at the test speed (affinity laws) and the raw test points."""
        from ..curves.charts import HEAD_KIND, Series, to_display

        curve, kind = result.curve, HEAD_KIND[result.kind]
        if result.acceptance is not None:
            acc = result.data["acceptance"]
            speed = acc["test_speed"]
            points = Series("test points at test speed",
                            tuple(to_display(q, "volume_flow") for q in acc["test_flow"]),
                            tuple(float(h) for h in acc["test_head"]), style="markers",
                            color="#6a3d9a")
        elif result.similarity is not None:
            speed = result.similarity.test.speed
            t = result.similarity.test
            points = Series("test point as measured",
                            (to_display(t.volume_flow, "volume_flow"),),
                            (to_display(t.polytropic_head, kind),), style="markers",
                            color="#6a3d9a")
        else:
            return ()
        if abs(speed / curve.speed - 1.0) < 1e-9 or not 0.1 <= speed / curve.speed <= 10:
            return (points,)
        scaled = curve_series(curve.at_speed(speed), "datasheet curve at test speed", kind,
                              color="#6a3d9a")
        scaled = dataclasses.replace(scaled, style="dashed")
        return (scaled, points)

    def set_stale(self, stale: bool) -> None:
        """Grey the result rows and mark the verdict as belonging to earlier inputs."""
        super().set_stale(stale)
        text = self.verdict.value
        note = ("<div class='wb-stale' style='color:#8a8a8a'>(stale: shown for the last "
                "inputs that could be evaluated)</div>")
        if stale and note not in text:
            self.verdict.value = text + note
        elif not stale:
            self.verdict.value = text.replace(note, "")

    # ------------------------------------------------------------------ callbacks
    def _kind_changed(self, change):
        if self.case.get("kind") == change["new"]:
            return
        if self.load_case(load_curves_demo(KIND_DEMOS[change["new"]])):
            self.demo.value = KIND_DEMOS[change["new"]]
        else:
            with self.quiet():
                self.kind.value = change["old"]

    def _curve_uploaded(self, change):
        name, content = _upload_content(change)
        with self.quiet():
            self.curve_file.value = ()
        if content is None:
            return
        text = self._table_text(name, content)
        table = parse_table(text, curve_columns(self.case["kind"]), self.system, name)
        if not table["_rows"]:
            raise InputError(f"{name}: no points found (one point a line, numbers only)")
        with self.quiet():  # the old limits may lie outside the new curve
            self.min_flow.set_si(float(table["flow"][0]))
            self.max_flow.set_si(float(table["flow"][-1]))
            self.curve_text.value = text
        if self.recalculate():
            self.message.show(f"curve read from {name}; its flow limits are set to its first "
                              "and last points: enter the minimum-flow or surge limit",
                              cautions=self._cautions(self.result))

    def _readings_uploaded(self, change):
        name, content = _upload_content(change)
        with self.quiet():
            self.readings_file.value = ()
        if content is None:
            return
        kind = self.case["kind"]
        points = points_from_readings(read_table(name or "readings.csv", content), kind)
        cols = measured_columns(kind)
        with self.quiet():
            if kind == "pump":
                self.test_speed.set_si(points.pop("test_speed") / RPM)
            self.test_text.value = format_table(cols, points, self.system)
        if self.recalculate():
            self.message.show(f"test points read from {name}",
                              cautions=self._cautions(self.result))

    def _case_uploaded(self, change):
        name, content = _upload_content(change)
        with self.quiet():
            self.case_file.value = ()
        if content is not None:
            self.load_case(content)

    @staticmethod
    def _table_text(name, content):
        if len(content) > TABLE_LIMIT_BYTES:
            raise InputError(f"{name}: {len(content)} bytes, more than the "
                             f"{TABLE_LIMIT_BYTES} bytes a point table may have")
        try:
            return content.decode("utf-8-sig")
        except UnicodeDecodeError:
            raise InputError(f"{name}: not UTF-8 text") from None


__all__ = ["CurvesPanel", "KIND_DEMOS", "RULES"]
