"""Process charts of the machine panel: h-s and T-s diagrams as plotly FigureWidgets.

The point helpers only turn states from the calculation layer (``Fluid.saturation_curve``,
``Fluid.isobar``, ``polytropic.polytropic_path``) into arrays for plotting.  The figures are
built once with a fixed set of traces; :func:`update_process_figure` (both diagrams side by
side in one FigureWidget, :func:`make_process_figure`) and :func:`update_process_figures`
(one FigureWidget per diagram) change the traces in place inside ``batch_update`` so a front
end only redraws.  :func:`update_sweep_figure` does the same for a sweep figure.

Every FigureWidget carries the plotly JavaScript bundle (megabytes) to the page, so a panel
should make as few of them as it can, and only when they are shown.
"""

from __future__ import annotations

import math

import numpy as np
import plotly.graph_objects as go

from ..errors import WorkbenchError
from ..polytropic import polytropic_path
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

def _arrays(states):
    """(s, h, T) arrays in SI units of a list of states; ``None`` entries become NaN."""
    rows = [(st.s, st.h, st.T) if st is not None else (math.nan,) * 3 for st in states]
    arr = np.array(rows, dtype=float).reshape(-1, 3)
    return arr[:, 0], arr[:, 1], arr[:, 2]


def dome_points(fluid, points: int = 40):
    """Saturation dome of a pure fluid, or a mixture's dew line, as ``(s, h, T)`` arrays."""
    return _arrays(fluid.saturation_curve(points))


def isobar_points(fluid, pressure: float, s_low: float, s_high: float, points: int = 16):
    """``(s, h, T)`` arrays along an isobar; points the model cannot resolve are NaN."""
    return _arrays(fluid.isobar(float(pressure), float(s_low), float(s_high), points))


def polytropic_path_points(result, efficiency: float | None = None, steps: int = 12):
    """``(s, h, T)`` arrays of the result's polytropic path from inlet to outlet pressure."""
    eta = result.polytropic_efficiency if efficiency is None else efficiency
    try:
        states = polytropic_path(result.inlet, result.outlet.P, eta, steps)
    except WorkbenchError:
        states = [result.inlet]
    return _arrays(states)


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


def make_process_figures(width: int = 560, height: int = 400):
    """Two empty FigureWidgets (h-s, T-s) with the traces of :data:`TRACE_NAMES`."""
    figures = []
    for y_title in ("specific enthalpy", "temperature"):
        fig = new_figure()
        for name, style in zip(TRACE_NAMES, _trace_styles()):
            fig.add_scatter(x=[], y=[], name=name, **style)
        fig.update_layout(width=width, height=height, margin=dict(l=60, r=10, t=30, b=90),
                          title=dict(text=f"{y_title} vs entropy", font=dict(size=13)),
                          legend=dict(font=dict(size=10), orientation="h", y=-0.22),
                          template="simple_white")
        sync_figure(fig)
        figures.append(fig)
    return figures


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


def process_points(result, path_steps: int = 12):
    """All chart points of a result in SI units, as a dict of ``(s, h, T)`` arrays."""
    fluid = result.inlet.fluid
    a, b, iso = result.inlet, result.outlet, result.isentropic_outlet
    s_lo = min(a.s, b.s, iso.s)
    s_hi = max(a.s, b.s, iso.s)
    span = max(s_hi - s_lo, 1.0)
    s_lo, s_hi = s_lo - 0.15 * span, s_hi + 0.15 * span
    pts = {
        "dome": dome_points(fluid),
        "inlet isobar": isobar_points(fluid, a.P, s_lo, s_hi),
        "outlet isobar": isobar_points(fluid, b.P, s_lo, s_hi),
        "path": polytropic_path_points(result, steps=path_steps),
        "isentropic": (np.array([a.s, iso.s]), np.array([a.h, iso.h]), np.array([a.T, iso.T])),
        "ends": (np.array([a.s, b.s]), np.array([a.h, b.h]), np.array([a.T, b.T])),
        "iso end": (np.array([iso.s]), np.array([iso.h]), np.array([iso.T])),
        # legend name of the first trace: a mixture is supported above its dew line only
        "dome label": "dew line" if fluid.is_mixture else TRACE_NAMES[0],
    }
    return pts


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


def update_process_figures(figures, points, system="bar, degC"):
    """Put process points into the two figures in place (same figure objects).

    Parameters
    ----------
    figures : list of plotly.graph_objects.FigureWidget
        From :func:`make_process_figures`.
    points : dict
        From :func:`process_points`.
    system : str or UnitSystem
        Display unit system of the axes.
    """
    order = ("dome", "inlet isobar", "outlet isobar", "path", "isentropic", "ends", "iso end")
    s_unit = unit_label(system, "specific_entropy")
    h_unit = unit_label(system, "specific_enthalpy")
    T_unit = unit_label(system, "temperature")
    for fig, y_kind, col in ((figures[0], "specific_enthalpy", 1),
                             (figures[1], "temperature", 2)):
        focus_x, focus_y = [], []
        with fig.batch_update():
            fig.data[0].name = points.get("dome label", TRACE_NAMES[0])
            for i, key in enumerate(order):
                s, h, T = points[key]
                x = from_si(system, np.asarray(s, dtype=float), "specific_entropy")
                y = from_si(system, np.asarray((h, T)[col - 1], dtype=float), y_kind)
                fig.data[i].x = list(np.asarray(x, dtype=float))
                fig.data[i].y = list(np.asarray(y, dtype=float))
                if key != "dome":
                    focus_x.extend(np.atleast_1d(x))
                    focus_y.extend(np.atleast_1d(y))
            fig.data[5].text = ["inlet", "outlet"]
            fig.layout.xaxis.title.text = f"specific entropy [{s_unit}]"
            fig.layout.yaxis.title.text = (f"specific enthalpy [{h_unit}]" if col == 1
                                           else f"temperature [{T_unit}]")
            x_range, y_range = _range(focus_x), _range(focus_y)
            if x_range:
                fig.layout.xaxis.range = x_range
            if y_range:
                fig.layout.yaxis.range = y_range
        sync_figure(fig)


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


def sweep_figure(x, columns: dict, x_title: str, width: int = 700, height: int = 340):
    """A new FigureWidget of sweep columns against ``x`` (NaN rows are gaps).

    Built whole with its data, so a front end draws it from its initial state; later
    sweeps go into the same figure with :func:`update_sweep_figure`.
    """
    fig = make_sweep_figure(width, height)
    update_sweep_figure(fig, x, columns, x_title)
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
