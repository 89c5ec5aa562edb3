"""Tests for builder.chem.boiling (and the fitted model it ships).

External references: CRC Handbook organic boiling points from chemicals
1.5.2 (held-out split, recomputed here from the shipped model, not read from
boiling_validation.json); trends that are common practice.
"""

from __future__ import annotations

from functools import lru_cache

import chemicals  # noqa: F401  pinned test dependency: its absence must fail, not skip
import pytest

from builder.chem.boiling import (
    BOILING_METHODS,
    TbEstimate,
    estimate_boiling_point,
    load_model,
)


@lru_cache(maxsize=1)
def validation():
    from builder.fitting.boiling import load_records, validate

    return validate(load_records(), load_model())


def tb(smiles: str) -> float:
    value = estimate_boiling_point(smiles).value_K
    assert value is not None, smiles
    return value


@pytest.mark.slow
def test_held_out_accuracy():
    ours = validation()["methods"]["joback_sb_trees"]["all"]
    assert ours["n"] > 800
    assert ours["mae_K"] <= 12.0
    assert ours["median_ae_K"] <= 7.0
    assert abs(ours["bias_K"]) <= 4.0


# The intended domain, written out here rather than taken from boiling.check_structure
# (which also filters the training data, so coverage of that data is 1 by construction):
# organic (carbon-containing) single-fragment molecules of these elements.
INTENDED_ELEMENTS = {"C", "H", "N", "O", "S", "F", "Cl", "Br", "I"}


@pytest.mark.slow
def test_estimates_cover_the_crc_table():
    """Every CRC Handbook row (chemicals 1.5.2, Tb_sources["CRC_ORG"]) whose structure
    (chemicals.identifiers) parses into one fragment of the intended elements must get a
    value, bar at most 1 % (charged or otherwise odd structures); about 30 s."""
    from chemicals.identifiers import search_chemical
    from chemicals.phase_change import Tb_sources
    from rdkit import Chem, RDLogger

    RDLogger.DisableLog("rdApp.*")
    in_domain = covered = 0
    for cas in Tb_sources["CRC_ORG"].dropna(subset=["Tb"]).index:
        try:
            smiles = search_chemical(cas).smiles
        except ValueError:
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        if mol is None or len(Chem.GetMolFrags(mol)) != 1:
            continue
        elements = {atom.GetSymbol() for atom in mol.GetAtoms()}
        if "C" not in elements or not elements <= INTENDED_ELEMENTS:
            continue
        in_domain += 1
        covered += estimate_boiling_point(mol).value_K is not None
    assert in_domain > 4000
    assert covered / in_domain >= 0.99, (covered, in_domain)


def test_no_size_band_worse_than_stein_brown():
    methods = validation()["methods"]
    for band, ours in methods["joback_sb_trees"].items():
        assert ours["mae_K"] <= methods["joback_stein_brown"][band]["mae_K"], band


def test_published_methods_reproduce_expected_error():
    """Joback's error on the held-out CRC rows, against two outside references:

    - thermo 0.6.1's independent Joback implementation on the same rows must give the
      same mean absolute error (within 0.5 K);
    - Joback & Reid (1987) report an average absolute error of 12.91 K over 438
      compounds (as quoted in the docstring of thermo's ``Joback.Tb``). Those were the
      compounds the increments were fitted to, so on other compounds the error is
      expected to be larger (common practice); Stein & Brown (1994) introduced their
      correction because Joback's sum errs increasingly for larger molecules, so the
      corrected sum must do better than the plain one.
    """
    import statistics

    import thermo.group_contribution.joback as thermo_joback
    from rdkit import Chem

    from builder.fitting.boiling import load_records

    methods = validation()["methods"]
    ours = methods["joback"]["all"]["mae_K"]
    errors = []
    for record in load_records():
        if not record.held_out:
            continue
        reference = thermo_joback.Joback(Chem.MolFromSmiles(record.smiles))
        if reference.status == "OK":
            errors.append(abs(reference.Tb(reference.counts) - record.tb_K))
    assert len(errors) >= 0.9 * methods["joback"]["all"]["n_estimated"]
    assert ours == pytest.approx(statistics.fmean(errors), abs=0.5)
    assert ours > 12.91
    assert methods["joback_stein_brown"]["all"]["mae_K"] < ours


def test_interval90_covers_85_to_95_percent():
    coverage = validation()["methods"]["joback_sb_trees"]["all"]["interval90_coverage"]
    assert 0.85 <= coverage <= 0.95


def test_n_alkanes_rise_monotonically():
    # Common practice: each CH2 raises Tb of the n-alkanes C1-C20.
    values = [tb("C" * n) for n in range(1, 21)]
    assert all(b > a for a, b in zip(values, values[1:])), values


