"""Physical state, flammable gases and gases under pressure.

Contents
--------
- :func:`physical_state`: gas, liquid or solid at a temperature and 101.325 kPa from the
  melting and boiling points, with every state their 90 % intervals allow.
- :func:`flammable_gas_category`: UN GHS Rev. 10 chapter 2.2 category 1A / 1B / 2 from
  the flammability limits in air [1].
- :func:`jones_limits`: lower and upper flammability limits from the stoichiometric
  concentration (Jones 1938) [2].
- :func:`gas_under_pressure_group`: UN GHS Rev. 10 chapter 2.5 group from the critical
  temperature [1].
- :func:`check_declared_for_state`: declared H-codes that do not fit the state.

Criteria (UN GHS Rev. 10 [1]; written from memory, to be checked against the text):

- a *gas* is completely gaseous at 20 °C and 101.3 kPa (ch. 1.2; the second arm, vapour
  pressure above 300 kPa at 50 °C, is not modelled); a *liquid* is not a gas and melts at
  or below 20 °C; otherwise a *solid*.
- flammable gas (ch. 2.2, table 2.2.1): category 1A when ignitable in air at 13 vol % or
  less, or when the flammable range is at least 12 percentage points; such a gas is 1B
  instead when its lower limit is above 6 vol % (or its fundamental burning velocity is
  below 10 cm/s, used only when stated); category 2: any other gas with a flammable range
  in air.  H220 (1A), H221 (1B, 2).  Pyrophoric (H232) and chemically unstable gases
  (H230, H231) only when stated.
- gases under pressure (ch. 2.5, table 2.5.1), H280: compressed when Tc ≤ −50 °C;
  liquefied, high pressure when −50 °C < Tc ≤ +65 °C; liquefied, low pressure when
  Tc > +65 °C.  Refrigerated liquefied (H281) and dissolved gases only when stated.

References
----------
1. United Nations. Globally Harmonized System of Classification and Labelling of
   Chemicals (GHS), 10th revised ed.; UN: New York and Geneva, 2023.
2. Jones, G. W. "Inflammation Limits and Their Practical Application in Hazardous
   Industrial Operations." Chem. Rev. 1938, 22, 1-26; as quoted in Crowl, D. A.;
   Louvar, J. F. Chemical Process Safety, 3rd ed., 2011, eqs. 6-10 and 6-11.
"""
from __future__ import annotations

import math

from dataclasses import dataclass

from builder.chem.constants import T_ZERO_CELSIUS

STATES = ("solid", "liquid", "gas")
"""The states, least to most mobile."""

T_REFERENCE = T_ZERO_CELSIUS + 20.0
"""20 °C, the GHS reference temperature for the state [K]."""

K90 = 1.645
"""Coverage factor of a two-sided 90 % interval of a normal error."""

FLAMMABLE_GAS_STATEMENTS = {"1A": "H220", "1B": "H221", "2": "H221"}
"""H-codes of the flammable-gas categories (GHS annex 3)."""

GAS_UNDER_PRESSURE_STATEMENTS = {"compressed": "H280", "liquefied, high pressure": "H280",
                                 "liquefied, low pressure": "H280", "refrigerated liquefied": "H281",
                                 "dissolved": "H280"}

LIQUID_CODES = ("H224", "H225", "H226", "H227")
GAS_CODES = ("H220", "H221", "H280", "H281")


@dataclass(frozen=True)
class StateReading:
    """The state at one temperature: the most likely one, and every state the intervals allow
    (least to most mobile).  ``safer``: the most mobile of them, the reading the handling rules
    use (a liquid-or-solid is handled as a liquid, a gas-or-liquid as a gas)."""

    state: str
    alternatives: tuple[str, ...]

    @property
    def safer(self) -> str:
        return self.alternatives[-1]

    @property
    def clear(self) -> bool:
        return len(self.alternatives) == 1


def _state_at(T: float, tm: float | None, tb: float | None) -> str:
    if tb is not None and T >= tb:
        return "gas"
    if tm is not None and T < tm:
        return "solid"
    return "liquid"


def physical_state(T: float, tm: float | None, u_tm: float | None, tb: float | None,
                   u_tb: float | None, k: float = K90) -> StateReading | None:
    """The state at ``T`` [K] and 101.325 kPa from the melting point ``tm`` and boiling point
    ``tb`` [K] with standard uncertainties ``u_tm``, ``u_tb`` [K] (0 or None when stated).

    A point not known at all (None) leaves its side open: without a melting point a
    non-gas may be liquid or solid; without both, None.  When ``tb`` ≤ ``tm`` (the solid
    sublimes at 101.325 kPa) there is no liquid.  Alternatives span ±``k``·u.

    >>> physical_state(293.15, 178.5, 0, 329.2, 0).state   # acetone, CRC values
    'liquid'
    >>> physical_state(293.15, 288.0, 10.0, 400.0, 0).alternatives
    ('solid', 'liquid')
    """
    if tm is None and tb is None:
        return None
    dm = k * (u_tm or 0.0)
    db = k * (u_tb or 0.0)
    possible = set()
    if tb is not None and T >= tb - db:
        possible.add("gas")
    if tb is None or T < tb + db:
        if tm is None or T < tm + dm:
            possible.add("solid")
        if (tm is None or T >= tm - dm) and not (tm is not None and tb is not None and tb + db <= tm - dm):
            possible.add("liquid")
    state = _state_at(T, tm, tb)
    possible.add(state)
    return StateReading(state, tuple(s for s in STATES if s in possible))


