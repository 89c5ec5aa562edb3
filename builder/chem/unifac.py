"""UNIFAC activity coefficients of liquid mixtures, and the UNIFAC groups of a molecule.

Contents
--------
- :class:`Groups`: one molecule's UNIFAC subgroups and their counts.
- :func:`unifac_groups`: the subgroups of an RDKit molecule, from this module's own SMARTS
  rules (:data:`GROUP_RULES`); a molecule with atoms no rule covers gets a reason (a string)
  instead, never a partial assignment.
- :class:`UnifacMixture`: the arrays of one mixture, built once; ``gammas(T, x)`` is then fast.
- :func:`activity_coefficients`: γ_i for a mixture at T and x (uses a cached :class:`UnifacMixture`).
- :func:`missing_interactions`: the main-group pairs of a mixture with no published parameter
  (the caller then falls back to an ideal solution and says so).

Method (original UNIFAC, Fredenslund, Jones, Prausnitz 1975 [1]): ln γ_i = ln γ_i^C + ln γ_i^R.

Combinatorial part (Staverman–Guggenheim, coordination number z = 10)::

    r_i = Σ_k ν_ki R_k,  q_i = Σ_k ν_ki Q_k,  l_i = (z/2)(r_i − q_i) − (r_i − 1)
    φ_i = r_i x_i / Σ_j r_j x_j,  θ_i = q_i x_i / Σ_j q_j x_j
    ln γ_i^C = ln(φ_i/x_i) + (z/2) q_i ln(θ_i/φ_i) + l_i − (φ_i/x_i) Σ_j x_j l_j

Residual part (group activity coefficients Γ_k in the mixture and in pure i)::

    X_m = Σ_j ν_mj x_j / Σ_j Σ_n ν_nj x_j,  Θ_m = Q_m X_m / Σ_n Q_n X_n
    Ψ_mn = exp(−a_mn / T)      (a_mn between main groups, a_mm = 0)
    ln Γ_k = Q_k [1 − ln(Σ_m Θ_m Ψ_mk) − Σ_m Θ_m Ψ_km / Σ_n Θ_n Ψ_nm]
    ln γ_i^R = Σ_k ν_ki (ln Γ_k − ln Γ_k^(i))

Units: T in K, mole fractions of one; a_mn in K. Parameters (R_k, Q_k, a_mn) are the published
table of the revisions by Hansen et al. 1991 [2] and Wittig et al. 2003 [3], shipped in
``builder/data/unifac_parameters.json`` (transcribed from the ``thermo`` package by
``tools/export_unifac_parameters.py``).

Valid range: vapor–liquid equilibrium of non-electrolyte mixtures at low to moderate pressure,
about 275–425 K [2]; not for liquid–liquid equilibrium (other parameters), polymers,
electrolytes or supercritical components. Reported error: for VLE data in the Dortmund Data Bank
the original UNIFAC gives mean absolute deviations in vapor mole fraction of about 0.01–0.02 and
in bubble pressure of a few percent (from memory of the reviews in [2, 4]); dilute-solution
activity coefficients of strongly non-ideal systems (alcohols or hydrocarbons in water) can be off
by a factor of two or more.

References (DOIs from memory)
-----------------------------
1. A. Fredenslund, R. L. Jones, J. M. Prausnitz, AIChE J. 21 (1975) 1086–1099,
   doi:10.1002/aic.690210607.
2. H. K. Hansen, P. Rasmussen, A. Fredenslund, M. Schiller, J. Gmehling, Ind. Eng. Chem. Res.
   30 (1991) 2352–2355, doi:10.1021/ie00058a017.
3. R. Wittig, J. Lohmann, J. Gmehling, Ind. Eng. Chem. Res. 42 (2003) 183–188,
   doi:10.1021/ie020506l.
4. B. E. Poling, J. M. Prausnitz, J. P. O'Connell, The Properties of Gases and Liquids, 5th ed.,
   McGraw-Hill, 2001, section 8-10.

>>> from rdkit import Chem
>>> ethanol, water = unifac_groups(Chem.MolFromSmiles("CCO")), unifac_groups(Chem.MolFromSmiles("O"))
>>> ethanol.text()
'CH3, CH2, OH'
>>> [round(g, 3) for g in activity_coefficients(351.0, [0.5, 0.5], [ethanol, water])]
[1.231, 1.485]
"""
from __future__ import annotations

