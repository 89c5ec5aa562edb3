"""Fit and validate the boiling-point model (fitting and tests only).

Usage::

    python -m builder.fitting.boiling           # fit, write both data files
    python -m builder.fitting.boiling --check   # refit in memory, exit 1 if files differ
    python -m builder.fitting.boiling --report  # print held-out accuracy of the shipped model

Contents
--------
- ``load_records()``: CRC Handbook organic boiling points from ``chemicals``
  (``Tb_sources['CRC_ORG']``), structures from ``chemicals.identifiers``,
  kept if ``boiling.check_structure`` accepts them and the name passes the
  identifier check below; split 80/20 by the SHA-256 of the InChIKey's
  first (connectivity) block, so stereoisomers share a side.
- ``fit(records)``: vocabulary, stereo correction (``fit_ring_correction``,
  ``fit_alkene_correction``), trees, uncertainty table (``boiling_model.json``).
- ``validate(records, model)``: accuracy by size band on the held-out 20 %
  for every method (``boiling_validation.json``).

Data rules (stated, reproducible):

1. Identifier check (all rows): rows whose CRC name names an element that
   the structure lacks (e.g. "Tetrabutyl titanate" stored as butanol) are
   dropped as identifier mismatches.
2. Training rows only: 5-fold out-of-fold residuals are computed; rows
   whose residual exceeds ``TRIM_SIGMAS`` robust standard deviations
   (1.4826 x median absolute residual) are left out of the final fit; these
   are mostly reduced-pressure or decomposition temperatures.  Held-out rows
   are never trimmed: reported accuracy covers all of them.
3. Name-to-stereo repair (all rows): where a row's SMILES leaves cis/trans or
   E/Z unspecified and its CRC name states it without a choice left
   ("cis-", "trans-", "(E)-", "(Z)-", ring locants with alpha/beta), the
   stated stereo is put in (``name_stereo``, which says what is skipped as
   ambiguous); 83 rows with chemicals 1.5.2 (``n_rows_stereo_from_name`` in
   the validation file).  Stereo already given is never changed, and the
   split does not move.

Needs ``chemicals`` and ``lightgbm`` (fitting only; the runtime reads JSON).
"""

from __future__ import annotations

import argparse
import hashlib
import itertools
import json
import math
import re
import statistics
import sys
from dataclasses import dataclass, replace
from typing import Any

from rdkit import Chem, RDLogger

from builder.chem.boiling import (
    DESCRIPTORS,
    MODEL_PATH,
    STEREO_FEATURES,
    TreeModel,
    atom_environments,
    check_structure,
    descriptor_row,
    stereo_shift,
    joback_estimate,
    joback_stein_brown_estimate,
    stereo_features,
    tree_estimate,
)
from builder.chem.features import ring_cis_trans_pairs
from builder.chem.joback import JOBACK_TB

VALIDATION_PATH = MODEL_PATH.parent / "boiling_validation.json"
HELD_OUT_PERCENT = 20
MIN_ENV_COUNT = 5
TRIM_SIGMAS = 5.0
FOLDS = 5
BANDS = ((1, 6), (7, 12), (13, 20), (21, None))
LGB_PARAMS = {
    "objective": "huber", "alpha": 15.0, "learning_rate": 0.05, "num_leaves": 15,
    "min_data_in_leaf": 10, "feature_fraction": 0.5, "bagging_fraction": 0.8,
    "bagging_freq": 1, "lambda_l2": 1.0, "num_threads": 1, "seed": 0,
    "deterministic": True, "force_row_wise": True, "verbose": -1,
}
ROUNDS = 600
ELEMENT_WORDS = {
    "titan": "Ti", "silic": "Si", "silyl": "Si", "silox": "Si", "silan": "Si", "stann": "Sn",
    "boron": "B", "borat": "B", "boran": "B", "phosph": "P", "alumin": "Al", "sodium": "Na",
    "potassium": "K", "lithium": "Li", "zinc": "Zn", "mercur": "Hg", "plumb": "Pb", "arsen": "As",
    "german": "Ge", "selen": "Se", "ferr": "Fe", "cupr": "Cu", "magnes": "Mg", "calcium": "Ca",
}


