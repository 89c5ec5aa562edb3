"""The intermolecular-force section of a datasheet, as values with provenance.

``forces_of(mol, boiling_point)`` runs ``builder.chem.forces.force_profile`` and wraps
its numbers as ``Value`` objects (exact counts ``computed``, geometry-based numbers
``estimated``, the force excess ``rule`` or ``estimated`` as its boiling point is).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Mapping

from rdkit import Chem

from builder.chem.dipole import METHOD_MMFF
from builder.chem.forces import force_profile
from builder.core.model import frozen_map
from builder.core.values import Label, Provenance, Value, computed, estimated

#: ForceProfile field → the value name it becomes here
MISSING_NAMES = {"dipole_D": "dipole_moment", "npr1": "shape_npr1", "npr2": "shape_npr2"}

FORCE_WORDS = {"dispersion": "London dispersion", "dipole-dipole": "dipole–dipole",
               "hydrogen-bonding": "hydrogen bonding", "ionic": "ionic"}


@dataclass(frozen=True)
class Forces:
    """Which forces act, the dominant one, why, and the numbers behind them."""

    dominant: Label
    present: tuple[str, ...]
    reasons: tuple[str, ...]
    numbers: Mapping[str, Value] = field(default_factory=frozen_map)
    shape: str | None = None
    notes: tuple[str, ...] = ()
    #: value name → why it was not computed (e.g. "not computed: too large ..."), shown in its place
    missing: Mapping[str, str] = field(default_factory=frozen_map)

    def as_dict(self) -> dict:
        out = {"dominant": self.dominant.code, "present": list(self.present), "reasons": list(self.reasons)}
        for name, value in self.numbers.items():
            out[name] = value.as_dict()
        if self.shape:
            out["shape"] = self.shape
        if self.notes:
            out["notes"] = list(self.notes)
        if self.missing:
            out["not_computed"] = dict(self.missing)
        return out


def forces_of(mol: Chem.Mol, boiling_point: Value | None) -> Forces:
    fp = force_profile(mol, boiling_point.value if boiling_point is not None else None)
    numbers: dict[str, Value] = {
        "electron_count": computed(fp.electron_count, "count", "electron-count"),
        "hbond_donors": computed(fp.hbond_donors, "count", "hbond-counts"),
        "hbond_acceptors": computed(fp.hbond_acceptors, "count", "hbond-counts"),
    }
    if fp.polarizability_A3 is not None:
        numbers["polarizability"] = estimated(fp.polarizability_A3, "A**3", "polarizability-lorentz-lorenz", None)
    if fp.dipole_D is not None:
        numbers["dipole_moment"] = estimated(fp.dipole_D, "D", "dipole-mmff-ensemble", fp.dipole_uncertainty_D,
                                             None if fp.dipole_method == METHOD_MMFF else fp.dipole_method)
    if fp.npr1 is not None:
        numbers["shape_npr1"] = estimated(fp.npr1, "dimensionless", "shape-npr", None, "I1/I3")
        numbers["shape_npr2"] = estimated(fp.npr2, "dimensionless", "shape-npr", None, "I2/I3")
    if math.isfinite(fp.surface_area_A2):  # not for dummy atoms ("*"), which have no radius
        numbers["surface_area"] = estimated(fp.surface_area_A2, "A**2", "surface-area-labute", None)
    if fp.force_excess_K is not None and boiling_point is not None:
        if boiling_point.kind == "estimated":
            numbers["force_excess"] = estimated(fp.force_excess_K, "K delta", "force-excess",
                                                boiling_point.uncertainty, "from the estimated boiling point")
        else:
            numbers["force_excess"] = Value(fp.force_excess_K, "K delta", Provenance(
                "rule", method="force-excess", note=f"from the {boiling_point.kind} boiling point"))
    basis = "dipole moment estimated from 3D geometry" if "dipole-dipole" in fp.present or fp.dipole_D else None
    missing = {MISSING_NAMES[k]: why for k, why in sorted(fp.not_computed.items())}
    if "dipole_moment" in missing:
        basis = "dipole moment not computed (too large for the 3D step): dipole–dipole attraction not assessed"
    dominant = Label(FORCE_WORDS[fp.dominant], Provenance("rule", method="force-classification", note=basis),
                     fp.dominant)
    return Forces(dominant, fp.present, fp.reasons, frozen_map(numbers), fp.shape, fp.notes,
                  frozen_map(sorted(missing.items())))