import json
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

import numpy as np

DATA_PATH = Path(__file__).resolve().parent.parent / "data" / "unifac_parameters.json"

Z_COORDINATION = 10.0
"""Lattice coordination number z of the combinatorial term [1]."""


@dataclass(frozen=True)
class Subgroup:
    """One UNIFAC subgroup: id, name, main group, volume R and area Q (dimensionless)."""

    id: int
    name: str
    main: int
    R: float
    Q: float


@dataclass(frozen=True)
class Parameters:
    """The parameter table: subgroups by id, main-group names, and a_mn [K] by (m, n)."""

    subgroups: dict[int, Subgroup]
    main_groups: dict[int, str]
    interactions: dict[tuple[int, int], float]


@lru_cache(maxsize=None)
def parameters(path: str | None = None) -> Parameters:
    """Read the shipped parameter table (cached).

    >>> p = parameters()
    >>> p.subgroups[1].name, p.subgroups[1].R, p.interactions[(1, 7)]
    ('CH3', 0.9011, 1318.0)
    """
    with open(path or DATA_PATH, encoding="utf-8") as handle:
        data = json.load(handle)
    subgroups = {int(s["id"]): Subgroup(int(s["id"]), s["name"], int(s["main"]), float(s["R"]), float(s["Q"]))
                 for s in data["subgroups"]}
    mains = {int(k): v for k, v in data["main_groups"].items()}
    inter = {(int(m), int(n)): float(a) for m, n, a in data["interactions"]}
    return Parameters(subgroups, mains, inter)


# --------------------------------------------------------------------------------------------
# Groups of a molecule
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Groups:
    """One molecule's UNIFAC subgroups: ``counts`` are (subgroup id, count) sorted by id;
    ``names`` the subgroup names in the same order."""

    counts: tuple[tuple[int, int], ...]
    names: tuple[str, ...]

    @classmethod
    def from_counts(cls, counts: dict[int, int]) -> "Groups":
        """Groups from {subgroup id: count}; names from the shipped table.

        >>> Groups.from_counts({2: 1, 1: 2}).text()
        '2 CH3, CH2'
        """
        subs = parameters().subgroups
        unknown = sorted(k for k in counts if k not in subs)
        if unknown:
            raise ValueError(f"unknown UNIFAC subgroup id(s) {unknown}")
        items = tuple(sorted((int(k), int(v)) for k, v in counts.items() if v))
        return cls(items, tuple(subs[k].name for k, _ in items))

    def as_dict(self) -> dict[int, int]:
        return dict(self.counts)

    def text(self) -> str:
        """Readable form, e.g. ``'2 CH3, CH2'`` (a count of one is not written)."""
        return ", ".join(name if n == 1 else f"{n} {name}" for (_, n), name in zip(self.counts, self.names))


