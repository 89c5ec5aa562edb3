"""Load and validate every entry into one immutable ``Catalog``.

All problems are collected (never just the first) as ``Diagnostic`` objects with the
file, line and column they concern.  ``load_catalog`` returns the catalog only when
there is no error.

Contents: ``load_catalog``, ``load_entry`` and the small readers they share.
"""
from __future__ import annotations

import difflib
import math
import os
import re
import stat
from pathlib import Path

from builder.chem.identity import parse_smiles
from builder.chem.storage import default_table
from builder.core.cache import code_version, collector_paused, key_of, settings_key
from builder.core.diagnostics import Diagnostic, errors
from builder.core.model import (
    PROVENANCE_OF_SOURCE,
    SOURCE_KINDS,
    Antoine,
    Catalog,
    CatalogInfo,
    Entry,
    HansenSet,
    Location,
    Source,
    frozen_map,
)
from builder.core.quantities import PHYSICAL_RANGES, STORE_TEMPERATURE, PhysicalRange
from builder.core.units import (
    DIMENSIONS,
    FRACTION_SCALE,
    ZERO_CELSIUS_K,
    UnitProblem,
    parse_quantity,
)
from builder.core.values import Provenance, Value
from builder.load import entry_format as fmt
from builder.load.cas import cas_problem
from builder.load.composition import composition_problems, read_composition
from builder.load.yamlsafe import MAX_BYTES, Document, line_col, read_yaml

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
            if not isinstance(key, str):
                continue  # read_yaml reported it where it stands
            if key not in allowed:
                close = difflib.get_close_matches(str(key), allowed, n=1)
                hint = f"did you mean '{close[0]}'?" if close else f"allowed: {', '.join(allowed)}"
                self.error(keypath + (key,), f"unknown field '{key}' in {what}", hint, at_key=True)
        return data

    def text(self, data, keypath, required=False, what=None):
        value = data.get(keypath[-1]) if isinstance(data, dict) else None
        if value is None:
            if required:
                self.error(keypath[:-1], f"missing required field '{keypath[-1]}'" + (f" in {what}" if what else ""),
                           at_key=True)
            return None
        if isinstance(value, bool) or not isinstance(value, (str, int, float)):
            self.error(keypath, f"'{keypath[-1]}' must be text, got {_typename(value)}")
            return None
        if not isinstance(value, str):
            self.error(keypath, f"'{keypath[-1]}' must be text, got the number {_brief(value)}", "put it in quotes")
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
                self.error(keypath[:-1], f"missing required field '{keypath[-1]}'" + (f" in {what}" if what else ""),
                           at_key=True)
            return None
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            hint = "YAML reads 1e3 as text: write 1.0e+3" if isinstance(value, str) and re.match(r"^[-+]?[\d.]+e\d+$", value) else None
            self.error(keypath, f"'{keypath[-1]}' must be a number, got {_typename(value)}", hint)
            return None
        try:
            number = float(value)
        except OverflowError:
            number = math.inf
        if not math.isfinite(number):
            self.error(keypath, f"'{keypath[-1]}' must be a finite number, got {_brief(value)}")
            return None
        return number

    def quantity(self, value, keypath, dimension, minimum=None, maximum=None, label="value", possible=None):
        """SI (value, uncertainty) of a quantity text, or None with a diagnostic.

        Besides ``minimum`` and ``maximum``, the value must lie in the physically possible
        range: ``possible`` (SI low, high) or else the dimension's ``PHYSICAL_RANGES``.
        """
        try:
            si, unc = parse_quantity(value, dimension)
        except UnitProblem as exc:
            self.error(keypath, f"{label}: {exc}", exc.hint)
            return None
        shown = _brief(value)
        if dimension == "temperature" and si <= 0.0:
            self.error(keypath, f"{label} {shown} is at or below absolute zero", "check the sign and the unit")
            return None
        if minimum is not None and si < minimum:
            self.error(keypath, f"{label} {shown} cannot be negative" if minimum == 0.0
                       else f"{label} {shown} is below {minimum:g}, which is impossible")
            return None
        if maximum is not None and si > maximum:
            self.error(keypath, f"{label} {shown} is more than 100 %" if dimension == "fraction"
                       else f"{label} {shown} is above {maximum:g}, which is impossible")
            return None
        limits = (possible if isinstance(possible, PhysicalRange)
                  else PhysicalRange(possible[0], possible[1], f"{possible[0]:g} … {possible[1]:g}") if possible
                  else PHYSICAL_RANGES.get(dimension))
        if limits is not None:
            if not limits.low <= si <= limits.high:
                self.error(keypath, f"{label} {shown} is physically impossible (possible: {limits.shown})",
                           "check the exponent and the unit")
                return None
            if unc is not None and unc > limits.high - limits.low:
                self.error(keypath, f"the uncertainty of {label} {shown} is wider than every possible value "
                           f"({limits.shown})", "check the exponent and the unit")
                return None
        return si, unc


