"""Cross-links between entries, computed from the derived catalog; each says why it is there.

Relations:

- ``isomer``: same molecular formula (reciprocal);
- ``homologue``: same structure class and formulas differing by whole CH2 units (reciprocal);
  the structure class is the ring count, the count of each functional group in
  ``FUNCTIONAL_GROUPS``, the heteroatom counts and the number of branch points;
- ``contrast``: molar mass within ``CONTRAST_MASS_RATIO`` of each other but a different
  dominant force (reciprocal) — the boiling points are shown side by side;
- ``near-bp``: the ``NEAR_BP_COUNT`` entries with the nearest boiling points (not reciprocal).
"""
from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from functools import lru_cache

from rdkit import Chem

from builder.chem.identity import formula_counts
from builder.core.units import celsius_text
from builder.derive.entry import Derived

CONTRAST_MASS_RATIO = 0.10
NEAR_BP_COUNT = 3

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


@dataclass(frozen=True)
class Link:
    """A link from one entry to another, with the relation and a sentence saying why."""

    relation: str
    target: str  # entry id
    why: str


@lru_cache(maxsize=4096)
def structure_class(smiles: str) -> tuple:
    """A key shared by members of one homologous series."""
    mol = Chem.MolFromSmiles(smiles)
    groups = tuple(len(mol.GetSubstructMatches(Chem.MolFromSmarts(s))) for s in FUNCTIONAL_GROUPS.values())
    hetero = tuple(sorted(Counter(a.GetSymbol() for a in mol.GetAtoms() if a.GetSymbol() not in ("C", "H")).items()))
    branches = sum(1 for a in mol.GetAtoms() if a.GetSymbol() == "C" and a.GetDegree() >= 3 and not a.GetIsAromatic())
    return (mol.GetRingInfo().NumRings(), groups, hetero, branches)


def ch2_difference(formula_a: str, formula_b: str) -> int | None:
    """n when formula_b = formula_a + n·CH2 (n may be negative), else None."""
    a, b = formula_counts(formula_a)[0], formula_counts(formula_b)[0]
    diff = {el: b.get(el, 0) - a.get(el, 0) for el in set(a) | set(b)}
    n = diff.get("C", 0)
    if n == 0 or diff.get("H", 0) != 2 * n or any(v for el, v in diff.items() if el not in ("C", "H")):
        return None
    return n


def _bp(d: Derived) -> float | None:
    v = d.get("boiling_point")
    return v.value if v is not None else None


def _force(d: Derived) -> str | None:
    lab = d.label("dominant_force")
    return lab.code if lab is not None else None


def _celsius(kelvin: float) -> str:
    return celsius_text(kelvin, 0)


def cross_links(derived: tuple[Derived, ...]) -> dict[str, tuple[Link, ...]]:
    """Every entry's links, in a stable order (relation, then target id)."""
    links: dict[str, list[Link]] = {d.entry.id: [] for d in derived}
    molecules = [d for d in derived if d.identity is not None and d.identity.fragments == 1]
    for i, a in enumerate(molecules):
        for b in molecules[i + 1:]:
            for x, y in ((a, b), (b, a)):
                link = _pair_link(x, y)
                if link:
                    links[x.entry.id].extend(link)
    with_bp = [d for d in derived if _bp(d) is not None]
    for d in with_bp:
        others = sorted((abs(_bp(o) - _bp(d)), o.entry.id, o) for o in with_bp if o is not d)
        for _, oid, o in others[:NEAR_BP_COUNT]:
            links[d.entry.id].append(Link("near-bp", oid, f"boils at {_celsius(_bp(o))}, near this "
                                                           f"material's {_celsius(_bp(d))}"))
    order = {"isomer": 0, "homologue": 1, "contrast": 2, "near-bp": 3}
    return {k: tuple(sorted(v, key=lambda l: (order[l.relation], l.target))) for k, v in links.items()}


def _pair_link(a: Derived, b: Derived) -> list[Link]:
    out = []
    fa, fb = a.identity.formula, b.identity.formula
    if fa == fb:
        out.append(Link("isomer", b.entry.id, f"same formula {fa}"))
    n = ch2_difference(fa, fb)
    if n is not None and structure_class(a.identity.smiles) == structure_class(b.identity.smiles):
        more = "more" if n > 0 else "fewer"
        out.append(Link("homologue", b.entry.id, f"same structure class, {abs(n)} CH2 unit{'s' if abs(n) > 1 else ''} "
                                                  f"{more}"))
    ma, mb = a.identity.molar_mass, b.identity.molar_mass
    fa_force, fb_force = _force(a), _force(b)
    if (abs(ma - mb) <= CONTRAST_MASS_RATIO * max(ma, mb) and fa_force and fb_force and fa_force != fb_force):
        bp_a, bp_b = _bp(a), _bp(b)
        bps = (f"; boils at {_celsius(bp_b)} against {_celsius(bp_a)}" if bp_a is not None and bp_b is not None else "")
        out.append(Link("contrast", b.entry.id, f"similar molar mass ({mb:.0f} against {ma:.0f} g/mol) "
                                                f"but held together mainly by {fb_force}{bps}"))
    return out


def homologous_series(derived: tuple[Derived, ...], minimum: int = 3) -> list[list[Derived]]:
    """Groups of ``minimum`` or more entries of one structure class linked by CH2 steps, by size."""
    groups: dict[tuple, list[Derived]] = {}
    for d in derived:
        if d.identity is None or d.identity.fragments != 1:
            continue
        groups.setdefault(structure_class(d.identity.smiles), []).append(d)
    series = []
    for members in groups.values():
        members = sorted(members, key=lambda d: (d.identity.molar_mass, d.entry.id))
        base = members[0].identity.formula
        chain = [members[0]] + [m for m in members[1:] if ch2_difference(base, m.identity.formula)]
        if len(chain) >= minimum:
            series.append(chain)
    return sorted(series, key=lambda s: s[0].entry.id)
