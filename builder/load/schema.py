"""JSON Schema (draft-07) for entry files, generated from ``entry_format.py``.

Editors that speak the YAML language server read the schema named on an entry's first
line (``# yaml-language-server: $schema=entry.schema.json``) and offer completion, hover
help and checks while typing.  The schema is generated, never edited by hand:

- ``builder/data/entry.schema.json`` ships with the package (``tests/test_schema.py``
  checks it equals ``entry_schema()``; regenerate with ``python -m builder.load.schema``);
- ``cohesion schema`` writes it next to the entries as ``entries/entry.schema.json``.

The schema checks structure, types, units (the common spellings of ``UNIT_SPELLINGS``)
and patterns; the loader checks the rest (CAS check digits, SMILES, physical limits,
that sources and locations exist, and that an Antoine equation's coefficients, units
and range agree).  An entry the schema accepts may still be refused by
the loader, never the other way round for the structure.
"""
from __future__ import annotations

import json
import re
import sys
from pathlib import Path

from builder.core.units import DIMENSIONS, UNIT_SPELLINGS
from builder.load import entry_format as fmt

SCHEMA_FILE = "entry.schema.json"
MODELINE = f"# yaml-language-server: $schema={SCHEMA_FILE}"
SHIPPED = Path(__file__).resolve().parents[1] / "data" / SCHEMA_FILE

# the loader's number, bounded so that every match is a finite float (at most 15 digits before the
# point, two in the exponent)
_NUMBER = r"[-+\u2212]?(?:\d{1,15}(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d{1,2})?"
_TEXT = {"type": "string", "pattern": r"\S"}

#: valid example values per dimension (and unit, for dimensionless fractions), for editors and the test generator
EXAMPLES = {
    "temperature": ["78.4 °C", "351.5 K", "-10 °C", "120 °F", "25 ± 0.5 °C"],
    "pressure": ["5.8 kPa", "44 mmHg", "0.1 bar", "101.325 kPa"],
    "density": ["0.789 g/cm3", "789 kg/m3", "1.33 g/mL"],
    "ppm": ["200 ppm", "0.5 ppm"],
    "%": ["3.3 %", "19 %"],
    "ratio": [1.361, "1.5", -0.31],
    "mass_concentration": ["20 g/L", "0.5 mg/mL"],
    "molar_mass": ["46.07 g/mol", "92.14 g/mol"],
}


def _units_pattern(units) -> str:
    return "(?:" + "|".join(re.escape(u).replace("\\ ", " ") for u in sorted(units, key=lambda u: (-len(u), u))) + ")"


def quantity_schema(dimension: str, unit: str | None = None, description: str = "",
                    minimum: float | None = None, possible: tuple[float, float] | None = None) -> dict:
    """A ``"<number> [± <number>] <unit>"`` text of ``dimension`` (or a bare number if dimensionless).

    ``possible`` (low, high) is the physically possible range of a dimensionless value.
    """
    dim = DIMENSIONS[dimension]
    maximum = None
    if possible is not None:
        minimum = possible[0] if minimum is None else max(minimum, possible[0])
        maximum = possible[1]
    if dimension == "ratio":
        if minimum is None:  # a bare number, or the same as text
            out = {"anyOf": [{"type": "number"}, {"type": "string", "pattern": rf"^\s*{_NUMBER}\s*$"}]}
        else:  # a limit can only be checked on a number
            out = {"anyOf": [{"type": "number", "minimum": minimum}]}
            if maximum is not None:
                out["anyOf"][0]["maximum"] = maximum
    else:
        units = (unit,) if unit else UNIT_SPELLINGS[dimension]
        out = {"type": "string",
               "pattern": rf"^\s*{_NUMBER}\s*(?:(?:±|\+/-|\+-)\s*{_NUMBER})?\s*{_units_pattern(units)}\s*$"}
    text = description or f"a {dim.name}, e.g. '{dim.example}'"
    out["description"] = text
    out["examples"] = [x for x in EXAMPLES[unit if unit else dimension]
                       if dimension != "ratio" or ((minimum is None or float(x) >= minimum)
                                                   and (maximum is None or float(x) <= maximum))]
    return out


