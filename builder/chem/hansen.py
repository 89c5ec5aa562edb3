"""Hansen solubility parameters (δD, δP, δH in MPa^½) estimated from structure.

Contents
--------
- ``GroupHansen``: the group-method result (δD, δP, δH, molar volume, molar refraction, the
  two energy sums, the group counts and what the tables lack).
- ``mathieu_hansen(mol)``: the published group method alone.
- ``HansenEstimate``: the default estimate with standard uncertainties and 90 % intervals.
- ``estimate_hansen(mol_or_smiles)``: group method + fitted trees (the default).
- ``hansen_row(mol, environments)``: the feature vector of the trees, shared with
  ``builder.fitting.hansen`` so that fit and runtime cannot drift.
- ``cohesive_energy_split(delta_d, delta_p, delta_h)``: shares of the cohesive energy.

The group method (Mathieu 2018 [1]_)
------------------------------------
Atom increments give the liquid molar volume V and the molar refraction R
(``builder.chem.liquid_density``); then, V and R in cm³/mol, energies in J/mol:

    δD = √(93.8 + (2016 + 75044/V)·(R/V)²)
    δP = √(E_P / V),   E_P = Σ polar increments (groups, polar multiple bonds, heteroatoms)
    δH = √(E_H / V),   E_H = Σ hydrogen-bond increments (per H on C, N, O; per N, O, halogen)

The tables are data (``builder/data/hansen_groups.yaml``), read from the paper's supporting
script; the group rules are reimplemented here with our own SMARTS and follow what that script
computes (every match of a structural group counts, and heteroatoms are counted even when a
group holds them).  Polar keys the table lacks (a C~N aromatic bond, bromine, sulfur) make the
published method undefined; ``mathieu_hansen`` then reports them in ``unknown`` and gives the
sum over the keys it has, which is what the fitted model starts from.  We have not read the
paper's error figures.  Measured here on the held-out fifth (216 compounds inside its tables),
MAE δD/δP/δH 0.72/2.14/1.54 MPa^½ (``builder/data/hansen_validation.json``).

The fitted model
----------------
Gradient-boosted regression trees [2]_ on the group counts, the group estimate itself, the
estimated boiling point and dipole moment, RDKit descriptors and radius-1 atom environments (the
boiling-point model's features, ``builder.chem.boiling``).  Each component has one or two
ensembles ("members"): a residual member predicts the measured value minus the group estimate,
a value member the measured value itself; the estimate is the mean of the component's members,
clipped at zero.  δD and δH average one of each, δP uses a value member alone (the group δP is
the weakest of the three, MAE 2.14 MPa^½, and anchoring on it cost accuracy in
cross-validation; ``builder.fitting.hansen.MEMBERS``):

    δX = (1/M) Σ_m [a_m δX,group + Σ_t f_X,m,t(x)],   a_m = 1 (residual) or 0 (value)

Trees and uncertainty table live in ``builder/data/hansen_model.json`` written by
``python -m builder.fitting.hansen``; they are evaluated in plain Python.

Training data and which source is trusted
-----------------------------------------
The four sets shipped in ``chemicals.solubility`` (Manuel & Ruben 2022, Alshehri et al.,
HSPiPy, Schrier) overlap heavily and mostly agree; where they do not, Manuel & Ruben is the odd
one out: against Alshehri 112 of 814 shared compounds differ by more than 1 MPa^½ in some
component, while Alshehri agrees closely with the two smaller sets (mean absolute differences
0.05/0.33/0.23 against HSPiPy, 0.14/0.21/0.15 against Schrier; chloromethane δP is 9.9 in
Manuel & Ruben and 6.1 in the three others).  So, per compound: with three or more sets, the
median of each component; otherwise the first set in the order Alshehri, HSPiPy, Schrier,
Manuel & Ruben.  A component ten times another set's value is taken as a decimal slip (methyl
methacrylate δH 54.0 in HSPiPy, 5.4 elsewhere).  Compounds listed by exactly two sets that
differ by more than 1.5 MPa^½ are left out of training (no third set says which is right) but
kept in the held-out table.  Rules and counts: ``builder.fitting.hansen``.

Valid range: neutral organic molecules of H, C, N, O, S, F, Cl, Br, I (the boiling-point
model's domain).  Training values span δD 12-25, δP 0-30, δH 0-43 MPa^½ at 25 °C.

References
----------
.. [1] D. Mathieu, ACS Omega 3 (2018) 17049-17056, "Pencil and Paper Estimation of Hansen
   Solubility Parameters" (DOI 10.1021/acsomega.8b02601, from memory).
.. [2] J. H. Friedman, Ann. Stat. 29 (2001) 1189, doi:10.1214/aos/1013203451.
.. [3] C. M. Hansen, Hansen Solubility Parameters: A User's Handbook, 2nd ed., CRC Press (2007)
   (definitions δ² = δD² + δP² + δH²).
"""
from __future__ import annotations

