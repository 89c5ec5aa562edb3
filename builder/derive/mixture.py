"""Derive a mixture's datasheet from its composition and its components' own derived values.

``derive_mixture(entry, components, locations)``: ``components`` maps every component
entry id the composition names to its ``Derived`` (a component that is itself a mixture
brings its own components, one level deep). Inline components (``smiles`` and ``name``)
are derived here like any substance. The result is a ``Derived`` whose ``mixture`` holds
the composition table; its values are the mixture's own: molar mass, initial boiling
(bubble) point and dew point at 101.325 kPa, vapor pressure at 20 °C, 25 °C and at the
highest store temperature, flash point, and from them the GHS category, volatility band,
handling notes and the components' hazard alerts with their concentration.

Method: modified Raoult's law with UNIFAC activity coefficients (``builder.chem.unifac``,
``builder.chem.vle``; an ideal solution where a group or an interaction parameter is
missing, and the page says so); pure-component vapor pressures from the stated Antoine
coefficients or the Myrdal–Yalkowsky estimate from the boiling point; the flash point by
Liaw's model (``builder.chem.mixture_flash``). Composition ranges are carried to the worst
case for safety: every extreme composition is evaluated and the lowest boiling and flash
points and the highest vapor pressures are reported, with the nominal figure in the note.
"""
from __future__ import annotations

import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field, replace
from functools import lru_cache
from pathlib import Path

from builder.chem import bands, exposure, handling, mixture_flash, unifac, vle
from builder.chem import mixture as mix
from builder.chem.alerts import Alert
from builder.chem.constants import P_ATM
from builder.chem.datafile import load_yaml
from builder.chem.flexibility import vapor_structure
from builder.chem.identity import parse_smiles
from builder.chem.storage import Assignment, assign_group
from builder.chem.vapor import Antoine, estimate_psat, myrdal_yalkowsky_psat
from builder.core.model import Component, Entry, Location
from builder.core.units import celsius_text
from builder.core.values import Label, Provenance, Value, computed, estimated
from builder.derive.fire import (
    NOTE_FORMATS,
    T20,
    T25,
    FireResult,
    Segment,
    _band,
    _category,
    antoine_of,
    inherited_kind,
)
from builder.derive.forces import FORCE_WORDS
from builder.derive.solvency import KEYS as HANSEN_KEYS
from builder.derive.solvency import blend_values

#: standard uncertainty of ln P from stated Antoine coefficients inside / outside their range
#: (the catalog's own figures: a fit to measured data is good to about 2 %; an extrapolation less)
U_LN_ANTOINE, U_LN_ANTOINE_OUTSIDE = 0.02, 0.10
#: standard uncertainty of Liaw's model itself (K): its measured MAE on ethanol–water, 1.9 K
#: (tests/benchmarks/bench_mixture.py), as a standard uncertainty (× 1.25), rounded up
U_FLASH_MODEL = 2.5
#: temperatures of the mixture's vapor-pressure curve (K)
CURVE_LOW, CURVE_POINTS = 253.15, 61


@dataclass(frozen=True)
class Volatile:
    """One substance of the flattened composition, ready for the phase equilibrium."""

    name: str
    entry_id: str | None
    smiles: str
    molar_mass: float             # g/mol
    density: float | None         # kg/m³, pure liquid
    psat: Callable[[float], float]
    #: each independent uncertain input of the curve: z ↦ the curve moved by z standard uncertainties
    variations: tuple
    psat_basis: str
    flash_point: Value | None
    groups: object                # unifac.Groups, or the reason there are none (str)
    dominant_force: str | None
    force_text: str | None
    alerts: tuple[Alert, ...]
    hydrocarbon: bool = False
    #: the component's Hansen parameters (builder/derive/solvency.py), as Values by key
    hansen: tuple = ()


@dataclass(frozen=True)
class ComponentRow:
    """One line of the composition table."""

    name: str
    entry_id: str | None
    smiles: str
    stated: str
    mass_fraction: Value
    mole_fraction: Value
    vapor_fraction_20C: Value | None
    psat_basis: str
    dominant_force: str | None
    flammable: bool
    via: str | None = None  # the mixture component it comes from, for a nested mixture


