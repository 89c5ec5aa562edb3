"""Entry format v1: which fields an entry, a source and a location may hold.

This table is the single description of the format: the loader validates against
it, the README documents it and the JSON Schema (``schema.py``) is generated from it.
"""
from __future__ import annotations

from dataclasses import dataclass

from builder.core.quantities import STATED_PROPERTIES, PropertySpec  # noqa: F401  (re-exported)

FORMAT_VERSION = 1


PROPERTIES = STATED_PROPERTIES  # the stated properties an entry may hold (builder.core.quantities)

PROPERTY_KEYS = ("value", "source", "provenance", "conditions", "method", "note")
CONDITION_KEYS = {"at": "temperature", "pressure": "pressure"}
ANTOINE_KEYS = ("form", "A", "B", "C", "pressure_unit", "temperature_unit", "t_min", "t_max",
                "source", "provenance", "note")
ANTOINE_FORMS = ("log10", "ln")

ENTRY_TYPES = ("substance", "mixture")


@dataclass(frozen=True)
class FieldSpec:
    """A top-level or ``catalog`` field of an entry: what it holds and a line of help.

    ``kind`` is one of: text, choice (one of ``choices``), text_list, cas, smiles, formula,
    hazard_list, source (a key of sources.yaml), quantity (of ``dimension``), location_list, catalog, properties.
    """

    kind: str
    help: str
    required: bool = False
    choices: tuple[str, ...] = ()
    dimension: str | None = None


ENTRY_FIELDS: dict[str, FieldSpec] = {
    "name": FieldSpec("text", "the name the site uses for the material", required=True),
    "type": FieldSpec("choice", "substance (one structure, the default) or mixture", choices=ENTRY_TYPES),
    "synonyms": FieldSpec("text_list", "other names, searched and shown on the datasheet"),
    "cas": FieldSpec("cas", "CAS Registry Number, e.g. 64-17-5 (check digit validated)"),
    "smiles": FieldSpec("smiles", "structure as SMILES; required for a substance"),
    "formula": FieldSpec("formula", "declared molecular formula (Hill order, e.g. C2H6O); "
                                    "cohesion check compares it with the SMILES"),
    "molar_mass": FieldSpec("quantity", "declared molar mass, e.g. 46.07 g/mol; cohesion check compares it "
                                        "with the SMILES", dimension="molar_mass"),
    "hazard_statements": FieldSpec("hazard_list", "GHS hazard statement codes, e.g. [H225, H319]"),
    "hazard_source": FieldSpec("source", "the key of entries/sources.yaml the hazard statements come from"),
    "notes": FieldSpec("text", "free text shown on the datasheet"),
    "catalog": FieldSpec("catalog", "site-specific facts: code, locations, storage limits, owner"),
    "properties": FieldSpec("properties", "stated property values, each with its source"),
    "composition": FieldSpec("composition", "a mixture's components: each an entry id ('component') or a "
                                            "structure ('smiles' and 'name'), with a 'fraction' such as "
                                            "'40 % w/w', '10-20 % v/v', '0.5 mol/mol' or 'balance'"),
}
ENTRY_KEYS = tuple(ENTRY_FIELDS)

CATALOG_FIELDS: dict[str, FieldSpec] = {
    "code": FieldSpec("text", "the site's catalog code"),
    "locations": FieldSpec("location_list", "keys of entries/locations.yaml where the material is kept"),
    "max_store_temperature": FieldSpec("quantity", "warmest allowed storage temperature; overrides the store's "
                                                   "rating", dimension="temperature"),
    "process_temperature": FieldSpec("quantity", "temperature the material is used at", dimension="temperature"),
    "container": FieldSpec("text", "container type and size"),
    "owner": FieldSpec("text", "team responsible for the material"),
}
CATALOG_KEYS = tuple(CATALOG_FIELDS)

