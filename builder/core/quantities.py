"""The quantities of the catalog, each declared once: what it is, its dimension and how it is labelled.

``STATED_PROPERTIES``: the properties an entry may state (the loader, the JSON Schema,
the README's list and the datasheet's labels all read this table).
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class PropertySpec:
    """A stated property: its dimension, a label, and the smallest physical SI value."""

    dimension: str
    label: str
    minimum: float | None = None  # SI; values at or below are impossible
    maximum: float | None = None
    needs_temperature: bool = False  # conditions.at required (e.g. vapor pressure)
    help: str = ""
    unit: str | None = None  # unit kept inside when not the dimension's SI unit (ppm, %)


STATED_PROPERTIES: dict[str, PropertySpec] = {
    "boiling_point": PropertySpec("temperature", "Boiling point", 0.0,
                                  help="normal boiling point (at 101.325 kPa unless conditions say otherwise)"),
    "melting_point": PropertySpec("temperature", "Melting point", 0.0),
    "flash_point": PropertySpec("temperature", "Flash point", 0.0, help="give the test method, e.g. closed cup"),
    "autoignition_temperature": PropertySpec("temperature", "Auto-ignition temperature", 0.0),
    "density": PropertySpec("density", "Density", 0.0, help="liquid or solid density; conditions.at the temperature"),
    "vapor_pressure": PropertySpec("pressure", "Vapor pressure", 0.0, needs_temperature=True,
                                   help="a value at a stated temperature (conditions.at)"),
    "exposure_limit": PropertySpec("fraction", "Occupational exposure limit (8 h TWA)", 0.0, 1.0,
                                   help="8-hour time-weighted average in ppm, with its source", unit="ppm"),
    "lower_flammable_limit": PropertySpec("fraction", "Lower flammable limit", 0.0, 1.0, help="vol % in air",
                                          unit="%"),
    "upper_flammable_limit": PropertySpec("fraction", "Upper flammable limit", 0.0, 1.0, help="vol % in air",
                                          unit="%"),
    "refractive_index": PropertySpec("ratio", "Refractive index", 1.0),
    "log_kow": PropertySpec("ratio", "log Kow (octanol/water)"),
    "water_solubility": PropertySpec("mass_concentration", "Solubility in water", None),
}
