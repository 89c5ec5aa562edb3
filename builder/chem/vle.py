"""Vapor–liquid equilibrium of liquid mixtures by the modified Raoult's law.

Contents
--------
- :func:`bubble_pressure` (and :func:`dew_pressure`): the pressure at which a liquid of
  composition x starts to boil (a vapor of composition y starts to condense) at T.
- :func:`bubble_temperature`, :func:`dew_temperature`: the same at a given pressure.
- :func:`binary_txy`: points of the T–x–y diagram of a binary at P.
- :func:`binary_azeotropes`: compositions of a binary where x = y at P.

Method: the modified Raoult's law (ideal vapor, liquid activity coefficients, Poynting factor
neglected; e.g. [1], eq. 10.5-1 in later editions)::

    y_i P = x_i γ_i(T, x) Psat_i(T)

so that P_bubble = Σ_i x_i γ_i Psat_i and 1/P_dew = Σ_i y_i / (γ_i Psat_i). With ``gammas``
``None`` (ideal solution, γ_i = 1) it is Raoult's law exactly.

Units: T in K, P in Pa, fractions of one; ``psats`` are callables T [K] → Psat [Pa];
``gammas(T, x)`` returns the activity coefficients (e.g. :meth:`builder.chem.unifac.UnifacMixture.gammas`).

Valid range: low pressure (below about 1 MPa) where the vapor is nearly ideal; subcritical
components only; one liquid phase (a mixture that splits into two liquids is not detected, and
its bubble point is then that of the one-liquid model). The error is that of the vapor
pressures and activity coefficients used (the law itself adds < 1 % at ambient pressure for
non-associating vapors; carboxylic acids, whose vapors dimerize, are worse).

Solvers: the temperature is found on u = 1/T, where ln P is nearly linear (Clausius–Clapeyron),
by a bracketing search then the Illinois variant of regula falsi; no solution in the search
range raises :class:`NoSolution`.

References
----------
1. J. M. Smith, H. C. Van Ness, M. M. Abbott, Introduction to Chemical Engineering
   Thermodynamics, 7th ed., McGraw-Hill, 2005, section 10.5 (modified Raoult's law; from memory).

>>> import math
>>> def antoine(A, B, C):  # log10(P/Pa) = A - B/(T/K + C); constants of Poling et al. via chemicals
...     return lambda T: 10 ** (A - B / (T + C))
>>> benzene, toluene = antoine(8.98523, 1184.24, -55.578), antoine(9.05043, 1327.62, -55.525)
>>> T, y = bubble_temperature(101325.0, [0.5, 0.5], [benzene, toluene])
>>> round(T, 1), [round(v, 3) for v in y]
(365.2, [0.714, 0.286])
"""
from __future__ import annotations

import math
from collections.abc import Callable, Sequence

Psat = Callable[[float], float]
Gammas = Callable[[float, Sequence[float]], Sequence[float]]

T_MIN_DEFAULT = 100.0
T_MAX_DEFAULT = 1000.0


class NoSolution(ValueError):
    """No temperature (or pressure) in the search range satisfies the equilibrium condition."""


def _normalised(z: Sequence[float], what: str) -> list[float]:
    if any(v < 0 or not math.isfinite(v) for v in z):
        raise ValueError(f"{what} must be finite and non-negative: {list(z)}")
    total = sum(z)
    if total <= 0:
        raise ValueError(f"{what} sum to zero")
    return [v / total for v in z]


def _gammas(gammas: Gammas | None, T: float, x: Sequence[float]) -> Sequence[float]:
    return [1.0] * len(x) if gammas is None else gammas(T, x)


def bubble_pressure(T: float, x: Sequence[float], psats: Sequence[Psat],
                    gammas: Gammas | None = None) -> tuple[float, list[float]]:
    """Bubble pressure [Pa] of a liquid x at T [K], and the vapor composition y.

    P = Σ x_i γ_i Psat_i(T); y_i = x_i γ_i Psat_i(T) / P (modified Raoult's law; see module).
    This is also the vapor pressure of the mixture at T.

    >>> bubble_pressure(300.0, [0.25, 0.75], [lambda T: 4000.0, lambda T: 1000.0])
    (1750.0, [0.5714285714285714, 0.42857142857142855])
    """
    x = _normalised(x, "mole fractions")
    g = _gammas(gammas, T, x)
    partial = [xi * gi * p(T) for xi, gi, p in zip(x, g, psats)]
    P = sum(partial)
    if not P > 0:
        raise NoSolution(f"no positive vapor pressure at {T} K")
    return P, [p / P for p in partial]


