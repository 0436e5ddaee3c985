"""The machine panel: what-if studies of one compressor, turbine, pump or fan.

:class:`MachinePanel` is an ``ipywidgets.VBox``.  It keeps every input in SI units (the
same flat dict a case file stores, see :mod:`workbench.ui.cases`), calls the calculation
core (:func:`workbench.energy_balance`) on every change, shows the results in the chosen
display unit system and draws the process on h-s and T-s charts.  No thermodynamics is done
here: states come from :class:`workbench.Fluid`, balances from :mod:`workbench.machines`.

Entries are checked against their physical limits in the units they were typed in before
the core is called (absolute pressure and temperature above zero, flows above zero,
efficiencies above 0 and at most 100 %), so a message quotes the entry as the user typed it;
every other error comes from the core unchanged.  Entries show converted values to five
significant figures of the quantity, while the SI value held stays exactly what was typed.

The numbers come first: the process charts (one plotly FigureWidget with both diagrams)
are built when their tab is first opened, and the sweep figure when the first sweep runs;
both are then updated in place.

Test hooks: every entry has the CSS class ``wb-input-<name>``, every result
``wb-result-<name>``, the message area ``wb-message`` (names in :data:`ENTRIES`,
:data:`CHOICES` and :data:`RESULTS`).

Standard volume flow is referred to 15 degC and 1.01325 bar (common practice for natural
gas, ISO 13443 standard reference conditions), with the real-gas density of the fluid there.

References
----------
ISO 13443:1996, Natural gas - Standard reference conditions.
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
"""

from __future__ import annotations

import base64
import html
import math

import ipywidgets as widgets
import numpy as np

from .. import SAFETY_CAUTION
from ..errors import InputError, WorkbenchError
from ..machines import energy_balance
from ..machines.flows import STANDARD_CONDITIONS, mass_flow_from, standard_density
from ..properties import Fluid, available_fluids, normalise_fractions
from . import cases as case_files
from . import charts
from .common import (
    NumberEntry,
    ResultField,
    caution_banner,
    choice,
    format_number,
    format_typed,
    from_si,
    message_area,
    quoted_unit,
    round_for_entry,
    scale_zero,
    to_si,
    unit_label,
    unit_switch,
)

#: Significant figures of the quantity shown in an entry after a unit conversion; the
#: ambient pressure keeps one more, so the standard atmosphere shows as 1.01325 bar.
ENTRY_FIGURES = 5
_ENTRY_FIGURES = {"ambient-pressure": 6}

#: Standard reference conditions of standard volume flow: 15 degC, 1.01325 bar
#: (ISO 13443, common practice for natural gas).
STANDARD_TEMPERATURE, STANDARD_PRESSURE = STANDARD_CONDITIONS

#: Number entries: hook name -> (input key, label, kind).
ENTRIES = {
    "inlet-pressure": ("inlet_pressure_Pa", "inlet pressure", "pressure"),
    "inlet-temperature": ("inlet_temperature_K", "inlet temperature", "temperature"),
    "inlet-quality": ("inlet_quality", "inlet quality", "dimensionless"),
    "outlet-pressure": ("outlet_pressure_Pa", "outlet pressure", "pressure"),
    "outlet-temperature": ("outlet_temperature_K", "outlet temperature", "temperature"),
    "outlet-quality": ("outlet_quality", "outlet quality", "dimensionless"),
    "mass-flow": ("mass_flow_kg_per_s", "mass flow", "mass_flow"),
    "volume-flow": ("volume_flow_m3_per_s", "volume flow", "volume_flow"),
    "velocity-in": ("velocity_in_m_per_s", "inlet velocity", "velocity"),
    "velocity-out": ("velocity_out_m_per_s", "outlet velocity", "velocity"),
    "diameter-in": ("diameter_in_m", "inlet flow diameter", "length"),
    "diameter-out": ("diameter_out_m", "outlet flow diameter", "length"),
    "elevation-change": ("elevation_change_m", "elevation change", "elevation"),
    "heat-loss": ("heat_loss_W", "heat loss", "heat_flow"),
    "mechanical-efficiency": ("mechanical_efficiency", "mechanical efficiency", "percent"),
    "isentropic-efficiency": ("isentropic_efficiency", "isentropic efficiency", "percent"),
    "polytropic-efficiency": ("polytropic_efficiency", "polytropic efficiency", "percent"),
    "measured-power": ("power_W", "measured shaft power", "power"),
    "ambient-pressure": ("ambient_pressure_Pa", "ambient pressure", "absolute_pressure"),
}

#: Entries checked against a physical limit before the core is called: hook name -> limit.
#: ``"absolute"``: above the physical zero of the scale (absolute zero of temperature, zero
#: absolute pressure); ``"positive"``: above 0; ``"efficiency"``: above 0 and at most 100 %.
PHYSICAL_LIMITS = {
    "inlet-pressure": "absolute",
    "outlet-pressure": "absolute",
    "ambient-pressure": "absolute",
    "inlet-temperature": "absolute",
    "outlet-temperature": "absolute",
    "mass-flow": "positive",
    "volume-flow": "positive",
    "mechanical-efficiency": "efficiency",
    "isentropic-efficiency": "efficiency",
    "polytropic-efficiency": "efficiency",
}

#: Dropdowns: hook name -> (input key, label, options).
CHOICES = {
    "fluid-kind": ("fluid_kind", "fluid given as", ("pure", "mixture")),
    "composition-basis": ("composition_basis", "fractions by", ("mole", "mass")),
    "machine": ("machine", "machine", case_files.MACHINES),
    "outlet-mode": ("outlet_fixed_by", "outlet fixed by", case_files.OUTLET_MODES),
    "efficiency-basis": ("efficiency_basis", "efficiency basis", ("static", "total")),
    "inlet-given": ("inlet_given", "inlet state by", case_files.STATE_GIVEN),
    "outlet-given": ("outlet_given", "outlet state by", case_files.STATE_GIVEN),
    "flow-given": ("flow_given", "flow given as", case_files.FLOW_GIVEN),
    "velocity-given": ("velocity_given", "velocities from", case_files.VELOCITY_GIVEN),
}

