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
    METHOD_GASTEIGER,
    METHOD_MMFF,
    MMFF_STANDARD_UNCERTAINTY_D,
    POLAR_THRESHOLD_D,
    dipole_moment,
    point_charge_dipole,
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
def reference_comparison(reference_rows):
    """(number of rows, absolute errors [D], polar/non-polar agreements) over the set."""
    errors, agree = [], 0
    for row in reference_rows:
        estimate = dipole_moment(row.smiles)
        if estimate.value_D is None:
            continue
        errors.append(abs(estimate.value_D - row.dipole_D))
        agree += (estimate.value_D > POLAR_THRESHOLD_D) == (row.dipole_D > POLAR_THRESHOLD_D)
    return len(reference_rows), errors, agree


@pytest.mark.slow
def test_reference_set_agreement_and_error(reference_comparison):
    """Full reference set (about 550 molecules, about 20 s on one core).

    Measured with RDKit 2026.09.1: 96.8 % agreement, MAE 0.57 D over 532 molecules;
    the bounds leave room for RDKit-version drift of the embedding.
    """
    n_rows, errors, agree = reference_comparison
    assert n_rows > 500
    assert len(errors) >= 0.95 * n_rows
    assert agree / len(errors) >= 0.95
    assert statistics.mean(errors) <= 0.65


@pytest.mark.slow
def test_reference_set_rms_error_within_stated_standard_uncertainty(reference_comparison):
    # The estimate's own stated standard uncertainty must hold up: the root-mean-square
    # error against the CCCBDB/Muller/Poling references may not exceed it.
    _, errors, _ = reference_comparison
    rms = math.sqrt(statistics.mean(e * e for e in errors))
    assert rms <= MMFF_STANDARD_UNCERTAINTY_D, (rms, MMFF_STANDARD_UNCERTAINTY_D)


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

_OVERESTIMATE = pytest.mark.xfail(strict=True, reason="dipole overestimate, open issue #18")


@pytest.mark.parametrize(
    ("smiles", "cas"),
    [
        pytest.param("Cl/C=C\\Cl", "156-59-2", marks=_OVERESTIMATE, id="cis-1,2-dichloroethene"),
        pytest.param("ClC(Cl)Cl", "67-66-3", marks=_OVERESTIMATE, id="chloroform"),
        pytest.param("ClCCl", "75-09-2", marks=_OVERESTIMATE, id="dichloromethane"),
        pytest.param("CCO", "64-17-5", marks=_OVERESTIMATE, id="ethanol"),
        pytest.param("CCOCC", "60-29-7", marks=_OVERESTIMATE, id="diethyl-ether"),
        pytest.param("Clc1ccccc1", "108-90-7", id="chlorobenzene"),
        pytest.param("CC(C)=O", "67-64-1", id="acetone"),
        pytest.param("O", "7732-18-5", id="water"),
        pytest.param("CO", "67-56-1", id="methanol"),
        pytest.param("CC#N", "75-05-8", id="acetonitrile"),
        pytest.param("c1ccncc1", "110-86-1", id="pyridine"),
        pytest.param("CC(=O)OCC", "141-78-6", id="ethyl-acetate"),
        pytest.param("CF", "593-53-3", id="fluoromethane"),
        pytest.param("CBr", "74-83-9", id="bromomethane"),
        pytest.param("CI", "74-88-4", id="iodomethane"),
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