def flammable_gas_category(lfl_percent: float | None, ufl_percent: float | None,
                           burning_velocity_cm_s: float | None = None) -> str | None:
    """GHS Rev. 10 ch. 2.2 category of a gas from its limits in air [vol %] (see module text).

    Returns "1A", "1B", "2", or None when the lower limit is unknown or there is no
    flammable range (upper limit at or below the lower one).

    >>> flammable_gas_category(4.0, 75.0), flammable_gas_category(15.0, 28.0)  # hydrogen, ammonia
    ('1A', '1B')
    """
    if lfl_percent is None:
        return None
    if ufl_percent is not None and ufl_percent <= lfl_percent:
        return None
    span = None if ufl_percent is None else ufl_percent - lfl_percent
    if lfl_percent <= 13.0 or (span is not None and span >= 12.0):
        if lfl_percent > 6.0 or (burning_velocity_cm_s is not None and burning_velocity_cm_s < 10.0):
            return "1B"
        return "1A"
    return "2"


def stoichiometric_percent(c: int, h: int, o: int) -> float | None:
    """Stoichiometric fuel concentration in air [vol %] for CcHhOo (N counted as N2, inert):
    C_st = 100 / (1 + z/0.21), z = c + h/4 − o/2 mol O2 per mol fuel; None if z ≤ 0.

    >>> round(stoichiometric_percent(1, 4, 0), 2)  # methane
    9.5
    """
    z = c + h / 4.0 - o / 2.0
    if z <= 0:
        return None
    return 100.0 / (1.0 + z / 0.21)


JONES_LFL, JONES_UFL = 0.55, 3.50
"""Jones (1938) ratios of the lower and upper limits to the stoichiometric concentration."""


#: relative standard uncertainty given to Jones's limits (from memory: the correlation is quoted as good
#: to about ±30 % for hydrocarbons; the measured error is printed by ``python tools/report_state.py``)
JONES_U_REL = 0.25
#: Guldberg's rule Tc ≈ 1.5·Tb, the fallback where Joback has no groups (methane, inorganic gases)
GULDBERG_RATIO = 1.5
#: its relative standard uncertainty (from memory: the ratio Tb/Tc spans about 0.55-0.75)
GULDBERG_U_REL = 0.12
#: standard uncertainty of Joback Tc from a measured Tb: 1.2533 x the published AAE 4.76 K
JOBACK_TC_U = 6.0


def joback_tc_uncertainty(tc: float, tb: float, u_tb: float = 0.0) -> float:
    """Standard uncertainty of a Joback critical temperature [K]: the method's own (``JOBACK_TC_U``)
    combined with the boiling point's, to first order (Tc is proportional to Tb; GUM, JCGM 100:2008
    eq. 10):  u_Tc = √(u_J² + (Tc/Tb · u_Tb)²).

    >>> round(joback_tc_uncertainty(591.0, 383.8, 10.0), 2)
    16.53
    """
    return math.hypot(JOBACK_TC_U, (tc / tb) * u_tb)


def guldberg_tc(tb: float, u_tb: float = 0.0) -> tuple[float, float]:
    """Guldberg's rule Tc ≈ 1.5·Tb [K] with its standard uncertainty: the rule's own
    (``GULDBERG_U_REL``) combined with the boiling point's, to first order.

    >>> [round(x, 1) for x in guldberg_tc(111.7)]   # methane; measured Tc 190.6 K
    [167.6, 20.1]
    """
    tc = GULDBERG_RATIO * tb
    return tc, math.hypot(GULDBERG_U_REL * tc, GULDBERG_RATIO * u_tb)


def jones_limits(c: int, h: int, o: int) -> tuple[float, float] | None:
    """Jones (1938): LFL ≈ 0.55·C_st and UFL ≈ 3.50·C_st [vol %] for CcHhOo (and N).

    Valid range: organic fuels of C, H, O (N as N2), not halogenated; the error reported
    for the correlation is not verified here (from memory: within about ±30 % for
    hydrocarbons); the error measured against the IEC 60079-20-1 table is printed by
    ``python tools/report_state.py``.  Returns None when there is no oxygen demand.

    >>> [round(x, 2) for x in jones_limits(1, 4, 0)]  # methane; IEC 60079-20-1: 4.4, 17.0
    [5.23, 33.26]
    """
    cst = stoichiometric_percent(c, h, o)
    if cst is None:
        return None
    return JONES_LFL * cst, JONES_UFL * cst


def gas_under_pressure_group(tc_K: float) -> str:
    """GHS Rev. 10 ch. 2.5 group of a gas from its critical temperature [K] (see module text).

    >>> gas_under_pressure_group(190.6), gas_under_pressure_group(425.1)  # methane, butane
    ('compressed', 'liquefied, low pressure')
    """
    tc_c = round(tc_K - T_ZERO_CELSIUS, 6)
    if tc_c <= -50.0:
        return "compressed"
    if tc_c <= 65.0:
        return "liquefied, high pressure"
    return "liquefied, low pressure"


def check_declared_for_state(codes: tuple[str, ...] | list[str], alternatives: tuple[str, ...]) -> str | None:
    """A message when declared H-codes belong to a state the material cannot be in at 20 °C:
    flammable-liquid codes (H224–H227) on a gas or solid, gas codes (H220, H221, H280,
    H281) on a liquid or solid.  None when they fit."""
    problems = []
    liquid = [c for c in codes if c in LIQUID_CODES]
    gas = [c for c in codes if c in GAS_CODES]
    if liquid and "liquid" not in alternatives:
        problems.append(f"{', '.join(liquid)} (flammable liquid) declared for a {' or '.join(alternatives)}")
    if gas and "gas" not in alternatives:
        problems.append(f"{', '.join(gas)} (gas) declared for a {' or '.join(alternatives)}")
    return "; ".join(problems) or None
