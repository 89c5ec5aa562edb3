"""Dipole moment estimate from a conformer ensemble.

Contents
--------
- :func:`dipole_moment` -- estimate for a SMILES or Mol (uses the cached ensemble).
- :func:`ensemble_dipole` -- the same for a given :class:`ConformerEnsemble`.
- :func:`point_charge_dipole` -- |sum q_i r_i| of one geometry, in debye.
- :func:`recalibrated_charges`, :func:`bond_increment_keys`, :func:`atom_class` -- the
  fitted charge correction; :func:`load_model` reads it from ``data/dipole_model.json``.
- :func:`molecule_family`, :func:`standard_uncertainty` -- the uncertainty by family.
- :class:`DipoleEstimate` -- value, uncertainty, method, status and per-conformer moments.
- :data:`POLAR_THRESHOLD_D`, :data:`MMFF_STANDARD_UNCERTAINTY_D`.

Method ("recalibrated-charge Boltzmann RMS dipole")
---------------------------------------------------
Each conformer of :func:`builder.chem.structure3d.conformer_ensemble` (ETKDG v3,
MMFF94-minimised) carries point charges, and its moment is the point-charge sum.
Conformers are combined as the Boltzmann-weighted mean square at 298.15 K, the
average that enters the orientation polarisation of a freely rotating molecule
(Debye [3]_):

.. math::
    \\mu = \\sqrt{\\sum_c w_c \\mu_c^2}, \\qquad
    w_c = \\frac{e^{-E_c/RT}}{\\sum_d e^{-E_d/RT}}, \\qquad
    \\mu_c = 4.803\\,\\Big|\\sum_i q_i \\mathbf{r}_{i,c}\\Big|

The charges are the MMFF94 bond-increment charges [1]_ (Gasteiger-Marsili [2]_ when
MMFF94 cannot type every atom), recalibrated against experimental gas-phase moments:

.. math::
    q_i = s\\,q_i^{\\mathrm{base}} + \\sum_{\\mathrm{bonds}\\ ij} \\pm\\left(\\delta_{a(i)a(j)} + \\delta_{e(i)e(j)}\\right)

with one scale s per charge model, and increments delta per pair of atom classes
(element, aromaticity, number of neighbours; :func:`atom_class`) and per element pair,
moved from one bond atom to the other (so the total charge is unchanged and
symmetry-equivalent atoms stay equal: symmetric molecules keep a zero moment). This is
the bond-charge-increment idea of MMFF94 itself [1]_, with increments fitted to moments
instead of to ab initio electrostatics. MMFF94 charges are made for condensed-phase
interactions and overstate gas-phase moments; the fit gives s = 0.52 for MMFF94, the
increments putting back what each bond type needs.

The fit (``python -m builder.fitting.dipole``): robust (soft-L1, 0.3 D) least squares
with a ridge penalty chosen by 5-fold cross-validation, on the 80 % of the reference
moments in ``chemicals`` 1.5.2 (CCCBDB, Muller, Poling; neutral, at most 30 heavy atoms)
whose SHA-256 of the InChIKey's first block falls at or above 20 mod 100. Increments are
fitted for keys seen in at least 3 training molecules; rarer bonds keep only the scaled
base charges. Ions get no value (their dipole depends on the origin), and neither do
radicals (open-shell; outside both charge models).

Accuracy on the held-out 20 % (``builder/data/dipole_validation.json``; n = 125, of which
105 have a clear reference below 0.2 D or above 0.8 D): mean absolute error 0.30 D (0.32 D
on the clear ones; uncorrected MMFF94 0.59 and 0.64 D), root-mean-square error 0.54 D,
polar/non-polar agreement 97.1 % at 0.5 D. ``python tests/benchmarks/bench_profile.py`` gives the
figures over the whole reference set. The standard uncertainty given with a value is
that of the molecule's family (:func:`molecule_family`), the root-mean-square of
out-of-sample residuals (5-fold out-of-fold on the training part plus the held-out
part; ``uncertainty`` in the model file): hydrocarbons 0.20 D, other N/O compounds 0.47
D, halocarbons 0.54 D, inorganic 0.60 D, O-H/N-H compounds 0.63 D, compounds of S, P,
Si and other elements 0.96 D. Flexible molecules (3 or more torsions) are worse than
rigid ones (held-out MAE 0.53 against 0.24 D). Typical misses: conformer-sensitive
moments (1,2-dimethoxyethane, 1,1,2,2-tetrafluoroethane), bonds too rare to be fitted
(C-I, interhalogens), hypervalent and charge-separated inorganics (SO3, SF6, N2O).
Valid range: neutral closed-shell molecules of H, C, N, O, F, Si, P, S, Cl, Br, I.

References
----------
.. [1] Halgren, T. A. Merck Molecular Force Field. II. MMFF94 van der Waals and
   Electrostatic Parameters for Intermolecular Interactions. J. Comput. Chem. 1996,
   17, 520-552.
.. [2] Gasteiger, J.; Marsili, M. Iterative Partial Equalization of Orbital
   Electronegativity - a Rapid Access to Atomic Charges. Tetrahedron 1980, 36,
   3219-3228. doi:10.1016/0040-4020(80)80168-2.
.. [3] Debye, P. Polar Molecules; Chemical Catalog Co.: New York, 1929.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any

import numpy as np
from rdkit import Chem, rdBase
from rdkit.Chem import AllChem, rdForceFieldHelpers

from builder.chem.memo import for_last
from builder.chem.structure3d import (
    TEMPERATURE_K,
    ConformerEnsemble,
    canonical_smiles,
    conformer_ensemble,
)

__all__ = [
    "DEBYE_PER_E_ANGSTROM",
    "FAMILIES",
    "METHOD_GASTEIGER",
    "METHOD_MMFF",
    "METHOD_RAW_GASTEIGER",
    "METHOD_RAW_MMFF",
    "MODEL_PATH",
    "MMFF_STANDARD_UNCERTAINTY_D",
    "POLAR_THRESHOLD_D",
    "DipoleEstimate",
    "atom_class",
    "bond_increment_keys",
    "dipole_moment",
    "ensemble_dipole",
    "load_model",
    "molecule_family",
    "planar_dipole",
    "point_charge_dipole",
    "recalibrated_charges",
    "standard_uncertainty",
]

DEBYE_PER_E_ANGSTROM = 4.803204
"""1 e*angstrom in debye: 1.602176634e-29 C m / 3.335640952e-30 C m (1 D = 1e-21/c C m)."""

POLAR_THRESHOLD_D = 0.5
"""Moment above which a molecule is called polar [D]. No standard value exists;
0.5 D is a common rule of thumb, and the reference comparison excludes the
0.2-0.8 D band around it."""

MMFF_STANDARD_UNCERTAINTY_D = 0.53
"""Standard uncertainty of the default route over all families together [D]: the
root-mean-square out-of-sample error (``uncertainty.all_D`` in the model file). A value's
own uncertainty is its family's (:func:`standard_uncertainty`), from 0.20 to 0.95 D.

