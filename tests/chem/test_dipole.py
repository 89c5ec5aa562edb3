"""Tests for builder.chem.dipole and builder.chem.structure3d.

Sources: reference moments bundled with ``chemicals`` 1.5.2 (CCCBDB, Muller, Poling;
see conftest.py); the debye definition (CODATA); point-group facts of the trade
("common practice": centrosymmetric, D-infinity-h and Td molecules have no dipole).
"""

from __future__ import annotations

import math
import statistics

import numpy as np
import pytest

from builder.chem.dipole import (
    FAMILIES,
    METHOD_GASTEIGER,
    METHOD_MMFF,
    METHOD_RAW_MMFF,
    MMFF_STANDARD_UNCERTAINTY_D,
    POLAR_THRESHOLD_D,
    bond_increment_keys,
    dipole_moment,
    load_model,
    molecule_family,
    point_charge_dipole,
    recalibrated_charges,
    standard_uncertainty,
)
from builder.chem.structure3d import (
    canonical_smiles,
    clear_cache,
    conformer_ensemble,
    count_torsions,
)


def test_point_charge_dipole_is_one_elementary_charge_angstrom_in_debye():
    # 1 e * 1 angstrom = 1.602176634e-29 C m; 1 D = 3.33564e-30 C m (CODATA) -> 4.8032 D
    moment = point_charge_dipole(np.array([1.0, -1.0]), np.array([[0, 0, 0.5], [0, 0, -0.5]]))
    assert moment == pytest.approx(1.602176634e-29 / 3.33564095e-30, rel=1e-6)


def test_point_charge_dipole_of_neutral_set_does_not_depend_on_origin():
    charges = np.array([0.4, -0.1, -0.3])
    xyz = np.array([[0.0, 0.1, 0.2], [1.3, -0.4, 0.0], [-0.2, 1.1, 0.7]])
    assert point_charge_dipole(charges, xyz) == pytest.approx(
        point_charge_dipole(charges, xyz + np.array([5.0, -3.0, 2.0])), rel=1e-12
    )


@pytest.fixture(scope="module")
def held_out_comparison(reference_rows):
    """(estimate, reference, family) [D] for the reference molecules the fit left out.

    The split is the fit's own (``builder.fitting.dipole.split_hash``: SHA-256 of the
    InChIKey's first block, below 20 of 100 held out), so none of these rows shaped the
    recalibration.
    """
    from rdkit import Chem

    from builder.fitting.dipole import HELD_OUT_PERCENT, split_hash

    rows = []
    for row in reference_rows:
        mol = Chem.MolFromSmiles(row.smiles)
        if split_hash(Chem.MolToInchiKey(mol)) >= HELD_OUT_PERCENT:
            continue
        estimate = dipole_moment(row.smiles)
        if estimate.value_D is not None:
            rows.append((estimate.value_D, row.dipole_D, estimate.uncertainty_D))
    return rows


@pytest.mark.slow
def test_held_out_reference_agreement_and_error(held_out_comparison):
    """Held-out part of the CCCBDB/Muller/Poling set in chemicals 1.5.2 (about 105 molecules
    with a clear reference, a few seconds on one core).

    Measured with RDKit 2026.09.1: MAE 0.32 D, 97.1 % polar/non-polar agreement (the
    uncorrected MMFF94 charges: 0.64 D); the bounds leave room for embedding drift.
    """
    assert len(held_out_comparison) >= 90
    errors = [abs(est - ref) for est, ref, _ in held_out_comparison]
    agree = statistics.fmean(float((est > POLAR_THRESHOLD_D) == (ref > POLAR_THRESHOLD_D))
                             for est, ref, _ in held_out_comparison)
    assert statistics.fmean(errors) <= 0.35
    assert agree >= 0.96


@pytest.mark.slow
def test_held_out_errors_are_covered_by_the_stated_family_uncertainty(held_out_comparison):
    # With a standard uncertainty u, about 95 % of errors lie within 2u for a normal
    # distribution; the errors are heavy-tailed, so 90 % is required. The references are
    # the chemicals 1.5.2 moments, none of which entered the fit.
    inside = [abs(est - ref) <= 2 * u for est, ref, u in held_out_comparison]
    assert statistics.fmean(inside) >= 0.90, statistics.fmean(inside)


