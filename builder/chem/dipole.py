"""Dipole moment estimate from a conformer ensemble.

Contents
--------
- :func:`dipole_moment` -- estimate for a SMILES or Mol (uses the cached ensemble).
- :func:`ensemble_dipole` -- the same for a given :class:`ConformerEnsemble`.
- :func:`point_charge_dipole` -- |sum q_i r_i| of one geometry, in debye.
- :class:`DipoleEstimate` -- value, uncertainty, method, status and per-conformer moments.
- :data:`POLAR_THRESHOLD_D`, :data:`MMFF_MAE_D`, :data:`GASTEIGER_MAE_D`.

Method ("MMFF94-charge Boltzmann RMS dipole")
---------------------------------------------
Each conformer of :func:`builder.chem.structure3d.conformer_ensemble` (ETKDG v3,
MMFF94-minimised) gets the MMFF94 bond-increment partial charges [1]_, and its moment
is the point-charge sum. Conformers are combined as the Boltzmann-weighted mean
square at 298.15 K, the average that enters the orientation polarisation of a
freely rotating molecule (Debye [3]_):

.. math::
    \\mu = \\sqrt{\\sum_i w_i \\mu_i^2}, \\qquad
    w_i = \\frac{e^{-E_i/RT}}{\\sum_j e^{-E_j/RT}}

When MMFF94 cannot type every atom, Gasteiger-Marsili charges [2]_ on the UFF (or
embedded) geometry are used instead; that fallback is less accurate, and the
``method`` and ``status`` say so. Ions (net charge not zero) get no value: their
dipole depends on the choice of origin.

Accuracy, measured by ``python tools/bench_profile.py`` against the CCCBDB, Muller
and Poling tables in ``chemicals`` 1.5.2 (neutral molecules of at most 30 heavy atoms
whose reference moment is below 0.2 D or above 0.8 D; n = 532): mean absolute error
0.57 D, median 0.42 D, polar/non-polar agreement 96.8 %. Typical misses: small
strained rings, conformer-sensitive moments (1,1,2,2-tetrafluoroethane, diethyl
carbonate), radicals, charge-separated and hypervalent inorganics (N2O, SO3, SF6).
Valid range: neutral closed-shell organic molecules that MMFF94 types.

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

import math
from dataclasses import dataclass

import numpy as np
from rdkit import Chem
from rdkit.Chem import AllChem, rdForceFieldHelpers

from builder.chem.structure3d import (
    TEMPERATURE_K,
    ConformerEnsemble,
    canonical_smiles,
    conformer_ensemble,
)

__all__ = [
    "DEBYE_PER_E_ANGSTROM",
    "GASTEIGER_MAE_D",
    "METHOD_GASTEIGER",
    "METHOD_MMFF",
    "MMFF_MAE_D",
    "MMFF_RMS_D",
    "MMFF_STANDARD_UNCERTAINTY_D",
    "GASTEIGER_STANDARD_UNCERTAINTY_D",
    "POLAR_THRESHOLD_D",
    "DipoleEstimate",
    "dipole_moment",
    "ensemble_dipole",
    "point_charge_dipole",
]

DEBYE_PER_E_ANGSTROM = 4.803204
"""1 e*angstrom in debye: 1.602176634e-29 C m / 3.335640952e-30 C m (1 D = 1e-21/c C m)."""

POLAR_THRESHOLD_D = 0.5
"""Moment above which a molecule is called polar [D]. No standard value exists;
0.5 D is a common rule of thumb, and the reference comparison excludes the
0.2-0.8 D band around it."""

MMFF_MAE_D = 0.57
"""Mean absolute error of the default route [D]: 532 reference molecules, RDKit 2026.09.1;
96.8 % polar/non-polar agreement at the 0.5 D cut, median absolute error 0.42 D."""

GASTEIGER_MAE_D = 0.60
"""Mean absolute error [D] with Gasteiger-Marsili charges forced on the same 530 molecules
(MMFF94 geometries); only 90.6 % polar/non-polar agreement (esters come out near 0.4 D)."""

MMFF_RMS_D = 0.93
"""Root-mean-square error of the default route [D] on the same 532 reference molecules
(``python tools/bench_profile.py``). The errors are heavy-tailed (a few flexible or strongly
polar molecules are far off), so the RMS is well above MAE·√(π/2) = 0.71 D, the value a
normal distribution with this MAE would have."""

MMFF_STANDARD_UNCERTAINTY_D = MMFF_RMS_D
"""Standard uncertainty of the default route [D]: the root-mean-square error on the
reference set, the usual estimate of a standard uncertainty from residuals.

