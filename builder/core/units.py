"""Units at the edges: parse text quantities into SI floats, format SI floats for people.

Inside the builder every number is an SI float (K, Pa, kg/m³, g/mol is the one
chemistry exception, kept because every reference uses it).  pint is used only here:
when an entry is read (``parse_quantity``) and when a value is shown (``format_value``).

Contents
--------
DIMENSIONS      named dimensions an entry field may ask for, with their SI unit
parse_quantity  "78.4 °C" / "0.789 g/cm3" / "12 ± 2 mmHg" → (si_value, si_uncertainty)
to_unit         an SI float expressed in another unit (for display and exports)
celsius, kelvin the one °C ↔ K conversion above builder/chem (ZERO_CELSIUS_K)
celsius_text    a temperature as "78.4 °C" (pages, notes, the change report, profile)
format_value    the text shown on a page for a value in its display units
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

_EXPONENT = re.compile(r"(?<=[A-Za-z\u00b5])([23])(?![\d.])")


def _superscripts(text: str) -> str:
    # "cm3" and "m3" are common in data sheets; pint wants "cm**3".
    return _EXPONENT.sub(r"**\1", text)


@lru_cache(maxsize=1)
def registry():
    """pint's unit registry, made on first use (making it takes about 0.3 s, and a build whose
    entries all come from the cache, or that only formats values, never needs it)."""
    import pint

    return pint.UnitRegistry(autoconvert_offset_to_baseunit=True, preprocessors=[_superscripts])


@dataclass(frozen=True)
class Dimension:
    """A physical dimension an entry field accepts: its SI unit and an example."""

    name: str
    si_unit: str
    example: str

    @property
    def dimensionality(self):
        return registry().Quantity(1.0, self.si_unit).dimensionality


DIMENSIONS: dict[str, Dimension] = {
    "temperature": Dimension("temperature", "K", "78.4 °C"),
    "pressure": Dimension("pressure", "Pa", "5.8 kPa"),
    "density": Dimension("density", "kg/m**3", "0.789 g/cm3"),
    "fraction": Dimension("fraction", "dimensionless", "3.3 %"),
    "ratio": Dimension("ratio", "dimensionless", "1.361"),
    "mass_concentration": Dimension("mass concentration", "kg/m**3", "20 mg/m3"),
    # the chemistry exception: molar masses stay in g/mol, as every reference gives them
    "molar_mass": Dimension("molar mass", "g/mol", "46.07 g/mol"),
    # a store's volume limit (locations.yaml)
    "volume": Dimension("volume", "m**3", "250 L"),
}

#: common spellings of each dimension's units, for the JSON Schema (editor completion and checks).
#: The loader accepts any unit pint reads; every spelling here must parse (tests/test_schema.py).
UNIT_SPELLINGS: dict[str, tuple[str, ...]] = {
    "temperature": ("°C", "degC", "K", "°F", "degF"),
    "pressure": ("Pa", "hPa", "kPa", "MPa", "bar", "mbar", "atm", "mmHg", "torr", "psi"),
    "density": ("g/cm3", "g/cm³", "g/mL", "g/ml", "kg/m3", "kg/m³", "kg/L", "g/L"),
    "fraction": ("%", "ppm"),
    "ratio": (),
    "mass_concentration": ("g/L", "mg/L", "mg/mL", "g/mL", "mg/m3", "kg/m3", "g/cm3"),
    "molar_mass": ("g/mol", "kg/mol"),
    "volume": ("L", "mL", "m3", "m³"),
}

#: dimensionless units kept inside as scaled numbers (a fraction of 2e-5 is kept as 20 ppm)
FRACTION_SCALE = {"ppm": 1e6, "%": 100.0}

_NUMBER = r"[-+\u2212]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?"
_QUANTITY = re.compile(
    rf"^\s*(?P<num>{_NUMBER})\s*(?:(?:±|\+/-|\+-)\s*(?P<unc>{_NUMBER}))?\s*(?P<unit>.*?)\s*$"
)


class UnitProblem(ValueError):
    """A quantity that could not be read; ``hint`` says what was expected."""

    def __init__(self, message: str, hint: str | None = None):
        super().__init__(message)
        self.hint = hint


def _number(text: str) -> float:
    return float(text.replace("\u2212", "-"))


#: longest quantity text read (a longer one is a paste accident, and keeps the pattern linear)
MAX_QUANTITY_CHARS = 1000


def _shown(value: object) -> str:
    """``repr`` of a value for a message, cut to a readable length."""
    text = repr(value)
    return text if len(text) <= 42 else text[:40] + "…" + text[-1]


def _kind(value: object) -> str:
    return {dict: "a mapping", list: "a list", type(None): "nothing"}.get(type(value), type(value).__name__)


def parse_quantity(text: object, dimension: str) -> tuple[float, float | None]:
    """Read ``"<number> [± <number>] <unit>"`` and return SI (value, uncertainty).

    A bare number is accepted only for dimensionless quantities.  Raises
    ``UnitProblem`` with a hint naming the expected dimension otherwise.
    """
    dim = DIMENSIONS[dimension]
    if isinstance(text, bool):
        raise UnitProblem(f"expected a {dim.name} such as '{dim.example}', got {text!r}")
    if isinstance(text, (int, float)):
        try:
            number = float(text)
        except OverflowError:
            number = math.inf
        if not math.isfinite(number):
            raise UnitProblem(f"{_shown(text)} is not a finite number", hint="write a measured value")
        if dim.si_unit == "dimensionless":
            return number, None
        raise UnitProblem(
            f"{_shown(text)} has no unit",
            hint=f"write the unit, e.g. '{dim.example}'",
        )
    if not isinstance(text, str):
        raise UnitProblem(f"expected a {dim.name} such as '{dim.example}', got {_kind(text)}")
    if len(text) > MAX_QUANTITY_CHARS:
        raise UnitProblem(f"quantity text of {len(text)} characters is too long",
                          hint=f"expected a {dim.name}, e.g. '{dim.example}'")
    match = _QUANTITY.match(text)
    if not match:
        raise UnitProblem(
            f"cannot read {_shown(text)} as a number with a unit",
            hint=f"expected a {dim.name}, e.g. '{dim.example}'",
        )
    unit_text = match["unit"] or "dimensionless"
    if any(sign in unit_text for sign in ("±", "+/-", "+-")):
        raise UnitProblem(f"cannot read the uncertainty in {_shown(text)}",
                          hint="write '<number> ± <number> <unit>', e.g. '78.4 ± 0.2 °C'")
    fast = _FAST_UNITS.get((dimension, unit_text))
    if fast is not None:
        convert, convert_difference = _by_factor(*fast)
    else:
        convert, convert_difference = _through_pint(unit_text, dim, dimension)
    try:
        value = convert(_number(match["num"]))
    except Exception as exc:  # e.g. an offset unit inside a product ("°C·m/m")
        raise UnitProblem(f"cannot convert {_shown(text)} to {dim.si_unit}",
                          hint=f"expected a {dim.name}, e.g. '{dim.example}'") from exc
    if not math.isfinite(value):
        raise UnitProblem(f"{_shown(text)} is not a finite number")
    unc = None
    if match["unc"] is not None:
        if match["unc"][0] in "-\u2212":
            raise UnitProblem(f"the uncertainty in {_shown(text)} is negative",
                              hint="write it without a sign, e.g. '78.4 ± 0.2 °C'")
        # An uncertainty is a difference: converted without the offset of °C or °F.
        unc = abs(convert_difference(_number(match["unc"])))
        if not math.isfinite(unc):
            raise UnitProblem(f"the uncertainty in {_shown(text)} is not a finite number")
    return float(value), unc


def _by_factor(factor: float, offset: float):
    """Conversions of a unit of ``_FAST_UNITS``: a value and a difference, in SI."""
    return (lambda x: x * factor + offset if offset else x * factor), (lambda x: x * factor)


def _through_pint(unit_text: str, dim: Dimension, dimension: str):
    """Conversions of any other unit pint reads (a value and a difference, in SI), after checking
    that it is a unit of ``dim``; raises ``UnitProblem`` when not."""
    try:
        unit = registry().Unit(unit_text) if unit_text != "dimensionless" else registry().dimensionless
        dimensionality = registry().Quantity(1.0, unit).dimensionality
    except Exception as exc:  # pint raises many kinds (syntax, arithmetic, offset units) for odd unit text
        raise UnitProblem(f"unknown unit {_shown(unit_text)}",
                          hint=f"expected a {dim.name}, e.g. '{dim.example}'") from exc
    if dimensionality != dim.dimensionality:
        raise UnitProblem(
            f"{_shown(unit_text)} is not a unit of {dim.name}",
            hint=f"expected a {dim.name}, e.g. '{dim.example}'",
        )
    if dimension == "temperature" and "delta_" in str(unit):
        raise UnitProblem(f"{_shown(unit_text)} is a temperature difference, not a temperature",
                          hint="write a temperature such as '78.4 °C' or '351.6 K'")

    def convert(x: float) -> float:
        return registry().Quantity(x, unit).to(dim.si_unit).magnitude

    if dimension == "temperature":
        per_kelvin = registry().Quantity(1.0, _delta_unit(unit)).to("K").magnitude
        return convert, (lambda x: abs(x) * per_kelvin)
    return convert, convert  # no offset: a difference converts as a value does


#: 0 °C in kelvin (exact).  builder/chem keeps its own copy in chem/constants.py (it imports
#: nothing of the builder); everything above chem converts through ``celsius`` and ``kelvin`` below.
ZERO_CELSIUS_K = 273.15


#: the units entries use most, read without pint: (dimension, unit text) -> (factor, offset) to SI.
#: Each gives the very float pint gives (x * factor + offset, in that order; a test compares both
#: over many values); making pint's registry takes about half a second, so a build whose changed
#: entries name only these never makes it.
_FAST_UNITS = {
    ("temperature", "K"): (1.0, 0.0), ("temperature", "°C"): (1.0, ZERO_CELSIUS_K),
    ("temperature", "degC"): (1.0, ZERO_CELSIUS_K),
    ("pressure", "Pa"): (1.0, 0.0), ("pressure", "hPa"): (100.0, 0.0), ("pressure", "kPa"): (1000.0, 0.0),
    ("pressure", "bar"): (1e5, 0.0), ("pressure", "MPa"): (1e6, 0.0),
}


def _delta_unit(unit) -> str:
    name = str(unit)
    return {"degree_Celsius": "delta_degC", "degree_Fahrenheit": "delta_degF"}.get(name, name)


def to_unit(si_value: float, si_unit: str, unit: str) -> float:
    """Express an SI float in ``unit`` (offset units handled)."""
    return float(registry().Quantity(si_value, si_unit).to(unit).magnitude)


def celsius(kelvin_value: float) -> float:
    """A temperature in K as °C."""
    return kelvin_value - ZERO_CELSIUS_K


def kelvin(celsius_value: float) -> float:
    """A temperature in °C as K."""
    return celsius_value + ZERO_CELSIUS_K


def celsius_text(kelvin_value: float, decimals: int = 1, unit: bool = True) -> str:
    """'78.4 °C' for 351.55 K, with a true minus sign; ``unit=False`` leaves off ' °C'."""
    text = fixed(celsius(kelvin_value), decimals)
    return f"{text} °C" if unit else text


#: exact factors for the fixed display units of the exports (the same arithmetic every time)
_DISPLAY_SCALE = {("Pa", "kPa"): 1e-3, ("kg/m**3", "g/cm3"): 1e-3, ("g/mol", "g/mol"): 1.0}


def to_display(si_value: float, si_unit: str, unit: str) -> float:
    """An SI float in a display unit of the exports: ``degC`` for K, ``kPa``, ``g/cm3`` ..."""
    if si_unit == "K" and unit == "degC":
        return celsius(si_value)
    if si_unit == unit:
        return si_value
    scale = _DISPLAY_SCALE.get((si_unit, unit))
    if scale is None:
        scale = _scale(si_unit, unit)
    return si_value * scale if scale is not None else to_unit(si_value, si_unit, unit)


@lru_cache(maxsize=256)
def _scale(si_unit: str, unit: str) -> float | None:
    """The factor from ``si_unit`` to ``unit`` when the conversion is a plain factor (no offset),
    asked of pint once per pair (a conversion through pint costs about 15 µs; exports make
    thousands)."""
    factor, offset = to_unit(1.0, si_unit, unit), to_unit(0.0, si_unit, unit)
    return factor if offset == 0.0 else None


def _round(x: float, digits: int) -> str:
    if x == 0 or not math.isfinite(x):
        return f"{x:g}"
    if 1e4 <= abs(x) < 1e9:
        # large numbers in plain digits with thin-space groups: 28 690, not 2.869 × 10^4
        rounded = round(x, digits - 1 - int(math.floor(math.log10(abs(x)))))
        return f"{rounded:,.0f}".replace(",", "\u2009")
    text = f"{x:.{digits}g}"
    if "e" in text:
        mantissa, exp = text.split("e")
        return f"{mantissa} × 10^{int(exp)}"
    return text


def fixed(x: float, decimals: int) -> str:
    """Fixed-point text with a true minus sign."""
    return f"{x:.{decimals}f}".replace("-", "\u2212")


def uncertainty_decimals(uncertainty: float) -> int:
    """Decimal places at which a value and its standard uncertainty are both written.

    The uncertainty keeps two significant digits when its first three digits are 100 to 354 and
    one digit above that (the Particle Data Group's rounding rule, Review of Particle Physics,
    "Introduction: rounding"), in line with the GUM (JCGM 100:2008, 7.2.6: at most two significant
    digits).  The value is then rounded to the same place.

    >>> uncertainty_decimals(0.57), uncertainty_decimals(0.012), uncertainty_decimals(10.3)
    (1, 3, 0)
    >>> uncertainty_decimals(22.0), uncertainty_decimals(0.96), uncertainty_decimals(480.0)
    (0, 1, -2)
    """
    exponent = math.floor(math.log10(uncertainty))
    leading = uncertainty / 10 ** (exponent - 2)  # three digits, 100 ... 999
    if leading >= 949.5:  # rounds up to 1.0 of the next decade: two digits of that
        return 1 - (exponent + 1)
    return (1 if leading < 354.5 else 0) - exponent


def _measured(x: float, uncertainty: float | None, plain_digits: int = 4) -> str:
    """``x ± u`` with digits set by the uncertainty (``uncertainty_decimals``); without one,
    ``x`` to ``plain_digits`` significant digits.  Big or small numbers share a power of ten:
    (5 ± 5) × 10^-7; large ones in digit groups: 580 000 ± 480 000."""
    if not uncertainty:
        return _round(x, plain_digits)
    decimals = uncertainty_decimals(uncertainty)
    power = 0
    if decimals < -8 or decimals > 6:  # write both in a shared power of ten
        power = math.floor(math.log10(uncertainty))
        x, uncertainty = x / 10 ** power, uncertainty / 10 ** power
        decimals = uncertainty_decimals(uncertainty)
    shown = max(decimals, 0)

    def digits(v: float) -> str:
        text = f"{round(v, decimals):,.{shown}f}".replace(",", "\u2009")
        return text if abs(v) >= 1e4 else text.replace("\u2009", "")

    value_text = digits(x)
    if value_text.lstrip("-").strip("0.") == "":
        value_text = value_text.lstrip("-")  # no "−0.0"
    text = f"{value_text} ± {digits(uncertainty)}"
    return f"({text}) × 10^{power}" if power else text


def format_value(si_value: float, si_unit: str, uncertainty: float | None = None) -> str:
    """Text a person reads: temperatures in °C with K beside, pressures in kPa; with an
    uncertainty, the digits are set by it (``uncertainty_decimals``)."""
    if si_unit == "K":
        if uncertainty:
            d = min(max(uncertainty_decimals(uncertainty), 0), 1)
            return (f"{celsius_text(si_value, d, unit=False)} ± {round(uncertainty, d):.{d}f} °C "
                    f"({si_value:.{d}f} K)")
        return f"{celsius_text(si_value, 1, unit=False)} °C ({si_value:.1f} K)"
    if si_unit == "Pa":
        unc = uncertainty / 1000.0 if uncertainty else None
        return f"{_measured(si_value / 1000.0, unc)} kPa".replace("-", "\u2212")
    if si_unit == "kg/m**3":
        unc = f" ± {uncertainty / 1000.0:.3f}" if uncertainty else ""
        return f"{si_value / 1000.0:.3f}{unc} g/cm³"
    if si_unit in FRACTION_SCALE:
        return f"{_measured(si_value, uncertainty)} {si_unit}".replace("-", "\u2212")
    if si_unit == "K delta":
        if uncertainty:
            d = min(max(uncertainty_decimals(uncertainty), 0), 1)
            sign = "+" if round(si_value, d) > 0 else ""
            return f"{sign}{si_value:.{d}f} ± {round(uncertainty, d):.{d}f} K".replace("-", "\u2212")
        return f"{si_value:+.1f} K".replace("-", "\u2212")
    display = {"g/mol": "g/mol", "D": "D", "A**3": "Å³", "A**2": "Å²", "ppm": "ppm", "MPa**0.5": "MPa½", "cm**3/mol": "cm³/mol",
               "dimensionless": "", "count": ""}
    if si_unit == "J/mol":
        if uncertainty:
            return f"{_measured(si_value / 1000.0, uncertainty / 1000.0)} kJ/mol".replace("-", "\u2212")
        return f"{si_value / 1000.0:.1f} kJ/mol"
    unit_text = display.get(si_unit, si_unit)
    return f"{_measured(si_value, uncertainty)} {unit_text}".strip().replace("-", "\u2212")
