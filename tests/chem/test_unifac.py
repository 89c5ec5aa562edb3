"""UNIFAC groups and activity coefficients (builder.chem.unifac), checked against the thermo package.

References outside the project:
- group assignments: the DDBST original-UNIFAC assignments shipped with thermo 0.6.1
  (``thermo.unifac.UNIFAC_group_assignment_DDBST(CAS, "UNIFAC")``), looked up by CAS RN;
- parameters and activity coefficients: ``thermo.unifac.UFSG``/``UFIP`` and
  ``thermo.unifac.UNIFAC.from_subgroups(..., version=0)`` (original UNIFAC, same subgroups);
- the Gibbs–Duhem equation (thermodynamic consistency of any activity-coefficient model).
"""
from __future__ import annotations


import pytest
from rdkit import Chem

from builder.chem import unifac
from builder.chem.unifac import Groups, MissingInteractionParameters, activity_coefficients, unifac_groups

thermo_unifac = pytest.importorskip("thermo.unifac")

import bench_mixture  # tests/benchmarks/: the shared reference systems (name → SMILES, CAS RN)

# (name, CAS RN, SMILES); SMILES from chemicals.identifiers (chemicals 1.5.2)
DDBST_CHECKED = [
    ("hexane", "110-54-3", "CCCCCC"),
    ("cyclohexane", "110-82-7", "C1CCCCC1"),
    ("2,2,4-trimethylpentane", "540-84-1", "CC(C)CC(C)(C)C"),
    ("methylcyclohexane", "108-87-2", "CC1CCCCC1"),
    ("1-hexene", "592-41-6", "CCCCC=C"),
    ("cyclohexene", "110-83-8", "C1CCC=CC1"),
    ("2-methyl-2-butene", "513-35-9", "CC=C(C)C"),
    ("isoprene", "78-79-5", "CC(=C)C=C"),
    ("styrene", "100-42-5", "C=CC1=CC=CC=C1"),
    ("toluene", "108-88-3", "CC1=CC=CC=C1"),
    ("ethylbenzene", "100-41-4", "CCC1=CC=CC=C1"),
    ("p-xylene", "106-42-3", "CC1=CC=C(C=C1)C"),
    ("cumene", "98-82-8", "CC(C)c1ccccc1"),
    ("naphthalene", "91-20-3", "C1=CC=C2C=CC=CC2=C1"),
    ("methanol", "67-56-1", "CO"),
    ("ethanol", "64-17-5", "CCO"),
    ("2-propanol", "67-63-0", "CC(C)O"),
    ("1-butanol", "71-36-3", "CCCCO"),
    ("tert-butanol", "75-65-0", "CC(C)(C)O"),
    ("cyclohexanol", "108-93-0", "C1CCC(CC1)O"),
    ("benzyl alcohol", "100-51-6", "C1=CC=C(C=C1)CO"),
    ("ethylene glycol", "107-21-1", "C(CO)O"),
    ("phenol", "108-95-2", "C1=CC=C(C=C1)O"),
    ("m-cresol", "108-39-4", "CC1=CC(=CC=C1)O"),
    ("water", "7732-18-5", "O"),
    ("acetone", "67-64-1", "CC(=O)C"),
    ("2-butanone", "78-93-3", "CCC(=O)C"),
    ("methyl isobutyl ketone", "108-10-1", "CC(C)CC(=O)C"),
    ("cyclohexanone", "108-94-1", "C1CCC(=O)CC1"),
    ("acetophenone", "98-86-2", "CC(=O)C1=CC=CC=C1"),
    ("acetaldehyde", "75-07-0", "CC=O"),
    ("benzaldehyde", "100-52-7", "C1=CC=C(C=C1)C=O"),
    ("methyl acetate", "79-20-9", "CC(=O)OC"),
    ("ethyl acetate", "141-78-6", "CCOC(=O)C"),
    ("butyl acetate", "123-86-4", "CCCCOC(=O)C"),
    ("methyl formate", "107-31-3", "COC=O"),
    ("methyl propionate", "554-12-1", "CCC(=O)OC"),
    ("vinyl acetate", "108-05-4", "CC(=O)OC=C"),
    ("methyl benzoate", "93-58-3", "COC(=O)C1=CC=CC=C1"),
    ("diethyl ether", "60-29-7", "CCOCC"),
    ("methyl tert-butyl ether", "1634-04-4", "CC(C)(C)OC"),
    ("tetrahydrofuran", "109-99-9", "C1CCOC1"),
    ("1,4-dioxane", "123-91-1", "C1COCCO1"),
    ("anisole", "100-66-3", "COC1=CC=CC=C1"),
    ("1,2-dimethoxyethane", "110-71-4", "COCCOC"),
    ("2-methoxyethanol", "109-86-4", "COCCO"),
    ("2-ethoxyethanol", "110-80-5", "CCOCCO"),
    ("methylamine", "74-89-5", "CN"),
    ("diethylamine", "109-89-7", "CCNCC"),
    ("triethylamine", "121-44-8", "CCN(CC)CC"),
    ("aniline", "62-53-3", "C1=CC=C(C=C1)N"),
    ("pyridine", "110-86-1", "C1=CC=NC=C1"),
    ("2-methylpyridine", "109-06-8", "CC1=CC=CC=N1"),
    ("acetonitrile", "75-05-8", "CC#N"),
    ("propionitrile", "107-12-0", "CCC#N"),
    ("acrylonitrile", "107-13-1", "C=CC#N"),
    ("acetic acid", "64-19-7", "CC(=O)O"),
    ("formic acid", "64-18-6", "C(=O)O"),
    ("dichloromethane", "75-09-2", "C(Cl)Cl"),
    ("chloroform", "67-66-3", "C(Cl)(Cl)Cl"),
    ("carbon tetrachloride", "56-23-5", "C(Cl)(Cl)(Cl)Cl"),
    ("1,2-dichloroethane", "107-06-2", "C(CCl)Cl"),
    ("chlorobenzene", "108-90-7", "C1=CC=C(C=C1)Cl"),
    ("trichloroethylene", "79-01-6", "C(=C(Cl)Cl)Cl"),
    ("tetrachloroethylene", "127-18-4", "C(=C(Cl)Cl)(Cl)Cl"),
    ("1,1,1-trichloroethane", "71-55-6", "CC(Cl)(Cl)Cl"),
    ("nitrobenzene", "98-95-3", "C1=CC=C(C=C1)[N+](=O)[O-]"),
    ("carbon disulfide", "75-15-0", "C(=S)=S"),
    ("dimethyl sulfoxide", "67-68-5", "CS(=O)C"),
    ("N,N-dimethylformamide", "68-12-2", "CN(C)C=O"),
    ("morpholine", "110-91-8", "C1COCCN1"),
    ("4-methylmorpholine", "109-02-4", "CN1CCOCC1"),
    ("bromoethane", "74-96-4", "CCBr"),
    ("iodomethane", "74-88-4", "CI"),
    ("fluorobenzene", "462-06-6", "C1=CC=C(C=C1)F"),
    ("furfural", "98-01-1", "C1=COC(=C1)C=O"),
    ("thiophene", "110-02-1", "C1=CSC=C1"),
    ("dimethyl sulfide", "75-18-3", "CSC"),
    ("ethanethiol", "75-08-1", "CCS"),
    ("sulfolane", "126-33-0", "C1CCS(=O)(=O)C1"),
    ("N,N-dimethylacetamide", "127-19-5", "CC(=O)N(C)C"),
    ("hexamethyldisiloxane", "107-46-0", "C[Si](C)(C)O[Si](C)(C)C"),
    ("perfluorohexane", "355-42-0", "C(C(C(C(F)(F)F)(F)F)(F)F)(C(C(F)(F)F)(F)F)(F)F"),
    ("1,1,2-trichloro-1,2,2-trifluoroethane", "76-13-1", "C(C(F)(Cl)Cl)(F)(F)Cl"),
    ("dichlorodifluoromethane", "75-71-8", "C(F)(F)(Cl)Cl"),
    ("benzyl chloride", "100-44-7", "C1=CC=C(C=C1)CCl"),
    ("benzylamine", "100-46-9", "C1=CC=C(C=C1)CN"),
    ("methyl chloroacetate", "96-34-4", "COC(=O)CCl"),
    ("1-hexyne", "693-02-7", "CCCCC#C"),
    ("allyl chloride", "107-05-1", "C=CCCl"),
    ("2-chloroethanol", "107-07-3", "C(CCl)O"),
    ("diacetone alcohol", "123-42-2", "CC(=O)CC(C)(C)O"),
    ("N,N-dimethylaniline", "121-69-7", "CN(C)C1=CC=CC=C1"),
    # N-methyl-2-pyrrolidone: SMILES written here (chemicals 1.5.2 has a wrong one for this CAS RN)
    ("N-methyl-2-pyrrolidone", "872-50-4", "CN1CCCC1=O"),
]


