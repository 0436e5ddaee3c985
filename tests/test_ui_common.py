"""Tests of the shared panel helpers (workbench.ui.common) and the chart helpers
(workbench.ui.charts) that do not need a whole panel.

Unit factors are those of NIST SP 811 (1 psi = 6894.757 Pa, 1 bar = 1e5 Pa exactly,
degF = degC * 9/5 + 32 and absolute zero at -459.67 degF by definition).
"""

import math

import numpy as np
import pytest

from workbench.ui import charts
from workbench.ui.common import (
    NumberEntry,
    format_typed,
    from_si,
    quoted_unit,
    round_for_entry,
    round_for_kind,
    scale_zero,
)

PSI = 6894.757  # Pa (NIST SP 811)


def test_round_for_entry_keeps_eight_digits_which_is_too_many_after_a_conversion():
    # why the panels needed more than round_for_entry: 20 bar in psi keeps 8 digits
    shown = round_for_entry(from_si("US customary", 20e5, "pressure"))
    assert shown == pytest.approx(20e5 / PSI, abs=1e-5)
    assert len(f"{shown}".replace(".", "").lstrip("0")) == 8  # 290.07548


def test_round_for_kind_counts_figures_of_the_quantity():
    # 20 bar = 290.0754 psi (NIST SP 811) -> five figures
    assert round_for_kind(20e5 / PSI, "pressure", "US customary") == 290.08
    # temperatures: figures above absolute zero, so 30 degC (303.15 K) keeps 0.01 degC and
    # a small Celsius number is not given eight digits
    assert round_for_kind(30.000000001, "temperature", "bar, degC") == 30.0
    assert round_for_kind(0.3123456, "temperature", "bar, degC") == 0.31
    # 1000 degC is 1273 K: one decimal
    assert round_for_kind(1000.123456, "temperature", "bar, degC") == 1000.1
    # degF = degC * 9/5 + 32 (definition): 30 degC = 86 degF, shown to 0.01 degF
    assert round_for_kind(from_si("US customary", 303.15, "temperature"), "temperature",
                          "US customary") == 86.0
    # gauge: figures of the absolute pressure, 20 bar - 1.01325 bar = 18.98675 bar(g)
    assert round_for_kind(18.98675, "pressure", "bar(g), degC", 101325.0) == 18.987
    # a small gauge reading keeps the resolution of the absolute pressure (1.0247 bar)
    assert round_for_kind(0.0123456, "pressure", "bar(g), degC", 101325.0) == 0.0123
    assert round_for_kind(80.123456, "percent") == 80.123
    assert round_for_kind(0.0, "pressure", "SI") == 0.0
    assert math.isnan(round_for_kind(math.nan, "pressure", "SI"))
    assert round_for_kind(1.01325, "absolute_pressure", "bar, degC", significant=6) == 1.01325


def test_scale_zero_is_the_physical_zero_in_display_units():
    # absolute zero: -273.15 degC, -459.67 degF (definitions); 0 K
    assert scale_zero("bar, degC", "temperature") == pytest.approx(-273.15, abs=1e-9)
    assert scale_zero("US customary", "temperature") == pytest.approx(-459.67, abs=1e-9)
    assert scale_zero("SI", "temperature") == 0.0
    # zero absolute pressure on a gauge scale is minus the ambient pressure:
    # 101325 Pa = 14.6959 psi (NIST SP 811)
    assert scale_zero("psig, degF", "pressure", 101325.0) == pytest.approx(-101325.0 / PSI,
                                                                          rel=1e-6)
    assert scale_zero("bar, degC", "pressure") == 0.0
    assert scale_zero("bar, degC", "mass_flow") == 0.0


def test_quoted_units_say_absolute_or_gauge():
    # psia / psig (common practice in US customary units)
    assert quoted_unit("US customary", "pressure") == "psia"
    assert quoted_unit("psig, degF", "pressure") == "psig"
    assert quoted_unit("psig, degF", "absolute_pressure") == "psia"
    assert quoted_unit("bar, degC", "pressure") == "bar"
    assert quoted_unit("US customary", "temperature") == "°F"
    assert format_typed(-20.0) == "-20"
    assert format_typed(290.07548) == "290.07548"


def test_number_entry_gives_back_the_typed_value_after_unit_switches():
    changes = []
    entry = NumberEntry("p", "pressure", "pressure", 20e5, on_change=changes.append,
                        system="bar, degC", significant=5)
    entry.field.value = 20.123456789  # as typed
    assert changes == [entry]
    si = entry.si
    assert si == pytest.approx(20.123456789e5, rel=1e-15)  # 1 bar = 1e5 Pa (definition)
    entry.set_system("US customary", 101325.0)
    assert entry.value == 291.87  # 2012345.6789 Pa / 6894.757 Pa/psi = 291.8661 -> 291.87
    assert entry.value == pytest.approx(si / PSI, abs=0.005)
    assert entry.si == si
    entry.set_system("psig, degF", 101325.0)
    entry.set_system("bar, degC", 101325.0)
    assert entry.value == 20.123456789 and entry.display_value == 20.123456789
    assert entry.si == si
    assert len(changes) == 1  # unit switches do not call on_change
    # a new SI value set by the program is shown rounded, not as the old typed number
    entry.set_si(30.123456789e5)
    assert entry.value == 30.123


