"""Row lists for the templates, built from the registry of derived quantities
(``builder/core/quantities.py``) so a template never assembles rows itself.

Each row is ``(key, Value or Label)``; ``property_label(key)`` names it on the page.
"""
from __future__ import annotations

from builder.core.quantities import DERIVED_QUANTITIES
from builder.derive.entry import Derived

#: datasheet tables → the registry sections they show, in order
SHEET_TABLES = {"boiling": ("boiling",), "fire": ("vapor", "flash")}


def _present(d: Derived, q):
    return d.label(q.key) if q.is_label else d.get(q.key)


def table_rows(d: Derived, table: str) -> list[tuple[str, object]]:
    """The rows of datasheet table ``table``: values section by section (registry order within
    one), then the labels of all its sections in registry order."""
    sections = SHEET_TABLES[table]
    values = [(q.key, d.get(q.key)) for s in sections for q in DERIVED_QUANTITIES.values()
              if q.section == s and not q.is_label and d.get(q.key) is not None]
    labels = [(q.key, d.label(q.key)) for q in DERIVED_QUANTITIES.values()
              if q.section in sections and q.is_label and d.label(q.key) is not None]
    return values + labels


def card_rows(d: Derived) -> list[tuple[str, object, str]]:
    """(card label, Value/Label or None, text when missing) for a shelf card: the classification
    first, then the numbers, each in registry order."""
    shown = [q for q in DERIVED_QUANTITIES.values() if q.card]
    ordered = [q for q in shown if q.is_label] + [q for q in shown if not q.is_label]
    return [(q.card, _present(d, q), q.card_missing) for q in ordered]
