"""Two-solvent blends that stay one liquid.

A substitute blend is first placed where its volume-averaged parameters come closest to the
target (``builder.chem.solvency.optimal_blend_fraction``). Volume averaging assumes one liquid
phase, so each blend is then checked with ``builder.chem.miscibility`` (UNIFAC, 25 °C):

- its parts form one liquid at every composition, or at the optimal one: kept as it is;
- the optimal composition lies inside the predicted miscibility gap: moved to the nearer edge of
  the gap where Ra is lower (Ra² is a convex quadratic in the volume fraction, so the best
  one-phase composition lies on an edge), and kept when the moved blend still meets the rules of
  a blend (each part at least ``min_fraction``, closer to the target than either part alone,
  within ``max_ra``); otherwise left out;
- it cannot be checked (a part without a single structure, UNIFAC groups or a liquid molar
  volume): kept, and marked as not checked.

Mole fractions x and volume fractions φ convert through the liquid molar volumes V:
φ_a = x_a V_a / (x_a V_a + x_b V_b).
"""
from __future__ import annotations

from dataclasses import dataclass

from builder.chem import solvency

ONE_PHASE = "one phase"
MOVED = "moved to one phase"
NOT_CHECKED = "not checked"


@dataclass(frozen=True)
class BlendCheck:
    """A listed candidate and, for a blend, how its mixing was checked (``ONE_PHASE``,
    ``MOVED`` with the optimal fraction of its first part ``optimum``, or ``NOT_CHECKED``)."""

    candidate: solvency.Candidate
    mixing: str | None = None
    optimum: float | None = None


def volume_gap(a_id: str, b_id: str, by_id: dict) -> tuple[float, float] | tuple[()] | None:
    """The volume fractions of ``a`` (low, high) between which the a + b liquid may split into
    two phases at 25 °C; ``()`` when it forms one liquid at every composition; None when it
    cannot be checked. The ends are grid points inside the gap (``miscibility.STEP`` apart)."""
    from rdkit import Chem

    from builder.chem.miscibility import miscibility_gap
    from builder.chem.unifac import MissingInteractionParameters, unifac_groups

    parts = []
    for eid in (a_id, b_id):
        d = by_id.get(eid)
        volume = d.get("molar_volume") if d is not None else None
        if d is None or d.identity is None or volume is None or volume.value <= 0:
            return None
        groups = unifac_groups(Chem.MolFromSmiles(d.identity.smiles))
        if isinstance(groups, str):
            return None
        parts.append((groups, volume.value))
    (ga, va), (gb, vb) = parts
    try:
        gap = miscibility_gap(ga, gb)
    except MissingInteractionParameters:
        return None
    if gap is None:
        return ()
    return tuple(_volume_fraction(x, va, vb) for x in gap)  # type: ignore[return-value]


def _volume_fraction(x_a: float, v_a: float, v_b: float) -> float:
    x_a = min(max(x_a, 0.0), 1.0)
    return x_a * v_a / (x_a * v_a + (1.0 - x_a) * v_b)


def blend_separates(candidate: solvency.Candidate, by_id: dict) -> bool | None:
    """For a blend candidate (``candidate.blend``: two ids and their volume fractions): True when
    its parts at its composition may separate into two liquid phases at 25 °C (UNIFAC:
    qualitative), False when they form one, None when it cannot be checked."""
    (a, phi_a), (b, _) = candidate.blend
    gap = volume_gap(a, b, by_id)
    if gap is None:
        return None
    return bool(gap) and gap[0] <= phi_a <= gap[1]


def one_phase_blends(found: list, target: solvency.Solvent, solvents: dict, by_id: dict, max_ra: float,
                     min_fraction: float = 0.05) -> tuple[list[BlendCheck], int]:
    """The candidates ``found`` (safest first) with each blend checked, moved or left out as the
    module docstring says, in safety order again; and how many blends were left out.

    ``solvents``: the ranking records by id (``derive.solvency.catalog_solvents``); ``by_id``:
    the Derived entries by id (for structures and molar volumes)."""
    from builder.chem.miscibility import STEP

    kept: list[tuple[tuple, BlendCheck]] = []
    left_out = 0
    for c in found:
        if not c.blend:
            kept.append((solvency.safety_key(solvents[c.id], c.ra), BlendCheck(c)))
            continue
        (a, phi), (b, _) = c.blend
        gap = volume_gap(a, b, by_id)
        if gap is None or not gap or not gap[0] <= phi <= gap[1]:
            mixing = NOT_CHECKED if gap is None else ONE_PHASE
            record = solvency.blend_record(solvents[a], solvents[b], phi)
            kept.append((solvency.safety_key(record, c.ra), BlendCheck(c, mixing)))
            continue
        moved = _moved(solvents[a], solvents[b], target, gap, by_id, max_ra, min_fraction, STEP)
        if moved is None:
            left_out += 1
            continue
        record, candidate = moved
        kept.append((solvency.safety_key(record, candidate.ra), BlendCheck(candidate, MOVED, phi)))
    kept.sort(key=lambda item: item[0])
    return [check for _, check in kept], left_out


def _moved(a: solvency.Solvent, b: solvency.Solvent, target: solvency.Solvent, gap: tuple[float, float],
           by_id: dict, max_ra: float, min_fraction: float, step: float):
    """The blend at the better one-phase edge of ``gap`` as (record, Candidate), or None."""
    volumes = [by_id[i].get("molar_volume").value for i in (a.id, b.id)]
    x_gap = [phi * volumes[1] / (phi * volumes[1] + (1.0 - phi) * volumes[0]) for phi in gap]  # back to x_a
    edges = (_volume_fraction(x_gap[0] - step, *volumes), _volume_fraction(x_gap[1] + step, *volumes))
    alone = min(solvency.hansen_distance(a.hansen, target.hansen), solvency.hansen_distance(b.hansen, target.hansen))
    best = None
    for phi in edges:
        phi = round(phi, 3)
        if min(phi, 1.0 - phi) < min_fraction:
            continue
        record = solvency.blend_record(a, b, phi)
        ra = solvency.hansen_distance(record.hansen, target.hansen)
        if ra > max_ra or ra >= alone:
            continue
        if best is None or ra < best[0]:
            best = (ra, phi, record)
    if best is None:
        return None
    ra, phi, record = best
    better, worse = solvency.compare(record, target)
    blend = ((a.id, phi), (b.id, round(1.0 - phi, 3)))
    return record, solvency.Candidate(None, blend, tuple(record.hansen), round(ra, 3), better, worse)
