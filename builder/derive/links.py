"""Cross-links between entries, computed from the derived catalog; each says why it is there.

Relations:

- ``isomer``: same molecular formula (reciprocal);
- ``homologue``: same structure class and formulas differing by whole CH2 units (reciprocal);
  the structure class (``builder.chem.series.structure_class``, worked out while deriving) is the
  ring count, the count of each functional group in ``builder.chem.series.FUNCTIONAL_GROUPS``, the heteroatom counts and
  the number of branch points;
- ``contrast``: molar mass within ``CONTRAST_MASS_RATIO`` of each other but a different
  dominant force (reciprocal) — the boiling points are shown side by side;
- ``near-bp``: the ``NEAR_BP_COUNT`` entries with the nearest boiling points (not reciprocal);
- ``component`` and ``contained-in``: a mixture and the catalog entries its composition names,
  with the fraction (both ways).
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from builder.chem.identity import formula_counts
from builder.chem.series import structure_class
from builder.core.units import celsius_text
from builder.derive.entry import Derived

CONTRAST_MASS_RATIO = 0.10
#: contrast links per entry: the materials nearest in molar mass (within the ratio) that a different
#: force holds together; a long list teaches nothing more, and it grew with the catalog
CONTRAST_COUNT = 5
NEAR_BP_COUNT = 3

@dataclass(frozen=True)
class Link:
    """A link from one entry to another, with the relation and a sentence saying why."""

    relation: str
    target: str  # entry id
    why: str


def links_text(links) -> str:
    """An entry's links as one text, for the keys of the pages that show them (quicker than the
    links' ``repr``: 250,000 links at 10,000 entries). Relations and entry ids hold no separator
    (they are names of our own and file names); each sentence is preceded by its length, since a
    component's fraction is the entry's own text: two different lists never give one text.

    >>> links_text([Link("isomer", "b", "same formula C4H10"), Link("near-bp", "c", "x")])
    'isomer\\x1fb\\x1f18:same formula C4H10\\x1enear-bp\\x1fc\\x1f1:x'
    """
    return "\x1e".join(f"{l.relation}\x1f{l.target}\x1f{len(l.why)}:{l.why}" for l in links)


@lru_cache(maxsize=16384)
def _ch2_signature(formula: str) -> tuple[int, int, frozenset]:
    """(carbons, hydrogens, the other elements' counts) of a formula, what a CH2 step leaves alone."""
    counts = formula_counts(formula)[0]
    return (counts.get("C", 0), counts.get("H", 0),
            frozenset((el, n) for el, n in counts.items() if el not in ("C", "H") and n))


def ch2_difference(formula_a: str, formula_b: str) -> int | None:
    """n when formula_b = formula_a + n·CH2 (n may be negative), else None."""
    (ca, ha, rest_a), (cb, hb, rest_b) = _ch2_signature(formula_a), _ch2_signature(formula_b)
    n = cb - ca
    if n == 0 or hb - ha != 2 * n or rest_a != rest_b:
        return None
    return n


def _series(d: Derived) -> tuple:
    """The structure class of a single molecule: as derived, else worked out here."""
    return d.series_class if d.series_class is not None else structure_class(d.identity.smiles)


def _bp(d: Derived) -> float | None:
    v = d.get("boiling_point")
    return v.value if v is not None else None


def _force(d: Derived) -> str | None:
    lab = d.label("dominant_force")
    return lab.code if lab is not None else None


@lru_cache(maxsize=16384)
def _celsius(kelvin: float) -> str:
    return celsius_text(kelvin, 0)


def cross_links(derived: tuple[Derived, ...]) -> dict[str, tuple[Link, ...]]:
    """Every entry's links, in a stable order (relation, then target id).

    Only pairs that can be related are looked at (same formula, same structure class), and the
    contrasts are the ``CONTRAST_COUNT`` nearest in molar mass, so the work grows about linearly
    with the catalog rather than with the square of its size; the isomer and homologue links are
    those of comparing every pair.
    """
    links: dict[str, list[Link]] = {d.entry.id: [] for d in derived}
    molecules = [d for d in derived if d.identity is not None and d.identity.fragments == 1]
    position = {id(d): i for i, d in enumerate(molecules)}
    candidates: set[tuple[int, int]] = set()

    def pairs_within(groups: dict) -> None:
        for members in groups.values():
            for i, a in enumerate(members):
                for b in members[i + 1:]:
                    candidates.add((position[id(a)], position[id(b)]))

    by_formula: dict[str, list] = {}
    by_class: dict[tuple, list] = {}
    for d in molecules:
        by_formula.setdefault(d.identity.formula, []).append(d)
        by_class.setdefault(_series(d), []).append(d)
    pairs_within(by_formula)
    pairs_within(by_class)
    for i, j in sorted(candidates):
        a, b = molecules[i], molecules[j]
        for x, y in ((a, b), (b, a)):
            links[x.entry.id].extend(_pair_link(x, y))
    by_mass = sorted(molecules, key=lambda d: (d.identity.molar_mass, d.entry.id))
    for k, a in enumerate(by_mass):
        for b in _contrasts(by_mass, k, CONTRAST_COUNT):
            links[a.entry.id].append(_contrast_link(a, b))
    with_bp = sorted(((_bp(d), d.entry.id, d) for d in derived if _bp(d) is not None), key=lambda t: (t[0], t[1]))
    for k, (bp, _, d) in enumerate(with_bp):
        for _, oid, o in _nearest(with_bp, k, NEAR_BP_COUNT):
            links[d.entry.id].append(Link("near-bp", oid, f"boils at {_celsius(_bp(o))}, near this "
                                                           f"material's {_celsius(bp)}"))
    for d in derived:
        for comp in d.entry.composition:
            if comp.entry_id in links:
                links[d.entry.id].append(Link("component", comp.entry_id, comp.fraction.text))
                links[comp.entry_id].append(Link("contained-in", d.entry.id, comp.fraction.text))
    order = {"component": 0, "contained-in": 1, "isomer": 2, "homologue": 3, "contrast": 4, "near-bp": 5}
    return {k: tuple(sorted(v, key=lambda l: (order[l.relation], l.target))) for k, v in links.items()}


def _nearest(ordered: list, k: int, count: int) -> list:
    """The ``count`` items of ``ordered`` (sorted by boiling point) nearest item ``k``, ties by id."""
    bp = ordered[k][0]
    left, right, found = k - 1, k + 1, []
    while left >= 0 or right < len(ordered):
        gap_left = bp - ordered[left][0] if left >= 0 else float("inf")
        gap_right = ordered[right][0] - bp if right < len(ordered) else float("inf")
        gap = min(gap_left, gap_right)
        if len(found) >= count and gap > found[count - 1][0]:
            break
        if gap_left <= gap_right:
            found.append((gap_left, ordered[left][1], ordered[left][2]))
            left -= 1
        else:
            found.append((gap_right, ordered[right][1], ordered[right][2]))
            right += 1
        found.sort(key=lambda t: (t[0], t[1]))
    return found[:count]


def _pair_link(a: Derived, b: Derived) -> list[Link]:
    out = []
    fa, fb = a.identity.formula, b.identity.formula
    if fa == fb:
        out.append(Link("isomer", b.entry.id, f"same formula {fa}"))
    same_class = _series(a) == _series(b)
    n = ch2_difference(fa, fb) if same_class else None
    if n is not None:
        more = "more" if n > 0 else "fewer"
        out.append(Link("homologue", b.entry.id, f"same structure class, {abs(n)} CH2 unit{'s' if abs(n) > 1 else ''} "
                                                  f"{more}"))
    return out


def _contrasts(by_mass: list, k: int, count: int) -> list:
    """Up to ``count`` molecules of ``by_mass`` (sorted by molar mass, then id) that differ from
    item ``k`` in dominant force, within ``CONTRAST_MASS_RATIO`` of its molar mass: the nearest in
    mass, ties by id."""
    a = by_mass[k]
    force = _force(a)
    if force is None:
        return []
    ma = a.identity.molar_mass
    found = []
    for step in (-1, 1):  # outwards on each side, so each side's finds come nearest first
        side: list = []
        j = k + step
        while 0 <= j < len(by_mass):
            b = by_mass[j]
            mb = b.identity.molar_mass
            gap = abs(ma - mb)
            if gap > CONTRAST_MASS_RATIO * max(ma, mb) or (len(side) >= count and gap > side[count - 1][0]):
                break
            if _force(b) is not None and _force(b) != force:
                side.append((gap, b.entry.id, b))
            j += step
        found.extend(side)
    found.sort(key=lambda t: (t[0], t[1]))
    return [b for _, _, b in found[:count]]


def _contrast_link(a: Derived, b: Derived) -> Link:
    ma, mb = a.identity.molar_mass, b.identity.molar_mass
    bp_a, bp_b = _bp(a), _bp(b)
    bps = (f"; boils at {_celsius(bp_b)} against {_celsius(bp_a)}" if bp_a is not None and bp_b is not None else "")
    return Link("contrast", b.entry.id, f"similar molar mass ({mb:.0f} against {ma:.0f} g/mol) "
                                        f"but held together mainly by {_force(b)}{bps}")


def homologous_series(derived: tuple[Derived, ...], minimum: int = 3) -> list[list[Derived]]:
    """Groups of ``minimum`` or more entries of one structure class linked by CH2 steps, by size."""
    groups: dict[tuple, list[Derived]] = {}
    for d in derived:
        if d.identity is None or d.identity.fragments != 1:
            continue
        groups.setdefault(_series(d), []).append(d)
    series = []
    for members in groups.values():
        members = sorted(members, key=lambda d: (d.identity.molar_mass, d.entry.id))
        base = members[0].identity.formula
        chain = [members[0]] + [m for m in members[1:] if ch2_difference(base, m.identity.formula)]
        if len(chain) >= minimum:
            series.append(chain)
    return sorted(series, key=lambda s: s[0].entry.id)
