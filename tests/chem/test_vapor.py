"""Tests for builder.chem.vapor against chemicals' Poling Antoine data and hand calculations."""

from __future__ import annotations

import math

import numpy as np
import pytest
from conftest import report_volatility

from builder.chem import vapor
from builder.chem.vapor import Antoine

# Toluene, Poling Antoine in chemicals (log10, Pa, K): 9.05043, 1327.62, -55.525,
# 286.44-409.61 K; chemicals.vapor_pressure.Antoine gives 3789.04 Pa at 298.15 K.
TOLUENE_POLING = (9.05043, 1327.62, -55.525)
TOLUENE_P25 = 3789.0376


def test_antoine_internal_form_matches_chemicals():
    import chemicals.vapor_pressure as chem  # pinned test dependency: import plainly so absence fails
    a = Antoine(*TOLUENE_POLING, 286.44, 409.61)
    r = a.pressure(298.15)
    assert r.in_range
    assert r.value == pytest.approx(chem.Antoine(298.15, *TOLUENE_POLING), rel=1e-12)
    assert r.value == pytest.approx(TOLUENE_P25, rel=1e-6)


@pytest.mark.parametrize(
    "form",
    [
        # The Poling coefficients restated by hand in other units.
        dict(A=9.05043 - math.log10(101325 / 760), B=1327.62, C=-55.525 + 273.15,
             base="log10", p_unit="mmHg", t_unit="degC", Tmin=13.29, Tmax=136.46),
        dict(A=9.05043 - 3, B=1327.62, C=-55.525, base="log10", p_unit="kPa",
             t_unit="K", Tmin=286.44, Tmax=409.61),
        dict(A=9.05043 - 5, B=1327.62, C=-55.525 + 273.15, base="log10", p_unit="bar",
             t_unit="degC", Tmin=13.29, Tmax=136.46),
        dict(A=9.05043 * math.log(10), B=1327.62 * math.log(10), C=-55.525,
             base="ln", p_unit="Pa", t_unit="K", Tmin=286.44, Tmax=409.61),
        dict(A=(9.05043 - math.log10(101325)) * math.log(10), B=1327.62 * math.log(10),
             C=-55.525 + 273.15, base="ln", p_unit="atm", t_unit="degC",
             Tmin=13.29, Tmax=136.46),
    ],
)
def test_antoine_unit_forms_convert_to_same_curve(form):
    a = Antoine.from_published(**form)
    assert a.A == pytest.approx(9.05043, abs=1e-9)
    assert a.B == pytest.approx(1327.62, rel=1e-12)
    assert a.C == pytest.approx(-55.525, abs=1e-9)
    assert a.Tmin == pytest.approx(286.44) and a.Tmax == pytest.approx(409.61)
    assert a.pressure(298.15).value == pytest.approx(TOLUENE_P25, rel=1e-6)


def test_antoine_classic_mmhg_table_for_toluene():
    # Classic mmHg/degC toluene constants 6.95464, 1344.8, 219.482 (from memory,
    # the widely reprinted Lange's-style set): independent of Poling, so agree
    # only to about 0.1 %.
    a = Antoine.from_published(6.95464, 1344.8, 219.482, base="log10", p_unit="mmHg",
                               t_unit="degC", Tmin=6, Tmax=137)
    assert a.pressure(298.15).value == pytest.approx(TOLUENE_P25, rel=2e-3)


def test_antoine_out_of_range_is_flagged_not_hidden():
    a = Antoine(*TOLUENE_POLING, 286.44, 409.61)
    low = a.pressure(250.0)
    assert not low.in_range and low.value > 0
    assert a.pressure(286.44).in_range and a.pressure(409.61).in_range
    assert not a.pressure(409.62).in_range


def test_antoine_inverse_gives_normal_boiling_point():
    a = Antoine(*TOLUENE_POLING, 286.44, 409.61)
    tb = a.temperature(101325.0)
    assert tb.in_range
    # chemicals lists toluene Tb 383.75 K (HEOS); Poling's fit reproduces it to 0.2 K.
    assert tb.value == pytest.approx(383.75, abs=0.2)
    assert a.pressure(tb.value).value == pytest.approx(101325.0, rel=1e-10)


@pytest.mark.parametrize(
    "kwargs, message",
    [
        (dict(base="log2", p_unit="Pa", t_unit="K"), "log base"),
        (dict(base="log10", p_unit="psi", t_unit="K"), "pressure unit"),
        (dict(base="log10", p_unit="Pa", t_unit="F"), "temperature unit"),
    ],
)
def test_antoine_rejects_unknown_forms(kwargs, message):
    with pytest.raises(ValueError, match=message):
        Antoine.from_published(1, 1, 1, Tmin=300, Tmax=400, **kwargs)


