"""Fit and validate the Hansen-parameter model (fitting and tests only).

Usage::

    python -m builder.fitting.hansen           # fit, write hansen_model.json and hansen_validation.json
    python -m builder.fitting.hansen --check   # refit in memory, exit 1 if the files differ
    python -m builder.fitting.hansen --report  # print held-out accuracy of the shipped model

Contents
--------
- ``load_records()``: the four Hansen sets of ``chemicals.solubility`` merged per compound
  (``merge_sources``), structures from ``chemicals.identifiers``, kept if
  ``boiling.check_structure`` accepts them; split by the SHA-1 of the InChIKey's first block
  (as an integer, mod 5): 0 is held out, 1-4 train.
- ``fit(records)``: vocabulary, five tree ensembles (``MEMBERS``), uncertainty table
  (``hansen_model.json``).
- ``validate(records, model)``: held-out accuracy of the group method alone and of the model
  (``hansen_validation.json``).
- ``density_report()``: the liquid-density increments against CRC densities.

Which source is trusted (``merge_sources``)
-------------------------------------------
Pairwise over shared compounds (chemicals 1.5.2, MPa^½, mean absolute difference δD/δP/δH):
Alshehri-HSPiPy 0.05/0.33/0.23 (166 shared), Alshehri-Schrier 0.14/0.21/0.15 (84), but
Manuel & Ruben against each of the others 0.11-0.31/0.29-0.66/0.27-0.55 with 112 of 814
compounds beyond 1 MPa^½ against Alshehri (chloromethane δP 9.9 against 6.1 in the three
others).  Alshehri's set agrees best with the two independent smaller sets, so: with three or
more sets, the median of each component; otherwise the first set listing the compound in the
order Alshehri, HSPiPy, Schrier, Manuel & Ruben.

Settings (``LGB_PARAMS``, ``ROUNDS``, ``CONFLICT``, ``MEMBERS``) and the closure features
(``hansen.CLOSURE_FEATURES``) were chosen on 5-fold cross-validation of the training rows only
(training-CV MAE δD/δP/δH 0.49/1.52/1.20 MPa^½, ``training.cv_mae`` of the model file). The
held-out fifth was evaluated six times during development: before the conflict rule and the
boiling-point and dipole features; after them; for the model shipped then; after the conformer
ensemble shrank from eight conformers to six, which changes the dipole feature (training-CV
0.502/1.630/1.226 against 0.499/1.625/1.229 before; held-out 0.46/1.53/1.07 against
0.44/1.52/1.09, δD's change the spread of refitting trees on 259 compounds); with the closure
features (held-out 0.46/1.49/1.09); and with ``MEMBERS`` (held-out 0.44/1.51/1.08: the
training-CV gain of δP, 1.60 to 1.52, did not carry over to the held-out fifth).

Tried on training-CV and not kept (δP MAE against 1.60 for the residual-only model): the
distance-weighted values and residuals of the 1-10 nearest training compounds by Morgan
fingerprint (Tanimoto) as features, 1.60-1.62; kernel ridge regression with a Tanimoto kernel,
2.00-2.06 alone and 1.65-1.75 averaged with the trees; sample weights by source count, 1.60-1.64;
other LightGBM settings (L1 loss, 7 or 31 leaves, feature fraction 0.3, half the learning rate),
1.59-1.61; a square-root target, 1.53; predicting δD and δH first and feeding them to δP, 1.60.
Replacing our dipole estimate by the reference moments of ``chemicals.dipole`` (257 training
compounds) or our boiling point by ``chemicals.phase_change.Tb`` (847) changed δP by less than
0.03: the features' own errors are not what limits δP. With the value member (δP 1.516), adding
RDKit's whole 2D descriptor list (217), the 166 MACCS keys, or both gave 1.495, 1.497 and 1.490:
well short of the held-out target of 1.3 and not worth 600 features at run time.

Needs ``chemicals`` and ``lightgbm`` (fitting only; the runtime reads JSON).
"""
from __future__ import annotations

import argparse
import hashlib
import json
import math
import statistics
import sys
from dataclasses import dataclass
from typing import Any

from rdkit import Chem, RDLogger

from builder.chem.boiling import check_structure
from builder.chem.hansen import (
    COMPONENTS,
    MODEL_PATH,
    HansenModel,
    estimate_hansen,
    group_estimate,
    hansen_row,
)
from builder.fitting.boiling import _quantile, dumps, environment_vocabulary, export_trees

