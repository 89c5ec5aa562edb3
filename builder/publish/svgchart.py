"""Charts written as SVG text directly: one per datasheet and dozens per catalog, so each must take a millisecond.

The per-entry vapor-pressure chart is a few lines on a log axis; drawing it through
matplotlib cost about 0.4 s (mostly text layout of tick labels), so it is written here
from its data. Text stays text (searchable, read by screen readers, escaped, never
parsed as markup); numbers are rounded to 0.1 px, so the same data gives the same bytes.
Styles match the matplotlib charts (``charts.py``): Okabe–Ito colours, and a dash pattern
and a marker shape as well as a colour for every series, so nothing relies on colour alone.

Contents: ``vapor_curve_svg``; for the trends page ``boiling_vs_mass_svg`` (every material) and
``series_svg`` (one per homologous series), whose point names are placed by ``placement.py``;
``nice_ticks``, ``log_ticks``.
"""
from __future__ import annotations

import math

from builder.core.units import celsius as kelvin_to_celsius
from builder.publish.placement import Taken, place_names, text_width
from builder.publish.textsafe import visible

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


def escape(text: str) -> str:
    """Text for an SVG text node: &, < and > as entities (as xml.sax.saxutils.escape does, without
    importing the XML package and urllib with it on every build)."""
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


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


SERIES_WIDTH, SERIES_HEIGHT = 500, 340
NAME_SIZE = 7.0  # font size of point names


def _wrap(text: str, size: float, width: float, most: int = 3) -> list[str]:
    """``text`` in at most ``most`` lines of at most ``width`` (breaking at spaces); a last line
    may run over rather than lose words."""
    lines: list[str] = []
    for word in text.split(" "):
        if lines and text_width(lines[-1] + " " + word, size) <= width or (lines and len(lines) == most):
            lines[-1] += " " + word
        else:
            lines.append(word)
    return lines or [""]


def series_svg(title: str, points) -> str:
    """Boiling point (°C) along a homologous series against its number of carbon atoms.

    ``points``: (name, carbons, boiling_point_K). A line through the points, each named where
    there is room (``placement.place_names``, left to right); the page's table lists every point.
    The title (wrapped to the width) is also the SVG's ``<title>``, its text alternative.
    """
    pts = sorted(((name, c, kelvin_to_celsius(tb)) for name, c, tb in points), key=lambda p: (p[1], p[2], p[0]))
    title_text = visible(title)
    title_lines = _wrap(title_text, 9.0, SERIES_WIDTH - 24)
    top = 14 + 12 * len(title_lines)
    left, right, bottom = 58, 14, 40
    plot_w, plot_h = SERIES_WIDTH - left - right, SERIES_HEIGHT - top - bottom
    xs, ys = [p[1] for p in pts] or [1], [p[2] for p in pts] or [0.0]
    span_x = (max(xs) - min(xs)) or 1
    x_lo, x_hi = min(xs) - 0.25 * span_x, max(xs) + 0.25 * span_x
    span_y = (max(ys) - min(ys)) or 10.0
    y_lo, y_hi = min(ys) - 0.2 * span_y, max(ys) + 0.2 * span_y

    def px(x: float) -> float:
        return left + (x - x_lo) / (x_hi - x_lo) * plot_w

    def py(y: float) -> float:
        return top + plot_h - (y - y_lo) / (y_hi - y_lo) * plot_h

    axis_y = top + plot_h
    titles = [f'<text x="{SERIES_WIDTH / 2:g}" y="{14 + 12 * i}" text-anchor="middle">{escape(line)}</text>'
              for i, line in enumerate(title_lines)]
    out = _frame((SERIES_WIDTH, SERIES_HEIGHT), (left, right, top, plot_w, plot_h), title_text, sorted(set(xs)),
                 [t for t in nice_ticks(y_lo, y_hi, 6) if y_lo <= t <= y_hi], px, py,
                 ("Carbon atoms", "Normal boiling point (°C)"), labels=titles)
    coords = [(px(x), py(y)) for _, x, y in pts]
    out.append('<polyline points="' + " ".join(f"{_n(x)},{_n(y)}" for x, y in coords)
               + '" fill="none" stroke="#0072B2" stroke-width="1.2" stroke-linejoin="round"/>')
    out.append('<g fill="#0072B2">' + "".join(f'<circle cx="{_n(x)}" cy="{_n(y)}" r="3"/>' for x, y in coords)
               + "</g>")
    frame = (left + 1, top, SERIES_WIDTH - right, axis_y - 1)  # names stay off the axis lines
    placed, _ = place_names([(visible(name), x, y) for (name, _, _), (x, y) in zip(pts, coords)], frame, NAME_SIZE,
                            Taken(line_boxes(coords)))
    out.append(f'<g fill="#333333" font-size="{NAME_SIZE:g}">' + "".join(
        f'<text x="{_n(x)}" y="{_n(y)}"{_anchor(anchor)}>{escape(name)}</text>' for name, x, y, anchor in placed)
        + "</g>")
    out.append("</svg>")
    return "\n".join(out) + "\n"


