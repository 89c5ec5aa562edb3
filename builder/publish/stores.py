"""Store-level views for the printouts: which materials a store holds, their conflicts with the
store's temperature rating, and notes that apply to the store as a whole.

Rules (our own wording; the criteria are the GHS category and flash/boiling points):

- a material conflicts with a store when the store's rated temperature reaches its flash point
  (ignitable vapor above the liquid) or comes within 5 K of its boiling point (pressure build-up);
- store-wide notes: more than one category-1 liquid; the number of flammable liquids
  (categories 1–3) kept together; flammable liquids in a store with no temperature rating.
"""
from __future__ import annotations

from builder.chem.storage import (
    default_table,
    flammable_volume,
    grouped_conflicts,
    kind_conflicts,
    store_conflicts,
)
from builder.core.cache import Cache, code_version, key_of
from builder.core.model import Catalog
from builder.core.units import celsius_text
from builder.derive.catalog import store_members
from builder.derive.entry import Derived

BOILING_MARGIN_K = 5.0


def conflicts(d: Derived, rated_K: float | None) -> list[str]:
    if rated_K is None:
        return []
    out = []
    fp, bp = d.get("flash_point"), d.get("boiling_point")
    if fp is not None and rated_K >= fp.value:
        out.append(f"store reaches the flash point ({celsius_text(fp.value, 0)}{', estimated' if fp.kind == 'estimated' else ''})")
    if bp is not None and rated_K >= bp.value - BOILING_MARGIN_K:
        out.append(f"store within {BOILING_MARGIN_K:.0f}\u00a0K of the boiling point ({celsius_text(bp.value, 0)}): pressure build-up")
    return out


def store_sheet(catalog: Catalog, derived: tuple[Derived, ...], key: str, compat: dict | None = None) -> dict:
    """Context for one store sheet, materials in a stable order (category, then name); ``compat``:
    the store's ``store_compatibility`` when the caller has it already."""
    loc = catalog.locations[key]
    rated = loc.max_store_temperature.value if loc.max_store_temperature else None
    members = list(store_members(derived).get(key, ()))

    def order(d):
        cat = d.label("flammable_category")
        return (cat.code if cat and cat.code is not None else 9, d.entry.name.lower(), d.entry.id)

    members.sort(key=order)
    cats = [d.label("flammable_category").code for d in members if d.label("flammable_category")]
    notes = []
    if cats.count(1) > 1:
        notes.append(f"{cats.count(1)} category-1 liquids (extremely flammable, boiling at or below 35 °C) are kept "
                     "here together: keep quantities to the minimum and the store cool and ventilated.")
    flammable = [c for c in cats if c in (1, 2, 3)]
    if flammable:
        notes.append(f"{len(flammable)} flammable liquid{'s' if len(flammable) != 1 else ''} (GHS categories 1–3) "
                     "kept here: the store must be one intended for flammable liquids.")
        if rated is None:
            notes.append("No temperature rating is recorded for this store: the conflicts column cannot be checked.")
    n_conflicts = sum(1 for d in members if conflicts(d, rated))
    if n_conflicts:
        notes.append(f"{n_conflicts} material{'s' if n_conflicts != 1 else ''} can reach a flash point or boiling "
                     "point at the store's rated temperature (see the last column).")
    return {"loc": loc, "members": [(d, conflicts(d, rated)) for d in members], "store_notes": notes,
            "compat": store_compatibility(catalog, derived, key) if compat is None else compat}


def store_compatibility(catalog: Catalog, derived, key: str) -> dict:
    """Which of a store's materials should not share it (builder/data/storage_compatibility.yaml) and
    the store's own limits (locations.yaml): ``separate`` (a list of ``builder.chem.storage.Conflict``,
    pair by pair), ``apart`` (a list of ``builder.chem.storage.KindConflict``, kind by kind) and
    ``apart_pairs`` (how many pairs those are), ``limits`` (sentences), ``count`` (keep-separate pairs plus
    limits exceeded: what the by-store page shows), ``names`` (id -> name), ``source``."""
    loc = catalog.locations[key]
    members = [d for d in store_members(derived).get(key, ()) if getattr(d, "storage", None) is not None]
    assigned = [(d.entry.id, d.storage) for d in members]
    table = default_table()
    limits = []
    if loc.allowed_groups:
        allowed = ", ".join(table.names[g].lower() for g in loc.allowed_groups)
        for d in members:
            if d.storage.group not in loc.allowed_groups:
                limits.append(f"{d.entry.name} ({d.storage.name.lower()}) is not in a group this store is "
                              f"meant for ({allowed}).")
    if loc.max_flammable_liquid_volume is not None:
        limit_l = loc.max_flammable_liquid_volume.value * 1000.0
        total, counted, uncounted = flammable_volume((d.entry.id, d.storage, d.entry.catalog.container)
                                                     for d in members)
        if total > limit_l:
            limits.append(f"At least {total:g} L of flammable liquid is kept here, more than the store's limit of "
                          f"{limit_l:g} L.")
    separate = list(store_conflicts(assigned, worst_only=True))
    # keep-apart pairs are the many (most pairs of a large store): listed kind by kind, not pair by pair
    apart = [k for k in kind_conflicts(assigned) if k.outcome == "keep-apart"]
    return {"separate": separate, "apart": apart, "apart_pairs": sum(k.pairs for k in apart), "limits": limits,
            "separate_grouped": grouped_conflicts(separate),
            "count": len(separate) + len(limits), "names": {d.entry.id: d.entry.name for d in members},
            "source": table.source}


class KeptCompatibility:
    """``store_compatibility`` per store key, worked out once per process and kept in the build cache
    (kind ``compat``) under the key of exactly what it reads: the store, and each member's id, name,
    storage assignment and container. An edit that changes no member's storage (most edits) reuses
    it; the pairs of a store of a few hundred materials take a tenth of a second, and so does reading
    them back, so the by-store page reads only their counts (``counts``), kept beside them."""

    def __init__(self, catalog: Catalog, derived, cache: Cache | None):
        self.catalog, self.derived, self.cache = catalog, derived, cache
        self._full: dict[str, dict] = {}
        self._counts: dict[str, dict] = {}

    def _name(self, key: str) -> str:
        members = [(d.entry.id, d.entry.name, d.storage, d.entry.catalog.container)
                   for d in store_members(self.derived).get(key, ()) if getattr(d, "storage", None) is not None]
        return key_of("store-compatibility", code_version(), repr(self.catalog.locations[key]), repr(members))

    def full(self, key: str) -> dict:
        """The store's ``store_compatibility``."""
        if key not in self._full:
            name = self._name(key)
            found = self.cache.get("compat", name) if self.cache is not None else None
            if not isinstance(found, dict):
                found = store_compatibility(self.catalog, self.derived, key)
                if self.cache is not None:
                    self.cache.put("compat", name, found)
                    self.cache.put("compat-counts", name, compat_counts(found))
            self._full[key] = found
        return self._full[key]

    def counts(self, key: str) -> dict:
        """``compat_counts`` of the store's ``store_compatibility``."""
        if key not in self._counts:
            found = self.cache.get("compat-counts", self._name(key)) if self.cache is not None else None
            self._counts[key] = found if isinstance(found, dict) else compat_counts(self.full(key))
        return self._counts[key]


def compat_counts(compat: dict) -> dict:
    """How many pairs to keep separate and apart, store limits exceeded, and their total (``count``)."""
    return {"count": compat["count"], "separate": len(compat["separate"]), "apart": compat["apart_pairs"],
            "limits": len(compat["limits"])}
