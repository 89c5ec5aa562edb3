"""The per-entry vapor-pressure chart written directly as SVG (builder/publish/svgchart.py)."""
from __future__ import annotations

import math
import xml.etree.ElementTree as ET

import pytest

from builder.publish.svgchart import log_ticks, nice_ticks, vapor_curve_svg

SVG = "{http://www.w3.org/2000/svg}"


def _toluene_segments():
    """Toluene's vapor pressure from Poling's Antoine constants (log10, P in Pa, T in K) as shipped in chemicals."""
    from chemicals.vapor_pressure import Psat_data_AntoinePoling

    row = Psat_data_AntoinePoling.loc["108-88-3"]
    temps = [float(row.Tmin) + (float(row.Tmax) - float(row.Tmin)) * i / 59 for i in range(60)]
    pressures = [10 ** (row.A - row.B / (t + row.C)) for t in temps]
    return [("antoine", temps, pressures)]


@pytest.mark.parametrize("lo, hi", [(0.0, 100.0), (-23.0, 137.0), (0.003, 0.0121), (-180.0, -150.0),
                                    (14.0, 120.6), (250.0, 2600.0)])
def test_nice_ticks_are_round_evenly_spaced_and_inside_the_range(lo, hi):
    ticks = nice_ticks(lo, hi)
    assert 3 <= len(ticks) <= 8
    assert all(lo - 1e-9 <= t <= hi + 1e-9 for t in ticks)
    steps = [b - a for a, b in zip(ticks, ticks[1:])]
    assert max(steps) - min(steps) < 1e-9 * max(1.0, abs(hi))
    mantissa = steps[0] / 10 ** math.floor(math.log10(steps[0]))
    assert any(math.isclose(mantissa, m) for m in (1, 2, 2.5, 5))  # a round step (common practice for axes)
    assert all(math.isclose(t / steps[0], round(t / steps[0]), abs_tol=1e-6) for t in ticks)  # on the step grid


def test_log_ticks_mark_decades_and_the_2_5_steps():
    major, minor = log_ticks(0.15, 300.0)
    assert major == [1.0, 10.0, 100.0]
    assert minor == [0.2, 0.5, 2.0, 5.0, 20.0, 50.0, 200.0]


def test_chart_is_well_formed_deterministic_and_shows_every_series():
    segments = _toluene_segments() + [("estimated", [400.0, 420.0, 440.0], [2.0e5, 3.0e5, 4.5e5])]
    one = vapor_curve_svg(segments, [("stated value", 293.15, 2900.0)], 313.15)
    assert one == vapor_curve_svg(segments, [("stated value", 293.15, 2900.0)], 313.15)
    root = ET.fromstring(one)
    assert root.find(f"{SVG}title").text == "Vapor pressure against temperature"
    assert len(root.findall(f".//{SVG}polyline")) == 2
    texts = [t.text for t in root.iter(f"{SVG}text")]
    for label in ("Antoine equation (valid range)", "estimated from the boiling point", "stated value",
                  "max. store temperature", "Temperature (°C)", "Vapor pressure (kPa)", "101.3 kPa"):
        assert label in texts


def test_points_sit_where_the_axes_say():
    """The curve crosses 101.325 kPa at the normal boiling point the Antoine equation gives."""
    segments = _toluene_segments()
    root = ET.fromstring(vapor_curve_svg(segments))
    line = root.find(f"{SVG}polyline")
    xy = [tuple(map(float, p.split(","))) for p in line.get("points").split()]
    atm_y = next(float(el.get("y1")) for el in root.iter(f"{SVG}line") if el.get("stroke-dasharray") == "6 2 1 2")
    # x of the crossing, by linear interpolation in the drawing
    crossing = next(a[0] + (atm_y - a[1]) * (b[0] - a[0]) / (b[1] - a[1])
                    for a, b in zip(xy, xy[1:]) if (a[1] - atm_y) * (b[1] - atm_y) <= 0)
    ticks = {float(t.text): float(t.get("x")) for t in root.iter(f"{SVG}text")
             if t.get("text-anchor") == "middle" and t.text and t.text.lstrip("-").isdigit()}
    (t0, x0), (t1, x1) = sorted(ticks.items())[:2]
    crossing_c = t0 + (crossing - x0) * (t1 - t0) / (x1 - x0)
    from chemicals.phase_change import Tb

    # the CRC Handbook normal boiling point of toluene, as shipped in chemicals (383.75 K)
    assert math.isclose(crossing_c, Tb("108-88-3", method="CRC_ORG") - 273.15, abs_tol=1.5)


def test_entry_text_never_reaches_the_chart_unescaped():
    svg = vapor_curve_svg(_toluene_segments(), [("<b>&", 300.0, 4000.0)])
    assert "<b>" not in svg and "&lt;b&gt;&amp;" in svg
    ET.fromstring(svg)


def test_text_is_escaped_as_the_standard_library_escapes_it():
    """svgchart.escape stands in for xml.sax.saxutils.escape (not imported on every build)."""
    from xml.sax.saxutils import escape as reference

    from builder.publish import svgchart

    for text in ("a & b", "<script>", "x > y < z", "&amp;", "plain", "R&D <lab> & co >", ""):
        assert svgchart.escape(text) == reference(text)


class _EveryBox:
    """A ``Taken`` without the grid: every box compared with every other (the brute-force reference)."""

    def __init__(self):
        self.boxes = []

    def add(self, box):
        self.boxes.append(box)

    def hit(self, box):
        from builder.publish.placement import overlaps

        return any(overlaps(box, other) for other in self.boxes)


@pytest.mark.parametrize("cell", [4.0, 8.0, 24.0, 100.0])
def test_the_name_grid_places_names_as_comparing_every_box_would(cell, monkeypatch):
    """The grid of taken boxes only narrows the comparisons: on a crowded chart (400 points, a
    fixed random seed) it must give the places that comparing with every box gives, whatever its cell size."""
    import random

    from builder.publish import placement

    rng = random.Random(7)
    items = [(f"name {i} " + "x" * rng.randrange(12), rng.uniform(0, 600), rng.uniform(0, 400)) for i in range(400)]
    reference = placement.place_names(items, (0, 0, 600, 400), 7.0, taken=_EveryBox())
    monkeypatch.setattr(placement.Taken, "CELL", cell)
    assert placement.place_names(items, (0, 0, 600, 400), 7.0) == reference
    assert 30 < len(reference[0]) < 390  # crowded: some names placed, some left off