def _brief(value) -> str:
    """``repr`` of a value for a message, cut to a readable length."""
    text = repr(value) if not isinstance(value, int) or abs(value) < 10 ** 40 else f"a {len(str(abs(value)))}-digit number"
    return text if len(text) <= 42 else text[:40] + "…" + text[-1]


def _typename(value) -> str:
    return {dict: "a mapping", list: "a list", str: "text", bool: "true/false", type(None): "nothing"}.get(
        type(value), "a number" if isinstance(value, (int, float)) else type(value).__name__)


# ----------------------------------------------------------------------------- sources, locations

def id_problem(key: str, what: str, reserved: tuple[str, ...] = ()) -> tuple[str, str] | None:
    """(message, hint) when ``key`` cannot be the id of an entry, a source or a location."""
    if len(key) > fmt.MAX_ID_LENGTH:
        return (f"{what} '{key[:20]}…' is {len(key)} characters long, more than {fmt.MAX_ID_LENGTH}",
                "use a shorter id; it becomes a file name of the site")
    if not re.match(fmt.ID_PATTERN, key):
        return (f"{what} '{_brief(key)[1:-1]}' must use only a-z, 0-9 and '-'",
                "use lower-case a-z, 0-9 and '-' only, e.g. 'ethyl-acetate'")
    if key in reserved:
        return (f"{what} '{key}' is reserved: the site has a page or folder of that name",
                f"choose another name, e.g. '{key}-1'; reserved: {', '.join(fmt.SITE_NAMES)} and device "
                "names such as con, nul")
    return None


def _keyed_items(r: _Reader, what: str, allowed, reserved=()):
    """(key, key path, mapping) for each well-formed ``key: {...}`` item of a keyed file."""
    doc = r.doc
    data = {} if doc.data is None else doc.data
    if not isinstance(data, dict):
        r.error((), f"the {what}s file must be a mapping of {what} keys to {what}s, got {_typename(data)}",
                f"write one '<key>:' line per {what}, each with its fields indented below")
        return
    for key, item in data.items():
        if not isinstance(key, str):
            continue  # read_yaml reported it
        kp = (key,)
        if problem := id_problem(key, f"{what} key", reserved):
            r.error(kp, problem[0], problem[1], at_key=True)
            continue
        if isinstance(item, dict) and not item:
            r.error(kp, f"{what} '{key}' is empty", "give its fields or remove it")
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
        elif year is not None and not 1000 <= year <= 2999:
            r.error(kp + ("year",), f"'year' {_brief(year)} is not a four-digit year")
            year = None
        edition = item.get("edition")
        if edition is not None and (isinstance(edition, bool) or not isinstance(edition, (str, int))):
            r.error(kp + ("edition",), f"'edition' must be text or a whole number, got {_typename(edition)}")
            edition = None
        if title and kind:
            sources[key] = Source(key, title, kind, year, None if edition is None else str(edition),
                                  r.text(item, kp + ("authors",)), r.text(item, kp + ("publisher",)),
                                  r.text(item, kp + ("note",)), doc.where(kp, at_key=True)[0])
    return sources, r.problems