@pytest.mark.slow
def test_whole_reference_set_is_not_worse_than_the_uncorrected_charges(reference_rows):
    # Whole CCCBDB/Muller/Poling set (training part included): the recalibration must beat
    # the uncorrected MMFF94 charges (MAE 0.57 D, measured before the change) clearly.
    errors = []
    for row in reference_rows:
        estimate = dipole_moment(row.smiles)
        if estimate.value_D is not None:
            errors.append(abs(estimate.value_D - row.dipole_D))
    assert len(errors) >= 0.9 * len(reference_rows)
    assert statistics.fmean(errors) <= 0.40
    assert math.sqrt(statistics.fmean(e * e for e in errors)) <= MMFF_STANDARD_UNCERTAINTY_D + 0.1


@pytest.mark.parametrize(
    "smiles",
    ["ClC(Cl)(Cl)Cl", "O=C=O", "S=C=S", "Cl/C=C/Cl", "Clc1ccc(Cl)cc1", "c1ccccc1",
     "ClCl", "C#C", "FC(F)(F)F"],
)
def test_symmetric_molecules_have_no_dipole(smiles):
    # common practice: Td, D-infinity-h, D2h and D6h molecules are non-polar
    assert dipole_moment(smiles).value_D < 0.1


# Outside tolerance for a single molecule: within 0.6 D or within 35 % of the reference
# moment in ``chemicals.dipole`` (CCCBDB), whichever is wider. It is independent of the
# program's own uncertainty, which is derived from the program's error on the same set.
DIPOLE_ABS_TOL_D = 0.6
DIPOLE_REL_TOL = 0.35

_CHLOROFORM = pytest.mark.xfail(
    strict=True, reason="still overestimated (1.64 D): three C-Cl bond dipoles do not cancel enough "
                        "with increments shared by every C-Cl bond")
_RARE_BOND = pytest.mark.xfail(
    strict=True, reason="underestimated (0.9 D): C-I bonds occur in only two training molecules, so "
                        "no increment is fitted and only the scaled-down MMFF94 charges apply")


@pytest.mark.parametrize(
    ("smiles", "cas"),
    [
        pytest.param("Cl/C=C\\Cl", "156-59-2", id="cis-1,2-dichloroethene"),
        pytest.param("ClC(Cl)Cl", "67-66-3", marks=_CHLOROFORM, id="chloroform"),
        pytest.param("ClCCl", "75-09-2", id="dichloromethane"),
        pytest.param("CCO", "64-17-5", id="ethanol"),
        pytest.param("CCOCC", "60-29-7", id="diethyl-ether"),
        pytest.param("CCN(CC)CC", "121-44-8", id="triethylamine"),
        pytest.param("CCCCOCCO", "111-76-2", id="2-butoxyethanol"),
        pytest.param("Clc1ccccc1", "108-90-7", id="chlorobenzene"),
        pytest.param("CC(C)=O", "67-64-1", id="acetone"),
        pytest.param("O", "7732-18-5", id="water"),
        pytest.param("CO", "67-56-1", id="methanol"),
        pytest.param("CC#N", "75-05-8", id="acetonitrile"),
        pytest.param("c1ccncc1", "110-86-1", id="pyridine"),
        pytest.param("CC(=O)OCC", "141-78-6", id="ethyl-acetate"),
        pytest.param("CF", "593-53-3", id="fluoromethane"),
        pytest.param("CBr", "74-83-9", id="bromomethane"),
        pytest.param("CI", "74-88-4", marks=_RARE_BOND, id="iodomethane"),
        pytest.param("CN(C)C=O", "68-12-2", id="dimethylformamide"),
    ],
)
def test_polar_molecules_match_reference_within_stated_error(smiles, cas):
    from chemicals.dipole import dipole_moment as reference

    expected = reference(cas)  # CCCBDB value as bundled in chemicals 1.5.2
    estimate = dipole_moment(smiles)
    assert estimate.polar
    assert estimate.value_D == pytest.approx(expected, abs=DIPOLE_ABS_TOL_D, rel=DIPOLE_REL_TOL)