@dataclass(frozen=True)
class Record:
    """One CRC Handbook row with its structure and split."""

    cas: str
    name: str
    smiles: str
    inchikey: str
    tb_K: float
    held_out: bool
    stereo_from_name: bool = False


def split_hash(inchikey: str) -> int:
    """Return a number in 0-99 from the SHA-256 of the InChIKey's first block."""
    return int(hashlib.sha256(inchikey[:14].encode("ascii")).hexdigest()[:8], 16) % 100


def name_mismatch(name: str, mol: Chem.Mol) -> bool:
    """Return True if ``name`` names an element that ``mol`` does not contain."""
    symbols = {a.GetSymbol() for a in mol.GetAtoms()}
    lower = name.lower()
    return any(word in lower and symbol not in symbols for word, symbol in ELEMENT_WORDS.items())


def load_records() -> list[Record]:
    """Return the CRC organic boiling points usable for the model, sorted by CAS."""
    from chemicals.identifiers import search_chemical
    from chemicals.phase_change import Tb_sources

    RDLogger.DisableLog("rdApp.*")
    frame = Tb_sources["CRC_ORG"].dropna(subset=["Tb"])
    records = []
    for cas, row in frame.iterrows():
        try:
            smiles = search_chemical(cas).smiles
        except ValueError:
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        if check_structure(mol) != "OK" or name_mismatch(str(row["Name"]), mol):
            continue
        key = Chem.MolToInchiKey(mol)
        held_out = split_hash(key) < HELD_OUT_PERCENT
        records.append(Record(cas, str(row["Name"]), smiles, key, float(row["Tb"]), held_out))
    return sorted((repair_stereo(r) for r in records), key=lambda r: r.cas)


def repair_stereo(record: Record) -> Record:
    """Return ``record`` with the stereo its name states where its SMILES leaves it out
    (``name_stereo``); the split does not move (it hashes the connectivity block only)."""
    smiles = name_stereo(record.name, record.smiles)
    if smiles is None:
        return record
    return replace(record, smiles=smiles, inchikey=Chem.MolToInchiKey(Chem.MolFromSmiles(smiles)),
                   stereo_from_name=True)


_CIS_TRANS = re.compile(r"(?<![A-Za-z])(cis|trans)(?![A-Za-z])", re.IGNORECASE)
_E_Z = re.compile(r"\((E|Z)\)")
_ALPHA_BETA = re.compile(r"(?<![0-9])([0-9]+)([αβ])")


