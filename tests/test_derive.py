"""What a datasheet derives, end to end through the entry model and the CLI."""
from __future__ import annotations

import json

import pytest
from conftest import DEMO

from builder.cli import main
from builder.derive.catalog import derive_catalog
from builder.load.entries import load_catalog

#: the bibliography these entries cite (an uncited source would be a warning of its own)
CRC_ONLY = "crc-95:\n  title: CRC Handbook of Chemistry and Physics\n  kind: handbook\n"


def _check(make_entries, files, capsys, strict=False):
    folder = make_entries(files, sources=CRC_ONLY)
    status = main(["check", "--entries", str(folder)] + (["--strict"] if strict else []))
    return status, capsys.readouterr().err


def test_boiling_point_far_from_the_estimate_warns(make_entries, capsys):
    # a Fahrenheit value typed as Celsius: ethanol boils at 78.4 °C (CRC Handbook), 173 °F
    text = "name: Ethanol\nsmiles: CCO\nproperties:\n  boiling_point: {value: 173 °C, source: crc-95}\n"
    status, err = _check(make_entries, {"ethanol.yaml": text}, capsys)
    assert status == 0
    assert "ethanol.yaml:4:26: warning: boiling point 173.0 °C is" in err and "check the unit or the structure" in err
    status, _ = _check(make_entries, {"ethanol.yaml": text}, capsys, strict=True)
    assert status == 1


def test_correct_boiling_point_does_not_warn(make_entries, capsys):
    text = "name: Ethanol\nsmiles: CCO\nproperties:\n  boiling_point: {value: 78.3 °C, source: crc-95}\n"
    status, err = _check(make_entries, {"ethanol.yaml": text}, capsys, strict=True)
    assert status == 0 and "warning:" not in err


def test_hazard_statements_contradicting_the_flash_point_warn(make_entries, capsys):
    # ethanol: flash point 12 °C, boiling point 78 °C → GHS category 2 (H225), not H226
    text = ("name: Ethanol\nsmiles: CCO\nhazard_statements: [H226, H319]\nproperties:\n"
            "  boiling_point: {value: 78.3 °C, source: crc-95}\n  flash_point: {value: 12 °C, source: crc-95}\n")
    status, err = _check(make_entries, {"ethanol.yaml": text}, capsys)
    assert "ethanol.yaml:3:20: warning: hazard statements disagree with the flash point" in err
    fixed = text.replace("H226", "H225").replace("H319]\n", "H319]\nhazard_source: crc-95\n")
    status, err = _check(make_entries, {"ethanol.yaml": fixed}, capsys, strict=True)
    assert status == 0, err


def _profile(capsys, *args):
    assert main(["profile", *args, "--json"]) == 0
    return [json.loads(line) for line in capsys.readouterr().out.splitlines()]


def test_profile_with_given_values_is_category_1(capsys):
    # diethyl ether: bp 34.6 °C, flash point −45 °C (IEC 60079-20-1) → GHS category 1 (ch. 2.6: FP < 23, IBP ≤ 35)
    (obj,) = _profile(capsys, "CCOCC", "--given", "boiling_point=34.6 °C", "--given", "flash_point=-45 °C")
    assert obj["flammable_category"] == 1
    assert obj["flammable_category_range"] == [1]
    assert obj["boiling_point"]["provenance"] == {"kind": "measured", "source": "command-line",
                                                  "note": "given with --given"}
    ids = {n["id"] for n in obj["handling_notes"]}
    assert "flammable-storage-high" in ids and "pressure-build-up" in ids
    assert all({"id", "text", "severity", "source"} <= set(n) for n in obj["handling_notes"])


def test_an_uncertain_state_is_said_before_the_notes_that_assume_the_more_mobile_one(capsys):
    # ethanol from its structure alone: the estimated boiling point's 90 % interval reaches below
    # 20 °C, so the gas notes apply and the note on the uncertain state comes with them; with the
    # boiling and melting points given (CRC 95th ed.: 78.29 °C, −114.14 °C, from memory) the state
    # is clear and neither appears
    (obj,) = _profile(capsys, "CCO")
    ids = [n["id"] for n in obj["handling_notes"]]
    assert "state-uncertain" in ids and "gas-cylinder" in ids
    assert ids.index("state-uncertain") < ids.index("gas-cylinder")
    (obj,) = _profile(capsys, "CCO", "--given", "boiling_point=78.29 °C", "--given", "melting_point=-114.14 °C")
    ids = [n["id"] for n in obj["handling_notes"]]
    assert "state-uncertain" not in ids and "gas-cylinder" not in ids


