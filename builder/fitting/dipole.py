"""Fit and validate the dipole-moment correction (fitting and tests only).

Usage::

    python -m builder.fitting.dipole           # fit, write both data files
    python -m builder.fitting.dipole --check   # refit in memory, exit 1 if files differ
    python -m builder.fitting.dipole --report  # print held-out accuracy of the shipped model

Contents
--------
- ``load_records()``: every reference moment of ``chemicals`` 1.5.2 (CCCBDB, Muller,
  Poling; first table with a value, as ``chemicals.dipole.dipole_moment`` picks it) for
  neutral single molecules of at most 30 heavy atoms whose SMILES RDKit reads; split
  80/20 by the SHA-256 of the InChIKey's first block (below 20 of 100 held out), so
  stereoisomers share a side.
- ``prepare(records)``: conformer ensembles of ``builder.chem.structure3d`` (the very
  geometries the runtime uses), base charges (MMFF94, else Gasteiger-Marsili) and the
  bond-increment design of ``builder.chem.dipole.bond_increment_keys``. The 3D work is
  cached in ``CACHE_PATH`` (``/tmp/cohesion-dipole-features.pkl``, or
  ``$COHESION_DIPOLE_CACHE``), keyed by the RDKit version and the text of
  ``builder/chem/structure3d.py`` (a changed ensemble rule is a new cache): about 30 s the
  first time.
- ``fit(records)``: the two charge scales and the increments by robust penalised
  least squares (scipy, fitting only), penalty by 5-fold cross-validation; the
  uncertainty table by molecule family from out-of-sample residuals
  (``dipole_model.json``).
- ``validate(records, model)``: held-out accuracy by family and by number of torsions,
  beside the uncorrected MMFF94 charges (``dipole_validation.json``).

Needs ``chemicals`` and ``scipy`` (fitting only; the runtime reads JSON). A full fit
takes about 30-100 s of one core.
"""

from __future__ import annotations

import math
import statistics
import os
import pickle
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
from rdkit import Chem, RDLogger, rdBase

from builder.fitting.boiling import split_hash  # the same split rule as the boiling-point fit

HELD_OUT_PERCENT = 20
MAX_HEAVY_ATOMS = 30

CACHE_PATH = Path(os.environ.get("COHESION_DIPOLE_CACHE", Path(tempfile.gettempdir()) / "cohesion-dipole-features.pkl"))


@dataclass(frozen=True)
class Record:
    """One reference dipole moment with its structure and split."""

    cas: str
    name: str
    smiles: str
    inchikey: str
    dipole_D: float
    held_out: bool


def reference_molecule(cas: str):
    """(``chemicals`` identifier record, RDKit Mol) of a reference compound usable for the dipole
    comparison, or None: a SMILES that parses, one neutral component, at most ``MAX_HEAVY_ATOMS``
    heavy atoms (the rules the fit and ``tests/benchmarks/bench_profile.py`` share)."""
    from chemicals.identifiers import search_chemical

    try:
        meta = search_chemical(cas)
    except ValueError:
        return None
    mol = Chem.MolFromSmiles(meta.smiles) if meta.smiles else None
    if mol is None or "." in meta.smiles or Chem.GetFormalCharge(mol) != 0:
        return None
    if mol.GetNumHeavyAtoms() > MAX_HEAVY_ATOMS:
        return None
    return meta, mol


def load_records() -> list[Record]:
    """Return every usable reference moment of ``chemicals`` (CCCBDB, Muller, Poling), by CAS.

    Same rules as ``tests/benchmarks/bench_profile.py`` except that moments between 0.2 and 0.8 D
    are kept (they are real references; only the polar/non-polar count leaves them out).
    """
    from chemicals import dipole

    RDLogger.DisableLog("rdApp.*")
    dipole._load_dipole_data()
    tables = (dipole.dipole_data_CCDB, dipole.dipole_data_Muller, dipole.dipole_data_Poling)
    records = []
    for cas in sorted(set().union(*(set(t.index) for t in tables))):
        value = dipole.dipole_moment(cas)
        if value is None:
            continue
        found = reference_molecule(cas)
        if found is None:
            continue
        meta, mol = found
        key = Chem.MolToInchiKey(mol)
        if not key:
            continue
        records.append(Record(cas, meta.common_name, meta.smiles, key, float(value),
                              split_hash(key) < HELD_OUT_PERCENT))
    return records


