"""builder.chem.molar_mass against RDKit's public ``Descriptors.MolWt`` (the reference library's own
function) and against the molecular weights ``chemicals`` 1.5.2 computes from formulas."""
from __future__ import annotations

import pytest
from chemicals.elements import molecular_weight, simple_formula_parser
from rdkit import Chem
from rdkit.Chem import Descriptors, rdMolDescriptors

from builder.chem.molar_mass import molar_mass

MOLECULES = ["O", "CCO", "c1ccccc1", "ClC(Cl)(Cl)Cl", "[NH4+].[Cl-]", "CC(=O)OCC", "BrCCBr", "[2H]C([2H])([2H])O",
             "OS(=O)(=O)O", "C[Si](C)(C)Cl", "FC(F)(F)C(F)(F)F", "CCCCCCCCCCCCCCCCCC(=O)O"]


@pytest.mark.parametrize("smiles", MOLECULES)
def test_same_as_rdkit_descriptors(smiles):
    mol = Chem.MolFromSmiles(smiles)
    assert molar_mass(mol) == Descriptors.MolWt(mol)  # the same number, bit for bit


@pytest.mark.parametrize("smiles", [s for s in MOLECULES if "[2H]" not in s and "." not in s])
def test_agrees_with_chemicals_formula_weights(smiles):
    formula = rdMolDescriptors.CalcMolFormula(Chem.MolFromSmiles(smiles))
    reference = molecular_weight(simple_formula_parser(formula))  # chemicals' IUPAC atomic weights
    assert molar_mass(Chem.MolFromSmiles(smiles)) == pytest.approx(reference, rel=2e-4)
