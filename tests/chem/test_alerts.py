"""Tests for builder.chem.alerts and builder/data/hazard_alerts.yaml.

Each group of cases names the published list or guide it is checked against (as the alert
file cites it); "from memory" where the list was recalled rather than re-read, as in the file.
A positive case must raise an alert of its family, a negative case none of that family.
"""

from __future__ import annotations

import pytest
import yaml
from rdkit import Chem

from builder.chem.alerts import (
    ALERTS_PATH,
    FAMILIES,
    AlertsError,
    default_alerts,
    families,
    find_alerts,
    highlight_atoms,
    validate_alerts,
)

# ---------------------------------------------------------------- positive cases: (family, name, SMILES)

# R. J. Kelly, Chem. Health Saf. 3(5) (1996) 28, lists A, B and C of peroxide formers (from memory)
KELLY_PEROXIDE_FORMERS = [
    ("storage", "diisopropyl ether", "CC(C)OC(C)C"),
    ("storage", "vinylidene chloride", "C=C(Cl)Cl"),
    ("storage", "divinylacetylene", "C=CC#CC=C"),
    ("storage", "potassium metal", "[K]"),
    ("storage", "sodium amide", "[NH2-].[Na+]"),
    ("concentration", "diethyl ether", "CCOCC"),
    ("concentration", "tetrahydrofuran", "C1CCOC1"),
    ("concentration", "1,4-dioxane", "C1COCCO1"),
    ("concentration", "1,2-dimethoxyethane", "COCCOC"),
    ("concentration", "diglyme", "COCCOCCOC"),
    ("concentration", "2-propanol", "CC(C)O"),
    ("concentration", "2-butanol", "CCC(C)O"),
    ("concentration", "cumene", "CC(C)c1ccccc1"),
    ("concentration", "cyclohexene", "C1CCC=CC1"),
    ("concentration", "tetralin", "C1CCc2ccccc2C1"),
    ("concentration", "acetaldehyde", "CC=O"),
    ("concentration", "benzaldehyde", "O=Cc1ccccc1"),
    ("polymerization", "methyl methacrylate", "COC(=O)C(C)=C"),
    ("polymerization", "styrene", "C=Cc1ccccc1"),
    ("polymerization", "vinyl acetate", "C=COC(C)=O"),
    ("polymerization", "vinyl chloride", "C=CCl"),
    ("polymerization", "1,3-butadiene", "C=CC=C"),
    ("polymerization", "acrylonitrile", "C=CC#N"),
]

# Bretherick's Handbook of Reactive Chemical Hazards, 8th ed. (2017), polymerisation hazards, from
# memory; acrylic monomers' oxygen-dependent inhibitors: common practice
POLYMERIZABLE = [
    ("methyl methacrylate", "COC(=O)C(C)=C"),
    ("methyl acrylate", "C=CC(=O)OC"),
    ("acrylic acid", "C=CC(=O)O"),
    ("acrylamide", "C=CC(N)=O"),
    ("acrylonitrile", "C=CC#N"),
    ("styrene", "C=Cc1ccccc1"),
    ("vinyl acetate", "C=COC(C)=O"),
    ("vinyl chloride", "C=CCl"),
    ("isoprene", "C=CC(C)=C"),
    ("ethyl vinyl ether", "C=COCC"),
    ("epichlorohydrin", "ClCC1CO1"),
]

# Bretherick's 8th ed. (2017), acyl and non-metal halides, from memory; UN GHS Rev. 10 ch. 2.12
# (substances which in contact with water emit flammable gases), typical members from memory
WATER_REACTIVE = [
    ("acetyl chloride", "CC(Cl)=O"),
    ("benzoyl chloride", "O=C(Cl)c1ccccc1"),
    ("thionyl chloride", "O=S(Cl)Cl"),
    ("methanesulfonyl chloride", "CS(=O)(=O)Cl"),
    ("phosphorus trichloride", "ClP(Cl)Cl"),
    ("silicon tetrachloride", "Cl[Si](Cl)(Cl)Cl"),
    ("chlorotrimethylsilane", "C[Si](C)(C)Cl"),
    ("aluminium chloride", "Cl[Al](Cl)Cl"),
    ("toluene 2,4-diisocyanate", "Cc1ccc(N=C=O)cc1N=C=O"),
    ("methyl isocyanate", "CN=C=O"),
    ("acetic anhydride", "CC(=O)OC(C)=O"),
    ("sodium", "[Na]"),
    ("lithium", "[Li]"),
    ("sodium hydride", "[NaH]"),
    ("lithium aluminium hydride", "[Li+].[AlH4-]"),
    ("calcium carbide", "[Ca+2].[C-]#[C-]"),
    ("n-butyllithium", "[Li]CCCC"),
]

