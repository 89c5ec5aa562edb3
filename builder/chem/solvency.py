"""Solvency distance, solubility spheres, blends and safer substitutes (Hansen parameters).

Contents
--------
- ``hansen_distance(a, b)``: Ra = √(4ΔδD² + ΔδP² + ΔδH²) [MPa^½].
- ``relative_energy_difference(ra, r0)``, ``red_class(red)``: RED = Ra/R0 and its class.
- ``blend_parameters(parts)``: volume-fraction average of the parameters.
- ``optimal_blend_fraction(a, b, target)``: the volume fraction of ``a`` in an a+b blend that
  brings the blend closest to ``target`` (analytical optimum, clipped to [0, 1]).
- ``Solvent``, ``Candidate``, ``Comparison``, ``rank_substitutes(target, candidates, max_ra)``:
  catalog liquids (and, when asked, two-solvent blends) within ``max_ra`` of a target, ranked
  by safety, each with what it is better and worse at than the target.

Parameters are plain ``(delta_d, delta_p, delta_h)`` triples in MPa^½.

Conventions
-----------
- The factor 4 on the dispersion term and RED = Ra/R0 (inside a polymer's solubility sphere
  when RED < 1) are Hansen's [1]_.
- Borderline: 1 ≤ RED ≤ ``BORDERLINE_RED`` = 1.1.  Hansen treats RED near 1 as the uncertain
  edge of the sphere (spheres are fitted to good/bad solvent tests); the width 0.1 is our
  choice, not a published criterion.
- Blend parameters are volume-fraction averages, δX,blend = Σ φi δX,i (Hansen [1]_, common
  practice), with no volume change on mixing.

The quadratic optimum: with w = (4, 1, 1), a blend φ·a + (1 − φ)·b has
Ra²(φ) = Σ w_k (φ(a_k − b_k) + b_k − t_k)², whose minimum is at
φ* = Σ w_k (a_k − b_k)(t_k − b_k) / Σ w_k (a_k − b_k)², clipped to [0, 1].

Safety ordering (``safety_key``, lexicographic, safest first):

1. number of serious health hazard statements (``SERIOUS_HEALTH``): carcinogenicity, germ cell
   mutagenicity, reproductive toxicity (any category), acute toxicity categories 1-3, specific
   target organ toxicity (single exposure categories 1-2, repeated exposure), skin corrosion and
   respiratory sensitisation (the classes and categories behind each code: GHS Rev. 10 annex 3);
2. GHS flammable-liquid category: not classified, then 4, 3, 2, 1 (GHS Rev. 10 ch. 2.6);
3. number of the other declared health hazard statements (H300-H373);
4. volatility band: low, medium, high; unknown ranks as high (conservative);
5. number of structural hazard alerts;
6. flash point, higher first; unknown after every known value;
7. Ra to the target, smaller first; then the id.

Which codes count as serious, and that they come before flammability, is this catalog's rule,
not a published one: substituting a solvent usually aims first at chronic and life-threatening
health effects (a suspected carcinogen is not made "safer" by a flammable replacement that lacks
it, nor the reverse), and a lighter health hazard should not outweigh a fire hazard.

A blend takes the less safe value of its two parts for every criterion (worse category,
lower flash point, more volatile band, the union of alerts and hazard statements): blends
can flash below both parts (minimum-flash-point mixtures), so even this is not a bound.

References
----------
.. [1] C. M. Hansen, Hansen Solubility Parameters: A User's Handbook, 2nd ed., CRC Press,
   Boca Raton (2007), ch. 1 (Ra, RED, volume-averaged blends).
.. [2] United Nations, GHS Rev. 10 (2023), ch. 2.6 (flammable liquid categories).
"""
from __future__ import annotations

import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field
from itertools import combinations

import numpy as np

Params = Sequence[float]

WEIGHTS = (4.0, 1.0, 1.0)
BORDERLINE_RED = 1.1
VOLATILITY_ORDER = {"low": 0, "medium": 1, "high": 2}
CAUTION = ("Solvency is one criterion: compatibility with the process and materials, toxicity, "
           "regulations and a trial decide whether a substitute is suitable.")


