"""Tests for builder.chem.storage and builder/data/storage_compatibility.yaml.

The expected outcomes below are written out independently of the data file, from its stated
source: common practice, from memory, on the principles stated in UK HSE HSG51 (3rd ed., 2015) and
HSG71 (2nd ed., 2009), also from memory.  Every pair of the ten storage groups is listed.
"""

from __future__ import annotations

import itertools

import pytest
from rdkit import Chem

from builder.chem.alerts import find_alerts
from builder.chem.storage import (
    OUTCOMES,
    TableError,
    assign_group,
    compatibility,
    container_volume_litres,
    default_table,
    flammable_volume,
    group_outcome,
    grouped_conflicts,
    hubs,
    kind_conflicts,
    store_conflicts,
    validate_table,
)

GROUPS = ("energetic", "gas", "water-reactive", "oxidizer", "flammable", "acid", "base", "corrosive", "toxic",
          "general")
C, A, S = "compatible", "keep-apart", "keep-separate"

# The matrix, row by row (upper triangle, diagonal included), in GROUPS order.
# - energetic: on its own (keep separate from everything; two energetic materials kept apart)
# - gas cylinders: apart from everything else, secured in their own area
# - water/air-reactive: separate from oxidisers and aqueous corrosives (acids, bases), apart from the rest
# - oxidisers: separate from flammables (HSG51: no oxidisers in a flammable-liquid store), apart from
#   corrosives, toxics and general combustibles
# - flammables: apart from corrosives; with toxics and general materials compatible
# - acids apart from bases and from toxics (cyanides, sulfides); corrosives of unknown kind apart from
#   both and from each other
MATRIX = {
    "energetic":      [A, S, S, S, S, S, S, S, S, S],
    "gas":            [C, A, A, A, A, A, A, A, A],
    "water-reactive": [C, S, A, S, S, S, A, A],
    "oxidizer":       [C, S, A, A, A, A, A],
    "flammable":      [C, A, A, A, C, C],
    "acid":           [C, A, A, A, C],
    "base":           [C, A, C, C],
    "corrosive":      [A, A, C],
    "toxic":          [C, C],
    "general":        [C],
}
EXPECTED = {}
for i, g in enumerate(GROUPS):
    for j, outcome in enumerate(MATRIX[g]):
        EXPECTED[frozenset((g, GROUPS[i + j]))] = outcome


def test_the_table_knows_exactly_these_groups():
    assert default_table().group_ids == GROUPS
    assert len(EXPECTED) == 55  # 10 groups: 45 pairs and 10 diagonals


@pytest.mark.parametrize("a,b", list(itertools.combinations_with_replacement(GROUPS, 2)),
                         ids=[f"{a}|{b}" for a, b in itertools.combinations_with_replacement(GROUPS, 2)])
def test_every_pair_of_groups(a, b):
    assert group_outcome(a, b)[0] == EXPECTED[frozenset((a, b))]
    assert group_outcome(b, a)[0] == group_outcome(a, b)[0]  # symmetric


def _assign(smiles, statements, category=None, state=None):
    mol = Chem.MolFromSmiles(smiles) if smiles else None
    return assign_group(statements, find_alerts(mol, statements), category, state)


# Hazard statements as recorded from memory of the CLP Annex VI harmonised entries (the demo's source)
GROUP_CASES = [
    ("potassium persulfate", "[K+].[K+].[O-]S(=O)(=O)OOS(=O)(=O)[O-]", ["H272", "H302", "H315", "H317"], None, "oxidizer"),
    ("ethanol", "CCO", ["H225", "H319"], 2, "flammable"),
    ("butan-1-ol (category 3)", "CCCCO", ["H226", "H302"], 3, "flammable"),
    ("acetic acid: corrosive acid before category 3", "CC(=O)O", ["H226", "H314"], 3, "acid"),
    ("triethylamine: category 2 before corrosive", "CCN(CC)CC", ["H225", "H302", "H311", "H331", "H314"], 2,
     "flammable"),
    ("sodium hydroxide", "[Na+].[OH-]", ["H290", "H314"], None, "base"),
    ("a corrosive of unknown kind", None, ["H314"], None, "corrosive"),
    ("acetyl chloride: water-reactive first", "CC(Cl)=O", ["H225", "H302", "H314", "EUH014"], 2, "water-reactive"),
    ("sodium metal by structure alone", "[Na]", [], None, "water-reactive"),
    ("n-butyllithium: pyrophoric", "[Li]CCCC", ["H250", "H260", "H314"], None, "water-reactive"),
    ("dibenzoyl peroxide", "O=C(OOC(=O)c1ccccc1)c1ccccc1", ["H241", "H317", "H319"], None, "energetic"),
    ("propane: gas under pressure", "CCC", ["H220", "H280"], None, "gas"),
    ("nitrogen by state", "N#N", [], None, "gas"),
    ("sodium cyanide: acutely toxic", "[Na+].[C-]#N", ["H300", "H310", "H330", "H410", "EUH032"], None, "toxic"),
    ("dichloromethane: category 4 toxicity stays general", "ClCCl", ["H315", "H319", "H336", "H351"], None,
     "general"),
    ("2-butoxyethanol: acute toxicity category 4, not flammable", "CCCCOCCO", ["H302", "H312", "H332"], 4, "general"),
]


