"""Fit and validate the small-molecule boiling-point model (fitting and tests only).

Usage::

    python -m builder.fitting.boiling_small           # fit, write the model and validation files
    python -m builder.fitting.boiling_small --report  # print held-out accuracy of the shipped model

Data: CRC Handbook inorganic boiling points (``chemicals.miscdata.CRC_inorganic_data``,
column ``Tb``) with structures from ``chemicals.identifiers``; kept when the molecule is in
``builder.chem.boiling_small.small_domain`` and outside the organic model's domain (the
organic model covers the rest).  Split 80/20 by the SHA-256 of the InChIKey's first block
(``builder.fitting.boiling.split_hash``).  Ridge regression (λ = 1 on standardised
features) in numpy; the uncertainty is from 5-fold out-of-fold residuals on the training rows.
Baseline on the same held-out compounds: the training mean of ln Tb (no published
structure method covers this domain).
"""
from __future__ import annotations

import argparse
import json
import math
import statistics

import numpy as np
from rdkit import Chem, RDLogger

from builder.chem.boiling import check_structure
from builder.chem.boiling_small import (
    FEATURES,
    MODEL_PATH,
    small_domain,
    small_estimate,
    small_features,
)
from builder.fitting.boiling import (
    FOLDS,
    HELD_OUT_PERCENT,
    _quantile,
    dumps,
    split_hash,
)

VALIDATION_PATH = MODEL_PATH.parent / "boiling_small_validation.json"
LAMBDA = 1.0


def load_records() -> list[tuple[str, str, str, float, bool]]:
    from chemicals.identifiers import search_chemical
    from chemicals.miscdata import CRC_inorganic_data

    RDLogger.DisableLog("rdApp.*")
    out = []
    for cas, row in CRC_inorganic_data.dropna(subset=["Tb"]).iterrows():
        try:
            smiles = search_chemical(cas).smiles
        except ValueError:
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        if mol is None or small_domain(mol) != "OK" or check_structure(mol) == "OK":
            continue
        key = Chem.MolToInchiKey(mol)
        out.append((cas, str(row["Chemical"]), smiles, float(row["Tb"]), split_hash(key) < HELD_OUT_PERCENT))
    return sorted(out)


def _ridge(x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray, float, np.ndarray]:
    mean, scale = x.mean(axis=0), x.std(axis=0)
    scale[scale == 0] = 1.0
    z = (x - mean) / scale
    coef = np.linalg.solve(z.T @ z + LAMBDA * np.eye(z.shape[1]), z.T @ (y - y.mean()))
    return mean, scale, float(y.mean()), coef


def fit(records) -> dict:
    train = [r for r in records if not r[4]]
    x = np.array([small_features(Chem.MolFromSmiles(r[2])) for r in train])
    y = np.log([r[3] for r in train])
    fold = np.array([split_hash(Chem.MolToInchiKey(Chem.MolFromSmiles(r[2]))[::-1]) % FOLDS for r in train])
    oof = np.zeros(len(train))
    for k in range(FOLDS):
        mean, scale, b0, coef = _ridge(x[fold != k], y[fold != k])
        oof[fold == k] = b0 + ((x[fold == k] - mean) / scale) @ coef - y[fold == k]
    mean, scale, b0, coef = _ridge(x, y)
    return {
        "format": 1, "method": "small_molecule_ridge", "target": "ln(Tb/K)", "features": list(FEATURES),
        "mean": [round(float(v), 8) for v in mean], "scale": [round(float(v), 8) for v in scale],
        "intercept": round(b0, 8), "coef": [round(float(v), 8) for v in coef],
        "u_ln": round(math.sqrt(float(np.mean(oof ** 2))), 4),
        "half_width90_ln": round(_quantile([abs(float(e)) for e in oof], 0.90), 4),
        "training": {"source": "CRC Handbook inorganic boiling points via chemicals 1.5.2 (CRC_inorganic_data.Tb)",
                     "split": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT} held out",
                     "n_train": len(train), "ridge_lambda": LAMBDA,
                     "baseline_mean_ln_tb": round(float(y.mean()), 6)},
    }


def validate(records, model: dict) -> dict:
    held = [r for r in records if r[4]]
    errors, inside, base = [], [], []
    worst = []
    for cas, name, smiles, tb, _ in held:
        est = small_estimate(Chem.MolFromSmiles(smiles), model)
        errors.append(est.value_K - tb)
        inside.append(est.interval90_K[0] <= tb <= est.interval90_K[1])
        base.append(math.exp(model["training"]["baseline_mean_ln_tb"]) - tb)
        worst.append((-abs(est.value_K - tb), cas, name, tb, est.value_K))

    def stats(e):
        a = [abs(v) for v in e]
        return {"n": len(e), "mae_K": round(statistics.fmean(a), 2), "median_ae_K": round(statistics.median(a), 2),
                "bias_K": round(statistics.fmean(e), 2)}
    return {"held_out": {"n": len(held), "rule": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT}"},
            "methods": {"small_molecule_ridge": {**stats(errors),
                                                 "interval90_coverage": round(sum(inside) / len(inside), 4)},
                        "training_mean_baseline": stats(base)},
            "worst": [{"cas": c, "name": n, "measured_K": t, "estimate_K": v} for _, c, n, t, v in sorted(worst)[:10]]}


def format_table(v: dict) -> str:
    lines = [f"{'method':24s} {'n':>4s} {'MAE':>7s} {'median':>7s} {'bias':>7s} {'in90':>6s}"]
    for name, s in v["methods"].items():
        cov = s.get("interval90_coverage")
        lines.append(f"{name:24s} {s['n']:4d} {s['mae_K']:7.2f} {s['median_ae_K']:7.2f} {s['bias_K']:7.2f} "
                     f"{'   -  ' if cov is None else f'{cov:6.2f}'}")
    return "\n".join(lines)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python -m builder.fitting.boiling_small")
    parser.add_argument("--report", action="store_true")
    args = parser.parse_args(argv)
    records = load_records()
    if args.report:
        print(format_table(validate(records, json.loads(MODEL_PATH.read_text()))))
        return 0
    model = fit(records)
    validation = validate(records, model)
    MODEL_PATH.write_text(dumps(model), encoding="utf-8")
    VALIDATION_PATH.write_text(dumps(validation), encoding="utf-8")
    print(format_table(validation))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
