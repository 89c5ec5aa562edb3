"""Results kept for the last molecule (``builder.chem.memo.for_last``) are the results a fresh
computation gives, and one entry's derivation works each of them out once."""
from __future__ import annotations

import pytest
from rdkit import Chem

from builder.chem import boiling, dipole
from builder.chem.hansen import estimate_hansen
from builder.chem.melting import estimate_melting_point
from builder.chem.structure3d import canonical_smiles, conformer_ensemble
from builder.core.model import Entry
from builder.derive.entry import derive_entry

MOLECULES = ["CCCCO", "CC(C)(C)c1ccccc1", "OC(=O)CCC(=O)O", "ClC(Cl)(Cl)Cl", "CCOC(=O)C=C", "C/C=C\\CC"]


def test_kept_results_equal_fresh_ones_whatever_came_between():
    mols = [Chem.MolFromSmiles(s) for s in MOLECULES]
    for mol in mols + mols[::-1]:  # each molecule after another one, then again after others
        estimate_melting_point(mol)
        estimate_hansen(mol)
        kept = boiling.tree_estimate(mol)
        assert kept == boiling._tree_estimate(Chem.Mol(mol), None)
        env = boiling.load_model().environments
        assert boiling.descriptor_row(mol, env) == boiling.descriptor_row(Chem.Mol(mol), env)
        ensemble = conformer_ensemble(canonical_smiles(mol))
        assert dipole.ensemble_dipole(ensemble) == dipole._ensemble_dipole(ensemble, "auto")


def test_a_kept_row_is_not_changed_by_its_callers():
    mol = Chem.MolFromSmiles("CCCCO")
    env = boiling.load_model().environments
    first = boiling.descriptor_row(mol, env)
    first.append(99.0)  # a caller extends its row (TreeModel.features adds the stereo features)
    assert boiling.descriptor_row(mol, env) == first[:-1]


def test_one_entry_works_out_its_boiling_estimate_and_dipole_once(monkeypatch):
    calls = {"tb": 0, "dipole": 0}
    tree, route = boiling._tree_estimate, dipole._ensemble_dipole

    def counted_tree(*args):
        calls["tb"] += 1
        return tree(*args)

    def counted_route(*args):
        calls["dipole"] += 1
        return route(*args)

    monkeypatch.setattr(boiling, "_tree_estimate", counted_tree)
    monkeypatch.setattr(dipole, "_ensemble_dipole", counted_route)
    entry = Entry(id="pentanol", name="1-Pentanol", smiles="CCCCCO", path="pentanol.yaml")
    derived = derive_entry(entry)
    # the boiling point, the force profile and the Hansen parameters all came out ...
    assert derived.get("boiling_point_estimate") is not None and derived.forces is not None
    assert derived.get("hansen_delta_p") is not None
    # ... from one boiling-point estimate and one dipole moment
    assert calls == {"tb": 1, "dipole": 1}


@pytest.mark.parametrize("smiles", ["CCO", "c1ccccc1O"])
def test_an_equal_molecule_gets_its_own_computation(smiles):
    first, second = Chem.MolFromSmiles(smiles), Chem.MolFromSmiles(smiles)
    a, b = boiling.tree_estimate(first), boiling.tree_estimate(second)
    assert a == b and a is not b  # worked out again for the second object
    assert boiling.tree_estimate(second) is b  # and kept for it