def test_antoine_rejects_degc_constant_used_with_kelvin():
    # A C below -Tmin (e.g. a kelvin-form C shifted twice) makes T + C <= 0.
    with pytest.raises(ValueError, match="T \\+ C"):
        Antoine(9.0, 1300.0, -300.0, 286.44, 409.61)


def test_antoine_curve_matches_pointwise_and_masks_range():
    a = Antoine(*TOLUENE_POLING, 286.44, 409.61)
    T = np.array([280.0, 298.15, 400.0, 420.0])
    P, mask = vapor.antoine_curve(a, T)
    assert list(mask) == [False, True, True, False]
    assert P[1] == pytest.approx(TOLUENE_P25, rel=1e-6)


def test_myrdal_yalkowsky_is_one_atm_at_tb():
    assert vapor.myrdal_yalkowsky_psat(351.4, 351.4, 1.0, 0.02) == pytest.approx(101325.0)


def test_myrdal_yalkowsky_hand_calculation_toluene():
    # Hand calculation, tau = 0, HBN = 0, Tb = 383.75 K, T = 298.15 K:
    # dT/T = 85.6/298.15 = 0.287104; ln(Tb/T) = 0.252386
    # log10 P/atm = -86*0.287104/19.1 - 90/19.1*(0.287104 - 0.252386) = -1.45634
    # P = 101325 * 10**-1.45634 = 3543.6 Pa (Poling's Antoine: 3789 Pa).
    assert vapor.myrdal_yalkowsky_psat(298.15, 383.75) == pytest.approx(3543.6, rel=2e-4)


def test_hbn_and_tau_hand_values():
    # Ethanol: one OH, M 46.07 g/mol -> HBN = 1/46.07 = 0.021707 mol/g.
    assert vapor.hydrogen_bond_number(1, 0, 0, 46.07) == pytest.approx(1 / 46.07)
    # Butylamine: 0.33*sqrt(1)/73.14
    assert vapor.hydrogen_bond_number(0, 0, 1, 73.14) == pytest.approx(0.33 / 73.14)
    # n-hexane: 4 non-terminal sp3 carbons -> tau = 3; benzene -> 0 (clamped).
    assert vapor.flexibility_tau(4, 0, 0) == 3.0
    assert vapor.flexibility_tau(0, 0, 1) == 0.0


def test_molar_mass_in_kilograms_is_rejected():
    # 0.04607 is ethanol in kg/mol: below one hydrogen atom (1.008 g/mol) in the unit taken
    with pytest.raises(ValueError, match="kg/mol"):
        vapor.hydrogen_bond_number(1, 0, 0, 0.04607)


@pytest.mark.parametrize(
    "cas, tau, n_oh, molar_mass, rel",
    [
        ("108-88-3", 0.0, 0, 92.14, 0.01),  # toluene: 33002 vs CRC 33180 J/mol
        ("64-17-5", 0.0, 1, 46.07, 0.08),  # ethanol: 41064 vs CRC 38560 (+6.5 %)
    ],
)
def test_dhvb_against_crc(cas, tau, n_oh, molar_mass, rel):
    from chemicals import (
        phase_change,  # pinned test dependency: import plainly so absence fails
    )
    phase_change._load_phase_change_constants()
    ref = phase_change.Hvap_data_CRC.loc[cas]
    hbn = vapor.hydrogen_bond_number(n_oh, 0, 0, molar_mass)
    est = vapor.myrdal_yalkowsky_dHvap(ref.Tb, ref.Tb, tau=tau, hbn=hbn)
    assert est == pytest.approx(ref.HvapTb, rel=rel)


def test_dhvb_median_error_against_crc():
    import rdkit  # noqa: F401  pinned test dependency
    stats = report_volatility().dhvb_stats()
    assert stats["n"] >= 400
    assert stats["median_rel"] < 0.04  # measured 0.027


def test_dhvap_grows_below_tb():
    at_25c = vapor.myrdal_yalkowsky_dHvap(298.15, 383.75)
    assert at_25c > vapor.myrdal_yalkowsky_dHvap(383.75, 383.75)


def test_curve_equals_scalar():
    T = np.linspace(250.0, 380.0, 7)
    curve = vapor.myrdal_yalkowsky_curve(T, 383.75, 0.0, 0.0)
    assert curve == pytest.approx([vapor.myrdal_yalkowsky_psat(t, 383.75) for t in T], rel=1e-12)


def test_estimate_uncertainty_and_range():
    e = vapor.estimate_psat(298.15, 383.75, h_bond_donor=False)
    assert e.u_ln == vapor.U_LN_PSAT_NON_HBOND and e.in_range
    assert vapor.estimate_psat(298.15, 351.4, hbn=0.0217).u_ln == vapor.U_LN_PSAT_HBOND
    assert vapor.estimate_psat(298.15, 383.75).u_ln == vapor.U_LN_PSAT_HBOND  # unknown
    assert not vapor.estimate_psat(400.0, 383.75).in_range


