"""Conformer ensembles: 3D structures behind the dipole and shape estimates.

Contents
--------
- :func:`canonical_smiles` -- canonical isomeric SMILES of a SMILES string or RDKit Mol.
- :func:`conformer_ensemble` -- a small MMFF94-optimised ETKDG conformer ensemble,
  cached per canonical SMILES (the 3D work dominates the cost of a force profile);
  :func:`clear_cache` empties the cache.
- :class:`ConformerEnsemble` -- the frozen result: molecule with explicit hydrogens,
  conformer ids, relative energies, Boltzmann weights and a status string.
- :func:`count_torsions` -- the torsion count that sizes the ensemble.

Procedure
---------
Hydrogens are added, then up to :data:`MAX_CONFORMERS` conformers are embedded with
ETKDG version 3 [1]_ [2]_ using a fixed random seed, one thread. Each conformer is
minimised with the MMFF94 force field [3]_; when MMFF94 cannot type an atom the UFF
[4]_ is used, and when neither can, the embedded geometry is kept unoptimised (the
status says which). Relative energies give Boltzmann weights at 298.15 K.

Results are reproducible for a given RDKit version only (the embedding depends on
RDKit's random number stream). The cached :class:`ConformerEnsemble` holds an RDKit
Mol: callers must treat it as read-only.

Budget
------
3D work grows steeply with size, so it is bounded. A molecule (the fragment being
embedded) with more heavy atoms than :func:`max_3d_atoms` (default
:data:`MAX_3D_ATOMS`, changed with the environment variable ``COHESION_MAX_3D_ATOMS``)
is not embedded at all: the ensemble is empty and its status starts with
:data:`TOO_LARGE`, which the dipole, shape and force profile pass on. Below the
limit the work is bounded by counts, not the clock, so results stay deterministic:
embedding attempts (:data:`_MAX_EMBED_ATTEMPTS`) and minimiser iterations
(:data:`_MAX_ITERS`) are capped, and above :data:`FULL_ENSEMBLE_ATOMS` heavy atoms the
number of conformers and iterations shrinks with the square of the size (the status
says so). :data:`EMBED_TIMEOUT_S` is a clock-based safety net on top. Measured on one
core: at most about 5 s for 100 heavy atoms.

References
----------
.. [1] Riniker, S.; Landrum, G. A. Better Informed Distance Geometry: Using What We
   Know To Improve Conformation Generation. J. Chem. Inf. Model. 2015, 55, 2562-2574.
   doi:10.1021/acs.jcim.5b00654.
.. [2] Wang, S.; Witek, J.; Landrum, G. A.; Riniker, S. Improving Conformer
   Generation for Small Rings and Macrocycles Based on Distance Geometry and
   Experimental Torsional-Angle Preferences. J. Chem. Inf. Model. 2020, 60,
   2044-2058. doi:10.1021/acs.jcim.0c00025.
.. [3] Halgren, T. A. Merck Molecular Force Field. I. Basis, Form, Scope,
   Parameterization, and Performance of MMFF94. J. Comput. Chem. 1996, 17, 490-519.
.. [4] Rappe, A. K.; Casewit, C. J.; Colwell, K. S.; Goddard, W. A.; Skiff, W. M.
   UFF, a Full Periodic Table Force Field for Molecular Mechanics and Molecular
   Dynamics Simulations. J. Am. Chem. Soc. 1992, 114, 10024-10035.
"""

from __future__ import annotations

import functools
import os
from dataclasses import dataclass

import numpy as np
from rdkit import Chem, rdBase
from rdkit.Chem import AllChem, rdForceFieldHelpers

__all__ = [
    "EMBED_SEED",
    "EMBED_TIMEOUT_S",
    "MAX_3D_ATOMS",
    "MAX_3D_ATOMS_VARIABLE",
    "MAX_CONFORMERS",
    "TEMPERATURE_K",
    "TOO_LARGE",
    "ConformerEnsemble",
    "canonical_smiles",
    "clear_cache",
    "conformer_ensemble",
    "conformer_stereo",
    "count_torsions",
    "max_3d_atoms",
    "too_large_for_3d",
    "unspecified_stereo",
]

