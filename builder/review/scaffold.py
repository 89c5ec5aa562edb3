"""``cohesion new``: start an entry file from a name and a SMILES.

``scaffold_text(name, smiles, cas, ...)`` returns the text of a new entry: the YAML
language-server modeline, the identity computed from the structure (formula and molar
mass as declared fields, so ``cohesion check`` keeps them honest; InChIKey as a comment),
and commented-out placeholders for the measured values, so the file validates as it is.

With ``from_reference=True`` the handbook values the optional ``chemicals`` package ships
offline are filled in, each citing the original publication and saying which package
version it was transcribed from:

==================  =======================================================  ================
value               chemicals call                                           source key
==================  =======================================================  ================
boiling point       ``phase_change.Tb(CAS, method="CRC_ORG")``               crc-95
melting point       ``phase_change.Tm(CAS, method="CRC_ORG")``               crc-95
density             ``miscdata.CRC_organic_data.rho``                        crc-95
flash point         ``safety.T_flash(CAS, method="IEC 60079-20-1 (2010)")``  iec-60079-20-1
Antoine             ``vapor_pressure.Psat_data_AntoinePoling``               poling-2001
==================  =======================================================  ================

Source keys already in ``sources.yaml`` are reused; missing ones are appended.
"""
from __future__ import annotations

import math
import re
import unicodedata
from dataclasses import dataclass, field
from pathlib import Path

from builder.chem.identity import identify, parse_smiles
from builder.load.cas import cas_problem
from builder.load.schema import MODELINE
from builder.load.yamlsafe import read_yaml


class ScaffoldError(Exception):
    """The entry cannot be started; ``code`` is the exit status (1 bad input, 2 usage)."""

    def __init__(self, message: str, code: int = 1):
        super().__init__(message)
        self.code = code


#: bibliography items appended to sources.yaml when a reference value cites a key it lacks
REFERENCE_SOURCES = {
    "crc-95": {"title": "CRC Handbook of Chemistry and Physics", "kind": "handbook", "edition": "95th",
               "year": 2014, "authors": "W. M. Haynes, T. J. Bruno, D. R. Lide (eds.)", "publisher": "CRC Press",
               "note": 'Table "Physical Constants of Organic Compounds" (melting point, normal boiling point, '
                       "density, refractive index), via the Python package chemicals {version}."},
    "iec-60079-20-1": {"title": "IEC 60079-20-1 Explosive atmospheres - Part 20-1: Material characteristics for "
                                "gas and vapour classification - Test methods and data",
                       "kind": "standard", "edition": "1st", "year": 2010,
                       "publisher": "International Electrotechnical Commission",
                       "note": "Closed-cup flash points, via the Python package chemicals {version}."},
    "poling-2001": {"title": "The Properties of Gases and Liquids", "kind": "handbook", "edition": "5th",
                    "year": 2001, "authors": "B. E. Poling, J. M. Prausnitz, J. P. O'Connell",
                    "publisher": "McGraw-Hill",
                    "note": "Appendix A Antoine coefficients, restated as log10(P/Pa) = A - B/(T/K + C), via the "
                            "Python package chemicals {version} (Psat_data_AntoinePoling)."},
}


@dataclass
class Reference:
    """Values looked up in the offline ``chemicals`` data: YAML lines for ``properties``."""

    version: str
    properties: dict[str, dict] = field(default_factory=dict)  # name -> {value, source, ...}

    @property
    def sources(self) -> list[str]:
        return sorted({p["source"] for p in self.properties.values()})


def slugify(name: str) -> str:
    """Entry id from a name: 'Ethyl acetate' → 'ethyl-acetate', 'α-Pinene' → 'alpha-pinene'."""
    greek = {"α": "alpha", "β": "beta", "γ": "gamma", "δ": "delta", "ω": "omega"}
    text = "".join(greek.get(ch, ch) for ch in name.lower())
    text = unicodedata.normalize("NFKD", text).encode("ascii", "ignore").decode("ascii")
    return re.sub(r"[^a-z0-9]+", "-", text).strip("-")


def _quote(text: str) -> str:
    return "'" + text.replace("'", "''") + "'"


