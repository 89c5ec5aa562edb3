"""Charts as deterministic SVG (matplotlib, Agg): same data, same bytes.

Readable in greyscale and for colour-blind readers: every series has its own marker
shape and line style as well as a colour from the Okabe–Ito palette (Okabe & Ito 2008,
"Color Universal Design"), and every chart is shown with a text alternative.

Entry text on a chart (material names, series titles) is drawn as plain text: never
parsed as matplotlib math (``$...$``), bidi controls shown as ``[U+XXXX]``.

Point names are placed without overlap and inside the axes (``place_labels``); a name with no
free place is left off the chart, and the page's table beside each chart lists every point.

Contents: ``boiling_vs_mass_svg``, ``series_svg`` (catalog-wide charts; the per-entry vapor-pressure
chart is drawn directly as SVG by ``svgchart.py``).
"""
from __future__ import annotations

import io

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
from matplotlib.markers import MarkerStyle  # noqa: E402
from matplotlib.transforms import Bbox  # noqa: E402

from builder.core.units import celsius  # noqa: E402
from builder.publish.textsafe import visible  # noqa: E402

plt.rcParams.update({
    "svg.hashsalt": "cohesion",
    "svg.fonttype": "path",
    "font.family": "DejaVu Sans",
    "font.size": 9,
    "axes.spines.top": False,
    "axes.spines.right": False,
})

#: marker, colour and line style for each intermolecular-force class
FORCE_STYLE = {
    "dispersion": ("o", "#0072B2", "London dispersion"),
    "dipole-dipole": ("^", "#D55E00", "dipole–dipole"),
    "hydrogen-bonding": ("s", "#009E73", "hydrogen bonding"),
    "ionic": ("D", "#CC79A7", "ionic"),
    None: ("x", "#555555", "not classified"),
}


def _svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": "cohesion"}, bbox_inches="tight")
    plt.close(fig)
    return buf.getvalue()


#: where a label may sit relative to its point (offset points), tried in this order
_OFFSETS = ((5, 4), (5, -10), (-5, 4), (-5, -10), (0, 8), (0, -14), (9, -3), (-9, -3))


def _overlaps(a, b, pad: float = 1.0) -> bool:
    return not (a.x1 + pad <= b.x0 or b.x1 + pad <= a.x0 or a.y1 + pad <= b.y0 or b.y1 + pad <= a.y0)


