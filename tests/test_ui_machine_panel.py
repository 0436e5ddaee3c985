"""Tests of the machine panel (workbench.ui.machine_panel), driven from Python, no browser.

Shown numbers are compared with the calculation core called directly with the same inputs,
and with outside facts: IAPWS-IF97 through the ``iapws`` package, the ideal-gas isentrope,
and unit conversion factors of NIST SP 811.
"""

import json
import math

import ipywidgets as widgets
import plotly.graph_objects as go
import pytest
from iapws import IAPWS97

import workbench as wb
from workbench.ui import MachinePanel
from workbench.ui import machine_panel as mp

#: NIST SP 811 factors: 1 psi = 6894.757 Pa; 1 lb = 0.45359237 kg (exact).
PSI = 6894.757
POUND = 0.45359237


def number(text):
    """The number at the start of a shown result text."""
    return float(text.split()[0])


def all_widgets(widget):
    """The widget and every widget below it (children of boxes and tabs)."""
    yield widget
    for child in getattr(widget, "children", ()):
        yield from all_widgets(child)


def figure_widgets(panel):
    return [w for w in all_widgets(panel) if isinstance(w, go.FigureWidget)]


def css_classes(widget):
    found = set(getattr(widget, "_dom_classes", ()))
    for child in getattr(widget, "children", ()):
        found |= css_classes(child)
    return found


@pytest.fixture(scope="module")
def compressor_panel():
    return MachinePanel()


@pytest.fixture
def panel():
    return MachinePanel(case="compressor-demo")


def demo_gas():
    return wb.Fluid({"Methane": 0.88, "Ethane": 0.06, "Propane": 0.03, "Nitrogen": 0.03})


def test_panel_is_a_vbox_and_has_all_hooks(compressor_panel):
    p = compressor_panel
    assert isinstance(p, widgets.VBox)
    classes = css_classes(p)
    for name in ("inlet-pressure", "inlet-temperature", "outlet-pressure", "outlet-temperature",
                 "mass-flow", "isentropic-efficiency", "polytropic-efficiency"):
        assert f"wb-input-{name}" in classes
    for name in ("power", "outlet-temperature", "isentropic-efficiency", "polytropic-efficiency"):
        assert f"wb-result-{name}" in classes
    assert "wb-message" in classes
    assert wb.SAFETY_CAUTION.split(".")[0] in p.caution.value


def test_compressor_demo_shows_core_results(compressor_panel):
    p = compressor_panel
    gas = demo_gas()
    inlet = gas.state(P=20e5, T=303.15)
    outlet = gas.state(P=55e5, T=390.15)
    r = wb.compressor(inlet, outlet, mass_flow=12.0, mechanical_efficiency=0.98)
    assert not p.stale and p.result is not None
    # display rounding: about five significant digits
    assert number(p.shown("power")) == pytest.approx(r.power / 1e3, rel=1e-4)
    assert number(p.shown("shaft-power")) == pytest.approx(r.shaft_power / 1e3, rel=1e-4)
    assert number(p.shown("isentropic-efficiency")) == pytest.approx(
        100 * r.isentropic_efficiency, abs=0.006)
    assert number(p.shown("polytropic-efficiency")) == pytest.approx(
        100 * r.polytropic_efficiency, abs=0.006)
    assert number(p.shown("outlet-temperature")) == pytest.approx(117.0, abs=0.01)
    # 1 m3/s = 3600 m3/h (exact)
    assert number(p.shown("outlet-volume-flow")) == pytest.approx(
        r.outlet_volume_flow * 3600, rel=1e-4)


