"""GHS flammable-liquid category from flash point and initial boiling point.

Contents
--------
- :func:`flammable_liquid_category`: category 1-4, or None, from UN GHS
  Rev. 10, chapter 2.6, table 2.6.1 [1].
- :data:`HAZARD_STATEMENTS`: category -> (H-code, statement, signal word).
- :func:`possible_categories`: every category reachable when flash point and
  boiling point carry standard uncertainties, plus the most likely one.
- :func:`check_declared_statements`: compare declared H-statements with the
  derived category; returns a message or None.

Criteria (table 2.6.1; FP = closed-cup flash point, IBP = initial boiling
point):

========  ===================================  =====  ===========
category  criteria                             code   signal word
========  ===================================  =====  ===========
1         FP < 23 degC and IBP <= 35 degC      H224   Danger
2         FP < 23 degC and IBP > 35 degC       H225   Danger
3         23 degC <= FP <= 60 degC             H226   Warning
4         60 degC < FP <= 93 degC              H227   Warning
========  ===================================  =====  ===========

Category 4 has no pictogram, and not every jurisdiction adopts it (EU CLP
does not; CLP also lets gas oils, diesel and light heating oils with FP
55-75 degC be treated as category 3, which this module does not model).

Inputs are in kelvin; comparisons are made in degC rounded to 1e-6 K so that
a value typed as 23 degC (296.15 K) lands exactly on the boundary.

References
----------
1. United Nations. Globally Harmonized System of Classification and
   Labelling of Chemicals (GHS), 10th revised ed.; UN: New York and Geneva,
   2023; chapter 2.6 (flammable liquids), annex 3 (hazard statements).
"""

from __future__ import annotations

from collections.abc import Collection, Iterable
from dataclasses import dataclass

from builder.chem.constants import T_ZERO_CELSIUS

FP_CAT2_MAX_C = 23.0  # FP < 23 degC: category 1 or 2
IBP_CAT1_MAX_C = 35.0  # IBP <= 35 degC: category 1
FP_CAT3_MAX_C = 60.0  # 23 <= FP <= 60 degC: category 3
FP_CAT4_MAX_C = 93.0  # 60 < FP <= 93 degC: category 4

HAZARD_STATEMENTS: dict[int, tuple[str, str, str]] = {
    1: ("H224", "Extremely flammable liquid and vapour", "Danger"),
    2: ("H225", "Highly flammable liquid and vapour", "Danger"),
    3: ("H226", "Flammable liquid and vapour", "Warning"),
    4: ("H227", "Combustible liquid", "Warning"),
}
"""GHS annex 3 hazard statements and signal words for chapter 2.6."""

CODE_TO_CATEGORY = {code: cat for cat, (code, _, _) in HAZARD_STATEMENTS.items()}

K_COVERAGE = 1.645
"""Default coverage factor: +-1.645 sigma is a two-sided 90 % interval for a
normal error (5 % chance of lying beyond each side)."""


def _celsius(T: float) -> float:
    return round(T - T_ZERO_CELSIUS, 6)


def _category_c(fp_c: float, ibp_c: float | None) -> int | None:
    if fp_c < FP_CAT2_MAX_C:
        if ibp_c is None:
            raise ValueError("initial boiling point is needed when FP < 23 degC")
        return 1 if ibp_c <= IBP_CAT1_MAX_C else 2
    if fp_c <= FP_CAT3_MAX_C:
        return 3
    if fp_c <= FP_CAT4_MAX_C:
        return 4
    return None


def flammable_liquid_category(
    flash_point: float, initial_boiling_point: float | None
) -> int | None:
    """Return the GHS flammable-liquid category (1-4), or None if FP > 93 degC.

    Parameters
    ----------
    flash_point : float
        Closed-cup flash point [K].
    initial_boiling_point : float or None
        Initial boiling point [K] (the normal boiling point for a pure
        substance). Only needed when FP < 23 degC; ValueError if missing then.

    >>> flammable_liquid_category(T_ZERO_CELSIUS + 13, T_ZERO_CELSIUS + 78)  # ethanol
    2
    """
    ibp = None if initial_boiling_point is None else _celsius(initial_boiling_point)
    return _category_c(_celsius(flash_point), ibp)