def test_profile_without_given_values_reports_the_estimates_spread(capsys):
    (obj,) = _profile(capsys, "CCOCC")
    assert obj["boiling_point"]["provenance"]["kind"] == "estimated"
    assert obj["flash_point"]["provenance"]["kind"] == "estimated"
    assert obj["flammable_category"] in obj["flammable_category_range"]
    assert len(obj["flammable_category_range"]) > 1
    assert obj["boiling_point"]["unit"] == "K" and obj["boiling_point"]["uncertainty"] > 0
    assert obj["vapor_pressure_25C"]["unit"] == "Pa"


def test_profile_dichloroethene_isomers(capsys):
    trans, cis = _profile(capsys, "Cl/C=C/Cl", "Cl/C=C\\Cl")
    assert trans["forces"]["dominant"] == "dispersion"
    assert cis["forces"]["dominant"] == "dipole-dipole"
    for obj in (trans, cis):
        assert {"dominant", "present", "reasons", "dipole_moment", "polarizability"} <= set(obj["forces"])


def test_bad_given_value_is_a_usage_error(capsys):
    assert main(["profile", "CCO", "--given", "boiling_point=hot"]) == 2
    assert main(["profile", "CCO", "--given", "colour=blue"]) == 2


@pytest.fixture(scope="module")
def demo():
    catalog, _ = load_catalog(DEMO)
    return derive_catalog(catalog)


def test_every_demo_entry_has_forces_boiling_point_and_fire_sections(demo):
    for d in demo:
        if d.entry.type == "mixture" and not d.entry.composition:  # a resin without a structure: nothing to derive
            continue
        if d.entry.type == "mixture":  # a mixture's forces are its components': the composition section says so
            assert d.mixture is not None and d.mixture.force_note, d.entry.id
        else:
            assert d.forces is not None and d.forces.reasons, d.entry.id
        assert d.label("physical_state") is not None, d.entry.id
        if d.get("boiling_point") is None:  # a salt: the reason is shown instead (never a silent gap)
            assert d.label("boiling_point_missing").text.startswith("No boiling point: "), d.entry.id
            continue
        assert d.label("volatility_band") is not None, d.entry.id
        # no vapor-pressure curve for a gas: the store temperatures lie above its boiling point
        assert d.curve or d.label("physical_state").code == "gas", d.entry.id
        # plain floats (a numpy scalar pickles with its dtype: slow to cache and to send between processes)
        assert all(type(x) is float for s in d.curve for x in s.temperatures + s.pressures), d.entry.id


def test_in_house_intermediate_is_estimated_and_says_so(demo):
    d = next(x for x in demo if x.entry.id == "hm-7-hydroxy-ester")
    assert d.get("boiling_point").kind == "estimated" and d.get("boiling_point").uncertainty > 0
    assert d.get("flash_point").kind == "estimated"
    assert "estimated" in (d.label("flammable_category").provenance.note or "")


def test_a_label_from_an_estimate_is_tagged_as_an_estimate(demo):
    # the key says E marks an estimate: a category or band resting on one must carry E, not R
    d = next(x for x in demo if x.entry.id == "hm-7-hydroxy-ester")
    for key in ("flammable_category", "flammable_category_range", "volatility_band"):
        assert d.label(key).kind == "estimated", key
    assert d.get("saturated_vapor_concentration_20C").kind == d.get("vapor_pressure_20C").kind == "estimated"
    # all inputs stated: the rule's own kind
    toluene = next(x for x in demo if x.entry.id == "toluene")
    assert toluene.label("flammable_category").kind == "rule"
    assert toluene.label("volatility_band").kind == "rule"


def test_hazard_statements_carry_their_source(demo):
    toluene = next(x for x in demo if x.entry.id == "toluene")
    lab = toluene.label("hazard_statements")
    assert lab.kind == "literature" and lab.provenance.source == "clp-annex-vi"
    assert lab.code == toluene.entry.hazard_statements
    assert all(x.label("hazard_statements") is not None for x in demo if x.entry.hazard_statements)


def test_heavily_halogenated_liquid_gets_no_flash_point_estimate(demo):
    # dichloromethane has no flash point in normal tests (common practice); no category is invented
    d = next(x for x in demo if x.entry.id == "dichloromethane")
    assert d.get("flash_point") is None and d.label("flammable_category") is None


def test_store_temperature_comes_from_the_warmest_store(demo):
    d = next(x for x in demo if x.entry.id == "ethanol")  # flammables cabinet 30 °C and pilot bay 35 °C
    assert d.get("store_temperature").value == pytest.approx(308.15)
    assert d.get("store_temperature").kind == "rule"


