"""Charts as deterministic SVG (matplotlib, Agg): same data, same bytes.

Readable in greyscale and for colour-blind readers: every series has its own marker
shape and line style as well as a colour from the Okabe–Ito palette (Okabe & Ito 2008,
"Color Universal Design"), and every chart is shown with a text alternative.

Entry text on a chart (material names, series titles) is drawn as plain text: never
parsed as matplotlib math (``$...$``), bidi controls shown as ``[U+XXXX]``.

Contents: ``txy_svg`` (the T–x–y diagram of a binary mixture). The charts
drawn by the hundred or over the whole catalog (the per-entry vapor-pressure chart, the trends
page's boiling-point charts, the solvency map) are written directly as SVG by ``svgchart.py`` and
``solvency_chart.py``, about a hundred times faster.
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


def _svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": "cohesion"}, bbox_inches="tight")
    plt.close(fig)
    return buf.getvalue()


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
