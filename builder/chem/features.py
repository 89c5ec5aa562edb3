"""Structural features behind the force classification: hydrogen-bond donors and acceptors,
ionic character, polar bonds and fragments.

Contents: ``hbond_donors``, ``hbond_acceptors``, ``acceptor_atoms``, ``donor_groups``,
``ionic_kind``, ``polar_bonds``, ``largest_fragment``.

Rules (common practice): a donor is an H on N, O or F; an acceptor is an N, O or F lone pair
(amide, thioamide, sulfonamide and pyrrole-type N excluded; cationic N has none); a bond is
polar when the Pauling electronegativities differ by 0.4 or more, and mainly ionic when an
s-block metal is bonded to an atom at least 1.7 more electronegative.

Reference: Pauling, L. The Nature of the Chemical Bond, 3rd ed.; Cornell University Press,
1960 (electronegativity scale; values below from memory).
"""

from __future__ import annotations

from rdkit import Chem

_DONOR = Chem.MolFromSmarts("[#7,#8,#9;!H0]")
_ACCEPTORS = {
    "O": Chem.MolFromSmarts("[#8;+0,-1]"),
    "F": Chem.MolFromSmarts("[#9;+0,-1]"),
    "N": Chem.MolFromSmarts(
        "[#7;+0,-1;!$([nX3]);!$([NX3]-[CX3]=[OX1,SX1]);!$([NX3]-[SX4](=O)=O)]"
    ),
}
_PAULING = {  # Pauling electronegativities (Pauling 1960; values from memory)
    "H": 2.20, "Li": 0.98, "Be": 1.57, "B": 2.04, "C": 2.55, "N": 3.04, "O": 3.44,
    "F": 3.98, "Na": 0.93, "Mg": 1.31, "Al": 1.61, "Si": 1.90, "P": 2.19, "S": 2.58,
    "Cl": 3.16, "K": 0.82, "Ca": 1.00, "Se": 2.55, "Br": 2.96, "Rb": 0.82, "Sr": 0.95,
    "I": 2.66, "Cs": 0.79, "Ba": 0.89,
}
_S_BLOCK_METALS = {"Li", "Na", "K", "Rb", "Cs", "Be", "Mg", "Ca", "Sr", "Ba"}
_POLAR_BOND_EN = 0.4  # common practice: electronegativity difference of a polar bond
_IONIC_BOND_EN = 1.7  # common practice: above this a bond is mostly ionic


def hbond_donors(mol: Chem.Mol) -> int:
    """Count hydrogens bonded to N, O or F (exact, own SMARTS).

    Acetic acid has one O-H donor; water two (common practice):

    >>> hbond_donors(Chem.MolFromSmiles("CC(=O)O")), hbond_donors(Chem.MolFromSmiles("O"))
    (1, 2)
    """
    return sum(mol.GetAtomWithIdx(m[0]).GetTotalNumHs() for m in mol.GetSubstructMatches(_DONOR))


def hbond_acceptors(mol: Chem.Mol) -> int:
    """Count N, O and F atoms with a lone pair free to accept an H-bond (own SMARTS).

    Every neutral or anionic O and F counts. N counts unless its lone pair is part of
    an aromatic ring (pyrrole-type) or delocalised into C=O, C=S or SO2 (amides,
    thioamides, sulfonamides); cationic N (ammonium, nitro) has none.

    Acetic acid: both oxygens accept; pyrrole's ring N does not; pyridine's does
    (common practice):

    >>> [hbond_acceptors(Chem.MolFromSmiles(s)) for s in ("CC(=O)O", "c1cc[nH]c1", "c1ccncc1")]
    [2, 0, 1]
    """
    return sum(len(mol.GetSubstructMatches(q)) for q in _ACCEPTORS.values())


def acceptor_atoms(mol: Chem.Mol) -> dict[str, int]:
    counts = {el: len(mol.GetSubstructMatches(q)) for el, q in _ACCEPTORS.items()}
    return {el: n for el, n in counts.items() if n}


def donor_groups(mol: Chem.Mol) -> dict[str, int]:
    groups: dict[str, int] = {}
    for (idx,) in mol.GetSubstructMatches(_DONOR):
        atom = mol.GetAtomWithIdx(idx)
        label = f"{atom.GetSymbol()}–H"
        groups[label] = groups.get(label, 0) + atom.GetTotalNumHs()
    return groups


