"""Hansen solubility parameters on a datasheet, and the catalog-wide solvency relations.

Per entry (``hansen_values``): δD, δP, δH (MPa½) stated in the entry (``properties.hansen``)
or estimated from the structure (``builder.chem.hansen``), the shares of the cohesive energy
they imply, and the liquid density and molar volume where none is stated
(``builder.chem.liquid_density``). A mixture gets the volume-fraction average of its
components' parameters (``blend_values``).

Across entries (``solvency_relations``): for each liquid, the catalog liquids and two-solvent
blends of similar solvency ranked by safety (``builder.chem.solvency.rank_substitutes``), and
for each resin or polymer with a stated solubility sphere, every catalog liquid with its
relative energy difference RED = Ra/R0.
"""
from __future__ import annotations

import bisect
import math
from dataclasses import dataclass
from itertools import islice

import numpy as np

from builder.chem import solvency
from builder.chem.hansen import COMPONENTS, cohesive_energy_split, estimate_hansen
from builder.chem.liquid_density import estimate_liquid_density
from builder.chem.structure3d import max_3d_atoms
from builder.core.cache import code_version, key_of, settings_key
from builder.core.values import Provenance, Value, estimated
from builder.derive.fire import inherited_kind

KEYS = ("hansen_delta_d", "hansen_delta_p", "hansen_delta_h")
#: default largest Hansen distance of a substitute (MPa½): about the radius of a typical resin's
#: solubility sphere (common practice), so a candidate inside it dissolves much of what the target does
DEFAULT_MAX_RA = 6.0
#: substitutes shown on a datasheet
SHOWN_SUBSTITUTES = 5
#: health hazard statements (GHS H300–H373, EUH070 and similar are left out)
_HEALTH = ("H30", "H31", "H32", "H33", "H34", "H35", "H36", "H37")


def hansen_values(entry, mol, values, state=None) -> dict[str, Value]:
    """δD, δP, δH, the cohesive-energy shares, and density / molar volume where not stated.

    ``state``: the physical-state label. The liquid molar volume is given for a liquid, and for a
    solid only from the structure estimate (a sub-cooled liquid's); a gas gets neither an
    estimated density nor a molar volume (at 25 °C it is no liquid), and a solid's stated density
    (of the solid) gives no liquid molar volume."""
    out: dict[str, Value] = {}
    h = entry.hansen
    if h is not None:
        prov = Provenance(h.provenance, source=h.source, note=h.note)
        for key, x in zip(KEYS, (h.delta_d, h.delta_p, h.delta_h)):
            out[key] = Value(x, "MPa**0.5", prov)
    elif mol is not None and mol.GetNumHeavyAtoms() <= max_3d_atoms():
        # the parameters are for solvents and small molecules; the estimate's features need the 3D
        # dipole, which is not computed above the 3D budget either (a polymer states its sphere)
        est = estimate_hansen(mol)
        if est.delta_d is not None:
            for key, x, u, part in zip(KEYS, (est.delta_d, est.delta_p, est.delta_h), (est.u_d, est.u_p, est.u_h),
                                       COMPONENTS):
                lo, hi = (est.interval90 or {}).get(part, (None, None))
                note = f"90 % interval {lo:.1f} to {hi:.1f} MPa½" if lo is not None else None
                out[key] = estimated(max(x, 0.0), "MPa**0.5", "hansen-mathieu-trees", u, note)
    out.update(cohesive_shares(out))
    code = state.code if state is not None else None
    if mol is not None and "density" not in values and code != "gas":
        vol = estimate_liquid_density(mol)
        if vol.density_kg_m3 is not None:
            out["density"] = estimated(vol.density_kg_m3, "kg/m**3", "liquid-volume-mathieu-2018", vol.u_density,
                                       "liquid at 25 °C, from structure")
    density = (values.get("density") if code in ("liquid", None) else None) or out.get("density")
    mm = values.get("molar_mass")
    if density is not None and mm is not None and density.value > 0:
        volume = mm.value / (density.value / 1000.0)  # g/mol over g/cm³: cm³/mol
        u = volume * density.uncertainty / density.value if density.uncertainty else None
        out["molar_volume"] = Value(volume, "cm**3/mol", Provenance(inherited_kind(density), method="molar-volume",
                                                                     note="molar mass over density"), u)
    return out


