"""Volatility and fire for a datasheet: vapor pressure, exposure figures, flash point,
GHS flammable-liquid category, COSHH volatility bands and handling notes.

``fire_values(entry, mol, values, dominant_force, store_temperature)`` returns
``FireResult``: values, labels, handling notes, the vapor-pressure curve segments for
the chart, and findings for ``cohesion check``.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from rdkit import Chem

from builder.chem import bands, exposure, flash, ghs, handling, vapor
from builder.chem.flexibility import VaporStructure, vapor_structure
from builder.core.diagnostics import Diagnostic
from builder.core.methods import method_for_estimator
from builder.core.model import Antoine as StatedAntoine
from builder.core.model import Entry
from builder.core.units import ZERO_CELSIUS_K, celsius_text, to_unit
from builder.core.values import Label, Provenance, Value, estimated

T20, T25 = 293.15, 298.15

#: shown under every list of handling notes (datasheet, ``cohesion profile``)
NOTES_DISCLAIMER = (
    "These notes are generated from the values above by the catalog's rules. They summarise; they do not "
    "replace the supplier's safety data sheet, a risk assessment, local regulations or the site's rules."
)

#: how the handling rules' text filters write values: temperatures like every other page
NOTE_FORMATS = {"degC": lambda kelvin_value: celsius_text(kelvin_value, 0, unit=False)}


@dataclass(frozen=True)
class Segment:
    """A stretch of the vapor-pressure curve: kind is antoine, antoine-outside or estimated.

    The points are Python floats, not numpy scalars: a numpy scalar pickles as a call with its
    dtype, which made the curve most of the time spent storing and reading a derived entry."""

    kind: str
    temperatures: tuple[float, ...]
    pressures: tuple[float, ...]


@dataclass
class FireResult:
    values: dict[str, Value] = field(default_factory=dict)
    labels: dict[str, Label] = field(default_factory=dict)
    notes: list[handling.Note] = field(default_factory=list)
    curve: list[Segment] = field(default_factory=list)
    findings: list[Diagnostic] = field(default_factory=list)


def antoine_of(stated: StatedAntoine) -> vapor.Antoine:
    """The entry's coefficients in the one internal form (log10, Pa, K)."""
    factor = to_unit(1.0, stated.pressure_unit, "Pa")
    A = stated.A + (math.log(factor) if stated.form == "ln" else math.log10(factor))
    t_unit = "K" if stated.temperature_unit == "K" else "degC"
    offset = 0.0 if t_unit == "K" else ZERO_CELSIUS_K
    return vapor.Antoine.from_published(A, stated.B, stated.C, base=stated.form, p_unit="Pa", t_unit=t_unit,
                                        Tmin=stated.t_min - offset, Tmax=stated.t_max - offset)


def _pressure_at(T: float, antoine: vapor.Antoine | None, tb: Value | None, vs: VaporStructure | None,
                 antoine_source: str) -> Value | None:
    if antoine is not None and antoine.in_range(T):
        return Value(antoine.pressure(T).value, "Pa", Provenance("rule", method="antoine",
                                                                   note=f"coefficients from {antoine_source}"))
    if tb is None or vs is None or T >= tb.value:
        return None
    est = vapor.estimate_psat(T, tb.value, vs.tau, vs.hbn, vs.h_bond_donor, u_Tb=_u_estimated(tb))
    u = est.u
    why = "outside the Antoine range; " if antoine is not None else ""
    low, high = est.value * math.exp(-u / est.value), est.value * math.exp(u / est.value)
    return estimated(est.value, "Pa", "myrdal-yalkowsky", u,
                     f"{why}from the {tb.kind} boiling point; 1σ range {low / 1000:.3g} to {high / 1000:.3g} kPa")


def _u_estimated(tb: Value) -> float:
    """The boiling point's standard uncertainty to carry into what is computed from it: an estimate's
    (a stated value's error is already inside the methods' measured uncertainties), else 0."""
    return tb.uncertainty if tb.kind == "estimated" and tb.uncertainty else 0.0


def _curve(antoine: vapor.Antoine | None, tb: Value | None, vs: VaporStructure | None,
           store_T: float) -> list[Segment]:
    lo = 253.15
    hi = max(store_T + 20.0, 333.15)
    if tb is not None:
        hi = min(max(hi, tb.value + 10.0), tb.value + 40.0)
    grid = np.linspace(lo, hi, 121)
    segments: list[Segment] = []
    if antoine is not None:
        pressures, inside = vapor.antoine_curve(antoine, grid)
        for kind, mask in (("antoine", inside), ("antoine-outside", ~inside)):
            # split the mask into contiguous runs so a line is not drawn across a gap
            idx = np.flatnonzero(mask)
            for run in np.split(idx, np.flatnonzero(np.diff(idx) > 1) + 1):
                if len(run) > 1:
                    segments.append(Segment(kind, tuple(np.round(grid[run], 3).tolist()),
                                            tuple(np.asarray(pressures[run], dtype=float).tolist())))
    elif tb is not None and vs is not None:
        below = grid[grid < tb.value]
        if len(below) > 1:
            pressures = vapor.myrdal_yalkowsky_curve(below, tb.value, vs.tau, vs.hbn)
            segments.append(Segment("estimated", tuple(np.round(below, 3).tolist()),
                                    tuple(np.asarray(pressures, dtype=float).tolist())))
    return segments


