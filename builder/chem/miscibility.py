"""Whether two liquids mix in all proportions: the miscibility gap of a binary from UNIFAC.

Contents
--------
- ``miscibility_gap(groups_a, groups_b, T)``: the range of mole fractions of ``a`` over which the
  binary splits into two liquid phases, or None when it is one phase at every composition.
- ``splits(groups_a, groups_b, x_a, T)``: whether the binary at mole fraction ``x_a`` lies inside
  that range.

Method
------
A liquid mixture is stable as one phase where its molar Gibbs energy of mixing lies on its own
lower convex hull; where it lies above the hull, two phases on the common tangent have a lower
Gibbs energy and the liquid splits (the tangent-plane condition of phase stability; Prausnitz,
Lichtenthaler and de Azevedo, Molecular Thermodynamics of Fluid-Phase Equilibria, 3rd ed. (1999),
ch. 12, from memory). For a binary, in units of RT:

    Δg(x) = x ln(x γ_a) + (1 − x) ln((1 − x) γ_b)

with γ from original UNIFAC (``builder.chem.unifac``). Δg is evaluated on ``GRID`` compositions
from 0.005 to 0.995; the gap is the span of grid points more than ``TOLERANCE`` above the lower
convex hull, so its ends are known to the grid spacing (0.005).

Valid range and error: UNIFAC's parameters were fitted to vapor–liquid data, and
liquid–liquid splits computed from them are qualitative (they often overstate the gap; separate
LLE parameter tables exist): for methanol + cyclohexane the gap closes only between 420 and
450 K, against a measured critical solution temperature near 318 K; the n-butanol + water gap at
25 °C, 0.025-0.475 mole fraction butanol, is close to the measured 0.02-0.49 (both from memory).
Checked against four binaries with known behaviour at 25 °C (tests/chem/test_miscibility.py). A split found here means "may separate; check before use",
and no split does not prove full miscibility.
"""
from __future__ import annotations

import math
from collections.abc import Sequence

from builder.chem.unifac import Groups, MissingInteractionParameters, activity_coefficients, missing_interactions

GRID = 199
STEP = 0.99 / (GRID - 1)
"""Spacing of the composition grid (mole fraction): a gap's ends are known to within it."""
TOLERANCE = 1e-6
T_DEFAULT = 298.15


def _gibbs_of_mixing(groups: Sequence[Groups], T: float) -> tuple[list[float], list[float]]:
    xs = [0.005 + i * STEP for i in range(GRID)]
    gs = []
    for x in xs:
        ga, gb = activity_coefficients(T, [x, 1.0 - x], groups)
        gs.append(x * math.log(x * ga) + (1.0 - x) * math.log((1.0 - x) * gb))
    return xs, gs


def miscibility_gap(groups_a: Groups, groups_b: Groups, T: float = T_DEFAULT) -> tuple[float, float] | None:
    """The mole fractions of ``a`` (low, high) between which the a+b liquid splits at ``T`` [K], or None.

    Raises ``MissingInteractionParameters`` when UNIFAC has no parameter for a pair of groups.

    n-Butanol and water at 25 °C (measured about 0.02 to 0.49, from memory); ethanol and toluene
    mix in all proportions:

    >>> from rdkit import Chem
    >>> from builder.chem.unifac import unifac_groups
    >>> g = {s: unifac_groups(Chem.MolFromSmiles(s)) for s in ("CCCCO", "O", "CCO", "Cc1ccccc1")}
    >>> [round(x, 3) for x in miscibility_gap(g["CCCCO"], g["O"])]
    [0.025, 0.475]
    >>> miscibility_gap(g["CCO"], g["Cc1ccccc1"]) is None
    True
    """
    groups = (groups_a, groups_b)
    missing = missing_interactions(groups)
    if missing:
        raise MissingInteractionParameters(missing)
    xs, gs = _gibbs_of_mixing(groups, T)
    hull: list[int] = []
    for i in range(len(xs)):  # lower convex hull, left to right (monotone chain)
        while len(hull) >= 2:
            i1, i2 = hull[-2], hull[-1]
            if (gs[i2] - gs[i1]) * (xs[i] - xs[i1]) >= (gs[i] - gs[i1]) * (xs[i2] - xs[i1]):
                hull.pop()
            else:
                break
        hull.append(i)
    above = []
    for left, right in zip(hull, hull[1:]):
        for i in range(left + 1, right):
            on_hull = gs[left] + (gs[right] - gs[left]) * (xs[i] - xs[left]) / (xs[right] - xs[left])
            if gs[i] - on_hull > TOLERANCE:
                above.append(xs[i])
    return (min(above), max(above)) if above else None


def splits(groups_a: Groups, groups_b: Groups, x_a: float, T: float = T_DEFAULT) -> bool:
    """True when the a+b liquid at mole fraction ``x_a`` of ``a`` lies inside its miscibility gap."""
    gap = miscibility_gap(groups_a, groups_b, T)
    return gap is not None and gap[0] <= x_a <= gap[1]
