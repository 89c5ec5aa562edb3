"""Closed-cup flash point estimates for pure organic liquids.

Contents
--------
- :func:`catoire_naudet`: flash point from Tb, the enthalpy of vaporization
  at 298.15 K and the carbon count [1].
- :func:`satyanarayana_rao`: flash point from Tb alone [2].
- :func:`estimate_flash_point`: picks the best route the inputs allow and
  returns a :class:`FlashPointEstimate` with a standard uncertainty measured
  against IEC 60079-20-1 flash points (``tools/report_volatility.py``),
  combined with the boiling point's own uncertainty when it has one.
- :func:`flash_estimate_applies`: whether the correlations apply to a
  structure at all (the catalog's applicability rule).

Units: temperatures [K], enthalpy [J/mol].

Measured errors (reference Tb from ``chemicals.phase_change.Tb``; organics
with at least one carbon atom; see ``tools/report_volatility.py``):

============================================  ==========  ==========  ===========
route                                         MAE, IEC    RMS, IEC    MAE, Serat
============================================  ==========  ==========  ===========
Catoire-Naudet, tabulated Hvap(298 K)         5.6 K       9.2 K       5.8 K
Catoire-Naudet, Myrdal-Yalkowsky Hvap(298 K)  8.1 K       14.4 K      8.3 K
Satyanarayana-Rao, Tb only                    12.9 K      17.8 K      13.9 K
============================================  ==========  ==========  ===========

(n = 185 / 267 / 267 against IEC 60079-20-1 (2010), 508 / 832 / 832 against
Serat DIPPR (2017).) With Joback Tb instead of a reference Tb the IEC MAE
rises to 9.4, 12.4 and 15.1 K. The RMS is pulled up by a few reference
values that look wrong (formaldehyde 333 K is a formalin value; adiponitrile
366 K); we keep them, so the uncertainties below are conservative.

These correlations apply to pure flammable organic liquids only; they say
nothing about whether a substance burns at all (water, CCl4 and many
halogenated liquids have no flash point).

References
----------
1. Catoire, L.; Naudet, V. A Unique Equation to Estimate Flash Points of
   Selected Pure Liquids Application to the Correction of Probably Erroneous
   Flash Point Values. J. Phys. Chem. Ref. Data 2004, 33, 1083-1111.
   https://doi.org/10.1063/1.1835321
2. Satyanarayana, K.; Rao, P. G. Improved equation to estimate flash points
   of organic compounds. J. Hazard. Mater. 1992, 32, 81-85.
   https://doi.org/10.1016/0304-3894(92)85035-Q
3. Myrdal, P. B.; Yalkowsky, S. H. Ind. Eng. Chem. Res. 1997, 36, 2494
   (enthalpy of vaporization at 298.15 K when none is tabulated; see
   :mod:`builder.chem.vapor`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from rdkit import Chem

from builder.chem.vapor import myrdal_yalkowsky_dHvap

T_298 = 298.15

TB_STEP = 0.5
"""Half-width [K] of the central difference dTf/dTb in :func:`estimate_flash_point`."""

HALOGENS = ("F", "Cl", "Br", "I")

U_CATOIRE_NAUDET_MEASURED_HVAP = 9.5
"""Standard uncertainty [K] of :func:`catoire_naudet` with a tabulated Hvap.

RMS error against IEC 60079-20-1 (2010) flash points in ``chemicals``
(Hvap at 298 K from CRC, else Gharagheizi), reference Tb: 9.2 K (n = 185);
rounded up.
"""

U_CATOIRE_NAUDET_ESTIMATED_HVAP = 15.0
"""Standard uncertainty [K] with Hvap(298 K) from Myrdal-Yalkowsky.

RMS error against the same IEC data: 14.4 K (n = 267); rounded up.
"""

U_SATYANARAYANA_RAO = 18.0
"""Standard uncertainty [K] of :func:`satyanarayana_rao`.

