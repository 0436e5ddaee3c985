"""Chart data of a curves case in display units: the one place that decides what is drawn.

:func:`case_charts` turns an evaluated curves case into plain chart descriptions (series of
numbers, tolerance crosses, limit lines) in display units (m^3/h, m, kJ/kg, kW, bar, degC,
rpm).  The HTML report draws them as SVG (:mod:`.svg`); a panel can draw the same
descriptions with its own plotting library without computing anything.
"""

from __future__ import annotations

import html
import math
from dataclasses import dataclass

import numpy as np

from ..units import RPM
from .characteristic import HEAD_WORDS

#: Display unit and conversion from SI of each kind of quantity.
DISPLAY = {
    "volume_flow": ("m³/h", lambda v: v * 3600.0),
    "power": ("kW", lambda v: v / 1e3),
    "heat_flow": ("kW", lambda v: v / 1e3),
    "specific_energy": ("kJ/kg", lambda v: v / 1e3),
    "specific_enthalpy": ("kJ/kg", lambda v: v / 1e3),
    "pressure": ("bar", lambda v: v / 1e5),
    "temperature": ("°C", lambda v: v - 273.15),
    "rotational_speed": ("rpm", lambda v: v / RPM),
    "length": ("m", lambda v: v),
    "velocity": ("m/s", lambda v: v),
    "mass_flow": ("kg/s", lambda v: v),
    "density": ("kg/m³", lambda v: v),
    "dimensionless": ("-", lambda v: v),
}
HEAD_KIND = {"pump": "length", "fan": "pressure", "compressor": "specific_energy"}


@dataclass(frozen=True)
class Series:
    """One series of a chart (display units).

    Attributes
    ----------
    name : str
        Legend text.
    x, y : tuple of float
        Points; non-finite points are left out when drawn.
    style : str
        "line", "dashed" or "markers".
    color : str
        Colour, default by position in the chart.
    y_error : tuple of float, optional
        Half-widths of vertical error bars (markers), e.g. U95.
    """

    name: str
    x: tuple
    y: tuple
    style: str = "line"
    color: str = ""
    y_error: tuple | None = None


@dataclass(frozen=True)
class Cross:
    """A tolerance cross: horizontal bar x_low..x_high at y, vertical bar y_low..y_high at x."""

    name: str
    x: float
    y: float
    x_low: float
    x_high: float
    y_low: float
    y_high: float
    color: str = "#c00000"


@dataclass(frozen=True)
class Chart:
    """One chart: what to draw and its labels (display units).

    Attributes
    ----------
    key : str
        "head", "npsh", "acceptance", "compressor_head" or "compressor_efficiency".
    title, x_label, y_label : str
    series : tuple of Series
    crosses : tuple of Cross
    vlines : tuple of (float, str)
        Vertical limit lines (minimum flow or surge, maximum flow).
    zero : bool
        Whether the axes start at zero.
    """

    key: str
    title: str
    x_label: str
    y_label: str
    series: tuple
    crosses: tuple = ()
    vlines: tuple = ()
    zero: bool = True


def unit(kind: str) -> str:
    """Display unit of a kind of quantity."""
    return DISPLAY.get(kind, ("", None))[0]


def to_display(value, kind: str) -> float:
    """A SI value in the display unit of its kind."""
    return DISPLAY.get(kind, ("", lambda v: v))[1](float(value))


def show(value, kind: str, fmt: str = ".4g") -> str:
    """A SI value as display text (an en dash for None or NaN; text escaped for HTML)."""
    if value is None:
        return "\u2013"
    if isinstance(value, str):
        return html.escape(value)
    if isinstance(value, (bool, np.bool_)):
        return "yes" if value else "no"
    value = float(value)
    if not math.isfinite(value):
        return "\u2013"
    return format(to_display(value, kind), fmt)


def header(kind: str, label: str) -> str:
    """Column or axis header with the display unit, e.g. ``"flow [m³/h]"``."""
    u = unit(kind)
    return f"{label} [{u}]" if u and u != "-" else f"{label} [-]"


def _conv(kind, values):
    return tuple(to_display(v, kind) for v in values)


def curve_series(curve, name, kind, quantity="head", color="", points=80) -> Series:
    """The fitted curve of a quantity over its flow range, as a Series."""
    q = np.linspace(curve.flow[0], curve.flow[-1], points)
    return Series(name, _conv("volume_flow", q), _conv(kind, curve.value(quantity, q)),
                  color=color)


def _limits(curve, low_word):
    return ((to_display(curve.min_flow, "volume_flow"), low_word),
            (to_display(curve.max_flow, "volume_flow"), "max. flow"))