def name_stereo(name: str, smiles: str) -> str | None:
    """Return the SMILES with the unspecified stereo that ``name`` states, or None.

    Conservative: every unspecified element must be of one kind and the name must fix
    each of them without a choice left.

    - Double bonds: "(E)"/"(Z)" (CIP labels) as many as there are unspecified stereo
      double bonds, all alike; or "cis"/"trans" as many as the structure has stereo double
      bonds, all alike, each unspecified one carrying a single substituent at either end
      (so cis is the two substituents on one side; trisubstituted bonds are skipped,
      since cis/trans there depends on which chain the name takes).
    - Ring centres: every stereocentre of the molecule lies in one ring and carries one
      hydrogen, and the name gives either one "cis"/"trans" for exactly two centres or
      locants with alpha/beta for each centre ("1α,2β,4α": same letter, same face), the
      locants read as positions round a single ring (their ring distances must match
      the structure's under some numbering).  Relative configuration is read with
      ``features.ring_cis_trans_pairs`` (a centre that the others' configuration makes
      non-stereogenic, as C4 of trans-1,2-cis/trans-4-trimethylcyclopentane, drops out of
      the comparison); the stereoisomers that fit the name must be one compound up to
      its mirror image (the name gives no absolute configuration; the
      boiling point does not depend on it).
    """
    from rdkit.Chem import rdCIPLabeler
    from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

    mol = Chem.MolFromSmiles(smiles)
    found = list(Chem.FindPotentialStereo(mol))
    unspecified = [i for i in found if i.specified == Chem.StereoSpecified.Unspecified]
    if not unspecified:
        return None
    words = [w.lower() for w in _CIS_TRANS.findall(name)]
    labels, locants = _E_Z.findall(name), _ALPHA_BETA.findall(name)
    kinds = {i.type for i in unspecified}
    options = StereoEnumerationOptions(onlyUnassigned=True, unique=True)
    candidates = list(EnumerateStereoisomers(mol, options=options))
    if kinds == {Chem.StereoType.Bond_Double} and not locants:
        bonds = [i.centeredOn for i in unspecified]
        if labels and not words and len(labels) == len(bonds) and len(set(labels)) == 1:
            want = labels[0]
        elif words and not labels and len(set(words)) == 1 and all(_disubstituted(mol, b) for b in bonds) \
                and len(words) == sum(i.type == Chem.StereoType.Bond_Double for i in found):
            want = "Z" if words[0] == "cis" else "E"  # one substituent a side: it outranks H or a lone pair
        else:
            return None
        chosen = []
        for candidate in candidates:
            rdCIPLabeler.AssignCIPLabels(candidate)
            got = [candidate.GetBondWithIdx(b).GetPropsAsDict().get("_CIPCode") for b in bonds]
            if all(g == want for g in got):
                chosen.append(Chem.MolToSmiles(candidate))
        return min(chosen) if len(set(chosen)) == 1 else None
    if kinds != {Chem.StereoType.Atom_Tetrahedral} or labels:
        return None
    centres = [i.centeredOn for i in found if i.type == Chem.StereoType.Atom_Tetrahedral]
    if any(i.type != Chem.StereoType.Atom_Tetrahedral for i in found) or len(centres) < 2:
        return None
    ring = next((r for r in sorted(mol.GetRingInfo().AtomRings(), key=len) if set(centres) <= set(r)), None)
    if ring is None or any(mol.GetAtomWithIdx(c).GetTotalNumHs() != 1 for c in centres):
        return None
    if len(words) == 1 and not locants and len(centres) == 2:
        wanted = [{(min(centres), max(centres)): words[0] == "cis"}]
    elif locants and not words and len(locants) == len(centres) and len({n for n, _ in locants}) == len(locants):
        wanted = _locant_relations(locants, centres, ring)
    else:
        return None
    classes: dict[str, str] = {}
    for candidate in candidates:
        relations = {(i, j): cis for i, j, _, cis in ring_cis_trans_pairs(candidate)}
        settled = not any(i.specified == Chem.StereoSpecified.Unspecified for i in Chem.FindPotentialStereo(candidate))
        if relations and settled and any(all(w.get(k) == v for k, v in relations.items()) for w in wanted):
            smiles_out = Chem.MolToSmiles(candidate)
            classes.setdefault(_up_to_mirror(candidate), smiles_out)
            classes[_up_to_mirror(candidate)] = min(classes[_up_to_mirror(candidate)], smiles_out)
    return next(iter(classes.values())) if len(classes) == 1 else None


def _disubstituted(mol: Chem.Mol, bond_index: int) -> bool:
    """True if each end of the double bond has exactly one heavy neighbour besides the other end."""
    bond = mol.GetBondWithIdx(bond_index)
    return all(atom.GetDegree() == 2 for atom in (bond.GetBeginAtom(), bond.GetEndAtom()))


def _locant_relations(locants: list[tuple[str, str]], centres: list[int], ring: tuple[int, ...]) -> list[dict]:
    """Every cis/trans pattern over ``centres`` that the alpha/beta locants give under a
    numbering of ``ring`` whose ring distances match the locants'."""
    n = len(ring)
    position = {c: ring.index(c) for c in centres}
    patterns = []
    for order in itertools.permutations(centres):
        pairs = {}
        for (a, (la, fa)), (b, (lb, fb)) in itertools.combinations(zip(order, locants), 2):
            named = abs(int(la) - int(lb))
            drawn = abs(position[a] - position[b])
            if min(named, n - named) != min(drawn, n - drawn):
                break
            pairs[(min(a, b), max(a, b))] = fa == fb
        else:
            patterns.append(pairs)
    return patterns


