"""The self-contained HTML report of a curves case: no script, no external resource, the
caution, charts, tables and verdicts; hostile text escaped."""

import html
from html.parser import HTMLParser

import pytest

import workbench as wb
from workbench.curves import evaluate_curves_case, load_curves_demo
from workbench.curves.report import curves_report, write_curves_report
from workbench.curves.svg import nice_ticks

VOID = {"meta", "br", "hr", "img", "input", "link", "circle", "line", "rect", "polyline",
        "path"}


class Checker(HTMLParser):
    """Collects tags, refuses scripts and external resources, checks nesting."""

    def __init__(self):
        super().__init__()
        self.stack, self.tags, self.problems = [], [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        if tag == "script":
            self.problems.append("script")
        for key, value in attrs:
            if key in ("src", "href") and value and not value.startswith("#"):
                self.problems.append(f"{key}={value}")
        if tag not in VOID:
            self.stack.append(tag)

    def handle_startendtag(self, tag, attrs):
        self.tags.append(tag)

    def handle_endtag(self, tag):
        if tag in VOID:
            return
        if not self.stack or self.stack[-1] != tag:
            self.problems.append(f"unbalanced </{tag}>")
        else:
            self.stack.pop()


def check(text):
    parser = Checker()
    parser.feed(text)
    assert not parser.problems, parser.problems[:5]
    assert not parser.stack, parser.stack
    return parser.tags


@pytest.mark.parametrize("name, words", [
    ("pump-loop-demo", ["ISO 9906:2012", "tolerance cross", "NPSH margin", "grade 2B"]),
    ("compressor-co2-shop-test-demo", ["ASME PTC 10-1997", "machine Mach number", "U95",
                                       "flow coefficient"]),
])
def test_demo_reports_are_self_contained(name, words):
    result = evaluate_curves_case(load_curves_demo(name))
    text = curves_report(result)
    tags = check(text)
    assert tags.count("svg") >= 2
    assert html.escape(wb.SAFETY_CAUTION) in text
    for word in words:
        assert word in text
    assert "from memory" in text
    assert "class=\"pass\"" in text or "class=\"fail\"" in text


def test_hostile_text_is_escaped(tmp_path):
    data = load_curves_demo("pump-loop-demo")
    data["title"] = "<script>alert(1)</script>"
    data["curve"]["name"] = "<img src=x onerror=alert(1)>"
    result = evaluate_curves_case(data)
    path = write_curves_report(result, tmp_path / "report.html")
    text = path.read_text(encoding="utf-8")
    check(text)
    assert "<script>" not in text and "&lt;script&gt;" in text


def test_refusals(tmp_path):
    with pytest.raises(wb.InputError, match="CurvesCaseResult"):
        curves_report({"title": "x"})
    result = evaluate_curves_case(load_curves_demo("pump-loop-demo"))
    with pytest.raises(wb.InputError, match="could not write"):
        write_curves_report(result, tmp_path)  # a folder, not a file
    with pytest.raises(wb.InputError, match="report path"):
        write_curves_report(result, 42)


def test_nice_ticks_cover_the_range():
    ticks = nice_ticks(0.0, 973.0)
    assert ticks[0] <= 0.0 and ticks[-1] >= 973.0
    steps = {round(b - a, 9) for a, b in zip(ticks, ticks[1:])}
    assert len(steps) == 1 and steps.pop() in (100.0, 200.0, 250.0)


def test_chart_data_in_display_units():
    from workbench.curves.charts import case_charts

    result = evaluate_curves_case(load_curves_demo("pump-loop-demo"))
    charts = {c.key: c for c in case_charts(result)}
    assert set(charts) == {"head", "npsh", "acceptance"}
    cross = charts["acceptance"].crosses[0]
    ql, qh, hl, hh = result.acceptance.cross
    # 1 m3/s = 3600 m3/h (definition of the hour); heads stay in metres
    assert (cross.x_low, cross.x_high) == pytest.approx((ql * 3600, qh * 3600))
    assert (cross.y_low, cross.y_high) == pytest.approx((hl, hh))
    op = [s for s in charts["head"].series if s.name == "operating point"][0]
    assert op.x[0] == pytest.approx(result.operating_point.volume_flow * 3600)
    comp = evaluate_curves_case(load_curves_demo("compressor-co2-shop-test-demo"))
    head = {c.key: c for c in case_charts(comp)}["compressor_head"]
    test = [s for s in head.series if s.name.startswith("test converted")][0]
    # J/kg to kJ/kg; the error bar is the propagated U95
    assert test.y[0] == pytest.approx(comp.similarity.converted.polytropic_head / 1e3)
    assert test.y_error[0] == pytest.approx(
        comp.similarity.uncertainty.expanded["polytropic_head"] / 1e3)