def ensemble_data(smiles: str) -> dict[str, Any]:
    """Return what the fit needs of one molecule's conformer ensemble (cached by the caller)."""
    from builder.chem.structure3d import TEMPERATURE_K, canonical_smiles, conformer_ensemble

    key = canonical_smiles(smiles)
    ensemble = conformer_ensemble(key)
    return {
        "key": key, "ok": ensemble.ok, "status": ensemble.status,
        "positions": [ensemble.coordinates(c) for c in ensemble.conformer_ids],
        "weights": ensemble.weights(TEMPERATURE_K) if ensemble.ok else np.zeros(0),
        "energies": tuple(ensemble.energies_kcal_mol),
    }


@dataclass
class Prepared:
    """One molecule ready for the fit: base moments and increment design per conformer."""

    record: Record
    base: str | None  # "mmff", "gasteiger", or None (single atom: moment 0)
    weights: np.ndarray
    base_moments: np.ndarray  # (conformers, 3) [D]
    terms: dict[str, np.ndarray]  # key -> (conformers, 3) [D per e of increment]
    family: str
    torsions: int


def features_version() -> str:
    """What the cached 3D work depends on: the RDKit version and the ensemble code's text."""
    import hashlib

    import rdkit

    from builder.chem import structure3d

    code = Path(structure3d.__file__).read_bytes()
    return f"{rdkit.__version__} {hashlib.sha256(code).hexdigest()[:16]}"


def load_features(records: list[Record]) -> dict[str, dict[str, Any]]:
    """Return :func:`ensemble_data` of every record, read from (and added to) ``CACHE_PATH``."""
    version = features_version()
    cache: dict[str, Any] = {}
    if CACHE_PATH.exists():
        try:
            with CACHE_PATH.open("rb") as handle:
                stored = pickle.load(handle)  # our own file under /tmp, written below
            if stored.get("version") == version:
                cache = stored["data"]
        except (OSError, pickle.UnpicklingError, EOFError, KeyError, AttributeError):
            cache = {}
    missing = [r.smiles for r in records if r.smiles not in cache]
    if missing:
        blocker = rdBase.BlockLogs()
        for smiles in missing:
            cache[smiles] = ensemble_data(smiles)
        del blocker
        tmp = CACHE_PATH.with_suffix(".tmp")
        with tmp.open("wb") as handle:
            pickle.dump({"version": version, "data": cache}, handle)
        os.replace(tmp, CACHE_PATH)
    return cache


def prepare(records: list[Record]) -> list[Prepared]:
    """Turn records into fit rows; molecules without any charge model or ensemble are left out."""
    from rdkit.Chem import Descriptors

    from builder.chem.dipole import DEBYE_PER_E_ANGSTROM, _charges, bond_increment_keys, molecule_family
    from builder.chem.structure3d import count_torsions

    features = load_features(records)
    rows = []
    for record in records:
        data = features[record.smiles]
        if not data["ok"]:
            continue
        mol = Chem.AddHs(Chem.MolFromSmiles(data["key"]))
        family, torsions = molecule_family(mol), count_torsions(mol)
        n_conf = len(data["positions"])
        if mol.GetNumAtoms() == 1:
            rows.append(Prepared(record, None, np.ones(1), np.zeros((1, 3)), {}, family, 0))
            continue
        if Descriptors.NumRadicalElectrons(mol):
            continue
        q, _, _ = _charges(mol, "mmff")
        base = "mmff"
        if q is None:
            q, _, _ = _charges(mol, "gasteiger")
            base = "gasteiger"
        if q is None:
            continue
        positions = data["positions"]
        moments = DEBYE_PER_E_ANGSTROM * np.array([q @ p for p in positions])
        terms: dict[str, np.ndarray] = {}
        for key, i, j, factor in bond_increment_keys(mol):
            vector = factor * DEBYE_PER_E_ANGSTROM * np.array([p[i] - p[j] for p in positions])
            terms[key] = terms.get(key, np.zeros((n_conf, 3))) + vector
        rows.append(Prepared(record, base, np.asarray(data["weights"]), moments, terms, family, torsions))
    return rows