def _num(x) -> str:
    """The shortest text that reads back as the same float (no digits lost)."""
    return repr(float(x))


def reference_values(cas: str) -> Reference:
    """Handbook values for ``cas`` from the ``chemicals`` package (raises ScaffoldError without it)."""
    try:
        import chemicals
        from chemicals import miscdata
        from chemicals.phase_change import Tb, Tb_methods, Tm, Tm_methods
        from chemicals.safety import T_flash, T_flash_methods
        from chemicals.vapor_pressure import Psat_data_AntoinePoling
    except ImportError as exc:
        raise ScaffoldError("--from-reference needs the optional package 'chemicals' "
                            "(pip install chemicals==1.5.2)", code=2) from exc
    version = chemicals.__version__
    ref = Reference(version)
    via = f"transcribed from chemicals {version}"
    if "CRC_ORG" in Tb_methods(cas):
        ref.properties["boiling_point"] = {"value": f"{_num(Tb(cas, method='CRC_ORG'))} K", "source": "crc-95",
                                           "conditions": "{pressure: 101.325 kPa}",
                                           "note": f"{via} (phase_change.Tb, CRC_ORG)"}
    if "CRC_ORG" in Tm_methods(cas):
        ref.properties["melting_point"] = {"value": f"{_num(Tm(cas, method='CRC_ORG'))} K", "source": "crc-95",
                                           "note": f"{via} (phase_change.Tm, CRC_ORG)"}
    table = miscdata.CRC_organic_data
    if cas in table.index and not math.isnan(float(table.loc[cas, "rho"])):
        ref.properties["density"] = {"value": f"{_num(table.loc[cas, 'rho'])} kg/m3", "source": "crc-95",
                                     "note": f"at the temperature of the handbook table (mostly 20 °C); {via} "
                                             "(miscdata.CRC_organic_data)"}
    iec = "IEC 60079-20-1 (2010)"
    if iec in T_flash_methods(cas):
        ref.properties["flash_point"] = {"value": f"{_num(T_flash(cas, method=iec))} K",
                                         "source": "iec-60079-20-1", "method": "closed cup",
                                         "note": f"{via} (safety.T_flash, {iec})"}
    if cas in Psat_data_AntoinePoling.index:
        row = Psat_data_AntoinePoling.loc[cas]
        ref.properties["antoine"] = {"form": "log10", "pressure_unit": "Pa", "temperature_unit": "K",
                                     "A": _num(row['A']), "B": _num(row['B']),
                                     "C": _num(row['C']), "t_min": f"{_num(row['Tmin'])} K",
                                     "t_max": f"{_num(row['Tmax'])} K", "source": "poling-2001",
                                     "note": f"{via} (vapor_pressure.Psat_data_AntoinePoling)"}
    return ref


_PLACEHOLDERS = """\
# properties:                      # each stated value needs a source: a key of sources.yaml
#   boiling_point:
#     value: 78.4 °C               # "<number> [± <uncertainty>] <unit>"
#     source: KEY
#     conditions: {pressure: 101.325 kPa}
#   melting_point: {value: -114 °C, source: KEY}
#   flash_point: {value: 12 °C, source: KEY, method: closed cup}
#   density: {value: 0.789 g/cm3, source: KEY, conditions: {at: 20 °C}}
#   vapor_pressure: {value: 5.8 kPa, source: KEY, conditions: {at: 20 °C}}   # needs conditions.at
#   exposure_limit: {value: 200 ppm, source: KEY}                              # 8 h TWA
"""

_PROPERTY_ORDER = ("boiling_point", "melting_point", "flash_point", "density", "antoine")


def _properties_yaml(ref: Reference) -> str:
    lines = [_align("properties:  # handbook values from the offline reference data; each cites its source")]
    for name in _PROPERTY_ORDER:
        item = ref.properties.get(name)
        if item is None:
            continue
        lines.append(f"  {name}:")
        for key, value in item.items():
            text = _quote(value) if key in ("note",) else value
            lines.append(f"    {key}: {text}")
    missing = [n for n in _PROPERTY_ORDER if n not in ref.properties]
    if missing:
        lines.append(f"  # not in the offline reference data: {', '.join(missing)}")
    return "\n".join(lines) + "\n"