@pytest.mark.parametrize("name,smiles,statements,category,group", GROUP_CASES, ids=[c[0] for c in GROUP_CASES])
def test_storage_group(name, smiles, statements, category, group):
    state = "gas" if name.startswith("nitrogen") else None
    assert _assign(smiles, statements, category, state).group == group


def test_reason_and_classes():
    tea = _assign("CCN(CC)CC", ["H225", "H314", "H331"], 2)
    assert tea.reason == "H225 declared"
    assert {"flammable", "base", "toxic"} <= set(tea.classes)
    unknown = _assign(None, ["H314"])
    assert {"acid", "base"} <= set(unknown.classes)  # both sides' rules apply when the kind is not known


def test_class_rules_reach_past_the_group():
    # a flammable base and an acid filed as corrosive acid: apart (acid-base), whatever the groups say
    tea = _assign("CCN(CC)CC", ["H225", "H314"], 2)
    acetic = _assign("CC(=O)O", ["H226", "H314"], 3)
    assert compatibility(tea, acetic)[0] == A
    # a cyanide (toxic group) and an acid: separate, for the hydrogen cyanide
    cyanide = _assign("[Na+].[C-]#N", ["H300", "EUH032"])
    outcome, reason = compatibility(cyanide, acetic)
    assert outcome == S and "toxic gas" in reason
    # an oxidiser and a flammable liquid: separate, with the reason
    persulfate = _assign("[K+].[K+].[O-]S(=O)(=O)OOS(=O)(=O)[O-]", ["H272"])
    ethanol = _assign("CCO", ["H225"], 2)
    outcome, reason = compatibility(persulfate, ethanol)
    assert outcome == S and "oxidiser" in reason
    # two flammable liquids share a shelf
    assert compatibility(ethanol, _assign("Cc1ccccc1", ["H225"], 2))[0] == C


def test_store_conflicts_sorted_and_grouped():
    members = [("ethanol", _assign("CCO", ["H225"], 2)), ("toluene", _assign("Cc1ccccc1", ["H225"], 2)),
               ("persulfate", _assign("[K+].[K+].[O-]S(=O)(=O)OOS(=O)(=O)[O-]", ["H272"])),
               ("dcm", _assign("ClCCl", ["H351"]))]
    conflicts = store_conflicts(members)
    assert [(c.first, c.second, c.outcome) for c in conflicts] == [
        ("ethanol", "persulfate", S), ("persulfate", "toluene", S), ("dcm", "persulfate", A)]
    assert store_conflicts(members, worst_only=True) == conflicts[:2]
    grouped = grouped_conflicts(conflicts[:2])
    assert grouped == (("persulfate", ("ethanol", "toluene"), S, conflicts[0].reason),)
    assert store_conflicts(members[:2]) == ()