RMS error against the same IEC data: 17.8 K (n = 267), mean bias -7.4 K;
rounded up.
"""


def catoire_naudet(Tb: float, dHvap298: float, n_carbon: int) -> float:
    r"""Return the closed-cup flash point by Catoire & Naudet (2004) [1].

    .. math::
        T_f = 1.477\,T_b^{0.79686}\,
              (\Delta_{vap}H^\circ_{298}/\mathrm{kJ\,mol^{-1}})^{0.16845}\,
              n_C^{-0.05948}

    Parameters
    ----------
    Tb : float
        Normal boiling point [K].
    dHvap298 : float
        Standard enthalpy of vaporization at 298.15 K [J/mol] (converted to
        kJ/mol internally, as the constants require).
    n_carbon : int
        Number of carbon atoms in the molecule [-], at least 1.

    Returns
    -------
    float
        Closed-cup flash point [K].

    Notes
    -----
    Valid range: pure organic liquids (C, H, O, N, S, halogens) of the kind
    in the authors' data set. Reported error: not verified here (the paper
    was not available offline). Constants from research notes, checked by
    measurement: with tabulated Hvap(298 K) the MAE against IEC 60079-20-1
    is 5.6 K (n = 185), which such constants would not reach if mistyped.

    >>> round(catoire_naudet(383.78, 38010.0, 7), 1)  # toluene; IEC 277.15
    278.2
    """
    if not (Tb > 0.0 and dHvap298 > 0.0):
        raise ValueError(f"Tb and dHvap298 must be > 0, got {Tb!r}, {dHvap298!r}")
    if n_carbon < 1:
        raise ValueError(f"n_carbon must be >= 1, got {n_carbon!r}")
    return 1.477 * Tb**0.79686 * (dHvap298 / 1000.0) ** 0.16845 * n_carbon**-0.05948


def satyanarayana_rao(Tb: float) -> float:
    r"""Return the closed-cup flash point from Tb by Satyanarayana & Rao (1992) [2].

    .. math::
        T_f = a + b\,\frac{(c/T_b)^2\,e^{-c/T_b}}{(1 - e^{-c/T_b})^2}

    with a = 225.1 K, b = 537.6 K and c = 2217 K.

    Parameters
    ----------
    Tb : float
        Normal boiling point [K].

    Returns
    -------
    float
        Closed-cup flash point [K].

    Notes
    -----
    Valid range: organic liquids, fitted mainly to hydrocarbons; it reads
    low for alcohols and acids (ethanol 264 K against 285 K measured).
    Reported error: not verified here. Constants from research notes marked
    unverified; our measurement against IEC 60079-20-1 gives MAE 12.9 K
    (n = 267) with a mean bias of -7 K, in line with the 11-14 K expected of
    Tb-only correlations, so the constants are at least not badly wrong.

    >>> round(satyanarayana_rao(383.78), 1)  # toluene; IEC 277.15
    281.0
    """
    if not Tb > 0.0:
        raise ValueError(f"Tb must be > 0 K, got {Tb!r}")
    x = 2217.0 / Tb
    return 225.1 + 537.6 * x * x * math.exp(-x) / (1.0 - math.exp(-x)) ** 2


@dataclass(frozen=True)
class FlashPointEstimate:
    """An estimated flash point with its standard uncertainty.

    Attributes
    ----------
    value : float
        Closed-cup flash point [K].
    u : float
        Standard uncertainty [K], the measured RMS error of the route used.
    method : str
        Route used, e.g. "Catoire-Naudet (tabulated Hvap)".
    reference : str
        Short citation of the correlation.
    estimator : str
        Stable key of the correlation: "catoire_naudet" or "satyanarayana_rao"
        (the ``estimator`` of its entry in ``builder/data/methods.yaml``).
    """

    value: float
    u: float
    method: str
    reference: str
    estimator: str


def flash_estimate_applies(mol: Chem.Mol | None) -> bool:
    """Whether the flash-point correlations apply to this structure.

    They were fitted on flammable organic liquids, so they need at least one
    carbon atom, and molecules with more halogen (F, Cl, Br, I) atoms than
    carbon atoms are skipped: dichloromethane, chloroform and
    tetrachloroethene are hardly or not at all flammable, and a correlation
    would still give them a flash point. The catalog's own rule (not from a
    publication); hydrogens count only when drawn explicitly, which does not
    change the comparison.

    >>> [flash_estimate_applies(Chem.MolFromSmiles(s)) for s in ("CCO", "ClCCl", "ClC(Cl)Cl", "O")]
    [True, False, False, False]
    >>> flash_estimate_applies(None)
    False
    """
    if mol is None:
        return False
    symbols = [a.GetSymbol() for a in mol.GetAtoms()]
    carbons = symbols.count("C")
    halogens = sum(symbols.count(x) for x in HALOGENS)
    return carbons > 0 and halogens <= carbons


def estimate_flash_point(
    Tb: float,
    n_carbon: int | None = None,
    dHvap298: float | None = None,
    tau: float | None = None,
    hbn: float | None = None,
    u_Tb: float = 0.0,
) -> FlashPointEstimate:
    r"""Estimate the flash point [K] by the most accurate route the inputs allow.

    1. ``n_carbon`` and ``dHvap298`` [J/mol]: Catoire-Naudet.
    2. ``n_carbon``, ``tau`` and ``hbn``: Catoire-Naudet with Hvap at
       298.15 K from Myrdal-Yalkowsky (:mod:`builder.chem.vapor`).
    3. Otherwise: Satyanarayana-Rao from Tb alone.

    The uncertainty is the measured RMS error of the route against
    IEC 60079-20-1 with reference Tb. ``u_Tb`` [K] is the standard
    uncertainty of Tb itself (an estimated boiling point, e.g. Joback; 0 for
    a measured one); it is combined by first-order propagation with the
    route's, the two taken as uncorrelated (JCGM 100:2008, GUM, eq. 10):

    .. math::
        u(T_f) = \sqrt{u_{route}^2 + \left(\frac{dT_f}{dT_b}\,u(T_b)\right)^2},
        \quad \frac{dT_f}{dT_b} \approx \frac{T_f(T_b + h) - T_f(T_b - h)}{2h},
        \ h = 0.5\ \mathrm{K}

    (the same route at both points). Raises ValueError where a route's inputs
    leave its range (e.g. Hvap(298 K) not positive for a gas well below 25 °C).

    >>> e = estimate_flash_point(383.78)  # toluene, Tb only; IEC 277.15 K
    >>> round(e.value, 1), e.u
    (281.0, 18.0)
    >>> round(estimate_flash_point(383.78, u_Tb=10.0).u, 1)
    18.8

    Check by hand: with g(x) = x^2 e^-x / (1 - e^-x)^2 and x = c/Tb = 5.7767,
    g'(x) = g (2/x - 1 - 2 e^-x/(1 - e^-x)) = -0.06867, so dTf/dTb =
    -537.6 g'(x) c/Tb^2 = 0.5557 and u = sqrt(18^2 + 5.557^2) = 18.8 K.
    """
    est = _route_estimate(Tb, n_carbon, dHvap298, tau, hbn)
    if not u_Tb:
        return est
    slope = (_route_estimate(Tb + TB_STEP, n_carbon, dHvap298, tau, hbn).value
             - _route_estimate(Tb - TB_STEP, n_carbon, dHvap298, tau, hbn).value) / (2 * TB_STEP)
    return FlashPointEstimate(est.value, math.hypot(est.u, slope * u_Tb), est.method, est.reference,
                              est.estimator)


def _route_estimate(Tb: float, n_carbon: int | None, dHvap298: float | None, tau: float | None,
                    hbn: float | None) -> FlashPointEstimate:
    if n_carbon is not None and n_carbon >= 1:
        if dHvap298 is not None:
            return FlashPointEstimate(
                catoire_naudet(Tb, dHvap298, n_carbon),
                U_CATOIRE_NAUDET_MEASURED_HVAP,
                "Catoire-Naudet (tabulated Hvap)",
                "J. Phys. Chem. Ref. Data 2004, 33, 1083",
                "catoire_naudet",
            )
        if tau is not None and hbn is not None:
            dh = myrdal_yalkowsky_dHvap(T_298, Tb, tau, hbn)
            return FlashPointEstimate(
                catoire_naudet(Tb, dh, n_carbon),
                U_CATOIRE_NAUDET_ESTIMATED_HVAP,
                "Catoire-Naudet (Myrdal-Yalkowsky Hvap)",
                "J. Phys. Chem. Ref. Data 2004, 33, 1083; "
                "Ind. Eng. Chem. Res. 1997, 36, 2494",
                "catoire_naudet",
            )
    return FlashPointEstimate(
        satyanarayana_rao(Tb),
        U_SATYANARAYANA_RAO,
        "Satyanarayana-Rao (Tb only)",
        "J. Hazard. Mater. 1992, 32, 81",
        "satyanarayana_rao",
    )
