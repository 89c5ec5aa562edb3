"""Derive everything a datasheet shows from one entry: a pure function of the entry.

``derive_entry(entry, locations)`` returns a ``Derived`` record: identity from the
structure, the stated values, and every computed, estimated or rule-derived value,
each a ``Value`` with provenance.  It reads nothing else and writes nothing, so
results can be cached by entry and run in parallel.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Mapping

from .diagnostics import Diagnostic
from .model import Entry, Location, frozen_map
from .structure import Identity, identify
from .values import Value, computed


@dataclass(frozen=True)
class Derived:
    """One entry with everything derived from it."""

    entry: Entry
    identity: Identity | None
    values: Mapping[str, Value] = field(default_factory=frozen_map)
    #: findings for ``cohesion check`` (warnings about plausibility), with file positions
    findings: tuple[Diagnostic, ...] = ()

    def get(self, name: str) -> Value | None:
        return self.values.get(name)


def derive_entry(entry: Entry, locations: Mapping[str, Location] | None = None) -> Derived:
    """Everything the catalog derives for ``entry`` (``locations``: the stores it names)."""
    identity = identify(entry.smiles) if entry.smiles else None
    values: dict[str, Value] = {}
    if identity is not None:
        values["molar_mass"] = computed(identity.molar_mass, "g/mol", "molar-mass")
        values["electron_count"] = computed(identity.electron_count, "count", "electron-count")
    values.update(entry.properties)
    return Derived(entry, identity, frozen_map(values))