EMBED_SEED = 0xF00D
"""Random seed for ETKDG embedding (fixed, so results repeat)."""

MAX_CONFORMERS = 6
"""Upper bound on conformers per molecule.

Six rather than eight: on the 1,000-entry benchmark catalog the 3D work took 54 instead of 75 s
of CPU (a cold build is mostly 3D work), while the refitted dipole correction kept its held-out
accuracy (``python -m builder.fitting.dipole``: MAE 0.302 D against 0.300 D with eight; 0.526
against 0.514 D on the 20 molecules with three or more torsions; five conformers gave 0.306 and
0.546 D, four 0.317 and 0.600 D)."""

TEMPERATURE_K = 298.15
"""Temperature for Boltzmann weights [K]."""

_R_KCAL = 1.987204259e-3
"""Molar gas constant [kcal/(mol K)] (CODATA 2018, 8.314462618 J/(mol K) / 4184)."""

_MAX_ITERS = 500
"""Minimiser iterations per conformer."""

_MAX_EMBED_ATTEMPTS = 100
"""Embedding attempts per conformer: bounds the time spent on geometrically impossible
stereoisomers (a count, not a clock, so results stay deterministic)."""

EMBED_TIMEOUT_S = 10
"""Wall-clock limit of one embedding call [s]: a safety net only (the counts and the
heavy-atom limit keep every molecule below it); when it strikes, embedding has failed."""

MAX_3D_ATOMS = 100
"""Default heavy-atom limit of the 3D work (embedding, force field, dipole, shape)."""

MAX_3D_ATOMS_VARIABLE = "COHESION_MAX_3D_ATOMS"
"""Environment variable that overrides :data:`MAX_3D_ATOMS` (a whole number, 0 or more)."""

FULL_ENSEMBLE_ATOMS = 30
"""Up to this many heavy atoms the full ensemble is built (:data:`MAX_CONFORMERS`,
:data:`_MAX_ITERS`); the dipole reference comparison lies within it."""

_MIN_ITERS_LARGE = 200
"""Fewest minimiser iterations per conformer for a large molecule."""

TOO_LARGE = "not computed: too large"
"""How every status of a skipped 3D step begins."""

_TORSION = Chem.MolFromSmarts("[!#1;!D1;!$(*#*)]-&!@[!#1;!D1;!$(*#*)]")
_SYMMETRIC_TOPS = tuple(
    Chem.MolFromSmarts(f"[CX4,SiX4]({x})({x}){x}") for x in ("F", "Cl", "Br", "I")
)


@dataclass(frozen=True)
class ConformerEnsemble:
    """A set of 3D conformers of one molecule.

    Attributes
    ----------
    smiles : str
        Canonical isomeric SMILES the ensemble was built from.
    mol : rdkit.Chem.Mol
        Molecule with explicit hydrogens holding the conformers (read-only).
    conformer_ids : tuple of int
        Ids of the conformers in ``mol``, in embedding order.
    energies_kcal_mol : tuple of float
        Force-field energy of each conformer relative to the lowest [kcal/mol];
        all zero when no force field applied.
    forcefield : str
        "MMFF94", "UFF" or "none".
    status : str
        "ok", or a sentence saying what was not possible.
    """

    smiles: str
    mol: Chem.Mol
    conformer_ids: tuple[int, ...]
    energies_kcal_mol: tuple[float, ...]
    forcefield: str
    status: str

    @property
    def ok(self) -> bool:
        """Whether at least one conformer exists."""
        return bool(self.conformer_ids)

    @property
    def lowest_conformer_id(self) -> int:
        """Id of the lowest-energy conformer (first one on ties)."""
        if not self.conformer_ids:
            raise ValueError(f"no conformers for {self.smiles}: {self.status}")
        return self.conformer_ids[int(np.argmin(self.energies_kcal_mol))]

    def coordinates(self, conformer_id: int) -> np.ndarray:
        """Return the (n_atoms, 3) coordinates of one conformer [angstrom]."""
        return np.array(self.mol.GetConformer(conformer_id).GetPositions())

    def weights(self, temperature_K: float = TEMPERATURE_K) -> np.ndarray:
        """Return Boltzmann weights exp(-E_i/RT) / sum_j exp(-E_j/RT) of the conformers."""
        energies = np.asarray(self.energies_kcal_mol, dtype=float)
        factors = np.exp(-(energies - energies.min()) / (_R_KCAL * temperature_K))
        return factors / factors.sum()


