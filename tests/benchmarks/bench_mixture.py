"""Benchmark of the mixture chemistry: UNIFAC, vapor–liquid equilibrium, mixture flash points (a script).

Run from the repository root (needs the test extra: thermo 0.6.1, chemicals 1.5.2)::

    .venv/bin/python tests/benchmarks/bench_mixture.py
    .venv/bin/python tests/benchmarks/bench_mixture.py --runs 50

Prints, against references outside the project:

- activity coefficients of ``builder.chem.unifac`` against ``thermo.unifac.UNIFAC.from_subgroups``
  (original UNIFAC, same subgroups) over :data:`BINARIES` and :data:`TERNARIES`: maximum relative
  difference;
- bubble and dew temperatures at 101.325 kPa of ``builder.chem.vle`` against the same equilibrium
  solved with thermo's UNIFAC γ and scipy's root finders, same Poling Antoine vapor pressures
  (:func:`thermo_bubble_dew`): maximum |ΔT|;
- azeotropes predicted for :data:`AZEOTROPES` against the handbook values (from memory of the
  CRC Handbook azeotrope table): ΔT and Δx;
- mixture flash points of ethanol–water against the widely quoted closed-cup table
  (:data:`ETHANOL_WATER_FLASH`) and the minimum-flash-point systems of :data:`MINIMUM_FLASH_SYSTEMS`;
- the median time of one 5-component mixture's derivation (groups from SMILES, arrays,
  bubble and dew points at 101.325 kPa, vapor pressure at 3 temperatures, flash point).

The tables here are also used by ``tests/chem/test_unifac.py``, ``test_vle.py`` and
``test_mixture_flash.py``.
"""
from __future__ import annotations

import argparse
import functools
import statistics
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
if str(HERE.parents[1]) not in sys.path:
    sys.path.insert(0, str(HERE.parents[1]))

from builder.chem import unifac, vle
from builder.chem.mixture_flash import mixture_flash_point

P_ATM = 101325.0

#: name → (SMILES, CAS RN)
COMPONENTS = {
    "water": ("O", "7732-18-5"),
    "methanol": ("CO", "67-56-1"),
    "ethanol": ("CCO", "64-17-5"),
    "1-propanol": ("CCCO", "71-23-8"),
    "2-propanol": ("CC(C)O", "67-63-0"),
    "1-butanol": ("CCCCO", "71-36-3"),
    "acetone": ("CC(C)=O", "67-64-1"),
    "2-butanone": ("CCC(C)=O", "78-93-3"),
    "chloroform": ("ClC(Cl)Cl", "67-66-3"),
    "dichloromethane": ("ClCCl", "75-09-2"),
    "benzene": ("c1ccccc1", "71-43-2"),
    "toluene": ("Cc1ccccc1", "108-88-3"),
    "p-xylene": ("Cc1ccc(C)cc1", "106-42-3"),
    "hexane": ("CCCCCC", "110-54-3"),
    "heptane": ("CCCCCCC", "142-82-5"),
    "octane": ("CCCCCCCC", "111-65-9"),
    "cyclohexane": ("C1CCCCC1", "110-82-7"),
    "ethyl acetate": ("CCOC(C)=O", "141-78-6"),
    "methyl acetate": ("COC(C)=O", "79-20-9"),
    "butyl acetate": ("CCCCOC(C)=O", "123-86-4"),
    "tetrahydrofuran": ("C1CCOC1", "109-99-9"),
    "acetic acid": ("CC(=O)O", "64-19-7"),
    "pyridine": ("c1ccncc1", "110-86-1"),
    "diethyl ether": ("CCOCC", "60-29-7"),
    "carbon tetrachloride": ("ClC(Cl)(Cl)Cl", "56-23-5"),
}