#: Typing into one of these entries makes it the input that is used: (input key, value)
#: pairs set with it.
_ENTRY_SELECTS = {
    "isentropic-efficiency": ("outlet_fixed_by", "isentropic efficiency"),
    "polytropic-efficiency": ("outlet_fixed_by", "polytropic efficiency"),
    "measured-power": ("outlet_fixed_by", "measured power"),
    "outlet-temperature": (("outlet_given", "temperature"), ("outlet_fixed_by", "measured outlet")),
    "outlet-quality": (("outlet_given", "quality"), ("outlet_fixed_by", "measured outlet")),
    "inlet-temperature": ("inlet_given", "temperature"),
    "inlet-quality": ("inlet_given", "quality"),
    "mass-flow": ("flow_given", "mass flow"),
    "velocity-in": ("velocity_given", "velocities"),
    "velocity-out": ("velocity_given", "velocities"),
    "diameter-in": ("velocity_given", "flow diameters"),
    "diameter-out": ("velocity_given", "flow diameters"),
}


def _selected_by(name: str) -> dict:
    """Input choices that typing into entry ``name`` selects (so the typed number is used)."""
    pairs = _ENTRY_SELECTS.get(name, ())
    if pairs and isinstance(pairs[0], str):
        pairs = (pairs,)
    return dict(pairs)


#: Entries in use for each choice value: (input key, value) -> entry hook names.
_USED_WHEN = {
    ("inlet_given", "temperature"): ("inlet-temperature",),
    ("inlet_given", "quality"): ("inlet-quality",),
    ("outlet_fixed_by", "isentropic efficiency"): ("isentropic-efficiency", "outlet-pressure"),
    ("outlet_fixed_by", "polytropic efficiency"): ("polytropic-efficiency", "outlet-pressure"),
    ("outlet_fixed_by", "measured power"): ("measured-power", "outlet-pressure"),
    ("outlet_fixed_by", "measured outlet"): ("outlet-pressure",),
    ("flow_given", "mass flow"): ("mass-flow",),
    ("flow_given", "inlet volume flow"): ("volume-flow",),
    ("flow_given", "standard volume flow"): ("volume-flow",),
    ("velocity_given", "velocities"): ("velocity-in", "velocity-out"),
    ("velocity_given", "flow diameters"): ("diameter-in", "diameter-out"),
}
_OPTIONAL = {"inlet-temperature", "inlet-quality", "outlet-temperature", "outlet-quality",
             "isentropic-efficiency", "polytropic-efficiency", "measured-power", "mass-flow",
             "volume-flow", "velocity-in", "velocity-out", "diameter-in", "diameter-out",
             "outlet-pressure"}


def entries_in_use(inputs: dict) -> set:
    """Hook names of the optional entries that the current choices use."""
    used = set()
    for (key, value), names in _USED_WHEN.items():
        if inputs.get(key) == value:
            used.update(names)
    if inputs.get("outlet_fixed_by") == "measured outlet":
        used.add("outlet-temperature" if inputs.get("outlet_given") == "temperature"
                 else "outlet-quality")
    return used


def _quality(st):
    return math.nan if st.x is None else st.x


#: Results: hook name -> (label, kind, getter of a MachineResult in SI).
RESULTS = {
    "power": ("fluid power", "power", lambda r: r.power),
    "shaft-power": ("shaft power", "power", lambda r: r.shaft_power),
    "specific-work": ("specific work", "specific_enthalpy", lambda r: r.specific_work),
    "isentropic-efficiency": ("isentropic efficiency", "percent",
                              lambda r: r.isentropic_efficiency),
    "polytropic-efficiency": ("polytropic efficiency (path)", "percent",
                              lambda r: r.polytropic_efficiency),
    "polytropic-efficiency-schultz": ("polytropic efficiency (Schultz)", "percent",
                                      lambda r: r.polytropic_efficiency_schultz),
    "schultz-factor": ("Schultz factor", "dimensionless", lambda r: r.schultz_factor),
    "polytropic-head": ("polytropic head", "specific_enthalpy", lambda r: r.polytropic_head),
    "isentropic-head": ("isentropic head", "specific_enthalpy", lambda r: r.isentropic_head),
    # quoted as high over low pressure, so a turbine shows its expansion ratio (common practice)
    "pressure-ratio": ("pressure ratio (high / low)", "dimensionless",
                       lambda r: max(r.pressure_ratio, 1.0 / r.pressure_ratio)),
    "outlet-pressure": ("outlet pressure", "pressure", lambda r: r.outlet.P),
    "outlet-temperature": ("outlet temperature", "temperature", lambda r: r.outlet.T),
    "outlet-quality": ("outlet quality", "dimensionless", lambda r: _quality(r.outlet)),
    "kinetic-share": ("kinetic share of the work", "percent", lambda r: r.kinetic_share),
    "mass-flow": ("mass flow", "mass_flow", lambda r: r.mass_flow),
    "inlet-volume-flow": ("inlet volume flow", "volume_flow", lambda r: r.inlet_volume_flow),
    "outlet-volume-flow": ("outlet volume flow", "volume_flow", lambda r: r.outlet_volume_flow),
    "velocity-in": ("inlet velocity", "velocity", lambda r: r.velocity_in),
    "velocity-out": ("outlet velocity", "velocity", lambda r: r.velocity_out),
}

#: Results that need the polytropic path integration (slow for steam).
_POLYTROPIC_RESULTS = {"polytropic-efficiency", "polytropic-head"}


def make_fluid(inputs: dict, cache: dict | None = None) -> Fluid:
    """The Fluid of a panel input dict (pure name or composition), cached by its spec."""
    if inputs["fluid_kind"] == "pure":
        key = ("pure", inputs["fluid_name"])
    else:
        key = ("mixture", tuple(sorted(inputs["composition"].items())),
               inputs["composition_basis"])
    if cache is not None and key in cache:
        return cache[key]
    if key[0] == "pure":
        name = inputs["fluid_name"]
        if name not in available_fluids():
            raise InputError(f"fluid {name!r} is not in the list of pure fluids: pick one "
                             "from the list")
        fluid = Fluid(name)
    else:
        fluid = Fluid(dict(inputs["composition"]), basis=inputs["composition_basis"])
    if cache is not None:
        if len(cache) > 16:
            cache.clear()
        cache[key] = fluid
    return fluid


def _state(fluid, inputs, prefix):
    P = inputs[f"{prefix}_pressure_Pa"]
    try:
        if inputs[f"{prefix}_given"] == "quality":
            return fluid.state(P=P, x=inputs[f"{prefix}_quality"])
        return fluid.state(P=P, T=inputs[f"{prefix}_temperature_K"])
    except WorkbenchError as exc:
        raise type(exc)(f"{prefix} state: {exc}") from None