def _groups(smiles: str) -> Groups:
    g = unifac_groups(Chem.MolFromSmiles(smiles))
    assert not isinstance(g, str), g
    return g


def test_enough_molecules_are_checked():
    assert len(DDBST_CHECKED) >= 40


@pytest.mark.parametrize("name, cas, smiles", DDBST_CHECKED, ids=[r[0] for r in DDBST_CHECKED])
def test_groups_agree_with_ddbst_assignment(name, cas, smiles):
    # reference: DDBST original-UNIFAC assignment as shipped in thermo 0.6.1
    reference = thermo_unifac.UNIFAC_group_assignment_DDBST(cas, "UNIFAC")
    assert reference, f"no DDBST assignment for {name}"
    ours = unifac_groups(Chem.MolFromSmiles(smiles))
    assert not isinstance(ours, str), ours
    assert ours.as_dict() == reference


def test_explicit_hydrogens_change_nothing():
    for _name, _cas, smiles in DDBST_CHECKED[:30]:
        mol = Chem.MolFromSmiles(smiles)
        assert unifac_groups(Chem.AddHs(mol)) == unifac_groups(mol)


# Molecules that DDBST (thermo 0.6.1) also leaves without an original-UNIFAC assignment:
# a reason, never a wrong set of groups.
UNASSIGNABLE = [
    ("benzonitrile", "100-47-0", "N#Cc1ccccc1"),
    ("dimethyl carbonate", "616-38-6", "COC(=O)OC"),
    ("acetic anhydride", "108-24-7", "CC(=O)OC(C)=O"),
    ("propylene carbonate", "108-32-7", "CC1COC(=O)O1"),
    ("acetone cyanohydrin", "75-86-5", "CC(C)(O)C#N"),
]


