"""Entry text and file names made safe to publish, whatever an entry holds.

- ``visible(text)``: bidirectional control characters (which can make a name or note read
  differently from what it holds) are replaced by a visible marker such as ``[U+202E]``;
  ``visible_data`` does the same through a JSON-ready structure. Pages (a Jinja ``finalize``
  hook in ``templating.py``), charts, the search index and every export go through it.
- ``csv_text_cell(text)``: a text cell of ``catalog.csv`` that a spreadsheet would read as a
  formula (starting with ``=``, ``+``, ``-``, ``@``, a tab or a carriage return) gets a
  leading apostrophe. Number columns are left alone, so ``-45.0`` stays a number.
- ``short_path(path)``: a site path whose parts all fit in :data:`MAX_NAME_BYTES` bytes, so
  no id or store key, however long, makes a file name the file system refuses. Parts that
  fit are kept as they are; longer ones are cut and given a hash of the whole part, so
  different long names stay different. Every written file and every link goes through it.
"""
from __future__ import annotations

import hashlib
import re

#: LRE, RLE, PDF, LRO, RLO; LRI, RLI, FSI, PDI; LRM, RLM; the Arabic letter mark
BIDI_CONTROLS = ("\u202a\u202b\u202c\u202d\u202e" "\u2066\u2067\u2068\u2069" "\u200e\u200f" "\u061c")
_BIDI = re.compile(f"[{BIDI_CONTROLS}]")

#: first characters that make a spreadsheet treat a cell as a formula
CSV_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")

#: longest file or folder name the site writes (bytes, UTF-8); file systems allow 255,
#: and the print step adds ".print-letter.html" to page names
MAX_NAME_BYTES = 120
_KEPT_CHARS = 80
_HASH_CHARS = 12


def visible(text: str) -> str:
    """``text`` with each bidirectional control character shown as ``[U+XXXX]``."""
    if text.isascii() or not _BIDI.search(text):  # the controls are all outside ASCII
        return text
    return _BIDI.sub(lambda m: f"[U+{ord(m.group()):04X}]", text)


def visible_data(data):
    """``visible`` applied to every string (keys too) of a JSON-ready structure."""
    if isinstance(data, str):
        return visible(data)
    if isinstance(data, dict):
        return {visible_data(k): visible_data(v) for k, v in data.items()}
    if isinstance(data, (list, tuple)):
        return [visible_data(v) for v in data]
    return data


def csv_text_cell(text: str) -> str:
    """A text cell for ``catalog.csv``: visible controls, and no cell that reads as a formula."""
    text = visible(text)
    return "'" + text if text.startswith(CSV_FORMULA_STARTS) else text


def short_name(name: str) -> str:
    """One path part, cut to :data:`MAX_NAME_BYTES` bytes with a hash when longer."""
    if len(name.encode("utf-8")) <= MAX_NAME_BYTES:
        return name
    stem, dot, ext = name.rpartition(".")
    if not dot or len(ext) > 10:
        stem, ext = name, ""
    digest = hashlib.sha256(name.encode("utf-8")).hexdigest()[:_HASH_CHARS]
    kept = stem[:_KEPT_CHARS]
    while len(kept.encode("utf-8")) > _KEPT_CHARS:
        kept = kept[:-1]
    return f"{kept}-{digest}" + (f".{ext}" if ext else "")


def short_path(path: str) -> str:
    """A site path (posix, relative to the site root) with every part cut by ``short_name``."""
    return "/".join(short_name(part) for part in path.split("/"))