import json
import math
from collections import Counter
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any

from rdkit import Chem

from builder.chem.boiling import TreeModel, check_structure, descriptor_row, tree_estimate
from builder.chem.constants import T_ZERO_CELSIUS, R
from builder.chem.dipole import dipole_moment
from builder.chem.liquid_density import atom_code, increments, ring_codes

MODEL_PATH = Path(__file__).resolve().parent.parent / "data" / "hansen_model.json"
COMPONENTS = ("delta_d", "delta_p", "delta_h")
METHODS = ("mathieu_trees", "mathieu-2018")
K90 = 1.645

# Structural polar groups, in the order they are looked for; the first index is the group atom.
_POLAR_GROUPS = (
    ("COOH", "[CX3](=O)[OX2H1]"),
    ("NitroOnC", "[#6][$([NX3](=O)=O),$([NX3+](=O)[O-])]"),
    ("Carbonate", "[OX2;R][CX3;R](=O)[OX2]"),
    ("Ester", "[OX2][CX3]=O"),
    ("COinAmide", "[NX3][CX3](=[OX1])[#6]"),
    ("SO2", "O=S=O"),
)
_AMIDE_N = Chem.MolFromSmarts("[NX3][CX3](=[OX1])[#6]")
_ACID_OH = Chem.MolFromSmarts("[CX3](=O)[OX2H1]")
_BOND_MARK = {Chem.BondType.DOUBLE: "=", Chem.BondType.TRIPLE: "#", Chem.BondType.AROMATIC: "~"}


@lru_cache(maxsize=1)
def _patterns() -> tuple[tuple[str, Chem.Mol], ...]:
    return tuple((name, Chem.MolFromSmarts(smarts)) for name, smarts in _POLAR_GROUPS)


@dataclass(frozen=True)
class GroupHansen:
    """Result of the group method; δ in MPa^½, V and R in cm³/mol, energies in J/mol.

    ``complete`` is True when every atom has a volume increment and every polar key an
    increment, i.e. when the published method is defined; otherwise the δ values are the sums
    over what the tables hold (``unknown`` lists the rest) and serve only as a base.
    """

    delta_d: float | None
    delta_p: float | None
    delta_h: float | None
    volume_cm3: float
    refraction_cm3: float
    polar_energy: float
    hbond_energy: float
    polar_counts: dict[str, int] = field(default_factory=dict)
    hbond_counts: dict[str, int] = field(default_factory=dict)
    unknown: tuple[str, ...] = ()

    @property
    def complete(self) -> bool:
        return not self.unknown and self.delta_d is not None


def _is_nitro_n(atom: Chem.Atom) -> bool:
    if atom.GetSymbol() != "N" or atom.GetTotalDegree() != 3:
        return False
    terminal_o = [n for n in atom.GetNeighbors() if n.GetSymbol() == "O" and n.GetTotalDegree() == 1]
    return len(terminal_o) >= 2


def polar_counts(mol: Chem.Mol) -> Counter:
    """Count the polar keys of ``mol`` (group names, bond keys such as ``C=O``, ``O(1)``)."""
    counts: Counter = Counter()
    claimed: set[int] = set()
    for name, pattern in _patterns():
        for match in mol.GetSubstructMatches(pattern):
            counts[name] += 1
            claimed.update(match)
    for bond in mol.GetBonds():
        mark = _BOND_MARK.get(bond.GetBondType())
        if mark is None:
            continue
        a, b = bond.GetBeginAtom(), bond.GetEndAtom()
        if a.GetSymbol() == b.GetSymbol() or {a.GetIdx(), b.GetIdx()} & claimed:
            continue
        counts[mark.join(sorted((a.GetSymbol(), b.GetSymbol())))] += 1
        claimed.update((a.GetIdx(), b.GetIdx()))
    for atom in mol.GetAtoms():
        symbol = atom.GetSymbol()
        if symbol == "C" or (symbol == "P" and atom.GetTotalDegree() > 3):
            continue
        key = f"{symbol}({atom.GetTotalNumHs()})"
        if key not in ("N(0)", "F(0)"):
            counts[key] += 1
    return counts


