"""A self-contained HTML report of a curves case: inputs, method and references, charts,
tables, verdicts and the safety caution.

The report is one HTML file with inline CSS and inline SVG charts (:mod:`.svg`): it opens in
a browser from a file, with no server, no script and no network access.  Numbers are shown
in plain engineering units (m^3/h, m, kJ/kg, kW, bar, degC, rpm); every label comes from the
field table (:data:`workbench.fields.FIELDS`).
"""

from __future__ import annotations

import html
from datetime import datetime, timezone
from pathlib import Path

from ..errors import InputError
from ..fields import FIELDS
from .cases import CurvesCaseResult
from .characteristic import HEAD_WORDS
from .charts import case_charts, header, show, unit
from .svg import render_svg

CSS = """
body{font-family:sans-serif;max-width:980px;margin:2em auto;color:#1a1a1a;line-height:1.4}
h1{font-size:1.5em}h2{font-size:1.2em;border-bottom:1px solid #bfbfbf;margin-top:1.6em}
table{border-collapse:collapse;margin:.6em 0}td,th{border:1px solid #bfbfbf;padding:3px 8px;
text-align:right}th{background:#f2f2f2}td:first-child,th:first-child{text-align:left}
.caution{border:2px solid #c55a11;padding:.6em;background:#fff4ec}
.pass{color:#376e1e;font-weight:bold}.fail{color:#b00000;font-weight:bold}
.note{color:#595959;font-size:.9em}
"""

REFERENCES = [
    "ISO 9906:2012, Rotodynamic pumps - Hydraulic performance acceptance tests - Grades 1, 2 "
    "and 3 (Table 8 tolerance factors, recalled from memory).",
    "ISO 5801, Fans - Performance testing using standardized airways (definitions, recalled "
    "from memory).",
    "ASME PTC 10-1997, Performance Test Code on Compressors and Exhausters (Tables 3.1, 3.2, "
    "Figures 3.3-3.5 and section 5; recalled from memory, the Mach and Reynolds limits "
    "approximated).",
    "ASME PTC 19.1-2013, Test Uncertainty (propagation by sensitivity coefficients).",
    "C. F. Colebrook (1939), J. Inst. Civil Eng. 11, 133-156 (friction factor); Darcy-Weisbach "
    "head loss.",
    "ANSI/HI 9.6.1, Rotodynamic Pumps - Guideline for NPSH Margin (NPSH available).",
    "F. N. Fritsch and R. E. Carlson (1980), SIAM J. Numer. Anal. 17, 238-246 (PCHIP).",
    "J. M. Schultz (1962), J. Eng. Power 84, 69-82 (polytropic head).",
]


def _table(headers, rows) -> str:
    head = "".join(f"<th>{html.escape(str(h))}</th>" for h in headers)
    body = "".join("<tr>" + "".join(f"<td>{c}</td>" for c in row) + "</tr>" for row in rows)
    return f"<table><tr>{head}</tr>{body}</table>"


def _fields_table(values: dict, names, labels=None) -> str:
    rows = []
    for name in names:
        f = FIELDS[name]
        fmt = ".4f" if f.fmt == ".4f" else ".5g"
        label = (labels or {}).get(name, f.label)
        rows.append([html.escape(label), show(values.get(name), f.kind, fmt),
                     html.escape(unit(f.kind))])
    return _table(["quantity", "value", "unit"], rows)


def _verdict(ok) -> str:
    if ok is None:
        return "\u2013"
    return '<span class="pass">pass</span>' if ok else '<span class="fail">fail</span>'


def _curve_table(curve) -> str:
    quantities = curve.quantities
    kinds = {"head": curve.head_kind, "efficiency": "dimensionless", "power": "power",
             "npsh_required": "length"}
    words = {"head": HEAD_WORDS[curve.machine], "efficiency": "efficiency",
             "power": "power input", "npsh_required": "NPSH required"}
    headers = [header("volume_flow", "flow")] + [header(kinds[q], words[q])
                                                   for q in quantities]
    rows = []
    for i, q in enumerate(curve.flow):
        rows.append([show(q, "volume_flow")] + [show(curve.points(k)[i], kinds[k])
                                                for k in quantities])
    fit = (f"least-squares polynomial of degree {curve.degree}" if curve.fit == "polynomial"
           else "monotone PCHIP interpolant")
    note = (f'<p class="note">{html.escape(curve.name)} at '
            f'{show(curve.speed, "rotational_speed", ".5g")} rpm; fit: {fit}; largest head residual {curve.max_residual():.3g} (SI); flow '
            f'limits {show(curve.min_flow, "volume_flow")} to '
            f'{show(curve.max_flow, "volume_flow")} m³/h.</p>')
    return _table(headers, rows) + note