# UN GHS Rev. 10 ch. 2.9 and 2.10 (pyrophoric liquids and solids), typical members from memory
AIR_REACTIVE = [
    ("triethylaluminium", "CC[Al](CC)CC"),
    ("diethylzinc", "CC[Zn]CC"),
    ("n-butyllithium", "[Li]CCCC"),
    ("tert-butyllithium", "[Li]C(C)(C)C"),
    ("triethylborane", "CCB(CC)CC"),
    ("trimethylphosphine", "CP(C)C"),
    ("silane", "[SiH4]"),
    ("phosphine", "[PH3]"),
    ("sodium hydride", "[NaH]"),
]

# UN GHS Rev. 10 ch. 2.4, 2.13 and 2.14 (oxidising gases, liquids and solids), typical members from memory
OXIDIZERS = [
    ("hydrogen peroxide", "OO"),
    ("potassium persulfate", "[K+].[K+].[O-]S(=O)(=O)OOS(=O)(=O)[O-]"),
    ("sodium nitrate", "[Na+].[O-][N+]([O-])=O"),
    ("sodium nitrite", "[Na+].[O-]N=O"),
    ("nitric acid", "O[N+](=O)[O-]"),
    ("potassium permanganate", "[K+].[O-][Mn](=O)(=O)=O"),
    ("potassium dichromate", "[K+].[K+].[O-][Cr](=O)(=O)O[Cr](=O)(=O)[O-]"),
    ("sodium chlorate", "[Na+].[O-]Cl(=O)=O"),
    ("sodium perchlorate", "[Na+].[O-]Cl(=O)(=O)=O"),
    ("sodium hypochlorite", "[Na+].[O-]Cl"),
    ("potassium bromate", "[K+].[O-]Br(=O)=O"),
    ("sodium peroxide", "[Na+].[Na+].[O-][O-]"),
    ("chlorine", "ClCl"),
    ("oxygen", "O=O"),
    ("ozone", "[O-][O+]=O"),
]

# UN Manual of Tests and Criteria, Rev. 7 (2019), appendix 6 (groups indicating explosive
# properties), from memory
ENERGETIC = [
    ("sodium azide", "[Na+].[N-]=[N+]=[N-]"),
    ("phenyl azide", "[N-]=[N+]=Nc1ccccc1"),
    ("diazomethane", "C=[N+]=[N-]"),
    ("ethyl diazoacetate", "CCOC(=O)C=[N+]=[N-]"),
    ("benzenediazonium chloride", "[Cl-].N#[N+]c1ccccc1"),
    ("2,4,6-trinitrotoluene", "Cc1c([N+](=O)[O-])cc([N+](=O)[O-])cc1[N+](=O)[O-]"),
    ("2,4-dinitrotoluene", "Cc1ccc([N+](=O)[O-])cc1[N+](=O)[O-]"),
    ("picric acid", "Oc1c(cc(cc1[N+]([O-])=O)[N+]([O-])=O)[N+]([O-])=O"),
    ("dibenzoyl peroxide", "O=C(OOC(=O)c1ccccc1)c1ccccc1"),
    ("tert-butyl hydroperoxide", "CC(C)(C)OO"),
    ("di-tert-butyl peroxide", "CC(C)(C)OOC(C)(C)C"),
    ("nitroglycerin", "C(C(CO[N+](=O)[O-])O[N+](=O)[O-])O[N+](=O)[O-]"),
    ("RDX", "C1N(CN(CN1[N+](=O)[O-])[N+](=O)[O-])[N+](=O)[O-]"),
    ("silver acetylide", "[Ag]C#C[Ag]"),
]

