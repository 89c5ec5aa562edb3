"""Charts as deterministic SVG (matplotlib, Agg): same data, same bytes.

Readable in greyscale and for colour-blind readers: every series has its own marker
shape and line style as well as a colour from the Okabe–Ito palette (Okabe & Ito 2008,
"Color Universal Design"), and every chart is shown with a text alternative.

Contents: ``boiling_vs_mass_svg``, ``series_svg``, ``vapor_curve_svg``.
"""
from __future__ import annotations

import io

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

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
        ax.plot(xs, [y - 273.15 for y in ys], color="#444444", linestyle="--", linewidth=1.0,
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
            ax.scatter([p[1] for p in sub], [p[2] - 273.15 for p in sub], marker=marker, s=42,
                       facecolors="none" if estimated else colour, edgecolors=colour, linewidths=1.3,
                       label=f"{label}{' (estimated bp)' if estimated else ''}", zorder=3)
    for label, mass, tb, _, _ in points:
        ax.annotate(label, (mass, tb - 273.15), textcoords="offset points", xytext=(4, 3), fontsize=6.5,
                    color="#333333")
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
    ys = [p[2] - 273.15 for p in points]
    ax.plot(xs, ys, marker="o", color="#0072B2", linewidth=1.2)
    for label, x, y in zip((p[0] for p in points), xs, ys):
        ax.annotate(label, (x, y), textcoords="offset points", xytext=(4, -10), fontsize=7)
    ax.set_xlabel("Carbon atoms")
    ax.set_ylabel("Normal boiling point (°C)")
    ax.set_xticks(sorted(set(xs)))
    ax.set_title(title, fontsize=9)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    return _svg(fig)


_SEGMENT_STYLE = {
    "antoine": ("-", 1.8, "#0072B2", "Antoine equation (valid range)"),
    "antoine-outside": (":", 1.2, "#0072B2", "Antoine equation outside its range"),
    "estimated": ("--", 1.4, "#D55E00", "estimated from the boiling point"),
}


def vapor_curve_svg(segments, points=(), store_temperature_K=None) -> str:
    """Vapor pressure (kPa, log scale) against temperature (°C).

    ``segments``: (kind, temperatures_K, pressures_Pa) with kind in ``_SEGMENT_STYLE``;
    ``points``: (label, T_K, P_Pa) stated values; ``store_temperature_K`` is marked.
    """
    fig, ax = plt.subplots(figsize=(5.2, 3.3))
    seen = set()
    for kind, temps, pressures in segments:
        style, width, colour, label = _SEGMENT_STYLE[kind]
        ax.plot([t - 273.15 for t in temps], [p / 1000.0 for p in pressures], linestyle=style, linewidth=width,
                color=colour, label=None if kind in seen else label)
        seen.add(kind)
    for label, t, p in points:
        ax.scatter([t - 273.15], [p / 1000.0], marker="s", s=30, color="#000000", zorder=4, label=label)
    ax.axhline(101.325, color="#777777", linewidth=0.8, linestyle="-.")
    ax.annotate("101.3 kPa", (ax.get_xlim()[0], 101.325), textcoords="offset points", xytext=(2, 3), fontsize=6.5)
    if store_temperature_K is not None:
        ax.axvline(store_temperature_K - 273.15, color="#000000", linewidth=0.9, linestyle=(0, (1, 1)),
                   label="max. store temperature")
    ax.set_yscale("log")
    ax.set_xlabel("Temperature (°C)")
    ax.set_ylabel("Vapor pressure (kPa)")
    ax.grid(True, which="both", color="#e4e4e4", linewidth=0.5)
    ax.legend(loc="lower right", fontsize=6.5, frameon=False)
    return _svg(fig)