#: The group rules, in the order they claim atoms: (subgroup id, SMARTS). Every atom of the
#: SMARTS is claimed by the subgroup except atoms written inside a recursive ``$(...)``, which
#: only state the surroundings. Larger and more specific groups come first; an atom claimed once
#: is never claimed again. Written for this project from the group definitions of [1–3].
GROUP_RULES: tuple[tuple[int, str], ...] = (
    # whole small molecules
    (16, "[OX2H2]"),                                   # water
    (15, "[CH3X4][OX2H1]"),                            # methanol
    (43, "[CX3H1](=O)[OX2H1]"),                        # formic acid
    (58, "S=C=S"),                                     # carbon disulfide
    (67, "[CH3][SX3](=O)[CH3]"),                       # dimethyl sulfoxide
    (85, "[CH3]N1[CX3](=O)[CH2][CH2][CH2]1"),          # N-methyl-2-pyrrolidone
    (72, "[CX3H1](=O)N([CH3])[CH3]"),                  # N,N-dimethylformamide
    (73, "[CX3H1](=O)N([CH2])[CH2]"),                  # N,N-diethylformamide type
    (105, "[CH2]1[CH2][OX2][CH2][CH2][NX3H1]1"),       # morpholine (N-substituted ones: CH3N, CH2, THF)
    (61, "O=[CX3H1]c1[cH][cH][cH]o1"),                 # furfural
    (62, "[OX2H1][CH2][CH2][OX2H1]"),                  # ethylene glycol
    (68, "[CH2]=[CH1]C#N"),                            # acrylonitrile
    (52, "[CX4](Cl)(Cl)(Cl)Cl"),                       # tetrachloromethane
    (50, "[CX4H1](Cl)(Cl)Cl"),                         # chloroform
    (47, "[CX4H2](Cl)Cl"),                             # dichloromethane
    # chlorofluorocarbons (main group 45), most substituted first
    (86, "[CX4](Cl)(Cl)(Cl)F"), (93, "[CX4](Cl)(Cl)(F)F"), (92, "[CX4](Cl)(F)(F)F"),
    (88, "[CX4H1](Cl)(Cl)F"), (91, "[CX4H1](Cl)(F)F"), (89, "[CX4H1](Cl)F"),
    (87, "[CX4H0](Cl)(Cl)F"), (90, "[CX4H0](Cl)(F)F"),
    # nitro compounds (charge-separated and pentavalent spellings)
    (54, "[CH3][NX3+](=O)[O-]"), (55, "[CH2][NX3+](=O)[O-]"), (56, "[CX4H1][NX3+](=O)[O-]"),
    (57, "c[NX3+](=O)[O-]"),
    (54, "[CH3][NX3](=O)=O"), (55, "[CH2][NX3](=O)=O"), (56, "[CX4H1][NX3](=O)=O"), (57, "c[NX3](=O)=O"),
    # sulfones
    (118, "[CH2][SX4](=O)(=O)[CH2]"), (119, "[CH2][SX4](=O)(=O)[CH1]"),
    # hydroxy ethers  HO-C-C-O-
    (100, "[OX2H1][CH2][CH2][OX2;$(O([CX4])[#6])]"),
    (101, "[OX2H1][CH1X4][CH2][OX2;$(O([CX4])[#6])]"),
    (101, "[OX2H1][CH2][CH1X4][OX2;$(O([CX4])[#6])]"),
    # amides: the carbonyl carbon bonded to carbon
    (97, "[CX3;$(C[#6])](=O)[NX3]([CH3])[CH3]"), (98, "[CX3;$(C[#6])](=O)[NX3]([CH3])[CH2]"),
    (99, "[CX3;$(C[#6])](=O)[NX3]([CH2])[CH2]"),
    (95, "[CX3;$(C[#6])](=O)[NX3H1][CH3]"), (96, "[CX3;$(C[#6])](=O)[NX3H1][CH2]"),
    (94, "[CX3;$(C[#6])](=O)[NX3H2]"),
    # chlorinated alkane carbons (before the oxygen groups: ClCH2-COO- is CH2Cl + COO)
    (51, "[CX4H0](Cl)(Cl)Cl"),
    (48, "[CX4H1](Cl)Cl"), (49, "[CX4H0](Cl)Cl"),
    (44, "[CX4H2]Cl"), (45, "[CX4H1]Cl"), (46, "[CX4H0]Cl"),
    # carboxylic acids, esters, formates
    (42, "[CX3;$(C[#6])](=O)[OX2H1]"),
    (21, "[CH3][CX3](=O)[OX2;$(O[#6])]"),
    (22, "[CH2][CX3](=O)[OX2;$(O[#6])]"),
    (23, "[CX3H1](=O)[OX2;$(O[#6])]"),
    (77, "[CX3;$(C[#6])](=O)[OX2;$(O[#6])]"),
    # ketones and aldehydes
    (18, "[CH3][CX3;$(C([#6])([#6])=O)]=O"),
    (19, "[CH2][CX3;$(C([#6])([#6])=O)]=O"),
    (20, "[CX3H1;$(C[#6])]=O"),
    # isocyanates
    (109, "[NX2]=C=O"),
    # nitriles
    (40, "[CH3]C#N"), (41, "[CH2]C#N"),
    # ring ether CH2-O of saturated cyclic ethers (tetrahydrofuran, 1,4-dioxane: subgroup "THF")
    (27, "[CH2;R][OX2;R;$(O([CX4;R])[CX4;R])]"),
    # ethers (oxygen between two carbons, not an ester or acid oxygen)
    (24, "[CH3X4][OX2;$(O([#6])[#6]);!$(O[#6]=O)]"),
    (25, "[CH2X4][OX2;$(O([#6])[#6]);!$(O[#6]=O)]"),
    (26, "[CH1X4][OX2;$(O([#6])[#6]);!$(O[#6]=O)]"),
    # aromatic carbon with its heteroatom substituent
    (17, "c[OX2H1]"), (36, "c[NX3H2]"), (53, "cCl"), (71, "cF"),
    # alcohols
    (14, "[OX2H1;$(O[CX4])]"),
    # amines (nitrogen bonded to carbon only; not amides, imines or nitriles)
    (28, "[CH3X4][NX3H2;!$(N[#6]=[O,S,N])]"), (29, "[CH2X4][NX3H2;!$(N[#6]=[O,S,N])]"),
    (30, "[CH1X4][NX3H2;!$(N[#6]=[O,S,N])]"),
    (31, "[CH3X4][NX3H1;$(N([#6])[#6]);!$(N[#6]=[O,S,N])]"),
    (32, "[CH2X4][NX3H1;$(N([#6])[#6]);!$(N[#6]=[O,S,N])]"),
    (33, "[CH1X4][NX3H1;$(N([#6])[#6]);!$(N[#6]=[O,S,N])]"),
    (34, "[CH3X4][NX3H0;$(N([#6])([#6])[#6]);!$(N[#6]=[O,S,N])]"),
    (35, "[CH2X4][NX3H0;$(N([#6])([#6])[#6]);!$(N[#6]=[O,S,N])]"),
    # thiols and sulfides
    (59, "[CH3X4][SX2H1]"), (60, "[CH2X4][SX2H1]"),
    (102, "[CH3X4][SX2;$(S([#6])[#6])]"), (103, "[CH2X4][SX2;$(S([#6])[#6])]"),
    (104, "[CH1X4][SX2;$(S([#6])[#6])]"),
    # aromatic carbon with an alkyl carbon (after the groups that own such a carbon with a heteroatom)
    (11, "c[CH3X4]"), (12, "c[CH2X4]"), (13, "c[CH1X4]"),
    (69, "[Cl;$(Cl[CX3]=[CX3])]"),
    # perfluoro carbons
    (74, "[CX4H0](F)(F)F"), (75, "[CX4H0](F)F"), (76, "[CX4H0]F"),
    # bromine, iodine atoms
    (64, "[Br]"), (63, "[I]"),
    # siloxanes and silanes
    (82, "[SiX4H2][OX2;$(O[Si])]"), (83, "[SiX4H1][OX2;$(O[Si])]"), (84, "[SiX4H0][OX2;$(O[Si])]"),
    (78, "[SiX4H3]"), (79, "[SiX4H2]"), (80, "[SiX4H1]"), (81, "[SiX4H0]"),
    # alkenes and alkynes
    (5, "[CX3H2]=[CX3H1]"), (6, "[CX3H1]=[CX3H1]"), (7, "[CX3H2]=[CX3H0]"),
    (8, "[CX3H1]=[CX3H0]"), (70, "[CX3H0]=[CX3H0]"),
    (65, "[CX2H1]#[CX2]"), (66, "[CX2H0]#[CX2H0]"),
    # aromatic carbons left
    (9, "[cH1]"), (10, "[cH0]"),
    # alkane carbons
    (1, "[CX4H3]"), (2, "[CX4H2]"), (3, "[CX4H1]"), (4, "[CX4H0]"),
)

