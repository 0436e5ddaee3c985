"""The readings dashboard's charts: one plotly FigureWidget, efficiency and shaft power.

Both charts are subplots of one FigureWidget (each FigureWidget carries megabytes of
JavaScript to the page).  Rows that are not ok are left out; steady rows are filled dots,
unsteady rows hollow grey rings; the sampled rows carry their U95 error bars; the design point
is a diamond.  The figure is built once and :func:`update_readings_figure` changes its traces
in place.  The series come from
:meth:`workbench.fieldtest.session.SessionResult.chart_series` in SI units; this module only
scales them to the axes' units (m³/h, %, kW).
"""

from __future__ import annotations

import numpy as np

from .charts import new_figure, sync_figure

#: Traces of each chart, in order: trace ``i`` of the efficiency chart is ``data[i]``, of
#: the shaft-power chart ``data[len(READINGS_TRACES) + i]``.
READINGS_TRACES = ("steady rows", "unsteady rows", "U95 at sampled rows", "design point")
#: Charts in figure order: key of the session's chart series, title, axis title, and the
#: factor from SI to the axis unit.
CHARTS = (("efficiency", "Isentropic efficiency", "isentropic efficiency [%]", 100.0),
          ("shaft_power", "Shaft power", "shaft power [kW]", 1e-3))
#: Factor from m³/s to the flow axis unit (m³/h): 1 h = 3600 s.
FLOW_FACTOR = 3600.0

#: Colours of the traces (our own plain palette).
STEADY_COLOUR = "#2e6b8a"
UNSTEADY_COLOUR = "#8f8f8f"
BAR_COLOUR = "#303030"
DESIGN_COLOUR = "#c2461f"


def _styles():
    return (
        dict(mode="markers", marker=dict(color=STEADY_COLOUR, size=6, opacity=0.85)),
        dict(mode="markers", marker=dict(color=UNSTEADY_COLOUR, size=7, symbol="circle-open",
                                         line=dict(width=1.2))),
        dict(mode="markers", marker=dict(color=BAR_COLOUR, size=4, symbol="square"),
             error_y=dict(type="data", array=[], visible=True, thickness=1.2, width=4,
                          color=BAR_COLOUR)),
        dict(mode="markers", marker=dict(color=DESIGN_COLOUR, size=13, symbol="diamond",
                                         line=dict(color="#ffffff", width=1.5))),
    )


def make_readings_figure(width: int = 1300, height: int = 440):
    """One FigureWidget with the efficiency and shaft-power charts as two subplots."""
    fig = new_figure()
    fig.set_subplots(rows=1, cols=2, horizontal_spacing=0.09,
                     subplot_titles=tuple(title for _, title, _, _ in CHARTS))
    for col in (1, 2):
        for name, style in zip(READINGS_TRACES, _styles()):
            fig.add_scatter(x=[], y=[], name=name, legendgroup=name, showlegend=col == 1,
                            row=1, col=col, **style)
    fig.update_layout(
        width=width, height=height, template="simple_white",
        margin=dict(l=64, r=24, t=36, b=96), font=dict(size=12),
        legend=dict(orientation="h", x=0.0, y=-0.2, font=dict(size=11)),
        hovermode="closest")
    fig.update_annotations(font=dict(size=13))
    fig.update_xaxes(title_text="inlet volume flow [m³/h]", showgrid=True, gridcolor="#ececec")
    fig.update_yaxes(showgrid=True, gridcolor="#ececec")
    for col, (_, _, axis_title, _) in enumerate(CHARTS, start=1):
        fig.update_yaxes(title_text=axis_title, row=1, col=col)
    sync_figure(fig)
    return fig


def update_readings_figure(fig, series: dict):
    """Put a session's chart series into the figure's existing traces (in place, one batch).

    Parameters
    ----------
    fig : plotly.graph_objects.FigureWidget
        From :func:`make_readings_figure`.
    series : dict
        :meth:`~workbench.fieldtest.session.SessionResult.chart_series` (SI units); a trace
        missing from a chart is emptied.
    """
    n = len(READINGS_TRACES)
    with fig.batch_update():
        for offset, (chart, _, _, factor) in zip((0, n), CHARTS):
            for i, name in enumerate(READINGS_TRACES):
                x, y, error = series[chart].get(name, ([], [], None))
                trace = fig.data[offset + i]
                trace.x = FLOW_FACTOR * np.asarray(x, dtype=float)
                trace.y = factor * np.asarray(y, dtype=float)
                if error is not None:
                    trace.error_y.array = factor * np.asarray(error, dtype=float)
    sync_figure(fig)


__all__ = ["CHARTS", "READINGS_TRACES", "make_readings_figure", "update_readings_figure"]