def cohesive_shares(params: dict[str, Value]) -> dict[str, Value]:
    """The shares of the cohesive energy (δD²/δ², δP²/δ², δH²/δ²) as percentages.

    Their standard uncertainties follow from those of the parameters by first-order propagation
    (JCGM 100:2008, the law of propagation of uncertainty, parameters taken as independent): with
    T = δD² + δP² + δH² and s_X = δX²/T, ∂s_X/∂δX = 2δX(T − δX²)/T² and ∂s_X/∂δY = −2δY·δX²/T²."""
    if not all(k in params for k in KEYS):
        return {}
    d, p, h = (params[k].value for k in KEYS)
    if d * d + p * p + h * h <= 0:
        return {}
    split = cohesive_energy_split(d, p, h)
    kind = inherited_kind(*(params[k] for k in KEYS))
    prov = Provenance(kind if kind != "rule" else "computed", method="cohesive-energy-split",
                      note="from the Hansen parameters above")
    deltas = (d, p, h)
    us = [params[k].uncertainty or 0.0 for k in KEYS]
    total = d * d + p * p + h * h
    out = {}
    for i, (name, part) in enumerate((("dispersion", "dispersion"), ("polar", "polar"), ("hbond", "hydrogen_bond"))):
        x2 = deltas[i] ** 2
        grads = [2 * deltas[j] * ((total - x2) if j == i else -x2) / total**2 for j in range(3)]
        u = math.sqrt(sum((g * uj) ** 2 for g, uj in zip(grads, us)))
        out[f"cohesive_share_{name}"] = Value(100 * split[part], "%", prov, 100 * u if u > 0 else None)
    return out


def blend_values(parts: list[tuple[dict, float]]) -> dict[str, Value]:
    """A mixture's parameters: the volume-fraction average of its components' (``parts``: each
    component's values and its volume fraction); none when a component has no parameters."""
    if not parts or any(not all(k in vals for k in KEYS) for vals, _ in parts):
        return {}
    total = sum(phi for _, phi in parts)
    out = {}
    for key in KEYS:
        x = sum(vals[key].value * phi for vals, phi in parts) / total
        u = math.sqrt(sum(((vals[key].uncertainty or 0.0) * phi / total) ** 2 for vals, phi in parts)) or None
        out[key] = estimated(x, "MPa**0.5", "hansen-blend", u, "volume-fraction average of the components")
    out.update(cohesive_shares(out))
    return out


def params_of(d) -> tuple[float, float, float] | None:
    if all(d.get(k) is not None for k in KEYS):
        return tuple(d.get(k).value for k in KEYS)  # type: ignore[return-value]
    return None


def is_liquid(d) -> bool:
    state = d.label("physical_state")
    return state is not None and state.code == "liquid"


def health_codes(d, by_id: dict | None = None, _seen: tuple = ()) -> frozenset[str]:
    """The health hazard statements of an entry: those it declares; for a mixture that declares
    no hazard statements at all, every health statement its catalog components declare (or
    inherit), whatever their share — a mixture's own classification can be milder, so this errs
    on the side of caution. ``by_id``: the catalog's derived entries by id."""
    own = frozenset(h for h in d.entry.hazard_statements if h.startswith(_HEALTH))
    if d.entry.hazard_statements or not by_id or d.entry.type == "substance":
        return own
    codes: set[str] = set()
    for c in d.entry.composition:
        part = by_id.get(c.entry_id) if c.entry_id else None
        if part is not None and c.entry_id not in _seen:
            codes |= health_codes(part, by_id, (*_seen, d.entry.id))
    return frozenset(codes)


def solvent_of(d, by_id: dict | None = None) -> solvency.Solvent | None:
    """The ranking's record of a catalog liquid (None for a solid, a gas or one without parameters);
    ``by_id``: the catalog by id, from which a mixture takes its components' health statements
    (``health_codes``)."""
    params = params_of(d)
    if params is None or not is_liquid(d) or d.entry.hansen_sphere is not None:
        return None
    fp = d.get("flash_point")
    cat = d.label("flammable_category")
    band = d.label("volatility_band")
    return solvency.Solvent(d.entry.id, params, fp.value if fp else None,
                            cat.code if cat is not None and isinstance(cat.code, int) else None,
                            band.code if band else None, frozenset(a.id for a in d.hazard_alerts),
                            health_codes(d, by_id))


@dataclass(frozen=True)
class SphereMatch:
    """A catalog liquid measured against a resin's solubility sphere."""

    id: str
    ra: float
    red: float
    verdict: str  # inside, borderline, outside


@dataclass(frozen=True)
class Relations:
    """Per entry id: safer substitutes (for a liquid) and sphere matches (for a resin)."""

    substitutes: dict
    matches: dict


