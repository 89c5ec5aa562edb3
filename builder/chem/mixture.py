"""Composition arithmetic for mixtures: bases, ranges and how uncertainties carry through.

Contents
--------
- :func:`to_mass_fractions`, :func:`mass_to_mole_fractions`, :func:`mass_to_volume_fractions`:
  change of basis (mass, volume, mole) with molar masses and pure-liquid densities; volume
  fractions assume no volume change on mixing (ideal mixing of volumes, common practice).
- :func:`mixture_molar_mass`: the mole-fraction average of the molar masses.
- :func:`composition_corners`: every extreme composition allowed by stated ranges (the
  vertices of the box of ranges cut by the plane Σw = 1); a property that varies
  monotonically with each fraction takes its extremes there, which is how a range on a
  supplier's sheet is carried to the worst case for safety.
- :func:`nominal_composition`: the composition at the middle of every range.
- :func:`temperature_uncertainty`: the standard uncertainty of a temperature solved from
  ``F(T) = target`` when ``F``'s inputs carry uncertainties (first-order propagation).

Units: molar masses in g/mol, densities in kg/m³, fractions of one.
"""
from __future__ import annotations

import itertools
import math
from collections.abc import Callable, Sequence

BASES = ("mass", "volume", "mole")


def to_mass_fractions(fractions: Sequence[float], basis: str, molar_masses: Sequence[float],
                      densities: Sequence[float | None] | None = None) -> list[float]:
    """Mass fractions from fractions on ``basis`` (normalised to sum to one).

    Mole: w_i = x_i M_i / Σ x_j M_j. Volume: w_i = φ_i ρ_i / Σ φ_j ρ_j (pure-liquid densities;
    ideal mixing of volumes).

    >>> [round(w, 4) for w in to_mass_fractions([0.5, 0.5], "mole", [46.07, 18.015])]
    [0.7189, 0.2811]
    """
    if basis == "mass":
        weights = list(fractions)
    elif basis == "mole":
        weights = [f * m for f, m in zip(fractions, molar_masses)]
    elif basis == "volume":
        if densities is None or any(d is None or d <= 0 for d in densities):
            raise ValueError("volume fractions need every component's liquid density")
        weights = [f * d for f, d in zip(fractions, densities)]  # type: ignore[operator]
    else:
        raise ValueError(f"unknown basis {basis!r}; expected one of {BASES}")
    total = sum(weights)
    if total <= 0:
        raise ValueError("the fractions sum to zero")
    return [w / total for w in weights]


def mass_to_mole_fractions(w: Sequence[float], molar_masses: Sequence[float]) -> list[float]:
    """x_i = (w_i / M_i) / Σ (w_j / M_j).

    >>> [round(x, 3) for x in mass_to_mole_fractions([0.4, 0.6], [46.07, 18.015])]
    [0.207, 0.793]
    """
    moles = [wi / m for wi, m in zip(w, molar_masses)]
    total = sum(moles)
    return [n / total for n in moles]


def mass_to_volume_fractions(w: Sequence[float], densities: Sequence[float]) -> list[float]:
    """φ_i = (w_i / ρ_i) / Σ (w_j / ρ_j), ideal mixing of volumes.

    >>> [round(p, 3) for p in mass_to_volume_fractions([0.5, 0.5], [789.3, 997.0])]
    [0.558, 0.442]
    """
    volumes = [wi / d for wi, d in zip(w, densities)]
    total = sum(volumes)
    return [v / total for v in volumes]


def mixture_molar_mass(x: Sequence[float], molar_masses: Sequence[float]) -> float:
    """M = Σ x_i M_i (g/mol).

    >>> round(mixture_molar_mass([0.207, 0.793], [46.07, 18.015]), 2)
    23.82
    """
    return sum(xi * m for xi, m in zip(x, molar_masses))