@dataclass(frozen=True)
class MixtureFacts:
    """What the mixture datasheet shows beyond the values: the composition and how it was treated."""

    rows: tuple[ComponentRow, ...]
    activity_model: str
    activity_note: str | None
    ranged: bool
    corners: int
    force_note: str
    #: a binary mixture's T–x–y diagram at 101.325 kPa: (x of the first component, bubble T, dew T)
    txy: tuple[tuple[float, ...], tuple[float, ...], tuple[float, ...]] | None = None
    not_flammable: tuple[str, ...] = ()


class _Problem(ValueError):
    """The mixture cannot be derived (said on the page, never raised out of ``derive_mixture``)."""


def _scaled(psat: Callable[[float], float], u_ln: float):
    """One uncertain input: the curve shifted by z standard uncertainties in ln P."""
    return lambda z: (lambda T: psat(T) * math.exp(z * u_ln))


def _antoine_psat(derived) -> tuple[Callable[[float], float], tuple, str] | None:
    a = derived.entry.antoine
    if a is None:
        return None
    curve = antoine_of(a)

    def psat(T: float) -> float:
        return curve.pressure(T).value

    inside = curve.Tmin <= T20 <= curve.Tmax
    return psat, (_scaled(psat, U_LN_ANTOINE if inside else U_LN_ANTOINE_OUTSIDE),), f"Antoine coefficients ({a.source})"


_REFERENCE = Path(__file__).resolve().parents[1] / "data" / "reference_antoine.yaml"


@lru_cache(maxsize=1)
def _reference_antoine() -> dict:
    return load_yaml(_REFERENCE.read_text(encoding="utf-8")) or {}


def _reference_psat(derived) -> tuple[Callable[[float], float], tuple, str] | None:
    """Shipped coefficients for a component that states none and that the estimates cannot serve."""
    ref = _reference_antoine().get(derived.identity.inchikey)
    if ref is None:
        return None
    curve = Antoine(ref["A"], ref["B"], ref["C"], ref["t_min"], ref["t_max"])

    def psat(T: float) -> float:
        return curve.pressure(T).value

    return psat, (_scaled(psat, U_LN_ANTOINE),), f"Antoine coefficients from the catalog's reference data ({ref['source']})"


def _estimated_psat(derived, mol) -> tuple[Callable[[float], float], tuple, str] | None:
    """The Myrdal–Yalkowsky curve from the boiling point; two independent uncertain inputs: the
    method's own ln P error and, for an estimated boiling point, the boiling point itself (which
    moves the whole curve along the temperature axis rather than scaling it)."""
    tb = derived.get("boiling_point")
    try:
        vs = vapor_structure(mol)
    except ValueError:
        vs = None
    if tb is None or vs is None:
        return None
    est = estimate_psat(T25, tb.value, vs.tau, vs.hbn, vs.h_bond_donor)
    Tb, tau, hbn = tb.value, vs.tau, vs.hbn

    def psat(T: float) -> float:
        return myrdal_yalkowsky_psat(T, Tb, tau, hbn)

    variations = [_scaled(psat, est.u_ln)]
    if tb.kind == "estimated" and tb.uncertainty:
        u_tb = tb.uncertainty
        variations.append(lambda z: (lambda T: myrdal_yalkowsky_psat(T, Tb + z * u_tb, tau, hbn)))
    return psat, tuple(variations), f"estimated from the {tb.kind} boiling point (Myrdal–Yalkowsky)"


def _volatile(derived, name: str, entry_id: str | None) -> Volatile:
    if derived.identity is None:
        raise _Problem(f"component '{name}' has no structure")
    mol = parse_smiles(derived.identity.smiles)[0]
    source = _antoine_psat(derived) or _reference_psat(derived) or _estimated_psat(derived, mol)
    if source is None:
        raise _Problem(f"component '{name}' has neither Antoine coefficients nor a boiling point to estimate "
                       "its vapor pressure from")
    density = derived.get("density")
    force = derived.label("dominant_force")
    return Volatile(name, entry_id, derived.identity.smiles, derived.get("molar_mass").value,
                    density.value if density else None, source[0], source[1], source[2],
                    derived.get("flash_point"), unifac.unifac_groups(mol),
                    force.code if force else None, force.text if force else None, tuple(derived.hazard_alerts),
                    all(a.GetSymbol() in ("C", "H") for a in mol.GetAtoms()),
                    tuple((k, derived.get(k)) for k in HANSEN_KEYS if derived.get(k) is not None))


