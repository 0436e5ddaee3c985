"""The sweep tab of the machine panel: vary one input, tabulate and plot result fields.

The sweep itself is :func:`workbench.study.sweep` (SI values in, SI columns out, failed
points as gaps); this tab converts the range typed in display units, shows the table in
display units with headers from :data:`workbench.fields.FIELDS`, offers it as a CSV
download and draws it into one sweep figure, built when the tab is first opened and then
changed in place.
"""

from __future__ import annotations

import html

import ipywidgets as widgets
import numpy as np

from .. import study, units
from ..errors import InputError
from ..fields import field
from . import charts
from .common import (
    NumberEntry,
    choice,
    download_link,
    format_number,
    from_si,
    hook,
    input_class,
    result_class,
    round_for_entry,
    unit_label,
)
from .machine_entries import ENTRIES, ENTRY_FIGURES, PERCENT_FIELDS, RESULT_FIELDS, number_of


class SweepTab(widgets.VBox):
    """The sweep tab of a :class:`~workbench.ui.machine_panel.MachinePanel`.

    Attributes
    ----------
    table : pandas.DataFrame or None
        The last sweep in display units (units in the column names).
    csv : str
        The CSV text of :attr:`table`.
    figure : plotly FigureWidget or None
        The sweep figure, once built.
    """

    def __init__(self, panel):
        self.panel = panel
        inp = panel._inputs
        guard = panel.guard
        self.table = None
        self.csv = ""
        self.figure = None
        self.variable = choice("sweep-input", "vary", study.SWEEP_INPUTS, inp["sweep_input"])
        kind = ENTRIES[inp["sweep_input"]][2]
        self.start = NumberEntry("sweep-start", "from", kind, inp["sweep_start"],
                                 on_change=guard(self._bound_changed), system=panel.system,
                                 ambient_pressure=panel.ambient, significant=ENTRY_FIGURES)
        self.stop = NumberEntry("sweep-stop", "to", kind, inp["sweep_stop"],
                                on_change=guard(self._bound_changed), system=panel.system,
                                ambient_pressure=panel.ambient, significant=ENTRY_FIGURES)
        self.points = input_class(widgets.BoundedIntText(
            value=inp["sweep_points"], min=2, max=study.MAX_SWEEP_POINTS, description="points",
            continuous_update=False, style={"description_width": "170px"},
            layout=widgets.Layout(width="330px")), "sweep-points")
        self.points.observe(guard(self._points_changed), names="value")
        self.variable.observe(guard(self._variable_changed), names="value")
        self.results = input_class(widgets.SelectMultiple(
            options=[(field(n).label, hook(n)) for n in RESULT_FIELDS],
            value=("power", "outlet-temperature"), description="show", rows=8,
            style={"description_width": "60px"}, layout=widgets.Layout(width="320px")),
            "sweep-results")
        self.button = input_class(widgets.Button(description="run sweep",
                                                 layout=widgets.Layout(width="160px")),
                                  "sweep-run")
        self.button.on_click(guard(lambda _b: self.run()))
        self.view = widgets.Box([widgets.HTML(
            "<i style='color:#8a8a8a'>the sweep chart is drawn here</i>")])
        self.view.add_class("wb-sweep-chart")
        self.note = result_class(widgets.HTML(""), "sweep-note")
        self.link = result_class(widgets.HTML(""), "sweep-csv")
        self.table_html = result_class(widgets.HTML("", layout=widgets.Layout(
            max_height="260px", overflow="auto")), "sweep-table")
        super().__init__([
            widgets.HBox([widgets.VBox([self.variable, self.start, self.stop, self.points,
                                        self.button, self.note, self.link]), self.results]),
            self.view, self.table_html])

    # ------------------------------------------------------------------ settings
    def refresh(self):
        """Show the panel's sweep settings (called quietly by the panel)."""
        inp, panel = self.panel._inputs, self.panel
        self.variable.value = inp["sweep_input"]
        kind = ENTRIES[inp["sweep_input"]][2]
        for ent, key in ((self.start, "sweep_start"), (self.stop, "sweep_stop")):
            ent.kind = kind
            ent.set_system(panel.system, panel.ambient)
            ent.set_si(inp[key])
        self.points.value = inp["sweep_points"]

    def set_system(self, system, ambient):
        """Show the range in another unit system."""
        for ent in (self.start, self.stop):
            ent.set_system(system, ambient)

    def _bound_changed(self, entry):
        self.panel._inputs["sweep_start" if entry is self.start else "sweep_stop"] = entry.si

    def _points_changed(self, change):
        self.panel._inputs["sweep_points"] = int(change["new"])

    def _variable_changed(self, change):
        name = change["new"]
        panel = self.panel
        panel._inputs["sweep_input"] = name
        key, _label, kind = ENTRIES[name]
        current = panel._inputs[key]
        for ent, factor in ((self.start, 0.8), (self.stop, 1.2)):
            ent.kind = kind
            value = min(current * factor, 1.0) if kind == "percent" else current * factor
            ent.set_system(panel.system, panel.ambient)
            ent.set_si(value)
        panel._inputs["sweep_start"] = self.start.si
        panel._inputs["sweep_stop"] = self.stop.si

    def ensure_figure(self):
        """Build the (empty) sweep figure if not built yet; later sweeps fill it in place."""
        if self.figure is None:
            self.figure = charts.make_sweep_figure()
            self.view.children = (charts.figure_view(self.figure),)

    # ------------------------------------------------------------------ run
    def _apply(self, variable, start, stop, points, results):
        with self.panel.quiet():
            if variable is not None:
                self.variable.value = units.choice(hook(variable), study.SWEEP_INPUTS,
                                                   "sweep variable")
        if variable is not None:
            self._variable_changed({"new": self.variable.value})
        if start is not None:
            self.start.set_display(number_of(start, "sweep start"), notify=False)
        if stop is not None:
            self.stop.set_display(number_of(stop, "sweep end"), notify=False)
        if points is not None:
            self.points.value = units.count(points, "sweep points", low=2,
                                            high=study.MAX_SWEEP_POINTS)
        if results is not None:
            names = tuple(hook(r) for r in results)
            known = {hook(n) for n in RESULT_FIELDS}
            unknown = [n for n in names if n not in known]
            if unknown:
                raise InputError(f"no result named {unknown[0]!r} to sweep")
            self.results.value = names

    def _sweep(self, variable, start, stop, points, results):
        panel = self.panel
        self._apply(variable, start, stop, points, results)
        panel._inputs["sweep_start"] = self.start.si
        panel._inputs["sweep_stop"] = self.stop.si
        chosen = [n.replace("-", "_") for n in self.results.value] or ["power"]
        values = study.sweep_values(self.start.si, self.stop.si, self.points.value)
        return study.sweep(panel._inputs, self.variable.value, values, chosen, panel._fluids)

    def run(self, variable=None, start=None, stop=None, points=None, results=None):
        """Run the sweep (see :meth:`MachinePanel.run_sweep`); None and a message when the
        settings are bad."""
        import pandas as pd

        panel = self.panel
        ok, swept = panel.attempt(self._sweep, variable, start, stop, points, results,
                                  prefix="sweep not run: ", stale=False)
        if not ok:
            return None
        name, chosen = swept.variable, list(swept.columns)
        system, ambient = panel.system, panel.ambient
        _key, label, kind = ENTRIES[name]
        x_col = f"{label} [{unit_label(system, kind)}]"
        table = pd.DataFrame({x_col: [round_for_entry(float(from_si(system, v, kind, ambient)))
                                      for v in swept.values]})
        for n in chosen:
            shown = "percent" if n in PERCENT_FIELDS else field(n).kind
            table[field(n).header(unit_label(system, shown))] = np.asarray(
                from_si(system, swept.columns[n], shown, ambient), dtype=float)
        self._show(table, swept, x_col)
        return table

    def _show(self, table, swept, x_col):
        self.table = table
        self.csv = table.to_csv(index=False)
        self.link.value = download_link(self.csv, "sweep.csv", "download the table (CSV)")
        self.table_html.value = table.to_html(index=False, float_format=format_number,
                                              na_rep="–", border=0)
        note = f"{len(table)} points"
        if swept.failures:
            note += f", {len(swept.failures)} failed (gaps): {swept.failures[0][1]}"
        self.note.value = html.escape(note, quote=False)
        # the numbers are shown; now the chart (built once, then changed in place); the
        # table stays good when the chart cannot be drawn
        self.panel.attempt(self._draw, table, x_col, stale=False,
                           prefix="the sweep chart could not be drawn: ")

    def _draw(self, table, x_col):
        self.ensure_figure()
        columns = {c: table[c].tolist() for c in table.columns[1:]}
        charts.update_sweep_figure(self.figure, table[x_col].tolist(), columns, x_col)
        charts.refresh_view(self.view.children[0], self.figure)
