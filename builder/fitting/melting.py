"""Fit and validate the melting-point model (fitting and tests only).

Usage::

    python -m builder.fitting.melting           # fit, write melting_model.json and melting_validation.json
    python -m builder.fitting.melting --check   # refit in memory, exit 1 if the files differ
    python -m builder.fitting.melting --report  # print held-out accuracy of the shipped model

Data: CRC Handbook organic melting points (``chemicals.miscdata.CRC_organic_data``,
column ``Tm``), structures from ``chemicals.identifiers``; the same rules as the
boiling-point model (``builder.fitting.boiling``): structures the organic domain check
accepts, the element-name identifier check, the 80/20 split by the SHA-256 of the
InChIKey's first block, 5-fold out-of-fold residuals for the uncertainty table and the
trimming of training rows beyond ``TRIM_SIGMAS`` robust standard deviations.  Held-out
rows are never trimmed.  Needs ``chemicals`` and ``lightgbm``.
"""
from __future__ import annotations

import math
from typing import Any

from rdkit import Chem, RDLogger

from builder.chem.boiling import TreeModel, check_structure
from builder.chem.melting import (
    EXTRA_FEATURES,
    MODEL_PATH,
    joback_tf_estimate,
    melting_row,
    tree_estimate,
)
from builder.fitting.boiling import (
    BANDS,
    FOLDS,
    HELD_OUT_PERCENT,
    TRIM_SIGMAS,
    Record,
    _band_of,
    _quantile,
    environment_vocabulary,
    export_trees,
    fitting_command,
    name_mismatch,
    split_hash,
    validate_rows,
)

VALIDATION_PATH = MODEL_PATH.parent / "melting_validation.json"
LGB_PARAMS = {
    "objective": "huber", "alpha": 30.0, "learning_rate": 0.05, "num_leaves": 31,
    "min_data_in_leaf": 10, "feature_fraction": 0.5, "bagging_fraction": 0.8,
    "bagging_freq": 1, "lambda_l2": 1.0, "num_threads": 1, "seed": 0,
    "deterministic": True, "force_row_wise": True, "verbose": -1,
}
ROUNDS = 600


def load_records() -> list[Record]:
    """CRC organic melting points usable for the model, sorted by CAS (``tb_K`` holds Tm)."""
    from chemicals.identifiers import search_chemical
    from chemicals.miscdata import CRC_organic_data

    RDLogger.DisableLog("rdApp.*")
    frame = CRC_organic_data.dropna(subset=["Tm"])
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
        records.append(Record(cas, str(row["Name"]), smiles, key, float(row["Tm"]),
                              split_hash(key) < HELD_OUT_PERCENT))
    return sorted(records, key=lambda r: r.cas)


def _train(x: Any, y: Any) -> Any:
    import lightgbm

    return lightgbm.train(LGB_PARAMS, lightgbm.Dataset(x, y), num_boost_round=ROUNDS)


def fit(records: list[Record]) -> dict[str, Any]:
    import numpy as np

    train = [r for r in records if not r.held_out]
    vocab = environment_vocabulary(train)
    env_index = {k: i for i, k in enumerate(vocab)}
    mols = [Chem.MolFromSmiles(r.smiles) for r in train]
    x = np.array([melting_row(m, env_index) for m in mols])
    base = x[:, -2]
    y = np.array([r.tb_K for r in train]) - base
    fold = np.array([split_hash(r.inchikey[::-1]) % FOLDS for r in train])
    oof = np.zeros(len(train))
    for k in range(FOLDS):
        oof[fold == k] = _train(x[fold != k], y[fold != k]).predict(x[fold == k]) - y[fold == k]
    sigma = 1.4826 * float(np.median(np.abs(oof)))
    keep = np.abs(oof) <= TRIM_SIGMAS * sigma
    booster = _train(x[keep], y[keep])
    heavy = [m.GetNumHeavyAtoms() for m in mols]
    bands = []
    for i, (low, high) in enumerate(BANDS):
        res = [float(oof[j]) for j in range(len(train)) if _band_of(heavy[j]) == i]
        bands.append({
            "min_heavy_atoms": low, "max_heavy_atoms": high, "n": len(res),
            "standard_uncertainty_K": round(math.sqrt(sum(e * e for e in res) / len(res)), 1),
            "half_width90_K": round(_quantile([abs(e) for e in res], 0.90), 1),
        })
    model = {
        "format": 1,
        "method": "joback_tf_trees",
        "target": "Tm [K] minus the Joback Tf sum over assigned atoms",
        "extra_features": list(EXTRA_FEATURES),
        "environments": vocab,
        "trees": export_trees(booster),
        "uncertainty": {
            "basis": f"{FOLDS}-fold out-of-fold residuals on the training rows",
            "standard_uncertainty": "root mean square residual in the band",
            "interval90": "estimate +/- 90th percentile of absolute residual in the band",
            "heavy_atom_bands": bands,
        },
        "training": {
            "source": "CRC Handbook organic melting points via chemicals 1.5.2 (CRC_organic_data.Tm)",
            "split": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT} held out",
            "n_train": len(train), "n_trimmed": int((~keep).sum()),
            "trim_threshold_K": round(TRIM_SIGMAS * sigma, 1),
            "lightgbm_params": LGB_PARAMS, "rounds": ROUNDS,
        },
    }
    check = TreeModel(model)
    for row, expected in zip(x[:200], booster.predict(x[:200])):
        if abs(check.residual(list(row)) - expected) > 1e-3:
            raise RuntimeError("exported trees disagree with LightGBM")
    return model


def validate(records: list[Record], model: TreeModel) -> dict[str, Any]:
    """Held-out accuracy by heavy-atom band: Joback Tf alone and the default method."""
    funcs = {"joback_tf": joback_tf_estimate, "joback_tf_trees": lambda m: tree_estimate(m, model)}
    return validate_rows([r for r in records if r.held_out], funcs, "joback_tf_trees")


def main(argv: list[str] | None = None) -> int:
    """Run the command; return the exit code (1 if --check finds a difference)."""
    return fitting_command("python -m builder.fitting.melting", __doc__.split("\n")[0], load_records, fit,
                           lambda records, model: validate(records, TreeModel(model)), MODEL_PATH, VALIDATION_PATH,
                           argv)


if __name__ == "__main__":
    raise SystemExit(main())
