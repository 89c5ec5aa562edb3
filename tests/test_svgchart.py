"""The per-entry vapor-pressure chart written directly as SVG (builder/publish/svgchart.py)."""
from __future__ import annotations

import math
import xml.etree.ElementTree as ET

from builder.publish.svgchart import log_ticks, nice_ticks, vapor_curve_svg

SVG = "{http://www.w3.org/2000/svg}"


def _toluene_segments():
    # Poling et al., The Properties of Gases and Liquids, 5th ed., Antoine constants for toluene
    # (log10, P in bar, T in K): A = 4.07827, B = 1343.943, C = -53.773 (common table values; from memory)
    temps = [286.0 + 2.0 * i for i in range(60)]
    pressures = [10 ** (4.07827 - 1343.943 / (t - 53.773)) * 1e5 for t in temps]
    return [("antoine", temps, pressures)]


def test_nice_ticks_are_round_and_cover_the_range():
    assert nice_ticks(0.0, 100.0) == [0, 20, 40, 60, 80, 100]
    assert nice_ticks(-23.0, 137.0) == [0, 50, 100]  # steps of 1, 2, 2.5 or 5 × 10^k, about 6 ticks
    assert nice_ticks(0.003, 0.0121) == [0.004, 0.006, 0.008, 0.01, 0.012]


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
    # CRC: toluene boils at 110.6 °C
    assert math.isclose(crossing_c, 110.6, abs_tol=1.5)


def test_entry_text_never_reaches_the_chart_unescaped():
    svg = vapor_curve_svg(_toluene_segments(), [("<b>&", 300.0, 4000.0)])
    assert "<b>" not in svg and "&lt;b&gt;&amp;" in svg
    ET.fromstring(svg)