def _field(spec: fmt.FieldSpec) -> dict:
    kind = spec.kind
    if kind == "text" or kind == "smiles":
        out = dict(_TEXT)
    elif kind == "source":
        out = _source()
        out["description"] = spec.help
    elif kind == "choice":
        out = {"type": "string", "enum": list(spec.choices)}
    elif kind == "text_list":
        out = {"anyOf": [dict(_TEXT), {"type": "array", "items": dict(_TEXT)}]}
    elif kind == "cas":
        out = {"type": "string", "pattern": fmt.CAS_PATTERN, "examples": ["64-17-5", "108-88-3", "67-64-1"]}
    elif kind == "formula":
        out = {"type": "string", "pattern": fmt.FORMULA_PATTERN, "examples": ["C2H6O", "C7H8"]}
    elif kind == "hazard_list":
        out = {"type": "array", "items": {"type": "string", "pattern": fmt.HAZARD_PATTERN,
                                          "examples": ["H225", "H319", "H304", "EUH066"]}}
    elif kind == "location_list":
        key = {"type": "string", "pattern": fmt.ID_PATTERN, "maxLength": fmt.MAX_ID_LENGTH,
               "not": {"enum": list(fmt.RESERVED_NAMES)}}
        out = {"anyOf": [dict(key), {"type": "array", "items": dict(key)}]}
    elif kind == "quantity":
        return quantity_schema(spec.dimension, description=spec.help)
    elif kind == "catalog":
        out = {"type": "object", "additionalProperties": False,
               "properties": {k: _field(v) for k, v in fmt.CATALOG_FIELDS.items()}}
    elif kind == "properties":
        out = _properties()
    elif kind == "composition":
        out = _composition()
    else:
        raise ValueError(f"unknown field kind {kind!r}")
    if kind == "smiles":
        out["examples"] = ["CCO", "Cc1ccccc1", "CC(C)=O"]
    out["description"] = spec.help
    return out


def _source() -> dict:
    return {"type": "string", "pattern": fmt.ID_PATTERN, "maxLength": fmt.MAX_ID_LENGTH, "description": fmt.PROPERTY_HELP["source"],
            "examples": ["crc-95", "poling-2001"]}


def _provenance() -> dict:
    return {"type": "string", "enum": list(fmt.STATED_KINDS), "description": fmt.PROPERTY_HELP["provenance"]}


def _property(name: str, spec: fmt.PropertySpec) -> dict:
    conditions = {"type": "object", "additionalProperties": False, "description": fmt.PROPERTY_HELP["conditions"],
                  "properties": {k: quantity_schema(dim) for k, dim in fmt.CONDITION_KEYS.items()}}
    required = ["value", "source"]
    if spec.needs_temperature:
        conditions["required"] = ["at"]
        required.append("conditions")
    help_text = spec.label + (f": {spec.help}" if spec.help else "")
    return {"type": "object", "additionalProperties": False, "required": required, "description": help_text,
            "properties": {
                "value": quantity_schema(spec.dimension, spec.unit, fmt.PROPERTY_HELP["value"], spec.minimum,
                                         spec.possible),
                "source": _source(), "provenance": _provenance(), "conditions": conditions,
                "method": dict(_TEXT, description=fmt.PROPERTY_HELP["method"]),
                "note": dict(_TEXT, description=fmt.PROPERTY_HELP["note"])}}


def _antoine() -> dict:
    h = fmt.ANTOINE_HELP
    props = {
        "form": {"type": "string", "enum": list(fmt.ANTOINE_FORMS)},
        "A": {"type": "number"}, "B": {"type": "number"}, "C": {"type": "number"},
        "pressure_unit": {"type": "string", "enum": list(UNIT_SPELLINGS["pressure"])},
        "temperature_unit": {"type": "string", "enum": ["K", "°C", "degC"]},
        # every t_min example lies below every t_max example
        "t_min": dict(quantity_schema("temperature"), examples=["250 K", "-30 °C", "276.5 K"]),
        "t_max": dict(quantity_schema("temperature"), examples=["369.54 K", "100 °C", "400 K"]),
        "source": _source(), "provenance": _provenance(), "note": dict(_TEXT),
    }
    assert list(props) == list(fmt.ANTOINE_KEYS)
    for key, value in props.items():
        value["description"] = h[key]
    return {"type": "object", "additionalProperties": False,
            "required": ["form", "A", "B", "C", "pressure_unit", "temperature_unit", "t_min", "t_max", "source"],
            "description": "Antoine equation with its valid range and source", "properties": props}


