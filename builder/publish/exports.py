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
from builder.core.quantities import DERIVED_QUANTITIES, DerivedQuantity
from builder.core.units import to_display
from builder.derive.entry import Derived
from builder.derive.serialize import entry_json
from builder.publish.textsafe import (
    BIDI_CONTROLS,
    csv_text_cell,
    short_path,
    visible_data,
)

FORMAT = "cohesion-catalog"
FORMAT_VERSION = 1


#: how ``json.dumps(..., ensure_ascii=True)`` writes each bidirectional control character
_BIDI_ESCAPES = tuple(f"\\u{ord(c):04x}" for c in BIDI_CONTROLS)


def safe_json(data, indent: int | None = None) -> str:
    """JSON that is safe inside HTML and script files (no raw <, > or &; bidi controls made visible)."""
    text = json.dumps(data, ensure_ascii=True, sort_keys=True, indent=indent)
    if any(escape in text for escape in _BIDI_ESCAPES):  # some string holds one (or the text of its escape)
        text = json.dumps(visible_data(data), ensure_ascii=True, sort_keys=True, indent=indent)
    return text.replace("<", "\\u003c").replace(">", "\\u003e").replace("&", "\\u0026")


def entry_part(d: Derived, links) -> str:
    """One entry's JSON text (``entry_json``, safe, sorted keys, indent 1) at nesting depth 0.

    ``catalog.json`` and ``data/<id>.json`` are put together from these parts, so an entry
    that did not change is not serialised again (the parts are cached by the build).
    """
    return safe_json(entry_json(d, links), indent=1)


def _at_depth(part: str, depth: int) -> str:
    """JSON text made with indent 1 at depth 0, as it stands nested ``depth`` levels deep."""
    pad = " " * depth
    return pad + part.replace("\n", "\n" + pad)


def _head() -> str:
    return f'{{\n "builder_version": {json.dumps(__version__)},\n'


def _tail() -> str:
    return f' "format": {json.dumps(FORMAT)},\n "format_version": {FORMAT_VERSION}\n}}\n'


def catalog_piece(part: str) -> str:
    """An entry's ``entry_part`` as it stands in ``catalog.json`` (two levels deep): the piece kept
    between builds, so that putting the file together again is one join."""
    return _at_depth(part, 2)


def catalog_json_from_pieces(pieces: list[str]) -> str:
    """``catalog.json`` from each entry's ``catalog_piece``: the same bytes as ``catalog_json``."""
    entries = ' "entries": []' if not pieces else ' "entries": [\n' + ",\n".join(pieces) + "\n ]"
    return _head() + entries + ",\n" + _tail()


def entry_file_json_from_part(part: str) -> str:
    """``data/<id>.json`` from the entry's ``entry_part``: the same bytes as ``entry_file_json``."""
    return _head() + ' "entry": ' + _at_depth(part, 1).lstrip(" ") + ",\n" + _tail()


def catalog_json(derived: tuple[Derived, ...], links: dict) -> str:
    data = {"format": FORMAT, "format_version": FORMAT_VERSION, "builder_version": __version__,
            "entries": [entry_json(d, links.get(d.entry.id, ())) for d in derived]}
    return safe_json(data, indent=1) + "\n"


def entry_file_json(d: Derived, links) -> str:
    data = {"format": FORMAT, "format_version": FORMAT_VERSION, "builder_version": __version__,
            "entry": entry_json(d, links)}
    return safe_json(data, indent=1) + "\n"


#: CSV columns: (header with its fixed unit, function of a Derived)
def _value(q: DerivedQuantity):
    def get(d: Derived):
        v = d.get(q.key)
        return "" if v is None else f"{to_display(v.value, v.unit, q.csv.unit):.{q.csv.digits}f}"
    get.numeric = True  # a number column: never given the text-cell apostrophe
    return get


def _kind(q: DerivedQuantity):
    def get(d: Derived):
        v = d.get(q.key)
        return "" if v is None else v.kind
    return get


def _label(q: DerivedQuantity):
    def get(d: Derived):
        lab = d.label(q.key)
        if lab is None:
            return ""
        if q.csv.words:
            return lab.text
        return "" if lab.code is None else str(lab.code)
    return get


def _quantity_columns() -> list:
    """The columns of every quantity with a ``csv`` column in builder/core/quantities.py, in its order."""
    out = []
    for q in DERIVED_QUANTITIES.values():
        if q.csv is None:
            continue
        out.append((q.csv.name, _label(q) if q.is_label else _value(q)))
        if q.csv.provenance:
            out.append((q.csv.provenance, _kind(q)))
    return out


def csv_columns() -> list:
    """Identity columns, then the registry's quantity columns, then the stores (read at each call)."""
    return [
        ("id", lambda d: d.entry.id),
        ("name", lambda d: d.entry.name),
        ("code", lambda d: d.entry.catalog.code or ""),
        ("cas", lambda d: d.entry.cas or ""),
        ("formula", lambda d: d.identity.formula if d.identity else ""),
        ("inchikey", lambda d: d.identity.inchikey if d.identity else ""),
        *_quantity_columns(),
        ("locations", lambda d: " ".join(d.entry.catalog.locations)),
    ]


def catalog_csv(derived: tuple[Derived, ...], pieces=None, entry_keys: dict | None = None) -> str:
    """One row a material. With ``pieces`` (``builder.publish.pieces.Pieces``) and the derive keys
    by id, a row whose entry is unchanged is taken from the last build instead of written again."""
    columns = csv_columns()
    header = _csv_line([name for name, _ in columns])

    def row(d: Derived) -> str:
        return _csv_line([get(d) if getattr(get, "numeric", False) else csv_text_cell(get(d)) for _, get in columns])

    if pieces is None or entry_keys is None:
        return header + "".join(row(d) for d in derived)
    return header + "".join(pieces.get(("csv", header, entry_keys[d.entry.id]), lambda d=d: row(d)) for d in derived)


def _csv_line(cells: list) -> str:
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerow(cells)
    return buf.getvalue()


def search_index_js(derived: tuple[Derived, ...]) -> str:
    """A classic script setting ``window.COHESION_INDEX`` (works under file://, unlike fetch)."""
    items = []
    for d in derived:
        e = d.entry
        items.append({"id": e.id, "name": e.name, "synonyms": list(e.synonyms), "code": e.catalog.code or "",
                      "cas": e.cas or "", "formula": d.identity.formula if d.identity else "",
                      "inchikey": d.identity.inchikey if d.identity else "",
                      "url": short_path(f"materials/{e.id}.html")})
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
