"""Charts as deterministic SVG (matplotlib, Agg): same data, same bytes.

Readable in greyscale and for colour-blind readers: every series has its own marker
shape and line style as well as a colour from the Okabe–Ito palette (Okabe & Ito 2008,
"Color Universal Design"), and every chart is shown with a text alternative.

Entry text on a chart (material names, series titles) is drawn as plain text: never
parsed as matplotlib math (``$...$``), bidi controls shown as ``[U+XXXX]``.

Contents: ``boiling_vs_mass_svg``, ``series_svg`` (catalog-wide charts; the per-entry vapor-pressure
chart is drawn directly as SVG by ``svgchart.py``).
"""
from __future__ import annotations

import io

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

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


def boiling_vs_mass_svg(points, alkane_line) -> str:
    """Boiling point (°C) against molar mass, one marker shape per dominant force.

    ``points``: (label, molar_mass, boiling_point_K, force, estimated) tuples;
    ``alkane_line``: (molar_mass, boiling_point_K) pairs of the n-alkanes for reference.
    """
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
            ax.scatter([p[1] for p in sub], [celsius(p[2]) for p in sub], marker=marker, s=42,
                       facecolors="none" if estimated else colour, edgecolors=colour, linewidths=1.3,
                       label=f"{label}{' (estimated bp)' if estimated else ''}", zorder=3)
    for label, mass, tb, _, _ in points:
        ax.annotate(visible(label), (mass, celsius(tb)), textcoords="offset points", xytext=(4, 3), fontsize=6.5,
                    color="#333333", parse_math=False)
    ax.set_xlabel("Molar mass (g/mol)")
    ax.set_ylabel("Normal boiling point (°C)")
    if points:
        top = max(p[1] for p in points)
        ax.set_xlim(0, top * 1.12)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    ax.legend(loc="upper left", fontsize=7.5, frameon=False)
    return _svg(fig)


def series_svg(title: str, points) -> str:
    """Boiling point along a homologous series: ``points`` are (label, carbons, boiling_point_K)."""
    fig, ax = plt.subplots(figsize=(5.0, 3.4))
    xs = [p[1] for p in points]
    ys = [celsius(p[2]) for p in points]
    ax.plot(xs, ys, marker="o", color="#0072B2", linewidth=1.2)
    for label, x, y in zip((p[0] for p in points), xs, ys):
        ax.annotate(visible(label), (x, y), textcoords="offset points", xytext=(4, -10), fontsize=7,
                    parse_math=False)
    ax.set_xlabel("Carbon atoms")
    ax.set_ylabel("Normal boiling point (°C)")
    ax.set_xticks(sorted(set(xs)))
    ax.set_title(visible(title), fontsize=9, parse_math=False)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    return _svg(fig)
