"""Plausibility checks across the catalog for ``cohesion check`` and ``cohesion build``.

``check_catalog(catalog, derived)`` returns ``Diagnostic`` objects, each pointing at the
line that holds the doubtful value.  The loader already refuses what is impossible
(below absolute zero, wrong units, a value with no source); the checks here catch what
is possible but unlikely, and facts that contradict each other:

====================================  ========  ==============================================
check                                 severity  rule
====================================  ========  ==============================================
flash point ≥ boiling point           error     a liquid's flash point lies below its boiling
                                                point (both stated); warning when the boiling
                                                point is only estimated
melting point > boiling point         error     both stated
density outside its range             warning   ``density_range`` below (force class, halogens)
declared formula ≠ SMILES             warning   element counts compared (order ignored)
declared molar mass ≠ SMILES          warning   more than ``MOLAR_MASS_TOLERANCE`` g/mol apart
same InChIKey in two entries          error     at the ``smiles`` line of the later entry (by id)
source cited nowhere                  warning   at the source's line in sources.yaml
hazard statements without a source    warning   no ``hazard_source``
vapor pressure outside Antoine range  warning   its temperature outside the entry's t_min..t_max
vapor pressure far from Antoine       warning   more than ``ANTOINE_TOLERANCE`` off, inside range
store conflicts and store limits      warning   ``builder/review/storecheck.py`` (its own table)
====================================  ========  ==============================================

The boiling point's 3σ residual and the hazard-statement contradiction are found while
deriving (``Derived.findings``); ``cohesion check`` reports those beside these.

The per-entry checks run over ``derived`` (which may be a subset of the catalog, when only
some files are checked); the cross-entry checks (duplicates, uncited sources) always look
at the whole ``catalog``.
"""
from __future__ import annotations

import re
from pathlib import Path

from builder.chem.identity import formula_counts, identify
from builder.core.diagnostics import Diagnostic
from builder.core.model import Catalog, Entry
from builder.core.units import celsius_text
from builder.derive.entry import Derived, derive_entry
from builder.derive.fire import antoine_of
from builder.review.storecheck import check_stores, locations_path, store_mates

#: a stated vapor pressure further than this (relative) from the entry's own Antoine equation is doubtful
ANTOINE_TOLERANCE = 0.25
#: declared and computed molar masses further apart than this (g/mol) disagree; a hydrogen atom too
#: many or too few (1.008 g/mol) is caught, a value rounded to whole g/mol is not
MOLAR_MASS_TOLERANCE = 0.5

#: Plausible density (kg/m³) of a liquid or solid organic material near 20 °C, by dominant force.
#: Our own ranges, set to hold the common organic liquids of the CRC Handbook table (95th ed.,
#: "Physical Constants of Organic Compounds", as shipped in chemicals 1.5.2): light alkanes
#: from about 600 kg/m³, oxygen- and nitrogen-rich compounds up to about 1400 kg/m³.
#: Halogens and atoms heavier than argon raise the upper edge (see ``density_range``).  Checked
#: against 398 liquids drawn at random from that table (seed 1; tools/report_density_ranges.py):
#: all but 2 fall inside (tetranitromethane and ethylene glycol dinitrate, nitro-rich).
DENSITY_RANGES = {
    "dispersion": (550.0, 1100.0),
    "dipole-dipole": (600.0, 1450.0),
    "hydrogen-bonding": (650.0, 1600.0),
    "ionic": (700.0, 2500.0),
}
#: used for structures without a force class (should not happen for a parsed structure)
DEFAULT_DENSITY_RANGE = (500.0, 2000.0)
#: per unit mass fraction of heavy atoms, the upper edge may rise to 1000 + this (kg/m³):
#: bromoform (95 % Br) 2890, diiodomethane (95 % I) 3325, carbon tetrachloride (92 % Cl) 1594 kg/m³
HEAVY_DENSITY_SLOPE = 2600.0
HALOGENS = ("F", "Cl", "Br", "I")


def density_range(dominant_force: str | None, heavy_mass_fraction: float) -> tuple[float, float]:
    """The plausible density range (kg/m³) for a force class and heavy-atom mass fraction (0–1)."""
    low, high = DENSITY_RANGES.get(dominant_force or "", DEFAULT_DENSITY_RANGE)
    if heavy_mass_fraction > 0:
        high = max(high, 1000.0 + HEAVY_DENSITY_SLOPE * heavy_mass_fraction)
    return low, high


def heavy_mass_fraction(smiles: str) -> float:
    """Mass fraction of halogens and of atoms heavier than argon (Se, As, Sn, Pb, ...) in the structure."""
    from rdkit import Chem

    from builder.chem.molar_mass import molar_mass

    mol = Chem.MolFromSmiles(smiles)
    if mol is None:
        return 0.0
    heavy = sum(atom.GetMass() for atom in mol.GetAtoms()
                if atom.GetSymbol() in HALOGENS or atom.GetAtomicNum() > 18)
    return heavy / molar_mass(mol)