def ionic_kind(mol: Chem.Mol) -> tuple[str, tuple[str, ...]] | None:
    """Why the substance is ionic, as a code and its details, or None (rules in the module docstring):
    ``("salt", ions)``, ``("ion", (ion,))``, ``("zwitterion", ())`` or ``("s-block-bond", (a, b))``.

    >>> ionic_kind(Chem.MolFromSmiles("[Na+].[Cl-]"))
    ('salt', ('Cl−', 'Na+'))
    >>> ionic_kind(Chem.MolFromSmiles("CCO")) is None
    True
    """
    fragments = Chem.GetMolFrags(mol, asMols=True)
    charged = tuple(sorted({_ion_label(f) for f in fragments if Chem.GetFormalCharge(f) != 0}))
    if charged and len(fragments) > 1:
        return "salt", charged
    if charged:
        return "ion", charged[:1]
    for frag in fragments:
        plus = [a.GetIdx() for a in frag.GetAtoms() if a.GetFormalCharge() > 0]
        minus = [a.GetIdx() for a in frag.GetAtoms() if a.GetFormalCharge() < 0]
        distances = Chem.GetDistanceMatrix(frag) if plus and minus else None
        if distances is not None and min(distances[i][j] for i in plus for j in minus) >= 3:
            return "zwitterion", ()
    for bond in mol.GetBonds():
        a, b = bond.GetBeginAtom().GetSymbol(), bond.GetEndAtom().GetSymbol()
        if {a, b} & _S_BLOCK_METALS and a in _PAULING and b in _PAULING \
                and abs(_PAULING[a] - _PAULING[b]) >= _IONIC_BOND_EN:
            return "s-block-bond", (a, b)
    return None


def _ion_label(fragment: Chem.Mol) -> str:
    if fragment.GetNumAtoms() > 1:
        return Chem.MolToSmiles(fragment)
    charge = Chem.GetFormalCharge(fragment)
    magnitude = str(abs(charge)) if abs(charge) > 1 else ""
    return f"{fragment.GetAtomWithIdx(0).GetSymbol()}{magnitude}{'+' if charge > 0 else '−'}"


def polar_bonds(mol: Chem.Mol) -> list[str]:
    labels = []
    for bond in mol.GetBonds():
        a, b = bond.GetBeginAtom().GetSymbol(), bond.GetEndAtom().GetSymbol()
        if a in _PAULING and b in _PAULING and abs(_PAULING[a] - _PAULING[b]) >= _POLAR_BOND_EN:
            first, second = sorted((a, b), key=lambda s: _PAULING[s])
            symbol = {Chem.BondType.DOUBLE: "=", Chem.BondType.TRIPLE: "≡"}.get(bond.GetBondType(), "–")
            label = f"{first}{symbol}{second}"
            if label not in labels:
                labels.append(label)
    for atom in mol.GetAtoms():
        if atom.GetSymbol() in ("N", "O", "F") and atom.GetTotalNumHs():
            label = f"{atom.GetSymbol()}–H"
            if label not in labels:
                labels.append(label)
    return labels


def largest_fragment(mol: Chem.Mol) -> Chem.Mol:
    fragments = Chem.GetMolFrags(mol, asMols=True)
    return max(fragments, key=lambda f: (f.GetNumHeavyAtoms(), f.GetNumAtoms()))


RING_RELATIONS = ("1,2", "1,3", "1,4", "1,3+")
"""Ring relations told apart by :func:`ring_cis_trans_pairs`: neighbours in any ring ("1,2");
ring distance 2 and 3 in a six-membered ring ("1,3", "1,4"), where the chair fixes which
relation puts both substituents equatorial; ring distance 2 or more in any other ring
("1,3+")."""

_RING_CONFIGURATION_MAX_SIZE = 8
"""Largest ring whose faces :func:`ring_cis_trans_pairs` compares (larger rings fold)."""


