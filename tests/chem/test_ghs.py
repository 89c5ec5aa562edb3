"""Tests for builder.chem.ghs: UN GHS Rev. 10 table 2.6.1 boundaries and examples."""

from __future__ import annotations

import pytest

from builder.chem import ghs

C = 273.15


def cat(fp_c, ibp_c):
    return ghs.flammable_liquid_category(fp_c + C, None if ibp_c is None else ibp_c + C)


@pytest.mark.parametrize("fp_c, ibp_c, expected", [
    (22.9, 80.0, 2),    # FP < 23 -> 2 when IBP > 35
    (23.0, 80.0, 3),    # 23 <= FP <= 60 -> 3 (23 itself is category 3)
    (60.0, 150.0, 3),   # 60 is still category 3
    (60.1, 150.0, 4),   # > 60 -> 4
    (93.0, 200.0, 4),   # 93 is still category 4
    (93.1, 200.0, None),  # > 93 -> not classified
    (-20.0, 35.0, 1),   # IBP exactly 35 -> category 1
    (-20.0, 35.1, 2),   # IBP just above 35 -> category 2
    (22.9, 34.9, 1),
    (23.0, 30.0, 3),    # IBP is irrelevant from FP 23 upwards
])
def test_table_2_6_1_boundaries(fp_c, ibp_c, expected):
    assert cat(fp_c, ibp_c) == expected


@pytest.mark.parametrize("name, cas, flash_method, expected", [
    # Closed-cup flash points: IEC 60079-20-1 (2010) table in chemicals 1.5.2
    # (chemicals.safety.T_flash); diethylene glycol is not in that table, so its
    # flash point is the Serat DIPPR (2017) value in the same package. Boiling points
    # (taken as the initial boiling point of the pure liquid): CRC Handbook via
    # chemicals.phase_change.Tb(method="CRC_ORG"). Categories as commonly labelled on
    # these solvents (common practice).
    ("diethyl ether", "60-29-7", "IEC 60079-20-1 (2010)", 1),   # FP -45 C, IBP 34.4 C
    ("ethanol", "64-17-5", "IEC 60079-20-1 (2010)", 2),         # FP 12 C
    ("acetone", "67-64-1", "IEC 60079-20-1 (2010)", 2),         # FP -20 C
    ("toluene", "108-88-3", "IEC 60079-20-1 (2010)", 2),        # FP 4 C
    ("1-butanol", "71-36-3", "IEC 60079-20-1 (2010)", 3),       # FP 35 C
    ("diethylene glycol", "111-46-6", "Serat DIPPR (2017)", None),  # FP 133 C
])
def test_worked_examples(name, cas, flash_method, expected):
    from chemicals.phase_change import Tb
    from chemicals.safety import T_flash

    flash_K = T_flash(cas, method=flash_method)
    boiling_K = Tb(cas, method="CRC_ORG")
    assert flash_K is not None and boiling_K is not None, name
    assert ghs.flammable_liquid_category(flash_K, boiling_K) == expected, name


def test_missing_ibp_needed_below_23():
    with pytest.raises(ValueError, match="initial boiling point"):
        cat(10.0, None)
    assert cat(40.0, None) == 3


def test_hazard_statements_follow_annex_3():
    assert [ghs.HAZARD_STATEMENTS[c][0] for c in (1, 2, 3, 4)] == ["H224", "H225", "H226", "H227"]
    signal_words = [ghs.HAZARD_STATEMENTS[c][2] for c in (1, 2, 3, 4)]
    assert signal_words == ["Danger", "Danger", "Warning", "Warning"]


def test_possible_categories_band():
    # FP 20 +- 1.645*5 = 11.8..28.2 straddles 23; IBP 80 +- 4.9 stays > 35.
    r = ghs.possible_categories(20 + C, 5.0, 80 + C, 3.0)
    assert r.categories == {2, 3} and r.most_likely == 2 and not r.certain
    # Exactly on the edge: hi = 23 reaches category 3 (23 is inclusive).
    r = ghs.possible_categories(23 - 1.645 + C, 1.0, 80 + C, 0.0)
    assert 3 in r.categories
    # Far from every boundary: certain.
    r = ghs.possible_categories(-40 + C, 2.0, 34.6 - 10 + C, 1.0)
    assert r.categories == {1} and r.certain
    # IBP band straddles 35.
    r = ghs.possible_categories(-40 + C, 2.0, 36 + C, 1.0)
    assert r.categories == {1, 2} and r.most_likely == 2
    # Wide band from 58 to 96: 3, 4 and not classified.
    r = ghs.possible_categories(77 + C, 11.55, 200 + C, 0.0)
    assert r.categories == {3, 4, None} and r.most_likely == 4


def test_possible_categories_unknown_ibp_is_conservative():
    r = ghs.possible_categories(0 + C, 2.0, None)
    assert r.categories == {1, 2} and r.most_likely == 1


def test_possible_categories_zero_uncertainty_equals_point_value():
    for fp_c, ibp_c in [(23.0, 80.0), (60.0, 80.0), (93.0, 200.0), (-5.0, 35.0)]:
        r = ghs.possible_categories(fp_c + C, 0.0, ibp_c + C, 0.0)
        assert r.categories == {cat(fp_c, ibp_c)}


def test_check_declared_statements():
    assert ghs.check_declared_statements(["H225", "H319"], 2) is None
    msg = ghs.check_declared_statements(["H225"], 1)
    assert msg == "declared H225, but the data give category 1 (H224)"
    msg = ghs.check_declared_statements([], 3)
    assert msg == "no flammable-liquid statement declared, but the data give category 3 (H226)"
    msg = ghs.check_declared_statements(["H226"], None)
    assert msg == "declared H226, but the data give no flammable-liquid category"
    assert "several" in ghs.check_declared_statements(["H225", "H226"], 2)
    # Accepted when consistent with any category within the uncertainty band.
    assert ghs.check_declared_statements(["H226"], 2, possible={2, 3}) is None
    # Where category 4 is not adopted (EU CLP) a missing H227 is fine.
    assert ghs.check_declared_statements([], 4, category_4_adopted=False) is None
    assert ghs.check_declared_statements([], 4) is not None