# common practice (acid-base segregation), from memory: acids
ACIDS = [
    ("acetic acid", "CC(=O)O"),
    ("formic acid", "OC=O"),
    ("benzoic acid", "OC(=O)c1ccccc1"),
    ("trifluoroacetic acid", "OC(=O)C(F)(F)F"),
    ("methanesulfonic acid", "CS(=O)(=O)O"),
    ("sulfuric acid", "OS(=O)(=O)O"),
    ("phosphoric acid", "OP(=O)(O)O"),
    ("hydrogen chloride", "Cl"),
    ("hydrogen bromide", "Br"),
    ("hydrogen fluoride", "F"),
    ("nitric acid", "O[N+](=O)[O-]"),
]

# common practice (acid-base segregation), from memory: bases
BASES = [
    ("triethylamine", "CCN(CC)CC"),
    ("ethylamine", "CCN"),
    ("diethylamine", "CCNCC"),
    ("morpholine", "C1COCCN1"),
    ("piperidine", "C1CCNCC1"),
    ("ethylenediamine", "NCCN"),
    ("ethanolamine", "NCCO"),
    ("DBU", "C1CCC2=NCCCN2CC1"),
    ("tetramethylguanidine", "CN(C)C(=N)N(C)C"),
    ("ammonia", "N"),
    ("sodium hydroxide", "[Na+].[OH-]"),
    ("sodium methoxide", "C[O-].[Na+]"),
]

# common practice, from memory: toxic gases and salts that give one off with acids
TOXIC_GAS = [
    ("sodium cyanide", "[Na+].[C-]#N"),
    ("potassium cyanide", "[K+].[C-]#N"),
    ("hydrogen cyanide", "C#N"),
    ("sodium sulfide", "[Na+].[Na+].[S-2]"),
    ("hydrogen sulfide", "S"),
    ("phosgene", "O=C(Cl)Cl"),
    ("chlorine", "ClCl"),
    ("carbon monoxide", "[C-]#[O+]"),
    ("phosphine", "[PH3]"),
    ("sulfur dioxide", "O=S=O"),
    ("hydrogen chloride", "Cl"),
    ("ammonia", "N"),
    ("sodium azide", "[Na+].[N-]=[N+]=[N-]"),
    ("sodium hypochlorite", "[Na+].[O-]Cl"),
]

POSITIVE = (
    [("peroxide-former", n, s) for _, n, s in KELLY_PEROXIDE_FORMERS]
    + [("polymerizable", n, s) for n, s in POLYMERIZABLE]
    + [("water-reactive", n, s) for n, s in WATER_REACTIVE]
    + [("air-reactive", n, s) for n, s in AIR_REACTIVE]
    + [("oxidizer", n, s) for n, s in OXIDIZERS]
    + [("energetic", n, s) for n, s in ENERGETIC]
    + [("acid", n, s) for n, s in ACIDS]
    + [("base", n, s) for n, s in BASES]
    + [("toxic-gas", n, s) for n, s in TOXIC_GAS]
)

# ---------------------------------------------------------------- negative cases: (family, name, SMILES)