def _read_locations(doc: Document) -> tuple[dict[str, Location], list[Diagnostic]]:
    r = _Reader(doc)
    locations = {}
    for key, kp, item in _keyed_items(r, "location", fmt.LOCATION_KEYS, fmt.RESERVED_NAMES):
        name = r.text(item, kp + ("name",), required=True, what=f"location '{key}'")
        tmax = None
        if item.get("max_store_temperature") is not None:
            q = r.quantity(item["max_store_temperature"], kp + ("max_store_temperature",), "temperature", 0.0,
                           label="max_store_temperature", possible=STORE_TEMPERATURE)
            if q:
                tmax = Value(q[0], "K", Provenance("rule", method="site-store-rating",
                                                   note=f"rating of store '{key}' in locations.yaml"))
        groups = r.text_list(item, kp + ("allowed_groups",))
        known = default_table().group_ids
        for i, group in enumerate(groups):
            if group not in known:
                close = difflib.get_close_matches(group, list(known), n=1)
                r.error(kp + ("allowed_groups", i), f"unknown storage group '{group}'",
                        f"did you mean '{close[0]}'?" if close else f"one of: {', '.join(known)}")
        vmax = None
        if item.get("max_flammable_liquid_volume") is not None:
            q = r.quantity(item["max_flammable_liquid_volume"], kp + ("max_flammable_liquid_volume",), "volume",
                           0.0, label="max_flammable_liquid_volume", possible=(0.0, 1e5))
            if q:
                vmax = Value(q[0], "m**3", Provenance("rule", method="site-store-limit",
                                                      note=f"limit of store '{key}' in locations.yaml"))
        lines = {k: doc.where(kp + (k,), at_key=True)[0] for k in ("allowed_groups", "max_flammable_liquid_volume")
                 if item.get(k) is not None}
        if name:
            locations[key] = Location(key, name, r.text(item, kp + ("description",)), tmax,
                                      doc.where(kp, at_key=True)[0], tuple(groups), vmax, frozen_map(lines))
    return locations, r.problems


# ----------------------------------------------------------------------------- entries

def _read_property(r: _Reader, name: str, item, kp, sources) -> Value | None:
    spec = fmt.PROPERTIES[name]
    if isinstance(item, (str, int, float)) and not isinstance(item, bool):
        r.error(kp, f"property '{name}' needs a value and a source",
                f"write {name}: {{value: '{_brief(item).strip(chr(39))}', source: KEY}}")
        return None
    if isinstance(item, dict) and not item:
        r.error(kp, f"property '{name}' is empty", f"give its value and source, or remove '{name}'")
        return None
    item = r.mapping(item, kp, fmt.PROPERTY_KEYS, f"property '{name}'")
    if not item:
        return None
    if "value" not in item:
        r.error(kp, f"property '{name}' has no 'value'")
        return None
    q = r.quantity(item["value"], kp + ("value",), spec.dimension, spec.minimum, spec.maximum, label=name,
                   possible=spec.possible)
    source = r.text(item, kp + ("source",))
    kind = r.text(item, kp + ("provenance",))
    if kind is not None and kind not in fmt.STATED_KINDS:
        r.error(kp + ("provenance",), f"an entry may state provenance {', '.join(fmt.STATED_KINDS)}, not '{kind}'")
        return None
    if source is None:
        if item.get("source") is None:  # (a source that is not text is reported already)
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
    if isinstance(item, dict) and not item:
        r.error(kp, "antoine is empty", "give form, A, B, C, the units, t_min, t_max and source, or remove it")
        return None
    item = r.mapping(item, kp, fmt.ANTOINE_KEYS, "antoine")
    if not item:
        return None
    coeffs = [r.number(item, kp + (c,), required=True, what="antoine") for c in "ABC"]
    form = r.text(item, kp + ("form",), required=True, what="antoine")
    if form is not None and form not in fmt.ANTOINE_FORMS:
        r.error(kp + ("form",), f"unknown Antoine form '{form}'", "expected log10 or ln")
        form = None
    units = []
    pascal_per_unit = None
    for key, dim in (("pressure_unit", "pressure"), ("temperature_unit", "temperature")):
        unit = r.text(item, kp + (key,), required=True, what="antoine")
        if unit is not None:
            try:
                factor = parse_quantity(f"1 {unit}", dim)[0]
            except UnitProblem as exc:
                r.error(kp + (key,), f"{key}: {exc}", exc.hint)
                unit = None
            else:
                if dim == "pressure":
                    pascal_per_unit = factor
        units.append(unit)
    if units[1] is not None and units[1] not in ("K", "°C", "degC"):
        r.error(kp + ("temperature_unit",), f"Antoine temperature unit must be K or °C, not '{units[1]}'")
        units[1] = None
    limits = []
    for key in ("t_min", "t_max"):
        if key not in item:
            r.error(kp, f"antoine needs '{key}', the edge of its valid temperature range", at_key=True)
            limits.append(None)
        else:
            q = r.quantity(item[key], kp + (key,), "temperature", 0.0, label=key)
            limits.append(q[0] if q else None)
    if None not in limits and limits[0] >= limits[1]:
        r.error(kp + ("t_max",), "antoine t_max must be above t_min")
        return None
    cited = _cited_source(r, item, kp, sources, "antoine")
    if cited is None:
        return None
    source, kind = cited
    if None in coeffs or None in units or None in limits or form is None:
        return None
    if problem := antoine_problem(*coeffs, form, pascal_per_unit, units[1] != "K", *limits):
        r.error(kp, problem[0], problem[1], at_key=True)
        return None
    return Antoine(*coeffs, form, units[0], "°C" if units[1] == "degC" else units[1], limits[0], limits[1],
                   source, kind, r.text(item, kp + ("note",)))


