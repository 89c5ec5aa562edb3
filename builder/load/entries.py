"""Load and validate every entry into one immutable ``Catalog``.

All problems are collected (never just the first) as ``Diagnostic`` objects with the
file, line and column they concern.  ``load_catalog`` returns the catalog only when
there is no error.

Contents: ``load_catalog``, ``load_entry`` and the small readers they share.
"""
from __future__ import annotations

import difflib
import re
from pathlib import Path

from builder.chem.identity import parse_smiles
from builder.core.diagnostics import Diagnostic, errors
from builder.core.model import (
    PROVENANCE_OF_SOURCE,
    SOURCE_KINDS,
    Antoine,
    Catalog,
    CatalogInfo,
    Entry,
    Location,
    Source,
    frozen_map,
)
from builder.core.units import DIMENSIONS, FRACTION_SCALE, UnitProblem, parse_quantity
from builder.core.values import Provenance, Value
from builder.load import entry_format as fmt
from builder.load.cas import cas_problem
from builder.load.yamlsafe import Document, read_yaml

SPECIAL_FILES = ("sources.yaml", "locations.yaml")


class _Reader:
    """Validates one YAML document, collecting diagnostics."""

    def __init__(self, doc: Document):
        self.doc = doc
        self.problems: list[Diagnostic] = []

    def error(self, keypath, message, hint=None, at_key=False):
        self.problems.append(self.doc.diag(keypath, message, hint, at_key=at_key))

    def mapping(self, data, keypath, allowed, what) -> dict:
        """``data`` as a dict; unknown keys are errors with a did-you-mean hint."""
        if not isinstance(data, dict):
            self.error(keypath, f"{what} must be a mapping of keys to values, got {_typename(data)}")
            return {}
        for key in data:
            if key not in allowed:
                close = difflib.get_close_matches(str(key), allowed, n=1)
                hint = f"did you mean '{close[0]}'?" if close else f"allowed: {', '.join(allowed)}"
                self.error(keypath + (key,), f"unknown field '{key}' in {what}", hint, at_key=True)
        return data

    def text(self, data, keypath, required=False, what=None):
        value = data.get(keypath[-1]) if isinstance(data, dict) else None
        if value is None:
            if required:
                self.error(keypath[:-1], f"missing required field '{keypath[-1]}'" + (f" in {what}" if what else ""))
            return None
        if isinstance(value, bool) or not isinstance(value, (str, int, float)):
            self.error(keypath, f"'{keypath[-1]}' must be text, got {_typename(value)}")
            return None
        if not isinstance(value, str):
            self.error(keypath, f"'{keypath[-1]}' must be text, got the number {value!r}", "put it in quotes")
            return None
        if not value.strip():
            self.error(keypath, f"'{keypath[-1]}' is empty")
            return None
        return value.strip()

    def text_list(self, data, keypath) -> tuple[str, ...]:
        value = data.get(keypath[-1]) if isinstance(data, dict) else None
        if value is None:
            return ()
        if isinstance(value, str):
            value = [value]
        if not isinstance(value, list):
            self.error(keypath, f"'{keypath[-1]}' must be a list of text, got {_typename(value)}")
            return ()
        out = []
        for i, item in enumerate(value):
            if not isinstance(item, str) or not item.strip():
                self.error(keypath + (i,), f"item {i + 1} of '{keypath[-1]}' must be text, got {_typename(item)}")
            else:
                out.append(item.strip())
        return tuple(out)

    def number(self, data, keypath, required=False, what=None):
        value = data.get(keypath[-1]) if isinstance(data, dict) else None
        if value is None:
            if required:
                self.error(keypath[:-1], f"missing required field '{keypath[-1]}'" + (f" in {what}" if what else ""))
            return None
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            hint = "YAML reads 1e3 as text: write 1.0e+3" if isinstance(value, str) and re.match(r"^[-+]?[\d.]+e\d+$", value) else None
            self.error(keypath, f"'{keypath[-1]}' must be a number, got {_typename(value)}", hint)
            return None
        return float(value)

    def quantity(self, value, keypath, dimension, minimum=None, maximum=None, label="value"):
        """SI (value, uncertainty) of a quantity text, or None with a diagnostic."""
        try:
            si, unc = parse_quantity(value, dimension)
        except UnitProblem as exc:
            self.error(keypath, f"{label}: {exc}", exc.hint)
            return None
        if minimum is not None and si <= minimum and dimension == "temperature":
            self.error(keypath, f"{label} {value!r} is at or below absolute zero", "check the sign and the unit")
            return None
        if minimum is not None and si < minimum:
            self.error(keypath, f"{label} {value!r} cannot be negative")
            return None
        if maximum is not None and si > maximum:
            self.error(keypath, f"{label} {value!r} is more than 100 %")
            return None
        return si, unc


