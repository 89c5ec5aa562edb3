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
    #: physically possible SI range (low, high) when narrower than the dimension's PHYSICAL_RANGES
    possible: tuple[float, float] | None = None


@dataclass(frozen=True)
class PhysicalRange:
    """The SI values a quantity of one dimension can have at all; ``shown`` is the range in words."""

    low: float
    high: float
    shown: str


#: What is *possible*, not what is likely: a value outside is an error at load (a typo in the
#: exponent or the unit), while an unusual value inside stays a plausibility warning
#: (builder.review.plausibility).  Each edge and why:
#:   temperature  1 K … 6000 K: helium, the lowest-boiling substance, boils at 4.2 K; tungsten,
#:                the highest-boiling element, at about 5900 K; no material is stored, processed
#:                or changes phase above that (6000 K is about the Sun's surface).
#:   pressure     1e-10 Pa … 1e9 Pa: below 1e-10 Pa no vapor pressure is measured (ultra-high
#:                vacuum); 1 GPa is far beyond any vessel, store or process the catalog describes.
#:   density      0.01 kg/m³ … 25 000 kg/m³: hydrogen gas at 1 atm is 0.09 kg/m³; osmium, the
#:                densest element, 22 590 kg/m³ (25 g/cm³).
#:   mass_concentration 0 … 25 000 kg/m³: a solution cannot hold more than the densest matter.
#:   molar_mass   1 g/mol … 1e7 g/mol: one hydrogen atom is 1.008 g/mol; 1e7 covers polymers.
#:   fraction     0 … 1 (0 to 100 %, 1e6 ppm).
#: Stated properties may narrow these with ``PropertySpec.possible`` (refractive index, log Kow).
#: A store's temperature (catalog.max_store_temperature, a location's rating) is narrower still:
#:   store temperature 1 K … 500 °C: a store is a room, cabinet, fridge, freezer or dewar (liquid
#:                helium, 4 K); nothing is kept hotter than a drying oven (about 300 °C).
PHYSICAL_RANGES: dict[str, PhysicalRange] = {
    "temperature": PhysicalRange(1.0, 6000.0, "1 K … 6000 K"),
    "pressure": PhysicalRange(1e-10, 1e9, "1e-10 Pa … 1 GPa"),
    "density": PhysicalRange(0.01, 25000.0, "0.01 kg/m³ … 25 g/cm³"),
    "mass_concentration": PhysicalRange(0.0, 25000.0, "0 … 25 000 g/L"),
    "molar_mass": PhysicalRange(1.0, 1e7, "1 g/mol … 1e7 g/mol"),
    "fraction": PhysicalRange(0.0, 1.0, "0 … 100 %"),
}
STORE_TEMPERATURE = PhysicalRange(1.0, 773.15, "1 K … 500 °C")


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
    "refractive_index": PropertySpec("ratio", "Refractive index", 1.0,
                                     possible=(1.0, 5.0)),  # the highest known, germanium in the infrared, is about 4
    "log_kow": PropertySpec("ratio", "log Kow (octanol/water)",
                            possible=(-10.0, 15.0)),  # measured values span about -4 … 13
    "water_solubility": PropertySpec("mass_concentration", "Solubility in water", None),
}


# --- derived quantities -------------------------------------------------------------------------


@dataclass(frozen=True)
class CsvColumn:
    """How a quantity appears in catalog.csv: the header, the fixed unit and decimals of a number
    (a ``Label`` gives its code, or its words with ``words=True``), and an optional provenance column."""

    name: str
    unit: str | None = None  # display unit of builder.core.units.to_display
    digits: int = 2
    provenance: str | None = None  # header of a column with the value's provenance kind
    words: bool = False


@dataclass(frozen=True)
class DerivedQuantity:
    """A quantity a derived entry carries (``Derived.values``, ``Derived.labels`` or the force
    profile's numbers), declared once for every output that shows it.

    ``unit`` is the unit the ``Value`` carries (SI, or g/mol, ppm, D, Å³ ...; ``None`` for a
    ``Label``); ``builder.core.units.format_value`` shows it.  ``section``: the datasheet table
    it is a row of ("boiling"; "vapor" and "flash" share the volatility-and-fire table, values
    before labels; "forces" rows come from the force profile; ``None``: shown elsewhere or not
    as a row).  ``csv``: its catalog.csv column(s), in registry order.  ``review``: its label
    in the change report (``None``: not compared).  ``profile``: a top-level value of
    ``cohesion profile``.  ``card``: its label on a shelf card, ``card_missing`` the text
    when a material has none.
    """

    key: str
    label: str
    unit: str | None
    section: str | None = None
    csv: CsvColumn | None = None
    review: str | None = None
    profile: bool = False
    card: str | None = None
    card_missing: str = "—"

    @property
    def is_label(self) -> bool:
        return self.unit is None


