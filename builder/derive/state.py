"""Melting point, physical state and the classes that follow from the state.

``state_values(entry, mol, values, store_temperature)`` returns ``StateResult``:

- values: ``melting_point`` (stated, else the estimate), ``melting_point_estimate``,
  ``critical_temperature_estimate`` (gases), ``lower_flammable_limit_estimate`` and
  ``upper_flammable_limit_estimate`` (gases without stated limits);
- labels: ``physical_state`` (at 20 °C, 101.325 kPa; code the most likely state),
  ``physical_state_range`` (code: every state the 90 % intervals allow),
  ``physical_state_store`` (at the highest store temperature), ``flammable_gas_category``
  (UN GHS ch. 2.2), ``gas_under_pressure`` (ch. 2.5), ``boiling_point_missing`` (the
  reason there is no boiling point);
- facts for the handling rules; findings for ``cohesion check``.

The *safer reading* of a state that the intervals leave open is the most mobile state
allowed (a liquid-or-solid is handled as a liquid, a gas-or-liquid as a gas); the
flammable-liquid category is derived whenever "liquid" is among the states allowed.
"""
from __future__ import annotations

from dataclasses import dataclass, field

from rdkit import Chem

from builder.chem import state as chem_state
from builder.chem.boiling import check_structure
from builder.chem.boiling_small import SMALL_ELEMENTS
from builder.chem.joback import joback_groups, joback_tc
from builder.chem.melting import estimate_melting_point
from builder.chem.molar_mass import molar_mass
from builder.core.diagnostics import Diagnostic
from builder.core.model import Entry
from builder.core.units import celsius_text
from builder.core.values import Label, Provenance, Value, estimated

#: why no boiling point can be estimated, in words, by the estimator's status (prefix)
NO_TB_REASONS = {
    "more than one fragment": "a salt or a mixture of molecules: salts melt and decompose rather than boil "
                              "near any store temperature, and no estimator here applies",
    "no carbon": "no carbon: the structure model covers organic molecules only",
    "element other than": "an element outside the structure model (metals, Si, P, B and others): "
                          "no estimator here applies",
    "radical": "a radical: no estimator here applies",
    "isotope label": "an isotope-labelled structure: no estimator here applies",
    "net charge": "an ion: ions do not boil as such",
    "charge-separated": "a charge-separated structure: no estimator here applies",
}


@dataclass
class StateResult:
    values: dict[str, Value] = field(default_factory=dict)
    labels: dict[str, Label] = field(default_factory=dict)
    facts: dict = field(default_factory=dict)
    findings: list[Diagnostic] = field(default_factory=list)

    @property
    def liquid_possible(self) -> bool:
        rng = self.labels.get("physical_state_range")
        return rng is None or "liquid" in rng.code


def _u(v: Value | None) -> float:
    return (v.uncertainty or 0.0) if v is not None and v.kind == "estimated" else 0.0


def _kind(*inputs: Value | None) -> str:
    return "estimated" if any(v is not None and v.kind == "estimated" for v in inputs) else "rule"


def _state_label(reading, T_text: str, tm: Value | None, tb: Value | None, kind: str,
                 T: float = chem_state.T_REFERENCE) -> tuple[Label, Label]:
    words = " or ".join([reading.state] + [s for s in reversed(reading.alternatives) if s != reading.state])
    why = []
    if not reading.clear:
        for name, v in (("melting point", tm), ("boiling point", tb)):
            if v is not None and v.kind == "estimated" and v.uncertainty:
                half = chem_state.K90 * v.uncertainty
                if abs(v.value - T) <= half:  # only the point whose interval straddles T
                    why.append(f"{name} {celsius_text(v.value, 0, unit=False)} ± {half:.0f} °C")
        if tm is None:
            why.append("melting point unknown")
    text = words[0].upper() + words[1:] + (f" ({'; '.join(why)})" if why else "")
    basis = [f"{v.kind} {n}" for n, v in (("melting point", tm), ("boiling point", tb)) if v is not None]
    note = f"{T_text}, 101.325 kPa; from the " + " and the ".join(basis)
    if not reading.clear:
        note += f"; the rules read it as {reading.safer} (the safer reading)"
    prov = Provenance(kind, method="physical-state", note=note)
    return Label(text, prov, reading.state), Label(", ".join(reading.alternatives), prov, reading.alternatives)


def _melting(entry: Entry, mol: Chem.Mol | None, result: StateResult) -> Value | None:
    stated = entry.properties.get("melting_point")
    estimate = None
    if mol is not None:
        est = estimate_melting_point(mol)
        if est.value_K is not None:
            lo, hi = est.interval90_K
            estimate = estimated(est.value_K, "K", "melting-joback-trees", est.uncertainty_K,
                                 f"90 % interval {celsius_text(lo, 0, unit=False)} to {celsius_text(hi, 0)}")
            result.values["melting_point_estimate"] = estimate
    chosen = stated or estimate
    if chosen is not None:
        result.values["melting_point"] = chosen
    return chosen