def _up_to_mirror(mol: Chem.Mol) -> str:
    """The smaller canonical SMILES of ``mol`` and its mirror image."""
    mirror = Chem.Mol(mol)
    for atom in mirror.GetAtoms():
        tag = atom.GetChiralTag()
        if tag == Chem.ChiralType.CHI_TETRAHEDRAL_CW:
            atom.SetChiralTag(Chem.ChiralType.CHI_TETRAHEDRAL_CCW)
        elif tag == Chem.ChiralType.CHI_TETRAHEDRAL_CCW:
            atom.SetChiralTag(Chem.ChiralType.CHI_TETRAHEDRAL_CW)
    return min(Chem.MolToSmiles(mol), Chem.MolToSmiles(mirror))


def environment_vocabulary(records: list[Record]) -> list[str]:
    """Return environment keys found in at least ``MIN_ENV_COUNT`` training molecules."""
    seen: dict[str, int] = {}
    for record in records:
        for key in set(atom_environments(Chem.MolFromSmiles(record.smiles))):
            seen[key] = seen.get(key, 0) + 1
    return sorted(k for k, n in seen.items() if n >= MIN_ENV_COUNT)


def _train(x: Any, y: Any) -> Any:
    """Fit the residual trees with LightGBM."""
    import lightgbm

    return lightgbm.train(LGB_PARAMS, lightgbm.Dataset(x, y), num_boost_round=ROUNDS)


def _flatten(node: dict[str, Any], tree: dict[str, list]) -> int:
    """Append ``node`` to the flat arrays; return its index (leaves as ~index)."""
    if "leaf_value" in node:
        tree["leaf"].append(round(float(node["leaf_value"]), 6))
        return ~(len(tree["leaf"]) - 1)
    if node["decision_type"] != "<=":
        raise ValueError(f"unsupported split {node['decision_type']!r}")
    index = len(tree["feature"])
    tree["feature"].append(int(node["split_feature"]))
    tree["threshold"].append(float(node["threshold"]))
    tree["left"].append(0)
    tree["right"].append(0)
    tree["left"][index] = _flatten(node["left_child"], tree)
    tree["right"][index] = _flatten(node["right_child"], tree)
    return index


def export_trees(booster: Any) -> list[dict[str, list]]:
    """Return the booster's trees as flat arrays for ``TreeModel``."""
    trees = []
    for info in booster.dump_model()["tree_info"]:
        tree: dict[str, list] = {"feature": [], "threshold": [], "left": [], "right": [], "leaf": []}
        _flatten(info["tree_structure"], tree)
        trees.append(tree)
    return trees


def _band_of(heavy: int) -> int:
    for i, (low, high) in enumerate(BANDS):
        if heavy >= low and (high is None or heavy <= high):
            return i
    raise ValueError(f"no band for {heavy} heavy atoms")


def _quantile(values: list[float], q: float) -> float:
    ordered = sorted(values)
    pos = q * (len(ordered) - 1)
    low = math.floor(pos)
    high = min(low + 1, len(ordered) - 1)
    return ordered[low] + (ordered[high] - ordered[low]) * (pos - low)