def hansen_distance(a: Params, b: Params) -> float:
    """Hansen distance Ra [MPa^½] between two parameter triples (δD, δP, δH).

    Ra² = 4(δD,a − δD,b)² + (δP,a − δP,b)² + (δH,a − δH,b)² (Hansen 2007).

    >>> hansen_distance((18.0, 1.4, 2.0), (15.8, 8.8, 19.4))   # toluene to ethanol: √(19.36 + 54.76 + 302.76)
    19.41...
    """
    return math.sqrt(sum(w * (x - y) ** 2 for w, x, y in zip(WEIGHTS, a, b, strict=True)))


def relative_energy_difference(ra: float, r0: float) -> float:
    """RED = Ra / R0 for a sphere of radius ``r0`` [MPa^½].

    >>> relative_energy_difference(5.0, 10.0)
    0.5
    """
    if r0 <= 0:
        raise ValueError("the sphere radius must be positive")
    return ra / r0


def red_class(red: float) -> str:
    """'inside' (RED < 1), 'borderline' (1 ≤ RED ≤ 1.1) or 'outside' (see the module docstring).

    >>> [red_class(x) for x in (0.99, 1.0, 1.1, 1.2)]
    ['inside', 'borderline', 'borderline', 'outside']
    """
    if red < 1.0:
        return "inside"
    return "borderline" if red <= BORDERLINE_RED else "outside"


def blend_parameters(parts: Sequence[tuple[Params, float]]) -> tuple[float, float, float]:
    """Volume-fraction average of the parameters of ``parts`` = [(params, φ), ...].

    Fractions are normalised to sum to one.

    >>> blend_parameters([((18.0, 1.4, 2.0), 0.5), ((15.8, 8.8, 19.4), 0.5)])
    (16.9, 5.1, 10.7)
    """
    total = sum(phi for _, phi in parts)
    if total <= 0:
        raise ValueError("volume fractions must add up to more than zero")
    return tuple(round(sum(p[k] * phi for p, phi in parts) / total, 10) for k in range(3))


def optimal_blend_fraction(a: Params, b: Params, target: Params) -> tuple[float, float]:
    """Volume fraction φ of ``a`` in an a + b blend minimising Ra to ``target``, and that Ra.

    The analytical minimum of the quadratic Ra²(φ) (module docstring), clipped to [0, 1];
    when a and b have equal parameters, φ = 1.

    >>> phi, ra = optimal_blend_fraction((18.0, 1.4, 2.0), (15.8, 8.8, 19.4), (16.9, 5.1, 10.7))
    >>> round(phi, 6), round(ra, 6)
    (0.5, 0.0)
    """
    diff = [x - y for x, y in zip(a, b, strict=True)]
    denominator = sum(w * d * d for w, d in zip(WEIGHTS, diff))
    if denominator == 0:
        phi = 1.0
    else:
        numerator = sum(w * d * (t - y) for w, d, t, y in zip(WEIGHTS, diff, target, b))
        phi = min(max(numerator / denominator, 0.0), 1.0)
    return phi, hansen_distance(blend_parameters([(a, phi), (b, 1.0 - phi)]), target)


@dataclass(frozen=True)
class Solvent:
    """A catalog liquid as the ranking sees it.

    ``flammable_category`` is the GHS ch. 2.6 category (1-4) or None when not classified as a
    flammable liquid; ``flash_point_K`` None when unknown; ``volatility_band`` 'low', 'medium',
    'high' or None (unknown); ``health_h_codes`` the declared health hazard statements.
    """

    id: str
    hansen: tuple[float, float, float]
    flash_point_K: float | None = None
    flammable_category: int | None = None
    volatility_band: str | None = None
    alert_ids: frozenset[str] = frozenset()
    health_h_codes: frozenset[str] = frozenset()


@dataclass(frozen=True)
class Comparison:
    """One criterion on which a candidate differs from the target: the two values."""

    criterion: str
    candidate: object
    target: object


@dataclass(frozen=True)
class Candidate:
    """A substitute: a catalog liquid (``blend`` empty) or a blend [(id, volume fraction), ...]."""

    id: str | None
    blend: tuple[tuple[str, float], ...]
    hansen: tuple[float, float, float]
    ra: float
    better: tuple[Comparison, ...] = field(default=())
    worse: tuple[Comparison, ...] = field(default=())