def hbond_counts(mol: Chem.Mol) -> Counter:
    """Count the hydrogen-bond keys of ``mol`` (``HC``, ``HO``, ``N``, ``X`` ...)."""
    amide_n = {m[0] for m in mol.GetSubstructMatches(_AMIDE_N)}
    acid_o = {m[2] for m in mol.GetSubstructMatches(_ACID_OH)}
    counts: Counter = Counter()
    for atom in mol.GetAtoms():
        symbol, n_h = atom.GetSymbol(), atom.GetTotalNumHs()
        if symbol in ("N", "O") and not _is_nitro_n(atom):
            counts[symbol] += 1
        if symbol in ("F", "Cl", "Br", "I"):
            counts["X"] += 1
        if not n_h:
            continue
        if symbol == "C":
            counts["HC"] += n_h
        elif symbol == "N":
            if atom.GetIdx() in amide_n:
                counts["HNamide"] += n_h
            elif n_h == 2:
                counts["H2N"] += 2
            elif n_h == 1:
                counts["HN"] += 1
        elif symbol == "O":
            counts["HO_COOH" if atom.GetIdx() in acid_o else "HO"] += n_h
    return counts


def mathieu_hansen(mol: Chem.Mol) -> GroupHansen:
    """Hansen parameters by Mathieu's (2018) increments.

    Equations in the module docstring; units MPa^½.  Valid for the neutral organic molecules
    the tables cover (``GroupHansen.complete``); held-out MAE here 0.72/2.14/1.54 MPa^½
    (δD/δP/δH, ``hansen_validation.json``).  Reference: Mathieu, ACS Omega 3 (2018) 17049.

    Examples
    --------
    Ethanol, measured δD 15.8, δP 8.8, δH 19.4 MPa^½ (``chemicals`` 1.5.2, all four sets):

    >>> g = mathieu_hansen(Chem.MolFromSmiles("CCO"))
    >>> g.complete, round(g.volume_cm3, 2)
    (True, 57.93)
    >>> [round(x, 1) for x in (g.delta_d, g.delta_p, g.delta_h)]
    [16.0, 8.4, 18.1]

    By hand: V = 29.58 + 16.57 + 11.78 = 57.93, R = 5.74 + 4.60 + 2.51 = 12.85 cm³/mol;
    δD = √(93.8 + (2016 + 75044/57.93)(12.85/57.93)²) = 16.0; δP = √(4125/57.93) = 8.4;
    δH = √((5·24.5 + 16945 + 1980)/57.93) = 18.1.
    """
    table = increments()
    volume = refraction = 0.0
    unknown = []
    for atom in mol.GetAtoms():
        code = atom_code(atom)
        entry = table["atoms"].get(code)
        if entry is None:
            unknown.append(code)
            continue
        volume += entry[0]
        refraction += entry[1]
    for code, n in ring_codes(mol).items():
        volume += n * table["rings"][code]
    pc, hc = polar_counts(mol), hbond_counts(mol)
    e_p = sum(n * table["polar"][k] for k, n in pc.items() if k in table["polar"])
    e_h = sum(n * table["hydrogen_bond"][k] for k, n in hc.items())
    unknown += [k for k in pc if k not in table["polar"]]
    if volume <= 0:
        return GroupHansen(None, None, None, volume, refraction, e_p, e_h, dict(pc), dict(hc),
                           tuple(sorted(set(unknown))) or ("volume",))
    disp = table["dispersion"]
    d_d = math.sqrt(disp["a"] + (disp["b"] + disp["c"] / volume) * (refraction / volume) ** 2)
    d_p = math.sqrt(max(e_p, 0.0) / volume)
    d_h = math.sqrt(max(e_h, 0.0) / volume)
    return GroupHansen(d_d, d_p, d_h, volume, refraction, e_p, e_h, dict(pc), dict(hc),
                       tuple(sorted(set(unknown))))