def test_pentane_isomers_branching_lowers_tb():
    # Common practice (measured 309.2 > 301.0 > 282.6 K).
    assert tb("CCCCC") > tb("CC(C)CC") > tb("CC(C)(C)C")


@pytest.mark.parametrize(
    ("higher", "lower", "cas_higher", "cas_lower"),
    [
        ("Cl/C=C\\Cl", "Cl/C=C/Cl", "156-59-2", "156-60-5"),  # 1,2-dichloroethene: cis above trans
        ("COC(=O)/C=C\\C(=O)OC", "COC(=O)/C=C/C(=O)OC", "624-48-6", "624-49-7"),  # maleate above fumarate
        ("C/C=C/C(=O)O", "C/C=C\\C(=O)O", "107-93-7", "503-64-0"),  # 2-butenoic acid: trans above cis
    ],
    ids=["1,2-dichloroethene", "dimethyl-maleate-fumarate", "2-butenoic-acid"],
)
def test_stereoisomers_come_out_in_the_measured_order(higher, lower, cas_higher, cas_lower):
    # Measured order from the CRC Handbook table in chemicals 1.5.2 (CRC_ORG); these rows
    # are training rows of the model, so this checks that the stereo features reach the
    # estimate at all (the pair figure over the whole table is in boiling_validation.json).
    from chemicals.phase_change import Tb_sources

    crc = Tb_sources["CRC_ORG"]["Tb"]
    assert crc[cas_higher] > crc[cas_lower] + 5
    assert tb(higher) > tb(lower)


@pytest.mark.slow
def test_stereo_pair_order_over_the_crc_table():
    # Stereoisomer pairs (same connectivity, CRC Tb differing by >= 5 K, chemicals 1.5.2).
    # Measured with the shipped model: 10 of 20 in the right order, 6 of 10 where both
    # SMILES specify all stereo (misses: diethyl maleate/fumarate by 0.5 K, 1,3-dichloro-
    # propene, and two dimethylcyclohexanes, whose ring stereo the 2D features cannot
    # see). Before the stereo features: 0 of 20 (every pair got equal estimates).
    pairs = validation()["stereo_pairs"]
    assert pairs["n"] >= 15
    assert pairs["right_order"] >= 0.45 * pairs["n"]
    assert pairs["right_order_specified"] >= 0.5 * pairs["n_specified"]


def test_alcohol_above_ether_of_same_formula():
    assert tb("CCCCO") > tb("CCOCC") + 30  # measured 390.9 vs 307.6 K


def test_octanol_above_octane():
    assert tb("CCCCCCCCO") > tb("CCCCCCCC") + 40  # measured 468.3 vs 398.8 K


def test_estimate_carries_uncertainty_and_interval():
    est = estimate_boiling_point("CCCCCCO")
    assert est.method == BOILING_METHODS[0]
    assert est.uncertainty_K > 0
    low, high = est.interval90_K
    assert low < est.value_K < high
    assert est.reference


def test_other_methods_selectable():
    joback = estimate_boiling_point("CC(C)=O", method="joback")
    corrected = estimate_boiling_point("CC(C)=O", method="joback_stein_brown")
    assert joback.method == "joback" and corrected.method == "joback_stein_brown"
    assert joback.value_K != corrected.value_K


def test_unknown_method_lists_valid_ones():
    with pytest.raises(ValueError, match="joback_stein_brown"):
        estimate_boiling_point("CCO", method="guess")


@pytest.mark.parametrize(
    ("smiles", "reason"),
    [
        ("C1CC", "did not parse"),
        ("CC(=O)[O-].[Na+]", "fragment"),
        ("C[Si](C)(C)C", "element"),
        ("O", "carbon"),
    ],
)
def test_out_of_domain_structures_get_no_value(smiles, reason):
    est = estimate_boiling_point(smiles)
    assert est.value_K is None and est.interval90_K is None
    assert reason in est.status


def test_works_where_joback_has_no_group():
    # N-methylpyrrolidine: ring tertiary N has no Joback group.  Measured
    # 353.4 K (NIST WebBook via chemicals; the CRC row, 479 K, is a data
    # problem and is in the training split).
    from chemicals.phase_change import Tb

    assert estimate_boiling_point("CN1CCCC1", method="joback").value_K is None
    assert tb("CN1CCCC1") == pytest.approx(Tb("120-94-5", method="WEBBOOK"), abs=30)


def test_estimate_rejects_value_free_ok():
    with pytest.raises(ValueError):
        TbEstimate(None, None, "joback", "ref", "OK")
