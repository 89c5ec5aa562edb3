"""JSON forms of derived entries, shared by ``cohesion profile`` and the site's exports.

Every number is a ``Value.as_dict()`` object: value, unit, optional uncertainty and
conditions, and provenance (kind plus source or method).
"""
from __future__ import annotations

from builder.core.quantities import DERIVED_QUANTITIES
from builder.core.values import Provenance
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


def physical_state_json(d: Derived) -> dict | None:
    """``{"value", "alternatives", "text", "provenance", "at_store"}`` of the state at 20 °C, or None."""
    lab = d.label("physical_state")
    if lab is None:
        return None
    out = {"value": lab.code, "alternatives": list(d.label("physical_state_range").code), "text": lab.text,
           "provenance": lab.provenance.as_dict()}
    store = d.label("physical_state_store")
    if store is not None:
        out["at_store_temperature"] = {"value": store.code, "text": store.text,
                                       "provenance": store.provenance.as_dict()}
    return out


#: derived physical-hazard classes: label key → (class name, category/group → H-code)
_HAZARD_CLASSES = (
    ("flammable_category", "flammable-liquid", lambda c: {1: "H224", 2: "H225", 3: "H226", 4: "H227"}.get(c)),
    ("flammable_gas_category", "flammable-gas", lambda c: {"1A": "H220", "1B": "H221", "2": "H221"}.get(c)),
    ("gas_under_pressure", "gas-under-pressure", lambda c: "H281" if c == "refrigerated liquefied" else "H280"),
)


def hazard_classes_json(d: Derived) -> list[dict]:
    """Every derived physical-hazard class: ``{"class", "category", "h_code", "text", "provenance"}``."""
    out = []
    for key, name, code in _HAZARD_CLASSES:
        lab = d.label(key)
        if lab is None or lab.code is None:
            continue
        out.append({"class": name, "category": str(lab.code), "h_code": code(lab.code), "text": lab.text,
                    "provenance": lab.provenance.as_dict()})
    return out


def hazard_alerts_json(d: Derived) -> list[dict]:
    """``[{id, family, text, severity, source, atoms, provenance}]``: atoms index the canonical SMILES
    (``identity.smiles``), the structure the drawing shows."""
    prov = Provenance("rule", method="hazard-alerts")
    return [{**a.as_dict(), "provenance": {**prov.as_dict(), "note": a.source}} for a in d.hazard_alerts]


def storage_json(d: Derived) -> dict | None:
    """The storage group (its label) and every class the material carries for the compatibility rules."""
    lab = d.label("storage_group")
    if lab is None or d.storage is None:
        return None
    return {**lab.as_dict(), "classes": list(d.storage.classes)}


def mixture_json(d: Derived) -> dict:
    """A mixture's own keys: ``composition`` (each component with its fractions as values),
    ``bubble_point`` and ``dew_point`` at 101.325 kPa, ``vapor_composition_20C`` (each component's
    share of the saturated vapor) and the activity model; empty for a substance."""
    m = d.mixture
    if m is None:
        problem = d.label("mixture_problem")
        return {"mixture_problem": problem.as_dict()} if problem is not None else {}
    rows = [{"name": r.name, "id": r.entry_id, "smiles": r.smiles, "stated": r.stated,
             "mass_fraction": r.mass_fraction.as_dict(), "mole_fraction": r.mole_fraction.as_dict(),
             "vapor_fraction_20C": r.vapor_fraction_20C.as_dict() if r.vapor_fraction_20C else None,
             "vapor_pressure_from": r.psat_basis, "flammable": r.flammable, "via": r.via} for r in m.rows]
    out = {"composition": rows,
           "bubble_point": d.get("boiling_point").as_dict() if d.get("boiling_point") else None,
           "dew_point": d.get("dew_point").as_dict() if d.get("dew_point") else None,
           "vapor_composition_20C": {r.name: r.vapor_fraction_20C.as_dict() for r in m.rows if r.vapor_fraction_20C},
           "activity_model": {"name": m.activity_model, "note": m.activity_note},
           "composition_ranges": {"ranged": m.ranged, "extreme_compositions": m.corners},
           "unlike_interactions": m.force_note}
    return out


def hansen_json(d: Derived) -> dict:
    """``{"hansen": {"delta_d", "delta_p", "delta_h"}}`` (each a value in MPa½), plus a stated
    ``hansen_sphere``; empty when the entry has neither."""
    out = {}
    if all(d.get(k) is not None for k in ("hansen_delta_d", "hansen_delta_p", "hansen_delta_h")):
        out["hansen"] = {k[7:]: d.get(k).as_dict() for k in ("hansen_delta_d", "hansen_delta_p", "hansen_delta_h")}
    sphere = d.entry.hansen_sphere
    if sphere is not None:
        out["hansen_sphere"] = {"delta_d": sphere.delta_d, "delta_p": sphere.delta_p, "delta_h": sphere.delta_h,
                                "radius": sphere.radius, "unit": "MPa^0.5",
                                "provenance": {"kind": sphere.provenance, "source": sphere.source}}
    return out


def profile_json(d: Derived) -> dict:
    """The profile object: identity, forces, key values, category, band and handling notes."""
    out = identity_json(d)
    out.update(mixture_json(d))
    out.update(hansen_json(d))
    out["physical_state"] = physical_state_json(d)
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
    out["hazard_classes"] = hazard_classes_json(d)
    if d.get("boiling_point") is None and d.label("boiling_point_missing") is not None:
        out["boiling_point_missing"] = d.label("boiling_point_missing").as_dict()
    out["handling_notes"] = [n.as_dict() for n in d.notes]
    out["hazard_alerts"] = hazard_alerts_json(d)
    out["storage_group"] = storage_json(d)
    return out


def entry_json(d: Derived, links=()) -> dict:
    """Everything about one entry: what it states, every derived value and label, links."""
    e = d.entry
    out = {"id": e.id, "name": e.name, "type": e.type, "synonyms": list(e.synonyms), "cas": e.cas,
           "smiles_as_entered": e.smiles, "hazard_statements": list(e.hazard_statements), "notes": e.notes,
           "catalog": {"code": e.catalog.code, "locations": list(e.catalog.locations),
                       "container": e.catalog.container, "owner": e.catalog.owner}}
    out["identity"] = identity_json(d)
    out.update(mixture_json(d))
    out.update(hansen_json(d))
    out["values"] = {name: v.as_dict() for name, v in sorted(d.values.items())}
    out["labels"] = {name: lab.as_dict() for name, lab in sorted(d.labels.items())}
    if e.antoine is not None:
        a = e.antoine
        out["antoine"] = {"form": a.form, "A": a.A, "B": a.B, "C": a.C, "pressure_unit": a.pressure_unit,
                          "temperature_unit": a.temperature_unit, "t_min_K": a.t_min, "t_max_K": a.t_max,
                          "provenance": {"kind": a.provenance, "source": a.source}}
    if d.forces is not None:
        out["forces"] = d.forces.as_dict()
    out["physical_state"] = physical_state_json(d)
    out["hazard_classes"] = hazard_classes_json(d)
    out["handling_notes"] = [n.as_dict() for n in d.notes]
    out["hazard_alerts"] = hazard_alerts_json(d)
    out["storage_group"] = storage_json(d)
    out["links"] = [{"relation": link.relation, "target": link.target, "why": link.why} for link in links]
    return out