def inline_entry(mixture: Entry, index: int, comp: Component) -> Entry:
    """The throw-away substance entry of an inline component (derived like any other)."""
    return Entry(id=f"{mixture.id}--component-{index + 1}", path=mixture.path, name=comp.name, smiles=comp.smiles)


@dataclass(frozen=True)
class _Part:
    """One substance of the flattened composition and where it came from."""

    volatile: Volatile
    stated: str
    via: str | None


def _flatten(entry: Entry, components: Mapping[str, object], derive_inline
             ) -> tuple[list[_Part], tuple[float, ...], list[tuple[float, ...]]]:
    """The mixture's substances (nested mixtures opened at their nominal composition), their mass
    fractions at the nominal composition, and at every extreme composition the stated ranges allow
    (none when nothing is a range); the compositions are found on the stated basis, then converted."""
    comps = entry.composition
    vols: list[list[tuple[Volatile, float, str | None]]] = []  # per top-level component: (substance, share)
    for i, comp in enumerate(comps):
        if comp.entry_id is None:
            vols.append([(_volatile(derive_inline(inline_entry(entry, i, comp)), comp.name, None), 1.0, None)])
            continue
        derived = components[comp.entry_id]
        inner = getattr(derived, "mixture", None)
        if inner is None:
            vols.append([(_volatile(derived, derived.entry.name, comp.entry_id), 1.0, None)])
        else:
            nested = []
            for row in inner.rows:
                sub = components.get(row.entry_id) if row.entry_id else None
                if sub is None:
                    sub = derive_inline(Entry(id=f"{comp.entry_id}--{row.name}", path=derived.entry.path,
                                              name=row.name, smiles=row.smiles))
                nested.append((_volatile(sub, row.name, row.entry_id), row.mass_fraction.value / 100.0,
                               derived.entry.name))
            vols.append(nested)
    # each top-level component's molar mass and density (a nested mixture: mass-weighted, ideal volumes)
    M, rho = [], []
    for parts in vols:
        M.append(1.0 / sum(share / v.molar_mass for v, share, _ in parts))
        dens = [v.density for v, _, _ in parts]
        rho.append(None if None in dens else 1.0 / sum(share / v.density for v, share, _ in parts))
    basis = next((c.fraction.basis for c in comps if not c.fraction.balance), "mass")
    lows = [0.0 if c.fraction.balance else c.fraction.low for c in comps]
    highs = [1.0 if c.fraction.balance else c.fraction.high for c in comps]
    if basis == "volume" and None in rho:
        missing = [c.name for c, d in zip(comps, rho) if d is None]
        raise _Problem("volume fractions need each component's density; none is known for " + ", ".join(missing))
    out = [_Part(v, comp.fraction.text if via is None else f"{share:.3g} of {comp.fraction.text}", via)
           for comp, parts in zip(comps, vols) for v, share, via in parts]

    def spread(top: tuple[float, ...]) -> tuple[float, ...]:
        """Top-level fractions on the stated basis → mass fractions of the flattened substances."""
        w = mix.to_mass_fractions(top, basis, M, rho)
        return tuple(wi * share for wi, parts in zip(w, vols) for _, share, _ in parts)

    ranged = any(c.fraction.is_range for c in comps)
    corners = [spread(c) for c in mix.composition_corners(lows, highs)] if ranged else []
    return out, spread(mix.nominal_composition(lows, highs)), corners


@dataclass
class _State:
    """The equilibrium results at one composition."""

    w: tuple[float, ...]
    x: list[float]
    bubble: float
    dew: float
    p20: float
    p25: float
    p_store: float
    y20: list[float]
    flash: float | None


