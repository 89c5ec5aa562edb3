"""Keeping the solvency relations of the last build and updating them for a few changed liquids
gives exactly what ranking every liquid again gives (builder.derive.solvency.updated_relations).

The reference is the full ranking itself (``_relations``), on random catalogs of liquid records
with random edits: a flash point, a category, the parameters, a new liquid, a removed one.
"""
from __future__ import annotations

import random
from types import SimpleNamespace

import pytest

from builder.chem.solvency import Solvent
from builder.derive.solvency import UPDATE_LIMIT, Relations, _relations, updated_relations

H_CODES = ("H304", "H315", "H336", "H361d", "H373")
BANDS = ("low", "medium", "high")


def _record(rng: random.Random, sid: str) -> Solvent:
    cat = rng.choice((None, 1, 2, 3, 4))
    return Solvent(sid, (round(rng.uniform(15.0, 19.0), 2), round(rng.uniform(0.0, 8.0), 2),
                         round(rng.uniform(0.0, 10.0), 2)),
                   None if cat is None and rng.random() < 0.7 else round(rng.uniform(240.0, 360.0), 1), cat,
                   rng.choice(BANDS), frozenset(rng.sample(("peroxide", "amine"), rng.randint(0, 1))),
                   frozenset(rng.sample(H_CODES, rng.randint(0, 2))))


def _derived(solvents: dict, resins: tuple = ()) -> tuple:
    rows = [SimpleNamespace(entry=SimpleNamespace(id=k, hansen_sphere=None)) for k in sorted(solvents)]
    rows += [SimpleNamespace(entry=SimpleNamespace(id=k, hansen_sphere=sphere)) for k, sphere in resins]
    return tuple(sorted(rows, key=lambda d: d.entry.id))


def _edit(rng: random.Random, solvents: dict, serial: list) -> dict:
    out = dict(solvents)
    for _ in range(rng.randint(1, 3)):
        what = rng.random()
        if what < 0.15:
            serial[0] += 1
            sid = f"new-{serial[0]}"
            out[sid] = _record(rng, sid)
        elif what < 0.25 and len(out) > 5:
            del out[rng.choice(sorted(out))]
        else:
            sid = rng.choice(sorted(out))
            fresh = _record(rng, sid)
            field = rng.choice(("hansen", "flash_point_K", "flammable_category", "volatility_band", "health_h_codes"))
            out[sid] = Solvent(**{**out[sid].__dict__, field: getattr(fresh, field)})
    return dict(sorted(out.items()))


@pytest.mark.parametrize("seed", range(6))
def test_an_updated_ranking_equals_ranking_everything_again(seed):
    rng = random.Random(seed)
    solvents = {f"s{i:03d}": _record(rng, f"s{i:03d}") for i in range(120)}
    resins = (("resin-a", SimpleNamespace(delta_d=17.0, delta_p=4.0, delta_h=5.0, radius=6.0)),)
    relations = _relations(_derived(solvents, resins), solvents)
    assert sum(len(v) for v in relations.substitutes.values()) > 200  # lists long enough to be cut at five
    serial = [0]
    updated = merged = 0
    for _ in range(40):
        after = _edit(rng, solvents, serial)
        derived = _derived(after, resins)
        got = updated_relations(relations, solvents, after, derived)
        want = _relations(derived, after)
        assert isinstance(got, Relations)
        assert got == want
        assert list(got.substitutes) == list(want.substitutes)  # and in the same order
        updated += 1
        merged += sum(1 for k, v in got.substitutes.items() if v is relations.substitutes.get(k))
        solvents, relations = after, got
    assert updated == 40 and merged > 1000  # most lists were kept, not ranked again


def test_too_many_changes_are_ranked_afresh():
    rng = random.Random(7)
    solvents = {f"s{i:03d}": _record(rng, f"s{i:03d}") for i in range(UPDATE_LIMIT + 10)}
    relations = _relations(_derived(solvents), solvents)
    after = {k: _record(rng, k) for k in solvents}
    assert updated_relations(relations, solvents, after, _derived(after)) is None
