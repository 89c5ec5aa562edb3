"""Derive everything a datasheet shows from one entry: a pure function of the entry.

``derive_entry(entry, locations)`` returns a ``Derived`` record: identity from the
structure, the stated values, and every computed, estimated or rule-derived value,
each a ``Value`` (or, for classifications in words, a ``Label``) with provenance; the
force profile; handling notes; the vapor-pressure curve; and plausibility findings for
``cohesion check``.  It reads nothing else and writes nothing, so results can be cached
by entry and run in parallel.

Order: identity → boiling point (stated, else estimated) → forces (uses the boiling
point for the force excess) → vapor pressure, exposure, flash point, category, bands,
handling notes.
"""
from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

from builder.chem.alerts import Alert, find_alerts
from builder.chem.handling import Note
from builder.chem.identity import Identity, identify, parse_smiles
from builder.chem.series import structure_class
from builder.chem.storage import Assignment, assign_group
from builder.core.diagnostics import Diagnostic
from builder.core.model import Entry, Location, frozen_map
from builder.core.values import Label, Provenance, Value, computed
from builder.derive.boiling import boiling_values
from builder.derive.fire import Segment, fire_values
from builder.derive.forces import Forces, forces_of
from builder.derive.mixture import MixtureFacts, derive_mixture
from builder.derive.solvency import hansen_values
from builder.derive.state import state_values

#: store temperature assumed when neither the entry nor its stores state one (K)
DEFAULT_STORE_TEMPERATURE = 308.15


@dataclass(frozen=True)
class Derived:
    """One entry with everything derived from it."""

    entry: Entry
    identity: Identity | None
    values: Mapping[str, Value] = field(default_factory=frozen_map)
    #: classifications in words: dominant_force, flammable_category, volatility_band, ...
    labels: Mapping[str, Label] = field(default_factory=frozen_map)
    forces: Forces | None = None
    notes: tuple[Note, ...] = ()
    curve: tuple[Segment, ...] = ()
    #: findings for ``cohesion check`` (warnings about plausibility), with file positions
    findings: tuple[Diagnostic, ...] = ()
    #: structural hazard alerts (builder/chem/alerts.py); atom indices refer to ``identity.smiles``
    hazard_alerts: tuple[Alert, ...] = ()
    #: the storage group and every class the material carries (builder/chem/storage.py); the group
    #: is also ``labels["storage_group"]``
    storage: Assignment | None = None
    #: a mixture's composition table and how its equilibrium was computed (builder/derive/mixture.py)
    mixture: MixtureFacts | None = None
    #: the structure class of a single molecule (builder/chem/series.py), which homologues share
    series_class: tuple | None = None

    def get(self, name: str) -> Value | None:
        return self.values.get(name)

    def label(self, name: str) -> Label | None:
        return self.labels.get(name)


def store_temperature(entry: Entry, locations: Mapping[str, Location] | None) -> Value:
    """The warmest temperature the material may see in store: stated, else assumed."""
    if entry.catalog.max_store_temperature is not None:
        return entry.catalog.max_store_temperature
    rated = [loc.max_store_temperature for loc in (locations or {}).values() if loc.max_store_temperature]
    if rated:
        return max(rated, key=lambda v: v.value)
    return Value(DEFAULT_STORE_TEMPERATURE, "K", Provenance("assumed", method="default-store-temperature"))


def hazard_label(entry: Entry) -> Label:
    """The entry's GHS hazard statement codes as a label tagged with their source (an assumed
    value of method ``hazard-statements-unsourced`` when the entry names none)."""
    prov = entry.hazard_provenance or Provenance("assumed", method="hazard-statements-unsourced")
    return Label(", ".join(entry.hazard_statements), prov, tuple(entry.hazard_statements))


