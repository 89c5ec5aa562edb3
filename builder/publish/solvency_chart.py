"""The solvency map of the catalog, written directly as SVG (as the trend charts in ``svgchart``).

The catalog's liquids in the δP–δH plane: one marker each, its size growing with δD, its shape
and colour giving the dominant force (``svgchart.FORCE_MARKS``); each resin's solubility sphere
as a dashed outline of radius R0 around its centre (the sphere's cut at the centre's δD; the axes
differ in scale, so the circle is drawn as the ellipse it becomes). Names are placed where there
is room for them (``placement.place_names``); the page's table lists every point. Text stays
text, and the chart's ``<title>`` is its text alternative.

Drawing it through matplotlib took about four seconds at a thousand liquids (most of it placing
the names), so every edit that moved one liquid's parameters paid them.
"""
from __future__ import annotations

import math

from builder.publish.placement import Taken, place_names, text_width
from builder.publish.svgchart import (
    FORCE_MARKS,
    NAME_SIZE_SMALL,
    _anchor,
    _frame,
    _mark,
    _n,
    escape,
    nice_ticks,
)
from builder.publish.textsafe import visible

WIDTH, HEIGHT = 640, 480
LEFT, RIGHT, TOP, BOTTOM = 50, 128, 12, 40  # the legend stands in the right margin


def marker_radius(delta_d: float) -> float:
    """A marker's radius in user units: larger for a larger δD (about 2 at δD 13, 4.5 at δD 20 MPa½)."""
    return max(1.6, math.sqrt(max(8.0, (delta_d - 12.0) * 10.0)) / 2.0)


def solvency_map_svg(solvents, spheres) -> str:
    """``solvents``: (Derived, (δD, δP, δH)) per catalog liquid; ``spheres``: (Derived, sphere) per resin."""
    plot_w, plot_h = WIDTH - LEFT - RIGHT, HEIGHT - TOP - BOTTOM
    xs, ys = [0.0], [0.0]
    points = []
    for d, (dd, dp, dh) in solvents:
        label = d.label("dominant_force")
        points.append((visible(d.entry.name), dd, dp, dh, label.code if label else None))
        xs.append(dp)
        ys.append(dh)
    for _, sphere in spheres:
        xs += [sphere.delta_p + sphere.radius, sphere.delta_p - sphere.radius]
        ys += [sphere.delta_h + sphere.radius, sphere.delta_h - sphere.radius]
    x_lo, x_hi = (-0.5 if min(xs) >= 0 else min(xs) - 1.0), max(xs) + 2.0
    y_lo, y_hi = (-0.5 if min(ys) >= 0 else min(ys) - 1.0), max(ys) + 2.0

    def px(x: float) -> float:
        return LEFT + (x - x_lo) / (x_hi - x_lo) * plot_w

    def py(y: float) -> float:
        return TOP + plot_h - (y - y_lo) / (y_hi - y_lo) * plot_h

    clip = f'<clipPath id="plot"><rect x="{LEFT}" y="{TOP}" width="{plot_w}" height="{plot_h}"/></clipPath>'
    out = _frame((WIDTH, HEIGHT), (LEFT, RIGHT, TOP, plot_w, plot_h),
                 "The catalog's liquids by polar parameter against hydrogen-bonding parameter, marker size by "
                 "dispersion parameter, shape by dominant force, with resin solubility spheres as dashed outlines",
                 [t for t in nice_ticks(x_lo, x_hi, 8) if x_lo <= t <= x_hi],
                 [t for t in nice_ticks(y_lo, y_hi, 7) if y_lo <= t <= y_hi], px, py,
                 ("Polar parameter δP (MPa½)", "Hydrogen-bonding parameter δH (MPa½)"), head=[clip])
    taken = Taken()
    outlines, sphere_names = [], []
    for d, sphere in spheres:
        cx, cy = px(sphere.delta_p), py(sphere.delta_h)
        rx, ry = sphere.radius / (x_hi - x_lo) * plot_w, sphere.radius / (y_hi - y_lo) * plot_h
        outlines.append(f'<ellipse cx="{_n(cx)}" cy="{_n(cy)}" rx="{_n(rx)}" ry="{_n(ry)}"/>')
        name = visible(f"{d.entry.name} (sphere)")
        sphere_names.append(f'<text x="{_n(cx)}" y="{_n(cy - ry - 3)}" text-anchor="middle">{escape(name)}</text>')
        half = text_width(name, 7.0) / 2
        taken.add((cx - half, cy - ry - 12, cx + half, cy - ry))
    if outlines:
        out.append('<g clip-path="url(#plot)" fill="none" stroke="#555555" stroke-width="1" stroke-dasharray="4 2">'
                   + "".join(outlines) + "</g>")
    legend = []
    for force, (shape, colour, words) in FORCE_MARKS.items():
        chosen = [p for p in points if p[4] == force]
        if not chosen:
            continue
        out.append(f'<path fill="{colour}" fill-opacity="0.85" stroke="{colour}" stroke-width="0.8" d="'
                   + "".join(_mark(shape, px(p[2]), py(p[3]), marker_radius(p[1])) for p in chosen) + '"/>')
        legend.append((words, f'<path fill="{colour}" stroke="{colour}" stroke-width="0.8" d="{_mark(shape, 9, 0)}"/>'))
    if sphere_names:
        out.append('<g fill="#555555" font-size="7">' + "".join(sphere_names) + "</g>")
    size, row = 7.5, 11
    lx, ly = WIDTH - RIGHT + 8, TOP + 6
    for i, (text, sample) in enumerate(legend):
        out.append(f'<g transform="translate({_n(lx)} {_n(ly + i * row + row / 2)})">{sample}'
                   f'<text x="24" y="{size * 0.35:.1f}" font-size="{size:g}">{escape(text)}</text></g>')
    for _, dd, dp, dh, _ in points:
        r = marker_radius(dd)
        taken.add((px(dp) - r, py(dh) - r, px(dp) + r, py(dh) + r))
    items = sorted(((p[0], px(p[2]), py(p[3])) for p in points), key=lambda t: (t[1], -t[2], t[0]))
    placed, _ = place_names(items, (LEFT + 1, TOP, WIDTH - RIGHT, TOP + plot_h - 1), NAME_SIZE_SMALL, taken)
    out.append(f'<g fill="#333333" font-size="{NAME_SIZE_SMALL:g}">' + "".join(
        f'<text x="{_n(x)}" y="{_n(y)}"{_anchor(anchor)}>{escape(name)}</text>' for name, x, y, anchor in placed)
        + "</g>")
    out.append("</svg>")
    return "\n".join(out) + "\n"
