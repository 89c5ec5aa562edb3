"""Point names on charts written directly as SVG: widths and places, without a renderer.

A name's width is the sum of its characters' advance widths in DejaVu Sans (the font the charts
name first; ``builder/data/text_widths.json``, written by ``tools/make_text_widths.py``); a
character the table lacks counts as the widest one, and every width is taken 4 % wider, so a
browser that falls back to another sans-serif font still finds the room it was promised.

``place_names`` puts each name at the first of a list of places around its point where its box
stays inside the plot and clear of every box taken so far (other names, the markers, the legend);
a name with no free place is left off and returned, and the page's table lists every point.
Boxes are (x0, y0, x1, y1) in SVG user units, y downwards.
"""
from __future__ import annotations

import json
from functools import lru_cache
from pathlib import Path

WIDTHS_PATH = Path(__file__).resolve().parent.parent / "data" / "text_widths.json"
ASCENT, DESCENT = 0.93, 0.24  # DejaVu Sans, in em: the box of a line of text about its baseline
SLACK = 1.04

#: where a name may sit: (dx, dy, anchor) of its baseline point relative to the marker, in em
#: of the name's size, tried in this order (right above, right below, left above, left below,
#: above, below, right, left)
PLACES = ((0.8, -0.6, "start"), (0.8, 1.5, "start"), (-0.8, -0.6, "end"), (-0.8, 1.5, "end"),
          (0.0, -1.1, "middle"), (0.0, 2.1, "middle"), (1.3, 0.4, "start"), (-1.3, 0.4, "end"))


@lru_cache(maxsize=1)
def _widths() -> tuple[dict[str, float], float]:
    table = json.loads(WIDTHS_PATH.read_text(encoding="utf-8"))["widths"]
    return table, max(table.values())


def text_width(text: str, size: float) -> float:
    """Width of ``text`` at font size ``size`` (user units), erring wide.

    >>> round(text_width("MM", 10.0) / text_width("M", 10.0), 6)
    2.0
    >>> text_width("\u4e00", 10.0) >= text_width("W", 10.0)  # not in the table: the widest
    True
    """
    table, widest = _widths()
    return SLACK * size * sum(table.get(ch, widest) for ch in text)


def text_box(text: str, x: float, baseline: float, size: float, anchor: str = "start") -> tuple:
    """The box (x0, y0, x1, y1) a line of text takes when drawn at (x, baseline) with ``anchor``."""
    width = text_width(text, size)
    x0 = x - {"start": 0.0, "middle": width / 2.0, "end": width}[anchor]
    return (x0, baseline - ASCENT * size, x0 + width, baseline + DESCENT * size)


def overlaps(a: tuple, b: tuple, pad: float = 1.0) -> bool:
    return not (a[2] + pad <= b[0] or b[2] + pad <= a[0] or a[3] + pad <= b[1] or b[3] + pad <= a[1])


class Taken:
    """Boxes already taken, filed by grid cell so a new box is compared only with its neighbours."""

    CELL = 8.0
    """Side of a grid cell [user units]. The grid only narrows the comparisons, so the places found
    do not depend on it; 8 rather than 24 because markers crowd a chart of thousands of points
    (10,000-entry benchmark catalog, boiling point against molar mass: 1.8 s with 24, 0.7 s with 8,
    the same SVG)."""

    def __init__(self, boxes=()):
        self.cells: dict[tuple[int, int], list] = {}
        for box in boxes:
            self.add(box)

    def _cells(self, box, pad: float = 1.0):
        c = self.CELL
        for i in range(int((box[0] - pad) // c), int((box[2] + pad) // c) + 1):
            for j in range(int((box[1] - pad) // c), int((box[3] + pad) // c) + 1):
                yield i, j

    def add(self, box) -> None:
        for cell in self._cells(box):
            self.cells.setdefault(cell, []).append(box)

    def hit(self, box) -> bool:
        return any(overlaps(box, other) for cell in self._cells(box) for other in self.cells.get(cell, ()))


def place_names(items, frame: tuple, size: float, taken: Taken | None = None, marker: float = 3.5):
    """Places for the names of ``items`` ((name, x, y) in user units, placed in that order).

    Returns (placed, left_off): placed is (name, x, baseline, anchor) per name drawn, left_off the
    names with no free place. Every marker (a square of half-side ``marker``) is taken first.

    >>> placed, left = place_names([("A", 50, 50), ("B", 50, 50)], (0, 0, 100, 100), 7.0)
    >>> [p[0] for p in placed], left
    (['A', 'B'], [])
    >>> place_names([("far too long a name", 5, 5)], (0, 0, 20, 20), 7.0)
    ([], ['far too long a name'])
    """
    taken = taken or Taken()
    for _, x, y in items:
        taken.add((x - marker, y - marker, x + marker, y + marker))
    placed, left_off = [], []
    for name, x, y in items:
        for dx, dy, anchor in PLACES:
            tx, ty = x + dx * size, y + dy * size
            box = text_box(name, tx, ty, size, anchor)
            inside = frame[0] <= box[0] and box[2] <= frame[2] and frame[1] <= box[1] and box[3] <= frame[3]
            if inside and not taken.hit(box):
                taken.add(box)
                placed.append((name, tx, ty, anchor))
                break
        else:
            left_off.append(name)
    return placed, left_off