#: Rings whose subgroup depends on how many hydrogens the ring carries: SMARTS → {H: subgroup}.
RING_RULES: tuple[tuple[str, dict[int, int]], ...] = (
    ("[nX2]1ccccc1", {5: 37, 4: 38, 3: 39}),          # pyridines
    ("s1cccc1", {4: 106, 3: 107, 2: 108}),            # thiophenes
)


def _claimed_atoms(pattern) -> list[int]:
    """Indices (in the pattern) of the atoms a match claims: all of them (recursive SMARTS
    context lives inside a single atom's query, so every pattern atom is claimed)."""
    return list(range(pattern.GetNumAtoms()))


@lru_cache(maxsize=None)
def _compiled_rules():
    from rdkit import Chem

    rings = []
    for smarts, table in RING_RULES:
        patt = Chem.MolFromSmarts(smarts)
        if patt is None:  # pragma: no cover - a typo in the table
            raise ValueError(f"bad SMARTS {smarts!r}")
        rings.append((patt, table))
    rules = []
    for sid, smarts in GROUP_RULES:
        patt = Chem.MolFromSmarts(smarts)
        if patt is None:  # pragma: no cover
            raise ValueError(f"bad SMARTS {smarts!r} for subgroup {sid}")
        rules.append((sid, patt))
    return tuple(rings), tuple(rules)


