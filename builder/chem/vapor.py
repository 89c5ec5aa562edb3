"""Vapour pressure: Antoine evaluation and an estimate from the normal boiling point.

Contents
--------
- :class:`Antoine`: coefficients held in one internal form,
  log10(P/Pa) = A - B/(T/K + C); :meth:`Antoine.from_published` converts any
  stated form (log10 or ln; Pa, kPa, bar, atm or mmHg; K or degC).
- :class:`RangeChecked`: a value with an ``in_range`` flag (Antoine never
  extrapolates silently).
- :func:`myrdal_yalkowsky_psat`: liquid vapour pressure from Tb, flexibility
  and hydrogen-bond number [2].
- :func:`myrdal_yalkowsky_dSvb`, :func:`myrdal_yalkowsky_dHvap`: the entropy
  and enthalpy of vaporization implied by the same model (Hvap at Tb and at T).
- :func:`flexibility_tau`, :func:`hydrogen_bond_number`: the model's two
  structure numbers, from counts the caller supplies.
- :func:`estimate_psat`: the estimate with a standard uncertainty measured
  against Poling's Antoine table (see ``tools/report_volatility.py``),
  combined with the boiling point's own uncertainty when it has one
  (:func:`ln_psat_tb_sensitivity`).
- :func:`estimate_dhvap_at_tb`: the enthalpy of vaporization at Tb with its
  standard uncertainty (:data:`U_REL_DHVAP_TB`).
- :func:`antoine_curve`, :func:`myrdal_yalkowsky_curve`: T grid -> P for charts.

Units: T [K], P [Pa], molar mass [g/mol], enthalpy [J/mol], entropy
[J/(mol*K)].

References
----------
1. Poling, B. E.; Prausnitz, J. M.; O'Connell, J. P. The Properties of Gases
   and Liquids, 5th ed.; McGraw-Hill, 2001 (Antoine form and coefficients).
2. Myrdal, P. B.; Yalkowsky, S. H. Estimating Pure Component Vapor Pressures
   of Complex Organic Molecules. Ind. Eng. Chem. Res. 1997, 36, 2494-2499.
   https://doi.org/10.1021/ie950242l
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from builder.chem.constants import P_ATM, T_ZERO_CELSIUS, R  # noqa: F401 (R: re-exported)

PRESSURE_UNITS: dict[str, float] = {
    "Pa": 1.0,
    "kPa": 1.0e3,
    "bar": 1.0e5,
    "atm": P_ATM,
    "mmHg": P_ATM / 760.0,
}
"""Pressure units accepted by :meth:`Antoine.from_published`, in Pa each."""

TEMPERATURE_UNITS = ("K", "degC")
LOG_BASES = ("log10", "ln")

U_LN_PSAT_NON_HBOND = 0.12
"""Standard uncertainty of ln P from :func:`estimate_psat`, no OH/NH donor.

Measured: root-mean-square of ln(P_est/P_ref) at 298.15 K against Poling's
Antoine coefficients in ``chemicals`` (``Psat_data_AntoinePoling``), reference
Tb from ``chemicals.phase_change.Tb``, was 0.10 (n = 94); rounded up.
"""

U_LN_PSAT_HBOND = 0.40
"""Standard uncertainty of ln P for liquids with an O-H or N-H donor.

Measured as above: RMS ln ratio 0.35 over only 16 liquids (acetic acid,
whose vapour dimerizes, is the worst at -0.66); rounded up.
"""


MIN_MOLAR_MASS, MAX_MOLAR_MASS = 1.0, 5000.0
"""Molar masses [g/mol] accepted: from one hydrogen atom (1.008) to what can still be a liquid
that evaporates; a value below 1 was given in kg/mol."""


U_REL_DHVAP_TB = 0.04
"""Relative standard uncertainty of :func:`myrdal_yalkowsky_dHvap` at Tb [-].

