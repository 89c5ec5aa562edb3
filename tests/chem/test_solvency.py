"""Tests for builder.chem.solvency.

External references: hand-computed distances from the definition Ra² = 4ΔδD² + ΔδP² + ΔδH²
(Hansen, Hansen Solubility Parameters: A User's Handbook, 2nd ed., 2007, ch. 1); the
parameters used are Hansen's for toluene (18.0, 1.4, 2.0), ethanol (15.8, 8.8, 19.4), acetone
(15.5, 10.4, 7.0) and n-hexane (14.9, 0.0, 0.0) MPa^½ as shipped in chemicals 1.5.2; the
ranking uses a small invented catalog whose right order follows from the documented rules.
"""
from __future__ import annotations

import math

import pytest

from builder.chem.solvency import (
    Solvent,
    blend_parameters,
    hansen_distance,
    optimal_blend_fraction,
    rank_substitutes,
    red_class,
    relative_energy_difference,
    safety_key,
    serious_health,
)

TOLUENE = (18.0, 1.4, 2.0)
ETHANOL = (15.8, 8.8, 19.4)
ACETONE = (15.5, 10.4, 7.0)
HEXANE = (14.9, 0.0, 0.0)


def test_distance_hand_computed():
    # toluene-ethanol: 4·2.2² + 7.4² + 17.4² = 19.36 + 54.76 + 302.76 = 376.88
    assert hansen_distance(TOLUENE, ETHANOL) == pytest.approx(math.sqrt(376.88), abs=1e-9)
    # hexane-acetone: 4·0.6² + 10.4² + 7.0² = 1.44 + 108.16 + 49 = 158.6
    assert hansen_distance(HEXANE, ACETONE) == pytest.approx(math.sqrt(158.6), abs=1e-9)
    assert hansen_distance(ACETONE, ACETONE) == 0.0
    # the factor 4 weighs dispersion: a 1 MPa^½ step in δD counts as 2 in δP
    assert hansen_distance((1, 0, 0), (0, 0, 0)) == pytest.approx(hansen_distance((0, 2, 0), (0, 0, 0)))


def test_red_and_classes():
    # a sphere of radius 8 centred on acetone: hexane (Ra 12.59) outside, acetone inside
    assert relative_energy_difference(hansen_distance(HEXANE, ACETONE), 8.0) == pytest.approx(12.5936 / 8, abs=1e-4)
    assert red_class(relative_energy_difference(12.59, 8.0)) == "outside"
    assert red_class(relative_energy_difference(4.0, 8.0)) == "inside"
    assert red_class(relative_energy_difference(8.4, 8.0)) == "borderline"
    with pytest.raises(ValueError):
        relative_energy_difference(1.0, 0.0)


def test_blend_volume_average():
    # 30 % ethanol in toluene by volume: 0.7·18.0 + 0.3·15.8 = 17.34, 0.7·1.4 + 0.3·8.8 = 3.62,
    # 0.7·2.0 + 0.3·19.4 = 7.22
    assert blend_parameters([(TOLUENE, 0.7), (ETHANOL, 0.3)]) == pytest.approx((17.34, 3.62, 7.22))
    # unnormalised fractions are normalised
    assert blend_parameters([(TOLUENE, 7), (ETHANOL, 3)]) == pytest.approx((17.34, 3.62, 7.22))


@pytest.mark.parametrize("target", [ACETONE, (16.9, 5.1, 10.7), (20.0, 0.0, 0.0), (15.0, 12.0, 25.0)])
def test_blend_optimum_matches_brute_force(target):
    phi, ra = optimal_blend_fraction(TOLUENE, ETHANOL, target)
    grid = [i / 100000 for i in range(100001)]
    best = min(grid, key=lambda p: hansen_distance(blend_parameters([(TOLUENE, p), (ETHANOL, 1 - p)]), target))
    assert phi == pytest.approx(best, abs=2e-5)
    assert ra == pytest.approx(hansen_distance(blend_parameters([(TOLUENE, best), (ETHANOL, 1 - best)]), target),
                               abs=1e-6)
    assert 0.0 <= phi <= 1.0


def test_blend_optimum_hand_computed():
    # toluene/ethanol aiming at acetone: d = a − b = (2.2, −7.4, −17.4), t − b = (−0.3, 1.6, −12.4);
    # φ* = (4·2.2·(−0.3) − 7.4·1.6 + 17.4·12.4) / (4·2.2² + 7.4² + 17.4²)
    #    = (−2.64 − 11.84 + 215.76) / 376.88 = 0.534069...
    phi, _ = optimal_blend_fraction(TOLUENE, ETHANOL, ACETONE)
    assert phi == pytest.approx(201.28 / 376.88, abs=1e-9)