def test_number_entry_without_significant_keeps_the_old_rounding():
    # other panels build entries without ``significant``: 8 digits as before
    entry = NumberEntry("p", "pressure", "pressure", 20e5, system="US customary")
    assert entry.value == round_for_entry(from_si("US customary", 20e5, "pressure"))
    assert entry.value == pytest.approx(20e5 / PSI, abs=1e-4)


def test_sweep_figure_is_changed_in_place():
    fig = charts.sweep_figure([1.0, 2.0, 3.0], {"a [kW]": [1.0, math.nan, 3.0]}, "x [bar]")
    charts.update_sweep_figure(fig, [1.0, 2.0], {"a [kW]": [5.0, 6.0], "b [°C]": [7.0, 8.0]},
                               "x [psi]")
    assert len(fig.data) == 2
    assert list(fig.data[0].y) == [5.0, 6.0] and fig.data[1].yaxis == "y2"
    assert fig.layout.xaxis.title.text == "x [psi]"
    same = fig
    charts.update_sweep_figure(fig, [1.0], {"b [°C]": [9.0]}, "x")
    assert fig is same and len(fig.data) == 1 and list(fig.data[0].y) == [9.0]
    assert fig.data[0].name == "b [°C]" and fig.data[0].yaxis == "y"


def test_process_figure_holds_both_diagrams():
    fig = charts.make_process_figure()
    n = len(charts.TRACE_NAMES)
    assert len(fig.data) == 2 * n
    assert {t.xaxis for t in fig.data[:n]} == {"x"} and {t.xaxis for t in fig.data[n:]} == {"x2"}
    one = (np.array([1000.0, 1100.0]), np.array([3.0e5, 3.5e5]), np.array([300.0, 350.0]))
    points = {key: one for key in ("dome", "inlet isobar", "outlet isobar", "path",
                                   "isentropic", "ends", "iso end")}
    charts.update_process_figure(fig, points, "bar, degC")
    # kJ/(kg K), kJ/kg and degC of the SI points (1 kJ = 1000 J; degC = K - 273.15)
    assert list(fig.data[5].x) == pytest.approx([1.0, 1.1])
    assert list(fig.data[5].y) == pytest.approx([300.0, 350.0])
    assert list(fig.data[n + 5].y) == pytest.approx([26.85, 76.85])
    assert "kJ/kg" in fig.layout.yaxis.title.text and "°C" in fig.layout.yaxis2.title.text


def relayout_keys_sent(fig, update):
    """Layout key paths that ``update(fig)`` sends to the front end as deltas."""
    sent = []
    real_update, real_relayout = fig._send_update_msg, fig._send_relayout_msg

    def capture_update(restyle_data, relayout_data, *args, **kwargs):
        sent.extend(relayout_data)
        return real_update(restyle_data, relayout_data, *args, **kwargs)

    def capture_relayout(layout_data, *args, **kwargs):
        sent.extend(layout_data)
        return real_relayout(layout_data, *args, **kwargs)

    fig._send_update_msg, fig._send_relayout_msg = capture_update, capture_relayout
    update(fig)
    return sent


def no_parent_with_child(keys):
    """plotly.js refuses a relayout that sets a parent and one of its children together
    ("cannot set yaxis2.overlaying and a parent attribute simultaneously", seen in
    Chromium in this project): no key may be a dotted prefix of another."""
    return not any(a != b and b.startswith(a + ".") for a in keys for b in keys)


def test_first_sweep_into_an_empty_figure_sends_no_parent_and_child_together():
    fig = charts.make_sweep_figure()
    keys = relayout_keys_sent(fig, lambda f: charts.update_sweep_figure(
        f, [1.0, 2.0], {"a [kW]": [1.0, 2.0], "b [°C]": [3.0, 4.0]}, "x [bar]"))
    assert "yaxis2.title.text" in keys and no_parent_with_child(keys), keys


def test_first_process_chart_draw_sends_no_parent_and_child_together():
    fig = charts.make_process_figure()
    one = (np.array([1000.0, 1100.0]), np.array([3.0e5, 3.5e5]), np.array([300.0, 350.0]))
    points = {key: one for key in ("dome", "inlet isobar", "outlet isobar", "path",
                                   "isentropic", "ends", "iso end")}
    keys = relayout_keys_sent(fig, lambda f: charts.update_process_figure(f, points))
    assert "xaxis2.title.text" in keys and no_parent_with_child(keys), keys
