"""Unit conversions against their exact definitions (NIST Special Publication 811, 2008 ed., appendix B)."""
from __future__ import annotations

import pytest

from builder.core.units import UnitProblem, parse_quantity


@pytest.mark.parametrize("text, expected", [
    ("25 °C", 298.15),                     # T/K = t/°C + 273.15 (SP 811 B.8, exact)
    ("25 degC", 298.15),
    ("-40 °C", 233.15),
    ("77 °F", (77 + 459.67) / 1.8),        # T/K = (t/°F + 459.67)/1.8 (exact)
    ("-40 °F", 233.15),                    # -40 °F = -40 °C
    ("310 K", 310.0),
])
def test_temperatures(text, expected):
    assert parse_quantity(text, "temperature")[0] == pytest.approx(expected, abs=1e-9)


@pytest.mark.parametrize("text, expected", [
    ("760 mmHg", 760 * 133.322387415),     # 1 mmHg (conventional) = 133.322 387 415 Pa (exact by definition)
    ("1 bar", 1e5),                        # 1 bar = 10^5 Pa (exact)
    ("1 atm", 101325.0),                   # 1 atm = 101 325 Pa (exact)
    ("5.8 kPa", 5800.0),
    ("1 torr", 101325.0 / 760),            # 1 Torr = 101 325/760 Pa (exact)
])
def test_pressures(text, expected):
    assert parse_quantity(text, "pressure")[0] == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("text, expected", [
    ("1 g/cm3", 1000.0),                   # 1 g/cm³ = 1000 kg/m³ (exact)
    ("0.789 g/cm³", 789.0),
    ("789 kg/m³", 789.0),
    ("0.789 g/mL", 789.0),                 # 1 mL = 1 cm³ (exact since 1964)
])
def test_densities(text, expected):
    assert parse_quantity(text, "density")[0] == pytest.approx(expected, rel=1e-12)


def test_temperature_uncertainty_is_a_difference_not_a_temperature():
    value, unc = parse_quantity("100 ± 9 °F", "temperature")
    assert unc == pytest.approx(5.0)       # a 9 °F difference is 5 K (SP 811 B.8)
    assert value == pytest.approx((100 + 459.67) / 1.8)


@pytest.mark.parametrize("text, dimension", [("78 kPa", "temperature"), ("hot", "temperature"),
                                             (78, "temperature"), ("1 parsec", "pressure")])
def test_refused_with_a_hint(text, dimension):
    with pytest.raises(UnitProblem) as info:
        parse_quantity(text, dimension)
    assert info.value.hint


def test_units_read_without_pint_give_the_floats_pint_gives(monkeypatch):
    # the common units are read by a factor and an offset (units._FAST_UNITS); pint itself is the
    # reference: every value and uncertainty must be the same float, bit for bit
    import random

    from builder.core import units

    rng = random.Random(7)
    texts = []
    for (dimension, unit), _ in units._FAST_UNITS.items():
        for _ in range(400):
            x = round(rng.uniform(-250.0, 5000.0), rng.randint(0, 5))
            u = round(rng.uniform(0.0, 20.0), rng.randint(0, 3))
            texts += [(f"{x} {unit}", dimension), (f"{x} ± {u} {unit}", dimension), (f"{x}{unit}", dimension)]
    fast = [units.parse_quantity(t, d) for t, d in texts]
    monkeypatch.setattr(units, "_FAST_UNITS", {})
    assert fast == [units.parse_quantity(t, d) for t, d in texts]