def _frame(size, box, title: str, x_ticks, y_ticks, px, py, axis_titles, head=(), labels=()) -> list[str]:
    """The start of a chart on linear axes: the SVG element with its ``<title>`` (the text
    alternative), a white ground, grid lines at the ticks, the two axis lines, tick labels and axis
    titles (and any further ``labels``, drawn with them). ``box``: (left, right, top, plot width,
    plot height) in user units; ``px``, ``py`` map data to user units."""
    width, height = size
    left, right, top, plot_w, plot_h = box
    axis_y = top + plot_h
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
           f'viewBox="0 0 {width} {height}" font-family="{FONT}" font-size="9">',
           f"<title>{escape(title)}</title>", f'<rect x="0" y="0" width="{width}" height="{height}" fill="#ffffff"/>',
           *head]
    grid = [f'<line x1="{_n(px(t))}" x2="{_n(px(t))}" y1="{top}" y2="{axis_y}"/>' for t in x_ticks]
    grid += [f'<line x1="{left}" x2="{width - right}" y1="{_n(py(t))}" y2="{_n(py(t))}"/>' for t in y_ticks]
    out.append('<g stroke="#dddddd" stroke-width="0.6">' + "".join(grid) + "</g>")
    out.append(f'<g stroke="#000000" stroke-width="0.8"><line x1="{left}" x2="{width - right}" '
               f'y1="{axis_y}" y2="{axis_y}"/><line x1="{left}" x2="{left}" y1="{top}" y2="{axis_y}"/></g>')
    text = [f'<text x="{_n(px(t))}" y="{axis_y + 13}" text-anchor="middle">{_n(t)}</text>' for t in x_ticks]
    text += [f'<text x="{left - 4}" y="{_n(py(t) + 3)}" text-anchor="end">{_n(t)}</text>' for t in y_ticks]
    text.append(f'<text x="{_n(left + plot_w / 2)}" y="{height - 8}" text-anchor="middle" '
                f'font-size="10">{escape(axis_titles[0])}</text>')
    text.append(f'<text transform="translate(14 {_n(top + plot_h / 2)}) rotate(-90)" text-anchor="middle" '
                f'font-size="10">{escape(axis_titles[1])}</text>')
    out.append('<g fill="#000000">' + "".join(text + list(labels)) + "</g>")
    return out


def line_boxes(coords, step: float = 2.0, half: float = 1.0) -> list[tuple]:
    """Small boxes every ``step`` units along a polyline, so names are kept off the line itself."""
    boxes = []
    for (x0, y0), (x1, y1) in zip(coords, coords[1:]):
        n = max(1, int(max(abs(x1 - x0), abs(y1 - y0)) / step))
        for k in range(n + 1):
            x, y = x0 + (x1 - x0) * k / n, y0 + (y1 - y0) * k / n
            boxes.append((x - half, y - half, x + half, y + half))
    return boxes


def _anchor(anchor: str) -> str:
    return "" if anchor == "start" else f' text-anchor="{anchor}"'


BVM_WIDTH, BVM_HEIGHT = 700, 460
#: marker shape, colour and legend words for each intermolecular-force class (shape and colour both
#: tell the class, so greyscale prints and colour-blind readers lose nothing)
FORCE_MARKS = {
    "dispersion": ("circle", "#0072B2", "London dispersion"),
    "dipole-dipole": ("triangle", "#D55E00", "dipole–dipole"),
    "hydrogen-bonding": ("square", "#009E73", "hydrogen bonding"),
    "ionic": ("diamond", "#CC79A7", "ionic"),
    None: ("cross", "#555555", "not classified"),
}


def _mark(shape: str, x: float, y: float, r: float = 3.3) -> str:
    """Path data of one marker centred at (x, y), about 2r across."""
    if shape == "circle":  # two arcs
        return f"M{_n(x - r)} {_n(y)}a{r:g} {r:g} 0 1 0 {2 * r:g} 0a{r:g} {r:g} 0 1 0 {-2 * r:g} 0z"
    if shape == "triangle":
        return f"M{_n(x)} {_n(y - 1.15 * r)}L{_n(x + r)} {_n(y + 0.67 * r)}L{_n(x - r)} {_n(y + 0.67 * r)}z"
    if shape == "square":
        s = 0.88 * r
        return f"M{_n(x - s)} {_n(y - s)}h{2 * s:.1f}v{2 * s:.1f}h{-2 * s:.1f}z"
    if shape == "diamond":
        s = 1.15 * r
        return f"M{_n(x)} {_n(y - s)}L{_n(x + s)} {_n(y)}L{_n(x)} {_n(y + s)}L{_n(x - s)} {_n(y)}z"
    s = 0.9 * r  # cross
    return f"M{_n(x - s)} {_n(y - s)}L{_n(x + s)} {_n(y + s)}M{_n(x - s)} {_n(y + s)}L{_n(x + s)} {_n(y - s)}"