def _align(line: str, column: int = 35) -> str:
    """Line up a trailing comment (two or more spaces then '#') at ``column``."""
    match = re.match(r"^(.*?\S)\s{2,}(# .*)$", line)
    if not match:
        return line
    return f"{match[1]:<{column - 1}} {match[2]}"


def scaffold_text(name: str, smiles: str, cas: str | None = None, locations: list[str] | None = None,
                  reference: Reference | None = None) -> str:
    """The text of a new entry for ``name`` with structure ``smiles`` (both validated by the caller)."""
    ident = identify(smiles)
    stores = ", ".join(locations or []) or "none defined yet"
    parts = [
        MODELINE,
        f"# {name}: started with `cohesion new`. Replace the placeholders, cite every value with a key of",
        "# sources.yaml, then run `cohesion check` on this file.",
        f"name: {_quote(name)}                      # the name the site uses",
        "# synonyms: [other name]           # other names, searched and shown on the datasheet",
        (f"cas: {cas}                       # CAS Registry Number (check digit validated)" if cas else
         "# cas: 00-00-0                    # CAS Registry Number (check digit validated)"),
        f"smiles: {_quote(smiles)}                   # the structure: identity and estimates start here",
        "# computed from the SMILES; cohesion check warns if either stops matching the structure",
        f"formula: {ident.formula}",
        f"molar_mass: {ident.molar_mass:.2f} g/mol",
        f"# InChIKey {ident.inchikey} (computed; not a field)",
        "# hazard_statements: [H225]        # GHS H-codes from the supplier's safety data sheet",
        "# notes: free text shown on the datasheet",
        "# catalog:                         # site facts",
        "#   code: XX-000",
        f"#   locations: [KEY]               # keys of locations.yaml: {stores}",
        "#   container: 1 L glass bottle",
        "#   owner: team name",
    ]
    text = "\n".join(_align(line) for line in parts) + "\n"
    if reference is not None and reference.properties:
        return text + _properties_yaml(reference)
    return text + _PLACEHOLDERS


def _location_keys(entries_dir: Path) -> list[str]:
    loc_file = entries_dir / "locations.yaml"
    if loc_file.exists():
        doc, _ = read_yaml(str(loc_file), loc_file.read_text(encoding="utf-8"))
        if doc is not None and isinstance(doc.data, dict):
            return sorted(map(str, doc.data))
    return []


def mixture_scaffold_text(name: str, components: list[tuple[str, str, bool]], locations: list[str] | None = None) -> str:
    """The text of a new mixture entry: ``components`` are (entry id or SMILES, fraction text, is an entry id)."""
    stores = ", ".join(locations or []) or "none defined yet"
    parts = [
        MODELINE,
        f"# {name}: started with `cohesion new --mix`. Check the fractions against the supplier's sheet",
        "# (ranges like '10-20 % w/w' are fine), then run `cohesion check` on this file.",
        f"name: {_quote(name)}                      # the name the site uses",
        "type: mixture",
        "composition:                       # each: an entry id ('component') or 'smiles' with a 'name'",
    ]
    for key, fraction, is_entry in components:
        if is_entry:
            parts.append(f"  - component: {key}")
        else:
            parts += [f"  - smiles: {_quote(key)}", f"    name: {_quote(key)}             # a readable name"]
        parts.append(f"    fraction: {fraction}")
    parts += [
        "# hazard_statements: [H225]        # GHS H-codes from the supplier's safety data sheet",
        "# properties:                      # stated values win over the ones derived from the components",
        "#   flash_point: {value: 12 °C, source: KEY, method: closed cup}",
        "# catalog:                         # site facts",
        "#   code: XX-000",
        f"#   locations: [KEY]               # keys of locations.yaml: {stores}",
        "#   container: 25 L can",
    ]
    return "\n".join(_align(line) for line in parts) + "\n"