def _pump_sections(result: CurvesCaseResult, charts: dict) -> list[str]:
    curve, point, acc = result.curve, result.operating_point, result.acceptance
    out = ["<h2>Machine and system curves</h2>", render_svg(charts["head"])]
    if point is not None:
        out.append(_fields_table(point.to_dict(), [
            "volume_flow", "total_head", "system_head", "static_head", "efficiency", "power",
            "surge_margin", "npsh_available", "npsh_required", "npsh_margin"],
            labels={"power": "power input", "surge_margin": "margin to the minimum flow"
                    if curve.machine == "pump" else "surge margin"}))
        out.extend(f'<p class="fail">{html.escape(c)}</p>' for c in point.cautions)
    if "npsh" in charts:
        out.append(render_svg(charts["npsh"]))
    if acc is not None:
        out.extend(_acceptance_section(acc, charts["acceptance"]))
    return out


def _acceptance_section(acc, chart) -> list[str]:
    g = acc.grade
    out = ["<h2>Acceptance test after ISO 9906:2012</h2>", render_svg(chart)]
    rows = [["grade", html.escape(g.name), ""],
            ["flow tolerance", f"{g.flow[0]:+.0%} / {g.flow[1]:+.0%}", ""],
            ["head tolerance", f"{g.head[0]:+.0%} / {g.head[1]:+.0%}", ""],
            ["efficiency tolerance", f"{g.efficiency:+.0%}", ""],
            ["power tolerance", f"{g.power:+.0%}", ""],
            ["head at guarantee flow [m]", show(acc.head_at_guarantee_flow, "length"), ""],
            ["head deviation", show(acc.head_deviation, "dimensionless", "+.2%"), ""],
            ["flow deviation at guarantee head",
             show(acc.flow_deviation, "dimensionless", "+.2%"), ""],
            ["flow and head", _verdict(acc.flow_head_passes),
             f"margin {show(acc.flow_head_margin, 'dimensionless', '+.2%')}"],
            ["efficiency at check point", show(acc.test_efficiency, "dimensionless", ".4f"),
             _verdict(acc.efficiency_passes)],
            ["power at check point [kW]", show(acc.test_power, "power"),
             _verdict(acc.power_passes)],
            ["<b>verdict</b>", _verdict(acc.verdict == "pass"), ""]]
    out.append(_table(["item", "value", "note"], rows))
    out.extend(f'<p class="note">{html.escape(c)}</p>' for c in acc.cautions)
    return out


def _compressor_sections(result: CurvesCaseResult, charts: dict) -> list[str]:
    sim = result.similarity
    out = ["<h2>Compressor curve</h2>", render_svg(charts["compressor_head"])]
    if "compressor_efficiency" in charts:
        out.append(render_svg(charts["compressor_efficiency"]))
    if sim is None:
        return out
    names = sim.test.FIELDS
    rows = [[html.escape(FIELDS[n].label)] + [show(getattr(g, n), FIELDS[n].kind, ".5g")
                                              for g in (sim.test, sim.specified, sim.converted)]
            + [html.escape(unit(FIELDS[n].kind))] for n in names]
    out += [f"<h2>Similarity after ASME PTC 10-1997 (Type {sim.test_type} test)</h2>",
            _table(["quantity", "test", "specified", "test converted", "unit"], rows)]
    check_rows = [[html.escape(c.parameter.replace("_", " ")), html.escape(c.measure),
                   f"{c.value:.4g}", f"{c.low:.4g} .. {c.high:.4g}", _verdict(c.within),
                   html.escape(c.source)] for c in sim.checks]
    out.append(_table(["parameter", "measure", "value", "allowed", "verdict", "limit from"],
                      check_rows))
    out.append(f"<p><b>{html.escape(sim.verdict)}</b></p>")
    if sim.uncertainty is not None:
        u = sim.uncertainty
        rows = [[html.escape(FIELDS[k].label), show(u.value[k], FIELDS[k].kind, ".5g"),
                 show(u.expanded[k], FIELDS[k].kind, ".3g"),
                 html.escape(unit(FIELDS[k].kind)),
                 html.escape(str(u.dominant[k] or "\u2013").replace("_", " "))]
                for k in u.value]
        out += ["<h3>Uncertainty of the converted figures (ASME PTC 19.1)</h3>",
                _table(["quantity", "value", "U95", "unit", "dominant reading"], rows)]
    out.extend(f'<p class="note">{html.escape(c)}</p>' for c in sim.cautions)
    return out


def _method() -> str:
    items = [
        "Curves: the datasheet points are fitted by the stated fit; flows outside the points "
        "are not read. Speed changes follow the affinity laws (Q ~ N, H ~ N², P ~ N³, "
        "efficiency kept); for a compressor this is the conversion at equal flow and work "
        "coefficients, an approximation while Mach number and volume ratio stay close.",
        "System: static head plus Darcy-Weisbach friction (Colebrook friction factor) and "
        "fitting losses at the fluid's density and viscosity; the operating point is where "
        "machine and system heads are equal; NPSH available = (P - Pv)/(ρg) + V²/(2g) at the "
        "suction flange.",
        "Pump acceptance: test points translated to the rated speed, a curve fitted through "
        "them, the tolerance cross of the grade around the guarantee point; efficiency read "
        "where the straight line through the origin and the guarantee point meets the curve.",
        "Compressor similarity: flow coefficient q/(ω r³), work coefficient W_p/U², machine "
        "Mach number U/a, machine Reynolds number U b/ν, volume ratio v_i/v_d; the test is "
        "converted at equal flow coefficient (q ~ N, W_p ~ N², efficiency kept).",
        "Standards' tolerance factors and limits are recalled from memory and marked so in the "
        "tables; check them against the standards named in the contract.",
    ]
    refs = "".join(f"<li>{html.escape(r)}</li>" for r in REFERENCES)
    return ("<h2>Method and references</h2><ul>"
            + "".join(f"<li>{html.escape(i)}</li>" for i in items) + f"</ul><ol>{refs}</ol>")