def compute(inputs: dict, cache: dict | None = None):
    """Run the energy balance for a panel input dict (SI values).

    Parameters
    ----------
    inputs : dict
        Keys of :data:`workbench.ui.cases.DEFAULT_INPUTS`, SI units.
    cache : dict, optional
        Fluid objects by spec, reused between calls.

    Returns
    -------
    MachineResult
    """
    fluid = make_fluid(inputs, cache)
    inlet = _state(fluid, inputs, "inlet")
    mode = inputs["outlet_fixed_by"]
    kwargs = {}
    outlet = None
    if mode == "measured outlet":
        outlet = _state(fluid, inputs, "outlet")
    else:
        kwargs["P_out"] = inputs["outlet_pressure_Pa"]
        if mode == "isentropic efficiency":
            kwargs["isentropic_efficiency"] = inputs["isentropic_efficiency"]
        elif mode == "polytropic efficiency":
            kwargs["polytropic_efficiency"] = inputs["polytropic_efficiency"]
        else:
            kwargs["power"] = inputs["power_W"]
    flow = {"mass flow": "mass_flow", "inlet volume flow": "volume_flow"}.get(
        inputs["flow_given"], "standard_volume_flow")
    mass_flow = mass_flow_from(
        flow, inputs["mass_flow_kg_per_s" if flow == "mass_flow" else "volume_flow_m3_per_s"],
        inlet.rho, standard_density(fluid) if flow == "standard_volume_flow" else None)
    if inputs["velocity_given"] == "velocities":
        kwargs["velocity_in"] = inputs["velocity_in_m_per_s"]
        kwargs["velocity_out"] = inputs["velocity_out_m_per_s"]
    else:
        kwargs["diameter_in"] = inputs["diameter_in_m"]
        kwargs["diameter_out"] = inputs["diameter_out_m"]
    return energy_balance(
        inputs["machine"], inlet, outlet, mass_flow=mass_flow,
        elevation_change=inputs["elevation_change_m"], heat_loss=inputs["heat_loss_W"],
        mechanical_efficiency=inputs["mechanical_efficiency"],
        basis=inputs["efficiency_basis"], **kwargs)


def describe_error(exc: BaseException) -> str:
    """Plain one-line text of an error for the message area (never a traceback)."""
    if isinstance(exc, WorkbenchError):
        return str(exc).strip() or exc.__class__.__name__
    text = str(exc).strip().splitlines()[0] if str(exc).strip() else exc.__class__.__name__
    if len(text) > 160:
        text = text[:157] + "..."
    return f"unexpected error: {text}"


def parse_composition(text: str) -> dict:
    """Parse ``name fraction`` pairs, one a line (``:``, ``=`` or ``,`` also separate).

    Numbers are read with ``float`` only; nothing is evaluated.
    """
    out = {}
    for raw in text.replace(";", "\n").splitlines():
        line = raw.strip()
        if not line:
            continue
        for sep in (":", "=", ","):
            line = line.replace(sep, " ")
        parts = line.split()
        if len(parts) != 2:
            raise InputError(f"composition line {raw.strip()!r} is not 'component fraction'")
        name, number = parts
        try:
            value = float(number)
        except ValueError:
            raise InputError(f"fraction {number!r} of {name} is not a number") from None
        if not math.isfinite(value) or value < 0:
            raise InputError(f"fraction {number!r} of {name} must be a number >= 0")
        if name in out:
            raise InputError(f"component {name} appears twice in the composition")
        out[name] = value
    if not out:
        raise InputError("composition is empty: give one 'component fraction' a line")
    return out


def composition_text(composition: dict) -> str:
    return "\n".join(f"{name} {value:.6g}" for name, value in composition.items())


#: Tabs below the entries; the process charts are built when their tab is first opened.
TAB_TITLES = ("process states", "process charts", "sweep", "case file")
_CHART_TAB = TAB_TITLES.index("process charts")
_SWEEP_TAB = TAB_TITLES.index("sweep")


def _h(text, level=4):
    return widgets.HTML(f"<h{level} style='margin:6px 0 2px 0'>{html.escape(text)}</h{level}>")


