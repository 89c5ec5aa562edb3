"""Tests for builder.chem.hansen (Mathieu 2018 group method, residual trees, energy split).

External references:
- the increments of Mathieu, ACS Omega 3 (2018) 17049 (supporting-information script, shipped
  in builder/data/hansen_groups.yaml): the group method is checked by hand computations from
  those increments; the paper's own worked examples were not available here;
- Hansen parameters of the four sets in chemicals 1.5.2 (``chemicals.solubility``), read at
  test time; the held-out fifth is re-evaluated from the shipped model here, not read from
  hansen_validation.json.
"""
from __future__ import annotations

import math
from functools import lru_cache

import chemicals  # noqa: F401  pinned test dependency: its absence must fail, not skip
import pytest
from chemicals.solubility import hansen_delta_d, hansen_delta_h, hansen_delta_p
from rdkit import Chem

from builder.chem.hansen import (
    cohesive_energy_split,
    dominant_share,
    estimate_hansen,
    HansenModel,
    group_estimate,
    load_model,
    mathieu_hansen,
)

TARGETS = {"delta_d": 0.45, "delta_p": 1.3, "delta_h": 1.2}


def measured(cas: str) -> tuple[float, float, float]:
    """Hansen parameters [MPa^½] from chemicals 1.5.2 (its default source order)."""
    return tuple(f(cas) / 1000.0 for f in (hansen_delta_d, hansen_delta_p, hansen_delta_h))


@lru_cache(maxsize=1)
def validation():
    from builder.fitting.hansen import load_records, validate

    return validate(load_records(), load_model())


def test_group_method_by_hand_acetone():
    # acetone CC(=O)C: atoms C43 ×2, C30, O10 -> V = 2·29.58 + 0 + 14.89 = 74.05 cm³/mol,
    # R = 2·5.74 + 3.15 + 1.84 = 16.47; polar: one C=O bond (7492) + the O(0) heteroatom (1603)
    # = 9095 J/mol; H-bond: 6 HC (6·24.5) + one O (1980) = 2127 J/mol.
    g = mathieu_hansen(Chem.MolFromSmiles("CC(=O)C"))
    assert g.complete
    assert g.volume_cm3 == pytest.approx(74.05)
    assert g.refraction_cm3 == pytest.approx(16.47)
    assert g.polar_energy == pytest.approx(9095)
    assert g.hbond_energy == pytest.approx(2127)
    d_d = math.sqrt(93.8 + (2016 + 75044 / 74.05) * (16.47 / 74.05) ** 2)
    assert g.delta_d == pytest.approx(d_d)
    assert g.delta_p == pytest.approx(math.sqrt(9095 / 74.05))
    assert g.delta_h == pytest.approx(math.sqrt(2127 / 74.05))
    # and against Hansen's acetone (15.5, 10.4, 7.0): the published method is within ~1.5
    for ours, ref in zip((g.delta_d, g.delta_p, g.delta_h), measured("67-64-1")):
        assert abs(ours - ref) < 1.7


def test_group_method_by_hand_ethyl_acetate_and_acid():
    # ethyl acetate CCOC(C)=O: the ester group (3653) claims the C=O bond, both oxygens are
    # counted as O(0) (2·1603): E_P = 6859 J/mol
    g = mathieu_hansen(Chem.MolFromSmiles("CCOC(C)=O"))
    assert g.polar_counts == {"Ester": 1, "O(0)": 2}
    assert g.polar_energy == pytest.approx(3653 + 2 * 1603)
    # acetic acid: COOH (−5494) and the ester pattern both match; O(0) and O(1) are counted
    a = mathieu_hansen(Chem.MolFromSmiles("CC(=O)O"))
    assert a.polar_counts == {"COOH": 1, "Ester": 1, "O(0)": 1, "O(1)": 1}
    assert a.hbond_counts == {"HC": 3, "HO_COOH": 1, "O": 2}


