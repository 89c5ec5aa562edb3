"""Physical constants the chemistry modules share, each defined once (SI units).

``builder/chem`` imports nothing else of the builder, so it keeps these here; the
stages above chem convert and format temperatures through ``builder/core/units.py``,
which holds the one other copy of 0 °C (the two are checked equal by a test).

>>> T_ZERO_CELSIUS + 25.0
298.15
>>> round(R * T_ZERO_CELSIUS / P_ATM * 1000, 3)  # molar volume of an ideal gas at 0 °C, 1 atm [L/mol]
22.414
"""
from __future__ import annotations

R = 8.314462618
"""Molar gas constant [J/(mol K)] (CODATA 2018, exact in the 2019 SI)."""

P_ATM = 101325.0
"""Standard atmosphere [Pa] (exact by definition)."""

T_ZERO_CELSIUS = 273.15
"""0 °C in kelvin (exact by the definition of the Celsius scale)."""
