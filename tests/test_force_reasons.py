"""The force reasons (written in builder/derive/forces.py from the chemistry's facts) agree with the
force label and with the numbers they quote.

Structures and boiling points: 60 organic compounds drawn at random (seed 7) from the CRC
Handbook 95th ed. "Physical Constants of Organic Compounds" table as shipped in chemicals 1.5.2
(``chemicals.miscdata.CRC_organic_data``, SMILES from ``chemicals.identifiers.search_chemical``),
plus the cases a reader tripped over (cis-1,2-dichloroethene, chloroform, benzene, toluene,
sodium chloride) with their CRC boiling points.
"""
from __future__ import annotations

import re

import pytest
from rdkit import Chem

from builder.chem.forces import force_profile
from builder.derive.forces import force_reasons

chemicals = pytest.importorskip("chemicals")
from chemicals import miscdata  # noqa: E402
from chemicals.identifiers import search_chemical  # noqa: E402

NAMED = {  # CAS → SMILES (stereo as the name says)
    "156-59-2": "Cl/C=C\\Cl",  # cis-1,2-dichloroethene
    "67-66-3": "ClC(Cl)Cl",  # chloroform
    "71-43-2": "c1ccccc1",  # benzene
    "108-88-3": "Cc1ccccc1",  # toluene
}


def _structures() -> list[tuple[str, str, float | None]]:
    crc = miscdata.CRC_organic_data
    out = [(smiles, cas, float(crc.loc[cas, "Tb"])) for cas, smiles in NAMED.items()]
    out.append(("[Na+].[Cl-]", "7647-14-5", 1738.0))  # NaCl boils at 1465 °C (CRC, inorganic table)
    sample = crc.dropna(subset=["Tb"]).sample(60, random_state=7)
    for cas in sample.index:
        try:
            smiles = search_chemical(cas).smiles
        except Exception:  # noqa: BLE001 -- a CAS the identifier database lacks: skip it
            continue
        mol = Chem.MolFromSmiles(smiles) if smiles else None
        if mol is None or mol.GetNumHeavyAtoms() > 30 or "." in smiles:
            continue
        out.append((smiles, cas, float(sample.loc[cas, "Tb"])))
    return out


STRUCTURES = _structures()


def test_the_sample_is_large_enough():
    assert len(STRUCTURES) >= 50


@pytest.mark.parametrize(("smiles", "cas", "tb"), STRUCTURES, ids=[c for _, c, _ in STRUCTURES])
def test_reasons_agree_with_the_label_and_the_numbers(smiles, cas, tb):
    fp = force_profile(smiles, tb)
    text = " ".join(force_reasons(fp))
    mol = Chem.MolFromSmiles(smiles)
    polar = fp.dominant != "dispersion"
    # the label and the sentence about the force excess never contradict each other
    if polar:
        assert "nothing beyond dispersion" not in text and "nearly all of the cohesion" not in text, text
    else:
        assert "forces beyond dispersion add" not in text, text
    # an ion is not told about "molecules"; dispersion is named as minor beside the ions
    if fp.dominant == "ionic":
        assert "between all molecules" not in text and "small beside the attraction between the ions" in text
    # "chain-like" only for an open chain of at least four carbons
    if "chain-like" in text:
        assert mol.GetRingInfo().NumRings() == 0
        assert sum(a.GetSymbol() == "C" for a in mol.GetAtoms()) >= 4
    # the label's own force is explained by a reason
    words = {"dipole-dipole": "dipole moment", "hydrogen-bonding": "hydrogen-bond", "ionic": "ion"}
    if fp.dominant in words:
        assert words[fp.dominant] in text
    # the numbers quoted are the profile's
    if fp.dipole_D is not None:
        assert f"about {fp.dipole_D:.1f} ± {fp.dipole_uncertainty_D:.1f} D" in text
    if fp.force_excess_K is not None and fp.dominant != "ionic":
        excess = fp.force_excess_K
        if excess > 20:
            assert f"boils {excess:.0f} K above" in text
        elif excess < -20:
            assert f"boils {-excess:.0f} K below" in text
        else:
            assert f"({excess:+.0f} K)".replace("-", "−") in text
        # a flat, non-polar molecule far above the n-alkane is told the yardstick does not fit it
        aromatic = any(a.GetIsAromatic() for a in mol.GetAtoms())
        if aromatic and not polar and excess > 20:
            assert "wrong yardstick" in text


def test_the_cases_a_reader_tripped_over():
    crc = miscdata.CRC_organic_data
    cis = force_profile("Cl/C=C\\Cl", float(crc.loc["156-59-2", "Tb"]))
    cis_reasons = force_reasons(cis)
    assert cis.dominant == "dipole-dipole" and "chain-like" not in " ".join(cis_reasons)
    assert "does not mean the dipole–dipole attraction is absent" in cis_reasons[-1]
    benzene = force_profile("c1ccccc1", float(crc.loc["71-43-2", "Tb"]))
    assert benzene.dominant == "dispersion" and "stack face to face" in force_reasons(benzene)[-1]
    salt = force_reasons(force_profile("[Na+].[Cl-]", 1738.0))
    assert not any(re.search(r"between all molecules", r) for r in salt)
    assert "salt of the ions" in salt[0]


# moved from tests/chem/test_forces.py: the sentences for the structural facts tested there
# (classification by common practice, as in that file)

@pytest.mark.parametrize("smiles", ["CCOCC", "CC(C)=O", "CCN(CC)CC", "C1COCCO1"])
def test_acceptor_only_molecules_say_they_accept_hydrogen_bonds(smiles):
    assert any("water or alcohols" in r for r in force_reasons(force_profile(smiles)))


def test_symmetric_molecule_reason_names_cancelling_bonds():
    assert any("C–Cl bond dipoles cancel by symmetry" in r for r in force_reasons(force_profile("ClC(Cl)(Cl)Cl")))


def test_hydrogen_bonding_reason_names_the_donor_groups():
    reasons = " ".join(force_reasons(force_profile("NCCO")))
    assert "N–H (2 H)" in reasons and "O–H (1 H)" in reasons


def test_unspecified_stereo_is_reported():
    assert any("unspecified and decides the polarity" in r for r in force_reasons(force_profile("ClC=CCl")))
    assert any("unspecified and decides the polarity" in r for r in force_reasons(force_profile("ClC1CCC(Cl)CC1")))
    for specified in ("Cl/C=C/Cl", "Cl/C=C\\Cl"):
        assert not any("unspecified" in r for r in force_reasons(force_profile(specified)))
    assert any("mirror-image forms" in r for r in force_reasons(force_profile("CCC(C)O")))
