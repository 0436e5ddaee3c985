"""The train panel: a staged, intercooled compressor or an extraction steam turbine.

:class:`TrainPanel` is a :class:`~workbench.ui.common.Panel` built like the machine panel:
it keeps every input in SI units, runs :func:`workbench.train_study.train_study` on every
change and shows the result fields of :data:`workbench.fields.FIELDS`
(:data:`workbench.train_study.TRAIN_FIELDS`), the station table, the shaft power of each
stage as bars and all stations on one h-s chart.  No thermodynamics is done here.

Test hooks: every entry has the CSS class ``wb-input-<name>`` (names in
:data:`COMPRESSOR_ENTRIES`, :data:`TURBINE_ENTRIES` and the choices), every result
``wb-result-<name>`` (:data:`RESULTS`, plus ``wb-result-stations``,
``wb-result-power-bars`` and ``wb-result-hs-chart``), the message area ``wb-message``.

References
----------
ASME PTC 10-1997 (compressor sections with intercooling); ASME PTC 6-2004 (steam turbines).
"""

from __future__ import annotations

import html

import ipywidgets as widgets

from .. import train_study as ts
from . import charts
from .common import (
    DEFAULT_AMBIENT,
    NumberEntry,
    Panel,
    ResultRows,
    choice,
    format_number,
    from_si,
    hook,
    result_class,
    unit_label,
    unit_switch,
)

SCENARIOS = ts.SCENARIOS

#: Compressor entries: hook name -> (label, display kind).
COMPRESSOR_ENTRIES = {
    "suction-pressure": ("suction pressure", "absolute_pressure"),
    "suction-temperature": ("suction temperature", "temperature"),
    "discharge-pressure": ("discharge pressure", "absolute_pressure"),
    "mass-flow": ("mass flow", "mass_flow"),
    "isentropic-efficiency": ("stage isentropic efficiency", "percent"),
    "cooler-outlet-temperature": ("cooler outlet temperature", "temperature"),
    "cooler-pressure-drop": ("cooler pressure drop", "pressure_difference"),
    "knockout-pressure-drop": ("knock-out pressure drop", "pressure_difference"),
}

#: Turbine entries: hook name -> (label, display kind).
TURBINE_ENTRIES = {
    "inlet-pressure": ("inlet pressure", "absolute_pressure"),
    "inlet-temperature": ("inlet temperature", "temperature"),
    "valve-outlet-pressure": ("pressure after the valve", "absolute_pressure"),
    "extraction-pressure": ("extraction pressure", "absolute_pressure"),
    "exhaust-pressure": ("exhaust pressure", "absolute_pressure"),
    "steam-flow": ("steam flow", "mass_flow"),
    "extraction-flow": ("extraction flow", "mass_flow"),
    "hp-efficiency": ("HP isentropic efficiency", "percent"),
    "lp-efficiency": ("LP isentropic efficiency", "percent"),
}

#: Every entry of both scenarios, compressor first.
_ALL_ENTRIES = {**COMPRESSOR_ENTRIES, **TURBINE_ENTRIES}

#: Result rows: hook names of :data:`workbench.train_study.TRAIN_FIELDS`.
RESULTS = tuple(hook(name) for name in ts.TRAIN_FIELDS)


def _key(name: str) -> str:
    return name.replace("-", "_")


def _entry_kind(kind):
    # A pressure difference converts like an absolute pressure (no gauge offset).
    return "absolute_pressure" if kind == "pressure_difference" else kind


def _pretty(system, kind):
    if kind == "pressure_difference":
        return unit_label(system, "absolute_pressure").replace("(abs)", "").replace("psia", "psi")
    return unit_label(system, kind)