def _cited_source(r: _Reader, item, kp, sources, what: str) -> tuple[str, str] | None:
    """(source key, provenance kind) of a block that must cite a source (``antoine``, ``hansen``)."""
    source = r.text(item, kp + ("source",))
    if source is None:
        if item.get("source") is None:
            r.error(kp, f"{what} names no source", "add 'source:' with a key of entries/sources.yaml")
        return None
    if source not in sources:
        r.error(kp + ("source",), f"unknown source '{source}'", "add it to entries/sources.yaml")
        return None
    kind = r.text(item, kp + ("provenance",)) or PROVENANCE_OF_SOURCE[sources[source].kind]
    if kind not in fmt.STATED_KINDS:
        r.error(kp + ("provenance",), f"an entry may state provenance {', '.join(fmt.STATED_KINDS)}, not '{kind}'")
        return None
    return source, kind


def _read_hansen(r: _Reader, item, kp, sources, sphere: bool) -> HansenSet | None:
    """``properties.hansen`` (a material's δD, δP, δH) or ``properties.hansen_sphere`` (with a radius)."""
    what = "hansen_sphere" if sphere else "hansen"
    item = r.mapping(item, kp, fmt.SPHERE_KEYS if sphere else fmt.HANSEN_KEYS, what)
    if not item:
        return None
    numbers = []
    for key in ("delta_d", "delta_p", "delta_h") + (("radius",) if sphere else ()):
        value = r.number(item, kp + (key,), required=True, what=what)
        if value is not None and not 0.0 <= value <= fmt.HANSEN_MAX:
            r.error(kp + (key,), f"{key} {value:g} MPa½ is outside 0 … {fmt.HANSEN_MAX:g} MPa½",
                    "Hansen parameters are a few to a few tens of MPa½ (water: δH about 42)")
            value = None
        if sphere and key == "radius" and value is not None and value <= 0.0:
            r.error(kp + (key,), "the sphere's radius must be above zero")
            value = None
        numbers.append(value)
    cited = _cited_source(r, item, kp, sources, what)
    if cited is None:
        return None
    source, kind = cited
    if None in numbers:
        return None
    return HansenSet(*numbers[:3], source, kind, numbers[3] if sphere else None, r.text(item, kp + ("note",)))


#: vapor pressures an Antoine equation may give over its stated range (SI, Pa): the
#: physically possible window of ``PHYSICAL_RANGES['pressure']``
ANTOINE_PRESSURE = PHYSICAL_RANGES["pressure"]


