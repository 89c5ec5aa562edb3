"""What the builder derives for an arbitrary structure, through the same code path as a datasheet.

``profile(smiles)`` wraps the SMILES in a throw-away entry, runs ``derive_entry`` on it
and returns a JSON-ready dict: identity plus every derived value with provenance.
"""
from __future__ import annotations

from builder.chem.identity import parse_smiles
from builder.core.model import Entry, frozen_map
from builder.core.values import Value
from builder.derive.entry import derive_entry
from builder.derive.serialize import profile_json


def profile_entry(smiles: str, given: dict[str, Value] | None = None) -> Entry:
    return Entry(id="profile", path="<command line>", name=smiles, smiles=smiles,
                 properties=frozen_map(sorted((given or {}).items())))


def profile(smiles: str, given: dict[str, Value] | None = None) -> dict:
    """Profile one SMILES; a SMILES that does not parse gives ``{"input", "error"}``."""
    mol, reason = parse_smiles(smiles)
    if mol is None:
        return {"input": smiles, "error": f"SMILES does not parse: {reason}"}
    derived = derive_entry(profile_entry(smiles, given))
    return {"input": smiles, **profile_json(derived)}
