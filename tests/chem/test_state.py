"""Physical state, melting point, flammable gases and gases under pressure (issue 11).

External references, named beside each check:
- CRC Handbook organic and inorganic melting and boiling points, as shipped in chemicals 1.5.2
  (``CRC_organic_data``, ``CRC_inorganic_data``, ``phase_change.Tb``);
- flammability limits of IEC 60079-20-1 (2010) as shipped in chemicals 1.5.2
  (``safety.IEC_2010_data``), classified by the UN GHS Rev. 10 ch. 2.2 criteria (written from
  memory in builder/chem/state.py);
- critical temperatures of the IUPAC critical-data table in chemicals 1.5.2
  (``critical.critical_data_IUPAC`` through ``critical.Tc``).
"""
from __future__ import annotations

from functools import lru_cache

import pytest

from builder.chem import state
from builder.chem.joback import joback_groups, joback_tc
from builder.chem.melting import estimate_melting_point
from builder.core.values import Value, Provenance
from builder.derive.profile import profile

chemicals = pytest.importorskip("chemicals")

T20 = 293.15
CLEAR_K = 25.0

# (name, CAS, SMILES): common compounds of every state; the CRC values decide which are clear
COMPOUNDS = (
    ("methane", "74-82-8", "C"), ("ethane", "74-84-0", "CC"), ("propane", "74-98-6", "CCC"),
    ("ethylene", "74-85-1", "C=C"), ("propene", "115-07-1", "CC=C"), ("acetylene", "74-86-2", "C#C"),
    ("chloromethane", "74-87-3", "CCl"), ("dimethyl ether", "115-10-6", "COC"),
    ("formaldehyde", "50-00-0", "C=O"), ("methylamine", "74-89-5", "CN"),
    ("isobutane", "75-28-5", "CC(C)C"), ("trifluoromethane", "75-46-7", "FC(F)F"),
    ("n-hexane", "110-54-3", "CCCCCC"), ("n-heptane", "142-82-5", "CCCCCCC"), ("n-octane", "111-65-9", "CCCCCCCC"),
    ("toluene", "108-88-3", "Cc1ccccc1"), ("acetone", "67-64-1", "CC(C)=O"), ("ethanol", "64-17-5", "CCO"),
    ("methanol", "67-56-1", "CO"), ("ethyl acetate", "141-78-6", "CCOC(C)=O"), ("chloroform", "67-66-3", "ClC(Cl)Cl"),
    ("tetrahydrofuran", "109-99-9", "C1CCOC1"), ("1-butanol", "71-36-3", "CCCCO"), ("pyridine", "110-86-1", "c1ccncc1"),
    ("acetonitrile", "75-05-8", "CC#N"), ("N,N-dimethylformamide", "68-12-2", "CN(C)C=O"),
    ("ethylene glycol", "107-21-1", "OCCO"), ("1-octanol", "111-87-5", "CCCCCCCCO"),
    ("naphthalene", "91-20-3", "c1ccc2ccccc2c1"), ("benzoic acid", "65-85-0", "OC(=O)c1ccccc1"),
    ("stearic acid", "57-11-4", "CCCCCCCCCCCCCCCCCC(=O)O"), ("anthracene", "120-12-7", "c1ccc2cc3ccccc3cc2c1"),
    ("urea", "57-13-6", "NC(N)=O"), ("biphenyl", "92-52-4", "c1ccc(-c2ccccc2)cc1"),
    ("1,4-dichlorobenzene", "106-46-7", "Clc1ccc(Cl)cc1"), ("adipic acid", "124-04-9", "OC(=O)CCCCC(=O)O"),
    ("succinic acid", "110-15-6", "OC(=O)CCC(=O)O"), ("salicylic acid", "69-72-7", "OC(=O)c1ccccc1O"),
    ("acetanilide", "103-84-4", "CC(=O)Nc1ccccc1"), ("vanillin", "121-33-5", "COc1cc(C=O)ccc1O"),
    ("hexachloroethane", "67-72-1", "ClC(Cl)(Cl)C(Cl)(Cl)Cl"), ("caffeine", "58-08-2", "Cn1cnc2c1c(=O)n(C)c(=O)n2C"),
)


