"""Small charts written as SVG text directly: one per datasheet, so each must take a millisecond.

The per-entry vapor-pressure chart is a few lines on a log axis; drawing it through
matplotlib cost about 0.4 s (mostly text layout of tick labels), so it is written here
from its data. Text stays text (searchable, read by screen readers, escaped, never
parsed as markup); numbers are rounded to 0.1 px, so the same data gives the same bytes.
Styles match the matplotlib charts (``charts.py``): Okabe–Ito colours, and a dash pattern
and a marker shape as well as a colour for every series, so nothing relies on colour alone.

Contents: ``vapor_curve_svg``, ``nice_ticks``, ``log_ticks``.
"""
from __future__ import annotations

import math
from xml.sax.saxutils import escape

from builder.core.units import celsius as kelvin_to_celsius

WIDTH, HEIGHT = 520, 330
LEFT, RIGHT, TOP, BOTTOM = 62, 12, 12, 44
FONT = "DejaVu Sans, Verdana, sans-serif"

#: kind → (dash pattern, stroke width, colour, legend text)
SEGMENT_STYLE = {
    "antoine": (None, 1.8, "#0072B2", "Antoine equation (valid range)"),
    "antoine-outside": ("1.5 3", 1.2, "#0072B2", "Antoine equation outside its range"),
    "estimated": ("6 3", 1.4, "#D55E00", "estimated from the boiling point"),
    "mixture": (None, 1.8, "#009E73", "mixture: bubble pressure from its components"),
}


def _n(x: float) -> str:
    """A coordinate as short, stable text."""
    text = f"{x:.1f}"
    return text[:-2] if text.endswith(".0") else text


def nice_ticks(lo: float, hi: float, target: int = 6) -> list[float]:
    """Round tick values (1, 2 or 5 × 10^k steps) covering [lo, hi]."""
    if hi <= lo:
        hi = lo + 1.0
    raw = (hi - lo) / max(target - 1, 1)
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 2.5, 5, 10) if m * mag >= raw)
    first = math.ceil(lo / step - 1e-9) * step
    ticks, t = [], first
    while t <= hi + step * 1e-9:
        ticks.append(round(t, 10))
        t += step
    return ticks


def log_ticks(lo: float, hi: float) -> tuple[list[float], list[float]]:
    """(decades, minor ticks at 2 and 5 per decade) inside [lo, hi], for positive lo < hi."""
    major, minor = [], []
    for k in range(math.floor(math.log10(lo)), math.ceil(math.log10(hi)) + 1):
        for m in (1, 2, 5):
            v = m * 10.0 ** k
            if lo * (1 - 1e-9) <= v <= hi * (1 + 1e-9):
                (major if m == 1 else minor).append(v)
    return major, minor


def _pressure_label(kpa: float) -> str:
    if kpa >= 1:
        return f"{kpa:,.0f}".replace(",", " ")
    return f"{kpa:.6f}".rstrip("0").rstrip(".") if kpa >= 1e-4 else f"{kpa:.0e}"