def antoine_problem(a: float, b: float, c: float, form: str, pascal_per_unit: float, celsius: bool,
                    t_min: float, t_max: float) -> tuple[str, str] | None:
    """(message, hint) when the equation is singular or gives impossible pressures in [t_min, t_max] (K).

    ``form(P / unit) = A − B / (T + C)``.  T + C is linear in T, so it stays positive over the
    range when it is positive at both edges; then log P is monotonic (rising when B > 0) and
    its extremes are at the edges, where it is compared, as a logarithm, with the possible
    pressure window (so no exponential can overflow).
    """
    shift = ZERO_CELSIUS_K if celsius else 0.0
    unit = "°C" if celsius else "K"
    for t_si in (t_min, t_max):
        t = t_si - shift
        if t + c <= 0.0:
            return (f"antoine: T + C = {t + c:.4g} at T = {t:.6g} {unit}, inside [t_min, t_max]: the equation is "
                    "singular there", "check the sign of C and the temperature unit (K or °C)")
    if b <= 0.0:
        return (f"antoine: B = {b:g} makes the vapor pressure fall as the temperature rises",
                "B is positive in every Antoine table; check its sign")
    log10_unit = math.log10(pascal_per_unit)
    window = ANTOINE_PRESSURE
    for edge, t_si in (("t_min", t_min), ("t_max", t_max)):
        x = a - b / (t_si - shift + c)
        log10_p = (x if form == "log10" else x / math.log(10.0)) + log10_unit
        if not math.log10(window.low) <= log10_p <= math.log10(window.high):
            return (f"antoine gives a vapor pressure of 10^{log10_p:.1f} Pa at {edge}, outside what is "
                    f"physically possible ({window.shown})",
                    "check A, B and C digit by digit, the form (log10 or ln) and pressure_unit")
    return None


def load_entry(path: str, text: str, sources: dict, locations: dict) -> tuple[Entry | None, list[Diagnostic]]:
    """Validate one entry file; return the entry when it has no error."""
    entry_id = Path(path).stem
    doc, problems = read_yaml(path, text)
    if doc is None:
        return None, problems
    r = _Reader(doc)
    r.problems.extend(problems)
    if problem := id_problem(entry_id, "entry id (the file name)", fmt.RESERVED_NAMES):
        message, hint = problem
        if not re.match(fmt.ID_PATTERN, entry_id) and len(entry_id) <= fmt.MAX_ID_LENGTH:
            message = f"file name '{_brief(entry_id)[1:-1]}' is not a valid entry id"
        r.error((), message, hint)
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
    if smiles is not None and (problem := smiles_error(smiles)):
        r.error(("smiles",), *problem)
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
    hazard_source = r.text(data, ("hazard_source",))
    if hazard_source is not None and hazard_source not in sources:
        close = difflib.get_close_matches(hazard_source, list(sources), n=1)
        r.error(("hazard_source",), f"unknown source '{hazard_source}'",
                f"did you mean '{close[0]}'?" if close else "add it to entries/sources.yaml")
    catalog = _read_catalog(r, data.get("catalog"), locations)
    composition = read_composition(r, data)
    if composition and etype != "mixture":
        r.error(("composition",), "only a mixture has a composition", "add 'type: mixture' or remove 'composition'",
                at_key=True)
    elif composition and smiles is not None:
        r.error(("smiles",), "a mixture with a composition has no SMILES of its own",
                "remove 'smiles': the structures are the components'")
    properties = {}
    props = data.get("properties")
    antoine = None
    hansen_sets: dict[str, HansenSet | None] = {}
    if props is not None:
        allowed = list(fmt.PROPERTIES) + ["antoine", "hansen", "hansen_sphere"]
        props = r.mapping(props, ("properties",), allowed, "properties")
        for pname, item in props.items():
            kp = ("properties", pname)
            if pname == "antoine":
                antoine = _read_antoine(r, item, kp, sources)
            elif pname in ("hansen", "hansen_sphere"):
                hansen_sets[pname] = _read_hansen(r, item, kp, sources, sphere=pname == "hansen_sphere")
            elif pname in fmt.PROPERTIES:
                value = _read_property(r, pname, item, kp, sources)
                if value is not None:
                    properties[pname] = value
    lines = {".".join(map(str, k)): v for k, v in doc.positions.items() if k}
    if errors(r.problems):
        return None, r.problems
    entry = Entry(entry_id, path, name, etype, r.text_list(data, ("synonyms",)), cas, smiles, hazards,
                  r.text(data, ("notes",)), catalog, frozen_map(_in_format_order(properties)), antoine,
                  frozen_map(lines), declared_formula=formula, declared_molar_mass=molar_mass,
                  hazard_provenance=(Provenance(PROVENANCE_OF_SOURCE[sources[hazard_source].kind],
                                                source=hazard_source) if hazard_source else None),
                  composition=composition, hansen=hansen_sets.get("hansen"),
                  hansen_sphere=hansen_sets.get("hansen_sphere"))
    return entry, r.problems