NEGATIVE = [
    # Kelly (1996), from memory: none of these is on lists A-C; ethers without a CH/CH2 next to O
    # (methyl and tertiary carbons only), esters, primary and tertiary alcohols, plain arenes
    ("peroxide-former", "methyl tert-butyl ether", "COC(C)(C)C"),
    ("peroxide-former", "di-tert-butyl ether", "CC(C)(C)OC(C)(C)C"),
    ("peroxide-former", "anisole", "COc1ccccc1"),
    ("peroxide-former", "diphenyl ether", "c1ccc(Oc2ccccc2)cc1"),
    ("peroxide-former", "ethyl acetate (an ester, not an ether)", "CCOC(C)=O"),
    ("peroxide-former", "methanol", "CO"),
    ("peroxide-former", "ethanol", "CCO"),
    ("peroxide-former", "tert-butanol", "CC(C)(C)O"),
    ("peroxide-former", "toluene", "Cc1ccccc1"),
    ("peroxide-former", "n-hexane", "CCCCCC"),
    ("peroxide-former", "acetone", "CC(C)=O"),
    # Bretherick's 8th ed. (2017), from memory: esters and alkenes that are not vinyl monomers
    ("polymerizable", "ethyl acetate", "CCOC(C)=O"),
    ("polymerizable", "methyl propanoate", "CCC(=O)OC"),
    ("polymerizable", "methyl isobutyrate (saturated analogue of methyl methacrylate)", "CC(C)C(=O)OC"),
    ("polymerizable", "methyl crotonate (internal double bond)", "C/C=C/C(=O)OC"),
    ("polymerizable", "ethylbenzene", "CCc1ccccc1"),
    ("polymerizable", "cyclohexene", "C1CCC=CC1"),
    ("polymerizable", "trans-2-butene", "C/C=C/C"),
    ("polymerizable", "propanenitrile", "CCC#N"),
    ("polymerizable", "acetic acid", "CC(=O)O"),
    # Bretherick's 8th ed. (2017) and UN GHS Rev. 10 ch. 2.12, from memory: stable to water
    ("water-reactive", "ethyl acetate", "CCOC(C)=O"),
    ("water-reactive", "acetic acid", "CC(=O)O"),
    ("water-reactive", "acetamide", "CC(N)=O"),
    ("water-reactive", "dichloromethane", "ClCCl"),
    ("water-reactive", "chlorobenzene", "Clc1ccccc1"),
    ("water-reactive", "sodium chloride", "[Na+].[Cl-]"),
    ("water-reactive", "diethyl carbonate (one carbonyl, not an anhydride)", "CCOC(=O)OCC"),
    ("water-reactive", "hexamethyldisiloxane", "C[Si](C)(C)O[Si](C)(C)C"),
    ("water-reactive", "urea", "NC(N)=O"),
    ("water-reactive", "sodium acetate", "CC(=O)[O-].[Na+]"),
    # UN GHS Rev. 10 ch. 2.9 and 2.10, from memory: not pyrophoric
    ("air-reactive", "triphenylphosphine", "c1ccc(P(c2ccccc2)c2ccccc2)cc1"),
    ("air-reactive", "trimethyl borate", "COB(OC)OC"),
    ("air-reactive", "phenylboronic acid", "OB(O)c1ccccc1"),
    ("air-reactive", "tetramethylsilane", "C[Si](C)(C)C"),
    ("air-reactive", "triethyl phosphite", "CCOP(OCC)OCC"),
    ("air-reactive", "zinc chloride", "[Zn+2].[Cl-].[Cl-]"),
    ("air-reactive", "sodium acetate", "CC(=O)[O-].[Na+]"),
    # UN GHS Rev. 10 ch. 2.13 and 2.14, from memory: not oxidisers (nitro groups on carbon are not
    # nitrates; organic peroxides are a class of their own, ch. 2.15)
    ("oxidizer", "nitromethane", "C[N+](=O)[O-]"),
    ("oxidizer", "nitrobenzene", "O=[N+]([O-])c1ccccc1"),
    ("oxidizer", "chlorobenzene", "Clc1ccccc1"),
    ("oxidizer", "sodium chloride", "[Na+].[Cl-]"),
    ("oxidizer", "sodium sulfate", "[Na+].[Na+].[O-]S([O-])(=O)=O"),
    ("oxidizer", "ethanol", "CCO"),
    ("oxidizer", "water", "O"),
    ("oxidizer", "di-tert-butyl peroxide", "CC(C)(C)OOC(C)(C)C"),
    ("oxidizer", "trichloroacetic acid", "OC(=O)C(Cl)(Cl)Cl"),
    ("oxidizer", "dimethyl sulfoxide", "CS(C)=O"),
    # UN Manual of Tests and Criteria, Rev. 7 (2019), appendix 6, from memory: none of the groups
    # (a single nitro group on an arene is below the polynitro alert; terminal alkynes are not acetylides)
    ("energetic", "nitrobenzene", "O=[N+]([O-])c1ccccc1"),
    ("energetic", "4-nitrotoluene", "Cc1ccc([N+](=O)[O-])cc1"),
    ("energetic", "aniline", "Nc1ccccc1"),
    ("energetic", "benzonitrile", "N#Cc1ccccc1"),
    ("energetic", "acetonitrile", "CC#N"),
    ("energetic", "nitrogen", "N#N"),
    ("energetic", "phenylacetylene", "C#Cc1ccccc1"),
    ("energetic", "diethyl ether", "CCOCC"),
    ("energetic", "toluene", "Cc1ccccc1"),
    # common practice, from memory: not acids
    ("acid", "ethyl acetate", "CCOC(C)=O"),
    ("acid", "sodium acetate", "CC(=O)[O-].[Na+]"),
    ("acid", "acetic anhydride", "CC(=O)OC(C)=O"),
    ("acid", "ethanol", "CCO"),
    ("acid", "acetamide", "CC(N)=O"),
    ("acid", "dimethyl sulfate", "COS(=O)(=O)OC"),
    ("acid", "chlorobenzene", "Clc1ccccc1"),
    ("acid", "acetone", "CC(C)=O"),
    # common practice, from memory: not bases (amides, anilines, pyridines, nitriles, nitro)
    ("base", "acetamide", "CC(N)=O"),
    ("base", "N,N-dimethylformamide", "CN(C)C=O"),
    ("base", "aniline", "Nc1ccccc1"),
    ("base", "pyridine", "c1ccncc1"),
    ("base", "acetonitrile", "CC#N"),
    ("base", "nitromethane", "C[N+](=O)[O-]"),
    ("base", "urea", "NC(N)=O"),
    ("base", "N-methyl-2-pyrrolidone", "CN1CCCC1=O"),
    ("base", "ethanol", "CCO"),
    # common practice, from memory: neither a toxic gas nor a salt that releases one with acid
    ("toxic-gas", "acetonitrile (a nitrile, not a cyanide salt)", "CC#N"),
    ("toxic-gas", "benzonitrile", "N#Cc1ccccc1"),
    ("toxic-gas", "dimethyl sulfide", "CSC"),
    ("toxic-gas", "thiophene", "c1ccsc1"),
    ("toxic-gas", "dichloromethane", "ClCCl"),
    ("toxic-gas", "chloroform", "ClC(Cl)Cl"),
    ("toxic-gas", "sodium chloride", "[Na+].[Cl-]"),
    ("toxic-gas", "acetyl chloride", "CC(Cl)=O"),
    ("toxic-gas", "carbon dioxide", "O=C=O"),
    ("toxic-gas", "ethanol", "CCO"),
]


