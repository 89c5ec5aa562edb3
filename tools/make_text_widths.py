"""Write builder/data/text_widths.json: advance widths of DejaVu Sans (the font the charts name
first), in em, for the characters chart labels use.

The charts written directly as SVG (``builder/publish/svgchart.py``) place names without overlap,
so they need each name's width before a browser draws it. The widths come from the DejaVu Sans
shipped with matplotlib (Bitstream Vera licence); a character not in the table is measured as the
widest one, so an estimate errs on the side of room. Run from the project folder:
``python tools/make_text_widths.py``.
"""
from __future__ import annotations

import json
from pathlib import Path

from matplotlib import font_manager
from matplotlib.ft2font import FT2Font, LoadFlags

CHARS = ("".join(chr(c) for c in range(32, 127)) + "".join(chr(c) for c in range(0xA0, 0x180))
         + "αβγδεζηθικλμνξοπρστυφχψωΔΣΩ–—‘’“”•·…′″→←±×÷°µ‐‑")


def main() -> None:
    path = font_manager.findfont(font_manager.FontProperties(family="DejaVu Sans"), fallback_to_default=False)
    font = FT2Font(path)
    em = font.units_per_EM
    widths = {}
    for ch in CHARS:
        index = font.get_char_index(ord(ch))
        if index == 0:
            continue
        glyph = font.load_char(ord(ch), flags=LoadFlags.NO_SCALE)  # font units
        widths[ch] = round(glyph.horiAdvance / em, 4)
    out = Path(__file__).resolve().parents[1] / "builder" / "data" / "text_widths.json"
    data = {"font": "DejaVu Sans (as shipped with matplotlib)", "unit": "em", "widths": widths}
    out.write_text(json.dumps(data, ensure_ascii=False, sort_keys=True, indent=0) + "\n", encoding="utf-8")
    print(f"{len(widths)} widths written to {out}")


if __name__ == "__main__":
    main()