@lru_cache(maxsize=1)
def crc_clear_cases() -> tuple[tuple[str, str, float, float, str], ...]:
    """(name, SMILES, Tm, Tb, state) from the CRC organic table, kept when the state is clear."""
    from chemicals.miscdata import CRC_organic_data

    out = []
    for name, cas, smiles in COMPOUNDS:
        row = CRC_organic_data.loc[cas]
        tm, tb = float(row["Tm"]), float(row["Tb"])
        if tm != tm:  # NaN: no melting point tabulated
            continue
        if tb == tb and tb <= T20 - CLEAR_K:
            out.append((name, smiles, tm, tb, "gas"))
        elif tm >= T20 + CLEAR_K:
            out.append((name, smiles, tm, tb, "solid"))
        elif tm <= T20 - CLEAR_K and tb == tb and tb >= T20 + CLEAR_K:
            out.append((name, smiles, tm, tb, "liquid"))
    return tuple(out)


def test_at_least_30_clear_cases_of_all_three_states():
    cases = crc_clear_cases()  # source: CRC Handbook via chemicals 1.5.2
    assert len(cases) >= 30
    assert {c[-1] for c in cases} == {"gas", "liquid", "solid"}


def test_state_rule_on_crc_values_matches_the_crc_state():
    for name, _, tm, tb, expected in crc_clear_cases():  # source: CRC Handbook via chemicals 1.5.2
        reading = state.physical_state(T20, tm, 0.0, None if tb != tb else tb, 0.0)
        assert reading.state == expected and reading.clear, name


def _given(tm: float, tb: float | None) -> dict:
    out = {"melting_point": Value(tm, "K", Provenance("literature", source="crc-95"))}
    if tb is not None and tb == tb:
        out["boiling_point"] = Value(tb, "K", Provenance("literature", source="crc-95"))
    return out


def test_estimated_state_allows_the_crc_state_and_is_mostly_right():
    # from structure alone (estimated melting and boiling points) against the CRC state
    cases = crc_clear_cases()
    right = 0
    for name, smiles, _, _, expected in cases:
        p = profile(smiles)["physical_state"]
        assert expected in p["alternatives"], (name, p)
        right += p["value"] == expected
    assert right >= 0.85 * len(cases)


def test_no_gas_or_solid_gets_a_flammable_liquid_category():
    # UN GHS Rev. 10 ch. 2.6 applies to liquids only; states from CRC values (given as stated)
    liquid_notes = {"flammable-storage-high", "flammable-storage", "static-accumulator", "vapor-heavier-than-air",
                    "floats-on-water", "store-at-or-above-flash-point", "pressure-build-up"}
    checked = 0
    for name, smiles, tm, tb, expected in crc_clear_cases():
        if expected == "liquid":
            continue
        p = profile(smiles, _given(tm, tb))
        assert p["physical_state"]["value"] == expected, name
        assert p["flammable_category"] is None, name
        assert not [h for h in p["hazard_classes"] if h["class"] == "flammable-liquid"], name
        assert not liquid_notes & {n["id"] for n in p["handling_notes"]}, name
        assert not any("liquid" in n["text"].lower() and n["id"] != "liquefied-gas" for n in p["handling_notes"]), name
        checked += 1
    assert checked >= 15


