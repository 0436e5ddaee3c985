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
    fig = charts.make_sweep_figure()
    charts.update_sweep_figure(fig, [1.0, 2.0, 3.0], {"a [kW]": [1.0, math.nan, 3.0]}, "x [bar]")
    assert math.isnan(fig.data[0].y[1])  # a failed point is a gap
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


# ---------------------------------------------------------------------------- plumbing
# The plumbing every panel shares (message area, quiet updates, downloads, Panel.guard).
# Expected behaviour is the project's own rule (DESIGN.md, "Errors"): a UI callback never
# lets an exception escape into the page, shows the message and keeps the last good result
# visible, marked stale.

import base64  # noqa: E402
import doctest  # noqa: E402

import ipywidgets as widgets  # noqa: E402

from workbench.errors import InputError  # noqa: E402
from workbench.ui import common  # noqa: E402
from workbench.ui.common import (  # noqa: E402
    MessageArea,
    Panel,
    ResultRows,
    describe_error,
    download_link,
    input_class,
    quiet_update,
    result_class,
)


def test_plumbing_docstring_examples_run():
    failures, tried = doctest.testmod(common)
    assert tried >= 3 and failures == 0


def test_quiet_update_suppresses_a_guarded_observer_and_restores_after_an_error():
    panel = Panel()
    calls = []
    box = widgets.FloatText(value=1.0)
    box.observe(panel.guard(lambda change: calls.append(change["new"])), names="value")
    with panel.quiet():
        box.value = 2.0
    assert calls == [] and panel._quiet is False
    box.value = 3.0
    assert calls == [3.0]
    with pytest.raises(RuntimeError):
        with quiet_update(panel):
            with quiet_update(panel):  # nested: the outer quiet stays on
                pass
            assert panel._quiet is True
            raise RuntimeError("body failed")
    assert panel._quiet is False


def test_number_entry_set_si_does_not_call_its_callback():
    seen = []
    entry = NumberEntry("p", "pressure", "pressure", 2e5, on_change=seen.append,
                        system="bar, degC")
    entry.set_si(3e5)
    assert seen == [] and entry.value == pytest.approx(3.0)  # bar, exact (1 bar = 1e5 Pa)
    entry.field.value = 4.0  # as typed
    assert seen == [entry] and entry.si == pytest.approx(4e5)


def test_download_link_round_trips_the_content_and_escapes_the_name():
    text = "x [bar],y [kW]\n1,2\n"
    link = download_link(text, "a'b.csv", "get <it>")
    encoded = link.split("base64,")[1].split("'")[0]
    assert base64.b64decode(encoded).decode("utf-8") == text
    assert "a&#x27;b.csv" in link and "get &lt;it&gt;" in link
    assert "data:application/json;base64," in download_link(b"{}", "c.json", "c",
                                                            "application/json")


def test_message_area_escapes_text_and_lists_each_caution_once():
    area = MessageArea()
    assert area.has_class("wb-message") if hasattr(area, "has_class") else \
        "wb-message" in area._dom_classes
    area.show("<b>calculated</b>", cautions=("wet outlet", "wet outlet", "low flow"))
    assert area.text == "<b>calculated</b>; caution: wet outlet; caution: low flow"
    assert "<b>" not in area.value and "&lt;b&gt;" in area.value
    assert area.level == "caution"
    area.show_error(InputError("inlet pressure -1 bar is below 0 bar"))
    assert area.level == "error" and area.text == "inlet pressure -1 bar is below 0 bar"
    area.clear()
    assert area.text == "" and area.value == "" and area.level == ""


def test_describe_error_never_shows_a_raw_message_of_an_unexpected_error():
    text = describe_error(ZeroDivisionError("float division by zero"))
    assert "ZeroDivisionError" in text and "float division" not in text
    assert "Traceback" not in text
    assert describe_error(InputError("mass flow  0 kg/s\nmust be above 0")) == \
        "mass flow 0 kg/s must be above 0"


def test_panel_guard_shows_errors_and_keeps_the_last_result_marked_stale():
    panel = Panel()
    rows = panel.add_result_widget(ResultRows(["shaft_power", "isentropic_efficiency"],
                                              percent={"isentropic_efficiency"}))
    panel.show_result("good", "calculated")
    assert panel.result == "good" and not panel.stale and panel.message.text == "calculated"

    def bad_input():
        raise InputError("outlet pressure 2 bar is below inlet pressure 5 bar")

    def defect():
        return 1 / 0

    assert panel.guard(bad_input)() is None  # never raises
    assert panel.result == "good" and panel.stale
    assert panel.message.text == "outlet pressure 2 bar is below inlet pressure 5 bar"
    assert rows.rows["shaft-power"].text.style.text_color == common.STALE_COLOUR
    assert panel.guard(defect, "sweep not run: ")() is None
    assert panel.message.text.startswith("sweep not run: unexpected error (ZeroDivisionError)")
    panel.show_result("better")
    assert not panel.stale and rows.rows["shaft-power"].text.style.text_color is None
    assert panel.message.text == ""


def test_a_panel_without_a_result_is_not_stale_after_an_error():
    panel = Panel()
    panel.fail(InputError("bad"))
    assert panel.result is None and not panel.stale and panel.message.level == "error"


def test_panel_carries_the_safety_caution_once():
    import workbench as wb

    panel = Panel([widgets.Label("x")])
    assert wb.SAFETY_CAUTION[:40] in panel.caution.value
    assert panel.has_class("wb-panel") if hasattr(panel, "has_class") else True


def test_result_rows_take_labels_and_kinds_from_the_fields_table():
    from workbench.fields import FIELDS

    rows = ResultRows(["shaft_power", "isentropic_efficiency", "outlet_temperature"],
                      percent={"isentropic_efficiency"})
    assert rows.rows["shaft-power"].label.value == FIELDS["shaft_power"].label
    assert "wb-result-outlet-temperature" in rows.rows["outlet-temperature"].text._dom_classes
    # 1 bar = 1e5 Pa; 0 degC = 273.15 K; 1 kW = 1000 W (SI definitions, NIST SP 811)
    rows.show({"shaft_power": 1234.5, "isentropic_efficiency": 0.8123,
               "outlet_temperature": 373.15}, "bar, degC")
    assert rows.shown("shaft_power") == "1.2345 kW"
    assert rows.shown("isentropic-efficiency") == "81.23 %"
    assert rows.shown("outlet_temperature") == "100.00 °C"
    rows.show({"shaft_power": math.nan}, "SI", notes={"outlet_temperature": "– (gas)"})
    assert rows.shown("shaft_power") == "–" and rows.shown("outlet_temperature") == "– (gas)"


def test_hook_classes():
    w = input_class(widgets.Text(), "fluid")
    r = result_class(widgets.HTML(), "power")
    assert "wb-input-fluid" in w._dom_classes and "wb-result-power" in r._dom_classes
