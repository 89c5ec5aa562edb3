"""The average molar mass of a molecule, as RDKit's ``Descriptors.MolWt`` gives it.

``rdkit.Chem.Descriptors`` loads every descriptor module RDKit has (fingerprints, QED, ...), about
0.1 s in each process that imports it, for the one function the builder uses; ``MolWt`` there is
this same call (RDKit 2026.09: ``MolWt = lambda *x, **y: _rdMolDescriptors._CalcMolWt(*x, **y)``).
"""
from __future__ import annotations

from rdkit import Chem
from rdkit.Chem import rdMolDescriptors


def molar_mass(mol: Chem.Mol) -> float:
    """Average molar mass [g/mol]: IUPAC standard atomic weights, implicit hydrogens included.

    Examples
    --------
    Ethanol, C2H6O, 46.07 g/mol (CRC Handbook, 95th ed.):

    >>> round(molar_mass(Chem.MolFromSmiles("CCO")), 2)
    46.07
    """
    return rdMolDescriptors._CalcMolWt(mol)
