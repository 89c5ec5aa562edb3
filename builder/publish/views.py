"""Row lists for the templates, built from the registry of derived quantities
(``builder/core/quantities.py``) so a template never assembles rows itself.

Each row is ``(key, Value or Label)``; ``property_label(key)`` names it on the page.
"""
from __future__ import annotations

import functools
from pathlib import Path

from builder.chem.datafile import load_yaml
from builder.core.quantities import DERIVED_QUANTITIES
from builder.derive.entry import Derived

#: datasheet tables → the registry sections they show, in order
SHEET_TABLES = {"boiling": ("boiling",), "fire": ("vapor", "flash"), "solvency": ("solvency",)}


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
    return [(q.card, _present(d, q) or _card_fallback(d, q.key), _card_missing(d, q)) for q in ordered]


#: a card row with nothing of its own shows this label instead: a gas has a flammable-gas
#: category (UN GHS ch. 2.2) where a liquid has a flammable-liquid one (ch. 2.6)
CARD_FALLBACK = {"flammable_category": "flammable_gas_category"}


def _card_fallback(d: Derived, key: str):
    other = CARD_FALLBACK.get(key)
    return d.label(other) if other else None


def _card_missing(d: Derived, q) -> str:
    """The missing text, saying so when the class does not apply to the state (a gas or a solid)."""
    states = d.label("physical_state_range")
    if q.key == "flammable_category" and states is not None and "liquid" not in states.code:
        return f"not a liquid ({' or '.join(states.code)})"
    return q.card_missing


def _band_start(band: str) -> tuple[float, str]:
    """Where a size band such as "1-6", "13-20", ">=21" or "all" starts, for sorting ("all" last)."""
    digits = "".join(c if c.isdigit() else " " for c in band).split()
    return (float(digits[0]) if digits else float("inf"), band)


def bands_in_numeric_order(validation: dict) -> dict:
    """The stored boiling-point validation with each method's size bands in numeric order
    ("1-6", "7-12", "13-20", ">=21", then "all"), not the text order the file keeps."""
    methods = {key: {band: table[band] for band in sorted(table, key=_band_start)}
               for key, table in validation.get("methods", {}).items()}
    return {**validation, "methods": methods}


CARD_NOTES_PATH = Path(__file__).resolve().parents[1] / "data" / "card_notes.yaml"


@functools.lru_cache(maxsize=1)
def _card_short_forms() -> dict[str, str]:
    return load_yaml(CARD_NOTES_PATH.read_text(encoding="utf-8")) or {}


def card_notes(d: Derived) -> list[tuple[str, str]]:
    """(severity, text) of every handling note for a shelf card: the rule's short form from
    builder/data/card_notes.yaml, or the full note where the rule has none -- never cut."""
    short = _card_short_forms()
    return [(n.severity, short.get(n.id, n.text)) for n in d.notes]


def health_codes(d: Derived) -> list[str]:
    """The entry's health hazard statement codes (GHS H300-H399, and EUH codes), for a shelf card."""
    return [c for c in d.entry.hazard_statements if c.startswith("H3") or c.startswith("EUH")]