def _dew_inner(T: float, P: float, y: Sequence[float], psats: Sequence[Psat], gammas: Gammas | None,
               x0: Sequence[float] | None, tol: float = 1e-11, max_iter: int = 200) -> tuple[float, list[float]]:
    """At T: S = Σ y_i P / (γ_i Psat_i) with γ at the normalised liquid x (successive substitution)."""
    ps = [p(T) for p in psats]
    if gammas is None:
        raw = [yi * P / pi for yi, pi in zip(y, ps)]
        S = sum(raw)
        return S, [r / S for r in raw]
    x = list(x0) if x0 is not None else list(y)
    S = 1.0
    for _ in range(max_iter):
        g = gammas(T, x)
        raw = [yi * P / (gi * pi) for yi, gi, pi in zip(y, g, ps)]
        S = sum(raw)
        new = [r / S for r in raw]
        change = max(abs(a - b) for a, b in zip(new, x))
        x = [0.5 * (a + b) for a, b in zip(new, x)] if change > 0.2 else new  # damp large jumps
        if change < tol:
            break
    return S, x


def solve_temperature(f: Callable[[float], float], T_guess: float, T_min: float, T_max: float,
                        tol: float = 1e-10) -> float:
    """Root in T of f, increasing in T, searched on u = 1/T. Illinois regula falsi after bracketing."""
    def F(T: float) -> float:
        try:
            return f(T)
        except (OverflowError, ZeroDivisionError, ValueError) as exc:
            raise NoSolution(f"the model cannot be evaluated at {T:.2f} K ({exc})") from exc

    T0 = min(max(T_guess, T_min), T_max)
    f0 = F(T0)
    if f0 == 0:
        return T0
    # march in 1/T in the direction of the root, step growing, until the sign changes
    u0, step = 1.0 / T0, 0.03 / T0
    direction = -1.0 if f0 < 0 else 1.0    # f < 0: the root is hotter, u smaller
    u_lo, u_hi = 1.0 / T_max, 1.0 / T_min
    ua, fa = u0, f0
    while True:
        ub = min(max(ua + direction * step, u_lo), u_hi)
        fb = F(1.0 / ub)
        if fb == 0:
            return 1.0 / ub
        if (fb > 0) != (fa > 0):
            break
        if ub in (u_lo, u_hi):
            side = "above" if direction < 0 else "below"
            raise NoSolution(f"no solution between {T_min:g} and {T_max:g} K (it would lie {side} the range)")
        ua, fa, step = ub, fb, step * 2.0
    # Illinois regula falsi on [ua, ub]
    side = 0
    for _ in range(200):
        if math.isfinite(fa) and math.isfinite(fb):
            uc = (ua * fb - ub * fa) / (fb - fa)
        else:                               # a vapor pressure of zero at one end: bisect
            uc = 0.5 * (ua + ub)
        fc = F(1.0 / uc)
        if fc == 0 or abs(ub - ua) * (1.0 / uc) ** 2 < tol:
            return 1.0 / uc
        if (fc > 0) == (fb > 0):
            ub, fb = uc, fc
            if side == -1:
                fa *= 0.5
            side = -1
        else:
            ua, fa = uc, fc
            if side == 1:
                fb *= 0.5
            side = 1
        if abs(1.0 / ua - 1.0 / ub) < tol:
            return 1.0 / uc
    return 1.0 / uc  # pragma: no cover - converges long before


def bubble_temperature(P: float, x: Sequence[float], psats: Sequence[Psat], gammas: Gammas | None = None,
                       T_guess: float = 350.0, T_min: float = T_MIN_DEFAULT,
                       T_max: float = T_MAX_DEFAULT) -> tuple[float, list[float]]:
    """Bubble temperature [K] of a liquid x at P [Pa], and the first vapor's composition y.

    Solves ln Σ x_i γ_i(T, x) Psat_i(T) = ln P for T (modified Raoult's law; see module) to
    1e-10 K relative. Raises :class:`NoSolution` when no T in [T_min, T_max] works.

    >>> T, y = bubble_temperature(1000.0, [1.0, 0.0], [lambda T: 1e3 * math.exp(10 - 3000 / T), lambda T: 1.0])
    >>> round(T, 6)
    300.0
    """
    x = _normalised(x, "mole fractions")
    if not P > 0:
        raise ValueError(f"pressure must be positive, got {P}")
    lnP = math.log(P)

    def f(T: float) -> float:
        total = sum(xi * gi * p(T) for xi, gi, p in zip(x, _gammas(gammas, T, x), psats))
        return math.log(total) - lnP if total > 0 else -math.inf

    T = solve_temperature(f, T_guess, T_min, T_max)
    return T, bubble_pressure(T, x, psats, gammas)[1]


