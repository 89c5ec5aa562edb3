"""Every method and rule that produces a value, with its reference.

A ``computed``, ``estimated``, ``rule`` or ``assumed`` value names one of these ids in
its provenance; the site's methods page lists them and links each value's tag here.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Method:
    id: str
    name: str
    kind: str  # the provenance kind of the values it gives
    summary: str
    reference: str
    equation: str | None = None
    applicability: str | None = None
    error: str | None = None


_METHODS = [
    Method("molar-mass", "Molar mass from the formula", "computed",
           "Sum of standard atomic weights over the atoms of the structure (RDKit's periodic table).",
           "IUPAC Commission on Isotopic Abundances and Atomic Weights, standard atomic weights, as tabulated "
           "in RDKit (rdkit.Chem.Descriptors.MolWt).",
           "M = Σ n_i · A_r,i  g/mol"),
    Method("electron-count", "Electron count", "computed",
           "Sum of the atomic numbers of all atoms, hydrogens included, less the net formal charge.",
           "Definition (atomic number = electrons of the neutral atom).",
           "N_e = Σ Z_i − q"),
    Method("rdkit-identity", "Canonical SMILES, formula, InChI and InChIKey", "computed",
           "Canonical identifiers written by RDKit from the parsed structure.",
           "RDKit (open-source cheminformatics, rdkit.org); IUPAC International Chemical Identifier (InChI)."),
    Method("site-store-rating", "Store temperature rating", "rule",
           "The highest temperature a store or container is rated to reach, as stated for the site; "
           "for a material kept in several stores, the warmest of them.",
           "Site data in entries/locations.yaml or the entry's catalog section."),
    Method("site-process", "Process temperature", "rule",
           "The temperature the material is handled at in its main process, as stated in the entry.",
           "Site data in the entry's catalog section."),
    Method("default-store-temperature", "Default store temperature", "assumed",
           "When neither the entry nor its stores state a maximum temperature, the catalog assumes "
           "35 °C, a warm indoor store in summer.",
           "Builder default (common practice: plan for the warmest day, not the average)."),
    # --- intermolecular forces
    Method("force-classification", "Dominant intermolecular force", "rule",
           "London dispersion always acts. Dipole–dipole forces act when the estimated net dipole moment "
           "exceeds 0.5 D; hydrogen bonding when the molecule has both an H on N, O or F and an N, O or F "
           "lone pair; ionic forces for salts and charged species. The dominant force is the strongest kind "
           "of contact present (ionic > hydrogen bonding > dipole–dipole > dispersion).",
           "Common practice of physical chemistry; threshold 0.5 D is a common rule of thumb.",
           None, "Pure substances. In large molecules dispersion can still supply most of the attraction; "
           "the force excess shows how much the polar forces add."),
    Method("dipole-mmff-ensemble", "Dipole moment from a conformer ensemble", "estimated",
           "MMFF94 partial charges on several ETKDG conformers (fixed seed), each MMFF-optimised; the "
           "moment is the Boltzmann-weighted root-mean-square over conformers at 298.15 K.",
           "Charges: T. A. Halgren, J. Comput. Chem. 17 (1996) 490; conformers: S. Riniker, G. A. Landrum, "
           "J. Chem. Inf. Model. 55 (2015) 2562 (ETKDG), as implemented in RDKit.",
           "μ = |Σ q_i r_i| per conformer; μ_eff = (Σ w_c μ_c²)^½",
           "Neutral molecules MMFF94 can type (Gasteiger charges otherwise, as the value's note says); "
           "symmetric molecules come out near zero.",
           "Measured against the reference dipole moments shipped in chemicals 1.5.2 (CCCBDB, Müller, Poling; "
           "532 molecules with a moment below 0.2 D or above 0.8 D): polar/non-polar agreement 96.8 % at "
           "0.5 D, mean absolute error 0.57 D, which is the uncertainty shown."),
    Method("polarizability-lorentz-lorenz", "Polarizability from molar refractivity", "estimated",
           "Molar refractivity from Wildman–Crippen atom contributions, converted by the Lorentz–Lorenz "
           "relation; atoms the scheme does not cover fall back to tabulated atomic polarizabilities.",
           "S. A. Wildman, G. M. Crippen, J. Chem. Inf. Comput. Sci. 39 (1999) 868, doi:10.1021/ci990307l.",
           "α = 3·MR / (4π·N_A);  α [Å³] = 0.39643 · MR [cm³/mol]"),
    Method("hbond-counts", "Hydrogen-bond donors and acceptors", "computed",
           "Donors: H atoms on N, O or F. Acceptors: N, O or F atoms with a free lone pair (amide and "
           "aromatic pyrrole-type N excluded).",
           "Definition (common practice), matched with our own SMARTS patterns."),
    Method("shape-npr", "Shape from principal moments of inertia", "estimated",
           "Normalised principal-moment ratios I1/I3 and I2/I3 of the lowest-energy conformer: rod-like "
           "molecules sit near (0, 1), discs near (0.5, 0.5), spheres near (1, 1).",
           "W. H. B. Sauer, M. K. Schwarz, J. Chem. Inf. Comput. Sci. 43 (2003) 987, doi:10.1021/ci025599w."),
    Method("surface-area-labute", "Molecular surface area", "estimated",
           "Labute's approximate van der Waals surface area from the 2D structure.",
           "P. Labute, J. Mol. Graph. Model. 18 (2000) 464, doi:10.1016/S1093-3263(00)00068-1."),
    Method("force-excess", "Force excess over the n-alkane line", "rule",
           "The material's boiling point minus that of a (hypothetical) n-alkane of the same molar mass, "
           "interpolated in ln M between the tabulated n-alkanes C1–C26: how much more than dispersion "
           "alone holds the liquid together.",
           "n-alkane boiling points: CRC Handbook of Chemistry and Physics, 95th ed. (2014), as shipped in "
           "chemicals 1.5.2 (builder/data/n_alkanes.json).",
           "ΔTb = Tb − Tb,n-alkane(M)"),
    # --- boiling point
    Method("tb-joback", "Joback group contribution", "estimated",
           "Normal boiling point from first-order group counts matched with SMARTS; every heavy atom is "
           "assigned to exactly one group.",
           "K. G. Joback, R. C. Reid, Chem. Eng. Commun. 57 (1987) 233–243, doi:10.1080/00986448708960487.",
           "Tb = 198.2 K + Σ n_k·ΔTb,k",
           "Organic molecules whose atoms all fall into a Joback group.",
           "Published: 12.9 K average absolute error over 438 compounds."),
    Method("tb-joback-stein-brown", "Joback with the Stein–Brown correction", "estimated",
           "The Joback sum corrected by the non-linear function of Stein and Brown, which removes "
           "Joback's over-prediction for heavy molecules.",
           "S. E. Stein, R. L. Brown, J. Chem. Inf. Comput. Sci. 34 (1994) 581–587, doi:10.1021/ci00019a016.",
           "Tb' = Tb − 94.84 + 0.5577·Tb − 0.0007705·Tb² (Tb ≤ 700 K); Tb' = Tb + 282.7 − 0.5209·Tb above",
           "Organic molecules; the correction was fitted on the authors' own refitted groups."),
    Method("tb-joback-sb-trees", "Group contribution with a learned residual (this catalog's estimator)",
           "estimated",
           "Joback groups with the Stein–Brown correction as a base; an ensemble of gradient-boosted "
           "regression trees predicts the remaining error from group counts, radius-1 atom environments "
           "(in the spirit of second-order groups) and shape and polarity descriptors. Fitted only on "
           "80 % of the CRC Handbook organic boiling points (split by InChIKey hash); the uncertainty is "
           "the held-out residual spread in the molecule's size band.",
           "Base: Joback & Reid (1987); Stein & Brown (1994). Residual model: J. H. Friedman, Ann. Stat. 29 "
           "(2001) 1189, doi:10.1214/aos/1013203451; second-order idea: L. Constantinou, R. Gani, AIChE J. "
           "40 (1994) 1697. Training data: CRC Handbook of Chemistry and Physics, 95th ed. (2014), as shipped "
           "in chemicals 1.5.2.",
           "Tb = Tb,JSB + Σ_t f_t(x)",
           "Neutral organic molecules of H, C, N, O, S, F, Cl, Br, I.",
           "See the accuracy table below (held-out 20 % of the CRC data)."),
    # --- vapor pressure, exposure, fire
    Method("antoine", "Antoine equation", "rule",
           "Vapor pressure from the entry's Antoine coefficients, only inside their stated temperature range.",
           "C. Antoine, C. R. Acad. Sci. 107 (1888) 681; coefficients from the source the entry cites.",
           "log10(P) = A − B/(T + C)  (or the natural-log form, converted)"),
    Method("myrdal-yalkowsky", "Vapor pressure from the boiling point (Myrdal–Yalkowsky)", "estimated",
           "Integrated Clausius–Clapeyron equation with an entropy of vaporization that grows with chain "
           "flexibility (τ) and hydrogen bonding (HBN), and a heat-capacity term; gives the (sub-cooled) "
           "liquid vapor pressure below the boiling point.",
           "P. B. Myrdal, S. H. Yalkowsky, Ind. Eng. Chem. Res. 36 (1997) 2494–2499, doi:10.1021/ie950242l.",
           "log10(P/atm) = −(86 + 0.4τ + 1421·HBN)(Tb − T)/(19.1·T) + (90 + 2.1τ)/19.1·[(Tb − T)/T − ln(Tb/T)]",
           "Organic liquids below their boiling point.",
           "Measured here at 25 °C against Poling's Antoine data (chemicals 1.5.2): median relative error "
           "6.9 % overall, 17.6 % for hydrogen-bonding liquids; standard uncertainty taken as 0.12 in ln P "
           "(0.40 with O–H/N–H donors)."),
    Method("myrdal-yalkowsky-hvap", "Enthalpy of vaporization at the boiling point (Myrdal–Yalkowsky)",
           "estimated",
           "ΔHvap(Tb) = Tb·ΔSvb with ΔSvb = 86 + 0.4τ + 1421·HBN J/(mol·K).",
           "P. B. Myrdal, S. H. Yalkowsky, Ind. Eng. Chem. Res. 36 (1997) 2494.",
           "ΔHvap = Tb·(86 + 0.4τ + 1421·HBN)",
           None, "Measured here against CRC ΔHvap at Tb: median relative error 2.7 % (n = 510)."),
    Method("catoire-naudet", "Flash point (Catoire–Naudet)", "estimated",
           "Closed-cup flash point from the boiling point, the enthalpy of vaporization at 298.15 K (here "
           "from Myrdal–Yalkowsky) and the carbon count.",
           "L. Catoire, V. Naudet, J. Phys. Chem. Ref. Data 33 (2004) 1083, doi:10.1063/1.1835321.",
           "Tf = 1.477·Tb^0.79686·ΔHvap,298^0.16845·nC^−0.05948  (K, kJ/mol)",
           "Flammable organic liquids (C, H, N, O, S, halogens). Not applied to molecules with more halogen "
           "than carbon atoms (e.g. dichloromethane), which are hardly or not at all flammable.",
           "Measured here against IEC 60079-20-1 flash points with reference boiling points: MAE 8.1 K "
           "(n = 267); standard uncertainty taken as 15 K, combined with the boiling point's when that is "
           "itself estimated."),
    Method("satyanarayana-rao", "Flash point from the boiling point alone (Satyanarayana–Rao)", "estimated",
           "Closed-cup flash point as a function of the boiling point only; used when the structure "
           "counts are not available.",
           "K. Satyanarayana, P. G. Rao, J. Hazard. Mater. 32 (1992) 81–85.",
           "Tf = a + b·(c/Tb)²·e^(−c/Tb)/(1 − e^(−c/Tb))²,  a = 225.1, b = 537.6, c = 2217 K",
           None, "Measured here against IEC 60079-20-1: MAE 12.9 K (n = 267); standard uncertainty 18 K."),
    Method("ghs-flammable-liquid", "GHS flammable liquid category", "rule",
           "Category 1: flash point < 23 °C and initial boiling point ≤ 35 °C; 2: flash point < 23 °C and "
           "initial boiling point > 35 °C; 3: 23–60 °C; 4: > 60–93 °C. When the flash point or the boiling "
           "point is estimated, every category reachable within ±1.645 standard uncertainties (a 90 % "
           "interval) is given.",
           "United Nations, Globally Harmonized System of Classification and Labelling of Chemicals (GHS), "
           "Rev. 10 (2023), chapter 2.6, table 2.6.1.",
           None, "Liquids. EU CLP does not use category 4."),
    Method("coshh-volatility-band", "Volatility band (COSHH Essentials)", "rule",
           "Low, medium or high volatility from the boiling point and the process temperature: at 20 °C "
           "high below 50 °C, low above 150 °C; at a process temperature Tp, high when bp < 2·Tp + 10 and "
           "low when bp > 5·Tp + 50 (°C).",
           "UK Health and Safety Executive, COSHH Essentials (HSG193); S. C. Maidment, Ann. Occup. Hyg. 42 "
           "(1998) 391, doi:10.1016/S0003-4878(98)00048-8.",
           None, "Liquids; a control-banding input, not an exposure estimate."),
    Method("saturated-vapor-concentration", "Saturated vapor concentration", "rule",
           "The vapor concentration in air above the liquid at equilibrium: an upper bound on exposure.",
           "Dalton's law (common practice); see Popendorf, Am. Ind. Hyg. Assoc. J. 45 (1984) 719.",
           "SVC [ppm] = 10⁶ · Psat / 101 325 Pa"),
    Method("vapor-density-ideal-gas", "Vapor density relative to air", "assumed",
           "Pure vapor against air at the same temperature and pressure, treating both as ideal gases.",
           "Ideal-gas law; molar mass of dry air 28.9586 g/mol (Lemmon et al., J. Phys. Chem. Ref. Data 29 "
           "(2000) 331).",
           "d = M / 28.9586 g/mol"),
    Method("vapor-hazard-ratio", "Vapor hazard ratio", "rule",
           "How many times the saturated vapor concentration exceeds the occupational exposure limit.",
           "W. Popendorf, Am. Ind. Hyg. Assoc. J. 45 (1984) 719–726.",
           "VHR = SVC / OEL"),
    Method("handling-rules", "Handling notes", "rule",
           "Short notes produced by the rules in builder/data/handling_rules.yaml from the derived values; "
           "each note names its rule and source. They summarise and never replace the supplier's SDS.",
           "Rules kept as data in this catalog; sources named per rule."),
    Method("boiling-residual-check", "Stated against estimated boiling point", "rule",
           "A stated boiling point more than three standard uncertainties from the structure estimate is "
           "reported by cohesion check: the unit, the value or the structure may be wrong.",
           "Builder rule (3σ of the estimator's held-out residuals)."),
]

METHODS: dict[str, Method] = {m.id: m for m in _METHODS}

