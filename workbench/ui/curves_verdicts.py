"""Verdict table of the curves dashboard: one line per check, its value, limits and verdict.

Plain HTML built from an evaluated curves case (:class:`workbench.curves.cases.
CurvesCaseResult`); the numbers and verdicts are the calculation layer's, shown in the
report's display units (:func:`workbench.curves.charts.show`).  Rows carry the classes
``wb-verdict-pass`` or ``wb-verdict-fail`` so a test (or a reader) finds each verdict.
"""

from __future__ import annotations

import html

from ..curves.charts import show
from ..curves.charts import unit as unit_of
from ..fields import FIELDS

CSS = """
.wb-verdicts{border-collapse:collapse;font-size:13px;margin:4px 0}
.wb-verdicts td,.wb-verdicts th{border:1px solid #c8c8c8;padding:2px 8px;text-align:right}
.wb-verdicts th{background:#eeeeea}.wb-verdicts td:first-child{text-align:left}
.wb-verdicts td:last-child{text-align:left}
.wb-verdict-fail td:last-child{font-weight:bold;text-decoration:underline}
.wb-note{color:#555;font-size:12px;padding:2px 8px}
.wb-verdict-line{font-size:15px;margin:4px 0}
"""


def _pct(value) -> str:
    return show(None if value is None else 100.0 * value, "dimensionless", ".2f")


def _row(check, value, limits, passes) -> str:
    word = "–" if passes is None else ("pass" if passes else "fail")
    cls = "" if passes is None else (" class='wb-verdict-pass'" if passes
                                     else " class='wb-verdict-fail'")
    cells = "".join(f"<td>{c}</td>" for c in (html.escape(check), value, limits, word))
    return f"<tr{cls}>{cells}</tr>"


def _table(rows) -> str:
    head = "".join(f"<th>{h}</th>" for h in ("check", "value", "limits", "verdict"))
    return f"<table class='wb-verdicts'><tr>{head}</tr>{''.join(rows)}</table>"


def _pump_rows(acc):
    g = acc.grade
    rows = [_row("flow and head (tolerance cross)",
                 f"margin {_pct(acc.flow_head_margin)} %",
                 f"Q {100 * g.flow[0]:+g}/{100 * g.flow[1]:+g} %, "
                 f"H {100 * g.head[0]:+g}/{100 * g.head[1]:+g} %", bool(acc.flow_head_passes))]
    if acc.efficiency_margin is not None:
        rows.append(_row("efficiency at the guarantee",
                         f"{_pct(acc.test_efficiency)} % (margin {_pct(acc.efficiency_margin)}"
                         " %)", f"t_eta {100 * g.efficiency:+g} %",
                         acc.efficiency_margin >= 0))
    if acc.power_margin is not None:
        rows.append(_row("power input at the guarantee",
                         f"{show(acc.test_power, 'power')} kW (margin "
                         f"{_pct(acc.power_margin)} %)", f"t_P +{100 * g.power:g} %",
                         acc.power_margin >= 0))
    return rows


def _point_rows(point):
    rows = [_row("operating point within the flow limits",
                 f"{show(point.volume_flow, 'volume_flow')} m³/h",
                 f"surge or minimum-flow margin {_pct(point.surge_margin)} %",
                 point.surge_margin >= 0)]
    if point.npsh_margin is not None:
        rows.append(_row("NPSH margin", f"{show(point.npsh_margin, 'length', '.3g')} m",
                         "NPSH available above NPSH required", point.npsh_margin > 0))
    return rows


def _similarity_rows(sim):
    rows = []
    for c in sim.checks:
        label = FIELDS[c.parameter].label if c.parameter in FIELDS else c.parameter
        what = "test / specified" if c.measure == "ratio" else "test - specified"
        value = f"{c.value:.4f}" if c.measure == "departure" else f"{c.value:.4g}"
        rows.append(_row(f"{label} ({what})", value,
                         f"{c.low:.4g} .. {c.high:.4g}<br><span class='wb-note'>"
                         f"{html.escape(c.source)}</span>", bool(c.within)))
    return rows


#: Rows of the compressor table: field name, display kind, format.
_SIM_ROWS = (("volume_flow", "volume_flow", ".5g"), ("speed", "rotational_speed", ".5g"),
             ("polytropic_head", "specific_energy", ".5g"),
             ("polytropic_efficiency", "percent", ".2f"), ("power", "power", ".5g"),
             ("outlet_pressure", "pressure", ".5g"), ("outlet_temperature", "temperature", ".4g"),
             ("flow_coefficient", "dimensionless", ".5f"),
             ("work_coefficient", "dimensionless", ".4f"),
             ("machine_mach_number", "dimensionless", ".4f"),
             ("machine_reynolds_number", "dimensionless", ".4g"))
_U95 = {"polytropic_head": "polytropic_head", "polytropic_efficiency": "polytropic_efficiency",
        "power": "power"}


def _cell(value, kind, fmt):
    if kind == "percent":
        return show(None if value is None else 100.0 * value, "dimensionless", fmt)
    return show(value, kind, fmt)


def similarity_html(sim) -> str:
    """HTML table of a compressor test: test, specified and converted figures, with U95."""
    data = sim.to_dict()
    expanded = sim.uncertainty.expanded if sim.uncertainty is not None else {}
    head = "".join(f"<th>{h}</th>" for h in ("quantity", "test", "specified",
                                             "test converted", "U95"))
    rows = []
    for name, kind, fmt in _SIM_ROWS:
        f = FIELDS[name]
        unit = {"percent": "%", "dimensionless": ""}.get(kind) or unit_of(kind)
        label = f"{f.label} [{unit}]" if unit else f.label
        u = expanded.get(_U95.get(name, ""), None)
        cells = [_cell(data.get(f"{part}_{name}"), kind, fmt)
                 for part in ("test", "specified", "converted")]
        cells.append(_cell(u, kind, ".2g") if u is not None else "–")
        rows.append("<tr>" + "".join(f"<td>{c}</td>" for c in [html.escape(label), *cells])
                    + "</tr>")
    return f"<table class='wb-verdicts'><tr>{head}</tr>{''.join(rows)}</table>"


def verdicts_html(result) -> str:
    """HTML table of every check of an evaluated curves case (empty text when none)."""
    rows = []
    if result.acceptance is not None:
        rows += _pump_rows(result.acceptance)
    if result.operating_point is not None:
        rows += _point_rows(result.operating_point)
    note = ("<div class='wb-note'>Tables, charts and the report use m³/h, m, kJ/kg, kW, bar, "
            "°C and rpm whatever the unit switch.</div>")
    if result.similarity is not None:
        rows += _similarity_rows(result.similarity)
        return _table(rows) + similarity_html(result.similarity) + note
    return _table(rows) + note if rows else ""


def verdict_text(result) -> str:
    """One line: the acceptance verdict (pump) or the similarity verdict (compressor)."""
    if result.acceptance is not None:
        acc = result.acceptance
        text = f"ISO 9906 grade {acc.grade.name}: {acc.verdict}"
    elif result.similarity is not None:
        sim = result.similarity
        text = f"ASME PTC 10 Type {sim.test_type}: {sim.verdict}"
    elif result.operating_point is not None:
        text = "operating point only: no acceptance test in this case"
    else:
        text = "datasheet curve only"
    return f"<div class='wb-verdict-line'><b>Verdict.</b> {html.escape(text)}</div>"


__all__ = ["CSS", "verdict_text", "verdicts_html"]
