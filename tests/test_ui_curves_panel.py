"""The curves dashboard without a browser: demo, edits, bad entries, case files, report.

The panel only binds widgets to the curves calculation layer, so these tests check that
what it shows follows the entries, against closed forms where a number is checked (the
affinity laws, standard gravity) and against the ISO 9906 grade 2B tolerances.
"""

from __future__ import annotations

import base64
import html
import json
import re

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from workbench import SAFETY_CAUTION
from workbench.ui.curves_figure import trace_data
from workbench.ui.curves_panel import CurvesPanel
from workbench.ui.curves_table import measured_columns, parse_table

HOUR = 3600.0


@pytest.fixture()
def panel():
    return CurvesPanel("pump-loop-demo")


def _link_bytes(link_html: str) -> bytes:
    match = re.search(r"base64,([A-Za-z0-9+/=]+)'", link_html)
    assert match, link_html[:200]
    return base64.b64decode(match.group(1))


def _lines(text):
    head, *rows = [line for line in text.splitlines() if line.strip()]
    return head, [[float(c) for c in row.split(",")] for row in rows]


def _upload(name, content):
    return {"new": ({"name": name, "content": content, "type": "text/csv",
                     "size": len(content)},)}


def test_demo_loads_with_results_verdict_and_charts(panel):
    assert panel.result is not None and not panel.stale
    assert "grade 2B: pass" in panel.verdict.value
    op = panel.result.operating_point
    # the row shows the operating point flow of the calculation layer in m3/h
    shown = float(panel.rows.shown("volume_flow").split()[0])
    assert shown == pytest.approx(op.volume_flow * HOUR, rel=1e-4)
    assert panel.rows.shown("total_head").endswith(" m")  # heads in metres, not mm
    traces = trace_data(panel.figure)
    assert (0, "system curve") in traces and (1, "tolerance cross, grade 2B") in traces
    # the curve at the test speed follows the affinity laws (common practice): Q ~ N,
    # H ~ N^2, so the shut-off head scales with the speed ratio squared
    acc = panel.case["acceptance"]
    ratio = acc["test_speed"] / panel.case["curve"]["speed"]
    x, y = traces[(0, "datasheet curve at test speed")]
    rated_x, rated_y = traces[(0, "datasheet curve")]
    assert x[-1] == pytest.approx(rated_x[-1] * ratio, rel=1e-9)
    assert y[0] == pytest.approx(rated_y[0] * ratio ** 2, rel=1e-6)
    assert SAFETY_CAUTION[:40] in html.unescape(panel.caution.value)


def test_lower_test_heads_fail_the_grade_and_move_the_chart(panel):
    head, rows = _lines(panel.test_text.value)
    before = trace_data(panel.figure)[(0, "test points at test speed")]
    # every test head 12 % low: beyond the -5 % head tolerance of grade 2B at the guarantee
    # flow and, along the line through the origin, beyond the -8 % flow tolerance too
    # (ISO 9906:2012 Table 8, from memory: grade 2B t_Q = +-8 %, t_H = +-5 %)
    text = head + "\n" + "\n".join(f"{q}, {h * 0.88}, {p}" for q, h, p in rows)
    panel.test_text.value = text
    assert panel.message.level != "error", panel.message.text
    assert "grade 2B: fail" in panel.verdict.value
    assert "wb-verdict-fail" in panel.verdicts.value
    after = trace_data(panel.figure)[(0, "test points at test speed")]
    assert after[1] == pytest.approx(tuple(h * 0.88 for h in before[1]))
    assert float(panel.rows.shown("flow_head_margin").split()[0]) < 0


def test_grade_choice_changes_the_tolerance_cross(panel):
    cross_2b = trace_data(panel.figure)[(1, "tolerance cross, grade 2B")]
    panel.rule.value = "1B"
    x, y = trace_data(panel.figure)[(1, "tolerance cross, grade 1B")]
    # grade 1B: t_Q = +-5 %, t_H = +-3 % (ISO 9906:2012 Table 8, from memory)
    q_g = panel.case["acceptance"]["guarantee_flow"] * HOUR
    h_g = panel.case["acceptance"]["guarantee_head"]
    assert (x[0], x[1]) == pytest.approx((0.95 * q_g, 1.05 * q_g))
    assert (y[3], y[4]) == pytest.approx((0.97 * h_g, 1.03 * h_g))
    assert x[1] - x[0] < cross_2b[0][1] - cross_2b[0][0]


