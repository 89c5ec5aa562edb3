"""Pieces of the catalog-wide files (a table row, a shelf card, a CSV row), kept between builds.

A page that lists every material is written again whenever any material changes, yet
nearly all of its rows are as they were. Each row is therefore a *piece*, stored under the
key of everything it shows: the entry's derive key (the entry, the stores it names, its
components, the code and the settings), the name of what makes it, and whatever else the
row reads (its substitutes, its revision line), given explicitly. The pieces of one file are
kept together in one cache file (kind ``pieces``), named by the file's site path and the
site key (code version, settings, revision stamp). A piece is used only when its own key
matches, so a file left by an older build costs time, never a wrong page; it holds only the
pieces the last build used, so it does not grow.
"""
from __future__ import annotations

from builder.core.cache import Cache, key_of

KIND = "pieces"


class Pieces:
    """The pieces of one catalog-wide file: ``get(parts, make)`` returns the text kept under the key of
    ``parts``, or ``make()``."""

    def __init__(self, cache: Cache | None, base: str, path: str):
        self.cache = cache
        self.name = key_of(base, KIND, path)
        kept = cache.get(KIND, self.name) if cache is not None else None
        self.kept: dict[str, str] = kept if isinstance(kept, dict) else {}
        self.used: dict[str, str] = {}
        self.made = 0
        self.module = None  # the template module of a page's pieces, made on the first miss

    def get(self, parts: tuple, make) -> str:
        """The piece made from ``parts`` (strings or objects with a stable ``repr``)."""
        key = key_of(*(p if isinstance(p, str) else repr(p) for p in parts))
        text = self.used.get(key)
        if text is None:
            text = self.kept.get(key)
            if not isinstance(text, str):
                text = make()
                self.made += 1
            self.used[key] = text
        return text

    def save(self) -> None:
        """Keep this build's pieces for the next one (only when something changed)."""
        if self.cache is not None and (self.made or self.used.keys() != self.kept.keys()):
            self.cache.put(KIND, self.name, self.used)
