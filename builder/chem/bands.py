"""COSHH Essentials volatility bands for liquids.

Contents
--------
- :func:`volatility_band`: "low", "medium" or "high" from the boiling point
  and the process (operating) temperature, by the HSE rule [1, 2].
- :data:`BANDS`: the band names in increasing volatility.

The rule (temperatures in degC; bp = boiling point, Tp = process temperature):

======  ===========================  ==========================
band    at room temperature (20 C)   at process temperature Tp
======  ===========================  ==========================
high    bp < 50                      bp < 2*Tp + 10
medium  50 <= bp <= 150              otherwise
low     bp > 150                     bp > 5*Tp + 50
======  ===========================  ==========================

At Tp = 20 degC the two lines give 50 and 150 degC, so the room-temperature
column is the same rule. Inputs are in kelvin; comparisons are made in degC
rounded to 1e-6 K so that boundary values typed in degC are exact.

Valid range: liquids at process temperatures from room temperature up to
below the boiling point (the band chart's domain); the band is a control-
banding input, not an exposure estimate. For solids HSE uses dustiness
instead.

References
----------
1. Health and Safety Executive. COSHH Essentials: Easy steps to control
   chemicals (HSG193); HSE Books: Sudbury, 1999; 2nd ed. 2003 (edition
   details from memory). The band rule above is from memory and matches the
   research notes; it is consistent at Tp = 20 degC (see tests).
2. Maidment, S. C. Occupational Hygiene Considerations in the Development
   of a Structured Approach to Select Chemical Control Strategies.
   Ann. Occup. Hyg. 1998, 42 (6), 391-400.
   https://doi.org/10.1016/S0003-4878(98)00048-8
"""

from __future__ import annotations

from builder.chem.constants import T_ZERO_CELSIUS

ROOM_TEMPERATURE = 293.15
"""The 20 degC room temperature of the band chart [K]."""

BANDS = ("low", "medium", "high")


def volatility_band(boiling_point: float, process_temperature: float = ROOM_TEMPERATURE) -> str:
    """Return the COSHH Essentials volatility band of a liquid.

    Parameters
    ----------
    boiling_point : float
        Normal boiling point [K].
    process_temperature : float
        Operating temperature of the task [K]; 20 degC by default.

    Returns
    -------
    str
        "high" if bp < 2*Tp + 10 degC, "low" if bp > 5*Tp + 50 degC, else
        "medium" (both boundaries belong to medium).

    >>> volatility_band(T_ZERO_CELSIUS + 56)  # acetone at room temperature
    'medium'
    >>> volatility_band(T_ZERO_CELSIUS + 100, T_ZERO_CELSIUS + 60)  # water-like bp at 60 degC
    'high'
    """
    bp = round(boiling_point - T_ZERO_CELSIUS, 6)
    tp = round(process_temperature - T_ZERO_CELSIUS, 6)
    if bp < 2.0 * tp + 10.0:
        return "high"
    if bp > 5.0 * tp + 50.0:
        return "low"
    return "medium"
