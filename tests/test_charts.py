"""Catalog charts (builder/publish/charts.py): point names never overlap, never leave the axes
and never sit on an axis line; a name with no room is left off (the page's table lists it)."""
from __future__ import annotations

import random

from builder.chem.forces import n_alkane_boiling_point
from builder.publish import charts


def _label_boxes(fig, ax):
    renderer = fig.canvas.get_renderer()
    return [(t.get_text(), t.get_window_extent(renderer)) for t in ax.texts]


def _assert_clear(fig, ax):
    fig.canvas.draw()
    frame = ax.get_window_extent(fig.canvas.get_renderer())
    boxes = _label_boxes(fig, ax)
    for i, (name, box) in enumerate(boxes):
        assert frame.x0 <= box.x0 and box.x1 <= frame.x1 and frame.y0 <= box.y0 and box.y1 <= frame.y1, name
        for other, box2 in boxes[i + 1:]:
            assert not box.overlaps(box2), (name, other)
    return boxes


def test_crowded_trend_chart_names_do_not_overlap_or_leave_the_axes():
    rng = random.Random(1)
    points = [(f"Material number {i}", rng.uniform(40, 150), rng.uniform(300, 450), "dispersion", i % 3 == 0)
              for i in range(30)]
    alkane = [(m, n_alkane_boiling_point(m)) for m in range(17, 160, 5)]
    fig, left_off = charts.boiling_vs_mass_figure(points, alkane)
    ax = fig.axes[0]
    boxes = _assert_clear(fig, ax)
    shown = {name for name, _ in boxes}
    # every point is either named on the chart or reported as left off (for the table)
    assert shown | set(left_off) == {p[0] for p in points} and not shown & set(left_off)
    assert len(shown) >= 10  # room is used, not given up


def test_series_names_stay_off_the_axes():
    points = [("Methanol", 1, 337.8), ("Ethanol", 2, 351.4), ("Propan-1-ol", 3, 370.3), ("Butan-1-ol", 4, 390.8)]
    fig, left_off = charts.series_figure("Methanol → Butan-1-ol", points)
    boxes = _assert_clear(fig, fig.axes[0])
    assert left_off == [] and {n for n, _ in boxes} == {p[0] for p in points}


def test_the_trends_page_links_the_table_of_every_point():
    from pathlib import Path

    page = (Path(__file__).resolve().parents[1] / "templates" / "trends.html").read_text(encoding="utf-8")
    assert 'id="chart-data"' in page and 'href="#chart-data"' in page


def test_every_marker_is_drawn_in_its_colour_measured_or_estimated():
    """A point is never invisible: the unclassified marker (×, a line marker with no inside) once
    took the hollow style of estimated points and was drawn with no colour at all."""
    import warnings

    from matplotlib.colors import to_rgba

    points = [(f"{force} {est}", 50.0 + 10 * i, 350.0 + 5 * i, force, est)
              for i, (force, est) in enumerate((f, e) for f in charts.FORCE_STYLE for e in (False, True))]
    alkane = [(m, n_alkane_boiling_point(m)) for m in range(17, 160, 5)]
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # matplotlib warns when it drops a marker's colour
        fig, _ = charts.boiling_vs_mass_figure(points, alkane)
    collections = [c for c in fig.axes[0].collections if c.get_label() and not c.get_label().startswith("_")]
    assert len(collections) == 2 * len(charts.FORCE_STYLE)
    for c in collections:
        colour = next(style[1] for style in charts.FORCE_STYLE.values() if c.get_label().startswith(style[2]))
        drawn = [tuple(x) for x in c.get_edgecolor()] + [tuple(x) for x in c.get_facecolor()]
        assert to_rgba(colour) in drawn, c.get_label()