Measured against the CRC Hvap at Tb in ``chemicals`` (``Hvap_data_CRC``, n = 510,
``tests/chem/test_vapor.py``): median absolute relative error 2.7 %. For normally
distributed errors the median absolute error is 0.674 standard deviations, so the
standard uncertainty is 2.7 % / 0.674 = 4.0 % (common practice for turning a median
absolute error into a standard uncertainty); 66 % of the compounds lie within +-4 %,
as a one-sigma interval should (68 %). The errors have heavy tails: the RMS relative
error is 8.3 %, pulled up by a few compounds.
"""

TB_STEP = 0.5
"""Half-width [K] of the central difference in :func:`ln_psat_tb_sensitivity`."""


def _check_molar_mass(molar_mass: float) -> None:
    if not molar_mass >= MIN_MOLAR_MASS:
        raise ValueError(
            f"molar mass {molar_mass!r} g/mol is below one hydrogen atom; was it given in kg/mol?"
        )
    if molar_mass > MAX_MOLAR_MASS:
        raise ValueError(f"molar mass {molar_mass!r} g/mol is implausible for a liquid")


@dataclass(frozen=True)
class RangeChecked:
    """A value with a flag saying whether it came from inside the valid range."""

    value: float
    in_range: bool


@dataclass(frozen=True)
class Antoine:
    """Antoine coefficients in the internal form log10(P/Pa) = A - B/(T/K + C).

    Attributes
    ----------
    A, B, C : float
        Coefficients for P [Pa] and T [K], decimal logarithm.
    Tmin, Tmax : float
        Range of the fitted data [K].
    """

    A: float
    B: float
    C: float
    Tmin: float
    Tmax: float

    def __post_init__(self) -> None:
        if not self.Tmin <= self.Tmax:
            raise ValueError(f"Tmin {self.Tmin} K is above Tmax {self.Tmax} K")
        if self.Tmin + self.C <= 0.0:
            raise ValueError(
                f"T + C is not positive at Tmin ({self.Tmin} K, C = {self.C}); "
                "was C given for degC while T is in K?"
            )

    @classmethod
    def from_published(
        cls,
        A: float,
        B: float,
        C: float,
        *,
        base: str,
        p_unit: str,
        t_unit: str,
        Tmin: float,
        Tmax: float,
    ) -> Antoine:
        """Convert coefficients stated as log_base(P/p_unit) = A - B/(t + C).

        ``Tmin`` and ``Tmax`` are in ``t_unit`` like C. Conversions: ln to
        log10 divides A and B by ln 10; a pressure unit u adds log10(u/Pa) to
        A; degC to K subtracts T_ZERO_CELSIUS from C.

        >>> a = Antoine.from_published(6.95464, 1344.8, 219.482, base="log10",
        ...     p_unit="mmHg", t_unit="degC", Tmin=6, Tmax=137)
        >>> round(a.A, 4), round(a.C, 3)
        (9.0795, -53.668)
        """
        if base not in LOG_BASES:
            raise ValueError(f"unknown log base {base!r}; expected one of {LOG_BASES}")
        if p_unit not in PRESSURE_UNITS:
            raise ValueError(
                f"unknown pressure unit {p_unit!r}; expected one of {tuple(PRESSURE_UNITS)}"
            )
        if t_unit not in TEMPERATURE_UNITS:
            raise ValueError(
                f"unknown temperature unit {t_unit!r}; expected one of {TEMPERATURE_UNITS}"
            )
        scale = math.log(10.0) if base == "ln" else 1.0
        offset = T_ZERO_CELSIUS if t_unit == "degC" else 0.0
        return cls(
            A=A / scale + math.log10(PRESSURE_UNITS[p_unit]),
            B=B / scale,
            C=C - offset,
            Tmin=Tmin + offset,
            Tmax=Tmax + offset,
        )

    def in_range(self, T: float) -> bool:
        """Return True if T [K] lies within [Tmin, Tmax]."""
        return self.Tmin <= T <= self.Tmax

    def pressure(self, T: float) -> RangeChecked:
        """Return P [Pa] at T [K] with an ``in_range`` flag.

        Outside [Tmin, Tmax] the value is still computed (so a chart can show
        it dashed) but flagged; callers must not present it as data.
        """
        if T + self.C <= 0.0:
            raise ValueError(f"T + C = {T + self.C} K is not positive at T = {T} K")
        return RangeChecked(10.0 ** (self.A - self.B / (T + self.C)), self.in_range(T))

    def temperature(self, P: float) -> RangeChecked:
        """Return the T [K] at which the vapour pressure equals P [Pa]."""
        if not P > 0.0:
            raise ValueError(f"pressure must be > 0 Pa, got {P!r}")
        denominator = self.A - math.log10(P)
        if denominator <= 0.0:
            raise ValueError(f"P = {P} Pa is beyond what these coefficients can represent")
        T = self.B / denominator - self.C
        return RangeChecked(T, self.in_range(T))


def antoine_curve(antoine: Antoine, T: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Return (P [Pa], in_range mask) over a grid of T [K]."""
    T = np.asarray(T, dtype=float)
    if np.any(T + antoine.C <= 0.0):
        raise ValueError("T + C is not positive somewhere on the grid")
    P = 10.0 ** (antoine.A - antoine.B / (T + antoine.C))
    return P, (T >= antoine.Tmin) & (T <= antoine.Tmax)


