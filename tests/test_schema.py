"""The JSON Schema (builder/schema.py) and the loader agree.

Entries are generated from the schema itself (a small generator below: objects, arrays,
enums, ``anyOf``, examples and regular-expression patterns) and must load; mutated ones
must be refused by the loader (and by the schema where a schema can say it).
"""
from __future__ import annotations

import json

import pytest
import yaml
from conftest import DEMO
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from builder.cli import main
from builder.core.units import UNIT_SPELLINGS, parse_quantity
from builder.load.entries import load_catalog
from builder.load.schema import (
    MODELINE,
    SCHEMA_FILE,
    SHIPPED,
    entry_schema,
    schema_text,
)

jsonschema = pytest.importorskip("jsonschema")
SCHEMA = entry_schema()
VALIDATOR = jsonschema.Draft7Validator(SCHEMA)
_PRINTABLE = st.characters(codec="ascii", categories=("L", "N", "P", "S", "Zs"))


def from_schema(schema: dict) -> st.SearchStrategy:
    """Values valid for ``schema`` (the subset of draft-07 the entry schema uses)."""
    if "enum" in schema:
        return st.sampled_from(schema["enum"])
    if "anyOf" in schema:
        return st.one_of([from_schema(s) for s in schema["anyOf"]])
    if "examples" in schema:
        return st.sampled_from(schema["examples"])
    kind = schema.get("type")
    if kind == "object":
        props, required = schema.get("properties", {}), set(schema.get("required", ()))
        return st.fixed_dictionaries({k: from_schema(v) for k, v in props.items() if k in required},
                                     optional={k: from_schema(v) for k, v in props.items() if k not in required})
    if kind == "array":
        return st.lists(from_schema(schema["items"]), max_size=3)
    if kind == "number":
        return st.floats(min_value=schema.get("minimum", -1e6), max_value=schema.get("maximum", 1e6), allow_nan=False)
    if kind == "integer":
        return st.integers(-1000, 3000)
    if kind == "string":
        pattern = schema.get("pattern", "")
        return st.from_regex(pattern, fullmatch=pattern.startswith("^"), alphabet=_PRINTABLE)
    raise AssertionError(f"generator does not know {schema}")


def _keys(doc, name):
    """Every value under a key ``name`` anywhere in ``doc``."""
    if isinstance(doc, dict):
        for k, v in doc.items():
            if k == name:
                yield from (v if isinstance(v, list) else [v])
            else:
                yield from _keys(v, name)


def _load(tmp_path, doc):
    """Write ``doc`` as an entry, with a bibliography and stores holding every key it names."""
    folder = tmp_path / "entries"
    folder.mkdir(exist_ok=True)
    named = list(_keys(doc, "source")) + list(_keys(doc, "hazard_source"))
    sources = {k: {"title": "T", "kind": "handbook"} for k in named if isinstance(k, str)}
    stores = {k: {"name": "S"} for k in _keys(doc.get("catalog") or {}, "locations") if isinstance(k, str)}
    (folder / "sources.yaml").write_text(yaml.safe_dump(sources or {"x": {"title": "T", "kind": "handbook"}}))
    (folder / "locations.yaml").write_text(yaml.safe_dump(stores or {"s": {"name": "S"}}))
    text = MODELINE + "\n" + yaml.safe_dump(doc, allow_unicode=True, sort_keys=False)
    (folder / "generated.yaml").write_text(text, encoding="utf-8")
    return load_catalog(folder)


def _consistent_antoine(doc):
    """Coefficients that agree with each other and with every t_min/t_max example (ethanol, Pa and K).

    A schema checks each coefficient alone; whether A, B, C, the units and the range give
    possible pressures together is the loader's check, which a schema cannot express.
    """
    antoine = (doc.get("properties") or {}).get("antoine")
    if isinstance(antoine, dict):
        antoine.update(form="log10", A=10.33675, B=1648.22, C=-42.232, pressure_unit="Pa", temperature_unit="K")
    return doc


def _consistent_composition(doc):
    """A composition whose fractions can sum to 100 % and whose components exist, on a mixture.

    The schema checks each component alone; sums, existing ids and the type a composition needs
    are the loader's checks across fields.
    """
    if "composition" in doc:
        doc["type"] = "mixture"
        doc.pop("smiles", None)
        doc["composition"] = [{"smiles": "CCO", "name": "ethanol", "fraction": "10-40 % w/w"},
                              {"smiles": "O", "name": "water", "fraction": "balance"}]
    return doc