def dew_pressure(T: float, y: Sequence[float], psats: Sequence[Psat],
                 gammas: Gammas | None = None) -> tuple[float, list[float]]:
    """Dew pressure [Pa] of a vapor y at T [K], and the first liquid's composition x.

    1/P = Σ y_i / (γ_i Psat_i), γ at the liquid composition (iterated; see module).

    >>> P, x = dew_pressure(300.0, [0.5, 0.5], [lambda T: 4000.0, lambda T: 1000.0])
    >>> P, [round(v, 3) for v in x]
    (1600.0, [0.2, 0.8])
    """
    y = _normalised(y, "vapor mole fractions")
    # iterate P and x: S(P) = Σ y P/(γ Psat) is proportional to P for fixed γ
    P, x = 1.0, list(y)
    for _ in range(100):
        S, x = _dew_inner(T, P, y, psats, gammas, x)
        P_new = P / S
        if abs(P_new - P) <= 1e-12 * P_new:
            P = P_new
            break
        P = P_new
    return P, x


def dew_temperature(P: float, y: Sequence[float], psats: Sequence[Psat], gammas: Gammas | None = None,
                    T_guess: float = 350.0, T_min: float = T_MIN_DEFAULT,
                    T_max: float = T_MAX_DEFAULT) -> tuple[float, list[float]]:
    """Dew temperature [K] of a vapor y at P [Pa], and the first liquid drop's composition x.

    Solves Σ y_i P / (γ_i(T, x) Psat_i(T)) = 1 for T, the liquid x = y_i P / (γ_i Psat_i)
    normalised being iterated at each T (successive substitution, warm-started). Raises
    :class:`NoSolution` when no T in [T_min, T_max] works.

    >>> T, x = dew_temperature(2000.0, [0.5, 0.5], [lambda T: 4000.0 * T / 300, lambda T: 1000.0 * T / 300])
    >>> round(T, 3), [round(v, 3) for v in x]
    (375.0, [0.2, 0.8])
    """
    y = _normalised(y, "vapor mole fractions")
    if not P > 0:
        raise ValueError(f"pressure must be positive, got {P}")
    state = {"x": list(y)}

    def f(T: float) -> float:
        S, x = _dew_inner(T, P, y, psats, gammas, state["x"])
        state["x"] = x
        return -math.log(S)

    T = solve_temperature(f, T_guess, T_min, T_max)
    S, x = _dew_inner(T, P, y, psats, gammas, state["x"])
    return T, x


def binary_txy(P: float, psats: Sequence[Psat], gammas: Gammas | None = None, n: int = 41,
               **kwargs) -> list[tuple[float, float, float]]:
    """(x1, y1, T_bubble) at n liquid compositions x1 = 0 … 1 of a binary at P [Pa].

    The bubble curve T(x1) and the dew curve T(y1) of the T–x–y diagram are both read from
    these points (each point is a liquid x1 in equilibrium with a vapor y1 at T).

    >>> pts = binary_txy(1000.0, [lambda T: 2000.0 * T / 300, lambda T: 500.0 * T / 300], n=3)
    >>> [(x, round(y, 3), round(T, 1)) for x, y, T in pts]
    [(0.0, 0.0, 600.0), (0.5, 0.8, 240.0), (1.0, 1.0, 150.0)]
    """
    out = []
    T_guess = kwargs.pop("T_guess", 350.0)
    for k in range(n):
        x1 = k / (n - 1)
        T, y = bubble_temperature(P, [x1, 1.0 - x1], psats, gammas, T_guess=T_guess, **kwargs)
        T_guess = T
        out.append((x1, y[0], T))
    return out


def binary_azeotropes(P: float, psats: Sequence[Psat], gammas: Gammas | None = None,
                      n: int = 40, **kwargs) -> list[tuple[float, float]]:
    """Azeotropes (x1, T [K]) of a binary at P [Pa]: compositions inside (0, 1) where y1 = x1.

    Scans y1 − x1 on n + 1 liquid compositions, then refines each sign change by the secant
    method with bisection safeguard to |y1 − x1| < 1e-10. An ideal solution has none.

    >>> binary_azeotropes(1000.0, [lambda T: 2000.0 * T / 300, lambda T: 500.0 * T / 300])
    []
    """
    def d(x1: float) -> tuple[float, float]:
        T, y = bubble_temperature(P, [x1, 1.0 - x1], psats, gammas, **kwargs)
        return y[0] - x1, T

    grid = [1e-6 + (1 - 2e-6) * k / n for k in range(n + 1)]
    values = [d(x)[0] for x in grid]
    found = []
    for k in range(n):
        a, b, fa, fb = grid[k], grid[k + 1], values[k], values[k + 1]
        if fa == 0 or (fa > 0) == (fb > 0):
            continue
        for _ in range(100):
            c = b - fb * (b - a) / (fb - fa)
            if not a < c < b:
                c = 0.5 * (a + b)
            fc, _T = d(c)
            if abs(fc) < 1e-10 or b - a < 1e-12:
                break
            if (fc > 0) == (fa > 0):
                a, fa = c, fc
            else:
                b, fb = c, fc
        found.append((c, d(c)[1]))
    return found
