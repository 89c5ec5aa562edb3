"""Charts as deterministic SVG (matplotlib, Agg): same data, same bytes.

Readable in greyscale and for colour-blind readers: every series has its own marker
shape and line style as well as a colour from the Okabe–Ito palette (Okabe & Ito 2008,
"Color Universal Design"), and every chart is shown with a text alternative.

Entry text on a chart (material names, series titles) is drawn as plain text: never
parsed as matplotlib math (``$...$``), bidi controls shown as ``[U+XXXX]``.

Point names are placed without overlap and inside the axes (``place_labels``); a name with no
free place is left off the chart, and the page's table beside each chart lists every point.

Contents: ``solvency_map_svg`` and ``txy_svg``. The charts drawn by the hundred (the per-entry
vapor-pressure chart, the trends page's boiling-point charts) are written directly as SVG by
``svgchart.py``, about a hundred times faster.
"""
from __future__ import annotations

import io

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

from builder.core.units import celsius  # noqa: E402
from builder.publish.placement import Taken  # noqa: E402
from builder.publish.svgchart import FORCE_MARKS  # noqa: E402
from builder.publish.textsafe import visible  # noqa: E402

plt.rcParams.update({
    "svg.hashsalt": "cohesion",
    "svg.fonttype": "path",
    "font.family": "DejaVu Sans",
    "font.size": 9,
    "axes.spines.top": False,
    "axes.spines.right": False,
})

#: matplotlib marker, colour and legend words for each intermolecular-force class (the shapes and
#: colours of the charts written directly, ``svgchart.FORCE_MARKS``)
_MARKERS = {"circle": "o", "triangle": "^", "square": "s", "diamond": "D", "cross": "x"}
FORCE_STYLE = {force: (_MARKERS[shape], colour, words) for force, (shape, colour, words) in FORCE_MARKS.items()}


def _svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": "cohesion"}, bbox_inches="tight")
    plt.close(fig)
    return buf.getvalue()


#: where a label may sit relative to its point (offset points), tried in this order
_OFFSETS = ((5, 4), (5, -10), (-5, 4), (-5, -10), (0, 8), (0, -14), (9, -3), (-9, -3))


def place_labels(fig, ax, items, fontsize: float = 6.5, avoid=()) -> list[str]:
    """Name points without overlap: each label (in ``items`` order) goes to the first place of
    ``_OFFSETS`` where it stays inside the axes and clear of every label placed so far, every
    marker and each box of ``avoid`` (display coordinates, e.g. the legend); a label with no
    free place is left off.  Returns the labels left off (the chart's table lists every point).

    ``items``: (label, x, y) in data coordinates. Each label's size is measured once; its box at
    each candidate place follows from the offset and the alignment.
    """
    fig.canvas.draw()
    renderer = fig.canvas.get_renderer()
    frame = ax.get_window_extent(renderer)
    scale = fig.dpi / 72.0  # offset points → display units
    marker = 4.0  # half a marker's size in display units (s=42 points², about 6.5 pt across)
    taken = Taken((b.x0, b.y0, b.x1, b.y1) for b in avoid)  # boxes as (x0, y0, x1, y1), display units
    for _, x, y in items:
        px, py = ax.transData.transform((x, y))
        taken.add((px - marker, py - marker, px + marker, py + marker))
    left_off = []
    probe = ax.annotate("", (0, 0), textcoords="offset points", xytext=(0, 0), fontsize=fontsize,
                        parse_math=False, ha="left")  # one artist measures every label
    for label, x, y in items:
        px, py = ax.transData.transform((x, y))
        probe.set_text(visible(label))
        probe.xy = (x, y)
        size = probe.get_window_extent(renderer)
        width, height, rise = size.width, size.height, size.y0 - py
        for dx, dy in _OFFSETS:
            ha = "left" if dx > 0 else "right" if dx < 0 else "center"
            x0 = px + dx * scale - {"left": 0.0, "right": width, "center": width / 2.0}[ha]
            y0 = py + dy * scale + rise
            box = (x0, y0, x0 + width, y0 + height)
            inside = frame.x0 <= box[0] and box[2] <= frame.x1 and frame.y0 <= box[1] and box[3] <= frame.y1
            if inside and not taken.hit(box):
                ax.annotate(visible(label), (x, y), textcoords="offset points", xytext=(dx, dy), fontsize=fontsize,
                            color="#333333", parse_math=False, ha=ha)
                taken.add(box)
                break
        else:
            left_off.append(label)
    probe.remove()
    return left_off