#: binaries (names) for γ and bubble/dew checks
BINARIES = [
    ("ethanol", "water"), ("acetone", "chloroform"), ("methanol", "benzene"), ("benzene", "toluene"),
    ("hexane", "ethanol"), ("ethyl acetate", "ethanol"), ("acetone", "water"), ("2-propanol", "water"),
    ("methanol", "water"), ("2-butanone", "toluene"), ("cyclohexane", "benzene"), ("dichloromethane", "methanol"),
    ("tetrahydrofuran", "water"), ("chloroform", "methanol"), ("pyridine", "water"), ("acetic acid", "water"),
    ("diethyl ether", "acetone"), ("carbon tetrachloride", "ethanol"),
]
#: ternaries (names) for the same checks
TERNARIES = [
    ("acetone", "methanol", "water"), ("methyl acetate", "methanol", "water"),
    ("hexane", "ethanol", "ethyl acetate"), ("benzene", "toluene", "p-xylene"),
    ("acetone", "chloroform", "methanol"),
]
#: a cleaning-thinner-like 5-component mixture for the timing (mole fractions)
FIVE = (("acetone", "ethanol", "toluene", "ethyl acetate", "2-butanone"), (0.25, 0.15, 0.3, 0.2, 0.1))

#: Minimum- and maximum-boiling azeotropes at 101.325 kPa, from memory of the CRC Handbook of
#: Chemistry and Physics azeotrope table ("Azeotropic data for binary mixtures"): (component 1,
#: component 2, T [K], mass fraction of component 1 in the azeotrope, kind).
AZEOTROPES = [
    ("ethanol", "water", 351.30, 0.956, "minimum-boiling"),
    ("ethanol", "benzene", 341.05, 0.324, "minimum-boiling"),
    ("ethanol", "toluene", 349.85, 0.680, "minimum-boiling"),
    ("acetone", "chloroform", 337.55, 0.200, "maximum-boiling"),
    ("ethyl acetate", "ethanol", 344.95, 0.692, "minimum-boiling"),
    ("methanol", "benzene", 330.65, 0.391, "minimum-boiling"),
    ("methanol", "acetone", 328.65, 0.120, "minimum-boiling"),
    ("2-propanol", "water", 353.55, 0.874, "minimum-boiling"),
    ("methanol", "toluene", 336.95, 0.724, "minimum-boiling"),
]
#: tolerances for the azeotropes, kept honest about UNIFAC's known error (a few kelvin in T,
#: a few hundredths in composition for these well-behaved systems)
AZEOTROPE_TOL_T = 2.0
AZEOTROPE_TOL_X = 0.05

#: Closed-cup flash points of ethanol–water [°C] by ethanol volume % (ABV, 20 °C), the widely
#: quoted table (as reproduced on http://www.ilpi.com/dchas/2015/20150128i.html, which quotes the
#: encyclopedic table; origin: the distilled-spirits literature).
ETHANOL_WATER_FLASH = [(10, 49.0), (20, 36.0), (30, 29.0), (40, 26.0), (50, 24.0),
                       (60, 22.0), (70, 21.0), (80, 20.0), (90, 17.0), (96, 17.0)]
#: densities at 20 °C used to turn % v/v into mole fractions [kg/m³] (CRC; from memory);
#: the volume contraction on mixing (a few %) is neglected
DENSITY_20C = {"ethanol": 789.3, "water": 998.2}
#: binaries reported to show a minimum flash point below both pure components' flash points
#: (these two systems: the abstract of Vidal, Rogers, Mannan, Process Saf. Environ. Prot. 84 (2006) 1,
#: doi:10.1205/psep.05041; the phenomenon: H.-J. Liaw et al., Binary liquid solutions exhibiting minimum flash-point behavior, J. Loss Prev.
#: Process Ind. 16 (2003) 173, doi:10.1016/S0950-4230(03)00004-4, as cited in the 2025 review by
#: Lakzian, Liaw et al., Prog. Energy Combust. Sci.; the direction of the effect only, no numbers)
MINIMUM_FLASH_SYSTEMS = [("ethanol", "octane"), ("1-butanol", "octane")]


def _ms(seconds: float) -> float:
    return 1000.0 * seconds


@functools.lru_cache(maxsize=None)
def groups(name: str) -> unifac.Groups:
    from rdkit import Chem

    g = unifac.unifac_groups(Chem.MolFromSmiles(COMPONENTS[name][0]))
    if isinstance(g, str):
        raise ValueError(f"{name}: {g}")
    return g