def test_estimates_keep_the_reference_order_of_polar_molecules():
    # Reference moments from chemicals.dipole (CCCBDB): acetonitrile 3.92 > acetone 2.88
    # > pyridine 2.19 > chlorobenzene 1.69 > toluene 0.33 D; the estimates must rank alike.
    from chemicals.dipole import dipole_moment as reference

    molecules = [("CC#N", "75-05-8"), ("CC(C)=O", "67-64-1"), ("c1ccncc1", "110-86-1"),
                 ("Clc1ccccc1", "108-90-7"), ("Cc1ccccc1", "108-88-3")]
    references = [reference(cas) for _, cas in molecules]
    assert references == sorted(references, reverse=True)  # the list is written in that order
    estimates = [dipole_moment(smiles).value_D for smiles, _ in molecules]
    assert estimates == sorted(estimates, reverse=True), estimates


def test_stereo_in_smiles_is_respected():
    trans, cis = dipole_moment("Cl/C=C/Cl"), dipole_moment("Cl/C=C\\Cl")
    assert trans.value_D < 0.1
    assert cis.value_D > 1.0


def test_ions_get_no_value_and_a_status():
    estimate = dipole_moment("C[N+](C)(C)C")
    assert estimate.value_D is None
    assert "origin" in estimate.status


def test_molecule_mmff_cannot_type_falls_back_to_gasteiger_and_says_so():
    estimate = dipole_moment("F")  # HF: no MMFF94 type for F bonded to H
    assert estimate.method == METHOD_GASTEIGER
    assert "Gasteiger" in estimate.status
    assert estimate.value_D > POLAR_THRESHOLD_D  # HF is polar (reference 1.83 D, CCCBDB)


def test_single_atoms_have_zero_moment():
    for smiles in ("[He]", "[Ne]", "[Ar]", "[Kr]", "[Xe]"):
        estimate = dipole_moment(smiles)
        assert estimate.value_D == 0.0
        assert "atom" in estimate.status


def test_default_route_is_mmff_for_organics():
    assert dipole_moment("CCO").method == METHOD_MMFF


def test_deterministic_without_cache():
    first = dipole_moment("CCCCO")
    clear_cache()
    second = dipole_moment("CCCCO")
    assert first == second


def test_boltzmann_weights_are_normalised_and_favour_low_energy():
    ensemble = conformer_ensemble(canonical_smiles("CCCCCC"))
    weights = ensemble.weights()
    assert weights.sum() == pytest.approx(1.0)
    energies = np.asarray(ensemble.energies_kcal_mol)
    assert weights[np.argmin(energies)] == weights.max()


def test_torsion_count_ignores_methyl_tops_but_counts_hydroxyl_rotors():
    from rdkit import Chem

    assert count_torsions(Chem.MolFromSmiles("CC")) == 0
    assert count_torsions(Chem.MolFromSmiles("CCCC")) == 1
    assert count_torsions(Chem.MolFromSmiles("CCO")) == 1
    assert count_torsions(Chem.MolFromSmiles("CC(F)(F)F")) == 0


def test_unparsable_smiles_raises_value_error():
    with pytest.raises(ValueError, match="did not parse"):
        dipole_moment("C1CC")