def _paint(shape: str, colour: str, estimated: bool) -> str:
    """Measured: filled; estimated: hollow (a cross, which has no inside, is drawn thinner)."""
    if shape == "cross":
        return f'fill="none" stroke="{colour}" stroke-width="{0.7 if estimated else 1.3}"'
    return f'fill="{"none" if estimated else colour}" stroke="{colour}" stroke-width="1.3"'


def boiling_vs_mass_svg(points, alkane_line) -> str:
    """The SVG of ``boiling_vs_mass_chart``."""
    return boiling_vs_mass_chart(points, alkane_line)[0]


def boiling_vs_mass_chart(points, alkane_line) -> tuple[str, list[str]]:
    """Boiling point (°C) against molar mass, one marker shape per dominant force, hollow where the
    boiling point is estimated, with the n-alkanes as a dashed reference line; names where there is
    room for them (``placement.place_names``, lightest first: the crowded low-mass corner gets its
    places before the sparse heavy end). Returns (svg, names left off); the page's table lists
    every point.

    ``points``: (name, molar_mass, boiling_point_K, force, estimated) tuples;
    ``alkane_line``: (molar_mass, boiling_point_K) pairs of the n-alkanes.
    """
    left, right, top, bottom = 58, 14, 12, 40
    plot_w, plot_h = BVM_WIDTH - left - right, BVM_HEIGHT - top - bottom
    pts = [(visible(name), m, kelvin_to_celsius(tb), force, est) for name, m, tb, force, est in points]
    alkane = [(m, kelvin_to_celsius(tb)) for m, tb in alkane_line]
    x_hi = max(p[1] for p in pts) * 1.12 if pts else 100.0
    ys = [p[2] for p in pts] + [y for m, y in alkane if m <= x_hi] or [0.0, 100.0]
    span = (max(ys) - min(ys)) or 10.0
    y_lo, y_hi = min(ys) - 0.08 * span, max(ys) + 0.08 * span

    def px(x: float) -> float:
        return left + x / x_hi * plot_w

    def py(y: float) -> float:
        return top + plot_h - (y - y_lo) / (y_hi - y_lo) * plot_h

    axis_y = top + plot_h
    clip = f'<clipPath id="plot"><rect x="{left}" y="{top}" width="{plot_w}" height="{plot_h}"/></clipPath>'
    out = _frame((BVM_WIDTH, BVM_HEIGHT), (left, right, top, plot_w, plot_h),
                 "Normal boiling point against molar mass, by dominant intermolecular force",
                 [t for t in nice_ticks(0.0, x_hi, 8) if t <= x_hi],
                 [t for t in nice_ticks(y_lo, y_hi, 7) if y_lo <= t <= y_hi], px, py,
                 ("Molar mass (g/mol)", "Normal boiling point (°C)"), head=[clip])
    line = [(px(m), py(y)) for m, y in alkane if m <= x_hi]
    if line:
        out.append('<polyline clip-path="url(#plot)" points="' + " ".join(f"{_n(x)},{_n(y)}" for x, y in line)
                   + '" fill="none" stroke="#444444" stroke-width="1" stroke-dasharray="4 2"/>')
    legend = ([("n-alkanes (reference)", '<line x1="0" x2="18" y1="0" y2="0" stroke="#444444" stroke-width="1" '
                'stroke-dasharray="4 2"/>')] if line else [])
    for force, (shape, colour, words) in FORCE_MARKS.items():
        for estimated in (False, True):
            chosen = [p for p in pts if p[3] == force and p[4] == estimated]
            if not chosen:
                continue
            out.append(f'<path {_paint(shape, colour, estimated)} d="'
                       + "".join(_mark(shape, px(p[1]), py(p[2])) for p in chosen) + '"/>')
            legend.append((f"{words}{' (estimated bp)' if estimated else ''}",
                           f'<path {_paint(shape, colour, estimated)} d="{_mark(shape, 9, 0)}"/>'))
    size, row = 7.5, 11
    lx, ly = left + 8, top + 6
    legend_w = 26 + max((text_width(t, size) for t, _ in legend), default=0.0)
    for i, (text, sample) in enumerate(legend):
        y = ly + i * row + row / 2
        out.append(f'<g transform="translate({_n(lx)} {_n(y)})">{sample}'
                   f'<text x="24" y="{size * 0.35:.1f}" font-size="{size:g}">{escape(text)}</text></g>')
    taken = Taken(line_boxes(line) + [(lx - 2, ly - 2, lx + legend_w, ly + row * len(legend) + 2)])
    items = sorted(((p[0], px(p[1]), py(p[2])) for p in pts),
                   key=lambda t: (t[1], -t[2], t[0]))
    frame = (left + 1, top, BVM_WIDTH - right, axis_y - 1)
    placed, left_off = place_names(items, frame, NAME_SIZE_SMALL, taken)
    out.append(f'<g fill="#333333" font-size="{NAME_SIZE_SMALL:g}">' + "".join(
        f'<text x="{_n(x)}" y="{_n(y)}"{_anchor(anchor)}>{escape(name)}</text>' for name, x, y, anchor in placed)
        + "</g>")
    out.append("</svg>")
    return "\n".join(out) + "\n", left_off


NAME_SIZE_SMALL = 6.5
