"""Flash point of a liquid mixture from its components' flash points and vapor pressures.

Contents
--------
- :func:`mixture_flash_point`: the closed-cup flash point of a mixture (Liaw et al. 2002 [1]),
  non-flammable components (water, fully halogenated solvents) handled as in Liaw's work on
  aqueous–organic solutions [2];
  returns a :class:`MixtureFlashPoint`.
- :func:`flash_function`: the left-hand side of the flash-point condition at T (for plots).

Method. At its flash point Tf_i the vapor over pure flammable component i holds its lower
flammability limit, LFL_i ≈ Psat_i(Tf_i) / P. Over the mixture the partial pressures are
x_i γ_i Psat_i(T) (modified Raoult's law, :mod:`builder.chem.vle`); Le Chatelier's rule for the
vapor, Σ y_i / LFL_i = 1 over the flammable components, then gives the flash point T of the
mixture as the root of::

    Σ_{i flammable} x_i γ_i(T, x) Psat_i(T) / Psat_i(Tf_i) = 1

A non-flammable component dilutes the liquid (it enters x and γ) but adds nothing to the sum [2].
The sum rises with T; a root above the mixture's bubble point at the given pressure is no flash
point (the liquid boils first), and if even there the sum stays below one the mixture is reported
to have no flash point below its bubble point.

Units: T in K, P in Pa, mole fractions of one. Valid range: mixtures whose components' flash
points are known or well estimated, at ambient pressure; the LFL is assumed independent of
temperature over the span between the components' flash points [1]. Reported error: for binary
and ternary solvent mixtures with fitted (Wilson, NRTL, UNIQUAC) activity coefficients Liaw et al.
report predictions within about 1–3 K of closed-cup measurements [1, 2] (from memory); with
predicted (UNIFAC) coefficients errors of a few kelvin are typical, more for aqueous solutions of
alcohols at low alcohol content.

References
----------
1. H.-J. Liaw, Y.-H. Lee, C.-L. Tang, H.-H. Hsu, J.-H. Liu, J. Loss Prev. Process Ind. 15
   (2002) 429–438, doi:10.1016/S0950-4230(02)00068-2 (DOI from memory).
2. H.-J. Liaw, Y.-Y. Chiu, The prediction of the flash point for binary aqueous-organic
   solutions, J. Hazard. Mater. 101 (2003) 83–106, and the general form for mixtures with
   non-flammable components in H.-J. Liaw, Y.-Y. Chiu, J. Hazard. Mater. 137 (2006) 38–46
   (citation details from memory).

>>> def antoine(A, B, C):  # log10(P/Pa) = A - B/(T/K + C)
...     return lambda T: 10 ** (A - B / (T + C))
>>> methanol, ethanol = antoine(10.20277, 1580.08, -33.65), antoine(10.33675, 1648.22, -42.232)
>>> r = mixture_flash_point([0.5, 0.5], [284.15, 286.15], [methanol, ethanol])
>>> round(r.T, 1), r.reason is None
(285.2, True)
"""
from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from builder.chem.vle import Gammas, NoSolution, Psat, solve_temperature, bubble_temperature

P_ATM = 101325.0


@dataclass(frozen=True)
class MixtureFlashPoint:
    """``T``: the flash point [K], or None with ``reason`` saying why there is none;
    ``bubble_T``: the bubble point [K] at the pressure used (None if it could not be found)."""

    T: float | None
    bubble_T: float | None
    reason: str | None = None


def flash_function(T: float, x: Sequence[float], flash_points: Sequence[float | None],
                   psats: Sequence[Psat], gammas: Gammas | None = None) -> float:
    """Σ_{flammable i} x_i γ_i(T, x) Psat_i(T) / Psat_i(Tf_i) (dimensionless; 1 at the flash point).

    >>> flash_function(300.0, [0.5, 0.5], [300.0, None], [lambda T: 1e3, lambda T: 3e3])
    0.5
    """
    g = [1.0] * len(x) if gammas is None else gammas(T, x)
    return sum(xi * gi * p(T) / p(tf) for xi, gi, p, tf in zip(x, g, psats, flash_points)
               if tf is not None and xi > 0)


def mixture_flash_point(x: Sequence[float], flash_points: Sequence[float | None], psats: Sequence[Psat],
                        gammas: Gammas | None = None, P: float = P_ATM,
                        T_min: float = 150.0, T_max: float = 700.0) -> MixtureFlashPoint:
    """Flash point [K] of a liquid mixture x (Liaw et al. 2002; non-flammable components, with
    ``flash_points[i] = None``, as in Liaw et al. 2004). Equation, range and error: module docstring.

    ``psats``: each component's vapor pressure T [K] → Pa; ``gammas``: activity coefficients
    (None: ideal solution). The answer has ``T = None`` and a ``reason`` when no flammable
    component is present or the mixture boils at P before its vapor becomes flammable.

    >>> r = mixture_flash_point([0.05, 0.95], [286.0, None], [lambda T: 5.8e3 * math.exp(4900 * (1 / 286 - 1 / T)), lambda T: 3.2e3 * math.exp(5200 * (1 / 298 - 1 / T))])
    >>> round(r.T, 1), round(r.bubble_T, 1)
    (346.6, 369.1)
    """
    total = sum(x)
    if total <= 0 or any(v < 0 for v in x):
        raise ValueError("mole fractions must be non-negative and not all zero")
    x = [v / total for v in x]
    if len(flash_points) != len(x) or len(psats) != len(x):
        raise ValueError("one flash point (or None) and one vapor pressure per component")
    if not any(tf is not None and xi > 0 for xi, tf in zip(x, flash_points)):
        return MixtureFlashPoint(None, None, "no flammable component")
    guess = min(tf for xi, tf in zip(x, flash_points) if tf is not None and xi > 0)
    try:
        T_b = bubble_temperature(P, x, psats, gammas, T_guess=guess + 50.0, T_min=T_min, T_max=T_max)[0]
    except NoSolution:
        T_b = None
    def f(T: float) -> float:
        s = flash_function(T, x, flash_points, psats, gammas)
        return math.log(s) if s > 0 else -math.inf

    upper = T_b if T_b is not None else T_max
    if f(upper) < 0:
        return MixtureFlashPoint(None, T_b, "no flash point below the bubble point: the liquid boils "
                                            "before its vapor reaches the lower flammability limit")
    T = solve_temperature(f, guess, T_min, upper)
    return MixtureFlashPoint(T, T_b)
