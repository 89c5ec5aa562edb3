"""Store checks for ``cohesion check`` and the build: who shares a store with whom, and store limits.

====================================  ========  ==============================================
check                                 severity  rule
====================================  ========  ==============================================
two materials to keep separate        warning   their storage groups or classes are
in one store                                    "keep separate" in
                                                builder/data/storage_compatibility.yaml; at the
                                                ``catalog.locations`` line of one of them
                                                (the one with most such partners in that store,
                                                or each checked file when only some are), naming
                                                both and the reason
storage group not allowed here        warning   the store's ``allowed_groups`` (locations.yaml)
                                                leave out the material's group; at its
                                                ``catalog.locations`` line
too much flammable liquid             warning   the stated container volumes
                                                (``catalog.container``) of the store's
                                                flammable materials add up to more than its
                                                ``max_flammable_liquid_volume``; at that line
                                                of locations.yaml
====================================  ========  ==============================================

"Keep apart" pairs (separate shelf or tray in the same store) are shown on the store sheet but
are not warnings.  Container volumes are read from the free text of ``catalog.container``
(``builder.chem.storage.container_volume_litres``): every volume it names counts in every store the
material names, the conservative reading; a material with no stated volume is listed as not counted.
"""
from __future__ import annotations

from builder.chem.storage import OUTCOME_TEXT, default_table, flammable_volume, hubs, store_conflicts
from builder.core.diagnostics import Diagnostic
from builder.core.model import Catalog
from builder.derive.catalog import store_members
from builder.derive.entry import Derived


def locations_path(catalog: Catalog) -> str:
    return f"{catalog.root}/locations.yaml"  # as the loader shows it


def _members(derived, by_id: dict, key: str) -> list[Derived]:
    """The store's members that have a storage assignment, in entry id order (as the catalog's)."""
    return sorted((d for d in store_members(derived).get(key, ()) if by_id.get(d.entry.id) is d),
                  key=lambda d: d.entry.id)


def _at(d: Derived, severity: str, message: str, hint: str) -> Diagnostic:
    line, col = d.entry.line_of("catalog.locations")
    return Diagnostic(d.entry.path, line, col, severity, message, hint)


def _conflict_warnings(key: str, members: list[Derived], named: set[str] | None) -> list[Diagnostic]:
    by_id = {d.entry.id: d for d in members}
    rank = {g: i for i, g in enumerate(default_table().group_ids)}
    pending = list(store_conflicts([(d.entry.id, d.storage) for d in members], worst_only=True))
    preferred = None if named is None else {i for i, d in by_id.items() if d.entry.path in named}
    out = []
    # as builder.chem.storage.grouped_conflicts, but only checked files get warnings while any of them
    # is left in a pair; most partners first, ties: the group earlier in the table's order (the
    # oxidiser, not the solvent), then the id
    for at, mine in hubs([(c.first, c.second) for c in pending], lambda i: rank[by_id[i].storage.group], preferred):
        d = by_id[at]
        by_reason: dict[tuple[str, str], list[str]] = {}
        for c in (pending[k] for k in mine):
            other = by_id[c.second if c.first == at else c.first]
            by_reason.setdefault((c.reason, other.storage.name.lower()), []).append(f"'{other.entry.id}'")
        reasons = "; ".join(f"{', '.join(ids)} ({group}): {reason}"
                            for (reason, group), ids in sorted(by_reason.items()))
        out.append(_at(d, "warning",
                       f"store '{key}': '{at}' ({d.storage.name.lower()}) is kept with {reasons}; "
                       f"{OUTCOME_TEXT['keep-separate']}",
                       "move one of them to another store or into a fire-rated cabinet of its own; "
                       "the store sheet lists every pair"))
    return out


def _limit_warnings(catalog: Catalog, key: str, members: list[Derived]) -> list[Diagnostic]:
    loc = catalog.locations[key]
    out = []
    if loc.allowed_groups:
        names = default_table().names
        allowed = ", ".join(loc.allowed_groups)
        for d in members:
            if d.storage.group not in loc.allowed_groups:
                out.append(_at(d, "warning",
                               f"store '{key}' is meant for storage groups {allowed}; '{d.entry.id}' is "
                               f"{names[d.storage.group].lower()} ({d.storage.reason})",
                               "keep it in a store meant for its group, or add the group to the store's "
                               "allowed_groups in locations.yaml if the site allows it"))
    if loc.max_flammable_liquid_volume is not None:
        limit_l = loc.max_flammable_liquid_volume.value * 1000.0
        total, counted, uncounted = flammable_volume(
            (d.entry.id, d.storage, d.entry.catalog.container) for d in members)
        if total > limit_l:
            listed = ", ".join(f"'{i}' {v:g} L" for i, v in counted)
            missing = f"; not counted (no container volume stated): {', '.join(uncounted)}" if uncounted else ""
            line = loc.lines.get("max_flammable_liquid_volume", loc.line)
            out.append(Diagnostic(locations_path(catalog), line, 1, "warning",
                                  f"store '{key}' holds at least {total:g} L of flammable liquid, more than its "
                                  f"limit of {limit_l:g} L ({listed}{missing})",
                                  "move containers to another store or check the container sizes"))
    return out


def check_stores(catalog: Catalog, derived, named: set[str] | None = None) -> list[Diagnostic]:
    """Store warnings over ``derived`` (the stores' members that were derived).  ``named``: the entry
    paths being checked, when only some files are: each of them gets its own conflict warning."""
    by_id = {d.entry.id: d for d in derived if getattr(d, "storage", None) is not None}
    out = []
    for key in sorted(catalog.locations):
        members = _members(derived, by_id, key)
        out += _conflict_warnings(key, members, named) + _limit_warnings(catalog, key, members)
    return out


def store_mates(catalog: Catalog, derived) -> list:
    """Entries of ``catalog`` that share a store with an entry of ``derived`` but were not derived."""
    done = {d.entry.id for d in derived}
    stores = {key for d in derived for key in d.entry.catalog.locations}
    return [e for e in catalog.entries if e.id not in done and stores & set(e.catalog.locations)]