@pytest.mark.parametrize("name, cas, smiles", UNASSIGNABLE, ids=[r[0] for r in UNASSIGNABLE])
def test_uncovered_molecules_get_a_reason(name, cas, smiles):
    assert not thermo_unifac.UNIFAC_group_assignment_DDBST(cas, "UNIFAC")  # DDBST has none either
    reason = unifac_groups(Chem.MolFromSmiles(smiles))
    assert isinstance(reason, str) and reason.startswith("no UNIFAC group for atom")


def test_reason_names_the_uncovered_atoms():
    # the sulfonamide S(=O)(=O)N has no group in the table; the ethyl carbons do
    reason = unifac_groups(Chem.MolFromSmiles("CCS(=O)(=O)N"))
    assert reason == "no UNIFAC group for atoms 2, 3, 4, 5 (S, O, O, N)"


def test_ions_radicals_and_missing_structures_are_refused():
    assert "salt" in unifac_groups(Chem.MolFromSmiles("CC(=O)[O-].[Na+]"))
    assert "charged" in unifac_groups(Chem.MolFromSmiles("C[NH3+]"))
    assert "radical" in unifac_groups(Chem.MolFromSmiles("C[CH2]"))
    assert unifac_groups(None) == "no structure"


def test_parameter_table_matches_thermo_transcription():
    p = unifac.parameters()
    for sid, sg in thermo_unifac.UFSG.items():
        if sg.main_group_id in (84, 85):      # ionic-liquid groups, left out on purpose
            assert sid not in p.subgroups
            continue
        ours = p.subgroups[sid]
        assert (ours.main, ours.R, ours.Q) == (sg.main_group_id, sg.R, sg.Q)
    n = 0
    for m, row in thermo_unifac.UFIP.items():
        for k, a in row.items():
            if m != k and m not in (84, 85) and k not in (84, 85):
                assert p.interactions[(m, k)] == a
                n += 1
    assert n == len(p.interactions)