>>> MMFF_STANDARD_UNCERTAINTY_D
0.93
"""

GASTEIGER_STANDARD_UNCERTAINTY_D = round(GASTEIGER_MAE_D * MMFF_RMS_D / MMFF_MAE_D, 2)
"""Standard uncertainty with Gasteiger-Marsili charges [D]: its MAE scaled by the RMS/MAE
ratio measured for the default route (about 0.98 D); its own RMS has not been measured."""

METHOD_MMFF = "MMFF94 charges on ETKDG/MMFF94 conformers, Boltzmann RMS at 298.15 K"
METHOD_GASTEIGER = "Gasteiger-Marsili charges on ETKDG conformers, Boltzmann RMS at 298.15 K"


@dataclass(frozen=True)
class DipoleEstimate:
    """A dipole moment estimate.

    Attributes
    ----------
    value_D : float or None
        Moment [D]; None when not defined (ion) or not computable.
    uncertainty_D : float or None
        Standard uncertainty [D]: the route's measured mean absolute error converted
        as for a normal distribution (:data:`MMFF_STANDARD_UNCERTAINTY_D`).
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


def dipole_moment(mol_or_smiles: str | Chem.Mol, *, charges: str = "auto") -> DipoleEstimate:
    """Estimate the dipole moment of a neutral molecule.

    Parameters
    ----------
    mol_or_smiles : str or rdkit.Chem.Mol
        The structure; stereo is respected.
    charges : {"auto", "mmff", "gasteiger"}
        "auto" uses MMFF94 charges and falls back to Gasteiger-Marsili only when MMFF94
        cannot type the molecule; "gasteiger" forces the fallback (for measuring it).

    Returns
    -------
    DipoleEstimate
        Boltzmann RMS moment [D] over the conformers (see module docstring). Reported
        MAE :data:`MMFF_MAE_D` (MMFF94 route). Valid for neutral closed-shell molecules
        that MMFF94 covers (H, C, N, O, F, Si, P, S, Cl, Br, I organics).
    """
    return ensemble_dipole(conformer_ensemble(canonical_smiles(mol_or_smiles)), charges=charges)


def ensemble_dipole(ensemble: ConformerEnsemble, *, charges: str = "auto") -> DipoleEstimate:
    """Estimate the dipole moment from a conformer ensemble (see :func:`dipole_moment`)."""
    if charges not in ("auto", "mmff", "gasteiger"):
        raise ValueError(f"charges must be 'auto', 'mmff' or 'gasteiger', got {charges!r}")
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
    q, method, status = _charges(mol, charges)
    if q is None:
        return DipoleEstimate(None, None, method, status)
    moments = np.array(
        [point_charge_dipole(q, ensemble.coordinates(cid)) for cid in ensemble.conformer_ids]
    )
    weights = ensemble.weights(TEMPERATURE_K)
    value = math.sqrt(float(weights @ moments**2))
    uncertainty = MMFF_STANDARD_UNCERTAINTY_D if method == METHOD_MMFF else GASTEIGER_STANDARD_UNCERTAINTY_D
    return DipoleEstimate(
        value, uncertainty, method, status,
        tuple(float(m) for m in moments), tuple(float(w) for w in weights),
    )


def _charges(mol: Chem.Mol, which: str) -> tuple[np.ndarray | None, str, str]:
    if which != "gasteiger":
        props = rdForceFieldHelpers.MMFFGetMoleculeProperties(mol)
        if props is not None:
            q = np.array([props.GetMMFFPartialCharge(i) for i in range(mol.GetNumAtoms())])
            return q, METHOD_MMFF, "ok"
        if which == "mmff":
            return None, METHOD_MMFF, "MMFF94 cannot type every atom"
    work = Chem.Mol(mol)
    AllChem.ComputeGasteigerCharges(work)
    q = np.array([atom.GetDoubleProp("_GasteigerCharge") for atom in work.GetAtoms()])
    if not np.all(np.isfinite(q)):
        missing = sorted({a.GetSymbol() for a, x in zip(work.GetAtoms(), q) if not np.isfinite(x)})
        return None, METHOD_GASTEIGER, f"no MMFF94 or Gasteiger parameters for {', '.join(missing)}"
    status = "ok" if which == "gasteiger" else (
        "MMFF94 cannot type every atom; fell back to Gasteiger-Marsili charges (less accurate)"
    )
    return q, METHOD_GASTEIGER, status