def unifac_groups(mol) -> Groups | str:
    """The UNIFAC subgroups of an RDKit molecule, or a reason why there are none.

    Greedy assignment with :data:`RING_RULES` then :data:`GROUP_RULES`, in order: each match
    whose atoms are all still free claims them. Every heavy atom must end in exactly one
    subgroup; otherwise the answer is a string naming the atoms left over (charged or radical
    species, and elements or functions the table has no group for).

    >>> from rdkit import Chem
    >>> unifac_groups(Chem.MolFromSmiles("CC(=O)OCC")).text()
    'CH3, CH2, CH3COO'
    >>> unifac_groups(Chem.MolFromSmiles("Cc1ccccn1")).text()
    'CH3, C5H4N'
    >>> unifac_groups(Chem.MolFromSmiles("CCS(=O)(=O)N"))
    'no UNIFAC group for atoms 2, 3, 4, 5 (S, O, O, N)'
    """
    from rdkit import Chem

    if mol is None:
        return "no structure"
    mol = Chem.RemoveHs(mol)
    if mol.GetNumAtoms() == 0:
        return "no heavy atoms"
    for atom in mol.GetAtoms():
        if atom.GetNumRadicalElectrons():
            return f"radical at atom {atom.GetIdx()} ({atom.GetSymbol()}); UNIFAC covers closed-shell molecules"
    if len(Chem.GetMolFrags(mol)) > 1:
        return "more than one molecule (a salt or a mixture); UNIFAC groups are for one neutral molecule"
    if Chem.GetFormalCharge(mol) != 0:
        return "charged species; UNIFAC (this version) covers neutral molecules"
    rings, rules = _compiled_rules()
    free = [True] * mol.GetNumAtoms()
    counts: dict[int, int] = {}

    def claim(atoms) -> bool:
        if all(free[a] for a in atoms):
            for a in atoms:
                free[a] = False
            return True
        return False

    for patt, table in rings:
        for match in mol.GetSubstructMatches(patt, uniquify=True):
            n_h = sum(mol.GetAtomWithIdx(a).GetTotalNumHs() for a in match)
            sid = table.get(n_h)
            if sid is not None and claim(match):
                counts[sid] = counts.get(sid, 0) + 1
    for sid, patt in rules:
        for match in mol.GetSubstructMatches(patt, uniquify=True, maxMatches=10000):
            if claim(match):
                counts[sid] = counts.get(sid, 0) + 1
    left = [i for i, f in enumerate(free) if f]
    if left:
        symbols = ", ".join(mol.GetAtomWithIdx(i).GetSymbol() for i in left)
        return f"no UNIFAC group for atom{'s' if len(left) > 1 else ''} {', '.join(map(str, left))} ({symbols})"
    return Groups.from_counts(counts)