def composition_corners(lows: Sequence[float], highs: Sequence[float], tolerance: float = 1e-9
                        ) -> list[tuple[float, ...]]:
    """Every vertex of {w : low_i ≤ w_i ≤ high_i, Σ w_i = 1}, in a fixed order, without repeats.

    A balance component is written as the range 0–1. At a vertex every fraction but at most
    one sits at a bound, so the vertices are found by fixing all but one fraction at a bound
    and solving for the last. Exact fractions (low = high) add no vertices; the count grows
    as 2^(number of ranges).

    >>> composition_corners([0.1, 0.0], [0.2, 1.0])     # 10-20 % and the balance
    [(0.1, 0.9), (0.2, 0.8)]
    >>> composition_corners([0.2, 0.3, 0.0], [0.3, 0.5, 1.0])
    [(0.2, 0.3, 0.5), (0.2, 0.5, 0.3), (0.3, 0.3, 0.4), (0.3, 0.5, 0.2)]
    """
    n = len(lows)
    if n == 0:
        return []
    varying = [i for i in range(n) if highs[i] - lows[i] > tolerance]
    found: list[tuple[float, ...]] = []
    seen: set[tuple[float, ...]] = set()
    frees = varying or [n - 1]
    for free in frees:
        others = [i for i in varying if i != free]
        for bounds in itertools.product((0, 1), repeat=len(others)):
            w = list(lows)
            for i, b in zip(others, bounds):
                w[i] = highs[i] if b else lows[i]
            w[free] = 0.0
            w[free] = 1.0 - sum(w)
            if not lows[free] - tolerance <= w[free] <= highs[free] + tolerance:
                continue
            w[free] = min(max(w[free], lows[free]), highs[free])
            key = tuple(round(v, 9) for v in w)
            if key not in seen:
                seen.add(key)
                found.append(key)
    return sorted(found)


def nominal_composition(lows: Sequence[float], highs: Sequence[float]) -> tuple[float, ...]:
    """The composition with every range at the same share t of its width, t chosen so the fractions
    sum to one (t = ½ when the ranges are symmetric about 100 %; the balance is a range 0–1).

    >>> nominal_composition([0.1, 0.0], [0.2, 1.0])
    (0.15, 0.85)
    >>> nominal_composition([0.2, 0.3, 0.0], [0.3, 0.5, 1.0])
    (0.25, 0.4, 0.35)
    """
    stated = [i for i in range(len(lows)) if not (lows[i] == 0.0 and highs[i] == 1.0)]
    balance = [i for i in range(len(lows)) if i not in stated]
    w = [(lows[i] + highs[i]) / 2 if i in stated else 0.0 for i in range(len(lows))]
    rest = 1.0 - sum(w)
    if balance and rest >= 0.0:
        w[balance[0]] = rest
        return tuple(round(v, 12) for v in w)
    low_sum, width = sum(lows), sum(h - lo for lo, h in zip(lows, highs))
    t = 0.0 if width == 0 else (1.0 - low_sum) / width
    return tuple(round(lo + t * (h - lo), 12) for lo, h in zip(lows, highs))


def temperature_uncertainty(solve: Callable[[Sequence[float]], float], inputs: Sequence[float],
                            uncertainties: Sequence[float], step: float = 0.5) -> float:
    """Standard uncertainty of ``T = solve(inputs)`` by first-order propagation:

    .. math:: u_T^2 = \\sum_i \\left(\\frac{\\partial T}{\\partial q_i}\\right)^2 u_i^2

    with each derivative a central difference of ``step`` (in the input's units; inputs whose
    uncertainty is zero are not varied). Independent inputs are assumed.

    >>> round(temperature_uncertainty(lambda q: q[0] + 2 * q[1], [300.0, 10.0], [1.0, 0.5]), 6)
    1.414214
    """
    total = 0.0
    for i, u in enumerate(uncertainties):
        if not u:
            continue
        up, down = list(inputs), list(inputs)
        up[i] += step
        down[i] -= step
        slope = (solve(up) - solve(down)) / (2 * step)
        total += (slope * u) ** 2
    return math.sqrt(total)
