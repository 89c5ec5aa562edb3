"""Structure counts for the Myrdal & Yalkowsky (1997) vapor-pressure equation and the flash-point routes.

``vapor_structure(mol)`` counts, from an RDKit molecule, what ``builder.chem.vapor`` and
``builder.chem.flash`` need: the flexibility number τ (from non-terminal sp3 and sp2 chain
atoms and fused ring systems), the hydrogen-bond number HBN (from OH, COOH and NH2
groups), the carbon count and whether the molecule has an O–H or N–H donor.

Reference: Myrdal, P. B.; Yalkowsky, S. H. Estimating Pure Component Vapor Pressures of
Complex Organic Molecules. Ind. Eng. Chem. Res. 1997, 36, 2494–2499.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from rdkit import Chem

from builder.chem import vapor
from builder.chem.molar_mass import molar_mass

#: elements the estimation routes were measured on (C, H, N, O, S, halogens)
ORGANIC_ELEMENTS = frozenset({1, 6, 7, 8, 9, 15, 16, 17, 35, 53})


@dataclass(frozen=True)
class VaporStructure:
    """Counts from a structure: tau [-], HBN [mol/g], molar mass [g/mol], carbon count [-]."""

    tau: float
    hbn: float
    molar_mass: float  # g/mol
    n_carbon: int
    h_bond_donor: bool


_COOH = Chem.MolFromSmarts("[CX3](=O)[OX2H1]")
_OH = Chem.MolFromSmarts("[OX2H1][#6]")
_NH2 = Chem.MolFromSmarts("[NX3;H2][#6]")
_DONOR = Chem.MolFromSmarts("[O,N;!H0]")


def _ring_systems(mol: Chem.Mol) -> int:
    systems: list[set[int]] = []
    for ring in mol.GetRingInfo().AtomRings():
        merged = set(ring)
        for s in [s for s in systems if s & merged]:
            systems.remove(s)
            merged |= s
        systems.append(merged)
    return len(systems)


def vapor_structure(mol: Chem.Mol) -> VaporStructure | None:
    """The counts for a neutral, single-fragment organic molecule; None outside that domain.

    Hand counts from the published definitions (Myrdal & Yalkowsky 1997): n-hexane has
    four non-terminal sp3 chain carbons and no ring, so tau = 4 - 1 = 3; 1-butanol has
    one OH, so HBN = sqrt(1) / M with M = 74.12 g/mol (CRC Handbook), i.e. 0.01349.

    >>> s = vapor_structure(Chem.MolFromSmiles("CCCCCC"))
    >>> s.tau, s.hbn, s.n_carbon, round(s.molar_mass, 2)
    (3.0, 0.0, 6, 86.18)
    >>> abs(vapor_structure(Chem.MolFromSmiles("CCCCO")).hbn - 1 / 74.12) < 1e-4
    True
    >>> vapor_structure(Chem.MolFromSmiles("[Na+].[Cl-]")) is None
    True
    """
    if any(a.GetAtomicNum() not in ORGANIC_ELEMENTS for a in mol.GetAtoms()):
        return None
    n_carbon = sum(1 for a in mol.GetAtoms() if a.GetAtomicNum() == 6)
    if n_carbon == 0 or Chem.GetFormalCharge(mol) != 0 or len(Chem.GetMolFrags(mol)) != 1:
        return None
    sp3 = sp2 = 0
    for atom in mol.GetAtoms():
        if atom.IsInRing() or atom.GetDegree() < 2:
            continue
        hyb = atom.GetHybridization()
        if hyb == Chem.HybridizationType.SP3:
            sp3 += 1
        elif hyb == Chem.HybridizationType.SP2:
            sp2 += 1
    n_cooh = len(mol.GetSubstructMatches(_COOH))
    n_oh = len(mol.GetSubstructMatches(_OH)) - n_cooh
    n_nh2 = len(mol.GetSubstructMatches(_NH2))
    mm = molar_mass(mol)
    return VaporStructure(
        tau=vapor.flexibility_tau(sp3, sp2, _ring_systems(mol)),
        hbn=vapor.hydrogen_bond_number(n_oh, n_cooh, n_nh2, mm),
        molar_mass=mm,
        n_carbon=n_carbon,
        h_bond_donor=mol.HasSubstructMatch(_DONOR),
    )


@lru_cache(maxsize=4096)
def vapor_structure_of(smiles: str) -> VaporStructure | None:
    mol = Chem.MolFromSmiles(smiles) if smiles else None
    return vapor_structure(mol) if mol is not None else None
