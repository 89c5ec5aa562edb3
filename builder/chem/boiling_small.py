"""Normal boiling point of small molecules outside the organic model (no carbon, or elements
the organic model was not fitted on): noble gases, halogens, hydrides, small inorganic molecules.

Contents
--------
- ``SMALL_ELEMENTS``: the elements of the domain (non-metals, metalloids, noble gases).
- ``small_domain(mol)``: "OK" or the reason the molecule is outside the domain.
- ``small_features(mol)``: the feature vector.
- ``small_estimate(mol)``: ``TbEstimate``-like result from ``builder/data/boiling_small_model.json``.

Method ("small_molecule_ridge", this catalog's estimator)
--------------------------------------------------------
A ridge regression of ln Tb on terms of the force profile:

    ln(Tb/K) = b0 + Σ_j b_j·x_j

with x = ln(polarizability α/Å³ + 0.2) and its square (Lorentz-Lorenz over Wildman-Crippen
molar refractivity, ``builder.chem.shape.polarizability``), ln(electron count), ln(molar mass),
heavy atoms, hydrogen-bond donors and acceptors (H on N, O, F; N, O, F lone pairs), their
product, the number of polar bonds, counts of H, halogen and O atoms, and whether the molecule
is a single atom.  Fitted by ``python -m builder.fitting.boiling_small``
on the CRC Handbook inorganic table in ``chemicals`` (80 % training, split by the InChIKey hash
as for the organic model); the standard uncertainty is the RMS of the out-of-fold residuals
(in ln Tb, converted to K at the estimate) and the 90 % half-width their 90th percentile.
Valid range: single neutral molecules of the ``SMALL_ELEMENTS`` with at most 12 heavy atoms;
held-out error in ``builder/data/boiling_small_validation.json``.  The dipole moment is not a
feature (the force-field charges do not cover most of these elements).

Reference for the descriptors: Wildman, S. A.; Crippen, G. M. J. Chem. Inf. Comput. Sci. 1999,
39, 868 (molar refractivity); data: CRC Handbook of Chemistry and Physics, 95th ed.
"""
from __future__ import annotations

import json
import math
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from rdkit import Chem

from builder.chem.features import hbond_acceptors, hbond_donors, polar_bonds
from builder.chem.molar_mass import molar_mass
from builder.chem.shape import polarizability

MODEL_PATH = Path(__file__).resolve().parent.parent / "data" / "boiling_small_model.json"

SMALL_ELEMENTS = frozenset({1, 2, 5, 6, 7, 8, 9, 10, 14, 15, 16, 17, 18, 32, 33, 34, 35, 36, 51, 52, 53, 54, 86})
"""H He B C N O F Ne Si P S Cl Ar Ge As Se Br Kr Sb Te I Xe Rn."""

MAX_HEAVY_ATOMS = 12
FEATURES = ("ln_alpha", "ln_electrons", "heavy_atoms", "donors", "acceptors", "donor_x_acceptor",
            "polar_bonds", "single_atom", "ln_molar_mass", "hydrogens", "halogens", "oxygens", "ln_alpha_squared")


@dataclass(frozen=True)
class SmallEstimate:
    value_K: float | None
    uncertainty_K: float | None
    status: str
    interval90_K: tuple[float, float] | None = None
    method: str = "small_molecule_ridge"


def small_domain(mol: Chem.Mol | None) -> str:
    """"OK" if ``mol`` is in the small-molecule domain, else the reason."""
    if mol is None:
        return "SMILES did not parse"
    if len(Chem.GetMolFrags(mol)) > 1:
        return "more than one fragment (salt or mixture)"
    elements = {a.GetAtomicNum() for a in mol.GetAtoms()}
    if not elements <= SMALL_ELEMENTS:
        return "contains a metal or an element outside the small-molecule model"
    if any(a.GetFormalCharge() for a in mol.GetAtoms()) or any(a.GetNumRadicalElectrons() for a in mol.GetAtoms()):
        return "charged or radical structure"
    if mol.GetNumHeavyAtoms() > MAX_HEAVY_ATOMS:
        return f"more than {MAX_HEAVY_ATOMS} heavy atoms (a network or polymer solid, or outside the fitted range)"
    return "OK"


def small_features(mol: Chem.Mol) -> list[float]:
    alpha, _ = polarizability(mol)
    electrons = sum(a.GetAtomicNum() for a in Chem.AddHs(mol).GetAtoms())
    d, a = hbond_donors(mol), hbond_acceptors(mol)
    with_h = Chem.AddHs(mol)
    ln_alpha = math.log((alpha or 0.0) + 0.2)
    count = lambda numbers: float(sum(1 for at in with_h.GetAtoms() if at.GetAtomicNum() in numbers))  # noqa: E731
    return [ln_alpha, math.log(max(electrons, 1)), float(mol.GetNumHeavyAtoms()),
            float(d), float(a), float(d * a), float(len(polar_bonds(mol))),
            1.0 if with_h.GetNumAtoms() == 1 else 0.0, math.log(molar_mass(mol)),
            count((1,)), count((9, 17, 35, 53)), count((8,)), ln_alpha * ln_alpha]


@lru_cache(maxsize=1)
def load_model(path: str = str(MODEL_PATH)) -> dict:
    with open(path, encoding="utf-8") as handle:
        return json.load(handle)


def small_estimate(mol: Chem.Mol, model: dict | None = None) -> SmallEstimate:
    r"""Estimate Tb [K] for a small molecule outside the organic model (see the module text).

    .. math:: \ln(T_b/\mathrm{K}) = b_0 + \sum_j b_j x_j

    Returns the estimate with its standard uncertainty and 90 % interval [K], or a reason.
    """
    status = small_domain(mol)
    if status != "OK":
        return SmallEstimate(None, None, status)
    model = model or load_model()
    x = small_features(mol)
    z = [(v - m) / s for v, m, s in zip(x, model["mean"], model["scale"])]
    ln_tb = model["intercept"] + sum(c * v for c, v in zip(model["coef"], z))
    value = math.exp(ln_tb)
    u_ln, h_ln = model["u_ln"], model["half_width90_ln"]
    return SmallEstimate(round(value, 3), round(value * u_ln, 1), "OK",
                         (round(value * math.exp(-h_ln), 3), round(value * math.exp(h_ln), 3)))