def _machine_charts(result):
    curve, system, point = result.curve, result.system, result.operating_point
    kind = HEAD_KIND[curve.machine]
    series = [curve_series(curve, "datasheet curve", kind),
              Series("datasheet points", _conv("volume_flow", curve.flow),
                     _conv(kind, curve.points("head")), style="markers")]
    if system is not None:
        q = np.linspace(0.0, curve.flow[-1], 60)
        h = system.head(q) if curve.machine == "pump" else system.pressure(q)
        series.append(Series("system curve", _conv("volume_flow", q), _conv(kind, h),
                             style="dashed"))
    if point is not None:
        y = point.total_head if curve.machine == "pump" else point.pressure_rise
        series.append(Series("operating point", _conv("volume_flow", [point.volume_flow]),
                             _conv(kind, [y]), style="markers", color="#000000"))
    charts = [Chart("head", "Head against flow", header("volume_flow", "flow"),
                    header(kind, HEAD_WORDS[curve.machine]), tuple(series),
                    vlines=_limits(curve, "min. flow"))]
    if (point is not None and point.npsh_available is not None
            and "npsh_required" in curve.quantities):
        q = np.linspace(max(curve.flow[0], 1e-9), curve.flow[-1], 40)
        npsha = tuple(system.npsh_available(x) for x in q)
        charts.append(Chart("npsh", "Suction head", header("volume_flow", "flow"),
                            "NPSH [m]", (Series("NPSH available", _conv("volume_flow", q),
                                                npsha),
                                         curve_series(curve, "NPSH required", "length",
                                                      "npsh_required"))))
    return charts


def _acceptance_chart(acc):
    g = acc.grade
    ql, qh, hl, hh = acc.cross
    fq = DISPLAY["volume_flow"][1]
    series = (curve_series(acc.curve, "fitted test curve", "length"),
              Series("test points at rated speed", _conv("volume_flow", acc.flow),
                     tuple(float(h) for h in acc.head), style="markers"),
              Series("line through origin and guarantee", (0.0, fq(acc.check_flow)),
                     (0.0, acc.check_head), style="dashed", color="#7f7f7f"))
    cross = Cross(f"tolerance cross, grade {g.name}", fq(acc.guarantee_flow),
                  acc.guarantee_head, fq(ql), fq(qh), hl, hh)
    return Chart("acceptance", f"Test against guarantee, grade {g.name}",
                 header("volume_flow", "flow"), "pump total head [m]", series, (cross,))


def _compressor_charts(result):
    curve, sim = result.curve, result.similarity
    fq, fh = DISPLAY["volume_flow"][1], DISPLAY["specific_energy"][1]
    vlines = _limits(curve, "surge")
    head = [curve_series(curve, "datasheet curve", "specific_energy"),
            Series("datasheet points", _conv("volume_flow", curve.flow),
                   _conv("specific_energy", curve.points("head")), style="markers")]
    eff = []
    if sim is not None:
        u = sim.uncertainty.expanded if sim.uncertainty is not None else {}
        c, s = sim.converted, sim.specified
        head += [Series("specified point", (fq(s.volume_flow),), (fh(s.polytropic_head),),
                        style="markers", color="#000000"),
                 Series("test converted (U95)", (fq(c.volume_flow),), (fh(c.polytropic_head),),
                        style="markers", color="#c00000",
                        y_error=(fh(u.get("polytropic_head", 0.0)),))]
        if "efficiency" in curve.quantities:
            eff = [curve_series(curve, "datasheet curve", "dimensionless", "efficiency"),
                   Series("specified point", (fq(s.volume_flow),), (s.polytropic_efficiency,),
                          style="markers", color="#000000"),
                   Series("test converted (U95)", (fq(c.volume_flow),),
                          (c.polytropic_efficiency,), style="markers", color="#c00000",
                          y_error=(u.get("polytropic_efficiency", 0.0),))]
    charts = [Chart("compressor_head", "Polytropic head against inlet flow",
                    header("volume_flow", "inlet flow"),
                    header("specific_energy", "polytropic head"), tuple(head), vlines=vlines,
                    zero=False)]
    if eff:
        charts.append(Chart("compressor_efficiency", "Polytropic efficiency against inlet flow",
                            header("volume_flow", "inlet flow"), "polytropic efficiency [-]",
                            tuple(eff), vlines=vlines, zero=False))
    return charts


def case_charts(result) -> tuple:
    """The charts of an evaluated curves case (display units).

    Parameters
    ----------
    result : CurvesCaseResult

    Returns
    -------
    tuple of Chart
        Pumps and fans: "head" (curve, points, system curve, operating point, flow limits),
        "npsh" where the data allow, "acceptance" (translated test points, fitted curve,
        tolerance cross, the line through the origin).  Compressors: "compressor_head" and
        "compressor_efficiency" (datasheet curve, specified point, converted test with U95).
    """
    if result.kind == "compressor":
        return tuple(_compressor_charts(result))
    charts = _machine_charts(result)
    if result.acceptance is not None:
        charts.append(_acceptance_chart(result.acceptance))
    return tuple(charts)


__all__ = ["Chart", "Cross", "DISPLAY", "Series", "case_charts", "curve_series", "header",
           "show", "to_display", "unit"]