# --------------------------------------------------------------------------------------------
# Activity coefficients
# --------------------------------------------------------------------------------------------

class MissingInteractionParameters(ValueError):
    """The table has no a_mn for some main-group pairs of the mixture (``pairs``)."""

    def __init__(self, pairs: list[tuple[int, int]]) -> None:
        names = parameters().main_groups
        text = ", ".join(f"{names.get(m, m)}/{names.get(n, n)}" for m, n in pairs)
        super().__init__(f"no UNIFAC interaction parameters for main groups {text}")
        self.pairs = pairs


def missing_interactions(groups: Sequence[Groups]) -> list[tuple[int, int]]:
    """Main-group pairs (m < n) present in the mixture that have no published a_mn or a_nm.

    An empty list means :func:`activity_coefficients` can be used; otherwise the caller should
    fall back to an ideal solution (γ = 1) and say so.

    >>> from rdkit import Chem
    >>> g = [unifac_groups(Chem.MolFromSmiles(s)) for s in ("O", "ClC=C(Cl)Cl")]
    >>> missing_interactions(g)  # water / chlorine on a double bond
    [(7, 37)]
    """
    p = parameters()
    mains = sorted({p.subgroups[sid].main for g in groups for sid, _ in g.counts})
    missing = []
    for i, m in enumerate(mains):
        for n in mains[i + 1:]:
            if (m, n) not in p.interactions or (n, m) not in p.interactions:
                missing.append((m, n))
    return missing