def _dlnp_dtb_closed_form(T, Tb, tau, hbn):
    # derivative of Myrdal & Yalkowsky (1997), log10 P/atm = -dSvb (Tb - T)/(19.1 T)
    #   - dCp/19.1 ((Tb - T)/T - ln(Tb/T)), with respect to Tb, times ln 10
    d_svb, d_cp = 86.0 + 0.4 * tau + 1421.0 * hbn, 90.0 + 2.1 * tau
    return math.log(10.0) * (-d_svb / (19.1 * T) - d_cp / 19.1 * (1.0 / T - 1.0 / Tb))


@pytest.mark.parametrize("T, Tb, tau, hbn", [
    (298.15, 383.75, 0.0, 0.0),  # toluene
    (293.15, 351.4, 0.0, 1 / 46.07),  # ethanol
    (298.15, 490.0, 6.0, 0.0),  # a flexible, high-boiling chain
])
def test_tb_sensitivity_matches_the_closed_form(T, Tb, tau, hbn):
    assert vapor.ln_psat_tb_sensitivity(T, Tb, tau, hbn) == pytest.approx(
        _dlnp_dtb_closed_form(T, Tb, tau, hbn), rel=1e-5)


def test_boiling_point_uncertainty_is_combined_as_in_the_gum():
    # JCGM 100:2008 eq. 10 for uncorrelated inputs: u^2 = u_model^2 + (dlnP/dTb u_Tb)^2
    T, Tb, u_tb = 298.15, 383.75, 12.0
    plain = vapor.estimate_psat(T, Tb, h_bond_donor=False)
    combined = vapor.estimate_psat(T, Tb, h_bond_donor=False, u_Tb=u_tb)
    assert plain.u_ln == vapor.U_LN_PSAT_NON_HBOND and combined.value == plain.value
    assert combined.u_ln == pytest.approx(math.hypot(vapor.U_LN_PSAT_NON_HBOND,
                                                     _dlnp_dtb_closed_form(T, Tb, 0.0, 0.0) * u_tb), rel=1e-5)
    assert combined.u == pytest.approx(combined.value * combined.u_ln)
    # first order is good here: a Monte Carlo spread of ln P over Tb ~ N(Tb, u_Tb) agrees within 5 %
    rng = np.random.default_rng(3)
    samples = [math.log(vapor.myrdal_yalkowsky_psat(T, tb)) for tb in rng.normal(Tb, u_tb, 4000)]
    assert float(np.std(samples)) == pytest.approx(abs(_dlnp_dtb_closed_form(T, Tb, 0.0, 0.0)) * u_tb, rel=0.05)


def test_dhvap_uncertainty_covers_about_two_thirds_of_crc():
    # a standard uncertainty is a one-sigma interval: about 68 % of the CRC values
    # (chemicals.phase_change.Hvap_data_CRC, HvapTb at Tb) should lie within it
    from chemicals import phase_change

    report = report_volatility()
    phase_change._load_phase_change_constants()
    data = phase_change.Hvap_data_CRC.dropna(subset=["HvapTb", "Tb"])
    inside = total = 0
    for cas, r in data.iterrows():
        s = report.structure(report.smiles_of(cas) or "")
        if s is None:
            continue
        e = vapor.estimate_dhvap_at_tb(r.Tb, s.tau, s.hbn)
        assert e.u == pytest.approx(vapor.U_REL_DHVAP_TB * e.value)
        total += 1
        inside += abs(e.value - r.HvapTb) <= e.u
    assert total >= 400
    assert 0.60 <= inside / total <= 0.76  # measured 0.66


@pytest.fixture(scope="module")
def psat_rows():
    import chemicals  # noqa: F401  pinned test dependency
    import rdkit  # noqa: F401  pinned test dependency
    return report_volatility().psat_rows()


def test_psat_25c_against_poling_antoine(psat_rows):
    report = report_volatility()
    overall = report.psat_stats(psat_rows)
    no_donor = report.psat_stats(psat_rows, donors=False)
    donor = report.psat_stats(psat_rows, donors=True)
    assert overall["n"] >= 100 and donor["n"] >= 15
    # Measured 0.069 overall, 0.057 without and 0.18 with donors.
    assert overall["median_rel"] < 0.10
    assert no_donor["median_rel"] < 0.08
    assert donor["median_rel"] < 0.25
    # The declared uncertainties are not smaller than the measured RMS ln ratio.
    assert no_donor["rms_ln"] <= vapor.U_LN_PSAT_NON_HBOND
    assert donor["rms_ln"] <= vapor.U_LN_PSAT_HBOND