def _activity(vols: Sequence[Volatile]):
    """The activity-coefficient function, its name and why it is ideal (None when UNIFAC applies)."""
    missing = [v.name for v in vols if isinstance(v.groups, str)]
    if missing:
        return None, "ideal solution", ("no UNIFAC groups for " + ", ".join(missing)
                                        + ": activity coefficients taken as 1 (ideal solution)")
    groups = [v.groups for v in vols]
    gaps = unifac.missing_interactions(groups)
    if gaps:
        return None, "ideal solution", (f"UNIFAC lacks interaction parameters for {len(gaps)} group pair(s) "
                                        "of these components: activity coefficients taken as 1 (ideal solution)")
    model = unifac.UnifacMixture(groups)
    return model.gammas, "UNIFAC (original, Hansen et al. 1991 parameters)", None


def _solve(w, vols, gammas, store_T) -> _State:
    M = [v.molar_mass for v in vols]
    x = mix.mass_to_mole_fractions(w, M)
    psats = [v.psat for v in vols]
    bubble, _ = vle.bubble_temperature(P_ATM, x, psats, gammas)
    dew, _ = vle.dew_temperature(P_ATM, x, psats, gammas)
    p20, y20 = vle.bubble_pressure(T20, x, psats, gammas)
    p25, _ = vle.bubble_pressure(T25, x, psats, gammas)
    p_store, _ = vle.bubble_pressure(store_T, x, psats, gammas)
    flash = None
    flash_points = [v.flash_point.value if v.flash_point is not None else None for v in vols]
    if any(f is not None for f in flash_points):
        flash = mixture_flash.mixture_flash_point(x, flash_points, psats, gammas).T
    return _State(tuple(w), x, bubble, dew, p20, p25, p_store, list(y20), flash)


def _range_note(values: list[float], fmt) -> str:
    return f"{fmt(min(values))} to {fmt(max(values))} over the stated composition ranges"


@dataclass
class MixtureResult:
    values: dict[str, Value]
    labels: dict[str, Label]
    notes: list = field(default_factory=list)
    curve: tuple[Segment, ...] = ()
    alerts: tuple[Alert, ...] = ()
    facts: MixtureFacts | None = None
    storage: Assignment | None = None
    findings: list = field(default_factory=list)