GROUP_KEYS = (
    "COOH", "NitroOnC", "Carbonate", "Ester", "COinAmide", "SO2", "C=O", "C#N", "C~N", "C=N",
    "N=O", "C=S", "O=S", "O(0)", "O(1)", "N(1)", "N(2)", "Cl(0)", "Br(0)", "I(0)", "S(0)", "S(1)",
    "HC", "HN", "HNamide", "H2N", "HO", "HO_COOH", "N", "O", "X",
)
"""Count columns of the feature vector (polar then hydrogen-bond keys)."""

BASE_FEATURES = ("dD_group", "dP_group", "dH_group", "V_group", "R_group", "EP_group",
                 "EH_group", "n_unknown", "EP_per_V", "EH_per_V", "tb_K", "delta_total_from_tb",
                 "dipole_D", "beerbower_dP")
"""Names of the leading features; the group counts (``GROUP_KEYS``), the boiling-point model's
features and the ``CLOSURE_FEATURES`` follow.  ``delta_total_from_tb`` is √((ΔHvap − RT)/V) with
ΔHvap at 298 K from the estimated Tb (Kistiakowsky's entropy at Tb, Watson's scaling with
Tc ≈ 1.5 Tb); ``beerbower_dP`` is Beerbower's δP ≈ 37.4 μ/√V (μ in D, V in cm³/mol, Hansen 2007,
from memory): both only features, their constants need not be exact."""

MISSING = -1.0
"""Value of a feature that could not be computed (the exported trees have no missing-value branch)."""

CLOSURE_FEATURES = ("dP_closure", "dH_closure", "dD_closure", "closure_excess")
"""The last features: Hansen's δ² = δD² + δP² + δH² (Hansen 2007) closed with the total δ from the
estimated Tb (``delta_total_from_tb``) and the group values of the two other components, e.g.
dP_closure = √max(δ² − δD,group² − δH,group², 0), and closure_excess = δ² − the three group values
squared. Chosen on 5-fold cross-validation of the training rows: δP MAE 1.630 → 1.597 MPa^½ (1.623 →
1.592 with five-conformer dipoles), δD and δH unchanged within 0.005."""

R_GAS = R
T_REF = T_ZERO_CELSIUS + 25.0


def tb_cohesion(tb_K: float, volume_cm3: float) -> float:
    """√((ΔHvap,298 − RT)/V) [MPa^½] from a normal boiling point (a feature, not an estimator).

    >>> round(tb_cohesion(341.9, 131.6), 1)   # n-hexane: total δ 14.9 MPa^½ (Hansen 2007)
    14.9
    """
    tc = 1.5 * tb_K
    dh = (36.61 + R_GAS * math.log(tb_K)) * tb_K * max((tc - T_REF) / (tc - tb_K), 0.05) ** 0.38
    return math.sqrt(max(dh - R_GAS * T_REF, 0.0) / volume_cm3)


def hansen_row(mol: Chem.Mol, environments: dict[str, int]) -> tuple[list[float], GroupHansen]:
    """Return (feature vector, group result): group features, the boiling-point features, the closures."""
    g = mathieu_hansen(mol)
    counts = {**g.polar_counts, **g.hbond_counts}
    v = g.volume_cm3 if g.volume_cm3 > 0 else float("nan")
    row = [
        g.delta_d if g.delta_d is not None else float("nan"),
        g.delta_p if g.delta_p is not None else float("nan"),
        g.delta_h if g.delta_h is not None else float("nan"),
        g.volume_cm3, g.refraction_cm3, g.polar_energy, g.hbond_energy, float(len(g.unknown)),
        g.polar_energy / v, g.hbond_energy / v,
    ]
    tb = tree_estimate(mol).value_K
    try:
        mu = dipole_moment(mol).value_D
    except Exception:  # noqa: BLE001  a failed conformer search leaves the feature missing
        mu = None
    row += [
        tb if tb is not None else MISSING,
        tb_cohesion(tb, v) if tb is not None and v == v else MISSING,
        mu if mu is not None else MISSING,
        37.4 * mu / math.sqrt(v) if mu is not None and v == v else MISSING,
    ]
    row += [float(counts.get(k, 0)) for k in GROUP_KEYS]
    closures = closure_features(*(row[BASE_FEATURES.index(name)] for name in
                                  ("dD_group", "dP_group", "dH_group", "delta_total_from_tb")))
    return row + descriptor_row(mol, environments) + closures, g