#: one line of help for each key of a stated property and of ``antoine`` (editor hover text)
PROPERTY_HELP = {
    "value": "<number> [± <uncertainty>] <unit>",
    "source": "a key of entries/sources.yaml",
    "provenance": "measured, literature or supplier (default from the source's kind)",
    "conditions": "at: the temperature, pressure: the pressure the value holds for",
    "method": "how the value was measured, e.g. closed cup",
    "note": "free text",
}
ANTOINE_HELP = {
    "form": "log10 or ln: form(P / pressure_unit) = A − B / (T / temperature_unit + C)",
    "A": "coefficient A", "B": "coefficient B", "C": "coefficient C",
    "pressure_unit": "unit of P in the equation, e.g. Pa, kPa, mmHg",
    "temperature_unit": "unit of T in the equation: K or °C",
    "t_min": "lower edge of the valid temperature range", "t_max": "upper edge of the valid temperature range",
    "source": "a key of entries/sources.yaml", "provenance": "measured, literature or supplier",
    "note": "free text",
}
HANSEN_KEYS = ("delta_d", "delta_p", "delta_h", "source", "provenance", "note")
SPHERE_KEYS = ("delta_d", "delta_p", "delta_h", "radius", "source", "provenance", "note")
HANSEN_HELP = {
    "delta_d": "dispersion parameter δD in MPa½ (a number)",
    "delta_p": "polar parameter δP in MPa½ (a number)",
    "delta_h": "hydrogen-bonding parameter δH in MPa½ (a number)",
    "radius": "interaction radius R0 of the solubility sphere in MPa½ (a number)",
    "source": "a key of entries/sources.yaml", "provenance": "measured, literature or supplier", "note": "free text",
}
#: the largest Hansen parameter or sphere radius the loader accepts (MPa½): water's δH, about 42, is the
#: largest of the common solvents; anything far above is a typing error
HANSEN_MAX = 60.0
SOURCE_KEYS = ("title", "kind", "year", "edition", "authors", "publisher", "note")
LOCATION_KEYS = ("name", "description", "max_store_temperature", "allowed_groups", "max_flammable_liquid_volume")
#: provenance kinds an entry may state for a value it gives
STATED_KINDS = ("measured", "literature", "supplier")

ID_PATTERN = r"^[a-z0-9]+(?:-[a-z0-9]+)*$"
HAZARD_PATTERN = r"^(?:EU)?H\d{3}[A-Za-z]{0,2}(?:\+H\d{3}[A-Za-z]{0,2})*$"
CAS_PATTERN = r"^\d{2,7}-\d{2}-\d$"
#: a molecular formula: element symbols with counts, optionally a charge (C2H6O, C7H8, C2H3O2-)
FORMULA_PATTERN = r"^(?:[A-Z][a-z]?\d*)+(?:[+-]\d*)?$"

#: longest entry id, source key and location key (ids become file names of the site)
MAX_ID_LENGTH = 64
#: names an entry id or a location key may not take: the site's own pages and folders
#: (builder/publish/site.py: index.html, cards/all.html, …; a test keeps this list complete)
#: and the names Windows reserves for devices, so a copied site opens everywhere
SITE_NAMES = ("index", "forces", "stores", "categories", "trends", "solvency", "sources", "methods", "build", "all",
              "assets", "charts", "cards", "materials", "data", "catalog", "search-index")
DEVICE_NAMES = ("con", "prn", "aux", "nul") + tuple(f"com{i}" for i in range(10)) + tuple(f"lpt{i}" for i in range(10))
RESERVED_NAMES = SITE_NAMES + DEVICE_NAMES
#: an entry id ending in this names the vapor-pressure chart of the entry without it
#: (materials/<id>-vapor.svg), so ``x-vapor`` is refused when an entry ``x`` exists
CHART_SUFFIX = "-vapor"
#: SMILES wildcard atom: a structure with one is not a substance
SMILES_WILDCARD = "*"