def smiles_error(smiles: str) -> tuple[str, str] | None:
    """(message, hint) when ``smiles`` is not one readable structure, else None."""
    if problem := _smiles_problem(smiles):
        return problem
    _, reason = parse_smiles(smiles)
    if reason:
        return f"SMILES {_brief(smiles)} does not parse", f"RDKit: {reason}"
    return None


def _smiles_problem(smiles: str) -> tuple[str, str] | None:
    """(message, hint) for SMILES that RDKit would read as something else, or not as one substance."""
    if space := re.search(r"\s", smiles):
        return (f"SMILES {_brief(smiles)} contains a space at character {space.start() + 1}",
                "RDKit reads only up to the first space and would ignore the rest; "
                "remove the space or what follows it")
    if fmt.SMILES_WILDCARD in smiles:
        return (f"SMILES {_brief(smiles)} contains a wildcard atom '*'",
                "a catalog substance needs a complete structure; write the real atom, "
                "or make the entry 'type: mixture' without SMILES")
    return None


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
            q = r.quantity(data[key], ("catalog", key), "temperature", 0.0, label=key,
                           possible=STORE_TEMPERATURE if key == "max_store_temperature" else None)
            if q:
                temps[key] = Value(q[0], "K", Provenance("rule", method=method, note="stated in the entry"))
    return CatalogInfo(code=r.text(data, ("catalog", "code")), locations=locs,
                       max_store_temperature=temps.get("max_store_temperature"),
                       process_temperature=temps.get("process_temperature"),
                       container=r.text(data, ("catalog", "container")), owner=r.text(data, ("catalog", "owner")))