VALIDATION_PATH = MODEL_PATH.parent / "hansen_validation.json"
SOURCE_ORDER = ("alsheri_hansen_data", "hspipy_data", "wdr_schrier_data", "manuel_ruben_2022_data")
SOURCE_NAMES = {"alsheri_hansen_data": "Alshehri", "hspipy_data": "HSPiPy",
                "wdr_schrier_data": "Schrier", "manuel_ruben_2022_data": "Manuel-Ruben 2022"}
FOLDS = 5
TRIM_SIGMAS = 5.0
MIN_ENV_COUNT = 5
LGB_PARAMS = {
    "objective": "huber", "alpha": 1.0, "learning_rate": 0.03, "num_leaves": 15,
    "min_data_in_leaf": 5, "feature_fraction": 0.5, "bagging_fraction": 0.8, "extra_trees": True,
    "bagging_freq": 1, "lambda_l2": 1.0, "num_threads": 1, "seed": 0,
    "deterministic": True, "force_row_wise": True, "verbose": -1,
}
ROUNDS = 1200
CONFLICT = 1.5
MEMBERS = {"delta_d": ("residual", "value"), "delta_p": ("value",), "delta_h": ("residual", "value")}
"""What each component's ensembles learn (``residual``: the group estimate's error; ``value``: the
value itself, the group values being features) and so how the estimate is made (the mean of the
members).  Chosen on training-CV MAE, the same for LightGBM seeds 0, 1 and 2 (MPa^½, δD/δP/δH):
residual only 0.499-0.502/1.589-1.597/1.217-1.230; value only 0.494-0.500/1.516-1.521/1.216-1.225;
the mean of both 0.489-0.490/1.537-1.540/1.201-1.205."""


@dataclass(frozen=True)
class Record:
    """One compound: merged values [MPa^½], structure, split."""

    cas: str
    smiles: str
    inchikey: str
    values: tuple[float, float, float]
    n_sources: int
    held_out: bool
    conflict: bool = False


def split_fold(inchikey: str) -> int:
    """SHA-1 of the InChIKey's first block, as an integer, mod 5 (0 = held out)."""
    return int(hashlib.sha1(inchikey[:14].encode("ascii")).hexdigest(), 16) % 5


def merge_sources(rows: dict[str, tuple[float, float, float]]) -> tuple[float, float, float]:
    """One compound's values from the sets that list it (``rows``: set name -> values).

    Three or more sets: the median of each component; fewer: the first in ``SOURCE_ORDER``.

    >>> merge_sources({"manuel_ruben_2022_data": (15.3, 9.9, 3.9), "alsheri_hansen_data": (15.3, 6.1, 3.9),
    ...                "hspipy_data": (15.3, 6.1, 3.9)})
    (15.3, 6.1, 3.9)
    >>> merge_sources({"manuel_ruben_2022_data": (16.9, 13.0, 10.9), "alsheri_hansen_data": (16.2, 17.8, 5.9)})
    (16.2, 17.8, 5.9)
    """
    rows = {name: _undo_decimal_slip(v, rows) for name, v in rows.items()}
    if len(rows) >= 3:
        return tuple(statistics.median(v[i] for v in rows.values()) for i in range(3))
    for name in SOURCE_ORDER:
        if name in rows:
            return rows[name]
    raise ValueError("no source")


def _undo_decimal_slip(values: tuple[float, float, float],
                       rows: dict[str, tuple[float, float, float]]) -> tuple[float, float, float]:
    """Divide by ten a component that is ten times another set's value for the same compound
    (methyl methacrylate δH 54.0 in HSPiPy against 5.4 in Manuel & Ruben)."""
    fixed = list(values)
    for i, v in enumerate(values):
        if any(o[i] > 0 and 9.9 <= v / o[i] <= 10.1 for o in rows.values()):
            fixed[i] = round(v / 10.0, 3)
    return tuple(fixed)


def conflicting(rows: dict[str, tuple[float, float, float]]) -> bool:
    """True when exactly two sets list the compound and differ by more than ``CONFLICT`` MPa^½
    in a component (after undoing decimal slips): no third set says which is right, so the row
    is left out of training (it stays in the held-out table, with the value ``merge_sources``
    picks)."""
    if len(rows) != 2:
        return False
    a, b = (_undo_decimal_slip(v, rows) for v in rows.values())
    return max(abs(x - y) for x, y in zip(a, b)) > CONFLICT