def _append_sources(sources_file: Path, keys: list[str], version: str) -> list[str]:
    """Append the bibliography items ``keys`` lacks to ``sources_file``; returns the keys added."""
    text = sources_file.read_text(encoding="utf-8") if sources_file.exists() else ""
    doc, _ = read_yaml(str(sources_file), text)
    present = set(doc.data or {}) if doc is not None and isinstance(doc.data, dict) else set()
    added = [k for k in keys if k not in present]
    if not added:
        return []
    out = [text.rstrip("\n")] if text.strip() else []
    for key in added:
        item = REFERENCE_SOURCES[key]
        out.append(f"{key}:")
        for field_name, value in item.items():
            value = value.format(version=version) if isinstance(value, str) else value
            out.append(f"  {field_name}: {_quote(value) if isinstance(value, str) else value}")
    sources_file.write_text("\n".join(out) + "\n", encoding="utf-8")
    return added


def _mixture_components(entries_dir: Path, items: list[str]) -> list[tuple[str, str, bool]]:
    """``ID=FRACTION`` or ``SMILES=FRACTION`` items, checked like a composition in a file."""
    from builder.load.composition import FractionProblem, parse_fraction, sum_problem

    out, fractions = [], []
    for item in items:
        key, sep, text = item.rpartition("=")
        if not sep or not key.strip():
            raise ScaffoldError(f"--mix {item!r}: expected ID=FRACTION or SMILES=FRACTION, e.g. 'ethanol=40 % w/w'",
                                code=2)
        key = key.strip()
        try:
            fractions.append(parse_fraction(text.strip()))
        except FractionProblem as exc:
            raise ScaffoldError(f"--mix {item!r}: {exc}" + (f" ({exc.hint})" if exc.hint else "")) from exc
        is_entry = (entries_dir / f"{key}.yaml").is_file()
        if not is_entry and parse_smiles(key)[1]:
            raise ScaffoldError(f"--mix {item!r}: '{key}' is neither an entry of {entries_dir} nor a SMILES")
        out.append((key, text.strip(), is_entry))
    if problem := sum_problem(fractions):
        raise ScaffoldError(f"--mix: {problem}")
    return out


def new_entry(entries_dir: Path, name: str, smiles: str | None, cas: str | None = None,
              from_reference: bool = False, mix: list[str] | None = None) -> tuple[Path, list[str]]:
    """Write ``entries_dir/<id>.yaml``; returns its path and the source keys appended to sources.yaml.
    ``mix``: the components of a mixture (``ID=FRACTION`` or ``SMILES=FRACTION``) instead of a SMILES."""
    entries_dir = Path(entries_dir)
    entry_id = slugify(name)
    if not entry_id:
        raise ScaffoldError(f"cannot make an entry id from the name {name!r}: use letters or digits")
    if not entries_dir.is_dir():
        raise ScaffoldError(f"entries folder {entries_dir} not found", code=2)
    if mix:
        components = _mixture_components(entries_dir, mix)
        path = entries_dir / f"{entry_id}.yaml"
        if path.exists():
            raise ScaffoldError(f"{path} already exists; not overwriting it")
        with open(path, "x", encoding="utf-8") as handle:
            handle.write(mixture_scaffold_text(name, components, _location_keys(entries_dir)))
        return path, []
    if smiles is None:
        raise ScaffoldError("give --smiles for a substance or --mix components for a mixture", code=2)
    _, reason = parse_smiles(smiles)
    if reason:
        raise ScaffoldError(f"SMILES {smiles!r} does not parse: {reason}")
    if cas is not None and (problem := cas_problem(cas)):
        raise ScaffoldError(problem)
    path = entries_dir / f"{entry_id}.yaml"
    if path.exists():
        raise ScaffoldError(f"{path} already exists; not overwriting it")
    reference = None
    if from_reference:
        if cas is None:
            raise ScaffoldError("--from-reference looks values up by CAS number: give --cas", code=2)
        reference = reference_values(cas)
    text = scaffold_text(name, smiles, cas, _location_keys(entries_dir), reference)
    added = _append_sources(entries_dir / "sources.yaml", reference.sources, reference.version) if reference else []
    with open(path, "x", encoding="utf-8") as handle:  # "x": never overwrite, even in a race
        handle.write(text)
    return path, added