def txy_svg(first: str, second: str, xs, bubble_K, dew_K, model: str) -> str:
    """The T–x–y diagram of a binary mixture at 101.325 kPa: bubble and dew temperatures against the
    mole fraction of ``first`` (``xs``), as an SVG with its title as the text alternative."""
    fig, ax = plt.subplots(figsize=(5.0, 3.4))
    ax.plot(xs, [celsius(t) for t in bubble_K], color="#0072B2", linewidth=1.6, label="bubble point (liquid)")
    ax.plot(xs, [celsius(t) for t in dew_K], color="#D55E00", linewidth=1.6, linestyle="--",
            label="dew point (vapor)")
    ax.set_xlim(0.0, 1.0)
    ax.set_xlabel(visible(f"Mole fraction of {first} (the rest {second})"), parse_math=False)
    ax.set_ylabel("Temperature at 101.325 kPa (°C)")
    ax.set_title(visible(f"Boiling of {first} + {second} ({model})"), fontsize=9, parse_math=False)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    ax.legend(frameon=False, fontsize=7)
    return _svg(fig)


def solvency_map_svg(solvents, spheres) -> str:
    """The catalog's liquids in the δP–δH plane (marker size by δD, shape and colour by dominant
    force) with each resin's solubility sphere as a circle of its radius R0 around its centre (the
    sphere's cut at the centre's δD); ``solvents``: (Derived, (δD, δP, δH)); ``spheres``: (Derived, sphere).
    Names are placed where there is room (``place_labels``); the page's table lists every point."""
    fig, ax = plt.subplots(figsize=(6.4, 4.8))
    seen = set()
    xs, ys, items = [0.0], [0.0], []
    for d, (dd, dp, dh) in solvents:
        force = d.label("dominant_force").code if d.label("dominant_force") else None
        marker, colour, name = FORCE_STYLE.get(force, FORCE_STYLE[None])
        ax.scatter([dp], [dh], marker=marker, s=max(8.0, (dd - 12.0) * 10.0), color=colour, alpha=0.85,
                   label=None if force in seen else name, zorder=3)
        seen.add(force)
        xs.append(dp)
        ys.append(dh)
        items.append((d.entry.name, dp, dh))
    for d, sphere in spheres:
        ax.add_patch(plt.Circle((sphere.delta_p, sphere.delta_h), sphere.radius, fill=False, color="#555555",
                                linestyle="--", linewidth=1.0))
        xs += [sphere.delta_p + sphere.radius, sphere.delta_p - sphere.radius]
        ys += [sphere.delta_h + sphere.radius, sphere.delta_h - sphere.radius]
        ax.text(sphere.delta_p, sphere.delta_h + sphere.radius, visible(f"{d.entry.name} (sphere)"), fontsize=7,
                ha="center", va="bottom", color="#555555", parse_math=False)
    ax.set_xlim(max(min(xs) - 1.0, -0.5 if min(xs) >= 0 else min(xs) - 1.0), max(xs) + 2.0)
    ax.set_ylim(max(min(ys) - 1.0, -0.5 if min(ys) >= 0 else min(ys) - 1.0), max(ys) + 2.0)
    ax.set_xlabel("Polar parameter δP (MPa½)")
    ax.set_ylabel("Hydrogen-bonding parameter δH (MPa½)")
    ax.grid(True, color="#dddddd", linewidth=0.6)
    if seen:
        ax.legend(frameon=False, fontsize=7, loc="upper left", bbox_to_anchor=(1.0, 1.0))
    place_labels(fig, ax, items, fontsize=6)
    return _svg(fig)