def load_records() -> list[Record]:
    """The merged Hansen parameters usable for the model, sorted by CAS."""
    import chemicals.solubility as solubility
    from chemicals.identifiers import search_chemical

    RDLogger.DisableLog("rdApp.*")
    solubility._load_solubility_data()
    by_cas: dict[str, dict[str, tuple[float, float, float]]] = {}
    for name in SOURCE_ORDER:
        frame = getattr(solubility, name)
        for cas, row in frame.iterrows():
            values = (row["HANSEN_DELTA_D"], row["HANSEN_DELTA_P"], row["HANSEN_DELTA_H"])
            if any(v != v for v in values):
                continue
            by_cas.setdefault(str(cas), {})[name] = tuple(round(float(v) / 1000.0, 3) for v in values)
    records = []
    for cas in sorted(by_cas):
        try:
            smiles = search_chemical(cas).smiles
        except ValueError:
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        if check_structure(mol) != "OK":
            continue
        key = Chem.MolToInchiKey(mol)
        records.append(Record(cas, smiles, key, merge_sources(by_cas[cas]), len(by_cas[cas]),
                              split_fold(key) == 0, conflicting(by_cas[cas])))
    return records


def _train(x: Any, y: Any) -> Any:
    import lightgbm

    return lightgbm.train(LGB_PARAMS, lightgbm.Dataset(x, y), num_boost_round=ROUNDS)


def fit(records: list[Record]) -> dict[str, Any]:
    """Fit each component's tree ensembles (``MEMBERS``) on the training rows; return the
    JSON-ready model."""
    import numpy as np

    train = [r for r in records if not r.held_out and not r.conflict]
    vocab = environment_vocabulary(train)
    env_index = {k: i for i, k in enumerate(vocab)}
    rows, complete = [], []
    for r in train:
        x, g = hansen_row(Chem.MolFromSmiles(r.smiles), env_index)
        rows.append(x)
        complete.append(g.complete)
    x = np.array(rows, dtype=float)
    complete_arr = np.array(complete)
    usable = ~np.isnan(x[:, 0])
    fold = np.array([split_fold(r.inchikey[::-1]) for r in train])
    members, uncertainty, trimmed, cv_mae = {}, {}, {}, {}
    for c, component in enumerate(COMPONENTS):
        measured = np.array([r.values[c] for r in train])
        # what each member learns: the group estimate's error, or the value itself
        targets = {"residual": measured - x[:, c], "value": measured}
        offsets = {"residual": x[:, c], "value": np.zeros(len(train))}
        oof = np.full(len(train), np.nan)
        for k in range(FOLDS):
            fit_rows, test_rows = usable & (fold != k), usable & (fold == k)
            pred = np.mean([offsets[m][test_rows] + _train(x[fit_rows], targets[m][fit_rows]).predict(x[test_rows])
                            for m in MEMBERS[component]], axis=0)
            # out-of-fold error of the final estimate (clipped at zero like the runtime)
            oof[test_rows] = np.maximum(pred, 0.0) - measured[test_rows]
        cv_mae[component] = round(float(np.nanmean(np.abs(oof))), 3)
        sigma = 1.4826 * float(np.nanmedian(np.abs(oof)))
        keep = usable & (np.abs(np.nan_to_num(oof)) <= TRIM_SIGMAS * sigma)
        members[component] = []
        for m in MEMBERS[component]:
            booster = _train(x[keep], targets[m][keep])
            exported = {"target": m, "trees": export_trees(booster)}
            check = HansenModel({"environments": vocab, "members": {k: [exported] for k in COMPONENTS},
                                 "uncertainty": {}})
            for row, expected in zip(x[keep][:100], booster.predict(x[keep][:100])):
                if abs(check.members[component][0][1].residual(list(row)) - expected) > 1e-3:
                    raise RuntimeError("exported trees disagree with LightGBM")
            members[component].append(exported)
        trimmed[component] = int((usable & ~keep).sum())
        table = {}
        for label, mask in (("complete", complete_arr & usable), ("partial", ~complete_arr & usable)):
            res = [float(e) for e in oof[mask]]
            table[label] = {
                "n": len(res),
                "standard_uncertainty": round(math.sqrt(sum(e * e for e in res) / len(res)), 2),
                "half_width90": round(_quantile([abs(e) for e in res], 0.90), 2),
            }
        uncertainty[component] = table
    return {
        "format": 2,
        "method": "mathieu_trees",
        "members": members,
        "member_targets": {
            "residual": "measured delta minus the Mathieu (2018) group estimate over the keys it has "
                        "[MPa^0.5]; the estimate adds the group value back",
            "value": "measured delta [MPa^0.5]; the group values are among the features",
            "estimate": "mean of the component's members, clipped at zero",
        },
        "environments": vocab,
        "uncertainty": {
            **uncertainty,
            "basis": f"{FOLDS}-fold out-of-fold residuals on the training rows, by whether the group "
                     "tables cover the molecule",
            "standard_uncertainty": "root mean square residual",
            "interval90": "estimate +/- 90th percentile of absolute residual",
        },
        "training": {
            "source": "chemicals 1.5.2 solubility: " + ", ".join(SOURCE_NAMES[s] for s in SOURCE_ORDER),
            "merge": "median of each component over >= 3 sets, else first of " + " > ".join(
                SOURCE_NAMES[s] for s in SOURCE_ORDER),
            "split": "int(sha1(InChIKey[:14])) mod 5 == 0 held out",
            "n_train": len(train), "n_trimmed": trimmed, "cv_mae": cv_mae,
            "trim_rule": f"|out-of-fold residual| > {TRIM_SIGMAS} x 1.4826 x median |residual|",
            "lightgbm_params": LGB_PARAMS, "rounds": ROUNDS,
        },
    }