def test_ideal_gas_isentrope_for_air_at_low_pressure():
    p = MachinePanel()
    p.set_values(fluid="Air", **{"inlet-pressure": 1.0, "inlet-temperature": 20.0,
                                 "outlet-pressure": 3.0, "isentropic-efficiency": 100.0,
                                 "mechanical-efficiency": 100.0})
    assert p.result is not None and not p.stale, p.message.text
    # ideal gas, k = 1.4 for air (from memory): T2 = T1 (P2/P1)^((k-1)/k)
    t2 = 293.15 * 3.0 ** (0.4 / 1.4) - 273.15
    assert number(p.shown("outlet-temperature")) == pytest.approx(t2, abs=1.5)


def test_turbine_demo_wet_exhaust_against_iapws():
    p = MachinePanel(case="turbine-demo")
    assert not p.stale, p.message.text
    # IAPWS-IF97 via the iapws package: h2 = h1 - shaft power / (eta_m m)
    h1 = IAPWS97(P=4.0, T=673.15).h  # kJ/kg
    h2 = h1 - 8000.0 / (0.98 * 10.0)
    x2 = IAPWS97(P=0.01, h=h2).x
    assert number(p.shown("outlet-quality")) == pytest.approx(x2, abs=2e-4)
    assert number(p.shown("shaft-power")) == pytest.approx(8000.0, rel=1e-4)
    assert "wet" in p.message.text
    # the case tab names the demo opened, not the first one in the list
    assert p.demo_choice.value == "turbine-demo"
    assert MachinePanel(case=p.to_case()).demo_choice.value == p.demo_choice.options[0]


def test_bad_entry_keeps_result_and_marks_stale(panel):
    before = panel.result
    shown_before = panel.shown("power")
    assert panel.set_values(**{"inlet-pressure": -5.0}) is False
    assert panel.stale is True
    assert panel.result is before
    assert panel.shown("power") == shown_before
    # the entry's label, the number and the unit typed (bar, absolute, in "bar, degC")
    assert panel.message.text == ("Inlet pressure -5 bar is not positive: an absolute pressure "
                             "must be above 0 bar")
    assert "Traceback" not in panel.message.text
    assert "stale" in panel.stale_note.value
    # a good value clears the stale mark
    panel.set_values(**{"inlet-pressure": 20.0})
    assert panel.stale is False


def test_typed_entry_through_the_widget_recomputes(panel):
    entry = panel.entries["outlet-pressure"]
    entry.field.value = 60.0  # as if typed in the browser, in bar
    gas = demo_gas()
    r = wb.compressor(gas.state(P=20e5, T=303.15), gas.state(P=60e5, T=390.15),
                      mass_flow=12.0, mechanical_efficiency=0.98)
    assert number(panel.shown("power")) == pytest.approx(r.power / 1e3, rel=1e-4)


def test_unexpected_error_shows_short_text(panel, monkeypatch):
    def broken(*args, **kwargs):
        raise ZeroDivisionError("float division by zero")

    monkeypatch.setattr(mp.study, "machine_study", broken)
    before = panel.result
    panel.set_values(**{"mass-flow": 11.0})
    # a defect, not a bad input: its class is named, its raw text is not shown
    assert panel.message.text.startswith("unexpected error (ZeroDivisionError)")
    assert "float division" not in panel.message.text
    assert panel.stale and panel.result is before


def test_unit_switch_converts_entries_and_results(panel):
    power_w = panel.result.power
    panel.set_values(unit_system="US customary")
    # NIST SP 811: 1 bar = 14.50377 psi; 1 hp (550 ft lbf/s) = 745.6999 W; shown to five
    # significant figures: 290.0754 psi -> 290.08
    assert panel.entry_value("inlet-pressure") == pytest.approx(20 * 14.50377, abs=0.005)
    assert panel.entry_value("inlet-pressure") == 290.08
    assert panel.entries["inlet-pressure"].unit.value == "psi"
    assert number(panel.shown("power")) == pytest.approx(power_w / 745.6999, rel=1e-4)
    # degF = degC * 9/5 + 32 (definition)
    assert panel.entry_value("inlet-temperature") == pytest.approx(30 * 1.8 + 32, abs=1e-6)
    # switching units does not change the result
    assert panel.result.power == pytest.approx(power_w, rel=1e-12)


