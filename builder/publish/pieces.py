"""Pieces of the catalog-wide files (a table row, a shelf card, a CSV row), kept between builds.

A page that lists every material is written again whenever any material changes, yet
nearly all of its rows are as they were. Each row is therefore a *piece*, stored under the
key of everything it shows: the entry's derive key (the entry, the stores it names, its
components, the code and the settings), the name of what makes it, and whatever else the
row reads (its substitutes, its revision line), given explicitly. The pieces of one file are
kept in :data:`SHARDS` cache files (kind ``pieces``), named by the file's site path, the
site key (code version, settings, revision stamp) and the shard number; a piece goes to the
shard of its key's first hex digit. A piece is used only when its own key matches, so a file
left by an older build costs time, never a wrong page; each shard holds only the pieces the
last build used, so it does not grow.

Why shards: the pieces of a 1,000-entry ``catalog.json`` are 14 MB. After one edit only the
shards that lost or gained a piece are written again (at most two per changed piece), not all
of it.
"""
from __future__ import annotations

from builder.core.cache import Cache, key_of

KIND = "pieces"
#: cache files per catalog-wide file: one per first hex digit of a piece's key (``_shard_of``)
SHARDS = 16


class Pieces:
    """The pieces of one catalog-wide file: ``get(parts, make)`` returns the text kept under the key of
    ``parts``, or ``make()``."""

    def __init__(self, cache: Cache | None, base: str, path: str):
        self.cache = cache
        self.name = key_of(base, KIND, path)
        self.kept: dict[str, str] = {}
        #: the keys each shard held when read, by shard number (None: no readable shard file)
        self._read: list[set | None] = [None] * SHARDS
        if cache is not None:
            for i in range(SHARDS):
                kept = cache.get(KIND, self._shard_key(i))
                if isinstance(kept, dict):
                    self._read[i] = set(kept)
                    self.kept.update(kept)
        self._made_in: set[int] = set()  # shards that gained a newly made piece
        self.used: dict[str, str] = {}
        self.made = 0
        self.module = None  # the template module of a page's pieces, made on the first miss

    def _shard_key(self, shard: int) -> str:
        return key_of(self.name, f"shard {shard} of {SHARDS}")

    def get(self, parts: tuple, make) -> str:
        """The piece made from ``parts`` (strings or objects with a stable ``repr``)."""
        key = key_of(*(p if isinstance(p, str) else repr(p) for p in parts))
        text = self.used.get(key)
        if text is None:
            text = self.kept.get(key)
            if not isinstance(text, str):
                text = make()
                self.made += 1
                self._made_in.add(_shard_of(key))
            self.used[key] = text
        return text

    def save(self) -> None:
        """Keep this build's pieces for the next one: each shard whose pieces changed, and each shard
        that had no readable file (an empty one too, so that the next build finds every shard)."""
        if self.cache is None:
            return
        shards: list[dict] = [{} for _ in range(SHARDS)]
        for key, text in self.used.items():
            shards[_shard_of(key)][key] = text
        for i, (now, before) in enumerate(zip(shards, self._read)):
            if before is None or i in self._made_in or now.keys() != before:
                self.cache.put(KIND, self._shard_key(i), now)


def _shard_of(key: str) -> int:
    """The shard of a piece: the first hex digit of its key."""
    return int(key[0], 16)