def _stats(errors: list[float]) -> dict[str, Any]:
    absolute = [abs(e) for e in errors]
    return {
        "n": len(errors),
        "mae": round(statistics.fmean(absolute), 3) if errors else None,
        "median_ae": round(statistics.median(absolute), 3) if errors else None,
        "bias": round(statistics.fmean(errors), 3) if errors else None,
        "rmse": round(math.sqrt(statistics.fmean([e * e for e in errors])), 3) if errors else None,
    }


def validate(records: list[Record], model: HansenModel) -> dict[str, Any]:
    """Held-out accuracy per component: the model on all compounds, and the model beside the
    group method alone on the compounds the group tables cover."""
    held = [r for r in records if r.held_out]
    ours: dict[str, list[float]] = {c: [] for c in COMPONENTS}
    ours_same: dict[str, list[float]] = {c: [] for c in COMPONENTS}
    group: dict[str, list[float]] = {c: [] for c in COMPONENTS}
    inside: dict[str, list[bool]] = {c: [] for c in COMPONENTS}
    u_used: dict[str, list[float]] = {c: [] for c in COMPONENTS}
    worst = []
    for r in held:
        mol = Chem.MolFromSmiles(r.smiles)
        est = estimate_hansen(mol, model)
        base = group_estimate(mol)
        if est.delta_d is None:
            continue
        values = (est.delta_d, est.delta_p, est.delta_h)
        us = (est.u_d, est.u_p, est.u_h)
        for c, component in enumerate(COMPONENTS):
            err = values[c] - r.values[c]
            ours[component].append(err)
            lo, hi = est.interval90[component]
            inside[component].append(lo <= r.values[c] <= hi)
            u_used[component].append(us[c])
            if base.delta_d is not None:
                group[component].append((base.delta_d, base.delta_p, base.delta_h)[c] - r.values[c])
                ours_same[component].append(err)
        worst.append((-max(abs(v - m) for v, m in zip(values, r.values)), r.cas, r.smiles,
                      r.values, values))
    table = {}
    for component in COMPONENTS:
        errors = ours[component]
        table[component] = {
            "model_all": _stats(errors),
            "model_where_group_defined": _stats(ours_same[component]),
            "group_method_alone": _stats(group[component]),
            "interval90_coverage": round(sum(inside[component]) / len(inside[component]), 3),
            "mean_standard_uncertainty": round(statistics.fmean(u_used[component]), 3),
            "rms_error_over_u": round(math.sqrt(statistics.fmean(
                [(e / u) ** 2 for e, u in zip(errors, u_used[component])])), 3),
        }
    return {
        "held_out": {"n": len(held), "n_estimated": len(ours["delta_d"]),
                     "n_group_defined": len(group["delta_d"]),
                     "rule": "int(sha1(InChIKey[:14])) mod 5 == 0"},
        "units": "MPa^0.5",
        "components": table,
        "targets_mae": {"delta_d": 0.45, "delta_p": 1.3, "delta_h": 1.2},
        "worst": [{"cas": c, "smiles": s, "measured": list(m), "estimate": list(v)}
                  for _, c, s, m, v in sorted(worst)[:15]],
    }