MIN_KEY_COUNT = {"a:": 3, "e:": 3}
"""An increment is fitted only for keys found in at least this many training molecules (by
kind). Measured: a count of one for element pairs gave a worse 5-fold CV MAE (0.313 against
0.307 D); bonds of rarer pairs keep only the scaled base charges (methyl iodide is one)."""
PENALTIES = (3.0, 10.0, 30.0)
"""Ridge weights tried for the atom-class increments (chosen by 5-fold cross-validation)."""
ELEMENT_PENALTY_RATIO = 0.3
"""Ridge weight of the element-pair increments relative to the atom-class ones (they are
few and well populated)."""
LOSS_SCALE_D = 0.3
"""Soft-L1 loss scale [D]: residuals beyond it count about linearly (robust to bad rows)."""
FOLDS = 5
CLEAR_BELOW_D, CLEAR_ABOVE_D = 0.2, 0.8


def vocabulary(rows: list[Prepared]) -> list[str]:
    counts: dict[str, int] = {}
    for row in rows:
        for key in row.terms:
            counts[key] = counts.get(key, 0) + 1
    return sorted(k for k, n in counts.items() if n >= MIN_KEY_COUNT[k[:2]])


def _design(row: Prepared, index: dict[str, int]) -> np.ndarray:
    design = np.zeros((len(row.weights), 3, len(index)))
    for key, vector in row.terms.items():
        if key in index:
            design[:, :, index[key]] = vector
    return design


def predict(row: Prepared, scales: dict[str, float], increments: dict[str, float]) -> float:
    """Boltzmann RMS moment [D] of a prepared row under given parameters."""
    if row.base is None:
        return 0.0
    moments = scales[row.base] * row.base_moments
    for key, vector in row.terms.items():
        moments = moments + increments.get(key, 0.0) * vector
    return math.sqrt(float(row.weights @ (moments ** 2).sum(axis=1)))


def fit_parameters(rows: list[Prepared], penalty: float) -> tuple[dict[str, float], dict[str, float]]:
    """Fit the two charge scales and the bond increments by robust penalised least squares."""
    from scipy.optimize import least_squares  # fitting only

    rows = [r for r in rows if r.base is not None]
    keys = vocabulary(rows)
    index = {k: i for i, k in enumerate(keys)}
    designs = [_design(r, index) for r in rows]
    bases = np.array([0 if r.base == "mmff" else 1 for r in rows])
    refs = np.array([r.record.dipole_D for r in rows])
    lam = np.sqrt(np.array([penalty * (1.0 if k.startswith("a:") else ELEMENT_PENALTY_RATIO) for k in keys]))
    n = len(rows)

    def parts(p):
        values, jac = np.empty(n), np.zeros((n, len(p)))
        for m, (row, design) in enumerate(zip(rows, designs)):
            moments = p[bases[m]] * row.base_moments + design @ p[2:]
            value = math.sqrt(float(row.weights @ (moments ** 2).sum(axis=1)) + 1e-12)
            weighted = row.weights[:, None] * moments / value
            values[m] = value
            jac[m, bases[m]] = float((weighted * row.base_moments).sum())
            jac[m, 2:] = np.einsum("cx,cxk->k", weighted, design)
        return values, jac

    def residuals(p):
        return np.concatenate([parts(p)[0] - refs, lam * p[2:]])

    def jacobian(p):
        penalty_rows = np.zeros((len(keys), len(p)))
        penalty_rows[:, 2:] = np.diag(lam)
        return np.vstack([parts(p)[1], penalty_rows])

    start = np.zeros(2 + len(keys))
    start[:2] = 1.0
    solution = least_squares(residuals, start, jac=jacobian, loss="soft_l1", f_scale=LOSS_SCALE_D,
                             x_scale="jac", max_nfev=400)
    p = solution.x
    return ({"mmff": float(p[0]), "gasteiger": float(p[1])},
            {k: float(v) for k, v in zip(keys, p[2:])})