def test_gauge_pressure_uses_the_stated_ambient_pressure(panel):
    panel.set_values(unit_system="bar(g), degC")
    # 20 bar - 1.01325 bar = 18.98675 bar(g), shown to five figures of the absolute pressure
    assert panel.entry_value("inlet-pressure") == pytest.approx(20 - 1.01325, abs=5e-4)
    assert panel.entries["inlet-pressure"].display_value == pytest.approx(20 - 1.01325,
                                                                          abs=1e-9)
    assert panel.entries["inlet-pressure"].unit.value == "bar(g)"
    panel.set_values(**{"ambient-pressure": 0.9})  # bar absolute: a gauge reading stays
    assert panel.entry_value("inlet-pressure") == pytest.approx(20 - 1.01325, abs=5e-4)
    assert panel.result.inlet.P == pytest.approx((20 - 1.01325 + 0.9) * 1e5, rel=1e-9)


def test_chart_traces_are_updated_in_place(panel):
    panel.tabs.selected_index = mp.TAB_TITLES.index("process charts")  # as if clicked
    fig = panel.figure
    n = len(mp.charts.TRACE_NAMES)
    assert len(fig.data) == 2 * n  # h-s traces, then T-s traces, in one FigureWidget
    old_x = list(fig.data[5].x)
    panel.set_values(**{"outlet-temperature": 125.0})
    assert panel.figure is fig and figure_widgets(panel) == [fig]
    new_x = list(fig.data[5].x)
    assert new_x != old_x
    # outlet point at the result's outlet entropy, in kJ/(kg K)
    assert new_x[1] == pytest.approx(panel.result.outlet.s / 1e3, rel=1e-9)
    assert list(fig.data[n + 5].y)[1] == pytest.approx(125.0, abs=1e-6)
    # h-s: outlet point at the result's outlet enthalpy, in kJ/kg
    assert list(fig.data[5].y)[1] == pytest.approx(panel.result.outlet.h / 1e3, rel=1e-9)


def test_polytropic_path_ends_near_the_outlet():
    p = MachinePanel(case="compressor-demo")
    from workbench.study import process_series

    s, h, _T = process_series(p.result, path_steps=12)["path"]
    # a constant-efficiency path at the rated efficiency ends at the measured outlet
    assert h[-1] == pytest.approx(p.result.outlet.h, rel=2e-3)


def test_sweep_rows_csv_and_gaps(panel):
    table = panel.run_sweep("outlet-pressure", 30.0, 70.0, 5, ["power"])
    assert len(table) == 5
    lines = panel.sweep.csv.strip().splitlines()
    assert len(lines) == 6 and lines[0].startswith("outlet pressure [bar]")
    gas = demo_gas()
    r = wb.compressor(gas.state(P=20e5, T=303.15), gas.state(P=50e5, T=390.15),
                      mass_flow=12.0, mechanical_efficiency=0.98)
    assert table.iloc[2, 1] == pytest.approx(r.power / 1e3, rel=1e-9)
    assert "data:text/csv;base64," in panel.sweep.link.value
    # outlet pressures below the 20 bar inlet fail: gaps, not a crash
    table = panel.run_sweep("outlet-pressure", 10.0, 30.0, 5, ["power"])
    assert len(table) == 5
    assert math.isnan(table.iloc[0, 1]) and not math.isnan(table.iloc[-1, 1])
    assert "failed" in panel.sweep.note.value
    trace = panel.sweep.figure.data[0]
    assert len(panel.sweep.figure.data) == 1 and len(trace.y) == 5
    assert trace.y[0] is None or math.isnan(trace.y[0])


