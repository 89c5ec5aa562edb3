"""Catalog charts: point names never overlap, never leave the plot and never sit on an axis line;
a name with no room is left off (the page's table lists it). The trends page's charts are written
directly as SVG (builder/publish/svgchart.py, names placed by builder/publish/placement.py); the
browser test measures the names as Chromium draws them, with its own fonts."""
from __future__ import annotations

import random
import re
from html import unescape

import pytest

from builder.chem.forces import n_alkane_boiling_point
from builder.publish import placement, solvency_chart, svgchart

_NAME = re.compile(r'<text x="([-\d.]+)" y="([-\d.]+)"(?: text-anchor="(\w+)")?>([^<]*)</text>')


def _names(svg: str, size: float):
    """(name, box) of every point name in a chart (the last group of texts at that size)."""
    group = svg.rsplit(f'<g fill="#333333" font-size="{size:g}">', 1)[1].split("</g>", 1)[0]
    return [(unescape(n), placement.text_box(unescape(n), float(x), float(y), size, a or "start"))
            for x, y, a, n in _NAME.findall(group)]


def _frame(svg: str):
    """The plot's box (inside the axis lines), from the axis lines of the chart."""
    m = re.search(r'<g stroke="#000000" stroke-width="0.8"><line x1="([\d.]+)" x2="([\d.]+)" y1="([\d.]+)" '
                  r'y2="[\d.]+"/><line x1="[\d.]+" x2="[\d.]+" y1="([\d.]+)"', svg)
    left, right, axis_y, top = (float(v) for v in m.groups())
    return left, top, right, axis_y


def _assert_clear(boxes, frame):
    for i, (name, box) in enumerate(boxes):
        assert frame[0] < box[0] and box[2] <= frame[2] and frame[1] <= box[1] and box[3] < frame[3], name
        for other, box2 in boxes[i + 1:]:
            assert not placement.overlaps(box, box2, pad=0.0), (name, other)


def _crowd(n=30, seed=1):
    rng = random.Random(seed)
    points = [(f"Material number {i}", rng.uniform(40, 150), rng.uniform(300, 450), "dispersion", i % 3 == 0)
              for i in range(n)]
    alkane = [(m, n_alkane_boiling_point(m)) for m in range(17, 160, 5)]
    return points, alkane


def test_crowded_trend_chart_names_do_not_overlap_or_leave_the_axes():
    points, alkane = _crowd()
    svg, left_off = svgchart.boiling_vs_mass_chart(points, alkane)
    boxes = _names(svg, svgchart.NAME_SIZE_SMALL)
    _assert_clear(boxes, _frame(svg))
    shown = {name for name, _ in boxes}
    # every point is either named on the chart or reported as left off (for the table)
    assert shown | set(left_off) == {p[0] for p in points} and not shown & set(left_off)
    assert len(shown) >= 10  # room is used, not given up


def test_series_names_stay_off_the_axes():
    points = [("Methanol", 1, 337.8), ("Ethanol", 2, 351.4), ("Propan-1-ol", 3, 370.3), ("Butan-1-ol", 4, 390.8)]
    svg = svgchart.series_svg("Methanol → Butan-1-ol", points)
    boxes = _names(svg, svgchart.NAME_SIZE)
    _assert_clear(boxes, _frame(svg))
    assert {n for n, _ in boxes} == {p[0] for p in points}
    assert "<title>Methanol → Butan-1-ol</title>" in svg  # the text alternative


def test_a_long_series_title_is_wrapped_not_cut():
    names = [f"Alkan-{i}-ol with a long name" for i in range(1, 9)]
    title = " → ".join(names)
    svg = svgchart.series_svg(title, [(n, i + 1, 300.0 + 15 * i) for i, n in enumerate(names)])
    lines = re.findall(r'<text x="250" y="\d+" text-anchor="middle">([^<]*)</text>', svg)
    assert len(lines) >= 2 and " ".join(unescape(x) for x in lines) == title
    assert all(placement.text_width(unescape(x), 9.0) <= svgchart.SERIES_WIDTH for x in lines)


def _liquids(n=120, seed=5):
    """(Derived-like, (δD, δP, δH)) of ``n`` invented liquids and one invented resin sphere."""
    from types import SimpleNamespace

    rng = random.Random(seed)
    forces = ("dispersion", "dipole-dipole", "hydrogen-bonding", None)
    rows = []
    for i in range(n):
        force = forces[i % 4]
        d = SimpleNamespace(entry=SimpleNamespace(name=f"Liquid {i}"),
                            label=lambda key, f=force: SimpleNamespace(code=f) if f else None)
        rows.append((d, (rng.uniform(14.0, 20.0), rng.uniform(0.0, 14.0), rng.uniform(0.0, 22.0))))
    resin = SimpleNamespace(entry=SimpleNamespace(name="Resin R-1"))
    return rows, [(resin, SimpleNamespace(delta_d=17.0, delta_p=6.0, delta_h=6.0, radius=5.0))]