def flexibility_tau(n_sp3: int, n_sp2: int, n_ring_systems: int) -> float:
    r"""Return the torsional flexibility number tau of Myrdal & Yalkowsky [2].

    .. math:: \tau = \max(0,\ SP3 + 0.5\,SP2 + 0.5\,RING - 1)

    Parameters
    ----------
    n_sp3 : int
        Non-ring, non-terminal sp3 atoms (bonded to at least two non-hydrogen
        atoms), e.g. CH2 in a chain, ether O, secondary amine N [-].
    n_sp2 : int
        Non-ring, non-terminal sp2 atoms, e.g. =CH- in a chain, C=O carbons [-].
    n_ring_systems : int
        Independent single or fused ring systems [-].
    """
    for name, n in (("n_sp3", n_sp3), ("n_sp2", n_sp2), ("n_ring_systems", n_ring_systems)):
        if n < 0:
            raise ValueError(f"{name} must be >= 0, got {n}")
    return max(0.0, n_sp3 + 0.5 * n_sp2 + 0.5 * n_ring_systems - 1.0)


def hydrogen_bond_number(n_oh: int, n_cooh: int, n_nh2: int, molar_mass: float) -> float:
    r"""Return the hydrogen-bond number HBN of Myrdal & Yalkowsky [2] [mol/g].

    .. math:: HBN = \frac{\sqrt{n_{OH} + n_{COOH}} + 0.33\sqrt{n_{NH_2}}}{M}

    with M in g/mol as in the paper.

    Parameters
    ----------
    n_oh : int
        Hydroxyl groups not part of a carboxylic acid (alcohols, phenols) [-].
    n_cooh : int
        Carboxylic acid groups [-].
    n_nh2 : int
        Primary amine groups [-].
    molar_mass : float
        Molar mass [g/mol].

    >>> round(hydrogen_bond_number(1, 0, 0, 46.07), 6)  # ethanol: 1/46.07
    0.021706
    """
    _check_molar_mass(molar_mass)
    if min(n_oh, n_cooh, n_nh2) < 0:
        raise ValueError("group counts must be >= 0")
    return (math.sqrt(n_oh + n_cooh) + 0.33 * math.sqrt(n_nh2)) / molar_mass


def myrdal_yalkowsky_dSvb(tau: float = 0.0, hbn: float = 0.0) -> float:
    r"""Return the entropy of vaporization at Tb of Myrdal & Yalkowsky [2].

    .. math:: \Delta S_{vb} = 86.0 + 0.4\,\tau + 1421\,HBN

    A Trouton-type rule: 86 J/(mol*K) for a rigid non-associating liquid,
    raised by chain flexibility and by OH/NH2 hydrogen bonding.

    Parameters
    ----------
    tau : float
        Flexibility number from :func:`flexibility_tau` [-].
    hbn : float
        Hydrogen-bond number from :func:`hydrogen_bond_number` [mol/g].

    Returns
    -------
    float
        Entropy of vaporization at the normal boiling point [J/(mol*K)].

    Notes
    -----
    Measured here (``tools/report_volatility.py``): Tb*dSvb against the CRC
    Hvap at Tb in ``chemicals`` (``Hvap_data_CRC``) has a median absolute
    relative error of 2.7 % (n = 510 organics).
    """
    return 86.0 + 0.4 * tau + 1421.0 * hbn


def myrdal_yalkowsky_dHvap(T: float, Tb: float, tau: float = 0.0, hbn: float = 0.0) -> float:
    r"""Return the enthalpy of vaporization at T implied by Myrdal & Yalkowsky [2].

    .. math:: \Delta H_v(T) = T_b\,\Delta S_{vb} + (90.0 + 2.1\,\tau)(T_b - T)

    The model takes the heat-capacity change of vaporization as
    -(90.0 + 2.1 tau) J/(mol*K), constant in T; at T = Tb this is Hvap at Tb.

    Parameters
    ----------
    T : float
        Temperature [K].
    Tb : float
        Normal boiling point [K].
    tau, hbn : float
        As in :func:`myrdal_yalkowsky_dSvb`.

    Returns
    -------
    float
        Enthalpy of vaporization [J/mol].

    >>> round(myrdal_yalkowsky_dHvap(383.75, 383.75))  # toluene at Tb; CRC 33180
    33002
    """
    return Tb * myrdal_yalkowsky_dSvb(tau, hbn) + (90.0 + 2.1 * tau) * (Tb - T)