def fit(records: list[Record]) -> dict[str, Any]:
    """Fit the model on the training rows; return the JSON-ready model."""
    import numpy as np

    train = [r for r in records if not r.held_out]
    vocab = environment_vocabulary(train)
    env_index = {k: i for i, k in enumerate(vocab)}
    mols = [Chem.MolFromSmiles(r.smiles) for r in train]
    x = np.array([descriptor_row(m, env_index) + stereo_features(m) for m in mols])
    base = x[:, len(JOBACK_TB) + DESCRIPTORS.index("joback_sb_K")]
    correction = fit_ring_correction(train, x, x.shape[1] - len(STEREO_FEATURES))
    shift = np.array([stereo_shift(list(row), correction) for row in x])
    y = np.array([r.tb_K for r in train]) - base - shift
    xt = x[:, :x.shape[1] - len(STEREO_FEATURES) + TREE_STEREO_FEATURES]  # the trees' columns
    fold = np.array([split_hash(r.inchikey[::-1]) % FOLDS for r in train])
    oof = np.zeros(len(train))
    for k in range(FOLDS):
        oof[fold == k] = _train(xt[fold != k], y[fold != k]).predict(xt[fold == k]) - y[fold == k]
    sigma = 1.4826 * float(np.median(np.abs(oof)))
    keep = np.abs(oof) <= TRIM_SIGMAS * sigma
    booster = _train(xt[keep], y[keep])
    trees = export_trees(booster)
    correction = fit_alkene_correction(train, x, -oof, correction)
    bands = []
    heavy = [m.GetNumHeavyAtoms() for m in mols]
    for i, (low, high) in enumerate(BANDS):
        res = [float(oof[j]) for j in range(len(train)) if _band_of(heavy[j]) == i]
        bands.append({
            "min_heavy_atoms": low, "max_heavy_atoms": high, "n": len(res),
            "standard_uncertainty_K": round(math.sqrt(sum(e * e for e in res) / len(res)), 1),
            "half_width90_K": round(_quantile([abs(e) for e in res], 0.90), 1),
        })
    model = {
        "format": 1,
        "method": "joback_sb_trees",
        "target": "Tb [K] minus the Joback + Stein-Brown estimate over assigned atoms",
        "groups": [name for name, _, _ in JOBACK_TB],
        "descriptors": list(DESCRIPTORS),
        "environments": vocab,
        "stereo_features": list(STEREO_FEATURES),
        "stereo_correction": correction,
        "stereo_features_in_trees": TREE_STEREO_FEATURES,
        "trees": trees,
        "uncertainty": {
            "basis": f"{FOLDS}-fold out-of-fold residuals on the training rows",
            "standard_uncertainty": "root mean square residual in the band",
            "interval90": "estimate +/- 90th percentile of absolute residual in the band",
            "heavy_atom_bands": bands,
        },
        "training": {
            "source": "CRC Handbook organic boiling points via chemicals 1.5.2 (CRC_ORG)",
            "split": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT} held out",
            "n_train": len(train), "n_trimmed": int((~keep).sum()),
            "trim_rule": f"|out-of-fold residual| > {TRIM_SIGMAS} x 1.4826 x median |residual|",
            "trim_threshold_K": round(TRIM_SIGMAS * sigma, 1),
            "lightgbm_params": LGB_PARAMS, "rounds": ROUNDS,
        },
    }
    check = TreeModel(model)
    for row, expected in zip(x[:200], booster.predict(xt[:200])):
        if abs(check.residual(list(row)) - expected) > 1e-3:
            raise RuntimeError("exported trees disagree with LightGBM")
    return model


TREE_STEREO_FEATURES = 3
"""The trees read the first three ``STEREO_FEATURES`` (planar dipole, Z and E counts); the
counts behind the stereo correction are its alone, so within a ring stereoisomer pair the
trees give equal values (which ``fit_ring_correction`` assumes) and nothing is counted twice."""

RING_RIDGE = 1.0
"""Ridge penalty of the stereo correction fits [K^2 per (K per pair)^2]."""


def _training_pairs(train: list[Record], signed: Any) -> list[tuple[int, int]]:
    """Training stereoisomer pairs (same InChIKey first block, different InChIKeys, no
    unspecified stereo in either) whose rows of ``signed`` differ."""
    import numpy as np
    from builder.chem.structure3d import unspecified_stereo

    groups: dict[str, list[int]] = {}
    for i, record in enumerate(train):
        if not unspecified_stereo(Chem.MolFromSmiles(record.smiles)):
            groups.setdefault(record.inchikey[:14], []).append(i)
    return [(i, j) for members in groups.values() for a, i in enumerate(members) for j in members[a + 1:]
            if train[i].inchikey != train[j].inchikey and np.any(signed[i] != signed[j])]


def _pair_ridge(signed: Any, target: Any, pairs: list[tuple[int, int]]) -> tuple[list[float], dict[str, Any]]:
    """Ridge fit of within-pair differences: minimise sum (dt - c . ds)^2 + RING_RIDGE |c|^2."""
    import numpy as np

    design = np.array([signed[i] - signed[j] for i, j in pairs])
    diff = np.array([target[i] - target[j] for i, j in pairs])
    coefficients = np.linalg.solve(design.T @ design + RING_RIDGE * np.eye(design.shape[1]), design.T @ diff)
    return [round(float(c), 2) for c in coefficients], {
        "n_pairs": len(pairs),
        "pair_mae_K": round(float(np.mean(np.abs(diff - design @ coefficients))), 2),
        "pair_mae_without_K": round(float(np.mean(np.abs(diff))), 2),
    }