def test_group_method_outside_its_tables():
    # pyridine's aromatic C~N bond has no polar increment: the published method is undefined
    g = mathieu_hansen(Chem.MolFromSmiles("c1ccncc1"))
    assert not g.complete and "C~N" in g.unknown
    assert group_estimate("c1ccncc1").delta_d is None
    # the default estimate still answers, from the partial base
    est = estimate_hansen("c1ccncc1")
    assert est.status == "OK" and est.delta_p > 3.0   # Hansen: 8.8


COMMON_SOLVENTS = (("110-54-3", "CCCCCC"), ("108-88-3", "Cc1ccccc1"), ("67-64-1", "CC(C)=O"),
                   ("64-17-5", "CCO"), ("67-68-5", "CS(C)=O"), ("141-78-6", "CCOC(C)=O"))


def test_estimates_of_common_solvents_within_their_interval():
    # these are partly training compounds: the check is that the 90 % intervals are honest, not
    # accuracy. A 90 % interval leaves out about one value in ten, so of the 18 (6 solvents x 3
    # parameters) at least 16 must lie inside, and none may miss by more than half the interval's
    # width (DMSO's dD, 18.4 against an upper end of 18.38 after the refit of December 2026, is the
    # one miss today)
    inside, misses = 0, []
    for cas, smiles in COMMON_SOLVENTS:
        est = estimate_hansen(smiles)
        assert est.status == "OK", smiles
        for (lo, hi), ref in zip(est.interval90.values(), measured(cas)):
            if lo <= ref <= hi:
                inside += 1
            else:
                misses.append((smiles, ref, lo, hi))
                assert min(abs(ref - lo), abs(ref - hi)) <= (hi - lo) / 2, (smiles, ref, lo, hi)
    assert inside >= 16, misses


def test_members_are_averaged_and_only_residual_members_add_the_group_value():
    # by hand: δD members 16.0 + 0.5 (residual) and 17.0 (value) -> 16.75; δP 3.0 whatever the
    # group says; δH 4.0 - 1.0
    def leaf(v):
        return {"feature": [], "threshold": [], "left": [], "right": [], "leaf": [v]}

    model = HansenModel({"environments": [], "uncertainty": {}, "members": {
        "delta_d": [{"target": "residual", "trees": [leaf(0.5)]}, {"target": "value", "trees": [leaf(17.0)]}],
        "delta_p": [{"target": "value", "trees": [leaf(1.0), leaf(2.0)]}],
        "delta_h": [{"target": "residual", "trees": [leaf(-1.0)]}]}})
    assert model.value("delta_d", [], 16.0) == pytest.approx(16.75)
    assert model.value("delta_p", [], 9.0) == pytest.approx(3.0)
    assert model.value("delta_h", [], 4.0) == pytest.approx(3.0)


def test_outside_domain():
    assert estimate_hansen("[Na+].[Cl-]").delta_d is None
    assert estimate_hansen("O").status != "OK"        # no carbon
    assert estimate_hansen("not a smiles").delta_d is None


@pytest.mark.slow
def test_held_out_accuracy_beats_the_group_method():
    table = validation()["components"]
    assert validation()["held_out"]["n"] > 200
    for component, row in table.items():
        assert row["model_where_group_defined"]["mae"] < row["group_method_alone"]["mae"], component
        # calibrated interval: between 85 % and 97 % of held-out values inside the 90 % interval
        assert 0.85 <= row["interval90_coverage"] <= 0.97, component
    assert table["delta_h"]["model_all"]["mae"] <= TARGETS["delta_h"]
    assert table["delta_d"]["model_all"]["mae"] <= TARGETS["delta_d"]
    # regression guard at the accuracy reached (the target for δP is not yet met)
    assert table["delta_p"]["model_all"]["mae"] <= 1.55