def _flash_point(entry: Entry, mol: Chem.Mol | None, tb: Value | None,
                 vs: VaporStructure | None) -> tuple[Value | None, Value | None]:
    stated = entry.properties.get("flash_point")
    estimate = None
    if tb is not None and flash.flash_estimate_applies(mol):
        try:
            est = flash.estimate_flash_point(tb.value, n_carbon=vs.n_carbon if vs else None,
                                             tau=vs.tau if vs else None, hbn=vs.hbn if vs else None,
                                             u_Tb=_u_estimated(tb))
        except ValueError:  # outside the correlations' range (e.g. a gas far below 25 °C): no estimate
            return stated, None
        method = method_for_estimator(est.estimator)
        estimate = estimated(est.value, "K", method, est.u, f"from the {tb.kind} boiling point")
    return stated or estimate, estimate


#: how much a derived value can be trusted, weakest last: a value derived by a rule from its inputs is
#: no better than the weakest of them, so it carries that input's kind when it is weaker than "rule"
_WEAKER_THAN_RULE = ("assumed", "estimated")


def inherited_kind(*inputs: Value | None) -> str:
    """The provenance kind of a value derived by a rule from ``inputs``: ``estimated`` when any input
    is an estimate, else ``assumed`` when any input is an assumed default, else ``rule``.

    >>> inherited_kind(estimated(300.0, "K", "catoire-naudet", 5.0))
    'estimated'
    >>> inherited_kind(None)
    'rule'
    """
    kinds = {v.kind for v in inputs if v is not None}
    for kind in reversed(_WEAKER_THAN_RULE):
        if kind in kinds:
            return kind
    return "rule"


def _category(entry: Entry, fp: Value | None, tb: Value | None, result: FireResult) -> None:
    if fp is None:
        return
    u_fp = fp.uncertainty if fp.kind == "estimated" else 0.0
    u_tb = (tb.uncertainty or 0.0) if tb is not None and tb.kind == "estimated" else 0.0
    rng = ghs.possible_categories(fp.value, u_fp or 0.0, tb.value if tb else None, u_tb)
    cat = rng.most_likely
    estimated_inputs = [name for name, v in (("flash point", fp), ("boiling point", tb))
                        if v is not None and v.kind == "estimated"]
    note = "rests on an estimated " + " and ".join(estimated_inputs) if estimated_inputs else None
    possible = sorted(rng.categories, key=lambda c: 5 if c is None else c)

    # one capital, numbers once: "Category 3 or 4 or not a flammable liquid (most likely 4)"
    numbers = [str(c) for c in possible if c is not None]
    text = "Category " + " or ".join(numbers) if numbers else "Not a flammable liquid"
    if numbers and None in possible:
        text += " or not a flammable liquid"
    if len(possible) > 1:
        text += f" (most likely {'not a flammable liquid' if cat is None else cat})"
    if cat is not None:
        text += f" — {ghs.HAZARD_STATEMENTS[cat][0]}"
    kind = inherited_kind(fp, tb)
    result.labels["flammable_category"] = Label(text, Provenance(kind, method="ghs-flammable-liquid", note=note),
                                                cat)
    result.labels["flammable_category_range"] = Label(
        ", ".join("none" if c is None else str(c) for c in possible),
        Provenance(kind, method="ghs-flammable-liquid", note=note), tuple(possible))
    if not entry.hazard_statements or entry.path == "<command line>":
        return  # nothing declared, nothing to disagree with
    message = ghs.check_declared_statements(entry.hazard_statements, cat, rng.categories,
                                            category_4_adopted=False)
    if message:
        line, col = entry.line_of("hazard_statements")
        result.findings.append(Diagnostic(entry.path, line, col, "warning",
                                          f"hazard statements disagree with the flash point: {message}",
                                          "check the H-codes against the flash point and boiling point"))


def _band(tb: Value, T: float, note: str) -> Label:
    band = bands.volatility_band(tb.value, T)
    basis = f"{note}; from the {tb.kind} boiling point"
    return Label(f"{band} volatility", Provenance(inherited_kind(tb), method="coshh-volatility-band", note=basis),
                 band)


def _vapor_structure(mol: Chem.Mol | None) -> VaporStructure | None:
    """The structure terms of the vapor-pressure methods, or None outside their range (no liquid)."""
    if mol is None:
        return None
    try:
        return vapor_structure(mol)
    except ValueError:  # e.g. a molar mass far beyond any liquid's: the methods do not apply
        return None


