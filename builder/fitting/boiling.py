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
- ``fit(records)``: vocabulary, trees, uncertainty table (``boiling_model.json``).
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

from builder.chem.boiling import (
    DESCRIPTORS,
    MODEL_PATH,
    STEREO_FEATURES,
    TreeModel,
    atom_environments,
    check_structure,
    descriptor_row,
    joback_estimate,
    joback_stein_brown_estimate,
    stereo_features,
    tree_estimate,
)
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
    return sorted(records, key=lambda r: r.cas)


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
    y = np.array([r.tb_K for r in train]) - base
    fold = np.array([split_hash(r.inchikey[::-1]) % FOLDS for r in train])
    oof = np.zeros(len(train))
    for k in range(FOLDS):
        oof[fold == k] = _train(x[fold != k], y[fold != k]).predict(x[fold == k]) - y[fold == k]
    sigma = 1.4826 * float(np.median(np.abs(oof)))
    keep = np.abs(oof) <= TRIM_SIGMAS * sigma
    booster = _train(x[keep], y[keep])
    trees = export_trees(booster)
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
    for row, expected in zip(x[:200], booster.predict(x[:200])):
        if abs(check.residual(list(row)) - expected) > 1e-3:
            raise RuntimeError("exported trees disagree with LightGBM")
    return model


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
    ``PAIR_MIN_DIFFERENCE_K``. "specified" keeps the pairs whose SMILES leave no stereo
    element unspecified (so the structures can differ at all); the pairs share a side of
    the split, and most are training rows.
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
                estimates = [tree_estimate(Chem.MolFromSmiles(r.smiles), model).value_K for r in (first, second)]
                specified = not any(unspecified_stereo(Chem.MolFromSmiles(r.smiles)) for r in (first, second))
                right = (estimates[0] - estimates[1]) * (first.tb_K - second.tb_K) > 0
                pairs.append({"names": [first.name, second.name], "measured_K": [first.tb_K, second.tb_K],
                              "estimate_K": [round(e, 1) for e in estimates], "specified": specified,
                              "held_out": first.held_out, "right_order": right})
    chosen = [p for p in pairs if p["specified"]]
    return {
        "rule": f"same InChIKey[:14], different InChIKey, measured Tb differ by >= {PAIR_MIN_DIFFERENCE_K} K",
        "n": len(pairs), "right_order": sum(p["right_order"] for p in pairs),
        "n_specified": len(chosen), "right_order_specified": sum(p["right_order"] for p in chosen),
        "pairs": sorted(pairs, key=lambda p: p["names"]),
    }


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
        lines.append(f"stereoisomer pairs in the measured order: {pairs['right_order']} of {pairs['n']}; "
                     f"with every stereo element specified: {pairs['right_order_specified']} of {pairs['n_specified']}")
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