def _typename(value) -> str:
    return {dict: "a mapping", list: "a list", str: "text", bool: "true/false", type(None): "nothing"}.get(
        type(value), "a number" if isinstance(value, (int, float)) else type(value).__name__)


# ----------------------------------------------------------------------------- sources, locations

def _keyed_items(r: _Reader, what: str, allowed):
    """(key, key path, mapping) for each well-formed ``key: {...}`` item of a keyed file."""
    doc = r.doc
    data = r.mapping(doc.data if doc.data is not None else {}, (), list(doc.data or {}), f"{what}s file")
    for key, item in data.items():
        kp = (key,)
        if not re.match(fmt.ID_PATTERN, str(key)):
            r.error(kp, f"{what} key '{key}' must use only a-z, 0-9 and '-'", at_key=True)
            continue
        item = r.mapping(item, kp, allowed, f"{what} '{key}'")
        if item:
            yield key, kp, item


def _read_sources(doc: Document) -> tuple[dict[str, Source], list[Diagnostic]]:
    r = _Reader(doc)
    sources = {}
    for key, kp, item in _keyed_items(r, "source", fmt.SOURCE_KEYS):
        title = r.text(item, kp + ("title",), required=True, what=f"source '{key}'")
        kind = r.text(item, kp + ("kind",), required=True, what=f"source '{key}'")
        if kind is not None and kind not in SOURCE_KINDS:
            r.error(kp + ("kind",), f"unknown source kind '{kind}'", f"expected one of {', '.join(SOURCE_KINDS)}")
            kind = None
        year = item.get("year")
        if year is not None and (isinstance(year, bool) or not isinstance(year, int)):
            r.error(kp + ("year",), f"'year' must be a whole number, got {_typename(year)}")
            year = None
        edition = item.get("edition")
        if title and kind:
            sources[key] = Source(key, title, kind, year, None if edition is None else str(edition),
                                  r.text(item, kp + ("authors",)), r.text(item, kp + ("publisher",)),
                                  r.text(item, kp + ("note",)), doc.where(kp, at_key=True)[0])
    return sources, r.problems


def _read_locations(doc: Document) -> tuple[dict[str, Location], list[Diagnostic]]:
    r = _Reader(doc)
    locations = {}
    for key, kp, item in _keyed_items(r, "location", fmt.LOCATION_KEYS):
        name = r.text(item, kp + ("name",), required=True, what=f"location '{key}'")
        tmax = None
        if item.get("max_store_temperature") is not None:
            q = r.quantity(item["max_store_temperature"], kp + ("max_store_temperature",), "temperature", 0.0,
                           label="max_store_temperature")
            if q:
                tmax = Value(q[0], "K", Provenance("rule", method="site-store-rating",
                                                   note=f"rating of store '{key}' in locations.yaml"))
        if name:
            locations[key] = Location(key, name, r.text(item, kp + ("description",)), tmax,
                                      doc.where(kp, at_key=True)[0])
    return locations, r.problems


# ----------------------------------------------------------------------------- entries