def test_a_bad_entry_shows_a_message_and_keeps_the_last_result_stale(panel):
    good = panel.result
    verdict = panel.verdict.value
    head, rows = _lines(panel.test_text.value)
    panel.test_text.value = head + "\n" + "\n".join(
        ["1O0, 40, 60"] + [", ".join(map(str, r)) for r in rows])
    assert panel.message.level == "error"
    assert "line 2" in panel.message.text and "'1O0' is not a number" in panel.message.text
    assert panel.result is good and panel.stale
    assert panel.verdict.value.startswith(verdict) and "stale" in panel.verdict.value
    # a value the calculation refuses: a negative datasheet speed
    panel.test_text.value = head + "\n" + "\n".join(", ".join(map(str, r)) for r in rows)
    assert not panel.stale and panel.verdict.value == verdict
    panel.curve_speed.set_display(-1480.0)
    assert panel.message.level == "error" and "speed" in panel.message.text
    assert panel.stale and panel.result is not None


@pytest.mark.parametrize("cell", ["nan", "inf", "1e400x", "__import__('os')", "2*3"])
def test_table_cells_are_numbers_only(cell):
    cols = measured_columns("pump")
    with pytest.raises(Exception) as info:
        parse_table(f"100, 40, 50\n{cell}, 30, 60\n", cols, "bar, degC", "test points")
    assert "not a number" in str(info.value) or "finite" in str(info.value).lower()


def test_partly_filled_optional_column_is_refused_with_its_line():
    cols = measured_columns("pump")
    with pytest.raises(Exception, match="line 2: the power input is missing"):
        parse_table("100, 40, 50\n200, 30\n", cols, "bar, degC", "test points")


def test_case_round_trip_keeps_an_edit(panel):
    panel.g_head.set_display(34.0)
    assert panel.case["acceptance"]["guarantee_head"] == 34.0
    saved = _link_bytes(panel.case_link.value)
    assert json.loads(saved) == json.loads(panel.case_json())
    other = CurvesPanel("compressor-co2-shop-test-demo")
    assert other.load_case(saved)
    assert other.kind.value == "pump" and other.g_head.value == pytest.approx(34.0)
    assert other.result.acceptance.guarantee_head == 34.0
    # a file that is not a curves case is refused and nothing changes
    title = other.result.title
    assert not other.load_case(b'{"format": "something else"}')
    assert "case not loaded" in other.message.text and other.result.title == title


def test_report_download_has_the_charts_and_the_caution(panel):
    link = panel.report_link.value
    assert "data:text/html;base64," in link and "curves-report.html" in link
    report = _link_bytes(link).decode("utf-8")
    assert report.count("<svg") >= 2
    assert html.escape(SAFETY_CAUTION)[:60] in report or SAFETY_CAUTION[:60] in report
    assert "<script" not in report.lower()


def test_compressor_test_point_edit_moves_the_converted_point():
    panel = CurvesPanel("compressor-co2-shop-test-demo")
    assert "Type 2" in panel.verdict.value
    before = trace_data(panel.figure)[(0, "test converted (U95)")]
    head, (row,) = _lines(panel.test_text.value)
    row[3] += 3.0  # a hotter discharge at the same pressures
    panel.test_text.value = head + "\n" + ", ".join(map(str, row))
    assert panel.message.level != "error", panel.message.text
    after = trace_data(panel.figure)[(0, "test converted (U95)")]
    assert after != before
    panel.test_text.value += "\n" + ", ".join(map(str, row))
    assert panel.message.level == "error" and "one test point" in panel.message.text


def test_unit_switch_keeps_the_case(panel):
    case = json.dumps(panel.case, sort_keys=True)
    panel.units.value = "US customary"
    assert "ft³/min" in panel.curve_text.value.splitlines()[0]
    assert panel.rows.shown("volume_flow").endswith("ft³/min")
    panel.curve_speed.set_display(panel.curve_speed.value)  # re-parse every table
    new = panel.case
    old = json.loads(case)
    # flows come back to within the rounding of the shown numbers (8 significant digits)
    np.testing.assert_allclose(new["curve"]["flow"], old["curve"]["flow"], rtol=1e-7,
                               atol=1e-12)
    np.testing.assert_allclose(new["acceptance"]["test_head"],
                               old["acceptance"]["test_head"], rtol=1e-7)


def test_kind_switch_loads_the_other_demo(panel):
    panel.kind.value = "compressor"
    assert panel.result.kind == "compressor"
    assert [o[1] for o in panel.rule.options] == ["1", "2"]
    assert "polytropic head" in panel.curve_text.value.splitlines()[0]