def _boiling_reason(entry: Entry, mol: Chem.Mol | None) -> str:
    if entry.type != "substance":
        return f"a {entry.type}: its boiling range depends on the composition; state it from the supplier's data"
    if mol is None:
        return "no structure is recorded"
    if _has_metal(mol) and len(Chem.GetMolFrags(mol)) == 1:
        return ("a metal or metal compound: metals and their compounds boil far above any store temperature, "
                "and no estimator here applies")
    status = check_structure(mol)
    for prefix, words in NO_TB_REASONS.items():
        if status.startswith(prefix):
            return words
    if mol.GetNumHeavyAtoms() > 60 or molar_mass(mol) > 1500:
        return "a very large molecule (polymer-like): it decomposes before it boils"
    return f"no estimator applies ({status})"


def _has_metal(mol: Chem.Mol) -> bool:
    return any(a.GetAtomicNum() not in SMALL_ELEMENTS for a in mol.GetAtoms())


def _is_salt(mol: Chem.Mol) -> bool:
    return len(Chem.GetMolFrags(mol)) > 1 and any(a.GetFormalCharge() for a in mol.GetAtoms())


def _state_without_points(mol: Chem.Mol | None) -> tuple[str, str] | None:
    """(state, reason) for a structure with neither point known: salts and metals (common practice)."""
    if mol is None:
        return None
    if _is_salt(mol):
        return "solid", ("a salt: salts of small ions are solids at 20 °C (common practice; ionic liquids "
                         "are the exception, state the melting point for one)")
    symbols = {a.GetSymbol() for a in mol.GetAtoms()}
    if _has_metal(mol) and len(Chem.GetMolFrags(mol)) == 1:
        if symbols == {"Hg"}:
            return "liquid", "mercury, the one metal liquid at 20 °C (common practice)"
        return "solid", ("a metal or metal compound: solid at 20 °C (common practice; gallium and caesium "
                         "melt just above, mercury is liquid)")
    return None


def _critical_temperature(mol: Chem.Mol, tb: Value) -> Value:
    counts, unassigned = joback_groups(mol)
    tc = joback_tc(counts, tb.value) if counts and not unassigned else None
    if tc is not None:
        u = chem_state.joback_tc_uncertainty(tc, tb.value, _u(tb))
        return estimated(tc, "K", "joback-tc", u, f"from the {tb.kind} boiling point")
    tc, u = chem_state.guldberg_tc(tb.value, _u(tb))
    return estimated(tc, "K", "guldberg-tc", u, f"from the {tb.kind} boiling point; no Joback groups for this structure")


def _element_counts(mol: Chem.Mol) -> dict[str, int]:
    out: dict[str, int] = {}
    for atom in Chem.AddHs(mol).GetAtoms():
        out[atom.GetSymbol()] = out.get(atom.GetSymbol(), 0) + 1
    return out


def _flammable_gas(entry: Entry, mol: Chem.Mol | None, result: StateResult) -> None:
    lfl = entry.properties.get("lower_flammable_limit")
    ufl = entry.properties.get("upper_flammable_limit")
    note = "from the stated flammability limits"
    kind = "rule"
    if lfl is None and mol is not None:
        counts = _element_counts(mol)
        if set(counts) <= {"C", "H", "O", "N"} and counts.get("C", 0) > 0:
            limits = chem_state.jones_limits(counts.get("C", 0), counts.get("H", 0), counts.get("O", 0))
            if limits is not None:
                lfl = estimated(limits[0], "%", "jones-flammability-limits", chem_state.JONES_U_REL * limits[0],
                                "0.55 x the stoichiometric concentration")
                result.values["lower_flammable_limit_estimate"] = lfl
                if ufl is None:
                    ufl = estimated(limits[1], "%", "jones-flammability-limits",
                                    chem_state.JONES_U_REL * limits[1], "3.5 x the stoichiometric concentration")
                    result.values["upper_flammable_limit_estimate"] = ufl
                note, kind = "from flammability limits estimated by Jones's correlation", "estimated"
    if lfl is None:
        return
    cat = chem_state.flammable_gas_category(lfl.value, ufl.value if ufl else None)  # vol % (the loader keeps %)
    if cat is None:
        return
    code = chem_state.FLAMMABLE_GAS_STATEMENTS[cat]
    text = f"Flammable gas, category {cat} — {code}"
    declared = set(entry.hazard_statements)
    if "H232" in declared:  # pyrophoric gas: category 1A, only when stated (UN GHS Rev. 10 ch. 2.2)
        cat, text = "1A", "Flammable gas, category 1A, pyrophoric (H232 declared) — H220, H232"
    for h, words in (("H230", "chemically unstable, category A"), ("H231", "chemically unstable, category B")):
        if h in declared:
            text += f"; {words} ({h} declared)"
    result.labels["flammable_gas_category"] = Label(text, Provenance(kind, method="ghs-flammable-gas", note=note), cat)