def _inputs(result: CurvesCaseResult) -> list[str]:
    out = ["<h2>Inputs</h2>", "<h3>Datasheet curve</h3>", _curve_table(result.curve)]
    system = result.system
    if system is not None:
        st = system.state
        out += ["<h3>System</h3>", _table(["item", "value"], [
            ["fluid", html.escape(st.fluid.name)],
            ["source pressure [bar]", show(st.P, "pressure")],
            ["temperature [°C]", show(st.T, "temperature")],
            ["density [kg/m³]", show(system.density, "density")],
            ["static head [m]", show(system.static_head, "length")],
            ["source level above the pump [m]", show(system.suction_head, "length")]]),
            _table(["section", "diameter [mm]", "length [m]", "roughness [mm]", "K [-]",
                    "suction side"],
                   [[html.escape(s.name), f"{s.diameter * 1e3:.4g}", f"{s.length:.4g}",
                     f"{s.roughness * 1e3:.3g}", f"{s.loss_coefficient:.4g}",
                     "yes" if s.suction else "no"] for s in system.sections])]
    acc = result.acceptance
    if acc is not None:
        rows = [[show(q, "volume_flow"), show(h, "length"),
                 show(e, "dimensionless", ".4f") if len(acc.efficiency) else "\u2013"]
                for q, h, e in zip(acc.flow, acc.head, acc.efficiency if len(acc.efficiency)
                                   else [None] * len(acc.flow))]
        out += ["<h3>Test points, translated to the rated speed "
                f"{show(acc.rated_speed, 'rotational_speed')} rpm</h3>",
                _table([header("volume_flow", "flow"), "pump total head [m]",
                        "efficiency [-]"], rows),
                f"<p>Guarantee: {show(acc.guarantee_flow, 'volume_flow')} m³/h, "
                f"{show(acc.guarantee_head, 'length')} m, efficiency "
                f"{show(acc.guarantee_efficiency, 'dimensionless', '.3f')}.</p>"]
    return out


def curves_report(result: CurvesCaseResult, *, caution: str | None = None) -> str:
    """The HTML text of a self-contained report of an evaluated curves case.

    Parameters
    ----------
    result : CurvesCaseResult
        From :func:`workbench.curves.evaluate_curves_case`.
    caution : str, optional
        Safety caution; default :data:`workbench.SAFETY_CAUTION`.

    Returns
    -------
    str
        A complete HTML document (inline CSS and SVG, no script, no external resource).

    Examples
    --------
    >>> from workbench.curves import evaluate_curves_case, load_curves_demo
    >>> text = curves_report(evaluate_curves_case(load_curves_demo("pump-loop-demo")))
    >>> "<svg" in text and "ISO 9906" in text
    True
    """
    if not isinstance(result, CurvesCaseResult):
        raise InputError(f"a report needs an evaluated curves case (CurvesCaseResult), not "
                         f"{type(result).__name__}")
    if caution is None:
        from .. import SAFETY_CAUTION as caution
    title = html.escape(result.title or "Machine curves and acceptance")
    stamp = datetime.now(timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    body = [f"<h1>{title}</h1>",
            f'<p class="caution"><b>Caution.</b> {html.escape(caution)}</p>',
            f"<p>{html.escape(result.description)}</p>",
            f'<p class="note">Report made {stamp} by turbo-workbench.</p>']
    body += _inputs(result)
    charts = {chart.key: chart for chart in case_charts(result)}
    body += _compressor_sections(result, charts) if result.kind == "compressor" else \
        _pump_sections(result, charts)
    body.append(_method())
    return ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
            f"<title>{title}</title><style>{CSS}</style></head><body>\n"
            + "\n".join(body) + "\n</body></html>\n")


def write_curves_report(result: CurvesCaseResult, path) -> Path:
    """Write :func:`curves_report` to a file (UTF-8) and return its path."""
    if not isinstance(path, (str, Path)):
        raise InputError(f"report path must be text or a Path, not {type(path).__name__}")
    target = Path(path)
    try:
        target.write_text(curves_report(result), encoding="utf-8")
    except OSError as exc:
        raise InputError(f"could not write the report to {str(target)!r}: "
                         f"{exc.__class__.__name__}") from None
    return target


__all__ = ["REFERENCES", "curves_report", "write_curves_report"]
