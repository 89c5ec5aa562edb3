"""Tests for builder.chem.bands: COSHH Essentials volatility bands (HSG193; Maidment 1998)."""

from __future__ import annotations

import pytest

from builder.chem.bands import volatility_band

C = 273.15


@pytest.mark.parametrize("bp_c, expected", [
    (49.9, "high"), (50.0, "medium"), (150.0, "medium"), (150.1, "low"),
    (34.6, "high"),    # diethyl ether
    (56.0, "medium"),  # acetone
    (197.3, "low"),    # ethylene glycol
])
def test_room_temperature_boundaries(bp_c, expected):
    assert volatility_band(bp_c + C) == expected


@pytest.mark.parametrize("bp_c, tp_c, expected", [
    # Tp = 60 degC: high below 2*60+10 = 130, low above 5*60+50 = 350.
    (129.9, 60.0, "high"), (130.0, 60.0, "medium"),
    (350.0, 60.0, "medium"), (350.1, 60.0, "low"),
    # Tp = 100 degC: 210 and 550.
    (209.9, 100.0, "high"), (210.0, 100.0, "medium"), (550.1, 100.0, "low"),
])
def test_process_temperature_boundaries(bp_c, tp_c, expected):
    assert volatility_band(bp_c + C, tp_c + C) == expected


def test_process_rule_reduces_to_room_rule_at_20c():
    for bp_c in (49.9, 50.0, 100.0, 150.0, 150.1):
        assert volatility_band(bp_c + C, 20.0 + C) == volatility_band(bp_c + C)


def test_heating_raises_the_band():
    # Toluene (bp 110.6 degC): medium at 20 degC, high at 60 degC.
    assert volatility_band(110.6 + C) == "medium"
    assert volatility_band(110.6 + C, 60.0 + C) == "high"