def state_values(entry: Entry, mol: Chem.Mol | None, values: dict[str, Value], store_temperature: Value) -> StateResult:
    """Melting point, state at 20 °C and in store, and the state's classes (see the module text)."""
    result = StateResult()
    tm = _melting(entry, mol, result)
    tb = values.get("boiling_point")
    if tb is None:
        result.labels["boiling_point_missing"] = Label(
            "No boiling point: " + _boiling_reason(entry, mol),
            Provenance("rule", method="boiling-point-domain", note="none stated, none estimated"))
    reading = chem_state.physical_state(chem_state.T_REFERENCE, tm.value if tm else None, _u(tm),
                                        tb.value if tb else None, _u(tb))
    if reading is None:
        fallback = _state_without_points(mol)
        if fallback is None:
            return result
        state, why = fallback
        prov = Provenance("rule", method="physical-state", note=f"at 20 °C and in store; {why}")
        text = f"{state[0].upper()}{state[1:]} ({why.split(':')[0].split(' (')[0].split(', the')[0]})"
        result.labels["physical_state"] = Label(text, prov, state)
        result.labels["physical_state_range"] = Label(state, prov, (state,))
        result.labels["physical_state_store"] = Label(text, prov, state)
        result.facts = {"physical_state": state, "state_for_rules": state, "store_state_for_rules": state}
        return result
    kind = _kind(tm, tb)
    result.labels["physical_state"], result.labels["physical_state_range"] = _state_label(
        reading, "at 20 °C", tm, tb, kind)
    store_reading = chem_state.physical_state(store_temperature.value, tm.value if tm else None, _u(tm),
                                              tb.value if tb else None, _u(tb))
    store_text = f"at {celsius_text(store_temperature.value, 0)} (highest store temperature)"
    store_label, _ = _state_label(store_reading, store_text, tm, tb, kind, store_temperature.value)
    result.labels["physical_state_store"] = store_label
    result.facts = {"physical_state": reading.state, "state_for_rules": reading.safer,
                    "store_state_for_rules": store_reading.safer, "state_clear": reading.clear,
                    "state_alternatives": " or ".join(reading.alternatives)}
    if mol is not None:
        result.facts["is_organic"] = any(a.GetAtomicNum() == 6 for a in mol.GetAtoms())
    if "gas" in reading.alternatives:
        if tb is not None and mol is not None:
            tc = _critical_temperature(mol, tb)
            result.values["critical_temperature_estimate"] = tc
            group = chem_state.gas_under_pressure_group(tc.value)
            lo = chem_state.gas_under_pressure_group(tc.value - chem_state.K90 * tc.uncertainty)
            hi = chem_state.gas_under_pressure_group(tc.value + chem_state.K90 * tc.uncertainty)
            alt = [g for g in dict.fromkeys((lo, group, hi)) if g != group]
            text = f"Gas under pressure (in a cylinder): {group}" + \
                   (f" (or {' or '.join(alt)} within the critical temperature's 90 % interval)" if alt else "") + " — H280"
            note = f"from the estimated critical temperature {celsius_text(tc.value, 0)}"
            if reading.state == "gas" and store_reading.safer != "gas":
                # kept below its boiling point (a dewar or cold store): stated by the store's rating
                group, text = "refrigerated liquefied", "Refrigerated liquefied gas (kept below its boiling point) — H281"
                note = f"the store's highest temperature {celsius_text(store_temperature.value, 0)} is below the boiling point"
            result.labels["gas_under_pressure"] = Label(
                text, Provenance("estimated" if group != "refrigerated liquefied" else "rule",
                                 method="ghs-gas-under-pressure", note=note), group)
            result.facts["gas_group"] = group
        _flammable_gas(entry, mol, result)
    if entry.hazard_statements and entry.path != "<command line>":
        message = chem_state.check_declared_for_state(entry.hazard_statements, reading.alternatives)
        if message:
            line, col = entry.line_of("hazard_statements")
            result.findings.append(Diagnostic(entry.path, line, col, "warning",
                                              f"hazard statements disagree with the physical state: {message}",
                                              "check the H-codes against the melting and boiling points"))
    declared = set(entry.hazard_statements)
    result.facts["declared_toxic_by_inhalation"] = bool(declared & {"H330", "H331"})
    result.facts["declared_oxidising_gas"] = "H270" in declared
    if "gas" in reading.alternatives:
        result.facts["flammable_gas"] = ("flammable_gas_category" in result.labels
                                         or bool(declared & {"H220", "H221", "H232"}))
    return result
