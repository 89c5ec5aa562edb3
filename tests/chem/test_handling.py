"""Tests for builder.chem.handling and builder/data/handling_rules.yaml."""

from __future__ import annotations

import pytest
import yaml
from chemicals.environment import logP
from chemicals.miscdata import CRC_organic_data

from builder.chem import handling
from builder.chem.handling import RulesError, evaluate_rules, load_rules, validate_rules

C = 273.15

# Toluene facts: IEC flash point 277.15 K, Tb 383.75 K (chemicals), GHS cat 2,
# M 92.14 g/mol -> 3.18 x air; liquid density from the CRC Handbook organic table
# (chemicals.miscdata.CRC_organic_data "rho", 862.3 kg/m3) and log P from
# chemicals.environment.logP (CRC, 2.73); a hydrocarbon held together by
# dispersion; a store assumed to reach 40 degC.
# The liquid-only rules need the state: a liquid at 20 degC and in store (CRC Tm 178.2 K, Tb 383.75 K).
LIQUID = {"physical_state": "liquid", "state_for_rules": "liquid", "store_state_for_rules": "liquid"}
TOLUENE = {
    **LIQUID,
    "flammable_category": 2,
    "flash_point": 277.15,
    "boiling_point": 383.75,
    "store_max_temperature": 40.0 + C,
    "store_max_temperature_basis": "assumed default",
    "vapor_density_ratio": 3.18,
    "dominant_force": "dispersion",
    "is_hydrocarbon": True,
    "density": float(CRC_organic_data.loc["108-88-3", "rho"]),
    "log_p": float(logP("108-88-3")),
}


def ids(facts):
    return [n.id for n in evaluate_rules(facts)]


def test_packaged_rules_load_and_cover_required_topics():
    rules = load_rules()
    names = {r.id for r in rules}
    assert {"flammable-storage-high", "flammable-storage", "pressure-build-up",
            "vapor-heavier-than-air", "static-accumulator", "floats-on-water",
            "store-at-or-above-flash-point"} <= names
    assert all(r.source and r.severity in handling.SEVERITIES for r in rules)


def test_toluene_notes_in_stable_order():
    notes = evaluate_rules(TOLUENE)
    assert [n.id for n in notes] == [
        "flammable-storage-high", "store-at-or-above-flash-point",
        "static-accumulator", "vapor-heavier-than-air", "floats-on-water",
    ]
    assert [n.severity for n in notes] == ["high", "high", "medium", "info", "info"]
    text = {n.id: n.text for n in notes}
    assert "category 2" in text["flammable-storage-high"]
    assert "40\u00a0°C (assumed default)" in text["store-at-or-above-flash-point"]
    assert "flash point (4\u00a0°C)" in text["store-at-or-above-flash-point"]
    assert "3.18 times" in text["vapor-heavier-than-air"]
    assert f"{TOLUENE['density']:.3g} kg/m³" in text["floats-on-water"]  # 3 significant figures
    assert "Bond and earth" in text["static-accumulator"]
    assert evaluate_rules(TOLUENE) == notes  # deterministic


def test_unknown_facts_never_fire():
    assert evaluate_rules({}) == []
    assert ids({"flammable_category": None, "flash_point": None}) == []
    # A comparison against an unknown reference is unknown, not false-then-negated.
    assert "pressure-build-up" not in ids({"boiling_point": 300.0})


def test_not_of_unknown_stays_unknown():
    rules = validate_rules({"version": 1, "rules": [{
        "id": "not-test", "when": {"not": {"field": "density", "lt": 1000.0}},
        "text": "dense", "severity": "info", "source": "test"}]})
    assert evaluate_rules({}, rules) == []
    assert [n.id for n in evaluate_rules({"density": 1200.0}, rules)] == ["not-test"]
    assert evaluate_rules({"density": 800.0}, rules) == []


def test_pressure_build_up_margin():
    base = {**LIQUID, "store_max_temperature": 40.0 + C, "store_max_temperature_basis": "stated"}
    # Diethyl ether, bp 34.6 degC: below the store maximum.
    assert "pressure-build-up" in ids({**base, "boiling_point": 34.6 + C})
    # Within the 5 K margin, and just outside it.
    assert "pressure-build-up" in ids({**base, "boiling_point": 45.0 + C})
    assert "pressure-build-up" not in ids({**base, "boiling_point": 45.2 + C})
    text = evaluate_rules({**base, "boiling_point": 34.6 + C})[0].text
    assert "Boils at 35\u00a0°C" in text and "40\u00a0°C, stated" in text


