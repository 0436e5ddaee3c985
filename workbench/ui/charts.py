"""Charts of the panels as plotly FigureWidgets: process diagrams, sweeps, trains.

The chart series come from the calculation layer (:func:`workbench.study.process_series`
gives the dome or dew line, isobars and the polytropic path in SI units); these helpers
only convert them to display units and put them into figures.  Each figure is built once
with a fixed set of traces and changed in place inside ``batch_update`` so a front end only
redraws: :func:`update_process_figure` (h-s and T-s diagrams side by side in one
FigureWidget, :func:`make_process_figure`), :func:`update_sweep_figure` (a sweep) and
:func:`update_train_figure` (a train's stage powers and stations).

Every FigureWidget carries the plotly JavaScript bundle (megabytes) to the page, so a panel
should make as few of them as it can, and only when they are shown.
"""

from __future__ import annotations

import numpy as np
import plotly.graph_objects as go

from .common import from_si, unit_label

#: Trace order of each process figure.
TRACE_NAMES = ("saturation dome", "inlet isobar", "outlet isobar", "polytropic path",
               "isentropic line", "inlet / outlet", "isentropic end")

#: Keys of :func:`process_points` in trace order.
_POINT_ORDER = ("dome", "inlet isobar", "outlet isobar", "path", "isentropic", "ends",
                "iso end")


def _trace_styles():
    return [
        dict(mode="lines", line=dict(color="#777777", width=1)),
        dict(mode="lines", line=dict(color="#4a7fb0", width=1, dash="dot")),
        dict(mode="lines", line=dict(color="#b0704a", width=1, dash="dot")),
        dict(mode="lines", line=dict(color="#222222", width=2)),
        dict(mode="lines", line=dict(color="#6a9a5a", width=1, dash="dash")),
        dict(mode="markers+text", marker=dict(color="#222222", size=8),
             textposition="top center"),
        dict(mode="markers", marker=dict(color="#6a9a5a", size=8, symbol="x")),
    ]


_PRELOAD: dict = {}


def preload_figure_widget(background: bool = True):
    """Import plotly's FigureWidget ahead of the first chart (once per process).

    The import is slow (seconds: plotly's renderers import ``nbformat`` and with it
    ``jsonschema``, whose format checks may compile grammars), so a panel that shows its
    numbers first and its charts later starts it in a background thread right after its
    first result; the first chart then does not wait for it.

    Parameters
    ----------
    background : bool
        Import in a daemon thread (True) or now (False).

    Returns
    -------
    threading.Thread or None
        The thread importing, or None when imported already or ``background`` is False.
    """
    import threading

    def run():
        try:
            import plotly.graph_objs._figurewidget  # noqa: F401
        except ImportError:  # no widget front end (anywidget): plain figures are used
            pass

    if _PRELOAD.get("started"):
        return None
    _PRELOAD["started"] = True
    if not background:
        run()
        return None
    thread = threading.Thread(target=run, name="plotly-preload", daemon=True)
    thread.start()
    return thread


def new_figure():
    """A plotly FigureWidget, or a plain Figure when the widget front end (anywidget) is
    not installed; show a plain Figure with :func:`figure_view` / :func:`refresh_view`."""
    try:
        return go.FigureWidget()
    except ImportError:
        return go.Figure()


def figure_view(fig):
    """A widget showing ``fig``: the FigureWidget itself, or an Output widget for a Figure."""
    import ipywidgets as widgets

    if isinstance(fig, widgets.DOMWidget):
        return fig
    view = widgets.Output()
    refresh_view(view, fig)
    return view


def refresh_view(view, fig):
    """Redraw a plain Figure in its Output view (FigureWidgets redraw by themselves)."""
    if view is fig:
        return
    view.clear_output(wait=True)
    with view:
        fig.show()


def make_process_figure(width: int = 1120, height: int = 420):
    """One empty FigureWidget with the h-s diagram (left) and the T-s diagram (right).

    Traces 0 to 6 are the h-s diagram, 7 to 13 the T-s diagram, each in the order of
    :data:`TRACE_NAMES`; a legend entry toggles the curve in both diagrams.
    """
    fig = new_figure()
    for panel, (x_axis, y_axis) in enumerate((("x", "y"), ("x2", "y2"))):
        for name, style in zip(TRACE_NAMES, _trace_styles()):
            fig.add_scatter(x=[], y=[], name=name, legendgroup=name, showlegend=panel == 0,
                            xaxis=x_axis, yaxis=y_axis, **style)
    titles = ("specific enthalpy vs entropy", "temperature vs entropy")
    fig.update_layout(
        width=width, height=height, margin=dict(l=60, r=10, t=36, b=90),
        template="simple_white",
        xaxis=dict(domain=[0.0, 0.45]), yaxis=dict(anchor="x"),
        xaxis2=dict(domain=[0.55, 1.0]), yaxis2=dict(anchor="x2"),
        legend=dict(font=dict(size=10), orientation="h", y=-0.22),
        annotations=[dict(text=t, x=x, y=1.0, xref="paper", yref="paper", xanchor="center",
                          yanchor="bottom", showarrow=False, font=dict(size=13))
                     for t, x in zip(titles, (0.225, 0.775))])
    sync_figure(fig)
    return fig