def closure_features(d_d: float, d_p: float, d_h: float, d_total: float) -> list[float]:
    """``CLOSURE_FEATURES`` from the group values (NaN: none, counted as 0) and ``delta_total_from_tb``.

    By hand: √(324 − 225 − 36), √(324 − 225 − 16), √(324 − 16 − 36) and 324 − 225 − 16 − 36.

    >>> [round(x, 2) for x in closure_features(15.0, 4.0, 6.0, 18.0)]
    [7.94, 9.11, 16.49, 47.0]
    >>> closure_features(15.0, 4.0, 6.0, MISSING)
    [-1.0, -1.0, -1.0, -1.0]
    """
    if not d_total > 0:
        return [MISSING] * len(CLOSURE_FEATURES)
    d_d, d_p, d_h = (x if x == x else 0.0 for x in (d_d, d_p, d_h))
    total = d_total**2
    return [math.sqrt(max(total - d_d**2 - d_h**2, 0.0)), math.sqrt(max(total - d_d**2 - d_p**2, 0.0)),
            math.sqrt(max(total - d_p**2 - d_h**2, 0.0)), total - d_d**2 - d_p**2 - d_h**2]


@dataclass(frozen=True)
class HansenEstimate:
    """Hansen parameters [MPa^½] with standard uncertainties ``u_*`` and 90 % intervals.

    Values are None when the structure is outside the method's domain; ``status`` says why.
    """

    delta_d: float | None
    delta_p: float | None
    delta_h: float | None
    u_d: float | None
    u_p: float | None
    u_h: float | None
    method: str
    status: str
    interval90: dict[str, tuple[float, float]] | None = None

    def __post_init__(self) -> None:
        if self.method not in METHODS:
            raise ValueError(f"unknown method {self.method!r}; expected one of {METHODS}")
        if self.delta_d is None and self.status == "OK":
            raise ValueError("an estimate without values needs a failure status")


class HansenModel:
    """Each component's tree ensembles and the uncertainty table (``hansen_model.json``).

    ``members[component]`` lists (adds_group, TreeModel) pairs: a member either predicts the
    group estimate's error (the group value is added back) or the value itself; the estimate is
    the members' mean.
    """

    def __init__(self, data: dict[str, Any]) -> None:
        self.data = data
        self.environments = {k: i for i, k in enumerate(data["environments"])}
        self.members = {
            c: [(member["target"] == "residual",
                 TreeModel({"environments": data["environments"], "trees": member["trees"],
                            "uncertainty": {"heavy_atom_bands": []}}))
                for member in data["members"][c]]
            for c in COMPONENTS}
        self.uncertainty = data["uncertainty"]

    def value(self, component: str, x: list[float], group: float) -> float:
        """The component's estimate for feature row ``x`` and group value ``group``, unclipped."""
        members = self.members[component]
        return sum((group if adds else 0.0) + trees.residual(x) for adds, trees in members) / len(members)

    def band(self, component: str, complete: bool) -> dict[str, float]:
        """Uncertainty entry of ``component`` for molecules the group tables cover or not."""
        return self.uncertainty[component]["complete" if complete else "partial"]


@lru_cache(maxsize=1)
def load_model(path: str = str(MODEL_PATH)) -> HansenModel:
    """Read and cache the fitted model."""
    with open(path, encoding="utf-8") as handle:
        return HansenModel(json.load(handle))


def group_estimate(mol_or_smiles: Chem.Mol | str) -> HansenEstimate:
    """The published group method alone (no uncertainty; undefined outside its tables)."""
    mol = Chem.MolFromSmiles(mol_or_smiles) if isinstance(mol_or_smiles, str) else mol_or_smiles
    status = check_structure(mol)
    if status != "OK":
        return HansenEstimate(None, None, None, None, None, None, "mathieu-2018", status)
    g = mathieu_hansen(mol)
    if not g.complete:
        return HansenEstimate(None, None, None, None, None, None, "mathieu-2018",
                              "no increment for " + ", ".join(g.unknown))
    return HansenEstimate(round(g.delta_d, 3), round(g.delta_p, 3), round(g.delta_h, 3),
                          None, None, None, "mathieu-2018", "OK")


