"""The intermolecular-force section of a datasheet, as values with provenance.

``forces_of(mol, boiling_point)`` runs ``builder.chem.forces.force_profile`` and wraps
its numbers as ``Value`` objects (exact counts ``computed``, geometry-based numbers
``estimated``, the force excess ``rule`` or ``estimated`` as its boiling point is).
``force_reasons(profile)`` writes the sentences that explain the classification from the
profile's facts (the chemistry module returns numbers and codes, never sentences).
"""
from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field

from rdkit import Chem

from builder.chem.dipole import METHOD_MMFF, POLAR_THRESHOLD_D
from builder.chem.features import ionic_kind
from builder.chem.forces import (
    FORCE_EXCESS_NOTABLE_K,
    ForceProfile,
    StereoSpread,
    force_profile,
)
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
    return Forces(dominant, fp.present, force_reasons(fp), frozen_map(numbers), fp.shape, fp.notes,
                  frozen_map(sorted(missing.items())))


def ionic_reason(mol) -> str | None:
    """The sentence saying why a substance is ionic (``builder.chem.features.ionic_kind``), or None."""
    found = ionic_kind(mol)
    if found is None:
        return None
    kind, details = found
    if kind == "salt":
        return f"It is a salt of the ions {', '.join(details)}, held together by ionic attraction."
    if kind == "ion":
        return f"It is an ion ({details[0]}), held by ionic attraction to its counter-ions."
    if kind == "zwitterion":
        return ("It is a zwitterion: its + and − charges sit on separate groups and "
                "attract neighbouring molecules ionically.")
    a, b = details
    return f"The {a}–{b} bond joins an s-block metal to a much more electronegative atom, so it is mainly ionic."


def force_reasons(fp: ForceProfile) -> tuple[str, ...]:
    """The sentences that explain a force profile: the ions (if any), dispersion and size, shape,
    the dipole moment, unspecified stereo, hydrogen bonding and the force excess, in that order."""
    ionic = ionic_reason(Chem.MolFromSmiles(fp.smiles)) if "ionic" in fp.present else None
    reasons = [ionic] if ionic else []
    size = f"{fp.electron_count} electrons"
    if fp.polarizability_A3 is not None:
        size += f", polarizability {fp.polarizability_A3:.1f} Å³"
    if ionic:
        reasons.append(f"Dispersion acts as well, growing with size ({size}), but it is small beside "
                       "the attraction between the ions.")
    else:
        reasons.append(f"Dispersion acts between all molecules; it grows with size ({size}).")
    if fp.shape == "rod-like" and fp.heavy_atom_count > 3 and fp.chain:
        reasons.append("Its chain-like shape gives a large contact area, which strengthens dispersion.")
    elif fp.shape == "sphere-like" and fp.heavy_atom_count > 3:
        reasons.append("Its compact, ball-like shape limits contact area and so dispersion.")
    bonds = fp.polar_bonds
    if fp.dipole_D is not None:
        moment = f"{fp.dipole_D:.1f} ± {fp.dipole_uncertainty_D:.1f} D"
        if fp.dipole_D > POLAR_THRESHOLD_D:
            origin = f" from its {', '.join(bonds)} bonds" if bonds else ""
            reasons.append(f"It has a net dipole moment of about {moment}{origin}, "
                           f"above the {POLAR_THRESHOLD_D} D threshold for dipole–dipole attraction.")
        elif bonds:
            reasons.append(f"The {', '.join(bonds)} bond dipoles cancel by symmetry "
                           f"(net moment about {moment}), so it is non-polar.")
        elif fp.atom_count == 1:
            reasons.append("A single atom has no permanent dipole moment.")
        else:
            reasons.append(f"It has no polar bonds (net moment about {moment}).")
    elif "dipole_D" in fp.not_computed:
        reasons.append("Its dipole moment was not computed (the molecule is too large for the 3D step), "
                       "so whether dipole–dipole attraction acts is not assessed.")
    if fp.stereo is not None:
        reasons.append(_stereo_reason(fp.stereo))
    acc_text = " and ".join(_count(n, f"{el} atom") for el, n in fp.acceptor_atoms)
    if fp.hbond_donors and fp.hbond_acceptors:
        don_text = " and ".join(f"{g} ({n} H)" for g, n in fp.donor_groups)
        reasons.append(f"Its {don_text} can donate hydrogen bonds to the lone pairs of "
                       f"its {acc_text}, so the molecules hydrogen-bond to each other.")
    elif fp.hbond_acceptors:
        reasons.append(f"It has no H on N, O or F, so it cannot hydrogen-bond to itself, "
                       f"but the lone pairs of its {acc_text} accept hydrogen bonds from water or alcohols.")
    elif fp.hbond_donors:
        reasons.append("It has H on N, O or F but no free N, O or F lone pair, so it forms "
                       "hydrogen bonds only with acceptor molecules.")
    if fp.force_excess_K is not None and not ionic:
        reasons.append(_excess_reason(fp.force_excess_K, fp.dominant, fp.flat, fp.heavy_elements))
    return tuple(reasons)