def vapor_curve_svg(segments, points=(), store_temperature_K=None) -> str:
    """Vapor pressure (kPa, log scale) against temperature (°C).

    ``segments``: (kind, temperatures_K, pressures_Pa) with kind in ``SEGMENT_STYLE``;
    ``points``: (label, T_K, P_Pa) stated values; ``store_temperature_K`` is marked.
    """
    series = [(kind, [kelvin_to_celsius(t) for t in ts], [p / 1000.0 for p in ps])
              for kind, ts, ps in segments if len(ts) == len(ps) and ts]
    pts = [(label, kelvin_to_celsius(t), p / 1000.0) for label, t, p in points]
    xs = [x for _, tx, _ in series for x in tx] + [p[1] for p in pts]
    ys = [y for _, _, py in series for y in py if y > 0] + [p[2] for p in pts if p[2] > 0] + [101.325]
    store_c = kelvin_to_celsius(store_temperature_K) if store_temperature_K is not None else None
    if store_c is not None:
        xs.append(store_c)
    x_lo, x_hi = (min(xs), max(xs)) if xs else (0.0, 100.0)
    pad = (x_hi - x_lo) * 0.04 or 5.0
    x_lo, x_hi = x_lo - pad, x_hi + pad
    y_lo, y_hi = min(ys) / 1.6, max(ys) * 1.6
    plot_w, plot_h = WIDTH - LEFT - RIGHT, HEIGHT - TOP - BOTTOM
    lx_lo, lx_hi = math.log10(y_lo), math.log10(y_hi)

    def px(x: float) -> float:
        return LEFT + (x - x_lo) / (x_hi - x_lo) * plot_w

    def py(y: float) -> float:
        return TOP + plot_h - (math.log10(y) - lx_lo) / (lx_hi - lx_lo) * plot_h

    out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{WIDTH}" height="{HEIGHT}" '
           f'viewBox="0 0 {WIDTH} {HEIGHT}" font-family="{FONT}" font-size="9">',
           "<title>Vapor pressure against temperature</title>",
           f'<rect x="0" y="0" width="{WIDTH}" height="{HEIGHT}" fill="#ffffff"/>']
    major, minor = log_ticks(y_lo, y_hi)
    grid = []
    for v in minor:
        grid.append(f'<line x1="{LEFT}" x2="{WIDTH - RIGHT}" y1="{_n(py(v))}" y2="{_n(py(v))}"/>')
    for v in major:
        grid.append(f'<line x1="{LEFT}" x2="{WIDTH - RIGHT}" y1="{_n(py(v))}" y2="{_n(py(v))}"/>')
    x_ticks = [t for t in nice_ticks(x_lo, x_hi) if x_lo <= t <= x_hi]
    for t in x_ticks:
        grid.append(f'<line x1="{_n(px(t))}" x2="{_n(px(t))}" y1="{TOP}" y2="{TOP + plot_h}"/>')
    out.append('<g stroke="#e4e4e4" stroke-width="0.5">' + "".join(grid) + "</g>")
    axis_y = TOP + plot_h
    out.append(f'<g stroke="#000000" stroke-width="0.8"><line x1="{LEFT}" x2="{WIDTH - RIGHT}" y1="{axis_y}" '
               f'y2="{axis_y}"/><line x1="{LEFT}" x2="{LEFT}" y1="{TOP}" y2="{axis_y}"/></g>')
    labels = []
    for t in x_ticks:
        labels.append(f'<text x="{_n(px(t))}" y="{axis_y + 13}" text-anchor="middle">{_n(t)}</text>')
    for v in major:
        labels.append(f'<text x="{LEFT - 4}" y="{_n(py(v) + 3)}" text-anchor="end">{escape(_pressure_label(v))}'
                      "</text>")
    labels.append(f'<text x="{_n(LEFT + plot_w / 2)}" y="{HEIGHT - 8}" text-anchor="middle" font-size="10">'
                  "Temperature (°C)</text>")
    labels.append(f'<text transform="translate(14 {_n(TOP + plot_h / 2)}) rotate(-90)" text-anchor="middle" '
                  'font-size="10">Vapor pressure (kPa)</text>')
    out.append('<g fill="#000000">' + "".join(labels) + "</g>")
    atm = py(101.325)
    out.append(f'<line x1="{LEFT}" x2="{WIDTH - RIGHT}" y1="{_n(atm)}" y2="{_n(atm)}" stroke="#777777" '
               'stroke-width="0.8" stroke-dasharray="6 2 1 2"/>')
    out.append(f'<text x="{LEFT + 3}" y="{_n(atm - 3)}" font-size="6.5">101.3 kPa</text>')
    legend: list[tuple[str, str]] = []
    for kind, tx, ty in series:
        dash, width, colour, text = SEGMENT_STYLE[kind]
        coords = " ".join(f"{_n(px(x))},{_n(py(y))}" for x, y in zip(tx, ty) if y > 0)
        dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
        out.append(f'<polyline points="{coords}" fill="none" stroke="{colour}" stroke-width="{width}"'
                   f'{dash_attr} stroke-linejoin="round"/>')
        sample = (f'<line x1="0" x2="18" y1="0" y2="0" stroke="{colour}" stroke-width="{width}"{dash_attr}/>')
        if text not in [t for t, _ in legend]:
            legend.append((text, sample))
    for label, x, y in pts:
        if y > 0:
            out.append(f'<rect x="{_n(px(x) - 3)}" y="{_n(py(y) - 3)}" width="6" height="6" fill="#000000"/>')
            legend.append((label, '<rect x="6" y="-3" width="6" height="6" fill="#000000"/>'))
    if store_c is not None:
        sx = _n(px(store_c))
        out.append(f'<line x1="{sx}" x2="{sx}" y1="{TOP}" y2="{axis_y}" stroke="#000000" stroke-width="0.9" '
                   'stroke-dasharray="1 1"/>')
        legend.append(("max. store temperature", '<line x1="0" x2="18" y1="0" y2="0" stroke="#000000" '
                       'stroke-width="0.9" stroke-dasharray="1 1"/>'))
    row_h, box_w = 10, 190
    x0, y0 = WIDTH - RIGHT - box_w, axis_y - 6 - row_h * len(legend)
    for i, (text, sample) in enumerate(legend):
        y = y0 + i * row_h + row_h / 2
        out.append(f'<g transform="translate({_n(x0)} {_n(y)})">{sample}'
                   f'<text x="24" y="2.5" font-size="6.5">{escape(text)}</text></g>')
    out.append("</svg>")
    return "\n".join(out) + "\n"