def substitutes_for(target, derived, max_ra: float = DEFAULT_MAX_RA, blends: bool = False,
                    safer_only: bool = True, solvents: dict | None = None, safety: dict | None = None,
                    limit: int | None = None) -> list:
    """Candidates of similar solvency for the liquid ``target`` (a Derived), safest first; with
    ``safer_only``, only those the ranking puts before the target itself. ``solvents``: the
    ranking records of ``derived`` by id, when the caller has them already (``catalog_solvents``);
    ``safety``: their safety keys without Ra (``safety_prefixes``), likewise; ``limit``: only the
    first so many."""
    solvents = catalog_solvents(derived) if solvents is None else solvents
    me = solvents.get(target.entry.id)
    if me is None:
        return []
    safety = safety_prefixes(solvents) if safety is None else safety
    mine = safety[me.id]
    if safer_only:
        # the safety key leaves out Ra, and a blend is never safer than its less safe part
        # (blend_record takes the worse of the two on every criterion): the others can be left out first
        order = _safety_order(solvents, safety)
        count = bisect.bisect_left(order.prefixes, mine)  # those before: strictly safer than the target
        ranked = solvency.iter_substitutes(me, order.records[:count], max_ra, blends=blends,
                                           params=order.params[:count], prefixes=safety)
    else:
        others = [s for key, s in solvents.items() if key != me.id]
        ranked = solvency.iter_substitutes(me, others, max_ra, blends=blends)
    if safer_only:
        ranked = (c for c in ranked if c.better and solvency.safety_key(_record(c, solvents), c.ra)[:-2] < mine)
    return list(islice(ranked, limit))


def safety_prefixes(solvents: dict) -> dict:
    """Each record's place in the safety ordering, Ra and id left out (``solvency.safety_key``)."""
    return {key: solvency.safety_key(s, 0.0)[:-2] for key, s in solvents.items()}


@dataclass(frozen=True)
class _SafetyOrder:
    """The ranking records in safety order (``prefixes``: their safety keys without Ra and id, sorted;
    ``params``: their Hansen parameters as an array): the liquids safer than a given one are a head of it."""

    records: tuple
    prefixes: tuple
    params: np.ndarray


#: [solvents, safety, order] of the last ``_safety_order``: ranking every liquid asks for it each time
_LAST_ORDER: list = [None, None, None]


def _safety_order(solvents: dict, safety: dict) -> _SafetyOrder:
    if _LAST_ORDER[0] is solvents and _LAST_ORDER[1] is safety:
        return _LAST_ORDER[2]
    records = tuple(sorted(solvents.values(), key=lambda s: (safety[s.id], s.id)))
    order = _SafetyOrder(records, tuple(safety[s.id] for s in records),
                         np.asarray([s.hansen for s in records], dtype=float).reshape(-1, 3))
    _LAST_ORDER[:] = [solvents, safety, order]
    return order


def catalog_solvents(derived) -> dict[str, solvency.Solvent]:
    """The ranking's record of every catalog liquid with Hansen parameters, by id (catalog order)."""
    by_id = {d.entry.id: d for d in derived}
    return {s.id: s for s in (solvent_of(d, by_id) for d in derived) if s is not None}


def _record(candidate, solvents: dict) -> solvency.Solvent:
    if candidate.id is not None:
        return solvents[candidate.id]
    (a, pa), (b, _) = candidate.blend
    return solvency.blend_record(solvents[a], solvents[b], pa)


def sphere_matches(resin, derived, solvents: dict | None = None) -> list[SphereMatch]:
    """Every catalog liquid with its RED to the resin's stated sphere, nearest first."""
    sphere = resin.entry.hansen_sphere
    if sphere is None:
        return []
    centre = (sphere.delta_d, sphere.delta_p, sphere.delta_h)
    out = []
    for s in (catalog_solvents(derived) if solvents is None else solvents).values():
        ra = solvency.hansen_distance(s.hansen, centre)
        red = solvency.relative_energy_difference(ra, sphere.radius)
        out.append(SphereMatch(s.id, ra, red, solvency.red_class(red)))
    return sorted(out, key=lambda m: (m.red, m.id))