def _stereo_reason(stereo: StereoSpread) -> str:
    if stereo.mirror_images_only:
        return "One stereocentre is unspecified; its two mirror-image forms have the same dipole moment."
    kinds = stereo.unspecified
    what = " and ".join(_count(kinds.count(k), k) for k in sorted(set(kinds)))
    moments = stereo.isomer_moments_D
    if len(moments) == 1:
        return f"The stereo of {what} is unspecified, but the 3D embedding formed only one stereoisomer."
    low, high = min(moments), max(moments)
    if not stereo.decides_polarity:
        return (f"The stereo of {what} is unspecified; the {len(moments)} stereoisomers "
                f"sampled agree on polarity ({low:.1f}–{high:.1f} D).")
    return (f"The stereo of {what} is unspecified and decides the polarity: the "
            f"sampled stereoisomers range from {low:.1f} to {high:.1f} D. The largest "
            "is reported; give the stereo in the SMILES to settle it.")


def _excess_reason(excess: float, dominant: str = "dispersion", flat: bool = False,
                   heavy: list[str] | tuple[str, ...] = ()) -> str:
    """What the force excess says, in words that agree with the dominant force: a polar molecule
    is never told it gains nothing beyond dispersion, a non-polar one never that forces beyond
    dispersion add.  Flat (aromatic, planar) molecules and molecules with heavy atoms are told
    why the n-alkane of equal mass is the wrong yardstick for them."""
    limit = FORCE_EXCESS_NOTABLE_K
    polar = dominant != "dispersion"
    heavy_text = " and ".join(heavy)
    if excess > limit:
        head = f"It boils {excess:.0f} K above the n-alkane of the same molar mass"
        if polar:
            return f"{head}: the forces beyond dispersion add noticeably to cohesion."
        if flat:
            return (f"{head}. It has no polar attraction to explain this: flat molecules (an aromatic ring, "
                    "a planar frame) stack face to face and touch over more of their surface than chains "
                    "of equal mass, so their dispersion is stronger; the n-alkane is the wrong yardstick "
                    "for a flat molecule.")
        return (f"{head}. It has no polar attraction to explain this: its compact shape (rings, few "
                "loose ends) packs closely, so dispersion is stronger than between chains of equal mass.")
    if excess < -limit:
        head = f"It boils {-excess:.0f} K below the n-alkane of the same molar mass"
        if heavy:
            why = (f"its {heavy_text} atoms add mass with fewer electrons per gram than CH₂, so the "
                   "n-alkane of equal mass is larger in electrons and contact and the comparison by mass "
                   "understates its cohesion")
            if polar:
                return (f"{head}: {why}. This does not mean the {dominant.replace('-', '–')} attraction "
                        "is absent.")
            return f"{head}: {why}; it gains nothing beyond dispersion."
        if polar:
            return (f"{head}: by this measure the {dominant.replace('-', '–')} attraction adds little; "
                    "the molecule is more compact than a chain of equal mass, which weakens its dispersion.")
        return f"{head}: it gains nothing beyond dispersion, and its compact shape limits contact."
    head = (f"It boils within {limit:.0f} K of the n-alkane of the same molar mass "
            f"({excess:+.0f} K)".replace("-", "−"))
    if polar:
        return (f"{head}: dispersion supplies most of the cohesion; the "
                f"{dominant.replace('-', '–')} attraction adds little to the boiling point.")
    return f"{head}: dispersion supplies nearly all of the cohesion."


def _plural(n: int, noun: str) -> str:
    return noun if n == 1 else {"centre": "centres", "double bond": "double bonds"}.get(noun, noun + "s")


def _count(n: int, noun: str) -> str:
    return f"{n} {_plural(n, noun)}"
