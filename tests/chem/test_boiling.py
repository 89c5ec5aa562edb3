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
    # cis/trans and E/Z pairs (same connectivity, a stereo double bond or two stereocentres in
    # one ring, CRC Tb differing by >= 5 K, chemicals 1.5.2; structures after the name-to-stereo
    # repair). Measured with the shipped model: 24 of 26 in the right order, 24 of the 25 where
    # both SMILES specify all stereo; the 4 held-out pairs all right (the rest are training
    # rows). Misses: 1,3-dichloropropene (trans boils 7 K higher; estimates 0.5 K apart the
    # other way) and 1,3-dichloro-2-butene (the cis row's trisubstituted bond stays
    # unspecified: its name is ambiguous). Before the ring features, the stereo correction
    # and the repair: 10 of 20 (old rule, which also counted a racemate against one
    # enantiomer); before any stereo feature: 0 of 20.
    pairs = validation()["stereo_pairs"]
    assert pairs["n"] >= 20
    assert pairs["right_order"] >= 0.9 * pairs["n"]
    assert pairs["right_order_specified"] >= 0.9 * pairs["n_specified"]
    assert pairs["right_order_held_out"] == pairs["n_held_out"] >= 3


@lru_cache(maxsize=1)
def crc_rows():
    """(CAS, name, SMILES as chemicals gives it) of the CRC organic rows with a single cis/trans
    in the name, no alpha/beta locants and no (E)/(Z), whose SMILES specify every stereo element."""
    import re

    from chemicals.identifiers import search_chemical
    from chemicals.phase_change import Tb_sources
    from rdkit import Chem, RDLogger

    RDLogger.DisableLog("rdApp.*")
    rows = []
    for cas, row in Tb_sources["CRC_ORG"].dropna(subset=["Tb"]).iterrows():
        name = str(row["Name"])
        words = re.findall(r"(?<![A-Za-z])(cis|trans)(?![A-Za-z])", name, re.IGNORECASE)
        if len(words) != 1 or re.search(r"[0-9][αβ]|\((E|Z)\)", name):
            continue
        try:
            smiles = search_chemical(cas).smiles
        except ValueError:
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        found = list(Chem.FindPotentialStereo(mol)) if mol is not None else []
        if found and all(i.specified == Chem.StereoSpecified.Specified for i in found):
            rows.append((cas, name, smiles, words[0].lower() == "cis"))
    return rows


@pytest.mark.slow
def test_ring_relative_configuration_agrees_with_crc_names():
    # The chiral-tag reading behind the ring features and the name-to-stereo repair, against
    # the CRC names of rows whose SMILES (chemicals 1.5.2) already specify both ring centres.
    # Measured: 26 of 27 agree; the exception, trans-octahydro-2H-quinolizine-1-methanol,
    # names the ring fusion at nitrogen, not the two C-H centres.
    from rdkit import Chem

    from builder.chem.features import ring_cis_trans_pairs

    checked = agree = 0
    for _, _, smiles, cis in crc_rows():
        mol = Chem.MolFromSmiles(smiles)
        centres = [i for i in Chem.FindPotentialStereo(mol) if i.type == Chem.StereoType.Atom_Tetrahedral]
        pairs = ring_cis_trans_pairs(mol)
        if len(pairs) == 1 and len(centres) == 2 and len(centres) == len(Chem.FindPotentialStereo(mol)):
            checked += 1
            agree += pairs[0][3] == cis
    assert checked >= 20
    assert agree >= 0.95 * checked, (agree, checked)


@pytest.mark.slow
def test_double_bond_cis_is_z_for_crc_rows():
    # The rule the repair uses for 1,2-disubstituted double bonds (cis = Z), against CRC rows
    # whose SMILES specify the bond. Measured: 69 of 71 agree; the two others (cis-5-decene,
    # cis-1,2-di-tert-butylethene) carry an E bond in chemicals' SMILES against their names.
    from rdkit import Chem

    from builder.chem.boiling import double_bond_configurations
    from builder.fitting.boiling import _disubstituted

    checked = agree = 0
    for _, _, smiles, cis in crc_rows():
        mol = Chem.MolFromSmiles(smiles)
        found = list(Chem.FindPotentialStereo(mol))
        if len(found) == 1 and found[0].type == Chem.StereoType.Bond_Double and _disubstituted(mol, found[0].centeredOn):
            checked += 1
            agree += (double_bond_configurations(mol)[0] == 1.0) == cis
    assert checked >= 50
    assert agree >= 0.95 * checked, (agree, checked)