def test_flammable_categories():
    assert ids({**LIQUID, "flammable_category": 1}) == ["flammable-storage-high"]
    assert ids({**LIQUID, "flammable_category": 3}) == ["flammable-storage"]
    assert ids({**LIQUID, "flammable_category": 4}) == []
    # the state unknown: no liquid note (three-valued logic)
    assert ids({"flammable_category": 1}) == []


def test_static_rule_needs_hydrocarbon_or_low_conductivity():
    for force in ("dispersion", "hydrogen-bonding"):
        assert "static-accumulator" not in ids({**LIQUID, "dominant_force": force, "is_hydrocarbon": False})
    # IEC TS 60079-32-1: <= 50 pS/m is an accumulator.
    assert "static-accumulator" in ids({**LIQUID, "electrical_conductivity": 50e-12})
    assert "static-accumulator" not in ids({**LIQUID, "electrical_conductivity": 1e-6})
    # Hydrocarbon with unknown force: unknown, so no note.
    assert "static-accumulator" not in ids({**LIQUID, "is_hydrocarbon": True})
    # a liquid-only note: never for a gas or a solid (naphthalene, CRC Tm 353.4 K, is a solid hydrocarbon)
    for state in ("gas", "solid"):
        facts = {"state_for_rules": state, "dominant_force": "dispersion", "is_hydrocarbon": True}
        assert "static-accumulator" not in ids(facts)


def test_floats_on_water():
    assert "floats-on-water" in ids({**LIQUID, "density": 790.0, "water_miscible": False})
    assert "floats-on-water" not in ids({**LIQUID, "density": 789.0, "water_miscible": True})  # ethanol
    assert "floats-on-water" not in ids({**LIQUID, "density": 1330.0, "log_p": 1.25})  # dichloromethane
    assert "floats-on-water" not in ids({**LIQUID, "density": 790.0})  # miscibility unknown
    assert "floats-on-water" not in ids({"state_for_rules": "solid", "density": 940.0, "log_p": 8.2})


def test_large_numbers_render_readably():
    notes = evaluate_rules({**LIQUID, "vapor_hazard_ratio": 1869.7})
    assert "about 1,870 times" in notes[0].text


def test_fact_checks():
    with pytest.raises(ValueError, match="unknown fact 'flashpoint'"):
        evaluate_rules({"flashpoint": 300.0})
    with pytest.raises(ValueError, match="not of type int"):
        evaluate_rules({"flammable_category": "2"})
    with pytest.raises(ValueError, match="not of type bool"):
        evaluate_rules({"is_hydrocarbon": 1})


def _rule(**over):
    rule = {"id": "x", "when": {"field": "density", "lt": 1000.0}, "text": "t",
            "severity": "info", "source": "s"}
    rule.update(over)
    return {"version": 1, "rules": [rule]}


@pytest.mark.parametrize("data, fragment", [
    (_rule(colour="red"), "unknown field(s) ['colour']"),
    (_rule(when={"field": "density", "lte": 1.0}), "need exactly one operator"),
    (_rule(when={"field": "densty", "lt": 1.0}), "unknown fact 'densty'"),
    (_rule(when={"field": "density", "lt": "heavy"}), "is not a float"),
    (_rule(when={"field": "dominant_force", "gt": "dipole"}), "needs a number"),
    (_rule(when={"all": []}), "non-empty list"),
    (_rule(when={"field": "density", "lt": {"field": "log_p", "mul": 2}}), "reference needs"),
    (_rule(severity="danger"), "severity"),
    (_rule(id="Bad_Id"), "lower-case"),
    (_rule(text="{density:.2f}"), "no format spec"),
    (_rule(text="{density|degF}"), "unknown filter"),
    (_rule(text="{nope}"), "not a known fact"),
    (_rule(source=""), "source"),
    ({"version": 2, "rules": []}, "unsupported 2"),
    ({"rules": []}, "exactly 'version' and 'rules'"),
])
def test_validation_errors_are_clear(data, fragment):
    with pytest.raises(RulesError) as info:
        validate_rules(data, "rules.yaml")
    assert fragment in str(info.value)
    assert str(info.value).startswith("rules.yaml: ")


def test_all_problems_reported_at_once(tmp_path):
    data = {"version": 1, "rules": [_rule(severity="x")["rules"][0], _rule(id="x")["rules"][0]]}
    path = tmp_path / "r.yaml"
    path.write_text(yaml.safe_dump(data), encoding="utf-8")
    with pytest.raises(RulesError) as info:
        load_rules(path)
    assert len(info.value.problems) == 2
    assert any("duplicate id" in p for p in info.value.problems)


def test_no_code_execution_from_rules(tmp_path):
    path = tmp_path / "r.yaml"
    text = "version: 1\nrules: !!python/object/apply:os.system ['true']\n"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(RulesError, match="not valid YAML"):
        load_rules(path)