class TrainPanel(Panel):
    """Panel of a machine train (see the module notes).

    Parameters
    ----------
    scenario : {"intercooled compressor", "extraction turbine"}
        What the panel opens with.
    system : str
        Display unit system, a key of :data:`workbench.units.UNIT_SYSTEMS`.

    Attributes
    ----------
    result : IntercooledCompressorResult or ExtractionTurbineResult or None
        The last good result.
    stale : bool
        True when the inputs changed but the calculation failed (the shown result is the
        last good one).
    """

    css_class = "wb-train-panel"

    def __init__(self, scenario: str = "intercooled compressor", system: str = "bar, degC"):
        self._ensure_plumbing()
        self.system = system
        guard = self.guard
        self.title = widgets.HTML("<h3 style='margin:4px 0'>Machine train</h3>")
        self.units = unit_switch(system)
        self.units.observe(guard(self._units_changed), names="value")
        self.scenario = choice("scenario", "train", SCENARIOS, scenario)
        self.scenario.layout.width = "380px"  # room for "intercooled compressor"
        self.scenario.observe(guard(lambda _: self._scenario_changed()), names="value")
        options = ts.COMPRESSOR_OPTIONS
        self.gas = choice("gas", "gas", options["gas"][0], options["gas"][1])
        self.stages = choice("stages", "stages", options["stages"][0], options["stages"][1])
        self.ratio_method = choice("ratio-method", "stage ratios", options["stage_ratios"][0],
                                   options["stage_ratios"][1])
        for w in (self.gas, self.stages, self.ratio_method):
            w.observe(guard(lambda _: self.recalculate()), names="value")
        defaults = {**ts.default_inputs(SCENARIOS[0]), **ts.default_inputs(SCENARIOS[1])}
        self.entries = {}
        for name, (label, kind) in _ALL_ENTRIES.items():
            entry = NumberEntry(name, label, _entry_kind(kind), defaults[_key(name)],
                                on_change=guard(lambda _: self.recalculate()), system=system,
                                significant=5)
            entry.unit.value = _pretty(system, kind)
            entry.label.layout.width = "210px"
            entry.layout.width = "400px"
            self.entries[name] = entry
        self.compressor_box = widgets.VBox(
            [self.gas, self.stages, self.ratio_method]
            + [self.entries[n] for n in COMPRESSOR_ENTRIES])
        self.turbine_box = widgets.VBox([self.entries[n] for n in TURBINE_ENTRIES])
        self.inputs = widgets.VBox([])
        self.results = self.add_result_widget(ResultRows(ts.TRAIN_FIELDS))
        self.stations = result_class(widgets.HTML(""), "stations")
        # One FigureWidget for both charts (each widget costs page-load time): the shaft
        # power of each stage (left) and every station on the h-s chart (right).
        self.chart = charts.make_train_figure()
        self.chart_view = charts.figure_view(self.chart)
        self.chart_view.add_class("wb-result-power-bars")
        self.chart_view.add_class("wb-result-hs-chart")
        super().__init__([
            self.title, self.caution, widgets.HBox([self.scenario, self.units]),
            widgets.HBox([self.inputs, self.results]), self.message, self.stations,
            self.chart_view])
        self._scenario_changed()

    # ------------------------------------------------------------------ inputs
    def si(self, name: str) -> float:
        """SI value of an entry."""
        return self.entries[name].si

    def set_input(self, name: str, display_value: float):
        """Type a number (display units) into an entry, as a user would."""
        self.entries[name].set_display(display_value)

    def study_inputs(self) -> dict:
        """The chosen scenario's inputs (SI) for :func:`workbench.train_study.train_study`."""
        compressor = self.scenario.value == SCENARIOS[0]
        names = COMPRESSOR_ENTRIES if compressor else TURBINE_ENTRIES
        inputs = {_key(name): self.si(name) for name in names}
        if compressor:
            inputs.update(gas=self.gas.value, stages=int(self.stages.value),
                          stage_ratios=self.ratio_method.value)
        return inputs

    def _scenario_changed(self):
        compressor = self.scenario.value == SCENARIOS[0]
        self.inputs.children = [self.compressor_box if compressor else self.turbine_box]
        self.recalculate()

    def _units_changed(self, change):
        self.system = change["new"]
        for name, entry in self.entries.items():
            entry.set_system(self.system, DEFAULT_AMBIENT)
            entry.unit.value = _pretty(self.system, _ALL_ENTRIES[name][1])
        if self.result is not None:
            self._show(self.result)

    # ------------------------------------------------------------------ calculation
    def compute(self):
        """Run the chosen train with the panel's SI inputs and return its result."""
        return ts.train_study(self.scenario.value, self.study_inputs())

    def recalculate(self) -> bool:
        """Recalculate; on failure show the message and keep the last result, marked stale."""
        ok, result = self.attempt(self.compute)
        if not ok:
            return False
        ok, values = self.attempt(ts.train_values, result)
        if not ok:
            return False
        self._values = values
        self.show_result(result)
        self._show(result)
        return True

    # ------------------------------------------------------------------ display
    def _show(self, result):
        values = self._values
        ratios = ", ".join(f"{r:.4g}" for r in values["stage_pressure_ratios"])
        notes = {"stage_pressure_ratios": ratios}
        if values["outlet_quality"] != values["outlet_quality"]:  # NaN: single-phase
            notes["outlet_quality"] = "–"
        shown = {k: v for k, v in values.items() if k != "stage_pressure_ratios"}
        self.results.show(shown, self.system, DEFAULT_AMBIENT, notes)
        self.stations.value = self._station_table(result)
        charts.update_train_figure(self.chart, ts.train_series(result), self.system)
        charts.refresh_view(self.chart_view, self.chart)

    def _station_table(self, result) -> str:
        sys_ = self.system
        columns = (("P", "pressure", "absolute_pressure"), ("T", "temperature", "temperature"),
                   ("h", "enthalpy", "specific_enthalpy"), ("s", "entropy", "specific_entropy"))
        heads = [("#", ""), ("station", "")] + [
            (title, unit_label(sys_, kind)) for title, _key_, kind in columns] + [
            ("quality", "-"), ("mass flow", unit_label(sys_, "mass_flow"))]
        cells = "".join(f"<th style='padding:2px 8px'>{html.escape(h)}"
                        f"{' [' + html.escape(u) + ']' if u else ''}</th>" for h, u in heads)
        rows = [f"<tr>{cells}</tr>"]
        for st in ts.train_stations(result):
            values = [st["number"], st["name"]] + [
                format_number(from_si(sys_, st[key], kind)) for _t, key, kind in columns] + [
                "–" if st["quality"] != st["quality"] else f"{st['quality']:.4f}",
                format_number(from_si(sys_, st["mass_flow"], "mass_flow"))]
            rows.append("<tr>" + "".join(f"<td style='padding:2px 8px'>{html.escape(v)}</td>"
                                         for v in values) + "</tr>")
        return ("<table style='border-collapse:collapse;font-size:90%'>" + "".join(rows)
                + "</table>")


__all__ = ["COMPRESSOR_ENTRIES", "RESULTS", "SCENARIOS", "TURBINE_ENTRIES", "TrainPanel"]