def derive_mixture(entry: Entry, components: Mapping[str, object], locations: Mapping[str, Location] | None,
                   derive_inline) -> MixtureResult:
    """Everything derived for a mixture; ``components``: the ``Derived`` of each component entry id
    (and of the components of a component mixture); ``derive_inline(entry)`` derives an inline
    component. A mixture that cannot be derived gets a label saying why and no figures."""
    from builder.derive.entry import store_temperature

    values: dict[str, Value] = {}
    labels: dict[str, Label] = {}
    store_T = store_temperature(entry, locations)
    values["store_temperature"] = store_T
    values.update(entry.properties)
    try:
        parts, nominal, corners = _flatten(entry, components, derive_inline)
    except _Problem as exc:
        labels["mixture_problem"] = Label(f"Nothing derived for this mixture: {exc}",
                                          Provenance("rule", method="mixture-vle"))
        return MixtureResult(values, labels)
    vols = [p.volatile for p in parts]
    gammas, model_name, model_note = _activity(vols)
    ranged = bool(corners)
    try:
        states = [_solve(w, vols, gammas, store_T.value) for w in [nominal, *corners]]
    except vle.NoSolution as exc:
        labels["mixture_problem"] = Label(f"Nothing derived for this mixture: the phase equilibrium has no "
                                          f"solution ({exc})", Provenance("rule", method="mixture-vle"))
        return MixtureResult(values, labels)
    base = states[0]
    worst_bubble = min(states, key=lambda s: s.bubble)
    worst_p20 = max(states, key=lambda s: s.p20)
    M = [v.molar_mass for v in vols]

    # uncertainty from the components' vapor-pressure curves: each independent input moved by a
    # fraction of its standard uncertainty, to first order (builder.chem.mixture.temperature_uncertainty)
    inputs = [(i, vary) for i, v in enumerate(vols) for vary in v.variations]

    def curves(zs) -> list:
        out = [v.psat for v in vols]
        for (i, vary), z in zip(inputs, zs):
            if z:
                out[i] = vary(z)
        return out

    def u_temperature(state: _State, which: str) -> float:
        def solve(zs):
            if which == "bubble":
                return vle.bubble_temperature(P_ATM, state.x, curves(zs), gammas)[0]
            return vle.dew_temperature(P_ATM, state.x, curves(zs), gammas)[0]
        return mix.temperature_uncertainty(solve, [0.0] * len(inputs), [1.0] * len(inputs), step=0.1)

    def u_pressure(state: _State, T: float) -> float:
        return mix.temperature_uncertainty(lambda zs: vle.bubble_pressure(T, state.x, curves(zs), gammas)[0],
                                           [0.0] * len(inputs), [1.0] * len(inputs), step=0.1)

    model_word = "UNIFAC" if gammas is not None else "ideal solution"
    span = (lambda attr, f: "; " + _range_note([getattr(s, attr) for s in states], f)) if ranged else (lambda a, f: "")
    tk = lambda t: celsius_text(t, 1)
    mm = mix.mixture_molar_mass(base.x, M)
    values["molar_mass"] = computed(mm, "g/mol", "mixture-molar-mass")
    values["boiling_point"] = estimated(
        worst_bubble.bubble, "K", "mixture-bubble-point", u_temperature(worst_bubble, "bubble"),
        f"initial boiling point: bubble point at 101.325 kPa ({model_word})"
        + (f"; lowest over the composition ranges (nominal {tk(base.bubble)})" if ranged else ""))
    worst_dew = min(states, key=lambda s: s.dew)
    values["dew_point"] = estimated(worst_dew.dew, "K", "mixture-dew-point", u_temperature(worst_dew, "dew"),
                                    f"dew point at 101.325 kPa ({model_word})" + span("dew", tk))
    for key, attr, T in (("vapor_pressure_20C", "p20", T20), ("vapor_pressure_25C", "p25", T25),
                         ("vapor_pressure_store", "p_store", store_T.value)):
        worst = max(states, key=lambda s: getattr(s, attr))
        p = getattr(worst, attr)
        v = estimated(p, "Pa", "mixture-vle", u_pressure(worst, T),
                      f"bubble pressure ({model_word})" + ("; highest over the composition ranges" if ranged else ""))
        values[key] = Value(v.value, v.unit, v.provenance, v.uncertainty, (("at", T),))
    p20 = values["vapor_pressure_20C"]
    svc = exposure.saturated_vapor_concentration_ppm(p20.value)
    values["saturated_vapor_concentration_20C"] = Value(
        svc, "ppm", Provenance(inherited_kind(p20), method="saturated-vapor-concentration",
                               note="from the mixture's vapor pressure at 20 °C"),
        svc * p20.uncertainty / p20.value if p20.uncertainty else None)
    vapor_M = mix.mixture_molar_mass(worst_p20.y20, M)
    if vapor_M <= exposure.MAX_MOLAR_MASS:  # g/mol
        values["vapor_density_relative"] = Value(exposure.relative_vapor_density(vapor_M), "dimensionless",
                                                 Provenance("assumed", method="vapor-density-ideal-gas",
                                                            note="of the saturated vapor's mean molar mass at 20 °C"))
    if "density" not in values and all(v.density for v in vols):
        rho = 1.0 / sum(w / v.density for w, v in zip(base.w, vols))
        values["density"] = Value(rho, "kg/m**3", Provenance("estimated", method="mixture-density-ideal",
                                                             note="pure-liquid densities, ideal mixing of volumes"))

    if all(v.density for v in vols):
        phi = mix.mass_to_volume_fractions(base.w, [v.density for v in vols])
        values.update(blend_values([(dict(v.hansen), p) for v, p in zip(vols, phi)]))

    # flash point: stated wins; else Liaw's model, lowest over the composition ranges
    flammable = [v.flash_point is not None for v in vols]
    not_flammable = tuple(v.name for v, f in zip(vols, flammable) if not f)
    fp_estimate = None
    flash_states = [s for s in states if s.flash is not None]
    if flash_states:
        worst_fp = min(flash_states, key=lambda s: s.flash)
        fp_inputs = [v.flash_point.value if v.flash_point else 0.0 for v in vols]
        fp_u = [(v.flash_point.uncertainty or 0.0) if v.flash_point is not None else 0.0 for v in vols]

        def solve_fp(tf):
            return mixture_flash.mixture_flash_point(worst_fp.x, [t if f else None for t, f in zip(tf, flammable)],
                                                     [v.psat for v in vols], gammas).T
        u_fp = math.hypot(mix.temperature_uncertainty(solve_fp, fp_inputs, fp_u), U_FLASH_MODEL)
        kinds = {v.flash_point.kind for v in vols if v.flash_point is not None}
        fp_estimate = estimated(worst_fp.flash, "K", "liaw-mixture-flash-point", u_fp,
                                f"Le Chatelier over the components' flash points ({model_word}; from "
                                + ", ".join(sorted(kinds)) + " component flash points)"
                                + (f"; lowest over the composition ranges (nominal {tk(base.flash)})"
                                   if ranged and base.flash is not None else "")
                                + (f"; {', '.join(not_flammable)} taken as not flammable" if not_flammable else ""))
    fp = entry.properties.get("flash_point") or fp_estimate
    if fp is not None:
        values["flash_point"] = fp
    if fp_estimate is not None and fp_estimate is not fp:
        values["flash_point_estimate"] = fp_estimate
    result = FireResult()
    tb = values["boiling_point"]
    _category(entry, fp, tb, result)
    result.labels["volatility_band"] = _band(tb, bands.ROOM_TEMPERATURE, "at 20 °C, from the initial boiling point")
    if entry.catalog.process_temperature is not None:
        values["process_temperature"] = entry.catalog.process_temperature
        result.labels["volatility_band_process"] = _band(
            tb, entry.catalog.process_temperature.value,
            f"at the process temperature {celsius_text(entry.catalog.process_temperature.value, 0)}")
    labels.update(result.labels)
    labels["physical_state"] = Label("Liquid (a solution below its bubble point)" if tb.value > T20
                                     else "Gas or boiling liquid (bubble point below 20 °C)",
                                     Provenance(inherited_kind(tb), method="physical-state",
                                                note="from the mixture's initial boiling point"),
                                     "liquid" if tb.value > T20 else "gas")
    state = labels["physical_state"].code
    labels["physical_state_range"] = Label(state, labels["physical_state"].provenance, (state,))

    # rows of the composition table
    rows = []
    for i, (part, v) in enumerate(zip(parts, vols)):
        ws = [s.w[i] for s in states]
        xs = [s.x[i] for s in states]
        wv = _fraction_value(base.w[i], min(ws), max(ws), "mass", part.stated)
        xv = _fraction_value(base.x[i], min(xs), max(xs), "mole", part.stated)
        yv = Value(100 * base.y20[i], "%", Provenance("estimated", method="mixture-vle",
                                                             note=f"share of the saturated vapor at 20 °C ({model_word})"))
        rows.append(ComponentRow(v.name, v.entry_id, v.smiles, part.stated, wv, xv, yv, v.psat_basis,
                                 v.dominant_force, flammable[i], part.via))
    txy = _txy(vols, gammas) if len(vols) == 2 else None
    facts = MixtureFacts(tuple(rows), model_name, model_note, ranged, len(corners), _force_note(vols, base.x),
                         txy, not_flammable)

    # the components' alerts, each with the concentration it comes with
    alerts = []
    for i, v in enumerate(vols):
        share = _percent_text(min(s.w[i] for s in states), max(s.w[i] for s in states))
        for a in v.alerts:
            alerts.append(replace(a, text=f"{v.name} ({share} w/w): {a.text}", atoms=()))
    notes = handling.evaluate_rules(_facts(entry, values, labels, vols, state, store_T), formats=NOTE_FORMATS)
    curve = _curve(vols, base.x, gammas, store_T.value, tb.value)
    cat = labels.get("flammable_category")
    assignment = assign_group(entry.hazard_statements, alerts, cat.code if cat and isinstance(cat.code, int) else None,
                              state)
    result = MixtureResult(values, labels, notes, curve, tuple(alerts), facts, assignment, result.findings)
    return result