def test_recalibrated_charges_keep_the_total_charge_and_symmetry():
    # Every increment moves charge from one bond atom to the other, so the total stays that
    # of the base charges (zero for a neutral molecule, Kirchhoff-style bookkeeping), and
    # the three H atoms of methanol's methyl group stay equal (they are equivalent).
    from rdkit import Chem
    from rdkit.Chem import rdForceFieldHelpers

    for smiles in ("CO", "CC(=O)OCC", "Clc1ccccc1", "CCN(CC)CC"):
        mol = Chem.AddHs(Chem.MolFromSmiles(smiles))
        props = rdForceFieldHelpers.MMFFGetMoleculeProperties(mol)
        base = np.array([props.GetMMFFPartialCharge(i) for i in range(mol.GetNumAtoms())])
        charges = recalibrated_charges(mol, base, "mmff")
        assert abs(charges.sum() - base.sum()) < 1e-9
    mol = Chem.AddHs(Chem.MolFromSmiles("CO"))
    props = rdForceFieldHelpers.MMFFGetMoleculeProperties(mol)
    base = np.array([props.GetMMFFPartialCharge(i) for i in range(mol.GetNumAtoms())])
    charges = recalibrated_charges(mol, base, "mmff")
    methyl_h = [a.GetIdx() for a in mol.GetAtoms() if a.GetSymbol() == "H" and a.GetNeighbors()[0].GetSymbol() == "C"]
    assert len(methyl_h) == 3 and np.ptp(charges[methyl_h]) < 1e-12


def test_bond_increment_terms_name_the_positive_end_first():
    from rdkit import Chem

    mol = Chem.AddHs(Chem.MolFromSmiles("CO"))
    for key, i, j, _ in bond_increment_keys(mol):
        first, second = key[2:].split("-")
        assert mol.GetAtomWithIdx(i).GetSymbol() == first.rstrip("0123456789a")
        assert mol.GetAtomWithIdx(j).GetSymbol() == second.rstrip("0123456789a")


def test_uncorrected_mmff_route_overestimates_ethanol_more_than_the_default():
    # Ethanol, 1.44 D in chemicals 1.5.2 (first table with a value); 1.69 D in CCCBDB
    # (from memory). The uncorrected MMFF94 charges gave 2.2 D (issue report).
    from chemicals.dipole import dipole_moment as reference

    raw, default = dipole_moment("CCO", charges="mmff"), dipole_moment("CCO")
    assert raw.method == METHOD_RAW_MMFF and raw.uncertainty_D is None
    assert abs(raw.value_D - reference("64-17-5")) > abs(default.value_D - reference("64-17-5"))


def test_radicals_get_no_value_and_a_status():
    # NO2 is an open-shell molecule; neither charge model is parameterised for radicals.
    estimate = dipole_moment("[O]N=O")
    assert estimate.value_D is None
    assert "radical" in estimate.status


def test_families_follow_their_definitions():
    from rdkit import Chem

    cases = {"CCCC": "hydrocarbon", "FC(F)Cl": "halocarbon", "CC(=O)O": "O-H/N-H", "CN": "O-H/N-H",
             "CC#N": "other N/O", "COC": "other N/O", "CSC": "S, P, Si, other", "O=S=O": "inorganic",
             "C[Si](C)(C)C": "S, P, Si, other", "N": "inorganic"}
    for smiles, family in cases.items():
        assert molecule_family(Chem.AddHs(Chem.MolFromSmiles(smiles))) == family, smiles
        assert molecule_family(Chem.MolFromSmiles(smiles)) == family, smiles


def test_every_family_has_a_measured_uncertainty_from_enough_molecules():
    table = load_model()["uncertainty"]["families"]
    assert set(table) == set(FAMILIES)
    assert all(entry["n"] >= 20 for entry in table.values()), table
    from rdkit import Chem

    assert standard_uncertainty(Chem.MolFromSmiles("c1ccccc1")) == table["hydrocarbon"]["standard_uncertainty_D"]


@pytest.mark.slow
def test_shipped_validation_matches_the_runtime_on_the_held_out_rows():
    # The held-out figure in dipole_validation.json is computed by the fitting script from
    # its own arrays; the runtime path (dipole_moment) must give the same MAE.
    import json

    from builder.chem.dipole import MODEL_PATH
    from builder.fitting.dipole import load_records

    shipped = json.loads((MODEL_PATH.parent / "dipole_validation.json").read_text())
    figures = shipped["methods"]["recalibrated"]["all"]
    errors = []
    for record in load_records():
        if record.held_out:
            estimate = dipole_moment(record.smiles)
            if estimate.value_D is not None:
                errors.append(abs(estimate.value_D - record.dipole_D))
    assert len(errors) == figures["n"]
    assert statistics.fmean(errors) == pytest.approx(figures["mae_D"], abs=0.002)