def test_store_conflicts_match_every_pair_compared_one_by_one():
    # store_conflicts looks each pair of (group, classes) kinds up once; compared here with the
    # plain pairwise reading of the table over the demo catalog's materials put in one store,
    # each twice under a second id so that kinds hold several members and ids interleave
    from pathlib import Path

    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog

    catalog, _ = load_catalog(Path(__file__).resolve().parents[2] / "entries")
    derived = [d for d in derive_catalog(catalog) if getattr(d, "storage", None) is not None]
    members = [(d.entry.id, d.storage) for d in derived] + [(f"{d.entry.id[::-1]}-2", d.storage) for d in derived]
    assert len({a.group for _, a in members}) >= 4
    for worst_only in (False, True):
        expected = []
        for (a_id, a), (b_id, b) in itertools.combinations(sorted(members, key=lambda m: m[0]), 2):
            outcome, reason = compatibility(a, b)
            if outcome == C or (worst_only and outcome != S):
                continue
            expected.append((a_id, b_id, outcome, reason))
        expected.sort(key=lambda c: (-OUTCOMES.index(c[2]), c[0], c[1]))
        got = [(c.first, c.second, c.outcome, c.reason) for c in store_conflicts(members, worst_only=worst_only)]
        assert got == expected and expected
        # kind by kind: the same pairs with the same outcomes, each pair once
        kinds = kind_conflicts(members, worst_only=worst_only)
        expanded = sorted(tuple(sorted((a, b))) + (k.outcome,) for k in kinds
                          for a, b in (itertools.combinations(k.first, 2) if not k.second
                                       else itertools.product(k.first, k.second)))
        assert expanded == sorted((a, b, o) for a, b, o, _ in expected)
        assert sum(k.pairs for k in kinds) == len(expected) and len(kinds) < len(expected)


def _plain_greedy(pairs, tiebreak, preferred):
    """The material in most remaining pairs takes them, counted afresh each time (the definition)."""
    pending, out = list(enumerate(pairs)), []
    while pending:
        count = {}
        for _, (a, b) in pending:
            for x in (a, b):
                count[x] = count.get(x, 0) + 1
        candidates = [i for i in count if preferred is None or i in preferred] or list(count)
        at = max(sorted(candidates), key=lambda i: (count[i], [-t for t in tiebreak(i)]))
        out.append((at, [k for k, p in pending if at in p]))
        pending = [(k, p) for k, p in pending if at not in p]
    return out


def test_hubs_take_pairs_as_the_plain_greedy_does():
    import random

    rng = random.Random(3)
    for _ in range(300):
        ids = [f"m{i:02d}" for i in range(rng.randint(2, 25))]
        pairs = sorted({tuple(sorted(rng.sample(ids, 2))) for _ in range(rng.randint(1, 80))})
        rank = {i: (rng.randint(0, 3),) for i in ids}
        preferred = set(rng.sample(ids, rng.randint(0, min(4, len(ids))))) if rng.random() < 0.5 else None
        assert hubs(pairs, rank.__getitem__, preferred) == _plain_greedy(pairs, rank.__getitem__, preferred)
        assert hubs(pairs) == _plain_greedy(pairs, lambda i: (), None)
    with pytest.raises(ValueError):  # ids are unique in a store: a material never pairs with itself
        hubs([("a", "a"), ("a", "b")])


def test_container_volumes():
    assert container_volume_litres("25 L steel can with bung; 1 L amber glass in the pilot bay") == 26.0
    assert container_volume_litres("4 x 2.5 L glass bottles") == 10.0
    assert container_volume_litres("2 × 500 mL") == 1.0
    assert container_volume_litres("1 m3 IBC") == 1000.0
    assert container_volume_litres("1 kg HDPE tub") is None
    assert container_volume_litres(None) is None
    ethanol = _assign("CCO", ["H225"], 2)
    general = _assign("ClCCl", ["H351"])
    total, counted, uncounted = flammable_volume([("a", ethanol, "20 L can"), ("b", ethanol, None),
                                                  ("c", general, "200 L drum")])
    assert (total, counted, uncounted) == (20.0, (("a", 20.0),), ("b",))


def test_invalid_tables_are_refused():
    with pytest.raises(TableError):
        validate_table({"version": 1, "source": "x", "groups": [{"id": "general", "when": {}}],
                        "table": [["general", "nowhere", "compatible"]], "class_rules": []})
    with pytest.raises(TableError):
        validate_table({"version": 1, "source": "x", "groups": [{"id": "a", "when": {"h_statements": ["H225"]}}],
                        "table": [], "class_rules": [["a", "b", "sometimes", "why"]]})


def test_outcomes_are_ordered_mildest_first():
    assert OUTCOMES == (C, A, S)