def fit_ring_correction(train: list[Record], x: Any, stereo_start: int) -> dict[str, Any]:
    """Fit the ring cis/trans coefficients on within-pair differences of training rows.

    Pairs (``_training_pairs``) whose ring cis/trans counts differ: every other feature
    but the ring counts is equal within such a pair, so the measured difference is
    regressed on the difference of (cis - trans) per relation (``_pair_ridge``).
    """
    import numpy as np
    from builder.chem.features import RING_RELATIONS

    names = [r.replace(",", "").replace("+", "plus") for r in RING_RELATIONS]
    columns = [[stereo_start + STEREO_FEATURES.index(f"ring_cis_{n}"),
                stereo_start + STEREO_FEATURES.index(f"ring_trans_{n}")] for n in names]
    signed = np.array([[row[c] - row[t] for c, t in columns] for row in x])
    pairs = _training_pairs(train, signed)
    coefficients, stats = _pair_ridge(signed, np.array([r.tb_K for r in train]), pairs)
    return {
        "terms": [f"ring cis - trans {r}" for r in RING_RELATIONS], "columns": columns,
        "coefficients_K": coefficients, "ridge": RING_RIDGE,
        "ring_fit": dict(stats, basis="measured within-pair Tb differences of training stereoisomers"),
    }


def fit_alkene_correction(train: list[Record], x: Any, residual: Any, correction: dict[str, Any]) -> dict[str, Any]:
    """Add the (Z - E) terms of alkyl and of polar double bonds to ``correction``: fitted,
    after the trees, on the within-pair differences of the trees' out-of-fold residuals
    (measured minus estimated; ``_pair_ridge``) over the training pairs whose counts differ."""
    import numpy as np

    stereo_start = x.shape[1] - len(STEREO_FEATURES)
    columns = [[stereo_start + STEREO_FEATURES.index(f"z_{kind}_double_bonds"),
                stereo_start + STEREO_FEATURES.index(f"e_{kind}_double_bonds")] for kind in ("alkyl", "polar")]
    signed = np.array([[row[z] - row[e] for z, e in columns] for row in x])
    pairs = _training_pairs(train, signed)
    coefficients, stats = _pair_ridge(signed, residual, pairs)
    return dict(correction, terms=correction["terms"] + ["alkyl double bonds Z - E", "polar double bonds Z - E"],
                columns=correction["columns"] + columns,
                coefficients_K=correction["coefficients_K"] + coefficients,
                double_bond_fit=dict(stats, basis="within-pair differences of the trees' out-of-fold residuals"))


def _stats(errors: list[float], n_total: int) -> dict[str, Any]:
    absolute = [abs(e) for e in errors]
    return {
        "n": n_total, "n_estimated": len(errors),
        "coverage": round(len(errors) / n_total, 4) if n_total else None,
        "mae_K": round(statistics.fmean(absolute), 2) if errors else None,
        "median_ae_K": round(statistics.median(absolute), 2) if errors else None,
        "bias_K": round(statistics.fmean(errors), 2) if errors else None,
        "rmse_K": round(math.sqrt(statistics.fmean([e * e for e in errors])), 2) if errors else None,
    }


def validate(records: list[Record], model: TreeModel) -> dict[str, Any]:
    """Return held-out accuracy by heavy-atom band for every method."""
    held = [r for r in records if r.held_out]
    funcs = {
        "joback": joback_estimate,
        "joback_stein_brown": joback_stein_brown_estimate,
        "joback_sb_trees": lambda m: tree_estimate(m, model),
    }
    table = validate_rows(held, funcs, "joback_sb_trees")
    table["stereo_pairs"] = stereo_pair_order(records, model)
    return table


PAIR_MIN_DIFFERENCE_K = 5.0