def max_3d_atoms() -> int:
    """Return the heavy-atom limit of the 3D work: ``COHESION_MAX_3D_ATOMS`` or :data:`MAX_3D_ATOMS`.

    A value that is not a whole number of 0 or more is ignored (the default applies).
    """
    text = os.environ.get(MAX_3D_ATOMS_VARIABLE, "").strip()
    try:
        limit = int(text)
    except ValueError:
        return MAX_3D_ATOMS
    return limit if limit >= 0 else MAX_3D_ATOMS


def too_large_for_3d(mol: Chem.Mol, limit: int | None = None) -> str | None:
    """Return why ``mol`` gets no 3D structure (a sentence starting :data:`TOO_LARGE`), or None.

    ``limit``: the heavy-atom limit (default: :func:`max_3d_atoms`, read now)."""
    heavy, limit = mol.GetNumHeavyAtoms(), max_3d_atoms() if limit is None else limit
    if heavy <= limit:
        return None
    return (f"{TOO_LARGE} ({heavy} heavy atoms, above the limit of {limit} for 3D work; "
            f"{MAX_3D_ATOMS_VARIABLE} sets it)")


def canonical_smiles(mol_or_smiles: str | Chem.Mol) -> str:
    """Return the canonical isomeric SMILES of a SMILES string or Mol.

    Two spellings of ethanol give one key; stereo is kept (trans-1,2-dichloroethene
    stays apart from the unspecified isomer):

    >>> canonical_smiles("OCC") == canonical_smiles("C(O)C")
    True
    >>> canonical_smiles("Cl/C=C/Cl"), canonical_smiles("ClC=CCl")
    ('Cl/C=C/Cl', 'ClC=CCl')

    Raises
    ------
    ValueError
        If the SMILES does not parse.
    """
    if isinstance(mol_or_smiles, Chem.Mol):
        return Chem.MolToSmiles(Chem.RemoveHs(mol_or_smiles), isomericSmiles=True)
    return _canonical_text(mol_or_smiles)


@functools.lru_cache(maxsize=4096)
def _canonical_text(smiles: str) -> str:
    """:func:`canonical_smiles` of a SMILES string, kept: an entry's force profile, dipole and
    Hansen estimate each ask for the ensemble of the same canonical SMILES."""
    mol = Chem.MolFromSmiles(smiles)
    if mol is None:
        raise ValueError(f"SMILES did not parse: {smiles!r}")
    return Chem.MolToSmiles(Chem.RemoveHs(mol), isomericSmiles=True)


def count_torsions(mol: Chem.Mol) -> int:
    """Count acyclic single bonds whose rotation changes the geometry.

    Both bond atoms must carry another heavy atom or a hydrogen (heavy degree > 1 in
    the hydrogen-suppressed graph, or an O-H / N-H / S-H rotor), and neither may be
    sp (triple bonded). Bonds to CH3 or CX3 tops are not counted: their rotation
    moves only symmetry-equivalent atoms.

    n-Butane has one conformational torsion (the central C-C: anti and gauche);
    n-hexane three; ethane none (common practice):

    >>> [count_torsions(Chem.MolFromSmiles(s)) for s in ("CC", "CCCC", "CCCCCC")]
    [0, 1, 3]
    """
    heavy = Chem.RemoveHs(mol)
    tops = {m[0] for top in _SYMMETRIC_TOPS for m in heavy.GetSubstructMatches(top)}
    count = 0
    for bond in heavy.GetBonds():
        if bond.GetBondType() != Chem.BondType.SINGLE or bond.IsInRing():
            continue
        ends = (bond.GetBeginAtom(), bond.GetEndAtom())
        if any(_is_sp(atom) for atom in ends):
            continue
        if any(atom.GetIdx() in tops or _is_methyl(atom) for atom in ends):
            continue
        if all(atom.GetDegree() > 1 or _has_polar_h(atom) for atom in ends):
            count += 1
    return count