SYSTEMS = bench_mixture.BINARIES + bench_mixture.TERNARIES


def test_enough_systems():
    assert len(bench_mixture.BINARIES) >= 10 and len(bench_mixture.TERNARIES) >= 3


@pytest.mark.parametrize("names", SYSTEMS, ids=[" + ".join(s) for s in SYSTEMS])
def test_activity_coefficients_match_thermo(names):
    # reference: thermo.unifac.UNIFAC.from_subgroups(version=0), same subgroups (thermo 0.6.1)
    gs = [bench_mixture.groups(n) for n in names]
    for x in bench_mixture.compositions(len(names)):
        for T in (290.0, 330.0, 370.0):
            ours = activity_coefficients(T, x, gs)
            ref = bench_mixture.thermo_gammas(T, x, names)
            assert ours == pytest.approx(ref, rel=1e-9)


def test_infinite_dilution_matches_thermo():
    # γ of a component at x = 0 (ethanol infinitely dilute in water) is finite; thermo agrees
    names = ("ethanol", "water")
    gs = [bench_mixture.groups(n) for n in names]
    ours = activity_coefficients(298.15, [0.0, 1.0], gs)
    ref = bench_mixture.thermo_gammas(298.15, [0.0, 1.0], names)
    assert ours == pytest.approx(ref, rel=1e-9)
    assert ours[1] == pytest.approx(1.0, abs=1e-12)


@pytest.mark.parametrize("names", [("ethanol", "water"), ("acetone", "chloroform", "methanol")])
def test_gibbs_duhem(names):
    # Gibbs–Duhem at constant T, P: Σ x_i d ln γ_i = 0 along any composition path
    mix = unifac.mixture([bench_mixture.groups(n) for n in names])
    x = [0.3, 0.7] if len(names) == 2 else [0.2, 0.3, 0.5]
    direction = [1.0, -1.0] if len(names) == 2 else [1.0, -0.4, -0.6]
    h = 1e-6
    up = mix.ln_gammas(320.0, [a + h * d for a, d in zip(x, direction)])
    down = mix.ln_gammas(320.0, [a - h * d for a, d in zip(x, direction)])
    total = sum(a * (u - v) / (2 * h) for a, u, v in zip(x, up, down))
    assert abs(total) < 1e-7


def test_missing_interaction_pairs_match_the_table():
    # water / chlorine on a C=C (trichloroethylene): thermo's UFIP has no parameter for 7–37
    gs = [_groups("O"), _groups("ClC=C(Cl)Cl")]
    assert 37 not in thermo_unifac.UFIP[7]
    assert unifac.missing_interactions(gs) == [(7, 37)]
    with pytest.raises(MissingInteractionParameters, match="H2O/CLCC"):
        activity_coefficients(300.0, [0.5, 0.5], gs)


def test_no_missing_pairs_in_common_solvent_blends():
    gs = [bench_mixture.groups(n) for n in bench_mixture.FIVE[0]]
    assert unifac.missing_interactions(gs) == []


def test_bad_inputs_are_refused():
    gs = [_groups("CCO"), _groups("O")]
    with pytest.raises(ValueError):
        activity_coefficients(300.0, [0.5], gs)
    with pytest.raises(ValueError):
        activity_coefficients(300.0, [-0.1, 1.1], gs)
    with pytest.raises(ValueError):
        activity_coefficients(0.0, [0.5, 0.5], gs)