def myrdal_yalkowsky_psat(T: float, Tb: float, tau: float = 0.0, hbn: float = 0.0) -> float:
    r"""Return the liquid vapour pressure from Tb by Myrdal & Yalkowsky (1997) [2].

    .. math::
        \log_{10}\frac{P}{\mathrm{atm}} =
        -\frac{(86.0 + 0.4\tau + 1421\,HBN)(T_b - T)}{19.1\,T}
        - \frac{90.0 + 2.1\tau}{19.1}\left[\frac{T_b - T}{T} - \ln\frac{T_b}{T}\right]

    Clausius-Clapeyron integrated from the normal boiling point with the
    entropy of :func:`myrdal_yalkowsky_dSvb` and a constant heat-capacity
    change; 19.1 = R ln 10 in J/(mol*K).

    Parameters
    ----------
    T : float
        Temperature [K].
    Tb : float
        Normal boiling point [K].
    tau : float
        Flexibility number (:func:`flexibility_tau`) [-].
    hbn : float
        Hydrogen-bond number (:func:`hydrogen_bond_number`) [mol/g].

    Returns
    -------
    float
        Vapour pressure of the (sub-cooled) liquid [Pa].

    Notes
    -----
    Valid range: organic non-electrolytes below their normal boiling point
    (the paper's fitting set). Below the melting point the result is the
    sub-cooled liquid's pressure; the solid's is lower. Reported error: not
    verified here (the paper was not available offline). Constants checked by
    comparison with the open implementation in UManSysProp
    (``umansysprop/vapour_pressures.py``, same equation and constants) and by
    our measurement against Poling's Antoine data: median relative error at
    298.15 K about 6 % without H-bond donors and 18 % with them.

    >>> round(myrdal_yalkowsky_psat(298.15, 383.75))  # toluene (tau 0); Antoine 3789
    3544
    """
    if not (T > 0.0 and Tb > 0.0):
        raise ValueError(f"temperatures must be > 0 K, got T={T!r}, Tb={Tb!r}")
    d_svb = myrdal_yalkowsky_dSvb(tau, hbn)
    d_cp = 90.0 + 2.1 * tau
    log10_atm = -d_svb * (Tb - T) / (19.1 * T) - d_cp / 19.1 * (
        (Tb - T) / T - math.log(Tb / T)
    )
    return P_ATM * 10.0**log10_atm


def myrdal_yalkowsky_curve(
    T: np.ndarray, Tb: float, tau: float = 0.0, hbn: float = 0.0
) -> np.ndarray:
    """Return P [Pa] of :func:`myrdal_yalkowsky_psat` over a grid of T [K]."""
    T = np.asarray(T, dtype=float)
    if np.any(T <= 0.0):
        raise ValueError("temperatures must be > 0 K")
    d_svb = myrdal_yalkowsky_dSvb(tau, hbn)
    d_cp = 90.0 + 2.1 * tau
    log10_atm = -d_svb * (Tb - T) / (19.1 * T) - d_cp / 19.1 * ((Tb - T) / T - np.log(Tb / T))
    return P_ATM * 10.0**log10_atm


@dataclass(frozen=True)
class PressureEstimate:
    """An estimated vapour pressure with its standard uncertainty.

    Attributes
    ----------
    value : float
        Estimated vapour pressure [Pa].
    u_ln : float
        Standard uncertainty of ln(value) [-]; the one-sigma interval is
        value*exp(-u_ln) .. value*exp(+u_ln) (about +-u_ln relative when small).
    in_range : bool
        False when T is above Tb (the model is fitted below Tb).
    method : str
        Name of the method.
    reference : str
        Short citation.
    """

    value: float
    u_ln: float
    in_range: bool
    method: str = "Myrdal-Yalkowsky 1997"
    reference: str = "Ind. Eng. Chem. Res. 1997, 36, 2494"

    @property
    def u(self) -> float:
        """Standard uncertainty [Pa] to first order, u = P * u_ln."""
        return self.value * self.u_ln


