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
           "The highest temperature a store or container is rated to reach, as stated for the site.",
           "Site data in entries/locations.yaml or the entry's catalog section."),
]

METHODS: dict[str, Method] = {m.id: m for m in _METHODS}


def register(method: Method) -> Method:
    """Add a method (chemistry modules call this at import); ids are unique."""
    if method.id in METHODS and METHODS[method.id] != method:
        raise ValueError(f"method id {method.id!r} registered twice")
    METHODS[method.id] = method
    return method