def ring_cis_trans_pairs(mol: Chem.Mol) -> list[tuple[int, int, str, bool]]:
    """Relative configuration of the specified ring stereocentres that carry one hydrogen.

    Returns ``(i, j, relation, cis)`` for every two such centres that share a ring of at
    most eight atoms: ``relation`` is one of ``RING_RELATIONS`` (from the ring distance in
    the smallest shared ring and its size) and ``cis`` is True when their hydrogens lie on the same
    face, i.e. when their substituents do (a ring-fusion atom's hydrogen stands for the
    fusion, so cis-decalin is cis).  Read from the chiral tags alone, without coordinates:
    walking round the ring in one direction, a centre's hydrogen is on the face whose
    handedness (hydrogen, previous ring atom, next ring atom) it has, so two centres are
    cis when the handedness agrees.  Mirror images give the same answer; centres whose
    stereo is unspecified, or without exactly one hydrogen, are left out.

    cis- and trans-1,2-dimethylcyclohexane and trans-1,4-dimethylcyclohexane (common
    practice):

    >>> [ring_cis_trans_pairs(Chem.MolFromSmiles(s))[0][2:] for s in
    ...  ("C[C@@H]1CCCC[C@@H]1C", "C[C@@H]1CCCC[C@H]1C", "C[C@H]1CC[C@H](C)CC1")]
    [('1,2', True), ('1,2', False), ('1,4', False)]
    """
    work = Chem.AddHs(mol)
    centres = []
    for info in Chem.FindPotentialStereo(work):
        if info.type != Chem.StereoType.Atom_Tetrahedral or info.specified != Chem.StereoSpecified.Specified:
            continue
        atom = work.GetAtomWithIdx(info.centeredOn)
        if atom.GetDegree() == 4 and atom.GetTotalNumHs(includeNeighbors=True) == 1 and atom.IsInRing():
            centres.append(info.centeredOn)
    if len(centres) < 2:
        return []
    rings = sorted(work.GetRingInfo().AtomRings(), key=len)
    pairs = []
    for a, first in enumerate(centres):
        for second in centres[a + 1:]:
            ring = next((r for r in rings if first in r and second in r), None)
            if ring is None or len(ring) > _RING_CONFIGURATION_MAX_SIZE:
                continue
            i, j = ring.index(first), ring.index(second)
            distance = min(abs(i - j), len(ring) - abs(i - j))
            cis = _ring_face(work, ring, i) == _ring_face(work, ring, j)
            relation = "1,2" if distance == 1 else ("1,3" if distance == 2 else "1,4") if len(ring) == 6 else "1,3+"
            pairs.append((min(first, second), max(first, second), relation, cis))
    return pairs


def _ring_face(mol: Chem.Mol, ring: tuple[int, ...], position: int) -> int:
    """+1 or -1: the handedness of (hydrogen, previous, next ring atom) at ``ring[position]``."""
    centre = mol.GetAtomWithIdx(ring[position])
    before, after = ring[position - 1], ring[(position + 1) % len(ring)]
    hydrogen = next(n.GetIdx() for n in centre.GetNeighbors() if n.GetAtomicNum() == 1)
    order = [bond.GetOtherAtomIdx(centre.GetIdx()) for bond in centre.GetBonds()]
    rest = [n for n in order if n not in (hydrogen, before, after)]
    wanted = [order.index(n) for n in (hydrogen, before, after, *rest)]
    inversions = sum(1 for x in range(4) for y in range(x + 1, 4) if wanted[x] > wanted[y])
    sign = 1 if centre.GetChiralTag() == Chem.ChiralType.CHI_TETRAHEDRAL_CCW else -1
    return sign if inversions % 2 == 0 else -sign


def ring_cis_trans_counts(mol: Chem.Mol) -> list[float]:
    """Numbers of cis and of trans centre pairs per ring relation (:func:`ring_cis_trans_pairs`),
    in the order of ``RING_RELATIONS``, cis before trans.

    >>> ring_cis_trans_counts(Chem.MolFromSmiles("C1CC[C@H]2CCCC[C@@H]2C1"))  # trans-decalin
    [0.0, 1.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0]
    """
    counts = [0.0] * (2 * len(RING_RELATIONS))
    for _, _, relation, cis in ring_cis_trans_pairs(mol):
        counts[2 * RING_RELATIONS.index(relation) + (0 if cis else 1)] += 1.0
    return counts