def format_table(validation: dict[str, Any]) -> str:
    """The held-out table as plain text."""
    h = validation["held_out"]
    lines = [f"held-out fifth: {h['n']} compounds, {h['n_estimated']} estimated, "
             f"{h['n_group_defined']} inside the group method's tables (MPa^0.5)",
             f"{'component':10s} {'estimator':28s} {'n':>5s} {'MAE':>6s} {'median':>6s} {'bias':>6s} {'RMSE':>6s}"]
    for component, t in validation["components"].items():
        for label in ("model_all", "model_where_group_defined", "group_method_alone"):
            s = t[label]
            lines.append(f"{component:10s} {label:28s} {s['n']:5d} {s['mae']:6.2f} {s['median_ae']:6.2f} "
                         f"{s['bias']:6.2f} {s['rmse']:6.2f}")
        lines.append(f"{component:10s} {'90% interval coverage':28s} {t['interval90_coverage']:6.3f}   "
                     f"mean u {t['mean_standard_uncertainty']:.2f}   RMS(err/u) {t['rms_error_over_u']:.2f}   "
                     f"target MAE <= {validation['targets_mae'][component]}")
    return "\n".join(lines)


def density_report() -> dict[str, Any]:
    """Liquid-density increments against CRC densities (chemicals CRC_organic_data['rho']) for
    organic compounds melting below 298.15 K (or with no melting point) in the model domain."""
    from chemicals.identifiers import search_chemical
    from chemicals.miscdata import CRC_organic_data

    from builder.chem.liquid_density import estimate_liquid_density

    RDLogger.DisableLog("rdApp.*")
    frame = CRC_organic_data.dropna(subset=["rho"])
    rel, n_total = [], 0
    for cas, row in frame.iterrows():
        if row["Tm"] == row["Tm"] and row["Tm"] >= 298.15:
            continue
        try:
            smiles = search_chemical(cas).smiles
        except ValueError:
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        if check_structure(mol) != "OK":
            continue
        n_total += 1
        est = estimate_liquid_density(mol)
        if est.density_kg_m3 is not None:
            rel.append(est.density_kg_m3 / float(row["rho"]) - 1.0)
    absolute = sorted(abs(e) for e in rel)
    return {"n": n_total, "n_estimated": len(rel),
            "mae_percent": round(100 * statistics.fmean(absolute), 2),
            "median_percent": round(100 * statistics.median(absolute), 2),
            "bias_percent": round(100 * statistics.fmean(rel), 2),
            "rms_percent": round(100 * math.sqrt(statistics.fmean([e * e for e in rel])), 2),
            "p90_percent": round(100 * _quantile(absolute, 0.9), 2)}


def main(argv: list[str] | None = None) -> int:
    """Refit and write, ``--check`` (exit 1 if the shipped files differ) or ``--report``."""
    parser = argparse.ArgumentParser(prog="python -m builder.fitting.hansen", description=__doc__.split("\n")[0])
    parser.add_argument("--check", action="store_true", help="refit in memory and compare with the files")
    parser.add_argument("--report", action="store_true", help="print held-out accuracy of the shipped model")
    parser.add_argument("--density", action="store_true", help="also print the liquid-density comparison")
    args = parser.parse_args(argv)
    records = load_records()
    if args.report:
        print(format_table(validate(records, HansenModel(json.loads(MODEL_PATH.read_text())))))
        if args.density:
            print("liquid density vs CRC:", json.dumps(density_report()))
        return 0
    model = fit(records)
    validation = validate(records, HansenModel(model))
    outputs = {MODEL_PATH: dumps(model), VALIDATION_PATH: dumps(validation)}
    if args.check:
        stale = [p for p, text in outputs.items() if not p.exists() or p.read_text() != text]
        for path in stale:
            print(f"{path}: differs from a fresh fit", file=sys.stderr)
        return 1 if stale else 0
    for path, text in outputs.items():
        path.write_text(text, encoding="utf-8")
    print(format_table(validation))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
