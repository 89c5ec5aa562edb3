"""Liquid molar volume and density at 25 °C from atom and ring increments.

Contents
--------
- ``VolumeEstimate``: molar volume [m³/mol], density [kg/m³], their standard uncertainties,
  the atom codes without an increment, and a status.
- ``atom_code(atom)``, ``ring_codes(mol)``: the codes the increments are keyed by.
- ``molar_volume_increments(mol)``: the plain sum, cm³/mol, and the codes it lacks.
- ``estimate_liquid_density(mol_or_smiles)``: the estimate with its uncertainty.

Method
------
Mathieu (2018) [1]_ fitted additive increments for the molar volume of liquids at 25 °C
alongside his Hansen-parameter method (``builder/chem/hansen.py``):

    V = Σ_atoms v(code) + Σ_rings v(ring code)      [cm³/mol]
    ρ = M / V                                         [g/cm³ → ×1000 kg/m³]

Atom codes are symbol + number of neighbours (hydrogens included) + number of hydrogens, with
"a" for aromatic atoms (``C43`` is a methyl carbon); each ring of the smallest set of smallest
rings adds its size term and, when all its atoms are aromatic, the aromatic term.  The
increments are data (``builder/data/hansen_groups.yaml``, from the paper's supporting script).

Accuracy measured here against CRC Handbook densities as shipped in ``chemicals`` 1.5.2
(``CRC_organic_data['rho']``, liquids at 20-25 °C; the table does not give the temperature per
row) over organic C/H/N/O/S/halogen compounds melting below 25 °C: see ``DENSITY_ERROR`` and
``python -m builder.fitting.hansen --report``.  The paper itself reports no separate error for
the volume increments in what we have read.

Valid range: neutral organic liquids of H, B, C, N, O, F, Si, P, S, Cl, Ge, Se, Br, Sn, I and
Ti whose atom types all have an increment; solids get a sub-cooled-liquid volume.

References
----------
.. [1] D. Mathieu, ACS Omega 3 (2018) 17049-17056 ("Pencil and Paper Estimation of Hansen
   Solubility Parameters"); increments from the supporting-information script (figshare 7449257).
"""
from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any

from rdkit import Chem

from builder.chem.datafile import load_yaml
from builder.chem.molar_mass import molar_mass

GROUPS_PATH = Path(__file__).resolve().parent.parent / "data" / "hansen_groups.yaml"

DENSITY_ERROR = 0.041
"""Relative standard uncertainty of the density (RMS relative error against the CRC densities of
the compounds the increments cover, measured with ``builder.fitting.hansen.density_report``)."""


@lru_cache(maxsize=1)
def increments() -> dict[str, Any]:
    """Read and cache ``hansen_groups.yaml``."""
    with open(GROUPS_PATH, encoding="utf-8") as handle:
        return load_yaml(handle)


def atom_code(atom: Chem.Atom) -> str:
    """Return the increment code of ``atom``: symbol, neighbours, hydrogens, "a" if aromatic.

    >>> mol = Chem.MolFromSmiles("CC(=O)O")
    >>> [atom_code(a) for a in mol.GetAtoms()]
    ['C43', 'C30', 'O10', 'O21']
    """
    code = f"{atom.GetSymbol()}{atom.GetTotalDegree()}{atom.GetTotalNumHs()}"
    return code + ("a" if atom.GetIsAromatic() else "")


def ring_codes(mol: Chem.Mol) -> Counter:
    """Count the ring terms: one size term per ring and "aromatic" for each fully aromatic ring."""
    counts: Counter = Counter()
    for ring in mol.GetRingInfo().AtomRings():
        size = len(ring)
        counts["R<5" if size < 5 else "R>6" if size > 6 else f"R{size}"] += 1
        if all(mol.GetAtomWithIdx(i).GetIsAromatic() for i in ring):
            counts["aromatic"] += 1
    return counts


def molar_volume_increments(mol: Chem.Mol) -> tuple[float, tuple[str, ...]]:
    """Return (V in cm³/mol over the atoms that have an increment, codes without one)."""
    table = increments()
    volume = 0.0
    missing = []
    for atom in mol.GetAtoms():
        code = atom_code(atom)
        if code in table["atoms"]:
            volume += table["atoms"][code][0]
        else:
            missing.append(code)
    for code, n in ring_codes(mol).items():
        volume += n * table["rings"][code]
    return volume, tuple(sorted(missing))


@dataclass(frozen=True)
class VolumeEstimate:
    """Liquid molar volume [m³/mol] and density [kg/m³] at 25 °C, with standard uncertainties."""

    molar_volume_m3_per_mol: float | None
    density_kg_m3: float | None
    u_molar_volume: float | None
    u_density: float | None
    missing_codes: tuple[str, ...]
    status: str
    method: str = "mathieu-2018-volume"


def estimate_liquid_density(mol_or_smiles: Chem.Mol | str) -> VolumeEstimate:
    r"""Estimate the molar volume and density of the liquid at 25 °C (Mathieu 2018 increments).

    .. math:: V = \sum_i n_i v_i + \sum_r n_r v_r,\qquad \rho = M/V

    Parameters
    ----------
    mol_or_smiles : rdkit.Chem.Mol or str
        Structure [-]

    Returns
    -------
    VolumeEstimate
        Molar volume [m³/mol] and density [kg/m³] with standard uncertainties (relative
        ``DENSITY_ERROR``); values None, with the reason in ``status``, when an atom has no
        increment, the SMILES does not parse or there is more than one fragment.

    Notes
    -----
    Valid at 25 °C and atmospheric pressure for neutral liquids; reference: Mathieu, ACS Omega 3
    (2018) 17049.  Error against CRC densities: about 2 % mean absolute (``DENSITY_ERROR``).

    Examples
    --------
    Benzene, CRC density 876.5 kg/m³ at 20 °C (``chemicals`` 1.5.2), 873.6 at 25 °C (from memory):

    >>> est = estimate_liquid_density("c1ccccc1")
    >>> round(est.molar_volume_m3_per_mol * 1e6, 2)
    88.09
    >>> abs(est.density_kg_m3 - 876.5) < 2 * est.u_density
    True
    """
    mol = Chem.MolFromSmiles(mol_or_smiles) if isinstance(mol_or_smiles, str) else mol_or_smiles
    if mol is None:
        return VolumeEstimate(None, None, None, None, (), "SMILES did not parse")
    if len(Chem.GetMolFrags(mol)) > 1:
        return VolumeEstimate(None, None, None, None, (), "more than one fragment (salt or mixture)")
    volume, missing = molar_volume_increments(mol)
    if missing:
        return VolumeEstimate(None, None, None, None, missing,
                              "no volume increment for atom type " + ", ".join(missing))
    if volume <= 0:
        return VolumeEstimate(None, None, None, None, (), "non-positive increment sum")
    v_si = volume * 1e-6
    rho = molar_mass(mol) / volume * 1000.0
    return VolumeEstimate(v_si, rho, DENSITY_ERROR * v_si, DENSITY_ERROR * rho, (), "OK")