def _diag(entry: Entry, dotted: str, severity: str, message: str, hint: str | None = None) -> Diagnostic:
    line, col = entry.line_of(dotted)
    return Diagnostic(entry.path, line, col, severity, message, hint)


def _c(kelvin: float) -> str:
    return celsius_text(kelvin, 1)


def _temperatures(d: Derived) -> list[Diagnostic]:
    e = d.entry
    out = []
    fp, tb, tm = (e.properties.get(k) for k in ("flash_point", "boiling_point", "melting_point"))
    if fp is not None:
        if tb is not None and fp.value >= tb.value:
            out.append(_diag(e, "properties.flash_point.value", "error",
                             f"flash point {_c(fp.value)} is at or above the boiling point {_c(tb.value)}",
                             "a liquid's flash point lies below its boiling point: check both values and units"))
        elif tb is None and (est := d.get("boiling_point")) is not None and fp.value >= est.value:
            out.append(_diag(e, "properties.flash_point.value", "warning",
                             f"flash point {_c(fp.value)} is at or above the estimated boiling point "
                             f"{_c(est.value)}", "check the flash point and its unit, or state the boiling point"))
    if tm is not None and tb is not None and tm.value > tb.value:
        out.append(_diag(e, "properties.melting_point.value", "error",
                         f"melting point {_c(tm.value)} is above the boiling point {_c(tb.value)}",
                         "check both values and their units"))
    return out


def _density(d: Derived) -> list[Diagnostic]:
    rho = d.entry.properties.get("density")
    if rho is None or d.identity is None or d.entry.type != "substance":
        return []
    force = d.label("dominant_force")
    code = force.code if force is not None else None
    w = heavy_mass_fraction(d.identity.smiles)
    low, high = density_range(code, w)
    if low <= rho.value <= high:
        return []
    basis = f"{code or 'unknown force class'}" + (f", {100 * w:.0f} % halogen or heavy atoms by mass" if w else "")
    return [_diag(d.entry, "properties.density.value", "warning",
                  f"density {rho.value / 1000:.4g} g/cm³ is outside the plausible range "
                  f"{low / 1000:.2f}–{high / 1000:.2f} g/cm³ for this structure ({basis})",
                  "check the unit (g/cm³ against kg/m³) and the value")]


def _identity(d: Derived) -> list[Diagnostic]:
    e, ident = d.entry, d.identity
    if ident is None:
        return []
    out = []
    if e.declared_formula is not None and formula_counts(e.declared_formula) != formula_counts(ident.formula):
        out.append(_diag(e, "formula", "warning",
                         f"declared formula {e.declared_formula} disagrees with the SMILES, which gives {ident.formula}",
                         "check the formula or the structure"))
    if e.declared_molar_mass is not None and abs(e.declared_molar_mass - ident.molar_mass) > MOLAR_MASS_TOLERANCE:
        out.append(_diag(e, "molar_mass", "warning",
                         f"declared molar mass {e.declared_molar_mass:.2f} g/mol disagrees with the SMILES, "
                         f"which gives {ident.molar_mass:.2f} g/mol", "check the molar mass or the structure"))
    return out


def _vapor_pressure(d: Derived) -> list[Diagnostic]:
    e = d.entry
    vp = e.properties.get("vapor_pressure")
    if vp is None or e.antoine is None:
        return []
    T = dict(vp.conditions)["at"]
    a = e.antoine
    if not a.t_min <= T <= a.t_max:
        return [_diag(e, "properties.vapor_pressure.conditions.at", "warning",
                      f"vapor pressure is stated at {_c(T)}, outside the Antoine equation's valid range "
                      f"{_c(a.t_min)} to {_c(a.t_max)}", "the two cannot be compared; check the temperature")]
    expected = antoine_of(a).pressure(T).value
    off = vp.value / expected - 1.0
    if abs(off) > ANTOINE_TOLERANCE:
        return [_diag(e, "properties.vapor_pressure.value", "warning",
                      f"vapor pressure {vp.value / 1000:.4g} kPa at {_c(T)} is {100 * off:+.0f} % from the "
                      f"Antoine equation's {expected / 1000:.4g} kPa", "check the value, its unit and temperature, "
                      "or the Antoine coefficients")]
    return []


def _hazard_source(d: Derived) -> list[Diagnostic]:
    e = d.entry
    if e.hazard_statements and e.hazard_provenance is None:
        return [_diag(e, "hazard_statements", "warning", "hazard statements name no source",
                      "add 'hazard_source:' with a key of entries/sources.yaml (the supplier's SDS, "
                      "a harmonised classification)")]
    return []