def _read_property(r: _Reader, name: str, item, kp, sources) -> Value | None:
    spec = fmt.PROPERTIES[name]
    if isinstance(item, (str, int, float)) and not isinstance(item, bool):
        r.error(kp, f"property '{name}' needs a value and a source", f"write {name}: {{value: '{item}', source: KEY}}")
        return None
    item = r.mapping(item, kp, fmt.PROPERTY_KEYS, f"property '{name}'")
    if not item:
        return None
    if "value" not in item:
        r.error(kp, f"property '{name}' has no 'value'")
        return None
    q = r.quantity(item["value"], kp + ("value",), spec.dimension, spec.minimum, spec.maximum, label=name)
    source = r.text(item, kp + ("source",))
    kind = r.text(item, kp + ("provenance",))
    if kind is not None and kind not in fmt.STATED_KINDS:
        r.error(kp + ("provenance",), f"an entry may state provenance {', '.join(fmt.STATED_KINDS)}, not '{kind}'")
        return None
    if source is None:
        r.error(kp, f"property '{name}' names no source", "add 'source:' with a key of entries/sources.yaml")
        return None
    if source not in sources:
        close = difflib.get_close_matches(source, list(sources), n=1)
        r.error(kp + ("source",), f"unknown source '{source}'",
                f"did you mean '{close[0]}'?" if close else "add it to entries/sources.yaml")
        return None
    kind = kind or PROVENANCE_OF_SOURCE[sources[source].kind]
    conditions = []
    cond = item.get("conditions")
    if cond is not None:
        cond = r.mapping(cond, kp + ("conditions",), list(fmt.CONDITION_KEYS), f"conditions of '{name}'")
        for ckey, dim in fmt.CONDITION_KEYS.items():
            if ckey in cond:
                cq = r.quantity(cond[ckey], kp + ("conditions", ckey), dim, 0.0, label=f"conditions.{ckey}")
                if cq:
                    conditions.append((ckey, cq[0]))
    if spec.needs_temperature and not any(k == "at" for k, _ in conditions):
        r.error(kp, f"'{name}' needs the temperature it was measured at", "add conditions: {at: '20 °C'}")
        return None
    if q is None:
        return None
    method = r.text(item, kp + ("method",))
    note = r.text(item, kp + ("note",))
    unit = spec.unit or DIMENSIONS[spec.dimension].si_unit
    scale = FRACTION_SCALE.get(spec.unit, 1.0)
    return Value(q[0] * scale, unit, Provenance(kind, source=source, method=method, note=note),
                 None if q[1] is None else q[1] * scale, tuple(conditions))


def _read_antoine(r: _Reader, item, kp, sources) -> Antoine | None:
    item = r.mapping(item, kp, fmt.ANTOINE_KEYS, "antoine")
    if not item:
        return None
    coeffs = [r.number(item, kp + (c,), required=True, what="antoine") for c in "ABC"]
    form = r.text(item, kp + ("form",), required=True, what="antoine")
    if form is not None and form not in fmt.ANTOINE_FORMS:
        r.error(kp + ("form",), f"unknown Antoine form '{form}'", "expected log10 or ln")
        form = None
    units = []
    for key, dim in (("pressure_unit", "pressure"), ("temperature_unit", "temperature")):
        unit = r.text(item, kp + (key,), required=True, what="antoine")
        if unit is not None and r.quantity(f"1 {unit}", kp + (key,), dim, label=key) is None:
            unit = None
        units.append(unit)
    if units[1] is not None and units[1] not in ("K", "°C", "degC"):
        r.error(kp + ("temperature_unit",), f"Antoine temperature unit must be K or °C, not '{units[1]}'")
        units[1] = None
    limits = []
    for key in ("t_min", "t_max"):
        if key not in item:
            r.error(kp, f"antoine needs '{key}', the edge of its valid temperature range")
            limits.append(None)
        else:
            q = r.quantity(item[key], kp + (key,), "temperature", 0.0, label=key)
            limits.append(q[0] if q else None)
    if None not in limits and limits[0] >= limits[1]:
        r.error(kp + ("t_max",), "antoine t_max must be above t_min")
        return None
    source = r.text(item, kp + ("source",))
    if source is None:
        r.error(kp, "antoine names no source", "add 'source:' with a key of entries/sources.yaml")
        return None
    if source not in sources:
        r.error(kp + ("source",), f"unknown source '{source}'", "add it to entries/sources.yaml")
        return None
    kind = r.text(item, kp + ("provenance",)) or PROVENANCE_OF_SOURCE[sources[source].kind]
    if kind not in fmt.STATED_KINDS:
        r.error(kp + ("provenance",), f"an entry may state provenance {', '.join(fmt.STATED_KINDS)}, not '{kind}'")
        return None
    if None in coeffs or None in units or None in limits or form is None:
        return None
    return Antoine(*coeffs, form, units[0], "°C" if units[1] == "degC" else units[1], limits[0], limits[1],
                   source, kind, r.text(item, kp + ("note",)))


