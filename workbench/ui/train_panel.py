"""The train panel: a staged, intercooled compressor or an extraction steam turbine.

:class:`TrainPanel` is an ``ipywidgets.VBox``.  It keeps every input in SI units, calls
:func:`workbench.trains.intercooled_compressor` or :func:`workbench.trains.extraction_turbine`
on every change, and shows the station table, the shaft power of each stage as bars and all
stages on one h-s chart.  No thermodynamics is done here.

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
import plotly.graph_objects as go

from .. import SAFETY_CAUTION
from ..properties import Fluid
from ..trains import extraction_turbine, intercooled_compressor
from .charts import sync_figure
from .common import (
    NumberEntry,
    ResultField,
    caution_banner,
    choice,
    format_number,
    from_si,
    message_area,
    unit_label,
    unit_switch,
)

SCENARIOS = ("intercooled compressor", "extraction turbine")

#: Gases offered for the compressor.
GASES = ("Air", "Nitrogen", "CarbonDioxide", "Methane")

#: Compressor entries: hook name -> (label, kind, SI default).  Demo scenario: an
#: instrument-air compressor in three stages (values invented for the demo).
COMPRESSOR_ENTRIES = {
    "suction-pressure": ("suction pressure", "absolute_pressure", 1.0e5),
    "suction-temperature": ("suction temperature", "temperature", 298.15),
    "discharge-pressure": ("discharge pressure", "absolute_pressure", 9.0e5),
    "mass-flow": ("mass flow", "mass_flow", 1.5),
    "isentropic-efficiency": ("stage isentropic efficiency", "percent", 0.80),
    "cooler-outlet-temperature": ("cooler outlet temperature", "temperature", 308.15),
    "cooler-pressure-drop": ("cooler pressure drop", "pressure_difference", 0.1e5),
    "knockout-pressure-drop": ("knock-out pressure drop", "pressure_difference", 0.05e5),
}

#: Turbine entries.  Demo scenario: a paper-mill back-pressure turbine with a process steam
#: extraction (values invented for the demo).
TURBINE_ENTRIES = {
    "inlet-pressure": ("inlet pressure", "absolute_pressure", 42.0e5),
    "inlet-temperature": ("inlet temperature", "temperature", 713.15),
    "valve-outlet-pressure": ("pressure after the valve", "absolute_pressure", 38.0e5),
    "extraction-pressure": ("extraction pressure", "absolute_pressure", 12.0e5),
    "exhaust-pressure": ("exhaust pressure", "absolute_pressure", 4.0e5),
    "steam-flow": ("steam flow", "mass_flow", 12.0),
    "extraction-flow": ("extraction flow", "mass_flow", 4.0),
    "hp-efficiency": ("HP isentropic efficiency", "percent", 0.78),
    "lp-efficiency": ("LP isentropic efficiency", "percent", 0.75),
}

#: Every entry of both scenarios, compressor first.
_ALL_ENTRIES = {**COMPRESSOR_ENTRIES, **TURBINE_ENTRIES}

#: Results: hook name -> (label, kind).
RESULTS = {
    "total-power": ("total shaft power", "power"),
    "heat-removed": ("heat removed by coolers", "heat_flow"),
    "outlet-temperature": ("train outlet temperature", "temperature"),
    "outlet-quality": ("train outlet quality", "dimensionless"),
    "stage-ratios": ("stage pressure ratios", "dimensionless"),
}


def _pretty(system, kind):
    if kind == "pressure_difference":
        return unit_label(system, "absolute_pressure").replace("(abs)", "").replace("psia", "psi")
    return unit_label(system, kind)


def _entry_kind(kind):
    # A pressure difference converts like an absolute pressure (no gauge offset).
    return "absolute_pressure" if kind == "pressure_difference" else kind


class TrainPanel(widgets.VBox):
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

    def __init__(self, scenario: str = "intercooled compressor", system: str = "bar, degC"):
        self.result = None
        self.stale = False
        self._fluids: dict = {}
        self.system = system
        self.title = widgets.HTML("<h3 style='margin:4px 0'>Machine train</h3>")
        self.caution = caution_banner(SAFETY_CAUTION)
        self.units = unit_switch(system)
        self.units.observe(self._units_changed, names="value")
        self.scenario = choice("scenario", "train", SCENARIOS, scenario)
        self.scenario.layout.width = "380px"  # room for "intercooled compressor"
        self.scenario.observe(lambda _: self._scenario_changed(), names="value")
        self.gas = choice("gas", "gas", GASES, "Air")
        self.stages = choice("stages", "stages", (1, 2, 3, 4, 5, 6), 3)
        self.ratio_method = choice("ratio-method", "stage ratios", ("equal", "optimal"),
                                   "optimal")
        for w in (self.gas, self.stages, self.ratio_method):
            w.observe(lambda _: self.recalculate(), names="value")
        self.entries = {}
        for name, (label, kind, default) in _ALL_ENTRIES.items():
            self.entries[name] = NumberEntry(name, label, _entry_kind(kind), default,
                                             on_change=lambda _: self.recalculate(),
                                             system=system, significant=5)
            self.entries[name].unit.value = _pretty(system, kind)
            self.entries[name].label.layout.width = "210px"
            self.entries[name].layout.width = "400px"
        self.compressor_box = widgets.VBox(
            [self.gas, self.stages, self.ratio_method]
            + [self.entries[n] for n in COMPRESSOR_ENTRIES])
        self.turbine_box = widgets.VBox([self.entries[n] for n in TURBINE_ENTRIES])
        self.inputs = widgets.VBox([])
        self.results = {name: ResultField(name, label, kind)
                        for name, (label, kind) in RESULTS.items()}
        self.stations = widgets.HTML("")
        self.stations.add_class("wb-result-stations")
        self.message = message_area()
        # One FigureWidget for both charts (each widget costs page-load time): the shaft
        # power of each stage (left) and every station on the h-s chart (right).
        self.chart = go.FigureWidget(
            data=[go.Bar(x=[], y=[], name="shaft power", marker=dict(color="#4a7fb0"),
                         xaxis="x", yaxis="y", showlegend=False),
                  go.Scatter(x=[], y=[], mode="lines+markers+text", name="main line",
                             textposition="top center", line=dict(color="#222222", width=1.5),
                             marker=dict(color="#222222", size=7), xaxis="x2", yaxis="y2"),
                  go.Scatter(x=[], y=[], mode="markers", name="branches", xaxis="x2",
                             yaxis="y2", marker=dict(symbol="diamond", size=10,
                                                     color="#b0704a"))],
            layout=dict(
                height=380, width=1040, margin=dict(l=70, r=10, t=40, b=50),
                template="simple_white",
                xaxis=dict(domain=[0.0, 0.36]), yaxis=dict(anchor="x"),
                xaxis2=dict(domain=[0.46, 1.0]), yaxis2=dict(anchor="x2"),
                legend=dict(orientation="h", y=-0.18, x=0.46, font=dict(size=10)),
                annotations=[dict(text=t, x=x, y=1.02, xref="paper", yref="paper",
                                  xanchor="center", yanchor="bottom", showarrow=False,
                                  font=dict(size=13))
                             for t, x in (("shaft power of each stage", 0.18),
                                          ("every station on the h-s chart", 0.73))]))
        self.chart.add_class("wb-result-power-bars")
        self.chart.add_class("wb-result-hs-chart")
        super().__init__([
            self.title, self.caution, widgets.HBox([self.scenario, self.units]),
            widgets.HBox([self.inputs, widgets.VBox(list(self.results.values()))]),
            self.message, self.stations, self.chart,
        ])
        self._scenario_changed()

    # ------------------------------------------------------------------ inputs
    def si(self, name: str) -> float:
        """SI value of an entry."""
        return self.entries[name].si

    def set_input(self, name: str, display_value: float):
        """Type a number (display units) into an entry, as a user would."""
        self.entries[name].set_display(display_value)

    def _scenario_changed(self):
        compressor = self.scenario.value == SCENARIOS[0]
        self.inputs.children = [self.compressor_box if compressor else self.turbine_box]
        self.recalculate()

    def _units_changed(self, change):
        self.system = change["new"]
        for name, entry in self.entries.items():
            entry.set_system(self.system, 101325.0)
            entry.unit.value = _pretty(self.system, _ALL_ENTRIES[name][1])
        if self.result is not None:
            self._show(self.result)

    def _fluid(self, name):
        if name not in self._fluids:
            self._fluids[name] = Fluid(name) if name != "Water" else Fluid("Water", backend="IF97")
        return self._fluids[name]

    # ------------------------------------------------------------------ calculation
    def compute(self):
        """Run the chosen train with the panel's SI inputs and return its result."""
        if self.scenario.value == SCENARIOS[0]:
            gas = self._fluid(self.gas.value)
            suction = gas.state(P=self.si("suction-pressure"), T=self.si("suction-temperature"))
            return intercooled_compressor(
                suction, self.si("mass-flow"), P_out=self.si("discharge-pressure"),
                stages=int(self.stages.value),
                isentropic_efficiency=self.si("isentropic-efficiency"),
                cooler_outlet_temperature=self.si("cooler-outlet-temperature"),
                cooler_pressure_drop=self.si("cooler-pressure-drop"),
                knockout_pressure_drop=self.si("knockout-pressure-drop"),
                stage_ratios=self.ratio_method.value)
        steam = self._fluid("Water")
        inlet = steam.state(P=self.si("inlet-pressure"), T=self.si("inlet-temperature"))
        return extraction_turbine(
            inlet, self.si("steam-flow"), self.si("exhaust-pressure"),
            valve_outlet_pressure=self.si("valve-outlet-pressure"),
            extraction_pressure=self.si("extraction-pressure"),
            extraction_mass_flow=self.si("extraction-flow"),
            hp_isentropic_efficiency=self.si("hp-efficiency"),
            lp_isentropic_efficiency=self.si("lp-efficiency"))

    def recalculate(self) -> bool:
        """Recalculate; on failure show the message and keep the last result, marked stale."""
        try:
            result = self.compute()
        except Exception as exc:  # noqa: BLE001 - shown to the user, never raised
            self.message.value = html.escape(_plain(exc))
            self.stale = self.result is not None
            for field in self.results.values():
                field.set_stale(True)
            return False
        self.result = result
        self.stale = False
        self.message.value = ""
        for field in self.results.values():
            field.set_stale(False)
        self._show(result)
        return True

    # ------------------------------------------------------------------ display
    def _fmt(self, value, kind):
        shown = from_si(self.system, value, kind)
        return f"{format_number(shown, kind)} {unit_label(self.system, kind)}".strip()

    def _hs_points(self, stations):
        """Entropy and enthalpy of ``stations`` in display units (h-s chart x and y)."""
        return ([from_si(self.system, s.state.s, "specific_entropy") for s in stations],
                [from_si(self.system, s.state.h, "specific_enthalpy") for s in stations])

    def _show(self, result):
        train = result.train
        power = train.absorbed_power if train.absorbed_power else train.delivered_power
        self.results["total-power"].show(self._fmt(power, "power"))
        self.results["heat-removed"].show(self._fmt(train.heat_removed, "heat_flow"))
        out = train.outlet
        self.results["outlet-temperature"].show(self._fmt(out.T, "temperature"))
        self.results["outlet-quality"].show(
            "–" if not out.two_phase else format_number(out.x, "dimensionless"))
        # Compressor stages: discharge over suction; turbine sections: inlet over exhaust.
        ratios = [r.pressure_ratio if r.kind != "turbine" else 1.0 / r.pressure_ratio
                  for r in train.machines.values()]
        self.results["stage-ratios"].show(", ".join(f"{r:.4g}" for r in ratios))
        self.stations.value = self._station_table(train)
        names = list(train.machines)
        powers = [from_si(self.system, r.shaft_power, "power") for r in train.machines.values()]
        p_unit = unit_label(self.system, "power")
        h_unit = unit_label(self.system, "specific_enthalpy")
        s_unit = unit_label(self.system, "specific_entropy")
        main = [s for s in train.stations if s.role == "main"]
        side = [s for s in train.stations if s.role != "main"]
        with self.chart.batch_update():
            bars, line, branches = self.chart.data
            bars.x, bars.y = names, powers
            self.chart.layout.yaxis.title = f"shaft power [{p_unit}]"
            line.x, line.y = self._hs_points(main)
            line.text = [str(i) for i in range(len(main))]
            branches.x, branches.y = self._hs_points(side)
            self.chart.layout.xaxis2.title = f"specific entropy [{s_unit}]"
            self.chart.layout.yaxis2.title = f"specific enthalpy [{h_unit}]"
        sync_figure(self.chart)

    def _station_table(self, train) -> str:
        sys_ = self.system
        heads = [("#", ""), ("station", ""),
                 ("P", unit_label(sys_, "absolute_pressure")),
                 ("T", unit_label(sys_, "temperature")),
                 ("h", unit_label(sys_, "specific_enthalpy")),
                 ("s", unit_label(sys_, "specific_entropy")),
                 ("quality", "-"), ("mass flow", unit_label(sys_, "mass_flow"))]
        cells = "".join(f"<th style='padding:2px 8px'>{html.escape(h)}"
                        f"{' [' + html.escape(u) + ']' if u else ''}</th>" for h, u in heads)
        rows = [f"<tr>{cells}</tr>"]
        number = 0
        for st in train.stations:
            label = "" if st.role != "main" else str(number)
            if st.role == "main":
                number += 1
            s = st.state
            values = [label, st.name,
                      format_number(from_si(sys_, s.P, "absolute_pressure")),
                      format_number(from_si(sys_, s.T, "temperature")),
                      format_number(from_si(sys_, s.h, "specific_enthalpy")),
                      format_number(from_si(sys_, s.s, "specific_entropy")),
                      "–" if not s.two_phase else f"{s.x:.4f}",
                      format_number(from_si(sys_, st.mass_flow, "mass_flow"))]
            rows.append("<tr>" + "".join(f"<td style='padding:2px 8px'>{html.escape(v)}</td>"
                                         for v in values) + "</tr>")
        return "<table style='border-collapse:collapse;font-size:90%'>" + "".join(rows) + \
            "</table>"


def _plain(exc) -> str:
    """The text shown for an error: the project's message, or a plain note for others."""
    from ..errors import WorkbenchError

    if isinstance(exc, WorkbenchError):
        return str(exc)
    return f"the calculation failed ({type(exc).__name__}); check the inputs"


__all__ = ["COMPRESSOR_ENTRIES", "RESULTS", "SCENARIOS", "TURBINE_ENTRIES", "TrainPanel"]


