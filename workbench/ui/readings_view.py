"""HTML of the readings dashboard: the summary, the table of rows and the page styles.

Pure text from a :class:`workbench.fieldtest.session.SessionResult`: nothing is computed here
but display rounding.  Every value from the file is escaped.  CSS hooks: table rows are
``wb-row-ok`` / ``wb-row-flagged``, steady cells ``wb-steady-yes`` / ``wb-steady-no``; the
summary is ``wb-fresh`` while it matches the entries and ``wb-stale`` after a failed update.
"""

from __future__ import annotations

import html
import math

#: Rows of the table shown on the page (the CSV export has every row).
TABLE_ROWS = 40
#: Background of a flagged row and of the steady cell of an unsteady row.
FLAGGED_ROW = "#fbe3c6"
UNSTEADY_CELL = "#dde5ef"

#: Table columns: result column, header, display format of the SI value (None: text).
_COLUMNS = (("status", "status", None), ("message", "message", None),
            ("isentropic_efficiency", "eff. %", lambda v: f"{100 * v:.2f}"),
            ("shaft_power", "shaft kW", lambda v: f"{v / 1e3:.1f}"),
            ("inlet_volume_flow", "Q1 m³/h", lambda v: f"{3600 * v:.0f}"),
            ("pressure_ratio", "ratio", lambda v: f"{v:.3f}"),
            ("efficiency_deviation_points", "eff. dev. points", lambda v: f"{v:+.2f}"))


def summary_html(result) -> str:
    """The summary block: counts, steady rows, means and the dominant uncertainty."""
    s = result.summary()
    parts = ", ".join(f"{html.escape(k)}: {v}" for k, v in result.status_counts().items())
    dominant = ""
    reading = result.dominant_reading()
    if reading is not None:
        dominant = (f"<br>Efficiency U95 about "
                    f"{100 * s['mean_U95_isentropic_efficiency']:.2f} points at the "
                    f"sampled rows, mostly from the {html.escape(reading.replace('_', ' '))}.")
    steady_mean = (f" ({100 * s['mean_isentropic_efficiency_steady']:.2f} % over the "
                   "steady rows)" if math.isfinite(s["mean_isentropic_efficiency_steady"])
                   else "")
    return (f"<div class='wb-summary'><span class='wb-fresh'><b>{s['rows']} rows</b> "
            f"({parts}).<br><b>Steady: {s['steady']} of {s['rows']} rows</b> "
            f"({s['steady_ok']} of them ok; window {s['steady_window']} rows).<br>"
            f"Mean isentropic efficiency {_number(100 * s['mean_isentropic_efficiency'], 2)} %"
            f"{steady_mean}, mean shaft power "
            f"{_number(s['mean_shaft_power_W'] / 1e3, 1)} kW.{dominant}</span></div>")


def stale(summary: str) -> str:
    """The summary marked stale (greyed): the entries no longer match it."""
    return summary.replace("<span class='wb-fresh'>",
                           "<span class='wb-stale' style='color:#8a8a8a'>")


def _number(value: float, decimals: int) -> str:
    return f"{value:.{decimals}f}" if math.isfinite(value) else "–"


def table_html(result, rows: int = TABLE_ROWS) -> str:
    """The table: every flagged row (shaded) first, then the first ok rows, with the steady
    flag and the reason a row is not steady."""
    shown = result.table_rows(rows)
    cols = [c for c in _COLUMNS if c[0] in shown.columns]
    head = "".join(f"<th>{html.escape(label)}</th>" for _, label, _ in cols)
    body = []
    for index, row in shown.iterrows():
        good = row["status"] == "ok"
        style = "" if good else f" style='background:{FLAGGED_ROW}'"
        css = "wb-row-ok" if good else "wb-row-flagged"
        steady, steady_text = result.steady_reason(index)
        steady_cell = ("<td class='wb-steady-yes'>yes</td>" if steady else
                       f"<td class='wb-steady-no' style='background:{UNSTEADY_CELL}'>"
                       f"{html.escape(steady_text)}</td>")
        cells = []
        for key, _, fmt in cols:
            v = row.get(key)
            if fmt is None:
                text = "" if v is None else str(v)
                css_cell = " class='wb-msg'" if key == "message" else ""
                cells.append(f"<td{css_cell}>{html.escape(text)}</td>")
            else:
                text = fmt(v) if isinstance(v, float) and math.isfinite(v) else "–"
                cells.append(f"<td class='wb-num'>{html.escape(text)}</td>")
        body.append(f"<tr class='{css}'{style}><td class='wb-num'>{html.escape(str(index))}"
                    f"</td>{steady_cell}{''.join(cells)}</tr>")
    total = len(result.results)
    note = (f"<p class='wb-note'>Showing {len(shown)} of {total} rows: every flagged row "
            "(shaded orange) first, then the first rows that were computed; the CSV has "
            "every row. Cells of unsteady rows are blue-grey.</p>")
    return (note + "<table class='wb-table'><thead><tr><th>row</th><th>steady</th>"
            f"{head}</tr></thead><tbody>{''.join(body)}</tbody></table>")


def title_html(file_name: str) -> str:
    """The panel's heading with the loaded file's name."""
    name = f" <span class='wb-file'>{html.escape(file_name)}</span>" if file_name else ""
    return f"<h3 style='margin:4px 0'>Readings file{name}</h3>"


#: Page styles of the panel (scoped to its own classes).
CSS = """
.wb-panel-test-data { font-size: 13px; color: #222; }
.wb-panel-test-data .widget-html-content { line-height: 1.4; }
.wb-panel-test-data .wb-section { font-weight: 600; margin: 10px 0 4px 0; padding-bottom: 2px;
  border-bottom: 1px solid #d4d8dd; color: #2b3a4a; }
.wb-panel-test-data .wb-head { font-size: 11px; color: #666; text-transform: uppercase;
  letter-spacing: 0.04em; }
.wb-panel-test-data .wb-summary { border-left: 3px solid #2e6b8a; background: #f4f7f9;
  padding: 6px 10px; margin: 6px 0; line-height: 1.5; }
.wb-panel-test-data .wb-note { color: #555; margin: 4px 0; font-size: 12px; }
.wb-panel-test-data .wb-file { font-weight: 400; color: #555; font-size: 14px;
  margin-left: 8px; }
.wb-panel-test-data .wb-table { border-collapse: collapse; font-size: 12px; }
.wb-panel-test-data .wb-table th { position: sticky; top: 0; background: #eef1f4;
  text-align: left; font-weight: 600; border-bottom: 1px solid #c8ced5; }
.wb-panel-test-data .wb-table td, .wb-panel-test-data .wb-table th { padding: 2px 8px;
  white-space: nowrap; vertical-align: top; }
.wb-panel-test-data .wb-table td.wb-msg { white-space: normal; min-width: 260px;
  max-width: 520px; }
.wb-panel-test-data .wb-table tbody tr { border-bottom: 1px solid #eceff2; }
.wb-panel-test-data .wb-table td.wb-num { text-align: right;
  font-variant-numeric: tabular-nums; }
"""

__all__ = ["CSS", "TABLE_ROWS", "stale", "summary_html", "table_html", "title_html"]