def ln_psat_tb_sensitivity(T: float, Tb: float, tau: float = 0.0, hbn: float = 0.0,
                           step: float = TB_STEP) -> float:
    r"""Return d ln P / d Tb of :func:`myrdal_yalkowsky_psat` at T [1/K].

    .. math::
        \frac{\partial \ln P}{\partial T_b} \approx
        \frac{\ln P(T_b + h) - \ln P(T_b - h)}{2h}, \quad h = 0.5\ \mathrm{K}

    A central difference (error of order h^2 times the third derivative,
    negligible here: ln P is nearly linear in Tb over 1 K). Negative: a higher
    boiling point means a lower vapour pressure.

    Check against the derivative of the closed form, toluene (tau = HBN = 0,
    Tb = 383.75 K, T = 298.15 K): ln 10 * [-86/(19.1 T) - 90/19.1 (1/T - 1/Tb)]
    = 2.302585 * (-0.015102 - 0.003525) = -0.04289 per K.

    >>> round(ln_psat_tb_sensitivity(298.15, 383.75), 4)
    -0.0429
    """
    return (math.log(myrdal_yalkowsky_psat(T, Tb + step, tau, hbn))
            - math.log(myrdal_yalkowsky_psat(T, Tb - step, tau, hbn))) / (2 * step)


def estimate_psat(T: float, Tb: float, tau: float = 0.0, hbn: float = 0.0,
                  h_bond_donor: bool | None = None, u_Tb: float = 0.0) -> PressureEstimate:
    r"""Estimate P [Pa] at T [K] from Tb [K] with a standard uncertainty.

    ``h_bond_donor`` says whether the molecule has an O-H or N-H donor; it
    selects :data:`U_LN_PSAT_HBOND` or :data:`U_LN_PSAT_NON_HBOND`. When it
    is None (unknown) the larger uncertainty is used: HBN alone cannot tell,
    since a secondary amine has HBN 0 yet donates a hydrogen bond.
    The uncertainties were measured at 298.15 K for Tb of about 300-500 K;
    they grow as T moves further below Tb.

    ``u_Tb`` [K] is the standard uncertainty of Tb itself (e.g. of an
    estimated boiling point; 0 for a measured one, whose error is part of the
    model's measured uncertainty). It is combined with the model's by
    first-order propagation, the two taken as uncorrelated (JCGM 100:2008,
    GUM, eq. 10):

    .. math::
        u(\ln P) = \sqrt{u_{model}^2 +
        \left(\frac{\partial \ln P}{\partial T_b}\,u(T_b)\right)^2}

    with the derivative from :func:`ln_psat_tb_sensitivity`.

    >>> e = estimate_psat(298.15, 383.75, h_bond_donor=False)
    >>> round(e.value), e.u_ln
    (3544, 0.12)
    >>> round(estimate_psat(298.15, 383.75, h_bond_donor=False, u_Tb=10.0).u_ln, 3)
    0.445

    (sqrt(0.12^2 + (0.04289 * 10)^2) = 0.445.)
    """
    if h_bond_donor is None:
        h_bond_donor = True  # unknown: take the larger (conservative) uncertainty
    u = U_LN_PSAT_HBOND if (h_bond_donor or hbn > 0.0) else U_LN_PSAT_NON_HBOND
    if u_Tb:
        u = math.hypot(u, ln_psat_tb_sensitivity(T, Tb, tau, hbn) * u_Tb)
    return PressureEstimate(
        value=myrdal_yalkowsky_psat(T, Tb, tau, hbn), u_ln=u, in_range=T <= Tb
    )


@dataclass(frozen=True)
class EnthalpyEstimate:
    """An estimated enthalpy of vaporization [J/mol] with its standard uncertainty [J/mol]."""

    value: float
    u: float


def estimate_dhvap_at_tb(Tb: float, tau: float = 0.0, hbn: float = 0.0) -> EnthalpyEstimate:
    r"""Estimate the enthalpy of vaporization at the normal boiling point [J/mol].

    .. math:: \Delta H_v(T_b) = T_b\,\Delta S_{vb}(\tau, HBN), \quad
              u = 0.04\,\Delta H_v(T_b)

    :func:`myrdal_yalkowsky_dHvap` at T = Tb; the relative standard
    uncertainty :data:`U_REL_DHVAP_TB` comes from the measured median error
    (2.7 %, n = 510 against CRC). The uncertainty of Tb itself is not
    included (the estimate is stated "at the boiling point").

    >>> e = estimate_dhvap_at_tb(383.75)  # toluene; CRC Hvap(Tb) 33180 J/mol
    >>> round(e.value), round(e.u)
    (33002, 1320)
    """
    dh = myrdal_yalkowsky_dHvap(Tb, Tb, tau, hbn)
    return EnthalpyEstimate(dh, U_REL_DHVAP_TB * dh)
