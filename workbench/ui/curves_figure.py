"""The curves dashboard's chart: one plotly FigureWidget, two charts side by side.

The chart descriptions come from the calculation layer (:func:`workbench.curves.charts.
case_charts`, display units m^3/h, m, kJ/kg, kW); this module only puts them into a figure
built once with a fixed pool of traces per chart, changed in place inside ``batch_update``
(a front end only redraws).  Tolerance crosses and flow-limit lines are drawn as traces of
the same pool, so the layout keys never change after the figure is made.
"""

from __future__ import annotations

import math

from .charts import new_figure, sync_figure

#: Traces per chart (series, crosses and limit lines share the pool; the rest are hidden).
POOL = 14
#: Default colours by position (a plain palette of our own).
PALETTE = ("#1f4e79", "#7a7a7a", "#a05a2c", "#3c7d3c", "#6a3d9a", "#8c6d1f", "#2b8a8a")
_AXES = (("x", "y"), ("x2", "y2"))


def make_curves_figure(width: int = 1160, height: int = 560):
    """An empty FigureWidget: two charts side by side, :data:`POOL` hidden traces each."""
    fig = new_figure()
    for panel, (x_axis, y_axis) in enumerate(_AXES):
        for _ in range(POOL):
            fig.add_scatter(x=[], y=[], name="", visible=False, xaxis=x_axis, yaxis=y_axis,
                            legend="legend" if panel == 0 else "legend2", mode="lines")
    fig.update_layout(
        width=width, height=height, margin=dict(l=60, r=20, t=40, b=200),
        template="simple_white",
        xaxis=dict(domain=[0.0, 0.45], title=dict(text=""), rangemode="tozero"),
        yaxis=dict(anchor="x", title=dict(text=""), rangemode="tozero"),
        xaxis2=dict(domain=[0.55, 1.0], title=dict(text=""), rangemode="tozero"),
        yaxis2=dict(anchor="x2", title=dict(text=""), rangemode="tozero"),
        legend=dict(orientation="v", x=0.0, y=-0.16, xanchor="left", yanchor="top",
                    font=dict(size=11)),
        legend2=dict(orientation="v", x=0.55, y=-0.16, xanchor="left", yanchor="top",
                     font=dict(size=11)),
        annotations=[dict(text="", x=x, y=1.0, xref="paper", yref="paper", xanchor="center",
                          yanchor="bottom", showarrow=False, font=dict(size=13))
                     for x in (0.225, 0.775)])
    sync_figure(fig)
    return fig


def _finite(values):
    return [v for v in values if v is not None and math.isfinite(v)]


def _series_traces(chart):
    """Trace property dicts of one chart: series, then crosses, then limit lines."""
    traces = []
    for i, s in enumerate(chart.series):
        color = s.color or PALETTE[i % len(PALETTE)]
        t = dict(x=list(s.x), y=list(s.y), name=s.name, showlegend=True, visible=True,
                 error_y=dict(visible=False, array=[]))
        if s.style == "markers":
            big = color == "#000000"  # the operating or specified point
            t.update(mode="markers", marker=dict(color=color, size=12 if big else 8,
                                                 symbol="diamond" if big else "circle"),
                     line=dict(color=color, width=1, dash="solid"))
            if s.y_error is not None:
                t["error_y"] = dict(visible=True, type="data", array=list(s.y_error),
                                    color=color, thickness=1.5, width=6)
        else:
            t.update(mode="lines", line=dict(color=color, width=2 if s.style == "line" else 1.5,
                                             dash="dash" if s.style == "dashed" else "solid"),
                     marker=dict(color=color, size=6, symbol="circle"))
        traces.append(t)
    for c in chart.crosses:
        traces.append(dict(
            x=[c.x_low, c.x_high, None, c.x, c.x], y=[c.y, c.y, None, c.y_low, c.y_high],
            name=c.name, mode="lines", showlegend=True, visible=True,
            line=dict(color=c.color, width=2.5, dash="solid"),
            marker=dict(color=c.color, size=6, symbol="circle"),
            error_y=dict(visible=False, array=[])))
    ys = _finite([y for s in chart.series for y in s.y]
                 + [v for c in chart.crosses for v in (c.y_low, c.y_high)])
    top = max(ys) * 1.05 if ys else 1.0
    bottom = 0.0 if chart.zero or not ys else min(ys) - 0.05 * (max(ys) - min(ys))
    for i, (x, label) in enumerate(chart.vlines):
        traces.append(dict(x=[x, x], y=[bottom, top], name=label, mode="lines+text",
                           text=["", label], textposition="top left" if i else "top right",
                           showlegend=False,
                           visible=True, line=dict(color="#9a3b00", width=1, dash="dot"),
                           marker=dict(color="#9a3b00", size=1, symbol="circle"),
                           error_y=dict(visible=False, array=[])))
    return traces[:POOL]


def update_curves_figure(fig, charts) -> None:
    """Draw up to two charts (:class:`workbench.curves.charts.Chart`) into ``fig`` in place.

    Parameters
    ----------
    fig : plotly FigureWidget or Figure
        A figure from :func:`make_curves_figure`.
    charts : sequence of Chart
        The first chart goes left, the second right; an absent chart leaves its side empty.
    """
    with fig.batch_update():
        for panel in range(2):
            chart = charts[panel] if panel < len(charts) else None
            traces = _series_traces(chart) if chart is not None else []
            for slot in range(POOL):
                trace = fig.data[panel * POOL + slot]
                if slot < len(traces):
                    trace.update(traces[slot])
                else:
                    trace.update(x=[], y=[], name="", visible=False, showlegend=False)
            x_axis = fig.layout.xaxis if panel == 0 else fig.layout.xaxis2
            y_axis = fig.layout.yaxis if panel == 0 else fig.layout.yaxis2
            x_axis.title.text = chart.x_label if chart is not None else ""
            y_axis.title.text = chart.y_label if chart is not None else ""
            mode = "tozero" if chart is None or chart.zero else "normal"
            x_axis.rangemode = mode
            y_axis.rangemode = mode
            fig.layout.annotations[panel].text = chart.title if chart is not None else ""
    sync_figure(fig)


def trace_data(fig) -> dict:
    """Visible traces by name per chart: ``{(panel, name): (x, y)}`` (for tests and views)."""
    out = {}
    for i, trace in enumerate(fig.data):
        if trace.visible:
            out[(i // POOL, trace.name)] = (tuple(trace.x), tuple(trace.y))
    return out


__all__ = ["POOL", "make_curves_figure", "trace_data", "update_curves_figure"]