SERIOUS_HEALTH = frozenset({
    "H300", "H301", "H310", "H311", "H330", "H331",   # acute toxicity, categories 1-3
    "H314",                                           # skin corrosion
    "H334",                                           # respiratory sensitisation
    "H340", "H341", "H350", "H351",                   # mutagenicity, carcinogenicity
    "H360", "H361", "H362",                           # reproductive toxicity, effects via lactation
    "H370", "H371", "H372", "H373",                   # target organ toxicity
})
"""Health hazard statements ranked first (module docstring); a code with a suffix (H350i,
H361d, H360FD) counts by its first four characters."""


def serious_health(codes) -> frozenset[str]:
    """The serious ones among health hazard statements ``codes``.

    >>> sorted(serious_health({"H319", "H336", "H351"}))
    ['H351']
    >>> sorted(serious_health({"H361d", "H373", "H304"}))
    ['H361d', 'H373']
    """
    return frozenset(c for c in codes if c[:4] in SERIOUS_HEALTH)


def _flam_rank(category: int | None) -> int:
    return 0 if category is None else 5 - category


def _vol_rank(band: str | None) -> int:
    return VOLATILITY_ORDER.get(band, 2) if band is not None else 2


def safety_key(s: Solvent, ra: float) -> tuple:
    """The sort key of the safety ordering (module docstring), safest first."""
    flash = -s.flash_point_K if s.flash_point_K is not None else math.inf
    serious = len(serious_health(s.health_h_codes))
    return (serious, _flam_rank(s.flammable_category), len(s.health_h_codes) - serious,
            _vol_rank(s.volatility_band), len(s.alert_ids), flash, round(ra, 9), s.id)


def compare(candidate: Solvent, target: Solvent) -> tuple[tuple[Comparison, ...], tuple[Comparison, ...]]:
    """What ``candidate`` is better and worse at than ``target``, criterion by criterion.

    For the hazard statements and the alerts, each side of a comparison is the whole sorted set;
    a candidate is better when the target has codes it lacks and worse when it has codes the
    target lacks (it can be both)."""
    better: list[Comparison] = []
    worse: list[Comparison] = []

    def note(criterion: str, cand_rank: float, targ_rank: float, cand_value: object, targ_value: object) -> None:
        if cand_rank < targ_rank:
            better.append(Comparison(criterion, cand_value, targ_value))
        elif cand_rank > targ_rank:
            worse.append(Comparison(criterion, cand_value, targ_value))

    note("flammable_category", _flam_rank(candidate.flammable_category), _flam_rank(target.flammable_category),
         candidate.flammable_category, target.flammable_category)
    if candidate.flash_point_K is not None and target.flash_point_K is not None:
        note("flash_point_K", -candidate.flash_point_K, -target.flash_point_K,
             candidate.flash_point_K, target.flash_point_K)
    note("volatility_band", _vol_rank(candidate.volatility_band), _vol_rank(target.volatility_band),
         candidate.volatility_band, target.volatility_band)
    for criterion, cand_set, targ_set in (("health_h_codes", candidate.health_h_codes, target.health_h_codes),
                                           ("alert_ids", candidate.alert_ids, target.alert_ids)):
        both = (tuple(sorted(cand_set)), tuple(sorted(targ_set)))
        if targ_set - cand_set:
            better.append(Comparison(criterion, *both))
        if cand_set - targ_set:
            worse.append(Comparison(criterion, *both))
    return tuple(better), tuple(worse)


def blend_record(a: Solvent, b: Solvent, phi: float) -> Solvent:
    """The blend as the ranking sees it: the less safe part on every criterion."""
    flashes = [f for f in (a.flash_point_K, b.flash_point_K) if f is not None]
    cats = [c for c in (a.flammable_category, b.flammable_category) if c is not None]
    bands = [a.volatility_band, b.volatility_band]
    band = None if None in bands else max(bands, key=_vol_rank)
    return Solvent(
        id=f"{a.id}+{b.id}",
        hansen=blend_parameters([(a.hansen, phi), (b.hansen, 1.0 - phi)]),
        flash_point_K=min(flashes) if len(flashes) == 2 else None,
        flammable_category=min(cats) if cats else None,
        volatility_band=band,
        alert_ids=a.alert_ids | b.alert_ids,
        health_h_codes=a.health_h_codes | b.health_h_codes,
    )