# --- rules by physical state (issue 11) -------------------------------------------------------
GAS = {"physical_state": "gas", "state_for_rules": "gas", "store_state_for_rules": "gas",
       "flammable_gas": False, "declared_toxic_by_inhalation": False, "declared_oxidising_gas": False}


def test_vapour_notes_by_state():
    # vapour heavier than air: a liquid's vapour, a gas's leak; never a solid's (common practice)
    assert "vapor-heavier-than-air" in ids({**LIQUID, "vapor_density_ratio": 3.18})
    assert ids({**GAS, "vapor_density_ratio": 1.52}).count("gas-heavier-than-air") == 1  # propane, M 44.1
    assert "vapor-heavier-than-air" not in ids({**GAS, "vapor_density_ratio": 1.52})
    assert not {"vapor-heavier-than-air", "gas-heavier-than-air"} & set(
        ids({"state_for_rules": "solid", "vapor_density_ratio": 4.4}))  # naphthalene


def test_cylinder_notes():
    # nitrogen (inert, CRC Tb 77.4 K, Tc 126.2 K: compressed per GHS ch. 2.5)
    got = ids({**GAS, "gas_group": "compressed"})
    assert got[:1] == ["gas-cylinder"] and "gas-displaces-oxygen" in got and "compressed-gas" in got
    assert "liquefied-gas" not in got
    # propane (H220 declared; Tc 369.9 K: liquefied, low pressure)
    got = ids({**GAS, "flammable_gas": True, "gas_group": "liquefied, low pressure"})
    assert {"gas-cylinder", "flammable-gas", "liquefied-gas"} <= set(got) and "gas-displaces-oxygen" not in got
    # chlorine (H330 declared): the toxic-gas note, not the inert one
    got = ids({**GAS, "declared_toxic_by_inhalation": True, "gas_group": "liquefied, low pressure"})
    assert "toxic-gas" in got and "gas-displaces-oxygen" not in got
    assert "gas-cylinder" not in ids({**LIQUID})


def test_solid_dust_note():
    assert "combustible-dust" in ids({"state_for_rules": "solid", "is_organic": True})  # stearic acid
    assert "combustible-dust" not in ids({"state_for_rules": "solid", "is_organic": False})  # sodium chloride
    assert "combustible-dust" not in ids({**LIQUID, "is_organic": True})


def test_process_temperature_near_flash_point():
    # 2-butoxyethanol: IEC 60079-20-1 flash point 61 degC (from the demo entry), run at 60 degC
    facts = {**LIQUID, "flash_point": 61.0 + C, "process_temperature": 60.0 + C}
    (note,) = [n for n in evaluate_rules(facts) if n.id == "process-at-or-above-flash-point"]
    assert "60\u00a0°C" in note.text and "(61\u00a0°C)" in note.text
    assert "process-at-or-above-flash-point" not in ids({**facts, "process_temperature": 55.0 + C})
    assert "process-at-or-above-flash-point" not in ids({**facts, "state_for_rules": "solid"})



def test_refrigerated_liquefied_gas_note():
    # liquid nitrogen in a dewar: CRC Tb 77.4 K, the store kept below it (UN GHS Rev. 10 ch. 2.5)
    got = ids({**GAS, "store_state_for_rules": "liquid", "gas_group": "refrigerated liquefied"})
    assert "refrigerated-liquefied-gas" in got and "liquefied-gas" not in got and "compressed-gas" not in got


def test_data_files_read_the_same_with_either_yaml_parser():
    """builder/data files are read with libyaml's parser when PyYAML has it (chem.datafile.load_yaml);
    the safe constructor is the same, so the data must equal PyYAML's pure-Python reading."""
    from pathlib import Path

    import yaml

    from builder.chem.datafile import load_yaml

    files = sorted((Path(__file__).resolve().parents[2] / "builder" / "data").glob("*.yaml"))
    assert len(files) >= 7
    for path in files:
        text = path.read_text(encoding="utf-8")
        assert load_yaml(text) == yaml.safe_load(text), path.name


def test_a_number_keeps_its_unit_on_the_same_line():
    # printed notes wrap wherever there is a plain space: between a number and its unit there is
    # a no-break space instead (tests/test_print.py checks the printed datasheets)
    from builder.chem.handling import _render

    assert _render("at {t} °C, within 5 K, {p} kPa or 3 %", {"t": 20, "p": 101}) == \
        "at 20\u00a0°C, within 5\u00a0K, 101\u00a0kPa or 3\u00a0%"
    assert _render("Kr 5 Kelvin", {}) == "Kr 5 Kelvin"  # a word that starts with K is no unit
