"""Derive every entry of a catalog."""
from __future__ import annotations

from builder.core.model import Catalog
from builder.derive.entry import Derived, derive_entry


def derive_catalog(catalog: Catalog) -> tuple[Derived, ...]:
    """Derive every entry (each a pure function of its entry and the stores it names)."""
    out = []
    for entry in catalog.entries:
        stores = {k: catalog.locations[k] for k in entry.catalog.locations}
        out.append(derive_entry(entry, stores))
    return tuple(out)
