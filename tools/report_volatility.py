"""Benchmark the volatility and flash-point estimators against reference data.

Run ``python tools/report_volatility.py`` from the repository root (needs the
test-only packages ``chemicals``, ``thermo`` and ``rdkit``). It prints:

- vapour pressure at 298.15 K from reference Tb (Myrdal-Yalkowsky) against
  Poling's Antoine coefficients (``chemicals.vapor_pressure.
  Psat_data_AntoinePoling``), only where 298.15 K is inside the fitted range
  and Tb > 298.15 K: median relative error and RMS ln ratio, overall and for
  liquids with an O-H or N-H donor;
- Hvap at Tb (Myrdal-Yalkowsky) against CRC (``Hvap_data_CRC``);
- flash point MAE, RMS and bias against 'IEC 60079-20-1 (2010)' and
  'Serat DIPPR (2017)' in ``chemicals.safety``, with reference Tb
  (``chemicals.phase_change.Tb``, first available source) and with Joback Tb
  (``thermo``), for each route of :mod:`builder.chem.flash`.

The functions here are also used by ``tests/chem/test_vapor.py`` and
``tests/chem/test_flash.py`` to assert bounds.

Structure counts follow Myrdal & Yalkowsky (1997): SP3/SP2 are non-ring atoms
bonded to at least two heavy atoms, rings are counted as ring systems (fused
rings merged); HBN uses alcohol/phenol OH, COOH and primary amine NH2.
"""

from __future__ import annotations

import math
import statistics
import sys
from functools import lru_cache
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from builder.chem import flash, vapor  # noqa: E402
from builder.chem.flexibility import VaporStructure, vapor_structure_of  # noqa: E402

T25 = 298.15


def structure(smiles: str):
    """The Myrdal-Yalkowsky numbers for an organic SMILES (the runtime's own counting), else None."""
    return vapor_structure_of(smiles) if smiles else None


def smiles_of(cas: str) -> str | None:
    from chemicals.identifiers import search_chemical

    try:
        return search_chemical(cas).smiles
    except ValueError:
        return None


def psat_rows() -> list[tuple[str, float, float, VaporStructure]]:
    """(CAS, P_est, P_ref, structure) at 298.15 K for the Poling Antoine set."""
    from chemicals.phase_change import Tb
    from chemicals.vapor_pressure import Psat_data_AntoinePoling

    rows = []
    for cas, r in Psat_data_AntoinePoling.iterrows():
        antoine = vapor.Antoine(r.A, r.B, r.C, r.Tmin, r.Tmax)
        if not antoine.in_range(T25):
            continue
        tb = Tb(cas)
        s = structure(smiles_of(cas) or "")
        if tb is None or tb <= T25 or s is None:
            continue
        est = vapor.myrdal_yalkowsky_psat(T25, tb, s.tau, s.hbn)
        rows.append((cas, est, antoine.pressure(T25).value, s))
    return rows


def psat_stats(rows, donors: bool | None = None) -> dict[str, float]:
    sel = [r for r in rows if donors is None or r[3].h_bond_donor == donors]
    rel = [abs(est / ref - 1.0) for _, est, ref, _ in sel]
    ln = [math.log(est / ref) for _, est, ref, _ in sel]
    return {
        "n": len(sel),
        "median_rel": statistics.median(rel),
        "rms_ln": math.sqrt(sum(x * x for x in ln) / len(ln)),
    }


def dhvb_stats() -> dict[str, float]:
    from chemicals import phase_change

    phase_change._load_phase_change_constants()
    data = phase_change.Hvap_data_CRC.dropna(subset=["HvapTb", "Tb"])
    rel = []
    for cas, r in data.iterrows():
        s = structure(smiles_of(cas) or "")
        if s is None:
            continue
        est = vapor.myrdal_yalkowsky_dHvap(r.Tb, r.Tb, s.tau, s.hbn)
        rel.append(abs(est / r.HvapTb - 1.0))
    return {"n": len(rel), "median_rel": statistics.median(rel)}