def fire_values(entry: Entry, mol: Chem.Mol | None, values: dict[str, Value], dominant_force: str | None,
                store_temperature: Value, process_temperature: Value | None = None,
                state_facts: dict | None = None, liquid_possible: bool = True) -> FireResult:
    """Everything about evaporation and fire that follows from the values derived so far."""
    result = FireResult()
    tb = values.get("boiling_point")
    vs = _vapor_structure(mol)
    antoine = antoine_of(entry.antoine) if entry.antoine else None
    for T, key in ((T20, "vapor_pressure_20C"), (T25, "vapor_pressure_25C")):
        v = _pressure_at(T, antoine, tb, vs, entry.antoine.source if entry.antoine else "")
        if v is not None:
            result.values[key] = Value(v.value, v.unit, v.provenance, v.uncertainty, (("at", T),))
    if tb is not None and vs is not None:
        dh = vapor.estimate_dhvap_at_tb(tb.value, vs.tau, vs.hbn)
        result.values["enthalpy_of_vaporization"] = estimated(dh.value, "J/mol", "myrdal-yalkowsky-hvap", dh.u,
                                                              f"at the {tb.kind} boiling point")
    result.curve = _curve(antoine, tb, vs, store_temperature.value)
    mm = values.get("molar_mass")
    p20 = result.values.get("vapor_pressure_20C")
    if p20 is not None:
        svc = exposure.saturated_vapor_concentration_ppm(p20.value)
        unc = svc * p20.uncertainty / p20.value if p20.uncertainty else None
        result.values["saturated_vapor_concentration_20C"] = Value(
            svc, "ppm", Provenance(inherited_kind(p20), method="saturated-vapor-concentration",
                                   note=f"from the vapor pressure at 20 °C ({p20.kind})"), unc)
        oel = entry.properties.get("exposure_limit")
        if oel is not None:
            result.values["vapor_hazard_ratio"] = Value(
                exposure.vapor_hazard_ratio(svc, oel.value), "dimensionless",
                Provenance(inherited_kind(p20), method="vapor-hazard-ratio", note=f"exposure limit from {oel.provenance.source}"))
    if mm is not None and exposure.MIN_MOLAR_MASS <= mm.value <= exposure.MAX_MOLAR_MASS:  # else: not a vapor
        result.values["vapor_density_relative"] = Value(
            exposure.relative_vapor_density(mm.value), "dimensionless",
            Provenance("assumed", method="vapor-density-ideal-gas"))
    fp, fp_estimate = _flash_point(entry, mol, tb, vs)
    if fp is not None:
        result.values["flash_point"] = fp
    if fp_estimate is not None and fp_estimate is not fp:
        result.values["flash_point_estimate"] = fp_estimate
    if liquid_possible:  # UN GHS ch. 2.6 applies to liquids only (builder/derive/state.py)
        _category(entry, fp, tb, result)
    if tb is not None:
        result.labels["volatility_band"] = _band(tb, bands.ROOM_TEMPERATURE, "at 20 °C")
        if process_temperature is not None:
            result.labels["volatility_band_process"] = _band(
                tb, process_temperature.value, f"at the process temperature {celsius_text(process_temperature.value, 0)}")
    facts = _facts(entry, mol, values, result, dominant_force, store_temperature)
    facts.update(state_facts or {})
    if process_temperature is not None:
        facts["process_temperature"] = process_temperature.value
    result.notes = handling.evaluate_rules(facts, formats=NOTE_FORMATS)
    return result


def _facts(entry, mol, values, result, dominant_force, store_temperature) -> dict:
    cat = result.labels.get("flammable_category")
    density = values.get("density")
    log_kow = entry.properties.get("log_kow")
    fp = result.values.get("flash_point")
    tb = values.get("boiling_point")
    vd = result.values.get("vapor_density_relative")
    vhr = result.values.get("vapor_hazard_ratio")
    band = result.labels.get("volatility_band")
    facts = {
        "flammable_category": cat.code if cat else None,
        "flash_point": fp.value if fp else None,
        "boiling_point": tb.value if tb else None,
        "store_max_temperature": store_temperature.value,
        "store_max_temperature_basis": "assumed default" if store_temperature.kind == "assumed" else "stated",
        "vapor_density_ratio": vd.value if vd else None,
        "dominant_force": dominant_force,
        "is_hydrocarbon": (all(a.GetSymbol() in ("C", "H") for a in mol.GetAtoms()) if mol is not None else None),
        "density": density.value if density else None,
        "log_p": log_kow.value if log_kow else None,
        "vapor_hazard_ratio": vhr.value if vhr else None,
        "volatility_band": band.code if band else None,
    }
    if mol is not None and facts["log_p"] is None and dominant_force == "dispersion" and facts["is_hydrocarbon"]:
        facts["water_miscible"] = False  # hydrocarbons: practically immiscible with water (common practice)
    return {k: v for k, v in facts.items() if v is not None}