@functools.lru_cache(maxsize=None)
def antoine(name: str):
    """Psat(T) [Pa] from the Antoine constants of Poling et al. (The Properties of Gases and
    Liquids, 5th ed.) as shipped in chemicals (``Psat_data_AntoinePoling``, log10 Pa form)."""
    from chemicals.vapor_pressure import Psat_data_AntoinePoling

    row = Psat_data_AntoinePoling.loc[COMPONENTS[name][1]]
    A, B, C = float(row.A), float(row.B), float(row.C)
    return lambda T: 10.0 ** (A - B / (T + C))


def flash_point_iec(name: str) -> float | None:
    """Pure-component closed-cup flash point [K], IEC 60079-20-1 (2010) via chemicals.safety."""
    from chemicals.safety import T_flash

    return T_flash(COMPONENTS[name][1], method="IEC 60079-20-1 (2010)")


def thermo_gammas(T: float, x, names) -> list[float]:
    from thermo.unifac import UNIFAC

    model = UNIFAC.from_subgroups(T=T, xs=list(x), chemgroups=[groups(n).as_dict() for n in names], version=0)
    return list(model.gammas())


def thermo_bubble_dew(names, x, P: float = P_ATM) -> tuple[float, float]:
    """Reference bubble and dew temperatures [K]: thermo's UNIFAC γ with the same vapor pressures,
    solved by scipy (``brentq`` for the bubble point; ``fsolve`` on (T, x) for the dew point).

    thermo's own ``FlashVL`` (GibbsExcessLiquid + IdealGas) was tried first; in thermo 0.6.1 it
    returns no or unphysical answers for several of these systems (its phase-stability search
    fails), so the equilibrium equations are solved here with thermo's activity coefficients.
    """
    import numpy as np
    from scipy.optimize import brentq, fsolve

    ps = [antoine(n) for n in names]
    lnP = np.log(P)

    def bubble(T):
        g = thermo_gammas(T, x, names)
        return np.log(sum(xi * gi * p(T) for xi, gi, p in zip(x, g, ps))) - lnP

    tb = brentq(bubble, 200.0, 600.0, xtol=1e-12)

    def dew_equations(v):
        T, xs = v[0], list(v[1:]) + [1.0 - sum(v[1:])]
        g = thermo_gammas(T, [max(a, 1e-12) for a in xs], names)
        return [np.log(max(xi, 1e-300) * gi * p(T)) - np.log(yi * P) for xi, gi, p, yi in zip(xs, g, ps, x)]

    # start: the dew point of an ideal solution
    T0 = brentq(lambda T: np.log(sum(yi * P / p(T) for yi, p in zip(x, ps))), 200.0, 600.0)
    raw = [yi * P / p(T0) for yi, p in zip(x, ps)]
    x0 = [r / sum(raw) for r in raw]
    td = float("nan")
    for T_start in (T0, 0.5 * (T0 + tb), tb):   # a few starts; nan if none converges
        sol, info, ier, msg = fsolve(dew_equations, [T_start] + x0[:-1], full_output=True, xtol=1e-12)
        if ier == 1 and max(abs(v) for v in info["fvec"]) < 1e-9:
            td = float(sol[0])
            break
    return tb, td


def dew_residual(names, y, T: float, x, P: float = P_ATM) -> float:
    """max |ln(x_i γ_i Psat_i / (y_i P))| of a dew point (T, x) with thermo's γ (0 when exact)."""
    import math

    g = thermo_gammas(T, x, names)
    return max(abs(math.log(xi * gi * antoine(n)(T) / (yi * P))) for xi, gi, n, yi in zip(x, g, names, y))


def compositions(n: int) -> list[tuple[float, ...]]:
    """A few liquid compositions for n components (equimolar and lopsided ones)."""
    if n == 2:
        return [(0.5, 0.5), (0.1, 0.9), (0.85, 0.15)]
    return [tuple([1.0 / n] * n), tuple([0.6] + [0.4 / (n - 1)] * (n - 1)),
            tuple([0.1] * (n - 1) + [1.0 - 0.1 * (n - 1)])]


