"""Tests of the train panel (workbench.ui.train_panel), driven from Python, no browser.

Shown numbers are compared with the train functions called directly with the same inputs,
and with outside facts: IAPWS-IF97 through the ``iapws`` package, the two-stage optimum at
the geometric-mean pressure, and unit conversion factors of NIST SP 811.
"""

import ipywidgets as widgets
import pytest
from iapws import IAPWS97

import workbench as wb
from workbench.fluids import Fluid
from workbench.trains import intercooled_compressor
from workbench.ui.train_panel import COMPRESSOR_ENTRIES, RESULTS, TURBINE_ENTRIES, TrainPanel


def number(text):
    return float(text.split()[0])


def css_classes(widget):
    found = set(getattr(widget, "_dom_classes", ()))
    for child in getattr(widget, "children", ()):
        found |= css_classes(child)
    return found


@pytest.fixture
def panel():
    return TrainPanel()


def test_hooks_and_caution(panel):
    assert isinstance(panel, widgets.VBox)
    classes = css_classes(panel)
    for name in list(COMPRESSOR_ENTRIES) + ["scenario", "gas", "stages", "ratio-method",
                                            "unit-system"]:
        assert f"wb-input-{name}" in classes
    for name in list(RESULTS) + ["stations"]:
        assert f"wb-result-{name}" in classes
    assert "wb-result-power-bars" in panel.chart._dom_classes
    assert "wb-result-hs-chart" in panel.chart._dom_classes
    assert "wb-message" in classes
    assert wb.SAFETY_CAUTION.split(".")[0] in panel.caution.value
    panel.scenario.value = "extraction turbine"
    classes = css_classes(panel)
    for name in TURBINE_ENTRIES:
        assert f"wb-input-{name}" in classes


def test_two_stage_optimum_shown_at_geometric_mean(panel):
    # Two ideal stages with perfect intercooling and no drops: the panel's stage ratios are
    # equal, P_i = sqrt(P1 P2) (textbook result; 0.5 % for real-gas effects of air).
    panel.stages.value = 2
    panel.set_input("suction-temperature", 25.0)   # degC
    panel.set_input("cooler-outlet-temperature", 25.0)
    panel.set_input("isentropic-efficiency", 100.0)
    panel.set_input("cooler-pressure-drop", 0.0)
    panel.set_input("knockout-pressure-drop", 0.0)
    assert panel.message.value == ""
    r1, r2 = (float(v) for v in panel.results["stage-pressure-ratios"].shown.split(","))
    assert r1 == pytest.approx(3.0, rel=5e-3) and r2 == pytest.approx(3.0, rel=5e-3)
    # Same inputs straight into the library give the power shown (kW, 5 digits).
    air = Fluid("Air")
    direct = intercooled_compressor(air.state_PT(1e5, 298.15), 1.5, P_out=9e5, stages=2,
                                    isentropic_efficiency=1.0, cooler_outlet_temperature=298.15,
                                    stage_ratios="optimal")
    assert number(panel.results["total-shaft-power"].shown) == pytest.approx(
        direct.total_power / 1e3, rel=1e-4)
    bars, line, _branches = panel.chart.data
    assert len(bars.y) == 2
    assert len(line.x) == 4   # inlet, stage 1, intercooler, stage 2


def test_turbine_exhaust_matches_if97(panel):
    # Back-pressure turbine demo: exhaust enthalpy from IAPWS-IF97 via iapws, with the
    # valve isenthalpic and h2 = h1 - eta (h1 - h2s) in each section.
    panel.scenario.value = "extraction turbine"
    assert panel.message.value == ""
    h1 = IAPWS97(P=4.2, T=713.15).h
    s1 = IAPWS97(P=3.8, h=h1).s
    h2 = h1 - 0.78 * (h1 - IAPWS97(P=1.2, s=s1).h)
    h3 = h2 - 0.75 * (h2 - IAPWS97(P=0.4, s=IAPWS97(P=1.2, h=h2).s).h)
    power = 12.0 * (h1 - h2) + 8.0 * (h2 - h3)  # kW
    assert number(panel.results["total-shaft-power"].shown) == pytest.approx(power, rel=1e-4)
    t3 = IAPWS97(P=0.4, h=h3).T - 273.15
    assert number(panel.results["outlet-temperature"].shown) == pytest.approx(t3, abs=0.01)


def test_unit_switch_keeps_si_values(panel):
    # 1 psi = 6894.757 Pa, 1 hp (mechanical) = 745.6999 W (NIST SP 811).
    kw = number(panel.results["total-shaft-power"].shown)
    panel.units.value = "psig, degF"
    # shown to five significant figures
    assert panel.entries["discharge-pressure"].value == pytest.approx(9e5 / 6894.757, rel=5e-5)
    assert number(panel.results["total-shaft-power"].shown) == pytest.approx(kw * 1e3 / 745.6999,
                                                                      rel=1e-4)
    assert panel.si("discharge-pressure") == pytest.approx(9e5)
    assert "psia" in panel.stations.value


def test_bad_input_shows_message_and_keeps_last_result(panel):
    shown = panel.results["total-shaft-power"].shown
    panel.set_input("cooler-outlet-temperature", 400.0)  # degC, hotter than any discharge
    assert "cooler outlet temperature" in panel.message.value
    assert panel.stale
    assert panel.results["total-shaft-power"].shown == shown
    panel.set_input("cooler-outlet-temperature", 35.0)
    assert panel.message.value == "" and not panel.stale


def test_turbine_stage_ratios_quoted_high_over_low(panel):
    # Turbine section ratios are quoted inlet over exhaust, high over low (common practice):
    # with the demo's 38 bar after the valve, 12 bar extraction and 4 bar exhaust the HP
    # section shows 38/12 and the LP section 12/4 (plain arithmetic on the entries).
    panel.scenario.value = "extraction turbine"
    assert panel.message.value == ""
    hp, lp = (float(v) for v in panel.results["stage-pressure-ratios"].shown.split(","))
    assert hp == pytest.approx(38.0 / 12.0, rel=1e-3)
    assert lp == pytest.approx(12.0 / 4.0, rel=1e-3)
    # The h-s chart follows the stations: five main-line points (inlet and the outlets of the
    # valve, the HP section, the extraction and the LP section) and the extraction branch.
    bars, line, branches = panel.chart.data
    assert len(line.x) == 5 and len(branches.x) == 1
    assert list(bars.x) == ["HP section", "LP section"]


def test_unit_switch_shows_five_figures_and_keeps_the_result(panel):
    # NIST SP 811: 1 bar = 14.503774 psi; the entry shows five significant figures while the
    # train keeps the exact SI inputs, so the result does not move on a round trip.
    power = panel.result.total_power
    panel.units.value = "US customary"
    assert panel.entries["suction-pressure"].value == pytest.approx(14.504, abs=1e-9)
    assert panel.result.total_power == pytest.approx(power, rel=1e-12)
    panel.units.value = "bar, degC"
    assert panel.entries["suction-pressure"].value == pytest.approx(1.0, abs=1e-12)
    assert panel.result.total_power == pytest.approx(power, rel=1e-12)
