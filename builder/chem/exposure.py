"""Vapour exposure screening: saturated vapour concentration, vapour density.

Contents
--------
- :func:`saturated_vapor_concentration_ppm`: SVC [ppm by volume] from the
  vapour pressure.
- :func:`saturated_vapor_mass_concentration`: SVC [kg/m3] (ideal gas).
- :func:`vapor_hazard_ratio`: SVC / OEL, Popendorf's vapour hazard ratio [1].
- :func:`relative_vapor_density`: vapour density relative to air, M/M_air.

Units: pressure [Pa], temperature [K], molar mass [g/mol] (as everywhere in the
catalog). All assume ideal-gas vapour. SVC is the concentration in air saturated with
the vapour at a given temperature, an upper bound: real workplace
concentrations are usually far lower (HSE RR923 found exposures to low-
volatility substances below about 1 % of SVC [3]).

References
----------
1. Popendorf, W. Vapor Pressure and Solvent Vapor Hazards. Am. Ind. Hyg.
   Assoc. J. 1984, 45 (10), 719-726.
   https://doi.org/10.1080/15298668491400485
2. Lemmon, E. W.; Jacobsen, R. T.; Penoncello, S. G.; Friend, D. G.
   Thermodynamic Properties of Air and Mixtures of Nitrogen, Argon, and
   Oxygen. J. Phys. Chem. Ref. Data 2000, 29, 331-385 (M_air = 28.9586 g/mol).
3. Health and Safety Executive. Research Report RR923 (2012).
"""

from __future__ import annotations

from builder.chem.constants import P_ATM, R

M_AIR = 28.9586
"""Molar mass of dry air [g/mol] (Lemmon et al. 2000 [2])."""

MIN_MOLAR_MASS = 1.0
"""Smallest molar mass accepted [g/mol]: below one hydrogen atom (1.008 g/mol), so a value
under it was given in kg/mol."""


def _check_molar_mass(molar_mass: float, largest: float | None = None) -> None:
    if not molar_mass >= MIN_MOLAR_MASS:
        raise ValueError(f"molar mass {molar_mass!r} g/mol is below one hydrogen atom; "
                         "was it given in kg/mol?")
    if largest is not None and molar_mass > largest:
        raise ValueError(f"molar mass {molar_mass!r} g/mol is above {largest:g} g/mol: not a vapour")


def saturated_vapor_concentration_ppm(psat: float, pressure: float = P_ATM) -> float:
    r"""Return the saturated vapour concentration [ppm by volume].

    .. math:: SVC = 10^6\,P_{sat}/P

    Parameters
    ----------
    psat : float
        Vapour pressure at the temperature of interest [Pa].
    pressure : float
        Total (ambient) pressure [Pa]; 101325 by default.

    Notes
    -----
    Ideal gas (mole fraction = partial-pressure fraction). Above
    ``psat >= pressure`` the liquid boils and the result exceeds 10^6 ppm;
    a ValueError is raised then.

    >>> round(saturated_vapor_concentration_ppm(3789.0))  # toluene at 25 degC
    37395
    """
    if psat < 0.0 or not pressure > 0.0:
        raise ValueError(f"need psat >= 0 and pressure > 0, got {psat!r}, {pressure!r}")
    if psat > pressure:
        raise ValueError(f"psat {psat} Pa exceeds the total pressure {pressure} Pa: it boils")
    return 1.0e6 * psat / pressure


def saturated_vapor_mass_concentration(psat: float, molar_mass: float, T: float) -> float:
    r"""Return the saturated vapour mass concentration [kg/m3].

    .. math:: c = P_{sat} M / (R T)

    with M in kg/mol; the function takes g/mol and divides by 1000.

    Parameters
    ----------
    psat : float
        Vapour pressure [Pa].
    molar_mass : float
        Molar mass [g/mol].
    T : float
        Temperature [K].

    Notes
    -----
    Ideal gas. Multiply by 10^6 for mg/m3.

    >>> round(saturated_vapor_mass_concentration(3789.0, 92.14, 298.15), 4)  # toluene, 25 degC
    0.1408
    """
    if psat < 0.0 or not T > 0.0:
        raise ValueError("need psat >= 0 and T > 0")
    _check_molar_mass(molar_mass)
    return psat * (molar_mass / 1000.0) / (R * T)


def vapor_hazard_ratio(svc: float, oel: float) -> float:
    """Return Popendorf's vapour hazard ratio SVC/OEL [-] [1].

    ``svc`` and ``oel`` must be in the same unit (both ppm, or both kg/m3).
    A larger ratio means a saturated atmosphere exceeds the exposure limit
    by more; it ranks liquids, it does not predict exposure.

    >>> round(vapor_hazard_ratio(37395.0, 20.0))  # toluene, OEL 20 ppm
    1870
    """
    if not oel > 0.0:
        raise ValueError(f"exposure limit must be > 0, got {oel!r}")
    if svc < 0.0:
        raise ValueError(f"SVC must be >= 0, got {svc!r}")
    return svc / oel


MAX_MOLAR_MASS = 5000.0
"""Largest molar mass :func:`relative_vapor_density` accepts [g/mol]: heavier molecules do not
evaporate (the heaviest liquids that boil undecomposed are far lighter)."""


def relative_vapor_density(molar_mass: float) -> float:
    r"""Return the vapour density relative to air at the same T and P [-].

    .. math:: d = M / M_{air}, \quad M_{air} = 28.9586\ \mathrm{g/mol}

    Ideal-gas assumption: at equal temperature and pressure both gases hold
    the same number of moles per volume, so densities scale with molar mass.
    This compares pure vapour with air; near room temperature a saturated
    vapour-air mixture of a low-volatility liquid is much closer to 1.

    Parameters
    ----------
    molar_mass : float
        Molar mass [g/mol], from :data:`MIN_MOLAR_MASS` to :data:`MAX_MOLAR_MASS`.

    >>> round(relative_vapor_density(92.14), 2)  # toluene
    3.18
    """
    _check_molar_mass(molar_mass, MAX_MOLAR_MASS)
    return molar_mass / M_AIR