class UnifacMixture:
    """The arrays of one mixture, computed once; :meth:`gammas` evaluates γ(T, x).

    ``groups``: one :class:`Groups` per component. Raises :class:`MissingInteractionParameters`
    when a main-group pair has no parameter (see :func:`missing_interactions`).

    >>> from rdkit import Chem
    >>> mix = UnifacMixture([unifac_groups(Chem.MolFromSmiles(s)) for s in ("CC(C)=O", "ClC(Cl)Cl")])
    >>> [round(g, 3) for g in mix.gammas(330.0, [0.4, 0.6])]  # thermo 0.6.1 gives the same
    [0.769, 0.877]
    """

    def __init__(self, groups: Sequence[Groups]) -> None:
        p = parameters()
        missing = missing_interactions(groups)
        if missing:
            raise MissingInteractionParameters(missing)
        sub_ids = sorted({sid for g in groups for sid, _ in g.counts})
        col = {sid: k for k, sid in enumerate(sub_ids)}
        nu = np.zeros((len(groups), len(sub_ids)))
        for i, g in enumerate(groups):
            for sid, n in g.counts:
                nu[i, col[sid]] = n
        self.n = len(groups)
        self.nu = nu
        R = np.array([p.subgroups[s].R for s in sub_ids])
        self.Qk = np.array([p.subgroups[s].Q for s in sub_ids])
        mains = [p.subgroups[s].main for s in sub_ids]
        a = np.zeros((len(sub_ids), len(sub_ids)))
        for k, mk in enumerate(mains):
            for l, ml in enumerate(mains):
                if mk != ml:
                    a[k, l] = p.interactions[(mk, ml)]
        self.a = a
        self.r = nu @ R
        self.q = nu @ self.Qk
        self.l = (Z_COORDINATION / 2.0) * (self.r - self.q) - (self.r - 1.0)
        # pure-component group fractions Θ_m^(i), one row per component
        X_pure = nu / nu.sum(axis=1, keepdims=True)
        self._theta_pure = (X_pure * self.Qk) / (X_pure @ self.Qk)[:, None]
        self._lnG_pure_T: float | None = None
        self._lnG_pure = np.zeros_like(nu)

    def _ln_group_gammas(self, theta: np.ndarray, psi: np.ndarray) -> np.ndarray:
        """ln Γ_k for rows of group area fractions ``theta`` (shape c × g)."""
        s = theta @ psi                     # s[c, k] = Σ_m Θ_m Ψ_mk
        return self.Qk * (1.0 - np.log(s) - (theta / s) @ psi.T)

    def ln_gammas(self, T: float, x: Sequence[float]) -> np.ndarray:
        """ln γ_i at T [K] and mole fractions x (normalised here)."""
        x = np.asarray(x, dtype=float)
        x = x / x.sum()
        psi = np.exp(-self.a / T)
        if self._lnG_pure_T != T:
            self._lnG_pure = self._ln_group_gammas(self._theta_pure, psi)
            self._lnG_pure_T = T
        # combinatorial; the limit x_i → 0 is finite, so evaluate with the ratios φ/x, θ/φ directly
        rx, qx = self.r @ x, self.q @ x
        phi_x = self.r / rx                 # φ_i / x_i
        theta_phi = (self.q / qx) / phi_x   # θ_i / φ_i
        ln_c = (np.log(phi_x) + (Z_COORDINATION / 2.0) * self.q * np.log(theta_phi)
                + self.l - phi_x * (x @ self.l))
        # residual
        X = x @ self.nu
        X = X / X.sum()
        theta = (X * self.Qk) / (X @ self.Qk)
        lnG = self._ln_group_gammas(theta[None, :], psi)[0]
        ln_r = (self.nu * (lnG - self._lnG_pure)).sum(axis=1)
        return ln_c + ln_r

    def gammas(self, T: float, x: Sequence[float]) -> list[float]:
        """γ_i at T [K] and mole fractions x."""
        return np.exp(self.ln_gammas(T, x)).tolist()

    __call__ = gammas


@lru_cache(maxsize=256)
def _mixture(groups: tuple[Groups, ...]) -> UnifacMixture:
    return UnifacMixture(groups)


def mixture(groups: Sequence[Groups]) -> UnifacMixture:
    """A cached :class:`UnifacMixture` for these groups."""
    return _mixture(tuple(groups))


def activity_coefficients(T: float, x: Sequence[float], groups: Sequence[Groups]) -> list[float]:
    """Original UNIFAC activity coefficients γ_i (dimensionless) at T [K] and mole fractions x.

    Equations, valid range, reported error and references: see the module docstring
    (Fredenslund et al. 1975; parameters of Hansen et al. 1991 and Wittig et al. 2003).
    Raises :class:`MissingInteractionParameters` when a pair of main groups has no parameter.

    >>> from rdkit import Chem
    >>> g = [unifac_groups(Chem.MolFromSmiles(s)) for s in ("CCCCCC", "CCCCCCC")]
    >>> [round(v, 4) for v in activity_coefficients(350.0, [0.5, 0.5], g)]
    [0.9977, 0.9979]
    """
    if len(x) != len(groups):
        raise ValueError(f"{len(x)} mole fractions for {len(groups)} components")
    if any(v < 0 for v in x) or sum(x) <= 0:
        raise ValueError("mole fractions must be non-negative and not all zero")
    if not T > 0:
        raise ValueError(f"temperature must be positive, got {T}")
    return mixture(groups).gammas(T, x)