_FILE_KINDS = ((stat.S_ISDIR, "a folder"), (stat.S_ISFIFO, "a named pipe (FIFO)"), (stat.S_ISSOCK, "a socket"),
               (stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device"))


def _not_regular(mode: int) -> str | None:
    if stat.S_ISREG(mode):
        return None
    return next((name for test, name in _FILE_KINDS if test(mode)), "not a regular file")


def _file_problem(path: Path, root: Path | None, shown: str) -> Diagnostic | None:
    """Why ``path`` may not be read, found without opening it: a symbolic link leading out of
    ``root`` (or nowhere), something other than a regular file, or a file over the size limit."""
    def problem(message, hint=None):
        return Diagnostic(shown, 1, 1, "error", message, hint)

    try:
        if path.is_symlink():
            target = Path(os.path.realpath(path))
            if root is not None and not target.is_relative_to(Path(os.path.realpath(root))):
                return problem(f"symbolic link to {target}, outside the entries folder",
                               "copy the file into the entries folder instead of linking to it")
            if not target.exists():
                return problem(f"symbolic link to {target}, which does not exist")
        info = path.stat()
    except OSError as exc:
        return problem(f"cannot read file: {exc.strerror or exc}")
    if kind := _not_regular(info.st_mode):
        return problem(f"{kind}, not a file; skipped", "only regular files are read from the entries folder")
    if info.st_size > MAX_BYTES:
        return problem(f"file is larger than {MAX_BYTES // 1024} KiB ({info.st_size // 1024} KiB)",
                       "an entry is a few KiB; split or shorten it")
    return None


def _decode(data: bytes, shown: str) -> tuple[str | None, list[Diagnostic]]:
    """UTF-8 text of ``data`` (a leading byte order mark dropped), or the line and column of the first bad byte."""
    try:
        return data.decode("utf-8-sig"), []
    except UnicodeDecodeError as exc:
        start = exc.start + (3 if data.startswith(b"\xef\xbb\xbf") else 0)
        before = data[:start].decode("utf-8-sig", errors="replace")
        line, col = line_col(before, len(before))
        return None, [Diagnostic(shown, line, col, "error",
                                 f"file is not UTF-8 text (byte 0x{data[start]:02x} at byte {start + 1}: {exc.reason})",
                                 "save the file as UTF-8")]


def _read_file(path: Path, shown: str, root: Path | None = None) -> tuple[str | None, list[Diagnostic]]:
    """The text of one YAML file of the entries folder, or the diagnostics saying why not.

    Checked before opening (``_file_problem``); opened without blocking and checked again
    on the open file, so a file swapped for a named pipe cannot hang the build.
    """
    if problem := _file_problem(path, root, shown):
        return None, [problem]
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0))
        with os.fdopen(fd, "rb") as handle:
            if kind := _not_regular(os.fstat(handle.fileno()).st_mode):
                return None, [Diagnostic(shown, 1, 1, "error", f"{kind}, not a file; skipped")]
            data = handle.read(MAX_BYTES + 1)
    except OSError as exc:
        return None, [Diagnostic(shown, 1, 1, "error", f"cannot read file: {exc.strerror or exc}")]
    if len(data) > MAX_BYTES:
        return None, [Diagnostic(shown, 1, 1, "error", f"file is larger than {MAX_BYTES // 1024} KiB")]
    return _decode(data, shown)


def _read_special(entries_dir: Path, name: str, reader, shown_root: str):
    path = entries_dir / name
    shown = f"{shown_root}/{name}"
    if not os.path.lexists(path):
        return {}, [Diagnostic(shown, 1, 1, "error", f"missing {name}",
                               "the entries folder needs sources.yaml and locations.yaml")]
    text, problems = _read_file(path, shown, entries_dir)
    if text is None:
        return {}, problems
    doc, problems = read_yaml(shown, text)
    if doc is None:
        return {}, problems
    items, more = reader(doc)
    return items, problems + more


def shown_path(path: Path) -> str:
    """Path as printed in diagnostics: relative to the working folder when possible.

    The folder is resolved, the name kept: a symbolic link is shown as itself, not as its target.
    """
    return _shown_paths()(path)


def _shown_paths():
    """``shown_path`` for many files of few folders: each folder and the working folder resolved once."""
    try:
        cwd = Path.cwd().resolve()
    except OSError:
        cwd = None
    folders: dict[Path, Path] = {}

    def shown(path: Path) -> str:
        try:
            path = Path(path)
            parent = path.absolute().parent
            if parent not in folders:
                folders[parent] = parent.resolve()
            if cwd is None:
                return str(path)
            return str((folders[parent] / path.name).relative_to(cwd))
        except (ValueError, OSError):
            return str(path)

    return shown


def entry_files(entries_dir: Path) -> list[Path]:
    return sorted(p for p in entries_dir.glob("*.y*ml") if p.name not in SPECIAL_FILES)


def read_bibliography(entries_dir: Path, root: str) -> tuple[dict, dict, list[Diagnostic]]:
    """sources.yaml and locations.yaml of ``entries_dir`` (shown as ``root/...``), with their problems."""
    sources, diagnostics = _read_special(entries_dir, "sources.yaml", _read_sources, root)
    locations, more = _read_special(entries_dir, "locations.yaml", _read_locations, root)
    return sources, locations, diagnostics + more