class MachinePanel(widgets.VBox):
    """Widget panel of one machine energy balance; see the module docstring.

    Parameters
    ----------
    case : str, dict or path, optional
        A demo case name (``workbench.ui.cases.list_demo_cases()``), a case dict, or a path
        to a case JSON file.  Default: ``"compressor-demo"``.

    Attributes
    ----------
    result : MachineResult or None
        The last good result.
    stale : bool
        True when the inputs shown have no result (the result shown is an older one).
    """

    def __init__(self, case="compressor-demo"):
        if case is None:
            case = "compressor-demo"
        if isinstance(case, str) and case in case_files.list_demo_cases():
            loaded = case_files.load_demo_case(case)
        else:
            loaded = case_files.read_case(case)
        self._inputs = loaded["inputs"]
        self.title = loaded["title"]
        self.description = loaded["description"]
        self._fluids: dict = {}
        self._quiet = False
        self.result = None
        self.stale = False
        self._points = None
        self._points_of = None
        self.figure = None
        self.sweep_figure = None
        self.sweep_table = None
        self.sweep_csv = ""
        self._build()
        super().__init__(self._layout(), layout=widgets.Layout(width="100%", max_width="1400px"))
        self.add_class("wb-machine-panel")
        self._recalculate()
        charts.preload_figure_widget()  # the charts are built later: import plotly now

    # ------------------------------------------------------------------ building
    @property
    def system(self):
        return self._inputs["unit_system"]

    @property
    def ambient(self) -> float:
        return self._inputs["ambient_pressure_Pa"]

    def _build(self):
        inp = self._inputs
        self.title_html = widgets.HTML(
            f"<h3 style='margin:4px 0'>{html.escape(self.title or 'Machine energy balance')}</h3>")
        self.units = unit_switch(inp["unit_system"])
        self.units.observe(self._guard(self._units_changed), names="value")
        self.message_html = message_area()
        self.stale_note = widgets.HTML("")
        self.stale_note.add_class("wb-stale-note")
        self.caution = caution_banner(SAFETY_CAUTION)

        self.entries = {}
        for name, (key, label, kind) in ENTRIES.items():
            self.entries[name] = NumberEntry(name, label, kind, inp[key],
                                             on_change=self._guard(self._entry_changed),
                                             system=self.system, ambient_pressure=self.ambient,
                                             significant=_ENTRY_FIGURES.get(name,
                                                                            ENTRY_FIGURES))
        self.choices = {}
        for name, (key, label, options) in CHOICES.items():
            w = choice(name, label, options, inp[key])
            w.observe(self._guard(self._choice_changed), names="value")
            self.choices[name] = w

        self.fluid_box = widgets.Combobox(
            value=inp["fluid_name"], options=available_fluids(), ensure_option=False,
            placeholder="type to search", description="pure fluid",
            continuous_update=False, style={"description_width": "170px"},
            layout=widgets.Layout(width="330px"))
        self.fluid_box.add_class("wb-input-fluid")
        self.fluid_box.observe(self._guard(self._fluid_changed), names="value")
        self.composition_box = widgets.Textarea(
            value=composition_text(inp["composition"]), continuous_update=False,
            description="mixture", placeholder="Methane 0.9\nEthane 0.1",
            style={"description_width": "170px"}, layout=widgets.Layout(width="330px",
                                                                        height="96px"))
        self.composition_box.add_class("wb-input-composition")
        self.composition_box.observe(self._guard(self._composition_changed), names="value")
        self.normalise_button = widgets.Button(description="normalise fractions",
                                               layout=widgets.Layout(width="160px"))
        self.normalise_button.add_class("wb-input-normalise")
        self.normalise_button.on_click(self._guard(lambda _b: self.normalise()))
        self.composition_sum = widgets.HTML("")
        self.composition_sum.add_class("wb-result-composition-sum")

        self.results = {name: ResultField(name, label, kind)
                        for name, (label, kind, _get) in RESULTS.items()}

        self.states_html = widgets.HTML("", layout=widgets.Layout(width="auto"))
        self.states_html.add_class("wb-result-states")
        self.chart_box = widgets.Box([widgets.HTML(
            "<i style='color:#8a8a8a'>drawing the h-s and T-s diagrams ...</i>")],
            layout=widgets.Layout(flex_flow="row wrap"))
        self.chart_box.add_class("wb-process-charts")
        self._build_sweep()
        self._build_case_tools()
        self._show_composition_sum()

    def _build_sweep(self):
        inp = self._inputs
        self.sweep_input = choice("sweep-input", "vary", case_files.SWEEP_INPUTS,
                                  inp["sweep_input"])
        kind = ENTRIES[inp["sweep_input"]][2]
        self.sweep_start = NumberEntry("sweep-start", "from", kind, inp["sweep_start"],
                                       on_change=self._guard(self._sweep_entry_changed),
                                       system=self.system, ambient_pressure=self.ambient,
                                       significant=ENTRY_FIGURES)
        self.sweep_stop = NumberEntry("sweep-stop", "to", kind, inp["sweep_stop"],
                                      on_change=self._guard(self._sweep_entry_changed),
                                      system=self.system, ambient_pressure=self.ambient,
                                      significant=ENTRY_FIGURES)
        self.sweep_points = widgets.BoundedIntText(
            value=inp["sweep_points"], min=2, max=200, description="points",
            continuous_update=False, style={"description_width": "170px"},
            layout=widgets.Layout(width="330px"))
        self.sweep_points.add_class("wb-input-sweep-points")
        self.sweep_points.observe(self._guard(self._sweep_points_changed), names="value")
        self.sweep_input.observe(self._guard(self._sweep_input_changed), names="value")
        self.sweep_results = widgets.SelectMultiple(
            options=[(RESULTS[n][0], n) for n in RESULTS], value=("power", "outlet-temperature"),
            description="show", rows=8, style={"description_width": "60px"},
            layout=widgets.Layout(width="320px"))
        self.sweep_results.add_class("wb-input-sweep-results")
        self.sweep_button = widgets.Button(description="run sweep",
                                           layout=widgets.Layout(width="160px"))
        self.sweep_button.add_class("wb-input-sweep-run")
        self.sweep_button.on_click(self._guard(lambda _b: self.run_sweep()))
        self.sweep_view = widgets.Box([widgets.HTML(
            "<i style='color:#8a8a8a'>the sweep chart is drawn here</i>")])
        self.sweep_view.add_class("wb-sweep-chart")
        self.sweep_note = widgets.HTML("")
        self.sweep_note.add_class("wb-result-sweep-note")
        self.sweep_link = widgets.HTML("")
        self.sweep_link.add_class("wb-result-sweep-csv")
        self.sweep_table_html = widgets.HTML("", layout=widgets.Layout(
            max_height="260px", overflow="auto"))
        self.sweep_table_html.add_class("wb-result-sweep-table")

    def _build_case_tools(self):
        self.demo_choice = widgets.Dropdown(options=case_files.list_demo_cases(),
                                            description="demo case",
                                            layout=widgets.Layout(width="330px"))
        self.demo_choice.add_class("wb-input-demo-case")
        self.demo_button = widgets.Button(description="open demo case")
        self.demo_button.add_class("wb-input-open-demo")
        self.demo_button.on_click(self._guard(lambda _b: self.load_case(self.demo_choice.value)))
        self.upload = widgets.FileUpload(accept=".json", multiple=False,
                                         description="load case file")
        self.upload.add_class("wb-input-case-upload")
        self.upload.observe(self._guard(self._uploaded), names="value")
        self.save_button = widgets.Button(description="prepare case download")
        self.save_button.add_class("wb-input-case-save")
        self.save_button.on_click(self._guard(lambda _b: self._refresh_case_link()))
        self.case_link = widgets.HTML("")
        self.case_link.add_class("wb-result-case-download")

    def _layout(self):
        e, c = self.entries, self.choices
        col_w = widgets.Layout(width="340px")
        fluid_col = widgets.VBox([
            _h("Fluid"), c["fluid-kind"], self.fluid_box, self.composition_box,
            c["composition-basis"], widgets.HBox([self.normalise_button, self.composition_sum]),
            _h("Machine"), c["machine"], c["outlet-mode"], c["efficiency-basis"],
            e["isentropic-efficiency"], e["polytropic-efficiency"], e["measured-power"],
            e["mechanical-efficiency"], e["heat-loss"],
        ], layout=col_w)
        state_col = widgets.VBox([
            _h("Inlet"), e["inlet-pressure"], c["inlet-given"], e["inlet-temperature"],
            e["inlet-quality"],
            _h("Outlet"), e["outlet-pressure"], c["outlet-given"], e["outlet-temperature"],
            e["outlet-quality"],
            _h("Flow"), c["flow-given"], e["mass-flow"], e["volume-flow"],
            c["velocity-given"], e["velocity-in"], e["velocity-out"], e["diameter-in"],
            e["diameter-out"], e["elevation-change"],
        ], layout=col_w)
        result_col = widgets.VBox(
            [_h("Results"), self.stale_note] + list(self.results.values()),
            layout=widgets.Layout(width="360px", border="1px solid #ddd", padding="4px"))
        header = widgets.HBox([self.title_html, self.units, self.entries["ambient-pressure"]],
                              layout=widgets.Layout(justify_content="space-between",
                                                    align_items="center", width="100%"))
        sweep_box = widgets.VBox([
            widgets.HBox([
                widgets.VBox([self.sweep_input, self.sweep_start, self.sweep_stop,
                              self.sweep_points, self.sweep_button, self.sweep_note,
                              self.sweep_link]),
                self.sweep_results]),
            self.sweep_view, self.sweep_table_html])
        case_box = widgets.VBox([
            widgets.HBox([self.demo_choice, self.demo_button]),
            widgets.HBox([self.upload]),
            widgets.HBox([self.save_button, self.case_link]),
            widgets.HTML("<small>Case files are plain JSON with SI values; they are checked "
                         "before anything changes.</small>")])
        tabs = widgets.Tab([self.states_html, self.chart_box, sweep_box, case_box])
        for i, t in enumerate(TAB_TITLES):
            tabs.set_title(i, t)
        tabs.add_class("wb-tabs")
        tabs.selected_index = 0
        tabs.observe(self._guard(self._tab_changed), names="selected_index")
        self.tabs = tabs
        inputs_row = widgets.HBox([fluid_col, state_col, result_col],
                                  layout=widgets.Layout(flex_flow="row wrap"))
        return [header, self.caution, self.message_html, inputs_row, tabs]

    # ------------------------------------------------------------------ public API
    @property
    def message(self) -> str:
        """Text shown in the message area (plain)."""
        return html.unescape(_strip_tags(self.message_html.value))

    def shown(self, name: str) -> str:
        """Text shown by result widget ``name`` (hook name, e.g. ``"power"``)."""
        return self.results[_hook(name)].shown

    def entry_value(self, name: str) -> float:
        """Number shown in entry ``name`` in display units."""
        return self.entries[_hook(name)].value

    def set_values(self, **values):
        """Set entries (display units) and dropdowns by hook name, then recompute once.

        Names may use ``-`` or ``_``.  ``unit_system`` / ``unit-system``, ``fluid`` and
        ``composition`` (a dict) are accepted too.
        """
        try:
            new = dict(self._inputs)
            new["composition"] = dict(new["composition"])
            system = values.pop("unit_system", values.pop("unit-system", None))
            if system is not None:
                if system not in case_files.UNIT_SYSTEMS:
                    raise InputError(f"unit system {system!r} is not one of "
                                     + ", ".join(case_files.UNIT_SYSTEMS))
                self._set_unit_system(system)
                new["unit_system"] = system
            values = {_hook(k): v for k, v in values.items()}
            typed = {}  # entry -> number as typed (display units), shown as typed
            if "ambient-pressure" in values:
                number = _as_float(values.pop("ambient-pressure"), "ambient pressure")
                problem = self._limit_problem("ambient-pressure", number)
                if problem:
                    raise InputError(problem)
                ambient = float(to_si(self.system, number, "absolute_pressure"))
                new["ambient_pressure_Pa"] = ambient
                typed["ambient-pressure"] = number
                if case_files.UNIT_SYSTEMS[self.system].gauge:
                    # a gauge reading stays as shown; its absolute value follows the ambient
                    for name, (key, _label, kind) in ENTRIES.items():
                        if kind == "pressure":
                            typed[name] = self.entries[name].display_value
                            new[key] = float(to_si(self.system, typed[name], kind, ambient))
            for raw, value in values.items():
                name = _hook(raw)
                if name in ENTRIES:
                    key, _label, kind = ENTRIES[name]
                    number = _as_float(value, name)
                    new[key] = float(to_si(self.system, number, kind, new["ambient_pressure_Pa"]))
                    new.update(_selected_by(name))
                    typed[name] = number
                elif name in CHOICES:
                    key, _label, options = CHOICES[name]
                    if value not in options:
                        raise InputError(f"{name} {value!r} is not one of {', '.join(options)}")
                    new[key] = value
                elif name == "fluid":
                    new["fluid_name"], new["fluid_kind"] = str(value), "pure"
                elif name == "composition":
                    new["composition"] = dict(value) if isinstance(value, dict) else \
                        parse_composition(str(value))
                    new["fluid_kind"] = "mixture"
                else:
                    raise InputError(f"no entry named {raw!r}")
        except Exception as exc:  # noqa: BLE001 - shown to the user, never raised
            self._fail(exc)
            return False
        self._inputs = new
        self._refresh_widgets()
        self._quiet = True
        try:
            for name, number in typed.items():
                self.entries[name].set_display(number, notify=False)  # shown as typed
        finally:
            self._quiet = False
        return self._recalculate(first=tuple(typed))

    def show_charts(self) -> bool:
        """Build the process charts if not built yet and draw the last good result.

        Called when the "process charts" tab is opened; True when a chart is shown.
        """
        if self.figure is None:
            self.figure = charts.make_process_figure()
            self.chart_box.children = (charts.figure_view(self.figure),)
        return self._draw_charts()

    @property
    def figures(self) -> list:
        """The process chart FigureWidgets built so far (one, with both diagrams)."""
        return [] if self.figure is None else [self.figure]

    def to_case(self) -> dict:
        """The whole panel state as a case dict (SI values; see :mod:`workbench.ui.cases`)."""
        return case_files.make_case(self._inputs, self.title, self.description)

    def case_json(self) -> str:
        """JSON text of :meth:`to_case`."""
        return case_files.case_json(self.to_case())

    def load_case(self, source) -> bool:
        """Load a case (dict, JSON text or bytes, path, or demo case name).

        The case is validated and computed first; if anything is wrong the message area says
        so and nothing in the panel changes.  Returns True when loaded.
        """
        try:
            if isinstance(source, str) and source in case_files.list_demo_cases():
                loaded = case_files.load_demo_case(source)
            else:
                loaded = case_files.read_case(source)
            trial = compute(loaded["inputs"], self._fluids)
            trial.polytropic_efficiency  # noqa: B018 - surface path errors before changing
        except Exception as exc:  # noqa: BLE001 - shown to the user
            self._set_message("case not loaded: " + describe_error(exc), error=True)
            return False
        self._inputs = loaded["inputs"]
        self.title, self.description = loaded["title"], loaded["description"]
        self.title_html.value = (f"<h3 style='margin:4px 0'>"
                                 f"{html.escape(self.title or 'Machine energy balance')}</h3>")
        self._refresh_widgets()
        ok = self._recalculate()
        if ok:
            self._set_message(f"case loaded: {self.title or 'untitled'}")
        return ok

    def normalise(self):
        """Scale the mixture fractions so they sum to 1 and recompute."""
        try:
            comp = parse_composition(self.composition_box.value)
            comp = normalise_fractions(comp)
        except Exception as exc:  # noqa: BLE001
            self._fail(exc)
            return False
        self._inputs["composition"] = comp
        self._inputs["fluid_kind"] = "mixture"
        self._refresh_widgets()
        return self._recalculate()

    # ------------------------------------------------------------------ sweep
    def run_sweep(self, variable: str | None = None, start: float | None = None,
                  stop: float | None = None, points: int | None = None, results=None):
        """Vary one input over a range and tabulate results; failed points are NaN (gaps).

        Parameters
        ----------
        variable : str, optional
            Hook name of the input to vary (one of ``cases.SWEEP_INPUTS``).
        start, stop : float, optional
            Range in display units.
        points : int, optional
            Number of points, 2 to 200.
        results : sequence of str, optional
            Result hook names to tabulate and plot.

        Returns
        -------
        pandas.DataFrame or None
            The table (display units, units in the column names); None on bad settings.
        """
        import pandas as pd

        try:
            if variable is not None:
                self.sweep_input.value = _hook(variable)
            if start is not None:
                self.sweep_start.set_display(_as_float(start, "sweep start"), notify=False)
            if stop is not None:
                self.sweep_stop.set_display(_as_float(stop, "sweep end"), notify=False)
            if points is not None:
                if isinstance(points, bool) or int(points) != points or not 2 <= points <= 200:
                    raise InputError(f"sweep points {points!r} must be a whole number 2 to 200")
                self.sweep_points.value = int(points)
            if results is not None:
                self.sweep_results.value = tuple(_hook(r) for r in results)
            variable = self.sweep_input.value
            self._inputs["sweep_start"] = self.sweep_start.si
            self._inputs["sweep_stop"] = self.sweep_stop.si
            n = int(self.sweep_points.value)
            chosen = list(self.sweep_results.value) or ["power"]
            key, label, kind = ENTRIES[variable]
            values_si = np.linspace(self.sweep_start.si, self.sweep_stop.si, n)
            rows = []
            failures = []
            for value in values_si:
                trial = dict(self._inputs)
                trial[key] = float(value)
                trial.update(_selected_by(variable))
                row = {}
                try:
                    res = compute(trial, self._fluids)
                    for name in chosen:
                        r_label, r_kind, get = RESULTS[name]
                        row[name] = from_si(self.system, get(res), r_kind, self.ambient)
                except Exception as exc:  # noqa: BLE001 - a failed point is a gap
                    failures.append(describe_error(exc))
                    row = {name: math.nan for name in chosen}
                rows.append(row)
        except Exception as exc:  # noqa: BLE001
            self._set_message("sweep not run: " + describe_error(exc), error=True)
            return None
        x_col = f"{label} [{unit_label(self.system, kind)}]"
        x_values = [round_for_entry(from_si(self.system, v, kind, self.ambient))
                    for v in values_si]
        table = pd.DataFrame({x_col: x_values})
        columns = {}
        for name in chosen:
            r_label, r_kind, _g = RESULTS[name]
            col = f"{r_label} [{unit_label(self.system, r_kind)}]"
            table[col] = [row[name] for row in rows]
            columns[col] = table[col].tolist()
        self.sweep_table = table
        self.sweep_csv = table.to_csv(index=False)
        encoded = base64.b64encode(self.sweep_csv.encode("utf-8")).decode("ascii")
        self.sweep_link.value = (f"<a download='sweep.csv' href='data:text/csv;base64,{encoded}'"
                                 " target='_blank'>download the table (CSV)</a>")
        self.sweep_table_html.value = table.to_html(index=False, float_format=lambda v:
                                                    format_number(v), na_rep="–", border=0)
        note = f"{n} points"
        if failures:
            note += f", {len(failures)} failed (gaps): {html.escape(failures[0])}"
        self.sweep_note.value = note
        # the numbers are shown; now the chart (built once, then changed in place)
        try:
            self._ensure_sweep_figure()
            charts.update_sweep_figure(self.sweep_figure, x_values, columns, x_col)
            charts.refresh_view(self.sweep_view.children[0], self.sweep_figure)
        except Exception as exc:  # noqa: BLE001 - the table is good; the chart is not
            self._set_message("the sweep chart could not be drawn: " + describe_error(exc))
        return table

    # ------------------------------------------------------------------ callbacks
    def _guard(self, fn):
        def wrapped(*args, **kwargs):
            if self._quiet:
                return None
            try:
                return fn(*args, **kwargs)
            except Exception as exc:  # noqa: BLE001 - no traceback ever reaches the page
                self._fail(exc)
                return None
        return wrapped

    def _entry_changed(self, entry: NumberEntry):
        key = ENTRIES[entry.name][0]
        self._inputs[key] = entry.si
        if entry.name == "ambient-pressure":
            self._ambient_changed()
            return
        if entry.name in _ENTRY_SELECTS:
            self._inputs.update(_selected_by(entry.name))
            self._refresh_choices()
        self._recalculate(first=(entry.name,))

    def _ambient_changed(self):
        # A gauge reading stays as typed; its absolute value follows the new ambient pressure.
        sysm = self.system
        problem = self._limit_problem("ambient-pressure")
        if problem:
            self._fail(InputError(problem))
            return
        kept = {}
        for name, (key, _label, kind) in ENTRIES.items():
            ent = self.entries[name]
            if kind == "pressure" and case_files.UNIT_SYSTEMS[sysm].gauge:
                kept[name] = ent.display_value
                self._inputs[key] = float(to_si(sysm, kept[name], kind, self.ambient))
            ent.set_system(sysm, self.ambient)
        self._refresh_widgets()
        self._quiet = True
        try:
            for name, number in kept.items():
                self.entries[name].set_display(number, notify=False)
        finally:
            self._quiet = False
        self._recalculate(first=("ambient-pressure",))

    def _choice_changed(self, change):
        for name, w in self.choices.items():
            if w is change["owner"]:
                self._inputs[CHOICES[name][0]] = change["new"]
        self._recalculate()

    def _fluid_changed(self, change):
        self._inputs["fluid_name"] = change["new"].strip()
        self._inputs["fluid_kind"] = "pure"
        self._refresh_choices()
        self._recalculate()

    def _composition_changed(self, change):
        comp = parse_composition(change["new"])
        self._inputs["composition"] = comp
        self._inputs["fluid_kind"] = "mixture"
        self._refresh_choices()
        self._show_composition_sum()
        self._recalculate()

    def _tab_changed(self, change):
        if change["new"] == _CHART_TAB:
            self.show_charts()
        elif change["new"] == _SWEEP_TAB:
            self._ensure_sweep_figure()

    def _ensure_sweep_figure(self):
        """Build the (empty) sweep figure if not built yet; later sweeps fill it in place."""
        if self.sweep_figure is None:
            self.sweep_figure = charts.make_sweep_figure()
            self.sweep_view.children = (charts.figure_view(self.sweep_figure),)

    def _units_changed(self, change):
        self._set_unit_system(change["new"])

    def _set_unit_system(self, name):
        if name not in case_files.UNIT_SYSTEMS:
            raise InputError(f"unit system {name!r} is not one of "
                             + ", ".join(case_files.UNIT_SYSTEMS))
        self._inputs["unit_system"] = name
        self._quiet = True
        try:
            self.units.value = name
        finally:
            self._quiet = False
        for ent in list(self.entries.values()) + [self.sweep_start, self.sweep_stop]:
            ent.set_system(name, self.ambient)
        self._show_results()
        self._draw_charts()

    def _sweep_entry_changed(self, entry):
        self._inputs["sweep_start" if entry is self.sweep_start else "sweep_stop"] = entry.si

    def _sweep_points_changed(self, change):
        self._inputs["sweep_points"] = int(change["new"])

    def _sweep_input_changed(self, change):
        name = change["new"]
        self._inputs["sweep_input"] = name
        key, _label, kind = ENTRIES[name]
        current = self._inputs[key]
        for ent, factor in ((self.sweep_start, 0.8), (self.sweep_stop, 1.2)):
            ent.kind = kind
            value = current * factor
            if kind == "percent":
                value = min(value, 1.0)
            ent.set_system(self.system, self.ambient)
            ent.set_si(value)
        self._inputs["sweep_start"] = self.sweep_start.si
        self._inputs["sweep_stop"] = self.sweep_stop.si

    def _uploaded(self, change):
        files = change["new"]
        if not files:
            return
        item = files[0] if isinstance(files, (tuple, list)) else next(iter(files.values()))
        content = item["content"] if isinstance(item, dict) else item.content
        self.load_case(bytes(content))
        self.upload.value = ()  # so the same file can be loaded again

    def _refresh_case_link(self):
        text = self.case_json()
        encoded = base64.b64encode(text.encode("utf-8")).decode("ascii")
        self.case_link.value = (f"<a download='machine-case.json' "
                                f"href='data:application/json;base64,{encoded}' "
                                "target='_blank'>download the case (JSON)</a>")

    # ------------------------------------------------------------------ internals
    def _recalculate(self, first=()) -> bool:
        try:
            problem = self._check_entries(first)
            if problem:
                raise InputError(problem)
            result = compute(self._inputs, self._fluids)
            for _name, (_label, _kind, get) in RESULTS.items():
                get(result)  # evaluate every shown number now, so a failure marks stale
        except Exception as exc:  # noqa: BLE001 - shown, never raised
            self._fail(exc)
            return False
        self.result = result
        self.stale = False
        self._show_results()
        self._set_message(self._ok_text(result))
        self._draw_charts()
        return True

    # ------------------------------------------------------------------ entry limits
    def _check_entries(self, first=()) -> str | None:
        """Message of the first entry in use beyond its physical limit, or None.

        Entries named in ``first`` (just typed) are checked first, then the others in the
        order of :data:`ENTRIES`.  Only entries the current choices use are checked.
        """
        used = entries_in_use(self._inputs) | (set(ENTRIES) - _OPTIONAL)
        order = [n for n in first if n in PHYSICAL_LIMITS]
        order += [n for n in ENTRIES if n in PHYSICAL_LIMITS and n not in order]
        for name in order:
            if name in used:
                problem = self._limit_problem(name)
                if problem:
                    return problem
        return None

    def _limit_problem(self, name: str, value: float | None = None) -> str | None:
        """Message when entry ``name`` (or ``value`` typed into it, display units) is beyond
        its physical limit, quoting the entry's label, the number and the unit typed."""
        limit = PHYSICAL_LIMITS.get(name)
        if limit is None:
            return None
        entry = self.entries[name]
        _key, label, kind = ENTRIES[name]
        system, ambient = entry.system, entry.ambient_pressure
        if value is None:  # compare the exact value, quote the number the entry shows
            value, shown = entry.display_value, entry.value
        else:
            shown = value
        unit = quoted_unit(system, kind)
        quoted = f"{label[:1].upper()}{label[1:]} {format_typed(shown)} {unit}"
        if limit == "efficiency":
            if 0.0 < value <= 100.0:
                return None
            return f"{quoted} is out of range: an efficiency is above 0 % and at most 100 %"
        zero = scale_zero(system, kind, ambient) if limit == "absolute" else 0.0
        if value > zero:
            return None
        if kind == "temperature":
            return (f"{quoted} is below absolute zero: a temperature must be above "
                    f"{format_number(zero)} {unit}")
        if kind == "pressure" and zero != 0.0:  # gauge scale
            abs_unit = quoted_unit(system, "absolute_pressure")
            return (f"{quoted} is below vacuum: it is {format_number(value - zero)} {abs_unit} "
                    f"absolute (ambient pressure {format_number(-zero)} {abs_unit}); a gauge "
                    f"pressure must be above {format_number(zero)} {unit}")
        if kind in ("pressure", "absolute_pressure"):
            return (f"{quoted} is not positive: an absolute pressure must be above "
                    f"0 {unit}")
        return f"{quoted} is not positive: a flow must be above 0 {unit}"

    def _ok_text(self, result) -> str:
        mode = self._inputs["outlet_fixed_by"]
        text = f"calculated: {result.kind}, outlet fixed by {mode}"
        if result.outlet.x is not None:
            text += f"; the outlet is wet (quality {result.outlet.x:.4f})"
        for caution in result.cautions:
            text += f"; caution: {caution}"
        return text

    def _fail(self, exc):
        self._show_usage()
        self.stale = self.result is not None
        self._set_message(describe_error(exc), error=True)
        self._mark_stale()

    def _set_message(self, text: str, error: bool = False):
        colour = "#9a3b00" if error else "#333333"
        self.message_html.value = (f"<div style='color:{colour};padding:2px 0'>"
                                   f"{html.escape(text)}</div>")

    def _mark_stale(self):
        for field in self.results.values():
            field.set_stale(self.stale)
        self._show_states()
        self.stale_note.value = ("<i style='color:#8a8a8a'>stale: these results belong to "
                                 "earlier inputs</i>" if self.stale else "")

    def _show_usage(self):
        used = entries_in_use(self._inputs)
        for name in _OPTIONAL:
            self.entries[name].label.style.text_color = None if name in used else "#9a9a9a"

    def _show_results(self):
        self._show_usage()
        r = self.result
        for name, (_label, kind, get) in RESULTS.items():
            field = self.results[name]
            if r is None:
                field.show("–")
                continue
            value = from_si(self.system, get(r), kind, self.ambient)
            unit = unit_label(self.system, kind)
            text = format_number(value, kind)
            if name == "outlet-quality" and r.outlet.x is None:
                field.show(f"– ({r.outlet.phase or 'one phase'})")
            else:
                field.show(text if unit == "-" else f"{text} {unit}")
        self._mark_stale()

    def _show_states(self):
        """Table of the inlet, outlet and isentropic outlet states in display units."""
        r = self.result
        if r is None:
            self.states_html.value = ""
            return
        columns = (("pressure", "pressure", lambda st: st.P),
                   ("temperature", "temperature", lambda st: st.T),
                   ("specific enthalpy", "specific_enthalpy", lambda st: st.h),
                   ("specific entropy", "specific_entropy", lambda st: st.s),
                   ("density", "density", lambda st: st.rho))
        head = "".join(f"<th style='padding:2px 10px'>{html.escape(name)} "
                       f"[{html.escape(unit_label(self.system, kind))}]</th>"
                       for name, kind, _get in columns)
        rows = []
        for title, st in (("inlet", r.inlet), ("outlet", r.outlet),
                          ("isentropic outlet (same outlet pressure)", r.isentropic_outlet)):
            cells = "".join(
                f"<td style='padding:2px 10px;text-align:right'>"
                f"{format_number(float(from_si(self.system, get(st), kind, self.ambient)))}"
                "</td>" for _name, kind, get in columns)
            phase = (f"quality {st.x:.4f}" if st.x is not None else st.phase or "one phase")
            rows.append(f"<tr><td style='padding:2px 10px'>{html.escape(title)}</td>{cells}"
                        f"<td style='padding:2px 10px'>{html.escape(phase)}</td></tr>")
        colour = "#8a8a8a" if self.stale else "#222222"
        self.states_html.value = (
            f"<table style='border-collapse:collapse;color:{colour}'>"
            f"<tr><th style='padding:2px 10px'>state</th>{head}"
            f"<th style='padding:2px 10px'>phase</th></tr>{''.join(rows)}</table>")

    def _draw_charts(self) -> bool:
        """Draw the last good result into the process charts, if they are built."""
        if self.figure is None or self.result is None:
            return False
        try:
            if self._points_of is not self.result:
                self._points = None
                self._points = charts.process_points(self.result)
                self._points_of = self.result
            charts.update_process_figure(self.figure, self._points, self.system)
            charts.refresh_view(self.chart_box.children[0], self.figure)
        except Exception as exc:  # noqa: BLE001 - the numbers stay good; the chart is not
            self._set_message("the process chart could not be drawn: " + describe_error(exc))
            return False
        return True

    def _show_composition_sum(self):
        try:
            total = sum(parse_composition(self.composition_box.value).values())
        except WorkbenchError:
            self.composition_sum.value = ""
            return
        flag = "" if abs(total - 1) <= 1e-6 else " (must be 1: normalise)"
        self.composition_sum.value = f"sum {total:.6g}{html.escape(flag)}"

    def _refresh_choices(self):
        self._quiet = True
        try:
            for name, (key, _label, _options) in CHOICES.items():
                self.choices[name].value = self._inputs[key]
        finally:
            self._quiet = False

    def _refresh_widgets(self):
        self._quiet = True
        try:
            inp = self._inputs
            self.units.value = inp["unit_system"]
            for name, (key, _label, _kind) in ENTRIES.items():
                self.entries[name].set_system(inp["unit_system"], inp["ambient_pressure_Pa"])
                self.entries[name].set_si(inp[key])
            for name, (key, _label, _options) in CHOICES.items():
                self.choices[name].value = inp[key]
            self.fluid_box.value = inp["fluid_name"]
            self.composition_box.value = composition_text(inp["composition"])
            self.sweep_input.value = inp["sweep_input"]
            kind = ENTRIES[inp["sweep_input"]][2]
            for ent, key in ((self.sweep_start, "sweep_start"), (self.sweep_stop, "sweep_stop")):
                ent.kind = kind
                ent.set_system(inp["unit_system"], inp["ambient_pressure_Pa"])
                ent.set_si(inp[key])
            self.sweep_points.value = inp["sweep_points"]
        finally:
            self._quiet = False
        self._show_composition_sum()


def _hook(name: str) -> str:
    return str(name).strip().replace("_", "-")


def _as_float(value, name):
    if isinstance(value, bool):
        raise InputError(f"{name} must be a number, not {value!r}")
    try:
        number = float(value)
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a number, not {value!r}") from None
    if not math.isfinite(number):
        raise InputError(f"{name} must be a finite number, not {value!r}")
    return number


def _strip_tags(text: str) -> str:
    import re

    return re.sub(r"<[^>]*>", "", text)