def _hvap298(cas: str) -> float | None:
    from chemicals import phase_change

    phase_change._load_phase_change_constants()
    crc = phase_change.Hvap_data_CRC
    if cas in crc.index and crc.loc[cas, "Hvap298"] == crc.loc[cas, "Hvap298"]:
        return float(crc.loc[cas, "Hvap298"])
    gh = phase_change.Hvap_data_Gharagheizi
    if cas in gh.index and gh.loc[cas, "Hvap298"] == gh.loc[cas, "Hvap298"]:
        return float(gh.loc[cas, "Hvap298"])
    return None


@lru_cache(maxsize=None)
def _joback_tb(smiles: str) -> float | None:
    from thermo.group_contribution.joback import Joback

    j = Joback(smiles)
    return j.Tb(j.counts) if j.success else None


ROUTES = ("catoire_naudet_tabulated_hvap", "catoire_naudet_my_hvap", "satyanarayana_rao")


def flash_errors(source: str, tb_source: str = "reference") -> dict[str, list[float]]:
    """Signed errors (estimate - data) [K] per route against one flash-point source.

    ``source`` is 'IEC 60079-20-1 (2010)' or 'Serat DIPPR (2017)';
    ``tb_source`` is 'reference' (chemicals Tb) or 'joback'.
    """
    from chemicals import safety
    from chemicals.phase_change import Tb

    safety._load_safety_data()
    frame = {
        "IEC 60079-20-1 (2010)": safety.IEC_2010_data,
        "Serat DIPPR (2017)": safety.DIPPR_SERAT_data,
    }[source]
    errors: dict[str, list[float]] = {k: [] for k in ROUTES}
    for cas, r in frame.iterrows():
        tf = r.T_flash
        if tf != tf:
            continue
        smi = smiles_of(cas)
        s = structure(smi or "")
        if s is None:
            continue
        tb = Tb(cas) if tb_source == "reference" else _joback_tb(smi)
        if tb is None:
            continue
        dh = _hvap298(cas)
        if dh is not None:
            errors[ROUTES[0]].append(flash.catoire_naudet(tb, dh, s.n_carbon) - tf)
        errors[ROUTES[1]].append(
            flash.estimate_flash_point(tb, s.n_carbon, tau=s.tau, hbn=s.hbn).value - tf
        )
        errors[ROUTES[2]].append(flash.satyanarayana_rao(tb) - tf)
    return errors


def summary(errs: list[float]) -> dict[str, float]:
    return {
        "n": len(errs),
        "mae": sum(abs(e) for e in errs) / len(errs),
        "rms": math.sqrt(sum(e * e for e in errs) / len(errs)),
        "bias": sum(errs) / len(errs),
    }


def main() -> None:
    rows = psat_rows()
    print("Vapour pressure at 298.15 K, Myrdal-Yalkowsky from reference Tb,")
    print("vs Poling Antoine (chemicals Psat_data_AntoinePoling, in range):")
    for label, donors in (("all", None), ("no O-H/N-H donor", False), ("O-H/N-H donor", True)):
        s = psat_stats(rows, donors)
        print(f"  {label:18s} n={s['n']:4d}  median |rel err|={s['median_rel']:.3f}"
              f"  RMS ln ratio={s['rms_ln']:.3f}")
    d = dhvb_stats()
    print(f"Hvap at Tb vs CRC: n={d['n']} median |rel err|={d['median_rel']:.3f}")
    print()
    for source in ("IEC 60079-20-1 (2010)", "Serat DIPPR (2017)"):
        for tb_source in ("reference", "joback"):
            print(f"Flash point vs {source}, Tb = {tb_source}:")
            for route, errs in flash_errors(source, tb_source).items():
                s = summary(errs)
                print(f"  {route:30s} n={s['n']:4d}  MAE={s['mae']:5.2f} K"
                      f"  RMS={s['rms']:5.2f} K  bias={s['bias']:+6.2f} K")
    print("\nNote: Serat's values for some families (e.g. alcohols) look predicted,"
          " not measured; IEC is the stronger reference.")


if __name__ == "__main__":
    main()