@pytest.mark.slow
def test_stored_validation_is_the_shipped_model():
    # the methods page shows builder/data/hansen_validation.json: it must be this model's table
    import json

    from builder.fitting.hansen import VALIDATION_PATH

    stored = json.loads(VALIDATION_PATH.read_text(encoding="utf-8"))
    assert stored["components"] == validation()["components"]
    assert stored["held_out"] == validation()["held_out"]


@pytest.mark.slow
@pytest.mark.xfail(strict=True, reason="issue target δP ≤ 1.3 not reached; δD ≤ 0.45 and δH ≤ 1.2 are (held-out 0.44, 1.51, 1.08: python -m builder.fitting.hansen --report)")
def test_held_out_targets_of_the_issue():
    table = validation()["components"]
    assert all(table[c]["model_all"]["mae"] <= t for c, t in TARGETS.items())


def test_cohesive_energy_split_definition():
    split = cohesive_energy_split(*measured("7732-18-5"))  # water 15.5, 16.0, 42.3
    total = 15.5**2 + 16.0**2 + 42.3**2
    assert split["hydrogen_bond"] == pytest.approx(42.3**2 / total)
    assert sum(split.values()) == pytest.approx(1.0)
    with pytest.raises(ValueError):
        cohesive_energy_split(0.0, 0.0, 0.0)


# The force profile names the strongest kind of contact present (builder.chem.forces); the
# energy split measures shares.  They agree when: a molecule labelled "dispersion" has less than
# 10 % of its cohesive energy elsewhere, and otherwise the larger of the polar and hydrogen-bond
# shares matches the label.  Expected disagreements, each explained:
EXPECTED_DISAGREEMENTS = {
    # Hansen's δH counts electron-pair acceptors (ether and ester oxygens) even without a donor,
    # while the force profile calls hydrogen bonding only where an N-H/O-H donor exists:
    "123-91-1": "1,4-dioxane: no net dipole, acceptor oxygens give δH 9.0",
    "109-99-9": "THF: acceptor oxygen, δH 8.0 > δP 5.7",
    "60-29-7": "diethyl ether: acceptor oxygen, δH 4.6 > δP 2.9",
    "141-78-6": "ethyl acetate: acceptor oxygens, δH 7.2 > δP 5.3",
    # weak C-H donor of chloroform (it hydrogen-bonds to acceptors), small dipole:
    "67-66-3": "chloroform: δH 5.7 > δP 3.1",
}
SOLVENTS = {
    "110-54-3": "CCCCCC", "108-88-3": "Cc1ccccc1", "56-23-5": "ClC(Cl)(Cl)Cl", "67-64-1": "CC(C)=O",
    "64-17-5": "CCO", "67-66-3": "ClC(Cl)Cl", "75-09-2": "ClCCl", "141-78-6": "CCOC(C)=O",
    "67-68-5": "CS(C)=O", "68-12-2": "CN(C)C=O", "75-05-8": "CC#N", "109-99-9": "C1CCOC1",
    "60-29-7": "CCOCC", "64-19-7": "CC(=O)O", "123-91-1": "C1COCCO1", "71-43-2": "c1ccccc1",
    "110-86-1": "c1ccncc1", "67-56-1": "CO", "75-15-0": "S=C=S",
}


def test_energy_split_against_force_label():
    from builder.chem.forces import force_profile

    label_of = {"polar": "dipole-dipole", "hydrogen_bond": "hydrogen-bonding"}
    disagreements = set()
    for cas, smiles in SOLVENTS.items():
        split = cohesive_energy_split(*measured(cas))
        label = force_profile(smiles).dominant
        if label == "dispersion":
            agree = split["polar"] + split["hydrogen_bond"] < 0.10
        else:
            agree = label_of[max(("polar", "hydrogen_bond"), key=split.get)] == label
        if not agree:
            disagreements.add(cas)
    assert disagreements == set(EXPECTED_DISAGREEMENTS)
    assert dominant_share(*measured("64-17-5")) == "hydrogen_bond"