def _process_xy(points, system):
    """Display-unit ``(x, y)`` lists per trace and the focus ranges, for both diagrams.

    Returns
    -------
    list of tuple
        For the h-s and the T-s diagram: (list of (x, y) per trace, x range, y range).
    """
    out = []
    for y_kind, col in (("specific_enthalpy", 1), ("temperature", 2)):
        traces, focus_x, focus_y = [], [], []
        for key in _POINT_ORDER:
            s, h, T = points[key]
            x = np.asarray(from_si(system, np.asarray(s, dtype=float), "specific_entropy"),
                           dtype=float)
            y = np.asarray(from_si(system, np.asarray((h, T)[col - 1], dtype=float), y_kind),
                           dtype=float)
            traces.append((list(np.atleast_1d(x)), list(np.atleast_1d(y))))
            if key != "dome":
                focus_x.extend(np.atleast_1d(x))
                focus_y.extend(np.atleast_1d(y))
        out.append((traces, _range(focus_x), _range(focus_y)))
    return out


def update_process_figure(fig, points, system="bar, degC"):
    """Put process points into the figure of :func:`make_process_figure`, in place.

    Parameters
    ----------
    fig : plotly.graph_objects.FigureWidget
        From :func:`make_process_figure` (the same object is kept).
    points : dict
        From :func:`process_points`.
    system : str or UnitSystem
        Display unit system of the axes.
    """
    s_unit = unit_label(system, "specific_entropy")
    h_unit = unit_label(system, "specific_enthalpy")
    T_unit = unit_label(system, "temperature")
    n = len(TRACE_NAMES)
    with fig.batch_update():
        for panel, (traces, x_range, y_range) in enumerate(_process_xy(points, system)):
            fig.data[panel * n].name = points.get("dome label", TRACE_NAMES[0])
            for i, (x, y) in enumerate(traces):
                fig.data[panel * n + i].x = x
                fig.data[panel * n + i].y = y
            fig.data[panel * n + 5].text = ["inlet", "outlet"]
            x_axis = fig.layout.xaxis if panel == 0 else fig.layout.xaxis2
            y_axis = fig.layout.yaxis if panel == 0 else fig.layout.yaxis2
            x_axis.title.text = f"specific entropy [{s_unit}]"
            y_axis.title.text = (f"specific enthalpy [{h_unit}]" if panel == 0
                                 else f"temperature [{T_unit}]")
            if x_range:
                x_axis.range = x_range
            if y_range:
                y_axis.range = y_range
    sync_figure(fig)


def _range(values, pad=0.08):
    finite = np.asarray(values, dtype=float)
    finite = finite[np.isfinite(finite)]
    if finite.size == 0:
        return None
    lo, hi = float(finite.min()), float(finite.max())
    span = hi - lo or max(abs(hi), 1.0) * 0.05
    return [lo - pad * span, hi + pad * span]


def sync_figure(fig):
    """Send a FigureWidget's whole data and layout state to the front end.

    In-place updates travel as deltas that a front end only applies to views already on
    the page; a view drawn later (a dashboard loading, a second display) starts from the
    model state, which this keeps current.
    """
    import copy

    try:
        if fig.has_trait("_widget_data"):  # plotly >= 6 (anywidget front end)
            fig._widget_data = copy.deepcopy(fig._data)
            fig._widget_layout = copy.deepcopy(fig._layout_obj._props)
        elif fig.has_trait("_data"):  # plotly 5
            fig.send_state(["_data", "_layout"])
    except (AttributeError, TypeError):
        pass  # a plain Figure, redrawn by refresh_view


def make_sweep_figure(width: int = 700, height: int = 340):
    """An empty FigureWidget for sweep results."""
    fig = new_figure()
    # every layout key a sweep changes exists from the start: a front end refuses a
    # relayout that sets a parent (yaxis2) and its children (yaxis2.overlaying) at once
    fig.update_layout(width=width, height=height, margin=dict(l=60, r=60, t=30, b=90),
                      template="simple_white", title=dict(text="sweep", font=dict(size=13)),
                      xaxis=dict(title=dict(text="")), yaxis=dict(title=dict(text="")),
                      yaxis2=dict(overlaying="y", side="right", visible=False,
                                  title=dict(text="")),
                      legend=dict(orientation="h", y=-0.3))
    sync_figure(fig)
    return fig


