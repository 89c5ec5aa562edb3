"""Held-out and reference figures of the physical-state estimators, side by side.

Run ``python tools/report_state.py`` from the repository root (needs the test-only package
``chemicals``); ``--write`` also stores the flammability-limit table as
``builder/data/flammability_validation.json`` (shown on the methods page).  It prints:

- melting point (``builder.fitting.melting``): the default estimator beside Joback Tf alone on
  the held-out 20 % of the CRC organic melting points (recomputed from the shipped model);
- boiling point of small non-organic molecules (``builder.fitting.boiling_small``): beside the
  training-mean baseline on the held-out CRC inorganic compounds;
- flammability limits by Jones's correlation (``builder.chem.state.jones_limits``) against
  the IEC 60079-20-1 (2010) table in ``chemicals.safety`` for every C/H/O/N compound listed
  there (Jones is not fitted, so every row counts as held out): MAE and median in vol %,
  the share inside the 90 % interval (±1.645 × 25 %), beside the baseline of a constant equal
  to the median of the table.
"""
from __future__ import annotations

import argparse
import json
import statistics
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

LIMITS_PATH = ROOT / "builder" / "data" / "flammability_validation.json"


def _stats(errors, inside=None):
    a = [abs(e) for e in errors]
    out = {"n": len(errors), "mae": round(statistics.fmean(a), 3), "median_ae": round(statistics.median(a), 3),
           "bias": round(statistics.fmean(errors), 3)}
    if inside is not None:
        out["interval90_coverage"] = round(sum(inside) / len(inside), 4)
    return out


def limits_table() -> dict:
    from chemicals import safety
    from chemicals.identifiers import search_chemical
    from rdkit import Chem, RDLogger

    from builder.chem.state import K90, jones_limits

    RDLogger.DisableLog("rdApp.*")
    safety._load_safety_data()
    frame = safety.IEC_2010_data
    rows = []
    for cas, row in frame.iterrows():
        lfl, ufl = row["LFL"], row["UFL"]
        if lfl != lfl:  # NaN
            continue
        try:
            mol = Chem.MolFromSmiles(search_chemical(cas).smiles)
        except Exception:  # noqa: BLE001 - identifiers the lookup cannot resolve are skipped
            continue
        if mol is None:
            continue
        counts = {}
        for atom in Chem.AddHs(mol).GetAtoms():
            counts[atom.GetSymbol()] = counts.get(atom.GetSymbol(), 0) + 1
        if not set(counts) <= {"C", "H", "O", "N"} or "C" not in counts:
            continue
        est = jones_limits(counts["C"], counts.get("H", 0), counts.get("O", 0))
        if est is None:
            continue
        rows.append((cas, 100 * lfl, None if ufl != ufl else 100 * ufl, est[0], est[1]))
    out = {"source": "IEC 60079-20-1 (2010) via chemicals 1.5.2 (safety.IEC_2010_data)", "unit": "vol %",
           "interval90": "estimate +/- 1.645 x 25 %"}
    for i, name in ((1, "lfl"), (2, "ufl")):
        pairs = [(r[i], r[i + 2]) for r in rows if r[i] is not None]
        errors = [e - m for m, e in pairs]
        inside = [abs(e - m) <= K90 * 0.25 * e for m, e in pairs]
        median = statistics.median(m for m, _ in pairs)
        out[name] = {"jones": _stats(errors, inside), "constant_median_baseline": _stats([median - m for m, _ in pairs])}
    return out


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python tools/report_state.py")
    parser.add_argument("--write", action="store_true", help="store the flammability-limit table")
    args = parser.parse_args(argv)
    from builder.fitting import boiling_small, melting

    print("Melting point, held-out CRC organic (K):")
    melting.main(["--report"])
    print("\nBoiling point of small non-organic molecules, held-out CRC inorganic (K):")
    boiling_small.main(["--report"])
    table = limits_table()
    print(f"\nFlammability limits, Jones (1938) against {table['source']} ({table['unit']}):")
    print(f"{'limit':6s} {'method':26s} {'n':>4s} {'MAE':>7s} {'median':>7s} {'bias':>7s} {'in90':>6s}")
    for name in ("lfl", "ufl"):
        for method, s in table[name].items():
            cov = s.get("interval90_coverage")
            print(f"{name.upper():6s} {method:26s} {s['n']:4d} {s['mae']:7.2f} {s['median_ae']:7.2f} {s['bias']:7.2f} "
                  f"{'   -  ' if cov is None else f'{cov:6.2f}'}")
    if args.write:
        LIMITS_PATH.write_text(json.dumps(table, sort_keys=True, indent=1) + "\n", encoding="utf-8")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
