"""The immutable catalog: entries, sources and store locations after validation.

Everything here is plain data with SI floats; loading (``entries.py``) builds it and
nothing changes it afterwards.  Derived values live elsewhere (``derive.py``).
"""
from __future__ import annotations

import copyreg
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Mapping

from builder.core.values import Provenance, Value

SOURCE_KINDS = ("handbook", "paper", "standard", "database", "supplier", "in-house")
#: provenance a value gets by default from the kind of source it cites
PROVENANCE_OF_SOURCE = {"handbook": "literature", "paper": "literature", "standard": "literature",
                        "database": "literature", "supplier": "supplier", "in-house": "measured"}


def frozen_map(mapping: Mapping | None = None) -> Mapping:
    return MappingProxyType(dict(mapping or {}))


def _thawed(items: dict) -> Mapping:
    return MappingProxyType(items)


# read-only maps travel to worker processes and into the cache as plain dicts
copyreg.pickle(MappingProxyType, lambda m: (_thawed, (dict(m),)))


@dataclass(frozen=True)
class Source:
    """One bibliography item of ``entries/sources.yaml``."""

    key: str
    title: str
    kind: str
    year: int | None = None
    edition: str | None = None
    authors: str | None = None
    publisher: str | None = None
    note: str | None = None
    line: int = 1


@dataclass(frozen=True)
class Location:
    """One store location of ``entries/locations.yaml``."""

    key: str
    name: str
    description: str | None = None
    max_store_temperature: Value | None = None
    line: int = 1
    #: storage groups (builder/data/storage_compatibility.yaml) the store is meant for; empty: any
    allowed_groups: tuple[str, ...] = ()
    #: most flammable liquid the store may hold (m³), summed over the materials' stated containers
    max_flammable_liquid_volume: Value | None = None
    #: line of each of the location's keys ("allowed_groups" -> line), for warnings
    lines: Mapping[str, int] = field(default_factory=frozen_map)


@dataclass(frozen=True)
class Antoine:
    """Antoine coefficients as the source states them; ``vapor.py`` evaluates them.

    ``form`` is ``log10`` or ``ln``: ``form(P / pressure_unit) = A − B / (T / temperature_unit + C)``.
    ``t_min`` and ``t_max`` are the valid range in K.
    """

    A: float
    B: float
    C: float
    form: str
    pressure_unit: str
    temperature_unit: str
    t_min: float
    t_max: float
    source: str
    provenance: str
    note: str | None = None


@dataclass(frozen=True)
class HansenSet:
    """Hansen solubility parameters as an entry states them (MPa½): a material's own (``hansen``),
    or a resin's solubility sphere (``hansen_sphere``, with its interaction ``radius``)."""

    delta_d: float
    delta_p: float
    delta_h: float
    source: str
    provenance: str
    radius: float | None = None
    note: str | None = None


@dataclass(frozen=True)
class CatalogInfo:
    """Site-specific facts: catalog code, where it is kept, storage limits."""

    code: str | None = None
    locations: tuple[str, ...] = ()
    max_store_temperature: Value | None = None
    container: str | None = None
    process_temperature: Value | None = None
    owner: str | None = None


@dataclass(frozen=True)
class Fraction:
    """How much of a mixture one component is, as the entry states it.

    ``low`` and ``high`` are fractions of one (equal for an exact figure) on ``basis``
    (``mass``, ``volume`` or ``mole``); a ``balance`` component is whatever the others
    leave and has neither bounds nor a basis of its own.
    """

    text: str
    low: float | None = None
    high: float | None = None
    basis: str | None = None
    balance: bool = False

    @property
    def is_range(self) -> bool:
        return not self.balance and self.low != self.high


@dataclass(frozen=True)
class Component:
    """One component of a mixture: another entry of the catalog (``entry_id``) or an inline
    structure (``smiles`` with a ``name``)."""

    name: str
    fraction: Fraction
    entry_id: str | None = None
    smiles: str | None = None


@dataclass(frozen=True)
class Entry:
    """One material: identity, site facts and stated properties (SI values)."""

    id: str
    path: str
    name: str
    type: str = "substance"
    synonyms: tuple[str, ...] = ()
    cas: str | None = None
    smiles: str | None = None
    hazard_statements: tuple[str, ...] = ()
    notes: str | None = None
    catalog: CatalogInfo = field(default_factory=CatalogInfo)
    properties: Mapping[str, Value] = field(default_factory=frozen_map)
    antoine: Antoine | None = None
    #: "properties.boiling_point" style key path → (line, col), for later warnings
    lines: Mapping[str, tuple[int, int]] = field(default_factory=frozen_map)
    #: identity as the entry declares it (``formula``, ``molar_mass`` in g/mol); checked against the SMILES
    declared_formula: str | None = None
    declared_molar_mass: float | None = None
    #: where the hazard statements come from (the entry's ``hazard_source``), None when it names none
    hazard_provenance: Provenance | None = None
    #: a mixture's components as stated (``composition``); empty for a substance
    composition: tuple[Component, ...] = ()
    #: stated Hansen parameters (``properties.hansen``) and a resin's solubility sphere (``properties.hansen_sphere``)
    hansen: HansenSet | None = None
    hansen_sphere: HansenSet | None = None

    def line_of(self, dotted: str) -> tuple[int, int]:
        while dotted:
            if dotted in self.lines:
                return self.lines[dotted]
            dotted = dotted.rpartition(".")[0]
        return (1, 1)


@dataclass(frozen=True)
class Catalog:
    """All entries (sorted by id), the bibliography and the store locations."""

    entries: tuple[Entry, ...]
    sources: Mapping[str, Source]
    locations: Mapping[str, Location]
    root: str = "entries"

    def entry(self, entry_id: str) -> Entry:
        for entry in self.entries:
            if entry.id == entry_id:
                return entry
        raise KeyError(entry_id)