def _composition() -> dict:
    from builder.load.composition import BASES
    fraction = {"anyOf": [{"enum": ["balance"]}, {"type": "string", "pattern": r"^[0-9.]+(\s*(-|–|to)\s*[0-9.]+)?\s*%?\s*("
                                                 + "|".join(re.escape(b) for b in BASES) + ")$"}],
                "description": "e.g. '40 % w/w', '10-20 % v/v', '0.5 mol/mol' or 'balance'",
                "examples": ["40 % w/w", "10-20 % w/w", "0.5 mol/mol", "balance"]}
    component = {"type": "object", "additionalProperties": False, "required": ["fraction"],
                 "properties": {"component": dict(_TEXT, description="an entry id of the catalog"),
                                "smiles": dict(_TEXT, description="an inline structure (with a name)"),
                                "name": dict(_TEXT, description="the inline component's name"),
                                "fraction": fraction},
                 "oneOf": [{"required": ["component"]}, {"required": ["smiles", "name"]}]}
    return {"type": "array", "minItems": 1, "items": component}


def _hansen(sphere: bool) -> dict:
    keys = fmt.SPHERE_KEYS if sphere else fmt.HANSEN_KEYS
    props = {}
    for key in keys:
        if key in ("source",):
            props[key] = _source()
        elif key == "provenance":
            props[key] = _provenance()
        elif key == "note":
            props[key] = dict(_TEXT)
        else:
            props[key] = {"type": "number", "minimum": 0, "maximum": fmt.HANSEN_MAX}
        props[key]["description"] = fmt.HANSEN_HELP[key]
    required = [k for k in keys if k not in ("provenance", "note")]
    what = ("a resin's or polymer's Hansen solubility sphere (centre and radius, MPa½)" if sphere
            else "stated Hansen solubility parameters (MPa½)")
    return {"type": "object", "additionalProperties": False, "required": required, "description": what,
            "properties": props}


def _properties() -> dict:
    props = {name: _property(name, spec) for name, spec in fmt.PROPERTIES.items()}
    props["antoine"] = _antoine()
    props["hansen"] = _hansen(False)
    props["hansen_sphere"] = _hansen(True)
    return {"type": "object", "additionalProperties": False, "properties": props}


def entry_schema() -> dict:
    """The draft-07 JSON Schema of an entry file (format v{fmt.FORMAT_VERSION})."""
    assert all(k in fmt.ENTRY_FIELDS for k in fmt.ENTRY_KEYS)
    return {
        "$schema": "http://json-schema.org/draft-07/schema#",
        "$id": f"https://cohesion.invalid/schema/entry-v{fmt.FORMAT_VERSION}.json",
        "title": f"cohesion entry (format v{fmt.FORMAT_VERSION})",
        "description": "One material of the catalog: entries/<id>.yaml. Generated from builder/entry_format.py; "
                       "do not edit.",
        "type": "object",
        "additionalProperties": False,
        "required": [k for k, v in fmt.ENTRY_FIELDS.items() if v.required],
        "properties": {k: _field(v) for k, v in fmt.ENTRY_FIELDS.items()},
        # a substance needs its structure; a mixture may leave it out
        "if": {"properties": {"type": {"const": "mixture"}}, "required": ["type"]},
        "then": {},
        "else": {"required": ["smiles"]},
    }


def schema_text() -> str:
    return json.dumps(entry_schema(), indent=2, ensure_ascii=False) + "\n"


def write_schema(folder: Path) -> Path:
    """Write ``entry.schema.json`` into ``folder``; returns its path."""
    path = Path(folder) / SCHEMA_FILE
    path.write_text(schema_text(), encoding="utf-8")
    return path


if __name__ == "__main__":  # regenerate the shipped copy
    SHIPPED.write_text(schema_text(), encoding="utf-8")
    print(f"wrote {SHIPPED}", file=sys.stderr)