def test_curve_csv_upload_and_size_limit(panel):
    text = ("flow [m³/h], pump total head [m]\n0, 50\n300, 45\n600, 36\n900, 22\n")
    panel._curve_uploaded(_upload("curve.csv", text.encode()))
    assert panel.message.level != "error", panel.message.text
    assert panel.result.curve.flow[-1] == pytest.approx(900 / HOUR)
    assert "efficiency" not in panel.result.curve.quantities
    guarded = panel.guard(panel._curve_uploaded)
    guarded(_upload("big.csv", b"1, 2\n" * 50_000))
    assert panel.message.level == "error" and "bytes" in panel.message.text
    guarded(_upload("empty.csv", b"flow, head\n"))
    assert panel.message.level == "error" and "no points" in panel.message.text
    assert panel.result.curve.flow[-1] == pytest.approx(900 / HOUR)  # unchanged


def test_readings_result_file_gives_pump_test_points(panel):
    # a readings result file as the readings dashboard exports it (SI values, speed in rpm
    # as workbench.fieldtest.readers keeps it)
    csv = ("status,steady,inlet_volume_flow,isentropic_head,shaft_power,speed\n"
           "ok,True,0.15,412.0,75000,1473\n"
           "ok,True,0.10,450.0,66000,1475\n"
           "inconsistent readings,False,0.12,,,1474\n"
           "ok,False,0.13,430.0,70000,1474\n"
           "ok,True,0.20,340.0,80000,1474\n")
    panel._readings_uploaded(_upload("r.csv", csv.encode()))
    assert "test points read from r.csv" in panel.message.text
    # only ok and steady rows, sorted by flow (the conversion itself: tests/curves)
    assert panel.result.data["acceptance"]["test_flow"] == pytest.approx([0.10, 0.15, 0.20])
    assert panel.result.data["acceptance"]["test_head"][0] == pytest.approx(450.0 / 9.80665)
    assert panel.test_speed.value == pytest.approx(1474.0)


def test_readings_file_without_result_columns_is_refused(panel):
    guarded = panel.guard(panel._readings_uploaded)
    guarded(_upload("raw.csv", b"time,p1\n1,2\n2,3\n"))
    assert panel.message.level == "error" and "status" in panel.message.text
    assert panel.result is not None and panel.stale


def test_readings_result_file_gives_the_mean_compressor_test_point():
    panel = CurvesPanel("compressor-co2-shop-test-demo")
    csv = ("status,steady,inlet_pressure,inlet_temperature,outlet_pressure,"
           "reading_outlet_temperature,inlet_volume_flow,speed\n"
           "ok,True,299000,299.8,546000,352.4,0.3861,6730\n"
           "ok,True,301000,300.2,547600,352.72,0.3881,6742\n"
           "ok,False,250000,280.0,500000,340.0,0.30,6000\n")
    panel._readings_uploaded(_upload("compressor-results.csv", csv.encode()))
    assert panel.message.level != "error", panel.message.text
    test = panel.case["similarity"]["test"]
    # the mean of the two usable rows (the unsteady row is left out); 1 rpm = 2 pi/60 rad/s
    assert test["inlet_pressure"] == pytest.approx(300000.0, rel=1e-7)
    assert test["discharge_temperature"] == pytest.approx(352.56, rel=1e-7)
    assert test["speed"] == pytest.approx(6736.0 * 2 * np.pi / 60, rel=1e-7)
    assert panel.result.similarity.test.speed == pytest.approx(test["speed"])
    assert "Type 2" in panel.verdict.value


_CELL = st.one_of(st.floats(allow_nan=True, allow_infinity=True).map(repr),
                  st.integers(-10**30, 10**30).map(str),
                  st.text(alphabet="0123456789.eE+-,; \tnaifx()_'", max_size=12))


@settings(max_examples=40, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(lines=st.lists(st.lists(_CELL, min_size=0, max_size=7), min_size=0, max_size=6),
       target=st.sampled_from(["curve_text", "test_text"]))
def test_any_table_text_gives_a_result_or_a_message(panel, lines, target):
    # fuzz (property-based): whatever is typed, nothing escapes into the page and the last
    # good result stays; the panel shows either a fresh result or an error message
    text = "\n".join(", ".join(cells) for cells in lines)
    getattr(panel, target).value = text
    assert panel.result is not None
    assert panel.stale == (panel.message.level == "error")
    if panel.message.level == "error":
        assert "unexpected error" not in panel.message.text, panel.message.text


@settings(max_examples=60, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(name=st.sampled_from(["curve_speed", "min_flow", "max_flow", "test_speed", "g_flow",
                             "g_head", "g_eff", "static_head"]),
       value=st.floats(-1e12, 1e12, allow_nan=False))
def test_any_entry_value_gives_a_result_or_a_message(panel, name, value):
    # fuzz (property-based) over the number entries: no exception reaches the page
    getattr(panel, name).set_display(value)
    assert panel.result is not None
    assert panel.stale == (panel.message.level == "error")
    if panel.message.level == "error":
        assert "unexpected error" not in panel.message.text, panel.message.text
