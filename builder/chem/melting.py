"""Normal melting point estimated from structure.

Contents
--------
- ``TmEstimate``: value [K], standard uncertainty [K], 90 % interval [K], method, status.
- ``joback_tf_estimate(mol)``: Joback & Reid (1987) [1]_ alone (no uncertainty).
- ``tree_estimate(mol)``: the default, Joback Tf base plus fitted residual trees.
- ``estimate_melting_point(mol)``: the default estimate.
- ``melting_row(mol, environments)``: the feature vector, shared with
  ``builder.fitting.melting`` so fit and runtime cannot drift.

The default method ("joback_tf_trees")
--------------------------------------
    Tm = Tf_J + sum_t f_t(x),   Tf_J = 122.5 K + sum_k N_k dTf_k

Tf_J is the Joback melting-point sum over the atoms that have a group (a missing
increment counts 0); f_t are gradient-boosted regression trees [2]_ fitted on the
residual, reading the boiling-point model's features (Joback group counts, radius-1 atom
environments, RDKit 2D descriptors; ``builder.chem.boiling.descriptor_row``) plus the
Joback Tf sum and a symmetry term: the fraction of heavy atoms that are topologically
equivalent to another (RDKit canonical ranks without tie breaking), because symmetric
molecules pack better and melt higher (Carnelley's rule, common knowledge of the trade).
The trees and the uncertainty table live in ``builder/data/melting_model.json``, written
by ``python -m builder.fitting.melting`` from the CRC Handbook organic melting points
(training 80 %, same InChIKey-hash split as the boiling-point model); the held-out
accuracy is in ``builder/data/melting_validation.json``.  Evaluated in plain Python.

References
----------
.. [1] Joback, K. G.; Reid, R. C. Chem. Eng. Commun. 1987, 57, 233-243.
   doi:10.1080/00986448708960487.
.. [2] Friedman, J. H. Ann. Stat. 2001, 29, 1189-1232. doi:10.1214/aos/1013203451.
"""
from __future__ import annotations

import json
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from rdkit import Chem

from builder.chem.boiling import TreeModel, check_structure, descriptor_row
from builder.chem.joback import (
    TC_TF_INCREMENT,
    TF_BASE,
    joback_groups,
    joback_tf,
    to_mol,
)

MODEL_PATH = Path(__file__).resolve().parent.parent / "data" / "melting_model.json"

MELTING_METHODS = ("joback_tf_trees", "joback_tf")

EXTRA_FEATURES = ("joback_tf_assigned_K", "symmetric_fraction")
"""Features appended to ``boiling.descriptor_row``, in order."""


@dataclass(frozen=True)
class TmEstimate:
    """One melting-point estimate [K]; ``value_K`` None with a reason in ``status``."""

    value_K: float | None
    uncertainty_K: float | None
    method: str
    status: str
    interval90_K: tuple[float, float] | None = None


def joback_tf_assigned(mol: Chem.Mol) -> float:
    """Joback Tf sum over the atoms that have a group, a missing increment counted as 0 [K]."""
    counts, _ = joback_groups(mol)
    return TF_BASE + sum(n * (TC_TF_INCREMENT[g][1] or 0.0) for g, n in counts.items())


def symmetric_fraction(mol: Chem.Mol) -> float:
    """Fraction of heavy atoms sharing their canonical rank with another atom (0 … 1)."""
    n = mol.GetNumHeavyAtoms()
    if n < 2:
        return 0.0
    ranks = list(Chem.CanonicalRankAtoms(mol, breakTies=False))
    shared = sum(1 for r in ranks if ranks.count(r) > 1)
    return shared / n


def melting_row(mol: Chem.Mol, environments: dict[str, int]) -> list[float]:
    """The feature vector of the melting-point trees."""
    return descriptor_row(mol, environments) + [joback_tf_assigned(mol), symmetric_fraction(mol)]


@lru_cache(maxsize=1)
def load_model(path: str = str(MODEL_PATH)) -> TreeModel:
    with open(path, encoding="utf-8") as handle:
        return TreeModel(json.load(handle))


def joback_tf_estimate(mol_or_smiles: Chem.Mol | str) -> TmEstimate:
    """Joback & Reid (1987) Tf alone; withheld if an atom has no group (no uncertainty)."""
    mol = to_mol(mol_or_smiles)
    if mol is None:
        return TmEstimate(None, None, "joback_tf", "SMILES did not parse")
    counts, unassigned = joback_groups(mol)
    if unassigned or not counts:
        return TmEstimate(None, None, "joback_tf", "no Joback group for some atoms")
    value = joback_tf(counts)
    if value is None:
        return TmEstimate(None, None, "joback_tf", "a Joback group has no melting-point increment")
    return TmEstimate(round(value, 3), None, "joback_tf", "OK")


def tree_estimate(mol_or_smiles: Chem.Mol | str, model: TreeModel | None = None) -> TmEstimate:
    r"""Estimate the normal melting point: Joback Tf base plus residual trees.

    .. math:: T_m = 122.5 + \sum_k N_k \Delta T_{f,k} + \sum_t f_t(\mathbf{x})

    Returns the melting point, its standard uncertainty and 90 % interval [K].
    Valid range: single neutral organic molecules of H, C, N, O, S, F, Cl, Br, I (the
    boiling-point model's domain); training data span about 90-600 K.  Error on the
    held-out 20 % of CRC Handbook melting points: see ``melting_validation.json``
    (printed by ``python -m builder.fitting.melting --report``).  The standard
    uncertainty is the RMS and the 90 % half-width the 90th percentile of out-of-fold
    training residuals in the heavy-atom band.
    """
    method = "joback_tf_trees"
    mol = to_mol(mol_or_smiles)
    status = check_structure(mol)
    if status != "OK":
        return TmEstimate(None, None, method, status)
    model = model or load_model()
    x = melting_row(mol, model.environments)
    value = round(x[-2] + model.residual(x), 3)
    band = model.band(mol.GetNumHeavyAtoms())
    half = band["half_width90_K"]
    return TmEstimate(value, band["standard_uncertainty_K"], method, "OK",
                      (round(value - half, 3), round(value + half, 3)))


def estimate_melting_point(mol_or_smiles: Chem.Mol | str) -> TmEstimate:
    """The default melting-point estimate [K] of a molecule or SMILES."""
    return tree_estimate(mol_or_smiles)