def test_mixture_fractions_must_sum_to_one_then_normalise(panel):
    before = panel.result
    panel.set_values(composition={"Methane": 0.86, "Ethane": 0.06, "Propane": 0.03,
                                  "Nitrogen": 0.03})
    assert panel.stale and panel.result is before
    assert "sum" in panel.message.text
    assert panel.normalise() is True
    assert not panel.stale
    assert sum(panel.to_case()["inputs"]["composition"].values()) == pytest.approx(1.0)


def test_composition_text_is_parsed_not_evaluated():
    with pytest.raises(wb.InputError):
        mp.parse_composition("Methane __import__('os')")
    assert mp.parse_composition("Methane: 0.9\nEthane = 0.1") == {"Methane": 0.9, "Ethane": 0.1}


def test_standard_volume_flow_at_15_degC_and_1_01325_bar(panel):
    panel.set_values(**{"flow-given": "standard volume flow", "volume-flow": 50000.0})  # m3/h
    gas = demo_gas()
    rho = gas.state(P=101325.0, T=288.15).rho
    # mass flow = standard volume flow x density at standard conditions (ISO 13443)
    assert panel.result.mass_flow == pytest.approx(50000.0 / 3600 * rho, rel=1e-9)


def test_case_json_is_plain_json(compressor_panel):
    text = compressor_panel.case_json()
    data = json.loads(text)
    assert data["inputs"]["inlet_pressure_Pa"] == 2.0e6


def test_figure_model_state_follows_in_place_updates(panel):
    # a browser view drawn after an update starts from the widget model state
    panel.show_charts()
    fig = panel.figure
    panel.set_values(**{"outlet-temperature": 121.0})
    if fig.has_trait("_widget_data"):
        synced = fig._widget_data[5]["x"]
    elif fig.has_trait("_data"):
        synced = fig._data[5]["x"]
    else:
        pytest.skip("plain plotly Figure: redrawn whole")
    assert list(synced)[1] == pytest.approx(panel.result.outlet.s / 1e3, rel=1e-9)


def test_typing_an_efficiency_makes_it_fix_the_outlet(panel):
    panel.set_values(**{"isentropic-efficiency": 80.0})
    assert panel.choices["outlet-mode"].value == "isentropic efficiency"
    gas = demo_gas()
    r = wb.compressor(gas.state(P=20e5, T=303.15), P_out=55e5, isentropic_efficiency=0.8,
                      mass_flow=12.0, mechanical_efficiency=0.98)
    assert number(panel.shown("power")) == pytest.approx(r.power / 1e3, rel=1e-4)
    # the measured outlet temperature entry is now not used: its label is greyed
    assert panel.entries["outlet-temperature"].label.style.text_color == "#9a9a9a"
    assert panel.entries["isentropic-efficiency"].label.style.text_color is None


def test_pump_matches_the_incompressible_closed_form():
    p = MachinePanel(case="turbine-demo")
    p.set_values(machine="pump", fluid="Water", **{
        "inlet-pressure": 1.0, "inlet-temperature": 20.0, "outlet-pressure": 10.0,
        "isentropic-efficiency": 70.0, "mass-flow": 5.0, "mechanical-efficiency": 100.0})
    assert not p.stale, p.message.text
    # incompressible liquid (common practice): P = m v dP / eta; v of water at 20 degC,
    # 1 bar from IAPWS-IF97 via the iapws package
    v = IAPWS97(P=0.1, T=293.15).v
    expected_kw = 5.0 * v * 9e5 / 0.7 / 1e3
    assert number(p.shown("power")) == pytest.approx(expected_kw, rel=2e-3)


# ---------------------------------------------------------------- messages in the units typed


