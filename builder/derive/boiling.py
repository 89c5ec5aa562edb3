"""Boiling point for a datasheet: the stated value wins, the structure estimate stands beside it.

``boiling_values(entry, mol)`` returns the values to show (``boiling_point`` chosen,
``boiling_point_estimate`` and, when both exist, ``boiling_point_residual``) and any
finding for ``cohesion check`` when a stated value is far from the estimate.
"""
from __future__ import annotations

from rdkit import Chem

from builder.chem.boiling import estimate_boiling_point
from builder.chem.boiling_small import small_domain, small_estimate
from builder.core.diagnostics import Diagnostic
from builder.core.model import Entry
from builder.core.methods import method_for_estimator
from builder.core.units import celsius_text
from builder.core.values import Provenance, Value, estimated

SIGMA_LIMIT = 3.0


def boiling_values(entry: Entry, mol: Chem.Mol | None) -> tuple[dict[str, Value], list[Diagnostic]]:
    values: dict[str, Value] = {}
    findings: list[Diagnostic] = []
    stated = entry.properties.get("boiling_point")
    estimate = None
    if mol is not None:
        result = estimate_boiling_point(mol)
        if result.value_K is None and small_domain(mol) == "OK":
            result = small_estimate(mol)  # outside the organic model: noble gases, halogens, hydrides...
        if result.value_K is not None:
            note = None
            if result.interval90_K:
                lo, hi = result.interval90_K
                note = f"90 % interval {celsius_text(lo, 0, unit=False)} to {celsius_text(hi, 0)}"
            estimate = estimated(result.value_K, "K", method_for_estimator(result.method), result.uncertainty_K, note)
            values["boiling_point_estimate"] = estimate
    if stated is not None:
        values["boiling_point"] = stated
        if estimate is not None and estimate.uncertainty:
            residual = stated.value - estimate.value
            values["boiling_point_residual"] = Value(residual, "K delta", Provenance(
                "rule", method="boiling-residual-check", note="stated minus estimated"))
            if abs(residual) > SIGMA_LIMIT * estimate.uncertainty:
                line, col = entry.line_of("properties.boiling_point.value")
                findings.append(Diagnostic(
                    entry.path, line, col, "warning",
                    f"boiling point {celsius_text(stated.value, 1)} is {abs(residual):.0f} K from the structure "
                    f"estimate {celsius_text(estimate.value, 0, unit=False)} ± {estimate.uncertainty:.0f} °C "
                    f"(more than {SIGMA_LIMIT:.0f}σ)", "check the unit or the structure"))
    elif estimate is not None:
        values["boiling_point"] = estimate
    return values, findings