def read_entries(files, sources: dict, locations: dict, shown=None, root: Path | None = None,
                 cache=None) -> tuple[dict[str, Entry], list[Diagnostic], set[str]]:
    """Load each entry file: the entries that load (by id), every diagnostic, and the ids that did not.

    A symbolic link may lead only inside ``root`` (by default the folder of each file). With a
    ``cache`` (``builder.core.cache.Cache``), each file's result is kept under the key of exactly
    what ``load_entry`` reads: its path as shown, its text, the sources and stores, the code.
    """
    context = key_of("load", code_version(), settings_key(), repr(sorted(sources.items())),
                     repr(sorted(locations.items()))) if cache is not None and cache.root is not None else None
    entries: dict[str, Entry] = {}
    diagnostics: list[Diagnostic] = []
    failed: set[str] = set()
    seen_at: dict[str, str] = {}
    files = list(files)
    shown = shown or _shown_paths()
    stems = {Path(f).stem for f in files}
    with collector_paused():  # most files come from the cache
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
            text, probs = _read_file(path, where, Path(path).parent if root is None else root)
            entry = None
            if text is not None:
                entry, probs = _load_cached(where, text, sources, locations, cache, context)
            if path.stem.endswith(fmt.CHART_SUFFIX) and path.stem[:-len(fmt.CHART_SUFFIX)] in stems:
                probs = [*probs, Diagnostic(where, 1, 1, "error", f"entry id '{path.stem}' would overwrite the "
                                            f"vapor-pressure chart of entry '{path.stem[:-len(fmt.CHART_SUFFIX)]}'",
                                            f"choose an id that does not end in '{fmt.CHART_SUFFIX}'")]
                entry = None
            diagnostics += probs
            if entry is None:
                failed.add(path.stem)
            else:
                entries[entry.id] = entry
    return entries, diagnostics, failed


def _load_cached(where: str, text: str, sources: dict, locations: dict, cache, context: str | None):
    """``load_entry``, or its result for the same inputs from ``cache`` (a pure function of them)."""
    if context is None:
        return load_entry(where, text, sources, locations)
    key = key_of(context, where, text)
    found = cache.get("load", key)
    if isinstance(found, tuple) and len(found) == 2 and (found[0] is None or isinstance(found[0], Entry)):
        return found[0], list(found[1])
    entry, probs = load_entry(where, text, sources, locations)
    cache.put("load", key, (entry, tuple(probs)))
    return entry, probs


def load_catalog(entries_dir: Path, only: list[Path] | None = None, cache=None
                 ) -> tuple[Catalog | None, list[Diagnostic]]:
    """Read ``entries_dir`` (or just the files ``only``) and validate everything.

    Returns ``(catalog, diagnostics)``; ``catalog`` is None when any diagnostic is an error.
    ``cache``: each file's validated entry is reused while its text, the sources, the stores and
    the code are unchanged (``read_entries``).
    """
    entries_dir = Path(entries_dir)
    root = shown_path(entries_dir)
    if not entries_dir.is_dir():
        return None, [Diagnostic(root, 1, 1, "error", "entries folder not found")]
    sources, locations, diagnostics = read_bibliography(entries_dir, root)
    files = sorted(Path(p) for p in only) if only else entry_files(entries_dir)
    entries, more, failed = read_entries(files, sources, locations, root=entries_dir, cache=cache)
    if only:  # the files' neighbours take part in the checks across entries (their own problems are not shown)
        others = [p for p in entry_files(entries_dir) if p.stem not in entries and p.stem not in failed]
        neighbours = read_entries(others, sources, locations, root=entries_dir, cache=cache)[0]
        more += [d for d in composition_problems({**neighbours, **entries}, {p.stem for p in others})
                 if d.path in {e.path for e in entries.values()}]
    else:
        more += composition_problems(entries, failed)
    # sources.yaml and locations.yaml first: their problems cause the entries' unknown-key errors
    diagnostics = sorted(diagnostics + more, key=lambda d: (Path(d.path).name not in SPECIAL_FILES, d.path,
                                                            d.line, d.col, d.message))
    if errors(diagnostics):
        return None, diagnostics
    catalog = Catalog(tuple(entries[k] for k in sorted(entries)), frozen_map(sorted(sources.items())),
                      frozen_map(sorted(locations.items())), root)
    return catalog, diagnostics