def _fraction_value(nominal: float, low: float, high: float, basis: str, stated: str) -> Value:
    """A fraction as a percentage Value at the nominal composition; its note gives the span over the ranges."""
    note = f"{basis} fraction from the stated {stated}"
    if high - low > 1e-9:
        note += f"; {100 * low:.3g}–{100 * high:.3g} % over the composition ranges"
    return Value(100 * nominal, "%", Provenance("computed", method="composition-basis", note=note))


def _percent_text(low: float, high: float) -> str:
    return f"{100 * low:.3g}–{100 * high:.3g} %" if high - low > 1e-9 else f"{100 * low:.3g} %"


def _force_note(vols: Sequence[Volatile], x: Sequence[float]) -> str:
    """A sentence on the forces between unlike molecules, from the components' dominant forces."""
    by_force: dict[str, list[str]] = {}
    for v, xi in sorted(zip(vols, x), key=lambda p: -p[1]):
        by_force.setdefault(v.dominant_force or "unclassified", []).append(v.name)
    words = {k: FORCE_WORDS.get(k, k) for k in by_force}
    if len(by_force) == 1:
        force = next(iter(by_force))
        return (f"Every component is held together mainly by {words[force]}, so like and unlike molecules "
                "attract each other in much the same way.")
    parts = [f"{', '.join(names)} ({words[f]})" for f, names in by_force.items()]
    text = "The components differ in their dominant force: " + "; ".join(parts) + "."
    if "hydrogen-bonding" in by_force:
        text += (" Molecules that hydrogen-bond to each other lose some of those bonds when mixed with molecules "
                 "that cannot take part, so the vapor pressure tends to be higher than Raoult's law alone gives "
                 "(activity coefficients above one).")
    elif "dipole-dipole" in by_force and "dispersion" in by_force:
        text += (" Polar molecules attract each other more than they attract the non-polar ones, so the mixture "
                 "tends to evaporate a little more readily than its components' average.")
    return text