# UN GHS Rev. 10 ch. 2.2 applied by hand to the IEC 60079-20-1 limits (vol %, printed beside):
# 1A if LFL <= 13 or range >= 12, but 1B when LFL > 6; else 2.
GAS_CATEGORIES = (
    ("methane", "74-82-8", "1A"),          # 4.4-17
    ("ethane", "74-84-0", "1A"),           # 2.4-15.5
    ("propane", "74-98-6", "1A"),          # 1.7-10.9
    ("n-butane", "106-97-8", "1A"),        # 1.4-9.3
    ("ethylene", "74-85-1", "1A"),         # 2.3-36
    ("acetylene", "74-86-2", "1A"),        # 2.3-100
    ("hydrogen", "1333-74-0", "1A"),       # 4.0-77
    ("ammonia", "7664-41-7", "1B"),        # 15-33.6: range >= 12, LFL > 6 (the Rev. 10 1B example, from memory)
    ("carbon monoxide", "630-08-0", "1B"),  # 10.9-74: LFL > 6
    ("chloromethane", "74-87-3", "1B"),    # 7.6-19: LFL > 6
    ("hydrogen sulfide", "7783-06-4", "1A"),  # 4.0-45.5
    ("dimethyl ether", "115-10-6", "1A"),  # 2.7-32
)


def test_flammable_gas_categories_from_published_limits():
    from chemicals import safety

    safety._load_safety_data()
    table = safety.IEC_2010_data  # source: IEC 60079-20-1 (2010) via chemicals 1.5.2
    for name, cas, expected in GAS_CATEGORIES:
        lfl, ufl = 100 * float(table.loc[cas, "LFL"]), 100 * float(table.loc[cas, "UFL"])
        assert state.flammable_gas_category(lfl, ufl) == expected, (name, lfl, ufl)
    # the criteria's edges: 13 % and 12 points (UN GHS Rev. 10 ch. 2.2)
    assert state.flammable_gas_category(13.0, 14.0) == "1B"  # LFL <= 13, above 6
    assert state.flammable_gas_category(13.1, 25.0) == "2"   # LFL > 13 and a range of 11.9 points
    assert state.flammable_gas_category(13.1, 25.2) == "1B"  # a range of 12.1 points
    assert state.flammable_gas_category(14.0, 20.0) == "2"
    assert state.flammable_gas_category(5.0, 4.0) is None


def test_flammable_gas_category_reaches_the_profile_with_stated_limits():
    # propane with CRC Tm/Tb and IEC 60079-20-1 limits: 1A, liquefied (IUPAC Tc 369.9 K > 65 degC)
    given = _given(85.4, 231.04)
    given["lower_flammable_limit"] = Value(1.7, "%", Provenance("literature", source="iec-60079-20-1"))
    given["upper_flammable_limit"] = Value(10.9, "%", Provenance("literature", source="iec-60079-20-1"))
    p = profile("CCC", given)
    classes = {h["class"]: h for h in p["hazard_classes"]}
    assert classes["flammable-gas"]["category"] == "1A" and classes["flammable-gas"]["h_code"] == "H220"
    assert classes["gas-under-pressure"]["category"] == "liquefied, low pressure"
    assert classes["gas-under-pressure"]["h_code"] == "H280"
    assert p["flammable_category"] is None and "lower_flammable_limit_estimate" not in p


def test_jones_limits_against_iec_table():
    # Jones (1938) LFL = 0.55 C_st against IEC 60079-20-1 for alkanes (chemicals 1.5.2)
    from chemicals import safety

    safety._load_safety_data()
    table = safety.IEC_2010_data
    for cas, (c, h) in {"74-82-8": (1, 4), "74-84-0": (2, 6), "74-98-6": (3, 8), "106-97-8": (4, 10),
                        "110-54-3": (6, 14)}.items():
        lfl, _ = state.jones_limits(c, h, 0)
        measured = 100 * float(table.loc[cas, "LFL"])
        assert abs(lfl - measured) <= 1.645 * 0.25 * lfl, cas  # within the stated 90 % interval


# Critical temperatures (K) of the IUPAC table in chemicals 1.5.2, Joback from the CRC/chemicals Tb
TC_CASES = ("74-84-0", "74-98-6", "106-97-8", "75-28-5", "74-85-1", "115-07-1", "115-10-6", "74-87-3",
            "106-99-0", "75-01-4", "74-89-5", "75-21-8")