def derive_entry(entry: Entry, locations: Mapping[str, Location] | None = None,
                 components: Mapping[str, Derived] | None = None) -> Derived:
    """Everything the catalog derives for ``entry`` (``locations``: the stores it names; ``components``:
    for a mixture, the ``Derived`` of every entry its composition names, nested ones included)."""
    if entry.type == "mixture" and entry.composition:
        return _derive_mixture(entry, locations, components or {})
    identity = identify(entry.smiles) if entry.smiles else None
    mol = parse_smiles(entry.smiles)[0] if entry.smiles else None
    values: dict[str, Value] = {}
    labels: dict[str, Label] = {}
    findings: list[Diagnostic] = []
    if identity is not None:
        values["molar_mass"] = computed(identity.molar_mass, "g/mol", "molar-mass")
        values["electron_count"] = computed(identity.electron_count, "count", "electron-count")
    values.update(entry.properties)
    tb_values, tb_findings = boiling_values(entry, mol if entry.type == "substance" else None)
    values.update(tb_values)
    findings += tb_findings
    forces = None
    if mol is not None:
        forces = forces_of(mol, values.get("boiling_point"))
        labels["dominant_force"] = forces.dominant
    store_T = store_temperature(entry, locations)
    values["store_temperature"] = store_T
    if entry.catalog.process_temperature is not None:
        values["process_temperature"] = entry.catalog.process_temperature
    state = state_values(entry, mol if entry.type == "substance" else None, values, store_T)
    values.update(state.values)
    labels.update(state.labels)
    findings += state.findings
    fire = fire_values(entry, mol, values, forces.dominant.code if forces else None, store_T,
                       entry.catalog.process_temperature, state_facts=state.facts,
                       liquid_possible=state.liquid_possible)
    values.update(fire.values)
    labels.update(fire.labels)
    findings += fire.findings
    notes = tuple(fire.notes)
    if entry.type == "substance":
        values.update(hansen_values(entry, mol, values, labels.get("physical_state")))
    if entry.hazard_statements:
        labels["hazard_statements"] = hazard_label(entry)
    alerts, storage = hazard_alerts_of(entry, identity, labels)
    labels["storage_group"] = Label(storage.name, Provenance("rule", method="storage-group", note=storage.reason),
                                    storage.group)
    series_class = structure_class(identity.smiles) if identity is not None and identity.fragments == 1 else None
    return Derived(entry, identity, frozen_map(values), frozen_map(labels), forces, notes, tuple(fire.curve),
                   tuple(findings), alerts, storage, series_class=series_class)


def _derive_mixture(entry: Entry, locations, components) -> Derived:
    result = derive_mixture(entry, components, locations, derive_inline=lambda e: derive_entry(e))
    labels = dict(result.labels)
    if entry.hazard_statements:
        labels["hazard_statements"] = hazard_label(entry)
    storage = result.storage
    if storage is None:
        storage = assign_group(entry.hazard_statements, (), None, None)
    labels["storage_group"] = Label(storage.name, Provenance("rule", method="storage-group", note=storage.reason),
                                    storage.group)
    return Derived(entry, None, frozen_map(result.values), frozen_map(labels), None, tuple(result.notes),
                   tuple(result.curve), tuple(result.findings), tuple(result.alerts), storage, result.facts)


def hazard_alerts_of(entry: Entry, identity: Identity | None, labels: Mapping[str, Label]):
    """The structural alerts (matched on the canonical SMILES, the one the drawing uses) and the
    storage group from the state, the alerts, the flammable category and the hazard statements."""
    mol = parse_smiles(identity.smiles)[0] if identity is not None else None
    alerts = find_alerts(mol, entry.hazard_statements)
    category = labels.get("flammable_category")
    code = category.code if category is not None and isinstance(category.code, int) else None
    state = labels.get("physical_state")
    # the most likely state at 20 °C (a stated or declared gas: H280 and the like set the group too)
    state_code = state.code if state is not None and isinstance(state.code, str) else None
    return alerts, assign_group(entry.hazard_statements, alerts, code, state_code)
