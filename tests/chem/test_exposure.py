"""Tests for builder.chem.exposure against hand calculations."""

from __future__ import annotations

import pytest

from builder.chem import exposure


def test_svc_ppm_hand_calculation():
    # Toluene at 25 degC, P = 3789 Pa: 1e6 * 3789 / 101325 = 37394.5 ppm.
    assert exposure.saturated_vapor_concentration_ppm(3789.0) == pytest.approx(37394.5, abs=0.1)
    # At a lower total pressure (e.g. 90 kPa at altitude) the fraction rises.
    assert exposure.saturated_vapor_concentration_ppm(3789.0, 90000.0) == pytest.approx(42100.0)


def test_svc_mass_hand_calculation():
    # 3789 Pa * 0.09214 kg/mol / (8.314462618 * 298.15) = 0.14083 kg/m3 (molar mass given in g/mol).
    c = exposure.saturated_vapor_mass_concentration(3789.0, 92.14, 298.15)
    assert c == pytest.approx(0.14083, rel=1e-4)
    # Consistent with ppm * M / 24.465 L/mol (chemicals' ppmv_to_mgm3 basis at 25 degC).
    ppm = exposure.saturated_vapor_concentration_ppm(3789.0)
    assert c * 1e6 == pytest.approx(ppm * 92.14 / 24.465, rel=1e-3)


def test_vapor_hazard_ratio():
    # 37394.5 ppm / 20 ppm = 1869.7 (toluene TWA 20 ppm, chemicals.safety.TWA).
    assert exposure.vapor_hazard_ratio(37394.5, 20.0) == pytest.approx(1869.7, abs=0.1)
    with pytest.raises(ValueError):
        exposure.vapor_hazard_ratio(1.0, 0.0)


@pytest.mark.parametrize("molar_mass, expected", [
    # Air: 28.9586 g/mol, molar mass of dry air (Lemmon, E. W.; Jacobsen, R. T.;
    # Penoncello, S. G.; Friend, D. G. J. Phys. Chem. Ref. Data 2000, 29, 331-385).
    (92.14, 3.1818),  # toluene 92.14 / 28.9586 (g/mol)
    (58.08, 2.0056),  # acetone
    (16.043, 0.5540),  # methane: lighter than air
    (28.9586, 1.0),
])
def test_relative_vapor_density(molar_mass, expected):
    assert exposure.relative_vapor_density(molar_mass) == pytest.approx(expected, abs=1e-4)


def test_kilograms_per_mole_rejected():
    # below one hydrogen atom (1.008 g/mol, IUPAC standard atomic weight): given in kg/mol
    with pytest.raises(ValueError, match="kg/mol"):
        exposure.relative_vapor_density(0.09214)
    with pytest.raises(ValueError, match="kg/mol"):
        exposure.saturated_vapor_mass_concentration(3789.0, 0.09214, 298.15)
    with pytest.raises(ValueError, match="not a vapour"):
        exposure.relative_vapor_density(exposure.MAX_MOLAR_MASS * 2)


def test_boiling_liquid_rejected():
    with pytest.raises(ValueError, match="boils"):
        exposure.saturated_vapor_concentration_ppm(120000.0)