@dataclass(frozen=True)
class CategoryRange:
    """Categories reachable within the coverage interval.

    Attributes
    ----------
    categories : frozenset
        Every category (int, or None for "not classified") reachable for FP
        and IBP inside value +- k*u.
    most_likely : int or None
        Category at the central values; with IBP unknown and FP < 23 degC
        the more severe category 1 is reported.
    k : float
        Coverage factor used.
    """

    categories: frozenset[int | None]
    most_likely: int | None
    k: float

    @property
    def certain(self) -> bool:
        """True if only one category is reachable."""
        return len(self.categories) == 1


def _fp_regions(lo: float, hi: float) -> set[str]:
    """Flash-point regions (in degC) that meet the closed interval [lo, hi]."""
    regions = set()
    if lo < FP_CAT2_MAX_C:
        regions.add("low")
    if hi >= FP_CAT2_MAX_C and lo <= FP_CAT3_MAX_C:
        regions.add(3)
    if hi > FP_CAT3_MAX_C and lo <= FP_CAT4_MAX_C:
        regions.add(4)
    if hi > FP_CAT4_MAX_C:
        regions.add(None)
    return regions


def possible_categories(
    flash_point: float,
    u_flash_point: float = 0.0,
    initial_boiling_point: float | None = None,
    u_boiling_point: float = 0.0,
    k: float = K_COVERAGE,
) -> CategoryRange:
    """Return the categories reachable for FP and IBP within +-k standard uncertainties.

    Parameters
    ----------
    flash_point, u_flash_point : float
        Flash point and its standard uncertainty [K].
    initial_boiling_point, u_boiling_point : float
        Initial boiling point and its standard uncertainty [K]; an unknown
        IBP (None) makes both 1 and 2 possible whenever FP may be < 23 degC.
    k : float
        Coverage factor (default 1.645, a two-sided 90 % normal interval).

    >>> sorted(possible_categories(T_ZERO_CELSIUS + 20, 5.0, T_ZERO_CELSIUS + 80, 3.0).categories)
    [2, 3]
    """
    if u_flash_point < 0 or u_boiling_point < 0 or k < 0:
        raise ValueError("uncertainties and k must be >= 0")
    fp = _celsius(flash_point)
    fp_lo, fp_hi = fp - k * u_flash_point, fp + k * u_flash_point
    cats: set[int | None] = set()
    for region in _fp_regions(fp_lo, fp_hi):
        if region != "low":
            cats.add(region)
            continue
        if initial_boiling_point is None:
            cats.update((1, 2))
            continue
        ibp = _celsius(initial_boiling_point)
        if ibp - k * u_boiling_point <= IBP_CAT1_MAX_C:
            cats.add(1)
        if ibp + k * u_boiling_point > IBP_CAT1_MAX_C:
            cats.add(2)
    if fp < FP_CAT2_MAX_C and initial_boiling_point is None:
        most_likely: int | None = 1
    else:
        most_likely = flammable_liquid_category(flash_point, initial_boiling_point)
    return CategoryRange(frozenset(cats), most_likely, k)


def check_declared_statements(
    declared: Iterable[str],
    derived: int | None,
    possible: Collection[int | None] | None = None,
    category_4_adopted: bool = True,
) -> str | None:
    """Compare declared flammable-liquid H-statements with a derived category.

    Parameters
    ----------
    declared : iterable of str
        H-codes stated by the supplier (others than H224-H227 are ignored).
    derived : int or None
        Category derived from data (:func:`flammable_liquid_category`).
    possible : collection, optional
        Categories reachable given the uncertainties
        (:attr:`CategoryRange.categories`); a declaration consistent with any
        of them is accepted.
    category_4_adopted : bool
        False where category 4 is not used (e.g. EU CLP): then a missing
        H227 is not reported.

    Returns
    -------
    str or None
        A one-line message describing the disagreement, or None if none.
    """
    codes = sorted({c.strip().upper() for c in declared} & set(CODE_TO_CATEGORY))
    accepted = set(possible) if possible is not None else {derived}
    accepted.add(derived)
    if not category_4_adopted:
        accepted = {None if c == 4 else c for c in accepted}

    def describe(cat: int | None) -> str:
        if cat is None:
            return "no flammable-liquid category"
        return f"category {cat} ({HAZARD_STATEMENTS[cat][0]})"

    if len(codes) > 1:
        return f"several flammable-liquid statements declared ({', '.join(codes)}); expected one"
    declared_cat = CODE_TO_CATEGORY[codes[0]] if codes else None
    if declared_cat in accepted:
        return None
    target = derived if (category_4_adopted or derived != 4) else None
    if declared_cat is None:
        return f"no flammable-liquid statement declared, but the data give {describe(target)}"
    return f"declared {codes[0]}, but the data give {describe(target)}"