_S = STATED_PROPERTIES

#: every derived quantity, in the order the outputs list them
DERIVED_QUANTITIES: dict[str, DerivedQuantity] = {q.key: q for q in (
    DerivedQuantity("molar_mass", "Molar mass", "g/mol", csv=CsvColumn("molar_mass_g_per_mol", "g/mol", 3),
                    profile=True),
    DerivedQuantity("electron_count", "Electrons per molecule", "count", "forces", profile=True),
    DerivedQuantity("dominant_force", "Dominant force", None, csv=CsvColumn("dominant_force"),
                    review="dominant force"),
    DerivedQuantity("physical_state", "Physical state at 20 °C", None, "boiling",
                    CsvColumn("physical_state_20degC"), review="physical state at 20 °C", card="State"),
    DerivedQuantity("physical_state_range", "Possible states at 20 °C", None,
                    csv=CsvColumn("physical_state_possible", words=True), review="possible states"),
    DerivedQuantity("physical_state_store", "Physical state at the highest store temperature", None, "boiling",
                    CsvColumn("physical_state_store"), review="physical state in store"),
    DerivedQuantity("boiling_point_missing", "Boiling point", None, "boiling"),
    DerivedQuantity("boiling_point", _S["boiling_point"].label, "K", "boiling",
                    CsvColumn("boiling_point_degC", "degC", 1, provenance="boiling_point_provenance"),
                    review="boiling point (chosen)", profile=True, card="Boils"),
    DerivedQuantity("boiling_point_estimate", "Boiling point, estimated from structure", "K", "boiling",
                    review="boiling point estimate", profile=True),
    DerivedQuantity("boiling_point_residual", "Stated minus estimated boiling point", "K delta", "boiling"),
    DerivedQuantity("dew_point", "Dew point at 101.325 kPa (end of boiling)", "K", "boiling",
                    CsvColumn("dew_point_degC", "degC", 1), review="dew point", profile=True),
    DerivedQuantity("melting_point", _S["melting_point"].label, "K", "boiling",
                    CsvColumn("melting_point_degC", "degC", 1, provenance="melting_point_provenance"),
                    review="melting point (chosen)", profile=True),
    DerivedQuantity("melting_point_estimate", "Melting point, estimated from structure", "K", "boiling",
                    review="melting point estimate", profile=True),
    DerivedQuantity("critical_temperature_estimate", "Critical temperature, estimated", "K", "boiling",
                    review="critical temperature estimate", profile=True),
    DerivedQuantity("flash_point", _S["flash_point"].label, "K", "flash",
                    CsvColumn("flash_point_degC", "degC", 1, provenance="flash_point_provenance"),
                    review="flash point", profile=True, card="Flash pt."),
    DerivedQuantity("flash_point_estimate", "Flash point, estimated", "K", "flash", review="flash point estimate",
                    profile=True),
    DerivedQuantity("flammable_category", "GHS flammable liquid category", None, "flash",
                    CsvColumn("flammable_category_ghs"), review="flammable-liquid category", card="Flammability",
                    card_missing="not classified: no flash point"),
    DerivedQuantity("hazard_statements", "Hazard statements", None),
    DerivedQuantity("storage_group", "Storage group", None, csv=CsvColumn("storage_group"), review="storage group"),
    DerivedQuantity("flammable_gas_category", "GHS flammable gas category", None, "flash",
                    CsvColumn("flammable_gas_category_ghs"), review="flammable-gas category"),
    DerivedQuantity("gas_under_pressure", "GHS gas under pressure", None, "flash",
                    CsvColumn("gas_under_pressure_ghs"), review="gas under pressure"),
    DerivedQuantity("lower_flammable_limit_estimate", "Lower flammable limit, estimated", "%", "flash",
                    review="lower flammable limit estimate", profile=True),
    DerivedQuantity("upper_flammable_limit_estimate", "Upper flammable limit, estimated", "%", "flash",
                    review="upper flammable limit estimate", profile=True),
    DerivedQuantity("flammable_category_range", "Possible categories", None,
                    csv=CsvColumn("flammable_category_possible", words=True), review="possible categories"),
    DerivedQuantity("vapor_pressure_20C", "Vapor pressure at 20 °C", "Pa", "vapor", review="vapor pressure at 20 °C",
                    profile=True),
    DerivedQuantity("vapor_pressure_25C", "Vapor pressure at 25 °C", "Pa", "vapor",
                    CsvColumn("vapor_pressure_25degC_kPa", "kPa", 4, provenance="vapor_pressure_25degC_provenance"),
                    review="vapor pressure at 25 °C", profile=True),
    DerivedQuantity("vapor_pressure_store", "Vapor pressure at the highest store temperature", "Pa", "vapor",
                    review="vapor pressure in store", profile=True),
    DerivedQuantity("enthalpy_of_vaporization", "Enthalpy of vaporization at the boiling point", "J/mol", "vapor",
                    profile=True),
    DerivedQuantity("saturated_vapor_concentration_20C", "Saturated vapor concentration at 20 °C", "ppm", "vapor",
                    profile=True),
    DerivedQuantity("vapor_density_relative", "Vapor density (air = 1)", "dimensionless", "vapor", profile=True),
    DerivedQuantity("vapor_hazard_ratio", "Vapor hazard ratio (saturated concentration / exposure limit)",
                    "dimensionless", "vapor", profile=True),
    DerivedQuantity("volatility_band", "Volatility band at 20 °C", None, "vapor",
                    CsvColumn("volatility_band_20degC"), review="volatility band"),
    DerivedQuantity("volatility_band_process", "Volatility band at the process temperature", None, "vapor",
                    review="volatility band (process)"),
    DerivedQuantity("store_temperature", "Highest store temperature", "K", review="store temperature"),
    DerivedQuantity("process_temperature", "Process temperature", "K"),
    # Hansen solubility parameters and the cohesive-energy split (builder/derive/solvency.py), shown in the
    # force section's second table
    DerivedQuantity("hansen_delta_d", "Hansen dispersion parameter δD", "MPa**0.5", "solvency",
                    CsvColumn("hansen_delta_d_MPa05", "MPa**0.5", 1, provenance="hansen_delta_d_provenance"),
                    review="Hansen δD"),
    DerivedQuantity("hansen_delta_p", "Hansen polar parameter δP", "MPa**0.5", "solvency",
                    CsvColumn("hansen_delta_p_MPa05", "MPa**0.5", 1, provenance="hansen_delta_p_provenance"),
                    review="Hansen δP"),
    DerivedQuantity("hansen_delta_h", "Hansen hydrogen-bonding parameter δH", "MPa**0.5", "solvency",
                    CsvColumn("hansen_delta_h_MPa05", "MPa**0.5", 1, provenance="hansen_delta_h_provenance"),
                    review="Hansen δH"),
    DerivedQuantity("cohesive_share_dispersion", "Share of cohesive energy: dispersion (δD²/δ²)", "%", "solvency"),
    DerivedQuantity("cohesive_share_polar", "Share of cohesive energy: polar (δP²/δ²)", "%", "solvency"),
    DerivedQuantity("cohesive_share_hbond", "Share of cohesive energy: hydrogen bonding (δH²/δ²)", "%",
                    "solvency"),
    DerivedQuantity("density", _S["density"].label, "kg/m**3", "solvency",
                    CsvColumn("density_g_per_cm3", "g/cm3", 4, provenance="density_provenance")),
    DerivedQuantity("molar_volume", "Liquid molar volume", "cm**3/mol", "solvency"),
    # the force profile's numbers (Derived.forces.numbers), in its table's order
    DerivedQuantity("hbond_donors", "Hydrogen-bond donors (H on N, O, F)", "count", "forces"),
    DerivedQuantity("hbond_acceptors", "Hydrogen-bond acceptors (N, O, F lone pairs)", "count", "forces"),
    DerivedQuantity("polarizability", "Polarizability", "A**3", "forces"),
    DerivedQuantity("dipole_moment", "Dipole moment", "D", "forces"),
    DerivedQuantity("shape_npr1", "Shape: moment ratio I1/I3", "dimensionless", "forces"),
    DerivedQuantity("shape_npr2", "Shape: moment ratio I2/I3", "dimensionless", "forces"),
    DerivedQuantity("surface_area", "Surface area", "A**2", "forces"),
    DerivedQuantity("force_excess", "Force excess over the n-alkane of equal mass", "K delta", "forces"),
)}