def gamma_differences():
    """Max relative |γ_ours − γ_thermo| / γ_thermo per system over compositions and 300/330/360 K."""
    out = []
    for names in BINARIES + TERNARIES:
        worst = 0.0
        for x in compositions(len(names)):
            for T in (300.0, 330.0, 360.0):
                ours = unifac.activity_coefficients(T, x, [groups(n) for n in names])
                ref = thermo_gammas(T, x, names)
                worst = max(worst, max(abs(a - b) / b for a, b in zip(ours, ref)))
        out.append((names, worst))
    return out


def bubble_dew_differences():
    """(names, x, Tb ours, Tb ref, Td ours, Td ref, residual of our dew point with thermo's γ) at 101.325 kPa.

    Td ref is nan where the reference solver found no dew point (a composition inside UNIFAC's
    liquid–liquid split, where the dew equations have several roots); the residual still checks ours."""
    out = []
    for names in BINARIES + TERNARIES:
        mix = unifac.mixture([groups(n) for n in names])
        ps = [antoine(n) for n in names]
        for x in compositions(len(names))[:2]:
            tb = vle.bubble_temperature(P_ATM, x, ps, mix.gammas)[0]
            td, x_dew = vle.dew_temperature(P_ATM, x, ps, mix.gammas)
            rb, rd = thermo_bubble_dew(names, x)
            out.append((names, x, tb, rb, td, rd, dew_residual(names, x, td, x_dew)))
    return out


def mole_fraction_from_mass(w1: float, names) -> float:
    from rdkit.Chem import Descriptors
    from rdkit import Chem

    M = [Descriptors.MolWt(Chem.MolFromSmiles(COMPONENTS[n][0])) for n in names]
    n1, n2 = w1 / M[0], (1.0 - w1) / M[1]
    return n1 / (n1 + n2)


def azeotrope_results():
    """(names, T ref, x1 ref, [(x1, T) predicted])."""
    out = []
    for a, b, T_ref, w_ref, kind in AZEOTROPES:
        names = (a, b)
        mix = unifac.mixture([groups(n) for n in names])
        found = vle.binary_azeotropes(P_ATM, [antoine(a), antoine(b)], mix.gammas)
        out.append((names, kind, T_ref, mole_fraction_from_mass(w_ref, names), found))
    return out


def ethanol_water_flash_points():
    """(vol %, x ethanol, measured [K], predicted [K] or None)."""
    from rdkit.Chem import Descriptors
    from rdkit import Chem

    names = ("ethanol", "water")
    M = {n: Descriptors.MolWt(Chem.MolFromSmiles(COMPONENTS[n][0])) for n in names}
    mix = unifac.mixture([groups(n) for n in names])
    out = []
    for vol, t_c in ETHANOL_WATER_FLASH:
        ne = vol * DENSITY_20C["ethanol"] / M["ethanol"]
        nw = (100 - vol) * DENSITY_20C["water"] / M["water"]
        x = ne / (ne + nw)
        r = mixture_flash_point([x, 1 - x], [flash_point_iec("ethanol"), None],
                                [antoine("ethanol"), antoine("water")], mix.gammas)
        out.append((vol, x, t_c + 273.15, r.T))
    return out


def minimum_flash_curve(names, n: int = 19):
    """(x1, flash point [K]) over a binary's composition range, UNIFAC + Liaw."""
    mix = unifac.mixture([groups(m) for m in names])
    fps = [flash_point_iec(m) for m in names]
    ps = [antoine(m) for m in names]
    pts = []
    for k in range(n + 1):
        x1 = k / n
        pts.append((x1, mixture_flash_point([x1, 1 - x1], fps, ps, mix.gammas).T))
    return pts