>>> MMFF_STANDARD_UNCERTAINTY_D == load_model()["uncertainty"]["all_D"]
True
"""

METHOD_MMFF = "recalibrated MMFF94 charges on ETKDG/MMFF94 conformers, Boltzmann RMS at 298.15 K"
METHOD_GASTEIGER = "recalibrated Gasteiger-Marsili charges on ETKDG conformers, Boltzmann RMS at 298.15 K"
METHOD_RAW_MMFF = "MMFF94 charges (uncorrected) on ETKDG/MMFF94 conformers, Boltzmann RMS at 298.15 K"
METHOD_RAW_GASTEIGER = "Gasteiger-Marsili charges (uncorrected) on ETKDG conformers, Boltzmann RMS at 298.15 K"


@dataclass(frozen=True)
class DipoleEstimate:
    """A dipole moment estimate.

    Attributes
    ----------
    value_D : float or None
        Moment [D]; None when not defined (ion) or not computable.
    uncertainty_D : float or None
        Standard uncertainty [D] of the molecule's family (:func:`standard_uncertainty`);
        None for the uncorrected comparison routes, whose error is not tabulated by family.
    method : str
        Name of the route taken (:data:`METHOD_MMFF` or :data:`METHOD_GASTEIGER`).
    status : str
        "ok", or what was approximated or impossible.
    conformer_moments_D : tuple of float
        Moment of each conformer [D].
    weights : tuple of float
        Boltzmann weight of each conformer.
    """

    value_D: float | None
    uncertainty_D: float | None
    method: str
    status: str
    conformer_moments_D: tuple[float, ...] = ()
    weights: tuple[float, ...] = ()

    @property
    def polar(self) -> bool | None:
        """Whether the moment exceeds :data:`POLAR_THRESHOLD_D` (None without a value)."""
        if self.value_D is None:
            return None
        return self.value_D > POLAR_THRESHOLD_D


def point_charge_dipole(charges: np.ndarray, coordinates: np.ndarray) -> float:
    """Return the magnitude of a point-charge dipole moment.

    .. math:: \\mu = 4.803204\\,\\left|\\sum_i q_i \\mathbf{r}_i\\right|

    Parameters
    ----------
    charges : ndarray, shape (n,)
        Partial charges [e]; they should sum to zero, else the result depends on
        the origin.
    coordinates : ndarray, shape (n, 3)
        Positions [angstrom].

    Returns
    -------
    float
        Dipole moment [D].

    Examples
    --------
    Charges of +1 e and -1 e one angstrom apart: 1.602176634e-29 C m, which is
    4.8032 D with 1 D = 3.33564e-30 C m (CODATA 2018 constants):

    >>> moment = point_charge_dipole(np.array([1.0, -1.0]),
    ...                              np.array([[0.0, 0.0, 0.5], [0.0, 0.0, -0.5]]))
    >>> abs(moment - 1.602176634e-29 / 3.33564095e-30) < 1e-4
    True
    """
    vector = np.asarray(charges, dtype=float) @ np.asarray(coordinates, dtype=float)
    return float(np.linalg.norm(vector) * DEBYE_PER_E_ANGSTROM)


MODEL_PATH = Path(__file__).resolve().parent.parent / "data" / "dipole_model.json"
"""The fitted charge recalibration (written by ``python -m builder.fitting.dipole``)."""

FAMILIES = ("hydrocarbon", "halocarbon", "O-H/N-H", "other N/O", "S, P, Si, other", "inorganic")
"""Molecule families of the uncertainty table, in the order :func:`molecule_family` tests them
(first match from the end: no carbon -> inorganic; then other elements; then O-H/N-H; ...)."""

_HALOGENS = {9, 17, 35, 53}


def molecule_family(mol: Chem.Mol) -> str:
    """Return the family of a molecule for the uncertainty table (one of :data:`FAMILIES`).

    No carbon: "inorganic"; any element other than H, C, N, O and the halogens: "S, P, Si,
    other"; an H on N or O: "O-H/N-H"; N or O: "other N/O"; a halogen: "halocarbon";
    else "hydrocarbon".

    >>> [molecule_family(Chem.MolFromSmiles(s)) for s in ("CCO", "CC(C)=O", "ClCCl", "c1ccccc1", "CS", "O")]
    ['O-H/N-H', 'other N/O', 'halocarbon', 'hydrocarbon', 'S, P, Si, other', 'inorganic']
    """
    numbers = {atom.GetAtomicNum() for atom in mol.GetAtoms()}
    if 6 not in numbers:
        return "inorganic"
    if numbers - {1, 6, 7, 8} - _HALOGENS:
        return "S, P, Si, other"
    if any(atom.GetAtomicNum() in (7, 8) and atom.GetTotalNumHs(includeNeighbors=True) > 0 for atom in mol.GetAtoms()):
        return "O-H/N-H"
    if numbers & {7, 8}:
        return "other N/O"
    if numbers & _HALOGENS:
        return "halocarbon"
    return "hydrocarbon"


def atom_class(atom: Chem.Atom) -> str:
    """Return the atom class that keys the bond charge increments: element symbol, "a" when
    aromatic, and the number of neighbours (hydrogens included; call on a molecule with
    explicit hydrogens).

    >>> mol = Chem.AddHs(Chem.MolFromSmiles("CO"))
    >>> [atom_class(a) for a in mol.GetAtoms()][:3]
    ['C4', 'O2', 'H1']
    """
    aromatic = "a" if atom.GetIsAromatic() else ""
    return f"{atom.GetSymbol()}{aromatic}{atom.GetDegree()}"


def bond_increment_keys(mol: Chem.Mol) -> list[tuple[str, int, int, float]]:
    """List the charge-increment terms of a molecule with explicit hydrogens.

    A term is ``(key, i, j, factor)``: an increment delta of that key moves charge
    +factor*delta onto atom ``i`` and -factor*delta onto atom ``j`` (factor is 1 here; the
    field leaves room for scaled terms). Every bond gives

    - between atoms of different :func:`atom_class`: ``"a:X-Y"`` (the two class names
      sorted; ``i`` is the atom named first);
    - between different elements: ``"e:X-Y"`` (element symbols sorted), which carries
      the part shared by all bonds of that element pair.

    Bonds between atoms of one class carry no term, so symmetry-equivalent atoms stay equal.

    >>> sorted(k for k, _, _, _ in bond_increment_keys(Chem.AddHs(Chem.MolFromSmiles("CCl"))))
    ['a:C4-Cl1', 'a:C4-H1', 'a:C4-H1', 'a:C4-H1', 'e:C-Cl', 'e:C-H', 'e:C-H', 'e:C-H']
    """
    terms = []
    for bond in mol.GetBonds():
        first, second = bond.GetBeginAtom(), bond.GetEndAtom()
        for prefix, names in (("a:", (atom_class(first), atom_class(second))),
                              ("e:", (first.GetSymbol(), second.GetSymbol()))):
            if names[0] == names[1]:
                continue
            i, j = (first.GetIdx(), second.GetIdx())
            if names[0] > names[1]:
                names, (i, j) = names[::-1], (j, i)
            terms.append((f"{prefix}{names[0]}-{names[1]}", i, j, 1.0))
    return terms


@lru_cache(maxsize=1)
def load_model(path: str = str(MODEL_PATH)) -> dict[str, Any]:
    """Read the fitted recalibration (scales, bond increments, uncertainty table)."""
    return json.loads(Path(path).read_text(encoding="utf-8"))


def recalibrated_charges(mol: Chem.Mol, base_charges: np.ndarray, base: str,
                         model: dict[str, Any] | None = None) -> np.ndarray:
    """Return recalibrated partial charges [e]: q = s_base * q_base + sum of bond increments.

    ``base`` is "mmff" or "gasteiger" (which scale s applies); increments whose key the
    fit did not learn are zero. The charges still sum to the base total (every
    increment adds +delta and -delta).
    """
    model = load_model() if model is None else model
    charges = model["scale"][base] * np.asarray(base_charges, dtype=float)
    increments = model["increments"]
    for key, i, j, factor in bond_increment_keys(mol):
        delta = factor * increments.get(key, 0.0)
        charges[i] += delta
        charges[j] -= delta
    return charges


def standard_uncertainty(mol: Chem.Mol, model: dict[str, Any] | None = None) -> float:
    """Return the standard uncertainty [D] of the default route for this molecule's family
    (held-out root-mean-square error of its :func:`molecule_family`)."""
    model = load_model() if model is None else model
    table = model["uncertainty"]["families"]
    return float(table[molecule_family(mol)]["standard_uncertainty_D"])


def dipole_moment(mol_or_smiles: str | Chem.Mol, *, charges: str = "auto") -> DipoleEstimate:
    """Estimate the dipole moment of a neutral molecule.

    Parameters
    ----------
    mol_or_smiles : str or rdkit.Chem.Mol
        The structure; stereo is respected.
    charges : {"auto", "mmff", "gasteiger"}
        "auto" (the default route) recalibrates MMFF94 charges (Gasteiger-Marsili when
        MMFF94 cannot type the molecule) with the fitted scale and bond increments;
        "mmff" and "gasteiger" give the uncorrected charge models, for comparison only.

    Returns
    -------
    DipoleEstimate
        Boltzmann RMS moment [D] over the conformers (see module docstring), with the
        standard uncertainty of the molecule's family. Valid for neutral closed-shell
        molecules (H, C, N, O, F, Si, P, S, Cl, Br, I).

    Examples
    --------
    Water, reference 1.85 D (CCCBDB, as bundled in ``chemicals``):

    >>> abs(dipole_moment("O").value_D - 1.85) < 0.4
    True
    """
    return ensemble_dipole(conformer_ensemble(canonical_smiles(mol_or_smiles)), charges=charges)


def ensemble_dipole(ensemble: ConformerEnsemble, *, charges: str = "auto") -> DipoleEstimate:
    """Estimate the dipole moment from a conformer ensemble (see :func:`dipole_moment`).

    The default route's estimate of the last ensemble object is kept (``memo.for_last``): the
    force profile and the Hansen features of one entry both ask for it.
    """
    if charges not in ("auto", "mmff", "gasteiger"):
        raise ValueError(f"charges must be 'auto', 'mmff' or 'gasteiger', got {charges!r}")
    if charges == "auto":
        return _default_route(ensemble)
    return _ensemble_dipole(ensemble, charges)


@for_last
def _default_route(ensemble: ConformerEnsemble) -> DipoleEstimate:
    return _ensemble_dipole(ensemble, "auto")


def _ensemble_dipole(ensemble: ConformerEnsemble, charges: str) -> DipoleEstimate:
    mol = ensemble.mol
    net_charge = Chem.GetFormalCharge(mol)
    if net_charge != 0:
        return DipoleEstimate(
            None, None, METHOD_MMFF,
            f"net charge {net_charge:+d}: an ion's dipole moment depends on the origin",
        )
    if not ensemble.ok:
        return DipoleEstimate(None, None, METHOD_MMFF, ensemble.status)
    if mol.GetNumAtoms() == 1:
        return DipoleEstimate(
            0.0, 0.0, "single atom", "a free atom has no dipole moment (spherical symmetry)",
            (0.0,), (1.0,),
        )
    if any(atom.GetNumRadicalElectrons() for atom in mol.GetAtoms()):
        return DipoleEstimate(None, None, METHOD_MMFF,
                              "radical: open-shell molecules are outside the charge models' range")
    q, method, status = _charges(mol, "mmff" if charges == "auto" else charges)
    if q is None and charges == "auto":
        q, method, status = _charges(mol, "gasteiger")
        if q is not None:
            status = "MMFF94 cannot type every atom; recalibrated Gasteiger-Marsili charges used (less accurate)"
    if q is None:
        return DipoleEstimate(None, None, method, status)
    if charges == "auto":
        base = "mmff" if method == METHOD_RAW_MMFF else "gasteiger"
        q = recalibrated_charges(mol, q, base)
        method = METHOD_MMFF if base == "mmff" else METHOD_GASTEIGER
        uncertainty = standard_uncertainty(mol)
    else:
        uncertainty = None
    moments = np.array(
        [point_charge_dipole(q, ensemble.coordinates(cid)) for cid in ensemble.conformer_ids]
    )
    weights = ensemble.weights(TEMPERATURE_K)
    value = math.sqrt(float(weights @ moments**2))
    return DipoleEstimate(
        value, uncertainty, method, status,
        tuple(float(m) for m in moments), tuple(float(w) for w in weights),
    )


#: largest molecule (heavy atoms) :func:`planar_dipole` draws; above it the feature is 0 (a 2D
#: depiction of a 1000-atom chain takes tens of seconds; the boiling-point fitting set stays below)
PLANAR_MAX_HEAVY_ATOMS = 100


def planar_dipole(mol: Chem.Mol) -> float:
    """Return the moment of the recalibrated charges on a 2D depiction [D]: a cheap
    stereo and polarity descriptor, not a physical dipole moment.

    .. math:: \\mu_{2D} = 4.803\\,\\Big|\\sum_i q_i \\mathbf{r}^{2D}_i\\Big|

    The charges are those of the default route (:func:`recalibrated_charges` on MMFF94,
    or Gasteiger-Marsili when MMFF94 cannot type the molecule); the coordinates are
    RDKit's 2D depiction with explicit hydrogens [angstrom], which keeps the E/Z
    configuration of double bonds (but not the tetrahedral stereo of ring substituents).
    The moment therefore separates cis from trans isomers where the 3D one does, at a
    few milliseconds and without conformers. Zero for single atoms, ions and
    molecules neither charge model covers. Used as a boiling-point feature
    (:mod:`builder.chem.boiling`); its error as a dipole moment has not been measured.

    >>> cis, trans = (planar_dipole(Chem.MolFromSmiles(s)) for s in ("Cl/C=C\\\\Cl", "Cl/C=C/Cl"))
    >>> cis > 1.5, trans < 0.05
    (True, True)
    """
    if mol.GetNumHeavyAtoms() > PLANAR_MAX_HEAVY_ATOMS:
        return 0.0  # the depiction grows faster than the molecule; no training molecule is this large
    work = Chem.AddHs(mol)
    if work.GetNumAtoms() < 2 or Chem.GetFormalCharge(work) != 0:
        return 0.0
    blocker = rdBase.BlockLogs()
    try:
        q, method, _ = _charges(work, "mmff")
        if q is None:
            q, method, _ = _charges(work, "gasteiger")
        if q is None:
            return 0.0
        AllChem.Compute2DCoords(work)
    finally:
        del blocker
    q = recalibrated_charges(work, q, "mmff" if method == METHOD_RAW_MMFF else "gasteiger")
    return point_charge_dipole(q, work.GetConformer().GetPositions())


def _charges(mol: Chem.Mol, which: str) -> tuple[np.ndarray | None, str, str]:
    """Uncorrected MMFF94 ("mmff") or Gasteiger-Marsili ("gasteiger") charges of ``mol``."""
    if which == "mmff":
        props = rdForceFieldHelpers.MMFFGetMoleculeProperties(mol)
        if props is None:
            return None, METHOD_RAW_MMFF, "MMFF94 cannot type every atom"
        q = np.array([props.GetMMFFPartialCharge(i) for i in range(mol.GetNumAtoms())])
        return q, METHOD_RAW_MMFF, "ok"
    work = Chem.Mol(mol)
    AllChem.ComputeGasteigerCharges(work)
    q = np.array([atom.GetDoubleProp("_GasteigerCharge") for atom in work.GetAtoms()])
    if not np.all(np.isfinite(q)):
        missing = sorted({a.GetSymbol() for a, x in zip(work.GetAtoms(), q) if not np.isfinite(x)})
        return None, METHOD_RAW_GASTEIGER, f"no MMFF94 or Gasteiger parameters for {', '.join(missing)}"
    return q, METHOD_RAW_GASTEIGER, "ok"