def _facts(entry, values, labels, vols, state, store_T) -> dict:
    cat = labels.get("flammable_category")
    fp = values.get("flash_point")
    vd = values.get("vapor_density_relative")
    band = labels.get("volatility_band")
    density = values.get("density")
    facts = {
        "flammable_category": cat.code if cat else None,
        "flash_point": fp.value if fp else None,
        "boiling_point": values["boiling_point"].value,
        "store_max_temperature": store_T.value,
        "store_max_temperature_basis": "assumed default" if store_T.kind == "assumed" else "stated",
        "vapor_density_ratio": vd.value if vd else None,
        "is_hydrocarbon": all(v.hydrocarbon for v in vols),
        "density": density.value if density else None,
        "volatility_band": band.code if band else None,
        "physical_state": state, "state_for_rules": state, "store_state_for_rules": state,
    }
    if entry.catalog.process_temperature is not None:
        facts["process_temperature"] = entry.catalog.process_temperature.value
    return {k: v for k, v in facts.items() if v is not None}


def _curve(vols, x, gammas, store_T: float, bubble: float) -> tuple[Segment, ...]:
    hi = min(max(store_T + 20.0, 333.15, bubble + 10.0), bubble + 40.0)
    temps = [CURVE_LOW + (hi - CURVE_LOW) * i / (CURVE_POINTS - 1) for i in range(CURVE_POINTS)]
    psats = [v.psat for v in vols]
    pressures = [vle.bubble_pressure(T, x, psats, gammas)[0] for T in temps]
    return (Segment("mixture", tuple(round(t, 3) for t in temps), tuple(pressures)),)


def _txy(vols, gammas, points: int = 21):
    psats = [v.psat for v in vols]
    xs, bubbles, dews = [], [], []
    for i in range(points):
        x1 = i / (points - 1)
        x = [x1, 1.0 - x1]
        xs.append(round(x1, 6))
        bubbles.append(vle.bubble_temperature(P_ATM, x, psats, gammas)[0])
        dews.append(vle.dew_temperature(P_ATM, x, psats, gammas)[0])
    return tuple(xs), tuple(bubbles), tuple(dews)
