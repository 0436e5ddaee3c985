"""Small line charts as inline SVG text, for reports that open without a server or Python.

No plotting library: the charts are plain SVG elements (polylines, circles, lines, text)
with "nice" axis ticks, so a report is one self-contained HTML file.  All text is escaped.
"""

from __future__ import annotations

import html
import math

from .charts import Chart, Cross, Series

#: Plain colours of our own for the series, in order of use.
PALETTE = ("#1f4e79", "#c55a11", "#548235", "#7f6000", "#7030a0", "#404040")


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


def _ranges(chart):
    pts = [p for s in chart.series for p in _finite_points(s)]
    xs = [p[0] for p in pts] + [v for c in chart.crosses for v in (c.x_low, c.x_high)] + \
        [v[0] for v in chart.vlines]
    ys = [p[1] for p in pts] + [v for c in chart.crosses for v in (c.y_low, c.y_high)]
    for s in chart.series:
        if s.y_error:
            ys += [y + e for y, e in zip(s.y, s.y_error)] + [y - e for y, e in zip(s.y,
                                                                                  s.y_error)]
    xs = [v for v in xs if math.isfinite(v)] or [0.0, 1.0]
    ys = [v for v in ys if math.isfinite(v)] or [0.0, 1.0]
    x_low, y_low = min(xs), min(ys)
    if chart.zero:
        x_low, y_low = min(x_low, 0.0), min(y_low, 0.0)
    return nice_ticks(x_low, max(xs)), nice_ticks(y_low, max(ys))


class _Frame:
    """Pixel mapping of a plot area."""

    def __init__(self, xt, yt, width, height):
        self.xt, self.yt = xt, yt
        self.left, self.top = 70, 34
        self.pw, self.ph = width - 70 - 250, height - 34 - 50
        self.width, self.height = width, height

    def X(self, x):
        return self.left + (x - self.xt[0]) / (self.xt[-1] - self.xt[0]) * self.pw

    def Y(self, y):
        return self.top + self.ph - (y - self.yt[0]) / (self.yt[-1] - self.yt[0]) * self.ph


def _axes(f: _Frame, chart: Chart) -> list[str]:
    esc = html.escape
    out = [f'<text x="{f.left}" y="20" font-size="14" font-weight="bold">'
           f'{esc(chart.title)}</text>',
           f'<rect x="{f.left}" y="{f.top}" width="{f.pw}" height="{f.ph}" fill="none" '
           'stroke="#808080"/>']
    bottom = f.top + f.ph
    for t in f.xt:
        out.append(f'<line x1="{f.X(t):.1f}" y1="{f.top}" x2="{f.X(t):.1f}" y2="{bottom}" '
                   f'stroke="#e0e0e0"/><text x="{f.X(t):.1f}" y="{bottom + 16}" '
                   f'text-anchor="middle">{_fmt(t)}</text>')
    for t in f.yt:
        out.append(f'<line x1="{f.left}" y1="{f.Y(t):.1f}" x2="{f.left + f.pw}" '
                   f'y2="{f.Y(t):.1f}" stroke="#e0e0e0"/><text x="{f.left - 6}" '
                   f'y="{f.Y(t) + 4:.1f}" text-anchor="end">{_fmt(t)}</text>')
    out.append(f'<text x="{f.left + f.pw / 2:.1f}" y="{f.height - 10}" '
               f'text-anchor="middle">{esc(chart.x_label)}</text>')
    out.append(f'<text transform="translate(16,{f.top + f.ph / 2:.1f}) rotate(-90)" '
               f'text-anchor="middle">{esc(chart.y_label)}</text>')
    for x, label in chart.vlines:
        if math.isfinite(x):
            out.append(f'<line x1="{f.X(x):.1f}" y1="{f.top}" x2="{f.X(x):.1f}" '
                       f'y2="{bottom}" stroke="#7f7f7f" stroke-dasharray="2,3"/>'
                       f'<text x="{f.X(x) + 3:.1f}" y="{f.top + 12}" fill="#595959">'
                       f'{esc(label)}</text>')
    return out


def _series(f: _Frame, s: Series, color: str) -> list[str]:
    points = _finite_points(s)
    if s.style in ("line", "dashed"):
        path = " ".join(f"{f.X(x):.1f},{f.Y(y):.1f}" for x, y in points)
        dash = ' stroke-dasharray="6,4"' if s.style == "dashed" else ""
        return [f'<polyline points="{path}" fill="none" stroke="{color}" stroke-width="2"'
                f'{dash}/>'] if points else []
    out = []
    errors = s.y_error or (0.0,) * len(s.x)
    for (x, y), e in zip(points, errors):
        if e and math.isfinite(e):
            out.append(f'<line x1="{f.X(x):.1f}" y1="{f.Y(y - e):.1f}" x2="{f.X(x):.1f}" '
                       f'y2="{f.Y(y + e):.1f}" stroke="{color}"/>')
        out.append(f'<circle cx="{f.X(x):.1f}" cy="{f.Y(y):.1f}" r="4" fill="{color}"/>')
    return out


def _cross(f: _Frame, c: Cross) -> list[str]:
    return [f'<line x1="{f.X(c.x_low):.1f}" y1="{f.Y(c.y):.1f}" x2="{f.X(c.x_high):.1f}" '
            f'y2="{f.Y(c.y):.1f}" stroke="{c.color}" stroke-width="2"/>',
            f'<line x1="{f.X(c.x):.1f}" y1="{f.Y(c.y_low):.1f}" x2="{f.X(c.x):.1f}" '
            f'y2="{f.Y(c.y_high):.1f}" stroke="{c.color}" stroke-width="2"/>']


def _legend(f: _Frame, entries) -> list[str]:
    out = []
    for i, (name, color, style) in enumerate(entries):
        y, x = f.top + 10 + 18 * i, f.left + f.pw + 12
        if style == "markers":
            out.append(f'<circle cx="{x + 10}" cy="{y}" r="4" fill="{color}"/>')
        else:
            dash = ' stroke-dasharray="6,4"' if style == "dashed" else ""
            out.append(f'<line x1="{x}" y1="{y}" x2="{x + 20}" y2="{y}" stroke="{color}" '
                       f'stroke-width="2"{dash}/>')
        out.append(f'<text x="{x + 26}" y="{y + 4}">{html.escape(name)}</text>')
    return out


def render_svg(chart: Chart, *, width: int = 760, height: int = 380) -> str:
    """A chart (:class:`workbench.curves.charts.Chart`) as SVG text.

    Returns
    -------
    str
        ``<svg ...>...</svg>``: axes with nice ticks, limit lines, series, tolerance crosses
        and a legend; all text escaped.
    """
    xt, yt = _ranges(chart)
    f = _Frame(xt, yt, width, height)
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
           f'viewBox="0 0 {width} {height}" role="img" aria-label="{html.escape(chart.title)}" '
           'font-family="sans-serif" font-size="12">']
    out += _axes(f, chart)
    legend = []
    for i, s in enumerate(chart.series):
        color = s.color or PALETTE[i % len(PALETTE)]
        drawn = _series(f, s, color)
        if drawn:
            out += drawn
            legend.append((s.name, color, s.style))
    for c in chart.crosses:
        out += _cross(f, c)
        legend.append((c.name, c.color, "cross"))
    out += _legend(f, legend)
    out.append("</svg>")
    return "\n".join(out)


__all__ = ["PALETTE", "nice_ticks", "render_svg"]