def fold_of(record: Record) -> int:
    return split_hash(record.inchikey[::-1]) % FOLDS


def choose_penalty(train: list[Prepared]) -> tuple[float, dict[float, float]]:
    """Return the penalty with the lowest 5-fold cross-validated MAE, and every CV MAE."""
    scores = {}
    for penalty in PENALTIES:
        errors = []
        for k in range(FOLDS):
            scales, increments = fit_parameters([r for r in train if fold_of(r.record) != k], penalty)
            errors += [abs(predict(r, scales, increments) - r.record.dipole_D)
                       for r in train if fold_of(r.record) == k]
        scores[penalty] = round(statistics.fmean(errors), 4)
    return min(scores, key=lambda p: (scores[p], p)), scores


TORSION_BANDS = ((0, 0), (1, 2), (3, None))


def _torsion_band(torsions: int) -> str:
    for low, high in TORSION_BANDS:
        if torsions >= low and (high is None or torsions <= high):
            return f"{low}" if low == high else (f"{low}-{high}" if high is not None else f">={low}")
    raise ValueError(torsions)


def _figures(pairs: list[tuple[float, float]]) -> dict[str, Any]:
    """Summary of (estimate, reference) pairs [D]; agreement only over clear references."""
    errors = [e - r for e, r in pairs]
    clear = [(e, r) for e, r in pairs if not CLEAR_BELOW_D <= r <= CLEAR_ABOVE_D]
    out: dict[str, Any] = {"n": len(pairs)}
    if errors:
        out.update(
            mae_D=round(statistics.fmean(abs(e) for e in errors), 3),
            median_ae_D=round(statistics.median(abs(e) for e in errors), 3),
            bias_D=round(statistics.fmean(errors), 3),
            rms_D=round(math.sqrt(statistics.fmean(e * e for e in errors)), 3),
        )
    if clear:
        out["n_clear"] = len(clear)
        out["mae_clear_D"] = round(statistics.fmean(abs(e - r) for e, r in clear), 3)
        out["polar_agreement_clear"] = round(
            statistics.fmean(float((e > 0.5) == (r > 0.5)) for e, r in clear), 4)
    return out


def out_of_sample(rows: list[Prepared], penalty: float, scales, increments) -> list[tuple[Prepared, float]]:
    """(row, estimate) for every row predicted by a fit that did not see it: 5-fold
    out-of-fold on the training rows, the final fit on the held-out rows."""
    train = [r for r in rows if not r.record.held_out]
    result = [(r, predict(r, scales, increments)) for r in rows if r.record.held_out]
    for k in range(FOLDS):
        fold_scales, fold_increments = fit_parameters([r for r in train if fold_of(r.record) != k], penalty)
        result += [(r, predict(r, fold_scales, fold_increments)) for r in train if fold_of(r.record) == k]
    return result


def fit(records: list[Record]) -> dict[str, Any]:
    """Fit the recalibration on the training rows; return the JSON-ready model."""
    from builder.chem.dipole import FAMILIES

    rows = prepare(records)
    train = [r for r in rows if not r.record.held_out]
    penalty, cv_scores = choose_penalty(train)
    scales, increments = fit_parameters(train, penalty)
    samples = out_of_sample(rows, penalty, scales, increments)
    families = {}
    for family in FAMILIES:
        errors = [est - r.record.dipole_D for r, est in samples if r.family == family]
        families[family] = {
            "n": len(errors),
            "standard_uncertainty_D": round(math.sqrt(statistics.fmean(e * e for e in errors)), 2),
            "mae_D": round(statistics.fmean(abs(e) for e in errors), 2),
        }
    every = [est - r.record.dipole_D for r, est in samples]
    return {
        "format": 1,
        "method": "recalibrated point charges: q = s_base * q_base + bond increments",
        "scale": {k: round(v, 6) for k, v in scales.items()},
        "increments": {k: round(v, 6) for k, v in sorted(increments.items())},
        "uncertainty": {
            "basis": ("out-of-sample residuals: 5-fold out-of-fold on the training rows plus the "
                      "final fit on the held-out rows"),
            "standard_uncertainty": "root mean square residual of the family",
            "all_D": round(math.sqrt(statistics.fmean(e * e for e in every)), 2),
            "families": families,
        },
        "training": {
            "source": "chemicals 1.5.2 dipole tables (CCCBDB, Muller, Poling), first available per CAS",
            "split": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT} held out",
            "folds": "sha256(reversed InChIKey[:14]) mod 100 mod 5",
            "n_train": len(train), "n_held_out": len(rows) - len(train),
            "min_key_count": dict(MIN_KEY_COUNT), "penalty": penalty, "cv_mae_D": {str(k): v for k, v in cv_scores.items()},
            "element_penalty_ratio": ELEMENT_PENALTY_RATIO, "loss": f"soft_l1, scale {LOSS_SCALE_D} D",
        },
    }