def _hydrogens_on_one_face(smiles: str) -> bool:
    """Embed ``smiles`` in 3D (fixed seed) and say whether the hydrogens of its two ring
    stereocentres lie on one side of their ring's mean plane (independent of the chiral-tag
    reading)."""
    import numpy as np
    from rdkit import Chem
    from rdkit.Chem import AllChem

    mol = Chem.AddHs(Chem.MolFromSmiles(smiles))
    assert AllChem.EmbedMolecule(mol, randomSeed=7) == 0
    pos = mol.GetConformer().GetPositions()
    centres = [a.GetIdx() for a in mol.GetAtoms() if a.GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED]
    ring = next(r for r in sorted(mol.GetRingInfo().AtomRings(), key=len) if set(centres) <= set(r))
    points = pos[list(ring)]
    normal = np.linalg.svd(points - points.mean(0))[2][2]
    sides = []
    for c in centres:
        h = next(n.GetIdx() for n in mol.GetAtomWithIdx(c).GetNeighbors() if n.GetAtomicNum() == 1)
        sides.append(np.sign((pos[h] - pos[c]) @ normal))
    return len(set(sides)) == 1


@pytest.mark.parametrize(
    ("cas", "cis"),
    [("493-01-6", True), ("822-50-4", False), ("930-89-2", True), ("2402-06-4", False), ("930-18-7", True)],
    ids=["cis-decalin", "trans-1,2-dimethylcyclopentane", "cis-1-ethyl-2-methylcyclopentane",
         "trans-1,2-dimethylcyclopropane", "cis-1,2-dimethylcyclopropane"],
)
def test_name_to_stereo_repair_of_ring_rows(cas, cis):
    # CRC rows (chemicals 1.5.2) whose SMILES leave the ring stereo (partly) out while the name
    # states it; the repaired structure is checked on a 3D embedding, and differs from the
    # other isomer's row where the table has one.
    from chemicals.identifiers import search_chemical
    from rdkit import Chem

    from builder.chem.structure3d import unspecified_stereo
    from builder.fitting.boiling import name_stereo

    records = {r.cas: r for r in records_by_cas()}
    original = search_chemical(cas).smiles
    assert unspecified_stereo(Chem.MolFromSmiles(original))
    record = records[cas]
    assert record.stereo_from_name and record.smiles == name_stereo(record.name, original)
    assert not unspecified_stereo(Chem.MolFromSmiles(record.smiles))
    assert _hydrogens_on_one_face(record.smiles) is cis
    others = [r for r in records.values() if r.inchikey[:14] == record.inchikey[:14] and r.cas != cas]
    assert all(r.inchikey != record.inchikey for r in others)


def test_name_to_stereo_repair_of_double_bonds_and_what_it_skips():
    # CRC names (chemicals 1.5.2): cis-1-chloropropene is Z, trans-1-propenylbenzene E,
    # (E)-methyl 2-methyl-2-butenoate E by CIP; cis-1,3-dichloro-2-butene (trisubstituted:
    # which chain cis refers to is a naming choice) and 1-phenyl-2-propylamine (one centre)
    # are left as they are.
    from rdkit import Chem

    from builder.chem.boiling import double_bond_configurations
    from builder.fitting.boiling import name_stereo

    z_e = {
        ("cis-1-Chloropropene", "CC=CCl"): (1.0, 0.0),
        ("trans-1-Propenylbenzene", "CC=CC1=CC=CC=C1"): (0.0, 1.0),
        ("Methyl 2-methyl-2-butenoate, (E)-", "CC=C(C)C(=O)OC"): (0.0, 1.0),
    }
    for (name, smiles), expected in z_e.items():
        assert double_bond_configurations(Chem.MolFromSmiles(name_stereo(name, smiles))) == expected, name
    assert name_stereo("cis-1,3-Dichloro-2-butene", "CC(=CCCl)Cl") is None
    assert name_stereo("1-Phenyl-2-propylamine, (±)-", "CC(CC1=CC=CC=C1)N") is None
    assert name_stereo("cis-1,2-Dichloroethene", "Cl/C=C\\Cl") is None  # given stereo is kept


@lru_cache(maxsize=1)
def records_by_cas():
    from builder.fitting.boiling import load_records

    return tuple(load_records())


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