def test_negative_absolute_pressure_typed_in_psia_is_quoted_in_psia(panel):
    panel.set_values(unit_system="US customary")
    before, shown_before = panel.result, panel.shown("power")
    entry = panel.entries["inlet-pressure"]
    entry.field.value = -20.0  # as if typed in the browser, in psi (absolute)
    assert panel.message.text == ("Inlet pressure -20 psia is not positive: an absolute pressure "
                             "must be above 0 psia")
    assert "Pa" not in panel.message.text.replace("psia", "")  # no SI value quoted
    assert panel.stale and panel.result is before and panel.shown("power") == shown_before
    # the entry still shows what was typed
    assert panel.entry_value("inlet-pressure") == -20.0
    entry.field.value = 300.0
    assert not panel.stale
    # NIST SP 811: 1 psi = 6894.757 Pa
    assert panel.result.inlet.P == pytest.approx(300.0 * PSI, rel=1e-6)


def test_gauge_pressure_below_vacuum_is_quoted_in_psig(panel):
    panel.set_values(unit_system="psig, degF")
    assert panel.set_values(**{"inlet-pressure": -20.0}) is False
    # 1 atm = 101325 Pa = 14.696 psia (NIST SP 811): -20 psig is -5.3041 psia absolute
    assert panel.message.text == ("Inlet pressure -20 psig is below vacuum: it is -5.3041 psia "
                             "absolute (ambient pressure 14.696 psia); a gauge pressure must be "
                             "above -14.696 psig")
    assert panel.stale


def test_temperature_below_absolute_zero_is_quoted_in_degF(panel):
    panel.set_values(unit_system="US customary")
    before = panel.result
    assert panel.set_values(**{"inlet-temperature": -500.0}) is False
    # absolute zero is -459.67 degF (definition of the Rankine scale, NIST SP 811)
    assert panel.message.text == ("Inlet temperature -500 °F is below absolute zero: a temperature "
                             "must be above -459.67 °F")
    assert panel.stale and panel.result is before
    assert "stale" in panel.stale_note.value


def test_flow_and_efficiency_limits_are_quoted_as_typed(panel):
    panel.set_values(unit_system="US customary")
    assert panel.set_values(**{"mass-flow": -3.0}) is False
    assert panel.message.text == ("Mass flow -3 lb/s is not positive: a flow must be above 0 lb/s")
    panel.set_values(**{"mass-flow": 26.0})
    assert not panel.stale
    # 1 lb = 0.45359237 kg exactly (NIST SP 811)
    assert panel.result.mass_flow == pytest.approx(26.0 * POUND, rel=1e-9)
    assert panel.set_values(**{"isentropic-efficiency": 120.0}) is False
    assert panel.message.text == ("Isentropic efficiency 120 % is out of range: an efficiency is "
                             "above 0 % and at most 100 %")
    assert panel.set_values(**{"mechanical-efficiency": 0.0}) is False
    assert panel.message.text.startswith("Mechanical efficiency 0 % is out of range")
    # 100 % is allowed (an ideal machine)
    assert panel.set_values(**{"mechanical-efficiency": 100.0,
                               "isentropic-efficiency": 80.0}) is True


def test_other_errors_come_from_the_core_unchanged(panel):
    # a compressor whose outlet pressure is below its inlet pressure passes every physical
    # limit of the panel; the core refuses it (a compressor raises pressure)
    assert panel.set_values(**{"outlet-pressure": 15.0}) is False
    inputs = dict(panel._inputs)
    with pytest.raises(wb.WorkbenchError) as info:
        mp.study.machine_study(inputs)
    assert panel.message.text == str(info.value)


def test_an_entry_not_in_use_is_not_checked(panel):
    # the demo compressor takes its flow as a mass flow: the volume flow entry is not used
    assert panel.set_values(**{"volume-flow": -1.0, "flow-given": "mass flow"}) is True
    assert not panel.stale


# ---------------------------------------------------------------- rounding and round trips


def significant_figures_of_quantity(value, zero=0.0):
    """Decimal places of ``value`` when it has five significant figures above ``zero``."""
    return 4 - math.floor(math.log10(abs(value - zero)))