def test_joback_tc_against_the_iupac_table():
    from chemicals.critical import Tc
    from chemicals.identifiers import search_chemical
    from chemicals.phase_change import Tb
    from rdkit import Chem

    errors = []
    for cas in TC_CASES:
        mol = Chem.MolFromSmiles(search_chemical(cas).smiles)
        counts, unassigned = joback_groups(mol)
        assert not unassigned, cas
        estimate = joback_tc(counts, Tb(cas))
        reference = Tc(cas)  # source: IUPAC critical data via chemicals 1.5.2
        errors.append(abs(estimate - reference))
        assert abs(estimate - reference) <= 3 * 6.0, cas  # 3 x the standard uncertainty used (6 K)
    assert sum(errors) / len(errors) <= 6.0  # published AAE 4.76 K (Joback & Reid 1987)


def test_joback_increments_match_thermo():
    # the Tc and Tf increments typed into builder/chem/joback.py against thermo 0.6.1's Joback table
    thermo_joback = pytest.importorskip("thermo.group_contribution.joback")
    from builder.chem.joback import TC_TF_INCREMENT

    theirs = {g.group: (g.Tc, g.Tm) for g in thermo_joback.JOBACK_GROUPS_LIST}
    renamed = {"≡CH": "#CH", "≡C-": "#C-", "O=CH- (aldehyde)": "O=CH-", "-COOH (acid)": "-COOH",
               "-COO- (ester)": "-COO-", "=O (other than above)": "=O (other)"}
    theirs = {renamed.get(k, k): v for k, v in theirs.items()}
    assert set(theirs) == set(TC_TF_INCREMENT)
    for name, (tc, tf) in TC_TF_INCREMENT.items():
        assert theirs[name] == (tc, tf), name


def test_melting_estimate_has_interval_and_reason():
    est = estimate_melting_point("c1ccccc1C(=O)O")  # benzoic acid, CRC Tm 395.5 K
    assert est.uncertainty_K > 0 and est.interval90_K[0] < 395.5 < est.interval90_K[1]
    assert estimate_melting_point("[Na+].[Cl-]").value_K is None


def test_gases_under_pressure_groups():
    # UN GHS Rev. 10 ch. 2.5; IUPAC Tc (chemicals 1.5.2): nitrogen 126.2, ethylene 282.35, propane 369.9
    assert state.gas_under_pressure_group(126.192) == "compressed"
    assert state.gas_under_pressure_group(282.35) == "liquefied, high pressure"
    assert state.gas_under_pressure_group(369.89) == "liquefied, low pressure"
    assert state.gas_under_pressure_group(223.15) == "compressed"  # exactly -50 degC


def test_straddling_estimate_says_both_and_reads_safer():
    reading = state.physical_state(T20, 288.15, 10.0, 450.0, 0.0)
    assert reading.alternatives == ("solid", "liquid") and reading.safer == "liquid"
    assert state.physical_state(T20, None, None, None, None) is None


def test_declared_statements_checked_against_state():
    assert "H225" in state.check_declared_for_state(["H225"], ("gas",))
    assert "H220" in state.check_declared_for_state(["H220"], ("liquid",))
    assert state.check_declared_for_state(["H220", "H280"], ("gas",)) is None
    assert state.check_declared_for_state(["H226"], ("solid", "liquid")) is None


@pytest.mark.parametrize("smiles", ["O", "N", "Cl", "ClCl", "BrBr", "O=S=O", "[Ar]", "[He]", "[Na+].[Cl-]", "[Fe]",
                                    "C", "FC(F)(F)F", "CCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCCC"])
def test_profile_always_gives_a_state_and_a_boiling_point_or_reason(smiles):
    p = profile(smiles)
    assert p["physical_state"]["value"] in ("gas", "liquid", "solid")
    assert "boiling_point" in p or p["boiling_point_missing"]["text"].startswith("No boiling point: ")
