"""The machine panel: what-if studies of one compressor, turbine, pump or fan.

:class:`MachinePanel` is a :class:`~workbench.ui.common.Panel`.  It keeps a study's inputs
in SI units (the flat dict a case file stores, :mod:`workbench.machine_case`), runs
:func:`workbench.study.machine_study` on every change and shows the result fields of
:data:`workbench.fields.FIELDS` in the chosen display unit system; it draws the chart series
of :func:`workbench.study.process_series` on h-s and T-s diagrams.  No thermodynamics is
done here: the panel only binds widgets to those functions.

Entries are checked against their physical limits in the units they were typed in before
the study is run (absolute pressure and temperature above zero, flows above zero,
efficiencies above 0 and at most 100 %), so a message quotes the entry as the user typed it;
every other error comes from the calculation unchanged.  Entries show converted values to
five significant figures of the quantity, while the SI value held stays exactly what was
typed.

The numbers come first: the process charts (one plotly FigureWidget with both diagrams)
are built when their tab is first opened, and the sweep figure when the first sweep runs;
both are then updated in place.

Test hooks: every entry has the CSS class ``wb-input-<name>``, every result
``wb-result-<name>``, the message area ``wb-message`` (names in
:data:`~workbench.ui.machine_entries.ENTRIES`, ``CHOICES`` and ``RESULT_FIELDS`` with
dashes for underscores).

References
----------
ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters.
"""

from __future__ import annotations

import html

import ipywidgets as widgets

from .. import study
from ..errors import InputError
from ..machine_case import MAX_CASE_BYTES, case_json, list_demo_cases, make_case, open_case
from ..units import UNIT_SYSTEMS
from ..units import choice as one_of
from . import charts
from .common import (
    STALE_COLOUR,
    NumberEntry,
    Panel,
    ResultRows,
    choice,
    download_link,
    format_number,
    from_si,
    hook,
    input_class,
    result_class,
    to_si,
    unit_label,
    unit_switch,
)
from .machine_entries import (
    CHOICES,
    ENTRIES,
    ENTRY_FIGURES,
    ENTRY_FIGURES_OF,
    ENTRY_SELECTS,
    OPTIONAL,
    PERCENT_FIELDS,
    PHYSICAL_LIMITS,
    RESULT_FIELDS,
    composition_text,
    entries_in_use,
    limit_problem,
    number_of,
    parse_composition,
)
from .machine_sweep import SweepTab

#: Tabs below the entries; the process charts are built when their tab is first opened.
TAB_TITLES = ("process states", "process charts", "sweep", "case file")
_CHART_TAB = TAB_TITLES.index("process charts")
_SWEEP_TAB = TAB_TITLES.index("sweep")

#: Columns of the process states table: (heading, kind, attribute of a state).
STATE_COLUMNS = (("pressure", "pressure", "P"), ("temperature", "temperature", "T"),
                 ("specific enthalpy", "specific_enthalpy", "h"),
                 ("specific entropy", "specific_entropy", "s"), ("density", "density", "rho"))


def _h(text, level=4):
    return widgets.HTML(f"<h{level} style='margin:6px 0 2px 0'>{html.escape(text)}</h{level}>")


def _phase_text(st) -> str:
    return f"quality {st.quality:.4f}" if st.two_phase else (st.phase or "one phase")


def states_table(result, system, ambient: float, stale: bool) -> str:
    """HTML table of the inlet, outlet and isentropic outlet states in display units."""
    head = "".join(f"<th style='padding:2px 10px'>{html.escape(name)} "
                   f"[{html.escape(unit_label(system, kind))}]</th>"
                   for name, kind, _attr in STATE_COLUMNS)
    rows = []
    for title, st in (("inlet", result.inlet), ("outlet", result.outlet),
                      ("isentropic outlet (same outlet pressure)", result.isentropic_outlet)):
        cells = "".join(
            "<td style='padding:2px 10px;text-align:right'>"
            f"{format_number(float(from_si(system, getattr(st, attr), kind, ambient)))}</td>"
            for _name, kind, attr in STATE_COLUMNS)
        rows.append(f"<tr><td style='padding:2px 10px'>{html.escape(title)}</td>{cells}"
                    f"<td style='padding:2px 10px'>{html.escape(_phase_text(st))}</td></tr>")
    colour = STALE_COLOUR if stale else "#222222"
    return (f"<table style='border-collapse:collapse;color:{colour}'>"
            f"<tr><th style='padding:2px 10px'>state</th>{head}"
            f"<th style='padding:2px 10px'>phase</th></tr>{''.join(rows)}</table>")