def _families(smiles, statements=()):
    mol = Chem.MolFromSmiles(smiles)
    assert mol is not None, smiles
    return families(find_alerts(mol, statements))


def test_enough_named_structures_on_both_sides():
    assert len({(f, s) for f, _, s in POSITIVE}) >= 40
    assert len({(f, s) for f, _, s in NEGATIVE}) >= 40
    # every family has cases on both sides
    assert {f for f, _, _ in POSITIVE} == set(FAMILIES) == {f for f, _, _ in NEGATIVE}


@pytest.mark.parametrize("family,name,smiles", POSITIVE, ids=[f"{f}:{n}" for f, n, _ in POSITIVE])
def test_alert_fires(family, name, smiles):
    assert family in _families(smiles), f"{name} should raise a {family} alert"


@pytest.mark.parametrize("family,name,smiles", NEGATIVE, ids=[f"{f}:{n}" for f, n, _ in NEGATIVE])
def test_alert_does_not_fire(family, name, smiles):
    assert family not in _families(smiles), f"{name} should raise no {family} alert"


@pytest.mark.parametrize("hazard_class,name,smiles", KELLY_PEROXIDE_FORMERS,
                         ids=[n for _, n, _ in KELLY_PEROXIDE_FORMERS])
def test_peroxide_former_class_follows_kellys_lists(hazard_class, name, smiles):
    # Kelly (1996): list A = storage, B = concentration, C = polymerization (from memory)
    classes = {a.hazard_class for a in find_alerts(Chem.MolFromSmiles(smiles)) if a.family == "peroxide-former"}
    assert hazard_class in classes


