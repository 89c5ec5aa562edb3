"""What the builder derives for an arbitrary structure, through the same code path as a datasheet.

``profile(smiles)`` wraps the SMILES in a throw-away entry, runs ``derive_entry`` on it
and returns a JSON-ready dict: identity plus every derived value with provenance.
"""
from __future__ import annotations

from builder.chem.identity import parse_smiles
from builder.core.model import Component, Entry, frozen_map
from builder.core.values import Value
from builder.derive.entry import derive_entry
from builder.derive.serialize import profile_json


def profile_entry(smiles: str, given: dict[str, Value] | None = None) -> Entry:
    return Entry(id="profile", path="<command line>", name=smiles, smiles=smiles,
                 properties=frozen_map(sorted((given or {}).items())))


def profile_mixture(composition: tuple[Component, ...]) -> dict:
    """Profile a mixture of inline structures (``composition``, checked by the caller, as ``--mix``
    gives it: builder.load.composition.composition_of_pairs)."""
    shown = [f"{c.smiles}={c.fraction.text}" for c in composition]
    entry = Entry(id="profile", path="<command line>", name=" + ".join(c.smiles for c in composition),
                  type="mixture", composition=composition)
    return {"input": shown, **profile_json(derive_entry(entry))}


def profile(smiles: str, given: dict[str, Value] | None = None) -> dict:
    """Profile one SMILES; a SMILES that does not parse gives ``{"input", "error"}``."""
    mol, reason = parse_smiles(smiles)
    if mol is None:
        return {"input": smiles, "error": f"SMILES does not parse: {reason}"}
    derived = derive_entry(profile_entry(smiles, given))
    return {"input": smiles, **profile_json(derived)}
