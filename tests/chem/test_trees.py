"""The residual trees are walked all at once (``builder.chem.boiling._FlatTrees``); the result must
be the float a walk of one tree at a time gives, the definition of a sum of regression trees
(common practice: each tree sends ``x`` left when ``x[feature] <= threshold`` until a leaf, and the
leaves are added in tree order).  Checked on the shipped models and on hand-made trees.
"""
from __future__ import annotations

import math
import random

import pytest
from rdkit import Chem

from builder.chem import boiling, hansen, melting
from builder.chem.boiling import TreeModel


def one_tree_at_a_time(trees, x) -> float:
    total = 0.0
    for feature, threshold, left, right, leaf in trees:
        node = 0 if feature else -1
        while node >= 0:
            node = left[node] if x[feature[node]] <= threshold[node] else right[node]
        total += leaf[~node]
    return total


def model_of(trees) -> TreeModel:
    return TreeModel({"environments": [], "uncertainty": {"heavy_atom_bands": []},
                      "trees": [dict(zip(("feature", "threshold", "left", "right", "leaf"), t)) for t in trees]})


MOLECULES = ["CCCCO", "CC(C)(C)c1ccccc1", "OC(=O)CCC(=O)O", "ClC(Cl)(Cl)Cl", "CCOC(=O)C=C", "N#CCC#N",
             "C1CCC2CCCCC2C1", "CCCCCCCCCCCCCCCC", "O=C1CCCCC1", "c1ccc2ccccc2c1", "CS(=O)C", "CCN(CC)CC"]


@pytest.mark.parametrize("smiles", MOLECULES)
def test_shipped_models_give_the_tree_by_tree_sum(smiles):
    mol = Chem.MolFromSmiles(smiles)
    bm, mm, hm = boiling.load_model(), melting.load_model(), hansen.load_model()
    rows = [(bm, bm.features(mol)), (mm, melting.melting_row(mol, mm.environments))]
    rows += [(trees, hansen.hansen_row(mol, hm.environments)[0])
             for members in hm.members.values() for _, trees in members]
    rng = random.Random(smiles)
    for model, x in rows:
        for row in (x, [v * rng.uniform(0.5, 1.5) for v in x]):  # other paths through the same trees
            assert model.residual(row) == one_tree_at_a_time(model.trees, row)  # exactly, not nearly


def test_hand_made_trees_leaves_ties_and_nan():
    trees = [
        ([], [], [], [], [2.5]),                                  # no split: its only leaf
        ([0], [1.0], [~0], [~1], [10.0, -10.0]),                  # x0 <= 1 -> 10, else -10
        ([1, 0], [0.5, 3.0], [1, ~2], [~0, ~1], [0.1, 0.2, 0.3]),  # two levels
    ]
    model = model_of(trees)
    for x in ([1.0, 0.5], [1.0000001, 0.5], [3.0, 0.2], [5.0, 9.0], [math.nan, math.nan], [-1e300, 1e300]):
        assert model.residual(x) == one_tree_at_a_time(trees, x)
    assert model.residual([1.0, 0.5]) == 2.5 + 10.0 + 0.3   # the tie x0 == 1 goes left
    assert model.residual([math.nan, 0.0]) == 2.5 - 10.0 + 0.2   # NaN fails every "<=" test


def random_tree(rng: random.Random, depth: int) -> tuple[list, list, list, list, list]:
    """A tree in the shipped layout: split ``i`` at ``feature[i] <= threshold[i]``, children
    ``left[i]``/``right[i]`` (a split's index, or ``~k`` for leaf ``k``)."""
    feature, threshold, left, right, leaves = [], [], [], [], []

    def grow(depth: int) -> int:
        if depth == 0 or rng.random() < 0.3:
            leaves.append(rng.uniform(-5, 5))
            return ~(len(leaves) - 1)
        i = len(feature)
        feature.append(rng.randrange(4))
        threshold.append(rng.uniform(-1, 1))
        left.append(0)
        right.append(0)
        left[i] = grow(depth - 1)
        right[i] = grow(depth - 1)
        return i

    grow(depth)
    return feature, threshold, left, right, leaves


def test_random_trees():
    rng = random.Random(7)
    for _ in range(50):
        trees = [random_tree(rng, rng.randint(0, 8)) for _t in range(rng.randint(0, 30))]
        model = model_of(trees)
        for _x in range(20):
            x = [rng.uniform(-1.2, 1.2) for _ in range(4)]
            assert model.residual(x) == one_tree_at_a_time(trees, x)


def test_edge_cases_no_trees_negative_zero_and_missing_features():
    assert model_of([]).residual([1.0, 2.0]) == 0.0                 # an empty sum
    leaves_only = [([], [], [], [], [-0.0]), ([], [], [], [], [-0.0])]
    got, want = model_of(leaves_only).residual([]), one_tree_at_a_time(leaves_only, [])
    assert math.copysign(1.0, got) == math.copysign(1.0, want) == 1.0  # 0.0 + -0.0 + -0.0 is +0.0
    with pytest.raises(TypeError):                                  # a missing feature is not compared
        model_of([([0], [1.0], [~0], [~1], [1.0, 2.0])]).residual([None])