def _catalog():
    # An invented catalog around a target "tgt" (parameters like toluene's); the expected order
    # follows the documented safety rules: serious health statements first (the target's H361d
    # and H373 are reproductive and repeated-exposure organ toxicity), then category, the other
    # health statements, volatility, alerts, flash point.
    target = Solvent("tgt", TOLUENE, 277.0, 2, "medium", frozenset(), frozenset({"H304", "H361d", "H373"}))
    return target, [
        target,
        # close in solvency, category 3, fewer health statements: safest flammable one
        Solvent("safe3", (17.8, 1.0, 3.1), 300.0, 3, "medium", frozenset(), frozenset({"H304"})),
        # same category as the target but fewer health statements
        Solvent("same2", (17.6, 2.0, 2.5), 280.0, 2, "medium", frozenset(), frozenset({"H304"})),
        # not classified as flammable (no category) but a suspected carcinogen (H351): after every
        # candidate without a serious health statement (Ra 3.7)
        Solvent("nonflam", (18.5, 3.0, 5.0), None, None, "low", frozenset(), frozenset({"H351"})),
        # very close but category 1 and high volatility: last of those without a serious statement
        Solvent("worse1", (18.0, 1.5, 2.2), 250.0, 1, "high", frozenset({"peroxide-former"}), frozenset()),
        # good in every way but too far in solvency (ethanol): excluded at max_ra 5
        Solvent("far", ETHANOL, 286.0, 2, "medium", frozenset(), frozenset()),
    ]


def test_rank_substitutes_order_and_reasons():
    target, catalog = _catalog()
    result = rank_substitutes(target, catalog, max_ra=5.0)
    assert [c.id for c in result] == ["safe3", "same2", "worse1", "nonflam"]
    assert all(c.ra <= 5.0 for c in result)
    by_id = {c.id: c for c in result}
    better = {b.criterion for b in by_id["safe3"].better}
    assert {"flammable_category", "flash_point_K", "health_h_codes"} <= better
    worse1 = {w.criterion for w in by_id["worse1"].worse}
    assert {"flammable_category", "flash_point_K", "volatility_band", "alert_ids"} <= worse1
    # worse1 carries none of the target's health statements: that is listed as better
    assert any(b.criterion == "health_h_codes" for b in by_id["worse1"].better)
    # nonflam adds H351, which the target lacks: listed as worse, and (lacking H304, H361d, H373)
    # as better; each side of the comparison is the whole set of codes
    health_worse = [w for w in by_id["nonflam"].worse if w.criterion == "health_h_codes"]
    assert [(w.candidate, w.target) for w in health_worse] == [(("H351",), ("H304", "H361d", "H373"))]
    assert any(b.criterion == "health_h_codes" for b in by_id["nonflam"].better)


def test_a_serious_health_hazard_outranks_flammability():
    # a non-flammable suspected carcinogen (like dichloromethane: H351) against a flammable liquid
    # whose only health statement is eye irritation (H319): the flammable one ranks safer, and the
    # carcinogen is not offered as a safer substitute for it (builder/chem/solvency.py docstring)
    carc = Solvent("carc", (18.0, 6.3, 6.1), None, None, "high", frozenset(), frozenset({"H351", "H319"}))
    flam = Solvent("flam", (17.5, 5.7, 6.5), 280.0, 2, "high", frozenset(), frozenset({"H319"}))
    assert safety_key(flam, 1.0) < safety_key(carc, 1.0)
    assert [c.id for c in rank_substitutes(carc, [carc, flam], max_ra=5.0)] == ["flam"]
    assert serious_health({"H361d", "H360FD", "H350i", "H319", "H304"}) == {"H361d", "H360FD", "H350i"}


def test_rank_substitutes_blends():
    # Target acetone; catalog holds only toluene and ethanol, each far from it (Ra 10.0 and 12.9);
    # their optimal blend (φ_toluene = 0.534) comes within about 5.
    target = Solvent("acetone", ACETONE, 253.0, 2, "high")
    tol = Solvent("toluene", TOLUENE, 277.0, 2, "medium", health_h_codes=frozenset({"H304"}))
    eth = Solvent("ethanol", ETHANOL, 286.0, 2, "medium")
    assert rank_substitutes(target, [target, tol, eth], max_ra=8.0) == []
    result = rank_substitutes(target, [target, tol, eth], max_ra=8.0, blends=True)
    assert len(result) == 1
    blend = result[0]
    assert blend.id is None
    assert [part for part, _ in blend.blend] == ["ethanol", "toluene"]
    phi_toluene = dict(blend.blend)["toluene"]
    assert phi_toluene == pytest.approx(201.28 / 376.88, abs=1e-3)
    _, ra = optimal_blend_fraction(TOLUENE, ETHANOL, ACETONE)
    assert blend.ra == pytest.approx(ra, abs=1e-2)
    # the blend is judged by its less safe part: the lower flash point, toluene's H304
    assert {w.criterion for w in blend.worse} == {"health_h_codes"}
    assert {b.criterion for b in blend.better} >= {"flash_point_K", "volatility_band"}
