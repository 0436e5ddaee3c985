"""Small line charts as inline SVG text, for reports that open without a server or Python.

No plotting library: the charts are plain SVG elements (polylines, circles, lines, text)
with "nice" axis ticks, so a report is one self-contained HTML file.  All text is escaped.
"""

from __future__ import annotations

import html
import math
from dataclasses import dataclass

#: Plain colours of our own for the series, in order of use.
PALETTE = ("#1f4e79", "#c55a11", "#548235", "#7f6000", "#7030a0", "#404040")


@dataclass(frozen=True)
class Series:
    """One series of a chart (display units).

    Attributes
    ----------
    name : str
        Legend text.
    x, y : tuple of float
        Points; non-finite points are left out.
    style : str
        "line", "dashed" or "markers".
    color : str
        SVG colour, default from :data:`PALETTE` by position.
    y_error : tuple of float, optional
        Half-widths of vertical error bars (markers).
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


def nice_ticks(low: float, high: float, count: int = 6) -> list[float]:
    """Round tick values covering [low, high] (1, 2, 2.5, 5 x 10^k steps)."""
    if not (math.isfinite(low) and math.isfinite(high)):
        return [0.0, 1.0]
    if high <= low:
        high = low + (abs(low) or 1.0)
    raw = (high - low) / max(count - 1, 1)
    power = 10 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1, 2, 2.5, 5, 10) if m * power >= raw)
    start = math.floor(low / step) * step
    ticks = []
    value = start
    while value <= high + 1e-9 * step and len(ticks) < 50:
        ticks.append(round(value, 12))
        value += step
    if ticks[-1] < high:
        ticks.append(round(value, 12))
    return ticks


def _fmt(value: float) -> str:
    return f"{value:.4g}"


def _finite_points(s):
    return [(float(x), float(y)) for x, y in zip(s.x, s.y)
            if x is not None and y is not None and math.isfinite(x) and math.isfinite(y)]


def line_chart(series, *, title: str, x_label: str, y_label: str, crosses=(), vlines=(),
               zero: bool = True, width: int = 760, height: int = 380) -> str:
    """An SVG line chart as text.

    Parameters
    ----------
    series : sequence of Series
    title, x_label, y_label : str
        Chart title and axis labels (with their units).
    crosses : sequence of Cross
    vlines : sequence of (float, str)
        Vertical lines at x with a label (limits).
    zero : bool
        Start both axes at zero (else the axes span the data only).
    width, height : int
        Size in pixels.

    Returns
    -------
    str
        ``<svg ...>...</svg>``
    """
    pts = [p for s in series for p in _finite_points(s)]
    xs = [p[0] for p in pts] + [c.x_low for c in crosses] + [c.x_high for c in crosses] + \
        [v[0] for v in vlines]
    ys = [p[1] for p in pts] + [c.y_low for c in crosses] + [c.y_high for c in crosses]
    for s in series:
        if s.y_error:
            ys += [y + e for y, e in zip(s.y, s.y_error)] + [y - e for y, e in zip(s.y,
                                                                                  s.y_error)]
    xs = [v for v in xs if math.isfinite(v)] or [0.0, 1.0]
    ys = [v for v in ys if math.isfinite(v)] or [0.0, 1.0]
    x_low, y_low = min(xs), min(ys)
    if zero:
        x_low, y_low = min(x_low, 0.0), min(y_low, 0.0)
    xt = nice_ticks(x_low, max(xs))
    yt = nice_ticks(y_low, max(ys))
    left, right, top, bottom = 70, 250, 34, 50
    pw, ph = width - left - right, height - top - bottom

    def X(x):
        return left + (x - xt[0]) / (xt[-1] - xt[0]) * pw

    def Y(y):
        return top + ph - (y - yt[0]) / (yt[-1] - yt[0]) * ph

    esc = html.escape
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
           f'viewBox="0 0 {width} {height}" role="img" aria-label="{esc(title)}" '
           'font-family="sans-serif" font-size="12">',
           f'<text x="{left}" y="20" font-size="14" font-weight="bold">{esc(title)}</text>',
           f'<rect x="{left}" y="{top}" width="{pw}" height="{ph}" fill="none" '
           'stroke="#808080"/>']
    for t in xt:
        out.append(f'<line x1="{X(t):.1f}" y1="{top}" x2="{X(t):.1f}" y2="{top + ph}" '
                   'stroke="#e0e0e0"/>')
        out.append(f'<text x="{X(t):.1f}" y="{top + ph + 16}" text-anchor="middle">'
                   f'{_fmt(t)}</text>')
    for t in yt:
        out.append(f'<line x1="{left}" y1="{Y(t):.1f}" x2="{left + pw}" y2="{Y(t):.1f}" '
                   'stroke="#e0e0e0"/>')
        out.append(f'<text x="{left - 6}" y="{Y(t) + 4:.1f}" text-anchor="end">{_fmt(t)}'
                   '</text>')
    out.append(f'<text x="{left + pw / 2:.1f}" y="{height - 10}" text-anchor="middle">'
               f'{esc(x_label)}</text>')
    out.append(f'<text transform="translate(16,{top + ph / 2:.1f}) rotate(-90)" '
               f'text-anchor="middle">{esc(y_label)}</text>')
    legend = []
    for x, label in vlines:
        if math.isfinite(x):
            out.append(f'<line x1="{X(x):.1f}" y1="{top}" x2="{X(x):.1f}" y2="{top + ph}" '
                       'stroke="#7f7f7f" stroke-dasharray="2,3"/>')
            out.append(f'<text x="{X(x) + 3:.1f}" y="{top + 12}" fill="#595959">'
                       f'{esc(label)}</text>')
    for i, s in enumerate(series):
        color = s.color or PALETTE[i % len(PALETTE)]
        points = _finite_points(s)
        if not points:
            continue
        if s.style in ("line", "dashed"):
            path = " ".join(f"{X(x):.1f},{Y(y):.1f}" for x, y in points)
            dash = ' stroke-dasharray="6,4"' if s.style == "dashed" else ""
            out.append(f'<polyline points="{path}" fill="none" stroke="{color}" '
                       f'stroke-width="2"{dash}/>')
        else:
            errors = s.y_error or (0.0,) * len(s.x)
            for (x, y), e in zip(points, errors):
                if e and math.isfinite(e):
                    out.append(f'<line x1="{X(x):.1f}" y1="{Y(y - e):.1f}" x2="{X(x):.1f}" '
                               f'y2="{Y(y + e):.1f}" stroke="{color}"/>')
                out.append(f'<circle cx="{X(x):.1f}" cy="{Y(y):.1f}" r="4" fill="{color}"/>')
        legend.append((s.name, color, s.style))
    for c in crosses:
        out.append(f'<line x1="{X(c.x_low):.1f}" y1="{Y(c.y):.1f}" x2="{X(c.x_high):.1f}" '
                   f'y2="{Y(c.y):.1f}" stroke="{c.color}" stroke-width="2"/>')
        out.append(f'<line x1="{X(c.x):.1f}" y1="{Y(c.y_low):.1f}" x2="{X(c.x):.1f}" '
                   f'y2="{Y(c.y_high):.1f}" stroke="{c.color}" stroke-width="2"/>')
        legend.append((c.name, c.color, "cross"))
    for i, (name, color, style) in enumerate(legend):
        y = top + 10 + 18 * i
        x = left + pw + 12
        if style == "markers":
            out.append(f'<circle cx="{x + 10}" cy="{y}" r="4" fill="{color}"/>')
        else:
            dash = ' stroke-dasharray="6,4"' if style == "dashed" else ""
            out.append(f'<line x1="{x}" y1="{y}" x2="{x + 20}" y2="{y}" stroke="{color}" '
                       f'stroke-width="2"{dash}/>')
        out.append(f'<text x="{x + 26}" y="{y + 4}">{esc(name)}</text>')
    out.append("</svg>")
    return "\n".join(out)


__all__ = ["Cross", "PALETTE", "Series", "line_chart", "nice_ticks"]
