"""Benchmark of the intermolecular-force profile (a script, not a test).

The reference set: ``chemicals.dipole.dipole_moment(CAS)`` (first available of
CCCBDB -- NIST Computational Chemistry Comparison and Benchmark Database, experimental
values --, Muller, Poling -- The Properties of Gases and Liquids, 5th ed.) over the
union of the three tables; SMILES from ``chemicals.identifiers.search_chemical``.

Run from the repository root::

    python tests/benchmarks/bench_profile.py            # whole reference set
    python tests/benchmarks/bench_profile.py --limit 100

Prints, for the neutral single molecules of the reference set with at most 30 heavy
atoms whose reference moment is below 0.2 D or above 0.8 D (:func:`reference_dipoles`,
also used by the tests through ``tests/chem/conftest.py``):

- polar / non-polar agreement at the 0.5 D cut and the mean absolute error [D] of
  the default route (recalibrated MMFF94 charges, recalibrated Gasteiger fallback;
  ``builder/data/dipole_model.json``) on the whole set and on its held-out 20 % (the
  split of ``builder.fitting.dipole``: SHA-256 of the InChIKey's first block), and of
  the uncorrected MMFF94 and Gasteiger charge models for comparison;
- the median wall time of an uncached :func:`force_profile` call [ms], single thread.
"""

from __future__ import annotations

import argparse
import functools
import math
import statistics
import sys
import time
from dataclasses import dataclass
from pathlib import Path

HERE = Path(__file__).resolve().parent
if str(HERE.parents[1]) not in sys.path:
    sys.path.insert(0, str(HERE.parents[1]))

from builder.chem.dipole import POLAR_THRESHOLD_D, dipole_moment
from builder.chem.forces import force_profile
from builder.chem.structure3d import clear_cache
from builder.fitting.dipole import MAX_HEAVY_ATOMS  # the limit the fit uses

CLEAR_BELOW_D = 0.2
"""Reference moments below this count as clearly non-polar [D]."""

CLEAR_ABOVE_D = 0.8
"""Reference moments above this count as clearly polar [D]."""


@dataclass(frozen=True)
class ReferenceDipole:
    cas: str
    name: str
    smiles: str
    dipole_D: float
    heavy_atoms: int


@functools.lru_cache(maxsize=1)
def reference_dipoles() -> tuple[ReferenceDipole, ...]:
    """Return neutral single-component molecules with a clear reference moment.

    Clear means below :data:`CLEAR_BELOW_D` or above :data:`CLEAR_ABOVE_D`; at most
    :data:`MAX_HEAVY_ATOMS` heavy atoms; SMILES must parse in RDKit. Sorted by CAS.
    """
    from chemicals import dipole
    from rdkit import RDLogger

    from builder.fitting.dipole import reference_molecule

    RDLogger.DisableLog("rdApp.*")
    dipole._load_dipole_data()  # the frames below exist only after this private loader
    tables = (dipole.dipole_data_CCDB, dipole.dipole_data_Muller, dipole.dipole_data_Poling)
    cas_numbers = sorted(set().union(*(set(t.index) for t in tables)))
    rows = []
    for cas in cas_numbers:
        value = dipole.dipole_moment(cas)
        if value is None or CLEAR_BELOW_D <= value <= CLEAR_ABOVE_D:
            continue
        found = reference_molecule(cas)  # parses, one neutral component, small enough
        if found is None:
            continue
        meta, mol = found
        rows.append(ReferenceDipole(cas, meta.common_name, meta.smiles, float(value),
                                    mol.GetNumHeavyAtoms()))
    RDLogger.EnableLog("rdApp.*")
    return tuple(rows)


def held_out(row: ReferenceDipole) -> bool:
    """Whether the recalibration fit left this molecule out (``builder.fitting.dipole`` split)."""
    from rdkit import Chem

    from builder.fitting.dipole import HELD_OUT_PERCENT, split_hash

    return split_hash(Chem.MolToInchiKey(Chem.MolFromSmiles(row.smiles))) < HELD_OUT_PERCENT


def dipole_figures(rows, charges: str) -> dict[str, float]:
    """Compare estimated and reference moments; return summary figures."""
    errors, agree, misses, no_value = [], 0, [], 0
    for row in rows:
        estimate = dipole_moment(row.smiles, charges=charges)
        if estimate.value_D is None:
            no_value += 1
            continue
        errors.append(abs(estimate.value_D - row.dipole_D))
        same = (estimate.value_D > POLAR_THRESHOLD_D) == (row.dipole_D > POLAR_THRESHOLD_D)
        agree += same
        if not same:
            misses.append(f"{row.name} {row.smiles}: ref {row.dipole_D:.2f}, est {estimate.value_D:.2f}")
    return {
        "n": len(errors), "no_value": no_value, "agreement_pct": 100.0 * agree / len(errors),
        "mae_D": statistics.mean(errors), "median_abs_err_D": statistics.median(errors),
        "rms_D": math.sqrt(statistics.mean(e * e for e in errors)),
        "misses": misses,
    }


def timing(rows) -> list[float]:
    """Return the uncached wall time of force_profile per molecule [ms]."""
    times = []
    for row in rows:
        clear_cache()
        start = time.perf_counter()
        force_profile(row.smiles)
        times.append(1000.0 * (time.perf_counter() - start))
    return times


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--limit", type=int, default=None, help="use only the first N molecules")
    parser.add_argument("--misses", action="store_true", help="list polar/non-polar disagreements")
    args = parser.parse_args(argv)
    from rdkit import RDLogger

    rows = reference_dipoles()[: args.limit]
    RDLogger.DisableLog("rdApp.warning")  # hydrogen-only species warn on every AddHs
    print(f"reference set: {len(rows)} molecules (chemicals 1.5.2 CCCBDB/MULLER/POLING)")
    times = timing(rows)
    print(f"force_profile, uncached: median {statistics.median(times):.1f} ms, "
          f"90th percentile {statistics.quantiles(times, n=10)[-1]:.1f} ms, "
          f"max {max(times):.0f} ms per molecule")
    for low, high in ((1, 9), (10, 19), (20, MAX_HEAVY_ATOMS)):
        chosen = [t for t, row in zip(times, rows) if low <= row.heavy_atoms <= high]
        if chosen:
            print(f"    {low}-{high} heavy atoms: n={len(chosen)}, "
                  f"median {statistics.median(chosen):.1f} ms")
    held = [row for row in rows if held_out(row)]
    for label, charges, chosen in (("auto, all", "auto", rows), ("auto, held-out", "auto", held),
                                   ("uncorrected MMFF94, all", "mmff", rows),
                                   ("uncorrected MMFF94, held-out", "mmff", held),
                                   ("uncorrected Gasteiger, all", "gasteiger", rows)):
        figures = dipole_figures(chosen, charges)
        print(f"dipole ({label}): n={figures['n']} (no value for {figures['no_value']}), "
              f"polar/non-polar agreement {figures['agreement_pct']:.1f} %, "
              f"MAE {figures['mae_D']:.2f} D, RMS {figures['rms_D']:.2f} D, median |error| {figures['median_abs_err_D']:.2f} D")
        if args.misses:
            for line in figures["misses"]:
                print("   ", line)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