def _is_sp(atom: Chem.Atom) -> bool:
    return atom.GetHybridization() == Chem.HybridizationType.SP


def _is_methyl(atom: Chem.Atom) -> bool:
    return atom.GetDegree() == 1 and atom.GetTotalNumHs() >= 3


def _has_polar_h(atom: Chem.Atom) -> bool:
    return atom.GetAtomicNum() in (7, 8, 16) and atom.GetTotalNumHs() > 0


def unspecified_stereo(mol: Chem.Mol) -> list[str]:
    """List the unspecified stereo elements of a molecule: "double bond" or "centre" each."""
    kinds = []
    for info in Chem.FindPotentialStereo(mol):
        if info.specified == Chem.StereoSpecified.Unspecified:
            kinds.append("double bond" if info.type == Chem.StereoType.Bond_Double else "centre")
    return kinds


def conformer_stereo(ensemble: ConformerEnsemble) -> tuple[str, ...]:
    """Return, per conformer, the canonical SMILES with stereo perceived from its 3D geometry.

    Where the input left stereo unspecified, the embedding picks a configuration per
    conformer, so conformers of one ensemble can belong to different stereoisomers.
    """
    labels = []
    for cid in ensemble.conformer_ids:
        work = Chem.Mol(ensemble.mol)
        Chem.AssignStereochemistryFrom3D(work, confId=cid)
        labels.append(Chem.MolToSmiles(Chem.RemoveHs(work)))
    return tuple(labels)


def _n_conformers(mol: Chem.Mol) -> int:
    if unspecified_stereo(mol):
        return MAX_CONFORMERS  # sample several stereoisomers as well as conformations
    rings = Chem.rdMolDescriptors.CalcNumAliphaticRings(mol)
    return min(MAX_CONFORMERS, 1 + 2 * (count_torsions(mol) + rings))


def _budget(heavy_atoms: int) -> tuple[int, int]:
    """Return (most conformers, minimiser iterations) for a molecule of this size.

    Embedding and force-field cost grow about with the square of the size, so above
    :data:`FULL_ENSEMBLE_ATOMS` both shrink by that factor (at least one conformer and
    :data:`_MIN_ITERS_LARGE` iterations).
    """
    if heavy_atoms <= FULL_ENSEMBLE_ATOMS:
        return MAX_CONFORMERS, _MAX_ITERS
    scale = (FULL_ENSEMBLE_ATOMS / heavy_atoms) ** 2
    return max(1, int(MAX_CONFORMERS * scale)), max(_MIN_ITERS_LARGE, int(_MAX_ITERS * scale))


def conformer_ensemble(smiles: str) -> ConformerEnsemble:
    """Build (or fetch from the cache) the conformer ensemble of a SMILES.

    Parameters
    ----------
    smiles : str
        Any SMILES; it is canonicalised first, so equal molecules share a cache entry.
        Stereo given in the SMILES is kept; unspecified stereo is chosen by the
        embedding (see :mod:`builder.chem.forces` for how that is reported).

    Returns
    -------
    ConformerEnsemble
        1 + 2 x (torsions + aliphatic rings) conformers, at most
        :data:`MAX_CONFORMERS` (always that many when stereo is unspecified, so that
        several stereoisomers are sampled); ``status`` explains any shortfall.
    """
    key = canonical_smiles(smiles)
    reason = _too_large(key, max_3d_atoms())
    if reason is not None:
        return ConformerEnsemble(key, Chem.AddHs(Chem.MolFromSmiles(key)), (), (), "none", reason)
    return _ensemble(key)