def load_entry(path: str, text: str, sources: dict, locations: dict) -> tuple[Entry | None, list[Diagnostic]]:
    """Validate one entry file; return the entry when it has no error."""
    entry_id = Path(path).stem
    doc, problems = read_yaml(path, text)
    if doc is None:
        return None, problems
    r = _Reader(doc)
    r.problems.extend(problems)
    if not re.match(fmt.ID_PATTERN, entry_id):
        r.error((), f"file name '{entry_id}' is not a valid entry id",
                "use lower-case a-z, 0-9 and '-' only, e.g. 'ethyl-acetate.yaml'")
    if doc.data is None:
        r.error((), "entry is empty", "an entry needs at least 'name' and 'smiles'")
        return None, r.problems
    data = r.mapping(doc.data, (), fmt.ENTRY_KEYS, "an entry")
    if not data:
        return None, r.problems
    name = r.text(data, ("name",), required=True)
    etype = r.text(data, ("type",)) or "substance"
    if etype not in fmt.ENTRY_TYPES:
        r.error(("type",), f"unknown type '{etype}'", f"expected one of {', '.join(fmt.ENTRY_TYPES)}")
    smiles = r.text(data, ("smiles",), required=(etype == "substance"))
    if smiles is not None:
        _, reason = parse_smiles(smiles)
        if reason:
            r.error(("smiles",), f"SMILES {smiles!r} does not parse", f"RDKit: {reason}")
    cas = r.text(data, ("cas",))
    if cas is not None and (problem := cas_problem(cas)):
        r.error(("cas",), problem)
    formula = r.text(data, ("formula",))
    if formula is not None and not re.match(fmt.FORMULA_PATTERN, formula):
        r.error(("formula",), f"{formula!r} is not a molecular formula", "e.g. C2H6O")
    molar_mass = None
    if data.get("molar_mass") is not None:
        q = r.quantity(data["molar_mass"], ("molar_mass",), "molar_mass", 0.0, label="molar_mass")
        if q is not None:
            if q[0] <= 0:
                r.error(("molar_mass",), "molar_mass must be above zero")
            else:
                molar_mass = q[0]
    hazards = r.text_list(data, ("hazard_statements",))
    for i, code in enumerate(hazards):
        if not re.match(fmt.HAZARD_PATTERN, code):
            r.error(("hazard_statements", i), f"'{code}' is not a GHS hazard statement code", "e.g. H225")
    catalog = _read_catalog(r, data.get("catalog"), locations)
    properties = {}
    props = data.get("properties")
    antoine = None
    if props is not None:
        allowed = list(fmt.PROPERTIES) + ["antoine"]
        props = r.mapping(props, ("properties",), allowed, "properties")
        for pname, item in props.items():
            kp = ("properties", pname)
            if pname == "antoine":
                antoine = _read_antoine(r, item, kp, sources)
            elif pname in fmt.PROPERTIES:
                value = _read_property(r, pname, item, kp, sources)
                if value is not None:
                    properties[pname] = value
    lines = {".".join(map(str, k)): v for k, v in doc.positions.items() if k}
    if errors(r.problems):
        return None, r.problems
    entry = Entry(entry_id, path, name, etype, r.text_list(data, ("synonyms",)), cas, smiles, hazards,
                  r.text(data, ("notes",)), catalog, frozen_map(_in_format_order(properties)), antoine,
                  frozen_map(lines), declared_formula=formula, declared_molar_mass=molar_mass)
    return entry, r.problems


def _in_format_order(properties: dict) -> list:
    order = list(fmt.PROPERTIES)
    return sorted(properties.items(), key=lambda item: order.index(item[0]))


def _read_catalog(r: _Reader, data, locations) -> CatalogInfo:
    if data is None:
        return CatalogInfo()
    data = r.mapping(data, ("catalog",), fmt.CATALOG_KEYS, "catalog")
    locs = r.text_list(data, ("catalog", "locations"))
    for i, loc in enumerate(locs):
        if loc not in locations:
            close = difflib.get_close_matches(loc, list(locations), n=1)
            r.error(("catalog", "locations", i), f"unknown location '{loc}'",
                    f"did you mean '{close[0]}'?" if close else "add it to entries/locations.yaml")
    temps = {}
    for key, method in (("max_store_temperature", "site-store-rating"), ("process_temperature", "site-process")):
        if data.get(key) is not None:
            q = r.quantity(data[key], ("catalog", key), "temperature", 0.0, label=key)
            if q:
                temps[key] = Value(q[0], "K", Provenance("rule", method=method, note="stated in the entry"))
    return CatalogInfo(code=r.text(data, ("catalog", "code")), locations=locs,
                       max_store_temperature=temps.get("max_store_temperature"),
                       process_temperature=temps.get("process_temperature"),
                       container=r.text(data, ("catalog", "container")), owner=r.text(data, ("catalog", "owner")))