def stereo_pair_order(records: list[Record], model: TreeModel) -> dict[str, Any]:
    """How often stereoisomer pairs come out in the measured order.

    A pair is two CRC rows with the same InChIKey first block (connectivity) and different
    full InChIKeys whose measured boiling points differ by at least
    ``PAIR_MIN_DIFFERENCE_K``, of a connectivity that has cis/trans or E/Z isomers at all
    (``has_cis_trans``: a stereo double bond, or two stereocentres in one ring); a
    racemate against one of its enantiomers is not such a pair.  Structures are the
    records' (after ``repair_stereo``). "specified" keeps the pairs whose SMILES leave no
    stereo element unspecified (so the structures can differ at all); the pairs share a
    side of the split, and most are training rows.
    """
    from builder.chem.structure3d import unspecified_stereo

    groups: dict[str, list[Record]] = {}
    for record in records:
        groups.setdefault(record.inchikey[:14], []).append(record)
    pairs = []
    for group in groups.values():
        for i, first in enumerate(group):
            for second in group[i + 1:]:
                if first.inchikey == second.inchikey or abs(first.tb_K - second.tb_K) < PAIR_MIN_DIFFERENCE_K:
                    continue
                if not has_cis_trans(Chem.MolFromSmiles(first.smiles)):
                    continue
                estimates = [tree_estimate(Chem.MolFromSmiles(r.smiles), model).value_K for r in (first, second)]
                specified = not any(unspecified_stereo(Chem.MolFromSmiles(r.smiles)) for r in (first, second))
                right = (estimates[0] - estimates[1]) * (first.tb_K - second.tb_K) > 0
                pairs.append({"names": [first.name, second.name], "measured_K": [first.tb_K, second.tb_K],
                              "estimate_K": [round(e, 1) for e in estimates], "specified": specified,
                              "held_out": first.held_out, "right_order": right})
    chosen = [p for p in pairs if p["specified"]]
    return {
        "rule": f"same InChIKey[:14], different InChIKey, measured Tb differ by >= {PAIR_MIN_DIFFERENCE_K} K, "
                "cis/trans or E/Z isomers possible (a stereo double bond or two stereocentres in one ring); "
                "structures after the name-to-stereo repair",
        "n_rows_stereo_from_name": sum(r.stereo_from_name for r in records),
        "n": len(pairs), "right_order": sum(p["right_order"] for p in pairs),
        "n_held_out": sum(p["held_out"] for p in pairs),
        "right_order_held_out": sum(p["right_order"] for p in pairs if p["held_out"]),
        "n_specified": len(chosen), "right_order_specified": sum(p["right_order"] for p in chosen),
        "pairs": sorted(pairs, key=lambda p: p["names"]),
    }


def has_cis_trans(mol: Chem.Mol) -> bool:
    """True if the connectivity of ``mol`` has cis/trans or E/Z isomers: a possible stereo
    double bond, or two possible stereocentres in one ring."""
    flat = Chem.Mol(mol)
    Chem.RemoveStereochemistry(flat)
    found = list(Chem.FindPotentialStereo(flat))
    if any(i.type == Chem.StereoType.Bond_Double for i in found):
        return True
    centres = {i.centeredOn for i in found if i.type == Chem.StereoType.Atom_Tetrahedral}
    return any(len(centres & set(ring)) >= 2 for ring in flat.GetRingInfo().AtomRings())


def validate_rows(held: list[Record], funcs: dict[str, Any], main_method: str) -> dict[str, Any]:
    """Held-out accuracy by heavy-atom band of each estimator in ``funcs`` (name -> function of a
    molecule returning an object with ``value_K`` and ``interval90_K``); the worst cases of
    ``main_method`` are listed (shared with the melting-point fit)."""
    rows: dict[str, list[tuple[int, float | None, bool | None]]] = {k: [] for k in funcs}
    worst = []
    for record in held:
        mol = Chem.MolFromSmiles(record.smiles)
        band = _band_of(mol.GetNumHeavyAtoms())
        for name, func in funcs.items():
            est = func(mol)
            err = None if est.value_K is None else est.value_K - record.tb_K
            inside = None
            if est.interval90_K is not None:
                inside = est.interval90_K[0] <= record.tb_K <= est.interval90_K[1]
            rows[name].append((band, err, inside))
            if name == main_method and err is not None:
                worst.append((-abs(err), record.cas, record.name, record.tb_K, est.value_K))
    methods = {}
    for name, items in rows.items():
        table = {}
        for i, (low, high) in enumerate([(1, None)] + list(BANDS)):
            chosen = items if i == 0 else [t for t in items if t[0] == i - 1]
            label = "all" if i == 0 else (f"{low}-{high}" if high else f">={low}")
            stats = _stats([e for _, e, _ in chosen if e is not None], len(chosen))
            flags = [f for _, _, f in chosen if f is not None]
            if flags:
                stats["interval90_coverage"] = round(sum(flags) / len(flags), 4)
            table[label] = stats
        methods[name] = table
    return {
        "held_out": {"n": len(held), "rule": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT}"},
        "bands": "heavy atoms",
        "methods": methods,
        f"worst_{main_method}": [
            {"cas": c, "name": n, "measured_K": t, "estimate_K": v}
            for _, c, n, t, v in sorted(worst)[:15]
        ],
    }