def solvency_relations(derived, cache=None) -> Relations:
    """The substitutes of every catalog liquid and the sphere matches of every resin.

    They depend only on the liquids' ranking records (``catalog_solvents``) and the resins'
    spheres, so with a ``cache`` (``builder.core.cache.Cache``) they are kept under the key of
    exactly those and the code: an edit that changes no liquid's record (most edits: a solid,
    a gas, a note, a store) reuses them instead of ranking every liquid against every other again.
    The relations of the last build are kept as well (under the code and the settings only, with
    the records they were made from): when a few records changed, only the liquids whose lists
    they can touch are ranked again (``updated_relations``).
    """
    solvents = catalog_solvents(derived)
    key = last = None
    if cache is not None and cache.root is not None:
        resins = [(d.entry.id, d.entry.hansen_sphere) for d in derived if d.entry.hansen_sphere is not None]
        records = [(r.id, r.hansen, r.flash_point_K, r.flammable_category, r.volatility_band, sorted(r.alert_ids),
                    sorted(r.health_h_codes)) for r in solvents.values()]  # sets sorted: the key is the same in every process
        key = key_of("relations", code_version(), settings_key(), repr(records), repr(resins))
        found = cache.get("relations", key)
        if isinstance(found, Relations):
            return found
        last = key_of("relations-last", code_version(), settings_key())
    relations = None
    if last is not None:
        kept = cache.get("relations", last)
        if isinstance(kept, tuple) and len(kept) == 2 and isinstance(kept[1], Relations):
            relations = updated_relations(kept[1], kept[0], solvents, derived)
    if relations is None:
        relations = _relations(derived, solvents)
    if key is not None:
        cache.put("relations", key, relations)
        cache.put("relations", last, (solvents, relations))
    return relations


#: above this many changed liquids, ranking every liquid again is as quick as finding which to rank
UPDATE_LIMIT = 50


def updated_relations(previous: Relations, before: dict, solvents: dict, derived) -> Relations | None:
    """The relations for the records ``solvents`` from ``previous``, made for the records ``before``
    (both: id → ``solvency.Solvent``); the same as ``_relations`` gives, or None when too much changed.

    A liquid's list is the first ``SHOWN_SUBSTITUTES`` of the other liquids that pass its filter
    (safer, better at something, within ``DEFAULT_MAX_RA``), safest first, and whether one passes
    depends only on the two records. So a liquid whose own record is unchanged keeps its list
    unless a changed liquid was on it (then it is ranked again); otherwise the changed liquids'
    new records that pass its filter are merged into the list by the same ordering. A changed or
    new liquid is ranked again; the sphere matches, one pass over the liquids per resin, are
    always worked out again.
    """
    changed = {k for k in before.keys() | solvents.keys() if before.get(k) != solvents.get(k)}
    if len(changed) > UPDATE_LIMIT:
        return None
    arrivals = [solvents[k] for k in sorted(changed) if k in solvents]
    safety = safety_prefixes(solvents)
    subs, matches = {}, {}
    for d in derived:
        eid = d.entry.id
        if d.entry.hansen_sphere is not None:
            matches[eid] = tuple(sphere_matches(d, derived, solvents))
            continue
        me = solvents.get(eid)
        if me is None:
            continue
        old = previous.substitutes.get(eid, ())
        if eid in changed or any(c.id in changed for c in old):
            found = tuple(substitutes_for(d, derived, solvents=solvents, safety=safety, limit=SHOWN_SUBSTITUTES))
        else:
            found = _merged(me, old, arrivals, solvents, safety)
        if found:
            subs[eid] = found
    return Relations(subs, matches)


def _merged(me, old: tuple, arrivals: list, solvents: dict, safety: dict) -> tuple:
    """``old`` (a liquid's substitutes) with those of ``arrivals`` that pass its filter, in the
    ranking's order, the first ``SHOWN_SUBSTITUTES`` kept."""
    mine = safety[me.id]
    safer = [s for s in arrivals if s.id != me.id and safety[s.id] < mine]
    entering = [c for c in solvency.iter_substitutes(me, safer, DEFAULT_MAX_RA) if c.better]
    if not entering:
        return old

    def order(c) -> tuple:  # the ranking's sort key, from the unrounded distance
        return solvency.safety_key(solvents[c.id], solvency.hansen_distance(solvents[c.id].hansen, me.hansen))

    return tuple(sorted((*old, *entering), key=order)[:SHOWN_SUBSTITUTES])


def _relations(derived, solvents: dict) -> Relations:
    subs, matches = {}, {}
    safety = safety_prefixes(solvents)
    for d in derived:
        if d.entry.hansen_sphere is not None:
            matches[d.entry.id] = tuple(sphere_matches(d, derived, solvents))
        elif d.entry.id in solvents:
            found = substitutes_for(d, derived, solvents=solvents, safety=safety, limit=SHOWN_SUBSTITUTES)
            if found:
                subs[d.entry.id] = tuple(found)
    return Relations(subs, matches)