def test_crowded_solvency_map_names_do_not_overlap_or_leave_the_axes():
    from xml.etree import ElementTree

    liquids, spheres = _liquids()
    svg = solvency_chart.solvency_map_svg(liquids, spheres)
    ElementTree.fromstring(svg)  # well-formed
    assert svg.startswith("<svg") and "<title>The catalog's liquids" in svg  # the text alternative
    boxes = _names(svg, svgchart.NAME_SIZE_SMALL)
    _assert_clear(boxes, _frame(svg))
    assert len(boxes) >= 30  # room is used, not given up
    for shape, colour, _words in svgchart.FORCE_MARKS.values():
        if shape != "diamond":  # no ionic liquid among them
            assert f'fill="{colour}" fill-opacity="0.85"' in svg, colour
    assert svg.count("<ellipse ") == 1 and "Resin R-1 (sphere)" in svg
    assert solvency_chart.solvency_map_svg(liquids, spheres) == svg  # same data, same bytes


@pytest.mark.browser
def test_names_as_chromium_draws_them_do_not_overlap(browser, tmp_path):
    """The widths the placement assumes hold for the fonts a browser really uses: every name's
    box as Chromium lays it out (getBBox) stays inside the plot and clear of every other name."""
    points, alkane = _crowd(200, seed=3)
    charts = {"bvm.svg": (svgchart.boiling_vs_mass_svg(points, alkane), svgchart.NAME_SIZE_SMALL),
              "series.svg": (svgchart.series_svg("Methanol → Hexan-1-ol", [
                  ("Methanol", 1, 337.8), ("Ethanol", 2, 351.4), ("Propan-1-ol", 3, 370.3),
                  ("Butan-1-ol", 4, 390.8), ("Pentan-1-ol", 5, 411.1), ("Hexan-1-ol", 6, 430.2)]),
                  svgchart.NAME_SIZE),
              "solvency.svg": (solvency_chart.solvency_map_svg(*_liquids(200, seed=8)), svgchart.NAME_SIZE_SMALL)}
    page = browser.new_page()
    try:
        for name, (svg, size) in charts.items():
            (tmp_path / name).write_text(svg, encoding="utf-8")
            page.goto((tmp_path / name).as_uri())
            boxes = page.evaluate(f"""() => [...document.querySelectorAll('g[font-size="{size:g}"] text')].map(t => {{
                const b = t.getBBox(); return [t.textContent, [b.x, b.y, b.x + b.width, b.y + b.height]]; }})""")
            assert len(boxes) >= 6, name
            _assert_clear([(n, tuple(b)) for n, b in boxes], _frame(svg))
    finally:
        page.close()


def test_the_trends_page_links_the_table_of_every_point():
    from pathlib import Path

    page = (Path(__file__).resolve().parents[1] / "templates" / "trends.html").read_text(encoding="utf-8")
    assert 'id="chart-data"' in page and 'href="#chart-data"' in page


def test_every_marker_is_drawn_in_its_colour_measured_or_estimated():
    """A point is never invisible: each force class has its shape and colour, measured points filled,
    estimated ones hollow, and the cross (a line marker with no inside) drawn thinner instead."""
    points = [(f"{force} {est}", 50.0 + 10 * i, 350.0 + 5 * i, force, est)
              for i, (force, est) in enumerate((f, e) for f in svgchart.FORCE_MARKS for e in (False, True))]
    alkane = [(m, n_alkane_boiling_point(m)) for m in range(17, 160, 5)]
    svg = svgchart.boiling_vs_mass_svg(points, alkane)
    plotted = svg.split("</polyline>")[0]
    for force, (shape, colour, words) in svgchart.FORCE_MARKS.items():
        for estimated in (False, True):
            paint = svgchart._paint(shape, colour, estimated)
            assert f'stroke="{colour}"' in paint
            assert plotted.count(f"<path {paint} d=") == 2, (force, estimated)  # the points and the legend
            legend = f"{words}{' (estimated bp)' if estimated else ''}</text>"
            assert legend in svg
        filled, hollow = (svgchart._paint(shape, colour, e) for e in (False, True))
        assert filled != hollow and ('fill="none"' in hollow)


def test_placement_examples():
    import doctest

    result = doctest.testmod(placement)
    assert result.attempted >= 4 and result.failed == 0