ENTRIES = from_schema(SCHEMA).filter(VALIDATOR.is_valid).map(_consistent_antoine).map(_consistent_composition)
SETTINGS = settings(max_examples=40, deadline=None, derandomize=True,
                    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow,
                                           HealthCheck.filter_too_much])


def test_shipped_schema_is_the_generator_output():
    assert SHIPPED.read_text(encoding="utf-8") == schema_text(), "run: python -m builder.load.schema"
    jsonschema.Draft7Validator.check_schema(json.loads(SHIPPED.read_text(encoding="utf-8")))


def test_demo_entries_carry_the_modeline_and_validate():
    files = [p for p in sorted(DEMO.glob("*.yaml")) if p.name not in ("sources.yaml", "locations.yaml")]
    assert files
    for path in files:
        text = path.read_text(encoding="utf-8")
        assert text.splitlines()[0] == MODELINE, path.name
        errors = [e.message for e in VALIDATOR.iter_errors(yaml.safe_load(text))]
        assert errors == [], (path.name, errors)


def test_schema_command_writes_a_file_the_loader_ignores(make_entries, capsys):
    folder = make_entries({"ethanol.yaml": "name: Ethanol\nsmiles: CCO\n"})
    assert main(["schema", "--entries", str(folder)]) == 0
    assert json.loads((folder / SCHEMA_FILE).read_text(encoding="utf-8")) == SCHEMA
    catalog, diags = load_catalog(folder)
    assert [e.id for e in catalog.entries] == ["ethanol"] and diags == []


def test_every_unit_spelling_in_the_schema_parses():
    for dimension, units in UNIT_SPELLINGS.items():
        for unit in units:
            parse_quantity(f"1.5 {unit}", dimension)  # raises UnitProblem if the loader disagrees


@pytest.mark.slow  # 40 generated entries, each loaded from disk
@SETTINGS
@given(doc=ENTRIES)
def test_entries_generated_from_the_schema_load(tmp_path, doc):
    catalog, diags = _load(tmp_path, doc)
    assert catalog is not None, [str(d) for d in diags]


def _put(path, value):
    def apply(doc):
        target = doc
        for key in path[:-1]:
            target = target.setdefault(key, {})
        target[path[-1]] = value
        return doc
    return apply


# (name, mutation, the schema refuses it too)
MUTATIONS = [
    ("unknown field", _put(("colour",), "red"), True),
    ("name not text", _put(("name",), 12), True),
    ("properties a list", _put(("properties",), ["boiling_point"]), True),
    ("unknown property", _put(("properties", "boiling_pt"), {"value": "78 °C", "source": "crc-95"}), True),
    ("bad unit", _put(("properties", "boiling_point"), {"value": "78 kPa", "source": "crc-95"}), True),
    ("no unit", _put(("properties", "density"), {"value": 0.79, "source": "crc-95"}), True),
    ("no source", _put(("properties", "flash_point"), {"value": "12 °C"}), True),
    ("stated estimate", _put(("properties", "density"), {"value": "0.79 g/cm3", "source": "crc-95",
                                                         "provenance": "estimated"}), True),
    ("vapor pressure without temperature", _put(("properties", "vapor_pressure"),
                                                {"value": "5.8 kPa", "source": "crc-95"}), True),
    ("bad hazard code", _put(("hazard_statements",), ["flammable"]), True),
    ("bad formula", _put(("formula",), "c2h6o"), True),
    ("molar mass in kelvin", _put(("molar_mass",), "46 K"), True),
    ("bad CAS check digit", _put(("cas",), "64-17-6"), False),
    ("SMILES that does not parse", _put(("smiles",), "C1CC"), False),
]


@SETTINGS
@given(doc=ENTRIES, mutation=st.sampled_from(MUTATIONS))
def test_mutated_entries_are_refused(tmp_path, doc, mutation):
    name, apply, schema_refuses = mutation
    if name == "SMILES that does not parse":
        assume(doc.get("type") != "mixture")
    doc = apply(json.loads(json.dumps(doc)))
    catalog, diags = _load(tmp_path, doc)
    assert catalog is None, name
    assert any(d.severity == "error" for d in diags)
    if schema_refuses:
        assert not VALIDATOR.is_valid(doc), name