def validate(records: list[Record], model: dict[str, Any]) -> dict[str, Any]:
    """Held-out accuracy of the model and of the uncorrected MMFF94 route, by family and by
    flexibility (conformational torsions)."""
    from builder.chem.dipole import FAMILIES

    rows = [r for r in prepare(records) if r.record.held_out]
    raw = {"mmff": 1.0, "gasteiger": 1.0}
    pairs = {name: [(predict(r, scales, inc), r.record.dipole_D) for r in rows]
             for name, scales, inc in (("recalibrated", model["scale"], model["increments"]),
                                       ("uncorrected", raw, {}))}
    table: dict[str, Any] = {}
    for name, values in pairs.items():
        by: dict[str, Any] = {"all": _figures(values)}
        for family in FAMILIES:
            by[f"family {family}"] = _figures([p for p, r in zip(values, rows) if r.family == family])
        for low, high in TORSION_BANDS:
            label = _torsion_band(low)
            by[f"torsions {label}"] = _figures([p for p, r in zip(values, rows) if _torsion_band(r.torsions) == label])
        table[name] = by
    worst = sorted(((abs(e - r.record.dipole_D), r, e) for (e, _), r in zip(pairs["recalibrated"], rows)),
                   key=lambda t: (-t[0], t[1].record.cas))[:15]
    return {
        "held_out": {"n": len(rows), "rule": f"sha256(InChIKey[:14]) mod 100 < {HELD_OUT_PERCENT}",
                     "clear": f"reference below {CLEAR_BELOW_D} D or above {CLEAR_ABOVE_D} D"},
        "methods": table,
        "worst_recalibrated": [
            {"cas": r.record.cas, "name": r.record.name, "smiles": r.record.smiles,
             "reference_D": r.record.dipole_D, "estimate_D": round(e, 3)} for _, r, e in worst],
    }


def format_table(validation: dict[str, Any]) -> str:
    """Return the held-out accuracy table as plain text."""
    lines = [f"{'route':13s} {'subset':26s} {'n':>4s} {'MAE':>6s} {'RMS':>6s} {'bias':>6s} "
             f"{'n_cl':>5s} {'MAE_cl':>6s} {'agree':>6s}"]
    for name, by in validation["methods"].items():
        for subset, s in by.items():
            fmt = lambda v: "   -  " if v is None else f"{v:6.3f}"  # noqa: E731
            lines.append(f"{name:13s} {subset:26s} {s['n']:4d} {fmt(s.get('mae_D'))} {fmt(s.get('rms_D'))} "
                         f"{fmt(s.get('bias_D'))} {s.get('n_clear', 0):5d} {fmt(s.get('mae_clear_D'))} "
                         f"{fmt(s.get('polar_agreement_clear'))}")
    return "\n".join(lines)


def main(argv: list[str] | None = None) -> int:
    """Run the command; return the exit code (1 if --check finds a difference)."""
    from builder.chem.dipole import MODEL_PATH
    from builder.fitting import boiling

    validation_path = MODEL_PATH.parent / "dipole_validation.json"
    original = boiling.format_table
    boiling.format_table = format_table  # the shared command prints our own table
    try:
        return boiling.fitting_command("python -m builder.fitting.dipole", __doc__.split("\n")[0],
                                       load_records, fit, validate, MODEL_PATH, validation_path, argv)
    finally:
        boiling.format_table = original


if __name__ == "__main__":
    raise SystemExit(main())