def time_five(runs: int = 30):
    """Median wall times [s] of the 5-component derivation, with and without group assignment."""
    from rdkit import Chem

    names, x = FIVE
    mols = [Chem.MolFromSmiles(COMPONENTS[n][0]) for n in names]
    ps = [antoine(n) for n in names]
    fps = [flash_point_iec(n) for n in names]
    with_groups, without = [], []
    for _ in range(runs):
        t0 = time.perf_counter()
        gs = [unifac.unifac_groups(m) for m in mols]
        t1 = time.perf_counter()
        mix = unifac.UnifacMixture(gs)
        vle.bubble_temperature(P_ATM, x, ps, mix.gammas)
        vle.dew_temperature(P_ATM, x, ps, mix.gammas)
        for T in (293.15, 298.15, 313.15):
            vle.bubble_pressure(T, x, ps, mix.gammas)
        mixture_flash_point(x, fps, ps, mix.gammas)
        t2 = time.perf_counter()
        with_groups.append(t2 - t0)
        without.append(t2 - t1)
    return statistics.median(with_groups), statistics.median(without)


def main(argv=None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=30, help="timing runs (median reported)")
    args = parser.parse_args(argv)

    print("UNIFAC activity coefficients vs thermo.unifac.UNIFAC (same subgroups), max relative difference")
    for names, worst in gamma_differences():
        print(f"  {' + '.join(names):40s} {worst:.1e}")
    print("\nBubble / dew temperature at 101.325 kPa vs thermo UNIFAC + scipy solvers (same Antoine), K")
    worst_b = worst_d = 0.0
    failed = 0
    worst_r = 0.0
    for names, x, tb, rb, td, rd, res in bubble_dew_differences():
        worst_r = max(worst_r, res)
        worst_b = max(worst_b, abs(tb - rb))
        if rd == rd:
            worst_d = max(worst_d, abs(td - rd))
        else:
            failed += 1
        xs = "/".join(f"{v:.2f}" for v in x)
        print(f"  {' + '.join(names):40s} x={xs:15s} Tb {tb:8.3f} (thermo {rb:8.3f})  Td {td:8.3f} (thermo {rd:8.3f})")
    print(f"  max |ΔTb| = {worst_b:.2e} K, max |ΔTd| = {worst_d:.2e} K (dew points whose reference did not converge: {failed}; "
          f"max residual of our dew points in thermo's equations {worst_r:.1e})")
    print("\nAzeotropes at 101.325 kPa vs the CRC Handbook table (from memory)")
    for names, kind, T_ref, x_ref, found in azeotrope_results():
        if not found:
            print(f"  {' + '.join(names):28s} {kind:16s} NONE predicted (ref {T_ref:.2f} K, x1 {x_ref:.3f})")
            continue
        x1, T = found[0]
        print(f"  {' + '.join(names):28s} {kind:16s} T {T:7.2f} K (ref {T_ref:.2f}, Δ {T - T_ref:+.2f})"
              f"  x1 {x1:.3f} (ref {x_ref:.3f}, Δ {x1 - x_ref:+.3f})")
    print("\nEthanol–water closed-cup flash points (UNIFAC + Liaw; pure ethanol IEC 60079-20-1) vs the quoted table")
    errors = []
    for vol, x, meas, pred in ethanol_water_flash_points():
        errors.append(pred - meas)
        print(f"  {vol:3d} % v/v  x={x:.3f}  measured {meas - 273.15:5.1f} °C  predicted {pred - 273.15:5.1f} °C  Δ {pred - meas:+.1f} K")
    print(f"  MAE {statistics.mean(abs(e) for e in errors):.1f} K, max |Δ| {max(abs(e) for e in errors):.1f} K")
    print("\nMinimum flash point behaviour (reported by Vidal et al. 2006, Liaw et al. 2003)")
    for names in MINIMUM_FLASH_SYSTEMS:
        pts = minimum_flash_curve(names)
        x_min, t_min = min(pts, key=lambda p: p[1])
        pure = min(pts[0][1], pts[-1][1])
        print(f"  {' + '.join(names):20s} minimum {t_min - 273.15:5.1f} °C at x1={x_min:.2f}; lower pure value {pure - 273.15:5.1f} °C")
    t_all, t_core = time_five(args.runs)
    print(f"\n5-component mixture {' + '.join(FIVE[0])}: median {_ms(t_all):.1f} ms per derivation "
          f"({_ms(t_core):.1f} ms without the group assignment; {args.runs} runs)")


if __name__ == "__main__":
    main()