def _duplicates(catalog: Catalog, named: set[str] | None = None, known: dict | None = None) -> list[Diagnostic]:
    """Same InChIKey twice: an error at the later entry's ``smiles`` line (by id).  When only the
    files ``named`` (paths) are checked and the later entry is not one of them, the error stands at
    the earlier, named entry instead, so a per-file check lets through nothing the build rejects.
    ``known``: InChIKeys already worked out while deriving, by (entry id, SMILES); the rest are computed."""
    known = known or {}
    out = []
    first: dict[str, Entry] = {}
    for e in catalog.entries:  # sorted by id: the later entry gets the error
        if not e.smiles or e.type != "substance":
            continue
        key = known.get((e.id, e.smiles))
        if key is None:
            try:
                key = identify(e.smiles).inchikey
            except ValueError:
                continue
        if not key:
            continue
        if key in first:
            earlier = first[key]
            at, other = (earlier, e) if named is not None and e.path not in named else (e, earlier)
            out.append(_diag(at, "smiles", "error",
                             f"same structure (InChIKey {key}) as entry '{other.id}' ({other.path})",
                             "merge the two entries or correct one structure"))
        else:
            first[key] = e
    return out


def _cited_sources(catalog: Catalog) -> set[str]:
    cited = set()
    for e in catalog.entries:
        cited |= {v.provenance.source for v in e.properties.values() if v.provenance.source}
        if e.antoine is not None:
            cited.add(e.antoine.source)
        cited |= {h.source for h in (e.hansen, e.hansen_sphere) if h is not None}
        if e.hazard_provenance is not None:
            cited.add(e.hazard_provenance.source)
        # a key named in free text (e.g. "hazard statements from source clp-annex-vi") counts as cited
        texts = [e.notes or ""] + [v.provenance.note or "" for v in e.properties.values()]
        cited |= {key for key in catalog.sources
                  if any(re.search(rf"(?<![\w-]){re.escape(key)}(?![\w-])", t) for t in texts)}
    return cited


def sources_path(catalog: Catalog) -> str:
    return f"{catalog.root}/sources.yaml"  # as the loader shows it


def whole_catalog(entries_dir: Path, named: Catalog, cache=None) -> Catalog:
    """``named`` (a catalog of some files) plus every other entry of ``entries_dir`` that loads.

    For the cross-entry checks when only some files are checked: the other files' own
    problems are not reported (they are not being checked), they only take part.
    """
    from builder.load.entries import entry_files, read_entries

    entries = {e.id: e for e in named.entries}
    named_files = {Path(e.path).resolve() for e in named.entries}
    others = [p for p in entry_files(Path(entries_dir)) if p.stem not in entries and p.resolve() not in named_files]
    entries.update(read_entries(others, named.sources, named.locations, cache=cache)[0])
    return Catalog(tuple(entries[k] for k in sorted(entries)), named.sources, named.locations, named.root)


def check_files(entries_dir: Path, named: Catalog, derived, cache=None) -> list[Diagnostic]:
    """Plausibility diagnostics for the files of ``named`` (and sources.yaml), cross-checked
    against the whole entries folder."""
    whole = whole_catalog(entries_dir, named, cache)
    paths = {e.path for e in named.entries}
    shown = paths | {sources_path(named), locations_path(named)}
    # the store checks need the storage groups of every material sharing a store with a checked one
    mates = [derive_entry(e, {k: whole.locations[k] for k in e.catalog.locations if k in whole.locations})
             for e in store_mates(whole, derived)]
    return [d for d in check_catalog(whole, derived, named=paths, others=mates) if d.path in shown]


def _uncited(catalog: Catalog) -> list[Diagnostic]:
    cited = _cited_sources(catalog)
    return [Diagnostic(sources_path(catalog), s.line, 1, "warning", f"source '{key}' is cited by no entry",
                       "cite it or remove it from the bibliography")
            for key, s in catalog.sources.items() if key not in cited]


def check_catalog(catalog: Catalog, derived, named: set[str] | None = None, others=()) -> list[Diagnostic]:
    """Every plausibility diagnostic for ``catalog`` (per-entry checks over ``derived``), sorted;
    ``named``: the paths being checked, when only some files are (see ``_duplicates``)."""
    out: list[Diagnostic] = []
    for d in derived:
        out += _temperatures(d) + _density(d) + _identity(d) + _vapor_pressure(d) + _hazard_source(d)
    # the InChIKeys derive_entry already worked out (identify(entry.smiles)), for the same SMILES
    known = {(d.entry.id, d.entry.smiles): d.identity.inchikey for d in derived if d.identity is not None}
    out += _duplicates(catalog, named, known) + _uncited(catalog)
    # store compatibility and limits (builder/review/storecheck.py); ``others``: derived store-mates
    # of the checked entries that take part without being checked themselves
    out += check_stores(catalog, list(derived) + list(others), named)
    return sorted(out)