# UN GHS Rev. 10 (2023) ch. 2.4, 2.12, 2.13, 2.14 (H260, H261, H270-H272); CLP Annex II (EUH014,
# EUH029, EUH031, EUH032): the declared statement raises the alert without a structure
@pytest.mark.parametrize("code,family", [("H272", "oxidizer"), ("H271", "oxidizer"), ("H270", "oxidizer"),
                                         ("H260", "water-reactive"), ("H261", "water-reactive"),
                                         ("EUH014", "water-reactive"), ("H250", "air-reactive"),
                                         ("H241", "energetic"), ("EUH032", "toxic-gas")])
def test_declared_hazard_statement_raises_the_alert(code, family):
    alerts = find_alerts(None, [code])
    assert family in families(alerts)
    alert = next(a for a in alerts if a.family == family)
    assert alert.atoms == () and alert.h_statements == (code,)
    assert families(find_alerts(None, ["H225", "H319"])) == ()


def test_matched_atoms_are_the_group():
    # methyl methacrylate COC(=O)C(C)=C: the ester O (1), carbonyl C (2) and O (3), the vinyl C=C (4, 6);
    # the methoxy carbon (0) and the alpha-methyl (5) are not part of the acrylic pattern
    mol = Chem.MolFromSmiles("COC(=O)C(C)=C")
    acrylic = next(a for a in find_alerts(mol) if a.id == "polymerizable-acrylic")
    assert acrylic.atoms == (1, 2, 3, 4, 6)
    # tetrahydrofuran C1CCOC1: the oxygen (3) and the CH2 groups beside it (2, 4)
    thf = find_alerts(Chem.MolFromSmiles("C1CCOC1"))
    assert highlight_atoms(thf) == (2, 3, 4)
    assert all(mol.GetAtomWithIdx(i).GetSymbol() in "CO" for i in acrylic.atoms)


def test_polynitro_needs_two_nitro_groups():
    assert "energetic" not in _families("O=[N+]([O-])c1ccccc1")
    tnt = [a for a in find_alerts(Chem.MolFromSmiles("Cc1c([N+](=O)[O-])cc([N+](=O)[O-])cc1[N+](=O)[O-]"))
           if a.id == "energetic-polynitro"]
    assert len(tnt) == 1 and len(tnt[0].atoms) == 3  # the three nitro nitrogens


def test_every_alert_names_a_source_and_memory_is_marked():
    for rule in default_alerts():
        assert rule.source.strip()
        # a list recalled rather than re-read says so; the rest are standards' own definitions
        cites_list = any(w in rule.source for w in ("Kelly", "Bretherick", "appendix 6", "typical members"))
        if cites_list:
            assert "from memory" in rule.source, rule.id
        if rule.smarts and "GHS" not in rule.source and "Kelly" not in rule.source and "Manual" not in rule.source:
            assert "common practice" in rule.source or "Bretherick" in rule.source, rule.id


def test_invalid_alert_files_report_every_problem():
    data = yaml.safe_load(ALERTS_PATH.read_text(encoding="utf-8"))
    plain = [a for a in data["alerts"] if "hazard_class" not in a]
    plain[0]["family"] = "explosive"
    plain[1]["smarts"] = ["[C;"]
    del plain[2]["source"]
    with pytest.raises(AlertsError) as info:
        validate_alerts(data)
    text = str(info.value)
    assert "family" in text and "cannot read" in text and "missing field(s) ['source']" in text
    assert len(info.value.problems) == 3


def test_order_is_by_severity_then_file_order():
    alerts = find_alerts(Chem.MolFromSmiles("COC(=O)C(C)=C"), ["H272"])
    severities = [a.severity for a in alerts]
    assert severities == sorted(severities, key=("high", "medium", "info").index)
    assert alerts[0].id == "oxidizer-h-statement"