def _within(pool: Sequence[Solvent], centre: Params, max_ra: float, params: np.ndarray | None = None) -> list[Solvent]:
    """The members of ``pool`` that may lie within ``max_ra`` of ``centre``: a vectorised
    pre-selection with a margin, so that ``hansen_distance`` alone decides at the border.
    ``params``: the members' parameters as an (n, 3) array, when the caller has them."""
    if not pool:
        return []
    if params is None:
        params = np.asarray([s.hansen for s in pool], dtype=float)
    d = (params - np.asarray(centre, dtype=float)) * np.sqrt(np.asarray(WEIGHTS, dtype=float))
    near = np.einsum("ij,ij->i", d, d) <= (max_ra + 1e-6) ** 2
    return [s for s, keep in zip(pool, near.tolist(), strict=True) if keep]


def rank_substitutes(target: Solvent, candidates: Sequence[Solvent], max_ra: float,
                     blends: bool = False, min_fraction: float = 0.05) -> list[Candidate]:
    """Candidates within ``max_ra`` [MPa^½] of ``target``, safest first (``safety_key``).

    ``target`` itself (same id) is skipped.  With ``blends``, every pair of candidates is
    blended at its optimal volume fraction (``optimal_blend_fraction``); a blend is listed when
    each part is at least ``min_fraction`` of it and it comes closer to the target than either
    part alone.  Each candidate carries what it is better and worse at than the target.

    >>> tol = Solvent("toluene", (18.0, 1.4, 2.0), 277.0, 2, "medium", health_h_codes=frozenset({"H304", "H361d"}))
    >>> xyl = Solvent("xylene", (17.8, 1.0, 3.1), 300.0, 3, "medium", health_h_codes=frozenset({"H304"}))
    >>> [c.id for c in rank_substitutes(tol, [tol, xyl], max_ra=4.0)]
    ['xylene']
    """
    return list(iter_substitutes(target, candidates, max_ra, blends, min_fraction))


def iter_substitutes(target: Solvent, candidates: Sequence[Solvent], max_ra: float,
                     blends: bool = False, min_fraction: float = 0.05, *, params: np.ndarray | None = None,
                     prefixes: dict | None = None) -> Iterator[Candidate]:
    """``rank_substitutes`` one candidate at a time: each is compared with the target only when
    it is asked for, so taking the first few of a long list costs little.

    For a caller that ranks many targets against one catalog: ``params``, the candidates'
    parameters as an (n, 3) array in their order, and ``prefixes``, each candidate's
    ``safety_key(candidate, 0.0)[:-2]`` by id (the part of its key that does not depend on Ra)."""
    keep = [c.id != target.id for c in candidates]
    pool = [c for c, k in zip(candidates, keep, strict=True) if k]
    if params is not None and len(pool) != len(candidates):
        params = params[np.asarray(keep, dtype=bool)]
    scored: list[tuple[tuple, Solvent, tuple, float]] = []

    def add(record: Solvent, blend: tuple[tuple[str, float], ...]) -> None:
        ra = hansen_distance(record.hansen, target.hansen)
        if ra <= max_ra:
            prefix = prefixes.get(record.id) if prefixes is not None and not blend else None
            key = prefix + (round(ra, 9), record.id) if prefix is not None else safety_key(record, ra)
            scored.append((key, record, blend, ra))

    for c in _within(pool, target.hansen, max_ra, params):
        add(c, ())
    if blends:
        for a, b in combinations(sorted(pool, key=lambda s: s.id), 2):
            phi, ra = optimal_blend_fraction(a.hansen, b.hansen, target.hansen)
            if min(phi, 1.0 - phi) < min_fraction:
                continue
            if ra >= min(hansen_distance(a.hansen, target.hansen), hansen_distance(b.hansen, target.hansen)):
                continue
            phi = round(phi, 3)
            add(blend_record(a, b, phi), ((a.id, phi), (b.id, round(1.0 - phi, 3))))
    scored.sort(key=lambda item: item[0])  # the keys end in the record's id: no two are equal
    for _, record, blend, ra in scored:
        better, worse = compare(record, target)
        yield Candidate(None if blend else record.id, blend, tuple(record.hansen), round(ra, 3), better, worse)
