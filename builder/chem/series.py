"""Structure classes: the key shared by the members of one homologous series.

Two molecules are in one class when they have the same number of rings, the same count of
each functional group of ``FUNCTIONAL_GROUPS``, the same heteroatoms and the same number of
branch points; with formulas differing by whole CH2 units they are homologues
(``builder.derive.links``). Worked out once per entry while deriving (``Derived.series_class``).
"""
from __future__ import annotations

from collections import Counter
from functools import lru_cache

from rdkit import Chem

#: functional groups that define a structure class (SMARTS, our own selection)
FUNCTIONAL_GROUPS = {
    "primary alcohol": "[CX4;!$(C(C)(C)C)][OX2H]",
    "secondary or tertiary alcohol": "[CX4;$(C(C)(C)C)][OX2H]",
    "phenol": "c[OX2H]",
    "carboxylic acid": "[CX3](=O)[OX2H]",
    "ester": "[CX3](=O)[OX2][#6]",
    "ketone": "[#6][CX3](=O)[#6]",
    "aldehyde": "[CX3H1](=O)",
    "ether": "[OD2]([#6;!$(C=O)])[#6;!$(C=O)]",
    "amine": "[NX3;!$(N-C=O);!$(N-a)]",
    "amide": "[NX3][CX3]=O",
    "nitrile": "C#N",
    "alkene": "[CX3]=[CX3]",
    "aromatic ring carbon": "c",
    "halogen": "[F,Cl,Br,I]",
}


@lru_cache(maxsize=1)
def _group_patterns() -> tuple:
    return tuple(Chem.MolFromSmarts(s) for s in FUNCTIONAL_GROUPS.values())


@lru_cache(maxsize=16384)
def structure_class(smiles: str) -> tuple:
    """A key shared by members of one homologous series (of a canonical SMILES): rings, the counts of
    ``FUNCTIONAL_GROUPS``, the heteroatoms and the branch points.

    Propan-1-ol and butan-1-ol share a class; butan-2-ol (a secondary alcohol) does not:

    >>> structure_class("CCCO") == structure_class("CCCCO")
    True
    >>> structure_class("CCCO") == structure_class("CCC(C)O")
    False
    """
    mol = Chem.MolFromSmiles(smiles)
    groups = tuple(len(mol.GetSubstructMatches(p)) for p in _group_patterns())
    hetero = tuple(sorted(Counter(a.GetSymbol() for a in mol.GetAtoms() if a.GetSymbol() not in ("C", "H")).items()))
    branches = sum(1 for a in mol.GetAtoms() if a.GetSymbol() == "C" and a.GetDegree() >= 3 and not a.GetIsAromatic())
    return (mol.GetRingInfo().NumRings(), groups, hetero, branches)