def update_sweep_figure(fig, x, columns: dict, x_title: str):
    """Put sweep columns into an existing sweep figure, in place (same figure object).

    Existing traces are reused, missing ones added and extra ones removed; the first
    column is drawn on the left axis, the others on the right axis.

    Parameters
    ----------
    fig : plotly.graph_objects.FigureWidget
        From :func:`make_sweep_figure` or :func:`sweep_figure`.
    x : sequence of float
        Swept input values in display units.
    columns : dict
        Column name (with its unit) -> values in display units; NaN values are gaps.
    x_title : str
        Title of the x axis (name and unit of the swept input).
    """
    names = list(columns)
    x = [float(v) for v in x]
    # traces are added and removed first, each its own message (a front end applies an
    # added trace reliably only outside a batch); then values and layout in one batch
    if len(fig.data) > len(names):
        fig.data = fig.data[:len(names)]
    for i in range(len(fig.data), len(names)):
        fig.add_scatter(x=[], y=[], name=names[i], mode="lines+markers", connectgaps=False,
                        yaxis="y" if i == 0 else "y2")
    with fig.batch_update():
        for i, (name, values) in enumerate(columns.items()):
            trace = fig.data[i]
            trace.x, trace.y = x, [float(v) for v in values]
            trace.name, trace.yaxis = name, "y" if i == 0 else "y2"
        layout = fig.layout
        layout.xaxis.title.text = x_title
        layout.yaxis.title.text = names[0] if names else ""
        layout.yaxis2.overlaying, layout.yaxis2.side = "y", "right"
        layout.yaxis2.visible = len(names) > 1
        layout.yaxis2.title.text = ", ".join(names[1:])
        layout.legend.orientation, layout.legend.y = "h", -0.3
    sync_figure(fig)


def make_train_figure(width: int = 1040, height: int = 380):
    """One empty FigureWidget with a train's stage shaft powers as bars (left) and its
    stations on the h-s chart (right): traces ``shaft power``, ``main line``, ``branches``."""
    fig = new_figure()
    fig.add_bar(x=[], y=[], name="shaft power", marker=dict(color="#4a7fb0"), xaxis="x",
                yaxis="y", showlegend=False)
    fig.add_scatter(x=[], y=[], mode="lines+markers+text", name="main line",
                    textposition="top center", line=dict(color="#222222", width=1.5),
                    marker=dict(color="#222222", size=7), xaxis="x2", yaxis="y2")
    fig.add_scatter(x=[], y=[], mode="markers", name="branches", xaxis="x2", yaxis="y2",
                    marker=dict(symbol="diamond", size=10, color="#b0704a"))
    fig.update_layout(
        height=height, width=width, margin=dict(l=70, r=10, t=40, b=50),
        template="simple_white",
        xaxis=dict(domain=[0.0, 0.36]), yaxis=dict(anchor="x", title=dict(text="")),
        xaxis2=dict(domain=[0.46, 1.0], title=dict(text="")),
        yaxis2=dict(anchor="x2", title=dict(text="")),
        legend=dict(orientation="h", y=-0.18, x=0.46, font=dict(size=10)),
        annotations=[dict(text=t, x=x, y=1.02, xref="paper", yref="paper", xanchor="center",
                          yanchor="bottom", showarrow=False, font=dict(size=13))
                     for t, x in (("shaft power of each stage", 0.18),
                                  ("every station on the h-s chart", 0.73))])
    sync_figure(fig)
    return fig


def update_train_figure(fig, series: dict, system="bar, degC"):
    """Put a train's chart series [SI] into the figure of :func:`make_train_figure`.

    Parameters
    ----------
    fig : plotly.graph_objects.FigureWidget
        From :func:`make_train_figure` (the same object is kept).
    series : dict
        ``"names"`` and ``"shaft_power"`` [W] of the stages, ``"main"`` and ``"branches"``
        as ``(s, h)`` arrays [J/(kg K), J/kg] (from :func:`workbench.train_study.train_series`).
    system : str or UnitSystem
        Display unit system.
    """
    def hs(key):
        s, h = series[key]
        return (list(np.atleast_1d(from_si(system, np.asarray(s, float), "specific_entropy"))),
                list(np.atleast_1d(from_si(system, np.asarray(h, float), "specific_enthalpy"))))

    with fig.batch_update():
        bars, line, branches = fig.data[:3]
        bars.x = list(series["names"])
        bars.y = list(np.atleast_1d(from_si(system, np.asarray(series["shaft_power"], float),
                                            "power")))
        line.x, line.y = hs("main")
        line.text = [str(i) for i in range(len(line.x))]
        branches.x, branches.y = hs("branches")
        fig.layout.yaxis.title.text = f"shaft power [{unit_label(system, 'power')}]"
        fig.layout.xaxis2.title.text = (
            f"specific entropy [{unit_label(system, 'specific_entropy')}]")
        fig.layout.yaxis2.title.text = (
            f"specific enthalpy [{unit_label(system, 'specific_enthalpy')}]")
    sync_figure(fig)