def dumps(data: dict[str, Any]) -> str:
    """Serialise deterministically."""
    return json.dumps(data, sort_keys=True, indent=1, ensure_ascii=False) + "\n"


def format_table(validation: dict[str, Any]) -> str:
    """Return the accuracy table as plain text."""
    lines = [f"{'method':20s} {'band':>6s} {'n':>5s} {'cov':>6s} {'MAE':>6s} "
             f"{'median':>6s} {'bias':>6s} {'RMSE':>6s} {'in90':>6s}"]
    for name, table in validation["methods"].items():
        for band, s in table.items():
            fmt = lambda v: "   -  " if v is None else f"{v:6.2f}"  # noqa: E731
            lines.append(
                f"{name:20s} {band:>6s} {s['n']:5d} {s['coverage']:6.3f} {fmt(s['mae_K'])} "
                f"{fmt(s['median_ae_K'])} {fmt(s['bias_K'])} {fmt(s['rmse_K'])} "
                f"{fmt(s.get('interval90_coverage'))}"
            )
    pairs = validation.get("stereo_pairs")
    if pairs:
        lines.append(f"cis/trans and E/Z pairs in the measured order: {pairs['right_order']} of {pairs['n']}; "
                     f"with every stereo element specified: {pairs['right_order_specified']} of {pairs['n_specified']}; "
                     f"held out: {pairs.get('right_order_held_out')} of {pairs.get('n_held_out')}; "
                     f"rows given stereo from their names: {pairs.get('n_rows_stereo_from_name')}")
    return "\n".join(lines)


def fitting_command(prog: str, description: str, load, fit_model, validate_model, model_path, validation_path,
                    argv: list[str] | None = None) -> int:
    """The command line every tree model shares: refit and write, ``--check`` (refit in memory and
    compare with the shipped files; exit 1 on a difference) or ``--report`` (held-out accuracy of
    the shipped model). ``validate_model(records, model_dict)`` returns the validation table."""
    parser = argparse.ArgumentParser(prog=prog, description=description)
    parser.add_argument("--check", action="store_true", help="refit in memory and compare with the files")
    parser.add_argument("--report", action="store_true", help="print held-out accuracy of the shipped model")
    args = parser.parse_args(argv)
    records = load()
    if args.report:
        print(format_table(validate_model(records, json.loads(model_path.read_text()))))
        return 0
    model = fit_model(records)
    validation = validate_model(records, model)
    outputs = {model_path: dumps(model), validation_path: dumps(validation)}
    if args.check:
        stale = [p for p, text in outputs.items() if not p.exists() or p.read_text() != text]
        for path in stale:
            print(f"{path}: differs from a fresh fit", file=sys.stderr)
        return 1 if stale else 0
    for path, text in outputs.items():
        path.write_text(text, encoding="utf-8")
    print(format_table(validation))
    return 0


def main(argv: list[str] | None = None) -> int:
    """Run the command; return the exit code (1 if --check finds a difference)."""
    return fitting_command("python -m builder.fitting.boiling", __doc__.split("\n")[0], load_records, fit,
                           lambda records, model: validate(records, TreeModel(model)), MODEL_PATH, VALIDATION_PATH,
                           argv)


if __name__ == "__main__":
    raise SystemExit(main())