def test_entries_after_a_unit_switch_show_five_significant_figures(panel):
    panel.set_values(unit_system="US customary")
    for name in ("inlet-pressure", "outlet-pressure", "mass-flow"):
        shown = panel.entry_value(name)
        decimals = significant_figures_of_quantity(shown)
        assert shown == round(shown, decimals), (name, shown)
    # 55 bar = 797.7076 psi (NIST SP 811: 1 bar = 14.50377 psi) -> 797.71
    assert panel.entry_value("outlet-pressure") == 797.71
    # temperatures: five figures above absolute zero (-459.67 degF), so 0.01 degF here;
    # 117 degC = 242.6 degF (degF = degC * 9/5 + 32, definition)
    shown = panel.entry_value("outlet-temperature")
    assert shown == pytest.approx(242.6, abs=0.005) and shown == round(shown, 2)
    # gauge pressures: five figures of the absolute pressure, 20 bar - 1.01325 bar = 18.98675
    panel.set_values(unit_system="bar(g), degC")
    assert panel.entry_value("inlet-pressure") == 18.987


def test_unit_switch_round_trip_gives_back_the_typed_value(panel):
    entry = panel.entries["inlet-pressure"]
    entry.field.value = 20.123456789  # typed in bar, more digits than shown after a switch
    si, power = entry.si, panel.result.power
    outlet_temperature = panel.result.outlet.T
    # 1 bar = 1e5 Pa (definition)
    assert si == pytest.approx(20.123456789e5, rel=1e-15)
    for system in ("US customary", "psig, degF", "SI", "bar(g), degC"):
        panel.set_values(unit_system=system)
        assert entry.si == si  # the SI value held does not change
    panel.set_values(unit_system="US customary")
    # 20.123456789 bar = 291.8691 psi (NIST SP 811: 1 psi = 6894.757 Pa), shown rounded
    assert panel.entry_value("inlet-pressure") == pytest.approx(20.123456789e5 / PSI,
                                                                abs=0.005)
    assert panel.entry_value("inlet-pressure") == round(panel.entry_value("inlet-pressure"), 2)
    panel.set_values(unit_system="bar, degC")
    assert panel.entry_value("inlet-pressure") == 20.123456789  # exactly as typed
    assert entry.si == si
    assert panel.result.power == power and panel.result.outlet.T == outlet_temperature
    # a recalculation after the round trip gives the same result (same SI inputs)
    panel.set_values(**{"mass-flow": 12.0})
    assert panel.result.power == power


def test_value_typed_in_psi_survives_a_round_trip(panel):
    panel.set_values(unit_system="US customary", **{"outlet-pressure": 800.123456})
    si = panel.entries["outlet-pressure"].si
    power = panel.result.power
    panel.set_values(unit_system="bar, degC")
    # 800.123456 psi = 55.1666 bar (NIST SP 811: 1 psi = 6894.757 Pa), five figures
    assert panel.entry_value("outlet-pressure") == pytest.approx(800.123456 * PSI / 1e5,
                                                                 abs=5e-4)
    assert panel.entry_value("outlet-pressure") == 55.167
    panel.set_values(unit_system="US customary")
    assert panel.entry_value("outlet-pressure") == 800.123456
    assert panel.entries["outlet-pressure"].si == si and panel.result.power == power


def test_ambient_change_keeps_a_gauge_reading_exactly(panel):
    panel.set_values(unit_system="bar(g), degC", **{"inlet-pressure": 18.9876543})
    panel.set_values(**{"ambient-pressure": 0.95})
    assert panel.entry_value("inlet-pressure") == 18.9876543
    # absolute = gauge + ambient
    assert panel.result.inlet.P == pytest.approx((18.9876543 + 0.95) * 1e5, rel=1e-12)
    assert panel.set_values(**{"ambient-pressure": -1.0}) is False
    assert panel.message.text.startswith("Ambient pressure -1 bar(abs) is not positive")


# ---------------------------------------------------------------- charts: lazy, in place