def estimate_hansen(mol_or_smiles: Chem.Mol | str, model: HansenModel | None = None) -> HansenEstimate:
    r"""Estimate δD, δP, δH [MPa^½]: Mathieu (2018) group method and fitted trees.

    .. math:: \delta_X = \frac{1}{M_X} \sum_m \Big[a_m \delta_{X,\mathrm{group}}
              + \sum_t f_{X,m,t}(\mathbf{x})\Big], \quad X \in \{D, P, H\}

    with :math:`a_m` = 1 for a member fitted to the group estimate's error and 0 for one fitted
    to the value itself (module docstring).

    Parameters
    ----------
    mol_or_smiles : rdkit.Chem.Mol or str
        Structure [-]
    model : HansenModel, optional
        Fitted model; default the shipped ``hansen_model.json`` [-]

    Returns
    -------
    HansenEstimate
        δD, δP, δH, standard uncertainties and 90 % intervals [MPa^½]; δP and δH are
        clipped at 0.

    Notes
    -----
    Valid range: neutral organic molecules of H, C, N, O, S, F, Cl, Br, I (``check_structure``
    of the boiling-point model).  The standard uncertainty is the RMS and the 90 % half-width
    the 90th percentile of out-of-fold training residuals, separately for molecules the group
    tables cover and those they do not.  Held-out MAE (fifth of the ``chemicals`` Hansen sets by
    InChIKey hash, 259 compounds): MAE δD 0.44, δP 1.51, δH 1.08 MPa^½ (group method alone on
    the 216 it covers: 0.72, 2.14, 1.54); 90 % interval coverage 0.87 (δP) to 0.92
    (``builder/data/hansen_validation.json``).  Each call also estimates Tb and the dipole
    moment (features; about 50 ms), unless they were just made for the same Mol object (an entry's
    own boiling point and force profile; ``memo.for_last``).  References: module docstring.

    Examples
    --------
    Toluene, measured δD 18.0, δP 1.4, δH 2.0 MPa^½ (``chemicals`` 1.5.2): each measured value
    lies inside the estimate's 90 % interval.

    >>> est = estimate_hansen("Cc1ccccc1")
    >>> all(lo <= x <= hi for x, (lo, hi) in zip((18.0, 1.4, 2.0), est.interval90.values()))
    True
    """
    method = "mathieu_trees"
    mol = Chem.MolFromSmiles(mol_or_smiles) if isinstance(mol_or_smiles, str) else mol_or_smiles
    status = check_structure(mol)
    if status != "OK":
        return HansenEstimate(None, None, None, None, None, None, method, status)
    model = model or load_model()
    x, g = hansen_row(mol, model.environments)
    if g.delta_d is None:
        return HansenEstimate(None, None, None, None, None, None, method,
                              "no molar volume from the increments")
    values, us, intervals = [], [], {}
    for component, base in zip(COMPONENTS, (g.delta_d, g.delta_p, g.delta_h)):
        value = max(model.value(component, x, base), 0.0)
        band = model.band(component, g.complete)
        value = round(value, 2)
        values.append(value)
        us.append(band["standard_uncertainty"])
        half = band["half_width90"]
        intervals[component] = (round(max(value - half, 0.0), 2), round(value + half, 2))
    return HansenEstimate(*values, *us, method, "OK", intervals)


def cohesive_energy_split(delta_d: float, delta_p: float, delta_h: float) -> dict[str, float]:
    """Shares of the cohesive energy density from dispersion, polar and hydrogen-bond forces.

    Since the cohesive energy density is δ² = δD² + δP² + δH² (Hansen 2007), each share is
    δX²/δ²; the three add up to one.  Inputs in MPa^½ (any common unit works).

    >>> split = cohesive_energy_split(15.8, 8.8, 19.4)   # ethanol
    >>> {k: round(v, 3) for k, v in split.items()}
    {'dispersion': 0.355, 'polar': 0.11, 'hydrogen_bond': 0.535}
    >>> cohesive_energy_split(14.9, 0.0, 0.0)["dispersion"]   # n-hexane
    1.0
    """
    total = delta_d**2 + delta_p**2 + delta_h**2
    if total <= 0:
        raise ValueError("all three parameters are zero")
    return {"dispersion": delta_d**2 / total, "polar": delta_p**2 / total,
            "hydrogen_bond": delta_h**2 / total}


def dominant_share(delta_d: float, delta_p: float, delta_h: float) -> str:
    """The contribution with the largest share of the cohesive energy.

    >>> dominant_share(15.8, 8.8, 19.4)
    'hydrogen_bond'
    """
    split = cohesive_energy_split(delta_d, delta_p, delta_h)
    return max(split, key=split.get)