class _Boxes:
    """Boxes already taken on the chart, filed by grid cell so a new box is compared only with its neighbours."""

    CELL = 24.0  # display units

    def __init__(self):
        self.cells: dict[tuple[int, int], list] = {}

    def _cells(self, box, pad: float = 1.0):
        c = self.CELL
        for i in range(int((box.x0 - pad) // c), int((box.x1 + pad) // c) + 1):
            for j in range(int((box.y0 - pad) // c), int((box.y1 + pad) // c) + 1):
                yield i, j

    def add(self, box) -> None:
        for cell in self._cells(box):
            self.cells.setdefault(cell, []).append(box)

    def hit(self, box) -> bool:
        return any(_overlaps(box, other) for cell in self._cells(box) for other in self.cells.get(cell, ()))


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
    taken = _Boxes()
    for box in avoid:
        taken.add(box)
    for _, x, y in items:
        px, py = ax.transData.transform((x, y))
        taken.add(Bbox.from_extents(px - marker, py - marker, px + marker, py + marker))
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
            box = Bbox.from_extents(x0, y0, x0 + width, y0 + height)
            inside = frame.x0 <= box.x0 and box.x1 <= frame.x1 and frame.y0 <= box.y0 and box.y1 <= frame.y1
            if inside and not taken.hit(box):
                ax.annotate(visible(label), (x, y), textcoords="offset points", xytext=(dx, dy), fontsize=fontsize,
                            color="#333333", parse_math=False, ha=ha)
                taken.add(box)
                break
        else:
            left_off.append(label)
    probe.remove()
    return left_off


def boiling_vs_mass_figure(points, alkane_line):
    """The figure of ``boiling_vs_mass_svg`` and the labels left off it for want of room."""
    fig, ax = plt.subplots(figsize=(7.0, 4.6))
    if alkane_line:
        xs, ys = zip(*alkane_line)
        ax.plot(xs, [celsius(y) for y in ys], color="#444444", linestyle="--", linewidth=1.0,
                label="n-alkanes (reference)")
    for force in FORCE_STYLE:
        chosen = [p for p in points if p[3] == force]
        if not chosen:
            continue
        marker, colour, label = FORCE_STYLE[force]
        for estimated in (False, True):
            sub = [p for p in chosen if p[4] == estimated]
            if not sub:
                continue
            if MarkerStyle(marker).is_filled():  # estimated: hollow
                paint = {"facecolors": "none" if estimated else colour, "edgecolors": colour, "linewidths": 1.3}
            else:  # a line marker (×) has no inside to hollow: estimated ones are drawn thinner
                paint = {"color": colour, "linewidths": 0.7 if estimated else 1.3}
            ax.scatter([p[1] for p in sub], [celsius(p[2]) for p in sub], marker=marker, s=42, **paint,
                       label=f"{label}{' (estimated bp)' if estimated else ''}", zorder=3)
    ax.set_xlabel("Molar mass (g/mol)")
    ax.set_ylabel("Normal boiling point (°C)")
    if points:
        top = max(p[1] for p in points)
        ax.set_xlim(0, top * 1.12)
        ax.margins(y=0.08)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    legend = ax.legend(loc="upper left", fontsize=7.5, frameon=False)
    fig.canvas.draw()
    avoid = [legend.get_window_extent(fig.canvas.get_renderer())]
    # keep names off the n-alkane line too: a small box at each of its points (display units)
    line = [ax.transData.transform((m, celsius(tb))) for m, tb in alkane_line]
    for (x0, y0), (x1, y1) in zip(line, line[1:]):
        steps = max(1, int(max(abs(x1 - x0), abs(y1 - y0)) / 2.0))  # a box every 2 display units
        for k in range(steps + 1):
            px, py = x0 + (x1 - x0) * k / steps, y0 + (y1 - y0) * k / steps
            avoid.append(Bbox.from_extents(px - 1.0, py - 1.0, px + 1.0, py + 1.0))
    # lightest first: the crowded low-mass corner gets its places before the sparse heavy end
    items = sorted(((p[0], p[1], celsius(p[2])) for p in points), key=lambda t: (t[1], t[2], t[0]))
    left_off = place_labels(fig, ax, items, avoid=avoid)
    return fig, left_off


def boiling_vs_mass_svg(points, alkane_line) -> str:
    """Boiling point (°C) against molar mass, one marker shape per dominant force; names where
    there is room for them (``place_labels``), every point in the page's table.

    ``points``: (label, molar_mass, boiling_point_K, force, estimated) tuples;
    ``alkane_line``: (molar_mass, boiling_point_K) pairs of the n-alkanes for reference.
    """
    fig, _ = boiling_vs_mass_figure(points, alkane_line)
    return _svg(fig)


def series_figure(title: str, points):
    """The figure of ``series_svg`` and the labels left off it."""
    fig, ax = plt.subplots(figsize=(5.0, 3.4))
    xs = [p[1] for p in points]
    ys = [celsius(p[2]) for p in points]
    ax.plot(xs, ys, marker="o", color="#0072B2", linewidth=1.2)
    ax.set_xlabel("Carbon atoms")
    ax.set_ylabel("Normal boiling point (°C)")
    ax.set_xticks(sorted(set(xs)))
    ax.set_title(visible(title), fontsize=9, parse_math=False)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    # room inside the axes for the names, so none sits on an axis line
    ax.margins(x=0.25, y=0.2)
    left_off = place_labels(fig, ax, [(p[0], x, y) for p, x, y in zip(points, xs, ys)], fontsize=7)
    return fig, left_off


def series_svg(title: str, points) -> str:
    """Boiling point along a homologous series: ``points`` are (label, carbons, boiling_point_K)."""
    fig, _ = series_figure(title, points)
    return _svg(fig)


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
