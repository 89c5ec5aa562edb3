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
    fixed = text.replace("H226", "H225")
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
        assert d.forces is not None and d.forces.reasons, d.entry.id
        assert d.get("boiling_point") is not None, d.entry.id
        assert d.label("volatility_band") is not None, d.entry.id
        assert d.curve, d.entry.id


def test_in_house_intermediate_is_estimated_and_says_so(demo):
    d = next(x for x in demo if x.entry.id == "hm-7-hydroxy-ester")
    assert d.get("boiling_point").kind == "estimated" and d.get("boiling_point").uncertainty > 0
    assert d.get("flash_point").kind == "estimated"
    assert "estimated" in (d.label("flammable_category").provenance.note or "")


def test_heavily_halogenated_liquid_gets_no_flash_point_estimate(demo):
    # dichloromethane has no flash point in normal tests (common practice); no category is invented
    d = next(x for x in demo if x.entry.id == "dichloromethane")
    assert d.get("flash_point") is None and d.label("flammable_category") is None


def test_store_temperature_comes_from_the_warmest_store(demo):
    d = next(x for x in demo if x.entry.id == "ethanol")  # flammables cabinet 30 °C and pilot bay 35 °C
    assert d.get("store_temperature").value == pytest.approx(308.15)
    assert d.get("store_temperature").kind == "rule"