def _read_file(path: Path, shown: str) -> tuple[str | None, list[Diagnostic]]:
    try:
        return path.read_text(encoding="utf-8"), []
    except UnicodeDecodeError as exc:
        return None, [Diagnostic(shown, 1, 1, "error", f"file is not UTF-8 text ({exc.reason})")]
    except OSError as exc:
        return None, [Diagnostic(shown, 1, 1, "error", f"cannot read file: {exc.strerror}")]


def _read_special(entries_dir: Path, name: str, reader, shown_root: str):
    path = entries_dir / name
    shown = f"{shown_root}/{name}"
    if not path.exists():
        return {}, [Diagnostic(shown, 1, 1, "error", f"missing {name}",
                               "the entries folder needs sources.yaml and locations.yaml")]
    text, problems = _read_file(path, shown)
    if text is None:
        return {}, problems
    doc, problems = read_yaml(shown, text)
    if doc is None:
        return {}, problems
    items, more = reader(doc)
    return items, problems + more


def shown_path(path: Path) -> str:
    """Path as printed in diagnostics: relative to the working folder when possible."""
    try:
        return str(path.resolve().relative_to(Path.cwd().resolve()))
    except ValueError:
        return str(path)


def entry_files(entries_dir: Path) -> list[Path]:
    return sorted(p for p in entries_dir.glob("*.y*ml") if p.name not in SPECIAL_FILES)


def read_bibliography(entries_dir: Path, root: str) -> tuple[dict, dict, list[Diagnostic]]:
    """sources.yaml and locations.yaml of ``entries_dir`` (shown as ``root/...``), with their problems."""
    sources, diagnostics = _read_special(entries_dir, "sources.yaml", _read_sources, root)
    locations, more = _read_special(entries_dir, "locations.yaml", _read_locations, root)
    return sources, locations, diagnostics + more


def read_entries(files, sources: dict, locations: dict, shown=shown_path
                 ) -> tuple[dict[str, Entry], list[Diagnostic], set[str]]:
    """Load each entry file: the entries that load (by id), every diagnostic, and the ids that did not."""
    entries: dict[str, Entry] = {}
    diagnostics: list[Diagnostic] = []
    failed: set[str] = set()
    seen_at: dict[str, str] = {}
    for path in files:
        where = shown(path)
        if path.suffix != ".yaml":
            diagnostics.append(Diagnostic(where, 1, 1, "error", "entry files must end in .yaml"))
            continue
        if path.stem in seen_at:
            diagnostics.append(Diagnostic(where, 1, 1, "error", f"duplicate entry id '{path.stem}'",
                                          f"also in {seen_at[path.stem]}"))
            continue
        seen_at[path.stem] = where
        text, probs = _read_file(path, where)
        entry = None
        if text is not None:
            entry, probs = load_entry(where, text, sources, locations)
        diagnostics += probs
        if entry is None:
            failed.add(path.stem)
        else:
            entries[entry.id] = entry
    return entries, diagnostics, failed


def load_catalog(entries_dir: Path, only: list[Path] | None = None) -> tuple[Catalog | None, list[Diagnostic]]:
    """Read ``entries_dir`` (or just the files ``only``) and validate everything.

    Returns ``(catalog, diagnostics)``; ``catalog`` is None when any diagnostic is an error.
    """
    entries_dir = Path(entries_dir)
    root = shown_path(entries_dir)
    if not entries_dir.is_dir():
        return None, [Diagnostic(root, 1, 1, "error", "entries folder not found")]
    sources, locations, diagnostics = read_bibliography(entries_dir, root)
    files = sorted(Path(p) for p in only) if only else entry_files(entries_dir)
    entries, more, _ = read_entries(files, sources, locations)
    diagnostics = sorted(diagnostics + more, key=lambda d: (d.path, d.line, d.col, d.message))
    if errors(diagnostics):
        return None, diagnostics
    catalog = Catalog(tuple(entries[k] for k in sorted(entries)), frozen_map(sorted(sources.items())),
                      frozen_map(sorted(locations.items())), root)
    return catalog, diagnostics