def test_charts_are_built_only_when_their_tab_is_opened():
    p = MachinePanel(case="turbine-demo")
    assert p.result is not None and not p.stale
    assert p.figure is None and p.sweep.figure is None
    assert figure_widgets(p) == []  # no plotly bundle travels to the page at first
    assert "outlet" in p.states_html.value  # the process states are shown at once
    p.set_values(**{"mass-flow": 11.0})
    assert p.figure is None  # updates do not build it either
    p.tabs.selected_index = mp.TAB_TITLES.index("process charts")
    fig = p.figure
    assert figure_widgets(p) == [fig]
    # the drawn outlet point is the current result's: T-s outlet temperature in degC
    n = len(mp.charts.TRACE_NAMES)
    assert list(fig.data[n + 5].y)[1] == pytest.approx(p.result.outlet.T - 273.15, abs=1e-9)
    p.tabs.selected_index = 0
    p.tabs.selected_index = mp.TAB_TITLES.index("process charts")
    assert p.figure is fig and figure_widgets(p) == [fig]


def test_unit_switch_redraws_the_charts_in_place(panel):
    panel.show_charts()
    fig = panel.figure
    panel.set_values(unit_system="US customary")
    assert panel.figure is fig
    n = len(mp.charts.TRACE_NAMES)
    # degF = degC * 9/5 + 32 (definition); 117 degC outlet
    assert list(fig.data[n + 5].y)[1] == pytest.approx(117 * 1.8 + 32, abs=1e-6)
    assert "°F" in fig.layout.yaxis2.title.text


def test_sweep_figure_is_updated_in_place(panel):
    panel.run_sweep("outlet-pressure", 30.0, 70.0, 5, ["power"])
    fig = panel.sweep.figure
    assert figure_widgets(panel) == [fig]
    panel.run_sweep("outlet-pressure", 40.0, 60.0, 3, ["power", "outlet-temperature"])
    assert panel.sweep.figure is fig and figure_widgets(panel) == [fig]
    assert len(fig.data) == 2
    assert list(fig.data[0].x) == [40.0, 50.0, 60.0]
    gas = demo_gas()
    r = wb.compressor(gas.state(P=20e5, T=303.15), gas.state(P=50e5, T=390.15),
                      mass_flow=12.0, mechanical_efficiency=0.98)
    assert fig.data[0].y[1] == pytest.approx(r.power / 1e3, rel=1e-9)
    assert fig.data[1].yaxis == "y2"
    panel.run_sweep("outlet-pressure", 30.0, 70.0, 5, ["power"])
    assert panel.sweep.figure is fig and len(fig.data) == 1 and len(fig.data[0].y) == 5


def test_mixture_chart_draws_the_dew_line_and_steam_the_dome():
    # The first trace is the edge of the supported region: a mixture's dew line (the gas is
    # refused below it), a pure fluid's saturation dome; points from the calculation layer.
    gas_panel = MachinePanel(case="compressor-demo")
    gas_panel.show_charts()
    fig = gas_panel.figure
    n = len(mp.charts.TRACE_NAMES)
    assert fig.data[0].name == "dew line" and fig.data[n].name == "dew line"
    line = gas_panel.result.inlet.fluid.dew_line(40)
    assert len(line) > 10
    assert list(fig.data[0].x) == pytest.approx([st.s / 1e3 for st in line], rel=1e-9)
    steam_panel = MachinePanel(case="turbine-demo")
    steam_panel.show_charts()
    assert steam_panel.figure.data[0].name == "saturation dome"


def test_wet_expansion_caution_reaches_the_message_area():
    # Common practice: Schultz's method is for single-phase gases; the turbine demo's exhaust
    # is wet, so the panel must say which polytropic values to use.
    p = MachinePanel(case="turbine-demo")
    assert p.result.outlet.two_phase
    assert "Schultz" in p.message.text and "two-phase" in p.message.text
