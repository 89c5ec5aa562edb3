"""Data exports written beside the pages: catalog.json, catalog.csv, one JSON file per entry,
the search index script, and the JSON-LD block of each datasheet.

All JSON is written with sorted keys and ``ensure_ascii``; JSON that ends up inside a
page or a script has ``<``, ``>`` and ``&`` escaped so entry text can never close a
``<script>`` element.
"""
from __future__ import annotations

import csv
import io
import json

from builder import __version__
from builder.derive.entry import Derived
from builder.derive.serialize import entry_json

FORMAT = "cohesion-catalog"
FORMAT_VERSION = 1


def safe_json(data, indent: int | None = None) -> str:
    """JSON that is safe inside HTML and script files (no raw <, > or &)."""
    text = json.dumps(data, ensure_ascii=True, sort_keys=True, indent=indent)
    return text.replace("<", "\\u003c").replace(">", "\\u003e").replace("&", "\\u0026")


def catalog_json(derived: tuple[Derived, ...], links: dict) -> str:
    data = {"format": FORMAT, "format_version": FORMAT_VERSION, "builder_version": __version__,
            "entries": [entry_json(d, links.get(d.entry.id, ())) for d in derived]}
    return safe_json(data, indent=1) + "\n"


def entry_file_json(d: Derived, links) -> str:
    data = {"format": FORMAT, "format_version": FORMAT_VERSION, "builder_version": __version__,
            "entry": entry_json(d, links)}
    return safe_json(data, indent=1) + "\n"


#: CSV columns: (header with its fixed unit, function of a Derived)
def _value(name, scale=1.0, offset=0.0, digits=2):
    def get(d: Derived):
        v = d.get(name)
        return "" if v is None else f"{v.value * scale + offset:.{digits}f}"
    return get


def _kind(name):
    def get(d: Derived):
        v = d.get(name)
        return "" if v is None else v.kind
    return get


def _label(name, code=True):
    def get(d: Derived):
        lab = d.label(name)
        if lab is None:
            return ""
        return "" if (code and lab.code is None) else str(lab.code if code else lab.text)
    return get


CSV_COLUMNS = [
    ("id", lambda d: d.entry.id),
    ("name", lambda d: d.entry.name),
    ("code", lambda d: d.entry.catalog.code or ""),
    ("cas", lambda d: d.entry.cas or ""),
    ("formula", lambda d: d.identity.formula if d.identity else ""),
    ("inchikey", lambda d: d.identity.inchikey if d.identity else ""),
    ("molar_mass_g_per_mol", _value("molar_mass", digits=3)),
    ("dominant_force", _label("dominant_force")),
    ("boiling_point_degC", _value("boiling_point", offset=-273.15, digits=1)),
    ("boiling_point_provenance", _kind("boiling_point")),
    ("flash_point_degC", _value("flash_point", offset=-273.15, digits=1)),
    ("flash_point_provenance", _kind("flash_point")),
    ("flammable_category_ghs", _label("flammable_category")),
    ("flammable_category_possible", lambda d: d.label("flammable_category_range").text
     if d.label("flammable_category_range") else ""),
    ("vapor_pressure_25degC_kPa", _value("vapor_pressure_25C", scale=1e-3, digits=4)),
    ("vapor_pressure_25degC_provenance", _kind("vapor_pressure_25C")),
    ("density_g_per_cm3", _value("density", scale=1e-3, digits=4)),
    ("volatility_band_20degC", _label("volatility_band")),
    ("locations", lambda d: " ".join(d.entry.catalog.locations)),
]


def catalog_csv(derived: tuple[Derived, ...]) -> str:
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    writer.writerow([name for name, _ in CSV_COLUMNS])
    for d in derived:
        writer.writerow([get(d) for _, get in CSV_COLUMNS])
    return buf.getvalue()


def search_index_js(derived: tuple[Derived, ...]) -> str:
    """A classic script setting ``window.COHESION_INDEX`` (works under file://, unlike fetch)."""
    items = []
    for d in derived:
        e = d.entry
        items.append({"id": e.id, "name": e.name, "synonyms": list(e.synonyms), "code": e.catalog.code or "",
                      "cas": e.cas or "", "formula": d.identity.formula if d.identity else "",
                      "inchikey": d.identity.inchikey if d.identity else "",
                      "url": f"materials/{e.id}.html"})
    return "window.COHESION_INDEX = " + safe_json(items) + ";\n"


def json_ld(d: Derived) -> str:
    """schema.org MolecularEntity (with ChemicalSubstance for the material) for a datasheet's head."""
    e = d.entry
    substance = {"@type": "ChemicalSubstance", "name": e.name}
    if e.synonyms:
        substance["alternateName"] = list(e.synonyms)
    if e.cas:
        substance["identifier"] = {"@type": "PropertyValue", "propertyID": "CAS RN", "value": e.cas}
    if d.identity is not None:
        mm = d.get("molar_mass")
        substance["hasBioChemEntityPart"] = {
            "@type": "MolecularEntity", "name": e.name, "smiles": d.identity.smiles, "inChI": d.identity.inchi,
            "inChIKey": d.identity.inchikey, "molecularFormula": d.identity.formula,
            "molecularWeight": {"@type": "QuantitativeValue", "value": round(mm.value, 3), "unitText": "g/mol"},
        }
    substance["@context"] = "https://schema.org"
    return safe_json(substance)