def test_hazard_statements_contradicting_the_physical_state_warn(make_entries, capsys):
    # propane, CRC Tm 85.4 K and Tb 231.04 K: a gas at 20 °C, so H225 (flammable liquid, UN GHS ch. 2.6) is wrong
    text = ("name: Propane\nsmiles: CCC\nhazard_statements: [H225]\nhazard_source: crc-95\nproperties:\n"
            "  boiling_point: {value: 231.04 K, source: crc-95}\n  melting_point: {value: 85.4 K, source: crc-95}\n")
    status, err = _check(make_entries, {"propane.yaml": text}, capsys)
    assert "hazard statements disagree with the physical state: H225 (flammable liquid) declared for a gas" in err
    # toluene, CRC Tb 383.75 K: a liquid, so H220 (flammable gas, ch. 2.2) is wrong too
    text = ("name: Toluene\nsmiles: Cc1ccccc1\nhazard_statements: [H220]\nhazard_source: crc-95\nproperties:\n"
            "  boiling_point: {value: 383.75 K, source: crc-95}\n  melting_point: {value: 178.15 K, source: crc-95}\n")
    status, err = _check(make_entries, {"toluene.yaml": text}, capsys)
    assert "H220 (gas) declared for a liquid" in err
    fixed = text.replace("H220", "H225")
    status, err = _check(make_entries, {"toluene.yaml": fixed}, capsys)
    assert not [line for line in err.splitlines() if "toluene.yaml" in line and "physical state" in line]


def test_profile_json_has_state_and_hazard_classes(capsys):
    # ethylene with its CRC points (Tm 104.0 K, Tb 169.38 K): a gas; no flammable-liquid category
    (obj,) = _profile(capsys, "C=C", "--given", "boiling_point=169.38 K", "--given", "melting_point=104.0 K")
    assert obj["physical_state"]["value"] == "gas" and obj["physical_state"]["alternatives"] == ["gas"]
    assert obj["physical_state"]["provenance"]["method"] == "physical-state"
    assert obj["flammable_category"] is None
    classes = {c["class"]: c for c in obj["hazard_classes"]}
    assert set(classes) == {"flammable-gas", "gas-under-pressure"}
    assert classes["flammable-gas"]["provenance"]["kind"] == "estimated"  # limits by Jones's correlation


def test_gas_kept_below_its_boiling_point_is_refrigerated_liquefied(make_entries):
    # nitrogen, CRC Tb 77.355 K, kept in a dewar store rated to 70 K: UN GHS ch. 2.5 refrigerated liquefied (H281)
    from builder.derive.serialize import hazard_classes_json

    text = ("name: Liquid nitrogen\nsmiles: 'N#N'\ncatalog:\n  max_store_temperature: 70 K\nproperties:\n"
            "  boiling_point: {value: 77.355 K, source: crc-95}\n  melting_point: {value: 63.15 K, source: crc-95}\n")
    catalog, diags = load_catalog(make_entries({"liquid-nitrogen.yaml": text}))
    assert catalog is not None, diags
    (d,) = derive_catalog(catalog)
    assert d.label("physical_state").code == "gas" and d.label("physical_state_store").code == "liquid"
    (cls,) = hazard_classes_json(d)
    assert cls["category"] == "refrigerated liquefied" and cls["h_code"] == "H281"
    assert "refrigerated-liquefied-gas" in {n.id for n in d.notes}


def test_entry_keys_follow_the_settings_for_the_same_catalog(monkeypatch):
    # the keys are kept for the catalog last asked about; a changed COHESION_* setting (here the 3D
    # limit, which changes results) must still give other keys, and the keys of a cold computation
    from builder.core.cache import settings_key
    from builder.derive import catalog as derive_module

    monkeypatch.delenv("COHESION_MAX_3D_ATOMS", raising=False)
    catalog, _ = load_catalog(DEMO)
    before = derive_module.entry_keys(catalog)
    monkeypatch.setenv("COHESION_MAX_3D_ATOMS", "12")
    limited = derive_module.entry_keys(catalog)
    by_id = {e.id: e for e in catalog.entries}
    assert limited == {e.id: derive_module.derive_key(
        e, {k: catalog.locations[k] for k in e.catalog.locations},
        tuple(by_id[i] for i in derive_module.component_ids(e, by_id)), settings_key()) for e in catalog.entries}
    assert all(limited[k] != before[k] for k in before)
    monkeypatch.delenv("COHESION_MAX_3D_ATOMS")
    assert derive_module.entry_keys(catalog) == before
