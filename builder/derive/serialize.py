"""JSON forms of derived entries, shared by ``cohesion profile`` and the site's exports.

Every number is a ``Value.as_dict()`` object: value, unit, optional uncertainty and
conditions, and provenance (kind plus source or method).
"""
from __future__ import annotations

from builder.core.quantities import DERIVED_QUANTITIES
from builder.derive.entry import Derived

def profile_values() -> tuple[str, ...]:
    """Derived values reported at the top level of a profile: the quantities marked ``profile`` in
    builder/core/quantities.py, in its order."""
    return tuple(q.key for q in DERIVED_QUANTITIES.values() if q.profile and not q.is_label)


def identity_json(d: Derived) -> dict:
    ident = d.identity
    if ident is None:
        return {}
    return {"smiles": ident.smiles, "formula": ident.formula, "inchi": ident.inchi, "inchikey": ident.inchikey}


def profile_json(d: Derived) -> dict:
    """The profile object: identity, forces, key values, category, band and handling notes."""
    out = identity_json(d)
    for name in profile_values():
        if d.get(name) is not None:
            out[name] = d.get(name).as_dict()
    if d.forces is not None:
        out["forces"] = d.forces.as_dict()
    cat = d.label("flammable_category")
    out["flammable_category"] = cat.code if cat else None
    if cat is not None:
        out["flammable_category_range"] = list(d.label("flammable_category_range").code)
        out["flammable_category_basis"] = cat.as_dict()
    for band in ("volatility_band", "volatility_band_process"):
        if d.label(band) is not None:
            out[band] = d.label(band).as_dict()
    out["handling_notes"] = [n.as_dict() for n in d.notes]
    return out


def entry_json(d: Derived, links=()) -> dict:
    """Everything about one entry: what it states, every derived value and label, links."""
    e = d.entry
    out = {"id": e.id, "name": e.name, "type": e.type, "synonyms": list(e.synonyms), "cas": e.cas,
           "smiles_as_entered": e.smiles, "hazard_statements": list(e.hazard_statements), "notes": e.notes,
           "catalog": {"code": e.catalog.code, "locations": list(e.catalog.locations),
                       "container": e.catalog.container, "owner": e.catalog.owner}}
    out["identity"] = identity_json(d)
    out["values"] = {name: v.as_dict() for name, v in sorted(d.values.items())}
    out["labels"] = {name: lab.as_dict() for name, lab in sorted(d.labels.items())}
    if e.antoine is not None:
        a = e.antoine
        out["antoine"] = {"form": a.form, "A": a.A, "B": a.B, "C": a.C, "pressure_unit": a.pressure_unit,
                          "temperature_unit": a.temperature_unit, "t_min_K": a.t_min, "t_max_K": a.t_max,
                          "provenance": {"kind": a.provenance, "source": a.source}}
    if d.forces is not None:
        out["forces"] = d.forces.as_dict()
    out["handling_notes"] = [n.as_dict() for n in d.notes]
    out["links"] = [{"relation": link.relation, "target": link.target, "why": link.why} for link in links]
    return out