@functools.lru_cache(maxsize=4096)
def _too_large(key: str, limit: int) -> str | None:
    """:func:`too_large_for_3d` of a canonical SMILES under the heavy-atom ``limit`` in force, kept."""
    return too_large_for_3d(Chem.MolFromSmiles(key), limit)


def clear_cache() -> None:
    """Forget every cached ensemble (for timing and determinism checks)."""
    _ensemble.cache_clear()
    _canonical_text.cache_clear()
    _too_large.cache_clear()


@functools.lru_cache(maxsize=2048)
def _ensemble(key: str) -> ConformerEnsemble:
    mol = Chem.AddHs(Chem.MolFromSmiles(key))
    blocker = rdBase.BlockLogs()  # typing warnings become the status string instead
    try:
        wanted = _n_conformers(mol)
        most, iterations = _budget(mol.GetNumHeavyAtoms())
        conformer_ids = _embed(mol, min(wanted, most))
        if not conformer_ids:
            return ConformerEnsemble(key, mol, (), (), "none", "3D embedding failed")
        energies, forcefield, status = _optimise(mol, iterations)
        if most < wanted or iterations < _MAX_ITERS:
            status = _join(status, f"reduced ensemble for a large molecule ({len(conformer_ids)} "
                                   f"conformer{'s' if len(conformer_ids) != 1 else ''}, at most "
                                   f"{iterations} minimiser steps each)")
    except (RuntimeError, ValueError) as error:  # RDKit refuses some inputs (dummy atoms "*") outright
        first = str(error).strip().splitlines()
        detail = f" ({first[0].strip()})" if first and first[0].strip() else ""
        return ConformerEnsemble(key, Chem.AddHs(Chem.MolFromSmiles(key)), (), (), "none",
                                 f"3D embedding failed{detail}")
    finally:
        del blocker
    return ConformerEnsemble(key, mol, conformer_ids, energies, forcefield, status)


def _embed(mol: Chem.Mol, n_conformers: int) -> tuple[int, ...]:
    params = AllChem.ETKDGv3()
    params.randomSeed = EMBED_SEED
    params.numThreads = 1
    params.maxIterations = _MAX_EMBED_ATTEMPTS
    params.timeout = EMBED_TIMEOUT_S
    ids = [i for i in AllChem.EmbedMultipleConfs(mol, n_conformers, params) if i >= 0]
    if not ids:
        params.useRandomCoords = True
        ids = [i for i in AllChem.EmbedMultipleConfs(mol, n_conformers, params) if i >= 0]
    if len(ids) != mol.GetNumConformers():  # the time limit struck part-way: keep nothing half-made
        mol.RemoveAllConformers()
        return ()
    return tuple(ids)


def _optimise(mol: Chem.Mol, max_iters: int = _MAX_ITERS) -> tuple[tuple[float, ...], str, str]:
    n = mol.GetNumConformers()
    if mol.GetNumAtoms() == 1:
        return (0.0,) * n, "none", "ok"
    if rdForceFieldHelpers.MMFFHasAllMoleculeParams(mol):
        results = rdForceFieldHelpers.MMFFOptimizeMoleculeConfs(
            mol, numThreads=1, maxIters=max_iters
        )
        forcefield = "MMFF94"
        status = "ok"
    elif rdForceFieldHelpers.UFFHasAllMoleculeParams(mol):
        results = rdForceFieldHelpers.UFFOptimizeMoleculeConfs(
            mol, numThreads=1, maxIters=max_iters
        )
        forcefield = "UFF"
        status = "MMFF94 cannot type every atom; geometry optimised with UFF"
    else:
        return (0.0,) * n, "none", "no force field types every atom; embedded geometry kept"
    energies = np.array([energy for _, energy in results], dtype=float)
    if any(not_converged for not_converged, _ in results):
        status = _join(status, "some conformers did not fully converge")
    return tuple(float(e) for e in energies - energies.min()), forcefield, status


def _join(status: str, extra: str) -> str:
    return extra if status == "ok" else f"{status}; {extra}"