class MachinePanel(Panel):
    """Widget panel of one machine energy balance; see the module docstring.

    Parameters
    ----------
    case : str, dict or pathlib.Path, optional
        A demo case name (``workbench.machine_case.list_demo_cases()``), a case dict, the
        JSON text of a case, or a :class:`pathlib.Path` of a case file (text is never
        opened as a path).  Default: ``"compressor-demo"``.

    Attributes
    ----------
    result : MachineResult or None
        The last good result.
    stale : bool
        True when the inputs shown have no result (the result shown is an older one).
    message : MessageArea
        The message area; ``message.text`` is the plain text shown.
    """

    css_class = "wb-machine-panel"

    def __init__(self, case="compressor-demo"):
        loaded = open_case(case)
        self._demos = list_demo_cases()
        #: The demo case shown in the case tab: the one opened, else the first.
        self._demo_shown = (case if isinstance(case, str) and case in self._demos
                            else self._demos[0])
        self._ensure_plumbing()
        self._inputs = loaded["inputs"]
        self.title = loaded["title"]
        self.description = loaded["description"]
        self._fluids: dict = {}
        self._values: dict = {}
        self._points = None
        self._points_of = None
        self.figure = None
        self._build()
        super().__init__(self._layout(), layout=widgets.Layout(width="100%", max_width="1400px"))
        self._recalculate()
        charts.preload_figure_widget()  # the charts are built later: import plotly now

    # ------------------------------------------------------------------ building
    @property
    def system(self):
        """Name of the display unit system."""
        return self._inputs["unit_system"]

    @property
    def ambient(self) -> float:
        """Ambient pressure [Pa] of gauge pressures."""
        return self._inputs["ambient_pressure_Pa"]

    def _build(self):
        inp, guard = self._inputs, self.guard
        self.title_html = widgets.HTML(self._title_text())
        self.units = unit_switch(inp["unit_system"])
        self.units.observe(guard(lambda change: self._set_unit_system(change["new"])),
                           names="value")
        self.stale_note = widgets.HTML("")
        self.stale_note.add_class("wb-stale-note")
        self.entries = {
            name: NumberEntry(name, label, kind, inp[key], on_change=guard(self._entry_changed),
                              system=self.system, ambient_pressure=self.ambient,
                              significant=ENTRY_FIGURES_OF.get(name, ENTRY_FIGURES))
            for name, (key, label, kind) in ENTRIES.items()}
        self.choices = {}
        for name, (key, label, options) in CHOICES.items():
            self.choices[name] = choice(name, label, options, inp[key])
            self.choices[name].observe(guard(self._choice_changed), names="value")
        wide = {"style": {"description_width": "170px"}, "layout": widgets.Layout(width="330px")}
        self.fluid_box = input_class(widgets.Combobox(
            value=inp["fluid_name"], options=study.pure_fluid_names(), ensure_option=False,
            placeholder="type to search", description="pure fluid", continuous_update=False,
            **wide), "fluid")
        self.fluid_box.observe(guard(self._fluid_changed), names="value")
        self.composition_box = input_class(widgets.Textarea(
            value=composition_text(inp["composition"]), continuous_update=False,
            description="mixture", placeholder="Methane 0.9\nEthane 0.1",
            style={"description_width": "170px"},
            layout=widgets.Layout(width="330px", height="96px")), "composition")
        self.composition_box.observe(guard(self._composition_changed), names="value")
        self.normalise_button = input_class(widgets.Button(
            description="normalise fractions", layout=widgets.Layout(width="160px")),
            "normalise")
        self.normalise_button.on_click(guard(lambda _b: self.normalise()))
        self.composition_sum = result_class(widgets.HTML(""), "composition-sum")
        self.results = self.add_result_widget(ResultRows(RESULT_FIELDS, PERCENT_FIELDS))
        self.states_html = result_class(widgets.HTML("", layout=widgets.Layout(width="auto")),
                                        "states")
        self.chart_box = widgets.Box([widgets.HTML(
            "<i style='color:#8a8a8a'>drawing the h-s and T-s diagrams ...</i>")],
            layout=widgets.Layout(flex_flow="row wrap"))
        self.chart_box.add_class("wb-process-charts")
        self.sweep = SweepTab(self)
        self._build_case_tools()
        self._show_composition_sum()

    def _build_case_tools(self):
        guard = self.guard
        self.demo_choice = input_class(widgets.Dropdown(
            options=self._demos, value=self._demo_shown, description="demo case",
            layout=widgets.Layout(width="330px")), "demo-case")
        self.demo_button = input_class(widgets.Button(description="open demo case"),
                                       "open-demo")
        self.demo_button.on_click(guard(lambda _b: self.load_case(self.demo_choice.value)))
        self.upload = input_class(widgets.FileUpload(accept=".json", multiple=False,
                                                     description="load case file"),
                                  "case-upload")
        self.upload.observe(guard(self._uploaded), names="value")
        self.save_button = input_class(widgets.Button(
            description="prepare case download", layout=widgets.Layout(width="200px")),
                                       "case-save")
        self.save_button.on_click(guard(lambda _b: self._refresh_case_link()))
        self.case_link = result_class(widgets.HTML(""), "case-download")

    def _layout(self):
        e, c = self.entries, self.choices
        col_w = widgets.Layout(width="340px")
        fluid_col = widgets.VBox([
            _h("Fluid"), c["fluid-kind"], self.fluid_box, self.composition_box,
            c["composition-basis"], widgets.HBox([self.normalise_button, self.composition_sum]),
            _h("Machine"), c["machine"], c["outlet-mode"], c["efficiency-basis"],
            e["isentropic-efficiency"], e["polytropic-efficiency"], e["measured-power"],
            e["mechanical-efficiency"], e["heat-loss"]], layout=col_w)
        state_col = widgets.VBox([
            _h("Inlet"), e["inlet-pressure"], c["inlet-given"], e["inlet-temperature"],
            e["inlet-quality"],
            _h("Outlet"), e["outlet-pressure"], c["outlet-given"], e["outlet-temperature"],
            e["outlet-quality"],
            _h("Flow"), c["flow-given"], e["mass-flow"], e["volume-flow"],
            c["velocity-given"], e["velocity-in"], e["velocity-out"], e["diameter-in"],
            e["diameter-out"], e["elevation-change"]], layout=col_w)
        result_col = widgets.VBox(
            [_h("Results"), self.stale_note, self.results],
            layout=widgets.Layout(width="360px", border="1px solid #ddd", padding="4px"))
        header = widgets.HBox([self.title_html, self.units, self.entries["ambient-pressure"]],
                              layout=widgets.Layout(justify_content="space-between",
                                                    align_items="center", width="100%"))
        case_box = widgets.VBox([
            widgets.HBox([self.demo_choice, self.demo_button]), widgets.HBox([self.upload]),
            widgets.HBox([self.save_button, self.case_link]),
            widgets.HTML("<small>Case files are plain JSON with SI values; they are checked "
                         "before anything changes.</small>")])
        tabs = widgets.Tab([self.states_html, self.chart_box, self.sweep, case_box])
        for i, t in enumerate(TAB_TITLES):
            tabs.set_title(i, t)
        tabs.add_class("wb-tabs")
        tabs.selected_index = 0
        tabs.observe(self.guard(self._tab_changed), names="selected_index")
        self.tabs = tabs
        inputs_row = widgets.HBox([fluid_col, state_col, result_col],
                                  layout=widgets.Layout(flex_flow="row wrap"))
        return [header, self.caution, self.message, inputs_row, tabs]

    def _title_text(self) -> str:
        return (f"<h3 style='margin:4px 0'>"
                f"{html.escape(self.title or 'Machine energy balance')}</h3>")

    # ------------------------------------------------------------------ public API
    def shown(self, name: str) -> str:
        """Text shown by result row ``name`` (hook or field name, e.g. ``"power"``)."""
        return self.results.shown(name)

    def entry_value(self, name: str) -> float:
        """Number shown in entry ``name`` in display units."""
        return self.entries[hook(name)].value

    def set_values(self, **values) -> bool:
        """Set entries (display units) and dropdowns by hook name, then recompute once.

        Names may use ``-`` or ``_``.  ``unit_system`` / ``unit-system``, ``fluid`` and
        ``composition`` (a dict or text) are accepted too.  Returns True when the study
        ran; on a bad value the message area says why and nothing is computed.
        """
        ok, got = self.attempt(self._new_inputs, values)
        if not ok:
            return False
        new, typed = got
        self._inputs = new
        self._refresh_widgets()
        with self.quiet():
            for name, number in typed.items():
                self.entries[name].set_display(number, notify=False)  # shown as typed
        return self._recalculate(first=tuple(typed))

    def _new_inputs(self, values):
        """The inputs after ``set_values(**values)`` and the numbers typed by entry."""
        new = dict(self._inputs)
        new["composition"] = dict(new["composition"])
        system = values.pop("unit_system", values.pop("unit-system", None))
        if system is not None:
            self._set_unit_system(one_of(system, tuple(UNIT_SYSTEMS), "unit system"))
            new["unit_system"] = system
        values = {hook(k): v for k, v in values.items()}
        typed = {}  # entry -> number as typed (display units), shown as typed
        if "ambient-pressure" in values:
            number = number_of(values.pop("ambient-pressure"), "ambient pressure")
            self._raise_beyond_limit("ambient-pressure", number)
            ambient = float(to_si(self.system, number, "absolute_pressure"))
            new["ambient_pressure_Pa"] = ambient
            typed["ambient-pressure"] = number
            if UNIT_SYSTEMS[self.system].gauge:
                # a gauge reading stays as shown; its absolute value follows the ambient
                for name, (key, _label, kind) in ENTRIES.items():
                    if kind == "pressure":
                        typed[name] = self.entries[name].display_value
                        new[key] = float(to_si(self.system, typed[name], kind, ambient))
        for name, value in values.items():
            if name in ENTRIES:
                key, _label, kind = ENTRIES[name]
                number = number_of(value, name)
                new[key] = float(to_si(self.system, number, kind, new["ambient_pressure_Pa"]))
                new.update(ENTRY_SELECTS.get(name, {}))
                typed[name] = number
            elif name in CHOICES:
                key, _label, options = CHOICES[name]
                new[key] = one_of(value, options, name)
            elif name == "fluid":
                new["fluid_name"], new["fluid_kind"] = str(value), "pure"
            elif name == "composition":
                new["composition"] = dict(value) if isinstance(value, dict) else \
                    parse_composition(str(value))
                new["fluid_kind"] = "mixture"
            else:
                raise InputError(f"no entry named {name[:40]!r}")
        return new, typed

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
        """The whole panel state as a case dict (SI values; see :mod:`workbench.machine_case`)."""
        return make_case(self._inputs, self.title, self.description)

    def case_json(self) -> str:
        """JSON text of :meth:`to_case`."""
        return case_json(self.to_case())

    def load_case(self, source) -> bool:
        """Load a case (dict, JSON text or bytes, :class:`pathlib.Path`, or demo case name).

        The case is validated and computed first; if anything is wrong the message area says
        so and nothing in the panel changes.  Returns True when loaded.
        """
        ok, loaded = self.attempt(self._trial_case, source, prefix="case not loaded: ",
                                  stale=False)
        if not ok:
            return False
        self._inputs = loaded["inputs"]
        self.title, self.description = loaded["title"], loaded["description"]
        self.title_html.value = self._title_text()
        self._refresh_widgets()
        ok = self._recalculate()
        if ok:
            self.message.show(f"case loaded: {self.title or 'untitled'}",
                              cautions=self.result.cautions)
        return ok

    def _trial_case(self, source) -> dict:
        """The case read from ``source``, after a trial study (nothing in the panel changes)."""
        loaded = open_case(source)
        trial = study.machine_study(loaded["inputs"], self._fluids)
        study.result_values(trial, RESULT_FIELDS)  # surface path errors before changing
        return loaded

    def normalise(self) -> bool:
        """Scale the mixture fractions so they sum to 1 and recompute."""
        ok, comp = self.attempt(
            lambda: study.normalise_composition(parse_composition(self.composition_box.value)))
        if not ok:
            return False
        self._inputs["composition"] = comp
        self._inputs["fluid_kind"] = "mixture"
        self._refresh_widgets()
        return self._recalculate()

    def run_sweep(self, variable: str | None = None, start: float | None = None,
                  stop: float | None = None, points: int | None = None, results=None):
        """Vary one input over a range and tabulate results; failed points are NaN (gaps).

        Parameters
        ----------
        variable : str, optional
            Hook name of the input to vary (one of ``workbench.study.SWEEP_INPUTS``).
        start, stop : float, optional
            Range in display units.
        points : int, optional
            Number of points, 2 to 200.
        results : sequence of str, optional
            Result hook or field names to tabulate and plot.

        Returns
        -------
        pandas.DataFrame or None
            The table (display units, units in the column names); None on bad settings.
        """
        return self.sweep.run(variable, start, stop, points, results)

    # ------------------------------------------------------------------ callbacks
    def _entry_changed(self, entry: NumberEntry):
        self._inputs[ENTRIES[entry.name][0]] = entry.si
        if entry.name == "ambient-pressure":
            self._ambient_changed()
            return
        if entry.name in ENTRY_SELECTS:
            self._inputs.update(ENTRY_SELECTS[entry.name])
            self._refresh_choices()
        self._recalculate(first=(entry.name,))

    def _ambient_changed(self):
        # A gauge reading stays as typed; its absolute value follows the new ambient pressure.
        self._raise_beyond_limit("ambient-pressure")
        kept = {}
        for name, (key, _label, kind) in ENTRIES.items():
            ent = self.entries[name]
            if kind == "pressure" and UNIT_SYSTEMS[self.system].gauge:
                kept[name] = ent.display_value
                self._inputs[key] = float(to_si(self.system, kept[name], kind, self.ambient))
            ent.set_system(self.system, self.ambient)
        self._refresh_widgets()
        with self.quiet():
            for name, number in kept.items():
                self.entries[name].set_display(number, notify=False)
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
        self._inputs["composition"] = parse_composition(change["new"])
        self._inputs["fluid_kind"] = "mixture"
        self._refresh_choices()
        self._show_composition_sum()
        self._recalculate()

    def _tab_changed(self, change):
        if change["new"] == _CHART_TAB:
            self.show_charts()
        elif change["new"] == _SWEEP_TAB:
            self.sweep.ensure_figure()

    def _set_unit_system(self, name):
        self._inputs["unit_system"] = one_of(name, tuple(UNIT_SYSTEMS), "unit system")
        with self.quiet():
            self.units.value = name
        for ent in self.entries.values():
            ent.set_system(name, self.ambient)
        self.sweep.set_system(name, self.ambient)
        self._show_results()
        self._draw_charts()

    def _uploaded(self, change):
        files = change["new"]
        if not files:
            return
        item = files[0] if isinstance(files, (tuple, list)) else next(iter(files.values()))
        get = item.get if isinstance(item, dict) else lambda key: getattr(item, key)
        content = get("content")
        with self.quiet():
            self.upload.value = ()  # so the same file can be loaded again
        if len(content) > MAX_CASE_BYTES:
            self.message.show_error(f"case not loaded: the file is {len(content)} bytes, "
                                    f"more than the {MAX_CASE_BYTES} bytes a case may have")
            return
        self.load_case(bytes(content))

    def _refresh_case_link(self):
        self.case_link.value = download_link(self.case_json(), "machine-case.json",
                                             "download the case (JSON)", "application/json")

    # ------------------------------------------------------------------ internals
    def _study(self, first=()):
        """The study of the current inputs and its shown values (entries checked first)."""
        problem = self._check_entries(first)
        if problem:
            raise InputError(problem)
        result = study.machine_study(self._inputs, self._fluids)
        return result, study.result_values(result, RESULT_FIELDS)  # every shown number now

    def _recalculate(self, first=()) -> bool:
        ok, got = self.attempt(self._study, first)
        if not ok:
            return False
        result, self._values = got
        self.show_result(result, self._ok_text(result), cautions=result.cautions)
        self._show_results(states=False)  # show_result drew the states table already
        self._draw_charts()
        return True

    def _check_entries(self, first=()) -> str | None:
        """Message of the first entry beyond its physical limit, or None.

        Entries named in ``first`` (just typed) are checked first, then the others in the
        order of :data:`ENTRIES`.  Only entries the current choices use are checked (the
        study does not read the others either).
        """
        used = entries_in_use(self._inputs) | (set(ENTRIES) - OPTIONAL)
        order = [n for n in first if n in PHYSICAL_LIMITS]
        order += [n for n in ENTRIES if n in PHYSICAL_LIMITS and n not in order]
        for name in order:
            problem = self._limit_problem(name) if name in used else None
            if problem:
                return problem
        return None

    def _limit_problem(self, name: str, value: float | None = None) -> str | None:
        entry = self.entries[name]
        if value is None:  # compare the exact value, quote the number the entry shows
            value, shown = entry.display_value, entry.value
        else:
            shown = value
        return limit_problem(name, value, shown, entry.system, entry.ambient_pressure)

    def _raise_beyond_limit(self, name, value=None):
        problem = self._limit_problem(name, value)
        if problem:
            raise InputError(problem)

    def _ok_text(self, result) -> str:
        text = f"calculated: {result.kind}, outlet fixed by {self._inputs['outlet_fixed_by']}"
        if result.outlet.two_phase:
            text += f"; the outlet is wet (quality {result.outlet.quality:.4f})"
        return text

    def set_stale(self, stale: bool) -> None:
        """Grey the results, the states table and note that they belong to earlier inputs."""
        super().set_stale(stale)
        self._show_usage()
        self._show_states()
        self.stale_note.value = ("<i style='color:#8a8a8a'>stale: these results belong to "
                                 "earlier inputs</i>" if self.stale else "")

    def _show_usage(self):
        used = entries_in_use(self._inputs)
        for name in OPTIONAL:
            self.entries[name].label.style.text_color = None if name in used else "#9a9a9a"

    def _show_results(self, states: bool = True):
        if states:
            self._show_usage()
        if self.result is None:
            self.results.clear()
        else:
            outlet = self.result.outlet
            notes = {} if outlet.two_phase else {
                "outlet_quality": f"– ({outlet.phase or 'one phase'})"}
            self.results.show(self._values, self.system, self.ambient, notes)
        if states:
            self._show_states()

    def _show_states(self):
        self.states_html.value = "" if self.result is None else states_table(
            self.result, self.system, self.ambient, self.stale)

    def _draw_charts(self) -> bool:
        """Draw the last good result into the process charts, if they are built."""
        if self.figure is None or self.result is None:
            return False
        return self.attempt(self._update_charts, stale=False,  # the numbers stay good
                            prefix="the process chart could not be drawn: ")[0]

    def _update_charts(self):
        if self._points_of is not self.result:
            self._points = study.process_series(self.result)
            self._points_of = self.result
        charts.update_process_figure(self.figure, self._points, self.system)
        charts.refresh_view(self.chart_box.children[0], self.figure)

    def _show_composition_sum(self):
        try:
            total = sum(parse_composition(self.composition_box.value).values())
        except InputError:
            self.composition_sum.value = ""
            return
        flag = "" if abs(total - 1) <= 1e-6 else " (must be 1: normalise)"
        self.composition_sum.value = f"sum {total:.6g}{html.escape(flag)}"

    def _refresh_choices(self):
        with self.quiet():
            for name, (key, _label, _options) in CHOICES.items():
                self.choices[name].value = self._inputs[key]

    def _refresh_widgets(self):
        inp = self._inputs
        with self.quiet():
            self.units.value = inp["unit_system"]
            for name, (key, _label, _kind) in ENTRIES.items():
                self.entries[name].set_system(inp["unit_system"], inp["ambient_pressure_Pa"])
                self.entries[name].set_si(inp[key])
            for name, (key, _label, _options) in CHOICES.items():
                self.choices[name].value = inp[key]
            self.fluid_box.value = inp["fluid_name"]
            self.composition_box.value = composition_text(inp["composition"])
            self.sweep.refresh()
        self._show_composition_sum()
